/* core-tol.h - tolerances: how far a value of the bench may really lie from
 * the value written, and the random draws of the Monte-Carlo.
 *
 * A tolerance is written after a value: "250 mm ± 2 mm" (normal, σ 2 mm),
 * "2 W ± 5 %" (normal, σ 5 % of the value), "0.99 ± 0.004 uniform" (uniform
 * over the value ± the half-width); "+-" may stand for "±".  Elements keep
 * theirs beside their values (struct element.tol); the source's and the
 * bench-wide defaults per type and key live in struct tol_bench.
 *
 * Out of range: a uniform tolerance whose interval leaves the key's allowed
 * range is refused when it is written; a normal one is truncated to the
 * range (a draw outside is drawn again from the sample's own stream).
 *
 * Random numbers: one counter-based stream per sample (SplitMix64 of the
 * seed, the sample index and a draw counter), so a sample's values depend
 * only on (seed, sample), never on threads or order.  Pure computation. */
#ifndef CORE_TOL_H
#define CORE_TOL_H

#include <stddef.h>
#include <stdint.h>

#include "core-model.h"

#define TOL_SIGN "\xc2\xb1"         /* U+00B1 */

/* Source values that may carry a tolerance, in the order they are drawn. */
enum tol_src {
	TS_WAVELENGTH, TS_POWER, TS_PULSE_ENERGY, TS_REP_RATE, TS_PULSE_WIDTH,
	TS_WAIST_X, TS_WAIST_Y, TS_WAIST_POSITION, TS_M2_X, TS_M2_Y, TS_POLARIZATION,
	TS_COUNT
};
/* "source.power", ... ("source.waist" for both waist entries when written
 * as one value). */
const char   *tol_src_name(enum tol_src);
enum unit_dim tol_src_dim(enum tol_src);
/* The range a drawn source value is held to: > 0, M² >= 1, any waist
 * position or angle. */
void          tol_src_range(enum tol_src, double *lo, double *hi);

/* A default for every element of a type (EL_NTYPES: of every type) that
 * has the key written and no tolerance of its own. */
struct tol_default {
	enum elem_type type;
	enum model_key key;
	struct tol     t;
};

struct tol_bench {
	struct tol          src[TS_COUNT];
	struct tol_default *dflt;       /* owned array */
	size_t              ndflt, cap;
};

struct tol_bench *tol_bench_dup(const struct tol_bench *);   /* NULL gives NULL */
void              tol_bench_free(struct tol_bench *);        /* NULL ok */
/* b's table, made when it has none (borrowed). */
struct tol_bench *tol_bench_of(struct bench *);
/* The source value slot ts stands for (NAN for none). */
double            tol_source_value(const struct source *, enum tol_src ts);
int               tol_bench_empty(const struct tol_bench *); /* NULL: 1 */

/* ---- text ---- */

/* Finds the tolerance in text: 1 with *vlen the length of the value before
 * the sign and *rest the text after it, or 0 when there is none. */
int   tol_split(const char *text, size_t *vlen, const char **rest);
/* Parses what follows the sign: "<number> <unit of dim>" or "<number> %",
 * then optionally "normal" or "uniform".  Refuses negative or non-finite
 * amounts and units of another dimension. */
int   tol_parse(const char *rest, enum unit_dim dim, struct tol *out, char **cause);
/* " ± 2 mm", " ± 5 %", " ± 0.004 uniform": the suffix that tol_parse reads
 * back to the identical tolerance ("" when t has none).  As snprintf. */
int   tol_format(char *buf, size_t n, const struct tol *, enum unit_dim dim, int ascii);
int   tol_is_set(const struct tol *);          /* NULL or amount 0: 0 */

/* The amount in the value's unit: σ or half-width (a relative tolerance
 * taken of |nominal|). */
double tol_width(const struct tol *, double nominal);

/* ---- on elements ---- */

const struct tol *tol_of(const struct element *, enum model_key);    /* NULL: none */
/* Stores t (amount 0 removes the tolerance). */
void  tol_put(struct element *, enum model_key, const struct tol *);
/* The tolerance in effect: the element's own, else the bench's default for
 * the element's type and key when the key is written. */
const struct tol *tol_effective(const struct bench *, const struct element *,
                      enum model_key);
/* The value v of key k lies in the key's allowed range. */
int   tol_key_in_range(enum model_key, double v);
/* Refuses a uniform tolerance whose interval leaves k's range, naming the
 * element and key. */
int   tol_check_range(const struct element *, enum model_key, double v,
          const struct tol *, char **cause);
/* The bench-wide default "TYPE.KEY" ("space.length", "*.damage.fluence")
 * set from "± 1 mm" text (an empty text or "± 0" removes it). */
int   tol_default_set(struct bench *, const char *which, const char *text,
          char **cause);
/* The text of a default as tol_default_set reads it ("± 1 mm"); the name
 * "TYPE.KEY" into name. */
void  tol_default_name(const struct tol_default *, char *name, size_t n);

/* ---- random draws ---- */

struct tol_rng {
	uint64_t seed, sample, n;       /* n: draws taken so far */
};
void     tol_rng_init(struct tol_rng *, uint64_t seed, uint64_t sample);
uint64_t tol_rng_next(struct tol_rng *);
double   tol_rng_uniform(struct tol_rng *);    /* in (0, 1) */
double   tol_rng_normal(struct tol_rng *);     /* standard normal (Box-Muller) */
/* One value from nominal and t, truncated to key k's range (k < 0: to
 * lo..hi, either may be infinite).  *z gets the standardized deviation
 * (value - nominal) / width. */
double   tol_draw(const struct tol *, double nominal, int k, double lo, double hi,
             struct tol_rng *, double *z);

#endif
