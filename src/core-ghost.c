/* core-ghost.c - first-order ghosts, strays and the combined rating
 * (ghost-conventions.md).  Every untilted glass surface sends its residual
 * reflection back up the beam; the ghost retraces the elements it came
 * through, each passing the fraction it passed forward (an isolator its
 * isolation), and is rated at every element it meets. */
#include <config.h>

#include <complex.h>
#include <math.h>
#include <pthread.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "core-ghost-impl.h"
#include "core-thick.h"
#include "util-err.h"

static const char *const gflag_names[GF_COUNT] = {
	"reflectance_assumed", "shape_assumed", "over",
};

const char *
ghost_flag_name(unsigned bit)
{
	for (int i = 0; i < GF_COUNT; i++)
		if (bit == 1u << i)
			return gflag_names[i];
	return "?";
}

void
ghost_set_free(struct ghost_set *gs)
{
	if (gs == NULL)
		return;
	free(gs->g);
	free(gs->rows);
	free(gs->foci);
	free(gs->strays);
	free(gs->at);
	free(gs);
}

void
ghost_surface_name(const struct ghost *g, int k, char *buf, size_t n)
{
	const struct element *el = g->surf_el[k];

	if (el == NULL) {
		snprintf(buf, n, "?");
		return;
	}
	snprintf(buf, n, "%s.%s", el->id, g->surf[k] == GS_FRONT ? "front" : "back");
}

/* ---- surface optics ---- */

void
ghost_radii(const struct element *el, double lambda, double *r1, double *r2, int *assumed)
{
	double n = thick_index(el, lambda), f;

	*r1 = *r2 = INFINITY;
	*assumed = 0;
	if (el->type != EL_LENS)
		return;
	if (model_has(el, K_R1) || model_has(el, K_R2)) {
		/* the file's shape; an absent radius is a flat face */
		if (model_has(el, K_R1))
			*r1 = el->val[K_R1];
		if (model_has(el, K_R2))
			*r2 = el->val[K_R2];
		return;
	}
	/* focal alone: equi-convex (or equi-concave) in its index, from the
	 * thin lensmaker's equation 1/f = (n - 1)(1/r1 - 1/r2) with r2 = -r1 */
	f = el->val[K_FOCAL];
	*r1 = 2 * (n - 1) * f;
	*r2 = -*r1;
	*assumed = 1;
}

static double
inv(double r)
{
	return isinf(r) ? 0 : 1 / r;
}

double
ghost_power_front_outside(double r1)
{
	return -2 * inv(r1);
}

double
ghost_power_back_inside(double n, double r1, double r2)
{
	return 2 * (n - 1) * inv(r1) - 2 * n * inv(r2);
}

double
ghost_power_back_outside(double r2)
{
	return 2 * inv(r2);
}

double
ghost_power_front_inside(double n, double r1, double r2)
{
	return 2 * n * inv(r1) - 2 * (n - 1) * inv(r2);
}

double
ghost_power_double(double n, double r1, double r2)
{
	return (3 * n - 1) * (inv(r1) - inv(r2));
}

void
ghost_fresnel(double n, double aoi_deg, double *rs, double *rp)
{
	double ti = aoi_deg * M_PI / 180, st = sin(ti) / n;
	double ci = cos(ti), ct = sqrt(1 - st * st);
	double as = (ci - n * ct) / (ci + n * ct), ap = (ct - n * ci) / (ct + n * ci);

	*rs = as * as;
	*rp = ap * ap;
}

int
ghost_has_surfaces(const struct element *el)
{
	return model_key_applies(K_SURF_R, el->type);
}

int
ghost_untilted(const struct ghost_ctx *c, const struct element *el)
{
	return ghost_has_surfaces(el) && model_get(el, K_AOI) < c->b->ghost_tilt;
}

double
ghost_surface_r(const struct ghost_ctx *c, size_t row, enum ghost_surface s,
    unsigned *flags)
{
	const struct trace_row *r = &c->t->rows[row];
	const struct element *el = r->el;
	enum model_key k = s == GS_BACK && model_has(el, K_SURF_R_BACK) ? K_SURF_R_BACK : K_SURF_R;
	double v, rs, rp, wp;

	if (!model_has(el, k)) {
		*flags |= GF_REFLECTANCE_ASSUMED;
		return GHOST_R_ASSUMED;
	}
	v = el->val[k];
	if (v != MODEL_UNCOATED)
		return v;
	/* Fresnel at the angle of incidence, s and p weighted by the Stokes
	 * vector (x is p, S1 > 0 horizontal); the same value inside a plate */
	ghost_fresnel(thick_index(el, c->lam), model_get(el, K_AOI), &rs, &rp);
	wp = r->stokes[0] > 0 ? (r->stokes[0] + r->stokes[1]) / (2 * r->stokes[0]) : 0.5;
	return wp * rp + (1 - wp) * rs;
}

double
ghost_bulk(const struct element *el, double rf, double rb)
{
	double t;

	if (el->type == EL_FILTER && model_has(el, K_OD))
		return pow(10, -el->val[K_OD]);
	if (!model_has(el, K_TRANSMISSION))
		return 1;
	t = el->val[K_TRANSMISSION] / ((1 - rf) * (1 - rb));
	return t < 1 ? t : 1;
}

double
ghost_p_clip(const struct trace_row *r)
{
	return r->power_in * (1 - r->clip_loss);
}

