/* ui-reflections.c - every surface reflection of the bench in one list
 * (ghost-conventions.md): the ghosts worst first, then the strays by
 * power, each with its surfaces or source, its power, where it is worst
 * and how, a ghost focus that sparks, a stray's focus; the count line
 * above and the chosen one in full below.  Enter goes to its element (a
 * ghost's worst element, a stray's source).  What is listed and how it is
 * worded is core-layout-ghost.c's; this file only draws it.  Owned by the
 * workbench. */
#include <config.h>

#include <stdlib.h>
#include <string.h>

#include "core-ghost.h"
#include "ui-app.h"
#include "util-err.h"

struct rf {
	int sel, top;
};

enum rf_col { R_KIND, R_NAME, R_POWER, R_WHERE, R_RATIO, R_STATUS, R_NOTE, R_NCOLS };

static const struct layout_col rf_cols[R_NCOLS] = {
	[R_KIND] = { "kind", 6, 6, 0 },
	[R_NAME] = { "surfaces / source", 14, 26, 0 },
	[R_POWER] = { "power", 8, 9, 0 },
	[R_WHERE] = { "worst at", 8, 9, 1 },
	[R_RATIO] = { "ratio", 7, 7, 0 },
	[R_STATUS] = { "status", 6, 7, 0 },
	[R_NOTE] = { "notes", 8, -1, 2 },
};

static void
rf_draw(struct app *a, struct ui_pane *p, int h, int w)
{
	struct rf *d = p->data;
	struct layout_refl *v;
	size_t n = layout_reflections(a->trace, &v);
	int rows = h - 11, cw[R_NCOLS], x;
	char *t = xasprintf("reflections %s %zu", ui_glyph(a, GL_DOT), n), *count;

	ui_frame(a, t, NULL, h, w);
	free(t);
	if (d->sel >= (int)n)
		d->sel = (int)n - 1;
	if (d->sel < 0)
		d->sel = 0;
	d->top = layout_scroll(d->sel, d->top, rows, (int)n);
	count = layout_reflection_count(a->trace, a->ascii, w - 1);
	ui_put(a, 2, 1, w - 1, count, UC_INFO);
	free(count);
	layout_fit_columns(rf_cols, R_NCOLS, w - 3, 1, cw);
	x = 2;
	for (int c = 0; c < R_NCOLS; c++)
		if (cw[c] > 0) {
			if (c == R_POWER || c == R_RATIO)
				ui_put_right(a, 3, x, cw[c], rf_cols[c].name, ui_attr(a, UC_HEADER));
			else
				ui_put(a, 3, x, cw[c], rf_cols[c].name, UC_HEADER);
			x += cw[c] + 1;
		}
	if (n == 0)
		ui_put(a, 4, 2, w - 4, a->trace->ghosts == NULL ? "Reflections are not traced "
		    "for this bench." : "No surface on this bench reflects anything worth "
		    "following.", UC_NORMAL);
	for (int r = 0; r < rows && d->top + r < (int)n; r++) {
		int i = d->top + r, y = 4 + r;
		attr_t at = i == d->sel ? ui_attr(a, UC_SELECT) : A_NORMAL, st;
		struct layout_refl_cells c;
		const char *cell[R_NCOLS];

		layout_reflection_cells(a->trace, &v[i], a->ascii, &c);
		st = ui_status_attr(a, c.status);
		cell[R_KIND] = c.kind;
		cell[R_NAME] = c.name;
		cell[R_POWER] = c.power;
		cell[R_WHERE] = c.where;
		cell[R_RATIO] = c.ratio;
		cell[R_STATUS] = c.word;
		cell[R_NOTE] = c.note;
		ui_fill(a, y, 0, w, at);
		if (c.status >= STATUS_CAUTION)
			ui_put_attr(a, y, 0, 1, ui_glyph(a, GL_HAZARD), at | ui_attr(a, UC_HAZARD));
		x = 2;
		for (int k = 0; k < R_NCOLS; k++) {
			if (cw[k] == 0)
				continue;
			if (k == R_POWER || k == R_RATIO)
				ui_put_right(a, y, x, cw[k], cell[k], at | (k == R_RATIO &&
				    v[i].kind == LR_GHOST ? st : 0));
			else if (k == R_STATUS)
				ui_put_attr(a, y, x, cw[k], cell[k], at | st | A_BOLD);
			else
				ui_put_attr(a, y, x, cw[k], cell[k], at);
			x += cw[k] + 1;
		}
	}
	if (n > 0 && d->sel < (int)n) {
		/* the chosen one in full: its row may be cut */
		char *text = layout_reflection_text(a->trace, &v[d->sel], a->ascii);
		size_t st[3], ln[3], nl = layout_wrap(text, w - 2, st, ln, 3);

		for (size_t k = 0; k < nl && k < 3; k++) {
			char *part = xasprintf("%.*s", (int)ln[k], text + st[k]);

			ui_put(a, h - 6 + (int)k, 1, w - 2, part, UC_NORMAL);
			free(part);
		}
		free(text);
	}
	free(v);
	ui_footer(a, p->ops->keys, h, w);
}

