/* core-layout-profile.c - the beam-profile plot of the workbench laid out
 * without curses: the path from the source to the end of a branch, nice
 * scales and ticks, and the grid of glyph codes the profile screen paints.
 * Split from core-layout.c; see core-layout.h.  Owned by the workbench. */
#include <config.h>

#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "core-layout.h"
#include "util-err.h"

/* ---- the beam profile ---- */

static int
same_branch(const struct trace_row *r, const struct element *parent)
{
	return r->parent == parent;
}

size_t
layout_profile_path(const struct trace *t, size_t sel, size_t **idx)
{
	const struct element **anc = NULL;
	size_t nanc = 0, n = 0, level = 0;
	size_t *out;

	*idx = NULL;
	if (sel >= t->nrows)
		return 0;
	/* ancestors of sel's branch, innermost first: owners of side branches */
	for (const struct element *p = t->rows[sel].parent; p != NULL;) {
		const struct element *up = NULL;

		anc = xreallocarray(anc, nanc + 1, sizeof *anc);
		anc[nanc++] = p;
		for (size_t i = 0; i < t->nrows; i++)
			if (t->rows[i].el == p) {
				up = t->rows[i].parent;
				break;
			}
		p = up;
	}
	out = xreallocarray(NULL, t->nrows ? t->nrows : 1, sizeof *out);
	/* walk from main (parent NULL) down: the branch at `level` is owned by
	 * anc[nanc - level] (NULL at level 0) and is followed up to the owner of
	 * the next level's branch, or to its end at the last level */
	for (level = 0; level <= nanc; level++) {
		const struct element *owner = level == 0 ? NULL : anc[nanc - level];
		const struct element *stop = level < nanc ? anc[nanc - level - 1] : NULL;

		for (size_t i = 0; i < t->nrows; i++) {
			if (!same_branch(&t->rows[i], owner))
				continue;
			out[n++] = i;
			if (stop != NULL && t->rows[i].el == stop)
				break;
		}
	}
	free(anc);
	*idx = out;
	return n;
}

double
layout_nice_ceil(double x)
{
	static const double steps[] = { 1, 2, 2.5, 5, 10 };
	double e, m;

	if (!(x > 0) || !isfinite(x))
		return x > 0 ? x : 0;
	e = pow(10, floor(log10(x)));
	m = x / e;
	for (size_t i = 0; i < sizeof steps / sizeof *steps; i++)
		if (m <= steps[i] * (1 + 1e-12))
			return steps[i] * e;
	return 10 * e;
}

size_t
layout_ticks(double lo, double hi, size_t maxn, double *out)
{
	static const double mult[] = { 1, 2, 5, 10 };
	double span = hi - lo, base, step = 0;
	size_t n = 0;

	if (maxn == 0 || !(span > 0) || !isfinite(span))
		return 0;
	base = pow(10, floor(log10(span / (double)maxn)));
	for (int k = 0; k < 2 && step == 0; k++, base *= 10)
		for (size_t i = 0; i < sizeof mult / sizeof *mult; i++) {
			double s = base * mult[i];

			if (floor(hi / s) - ceil(lo / s) + 1 <= (double)maxn) {
				step = s;
				break;
			}
		}
	if (step == 0)
		return 0;
	for (double v = ceil(lo / step - 1e-9) * step; v <= hi + step * 1e-9 && n < maxn;
	    v += step)
		out[n++] = fabs(v) < step * 1e-9 ? 0 : v;
	return n;
}

int
layout_map_col(double z, double z0, double z1, int w)
{
	int c;

	if (w <= 0)
		return 0;
	if (!(z1 > z0))
		return 0;
	c = (int)floor((z - z0) / (z1 - z0) * w);
	return c < 0 ? 0 : c >= w ? w - 1 : c;
}

static int
value_row(double v, double top, int h)
{
	int r;

	if (!(top > 0) || !isfinite(v))
		return h - 1;
	r = (h - 1) - (int)floor(v / top * (h - 1) + 0.5);
	return r < 0 ? 0 : r > h - 1 ? h - 1 : r;
}

static void
setc(struct layout_plot *p, int row, int col, unsigned char g)
{
	unsigned char *c = &p->cell[(size_t)row * (size_t)p->w + (size_t)col];

	if ((*c == LG_WX && g == LG_WY) || (*c == LG_WY && g == LG_WX))
		*c = LG_WXY;
	else if (*c == LG_EMPTY || g == LG_FOCUS || (*c == LG_SEL && g != LG_SEL))
		*c = g;
}

