/* report-pdf.c - the printed review as a PDF (A4, cairo, text set by
 * pango): the title block, the verdict and the sign-off lines, the chain
 * schematic and the profile plots, the element table over as many pages as
 * it needs with its header repeated, the changes since an earlier setup,
 * foci, warnings and the laser-safety cautions.  Every page names the
 * bench and setup and carries "page N of M", so the document is laid out
 * twice: once to count the pages, once to keep.  Also the profile plots
 * alone as SVG. */
#include <config.h>

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <cairo-pdf.h>
#include <cairo-svg.h>

#include "core-layout.h"
#include "report-diff.h"
#include "report-pdf.h"
#include "report.h"
#include "util-buf.h"
#include "util-err.h"

/* ---- text ---- */

static void
set_font(struct pdoc *d, const char *font)
{
	PangoFontDescription *fd = pango_font_description_from_string(font);

	pango_layout_set_font_description(d->lay, fd);
	pango_font_description_free(fd);
}

double
pdf_text(struct pdoc *d, double x, double y, double w, const char *font, const char *text,
    int align, int draw)
{
	int pw, ph;

	set_font(d, font);
	pango_layout_set_text(d->lay, text, -1);
	pango_layout_set_width(d->lay, w > 0 ? (int)(w * PANGO_SCALE) : -1);
	pango_layout_set_wrap(d->lay, PANGO_WRAP_WORD_CHAR);
	pango_layout_set_ellipsize(d->lay, d->one_line && w > 0 ? PANGO_ELLIPSIZE_END :
	    PANGO_ELLIPSIZE_NONE);
	pango_layout_set_alignment(d->lay, align == 1 ? PANGO_ALIGN_CENTER :
	    align == 2 ? PANGO_ALIGN_RIGHT : PANGO_ALIGN_LEFT);
	pango_layout_get_size(d->lay, &pw, &ph);
	if (draw) {
		cairo_move_to(d->cr, x, y);
		pango_cairo_show_layout(d->cr, d->lay);
		cairo_new_path(d->cr);
	}
	return (double)ph / PANGO_SCALE;
}

double
pdf_text_width(struct pdoc *d, const char *font, const char *text)
{
	int pw, ph;

	set_font(d, font);
	pango_layout_set_width(d->lay, -1);
	pango_layout_set_ellipsize(d->lay, PANGO_ELLIPSIZE_NONE);
	pango_layout_set_text(d->lay, text, -1);
	pango_layout_get_size(d->lay, &pw, &ph);
	return (double)pw / PANGO_SCALE;
}

/* ---- pages ---- */

static void
page_frame(struct pdoc *d)
{
	cairo_t *cr = d->cr;
	char buf[300];

	cairo_set_source_rgb(cr, 0, 0, 0);
	snprintf(buf, sizeof buf, "beamledger review · bench %s · %s", d->rv->bench->name,
	    d->rv->setup);
	d->one_line = 1;            /* a long bench name must not run into the rule */
	pdf_text(d, d->mx, 22, d->pw - 2 * d->mx - 80, PDF_SANS " 7.5", buf, 0, 1);
	d->one_line = 0;
	if (d->total > 0)
		snprintf(buf, sizeof buf, "page %d of %d", d->page, d->total);
	else
		snprintf(buf, sizeof buf, "page %d", d->page);
	pdf_text(d, d->pw - d->mx - 80, 22, 80, PDF_SANS " 7.5", buf, 2, 1);
	cairo_set_line_width(cr, 0.5);
	cairo_move_to(cr, d->mx, 33);
	cairo_line_to(cr, d->pw - d->mx, 33);
	cairo_move_to(cr, d->mx, d->ph - 32);
	cairo_line_to(cr, d->pw - d->mx, d->ph - 32);
	cairo_stroke(cr);
	snprintf(buf, sizeof buf, "Design estimate only; the laser safety officer and local "
	    "rules decide.   Content hash %.16s…", d->rv->hash);
	pdf_text(d, d->mx, d->ph - 28, d->pw - 2 * d->mx, PDF_SANS " 6.5", buf, 0, 1);
}

