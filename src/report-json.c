/* report-json.c - the trace as one JSON object with the fields named in
 * bench-format.md ("Trace output"): SI numbers (10 significant digits),
 * null where a value does not apply.  Written straight into a buffer, and
 * by report_json_write to a stream as it goes: a 10^5-element trace (76 MB
 * of text) must come out in a fraction of a second and without holding
 * the whole text. */
#include <config.h>

#include <math.h>
#include <stdio.h>
#include <stdlib.h>

#include "core-ghost.h"
#include "core-layout.h"
#include "report.h"
#include "util-buf.h"
#include "util-err.h"
#include "util-json.h"

/* Appends a string literal without measuring it. */
#define ADD(b, lit)     buf_addn((b), "" lit, sizeof(lit) - 1)
/* ",\n      \"k\": " for a literal key: a row has thirty of them */
#define KEY(b, k)       ADD(b, ",\n      \"" k "\": ")
#define KNUM(b, k, v)   (KEY(b, k), json_put_number((b), (v)))
#define KSTR(b, k, v)   (KEY(b, k), json_put_string((b), (v)))

/* Where the text goes while it is written: with f set, the buffer is
 * emptied into f whenever it holds SPILL bytes, so a 10^5-element report
 * (76 MB) never sits in memory whole. */
struct jout {
	struct buf  b;
	FILE       *f;          /* borrowed; NULL: keep everything in b */
	int         err;        /* a write to f failed (errno says why) */
};
#define SPILL (1 << 16)

static void
spill(struct jout *o, size_t at_least)
{
	if (o->f == NULL || o->b.len < at_least)
		return;
	if (!o->err && fwrite(o->b.s, 1, o->b.len, o->f) != o->b.len)
		o->err = 1;
	buf_reset(&o->b);
}

static void
put_uint(struct buf *b, unsigned v)
{
	char d[12];
	int n = sizeof d;

	do {
		d[--n] = (char)('0' + v % 10);
		v /= 10;
	} while (v != 0);
	buf_addn(b, d + n, sizeof d - (size_t)n);
}

/* The branch name of consecutive rows on one branch, made once. */
struct branch_cache {
	const struct element *parent;
	enum port             port;
	int                   valid;
	char                  name[160];
};

static const char *
branch_of(struct branch_cache *c, const struct element *parent, enum port port)
{
	if (!c->valid || c->parent != parent || c->port != port) {
		trace_branch_name(parent, port, c->name, sizeof c->name);
		c->parent = parent;
		c->port = port;
		c->valid = 1;
	}
	return c->name;
}

static void waist_json(struct buf *, const struct trace_row *, int present);

static void
row_json(struct buf *b, const struct trace *t, const struct trace_row *r,
    struct branch_cache *bc)
{
	const struct damage_limits *l = &r->limits;
	const char *br = branch_of(bc, r->parent, r->port);
	int first = 1;

