/* util-buf.h - a growable string buffer, so that nothing is formatted into
 * a fixed array.  Embed a struct buf, buf_init it, append, then either
 * buf_release it or buf_take the string. */
#ifndef UTIL_BUF_H
#define UTIL_BUF_H

#include <stdarg.h>
#include <stddef.h>

struct buf {
	char   *s;          /* owned; always NUL-terminated after buf_init */
	size_t  len;
	size_t  cap;
};

void  buf_init(struct buf *);
void  buf_release(struct buf *);
void  buf_reset(struct buf *);                 /* empty, keep memory */
char *buf_take(struct buf *);                  /* caller frees; buf is reset */
void  buf_add(struct buf *, const char *s);
void  buf_addn(struct buf *, const char *s, size_t n);
void  buf_addc(struct buf *, char c);
void  buf_printf(struct buf *, const char *fmt, ...)
          __attribute__((format(printf, 2, 3)));
void  buf_vprintf(struct buf *, const char *fmt, va_list)
          __attribute__((format(printf, 2, 0)));
void  buf_pad(struct buf *, size_t width_cols, size_t from);  /* pad with spaces to width, counting UTF-8 columns from offset `from` */

/* Columns a UTF-8 string takes on a terminal (every code point counts one:
 * the program prints no wide or combining characters of its own). */
size_t utf8_cols(const char *s);
/* 1 when s is well-formed UTF-8 (no overlongs, surrogates or bytes past
 * U+10FFFF), NULL included; text the program stores must be. */
int    utf8_valid(const char *s);

#endif