void
ghost_mirror(const struct element *el, double pw, struct beam_axis *x, struct beam_axis *y)
{
	int axis = el->type == EL_LENS ? (int)model_get(el, K_AXIS) : AXIS_BOTH;

	if (pw == 0 || !isfinite(pw))
		return;
	if (axis != AXIS_Y)
		beam_lens(x, 1 / pw);
	if (axis != AXIS_X)
		beam_lens(y, 1 / pw);
}

/* ---- a ghost's beam ---- */

void
ghost_beam_set(struct ghost_beam *gb, const struct beam_axis *x, const struct beam_axis *y)
{
	gb->x = *x;
	gb->y = *y;
	gb->sym = x->q == y->q && x->m2 == y->m2;
}

void
ghost_beam_radii(const struct ghost_ctx *c, const struct ghost_beam *gb, double *wx,
    double *wy)
{
	*wx = beam_radius(&gb->x, c->lam);
	*wy = gb->sym ? *wx : beam_radius(&gb->y, c->lam);
}

void
ghost_beam_space(struct ghost_beam *gb, double len)
{
	beam_space(&gb->x, len);
	beam_space(&gb->y, len);
}

void
ghost_beam_optics(const struct ghost_ctx *c, size_t u, int back, struct ghost_beam *gb)
{
	const struct ghost_pass *ps = &c->pass[u];

	switch (ps->optic) {
	case GO_NONE:
		return;
	case GO_THIN:
		if (!isinf(ps->fx))
			beam_lens(&gb->x, ps->fx);
		if (gb->sym && ps->sym) {
			gb->y = gb->x;
			return;
		}
		if (!isinf(ps->fy))
			beam_lens(&gb->y, ps->fy);
		break;
	case GO_GENERAL:
		if (back)
			(void)thick_apply_back(c->t->rows[u].el, c->lam, &gb->x, &gb->y);
		else
			trace_element_optics(c->t->rows[u].el, c->lam, &gb->x, &gb->y);
		break;
	}
	gb->sym = gb->x.q == gb->y.q && gb->x.m2 == gb->y.m2;
}

/* ---- the set ---- */

struct ghost *
ghost_new(struct ghost_ctx *c, int order, unsigned flags)
{
	struct ghost_set *gs = c->gs;
	struct ghost *g;

	if (gs->n == gs->cap) {
		gs->cap = gs->cap ? 2 * gs->cap : 16;
		gs->g = xreallocarray(gs->g, gs->cap, sizeof *gs->g);
	}
	g = &gs->g[gs->n++];
	memset(g, 0, sizeof *g);
	g->order = order;
	g->flags = flags;
	g->row0 = gs->nrows;
	g->focus0 = gs->nfoci;
	g->worst_row = -1;
	g->worst_ratio = NAN;
	return g;
}

void
ghost_beam_inv2(const struct ghost_ctx *c, const struct ghost_beam *gb, double *ix, double *iy)
{
	double re = creal(gb->x.q), im = cimag(gb->x.q);

	/* 1/w² = π Im q / (M² λ |q|²), beam_radius without the root */
	*ix = M_PI * im / (gb->x.m2 * c->lam * (re * re + im * im));
	if (gb->sym) {
		*iy = *ix;
		return;
	}
	re = creal(gb->y.q);
	im = cimag(gb->y.q);
	*iy = M_PI * im / (gb->y.m2 * c->lam * (re * re + im * im));
}

struct ghost_row *
ghost_add_row(struct ghost_ctx *c, struct ghost *g, size_t u, double ix, double iy, double p)
{
	struct ghost_set *gs = c->gs;
	const struct trace_row *tr = &c->t->rows[u];
	const struct ghost_pass *ps = &c->pass[u];
	const struct source *src = &c->b->src;
	struct ghost_acc *a = &c->acc[u];
	double irr, flu, lin = NAN, wx = NAN, wy = NAN;
	double ratio = NAN;
	enum damage_status st = STATUS_UNRATED;
	struct ghost_row *r;

	g->nrows++;
	/* 2P/(π wx wy) (damage_peak_irradiance) */
	irr = 2 * p / M_PI * (ix == iy ? ix : sqrt(ix * iy));
	/* c->inv_rep is NAN for CW, as the fluence is */
	flu = irr * c->inv_rep;
	if (c->keep_rows || ps->linear) {
		wx = 1 / sqrt(ix);
		wy = ix == iy ? wx : 1 / sqrt(iy);
		lin = damage_linear_density(p, wx, wy);
	}
	if (ps->rated) {
		struct damage_exposure ex;

		ex.power_in = p;
		ex.power_lost = 0;
		ex.linear_density = lin;
		ex.irradiance = irr;
		ex.fluence = flu;
		ratio = damage_ratio(&tr->limits, &ex);
		st = damage_status_of(ratio, c->b->safety_factor);
		if (!isnan(ratio) && (g->worst_row < 0 || ratio > g->worst_ratio)) {
			g->worst_row = (long)u;
			g->worst_ratio = ratio;
		}
		if (st == STATUS_OVER)
			g->flags |= GF_OVER;
	}
	/* the summaries are for the screens and reports, not the ratings */
	if (!c->lean) {
		struct ghost_at *at = &gs->at[u];

		at->nmet++;
		at->power_in += p;
		at->irradiance += irr;
		if (at->top < 0 || (ps->rated ? ratio > at->top_ratio : irr > at->top_irradiance)) {
			at->top = (long)(g - gs->g);
			at->top_ratio = ratio;
			at->top_irradiance = irr;
			at->top_power = p;
		}
	}
	a->met = 1;
	a->power_in += p;
	a->irradiance += irr;
	if (ps->linear)
		a->linear_density += lin;
	if (src->pulsed)
		a->fluence += flu;
	if (!c->keep_rows)
		return NULL;
	if (gs->nrows == gs->caprows) {
		gs->caprows = gs->caprows ? 2 * gs->caprows : 64;
		gs->rows = xreallocarray(gs->rows, gs->caprows, sizeof *gs->rows);
	}
	r = &gs->rows[gs->nrows++];
	r->el = tr->el;
	r->trace_row = u;
	r->power_in = p;
	r->wx = wx;
	r->wy = wy;
	r->irradiance = irr;
	r->linear_density = lin;
	r->fluence = flu;
	r->peak_irradiance = src->pulsed ?
	    irr * damage_peak_factor(src->shape) / (src->rep_rate * src->pulse_width) : irr;
	r->power_lost = 0;
	r->ratio = ratio;
	r->status = st;
	return r;
}

