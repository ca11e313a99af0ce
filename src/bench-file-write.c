/* bench-file-write.c - writing bench files: every value with the unit a
 * person would type ("250 mm", "1064 nm"), in the shortest digits that read
 * back to the same double, its tolerance after it; the file laid out with
 * an element to a line.  What it writes, bench-file.c reads back to the
 * same bench. */
#include <config.h>

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "bench-file.h"
#include "bench-point.h"
#include "bench-tol.h"
#include "util-buf.h"
#include "util-json.h"

static void dump_element(struct buf *, json_t *, int);

/* Export writes every quantity as a person would type it ("1064 nm",
 * "5 W", "200 mm", "1 kW/cm^2") rather than in bare SI.  The digits are
 * those of the shortest decimal that reads back to the same double; moving
 * the decimal point into a power-of-ten unit keeps that decimal exactly,
 * and units_parse folds the unit into the exponent before one rounding, so
 * the text reads back bit for bit.  Each string is still checked by
 * reading it back, with the bare SI number as the fallback.  The store
 * keeps bare numbers (units = 0): its records are compared as text. */
struct unit_step {
	const char *name;           /* ASCII, as typed */
	int         exp10;          /* one of it is 10^exp10 SI */
};

/* Candidate units per dimension, smallest first; a value takes the largest
 * whose mantissa is at least 1 (the smallest for smaller values). */
static const struct unit_step len_units[] = { { "nm", -9 }, { "um", -6 }, { "mm", -3 },
    { "m", 0 }, { NULL, 0 } };
static const struct unit_step power_units[] = { { "nW", -9 }, { "uW", -6 }, { "mW", -3 },
    { "W", 0 }, { "kW", 3 }, { "MW", 6 }, { "GW", 9 }, { NULL, 0 } };
static const struct unit_step energy_units[] = { { "nJ", -9 }, { "uJ", -6 }, { "mJ", -3 },
    { "J", 0 }, { "kJ", 3 }, { NULL, 0 } };
static const struct unit_step time_units[] = { { "fs", -15 }, { "ps", -12 }, { "ns", -9 },
    { "us", -6 }, { "ms", -3 }, { "s", 0 }, { NULL, 0 } };
static const struct unit_step freq_units[] = { { "Hz", 0 }, { "kHz", 3 }, { "MHz", 6 },
    { "GHz", 9 }, { NULL, 0 } };
/* W/cm = 100 W/m; W/cm^2 and J/cm^2 = 10^4 SI; cm^2/W = 10^-4 m^2/W */
static const struct unit_step linear_units[] = { { "mW/cm", 0 }, { "W/cm", 2 },
    { "kW/cm", 5 }, { "MW/cm", 8 }, { NULL, 0 } };
static const struct unit_step irr_units[] = { { "mW/cm^2", 1 }, { "W/cm^2", 4 },
    { "kW/cm^2", 7 }, { "MW/cm^2", 10 }, { "GW/cm^2", 13 }, { "TW/cm^2", 16 },
    { NULL, 0 } };
static const struct unit_step fluence_units[] = { { "uJ/cm^2", -2 }, { "mJ/cm^2", 1 },
    { "J/cm^2", 4 }, { "kJ/cm^2", 7 }, { NULL, 0 } };
static const struct unit_step n2_units[] = { { "cm^2/W", -4 }, { NULL, 0 } };
/* wavelengths are said in nm below 10 um ("1064 nm", "2100 nm"), then in
 * um ("10.6 um") */
static const struct unit_step wl_units[] = { { "nm", -9 }, { "um", -6 }, { NULL, 0 } };

static const struct unit_step *
units_for(enum unit_dim dim, int wavelength)
{
	switch (dim) {
	case DIM_LENGTH:        return wavelength ? wl_units : len_units;
	case DIM_POWER:         return power_units;
	case DIM_ENERGY:        return energy_units;
	case DIM_TIME:          return time_units;
	case DIM_FREQUENCY:     return freq_units;
	case DIM_LINEAR:        return linear_units;
	case DIM_IRRADIANCE:    return irr_units;
	case DIM_FLUENCE:       return fluence_units;
	case DIM_N2:            return n2_units;
	default:                return NULL;
	}
}

/* The shortest significant digits of v that read back (no point, no
 * trailing zeros) into digits, and the power of ten of its last digit:
 * |v| = digits * 10^*last.  Returns the number of digits. */
