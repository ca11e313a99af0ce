/* check_layout_tol.c - the workbench's tolerance layout: values shown with
 * their tolerance (and read back by the editor), the screen's sample
 * count, probabilities with their error or bound, stacked bars, the
 * histogram's bins, cells and axis, the drivers, the unrated note and the
 * how-to whose examples the parser must take.  Expected values are worked
 * by hand in the comments or computed independently here. */
#include <config.h>

#include <check.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "core-edit.h"
#include "core-layout-tol.h"
#include "core-layout.h"
#include "core-mc.h"
#include "core-tol.h"
#include "core-trace.h"
#include "util-buf.h"
#include "util-err.h"

#include "check-bench-util.h"
#include "check-util.h"

#define PM "\xc2\xb1"               /* ± */
#define LOOP(tc, fn, arr) tcase_add_loop_test(tc, fn, 0, (int)(sizeof arr / sizeof *arr))

/* 1 W CW through a 100 mm gap into a 1.1 W dump (rated by max_power, so
 * its ratio is P/1.1 W whatever the gap), then a lens and a second gap. */
#define DUMP_BENCH \
	"{ 'format': 'beamledger-bench-1', 'name': 'dump', 'safety_factor': 2," \
	"  'source': { 'wavelength': '1064 nm', 'power': '1 W%s', 'waist': '1 mm' }," \
	"  'path': [ { 'id': 'S0', 'type': 'space', 'length': '100 mm%s' }," \
	"            { 'id': 'L1', 'type': 'lens', 'focal': '250 mm' }," \
	"            { 'id': 'S1', 'type': 'space', 'length': '50 mm' }," \
	"            { 'id': 'BD1', 'type': 'dump', 'max_power': '1.1 W' } ] }"

static int
all_ascii(const char *s)
{
	for (; *s != '\0'; s++)
		if ((unsigned char)*s >= 0x80)
			return 0;
	return 1;
}

static struct element *
find(struct bench *b, const char *id)
{
	struct element *el = model_find(b, id, NULL, NULL, NULL);

	ck_assert_msg(el != NULL, "no element %s", id);
	return el;
}

static void
run(const struct bench *b, size_t n, struct mc_result *r)
{
	struct mc_opts o;
	char *cause = NULL;

	memset(&o, 0, sizeof o);
	o.samples = n;
	o.seed = 7;
	o.threads = 2;
	o.keep_ratios = 1;
	ck_assert_msg(mc_run(b, &o, r, &cause) == 0, "%s", cause);
}

/* ---- values with their tolerance ---- */

START_TEST(test_value_with_tol)
{
	struct bench *b = bench_text("dump", DUMP_BENCH, "", "");
	struct bench *c = bench_text("dump", DUMP_BENCH, "", "");
	char *cause = NULL, *v, *w;

	ck_assert_msg(edit_set(b, "L1", "focal", "250 mm " PM " 2 mm", &cause) == 0, "%s", cause);
	v = layout_value_text(find(b, "L1"), K_FOCAL);
	ck_assert_str_eq(v, "250 mm " PM " 2 mm");
	/* what the pane shows, the editor reads back to the same value and
	 * tolerance */
	ck_assert_msg(edit_set(c, "L1", "focal", v, &cause) == 0, "%s", cause);
	w = layout_value_text(find(c, "L1"), K_FOCAL);
	ck_assert_str_eq(w, v);
	ck_assert_double_eq(tol_of(find(c, "L1"), K_FOCAL)->amount, 2e-3);
	free(v);
	free(w);
	/* a value without one is shown as before */
	v = layout_value_text(find(b, "S1"), K_LENGTH);
	ck_assert_str_eq(v, "50 mm");
	free(v);
	/* uniform and relative */
	ck_assert(edit_set(b, "S1", "length", "50 mm +- 1 % uniform", &cause) == 0);
	v = layout_value_text(find(b, "S1"), K_LENGTH);
	ck_assert_str_eq(v, "50 mm " PM " 1 % uniform");
	free(v);
	model_bench_free(b);
	model_bench_free(c);
}
END_TEST