/* Whether a focus of this ghost could reach the air's breakdown
 * irradiance: nowhere is an axis narrower than its own waist, w0² = M²λ
 * Im q/π (Kogelnik & Li 1966, eq. 21 at the waist), so 2P/(π w0x w0y) of
 * the pulse's peak power bounds every focus it has.  Squared, that is
 * (c->spark_a p)² against c->spark_b M²x M²y Im qx Im qy (ghost_run
 * sets both; the 0.999 in spark_b keeps rounding on the safe side).  A
 * CW ghost never sparks. */
static int
ghost_may_spark(const struct ghost_ctx *c, const struct ghost_beam *gb, double p)
{
	double lhs = c->spark_a * p;

	if (!c->b->src.pulsed)
		return 0;
	return !(lhs * lhs < c->spark_b * gb->x.m2 * gb->y.m2 * cimag(gb->x.q) *
	    cimag(gb->y.q));
}

void
ghost_gap(struct ghost_ctx *c, struct ghost *g, size_t u, double z0, int dir,
    const struct ghost_beam *gb, double p)
{
	const struct bench *b = c->b;
	double len = c->t->rows[u].el->val[K_LENGTH], dz, wx, wy, w0x, w0y, ex, ey;
	struct ghost_beam end = *gb;
	struct ghost_focus *f;
	struct ghost_set *gs = c->gs;

	if (c->lean && !ghost_may_spark(c, gb, p))
		return;
	if (!beam_gap_focus(&gb->x, &gb->y, c->lam, len, 0, &dz, &wx, &wy))
		return;
	/* the same concentration rule as a main-beam focus */
	ghost_beam_radii(c, gb, &w0x, &w0y);
	ghost_beam_space(&end, len);
	ghost_beam_radii(c, &end, &ex, &ey);
	if (fmin(w0x * w0y, ex * ey) / (wx * wy) < TRACE_FOCUS_CONCENTRATION)
		return;
	if (gs->nfoci == gs->capfoci) {
		gs->capfoci = gs->capfoci ? 2 * gs->capfoci : 16;
		gs->foci = xreallocarray(gs->foci, gs->capfoci, sizeof *gs->foci);
	}
	f = &gs->foci[gs->nfoci++];
	g->nfoci++;
	f->z = z0 + dir * dz;
	f->wx = wx;
	f->wy = wy;
	f->gap = c->t->rows[u].el;
	f->gap_row = u;
	f->distance = fmin(dz, len - dz);
	f->peak_irradiance = damage_peak_irradiance(p, wx, wy);
	f->air_breakdown = 0;
	if (b->src.pulsed) {
		double e = p / b->src.rep_rate;

		f->peak_irradiance = damage_peak_irradiance(damage_peak_factor(b->src.shape) *
		    e / b->src.pulse_width, wx, wy);
		/* reported with the ghost's focus, not as a main-beam warning */
		f->air_breakdown = f->distance > TRACE_PLANE_TOL &&
		    f->peak_irradiance >= b->air_breakdown;
	}
}

double
ghost_meet(struct ghost_ctx *c, struct ghost *g, size_t u, const struct ghost_beam *gb,
    double p, struct ghost_row **kept)
{
	const struct ghost_pass *ps = &c->pass[u];
	double ix, iy;

	*kept = NULL;
	/* a lean walk reads nothing of an unrated row but what its aperture
	 * passes */
	if (c->lean && !ps->rated) {
		g->nrows++;
		if (isnan(ps->ap))
			return p;
		ghost_beam_inv2(c, gb, &ix, &iy);
		return ghost_clip(c, u, ix, iy, p);
	}
	ghost_beam_inv2(c, gb, &ix, &iy);
	*kept = ghost_add_row(c, g, u, ix, iy, p);
	return ghost_clip(c, u, ix, iy, p);
}

double
ghost_clip(const struct ghost_ctx *c, size_t u, double ix, double iy, double p)
{
	double a = c->pass[u].ap;

	/* NAN: no aperture; 2a²/w² of the narrower inverse at 38 or more:
	 * all of it passes (beam_clip_transmission) without the roots */
	if (isnan(a) || 2 * a * a * fmin(ix, iy) >= 38)
		return p;
	return p * beam_clip_transmission(1 / sqrt(ix), 1 / sqrt(iy), a);
}

