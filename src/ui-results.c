/* ui-results.c - what the selected element sees, beside its values in the
 * workbench's lower half: power, radii, irradiance, fluence, the ratio to
 * its threshold and how it was derived, limits, flags, the focus in a gap
 * and the reflections that meet it.  Draws only.  Owned by the workbench. */
#include <config.h>

#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "report.h"
#include "ui-bench.h"
#include "util-err.h"

static void
qty(struct app *a, double v, enum unit_dim dim, char *buf, size_t n)
{
	units_format(buf, n, v, dim, 3, a->ascii);
}

static int
result_line(struct app *a, int y, int x, int w, const char *label, const char *text,
    attr_t at)
{
	ui_put(a, y, x, 11, label, UC_DIM);
	ui_put_attr(a, y, x + 11, w - 11, text, at);
	return 1;
}

/* A result that may need more than one line: wrapped under its label,
 * at most `max` lines and never past the pane (h - n left). */
static int
result_wrapped(struct app *a, int y, int x, int w, int left, int max, const char *label,
    const char *text, attr_t at)
{
	size_t st[4], ln[4], nl = layout_wrap(text, w - 11, st, ln, 4);
	int used = 0;

	for (size_t i = 0; i < nl && i < 4 && used < max && used < left; i++) {
		char *part = xasprintf("%.*s", (int)ln[i], text + st[i]);

		used += result_line(a, y + used, x, w, i == 0 ? label : "", part, at);
		free(part);
	}
	return used;
}

/* The ghost lines of trace row `tr`, as the layout words them: 0 the ghosts
 * that meet it, 1 the ones its surfaces make, 2 its strays. */
static int
ghost_lines(struct app *a, int y, int x, int w, int left, int made, size_t tr)
{
	struct layout_line l[12];
	int blocks;
	size_t nl = made == 1 ? layout_ghost_made(a->trace, tr, a->ascii, 4, l, 12) :
	    made == 2 ? layout_ghost_strays(a->trace, tr, a->ascii, &blocks, l, 12) :
	    layout_ghost_meet(a->trace, tr, a->ascii, l, 12);
	int used = 0;

	if (nl > 12)
		nl = 12;
	for (size_t i = 0; i < nl; i++) {
		attr_t at = l[i].level >= STATUS_CAUTION ? ui_status_attr(a, l[i].level) : A_NORMAL;

		if (used < left)
			used += result_wrapped(a, y + used, x, w, left - used, 2, l[i].label,
			    l[i].text, at);
	}
	layout_lines_free(l, nl);
	return used;
}

