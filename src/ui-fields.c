/* ui-fields.c - the lower half of the workbench: the selected element's
 * values (or the source and bench settings) as fields edited in place,
 * with units, beside what the element sees (ui-results.c).  A refused
 * value stays in the field with the same message a bench file would get,
 * and nothing is stored.  Owned by the workbench. */
#include <config.h>

#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "core-edit.h"
#include "core-layout-tol.h"
#include "report.h"
#include "ui-bench.h"
#include "util-err.h"

#define MAX_FIELDS 48

struct fld {
	const char *name;           /* borrowed: key as edit_set / edit_set_bench take it */
	const char *help;           /* borrowed */
	const char *label;          /* borrowed: the human label */
	enum layout_key_group group;
	int         key;            /* enum model_key, -1 for the others */
	char       *value;          /* owned: as shown and as the editor starts */
	int         given;
	int         fixed;          /* shown, not editable */
	int         derived;        /* computed from another field (M² from the divergence) */
};

static const struct layout_row *
field_row(const struct app *a)
{
	return app_sel_row(a);
}

/* The fields of the current mode; returns the count, values owned by out. */
static size_t
fields_get(struct app *a, struct wb *d, struct fld *out, size_t max)
{
	size_t n = 0;

	if (d->mode == WB_SETTINGS) {
		const struct source *s = &a->shown->src;

		for (const char *const *k = edit_bench_keys; *k != NULL && n < max; k++, n++) {
			out[n].name = *k;
			out[n].help = layout_bench_key_help(*k);
			out[n].label = layout_bench_key_label(*k, &out[n].group);
			out[n].key = -1;
			out[n].value = layout_bench_value_text(a->shown, *k);
			out[n].given = out[n].value[0] != '\0';
			out[n].fixed = strcmp(*k, "name") == 0;
			out[n].derived = 0;
			if (strcmp(*k, "source.m2") != 0 || n + 1 >= max)
				continue;
			if (s->divergence_given) {
				/* M² follows from the divergence: shown as derived */
				free(out[n].value);
				out[n].value = layout_source_m2_text(s);
				out[n].given = 0;
				out[n].derived = 1;
				out[n].help = layout_bench_key_help("source.m2 derived");
			}
			/* the measured divergence, which stands for M² when given
			 * (not in edit_bench_keys: the comparison shows M²) */
			n++;
			out[n].name = "source.divergence";
			out[n].help = layout_bench_key_help(out[n].name);
			out[n].label = layout_bench_key_label(out[n].name, &out[n].group);
			out[n].key = -1;
			out[n].value = layout_bench_value_text(a->shown, out[n].name);
			out[n].given = out[n].value[0] != '\0';
			out[n].fixed = 0;
			out[n].derived = 0;
		}
		return n;
	} else {
		const struct layout_row *r = field_row(a);
		struct layout_field f[MAX_FIELDS];
		size_t nf;

		if (r == NULL)
			return 0;
		nf = layout_fields(r->el, f, MAX_FIELDS);
		if (nf > MAX_FIELDS)
			nf = MAX_FIELDS;
		/* the physical values first, each group together; the element's
		 * names after them (the layout's order) */
		size_t order[MAX_FIELDS], no = layout_field_order(r->el, f, nf, order);

		for (size_t oi = 0; oi < no && n < max; oi++, n++) {
			size_t i = order[oi];

			out[n].name = f[i].name;
			out[n].help = f[i].help;
			out[n].key = f[i].kind == LF_KEY ? f[i].key : -1;
			if (f[i].kind == LF_KEY) {
				out[n].label = layout_key_label_for(r->el->type, f[i].key, &out[n].group);
			} else {
				out[n].group = LKG_ELEMENT;
				out[n].label = f[i].kind == LF_SIDE ? "side port" : f[i].name;
			}
			out[n].value = layout_field_value(r->el, &f[i]);
			out[n].given = f[i].given;
			out[n].fixed = 0;
			out[n].derived = 0;
		}
		return n;
	}
}

