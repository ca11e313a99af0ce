/* cmd-report.h - writing the printed review to a file, for `report` and
 * for the workbench's history screen. */
#ifndef CMD_REPORT_H
#define CMD_REPORT_H

#include "report-review.h"

/* The output format for path: from --format `given` (may be NULL) or the
 * extension (.pdf, .svg, .md; "-" is Markdown).  Returns 1 PDF, 2 SVG,
 * 3 Markdown, or -1 with *cause (unknown extension, disagreement). */
int cmd_report_format_of(const char *path, const char *given, char **cause);
/* Writes the review in that format to path ("-": standard output) through
 * a temporary file and rename; nothing is left behind on failure. */
int cmd_report_write(const struct review *, const char *path, int fmt, char **cause);

#endif
