/* core-material.c - Fresnel equations (Hecht, Optics, 5th ed., sec. 4.6;
 * Born & Wolf sec. 1.5.2) and Malitson's Sellmeier fit for fused silica
 * (J. Opt. Soc. Am. 55, 1205 (1965)). */
#include <config.h>

#include <math.h>

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

double
material_silica_index(double lambda)
{
	static const double b[3] = { 0.6961663, 0.4079426, 0.8974794 };
	static const double c[3] = { 0.0684043, 0.1162414, 9.896161 };   /* µm */
	double l = lambda * 1e6, l2 = l * l, n2 = 1;

	if (!(l >= 0.21 && l <= 3.71))
		return NAN;
	for (int i = 0; i < 3; i++)
		n2 += b[i] * l2 / (l2 - c[i] * c[i]);
	return sqrt(n2);
}
