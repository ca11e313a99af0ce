/* report-pdf.h - what report-pdf.c (pages, text, tables) and
 * report-pdf-draw.c (the profile plot and the chain schematic) share: one
 * drawing context over a cairo surface with pango text.  Private to those
 * two files. */
#ifndef REPORT_PDF_H
#define REPORT_PDF_H

#include <cairo.h>
#include <pango/pangocairo.h>

#include "core-report.h"
#include "report-review.h"

#define PDF_SANS "DejaVu Sans"
#define PDF_MONO "DejaVu Sans Mono"

struct pdoc {
	cairo_t            *cr;         /* borrowed */
	PangoLayout        *lay;        /* owned */
	const struct review *rv;        /* borrowed */
	double              pw, ph;     /* page size, pt */
	double              mx, top, bottom; /* margins: side, first and last usable y */
	double              y;          /* next free y on the page */
	int                 page;       /* 1-based, 0 before the first */
	int                 total;      /* page count for "page N of M"; 0: unknown */
	int                 paged;      /* 1: a PDF (new pages, headers); 0: one SVG */
	int                 one_line;   /* pdf_text cuts with "…" instead of wrapping */
};

/* Text at (x, y) in a box w wide (w <= 0: no wrap), font "DejaVu Sans 9",
 * align 0 left, 1 centre, 2 right; returns its height.  draw 0 measures. */
double pdf_text(struct pdoc *, double x, double y, double w, const char *font,
           const char *text, int align, int draw);
double pdf_text_width(struct pdoc *, const char *font, const char *text);
/* Ends the current page and starts another (header and footer drawn). */
void   pdf_new_page(struct pdoc *);
/* Makes room for h points: a new page when the rest of this one is less. */
void   pdf_need(struct pdoc *, double h);
void   pdf_heading(struct pdoc *, const char *title);

/* The status look, for the schematic and the table: fill colour and the
 * hatching that tells it in black and white. */
void   pdf_status_tile(cairo_t *, double x, double y, double w, double h,
           enum damage_status);
/* Height the profile plot of p takes at width w. */
double pdf_profile_height(struct pdoc *, const struct rep_profile *, double w);
/* Draws it with its top-left corner at (x, y); returns the height.  The
 * frame of the radius panel goes to frame[4] (x0, y0, x1, y1) when not NULL. */
double pdf_draw_profile(struct pdoc *, const struct rep_profile *, double x, double y,
           double w, double *frame);
/* Draws the schematic strips from the page's current y on, breaking pages
 * between strips. */
void   pdf_draw_schematic(struct pdoc *);
/* A legend line of the status tiles at the current y. */
void   pdf_status_legend(struct pdoc *);

/* Colours of the two radius curves (also named in the SVG's description). */
#define PDF_WX_RGB 0.0, 0.0, 0.8
#define PDF_WY_RGB 0.85, 0.33, 0.0

#endif
