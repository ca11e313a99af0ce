/* check_beam.c - unit tests for core-beam: the Gaussian beam of one axis
 * (q parameter, ABCD law, M²), focusing by a thin lens against Self's
 * formula, curved mirrors at an angle, clipping at a round aperture and the
 * focus inside a free-space gap.  Expected values come from REFERENCE.md or
 * from an independent computation written out in this file. */
#include <config.h>

#include <check.h>
#include <complex.h>
#include <math.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>

#include "core-beam.h"
#include "core-thick.h"

#include "check-util.h"

/*
 * §1: Rayleigh range, radius, curvature, far-field angle.
 * Kogelnik & Li, Appl. Opt. 5, 1550 (1966) and Siegman, Lasers (1986)
 * ch. 17 (from memory); check values: REFERENCE §1 table.  The table prints
 * six significant figures, so each value is held to half its last digit.
 */
static const struct gauss_case {
	double lambda, w0, m2;
	double zr_m;		/* 5 decimals */
	double z;		/* where w and R are read, m */
	double w_mm;		/* 5 decimals, NAN: not in the table */
	double r_m;		/* 4 decimals, NAN: not in the table */
	double theta_mrad;	/* 6 decimals, NAN: not in the table */
} gauss_cases[] = {
	/* REFERENCE §1 (Siegman 1986 ch. 17, from memory) row 1 */
	{ 1064e-9, 1e-3, 1.0, 2.95262, 10, 3.53136, 10.8718, 0.338682 },
	/* REFERENCE §1 (Siegman 1986 ch. 17, from memory) row 2 */
	{ 1064e-9, 1e-3, 1.5, 1.96842, 10, 5.17771, NAN, NAN },
	/* REFERENCE §1 (Siegman 1986 ch. 17, from memory) row 3 */
	{ 632.8e-9, 0.5e-3, 1.0, 1.24115, 10, NAN, NAN, NAN },
};

START_TEST(test_gauss_table)
{
	const struct gauss_case *c = &gauss_cases[_i];
	struct beam_axis a;

	CHECK_ABS(beam_rayleigh(c->w0, c->m2, c->lambda), c->zr_m, half_digit(5));
	a = beam_axis_from_waist(c->w0, c->m2, c->lambda, c->z);
	ck_assert(a.m2 == c->m2);
	if (!isnan(c->w_mm))
		CHECK_ABS(beam_radius(&a, c->lambda) * 1e3, c->w_mm, half_digit(5));
	if (!isnan(c->r_m))
		CHECK_ABS(beam_curvature(&a), c->r_m, half_digit(4));
	if (!isnan(c->theta_mrad)) {
		/* Far field: w(z)/z -> θ; at z = 1e5 zR the excess is
		 * (zR/z)²/2 = 5e-11, far below the table's digits. */
		double zr = beam_rayleigh(c->w0, c->m2, c->lambda);
		struct beam_axis far = beam_axis_from_waist(c->w0, c->m2, c->lambda, 1e5 * zr);

		CHECK_ABS(beam_radius(&far, c->lambda) / (1e5 * zr) * 1e3,
		    c->theta_mrad, half_digit(6));
	}
}
END_TEST

/* REFERENCE §1 row 4: λ = 1064 nm, w0 = 1 mm, θ = 0.5 mrad gives
 * M² = 1.47631.  The program has no M²-from-θ function, so run it the other
 * way: a beam of M² = 1.47631 must spread at 0.5 mrad (to the 6 figures of
 * M²), and the ISO 11146-1 form M² = π d0 Θ/(4λ) with d0 = 2 w0, Θ = 2θ
 * must give back the M² the beam was made with (ISO 11146-1, from memory). */
START_TEST(test_far_field_m2)
{
	double lambda = 1064e-9, w0 = 1e-3, m2 = 1.47631;
	double zr = beam_rayleigh(w0, m2, lambda);
	struct beam_axis far = beam_axis_from_waist(w0, m2, lambda, 1e6 * zr);
	double theta = beam_radius(&far, lambda) / (1e6 * zr);

	CHECK_REL(theta, 0.5e-3, 5e-6);
	CHECK_REL(M_PI * (2 * w0) * (2 * theta) / (4 * lambda), m2, 1e-9);
}
END_TEST

/* The q law against the closed forms of REFERENCE §1 (Siegman 1986 ch. 17,
 * from memory):
 * w(z) = w0 √(1 + (z/zR)²), R(z) = z (1 + (zR/z)²), zR = π w0²/(M² λ);
 * the waist is -Re q ahead and has radius √(M² λ Im q / π). */
