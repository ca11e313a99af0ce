/* ui-bench.c - the workbench screen: the chain with every element's
 * results (power, radius, peak irradiance or fluence, ratio bar, status),
 * the selected element's values and results below it, the margin line,
 * and the chain's keys: select, place, lift, shift, duplicate, undo,
 * record and the ways to the other screens.  The value editor lives in
 * ui-fields.c.  Owned by the workbench. */
#include <config.h>

#include <math.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>

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

/* Which exposure columns the bench's ratings compare: a pulsed bench its
 * fluence, a CW bench its irradiance and, where a rating is per length,
 * the linear power density. */
static void
chain_cols(const struct app *a, struct layout_col *c)
{
	int pulsed = a->shown->src.pulsed, linear = 0;

	for (size_t i = 0; i < a->trace->nrows; i++)
		if (!isnan(a->trace->rows[i].limits.cw_linear))
			linear = 1;
	c[C_ELEM] = (struct layout_col){ "element", 8, 12, 0 };
	c[C_TYPE] = (struct layout_col){ "type", 9, 9, 4 };
	c[C_Z] = (struct layout_col){ "z", 8, 8, 3 };
	c[C_POWER] = (struct layout_col){ "power", 8, 9, 1 };
	c[C_RADIUS] = (struct layout_col){ "radius x/y", 14, 15, 2 };
	c[C_PEAK] = (struct layout_col){ pulsed ? "peak irr." : "irradiance", 11, 11,
	    pulsed ? 3 : linear ? 3 : 2 };
	c[C_FLUENCE] = (struct layout_col){ pulsed ? "fluence" : "lin. dens.", 11, 11,
	    pulsed ? 2 : linear ? 2 : 3 };
	c[C_BAR] = (struct layout_col){ "to LIDT", 8, 14, 1 };
	c[C_RATIO] = (struct layout_col){ "ratio", 7, 7, 0 };
	c[C_STATUS] = (struct layout_col){ "status", 7, 7, 0 };
	c[C_FLAGS] = (struct layout_col){ "flags", 6, -1, 5 };
	/* each element's worst over every point: where it is takes the type's place */
	if (a->worst_all) {
		c[C_TYPE] = (struct layout_col){ "worst at", 9, 12, 0 };
		c[C_BAR] = (struct layout_col){ "all points", 10, 14, 1 };
	}
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
		if (a->shown->src.pulsed)
			units_format(buf, n, r->fluence, DIM_FLUENCE, 3, asc);
		else
			units_format(buf, n, r->linear_density, DIM_LINEAR, 3, asc);
		break;
	case C_RATIO:
		layout_percent(buf, n, r->ratio);
		break;
	case C_STATUS:
		snprintf(buf, n, "%s", layout_row_status_word(r));
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
	double caution = 1 / a->shown->safety_factor;
	const struct point_survey *sv = app_survey(a);

	chain_cols(a, cols);
	/* column w-1 is kept for the scroll arrows (a blank before them), column
	 * 0 for the hazard sign */
	layout_fit_columns(cols, C_NCOLS, w - 3, 1, cw);
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
		ui_put(a, g->chain_y + 1, 2, w - 4, "The bench has no elements yet: p places the "
		    "first one.", UC_NORMAL);
		ui_put(a, g->chain_y + 2, 2, w - 4, "A space, then optics, then a dump, detector "
		    "or target; b: the beam.", UC_NORMAL);
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
		long sj = sv != NULL && row->kind == LROW_ELEMENT ?
		    layout_survey_find(sv, row->el->id) : -1;

		int hazard = row->trace_row >= 0 && layout_row_hazard(a->trace, (size_t)row->trace_row);

		if (ri == a->sel && !selected)
			base = A_BOLD;
		ui_fill(a, y, 0, w - 1, base);
		if (row->kind == LROW_PORT) {
			snprintf(name, sizeof name, "%*s%s%s.%s%s", (int)row->depth * 2, "",
			    ui_glyph(a, GL_BRANCH), row->el->id, model_port_name(row->port),
			    row->el->side.n == 0 ? "   (empty: p places an element here)" : "");
			ui_put_attr(a, y, 1, w - 2, name, base | (selected ? 0 : ui_attr(a, UC_DIM)));
			continue;
		}
		/* a hazard is marked by a sign and bold type, colour only repeats it */
		if (hazard) {
			base |= A_BOLD;
			ui_put_attr(a, y, 0, 1, ui_glyph(a, GL_HAZARD), base | ui_attr(a, UC_HAZARD));
		}
		snprintf(name, sizeof name, "%s%*s%s", moving ? ">" : "", (int)row->depth * 2, "",
		    row->el->id);
		x = 1;
		for (int c = 0; c < C_NCOLS; c++) {
			const struct trace_row *tr;
			attr_t at = base, st;

			if (cw[c] == 0)
				continue;
			if (c == C_ELEM) {
				ui_put_attr(a, y, x, cw[c], name, base | (moving ? A_BOLD : 0));
				x += cw[c] + 1;
				continue;
			}
			if (row->trace_row < 0 || (c == C_TYPE && sv != NULL &&
			    (sj < 0 || isnan(sv->el[sj].ratio)))) {
				x += cw[c] + 1;     /* nothing rated anywhere: no "worst at" */
				continue;
			}
			tr = &a->trace->rows[row->trace_row];
			if (sj >= 0 && !isnan(sv->el[sj].ratio) && (c == C_BAR || c == C_RATIO ||
			    c == C_STATUS || c == C_TYPE)) {
				const struct point_worst *pw = &sv->el[sj];

				st = ui_status_attr(a, pw->status);
				if (c == C_BAR)
					layout_bar(buf, sizeof buf, pw->ratio, caution, cw[c], a->ascii);
				else if (c == C_RATIO)
					layout_percent(buf, sizeof buf, pw->ratio);
				else if (c == C_STATUS)
					snprintf(buf, sizeof buf, "%s", layout_status_word(pw->status));
				else
					snprintf(buf, sizeof buf, "%s", sv->pt[pw->at].name);
				if (c == C_RATIO)
					ui_put_right(a, y, x, cw[c], buf, at | st);
				else
					ui_put_attr(a, y, x, cw[c], buf, c == C_TYPE ? at : at | st);
				x += cw[c] + 1;
				continue;
			}
			/* a hazard is never dimmed as "unrated" */
			st = hazard && tr->status == STATUS_UNRATED ?
			    ui_attr(a, (tr->flags & TF_AIR_BREAKDOWN) ? UC_OVER : UC_HAZARD) :
			    ui_status_attr(a, tr->status);
			if (c == C_BAR) {
				layout_bar(buf, sizeof buf, tr->ratio, caution, cw[c], a->ascii);
				ui_put_attr(a, y, x, cw[c], buf, at | st);
			} else {
				cell_text(a, tr, (enum wb_col)c, buf, sizeof buf);
				if (c == C_STATUS || c == C_RATIO)
					at |= st;
				if (c == C_STATUS || c == C_TYPE || c == C_FLAGS)
					ui_put_attr(a, y, x, cw[c], buf, at);
				else
					ui_put_right(a, y, x, cw[c], buf, at);
			}
			x += cw[c] + 1;
		}
	}
	if (a->scroll > 0)
		ui_put(a, g->chain_y, w - 1, 1, a->ascii ? "^" : "\u25b4", UC_DIM);
	if (a->scroll + g->chain_h < (int)a->nrows)
		ui_put(a, g->chain_y + g->chain_h - 1, w - 1, 1, a->ascii ? "v" : "\u25be", UC_DIM);
}

