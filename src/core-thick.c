/* core-thick.c - plates, thick lenses and Brewster plates by reduced ray
 * matrices (REFERENCE §1, §15).  A thick element occupies its thickness
 * along z; its results are taken at its front surface (trace-conventions). */
#include <config.h>

#include <math.h>

#include "core-material.h"
#include "core-thick.h"

double
thick_index(const struct element *el, double lambda)
{
	if (model_has(el, K_MATERIAL))
		return material_index((int)el->val[K_MATERIAL], lambda, NULL, NULL);
	return model_get(el, K_INDEX);
}

void
thick_brewster_lengths(double n, double t, double *tangential, double *sagittal)
{
	double k = sqrt(n * n + 1);

	*sagittal = t * k / (n * n);
	*tangential = t * k / (n * n * n * n);
}

static double
curvature(const struct element *el, enum model_key k)
{
	return model_has(el, k) ? 1 / el->val[k] : 0;    /* absent = flat */
}

double
thick_lens_focal(double n, double r1, double r2, double t)
{
	double c1 = 1 / r1, c2 = 1 / r2;
	double p = (n - 1) * (c1 - c2 + (n - 1) * t * c1 * c2 / n);

	return p == 0 ? INFINITY : 1 / p;
}

/* surface(r2) · plate(t/n) · surface(r1), reduced: a surface from n1 into
 * n2 of curvature c is [[1, 0], [−(n2 − n1)c, 1]] (REFERENCE §15). */
static void
thick_lens(struct beam_axis *a, double n, double c1, double c2, double t)
{
	double p1 = (n - 1) * c1, p2 = -(n - 1) * c2;   /* powers of the faces */
	double ma = 1 - t / n * p1, mb = t / n;
	double mc = -p2 * ma - p1, md = 1 - p2 * t / n;

	beam_abcd(a, ma, mb, mc, md);
}

/* A lens by its faces' curvatures c1 (met first) and c2: the glass is
 * crossed on both axes; only the lens axes see the curved faces. */
static void
lens_by_radii(const struct element *el, double lambda, double c1, double c2, double t,
    struct beam_axis *x, struct beam_axis *y)
{
	double n = thick_index(el, lambda);

	if (model_get(el, K_AXIS) != AXIS_Y)
		thick_lens(x, n, c1, c2, t);
	else
		beam_space(x, t / n);
	if (model_get(el, K_AXIS) != AXIS_X)
		thick_lens(y, n, c1, c2, t);
	else
		beam_space(y, t / n);
}

double
thick_apply(const struct element *el, double lambda, struct beam_axis *x,
    struct beam_axis *y)
{
	double t = model_has(el, K_THICKNESS) ? el->val[K_THICKNESS] : 0;
	double n;                   /* only where the glass is crossed (below) */
	int on_x = 1, on_y = 1;

	if (el->type == EL_LENS) {
		on_x = model_get(el, K_AXIS) != AXIS_Y;
		on_y = model_get(el, K_AXIS) != AXIS_X;
		/* radii win over focal when both are given (they fix the
		 * shape; model_validate has held focal to them) */
		if (model_has(el, K_R1) || model_has(el, K_R2)) {
			lens_by_radii(el, lambda, curvature(el, K_R1), curvature(el, K_R2), t, x, y);
			return t;
		}
		/* a lens given by its focal length: thin at its front
		 * surface, then the plate (an approximation, man page) */
		if (on_x)
			beam_lens(x, el->val[K_FOCAL]);
		if (on_y)
			beam_lens(y, el->val[K_FOCAL]);
	}
	if (t == 0)
		return 0;
	n = thick_index(el, lambda);
	if (el->type == EL_WINDOW && model_get(el, K_BREWSTER) != 0) {
		double lt, ls;

		thick_brewster_lengths(n, t, &lt, &ls);
		beam_space(x, lt);
		beam_space(y, ls);
		/* the path in the glass: t / cos θt, with tan θB = n */
		return t * sqrt(n * n + 1) / n;
	}
	beam_space(x, t / n);
	beam_space(y, t / n);
	return t;
}

double
thick_apply_back(const struct element *el, double lambda, struct beam_axis *x,
    struct beam_axis *y)
{
	double t = model_has(el, K_THICKNESS) ? el->val[K_THICKNESS] : 0;
	int on_x = 1, on_y = 1;

	if (el->type != EL_LENS)
		return thick_apply(el, lambda, x, y);   /* a plate is the same both ways */
	on_x = model_get(el, K_AXIS) != AXIS_Y;
	on_y = model_get(el, K_AXIS) != AXIS_X;
	if (model_has(el, K_R1) || model_has(el, K_R2)) {
		/* the radii fix the shape (as forward); the back face first:
		 * in the unfolded frame of the return trip each radius
		 * changes sign and the faces swap */
		lens_by_radii(el, lambda, -curvature(el, K_R2), -curvature(el, K_R1), t, x, y);
		return t;
	}
	/* by its focal length: the plate first, then the thin lens */
	if (t != 0) {
		double n = thick_index(el, lambda);

		beam_space(x, t / n);
		beam_space(y, t / n);
	}
	if (on_x)
		beam_lens(x, el->val[K_FOCAL]);
	if (on_y)
		beam_lens(y, el->val[K_FOCAL]);
	return t;
}
