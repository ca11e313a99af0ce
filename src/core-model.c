/* core-model.c - the bench in memory, its key table and its checks.
 * Every rule about which value a key may hold lives here, so a value typed
 * in a file, on the command line or in the workbench meets the same check. */
#include <config.h>

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "core-model.h"
#include "core-point.h"
#include "core-tol.h"
#include "util-buf.h"
#include "util-err.h"

#define ALL_OPTICS (EL_BIT(EL_MIRROR) | EL_BIT(EL_LENS) | EL_BIT(EL_SPLITTER) | \
	EL_BIT(EL_WINDOW) | EL_BIT(EL_FILTER) | EL_BIT(EL_WAVEPLATE) | \
	EL_BIT(EL_POLARIZER) | EL_BIT(EL_IRIS) | EL_BIT(EL_DUMP) | \
	EL_BIT(EL_DETECTOR) | EL_BIT(EL_TARGET) | EL_BIT(EL_ISOLATOR))
/* bench-format.md: every element may have an aperture and a damage rating */
#define ALL_TYPES (ALL_OPTICS | EL_BIT(EL_SPACE))
#define TRANSMISSIVE (EL_BIT(EL_LENS) | EL_BIT(EL_WINDOW))
#define TERMINATORS (EL_BIT(EL_DUMP) | EL_BIT(EL_DETECTOR) | EL_BIT(EL_TARGET))
/* ghost-conventions.md: the elements whose glass surfaces reflect */
#define SURFACED (TRANSMISSIVE | EL_BIT(EL_FILTER) | EL_BIT(EL_WAVEPLATE) | \
	EL_BIT(EL_POLARIZER) | EL_BIT(EL_SPLITTER))

static const char *const material_choices[MAT_COUNT + 1] = {
	"fused_silica", "n-bk7", "caf2", "sapphire_o", NULL,
};

/* Ranges: angles of incidence stay below grazing; polarizer and waveplate
 * angles are any orientation (within ±360°).  Everything else is held to
 * what a bench can hold (beamledger-bench(5), RANGES): lengths, radii and
 * apertures 1 nm .. 1 km, n2 up to 1e-5 cm²/W, index 1 .. 10, od up to 20,
 * power ratings 1 fW .. 1 GW, damage ratings 1 mW/cm .. 10 GW/cm,
 * 1 mW/cm² .. 1 PW/cm², 1 µJ/cm² .. 1 MJ/cm², measured at 10 nm .. 1 mm and
 * 1 as .. 1 s.  Beyond these a trace would only multiply round-off into
 * infinities; the bounds are far outside any real part. */
