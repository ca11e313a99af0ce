/* ui-profile.c - the beam profile: both 1/e² radii and the power along the
 * path from the source to the end of the selected element's branch,
 * scaled to the window, with every element marked under the axis and the
 * foci shown.  The grid comes from layout_profile(); this only paints it.
 * Owned by the workbench. */
#include <config.h>

#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "core-ghost.h"
#include "core-report.h"
#include "ui-app.h"
#include "util-err.h"

#define LABEL_W 10

/* The pane's state: the view, and the ghost laid over the beam (f). */
struct prof {
	int           curves;       /* 0: the band */
	long          ghost;        /* index into the trace's ghosts; -1: none */
	struct trace *gt;           /* owned: the bench traced with its ghosts'
	                             * rows, made when a ghost is first asked for */
};

static size_t
sel_trace_row(const struct app *a)
{
	const struct layout_row *r = app_sel_row(a);

	if (r == NULL)
		return 0;
	if (r->trace_row >= 0)
		return (size_t)r->trace_row;
	/* a port row: its owner */
	for (size_t i = 0; i < a->trace->nrows; i++)
		if (a->trace->rows[i].el == r->el)
			return i;
	return 0;
}

static void
branch_of(const struct app *a, size_t row, char *buf, size_t n)
{
	const struct trace_row *r = &a->trace->rows[row];

	trace_branch_name(r->parent, r->port, buf, n);
}

