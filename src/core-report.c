/* core-report.c - the printed review's geometry: branch profiles sampled
 * through the trace's own numbers, labels spread over levels, the table
 * cut into pages, and the chain schematic placed on a grid.  Nothing here
 * knows about cairo or pages in points beyond the numbers it is given. */
#include <config.h>

#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "core-layout.h"
#include "core-report.h"
#include "util-err.h"

static int
same_branch(const struct trace_row *a, const struct trace_row *b)
{
	return a->parent == b->parent && a->port == b->port;
}

size_t
rep_branch_ends(const struct trace *t, size_t **ends)
{
	size_t n = 0, *out = xreallocarray(NULL, t->nrows ? t->nrows : 1, sizeof *out);

	/* a branch's first row comes in path order; its end is its last row */
	for (size_t i = 0; i < t->nrows; i++) {
		size_t last = i;
		int first = 1;

		for (size_t j = 0; j < i; j++)
			if (same_branch(&t->rows[j], &t->rows[i])) {
				first = 0;
				break;
			}
		if (!first)
			continue;
		for (size_t j = i + 1; j < t->nrows; j++)
			if (same_branch(&t->rows[j], &t->rows[i]))
				last = j;
		out[n++] = last;
	}
	*ends = out;
	return n;
}

static void
add_sample(struct rep_profile *p, size_t *cap, double z, double wx, double wy, double pw)
{
	if (p->ns == *cap) {
		*cap = *cap ? *cap * 2 : 64;
		p->s = xreallocarray(p->s, *cap, sizeof *p->s);
	}
	p->s[p->ns++] = (struct rep_sample){ z, wx, wy, pw };
}

static void
add_mark(struct rep_profile *p, size_t row, double z, int focus)
{
	p->mark = xreallocarray(p->mark, p->nmark + 1, sizeof *p->mark);
	p->mark[p->nmark++] = (struct rep_mark){ row, z, focus };
}

int
rep_profile_build(const struct trace *t, size_t end, int per_gap, struct rep_profile *p)
{
	size_t cap = 0;
	double rmax = 0, pmax = 0;

	memset(p, 0, sizeof *p);
	if (end >= t->nrows)
		return -1;
	trace_branch_name(t->rows[end].parent, t->rows[end].port, p->branch, sizeof p->branch);
	p->npath = layout_profile_path(t, end, &p->path);
	if (p->npath == 0) {
		free(p->path);
		p->path = NULL;
		return -1;
	}
	if (per_gap < 1)
		per_gap = 1;
	for (size_t i = 0; i < p->npath; i++) {
		const struct trace_row *r = &t->rows[p->path[i]];

		if (r->el->type == EL_SPACE) {
			double len = model_get(r->el, K_LENGTH);

			for (int k = 0; k <= per_gap; k++) {
				double dz = len * k / per_gap, wx, wy;

				if (k == 0) {
					wx = r->wx;
					wy = r->wy;
				} else {
					trace_radius_at(t, r, dz, &wx, &wy);
				}
				add_sample(p, &cap, r->z + dz, wx, wy, r->power_in);
			}
		} else {
			/* the plane itself: the power arriving, then what leaves */
			add_sample(p, &cap, r->z, r->wx, r->wy, r->power_in);
			add_sample(p, &cap, r->z, r->wx, r->wy, r->power_out);
			add_mark(p, p->path[i], r->z, 0);
		}
		if (r->has_focus)
			add_mark(p, p->path[i], r->focus.z, 1);
	}
	for (size_t i = 0; i < p->ns; i++) {
		if (p->s[i].wx > rmax)
			rmax = p->s[i].wx;
		if (p->s[i].wy > rmax)
			rmax = p->s[i].wy;
		if (p->s[i].power > pmax)
			pmax = p->s[i].power;
	}
	p->z0 = p->s[0].z;
	p->z1 = p->s[p->ns - 1].z;
	if (!(p->z1 > p->z0))
		p->z1 = p->z0 + 1e-3;
	p->rmax = layout_nice_ceil(rmax * 1.05);
	p->pmax = layout_nice_ceil(pmax * 1.05);
	if (!(p->rmax > 0))
		p->rmax = 1e-3;
	if (!(p->pmax > 0))
		p->pmax = 1e-3;
	return 0;
}

void
rep_profile_release(struct rep_profile *p)
{
	free(p->path);
	free(p->s);
	free(p->mark);
	memset(p, 0, sizeof *p);
}

