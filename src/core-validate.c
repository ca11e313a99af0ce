/* core-validate.c - the checks that span more than one value: unique ids,
 * terminators last, side branches where they belong, keys that exclude or
 * need each other, and a consistent source.  Single values are checked as
 * they are set (core-model.c). */
#include <config.h>

#include <math.h>
#include <stdint.h>
#include <stdlib.h>
#include <string.h>

#include "core-beam.h"
#include "core-material.h"
#include "core-model.h"
#include "core-point.h"
#include "core-thick.h"
#include "core-tol.h"
#include "core-units.h"
#include "util-buf.h"
#include "util-err.h"

/* An open-addressing set of borrowed id strings, so that a 10^5-element
 * bench is checked in linear time. */
struct idset {
	const char **slot;
	size_t       cap;
};

static uint64_t
hash_str(const char *s)
{
	uint64_t h = 1469598103934665603ULL;     /* FNV-1a */

	for (; *s != '\0'; s++)
		h = (h ^ (unsigned char)*s) * 1099511628211ULL;
	return h;
}

/* Returns 1 when id was already present. */
static int
idset_add(struct idset *set, const char *id)
{
	size_t i = (size_t)hash_str(id) & (set->cap - 1);

	while (set->slot[i] != NULL) {
		if (strcmp(set->slot[i], id) == 0)
			return 1;
		i = (i + 1) & (set->cap - 1);
	}
	set->slot[i] = id;
	return 0;
}

struct vctx {
	struct idset ids;
	double       wavelength;    /* the source's, m: for the material fits */
	char       **cause;
};

static int
exclusive(const struct element *el, enum model_key a, enum model_key b, char **cause)
{
	if (model_has(el, a) && model_has(el, b))
		return fail_with(cause, "element '%s': give %s or %s, not both",
		    el->id, model_key_path(a), model_key_path(b));
	return 0;
}

static int
require(const struct element *el, enum model_key k, char **cause)
{
	if (!model_has(el, k))
		return fail_with(cause, "element '%s': a %s needs %s (%s)", el->id,
		    model_type_name(el->type), model_key_path(k), model_keys[k].help);
	return 0;
}

static int
sum_le_one(const struct element *el, enum model_key a, double va,
    enum model_key b, double vb, char **cause)
{
	if (va + vb > 1 + 1e-12)
		return fail_with(cause, "element '%s': %s + %s = %g exceeds 1 "
		    "(the splitter would make power)", el->id, model_key_path(a),
		    model_key_path(b), va + vb);
	return 0;
}

static int
check_splitter(const struct element *el, char **cause)
{
	double rs, rp, tp, ts;

	if (model_get(el, K_POLARIZING) == 0) {
		static const enum model_key pol_only[] = { K_RS, K_RP, K_TP, K_TS };

		for (size_t i = 0; i < sizeof pol_only / sizeof *pol_only; i++)
			if (model_has(el, pol_only[i]))
				return fail_with(cause, "element '%s': %s applies only "
				    "with polarizing: true", el->id,
				    model_key_path(pol_only[i]));
		return require(el, K_REFLECTANCE, cause);
	}
	if (model_has(el, K_REFLECTANCE))
		return fail_with(cause, "element '%s': a polarizing splitter takes "
		    "tp, rs (and ts, rp), not reflectance", el->id);
	tp = model_has(el, K_TP) ? el->val[K_TP] : 1;
	rs = model_has(el, K_RS) ? el->val[K_RS] : 1;
	ts = model_has(el, K_TS) ? el->val[K_TS] : 1 - rs;
	rp = model_has(el, K_RP) ? el->val[K_RP] : 1 - tp;
	if (sum_le_one(el, K_TP, tp, K_RP, rp, cause) != 0 ||
	    sum_le_one(el, K_TS, ts, K_RS, rs, cause) != 0)
		return -1;
	return 0;
}

/* ghost-conventions.md: "uncoated" is the Fresnel reflectance of a glass
 * the file names; of a guessed one it is refused.  A mirror's leak and its
 * reflectance cannot pass more than arrives. */