static void
profile_draw(struct app *a, struct ui_pane *p, int h, int w)
{
	size_t sel = sel_trace_row(a), *path, np;
	const struct trace_row *sr = &a->trace->rows[sel];
	int hp = (h - 9) / 4, hr = h - 9 - hp, pw = w - LABEL_W - 1, y0 = 3;
	struct layout_plot pl;
	char t1[64], t2[64], t3[64], pct[32], br[160], *t;
	double ticks[32];
	size_t nt;
	struct prof *d = p->data;
	int curves = d->curves;

	np = layout_profile_path(a->trace, sel, &path);
	branch_of(a, sel, br, sizeof br);
	t = xasprintf("profile along %s", br);
	ui_frame(a, t, NULL, h, w);
	free(t);
	layout_radius_text(t1, sizeof t1, sr->wx, sr->wy, a->ascii);
	units_format(t2, sizeof t2, sr->power_in, DIM_POWER, 3, a->ascii);
	units_format(t3, sizeof t3, sr->z, DIM_LENGTH, 3, a->ascii);
	layout_percent(pct, sizeof pct, sr->ratio);
	t = xasprintf("%s %s at z = %s: radius %s, power %s, %s %s", model_type_name(sr->el->type),
	    sr->el->id, t3, t1, t2, pct, layout_row_status_word(sr));
	ui_put_attr(a, 2, 1, w - 2, t, ui_status_attr(a, sr->status) | A_BOLD);
	free(t);
	if ((curves ? layout_profile : layout_profile_band)(a->trace, path, np, sel, pw, hr, hp,
	    &pl) != 0) {
		ui_put(a, 3, 1, w - 2, "nothing to plot", UC_DIM);
		free(path);
		return;
	}
	/* y labels: radius top and zero; power top and zero */
	units_format(t1, sizeof t1, pl.rmax, DIM_LENGTH, 3, a->ascii);
	if (curves) {
		ui_put_right(a, y0, 0, LABEL_W - 1, t1, ui_attr(a, UC_DIM));
		units_format(t1, sizeof t1, pl.rmax / 2, DIM_LENGTH, 3, a->ascii);
		ui_put_right(a, y0 + (hr - 1) / 2, 0, LABEL_W - 1, t1, ui_attr(a, UC_DIM));
		ui_put_right(a, y0 + hr - 1, 0, LABEL_W - 1, "0", ui_attr(a, UC_DIM));
	} else {
		/* the band: distances from the axis, up and down */
		char *u = xasprintf("+%s", t1), *v = xasprintf("-%s", t1);

		ui_put_right(a, y0, 0, LABEL_W - 1, u, ui_attr(a, UC_DIM));
		ui_put_right(a, y0 + (hr - 1) / 2, 0, LABEL_W - 1, "axis", ui_attr(a, UC_DIM));
		ui_put_right(a, y0 + hr - 1, 0, LABEL_W - 1, v, ui_attr(a, UC_DIM));
		free(u);
		free(v);
	}
	units_format(t1, sizeof t1, pl.pmax, DIM_POWER, 3, a->ascii);
	ui_put_right(a, y0 + hr + 4, 0, LABEL_W - 1, t1, ui_attr(a, UC_DIM));
	ui_put_right(a, y0 + hr + 4 + hp - 1, 0, LABEL_W - 1, "0 W", ui_attr(a, UC_DIM));
	for (int r = 0; r < hr; r++)
		ui_put(a, y0 + r, LABEL_W, 1, ui_glyph(a, GL_VBAR), UC_DIM);
	for (int r = 0; r < hp; r++)
		ui_put(a, y0 + hr + 4 + r, LABEL_W, 1, ui_glyph(a, GL_VBAR), UC_DIM);
	/* the grid */
	for (int band = 0; band < 2; band++) {
		int rows = band == 0 ? hr : hp, base = band == 0 ? 0 : hr;
		int sy = band == 0 ? y0 : y0 + hr + 4;

		for (int r = 0; r < rows; r++)
			for (int c = 0; c < pw; c++) {
				unsigned char g = pl.cell[(size_t)(base + r) * (size_t)pw + (size_t)c];
				static const struct { enum ui_glyph gl; enum ui_color co; } map[LG_COUNT] = {
					[LG_WX] = { GL_WX, UC_WX }, [LG_WY] = { GL_WY, UC_WY },
					[LG_WXY] = { GL_WXY, UC_WX }, [LG_POWER] = { GL_POWER, UC_POWER },
					[LG_FOCUS] = { GL_FOCUS, UC_FOCUS }, [LG_SEL] = { GL_DOT, UC_DIM },
				};

				if (g == LG_EMPTY)
					continue;
				ui_put(a, sy + r, LABEL_W + 1 + c, 1, ui_glyph(a, !curves && band == 0 &&
				    g == LG_WX ? GL_BAND : map[g].gl), map[g].co);
			}
	}
	/* the axis: element marks, foci, z ticks, ids */
	{
		int ay = y0 + hr;

		for (int c = 0; c < pw; c++)
			ui_put(a, ay, LABEL_W + 1 + c, 1, ui_glyph(a, GL_HBAR), UC_DIM);
		for (size_t i = 0; i < pl.nmark; i++) {
			const struct layout_mark *m = &pl.mark[i];
			int is_sel = m->row == sel && !m->focus;

			ui_put(a, ay, LABEL_W + 1 + m->col, 1,
			    m->focus ? ui_glyph(a, GL_FOCUS) : a->ascii ? "+" : "\u253c",
			    m->focus ? UC_FOCUS : is_sel ? UC_KEY : UC_NORMAL);
		}
		/* ids under their marks on two rows, none over another: the
		 * selected, over and caution ones first, then left to right; an id
		 * with no room is left out (core-report's label spreading) */
		{
			size_t n = 0, *of = xcalloc(pl.nmark + 1, sizeof *of);
			double *x = xcalloc(pl.nmark + 1, sizeof *x), *wd = xcalloc(pl.nmark + 1, sizeof *wd);
			int *lv = xcalloc(pl.nmark + 1, sizeof *lv), *prio = xcalloc(pl.nmark + 1, sizeof *prio);

			for (size_t i = 0; i < pl.nmark; i++) {
				const struct layout_mark *m = &pl.mark[i];
				const struct trace_row *r = &a->trace->rows[m->row];
				int l = (int)utf8_cols(r->el->id);
				int at = m->col + l > pw ? pw - l : m->col;   /* the last ones shift left */

				if (m->focus || at < 0)
					continue;
				of[n] = i;
				x[n] = at + l / 2.0;
				wd[n] = l;
				prio[n] = m->row == sel ? 9 : r->status == STATUS_OVER ? 3 :
				    r->status == STATUS_CAUTION ? 2 : 0;
				n++;
			}
			rep_labels_spread(x, wd, prio, n, 1, 2, lv, NULL);
			for (size_t k = 0; k < n; k++) {
				const struct layout_mark *m = &pl.mark[of[k]];
				const struct trace_row *r = &a->trace->rows[m->row];
				int l = (int)wd[k], at = (int)(x[k] - l / 2.0 + 0.5);

				if (lv[k] < 0)
					continue;
				if (m->row == sel)
					ui_put_attr(a, ay + 1 + lv[k], LABEL_W + 1 + at, l, r->el->id,
					    ui_attr(a, UC_SELECT));
				else
					ui_put(a, ay + 1 + lv[k], LABEL_W + 1 + at, l, r->el->id,
					    r->status == STATUS_OVER ? UC_OVER :
					    r->status == STATUS_CAUTION ? UC_CAUTION : UC_NORMAL);
			}
			free(of);
			free(x);
			free(wd);
			free(lv);
			free(prio);
		}
		nt = layout_ticks(pl.z0, pl.z1, (size_t)(pw / 12 > 1 ? pw / 12 : 2), ticks);
		ui_put(a, ay + 3, 0, LABEL_W, "z", UC_DIM);
		for (size_t i = 0; i < nt; i++) {
			int c = layout_map_col(ticks[i], pl.z0, pl.z1, pw);

			units_format(t1, sizeof t1, ticks[i], DIM_LENGTH, 3, a->ascii);
			if (c + (int)utf8_cols(t1) <= pw)
				ui_put(a, ay + 3, LABEL_W + 1 + c, (int)utf8_cols(t1), t1, UC_DIM);
		}
	}
	/* the ghost chosen with f, over the beam: a dot at each element it meets */
	if (d->ghost >= 0 && d->gt != NULL) {
		struct layout_gpoint gp[256];
		size_t ng = layout_profile_ghost(d->gt, (size_t)d->ghost, path, np, &pl, !curves, gp,
		    256);

		for (size_t i = 0; i < ng && i < 256; i++) {
			const char *gl = gp[i].beyond ? (a->ascii ? "^" : "\u25b2") :
			    (a->ascii ? "o" : "\u25cb");

			ui_put(a, y0 + gp[i].row, LABEL_W + 1 + gp[i].col, 1, gl, UC_HAZARD);
			if (gp[i].row2 != gp[i].row)
				ui_put(a, y0 + gp[i].row2, LABEL_W + 1 + gp[i].col, 1, gp[i].beyond ?
				    (a->ascii ? "v" : "\u25bc") : gl, UC_HAZARD);
		}
	}
	units_format(t1, sizeof t1, pl.rmax, DIM_LENGTH, 3, a->ascii);
	if (d->ghost >= 0 && d->gt != NULL && (size_t)d->ghost < d->gt->ghosts->n) {
		char name[200], gpw[48];
		const struct ghost *g = &d->gt->ghosts->g[d->ghost];

		layout_ghost_name(g, a->ascii, name, sizeof name);
		units_format(gpw, sizeof gpw, g->power_start, DIM_POWER, 3, a->ascii);
		t = xasprintf("%s=ghost %s %s, larger radius at each element; %s=wider  (f: next)",
		    a->ascii ? "o" : "\u25cb", name, gpw, a->ascii ? "^" : "\u25b2");
	} else if (curves)
		t = xasprintf("%s=x %s=y radius  %s=both  %s=focus  %s=power  %s=selected  (1/e%s, top %s)",
		    ui_glyph(a, GL_WX), ui_glyph(a, GL_WY), ui_glyph(a, GL_WXY), ui_glyph(a, GL_FOCUS),
		    ui_glyph(a, GL_POWER), ui_glyph(a, GL_DOT), a->ascii ? "^2" : "\u00b2", t1);
	else
		t = xasprintf("%s=beam %sx radius  %s=%sy radius  %s=focus  %s=power  (1/e%s; v: curves)",
		    ui_glyph(a, GL_BAND), a->ascii ? "+/-" : "\u00b1", ui_glyph(a, GL_WY),
		    a->ascii ? "+/-" : "\u00b1", ui_glyph(a, GL_FOCUS), ui_glyph(a, GL_POWER),
		    a->ascii ? "^2" : "\u00b2");
	ui_put(a, h - 2, 1, w - 2, t, UC_DIM);
	free(t);
	ui_key_line(a, ui_profile_ops.keys, h - 1, w);
	layout_plot_release(&pl);
	free(path);
}

