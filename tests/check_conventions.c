/* check_conventions.c - conformance of the trace engine to the two
 * contracts, spec/trace-conventions.md and spec/bench-format.md, on the
 * points check_trace.c leaves open: waist_position signs, M² pairs,
 * zero-length gaps, zero-power branches, the handedness of every reflected
 * port, the edges of the clipping and pulse-range flags, which power a
 * ratio uses, the self_focusing condition, keys the format allows, the JSON
 * fields, and numerical hazards (a waist at a gap end written in decimal,
 * round-off "power" leaving the bench, very elliptical beams in the
 * clipping integral).  Every bench is an inline bench file parsed with
 * bench_file_parse and traced with trace_run; every expected value is
 * derived by hand or taken from REFERENCE.md, as the comment beside it says. */
#include <config.h>

#include <check.h>
#include <complex.h>
#include <math.h>
#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <jansson.h>

#include "bench-file.h"
#include "core-model.h"
#include "core-trace.h"
#include "report.h"

#include "check-bench-util.h"
#include "check-util.h"

/* Bench files are written here with ' for " to keep them readable. */
#define HEAD "{'format':'beamledger-bench-1','name':'conv',"
#define CW_1W_1MM "'source':{'wavelength':'1064 nm','power':'1 W','waist':'1 mm'},"

#define LAMBDA 1064e-9

/* zR = π w0²/(M² λ), REFERENCE §1 (Kogelnik & Li 1966, Siegman [M]). */
static double
rayleigh(double w0, double m2, double lambda)
{
	return M_PI * w0 * w0 / (m2 * lambda);
}

/* w(z) = w0 √(1 + ((z − z0)/zR)²), REFERENCE §1 (Siegman 1986 ch. 17, from
 * memory). */
static double
radius_at(double w0, double zr, double dz)
{
	return w0 * sqrt(1 + (dz / zr) * (dz / zr));
}

/* Parses a bench or returns NULL with *cause set (the caller asserts). */
static struct bench *
bench_try(char **cause, const char *fmt, ...) __attribute__((format(printf, 2, 3)));

static struct bench *
bench_try(char **cause, const char *fmt, ...)
{
	char text[8192];
	va_list ap;
	int n;

	va_start(ap, fmt);
	n = vsnprintf(text, sizeof text, fmt, ap);
	va_end(ap);
	ck_assert(n > 0 && (size_t)n < sizeof text);
	bench_quote(text);
	*cause = NULL;
	return bench_file_parse(text, strlen(text), "conv", cause);
}

static void
check_no_focus(const struct trace *t, const char *id, const char *why)
{
	const struct trace_row *r = row_of(t, id);

	ck_assert_msg(!r->has_waist && !r->has_focus && !(r->flags & TF_FOCUS),
	    "%s: %s reports a waist at z = %.17g (radii %.6g, %.6g)", why, id,
	    r->focus.z, r->focus.wx, r->focus.wy);
}

/*
 * 1. waist_position: "negative = upstream (inside the laser), positive =
 * downstream" (bench-format.md, Source), q = −waist_position + i·zR
 * (trace-conventions.md, Frame and beam).  w0 = 0.1 mm at 1064 nm:
 * zR = π (0.1 mm)²/λ = 29.5262 mm (REFERENCE §1 formula).
 *   +0.5 m: at z = 0, w = w0 √(1 + (0.5/zR)²); the 1 m gap holds the focus at
 *          z = 0.5 m with w = w0 both ways; at z = 1 m the radius is again
 *          w0 √(1 + (0.5/zR)²) (hand: symmetric about the waist).
 *   −0.5 m: the same radius at z = 0; diverging, so no focus; at z = 1 m,
 *          w0 √(1 + (1.5/zR)²).
 */
static const struct wp_case {
	const char *wp;
	double waist_at;	/* m along the beam from the start */
	int focus;
} wp_cases[] = {
	{ "'500 mm'", 0.5, 1 },
	{ "'-500 mm'", -0.5, 0 },
	{ "0.5", 0.5, 1 },	/* plain SI number, bench-format.md Quantities */
};

START_TEST(test_waist_position_sign)
{
	const struct wp_case *c = &wp_cases[_i];
	struct bench *b = bench_text("conv", HEAD
	    "'source':{'wavelength':'1064 nm','power':'1 W','waist':'0.1 mm','waist_position':%s},"
	    "'path':[{'id':'S1','type':'space','length':'1 m'},{'id':'BD','type':'dump'}]}", c->wp);
	struct trace *t = trace_run(b);
	const struct trace_row *s1 = row_of(t, "S1"), *bd = row_of(t, "BD");
	double w0 = 0.1e-3, zr = rayleigh(w0, 1, LAMBDA);

	CHECK_REL(zr, 29.5262e-3, 1e-5);
	CHECK_REL(s1->wx, radius_at(w0, zr, 0 - c->waist_at), 1e-9);
	CHECK_REL(s1->wy, s1->wx, 1e-12);
	CHECK_REL(bd->wx, radius_at(w0, zr, 1 - c->waist_at), 1e-9);
	ck_assert_int_eq(s1->has_focus, c->focus);
	if (c->focus) {
		CHECK_ABS(s1->focus.z, c->waist_at, 1e-9);
		CHECK_REL(s1->focus.wx, w0, 1e-9);
		CHECK_REL(s1->focus.wy, w0, 1e-9);
		/* REFERENCE §4 (derived; Siegman ch. 17, from memory): I0 =
		 * 2P/(π w0²) */
		CHECK_REL(s1->focus.irradiance, 2 / (M_PI * w0 * w0), 1e-9);
	}
	trace_free(t);
	model_bench_free(b);
}
END_TEST

/*
 * 2. M² pairs: each axis has its own M² (trace-conventions.md, Frame and
 * beam).  REFERENCE §1 (Siegman 1986 ch. 17, from memory) check values, 1064
 * nm, w0 = 1 mm: w(10 m) =
 * 3.53136 mm with M² = 1 and 5.17771 mm with M² = 1.5.  Six digits carry
 * up to 1.4e-6 relative rounding (3.53136 stands for 3.5313639), so the
 * table is checked to 2e-6 and the formula w0 √(1 + (z/zR)²) to 1e-12.
 * irradiance 2P/(π wx wy) (trace-conventions.md), linear density
 * P/(2 min(wx, wy)).
 */
