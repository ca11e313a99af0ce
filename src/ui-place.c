/* ui-place.c - putting elements on the chain: the type menu, then one
 * skippable question for each value that matters for that type (the
 * required one first, then e.g. a mirror's angle, a filter's OD, the
 * rating its type takes), and duplicating the selected element under a
 * new id.  Split from ui-bench.c.  Owned by the workbench. */
#include <config.h>

#include <stdlib.h>
#include <string.h>

#include "core-edit.h"
#include "ui-bench.h"
#include "util-err.h"

struct add_arg {
	struct element el;          /* owned until placed */
	struct edit_place pl;
	char *after, *before, *into;    /* owned: the place's strings */
	int   ask[8];               /* keys asked, in order (layout_place_keys) */
	size_t nask, at;            /* how many; the one being asked */
	int   refs;                 /* prompts holding it: each asked key is one */
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

static void
add_arg_release(void *p)
{
	struct add_arg *x = p;

	if (--x->refs <= 0)
		add_arg_free(x);
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

/* Places x->el; on success selects it and says so. */
static int
wb_add_element(struct app *a, struct add_arg *x, char **cause)
{
	char where[160];
	const char *unrated = "";

	if (app_edit(a, do_add, x, cause) != 0)
		return -1;
	app_select_id(a, x->el.id, 0);
	{
		const struct trace_row *r = app_sel_trace(a);

		if (r != NULL && r->el->type != EL_SPACE && r->status == STATUS_UNRATED)
			unrated = "; still unrated";
	}
	app_msg(a, 0, "placed %s %s %s%s (- undoes; Enter edits its values)",
	    model_type_name(x->el.type), x->el.id, place_words(x, where, sizeof where), unrated);
	return 0;
}

static void ask_next(struct app *, struct add_arg *);

static int
value_given(struct app *a, void *arg, const char *text, char **cause)
{
	struct add_arg *x = arg;
	int k = x->ask[x->at];
	struct element probe;
	size_t was;

	if (text[0] == '\0') {
		if (k == layout_required_key(x->el.type))
			return fail_with(cause, "a %s needs its %s: it cannot be placed without one",
			    model_type_name(x->el.type), model_key_path((enum model_key)k));
		if (k == K_DMG_PULSE_WIDTH && model_has(&x->el, K_DMG_FLUENCE))
			return fail_with(cause, "a fluence rating needs the pulse width it was "
			    "measured at (the bench's own is filled in)");
	} else {
		model_element_copy(&probe, &x->el);
		if (model_set_text(&probe, (enum model_key)k, text, cause) != 0) {
			model_element_release(&probe);
			return -1;
		}
		model_element_release(&x->el);
		x->el = probe;
	}
	was = x->at++;
	/* a fluence skipped: its pulse width is not asked */
	while (x->at < x->nask && x->ask[x->at] == K_DMG_PULSE_WIDTH &&
	    !model_has(&x->el, K_DMG_FLUENCE))
		x->at++;
	if (x->at < x->nask) {
		ask_next(a, x);
		return 0;
	}
	if (wb_add_element(a, x, cause) != 0) {
		x->at = was;            /* the prompt stays, on the same key */
		return -1;
	}
	return 0;
}

/* One prompt per key that matters for the type; all but the required one
 * may be left empty.  Each prompt holds a reference to x. */
static void
ask_next(struct app *a, struct add_arg *x)
{
	int k = x->ask[x->at];
	enum layout_key_group g;
	const char *label = layout_key_label(k, &g);
	char where[160], *title, *help, *hint, init[64] = "";
	int required = k == layout_required_key(x->el.type);

	title = xasprintf("place %s %s %s: %zu of %zu", model_type_name(x->el.type), x->el.id,
	    place_words(x, where, sizeof where), x->at + 1, x->nask);
	hint = layout_key_hint(k);
	help = xasprintf("%s %s %s (%s): %s; %s.", layout_group_name(g),
	    ui_glyph(a, GL_DOT), label, model_key_path((enum model_key)k), hint,
	    required ? "needed" : "Enter with nothing skips it");
	if (k == K_DMG_PULSE_WIDTH && a->bench->src.pulsed) {
		/* the bench's own pulse, exactly as it reads back */
		char *t = layout_quantity_text(a->bench->src.pulse_width, DIM_TIME);

		snprintf(init, sizeof init, "%s", t);
		free(t);
	}
	x->refs++;
	ui_prompt(a, title, help, init, value_given, x, add_arg_release);
	free(title);
	free(help);
	free(hint);
}

static void
type_chosen(struct app *a, void *arg, int choice)
{
	const int *before = arg;
	struct add_arg *x = xcalloc(1, sizeof *x);
	enum elem_type t = (enum elem_type)choice;
	char *id = layout_new_id(a->bench, t), *cause = NULL;

	if (edit_element_new(&x->el, model_type_name(t), id, NULL, 0, &cause) != 0) {
		app_msg_take(a, 1, cause);
		free(id);
		free(x);
		return;
	}
	free(id);
	place_for(a, *before, x);
	x->nask = layout_place_keys(t, a->bench->src.pulsed, x->ask, 8);
	if (x->nask == 0) {
		if (wb_add_element(a, x, &cause) != 0)
			app_msg_take(a, 1, cause);
		add_arg_free(x);
		return;
	}
	ask_next(a, x);
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
		snprintf(title, sizeof title, "place the first element");
	else if (r->kind == LROW_PORT)
		snprintf(title, sizeof title, "place into %s.%s", r->el->id, model_port_name(r->port));
	else
		snprintf(title, sizeof title, "place %s %s", before ? "before" : "after", r->el->id);
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

/* A copy of the selected element with a new id, right after it (its side
 * branch stays with the original: the copy's starts empty). */
enum ui_reaction
wb_k_duplicate(struct app *a, struct ui_pane *p)
{
	const struct layout_row *r = app_sel_row(a);
	struct add_arg *x;
	char *cause = NULL, *from;

	(void)p;
	if (r == NULL || r->kind == LROW_PORT) {
		app_msg(a, 1, "select an element to duplicate");
		return UI_REDRAW;
	}
	x = xcalloc(1, sizeof *x);
	from = xstrdup(r->el->id);
	model_element_copy(&x->el, r->el);
	model_branch_release(&x->el.side);
	free(x->el.id);
	x->el.id = layout_new_id(a->bench, x->el.type);
	x->after = xstrdup(from);
	x->pl.after = x->after;
	if (app_edit(a, do_add, x, &cause) != 0) {
		app_msg_take(a, 1, cause);
	} else {
		app_select_id(a, x->el.id, 0);
		app_msg(a, 0, "duplicated %s as %s, placed after it (- undoes)", from,
		    x->el.id);
	}
	free(from);
	add_arg_free(x);
	return UI_REDRAW;
}

enum ui_reaction
wb_k_place(struct app *a, struct ui_pane *p)
{
	return open_type_menu(a, p->data, 0);
}

enum ui_reaction
wb_k_place_before(struct app *a, struct ui_pane *p)
{
	return open_type_menu(a, p->data, 1);
}

