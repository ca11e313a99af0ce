/* cmd-ui.c - `beamledger open [BENCH]`, and beamledger with no command:
 * the terminal workbench on the database of --db (or the default).  Owned
 * by the workbench; everything curses is in ui-*.c. */
#include <config.h>

#include <stdio.h>
#include <string.h>
#include <unistd.h>

#include <stdlib.h>

#include "bench-demo.h"
#include "bench-file.h"
#include "cmd.h"
#include "store.h"
#include "ui.h"

/* Without a terminal (a script, a pipe) the workbench is a usage error,
 * told before any database is opened or created. */
static int
start(const struct ui_opts *o)
{
	if (!isatty(STDIN_FILENO) || !isatty(STDOUT_FILENO))
		return cmd_usage("the workbench needs a terminal (for scripts, use the "
		    "commands listed by --help)");
	return ui_run(o);
}

/* Puts the demo bench into the database unless a bench of its name is
 * there already (then that one, with whatever was done to it, opens). */
static int
ensure_demo(const char *db_path, const char *author, char **name)
{
	char *path = db_path != NULL ? NULL : store_default_path(), *cause = NULL;
	struct store *st = store_open(db_path != NULL ? db_path : path, &cause);
	struct bench *b = NULL;
	int rc = -1;

	free(path);
	if (st == NULL)
		return cmd_fail(cause), -1;
	b = bench_file_parse(bench_demo_text, strlen(bench_demo_text), "demo", &cause);
	if (b == NULL)
		goto out;
	*name = strdup(b->name);
	if (*name == NULL) {
		cause = strdup("out of memory");
		goto out;
	}
	{
		struct bench *have = store_bench_load(st, b->name, NULL, NULL, NULL);

		if (have != NULL) {
			model_bench_free(have);
			rc = 0;
			goto out;
		}
	}
	if (store_bench_create(st, b, "demo bench", author, &cause) == 0)
		rc = 0;
out:
	model_bench_free(b);
	store_close(st);
	if (rc != 0)
		cmd_fail(cause);
	return rc;
}

int
cmd_open(struct cmd_ctx *ctx, int argc, char **argv)
{
	struct ui_opts o = { ctx->db_path, NULL, ctx->author, NULL, NULL, NULL, -1, -1 };
	char *demo = NULL;
	int want_demo = 0, rc;

	for (int i = 1; i < argc; i++) {
		if (strcmp(argv[i], "--help") == 0 || strcmp(argv[i], "-h") == 0) {
			printf("Usage: " PROG " [--db PATH] open [BENCH | --demo] [--ascii]\n"
			    "The terminal workbench: lay out a bench, watch every optic's damage\n"
			    "margin as you edit, record and compare setups.  With BENCH it opens\n"
			    "that bench at once; --demo puts the demo bench into the database\n"
			    "(unless it is there) and opens it.  Press ? inside for every key.\n");
			return 0;
		} else if (strcmp(argv[i], "--demo") == 0) {
			want_demo = 1;
		} else if (strcmp(argv[i], "--ascii") == 0) {
			o.ascii = 1;
		} else if (argv[i][0] == '-' && argv[i][1] != '\0') {
			return cmd_usage("open: unknown option '%s'", argv[i]);
		} else if (o.bench == NULL) {
			o.bench = argv[i];
		} else {
			return cmd_usage("open: one bench at a time ('%s' is one too many)", argv[i]);
		}
	}
	if (want_demo && o.bench != NULL)
		return cmd_usage("open: give a bench or --demo, not both");
	if (want_demo) {
		if (!isatty(STDIN_FILENO) || !isatty(STDOUT_FILENO))
			return start(&o);       /* the usage error, before any database */
		if (ensure_demo(ctx->db_path, ctx->author, &demo) != 0)
			return 2;
		o.bench = demo;
	}
	rc = start(&o);
	free(demo);
	return rc;
}

int
cmd_workbench(struct cmd_ctx *ctx)
{
	struct ui_opts o = { ctx->db_path, NULL, ctx->author, NULL, NULL, NULL, -1, -1 };

	return start(&o);
}
