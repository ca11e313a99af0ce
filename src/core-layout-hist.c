/* core-layout-hist.c - the tolerance screen's histogram of one element's
 * ratio over the samples: the bins (fixed width, the caution and over
 * levels on bin edges), each cell's block and status, the axis with its
 * marks, and the caption.  Numbers come from core-mc.c.  See
 * core-layout-tol.h. */
#include <config.h>

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "core-layout-tol.h"
#include "core-layout.h"
#include "util-buf.h"
#include "util-err.h"

/* ---- the histogram ---- */

int
layout_hist_make(const double *v, size_t n, size_t stride, double caution_at, int maxbins,
    struct layout_hist *h)
{
	double lo, hi, w;
	int nb;

	memset(h, 0, sizeof *h);
	h->caution_at = caution_at;
	if (n == 0 || maxbins < 1)
		return -1;
	if (maxbins > LAYOUT_HIST_MAX)
		maxbins = LAYOUT_HIST_MAX;
	{
		/* no more bins than the samples can fill: Rice's rule, 2·n^(1/3)
		 * (common practice, from memory), and never fewer than 8 */
		int rice = (int)ceil(2 * cbrt((double)n));

		rice = rice < 8 ? 8 : rice;
		maxbins = rice < maxbins ? rice : maxbins;
	}
	lo = hi = v[0];
	for (size_t i = 1; i < n; i++) {
		double x = v[i * stride];

		lo = x < lo ? x : lo;
		hi = x > hi ? x : hi;
	}
	h->min = lo;
	h->max = hi;
	h->n = n;
	if (!(hi > lo)) {
		/* one value: a single column in the middle of a ±1 % range */
		double d = lo != 0 ? fabs(lo) * 0.01 : 0.01;

		h->constant = 1;
		lo -= d;
		hi += d;
	}
	nb = maxbins;
	w = (hi - lo) / nb;
	if (lo < 1 && hi >= 1 && nb > 1) {
		/* an edge at 100 %: one bin less, shifted so that 1 starts a bin */
		long k;

		w = (hi - lo) / (nb - 1);
		k = (long)ceil((1 - lo) / w);
		lo = 1 - (double)k * w;
		nb = (int)ceil((hi - lo) / w);
		if (lo + nb * w <= hi)
			nb++;
		if (nb > maxbins)
			nb = maxbins;
	}
	h->nbins = nb;
	h->lo = lo;
	h->width = w;
	for (size_t i = 0; i < n; i++) {
		double x = v[i * stride];
		int b = layout_hist_col(h, x);

		b = b < 0 ? 0 : b >= nb ? nb - 1 : b;
		h->count[b]++;
		if (x >= 1) {
			h->over[b]++;
			h->n_over++;
		} else if (x >= caution_at) {
			h->caution[b]++;
			h->n_caution++;
		}
	}
	for (int b = 0; b < nb; b++)
		h->top = h->count[b] > h->top ? h->count[b] : h->top;
	return 0;
}

int
layout_hist_of(const struct mc_result *r, size_t j, int maxbins, struct layout_hist *h)
{
	if (r->ratio == NULL || j >= r->nrated) {
		memset(h, 0, sizeof *h);
		return -1;
	}
	return layout_hist_make(r->ratio + j, r->done, r->nrated, 1 / r->safety_factor, maxbins,
	    h);
}

const char *
layout_hist_cell(const struct layout_hist *h, int b, int level, int height, int ascii)
{
	static const char *const eighth[9] = {
		" ", "\u2581", "\u2582", "\u2583", "\u2584", "\u2585", "\u2586", "\u2587", "\u2588",
	};
	long e, unit = ascii ? 1 : 8;

	if (b < 0 || b >= h->nbins || h->top == 0 || h->count[b] == 0 || height <= 0)
		return " ";
	e = (long)floor((double)h->count[b] / (double)h->top * (double)(height * unit) + 0.5);
	if (e < 1)
		e = 1;
	e -= (long)level * unit;
	if (e <= 0)
		return " ";
	if (ascii)
		return "#";
	return eighth[e >= 8 ? 8 : e];
}

