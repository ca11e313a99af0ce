/* report-table.c - the trace as a person reads it on a terminal: a header,
 * one row per element with side branches indented under their port, then
 * foci, warnings, the worst element, the safe source power and what the
 * flags mean.  Status is always a word; colour only repeats it. */
#include <config.h>

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "core-ghost.h"
#include "core-layout.h"
#include "report.h"
#include "util-buf.h"
#include "util-err.h"

static const char *
status_color(enum damage_status s)
{
	switch (s) {
	case STATUS_OVER:	return "\033[1;31m";
	case STATUS_CAUTION:	return "\033[33m";
	case STATUS_OK:		return "\033[32m";
	default:		return "";
	}
}

static void
col(struct buf *b, size_t start, size_t width, const char *text, int right)
{
	size_t n = utf8_cols(text), have = utf8_cols(b->s + start);

	if (right)
		while (have + n < width) {
			buf_addc(b, ' ');
			have++;
		}
	buf_add(b, text);
	buf_pad(b, width, start);
}

/* Column widths (terminal columns).  The id column grows with nesting. */
enum { W_ID = 14, W_TYPE = 10, W_Z = 9, W_P = 10, W_R = 17, W_I = 12, W_F = 12,
    W_RATIO = 8, W_STATUS = 9 };

static void
header(struct buf *b, const struct trace *t)
{
	size_t s = b->len;
	int pulsed = t->bench->src.pulsed;

	col(b, s, W_ID, "element", 0);
	col(b, s, W_ID + W_TYPE, "type", 0);
	col(b, s, W_ID + W_TYPE + W_Z, "z", 1);
	col(b, s, W_ID + W_TYPE + W_Z + W_P, "power", 1);
	col(b, s, W_ID + W_TYPE + W_Z + W_P + W_R, "radius x/y", 1);
	col(b, s, W_ID + W_TYPE + W_Z + W_P + W_R + W_I, pulsed ? "peak irr." : "irradiance", 1);
	col(b, s, W_ID + W_TYPE + W_Z + W_P + W_R + W_I + W_F, pulsed ? "fluence" : "lin. dens.", 1);
	col(b, s, W_ID + W_TYPE + W_Z + W_P + W_R + W_I + W_F + W_RATIO, "ratio", 1);
	buf_add(b, "  status   flags\n");
}