static int
check_surfaces(const struct element *el, char **cause)
{
	static const enum model_key surf[] = { K_SURF_R, K_SURF_R_BACK };

	for (size_t i = 0; i < 2; i++)
		if (model_has(el, surf[i]) && el->val[surf[i]] == MODEL_UNCOATED &&
		    !model_has(el, K_INDEX) && !model_has(el, K_MATERIAL))
			return fail_with(cause, "element '%s': %s \"uncoated\" needs the "
			    "glass's index or material (an uncoated surface of a guessed "
			    "glass is refused)", el->id, model_key_path(surf[i]));
	if (el->type != EL_MIRROR || !model_has(el, K_LEAK))
		return 0;
	if (!model_has(el, K_RS) && !model_has(el, K_RP)) {
		if (el->val[K_LEAK] + model_get(el, K_REFLECTANCE) > 1 + 1e-12)
			return fail_with(cause, "element '%s': leak %g + reflectance %g "
			    "exceeds 1 (the mirror would make power)", el->id,
			    el->val[K_LEAK], model_get(el, K_REFLECTANCE));
		return 0;
	}
	/* by s and p: the one not given reflects 1, as the trace takes it
	 * (core-trace.c), so a leak needs both */
	for (int i = 0; i < 2; i++) {
		enum model_key k = i == 0 ? K_RS : K_RP;
		double r = model_has(el, k) ? el->val[k] : 1;

		if (el->val[K_LEAK] + r > 1 + 1e-12)
			return fail_with(cause, "element '%s': leak %g + %s %g%s exceeds 1 "
			    "(the mirror would make power)", el->id, el->val[K_LEAK],
			    model_key_path(k), r, model_has(el, k) ? "" : " (not given: 1)");
	}
	return 0;
}

/* ghost-conventions.md, "Surfaces": a lens given both its radii and its
 * focal length is accepted when the focal length the radii give (the
 * thick-lens lensmaker's equation, Hecht sec. 6.2, with the lens's own
 * thickness and its index at the source's wavelength) agrees with `focal`
 * within 0.5 % of the radii's value; the trace then uses the radii, which
 * fix the shape.  Called after the material's fit is known to hold at the
 * source's wavelength (a NaN index cannot reach here; it is skipped). */
#define FOCAL_RADII_TOL 0.005

static int
check_focal_radii(const struct element *el, double lambda, char **cause)
{
	double n = thick_index(el, lambda);
	double r1 = model_has(el, K_R1) ? el->val[K_R1] : INFINITY;
	double r2 = model_has(el, K_R2) ? el->val[K_R2] : INFINITY;
	double t = model_has(el, K_THICKNESS) ? el->val[K_THICKNESS] : 0;
	double f = el->val[K_FOCAL], fr;
	char sf[64], sr[64], st[64];

	/* a tolerance on focal would be drawn and change nothing */
	if (tol_of(el, K_FOCAL) != NULL)
		return fail_with(cause, "element '%s': focal has a tolerance, but the "
		    "trace takes this lens by r1/r2 (focal only checks them): put the "
		    "tolerance on r1 or r2", el->id);
	if (isnan(n))
		return 0;
	fr = thick_lens_focal(n, r1, r2, t);
	if (isfinite(fr) && fabs(f - fr) <= FOCAL_RADII_TOL * fabs(fr))
		return 0;
	units_format_shortest(sf, sizeof sf, f, DIM_LENGTH, 0);
	units_format(sr, sizeof sr, fr, DIM_LENGTH, 6, 0);
	units_format_shortest(st, sizeof st, t, DIM_LENGTH, 0);
	if (!isfinite(fr))
		return fail_with(cause, "element '%s': focal %s disagrees with r1/r2, "
		    "which give a lens of no power (lensmaker's equation, n = %.6g, "
		    "thickness %s); give focal or the radii, or make them agree",
		    el->id, sf, n, st);
	return fail_with(cause, "element '%s': focal %s disagrees with r1/r2, which "
	    "give focal %s (lensmaker's equation, n = %.6g, thickness %s): %.3g %% "
	    "apart, more than the 0.5 %% allowed", el->id, sf, sr, n, st,
	    100 * fabs(f - fr) / fabs(fr));
}

