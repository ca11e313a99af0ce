/* cmd-report.c - `beamledger report`: the printed review of a bench setup
 * (PDF, the profile plot alone as SVG, or Markdown).  Gathers the facts
 * from the record (or a bench file), traces, compares with the setup
 * before, and writes the file through a temporary one and rename(2), so a
 * failure leaves nothing behind. */
#include <config.h>

#include <errno.h>
#include <getopt.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <time.h>

#include "bench-demo.h"
#include "bench-file.h"
#include "cmd-report.h"
#include "cmd-store.h"
#include "core-diff.h"
#include "report-review.h"
#include "util-err.h"
#include "util-sha256.h"

enum out_format { OUT_NONE, OUT_PDF, OUT_SVG, OUT_MD };

static enum out_format
format_word(const char *s)
{
	if (strcmp(s, "pdf") == 0)
		return OUT_PDF;
	if (strcmp(s, "svg") == 0)
		return OUT_SVG;
	if (strcmp(s, "md") == 0 || strcmp(s, "markdown") == 0)
		return OUT_MD;
	return OUT_NONE;
}

static const char *
format_ext(enum out_format f)
{
	return f == OUT_SVG ? "svg" : f == OUT_MD ? "md" : "pdf";
}

/* "3", "#3" -> "r3" for the store's reference parser; anything else as is. */
static char *
setup_ref(const char *s)
{
	const char *p = s[0] == '#' ? s + 1 : s;

	if (p[0] != '\0' && strspn(p, "0123456789") == strlen(p))
		return xasprintf("r%s", p);
	return xstrdup(s);
}

static char *
setup_shown(int no)
{
	return no == 0 ? xstrdup("the draft") : xasprintf("setup #%d", no);
}

/* What the review shows about where it came from; all owned. */
struct gathered {
	struct bench *bench, *old;
	char *setup, *names, *time, *author, *note, *origin, *since, *why, *stem;
};

static void
gathered_release(struct gathered *g)
{
	model_bench_free(g->bench);
	model_bench_free(g->old);
	free(g->setup);
	free(g->names);
	free(g->time);
	free(g->author);
	free(g->note);
	free(g->origin);
	free(g->since);
	free(g->why);
	free(g->stem);
}

static int
from_record(struct cmd_ctx *ctx, const char *arg, const char *since, struct gathered *g,
    char **cause)
{
	char *dbp = ctx->db_path != NULL && ctx->db_path[0] != '\0' ?
	    xstrdup(ctx->db_path) : store_default_path();
	struct store_rev *revs = NULL;
	struct store *s;
	struct stat sb;
	size_t nrev = 0;
	char *name = NULL, *rev = NULL;
	int no = 0, old_no = -1, rc = -1;

	if (stat(dbp, &sb) != 0) {
		fail_with(cause, "no file '%s', and no bench record at '%s'", arg, dbp);
		free(dbp);
		return -1;
	}
	free(dbp);
	if ((s = cmd_store_open_existing(ctx)) == NULL)
		return -2;              /* it said why */
	cmd_bench_ref(s, arg, &name, &rev);
	if (rev != NULL) {
		char *r = setup_ref(rev);

		free(rev);
		rev = r;
	}
	if ((g->bench = store_bench_load(s, name, rev, &no, cause)) == NULL)
		goto out;
	if (store_log(s, name, &revs, &nrev, cause) != 0)
		goto out;
	g->setup = setup_shown(no);
	g->origin = xasprintf("the record %s", store_path(s));
	g->stem = no == 0 ? xasprintf("%s-draft", name) : xasprintf("%s-setup-%d", name, no);
	for (size_t i = 0; i < nrev; i++)
		if (revs[i].no == no) {
			g->time = xstrdup(revs[i].time);
			g->author = xstrdup(revs[i].author);
			g->note = xstrdup(revs[i].note);
			if (revs[i].labels != NULL && revs[i].labels[0] != '\0')
				g->names = xstrdup(revs[i].labels);
		}
	if (no == 0)
		g->note = xstrdup("not recorded yet: the draft as it stands");
	if (since != NULL) {
		char *r = setup_ref(since);

		g->old = store_bench_load(s, name, r, &old_no, cause);
		free(r);
		if (g->old == NULL)
			goto out;
	} else if (no > 1 || (no == 0 && nrev > 0)) {
		char r[24];

		snprintf(r, sizeof r, "r%d", no > 1 ? no - 1 : revs[0].no);
		if ((g->old = store_bench_load(s, name, r, &old_no, cause)) == NULL)
			goto out;
	} else {
		g->why = xstrdup(no == 1 ? "This is the bench's first setup: nothing earlier to "
		    "compare with." : "The bench has no recorded setup to compare with.");
	}
	if (g->old != NULL)
		g->since = setup_shown(old_no);
	rc = 0;
out:
	store_revs_free(revs, nrev);
	free(name);
	free(rev);
	store_close(s);
	return rc;
}

