/* report-explain.c - `trace --explain ID`: how one element's limit came
 * from its rating, written out in full (the rating as given, the λ and τ
 * factors with the rule each comes from and whether the τ law was capped,
 * the limit, the caution level, what the beam brings, the ratio).  The
 * numbers are layout_derive's, which takes them from damage_limits. */
#include <config.h>

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "core-damage.h"
#include "core-ghost.h"
#include "core-layout.h"
#include "report.h"
#include "util-buf.h"
#include "util-err.h"

/* The quantity of the row that the metric compares with its limit. */
static double
exposure_of(const struct trace_row *r, enum layout_metric m)
{
	switch (m) {
	case LD_CW_LINEAR:	return r->linear_density;
	case LD_CW_IRRADIANCE:	return r->irradiance;
	case LD_FLUENCE:	return r->fluence;
	case LD_MAX_POWER:	return r->power_in;
	default:		return r->power_lost;
	}
}

/* The same quantity, summed over the ghosts that meet the element. */
static double
ghost_share(const struct ghost_at *g, enum layout_metric m)
{
	switch (m) {
	case LD_CW_LINEAR:	return g->linear_density;
	case LD_CW_IRRADIANCE:	return g->irradiance;
	case LD_FLUENCE:	return g->fluence;
	case LD_MAX_POWER:	return g->power_in;
	default:		return g->power_lost;
	}
}

static const char *
exposure_name(enum layout_metric m)
{
	switch (m) {
	case LD_CW_LINEAR:	return "linear power density";
	case LD_CW_IRRADIANCE:	return "irradiance";
	case LD_FLUENCE:	return "fluence";
	case LD_MAX_POWER:	return "power in";
	default:		return "power absorbed";
	}
}

/* "max_absorbed or damage.fluence with damage.pulse_width": the keys that
 * would rate this type on this bench. */
static void
rating_keys(struct buf *b, enum elem_type type, int pulsed)
{
	int k[4];
	size_t n = layout_rating_keys(type, pulsed, k, 4);

	for (size_t i = 0; i < n; i++) {
		const char *sep = i == 0 ? "" : k[i] == K_DMG_PULSE_WIDTH ? " with " : " or ";

		buf_printf(b, "%s%s", sep, model_key_path((enum model_key)k[i]));
	}
}

static const struct trace_row *
find_row(const struct trace *t, const char *id)
{
	for (size_t i = 0; i < t->nrows; i++)
		if (strcmp(t->rows[i].el->id, id) == 0)
			return &t->rows[i];
	return NULL;
}

/* "  rating        ": a label in a column 14 wide, whatever its script. */
static void
lab(struct buf *o, const char *a, const char *b)
{
	size_t start;

	buf_add(o, "  ");
	start = o->len;
	buf_printf(o, "%s%s", a, b);
	buf_pad(o, 14, start);
	if (utf8_cols(o->s + start) >= 14)
		buf_addc(o, ' ');
}

/* Four significant digits: enough to check a derivation by hand. */
static void
q4(char *buf, size_t n, double v, enum unit_dim dim, int ascii)
{
	units_format(buf, n, v, dim, 4, ascii);
}