START_TEST(test_source_with_tol)
{
	struct bench *b = bench_text("dump", DUMP_BENCH, "", "");
	struct bench *c = bench_text("dump", DUMP_BENCH, "", "");
	char *cause = NULL, *v, *w;

	v = layout_bench_value_text(b, "source.power");
	ck_assert_str_eq(v, "1 W");
	free(v);
	ck_assert_msg(edit_set_bench(b, "source.power", "2 W " PM " 5 %", &cause) == 0, "%s", cause);
	v = layout_bench_value_text(b, "source.power");
	ck_assert_str_eq(v, "2 W " PM " 5 %");
	free(v);
	/* a pair: each value with its own, and back through the editor */
	ck_assert_msg(edit_set_bench(b, "source.waist", "3 mm " PM " 0.1 mm, 2 mm " PM " 0.2 mm",
	    &cause) == 0, "%s", cause);
	v = layout_bench_value_text(b, "source.waist");
	/* each amount in its shortest unit (tol_format) */
	ck_assert_str_eq(v, "3 mm " PM " 100 \xc2\xb5m, 2 mm " PM " 200 \xc2\xb5m");
	ck_assert_msg(edit_set_bench(c, "source.waist", v, &cause) == 0, "%s", cause);
	w = layout_bench_value_text(c, "source.waist");
	ck_assert_str_eq(w, v);
	free(v);
	free(w);
	/* a key that takes no tolerance stays as it was */
	v = layout_bench_value_text(b, "source.wavelength");
	ck_assert_str_eq(v, "1.064 \xc2\xb5m");
	free(v);
	model_bench_free(b);
	model_bench_free(c);
}
END_TEST

START_TEST(test_inherited)
{
	struct bench *b = bench_text("dump", DUMP_BENCH, "", "");
	char *cause = NULL, *t, name[64], *v;

	ck_assert(tol_default_set(b, "space.length", PM " 1 mm", &cause) == 0);
	t = layout_tol_inherited(b, find(b, "S0"), K_LENGTH, name, sizeof name);
	ck_assert_str_eq(t, PM " 1 mm");
	ck_assert_str_eq(name, "space.length");
	free(t);
	/* not the field's own text: the editor starts without it */
	v = layout_value_text(find(b, "S0"), K_LENGTH);
	ck_assert_str_eq(v, "100 mm");
	free(v);
	/* a lens has no such default */
	ck_assert_ptr_null(layout_tol_inherited(b, find(b, "L1"), K_FOCAL, name, sizeof name));
	/* its own replaces it */
	ck_assert(edit_set(b, "S0", "length", "100 mm " PM " 3 mm", &cause) == 0);
	ck_assert_ptr_null(layout_tol_inherited(b, find(b, "S0"), K_LENGTH, name, sizeof name));
	model_bench_free(b);
}
END_TEST

static const struct {
	const char *value, *inh, *name;
	int         cols;
	const char *want;
} fit_cases[] = {
	{ "250 mm " PM " 2 mm", NULL, NULL, 20, "250 mm " PM " 2 mm" },
	{ "250 mm " PM " 2 mm", NULL, NULL, 12, "250 mm " PM "2 mm" },
	{ "250 mm " PM " 2 mm", NULL, NULL, 10, "250" PM "2 mm" },
	{ "250 mm " PM " 2 mm", NULL, NULL, 3, "250" PM "2 mm" },      /* the shortest */
	{ "2 W " PM " 5 %", NULL, NULL, 8, "2 W " PM "5 %" },          /* units differ */
	{ "2 W " PM " 5 %", NULL, NULL, 4, "2 W " PM "5 %" },
	{ "1 (default)", NULL, NULL, 5, "1 (default)" },               /* no tolerance */
	{ "300 mm", PM " 2 mm", "space.length", 40, "300 mm (" PM " 2 mm for every space.length)" },
	{ "300 mm", PM " 2 mm", "space.length", 25, "300 mm (" PM " 2 mm, bench)" },
	{ "300 mm", PM " 2 mm", "space.length", 15, "300 mm (" PM "2 mm)" },
	{ "300 mm", PM " 2 mm", "space.length", 11, "300 (" PM "2) mm" },
	{ "300 mm", PM " 1 %", "*.length", 11, "300 mm (" PM "1 %)" }, /* no shared unit */
};

START_TEST(test_fit_value)
{
	char buf[256];

	layout_tol_fit_value(buf, sizeof buf, fit_cases[_i].value, fit_cases[_i].inh,
	    fit_cases[_i].name, fit_cases[_i].cols, 0);
	ck_assert_str_eq(buf, fit_cases[_i].want);
}
END_TEST

/* In ASCII the sign takes two columns ("+-"): "250 mm +-2 mm" is 13 wide,
 * so 12 columns take the shorter form. */
START_TEST(test_fit_value_ascii)
{
	char buf[256];

	layout_tol_fit_value(buf, sizeof buf, "250 mm " PM " 2 mm", NULL, NULL, 13, 1);
	ck_assert_str_eq(buf, "250 mm " PM "2 mm");
	layout_tol_fit_value(buf, sizeof buf, "250 mm " PM " 2 mm", NULL, NULL, 12, 1);
	ck_assert_str_eq(buf, "250" PM "2 mm");
}
END_TEST

