/* report-md.c - the printed review as Markdown, for a lab notebook or an
 * e-mail, with the same facts as the PDF; and the pieces both forms share
 * (the verdict counts and sentences, the element table's cells). */
#include <config.h>

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "core-layout.h"
#include "report-diff.h"
#include "report-review.h"
#include "report.h"
#include "util-buf.h"
#include "util-err.h"

void
review_count(const struct trace *t, struct review_counts *c)
{
	memset(c, 0, sizeof *c);
	for (size_t i = 0; i < t->nrows; i++) {
		const struct trace_row *r = &t->rows[i];

		if (r->el->type == EL_SPACE)
			continue;           /* a gap has no rating of its own */
		switch (r->status) {
		case STATUS_OVER:	c->over++; break;
		case STATUS_CAUTION:	c->caution++; break;
		case STATUS_OK:		c->ok++; break;
		default:		c->unrated++; break;
		}
	}
	for (size_t i = 0; i < t->nrows; i++)
		if (t->rows[i].has_focus && t->rows[i].focus.air_breakdown)
			c->air_breakdown++;
	for (size_t i = 0; i < t->nwarn; i++) {
		if (t->warn[i].kind == TW_UNTERMINATED)
			c->unterminated++;
		/* a reflection's focus that sparks (one warning per gap) */
		if (t->warn[i].kind == TW_AIR_BREAKDOWN && t->warn[i].ghost)
			c->air_breakdown++;
	}
}

void
review_count_all(const struct review *rv, struct review_counts *c)
{
	review_count(rv->trace, c);
	c->points = rv->npoints;
	if (rv->survey != NULL)
		for (size_t i = 0; i < rv->survey->n; i++)
			if (rv->survey->pt[i].status == STATUS_OVER)
				c->points_over++;
}

char *
review_points_text(const struct review *rv)
{
	struct review_counts c;

	review_count_all(rv, &c);
	if (rv->point != NULL) {
		struct buf b;

		buf_init(&b);
		buf_printf(&b, "Operating point: %s (one of %zu; the table and the plots are "
		    "of this point)", rv->point, rv->npoints);
		for (size_t i = 0; rv->point_def != NULL && i < rv->point_def->n; i++)
			buf_printf(&b, "%s%s", i ? "; " : ": changes ", rv->point_def->change[i]);
		return buf_take(&b);
	}
	if (rv->survey != NULL)
		return xasprintf("Operating points: %zu besides the base; something is over at "
		    "%zu of the %zu traced (the base included)", c.points, c.points_over,
		    rv->survey->n);
	if (c.points == 0)
		return xstrdup("Operating points: none");
	return xasprintf("Operating points: %zu besides the base, not traced here "
	    "(this is the base; see --point NAME or --every-point)", c.points);
}

const struct point_worst *
review_survey_worst(const struct point_survey *sv, const char *id)
{
	for (size_t i = 0; sv != NULL && i < sv->nel; i++)
		if (strcmp(sv->el[i].id, id) == 0)
			return &sv->el[i];
	return NULL;
}

void
review_survey_cell(const struct point_survey *sv, const char *id, char *buf, size_t n)
{
	const struct point_worst *w = review_survey_worst(sv, id);
	char pct[32];

	if (w == NULL || isnan(w->ratio)) {
		snprintf(buf, n, "-");
		return;
	}
	layout_percent(pct, sizeof pct, w->ratio);
	snprintf(buf, n, "%s at %s", pct, sv->pt[w->at].name);
}

char *
review_survey_worst_text(const struct review *rv)
{
	const struct point_survey *sv = rv->survey;
	const struct point_worst *w = NULL;
	char pct[32];

	if (sv == NULL)
		return NULL;
	for (size_t i = 0; i < sv->nel; i++)
		if (!isnan(sv->el[i].ratio) && (w == NULL || sv->el[i].ratio > w->ratio))
			w = &sv->el[i];
	if (w == NULL)
		return xstrdup("Worst over the base and every point: none (nothing rated)");
	layout_percent(pct, sizeof pct, w->ratio);
	return xasprintf("Worst over the base and every point: %s, %s of its threshold at "
	    "point %s (%s)", w->id, pct, sv->pt[w->at].name, layout_status_word(w->status));
}

