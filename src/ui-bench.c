/* ui-bench.c - the workbench screen: the chain with every element's
 * results (power, radius, peak irradiance or fluence, ratio bar, status),
 * the selected element's values and results below it, the status line,
 * and the chain's keys: select, add, insert, delete, move, undo, commit
 * and the ways to the other screens.  The value editor lives in
 * ui-fields.c.  Owned by the workbench. */
#include <config.h>

#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "core-edit.h"
#include "report.h"
#include "ui-bench.h"
#include "util-err.h"

/* ---- geometry ---- */

void
wb_geometry(int h, size_t nrows, struct wb_geom *g)
{
	int rest = h - 7;           /* title, source, header, separator, msg, status, hints */

	g->detail_h = rest * 2 / 5;
	if (g->detail_h < 6)
		g->detail_h = 6;
	if (g->detail_h > 14)
		g->detail_h = 14;
	/* A short chain leaves its empty rows to the values and results,
	 * which are what a person reads while laying it out. */
	if ((int)nrows + 1 < rest - g->detail_h)
		g->detail_h = rest - ((int)nrows + 1 > 4 ? (int)nrows + 1 : 4);
	g->chain_y = 3;
	g->chain_h = rest - g->detail_h;
	g->sep_y = g->chain_y + g->chain_h;
	g->detail_y = g->sep_y + 1;
}

/* ---- the chain table ---- */

enum wb_col { C_ELEM, C_TYPE, C_Z, C_POWER, C_RADIUS, C_PEAK, C_FLUENCE, C_BAR,
	C_RATIO, C_STATUS, C_FLAGS, C_NCOLS };

static void
chain_cols(const struct app *a, struct layout_col *c)
{
	int pulsed = a->bench->src.pulsed;

	c[C_ELEM] = (struct layout_col){ "element", 8, 12, 0 };
	c[C_TYPE] = (struct layout_col){ "type", 9, 9, 4 };
	c[C_Z] = (struct layout_col){ "z", 8, 8, 3 };
	c[C_POWER] = (struct layout_col){ "power", 8, 9, 1 };
	c[C_RADIUS] = (struct layout_col){ "radius x/y", 14, 15, 2 };
	c[C_PEAK] = (struct layout_col){ "peak irr.", 11, 11, pulsed ? 3 : 2 };
	c[C_FLUENCE] = (struct layout_col){ "fluence", 11, 11, pulsed ? 2 : 99 };
	c[C_BAR] = (struct layout_col){ "to LIDT", 8, 14, 1 };
	c[C_RATIO] = (struct layout_col){ "ratio", 7, 7, 0 };
	c[C_STATUS] = (struct layout_col){ "status", 7, 7, 0 };
	c[C_FLAGS] = (struct layout_col){ "flags", 6, -1, 5 };
}

static void
cell_text(struct app *a, const struct trace_row *r, enum wb_col c, char *buf, size_t n)
{
	int asc = a->ascii;

	buf[0] = '\0';
	switch (c) {
	case C_TYPE:
		snprintf(buf, n, "%s", model_type_name(r->el->type));
		break;
	case C_Z:
		units_format(buf, n, r->z, DIM_LENGTH, 3, asc);
		break;
	case C_POWER:
		units_format(buf, n, r->power_in, DIM_POWER, 3, asc);
		break;
	case C_RADIUS:
		layout_radius_text(buf, n, r->wx, r->wy, asc);
		break;
	case C_PEAK:
		units_format(buf, n, r->peak_irradiance, DIM_IRRADIANCE, 3, asc);
		break;
	case C_FLUENCE:
		units_format(buf, n, r->fluence, DIM_FLUENCE, 3, asc);
		break;
	case C_RATIO:
		layout_percent(buf, n, r->ratio);
		break;
	case C_STATUS:
		snprintf(buf, n, "%s", layout_status_word(r->status));
		break;
	case C_FLAGS:
		report_flags(r->flags, buf, n, ",");
		break;
	default:
		break;
	}
}

