/* check_polar.c - unit tests for core-polar: Stokes vectors and Mueller
 * matrices of polarizers, retarders, mirrors and polarizing splitters,
 * against the check values of REFERENCE §8 (Goldstein 2003, from memory) and
 * the closed-form matrices
 * written out there, plus what a lossless retarder must conserve. */
#include <config.h>

#include <check.h>
#include <math.h>
#include <stdint.h>
#include <stdlib.h>

#include "core-polar.h"

#include "check-util.h"

#define TOL		1e-9	/* REFERENCE §8 (Goldstein 2003, from memory): tol 1e-9 abs */
#define DEG		(M_PI / 180)

static void
check_stokes(const double got[4], double s0, double s1, double s2, double s3,
    double tol, const char *what)
{
	ck_assert_msg(fabs(got[0] - s0) <= tol && fabs(got[1] - s1) <= tol &&
	    fabs(got[2] - s2) <= tol && fabs(got[3] - s3) <= tol,
	    "%s: (%.12g, %.12g, %.12g, %.12g), want (%.12g, %.12g, %.12g, %.12g)",
	    what, got[0], got[1], got[2], got[3], s0, s1, s2, s3);
}

static void
check_matrix(const struct mueller *got, const double want[4][4], double tol,
    const char *what)
{
	for (int i = 0; i < 4; i++)
		for (int j = 0; j < 4; j++)
			ck_assert_msg(fabs(got->m[i][j] - want[i][j]) <= tol,
			    "%s: m[%d][%d] = %.15g, want %.15g", what, i, j,
			    got->m[i][j], want[i][j]);
}

/* The states themselves: S0 = power, S1 = I_H - I_V, S2 = I_45 - I_-45
 * (REFERENCE §8 (Goldstein 2003, from memory)); circular is the S3 > 0 state
 * (core-polar.h). */
START_TEST(test_states)
{
	double s[4];

	polar_linear(s, 2, 0);
	check_stokes(s, 2, 2, 0, 0, 1e-15, "H");
	polar_linear(s, 2, 90);
	check_stokes(s, 2, -2, 0, 0, 1e-15, "V");
	polar_linear(s, 2, 45);
	check_stokes(s, 2, 0, 2, 0, 1e-15, "+45");
	polar_linear(s, 2, -45);
	check_stokes(s, 2, 0, -2, 0, 1e-15, "-45");
	polar_circular(s, 3);
	check_stokes(s, 3, 0, 0, 3, 0, "circular");
	polar_unpolarized(s, 5);
	check_stokes(s, 5, 0, 0, 0, 0, "unpolarized");
	polar_linear(s, 1, 30);
	CHECK_ABS(polar_linear_angle(s), 30, 1e-12);
	CHECK_ABS(polar_dop(s), 1, 1e-15);
	polar_unpolarized(s, 1);
	CHECK_ABS(polar_dop(s), 0, 0);
	/* half polarized: (1, 0.3, 0.4, 0) has DOP 0.5 */
	s[0] = 1, s[1] = 0.3, s[2] = 0.4, s[3] = 0;
	CHECK_ABS(polar_dop(s), 0.5, 1e-15);
}
END_TEST

/* REFERENCE §8 (Goldstein 2003, from memory): HWP at 22.5°, then an ideal
 * PBS: 0.5 / 0.5.  The PBS's
 * transmitted port is diattenuator(Tp, Ts, 0°) and its reflected port
 * diag(1, 1, -1, -1)·diattenuator(Rs, Rp, 90°). */
START_TEST(test_hwp_pbs)
{
	struct mueller hwp, tr, rf;
	double h[4], mid[4], t[4], r[4];

	polar_linear(h, 1, 0);
	polar_retarder(&hwp, 0.5, 22.5);
	polar_apply(&hwp, h, mid);
	polar_diattenuator(&tr, 1, 0, 0);
	polar_diattenuator(&rf, 1, 0, 90);	/* Rs = 1 along y, Rp = 0 */
	polar_reflect(&rf);
	polar_apply(&tr, mid, t);
	polar_apply(&rf, mid, r);
	CHECK_ABS(t[0], 0.5, TOL);
	CHECK_ABS(r[0], 0.5, TOL);
}
END_TEST

