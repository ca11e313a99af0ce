/* ui-points.c - two workbench screens for a bench run at more than one
 * setting: every operating point side by side (each rated element's ratio
 * at the base and at each point, its worst and where), and a sweep of one
 * knob with a cursor that walks along it.  The numbers come from
 * point_survey_run and sweep_run, the plot from sweep_plot_layout; this
 * only paints.  Owned by the workbench. */
#include <config.h>

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "core-point.h"
#include "core-sweep.h"
#include "ui-app.h"
#include "util-buf.h"
#include "util-err.h"

/* ---- every point side by side ---- */

struct pts_view {
	struct point_survey sv;     /* owned */
	size_t             *rows;   /* owned: indices into sv.el of rated elements */
	size_t              nrows, sel;
};

static void
pts_release(struct ui_pane *p)
{
	struct pts_view *v = p->data;

	if (v == NULL)
		return;
	point_survey_release(&v->sv);
	free(v->rows);
	free(v);
}

static void
title(struct app *a, int w, const char *what)
{
	char *t = xasprintf(" beamledger %s %s %s %s", ui_glyph(a, GL_VBAR), a->name,
	    ui_glyph(a, GL_VBAR), what);

	ui_fill(a, 0, 0, w, ui_attr(a, UC_TITLE));
	ui_put(a, 0, 0, w, t, UC_TITLE);
	free(t);
}

#define ID_W   12
#define COL_W  11

static void
pts_draw(struct app *a, struct ui_pane *p, int h, int w)
{
	struct pts_view *v = p->data;
	const struct point_survey *sv = &v->sv;
	int ncol = (w - ID_W - 2 - 24) / COL_W, y = 4, first = 0;
	char pct[32], *t;

	title(a, w, "operating points side by side");
	if (ncol < 1)
		ncol = 1;
	if ((size_t)ncol > sv->n)
		ncol = (int)sv->n;
	t = sv->n == 1 ? xstrdup("This bench has no operating points: add them with "
	    "'beamledger point add BENCH NAME CHANGE...'.") :
	    xasprintf("%zu points besides the base%s.", sv->n - 1,
	    (size_t)ncol < sv->n ? "; the widest terminal shows more" : "");
	ui_put(a, 1, 1, w - 2, t, UC_DIM);
	free(t);
	/* header: point names, then each point's worst */
	ui_put(a, 2, 1, ID_W, "element", UC_HEADER);
	ui_put(a, 3, 1, ID_W, "worst", UC_DIM);
	for (int c = 0; c < ncol; c++) {
		const struct point_summary *ps = &sv->pt[c];

		ui_put_right(a, 2, 1 + ID_W + c * COL_W, COL_W - 1, ps->name, ui_attr(a, UC_HEADER));
		layout_percent(pct, sizeof pct, ps->worst_id != NULL ? ps->worst_ratio : NAN);
		t = xasprintf("%s %s", ps->worst_id != NULL ? ps->worst_id : "-", pct);
		ui_put_right(a, 3, 1 + ID_W + c * COL_W, COL_W - 1, t, ui_status_attr(a, ps->status));
		free(t);
	}
	ui_put(a, 2, 1 + ID_W + ncol * COL_W + 1, 24, "worst at", UC_HEADER);
	if ((size_t)(h - 7) < v->nrows && v->sel >= (size_t)(h - 7))
		first = (int)(v->sel - (size_t)(h - 7) + 1);
	for (size_t r = (size_t)first; r < v->nrows && y < h - 2; r++, y++) {
		const struct point_worst *e = &sv->el[v->rows[r]];
		attr_t sel = r == v->sel ? ui_attr(a, UC_SELECT) : 0;

		if (sel)
			ui_fill(a, y, 0, w, sel);
		ui_put_attr(a, y, 1, ID_W, e->id, sel ? sel : ui_attr(a, UC_NORMAL));
		for (int c = 0; c < ncol; c++) {
			double ratio = sv->ratio[(size_t)c * sv->nel + v->rows[r]];

			layout_percent(pct, sizeof pct, ratio);
			ui_put_right(a, y, 1 + ID_W + c * COL_W, COL_W - 1, isnan(ratio) ? "-" : pct,
			    /* a point changes no safety factor: the base's holds */
			    sel ? sel : ui_status_attr(a, damage_status_of(ratio,
			    a->bench->safety_factor)));
		}
		layout_percent(pct, sizeof pct, e->ratio);
		t = xasprintf("%s %s at %s", pct, layout_status_word(e->status), sv->pt[e->at].name);
		ui_put_attr(a, y, 1 + ID_W + ncol * COL_W + 1, w - (2 + ID_W + ncol * COL_W + 1), t,
		    sel ? sel : ui_status_attr(a, e->status));
		free(t);
	}
	ui_footer(a, p->ops->keys, h, w);
}

