/* report-pdf-draw.c - the pictures of the printed review: the beam-profile
 * plot of a branch (both 1/e² radii over z, the power under it) and the
 * chain schematic (a symbol per element kind on a tile that shows its
 * status by colour and by hatching, so a black-and-white copy still tells
 * over from caution).  Positions come from core-report; this only draws. */
#include <config.h>

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "core-layout.h"
#include "report-pdf.h"
#include "util-err.h"

/* ---- units for the axes ---- */

struct axis_unit {
	const char *name;
	double      scale;          /* SI value / scale = shown value */
};

static struct axis_unit
length_unit(double top)
{
	if (top >= 1)
		return (struct axis_unit){ "m", 1 };
	if (top >= 1e-3)
		return (struct axis_unit){ "mm", 1e-3 };
	return (struct axis_unit){ "µm", 1e-6 };
}

static struct axis_unit
power_unit(double top)
{
	if (top >= 1)
		return (struct axis_unit){ "W", 1 };
	if (top >= 1e-3)
		return (struct axis_unit){ "mW", 1e-3 };
	return (struct axis_unit){ "µW", 1e-6 };
}

static void
tick_text(char *buf, size_t n, double v, double scale)
{
	snprintf(buf, n, "%.4g", v / scale);
}

/* ---- status tiles ---- */

static void
hatch(cairo_t *cr, double x, double y, double w, double h, double step, int dir)
{
	for (double d = -h; d < w + h; d += step) {
		if (dir > 0) {
			cairo_move_to(cr, x + d, y + h);
			cairo_line_to(cr, x + d + h, y);
		} else {
			cairo_move_to(cr, x + d, y);
			cairo_line_to(cr, x + d + h, y + h);
		}
	}
	cairo_stroke(cr);
}

void
pdf_status_tile(cairo_t *cr, double x, double y, double w, double h, enum damage_status s)
{
	static const double dash[] = { 2, 1.5 };

	cairo_save(cr);
	cairo_rectangle(cr, x, y, w, h);
	switch (s) {
	case STATUS_OVER:
		cairo_set_source_rgb(cr, 0.95, 0.62, 0.62);
		break;
	case STATUS_CAUTION:
		cairo_set_source_rgb(cr, 1.0, 0.87, 0.5);
		break;
	case STATUS_OK:
		cairo_set_source_rgb(cr, 0.78, 0.92, 0.78);
		break;
	default:
		cairo_set_source_rgb(cr, 1, 1, 1);
		break;
	}
	cairo_fill_preserve(cr);
	cairo_clip(cr);
	cairo_set_line_width(cr, 0.6);
	if (s == STATUS_OVER) {
		cairo_set_source_rgb(cr, 0.55, 0, 0);
		hatch(cr, x, y, w, h, 3, 1);
		hatch(cr, x, y, w, h, 3, -1);
	} else if (s == STATUS_CAUTION) {
		cairo_set_source_rgb(cr, 0.5, 0.35, 0);
		hatch(cr, x, y, w, h, 4, 1);
	}
	cairo_reset_clip(cr);
	cairo_rectangle(cr, x, y, w, h);
	if (s == STATUS_UNRATED || s == STATUS_OK) {
		cairo_set_source_rgb(cr, 0.35, 0.35, 0.35);
		if (s == STATUS_UNRATED)
			cairo_set_dash(cr, dash, 2, 0);
	} else {
		cairo_set_source_rgb(cr, 0, 0, 0);
	}
	cairo_set_line_width(cr, s == STATUS_OVER ? 1.4 : 0.7);
	cairo_stroke(cr);
	cairo_restore(cr);
}

void
pdf_status_legend(struct pdoc *d)
{
	static const struct { enum damage_status s; const char *text; } items[] = {
		{ STATUS_OVER, "over (cross-hatched, heavy border)" },
		{ STATUS_CAUTION, "caution (hatched)" },
		{ STATUS_OK, "ok (plain)" },
		{ STATUS_UNRATED, "unrated (dashed border)" },
	};
	double x = d->mx;

	for (size_t i = 0; i < sizeof items / sizeof *items; i++) {
		pdf_status_tile(d->cr, x, d->y + 1, 10, 8, items[i].s);
		x += 13;
		x += pdf_text(d, x, d->y, 0, PDF_SANS " 7", items[i].text, 0, 1) * 0;
		x += pdf_text_width(d, PDF_SANS " 7", items[i].text) + 14;
	}
	d->y += 12;
}