static int
by_ratio_down(const void *a, const void *b)
{
	const struct point_worst *x = *(const struct point_worst *const *)a;
	const struct point_worst *y = *(const struct point_worst *const *)b;

	return x->ratio < y->ratio ? 1 : x->ratio > y->ratio ? -1 : 0;
}

char *
review_survey_list_text(const struct review *rv, size_t max)
{
	const struct point_survey *sv = rv->survey;
	const struct point_worst **l;
	size_t n = 0;
	struct buf b;

	if (sv == NULL)
		return NULL;
	l = xcalloc(sv->nel + 1, sizeof *l);
	for (size_t i = 0; i < sv->nel; i++)
		if (!isnan(sv->el[i].ratio) && sv->el[i].status >= STATUS_CAUTION)
			l[n++] = &sv->el[i];
	qsort(l, n, sizeof *l, by_ratio_down);
	buf_init(&b);
	buf_add(&b, "Over or at caution at some point:");
	if (n == 0)
		buf_add(&b, " none");
	for (size_t i = 0; i < n && i < max; i++) {
		char pct[32];

		layout_percent(pct, sizeof pct, l[i]->ratio);
		buf_printf(&b, "%s %s %s %s at %s", i ? ";" : "", l[i]->id, pct,
		    layout_status_word(l[i]->status), sv->pt[l[i]->at].name);
	}
	if (n > max)
		buf_printf(&b, "; and %zu more (see the table)", n - max);
	free(l);
	return buf_take(&b);
}

const char *
review_col_name(const struct trace *t, int col)
{
	static const char *const names[REVIEW_NCOLS] = {
		"element", "type", "z", "power", "radius x/y", "peak irr.", "fluence",
		"ratio", "status", "flags"
	};

	if (col == 6 && !t->bench->src.pulsed)
		return "lin. dens.";
	if (col == 5 && !t->bench->src.pulsed)
		return "irradiance";
	return names[col];
}

void
review_row_cells(const struct trace *t, const struct trace_row *r,
    char c[REVIEW_NCOLS][REVIEW_CELL])
{
	snprintf(c[0], REVIEW_CELL, "%s", r->el->id);
	snprintf(c[1], REVIEW_CELL, "%s", model_type_name(r->el->type));
	units_format(c[2], REVIEW_CELL, r->z, DIM_LENGTH, 3, 0);
	units_format(c[3], REVIEW_CELL, r->power_in, DIM_POWER, 3, 0);
	layout_radius_text(c[4], REVIEW_CELL, r->wx, r->wy, 0);
	units_format(c[5], REVIEW_CELL, r->peak_irradiance, DIM_IRRADIANCE, 3, 0);
	if (t->bench->src.pulsed)
		units_format(c[6], REVIEW_CELL, r->fluence, DIM_FLUENCE, 3, 0);
	else
		units_format(c[6], REVIEW_CELL, r->linear_density, DIM_LINEAR, 3, 0);
	if (isnan(r->ratio))
		snprintf(c[7], REVIEW_CELL, "-");
	else
		layout_percent(c[7], REVIEW_CELL, r->ratio);
	/* the table's words: "n/a" for free space, "spark" for a breakdown */
	snprintf(c[8], REVIEW_CELL, "%s", layout_row_status_word(r));
	report_flags(r->flags, c[9], REVIEW_CELL, ", ");
}

char *
review_worst_text(const struct trace *t)
{
	const struct trace_row *w;
	char pct[32];

	if (t->worst < 0)
		return xstrdup("Worst element: none (no element has a damage rating: nothing was checked)");
	w = &t->rows[t->worst];
	layout_percent(pct, sizeof pct, t->worst_ratio);
	return xasprintf("Worst element: %s (%s), %s of its threshold (%s)", w->el->id,
	    model_type_name(w->el->type), pct, layout_status_word(w->status));
}

char *
review_worst_text_of(const struct review *rv)
{
	char *s = review_worst_text(rv->trace), *at;

	if (rv->survey == NULL)
		return s;
	at = xasprintf("%s, at the base", s);
	free(s);
	return at;
}

static const char *
warn_words(enum trace_warn_kind k, int plural)
{
	switch (k) {
	case TW_AIR_BREAKDOWN:		return plural ? "sparks" : "spark";
	case TW_UNTERMINATED:		return plural ? "unterminated beams" : "unterminated beam";
	case TW_UNRATED_ABSORBER:	return plural ? "unrated absorbers" : "unrated absorber";
	case TW_UNRATED_DUMP:		return plural ? "unrated dumps" : "unrated dump";
	case TW_SELF_FOCUSING:		return "self-focusing";
	case TW_B_INTEGRAL:		return "B-integral over 3 rad";
	default:			return trace_warn_name(k);
	}
}