static void
draw_chain(struct app *a, struct wb *d, const struct wb_geom *g, int w)
{
	struct layout_col cols[C_NCOLS];
	int cw[C_NCOLS], x;
	double caution = 1 / a->bench->safety_factor;

	chain_cols(a, cols);
	layout_fit_columns(cols, C_NCOLS, w - 1, 1, cw);
	x = 1;
	for (int c = 0; c < C_NCOLS; c++)
		if (cw[c] > 0) {
			if (c == C_ELEM || c == C_TYPE || c == C_BAR || c == C_STATUS || c == C_FLAGS)
				ui_put(a, 2, x, cw[c], cols[c].name, UC_HEADER);
			else
				ui_put_right(a, 2, x, cw[c], cols[c].name, ui_attr(a, UC_HEADER));
			x += cw[c] + 1;
		}
	a->scroll = layout_scroll(a->sel, a->scroll, g->chain_h, (int)a->nrows);
	if (a->nrows == 0) {
		ui_put(a, g->chain_y + 1, 2, w - 4, "The bench has no elements yet: press a to add "
		    "the first one (a space, then optics, and a dump, detector or target at the end).",
		    UC_NORMAL);
		return;
	}
	for (int i = 0; i < g->chain_h && a->scroll + i < (int)a->nrows; i++) {
		int ri = a->scroll + i, y = g->chain_y + i;
		const struct layout_row *row = &a->rows[ri];
		int selected = ri == a->sel && d->focus == WB_CHAIN;
		attr_t base = ri == a->sel ? ui_attr(a, selected ? UC_SELECT : UC_HEADER) : A_NORMAL;
		char buf[256], name[200];
		int moving = d->moving != NULL && row->kind == LROW_ELEMENT &&
		    strcmp(row->el->id, d->moving) == 0;

		if (ri == a->sel && !selected)
			base = A_BOLD;
		ui_fill(a, y, 0, w, base);
		if (row->kind == LROW_PORT) {
			snprintf(name, sizeof name, "%*s%s%s.%s%s", (int)row->depth * 2, "",
			    ui_glyph(a, GL_BRANCH), row->el->id, model_port_name(row->port),
			    row->el->side.n == 0 ? "   (empty: a adds an element here)" : "");
			ui_put_attr(a, y, 1, w - 2, name, base | (selected ? 0 : ui_attr(a, UC_DIM)));
			continue;
		}
		snprintf(name, sizeof name, "%s%*s%s", moving ? ">" : "", (int)row->depth * 2, "",
		    row->el->id);
		x = 1;
		for (int c = 0; c < C_NCOLS; c++) {
			const struct trace_row *tr;
			attr_t at = base;

			if (cw[c] == 0)
				continue;
			if (c == C_ELEM) {
				ui_put_attr(a, y, x, cw[c], name, base | (moving ? A_BOLD : 0));
				x += cw[c] + 1;
				continue;
			}
			if (row->trace_row < 0) {
				x += cw[c] + 1;
				continue;
			}
			tr = &a->trace->rows[row->trace_row];
			if (c == C_BAR) {
				layout_bar(buf, sizeof buf, tr->ratio, caution, cw[c], a->ascii);
				ui_put_attr(a, y, x, cw[c], buf, at | ui_status_attr(a, tr->status));
			} else {
				cell_text(a, tr, (enum wb_col)c, buf, sizeof buf);
				if (c == C_STATUS || c == C_RATIO)
					at |= ui_status_attr(a, tr->status);
				if (c == C_STATUS || c == C_TYPE || c == C_FLAGS)
					ui_put_attr(a, y, x, cw[c], buf, at);
				else
					ui_put_right(a, y, x, cw[c], buf, at);
			}
			x += cw[c] + 1;
		}
	}
	if (a->scroll > 0)
		ui_put(a, g->chain_y, w - 1, 1, a->ascii ? "^" : "\u25b2", UC_DIM);
	if (a->scroll + g->chain_h < (int)a->nrows)
		ui_put(a, g->chain_y + g->chain_h - 1, w - 1, 1, a->ascii ? "v" : "\u25bc", UC_DIM);
}

/* ---- the frame around it ---- */

