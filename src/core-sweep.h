/* core-sweep.h - one knob of the bench swept over a range: what every rated
 * element sees at each step, where each first reaches caution and over, and
 * the intervals of the knob that are safe.
 *
 * A knob is ID.KEY (a numeric key of the model's table on that element),
 * source.KEY (power, pulse_energy, rep_rate, pulse_width, wavelength, waist,
 * waist_position, m2, polarization), or a rail, ID1.length~ID2.length: ID1
 * takes the knob value and ID2 the sum of the two lengths less it, so the
 * element between the two gaps slides with the total fixed.
 *
 * The sweep changes the one value in place in the bench it is given (and
 * puts back exactly what it touched at the end) and reuses one trace result for every step:
 * no copy of the bench per step.  Pure computation. */
#ifndef CORE_SWEEP_H
#define CORE_SWEEP_H

#include <stddef.h>

#include "core-damage.h"
#include "core-model.h"
#include "core-trace.h"

enum sweep_src { SRC_NONE, SRC_POWER, SRC_PULSE_ENERGY, SRC_REP_RATE, SRC_PULSE_WIDTH,
	SRC_WAVELENGTH, SRC_WAIST, SRC_WAIST_POSITION, SRC_M2, SRC_POLARIZATION };

struct sweep_knob {
	char           *text;       /* owned: as typed */
	enum sweep_src  src;        /* SRC_NONE: an element key */
	struct element *el, *el2;   /* borrowed from the bench; el2: the rail's other gap */
	enum model_key  key;
	enum unit_dim   dim;        /* of the value */
	int             angle;      /* degrees */
	double          total;      /* rail: the two lengths' sum */
	double          base;       /* the value before the sweep */
};

/* Finds the knob in b; refuses unknown ids, keys the type does not take and
 * keys that are not numbers.  The knob borrows from b. */
int    sweep_knob_parse(struct bench *b, const char *text, struct sweep_knob *,
           char **cause);
void   sweep_knob_release(struct sweep_knob *);
/* A value for the knob as typed ("20 mW", "12.5"). */
int    sweep_knob_value(const struct sweep_knob *, const char *text, double *v,
           char **cause);
void   sweep_knob_set(const struct sweep_knob *, struct bench *, double v);
double sweep_knob_get(const struct sweep_knob *, const struct bench *);

struct sweep_cross {
	size_t      row;            /* trace row of the element */
	const char *id;             /* borrowed from the bench */
	double      caution, over;  /* knob value where first reached; NAN: never */
};

struct sweep_interval {
	double lo, hi;              /* in sweep order: lo is met first */
};

struct sweep {
	size_t              nsteps;
	double             *x;          /* owned [nsteps] knob values */
	size_t              nrated;
	struct sweep_cross *rated;      /* owned [nrated] */
	double             *ratio;      /* owned [nsteps * nrated]; NAN: unrated there */
	long               *worst;      /* owned [nsteps]: index into rated, -1: none */
	enum damage_status *status;     /* owned [nsteps]: the highest of the step */
	size_t              nterm;
	const char        **term_id;    /* owned array of borrowed ids */
	double             *term_power; /* owned [nsteps * nterm]: W into each */
	unsigned char      *unterminated, *breakdown;  /* owned [nsteps] */
	struct sweep_interval *safe;    /* owned: nothing over */
	size_t              nsafe;
	struct sweep_interval *calm;    /* owned: nothing at caution or over */
	size_t              ncalm;
	int                 any_over;
	double              tol;        /* bisection tolerance: 1e-6 of the range */
};

/* Sweeps the knob from `from` to `to` in `steps` values (>= 2), evenly or,
 * with SWEEP_LOG, in equal ratios (both ends of one sign, nonzero); with
 * SWEEP_NO_GHOSTS the main beam alone (--no-ghosts).  The bench must be
 * valid at both ends.  Returns NULL with *cause on bad input, and on a
 * step whose reflections are beyond the bound (trace_check). */
#define SWEEP_LOG       1u
#define SWEEP_NO_GHOSTS 2u
struct sweep *sweep_run(struct bench *, const struct sweep_knob *, double from,
                  double to, size_t steps, unsigned flags, char **cause);   /* caller frees */
void          sweep_free(struct sweep *);                             /* NULL ok */

/* The plot of ratio against the knob, laid out on a grid of w x h cells:
 * cell[row * w + col] is 0 (empty), 1 + i for series i (the `nseries`
 * highest elements, in sweep->rated order given by series[]), or the
 * level lines SWEEP_PLOT_OVER / SWEEP_PLOT_CAUTION.  Row 0 is the top,
 * at ratio ymax. */
#define SWEEP_PLOT_OVER    0xfe
#define SWEEP_PLOT_CAUTION 0xfd
struct sweep_plot {
	size_t         w, h;
	unsigned char *cell;        /* owned */
	double         ymax;
	size_t         nseries;
	size_t         series[8];   /* indices into rated */
};
void sweep_plot_layout(const struct sweep *, double safety_factor, size_t w, size_t h,
         size_t nseries, struct sweep_plot *out);
void sweep_plot_release(struct sweep_plot *);

#endif
