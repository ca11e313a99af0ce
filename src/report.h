/* report.h - a finished trace written out for people (table), scripts
 * (JSON, the fields of bench-format.md) and spreadsheets (CSV).  Pure
 * formatting into strings; the caller prints. */
#ifndef REPORT_H
#define REPORT_H

#include <stdio.h>

#include "core-trace.h"

enum report_format { REPORT_TABLE, REPORT_JSON, REPORT_CSV };

struct report_opts {
	int color;                  /* ANSI colour as an extra, never alone */
	int ascii;                  /* no UTF-8 symbols */
	const char *origin;         /* borrowed, may be NULL: "draft", "r3" (from the database) */
	unsigned trace_opts;        /* TRACE_NO_GHOSTS: the main beam only */
};

int   report_format_parse(const char *s, enum report_format *out);   /* 0 / -1 */
char *report_table(const struct trace *, const struct report_opts *); /* caller frees */
char *report_json(const struct trace *);                              /* caller frees */
/* The same text written to f in pieces of about 64 kB as it is made; 0, or
 * -1 when a write failed (errno set; what came before it was written). */
int   report_json_write(const struct trace *, FILE *f);
/* The same bytes, written as trace_stream makes the rows (a long chain's
 * rows are never all held): begin, then report_json_stream_row as the
 * trace_stream callback, then end with that trace (which frees the
 * stream; -1 when a write failed, errno says why). */
struct report_json_stream;
struct report_json_stream *report_json_stream_begin(const struct bench *, FILE *f);
void  report_json_stream_row(void *stream, const struct trace *, const struct trace_row *);
int   report_json_stream_end(struct report_json_stream *, const struct trace *);
char *report_csv(const struct trace *);                               /* caller frees */

/* Shared by the table and the workbench: the source in one line
 * ("1064 nm, pulsed 10 Hz 8 ns gaussian, 200 mJ (2.00 W average), ..."). */
char *report_source_line(const struct bench *, int ascii);            /* caller frees */
/* Flags as "clipping, focus" into buf. */
void  report_flags(unsigned flags, char *buf, size_t n, const char *sep);
/* A warning in one line ("beam leaves the bench after S4r (POL1.rejected): 1.23 mW"). */
char *report_warning_text(const struct trace *, const struct trace_warning *, int ascii); /* caller frees */
/* `trace --explain ID`: the derivation of element id's limit in full, from
 * its rating as given to the ratio.  NULL with *cause for an unknown id, free
 * space or an unrated element (naming the keys that would rate it). */
char *report_explain(const struct trace *, const char *id, int ascii, char **cause); /* caller frees */
/* The cautions shown by --help, the man page and the workbench help. */
extern const char report_safety_text[];

#endif
