/* check_sweep.c - sweeping one knob: Malus's law through a half-wave plate
 * and a polarizing splitter, the dump-rating angle in closed form, a source
 * power sweep against the trace's own safe power, a lens slid along a rail
 * against Self's formula, and every refused sweep. */
#include <config.h>

#include <check.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "bench-file.h"
#include "core-sweep.h"
#include "core-trace.h"

#include "check-bench-util.h"
#include "check-util.h"

#define DEG (M_PI / 180)

/* 10 W CW, horizontal (p) light; an ideal half-wave plate; an ideal
 * polarizing splitter (p through, s reflected) with a 4 W dump in its
 * reflected port; the transmitted beam into a target. */
#define MALUS_BENCH \
	"{ 'format': 'beamledger-bench-1', 'name': 'malus', 'safety_factor': 2," \
	"  'source': { 'wavelength': '1064 nm', 'power': '10 W', 'waist': '1 mm'," \
	"              'polarization': 0 }," \
	"  'path': [" \
	"    { 'id': 'S0', 'type': 'space', 'length': '100 mm' }," \
	"    { 'id': 'HWP1', 'type': 'waveplate', 'retardance': 0.5, 'angle': 0 }," \
	"    { 'id': 'S1', 'type': 'space', 'length': '100 mm' }," \
	"    { 'id': 'PBS1', 'type': 'splitter', 'polarizing': true, 'tp': 1, 'rs': 1," \
	"      'reflected': [ { 'id': 'S1r', 'type': 'space', 'length': '50 mm' }," \
	"                     { 'id': 'BD1', 'type': 'dump', 'max_power': '4 W' } ] }," \
	"    { 'id': 'S2', 'type': 'space', 'length': '100 mm' }," \
	"    { 'id': 'T1', 'type': 'target' } ] }"

static size_t
term_index(const struct sweep *sw, const char *id)
{
	for (size_t i = 0; i < sw->nterm; i++)
		if (strcmp(sw->term_id[i], id) == 0)
			return i;
	ck_abort_msg("no terminator %s", id);
	return 0;
}

static size_t
rated_index(const struct sweep *sw, const char *id)
{
	for (size_t i = 0; i < sw->nrated; i++)
		if (strcmp(sw->rated[i].id, id) == 0)
			return i;
	ck_abort_msg("no rated element %s", id);
	return 0;
}

/* Malus's law behind a half-wave plate at θ: the plate turns linear light
 * by 2θ, so a polarizing splitter passes P·cos²(2θ) and reflects
 * P·sin²(2θ) (Hecht, Optics, polarization chapter).  The dump (rating
 * P_max) reaches it where sin²(2θ) = P_max/P: θ = ½·arcsin(√(P_max/P)),
 * and caution (safety factor 2) where sin²(2θ) = P_max/(2P). */