/* Steps the selection to the previous or next non-space element on the
 * plotted path. */
static enum ui_reaction
step(struct app *a, int by)
{
	size_t sel = sel_trace_row(a), *path, np = layout_profile_path(a->trace, sel, &path);
	long at = -1;

	for (size_t i = 0; i < np; i++)
		if (path[i] == sel)
			at = (long)i;
	for (long i = at + by; at >= 0 && i >= 0 && i < (long)np; i += by)
		if (a->trace->rows[path[i]].el->type != EL_SPACE) {
			app_select_id(a, a->trace->rows[path[i]].el->id, 0);
			break;
		}
	free(path);
	return UI_REDRAW;
}

static enum ui_reaction
p_prev(struct app *a, struct ui_pane *p)
{
	(void)p;
	return step(a, -1);
}

static enum ui_reaction
p_next(struct app *a, struct ui_pane *p)
{
	(void)p;
	return step(a, 1);
}

/* The band as on the table, or both radii as curves from zero. */
static enum ui_reaction
p_view(struct app *a, struct ui_pane *p)
{
	struct prof *d = p->data;

	(void)a;
	d->curves = !d->curves;
	return UI_REDRAW;
}

/* The next ghost that meets the plotted path, worst first (as the
 * reflections screen lists them); after the last, none.  The lean trace
 * keeps no ghost rows: the bench shown is traced once with them. */