const struct model_key_def model_keys[K_COUNT] = {
	[K_LENGTH] = { "length", KIND_QUANTITY, DIM_LENGTH, 0, 1e3, 0, 0, 0,
	    EL_BIT(EL_SPACE), NAN, "free-space gap length" },
	[K_REFLECTANCE] = { "reflectance", KIND_FRACTION, DIM_NONE, 0, 1, 0, 0, 0,
	    EL_BIT(EL_MIRROR) | EL_BIT(EL_SPLITTER), NAN, "power reflectance, 0..1" },
	[K_RS] = { "rs", KIND_FRACTION, DIM_NONE, 0, 1, 0, 0, 0,
	    EL_BIT(EL_MIRROR) | EL_BIT(EL_SPLITTER), NAN, "s-polarized power reflectance" },
	[K_RP] = { "rp", KIND_FRACTION, DIM_NONE, 0, 1, 0, 0, 0,
	    EL_BIT(EL_MIRROR) | EL_BIT(EL_SPLITTER), NAN, "p-polarized power reflectance" },
	[K_TP] = { "tp", KIND_FRACTION, DIM_NONE, 0, 1, 0, 0, 0,
	    EL_BIT(EL_SPLITTER), NAN, "p-polarized power transmittance" },
	[K_TS] = { "ts", KIND_FRACTION, DIM_NONE, 0, 1, 0, 0, 0,
	    EL_BIT(EL_SPLITTER), NAN, "s-polarized power transmittance" },
	[K_ROC] = { "roc", KIND_QUANTITY, DIM_LENGTH, -1e3, 1e3, 0, 0, 1,
	    EL_BIT(EL_MIRROR), NAN, "radius of curvature, + concave; absent = flat" },
	[K_AOI] = { "aoi", KIND_ANGLE, DIM_NONE, 0, 90, 0, 1, 0,
	    EL_BIT(EL_MIRROR) | SURFACED, NAN, "angle of incidence, degrees" },
	[K_FOCAL] = { "focal", KIND_QUANTITY, DIM_LENGTH, -1e3, 1e3, 0, 0, 1,
	    EL_BIT(EL_LENS), NAN, "focal length, - diverging" },
	[K_AXIS] = { "axis", KIND_AXIS, DIM_NONE, 0, 2, 0, 0, 0,
	    EL_BIT(EL_LENS), AXIS_BOTH, "both, x or y (cylindrical)" },
	[K_TRANSMISSION] = { "transmission", KIND_FRACTION, DIM_NONE, 0, 1, 0, 0, 0,
	    TRANSMISSIVE | EL_BIT(EL_FILTER) | EL_BIT(EL_WAVEPLATE) | EL_BIT(EL_POLARIZER) |
	    EL_BIT(EL_ISOLATOR), 1, "power transmission, 0..1" },
	[K_THICKNESS] = { "thickness", KIND_QUANTITY, DIM_LENGTH, 0, 1e3, 0, 0, 0,
	    TRANSMISSIVE, NAN, "material thickness, for the B-integral" },
	[K_N2] = { "n2", KIND_QUANTITY, DIM_N2, 0, 1e-9, 0, 0, 0,
	    TRANSMISSIVE, NAN, "nonlinear index, e.g. 2.7e-16 cm^2/W" },
	[K_INDEX] = { "index", KIND_NUMBER, DIM_NONE, 1, 10, 0, 0, 0,
	    SURFACED, 1.45, "linear refractive index" },
	[K_POLARIZING] = { "polarizing", KIND_BOOL, DIM_NONE, 0, 1, 0, 0, 0,
	    EL_BIT(EL_SPLITTER), 0, "true: polarizing splitter" },
	[K_OD] = { "od", KIND_NUMBER, DIM_NONE, 0, 20, 0, 0, 0,
	    EL_BIT(EL_FILTER), NAN, "optical density, T = 10^-od" },
	[K_MAX_ABSORBED] = { "max_absorbed", KIND_QUANTITY, DIM_POWER, 1e-15, 1e9, 0, 0, 0,
	    EL_BIT(EL_FILTER), NAN, "absorbed power rating" },
	[K_RETARDANCE] = { "retardance", KIND_NUMBER, DIM_NONE, 0, 1e3, 0, 0, 0,
	    EL_BIT(EL_WAVEPLATE), NAN, "retardance in waves (0.5, 0.25)" },
	[K_ANGLE] = { "angle", KIND_ANGLE, DIM_NONE, -360, 360, 0, 0, 0,
	    EL_BIT(EL_WAVEPLATE) | EL_BIT(EL_POLARIZER), 0, "axis angle from horizontal, degrees" },
	[K_EXTINCTION] = { "extinction", KIND_NUMBER, DIM_NONE, 1, 1e12, 0, 0, 0,
	    EL_BIT(EL_POLARIZER), NAN, "pass/block transmission ratio; absent = ideal" },
	[K_DIAMETER] = { "diameter", KIND_QUANTITY, DIM_LENGTH, 1e-9, 1e3, 0, 0, 0,
	    EL_BIT(EL_IRIS), NAN, "iris opening diameter" },
	[K_MAX_POWER] = { "max_power", KIND_QUANTITY, DIM_POWER, 1e-15, 1e9, 0, 0, 0,
	    TERMINATORS, NAN, "power rating" },
	[K_APERTURE] = { "aperture", KIND_QUANTITY, DIM_LENGTH, 1e-9, 1e3, 0, 0, 0,
	    ALL_TYPES, NAN, "clear-aperture diameter" },
	/* ghost-conventions.md: absent = AR coated, 0.5 % per surface, assumed */
	[K_SURF_R] = { "surface_reflectance", KIND_SURFACE, DIM_NONE, 0, 1, 0, 1, 0,
	    SURFACED, NAN, "residual reflectance per surface, or uncoated (Fresnel)" },
	[K_SURF_R_BACK] = { "surface_reflectance_back", KIND_SURFACE, DIM_NONE, 0, 1, 0, 1, 0,
	    SURFACED, NAN, "back surface's reflectance when it differs from the front" },
	[K_LEAK] = { "leak", KIND_FRACTION, DIM_NONE, 0, 1, 0, 0, 0,
	    EL_BIT(EL_MIRROR), NAN, "fraction that passes behind the mirror (a stray)" },
	[K_REFLECTIVE] = { "reflective", KIND_BOOL, DIM_NONE, 0, 1, 0, 0, 0,
	    EL_BIT(EL_FILTER), 0, "true: what the filter does not pass it reflects" },
	[K_ISOLATION] = { "isolation", KIND_NUMBER, DIM_NONE, 0, 100, 0, 0, 0,
	    EL_BIT(EL_ISOLATOR), NAN, "reverse isolation in dB, for light going back" },
	[K_R1] = { "r1", KIND_QUANTITY, DIM_LENGTH, -1e3, 1e3, 0, 0, 1,
	    EL_BIT(EL_LENS), NAN, "front surface radius, + centre downstream; absent = flat" },
	[K_R2] = { "r2", KIND_QUANTITY, DIM_LENGTH, -1e3, 1e3, 0, 0, 1,
	    EL_BIT(EL_LENS), NAN, "back surface radius, + centre downstream; absent = flat" },
	[K_MATERIAL] = { "material", KIND_CHOICE, DIM_NONE, 0, MAT_COUNT - 1, 0, 0, 0,
	    TRANSMISSIVE, NAN, "glass: fused_silica, n-bk7, caf2, sapphire_o (index from Sellmeier)",
	    material_choices },
	[K_BREWSTER] = { "brewster", KIND_BOOL, DIM_NONE, 0, 1, 0, 0, 0,
	    EL_BIT(EL_WINDOW), 0, "true: a plate at Brewster's angle (no p loss)" },
	[K_PHASE] = { "phase", KIND_ANGLE, DIM_NONE, -360, 360, 0, 0, 0,
	    EL_BIT(EL_MIRROR) | EL_BIT(EL_SPLITTER), 0, "s-p phase on reflection, degrees" },
	[K_DMG_CW_LINEAR] = { "cw_linear", KIND_QUANTITY, DIM_LINEAR, 1e-1, 1e12, 0, 0, 0,
	    ALL_TYPES, NAN, "CW LIDT, linear power density (kW/cm)" },
	[K_DMG_CW_IRRADIANCE] = { "cw_irradiance", KIND_QUANTITY, DIM_IRRADIANCE, 10, 1e19, 0, 0, 0,
	    ALL_TYPES, NAN, "CW LIDT, irradiance (kW/cm^2)" },
	[K_DMG_FLUENCE] = { "fluence", KIND_QUANTITY, DIM_FLUENCE, 1e-2, 1e10, 0, 0, 0,
	    ALL_TYPES, NAN, "pulsed LIDT, peak fluence (J/cm^2)" },
	[K_DMG_WAVELENGTH] = { "wavelength", KIND_QUANTITY, DIM_LENGTH, 1e-8, 1e-3, 0, 0, 0,
	    ALL_TYPES, NAN, "wavelength the LIDT was measured at" },
	[K_DMG_PULSE_WIDTH] = { "pulse_width", KIND_QUANTITY, DIM_TIME, 1e-18, 1, 0, 0, 0,
	    ALL_TYPES, NAN, "pulse width the fluence LIDT was measured at" },
};

