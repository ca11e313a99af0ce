/* ui-points.c - the workbench for a bench run at more than one setting:
 * every operating point side by side (each rated element's ratio at the
 * base and at each point, its worst and where); and the chain at one
 * point at a time, where a value typed is that point's override, or with
 * each element's worst over all of them.  The numbers come from
 * point_survey_run; this only paints.  The sweep screen is ui-sweep.c.
 * Owned by the workbench. */
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

void
ui_screen_title(struct app *a, int w, const char *what)
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

	ui_screen_title(a, w, "operating points side by side");
	if (ncol < 1)
		ncol = 1;
	if ((size_t)ncol > sv->n)
		ncol = (int)sv->n;
	t = sv->n == 1 ? xstrdup("This bench has no operating points yet: n adds one.") :
	    xasprintf("%zu point%s besides the base%s.", sv->n - 1, sv->n == 2 ? "" : "s",
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

static enum ui_reaction pts_new(struct app *, struct ui_pane *);
static void pts_enter(struct app *, struct ui_pane *);

static const struct ui_key pts_keys[] = {
	{ { UI_FKEY(KEY_UP) }, "\u2191\u2193", "element", 0, "choose an element", pts_up, 0, UG_MOVE },
	{ { UI_FKEY(KEY_DOWN) }, "\u2193", NULL, 0, NULL, pts_down, 0, UG_MOVE },
	{ { 'n', UI_FKEY(KEY_IC) }, "n", "new point", 1, "a new operating point: its name and first change (also Insert)", pts_new, UI_K_EDITS, UG_VALUES },
	{ { UI_ESC, 'q', 'o', '\r' }, "Esc", "back to the chain", 0,
	    "back to the chain, the element chosen here selected (also q, o, Enter)", pts_back, 0,
	    UG_LEAVE },
	UI_KEYS_END,
};

const struct ui_pane_ops ui_points_ops = {
	"operating points", 0, pts_keys, pts_draw, NULL, NULL, pts_enter, NULL, pts_release,
};

/* Traces the base and every point for the screen; -1 (said) when it cannot. */
static int
pts_load(struct app *a, struct pts_view *v)
{
	const struct layout_row *sr = app_sel_row(a);
	char *cause = NULL;

	v->nrows = v->sel = 0;
	if (point_survey_run(a->bench, NULL, &v->sv, &cause) != 0) {
		app_msg_take(a, 1, cause);
		return -1;
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
	return 0;
}

void
ui_points_push(struct app *a)
{
	struct pts_view *v = xcalloc(1, sizeof *v);

	if (pts_load(a, v) != 0) {
		free(v);
		return;
	}
	app_push(a, &ui_points_ops, v);
}

/* Back on top (after the new-point prompt): the points again. */
static void
pts_enter(struct app *a, struct ui_pane *p)
{
	struct pts_view *v = p->data;
	struct point_survey old = v->sv;

	free(v->rows);
	v->rows = NULL;
	memset(&v->sv, 0, sizeof v->sv);
	if (pts_load(a, v) != 0)
		v->sv = old;        /* keep what was shown */
	else
		point_survey_release(&old);
	if (v->rows == NULL)
		v->rows = xcalloc(1, sizeof *v->rows);
}

struct new_point {
	const char *name;
	char      **change;
	size_t      n;
};

static int
do_new_point(struct bench *b, void *arg, char **cause)
{
	struct new_point *np = arg;

	return point_edit_add(b, np->name, np->change, np->n, cause);
}

static char *
trimmed(const char *s, size_t len)
{
	while (len > 0 && (*s == ' ' || *s == '\t')) {
		s++;
		len--;
	}
	while (len > 0 && (s[len - 1] == ' ' || s[len - 1] == '\t'))
		len--;
	return xasprintf("%.*s", (int)len, s);
}

/* "NAME: CHANGE; CHANGE ...": the point added to the draft and shown. */
static int
new_point(struct app *a, void *arg, const char *text, char **cause)
{
	const char *colon = strchr(text, ':'), *c;
	struct new_point np = { NULL, NULL, 0 };
	char *name;
	int rc;

	(void)arg;
	if (colon == NULL)
		return fail_with(cause, "write NAME: CHANGE, e.g. alignment: source.power=20 mW");
	name = trimmed(text, (size_t)(colon - text));
	for (c = colon + 1; *c != '\0';) {
		const char *end = strchr(c, ';');
		size_t len = end != NULL ? (size_t)(end - c) : strlen(c);
		char *one = trimmed(c, len);

		if (one[0] != '\0') {
			np.change = xreallocarray(np.change, np.n + 1, sizeof *np.change);
			np.change[np.n++] = one;
		} else {
			free(one);
		}
		c += len + (end != NULL);
	}
	np.name = name;
	a->point_edit = 1;
	rc = app_edit(a, do_new_point, &np, cause);
	a->point_edit = 0;
	if (rc == 0) {
		a->point = (long)a->bench->points.n - 1;
		app_retrace(a);
		app_msg(a, 0, "point %s added and shown on the chain: values typed there are its "
		    "overrides", name);
	}
	for (size_t i = 0; i < np.n; i++)
		free(np.change[i]);
	free(np.change);
	free(name);
	return rc;
}

static enum ui_reaction
pts_new(struct app *a, struct ui_pane *p)
{
	(void)p;
	ui_prompt(a, "new operating point", "Its name and its first change (more after ';'), "
	    "e.g. alignment: source.power=20 mW; ND1.od=2. Then values typed on the chain "
	    "while it is shown are its overrides.", "", new_point, NULL, NULL);
	return UI_REDRAW;
}

/* ---- the chain at one point, and its worst over all of them ---- */

void
ui_point_cycle(struct app *a)
{
	const char *name;

	if (a->bench == NULL)
		return;
	if (a->bench->points.n == 0) {
		app_msg(a, 1, "no operating points yet: o, then n adds one");
		return;
	}
	a->point = layout_point_next(a->bench, a->point);
	app_retrace(a);
	if ((name = app_point_name(a)) != NULL)
		app_msg(a, 0, "point %s shown: values typed are its overrides; O: next", name);
	else
		app_msg(a, 0, "the base shown: values typed change the base; O: the first point");
}

const struct point_survey *
app_survey(struct app *a)
{
	char *cause = NULL;

	if (!a->worst_all || a->bench == NULL)
		return NULL;
	if (!a->have_survey) {
		if (point_survey_run(a->bench, NULL, &a->survey, &cause) != 0) {
			app_msg_take(a, 1, cause);
			a->worst_all = 0;
			return NULL;
		}
		a->have_survey = 1;
	}
	return &a->survey;
}

void
ui_point_worst_toggle(struct app *a)
{
	if (a->bench == NULL)
		return;
	if (!a->worst_all && a->bench->points.n == 0) {
		app_msg(a, 1, "no operating points yet: o, then n adds one");
		return;
	}
	a->worst_all = !a->worst_all;
	if (a->worst_all && app_survey(a) != NULL)
		app_msg(a, 0, "ratio and status: each element's worst over the base and %zu "
		    "point%s; W: back", a->bench->points.n,
		    a->bench->points.n == 1 ? "" : "s");
	else if (!a->worst_all)
		app_msg(a, 0, "ratio and status: as traced at the %s shown",
		    app_point_name(a) != NULL ? "point" : "base");
}

struct override_arg {
	const char *point, *id, *key, *text;
};

static int
do_override(struct bench *b, void *arg, char **cause)
{
	struct override_arg *o = arg;

	return layout_point_override(b, o->point, o->id, o->key, o->text, cause);
}

int
ui_point_override(struct app *a, const char *id, const char *key, const char *text,
    char **cause)
{
	struct override_arg o = { app_point_name(a), id, key, text };
	int rc;

	if (o.point == NULL)
		return fail_with(cause, "no operating point is shown");
	a->point_edit = 1;
	rc = app_edit(a, do_override, &o, cause);
	a->point_edit = 0;
	return rc;
}
