/* report-diff.h - a diff of two bench states (core-diff.h) written out for
 * people and for scripts.  Pure formatting into strings; the caller
 * prints.  from/to name the two sides ("r2", "draft"). */
#ifndef REPORT_DIFF_H
#define REPORT_DIFF_H

#include "core-diff.h"

/* The chain changes, one per line, then the effect on the results as a
 * table ("W1  window  ...  62.0 % caution → 131 % over"), the worst
 * element and the safe source power on both sides. */
char *report_diff_text(const struct diff *, const char *bench, const char *from,
          const char *to);                                 /* caller frees */
/* One JSON object: bench, from, to, changes, effects, worst,
 * safe_source_power (SI numbers, null where a value does not apply). */
char *report_diff_json(const struct diff *, const char *bench, const char *from,
          const char *to);                                 /* caller frees */
/* "62.0 % caution", "131 % over", "unrated", or "absent" into buf. */
void  report_diff_status(char *buf, size_t n, int present, double ratio,
          enum damage_status);

#endif
