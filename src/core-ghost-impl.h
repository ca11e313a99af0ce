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
	struct ghost_pending *pend;     /* owned */
	size_t               npend, cappend;
	double               floor;     /* W: GHOST_FLOOR of the source */
	double               lam;
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

struct ghost *ghost_new(struct ghost_ctx *, int order, unsigned flags);
/* A row for ghost g at trace row u: radii from x, y; rated with u's limits;
 * added to u's sums.  Returns the row. */
struct ghost_row *ghost_add_row(struct ghost_ctx *, struct ghost *, size_t u,
           const struct beam_axis *x, const struct beam_axis *y, double p);
/* A focus in a gap of length len that the ghost crosses from plane z0 in
 * direction dir (+1 downstream, -1 upstream). */
void   ghost_gap(struct ghost_ctx *, struct ghost *, size_t u, double z0, int dir,
           const struct beam_axis *x, const struct beam_axis *y, double p);
/* Clips p at row u's aperture by the ghost's own radii. */
double ghost_clip(const struct ghost_ctx *, size_t u, const struct beam_axis *x,
           const struct beam_axis *y, double p);
void   ghost_add_stray(struct ghost_ctx *, const struct element *, const char *what,
           double p, double focus_distance);

/* Second order: the first-order ghost of row j, arriving at row i of the
 * same branch from downstream with power p and axes x, y (after i's
 * aperture), reflects forward again off i (core-ghost-second.c). */
void   ghost_second_at(struct ghost_ctx *, const struct ghost *first, size_t i,
           const struct beam_axis *x, const struct beam_axis *y, double p);
/* Row i's double bounce inside its own element. */
void   ghost_second_double(struct ghost_ctx *, size_t i);

#endif