/* REFERENCE §8 (Goldstein 2003, from memory): a half-wave plate maps linear φ
 * to 2θ - φ. */
static const struct hwp_case {
	double axis, in, out;
} hwp_cases[] = {
	{ 10, 0, 20 },		/* REFERENCE §8 (Goldstein 2003, from memory): HWP at 10° on H -> 20° */
	{ 10, 30, -10 },	/* REFERENCE §8 (Goldstein 2003, from memory): HWP at 10° on 30° -> -10° */
	{ 22.5, 0, 45 },	/* 2θ - φ with θ = 22.5°, φ = 0 */
	{ 45, 0, 90 - 180 },	/* H -> V (angle reported in (-90, 90]) */
	{ -15, 20, -50 },	/* 2θ - φ */
};

START_TEST(test_hwp_linear)
{
	const struct hwp_case *c = &hwp_cases[_i];
	struct mueller m;
	double s[4], o[4], want = c->out;

	polar_linear(s, 1, c->in);
	polar_retarder(&m, 0.5, c->axis);
	polar_apply(&m, s, o);
	CHECK_ABS(o[0], 1, TOL);
	CHECK_ABS(o[3], 0, TOL);
	CHECK_ABS(polar_dop(o), 1, TOL);
	/* compare as an orientation: angles modulo 180° */
	{
		double d = fmod(polar_linear_angle(o) - want + 360 + 90, 180) - 90;

		CHECK_ABS(d, 0, 1e-7);
	}
	CHECK_ABS(o[1], cos(2 * want * DEG), TOL);
	CHECK_ABS(o[2], sin(2 * want * DEG), TOL);
}
END_TEST

/* REFERENCE §8 (Goldstein 2003, from memory): QWP at +45° on H gives (1, 0,
 * 0, +1), at -45° (1, 0, 0, -1);
 * core-polar.h makes +1 the "circular" state. */
START_TEST(test_qwp)
{
	struct mueller m;
	double h[4], o[4], c[4];

	polar_linear(h, 1, 0);
	polar_retarder(&m, 0.25, 45);
	polar_apply(&m, h, o);
	check_stokes(o, 1, 0, 0, 1, TOL, "QWP +45 on H");
	polar_circular(c, 1);
	check_stokes(o, c[0], c[1], c[2], c[3], TOL, "QWP +45 on H is 'circular'");
	polar_retarder(&m, 0.25, -45);
	polar_apply(&m, h, o);
	check_stokes(o, 1, 0, 0, -1, TOL, "QWP -45 on H");
}
END_TEST

/* Malus's law I = I0 cos² θ (Hecht §8.2, from memory); REFERENCE §8 row
 * "Malus": 1 / 0.75 / 0.5 / 0.25 / 0. */
static const struct malus_case {
	double axis, t;
} malus_cases[] = {
	{ 0, 1 }, { 30, 0.75 }, { 45, 0.5 }, { 60, 0.25 }, { 90, 0 },
	{ -30, 0.75 }, { 180, 1 }, { 120, 0.25 },	/* cos² is even and 180°-periodic */
};

START_TEST(test_malus)
{
	const struct malus_case *c = &malus_cases[_i];
	struct mueller m;
	double h[4], o[4];

	polar_linear(h, 1, 0);
	polar_diattenuator(&m, 1, 0, c->axis);
	polar_apply(&m, h, o);
	CHECK_ABS(o[0], c->t, TOL);
	/* what leaves an ideal polarizer is linear along its axis */
	if (c->t > 0.01) {
		CHECK_ABS(polar_dop(o), 1, 1e-9);
		CHECK_ABS(o[1], o[0] * cos(2 * c->axis * DEG), TOL);
		CHECK_ABS(o[2], o[0] * sin(2 * c->axis * DEG), TOL);
	}
}
END_TEST

/* REFERENCE §8 (Goldstein 2003, from memory): non-ideal polarizers, T = t1
 * cos²(φ-θ) + t2 sin²(φ-θ). */
