/* report-common.c - pieces of a report that more than one form shares:
 * the source line, flag lists, warning sentences, the safety cautions. */
#include <config.h>

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "core-layout.h"
#include "report.h"
#include "util-buf.h"
#include "util-err.h"

const char report_safety_text[] =
"Laser safety: beamledger gives design estimates, not a safety assessment.\n"
"The laser safety officer, local rules and licensed practice decide.\n"
"  - Class 3B and 4 beams hurt eyes directly and by specular reflection;\n"
"    class 4 also by diffuse reflection, to skin, and as a fire risk.\n"
"  - Wear eyewear rated for this wavelength with enough optical density;\n"
"    invisible beams (UV, 1030/1064 nm, IR) need particular care.\n"
"  - Terminate every beam, stray reflections and rejected ports included,\n"
"    in a dump rated for it; keep beams in the table plane, below eye level.\n"
"  - Align at reduced power.  A pulsed focus in air can spark: UV, noise, ozone.\n";

int
report_format_parse(const char *s, enum report_format *out)
{
	if (strcmp(s, "table") == 0)
		*out = REPORT_TABLE;
	else if (strcmp(s, "json") == 0)
		*out = REPORT_JSON;
	else if (strcmp(s, "csv") == 0)
		*out = REPORT_CSV;
	else
		return -1;
	return 0;
}

void
report_flags(unsigned flags, char *buf, size_t n, const char *sep)
{
	size_t used = 0;

	if (n == 0)
		return;
	buf[0] = '\0';
	for (int i = 0; i < TF_COUNT; i++) {
		if (!(flags & (1u << i)))
			continue;
		used += (size_t)snprintf(buf + (used < n ? used : n - 1),
		    used < n ? n - used : 1, "%s%s", used ? sep : "",
		    trace_flag_name(1u << i));
	}
}

char *
report_source_line(const struct bench *b, int ascii)
{
	const struct source *s = &b->src;
	char t1[48], t2[48], t3[48], t4[48];
	struct buf out;

	/* What was typed shows as typed (shortest form that reads back);
	 * what was derived from it (energy from power, or power from energy)
	 * with three figures. */
	buf_init(&out);
	{
		/* the wavelength as typed, as the workbench and the caution line
		 * write it ("532 nm", not "532.0 nm"): one function for all */
		char *wl = layout_quantity_text(s->wavelength, DIM_LENGTH);
		char *shown = ascii ? layout_ascii(wl) : xstrdup(wl);

		buf_add(&out, shown);
		free(shown);
		free(wl);
	}
	if (s->pulsed) {
		units_format_shortest(t1, sizeof t1, s->rep_rate, DIM_FREQUENCY, ascii);
		units_format_shortest(t2, sizeof t2, s->pulse_width, DIM_TIME, ascii);
		if (s->energy_given) {
			units_format_shortest(t3, sizeof t3, s->pulse_energy, DIM_ENERGY, ascii);
			units_format(t4, sizeof t4, s->power, DIM_POWER, 3, ascii);
		} else {
			units_format(t3, sizeof t3, s->pulse_energy, DIM_ENERGY, 3, ascii);
			units_format_shortest(t4, sizeof t4, s->power, DIM_POWER, ascii);
		}
		buf_printf(&out, ", pulsed %s, %s %s, %s a pulse (%s average)",
		    t1, t2, model_shape_name(s->shape), t3, t4);
	} else {
		units_format_shortest(t1, sizeof t1, s->power, DIM_POWER, ascii);
		buf_printf(&out, ", CW %s", t1);
	}
	units_format_shortest(t1, sizeof t1, s->waist[0], DIM_LENGTH, ascii);
	if (s->waist[0] != s->waist[1]) {
		units_format_shortest(t2, sizeof t2, s->waist[1], DIM_LENGTH, ascii);
		buf_printf(&out, ", waist %s x %s", t1, t2);
	} else {
		buf_printf(&out, ", waist %s", t1);
	}
	if (s->waist_position != 0) {
		units_format_shortest(t1, sizeof t1, s->waist_position, DIM_LENGTH, ascii);
		buf_printf(&out, " at %s", t1);
	}
	if (s->divergence_given) {
		/* typed: the divergence; derived: M² = π·w0·θ/λ, three figures */
		units_format_shortest(t1, sizeof t1, s->divergence[0], DIM_NONE, ascii);
		units_format_shortest(t2, sizeof t2, s->divergence[1], DIM_NONE, ascii);
		if (s->divergence[0] != s->divergence[1])
			buf_printf(&out, ", divergence %s x %s rad", t1, t2);
		else
			buf_printf(&out, ", divergence %s rad", t1);
		units_format(t1, sizeof t1, s->m2[0], DIM_NONE, 3, ascii);
		units_format(t2, sizeof t2, s->m2[1], DIM_NONE, 3, ascii);
	} else {
		units_format_shortest(t1, sizeof t1, s->m2[0], DIM_NONE, ascii);
		units_format_shortest(t2, sizeof t2, s->m2[1], DIM_NONE, ascii);
	}
	if (s->m2[0] != s->m2[1])
		buf_printf(&out, ", M%s %s x %s", ascii ? "2" : "²", t1, t2);
	else
		buf_printf(&out, ", M%s %s", ascii ? "2" : "²", t1);
	if (s->pol == POL_CIRCULAR)
		buf_add(&out, ", circular");
	else if (s->pol == POL_UNPOLARIZED)
		buf_add(&out, ", unpolarized");
	else {
		units_format_shortest(t1, sizeof t1, s->pol_angle_deg, DIM_NONE, ascii);
		buf_printf(&out, ", linear %s%s", t1, ascii ? " deg" : "°");
	}
	return buf_take(&out);
}