static void
fields_free(struct fld *f, size_t n)
{
	for (size_t i = 0; i < n; i++)
		free(f[i].value);
}

/* Display lines of the value pane: -1-group for a group's heading, else
 * the field's index.  Returns the count; *sel_line is the line of field sel. */
static int
field_lines(const struct fld *f, size_t n, int sel, int *lines, int *sel_line)
{
	int nl = 0;

	*sel_line = 0;
	for (size_t i = 0; i < n; i++) {
		if (i == 0 || f[i].group != f[i - 1].group)
			lines[nl++] = -1 - (int)f[i].group;
		if ((int)i == sel)
			*sel_line = nl;
		lines[nl++] = (int)i;
	}
	return nl;
}

static int
first_key_field(const struct fld *f, size_t n)
{
	for (size_t i = 0; i < n; i++)
		if (f[i].key >= 0)
			return (int)i;
	return 0;
}

static void
clamp_field(struct wb *d, size_t n)
{
	if (d->field >= (int)n)
		d->field = (int)n - 1;
	if (d->field < 0)
		d->field = 0;
}

void
wb_draw_detail(struct app *a, struct wb *d, const struct wb_geom *g, int w)
{
	struct fld f[MAX_FIELDS];
	size_t n = fields_get(a, d, f, MAX_FIELDS);
	const struct layout_row *r = field_row(a);
	int lw = w * 2 / 5 < 34 ? 34 : w * 2 / 5 > 56 ? 56 : w * 2 / 5, y = g->detail_y, rows = g->detail_h, err_lines = 0;
	char *tol_hint = NULL;
	char *title;
	size_t est[4], eln[4];
	int title_end;

	/* the separator names what is shown and says what the focused field is */
	if (d->mode == WB_SETTINGS)
		title = xasprintf("bench '%s': source and settings", a->name);
	else if (r == NULL)
		title = xstrdup("no element");
	else if (r->kind == LROW_PORT)
		title = xasprintf("%s %s (owner of %s.%s)", model_type_name(r->el->type), r->el->id,
		    r->el->id, model_port_name(r->port));
	else
		title = xasprintf("%s %s%s%s%s", model_type_name(r->el->type), r->el->id,
		    r->el->label != NULL ? " \"" : "", r->el->label != NULL ? r->el->label : "",
		    r->el->label != NULL ? "\"" : "");
	if (app_point_name(a) != NULL) {
		/* values typed now go to the point shown: said before the rest */
		char *t = xasprintf("point %s overrides %s %s", app_point_name(a),
		    ui_glyph(a, GL_HEAD), title);

		free(title);
		title = t;
	}
	ui_fill(a, g->sep_y, 0, w, ui_attr(a, UC_HEADER));
	for (int i = 0; i < w; i++)
		mvaddstr(g->sep_y, i, ui_glyph(a, GL_HBAR));
	{
		char *t = xasprintf(" %s ", title);
		int tw = (int)utf8_cols(t);
		/* with a field chosen its hint takes the right part of the line */
		int room = d->focus == WB_FIELDS ? lw - 2 : w - 14;

		title_end = 2 + (tw < room ? tw : room);
		ui_put(a, g->sep_y, 2, title_end - 2, t, UC_HEADER);
		free(t);
	}
	free(title);
	clamp_field(d, n);
	if (d->focus == WB_CHAIN && d->mode == WB_ELEMENT && r != NULL && r->kind == LROW_ELEMENT &&
	    (d->field_of == NULL || strcmp(d->field_of, r->el->id) != 0)) {
		/* another element: Enter will start at its first physical value */
		d->field = first_key_field(f, n);
		d->field_top = 0;
	}
	if (d->focus == WB_FIELDS && n > 0) {
		char *hint = f[d->field].key >= 0 ? layout_key_hint(f[d->field].key) :
		    d->mode == WB_SETTINGS ? layout_bench_key_hint(f[d->field].name) : xstrdup("");
		char *t = xasprintf(" %s: %s%s%s ", f[d->field].name, f[d->field].help,
		    hint[0] ? "; " : "", hint);
		int tw = (int)utf8_cols(t);

		if (tw > w - lw - 1)
			tw = w - lw - 1;
		ui_put(a, g->sep_y, w - tw - 1, tw, t, UC_KEY);
		free(t);
		free(hint);
	} else if (d->mode == WB_ELEMENT) {
		int rx = title_end + 1 > lw + 2 ? title_end + 1 : lw + 2;

		if (rx + 9 < w)
			ui_put(a, g->sep_y, rx, 9, " results ", UC_HEADER);
	}
	/* the error of a refused value sits right under its field */
	if (d->editing && d->error != NULL) {
		err_lines = (int)layout_wrap(d->error, lw - 4, est, eln, 4);
		if (err_lines > 3)
			err_lines = 3;
	} else if (d->editing && n > 0) {
		/* while typing a number: how a tolerance goes after it, there */
		tol_hint = layout_tol_edit_short(f[d->field].key, d->mode == WB_SETTINGS ?
		    f[d->field].name : NULL, a->ascii);
		err_lines = tol_hint[0] != '\0';
	}
	/* display lines: a heading where the group changes, then its fields */
	{
		int lines[2 * MAX_FIELDS], sel_line, top;
		int nl = field_lines(f, n, d->field, lines, &sel_line);

		top = d->field_top;
		if (sel_line - 1 < top)
			top = sel_line - 1;
		if (sel_line + err_lines >= top + rows)
			top = sel_line + err_lines - rows + 1;
		if (top > nl - rows)
			top = nl - rows;
		if (top < 0)
			top = 0;
		d->field_top = top;
		for (int li = top, line = 0; line < rows && li < nl; li++) {
			int yy = y + line, fi;
			int here, marked;
			attr_t at;
			const struct fld *x;

			if (lines[li] < 0) {
				ui_put(a, yy, 1, lw - 2, layout_group_name((enum layout_key_group)(-1 - lines[li])),
				    UC_HEADER);
				line++;
				continue;
			}
			fi = lines[li];
			x = &f[fi];
			here = d->focus == WB_FIELDS && fi == d->field;
			marked = d->focus == WB_CHAIN && fi == d->field && d->mode == WB_ELEMENT;
			at = here ? ui_attr(a, UC_SELECT) : A_NORMAL;
			ui_fill(a, yy, 0, lw, at);
			if (marked)
				ui_put(a, yy, 1, 1, ui_glyph(a, GL_KEY), UC_KEY);
			ui_put_attr(a, yy, 3, LAYOUT_LABEL_COLS, x->label, at | (x->given ? 0 :
			    ui_attr(a, UC_DIM)));
			if (here && d->editing) {
				ui_line_draw(a, &d->line, yy, 21, lw - 22);
			} else {
				char *v = x->fixed ? xasprintf("%s (fixed)", x->value) :
				    x->derived ? xasprintf("%s (derived)", x->value) :
				    x->value[0] == '\0' ? xstrdup("-") :
				    !x->given ? xasprintf("%s (default)", x->value) : xstrdup(x->value);
				char who[96] = "", fit[400];
				/* a tolerance shown beside the value (a bench-wide one
				 * in brackets), shortened to fit (core-layout-tol.c) */
				char *inh = d->mode == WB_ELEMENT && r != NULL && x->key >= 0 ?
				    layout_tol_inherited(a->shown, r->el, (enum model_key)x->key,
				    who, sizeof who) : NULL;

				layout_tol_fit_value(fit, sizeof fit, v, inh, who, lw - 24, a->ascii);
				free(inh);
				free(v);
				v = xstrdup(fit);

				ui_put_attr(a, yy, 22, lw - 23, v, at | (x->given ? 0 : ui_attr(a, UC_DIM)));
				free(v);
			}
			line++;
			if (here && d->editing && d->error == NULL && tol_hint != NULL &&
			    tol_hint[0] != '\0' && line < rows)
				ui_put(a, y + line++, 3, lw - 4, tol_hint, UC_DIM);
			if (here && d->editing && d->error != NULL)
				for (int e = 0; e < err_lines && line < rows; e++, line++) {
					char *t = xstrdup(d->error + est[e]);

					t[eln[e]] = '\0';
					ui_put(a, y + line, 3, lw - 4, t, UC_ERROR);
					free(t);
				}
		}
		if (top + rows < nl)
			ui_put(a, y + rows - 1, lw - 1, 1, a->ascii ? "v" : "\u25be", UC_DIM);
		if (top > 0)
			ui_put(a, y, lw - 1, 1, a->ascii ? "^" : "\u25b4", UC_DIM);
	}
	for (int i = 0; i < rows; i++)
		ui_put(a, y + i, lw, 1, ui_glyph(a, GL_VBAR), UC_DIM);
	if (d->mode == WB_ELEMENT) {
		wb_draw_results(a, y, lw + 2, rows, w - lw - 3);
	} else {
		/* the settings' effect: the warnings of the whole bench */
		int line = 0;
		char t[64], u[64];
		char *s;

		units_format(t, sizeof t, a->trace->absorbed, DIM_POWER, 3, a->ascii);
		units_format(u, sizeof u, a->trace->leaving, DIM_POWER, 3, a->ascii);
		s = xasprintf("absorbed on the bench %s, leaving it %s", t, u);
		ui_put(a, y + line++, lw + 2, w - lw - 3, s, UC_NORMAL);
		free(s);
		if (a->trace->ghosts != NULL && line < rows) {
			/* what ghost_tilt and stray_warn decide, in one line */
			s = layout_reflection_count(a->trace, a->ascii, w - lw - 3);
			ui_put(a, y + line++, lw + 2, w - lw - 3, s, UC_NORMAL);
			free(s);
		}
		for (size_t i = 0; i < a->trace->nwarn && line < rows; i++) {
			s = report_warning_text(a->trace, &a->trace->warn[i], a->ascii);
			ui_put(a, y + line++, lw + 2, w - lw - 3, s, UC_CAUTION);
			free(s);
		}
	}
	fields_free(f, n);
	free(tol_hint);
}