/* Puts glyph g in `col` from row a to row b of the plot band starting at base. */
static void
vline(struct layout_plot *p, int base, int col, int a, int b, unsigned char g)
{
	if (a > b) {
		int t = a;

		a = b;
		b = t;
	}
	for (int r = a; r <= b; r++)
		setc(p, base + r, col, g);
}

static double
row_length(const struct trace_row *r)
{
	return r->el->type == EL_SPACE ? model_get(r->el, K_LENGTH) : 0;
}

int
layout_profile(const struct trace *t, const size_t *path, size_t npath, size_t sel,
    int w, int hr, int hp, struct layout_plot *p)
{
	double *wx, *wy, *pw, rmax = 0, pmax = 0;
	int prev_x = -1, prev_y = -1, prev_p = -1;

	memset(p, 0, sizeof *p);
	p->sel_col = -1;
	if (w < 2 || hr < 2 || hp < 2 || npath == 0)
		return -1;
	p->w = w;
	p->hr = hr;
	p->hp = hp;
	p->cell = xcalloc((size_t)w * (size_t)(hr + hp), 1);
	p->z0 = t->rows[path[0]].z;
	p->z1 = t->rows[path[npath - 1]].z + row_length(&t->rows[path[npath - 1]]);
	if (!(p->z1 > p->z0))
		p->z1 = p->z0 + 1e-3;
	wx = xcalloc((size_t)w, sizeof *wx);
	wy = xcalloc((size_t)w, sizeof *wy);
	pw = xcalloc((size_t)w, sizeof *pw);
	/* sample the middle of each column inside the gap that holds it */
	for (int c = 0, k = 0; c < w; c++) {
		double z = p->z0 + (c + 0.5) * (p->z1 - p->z0) / w;
		const struct trace_row *r;

		while ((size_t)k + 1 < npath && t->rows[path[k + 1]].z <= z)
			k++;
		r = &t->rows[path[k]];
		if (r->el->type == EL_SPACE)
			trace_radius_at(t, r, z - r->z, &wx[c], &wy[c]);
		else {
			wx[c] = r->wx;
			wy[c] = r->wy;
		}
		pw[c] = r->el->type == EL_SPACE ? r->power_in : r->power_out;
		if (wx[c] > rmax)
			rmax = wx[c];
		if (wy[c] > rmax)
			rmax = wy[c];
		if (pw[c] > pmax)
			pmax = pw[c];
	}
	for (size_t i = 0; i < npath; i++) {
		const struct trace_row *r = &t->rows[path[i]];

		if (r->wx > rmax)
			rmax = r->wx;
		if (r->wy > rmax)
			rmax = r->wy;
		if (r->power_in > pmax)
			pmax = r->power_in;
	}
	p->rmax = layout_nice_ceil(rmax * 1.05);
	/* the power scale tops at the bench's own power when that is a nice
	 * number (5 W, not 10 W) */
	p->pmax = layout_nice_ceil(pmax);
	if (sel != (size_t)-1)
		for (size_t i = 0; i < npath; i++)
			if (path[i] == sel) {
				p->sel_col = layout_map_col(t->rows[sel].z, p->z0, p->z1, w);
				vline(p, 0, p->sel_col, 0, hr - 1, LG_SEL);
				vline(p, hr, p->sel_col, 0, hp - 1, LG_SEL);
			}
	for (int c = 0; c < w; c++) {
		int ry = value_row(wy[c], p->rmax, hr), rx = value_row(wx[c], p->rmax, hr);
		int rp = value_row(pw[c], p->pmax, hp);

		/* join to the previous column so steep curves stay connected */
		vline(p, 0, c, ry, prev_y < 0 ? ry : prev_y + (prev_y < ry ? 1 : prev_y > ry ? -1 : 0), LG_WY);
		vline(p, 0, c, rx, prev_x < 0 ? rx : prev_x + (prev_x < rx ? 1 : prev_x > rx ? -1 : 0), LG_WX);
		vline(p, hr, c, rp, prev_p < 0 ? rp : prev_p, LG_POWER);
		prev_x = rx;
		prev_y = ry;
		prev_p = rp;
	}
	for (size_t i = 0; i < npath; i++) {
		const struct trace_row *r = &t->rows[path[i]];

		if (r->el->type != EL_SPACE) {
			p->mark = xreallocarray(p->mark, p->nmark + 1, sizeof *p->mark);
			p->mark[p->nmark++] = (struct layout_mark){
				layout_map_col(r->z, p->z0, p->z1, w), path[i], 0 };
		}
		if (r->has_focus) {
			int c = layout_map_col(r->focus.z, p->z0, p->z1, w);
			double fw = r->focus.wx < r->focus.wy ? r->focus.wx : r->focus.wy;

			p->mark = xreallocarray(p->mark, p->nmark + 1, sizeof *p->mark);
			p->mark[p->nmark++] = (struct layout_mark){ c, path[i], 1 };
			setc(p, value_row(fw, p->rmax, hr), c, LG_FOCUS);
		}
	}
	free(wx);
	free(wy);
	free(pw);
	return 0;
}