static int
check_element(struct element *el, struct element *parent, size_t depth, void *arg)
{
	struct vctx *v = arg;
	char **cause = v->cause;

	(void)parent;
	if (el->id == NULL || el->id[0] == '\0')
		return fail_with(cause, "a %s has an empty id", model_type_name(el->type));
	if (!utf8_valid(el->id) || !utf8_valid(el->label) || !utf8_valid(el->part))
		return fail_with(cause, "element '%s': id, label or part is not valid UTF-8",
		    utf8_valid(el->id) ? el->id : "?");
	if (idset_add(&v->ids, el->id))
		return fail_with(cause, "element '%s': id used twice", el->id);
	if (depth > MODEL_MAX_DEPTH)
		return fail_with(cause, "element '%s': side branches nested more "
		    "than %d deep", el->id, MODEL_MAX_DEPTH);
	/* the keys given only, lowest first (the message names the first) */
	for (uint64_t set = el->set; set != 0; set &= set - 1) {
		int k = __builtin_ctzll(set);

		if (k >= K_COUNT)
			break;
		if (!model_key_applies((enum model_key)k, el->type))
			return fail_with(cause, "element '%s': a %s has no key '%s'",
			    el->id, model_type_name(el->type),
			    model_key_path((enum model_key)k));
	}
	if (el->side_port != PORT_NONE && !model_type_takes_port(el->type, el->side_port))
		return fail_with(cause, "element '%s': a %s has no %s port", el->id,
		    model_type_name(el->type), model_port_name(el->side_port));
	if (el->side_port == PORT_NONE && el->side.n != 0)
		return fail_with(cause, "element '%s': side branch without a port", el->id);

	switch (el->type) {
	case EL_SPACE:
		return require(el, K_LENGTH, cause);
	case EL_MIRROR:
		if (exclusive(el, K_REFLECTANCE, K_RS, cause) != 0 ||
		    exclusive(el, K_REFLECTANCE, K_RP, cause) != 0)
			return -1;
		break;
	case EL_LENS:
		/* a thin lens by its focal length, or a lens by its radii
		 * (one may be absent: flat), or both when they agree (below,
		 * once the glass is known good) */
		if (!model_has(el, K_FOCAL) && !model_has(el, K_R1) && !model_has(el, K_R2))
			return fail_with(cause, "element '%s': a lens needs focal (%s), or "
			    "r1 and/or r2 (the radii of its faces)", el->id,
			    model_keys[K_FOCAL].help);
		break;
	case EL_SPLITTER:
		if (el->side_port == PORT_NONE)
			return fail_with(cause, "element '%s': a splitter needs one side "
			    "branch, reflected or transmitted", el->id);
		if (check_splitter(el, cause) != 0)
			return -1;
		break;
	case EL_FILTER:
		if (exclusive(el, K_OD, K_TRANSMISSION, cause) != 0)
			return -1;
		break;
	case EL_WAVEPLATE:
		if (require(el, K_RETARDANCE, cause) != 0)
			return -1;
		break;
	case EL_IRIS:
		if (require(el, K_DIAMETER, cause) != 0)
			return -1;
		break;
	case EL_ISOLATOR:
		if (require(el, K_ISOLATION, cause) != 0)
			return -1;
		break;
	default:
		break;
	}
	if (check_surfaces(el, cause) != 0)
		return -1;
	if (exclusive(el, K_MATERIAL, K_INDEX, cause) != 0)
		return -1;
	if (model_has(el, K_MATERIAL) && !isnan(v->wavelength)) {
		double lo, hi;

		if (isnan(material_index((int)el->val[K_MATERIAL], v->wavelength, &lo, &hi)))
			return fail_with(cause, "element '%s': material %s: its Sellmeier fit "
			    "(%s) holds for %.3g-%.3g um, not at the source's %.6g um; "
			    "give index instead", el->id,
			    model_keys[K_MATERIAL].choices[(int)el->val[K_MATERIAL]],
			    material_source((int)el->val[K_MATERIAL]), lo * 1e6, hi * 1e6,
			    v->wavelength * 1e6);
	}
	if (el->type == EL_LENS && model_has(el, K_FOCAL) &&
	    (model_has(el, K_R1) || model_has(el, K_R2)) &&
	    check_focal_radii(el, v->wavelength, cause) != 0)
		return -1;
	if (model_has(el, K_DMG_FLUENCE) && !model_has(el, K_DMG_PULSE_WIDTH))
		return fail_with(cause, "element '%s': damage.fluence needs "
		    "damage.pulse_width (the pulse width it was measured at)", el->id);
	return 0;
}

