/* report-json.c - the trace as one JSON object with the fields named in
 * bench-format.md ("Trace output"), SI numbers, null where a value does not
 * apply. */
#include <config.h>

#include <math.h>
#include <stdlib.h>

#include <jansson.h>

#include "report.h"
#include "util-err.h"

static json_t *
num(double v)
{
	return isfinite(v) ? json_real(v) : json_null();
}

static json_t *
flags_json(unsigned flags)
{
	json_t *a = json_array();

	for (int i = 0; i < TF_COUNT; i++)
		if (flags & (1u << i))
			json_array_append_new(a, json_string(trace_flag_name(1u << i)));
	return a;
}

static json_t *
row_json(const struct trace *t, const struct trace_row *r)
{
	json_t *o = json_object(), *lim;
	char br[160];

	trace_branch_name(r->parent, r->port, br, sizeof br);
	json_object_set_new(o, "id", json_string(r->el->id));
	json_object_set_new(o, "type", json_string(model_type_name(r->el->type)));
	if (r->el->label != NULL)
		json_object_set_new(o, "label", json_string(r->el->label));
	json_object_set_new(o, "branch", json_string(br));
	json_object_set_new(o, "depth", json_integer(r->depth));
	json_object_set_new(o, "z", num(r->z));
	json_object_set_new(o, "power_in", num(r->power_in));
	json_object_set_new(o, "power_out", num(r->power_out));
	json_object_set_new(o, "power_lost", num(r->power_lost));
	json_object_set_new(o, "radius_x", num(r->wx));
	json_object_set_new(o, "radius_y", num(r->wy));
	json_object_set_new(o, "irradiance", num(r->irradiance));
	json_object_set_new(o, "linear_density", num(r->linear_density));
	json_object_set_new(o, "peak_irradiance", num(r->peak_irradiance));
	json_object_set_new(o, "field", num(r->field));
	json_object_set_new(o, "clip_loss", num(r->clip_loss));
	if (t->bench->src.pulsed) {
		json_object_set_new(o, "fluence", num(r->fluence));
		json_object_set_new(o, "peak_power", num(r->peak_power));
	}
	if (!isnan(r->critical_power)) {
		json_object_set_new(o, "critical_power", num(r->critical_power));
		json_object_set_new(o, "b_integral", num(r->b_integral));
	}
	json_object_set_new(o, "b_total", num(r->b_total));
	json_object_set_new(o, "stokes", json_pack("[ffff]", r->stokes[0], r->stokes[1],
	    r->stokes[2], r->stokes[3]));
	json_object_set_new(o, "ratio", num(r->ratio));
	json_object_set_new(o, "status", json_string(damage_status_name(r->status)));
	json_object_set_new(o, "flags", flags_json(r->flags));
	lim = json_object();
	if (!isnan(r->limits.cw_linear))
		json_object_set_new(lim, "cw_linear", num(r->limits.cw_linear));
	if (!isnan(r->limits.cw_irradiance))
		json_object_set_new(lim, "cw_irradiance", num(r->limits.cw_irradiance));
	if (!isnan(r->limits.fluence))
		json_object_set_new(lim, "fluence", num(r->limits.fluence));
	if (!isnan(r->limits.max_power))
		json_object_set_new(lim, "max_power", num(r->limits.max_power));
	if (!isnan(r->limits.max_absorbed))
		json_object_set_new(lim, "max_absorbed", num(r->limits.max_absorbed));
	json_object_set_new(o, "scaled_limits", lim);
	if (r->el->type == EL_SPACE) {
		if (r->has_focus)
			json_object_set_new(o, "focus", json_pack("{s:o,s:o,s:o,s:o,s:o,s:b}",
			    "z", num(r->focus.z), "radius_x", num(r->focus.wx),
			    "radius_y", num(r->focus.wy), "irradiance", num(r->focus.irradiance),
			    "peak_irradiance", num(r->focus.peak_irradiance),
			    "air_breakdown", r->focus.air_breakdown));
		else
			json_object_set_new(o, "focus", json_null());
	}
	return o;
}

char *
report_json(const struct trace *t)
{
	json_t *o = json_object(), *rows = json_array(), *w = json_array();
	char br[160], *text, *out;

	json_object_set_new(o, "bench", json_string(t->bench->name));
	for (size_t i = 0; i < t->nrows; i++)
		json_array_append_new(rows, row_json(t, &t->rows[i]));
	json_object_set_new(o, "elements", rows);
	for (size_t i = 0; i < t->nwarn; i++) {
		const struct trace_warning *x = &t->warn[i];
		json_t *e = json_object();

		trace_branch_name(x->parent, x->port, br, sizeof br);
		json_object_set_new(e, "kind", json_string(trace_warn_name(x->kind)));
		json_object_set_new(e, "branch", json_string(br));
		json_object_set_new(e, "after", x->after != NULL ?
		    json_string(x->after->id) : json_null());
		json_object_set_new(e, x->kind == TW_UNTERMINATED ? "power" : "value",
		    num(x->value));
		json_array_append_new(w, e);
	}
	json_object_set_new(o, "warnings", w);
	if (t->worst >= 0)
		json_object_set_new(o, "worst", json_pack("{s:s,s:o}", "id",
		    t->rows[t->worst].el->id, "ratio", num(t->worst_ratio)));
	else
		json_object_set_new(o, "worst", json_null());
	json_object_set_new(o, "safe_source_power", num(t->safe_source_power));
	text = json_dumps(o, JSON_INDENT(2) | JSON_PRESERVE_ORDER | JSON_REAL_PRECISION(10));
	json_decref(o);
	out = xasprintf("%s\n", text);
	free(text);
	return out;
}
