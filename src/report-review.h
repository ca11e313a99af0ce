/* report-review.h - the printed review of one bench setup: the facts it
 * shows (gathered by cmd-report.c from the record or a file) and the three
 * ways of writing it: a PDF (report-pdf*.c, cairo and pango), the profile
 * plot alone as SVG, and the whole review as Markdown (report-md.c). */
#ifndef REPORT_REVIEW_H
#define REPORT_REVIEW_H

#include <stddef.h>

#include "core-diff.h"
#include "core-point.h"
#include "core-trace.h"

struct review {
	const struct bench *bench;      /* borrowed */
	const struct trace *trace;      /* borrowed, of bench */
	const char *setup;              /* borrowed: "setup #3", "draft", "file";
	                                 * "setup #3, point full" */
	const char *setup_names;        /* borrowed, may be NULL: "aligned, before-upgrade" */
	const char *time;               /* borrowed, may be NULL: UTC when recorded */
	const char *author;             /* borrowed, may be NULL */
	const char *note;               /* borrowed, may be NULL */
	const char *origin;             /* borrowed: "database /path/benches.db" or "file x.json" */
	const char *hash;               /* borrowed: SHA-256 hex of the bench file text */
	const char *printed;            /* borrowed: UTC time the review was made */
	const struct diff *changes;     /* borrowed, may be NULL: no earlier setup */
	const char *since;              /* borrowed: "setup #2" (changes' old side) */
	const char *no_changes_why;     /* borrowed, may be NULL: why there is no comparison */
	/* Operating points (all zero: the base alone, as before points).
	 * With `point`, bench and trace are that point's (the setup with
	 * the point applied); with `survey`, the base's, and the survey
	 * gives every element's worst over the base and every point. */
	const char *point;              /* borrowed, may be NULL: the point shown */
	const struct point *point_def;  /* borrowed, with point: its changes */
	const struct point_survey *survey; /* borrowed, may be NULL: every point */
	size_t npoints;                 /* the setup's operating points, besides the base */
	const char *base_setup;         /* borrowed, may be NULL (then setup): "setup #3"
	                                 * without the point's words, for the changes */
};

/* The survey's slot of element id (NULL: not in the survey). */
const struct point_worst *review_survey_worst(const struct point_survey *, const char *id);
/* "130 % at full" for an element's worst over every point; "-" unrated. */
void  review_survey_cell(const struct point_survey *, const char *id, char *buf, size_t n);
/* The verdict's lines for every point: the worst element anywhere and at
 * which point; the elements over or at caution at some point, worst
 * first (at most `max`, then "and N more"); NULL without a survey. */
char *review_survey_worst_text(const struct review *);       /* caller frees */
char *review_survey_list_text(const struct review *, size_t max); /* caller frees */

/* Counts the verdict box shows. */
struct review_counts {
	size_t over, caution, ok, unrated;
	size_t unterminated, air_breakdown;
	size_t points;                  /* operating points, besides the base */
	size_t points_over;             /* with a survey: points with something over */
};
void  review_count(const struct trace *, struct review_counts *);
/* The same with the review's operating points counted too. */
void  review_count_all(const struct review *, struct review_counts *);
/* "Operating points: 3 besides the base; over at 1 of the 4 traced" or
 * "Operating point: full (one of 3)" or "Operating points: none". */
char *review_points_text(const struct review *);             /* caller frees */

/* The element table as `trace` shows it, one cell text per column:
 * element, type, z, power, radius x/y, peak irradiance, fluence (pulsed)
 * or linear density (CW), ratio, status, flags. */
enum { REVIEW_NCOLS = 10, REVIEW_CELL = 160 };
const char *review_col_name(const struct trace *, int col);
void  review_row_cells(const struct trace *, const struct trace_row *,
          char cells[REVIEW_NCOLS][REVIEW_CELL]);
/* The verdict's lines ("Worst element: W1, 109 % of its threshold (OVER)"),
 * shared by the PDF and the Markdown. */
char *review_worst_text(const struct trace *);                /* caller frees */
char *review_safe_text(const struct trace *);                 /* caller frees */
/* Every kind of warning the trace gives, counted, then the notes:
 * "Warnings: 1 spark, 1 unterminated beam, 1 unrated absorber; notes: 2
 * above critical power".  A kind added to the trace later is counted under
 * its own name. */
char *review_warnings_text(const struct trace *);             /* caller frees */
/* review_worst_text of the review's trace, "..., at the base" with a survey. */
char *review_worst_text_of(const struct review *);            /* caller frees */

/* Writers: the document into memory.  Return NULL with *cause on failure. */
char *review_markdown(const struct review *);                 /* caller frees */
/* PDF or SVG bytes; *len gets the length.  In the print module
 * (report-print.h): the program reaches them through report_print_load,
 * the unit tests and benches link src/libreport.a. */
unsigned char *review_pdf(const struct review *, size_t *len, char **cause);   /* caller frees */
unsigned char *review_svg(const struct review *, size_t *len, char **cause);   /* caller frees */

#endif