void
layout_plot_release(struct layout_plot *p)
{
	free(p->cell);
	free(p->mark);
	memset(p, 0, sizeof *p);
	p->sel_col = -1;
}

int
layout_place_labels(const int *col, const int *len, size_t n, long sel, int width, int *at)
{
	int lo = -1, hi = -1, next_free = 0, placed = 0;

	/* the selected one first, under its mark (pulled in at the right edge) */
	if (sel >= 0 && (size_t)sel < n) {
		lo = col[sel];
		if (lo + len[sel] > width)
			lo = width - len[sel];
		if (lo < 0)
			lo = 0;
		hi = lo + len[sel];
		at[sel] = lo;
		placed++;
	}
	/* the rest left to right, each as near its mark as the ones before allow */
	for (size_t i = 0; i < n; i++) {
		int x;

		if ((long)i == sel)
			continue;
		at[i] = -1;
		x = col[i] > next_free ? col[i] : next_free;
		if (lo >= 0 && x + len[i] > lo - 1 && x < hi + 1)
			x = hi + 1;             /* step over the selected one */
		if (x + len[i] > width) {
			x = width - len[i];
			if (x < next_free || (lo >= 0 && x + len[i] > lo - 1 && x < hi + 1))
				continue;
		}
		if (x < 0)
			continue;
		at[i] = x;
		next_free = x + len[i] + 1;
		placed++;
	}
	return placed;
}

int
layout_profile_band(const struct trace *t, const size_t *path, size_t npath, size_t sel,
    int w, int hr, int hp, struct layout_plot *p)
{
	int mid;

	if (layout_profile(t, path, npath, sel, w, hr, hp, p) != 0)
		return -1;
	/* the radius rows again, now as the beam lies on the table: the axis
	 * in the middle row, the x radius filled above and below it, the y
	 * radius marked at its edges */
	memset(p->cell, LG_EMPTY, (size_t)w * (size_t)hr);
	mid = (hr - 1) / 2;
	for (int c = 0; c < w; c++) {
		double z = p->z0 + (c + 0.5) * (p->z1 - p->z0) / w, wx, wy;
		int k = 0, ex, ey;
		const struct trace_row *r;

		while ((size_t)k + 1 < npath && t->rows[path[k + 1]].z <= z)
			k++;
		r = &t->rows[path[k]];
		if (r->el->type == EL_SPACE) {
			trace_radius_at(t, r, z - r->z, &wx, &wy);
		} else {
			wx = r->wx;
			wy = r->wy;
		}
		/* rows from the axis to the edge, rounded; at least the axis row */
		ex = p->rmax > 0 ? (int)floor(wx / p->rmax * mid + 0.5) : 0;
		ey = p->rmax > 0 ? (int)floor(wy / p->rmax * mid + 0.5) : 0;
		for (int d = 0; d <= ex && d <= mid; d++) {
			setc(p, mid - d, c, LG_WX);
			if (mid + d < hr)
				setc(p, mid + d, c, LG_WX);
		}
		if (ey <= mid && ey != ex) {
			p->cell[(size_t)(mid - ey) * (size_t)w + (size_t)c] = LG_WY;
			if (mid + ey < hr)
				p->cell[(size_t)(mid + ey) * (size_t)w + (size_t)c] = LG_WY;
		}
		if (p->sel_col == c)
			for (int rr = 0; rr < hr; rr++)
				if (p->cell[(size_t)rr * (size_t)w + (size_t)c] == LG_EMPTY)
					p->cell[(size_t)rr * (size_t)w + (size_t)c] = LG_SEL;
	}
	for (size_t i = 0; i < p->nmark; i++)
		if (p->mark[i].focus)
			p->cell[(size_t)mid * (size_t)w + (size_t)p->mark[i].col] = LG_FOCUS;
	return 0;
}
