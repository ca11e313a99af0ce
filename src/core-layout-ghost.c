/* core-layout-ghost.c - what the workbench says about surface reflections
 * (ghost-conventions.md), decided without curses: every ghost and stray in
 * one list worst first with the cells of its row and a sentence about it,
 * the count line of that list, the lines of an element's results that tell
 * which ghosts meet it and which it makes, and how many ghosts are over
 * and strays must be blocked (the margin line's part).  Works from the
 * lean trace's summaries (ghost_set.g, .strays, .at), never from per-ghost
 * rows, which the workbench does not keep.
 * See core-layout.h.  Owned by the workbench. */
#include <config.h>

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "core-ghost.h"
#include "core-layout.h"
#include "util-err.h"

/* ---- names and small facts ---- */

void
layout_ghost_name(const struct ghost *g, int ascii, char *buf, size_t n)
{
	char a[96], b[96];

	ghost_surface_name(g, 0, a, sizeof a);
	if (g->order == 2 && g->surf_el[1] != NULL) {
		ghost_surface_name(g, 1, b, sizeof b);
		snprintf(buf, n, "%s %s %s", a, ascii ? "->" : "\u2192", b);
	} else {
		snprintf(buf, n, "%s", a);
	}
}

/* The focus of a ghost that sparks (the first), NULL: none. */
static const struct ghost_focus *
ghost_spark(const struct ghost_set *gs, const struct ghost *g)
{
	for (size_t k = 0; k < g->nfoci; k++)
		if (gs->foci[g->focus0 + k].air_breakdown)
			return &gs->foci[g->focus0 + k];
	return NULL;
}

static long
row_of(const struct trace *t, const struct element *el)
{
	if (el == NULL)
		return -1;
	for (size_t i = 0; i < t->nrows; i++)
		if (t->rows[i].el == el)
			return (long)i;
	return -1;
}

static int
stray_blocks(const struct trace *t, const struct ghost_stray *s)
{
	return s->power >= t->bench->stray_warn;
}

size_t
layout_strays_to_block(const struct trace *t)
{
	size_t n = 0;

	if (t->ghosts == NULL)
		return 0;
	for (size_t i = 0; i < t->ghosts->nstrays; i++)
		n += stray_blocks(t, &t->ghosts->strays[i]);
	return n;
}

/* "back", "fourth port": a stray's kind in words. */
static const char *
stray_words(const char *what)
{
	if (strcmp(what, "fourth_port") == 0)
		return "fourth port";
	if (strcmp(what, "reflected") == 0)
		return "reflected";
	return what;
}

/* ---- the list, worst first ---- */

static double
ghost_key(const struct ghost *g)
{
	return isnan(g->worst_ratio) ? -1 : g->worst_ratio;
}

/* 2: over somewhere, or its focus sparks; 1: at caution; 0: the rest. */
static int
ghost_severity(const struct trace *t, const struct ghost *g)
{
	enum damage_status st = damage_status_of(g->worst_ratio, t->bench->safety_factor);

	if ((g->flags & GF_OVER) || st == STATUS_OVER || ghost_spark(t->ghosts, g) != NULL)
		return 2;
	return st == STATUS_CAUTION;
}

static int
refl_cmp(const void *x, const void *y)
{
	const struct layout_refl *a = x, *b = y;
	const struct ghost_set *gs = NULL;
	double ka, kb;

	/* the worst tier first; in a tier ghosts first */
	if (a->severity != b->severity)
		return a->severity > b->severity ? -1 : 1;
	if (a->kind != b->kind)
		return a->kind == LR_GHOST ? -1 : 1;
	gs = a->set;
	if (a->kind == LR_GHOST) {
		ka = ghost_key(&gs->g[a->index]);
		kb = ghost_key(&gs->g[b->index]);
	} else {
		ka = gs->strays[a->index].power;
		kb = gs->strays[b->index].power;
	}
	if (ka != kb)
		return ka > kb ? -1 : 1;
	/* equal: the trace's own order, so the list never shuffles */
	return a->index < b->index ? -1 : a->index > b->index ? 1 : 0;
}

