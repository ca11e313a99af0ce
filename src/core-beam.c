/* core-beam.c - Gaussian beam propagation per axis with the ABCD law
 * (Kogelnik & Li 1966; Siegman, Lasers, ch. 20), clipping at a round
 * aperture, and the focus inside a gap. */
#include <config.h>

#include <math.h>
#include <pthread.h>

#include "core-beam.h"

double
beam_rayleigh(double w0, double m2, double lambda)
{
	return M_PI * w0 * w0 / (m2 * lambda);
}

double
beam_m2_from_divergence(double w0, double theta, double lambda)
{
	return M_PI * w0 * theta / lambda;
}

struct beam_axis
beam_axis_from_waist(double w0, double m2, double lambda, double dz)
{
	struct beam_axis a;

	a.q = dz + I * beam_rayleigh(w0, m2, lambda);
	a.m2 = m2;
	return a;
}

double
beam_curvature(const struct beam_axis *a)
{
	double re = creal(a->q), im = cimag(a->q);

	return re == 0 ? INFINITY : (re * re + im * im) / re;
}

double
beam_waist_distance(const struct beam_axis *a)
{
	return -creal(a->q);
}

double
beam_waist_radius(const struct beam_axis *a, double lambda)
{
	return sqrt(a->m2 * lambda * cimag(a->q) / M_PI);
}

void
beam_mirror_focal(double roc, double aoi_deg, double *fx, double *fy)
{
	double c = cos(aoi_deg * M_PI / 180.0);

	*fx = roc / 2 * c;
	*fy = roc / 2 / c;
}

/* The spec's angular integral, (1/(2π wx wy)) ∫ (1 - exp(-2a²g))/g dφ with
 * g = cos²φ/wx² + sin²φ/wy², has a peak of width wy/wx along the long
 * axis.  Substituting tan φ = (wy/wx) tan ψ (wx the larger radius, r =
 * wy/wx) turns it into (2/π) ∫₀^{π/2} [1 - exp(-2a²/(wx² h(ψ)))] dψ with
 * h = cos²ψ + r² sin²ψ [derived]: bounded, smooth and even about both ends,
 * so the trapezoid rule converges geometrically at any ellipticity. */
static double
clip_integrand(double psi, double c, double r2)
{
	double co = cos(psi), si = sin(psi);

	return -expm1(-c / (co * co + r2 * si * si));
}

/* cos² at the quadrature's nodes, j·(π/2)/CLIP_NODES: every node of the
 * doublings up to CLIP_NODES intervals is one of them.  Filled once
 * (the tolerance run traces from several threads). */
#define CLIP_NODES 1024
static double clip_cos2[CLIP_NODES + 1];
/* the series' (2k+1)/(2k+2) and 1/j (clip_series, below) */
#define CLIP_SERIES_MAX 64
static double clip_dk[CLIP_SERIES_MAX], clip_inv[2 * CLIP_SERIES_MAX + 1];
static pthread_once_t clip_once = PTHREAD_ONCE_INIT;

static void
clip_fill(void)
{
	for (int j = 0; j <= CLIP_NODES; j++) {
		double co = cos(j * (M_PI / 2) / CLIP_NODES);

		clip_cos2[j] = co * co;
	}
	for (int k = 0; k < CLIP_SERIES_MAX; k++)
		clip_dk[k] = (2.0 * k + 1) / (2.0 * k + 2);
	for (int j = 1; j <= 2 * CLIP_SERIES_MAX; j++)
		clip_inv[j] = 1.0 / j;
}

/* The integrand at node i of n intervals: in ψ (above), or, phi set, in
 * the beam's own angle φ: (1 - exp(-c u))/u with u = cos²φ + sin²φ/r²
 * (the spec's integral with wy = r wx, before the substitution).  A beam
 * much wider than the aperture along x (c < 1) has a feature of width r
 * in ψ but of width r/√c in φ: the φ form needs a few dozen nodes where
 * the ψ form needs a thousand [derived]. */
