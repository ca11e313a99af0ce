/* cmd-tolerance.c - `beamledger tolerance`: the Monte-Carlo over every
 * tolerance of a bench (or of one of its operating points).  Prints the
 * chance that each rated optic is over, what drives the worst, and exits 1
 * when the chance that anything is over exceeds --max-risk.  Progress on a
 * terminal after a second; Ctrl-C stops and reports what was done. */
#include <config.h>

#include <math.h>
#include <signal.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>
#include <unistd.h>

#include "bench-demo.h"
#include "bench-file.h"
#include "cmd.h"
#include "core-mc.h"
#include "core-point.h"
#include "report.h"
#include "util-buf.h"
#include "util-err.h"
#include "util-json.h"

struct tol_args {
	const char        *ref, *point;
	size_t             samples;
	uint64_t           seed;
	unsigned           threads;
	double             max_risk;
	int                demo, no_ghosts;
	enum report_format fmt;
};

static volatile sig_atomic_t interrupted;

static void
on_sigint(int sig)
{
	(void)sig;
	interrupted = 1;
}

struct progress {
	struct timespec start;
	int             shown, tty;
};

static double
since(const struct timespec *t0)
{
	struct timespec t;

	clock_gettime(CLOCK_MONOTONIC, &t);
	return (double)(t.tv_sec - t0->tv_sec) + 1e-9 * (double)(t.tv_nsec - t0->tv_nsec);
}

static void
on_progress(void *arg, size_t done, size_t total)
{
	struct progress *p = arg;

	if (!p->tty || since(&p->start) < 1.0)
		return;
	fprintf(stderr, "\r" PROG " tolerance: %zu of %zu samples (%.0f %%)%s", done, total,
	    100.0 * (double)done / (double)total, interrupted ? ", stopping" : "");
	fflush(stderr);
	p->shown = 1;
}

static void
pct(char *buf, size_t n, double p)
{
	if (isnan(p))
		snprintf(buf, n, "-");
	else
		snprintf(buf, n, "%.2f%%", 100 * p);
}

static void
param_text(char *buf, size_t n, const struct mc_param *p)
{
	char v[64], t[64];

	units_format_shortest(v, sizeof v, p->nominal, p->dim, 0);
	tol_format(t, sizeof t, &p->t, p->dim, 0);
	snprintf(buf, n, "%s%s%s", v, t, p->t.uniform ? "" : " normal");
}

static char *
table(const struct mc_result *r, const struct bench *b, const struct tol_args *a)
{
	struct buf out;
	char x[200], y[200], z[96];

	buf_init(&out);
	buf_printf(&out, "Tolerances of bench %s%s%s: %zu samples, seed %llu, %zu "
	    "tolerance%s\n", b->name, a->point != NULL ? ", point " : "",
	    a->point != NULL ? a->point : "", r->asked, (unsigned long long)r->seed,
	    r->nparam, r->nparam == 1 ? "" : "s");
	if (r->stopped)
		buf_printf(&out, "STOPPED: %zu of %zu samples done; the figures are of "
		    "those only.\n", r->done, r->asked);
	if (r->no_ghosts)
		buf_add(&out, "Main beam only (--no-ghosts): surface reflections are not in "
		    "these ratios.\n");
	if (r->nparam == 0)
		buf_add(&out, "No value carries a tolerance: every sample is the bench "
		    "as written.\n");
	for (size_t p = 0; p < r->nparam; p++) {
		size_t start = out.len;

		param_text(x, sizeof x, &r->param[p]);
		buf_printf(&out, "  %s", r->param[p].name);
		buf_pad(&out, 28, start);
		buf_printf(&out, " %s\n", x);
	}
	buf_add(&out, "\nRated elements (ratio of the scaled damage threshold; "
	    "± one standard error):\n");
	buf_printf(&out, "  %-10s %9s  %-19s %-19s %9s %9s\n", "element", "as written",
	    "P(over)", "P(caution)", "median", "95th pct");
	for (size_t j = 0; j < r->nrated; j++) {
		const struct mc_elem *e = &r->el[j];
		char c1[32], c2[32], s1[32], s2[32];

		pct(c1, sizeof c1, e->p_over);
		pct(s1, sizeof s1, e->se_over);
		pct(c2, sizeof c2, e->p_caution);
		pct(s2, sizeof s2, e->se_caution);
		snprintf(x, sizeof x, "%s ± %s", c1, s1);
		snprintf(y, sizeof y, "%s ± %s", c2, s2);
		buf_printf(&out, "  %-10s %9.1f%%  %-19s %-19s %8.1f%% %8.1f%%\n", e->id,
		    100 * e->nominal, x, y, 100 * e->median, 100 * e->p95);
	}
	if (r->nrated == 0)
		buf_add(&out, "  (none: no element carries a damage rating)\n");
	pct(x, sizeof x, r->p_any);
	pct(y, sizeof y, r->se_any);
	pct(z, sizeof z, a->max_risk);
	buf_printf(&out, "\nP(anything over): %s ± %s (limit %s)\n", x, y, z);
	units_format(x, sizeof x, r->safe_p5, DIM_POWER, 3, 0);
	units_format(y, sizeof y, r->nominal_safe, DIM_POWER, 3, 0);
	buf_printf(&out, "Safe source power (worst element at caution), 5th percentile: "
	    "%s (as written: %s)\n", isinf(r->safe_p5) ? "any" : x,
	    isnan(r->nominal_safe) ? "-" : isinf(r->nominal_safe) ? "any" : y);
	if (r->nparam > 0 && r->nworst > 0) {
		buf_add(&out, "\nWhat drives the worst (correlation r of each tolerance's draw "
		    "with the ratio, over the samples):\n");
		for (size_t q = 0; q < r->nworst; q++) {
			const struct mc_elem *e = &r->el[r->worst[q]];

			buf_printf(&out, "  %s:", e->id);
			for (size_t k = 0; k < e->nsens; k++)
				buf_printf(&out, "%s %s r %+.2f", k ? "," : "",
				    r->param[e->sens[k].param].name, e->sens[k].r);
			buf_add(&out, e->nsens == 0 ? " -\n" : "\n");
		}
	}
	buf_printf(&out, "\n%s\n", r->p_any > a->max_risk ?
	    "The risk that something is over exceeds the limit." :
	    "The risk that something is over is within the limit.");
	return buf_take(&out);
}