static enum ui_reaction
pts_move(struct app *a, struct ui_pane *p, int by)
{
	struct pts_view *v = p->data;

	(void)a;
	if (by < 0 && v->sel > 0)
		v->sel--;
	else if (by > 0 && v->sel + 1 < v->nrows)
		v->sel++;
	return UI_REDRAW;
}

static enum ui_reaction
pts_up(struct app *a, struct ui_pane *p)
{
	return pts_move(a, p, -1);
}

static enum ui_reaction
pts_down(struct app *a, struct ui_pane *p)
{
	return pts_move(a, p, 1);
}

static enum ui_reaction
pts_back(struct app *a, struct ui_pane *p)
{
	struct pts_view *v = p->data;

	/* the element chosen here is selected in the chain, if the base has it */
	if (v->nrows > 0 && model_find(a->bench, v->sv.el[v->rows[v->sel]].id, NULL, NULL, NULL))
		app_select_id(a, v->sv.el[v->rows[v->sel]].id, 0);
	return UI_POP | UI_REDRAW;
}

static const struct ui_key pts_keys[] = {
	{ { UI_FKEY(KEY_UP) }, "\u2191\u2193", "element", 0, "choose an element", pts_up, 0, UG_MOVE },
	{ { UI_FKEY(KEY_DOWN) }, "\u2193", NULL, 0, NULL, pts_down, 0, UG_MOVE },
	{ { UI_ESC, 'q', 'o', '\r' }, "Esc", "back to the chain", 0,
	    "back to the chain, the element chosen here selected (also q, o, Enter)", pts_back, 0,
	    UG_LEAVE },
	UI_KEYS_END,
};

const struct ui_pane_ops ui_points_ops = {
	"operating points", 0, pts_keys, pts_draw, NULL, NULL, NULL, NULL, pts_release,
};

void
ui_points_push(struct app *a)
{
	struct pts_view *v = xcalloc(1, sizeof *v);
	const struct layout_row *sr = app_sel_row(a);
	char *cause = NULL;

	if (point_survey_run(a->bench, NULL, &v->sv, &cause) != 0) {
		app_msg_take(a, 1, cause);
		free(v);
		return;
	}
	v->rows = xcalloc(v->sv.nel + 1, sizeof *v->rows);
	for (size_t j = 0; j < v->sv.nel; j++) {
		int rated = 0;

		for (size_t i = 0; i < v->sv.n; i++)
			rated |= !isnan(v->sv.ratio[i * v->sv.nel + j]);
		if (!rated)
			continue;
		if (sr != NULL && sr->el != NULL && strcmp(sr->el->id, v->sv.el[j].id) == 0)
			v->sel = v->nrows;
		v->rows[v->nrows++] = j;
	}
	app_push(a, &ui_points_ops, v);
}

/* ---- a sweep with a cursor ---- */

struct swp_view {
	struct bench      *work;    /* owned: the draft without its points */
	struct sweep_knob  k;       /* borrows from work */
	struct sweep      *sw;      /* owned */
	char              *range;   /* owned: as typed */
	size_t             cur;
};

static void
swp_release(struct ui_pane *p)
{
	struct swp_view *v = p->data;

	if (v == NULL)
		return;
	sweep_free(v->sw);
	sweep_knob_release(&v->k);
	model_bench_free(v->work);
	free(v->range);
	free(v);
}

