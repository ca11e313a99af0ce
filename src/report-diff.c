/* report-diff.c - the diff of two bench states as text (changes one per
 * line, then a table of what the results did) and as JSON.  Status is
 * always a word, as in the trace report, and the same word ("OVER"); JSON
 * keeps the lowercase names of bench-format.md. */
#include <config.h>

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <jansson.h>

#include "core-layout.h"
#include "report-diff.h"
#include "util-buf.h"
#include "util-err.h"

static const char *const kind_names[] = {
	[DIFF_ADDED] = "added", [DIFF_REMOVED] = "removed", [DIFF_MOVED] = "moved",
	[DIFF_CHANGED] = "changed", [DIFF_SETTINGS] = "settings",
};

void
report_diff_status(char *buf, size_t n, int present, double ratio, enum damage_status st)
{
	if (!present)
		snprintf(buf, n, "absent");
	else if (isnan(ratio))
		snprintf(buf, n, "%s", layout_status_word(st));
	else {
		/* the table's and the workbench's forms: "109 % OVER", "0.91 % ok" */
		char pct[32];

		layout_percent(pct, sizeof pct, ratio);
		snprintf(buf, n, "%s %s", pct, layout_status_word(st));
	}
}

static void
place_text(struct buf *b, const struct diff_place *p)
{
	if (p->after != NULL)
		buf_printf(b, "%s after %s", p->branch, p->after);
	else
		buf_printf(b, "%s, first", p->branch);
}

static void
values_text(struct buf *b, const struct diff_change *c, int one_side)
{
	for (size_t i = 0; i < c->nvals; i++) {
		const struct diff_value *v = &c->vals[i];

		buf_add(b, i > 0 ? "; " : ": ");
		if (one_side)
			buf_printf(b, "%s %s", v->key, v->new_text != NULL ? v->new_text : "-");
		else
			buf_printf(b, "%s %s → %s", v->key, v->old_text != NULL ? v->old_text : "-",
			    v->new_text != NULL ? v->new_text : "-");
	}
}

static void
change_line(struct buf *b, const struct diff_change *c)
{
	buf_printf(b, "  %-9s", kind_names[c->kind]);
	switch (c->kind) {
	case DIFF_SETTINGS:
		buf_add(b, "bench");
		values_text(b, c, 0);
		break;
	case DIFF_ADDED:
		buf_printf(b, "%s (%s) in ", c->id, model_type_name(c->type));
		place_text(b, &c->new_at);
		values_text(b, c, 1);
		break;
	case DIFF_REMOVED:
		buf_printf(b, "%s (%s) from ", c->id, model_type_name(c->type));
		place_text(b, &c->old_at);
		break;
	case DIFF_MOVED:
		buf_printf(b, "%s (%s) from ", c->id, model_type_name(c->type));
		place_text(b, &c->old_at);
		buf_add(b, " to ");
		place_text(b, &c->new_at);
		values_text(b, c, 0);
		break;
	case DIFF_CHANGED:
		buf_printf(b, "%s (%s)", c->id, model_type_name(c->type));
		values_text(b, c, 0);
		break;
	}
	buf_addc(b, '\n');
}

/* "a → b", or just "a" when both read the same. */
static char *
pair_text(double a, double b, int pa, int pb, enum unit_dim dim)
{
	char ta[48], tb[48];

	units_format(ta, sizeof ta, a, dim, 3, 0);
	units_format(tb, sizeof tb, b, dim, 3, 0);
	if (!pa)
		snprintf(ta, sizeof ta, "absent");
	if (!pb)
		snprintf(tb, sizeof tb, "absent");
	if (strcmp(ta, tb) == 0)
		return xstrdup(ta);
	return xasprintf("%s → %s", ta, tb);
}

enum { C_ID, C_TYPE, C_POWER, C_PEAK, C_STATUS, C_N };

