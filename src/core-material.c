/* core-material.c - Fresnel equations (Hecht, Optics, 5th ed., sec. 4.6;
 * Born & Wolf sec. 1.5.2), used by Brewster plates, and the published
 * Sellmeier fits of the `material` key's glasses (REFERENCE §7, §15). */
#include <config.h>

#include <math.h>
#include <stddef.h>

#include "core-material.h"

void
material_fresnel(double n1, double n2, double aoi_deg, double *rs, double *rp)
{
	double ti = aoi_deg * M_PI / 180, si = sin(ti), ci = cos(ti);
	double st = n1 / n2 * si, ct, a, b;

	if (st >= 1) {
		*rs = *rp = 1;
		return;
	}
	ct = sqrt(1 - st * st);
	a = (n1 * ci - n2 * ct) / (n1 * ci + n2 * ct);
	b = (n2 * ci - n1 * ct) / (n2 * ci + n1 * ct);
	*rs = a * a;
	*rp = b * b;
}

double
material_brewster_deg(double n1, double n2)
{
	return atan2(n2, n1) * 180 / M_PI;
}

/* Sellmeier coefficients (REFERENCE §15, coefficients as published; the
 * ranges are those the fits were made over, from memory). */
#define SQ(x) ((x) * (x))

static const struct glass {
	const char *source;
	double      b[3], c[3];     /* C in µm²: Malitson gives resonance
	                             * wavelengths (squared here), Schott C itself */
	double      lo, hi;         /* µm */
} glasses[] = {
	{ "Malitson, J. Opt. Soc. Am. 55, 1205 (1965)",
	    { 0.6961663, 0.4079426, 0.8974794 },
	    { SQ(0.0684043), SQ(0.1162414), SQ(9.896161) }, 0.21, 3.71 },
	{ "Schott N-BK7 data sheet",
	    { 1.03961212, 0.231792344, 1.01046945 },
	    { 0.00600069867, 0.0200179144, 103.560653 }, 0.3, 2.5 },
	{ "Malitson, Appl. Opt. 2, 1103 (1963)",
	    { 0.5675888, 0.4710914, 3.8484723 },
	    { SQ(0.050263605), SQ(0.1003909), SQ(34.649040) }, 0.23, 9.7 },
	{ "Malitson & Dodge, J. Opt. Soc. Am. 62, 1405 (1972)",
	    { 1.4313493, 0.65054713, 5.3414021 },
	    { SQ(0.0726631), SQ(0.1193242), SQ(18.028251) }, 0.2, 5.5 },
};

double
material_index(int material, double lambda, double *lo, double *hi)
{
	const struct glass *g;
	double l = lambda * 1e6, l2 = l * l, n2 = 1;

	if (material < 0 || material >= (int)(sizeof glasses / sizeof *glasses))
		return NAN;
	g = &glasses[material];
	if (lo != NULL)
		*lo = g->lo * 1e-6;
	if (hi != NULL)
		*hi = g->hi * 1e-6;
	if (!(l >= g->lo && l <= g->hi))
		return NAN;
	for (int i = 0; i < 3; i++)
		n2 += g->b[i] * l2 / (l2 - g->c[i]);
	return sqrt(n2);
}

const char *
material_source(int material)
{
	if (material < 0 || material >= (int)(sizeof glasses / sizeof *glasses))
		return "?";
	return glasses[material].source;
}

double
material_silica_index(double lambda)
{
	return material_index(0, lambda, NULL, NULL);
}