static size_t
rf_count(struct app *a)
{
	struct layout_refl *v;
	size_t n = layout_reflections(a->trace, &v);

	free(v);
	return n;
}

static enum ui_reaction
rf_up(struct app *a, struct ui_pane *p)
{
	struct rf *d = p->data;

	(void)a;
	if (d->sel > 0)
		d->sel--;
	return UI_REDRAW;
}

static enum ui_reaction
rf_down(struct app *a, struct ui_pane *p)
{
	struct rf *d = p->data;

	if (d->sel + 1 < (int)rf_count(a))
		d->sel++;
	return UI_REDRAW;
}

static enum ui_reaction
rf_page(struct app *a, struct ui_pane *p, int by)
{
	struct rf *d = p->data;
	int n = (int)rf_count(a);

	d->sel += by;
	if (d->sel >= n)
		d->sel = n - 1;
	if (d->sel < 0)
		d->sel = 0;
	return UI_REDRAW;
}

static enum ui_reaction
rf_pgup(struct app *a, struct ui_pane *p)
{
	return rf_page(a, p, -(LINES - 8));
}

static enum ui_reaction
rf_pgdn(struct app *a, struct ui_pane *p)
{
	return rf_page(a, p, LINES - 8);
}

static enum ui_reaction
rf_home(struct app *a, struct ui_pane *p)
{
	(void)a;
	((struct rf *)p->data)->sel = 0;
	return UI_REDRAW;
}

static enum ui_reaction
rf_end(struct app *a, struct ui_pane *p)
{
	return rf_page(a, p, 1 << 20);
}

static enum ui_reaction
rf_jump(struct app *a, struct ui_pane *p)
{
	struct rf *d = p->data;
	struct layout_refl *v;
	size_t n = layout_reflections(a->trace, &v);
	char *id = NULL;

	if (d->sel >= 0 && d->sel < (int)n && v[d->sel].row >= 0)
		id = xstrdup(a->trace->rows[v[d->sel].row].el->id);
	free(v);
	if (id == NULL)
		return UI_POP | UI_REDRAW;
	app_select_id(a, id, 0);
	app_msg(a, 0, "%s selected: its results list the ghosts that meet it and the ones "
	    "it makes", id);
	free(id);
	return UI_POP | UI_REDRAW;
}

static enum ui_reaction
rf_back(struct app *a, struct ui_pane *p)
{
	(void)a;
	(void)p;
	return UI_POP | UI_REDRAW;
}

static const struct ui_key rf_keys[] = {
	{ { UI_FKEY(KEY_UP) }, "\u2191\u2193", "choose", 2, "choose a ghost or stray", rf_up, 0, UG_MOVE },
	{ { UI_FKEY(KEY_DOWN) }, "\u2193", NULL, 0, NULL, rf_down, 0, UG_MOVE },
	{ { UI_FKEY(KEY_PPAGE) }, "PgUp", NULL, 0, "a page up", rf_pgup, 0, UG_MOVE },
	{ { UI_FKEY(KEY_NPAGE) }, "PgDn", NULL, 0, "a page down", rf_pgdn, 0, UG_MOVE },
	{ { UI_FKEY(KEY_HOME) }, "Home", NULL, 0, "the worst one", rf_home, 0, UG_MOVE },
	{ { UI_FKEY(KEY_END) }, "End", NULL, 0, "the last one", rf_end, 0, UG_MOVE },
	{ { '\r', '\n', UI_FKEY(KEY_ENTER) }, "Enter", "go to element", 0,
	    "back to the workbench at the element: a ghost's worst, a stray's source", rf_jump, 0,
	    UG_LOOK },
	{ { UI_ESC, 'q', 'f' }, "Esc", "back", 0, "back to the workbench (also q, f)", rf_back, 0, UG_LEAVE },
	UI_KEYS_END,
};

static void
rf_release(struct ui_pane *p)
{
	free(p->data);
}

const struct ui_pane_ops ui_reflections_ops = {
	"reflections (f)", 0, rf_keys, rf_draw, NULL, NULL, NULL, NULL, rf_release,
};

void
ui_reflections_push(struct app *a)
{
	app_push(a, &ui_reflections_ops, xcalloc(1, sizeof(struct rf)));
}
