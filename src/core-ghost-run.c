/* core-ghost-run.c - one ghost run over a trace (ghost-conventions.md):
 * the rows linked up and down the branches, the walk from every element
 * (split over two threads for a long bench, merged back in bench order),
 * the ghosts' exposure added to each element's own rating, and the
 * warnings.  The walks themselves are core-ghost.c's and
 * core-ghost-second.c's. */
#include <config.h>

#include <math.h>
#include <pthread.h>
#include <stdlib.h>
#include <string.h>

#include "core-ghost-impl.h"
#include "util-err.h"

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

		ghost_side_strays(c, r);
		if (!ghost_has_surfaces(el))
			continue;
		ghost_first_order(c, r);
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