static int
check_order(struct branch *b, const char *where, char **cause)
{
	for (size_t i = 0; i < b->n; i++) {
		struct element *el = &b->el[i];

		if (model_type_is_terminator(el->type) && i + 1 < b->n)
			return fail_with(cause, "element '%s': a %s ends its branch (%s) "
			    "but '%s' follows it", el->id, model_type_name(el->type),
			    where, b->el[i + 1].id);
	}
	return 0;
}

static int
order_fn(struct element *el, struct element *parent, size_t depth, void *arg)
{
	(void)parent;
	(void)depth;
	if (el->side_port == PORT_NONE)
		return 0;
	return check_order(&el->side, model_port_name(el->side_port), arg);
}

/* Source and bench settings are held to what a bench can hold, like the
 * element keys (core-model.c; beamledger-bench(5), RANGES). */
static int
in_range(const char *what, double v, double lo, double hi, enum unit_dim dim,
    char **cause)
{
	char sv[64], sl[64], sh[64];

	if (v >= lo && v <= hi)
		return 0;
	units_format_shortest(sv, sizeof sv, v, dim, 0);
	units_format_shortest(sl, sizeof sl, lo, dim, 0);
	units_format_shortest(sh, sizeof sh, hi, dim, 0);
	return fail_with(cause, "%s %s is out of range (allowed: [%s, %s])",
	    what, sv, sl, sh);
}

static int
source_ranges(const struct source *s, char **cause)
{
	if (in_range("source: wavelength", s->wavelength, 1e-8, 1e-3, DIM_LENGTH, cause) ||
	    in_range("source: power", s->power, 1e-15, 1e9, DIM_POWER, cause) ||
	    in_range("source: waist", s->waist[0], 1e-9, 1e3, DIM_LENGTH, cause) ||
	    in_range("source: waist", s->waist[1], 1e-9, 1e3, DIM_LENGTH, cause) ||
	    in_range("source: waist_position", s->waist_position, -1e3, 1e3, DIM_LENGTH, cause) ||
	    in_range("source: m2", s->m2[0], 1, 1e5, DIM_NONE, cause) ||
	    in_range("source: m2", s->m2[1], 1, 1e5, DIM_NONE, cause))
		return -1;
	if (s->pol == POL_LINEAR &&
	    in_range("source: polarization", s->pol_angle_deg, -360, 360, DIM_NONE, cause))
		return -1;
	if (!s->pulsed)
		return 0;
	if (in_range("source: pulsed.rep_rate", s->rep_rate, 1e-6, 1e12, DIM_FREQUENCY, cause) ||
	    in_range("source: pulsed.pulse_width", s->pulse_width, 1e-18, 1, DIM_TIME, cause) ||
	    in_range("source: pulsed.pulse_energy", s->pulse_energy, 1e-18, 1e7, DIM_ENERGY, cause))
		return -1;
	return 0;
}

int
model_source_m2_from_divergence(struct source *s, char **cause)
{
	if (!s->divergence_given || isnan(s->waist[0]) || isnan(s->waist[1]) ||
	    isnan(s->wavelength))
		return 0;
	for (int i = 0; i < 2; i++) {
		s->m2[i] = beam_m2_from_divergence(s->waist[i], s->divergence[i], s->wavelength);
		if (!(s->m2[i] >= 1))
			return fail_with(cause, "source: divergence: %.6g rad with "
			    "waist %.6g mm at %.6g nm gives M² = π·w0·θ/λ = %.4g, "
			    "below 1: no beam diverges less than a Gaussian",
			    s->divergence[i], s->waist[i] * 1e3,
			    s->wavelength * 1e9, s->m2[i]);
	}
	return 0;
}

