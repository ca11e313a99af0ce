/* core-edit-bench.c - all-or-nothing edits of the bench's own settings and
 * its source (KEY=VALUE with --bench), with the source's tolerances, and
 * each such key's value as text that reads back.  Like core-edit.c, each
 * edit runs on a copy that must pass model_validate. */
#include <config.h>

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "core-edit.h"
#include "core-tol.h"
#include "util-err.h"

/* ---- bench settings ---- */

/* (source.divergence is taken by set_bench_key but not listed: the list is
 * also the workbench's settings screen and the comparison's, where M²
 * stands for it) */
const char *const edit_bench_keys[] = {
	"name", "notes", "safety_factor", "air_breakdown", "ghost_tilt", "stray_warn",
	"source.wavelength", "source.power", "source.pulsed", "source.pulse_energy",
	"source.rep_rate", "source.pulse_width", "source.shape", "source.waist",
	"source.waist_position", "source.m2", "source.polarization", "source.max_return",
	NULL,
};

static int
quantity(const char *key, const char *text, enum unit_dim dim, double *out, char **cause)
{
	char *why = NULL;

	if (units_parse(text, dim, out, &why) != 0) {
		fail_with(cause, "%s: %s", key, why);
		free(why);
		return -1;
	}
	return 0;
}

static int
plain(const char *key, const char *text, double *out, char **cause)
{
	char *end;

	*out = strtod(text, &end);
	while (*end == ' ')
		end++;
	if (end == text || *end != '\0' || !isfinite(*out))
		return fail_with(cause, "%s: '%s' is not a plain number", key, text);
	return 0;
}

/* "3 mm" or "3 mm, 2 mm" */
static int
pair(const char *key, const char *text, enum unit_dim dim, double v[2], int *is_pair,
    char **cause)
{
	char *t = xstrdup(text), *comma = strchr(t, ',');
	int rc;

	if (comma != NULL)
		*comma = '\0';
	rc = dim == DIM_NONE ? plain(key, t, &v[0], cause) :
	    quantity(key, t, dim, &v[0], cause);
	if (rc == 0 && comma != NULL)
		rc = dim == DIM_NONE ? plain(key, comma + 1, &v[1], cause) :
		    quantity(key, comma + 1, dim, &v[1], cause);
	else
		v[1] = v[0];
	*is_pair = comma != NULL;
	free(t);
	return rc;
}