START_TEST(test_malus_half_wave)
{
	struct bench *b = bench_text("malus.json", MALUS_BENCH);
	char *before = bench_file_dump(b), *after, *cause = NULL;
	struct sweep_knob k;
	struct sweep *sw;
	size_t bd, t1, r;
	double over = 0.5 * asin(sqrt(4.0 / 10.0)), caution = 0.5 * asin(sqrt(2.0 / 10.0));

	ck_assert_int_eq(sweep_knob_parse(b, "HWP1.angle", &k, &cause), 0);
	sw = sweep_run(b, &k, 0, 45, 46, 0, &cause);
	ck_assert_msg(sw != NULL, "%s", cause);
	bd = term_index(sw, "BD1");
	t1 = term_index(sw, "T1");
	for (size_t s = 0; s < sw->nsteps; s++) {
		double th = sw->x[s] * DEG;

		ck_assert_double_eq_tol(sw->x[s], (double)s, 1e-12);
		ck_assert_double_eq_tol(sw->term_power[s * sw->nterm + bd],
		    10 * sin(2 * th) * sin(2 * th), 1e-9);
		ck_assert_double_eq_tol(sw->term_power[s * sw->nterm + t1],
		    10 * cos(2 * th) * cos(2 * th), 1e-9);
	}
	r = rated_index(sw, "BD1");
	ck_assert_double_eq_tol(sw->rated[r].over * DEG, over, 1e-6);
	ck_assert_double_eq_tol(sw->rated[r].caution * DEG, caution, 1e-6);
	ck_assert(sw->any_over);
	/* safe from 0° up to the over angle; calm up to the caution angle */
	ck_assert_uint_eq(sw->nsafe, 1);
	ck_assert_double_eq(sw->safe[0].lo, 0);
	ck_assert_double_eq_tol(sw->safe[0].hi * DEG, over, 1e-6);
	ck_assert_uint_eq(sw->ncalm, 1);
	ck_assert_double_eq_tol(sw->calm[0].hi * DEG, caution, 1e-6);
	/* the dump is over at 45° and the worst element there */
	ck_assert_int_eq(sw->status[45], STATUS_OVER);
	ck_assert_int_eq(sw->worst[45], (long)r);
	/* the sweep put the one value back */
	after = bench_file_dump(b);
	ck_assert_str_eq(before, after);
	free(before);
	free(after);
	sweep_free(sw);
	sweep_knob_release(&k);
	model_bench_free(b);
}
END_TEST

/* Downwards, and a log sweep: the same closed-form angle is found. */
START_TEST(test_malus_descending_log)
{
	struct bench *b = bench_text("malus.json", MALUS_BENCH);
	double over = 0.5 * asin(sqrt(4.0 / 10.0));
	char *cause = NULL;
	struct sweep_knob k;
	struct sweep *sw;

	ck_assert_int_eq(sweep_knob_parse(b, "HWP1.angle", &k, &cause), 0);
	sw = sweep_run(b, &k, 1, 40, 17, 1, &cause);
	ck_assert_msg(sw != NULL, "%s", cause);
	ck_assert_double_eq_tol(sw->x[8], sqrt(40.0), 1e-9);   /* geometric middle */
	ck_assert_double_eq_tol(sw->rated[0].over * DEG, over, 1e-6);
	sweep_free(sw);
	sw = sweep_run(b, &k, 45, 0, 10, 0, &cause);
	ck_assert_msg(sw != NULL, "%s", cause);
	/* over from the start: reached at FROM; leaving it is the safe interval's start */
	ck_assert_double_eq(sw->rated[0].over, 45);
	ck_assert_uint_eq(sw->nsafe, 1);
	ck_assert_double_eq_tol(sw->safe[0].lo * DEG, over, 1e-6);
	ck_assert_double_eq(sw->safe[0].hi, 0);
	sweep_free(sw);
	sweep_knob_release(&k);
	model_bench_free(b);
}
END_TEST

/* Self-consistency check (linearity, no outside source): ratios scale with
 * the source power, so the power where the first element goes over is the
 * trace's safe source power times the safety factor, and the power where
 * the first reaches caution is the safe source power itself. */
