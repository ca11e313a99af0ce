/* cmd-report.h - making the printed review of a setup and writing it to a
 * file, for `report` and for the workbench's history screen
 * (cmd-report-make.c; the drawing is report-pdf*.c and report-md.c). */
#ifndef CMD_REPORT_H
#define CMD_REPORT_H

#include "report-review.h"
#include "store.h"

/* Output formats: 1 PDF, 2 SVG (the profile plots), 3 Markdown; 0 none. */
int         cmd_report_format_word(const char *);   /* "pdf", "svg", "md"; else 0 */
const char *cmd_report_ext(int fmt);                 /* "pdf", "svg", "md" */
/* The format for path: from --format `given` (may be NULL) or the
 * extension; "-" is Markdown.  Returns it, or -1 with *cause (an unknown
 * extension, or one that disagrees with --format). */
int         cmd_report_format_of(const char *path, const char *given, char **cause);
/* Writes the review in that format to path ("-": standard output) through
 * a temporary file and rename; nothing is left behind on failure.  A path
 * in a folder that does not exist is refused with words that say so. */
int         cmd_report_write(const struct review *, const char *path, int fmt, char **cause);

/* What a review is made of: a bench, where it came from, and the setup
 * before it. */
struct review_src;
/* Setup `rev` of bench `name` ("3", "#3", "rN", a name; NULL: the draft),
 * with the setup before it (the latest one for the draft) or `since`. */
struct review_src *review_src_record(struct store *, const char *name, const char *rev,
                       const char *since, char **cause);         /* caller frees */
/* A bench file (or, demo != 0, the built-in demo bench). */
struct review_src *review_src_file(const char *path, int demo, char **cause); /* caller frees */
void        review_src_free(struct review_src *);   /* NULL ok */
/* Review one operating point (name, copied) or, every != 0, the base and
 * every point; the stem and the setup's words follow. */
void        review_src_points(struct review_src *, const char *point, int every);
/* "table3-ablation-setup-2": a file name without extension. */
const char *review_src_stem(const struct review_src *);
/* "setup #2", "the draft", "a bench file" (", point full"). */
const char *review_src_setup(const struct review_src *);
/* Traces, compares, hashes and writes the review. */
int         review_src_write(const struct review_src *, const char *path, int fmt,
                char **cause);

#endif
