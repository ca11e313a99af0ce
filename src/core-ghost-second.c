/* core-ghost-second.c - second-order ghosts (ghost-conventions.md): a
 * first-order ghost reflected forward again by an element upstream in the
 * same branch, or the double bounce inside one element.  They travel
 * downstream to the branch's end and are rated at every element they meet.
 * Higher orders are not traced. */
#include <config.h>

#include <math.h>

#include "core-ghost-impl.h"
#include "core-thick.h"

/* The ghost leaves row i downstream with axes x, y and power p. */
static void
walk_forward(struct ghost_ctx *c, struct ghost *g, size_t i, const struct beam_axis *x,
    const struct beam_axis *y, double p)
{
	const struct trace *t = c->t;
	size_t gi = (size_t)(g - c->gs->g);
	long u = c->next[i];
	struct ghost_beam gb;

	ghost_beam_set(&gb, x, y);
	while (u >= 0 && p > c->floor) {
		const struct trace_row *tr = &t->rows[u];
		const struct ghost_pass *ps = &c->pass[u];
		double pin = p;
		struct ghost_row *kept;

		p = ghost_meet(c, &c->gs->g[gi], (size_t)u, &gb, p, &kept);
		if (ps->space) {
			if (kept != NULL)
				kept->power_lost = pin - p;
			ghost_gap(c, &c->gs->g[gi], (size_t)u, tr->z, +1, &gb, p);
			ghost_beam_space(&gb, tr->el->val[K_LENGTH]);
			u = c->next[u];
			continue;
		}
		if (ps->term) {
			if (kept != NULL)
				kept->power_lost = pin;
			c->acc[u].power_lost += pin;
			return;
		}
		if (kept != NULL)
			kept->power_lost = pin - p * ps->fwd;
		c->acc[u].power_lost += pin - p * ps->fwd;
		ghost_beam_optics(c, (size_t)u, 0, &gb);
		p *= ps->fwd;
		u = c->next[u];
	}
}

void
ghost_second_at(struct ghost_ctx *c, const struct ghost *first, size_t i,
    const struct beam_axis *x, const struct beam_axis *y, double p)
{
	const struct element *el = c->t->rows[i].el;
	double n = thick_index(el, c->lam), r1, r2, rf, rb, tb;
	unsigned flags = first->flags & (GF_REFLECTANCE_ASSUMED | GF_SHAPE_ASSUMED);
	int assumed;

	ghost_radii(el, c->lam, &r1, &r2, &assumed);
	if (assumed)
		flags |= GF_SHAPE_ASSUMED;
	rf = ghost_surface_r(c, i, GS_FRONT, &flags);
	rb = ghost_surface_r(c, i, GS_BACK, &flags);
	tb = ghost_bulk(el, rf, rb);
	for (int k = 0; k < 2; k++) {
		/* k = 0: off the back from outside; 1: in through the back, off
		 * the front inside, out through the back (not at a splitter,
		 * whose front is its coating) */
		double p2 = k ? p * (1 - rb) * (1 - rb) * rf * tb * tb : p * rb;
		struct beam_axis gx = *x, gy = *y;
		struct ghost *g;

		if (k && el->type == EL_SPLITTER)
			break;
		if (!(p2 > c->floor))
			continue;
		ghost_mirror(el, k ? ghost_power_front_inside(n, r1, r2) :
		    ghost_power_back_outside(r2), &gx, &gy);
		g = ghost_new(c, 2, flags);
		g->surf_el[0] = first->surf_el[0];
		g->surf[0] = first->surf[0];
		g->surf_el[1] = el;
		g->surf[1] = k ? GS_FRONT : GS_BACK;
		g->power_start = p2;
		walk_forward(c, g, i, &gx, &gy, p2);
	}
}

void
ghost_second_double(struct ghost_ctx *c, size_t i)
{
	const struct trace_row *tr = &c->t->rows[i];
	const struct element *el = tr->el;
	double n = thick_index(el, c->lam), r1, r2, rf, rb, tb, p;
	unsigned flags = 0;
	struct beam_axis x = tr->qx, y = tr->qy;
	struct ghost *g;
	int assumed;

	ghost_radii(el, c->lam, &r1, &r2, &assumed);
	if (assumed)
		flags |= GF_SHAPE_ASSUMED;
	rf = ghost_surface_r(c, i, GS_FRONT, &flags);
	rb = ghost_surface_r(c, i, GS_BACK, &flags);
	tb = ghost_bulk(el, rf, rb);
	p = ghost_p_clip(tr) * (1 - rf) * rb * rf * (1 - rb) * tb * tb * tb;
	if (!(p > c->floor))
		return;
	/* in through the front, off the back and the front inside, out
	 * through the back: the element's own power is part of it */
	ghost_mirror(el, ghost_power_double(n, r1, r2), &x, &y);
	g = ghost_new(c, 2, flags);
	g->surf_el[0] = g->surf_el[1] = el;
	g->surf[0] = GS_BACK;
	g->surf[1] = GS_FRONT;
	g->power_start = p;
	walk_forward(c, g, i, &x, &y, p);
}
