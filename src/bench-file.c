/* bench-file.c - reading bench files, through jansson.  Everything a file
 * may say is checked here or in the model's key table; nothing unknown is
 * silently ignored.  Writing them is bench-file-write.c's; the fast reader
 * of long paths bench-file-scan.c's. */
#include <config.h>

#include <errno.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>

#include "bench-file.h"
#include "bench-point.h"
#include "bench-tol.h"
#include "util-buf.h"
#include "util-err.h"

/* RFC 8259 §8.1 lets a parser ignore a leading byte-order mark. */
static size_t
bom_len(const char *text, size_t len)
{
	return len >= 3 && memcmp(text, "\xef\xbb\xbf", 3) == 0 ? 3 : 0;
}

static const char *
json_kind(const json_t *v)
{
	switch (json_typeof(v)) {
	case JSON_OBJECT:	return "an object";
	case JSON_ARRAY:	return "an array";
	case JSON_STRING:	return "a string";
	case JSON_INTEGER:
	case JSON_REAL:		return "a number";
	case JSON_TRUE:
	case JSON_FALSE:	return "a boolean";
	default:		return "null";
	}
}

/* A JSON number; -0 is 0 (one value, one text, one record). */
static double
num_value(const json_t *v)
{
	double x = json_number_value(v);

	return x == 0 ? 0.0 : x;
}

/* A quantity: a JSON number in SI, or a string with a unit. */
static int
get_quantity(json_t *v, enum unit_dim dim, double *out, const char *what, char **cause)
{
	char *why = NULL;

	if (json_is_number(v)) {
		*out = num_value(v);
		return 0;
	}
	if (!json_is_string(v))
		return fail_with(cause, "%s: expected a number or a string with a unit, "
		    "got %s", what, json_kind(v));
	if (units_parse(json_string_value(v), dim, out, &why) != 0) {
		fail_with(cause, "%s: %s", what, why);
		free(why);
		return -1;
	}
	return 0;
}

static int
get_number(json_t *v, double *out, const char *what, char **cause)
{
	if (!json_is_number(v))
		return fail_with(cause, "%s: expected a plain number, got %s", what,
		    json_kind(v));
	*out = num_value(v);
	return 0;
}

static int
get_positive(json_t *v, enum unit_dim dim, double *out, const char *what, char **cause)
{
	if (get_quantity(v, dim, out, what, cause) != 0)
		return -1;
	if (!(*out > 0) || !isfinite(*out))
		return fail_with(cause, "%s: must be > 0", what);
	return 0;
}

/* The value of a quantity or plain-number key when it reads without
 * complaint (what get_quantity or get_number would give): the message
 * prefix ("element 'M1': aoi") is then never made, and files of 10^5
 * elements set half a million values.  -1: take the long way. */
static int
quiet_value(const struct model_key_def *d, json_t *v, double *out)
{
	const char *rest;
	char *why = NULL;
	size_t vlen;
	int rc;

	if (d->kind != KIND_QUANTITY && d->kind != KIND_FRACTION && d->kind != KIND_ANGLE &&
	    d->kind != KIND_NUMBER)
		return -1;
	if (json_is_number(v)) {
		*out = num_value(v);
		return 0;
	}
	if (d->kind != KIND_QUANTITY || !json_is_string(v) ||
	    tol_split(json_string_value(v), &vlen, &rest))
		return -1;
	rc = units_parse(json_string_value(v), d->dim, out, &why);
	free(why);
	return rc;
}