char *
report_explain(const struct trace *t, const char *id, int ascii, char **cause)
{
	const struct bench *b = t->bench;
	const struct trace_row *r = find_row(t, id);
	const struct source *s = &b->src;
	const char *x = ascii ? "x" : "\u00d7", *lam = ascii ? "lambda" : "\u03bb",
	    *tau = ascii ? "tau" : "\u03c4", *sq = ascii ? "sqrt" : "\u221a",
	    *law = ascii ? "sqrt(tau)" : "\u221a\u03c4";
	struct layout_derivation d;
	char v1[48], v2[48], v3[48], pct[32];
	struct buf o;
	const struct ghost_at *ga = NULL;

	if (r == NULL) {
		fail_with(cause, "bench '%s': no element '%s' to explain", b->name, id);
		return NULL;
	}
	if (r->el->type == EL_SPACE) {
		fail_with(cause, "bench '%s': '%s' is free space: it has no rating (n/a); "
		    "explain an optic", b->name, id);
		return NULL;
	}
	if (layout_derive(r, b, &d) != 0) {
		struct buf k;

		buf_init(&k);
		rating_keys(&k, r->el->type, s->pulsed);
		if (r->flags & TF_PULSED_RATING_ON_CW)
			fail_with(cause, "bench '%s': element '%s' (%s) is unrated on this CW "
			    "bench: its damage.fluence rating says nothing about a CW beam; "
			    "give %s to rate it", b->name, id, model_type_name(r->el->type),
			    k.s != NULL ? k.s : "a CW rating");
		else
			fail_with(cause, "bench '%s': element '%s' (%s) is unrated: give %s "
			    "to rate it", b->name, id, model_type_name(r->el->type),
			    k.s != NULL ? k.s : "a rating");
		buf_release(&k);
		return NULL;
	}
	buf_init(&o);
	/* the element's own ratio counts the reflections that meet it */
	if (t->ghosts != NULL && (r->flags & TF_GHOSTS))
		ga = &t->ghosts->at[r - t->rows];
	layout_percent(pct, sizeof pct, ga != NULL ? r->ratio : d.ratio);
	buf_printf(&o, "Why %s (%s) is at %s of its limit, on bench %s:\n\n", id,
	    model_type_name(r->el->type), pct, b->name);
	/* the rating as given, with the conditions it was specified at */
	units_format_shortest(v1, sizeof v1, d.rating, d.dim, ascii);
	lab(&o, "rating", "");
	buf_printf(&o, "%s = %s", model_key_path((enum model_key)d.key), v1);
	if (d.metric == LD_FLUENCE || d.metric == LD_CW_LINEAR || d.metric == LD_CW_IRRADIANCE) {
		if (model_has(r->el, K_DMG_WAVELENGTH)) {
			units_format_shortest(v2, sizeof v2, r->el->val[K_DMG_WAVELENGTH],
			    DIM_LENGTH, ascii);
			buf_printf(&o, " at %s", v2);
		} else {
			buf_add(&o, " (no damage.wavelength: taken as the beam's)");
		}
		if (d.metric == LD_FLUENCE) {
			units_format_shortest(v2, sizeof v2, r->el->val[K_DMG_PULSE_WIDTH],
			    DIM_TIME, ascii);
			buf_printf(&o, ", %s pulses", v2);
		}
	}
	buf_addc(&o, '\n');
	units_format_shortest(v1, sizeof v1, s->wavelength, DIM_LENGTH, ascii);
	lab(&o, "beam", "");
	buf_printf(&o, "%s", v1);
	if (s->pulsed) {
		units_format_shortest(v2, sizeof v2, s->pulse_width, DIM_TIME, ascii);
		buf_printf(&o, ", %s pulses", v2);
	} else {
		buf_add(&o, ", CW");
	}
	buf_addc(&o, '\n');
	/* the λ factor */
	if (d.metric == LD_MAX_POWER || d.metric == LD_MAX_ABSORBED) {
		lab(&o, lam, " factor");
		buf_add(&o, "none: a power rating is not scaled\n");
		lab(&o, tau, " factor");
		buf_add(&o, "none: a power rating is not scaled\n");
	} else {
		if (model_has(r->el, K_DMG_WAVELENGTH) && r->el->val[K_DMG_WAVELENGTH] != s->wavelength) {
			units_format_shortest(v1, sizeof v1, s->wavelength, DIM_LENGTH, ascii);
			units_format_shortest(v2, sizeof v2, r->el->val[K_DMG_WAVELENGTH],
			    DIM_LENGTH, ascii);
			lab(&o, lam, " factor");
			buf_printf(&o, "%s %.4g = %s / %s (threshold proportional to %s: rule of "
			    "thumb, common practice)\n", x, d.lambda_factor, v1, v2, lam);
		} else {
			lab(&o, lam, " factor");
			buf_printf(&o, "%s 1: rated at the beam's wavelength\n", x);
		}
		if (d.metric != LD_FLUENCE) {
			lab(&o, tau, " factor");
			buf_add(&o, "none: a CW rating is not scaled by pulse width\n");
		} else {
			double ts = r->el->val[K_DMG_PULSE_WIDTH], raw = sqrt(s->pulse_width / ts);
			int inside = ts >= DAMAGE_TAU_MIN && ts <= DAMAGE_TAU_MAX &&
			    s->pulse_width >= DAMAGE_TAU_MIN && s->pulse_width <= DAMAGE_TAU_MAX;

			units_format_shortest(v1, sizeof v1, s->pulse_width, DIM_TIME, ascii);
			units_format_shortest(v2, sizeof v2, ts, DIM_TIME, ascii);
			lab(&o, tau, " factor");
			if (s->pulse_width == ts)
				buf_printf(&o, "%s 1: rated at the beam's pulse width\n", x);
			else if (inside)
				buf_printf(&o, "%s %.4g = %s(%s / %s) (the %s law for fluence, Stuart "
				    "et al. 1996; both widths inside 50 ps-100 ns: not capped)\n", x,
				    d.tau_factor, sq, v1, v2, law);
			else if (raw > 1)
				buf_printf(&o, "%s %.4g: %s(%s / %s) = %.4g capped at 1 (outside "
				    "50 ps-100 ns the %s law only lowers a threshold, never raises it; "
				    "ask the vendor for a rating)\n", x, d.tau_factor, sq, v1, v2, raw,
				    law);
			else
				buf_printf(&o, "%s %.4g = %s(%s / %s) (outside 50 ps-100 ns: the %s law "
				    "is not established there, but it only lowers the threshold, so it "
				    "is kept; not capped)\n", x, d.tau_factor, sq, v1, v2, law);
		}
	}
	q4(v1, sizeof v1, d.rating, d.dim, ascii);
	q4(v2, sizeof v2, d.limit, d.dim, ascii);
	lab(&o, "limit", "");
	if (d.metric == LD_MAX_POWER || d.metric == LD_MAX_ABSORBED)
		buf_printf(&o, "%s, the rating itself\n", v2);
	else
		buf_printf(&o, "%s %s %.4g %s %.4g = %s\n", v1, x, d.lambda_factor, x,
		    d.tau_factor, v2);
	q4(v3, sizeof v3, d.caution_level, d.dim, ascii);
	lab(&o, "caution level", "");
	buf_printf(&o, "%s / %g (the bench's safety factor) = %s\n", v2,
	    d.safety_factor, v3);
	q4(v1, sizeof v1, exposure_of(r, d.metric), d.dim, ascii);
	lab(&o, "the beam", "");
	buf_printf(&o, "%s %s at %s%s\n", exposure_name(d.metric), v1, id,
	    ga != NULL ? " (the main beam)" : "");
	if (ga != NULL) {
		double g = ghost_share(ga, d.metric);

		q4(v3, sizeof v3, g, d.dim, ascii);
		lab(&o, "reflections", "");
		buf_printf(&o, "+ %s from the %zu surface reflection%s that meet it (added "
		    "as if coaxial)\n", v3, ga->nmet, ga->nmet == 1 ? "" : "s");
		q4(v1, sizeof v1, exposure_of(r, d.metric) + g, d.dim, ascii);
	}
	lab(&o, "ratio", "");
	buf_printf(&o, "%s / %s = %s: %s\n", v1, v2, pct,
	    layout_status_word(r->status));
	return buf_take(&o);
}