/* Signed keys that may be neither zero nor tighter than this: |v| at least
 * (a 1e-320 m focal length would make 1/f infinite). */
static const double min_abs[K_COUNT] = {
	[K_ROC] = 1e-9, [K_FOCAL] = 1e-9, [K_R1] = 1e-9, [K_R2] = 1e-9,
};

static const char *const type_names[EL_NTYPES] = {
	"space", "mirror", "lens", "splitter", "window", "filter",
	"waveplate", "polarizer", "iris", "dump", "detector", "target",
	"isolator",
};

static const char *const key_paths[K_COUNT - K_DMG_FIRST] = {
	"damage.cw_linear", "damage.cw_irradiance", "damage.fluence",
	"damage.wavelength", "damage.pulse_width",
};

const char *
model_type_name(enum elem_type t)
{
	return (unsigned)t < EL_NTYPES ? type_names[t] : "?";
}

int
model_type_parse(const char *s, enum elem_type *out)
{
	for (int t = 0; t < EL_NTYPES; t++)
		if (strcmp(s, type_names[t]) == 0) {
			*out = (enum elem_type)t;
			return 0;
		}
	return -1;
}

static const char *const shape_names[] = { "gaussian", "sech2", "square" };

const char *
model_shape_name(enum pulse_shape sh)
{
	return (unsigned)sh < 3 ? shape_names[sh] : "?";
}