static void
draw_title(struct app *a, int w)
{
	char *t, rev[64];

	ui_fill(a, 0, 0, w, ui_attr(a, UC_TITLE));
	if (a->latest_rev == 0)
		snprintf(rev, sizeof rev, "draft, no revision yet");
	else if (a->draft_changed)
		snprintf(rev, sizeof rev, "draft: changed since r%d", a->latest_rev);
	else
		snprintf(rev, sizeof rev, "draft = r%d", a->latest_rev);
	{
		size_t n = model_count(&a->bench->path);

		t = xasprintf(" beamledger %s %s %s %s %s %zu element%s", ui_glyph(a, GL_VBAR),
		    a->name, ui_glyph(a, GL_VBAR), rev, ui_glyph(a, GL_VBAR), n, n == 1 ? "" : "s");
	}
	ui_put(a, 0, 0, w - 17, t, UC_TITLE);
	free(t);
	if (a->readonly)
		ui_put_right(a, 0, w - 17, 16, "VIEW ONLY ", ui_attr(a, UC_TITLE));
	else if (a->unsaved != NULL)
		ui_put_right(a, 0, w - 17, 16, "DRAFT NOT SAVED ", ui_attr(a, UC_ERROR));
	else
		ui_put_right(a, 0, w - 17, 16, "draft saved ", ui_attr(a, UC_TITLE));
}

void
wb_draw_status(struct app *a, int y, int w)
{
	char *s = layout_status_line(a->trace, a->ascii, w - 1);
	const char *cut = strstr(s, a->ascii ? " |" : " \u2502");
	enum damage_status worst = a->trace->worst >= 0 ?
	    a->trace->rows[a->trace->worst].status : STATUS_UNRATED;

	ui_fill(a, y, 0, w, ui_attr(a, UC_STATUS));
	ui_put_attr(a, y, 0, w, s, ui_attr(a, UC_STATUS));
	if (cut != NULL && worst >= STATUS_CAUTION) {
		s[cut - s] = '\0';
		ui_put_attr(a, y, 0, (int)utf8_cols(s) < w ? (int)utf8_cols(s) : w, s,
		    ui_status_attr(a, worst) | A_REVERSE);
	}
	free(s);
}

static void
draw_wb(struct app *a, struct ui_pane *p, int h, int w)
{
	struct wb *d = p->data;
	struct wb_geom g;
	char *src, *t;
	struct layout_hint hints[40];
	size_t nh;

	wb_geometry(h, a->nrows, &g);
	draw_title(a, w);
	src = report_source_line(a->bench, a->ascii);
	t = xasprintf("source: %s; safety factor %g", src, a->bench->safety_factor);
	ui_put(a, 1, 1, w - 2, t, UC_NORMAL);
	free(t);
	free(src);
	draw_chain(a, d, &g, w);
	wb_draw_detail(a, d, &g, w);
	if (a->msg != NULL)
		ui_put(a, h - 3, 0, w, a->msg, a->msg_error ? UC_ERROR : UC_INFO);
	wb_draw_status(a, h - 2, w);
	nh = wb_hints(a, d, hints, 40);
	ui_hints(a, h - 1, w, hints, nh);
}

/* ---- edits on the chain ---- */

struct add_arg {
	struct element el;          /* owned until added */
	struct edit_place pl;
	char *after, *before, *into;    /* owned: the place's strings */
};

static int
do_add(struct bench *b, void *arg, char **cause)
{
	struct add_arg *x = arg;
	struct element copy;

	model_element_copy(&copy, &x->el);
	return edit_add(b, &copy, &x->pl, cause);
}

/* Where a new element goes: after (or before) the selected element, at the
 * start of a side branch when a port row is selected, at the end of the
 * main path when the bench is empty. */
static void
place_for(struct app *a, int before, struct add_arg *x)
{
	const struct layout_row *r = app_sel_row(a);

	memset(&x->pl, 0, sizeof x->pl);
	if (r == NULL)
		return;
	if (r->kind == LROW_PORT) {
		x->into = xasprintf("%s.%s", r->el->id, model_port_name(r->port));
		x->pl.into = x->into;
		x->pl.at_start = 1;
	} else if (before) {
		x->before = xstrdup(r->el->id);
		x->pl.before = x->before;
	} else {
		x->after = xstrdup(r->el->id);
		x->pl.after = x->after;
	}
}

static void
add_arg_free(struct add_arg *x)
{
	model_element_release(&x->el);
	free(x->after);
	free(x->before);
	free(x->into);
	free(x);
}

static const char *
place_words(const struct add_arg *x, char *buf, size_t n)
{
	if (x->pl.into != NULL)
		snprintf(buf, n, "at the start of %s", x->pl.into);
	else if (x->pl.before != NULL)
		snprintf(buf, n, "before %s", x->pl.before);
	else if (x->pl.after != NULL)
		snprintf(buf, n, "after %s", x->pl.after);
	else
		snprintf(buf, n, "at the end of the main path");
	return buf;
}