/* ---- symbols, own design, centred at (cx, cy) within about ±8 pt ---- */

static void
symbol_path(cairo_t *cr, const struct element *el, double cx, double cy)
{
	switch (el->type) {
	case EL_MIRROR:             /* a bar leaning across the beam */
		cairo_move_to(cr, cx - 5, cy + 8);
		cairo_line_to(cr, cx - 1.5, cy + 8);
		cairo_line_to(cr, cx + 5, cy - 8);
		cairo_line_to(cr, cx + 1.5, cy - 8);
		cairo_close_path(cr);
		break;
	case EL_LENS:
		if (model_get(el, K_FOCAL) < 0) {
			cairo_move_to(cr, cx - 4.5, cy - 8);
			cairo_line_to(cr, cx + 4.5, cy - 8);
			cairo_curve_to(cr, cx + 1, cy - 3, cx + 1, cy + 3, cx + 4.5, cy + 8);
			cairo_line_to(cr, cx - 4.5, cy + 8);
			cairo_curve_to(cr, cx - 1, cy + 3, cx - 1, cy - 3, cx - 4.5, cy - 8);
		} else {
			cairo_move_to(cr, cx, cy - 8.5);
			cairo_curve_to(cr, cx + 6, cy - 4, cx + 6, cy + 4, cx, cy + 8.5);
			cairo_curve_to(cr, cx - 6, cy + 4, cx - 6, cy - 4, cx, cy - 8.5);
		}
		cairo_close_path(cr);
		break;
	case EL_SPLITTER:           /* a cube with its dividing face */
		cairo_rectangle(cr, cx - 7, cy - 7, 14, 14);
		cairo_move_to(cr, cx - 7, cy + 7);
		cairo_line_to(cr, cx + 7, cy - 7);
		break;
	case EL_WINDOW:
		cairo_rectangle(cr, cx - 2, cy - 8, 4, 16);
		break;
	case EL_FILTER:             /* a thicker plate with a band */
		cairo_rectangle(cr, cx - 4, cy - 8, 8, 16);
		cairo_move_to(cr, cx - 4, cy - 3);
		cairo_line_to(cr, cx + 4, cy - 3);
		cairo_move_to(cr, cx - 4, cy + 3);
		cairo_line_to(cr, cx + 4, cy + 3);
		break;
	case EL_WAVEPLATE:          /* a thin disc seen from the side */
		cairo_save(cr);
		cairo_translate(cr, cx, cy);
		cairo_scale(cr, 2.8, 8.5);
		cairo_arc(cr, 0, 0, 1, 0, 2 * M_PI);
		cairo_restore(cr);
		break;
	case EL_POLARIZER:          /* a rhombus */
		cairo_move_to(cr, cx, cy - 8.5);
		cairo_line_to(cr, cx + 5.5, cy);
		cairo_line_to(cr, cx, cy + 8.5);
		cairo_line_to(cr, cx - 5.5, cy);
		cairo_close_path(cr);
		break;
	case EL_IRIS:               /* two jaws and the opening between */
		cairo_rectangle(cr, cx - 2, cy - 9, 4, 6);
		cairo_rectangle(cr, cx - 2, cy + 3, 4, 6);
		break;
	case EL_DUMP:               /* a block that widens away from the beam */
		cairo_move_to(cr, cx - 6, cy - 4);
		cairo_line_to(cr, cx + 6, cy - 8);
		cairo_line_to(cr, cx + 6, cy + 8);
		cairo_line_to(cr, cx - 6, cy + 4);
		cairo_close_path(cr);
		break;
	case EL_DETECTOR:           /* a flat face to the beam, round behind */
		cairo_move_to(cr, cx - 4, cy + 7);
		cairo_line_to(cr, cx - 4, cy - 7);
		cairo_arc(cr, cx - 4, cy, 7, -M_PI / 2, M_PI / 2);
		cairo_close_path(cr);
		break;
	case EL_TARGET:
		cairo_arc(cr, cx, cy, 7, 0, 2 * M_PI);
		cairo_close_path(cr);
		cairo_move_to(cr, cx - 7, cy);
		cairo_line_to(cr, cx + 7, cy);
		cairo_move_to(cr, cx, cy - 7);
		cairo_line_to(cr, cx, cy + 7);
		break;
	default:
		cairo_rectangle(cr, cx - 5, cy - 5, 10, 10);
		break;
	}
}