static const struct er_case {
	double t1, t2, axis, in, t;
} er_cases[] = {
	{ 1, 1e-3, 90, 0, 1.0e-3 },		/* REFERENCE §8: ER 1000, axis 90° */
	{ 1, 1e-3, 45, 0, 0.5005 },		/* REFERENCE §8: ER 1000, axis 45° */
	{ 0.98, 0.98e-3, 30, 0, 0.735245 },	/* REFERENCE §8: t1 0.98, ER 1000, 30° */
	{ 0.9, 0.09, 0, 90, 0.09 },		/* hand: across the axis passes t2 */
};

START_TEST(test_extinction)
{
	const struct er_case *c = &er_cases[_i];
	struct mueller m;
	double s[4], o[4];

	polar_linear(s, 1, c->in);
	polar_diattenuator(&m, c->t1, c->t2, c->axis);
	polar_apply(&m, s, o);
	CHECK_ABS(o[0], c->t, TOL);
}
END_TEST

/* REFERENCE §8 (Goldstein 2003, from memory): unpolarized light through an
 * ideal polarizer: 0.5, at any
 * axis; through t1, t2: (t1 + t2)/2. */
START_TEST(test_unpolarized_polarizer)
{
	struct mueller m;
	double s[4], o[4];

	polar_unpolarized(s, 1);
	for (int a = -90; a <= 180; a += 15) {
		polar_diattenuator(&m, 1, 0, a);
		polar_apply(&m, s, o);
		CHECK_ABS(o[0], 0.5, TOL);
		polar_diattenuator(&m, 0.9, 0.01, a);
		polar_apply(&m, s, o);
		CHECK_ABS(o[0], 0.455, TOL);
	}
}
END_TEST

/* REFERENCE §8 (Goldstein 2003, from memory): PBS split for linear input at
 * φ: T = cos² φ, R = 1 - T
 * (the table prints 1 / 0.933013 / 0.75 / 0.5 / 0.25; held here to 1e-6
 * against the table and to 1e-9 against cos²). */
static const struct split_case {
	double in, t;
} split_cases[] = {
	{ 0, 1 }, { 15, 0.933013 }, { 30, 0.75 }, { 45, 0.5 }, { 60, 0.25 },
};

START_TEST(test_pbs_split)
{
	const struct split_case *c = &split_cases[_i];
	struct mueller tr, rf;
	double s[4], t[4], r[4], c2 = cos(c->in * DEG) * cos(c->in * DEG);

	polar_linear(s, 1, c->in);
	polar_diattenuator(&tr, 1, 0, 0);
	polar_diattenuator(&rf, 1, 0, 90);
	polar_reflect(&rf);
	polar_apply(&tr, s, t);
	polar_apply(&rf, s, r);
	CHECK_ABS(t[0], c->t, 1e-6);
	CHECK_ABS(t[0], c2, TOL);
	CHECK_ABS(r[0], 1 - c2, TOL);
	/* the reflected port is s (vertical) light */
	if (r[0] > 1e-3)
		CHECK_ABS(r[1], -r[0], TOL);
}
END_TEST

/* diattenuator(Rs, Rp, 90°) is diattenuator(Rp, Rs, 0°): a fold's
 * reflected port written either way (REFERENCE §8 (Goldstein 2003, from
 * memory) and trace-conventions). */
START_TEST(test_pbs_forms_agree)
{
	struct mueller a, b;

	polar_diattenuator(&a, 0.995, 0.02, 90);
	polar_diattenuator(&b, 0.02, 0.995, 0);
	check_matrix(&a, (const double (*)[4])b.m, 1e-12, "Rs/Rp at 90 vs Rp/Rs at 0");
}
END_TEST

/* REFERENCE §8 (Goldstein 2003, from memory): an ideal mirror in the unfolded
 * frame is diag(1, 1, -1, -1):
 * +45° -> -45°, (1, 0, 0, 1) -> (1, 0, 0, -1); two mirrors: identity. */