static int
set_key_json(struct element *el, enum model_key k, json_t *v, char **cause)
{
	const struct model_key_def *d = &model_keys[k];
	char what[128];
	double x;

	if (quiet_value(d, v, &x) == 0)
		return model_set(el, k, x, cause);
	snprintf(what, sizeof what, "element '%s': %s", el->id, model_key_path(k));
	if (json_is_string(v)) {
		const char *rest;
		size_t vlen;

		if (tol_split(json_string_value(v), &vlen, &rest))
			return model_set_text(el, k, json_string_value(v), cause);
	}
	switch (d->kind) {
	case KIND_QUANTITY:
		if (get_quantity(v, d->dim, &x, what, cause) != 0)
			return -1;
		break;
	case KIND_BOOL:
		if (!json_is_boolean(v))
			return fail_with(cause, "%s: expected true or false, got %s",
			    what, json_kind(v));
		x = json_is_true(v);
		break;
	case KIND_AXIS:
		if (!json_is_string(v))
			return fail_with(cause, "%s: expected \"both\", \"x\" or \"y\", got %s",
			    what, json_kind(v));
		return model_set_text(el, k, json_string_value(v), cause);
	case KIND_SURFACE:
		/* one value for both surfaces or [front, back] (ghost-conventions.md) */
		if (k == K_SURF_R && json_is_array(v)) {
			if (json_array_size(v) != 2)
				return fail_with(cause, "%s: expected one value or [front, back], "
				    "got %zu values", what, json_array_size(v));
			if (set_key_json(el, K_SURF_R, json_array_get(v, 0), cause) != 0 ||
			    set_key_json(el, K_SURF_R_BACK, json_array_get(v, 1), cause) != 0)
				return -1;
			return 0;
		}
		if (json_is_string(v))
			return model_set_text(el, k, json_string_value(v), cause);
		if (get_number(v, &x, what, cause) != 0)
			return -1;
		if (x == MODEL_UNCOATED)
			x = 2;          /* a typed -1 is out of range, not "uncoated" */
		break;
	case KIND_CHOICE:
		if (!json_is_string(v))
			return fail_with(cause, "%s: expected a name, got %s", what, json_kind(v));
		return model_set_text(el, k, json_string_value(v), cause);
	default:
		if (get_number(v, &x, what, cause) != 0)
			return -1;
		break;
	}
	return model_set(el, k, x, cause);
}

static int read_branch(json_t *arr, struct branch *br, const char *where,
    size_t depth, char **cause);

static int
read_damage(json_t *obj, struct element *el, char **cause)
{
	const char *key;
	json_t *v;

	if (!json_is_object(obj))
		return fail_with(cause, "element '%s': damage: expected an object, got %s",
		    el->id, json_kind(obj));
	json_object_foreach(obj, key, v) {
		int k = -1;

		for (int i = K_DMG_FIRST; i < K_COUNT; i++)
			if (strcmp(key, model_keys[i].name) == 0)
				k = i;
		if (k < 0)
			return fail_with(cause, "element '%s': damage: unknown key '%s' "
			    "(cw_linear, cw_irradiance, fluence, wavelength, pulse_width)",
			    el->id, key);
		if (set_key_json(el, (enum model_key)k, v, cause) != 0)
			return -1;
	}
	return 0;
}

static int
set_text(char **dst, json_t *v, const char *id, const char *key, char **cause)
{
	if (!json_is_string(v))
		return fail_with(cause, "element '%s': %s: expected a string, got %s",
		    id, key, json_kind(v));
	free(*dst);
	*dst = xstrdup(json_string_value(v));
	return 0;
}

