/* cmd-report.c - `beamledger report`: the printed review of a bench setup
 * (PDF, the profile plots alone as SVG, or Markdown).  Reads the operand
 * (a setup in the record or a bench file); cmd-report-make.c gathers,
 * draws and writes. */
#include <config.h>

#include <errno.h>
#include <getopt.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>

#include "cmd-report.h"
#include "cmd-store.h"
#include "util-err.h"

/* BENCH[@SETUP] in the record, which must exist already */
static struct review_src *
from_record(struct cmd_ctx *ctx, const char *arg, const char *since, int *said, char **cause)
{
	char *dbp = ctx->db_path != NULL && ctx->db_path[0] != '\0' ?
	    xstrdup(ctx->db_path) : store_default_path();
	struct review_src *g;
	struct store *s;
	struct stat sb;
	char *name = NULL, *rev = NULL;

	if (stat(dbp, &sb) != 0) {
		fail_with(cause, "no file '%s', and no bench record at '%s'", arg, dbp);
		free(dbp);
		return NULL;
	}
	free(dbp);
	if ((s = cmd_store_open_existing(ctx)) == NULL) {
		*said = 1;
		return NULL;
	}
	cmd_bench_ref(s, arg, &name, &rev);
	g = review_src_record(s, name, rev, since, cause);
	free(name);
	free(rev);
	store_close(s);
	return g;
}

int
cmd_report(struct cmd_ctx *ctx, int argc, char **argv)
{
	static const struct option opts[] = {
		{ "output", required_argument, NULL, 'o' },
		{ "format", required_argument, NULL, 'f' },
		{ "since", required_argument, NULL, 's' },
		{ "demo", no_argument, NULL, 'd' },
		{ "point", required_argument, NULL, 'p' },
		{ "every-point", no_argument, NULL, 'e' },
		{ "help", no_argument, NULL, 'h' },
		{ NULL, 0, NULL, 0 },
	};
	const char *out = NULL, *fmt_text = NULL, *since = NULL, *point = NULL;
	struct review_src *g;
	char *cause = NULL, *path = NULL;
	int ch, demo = 0, every = 0, fmt = 1, rc, said = 0;

	cmd_getopt_reset();
	while ((ch = getopt_long(argc, argv, "o:f:", opts, NULL)) != -1) {
		switch (ch) {
		case 'o': out = optarg; break;
		case 'f': fmt_text = optarg; break;
		case 's': since = optarg; break;
		case 'd': demo = 1; break;
		case 'p': point = optarg; break;
		case 'e': every = 1; break;
		case 'h':
			printf("Usage: " PROG " report BENCH[@SETUP] | FILE | --demo [-o FILE.pdf|FILE.svg|FILE.md]\n"
			    "           [--format pdf|svg|md] [--since SETUP] [--point NAME | --every-point]\n"
			    "A review of a bench setup to print and sign: title block (setup, time,\n"
			    "author, note, record and content hash), verdict, sign-off lines, the\n"
			    "chain schematic, beam-profile plots, the element table, the changes\n"
			    "since the setup before (or SETUP), foci, warnings and the laser-safety\n"
			    "cautions.  .svg writes the profile plots alone, .md the whole review as\n"
			    "Markdown; '-o -' writes to standard output.  Without -o the file is\n"
			    "BENCH-setup-N.pdf in the current folder.\n"
			    "--point NAME reviews that operating point (the setup with the point's\n"
			    "changes); --every-point reviews the base and gives, in the verdict and\n"
			    "the element table, each element's worst ratio over the base and every\n"
			    "point, and at which point.\n"
			    "Exit status: 0 written, 2 trouble (nothing is written then).\n");
			return 0;
		default:
			return cmd_usage("report: unknown option or missing value in '%s'",
			    optind - 1 < argc ? argv[optind - 1] : "?");
		}
	}
	if (demo == (optind < argc))
		return cmd_usage(demo ? "report: give a bench or --demo, not both" :
		    "report: which bench? give BENCH[@SETUP], a bench file or --demo");
	if (optind + 1 < argc)
		return cmd_usage("report: one bench at a time ('%s' is extra)", argv[optind + 1]);
	if (point != NULL && every)
		return cmd_usage("report: give --point NAME or --every-point, not both");
	if (out != NULL && (fmt = cmd_report_format_of(out, fmt_text, &cause)) < 0)
		return cmd_fail(cause);
	if (out == NULL && fmt_text != NULL && (fmt = cmd_report_format_word(fmt_text)) == 0)
		return cmd_usage("report: --format must be pdf, svg or md, not '%s'", fmt_text);
	if (demo) {
		g = review_src_file("demo", 1, &cause);
	} else {
		struct stat sb;

		if (stat(argv[optind], &sb) == 0 || errno != ENOENT) {
			if (since != NULL)
				return cmd_usage("report: --since needs a bench in the record, not a file");
			g = review_src_file(argv[optind], 0, &cause);
		} else {
			g = from_record(ctx, argv[optind], since, &said, &cause);
		}
	}
	if (g == NULL)
		return said ? 2 : cmd_fail(cause);
	review_src_points(g, point, every);
	path = out != NULL ? xstrdup(out) :
	    xasprintf("%s.%s", review_src_stem(g), cmd_report_ext(fmt));
	rc = review_src_write(g, path, fmt, &cause) == 0 ? 0 : cmd_fail(cause);
	if (rc == 0 && strcmp(path, "-") != 0)
		printf("wrote %s (%s)\n", path, review_src_setup(g));
	free(path);
	review_src_free(g);
	return rc;
}