static void
knob_text(char *buf, size_t n, const struct sweep_knob *k, double x, int ascii)
{
	if (k->angle)
		snprintf(buf, n, "%.4g%s", x, ascii ? " deg" : "\u00b0");
	else if (k->dim == DIM_NONE)
		snprintf(buf, n, "%.4g", x);
	else
		units_format(buf, n, x, k->dim, 4, ascii);
}

#define PLOT_X 8

static void
swp_draw(struct app *a, struct ui_pane *p, int h, int w)
{
	static const char marks[] = "*+ox";
	static const enum ui_color series_color[] = { UC_OVER, UC_WX, UC_WY, UC_POWER };
	struct swp_view *v = p->data;
	const struct sweep *sw = v->sw;
	int pw = w - PLOT_X - 2, ph = h - 8, cc;
	struct sweep_plot pl;
	struct buf b;
	char x[48], pct[32], *t;
	long wst = sw->worst[v->cur];

	t = xasprintf("sweep of %s, %s", v->k.text, v->range);
	title(a, w, t);
	free(t);
	knob_text(x, sizeof x, &v->k, sw->x[v->cur], a->ascii);
	layout_percent(pct, sizeof pct, wst >= 0 ? sw->ratio[v->cur * sw->nrated + (size_t)wst] : NAN);
	t = xasprintf("%s = %s: worst %s %s %s%s%s", v->k.text, x, wst >= 0 ? sw->rated[wst].id : "-",
	    pct, layout_status_word(sw->status[v->cur]),
	    sw->unterminated[v->cur] ? ", unterminated" : "",
	    sw->breakdown[v->cur] ? ", air breakdown" : "");
	ui_put_attr(a, 1, 1, w - 2, t, ui_status_attr(a, sw->status[v->cur]) | A_BOLD);
	free(t);
	if (pw < 10 || ph < 4) {
		ui_footer(a, p->ops->keys, h, w);
		return;
	}
	sweep_plot_layout(sw, v->work->safety_factor, (size_t)pw, (size_t)ph, 4, &pl);
	cc = sw->nsteps > 1 ? (int)lround((double)v->cur * (pw - 1) / (double)(sw->nsteps - 1)) : 0;
	for (int r = 0; r < ph; r++) {
		if (r == 0 || r == ph - 1) {
			layout_percent(pct, sizeof pct, pl.ymax * (1 - (double)r / (ph - 1)));
			ui_put_right(a, 2 + r, 0, PLOT_X - 1, pct, ui_attr(a, UC_DIM));
		}
		ui_put(a, 2 + r, PLOT_X, 1, ui_glyph(a, GL_VBAR), UC_DIM);
		for (int c = 0; c < pw; c++) {
			unsigned char g = pl.cell[(size_t)r * (size_t)pw + (size_t)c];
			char s[2] = { 0, 0 };

			if (g == 0) {
				if (c == cc)
					ui_put(a, 2 + r, PLOT_X + 1 + c, 1, ":", UC_KEY);
				continue;
			}
			s[0] = g == SWEEP_PLOT_OVER ? '=' : g == SWEEP_PLOT_CAUTION ? '-' : marks[g - 1];
			ui_put(a, 2 + r, PLOT_X + 1 + c, 1, s,
			    g == SWEEP_PLOT_OVER ? UC_OVER : g == SWEEP_PLOT_CAUTION ? UC_CAUTION :
			    c == cc ? UC_KEY : series_color[g - 1]);
		}
	}
	knob_text(x, sizeof x, &v->k, sw->x[0], a->ascii);
	ui_put(a, 2 + ph, PLOT_X + 1, pw / 2, x, UC_DIM);
	knob_text(x, sizeof x, &v->k, sw->x[sw->nsteps - 1], a->ascii);
	ui_put_right(a, 2 + ph, PLOT_X + 1 + pw / 2, pw - pw / 2, x, ui_attr(a, UC_DIM));
	/* the series at the cursor, and where each first goes over */
	buf_init(&b);
	for (size_t q = 0; q < pl.nseries; q++) {
		const struct sweep_cross *cr = &sw->rated[pl.series[q]];

		layout_percent(pct, sizeof pct, sw->ratio[v->cur * sw->nrated + pl.series[q]]);
		knob_text(x, sizeof x, &v->k, cr->over, a->ascii);
		buf_printf(&b, "%s%c %s %s (over %s)", q ? "   " : "", marks[q], cr->id, pct,
		    isnan(cr->over) ? "never" : x);
	}
	ui_put(a, 3 + ph, 1, w - 2, b.s != NULL ? b.s : "", UC_NORMAL);
	buf_reset(&b);
	buf_add(&b, "safe (nothing over):");
	for (size_t i = 0; i < sw->nsafe; i++) {
		char lo[48];

		knob_text(lo, sizeof lo, &v->k, sw->safe[i].lo, a->ascii);
		knob_text(x, sizeof x, &v->k, sw->safe[i].hi, a->ascii);
		buf_printf(&b, "%s %s .. %s", i ? "," : "", lo, x);
	}
	if (sw->nsafe == 0)
		buf_add(&b, " none");
	ui_put(a, 4 + ph, 1, w - 2, b.s, UC_INFO);
	buf_release(&b);
	sweep_plot_release(&pl);
	ui_footer(a, p->ops->keys, h, w);
}

