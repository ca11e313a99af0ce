/* bench-tol.c - the tolerance suffix and the "tolerances" section in the
 * bench file, both ways.  Kept out of bench-file.c so the reader proper
 * only asks here when a string carries the sign.  See bench-tol.h. */
#include <config.h>

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "bench-tol.h"
#include "util-err.h"

json_t *
bench_tol_wrap(json_t *v, const struct tol *t, enum unit_dim dim)
{
	char suffix[96], num[64];
	json_t *s;

	if (!tol_is_set(t))
		return v;
	tol_format(suffix, sizeof suffix, t, dim, 1);
	/* the ASCII form of the amount, but the sign as the trade writes it */
	if (strncmp(suffix, " +-", 3) == 0) {
		memmove(suffix + 1 + strlen(TOL_SIGN), suffix + 3, strlen(suffix + 3) + 1);
		memcpy(suffix + 1, TOL_SIGN, strlen(TOL_SIGN));
	}
	if (json_is_string(v)) {
		const char *str = json_string_value(v);

		s = json_sprintf("%s%s", str, str[0] != '\0' ? suffix : suffix + 1);
	} else {
		units_format_exact(num, sizeof num, json_number_value(v), dim);
		s = json_sprintf("%s%s", num, suffix);
	}
	json_decref(v);
	return s;
}

int
bench_tol_source_take(json_t **v, json_t **owned, struct bench *b, enum tol_src ts,
    const char *what, char **cause)
{
	const char *text, *rest;
	size_t vlen;
	struct tol t;
	char *vt, *end;

	*owned = NULL;
	if (!json_is_string(*v) || !tol_split(json_string_value(*v), &vlen, &rest))
		return 0;
	text = json_string_value(*v);
	if (tol_parse(rest, tol_src_dim(ts), &t, cause) != 0)
		return cause_prefix(cause, "source: %s", what), -1;
	vt = xasprintf("%.*s", (int)vlen, text);
	if (tol_src_dim(ts) == DIM_NONE) {
		double x = strtod(vt, &end);

		while (*end == ' ' || *end == '\t')
			end++;
		if (end == vt || *end != '\0' || !isfinite(x)) {
			fail_with(cause, "source: %s: '%s' is not a plain number", what, vt);
			free(vt);
			return -1;
		}
		*owned = json_real(x);
	} else {
		*owned = json_string(vt);
	}
	free(vt);
	*v = *owned;
	tol_bench_of(b)->src[ts] = t;
	return 0;
}

int
bench_tol_source_check(const struct bench *b, char **cause)
{
	if (b->tol == NULL)
		return 0;
	for (int i = 0; i < TS_COUNT; i++) {
		const struct tol *t = &b->tol->src[i];
		double v = tol_source_value(&b->src, (enum tol_src)i), w = tol_width(t, v), lo, hi;

		if (!tol_is_set(t) || !t->uniform)
			continue;
		tol_src_range((enum tol_src)i, &lo, &hi);
		if (!(v - w >= lo && v + w <= hi))
			return fail_with(cause, "source: %s: the uniform tolerance leaves "
			    "the allowed range (narrow it, or make it normal: a normal "
			    "tolerance is truncated to the range)", tol_src_name((enum tol_src)i) + 7);
	}
	return 0;
}

int
bench_tol_defaults_from_json(json_t *v, struct bench *b, char **cause)
{
	const char *key;
	json_t *x;

	if (!json_is_object(v))
		return fail_with(cause, "tolerances: expected an object of \"TYPE.KEY\": "
		    "\"± AMOUNT\", got %s", json_is_array(v) ? "an array" : "another kind");
	json_object_foreach(v, key, x) {
		if (!json_is_string(x))
			return fail_with(cause, "tolerances: %s: expected a string "
			    "(\"± 1 mm\")", key);
		if (json_string_length(x) == 0)
			return fail_with(cause, "tolerances: %s: empty", key);
		if (tol_default_set(b, key, json_string_value(x), cause) != 0)
			return cause_prefix(cause, "tolerances"), -1;
	}
	return 0;
}

json_t *
bench_tol_defaults_to_json(const struct bench *b)
{
	json_t *o;

	if (b->tol == NULL || b->tol->ndflt == 0)
		return NULL;
	o = json_object();
	for (size_t i = 0; i < b->tol->ndflt; i++) {
		const struct tol_default *d = &b->tol->dflt[i];
		enum unit_dim dim = model_keys[d->key].kind == KIND_QUANTITY ?
		    model_keys[d->key].dim : DIM_NONE;
		char name[96];

		tol_default_name(d, name, sizeof name);
		json_object_set_new(o, name, bench_tol_wrap(json_string(""), &d->t, dim));
	}
	return o;
}