int
model_shape_parse(const char *s, enum pulse_shape *out)
{
	for (int i = 0; s != NULL && i < 3; i++)
		if (strcmp(s, shape_names[i]) == 0) {
			*out = (enum pulse_shape)i;
			return 0;
		}
	return -1;
}

const char *
model_port_name(enum port p)
{
	switch (p) {
	case PORT_REFLECTED:	return "reflected";
	case PORT_TRANSMITTED:	return "transmitted";
	case PORT_REJECTED:	return "rejected";
	default:		return "main";
	}
}

int
model_type_is_terminator(enum elem_type t)
{
	return (TERMINATORS & EL_BIT(t)) != 0;
}

int
model_type_takes_port(enum elem_type t, enum port p)
{
	if (t == EL_SPLITTER)
		return p == PORT_REFLECTED || p == PORT_TRANSMITTED;
	if (t == EL_POLARIZER)
		return p == PORT_REJECTED;
	return 0;
}

const char *
model_key_path(enum model_key k)
{
	return k >= K_DMG_FIRST ? key_paths[k - K_DMG_FIRST] : model_keys[k].name;
}

int
model_key_find(const char *name)
{
	for (int k = 0; k < K_COUNT; k++)
		if (strcmp(name, model_key_path((enum model_key)k)) == 0)
			return k;
	return -1;
}

int
model_key_applies(enum model_key k, enum elem_type t)
{
	return (model_keys[k].types & EL_BIT(t)) != 0;
}

/* A bound as a person reads it: "1 nm", "1 km", "0.5". */
static void
bound_text(struct buf *b, const struct model_key_def *d, double v)
{
	char tmp[64];

	units_format_shortest(tmp, sizeof tmp, v, d->kind == KIND_QUANTITY ?
	    d->dim : DIM_NONE, 0);
	buf_add(b, tmp);
}

static void
range_text(struct buf *b, const struct model_key_def *d)
{
	if (isinf(d->lo) && isinf(d->hi)) {
		buf_add(b, "any nonzero value");
	} else if (isinf(d->hi)) {
		buf_add(b, d->lo_open ? "> " : ">= ");
		bound_text(b, d, d->lo);
	} else if (min_abs[d - model_keys] > 0 && d->lo == -d->hi) {
		/* "roc": either sign, neither too flat nor too tight */
		buf_add(b, "± ");
		bound_text(b, d, min_abs[d - model_keys]);
		buf_add(b, " to ± ");
		bound_text(b, d, d->hi);
	} else {
		buf_add(b, d->lo_open ? "(" : "[");
		bound_text(b, d, d->lo);
		buf_add(b, ", ");
		bound_text(b, d, d->hi);
		buf_add(b, d->hi_open ? ")" : "]");
	}
}

