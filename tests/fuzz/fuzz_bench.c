/* fuzz_bench.c - libFuzzer harness for the bench reader: any bytes are
 * parsed; what parses is dumped, the dump must parse again and dump to the
 * very same text, and the bench is traced and written in every report
 * format (table with and without colour and UTF-8, JSON, CSV, a diff
 * against itself) and laid out as the workbench would (chain rows, bars,
 * status line, values, the beam profile: the pure core-layout part).  Any crash, sanitizer report or broken round trip is a
 * finding, and so is the fast reader disagreeing with the tree reader, a
 * lean trace (TRACE_LEAN) rating anything otherwise than the full one, or
 * the row-by-row JSON of trace_stream differing from the whole trace's.
 * Built by ./configure --enable-fuzz; see DEVELOPERS.md. */
#include <config.h>

#include <math.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "bench-file.h"
#include "core-diff.h"
#include "core-layout.h"
#include "core-trace.h"
#include "report-diff.h"
#include "report.h"

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size);

static void
finding(const char *what, const char *detail, const char *text)
{
	fprintf(stderr, "fuzz_bench: %s\n%s\n--- text ---\n%s\n", what,
	    detail != NULL ? detail : "", text != NULL ? text : "");
	abort();
}

/* What the workbench computes before it draws anything. */
static void
layout(const struct bench *b, const struct trace *t)
{
	struct layout_row *rows = NULL;
	struct layout_plot plot;
	size_t n = layout_chain(b, t, &rows), *path = NULL, np;
	char buf[128];

	for (size_t i = 0; i < n; i++) {
		struct layout_field f[64];
		size_t nf = layout_fields(rows[i].el, f, 64);

		for (size_t j = 0; j < nf; j++)
			free(layout_field_value(rows[i].el, &f[j]));
	}
	free(rows);
	for (size_t i = 0; i < t->nrows; i++) {
		const struct trace_row *r = &t->rows[i];

		layout_bar(buf, sizeof buf, r->ratio, 1 / b->safety_factor, 20, (int)(i & 1));
		layout_percent(buf, sizeof buf, r->ratio);
		layout_radius_text(buf, sizeof buf, r->wx, r->wy, (int)(i & 1));
	}
	free(layout_margin_line(t, 0, 80, "saved 12:00"));
	free(layout_margin_line(t, 1, 40, NULL));
	if (t->nrows == 0)
		return;
	np = layout_profile_path(t, t->nrows - 1, &path);
	if (layout_profile(t, path, np, t->nrows - 1, 78, 10, 4, &plot) == 0)
		layout_plot_release(&plot);
	free(path);
}

static int
same(double a, double b)
{
	return a == b || (isnan(a) && isnan(b));
}

/* The lean trace rates as the full one does; the streamed JSON is the
 * whole main-beam trace's text. */
static void
variants(const struct bench *b, const struct trace *t)
{
	struct trace *lean = trace_rerun_opts(NULL, b, TRACE_LEAN), *whole, *st;
	struct report_json_stream *s;
	char *text, *got = NULL;
	size_t len = 0;
	FILE *f;

	if (lean->nwarn != t->nwarn || !same(lean->worst_ratio, t->worst_ratio) ||
	    !same(lean->safe_source_power, t->safe_source_power))
		finding("a lean trace's summary differs from the full trace's", b->name, NULL);
	for (size_t i = 0; i < t->nrows; i++)
		if (!same(lean->rows[i].ratio, t->rows[i].ratio) ||
		    lean->rows[i].status != t->rows[i].status)
			finding("a lean trace rates an element otherwise", t->rows[i].el->id, NULL);
	trace_free(lean);
	whole = trace_rerun_opts(NULL, b, TRACE_NO_GHOSTS);
	text = report_json(whole);
	if ((f = open_memstream(&got, &len)) == NULL)
		abort();
	s = report_json_stream_begin(b, f);
	st = trace_stream(NULL, b, report_json_stream_row, s);
	if (report_json_stream_end(s, st) != 0 || fclose(f) != 0)
		abort();
	if (len != strlen(text) || memcmp(got, text, len) != 0)
		finding("the streamed JSON differs from the whole trace's", b->name, text);
	if ((trace_check(st, NULL) != 0) != (trace_check(whole, NULL) != 0))
		finding("the streamed trace checks otherwise", b->name, NULL);
	free(got);
	free(text);
	trace_free(st);
	trace_free(whole);
}

static void
reports(const struct bench *b)
{
	struct trace *t = trace_run(b);
	struct report_opts o = { 0, 0, NULL };
	struct diff *d;
	char *text, *cause = NULL;

	if (trace_check(t, &cause) != 0) {
		if (cause == NULL || strstr(cause, "element '") == NULL)
			finding("trace_check failed without naming the element", cause, NULL);
		free(cause);
	}
	for (size_t i = 0; i < t->nrows; i++)
		if (damage_rated(&t->rows[i].limits) && !(t->rows[i].ratio >= 0))
			finding("a rated element has no ratio", t->rows[i].el->id, NULL);
	for (int color = 0; color < 2; color++)
		for (int ascii = 0; ascii < 2; ascii++) {
			o.color = color;
			o.ascii = ascii;
			free(report_table(t, &o));
		}
	free(report_json(t));
	free(report_csv(t));
	variants(b, t);
	layout(b, t);
	trace_free(t);
	d = diff_run(b, b);
	text = report_diff_text(d, b->name, "r1", "draft");
	free(text);
	free(report_diff_json(d, b->name, "r1", "draft"));
	diff_free(d);
}

/* The fast reader (bench-file-scan.c) takes only what the whole-tree
 * reader takes, and reads it to the same bench. */
static void
fast_vs_tree(const char *text, size_t size)
{
	size_t skip = size >= 3 && memcmp(text, "\xef\xbb\xbf", 3) == 0 ? 3 : 0;
	struct bench *f = bench_file_parse_fast(text + skip, size - skip), *t;
	char *cause = NULL, *a, *b;

	if (f == NULL)
		return;
	if ((t = bench_file_parse_tree(text, size, "fuzz.json", &cause)) == NULL)
		finding("the fast reader took what the tree reader refuses", cause, NULL);
	a = bench_file_dump(f);
	b = bench_file_dump(t);
	if (strcmp(a, b) != 0)
		finding("the fast and the tree reader read different benches", a, b);
	free(a);
	free(b);
	model_bench_free(f);
	model_bench_free(t);
}

int
LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
	char *cause = NULL, *one, *two;
	struct bench *b, *back;

	fast_vs_tree((const char *)data, size);
	b = bench_file_parse((const char *)data, size, "fuzz.json", &cause);
	if (b == NULL) {
		if (cause == NULL || strncmp(cause, "fuzz.json", 9) != 0)
			finding("refused without naming the file", cause, NULL);
		free(cause);
		return 0;
	}
	one = bench_file_dump(b);
	back = bench_file_parse(one, strlen(one), "dump", &cause);
	if (back == NULL)
		finding("the dump of a bench does not read back", cause, one);
	two = bench_file_dump(back);
	if (strcmp(one, two) != 0)
		finding("dump -> parse -> dump is not the same text", two, one);
	reports(back);
	free(one);
	free(two);
	model_bench_free(back);
	model_bench_free(b);
	return 0;
}
