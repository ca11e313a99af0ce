/* util-json.h - writing JSON text straight into a growable buffer: strings
 * escaped per RFC 8259, numbers either in the shortest form that reads back
 * to the same double or with a fixed number of significant digits.  Used
 * where building a jansson tree would cost more than the work itself (a
 * 10^5-element trace) and where numbers must look the way people typed
 * them (export). */
#ifndef UTIL_JSON_H
#define UTIL_JSON_H

#include <stddef.h>

#include "util-buf.h"

/* The shortest "%.Ng" of v that reads back to the same double; "inf",
 * "-inf", "nan" for the rest.  Needs the C numeric locale. */
void fmt_exact(char *out, size_t n, double v);
void json_put_string(struct buf *, const char *s);
/* Shortest "%.Ng" (N <= 17) that round-trips; non-finite values are null. */
void json_put_exact(struct buf *, double v);
/* A decimal number s[0..len) (JSON's syntax, already checked) as strtod
 * reads it, where that is one exact operation: digits that make an
 * integer below 2^53 times or over a power of ten up to 10^22, which
 * rounds once (Clinger 1990, the fast path).  0, or -1 for the rest,
 * which strtod must read. */
int json_number_exact(const char *s, size_t len, double *out);
/* "%.10g"; non-finite values are null. */
void json_put_number(struct buf *, double v);

#endif