enum damage_status
layout_hist_status(const struct layout_hist *h, int b)
{
	size_t ov, ca, ok;

	if (b < 0 || b >= h->nbins || h->count[b] == 0)
		return STATUS_OK;
	ov = h->over[b];
	ca = h->caution[b];
	ok = h->count[b] - ov - ca;
	if (ov >= ca && ov >= ok)
		return STATUS_OVER;
	if (ca >= ok)
		return STATUS_CAUTION;
	return STATUS_OK;
}

int
layout_hist_col(const struct layout_hist *h, double x)
{
	double c;

	if (h->nbins == 0 || x < h->lo)
		return -1;
	c = floor((x - h->lo) / h->width);
	if (c >= h->nbins)
		return h->nbins;
	/* the edge at 100 % by construction: a rounding below it is its bin */
	if (c + 1 < h->nbins && h->lo + (c + 1) * h->width <= x)
		c++;
	return (int)c;
}

/* Puts label s (ASCII but for the mark byte 1) at column x of cells; 0 when
 * it would not fit or would touch another label. */
static int
axis_put(char *cells, int cols, int x, const char *s)
{
	int l = (int)strlen(s);

	if (x < 0 || x + l > cols)
		return 0;
	for (int i = x - 1; i <= x + l; i++)
		if (i >= 0 && i < cols && cells[i] != ' ')
			return 0;
	memcpy(cells + x, s, (size_t)l);
	return 1;
}

/* A mark under column c with the name after it, or before it at the
 * right edge. */
static void
axis_mark(char *cells, int cols, int c, const char *name, double at)
{
	char pct[32], s[64];

	layout_percent(pct, sizeof pct, at);
	snprintf(s, sizeof s, "\001%s %s", name, pct);
	if (axis_put(cells, cols, c, s))
		return;
	snprintf(s, sizeof s, "%s %s\001", name, pct);
	if (axis_put(cells, cols, c - (int)strlen(s) + 1, s))
		return;
	snprintf(s, sizeof s, "\001%s", name);
	if (axis_put(cells, cols, c, s))
		return;
	snprintf(s, sizeof s, "\001");
	(void)axis_put(cells, cols, c, s);
}

char *
layout_hist_axis(char *buf, size_t n, const struct layout_hist *h, int cw, int ascii)
{
	char cells[LAYOUT_HIST_AXIS_MAX + 1], lo[32], hi[32];
	int oc = layout_hist_col(h, 1), cc = layout_hist_col(h, h->caution_at), cols;
	struct buf b;

	if (n == 0)
		return buf;
	cw = cw < 1 ? 1 : cw;
	cols = h->nbins * cw > LAYOUT_HIST_AXIS_MAX ? LAYOUT_HIST_AXIS_MAX : h->nbins * cw;
	memset(cells, ' ', sizeof cells);
	cells[cols] = '\0';
	if (oc >= 0 && oc < h->nbins && h->lo < 1)
		axis_mark(cells, cols, oc * cw, "over", 1);
	if (cc >= 0 && cc < h->nbins && h->lo < h->caution_at && cc != oc)
		axis_mark(cells, cols, cc * cw, "caution", h->caution_at);
	layout_percent(lo, sizeof lo, h->min);
	layout_percent(hi, sizeof hi, h->max);
	if (!h->constant) {
		(void)axis_put(cells, cols, 0, lo);
		(void)axis_put(cells, cols, cols - (int)strlen(hi), hi);
	}
	buf_init(&b);
	for (int i = 0; i < cols; i++)
		if (cells[i] == '\001')
			buf_add(&b, ascii ? "^" : "\u25b2");
		else
			buf_addc(&b, cells[i]);
	snprintf(buf, n, "%s", b.s != NULL ? b.s : "");
	buf_release(&b);
	return buf;
}

char *
layout_hist_caption(const struct layout_hist *h, const char *id)
{
	char lo[32], hi[32];

	layout_percent(lo, sizeof lo, h->min);
	layout_percent(hi, sizeof hi, h->max);
	if (h->constant)
		return xasprintf("%s's ratio: %s in every one of %zu samples (no tolerance moves "
		    "it)", id, lo, h->n);
	return xasprintf("%s's ratio in %zu samples: %s to %s; %zu over, %zu caution, %zu ok",
	    id, h->n, lo, hi, h->n_over, h->n_caution, h->n - h->n_over - h->n_caution);
}