size_t
layout_reflections(const struct trace *t, struct layout_refl **out)
{
	const struct ghost_set *gs = t->ghosts;
	struct layout_refl *v;
	size_t n = 0;

	*out = NULL;
	if (gs == NULL || gs->n + gs->nstrays == 0)
		return 0;
	v = xcalloc(gs->n + gs->nstrays, sizeof *v);
	for (size_t i = 0; i < gs->n; i++) {
		const struct ghost *g = &gs->g[i];
		long row = g->worst_row;

		/* unrated everywhere: the element whose reflection starts it */
		if (row < 0)
			row = row_of(t, g->surf_el[g->order == 2 && g->surf_el[1] != NULL ? 1 : 0]);
		v[n++] = (struct layout_refl){ LR_GHOST, i, row, ghost_severity(t, g), gs };
	}
	for (size_t i = 0; i < gs->nstrays; i++)
		v[n++] = (struct layout_refl){ LR_STRAY, i, row_of(t, gs->strays[i].from),
		    stray_blocks(t, &gs->strays[i]), gs };
	qsort(v, n, sizeof *v, refl_cmp);
	*out = v;
	return n;
}

void
layout_reflection_cells(const struct trace *t, const struct layout_refl *r, int ascii,
    struct layout_refl_cells *c)
{
	const struct ghost_set *gs = t->ghosts;

	memset(c, 0, sizeof *c);
	if (r->kind == LR_GHOST) {
		const struct ghost *g = &gs->g[r->index];
		const struct ghost_focus *sp = ghost_spark(gs, g);

		snprintf(c->kind, sizeof c->kind, "ghost%s", g->order != 2 ? "" : ascii ? "2" :
		    "\u00b2");
		layout_ghost_name(g, ascii, c->name, sizeof c->name);
		units_format(c->power, sizeof c->power, g->power_start, DIM_POWER, 3, ascii);
		if (g->worst_row >= 0) {
			snprintf(c->where, sizeof c->where, "%s", t->rows[g->worst_row].el->id);
			layout_percent(c->ratio, sizeof c->ratio, g->worst_ratio);
			c->status = damage_status_of(g->worst_ratio, t->bench->safety_factor);
			c->word = layout_status_word(c->status);
		} else {
			snprintf(c->where, sizeof c->where, "-");
			snprintf(c->ratio, sizeof c->ratio, "-");
			c->status = STATUS_UNRATED;
			c->word = "unrated";
		}
		if (sp != NULL) {
			char d[48];

			units_format(d, sizeof d, sp->distance, DIM_LENGTH, 3, ascii);
			snprintf(c->note, sizeof c->note, "focus in %s sparks, %s from an optic",
			    sp->gap != NULL ? sp->gap->id : "air", d);
			c->word = "spark";
			c->status = STATUS_OVER;
		} else if (g->flags & GF_REFLECTANCE_ASSUMED) {
			snprintf(c->note, sizeof c->note, "reflectance assumed");
		} else if (g->flags & GF_SHAPE_ASSUMED) {
			snprintf(c->note, sizeof c->note, "lens shape assumed");
		}
	} else {
		const struct ghost_stray *s = &gs->strays[r->index];

		snprintf(c->kind, sizeof c->kind, "stray");
		snprintf(c->name, sizeof c->name, "%s %s", s->from->id, stray_words(s->what));
		units_format(c->power, sizeof c->power, s->power, DIM_POWER, 3, ascii);
		/* where a ghost has its worst, a stray has its focus: "focus at 120 mm" */
		if (isnan(s->focus_distance)) {
			snprintf(c->where, sizeof c->where, "no focus");
			snprintf(c->ratio, sizeof c->ratio, "-");
		} else {
			snprintf(c->where, sizeof c->where, "focus at");
			units_format(c->ratio, sizeof c->ratio, s->focus_distance, DIM_LENGTH, 3, ascii);
		}
		if (stray_blocks(t, s)) {
			c->status = STATUS_CAUTION;
			c->word = "block";
			snprintf(c->note, sizeof c->note, "leaves the beam line: block or dump it");
		} else {
			c->status = STATUS_OK;
			c->word = "low";
			snprintf(c->note, sizeof c->note, "below the stray warning level");
		}
	}
}