static void
draw_symbol(cairo_t *cr, const struct element *el, double cx, double cy)
{
	cairo_save(cr);
	cairo_new_path(cr);
	symbol_path(cr, el, cx, cy);
	cairo_set_source_rgb(cr, 1, 1, 1);
	cairo_fill_preserve(cr);
	cairo_set_source_rgb(cr, 0, 0, 0);
	cairo_set_line_width(cr, 0.9);
	cairo_stroke(cr);
	cairo_restore(cr);
}

/* ---- the profile plot ---- */

enum {
	P_TITLE = 14, P_LEGEND = 13, P_LEVEL = 8, P_RADIUS = 130, P_MID = 8,
	P_POWER = 48, P_XAXIS = 24, P_LEFT = 46, P_RIGHT = 8, P_MAXLEVELS = 6
};

struct plot_labels {
	int    *level;              /* -1: no room, not shown */
	double *x, *w;
	int     levels;
	size_t  left_out;
};

static void
plot_labels(struct pdoc *d, const struct rep_profile *p, double x0, double x1,
    struct plot_labels *pl)
{
	const struct trace *t = d->rv->trace;

	int *prio = xcalloc(p->nmark + 1, sizeof *prio);

	pl->x = xcalloc(p->nmark + 1, sizeof *pl->x);
	pl->w = xcalloc(p->nmark + 1, sizeof *pl->w);
	pl->level = xcalloc(p->nmark + 1, sizeof *pl->level);
	for (size_t i = 0; i < p->nmark; i++) {
		const struct rep_mark *m = &p->mark[i];
		const struct trace_row *r = &t->rows[m->row];
		const char *s = m->focus ? "focus" : r->el->id;

		pl->x[i] = rep_map(m->z, p->z0, p->z1, x0, x1);
		pl->w[i] = pdf_text_width(d, PDF_SANS " 6.5", s);
		/* what a reviewer looks for keeps its label when room runs out */
		prio[i] = m->focus ? 2 : r->status == STATUS_OVER ? 3 :
		    r->status == STATUS_CAUTION ? 2 : r->el->type == EL_LENS ? 1 : 0;
	}
	pl->levels = rep_labels_spread(pl->x, pl->w, prio, p->nmark, 3, P_MAXLEVELS, pl->level,
	    &pl->left_out);
	free(prio);
	if (pl->levels < 1)
		pl->levels = 1;
}

static void
plot_labels_free(struct plot_labels *pl)
{
	free(pl->x);
	free(pl->w);
	free(pl->level);
}

double
pdf_profile_height(struct pdoc *d, const struct rep_profile *p, double w)
{
	struct plot_labels pl;
	double h;

	plot_labels(d, p, P_LEFT, w - P_RIGHT, &pl);
	h = P_TITLE + P_LEGEND + pl.levels * P_LEVEL + 4 + P_RADIUS + P_MID + P_POWER + P_XAXIS;
	plot_labels_free(&pl);
	return h;
}