void
ghost_add_stray(struct ghost_ctx *c, const struct element *el, const char *what, double p,
    double focus_distance)
{
	struct ghost_set *gs = c->gs;
	const struct source *src = &c->b->src;
	struct ghost_stray *s;

	if (!(p > c->floor))
		return;
	if (gs->nstrays == gs->capstrays) {
		gs->capstrays = gs->capstrays ? 2 * gs->capstrays : 16;
		gs->strays = xreallocarray(gs->strays, gs->capstrays, sizeof *gs->strays);
	}
	s = &gs->strays[gs->nstrays++];
	s->from = el;
	s->what = what;
	s->power = p;
	s->peak_power = src->pulsed ?
	    damage_peak_factor(src->shape) * (p / src->rep_rate) / src->pulse_width : NAN;
	s->focus_distance = focus_distance;
}

/* ---- first order: back upstream ---- */

/* The ghost g leaves row `from` upstream with axes x, y and power p. */
static void
walk_back(struct ghost_ctx *c, struct ghost *g, long from, const struct beam_axis *x0,
    const struct beam_axis *y0, double p)
{
	const struct trace *t = c->t;
	const struct element *branch_owner = t->rows[from].parent;
	long u = c->prev[from];
	size_t gi = (size_t)(g - c->gs->g), npend = 0;
	struct ghost_beam gb;

	ghost_beam_set(&gb, x0, y0);
	while (u >= 0 && p > c->floor) {
		const struct trace_row *tr = &t->rows[u];
		const struct ghost_pass *ps = &c->pass[u];
		const struct element *el = tr->el;
		struct ghost_row *kept;
		double pin, out, toward, other, lost;
		int side;

		if (ps->space) {
			double len = el->val[K_LENGTH];

			ghost_gap(c, g, (size_t)u, tr->z + len, -1, &gb, p);
			g = &c->gs->g[gi];
			ghost_beam_space(&gb, len);
		}
		pin = p;
		p = ghost_meet(c, g, (size_t)u, &gb, p, &kept);
		if (ps->space) {
			if (kept != NULL)
				kept->power_lost = pin - p;
			from = u;
			u = c->prev[u];
			continue;
		}
		/* a second reflection here, forward again: second order, traced
		 * once this ghost is done (its rows stay together) */
		if (tr->parent == branch_owner && ghost_untilted(c, el) &&
		    (el->type != EL_SPLITTER || el->side_port == PORT_REFLECTED)) {
			struct ghost_pending *q;

			if (c->npend + npend == c->cappend) {
				c->cappend = c->cappend ? 2 * c->cappend : 16;
				c->pend = xreallocarray(c->pend, c->cappend, sizeof *c->pend);
			}
			q = &c->pend[c->npend + npend++];
			q->row = (size_t)u;
			q->x = gb.x;
			q->y = gb.y;
			q->p = p;
		}
		/* reciprocity: the fraction the forward beam came by */
		side = t->rows[from].parent == el;
		toward = side ? ps->back_side : ps->back_same;
		other = side ? ps->stray_side : ps->stray_same;
		out = p * toward;
		/* one stray per splitter, every ghost's share summed (the beam
		 * that must be blocked there): made once the walks are done */
		if (ps->side)
			c->fourth[u] += p * other;
		lost = pin - out - (ps->side ? p * other : 0);
		if (kept != NULL)
			kept->power_lost = lost;
		c->acc[u].power_lost += lost;
		ghost_beam_optics(c, (size_t)u, 1, &gb);
		p = out;
		from = u;
		u = c->prev[u];
	}
	if (u < 0 && p > c->floor)
		c->gs->return_power += p;
	{
		struct ghost first = c->gs->g[gi];    /* a copy: the set grows */

		for (size_t i = 0; i < npend; i++) {
			struct ghost_pending q = c->pend[c->npend + i];

			ghost_second_at(c, &first, q.row, &q.x, &q.y, q.p);
		}
	}
}