char *
layout_reflection_text(const struct trace *t, const struct layout_refl *r, int ascii)
{
	const struct ghost_set *gs = t->ghosts;
	struct layout_refl_cells c;
	struct buf b;

	layout_reflection_cells(t, r, ascii, &c);
	buf_init(&b);
	if (r->kind == LR_GHOST) {
		const struct ghost *g = &gs->g[r->index];
		const struct ghost_focus *sp = ghost_spark(gs, g);

		buf_printf(&b, "%s ghost %s: %s after its %sreflection, meets %zu element%s",
		    g->order == 2 ? "second-order" : "first-order", c.name, c.power,
		    g->order == 2 ? "second " : "", g->nrows, g->nrows == 1 ? "" : "s");
		if (g->worst_row >= 0)
			buf_printf(&b, ", worst at %s: %s %s", c.where, c.ratio,
			    layout_status_word(damage_status_of(g->worst_ratio, t->bench->safety_factor)));
		else
			buf_add(&b, ", none of them rated");
		if (sp != NULL) {
			char d[48];

			units_format(d, sizeof d, sp->distance, DIM_LENGTH, 3, ascii);
			buf_printf(&b, "; its focus in %s, %s from the nearest optic, sparks in air",
			    sp->gap != NULL ? sp->gap->id : "air", d);
		}
		if (g->flags & GF_REFLECTANCE_ASSUMED)
			buf_add(&b, "; reflectance assumed (0.5 % AR: give surface_reflectance)");
		if (g->flags & GF_SHAPE_ASSUMED)
			buf_add(&b, "; lens taken as equi-convex (give r1, r2)");
	} else {
		const struct ghost_stray *s = &gs->strays[r->index];

		buf_printf(&b, "stray from %s (%s): %s", s->from->id, stray_words(s->what), c.power);
		if (!isnan(s->peak_power)) {
			char pk[48];

			units_format(pk, sizeof pk, s->peak_power, DIM_POWER, 3, ascii);
			buf_printf(&b, " (peak %s)", pk);
		}
		if (isnan(s->focus_distance))
			buf_add(&b, " leaves the beam line, unfocused");
		else
			buf_printf(&b, " leaves the beam line and focuses %s from the surface", c.ratio);
		if (stray_blocks(t, s))
			buf_add(&b, ": block or dump it");
		else
			buf_add(&b, "; below the stray warning level");
	}
	return buf_take(&b);
}

char *
layout_reflection_count(const struct trace *t, int ascii, int width)
{
	const struct ghost_set *gs = t->ghosts;
	size_t caution = 0, block;
	const char *dot = ascii ? " - " : " \u00b7 ";
	char v[48];

	if (gs == NULL)
		return xstrdup("reflections not traced");
	for (size_t i = 0; i < gs->n; i++)
		if (damage_status_of(gs->g[i].worst_ratio, t->bench->safety_factor) == STATUS_CAUTION)
			caution++;
	block = layout_strays_to_block(t);
	units_format(v, sizeof v, gs->return_power, DIM_POWER, 3, ascii);
	for (int level = 0;; level++) {
		char *full = level == 3 ? xasprintf("%zu ghost%s, %zu over%s%zu stra%s to block",
		    gs->n, gs->n == 1 ? "" : "s", gs->nover, dot, block, block == 1 ? "y" : "ys") :
		    xasprintf("%zu ghost%s: %zu over, %zu%s caution%s%zu stra%s: %zu to "
		    "block%s%s%s%s", gs->n, gs->n == 1 ? "" : "s", gs->nover, caution,
		    level == 0 ? " at" : "", dot, gs->nstrays, gs->nstrays == 1 ? "y" : "ys", block,
		    level < 2 ? dot : "", level == 1 ? "back to source " : "", level < 2 ? v : "",
		    level == 0 ? " back at the source" : "");

		if (level == 3 || (int)utf8_cols(full) <= width)
			return full;
		free(full);
	}
}

/* ---- an element's results ---- */

void
layout_lines_free(struct layout_line *l, size_t n)
{
	for (size_t i = 0; i < n; i++)
		free(l[i].text);
}

