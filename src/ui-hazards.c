/* ui-hazards.c - every hazard on the bench in one list: rows over and at
 * caution, every warning the trace gives (whatever its kind: the list is
 * built from the trace's own warnings, so new kinds appear here by
 * themselves), and optics that take power without a rating.  Enter goes
 * to the element.  Owned by the workbench. */
#include <config.h>

#include <stdlib.h>
#include <string.h>

#include "report.h"
#include "ui-app.h"
#include "util-err.h"

struct hz {
	int sel, top;
};

/* One line about a hazard, in the table's and the CLI's words. */
static char *
hazard_text(struct app *a, const struct layout_hazard *h)
{
	const struct trace_row *r = h->row >= 0 ? &a->trace->rows[h->row] : NULL;
	char pct[32], v[48];

	switch (h->kind) {
	case LH_WARNING:
		return report_warning_text(a->trace, h->warn, a->ascii);
	case LH_UNRATED: {
		char *hint = layout_rating_hint(r->el->type, a->shown->src.pulsed);

		units_format(v, sizeof v, r->power_in, DIM_POWER, 3, a->ascii);
		{
			char *s = xasprintf("%s %s takes %s with no rating (%s)",
			    model_type_name(r->el->type), r->el->id, v, hint);

			free(hint);
			return s;
		}
	}
	default: {
		char *why = layout_derivation_text(r, a->shown, a->ascii), *s;

		layout_percent(pct, sizeof pct, r->ratio);
		s = xasprintf("%s %s at %s of its limit%s%s", model_type_name(r->el->type), r->el->id,
		    pct, why != NULL ? ": " : "", why != NULL ? why : "");
		free(why);
		return s;
	}
	}
}

static void
hz_draw(struct app *a, struct ui_pane *p, int h, int w)
{
	struct hz *d = p->data;
	struct layout_hazard *hz;
	size_t n = layout_hazards(a->trace, &hz);
	/* the list, a blank line, then the selected one in full on h-5 and
	 * h-4 (the list must stop above it, or its last rows are written over) */
	int rows = h - 9 > 1 ? h - 9 : 1;
	char *t = xasprintf("hazards %s %zu", ui_glyph(a, GL_DOT), n);

	ui_frame(a, t, NULL, h, w);
	free(t);
	if (d->sel >= (int)n)
		d->sel = (int)n - 1;
	if (d->sel < 0)
		d->sel = 0;
	d->top = layout_scroll(d->sel, d->top, rows, (int)n);
	ui_put(a, 2, 2, 14, "kind", UC_HEADER);
	ui_put(a, 2, 17, 9, "element", UC_HEADER);
	ui_put(a, 2, 27, w - 28, "what", UC_HEADER);
	if (n == 0)
		ui_put(a, 3, 2, w - 4, "No hazards: every rated optic is below caution, every beam "
		    "ends in a rated stop, no focus sparks.", UC_NORMAL);
	for (int r = 0; r < rows && d->top + r < (int)n; r++) {
		int i = d->top + r, y = 3 + r;
		const struct layout_hazard *x = &hz[i];
		attr_t at = i == d->sel ? ui_attr(a, UC_SELECT) : A_NORMAL;
		char *text = hazard_text(a, x);
		enum ui_color c = x->kind == LH_OVER ? UC_OVER : x->kind == LH_CAUTION ? UC_CAUTION :
		    UC_HAZARD;

		ui_fill(a, y, 0, w, at);
		ui_put_attr(a, y, 0, 1, ui_glyph(a, GL_HAZARD), at | ui_attr(a, c));
		ui_put_attr(a, y, 2, 14, layout_hazard_word(x), at | ui_attr(a, c) | A_BOLD);
		ui_put_attr(a, y, 17, 9, x->el != NULL ? x->el->id : "source", at | A_BOLD);
		ui_put_attr(a, y, 27, w - 28, text, at);
		free(text);
	}
	if (n > 0 && d->sel < (int)n) {
		/* the selected one in full: it may be longer than the row */
		char *text = hazard_text(a, &hz[d->sel]);
		size_t st[3], ln[3], nl = layout_wrap(text, w - 2, st, ln, 3);

		for (size_t k = 0; k < nl && k < 2; k++) {
			char *part = xasprintf("%.*s", (int)ln[k], text + st[k]);

			ui_put(a, h - 5 + (int)k, 1, w - 2, part, UC_NORMAL);
			free(part);
		}
		free(text);
	}
	free(hz);
	ui_footer(a, p->ops->keys, h, w);
}