/* The two reflections of an element the main beam passes. */
static void
first_order(struct ghost_ctx *c, size_t r)
{
	const struct trace_row *tr = &c->t->rows[r];
	const struct element *el = tr->el;
	double pc = ghost_p_clip(tr), n = thick_index(el, c->lam);
	double r1, r2, rf, rb, tb, tsp = 1, pf, pb, pwf, pwb;
	unsigned flags = 0, fl_f = 0, fl_b = 0;
	int assumed, tilted = !ghost_untilted(c, el);
	struct beam_axis x, y;

	if (!(pc > c->floor))
		return;
	ghost_radii(el, c->lam, &r1, &r2, &assumed);
	if (assumed)
		flags |= GF_SHAPE_ASSUMED;
	rf = ghost_surface_r(c, r, GS_FRONT, &fl_f);
	rb = ghost_surface_r(c, r, GS_BACK, &fl_b);
	tb = ghost_bulk(el, rf, rb);
	if (el->type == EL_SPLITTER) {
		/* the front is the split coating; the back sees what it passes */
		double s[4], mo, so;

		for (int i = 0; i < 4; i++)
			s[i] = tr->stokes[i] * (1 - tr->clip_loss);
		trace_element_ports(el, c->lam, s, &mo, &so);
		tsp = (el->side_port == PORT_REFLECTED ? mo : so) / pc;
		pf = 0;
		pb = pc * tsp * tsp * rb;
	} else {
		pf = pc * rf;
		pb = pc * (1 - rf) * (1 - rf) * rb * tb * tb;
	}
	pwf = ghost_power_front_outside(r1);
	pwb = ghost_power_back_inside(n, r1, r2);
	if (tilted) {
		/* off the axis at twice the aoi: strays, with where they focus */
		for (int k = 0; k < 2; k++) {
			double pw = k ? pwb : pwf, fd = NAN;

			x = tr->qx;
			y = tr->qy;
			if (pw != 0) {
				ghost_mirror(el, pw, &x, &y);
				fd = fmin(beam_waist_distance(&x), beam_waist_distance(&y));
				if (!(fd > 0))
					fd = NAN;       /* diverging: no focus */
			}
			ghost_add_stray(c, el, k ? "back" : "front", k ? pb : pf, fd);
		}
		return;
	}
	for (int k = 0; k < 2; k++) {
		double p = k ? pb : pf;
		struct ghost *g;

		if (!(p > c->floor))
			continue;
		x = tr->qx;
		y = tr->qy;
		ghost_mirror(el, k ? pwb : pwf, &x, &y);
		g = ghost_new(c, 1, (k ? fl_f | fl_b : fl_f) | (el->type == EL_LENS ? flags : 0));
		g->surf_el[0] = el;
		g->surf[0] = k ? GS_BACK : GS_FRONT;
		g->power_start = p;
		walk_back(c, g, (long)r, &x, &y, p);
	}
}

/* Light that leaves the beam line by a mirror's back or a reflective ND. */
static void
side_strays(struct ghost_ctx *c, size_t r)
{
	const struct trace_row *tr = &c->t->rows[r];
	const struct element *el = tr->el;
	double pc = ghost_p_clip(tr);

	if (el->type == EL_MIRROR && model_has(el, K_LEAK))
		ghost_add_stray(c, el, "leak", pc * el->val[K_LEAK], NAN);
	if (el->type == EL_FILTER && model_get(el, K_REFLECTIVE) != 0) {
		double tf = model_has(el, K_OD) ? pow(10, -el->val[K_OD]) :
		    model_get(el, K_TRANSMISSION);

		ghost_add_stray(c, el, "reflected", pc * (1 - tf), NAN);
	}
}

/* prev and next of every row, from the depth-first order: a side branch
 * follows its owner's row, so the last row seen one level up is it. */
static void
link_rows(struct ghost_ctx *c)
{
	const struct trace *t = c->t;
	size_t maxd = 0;
	long *last;

	for (size_t i = 0; i < t->nrows; i++)
		if (t->rows[i].depth > maxd)
			maxd = t->rows[i].depth;
	last = ghost_scratch_longs(c->t->gscratch, maxd + 2);
	for (size_t d = 0; d <= maxd + 1; d++)
		last[d] = -1;
	for (size_t i = 0; i < t->nrows; i++) {
		unsigned d = t->rows[i].depth;

		c->next[i] = -1;
		if (last[d] >= 0) {
			c->prev[i] = last[d];
			c->next[last[d]] = (long)i;
		} else {
			c->prev[i] = d > 0 ? last[d - 1] : -1;
		}
		last[d] = (long)i;
		last[d + 1] = -1;       /* a deeper branch after this row is new */
	}
}

/* The element's own rating with the ghosts that met it added, coaxial and
 * centred; then worst and safe_source_power again. */
static void
combine(struct ghost_ctx *c)
{
	struct trace *t = c->t;
	const struct bench *b = c->b;

	t->worst = -1;
	t->worst_el = NULL;
	t->worst_ratio = NAN;
	for (size_t i = 0; i < t->nrows; i++) {
		struct trace_row *r = &t->rows[i];
		const struct ghost_acc *a = &c->acc[i];

		c->gs->at[i].main_ratio = r->ratio;
		c->gs->at[i].fluence = b->src.pulsed ? a->fluence : NAN;
		c->gs->at[i].linear_density = a->linear_density;
		c->gs->at[i].power_lost = a->power_lost;
		if (a->met && a->power_in > 0) {
			struct damage_exposure ex;

			ex.power_in = r->power_in + a->power_in;
			ex.power_lost = r->power_lost + a->power_lost;
			ex.linear_density = r->linear_density + a->linear_density;
			ex.irradiance = r->irradiance + a->irradiance;
			ex.fluence = b->src.pulsed ? r->fluence + a->fluence : NAN;
			r->flags |= TF_GHOSTS;
			if (damage_rated(&r->limits)) {
				r->ratio = damage_ratio(&r->limits, &ex);
				if (!isfinite(r->ratio))
					r->ratio = INFINITY;
				r->status = damage_status_of(r->ratio, b->safety_factor);
			}
		}
		if (!isnan(r->ratio) && (t->worst < 0 || r->ratio > t->worst_ratio)) {
			t->worst = (long)i;
			t->worst_el = r->el;
			t->worst_ratio = r->ratio;
		}
	}
	t->safe_source_power = NAN;
	if (t->worst >= 0)
		t->safe_source_power = t->worst_ratio > 0 ?
		    b->src.power / (b->safety_factor * t->worst_ratio) : INFINITY;
}

/* Ghosts that never reach an element are dropped (their power may still
 * have reached the source); rows and foci move with the ones kept. */
