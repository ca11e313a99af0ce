/* report-json.c - the trace as one JSON object with the fields named in
 * bench-format.md ("Trace output"): SI numbers (10 significant digits),
 * null where a value does not apply.  Written straight into a buffer: a
 * 10^5-element trace must come out in well under a second. */
#include <config.h>

#include <math.h>
#include <stdio.h>
#include <stdlib.h>

#include "core-ghost.h"
#include "core-layout.h"
#include "report.h"
#include "util-buf.h"
#include "util-json.h"

static void
key(struct buf *b, const char *k)
{
	buf_printf(b, ",\n      \"%s\": ", k);
}

static void
knum(struct buf *b, const char *k, double v)
{
	key(b, k);
	json_put_number(b, v);
}

static void
kstr(struct buf *b, const char *k, const char *v)
{
	key(b, k);
	json_put_string(b, v);
}

static void waist_json(struct buf *, const struct trace_row *, int present);

static void
row_json(struct buf *b, const struct trace *t, const struct trace_row *r)
{
	const struct damage_limits *l = &r->limits;
	char br[160];
	int first = 1;

	trace_branch_name(r->parent, r->port, br, sizeof br);
	buf_add(b, "    {\n      \"id\": ");
	json_put_string(b, r->el->id);
	kstr(b, "type", model_type_name(r->el->type));
	if (r->el->label != NULL)
		kstr(b, "label", r->el->label);
	kstr(b, "branch", br);
	key(b, "depth");
	buf_printf(b, "%u", r->depth);
	knum(b, "z", r->z);
	knum(b, "power_in", r->power_in);
	knum(b, "power_out", r->power_out);
	knum(b, "power_lost", r->power_lost);
	knum(b, "radius_x", r->wx);
	knum(b, "radius_y", r->wy);
	knum(b, "irradiance", r->irradiance);
	knum(b, "linear_density", r->linear_density);
	knum(b, "peak_irradiance", r->peak_irradiance);
	knum(b, "field", r->field);
	knum(b, "clip_loss", r->clip_loss);
	if (t->bench->src.pulsed) {
		knum(b, "fluence", r->fluence);
		knum(b, "peak_power", r->peak_power);
	}
	if (!isnan(r->critical_power)) {
		knum(b, "critical_power", r->critical_power);
		knum(b, "critical_ratio", r->critical_ratio);
		knum(b, "collapse_distance", r->collapse_distance);
		knum(b, "b_integral", r->b_integral);
	}
	knum(b, "b_total", r->b_total);
	key(b, "stokes");
	for (int i = 0; i < 4; i++) {
		buf_add(b, i ? ", " : "[");
		json_put_number(b, r->stokes[i]);
	}
	buf_addc(b, ']');
	knum(b, "ratio", r->ratio);
	kstr(b, "status", damage_status_name(r->status));
	key(b, "flags");
	buf_addc(b, '[');
	for (int i = 0; i < TF_COUNT; i++)
		if (r->flags & (1u << i)) {
			if (!first)
				buf_add(b, ", ");
			first = 0;
			json_put_string(b, trace_flag_name(1u << i));
		}
	buf_addc(b, ']');
	key(b, "scaled_limits");
	buf_addc(b, '{');
	first = 1;
	{
		const struct { const char *name; double v; } lims[] = {
			{ "cw_linear", l->cw_linear }, { "cw_irradiance", l->cw_irradiance },
			{ "fluence", l->fluence }, { "max_power", l->max_power },
			{ "max_absorbed", l->max_absorbed },
		};

		for (size_t i = 0; i < sizeof lims / sizeof *lims; i++) {
			if (isnan(lims[i].v))
				continue;
			buf_printf(b, "%s\"%s\": ", first ? "" : ", ", lims[i].name);
			json_put_number(b, lims[i].v);
			first = 0;
		}
	}
	buf_addc(b, '}');
	{
		/* how the governing limit came from its rating (layout_derive) */
		struct layout_derivation d;

		key(b, "limit_derivation");
		if (layout_derive(r, t->bench, &d) != 0) {
			buf_add(b, "null");
		} else {
			buf_add(b, "{\"rating_key\": ");
			json_put_string(b, model_key_path((enum model_key)d.key));
			buf_add(b, ", \"rating\": ");
			json_put_number(b, d.rating);
			buf_add(b, ", \"wavelength_factor\": ");
			json_put_number(b, d.lambda_factor);
			buf_add(b, ", \"pulse_factor\": ");
			json_put_number(b, d.tau_factor);
			buf_add(b, ", \"limit\": ");
			json_put_number(b, d.limit);
			buf_add(b, ", \"safety_factor\": ");
			json_put_number(b, d.safety_factor);
			buf_add(b, ", \"caution_level\": ");
			json_put_number(b, d.caution_level);
			buf_addc(b, '}');
		}
	}
	if (r->el->type == EL_SPACE) {
		/* "waist": every waist in the gap; "focus": the same when it
		 * concentrates the beam at least TRACE_FOCUS_CONCENTRATION times */
		key(b, "waist");
		waist_json(b, r, r->has_waist);
		key(b, "focus");
		waist_json(b, r, r->has_focus);
	}
	buf_add(b, "\n    }");
}