/* Adds x->el; on success selects it and says so. */
static int
wb_add_element(struct app *a, struct add_arg *x, char **cause)
{
	char where[160];

	if (app_edit(a, do_add, x, cause) != 0)
		return -1;
	app_select_id(a, x->el.id, 0);
	app_msg(a, 0, "added %s %s %s (u undoes; Enter edits its values)",
	    model_type_name(x->el.type), x->el.id, place_words(x, where, sizeof where));
	return 0;
}

static int
required_given(struct app *a, void *arg, const char *text, char **cause)
{
	struct add_arg *x = arg;
	int k = layout_required_key(x->el.type);
	struct element probe;

	model_element_copy(&probe, &x->el);
	if (model_set_text(&probe, (enum model_key)k, text, cause) != 0) {
		model_element_release(&probe);
		return -1;
	}
	model_element_release(&x->el);
	x->el = probe;
	return wb_add_element(a, x, cause);
}

static void prompt_add(struct app *, const char *, const char *, struct add_arg *);

static void
type_chosen(struct app *a, void *arg, int choice)
{
	const int *before = arg;
	struct add_arg *x = xcalloc(1, sizeof *x);
	enum elem_type t = (enum elem_type)choice;
	char *id = layout_new_id(a->bench, t), *cause = NULL;
	int k = layout_required_key(t);

	if (edit_element_new(&x->el, model_type_name(t), id, NULL, 0, &cause) != 0) {
		app_msg_take(a, 1, cause);
		free(id);
		free(x);
		return;
	}
	free(id);
	place_for(a, *before, x);
	if (k < 0) {
		if (wb_add_element(a, x, &cause) != 0)
			app_msg_take(a, 1, cause);
		add_arg_free(x);
		return;
	}
	{
		char where[160], *title, *help;

		title = xasprintf("new %s %s", model_type_name(t), x->el.id);
		help = xasprintf("%s (%s), needed before it can go %s. With units where they "
		    "apply, e.g. \"250 mm\".", model_key_path((enum model_key)k),
		    model_keys[k].help, place_words(x, where, sizeof where));
		prompt_add(a, title, help, x);
		free(title);
		free(help);
	}
}

static void
add_arg_release(void *x)
{
	add_arg_free(x);
}

/* The prompt owns x and frees it when it closes. */
static void
prompt_add(struct app *a, const char *title, const char *help, struct add_arg *x)
{
	ui_prompt(a, title, help, "", required_given, x, add_arg_release);
}

static const char *const type_items[EL_NTYPES] = {
	[EL_SPACE] = "s\tspace\t", [EL_MIRROR] = "m\tmirror\t", [EL_LENS] = "l\tlens\t",
	[EL_SPLITTER] = "b\tsplitter\t", [EL_WINDOW] = "w\twindow\t",
	[EL_FILTER] = "f\tfilter\t", [EL_WAVEPLATE] = "v\twaveplate\t",
	[EL_POLARIZER] = "p\tpolarizer\t", [EL_IRIS] = "i\tiris\t", [EL_DUMP] = "d\tdump\t",
	[EL_DETECTOR] = "e\tdetector\t", [EL_TARGET] = "t\ttarget\t",
	[EL_ISOLATOR] = "o\tisolator\t",
};

static enum ui_reaction
open_type_menu(struct app *a, struct wb *d, int before)
{
	char *items[EL_NTYPES];
	const struct layout_row *r = app_sel_row(a);
	char title[160];

	for (int t = 0; t < EL_NTYPES; t++)
		items[t] = xasprintf("%s%s", type_items[t], layout_type_help((enum elem_type)t));
	d->add.before = before;
	if (r == NULL)
		snprintf(title, sizeof title, "add the first element");
	else if (r->kind == LROW_PORT)
		snprintf(title, sizeof title, "add into %s.%s", r->el->id, model_port_name(r->port));
	else
		snprintf(title, sizeof title, "add %s %s", before ? "before" : "after", r->el->id);
	ui_menu(a, title, (const char *const *)items, EL_NTYPES, type_chosen, &d->add.before);
	for (int t = 0; t < EL_NTYPES; t++)
		free(items[t]);
	return UI_REDRAW;
}

