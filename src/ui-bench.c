/* ui-bench.c - the workbench screen: the chain with every element's
 * results (power, radius, peak irradiance or fluence, ratio bar, status),
 * the selected element's values and results below it, the margin line,
 * and the chain's keys: select, place, lift, shift, duplicate, undo,
 * record and the ways to the other screens.  Drawing is ui-bench-draw.c's,
 * the value editor ui-fields.c's.  Owned by the workbench. */
#include <config.h>

#include <stdlib.h>
#include <string.h>

#include "core-edit.h"
#include "ui-bench.h"
#include "util-err.h"

/* ---- edits on the chain ---- */

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
		app_msg(a, 1, "this row is %s's side branch: select an element to lift it, or "
		    "lift %s itself", r->el->id, r->el->id);
		return UI_REDRAW;
	}
	id = xstrdup(r->el->id);
	side = model_count(&r->el->side);
	if (app_edit(a, do_remove, id, &cause) != 0)
		app_msg_take(a, 1, cause);
	else if (side > 0)
		app_msg(a, 0, "lifted %s and the %zu element%s of its side branch (- undoes)",
		    id, side, side == 1 ? "" : "s");
	else
		app_msg(a, 0, "lifted %s (- undoes)", id);
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
		app_msg(a, 1, "%s is first in its branch: s shifts it anywhere", id);
	} else if (by > 0 && i + 1 >= br->n) {
		app_msg(a, 1, "%s is last in its branch: s shifts it anywhere", id);
	} else {
		char *ref = xstrdup(br->el[by < 0 ? i - 1 : i + 1].id);

		if (by < 0)
			m.pl.before = ref;
		else
			m.pl.after = ref;
		if (app_edit(a, do_move, &m, &cause) != 0)
			app_msg_take(a, 1, cause);
		else
			app_msg(a, 0, "shifted %s %s %s (- undoes)", id, by < 0 ? "before" : "after", ref);
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
	app_msg(a, 0, "shifting %s: choose the row to put it after (a port row: into that "
	    "branch), then Enter; Esc leaves it", d->moving);
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
		app_msg(a, 0, "shifted %s (- undoes)", d->moving);
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

	app_msg(a, 0, "%s stays where it was", d->moving);
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
		app_msg(a, 0, "undone (%zu more; + redoes)", a->nundo);
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

/* The next row after the selection with a hazard, wrapping. */
static enum ui_reaction
k_next_problem(struct app *a, struct ui_pane *p)
{
	(void)p;
	for (size_t k = 1; k <= a->nrows; k++) {
		size_t i = ((size_t)a->sel + k) % a->nrows;
		const struct layout_row *r = &a->rows[i];

		if (r->trace_row >= 0 && layout_row_hazard(a->trace, (size_t)r->trace_row)) {
			a->sel = (int)i;
			return UI_REDRAW;
		}
	}
	app_msg(a, 0, "no element with a hazard");
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
k_record(struct app *a, struct ui_pane *p)
{
	(void)p;
	ui_record_prompt(a);
	return UI_REDRAW;
}

static enum ui_reaction
k_compare(struct app *a, struct ui_pane *p)
{
	(void)p;
	ui_compare_draft(a);
	return UI_REDRAW;
}

static enum ui_reaction
k_hazards(struct app *a, struct ui_pane *p)
{
	(void)p;
	ui_hazards_push(a);
	return UI_REDRAW;
}

static enum ui_reaction
k_reflections(struct app *a, struct ui_pane *p)
{
	(void)p;
	if (a->trace->ghosts == NULL) {
		app_msg(a, 1, "this trace follows the main beam only: no reflections to list");
		return UI_REDRAW;
	}
	ui_reflections_push(a);
	return UI_REDRAW;
}

static enum ui_reaction
k_tolerance(struct app *a, struct ui_pane *p)
{
	(void)p;
	ui_tolerance_push(a);
	return UI_REDRAW;
}

static enum ui_reaction
k_parts(struct app *a, struct ui_pane *p)
{
	(void)p;
	ui_parts_push(a);
	return UI_REDRAW;
}

static enum ui_reaction
k_points(struct app *a, struct ui_pane *p)
{
	(void)p;
	ui_points_push(a);
	return UI_REDRAW;
}

static enum ui_reaction
k_sweep(struct app *a, struct ui_pane *p)
{
	char *knob = wb_marked_knob(a, p->data);

	/* opened on the marked field, when it is a number */
	ui_sweep_prompt(a, knob);
	free(knob);
	return UI_REDRAW;
}

static enum ui_reaction
k_point_next(struct app *a, struct ui_pane *p)
{
	(void)p;
	ui_point_cycle(a);
	return UI_REDRAW;
}

static enum ui_reaction
k_point_worst(struct app *a, struct ui_pane *p)
{
	(void)p;
	ui_point_worst_toggle(a);
	return UI_REDRAW;
}

const struct ui_key ui_bench_chain_keys[] = {
	{ { UI_FKEY(KEY_UP) }, "\u2191\u2193", NULL, 0, "select an element (the mouse too)", k_up, 0, UG_MOVE },
	{ { UI_FKEY(KEY_DOWN) }, "\u2193", NULL, 0, NULL, k_down, 0, UG_MOVE },
	{ { UI_FKEY(KEY_PPAGE) }, "PgUp", NULL, 0, "a page up", k_pgup, 0, UG_MOVE },
	{ { UI_FKEY(KEY_NPAGE) }, "PgDn", NULL, 0, "a page down", k_pgdn, 0, UG_MOVE },
	{ { UI_FKEY(KEY_HOME) }, "Home", NULL, 0, "the first element", k_home, 0, UG_MOVE },
	{ { UI_FKEY(KEY_END) }, "End", NULL, 0, "the last element", k_end, 0, UG_MOVE },
	{ { 'w' }, "w", NULL, 0, "the worst element", k_worst, 0, UG_MOVE },
	{ { 'n' }, "n", NULL, 0, "the next element with a hazard", k_next_problem, 0, UG_MOVE },
	{ { 'p', UI_FKEY(KEY_IC) }, "p", "place", 1, "place an element after the selection (on a port row: into that branch; also Insert)", wb_k_place, UI_K_EDITS | UI_K_LAYOUT, UG_LAYOUT },
	{ { 'P' }, "P", NULL, 0, "place an element before the selection", wb_k_place_before, UI_K_EDITS | UI_K_LAYOUT, UG_LAYOUT },
	{ { 'l', UI_FKEY(KEY_DC) }, "l", "lift", 3, "lift the selected element off the bench, with its side branch (also Delete)", k_delete, UI_K_EDITS | UI_K_LAYOUT, UG_LAYOUT },
	{ { 's' }, "s", "shift", 4, "shift the selection: choose a row, then Enter", k_move, UI_K_EDITS | UI_K_LAYOUT, UG_LAYOUT },
	{ { '<', UI_FKEY(KEY_SR) }, "<", NULL, 0, "shift the selection one place up its branch (also Shift-Up)", k_nudge_up, UI_K_EDITS | UI_K_LAYOUT, UG_LAYOUT },
	{ { '>', UI_FKEY(KEY_SF) }, ">", NULL, 0, "shift the selection one place down its branch (also Shift-Down)", k_nudge_down, UI_K_EDITS | UI_K_LAYOUT, UG_LAYOUT },
	{ { 'd' }, "d", "duplicate", 5, "duplicate the selected element with a new id, right after it", wb_k_duplicate, UI_K_EDITS | UI_K_LAYOUT, UG_LAYOUT },
	{ { '-' }, "-", "undo", 2, "undo the last change to the draft", k_undo, UI_K_EDITS, UG_LAYOUT },
	{ { '+', '=' }, "+", NULL, 0, "redo a change undone (also =)", k_redo, UI_K_EDITS, UG_LAYOUT },
	{ { '\r', '\n', UI_FKEY(KEY_ENTER) }, "Enter", "edit", 0,
	    "edit the selected element's values, starting at the marked one", wb_k_fields, 0, UG_VALUES },
	{ { 'b' }, "b", "beam", 3, "the beam and bench settings (wavelength, power, pulse, waist, M\u00b2, ...)", wb_k_settings, 0, UG_VALUES },
	{ { 'r' }, "r", "record", 1, "record the draft as a new numbered setup, with a note", k_record, UI_K_EDITS, UG_RECORD },
	{ { 'h' }, "h", "history", 3, "the bench's logbook: its setups, compare, reinstate, mark", k_history, 0, UG_RECORD },
	{ { 'c' }, "c", NULL, 0, "compare the draft with the setup it came from", k_compare, 0, UG_RECORD },
	{ { '!' }, "!", "hazards", 1, "every hazard on the bench; Enter goes to its element", k_hazards, 0, UG_LOOK },
	{ { 'f' }, "f", "reflections", 2, "every ghost and stray, worst first; Enter goes to its element", k_reflections, 0, UG_LOOK },
	{ { 't' }, "t", "tolerance", 2, "the odds that each rated optic is over when every tolerance is drawn at random (Monte-Carlo); Enter goes to an element", k_tolerance, 0, UG_LOOK },
	{ { 'z' }, "z", "profile", 4, "the beam along z to the end of the selected element's branch", k_profile, 0, UG_LOOK },
	{ { 'S' }, "S", NULL, 0, "the parts shelf: place a part, keep an element as a part", k_parts, 0, UG_LOOK },
	{ { 'o' }, "o", NULL, 0, "every operating point side by side: each element's ratio at each", k_points, 0, UG_LOOK },
	{ { 'v' }, "v", NULL, 0, "sweep a value of the selected element (or the source) over a range", k_sweep, 0, UG_LOOK },
	{ { 'O' }, "O", NULL, 0, "the next operating point on the chain, the base first (values typed then are its overrides)", k_point_next, 0, UG_LOOK },
	{ { 'W' }, "W", NULL, 0, "the chain's ratio and status as each element's worst over every point, and where (again: back)", k_point_worst, 0, UG_LOOK },
	{ { 'q', UI_ESC }, "q", "list", 3, "back to the bench list (the draft is saved; also Esc)", k_back, 0, UG_LEAVE },
	UI_KEYS_END,
};

const struct ui_key ui_bench_move_keys[] = {
	{ { UI_FKEY(KEY_UP) }, "\u2191\u2193", "choose place", 0, "choose where the element goes", k_up, 0, UG_MOVE },
	{ { UI_FKEY(KEY_DOWN) }, "\u2193", NULL, 0, NULL, k_down, 0, UG_MOVE },
	{ { '\r', '\n', UI_FKEY(KEY_ENTER), 's' }, "Enter", "put it after this row", 0,
	    "put the element after this row (a port row: first in that branch)", k_drop, UI_K_EDITS, UG_LAYOUT },
	{ { UI_ESC, 'q' }, "Esc", "leave it", 0, "leave it where it was", k_move_cancel, 0, UG_LEAVE },
	UI_KEYS_END,
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
			if ((k->flags & UI_K_LAYOUT) && app_point_name(a) != NULL) {
				app_msg(a, 1, "point %s is shown: the layout is the base's; O until "
				    "the base is shown, then change it", app_point_name(a));
				return UI_REDRAW;
			}
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
	free(d->field_of);
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
			{ "Enter", "apply", 0, UG_VALUES }, { "Esc", "cancel", 0, UG_VALUES },
			{ "^U", "clear", 1, UG_VALUES }, { "\u2190\u2192", "cursor", 2, UG_MOVE },
		};

		(void)a;
		n = sizeof edit_hints / sizeof *edit_hints;
		memcpy(h, edit_hints, n * sizeof *h);
		return n;
	}
	n = ui_table_hints(table, h, max - 2);
	if (table == ui_bench_chain_keys && app_point_name(a) != NULL) {
		/* a point shown: the layout keys are refused, so not offered */
		size_t m = 0;

		for (size_t i = 0; i < n; i++) {
			int layout = 0;

			for (const struct ui_key *k = table; k->fn != NULL; k++)
				if ((k->flags & UI_K_LAYOUT) && k->hint != NULL &&
				    strcmp(k->label, h[i].key) == 0)
					layout = 1;
			if (!layout)
				h[m++] = h[i];
		}
		n = m;
	}
	if (table == ui_bench_chain_keys && a->bench->points.n > 0) {
		/* with the other ways of looking, before leaving; at a point it
		 * is the way on and back to the base, so kept before f and t (at
		 * the base the margin line says "O: N points") */
		size_t at = n;

		while (at > 0 && h[at - 1].group > UG_LOOK)
			at--;
		memmove(h + at + 1, h + at, (n - at) * sizeof *h);
		h[at] = (struct layout_hint){ "O", "point", app_point_name(a) != NULL ? 1 : 3,
		    UG_LOOK };
		n++;
	}
	h[n++] = (struct layout_hint){ "?", "help", 0, UG_COUNT };
	return n;
}

const struct ui_pane_ops ui_bench_ops = {
	"workbench", 0, NULL, wb_draw, wb_key, wb_click, NULL, wb_hints_cb, wb_release,
};

void
ui_bench_push(struct app *a)
{
	struct wb *d = xcalloc(1, sizeof *d);

	app_push(a, &ui_bench_ops, d);
}