/* ---- the frame around it ---- */

void
wb_draw_status(struct app *a, int y, int w)
{
	char tail[64], *s, *pw;
	const char *cut;
	int ox = 0;
	enum damage_status worst = a->trace->worst >= 0 ?
	    a->trace->rows[a->trace->worst].status : STATUS_UNRATED;
	const char *bar = a->ascii ? " |" : " \u2502";

	if (a->ghosts_pending) {
		/* drawn for the moment until the reflections are in: say so */
		snprintf(tail, sizeof tail, "%s", a->ascii ? "reflections..." :
		    "reflections\u2026");
	} else if (a->readonly) {
		snprintf(tail, sizeof tail, "VIEW ONLY");
	} else if (a->unsaved != NULL) {
		snprintf(tail, sizeof tail, "DRAFT NOT SAVED");
	} else if (a->saved_at != 0) {
		time_t t = (time_t)a->saved_at;
		struct tm tm;

		localtime_r(&t, &tm);
		strftime(tail, sizeof tail, "saved %H:%M", &tm);
	} else {
		tail[0] = '\0';        /* nothing saved here yet */
	}
	move(y, 0);
	clrtoeol();
	/* which operating point is shown comes first, when the bench has any */
	pw = layout_point_words(a->bench, a->point);
	if (pw != NULL) {
		char *t = xasprintf("%s%s ", pw, bar);
		int tw = (int)utf8_cols(t);

		ui_put_attr(a, y, 0, tw < w ? tw : w, t, ui_attr(a, app_point_name(a) != NULL ?
		    UC_KEY : UC_DIM) | (app_point_name(a) != NULL ? A_BOLD | A_REVERSE : 0));
		ox = tw < w ? tw : w;
		free(t);
		free(pw);
	}
	w -= ox;
	s = layout_margin_line(a->trace, a->ascii, w, tail);
	ui_put(a, y, ox, w, s, UC_NORMAL);
	/* the worst part in its status, the hazards part marked */
	cut = strstr(s, bar);
	if (cut != NULL) {
		char *head = xasprintf("%.*s", (int)(cut - s), s);
		int hw = (int)utf8_cols(head);
		const char *st, *end;

		ui_put_attr(a, y, ox, hw < w ? hw : w, head, ui_status_attr(a, worst) | A_BOLD);
		free(head);
		st = strstr(cut + strlen(bar), bar);
		if (st != NULL) {
			st += strlen(bar);
			end = strstr(st, bar);
			if (end == NULL)
				end = st + strlen(st);
			if (strstr(st, "no hazards") != st + strspn(st, " ")) {
				char *pre = xasprintf("%.*s", (int)(st - s), s);
				char *part = xasprintf("%.*s", (int)(end - st), st);
				int px = (int)utf8_cols(pre), pwd = (int)utf8_cols(part);

				if (px < w)
					ui_put_attr(a, y, ox + px, px + pwd < w ? pwd : w - px, part,
					    ui_attr(a, UC_HAZARD) | A_BOLD);
				free(pre);
				free(part);
			}
		}
	}
	free(s);
}