char *
report_warning_text(const struct trace *t, const struct trace_warning *w, int ascii)
{
	char br[160], v[48];
	const char *after = w->after != NULL ? w->after->id : "the source";

	(void)t;
	trace_branch_name(w->parent, w->port, br, sizeof br);
	switch (w->kind) {
	case TW_UNTERMINATED:
		units_format(v, sizeof v, w->value, DIM_POWER, 3, ascii);
		return xasprintf("unterminated: %s leaves the bench after %s (branch %s)",
		    v, after, br);
	case TW_B_INTEGRAL:
		return xasprintf("b_integral: B = %.3g rad on branch %s after %s "
		    "(over 3 rad: small-scale self-focusing; common practice)",
		    w->value, br, after);
	case TW_AIR_BREAKDOWN:
		units_format(v, sizeof v, w->value, DIM_IRRADIANCE, 3, ascii);
		if (w->ghost) {
			char d[48];

			units_format(d, sizeof d, w->distance, DIM_LENGTH, 3, ascii);
			return xasprintf("air_breakdown: a surface reflection focuses in %s, %s "
			    "from the nearest optic, at %s peak: a spark in air (UV, noise, "
			    "ozone; a lens there may crack)", after, d, v);
		}
		return xasprintf("air_breakdown: the focus in %s reaches %s peak: a spark "
		    "in air (UV, noise, ozone)", after, v);
	case TW_UNRATED_DUMP:
		units_format(v, sizeof v, w->value, DIM_POWER, 3, ascii);
		return xasprintf("unrated_dump: %s goes into %s, which has no max_power: "
		    "give its rating to check it (branch %s)", v, after, br);
	case TW_GHOST_OVER:
		return xasprintf("ghost_over: a surface reflection reaches %.3g times the "
		    "threshold of %s (branch %s)", w->value, after, br);
	case TW_STRAY:
		units_format(v, sizeof v, w->value, DIM_POWER, 3, ascii);
		if (w->surface != NULL) {
			char what[32];

			/* "fourth_port" as words */
			snprintf(what, sizeof what, "%s", w->surface);
			for (char *q = what; *q != '\0'; q++)
				if (*q == '_')
					*q = ' ';
			return xasprintf("stray: %s leaves the beam line at %s (%s): block or "
			    "dump it", v, after, what);
		}
		return xasprintf("stray: %s leaves the beam line at %s: block or dump it",
		    v, after);
	case TW_RETURN_POWER:
		units_format(v, sizeof v, w->value, DIM_POWER, 3, ascii);
		return xasprintf("return_power: %s of reflections comes back to the source, "
		    "more than its max_return", v);
	case TW_UNRATED_ABSORBER:
		units_format(v, sizeof v, w->value, DIM_POWER, 3, ascii);
		return xasprintf("unrated_absorber: %s %s %s and has no rating "
		    "(over 0.5 W: give its damage rating%s; branch %s)", after,
		    w->after != NULL && model_type_is_terminator(w->after->type) ?
		    "takes" : "absorbs", v,
		    w->after != NULL && model_type_is_terminator(w->after->type) ?
		    " or max_power" : w->after != NULL && w->after->type == EL_FILTER ?
		    " or max_absorbed" : "", br);
	default: {
		char d[48], th[48];

		units_format(v, sizeof v, w->value, DIM_POWER, 3, ascii);
		units_format(d, sizeof d, w->distance, DIM_LENGTH, 2, ascii);
		units_format(th, sizeof th, w->after != NULL ?
		    model_get(w->after, K_THICKNESS) : NAN, DIM_LENGTH, 2, ascii);
		return xasprintf("self_focusing: peak power %s in %s is above the critical "
		    "power; a collimated beam would collapse after about %s of it "
		    "(thickness %s; Marburger)", v, after, d, th);
	}
	}
}
