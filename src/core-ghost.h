/* core-ghost.h - surface reflections as beams (ghost-conventions.md): the
 * residual reflection of every glass surface, traced back upstream as a
 * first-order ghost, forward again after a second reflection as a
 * second-order ghost, or off the axis as a stray; what comes back to the
 * source; and the element ratings with the ghosts that meet them added.
 * Works from the bench and the finished main-beam trace.  Pure computation. */
#ifndef CORE_GHOST_H
#define CORE_GHOST_H

#include <stddef.h>

#include "core-trace.h"

/* Below this fraction of the source power a ghost is not followed. */
#define GHOST_FLOOR 1e-9
/* An AR-coated surface where the file says nothing: 0.5 % (common practice:
 * broadband AR is 0.2-0.5 %; the conservative end). */
#define GHOST_R_ASSUMED 0.005

enum ghost_flag {
	GF_REFLECTANCE_ASSUMED = 1 << 0,    /* a surface without surface_reflectance */
	GF_SHAPE_ASSUMED       = 1 << 1,    /* a lens of focal alone: equi-convex */
	GF_OVER                = 1 << 2,    /* over at some element */
};
const char *ghost_flag_name(unsigned bit);     /* "reflectance_assumed", ... */
#define GF_COUNT 3

/* Which reflection: the element's front or back surface, seen from the
 * side the light arrives on. */
enum ghost_surface { GS_FRONT, GS_BACK };

struct ghost_row {
	const struct element *el;       /* borrowed */
	size_t                trace_row;  /* index into the trace's rows */
	double                power_in, wx, wy;
	double                irradiance, linear_density, fluence, peak_irradiance;
	double                power_lost;   /* what the element takes of it */
	double                ratio;        /* NAN: unrated */
	enum damage_status    status;
};

struct ghost_focus {
	double                z;        /* m, in the table's frame */
	double                wx, wy, peak_irradiance;
	const struct element *gap;      /* borrowed: the space it lies in */
	size_t                gap_row;  /* its trace row */
	double                distance; /* m to the nearest element's plane */
	int                   air_breakdown;
};

struct ghost {
	int                   order;    /* 1 or 2 */
	const struct element *surf_el[2];   /* borrowed; [1] NULL for order 1 */
	enum ghost_surface    surf[2];
	double                power_start;  /* W, after its last reflection */
	size_t                nrows;        /* elements met */
	size_t                row0;         /* its rows in ghost_set.rows (rows_kept only) */
	size_t                focus0, nfoci;
	long                  worst_row;    /* trace row where it is worst; -1: unrated */
	double                worst_ratio;
	unsigned              flags;
};

struct ghost_stray {
	const struct element *from;     /* borrowed */
	const char           *what;     /* static: "front", "back", "fourth_port",
	                                 * "leak", "reflected" */
	double                power, peak_power;  /* W; peak NAN for CW */
	double                focus_distance;     /* m from the surface; NAN: flat */
};

/* What the ghosts bring to one element: one per trace row. */
struct ghost_at {
	size_t nmet;            /* ghosts that meet it */
	double power_in;        /* W: their powers, summed */
	double irradiance;      /* W/m²: their peak irradiances, summed (coaxial) */
	double fluence;         /* J/m², summed; NAN for CW */
	double linear_density;  /* W/m, summed where the element is rated so (else 0) */
	double power_lost;      /* W the element takes of them */
	double main_ratio;      /* the element's ratio from the main beam alone;
	                         * NAN: unrated */
	long   top;             /* index into ghost_set.g of the ghost that counts
	                         * most here (largest ratio, or irradiance where
	                         * unrated); -1: none */
	double top_ratio, top_irradiance, top_power;
};