START_TEST(test_source_power_crossings)
{
	struct bench *b = demo();
	struct trace *t = trace_run(b);
	double safe = t->safe_source_power, first_over = INFINITY, first_caution = INFINITY;
	char *cause = NULL;
	struct sweep_knob k;
	struct sweep *sw;

	char *before = bench_file_dump(b), *after;

	ck_assert(isfinite(safe) && safe > 0);
	ck_assert_int_eq(sweep_knob_parse(b, "source.power", &k, &cause), 0);
	sw = sweep_run(b, &k, 0.1, 4.0, 200, 0, &cause);
	ck_assert_msg(sw != NULL, "%s", cause);
	for (size_t i = 0; i < sw->nrated; i++) {
		if (sw->rated[i].over < first_over)
			first_over = sw->rated[i].over;
		if (sw->rated[i].caution < first_caution)
			first_caution = sw->rated[i].caution;
	}
	ck_assert_double_eq_tol(first_over, safe * b->safety_factor, 3.9e-6);
	ck_assert_double_eq_tol(first_caution, safe, 3.9e-6);
	ck_assert_double_eq_tol(sw->safe[0].hi, safe * b->safety_factor, 3.9e-6);
	ck_assert_double_eq_tol(sw->calm[0].hi, safe, 3.9e-6);
	ck_assert_double_eq(sw->calm[0].lo, 0.1);
	/* the demo gives a pulse energy, not a power: that is what comes back */
	after = bench_file_dump(b);
	ck_assert_str_eq(before, after);
	free(before);
	free(after);
	sweep_free(sw);
	sweep_knob_release(&k);
	trace_free(t);
	model_bench_free(b);
}
END_TEST

/* A lens of f = 100 mm slid along a 1000 mm rail (S1.length~S2.length),
 * the source waist w0 = 0.1 mm at the source.  Self's formula (Self, Appl.
 * Opt. 22, 658 (1983), eq. 9): 1/(s + zR²/(s − f)) + 1/s'' = 1/f with
 * zR = π·w0²/(M²·λ); the focus lies s'' past the lens, and the target stays
 * at 1000 mm. */
#define RAIL_BENCH \
	"{ 'format': 'beamledger-bench-1', 'name': 'rail'," \
	"  'source': { 'wavelength': '1064 nm', 'power': '1 mW', 'waist': '0.1 mm' }," \
	"  'path': [" \
	"    { 'id': 'S1', 'type': 'space', 'length': '200 mm' }," \
	"    { 'id': 'L1', 'type': 'lens', 'focal': '100 mm' }," \
	"    { 'id': 'S2', 'type': 'space', 'length': '800 mm' }," \
	"    { 'id': 'T1', 'type': 'target', 'max_power': '1 W' } ] }"

START_TEST(test_rail_self_formula)
{
	static const double d1[] = { 0.12, 0.15, 0.2, 0.3, 0.45 };
	struct bench *b = bench_text("rail.json", RAIL_BENCH);
	double f = 0.1, zr = M_PI * 1e-4 * 1e-4 / 1064e-9;
	char *cause = NULL;
	struct sweep_knob k;
	struct trace *t = NULL;
	struct sweep *sw;

	ck_assert_int_eq(sweep_knob_parse(b, "S1.length~S2.length", &k, &cause), 0);
	for (size_t i = 0; i < sizeof d1 / sizeof *d1; i++) {
		double s = d1[i], s2 = 1 / (1 / f - 1 / (s + zr * zr / (s - f)));
		const struct trace_row *gap = NULL, *tgt = NULL;

		sweep_knob_set(&k, b, s);
		t = trace_rerun(t, b);
		for (size_t r = 0; r < t->nrows; r++) {
			if (strcmp(t->rows[r].el->id, "S2") == 0)
				gap = &t->rows[r];
			if (strcmp(t->rows[r].el->id, "T1") == 0)
				tgt = &t->rows[r];
		}
		ck_assert(gap != NULL && tgt != NULL);
		ck_assert_msg(gap->has_focus, "no focus in S2 at d1 = %g", s);
		ck_assert_double_eq_tol(gap->focus.z, s + s2, 1e-6);
		ck_assert_double_eq_tol(tgt->z, 1.0, 1e-12);
	}
	sweep_knob_set(&k, b, k.base);
	/* the sweep itself runs on the rail and puts both gaps back */
	sw = sweep_run(b, &k, 0.12, 0.9, 50, 0, &cause);
	ck_assert_msg(sw != NULL, "%s", cause);
	ck_assert_double_eq(model_get(model_find(b, "S1", NULL, NULL, NULL), K_LENGTH), 0.2);
	ck_assert_double_eq(model_get(model_find(b, "S2", NULL, NULL, NULL), K_LENGTH), 0.8);
	/* past 1000 mm the other gap would be negative */
	ck_assert_ptr_null(sweep_run(b, &k, 0.12, 1.2, 50, 0, &cause));
	ck_assert_ptr_nonnull(strstr(cause, "S2"));
	free(cause);
	sweep_free(sw);
	trace_free(t);
	sweep_knob_release(&k);
	model_bench_free(b);
}
END_TEST

