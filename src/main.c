/* main.c - argv to the command table.  Global options come before the
 * command; with no command the workbench opens. */
#include <config.h>

#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include "cmd.h"
#include "report.h"
#include "util-err.h"

const struct cmd cmd_table[] = {
	{ "trace", cmd_trace, "FILE | BENCH[@REV] | --demo [--format table|json|csv] [--color WHEN] [--ascii] "
	    "[--point NAME | --every-point]",
	    "trace a bench: power, beam size, irradiance and damage margins" },
	{ "demo", cmd_demo, "", "print the built-in demo bench as a bench file" },
	{ "sweep", cmd_sweep, "BENCH[@REV] | FILE KNOB FROM TO [--steps N] [--log] [--point NAME] "
	    "[--format table|json|csv]",
	    "trace the bench over a range of one value: crossings and safe intervals" },
	{ "point", cmd_point, "add BENCH NAME CHANGE... | list BENCH | show BENCH NAME | "
	    "remove BENCH NAME", "operating points: the bench as it is run at each setting" },
	{ "open", cmd_open, "[BENCH | --demo] [--ascii]",
	    "the terminal workbench (also with no command); BENCH opens that bench" },
	/* The bench database: benches, drafts, revisions, the parts shelf. */
	{ "import", cmd_import, "FILE [--name NAME]", "a new bench from a bench file" },
	{ "list", cmd_list, "[--format table|json]",
	    "benches: latest revision, draft changed?, worst status" },
	{ "show", cmd_show, "BENCH[@REV]", "the chain as a table" },
	{ "add", cmd_add, "BENCH TYPE ID [--part NAME] [KEY=VALUE...] "
	    "[--after ID | --before ID | --into SPLITTER.PORT [--first]]",
	    "add an element to the draft" },
	{ "set", cmd_set, "BENCH ID KEY=VALUE... | BENCH --bench KEY=VALUE...",
	    "change values of an element or of the bench and source" },
	{ "remove", cmd_remove, "BENCH ID", "remove an element (and its side branch)" },
	{ "move", cmd_move, "BENCH ID --after ID | --before ID | --into SPLITTER.PORT",
	    "move an element" },
	{ "commit", cmd_commit, "BENCH -m NOTE [--author NAME]", "the draft becomes a new revision" },
	{ "log", cmd_log, "BENCH [--format table|json]", "revisions, newest first, with labels" },
	{ "diff", cmd_diff, "BENCH REV [REV] [--format text|json]",
	    "changes and their effect on the damage margins (second REV: the draft)" },
	{ "restore", cmd_restore, "BENCH REV [--force]", "a revision becomes the draft" },
	{ "label", cmd_label, "BENCH REV NAME", "name a revision" },
	{ "clone", cmd_clone, "BENCH[@REV] NEWNAME", "a new bench from a revision of another" },
	{ "export", cmd_export, "BENCH[@REV] [-o FILE]", "the bench file of a revision or the draft" },
	{ "delete", cmd_delete, "BENCH --force", "drop a bench and all its revisions" },
	{ "parts", cmd_parts, "list | add FILE | show NAME", "the shelf of named parts" },
	{ "check", cmd_check, "", "check the database (integrity, every revision loads)" },
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
	    "Commands:\n");
	for (const struct cmd *c = cmd_table; c->name != NULL; c++)
		printf("  %-8s %s\n           %s\n", c->name, c->args, c->summary);
	printf("\nOptions:\n"
	    "  --db PATH      the bench database (default $XDG_DATA_HOME/beamledger/benches.db;\n"
	    "                 also BEAMLEDGER_DB)\n"
	    "  --author NAME  who commits, imports and clones (default $USER)\n"
	    "  --help         show this help and exit\n"
	    "  --version      show the version and exit\n\n"
	    "BENCH names a bench in the database; BENCH@REV one of its revisions, where\n"
	    "REV is rN, a label, or draft (the default).\n\n"
	    "Exit status: 0 fine; 1 trace: at least one element over its threshold\n"
	    "(check: problems found); 2 trouble.\n\n"
	    "%s\n"
	    "See beamledger(1) and beamledger-bench(5).\n", report_safety_text);
}

int
main(int argc, char **argv)
{
	struct cmd_ctx ctx = { getenv("BEAMLEDGER_DB"), getenv("USER") };
	int i = 1;

	for (; i < argc && argv[i][0] == '-'; i++) {
		if (strcmp(argv[i], "--help") == 0 || strcmp(argv[i], "-h") == 0) {
			usage();
			return 0;
		} else if (strcmp(argv[i], "--version") == 0) {
			printf(PROG " " PACKAGE_VERSION "\n"
			    "Copyright (c) 2026 the beamledger authors.\n"
			    "License MIT: <https://opensource.org/licenses/MIT>.\n"
			    "This is free software: you are free to change and redistribute it.\n"
			    "There is NO WARRANTY, to the extent permitted by law.\n");
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
	if (i >= argc)
		return cmd_workbench(&ctx);
	for (const struct cmd *c = cmd_table; c->name != NULL; c++)
		if (strcmp(argv[i], c->name) == 0)
			return c->fn(&ctx, argc - i, argv + i);
	return cmd_usage("unknown command '%s'", argv[i]);
}