START_TEST(test_edit_hint)
{
	char *h = layout_tol_edit_hint(K_FOCAL, NULL, 0), *e;
	struct bench *b = bench_text("dump", DUMP_BENCH, "", "");
	char *cause = NULL;

	ck_assert_ptr_nonnull(strstr(h, "\"" PM " 2 mm\""));
	/* the example it gives is taken by the editor */
	e = xasprintf("250 mm %s", strstr(h, PM " 2 mm"));
	e[strlen("250 mm " PM " 2 mm")] = '\0';
	ck_assert_msg(edit_set(b, "L1", "focal", e, &cause) == 0, "%s", cause);
	free(e);
	free(h);
	h = layout_tol_edit_hint(K_FOCAL, NULL, 1);
	ck_assert(all_ascii(h));
	ck_assert_ptr_nonnull(strstr(h, "+- 2 mm"));
	free(h);
	h = layout_tol_edit_hint(K_POLARIZING, NULL, 0);      /* a yes/no takes none */
	ck_assert_str_eq(h, "");
	free(h);
	h = layout_tol_edit_hint(-1, "source.power", 0);
	ck_assert_ptr_nonnull(strstr(h, PM " 5 %"));
	free(h);
	h = layout_tol_edit_hint(-1, "name", 0);
	ck_assert_str_eq(h, "");
	free(h);
	/* the short form fits under the box at 80 columns (30 wide) */
	h = layout_tol_edit_short(K_FOCAL, NULL, 0);
	ck_assert_str_eq(h, "+ tolerance: " PM " 2 mm [uniform]");
	ck_assert_int_le((int)utf8_cols(h), 30);
	free(h);
	h = layout_tol_edit_short(-1, "source.pulse_energy", 1);
	ck_assert_str_eq(h, "+ tolerance: +- 5 % [uniform]");
	free(h);
	h = layout_tol_edit_short(K_POLARIZING, NULL, 0);
	ck_assert_str_eq(h, "");
	free(h);
	model_bench_free(b);
}
END_TEST

/* ---- the run ---- */

/* The rule as documented: 2000 up to 64 rows, halved per doubling beyond,
 * at least 250, doubled `more` times (at most 5). */
static const struct {
	size_t rows;
	int    more;
	size_t want;
} sample_cases[] = {
	{ 30, 0, 2000 }, { 64, 0, 2000 }, { 65, 0, 1000 }, { 128, 0, 1000 }, { 129, 0, 500 },
	{ 100000, 0, 250 }, { 30, 1, 4000 }, { 30, 5, 64000 }, { 30, 99, 64000 },
	{ 30, -1, 2000 }, { 100000, 2, 1000 },
};

START_TEST(test_samples)
{
	ck_assert_uint_eq(layout_tol_samples(sample_cases[_i].rows, sample_cases[_i].more),
	    sample_cases[_i].want);
}
END_TEST

/* Bounds: none of n lies below 1 − 0.05^(1/n) (one-sided 95 %), shown
 * rounded up to 2 digits: n = 4000 gives 0.074866 % → "<0.075 %" and all
 * of n ">99.925 %"; n = 250 gives 1.191 % → "<1.2 %", ">98.8 %". */
static const struct {
	double      p, se;
	size_t      n;
	int         exact;
	const char *want;
} prob_cases[] = {
	{ 0.915, 0.0044, 4000, 0, "91.5 " PM " 0.4 %" },
	{ 0.005, 0.0011, 4000, 0, "0.50 " PM " 0.11 %" },
	{ 0.995, 0.0011, 4000, 0, "99.50 " PM " 0.11 %" },
	{ 0, 0, 4000, 0, "<0.075 %" },
	{ 1, 0, 4000, 0, ">99.925 %" },
	{ 0, 0, 250, 0, "<1.2 %" },
	{ 1, 0, 250, 0, ">98.8 %" },
	{ 0, 0, 4000, 1, "0 %" },
	{ 1, 0, 4000, 1, "100 %" },
	{ NAN, NAN, 4000, 0, "-" },
};

START_TEST(test_prob)
{
	char buf[64], plain[64], want[64];

	layout_tol_prob_se(buf, sizeof buf, prob_cases[_i].p, prob_cases[_i].se, prob_cases[_i].n,
	    prob_cases[_i].exact);
	ck_assert_str_eq(buf, prob_cases[_i].want);
	/* without the error: the same figure, the "± x" left out */
	layout_tol_prob(plain, sizeof plain, prob_cases[_i].p, prob_cases[_i].n,
	    prob_cases[_i].exact);
	snprintf(want, sizeof want, "%s", prob_cases[_i].want);
	if (strstr(want, " " PM " ") != NULL)
		strcpy(strstr(want, " " PM " "), " %");
	ck_assert_str_eq(plain, want);
}
END_TEST