int
bench_element_from_json(json_t *obj, struct element *el, int need_id,
    int allow_branch, size_t depth, char **cause)
{
	json_t *jid, *jtype, *v;
	const char *key, *id;
	enum elem_type type;

	if (!json_is_object(obj))
		return fail_with(cause, "an element must be an object, got %s", json_kind(obj));
	jid = json_object_get(obj, "id");
	if (jid == NULL && need_id)
		return fail_with(cause, "an element has no id");
	if (jid != NULL && (!json_is_string(jid) || json_string_length(jid) == 0))
		return fail_with(cause, "an element's id must be a non-empty string");
	id = jid != NULL ? json_string_value(jid) : "(part)";
	jtype = json_object_get(obj, "type");
	if (jtype == NULL)
		return fail_with(cause, "element '%s': type: missing", id);
	if (!json_is_string(jtype) || model_type_parse(json_string_value(jtype), &type) != 0)
		return fail_with(cause, "element '%s': type: unknown type %s%s%s (space, mirror, "
		    "lens, splitter, window, filter, waveplate, polarizer, iris, dump, "
		    "detector, target, isolator)", id, json_is_string(jtype) ? "'" : "",
		    json_is_string(jtype) ? json_string_value(jtype) : json_kind(jtype),
		    json_is_string(jtype) ? "'" : "");
	model_element_init(el, type, jid != NULL ? id : "");
	json_object_foreach(obj, key, v) {
		int k;
		enum port port = PORT_NONE;

		if (strcmp(key, "id") == 0 || strcmp(key, "type") == 0)
			continue;
		if (strcmp(key, "label") == 0) {
			if (set_text(&el->label, v, el->id, key, cause) != 0)
				return -1;
			continue;
		}
		if (strcmp(key, "part") == 0) {
			if (set_text(&el->part, v, el->id, key, cause) != 0)
				return -1;
			continue;
		}
		if (strcmp(key, "damage") == 0) {
			if (read_damage(v, el, cause) != 0)
				return -1;
			continue;
		}
		if (strcmp(key, "reflected") == 0)
			port = PORT_REFLECTED;
		else if (strcmp(key, "transmitted") == 0)
			port = PORT_TRANSMITTED;
		else if (strcmp(key, "rejected") == 0)
			port = PORT_REJECTED;
		if (port != PORT_NONE) {
			if (!allow_branch || !model_type_takes_port(type, port))
				return fail_with(cause, "element '%s': a %s has no '%s' branch",
				    el->id, model_type_name(type), key);
			if (el->side_port != PORT_NONE)
				return fail_with(cause, "element '%s': %s: a splitter takes "
				    "exactly one side branch, reflected or transmitted",
				    el->id, key);
			el->side_port = port;
			{
				char *where = xasprintf("%s.%s", el->id, key);
				int rc = read_branch(v, &el->side, where, depth + 1, cause);

				free(where);
				if (rc != 0)
					return rc;
			}
			continue;
		}
		k = model_key_find(key);
		if (k < 0 || k >= K_DMG_FIRST || !model_key_applies((enum model_key)k, type))
			return fail_with(cause, "element '%s': unknown key '%s' for a %s",
			    el->id, key, model_type_name(type));
		if (set_key_json(el, (enum model_key)k, v, cause) != 0)
			return -1;
	}
	return 0;
}

/* Reads a list of elements.  The innermost failing element's position is
 * put in front of the message once ("BS1.reflected[2]: ..."); callers
 * further out see -2 and add nothing, so a deep failure stays one line. */
static int
read_branch(json_t *arr, struct branch *br, const char *where, size_t depth,
    char **cause)
{
	size_t i;
	json_t *v;

	if (!json_is_array(arr))
		return fail_with(cause, "%s: expected an array of elements, got %s",
		    where, json_kind(arr));
	if (depth > MODEL_MAX_DEPTH)
		return fail_with(cause, "%s: side branches nested more than %d deep",
		    where, MODEL_MAX_DEPTH);
	json_array_foreach(arr, i, v) {
		struct element *el = model_branch_push(br);
		int rc;

		/* The slot is zeroed; bench_element_from_json initialises it. */
		rc = bench_element_from_json(v, el, 1, 1, depth, cause);
		if (rc == -1)
			cause_prefix(cause, "%s[%zu]", where, i);
		if (rc != 0)
			return -2;
	}
	return 0;
}

/* ts: the tolerance entry of x (y's is the next). */
/* A string (or a pair holding one) that carries "±" or "+-". */
static int
has_tolerance_text(json_t *v)
{
	if (json_is_array(v)) {
		for (size_t i = 0; i < json_array_size(v); i++)
			if (has_tolerance_text(json_array_get(v, i)))
				return 1;
		return 0;
	}
	return json_is_string(v) && (strstr(json_string_value(v), "\u00b1") != NULL ||
	    strstr(json_string_value(v), "+-") != NULL);
}

static int
read_pair(json_t *v, enum unit_dim dim, double out[2], int *pair, const char *what,
    struct bench *b, enum tol_src ts, char **cause)
{
	json_t *own = NULL;
	int rc;

