/* cmd-trace.c - `beamledger trace` and `beamledger demo`: read a bench,
 * trace it, print the report; nothing reaches stdout unless the whole trace
 * succeeded. */
#include <config.h>

#include <getopt.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <errno.h>
#include <sys/stat.h>

#include "bench-demo.h"
#include "bench-file.h"
#include "cmd.h"
#include "cmd-store.h"
#include "core-layout.h"
#include "core-point.h"
#include "core-trace.h"
#include "report.h"
#include "util-buf.h"
#include "util-err.h"
#include "util-json.h"

/* Prints the report of one bench; returns the trace's exit status. */
int cmd_trace_print(const struct bench *, enum report_format, const struct report_opts *);

static void
note_over(void *arg, const struct trace *t, const struct trace_row *r)
{
	(void)t;
	if (r->status == STATUS_OVER)
		*(int *)arg = 1;
}

/* The main beam's JSON without holding its rows (a 10^5-element chain's
 * are 38 MB): a first pass checks, so that nothing is printed for a trace
 * that fails, and a second writes each row as it is made. */
static int
print_json_streamed(const struct bench *b)
{
	struct report_json_stream *s;
	struct trace *t;
	char *cause = NULL;
	int over = 0, rc = 0;

	t = trace_stream(NULL, b, note_over, &over);
	if (trace_check(t, &cause) != 0) {
		cause_prefix(&cause, "bench '%s'", b->name);
		trace_free(t);
		return cmd_fail(cause);
	}
	s = report_json_stream_begin(b, stdout);
	t = trace_stream(t, b, report_json_stream_row, s);
	if (report_json_stream_end(s, t) != 0 || fflush(stdout) == EOF) {
		perror(PROG ": standard output");
		rc = 2;
	}
	trace_free(t);
	return rc != 0 ? rc : over;
}

int
cmd_trace_print(const struct bench *b, enum report_format fmt,
    const struct report_opts *o)
{
	struct trace *t;
	char *text, *cause = NULL;
	int rc, over = 0;

	if (fmt == REPORT_JSON && (o->trace_opts & TRACE_NO_GHOSTS))
		return print_json_streamed(b);
	t = trace_rerun_opts(NULL, b, o->trace_opts |
	    (fmt == REPORT_JSON || fmt == REPORT_CSV ? TRACE_GHOST_ROWS : 0));

	if (trace_check(t, &cause) != 0) {
		cause_prefix(&cause, "bench '%s'", b->name);
		trace_free(t);
		return cmd_fail(cause);
	}
	for (size_t i = 0; i < t->nrows; i++)
		if (t->rows[i].status == STATUS_OVER)
			over = 1;
	if (fmt == REPORT_JSON) {
		/* straight to stdout: the text of a long chain is many times
		 * the size of its trace */
		rc = 0;
		if (report_json_write(t, stdout) != 0 || fflush(stdout) == EOF) {
			perror(PROG ": standard output");
			rc = 2;
		}
		trace_free(t);
		return rc != 0 ? rc : over;
	}
	text = fmt == REPORT_CSV ? report_csv(t) : report_table(t, o);
	rc = cmd_print(text);
	free(text);
	trace_free(t);
	return rc != 0 ? rc : over;
}

/* An operand that is not a file: BENCH[@SETUP] in the database, which must
 * exist already (a mistyped file name should not create one). */
static struct bench *
load_from_db(struct cmd_ctx *ctx, const char *arg, char **shown, char **cause)
{
	char *path = ctx->db_path != NULL && ctx->db_path[0] != '\0' ?
	    xstrdup(ctx->db_path) : store_default_path();
	struct stat sb;
	struct store *s;
	struct bench *b;
	char *name = NULL;

	if (stat(path, &sb) != 0) {
		fail_with(cause, "no file '%s', and no bench database at '%s'", arg, path);
		free(path);
		return NULL;
	}
	free(path);
	if ((s = cmd_store_open(ctx)) == NULL)
		return NULL;
	b = cmd_bench_load(s, arg, &name, shown, cause);
	if (b == NULL && cause != NULL && *cause != NULL) {
		char *why = xasprintf("no file '%s', and %s", arg, *cause);

		free(*cause);
		*cause = why;
	}
	free(name);
	store_close(s);
	return b;
}

