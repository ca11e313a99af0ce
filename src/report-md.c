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
	for (size_t i = 0; i < t->nwarn; i++)
		if (t->warn[i].kind == TW_UNTERMINATED)
			c->unterminated++;
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
	snprintf(c[8], REVIEW_CELL, "%s", layout_status_word(r->status));
	report_flags(r->flags, c[9], REVIEW_CELL, ", ");
}

char *
review_worst_text(const struct trace *t)
{
	const struct trace_row *w;

	if (t->worst < 0)
		return xstrdup("Worst element: none (no element has a damage rating: nothing was checked)");
	w = &t->rows[t->worst];
	return xasprintf("Worst element: %s (%s), %.0f %% of its threshold (%s)", w->el->id,
	    model_type_name(w->el->type), t->worst_ratio * 100, layout_status_word(w->status));
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

char *
review_markdown(const struct review *rv)
{
	const struct trace *t = rv->trace;
	struct review_counts n;
	struct buf b;
	char *s, cells[REVIEW_NCOLS][REVIEW_CELL];

	buf_init(&b);
	review_count(t, &n);
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
	s = review_worst_text(t);
	buf_printf(&b, "- **%s**\n", s);
	free(s);
	s = review_safe_text(t);
	buf_printf(&b, "- **%s**\n", s);
	free(s);
	buf_printf(&b, "- Elements over: %zu; caution: %zu; ok: %zu; unrated: %zu\n",
	    n.over, n.caution, n.ok, n.unrated);
	buf_printf(&b, "- Unterminated beams: %zu\n- Air-breakdown foci: %zu\n", n.unterminated,
	    n.air_breakdown);
	buf_printf(&b, "- Safety factor %g: caution from %.0f %% of a threshold, over from 100 %%\n\n",
	    rv->bench->safety_factor, 100 / rv->bench->safety_factor);
	md_chain(&b, t);
	buf_add(&b, "## Beam profile\n\nThe profile plots (1/e² radii and power against z, one "
	    "per branch) are in the PDF and SVG forms of this review; the radii at every "
	    "element are in the table below.\n\n");
	buf_add(&b, "## Elements\n\n|");
	for (int c = 0; c < REVIEW_NCOLS; c++)
		md_cell(&b, review_col_name(t, c));
	buf_add(&b, "\n|");
	for (int c = 0; c < REVIEW_NCOLS; c++)
		buf_add(&b, c >= 2 && c <= 7 ? "---:|" : "---|");
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
		buf_addc(&b, '\n');
	}
	buf_addc(&b, '\n');
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
		buf_printf(&b, "## Changes since %s\n\n```text\n", rv->since);
		s = report_diff_text(rv->changes, rv->bench->name, rv->since, rv->setup);
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