/* ---- keys ---- */

static enum ui_reaction
begin_edit(struct app *a, struct wb *d, const char *initial)
{
	struct fld f[MAX_FIELDS];
	size_t n;

	if (app_refuse_readonly(a))
		return UI_REDRAW;
	n = fields_get(a, d, f, MAX_FIELDS);
	clamp_field(d, n);
	if (n == 0) {
		fields_free(f, n);
		return UI_NONE;
	}
	if (f[d->field].fixed) {
		app_msg(a, 1, "the bench's name: N on the bench list renames the bench and "
		    "every setup");
		fields_free(f, n);
		return UI_REDRAW;
	}
	d->editing = 1;
	free(d->error);
	d->error = NULL;
	ui_line_set(&d->line, initial != NULL ? initial : f[d->field].given ? f[d->field].value : "");
	{
		char *hint = f[d->field].key >= 0 ? layout_key_hint(f[d->field].key) :
		    d->mode == WB_SETTINGS ? layout_bench_key_hint(f[d->field].name) : xstrdup("");

		char *th = layout_tol_edit_hint(f[d->field].key, d->mode == WB_SETTINGS ?
		    f[d->field].name : NULL, a->ascii);

		app_msg(a, 0, "%s: %s%s%s%s%s", f[d->field].name, f[d->field].help, hint[0] ? "; " : "",
		    hint, th[0] ? "; " : "", th);
		free(hint);
		free(th);
	}
	fields_free(f, n);
	return UI_REDRAW;
}