/* Very many samples: the standard error sqrt(p(1-p)/n) (binomial, from
 * memory) below the last digit shown.  1 of 603456 samples over:
 * p = 1.657e-6, se = 1.657e-6, 0.0001657 %; all but one: 99.9998343 %;
 * p = 0.959 of 600000: se = 0.000256, 0.026 %, below the 0.05 of one
 * decimal. */
static const struct {
	double      p, se;
	size_t      n;
	const char *want;
} tiny_se_cases[] = {
	{ 1.0 / 603456, 1.657e-6, 603456, "0.00017 %" },
	{ 1 - 1.0 / 603456, 1.657e-6, 603456, "99.99983 %" },
	{ 0.959, 0.000256, 600000, "95.9 %" },
	/* one decimal's worth of error is still given */
	{ 0.959, 0.001, 40000, "95.9 " PM " 0.1 %" },
	{ 0.00005, 0.00005, 20000, "0.01 " PM " 0.01 %" },
};

START_TEST(test_prob_tiny_se)
{
	char buf[64];

	layout_tol_prob_se(buf, sizeof buf, tiny_se_cases[_i].p, tiny_se_cases[_i].se,
	    tiny_se_cases[_i].n, 0);
	ck_assert_str_eq(buf, tiny_se_cases[_i].want);
	ck_assert_int_le((int)utf8_cols(buf), 13);      /* the table's column */
}
END_TEST

static const struct {
	double po, pc;
	int    w, over, caution;
} bar_cells[] = {
	{ 0, 0, 10, 0, 0 }, { 1, 0, 10, 10, 0 }, { 0, 1, 10, 0, 10 },
	{ 0.001, 0, 10, 1, 0 },         /* rare, still a cell */
	{ 0.99, 0, 10, 9, 0 },          /* likely, not shown as certain */
	{ 0, 0.0001, 10, 0, 1 },
	{ 0.5, 0.5, 10, 5, 5 }, { 0.3, 0.3, 10, 3, 3 },
	{ 0.915, 0.085, 13, 12, 1 },    /* 11.9 → 12 over, the rest caution */
	{ 0.4, 0.55, 10, 4, 5 },        /* 9.5 → 10 would leave no ok cell for 5 % ok */
	{ 0.5, 0, 1, 1, 0 }, { 0.2, 0.2, 0, 0, 0 }, { NAN, 0, 10, 0, 0 },
};

START_TEST(test_bar_cells)
{
	int o, c;

	layout_tol_bar_cells(bar_cells[_i].po, bar_cells[_i].pc, bar_cells[_i].w, &o, &c);
	ck_assert_int_eq(o, bar_cells[_i].over);
	ck_assert_int_eq(c, bar_cells[_i].caution);
	ck_assert_int_le(o + c, bar_cells[_i].w < 0 ? 0 : bar_cells[_i].w);
}
END_TEST

/* A run of the dump bench: the power's ± 10 % moves the dump's ratio, the
 * gap's ± 2 mm does not (max_power rates the power alone).  With only the
 * gap's tolerance every sample is the bench as written: exact figures. */
/* A run stopped early: the count done comes first in every form, and
 * the shorter forms are taken as the columns shrink. */
START_TEST(test_head_stopped)
{
	struct mc_result r;
	char *s;

	memset(&r, 0, sizeof r);
	r.seed = 3;
	r.asked = 400000;
	r.done = 107200;
	r.stopped = 1;
	r.nparam = 2;
	s = layout_tol_head(&r, 200);
	ck_assert_str_eq(s, "STOPPED after 107200 of 400000 samples; statistical estimates "
	    "from those (seed 3) of 2 tolerances; " PM " is one standard error");
	free(s);
	s = layout_tol_head(&r, 120);
	ck_assert_str_eq(s, "STOPPED after 107200 of 400000 samples; estimates from those "
	    "only: seed 3, 2 tolerances, " PM " one standard error");
	ck_assert_int_le((int)utf8_cols(s), 120);
	free(s);
	/* 78: the tolerance screen at 80 columns */
	s = layout_tol_head(&r, 78);
	ck_assert_str_eq(s, "STOPPED after 107200 of 400000 samples; the figures are of "
	    "those only");
	ck_assert_int_le((int)utf8_cols(s), 78);
	free(s);
}
END_TEST

