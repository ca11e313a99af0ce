/* bench-tol.h - tolerances in the bench file: the "± ..." suffix on any
 * numeric value of an element or of the source (a JSON string then, where
 * the value alone may be a number: "0.99 ± 0.004", "1.1 ± 0.05"), and the
 * optional top-level section of bench-wide defaults:
 *
 *   "tolerances": { "space.length": "± 1 mm", "*.damage.fluence": "± 20 %" }
 *
 * Grammar and meaning: core-tol.h and beamledger-bench(5). */
#ifndef BENCH_TOL_H
#define BENCH_TOL_H

#include <jansson.h>

#include "core-model.h"
#include "core-tol.h"

/* v as written, with the tolerance t appended when it has one: a string
 * "<value text> ± <amount>" (the value's number turned into its exact SI
 * text).  Takes v; returns a new reference (caller decrefs). */
json_t *bench_tol_wrap(json_t *v, const struct tol *t, enum unit_dim dim);
/* A source value *v that carries a tolerance: the tolerance goes to
 * b's source entry ts and *v is replaced by the value alone (a number for
 * plain values); *owned gets the new reference to decref (NULL: *v was
 * left alone).  `what` names the key in messages. */
int     bench_tol_source_take(json_t **v, json_t **owned, struct bench *b,
            enum tol_src ts, const char *what, char **cause);
/* The uniform source tolerances whose interval leaves the value's range
 * are refused (after the whole source is read). */
int     bench_tol_source_check(const struct bench *, char **cause);
int     bench_tol_defaults_from_json(json_t *v, struct bench *b, char **cause);
/* NULL when the bench has no defaults (caller decrefs). */
json_t *bench_tol_defaults_to_json(const struct bench *b);

#endif