/* Knobs that must be refused, with the words their message needs. */
static const struct { const char *knob, *w1, *w2; } bad_knobs[] = {
	{ "NOPE.angle", "NOPE", "no element" },
	{ "HWP1.focal", "HWP1", "focal" },
	{ "HWP1.bogus", "HWP1", "bogus" },
	{ "PBS1.polarizing", "polarizing", "not a number" },
	{ "source.colour", "colour", "source" },
	{ "HWP1", "HWP1", "ID.KEY" },
	{ "S0.length~HWP1.angle", "rail", "length" },
	{ "source.pulse_energy", "pulse_energy", "CW" },
};

START_TEST(test_bad_knob)
{
	struct bench *b = bench_text("malus.json", MALUS_BENCH);
	char *cause = NULL;
	struct sweep_knob k;

	ck_assert_int_ne(sweep_knob_parse(b, bad_knobs[_i].knob, &k, &cause), 0);
	ck_assert_ptr_nonnull(cause);
	ck_assert_msg(strstr(cause, bad_knobs[_i].w1) && strstr(cause, bad_knobs[_i].w2),
	    "message '%s' lacks '%s' or '%s'", cause, bad_knobs[_i].w1, bad_knobs[_i].w2);
	free(cause);
	model_bench_free(b);
}
END_TEST

/* Ranges that must be refused; the bench is left as it was. */
static const struct {
	const char *knob;
	double from, to;
	size_t steps;
	int log;
	const char *word;
} bad_ranges[] = {
	{ "HWP1.angle", 10, 10, 10, 0, "different" },
	{ "HWP1.angle", 0, 45, 0, 0, "at least 2" },
	{ "HWP1.angle", 0, 45, 1, 0, "at least 2" },
	{ "HWP1.angle", -10, 45, 10, 1, "through zero" },
	{ "HWP1.angle", 0, 45, 10, 1, "through zero" },
	{ "HWP1.angle", 0, 400, 10, 0, "angle" },
	{ "source.power", -1, 10, 10, 0, "power" },
	{ "S0.length", -0.1, 0.2, 10, 0, "length" },
	{ "PBS1.rs", 0, 1.5, 10, 0, "rs" },
};

START_TEST(test_bad_range)
{
	struct bench *b = bench_text("malus.json", MALUS_BENCH);
	char *before = bench_file_dump(b), *after, *cause = NULL;
	struct sweep_knob k;

	ck_assert_int_eq(sweep_knob_parse(b, bad_ranges[_i].knob, &k, &cause), 0);
	ck_assert_ptr_null(sweep_run(b, &k, bad_ranges[_i].from, bad_ranges[_i].to,
	    bad_ranges[_i].steps, bad_ranges[_i].log, &cause));
	ck_assert_ptr_nonnull(cause);
	ck_assert_msg(strstr(cause, bad_ranges[_i].word) != NULL, "message '%s' lacks '%s'",
	    cause, bad_ranges[_i].word);
	after = bench_file_dump(b);
	ck_assert_str_eq(before, after);
	free(before);
	free(after);
	free(cause);
	sweep_knob_release(&k);
	model_bench_free(b);
}
END_TEST