START_TEST(test_progress_line)
{
	char *s = layout_tol_progress(12032, 200000, 0, 0);

	/* 12032/200000 = 6.016 % */
	ck_assert_str_eq(s, "sampling\u2026 12032 of 200000 samples (6 %)");
	free(s);
	s = layout_tol_progress(199990, 200000, 0, 1);
	/* 99.995 % is not done: never "100 %" before the end */
	ck_assert_str_eq(s, "sampling... 199990 of 200000 samples (99 %)");
	free(s);
	s = layout_tol_progress(12032, 200000, 1, 0);
	ck_assert_str_eq(s, "stopping\u2026 12032 of 200000 samples done");
	free(s);
}
END_TEST

static const struct {
	const char *text;
	size_t      max, want;      /* want 0: refused */
} count_cases[] = {
	{ "20000", 1000000, 20000 }, { " 20000 ", 1000000, 20000 }, { "20 000", 1000000, 20000 },
	{ "20k", 1000000, 20000 }, { "1000000", 1000000, 1000000 }, { "10", 1000000, 10 },
	{ "9", 1000000, 0 }, { "1000001", 1000000, 0 }, { "50000", 40000, 0 },
	{ "", 1000000, 0 }, { "2e4", 1000000, 0 }, { "-5", 1000000, 0 },
	{ "20000x", 1000000, 0 }, { "99999999999999999999999", 1000000, 0 },
};

START_TEST(test_parse_samples)
{
	size_t n = 7;
	char *cause = NULL;
	int rc = layout_tol_parse_samples(count_cases[_i].text, count_cases[_i].max, &n, &cause);

	if (count_cases[_i].want != 0) {
		ck_assert_int_eq(rc, 0);
		ck_assert_uint_eq(n, count_cases[_i].want);
		ck_assert_ptr_null(cause);
	} else {
		ck_assert_int_eq(rc, -1);
		ck_assert_uint_eq(n, 7);          /* untouched */
		ck_assert_ptr_nonnull(cause);
		ck_assert_msg(strstr(cause, count_cases[_i].text) != NULL, "%s", cause);
		free(cause);
	}
}
END_TEST

START_TEST(test_samples_max)
{
	/* 2^25 kept ratios: 32 rows leave 2^20 = 1048576, above the cap */
	ck_assert_uint_eq(layout_tol_samples_max(32), MC_MAX_SAMPLES);
	ck_assert_uint_eq(layout_tol_samples_max(0), MC_MAX_SAMPLES);
	ck_assert_uint_eq(layout_tol_samples_max(64), (size_t)1 << 19);
	ck_assert_uint_eq(layout_tol_samples_max(1000), ((size_t)1 << 25) / 1000);
	/* the screen's own first run always fits */
	ck_assert_uint_le(layout_tol_samples(100000, 0), layout_tol_samples_max(100000));
}
END_TEST

