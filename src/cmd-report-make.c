/* cmd-report-make.c - what a review is made from and how it is written:
 * a setup in the record (with its time, author, note, names and the setup
 * before it, for the changes) or a bench file; traced, compared, hashed,
 * drawn, and written through a temporary file and rename.  Used by
 * `beamledger report` and by the workbench's history screen, so it needs
 * nothing of the other commands. */
#include <config.h>

#include <errno.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <time.h>

#include "bench-demo.h"
#include "bench-file.h"
#include "cmd-report.h"
#include "core-diff.h"
#include "report-print.h"
#include "report-review.h"
#include "util-err.h"
#include "util-file.h"
#include "util-sha256.h"

enum out_format { OUT_NONE, OUT_PDF, OUT_SVG, OUT_MD };

int
cmd_report_format_word(const char *s)
{
	if (strcmp(s, "pdf") == 0)
		return OUT_PDF;
	if (strcmp(s, "svg") == 0)
		return OUT_SVG;
	if (strcmp(s, "md") == 0 || strcmp(s, "markdown") == 0)
		return OUT_MD;
	return OUT_NONE;
}

const char *
cmd_report_ext(int f)
{
	return f == OUT_SVG ? "svg" : f == OUT_MD ? "md" : "pdf";
}

/* "3", "#3" -> "r3" for the store's reference parser; anything else as is. */
static char *
setup_shown(int no)
{
	return no == 0 ? xstrdup("the draft") : xasprintf("setup #%d", no);
}

/* What the review shows about where it came from; all owned. */
struct review_src {
	struct bench *bench, *old;
	char *setup, *names, *time, *author, *note, *origin, *since, *why, *stem;
	char *point;                /* NULL: the base */
	char *base_setup;           /* setup before the point's words were added */
	int every;                  /* the base and every point */
};

void
review_src_free(struct review_src *g)
{
	if (g == NULL)
		return;
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
	free(g->point);
	free(g->base_setup);
	free(g);
}

/* A point's name in a file name: no folder separators or blanks. */
static char *
name_for_file(const char *s)
{
	char *o = xstrdup(s);

	for (char *c = o; *c; c++)
		if (*c == '/' || *c == ' ' || *c == '\\' || *c == '\t')
			*c = '-';
	return o;
}

void
review_src_points(struct review_src *g, const char *point, int every)
{
	char *s;

	if (point != NULL) {
		char *f = name_for_file(point);

		free(g->point);
		g->point = xstrdup(point);
		s = xasprintf("%s-point-%s", g->stem, f);
		free(f);
		free(g->stem);
		g->stem = s;
		s = xasprintf("%s, point %s", g->setup, point);
	} else if (every) {
		g->every = 1;
		s = xasprintf("%s-every-point", g->stem);
		free(g->stem);
		g->stem = s;
		s = xasprintf("%s, the base and every operating point", g->setup);
	} else {
		return;
	}
	if (g->base_setup == NULL)
		g->base_setup = g->setup;
	else
		free(g->setup);
	g->setup = s;
}

struct review_src *
review_src_record(struct store *s, const char *name, const char *rev_in, const char *since,
    char **cause)
{
	struct review_src *g = xcalloc(1, sizeof *g);
	struct store_rev *revs = NULL;
	size_t nrev = 0;
	const char *rev = rev_in;	/* 2, #2, a name or draft: the store reads them all */
	int no = 0, old_no = -1, ok = 0;

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
		g->old = store_bench_load(s, name, since, &old_no, cause);
		if (g->old == NULL)
			goto out;
	} else if (no > 1 || (no == 0 && nrev > 0)) {
		char r[24];

		snprintf(r, sizeof r, "%d", no > 1 ? no - 1 : revs[0].no);
		if ((g->old = store_bench_load(s, name, r, &old_no, cause)) == NULL)
			goto out;
	} else {
		g->why = xstrdup(no == 1 ? "This is the bench's first setup: nothing earlier to "
		    "compare with." : "The bench has no recorded setup to compare with.");
	}
	if (g->old != NULL)
		g->since = setup_shown(old_no);
	ok = 1;
out:
	store_revs_free(revs, nrev);
	if (!ok) {
		review_src_free(g);
		return NULL;
	}
	return g;
}

