/* main.c - argv to the command table.  Global options come before the
 * command; with no command the workbench opens. */
#include <config.h>

#include <signal.h>
#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include "cmd.h"
#include "report.h"
#include "store.h"
#include "util-err.h"

#ifndef BEAMLEDGER_DOCDIR
#define BEAMLEDGER_DOCDIR "/usr/local/share/doc/" PACKAGE_TARNAME
#endif

const struct cmd cmd_table[] = {
	{ "trace", cmd_trace, "FILE | BENCH[@SETUP] | --demo [--format table|json|csv] [--color WHEN] "
	    "[--ascii] [--point NAME | --every-point] [--explain ID]",
	    "trace a bench: power, beam size, irradiance and damage margins" },
	{ "demo", cmd_demo, "", "print the built-in demo bench as a bench file" },
	{ "report", cmd_report, "BENCH[@SETUP] | FILE | --demo [-o FILE.pdf|FILE.svg|FILE.md] "
	    "[--format pdf|svg|md] [--since SETUP] [--point NAME | --every-point]",
	    "a review of a setup to print and sign: verdict, schematic, profile, table, changes" },
	{ "sweep", cmd_sweep, "BENCH[@SETUP] | FILE KNOB FROM TO [--steps N] [--log] [--point NAME] "
	    "[--format table|json|csv] [--no-ghosts]",
	    "trace the bench over a range of one value: crossings and safe intervals" },
	{ "tolerance", cmd_tolerance, "BENCH[@SETUP] | FILE | --demo [--samples N] [--seed S] "
	    "[--point NAME] [--format table|json|csv] [--max-risk P] [--threads N] [--no-ghosts]",
	    "Monte-Carlo over every tolerance: the chance that each optic is over" },
	{ "point", cmd_point, "add BENCH NAME CHANGE... | list BENCH | show BENCH NAME | "
	    "remove BENCH NAME", "operating points: the bench as it is run at each setting" },
	{ "open", cmd_open, "[BENCH | --demo] [--ascii]",
	    "the terminal workbench (also with no command); BENCH opens that bench" },
	{ "help", cmd_help, "[COMMAND]", "this overview, or the help of one command" },
	/* The bench database: benches, drafts, numbered setups, the parts shelf. */
	{ "import", cmd_import, "FILE [--name NAME]", "a new bench from a bench file" },
	{ "list", cmd_list, "[--format table|json]",
	    "benches: latest setup, draft changed?, worst status" },
	{ "chain", cmd_chain, "BENCH[@SETUP]", "the chain as a table" },
	{ "place", cmd_place, "BENCH TYPE ID [--part NAME] [KEY=VALUE...] "
	    "[--after ID | --before ID | --into SPLITTER.PORT [--first]]",
	    "put an element into the draft's chain" },
	{ "set", cmd_set, "BENCH ID KEY=VALUE... | BENCH --bench KEY=VALUE...",
	    "change values of an element, or of the bench (name too) and source" },
	{ "lift", cmd_lift, "BENCH ID", "take an element (and its side branch) out" },
	{ "shift", cmd_shift, "BENCH ID --after ID | --before ID | --into SPLITTER.PORT",
	    "put an element somewhere else in the chain" },
	{ "record", cmd_record, "BENCH --note NOTE [--author NAME]",
	    "the draft becomes the next numbered setup" },
	{ "history", cmd_history, "BENCH [--margins] [--format table|json]",
	    "the setups, newest first, with their names" },
	{ "compare", cmd_compare, "BENCH SETUP [SETUP] [--format text|json]",
	    "changes and their effect on the damage margins (second SETUP: the draft)" },
	{ "reinstate", cmd_reinstate, "BENCH SETUP [--force]", "a setup becomes the draft again" },
	{ "mark", cmd_mark, "BENCH SETUP NAME", "give a setup a name" },
	{ "copy", cmd_copy, "BENCH[@SETUP] NEWNAME", "a new bench from a setup of another" },
	{ "export", cmd_export, "BENCH[@SETUP] [-o FILE]", "the bench file of a setup or the draft" },
	{ "delete", cmd_delete, "BENCH --force", "drop a bench and all its setups" },
	{ "parts", cmd_parts, "list | add FILE | show NAME", "the shelf of named parts" },
	{ "check", cmd_check, "", "check the database (integrity, every setup loads)" },
	{ NULL, NULL, NULL, NULL },
};

int
cmd_usage(const char *fmt, ...)
{
	va_list ap;

	fputs(PROG ": ", stderr);
	va_start(ap, fmt);
	vfprintf(stderr, fmt, ap);
	va_end(ap);
	fputs("\nTry '" PROG " --help' for more information.\n", stderr);
	return 2;
}

int
cmd_fail(char *cause)
{
	fprintf(stderr, PROG ": %s\n", cause != NULL ? cause : "failed");
	free(cause);
	return 2;
}