struct set_arg {
	const char *id, *key, *text;
	int         bench;
};

static int
do_set(struct bench *b, void *arg, char **cause)
{
	struct set_arg *s = arg;

	return s->bench ? edit_set_bench(b, s->key, s->text, cause) :
	    edit_set(b, s->id, s->key, s->text, cause);
}

/* How to undo from where the change was made: in the values, - starts a
 * negative number ("-500 mm"), so undo is the chain's key. */
static const char *
undo_hint(const struct wb *d)
{
	return d->focus == WB_FIELDS ? "Esc, then - undoes" : "- undoes";
}

static enum ui_reaction
apply_edit(struct app *a, struct wb *d)
{
	struct fld f[MAX_FIELDS];
	size_t n = fields_get(a, d, f, MAX_FIELDS);
	const struct layout_row *r = field_row(a);
	struct set_arg s;
	char *cause = NULL, *id = NULL, *text = xstrdup(d->line.s != NULL ? d->line.s : "");

	clamp_field(d, n);
	memset(&s, 0, sizeof s);
	s.bench = d->mode == WB_SETTINGS;
	if (!s.bench) {
		if (r == NULL) {
			fields_free(f, n);
			free(text);
			return UI_NONE;
		}
		id = xstrdup(r->el->id);
	}
	s.id = id;
	s.key = f[d->field].name;
	s.text = text;
	if (app_point_name(a) != NULL) {
		/* a point shown: the value is its override, the base keeps its own */
		const char *pt = app_point_name(a);
		int rc;

		if (f[d->field].key < 0 && (!s.bench || strcmp(s.key, "name") == 0))
			rc = fail_with(&cause, "%s belongs to the base, not to point %s: O until the "
			    "base is shown", s.key, pt);
		else
			rc = ui_point_override(a, s.bench ? NULL : id, s.key, text, &cause);
		if (rc != 0) {
			free(d->error);
			d->error = cause != NULL ? cause : xstrdup("refused");
			app_msg(a, 1, "refused, nothing stored: %s", d->error);
		} else {
			d->editing = 0;
			free(d->error);
			d->error = NULL;
			app_msg(a, 0, "point %s: %s%s%s = %s, its override; the base keeps its own "
			    "(%s)", pt, s.bench ? "" : id, s.bench ? "" : ".", s.key,
			    text[0] ? text : "(unset)", undo_hint(d));
		}
		fields_free(f, n);
		free(id);
		free(text);
		return UI_REDRAW;
	}
	if (app_edit(a, do_set, &s, &cause) != 0) {
		free(d->error);
		d->error = cause != NULL ? cause : xstrdup("refused");
		app_msg(a, 1, "refused, nothing stored: %s", d->error);
	} else {
		if (!s.bench && strcmp(s.key, "id") == 0)
			app_select_id(a, text, 0);
		d->editing = 0;
		free(d->error);
		d->error = NULL;
		if (s.bench)
			app_msg(a, 0, "%s = %s (%s)", s.key, text[0] ? text : "(unset)",
			    undo_hint(d));
		else
			app_msg(a, 0, "%s %s = %s (%s)", strcmp(s.key, "id") == 0 ? text : id,
			    s.key, text[0] ? text : "(unset)", undo_hint(d));
	}
	fields_free(f, n);
	free(id);
	free(text);
	return UI_REDRAW;
}