static enum ui_reaction
p_ghost(struct app *a, struct ui_pane *p)
{
	struct prof *d = p->data;
	size_t sel = sel_trace_row(a), *path, np, nr;
	struct layout_refl *v;
	long pos = -1, next = -1;

	if (a->trace->ghosts == NULL) {
		app_msg(a, 1, "this trace follows the main beam only: no ghost to lay over it");
		return UI_REDRAW;
	}
	if (d->gt == NULL || d->gt->nrows != a->trace->nrows)
		d->gt = trace_rerun_opts(d->gt, a->shown, TRACE_GHOST_ROWS);
	np = layout_profile_path(d->gt, sel, &path);
	nr = layout_reflections(d->gt, &v);
	for (size_t i = 0; i < nr; i++)
		if (v[i].kind == LR_GHOST && (long)v[i].index == d->ghost)
			pos = (long)i;
	for (size_t i = (size_t)(pos + 1); i < nr && next < 0; i++) {
		const struct ghost *g;

		if (v[i].kind != LR_GHOST)
			continue;
		g = &d->gt->ghosts->g[v[i].index];
		for (size_t k = 0; k < g->nrows && next < 0; k++)
			for (size_t j = 0; j < np; j++)
				if (path[j] == d->gt->ghosts->rows[g->row0 + k].trace_row &&
				    a->trace->rows[path[j]].el->type != EL_SPACE) {
					next = (long)v[i].index;
					break;
				}
	}
	d->ghost = next;
	if (next < 0)
		app_msg(a, 0, "no ghost laid over the beam (f: the worst again)");
	free(v);
	free(path);
	return UI_REDRAW;
}

static enum ui_reaction
p_back(struct app *a, struct ui_pane *p)
{
	(void)a;
	(void)p;
	return UI_POP | UI_REDRAW;
}

static const struct ui_key profile_keys[] = {
	{ { UI_FKEY(KEY_LEFT), UI_FKEY(KEY_UP) }, "\u2190\u2192", "element", 0,
	    "previous or next element along the path (also the up and down arrows)", p_prev, 0, UG_MOVE },
	{ { UI_FKEY(KEY_RIGHT), UI_FKEY(KEY_DOWN) }, "\u2192", NULL, 0,
	    NULL, p_next, 0, UG_MOVE },
	{ { 'v' }, "v", "view", 1, "the beam as a band about the axis, or both radii as curves",
	    p_view, 0, UG_LOOK },
	{ { 'f' }, "f", "ghost", 2, "lay the next ghost over the beam, worst first (its radius at "
	    "each element it meets); after the last, none", p_ghost, 0, UG_LOOK },
	{ { UI_ESC, 'q', 'z', '\r' }, "Esc", "back to the chain", 0,
	    "back to the workbench, the element you reached selected (also q, z, Enter)", p_back, 0, UG_LEAVE },
	UI_KEYS_END,
};

static void
p_release(struct ui_pane *p)
{
	struct prof *d = p->data;

	trace_free(d->gt);
	free(d);
}

const struct ui_pane_ops ui_profile_ops = {
	"beam profile", 0, profile_keys, profile_draw, NULL, NULL, NULL, NULL, p_release,
};

void
ui_profile_push(struct app *a)
{
	struct prof *d = xcalloc(1, sizeof *d);     /* the band, no ghost */

	d->ghost = -1;
	app_push(a, &ui_profile_ops, d);
}