static size_t
line_push(struct layout_line *out, size_t n, size_t max, const char *label, char *text,
    enum damage_status level)
{
	if (n < max)
		out[n] = (struct layout_line){ label, text, level };
	else
		free(text);
	return n + 1;
}

size_t
layout_ghost_meet(const struct trace *t, size_t row, int ascii, struct layout_line *out,
    size_t max)
{
	const struct ghost_set *gs = t->ghosts;
	const struct ghost_at *at;
	const struct trace_row *r = row < t->nrows ? &t->rows[row] : NULL;
	char irr[48], a[32], b[32], name[200], p[48];
	size_t n = 0;

	/* a gap has nothing to rate: what crosses it is said at the optics */
	if (gs == NULL || gs->at == NULL || r == NULL || r->el->type == EL_SPACE)
		return 0;
	at = &gs->at[row];
	if (at->nmet == 0)
		return 0;
	units_format(irr, sizeof irr, at->irradiance, DIM_IRRADIANCE, 3, ascii);
	if (!isnan(at->main_ratio) && !isnan(r->ratio)) {
		layout_percent(a, sizeof a, at->main_ratio);
		layout_percent(b, sizeof b, r->ratio);
		n = line_push(out, n, max, "ghosts in", xasprintf("%zu meet it, +%s: %s alone, "
		    "%s with them", at->nmet, irr, a, b), r->status);
	} else {
		n = line_push(out, n, max, "ghosts in", xasprintf("%zu meet it, +%s peak (unrated)",
		    at->nmet, irr), STATUS_UNRATED);
	}
	if (at->top >= 0 && (size_t)at->top < gs->n) {
		const struct ghost *g = &gs->g[at->top];

		layout_ghost_name(g, ascii, name, sizeof name);
		units_format(p, sizeof p, at->top_power, DIM_POWER, 3, ascii);
		if (!isnan(at->top_ratio)) {
			layout_percent(a, sizeof a, at->top_ratio);
			n = line_push(out, n, max, "most", xasprintf("%s %s (%s)", name, a, p),
			    damage_status_of(at->top_ratio, t->bench->safety_factor));
		} else {
			units_format(irr, sizeof irr, at->top_irradiance, DIM_IRRADIANCE, 3, ascii);
			n = line_push(out, n, max, "most", xasprintf("%s %s (%s)", name, irr, p),
			    STATUS_UNRATED);
		}
	}
	return n;
}

int
layout_ghost_matters(const struct trace *t, size_t row)
{
	const struct ghost_set *gs = t->ghosts;
	const struct trace_row *r;
	const struct ghost_at *at;

	if (gs == NULL || gs->at == NULL || row >= t->nrows)
		return 0;
	r = &t->rows[row];
	at = &gs->at[row];
	if (at->nmet == 0 || r->el->type == EL_SPACE || isnan(at->main_ratio) || isnan(r->ratio))
		return 0;
	return damage_status_of(at->main_ratio, t->bench->safety_factor) != r->status ||
	    r->ratio >= LAYOUT_GHOST_MATTERS * at->main_ratio;
}

static int
makes(const struct ghost *g, const struct element *el)
{
	return g->surf_el[0] == el || (g->order == 2 && g->surf_el[1] == el);
}

static int
idx_cmp(const void *x, const void *y)
{
	const struct ghost *const *a = x, *const *b = y;
	double ka = ghost_key(*a), kb = ghost_key(*b);

	if (ka != kb)
		return ka > kb ? -1 : 1;
	return *a < *b ? -1 : *a > *b ? 1 : 0;
}

size_t
layout_ghost_made(const struct trace *t, size_t row, int ascii, size_t each,
    struct layout_line *out, size_t max)
{
	const struct ghost_set *gs = t->ghosts;
	const struct element *el;
	const struct ghost **mine;
	size_t nm = 0, n = 0, shown = 0;
	char name[200], pct[32];