START_TEST(test_q_closed_form)
{
	uint64_t st = 11;

	for (int i = 0; i < 500; i++) {
		double lambda = lcg_uniform(&st, 300e-9, 2000e-9);
		double w0 = lcg_uniform(&st, 20e-6, 5e-3);
		double m2 = i % 3 == 0 ? 1 : lcg_uniform(&st, 1, 20);
		double zr = M_PI * w0 * w0 / (m2 * lambda);
		double z = zr * lcg_uniform(&st, -30, 30);
		struct beam_axis a = beam_axis_from_waist(w0, m2, lambda, z);

		/* zR itself is checked against REFERENCE §1 (Siegman 1986 ch.
		 * 17, from memory)'s table above; here
		 * the radius of q = z + i zR against w0 √(1 + (z/zR)²), a
		 * different expression from the code's |q|²/Im q */
		CHECK_REL(beam_radius(&a, lambda), w0 * sqrt(1 + (z / zr) * (z / zr)), 1e-9);
		CHECK_REL(beam_curvature(&a), z * (1 + (zr / z) * (zr / z)), 1e-9);
		CHECK_REL(beam_waist_distance(&a), -z, 1e-13);
		CHECK_REL(beam_waist_radius(&a, lambda), w0, 1e-9);
	}
}
END_TEST

/* At the waist the wavefront is flat: R = ∞ (core-beam.h). */
START_TEST(test_waist_flat)
{
	struct beam_axis a = beam_axis_from_waist(1e-3, 1.3, 1064e-9, 0);

	ck_assert(isinf(beam_curvature(&a)));
	CHECK_REL(beam_radius(&a, 1064e-9), 1e-3, 1e-12);
	ck_assert(beam_waist_distance(&a) == 0);
}
END_TEST

/*
 * The second-moment law Σ' = M Σ Mᵀ (ISO 11146 / Siegman, from memory;
 * REFERENCE §1), computed here on its own, must agree with the program's q
 * law to 1e-9 through any chain of gaps, thin lenses and general ABCD
 * matrices.  At the waist ⟨x²⟩ = w0²/4, ⟨xθ⟩ = 0, ⟨θ²⟩ = θ²/4 with
 * θ = M² λ/(π w0); w = 2 √⟨x²⟩ and 1/R = ⟨xθ⟩/⟨x²⟩.
 */
struct moments {
	double xx, xt, tt;
};

static void
mom_abcd(struct moments *m, double a, double b, double c, double d)
{
	struct moments o;

	o.xx = a * a * m->xx + 2 * a * b * m->xt + b * b * m->tt;
	o.xt = a * c * m->xx + (a * d + b * c) * m->xt + b * d * m->tt;
	o.tt = c * c * m->xx + 2 * c * d * m->xt + d * d * m->tt;
	*m = o;
}

START_TEST(test_sigma_law)
{
	uint64_t st = 1966 + (uint64_t)_i;
	double lambda = lcg_uniform(&st, 400e-9, 1600e-9);
	double w0 = lcg_uniform(&st, 0.1e-3, 3e-3);
	double m2 = _i % 2 ? 1 : lcg_uniform(&st, 1, 8);
	double theta = m2 * lambda / (M_PI * w0);
	double dz = lcg_uniform(&st, -2, 2);
	struct beam_axis q = beam_axis_from_waist(w0, m2, lambda, dz);
	struct moments s = { w0 * w0 / 4, 0, theta * theta / 4 };

	mom_abcd(&s, 1, dz, 0, 1);
	for (int step = 0; step < 40; step++) {
		int op = (int)(lcg_next(&st) >> 62);

		if (op == 0 || op == 1) {
			double l = lcg_uniform(&st, 0, 1.5);

			beam_space(&q, l);
			mom_abcd(&s, 1, l, 0, 1);
		} else if (op == 2) {
			double f = lcg_uniform(&st, 0.05, 2) * (lcg_next(&st) >> 63 ? 1 : -1);

			beam_lens(&q, f);
			mom_abcd(&s, 1, 0, -1 / f, 1);
		} else {
			/* a thick plate [[1, t/n], [0, 1]] (Kogelnik & Li
			 * 1966 table of ray matrices, from memory) or a
			 * general unimodular matrix */
			double a = lcg_uniform(&st, 0.5, 2), b = lcg_uniform(&st, -0.3, 0.3);
			double c = lcg_uniform(&st, -2, 2), d = (1 + b * c) / a;

			beam_abcd(&q, a, b, c, d);
			mom_abcd(&s, a, b, c, d);
		}
		CHECK_REL(beam_radius(&q, lambda), 2 * sqrt(s.xx), 1e-9);
		if (fabs(s.xt) > 1e-6 * sqrt(s.xx * s.tt))
			CHECK_REL(1 / beam_curvature(&q), s.xt / s.xx, 1e-8);
	}
}
END_TEST

