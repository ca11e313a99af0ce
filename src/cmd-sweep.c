/* cmd-sweep.c - `beamledger sweep`: one knob of a bench (or of one of its
 * operating points) over a range; per step the worst element, every rated
 * ratio and the power into every terminator; then the crossings, the safe
 * intervals and a plot.  Nothing reaches stdout unless the sweep ran. */
#include <config.h>

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "bench-demo.h"
#include "bench-file.h"
#include "cmd.h"
#include "core-layout.h"
#include "core-point.h"
#include "core-sweep.h"
#include "report.h"
#include "util-buf.h"
#include "util-err.h"
#include "util-json.h"

struct sweep_args {
	const char *ref, *knob, *from, *to, *point;
	size_t      steps;
	int         log, demo, no_ghosts;
	enum report_format fmt;
};

static void
value_text(char *buf, size_t n, const struct sweep_knob *k, double v, int sig)
{
	if (k->angle)
		snprintf(buf, n, "%.*g°", sig, v);
	else if (k->dim == DIM_NONE)
		snprintf(buf, n, "%.*g", sig, v);
	else
		units_format(buf, n, v, k->dim, sig, 0);
}

/* The table's and the workbench's percent form ("<0.01 %", "0.91 %",
 * "128 %"), so a sweep reads as the trace does. */
static void
ratio_text(char *buf, size_t n, double r)
{
	layout_percent(buf, n, r);
}

static const char series_mark[] = "*+ox#@%&";

static void
plot(struct buf *out, const struct sweep *sw, const struct sweep_knob *k, double sf)
{
	struct sweep_plot p;
	char a[64], b[64];

	sweep_plot_layout(sw, sf, 60, 12, 4, &p);
	if (p.nseries == 0) {
		sweep_plot_release(&p);
		return;
	}
	buf_add(out, "\nRatio against the knob ('=' over, '-' caution):\n");
	for (size_t r = 0; r < p.h; r++) {
		double y = p.ymax * (1 - (double)r / (double)(p.h - 1));

		if (r == 0 || r == p.h - 1 || r == p.h / 2)
			buf_printf(out, "%6.0f%% |", 100 * y);
		else
			buf_add(out, "        |");
		for (size_t c = 0; c < p.w; c++) {
			unsigned char v = p.cell[r * p.w + c];

			buf_addc(out, v == 0 ? ' ' : v == SWEEP_PLOT_OVER ? '=' :
			    v == SWEEP_PLOT_CAUTION ? '-' : series_mark[v - 1]);
		}
		buf_addc(out, '\n');
	}
	value_text(a, sizeof a, k, sw->x[0], 4);
	value_text(b, sizeof b, k, sw->x[sw->nsteps - 1], 4);
	buf_printf(out, "        +%.*s\n         %-*s%s\n", (int)p.w,
	    "------------------------------------------------------------------------",
	    (int)p.w - (int)strlen(b), a, b);
	buf_add(out, "         ");
	for (size_t q = 0; q < p.nseries; q++)
		buf_printf(out, "%s%c %s", q ? "   " : "", series_mark[q],
		    sw->rated[p.series[q]].id);
	buf_addc(out, '\n');
	sweep_plot_release(&p);
}

static void
intervals_text(struct buf *out, const char *what, const struct sweep_interval *iv,
    size_t n, const struct sweep_knob *k)
{
	char a[64], b[64];

	buf_printf(out, "%-28s", what);
	if (n == 0)
		buf_add(out, " none");
	for (size_t i = 0; i < n; i++) {
		value_text(a, sizeof a, k, iv[i].lo, 7);
		value_text(b, sizeof b, k, iv[i].hi, 7);
		buf_printf(out, "%s %s .. %s", i ? "," : "", a, b);
	}
	buf_addc(out, '\n');
}