START_TEST(test_m2_pair)
{
	static const char *const m2s[] = { "[1, 1.5]", "[1.5, 1]" };
	struct bench *b = bench_text("conv", HEAD
	    "'source':{'wavelength':'1064 nm','power':'1 W','waist':'1 mm','m2':%s},"
	    "'path':[{'id':'S1','type':'space','length':'10 m'},{'id':'BD','type':'dump'}]}",
	    m2s[_i]);
	struct trace *t = trace_run(b);
	const struct trace_row *bd = row_of(t, "BD");
	double w1 = 3.53136e-3, w15 = 5.17771e-3;
	double wx = _i == 0 ? w1 : w15, wy = _i == 0 ? w15 : w1;

	CHECK_REL(bd->wx, wx, 2e-6);
	CHECK_REL(bd->wy, wy, 2e-6);
	CHECK_REL(fmin(bd->wx, bd->wy), radius_at(1e-3, rayleigh(1e-3, 1, LAMBDA), 10), 1e-12);
	CHECK_REL(fmax(bd->wx, bd->wy), radius_at(1e-3, rayleigh(1e-3, 1.5, LAMBDA), 10), 1e-12);
	/* REFERENCE §4, I0 = 2P/(π wx wy), with the hand radii of REFERENCE §1 */
	CHECK_REL(bd->irradiance, 2 / (M_PI * radius_at(1e-3, rayleigh(1e-3, 1, LAMBDA), 10) *
	    radius_at(1e-3, rayleigh(1e-3, 1.5, LAMBDA), 10)), 1e-12);
	CHECK_REL(bd->linear_density, 1 / (2 * w1), 2e-6);
	/* the waist is at the start: no focus in S1 (trace-conventions.md, Foci) */
	check_no_focus(t, "S1", "waist at the start");
	trace_free(t);
	model_bench_free(b);
}
END_TEST

/* An elliptical beam with two M² whose waists share one place (waist
 * ['1 mm', '0.5 mm'], m2 [1, 2], waist_position 0.4 m): each factor
 * 1 + u²/zR_i² of wx·wy is least at u = 0, so the focus is at z = 0.4 m
 * with the two waist radii (hand, from REFERENCE §1 w(z)); I = 2P/(π wx wy). */
START_TEST(test_m2_pair_common_waist)
{
	struct bench *b = bench_text("conv", HEAD
	    "'source':{'wavelength':'1064 nm','power':'1 W','waist':['1 mm','0.5 mm'],"
	    " 'm2':[1, 2],'waist_position':'400 mm'},"
	    "'path':[{'id':'S1','type':'space','length':'1 m'},{'id':'BD','type':'dump'}]}");
	struct trace *t = trace_run(b);
	const struct trace_row *s1 = row_of(t, "S1"), *bd = row_of(t, "BD");
	double zx = rayleigh(1e-3, 1, LAMBDA), zy = rayleigh(0.5e-3, 2, LAMBDA);

	/* the waist is kept; it concentrates the beam by the smaller end
	 * area over its own, area ∝ √((1 + u²/zx²)(1 + u²/zy²)) (REFERENCE §1
	 * (Siegman 1986 ch. 17, from memory)):
	 * the start (u = −0.4 m) gives 1.488 against 1.95 at the end
	 * (u = 0.6 m), under 2, so a waist, not a focus (issue 9, item 9) */
	ck_assert(s1->has_waist);
	ck_assert(!s1->has_focus && !(s1->flags & TF_FOCUS));
	CHECK_REL(s1->focus.concentration,
	    sqrt((1 + 0.16 / (zx * zx)) * (1 + 0.16 / (zy * zy))), 1e-9);
	CHECK_ABS(s1->focus.z, 0.4, 1e-9);
	CHECK_REL(s1->focus.wx, 1e-3, 1e-9);
	CHECK_REL(s1->focus.wy, 0.5e-3, 1e-9);
	CHECK_REL(s1->focus.irradiance, 2 / (M_PI * 1e-3 * 0.5e-3), 1e-9);
	CHECK_REL(bd->wx, radius_at(1e-3, zx, 0.6), 1e-9);
	CHECK_REL(bd->wy, radius_at(0.5e-3, zy, 0.6), 1e-9);
	trace_free(t);
	model_bench_free(b);
}
END_TEST

/*
 * 3. Zero-length spaces ("length (≥ 0)", bench-format.md): no gap, so no
 * focus (trace-conventions.md, Foci: the product cannot fall and rise in
 * no length); its row sits at the plane of the next element with the same
 * radii, and nothing becomes NaN.  The lens focus in the real gap after it
 * is untouched: REFERENCE §2 (Self 1983) row 1 (s = 1 m, f = 100 mm: s'' =
 * 100.94459 mm,
 * w0' = 32.3966 µm).
 */
START_TEST(test_zero_length_space)
{
	struct bench *b = bench_text("conv", HEAD CW_1W_1MM "'path':["
	    "{'id':'S0','type':'space','length':0},"
	    "{'id':'S1','type':'space','length':'1 m'},"
	    "{'id':'L1','type':'lens','focal':'100 mm'},"
	    "{'id':'Z1','type':'space','length':'0 m'},"
	    "{'id':'S2','type':'space','length':'300 mm'},"
	    "{'id':'BD','type':'dump'}]}");
	struct trace *t = trace_run(b);
	const struct trace_row *s0 = row_of(t, "S0"), *z1 = row_of(t, "Z1");
	const struct trace_row *s2 = row_of(t, "S2"), *l1 = row_of(t, "L1");

	check_no_focus(t, "S0", "zero-length space at the waist");
	check_no_focus(t, "Z1", "zero-length space after the lens");
	CHECK_ABS(s0->z, 0, 0);
	CHECK_REL(s0->wx, 1e-3, 1e-12);
	CHECK_ABS(z1->z, 1.0, 1e-15);
	CHECK_ABS(s2->z, 1.0, 1e-15);
	/* a thin lens keeps w at its plane (trace-conventions.md ABCD: B = 0) */
	CHECK_REL(z1->wx, l1->wx, 1e-12);
	CHECK_REL(s2->wx, z1->wx, 1e-15);
	ck_assert(isfinite(z1->irradiance) && isfinite(z1->field) && isfinite(z1->linear_density));
	ck_assert(s2->has_focus);
	CHECK_ABS(s2->focus.z, 1.0 + 0.10094459, 1e-6);
	CHECK_REL(s2->focus.wx, 32.3966e-6, 1e-6);
	trace_free(t);
	model_bench_free(b);
}
END_TEST

/*
 * 4. Zero-power branches.  A non-polarizing splitter with R = 1 passes
 * 1 − R = 0 (trace-conventions.md, Power).  The main branch then carries
 * 0 W: M1 sees 0 W/m², field 0, ratio 0 (status ok, below 1/SF), loses
 * nothing, and the list that ends after it leaves no power on the table,
 * so no `unterminated` warning ("with power left", trace-conventions.md).
 * The reflected branch: M2 rated 1 kW/cm² sees I = 2·1 W/(π (1 mm)²) =
 * 63.6620 W/cm² (REFERENCE §4 (derived; Siegman ch. 17, from memory)): ratio
 * 0.0636620; safe source power =
 * 1 W/(2 × 0.0636620) = 7.85398 W (trace-conventions.md, SF default 2).
 * Case 1: only the dark M1 is rated: the largest ratio is 0 and the
 * formula P/(SF·0) gives no limit (+∞; core-trace.h says INFINITY).
 */