static enum ui_reaction
swp_step(struct ui_pane *p, long by)
{
	struct swp_view *v = p->data;
	long to = (long)v->cur + by;

	if (to < 0)
		to = 0;
	if (to >= (long)v->sw->nsteps)
		to = (long)v->sw->nsteps - 1;
	v->cur = (size_t)to;
	return UI_REDRAW;
}

static enum ui_reaction
swp_left(struct app *a, struct ui_pane *p)
{
	(void)a;
	return swp_step(p, -1);
}

static enum ui_reaction
swp_right(struct app *a, struct ui_pane *p)
{
	(void)a;
	return swp_step(p, 1);
}

static enum ui_reaction
swp_pgup(struct app *a, struct ui_pane *p)
{
	(void)a;
	return swp_step(p, -20);
}

static enum ui_reaction
swp_pgdn(struct app *a, struct ui_pane *p)
{
	(void)a;
	return swp_step(p, 20);
}

static enum ui_reaction
swp_home(struct app *a, struct ui_pane *p)
{
	(void)a;
	return swp_step(p, -(long)((struct swp_view *)p->data)->sw->nsteps);
}

static enum ui_reaction
swp_end(struct app *a, struct ui_pane *p)
{
	(void)a;
	return swp_step(p, (long)((struct swp_view *)p->data)->sw->nsteps);
}

static enum ui_reaction
swp_back(struct app *a, struct ui_pane *p)
{
	(void)a;
	(void)p;
	return UI_POP | UI_REDRAW;
}

static const struct ui_key swp_keys[] = {
	{ { UI_FKEY(KEY_LEFT) }, "\u2190\u2192", "move along the knob", 0,
	    "move the cursor one step along the knob", swp_left, 0, UG_MOVE },
	{ { UI_FKEY(KEY_RIGHT) }, "\u2192", NULL, 0, NULL, swp_right, 0, UG_MOVE },
	{ { UI_FKEY(KEY_PPAGE) }, "PgUp", NULL, 0, "20 steps back", swp_pgup, 0, UG_MOVE },
	{ { UI_FKEY(KEY_NPAGE) }, "PgDn", NULL, 0, "20 steps on", swp_pgdn, 0, UG_MOVE },
	{ { UI_FKEY(KEY_HOME) }, "Home", NULL, 0, "the start of the range", swp_home, 0, UG_MOVE },
	{ { UI_FKEY(KEY_END) }, "End", NULL, 0, "the end of the range", swp_end, 0, UG_MOVE },
	{ { UI_ESC, 'q', 'v' }, "Esc", "back to the chain", 0, "back to the chain (also q, v)", swp_back, 0,
	    UG_LEAVE },
	UI_KEYS_END,
};