int
model_key_in_range(enum model_key k, double v)
{
	const struct model_key_def *d = &model_keys[k];

	if (!isfinite(v) || (d->lo_open ? v <= d->lo : v < d->lo) ||
	    (d->hi_open ? v >= d->hi : v > d->hi) || (d->nonzero && v == 0) ||
	    fabs(v) < min_abs[k])
		return 0;
	if (d->kind == KIND_AXIS || d->kind == KIND_BOOL || d->kind == KIND_CHOICE)
		return v == floor(v);
	return 1;
}

int
model_set(struct element *el, enum model_key k, double v, char **cause)
{
	const struct model_key_def *d = &model_keys[k];
	struct buf b;
	char shown[64];
	int bad;

	if (!model_key_applies(k, el->type))
		return fail_with(cause, "element '%s': a %s has no key '%s'",
		    el->id, model_type_name(el->type), model_key_path(k));
	if (!isfinite(v)) {
		units_format(shown, sizeof shown, v, DIM_NONE, 6, 0);
		return fail_with(cause, "element '%s': %s: '%s' is not a finite number",
		    el->id, model_key_path(k), shown);
	}
	v = v == 0 ? 0.0 : v;           /* -0 is 0: one value, one text */
	if (d->kind == KIND_SURFACE && v == MODEL_UNCOATED) {
		el->val[k] = v;
		el->set |= KEY_BIT(k);
		return 0;
	}
	bad = !model_key_in_range(k, v);
	if (bad) {
		/* formatted only for the message: a 10^5-element file sets
		 * half a million values */
		units_format_shortest(shown, sizeof shown, v,
		    d->kind == KIND_QUANTITY ? d->dim : DIM_NONE, 0);
		buf_init(&b);
		range_text(&b, d);
		fail_with(cause, "element '%s': %s %s is out of range (allowed: %s)",
		    el->id, model_key_path(k), shown, b.s);
		buf_release(&b);
		return -1;
	}
	el->val[k] = v;
	el->set |= KEY_BIT(k);
	return 0;
}

void
model_unset(struct element *el, enum model_key k)
{
	el->set &= ~KEY_BIT(k);
	el->val[k] = NAN;
	tol_put(el, k, NULL);
}

static int
parse_plain(const char *text, double *v)
{
	char *end;

	while (*text == ' ' || *text == '\t')
		text++;
	if (*text == '\0')
		return -1;
	*v = strtod(text, &end);
	while (*end == ' ' || *end == '\t')
		end++;
	return *end == '\0' && isfinite(*v) ? 0 : -1;
}

/* A value of the wrong dimension is often meant for a sibling key (an
 * irradiance typed into damage.cw_linear): the key of this type that takes
 * the dimension the text has, if there is one. */
static const char *
other_key(enum elem_type t, enum model_key k, const char *text)
{
	for (int j = 0; j < K_COUNT; j++) {
		double v;

		if (j == (int)k || model_keys[j].kind != KIND_QUANTITY ||
		    model_keys[j].dim == model_keys[k].dim ||
		    !model_key_applies((enum model_key)j, t))
			continue;
		if (units_parse(text, model_keys[j].dim, &v, NULL) == 0 && v != 0)
			return model_key_path((enum model_key)j);
	}
	return NULL;
}

static int set_value_text(struct element *el, enum model_key k, const char *text,
    char **cause);