START_TEST(test_zero_power_branch)
{
	struct bench *b = bench_text("conv", HEAD CW_1W_1MM "'path':["
	    "{'id':'BS1','type':'splitter','reflectance':1,'reflected':["
	    " {'id':'M2','type':'mirror'%s},{'id':'BDr','type':'dump'}]},"
	    "{'id':'M1','type':'mirror','damage':{'cw_irradiance':'1 kW/cm^2'}},"
	    "{'id':'S1','type':'space','length':'1 m'}]}",
	    _i == 0 ? ",'damage':{'cw_irradiance':'1 kW/cm^2'}" : "");
	struct trace *t = trace_run(b);
	const struct trace_row *m1 = row_of(t, "M1");

	CHECK_ABS(m1->power_in, 0, 0);
	CHECK_ABS(m1->irradiance, 0, 0);
	CHECK_ABS(m1->field, 0, 0);
	CHECK_ABS(m1->power_lost, 0, 0);
	CHECK_ABS(m1->ratio, 0, 0);
	ck_assert_int_eq(m1->status, STATUS_OK);
	ck_assert(!row_of(t, "S1")->has_focus);
	ck_assert_uint_eq(count_warn(t, TW_UNTERMINATED), 0);
	CHECK_ABS(t->leaving, 0, 0);
	if (_i == 0) {
		CHECK_REL(row_of(t, "M2")->ratio, 0.0636620, 1e-6);
		ck_assert_str_eq(t->rows[t->worst].el->id, "M2");
		CHECK_REL(t->safe_source_power, 7.85398, 1e-6);
	} else {
		ck_assert_str_eq(t->rows[t->worst].el->id, "M1");
		ck_assert(isinf(t->safe_source_power) && t->safe_source_power > 0);
	}
	trace_free(t);
	model_bench_free(b);
}
END_TEST

/*
 * 5. Round-off is not power.  Linear light through an ideal polarizer
 * whose axis is 90° from it passes cos² 90° = 0 (Malus, REFERENCE §8
 * (Goldstein 2003, from memory) [M]);
 * the path ends there, so nothing is left on the table and the contract's
 * "with power left" is false: no `unterminated` warning
 * (trace-conventions.md, Beams that leave the bench).  The rejected
 * port gets all of it (diattenuator (0, 1), trace-conventions.md).
 */
static const struct crossed_case {
	double pol, axis;	/* degrees */
} crossed_cases[] = {
	{ 0, 90 }, { 45, -45 }, { 30, 120 }, { 60, -30 }, { 10, 100 }, { 72, 162 },
};

START_TEST(test_crossed_polarizer_no_residue)
{
	const struct crossed_case *c = &crossed_cases[_i];
	struct bench *b = bench_text("conv", HEAD
	    "'source':{'wavelength':'1064 nm','power':'1 W','waist':'1 mm','polarization':%g},"
	    "'path':[{'id':'POL1','type':'polarizer','angle':%g,"
	    " 'rejected':[{'id':'BDr','type':'dump'}]}]}", c->pol, c->axis);
	struct trace *t = trace_run(b);
	const struct trace_row *bdr = row_of(t, "BDr");

	CHECK_REL(bdr->power_in, 1, 1e-12);
	ck_assert_msg(count_warn(t, TW_UNTERMINATED) == 0,
	    "polarization %g° on an ideal polarizer at %g°: an unterminated warning "
	    "for %.3g W (hand: 0 W leave)", c->pol, c->axis,
	    t->nwarn ? t->warn[0].value : 0.0);
	CHECK_ABS(t->leaving, 0, 0);
	trace_free(t);
	model_bench_free(b);
}
END_TEST

/* The same through a half-wave plate: H on a HWP at θ comes out linear at
 * 2θ (REFERENCE §8, φ -> 2θ - φ); an ideal polarizer at 2θ + 90° then
 * passes nothing (Malus), so no power leaves the bench (hand). */
static const double hwp_angles[] = { 45, 22.5, 30, 15, 37.5, 10 };

START_TEST(test_hwp_crossed_no_residue)
{
	double th = hwp_angles[_i];
	struct bench *b = bench_text("conv", HEAD CW_1W_1MM "'path':["
	    "{'id':'HWP1','type':'waveplate','retardance':0.5,'angle':%.17g},"
	    "{'id':'POL1','type':'polarizer','angle':%.17g,"
	    " 'rejected':[{'id':'BDr','type':'dump'}]}]}", th, 2 * th + 90);
	struct trace *t = trace_run(b);

	CHECK_REL(row_of(t, "BDr")->power_in, 1, 1e-12);
	ck_assert_msg(count_warn(t, TW_UNTERMINATED) == 0,
	    "HWP at %g°, polarizer at %g°: an unterminated warning for %.3g W "
	    "(hand: 0 W leave)", th, 2 * th + 90, t->nwarn ? t->warn[0].value : 0.0);
	trace_free(t);
	model_bench_free(b);
}
END_TEST

/*
 * 6. A waist exactly at a gap end, or within 1e-9 m of it, "is a focus of
 * that gap" (trace-conventions.md, Foci between elements, as revised with
 * the physics review): found once, in the gap before the plane, also when
 * the lengths are written in decimal and do not add up exactly in binary.
 * (a) waist_position 0.3 m, gaps 0.1 m + 0.2 m + 0.5 m: hand, the waist is
 *     at z = 0.3 m, the end of S2 and the start of S3: S2 holds it, S1
 *     (falling all along) and S3 do not; S3 starts at w = w0 (REFERENCE
 *     §1).  A collimated beam: area ratio √(1 + (0.2 m/zR)²)² = 1.0046
 *     with zR = 2.95262 m (REFERENCE §1 (Siegman 1986 ch. 17, from memory)),
 * under 2: a waist, not a focus.
 * (b) REFERENCE §2 (Self 1983) row 4: w0 = 1 mm, s = f = 100 mm gives s'' = f
 * exactly
 *     (s''/f = 1 + (s/f − 1)/(...) = 1) and w0' = λf/(π w0) = 33.8682 µm:
 *     the waist is at the end of S2 (100 mm): a focus of S2 (the lens sees
 *     w ≈ 1 mm, some 870 times the waist's area), none in S3.
 * (c) control with exact binary lengths (0.25 + 0.25, waist at 0.5 m).
 */
static void
check_one_waist(const struct trace *t, const char *id, double z, const char *on,
    int focus)
{
	const struct trace_row *r = row_of(t, id);
	size_t n = 0;

	for (size_t i = 0; i < t->nrows; i++)
		n += t->rows[i].has_waist;
	ck_assert_msg(n == 1, "%zu waists reported, want 1 (in %s)", n, id);
	ck_assert_msg(r->has_waist, "%s holds no waist", id);
	CHECK_ABS(r->focus.z, z, 1e-9);
	ck_assert_ptr_nonnull(r->focus.on);
	ck_assert_str_eq(r->focus.on->id, on);
	ck_assert_int_eq(r->has_focus, focus);
	ck_assert_int_eq(!!(r->flags & TF_FOCUS), focus);
}