	if (json_is_array(v)) {
		if (json_array_size(v) != 2)
			return fail_with(cause, "source: %s: expected [x, y]", what);
		*pair = 1;
		for (int i = 0; i < 2; i++) {
			json_t *e = json_array_get(v, (size_t)i);

			if (bench_tol_source_take(&e, &own, b, (enum tol_src)(ts + i), what,
			    cause) != 0)
				return -1;
			rc = dim == DIM_NONE ?
			    get_number(e, &out[i], what, cause) :
			    get_quantity(e, dim, &out[i], what, cause);
			json_decref(own);
			if (rc != 0)
				return cause_prefix(cause, "source"), -1;
		}
		return 0;
	}
	*pair = 0;
	if (bench_tol_source_take(&v, &own, b, ts, what, cause) != 0)
		return -1;
	rc = dim == DIM_NONE ? get_number(v, &out[0], what, cause) :
	    get_quantity(v, dim, &out[0], what, cause);
	json_decref(own);
	if (rc != 0) {
		cause_prefix(cause, "source");
		return -1;
	}
	out[1] = out[0];
	return 0;
}

/* The tolerance entry a source key's value may carry (TS_COUNT: none). */
static enum tol_src
source_tol_of(const char *key)
{
	static const struct { const char *key; enum tol_src ts; } map[] = {
		{ "wavelength", TS_WAVELENGTH }, { "power", TS_POWER },
		{ "pulse_energy", TS_PULSE_ENERGY }, { "rep_rate", TS_REP_RATE },
		{ "pulse_width", TS_PULSE_WIDTH }, { "waist_position", TS_WAIST_POSITION },
		{ "polarization", TS_POLARIZATION },
	};

	for (size_t i = 0; i < sizeof map / sizeof *map; i++)
		if (strcmp(key, map[i].key) == 0)
			return map[i].ts;
	return TS_COUNT;
}

/* *own: the value alone of the last key that carried a tolerance; the
 * caller decrefs it whatever the result. */
static int
read_pulsed(json_t *obj, struct source *s, struct bench *b, json_t **own, char **cause)
{
	const char *key;
	json_t *v;
	int have_energy = 0;

	if (!json_is_object(obj))
		return fail_with(cause, "source: pulsed: expected an object, got %s",
		    json_kind(obj));
	s->pulsed = 1;
	json_object_foreach(obj, key, v) {
		json_decref(*own);
		*own = NULL;
		if (source_tol_of(key) != TS_COUNT &&
		    bench_tol_source_take(&v, own, b, source_tol_of(key), key, cause) != 0)
			return -1;
		if (strcmp(key, "rep_rate") == 0) {
			if (get_positive(v, DIM_FREQUENCY, &s->rep_rate, "source: pulsed.rep_rate", cause))
				return -1;
		} else if (strcmp(key, "pulse_width") == 0) {
			if (get_positive(v, DIM_TIME, &s->pulse_width, "source: pulsed.pulse_width", cause))
				return -1;
		} else if (strcmp(key, "pulse_energy") == 0) {
			if (get_positive(v, DIM_ENERGY, &s->pulse_energy, "source: pulsed.pulse_energy", cause))
				return -1;
			have_energy = 1;
		} else if (strcmp(key, "shape") == 0) {
			if (model_shape_parse(json_string_value(v), &s->shape) != 0)
				return fail_with(cause, "source: pulsed.shape: expected "
				    "\"gaussian\", \"sech2\" or \"square\"");
		} else {
			return fail_with(cause, "source: pulsed: unknown key '%s' "
			    "(rep_rate, pulse_width, shape, pulse_energy)", key);
		}
	}
	s->energy_given = have_energy;
	return 0;
}