int
model_set_text(struct element *el, enum model_key k, const char *text, char **cause)
{
	const struct model_key_def *d = &model_keys[k];
	const char *rest;
	struct tol t;
	size_t vlen, i;
	char *vt;
	int rc = 0;

	if (!tol_split(text, &vlen, &rest))
		return set_value_text(el, k, text, cause);
	if (!model_key_applies(k, el->type))
		return fail_with(cause, "element '%s': a %s has no key '%s'",
		    el->id, model_type_name(el->type), model_key_path(k));
	if (d->kind == KIND_BOOL || d->kind == KIND_AXIS || d->kind == KIND_CHOICE)
		return fail_with(cause, "element '%s': %s: '%s': a tolerance needs a "
		    "numeric key", el->id, model_key_path(k), text);
	if (tol_parse(rest, d->kind == KIND_QUANTITY ? d->dim : DIM_NONE, &t, cause) != 0)
		return cause_prefix(cause, "element '%s': %s", el->id, model_key_path(k)), -1;
	double oldv = el->val[k];
	uint64_t oldset = el->set;

	for (i = 0; i < vlen && (text[i] == ' ' || text[i] == '\t'); i++)
		;
	if (i < vlen) {
		vt = xasprintf("%.*s", (int)vlen, text);
		rc = set_value_text(el, k, vt, cause);
		free(vt);
	} else if (isnan(model_get(el, k))) {
		rc = fail_with(cause, "element '%s': %s: '%s': no value to put the "
		    "tolerance on (write the value before the sign)", el->id,
		    model_key_path(k), text);
	} else if (!(el->set & KEY_BIT(k))) {
		/* a tolerance on a default: the default becomes the element's
		 * own value, so the file and every view show what it is around */
		rc = model_set(el, k, model_get(el, k), cause);
	}
	if (rc == 0)
		rc = tol_check_range(el, k, model_get(el, k), &t, cause);
	if (rc == 0) {
		tol_put(el, k, &t);
	} else {
		/* all or nothing: the value stays as it was */
		el->val[k] = oldv;
		el->set = oldset;
	}
	return rc;
}

static int
set_value_text(struct element *el, enum model_key k, const char *text, char **cause)
{
	const struct model_key_def *d = &model_keys[k];
	char *why = NULL;
	double v;

	if (!model_key_applies(k, el->type))
		return fail_with(cause, "element '%s': a %s has no key '%s'",
		    el->id, model_type_name(el->type), model_key_path(k));
	switch (d->kind) {
	case KIND_QUANTITY:
		if (units_parse(text, d->dim, &v, &why) != 0) {
			const char *hint = other_key(el->type, k, text);

			fail_with(cause, "element '%s': %s: %s%s%s%s", el->id,
			    model_key_path(k), why, hint != NULL ? " (for that, use " : "",
			    hint != NULL ? hint : "", hint != NULL ? ")" : "");
			free(why);
			return -1;
		}
		break;
	case KIND_BOOL:
		if (strcmp(text, "true") == 0)
			v = 1;
		else if (strcmp(text, "false") == 0)
			v = 0;
		else
			return fail_with(cause, "element '%s': %s: '%s' is not true or false",
			    el->id, model_key_path(k), text);
		break;
	case KIND_SURFACE:
		if (strcmp(text, "uncoated") == 0)
			v = MODEL_UNCOATED;
		else if (parse_plain(text, &v) != 0)
			return fail_with(cause, "element '%s': %s: '%s' is neither a fraction "
			    "nor uncoated", el->id, model_key_path(k), text);
		else if (v == MODEL_UNCOATED)
			v = 2;          /* typed -1 is out of range, not "uncoated" */
		break;
	case KIND_AXIS:
		if (strcmp(text, "both") == 0)
			v = AXIS_BOTH;
		else if (strcmp(text, "x") == 0)
			v = AXIS_X;
		else if (strcmp(text, "y") == 0)
			v = AXIS_Y;
		else
			return fail_with(cause, "element '%s': %s: '%s' is not both, x or y",
			    el->id, model_key_path(k), text);
		break;
	case KIND_CHOICE: {
		struct buf names;

		for (int i = 0; d->choices[i] != NULL; i++)
			if (strcmp(text, d->choices[i]) == 0)
				return model_set(el, k, i, cause);
		buf_init(&names);
		for (int i = 0; d->choices[i] != NULL; i++)
			buf_printf(&names, "%s%s", i ? ", " : "", d->choices[i]);
		fail_with(cause, "element '%s': %s: '%s' is not one of %s",
		    el->id, model_key_path(k), text, names.s);
		buf_release(&names);
		return -1;
	}
	default:
		if (parse_plain(text, &v) != 0)
			return fail_with(cause, "element '%s': %s: '%s' is not a plain number%s",
			    el->id, model_key_path(k), text,
			    d->kind == KIND_ANGLE ? " (degrees)" : "");
		break;
	}
	return model_set(el, k, v, cause);
}