char *
review_warnings_text(const struct trace *t)
{
	int kinds[32];
	size_t counts[32], nk = 0, notes = 0;
	struct buf b;

	for (size_t i = 0; i < t->nwarn; i++) {
		size_t k = 0;

		while (k < nk && kinds[k] != (int)t->warn[i].kind)
			k++;
		if (k == nk && nk < sizeof kinds / sizeof *kinds) {
			kinds[nk] = (int)t->warn[i].kind;
			counts[nk++] = 0;
		}
		if (k < nk)
			counts[k]++;
	}
	for (size_t i = 0; i < t->nrows; i++)
		if (t->rows[i].flags & TF_ABOVE_CRITICAL)
			notes++;
	buf_init(&b);
	buf_add(&b, "Warnings:");
	if (nk == 0)
		buf_add(&b, " none");
	for (size_t k = 0; k < nk; k++)
		buf_printf(&b, "%s %zu %s", k ? "," : "", counts[k],
		    warn_words((enum trace_warn_kind)kinds[k], counts[k] != 1));
	if (notes > 0)
		buf_printf(&b, "; notes: %zu above critical power (self-focusing phase, "
		    "no collapse inside the element)", notes);
	return buf_take(&b);
}

char *
review_safe_text(const struct trace *t)
{
	char v[48];

	if (t->worst < 0 || isnan(t->safe_source_power))
		return xstrdup("Safe source power: not known (nothing rated)");
	if (isinf(t->safe_source_power))
		return xstrdup("Safe source power: no limit (no power reaches a rated element)");
	units_format(v, sizeof v, t->safe_source_power, DIM_POWER, 3, 0);
	return xasprintf("Safe source power: %s (every rated element at 1/%g of its threshold)",
	    v, t->bench->safety_factor);
}

/* Markdown table cells: a '|' would end the cell */
static void
md_cell(struct buf *b, const char *s)
{
	buf_add(b, " ");
	for (; *s; s++) {
		if (*s == '|' || *s == '\\')
			buf_addc(b, '\\');
		buf_addc(b, *s == '\n' ? ' ' : *s);
	}
	buf_add(b, " |");
}

static void
md_row(struct buf *b, const char *key, const char *val)
{
	buf_add(b, "|");
	md_cell(b, key);
	md_cell(b, val != NULL && val[0] != '\0' ? val : "-");
	buf_addc(b, '\n');
}

static int
same_branch(const struct trace_row *a, const struct trace_row *b)
{
	return a->parent == b->parent && a->port == b->port;
}

static void
md_chain(struct buf *b, const struct trace *t)
{
	buf_add(b, "## Chain\n\nFrom the source, side branches indented under their port:\n\n");
	for (size_t i = 0; i < t->nrows; i++) {
		const struct trace_row *r = &t->rows[i];
		char pct[32], g[48], br[160];
		double gap = 0;

		if (i > 0 && r->parent != NULL && t->rows[i - 1].el == r->parent) {
			int any = 0;

			for (size_t j = i; j < t->nrows && !any; j++)
				any = same_branch(&t->rows[j], r) && t->rows[j].el->type != EL_SPACE;
			trace_branch_name(r->parent, r->port, br, sizeof br);
			for (unsigned d = 1; d < r->depth; d++)
				buf_add(b, "  ");
			buf_printf(b, "- branch %s:%s\n", br, any ? "" :
			    " free space only: **the beam leaves the bench**");
		}
		if (r->el->type == EL_SPACE)
			continue;
		/* the free space before it in its own branch */
		for (size_t j = i; j-- > 0;) {
			if (!same_branch(&t->rows[j], r))
				continue;
			if (t->rows[j].el->type != EL_SPACE)
				break;
			gap += model_get(t->rows[j].el, K_LENGTH);
		}
		for (unsigned d = 0; d < r->depth; d++)
			buf_add(b, "  ");
		layout_percent(pct, sizeof pct, r->ratio);
		units_format(g, sizeof g, gap, DIM_LENGTH, 3, 0);
		buf_printf(b, "- %s (%s) after %s: %s%s%s\n", r->el->id, model_type_name(r->el->type),
		    g, r->status == STATUS_OVER ? "**OVER**" : layout_status_word(r->status),
		    isnan(r->ratio) ? "" : ", ", isnan(r->ratio) ? "" : pct);
	}
	buf_addc(b, '\n');
}