/* A source given by its measured divergence θ: M² = π·w0·θ/λ (ISO 11146-1)
 * follows a swept waist and wavelength, as `set source.waist` and the
 * reader derive it.  10 m on, w² = w0²(1 + (z/zR)²) with zR = π·w0²/(M²·λ)
 * (Kogelnik & Li 1966, eq. 21, with the embedded-Gaussian M², ISO 11146-1)
 * = w0/θ: w² = w0² + θ²z²; the target's ratio is 2P/(π·w²) over 1 W/cm².
 * A swept M² replaces the divergence (w² then from that M²). */
#define DIV_BENCH \
	"{ 'format': 'beamledger-bench-1', 'name': 'div'," \
	"  'source': { 'wavelength': '1064 nm', 'power': '1 W', 'divergence': %.10g," \
	"              'waist': '1 mm' }," \
	"  'path': [ { 'id': 'S0', 'type': 'space', 'length': '10 m' }," \
	"            { 'id': 'T1', 'type': 'target'," \
	"              'damage': { 'cw_irradiance': '1 W/cm^2' } } ] }"

static double
div_ratio(double w0, double m2, double lam)
{
	double zr = M_PI * w0 * w0 / (m2 * lam), w2 = w0 * w0 * (1 + (10 / zr) * (10 / zr));

	return 2 / (M_PI * w2) / 1e4;
}

START_TEST(test_divergence_knobs)
{
	const double theta = 1e-3, lam = 1064e-9;
	struct bench *b = bench_text("div.json", DIV_BENCH, theta);
	char *before = bench_file_dump(b), *after, *cause = NULL;
	struct sweep_knob k;
	struct sweep *sw;

	ck_assert_int_eq(sweep_knob_parse(b, "source.waist", &k, &cause), 0);
	sw = sweep_run(b, &k, 0.5e-3, 2e-3, 7, SWEEP_NO_GHOSTS, &cause);
	ck_assert_msg(sw != NULL, "%s", cause);
	for (size_t i = 0; i < sw->nsteps; i++)
		CHECK_REL(sw->ratio[i], div_ratio(sw->x[i], M_PI * sw->x[i] * theta / lam, lam),
		    1e-9);
	sweep_free(sw);
	sweep_knob_release(&k);
	ck_assert_int_eq(sweep_knob_parse(b, "source.wavelength", &k, &cause), 0);
	sw = sweep_run(b, &k, 800e-9, 1550e-9, 5, SWEEP_NO_GHOSTS, &cause);
	ck_assert_msg(sw != NULL, "%s", cause);
	for (size_t i = 0; i < sw->nsteps; i++)
		CHECK_REL(sw->ratio[i], div_ratio(1e-3, M_PI * 1e-3 * theta / sw->x[i], sw->x[i]),
		    1e-9);
	sweep_free(sw);
	sweep_knob_release(&k);
	ck_assert_int_eq(sweep_knob_parse(b, "source.m2", &k, &cause), 0);
	sw = sweep_run(b, &k, 1, 4, 4, SWEEP_NO_GHOSTS, &cause);
	ck_assert_msg(sw != NULL, "%s", cause);
	for (size_t i = 0; i < sw->nsteps; i++)
		CHECK_REL(sw->ratio[i], div_ratio(1e-3, sw->x[i], lam), 1e-9);
	sweep_free(sw);
	sweep_knob_release(&k);
	/* a waist that would make M² < 1 at an end is refused, saying why */
	ck_assert_int_eq(sweep_knob_parse(b, "source.waist", &k, &cause), 0);
	ck_assert_ptr_null(sweep_run(b, &k, 0.1e-3, 1e-3, 5, SWEEP_NO_GHOSTS, &cause));
	ck_assert_msg(cause != NULL && strstr(cause, "below 1") != NULL &&
	    strstr(cause, "source.waist") != NULL, "%s", cause);
	free(cause);
	sweep_knob_release(&k);
	/* and the bench is as it was, the divergence and M² too */
	after = bench_file_dump(b);
	ck_assert_str_eq(before, after);
	free(before);
	free(after);
	model_bench_free(b);
}
END_TEST