void
pdf_new_page(struct pdoc *d)
{
	if (d->page > 0)
		cairo_show_page(d->cr);
	d->page++;
	d->y = d->top;
	page_frame(d);
}

void
pdf_need(struct pdoc *d, double h)
{
	if (d->y + h > d->bottom && d->y > d->top)
		pdf_new_page(d);
}

void
pdf_heading(struct pdoc *d, const char *title)
{
	pdf_need(d, 40);
	d->y += 6;
	cairo_set_source_rgb(d->cr, 0, 0, 0);
	d->y += pdf_text(d, d->mx, d->y, 0, PDF_SANS " Bold 10.5", title, 0, 1) + 3;
}

/* ---- page one: title, verdict, sign-off ---- */

static void
kv(struct pdoc *d, const char *key, const char *val, double kw)
{
	double h;

	if (val == NULL || val[0] == '\0')
		val = "-";
	pdf_text(d, d->mx, d->y, kw, PDF_SANS " Bold 7.5", key, 0, 1);
	h = pdf_text(d, d->mx + kw, d->y, d->pw - 2 * d->mx - kw, PDF_SANS " 7.5", val, 0, 1);
	d->y += h + 1;
}

static void
title_block(struct pdoc *d)
{
	const struct review *rv = d->rv;
	char *s, buf[400];

	snprintf(buf, sizeof buf, "Review of bench %s, %s", rv->bench->name, rv->setup);
	d->y += pdf_text(d, d->mx, d->y, d->pw - 2 * d->mx, PDF_SANS " Bold 15", buf, 0, 1) + 4;
	kv(d, "Setup names", rv->setup_names, 110);
	snprintf(buf, sizeof buf, "%s%s%s", rv->time != NULL ? rv->time : "-",
	    rv->author != NULL ? " by " : "", rv->author != NULL ? rv->author : "");
	kv(d, "Recorded (UTC)", buf, 110);
	kv(d, "Note", rv->note, 110);
	if (rv->bench->notes != NULL)
		kv(d, "Bench notes", rv->bench->notes, 110);
	s = report_source_line(rv->bench, 0);
	kv(d, "Source", s, 110);
	free(s);
	kv(d, "Read from", rv->origin, 110);
	kv(d, "Content hash", rv->hash, 110);
	kv(d, "Printed (UTC)", rv->printed, 110);
	d->y += 6;
}