static void
waist_json(struct buf *b, const struct trace_row *r, int present)
{
	{
		if (!present) {
			buf_add(b, "null");
		} else {
			buf_add(b, "{\"z\": ");
			json_put_number(b, r->focus.z);
			buf_add(b, ", \"radius_x\": ");
			json_put_number(b, r->focus.wx);
			buf_add(b, ", \"radius_y\": ");
			json_put_number(b, r->focus.wy);
			buf_add(b, ", \"irradiance\": ");
			json_put_number(b, r->focus.irradiance);
			buf_add(b, ", \"peak_irradiance\": ");
			json_put_number(b, r->focus.peak_irradiance);
			buf_add(b, ", \"concentration\": ");
			json_put_number(b, r->focus.concentration);
			buf_add(b, ", \"on\": ");
			if (r->focus.on != NULL)
				json_put_string(b, r->focus.on->id);
			else
				buf_add(b, "null");
			buf_printf(b, ", \"air_breakdown\": %s}",
			    r->focus.air_breakdown ? "true" : "false");
		}
	}
}

/* ghost-conventions.md, Output: ghosts, strays, return_power. */
static void
ghosts_json(struct buf *b, const struct trace *t)
{
	const struct ghost_set *gs = t->ghosts;
	char name[160];

	buf_add(b, ",\n  \"ghosts\": [");
	for (size_t i = 0; i < gs->n; i++) {
		const struct ghost *g = &gs->g[i];
		int first = 1;

		buf_printf(b, "%s\n    {\"order\": %d, \"surfaces\": [", i ? "," : "", g->order);
		for (int k = 0; k < g->order; k++) {
			ghost_surface_name(g, k, name, sizeof name);
			if (k)
				buf_add(b, ", ");
			json_put_string(b, name);
		}
		buf_add(b, "], \"power_start\": ");
		json_put_number(b, g->power_start);
		/* rows only where the trace kept them (TRACE_GHOST_ROWS) */
		if (gs->rows_kept)
			buf_add(b, ",\n      \"rows\": [");
		for (size_t k = 0; gs->rows_kept && k < g->nrows; k++) {
			const struct ghost_row *r = &gs->rows[g->row0 + k];

			buf_add(b, k ? ",\n        {\"id\": " : "\n        {\"id\": ");
			json_put_string(b, r->el->id);
			buf_add(b, ", \"power_in\": ");
			json_put_number(b, r->power_in);
			buf_add(b, ", \"radius_x\": ");
			json_put_number(b, r->wx);
			buf_add(b, ", \"radius_y\": ");
			json_put_number(b, r->wy);
			buf_add(b, ", \"irradiance\": ");
			json_put_number(b, r->irradiance);
			buf_add(b, ", \"fluence\": ");
			json_put_number(b, r->fluence);
			buf_add(b, ", \"peak_irradiance\": ");
			json_put_number(b, r->peak_irradiance);
			buf_add(b, ", \"ratio\": ");
			json_put_number(b, r->ratio);
			buf_add(b, ", \"status\": ");
			json_put_string(b, damage_status_name(r->status));
			buf_addc(b, '}');
		}
		buf_add(b, gs->rows_kept ? "],\n      \"foci\": [" : ",\n      \"foci\": [");
		for (size_t k = 0; k < g->nfoci; k++) {
			const struct ghost_focus *f = &gs->foci[g->focus0 + k];

			buf_add(b, k ? ", {\"z\": " : "{\"z\": ");
			json_put_number(b, f->z);
			buf_add(b, ", \"gap\": ");
			json_put_string(b, f->gap->id);
			buf_add(b, ", \"distance\": ");
			json_put_number(b, f->distance);
			buf_add(b, ", \"radius_x\": ");
			json_put_number(b, f->wx);
			buf_add(b, ", \"radius_y\": ");
			json_put_number(b, f->wy);
			buf_add(b, ", \"peak_irradiance\": ");
			json_put_number(b, f->peak_irradiance);
			buf_printf(b, ", \"air_breakdown\": %s}", f->air_breakdown ? "true" : "false");
		}
		buf_add(b, "],\n      \"worst\": ");
		if (g->worst_row >= 0) {
			buf_add(b, "{\"id\": ");
			json_put_string(b, t->rows[g->worst_row].el->id);
			buf_add(b, ", \"ratio\": ");
			json_put_number(b, g->worst_ratio);
			buf_addc(b, '}');
		} else {
			buf_add(b, "null");
		}
		buf_add(b, ", \"flags\": [");
		for (int k = 0; k < GF_COUNT; k++)
			if (g->flags & (1u << k)) {
				if (!first)
					buf_add(b, ", ");
				first = 0;
				json_put_string(b, ghost_flag_name(1u << k));
			}
		buf_add(b, "]}");
	}
	buf_add(b, gs->n ? "\n  ],\n  \"strays\": [" : "],\n  \"strays\": [");
	for (size_t i = 0; i < gs->nstrays; i++) {
		const struct ghost_stray *s = &gs->strays[i];

		snprintf(name, sizeof name, "%s.%s", s->from->id, s->what);
		buf_add(b, i ? ",\n    {\"from\": " : "\n    {\"from\": ");
		json_put_string(b, name);
		buf_add(b, ", \"power\": ");
		json_put_number(b, s->power);
		buf_add(b, ", \"peak_power\": ");
		json_put_number(b, s->peak_power);
		buf_add(b, ", \"focus_distance\": ");
		json_put_number(b, s->focus_distance);
		buf_addc(b, '}');
	}
	buf_add(b, gs->nstrays ? "\n  ],\n  \"return_power\": " : "],\n  \"return_power\": ");
	json_put_number(b, gs->return_power);
}