/* beam_abcd with the gap and thin-lens matrices of REFERENCE §1 (Siegman 1986
 * ch. 17, from memory) must do
 * what beam_space and beam_lens do. */
START_TEST(test_abcd_matrices)
{
	struct beam_axis a = beam_axis_from_waist(0.8e-3, 1.2, 1030e-9, -0.4), b = a;

	beam_space(&a, 0.37);
	beam_abcd(&b, 1, 0.37, 0, 1);
	CHECK_REL(creal(a.q), creal(b.q), 1e-14);
	CHECK_REL(cimag(a.q), cimag(b.q), 1e-14);
	beam_lens(&a, -0.25);
	beam_abcd(&b, 1, 0, -1 / -0.25, 1);
	CHECK_REL(creal(a.q), creal(b.q), 1e-13);
	CHECK_REL(cimag(a.q), cimag(b.q), 1e-13);
	ck_assert(a.m2 == 1.2 && b.m2 == 1.2);
}
END_TEST

/*
 * §2: Self, "Focusing of spherical Gaussian beams", Appl. Opt. 22, 658
 * (1983) (content from memory).  REFERENCE §2 table: tol 1e-6 on w0',
 * 1e-6 m on s''.
 */
static const struct self_case {
	double lambda, w0, m2, s, f;
	double w0p_um, spp_mm;
} self_cases[] = {
	{ 1064e-9, 1.0e-3, 1.0, 1.0, 0.10, 32.3966, 100.94459 },	/* REFERENCE §2 (Self 1983) row 1 */
	{ 632.8e-9, 0.5e-3, 1.0, 0.5, 0.20, 78.3153, 207.35994 },	/* REFERENCE §2 (Self 1983) row 2 */
	{ 1064e-9, 2.0e-3, 1.5, 0.0, 0.25, 63.4708, 249.74822 },	/* REFERENCE §2 (Self 1983) row 3 */
	{ 1064e-9, 1.0e-3, 1.0, 0.1, 0.10, 33.8682, 100.00000 },	/* REFERENCE §2 row 4, s = f */
};

/* Self's closed form, REFERENCE §2: s''/f = 1 + (s/f - 1)/[(s/f - 1)² +
 * (zR/f)²], m = 1/√[(s/f - 1)² + (zR/f)²], w0' = m w0, zR' = m² zR. */
static void
self_focus(double lambda, double w0, double m2, double s, double f,
    double *spp, double *w0p, double *zrp)
{
	double zr = M_PI * w0 * w0 / (m2 * lambda), x = s / f - 1, y = zr / f;
	double den = x * x + y * y, mag = 1 / sqrt(den);

	*spp = f * (1 + x / den);
	*w0p = mag * w0;
	*zrp = mag * mag * zr;
}

START_TEST(test_self_table)
{
	const struct self_case *c = &self_cases[_i];
	struct beam_axis a = beam_axis_from_waist(c->w0, c->m2, c->lambda, c->s);
	double spp, w0p, zrp;

	beam_lens(&a, c->f);
	CHECK_ABS(beam_waist_distance(&a), c->spp_mm * 1e-3, 1e-6);
	CHECK_REL(beam_waist_radius(&a, c->lambda), c->w0p_um * 1e-6, 1e-6);

	/* The two routes agree to 1e-10 (REFERENCE §2 (Self 1983)). */
	self_focus(c->lambda, c->w0, c->m2, c->s, c->f, &spp, &w0p, &zrp);
	CHECK_ABS(beam_waist_distance(&a), spp, 1e-10 * c->f);
	CHECK_REL(beam_waist_radius(&a, c->lambda), w0p, 1e-10);
	CHECK_REL(cimag(a.q + beam_waist_distance(&a)), zrp, 1e-10);

	/* Self's first form: 1/(s + zR²/(s - f)) + 1/s'' = 1/f. */
	if (c->s != c->f) {
		double zr = beam_rayleigh(c->w0, c->m2, c->lambda);

		CHECK_REL(1 / (c->s + zr * zr / (c->s - c->f)) +
		    1 / beam_waist_distance(&a), 1 / c->f, 1e-9);
	}
}
END_TEST