static void
verdict_and_signoff(struct pdoc *d)
{
	const struct trace *t = d->rv->trace;
	struct review_counts n;
	double x = d->mx, w = 300, y0 = d->y, y, sx = d->mx + w + 12, sw = d->pw - d->mx - sx;
	char buf[200], *s;
	enum damage_status worst = t->worst >= 0 ? t->rows[t->worst].status : STATUS_UNRATED;

	review_count_all(d->rv, &n);
	y = y0 + 6;
	cairo_set_source_rgb(d->cr, 0, 0, 0);
	y += pdf_text(d, x + 8, y, w - 16, PDF_SANS " Bold 9", "Verdict", 0, 1) + 2;
	pdf_status_tile(d->cr, x + 8, y + 1, 12, 12, worst);
	s = review_worst_text_of(d->rv);
	y += pdf_text(d, x + 26, y, w - 34, PDF_SANS " Bold 8.5", s, 0, 1) + 2;
	free(s);
	s = review_safe_text(t);
	y += pdf_text(d, x + 8, y, w - 16, PDF_SANS " Bold 8.5", s, 0, 1) + 3;
	free(s);
	snprintf(buf, sizeof buf, "Over: %zu    caution: %zu    ok: %zu    unrated: %zu",
	    n.over, n.caution, n.ok, n.unrated);
	y += pdf_text(d, x + 8, y, w - 16, PDF_SANS " 8", buf, 0, 1) + 1;
	snprintf(buf, sizeof buf, "Unterminated beams: %zu    air-breakdown foci: %zu",
	    n.unterminated, n.air_breakdown);
	y += pdf_text(d, x + 8, y, w - 16, PDF_SANS " 8", buf, 0, 1) + 1;
	s = review_warnings_text(t);
	y += pdf_text(d, x + 8, y, w - 16, PDF_SANS " 8", s, 0, 1) + 1;
	free(s);
	s = review_points_text(d->rv);
	y += pdf_text(d, x + 8, y, w - 16, PDF_SANS " 8", s, 0, 1) + 1;
	free(s);
	if (d->rv->survey != NULL) {
		s = review_survey_worst_text(d->rv);
		y += pdf_text(d, x + 8, y, w - 16, PDF_SANS " Bold 8", s, 0, 1) + 1;
		free(s);
		s = review_survey_list_text(d->rv, 6);
		y += pdf_text(d, x + 8, y, w - 16, PDF_SANS " 7.5", s, 0, 1) + 1;
		free(s);
	}
	snprintf(buf, sizeof buf, "Safety factor %g: caution from %.0f %% of a threshold, "
	    "over from 100 %%.", d->rv->bench->safety_factor, 100 / d->rv->bench->safety_factor);
	y += pdf_text(d, x + 8, y, w - 16, PDF_SANS " 7", buf, 0, 1) + 6;
	if (y < y0 + 112)
		y = y0 + 112;
	cairo_set_line_width(d->cr, worst == STATUS_OVER ? 2 : 1);
	cairo_rectangle(d->cr, x, y0, w, y - y0);
	cairo_stroke(d->cr);
	/* sign-off, beside it */
	{
		static const char *const who[] = { "Checked by", "Laser safety officer", "Date" };
		double yy = y0 + 6;

		pdf_text(d, sx + 8, yy, sw - 16, PDF_SANS " Bold 9", "Sign-off", 0, 1);
		yy += 18;
		for (int i = 0; i < 3; i++) {
			pdf_text(d, sx + 8, yy, sw - 16, PDF_SANS " 7.5", who[i], 0, 1);
			yy += 20;
			cairo_set_line_width(d->cr, 0.6);
			cairo_move_to(d->cr, sx + 8, yy);
			cairo_line_to(d->cr, sx + sw - 8, yy);
			cairo_stroke(d->cr);
			yy += 5;
		}
		cairo_set_line_width(d->cr, 1);
		cairo_rectangle(d->cr, sx, y0, sw, y - y0);
		cairo_stroke(d->cr);
	}
	d->y = y + 8;
}

/* ---- the element table ---- */

static void para(struct pdoc *, const char *font, const char *text, double indent);

/* Display columns: the review's cells, with every point's worst before
 * the flags when there is a survey; the last column takes what is left. */
enum { PCOLS = REVIEW_NCOLS + 1, PC_WORST = REVIEW_NCOLS - 1 };
static const double col_w[REVIEW_NCOLS] = { 64, 42, 40, 40, 62, 50, 48, 34, 44, 0 };
static const double col_w_sv[PCOLS] = { 56, 40, 36, 38, 58, 46, 46, 34, 44, 58, 0 };

static int
ncols(const struct pdoc *d)
{
	return d->rv->survey != NULL ? PCOLS : REVIEW_NCOLS;
}

static double
width_of(const struct pdoc *d, int c)
{
	return d->rv->survey != NULL ? col_w_sv[c] : col_w[c];
}

/* The text of display column c. */
static const char *
col_text(const struct pdoc *d, int c, char cells[REVIEW_NCOLS][REVIEW_CELL], const char *worst)
{
	if (d->rv->survey == NULL || c < PC_WORST)
		return cells[c];
	return c == PC_WORST ? worst : cells[c - 1];
}
#define TFONT PDF_SANS " 6.5"
#define THEAD PDF_SANS " Bold 6.5"