char *
report_json(const struct trace *t)
{
	struct buf b;
	char br[160];

	buf_init(&b);
	buf_add(&b, "{\n  \"bench\": ");
	json_put_string(&b, t->bench->name);
	buf_add(&b, ",\n  \"elements\": [");
	for (size_t i = 0; i < t->nrows; i++) {
		buf_add(&b, i ? ",\n" : "\n");
		row_json(&b, t, &t->rows[i]);
	}
	buf_add(&b, t->nrows ? "\n  ],\n  \"warnings\": [" : "],\n  \"warnings\": [");
	for (size_t i = 0; i < t->nwarn; i++) {
		const struct trace_warning *x = &t->warn[i];

		trace_branch_name(x->parent, x->port, br, sizeof br);
		buf_add(&b, i ? ",\n    {\"kind\": " : "\n    {\"kind\": ");
		json_put_string(&b, trace_warn_name(x->kind));
		buf_add(&b, ", \"branch\": ");
		json_put_string(&b, br);
		buf_add(&b, ", \"after\": ");
		if (x->after != NULL)
			json_put_string(&b, x->after->id);
		else
			buf_add(&b, "null");
		buf_printf(&b, ", \"%s\": ", x->kind == TW_UNTERMINATED || x->kind == TW_UNRATED_DUMP ||
		    x->kind == TW_UNRATED_ABSORBER || x->kind == TW_STRAY ||
		    x->kind == TW_RETURN_POWER ? "power" : x->kind == TW_GHOST_OVER ? "ratio" :
		    "value");
		json_put_number(&b, x->value);
		if (x->kind == TW_SELF_FOCUSING || x->ghost) {
			buf_add(&b, ", \"distance\": ");
			json_put_number(&b, x->distance);
		}
		if (x->ghost)
			buf_add(&b, ", \"ghost\": true");
		if (x->surface != NULL) {
			buf_add(&b, ", \"surface\": ");
			json_put_string(&b, x->surface);
		}
		buf_addc(&b, '}');
	}
	buf_add(&b, t->nwarn ? "\n  ],\n  \"worst\": " : "],\n  \"worst\": ");
	if (t->worst >= 0) {
		buf_add(&b, "{\"id\": ");
		json_put_string(&b, t->rows[t->worst].el->id);
		buf_add(&b, ", \"ratio\": ");
		json_put_number(&b, t->worst_ratio);
		buf_addc(&b, '}');
	} else {
		buf_add(&b, "null");
	}
	buf_add(&b, ",\n  \"safe_source_power\": ");
	json_put_number(&b, t->safe_source_power);
	if (t->ghosts != NULL)
		ghosts_json(&b, t);
	buf_add(&b, "\n}\n");
	return buf_take(&b);
}