START_TEST(test_focus_waist_at_gap_end_decimal)
{
	struct bench *b = bench_text("conv", HEAD
	    "'source':{'wavelength':'1064 nm','power':'1 W','waist':'1 mm','waist_position':'300 mm'},"
	    "'path':[{'id':'S1','type':'space','length':'100 mm'},"
	    "{'id':'S2','type':'space','length':'200 mm'},"
	    "{'id':'S3','type':'space','length':'500 mm'},{'id':'BD','type':'dump'}]}");
	struct trace *t = trace_run(b);
	double zr = 2.95262;

	CHECK_REL(row_of(t, "S3")->wx, 1e-3, 1e-9);
	check_one_waist(t, "S2", 0.3, "S3", 0);
	CHECK_REL(row_of(t, "S2")->focus.concentration, 1 + 0.04 / (zr * zr), 1e-6);
	check_no_focus(t, "S1", "waist past the end of S1");
	check_no_focus(t, "S3", "waist exactly at the start of S3");
	trace_free(t);
	model_bench_free(b);
}
END_TEST

START_TEST(test_focus_waist_at_gap_end_lens)
{
	struct bench *b = bench_text("conv", HEAD CW_1W_1MM "'path':["
	    "{'id':'S1','type':'space','length':'100 mm'},"
	    "{'id':'L1','type':'lens','focal':'100 mm'},"
	    "{'id':'S2','type':'space','length':'100 mm'},"
	    "{'id':'S3','type':'space','length':'200 mm'},{'id':'BD','type':'dump'}]}");
	struct trace *t = trace_run(b);

	CHECK_REL(row_of(t, "S3")->wx, 33.8682e-6, 1e-6);
	check_one_waist(t, "S2", 0.2, "S3", 1);
	CHECK_REL(row_of(t, "S2")->focus.wx, 33.8682e-6, 1e-6);
	check_no_focus(t, "S3", "Self s = f: waist exactly at the start of S3");
	trace_free(t);
	model_bench_free(b);
}
END_TEST

START_TEST(test_focus_waist_at_gap_end_binary)
{
	struct bench *b = bench_text("conv", HEAD
	    "'source':{'wavelength':'1064 nm','power':'1 W','waist':'1 mm','waist_position':0.5},"
	    "'path':[{'id':'S1','type':'space','length':0.25},"
	    "{'id':'S2','type':'space','length':0.25},"
	    "{'id':'S3','type':'space','length':0.5},{'id':'BD','type':'dump'}]}");
	struct trace *t = trace_run(b);

	check_no_focus(t, "S1", "waist past the end of S1");
	check_one_waist(t, "S2", 0.5, "S3", 0);
	check_no_focus(t, "S3", "waist exactly at the start of S3 (binary)");
	trace_free(t);
	model_bench_free(b);
}
END_TEST

/*
 * 7. Very elliptical beams in the clipping integral (trace-conventions.md,
 * Clipping; REFERENCE §9).  An iris of a = wx/2 = σx (w = 2σ, REFERENCE §0)
 * on a beam with wy ≪ a.  Hand derivation, Cartesian form of the same 2-D
 * integral: T = ∫_{−a}^{a} p(x)·erf(√2·√(a²−x²)/wy) dx with p(x) =
 * √(2/π)/wx·exp(−2x²/wx²).  For wy → 0 the erf is 1 except within
 * ε = a − |x| ~ wy²/a of the rim, so T = erf(√2 a/wx) − D with
 * D = 2 p(a) ∫₀^∞ erfc(2√(aε)/wy) dε = 2 p(a)·wy²/(2a)·∫₀^∞ v erfc(v) dv
 * = p(a)·wy²/(4a)   (∫₀^∞ v erfc v dv = 1/4).
 * erf(√2·½) = erf(1/√2) = 0.682689492 (the ±1σ fraction).  The next terms
 * are below 1e-11 for wy ≤ 1 µm.  Either orientation gives the same T.
 */
static const struct ellipse_case {
	const char *waist;
	double wlong, wshort;
} ellipse_cases[] = {
	{ "['1 mm','1 um']", 1e-3, 1e-6 },		/* 1000:1, a line focus */
	{ "['1 um','1 mm']", 1e-3, 1e-6 },
	{ "['1 mm','100 nm']", 1e-3, 100e-9 },		/* 10⁴:1 */
	{ "['100 nm','1 mm']", 1e-3, 100e-9 },
	{ "['1 mm','10 nm']", 1e-3, 10e-9 },		/* 10⁵:1 */
	{ "['1 mm','1 nm']", 1e-3, 1e-9 },		/* 10⁶:1 */
};

START_TEST(test_clip_very_elliptical)
{
	const struct ellipse_case *c = &ellipse_cases[_i];
	struct bench *b = bench_text("conv", HEAD
	    "'source':{'wavelength':'1064 nm','power':'1 W','waist':%s},"
	    "'path':[{'id':'IR1','type':'iris','diameter':'%g m'},{'id':'BD','type':'dump'}]}",
	    c->waist, c->wlong);
	struct trace *t = trace_run(b);
	const struct trace_row *ir = row_of(t, "IR1");
	double a = c->wlong / 2;
	double pa = sqrt(2 / M_PI) / c->wlong * exp(-2 * a * a / (c->wlong * c->wlong));
	double want = erf(M_SQRT2 * a / c->wlong) - pa * c->wshort * c->wshort / (4 * a);

	CHECK_ABS(1 - ir->clip_loss, want, 1e-8);
	CHECK_REL(row_of(t, "BD")->power_in, want, 1e-7);
	trace_free(t);
	model_bench_free(b);
}
END_TEST

/*
 * 8. The self_focusing condition.  trace-conventions.md ("Transmissive
 * elements with `thickness` and `n2`: `b_integral` = ...; `critical_power`
 * = 3.77·λ²/(8π·n0·n2) ...; the flag `self_focusing` is raised only when
 * that distance is shorter than the element's thickness") puts the flag
 * under elements that have both keys.
 * Pulsed 1030 nm, 1 mJ, 10 ps sech²: P_pk = 0.881374 × 1 mJ/10 ps =
 * 88.1374 MW (REFERENCE §4 (derived; Siegman ch. 17, from memory)), far above
 * P_cr = 4.0648 MW (REFERENCE §11 (Marburger 1975, from memory),
 * 1030 nm, n0 1.45 default, n2 2.7e-20 m²/W).  W2, 500 mm thick: flagged.
 * W1 and L1 with n2 but no thickness: not flagged.
 */
START_TEST(test_self_focusing_needs_thickness)
{
	struct bench *b = bench_text("conv", HEAD
	    "'source':{'wavelength':'1030 nm','waist':'1 mm',"
	    " 'pulsed':{'rep_rate':'1 kHz','pulse_width':'10 ps','shape':'sech2','pulse_energy':'1 mJ'}},"
	    "'path':[{'id':'W2','type':'window','n2':2.7e-20,'thickness':'500 mm'},"
	    "{'id':'W1','type':'window','n2':2.7e-20},"
	    "{'id':'L1','type':'lens','focal':'10 m','n2':2.7e-20},"
	    "{'id':'BD','type':'dump'}]}");
	struct trace *t = trace_run(b);
	const struct trace_row *w2 = row_of(t, "W2");

	CHECK_REL(w2->peak_power, 88.1374e6, 1e-6);
	CHECK_REL(w2->critical_power, 4.0648e6, 2e-5);
	/* REFERENCE §11 (corrected): z_R = π·1.45·(1 mm)²/1030 nm = 4.4226 m,
	 * √21.6828 − 0.852 = 3.80448, z_sf = 0.367·4.4226/√(3.80448² − 0.0219)
	 * = 0.42695 m, by hand: shorter than the 500 mm block, so the beam
	 * collapses inside it */
	CHECK_REL(w2->collapse_distance, 0.42695, 1e-4);
	ck_assert(w2->flags & TF_SELF_FOCUSING);
	ck_assert_msg(!(row_of(t, "W1")->flags & TF_SELF_FOCUSING),
	    "W1 has n2 but no thickness, yet it is flagged self_focusing");
	ck_assert_msg(!(row_of(t, "L1")->flags & TF_SELF_FOCUSING),
	    "L1 has n2 but no thickness, yet it is flagged self_focusing");
	ck_assert_uint_eq(count_warn(t, TW_SELF_FOCUSING), 1);
	trace_free(t);
	model_bench_free(b);
}
END_TEST

