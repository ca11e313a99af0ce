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

struct mueller {
	double m[4][4];
};

void   polar_identity(struct mueller *);
void   polar_scalar(struct mueller *, double t);           /* t·identity */
/* Linear diattenuator with power transmittances tx along its axis and ty
 * across it, the axis at angle_deg from x: R(-θ)·M·R(θ). */
void   polar_diattenuator(struct mueller *, double tx, double ty, double angle_deg);
/* Linear retarder of `waves` retardance (δ = 2π·waves), fast axis at angle_deg. */
void   polar_retarder(struct mueller *, double waves, double angle_deg);
void   polar_reflect(struct mueller *);                    /* left-multiplies diag(1,1,-1,-1) */
void   polar_mul(struct mueller *out, const struct mueller *a, const struct mueller *b); /* out = a·b */
void   polar_apply(const struct mueller *, const double in[4], double out[4]);

/* Source states scaled to power p. */
void   polar_linear(double s[4], double p, double angle_deg);
void   polar_circular(double s[4], double p);
void   polar_unpolarized(double s[4], double p);

/* Degree of polarization and, for the linear part, its angle in degrees. */
double polar_dop(const double s[4]);
double polar_linear_angle(const double s[4]);

#endif