static void
num(struct buf *out, double v)
{
	if (isinf(v))
		buf_add(out, "null");
	else
		json_put_number(out, v);
}

static char *
json(const struct mc_result *r, const struct bench *b, const struct tol_args *a)
{
	struct buf out;
	char x[200];

	buf_init(&out);
	buf_add(&out, "{\n  \"bench\": ");
	json_put_string(&out, b->name);
	buf_add(&out, ",\n  \"point\": ");
	if (a->point != NULL)
		json_put_string(&out, a->point);
	else
		buf_add(&out, "null");
	buf_printf(&out, ",\n  \"seed\": %llu, \"samples\": %zu, \"done\": %zu, "
	    "\"stopped\": %s,\n  \"max_risk\": ", (unsigned long long)r->seed, r->asked,
	    r->done, r->stopped ? "true" : "false");
	num(&out, a->max_risk);
	buf_printf(&out, ", \"ghosts\": %s", r->no_ghosts ? "false" : "true");
	buf_add(&out, ",\n  \"tolerances\": [");
	for (size_t p = 0; p < r->nparam; p++) {
		buf_add(&out, p ? ",\n    " : "\n    ");
		buf_add(&out, "{\"name\": ");
		json_put_string(&out, r->param[p].name);
		param_text(x, sizeof x, &r->param[p]);
		buf_add(&out, ", \"text\": ");
		json_put_string(&out, x);
		buf_printf(&out, ", \"shape\": \"%s\", \"nominal\": ",
		    r->param[p].t.uniform ? "uniform" : "normal");
		num(&out, r->param[p].nominal);
		buf_add(&out, ", \"width\": ");
		num(&out, r->param[p].width);
		buf_add(&out, "}");
	}
	buf_add(&out, "],\n  \"elements\": [");
	for (size_t j = 0; j < r->nrated; j++) {
		const struct mc_elem *e = &r->el[j];
		const double v[] = { e->nominal, e->p_over, e->se_over, e->p_caution,
		    e->se_caution, e->median, e->p95 };
		const char *k[] = { "nominal_ratio", "p_over", "se_over", "p_caution",
		    "se_caution", "median_ratio", "p95_ratio" };

		buf_add(&out, j ? ",\n    {\"id\": " : "\n    {\"id\": ");
		json_put_string(&out, e->id);
		for (size_t i = 0; i < sizeof v / sizeof *v; i++) {
			buf_printf(&out, ", \"%s\": ", k[i]);
			num(&out, v[i]);
		}
		buf_add(&out, ", \"drivers\": [");
		for (size_t s = 0; s < e->nsens; s++) {
			buf_add(&out, s ? ", {\"tolerance\": " : "{\"tolerance\": ");
			json_put_string(&out, r->param[e->sens[s].param].name);
			buf_add(&out, ", \"r\": ");
			num(&out, e->sens[s].r);
			buf_add(&out, "}");
		}
		buf_add(&out, "]}");
	}
	buf_add(&out, "],\n  \"p_any_over\": ");
	num(&out, r->p_any);
	buf_add(&out, ", \"se_any_over\": ");
	num(&out, r->se_any);
	buf_add(&out, ",\n  \"safe_source_power_p5\": ");
	num(&out, r->safe_p5);
	buf_add(&out, ", \"safe_source_power\": ");
	num(&out, r->nominal_safe);
	buf_printf(&out, ",\n  \"over_risk\": %s\n}\n", r->p_any > a->max_risk ? "true" : "false");
	return buf_take(&out);
}

