/* core-layout-keys.c - the words the workbench puts beside a value: human
 * labels grouped by what they describe ("Damage rating", "CW irradiance"),
 * a hint that fits the key (its unit and range, no talk of units for a
 * plain number), and which keys matter when an optic of a type is placed
 * or still needs a rating.  See core-layout.h.  Owned by the workbench. */
#include <config.h>

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "core-layout.h"
#include "util-err.h"

static const struct {
	enum layout_key_group group;
	const char           *label;
} key_labels[K_COUNT] = {
	[K_LENGTH] = { LKG_OPTIC, "length" },
	[K_REFLECTANCE] = { LKG_OPTIC, "reflectance" },
	[K_RS] = { LKG_OPTIC, "reflectance s" },
	[K_RP] = { LKG_OPTIC, "reflectance p" },
	[K_TP] = { LKG_OPTIC, "transmittance p" },
	[K_TS] = { LKG_OPTIC, "transmittance s" },
	[K_ROC] = { LKG_OPTIC, "curvature radius" },
	[K_AOI] = { LKG_OPTIC, "angle of incidence" },
	[K_FOCAL] = { LKG_OPTIC, "focal length" },
	[K_AXIS] = { LKG_OPTIC, "focusing axis" },
	[K_TRANSMISSION] = { LKG_OPTIC, "transmission" },
	[K_THICKNESS] = { LKG_MATERIAL, "thickness" },
	[K_N2] = { LKG_MATERIAL, "nonlinear index n2" },
	[K_INDEX] = { LKG_MATERIAL, "refractive index" },
	[K_POLARIZING] = { LKG_OPTIC, "polarizing" },
	[K_OD] = { LKG_OPTIC, "optical density" },
	[K_MAX_ABSORBED] = { LKG_DAMAGE, "absorbed power" },
	[K_RETARDANCE] = { LKG_OPTIC, "retardance" },
	[K_ANGLE] = { LKG_OPTIC, "axis angle" },
	[K_EXTINCTION] = { LKG_OPTIC, "extinction ratio" },
	[K_DIAMETER] = { LKG_OPTIC, "opening diameter" },
	[K_MAX_POWER] = { LKG_DAMAGE, "power" },
	[K_APERTURE] = { LKG_OPTIC, "clear aperture" },
	[K_R1] = { LKG_OPTIC, "front radius r1" },
	[K_R2] = { LKG_OPTIC, "back radius r2" },
	[K_MATERIAL] = { LKG_MATERIAL, "glass" },
	[K_BREWSTER] = { LKG_OPTIC, "at Brewster angle" },
	[K_PHASE] = { LKG_OPTIC, "s-p phase shift" },
	[K_ISOLATION] = { LKG_OPTIC, "reverse isolation" },
	[K_SURF_R] = { LKG_REFLECTION, "each surface" },
	[K_SURF_R_BACK] = { LKG_REFLECTION, "back surface" },
	[K_LEAK] = { LKG_REFLECTION, "leak behind it" },
	[K_REFLECTIVE] = { LKG_REFLECTION, "reflects the rest" },
	[K_DMG_CW_LINEAR] = { LKG_DAMAGE, "CW linear density" },
	[K_DMG_CW_IRRADIANCE] = { LKG_DAMAGE, "CW irradiance" },
	[K_DMG_FLUENCE] = { LKG_DAMAGE, "pulse fluence" },
	[K_DMG_WAVELENGTH] = { LKG_DAMAGE, "at wavelength" },
	[K_DMG_PULSE_WIDTH] = { LKG_DAMAGE, "at pulse width" },
};

static const char *const group_names[LKG_COUNT] = {
	[LKG_ELEMENT] = "Element", [LKG_OPTIC] = "Optic", [LKG_MATERIAL] = "Material",
	[LKG_DAMAGE] = "Damage rating", [LKG_BENCH] = "Bench", [LKG_SOURCE] = "Source",
	[LKG_REFLECTION] = "Surface reflections",
};

const char *
layout_group_name(enum layout_key_group g)
{
	return (unsigned)g < LKG_COUNT ? group_names[g] : "";
}

const char *
layout_key_label(int key, enum layout_key_group *group)
{
	if (key < 0 || key >= K_COUNT || key_labels[key].label == NULL) {
		/* a key added to the table without a label here: its own name */
		*group = LKG_OPTIC;
		return key >= 0 && key < K_COUNT ? model_keys[key].name : "?";
	}
	*group = key_labels[key].group;
	return key_labels[key].label;
}