START_TEST(test_rows_and_drivers)
{
	struct bench *b = bench_text("dump", DUMP_BENCH, " " PM " 10 %", " " PM " 2 mm");
	struct bench *g = bench_text("dump", DUMP_BENCH, "", " " PM " 2 mm");
	struct mc_result r, rg;
	struct layout_tol_row row;
	char want[64], *dr, *others, *s;

	run(b, 2000, &r);
	ck_assert_uint_eq(r.nrated, 1);
	layout_tol_row(&r, 0, 12, &row);
	ck_assert(!row.exact);
	ck_assert_int_eq(row.worst, 1);
	layout_tol_prob_se(want, sizeof want, r.el[0].p_over, r.el[0].se_over, 2000, 0);
	ck_assert_str_eq(row.over, want);
	layout_percent(want, sizeof want, r.el[0].median);
	ck_assert_str_eq(row.median, want);
	dr = layout_tol_drivers(&r, 0, &others);
	/* the power is all that moves P/1.1 W: r = +1 first (correlation of a
	 * variable with a linear function of itself, derived in the test) */
	ck_assert_ptr_nonnull(dr);
	ck_assert_ptr_null(others);
	ck_assert_msg(strncmp(dr, "source.power +1.00", 18) == 0, "%s", dr);
	free(dr);
	s = layout_tol_head(&r, 200);
	ck_assert_str_eq(s, "Statistical estimates from 2000 random samples (seed 7) of 2 "
	    "tolerances; " PM " is one standard error");
	free(s);
	s = layout_tol_head(&r, 60);
	ck_assert_str_eq(s, "Statistical: 2000 samples, seed 7, 2 tolerances; " PM " one "
	    "standard error");
	free(s);
	s = layout_tol_bench_line(&r, 0, 200);
	ck_assert_msg(strncmp(s, "P(anything over) ", 17) == 0, "%s", s);
	ck_assert_ptr_nonnull(strstr(s, "(as written "));
	free(s);
	s = layout_tol_bench_line(&r, 1, 40);
	ck_assert_msg(strncmp(s, "P(any over) ", 12) == 0 && all_ascii(s), "%s", s);
	ck_assert_ptr_null(strstr(s, "as written"));
	free(s);

	run(g, 500, &rg);
	layout_tol_row(&rg, 0, 12, &row);
	ck_assert(row.exact);
	/* 1 W / 1.1 W = 90.9 %: caution (at 1/2 and above) in every sample */
	ck_assert_str_eq(row.over, "0 %");
	ck_assert_str_eq(row.caution, "100 %");
	ck_assert_int_eq(row.bar_over, 0);
	ck_assert_int_eq(row.bar_caution, 12);
	/* nothing moves: no bound, no correlation to rank */
	s = layout_tol_bench_line(&rg, 0, 200);
	ck_assert_msg(strncmp(s, "P(anything over) 0 % ", 21) == 0, "%s", s);
	free(s);
	dr = layout_tol_drivers(&rg, 0, &others);
	ck_assert_str_eq(dr, "none: no tolerance moves its ratio");
	free(dr);
	/* ... while a run that moves it gives a bound or an estimate */
	s = layout_tol_bench_line(&r, 0, 200);
	ck_assert_msg(strncmp(s, "P(anything over) 0 % ", 21) != 0, "%s", s);
	free(s);
	mc_result_release(&r);
	mc_result_release(&rg);
	model_bench_free(b);
	model_bench_free(g);
}
END_TEST

/* On the demo (nine rated optics) with ± 5 % on its pulse energy: the
 * drivers are ranked for three of them; for another the screen names
 * those three. */
START_TEST(test_drivers_unranked)
{
	struct bench *b = demo();
	struct mc_result r;
	char *cause = NULL, *dr, *others = NULL;
	size_t j;

	ck_assert_msg(edit_set_bench(b, "source.pulse_energy", PM " 5 %", &cause) == 0, "%s",
	    cause);
	run(b, 300, &r);
	ck_assert_uint_gt(r.nrated, MC_SENS_ELEMS);
	for (j = 0; j < r.nrated; j++) {
		int ranked = 0;

		for (size_t q = 0; q < r.nworst; q++)
			ranked |= r.worst[q] == j;
		if (!ranked)
			break;
	}
	ck_assert_uint_lt(j, r.nrated);
	dr = layout_tol_drivers(&r, j, &others);
	ck_assert_ptr_null(dr);
	ck_assert_ptr_nonnull(others);
	for (size_t q = 0; q < r.nworst; q++)
		ck_assert_ptr_nonnull(strstr(others, r.el[r.worst[q]].id));
	free(others);
	mc_result_release(&r);
	model_bench_free(b);
}
END_TEST

START_TEST(test_unrated_note)
{
	struct bench *b = demo(), *d = bench_text("dump", DUMP_BENCH, "", "");
	struct trace *t = trace_run(b), *u = trace_run(d);
	char *s = layout_tol_unrated_note(t);

	/* the demo's polarizer and target take power with no rating (the
	 * hazards screen lists both, tests/ui.sh) */
	ck_assert_ptr_nonnull(s);
	ck_assert_ptr_nonnull(strstr(s, "POL1"));
	ck_assert_ptr_nonnull(strstr(s, "T1"));
	free(s);
	/* the dump bench: the lens takes power unrated... */
	s = layout_tol_unrated_note(u);
	if (s != NULL)
		ck_assert_ptr_null(strstr(s, "BD1"));  /* ...but the rated dump is never named */
	free(s);
	trace_free(t);
	trace_free(u);
	model_bench_free(b);
	model_bench_free(d);
}
END_TEST