static int
set_bench_key(struct bench *b, const char *key, const char *text, char **cause)
{
	struct source *s = &b->src;
	double v;

	if (strcmp(key, "name") == 0) {
		if (text[0] == '\0')
			return fail_with(cause, "name: must not be empty");
		free(b->name);
		b->name = xstrdup(text);
	} else if (strcmp(key, "notes") == 0) {
		free(b->notes);
		b->notes = text[0] != '\0' ? xstrdup(text) : NULL;
	} else if (strcmp(key, "safety_factor") == 0) {
		if (plain(key, text, &b->safety_factor, cause) != 0)
			return -1;
		b->safety_given = 1;
	} else if (strcmp(key, "air_breakdown") == 0) {
		if (quantity(key, text, DIM_IRRADIANCE, &b->air_breakdown, cause) != 0)
			return -1;
		b->air_given = 1;
	} else if (strcmp(key, "ghost_tilt") == 0) {
		if (plain(key, text, &b->ghost_tilt, cause) != 0)
			return -1;
		b->tilt_given = 1;
	} else if (strcmp(key, "stray_warn") == 0) {
		if (quantity(key, text, DIM_POWER, &b->stray_warn, cause) != 0)
			return -1;
		b->stray_given = 1;
	} else if (strcmp(key, "source.max_return") == 0) {
		if (text[0] == '\0') {
			s->max_return = NAN;       /* empty: not judged */
			return 0;
		}
		return quantity(key, text, DIM_POWER, &s->max_return, cause);
	} else if (strcmp(key, "source.wavelength") == 0) {
		/* a measured divergence gives a new M² at a new wavelength */
		if (quantity(key, text, DIM_LENGTH, &s->wavelength, cause) != 0)
			return -1;
		return model_source_m2_from_divergence(s, cause);
	} else if (strcmp(key, "source.power") == 0) {
		if (quantity(key, text, DIM_POWER, &s->power, cause) != 0)
			return -1;
		s->energy_given = 0;
		if (s->pulsed)
			s->pulse_energy = s->power / s->rep_rate;
	} else if (strcmp(key, "source.pulse_energy") == 0) {
		if (!s->pulsed)
			return fail_with(cause, "%s: the source is CW; set source.pulsed=true first", key);
		if (quantity(key, text, DIM_ENERGY, &s->pulse_energy, cause) != 0)
			return -1;
		s->energy_given = 1;
		s->power = s->pulse_energy * s->rep_rate;
	} else if (strcmp(key, "source.rep_rate") == 0 || strcmp(key, "source.pulse_width") == 0) {
		int rate = key[7] == 'r';

		if (!s->pulsed)
			return fail_with(cause, "%s: the source is CW; set source.pulsed=true first", key);
		if (quantity(key, text, rate ? DIM_FREQUENCY : DIM_TIME,
		    rate ? &s->rep_rate : &s->pulse_width, cause) != 0)
			return -1;
		if (s->energy_given)
			s->power = s->pulse_energy * s->rep_rate;
		else
			s->pulse_energy = s->power / s->rep_rate;
	} else if (strcmp(key, "source.pulsed") == 0) {
		if (strcmp(text, "true") == 0) {
			if (!s->pulsed) {
				s->pulsed = 1;
				s->energy_given = 0;
				if (!(s->rep_rate > 0))
					s->rep_rate = 10;
				if (!(s->pulse_width > 0))
					s->pulse_width = 10e-9;
				s->pulse_energy = s->power / s->rep_rate;
			}
		} else if (strcmp(text, "false") == 0) {
			s->pulsed = 0;
			s->energy_given = 0;
		} else {
			return fail_with(cause, "%s: '%s' is not true or false", key, text);
		}
	} else if (strcmp(key, "source.shape") == 0) {
		if (model_shape_parse(text, &s->shape) != 0)
			return fail_with(cause, "%s: '%s' is not gaussian, sech2 or square", key, text);
	} else if (strcmp(key, "source.waist") == 0) {
		if (pair(key, text, DIM_LENGTH, s->waist, &s->waist_pair, cause) != 0)
			return -1;
		return model_source_m2_from_divergence(s, cause);
	} else if (strcmp(key, "source.waist_position") == 0) {
		return quantity(key, text, DIM_LENGTH, &s->waist_position, cause);
	} else if (strcmp(key, "source.m2") == 0) {
		s->divergence_given = 0;    /* a typed M² replaces a measured divergence */
		return pair(key, text, DIM_NONE, s->m2, &s->m2_pair, cause);
	} else if (strcmp(key, "source.divergence") == 0) {
		/* as in a file (bench-file.c): the far-field half-angle in rad,
		 * one or "x, y"; M² follows from it.  Empty: M² stays as it is
		 * now, typed. */
		if (text[0] == '\0') {
			s->divergence_given = 0;
			return 0;
		}
		if (strstr(text, TOL_SIGN) != NULL || strstr(text, "+-") != NULL)
			return fail_with(cause, "%s: a tolerance is not taken here; give "
			    "source.m2 with its tolerance instead", key);
		if (pair(key, text, DIM_NONE, s->divergence, &s->m2_pair, cause) != 0)
			return -1;
		if (!(s->divergence[0] > 0 && s->divergence[1] > 0))
			return fail_with(cause, "%s: must be > 0 (far-field half-angle, rad)", key);
		s->divergence_given = 1;
		return model_source_m2_from_divergence(s, cause);
	} else if (strcmp(key, "source.polarization") == 0) {
		if (strcmp(text, "circular") == 0) {
			s->pol = POL_CIRCULAR;
		} else if (strcmp(text, "unpolarized") == 0) {
			s->pol = POL_UNPOLARIZED;
		} else {
			if (plain(key, text, &v, cause) != 0)
				return fail_with(cause, "%s: expected degrees, circular or unpolarized", key);
			s->pol = POL_LINEAR;
			s->pol_angle_deg = v;
		}
	} else {
		return fail_with(cause, "unknown bench key '%s'", key);
	}
	return 0;
}

/* ---- tolerances on the source, and the bench-wide defaults ---- */

static enum tol_src
src_tol_key(const char *key)
{
	for (int i = 0; i < TS_COUNT; i++)
		if (i != TS_WAIST_Y && i != TS_M2_Y && strcmp(key, tol_src_name((enum tol_src)i)) == 0)
			return (enum tol_src)i;
	return TS_COUNT;
}

/* One part of a value: the tolerance into *t (untouched without one) and
 * the value text before it (caller frees; "" when only a tolerance). */
static char *
take_tol(const char *key, const char *part, enum unit_dim dim, struct tol *t, int *has,
    char **cause)
{
	const char *rest;
	size_t vlen;

	*has = 0;
	if (!tol_split(part, &vlen, &rest))
		return xstrdup(part);
	if (tol_parse(rest, dim, t, cause) != 0) {
		cause_prefix(cause, "%s", key);
		return NULL;
	}
	*has = 1;
	while (vlen > 0 && (part[vlen - 1] == ' ' || part[vlen - 1] == '\t'))
		vlen--;
	while (*part == ' ' && vlen > 0)
		part++, vlen--;
	return xasprintf("%.*s", (int)vlen, part);
}