static int
shortest_digits(double v, char digits[20], int *last)
{
	char tmp[40];
	int prec, x = 0, n = 0;

	for (prec = 1; prec <= 17; prec++) {
		snprintf(tmp, sizeof tmp, "%.*e", prec - 1, fabs(v));
		if (strtod(tmp, NULL) == fabs(v))
			break;
	}
	for (const char *p = tmp; *p != '\0' && *p != 'e'; p++)
		if (*p >= '0' && *p <= '9')
			digits[n++] = *p;
	digits[n] = '\0';
	x = atoi(strchr(tmp, 'e') + 1);
	while (n > 1 && digits[n - 1] == '0')   /* the leading digit's place stays x */
		digits[--n] = '\0';
	*last = x - (n - 1);
	return n;
}

/* digits * 10^shift as plain decimal text ("1064", "0.5", "2.75"), or in
 * scientific form when that would need many zeros. */
static void
place_point(struct buf *b, const char *digits, int n, int shift)
{
	if (shift >= 0 && shift <= 6) {
		buf_add(b, digits);
		for (int i = 0; i < shift; i++)
			buf_addc(b, '0');
	} else if (shift < 0 && -shift < n) {
		buf_printf(b, "%.*s.%s", n + shift, digits, digits + n + shift);
	} else if (shift < 0 && -shift - n <= 4) {
		buf_add(b, "0.");
		for (int i = 0; i < -shift - n; i++)
			buf_addc(b, '0');
		buf_add(b, digits);
	} else {
		buf_printf(b, "%c", digits[0]);
		if (n > 1)
			buf_printf(b, ".%s", digits + 1);
		buf_printf(b, "e%d", shift + n - 1);
	}
}

/* The text of v in the unit a person would type, or NULL when it would
 * not read back exactly (caller frees). */
static char *
quantity_text(double v, enum unit_dim dim, int wavelength)
{
	const struct unit_step *u = units_for(dim, wavelength), *pick;
	char digits[20];
	struct buf b;
	double back;
	int n, last, mag;

	if (u == NULL || !isfinite(v))
		return NULL;
	v = v == 0 ? 0.0 : v;           /* -0 is 0: one value, one text */
	pick = &u[0];
	if (v == 0) {
		/* zero reads as zero in any unit; the base one reads plainest */
		for (const struct unit_step *s = u; s->name != NULL; s++)
			if (s->exp10 == 0 || (dim == DIM_LINEAR && s->exp10 == 2) ||
			    ((dim == DIM_IRRADIANCE || dim == DIM_FLUENCE) && s->exp10 == 4))
				pick = s;
		buf_init(&b);
		buf_printf(&b, "0 %s", pick->name);
	} else {
		n = shortest_digits(v, digits, &last);
		mag = last + n - 1;             /* 10^mag <= |v| < 10^(mag+1) */
		for (const struct unit_step *s = u; s->name != NULL; s++)
			if (mag >= s->exp10 && !(wavelength && s->exp10 == -6 && mag < -5))
				pick = s;
		buf_init(&b);
		if (v < 0)
			buf_addc(&b, '-');
		place_point(&b, digits, n, last - pick->exp10);
		buf_printf(&b, " %s", pick->name);
	}
	if (units_parse(b.s, dim, &back, NULL) != 0 || memcmp(&back, &v, sizeof v) != 0) {
		buf_release(&b);
		return NULL;
	}
	return buf_take(&b);
}

static json_t *
quantity_json(double v, enum unit_dim dim, int wavelength, int units)
{
	char *t = units ? quantity_text(v, dim, wavelength) : NULL;
	json_t *j;

	if (t == NULL)
		return json_real(v == 0 ? 0.0 : v);
	j = json_string(t);
	free(t);
	return j;
}

static json_t *
key_json(const struct element *el, enum model_key k, int units)
{
	switch (model_keys[k].kind) {
	case KIND_BOOL:
		return json_boolean(el->val[k] != 0);
	case KIND_AXIS:
		return json_string(el->val[k] == AXIS_X ? "x" : el->val[k] == AXIS_Y ? "y" : "both");
	case KIND_SURFACE:
		if (el->val[k] == MODEL_UNCOATED)
			return json_string("uncoated");
		return quantity_json(el->val[k], DIM_NONE, 0, units);
	case KIND_CHOICE: {
		char *t = model_value_text(el, k);
		json_t *j = json_string(t);

		free(t);
		return j;
	}
	default:
		return bench_tol_wrap(quantity_json(el->val[k], model_keys[k].dim,
		    k == K_DMG_WAVELENGTH, units), tol_of(el, k),
		    model_keys[k].kind == KIND_QUANTITY ? model_keys[k].dim : DIM_NONE);
	}
}

static json_t *branch_json(const struct branch *br, int units);