int
wb_place(struct app *a, struct element *el, char **cause)
{
	struct add_arg *x = xcalloc(1, sizeof *x);
	int rc;

	x->el = *el;
	place_for(a, 0, x);
	rc = wb_add_element(a, x, cause);
	add_arg_free(x);
	return rc;
}

static enum ui_reaction
k_add(struct app *a, struct ui_pane *p)
{
	return open_type_menu(a, p->data, 0);
}

static enum ui_reaction
k_insert(struct app *a, struct ui_pane *p)
{
	return open_type_menu(a, p->data, 1);
}

static int
do_remove(struct bench *b, void *arg, char **cause)
{
	return edit_remove(b, arg, cause);
}

static enum ui_reaction
k_delete(struct app *a, struct ui_pane *p)
{
	const struct layout_row *r = app_sel_row(a);
	char *id, *cause = NULL;
	size_t side;

	(void)p;
	if (r == NULL)
		return UI_NONE;
	if (r->kind == LROW_PORT) {
		app_msg(a, 1, "this row is %s's side branch: select an element to delete it, or "
		    "delete %s itself", r->el->id, r->el->id);
		return UI_REDRAW;
	}
	id = xstrdup(r->el->id);
	side = model_count(&r->el->side);
	if (app_edit(a, do_remove, id, &cause) != 0)
		app_msg_take(a, 1, cause);
	else if (side > 0)
		app_msg(a, 0, "deleted %s and the %zu element(s) of its side branch (u undoes)",
		    id, side);
	else
		app_msg(a, 0, "deleted %s (u undoes)", id);
	free(id);
	return UI_REDRAW;
}

struct move_arg {
	const char *id;
	struct edit_place pl;
};

static int
do_move(struct bench *b, void *arg, char **cause)
{
	struct move_arg *m = arg;

	return edit_move(b, m->id, &m->pl, cause);
}

/* One place up or down inside the element's own branch. */
static enum ui_reaction
nudge(struct app *a, int by)
{
	const struct layout_row *r = app_sel_row(a);
	struct branch *br;
	size_t i;
	struct move_arg m;
	char *id, *cause = NULL;

	if (r == NULL || r->kind == LROW_PORT)
		return UI_NONE;
	id = xstrdup(r->el->id);
	model_find(a->bench, id, &br, &i, NULL);
	memset(&m, 0, sizeof m);
	m.id = id;
	if (by < 0 && i == 0) {
		app_msg(a, 1, "%s is first in its branch: m moves it anywhere", id);
	} else if (by > 0 && i + 1 >= br->n) {
		app_msg(a, 1, "%s is last in its branch: m moves it anywhere", id);
	} else {
		char *ref = xstrdup(br->el[by < 0 ? i - 1 : i + 1].id);

		if (by < 0)
			m.pl.before = ref;
		else
			m.pl.after = ref;
		if (app_edit(a, do_move, &m, &cause) != 0)
			app_msg_take(a, 1, cause);
		else
			app_msg(a, 0, "moved %s %s %s (u undoes)", id, by < 0 ? "before" : "after", ref);
		free(ref);
	}
	free(id);
	return UI_REDRAW;
}

static enum ui_reaction
k_nudge_up(struct app *a, struct ui_pane *p)
{
	(void)p;
	return nudge(a, -1);
}

static enum ui_reaction
k_nudge_down(struct app *a, struct ui_pane *p)
{
	(void)p;
	return nudge(a, 1);
}

static enum ui_reaction
k_move(struct app *a, struct ui_pane *p)
{
	struct wb *d = p->data;
	const struct layout_row *r = app_sel_row(a);

	if (r == NULL || r->kind == LROW_PORT)
		return UI_NONE;
	free(d->moving);
	d->moving = xstrdup(r->el->id);
	app_msg(a, 0, "moving %s: choose the row to put it after (a port row: into that "
	    "branch), then Enter; Esc cancels", d->moving);
	return UI_REDRAW;
}