/*
 * 9. Keys the format gives every element.  bench-format.md, Elements:
 * "Every element has `id` ..., `type` ..., and may have `label`, `part`,
 * `aperture` (clear-aperture diameter; the beam is clipped there), and
 * `damage`".  A space is an element, so these must parse:
 * (a) a space with an aperture, clipped at its start (trace-conventions.md
 *     "Results ... for a space, at its start").  Beam of REFERENCE §2 (Self
 * 1983) row 1:
 *     at the lens w = w0 √(1 + (1 m/zR)²) = 1.05580 mm (REFERENCE §1 (Siegman
 * 1986 ch. 17, from memory)), a
 *     2 mm aperture passes T = 1 − exp(−2 (1 mm)²/w²) (REFERENCE §9 (derived;
 * Siegman ch. 17, from memory)), and
 *     the focus inside the gap then carries T·1 W:
 *     I = 2 T/(π w0'²), w0' = 32.3966 µm (REFERENCE §2 (Self 1983), §4);
 * (b) a space with a damage rating: I = 63.6620 W/cm² at the waist
 *     (REFERENCE §4 (derived; Siegman ch. 17, from memory)) against 100
 * W/cm²: ratio 0.636620, caution (SF 2);
 * (c) an iris with an aperture: accepted (no number checked: the contract
 *     does not say which of diameter and aperture clips first).
 */
START_TEST(test_space_aperture_focus_power)
{
	char *cause = NULL;
	struct bench *b = bench_try(&cause, HEAD CW_1W_1MM "'path':["
	    "{'id':'S1','type':'space','length':'1 m'},"
	    "{'id':'L1','type':'lens','focal':'100 mm'},"
	    "{'id':'S2','type':'space','length':'300 mm','aperture':'2 mm'},"
	    "{'id':'BD','type':'dump'}]}");
	struct trace *t;
	const struct trace_row *s2;
	double zr = rayleigh(1e-3, 1, LAMBDA), w = radius_at(1e-3, zr, 1.0);
	double tr = 1 - exp(-2 * 1e-6 / (w * w)), w0p = 32.3966e-6;

	ck_assert_msg(b != NULL, "a space with an aperture is refused: %s", cause);
	t = trace_run(b);
	s2 = row_of(t, "S2");
	CHECK_REL(w, 1.05580e-3, 1e-5);
	CHECK_ABS(s2->clip_loss, 1 - tr, 1e-9);
	CHECK_REL(s2->power_in, 1, 1e-15);
	ck_assert(s2->has_focus);
	CHECK_REL(s2->focus.irradiance, 2 * tr / (M_PI * w0p * w0p), 1e-5);
	CHECK_REL(row_of(t, "BD")->power_in, tr, 1e-12);
	trace_free(t);
	model_bench_free(b);
}
END_TEST

START_TEST(test_space_damage)
{
	char *cause = NULL;
	struct bench *b = bench_try(&cause, HEAD CW_1W_1MM "'path':["
	    "{'id':'S1','type':'space','length':'1 mm','damage':{'cw_irradiance':'100 W/cm^2'}},"
	    "{'id':'BD','type':'dump'}]}");
	struct trace *t;

	ck_assert_msg(b != NULL, "a space with a damage rating is refused: %s", cause);
	t = trace_run(b);
	CHECK_REL(row_of(t, "S1")->ratio, 0.636620, 1e-6);
	ck_assert_int_eq(row_of(t, "S1")->status, STATUS_CAUTION);
	trace_free(t);
	model_bench_free(b);
}
END_TEST

START_TEST(test_iris_aperture_accepted)
{
	char *cause = NULL;
	struct bench *b = bench_try(&cause, HEAD CW_1W_1MM "'path':["
	    "{'id':'IR1','type':'iris','diameter':'4 mm','aperture':'4 mm'},"
	    "{'id':'BD','type':'dump'}]}");

	ck_assert_msg(b != NULL, "an iris with an aperture is refused: %s", cause);
	model_bench_free(b);
}
END_TEST

/*
 * 10. Handedness of every reflected port (trace-conventions.md: "Every
 * reflection (mirror, splitter reflected port, polarizer rejected port)
 * also applies diag(1, 1, −1, −1)").
 * (a) H (1, 1, 0, 0) on an ideal polarizer at 45°: the pass port is linear
 *     +45°, (0.5, 0, 0.5, 0); the rejected port diattenuator (0, 1) at 45°
 *     passes the −45° part (0.5, 0, −0.5, 0), which the reflection turns to
 *     (0.5, 0, +0.5, 0) (hand, REFERENCE §8 mirror row: −45° ↔ +45°).
 * (b) circular (1, 0, 0, 1) on a splitter R = 0.4: reflected (0.4, 0, 0,
 *     −0.4), transmitted (0.6, 0, 0, 0.6); then a plain mirror (R = 1) turns
 *     it to (0.6, 0, 0, −0.6) (REFERENCE §8: mirror on (1, 0, 0, 1)).
 * (c) a polarizing splitter, tp = 1, rs = 1, on linear +45° (1, 0, 1, 0):
 *     transmitted diattenuator (1, 0): (0.5, 0.5, 0, 0); reflected
 *     diattenuator (rp = 0, rs = 1) = (0.5, −0.5, 0, 0), unchanged by the
 *     flip (S2 = S3 = 0): hand.
 */