static int
read_source(json_t *obj, struct source *s, struct bench *b, json_t **own, char **cause)
{
	const char *key;
	json_t *v, *own_pulsed = NULL;
	int have_power = 0, rc;

	if (!json_is_object(obj))
		return fail_with(cause, "source: expected an object, got %s", json_kind(obj));
	model_source_defaults(s);
	json_object_foreach(obj, key, v) {
		/* the value alone stays alive until the next key; the caller
		 * drops the last */
		json_decref(*own);
		*own = NULL;
		if (source_tol_of(key) != TS_COUNT &&
		    bench_tol_source_take(&v, own, b, source_tol_of(key), key, cause) != 0)
			return -1;
		if (strcmp(key, "wavelength") == 0) {
			if (get_positive(v, DIM_LENGTH, &s->wavelength, "source: wavelength", cause))
				return -1;
		} else if (strcmp(key, "power") == 0) {
			if (get_positive(v, DIM_POWER, &s->power, "source: power", cause))
				return -1;
			have_power = 1;
		} else if (strcmp(key, "pulsed") == 0) {
			rc = read_pulsed(v, s, b, &own_pulsed, cause);
			json_decref(own_pulsed);
			own_pulsed = NULL;
			if (rc != 0)
				return -1;
		} else if (strcmp(key, "waist") == 0) {
			if (read_pair(v, DIM_LENGTH, s->waist, &s->waist_pair, "waist", b,
			    TS_WAIST_X, cause))
				return -1;
			if (!(s->waist[0] > 0 && s->waist[1] > 0))
				return fail_with(cause, "source: waist: must be > 0");
		} else if (strcmp(key, "waist_position") == 0) {
			if (get_quantity(v, DIM_LENGTH, &s->waist_position,
			    "source: waist_position", cause))
				return -1;
		} else if (strcmp(key, "m2") == 0) {
			if (read_pair(v, DIM_NONE, s->m2, &s->m2_pair, "m2", b, TS_M2_X, cause))
				return -1;
			if (!(s->m2[0] >= 1 && s->m2[1] >= 1))
				return fail_with(cause, "source: m2: must be >= 1 (M² of a real beam)");
		} else if (strcmp(key, "max_return") == 0) {
			if (get_positive(v, DIM_POWER, &s->max_return, "source: max_return", cause))
				return -1;
		} else if (strcmp(key, "divergence") == 0) {
			/* M² follows from it; a tolerance belongs on a value the
			 * file writes back, so the divergence takes none */
			if (has_tolerance_text(v))
				return fail_with(cause, "source: divergence: a tolerance is not "
				    "taken here; give m2 with its tolerance instead");
			if (read_pair(v, DIM_NONE, s->divergence, &s->m2_pair, "divergence",
			    b, TS_M2_X, cause))
				return -1;
			if (!(s->divergence[0] > 0 && s->divergence[1] > 0) ||
			    !isfinite(s->divergence[0] * s->divergence[1]))
				return fail_with(cause, "source: divergence: must be > 0 "
				    "(far-field half-angle, rad)");
			s->divergence_given = 1;
		} else if (strcmp(key, "polarization") == 0) {
			if (json_is_number(v)) {
				s->pol = POL_LINEAR;
				s->pol_angle_deg = num_value(v);
			} else if (json_is_string(v) && strcmp(json_string_value(v), "circular") == 0) {
				s->pol = POL_CIRCULAR;
			} else if (json_is_string(v) && strcmp(json_string_value(v), "unpolarized") == 0) {
				s->pol = POL_UNPOLARIZED;
			} else {
				return fail_with(cause, "source: polarization: expected an angle "
				    "in degrees, \"circular\" or \"unpolarized\"");
			}
		} else {
			return fail_with(cause, "source: unknown key '%s' (wavelength, power, "
			    "pulsed, waist, waist_position, m2, divergence, polarization, "
			    "max_return)", key);
		}
	}
	if (have_power && s->energy_given)
		return fail_with(cause, "source: give power or pulsed.pulse_energy, not both");
	if (s->divergence_given && json_object_get(obj, "m2") != NULL)
		return fail_with(cause, "source: give m2 or divergence, not both");
	if (model_source_m2_from_divergence(s, cause) != 0)
		return -1;
	if (s->energy_given)
		s->power = s->pulse_energy * s->rep_rate;
	else if (s->pulsed && have_power)
		s->pulse_energy = s->power / s->rep_rate;
	if (isnan(s->waist[0]))
		return fail_with(cause, "source: waist: missing");
	if (isnan(s->wavelength))
		return fail_with(cause, "source: wavelength: missing");
	return 0;
}