static enum ui_reaction
k_drop(struct app *a, struct ui_pane *p)
{
	struct wb *d = p->data;
	const struct layout_row *r = app_sel_row(a);
	struct move_arg m;
	char *into = NULL, *cause = NULL;

	if (r == NULL || d->moving == NULL)
		return UI_NONE;
	memset(&m, 0, sizeof m);
	m.id = d->moving;
	if (r->kind == LROW_PORT) {
		into = xasprintf("%s.%s", r->el->id, model_port_name(r->port));
		m.pl.into = into;
		m.pl.at_start = 1;
	} else if (strcmp(r->el->id, d->moving) == 0) {
		app_msg(a, 0, "%s stays where it is", d->moving);
		free(d->moving);
		d->moving = NULL;
		return UI_REDRAW;
	} else {
		m.pl.after = r->el->id;
	}
	if (app_edit(a, do_move, &m, &cause) != 0) {
		app_msg_take(a, 1, cause);     /* stay in move mode: choose another place */
	} else {
		app_select_id(a, d->moving, 0);
		app_msg(a, 0, "moved %s (u undoes)", d->moving);
		free(d->moving);
		d->moving = NULL;
	}
	free(into);
	return UI_REDRAW;
}

static enum ui_reaction
k_move_cancel(struct app *a, struct ui_pane *p)
{
	struct wb *d = p->data;

	app_msg(a, 0, "move cancelled");
	free(d->moving);
	d->moving = NULL;
	return UI_REDRAW;
}

static enum ui_reaction
k_undo(struct app *a, struct ui_pane *p)
{
	(void)p;
	if (app_undo(a) != 0) {
		if (!a->readonly)
			app_msg(a, 1, "nothing to undo");
	} else {
		app_msg(a, 0, "undone (%zu more; U redoes)", a->nundo);
	}
	return UI_REDRAW;
}

static enum ui_reaction
k_redo(struct app *a, struct ui_pane *p)
{
	(void)p;
	if (app_redo(a) != 0) {
		if (!a->readonly)
			app_msg(a, 1, "nothing to redo");
	} else {
		app_msg(a, 0, "redone (%zu more)", a->nredo);
	}
	return UI_REDRAW;
}

/* ---- moving around ---- */

static enum ui_reaction
sel_by(struct app *a, int by)
{
	a->sel += by;
	if (a->sel >= (int)a->nrows)
		a->sel = (int)a->nrows - 1;
	if (a->sel < 0)
		a->sel = 0;
	return UI_REDRAW;
}

static enum ui_reaction
k_up(struct app *a, struct ui_pane *p)
{
	(void)p;
	return sel_by(a, -1);
}

static enum ui_reaction
k_down(struct app *a, struct ui_pane *p)
{
	(void)p;
	return sel_by(a, 1);
}

static enum ui_reaction
k_pgup(struct app *a, struct ui_pane *p)
{
	struct wb_geom g;

	(void)p;
	wb_geometry(LINES, a->nrows, &g);
	return sel_by(a, -(g.chain_h - 1));
}

static enum ui_reaction
k_pgdn(struct app *a, struct ui_pane *p)
{
	struct wb_geom g;

	(void)p;
	wb_geometry(LINES, a->nrows, &g);
	return sel_by(a, g.chain_h - 1);
}

static enum ui_reaction
k_home(struct app *a, struct ui_pane *p)
{
	(void)p;
	a->sel = 0;
	return UI_REDRAW;
}

static enum ui_reaction
k_end(struct app *a, struct ui_pane *p)
{
	(void)p;
	return sel_by(a, (int)a->nrows);
}

static enum ui_reaction
k_worst(struct app *a, struct ui_pane *p)
{
	(void)p;
	if (a->trace->worst < 0) {
		app_msg(a, 0, "nothing on this bench has a damage threshold yet");
		return UI_REDRAW;
	}
	app_select_id(a, a->trace->rows[a->trace->worst].el->id, 0);
	app_msg(a, 0, "worst: %s", a->trace->rows[a->trace->worst].el->id);
	return UI_REDRAW;
}

/* The next row after the selection at caution or over, wrapping. */
static enum ui_reaction
k_next_problem(struct app *a, struct ui_pane *p)
{
	(void)p;
	for (size_t k = 1; k <= a->nrows; k++) {
		size_t i = ((size_t)a->sel + k) % a->nrows;
		const struct layout_row *r = &a->rows[i];

		if (r->trace_row >= 0 && a->trace->rows[r->trace_row].status >= STATUS_CAUTION) {
			a->sel = (int)i;
			return UI_REDRAW;
		}
	}
	app_msg(a, 0, "no element at caution or over");
	return UI_REDRAW;
}

static void
leave_anyway(struct app *a, void *arg, int yes)
{
	(void)arg;
	if (yes) {
		free(a->unsaved);
		a->unsaved = NULL;
		app_pop(a);             /* the workbench, now on top again */
	}
}