static char *
table(const struct sweep *sw, const struct sweep_knob *k, const struct bench *b,
    const struct sweep_args *a)
{
	struct buf out;
	char v[64];

	buf_init(&out);
	buf_printf(&out, "Sweep of %s on bench %s%s%s: %s .. %s, %zu steps%s\n", k->text,
	    b->name, a->point != NULL ? ", point " : "", a->point != NULL ? a->point : "",
	    a->from, a->to, sw->nsteps, a->log ? " (log)" : "");
	if (a->no_ghosts)
		buf_add(&out, "Main beam only (--no-ghosts): surface reflections are not in "
		    "these ratios.\n");
	buf_printf(&out, "%12s  %-10s %7s  %-8s", "value", "worst", "ratio", "status");
	for (size_t i = 0; i < sw->nrated; i++)
		buf_printf(&out, " %8s", sw->rated[i].id);
	for (size_t i = 0; i < sw->nterm; i++)
		buf_printf(&out, " %10s", sw->term_id[i]);
	buf_add(&out, "  flags\n");
	for (size_t s = 0; s < sw->nsteps; s++) {
		long w = sw->worst[s];

		value_text(v, sizeof v, k, sw->x[s], 4);
		buf_printf(&out, "%*s%s  %-10s", 12 - (int)utf8_cols(v) > 0 ?
		    12 - (int)utf8_cols(v) : 0, "", v, w >= 0 ? sw->rated[w].id : "-");
		ratio_text(v, sizeof v, w >= 0 ? sw->ratio[s * sw->nrated + (size_t)w] : NAN);
		buf_printf(&out, " %7s  %-8s", v, sw->status[s] == STATUS_OVER ? "OVER" :
		    damage_status_name(sw->status[s]));
		for (size_t i = 0; i < sw->nrated; i++) {
			ratio_text(v, sizeof v, sw->ratio[s * sw->nrated + i]);
			buf_printf(&out, " %8s", v);
		}
		for (size_t i = 0; i < sw->nterm; i++) {
			units_format(v, sizeof v, sw->term_power[s * sw->nterm + i], DIM_POWER, 3, 0);
			buf_printf(&out, " %10s", v);
		}
		buf_printf(&out, "  %s%s%s\n", sw->unterminated[s] ? "unterminated" : "",
		    sw->unterminated[s] && sw->breakdown[s] ? "," : "",
		    sw->breakdown[s] ? "air_breakdown" : "");
	}
	buf_add(&out, "\nWhere each rated element first reaches caution and over:\n");
	for (size_t i = 0; i < sw->nrated; i++) {
		size_t start = out.len;
		char c[64], o[64];

		if (isnan(sw->rated[i].caution) && isnan(sw->rated[i].over))
			continue;
		value_text(c, sizeof c, k, sw->rated[i].caution, 7);
		value_text(o, sizeof o, k, sw->rated[i].over, 7);
		buf_printf(&out, "  %-10s caution at %s", sw->rated[i].id, c);
		buf_pad(&out, 40, start);
		buf_printf(&out, "  %s%s\n", isnan(sw->rated[i].over) ? "never over" : "over at ",
		    isnan(sw->rated[i].over) ? "" : o);
	}
	intervals_text(&out, "Safe (nothing over):", sw->safe, sw->nsafe, k);
	intervals_text(&out, "Calm (nothing at caution):", sw->calm, sw->ncalm, k);
	plot(&out, sw, k, b->safety_factor);
	buf_printf(&out, "\n%s\n", sw->any_over ? "Something is OVER in this range." :
	    "Nothing is over in this range.");
	return buf_take(&out);
}

static void
num(struct buf *out, double v)
{
	json_put_number(out, v);
}