/* Self's formula over many random lens set-ups, either sign of f. */
START_TEST(test_self_random)
{
	uint64_t st = 1983;

	for (int i = 0; i < 400; i++) {
		double lambda = lcg_uniform(&st, 350e-9, 1600e-9);
		double w0 = lcg_uniform(&st, 0.1e-3, 3e-3);
		double m2 = lcg_uniform(&st, 1, 4);
		double s = lcg_uniform(&st, -1, 3);
		double f = lcg_uniform(&st, 0.03, 1.5) * (i % 4 == 3 ? -1 : 1);
		struct beam_axis a = beam_axis_from_waist(w0, m2, lambda, s);
		double spp, w0p, zrp;

		beam_lens(&a, f);
		self_focus(lambda, w0, m2, s, f, &spp, &w0p, &zrp);
		CHECK_ABS(beam_waist_distance(&a), spp, 1e-9 * fabs(f));
		CHECK_REL(beam_waist_radius(&a, lambda), w0p, 1e-9);
	}
}
END_TEST

/*
 * §3: a curved mirror at angle of incidence θ: f_t = (R/2) cos θ,
 * f_s = (R/2)/cos θ (Kogelnik, Ippen, Dienes & Shank, IEEE J. Quantum
 * Electron. QE-8, 373 (1972), from memory).  REFERENCE §3 table, printed to
 * 6 decimals; the exact formula is held to 1e-12.
 */
static const struct mirror_case {
	double roc, aoi, ft, fs;
} mirror_cases[] = {
	{ 1.0, 45, 0.353553, 0.707107 },	/* REFERENCE §3 (Kogelnik et al. 1972, from memory) row 1 */
	{ 1.0, 10, 0.492404, 0.507713 },	/* REFERENCE §3 (Kogelnik et al. 1972, from memory) row 2 */
	{ 0.5, 45, 0.176777, 0.353553 },	/* REFERENCE §3 (Kogelnik et al. 1972, from memory) row 3 */
	{ 0.2, 5, 0.099619, 0.100382 },		/* REFERENCE §3 (Kogelnik et al. 1972, from memory) row 4 */
};

START_TEST(test_mirror_focal)
{
	const struct mirror_case *c = &mirror_cases[_i];
	double fx = NAN, fy = NAN, cth = cos(c->aoi * M_PI / 180);

	beam_mirror_focal(c->roc, c->aoi, &fx, &fy);
	CHECK_ABS(fx, c->ft, half_digit(6));
	CHECK_ABS(fy, c->fs, half_digit(6));
	CHECK_REL(fx, c->roc / 2 * cth, 1e-12);
	CHECK_REL(fy, c->roc / 2 / cth, 1e-12);

	/* A convex mirror (R < 0) diverges on both axes. */
	beam_mirror_focal(-c->roc, c->aoi, &fx, &fy);
	CHECK_REL(fx, -c->roc / 2 * cth, 1e-12);
	CHECK_REL(fy, -c->roc / 2 / cth, 1e-12);
}
END_TEST

/* At normal incidence a mirror of radius R is a lens of focal R/2 on both
 * axes (REFERENCE §3 (Kogelnik et al. 1972, from memory) with θ = 0). */
START_TEST(test_mirror_normal)
{
	double fx, fy;

	beam_mirror_focal(0.8, 0, &fx, &fy);
	CHECK_REL(fx, 0.4, 1e-15);
	CHECK_REL(fy, 0.4, 1e-15);
}
END_TEST

/*
 * §9: clipping at a centred round aperture of radius a.  Circular:
 * T = 1 - exp(-2a²/w²) (Siegman ch. 17, from memory); elliptical: the
 * angular integral of REFERENCE §9 [derived].  Table values, tol 1e-6 abs.
 */
static const struct clip_case {
	double wx, wy, a, t;
} clip_cases[] = {
	{ 1, 1, 1.0, 0.864665 },	/* REFERENCE §9 (derived; Siegman ch. 17, from memory) table, 1:1, a = wx */
	{ 1, 1, 1.5, 0.988891 },	/* REFERENCE §9 (derived; Siegman ch. 17, from memory) table, 1:1, a = 1.5 wx */
	{ 1, 1, 2.0, 0.999665 },	/* REFERENCE §9 (derived; Siegman ch. 17, from memory) table, 1:1, a = 2 wx */
	{ 1, 0.5, 1.0, 0.945455 },	/* REFERENCE §9 (derived; Siegman ch. 17, from memory) table, 1:0.5, a = wx */
	{ 1, 0.5, 1.5, 0.996829 },	/* REFERENCE §9 table, 1:0.5, a = 1.5 wx */
	{ 1, 0.5, 2.0, 0.999926 },	/* REFERENCE §9 table, 1:0.5, a = 2 wx */
	{ 1, 1, 0.5, 0.393469 },	/* REFERENCE §9, a = 0.5 w */
	{ 1, 1, M_PI / 2, 0.992808 },	/* REFERENCE §9, diameter πw passes ≈99 % (Siegman ch. 17, from memory) */
	{ 1, 1, 1.517427, 0.99 },	/* REFERENCE §9, T = 0.99 at a = 1.517427 w */
	{ 1.2e-3, 0.6e-3, 1.0e-3, 0.883459 },	/* REFERENCE §9, last example */
	{ 2e-3, 2e-3, 2e-3, 0.864665 },	/* same as row 1, scaled to mm */
	{ 0.5, 1, 1.0, 0.945455 },	/* row 4 with x and y swapped */
};