/* Glass passes the beam: its angle of incidence is a tilt, and what it
 * decides is whether the surfaces' reflections go back up the beam as
 * ghosts or off the axis as strays (ghost-conventions.md).  A mirror's or
 * a splitter's is the angle it works at. */
const char *
layout_key_label_for(enum elem_type t, int key, enum layout_key_group *group)
{
	if (key == K_AOI && t != EL_MIRROR && t != EL_SPLITTER) {
		*group = LKG_REFLECTION;
		return "tilt (aoi)";
	}
	return layout_key_label(key, group);
}

/* The order of the value pane: what the optic is, its material, its
 * rating, its surface reflections, then its names. */
static const enum layout_key_group field_groups[] = { LKG_OPTIC, LKG_MATERIAL, LKG_DAMAGE,
	LKG_REFLECTION, LKG_ELEMENT };

size_t
layout_field_order(const struct element *el, const struct layout_field *f, size_t n,
    size_t *order)
{
	size_t no = 0;

	for (size_t g = 0; g < sizeof field_groups / sizeof *field_groups; g++)
		for (size_t i = 0; i < n; i++) {
			enum layout_key_group kg = LKG_ELEMENT;

			if (f[i].kind == LF_KEY)
				layout_key_label_for(el->type, f[i].key, &kg);
			if (kg == field_groups[g])
				order[no++] = i;
		}
	return no;
}

static const struct {
	const char           *key;
	enum layout_key_group group;
	const char           *label;
} bench_labels[] = {
	{ "name", LKG_BENCH, "name" }, { "notes", LKG_BENCH, "notes" },
	{ "safety_factor", LKG_BENCH, "safety factor" },
	{ "air_breakdown", LKG_BENCH, "breakdown level" },
	{ "ghost_tilt", LKG_REFLECTION, "tilt for strays" },
	{ "stray_warn", LKG_REFLECTION, "stray warn level" },
	{ "source.wavelength", LKG_SOURCE, "wavelength" },
	{ "source.power", LKG_SOURCE, "average power" },
	{ "source.pulsed", LKG_SOURCE, "pulsed" },
	{ "source.pulse_energy", LKG_SOURCE, "pulse energy" },
	{ "source.rep_rate", LKG_SOURCE, "repetition rate" },
	{ "source.pulse_width", LKG_SOURCE, "pulse width" },
	{ "source.shape", LKG_SOURCE, "pulse shape" },
	{ "source.waist", LKG_SOURCE, "waist radius" },
	{ "source.waist_position", LKG_SOURCE, "waist position" },
	{ "source.m2", LKG_SOURCE, "beam quality M\u00b2" },
	{ "source.divergence", LKG_SOURCE, "divergence, rad" },
	{ "source.polarization", LKG_SOURCE, "polarization" },
	{ "source.max_return", LKG_SOURCE, "max return power" },
};

const char *
layout_bench_key_label(const char *key, enum layout_key_group *group)
{
	for (size_t i = 0; i < sizeof bench_labels / sizeof *bench_labels; i++)
		if (strcmp(bench_labels[i].key, key) == 0) {
			*group = bench_labels[i].group;
			return bench_labels[i].label;
		}
	*group = LKG_BENCH;
	return key;
}

/* What a person types for a dimension, as an example. */
static const char *
dim_example(enum unit_dim d)
{
	switch (d) {
	case DIM_LENGTH:	return "250 mm";
	case DIM_POWER:		return "5 W";
	case DIM_ENERGY:	return "200 mJ";
	case DIM_TIME:		return "8 ns";
	case DIM_FREQUENCY:	return "10 Hz";
	case DIM_LINEAR:	return "5 kW/cm";
	case DIM_IRRADIANCE:	return "1 kW/cm^2";
	case DIM_FLUENCE:	return "10 J/cm^2";
	case DIM_N2:		return "2.7e-16 cm^2/W";
	default:		return "1";
	}
}