struct tline {
	size_t row;                 /* trace row */
	int    port;                /* 1: the heading of the branch starting at row */
	double h;
};

static double
col_x(const struct pdoc *d, int c, double *w)
{
	double x = d->mx;

	for (int i = 0; i < c; i++)
		x += width_of(d, i);
	*w = width_of(d, c) > 0 ? width_of(d, c) : d->pw - d->mx - x;
	return x;
}

static double
table_header(struct pdoc *d, int draw)
{
	double h = 11, w;

	if (!draw)
		return h;
	cairo_set_source_rgb(d->cr, 0.88, 0.88, 0.88);
	cairo_rectangle(d->cr, d->mx, d->y, d->pw - 2 * d->mx, h);
	cairo_fill(d->cr);
	cairo_set_source_rgb(d->cr, 0, 0, 0);
	for (int c = 0; c < ncols(d); c++) {
		double x = col_x(d, c, &w);
		const char *name = d->rv->survey == NULL || c < PC_WORST ?
		    review_col_name(d->rv->trace, c) : c == PC_WORST ? "worst, at point" :
		    review_col_name(d->rv->trace, c - 1);

		pdf_text(d, x + 1, d->y + 1.5, w - 2, THEAD, name, c >= 2 && c <= 7 ? 2 : 0, 1);
	}
	d->y += h;
	return h;
}

static double
tline_draw(struct pdoc *d, const struct tline *l, int draw)
{
	const struct trace *t = d->rv->trace;
	const struct trace_row *r = &t->rows[l->row];
	char cells[REVIEW_NCOLS][REVIEW_CELL], worst[REVIEW_CELL] = "";
	double h = 0, w, ind = r->depth * 6.0;

	if (l->port) {
		char br[160], txt[200];

		trace_branch_name(r->parent, r->port, br, sizeof br);
		snprintf(txt, sizeof txt, "└ branch %s", br);
		cairo_set_source_rgb(d->cr, 0, 0, 0);
		return pdf_text(d, d->mx + ind - 6 + 1, d->y + 1, 0, PDF_SANS " Oblique 6.5",
		    txt, 0, draw) + 2;
	}
	review_row_cells(t, r, cells);
	if (d->rv->survey != NULL)
		review_survey_cell(d->rv->survey, r->el->id, worst, sizeof worst);
	for (int c = 0; c < ncols(d); c++) {
		double x = col_x(d, c, &w), th, dx = 0;

		if (c == 0)
			dx = ind;
		if (c == 8) {
			if (draw)
				pdf_status_tile(d->cr, x + 5, d->y + 1.5, 6, 6, r->status);
			dx = 13;
		}
		cairo_set_source_rgb(d->cr, 0, 0, 0);
		th = pdf_text(d, x + 1 + dx, d->y + 1, w - 2 - dx,
		    c == 8 && r->status == STATUS_OVER ? THEAD : TFONT, col_text(d, c, cells, worst),
		    c >= 2 && c <= 7 ? 2 : 0, draw);
		if (th > h)
			h = th;
	}
	if (draw && r->el->type != EL_SPACE) {
		cairo_set_source_rgb(d->cr, 0.8, 0.8, 0.8);
		cairo_set_line_width(d->cr, 0.3);
		cairo_move_to(d->cr, d->mx, d->y + h + 2);
		cairo_line_to(d->cr, d->pw - d->mx, d->y + h + 2);
		cairo_stroke(d->cr);
	}
	return h + 2;
}

