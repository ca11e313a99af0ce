/* core-ghost-impl.h - what core-ghost.c and core-ghost-second.c share:
 * the walk's context and the steps a ghost takes through one element.
 * Private to the ghost engine. */
#ifndef CORE_GHOST_IMPL_H
#define CORE_GHOST_IMPL_H

#include "core-ghost.h"

struct ghost_acc {              /* what the ghosts add at one element */
	double irradiance, linear_density, fluence, power_in, power_lost;
	int    met;
};

/* What any ghost meets at one trace row, worked out once per trace: the
 * power fractions depend on the main beam there (its Stokes vector and
 * clipping), not on the ghost, and a ghost walk visits every row once per
 * ghost, 10⁴ ghosts on a long chain. */
enum ghost_optic {
	GO_NONE,                /* the element leaves q alone */
	GO_THIN,                /* thin lenses of focal fx, fy (INFINITY: none) */
	GO_GENERAL,             /* trace_element_optics */
};
struct ghost_pass {
	double           back_same;     /* passed upstream, ghost from the same branch */
	double           back_side;     /* ... from the element's own side branch */
	double           stray_same, stray_side;   /* the fourth port's share of each */
	double           fwd;           /* passed downstream along the branch */
	double           ap;            /* clipping radius, m; NAN: none */
	double           fx, fy;        /* GO_THIN */
	enum ghost_optic optic;
	unsigned char    space, term, rated, side;  /* side: has a side port */
	unsigned char    linear;        /* rated in W/cm (needs the radii) */
	unsigned char    sym;           /* acts alike on x and y */
};

struct ghost_pending {          /* a second reflection waiting to be traced */
	size_t           row;
	struct beam_axis x, y;
	double           p;
};

struct ghost_ctx {
	struct trace        *t;         /* borrowed */
	const struct bench  *b;         /* borrowed */
	struct ghost_set    *gs;        /* borrowed: t->ghosts */
	long                *prev;      /* owned: per row, the row upstream; -1: the source */
	long                *next;      /* owned: per row, the next row in its branch; -1: end */
	struct ghost_acc    *acc;       /* owned: per row */
	struct ghost_pass   *pass;      /* owned: per row */
	double              *fourth;    /* owned: per row, what the ghosts lose by its
	                                 * fourth port, W */
	struct ghost_pending *pend;     /* owned */
	size_t               npend, cappend;
	double               floor;     /* W: GHOST_FLOOR of the source */
	double               lam;
	int                  keep_rows; /* store every ghost's rows (GHOST_ROWS) */
	int                  lean;      /* GHOST_LEAN */
	double               inv_rep;   /* 1/rep_rate of a pulsed source (fluence) */
	double               spark_a, spark_b;  /* ghost_may_spark's constants */
};

/* A ghost's beam: its two axes, and whether they are equal (a round beam
 * through round optics needs one of them worked out). */
struct ghost_beam {
	struct beam_axis x, y;
	int              sym;
};

/* Surface reflectance of a row's element, front or back (as seen by the
 * main beam); sets GF_REFLECTANCE_ASSUMED in *flags when the file is silent. */
double ghost_surface_r(const struct ghost_ctx *, size_t row, enum ghost_surface,
           unsigned *flags);
/* Bulk transmission of one pass through the element's glass. */
double ghost_bulk(const struct element *, double rf, double rb);
/* The main beam's power at a row's surface, after its aperture. */
double ghost_p_clip(const struct trace_row *);
/* 1 when an element throws ghosts back along the axis (untilted, with surfaces). */
int    ghost_untilted(const struct ghost_ctx *, const struct element *);
int    ghost_has_surfaces(const struct element *);
/* Applies a thin mirror of power pw (1/m) to the curved axes of an element. */
void   ghost_mirror(const struct element *, double pw, struct beam_axis *x,
           struct beam_axis *y);
/* x, y into a ghost beam (sym when they are equal). */
void   ghost_beam_set(struct ghost_beam *, const struct beam_axis *x,
           const struct beam_axis *y);
/* Row u's element acting on the beam (pass[u].optic), crossed downstream
 * or, back, upstream. */
