/* ui-parts.c - the parts shelf: named components with their values and
 * damage ratings.  Place one on the chain after the selection, keep the
 * selected element as a new part, or edit a part's values (checked the way
 * a bench file would check them).  Owned by the workbench. */
#include <config.h>

#include <stdlib.h>
#include <string.h>

#include "core-edit.h"
#include "ui-bench.h"
#include "util-err.h"

#define MAX_FIELDS 48

struct shelf {
	char          **names;      /* owned */
	size_t          n;
	int             sel, top;
	int             on_fields, field;
	struct element  part;       /* owned: the selected part, type EL_NTYPES when none */
	int             have_part;
};

static void
shelf_load_part(struct app *a, struct shelf *d)
{
	char *cause = NULL;

	if (d->have_part)
		model_element_release(&d->part);
	d->have_part = 0;
	if (d->n == 0)
		return;
	if (store_part_get(a->store, d->names[d->sel], &d->part, &cause) != 0) {
		app_msg_take(a, 1, cause);
		return;
	}
	d->have_part = 1;
}

static void
shelf_load(struct app *a, struct shelf *d)
{
	char *cause = NULL;

	for (size_t i = 0; i < d->n; i++)
		free(d->names[i]);
	free(d->names);
	d->names = NULL;
	d->n = 0;
	if (store_parts(a->store, &d->names, &d->n, &cause) != 0)
		app_msg_take(a, 1, cause);
	if (d->sel >= (int)d->n)
		d->sel = (int)d->n - 1;
	if (d->sel < 0)
		d->sel = 0;
	shelf_load_part(a, d);
}

static void
shelf_release(struct ui_pane *p)
{
	struct shelf *d = p->data;

	for (size_t i = 0; i < d->n; i++)
		free(d->names[i]);
	free(d->names);
	if (d->have_part)
		model_element_release(&d->part);
	free(d);
}

static void
shelf_draw(struct app *a, struct ui_pane *p, int h, int w)
{
	struct shelf *d = p->data;
	int lw = w / 3, rows = h - 6;
	char *t;
	const struct layout_row *sel = app_sel_row(a);

	t = xasprintf("parts shelf %s %zu part%s%s%s", ui_glyph(a, GL_DOT), d->n,
	    d->n == 1 ? "" : "s", sel != NULL ? ", placed after " : "",
	    sel != NULL ? sel->el->id : "");
	ui_frame(a, t, NULL, h, w);
	free(t);
	ui_put(a, 2, 1, lw - 2, "part", UC_HEADER);
	ui_put(a, 2, lw + 1, w - lw - 2, d->have_part ? "values (Tab: edit them)" : "values",
	    UC_HEADER);
	if (d->n == 0) {
		/* drawn across the whole width, with no divider through it */
		ui_put(a, 3, 1, w - 2, "The shelf is empty.", UC_NORMAL);
		ui_put(a, 4, 1, w - 2, "Select an element on the workbench and come here: s keeps "
		    "it as a part.", UC_NORMAL);
		ui_footer(a, p->ops->keys, h, w);
		return;
	}
	d->top = layout_scroll(d->sel, d->top, rows, (int)d->n);
	for (int r = 0; r < rows && d->top + r < (int)d->n; r++) {
		int i = d->top + r;
		attr_t at = i == d->sel ? ui_attr(a, d->on_fields ? UC_HEADER : UC_SELECT) : A_NORMAL;

		ui_fill(a, 3 + r, 0, lw, at);
		ui_put_attr(a, 3 + r, 1, lw - 2, d->names[i], at);
	}
	for (int r = 0; r < rows + 1; r++)
		ui_put(a, 2 + r, lw - 1, 1, ui_glyph(a, GL_VBAR), UC_DIM);
	if (d->have_part) {
		struct layout_field f[MAX_FIELDS];
		size_t n = layout_fields(&d->part, f, MAX_FIELDS), shown = 0;

		t = xasprintf("type %s", model_type_name(d->part.type));
		ui_put(a, 3, lw + 1, w - lw - 2, t, UC_KEY);
		free(t);
		if (d->field >= (int)n)
			d->field = (int)n - 1;
		for (size_t i = 1; i < n && i < MAX_FIELDS && (int)shown < rows - 1; i++) {
			char *v = layout_field_value(&d->part, &f[i]);
			int here = d->on_fields && (int)i == d->field;
			attr_t at = here ? ui_attr(a, UC_SELECT) : A_NORMAL;
			int y = 4 + (int)shown++;

			if (i < 3 && !here && v[0] == '\0' && !d->on_fields) {
				free(v);
				shown--;
				continue;
			}
			ui_fill(a, y, lw, w - lw, at);
			ui_put_attr(a, y, lw + 1, 20, f[i].name, at | (f[i].given ? 0 : ui_attr(a, UC_DIM)));
			ui_put_attr(a, y, lw + 22, w - lw - 23, v[0] ? v : "-",
			    at | (f[i].given ? 0 : ui_attr(a, UC_DIM)));
			free(v);
		}
	}
	ui_footer(a, p->ops->keys, h, w);
}