START_TEST(test_reflected_port_handedness)
{
	struct bench *b = bench_text("conv", HEAD
	    "'source':{'wavelength':'1064 nm','power':'1 W','waist':'1 mm','polarization':0},"
	    "'path':[{'id':'POL1','type':'polarizer','angle':45,"
	    " 'rejected':[{'id':'BDr','type':'dump'}]},{'id':'BD','type':'dump'}]}");
	struct trace *t = trace_run(b);
	const double *sr = row_of(t, "BDr")->stokes, *st = row_of(t, "BD")->stokes;

	CHECK_ABS(st[0], 0.5, 1e-12);
	CHECK_ABS(st[1], 0, 1e-12);
	CHECK_ABS(st[2], 0.5, 1e-12);
	CHECK_ABS(sr[0], 0.5, 1e-12);
	CHECK_ABS(sr[1], 0, 1e-12);
	CHECK_ABS(sr[2], 0.5, 1e-12);
	CHECK_ABS(sr[3], 0, 1e-12);
	trace_free(t);
	model_bench_free(b);

	b = bench_text("conv", HEAD
	    "'source':{'wavelength':'1064 nm','power':'1 W','waist':'1 mm','polarization':'circular'},"
	    "'path':[{'id':'BS1','type':'splitter','reflectance':0.4,"
	    " 'reflected':[{'id':'BDr','type':'dump'}]},"
	    "{'id':'M1','type':'mirror'},{'id':'BD','type':'dump'}]}");
	t = trace_run(b);
	sr = row_of(t, "BDr")->stokes;
	CHECK_ABS(sr[0], 0.4, 1e-12);
	CHECK_ABS(sr[3], -0.4, 1e-12);
	CHECK_ABS(row_of(t, "M1")->stokes[3], 0.6, 1e-12);
	CHECK_ABS(row_of(t, "BD")->stokes[3], -0.6, 1e-12);
	trace_free(t);
	model_bench_free(b);

	b = bench_text("conv", HEAD
	    "'source':{'wavelength':'1064 nm','power':'1 W','waist':'1 mm','polarization':45},"
	    "'path':[{'id':'PBS1','type':'splitter','polarizing':true,"
	    " 'reflected':[{'id':'BDr','type':'dump'}]},{'id':'BD','type':'dump'}]}");
	t = trace_run(b);
	sr = row_of(t, "BDr")->stokes;
	st = row_of(t, "BD")->stokes;
	CHECK_ABS(st[0], 0.5, 1e-12);
	CHECK_ABS(st[1], 0.5, 1e-12);
	CHECK_ABS(sr[0], 0.5, 1e-12);
	CHECK_ABS(sr[1], -0.5, 1e-12);
	CHECK_ABS(sr[2], 0, 1e-12);
	trace_free(t);
	model_bench_free(b);
}
END_TEST

/*
 * 11. A convex mirror (roc < 0, "+ concave", bench-format.md), aoi default
 * 0, so f = roc/2 = −1 m on both axes (trace-conventions.md).  At the
 * waist (w = 1 mm, zR = 2.95262 m, REFERENCE §1) the lens matrix gives
 * 1/q' = −1/f − i/zR = 1/(1 m) − i/zR; after L = 1 m,
 * w(L)²/w² = |1 + L/q'|² = (1 + L·1 m⁻¹)² + (L/zR)² (hand, ABCD law):
 * w = 1 mm × √(4 + (1/2.95262)²) = 2.028474 mm.  Diverging: no focus.
 * The polarization default is 0 (bench-format.md): an ideal polarizer at
 * 90° after it passes nothing (Malus, REFERENCE §8).
 */
START_TEST(test_convex_mirror_defaults)
{
	struct bench *b = bench_text("conv", HEAD CW_1W_1MM "'path':["
	    "{'id':'CM1','type':'mirror','roc':'-2 m'},"
	    "{'id':'S1','type':'space','length':'1 m'},"
	    "{'id':'POL1','type':'polarizer','angle':90},{'id':'BD','type':'dump'}]}");
	struct trace *t = trace_run(b);
	const struct trace_row *p = row_of(t, "POL1");
	double zr = rayleigh(1e-3, 1, LAMBDA);

	CHECK_REL(p->wx, 1e-3 * sqrt(4 + 1 / (zr * zr)), 1e-9);
	CHECK_REL(p->wx, 2.028474e-3, 1e-6);
	CHECK_REL(p->wy, p->wx, 1e-12);
	check_no_focus(t, "S1", "diverging after a convex mirror");
	CHECK_ABS(row_of(t, "BD")->power_in, 0, 1e-15);
	trace_free(t);
	model_bench_free(b);
}
END_TEST

/*
 * 12. The edges of the pulse range: "pulse_scaling_out_of_range when either
 * duration lies outside 50 ps … 100 ns" (trace-conventions.md), so 50 ps
 * and 100 ns themselves are inside.  A fluence of 10 J/cm² rated at 100 ns
 * used at 50 ps: 1e5 J/m² × √(50 ps/100 ns) = 2236.068 J/m² (hand,
 * REFERENCE §10 τ^½), pulse_scaled only.  At 49 ps: out of range.
 */
static const struct range_case {
	const char *beam, *rated;
	double scale;
	int out;
} range_cases[] = {
	{ "50 ps", "100 ns", 0.022360679774997897, 0 },
	{ "100 ns", "50 ps", 44.721359549995796, 0 },
	{ "0.05 ns", "0.1 us", 0.022360679774997897, 0 },
	{ "49 ps", "100 ns", 0.022135943621178655, 1 },
	{ "50 ps", "101 ns", 0.022249707974499240, 1 },
};

START_TEST(test_pulse_range_edges)
{
	const struct range_case *c = &range_cases[_i];
	struct bench *b = bench_text("conv", HEAD
	    "'source':{'wavelength':'1064 nm','waist':'1 mm',"
	    " 'pulsed':{'rep_rate':'10 Hz','pulse_width':'%s','pulse_energy':'1 mJ'}},"
	    "'path':[{'id':'M1','type':'mirror','damage':{'fluence':'10 J/cm^2',"
	    " 'pulse_width':'%s'}},{'id':'BD','type':'dump'}]}", c->beam, c->rated);
	struct trace *t = trace_run(b);
	const struct trace_row *m = row_of(t, "M1");

	CHECK_REL(m->limits.fluence, 1e5 * c->scale, 1e-12);
	ck_assert(m->flags & TF_PULSE_SCALED);
	ck_assert_msg(!!(m->flags & TF_PULSE_RANGE) == c->out,
	    "beam %s, rated %s: pulse_scaling_out_of_range %s", c->beam, c->rated,
	    (m->flags & TF_PULSE_RANGE) ? "raised" : "not raised");
	trace_free(t);
	model_bench_free(b);
}
END_TEST

/*
 * 13. The edge of the clipping flag: "more than 1 % raises the flag
 * clipping" (trace-conventions.md).  w = 1 mm, a circular aperture loses
 * exp(−2a²/w²) (REFERENCE §9): a = 1.52 mm loses exp(−4.6208) = 0.98455 %,
 * no flag; a = 1.515 mm loses exp(−4.59045) = 1.01483 %, flagged (hand).
 */
START_TEST(test_clip_flag_edge)
{
	struct bench *b = bench_text("conv", HEAD CW_1W_1MM "'path':["
	    "{'id':'M1','type':'mirror','aperture':'3.04 mm'},{'id':'BD','type':'dump'}]}");
	struct trace *t = trace_run(b);

	CHECK_REL(row_of(t, "M1")->clip_loss, exp(-2 * 1.52 * 1.52), 1e-9);
	CHECK_REL(row_of(t, "M1")->clip_loss, 0.0098455, 1e-4);
	ck_assert(!(row_of(t, "M1")->flags & TF_CLIPPING));
	trace_free(t);
	model_bench_free(b);

	b = bench_text("conv", HEAD CW_1W_1MM "'path':["
	    "{'id':'M1','type':'mirror','aperture':'3.03 mm'},{'id':'BD','type':'dump'}]}");
	t = trace_run(b);
	CHECK_REL(row_of(t, "M1")->clip_loss, exp(-2 * 1.515 * 1.515), 1e-9);
	CHECK_REL(row_of(t, "M1")->clip_loss, 0.0101483, 1e-4);
	ck_assert(row_of(t, "M1")->flags & TF_CLIPPING);
	trace_free(t);
	model_bench_free(b);
}
END_TEST