struct review_src *
review_src_file(const char *path, int demo, char **cause)
{
	struct review_src *g = xcalloc(1, sizeof *g);
	const char *base, *dot;

	g->bench = demo ? bench_file_parse(bench_demo_text, strlen(bench_demo_text), "demo", cause) :
	    bench_file_read(path, cause);
	if (g->bench == NULL) {
		free(g);
		return NULL;
	}
	g->setup = xstrdup(demo ? "the built-in demo" : "a bench file");
	g->origin = demo ? xstrdup("the built-in demo bench") : xasprintf("the file %s", path);
	g->note = xstrdup("not from the record: no setup number, time or author");
	g->why = xstrdup("A bench file has no earlier setup to compare with; report a bench "
	    "in the record for that.");
	base = strrchr(path, '/') != NULL ? strrchr(path, '/') + 1 : path;
	dot = strrchr(base, '.');
	g->stem = dot != NULL && dot != base ? xasprintf("%.*s", (int)(dot - base), base) :
	    xstrdup(base);
	return g;
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
		/* cairo and pango are loaded only here (report-print.h) */
		const struct report_print *pm = report_print_load(cause);

		if (pm == NULL) {
			cause_prefix(cause, "%s", path);
			return -1;
		}
		data = fmt == OUT_SVG ? pm->svg(rv, &len, cause) : pm->pdf(rv, &len, cause);
		if (data == NULL)
			return -1;
	}
	if (strcmp(path, "-") == 0) {
		rc = fwrite(data, 1, len, stdout) == len && fflush(stdout) == 0 ? 0 :
		    fail_with(cause, "standard output: %s", strerror(errno));
	} else {
		rc = file_write_atomic(path, data, len, cause);
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
		by_ext = cmd_report_format_word(dot + 1);
	if (given != NULL && (by_opt = cmd_report_format_word(given)) == OUT_NONE)
		return fail_with(cause, "--format must be pdf, svg or md, not '%s'", given);
	if (by_opt != OUT_NONE) {
		if (by_ext != OUT_NONE && by_ext != by_opt)
			return fail_with(cause, "%s: the extension says %s but --format says %s; "
			    "nothing written", path, cmd_report_ext(by_ext), given);
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

const char *
review_src_stem(const struct review_src *g)
{
	return g->stem;
}

const char *
review_src_setup(const struct review_src *g)
{
	return g->setup;
}

int
review_src_write(const struct review_src *g, const char *path, int fmt, char **cause)
{
	struct point_survey sv;
	struct trace *t = NULL;
	struct diff *d;
	char *dump, hash[65], printed[32];
	time_t now = time(NULL);
	struct review rv;
	int rc, surveyed = g->point != NULL || g->every;

	/* the survey traces the base and the point(s) once, as trace does */
	if (surveyed && point_survey_run(g->bench, g->point, &sv, cause) != 0)
		return -1;
	if (!surveyed)
		t = trace_run(g->bench);
	d = g->old != NULL ? diff_run(g->old, g->bench) : NULL;
	/* the hash is of the setup as recorded (its points included) */
	dump = bench_file_dump(g->bench);
	sha256_hex(dump, strlen(dump), hash);
	free(dump);
	strftime(printed, sizeof printed, "%Y-%m-%d %H:%M:%S", gmtime(&now));
	rv = (struct review){ .bench = g->bench, .trace = t, .setup = g->setup,
		.setup_names = g->names, .time = g->time, .author = g->author, .note = g->note,
		.origin = g->origin, .hash = hash, .printed = printed, .changes = d,
		.since = g->since, .no_changes_why = g->why };
	rv.npoints = g->bench->points.n;
	rv.base_setup = g->base_setup;
	if (g->point != NULL) {
		rv.bench = sv.last;
		rv.trace = sv.last_trace;
		rv.point = g->point;
		rv.point_def = point_list_find(&g->bench->points, g->point);
	} else if (g->every) {
		rv.trace = sv.base_trace;
		rv.survey = &sv;
	}
	rc = cmd_report_write(&rv, path, fmt, cause);
	diff_free(d);
	trace_free(t);
	if (surveyed)
		point_survey_release(&sv);
	return rc;
}

