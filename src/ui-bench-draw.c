/* ui-bench-draw.c - drawing the workbench screen: its geometry, the chain
 * table (power, radius, peak irradiance or fluence, ratio bar, status for
 * every element, side branches indented), the frame around it and the
 * margin line.  Draws only; the keys are ui-bench.c's.  Owned by the
 * workbench. */
#include <config.h>

#include <math.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>

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

void
wb_draw(struct app *a, struct ui_pane *p, int h, int w)
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