static void
effects_table(struct buf *b, const struct diff *d)
{
	int pulsed = d->pulsed[1] || d->pulsed[0];
	char ***cell = xcalloc(d->nfx + 1, sizeof *cell);
	size_t w[C_N] = { 0 };
	static const char *const head[C_N] = { "element", "type", "power", NULL, "ratio and status" };

	for (size_t i = 0; i <= d->nfx; i++) {
		cell[i] = xcalloc(C_N, sizeof **cell);
		if (i == 0) {
			for (int c = 0; c < C_N; c++)
				cell[0][c] = xstrdup(head[c] != NULL ? head[c] :
				    pulsed ? "fluence" : "peak irradiance");
		} else {
			const struct diff_effect *fx = &d->fx[i - 1];
			char sa[48], sb[48];

			cell[i][C_ID] = xstrdup(fx->id);
			cell[i][C_TYPE] = xstrdup(model_type_name(fx->type));
			cell[i][C_POWER] = pair_text(fx->power[0], fx->power[1], fx->present[0],
			    fx->present[1], DIM_POWER);
			cell[i][C_PEAK] = pulsed ?
			    pair_text(fx->fluence[0], fx->fluence[1], fx->present[0],
			    fx->present[1], DIM_FLUENCE) :
			    pair_text(fx->peak[0], fx->peak[1], fx->present[0], fx->present[1],
			    DIM_IRRADIANCE);
			report_diff_status(sa, sizeof sa, fx->present[0], fx->ratio[0], fx->status[0]);
			report_diff_status(sb, sizeof sb, fx->present[1], fx->ratio[1], fx->status[1]);
			cell[i][C_STATUS] = strcmp(sa, sb) == 0 ? xstrdup(sa) :
			    xasprintf("%s → %s", sa, sb);
		}
		for (int c = 0; c < C_N; c++)
			if (utf8_cols(cell[i][c]) > w[c])
				w[c] = utf8_cols(cell[i][c]);
	}
	for (size_t i = 0; i <= d->nfx; i++) {
		size_t start;

		buf_add(b, "  ");
		start = b->len;
		for (int c = 0, x = 0; c < C_N; c++) {
			buf_add(b, cell[i][c]);
			x += (int)w[c] + 2;
			if (c + 1 < C_N)
				buf_pad(b, (size_t)x, start);
			free(cell[i][c]);
		}
		buf_addc(b, '\n');
		free(cell[i]);
	}
	free(cell);
}

char *
report_diff_text(const struct diff *d, const char *bench, const char *from,
    const char *to)
{
	struct buf b;

	buf_init(&b);
	buf_printf(&b, "Bench %s: %s → %s\n\n", bench, from, to);
	if (d->nch == 0) {
		buf_add(&b, "No change in the chain or the settings.\n");
	} else {
		buf_add(&b, "Changes:\n");
		for (size_t i = 0; i < d->nch; i++)
			change_line(&b, &d->ch[i]);
	}
	if (!d->traced)
		return buf_take(&b);
	buf_addc(&b, '\n');
	if (d->nfx == 0) {
		buf_add(&b, "Effect on the results: none (every element sees what it saw).\n");
	} else {
		buf_printf(&b, "Effect on the results (%s; ratio of the scaled damage "
		    "threshold):\n", d->pulsed[1] || d->pulsed[0] ? "pulsed: peak fluence" :
		    "CW: peak irradiance");
		effects_table(&b, d);
	}
	{
		char sa[48], sb[48], pa[48], pb[48];

		report_diff_status(sa, sizeof sa, d->worst_id[0] != NULL, d->worst_ratio[0],
		    d->worst_status[0]);
		report_diff_status(sb, sizeof sb, d->worst_id[1] != NULL, d->worst_ratio[1],
		    d->worst_status[1]);
		buf_printf(&b, "\nWorst: %s %s → %s %s\n",
		    d->worst_id[0] != NULL ? d->worst_id[0] : "nothing rated",
		    d->worst_id[0] != NULL ? sa : "",
		    d->worst_id[1] != NULL ? d->worst_id[1] : "nothing rated",
		    d->worst_id[1] != NULL ? sb : "");
		units_format(pa, sizeof pa, d->safe_power[0], DIM_POWER, 3, 0);
		units_format(pb, sizeof pb, d->safe_power[1], DIM_POWER, 3, 0);
		buf_printf(&b, "Safe source power: %s → %s\n", pa, pb);
	}
	return buf_take(&b);
}