static void
compact(struct ghost_scratch *s, struct ghost_set *gs, size_t nrows)
{
	size_t k = 0;
	long *to = ghost_scratch_longs(s, gs->n);

	for (size_t i = 0; i < gs->n; i++) {
		to[i] = gs->g[i].nrows > 0 ? (long)k : -1;
		if (gs->g[i].nrows > 0)
			gs->g[k++] = gs->g[i];
	}
	for (size_t u = 0; u < nrows; u++)
		if (gs->at[u].top >= 0)
			gs->at[u].top = to[gs->at[u].top];
	gs->n = k;
}

static void
warnings(struct ghost_ctx *c)
{
	struct trace *t = c->t;
	struct ghost_set *gs = c->gs;

	gs->nover = 0;
	for (size_t i = 0; i < gs->n; i++) {
		const struct ghost *g = &gs->g[i];

		if (g->flags & GF_OVER) {
			const struct trace_row *tr = &t->rows[g->worst_row];

			gs->nover++;
			trace_add_warning(t, TW_GHOST_OVER, tr->parent, tr->port, tr->el,
			    g->worst_ratio);
		}
	}
	/* a ghost focus that sparks is a spark like the main beam's: one
	 * warning per gap, for the brightest (ghost-conventions.md: foci
	 * with air_breakdown as for main-beam foci) */
	{
		long *spark = ghost_scratch_longs(t->gscratch, t->nrows);

		for (size_t u = 0; u < t->nrows; u++)
			spark[u] = -1;
		for (size_t k = 0; k < gs->nfoci; k++) {
			const struct ghost_focus *f = &gs->foci[k];

			if (f->air_breakdown && (spark[f->gap_row] < 0 ||
			    f->peak_irradiance > gs->foci[spark[f->gap_row]].peak_irradiance))
				spark[f->gap_row] = (long)k;
		}
		for (size_t u = 0; u < t->nrows; u++)
			if (spark[u] >= 0) {
				const struct ghost_focus *f = &gs->foci[spark[u]];
				const struct trace_row *tr = &t->rows[u];
				struct trace_warning *w;

				trace_add_warning(t, TW_AIR_BREAKDOWN, tr->parent, tr->port, f->gap,
				    f->peak_irradiance);
				w = &t->warn[t->nwarn - 1];
				w->ghost = 1;
				w->distance = f->distance;
			}
	}
	for (size_t i = 0; i < gs->nstrays; i++)
		if (gs->strays[i].power >= c->b->stray_warn) {
			trace_add_warning(t, TW_STRAY, NULL, PORT_NONE, gs->strays[i].from,
			    gs->strays[i].power);
			t->warn[t->nwarn - 1].surface = gs->strays[i].what;
		}
	if (!isnan(c->b->src.max_return) && gs->return_power > c->b->src.max_return)
		trace_add_warning(t, TW_RETURN_POWER, NULL, PORT_NONE, NULL, gs->return_power);
}

/* What every ghost meets at each row (struct ghost_pass). */
static void
prepare(struct ghost_ctx *c)
{
	const struct trace *t = c->t;

	for (size_t u = 0; u < t->nrows; u++) {
		const struct trace_row *tr = &t->rows[u];
		const struct element *el = tr->el;
		struct ghost_pass *ps = &c->pass[u];
		double pc = ghost_p_clip(tr), a, s[4], mo = 0, so = 0;

		memset(ps, 0, sizeof *ps);
		ps->space = el->type == EL_SPACE;
		ps->term = model_type_is_terminator(el->type);
		ps->rated = damage_rated(&tr->limits);
		ps->linear = !isnan(tr->limits.cw_linear);
		ps->side = el->side_port != PORT_NONE;
		a = model_has(el, K_APERTURE) ? el->val[K_APERTURE] : NAN;
		if (el->type == EL_IRIS && !(a < el->val[K_DIAMETER]))
			a = el->val[K_DIAMETER];
		ps->ap = a / 2;
		if (pc > 0 && !ps->space) {
			for (int i = 0; i < 4; i++)
				s[i] = tr->stokes[i] * (1 - tr->clip_loss);
			trace_element_ports(el, c->lam, s, &mo, &so);
		}
		if (el->type == EL_ISOLATOR) {
			ps->back_same = ps->back_side = pow(10, -el->val[K_ISOLATION] / 10);
			ps->fwd = model_get(el, K_TRANSMISSION);
		} else if (pc > 0) {
			ps->back_same = mo / pc;
			ps->stray_same = so / pc;
			ps->back_side = so / pc;
			ps->stray_side = mo / pc;
			ps->fwd = mo / pc;
		}
		/* the optics, as trace_element_optics applies them */
		ps->optic = GO_GENERAL;
		ps->sym = 0;
		ps->fx = ps->fy = INFINITY;
		switch (el->type) {
		case EL_MIRROR:
			if (!model_has(el, K_ROC)) {
				ps->optic = GO_NONE;
				break;
			}
			beam_mirror_focal(el->val[K_ROC], model_get(el, K_AOI), &ps->fx, &ps->fy);
			ps->optic = GO_THIN;
			ps->sym = ps->fx == ps->fy;
			break;
		case EL_LENS:
			/* a thin lens by its focal length alone (the radii, when
			 * given, fix the shape: thick_apply) */
			if (model_has(el, K_FOCAL) && !model_has(el, K_R1) && !model_has(el, K_R2) &&
			    !(model_has(el, K_THICKNESS) &&
			    el->val[K_THICKNESS] != 0)) {
				int ax = (int)model_get(el, K_AXIS);

				ps->optic = GO_THIN;
				if (ax != AXIS_Y)
					ps->fx = el->val[K_FOCAL];
				if (ax != AXIS_X)
					ps->fy = el->val[K_FOCAL];
				ps->sym = ax == AXIS_BOTH;
			}
			break;
		case EL_WINDOW:
			if (!(model_has(el, K_THICKNESS) && el->val[K_THICKNESS] != 0))
				ps->optic = GO_NONE;
			break;
		default:
			ps->optic = GO_NONE;
			break;
		}
	}
}