int
bench_head_from_json(json_t *root, struct bench *b, char **cause)
{
	const char *key;
	json_t *v, *fmt;

	if (!json_is_object(root))
		return fail_with(cause, "the file must hold one JSON object, got %s",
		    json_kind(root));
	fmt = json_object_get(root, "format");
	if (fmt == NULL)
		return fail_with(cause, "format: missing (expected \"%s\")", MODEL_FORMAT);
	if (!json_is_string(fmt) || strcmp(json_string_value(fmt), MODEL_FORMAT) != 0)
		return fail_with(cause, "format: expected \"%s\"", MODEL_FORMAT);
	if (json_object_get(root, "source") == NULL)
		return fail_with(cause, "source: missing");
	json_object_foreach(root, key, v) {
		if (strcmp(key, "format") == 0 || strcmp(key, "path") == 0) {
			continue;
		} else if (strcmp(key, "name") == 0) {
			if (!json_is_string(v) || json_string_length(v) == 0)
				return fail_with(cause, "name: expected a non-empty string");
			free(b->name);
			b->name = xstrdup(json_string_value(v));
		} else if (strcmp(key, "notes") == 0) {
			if (!json_is_string(v))
				return fail_with(cause, "notes: expected a string, got %s",
				    json_kind(v));
			free(b->notes);
			b->notes = xstrdup(json_string_value(v));
		} else if (strcmp(key, "safety_factor") == 0) {
			if (get_number(v, &b->safety_factor, "safety_factor", cause))
				return -1;
			if (!(b->safety_factor > 1) || !isfinite(b->safety_factor))
				return fail_with(cause, "safety_factor: %g must be > 1",
				    b->safety_factor);
			b->safety_given = 1;
		} else if (strcmp(key, "air_breakdown") == 0) {
			if (get_positive(v, DIM_IRRADIANCE, &b->air_breakdown, "air_breakdown", cause))
				return -1;
			b->air_given = 1;
		} else if (strcmp(key, "ghost_tilt") == 0) {
			if (get_number(v, &b->ghost_tilt, "ghost_tilt", cause))
				return -1;
			if (!(b->ghost_tilt > 0 && b->ghost_tilt < 90))
				return fail_with(cause, "ghost_tilt: %g is out of range "
				    "(allowed: (0, 90) degrees)", b->ghost_tilt);
			b->tilt_given = 1;
		} else if (strcmp(key, "stray_warn") == 0) {
			if (get_positive(v, DIM_POWER, &b->stray_warn, "stray_warn", cause))
				return -1;
			b->stray_given = 1;
		} else if (strcmp(key, "source") == 0) {
			json_t *own = NULL;
			int rc = read_source(v, &b->src, b, &own, cause);

			json_decref(own);
			if (rc != 0 || bench_tol_source_check(b, cause) != 0)
				return -1;
		} else if (strcmp(key, "tolerances") == 0) {
			if (bench_tol_defaults_from_json(v, b, cause) != 0)
				return -1;
		} else if (strcmp(key, "points") == 0) {
			if (bench_points_from_json(v, b, cause) != 0)
				return -1;
		} else {
			return fail_with(cause, "unknown top-level key '%s' (format, name, "
			    "notes, safety_factor, air_breakdown, ghost_tilt, stray_warn, source, points, "
			    "tolerances, path)", key);
		}
	}
	if (b->name == NULL || b->name[0] == '\0')
		return fail_with(cause, "name: missing");
	return 0;
}

struct bench *
bench_file_parse(const char *text, size_t len, const char *where, char **cause)
{
	size_t skip = bom_len(text, len);
	struct bench *b;

	if (len > BENCH_FILE_MAX) {
		fail_with(cause, "%s: larger than %d MiB, the most a bench file "
		    "may be; refused", where, BENCH_FILE_MAX >> 20);
		return NULL;
	}
	if ((b = bench_file_parse_fast(text + skip, len - skip)) != NULL)
		return b;
	return bench_file_parse_tree(text, len, where, cause);
}