/* source.KEY=VALUE with "± ..." after the value (after each of a pair's
 * two), and tolerance.TYPE.KEY=± AMOUNT; the rest as before.  A value
 * without a tolerance keeps the one it had; a tolerance alone keeps the
 * value. */
static int
set_bench_key_tol(struct bench *b, const char *key, const char *text, char **cause)
{
	enum tol_src ts = src_tol_key(key);
	int pairkey = ts == TS_WAIST_X || ts == TS_M2_X, has[2] = { 0, 0 }, rc;
	struct tol t[2] = { { 0, 0, 0 }, { 0, 0, 0 } };
	char *v[2] = { NULL, NULL }, *copy, *comma, *value;

	if (strncmp(key, "tolerance.", 10) == 0)
		return tol_default_set(b, key + 10, text, cause);
	if (ts == TS_COUNT || (strstr(text, TOL_SIGN) == NULL && strstr(text, "+-") == NULL))
		return set_bench_key(b, key, text, cause);
	if (ts == TS_POWER && b->src.energy_given && text[strspn(text, " \t")] != '\0' &&
	    (strncmp(text + strspn(text, " \t"), TOL_SIGN, strlen(TOL_SIGN)) == 0 ||
	    strncmp(text + strspn(text, " \t"), "+-", 2) == 0))
		return fail_with(cause, "%s: '%s': the source is given by its pulse energy; "
		    "put the tolerance on source.pulse_energy", key, text);
	if (strcmp(key, "source.polarization") == 0 && (strstr(text, "circular") != NULL ||
	    strstr(text, "unpolarized") != NULL))
		return fail_with(cause, "%s: '%s': a tolerance needs an angle", key, text);
	copy = xstrdup(text);
	comma = pairkey ? strchr(copy, ',') : NULL;
	if (comma != NULL)
		*comma = '\0';
	v[0] = take_tol(key, copy, tol_src_dim(ts), &t[0], &has[0], cause);
	if (v[0] != NULL && comma != NULL)
		v[1] = take_tol(key, comma + 1, tol_src_dim(ts), &t[1], &has[1], cause);
	free(copy);
	if (v[0] == NULL || (comma != NULL && v[1] == NULL)) {
		free(v[0]);
		free(v[1]);
		return -1;
	}
	if (comma != NULL && (v[0][0] == '\0') != (v[1][0] == '\0')) {
		free(v[0]);
		free(v[1]);
		return fail_with(cause, "%s: '%s': give both values or neither", key, text);
	}
	value = comma != NULL ? xasprintf("%s, %s", v[0], v[1]) : xstrdup(v[0]);
	rc = v[0][0] != '\0' ? set_bench_key(b, key, value, cause) : 0;
	free(value);
	free(v[0]);
	free(v[1]);
	if (rc != 0)
		return -1;
	if (has[0])
		tol_bench_of(b)->src[ts] = t[0];
	if (pairkey && (has[1] || (comma == NULL && has[0])))
		tol_bench_of(b)->src[ts + 1] = has[1] ? t[1] : t[0];
	return 0;
}

int
edit_set_bench_unchecked(struct bench *b, const char *key, const char *text, char **cause)
{
	return set_bench_key_tol(b, key, text, cause);
}

int
edit_set_bench(struct bench *b, const char *key, const char *text, char **cause)
{
	struct bench *copy = model_bench_dup(b);

	if (set_bench_key_tol(copy, key, text, cause) != 0) {
		model_bench_free(copy);
		return -1;
	}
	return edit_commit_copy(b, copy, cause);
}

static char *bench_value_plain(const struct bench *b, const char *key);

/* With the source value's tolerance after it ("2 W ± 5 %"). */
char *
edit_bench_value(const struct bench *b, const char *key)
{
	enum tol_src ts = src_tol_key(key);
	char *v = bench_value_plain(b, key), *out, s0[96], s1[96];

	if (strncmp(key, "tolerance.", 10) == 0 && b->tol != NULL) {
		for (size_t i = 0; i < b->tol->ndflt; i++) {
			const struct tol_default *d = &b->tol->dflt[i];
			char name[96];

			tol_default_name(d, name, sizeof name);
			if (strcmp(name, key + 10) == 0) {
				tol_format(s0, sizeof s0, &d->t, model_keys[d->key].kind ==
				    KIND_QUANTITY ? model_keys[d->key].dim : DIM_NONE, 0);
				free(v);
				return xstrdup(s0 + 1);
			}
		}
	}
	if (ts == TS_COUNT || b->tol == NULL || v[0] == '\0' ||
	    (ts == TS_POLARIZATION && b->src.pol != POL_LINEAR))
		return v;
	tol_format(s0, sizeof s0, &b->tol->src[ts], tol_src_dim(ts), 0);
	if ((ts == TS_WAIST_X && b->src.waist_pair) || (ts == TS_M2_X && b->src.m2_pair)) {
		char *comma = strchr(v, ',');

		tol_format(s1, sizeof s1, &b->tol->src[ts + 1], tol_src_dim(ts), 0);
		*comma = '\0';
		out = xasprintf("%s%s,%s%s", v, s0, comma + 1, s1);
	} else {
		out = xasprintf("%s%s", v, s0);
	}
	free(v);
	return out;
}