START_TEST(test_clip_table)
{
	const struct clip_case *c = &clip_cases[_i];

	CHECK_ABS(beam_clip_transmission(c->wx, c->wy, c->a), c->t, 1e-6);
}
END_TEST

/* The angular integral of REFERENCE §9 (derived; Siegman ch. 17, from memory)
 * done here with the midpoint rule
 * (periodic, smooth integrand: spectral convergence), compared with the
 * program over random ellipses and apertures. */
static double
clip_reference(double wx, double wy, double a)
{
	const int n = 8192;
	double sum = 0;

	for (int i = 0; i < n; i++) {
		double phi = (i + 0.5) * 2 * M_PI / n, c = cos(phi), s = sin(phi);
		double g = c * c / (wx * wx) + s * s / (wy * wy);

		sum += -expm1(-2 * a * a * g) / g;
	}
	return sum * (2 * M_PI / n) / (2 * M_PI * wx * wy);
}

START_TEST(test_clip_random)
{
	uint64_t st = 9;

	for (int i = 0; i < 200; i++) {
		double wx = lcg_uniform(&st, 0.1e-3, 5e-3);
		double wy = wx * lcg_uniform(&st, 0.1, 10);
		double a = fmax(wx, wy) * lcg_uniform(&st, 0.05, 3);
		double t = beam_clip_transmission(wx, wy, a);

		CHECK_ABS(t, clip_reference(wx, wy, a), 1e-10);
		/* x and y play the same part */
		CHECK_ABS(beam_clip_transmission(wy, wx, a), t, 1e-12);
	}
}
END_TEST

/* The same transmission by another road: the intensity is separable, so
 * T = ∫ p(x) · P(|y| < √(a² − x²)) dx with p the normal density of σ =
 * wx/2 and P = erf(√2 √(a² − x²)/wy) [derived]; x = a sin θ removes the
 * root's end points, and Simpson's rule on 2·10⁵ intervals does the rest.
 * Independent of the angular integral used by the program and above. */
static double
clip_separable(double wx, double wy, double a)
{
	const int n = 200000;
	double h = M_PI / n, sum = 0;

	for (int i = 0; i <= n; i++) {
		double th = -M_PI / 2 + i * h, co = cos(th), si = sin(th);
		double f = sqrt(2 / M_PI) * (a / wx) * co * exp(-2 * a * a * si * si / (wx * wx)) *
		    erf(M_SQRT2 * a * co / wy);

		sum += f * (i == 0 || i == n ? 1 : i % 2 ? 4 : 2);
	}
	return sum * h / 3;
}

/* Ghosts near a line focus meet apertures much narrower than their long
 * axis and wider than their short one: the hardest case for the
 * quadrature (c = 2a²/wx² and r² = (wy/wx)² as the demo's ghosts give them). */
START_TEST(test_clip_very_elliptic)
{
	static const double cases[][2] = {
		{ 0.0784643, 0.0092703 }, { 0.0442204, 0.000744748 }, { 0.0297822, 0.00351866 },
		{ 0.0112814, 0.000189998 }, { 0.534993, 0.0352714 }, { 5, 1e-4 }, { 0.3, 1e-6 },
	};

	for (size_t i = 0; i < NELEMS(cases); i++) {
		double wx = 2e-3, a = sqrt(cases[i][0] / 2) * wx, wy = sqrt(cases[i][1]) * wx;

		CHECK_ABS(beam_clip_transmission(wx, wy, a), clip_separable(wx, wy, a), 1e-10);
		CHECK_ABS(beam_clip_transmission(wy, wx, a), clip_separable(wx, wy, a), 1e-10);
	}
}
END_TEST

/* Beams near round take the program's series (e² <= 0.5, wy/wx within
 * 1 + √2) and the rest the quadrature: both against the separable
 * integral, relative to T so that small apertures count too, on either
 * side of the switch and down to a hundredth of the beam. */