static void
legend_line(struct pdoc *d, double *x, double y, int dashed, double r, double g, double b,
    const char *text)
{
	static const double dash[] = { 4, 2 };
	cairo_t *cr = d->cr;

	cairo_save(cr);
	cairo_set_source_rgb(cr, r, g, b);
	cairo_set_line_width(cr, 1.4);
	if (dashed)
		cairo_set_dash(cr, dash, 2, 0);
	cairo_move_to(cr, *x, y + 5);
	cairo_line_to(cr, *x + 18, y + 5);
	cairo_stroke(cr);
	cairo_restore(cr);
	*x += 21;
	pdf_text(d, *x, y, 0, PDF_SANS " 7", text, 0, 1);
	*x += pdf_text_width(d, PDF_SANS " 7", text) + 12;
}

static void
y_axis(struct pdoc *d, double x0, double x1, double ytop, double ybot, double top,
    struct axis_unit u, const char *name)
{
	cairo_t *cr = d->cr;
	double ticks[8], lab[8];
	size_t n = layout_ticks(0, top, 5, ticks);
	char buf[48];

	(void)lab;
	for (size_t i = 0; i < n; i++) {
		double y = rep_map(ticks[i], 0, top, ybot, ytop);

		cairo_set_source_rgb(cr, 0.85, 0.85, 0.85);
		cairo_set_line_width(cr, 0.4);
		cairo_move_to(cr, x0, y);
		cairo_line_to(cr, x1, y);
		cairo_stroke(cr);
		tick_text(buf, sizeof buf, ticks[i], u.scale);
		cairo_set_source_rgb(cr, 0, 0, 0);
		pdf_text(d, x0 - 40, y - 4, 37, PDF_SANS " 6.5", buf, 2, 1);
	}
	/* the axis title, turned up the left side */
	snprintf(buf, sizeof buf, "%s (%s)", name, u.name);
	cairo_save(cr);
	cairo_translate(cr, x0 - P_LEFT + 1, (ytop + ybot) / 2 + pdf_text_width(d, PDF_SANS " 7", buf) / 2);
	cairo_rotate(cr, -M_PI / 2);
	pdf_text(d, 0, 0, 0, PDF_SANS " 7", buf, 0, 1);
	cairo_restore(cr);
}