static void
element_table(struct pdoc *d)
{
	const struct trace *t = d->rv->trace;
	struct tline *l = xcalloc(2 * t->nrows + 1, sizeof *l);
	double *h;
	size_t n = 0, *page, npages, cur = 0;

	for (size_t i = 0; i < t->nrows; i++) {
		if (i > 0 && t->rows[i].parent != NULL && t->rows[i - 1].el == t->rows[i].parent)
			l[n++] = (struct tline){ i, 1, 0 };
		l[n++] = (struct tline){ i, 0, 0 };
	}
	h = xcalloc(n + 1, sizeof *h);
	page = xcalloc(n + 1, sizeof *page);
	for (size_t i = 0; i < n; i++)
		h[i] = l[i].h = tline_draw(d, &l[i], 0);
	pdf_heading(d, "Elements");
	if (d->rv->survey != NULL)
		para(d, PDF_SANS " Oblique 7", "Values at the base; \"worst, at point\" is the "
		    "element's worst ratio over the base and every operating point, and where.", 0);
	/* later pages lose a line to "(continued)" */
	npages = rep_paginate(h, n, d->bottom - d->y, d->bottom - d->top - 12, table_header(d, 0),
	    page);
	(void)npages;
	table_header(d, 1);
	for (size_t i = 0; i < n; i++) {
		if (page[i] != cur) {
			cur = page[i];
			pdf_new_page(d);
			cairo_set_source_rgb(d->cr, 0, 0, 0);
			d->y += pdf_text(d, d->mx, d->y, 0, PDF_SANS " Oblique 7.5",
			    "Elements (continued)", 0, 1) + 2;
			table_header(d, 1);
		}
		tline_draw(d, &l[i], 1);
		d->y += l[i].h;
	}
	free(l);
	free(h);
	free(page);
}

/* ---- text sections ---- */

static void
para(struct pdoc *d, const char *font, const char *text, double indent)
{
	double h = pdf_text(d, d->mx + indent, d->y, d->pw - 2 * d->mx - indent, font, text, 0, 0);

	pdf_need(d, h);
	cairo_set_source_rgb(d->cr, 0, 0, 0);
	pdf_text(d, d->mx + indent, d->y, d->pw - 2 * d->mx - indent, font, text, 0, 1);
	d->y += h + 1.5;
}

/* Text line by line (a '\n' ends each), for the diff and the cautions. */
static void
lines(struct pdoc *d, const char *font, const char *text)
{
	struct buf b;

	buf_init(&b);
	for (const char *p = text; *p;) {
		const char *e = strchr(p, '\n');
		size_t len = e != NULL ? (size_t)(e - p) : strlen(p);

		buf_reset(&b);
		buf_addn(&b, p, len);
		if (len == 0)
			d->y += 4;
		else
			para(d, font, b.s, 0);
		p += len + (e != NULL);
	}
	buf_release(&b);
}

static void
foci_and_warnings(struct pdoc *d)
{
	const struct trace *t = d->rv->trace;
	int any = 0;

	for (size_t i = 0; i < t->nrows; i++) {
		const struct trace_row *r = &t->rows[i];
		char z[48], w1[48], w2[48], irr[48], *s;

		if (!r->has_focus)
			continue;
		if (!any)
			pdf_heading(d, "Foci in air");
		any = 1;
		units_format(z, sizeof z, r->focus.z, DIM_LENGTH, 4, 0);
		units_format(w1, sizeof w1, r->focus.wx, DIM_LENGTH, 3, 0);
		units_format(w2, sizeof w2, r->focus.wy, DIM_LENGTH, 3, 0);
		units_format(irr, sizeof irr, r->focus.peak_irradiance, DIM_IRRADIANCE, 3, 0);
		s = xasprintf("In %s at z = %s: radius %s x %s, peak %s%s", r->el->id, z, w1, w2,
		    irr, r->focus.air_breakdown ? " - AIR BREAKDOWN: a spark in air" : "");
		para(d, r->focus.air_breakdown ? PDF_SANS " Bold 7.5" : PDF_SANS " 7.5", s, 8);
		free(s);
	}
	if (t->nwarn > 0) {
		pdf_heading(d, "Warnings");
		for (size_t i = 0; i < t->nwarn; i++) {
			char *s = report_warning_text(t, &t->warn[i], 0);
			char *b = xasprintf("• %s", s);

			para(d, PDF_SANS " 7.5", b, 8);
			free(b);
			free(s);
		}
	}
}