static void
range_text(struct buf *b, const struct model_key_def *d)
{
	int lo = isfinite(d->lo), hi = isfinite(d->hi);

	if (lo && hi)
		buf_printf(b, "%g to %g", d->lo, d->hi);
	else if (lo && d->lo_open)
		buf_printf(b, "above %g", d->lo);
	else if (lo)
		buf_printf(b, "%g or more", d->lo);
	else if (hi)
		buf_printf(b, "up to %g", d->hi);
	else if (d->nonzero)
		buf_add(b, "any but 0");
	else
		buf_add(b, "any");
}

char *
layout_key_hint(int key)
{
	const struct model_key_def *d;
	struct buf b;

	if (key < 0 || key >= K_COUNT)
		return xstrdup("");
	d = &model_keys[key];
	buf_init(&b);
	switch (d->kind) {
	case KIND_QUANTITY:
		buf_printf(&b, "with its unit, e.g. \"%s\"", dim_example(d->dim));
		if (isfinite(d->lo) && d->lo == 0)
			buf_add(&b, d->lo_open ? "; above 0" : "; 0 or more");
		else if (d->nonzero)
			buf_add(&b, "; + or -, not 0");
		break;
	case KIND_FRACTION:
		buf_add(&b, "a fraction, 0 to 1 (0.99, not 99 %)");
		break;
	case KIND_SURFACE:
		buf_add(&b, "a fraction below 1 (0.005 for 0.5 %), or uncoated");
		break;
	case KIND_ANGLE:
		buf_add(&b, "degrees, ");
		range_text(&b, d);
		break;
	case KIND_NUMBER:
		buf_add(&b, "a plain number, ");
		range_text(&b, d);
		break;
	case KIND_BOOL:
		buf_add(&b, "true or false");
		break;
	case KIND_AXIS:
		buf_add(&b, "both, x or y");
		break;
	case KIND_CHOICE:
		buf_add(&b, "one of: ");
		for (size_t i = 0; d->choices != NULL && d->choices[i] != NULL; i++)
			buf_printf(&b, "%s%s", i ? ", " : "", d->choices[i]);
		break;
	}
	return buf_take(&b);
}

size_t
layout_rating_keys(enum elem_type t, int pulsed, int *out, size_t max)
{
	int k[4];
	size_t n = 0;

	if (t == EL_SPACE)
		return 0;
	if (t == EL_DUMP || t == EL_DETECTOR) {
		k[n++] = K_MAX_POWER;
	} else {
		if (t == EL_FILTER)
			k[n++] = K_MAX_ABSORBED;
		if (pulsed) {
			k[n++] = K_DMG_FLUENCE;
			k[n++] = K_DMG_PULSE_WIDTH;
		} else {
			k[n++] = K_DMG_CW_IRRADIANCE;
		}
		if (t == EL_TARGET)
			k[n++] = K_MAX_POWER;
	}
	for (size_t i = 0; i < n && i < max; i++)
		out[i] = k[i];
	return n < max ? n : max;
}

size_t
layout_place_keys(enum elem_type t, int pulsed, int *out, size_t max)
{
	int k[8];
	size_t n = 0, nr;
	int req = layout_required_key(t);

	if (req >= 0)
		k[n++] = req;
	if (t == EL_MIRROR || t == EL_SPLITTER)
		k[n++] = K_AOI;
	if (t == EL_FILTER)
		k[n++] = K_OD;
	if (t != EL_SPACE && t != EL_IRIS) {
		nr = layout_rating_keys(t, pulsed, k + n, 3);
		/* a target is rated one way: its damage rating */
		if (t == EL_TARGET && nr > 0 && k[n + nr - 1] == K_MAX_POWER)
			nr--;
		n += nr;
	}
	for (size_t i = 0; i < n && i < max; i++)
		out[i] = k[i];
	return n < max ? n : max;
}

char *
layout_rating_hint(enum elem_type t, int pulsed)
{
	int k[4];
	size_t n = layout_rating_keys(t, pulsed, k, 4);
	struct buf b;

	if (n == 0)
		return xstrdup("n/a: nothing to damage in a gap");
	buf_init(&b);
	buf_add(&b, "unrated: give ");
	for (size_t i = 0; i < n; i++) {
		if (k[i] == K_DMG_PULSE_WIDTH)
			continue;
		buf_printf(&b, "%s%s", i ? " or " : "", model_key_path((enum model_key)k[i]));
		if (k[i] == K_DMG_FLUENCE)
			buf_add(&b, " (with damage.pulse_width)");
	}
	buf_add(&b, " (Enter)");
	return buf_take(&b);
}