static json_t *
element_json(const struct element *el, int with_branch, int units)
{
	json_t *o = json_object(), *dmg = NULL;

	if (el->id != NULL && el->id[0] != '\0')
		json_object_set_new(o, "id", json_string(el->id));
	json_object_set_new(o, "type", json_string(model_type_name(el->type)));
	if (el->label != NULL)
		json_object_set_new(o, "label", json_string(el->label));
	if (el->part != NULL)
		json_object_set_new(o, "part", json_string(el->part));
	for (int k = 0; k < K_COUNT; k++) {
		if (!model_has(el, (enum model_key)k))
			continue;
		if (k >= K_DMG_FIRST) {
			if (dmg == NULL)
				dmg = json_object();
			json_object_set_new(dmg, model_keys[k].name,
			    key_json(el, (enum model_key)k, units));
		} else {
			json_object_set_new(o, model_keys[k].name,
			    key_json(el, (enum model_key)k, units));
		}
	}
	if (dmg != NULL)
		json_object_set_new(o, "damage", dmg);
	if (with_branch && el->side_port != PORT_NONE)
		json_object_set_new(o, model_port_name(el->side_port),
		    branch_json(&el->side, units));
	return o;
}

json_t *
bench_element_to_json(const struct element *el, int with_branch)
{
	return element_json(el, with_branch, 0);
}

static json_t *
branch_json(const struct branch *br, int units)
{
	json_t *a = json_array();

	for (size_t i = 0; i < br->n; i++)
		json_array_append_new(a, element_json(&br->el[i], 1, units));
	return a;
}

/* A source value with its tolerance, if any. */
static json_t *
src_json(const struct bench *b, enum tol_src ts, json_t *v)
{
	return b->tol == NULL ? v : bench_tol_wrap(v, &b->tol->src[ts], tol_src_dim(ts));
}

static json_t *
pair_json(const struct bench *bn, enum tol_src ts, const double v[2], int pair,
    enum unit_dim dim, int units)
{
	json_t *a;

	if (!pair)
		return src_json(bn, ts, quantity_json(v[0], dim, 0, units));
	a = json_array();
	json_array_append_new(a, src_json(bn, ts, quantity_json(v[0], dim, 0, units)));
	json_array_append_new(a, src_json(bn, (enum tol_src)(ts + 1),
	    quantity_json(v[1], dim, 0, units)));
	return a;
}

static json_t *
head_json(const struct bench *b, int units)
{
	const struct source *s = &b->src;
	json_t *o = json_object(), *src = json_object(), *dflt;

	json_object_set_new(o, "format", json_string(MODEL_FORMAT));
	json_object_set_new(o, "name", json_string(b->name));
	if (b->notes != NULL)
		json_object_set_new(o, "notes", json_string(b->notes));
	if (b->safety_given)
		json_object_set_new(o, "safety_factor", json_real(b->safety_factor));
	if (b->air_given)
		json_object_set_new(o, "air_breakdown",
		    quantity_json(b->air_breakdown, DIM_IRRADIANCE, 0, units));
	if (b->tilt_given)
		json_object_set_new(o, "ghost_tilt", json_real(b->ghost_tilt));
	if (b->stray_given)
		json_object_set_new(o, "stray_warn",
		    quantity_json(b->stray_warn, DIM_POWER, 0, units));
	json_object_set_new(src, "wavelength", src_json(b, TS_WAVELENGTH,
	    quantity_json(s->wavelength, DIM_LENGTH, 1, units)));
	if (!s->energy_given)
		json_object_set_new(src, "power", src_json(b, TS_POWER,
		    quantity_json(s->power, DIM_POWER, 0, units)));
	if (s->pulsed) {
		json_t *p = json_object();

		json_object_set_new(p, "rep_rate", src_json(b, TS_REP_RATE,
		    quantity_json(s->rep_rate, DIM_FREQUENCY, 0, units)));
		json_object_set_new(p, "pulse_width", src_json(b, TS_PULSE_WIDTH,
		    quantity_json(s->pulse_width, DIM_TIME, 0, units)));
		json_object_set_new(p, "shape", json_string(model_shape_name(s->shape)));
		if (s->energy_given)
			json_object_set_new(p, "pulse_energy", src_json(b, TS_PULSE_ENERGY,
			    quantity_json(s->pulse_energy, DIM_ENERGY, 0, units)));
		json_object_set_new(src, "pulsed", p);
	}
	json_object_set_new(src, "waist", pair_json(b, TS_WAIST_X, s->waist, s->waist_pair,
	    DIM_LENGTH, units));
	json_object_set_new(src, "waist_position", src_json(b, TS_WAIST_POSITION,
	    quantity_json(s->waist_position, DIM_LENGTH, 0, units)));
	if (s->divergence_given) {
		/* a measured divergence carries no tolerance of its own (M² does) */
		json_t *d = s->m2_pair ? json_array() : NULL;

		if (d != NULL) {
			json_array_append_new(d, json_real(s->divergence[0]));
			json_array_append_new(d, json_real(s->divergence[1]));
		}
		json_object_set_new(src, "divergence", d != NULL ? d : json_real(s->divergence[0]));
	} else
		json_object_set_new(src, "m2", pair_json(b, TS_M2_X, s->m2, s->m2_pair, DIM_NONE, 0));
	if (s->pol == POL_CIRCULAR)
		json_object_set_new(src, "polarization", json_string("circular"));
	else if (s->pol == POL_UNPOLARIZED)
		json_object_set_new(src, "polarization", json_string("unpolarized"));
	else
		json_object_set_new(src, "polarization", src_json(b, TS_POLARIZATION,
		    json_real(s->pol_angle_deg)));
	if (!isnan(s->max_return))
		json_object_set_new(src, "max_return", quantity_json(s->max_return, DIM_POWER,
		    0, units));
	json_object_set_new(o, "source", src);
	if ((dflt = bench_tol_defaults_to_json(b)) != NULL)
		json_object_set_new(o, "tolerances", dflt);
	if (b->points.n > 0)
		json_object_set_new(o, "points", bench_points_to_json(b));
	return o;
}