/* Every point's worst element and its changes; the elements only points
 * put in (the base's come first in the survey). */
static void
points_section(struct pdoc *d)
{
	const struct point_survey *sv = d->rv->survey;

	if (sv == NULL)
		return;
	pdf_heading(d, "Operating points: each one's worst element");
	for (size_t i = 0; i < sv->n; i++) {
		const struct point_summary *ps = &sv->pt[i];
		const struct point *p = i > 0 ? point_list_find(&d->rv->bench->points, ps->name) :
		    NULL;
		char pct[32], v[48];
		struct buf b;

		layout_percent(pct, sizeof pct, ps->worst_id != NULL ? ps->worst_ratio : NAN);
		if (ps->worst_id == NULL || isnan(ps->safe_source_power))
			snprintf(v, sizeof v, "-");
		else if (isinf(ps->safe_source_power))
			snprintf(v, sizeof v, "no limit");
		else
			units_format(v, sizeof v, ps->safe_source_power, DIM_POWER, 3, 0);
		buf_init(&b);
		buf_printf(&b, "• %s: worst %s %s (%s); safe source power %s", ps->name,
		    ps->worst_id != NULL ? ps->worst_id : "none", pct,
		    layout_status_word(ps->status), v);
		if (i == 0)
			buf_add(&b, "; the bench as recorded");
		for (size_t j = 0; p != NULL && j < p->n; j++)
			buf_printf(&b, "%s%s", j ? "; " : "; changes ", p->change[j]);
		para(d, ps->status == STATUS_OVER ? PDF_SANS " Bold 7.5" : PDF_SANS " 7.5", b.s, 8);
		buf_release(&b);
	}
	for (size_t i = d->rv->trace->nrows, any = 0; i < sv->nel; i++) {
		char w[REVIEW_CELL], *s;

		if (!any++)
			para(d, PDF_SANS " 7.5", "Elements only operating points put in:", 0);
		review_survey_cell(sv, sv->el[i].id, w, sizeof w);
		s = xasprintf("• %s: %s%s", sv->el[i].id, strcmp(w, "-") == 0 ? "" : "worst ",
		    strcmp(w, "-") == 0 ? "unrated at every point that puts it in" : w);
		para(d, PDF_SANS " 7.5", s, 8);
		free(s);
	}
}

static void
changes(struct pdoc *d)
{
	const struct review *rv = d->rv;
	char *s, title[200];

	if (rv->changes == NULL) {
		pdf_heading(d, "Changes");
		para(d, PDF_SANS " 7.5", rv->no_changes_why != NULL ? rv->no_changes_why :
		    "No earlier setup to compare with.", 0);
		return;
	}
	snprintf(title, sizeof title, "Changes since %s and their effect on the margins",
	    rv->since);
	pdf_heading(d, title);
	if (rv->point != NULL || rv->survey != NULL)
		para(d, PDF_SANS " Oblique 7.5", "Between the two setups as recorded (their base "
		    "benches); the operating points' own changes are in the verdict and the "
		    "point list.", 0);
	s = report_diff_text(rv->changes, rv->bench->name, rv->since,
	    rv->base_setup != NULL ? rv->base_setup : rv->setup);
	lines(d, PDF_MONO " 6.3", s);
	free(s);
}

/* ---- the document ---- */