	if (gs == NULL || row >= t->nrows)
		return 0;
	el = t->rows[row].el;
	mine = xcalloc(gs->n ? gs->n : 1, sizeof *mine);
	for (size_t i = 0; i < gs->n; i++)
		if (makes(&gs->g[i], el))
			mine[nm++] = &gs->g[i];
	qsort(mine, nm, sizeof *mine, idx_cmp);
	for (size_t i = 0; i < nm && i < each; i++) {
		const struct ghost *g = mine[i];
		char *text;

		layout_ghost_name(g, ascii, name, sizeof name);
		if (g->worst_row >= 0) {
			enum damage_status st = damage_status_of(g->worst_ratio, t->bench->safety_factor);

			layout_percent(pct, sizeof pct, g->worst_ratio);
			text = xasprintf("%s: %s %s %s", name, t->rows[g->worst_row].el->id, pct,
			    layout_status_word(st));
			n = line_push(out, n, max, i == 0 ? "makes" : "", text, st);
		} else {
			text = xasprintf("%s: meets nothing rated", name);
			n = line_push(out, n, max, i == 0 ? "makes" : "", text, STATUS_UNRATED);
		}
		shown++;
	}
	if (nm > shown)
		n = line_push(out, n, max, shown == 0 ? "makes" : "", xasprintf("+%zu more ghost%s "
		    "(f lists all)", nm - shown, nm - shown == 1 ? "" : "s"), STATUS_OK);
	free(mine);
	return n;
}

size_t
layout_ghost_strays(const struct trace *t, size_t row, int ascii, int *blocks,
    struct layout_line *out, size_t max)
{
	const struct ghost_set *gs = t->ghosts;
	const struct element *el;
	size_t n = 0, ns = 0;
	char p[48];

	*blocks = 0;
	if (gs == NULL || row >= t->nrows)
		return 0;
	el = t->rows[row].el;
	for (size_t i = 0; i < gs->nstrays; i++) {
		const struct ghost_stray *s = &gs->strays[i];

		if (s->from != el)
			continue;
		units_format(p, sizeof p, s->power, DIM_POWER, 3, ascii);
		n = line_push(out, n, max, ns == 0 ? "strays" : "", xasprintf("%s %s%s",
		    stray_words(s->what), p, stray_blocks(t, s) ? ": block it" : ""),
		    stray_blocks(t, s) ? STATUS_CAUTION : STATUS_OK);
		*blocks |= stray_blocks(t, s);
		ns++;
	}
	return n;
}

/* ---- a ghost on the beam profile ---- */

size_t
layout_profile_ghost(const struct trace *rt, size_t gi, const size_t *path, size_t npath,
    const struct layout_plot *pl, int band, struct layout_gpoint *out, size_t max)
{
	const struct ghost_set *gs = rt->ghosts;
	const struct ghost *g;
	int hr = pl->hr, mid = (hr - 1) / 2;
	size_t n = 0;

	if (gs == NULL || !gs->rows_kept || gi >= gs->n || hr < 2)
		return 0;
	g = &gs->g[gi];
	for (size_t k = 0; k < g->nrows; k++) {
		const struct ghost_row *r = &gs->rows[g->row0 + k];
		double w = r->wx > r->wy ? r->wx : r->wy;
		int on = 0, row, row2;

		for (size_t i = 0; i < npath && !on; i++)
			on = path[i] == r->trace_row;
		if (!on || !isfinite(w))
			continue;
		if (band) {
			/* rows from the axis to its edge, rounded, as the band's own */
			int e = pl->rmax > 0 ? (int)floor(w / pl->rmax * mid + 0.5) : 0;

			if (e > mid)
				e = mid;
			row = mid - e;
			row2 = mid + e > hr - 1 ? hr - 1 : mid + e;
		} else {
			row = pl->rmax > 0 ? (hr - 1) - (int)floor(w / pl->rmax * (hr - 1) + 0.5) : hr - 1;
			if (row < 0)
				row = 0;
			if (row > hr - 1)
				row = hr - 1;
			row2 = row;
		}
		if (n < max)
			out[n] = (struct layout_gpoint){ layout_map_col(rt->rows[r->trace_row].z, pl->z0,
			    pl->z1, pl->w), row, row2, r->trace_row, w > pl->rmax };
		n++;
	}
	return n;
}