/* The how-to's examples are what the editor takes, in both spellings. */
START_TEST(test_howto)
{
	struct bench *b = demo();
	char *cause = NULL;

	for (int ascii = 0; ascii < 2; ascii++) {
		char *s = layout_tol_howto(b, ascii), *line, *save = NULL;
		struct bench *c = model_bench_dup(b);
		int examples = 0;

		ck_assert(!ascii || all_ascii(s));
		/* the demo's source is given by its pulse energy: that is the key */
		ck_assert_ptr_nonnull(strstr(s, "pulse energy"));
		for (line = strtok_r(s, "\n", &save); line != NULL; line = strtok_r(NULL, "\n", &save)) {
			char ex[64];
			size_t l;

			if (strncmp(line, "  ", 2) != 0)
				continue;
			/* "  EXAMPLE   what it means": the example ends at two spaces */
			l = strstr(line + 2, "  ") - (line + 2);
			snprintf(ex, sizeof ex, "%.*s", (int)l, line + 2);
			examples++;
			if (strstr(ex, "mJ") != NULL)
				ck_assert_msg(edit_set_bench(c, "source.pulse_energy", ex, &cause) == 0,
				    "%s: %s", ex, cause);
			else if (strncmp(ex, "250 mm", 6) == 0)
				ck_assert_msg(edit_set(c, "S0", "length", ex, &cause) == 0, "%s: %s", ex,
				    cause);
			else
				ck_assert_msg(edit_set(c, "W1", "transmission", ex, &cause) == 0, "%s: %s",
				    ex, cause);
		}
		ck_assert_int_eq(examples, 3);
		free(s);
		model_bench_free(c);
	}
	model_bench_free(b);
}
END_TEST

/* ---- the histogram ---- */

/* 1001 ratios evenly from 50 % to 150 %, caution from 50 %: 501 of them
 * (i >= 500, exactly 100 % included) over, 500 caution.  Rice's rule
 * gives ceil(2·1001^(1/3)) = 21 bins at most. */
START_TEST(test_hist_bins)
{
	static double v[1001];
	static struct layout_hist h;
	size_t sum = 0;
	int oc;

	for (int i = 0; i <= 1000; i++)
		v[i] = 0.5 + i / 1000.0;
	ck_assert_int_eq(layout_hist_make(v, 1001, 1, 0.5, 76, &h), 0);
	ck_assert_int_le(h.nbins, 21);
	ck_assert_int_ge(h.nbins, 19);
	ck_assert_uint_eq(h.n_over, 501);
	ck_assert_uint_eq(h.n_caution, 500);
	ck_assert_double_eq(h.min, 0.5);
	ck_assert_double_eq(h.max, 1.5);
	for (int b = 0; b < h.nbins; b++) {
		sum += h.count[b];
		/* 100 % is an edge: no bin holds both sides of it */
		ck_assert(h.over[b] == 0 || h.over[b] == h.count[b]);
		ck_assert_uint_le(h.count[b], h.top);
	}
	ck_assert_uint_eq(sum, 1001);
	oc = layout_hist_col(&h, 1);
	ck_assert(oc > 0 && oc < h.nbins);
	ck_assert_uint_eq(h.over[oc], h.count[oc]);
	ck_assert_uint_eq(h.over[oc - 1], 0);
	ck_assert_int_eq(layout_hist_status(&h, oc), STATUS_OVER);
	ck_assert_int_eq(layout_hist_status(&h, 0), STATUS_CAUTION);
	ck_assert_int_eq(layout_hist_col(&h, 0.1), -1);
	ck_assert_int_eq(layout_hist_col(&h, 9), h.nbins);
	/* a narrow plot: no more bins than columns */
	ck_assert_int_eq(layout_hist_make(v, 1001, 1, 0.5, 10, &h), 0);
	ck_assert_int_le(h.nbins, 10);
	ck_assert_int_eq(layout_hist_make(v, 0, 1, 0.5, 10, &h), -1);
}
END_TEST

/* 1000 ratios at 30 % and one at 90 %: the full bin reaches the top, the
 * single sample still shows a sliver at the bottom and nothing above. */
START_TEST(test_hist_cells)
{
	static double v[2002];
	static struct layout_hist h;
	int last;

	/* stride 2: the second element of each sample, as a run keeps them */
	for (int i = 0; i < 1001; i++) {
		v[2 * i] = 5;
		v[2 * i + 1] = i < 1000 ? 0.3 : 0.9;
	}
	ck_assert_int_eq(layout_hist_make(v + 1, 1001, 2, 0.5, 40, &h), 0);
	last = h.nbins - 1;
	ck_assert_uint_eq(h.count[0], 1000);
	ck_assert_uint_eq(h.count[last], 1);
	ck_assert_uint_eq(h.n_caution, 1);
	ck_assert_uint_eq(h.n_over, 0);
	ck_assert_str_eq(layout_hist_cell(&h, 0, 3, 4, 0), "\u2588");
	ck_assert_str_eq(layout_hist_cell(&h, 0, 3, 4, 1), "#");
	ck_assert_str_eq(layout_hist_cell(&h, last, 0, 4, 0), "\u2581");
	ck_assert_str_eq(layout_hist_cell(&h, last, 0, 4, 1), "#");
	ck_assert_str_eq(layout_hist_cell(&h, last, 1, 4, 0), " ");
	ck_assert_str_eq(layout_hist_cell(&h, 1, 0, 4, 0), " ");      /* empty */
	ck_assert_str_eq(layout_hist_cell(&h, h.nbins, 0, 4, 0), " ");
	ck_assert_int_eq(layout_hist_status(&h, last), STATUS_CAUTION);
	ck_assert_int_eq(layout_hist_status(&h, 0), STATUS_OK);
}
END_TEST