static void
document(struct pdoc *d)
{
	const struct trace *t = d->rv->trace;
	size_t *ends, nb = rep_branch_ends(t, &ends);

	pdf_new_page(d);
	title_block(d);
	verdict_and_signoff(d);
	pdf_heading(d, "The chain (from the source; side branches below their splitter)");
	pdf_status_legend(d);
	pdf_draw_schematic(d);
	for (size_t b = 0; b < nb; b++) {
		struct rep_profile p;
		double h;

		if (rep_profile_build(t, ends[b], 24, &p) != 0)
			continue;
		h = pdf_profile_height(d, &p, d->pw - 2 * d->mx);
		pdf_need(d, h + 8);
		d->y += 6;
		d->y += pdf_draw_profile(d, &p, d->mx, d->y, d->pw - 2 * d->mx, NULL);
		rep_profile_release(&p);
	}
	free(ends);
	element_table(d);
	points_section(d);
	foci_and_warnings(d);
	changes(d);
	pdf_heading(d, "Laser safety");
	lines(d, PDF_SANS " 7.5", report_safety_text);
	d->y += 10;
	para(d, PDF_SANS " 7.5", "Checked by: ______________________________    "
	    "Laser safety officer: ______________________________    Date: ______________", 0);
	cairo_show_page(d->cr);
}

static cairo_status_t
to_buf(void *closure, const unsigned char *data, unsigned int len)
{
	if (closure != NULL)
		buf_addn(closure, (const char *)data, len);
	return CAIRO_STATUS_SUCCESS;
}

static void
pdoc_init(struct pdoc *d, cairo_surface_t *surf, const struct review *rv, double pw, double ph)
{
	PangoContext *ctx;
	cairo_font_options_t *fo;

	memset(d, 0, sizeof *d);
	d->cr = cairo_create(surf);
	d->lay = pango_cairo_create_layout(d->cr);
	ctx = pango_layout_get_context(d->lay);
	pango_cairo_context_set_resolution(ctx, 72);    /* font sizes in points */
	fo = cairo_font_options_create();
	cairo_font_options_set_hint_metrics(fo, CAIRO_HINT_METRICS_OFF);
	cairo_font_options_set_hint_style(fo, CAIRO_HINT_STYLE_NONE);
	pango_cairo_context_set_font_options(ctx, fo);
	cairo_font_options_destroy(fo);
	pango_layout_context_changed(d->lay);
	d->rv = rv;
	d->pw = pw;
	d->ph = ph;
	d->mx = 40;
	d->top = 44;
	d->bottom = ph - 40;
	d->paged = 1;
}

static void
pdoc_release(struct pdoc *d)
{
	g_object_unref(d->lay);
	cairo_destroy(d->cr);
}

static int
pdf_pass(const struct review *rv, struct buf *out, int total, int *pages, char **cause)
{
	cairo_surface_t *surf = cairo_pdf_surface_create_for_stream(to_buf, out, 595.276, 841.89);
	cairo_status_t st;
	struct pdoc d;

	if (out != NULL) {
		char title[300];

		snprintf(title, sizeof title, "Review of bench %s, %s", rv->bench->name, rv->setup);
		cairo_pdf_surface_set_metadata(surf, CAIRO_PDF_METADATA_TITLE, title);
		cairo_pdf_surface_set_metadata(surf, CAIRO_PDF_METADATA_CREATOR, PACKAGE_STRING);
	}
	pdoc_init(&d, surf, rv, 595.276, 841.89);
	d.total = total;
	document(&d);
	*pages = d.page;
	st = cairo_status(d.cr);
	pdoc_release(&d);
	cairo_surface_finish(surf);
	if (st == CAIRO_STATUS_SUCCESS)
		st = cairo_surface_status(surf);
	cairo_surface_destroy(surf);
	if (st != CAIRO_STATUS_SUCCESS)
		return fail_with(cause, "drawing the PDF failed: %s", cairo_status_to_string(st));
	return 0;
}

unsigned char *
review_pdf(const struct review *rv, size_t *len, char **cause)
{
	struct buf out;
	int pages = 0, again;

	/* first to count the pages (discarding the bytes), then to keep */
	if (pdf_pass(rv, NULL, 0, &pages, cause) != 0)
		return NULL;
	buf_init(&out);
	if (pdf_pass(rv, &out, pages, &again, cause) != 0) {
		buf_release(&out);
		return NULL;
	}
	*len = out.len;
	return (unsigned char *)buf_take(&out);
}