static char *
bench_value_plain(const struct bench *b, const char *key)
{
	const struct source *s = &b->src;
	const struct { const char *key; double v; enum unit_dim dim; } qty[] = {
		{ "air_breakdown", b->air_breakdown, DIM_IRRADIANCE },
		{ "stray_warn", b->stray_warn, DIM_POWER },
		{ "source.max_return", s->max_return, DIM_POWER },
		{ "source.wavelength", s->wavelength, DIM_LENGTH },
		{ "source.power", s->power, DIM_POWER },
		{ "source.pulse_energy", s->pulse_energy, DIM_ENERGY },
		{ "source.rep_rate", s->rep_rate, DIM_FREQUENCY },
		{ "source.pulse_width", s->pulse_width, DIM_TIME },
		{ "source.waist_position", s->waist_position, DIM_LENGTH },
	};
	char t1[64], t2[64];

	if (strcmp(key, "name") == 0)
		return xstrdup(b->name);
	if (strcmp(key, "notes") == 0)
		return xstrdup(b->notes != NULL ? b->notes : "");
	if (strcmp(key, "safety_factor") == 0) {
		units_format_shortest(t1, sizeof t1, b->safety_factor, DIM_NONE, 1);
		return xstrdup(t1);
	}
	if (strcmp(key, "source.pulsed") == 0)
		return xstrdup(s->pulsed ? "true" : "false");
	if (!s->pulsed && (strcmp(key, "source.pulse_energy") == 0 ||
	    strcmp(key, "source.rep_rate") == 0 || strcmp(key, "source.pulse_width") == 0 ||
	    strcmp(key, "source.shape") == 0))
		return xstrdup("");
	if (strcmp(key, "ghost_tilt") == 0) {
		units_format_shortest(t1, sizeof t1, b->ghost_tilt, DIM_NONE, 1);
		return xstrdup(t1);
	}
	if (strcmp(key, "source.max_return") == 0 && isnan(s->max_return))
		return xstrdup("");
	for (size_t i = 0; i < sizeof qty / sizeof *qty; i++)
		if (strcmp(key, qty[i].key) == 0) {
			units_format_exact(t1, sizeof t1, qty[i].v, qty[i].dim);
			return xstrdup(t1);
		}
	if (strcmp(key, "source.shape") == 0)
		return xstrdup(model_shape_name(s->shape));
	if (strcmp(key, "source.waist") == 0) {
		units_format_exact(t1, sizeof t1, s->waist[0], DIM_LENGTH);
		if (!s->waist_pair)
			return xstrdup(t1);
		units_format_exact(t2, sizeof t2, s->waist[1], DIM_LENGTH);
		return xasprintf("%s, %s", t1, t2);
	}
	/* as typed: the shortest text that reads back (1.1, not 1.1000000000000001) */
	if (strcmp(key, "source.m2") == 0) {
		units_format_shortest(t1, sizeof t1, s->m2[0], DIM_NONE, 1);
		units_format_shortest(t2, sizeof t2, s->m2[1], DIM_NONE, 1);
		return s->m2_pair ? xasprintf("%s, %s", t1, t2) : xstrdup(t1);
	}
	if (strcmp(key, "source.divergence") == 0) {
		if (!s->divergence_given)
			return xstrdup("");
		units_format_shortest(t1, sizeof t1, s->divergence[0], DIM_NONE, 1);
		units_format_shortest(t2, sizeof t2, s->divergence[1], DIM_NONE, 1);
		return s->m2_pair ? xasprintf("%s, %s", t1, t2) : xstrdup(t1);
	}
	if (strcmp(key, "source.polarization") == 0) {
		units_format_shortest(t1, sizeof t1, s->pol_angle_deg, DIM_NONE, 1);
		return s->pol == POL_CIRCULAR ? xstrdup("circular") :
		    s->pol == POL_UNPOLARIZED ? xstrdup("unpolarized") : xstrdup(t1);
	}
	return xstrdup("");
}