static enum ui_reaction
k_back(struct app *a, struct ui_pane *p)
{
	char *q;

	(void)p;
	if (a->unsaved == NULL || app_save(a) == 0)
		return UI_POP | UI_REDRAW;
	q = xasprintf("The draft could not be saved (%s). Leave the bench anyway and lose "
	    "the changes since the last save?", a->unsaved);
	ui_confirm(a, q, leave_anyway, NULL);
	free(q);
	return UI_REDRAW;
}

static enum ui_reaction
k_profile(struct app *a, struct ui_pane *p)
{
	(void)p;
	if (a->trace->nrows == 0) {
		app_msg(a, 1, "no elements: nothing to plot yet");
		return UI_REDRAW;
	}
	ui_profile_push(a);
	return UI_REDRAW;
}

static enum ui_reaction
k_history(struct app *a, struct ui_pane *p)
{
	(void)p;
	ui_history_push(a);
	return UI_REDRAW;
}

static enum ui_reaction
k_commit(struct app *a, struct ui_pane *p)
{
	(void)p;
	ui_commit_prompt(a);
	return UI_REDRAW;
}

static enum ui_reaction
k_parts(struct app *a, struct ui_pane *p)
{
	(void)p;
	ui_parts_push(a);
	return UI_REDRAW;
}

const struct ui_key ui_bench_chain_keys[] = {
	{ { UI_FKEY(KEY_UP), 'k' }, "\u2191\u2193", "select", 5, "select an element (also k, j; mouse click)", k_up, 0 },
	{ { UI_FKEY(KEY_DOWN), 'j' }, "\u2193", NULL, 0, NULL, k_down, 0 },
	{ { UI_FKEY(KEY_PPAGE) }, "PgUp", NULL, 0, "a page up", k_pgup, 0 },
	{ { UI_FKEY(KEY_NPAGE) }, "PgDn", NULL, 0, "a page down", k_pgdn, 0 },
	{ { UI_FKEY(KEY_HOME), 'g' }, "Home", NULL, 0, "first element (also g)", k_home, 0 },
	{ { UI_FKEY(KEY_END), 'G' }, "End", NULL, 0, "last element (also G)", k_end, 0 },
	{ { '\r', '\n', UI_FKEY(KEY_ENTER), 'e' }, "Enter", "edit", 0,
	    "edit the selected element's values in place (also e, Tab)", wb_k_fields, 0 },
	{ { 'a' }, "a", "add", 1, "add an element after the selection (on a port row: into that branch)", k_add, UI_K_EDITS },
	{ { 'i' }, "i", "insert", 3, "insert an element before the selection", k_insert, UI_K_EDITS },
	{ { 'x', UI_FKEY(KEY_DC) }, "x", "del", 2, "delete the selected element and its side branch (also Del)", k_delete, UI_K_EDITS },
	{ { 'm' }, "m", "move", 3, "move the selection: pick a row, then Enter", k_move, UI_K_EDITS },
	{ { '[', '-' }, "[", NULL, 0, "move the selection one place up its branch", k_nudge_up, UI_K_EDITS },
	{ { ']', '+' }, "]", NULL, 0, "move the selection one place down its branch", k_nudge_down, UI_K_EDITS },
	{ { 'u' }, "u", "undo", 1, "undo the last change to the draft", k_undo, UI_K_EDITS },
	{ { 'U', UI_CTRL('r') }, "U", "redo", 4, "redo (also ^R)", k_redo, UI_K_EDITS },
	{ { 's' }, "s", "source", 3, "edit the source and bench settings (wavelength, power, pulse, waist, M\u00b2, ...)", wb_k_settings, 0 },
	{ { 'w' }, "w", "worst", 3, "jump to the worst element", k_worst, 0 },
	{ { 'n' }, "n", NULL, 0, "jump to the next element at caution or over", k_next_problem, 0 },
	{ { 'p' }, "p", "profile", 1, "beam profile along the selected element's branch", k_profile, 0 },
	{ { 'P' }, "P", "parts", 3, "the parts shelf: place a part, keep an element as a part", k_parts, 0 },
	{ { 'h' }, "h", "history", 1, "revisions: diff, restore, label", k_history, 0 },
	{ { 'c' }, "c", "commit", 1, "commit the draft as a new revision, with a note", k_commit, UI_K_EDITS },
	{ { 'q', UI_ESC }, "q", "list", 1, "back to the bench list (the draft is saved)", k_back, 0 },
	{ { 0 }, NULL, NULL, 0, NULL, NULL, 0 },
};