/* ---- the profile plots alone, as SVG ---- */

unsigned char *
review_svg(const struct review *rv, size_t *len, char **cause)
{
	const struct trace *t = rv->trace;
	size_t *ends, nb = rep_branch_ends(t, &ends);
	struct rep_profile *p = xcalloc(nb + 1, sizeof *p);
	double w = 640, hsum = 20, *frame = xcalloc(4 * (nb + 1), sizeof *frame);
	struct buf out, desc;
	cairo_surface_t *surf;
	cairo_status_t st;
	struct pdoc d;
	char *gt;
	size_t np = 0;

	/* measure on a scratch surface, then draw at the size that holds all */
	surf = cairo_svg_surface_create_for_stream(to_buf, NULL, w, 100);
	pdoc_init(&d, surf, rv, w, 100);
	for (size_t b = 0; b < nb; b++)
		if (rep_profile_build(t, ends[b], 24, &p[np]) == 0)
			hsum += pdf_profile_height(&d, &p[np++], w - 20) + 16;
	pdoc_release(&d);
	cairo_surface_destroy(surf);
	free(ends);
	buf_init(&out);
	surf = cairo_svg_surface_create_for_stream(to_buf, &out, w, hsum);
	pdoc_init(&d, surf, rv, w, hsum);
	d.paged = 0;
	d.y = 10;
	buf_init(&desc);
	buf_printf(&desc, "beamledger profile plot of bench %s, %s.\n"
	    "1/e2 radius x: stroke rgb(0%%,0%%,80%%), solid; radius y: stroke rgb(85%%,33%%,0%%), "
	    "dashed; power: black.  Scales, per plot (SI units; frame in user units):\n",
	    rv->bench->name, rv->setup);
	for (size_t i = 0; i < np; i++) {
		double *f = &frame[4 * i];

		d.y += pdf_draw_profile(&d, &p[i], 10, d.y, w - 20, f) + 16;
		buf_printf(&desc, "plot %zu branch=%s x0=%.3f x1=%.3f ytop=%.3f ybottom=%.3f "
		    "z0=%.9g z1=%.9g r_top=%.9g\n", i + 1, p[i].branch, f[0], f[2], f[1], f[3],
		    p[i].z0, p[i].z1, p[i].rmax);
		rep_profile_release(&p[i]);
	}
	free(p);
	free(frame);
	st = cairo_status(d.cr);
	pdoc_release(&d);
	cairo_surface_finish(surf);
	if (st == CAIRO_STATUS_SUCCESS)
		st = cairo_surface_status(surf);
	cairo_surface_destroy(surf);
	if (st != CAIRO_STATUS_SUCCESS) {
		buf_release(&out);
		buf_release(&desc);
		fail_with(cause, "drawing the SVG failed: %s", cairo_status_to_string(st));
		return NULL;
	}
	/* a description for readers (and for checking the scale) after <svg ...> */
	gt = strstr(out.s, "<svg");
	gt = gt != NULL ? strchr(gt, '>') : NULL;
	if (gt != NULL) {
		struct buf fin;
		size_t at = (size_t)(gt - out.s) + 1;

		buf_init(&fin);
		buf_addn(&fin, out.s, at);
		buf_add(&fin, "\n<desc>");
		for (const char *c = desc.s; *c; c++)
			if (*c == '<')
				buf_add(&fin, "&lt;");
			else if (*c == '&')
				buf_add(&fin, "&amp;");
			else
				buf_addc(&fin, *c);
		buf_add(&fin, "</desc>");
		buf_addn(&fin, out.s + at, out.len - at);
		buf_release(&out);
		out = fin;
	}
	buf_release(&desc);
	*len = out.len;
	return (unsigned char *)buf_take(&out);
}