char *
model_value_text(const struct element *el, enum model_key k)
{
	const struct model_key_def *d = &model_keys[k];
	double v = model_get(el, k);
	char tmp[64], tt[80];

	switch (d->kind) {
	case KIND_QUANTITY:
		units_format_exact(tmp, sizeof tmp, v, d->dim);
		tol_format(tt, sizeof tt, tol_of(el, k), d->dim, 0);
		return xasprintf("%s%s", tmp, tt);
	case KIND_BOOL:
		return xstrdup(v != 0 ? "true" : "false");
	case KIND_AXIS:
		return xstrdup(v == AXIS_X ? "x" : v == AXIS_Y ? "y" : "both");
	case KIND_CHOICE:
		return xstrdup(v >= d->lo && v <= d->hi ? d->choices[(int)v] : "");
	case KIND_SURFACE:
		if (v == MODEL_UNCOATED)
			return xstrdup("uncoated");
		/* FALLTHROUGH */
	default:
		units_format_exact(tmp, sizeof tmp, v, DIM_NONE);
		tol_format(tt, sizeof tt, tol_of(el, k), DIM_NONE, 0);
		return xasprintf("%s%s", tmp, tt);
	}
}

/* ---- life cycle ---- */

void
model_element_init(struct element *el, enum elem_type t, const char *id)
{
	memset(el, 0, sizeof *el);
	el->type = t;
	el->id = xstrdup(id != NULL ? id : "");
	for (int k = 0; k < K_COUNT; k++)
		el->val[k] = NAN;
}

void
model_branch_release(struct branch *b)
{
	for (size_t i = 0; i < b->n; i++)
		model_element_release(&b->el[i]);
	free(b->el);
	b->el = NULL;
	b->n = b->cap = 0;
}

void
model_element_release(struct element *el)
{
	free(el->id);
	free(el->label);
	free(el->part);
	model_branch_release(&el->side);
	free(el->tol);
	el->tol = NULL;
	el->id = el->label = el->part = NULL;
}

static void
branch_copy(struct branch *dst, const struct branch *src)
{
	dst->n = dst->cap = src->n;
	dst->el = src->n ? xcalloc(src->n, sizeof *dst->el) : NULL;
	for (size_t i = 0; i < src->n; i++)
		model_element_copy(&dst->el[i], &src->el[i]);
}

void
model_element_copy(struct element *dst, const struct element *src)
{
	*dst = *src;
	dst->id = xstrdup(src->id);
	dst->label = xstrdup(src->label);
	dst->part = xstrdup(src->part);
	if (src->tol != NULL) {
		dst->tol = xcalloc(K_COUNT, sizeof *dst->tol);
		memcpy(dst->tol, src->tol, K_COUNT * sizeof *dst->tol);
	}
	branch_copy(&dst->side, &src->side);
}

struct element *
model_branch_push(struct branch *b)
{
	struct element *el;

	if (b->n == b->cap) {
		b->cap = b->cap ? b->cap * 2 : 8;
		b->el = xreallocarray(b->el, b->cap, sizeof *b->el);
	}
	el = &b->el[b->n++];
	memset(el, 0, sizeof *el);
	return el;
}