	ADD(b, "    {\n      \"id\": ");
	json_put_string(b, r->el->id);
	KSTR(b, "type", model_type_name(r->el->type));
	if (r->el->label != NULL)
		KSTR(b, "label", r->el->label);
	KSTR(b, "branch", br);
	KEY(b, "depth");
	put_uint(b, r->depth);
	KNUM(b, "z", r->z);
	KNUM(b, "power_in", r->power_in);
	KNUM(b, "power_out", r->power_out);
	KNUM(b, "power_lost", r->power_lost);
	KNUM(b, "radius_x", r->wx);
	KNUM(b, "radius_y", r->wy);
	KNUM(b, "irradiance", r->irradiance);
	KNUM(b, "linear_density", r->linear_density);
	KNUM(b, "peak_irradiance", r->peak_irradiance);
	KNUM(b, "field", r->field);
	KNUM(b, "clip_loss", r->clip_loss);
	if (t->bench->src.pulsed) {
		KNUM(b, "fluence", r->fluence);
		KNUM(b, "peak_power", r->peak_power);
	}
	if (!isnan(r->critical_power)) {
		KNUM(b, "critical_power", r->critical_power);
		KNUM(b, "critical_ratio", r->critical_ratio);
		KNUM(b, "collapse_distance", r->collapse_distance);
		KNUM(b, "b_integral", r->b_integral);
	}
	KNUM(b, "b_total", r->b_total);
	KEY(b, "stokes");
	for (int i = 0; i < 4; i++) {
		if (i)
			ADD(b, ", ");
		else
			buf_addc(b, '[');
		json_put_number(b, r->stokes[i]);
	}
	buf_addc(b, ']');
	KNUM(b, "ratio", r->ratio);
	KSTR(b, "status", damage_status_name(r->status));
	KEY(b, "flags");
	buf_addc(b, '[');
	for (int i = 0; i < TF_COUNT; i++)
		if (r->flags & (1u << i)) {
			if (!first)
				ADD(b, ", ");
			first = 0;
			json_put_string(b, trace_flag_name(1u << i));
		}
	buf_addc(b, ']');
	KEY(b, "scaled_limits");
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
			if (!first)
				ADD(b, ", ");
			buf_addc(b, '"');
			buf_add(b, lims[i].name);
			ADD(b, "\": ");
			json_put_number(b, lims[i].v);
			first = 0;
		}
	}
	buf_addc(b, '}');
	{
		/* how the governing limit came from its rating (layout_derive) */
		struct layout_derivation d;

		KEY(b, "limit_derivation");
		if (layout_derive(r, t->bench, &d) != 0) {
			ADD(b, "null");
		} else {
			ADD(b, "{\"rating_key\": ");
			json_put_string(b, model_key_path((enum model_key)d.key));
			ADD(b, ", \"rating\": ");
			json_put_number(b, d.rating);
			ADD(b, ", \"wavelength_factor\": ");
			json_put_number(b, d.lambda_factor);
			ADD(b, ", \"pulse_factor\": ");
			json_put_number(b, d.tau_factor);
			ADD(b, ", \"limit\": ");
			json_put_number(b, d.limit);
			ADD(b, ", \"safety_factor\": ");
			json_put_number(b, d.safety_factor);
			ADD(b, ", \"caution_level\": ");
			json_put_number(b, d.caution_level);
			buf_addc(b, '}');
		}
	}
	if (r->el->type == EL_SPACE) {
		/* "waist": every waist in the gap; "focus": the same when it
		 * concentrates the beam at least TRACE_FOCUS_CONCENTRATION times */
		KEY(b, "waist");
		waist_json(b, r, r->has_waist);
		KEY(b, "focus");
		waist_json(b, r, r->has_focus);
	}
	ADD(b, "\n    }");
}

static void
waist_json(struct buf *b, const struct trace_row *r, int present)
{
	{
		if (!present) {
			ADD(b, "null");
		} else {
			ADD(b, "{\"z\": ");
			json_put_number(b, r->focus.z);
			ADD(b, ", \"radius_x\": ");
			json_put_number(b, r->focus.wx);
			ADD(b, ", \"radius_y\": ");
			json_put_number(b, r->focus.wy);
			ADD(b, ", \"irradiance\": ");
			json_put_number(b, r->focus.irradiance);
			ADD(b, ", \"peak_irradiance\": ");
			json_put_number(b, r->focus.peak_irradiance);
			ADD(b, ", \"concentration\": ");
			json_put_number(b, r->focus.concentration);
			ADD(b, ", \"on\": ");
			if (r->focus.on != NULL)
				json_put_string(b, r->focus.on->id);
			else
				ADD(b, "null");
			if (r->focus.air_breakdown)
				ADD(b, ", \"air_breakdown\": true}");
			else
				ADD(b, ", \"air_breakdown\": false}");
		}
	}
}