static void
row_line(struct buf *b, const struct trace *t, const struct trace_row *r,
    const struct report_opts *o)
{
	char v1[48], v2[48], tmp[112];
	size_t s = b->len, x = 0;
	int pulsed = t->bench->src.pulsed, a = o->ascii;

	for (unsigned d = 0; d < r->depth; d++)
		buf_add(b, "  ");
	buf_add(b, r->el->id);
	if (utf8_cols(b->s + s) >= W_ID)
		buf_addc(b, ' ');
	col(b, s, x += W_ID, "", 0);
	col(b, s, x += W_TYPE, model_type_name(r->el->type), 0);
	units_format(v1, sizeof v1, r->z, DIM_LENGTH, 3, a);
	col(b, s, x += W_Z, v1, 1);
	units_format(v1, sizeof v1, r->power_in, DIM_POWER, 3, a);
	col(b, s, x += W_P, v1, 1);
	units_format(v1, sizeof v1, r->wx, DIM_LENGTH, 3, a);
	units_format(v2, sizeof v2, r->wy, DIM_LENGTH, 3, a);
	if (strcmp(v1, v2) == 0) {          /* round beam, as far as shown */
		col(b, s, x += W_R, v1, 1);
	} else {
		/* "1.20/0.600 mm" when both share a unit */
		const char *u1 = strchr(v1, ' '), *u2 = strchr(v2, ' ');

		if (u1 != NULL && u2 != NULL && strcmp(u1, u2) == 0)
			snprintf(tmp, sizeof tmp, "%.*s/%s", (int)(u1 - v1), v1, v2);
		else
			snprintf(tmp, sizeof tmp, "%s/%s", v1, v2);
		col(b, s, x += W_R, tmp, 1);
	}
	units_format(v1, sizeof v1, r->peak_irradiance, DIM_IRRADIANCE, 3, a);
	col(b, s, x += W_I, v1, 1);
	if (pulsed)
		units_format(v1, sizeof v1, r->fluence, DIM_FLUENCE, 3, a);
	else
		units_format(v1, sizeof v1, r->linear_density, DIM_LINEAR, 3, a);
	col(b, s, x += W_F, v1, 1);
	layout_percent(v1, sizeof v1, r->ratio);    /* the workbench's form too */
	col(b, s, x += W_RATIO, v1, 1);
	buf_add(b, "  ");
	if (o->color && r->status != STATUS_UNRATED)
		buf_add(b, status_color(r->status));
	/* the workbench's words: OVER, n/a for a space, spark for a breakdown */
	snprintf(v1, sizeof v1, "%s", layout_row_status_word(r));
	buf_add(b, v1);
	if (o->color && r->status != STATUS_UNRATED)
		buf_add(b, "\033[0m");
	buf_pad(b, x + 2 + W_STATUS, s);
	report_flags(r->flags, tmp, sizeof tmp, ",");
	buf_add(b, tmp);
	while (b->len > 0 && b->s[b->len - 1] == ' ')
		b->s[--b->len] = '\0';
	buf_addc(b, '\n');
	if (r->status >= STATUS_CAUTION) {
		/* why it is at caution or over: the limit derived from the rating */
		char *why = layout_derivation_text(r, t->bench, a);

		if (why != NULL) {
			for (unsigned d = 0; d < r->depth; d++)
				buf_add(b, "  ");
			buf_printf(b, "  %s why: %s\n", a ? "`-" : "\u2514", why);
			free(why);
		}
	}
}

static void
foci(struct buf *b, const struct trace *t, int a)
{
	char z[48], w1[48], w2[48], irr[48];
	int any = 0;

	for (size_t i = 0; i < t->nrows; i++) {
		const struct trace_row *r = &t->rows[i];

		if (!r->has_focus)
			continue;
		if (!any)
			buf_add(b, "\nFoci in air:\n");
		any = 1;
		units_format(z, sizeof z, r->focus.z, DIM_LENGTH, 4, a);
		units_format(w1, sizeof w1, r->focus.wx, DIM_LENGTH, 3, a);
		units_format(w2, sizeof w2, r->focus.wy, DIM_LENGTH, 3, a);
		units_format(irr, sizeof irr, r->focus.peak_irradiance, DIM_IRRADIANCE, 3, a);
		buf_printf(b, "  in %s at z = %s: radius %s x %s, peak %s%s\n",
		    r->el->id, z, w1, w2, irr,
		    r->focus.air_breakdown ? "  AIR BREAKDOWN" : "");
	}
}

static void
legend(struct buf *b, unsigned all)
{
	static const struct { unsigned bit; const char *text; } notes[] = {
		{ TF_CLIPPING, "clipping: the aperture passes less than 99 % (common practice); "
		    "the clipped beam is then treated as Gaussian again, which can "
		    "underestimate downstream peaks (diffraction rings)" },
		{ TF_HARD_CLIP, "hard_clipping: less than 90 % passes; downstream figures are rough" },
		{ TF_WAVELENGTH_SCALED, "wavelength_scaled: threshold scaled by lambda/lambda_spec "
		    "(rule of thumb, common practice)" },
		{ TF_PULSE_SCALED, "pulse_scaled: fluence threshold scaled by sqrt(tau/tau_spec) "
		    "(rule of thumb; Stuart et al. 1996)" },
		{ TF_PULSE_RANGE, "pulse_scaling_out_of_range: a pulse width lies outside 50 ps..100 ns, "
		    "where the sqrt(tau) law is not established: ask the vendor for a rating" },
		{ TF_PULSED_RATING_ON_CW, "pulsed_rating_on_cw: only a fluence rating, which says "
		    "nothing about a CW beam: unrated" },
		{ TF_SELF_FOCUSING, "self_focusing: peak power above the critical power, and the "
		    "beam would collapse inside the element (Marburger 1975)" },
		{ TF_ABOVE_CRITICAL, "above_critical_power: peak power at or above the critical "
		    "power, but the collapse distance is longer than the element; the "
		    "B-integral counts the phase (Marburger 1975)" },
		{ TF_AIR_BREAKDOWN, "air_breakdown: a pulsed focus in air reaches the bench's breakdown level" },
	};
	int any = 0;

	for (size_t i = 0; i < sizeof notes / sizeof *notes; i++) {
		if (!(all & notes[i].bit))
			continue;
		if (!any)
			buf_add(b, "\nFlags:\n");
		any = 1;
		buf_printf(b, "  %s\n", notes[i].text);
	}
}