double
pdf_draw_profile(struct pdoc *d, const struct rep_profile *p, double x, double y, double w,
    double *frame)
{
	static const double dash[] = { 4, 2 }, dot[] = { 1, 2 };
	const struct trace *t = d->rv->trace;
	cairo_t *cr = d->cr;
	struct plot_labels pl;
	double x0 = x + P_LEFT, x1 = x + w - P_RIGHT, yr0, yr1, yp0, yp1, lx, ticks[12];
	struct axis_unit zu = length_unit(p->z1), ru = length_unit(p->rmax), pu = power_unit(p->pmax);
	char buf[400];
	size_t n;

	plot_labels(d, p, x0, x1, &pl);
	snprintf(buf, sizeof buf, "Beam profile, branch %s (from the source to %s)", p->branch,
	    t->rows[p->path[p->npath - 1]].el->id);
	cairo_set_source_rgb(cr, 0, 0, 0);
	pdf_text(d, x, y, w, PDF_SANS " Bold 8.5", buf, 0, 1);
	lx = x0;
	legend_line(d, &lx, y + P_TITLE, 0, PDF_WX_RGB, "1/e² radius x (tangential)");
	legend_line(d, &lx, y + P_TITLE, 1, PDF_WY_RGB, "1/e² radius y (sagittal)");
	legend_line(d, &lx, y + P_TITLE, 0, 0, 0, 0, "power");
	pdf_text(d, lx, y + P_TITLE, 0, PDF_SANS " 7", "┆ element   ▼ focus", 0, 1);
	yr0 = y + P_TITLE + P_LEGEND + pl.levels * P_LEVEL + 4;
	yr1 = yr0 + P_RADIUS;
	yp0 = yr1 + P_MID;
	yp1 = yp0 + P_POWER;
	if (frame != NULL) {
		frame[0] = x0;
		frame[1] = yr0;
		frame[2] = x1;
		frame[3] = yr1;
	}
	y_axis(d, x0, x1, yr0, yr1, p->rmax, ru, "radius");
	y_axis(d, x0, x1, yp0, yp1, p->pmax, pu, "power");
	/* z ticks under the power panel */
	n = layout_ticks(p->z0, p->z1, 10, ticks);
	for (size_t i = 0; i < n; i++) {
		double tx = rep_map(ticks[i], p->z0, p->z1, x0, x1);

		cairo_set_source_rgb(cr, 0, 0, 0);
		cairo_set_line_width(cr, 0.6);
		cairo_move_to(cr, tx, yp1);
		cairo_line_to(cr, tx, yp1 + 3);
		cairo_move_to(cr, tx, yr1);
		cairo_line_to(cr, tx, yr1 + 3);
		cairo_stroke(cr);
		tick_text(buf, sizeof buf, ticks[i], zu.scale);
		pdf_text(d, tx - 20, yp1 + 3, 40, PDF_SANS " 6.5", buf, 1, 1);
	}
	snprintf(buf, sizeof buf, "z along the beam, unfolded (%s)", zu.name);
	pdf_text(d, x0, yp1 + 12, x1 - x0, PDF_SANS " 7", buf, pl.left_out > 0 ? 2 : 1, 1);
	/* element planes and their labels on levels above the radius panel */
	for (size_t i = 0; i < p->nmark; i++) {
		const struct rep_mark *m = &p->mark[i];
		double mx = pl.x[i], ly = yr0 - 4 - (pl.level[i] + 1) * P_LEVEL;

		cairo_save(cr);
		cairo_set_line_width(cr, 0.5);
		cairo_set_source_rgb(cr, 0.45, 0.45, 0.45);
		if (!m->focus && p->nmark <= 30) {
			cairo_set_dash(cr, dot, 2, 0);
			cairo_move_to(cr, mx, yr0);
			cairo_line_to(cr, mx, yr1);
			cairo_move_to(cr, mx, yp0);
			cairo_line_to(cr, mx, yp1);
		} else if (!m->focus) {
			/* many planes: ticks on the frames, not lines over the curves */
			cairo_move_to(cr, mx, yr0);
			cairo_line_to(cr, mx, yr0 + 4);
			cairo_move_to(cr, mx, yp1);
			cairo_line_to(cr, mx, yp1 - 4);
		}
		cairo_stroke(cr);
		if (pl.level[i] >= 0) {
			cairo_set_dash(cr, dot, 2, 0);
			cairo_move_to(cr, mx, ly + P_LEVEL);
			cairo_line_to(cr, mx, yr0);
			cairo_stroke(cr);
		}
		cairo_restore(cr);
	}
	/* labels over the leaders, each on a blank patch, so a leader from a
	 * higher level never runs through a word */
	for (size_t i = 0; i < p->nmark; i++) {
		const struct rep_mark *m = &p->mark[i];
		double ly = yr0 - 4 - (pl.level[i] + 1) * P_LEVEL;

		if (pl.level[i] < 0)
			continue;
		cairo_set_source_rgb(cr, 1, 1, 1);
		cairo_rectangle(cr, pl.x[i] - pl.w[i] / 2 - 0.5, ly + 0.5, pl.w[i] + 1, P_LEVEL - 0.5);
		cairo_fill(cr);
		cairo_set_source_rgb(cr, m->focus ? 0.6 : 0, 0, 0);
		pdf_text(d, pl.x[i] - pl.w[i] / 2, ly, 0, PDF_SANS " 6.5",
		    m->focus ? "focus" : t->rows[m->row].el->id, 0, 1);
	}
	if (pl.left_out > 0) {
		snprintf(buf, sizeof buf, "%zu element labels left out for room (over, caution, "
		    "lenses and foci first); the table lists every element", pl.left_out);
		cairo_set_source_rgb(cr, 0.3, 0.3, 0.3);
		pdf_text(d, x0, yp1 + 12, 0, PDF_SANS " Oblique 6", buf, 0, 1);
		cairo_set_source_rgb(cr, 0, 0, 0);
	}
	/* the curves, clipped to their panels */
	cairo_save(cr);
	cairo_rectangle(cr, x0, yr0 - 1, x1 - x0, yr1 - yr0 + 2);
	cairo_clip(cr);
	for (int axis = 0; axis < 2; axis++) {
		cairo_new_path(cr);
		for (size_t i = 0; i < p->ns; i++) {
			double px = rep_map(p->s[i].z, p->z0, p->z1, x0, x1);
			double py = rep_map(axis ? p->s[i].wy : p->s[i].wx, 0, p->rmax, yr1, yr0);

			if (i == 0)
				cairo_move_to(cr, px, py);
			else
				cairo_line_to(cr, px, py);
		}
		cairo_set_line_width(cr, 1.3);
		if (axis) {
			cairo_set_source_rgb(cr, PDF_WY_RGB);
			cairo_set_dash(cr, dash, 2, 0);
		} else {
			cairo_set_source_rgb(cr, PDF_WX_RGB);
			cairo_set_dash(cr, NULL, 0, 0);
		}
		cairo_stroke(cr);
	}
	cairo_set_dash(cr, NULL, 0, 0);
	for (size_t i = 0; i < p->nmark; i++) {
		const struct trace_row *r = &t->rows[p->mark[i].row];
		double fx, fy, fw;

		if (!p->mark[i].focus)
			continue;
		fw = r->focus.wx < r->focus.wy ? r->focus.wx : r->focus.wy;
		fx = pl.x[i];
		fy = rep_map(fw, 0, p->rmax, yr1, yr0);
		cairo_set_source_rgb(cr, 0.6, 0, 0);
		cairo_move_to(cr, fx - 3.5, fy - 7);
		cairo_line_to(cr, fx + 3.5, fy - 7);
		cairo_line_to(cr, fx, fy - 1);
		cairo_close_path(cr);
		cairo_fill(cr);
	}
	cairo_restore(cr);
	cairo_save(cr);
	cairo_rectangle(cr, x0, yp0 - 1, x1 - x0, yp1 - yp0 + 2);
	cairo_clip(cr);
	cairo_new_path(cr);
	for (size_t i = 0; i < p->ns; i++) {
		double px = rep_map(p->s[i].z, p->z0, p->z1, x0, x1);
		double py = rep_map(p->s[i].power, 0, p->pmax, yp1, yp0);

		if (i == 0)
			cairo_move_to(cr, px, py);
		else
			cairo_line_to(cr, px, py);
	}
	cairo_set_source_rgb(cr, 0, 0, 0);
	cairo_set_line_width(cr, 1.1);
	cairo_stroke(cr);
	cairo_restore(cr);
	/* frames last, over the grid */
	cairo_set_source_rgb(cr, 0, 0, 0);
	cairo_set_line_width(cr, 0.7);
	cairo_rectangle(cr, x0, yr0, x1 - x0, yr1 - yr0);
	cairo_rectangle(cr, x0, yp0, x1 - x0, yp1 - yp0);
	cairo_stroke(cr);
	plot_labels_free(&pl);
	return yp1 + P_XAXIS - y;
}