START_TEST(test_hist_axis)
{
	static double v[1001];
	static struct layout_hist h;
	char buf[2048], *cap;
	const char *mark;
	int oc;

	for (int i = 0; i <= 1000; i++)
		v[i] = 0.5 + i / 1000.0;
	ck_assert_int_eq(layout_hist_make(v, 1001, 1, 0.25, 76, &h), 0);
	layout_hist_axis(buf, sizeof buf, &h, 3, 0);
	ck_assert_int_eq((int)utf8_cols(buf), 3 * h.nbins);
	ck_assert_msg(strncmp(buf, "50.0 %", 6) == 0, "%s", buf);
	ck_assert_msg(strstr(buf, "150 %") + strlen("150 %") == buf + strlen(buf), "%s", buf);
	/* the mark under the first column of the bin where over begins */
	mark = strstr(buf, "\u25b2over 100 %");
	ck_assert_ptr_nonnull(mark);
	oc = layout_hist_col(&h, 1);
	{
		char head[2048];

		snprintf(head, sizeof head, "%.*s", (int)(mark - buf), buf);
		ck_assert_int_eq((int)utf8_cols(head), 3 * oc);
	}
	/* caution at 25 % lies left of the plot: no mark */
	ck_assert_ptr_null(strstr(buf, "caution"));
	layout_hist_axis(buf, sizeof buf, &h, 3, 1);
	ck_assert(all_ascii(buf));
	ck_assert_ptr_nonnull(strstr(buf, "^over 100 %"));
	/* one column a bin, too narrow for every label: the over mark first */
	layout_hist_axis(buf, sizeof buf, &h, 1, 1);
	ck_assert_int_eq((int)strlen(buf), h.nbins);
	ck_assert_ptr_nonnull(strchr(buf, '^'));
	cap = layout_hist_caption(&h, "W1");
	ck_assert_str_eq(cap, "W1's ratio in 1001 samples: 50.0 % to 150 %; 501 over, "
	    "500 caution, 0 ok");
	free(cap);
	/* every sample the same: said so */
	for (int i = 0; i <= 1000; i++)
		v[i] = 0.159;
	ck_assert_int_eq(layout_hist_make(v, 1001, 1, 0.5, 76, &h), 0);
	ck_assert(h.constant);
	cap = layout_hist_caption(&h, "HWP1");
	ck_assert_str_eq(cap, "HWP1's ratio: 15.9 % in every one of 1001 samples (no "
	    "tolerance moves it)");
	free(cap);
}
END_TEST

int
main(void)
{
	Suite *s = suite_create("layout_tol");
	TCase *tc = tcase_create("values");

	tcase_add_test(tc, test_value_with_tol);
	tcase_add_test(tc, test_source_with_tol);
	tcase_add_test(tc, test_inherited);
	LOOP(tc, test_fit_value, fit_cases);
	tcase_add_test(tc, test_fit_value_ascii);
	tcase_add_test(tc, test_edit_hint);
	suite_add_tcase(s, tc);
	tc = tcase_create("run");
	tcase_set_timeout(tc, 30);
	LOOP(tc, test_samples, sample_cases);
	LOOP(tc, test_prob, prob_cases);
	LOOP(tc, test_prob_tiny_se, tiny_se_cases);
	LOOP(tc, test_bar_cells, bar_cells);
	tcase_add_test(tc, test_rows_and_drivers);
	tcase_add_test(tc, test_head_stopped);
	tcase_add_test(tc, test_progress_line);
	LOOP(tc, test_parse_samples, count_cases);
	tcase_add_test(tc, test_samples_max);
	tcase_add_test(tc, test_drivers_unranked);
	tcase_add_test(tc, test_unrated_note);
	tcase_add_test(tc, test_howto);
	suite_add_tcase(s, tc);
	tc = tcase_create("histogram");
	tcase_add_test(tc, test_hist_bins);
	tcase_add_test(tc, test_hist_cells);
	tcase_add_test(tc, test_hist_axis);
	suite_add_tcase(s, tc);
	return run_suite(s);
}