static int
from_file(const char *path, int demo, struct gathered *g, char **cause)
{
	const char *base, *dot;

	g->bench = demo ? bench_file_parse(bench_demo_text, strlen(bench_demo_text), "demo", cause) :
	    bench_file_read(path, cause);
	if (g->bench == NULL)
		return -1;
	g->setup = xstrdup(demo ? "the built-in demo" : "a bench file");
	g->origin = demo ? xstrdup("the built-in demo bench") : xasprintf("the file %s", path);
	g->note = xstrdup("not from the record: no setup number, time or author");
	g->why = xstrdup("A bench file has no earlier setup to compare with; report a bench "
	    "in the record for that.");
	base = strrchr(path, '/') != NULL ? strrchr(path, '/') + 1 : path;
	dot = strrchr(base, '.');
	g->stem = dot != NULL && dot != base ? xasprintf("%.*s", (int)(dot - base), base) :
	    xstrdup(base);
	return 0;
}

/* The folder of path must exist: say so rather than leave mkstemp's words. */
static int
check_folder(const char *path, char **cause)
{
	const char *slash = strrchr(path, '/');
	struct stat sb;
	char *dir;

	if (slash == NULL)
		return 0;
	dir = slash == path ? xstrdup("/") : xasprintf("%.*s", (int)(slash - path), path);
	if (stat(dir, &sb) != 0 || !S_ISDIR(sb.st_mode)) {
		fail_with(cause, "%s: the folder '%s' does not exist; nothing written", path, dir);
		free(dir);
		return -1;
	}
	free(dir);
	return 0;
}

int
cmd_report_write(const struct review *rv, const char *path, int fmt_in, char **cause)
{
	enum out_format fmt = (enum out_format)fmt_in;
	unsigned char *data = NULL;
	size_t len = 0;
	int rc;

	if (check_folder(path, cause) != 0)
		return -1;
	if (fmt == OUT_MD) {
		data = (unsigned char *)review_markdown(rv);
		len = strlen((char *)data);
	} else {
		data = fmt == OUT_SVG ? review_svg(rv, &len, cause) : review_pdf(rv, &len, cause);
		if (data == NULL)
			return -1;
	}
	if (strcmp(path, "-") == 0) {
		rc = fwrite(data, 1, len, stdout) == len && fflush(stdout) == 0 ? 0 :
		    fail_with(cause, "standard output: %s", strerror(errno));
	} else {
		rc = cmd_write_atomic_len(path, data, len, cause);
	}
	free(data);
	return rc;
}

int
cmd_report_format_of(const char *path, const char *given, char **cause)
{
	const char *dot = strrchr(path, '.'), *slash = strrchr(path, '/');
	enum out_format by_ext = OUT_NONE, by_opt = OUT_NONE;

	if (dot != NULL && (slash == NULL || dot > slash))
		by_ext = format_word(dot + 1);
	if (given != NULL && (by_opt = format_word(given)) == OUT_NONE)
		return fail_with(cause, "--format must be pdf, svg or md, not '%s'", given);
	if (by_opt != OUT_NONE) {
		if (by_ext != OUT_NONE && by_ext != by_opt)
			return fail_with(cause, "%s: the extension says %s but --format says %s; "
			    "nothing written", path, format_ext(by_ext), given);
		return by_opt;
	}
	if (strcmp(path, "-") == 0)
		return OUT_MD;
	if (by_ext == OUT_NONE)
		return fail_with(cause, "%s: unknown extension '%s': write .pdf, .svg or .md, "
		    "or give --format; nothing written", path,
		    dot != NULL && (slash == NULL || dot > slash) ? dot : "(none)");
	return by_ext;
}

