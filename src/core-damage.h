/* core-damage.h - what a beam does to a surface: irradiance, fluence, pulse
 * peak power, peak field, self-focusing, and laser-induced damage
 * thresholds rescaled from the conditions they were measured at.
 * Pure computation; every formula is in REFERENCE.md §4-5, 10-11. */
#ifndef CORE_DAMAGE_H
#define CORE_DAMAGE_H

#include <math.h>

#include "core-beam.h"
#include "core-model.h"

/* Pulses shorter or longer than this are outside the range where the
 * √τ law of fluence thresholds is established (Stuart et al. 1996). */
#define DAMAGE_TAU_MIN 50e-12
#define DAMAGE_TAU_MAX 100e-9

/* Peak power = k · E / τ_FWHM: 2√(ln2/π) gaussian, ln(1+√2) sech², 1 square. */
double damage_peak_factor(enum pulse_shape);
double damage_peak_power(enum pulse_shape, double energy, double fwhm);  /* k·E/τ */
/* damage_peak_irradiance: 2P/(π wx wy) (inline below) */
/* damage_fluence: 2E/(π wx wy) (inline below) */
/* damage_peak_field: √(2I/(c ε0)) V/m (inline below) */
/* damage_linear_density: P/(2 min w) (inline below) */
/* Marburger: P_cr = 3.77 λ² / (8π n0 n2). */
double damage_critical_power(double lambda, double n0, double n2);
/* Distance after which a collimated Gaussian beam of radius w carrying
 * p_ratio = P/P_cr collapses (Marburger's fit, as quoted by Couairon &
 * Mysyrowicz 2007): 0.367 z_R / √{[(P/P_cr)^½ − 0.852]² − 0.0219},
 * z_R = π n0 w²/λ the Rayleigh length of the input beam (w its 1/e²
 * radius).  INFINITY when the beam does not collapse (P ≤ P_cr). */
double damage_self_focus_distance(double lambda, double n0, double w, double p_ratio);
/* On-axis nonlinear phase of a thin plate: (2π/λ)·n2·I·L. */
double damage_b_integral(double lambda, double n2, double irradiance, double thickness);

/* Flags a threshold can raise while it is rescaled. */
enum {
	DAMAGE_WL_SCALED        = 1 << 0,
	DAMAGE_PULSE_SCALED     = 1 << 1,
	DAMAGE_PULSE_RANGE      = 1 << 2,   /* √τ outside its established range */
	DAMAGE_CW_ONLY_PULSED   = 1 << 3,   /* only a pulsed rating, CW beam: unrated */
};

/* A rating scaled to the beam at hand (rules of thumb of the trade, common
 * practice, no single source): every threshold × λ/λ_spec, a fluence also
 * × √(τ/τ_spec), or × min(1, √(τ/τ_spec)) when either width lies outside
 * DAMAGE_TAU_MIN … DAMAGE_TAU_MAX (lower, never higher, where the law is
 * not established).  NAN where the rating does not apply. */
struct damage_limits {
	double   cw_linear;         /* W/m */
	double   cw_irradiance;     /* W/m² */
	double   fluence;           /* J/m² */
	double   max_power;         /* W */
	double   max_absorbed;      /* W */
	unsigned flags;
};

void   damage_limits(const struct element *, const struct source *, struct damage_limits *);
/* damage_rated: inline below */

/* What the element sees, and the ratio to its scaled limits (the largest
 * that applies; NAN when none applies). */
struct damage_exposure {
	double power_in, power_lost, linear_density, irradiance, fluence;
};
/* damage_ratio: inline below */

enum damage_status { STATUS_UNRATED, STATUS_OK, STATUS_CAUTION, STATUS_OVER };
/* damage_status_of: inline below */
const char *damage_status_name(enum damage_status);

/* Inline (the trace's hot path, issue #12); same arithmetic as ever. */
static inline double
damage_fluence(double energy, double wx, double wy)
{
	return 2 * energy / (M_PI * wx * wy);
}

static inline double
damage_peak_irradiance(double power, double wx, double wy)
{
	return 2 * power / (M_PI * wx * wy);
}

static inline double
damage_peak_field(double irradiance)
{
	/* the constant folded: a multiplication where a division sat on
	 * every element's path (to an ulp the same) */
	return sqrt(irradiance * (2 / (PHYS_C * PHYS_EPS0)));
}

/* fmin without the library call in the cases that cannot differ from it
 * (unequal numbers; equal ones other than zeros, whose signs it may pick
 * either way): the same bits, issue #12. */
static inline double
damage_fmin(double a, double b)
{
	if (a < b)
		return a;
	if (b < a || (a == b && a != 0))
		return b;
	return fmin(a, b);
}

static inline double
damage_linear_density(double power, double wx, double wy)
{
	return power / (2 * damage_fmin(wx, wy));
}

static inline int
damage_rated(const struct damage_limits *l)
{
	return !isnan(l->cw_linear) || !isnan(l->cw_irradiance) ||
	    !isnan(l->fluence) || !isnan(l->max_power) || !isnan(l->max_absorbed);
}

static inline double
damage_worse(double r, double metric, double limit)
{
	double x;

	if (isnan(limit))
		return r;
	x = metric / limit;
	return isnan(r) || x > r ? x : r;
}

static inline double
damage_ratio(const struct damage_limits *l, const struct damage_exposure *e)
{
	double r = NAN;

	r = damage_worse(r, e->linear_density, l->cw_linear);
	r = damage_worse(r, e->irradiance, l->cw_irradiance);
	if (!isnan(e->fluence))
		r = damage_worse(r, e->fluence, l->fluence);
	r = damage_worse(r, e->power_in, l->max_power);
	r = damage_worse(r, e->power_lost, l->max_absorbed);
	return r;
}

/* The same with 1/safety_factor given (a trace divides once, not per
 * row: issue #12). */
static inline enum damage_status
damage_status_by(double ratio, double inv_sf)
{
	if (isnan(ratio))
		return STATUS_UNRATED;
	if (ratio >= 1)
		return STATUS_OVER;
	if (ratio >= inv_sf)
		return STATUS_CAUTION;
	return STATUS_OK;
}

static inline enum damage_status
damage_status_of(double ratio, double sf)
{
	return damage_status_by(ratio, 1 / sf);
}

#endif
