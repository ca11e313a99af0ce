/* core-beam.h - the Gaussian beam of each axis: complex beam parameter q,
 * ABCD propagation, radius, clipping at a round aperture, and the focus in
 * a free-space gap.  Embedded-Gaussian rule: the real beam of quality M²
 * has radius w with 1/q = 1/R - i·M²·λ/(π·w²).  Pure computation. */
#ifndef CORE_BEAM_H
#define CORE_BEAM_H

#include <complex.h>
#include <math.h>

#define PHYS_C    299792458.0          /* m/s, exact (SI) */
#define PHYS_EPS0 8.8541878128e-12     /* F/m, CODATA 2018 */

struct beam_axis {
	double complex q;           /* m */
	double         m2;          /* M² of this axis, >= 1 */
};

/* q at distance dz from a waist of radius w0 (dz > 0: past the waist). */
struct beam_axis beam_axis_from_waist(double w0, double m2, double lambda, double dz);
double beam_rayleigh(double w0, double m2, double lambda);        /* zR */
/* M² of a beam from its waist w0 and far-field half-angle divergence θ
 * (both 1/e² / second-moment): π·w0·θ/λ (ISO 11146-1). */
double beam_m2_from_divergence(double w0, double theta, double lambda);
/* beam_radius: 1/e² radius w (inline below) */
double beam_curvature(const struct beam_axis *);                  /* R, INFINITY at a waist */
double beam_waist_distance(const struct beam_axis *);             /* -Re q: + when the waist is ahead */
double beam_waist_radius(const struct beam_axis *, double lambda);

/* beam_space: inline below */
/* beam_lens: thin lens, f != 0 (inline below) */
/* beam_abcd: inline below */

/* Focal lengths of a curved mirror (roc > 0 concave) at angle of incidence
 * aoi: tangential (x) (roc/2)·cos θ, sagittal (y) (roc/2)/cos θ. */
void   beam_mirror_focal(double roc, double aoi_deg, double *fx, double *fy);

/* Power fraction of a centred elliptical Gaussian (radii wx, wy) passed by
 * a round aperture of radius a.  Exact for wx = wy; otherwise the angular
 * integral of the spec, by a trapezoid rule refined until it settles. */
double beam_clip_transmission(double wx, double wy, double a);

/* Looks for a waist inside a gap of `length` that starts with axes x, y:
 * the product wx·wy falls at the start and rises at the end.  A waist
 * within end_tol (m, >= 0) of the end counts as the gap's (at the end:
 * *dz = length), one within end_tol of the start does not; end_tol = 0
 * counts neither end.  On success returns 1 and sets *dz (from the gap
 * start) and both radii there. */
int    beam_gap_focus(const struct beam_axis *x, const struct beam_axis *y,
           double lambda, double length, double end_tol,
           double *dz, double *wx, double *wy);

/* Inline (the trace's hot path, issue #12).  Complex arithmetic is
 * written out: the library's general division guards against overflow and
 * infinities that a finite q never meets, and costs several times more. */
static inline double
beam_radius(const struct beam_axis *a, double lambda)
{
	double re = creal(a->q), im = cimag(a->q);

	/* Im(1/q) = -Im q / |q|², so w² = M² λ |q|² / (π Im q) */
	return sqrt(a->m2 * lambda * (re * re + im * im) / (M_PI * im));
}

static inline void
beam_space(struct beam_axis *a, double length)
{
	a->q += length;
}

static inline double complex
beam_cdiv(double complex n, double complex d)
{
	double dr = creal(d), di = cimag(d), nr = creal(n), ni = cimag(n);
	double den = dr * dr + di * di;

	return ((nr * dr + ni * di) + I * (ni * dr - nr * di)) / den;
}

static inline void
beam_abcd(struct beam_axis *a, double ma, double mb, double mc, double md)
{
	a->q = beam_cdiv(ma * a->q + mb, mc * a->q + md);
}

static inline void
beam_lens(struct beam_axis *a, double focal)
{
	/* [[1, 0], [-1/f, 1]]: q' = q / (1 - q/f) = q f / (f - q) */
	a->q = beam_cdiv(a->q * focal, focal - a->q);
}

#endif
