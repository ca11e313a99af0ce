/* core-ghost.c - first-order ghosts and strays (ghost-conventions.md); the
 * run over a trace and the combined rating are core-ghost-run.c's.  Every untilted glass surface sends its residual
 * reflection back up the beam; the ghost retraces the elements it came
 * through, each passing the fraction it passed forward (an isolator its
 * isolation), and is rated at every element it meets. */
#include <config.h>

#include <complex.h>
#include <math.h>
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
void
ghost_first_order(struct ghost_ctx *c, size_t r)
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
void
ghost_side_strays(struct ghost_ctx *c, size_t r)
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