struct bench *
cmd_bench_open(struct cmd_ctx *ctx, const char *arg, char **origin, char **cause)
{
	struct stat sb;

	*origin = NULL;
	if (strcmp(arg, "-") == 0 || stat(arg, &sb) == 0 || errno != ENOENT)
		return bench_file_read(arg, cause);
	return load_from_db(ctx, arg, origin, cause);
}

struct bench *
cmd_bench_at_point(struct cmd_ctx *ctx, int demo, const char *arg, const char *point,
    char **cause)
{
	struct bench *b, *w;
	char *origin = NULL;
	const struct point *p;

	*cause = NULL;
	if (demo)
		b = bench_file_parse(bench_demo_text, strlen(bench_demo_text), "demo", cause);
	else
		b = cmd_bench_open(ctx, arg, &origin, cause);
	free(origin);
	if (b == NULL || point == NULL) {
		if (b != NULL)
			point_list_release(&b->points);
		return b;
	}
	if ((p = point_list_find(&b->points, point)) == NULL) {
		fail_with(cause, "no point '%s' in bench '%s'%s", point, b->name,
		    b->points.n == 0 ? " (it has no points)" : "");
		model_bench_free(b);
		return NULL;
	}
	w = point_apply(b, p, cause);
	model_bench_free(b);
	return w;
}

/* Every point's worst element, and per element its worst over all points,
 * as text after the base's table. */
static void
points_table(struct buf *out, const struct point_survey *sv)
{
	char r[32];

	buf_printf(out, "\nOperating points (%zu besides the base):\n", sv->n - 1);
	buf_printf(out, "  %-16s %-12s %8s  %s\n", "point", "worst", "ratio", "status");
	for (size_t i = 0; i < sv->n; i++) {
		const struct point_summary *p = &sv->pt[i];

		layout_percent(r, sizeof r, p->worst_ratio);
		buf_printf(out, "  %-16s %-12s %8s  %s\n", p->name,
		    p->worst_id != NULL ? p->worst_id : "-", p->worst_id != NULL ? r : "-",
		    layout_status_word(p->status));
	}
	buf_printf(out, "\nWorst over all points, per rated element:\n");
	buf_printf(out, "  %-12s %8s  %-8s %s\n", "element", "ratio", "status", "at point");
	for (size_t i = 0; i < sv->nel; i++) {
		const struct point_worst *e = &sv->el[i];

		if (isnan(e->ratio))
			continue;
		layout_percent(r, sizeof r, e->ratio);
		buf_printf(out, "  %-12s %8s  %-8s %s%s\n", e->id, r,
		    layout_status_word(e->status),
		    sv->pt[e->at].name, e->present < sv->n ? " (not in every point)" : "");
	}
}

static void
points_json(struct buf *out, const struct point_survey *sv, const struct bench *b)
{
	buf_add(out, "  \"points\": [\n");
	for (size_t i = 0; i < sv->n; i++) {
		const struct point_summary *ps = &sv->pt[i];
		const struct point *p = i > 0 ? point_list_find(&b->points, ps->name) : NULL;

		buf_add(out, "    {\"name\": ");
		json_put_string(out, ps->name);
		buf_add(out, ", \"changes\": [");
		for (size_t j = 0; p != NULL && j < p->n; j++) {
			buf_add(out, j ? ", " : "");
			json_put_string(out, p->change[j]);
		}
		buf_add(out, "], \"worst\": ");
		if (ps->worst_id != NULL) {
			buf_add(out, "{\"id\": ");
			json_put_string(out, ps->worst_id);
			buf_add(out, ", \"ratio\": ");
			json_put_number(out, ps->worst_ratio);
			buf_add(out, "}");
		} else {
			buf_add(out, "null");
		}
		buf_printf(out, ", \"status\": \"%s\", \"safe_source_power\": ",
		    damage_status_name(ps->status));
		json_put_number(out, ps->safe_source_power);
		buf_printf(out, "}%s\n", i + 1 < sv->n ? "," : "");
	}
	buf_add(out, "  ],\n  \"worst_by_element\": [\n");
	for (size_t i = 0, first = 1; i < sv->nel; i++) {
		const struct point_worst *e = &sv->el[i];

		if (isnan(e->ratio))
			continue;
		buf_add(out, first ? "    {\"id\": " : ",\n    {\"id\": ");
		json_put_string(out, e->id);
		buf_add(out, ", \"ratio\": ");
		json_put_number(out, e->ratio);
		buf_printf(out, ", \"status\": \"%s\", \"point\": ", damage_status_name(e->status));
		json_put_string(out, sv->pt[e->at].name);
		buf_add(out, "}");
		first = 0;
	}
	buf_add(out, "\n  ]\n");
}

