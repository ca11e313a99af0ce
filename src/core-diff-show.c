/* core-diff-show.c - a value as the comparison of two benches shows it:
 * the shortest text that reads back, with its unit, trailing zeros
 * dropped, an angle with its degree sign, a choice by its name, a
 * tolerance after the value.  See
 * core-diff.h. */
#include <config.h>

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "core-diff.h"
#include "core-tol.h"
#include "util-err.h"

/* "2.500 mm" -> "2.5 mm", "1.00e+05" -> "1e+05": zeros after the point of
 * the leading number carry no information once the digits are minimal. */
static void
strip_zeros(char *s)
{
	char *p = s, *dot, *end;

	if (*p == '-')
		p++;
	while (*p >= '0' && *p <= '9')
		p++;
	if (*p != '.')
		return;
	dot = p++;
	while (*p >= '0' && *p <= '9')
		p++;
	end = p;
	while (end > dot + 1 && end[-1] == '0')
		end--;
	if (end == dot + 1)
		end = dot;
	memmove(end, p, strlen(p) + 1);
}

char *
diff_value_show(double v, enum unit_dim dim, int ascii)
{
	char buf[64];

	if (!isfinite(v) || v == 0) {
		units_format(buf, sizeof buf, v, dim, 3, ascii);
		return xstrdup(buf);
	}
	if (dim == DIM_NONE && fabs(v) >= 1e-4 && fabs(v) < 1e15) {
		/* Plain numbers as decimals, never "1e+03". */
		for (int dec = 0; dec <= 17; dec++) {
			snprintf(buf, sizeof buf, "%.*f", dec, v);
			if (fabs(strtod(buf, NULL) - v) <= 1e-12 * fabs(v))
				break;
		}
		return xstrdup(buf);
	}
	for (int sig = 1; sig <= 17; sig++) {
		double w;

		units_format(buf, sizeof buf, v, dim, sig, ascii);
		if (units_parse(buf, dim, &w, NULL) == 0 && fabs(w - v) <= 1e-12 * fabs(v))
			break;
	}
	strip_zeros(buf);
	return xstrdup(buf);
}

static char *
show_raw(double v, const struct model_key_def *d, int ascii)
{
	char *t, *u;

	switch (d->kind) {
	case KIND_QUANTITY:
		return diff_value_show(v, d->dim, ascii);
	case KIND_BOOL:
		return xstrdup(v != 0 ? "true" : "false");
	case KIND_AXIS:
		return xstrdup(v == AXIS_X ? "x" : v == AXIS_Y ? "y" : "both");
	case KIND_SURFACE:
		if (v == MODEL_UNCOATED)
			return xstrdup("uncoated");
		return diff_value_show(v, DIM_NONE, ascii);
	case KIND_CHOICE:
		return xstrdup(v >= d->lo && v <= d->hi ? d->choices[(int)v] : "?");
	case KIND_ANGLE:
		t = diff_value_show(v, DIM_NONE, ascii);
		u = xasprintf("%s%s", t, ascii ? " deg" : "°");
		free(t);
		return u;
	default:
		return diff_value_show(v, DIM_NONE, ascii);
	}
}

char *
diff_key_show(const struct element *el, enum model_key k, int ascii)
{
	const struct model_key_def *d = &model_keys[k];
	char *t, *u;

	if (model_has(el, k)) {
		char tt[96];

		t = show_raw(el->val[k], d, ascii);
		if (tol_of(el, k) == NULL)
			return t;
		tol_format(tt, sizeof tt, tol_of(el, k), d->kind == KIND_QUANTITY ? d->dim :
		    DIM_NONE, ascii);
		u = xasprintf("%s%s", t, tt);
		free(t);
		return u;
	}
	if (isnan(d->dflt))
		return xstrdup("-");
	t = show_raw(d->dflt, d, ascii);
	u = xasprintf("(default %s)", t);
	free(t);
	return u;
}