START_TEST(test_mirror)
{
	static const double ident[4][4] = {
		{ 1, 0, 0, 0 }, { 0, 1, 0, 0 }, { 0, 0, 1, 0 }, { 0, 0, 0, 1 },
	};
	static const double flip[4][4] = {
		{ 1, 0, 0, 0 }, { 0, 1, 0, 0 }, { 0, 0, -1, 0 }, { 0, 0, 0, -1 },
	};
	struct mueller m, two;
	double s[4], o[4];

	polar_identity(&m);
	check_matrix(&m, ident, 0, "identity");
	polar_reflect(&m);
	check_matrix(&m, flip, 0, "one mirror");
	polar_linear(s, 1, 45);
	polar_apply(&m, s, o);
	check_stokes(o, 1, 0, -1, 0, TOL, "mirror on +45");
	polar_circular(s, 1);
	polar_apply(&m, s, o);
	check_stokes(o, 1, 0, 0, -1, TOL, "mirror on circular");
	polar_mul(&two, &m, &m);
	check_matrix(&two, ident, 0, "two mirrors");
	polar_reflect(&m);
	check_matrix(&m, ident, 0, "reflect applied twice");
}
END_TEST

/* REFERENCE §8 [derived]: a mirror with Rs = 0.995, Rp = 0.98 (x = p)
 * passes 0.98 of H, 0.995 of V, 0.9875 of 45° or unpolarized light:
 * power after = ½(Rp+Rs) S0 + ½(Rp-Rs) S1. */
START_TEST(test_mirror_rs_rp)
{
	struct mueller m;
	double s[4], o[4];

	polar_diattenuator(&m, 0.98, 0.995, 0);
	polar_reflect(&m);
	polar_linear(s, 1, 0);
	polar_apply(&m, s, o);
	CHECK_ABS(o[0], 0.98, TOL);
	polar_linear(s, 1, 90);
	polar_apply(&m, s, o);
	CHECK_ABS(o[0], 0.995, TOL);
	polar_linear(s, 1, 45);
	polar_apply(&m, s, o);
	CHECK_ABS(o[0], 0.9875, TOL);
	polar_unpolarized(s, 1);
	polar_apply(&m, s, o);
	CHECK_ABS(o[0], 0.9875, TOL);
	polar_circular(s, 1);
	polar_apply(&m, s, o);
	CHECK_ABS(o[0], 0.9875, TOL);
}
END_TEST

/* The closed-form matrices of REFERENCE §8 (Goldstein, Polarized Light,
 * 2nd ed., ch. 4-5, from memory), written out here and compared element by
 * element with the program's over random parameters. */
static void
ref_diattenuator(double m[4][4], double t1, double t2, double th)
{
	double c = cos(2 * th * DEG), s = sin(2 * th * DEG);
	double a = t1 + t2, b = t1 - t2, g = 2 * sqrt(t1 * t2);
	double r[4][4] = {
		{ a, b * c, b * s, 0 },
		{ b * c, a * c * c + g * s * s, (a - g) * c * s, 0 },
		{ b * s, (a - g) * c * s, a * s * s + g * c * c, 0 },
		{ 0, 0, 0, g },
	};

	for (int i = 0; i < 4; i++)
		for (int j = 0; j < 4; j++)
			m[i][j] = r[i][j] / 2;
}

static void
ref_retarder(double m[4][4], double delta, double th)
{
	double c = cos(2 * th * DEG), s = sin(2 * th * DEG);
	double cd = cos(delta), sd = sin(delta);
	double r[4][4] = {
		{ 1, 0, 0, 0 },
		{ 0, c * c + s * s * cd, c * s * (1 - cd), -s * sd },
		{ 0, c * s * (1 - cd), s * s + c * c * cd, c * sd },
		{ 0, s * sd, -c * sd, cd },
	};

	for (int i = 0; i < 4; i++)
		for (int j = 0; j < 4; j++)
			m[i][j] = r[i][j];
}

START_TEST(test_closed_forms)
{
	uint64_t st = 2003;

	for (int i = 0; i < 300; i++) {
		double t1 = lcg_uniform(&st, 0, 1), t2 = lcg_uniform(&st, 0, 1);
		double th = lcg_uniform(&st, -180, 180), w = lcg_uniform(&st, 0, 2);
		double want[4][4];
		struct mueller m;

		polar_diattenuator(&m, t1, t2, th);
		ref_diattenuator(want, t1, t2, th);
		check_matrix(&m, (const double (*)[4])want, 1e-12, "diattenuator");
		polar_retarder(&m, w, th);
		ref_retarder(want, 2 * M_PI * w, th);
		check_matrix(&m, (const double (*)[4])want, 1e-12, "retarder");
	}
}
END_TEST