/* ghost-conventions.md, Output: ghosts, strays, return_power. */
static void
ghosts_json(struct jout *o, const struct trace *t)
{
	struct buf *b = &o->b;
	const struct ghost_set *gs = t->ghosts;
	char name[160];

	ADD(b, ",\n  \"ghosts\": [");
	for (size_t i = 0; i < gs->n; i++) {
		const struct ghost *g = &gs->g[i];
		int first = 1;

		buf_printf(b, "%s\n    {\"order\": %d, \"surfaces\": [", i ? "," : "", g->order);
		for (int k = 0; k < g->order; k++) {
			ghost_surface_name(g, k, name, sizeof name);
			if (k)
				ADD(b, ", ");
			json_put_string(b, name);
		}
		ADD(b, "], \"power_start\": ");
		json_put_number(b, g->power_start);
		/* rows only where the trace kept them (TRACE_GHOST_ROWS) */
		if (gs->rows_kept)
			ADD(b, ",\n      \"rows\": [");
		for (size_t k = 0; gs->rows_kept && k < g->nrows; k++) {
			const struct ghost_row *r = &gs->rows[g->row0 + k];

			buf_add(b, k ? ",\n        {\"id\": " : "\n        {\"id\": ");
			json_put_string(b, r->el->id);
			ADD(b, ", \"power_in\": ");
			json_put_number(b, r->power_in);
			ADD(b, ", \"radius_x\": ");
			json_put_number(b, r->wx);
			ADD(b, ", \"radius_y\": ");
			json_put_number(b, r->wy);
			ADD(b, ", \"irradiance\": ");
			json_put_number(b, r->irradiance);
			ADD(b, ", \"fluence\": ");
			json_put_number(b, r->fluence);
			ADD(b, ", \"peak_irradiance\": ");
			json_put_number(b, r->peak_irradiance);
			ADD(b, ", \"ratio\": ");
			json_put_number(b, r->ratio);
			ADD(b, ", \"status\": ");
			json_put_string(b, damage_status_name(r->status));
			buf_addc(b, '}');
			spill(o, SPILL);
		}
		buf_add(b, gs->rows_kept ? "],\n      \"foci\": [" : ",\n      \"foci\": [");
		for (size_t k = 0; k < g->nfoci; k++) {
			const struct ghost_focus *f = &gs->foci[g->focus0 + k];

			buf_add(b, k ? ", {\"z\": " : "{\"z\": ");
			json_put_number(b, f->z);
			ADD(b, ", \"gap\": ");
			json_put_string(b, f->gap->id);
			ADD(b, ", \"distance\": ");
			json_put_number(b, f->distance);
			ADD(b, ", \"radius_x\": ");
			json_put_number(b, f->wx);
			ADD(b, ", \"radius_y\": ");
			json_put_number(b, f->wy);
			ADD(b, ", \"peak_irradiance\": ");
			json_put_number(b, f->peak_irradiance);
			buf_printf(b, ", \"air_breakdown\": %s}", f->air_breakdown ? "true" : "false");
		}
		ADD(b, "],\n      \"worst\": ");
		if (g->worst_row >= 0) {
			ADD(b, "{\"id\": ");
			json_put_string(b, t->rows[g->worst_row].el->id);
			ADD(b, ", \"ratio\": ");
			json_put_number(b, g->worst_ratio);
			buf_addc(b, '}');
		} else {
			ADD(b, "null");
		}
		ADD(b, ", \"flags\": [");
		for (int k = 0; k < GF_COUNT; k++)
			if (g->flags & (1u << k)) {
				if (!first)
					ADD(b, ", ");
				first = 0;
				json_put_string(b, ghost_flag_name(1u << k));
			}
		ADD(b, "]}");
	}
	buf_add(b, gs->n ? "\n  ],\n  \"strays\": [" : "],\n  \"strays\": [");
	for (size_t i = 0; i < gs->nstrays; i++) {
		const struct ghost_stray *s = &gs->strays[i];

		snprintf(name, sizeof name, "%s.%s", s->from->id, s->what);
		buf_add(b, i ? ",\n    {\"from\": " : "\n    {\"from\": ");
		json_put_string(b, name);
		ADD(b, ", \"power\": ");
		json_put_number(b, s->power);
		ADD(b, ", \"peak_power\": ");
		json_put_number(b, s->peak_power);
		ADD(b, ", \"focus_distance\": ");
		json_put_number(b, s->focus_distance);
		buf_addc(b, '}');
	}
	buf_add(b, gs->nstrays ? "\n  ],\n  \"return_power\": " : "],\n  \"return_power\": ");
	json_put_number(b, gs->return_power);
	if (gs->rows_omitted)
		buf_printf(b, ",\n  \"ghost_rows_omitted\": \"more than %.0f ghost rows: "
		    "each ghost gives its worst, not a row per element\"", GHOST_ROWS_LIMIT);
}

static void
json_head(struct jout *o, const struct bench *bench)
{
	ADD(&o->b, "{\n  \"bench\": ");
	json_put_string(&o->b, bench->name);
	ADD(&o->b, ",\n  \"elements\": [");
}