static char *
csv(const struct mc_result *r)
{
	struct buf out;

	buf_init(&out);
	buf_add(&out, "id,nominal_ratio,p_over,se_over,p_caution,se_caution,median_ratio,"
	    "p95_ratio\n");
	for (size_t j = 0; j < r->nrated; j++) {
		const struct mc_elem *e = &r->el[j];
		const double v[] = { e->nominal, e->p_over, e->se_over, e->p_caution,
		    e->se_caution, e->median, e->p95 };

		buf_add(&out, e->id);
		for (size_t i = 0; i < sizeof v / sizeof *v; i++) {
			buf_addc(&out, ',');
			json_put_number(&out, v[i]);
		}
		buf_addc(&out, '\n');
	}
	buf_add(&out, "(any),,");
	json_put_number(&out, r->p_any);
	buf_addc(&out, ',');
	json_put_number(&out, r->se_any);
	buf_add(&out, ",,,,\n");
	return buf_take(&out);
}

static int
whole(const char *opt, const char *val, unsigned long long lo, unsigned long long hi,
    unsigned long long *out)
{
	char *end;
	unsigned long long n;

	n = strtoull(val, &end, 10);
	if (*val == '\0' || *end != '\0' || val[0] == '-' || val[0] == '+' || n < lo || n > hi)
		return cmd_usage("tolerance: %s must be a whole number %llu .. %llu, not '%s'",
		    opt, lo, hi, val);
	*out = n;
	return 0;
}