static enum ui_reaction f_move_to(struct app *, struct wb *, int by);

/* The edited text differs from what the field held. */
static int
line_changed(struct app *a, struct wb *d)
{
	struct fld f[MAX_FIELDS];
	size_t n = fields_get(a, d, f, MAX_FIELDS);
	int changed = 1;

	clamp_field(d, n);
	if (n > 0)
		changed = strcmp(d->line.s != NULL ? d->line.s : "",
		    f[d->field].given ? f[d->field].value : "") != 0;
	fields_free(f, n);
	return changed;
}

enum ui_reaction
wb_edit_key(struct app *a, struct wb *d, int key)
{
	switch (key) {
	case '\r':
	case '\n':
	case UI_FKEY(KEY_ENTER):
	case '\t':
		return apply_edit(a, d);
	case UI_ESC:
		d->editing = 0;
		free(d->error);
		d->error = NULL;
		app_msg(a, 0, "not changed");
		return UI_REDRAW;
	case UI_FKEY(KEY_UP):
	case UI_FKEY(KEY_DOWN): {
		/* as in a form: an untouched value is left, a typed one applied */
		int by = key == UI_FKEY(KEY_UP) ? -1 : 1;

		if (line_changed(a, d)) {
			apply_edit(a, d);
			if (d->editing)
				return UI_REDRAW;       /* refused: stay on it */
		}
		d->editing = 0;
		f_move_to(a, d, by);
		return begin_edit(a, d, NULL);
	}
	default:
		ui_line_key(&d->line, key);
		return UI_REDRAW;        /* every key is the editor's while it is open */
	}
}

