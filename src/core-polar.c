/* core-polar.c - Stokes and Mueller calculus (Goldstein, Polarized Light,
 * 2nd ed., ch. 4-5; Chipman, Lam & Young 2018), in the conventions of
 * trace-conventions.md: rotation R(θ) by 2θ, reflections flip S2 and S3. */
#include <config.h>

#include <math.h>
#include <string.h>

#include "core-polar.h"

#define DEG (M_PI / 180.0)

/* M' = R(-θ)·M·R(θ) for an M that is block-diagonal in (S1, S2): only the
 * middle 2×2 block and the first row/column mix. */
static void
rotate(struct mueller *m, double angle_deg)
{
	double c = cos(2 * angle_deg * DEG), s = sin(2 * angle_deg * DEG);
	double r[4][4] = { { 1, 0, 0, 0 }, { 0, c, s, 0 }, { 0, -s, c, 0 }, { 0, 0, 0, 1 } };
	double rt[4][4] = { { 1, 0, 0, 0 }, { 0, c, -s, 0 }, { 0, s, c, 0 }, { 0, 0, 0, 1 } };
	struct mueller a, b, out;

	memcpy(a.m, rt, sizeof rt);
	memcpy(b.m, r, sizeof r);
	polar_mul(&out, &a, m);
	polar_mul(m, &out, &b);
}

void
polar_diattenuator(struct mueller *m, double tx, double ty, double angle_deg)
{
	double a = (tx + ty) / 2, b = (tx - ty) / 2, g = sqrt(tx * ty);

	memset(m, 0, sizeof *m);
	m->m[0][0] = a;
	m->m[0][1] = b;
	m->m[1][0] = b;
	m->m[1][1] = a;
	m->m[2][2] = g;
	m->m[3][3] = g;
	if (angle_deg != 0)
		rotate(m, angle_deg);
}

void
polar_retarder(struct mueller *m, double waves, double angle_deg)
{
	double d = 2 * M_PI * waves, c = cos(d), s = sin(d);

	polar_identity(m);
	m->m[2][2] = c;
	m->m[2][3] = s;
	m->m[3][2] = -s;
	m->m[3][3] = c;
	if (angle_deg != 0)
		rotate(m, angle_deg);
}

void
polar_mul(struct mueller *out, const struct mueller *a, const struct mueller *b)
{
	struct mueller t;

	for (int i = 0; i < 4; i++)
		for (int j = 0; j < 4; j++) {
			double s = 0;
			for (int k = 0; k < 4; k++)
				s += a->m[i][k] * b->m[k][j];
			t.m[i][j] = s;
		}
	*out = t;
}

void
polar_linear(double s[4], double p, double angle_deg)
{
	s[0] = p;
	s[1] = p * cos(2 * angle_deg * DEG);
	s[2] = p * sin(2 * angle_deg * DEG);
	s[3] = 0;
}

void
polar_circular(double s[4], double p)
{
	s[0] = p;
	s[1] = s[2] = 0;
	s[3] = p;
}

void
polar_unpolarized(double s[4], double p)
{
	s[0] = p;
	s[1] = s[2] = s[3] = 0;
}

double
polar_dop(const double s[4])
{
	if (!(s[0] > 0))
		return 0;
	return sqrt(s[1] * s[1] + s[2] * s[2] + s[3] * s[3]) / s[0];
}

double
polar_linear_angle(const double s[4])
{
	return 0.5 * atan2(s[2], s[1]) / DEG;
}