/* trace --point NAME / --every-point: the report of one point, or of the
 * base followed by every point's summary. */
static int
trace_points(const struct bench *b, const char *only, enum report_format fmt,
    struct report_opts *ro)
{
	struct point_survey sv;
	struct buf out;
	char *cause = NULL, *text, *origin = NULL;
	int rc;
	const struct trace *shown;

	if (point_survey_run_opts(b, only, (ro->trace_opts & TRACE_NO_GHOSTS) |
	    (fmt == REPORT_JSON || fmt == REPORT_CSV ? TRACE_GHOST_ROWS : 0), &sv, &cause) != 0)
		return cmd_fail(cause);
	if (only != NULL) {
		origin = ro->origin != NULL ? xasprintf("%s, point %s", ro->origin, only) :
		    xasprintf("point %s", only);
		ro->origin = origin;
	}
	shown = only != NULL ? sv.last_trace : sv.base_trace;
	text = fmt == REPORT_JSON ? report_json(shown) :
	    fmt == REPORT_CSV ? report_csv(shown) : report_table(shown, ro);
	buf_init(&out);
	if (fmt == REPORT_JSON) {
		char *end = strrchr(text, '}');

		buf_addn(&out, text, (size_t)(end - text));
		while (out.len > 0 && (out.s[out.len - 1] == '\n' || out.s[out.len - 1] == ' '))
			out.len--;
		out.s[out.len] = '\0';
		buf_add(&out, ",\n");
		if (only != NULL) {
			buf_add(&out, "  \"point\": ");
			json_put_string(&out, only);
			buf_add(&out, "\n}\n");
		} else {
			points_json(&out, &sv, b);
			buf_add(&out, "}\n");
		}
	} else {
		buf_add(&out, text);
		if (only == NULL && fmt == REPORT_TABLE)
			points_table(&out, &sv);
	}
	free(text);
	rc = cmd_print(out.s);
	buf_release(&out);
	rc = rc != 0 ? rc : only != NULL ? sv.pt[1].status == STATUS_OVER : sv.any_over;
	point_survey_release(&sv);
	free(origin);
	return rc;
}

/* trace --explain ID [--point NAME]: 0, 1 when that element is over, 2
 * for an unknown id or an element without a rating. */
static int
trace_explain(const struct bench *b, const char *point, const char *id, int ascii)
{
	struct point_survey sv;
	const struct trace *t;
	struct trace *own = NULL;
	char *cause = NULL, *text;
	int rc;

	if (point != NULL) {
		if (point_survey_run(b, point, &sv, &cause) != 0)
			return cmd_fail(cause);
		t = sv.last_trace;
	} else {
		t = own = trace_run(b);
	}
	if ((text = report_explain(t, id, ascii, &cause)) == NULL) {
		rc = cmd_fail(cause);
	} else {
		const struct trace_row *r = NULL;

		for (size_t i = 0; i < t->nrows && r == NULL; i++)
			if (strcmp(t->rows[i].el->id, id) == 0)
				r = &t->rows[i];
		rc = cmd_print(text);
		if (rc == 0 && r != NULL && r->status == STATUS_OVER)
			rc = 1;
		free(text);
	}
	trace_free(own);
	if (point != NULL)
		point_survey_release(&sv);
	return rc;
}