const struct ui_pane_ops ui_sweep_ops = {
	"sweep", 0, swp_keys, swp_draw, NULL, NULL, NULL, NULL, swp_release,
};

/* "KNOB FROM .. TO": the sweep is run here, and the screen opens on it. */
static int
sweep_typed(struct app *a, void *arg, const char *text, char **cause)
{
	struct swp_view *v = xcalloc(1, sizeof *v);
	const char *sp = strchr(text, ' '), *dots = sp != NULL ? strstr(sp, "..") : NULL;
	char *knob, *from, *to;
	double x0, x1;
	int rc = -1;

	(void)arg;
	if (sp == NULL || dots == NULL) {
		free(v);
		return fail_with(cause, "write KNOB FROM .. TO, e.g. HWP1.angle 0 .. 45");
	}
	knob = xasprintf("%.*s", (int)(sp - text), text);
	from = xasprintf("%.*s", (int)(dots - sp - 1), sp + 1);
	for (size_t n = strlen(from); n > 0 && from[n - 1] == ' '; n--)
		from[n - 1] = '\0';
	to = xstrdup(dots + 2);
	v->work = model_bench_dup(a->bench);
	point_list_release(&v->work->points);
	if (sweep_knob_parse(v->work, knob, &v->k, cause) == 0 &&
	    sweep_knob_value(&v->k, from, &x0, cause) == 0 &&
	    sweep_knob_value(&v->k, to, &x1, cause) == 0 &&
	    (v->sw = sweep_run(v->work, &v->k, x0, x1, 201, 0, cause)) != NULL) {
		v->range = xasprintf("%s .. %s", from + strspn(from, " "), to + strspn(to, " "));
		rc = 0;
	}
	free(knob);
	free(from);
	free(to);
	if (rc != 0) {
		sweep_knob_release(&v->k);
		model_bench_free(v->work);
		free(v);
		return -1;
	}
	app_push(a, &ui_sweep_ops, v);     /* the prompt under it closes */
	return 0;
}

void
ui_sweep_prompt(struct app *a)
{
	static const enum model_key prefer[] = { K_ANGLE, K_LENGTH, K_FOCAL, K_OD };
	const struct layout_row *sr = app_sel_row(a);
	const struct element *el = sr != NULL ? sr->el : NULL;
	char *init = NULL;
	int key = -1;

	/* the knob people turn on that element, else its first number */
	for (size_t i = 0; el != NULL && key < 0 && i < sizeof prefer / sizeof *prefer; i++)
		if (model_key_applies(prefer[i], el->type) && !isnan(model_get(el, prefer[i])))
			key = (int)prefer[i];
	for (int k = 0; el != NULL && key < 0 && k < K_COUNT; k++)
		if (model_has(el, (enum model_key)k) && model_keys[k].kind != KIND_BOOL &&
		    model_keys[k].kind != KIND_AXIS && model_keys[k].kind != KIND_CHOICE)
			key = k;
	if (key >= 0) {
		const struct model_key_def *d = &model_keys[key];
		double v = model_get(el, (enum model_key)key);
		char lo[48], hi[48];

		if (d->kind == KIND_ANGLE) {
			snprintf(lo, sizeof lo, "0");
			snprintf(hi, sizeof hi, "45");
		} else {
			units_format_exact(lo, sizeof lo, v / 2, d->kind == KIND_QUANTITY ? d->dim : DIM_NONE);
			units_format_exact(hi, sizeof hi, d->hi < 2 * v ? d->hi : 2 * v,
			    d->kind == KIND_QUANTITY ? d->dim : DIM_NONE);
		}
		init = xasprintf("%s.%s %s .. %s", el->id, model_key_path((enum model_key)key), lo, hi);
	}
	ui_prompt(a, "sweep", "KNOB FROM .. TO: ID.KEY, source.KEY or ID1.length~ID2.length; "
	    "values with units", init != NULL ? init : "source.power 0.1 W .. 1 W", sweep_typed,
	    NULL, NULL);
	free(init);
}