/* Values typed for a knob carry its unit. */
START_TEST(test_knob_values)
{
	struct bench *b = bench_text("malus.json", MALUS_BENCH);
	char *cause = NULL;
	struct sweep_knob k;
	double v;

	ck_assert_int_eq(sweep_knob_parse(b, "source.power", &k, &cause), 0);
	ck_assert_int_eq(sweep_knob_value(&k, "20 mW", &v, &cause), 0);
	ck_assert_double_eq_tol(v, 0.02, 1e-15);
	ck_assert_int_ne(sweep_knob_value(&k, "20 mm", &v, &cause), 0);
	ck_assert_ptr_nonnull(strstr(cause, "source.power"));
	free(cause);
	cause = NULL;
	sweep_knob_release(&k);
	ck_assert_int_eq(sweep_knob_parse(b, "HWP1.angle", &k, &cause), 0);
	ck_assert_int_eq(sweep_knob_value(&k, "12.5", &v, &cause), 0);
	ck_assert_double_eq(v, 12.5);
	ck_assert_int_ne(sweep_knob_value(&k, "twelve", &v, &cause), 0);
	ck_assert_ptr_nonnull(strstr(cause, "not a number"));
	free(cause);
	sweep_knob_release(&k);
	model_bench_free(b);
}
END_TEST

/* The plot: the over line is drawn at ratio 1 and the caution line at 1/2;
 * the dump's curve starts at the bottom (ratio 0 at 0°). */
START_TEST(test_plot_layout)
{
	struct bench *b = bench_text("malus.json", MALUS_BENCH);
	char *cause = NULL;
	struct sweep_knob k;
	struct sweep_plot p;
	struct sweep *sw;
	long over_row = -1, caution_row = -1;

	ck_assert_int_eq(sweep_knob_parse(b, "HWP1.angle", &k, &cause), 0);
	sw = sweep_run(b, &k, 0, 45, 46, 0, &cause);
	ck_assert_ptr_nonnull(sw);
	sweep_plot_layout(sw, 2, 40, 11, 3, &p);
	ck_assert_uint_eq(p.nseries, 1);
	/* the dump peaks at 10 W / 4 W = 2.5: the top is 5 % above */
	ck_assert_double_eq_tol(p.ymax, 2.625, 1e-12);
	for (size_t r = 0; r < p.h; r++) {
		if (p.cell[r * p.w + 20] == SWEEP_PLOT_OVER)
			over_row = (long)r;
		if (p.cell[r * p.w + 20] == SWEEP_PLOT_CAUTION)
			caution_row = (long)r;
	}
	ck_assert_int_eq(over_row, lround((1 - 1 / 2.625) * 10));
	ck_assert_int_eq(caution_row, lround((1 - 0.5 / 2.625) * 10));
	ck_assert_int_eq(p.cell[10 * p.w + 0], 1);       /* bottom left: series 1 */
	sweep_plot_release(&p);
	sweep_free(sw);
	sweep_knob_release(&k);
	model_bench_free(b);
}
END_TEST

int
main(void)
{
	Suite *s = suite_create("sweep");
	TCase *tc = tcase_create("core");

	tcase_add_test(tc, test_malus_half_wave);
	tcase_add_test(tc, test_malus_descending_log);
	tcase_add_test(tc, test_source_power_crossings);
	tcase_add_test(tc, test_rail_self_formula);
	tcase_add_loop_test(tc, test_bad_knob, 0, sizeof bad_knobs / sizeof *bad_knobs);
	tcase_add_loop_test(tc, test_bad_range, 0, sizeof bad_ranges / sizeof *bad_ranges);
	tcase_add_test(tc, test_divergence_knobs);
	tcase_add_test(tc, test_knob_values);
	tcase_add_test(tc, test_plot_layout);
	suite_add_tcase(s, tc);
	return run_suite(s);
}