void
model_branch_insert(struct branch *b, size_t i, struct element *el)
{
	if (i > b->n)
		i = b->n;
	model_branch_push(b);
	memmove(&b->el[i + 1], &b->el[i], (b->n - 1 - i) * sizeof *b->el);
	b->el[i] = *el;
}

void
model_branch_remove(struct branch *b, size_t i, struct element *out)
{
	if (i >= b->n)
		return;
	if (out != NULL)
		*out = b->el[i];
	else
		model_element_release(&b->el[i]);
	memmove(&b->el[i], &b->el[i + 1], (b->n - 1 - i) * sizeof *b->el);
	b->n--;
}

void
model_source_defaults(struct source *s)
{
	memset(s, 0, sizeof *s);
	s->wavelength = NAN;
	s->power = NAN;
	s->pulse_energy = NAN;
	s->rep_rate = NAN;
	s->pulse_width = NAN;
	s->waist[0] = s->waist[1] = NAN;
	s->m2[0] = s->m2[1] = 1;
	s->shape = PULSE_GAUSSIAN;
	s->pol = POL_LINEAR;
	s->max_return = NAN;
}

struct bench *
model_bench_new(const char *name)
{
	struct bench *b = xcalloc(1, sizeof *b);

	b->name = xstrdup(name != NULL ? name : "");
	b->safety_factor = 2;
	b->air_breakdown = 1e14;
	b->ghost_tilt = 1;          /* degrees, ghost-conventions.md */
	b->stray_warn = 1e-3;       /* W: common practice, class 2 CW limit */
	model_source_defaults(&b->src);
	return b;
}

void
model_bench_free(struct bench *b)
{
	if (b == NULL)
		return;
	free(b->name);
	free(b->notes);
	model_branch_release(&b->path);
	point_list_release(&b->points);
	tol_bench_free(b->tol);
	free(b);
}

struct bench *
model_bench_dup(const struct bench *src)
{
	struct bench *b = xcalloc(1, sizeof *b);

	*b = *src;
	b->name = xstrdup(src->name);
	b->notes = xstrdup(src->notes);
	branch_copy(&b->path, &src->path);
	point_list_copy(&b->points, &src->points);
	b->tol = tol_bench_dup(src->tol);
	return b;
}

/* ---- walking ---- */

static int
walk(struct branch *b, struct element *parent, size_t depth,
    model_walk_fn fn, void *arg)
{
	int rc;

	for (size_t i = 0; i < b->n; i++) {
		if ((rc = fn(&b->el[i], parent, depth, arg)) != 0)
			return rc;
		if (b->el[i].side_port != PORT_NONE &&
		    (rc = walk(&b->el[i].side, &b->el[i], depth + 1, fn, arg)) != 0)
			return rc;
	}
	return 0;
}

int
model_walk(struct branch *b, model_walk_fn fn, void *arg)
{
	return walk(b, NULL, 0, fn, arg);
}

size_t
model_count(const struct branch *b)
{
	size_t n = b->n;

	for (size_t i = 0; i < b->n; i++)
		if (b->el[i].side.n)        /* no call for the common empty side */
			n += model_count(&b->el[i].side);
	return n;
}

struct find_ctx {
	const char      *id;
	struct element  *hit, *parent;
};

static int
find_fn(struct element *el, struct element *parent, size_t depth, void *arg)
{
	struct find_ctx *c = arg;

	(void)depth;
	if (strcmp(el->id, c->id) != 0)
		return 0;
	c->hit = el;
	c->parent = parent;
	return 1;
}

struct element *
model_find(struct bench *bench, const char *id, struct branch **where,
    size_t *index, struct element **parent)
{
	struct find_ctx c = { id, NULL, NULL };
	struct branch *b;

	if (model_walk(&bench->path, find_fn, &c) == 0)
		return NULL;
	b = c.parent != NULL ? &c.parent->side : &bench->path;
	if (where != NULL)
		*where = b;
	if (index != NULL)
		*index = (size_t)(c.hit - b->el);
	if (parent != NULL)
		*parent = c.parent;
	return c.hit;
}