/* ---- JSON ---- */

static json_t *
num(double v)
{
	return isfinite(v) ? json_real(v) : json_null();
}

static json_t *
str_or_null(const char *s)
{
	return s != NULL ? json_string(s) : json_null();
}

static json_t *
place_json(const struct diff_place *p)
{
	if (p->branch == NULL)
		return json_null();
	return json_pack("{s:s,s:o}", "branch", p->branch, "after", str_or_null(p->after));
}

static json_t *
change_json(const struct diff_change *c)
{
	json_t *o = json_object(), *vals = json_array();

	json_object_set_new(o, "kind", json_string(kind_names[c->kind]));
	json_object_set_new(o, "id", str_or_null(c->id));
	if (c->kind != DIFF_SETTINGS) {
		json_object_set_new(o, "type", json_string(model_type_name(c->type)));
		json_object_set_new(o, "old", place_json(&c->old_at));
		json_object_set_new(o, "new", place_json(&c->new_at));
	}
	for (size_t i = 0; i < c->nvals; i++) {
		const struct diff_value *v = &c->vals[i];

		json_array_append_new(vals, json_pack("{s:s,s:o,s:o,s:o,s:o}", "key", v->key,
		    "old", str_or_null(v->old_exact), "new", str_or_null(v->new_exact),
		    "old_text", str_or_null(v->old_text), "new_text", str_or_null(v->new_text)));
	}
	json_object_set_new(o, "values", vals);
	return o;
}

static json_t *
side_json(const struct diff_effect *fx, int i)
{
	if (!fx->present[i])
		return json_null();
	return json_pack("{s:o,s:o,s:o,s:o,s:s}", "power_in", num(fx->power[i]),
	    "peak_irradiance", num(fx->peak[i]), "fluence", num(fx->fluence[i]),
	    "ratio", num(fx->ratio[i]), "status", damage_status_name(fx->status[i]));
}

static json_t *
worst_json(const struct diff *d, int i)
{
	if (d->worst_id[i] == NULL)
		return json_null();
	return json_pack("{s:s,s:o,s:s}", "id", d->worst_id[i], "ratio",
	    num(d->worst_ratio[i]), "status", damage_status_name(d->worst_status[i]));
}

char *
report_diff_json(const struct diff *d, const char *bench, const char *from, const char *to)
{
	json_t *o = json_object(), *ch = json_array(), *fx = json_array();
	char *text, *out;

	json_object_set_new(o, "bench", json_string(bench));
	json_object_set_new(o, "from", json_string(from));
	json_object_set_new(o, "to", json_string(to));
	for (size_t i = 0; i < d->nch; i++)
		json_array_append_new(ch, change_json(&d->ch[i]));
	json_object_set_new(o, "changes", ch);
	if (d->traced) {
		for (size_t i = 0; i < d->nfx; i++)
			json_array_append_new(fx, json_pack("{s:s,s:s,s:o,s:o}", "id", d->fx[i].id,
			    "type", model_type_name(d->fx[i].type), "old", side_json(&d->fx[i], 0),
			    "new", side_json(&d->fx[i], 1)));
		json_object_set_new(o, "effects", fx);
		json_object_set_new(o, "worst", json_pack("{s:o,s:o}", "old", worst_json(d, 0),
		    "new", worst_json(d, 1)));
		json_object_set_new(o, "safe_source_power", json_pack("{s:o,s:o}", "old",
		    num(d->safe_power[0]), "new", num(d->safe_power[1])));
	} else {
		json_decref(fx);
	}
	text = json_dumps(o, JSON_INDENT(2) | JSON_PRESERVE_ORDER | JSON_REAL_PRECISION(17));
	json_decref(o);
	out = xasprintf("%s\n", text);
	free(text);
	return out;
}