struct ghost_set {
	struct ghost       *g;          /* owned */
	size_t              n, cap;
	struct ghost_row   *rows;       /* owned; NULL unless rows_kept */
	size_t              nrows, caprows;
	int                 rows_kept;  /* ghost_run with GHOST_ROWS */
	struct ghost_focus *foci;       /* owned */
	size_t              nfoci, capfoci;
	struct ghost_stray *strays;     /* owned */
	size_t              nstrays, capstrays;
	struct ghost_at    *at;         /* owned [trace nrows] */
	size_t              capat;
	/* Bounds (GHOST_WORK_LIMIT, GHOST_ROWS_LIMIT): the estimated
	 * ghost-element visits; refused: over the work limit, nothing traced
	 * (trace_check says so); rows_omitted: rows asked for but over the
	 * rows limit, so not kept */
	double              work;
	int                 refused, rows_omitted;
	double              return_power;   /* W back at the source (first order) */
	size_t              nover;          /* ghosts over somewhere */
};

/* Computes the ghosts and strays of a finished main trace, adds the
 * ghosts to the ratings of the elements they meet (flag "ghosts"), and
 * updates worst, safe_source_power and the warnings.  Sets t->ghosts.
 * With GHOST_ROWS every ghost keeps its row at every element it meets
 * (the JSON and CSV output; a long chain has millions); without, only
 * its summary (worst, foci, counts) - the ratings are the same. */
#define GHOST_ROWS 1u
/* The bench walked as one part, not two (a test's check that the halves
 * add up to the whole; the sums then differ only in the order added). */
#define GHOST_ONE_PART 2u
/* Only what the ratings and warnings need (TRACE_LEAN): no summaries
 * (at[] stays empty), nothing at an unrated row, no focus that cannot
 * reach air_breakdown. */
#define GHOST_LEAN 4u
/* A bench whose reflections would take more ghost-element visits than
 * this (a few seconds) is refused with a clear error rather than left
 * running for hours: `--no-ghosts` traces its main beam.  A 200-surface
 * chain takes ~1e7. */
#define GHOST_WORK_LIMIT 2e8
/* Rows kept for JSON and CSV at most (~100 bytes each): past it the
 * ghosts keep their summaries only, and the output says the rows are
 * left out. */
#define GHOST_ROWS_LIMIT 2e6
void ghost_run(struct trace *t, unsigned opts);
void ghost_set_free(struct ghost_set *);         /* NULL ok */
/* The buffers one ghost_run allocates, kept by the trace (t->gscratch)
 * so that tracing the same result again (trace_rerun: a sweep, a
 * tolerance run) allocates nothing once they have grown. */
struct ghost_scratch;
/* t->ghosts back into t's scratch, emptied (t->ghosts NULL after). */
void ghost_recycle(struct trace *t);
void ghost_scratch_free(struct ghost_scratch *); /* NULL ok */
/* "L1.back" for a ghost's k-th reflection, into buf. */
void ghost_surface_name(const struct ghost *, int k, char *buf, size_t n);

/* The optics of one element's surfaces, for the ghost engine and its tests.
 * Radii r1, r2 as the file gives them, or from the focal length when it gives no shape
 * (equi-convex, r1 = -r2 = 2(n - 1)f; *assumed set); a flat surface
 * INFINITY.  Powers are 1/f of the equivalent thin mirror. */
void   ghost_radii(const struct element *, double lambda, double *r1, double *r2,
           int *assumed);
double ghost_power_front_outside(double r1);                     /* -2/r1 */
double ghost_power_back_inside(double n, double r1, double r2);  /* 2(n-1)/r1 - 2n/r2 */
double ghost_power_back_outside(double r2);                      /* 2/r2, from downstream */
double ghost_power_front_inside(double n, double r1, double r2); /* 2n/r1 - 2(n-1)/r2 */
double ghost_power_double(double n, double r1, double r2);       /* (3n-1)(1/r1 - 1/r2) */
/* Fresnel power reflectance at aoi (degrees) for s and p, from air into n. */
void   ghost_fresnel(double n, double aoi_deg, double *rs, double *rp);

#endif