/* Enter on the chain: the values, editing the marked one at once. */
enum ui_reaction
wb_k_fields(struct app *a, struct ui_pane *p)
{
	struct wb *d = p->data;
	const struct layout_row *r = app_sel_row(a);
	struct fld f[MAX_FIELDS];
	size_t n;

	if (r == NULL) {
		app_msg(a, 1, "no element to edit: p places one");
		return UI_REDRAW;
	}
	if (r->kind == LROW_PORT) {
		app_msg(a, 1, "a side branch has no values: select an element");
		return UI_REDRAW;
	}
	n = fields_get(a, d, f, MAX_FIELDS);
	if (d->mode != WB_ELEMENT || d->field_of == NULL || strcmp(d->field_of, r->el->id) != 0) {
		d->mode = WB_ELEMENT;
		d->field = first_key_field(f, n);
		free(d->field_of);
		d->field_of = xstrdup(r->el->id);
	}
	fields_free(f, n);
	d->focus = WB_FIELDS;
	return begin_edit(a, d, NULL);
}

enum ui_reaction
wb_k_settings(struct app *a, struct ui_pane *p)
{
	struct wb *d = p->data;

	d->focus = WB_FIELDS;
	d->mode = WB_SETTINGS;
	d->field = 0;               /* the beam first: source.wavelength */
	for (int i = 0; edit_bench_keys[i] != NULL; i++)
		if (strcmp(edit_bench_keys[i], "source.wavelength") == 0) {
			d->field = i;
			break;
		}
	d->field_top = 0;
	app_msg(a, 0, "the beam and bench settings: Enter edits a value; Esc goes back to the chain");
	return UI_REDRAW;
}

static enum ui_reaction
f_move(struct app *a, struct ui_pane *p, int by)
{
	return f_move_to(a, p->data, by);
}

static enum ui_reaction
f_move_to(struct app *a, struct wb *d, int by)
{
	struct fld f[MAX_FIELDS];
	size_t n = fields_get(a, d, f, MAX_FIELDS);

	d->field += by;
	clamp_field(d, n);
	if (n > 0) {
		char *hint = f[d->field].key >= 0 ? layout_key_hint(f[d->field].key) :
		    d->mode == WB_SETTINGS ? layout_bench_key_hint(f[d->field].name) : xstrdup("");

		char *th = layout_tol_edit_hint(f[d->field].key, d->mode == WB_SETTINGS ?
		    f[d->field].name : NULL, a->ascii);

		app_msg(a, 0, "%s: %s%s%s%s%s", f[d->field].name, f[d->field].help, hint[0] ? "; " : "",
		    hint, th[0] ? "; " : "", th);
		free(hint);
		free(th);
	}
	if (d->mode == WB_ELEMENT && field_row(a) != NULL) {
		free(d->field_of);
		d->field_of = xstrdup(field_row(a)->el->id);
	}
	fields_free(f, n);
	return UI_REDRAW;
}

static enum ui_reaction
f_up(struct app *a, struct ui_pane *p)
{
	return f_move(a, p, -1);
}

static enum ui_reaction
f_down(struct app *a, struct ui_pane *p)
{
	return f_move(a, p, 1);
}

static enum ui_reaction
f_edit(struct app *a, struct ui_pane *p)
{
	return begin_edit(a, p->data, NULL);
}

static enum ui_reaction
f_clear(struct app *a, struct ui_pane *p)
{
	return begin_edit(a, p->data, "");
}