static enum ui_reaction
s_move(struct app *a, struct ui_pane *p, int by)
{
	struct shelf *d = p->data;

	if (d->on_fields) {
		d->field += by;
		if (d->field < 1)
			d->field = 1;
		return UI_REDRAW;
	}
	d->sel += by;
	if (d->sel >= (int)d->n)
		d->sel = (int)d->n - 1;
	if (d->sel < 0)
		d->sel = 0;
	shelf_load_part(a, d);
	return UI_REDRAW;
}

static enum ui_reaction
s_up(struct app *a, struct ui_pane *p)
{
	return s_move(a, p, -1);
}

static enum ui_reaction
s_down(struct app *a, struct ui_pane *p)
{
	return s_move(a, p, 1);
}

static enum ui_reaction
s_place(struct app *a, struct ui_pane *p)
{
	struct shelf *d = p->data;
	struct element el;
	char *cause = NULL, *id;

	if (d->on_fields)
		return UI_NONE;
	if (!d->have_part) {
		app_msg(a, 1, "no part to place");
		return UI_REDRAW;
	}
	if (app_refuse_readonly(a))
		return UI_REDRAW;
	model_element_copy(&el, &d->part);
	id = layout_new_id(a->bench, el.type);
	free(el.id);
	el.id = id;
	free(el.part);
	el.part = xstrdup(d->names[d->sel]);
	if (el.type == EL_SPLITTER && el.side_port == PORT_NONE)
		el.side_port = PORT_REFLECTED;
	if (wb_place(a, &el, &cause) != 0) {
		app_msg_take(a, 1, cause);
		return UI_REDRAW;
	}
	return UI_POP | UI_REDRAW;
}

static int
keep_part(struct app *a, void *arg, const char *text, char **cause)
{
	struct shelf *d = arg;
	const struct layout_row *r = app_sel_row(a);
	struct element el;
	int rc;

	if (text[0] == '\0')
		return fail_with(cause, "a part needs a name");
	if (r == NULL || r->kind != LROW_ELEMENT)
		return fail_with(cause, "select an element on the workbench first");
	model_element_copy(&el, r->el);
	free(el.id);
	el.id = xstrdup("");
	model_branch_release(&el.side);
	if (el.type != EL_SPLITTER)
		el.side_port = PORT_NONE;
	rc = store_part_put(a->store, text, &el, cause);
	model_element_release(&el);
	if (rc != 0)
		return -1;
	app_msg(a, 0, "'%s' is on the shelf", text);
	shelf_load(a, d);
	for (size_t i = 0; i < d->n; i++)
		if (strcmp(d->names[i], text) == 0)
			d->sel = (int)i;
	shelf_load_part(a, d);
	return 0;
}

static enum ui_reaction
s_keep(struct app *a, struct ui_pane *p)
{
	const struct layout_row *r = app_sel_row(a);
	char *help;

	if (r == NULL || r->kind != LROW_ELEMENT) {
		app_msg(a, 1, "select an element on the workbench first");
		return UI_REDRAW;
	}
	help = xasprintf("Keep %s %s (its values and damage ratings) on the shelf as:",
	    model_type_name(r->el->type), r->el->id);
	ui_prompt(a, "keep as part", help, r->el->part != NULL ? r->el->part : r->el->id,
	    keep_part, p->data, NULL);
	free(help);
	return UI_REDRAW;
}

struct part_edit {
	struct shelf *d;
	char         *key;          /* owned */
};

static void
part_edit_free(void *x)
{
	struct part_edit *pe = x;

	free(pe->key);
	free(pe);
}

/* Checks the new value as on a bench (a one-element bench named after the
 * part), then puts the part back on the shelf. */