START_TEST(test_clip_near_round)
{
	static const double ratio[] = { 1 + 1e-9, 1.001, 1.05, 1.3, 1.6, 2.0, 2.41, 2.42, 3.0 };
	static const double aw[] = { 0.01, 0.1, 0.5, 1.0, 1.7, 3.0 };

	for (size_t i = 0; i < NELEMS(ratio); i++) {
		for (size_t j = 0; j < NELEMS(aw); j++) {
			double wx = 1e-3, wy = wx * ratio[i], a = aw[j] * wy;
			double ref = clip_separable(wx, wy, a);

			ck_assert_msg(fabs(beam_clip_transmission(wx, wy, a) - ref) <= 1e-9 * ref,
			    "wy/wx %g, a/wy %g: T %.15g, separable %.15g", ratio[i], aw[j],
			    beam_clip_transmission(wx, wy, a), ref);
			ck_assert_msg(fabs(beam_clip_transmission(wy, wx, a) - ref) <= 1e-9 * ref,
			    "wx/wy %g, a/wx %g", ratio[i], aw[j]);
		}
	}
}
END_TEST

/* Limits: nothing passes a closed aperture, everything passes a huge one,
 * a nearly round beam meets the circular formula, and a wider opening
 * never passes less. */
START_TEST(test_clip_limits)
{
	double prev = 0;

	CHECK_ABS(beam_clip_transmission(1e-3, 1e-3, 0), 0, 1e-15);
	CHECK_ABS(beam_clip_transmission(1e-3, 0.3e-3, 0), 0, 1e-15);
	CHECK_ABS(beam_clip_transmission(1e-3, 1e-3, 1), 1, 1e-15);
	CHECK_ABS(beam_clip_transmission(1e-3, 0.3e-3, 1), 1, 1e-12);
	/* wy = wx (1 + 1e-7): the circular formula to ~1e-7 */
	CHECK_ABS(beam_clip_transmission(1e-3, 1e-3 * (1 + 1e-7), 1e-3),
	    -expm1(-2.0), 1e-6);
	for (int i = 1; i <= 60; i++) {
		double t = beam_clip_transmission(2e-3, 0.7e-3, i * 0.1e-3);

		ck_assert_msg(t >= prev, "T falls from %g to %g at a = %d00 um", prev, t, i);
		ck_assert(t <= 1);
		prev = t;
	}
}
END_TEST

/*
 * The focus in a gap (trace-conventions.md "Foci between elements"): there
 * is one when wx·wy falls at the start and rises at the end; it lies where
 * wx·wy is smallest; a waist exactly at either end is no focus of the gap.
 */

/* Stigmatic focus after a lens: it must sit at Self's s'' with Self's w0'
 * (REFERENCE §2 table rows; the gap is longer than s''). */
START_TEST(test_gap_focus_self)
{
	const struct self_case *c = &self_cases[_i];
	struct beam_axis x = beam_axis_from_waist(c->w0, c->m2, c->lambda, c->s), y;
	double dz = NAN, wx = NAN, wy = NAN;

	beam_lens(&x, c->f);
	y = x;
	ck_assert_int_eq(beam_gap_focus(&x, &y, c->lambda, 2 * c->spp_mm * 1e-3, 0,
	    &dz, &wx, &wy), 1);
	CHECK_ABS(dz, c->spp_mm * 1e-3, 1e-6);
	CHECK_REL(wx, c->w0p_um * 1e-6, 1e-6);
	CHECK_REL(wy, c->w0p_um * 1e-6, 1e-6);
}
END_TEST

/* No focus: diverging beam, waist past the end, waist exactly at the start
 * or the end, an empty gap.  Waists and lengths are exact binary fractions
 * so "exactly at the end" is exact. */
static const struct nofocus_case {
	double waist_at, length;	/* waist distance from the gap start */
	const char *why;
} nofocus_cases[] = {
	{ -0.25, 1.0, "waist behind the gap: diverging" },
	{ 2.0, 1.0, "waist past the end: converging all the way" },
	{ 0.0, 1.0, "waist exactly at the start" },
	{ 0.5, 0.5, "waist exactly at the end" },
	{ 0.25, 0.0, "empty gap" },
};

START_TEST(test_gap_focus_none)
{
	const struct nofocus_case *c = &nofocus_cases[_i];
	struct beam_axis x = { -c->waist_at + I * 0.015625, 1 }, y = x;
	double dz = -1, wx = -1, wy = -1;

	ck_assert_msg(beam_gap_focus(&x, &y, 1064e-9, c->length, 0, &dz, &wx, &wy) == 0,
	    "%s: focus reported at %g", c->why, dz);
}
END_TEST

/* Independent model of the gap for the astigmatic tests: axis i has its
 * waist at a_i = -Re q_i and Rayleigh range z_i = Im q_i, so
 * ln(wx·wy) = const + ½ ln(1 + (t-ax)²/zx²) + ½ ln(1 + (t-ay)²/zy²). */
struct gap_model {
	double ax, zx, ay, zy;
};

