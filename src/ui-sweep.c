/* ui-sweep.c - the workbench's sweep of one knob (at the point shown): the
 * ratio of the worst few elements against the knob with the caution and
 * over levels, a cursor that walks along it, and the chain at the
 * cursor's value (Tab).  The numbers come from sweep_run and one trace at
 * the cursor, the plot from sweep_plot_layout; this only paints.  Owned
 * by the workbench. */
#include <config.h>

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "core-layout.h"
#include "core-sweep.h"
#include "core-trace.h"
#include "ui-app.h"
#include "util-buf.h"
#include "util-err.h"

/* ---- a sweep with a cursor ---- */

struct swp_view {
	struct bench      *work;    /* owned: the draft without its points */
	struct sweep_knob  k;       /* borrows from work */
	struct sweep      *sw;      /* owned */
	char              *range;   /* owned: as typed */
	size_t             cur;
	int                chain;   /* Tab: the chain at the cursor, not the plot */
	struct trace      *t;       /* owned: work traced at x[t_at]; NULL: not yet */
	size_t             t_at;
	int                top;     /* first chain row shown */
};

static void
swp_release(struct ui_pane *p)
{
	struct swp_view *v = p->data;

	if (v == NULL)
		return;
	sweep_free(v->sw);
	trace_free(v->t);
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

/* The chain at the cursor's value: every element's power, ratio and
 * status there, from one trace of the work bench with the knob set. */
static void
swp_draw_chain(struct app *a, struct swp_view *v, int y, int h, int w)
{
	struct layout_row *rows = NULL;
	size_t n;
	int shown = 0, more;

	if (v->t == NULL || v->t_at != v->cur) {
		sweep_knob_set(&v->k, v->work, v->sw->x[v->cur]);
		v->t = trace_rerun(v->t, v->work);
		v->t_at = v->cur;
	}
	n = layout_chain(v->work, v->t, &rows);
	if (v->top > (int)n - h + 1)
		v->top = (int)n - h + 1;
	if (v->top < 0)
		v->top = 0;
	more = n - (size_t)v->top > (size_t)h;
	for (size_t i = (size_t)v->top; i < n && shown < h - more; i++) {
		const struct layout_row *r = &rows[i];
		const struct trace_row *tr = r->trace_row >= 0 ? &v->t->rows[r->trace_row] : NULL;
		char pw[32], pct[32], *line;

		if (r->kind == LROW_PORT) {
			char br[160];

			trace_branch_name(r->el, r->el->side_port, br, sizeof br);
			line = xasprintf("%*s%s", (int)r->depth * 2, "", br);
			ui_put(a, y + shown++, 1, w - 2, line, UC_DIM);
			free(line);
			continue;
		}
		units_format(pw, sizeof pw, tr != NULL ? tr->power_in : NAN, DIM_POWER, 3, a->ascii);
		layout_percent(pct, sizeof pct, tr != NULL ? tr->ratio : NAN);
		line = xasprintf("%*s%-*s %-10s %10s %8s  %s", (int)r->depth * 2, "",
		    12 - (int)r->depth * 2 > 1 ? 12 - (int)r->depth * 2 : 1, r->el->id,
		    model_type_name(r->el->type), pw, tr != NULL && !isnan(tr->ratio) ? pct : "-",
		    tr != NULL && r->el->type != EL_SPACE ? layout_status_word(tr->status) : "");
		ui_put_attr(a, y + shown++, 1, w - 2, line, tr != NULL && tr->status >= STATUS_CAUTION ?
		    ui_status_attr(a, tr->status) : ui_attr(a, UC_NORMAL));
		free(line);
	}
	if (more)
		ui_put_right(a, y + h - 1, 1, w - 2, a->ascii ? "more: Up/Down" : "more: \u2191\u2193",
		    ui_attr(a, UC_DIM));
	free(rows);
}

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
	ui_screen_title(a, w, t);
	free(t);
	knob_text(x, sizeof x, &v->k, sw->x[v->cur], a->ascii);
	layout_percent(pct, sizeof pct, wst >= 0 ? sw->ratio[v->cur * sw->nrated + (size_t)wst] : NAN);
	t = xasprintf("%s = %s: worst %s %s %s%s%s", v->k.text, x, wst >= 0 ? sw->rated[wst].id : "-",
	    pct, layout_status_word(sw->status[v->cur]),
	    sw->unterminated[v->cur] ? ", unterminated" : "",
	    sw->breakdown[v->cur] ? ", air breakdown" : "");
	ui_put_attr(a, 1, 1, w - 2, t, ui_status_attr(a, sw->status[v->cur]) | A_BOLD);
	free(t);
	if (v->chain && h > 4) {
		swp_draw_chain(a, v, 2, h - 5, w);
		ui_footer(a, p->ops->keys, h, w);
		return;
	}
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

static enum ui_reaction
swp_tab(struct app *a, struct ui_pane *p)
{
	struct swp_view *v = p->data;

	(void)a;
	v->chain = !v->chain;
	return UI_REDRAW;
}

static enum ui_reaction
swp_scroll(struct ui_pane *p, int by)
{
	struct swp_view *v = p->data;

	v->top += by;
	return UI_REDRAW;
}

static enum ui_reaction
swp_up(struct app *a, struct ui_pane *p)
{
	(void)a;
	return swp_scroll(p, -1);
}

static enum ui_reaction
swp_down(struct app *a, struct ui_pane *p)
{
	(void)a;
	return swp_scroll(p, 1);
}

static const struct ui_key swp_keys[] = {
	{ { UI_FKEY(KEY_LEFT) }, "\u2190\u2192", "move along the knob", 0,
	    "move the cursor one step along the knob", swp_left, 0, UG_MOVE },
	{ { UI_FKEY(KEY_RIGHT) }, "\u2192", NULL, 0, NULL, swp_right, 0, UG_MOVE },
	{ { UI_FKEY(KEY_PPAGE) }, "PgUp", NULL, 0, "20 steps back", swp_pgup, 0, UG_MOVE },
	{ { UI_FKEY(KEY_NPAGE) }, "PgDn", NULL, 0, "20 steps on", swp_pgdn, 0, UG_MOVE },
	{ { UI_FKEY(KEY_HOME) }, "Home", NULL, 0, "the start of the range", swp_home, 0, UG_MOVE },
	{ { UI_FKEY(KEY_END) }, "End", NULL, 0, "the end of the range", swp_end, 0, UG_MOVE },
	{ { '\t' }, "Tab", "chain here", 0,
	    "the chain at the cursor's value, or the plot again", swp_tab, 0, UG_LOOK },
	{ { UI_FKEY(KEY_UP) }, "\u2191\u2193", NULL, 0, "scroll the chain", swp_up, 0, UG_MOVE },
	{ { UI_FKEY(KEY_DOWN) }, "\u2193", NULL, 0, NULL, swp_down, 0, UG_MOVE },
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
	/* at the point shown, when one is: its copy holds no points */
	v->work = model_bench_dup(a->shown);
	point_list_release(&v->work->points);
	if (sweep_knob_parse(v->work, knob, &v->k, cause) == 0 &&
	    sweep_knob_value(&v->k, from, &x0, cause) == 0 &&
	    sweep_knob_value(&v->k, to, &x1, cause) == 0 &&
	    (v->sw = sweep_run(v->work, &v->k, x0, x1, 201, 0, cause)) != NULL) {
		v->range = xasprintf("%s .. %s%s%s", from + strspn(from, " "), to + strspn(to, " "),
		    app_point_name(a) != NULL ? " at point " : "",
		    app_point_name(a) != NULL ? app_point_name(a) : "");
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

/* "KNOB LO .. HI" around the knob's value: half to twice it (a range's
 * top at the key's), an angle 0 .. 45. */
static char *
knob_range(struct app *a, const char *knob)
{
	struct bench *b = model_bench_dup(a->shown);
	struct sweep_knob k;
	char *cause = NULL, lo[48], hi[48], *init = NULL;

	memset(&k, 0, sizeof k);
	if (sweep_knob_parse(b, knob, &k, &cause) == 0) {
		double v = sweep_knob_get(&k, b), top = k.src == SRC_NONE ? model_keys[k.key].hi : INFINITY;
		enum unit_dim dim = k.angle ? DIM_NONE : k.dim;

		if (k.angle) {
			snprintf(lo, sizeof lo, "0");
			snprintf(hi, sizeof hi, "45");
		} else {
			units_format_exact(lo, sizeof lo, v / 2, dim);
			units_format_exact(hi, sizeof hi, top < 2 * v ? top : 2 * v, dim);
		}
		init = xasprintf("%s %s .. %s", knob, lo, hi);
	}
	free(cause);
	sweep_knob_release(&k);
	model_bench_free(b);
	return init;
}

void
ui_sweep_prompt(struct app *a, const char *knob)
{
	static const enum model_key prefer[] = { K_ANGLE, K_LENGTH, K_FOCAL, K_OD };
	const struct layout_row *sr = app_sel_row(a);
	const struct element *el = sr != NULL ? sr->el : NULL;
	char *init = knob != NULL ? knob_range(a, knob) : NULL, *usual = NULL;
	int key = -1;

	/* else the knob people turn on that element, else its first number */
	for (size_t i = 0; init == NULL && el != NULL && key < 0 && i < sizeof prefer / sizeof *prefer; i++)
		if (model_key_applies(prefer[i], el->type) && !isnan(model_get(el, prefer[i])))
			key = (int)prefer[i];
	for (int k = 0; init == NULL && el != NULL && key < 0 && k < K_COUNT; k++)
		if (model_has(el, (enum model_key)k) && model_keys[k].kind != KIND_BOOL &&
		    model_keys[k].kind != KIND_AXIS && model_keys[k].kind != KIND_CHOICE)
			key = k;
	if (init == NULL && key >= 0) {
		usual = xasprintf("%s.%s", el->id, model_key_path((enum model_key)key));
		init = knob_range(a, usual);
	}
	ui_prompt(a, "sweep", "KNOB FROM .. TO: ID.KEY, source.KEY or ID1.length~ID2.length; "
	    "values with units", init != NULL ? init : "source.power 0.1 W .. 1 W", sweep_typed,
	    NULL, NULL);
	free(init);
	free(usual);
}