static int
by_ratio(const void *x, const void *y)
{
	const struct ghost *const *a = x, *const *b = y;
	double ra = isnan((*a)->worst_ratio) ? -1 : (*a)->worst_ratio;
	double rb = isnan((*b)->worst_ratio) ? -1 : (*b)->worst_ratio;

	if (ra != rb)
		return ra < rb ? 1 : -1;
	/* ties in the order traced (the pointers are into one array): the
	 * same table on every libc */
	return *a < *b ? -1 : *a > *b;
}

/* ghost-conventions.md, Output: worst first, every ghost at caution or
 * over and every stray to block; then how many more there are. */
static void
reflections(struct buf *b, const struct trace *t, int ascii)
{
	const struct ghost_set *gs = t->ghosts;
	const struct ghost **order;
	double caution = 1 / t->bench->safety_factor;
	size_t shown = 0, rest = 0, strays = 0;
	char name[2][160], v[48], pct[32];

	if (gs == NULL || (gs->n == 0 && gs->nstrays == 0))
		return;
	order = xcalloc(gs->n ? gs->n : 1, sizeof *order);
	for (size_t i = 0; i < gs->n; i++)
		order[i] = &gs->g[i];
	qsort(order, gs->n, sizeof *order, by_ratio);
	buf_add(b, "\nReflections (surface ghosts and strays):\n");
	for (size_t i = 0; i < gs->n; i++) {
		const struct ghost *g = order[i];
		const struct ghost_focus *spark = NULL;

		for (size_t k = 0; k < g->nfoci; k++)
			if (gs->foci[g->focus0 + k].air_breakdown)
				spark = &gs->foci[g->focus0 + k];
		if (!(g->worst_ratio >= caution) && spark == NULL) {
			rest++;
			continue;
		}
		ghost_surface_name(g, 0, name[0], sizeof name[0]);
		if (g->order == 2)
			ghost_surface_name(g, 1, name[1], sizeof name[1]);
		units_format(v, sizeof v, g->power_start, DIM_POWER, 3, ascii);
		layout_percent(pct, sizeof pct, g->worst_ratio);
		/* a ghost that sparks may meet no rated element (worst_row -1) */
		buf_printf(b, "  ghost %s%s%s: %s, %s%s %s (%s)%s\n", name[0],
		    g->order == 2 ? (ascii ? " > " : " \u2192 ") : "", g->order == 2 ? name[1] : "",
		    v, g->worst_row >= 0 ? "worst at " : "meets no rated element",
		    g->worst_row >= 0 ? t->rows[g->worst_row].el->id : "", g->worst_row >= 0 ? pct : "-",
		    g->worst_row >= 0 ? layout_status_word(damage_status_of(g->worst_ratio,
		    t->bench->safety_factor)) : "unrated", g->flags & GF_REFLECTANCE_ASSUMED ?
		    "  reflectance assumed" : "");
		if (spark != NULL) {
			units_format(v, sizeof v, spark->distance, DIM_LENGTH, 3, ascii);
			buf_printf(b, "    its focus in %s, %s from the nearest optic, sparks in air"
			    " (AIR BREAKDOWN)\n", spark->gap->id, v);
		}
		shown++;
	}
	for (size_t i = 0; i < gs->nstrays; i++) {
		const struct ghost_stray *s = &gs->strays[i];

		if (s->power < t->bench->stray_warn) {
			strays++;
			continue;
		}
		units_format(v, sizeof v, s->power, DIM_POWER, 3, ascii);
		buf_printf(b, "  stray %s.%s: %s leaves the beam line: block or dump it\n",
		    s->from->id, s->what, v);
		shown++;
	}
	units_format(v, sizeof v, gs->return_power, DIM_POWER, 3, ascii);
	buf_printf(b, "  %zu more ghosts below 1/%g of a threshold, %zu more strays below "
	    "the stray level; %s comes back to the source.\n", rest, t->bench->safety_factor,
	    strays, v);
	(void)shown;
	free(order);
}