int
cmd_trace(struct cmd_ctx *ctx, int argc, char **argv)
{
	static const struct option opts[] = {
		{ "format", required_argument, NULL, 'f' },
		{ "color", required_argument, NULL, 'c' },
		{ "colour", required_argument, NULL, 'c' },
		{ "ascii", no_argument, NULL, 'a' },
		{ "demo", no_argument, NULL, 'd' },
		{ "point", required_argument, NULL, 'p' },
		{ "every-point", no_argument, NULL, 'e' },
		{ "explain", required_argument, NULL, 'x' },
		{ "no-ghosts", no_argument, NULL, 'g' },
		{ "help", no_argument, NULL, 'h' },
		{ NULL, 0, NULL, 0 },
	};
	enum report_format fmt = REPORT_TABLE;
	struct report_opts ro = { 0, 0, NULL, 0 };
	const char *color = "auto";
	struct bench *b;
	char *cause = NULL, *origin = NULL;
	const char *point = NULL, *explain = NULL;
	int demo = 0, every = 0, ch, rc;

	optind = 0;
	opterr = 0;
	while ((ch = getopt_long(argc, argv, "f:", opts, NULL)) != -1) {
		switch (ch) {
		case 'f':
			if (report_format_parse(optarg, &fmt) != 0)
				return cmd_usage("trace: --format must be table, json or csv, "
				    "not '%s'", optarg);
			break;
		case 'c':
			if (strcmp(optarg, "always") && strcmp(optarg, "never") &&
			    strcmp(optarg, "auto"))
				return cmd_usage("trace: --color must be always, never or auto");
			color = optarg;
			break;
		case 'a':
			ro.ascii = 1;
			break;
		case 'd':
			demo = 1;
			break;
		case 'p':
			point = optarg;
			break;
		case 'e':
			every = 1;
			break;
		case 'x':
			explain = optarg;
			break;
		case 'g':
			ro.trace_opts |= TRACE_NO_GHOSTS;
			break;
		case 'h':
			printf("Usage: " PROG " trace FILE | BENCH[@SETUP] | --demo"
			    " [--format table|json|csv] [--color WHEN] [--ascii]\n"
			    "       [--point NAME | --every-point] [--explain ID] [--no-ghosts]\n"
			    "An operand that is not a file names a bench in the database: its\n"
			    "draft, or with @SETUP a recorded setup (a number, 2 or #2, or a name).\n"
			    "--point NAME traces that operating point; --every-point traces the base\n"
			    "and every point and gives each element's worst ratio and where.\n"
			    "--explain ID writes how element ID's limit comes from its rating: the\n"
			    "rating as given, the wavelength and pulse-width factors and their rules,\n"
			    "the limit, the caution level, the beam's value there and the ratio\n"
			    "(with --point NAME, at that point).\n"
			    "--no-ghosts traces the main beam alone: no surface reflections.\n"
			    "Exit status: 0 nothing over its threshold (at any point traced),\n"
			    "1 something over, 2 trouble.\n");
			return 0;
		default:
			return cmd_usage("trace: unknown option '%s'", argv[optind - 1]);
		}
	}
	if (demo == (optind < argc))
		return cmd_usage(demo ? "trace: give a file or --demo, not both" :
		    "trace: which bench? give a file, a bench in the database, or --demo");
	if (optind + 1 < argc)
		return cmd_usage("trace: one bench at a time ('%s' is extra%s)", argv[optind + 1],
		    (argv[optind + 1][0] >= '0' && argv[optind + 1][0] <= '9') ||
		    argv[optind + 1][0] == '#' || strcmp(argv[optind + 1], "draft") == 0 ?
		    "; for a setup write BENCH@SETUP" : "");
	if (point != NULL && every)
		return cmd_usage("trace: give --point NAME or --every-point, not both");
	if (explain != NULL && (every || fmt != REPORT_TABLE))
		return cmd_usage("trace: --explain ID writes text for one bench or one point "
		    "(not with --every-point or --format)");
	ro.color = cmd_color(color);
	if (demo) {
		b = bench_file_parse(bench_demo_text, strlen(bench_demo_text), "demo", &cause);
	} else {
		struct stat sb;

		if (strcmp(argv[optind], "-") == 0 || stat(argv[optind], &sb) == 0 ||
		    errno != ENOENT)
			b = bench_file_read(argv[optind], &cause);
		else if ((b = load_from_db(ctx, argv[optind], &origin, &cause)) == NULL &&
		    cause == NULL)
			return 2;           /* the database said why already */
	}
	if (b == NULL)
		return cmd_fail(cause);
	ro.origin = origin;
	if (explain != NULL)
		rc = trace_explain(b, point, explain, ro.ascii);
	else if (point != NULL || every)
		rc = trace_points(b, point, fmt, &ro);
	else
		rc = cmd_trace_print(b, fmt, &ro);
	model_bench_free(b);
	free(origin);
	return rc;
}

int
cmd_demo(struct cmd_ctx *ctx, int argc, char **argv)
{
	(void)ctx;
	if (argc == 2 && (strcmp(argv[1], "--help") == 0 || strcmp(argv[1], "-h") == 0))
		return printf("Usage: " PROG " demo\n"
		    "Prints the built-in demo bench (invented data: table 3 of our own lab) as "
		    "a bench file;\n" PROG " import - reads it back, " PROG " trace --demo "
		    "traces it.\n"), 0;
	if (argc > 1)
		return cmd_usage("demo: takes no arguments");
	return cmd_print(bench_demo_text);
}