void
wb_draw_results(struct app *a, int y, int x, int h, int w)
{
	const struct layout_row *row = app_sel_row(a);
	const struct trace_row *r = app_sel_trace(a);
	char t1[64], t2[64], t3[64], line[320];
	int n = 0, strays_first = 0;

	if (row == NULL)
		return;
	if (row->kind == LROW_PORT) {
		snprintf(line, sizeof line, "side branch %s.%s: %zu element%s", row->el->id,
		    model_port_name(row->port), row->el->side.n, row->el->side.n == 1 ? "" : "s");
		ui_put(a, y, x, w, line, UC_NORMAL);
		ui_put(a, y + 1, x, w, "p places a new element at its start; s then Enter here "
		    "shifts one into it", UC_DIM);
		return;
	}
	if (r == NULL)
		return;
	qty(a, r->power_in, DIM_POWER, t1, sizeof t1);
	qty(a, r->power_out, DIM_POWER, t2, sizeof t2);
	qty(a, r->power_lost, DIM_POWER, t3, sizeof t3);
	snprintf(line, sizeof line, "%s in, %s out, %s lost", t1, t2, t3);
	n += result_line(a, y + n, x, w, "power", line, A_NORMAL);
	layout_radius_text(t1, sizeof t1, r->wx, r->wy, a->ascii);
	qty(a, r->z, DIM_LENGTH, t2, sizeof t2);
	snprintf(line, sizeof line, "%s (1/e%s) at z = %s", t1, a->ascii ? "^2" : "\u00b2", t2);
	n += result_line(a, y + n, x, w, "radius", line, A_NORMAL);
	qty(a, r->peak_irradiance, DIM_IRRADIANCE, t1, sizeof t1);
	qty(a, r->linear_density, DIM_LINEAR, t2, sizeof t2);
	if (!isnan(r->fluence)) {
		qty(a, r->fluence, DIM_FLUENCE, t3, sizeof t3);
		snprintf(line, sizeof line, "peak %s, fluence %s", t1, t3);
	} else {
		snprintf(line, sizeof line, "peak %s, linear %s", t1, t2);
	}
	n += result_line(a, y + n, x, w, "irradiance", line, A_NORMAL);
	if (n < h && r->has_focus && r->focus.air_breakdown) {
		/* the worst a gap can do comes before the details */
		qty(a, r->focus.peak_irradiance, DIM_IRRADIANCE, t1, sizeof t1);
		snprintf(line, sizeof line, "AIR BREAKDOWN: the focus here reaches %s, a spark", t1);
		n += result_wrapped(a, y + n, x, w, h - n, 2, "hazard", line, ui_attr(a, UC_OVER));
	}
	if (n < h) {
		char bar[128], pct[32];

		layout_bar(bar, sizeof bar, r->ratio, 1 / a->shown->safety_factor, 12, a->ascii);
		layout_percent(pct, sizeof pct, r->ratio);
		if (isnan(r->ratio)) {
			char *hint = layout_rating_hint(r->el->type, a->shown->src.pulsed);

			snprintf(line, sizeof line, "%s", hint);
			free(hint);
		} else {
			snprintf(line, sizeof line, "%s %s: %s", bar, pct,
			    layout_status_word(r->status));
		}
		n += result_wrapped(a, y + n, x, w, h - n, 2, "damage", line,
		    isnan(r->ratio) && layout_row_hazard(a->trace, (size_t)row->trace_row) ?
		    ui_attr(a, UC_HAZARD) : ui_status_attr(a, r->status));
	}
	/* the ghosts that meet it: next to the ratio when they change it; the
	 * strays it throws there too when one must be blocked */
	if (layout_ghost_matters(a->trace, (size_t)row->trace_row))
		n += ghost_lines(a, y + n, x, w, h - n, 0, (size_t)row->trace_row);
	{
		struct layout_line sl[12];
		size_t ns = layout_ghost_strays(a->trace, (size_t)row->trace_row, a->ascii,
		    &strays_first, sl, 12);

		layout_lines_free(sl, ns < 12 ? ns : 12);
	}
	if (strays_first)
		n += ghost_lines(a, y + n, x, w, h - n, 2, (size_t)row->trace_row);
	if (n < h) {
		/* why the limit is what it is, wrapped over as many lines as it needs */
		char *why = layout_derivation_text(r, a->shown, a->ascii);

		if (why != NULL) {
			n += result_wrapped(a, y + n, x, w, h - n, 4, "why", why, A_NORMAL);
			free(why);
		}
	}
	if (n < h && damage_rated(&r->limits)) {
		struct buf b;

		buf_init(&b);
		if (!isnan(r->limits.fluence)) {
			qty(a, r->limits.fluence, DIM_FLUENCE, t1, sizeof t1);
			buf_printf(&b, "fluence %s ", t1);
		}
		if (!isnan(r->limits.cw_irradiance)) {
			qty(a, r->limits.cw_irradiance, DIM_IRRADIANCE, t1, sizeof t1);
			buf_printf(&b, "cw %s ", t1);
		}
		if (!isnan(r->limits.cw_linear)) {
			qty(a, r->limits.cw_linear, DIM_LINEAR, t1, sizeof t1);
			buf_printf(&b, "cw %s ", t1);
		}
		if (!isnan(r->limits.max_power)) {
			qty(a, r->limits.max_power, DIM_POWER, t1, sizeof t1);
			buf_printf(&b, "max %s ", t1);
		}
		if (!isnan(r->limits.max_absorbed)) {
			qty(a, r->limits.max_absorbed, DIM_POWER, t1, sizeof t1);
			buf_printf(&b, "absorbed %s ", t1);
		}
		n += result_line(a, y + n, x, w, "limits", b.s, A_NORMAL);
		buf_release(&b);
	}
	if (n < h && r->flags != 0) {
		report_flags(r->flags, line, sizeof line, ", ");
		n += result_line(a, y + n, x, w, "flags", line, ui_attr(a, UC_CAUTION));
	}
	if (n < h && r->has_focus) {
		qty(a, r->focus.z, DIM_LENGTH, t1, sizeof t1);
		layout_radius_text(t2, sizeof t2, r->focus.wx, r->focus.wy, a->ascii);
		qty(a, r->focus.peak_irradiance, DIM_IRRADIANCE, t3, sizeof t3);
		snprintf(line, sizeof line, "at z = %s: %s, peak %s%s", t1, t2, t3,
		    r->focus.air_breakdown ? "  AIR BREAKDOWN" : "");
		n += result_line(a, y + n, x, w, "focus", line,
		    r->focus.air_breakdown ? ui_attr(a, UC_OVER) : A_NORMAL);
	}
	if (n < h && r->critical_power > 0 && (r->flags & TF_SELF_FOCUSING)) {
		qty(a, r->critical_power, DIM_POWER, t1, sizeof t1);
		snprintf(line, sizeof line, "peak power above the critical %s: self-focusing", t1);
		n += result_wrapped(a, y + n, x, w, h - n, 2, "hazard", line, ui_attr(a, UC_HAZARD));
	}
	if (!layout_ghost_matters(a->trace, (size_t)row->trace_row))
		n += ghost_lines(a, y + n, x, w, h - n, 0, (size_t)row->trace_row);
	/* the ghosts and strays its own surfaces send off */
	n += ghost_lines(a, y + n, x, w, h - n, 1, (size_t)row->trace_row);
	if (!strays_first)
		n += ghost_lines(a, y + n, x, w, h - n, 2, (size_t)row->trace_row);
}