/*
 * 14. Which power a ratio uses.  trace-conventions.md: quantities at an
 * element use "power P = S0 arriving, before clipping"; ratios are
 * "power in / max_power; power lost / max_absorbed", and `power_lost`
 * counts "absorbed, leaked, clipped".  1 W at w = 1 mm, a 2 mm aperture
 * passes T = 1 − e⁻² = 0.864665 (REFERENCE §9 (derived; Siegman ch. 17, from
 * memory)).
 * (a) a dump with that aperture rated 1.5 W: ratio = 1 W/1.5 W = 0.666667
 *     (not T/1.5); its irradiance is that of the whole watt, 63.6620 W/cm²;
 * (b) a filter od 0 (T = 1) with the aperture, max_absorbed 0.5 W: it loses
 *     the clipped 0.135335 W, ratio 0.270671 (hand).
 * (c) a pulsed source: the CW ratios use the average power
 *     (trace-conventions.md): 10 mJ at 10 Hz = 0.1 W in w = 1 mm is
 *     6.36620 W/cm² against 10 W/cm²: 0.636620.
 */
START_TEST(test_ratio_powers)
{
	struct bench *b = bench_text("conv", HEAD CW_1W_1MM "'path':["
	    "{'id':'F1','type':'filter','od':0,'aperture':'2 mm','max_absorbed':'500 mW'},"
	    "{'id':'BS1','type':'splitter','reflectance':0.5,'reflected':["
	    " {'id':'BDr','type':'dump'}]},"
	    "{'id':'BD','type':'dump','aperture':'2 mm','max_power':'1.5 W'}]}");
	struct trace *t = trace_rerun_opts(NULL, b, TRACE_NO_GHOSTS);  /* main beam */
	const struct trace_row *f1 = row_of(t, "F1"), *bd = row_of(t, "BD");
	double tr = -expm1(-2.0);

	CHECK_ABS(tr, 0.864665, 1e-6);
	CHECK_REL(f1->power_lost, 1 - tr, 1e-12);
	CHECK_REL(f1->ratio, (1 - tr) / 0.5, 1e-12);
	/* BD gets half of T; its ratio is its arriving power over 1.5 W */
	CHECK_REL(bd->power_in, tr / 2, 1e-12);
	CHECK_REL(bd->ratio, tr / 2 / 1.5, 1e-12);
	CHECK_REL(bd->irradiance, 2 * (tr / 2) / (M_PI * 1e-6), 1e-12);
	trace_free(t);
	model_bench_free(b);

	b = bench_text("conv", HEAD CW_1W_1MM "'path':["
	    "{'id':'BD','type':'dump','aperture':'2 mm','max_power':'1.5 W'}]}");
	t = trace_run(b);
	CHECK_REL(row_of(t, "BD")->ratio, 1 / 1.5, 1e-12);
	CHECK_REL(row_of(t, "BD")->irradiance / 1e4, 63.6620, 1e-6);
	CHECK_REL(row_of(t, "BD")->power_lost, 1, 1e-15);
	trace_free(t);
	model_bench_free(b);

	b = bench_text("conv", HEAD
	    "'source':{'wavelength':'1064 nm','waist':'1 mm',"
	    " 'pulsed':{'rep_rate':'10 Hz','pulse_width':'10 ns','pulse_energy':'10 mJ'}},"
	    "'path':[{'id':'M1','type':'mirror','damage':{'cw_irradiance':'10 W/cm^2'}},"
	    "{'id':'BD','type':'dump'}]}");
	t = trace_run(b);
	CHECK_REL(row_of(t, "M1")->ratio, 0.636620, 1e-6);
	trace_free(t);
	model_bench_free(b);
}
END_TEST

/*
 * 15. The JSON fields of bench-format.md, "Trace output": top level
 * bench, elements, warnings, worst {id, ratio}, safe_source_power; each
 * entry id, type, branch, z, power_in, power_lost, radius_x, radius_y,
 * irradiance, linear_density, peak_irradiance, field, clip_loss, ratio
 * (null when unrated), status, flags, and for pulsed sources fluence and
 * peak_power; a space also focus (null or {z, radius_x, radius_y,
 * irradiance, peak_irradiance, air_breakdown}).  Warnings as in
 * trace-conventions.md: b_integral {kind, branch, after, value},
 * unterminated {kind, branch, after, power}.
 * The bench: 1030 nm, w = 1 mm, 2 mJ in 1 ps gaussian: P_pk = 0.939437 ×
 * 2 mJ/1 ps (REFERENCE §4), I_pk = 2 P_pk/(π w²); each 10 mm window with
 * n2 2.7e-20 adds B1 = 2π n2 I_pk L/λ ≈ 1.97 rad (REFERENCE §11), so the
 * sum passes 3 rad at W2 with value B1 + B2 (hand; B2 a hair less, W2
 * standing 10 mm of glass past the waist).  A lens then focuses in
 * S2 (REFERENCE §2 row 1 geometry, here at 1030 nm: the waist lies inside
 * the 300 mm gap); the path ends in a mirror of R = 0.5, so 2 mJ × 1 kHz =
 * 2 W average × 0.5 = 1 W leaves the bench (hand).  M1 is rated, so it is
 * the worst element; W1, W2, S1, L1, S2 are unrated (ratio null).
 */
static void
need_keys(json_t *o, const char *const *keys, size_t n, const char *what)
{
	for (size_t i = 0; i < n; i++)
		ck_assert_msg(json_object_get(o, keys[i]) != NULL, "%s lacks \"%s\"",
		    what, keys[i]);
}