/* Row number i (from 0) of the elements. */
static void
json_row(struct jout *o, const struct trace *t, const struct trace_row *r, size_t i,
    struct branch_cache *bc)
{
	if (i)
		ADD(&o->b, ",\n");
	else
		buf_addc(&o->b, '\n');
	row_json(&o->b, t, r, bc);
	spill(o, SPILL);
}

/* What follows the nrows rows. */
static void
json_tail(struct jout *o, const struct trace *t, size_t nrows)
{
	struct buf *b = &o->b;
	char br[160];

	buf_add(b, nrows ? "\n  ],\n  \"warnings\": [" : "],\n  \"warnings\": [");
	for (size_t i = 0; i < t->nwarn; i++) {
		const struct trace_warning *x = &t->warn[i];

		trace_branch_name(x->parent, x->port, br, sizeof br);
		buf_add(b, i ? ",\n    {\"kind\": " : "\n    {\"kind\": ");
		json_put_string(b, trace_warn_name(x->kind));
		ADD(b, ", \"branch\": ");
		json_put_string(b, br);
		ADD(b, ", \"after\": ");
		if (x->after != NULL)
			json_put_string(b, x->after->id);
		else
			ADD(b, "null");
		buf_printf(b, ", \"%s\": ", x->kind == TW_UNTERMINATED || x->kind == TW_UNRATED_DUMP ||
		    x->kind == TW_UNRATED_ABSORBER || x->kind == TW_STRAY ||
		    x->kind == TW_RETURN_POWER ? "power" : x->kind == TW_GHOST_OVER ? "ratio" :
		    "value");
		json_put_number(b, x->value);
		if (x->kind == TW_SELF_FOCUSING || x->ghost) {
			ADD(b, ", \"distance\": ");
			json_put_number(b, x->distance);
		}
		if (x->ghost)
			ADD(b, ", \"ghost\": true");
		if (x->surface != NULL) {
			ADD(b, ", \"surface\": ");
			json_put_string(b, x->surface);
		}
		buf_addc(b, '}');
		spill(o, SPILL);
	}
	buf_add(b, t->nwarn ? "\n  ],\n  \"worst\": " : "],\n  \"worst\": ");
	if (t->worst >= 0) {
		ADD(b, "{\"id\": ");
		json_put_string(b, t->worst_el->id);
		ADD(b, ", \"ratio\": ");
		json_put_number(b, t->worst_ratio);
		buf_addc(b, '}');
	} else {
		ADD(b, "null");
	}
	ADD(b, ",\n  \"safe_source_power\": ");
	json_put_number(b, t->safe_source_power);
	if (t->ghosts != NULL)
		ghosts_json(o, t);
	ADD(b, "\n}\n");
}

static void
json_out(struct jout *o, const struct trace *t)
{
	struct branch_cache bc = { NULL, PORT_NONE, 0, "" };

	json_head(o, t->bench);
	for (size_t i = 0; i < t->nrows; i++)
		json_row(o, t, &t->rows[i], i, &bc);
	json_tail(o, t, t->nrows);
}

struct report_json_stream {
	struct jout         o;
	struct branch_cache bc;
	size_t              n;      /* rows written */
};

struct report_json_stream *
report_json_stream_begin(const struct bench *bench, FILE *f)
{
	struct report_json_stream *s = xcalloc(1, sizeof *s);

	s->o.f = f;
	buf_init(&s->o.b);
	s->bc.port = PORT_NONE;
	json_head(&s->o, bench);
	return s;
}

void
report_json_stream_row(void *arg, const struct trace *t, const struct trace_row *r)
{
	struct report_json_stream *s = arg;

	json_row(&s->o, t, r, s->n++, &s->bc);
}

int
report_json_stream_end(struct report_json_stream *s, const struct trace *t)
{
	int err;

	json_tail(&s->o, t, s->n);
	spill(&s->o, 0);
	buf_release(&s->o.b);
	err = s->o.err;
	free(s);
	return err ? -1 : 0;
}

char *
report_json(const struct trace *t)
{
	struct jout o = { .f = NULL };

	buf_init(&o.b);
	json_out(&o, t);
	return buf_take(&o.b);
}

int
report_json_write(const struct trace *t, FILE *f)
{
	struct jout o = { .f = f };

	buf_init(&o.b);
	json_out(&o, t);
	spill(&o, 0);
	buf_release(&o.b);
	return o.err ? -1 : 0;
}