struct bench *
bench_file_parse_tree(const char *text, size_t len, const char *where, char **cause)
{
	json_error_t jerr;
	json_t *root, *path;
	struct bench *b;
	size_t skip = bom_len(text, len);

	if (len > BENCH_FILE_MAX) {
		fail_with(cause, "%s: larger than %d MiB, the most a bench file "
		    "may be; refused", where, BENCH_FILE_MAX >> 20);
		return NULL;
	}
	root = json_loadb(text + skip, len - skip, JSON_REJECT_DUPLICATES, &jerr);
	if (root == NULL) {
		fail_with(cause, "%s:%d:%d: not valid JSON: %s", where, jerr.line,
		    jerr.column, jerr.text);
		return NULL;
	}
	b = model_bench_new(NULL);
	free(b->name);
	b->name = NULL;
	if (bench_head_from_json(root, b, cause) != 0)
		goto bad;
	path = json_object_get(root, "path");
	if (path == NULL) {
		fail_with(cause, "path: missing");
		goto bad;
	}
	if (read_branch(path, &b->path, "path", 0, cause) != 0)
		goto bad;
	if (model_validate(b, cause) != 0)
		goto bad;
	json_decref(root);
	return b;
bad:
	cause_prefix(cause, "%s", where);
	json_decref(root);
	model_bench_free(b);
	return NULL;
}

#define SLURP_HUGE ((size_t)512 << 10)

char *
bench_slurp(const char *path, size_t *len, char **cause)
{
	int is_stdin = strcmp(path, "-") == 0;
	const char *shown = is_stdin ? "<stdin>" : path;
	FILE *f = is_stdin ? stdin : fopen(path, "rb");
	struct buf b;
	char chunk[65536];
	size_t n, skip;
	struct stat st;

	if (f == NULL) {
		fail_with(cause, "%s: %s", path, strerror(errno));
		return NULL;
	}
	buf_init(&b);
	/* a regular file's size is known: one buffer of it, not the
	 * doublings up to twice it (a 10^5-element file is 8 MB); one that
	 * grows meanwhile still grows the buffer */
	if (fstat(fileno(f), &st) == 0 && S_ISREG(st.st_mode) && st.st_size > 0 &&
	    st.st_size <= BENCH_FILE_MAX) {
		size_t want = (size_t)st.st_size + 1;
		/* a long file's text in 2 MB pages (util-err.h): from a quarter of
		 * one, what it saves in faults (2 us per 4 kB) pays for zeroing
		 * the rest (0.14 ms per 2 MB) */
		char *huge = want >= SLURP_HUGE ? huge_alloc(&want) : NULL;

		if (huge != NULL) {
			free(b.s);
			b.s = huge;
			b.s[0] = '\0';
		} else {
			want = (size_t)st.st_size + 1;
			b.s = xrealloc(b.s, want);
		}
		b.cap = want;
	}
	for (;;) {
		/* into the buffer itself while it has room (a regular file's
		 * whole text at once), through chunk when it must grow */
		int direct = b.cap - b.len > sizeof chunk;

		n = direct ? fread(b.s + b.len, 1, b.cap - b.len - 1, f) :
		    fread(chunk, 1, sizeof chunk, f);
		if (n == 0)
			break;
		if (n > BENCH_FILE_MAX - b.len) {
			/* refused before it is all read: /dev/zero never ends */
			fail_with(cause, "%s: larger than %d MiB, the most a bench "
			    "file may be; refused", shown, BENCH_FILE_MAX >> 20);
			if (f != stdin)
				fclose(f);
			buf_release(&b);
			return NULL;
		}
		if (direct) {
			b.len += n;
			b.s[b.len] = '\0';
		} else {
			buf_addn(&b, chunk, n);
		}
	}
	if (ferror(f)) {
		fail_with(cause, "%s: %s", path, strerror(errno));
		if (f != stdin)
			fclose(f);
		buf_release(&b);
		return NULL;
	}
	if (f != stdin)
		fclose(f);
	if ((skip = bom_len(b.s, b.len)) != 0) {
		memmove(b.s, b.s + skip, b.len - skip + 1);
		b.len -= skip;
	}
	*len = b.len;
	return buf_take(&b);
}

struct bench *
bench_file_read(const char *path, char **cause)
{
	size_t len;
	char *text = bench_slurp(path, &len, cause);
	struct bench *b;

	if (text == NULL)
		return NULL;
	b = bench_file_parse(text, len, strcmp(path, "-") == 0 ? "<stdin>" : path, cause);
	free(text);
	return b;
}