static double
clip_node(int i, int n, double c, double r2, int phi)
{
	double c2, u;

	if (n > CLIP_NODES) {
		double a = i * (M_PI / 2) / n, co = cos(a), si = sin(a);

		if (!phi)
			return clip_integrand(a, c, r2);
		u = co * co + si * si / r2;
		return -expm1(-c * u) / u;
	}
	c2 = clip_cos2[i * (CLIP_NODES / n)];
	if (phi) {
		u = c2 + (1 - c2) / r2;
		return -expm1(-c * u) / u;
	}
	c2 = c / (c2 + r2 * (1 - c2));
	return c2 >= 38 ? 1 : -expm1(-c2);     /* 1 to the last bit from 38 on */
}

/* The same transmission as a series, for beams not far from round.  The
 * angular integral of the intensity over a circle of radius r is 2π
 * exp(-2Ar²) I0(2Br²), A = (1/wx² + 1/wy²)/2, B = (1/wx² - 1/wy²)/2, so
 * with t = 2r² T = (1/(wx wy)) ∫₀^{2a²} exp(-At) I0(Bt) dt.  I0's power
 * series integrated term by term gives
 *   T = √(1 - e²) Σ_k d_k P(2k+1, x),  d_k = C(2k,k) (e/2)^{2k},
 * e = B/A, x = a²(1/wx² + 1/wy²), P the regularized lower incomplete gamma
 * function, which is the Poisson tail Σ_{j≥n} p_j, p_j = e^{-x} x^j / j!.
 * Since Σ_k d_k = 1/√(1 - e²), swapping the sums leaves
 *   T = (1 - e^{-x}) - √(1 - e²) Σ_{j≥1} p_j S_{⌊(j+1)/2⌋},  S_m = Σ_{k≥m} d_k
 * [derived; I0's series and the Poisson form of P: Abramowitz & Stegun
 * 9.6.10 and 6.5.13].  Every term is positive (no cancellation but the
 * one subtraction, and that only loses what T itself would not show), and
 * d_k falls as e^{2k}: a beam within 2:1 of round needs a dozen terms or
 * fewer where the quadrature below needs a dozen exponentials.  The sum
 * is cut where S_m < 1e-17, which bounds the relative error of T by it,
 * because T >= √(1 - e²)(1 - e^{-x}) and Σ p_j <= 1 - e^{-x}.  Returns -1
 * when the beam is too elliptic for the series to be short. */

static double
clip_series(double wx, double wy, double a)
{
	double ix = 1 / (wx * wx), iy = 1 / (wy * wy), e = (ix - iy) / (ix + iy), e2 = e * e;
	double x = a * a * (ix + iy), d[CLIP_SERIES_MAX + 1], s[CLIP_SERIES_MAX + 2];
	double p, t0, sum = 0, tail = 1e-17 * (1 - e2);
	int k, m;

	if (e2 > 0.5)
		return -1;
	/* d_k until the tail is below 1e-17: d_k e²/(1 - e²) bounds it */
	d[0] = 1;
	for (k = 0; k < CLIP_SERIES_MAX && d[k] * e2 > tail; k++)
		d[k + 1] = d[k] * e2 * clip_dk[k];
	if (k == CLIP_SERIES_MAX)
		return -1;
	/* S_m for m = 1 .. k, summed from the small end */
	s[k + 1] = 0;
	for (m = k; m >= 1; m--)
		s[m] = s[m + 1] + d[m];
	/* 1 - e^{-x} and e^{-x} from one exponential, each to a few ulps:
	 * the one near 1 is had from the other by a subtraction */
	if (x > 0.7) {
		p = exp(-x);
		t0 = 1 - p;
	} else {
		t0 = -expm1(-x);
		p = 1 - t0;
	}
	for (int j = 1; j <= 2 * k; j++) {
		p *= x * clip_inv[j];
		sum += p * s[(j + 1) / 2];
	}
	return t0 - sqrt(1 - e2) * sum;
}