double
rep_map(double v, double v0, double v1, double p0, double p1)
{
	if (v1 == v0)
		return p0;
	return p0 + (v - v0) * (p1 - p0) / (v1 - v0);
}

/* ---- labels ---- */

struct lab_ord {
	double x;
	int    prio;
	size_t i;
};

static int
cmp_lab(const void *a, const void *b)
{
	const struct lab_ord *p = a, *q = b;

	if (p->prio != q->prio)
		return p->prio > q->prio ? -1 : 1;
	if (p->x != q->x)
		return p->x < q->x ? -1 : 1;
	return p->i < q->i ? -1 : p->i > q->i;
}

int
rep_labels_spread(const double *x, const double *w, const int *prio, size_t n, double gap,
    int max_levels, int *level, size_t *crowded)
{
	struct lab_ord *ord;
	size_t *placed, np = 0;     /* labels placed so far, by index */
	int used = 0;

	if (crowded != NULL)
		*crowded = 0;
	if (n == 0)
		return 0;
	if (max_levels < 1)
		max_levels = 1;
	ord = xreallocarray(NULL, n, sizeof *ord);
	placed = xreallocarray(NULL, n, sizeof *placed);
	for (size_t i = 0; i < n; i++)
		ord[i] = (struct lab_ord){ x[i], prio != NULL ? prio[i] : 0, i };
	qsort(ord, n, sizeof *ord, cmp_lab);
	for (size_t k = 0; k < n; k++) {
		size_t i = ord[k].i;
		int l;

		for (l = 0; l < max_levels; l++) {
			int clear = 1;

			for (size_t j = 0; j < np && clear; j++) {
				size_t o = placed[j];

				if (level[o] == l && x[i] - w[i] / 2 < x[o] + w[o] / 2 + gap &&
				    x[o] - w[o] / 2 < x[i] + w[i] / 2 + gap)
					clear = 0;
			}
			if (clear)
				break;
		}
		if (l == max_levels) {
			level[i] = -1;
			if (crowded != NULL)
				(*crowded)++;
			continue;
		}
		level[i] = l;
		placed[np++] = i;
		if (l + 1 > used)
			used = l + 1;
	}
	free(ord);
	free(placed);
	return used;
}

/* ---- pages ---- */

size_t
rep_paginate(const double *h, size_t n, double first, double rest, double header,
    size_t *page)
{
	size_t pg = 0;
	double left = first - header;
	int empty = 1;              /* a page with no row yet takes any row */

	if (n == 0)
		return 0;
	for (size_t i = 0; i < n; i++) {
		if (h[i] > left && !empty) {
			pg++;
			left = rest - header;
		}
		page[i] = pg;
		left -= h[i];
		empty = 0;
	}
	return pg + 1;
}

/* ---- the schematic ---- */

struct grid {
	unsigned char *busy;        /* lanes * cols */
	int            lanes, cols;
};

static int
grid_busy(const struct grid *g, int lane, int col)
{
	return lane < g->lanes && col < g->cols && g->busy[(size_t)lane * (size_t)g->cols + (size_t)col];
}

static void
grid_set(struct grid *g, int lane, int col)
{
	if (lane >= g->lanes) {
		g->busy = xreallocarray(g->busy, (size_t)(lane + 1) * (size_t)g->cols, 1);
		memset(g->busy + (size_t)g->lanes * (size_t)g->cols, 0,
		    (size_t)(lane + 1 - g->lanes) * (size_t)g->cols);
		g->lanes = lane + 1;
	}
	g->busy[(size_t)lane * (size_t)g->cols + (size_t)col] = 1;
}

