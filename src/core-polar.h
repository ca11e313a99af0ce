/* core-polar.h - polarization and power bookkeeping with Stokes vectors
 * (S0 = power in W) and Mueller matrices.
 *
 * Frame: x is the tangential axis (p), y the sagittal (s); angles are from
 * +x toward +y.  S3 > 0 is the state a quarter-wave plate with its fast
 * axis at +45° makes from horizontal light; the source's "circular" is that
 * state.  Reflections are applied in the unfolded frame as
 * diag(1, 1, -1, -1).  Pure computation. */
#ifndef CORE_POLAR_H
#define CORE_POLAR_H

#include <string.h>

struct mueller {
	double m[4][4];
};

/* polar_identity: inline below */
/* polar_scalar: t·identity (inline below) */
/* Linear diattenuator with power transmittances tx along its axis and ty
 * across it, the axis at angle_deg from x: R(-θ)·M·R(θ). */
void   polar_diattenuator(struct mueller *, double tx, double ty, double angle_deg);
/* Linear retarder of `waves` retardance (δ = 2π·waves), fast axis at angle_deg. */
void   polar_retarder(struct mueller *, double waves, double angle_deg);
/* polar_reflect: left-multiplies diag(1,1,-1,-1) (inline below) */
void   polar_mul(struct mueller *out, const struct mueller *a, const struct mueller *b); /* out = a·b */
/* polar_apply: inline below */

/* Source states scaled to power p. */
void   polar_linear(double s[4], double p, double angle_deg);
void   polar_circular(double s[4], double p);
void   polar_unpolarized(double s[4], double p);

/* Degree of polarization and, for the linear part, its angle in degrees. */
double polar_dop(const double s[4]);
double polar_linear_angle(const double s[4]);

/* Inline (the trace's hot path, issue #12). */
static inline void
polar_scalar(struct mueller *m, double t)
{
	memset(m, 0, sizeof *m);
	for (int i = 0; i < 4; i++)
		m->m[i][i] = t;
}

static inline void
polar_identity(struct mueller *m)
{
	polar_scalar(m, 1);
}

static inline void
polar_reflect(struct mueller *m)
{
	for (int j = 0; j < 4; j++) {
		m->m[2][j] = -m->m[2][j];
		m->m[3][j] = -m->m[3][j];
	}
}

static inline void
polar_apply(const struct mueller *m, const double in[4], double out[4])
{
	double t[4];

	for (int i = 0; i < 4; i++)
		t[i] = m->m[i][0] * in[0] + m->m[i][1] * in[1] +
		    m->m[i][2] * in[2] + m->m[i][3] * in[3];
	memcpy(out, t, sizeof t);
}

#endif