char *
report_table(const struct trace *t, const struct report_opts *o)
{
	const struct bench *bench = t->bench;
	struct buf b;
	unsigned all = 0;
	char *src, v[48], br[160];
	int a = o->ascii;

	buf_init(&b);
	src = report_source_line(bench, a);
	if (o->origin != NULL)
		buf_printf(&b, "Bench %s @ %s: %s\n", bench->name, o->origin, src);
	else
		buf_printf(&b, "Bench %s: %s\n", bench->name, src);
	free(src);
	buf_printf(&b, "Safety factor %g: caution from %.0f %% of a threshold, over from 100 %%.\n\n",
	    bench->safety_factor, 100 / bench->safety_factor);
	if (t->ghosts == NULL)
		/* the ghosts can be what is over: say they are left out */
		buf_add(&b, "Main beam only (--no-ghosts): surface reflections are not in "
		    "these ratios.\n\n");
	header(&b, t);
	for (size_t i = 0; i < t->nrows; i++) {
		const struct trace_row *r = &t->rows[i];

		/* a side branch starts right after its owner */
		if (i > 0 && t->rows[i - 1].el == r->parent && r->parent != NULL) {
			for (unsigned d = 1; d < r->depth; d++)
				buf_add(&b, "  ");
			trace_branch_name(r->parent, r->port, br, sizeof br);
			buf_printf(&b, "%s %s\n", a ? "\\" : "\u2514", br);
		}
		row_line(&b, t, r, o);
		all |= r->flags;
	}
	foci(&b, t, a);
	reflections(&b, t, a);
	if (t->nwarn > 0) {
		buf_add(&b, "\nWarnings:\n");
		for (size_t i = 0; i < t->nwarn; i++) {
			char *w = report_warning_text(t, &t->warn[i], a);

			buf_printf(&b, "  %s\n", w);
			free(w);
		}
	}
	buf_addc(&b, '\n');
	if (t->worst >= 0) {
		const struct trace_row *w = &t->rows[t->worst];

		char pct[32];

		layout_percent(pct, sizeof pct, t->worst_ratio);
		buf_printf(&b, "Worst: %s at %s of its limit (%s).\n", w->el->id, pct,
		    layout_status_word(w->status));
		if (isinf(t->safe_source_power)) {
			buf_add(&b, "Safe source power: no limit (no power reaches a rated element).\n");
		} else {
			units_format(v, sizeof v, t->safe_source_power, DIM_POWER, 3, a);
			buf_printf(&b, "Safe source power: %s (every rated element at 1/%g "
			    "of its threshold).\n", v, bench->safety_factor);
		}
	} else {
		buf_add(&b, "No element has a damage rating: nothing was checked.\n");
	}
	legend(&b, all);
	buf_add(&b, "\nDesign estimate only; the laser safety officer and local rules decide.\n");
	return buf_take(&b);
}