/* A value typed straight at a chosen field ("150 mm") starts editing it. */
enum ui_reaction
wb_fields_type(struct app *a, struct wb *d, int key)
{
	enum ui_reaction r;

	if (!((key >= '0' && key <= '9') || key == '-' || key == '+' || key == '.'))
		return UI_NONE;
	r = begin_edit(a, d, "");
	if (d->editing)
		ui_line_key(&d->line, key);
	return r;
}

static enum ui_reaction
f_back(struct app *a, struct ui_pane *p)
{
	struct wb *d = p->data;

	d->focus = WB_CHAIN;
	d->mode = WB_ELEMENT;
	free(a->msg);
	a->msg = NULL;
	return UI_REDRAW;
}

const struct ui_key ui_bench_field_keys[] = {
	{ { UI_FKEY(KEY_UP) }, "\u2191\u2193", "field", 1, "choose a value", f_up, 0, UG_MOVE },
	{ { UI_FKEY(KEY_DOWN) }, "\u2193", NULL, 0, NULL, f_down, 0, UG_MOVE },
	{ { '\r', '\n', UI_FKEY(KEY_ENTER) }, "Enter", "edit value", 0,
	    "edit the chosen value in its box: type it with its unit (\"250 mm\", \"5 kW/cm\"); "
	    "an empty value unsets it", f_edit, UI_K_EDITS, UG_VALUES },
	{ { UI_FKEY(KEY_DC), UI_FKEY(KEY_BACKSPACE), 127 }, "Del", "clear", 3,
	    "edit the value starting from an empty box", f_clear, UI_K_EDITS, UG_VALUES },
	{ { '\t', UI_ESC, 'q', UI_FKEY(KEY_LEFT) }, "Esc", "back to chain", 0,
	    "back to the chain (also Tab, q)", f_back, 0, UG_LEAVE },
	UI_KEYS_END,
};

enum ui_reaction
wb_click_fields(struct app *a, struct wb *d, int row, int dbl, struct ui_pane *p)
{
	struct fld f[MAX_FIELDS];
	size_t n;

	if (app_sel_row(a) == NULL && d->mode == WB_ELEMENT)
		return UI_NONE;
	int lines[2 * MAX_FIELDS], sl, nl;

	n = fields_get(a, d, f, MAX_FIELDS);
	nl = field_lines(f, n, d->field, lines, &sl);
	fields_free(f, n);
	if (d->field_top + row >= nl || lines[d->field_top + row] < 0)
		return UI_NONE;
	d->focus = WB_FIELDS;
	d->field = lines[d->field_top + row];
	return dbl ? f_edit(a, p) : UI_REDRAW;
}

char *
wb_marked_knob(struct app *a, struct wb *d)
{
	const struct layout_row *r = app_sel_row(a);
	struct fld f[MAX_FIELDS];
	size_t n;
	char *knob = NULL;

	if (d->mode == WB_ELEMENT && (r == NULL || r->kind == LROW_PORT ||
	    d->field_of == NULL || strcmp(d->field_of, r->el->id) != 0))
		return NULL;        /* the mark is on another element's values */
	n = fields_get(a, d, f, MAX_FIELDS);
	if (d->field >= 0 && (size_t)d->field < n) {
		const struct fld *x = &f[d->field];

		if (d->mode == WB_ELEMENT && x->key >= 0 &&
		    model_keys[x->key].kind != KIND_BOOL && model_keys[x->key].kind != KIND_AXIS &&
		    model_keys[x->key].kind != KIND_CHOICE)
			knob = xasprintf("%s.%s", r->el->id, model_key_path((enum model_key)x->key));
		else if (d->mode == WB_SETTINGS && strncmp(x->name, "source.", 7) == 0 &&
		    strcmp(x->name, "source.pulsed") != 0 && strcmp(x->name, "source.shape") != 0 &&
		    strcmp(x->name, "source.polarization") != 0)
			knob = xstrdup(x->name);
	}
	fields_free(f, n);
	return knob;
}