/* ---- the schematic ---- */

enum { S_CWMAX = 44, S_CWMIN = 36, S_LH = 46, S_TILE = 22, S_LEFT = 30 };

static const char *
port_word(enum port p)
{
	return p == PORT_REFLECTED ? "refl." : p == PORT_TRANSMITTED ? "trans." :
	    p == PORT_REJECTED ? "rej." : "";
}

static int
branch_has_cells(const struct rep_schematic *sc, const struct trace *t,
    const struct element *owner)
{
	for (size_t k = 0; k < sc->n; k++)
		if (t->rows[sc->cell[k].row].parent == owner)
			return 1;
	return 0;
}

void
pdf_draw_schematic(struct pdoc *d)
{
	const struct trace *t = d->rv->trace;
	struct rep_schematic sc;
	int per, strips, *lanes, *row;
	unsigned char *has_next;
	cairo_t *cr = d->cr;
	double avail = d->pw - 2 * d->mx - S_LEFT - 20, S_CW;

	rep_schematic_build(t, &sc);
	if (sc.n == 0) {
		rep_schematic_release(&sc);
		return;
	}
	/* narrower cells before a second strip */
	S_CW = sc.cols > 0 ? avail / sc.cols : S_CWMAX;
	S_CW = S_CW > S_CWMAX ? S_CWMAX : S_CW < S_CWMIN ? S_CWMIN : S_CW;
	per = (int)(avail / S_CW);
	lanes = xcalloc((size_t)sc.cols / (size_t)(per > 0 ? per : 1) + 2, sizeof *lanes);
	row = xcalloc(sc.n, sizeof *row);
	has_next = xcalloc(sc.n, 1);
	strips = rep_schematic_strips(&sc, per, lanes, row);
	for (size_t k = 0; k < sc.n; k++)
		if (sc.cell[k].prev >= 0)
			has_next[sc.cell[k].prev] = 1;
	for (int s = 0; s < strips; s++) {
		double sh = lanes[s] * S_LH + 14, y0;

		pdf_need(d, sh);
		y0 = d->y;
#define CX(c) (d->mx + S_LEFT + ((c)->col % per) * S_CW + S_CW / 2)
#define CY(k) (y0 + row[k] * S_LH + 22)
		if (s == 0) {           /* the source */
			cairo_set_source_rgb(cr, 0, 0, 0);
			cairo_rectangle(cr, d->mx, y0 + 22 - 5, 14, 10);
			cairo_fill(cr);
			pdf_text(d, d->mx - 4, y0 + 22 + 7, 24, PDF_SANS " 6", "source", 1, 1);
		}
		/* beam lines first */
		cairo_set_line_width(cr, 0.9);
		for (size_t k = 0; k < sc.n; k++) {
			const struct rep_cell *c = &sc.cell[k];
			double cx = CX(c), cy = CY(k);
			char gap[48];

			if (c->col / per != s)
				continue;
			cairo_set_source_rgb(cr, 0, 0, 0);
			if (c->prev >= 0 && sc.cell[c->prev].col / per == s) {
				double px = CX(&sc.cell[c->prev]);

				cairo_move_to(cr, px, cy);
				cairo_line_to(cr, cx, cy);
				cairo_stroke(cr);
				if (c->gap > 0) {
					units_format(gap, sizeof gap, c->gap, DIM_LENGTH, 3, 0);
					pdf_text(d, px - 4, cy - 19, cx - px + 8, PDF_SANS " 5.5", gap, 1, 1);
				}
			} else if (c->prev >= 0) {
				cairo_move_to(cr, d->mx + S_LEFT - 10, cy);
				cairo_line_to(cr, cx, cy);
				cairo_stroke(cr);
				pdf_text(d, d->mx, cy - 4, S_LEFT - 12, PDF_SANS " 5.5", "from", 2, 1);
			} else if (c->owner >= 0 && sc.cell[c->owner].col / per == s) {
				const struct rep_cell *o = &sc.cell[c->owner];
				double ox = CX(o), oy = CY(c->owner);

				double dx = ox + S_CW / 2;

				cairo_move_to(cr, ox, oy);
				cairo_line_to(cr, dx, oy);
				cairo_line_to(cr, dx, cy);
				cairo_line_to(cr, cx, cy);
				cairo_stroke(cr);
				/* the port's name, and the free space to the first element,
				 * left of the drop just above its lane */
				pdf_text(d, dx - 2 - S_CW, cy - 10, S_CW, PDF_SANS " 5.5",
				    port_word(t->rows[c->row].port), 2, 1);
				if (c->gap > 0) {
					units_format(gap, sizeof gap, c->gap, DIM_LENGTH, 3, 0);
					pdf_text(d, dx - 2 - S_CW, cy - 17, S_CW, PDF_SANS " 5.5", gap, 2, 1);
				}
			} else if (c->owner >= 0) {
				char from[160];

				snprintf(from, sizeof from, "from %s %s", t->rows[c->row].parent->id,
				    port_word(t->rows[c->row].port));
				cairo_move_to(cr, d->mx + S_LEFT - 10, cy);
				cairo_line_to(cr, cx, cy);
				cairo_stroke(cr);
				pdf_text(d, d->mx - 8, cy - 14, S_LEFT + 4, PDF_SANS " 5", from, 2, 1);
			} else if (s == 0 && c->lane == 0) {
				cairo_move_to(cr, d->mx + 14, cy);
				cairo_line_to(cr, cx, cy);
				cairo_stroke(cr);
				if (c->gap > 0) {
					units_format(gap, sizeof gap, c->gap, DIM_LENGTH, 3, 0);
					pdf_text(d, d->mx + 10, cy - 19, cx - d->mx - 14, PDF_SANS " 5.5",
					    gap, 1, 1);
				}
			}
			if (has_next[k]) {
				/* continues in the next strip */
				for (size_t j = 0; j < sc.n; j++)
					if (sc.cell[j].prev == (long)k && sc.cell[j].col / per != s) {
						cairo_move_to(cr, cx, cy);
						cairo_line_to(cr, d->pw - d->mx - 8, cy);
						cairo_stroke(cr);
						pdf_text(d, d->pw - d->mx - 8, cy - 4, 0, PDF_SANS " 5.5", "→", 0, 1);
					}
			} else if (!model_type_is_terminator(t->rows[c->row].el->type)) {
				/* the beam goes on, off the bench */
				cairo_set_source_rgb(cr, 0.6, 0, 0);
				cairo_move_to(cr, cx, cy);
				cairo_line_to(cr, cx + S_CW * 0.55, cy);
				cairo_stroke(cr);
				pdf_text(d, cx + S_CW * 0.3, cy - 11, 0, PDF_SANS " Bold 5.5", "open", 0, 1);
			}
		}
		/* tiles, symbols and ids on top */
		for (size_t k = 0; k < sc.n; k++) {
			const struct rep_cell *c = &sc.cell[k];
			const struct trace_row *r = &t->rows[c->row];
			double cx = CX(c), cy = CY(k);

			if (c->col / per != s)
				continue;
			pdf_status_tile(cr, cx - S_TILE / 2.0, cy - S_TILE / 2.0, S_TILE, S_TILE, r->status);
			draw_symbol(cr, r->el, cx, cy);
			cairo_set_source_rgb(cr, 0, 0, 0);
			d->one_line = 1;    /* a long id is cut, not wrapped over its status */
			pdf_text(d, cx - S_CW / 2 + 1, cy + S_TILE / 2.0 + 1, S_CW - 2, PDF_SANS " 6",
			    r->el->id, 1, 1);
			d->one_line = 0;
			if (r->el->side_port != PORT_NONE && !branch_has_cells(&sc, t, r->el)) {
				/* a side port with nothing in its way: the beam leaves */
				cairo_set_source_rgb(cr, 0.6, 0, 0);
				cairo_set_line_width(cr, 0.9);
				cairo_move_to(cr, cx + S_TILE / 2.0, cy + S_TILE / 2.0);
				cairo_line_to(cr, cx + S_TILE / 2.0 + 7, cy + S_TILE / 2.0 + 7);
				cairo_stroke(cr);
				pdf_text(d, cx + S_TILE / 2.0 + 3, cy + S_TILE / 2.0 + 6, 0,
				    PDF_SANS " Bold 5.5", "open", 0, 1);
				pdf_text(d, cx + S_TILE / 2.0 + 3, cy + S_TILE / 2.0 + 12, 0,
				    PDF_SANS " 5", port_word(r->el->side_port), 0, 1);
				cairo_set_source_rgb(cr, 0, 0, 0);
			}
			if (r->status == STATUS_OVER || r->status == STATUS_CAUTION)
				pdf_text(d, cx - S_CW / 2, cy + S_TILE / 2.0 + 8, S_CW,
				    PDF_SANS " Bold 5.5", r->status == STATUS_OVER ? "OVER" : "caution", 1, 1);
		}
#undef CX
#undef CY
		d->y += sh;
	}
	free(lanes);
	free(row);
	free(has_next);
	rep_schematic_release(&sc);
}