int
cmd_report(struct cmd_ctx *ctx, int argc, char **argv)
{
	static const struct option opts[] = {
		{ "output", required_argument, NULL, 'o' },
		{ "format", required_argument, NULL, 'f' },
		{ "since", required_argument, NULL, 's' },
		{ "demo", no_argument, NULL, 'd' },
		{ "help", no_argument, NULL, 'h' },
		{ NULL, 0, NULL, 0 },
	};
	const char *out = NULL, *fmt_text = NULL, *since = NULL;
	struct gathered g;
	struct review rv;
	struct trace *t = NULL;
	struct diff *d = NULL;
	char *cause = NULL, *path = NULL, *dump, hash[65], printed[32];
	time_t now = time(NULL);
	int ch, demo = 0, fmt = OUT_PDF, rc;

	memset(&g, 0, sizeof g);
	cmd_getopt_reset();
	while ((ch = getopt_long(argc, argv, "o:f:", opts, NULL)) != -1) {
		switch (ch) {
		case 'o': out = optarg; break;
		case 'f': fmt_text = optarg; break;
		case 's': since = optarg; break;
		case 'd': demo = 1; break;
		case 'h':
			printf("Usage: " PROG " report BENCH[@SETUP] | FILE | --demo [-o FILE.pdf|FILE.svg|FILE.md]\n"
			    "           [--format pdf|svg|md] [--since SETUP]\n"
			    "A review of a bench setup to print and sign: title block (setup, time,\n"
			    "author, note, record and content hash), verdict, sign-off lines, the\n"
			    "chain schematic, beam-profile plots, the element table, the changes\n"
			    "since the setup before (or SETUP), foci, warnings and the laser-safety\n"
			    "cautions.  .svg writes the profile plots alone, .md the whole review as\n"
			    "Markdown; '-o -' writes to standard output.  Without -o the file is\n"
			    "BENCH-setup-N.pdf in the current folder.\n"
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
	if (out != NULL && (fmt = cmd_report_format_of(out, fmt_text, &cause)) < 0)
		return cmd_fail(cause);
	if (out == NULL && fmt_text != NULL && format_word(fmt_text) == OUT_NONE)
		return cmd_usage("report: --format must be pdf, svg or md, not '%s'", fmt_text);
	if (demo) {
		rc = from_file("demo", 1, &g, &cause);
	} else {
		struct stat sb;

		if (stat(argv[optind], &sb) == 0 || errno != ENOENT) {
			if (since != NULL)
				return cmd_usage("report: --since needs a bench in the record, not a file");
			rc = from_file(argv[optind], 0, &g, &cause);
		} else {
			rc = from_record(ctx, argv[optind], since, &g, &cause);
		}
	}
	if (rc != 0) {
		gathered_release(&g);
		return rc == -2 ? 2 : cmd_fail(cause);
	}
	if (out == NULL) {
		fmt = fmt_text != NULL ? format_word(fmt_text) : OUT_PDF;
		path = xasprintf("%s.%s", g.stem, format_ext((enum out_format)fmt));
	} else {
		path = xstrdup(out);
	}
	t = trace_run(g.bench);
	if (g.old != NULL)
		d = diff_run(g.old, g.bench);
	dump = bench_file_dump(g.bench);
	sha256_hex(dump, strlen(dump), hash);
	free(dump);
	strftime(printed, sizeof printed, "%Y-%m-%d %H:%M:%S", gmtime(&now));
	rv = (struct review){ g.bench, t, g.setup, g.names, g.time, g.author, g.note, g.origin,
		hash, printed, d, g.since, g.why };
	rc = cmd_report_write(&rv, path, fmt, &cause) == 0 ? 0 : cmd_fail(cause);
	if (rc == 0 && strcmp(path, "-") != 0)
		printf("wrote %s (%s of bench %s)\n", path, g.setup, g.bench->name);
	(void)ctx;
	diff_free(d);
	trace_free(t);
	free(path);
	gathered_release(&g);
	return rc;
}