/* ---- two halves of the bench, one thread each ---- */

/* A share of the surface rows, walked with its own sums and ghost set;
 * prev, next and pass are the whole trace's, read only. */
struct ghost_part {
	struct ghost_ctx c;
	size_t           r0, r1;
};

/* n empty summaries: no ghost met, nothing rated yet. */
static void
at_init(struct ghost_at *at, size_t n)
{
	memset(at, 0, n * sizeof *at);
	for (size_t r = 0; r < n; r++) {
		at[r].top = -1;
		at[r].main_ratio = at[r].top_ratio = NAN;
	}
}

/* Part k of the walk, with set gs, over rows r0 .. r1-1; its sums are
 * the scratch's k-th. */
static void
part_init(struct ghost_part *pt, const struct ghost_ctx *whole, struct ghost_set *gs, int k,
    size_t r0, size_t r1)
{
	struct ghost_scratch *s = whole->t->gscratch;
	size_t n = whole->t->nrows;

	pt->c = *whole;
	pt->c.gs = gs;
	pt->c.acc = s->acc[k];
	pt->c.fourth = s->fourth[k];
	memset(pt->c.acc, 0, n * sizeof *pt->c.acc);
	memset(pt->c.fourth, 0, n * sizeof *pt->c.fourth);
	pt->c.pend = s->pend[k];
	pt->c.cappend = s->cappend[k];
	pt->c.npend = 0;
	gs->rows_kept = whole->keep_rows;
	at_init(gs->at, n);
	pt->r0 = r0;
	pt->r1 = r1;
}

/* The pending list (grown by the walk) back to the scratch. */
static void
part_done(struct ghost_part *pt, int k)
{
	struct ghost_scratch *s = pt->c.t->gscratch;

	s->pend[k] = pt->c.pend;
	s->cappend[k] = pt->c.cappend;
}

static void *
part_walk(void *arg)
{
	struct ghost_part *pt = arg;
	struct ghost_ctx *c = &pt->c;

	for (size_t r = pt->r0; r < pt->r1; r++) {
		const struct element *el = c->t->rows[r].el;

		side_strays(c, r);
		if (!ghost_has_surfaces(el))
			continue;
		first_order(c, r);
		if (ghost_untilted(c, el) && el->type != EL_SPLITTER)
			ghost_second_double(c, r);
	}
	return NULL;
}

/* Appends b's ghosts, rows, foci and strays to a's, and adds its sums:
 * a's rows come first in the bench, so the order is the one a single walk
 * gives. */
static void
part_merge(struct ghost_part *a, struct ghost_part *b)
{
	struct ghost_set *ga = a->c.gs, *gb = b->c.gs;
	size_t n0 = ga->n, nr0 = ga->nrows, nf0 = ga->nfoci;

	for (size_t i = 0; i < gb->n; i++) {
		struct ghost *g = ghost_new(&a->c, gb->g[i].order, 0);

		*g = gb->g[i];
		g->row0 += nr0;
		g->focus0 += nf0;
	}
	if (gb->nrows > 0) {
		ga->rows = xreallocarray(ga->rows, nr0 + gb->nrows, sizeof *ga->rows);
		memcpy(ga->rows + nr0, gb->rows, gb->nrows * sizeof *gb->rows);
		ga->nrows = ga->caprows = nr0 + gb->nrows;
	}
	if (gb->nfoci > 0) {
		ga->foci = xreallocarray(ga->foci, nf0 + gb->nfoci, sizeof *ga->foci);
		memcpy(ga->foci + nf0, gb->foci, gb->nfoci * sizeof *gb->foci);
		ga->nfoci = ga->capfoci = nf0 + gb->nfoci;
	}
	if (gb->nstrays > 0) {
		ga->strays = xreallocarray(ga->strays, ga->nstrays + gb->nstrays, sizeof *ga->strays);
		memcpy(ga->strays + ga->nstrays, gb->strays, gb->nstrays * sizeof *gb->strays);
		ga->nstrays = ga->capstrays = ga->nstrays + gb->nstrays;
	}
	ga->return_power += gb->return_power;
	for (size_t u = 0; u < a->c.t->nrows; u++) {
		struct ghost_at *x = &ga->at[u];
		const struct ghost_at *y = &gb->at[u];
		struct ghost_acc *p = &a->c.acc[u];
		const struct ghost_acc *q = &b->c.acc[u];

		x->nmet += y->nmet;
		x->power_in += y->power_in;
		x->irradiance += y->irradiance;
		/* strictly more, as a single walk keeps the first of equals */
		if (y->top >= 0 && (x->top < 0 || (a->c.pass[u].rated ?
		    y->top_ratio > x->top_ratio : y->top_irradiance > x->top_irradiance))) {
			x->top = y->top + (long)n0;
			x->top_ratio = y->top_ratio;
			x->top_irradiance = y->top_irradiance;
			x->top_power = y->top_power;
		}
		p->irradiance += q->irradiance;
		p->linear_density += q->linear_density;
		p->fluence += q->fluence;
		p->power_in += q->power_in;
		p->power_lost += q->power_lost;
		p->met |= q->met;
		a->c.fourth[u] += b->c.fourth[u];
	}
}