static enum ui_reaction
hz_move(struct ui_pane *p, int by)
{
	struct hz *d = p->data;

	d->sel += by;
	if (d->sel < 0)
		d->sel = 0;
	return UI_REDRAW;           /* the upper end is kept by the drawing */
}

static enum ui_reaction
hz_up(struct app *a, struct ui_pane *p)
{
	(void)a;
	return hz_move(p, -1);
}

static enum ui_reaction
hz_down(struct app *a, struct ui_pane *p)
{
	struct layout_hazard *hz;
	size_t n = layout_hazards(a->trace, &hz);
	struct hz *d = p->data;

	free(hz);
	if (d->sel + 1 < (int)n)
		d->sel++;
	return UI_REDRAW;
}

static enum ui_reaction
hz_home(struct app *a, struct ui_pane *p)
{
	(void)a;
	((struct hz *)p->data)->sel = 0;
	return UI_REDRAW;
}

static enum ui_reaction
hz_end(struct app *a, struct ui_pane *p)
{
	(void)a;
	((struct hz *)p->data)->sel = 1 << 20;
	return UI_REDRAW;
}

static enum ui_reaction
hz_jump(struct app *a, struct ui_pane *p)
{
	struct hz *d = p->data;
	struct layout_hazard *hz;
	size_t n = layout_hazards(a->trace, &hz);
	char *id = NULL;

	if (d->sel >= 0 && d->sel < (int)n) {
		const struct element *el = hz[d->sel].el;

		if (el == NULL && a->trace->nrows > 0)
			el = a->trace->rows[0].el;
		if (el != NULL)
			id = xstrdup(el->id);
	}
	free(hz);
	if (id == NULL)
		return UI_POP | UI_REDRAW;
	app_select_id(a, id, 0);
	app_msg(a, 0, "%s selected: Enter edits its values", id);
	free(id);
	return UI_POP | UI_REDRAW;
}

static enum ui_reaction
hz_back(struct app *a, struct ui_pane *p)
{
	(void)a;
	(void)p;
	return UI_POP | UI_REDRAW;
}

static const struct ui_key hz_keys[] = {
	{ { UI_FKEY(KEY_UP) }, "\u2191\u2193", "choose", 2, "choose a hazard", hz_up, 0, UG_MOVE },
	{ { UI_FKEY(KEY_DOWN) }, "\u2193", NULL, 0, NULL, hz_down, 0, UG_MOVE },
	{ { UI_FKEY(KEY_HOME), UI_FKEY(KEY_PPAGE) }, "Home", NULL, 0, "the first hazard (also PgUp)", hz_home, 0, UG_MOVE },
	{ { UI_FKEY(KEY_END), UI_FKEY(KEY_NPAGE) }, "End", NULL, 0, "the last hazard (also PgDn)", hz_end, 0, UG_MOVE },
	{ { '\r', '\n', UI_FKEY(KEY_ENTER) }, "Enter", "go to element", 0,
	    "back to the workbench with the hazard's element selected", hz_jump, 0, UG_LOOK },
	{ { UI_ESC, 'q', '!' }, "Esc", "back", 0, "back to the workbench (also q, !)", hz_back, 0, UG_LEAVE },
	UI_KEYS_END,
};

static void
hz_release(struct ui_pane *p)
{
	free(p->data);
}

const struct ui_pane_ops ui_hazards_ops = {
	"hazards (!)", 0, hz_keys, hz_draw, NULL, NULL, NULL, NULL, hz_release,
};

void
ui_hazards_push(struct app *a)
{
	app_push(a, &ui_hazards_ops, xcalloc(1, sizeof(struct hz)));
}