static char *
json(const struct sweep *sw, const struct sweep_knob *k, const struct bench *b,
    const struct sweep_args *a)
{
	struct buf out;

	buf_init(&out);
	buf_add(&out, "{\n  \"bench\": ");
	json_put_string(&out, b->name);
	buf_add(&out, ",\n  \"point\": ");
	if (a->point != NULL)
		json_put_string(&out, a->point);
	else
		buf_add(&out, "null");
	buf_add(&out, ",\n  \"knob\": ");
	json_put_string(&out, k->text);
	buf_printf(&out, ",\n  \"unit\": \"%s\", \"log\": %s, \"ghosts\": %s, \"steps\": %zu,\n"
	    "  \"rows\": [\n", k->angle ? "deg" : k->dim == DIM_NONE ? "" : units_dim_name(k->dim),
	    a->log ? "true" : "false", a->no_ghosts ? "false" : "true", sw->nsteps);
	for (size_t s = 0; s < sw->nsteps; s++) {
		long w = sw->worst[s];

		buf_add(&out, "    {\"value\": ");
		num(&out, sw->x[s]);
		buf_add(&out, ", \"worst\": ");
		if (w >= 0)
			json_put_string(&out, sw->rated[w].id);
		else
			buf_add(&out, "null");
		buf_printf(&out, ", \"status\": \"%s\", \"ratios\": {", damage_status_name(sw->status[s]));
		for (size_t i = 0; i < sw->nrated; i++) {
			buf_add(&out, i ? ", " : "");
			json_put_string(&out, sw->rated[i].id);
			buf_add(&out, ": ");
			num(&out, sw->ratio[s * sw->nrated + i]);
		}
		buf_add(&out, "}, \"power\": {");
		for (size_t i = 0; i < sw->nterm; i++) {
			buf_add(&out, i ? ", " : "");
			json_put_string(&out, sw->term_id[i]);
			buf_add(&out, ": ");
			num(&out, sw->term_power[s * sw->nterm + i]);
		}
		buf_printf(&out, "}, \"unterminated\": %s, \"air_breakdown\": %s}%s\n",
		    sw->unterminated[s] ? "true" : "false", sw->breakdown[s] ? "true" : "false",
		    s + 1 < sw->nsteps ? "," : "");
	}
	buf_add(&out, "  ],\n  \"crossings\": [");
	for (size_t i = 0; i < sw->nrated; i++) {
		buf_add(&out, i ? ",\n    {\"id\": " : "\n    {\"id\": ");
		json_put_string(&out, sw->rated[i].id);
		buf_add(&out, ", \"caution\": ");
		num(&out, sw->rated[i].caution);
		buf_add(&out, ", \"over\": ");
		num(&out, sw->rated[i].over);
		buf_add(&out, "}");
	}
	for (int l = 0; l < 2; l++) {
		const struct sweep_interval *iv = l ? sw->calm : sw->safe;
		size_t n = l ? sw->ncalm : sw->nsafe;

		buf_printf(&out, "\n  ],\n  \"%s\": [", l ? "calm" : "safe");
		for (size_t i = 0; i < n; i++) {
			buf_add(&out, i ? ", [" : "[");
			num(&out, iv[i].lo);
			buf_add(&out, ", ");
			num(&out, iv[i].hi);
			buf_add(&out, "]");
		}
	}
	buf_printf(&out, "],\n  \"over\": %s\n}\n", sw->any_over ? "true" : "false");
	return buf_take(&out);
}

static char *
csv(const struct sweep *sw)
{
	struct buf out;
	char v[40];

	buf_init(&out);
	buf_add(&out, "value,worst,status");
	for (size_t i = 0; i < sw->nrated; i++)
		buf_printf(&out, ",ratio:%s", sw->rated[i].id);
	for (size_t i = 0; i < sw->nterm; i++)
		buf_printf(&out, ",power_W:%s", sw->term_id[i]);
	buf_add(&out, ",unterminated,air_breakdown\n");
	for (size_t s = 0; s < sw->nsteps; s++) {
		fmt_exact(v, sizeof v, sw->x[s]);
		buf_printf(&out, "%s,%s,%s", v, sw->worst[s] >= 0 ? sw->rated[sw->worst[s]].id : "",
		    damage_status_name(sw->status[s]));
		for (size_t i = 0; i < sw->nrated; i++) {
			double r = sw->ratio[s * sw->nrated + i];

			fmt_exact(v, sizeof v, r);
			buf_printf(&out, ",%s", isnan(r) ? "" : v);
		}
		for (size_t i = 0; i < sw->nterm; i++) {
			fmt_exact(v, sizeof v, sw->term_power[s * sw->nterm + i]);
			buf_printf(&out, ",%s", v);
		}
		buf_printf(&out, ",%d,%d\n", sw->unterminated[s], sw->breakdown[s]);
	}
	return buf_take(&out);
}