double
beam_clip_transmission(double wx, double wy, double a)
{
	double big, r2, c, sum, h, prev, scale, wpsi, wphi;
	int n, phi;

	if (!(a > 0))
		return 0;
	if (fabs(wx - wy) <= 1e-12 * (wx + wy)) {
		double x = 2 * a * a / (wx * wy);

		/* from 38 on, -expm1(-x) is 1 to the last bit (below) */
		return x >= 38 ? 1 : -expm1(-x);
	}
	big = fmax(wx, wy);
	r2 = fmin(wx, wy) / big;
	r2 *= r2;
	c = 2 * a * a / (big * big);
	/* every integrand value is 1 - exp(-c/h) with h <= 1: from c = 38 on
	 * (exp(-38) = 3e-17, under half an ulp of 1) each one is exactly 1,
	 * and so is the integral; an aperture well clear of the beam, the
	 * common case, then costs no quadrature [derived] */
	if (c >= 38)
		return 1;
	pthread_once(&clip_once, clip_fill);
	if ((sum = clip_series(wx, wy, a)) >= 0)
		return sum;
	/* a nearly round beam's integrand is nearly flat: start coarse and
	 * let the doubling below confirm it (the convergence is geometric
	 * in n for a smooth periodic integrand, so the difference of two
	 * estimates bounds the error) */
	/* The narrowest feature of each form: in ψ the edge where c/h ~ 1
	 * (width √c) once the axis end is 1 to the last bit (c/r² >= 38),
	 * else the axis end itself (width r); in φ the edge where cu ~ 1
	 * (width r/√c) for c < 1, else the 1/u peak (width r) [derived].
	 * The wider one is used, on a grid that resolves it, so that two
	 * estimates cannot agree by missing it. */
	wpsi = c / r2 >= 38 ? sqrt(c) : sqrt(r2);
	wphi = c < 1 ? sqrt(r2 / c) : sqrt(r2);
	phi = wphi > wpsi;
	n = r2 > 0.25 ? 4 : 16;
	while (fmax(wpsi, wphi) < 0.5 && n < (1 << 20) && M_PI / 2 / n > fmax(wpsi, wphi) / 4)
		n *= 2;
	h = M_PI / 2 / n;
	/* ∫(1 - exp(-cu))/u dφ over a quarter turn is (π/2)·r·T */
	scale = phi ? 2 / (M_PI * sqrt(r2)) : 2 / M_PI;
	sum = 0.5 * (clip_node(0, n, c, r2, phi) + clip_node(n, n, c, r2, phi));
	for (int i = 1; i < n; i++)
		sum += clip_node(i, n, c, r2, phi);
	prev = sum * h;
	/* Round-off in a sum of n terms is about sqrt(n)·ε, so a 1e-15 goal
	 * could never be met for a very elliptic beam and the loop ran to 16M
	 * terms (0.4 s a call; found by fuzzing).  1e-13 is met once the
	 * peak is resolved; 16 doublings (1M terms) bound the rest. */
	for (int iter = 0; iter < 16; iter++) {
		double now;

		for (int i = 1; i < 2 * n; i += 2)
			sum += clip_node(i, 2 * n, c, r2, phi);
		n *= 2;
		h /= 2;
		now = sum * h;
		if (fabs(now - prev) <= 1e-13 * fabs(now) + 1e-300)
			return now * scale;
		prev = now;
	}
	return prev * scale;
}

/* d ln(wx·wy)/dz up to a positive factor: each axis contributes
 * u/(u² + zR²), u the distance past its waist. */
static double
log_slope(double ux, double zx, double uy, double zy)
{
	return ux / (ux * ux + zx * zx) + uy / (uy * uy + zy * zy);
}

static double
snap(double u, double eps)
{
	return fabs(u) <= eps ? 0 : u;
}

static double
area(double ux, double zx, double uy, double zy)
{
	return (1 + ux * ux / (zx * zx)) * (1 + uy * uy / (zy * zy));
}

/* fmin and fmax without the library call where they cannot differ from
 * it (unequal numbers; equal ones other than zeros, whose signs they may
 * pick either way): the same bits, issue #12.  A gap asks a few times. */
static double
num_min(double a, double b)
{
	if (a < b)
		return a;
	if (b < a || (a == b && a != 0))
		return b;
	return fmin(a, b);
}

