/* cmd-trace.c - `beamledger trace` and `beamledger demo`: read a bench,
 * trace it, print the report; nothing reaches stdout unless the whole trace
 * succeeded. */
#include <config.h>

#include <getopt.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <errno.h>
#include <sys/stat.h>

#include "bench-demo.h"
#include "bench-file.h"
#include "cmd.h"
#include "cmd-store.h"
#include "core-trace.h"
#include "report.h"
#include "util-err.h"

/* Prints the report of one bench; returns the trace's exit status. */
int cmd_trace_print(const struct bench *, enum report_format, const struct report_opts *);

int
cmd_trace_print(const struct bench *b, enum report_format fmt,
    const struct report_opts *o)
{
	struct trace *t = trace_run(b);
	char *text, *cause = NULL;
	int rc, over = 0;

	if (trace_check(t, &cause) != 0) {
		cause_prefix(&cause, "bench '%s'", b->name);
		trace_free(t);
		return cmd_fail(cause);
	}
	for (size_t i = 0; i < t->nrows; i++)
		if (t->rows[i].status == STATUS_OVER)
			over = 1;
	text = fmt == REPORT_JSON ? report_json(t) :
	    fmt == REPORT_CSV ? report_csv(t) : report_table(t, o);
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

int
cmd_trace(struct cmd_ctx *ctx, int argc, char **argv)
{
	static const struct option opts[] = {
		{ "format", required_argument, NULL, 'f' },
		{ "color", required_argument, NULL, 'c' },
		{ "colour", required_argument, NULL, 'c' },
		{ "ascii", no_argument, NULL, 'a' },
		{ "demo", no_argument, NULL, 'd' },
		{ "help", no_argument, NULL, 'h' },
		{ NULL, 0, NULL, 0 },
	};
	enum report_format fmt = REPORT_TABLE;
	struct report_opts ro = { 0, 0, NULL };
	const char *color = "auto";
	struct bench *b;
	char *cause = NULL, *origin = NULL;
	int demo = 0, ch, rc;

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
		case 'h':
			printf("Usage: " PROG " trace FILE | BENCH[@SETUP] | --demo"
			    " [--format table|json|csv] [--color WHEN] [--ascii]\n"
			    "An operand that is not a file names a bench in the database: its\n"
			    "draft, or with @SETUP a recorded setup (a number, 2 or #2, or a name).\n"
			    "Exit status: 0 nothing over its threshold, 1 something over, 2 trouble.\n");
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