static int
parse_args(int argc, char **argv, struct tol_args *a)
{
	long cores = sysconf(_SC_NPROCESSORS_ONLN);

	memset(a, 0, sizeof *a);
	a->samples = 10000;
	a->seed = 1;
	a->threads = cores > 0 ? (unsigned)cores : 1;
	a->max_risk = 0.01;
	a->fmt = REPORT_TABLE;
	for (int i = 1; i < argc; i++) {
		const char *s = argv[i], *val = NULL;
		unsigned long long n;

		if (strncmp(s, "--", 2) != 0 || s[2] == '\0') {
			if (a->ref != NULL || a->demo)
				return cmd_usage("tolerance: '%s' is extra", s);
			a->ref = s;
			continue;
		}
		if (strcmp(s, "--demo") == 0) {
			if (a->ref != NULL)
				return cmd_usage("tolerance: give BENCH, FILE or --demo, not both");
			a->demo = 1;
			continue;
		}
		if (strcmp(s, "--no-ghosts") == 0) {
			a->no_ghosts = 1;
			continue;
		}
		if (strcmp(s, "--help") == 0) {
			printf("Usage: " PROG " tolerance BENCH[@SETUP] | FILE | --demo [--samples N]\n"
			    "       [--seed S] [--point NAME] [--format table|json|csv]\n"
			    "       [--max-risk P] [--threads N] [--no-ghosts]\n"
			    "Draws every tolerance of the bench at once (\"250 mm ± 2 mm\",\n"
			    "\"2 W ± 5 %%\", \"... uniform\"; beamledger-bench(5)) N times (default\n"
			    "10000, at most %d) and traces each sample: per rated element the\n"
			    "chance of over and of caution with their standard errors, the median\n"
			    "and 95th-percentile ratio; the chance that anything is over; the 5th\n"
			    "percentile of the safe source power; and for the worst elements the\n"
			    "tolerances whose draws correlate most with their ratio.  The same\n"
			    "seed (default 1) gives the same numbers with any number of threads\n"
			    "(default: every core).  P is a fraction or a percentage (default 1 %%).\n"
			    "Ctrl-C stops and reports the samples done so far.  --no-ghosts\n"
			    "traces the main beam alone (no surface reflections in any ratio:\n"
			    "faster, and said so in the output).\n"
			    "Exit status: 0 the chance that anything is over is at most P, 1 above\n"
			    "P (or stopped early), 2 trouble.\n", MC_MAX_SAMPLES);
			return 1;
		}
		if ((val = strchr(s, '=')) != NULL)
			val++;
		else if (i + 1 < argc)
			val = argv[++i];
		if (val == NULL)
			return cmd_usage("tolerance: '%s' needs a value", s);
#define OPT(name) (strncmp(s, name, strlen(name)) == 0 && \
	(s[strlen(name)] == '\0' || s[strlen(name)] == '='))
		if (OPT("--samples")) {
			if (whole("--samples", val, 1, MC_MAX_SAMPLES, &n) != 0)
				return 2;
			a->samples = (size_t)n;
		} else if (OPT("--seed")) {
			if (whole("--seed", val, 0, UINT64_MAX, &n) != 0)
				return 2;
			a->seed = n;
		} else if (OPT("--threads")) {
			if (whole("--threads", val, 1, 256, &n) != 0)
				return 2;
			a->threads = (unsigned)n;
		} else if (OPT("--point")) {
			a->point = val;
		} else if (OPT("--format")) {
			if (report_format_parse(val, &a->fmt) != 0)
				return cmd_usage("tolerance: --format must be table, json or csv, "
				    "not '%s'", val);
		} else if (OPT("--max-risk")) {
			char *end;
			double p = strtod(val, &end);

			while (*end == ' ')
				end++;
			if (*end == '%') {
				p /= 100;
				end++;
			}
			if (end == val || *end != '\0' || !(p >= 0 && p <= 1))
				return cmd_usage("tolerance: --max-risk must be a probability "
				    "0 .. 1 or 0 .. 100 %%, not '%s'", val);
			a->max_risk = p;
		} else {
			return cmd_usage("tolerance: unknown option '%s'", s);
		}
#undef OPT
	}
	if (a->ref == NULL && !a->demo)
		return cmd_usage("tolerance: give BENCH[@SETUP], FILE or --demo");
	return 0;
}

int
cmd_tolerance(struct cmd_ctx *ctx, int argc, char **argv)
{
	struct tol_args a;
	struct mc_result r;
	struct mc_opts o;
	struct progress pr;
	struct sigaction sa, old;
	struct bench *w;
	char *cause = NULL, *text;
	int rc;

	if ((rc = parse_args(argc, argv, &a)) != 0)
		return rc == 1 ? 0 : rc;
	if ((w = cmd_bench_at_point(ctx, a.demo, a.ref, a.point, &cause)) == NULL)
		return cause != NULL ? cmd_fail(cause) : 2;
	memset(&o, 0, sizeof o);
	o.samples = a.samples;
	o.seed = a.seed;
	o.threads = a.threads;
	o.no_ghosts = a.no_ghosts;
	o.stop = &interrupted;
	o.progress = on_progress;
	o.arg = &pr;
	memset(&pr, 0, sizeof pr);
	clock_gettime(CLOCK_MONOTONIC, &pr.start);
	pr.tty = isatty(STDERR_FILENO);
	interrupted = 0;
	memset(&sa, 0, sizeof sa);
	sa.sa_handler = on_sigint;
	sigemptyset(&sa.sa_mask);
	sigaction(SIGINT, &sa, &old);
	rc = mc_run(w, &o, &r, &cause);
	sigaction(SIGINT, &old, NULL);
	if (pr.shown)
		fprintf(stderr, "\r\033[K");
	if (rc != 0) {
		model_bench_free(w);
		return cmd_fail(cause);
	}
	if (r.done == 0) {
		mc_result_release(&r);
		model_bench_free(w);
		fprintf(stderr, PROG ": tolerance: stopped before any sample was done\n");
		return 2;
	}
	text = a.fmt == REPORT_JSON ? json(&r, w, &a) : a.fmt == REPORT_CSV ? csv(&r) :
	    table(&r, w, &a);
	rc = cmd_print(text);
	free(text);
	if (rc == 0 && r.stopped)
		fprintf(stderr, PROG ": tolerance: stopped: %zu of %zu samples done\n",
		    r.done, r.asked);
	rc = rc != 0 ? rc : (r.p_any > a.max_risk || r.stopped);
	mc_result_release(&r);
	model_bench_free(w);
	return rc;
}