/* The row where the work left of it equals the work right of it, by an
 * estimate of the ghost-element visits each surface row costs (an upper
 * bound: ghosts that fade below the floor or stop early cost less).  Depends on the bench alone, so the halves (and so the sums' order
 * of addition) are the same whether they run in one thread or two. */
static size_t
split_row(const struct ghost_ctx *c, double *total)
{
	size_t n = c->t->nrows, m = 0;
	/* every entry is written before it is read (prev < u < next) */
	double *up = c->t->gscratch->split, *down = up + n, *pre = down + n, *cost = pre + n;
	double sum = 0, run = 0;

	for (size_t u = n; u-- > 0;)
		down[u] = c->next[u] >= 0 ? down[c->next[u]] + 1 : 0;
	for (size_t u = 0; u < n; u++) {
		long v = c->prev[u];

		up[u] = v >= 0 ? up[v] + 1 : 0;
		pre[u] = v >= 0 ? pre[v] + (ghost_has_surfaces(c->t->rows[v].el) ? down[v] : 0) : 0;
		/* two first-order ghosts walk up; each meets every upstream
		 * surface's two reflections (four walks down); one double
		 * bounce walks down */
		cost[u] = ghost_has_surfaces(c->t->rows[u].el) ?
		    1 + 2 * up[u] + 4 * pre[u] + down[u] : 1;
		sum += cost[u];
	}
	while (m < n && run + cost[m] <= sum / 2)
		run += cost[m++];
	*total = sum;
	return m;
}

/* Below this many estimated visits a second thread costs more than it
 * saves (the demo has ~10³; a 200-surface chain ~5·10⁶). */
#define GHOST_THREAD_WORK 2e5

void
ghost_run(struct trace *t, unsigned opts)
{
	struct ghost_ctx c;
	struct ghost_part half[2];
	struct ghost_scratch *sc;
	struct ghost_set *second;
	double work;
	size_t m;
	pthread_t th;
	int threaded = 0;

	if (t->gscratch == NULL)
		t->gscratch = xcalloc(1, sizeof *t->gscratch);
	sc = t->gscratch;
	memset(&c, 0, sizeof c);
	c.t = t;
	c.b = t->bench;
	c.gs = t->ghosts = ghost_scratch_take_set(sc, 0, t->nrows);
	c.keep_rows = c.gs->rows_kept = (opts & GHOST_ROWS) != 0;
	c.lean = (opts & GHOST_LEAN) != 0 && !c.keep_rows;
	c.inv_rep = c.b->src.pulsed ? 1 / c.b->src.rep_rate : NAN;
	c.floor = GHOST_FLOOR * c.b->src.power;
	c.lam = c.b->src.wavelength;
	if (c.b->src.pulsed) {
		const struct source *s = &c.b->src;
		double lim = 0.999 * c.b->air_breakdown * c.lam;

		/* ghost_may_spark: 2P_peak/(π w0x w0y) = 2P_peak/(λ √(M²x M²y Im qx Im qy)) */
		c.spark_a = 2 * damage_peak_factor(s->shape) / (s->rep_rate * s->pulse_width);
		c.spark_b = lim * lim;
	}
	if (t->nrows == 0)
		return;
	ghost_scratch_rows(sc, t->nrows);
	c.prev = sc->prev;
	c.next = sc->next;
	c.pass = sc->pass;
	link_rows(&c);
	m = split_row(&c, &work);
	c.gs->work = work;
	if (work > GHOST_WORK_LIMIT) {
		/* an empty summary per row, as readers expect one */
		at_init(c.gs->at, t->nrows);
		/* said by trace_check: never a silent main-beam-only rating */
		c.gs->refused = 1;
		return;
	}
	if (c.keep_rows && work > GHOST_ROWS_LIMIT) {
		c.keep_rows = c.gs->rows_kept = 0;
		c.gs->rows_omitted = 1;
	}
	prepare(&c);
	if (opts & GHOST_ONE_PART)
		m = t->nrows;
	second = ghost_scratch_take_set(sc, 1, t->nrows);
	part_init(&half[0], &c, c.gs, 0, 0, m);
	part_init(&half[1], &c, second, 1, m, t->nrows);
	if (!(opts & GHOST_ONE_PART) && work > GHOST_THREAD_WORK &&
	    pthread_create(&th, NULL, part_walk, &half[1]) == 0)
		threaded = 1;
	part_walk(&half[0]);
	if (threaded)
		pthread_join(th, NULL);
	else
		part_walk(&half[1]);
	part_merge(&half[0], &half[1]);
	part_done(&half[1], 1);
	ghost_scratch_put_set(sc, 1, second);
	c = half[0].c;
	for (size_t u = 0; u < t->nrows; u++)
		ghost_add_stray(&c, t->rows[u].el, "fourth_port", c.fourth[u], NAN);
	compact(sc, c.gs, t->nrows);
	combine(&c);
	warnings(&c);
	part_done(&half[0], 0);
}