void   ghost_beam_optics(const struct ghost_ctx *, size_t u, int back, struct ghost_beam *);
void   ghost_beam_space(struct ghost_beam *, double len);

struct ghost *ghost_new(struct ghost_ctx *, int order, unsigned flags);
/* Ghost g at trace row u with power p and inverse squared radii ix, iy
 * (1/wx², 1/wy²: the irradiance needs no root): rated with u's limits;
 * added to u's sums (and kept as a row with keep_rows).  Returns the kept
 * row or NULL. */
struct ghost_row *ghost_add_row(struct ghost_ctx *, struct ghost *, size_t u,
           double ix, double iy, double p);
void   ghost_beam_inv2(const struct ghost_ctx *, const struct ghost_beam *,
           double *ix, double *iy);
/* The beam's radii at the lab wavelength. */
void   ghost_beam_radii(const struct ghost_ctx *, const struct ghost_beam *,
           double *wx, double *wy);
/* A focus in a gap of length len that the ghost crosses from plane z0 in
 * direction dir (+1 downstream, -1 upstream). */
void   ghost_gap(struct ghost_ctx *, struct ghost *, size_t u, double z0, int dir,
           const struct ghost_beam *, double p);
/* Ghost g with beam gb and power p meets row u: rated there
 * (ghost_add_row) and clipped (ghost_clip); returns the power past the
 * aperture and sets *kept.  In a lean walk an unrated row is only
 * counted and clipped (no radii without an aperture). */
double ghost_meet(struct ghost_ctx *, struct ghost *, size_t u, const struct ghost_beam *,
           double p, struct ghost_row **kept);
/* Clips p at row u's aperture by the ghost's own radii (from 1/w²). */
double ghost_clip(const struct ghost_ctx *, size_t u, double ix, double iy, double p);
void   ghost_add_stray(struct ghost_ctx *, const struct element *, const char *what,
           double p, double focus_distance);

/* The first-order ghosts of row r (core-ghost.c), and the strays that
 * leave it sideways: a mirror's leak, a reflective filter's reflection. */
void   ghost_first_order(struct ghost_ctx *, size_t r);
void   ghost_side_strays(struct ghost_ctx *, size_t r);

/* Second order: the first-order ghost of row j, arriving at row i of the
 * same branch from downstream with power p and axes x, y (after i's
 * aperture), reflects forward again off i (core-ghost-second.c). */
void   ghost_second_at(struct ghost_ctx *, const struct ghost *first, size_t i,
           const struct beam_axis *x, const struct beam_axis *y, double p);
/* Row i's double bounce inside its own element. */
void   ghost_second_double(struct ghost_ctx *, size_t i);

/* The buffers one ghost_run allocates, kept by the trace (t->gscratch;
 * core-ghost-scratch.c).  Every pointer is owned. */
struct ghost_scratch {
	struct ghost_set     *set[2];   /* owned: emptied sets, the halves' */
	size_t                cap;      /* rows the per-row arrays hold */
	long                 *prev, *next;              /* owned [cap] */
	struct ghost_pass    *pass;                     /* owned [cap] */
	struct ghost_acc     *acc[2];                   /* owned [cap] */
	double               *fourth[2];                /* owned [cap] */
	double               *split;                    /* owned [4 cap] */
	struct ghost_pending *pend[2];                  /* owned */
	size_t                cappend[2];
	long                 *tmp;                      /* owned [captmp] */
	size_t                captmp;
};

/* Set k (0: the trace's, 1: the second half's) emptied into the scratch,
 * which owns it; and taken back out with room for n summaries (the
 * caller owns it). */
void              ghost_scratch_put_set(struct ghost_scratch *, int k, struct ghost_set *);
struct ghost_set *ghost_scratch_take_set(struct ghost_scratch *, int k, size_t n);
/* The per-row arrays for n rows (contents undefined). */
void              ghost_scratch_rows(struct ghost_scratch *, size_t n);
/* n longs for one step's own use at a time (contents undefined). */
long             *ghost_scratch_longs(struct ghost_scratch *, size_t n);

#endif