static int
part_set(struct app *a, void *arg, const char *text, char **cause)
{
	struct part_edit *pe = arg;
	struct shelf *d = pe->d;
	const char *name = d->names[d->sel];
	struct bench *tmp = layout_bench_new("shelf");
	struct element el;
	int rc;

	model_element_copy(&el, &d->part);
	free(el.id);
	el.id = xstrdup(name);
	if (el.type == EL_SPLITTER && el.side_port == PORT_NONE)
		el.side_port = PORT_REFLECTED;
	model_branch_insert(&tmp->path, 0, &el);
	rc = edit_set(tmp, name, pe->key, text, cause);
	if (rc == 0) {
		struct element *e = &tmp->path.el[0];

		free(e->id);
		e->id = xstrdup("");
		rc = store_part_put(a->store, name, e, cause);
	}
	model_bench_free(tmp);
	if (rc != 0)
		return -1;
	app_msg(a, 0, "part '%s': %s = %s (placed elements keep their own copies)", name,
	    pe->key, text[0] ? text : "(unset)");
	shelf_load_part(a, d);
	return 0;
}

static enum ui_reaction
s_edit(struct app *a, struct ui_pane *p)
{
	struct shelf *d = p->data;
	struct layout_field f[MAX_FIELDS];
	size_t n;
	struct part_edit *pe;
	char *v, *title;

	if (!d->have_part)
		return UI_NONE;
	if (!d->on_fields) {
		d->on_fields = 1;
		d->field = 1;
		return UI_REDRAW;
	}
	if (app_refuse_readonly(a))
		return UI_REDRAW;
	n = layout_fields(&d->part, f, MAX_FIELDS);
	if (d->field < 1 || d->field >= (int)n)
		return UI_NONE;
	pe = xcalloc(1, sizeof *pe);
	pe->d = d;
	pe->key = xstrdup(f[d->field].name);
	v = f[d->field].given ? layout_field_value(&d->part, &f[d->field]) : xstrdup("");
	title = xasprintf("part %s: %s", d->names[d->sel], f[d->field].name);
	{
		char *hint = f[d->field].kind == LF_KEY ? layout_key_hint(f[d->field].key) : xstrdup("");
		char *help = xasprintf("%s%s%s", f[d->field].help, hint[0] ? "; " : "", hint);

		ui_prompt(a, title, help, v, part_set, pe, part_edit_free);
		free(help);
		free(hint);
	}
	free(title);
	free(v);
	return UI_REDRAW;
}

static enum ui_reaction
s_enter(struct app *a, struct ui_pane *p)
{
	struct shelf *d = p->data;

	return d->on_fields ? s_edit(a, p) : s_place(a, p);
}

static enum ui_reaction
s_tab(struct app *a, struct ui_pane *p)
{
	struct shelf *d = p->data;

	(void)a;
	if (!d->have_part)
		return UI_NONE;
	d->on_fields = !d->on_fields;
	if (d->field < 1)
		d->field = 1;
	return UI_REDRAW;
}

static enum ui_reaction
s_back(struct app *a, struct ui_pane *p)
{
	struct shelf *d = p->data;

	(void)a;
	if (d->on_fields) {
		d->on_fields = 0;
		return UI_REDRAW;
	}
	return UI_POP | UI_REDRAW;
}

static const struct ui_key shelf_keys[] = {
	{ { UI_FKEY(KEY_UP) }, "\u2191\u2193", "choose", 3, "choose a part, or a value", s_up, 0, UG_MOVE },
	{ { UI_FKEY(KEY_DOWN) }, "\u2193", NULL, 0, NULL, s_down, 0, UG_MOVE },
	{ { '\r', '\n', UI_FKEY(KEY_ENTER), UI_FKEY(KEY_IC) }, "Enter", "place", 0,
	    "place the part after the workbench's selection (on the values: edit one; also Insert)", s_enter, UI_K_EDITS, UG_LAYOUT },
	{ { 's' }, "s", "keep selected as part", 1, "keep the workbench's selected element on the shelf", s_keep, UI_K_EDITS, UG_LAYOUT },
	{ { '\t' }, "Tab", "edit values", 1, "move to the part's values to edit them", s_tab, 0, UG_VALUES },
	{ { UI_ESC, 'q', 'S' }, "Esc", "back", 0, "back (also q)", s_back, 0, UG_LEAVE },
	UI_KEYS_END,
};

static void
s_enter_pane(struct app *a, struct ui_pane *p)
{
	shelf_load_part(a, p->data);
}

const struct ui_pane_ops ui_parts_ops = {
	"parts shelf", 0, shelf_keys, shelf_draw, NULL, NULL, s_enter_pane, NULL, shelf_release,
};

void
ui_parts_push(struct app *a)
{
	struct shelf *d = xcalloc(1, sizeof *d);

	app_push(a, &ui_parts_ops, d);
	shelf_load(a, d);
}