int
cmd_color(const char *when)
{
	const char *nc = getenv("NO_COLOR"), *term = getenv("TERM");

	if (when != NULL && strcmp(when, "always") == 0)
		return 1;
	if (when != NULL && strcmp(when, "never") == 0)
		return 0;
	if (nc != NULL && nc[0] != '\0')
		return 0;
	if (term == NULL || strcmp(term, "dumb") == 0)
		return 0;
	return isatty(STDOUT_FILENO);
}

int
cmd_print(const char *text)
{
	if (fputs(text, stdout) == EOF || fflush(stdout) == EOF) {
		perror(PROG ": standard output");
		return 2;
	}
	return 0;
}

static void
usage(void)
{
	printf("Usage: " PROG " [--db PATH] [--author NAME] [COMMAND [ARGS]]\n"
	    "Lay out laser beam lines, trace power, beam size, irradiance and fluence\n"
	    "through every optic, and flag what exceeds its damage threshold.\n\n"
	    "Commands (" PROG " help COMMAND, or COMMAND --help, tells more):\n");
	for (const struct cmd *c = cmd_table; c->name != NULL; c++)
		printf("  %-9s %s\n            %s\n", c->name, c->args, c->summary);
	printf("\nOptions:\n"
	    "  --db PATH      the bench database (default $XDG_DATA_HOME/beamledger/benches.db;\n"
	    "                 also BEAMLEDGER_DB)\n"
	    "  --author NAME  who records, imports and copies (default $USER, else the\n"
	    "                 login name)\n"
	    "  --help         show this help and exit\n"
	    "  --version      show the version and exit\n\n"
	    "BENCH names a bench in the database.  Its draft is what you edit; record\n"
	    "makes it the next numbered setup (#1, #2, ...).  BENCH@SETUP is one of them:\n"
	    "BENCH@2 (or BENCH@#2), BENCH@NAME for a name given with mark, or BENCH@draft\n"
	    "(the default).\n\n"
	    "Exit status: 0 fine; 1 trace: at least one element over its threshold\n"
	    "(check: problems found); 2 trouble.\n\n"
	    "%s\n"
	    "See beamledger(1) and beamledger-bench(5).\n", report_safety_text);
}

int
cmd_help(struct cmd_ctx *ctx, int argc, char **argv)
{
	char *sub[3];

	if (argc == 1 || (argc == 2 && (strcmp(argv[1], "--help") == 0 ||
	    strcmp(argv[1], "help") == 0))) {
		usage();
		return 0;
	}
	if (argc > 2)
		return cmd_usage("help: one command at a time ('%s' is extra)", argv[2]);
	for (const struct cmd *c = cmd_table; c->name != NULL; c++) {
		if (strcmp(argv[1], c->name) != 0)
			continue;
		sub[0] = argv[1];
		sub[1] = (char *)"--help";
		sub[2] = NULL;
		return c->fn(ctx, 2, sub);
	}
	return cmd_usage("help: no command '%s' (" PROG " help lists them)", argv[1]);
}

int
main(int argc, char **argv)
{
	struct cmd_ctx ctx = { getenv("BEAMLEDGER_DB"), NULL };
	char *author = NULL;
	int i = 1, rc;

	/* Over a file-size limit every write (a report, an export, the
	 * standard output, the database) fails with EFBIG and is reported,
	 * leaving no partial file, instead of the signal killing the process
	 * between a temporary file and its rename. */
	signal(SIGXFSZ, SIG_IGN);
	for (; i < argc && argv[i][0] == '-'; i++) {
		if (strcmp(argv[i], "--help") == 0 || strcmp(argv[i], "-h") == 0) {
			usage();
			return 0;
		} else if (strcmp(argv[i], "--version") == 0) {
			printf(PROG " " PACKAGE_VERSION " - MIT licence; its text is in LICENSE, "
			    "installed as " BEAMLEDGER_DOCDIR "/LICENSE\n");
			return 0;
		} else if (strcmp(argv[i], "--db") == 0) {
			if (i + 1 >= argc)
				return cmd_usage("option '--db' needs a path");
			ctx.db_path = argv[++i];
		} else if (strncmp(argv[i], "--db=", 5) == 0) {
			ctx.db_path = argv[i] + 5;
		} else if (strcmp(argv[i], "--author") == 0) {
			if (i + 1 >= argc)
				return cmd_usage("option '--author' needs a name");
			ctx.author = argv[++i];
		} else if (strncmp(argv[i], "--author=", 9) == 0) {
			ctx.author = argv[i] + 9;
		} else if (strcmp(argv[i], "--") == 0) {
			i++;
			break;
		} else {
			return cmd_usage("unknown option '%s'", argv[i]);
		}
	}
	ctx.author = author = store_author(ctx.author);
	if (i >= argc) {
		rc = cmd_workbench(&ctx);
	} else {
		const struct cmd *c = cmd_table;

		while (c->name != NULL && strcmp(argv[i], c->name) != 0)
			c++;
		rc = c->name != NULL ? c->fn(&ctx, argc - i, argv + i) :
		    cmd_usage("unknown command '%s'", argv[i]);
	}
	free(author);
	return rc;
}