START_TEST(test_json_fields)
{
	static const char *const top[] = { "bench", "elements", "warnings", "worst",
	    "safe_source_power" };
	static const char *const entry[] = { "id", "type", "branch", "z", "power_in",
	    "power_lost", "radius_x", "radius_y", "irradiance", "linear_density",
	    "peak_irradiance", "field", "clip_loss", "ratio", "status", "flags",
	    "fluence", "peak_power" };
	static const char *const focus[] = { "z", "radius_x", "radius_y", "irradiance",
	    "peak_irradiance", "air_breakdown" };
	struct bench *b = bench_text("conv", HEAD
	    "'source':{'wavelength':'1030 nm','waist':'1 mm',"
	    " 'pulsed':{'rep_rate':'1 kHz','pulse_width':'1 ps','pulse_energy':'2 mJ'}},"
	    "'path':[{'id':'W1','type':'window','thickness':'10 mm','n2':2.7e-20},"
	    "{'id':'W2','type':'window','thickness':'10 mm','n2':2.7e-20},"
	    "{'id':'S1','type':'space','length':'1 m'},"
	    "{'id':'L1','type':'lens','focal':'100 mm'},"
	    "{'id':'S2','type':'space','length':'300 mm'},"
	    "{'id':'M1','type':'mirror','reflectance':0.5,'damage':{'fluence':'1 J/cm^2',"
	    " 'pulse_width':'1 ps'}}]}");
	struct trace *t = trace_run(b);
	char *text = report_json(t);
	json_error_t jerr;
	json_t *root = json_loads(text, 0, &jerr), *els, *w, *x;
	double ppk = 2 * sqrt(log(2.0) / M_PI) * 2e-3 / 1e-12;
	double b1 = 2 * M_PI * 2.7e-20 * (2 * ppk / (M_PI * 1e-6)) * 10e-3 / 1030e-9;
	size_t i, nb = 0, nu = 0;

	ck_assert_msg(root != NULL, "report_json is not JSON: %s", jerr.text);
	need_keys(root, top, NELEMS(top), "the trace");
	ck_assert_str_eq(json_string_value(json_object_get(root, "bench")), "conv");
	els = json_object_get(root, "elements");
	ck_assert_uint_eq(json_array_size(els), 6);
	json_array_foreach(els, i, x) {
		const char *type = json_string_value(json_object_get(x, "type"));
		const char *st = json_string_value(json_object_get(x, "status"));

		need_keys(x, entry, NELEMS(entry), json_string_value(json_object_get(x, "id")));
		ck_assert_str_eq(json_string_value(json_object_get(x, "branch")), "main");
		ck_assert(json_is_array(json_object_get(x, "flags")));
		ck_assert(st != NULL && (strcmp(st, "ok") == 0 || strcmp(st, "caution") == 0 ||
		    strcmp(st, "over") == 0 || strcmp(st, "unrated") == 0));
		if (strcmp(type, "space") == 0) {
			json_t *f = json_object_get(x, "focus");

			ck_assert(f != NULL && (json_is_null(f) || json_is_object(f)));
			if (json_is_object(f)) {
				need_keys(f, focus, NELEMS(focus), "a focus");
				ck_assert(json_is_boolean(json_object_get(f, "air_breakdown")));
				/* a focus concentrates the beam at least 2 times
				 * (issue 9, item 9; trace-conventions.md) */
				ck_assert(json_number_value(json_object_get(f,
				    "concentration")) >= 2);
			}
			/* every waist is kept, with its concentration */
			f = json_object_get(x, "waist");
			ck_assert(f != NULL && (json_is_null(f) || json_is_object(f)));
			if (json_is_object(f)) {
				need_keys(f, focus, NELEMS(focus), "a waist");
				ck_assert(json_object_get(f, "concentration") != NULL);
				ck_assert(json_object_get(f, "on") != NULL);
			}
		}
		/* ratio null when unrated */
		if (strcmp(st, "unrated") == 0)
			ck_assert(json_is_null(json_object_get(x, "ratio")));
		else
			ck_assert(json_is_number(json_object_get(x, "ratio")));
	}
	/* S1 starts at the waist: no focus; S2 holds the lens focus */
	ck_assert(json_is_null(json_object_get(json_array_get(els, 2), "focus")));
	ck_assert(json_is_object(json_object_get(json_array_get(els, 4), "focus")));
	json_array_foreach(json_object_get(root, "warnings"), i, w) {
		const char *kind = json_string_value(json_object_get(w, "kind"));

		ck_assert(json_object_get(w, "branch") != NULL && json_object_get(w, "after") != NULL);
		if (strcmp(kind, "b_integral") == 0) {
			nb++;
			ck_assert_str_eq(json_string_value(json_object_get(w, "after")), "W2");
			/* W2's front face lies 10 mm of glass past the waist, the
			 * reduced distance d = 10 mm/1.45 (REFERENCE §15
			 * (Kogelnik & Li 1966; Hecht, from memory) plate), so
			 * its w² and 1/I_pk grow by 1 + (d/zR)², zR = π w²/λ
			 * (REFERENCE §1 (Siegman 1986 ch. 17, from memory)) */
			double zr = M_PI * 1e-6 / 1030e-9, d = 10e-3 / 1.45;

			CHECK_REL(json_number_value(json_object_get(w, "value")),
			    b1 + b1 / (1 + d * d / (zr * zr)), 1e-9);
		} else if (strcmp(kind, "unterminated") == 0) {
			nu++;
			ck_assert_str_eq(json_string_value(json_object_get(w, "after")), "M1");
			CHECK_REL(json_number_value(json_object_get(w, "power")), 1.0, 1e-9);
		}
	}
	ck_assert_uint_eq(nb, 1);
	ck_assert_uint_eq(nu, 1);
	x = json_object_get(root, "worst");
	ck_assert_str_eq(json_string_value(json_object_get(x, "id")), "M1");
	ck_assert(json_is_number(json_object_get(x, "ratio")));
	ck_assert(json_is_number(json_object_get(root, "safe_source_power")));
	json_decref(root);
	free(text);
	trace_free(t);
	model_bench_free(b);
}
END_TEST

int
main(void)
{
	Suite *s = suite_create("conventions");
	TCase *tb = tcase_create("beam");
	TCase *tp = tcase_create("power");
	TCase *tf = tcase_create("format");

	tcase_add_loop_test(tb, test_waist_position_sign, 0, NELEMS(wp_cases));
	tcase_add_loop_test(tb, test_m2_pair, 0, 2);
	tcase_add_test(tb, test_m2_pair_common_waist);
	tcase_add_test(tb, test_zero_length_space);
	tcase_add_test(tb, test_focus_waist_at_gap_end_decimal);
	tcase_add_test(tb, test_focus_waist_at_gap_end_lens);
	tcase_add_test(tb, test_focus_waist_at_gap_end_binary);
	tcase_add_loop_test(tb, test_clip_very_elliptical, 0, NELEMS(ellipse_cases));
	tcase_add_test(tb, test_clip_flag_edge);
	tcase_add_test(tb, test_convex_mirror_defaults);
	tcase_set_timeout(tb, 30);
	suite_add_tcase(s, tb);

	tcase_add_loop_test(tp, test_zero_power_branch, 0, 2);
	tcase_add_loop_test(tp, test_crossed_polarizer_no_residue, 0, NELEMS(crossed_cases));
	tcase_add_loop_test(tp, test_hwp_crossed_no_residue, 0, NELEMS(hwp_angles));
	tcase_add_test(tp, test_reflected_port_handedness);
	tcase_add_test(tp, test_self_focusing_needs_thickness);
	tcase_add_loop_test(tp, test_pulse_range_edges, 0, NELEMS(range_cases));
	tcase_add_test(tp, test_ratio_powers);
	suite_add_tcase(s, tp);

	tcase_add_test(tf, test_space_aperture_focus_power);
	tcase_add_test(tf, test_space_damage);
	tcase_add_test(tf, test_iris_aperture_accepted);
	tcase_add_test(tf, test_json_fields);
	suite_add_tcase(s, tf);

	return run_suite(s);
}