const struct ui_key ui_bench_move_keys[] = {
	{ { UI_FKEY(KEY_UP), 'k' }, "\u2191\u2193", "choose place", 0, "choose where the element goes", k_up, 0 },
	{ { UI_FKEY(KEY_DOWN), 'j' }, "\u2193", NULL, 0, NULL, k_down, 0 },
	{ { '\r', '\n', UI_FKEY(KEY_ENTER), 'm' }, "Enter", "put it after this row", 0,
	    "drop the moving element after this row (a port row: first in that branch)", k_drop, UI_K_EDITS },
	{ { UI_ESC, 'q' }, "Esc", "cancel move", 0, "leave it where it was", k_move_cancel, 0 },
	{ { 0 }, NULL, NULL, 0, NULL, NULL, 0 },
};

/* ---- the pane ---- */

static enum ui_reaction
wb_key(struct app *a, struct ui_pane *p, int key)
{
	struct wb *d = p->data;
	const struct ui_key *table = d->moving != NULL ? ui_bench_move_keys :
	    d->focus == WB_FIELDS ? ui_bench_field_keys : ui_bench_chain_keys;

	if (d->editing)
		return wb_edit_key(a, d, key);
	for (const struct ui_key *k = table; k->fn != NULL; k++)
		if (ui_key_match(k, key)) {
			if ((k->flags & UI_K_EDITS) && app_refuse_readonly(a))
				return UI_REDRAW;
			return k->fn(a, p);
		}
	if (d->focus == WB_FIELDS && d->moving == NULL)
		return wb_fields_type(a, d, key);
	return UI_NONE;
}

static enum ui_reaction
wb_click(struct app *a, struct ui_pane *p, int y, int x, int dbl)
{
	struct wb *d = p->data;
	struct wb_geom g;
	int i;

	(void)x;
	wb_geometry(LINES, a->nrows, &g);
	if (d->editing)
		return UI_NONE;
	if (y >= g.chain_y && y < g.chain_y + g.chain_h) {
		i = a->scroll + y - g.chain_y;
		if (i >= (int)a->nrows)
			return UI_NONE;
		a->sel = i;
		d->focus = WB_CHAIN;
		d->mode = WB_ELEMENT;
		return dbl && d->moving == NULL ? wb_k_fields(a, p) : UI_REDRAW;
	}
	if (y >= g.detail_y && y < g.detail_y + g.detail_h)
		return wb_click_fields(a, d, y - g.detail_y, dbl, p);
	return UI_NONE;
}

static void
wb_release(struct ui_pane *p)
{
	struct wb *d = p->data;

	free(d->moving);
	ui_line_release(&d->line);
	free(d->error);
	free(d);
}

static size_t
wb_hints_cb(struct app *a, struct ui_pane *p, struct layout_hint *h, size_t max)
{
	return wb_hints(a, p->data, h, max);
}

size_t
wb_hints(struct app *a, struct wb *d, struct layout_hint *h, size_t max)
{
	const struct ui_key *table = d->moving != NULL ? ui_bench_move_keys :
	    d->focus == WB_FIELDS ? ui_bench_field_keys : ui_bench_chain_keys;
	size_t n;

	if (d->editing) {
		static const struct layout_hint edit_hints[] = {
			{ "Enter", "apply", 0 }, { "Esc", "cancel", 0 }, { "^U", "clear", 1 },
			{ "\u2190\u2192", "cursor", 2 },
		};

		(void)a;
		n = sizeof edit_hints / sizeof *edit_hints;
		memcpy(h, edit_hints, n * sizeof *h);
		return n;
	}
	n = ui_table_hints(table, h, max - 1);
	h[n++] = (struct layout_hint){ "?", "help", 0 };
	return n;
}

const struct ui_pane_ops ui_bench_ops = {
	"workbench", 0, NULL, draw_wb, wb_key, wb_click, NULL, wb_hints_cb, wb_release,
};

void
ui_bench_push(struct app *a)
{
	struct wb *d = xcalloc(1, sizeof *d);

	app_push(a, &ui_bench_ops, d);
}