static double
gap_log_area(const struct gap_model *g, double t)
{
	double u = (t - g->ax) / g->zx, v = (t - g->ay) / g->zy;

	return 0.5 * (log1p(u * u) + log1p(v * v));
}

/* d ln(wx·wy)/dt, analytically. */
static double
gap_slope(const struct gap_model *g, double t)
{
	double u = t - g->ax, v = t - g->ay;

	return u / (u * u + g->zx * g->zx) + v / (v * v + g->zy * g->zy);
}

/* Brute force: the smallest wx·wy on a grid of n points over [0, L], then
 * golden-section refinement in the two cells around it. */
static double
gap_brute_min(const struct gap_model *g, double len)
{
	const int n = 20000;
	const double gr = (sqrt(5.0) - 1) / 2;
	int best = 0;
	double lo, hi, c, d;

	for (int i = 1; i <= n; i++)
		if (gap_log_area(g, len * i / n) < gap_log_area(g, len * best / n))
			best = i;
	lo = len * (best > 0 ? best - 1 : 0) / n;
	hi = len * (best < n ? best + 1 : n) / n;
	for (int k = 0; k < 200 && hi - lo > 1e-15 * len; k++) {
		c = hi - gr * (hi - lo);
		d = lo + gr * (hi - lo);
		if (gap_log_area(g, c) < gap_log_area(g, d))
			hi = d;
		else
			lo = c;
	}
	return (lo + hi) / 2;
}

static void
check_gap(const struct gap_model *g, double len, double lambda, int exact_pos,
    const char *what)
{
	struct beam_axis x = { -g->ax + I * g->zx, 1.4 }, y = { -g->ay + I * g->zy, 1.1 };
	int want = gap_slope(g, 0) < 0 && gap_slope(g, len) > 0;
	double dz = NAN, wx = NAN, wy = NAN;
	int got = beam_gap_focus(&x, &y, lambda, len, 0, &dz, &wx, &wy);

	ck_assert_msg(got == want, "%s: focus %d, want %d (slopes %g, %g)", what,
	    got, want, gap_slope(g, 0), gap_slope(g, len));
	if (!want)
		return;
	{
		double t = gap_brute_min(g, len);
		struct beam_axis fx = x, fy = y;
		/* w0 of each axis from its own q: √(M² λ z_i/π) */
		double w0x = sqrt(1.4 * lambda * g->zx / M_PI);
		double w0y = sqrt(1.1 * lambda * g->zy / M_PI);
		double ux = (dz - g->ax) / g->zx, uy = (dz - g->ay) / g->zy;

		ck_assert_msg(dz > 0 && dz < len, "%s: focus at %g outside (0, %g)",
		    what, dz, len);
		/* the smallest product, to 1e-9 */
		ck_assert_msg(gap_log_area(g, dz) <= gap_log_area(g, t) + 1e-9,
		    "%s: focus at %.12g has ln(wx wy) %.12g; brute force %.12g at %.12g",
		    what, dz, gap_log_area(g, dz), gap_log_area(g, t), t);
		if (exact_pos)
			CHECK_ABS(dz, t, 1e-6 * len);
		/* the radii are those at dz */
		CHECK_REL(wx, w0x * sqrt(1 + ux * ux), 1e-9);
		CHECK_REL(wy, w0y * sqrt(1 + uy * uy), 1e-9);
		beam_space(&fx, dz);
		beam_space(&fy, dz);
		CHECK_REL(wx, beam_radius(&fx, lambda), 1e-9);
		CHECK_REL(wy, beam_radius(&fy, lambda), 1e-9);
	}
}

/* Designed astigmatic cases (invented numbers, m). */
static const struct astig_case {
	struct gap_model g;
	double len;
	const char *what;
} astig_cases[] = {
	{ { 0.3, 0.01, 0.3, 0.01 }, 1.0, "stigmatic, waist at 0.3" },
	{ { 0.3, 0.05, 0.5, 0.05 }, 1.0, "waists 0.2 apart, equal zR: mid-point" },
	{ { 0.2, 0.01, 0.6, 0.2 }, 1.0, "tight x waist, loose y waist" },
	{ { 0.2, 0.01, 0.8, 0.02 }, 1.0, "two minima: the one at 0.2 is smaller" },
	{ { 0.75, 0.03, 0.25, 0.004 }, 1.0, "two minima: the one at 0.25 is smaller" },
	{ { 50, 100, 0.4, 1e-3 }, 1.0, "line focus: x nearly collimated" },
	{ { -0.05, 0.02, 0.3, 0.01 }, 1.0, "x waist just behind the start" },
	{ { 0.3, 0.01, 1.2, 0.01 }, 1.0, "falling again at the end: no focus" },
	{ { 0.4, 0.5, 0.6, 0.5 }, 1.0, "weak focusing, long zR" },
	{ { 1e-4, 1e-3, 0.9, 2e-3 }, 1.0, "one waist near the start, the smaller minimum" },
};