/* Every point's worst element, and the elements only points put in. */
static void
md_points(struct buf *b, const struct review *rv)
{
	const struct point_survey *sv = rv->survey;
	size_t nbase = rv->trace->nrows, extra = 0;

	buf_add(b, "## Operating points\n\n| point | changes | worst | ratio | status | "
	    "safe source power |\n|---|---|---|---:|---|---:|\n");
	for (size_t i = 0; i < sv->n; i++) {
		const struct point_summary *ps = &sv->pt[i];
		const struct point *p = i > 0 ? point_list_find(&rv->bench->points, ps->name) : NULL;
		char pct[32], v[48];
		struct buf ch;

		buf_init(&ch);
		for (size_t j = 0; p != NULL && j < p->n; j++)
			buf_printf(&ch, "%s%s", j ? "; " : "", p->change[j]);
		layout_percent(pct, sizeof pct, ps->worst_id != NULL ? ps->worst_ratio : NAN);
		if (ps->worst_id == NULL || isnan(ps->safe_source_power))
			snprintf(v, sizeof v, "-");
		else if (isinf(ps->safe_source_power))
			snprintf(v, sizeof v, "no limit");
		else
			units_format(v, sizeof v, ps->safe_source_power, DIM_POWER, 3, 0);
		buf_add(b, "|");
		md_cell(b, ps->name);
		md_cell(b, i == 0 ? "(the bench as recorded)" : ch.s != NULL ? ch.s : "");
		md_cell(b, ps->worst_id != NULL ? ps->worst_id : "-");
		md_cell(b, pct);
		md_cell(b, layout_status_word(ps->status));
		md_cell(b, v);
		buf_addc(b, '\n');
		buf_release(&ch);
	}
	buf_addc(b, '\n');
	/* the base's elements come first in the survey, in trace order */
	for (size_t i = nbase; i < sv->nel; i++) {
		char w[REVIEW_CELL];

		if (extra++ == 0)
			buf_add(b, "Elements only operating points put in:\n\n");
		review_survey_cell(sv, sv->el[i].id, w, sizeof w);
		buf_printf(b, "- %s: %s%s\n", sv->el[i].id, strcmp(w, "-") == 0 ? "" : "worst ",
		    strcmp(w, "-") == 0 ? "unrated at every point that puts it in" : w);
	}
	if (extra > 0)
		buf_addc(b, '\n');
}