static double
num_max(double a, double b)
{
	if (a > b)
		return a;
	if (b > a || (a == b && a != 0))
		return b;
	return fmax(a, b);
}

int
beam_gap_focus(const struct beam_axis *x, const struct beam_axis *y,
    double lambda, double length, double end_tol, double *dz, double *wx, double *wy)
{
	/* Positions along the gap measured from its start; axis i has its
	 * waist at a_i = -Re q_i and Rayleigh range z_i = Im q_i. */
	double ax = -creal(x->q), zx = cimag(x->q);
	double ay = -creal(y->q), zy = cimag(y->q);
	double best = NAN, best_area = INFINITY;
	double m, d, p, qq, roots[3], eps, lo, hi;
	int nroots = 0;

	if (!(length > 0))
		return 0;
	/* Without end_tol a waist at either end is not a focus of the gap,
	 * also when decimal lengths leave it 1e-17 m off the end: positions
	 * within eps of an end count as the end.  With end_tol, a waist
	 * within end_tol of the end belongs to this gap and one within
	 * end_tol of the start to the gap before, so that a waist on an
	 * element's plane is found once. */
	eps = 1e-12 * (length + fabs(ax) + fabs(ay));
	lo = num_max(end_tol, 0);
	hi = end_tol > 0 ? length + end_tol : length;
	/* both waists before the start (or both past the end): every term of
	 * the slope has one sign there, and the test below fails; this says
	 * so without the divisions (a ghost walk asks once per gap) */
	if ((ax <= lo && ay <= lo) || (ax >= hi && ay >= hi))
		return 0;
	if (!(log_slope(snap(lo - ax, eps), zx, snap(lo - ay, eps), zy) < 0) ||
	    !(log_slope(snap(hi - ax, eps), zx, snap(hi - ay, eps), zy) > 0))
		return 0;
	hi = end_tol > 0 ? hi : length - eps;
	lo = num_max(lo, eps);
	/* Stationary points of wx·wy: with m the mid-point of the two waists,
	 * d half their separation and s = z - m, the condition is the
	 * depressed cubic 2s³ + (A + B - 2d²)s + d(A - B) = 0 (A = zx²,
	 * B = zy²) [derived]. */
	m = (ax + ay) / 2;
	d = (ax - ay) / 2;
	p = (zx * zx + zy * zy - 2 * d * d) / 2;
	qq = d * (zx * zx - zy * zy) / 2;
	if (qq == 0 && p >= 0) {
		/* s(s² + p) = 0 has the one real root 0: a round beam (d = 0)
		 * or equal Rayleigh ranges, the common case, without roots of
		 * a cubic (the formula below gives 0 too, exactly) */
		roots[nroots++] = 0;
	} else {
		/* s³ + p s + q = 0 */
		double disc = qq * qq / 4 + p * p * p / 27;

		if (disc > 0) {
			double sq = sqrt(disc);
			roots[nroots++] = cbrt(-qq / 2 + sq) + cbrt(-qq / 2 - sq);
		} else {
			double r = sqrt(-p / 3);
			double phi = acos(num_max(-1, num_min(1, -qq / (2 * r * r * r))));

			for (int k = 0; k < 3; k++)
				roots[nroots++] = 2 * r * cos((phi - 2 * M_PI * k) / 3);
		}
	}
	for (int i = 0; i < nroots; i++) {
		double s = roots[i], t, ar;

		/* two Newton steps polish the closed form */
		for (int k = 0; k < 2; k++) {
			double f = s * s * s + p * s + qq, fp = 3 * s * s + p;
			if (fp != 0)
				s -= f / fp;
		}
		t = m + s;
		if (!(t > lo && t < hi))
			continue;
		t = num_min(t, length);
		ar = area(t - ax, zx, t - ay, zy);
		if (ar < best_area) {
			best_area = ar;
			best = t;
		}
	}
	if (isnan(best))
		return 0;
	{
		struct beam_axis fx = *x, fy = *y;

		beam_space(&fx, best);
		beam_space(&fy, best);
		*dz = best;
		*wx = beam_radius(&fx, lambda);
		*wy = beam_radius(&fy, lambda);
	}
	return 1;
}
