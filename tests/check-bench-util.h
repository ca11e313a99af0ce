/* check-bench-util.h - helpers for the Check suites that parse and trace
 * benches: inline bench text, the demo bench, a trace's rows and warnings. */
#ifndef CHECK_BENCH_UTIL_H
#define CHECK_BENCH_UTIL_H

#include <check.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdio.h>
#include <string.h>

#include "bench-demo.h"
#include "bench-file.h"
#include "core-trace.h"

/* Bench files are written in the suites with ' for " to keep them
 * readable; this puts the " back, in place. */
static inline void
bench_quote(char *text)
{
	for (char *p = text; *p != '\0'; p++)
		if (*p == '\'')
			*p = '"';
}

/* A printf-style bench file written with ' for ", parsed under the file
 * name `label`; it must parse (caller frees). */
static inline struct bench *
bench_text(const char *label, const char *fmt, ...)
    __attribute__((format(printf, 2, 3)));

static inline struct bench *
bench_text(const char *label, const char *fmt, ...)
{
	char text[8192], *cause = NULL;
	struct bench *b;
	va_list ap;
	int n;

	va_start(ap, fmt);
	n = vsnprintf(text, sizeof text, fmt, ap);
	va_end(ap);
	ck_assert(n > 0 && (size_t)n < sizeof text);
	bench_quote(text);
	b = bench_file_parse(text, strlen(text), label, &cause);
	ck_assert_msg(b != NULL, "bench did not parse: %s\n%s", cause, text);
	return b;
}

/* The demo bench, parsed; it must parse (caller frees). */
static inline struct bench *
demo(void)
{
	char *cause = NULL;
	struct bench *b = bench_file_parse(bench_demo_text, strlen(bench_demo_text),
	    "demo", &cause);

	ck_assert_msg(b != NULL, "%s", cause);
	return b;
}

/* The row of element `id`; there must be one (borrowed). */
static inline const struct trace_row *
row_of(const struct trace *t, const char *id)
{
	for (size_t i = 0; i < t->nrows; i++)
		if (strcmp(t->rows[i].el->id, id) == 0)
			return &t->rows[i];
	ck_abort_msg("no row for element '%s'", id);
	return NULL;
}

/* How many warnings of kind k the trace gave. */
static inline size_t
count_warn(const struct trace *t, enum trace_warn_kind k)
{
	size_t n = 0;

	for (size_t i = 0; i < t->nwarn; i++)
		n += t->warn[i].kind == k;
	return n;
}

#endif /* CHECK_BENCH_UTIL_H */
