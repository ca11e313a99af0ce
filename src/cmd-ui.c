/* cmd-ui.c - `beamledger open [BENCH]`, and beamledger with no command:
 * the terminal workbench on the database of --db (or the default).  Owned
 * by the workbench; everything curses is in ui-*.c. */
#include <config.h>

#include <stdio.h>
#include <string.h>
#include <unistd.h>

#include "cmd.h"
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

int
cmd_open(struct cmd_ctx *ctx, int argc, char **argv)
{
	struct ui_opts o = { ctx->db_path, NULL, ctx->author, NULL, NULL, NULL, -1, -1 };

	for (int i = 1; i < argc; i++) {
		if (strcmp(argv[i], "--help") == 0 || strcmp(argv[i], "-h") == 0) {
			printf("Usage: " PROG " [--db PATH] open [BENCH] [--ascii]\n"
			    "The terminal workbench: lay out a bench, watch every optic's damage\n"
			    "margin as you edit, commit and compare revisions.  With BENCH it opens\n"
			    "that bench at once.  Press ? inside for every key.\n");
			return 0;
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
	return start(&o);
}

int
cmd_workbench(struct cmd_ctx *ctx)
{
	struct ui_opts o = { ctx->db_path, NULL, ctx->author, NULL, NULL, NULL, -1, -1 };

	return start(&o);
}