int
model_source_validate(const struct source *s, char **cause)
{
	if (!(s->wavelength > 0) || !isfinite(s->wavelength))
		return fail_with(cause, "source: wavelength must be given and > 0");
	if (!(s->waist[0] > 0) || !(s->waist[1] > 0) || !isfinite(s->waist[0] * s->waist[1]))
		return fail_with(cause, "source: waist must be given and > 0");
	if (!isfinite(s->waist_position))
		return fail_with(cause, "source: waist_position must be finite");
	if (!(s->m2[0] >= 1) || !(s->m2[1] >= 1) || !isfinite(s->m2[0] * s->m2[1]))
		return fail_with(cause, "source: m2 must be >= 1");
	if (s->pulsed) {
		if (!(s->rep_rate > 0) || !isfinite(s->rep_rate))
			return fail_with(cause, "source: pulsed.rep_rate must be given and > 0");
		if (!(s->pulse_width > 0) || !isfinite(s->pulse_width))
			return fail_with(cause, "source: pulsed.pulse_width must be given and > 0");
		if (s->energy_given && (!(s->pulse_energy > 0) || !isfinite(s->pulse_energy)))
			return fail_with(cause, "source: pulsed.pulse_energy must be > 0");
	}
	if (!(s->power > 0) || !isfinite(s->power))
		return fail_with(cause, s->pulsed ?
		    "source: give power or pulsed.pulse_energy (> 0)" :
		    "source: power must be given and > 0");
	if (s->pol == POL_LINEAR && !isfinite(s->pol_angle_deg))
		return fail_with(cause, "source: polarization angle must be finite");
	if (!isnan(s->max_return) && !(s->max_return > 0 && s->max_return <= 1e9))
		return fail_with(cause, "source: max_return must be > 0 and at most 1 GW");
	return source_ranges(s, cause);
}

int
model_validate(const struct bench *bench, char **cause)
{
	struct bench *b = (struct bench *)bench;    /* the walk does not modify */
	struct vctx v;
	size_t n = model_count(&b->path), cap = 16;
	int rc;

	if (b->name == NULL || b->name[0] == '\0')
		return fail_with(cause, "name: the bench needs a name");
	if (!utf8_valid(b->name) || !utf8_valid(b->notes))
		return fail_with(cause, "name or notes: not valid UTF-8 text");
	if (!(b->safety_factor > 1) || !isfinite(b->safety_factor))
		return fail_with(cause, "safety_factor %g must be > 1", b->safety_factor);
	if (!(b->air_breakdown > 0) || !isfinite(b->air_breakdown))
		return fail_with(cause, "air_breakdown must be > 0");
	if (in_range("safety_factor", b->safety_factor, 1, 1e3, DIM_NONE, cause) ||
	    in_range("air_breakdown", b->air_breakdown, 1e6, 1e22, DIM_IRRADIANCE, cause))
		return -1;
	if (!(b->ghost_tilt > 0 && b->ghost_tilt < 90))
		return fail_with(cause, "ghost_tilt %g is out of range (allowed: (0, 90) degrees)",
		    b->ghost_tilt);
	if (!(b->stray_warn > 0) || in_range("stray_warn", b->stray_warn, 1e-15, 1e9,
	    DIM_POWER, cause))
		return !(b->stray_warn > 0) ? fail_with(cause, "stray_warn must be > 0") : -1;
	if (model_source_validate(&b->src, cause) != 0)
		return -1;
	while (cap < 2 * n)
		cap *= 2;
	v.ids.cap = cap;
	v.ids.slot = xcalloc(cap, sizeof *v.ids.slot);
	v.cause = cause;
	v.wavelength = b->src.wavelength;
	rc = model_walk(&b->path, check_element, &v);
	free(v.ids.slot);
	if (rc != 0)
		return -1;
	if (check_order(&b->path, "main", cause) != 0)
		return -1;
	if (model_walk(&b->path, order_fn, cause) != 0)
		return -1;
	return point_check_all(b, cause);
}