/* Conservation: a lossless retarder (any retardance, any axis) keeps S0
 * and the degree of polarization of any state, polarized or partly. */
START_TEST(test_retarder_conserves)
{
	uint64_t st = 1852;

	for (int i = 0; i < 500; i++) {
		double dop = i % 5 == 0 ? 1 : lcg_uniform(&st, 0, 1);
		double az = lcg_uniform(&st, -M_PI, M_PI), el = lcg_uniform(&st, -M_PI / 2, M_PI / 2);
		double p = lcg_uniform(&st, 1e-3, 10);
		double s[4] = { p, p * dop * cos(el) * cos(az), p * dop * cos(el) * sin(az),
		    p * dop * sin(el) };
		double o[4];
		struct mueller m;

		polar_retarder(&m, lcg_uniform(&st, 0, 3), lcg_uniform(&st, -360, 360));
		polar_apply(&m, s, o);
		CHECK_ABS(o[0], s[0], 1e-12 * p);
		CHECK_ABS(polar_dop(o), polar_dop(s), 1e-12);
		CHECK_ABS(polar_dop(s), dop, 1e-12);
	}
}
END_TEST

/* Order of a product: polar_mul(out, a, b) is a·b, b acting first.  A
 * polarizer at 0° then a HWP at 22.5° passes all of H (ending at 45°);
 * the HWP first, then the polarizer, passes half. */
START_TEST(test_mul_order)
{
	struct mueller pol, hwp, ab, ba;
	double h[4], o[4];

	polar_linear(h, 1, 0);
	polar_diattenuator(&pol, 1, 0, 0);
	polar_retarder(&hwp, 0.5, 22.5);
	polar_mul(&ab, &hwp, &pol);	/* pol first */
	polar_mul(&ba, &pol, &hwp);	/* hwp first */
	polar_apply(&ab, h, o);
	check_stokes(o, 1, 0, 1, 0, TOL, "polarizer then HWP");
	polar_apply(&ba, h, o);
	CHECK_ABS(o[0], 0.5, TOL);
	/* out may alias an input */
	polar_mul(&hwp, &pol, &hwp);
	polar_apply(&hwp, h, o);
	CHECK_ABS(o[0], 0.5, TOL);
}
END_TEST

/* polar_scalar(t) scales every component; polar_apply may work in place. */
START_TEST(test_scalar)
{
	struct mueller m;
	double s[4] = { 2, 0.5, -1, 0.7 };

	polar_scalar(&m, 0.25);
	polar_apply(&m, s, s);
	check_stokes(s, 0.5, 0.125, -0.25, 0.175, 1e-15, "scalar in place");
}
END_TEST

int
main(void)
{
	Suite *s = suite_create("polar");
	TCase *tc = tcase_create("stokes");

	tcase_add_test(tc, test_states);
	tcase_add_test(tc, test_hwp_pbs);
	tcase_add_loop_test(tc, test_hwp_linear, 0, NELEMS(hwp_cases));
	tcase_add_test(tc, test_qwp);
	tcase_add_loop_test(tc, test_malus, 0, NELEMS(malus_cases));
	tcase_add_loop_test(tc, test_extinction, 0, NELEMS(er_cases));
	tcase_add_test(tc, test_unpolarized_polarizer);
	tcase_add_loop_test(tc, test_pbs_split, 0, NELEMS(split_cases));
	tcase_add_test(tc, test_pbs_forms_agree);
	tcase_add_test(tc, test_mirror);
	tcase_add_test(tc, test_mirror_rs_rp);
	tcase_add_test(tc, test_closed_forms);
	tcase_add_test(tc, test_retarder_conserves);
	tcase_add_test(tc, test_mul_order);
	tcase_add_test(tc, test_scalar);
	suite_add_tcase(s, tc);
	return run_suite(s);
}