static void
draw_wb(struct app *a, struct ui_pane *p, int h, int w)
{
	struct wb *d = p->data;
	struct wb_geom g;
	char state[96], *where;
	struct layout_hint hints[40];
	size_t nh, n = model_count(&a->shown->path);

	wb_geometry(h, a->nrows, &g);
	app_draft_words(a, state, sizeof state);
	if (app_survey(a) != NULL)
		where = xasprintf("%zu element%s %s worst over base + %zu point%s", n,
		    n == 1 ? "" : "s", ui_glyph(a, GL_DOT), a->bench->points.n,
		    a->bench->points.n == 1 ? "" : "s");
	else
		where = xasprintf("%zu element%s", n, n == 1 ? "" : "s");
	ui_frame(a, state, where, h, w);
	free(where);
	draw_chain(a, d, &g, w);
	wb_draw_detail(a, d, &g, w);
	nh = wb_hints(a, d, hints, 40);
	ui_frame_bottom(a, hints, nh, h, w);
}

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
	"workbench", 0, NULL, draw_wb, wb_key, wb_click, NULL, wb_hints_cb, wb_release,
};

void
ui_bench_push(struct app *a)
{
	struct wb *d = xcalloc(1, sizeof *d);

	app_push(a, &ui_bench_ops, d);
}