char *
review_markdown(const struct review *rv)
{
	const struct trace *t = rv->trace;
	struct review_counts n;
	struct buf b;
	char *s, cells[REVIEW_NCOLS][REVIEW_CELL];

	buf_init(&b);
	review_count_all(rv, &n);
	buf_printf(&b, "# Review of bench %s, %s\n\n", rv->bench->name, rv->setup);
	buf_add(&b, "| | |\n|---|---|\n");
	md_row(&b, "Bench", rv->bench->name);
	md_row(&b, "Setup", rv->setup);
	md_row(&b, "Setup names", rv->setup_names);
	md_row(&b, "Recorded (UTC)", rv->time);
	md_row(&b, "Author", rv->author);
	md_row(&b, "Note", rv->note);
	md_row(&b, "Bench notes", rv->bench->notes);
	s = report_source_line(rv->bench, 0);
	md_row(&b, "Source", s);
	free(s);
	md_row(&b, "Read from", rv->origin);
	md_row(&b, "Content hash (SHA-256 of the bench file)", rv->hash);
	md_row(&b, "Printed (UTC)", rv->printed);
	buf_add(&b, "\n## Verdict\n\n");
	s = review_worst_text_of(rv);
	buf_printf(&b, "- **%s**\n", s);
	free(s);
	s = review_safe_text(t);
	buf_printf(&b, "- **%s**\n", s);
	free(s);
	buf_printf(&b, "- Elements over: %zu; caution: %zu; ok: %zu; unrated: %zu\n",
	    n.over, n.caution, n.ok, n.unrated);
	buf_printf(&b, "- Unterminated beams: %zu\n- Air-breakdown foci: %zu\n", n.unterminated,
	    n.air_breakdown);
	s = review_warnings_text(t);
	buf_printf(&b, "- %s\n", s);
	free(s);
	s = review_points_text(rv);
	buf_printf(&b, "- %s\n", s);
	free(s);
	if (rv->survey != NULL) {
		s = review_survey_worst_text(rv);
		buf_printf(&b, "- **%s**\n", s);
		free(s);
		s = review_survey_list_text(rv, 8);
		buf_printf(&b, "- %s\n", s);
		free(s);
	}
	buf_printf(&b, "- Safety factor %g: caution from %.0f %% of a threshold, over from 100 %%\n\n",
	    rv->bench->safety_factor, 100 / rv->bench->safety_factor);
	md_chain(&b, t);
	buf_add(&b, "## Beam profile\n\nThe profile plots (1/e² radii and power against z, one "
	    "per branch) are in the PDF and SVG forms of this review; the radii at every "
	    "element are in the table below.\n\n");
	buf_add(&b, "## Elements\n\n");
	if (rv->survey != NULL)
		buf_add(&b, "Values at the base; the last column is the element's worst ratio "
		    "over the base and every point, and where.\n\n");
	buf_add(&b, "|");
	for (int c = 0; c < REVIEW_NCOLS; c++)
		md_cell(&b, review_col_name(t, c));
	if (rv->survey != NULL)
		md_cell(&b, "worst, at point");
	buf_add(&b, "\n|");
	for (int c = 0; c < REVIEW_NCOLS; c++)
		buf_add(&b, c >= 2 && c <= 7 ? "---:|" : "---|");
	if (rv->survey != NULL)
		buf_add(&b, "---|");
	buf_addc(&b, '\n');
	for (size_t i = 0; i < t->nrows; i++) {
		char br[160];

		review_row_cells(t, &t->rows[i], cells);
		if (t->rows[i].depth > 0) {
			trace_branch_name(t->rows[i].parent, t->rows[i].port, br, sizeof br);
			s = xasprintf("%s (in %s)", cells[0], br);
			snprintf(cells[0], REVIEW_CELL, "%s", s);
			free(s);
		}
		if (t->rows[i].status == STATUS_OVER) {
			s = xasprintf("**%s**", cells[8]);
			snprintf(cells[8], REVIEW_CELL, "%s", s);
			free(s);
		}
		buf_add(&b, "|");
		for (int c = 0; c < REVIEW_NCOLS; c++)
			md_cell(&b, cells[c]);
		if (rv->survey != NULL) {
			char w[REVIEW_CELL];

			review_survey_cell(rv->survey, t->rows[i].el->id, w, sizeof w);
			md_cell(&b, w);
		}
		buf_addc(&b, '\n');
	}
	buf_addc(&b, '\n');
	if (rv->survey != NULL)
		md_points(&b, rv);
	if (t->nwarn > 0) {
		buf_add(&b, "## Warnings\n\n");
		for (size_t i = 0; i < t->nwarn; i++) {
			s = report_warning_text(t, &t->warn[i], 0);
			buf_printf(&b, "- %s\n", s);
			free(s);
		}
		buf_addc(&b, '\n');
	}
	if (rv->changes != NULL) {
		buf_printf(&b, "## Changes since %s\n\n", rv->since);
		if (rv->point != NULL || rv->survey != NULL)
			buf_add(&b, "Between the two setups as recorded (their base benches); the "
			    "operating points' own changes are in the verdict and the point list.\n\n");
		buf_add(&b, "```text\n");
		s = report_diff_text(rv->changes, rv->bench->name, rv->since,
		    rv->base_setup != NULL ? rv->base_setup : rv->setup);
		buf_add(&b, s);
		free(s);
		buf_add(&b, "```\n\n");
	} else {
		buf_printf(&b, "## Changes\n\n%s\n\n", rv->no_changes_why != NULL ?
		    rv->no_changes_why : "No earlier setup to compare with.");
	}
	buf_add(&b, "## Laser safety\n\n```text\n");
	buf_add(&b, report_safety_text);
	buf_add(&b, "```\n\n## Sign-off\n\n"
	    "Checked by: ______________________________  Signature: ________________\n\n"
	    "Laser safety officer: ______________________  Signature: ________________\n\n"
	    "Date: ________________\n");
	return buf_take(&b);
}