void
rep_schematic_build(const struct trace *t, struct rep_schematic *sc)
{
	long *cell_of = xreallocarray(NULL, t->nrows ? t->nrows : 1, sizeof *cell_of);
	struct grid g = { NULL, 0, 0 };
	size_t nb;
	size_t *ends;

	memset(sc, 0, sizeof *sc);
	sc->cell = xreallocarray(NULL, t->nrows ? t->nrows : 1, sizeof *sc->cell);
	/* columns first: one after the other along each branch */
	for (size_t i = 0; i < t->nrows; i++) {
		const struct trace_row *r = &t->rows[i];
		long prev = -1, owner = -1;
		double gap = 0;
		int col = 0;

		cell_of[i] = -1;
		if (r->el->type == EL_SPACE)
			continue;
		for (size_t j = i; j-- > 0;) {
			if (same_branch(&t->rows[j], r)) {
				if (t->rows[j].el->type == EL_SPACE) {
					gap += model_get(t->rows[j].el, K_LENGTH);
					continue;
				}
				prev = cell_of[j];
				break;
			}
		}
		if (prev >= 0) {
			col = sc->cell[prev].col + 1;
		} else if (r->parent != NULL) {
			for (size_t j = 0; j < i; j++)
				if (t->rows[j].el == r->parent) {
					owner = cell_of[j];
					break;
				}
			col = owner >= 0 ? sc->cell[owner].col + 1 : 0;
		}
		cell_of[i] = (long)sc->n;
		sc->cell[sc->n++] = (struct rep_cell){ i, col, 0, prev, owner, gap };
		if (col + 1 > sc->cols)
			sc->cols = col + 1;
	}
	/* then lanes, branch by branch in path order */
	g.cols = sc->cols > 0 ? sc->cols : 1;
	nb = rep_branch_ends(t, &ends);
	for (size_t b = 0; b < nb; b++) {
		const struct trace_row *e = &t->rows[ends[b]];
		long first = -1, own = -1;
		int lo = 0, hi = -1, lane = 0, l0 = 0;

		for (size_t k = 0; k < sc->n; k++)
			if (same_branch(&t->rows[sc->cell[k].row], e)) {
				if (first < 0)
					first = (long)k;
				hi = sc->cell[k].col;
			}
		if (first < 0)
			continue;           /* a branch of spaces only */
		own = sc->cell[first].owner;
		lo = sc->cell[first].col;
		if (own >= 0) {
			/* the drop runs half a column after the splitter, between
			 * cells, so it crosses at most a beam line, never a symbol */
			l0 = sc->cell[own].lane;
			for (lane = l0 + 1;; lane++) {
				int free_run = 1;

				for (int c = lo; c <= hi && free_run; c++)
					if (grid_busy(&g, lane, c))
						free_run = 0;
				if (free_run)
					break;
			}
		}
		for (int c = lo; c <= hi; c++)
			grid_set(&g, lane, c);
		for (size_t k = 0; k < sc->n; k++)
			if (same_branch(&t->rows[sc->cell[k].row], e))
				sc->cell[k].lane = lane;
		if (lane + 1 > sc->lanes)
			sc->lanes = lane + 1;
	}
	free(ends);
	free(g.busy);
	free(cell_of);
}

void
rep_schematic_release(struct rep_schematic *sc)
{
	free(sc->cell);
	memset(sc, 0, sizeof *sc);
}

int
rep_schematic_strips(const struct rep_schematic *sc, int per_strip, int *strip_lanes,
    int *lane_row)
{
	int strips, lanes = sc->lanes > 0 ? sc->lanes : 1;
	int *used;                  /* per strip and lane: 0 unused, else row + 1 */

	if (per_strip < 1)
		per_strip = 1;
	strips = sc->cols > 0 ? (sc->cols + per_strip - 1) / per_strip : 0;
	if (strips == 0)
		return 0;
	used = xcalloc((size_t)strips * (size_t)lanes, sizeof *used);
	for (size_t k = 0; k < sc->n; k++) {
		const struct rep_cell *c = &sc->cell[k];
		int s = c->col / per_strip;

		used[(size_t)s * (size_t)lanes + (size_t)c->lane] = 1;
		/* the drop from a splitter in this strip passes the lanes between */
		if (c->owner >= 0 && sc->cell[c->owner].col / per_strip == s)
			for (int l = sc->cell[c->owner].lane; l < c->lane; l++)
				used[(size_t)s * (size_t)lanes + (size_t)l] = 1;
	}
	for (int s = 0; s < strips; s++) {
		int row = 0;

		for (int l = 0; l < lanes; l++)
			if (used[(size_t)s * (size_t)lanes + (size_t)l])
				used[(size_t)s * (size_t)lanes + (size_t)l] = ++row;
		strip_lanes[s] = row;
	}
	for (size_t k = 0; k < sc->n; k++) {
		const struct rep_cell *c = &sc->cell[k];

		lane_row[k] = used[(size_t)(c->col / per_strip) * (size_t)lanes + (size_t)c->lane] - 1;
	}
	free(used);
	return strips;
}