static int
parse_args(int argc, char **argv, struct sweep_args *a)
{
	const char *ops[4];
	int nops = 0;

	memset(a, 0, sizeof *a);
	a->steps = 101;
	a->fmt = REPORT_TABLE;
	for (int i = 1; i < argc; i++) {
		const char *s = argv[i], *val = NULL;

		if (strncmp(s, "--", 2) != 0 || s[2] == '\0') {
			if (nops == 4)
				return cmd_usage("sweep: '%s' is extra", s);
			ops[nops++] = s;
			continue;
		}
		if (strcmp(s, "--log") == 0) {
			a->log = 1;
			continue;
		}
		if (strcmp(s, "--demo") == 0) {
			a->demo = 1;
			continue;
		}
		if (strcmp(s, "--no-ghosts") == 0) {
			a->no_ghosts = 1;
			continue;
		}
		if (strcmp(s, "--help") == 0) {
			printf("Usage: " PROG " sweep BENCH[@SETUP] | FILE | --demo KNOB FROM TO [--steps N]\n"
			    "       [--log] [--point NAME] [--format table|json|csv] [--no-ghosts]\n"
			    "KNOB is ID.KEY, source.KEY, or ID1.length~ID2.length (a rail: the\n"
			    "element between the two gaps slides, their sum fixed).  FROM and TO\n"
			    "take the knob's unit (\"20 mW\"; angles in degrees).  N steps\n"
			    "(default 101), evenly or with --log in equal ratios.  --no-ghosts\n"
			    "traces the main beam alone (no surface reflections; said so).\n"
			    "Exit status: 0 nothing over anywhere in the range, 1 something over,\n"
			    "2 trouble.\n");
			return 1;
		}
		if ((val = strchr(s, '=')) != NULL)
			val++;
		else if (i + 1 < argc)
			val = argv[++i];
		if (val == NULL)
			return cmd_usage("sweep: '%s' needs a value", s);
		if (strncmp(s, "--steps", 7) == 0 && (s[7] == '\0' || s[7] == '=')) {
			char *end;
			unsigned long n = strtoul(val, &end, 10);

			if (*val == '\0' || *end != '\0' || val[0] == '-' || n > 1000000)
				return cmd_usage("sweep: --steps must be a whole number of steps, "
				    "2 .. 1000000, not '%s'", val);
			a->steps = n;
		} else if (strncmp(s, "--point", 7) == 0 && (s[7] == '\0' || s[7] == '=')) {
			a->point = val;
		} else if (strncmp(s, "--format", 8) == 0 && (s[8] == '\0' || s[8] == '=')) {
			if (report_format_parse(val, &a->fmt) != 0)
				return cmd_usage("sweep: --format must be table, json or csv, not '%s'", val);
		} else {
			return cmd_usage("sweep: unknown option '%s'", s);
		}
	}
	if (nops != (a->demo ? 3 : 4))
		return cmd_usage("sweep: give %sKNOB FROM TO", a->demo ? "" : "BENCH or FILE, ");
	if (!a->demo)
		a->ref = ops[0];
	a->knob = ops[a->demo ? 0 : 1];
	a->from = ops[a->demo ? 1 : 2];
	a->to = ops[a->demo ? 2 : 3];
	return 0;
}

int
cmd_sweep(struct cmd_ctx *ctx, int argc, char **argv)
{
	struct sweep_args a;
	struct sweep_knob k;
	struct sweep *sw = NULL;
	struct bench *w;
	char *cause = NULL, *text;
	double from, to;
	int rc;

	if ((rc = parse_args(argc, argv, &a)) != 0)
		return rc == 1 ? 0 : rc;
	if ((w = cmd_bench_at_point(ctx, a.demo, a.ref, a.point, &cause)) == NULL)
		return cause != NULL ? cmd_fail(cause) : 2;
	if (sweep_knob_parse(w, a.knob, &k, &cause) != 0) {
		model_bench_free(w);
		return cmd_fail(cause);
	}
	if (sweep_knob_value(&k, a.from, &from, &cause) != 0 ||
	    sweep_knob_value(&k, a.to, &to, &cause) != 0 ||
	    (sw = sweep_run(w, &k, from, to, a.steps,
	    (a.log ? SWEEP_LOG : 0) | (a.no_ghosts ? SWEEP_NO_GHOSTS : 0), &cause)) == NULL) {
		sweep_knob_release(&k);
		model_bench_free(w);
		return cmd_fail(cause);
	}
	text = a.fmt == REPORT_JSON ? json(sw, &k, w, &a) : a.fmt == REPORT_CSV ? csv(sw) :
	    table(sw, &k, w, &a);
	rc = cmd_print(text);
	free(text);
	rc = rc != 0 ? rc : sw->any_over;
	sweep_free(sw);
	sweep_knob_release(&k);
	model_bench_free(w);
	return rc;
}