json_t *
bench_head_to_json(const struct bench *b)
{
	return head_json(b, 0);
}

/* jansson prints reals with 17 digits ("0.10000000000000001"); a file
 * people read should say 0.1, and still read back to the same double.
 * Elements stay on one line each, so a long path reads like a list. */
static void
dump_value(struct buf *out, json_t *v, int indent, int inline_all)
{
	const char *k;
	json_t *x;
	size_t i;
	int first = 1;

	switch (json_typeof(v)) {
	case JSON_OBJECT:
		buf_addc(out, '{');
		json_object_foreach(v, k, x) {
			int branch = json_is_array(x) && !inline_all;

			buf_add(out, first ? (inline_all ? " " : "\n") : (inline_all ? ", " : ",\n"));
			if (!inline_all)
				buf_printf(out, "%*s", indent + 2, "");
			json_put_string(out, k);
			buf_add(out, ": ");
			dump_value(out, x, indent + 2, inline_all && !branch);
			first = 0;
		}
		if (inline_all)
			buf_add(out, first ? "}" : " }");
		else
			buf_printf(out, "\n%*s}", indent, "");
		break;
	case JSON_ARRAY:
		if (json_array_size(v) == 0) {
			buf_add(out, "[]");
			break;
		}
		buf_addc(out, '[');
		json_array_foreach(v, i, x) {
			if (inline_all || !json_is_object(x)) {
				buf_add(out, i ? ", " : "");
				dump_value(out, x, indent, 1);
				continue;
			}
			buf_printf(out, "%s\n%*s", i ? "," : "", indent + 2, "");
			/* an element: one line, except its side branch */
			dump_element(out, x, indent + 2);
		}
		if (inline_all || !json_is_object(json_array_get(v, 0)))
			buf_addc(out, ']');
		else
			buf_printf(out, "\n%*s]", indent, "");
		break;
	case JSON_STRING:
		json_put_string(out, json_string_value(v));
		break;
	case JSON_INTEGER:
		buf_printf(out, "%lld", (long long)json_integer_value(v));
		break;
	case JSON_REAL:
		json_put_exact(out, json_real_value(v));
		break;
	case JSON_TRUE:
		buf_add(out, "true");
		break;
	case JSON_FALSE:
		buf_add(out, "false");
		break;
	default:
		buf_add(out, "null");
		break;
	}
}

static void
dump_element(struct buf *out, json_t *el, int indent)
{
	const char *k;
	json_t *x;
	int first = 1;

	buf_addc(out, '{');
	json_object_foreach(el, k, x) {
		buf_add(out, first ? " " : ", ");
		json_put_string(out, k);
		buf_add(out, ": ");
		if (json_is_array(x) && json_array_size(x) > 0 &&
		    json_is_object(json_array_get(x, 0)))
			dump_value(out, x, indent + 2, 0);
		else
			dump_value(out, x, indent, 1);
		first = 0;
	}
	buf_add(out, " }");
}

char *
bench_file_dump(const struct bench *b)
{
	json_t *o = head_json(b, 1);
	struct buf out;

	json_object_set_new(o, "path", branch_json(&b->path, 1));
	buf_init(&out);
	dump_value(&out, o, 0, 0);
	buf_addc(&out, '\n');
	json_decref(o);
	return buf_take(&out);
}