START_TEST(test_gap_focus_astig)
{
	const struct astig_case *c = &astig_cases[_i];

	check_gap(&c->g, c->len, 1064e-9, 1, c->what);
}
END_TEST

START_TEST(test_gap_focus_random)
{
	uint64_t st = 4242;
	char what[64];

	for (int i = 0; i < 300; i++) {
		struct gap_model g;
		double len = lcg_uniform(&st, 0.05, 2);

		g.ax = lcg_uniform(&st, -0.5, 1.5) * len;
		g.ay = lcg_uniform(&st, -0.5, 1.5) * len;
		g.zx = len * pow(10, lcg_uniform(&st, -4, 1));
		g.zy = len * pow(10, lcg_uniform(&st, -4, 1));
		/* skip the knife-edge cases where the end slopes are ~0 */
		if (fabs(gap_slope(&g, 0)) * len < 1e-6 || fabs(gap_slope(&g, len)) * len < 1e-6)
			continue;
		snprintf(what, sizeof what, "random case %d", i);
		check_gap(&g, len, lcg_uniform(&st, 400e-9, 1600e-9), 0, what);
	}
}
END_TEST

/* M² from a measured divergence, ISO 11146-1 (M² = π w0 θ/λ, from
 * memory): w0 = 1 mm, θ = 0.5 mrad, 1064 nm gives 1.47631 (REFERENCE §1
 * and §15 check, 1.476312); a Gaussian's own θ = λ/(π w0) = 0.338682 mrad
 * (REFERENCE §1) gives 1. */
START_TEST(test_m2_from_divergence)
{
	CHECK_ABS(beam_m2_from_divergence(1e-3, 0.5e-3, 1064e-9), 1.476312, half_digit(6));
	CHECK_ABS(beam_m2_from_divergence(1e-3, 0.338682e-3, 1064e-9), 1, 2e-6);
}
END_TEST

/* Brewster plate effective lengths, Kogelnik, Ippen, Dienes & Shank 1972
 * (from memory), REFERENCE §1 check: n = 1.45, t = 10 mm gives 8.37761 mm
 * sagittal and 3.98459 mm tangential. */
START_TEST(test_brewster_lengths)
{
	double lt, ls;

	thick_brewster_lengths(1.45, 10e-3, &lt, &ls);
	CHECK_ABS(ls * 1e3, 8.37761, half_digit(5));
	CHECK_ABS(lt * 1e3, 3.98459, half_digit(5));
}
END_TEST

int
main(void)
{
	Suite *s = suite_create("beam");
	TCase *tc = tcase_create("gauss");
	TCase *tf = tcase_create("focus");
	TCase *tk = tcase_create("clip");

	tcase_add_loop_test(tc, test_gauss_table, 0, NELEMS(gauss_cases));
	tcase_add_test(tc, test_far_field_m2);
	tcase_add_test(tc, test_m2_from_divergence);
	tcase_add_test(tc, test_brewster_lengths);
	tcase_add_test(tc, test_q_closed_form);
	tcase_add_test(tc, test_waist_flat);
	tcase_add_loop_test(tc, test_sigma_law, 0, 20);
	tcase_add_test(tc, test_abcd_matrices);
	tcase_add_loop_test(tc, test_mirror_focal, 0, NELEMS(mirror_cases));
	tcase_add_test(tc, test_mirror_normal);
	suite_add_tcase(s, tc);

	tcase_add_loop_test(tf, test_self_table, 0, NELEMS(self_cases));
	tcase_add_test(tf, test_self_random);
	tcase_add_loop_test(tf, test_gap_focus_self, 0, NELEMS(self_cases));
	tcase_add_loop_test(tf, test_gap_focus_none, 0, NELEMS(nofocus_cases));
	tcase_add_loop_test(tf, test_gap_focus_astig, 0, NELEMS(astig_cases));
	tcase_add_test(tf, test_gap_focus_random);
	tcase_set_timeout(tf, 60);
	suite_add_tcase(s, tf);

	tcase_add_loop_test(tk, test_clip_table, 0, NELEMS(clip_cases));
	tcase_add_test(tk, test_clip_random);
	tcase_add_test(tk, test_clip_very_elliptic);
	tcase_add_test(tk, test_clip_near_round);
	tcase_add_test(tk, test_clip_limits);
	tcase_set_timeout(tk, 60);
	suite_add_tcase(s, tk);

	return run_suite(s);
}
