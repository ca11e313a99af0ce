/* report-review.h - the printed review of one bench setup: the facts it
 * shows (gathered by cmd-report.c from the record or a file) and the three
 * ways of writing it: a PDF (report-pdf*.c, cairo and pango), the profile
 * plot alone as SVG, and the whole review as Markdown (report-md.c). */
#ifndef REPORT_REVIEW_H
#define REPORT_REVIEW_H

#include <stddef.h>

#include "core-diff.h"
#include "core-trace.h"

struct review {
	const struct bench *bench;      /* borrowed */
	const struct trace *trace;      /* borrowed, of bench */
	const char *setup;              /* borrowed: "setup #3", "draft", "file" */
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
};

/* Counts the verdict box shows. */
struct review_counts {
	size_t over, caution, ok, unrated;
	size_t unterminated, air_breakdown;
};
void  review_count(const struct trace *, struct review_counts *);

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

/* Writers: the document into memory.  Return NULL with *cause on failure. */
char *review_markdown(const struct review *);                 /* caller frees */
/* PDF or SVG bytes; *len gets the length. */
unsigned char *review_pdf(const struct review *, size_t *len, char **cause);   /* caller frees */
unsigned char *review_svg(const struct review *, size_t *len, char **cause);   /* caller frees */

#endif
