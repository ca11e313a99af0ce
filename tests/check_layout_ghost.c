/* check_layout_ghost.c - what the workbench says about surface reflections
 * (core-layout-ghost.c): the reflections list worst first, its cells,
 * sentences and count line, the results lines of an element (the ghosts
 * that meet it, the ones it makes, its strays), the margin line's part,
 * and the value pane's labels and order for the newer keys.  The demo
 * bench is the fixture; every expected figure is counted here from the
 * trace's own ghost summaries, never copied from a run. */
#include <config.h>

#include <check.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "bench-demo.h"
#include "bench-file.h"
#include "core-edit.h"
#include "core-ghost.h"
#include "core-layout.h"
#include "core-trace.h"

#include "check-util.h"

static struct bench *
demo(void)
{
	char *cause = NULL;
	struct bench *b = bench_file_parse(bench_demo_text, strlen(bench_demo_text),
	    "demo", &cause);

	ck_assert_msg(b != NULL, "demo: %s", cause ? cause : "?");
	return b;
}

static long
row_of(const struct trace *t, const char *id)
{
	for (size_t i = 0; i < t->nrows; i++)
		if (strcmp(t->rows[i].el->id, id) == 0)
			return (long)i;
	ck_abort_msg("no row %s", id);
	return -1;
}

static int
sparks(const struct ghost_set *gs, const struct ghost *g)
{
	for (size_t k = 0; k < g->nfoci; k++)
		if (gs->foci[g->focus0 + k].air_breakdown)
			return 1;
	return 0;
}

static int
all_ascii(const char *s)
{
	for (; *s; s++)
		if ((unsigned char)*s >= 128)
			return 0;
	return 1;
}

/* ---- the list ---- */

/* Every ghost and stray once; the worst tier first; in a tier ghosts by
 * ratio, then strays by power; the row Enter goes to. */
START_TEST(test_reflections_order)
{
	struct bench *b = demo();
	struct trace *t = trace_run(b);
	const struct ghost_set *gs = t->ghosts;
	struct layout_refl *v;
	size_t n = layout_reflections(t, &v), spark_at = (size_t)-1, first_ok_ghost = (size_t)-1;
	unsigned char *seen_g, *seen_s;

	ck_assert_ptr_nonnull(gs);
	ck_assert_uint_gt(gs->n, 0);
	ck_assert_uint_gt(gs->nstrays, 0);
	ck_assert_int_eq(gs->rows_kept, 0);     /* the lean trace the workbench has */
	ck_assert_uint_eq(n, gs->n + gs->nstrays);
	seen_g = calloc(gs->n, 1);
	seen_s = calloc(gs->nstrays, 1);
	for (size_t i = 0; i < n; i++) {
		const struct layout_refl *r = &v[i];

		if (r->kind == LR_GHOST) {
			const struct ghost *g = &gs->g[r->index];
			enum damage_status st = damage_status_of(g->worst_ratio, b->safety_factor);
			int want = (g->flags & GF_OVER) || st == STATUS_OVER || sparks(gs, g) ? 2 :
			    st == STATUS_CAUTION ? 1 : 0;

			ck_assert_uint_lt(r->index, gs->n);
			ck_assert(!seen_g[r->index]);
			seen_g[r->index] = 1;
			ck_assert_int_eq(r->severity, want);
			if (g->worst_row >= 0)
				ck_assert_int_eq(r->row, g->worst_row);
			else
				ck_assert_int_ge(r->row, 0);    /* its own element */
			if (sparks(gs, g) && spark_at == (size_t)-1)
				spark_at = i;
			if (want == 0 && first_ok_ghost == (size_t)-1)
				first_ok_ghost = i;
		} else {
			const struct ghost_stray *s = &gs->strays[r->index];

			ck_assert_uint_lt(r->index, gs->nstrays);
			ck_assert(!seen_s[r->index]);
			seen_s[r->index] = 1;
			ck_assert_int_eq(r->severity, s->power >= b->stray_warn);
			ck_assert_ptr_eq(t->rows[r->row].el, s->from);
		}
		if (i == 0)
			continue;
		/* against the one before */
		ck_assert_int_le(r->severity, v[i - 1].severity);
		if (r->severity == v[i - 1].severity) {
			ck_assert(!(r->kind == LR_GHOST && v[i - 1].kind == LR_STRAY));
			if (r->kind == LR_GHOST && v[i - 1].kind == LR_GHOST) {
				double a = gs->g[v[i - 1].index].worst_ratio, c = gs->g[r->index].worst_ratio;

				ck_assert(isnan(c) || (!isnan(a) && a >= c));
			} else if (r->kind == LR_STRAY && v[i - 1].kind == LR_STRAY) {
				ck_assert(gs->strays[v[i - 1].index].power >= gs->strays[r->index].power);
			}
		}
	}
	/* the demo's L1.back ghost focuses in S8 and sparks: it is above every
	 * ghost that harms nothing, however the ratios fall */
	ck_assert_uint_ne(spark_at, (size_t)-1);
	ck_assert_uint_lt(spark_at, first_ok_ghost);
	free(seen_g);
	free(seen_s);
	free(v);
	trace_free(t);
	/* the main beam alone: nothing to list */
	t = trace_rerun_opts(NULL, b, TRACE_NO_GHOSTS);
	ck_assert_uint_eq(layout_reflections(t, &v), 0);
	ck_assert_ptr_null(v);
	trace_free(t);
	model_bench_free(b);
}
END_TEST

START_TEST(test_reflection_cells)
{
	struct bench *b = demo();
	struct trace *t = trace_run(b);
	const struct ghost_set *gs = t->ghosts;
	struct layout_refl *v;
	size_t n = layout_reflections(t, &v);
	int spark = 0, second = 0, block = 0;

	for (size_t i = 0; i < n; i++) {
		struct layout_refl_cells c, ca;
		char *s = layout_reflection_text(t, &v[i], 0), *sa = layout_reflection_text(t, &v[i], 1);

		layout_reflection_cells(t, &v[i], 0, &c);
		layout_reflection_cells(t, &v[i], 1, &ca);
		ck_assert(all_ascii(ca.kind) && all_ascii(ca.name) && all_ascii(ca.power) &&
		    all_ascii(ca.ratio) && all_ascii(ca.note) && all_ascii(sa));
		if (v[i].kind == LR_GHOST) {
			const struct ghost *g = &gs->g[v[i].index];
			char s0[96], s1[96];

			ghost_surface_name(g, 0, s0, sizeof s0);
			ck_assert_ptr_eq(strstr(c.name, s0), c.name);   /* its first reflection first */
			ck_assert_ptr_nonnull(strstr(s, c.name));
			if (g->order == 2) {
				ghost_surface_name(g, 1, s1, sizeof s1);
				ck_assert_ptr_nonnull(strstr(c.name, " \u2192 "));
				ck_assert_ptr_nonnull(strstr(ca.name, " -> "));
				ck_assert_ptr_nonnull(strstr(c.name, s1));
				ck_assert_ptr_nonnull(strstr(s, "second-order"));
				second = 1;
			}
			if (sparks(gs, g)) {
				ck_assert_str_eq(c.word, "spark");
				ck_assert_int_eq(c.status, STATUS_OVER);
				ck_assert_ptr_nonnull(strstr(c.note, "sparks"));
				ck_assert_ptr_nonnull(strstr(s, "sparks in air"));
				spark = 1;
			}
			if (g->worst_row >= 0)
				ck_assert_str_eq(c.where, t->rows[g->worst_row].el->id);
		} else {
			const struct ghost_stray *st = &gs->strays[v[i].index];

			ck_assert_ptr_eq(strstr(c.name, st->from->id), c.name);
			ck_assert_str_eq(c.kind, "stray");
			if (st->power >= b->stray_warn) {
				ck_assert_str_eq(c.word, "block");
				ck_assert_ptr_nonnull(strstr(s, "block or dump it"));
				block++;
			} else {
				ck_assert_str_eq(c.word, "low");
			}
		}
		free(s);
		free(sa);
	}
	ck_assert(spark && second);
	ck_assert_int_eq(block, (int)layout_strays_to_block(t));
	free(v);
	trace_free(t);
	model_bench_free(b);
}
END_TEST

START_TEST(test_reflection_count)
{
	struct bench *b = demo();
	struct trace *t = trace_run(b);
	const struct ghost_set *gs = t->ghosts;
	size_t block = 0;
	char want[96], *s, *narrow;

	for (size_t i = 0; i < gs->nstrays; i++)
		block += gs->strays[i].power >= b->stray_warn;
	ck_assert_uint_gt(block, 0);
	ck_assert_uint_eq(layout_strays_to_block(t), block);
	s = layout_reflection_count(t, 0, 400);
	snprintf(want, sizeof want, "%zu ghosts: %zu over, ", gs->n, gs->nover);
	ck_assert_ptr_eq(strstr(s, want), s);
	snprintf(want, sizeof want, "%zu strays: %zu to block", gs->nstrays, block);
	ck_assert_ptr_nonnull(strstr(s, want));
	ck_assert_ptr_nonnull(strstr(s, "back at the source"));
	free(s);
	/* the screen's line at 80 columns: whole, with the returned power */
	s = layout_reflection_count(t, 0, 79);
	ck_assert_int_le((int)utf8_cols(s), 79);
	ck_assert_ptr_nonnull(strstr(s, "back to source"));
	narrow = layout_reflection_count(t, 1, 60);
	ck_assert_ptr_null(strstr(narrow, "source"));
	ck_assert_ptr_nonnull(strstr(narrow, want));
	ck_assert(all_ascii(narrow));
	free(s);
	free(narrow);
	/* the settings' pane at 80 columns has 43: the counts that matter */
	s = layout_reflection_count(t, 0, 43);
	ck_assert_int_le((int)utf8_cols(s), 43);
	snprintf(want, sizeof want, "%zu ghosts, %zu over", gs->n, gs->nover);
	ck_assert_ptr_eq(strstr(s, want), s);
	snprintf(want, sizeof want, "%zu strays to block", block);
	ck_assert_ptr_nonnull(strstr(s, want));
	free(s);
	trace_free(t);
	model_bench_free(b);
}
END_TEST

/* ---- an element's results ---- */

START_TEST(test_ghost_meet)
{
	struct bench *b = demo();
	struct trace *t = trace_run(b);
	const struct ghost_set *gs = t->ghosts;
	long w1 = row_of(t, "W1");
	const struct ghost_at *at = &gs->at[w1];
	struct layout_line l[4];
	size_t n = layout_ghost_meet(t, (size_t)w1, 0, l, 4);
	char want[128], pa[32], pb[32], name[200];

	ck_assert_uint_gt(at->nmet, 0);
	ck_assert(!isnan(at->main_ratio));
	ck_assert_int_ge(at->top, 0);
	ck_assert_uint_eq(n, 2);
	ck_assert_str_eq(l[0].label, "ghosts in");
	snprintf(want, sizeof want, "%zu meet it, +", at->nmet);
	ck_assert_ptr_eq(strstr(l[0].text, want), l[0].text);
	/* the main beam's own ratio and the combined one, in that order */
	layout_percent(pa, sizeof pa, at->main_ratio);
	layout_percent(pb, sizeof pb, t->rows[w1].ratio);
	snprintf(want, sizeof want, "%s alone, %s with them", pa, pb);
	ck_assert_ptr_nonnull(strstr(l[0].text, want));
	ck_assert_int_eq(l[0].level, t->rows[w1].status);
	ck_assert_str_eq(l[1].label, "most");
	layout_ghost_name(&gs->g[at->top], 0, name, sizeof name);
	ck_assert_ptr_eq(strstr(l[1].text, name), l[1].text);
	layout_lines_free(l, n);
	/* a gap rates nothing: no lines, though ghosts cross it */
	{
		long s9 = row_of(t, "S9");

		ck_assert_uint_gt(gs->at[s9].nmet, 0);
		ck_assert_uint_eq(layout_ghost_meet(t, (size_t)s9, 0, l, 4), 0);
	}
	/* an unrated optic: the count, no ratio */
	{
		long pol = row_of(t, "POL1");

		ck_assert(isnan(t->rows[pol].ratio));
		n = layout_ghost_meet(t, (size_t)pol, 0, l, 4);
		if (gs->at[pol].nmet > 0) {
			ck_assert_uint_ge(n, 1);
			ck_assert_ptr_nonnull(strstr(l[0].text, "unrated"));
			ck_assert_ptr_null(strstr(l[0].text, "alone"));
		}
		layout_lines_free(l, n < 4 ? n : 4);
	}
	/* W1's ghosts leave its ratio as it is: said after the rest; CM1's
	 * raise it by more than a tenth: said beside the rating */
	{
		long cm1 = row_of(t, "CM1");

		ck_assert_int_eq(t->rows[w1].status, damage_status_of(at->main_ratio, b->safety_factor));
		ck_assert(t->rows[w1].ratio < 1.1 * at->main_ratio);
		ck_assert_int_eq(layout_ghost_matters(t, (size_t)w1), 0);
		ck_assert(t->rows[cm1].ratio >= 1.1 * gs->at[cm1].main_ratio);
		ck_assert_int_eq(layout_ghost_matters(t, (size_t)cm1), 1);
		ck_assert_int_eq(layout_ghost_matters(t, (size_t)row_of(t, "S9")), 0);
	}
	/* asking for fewer still counts them */
	ck_assert_uint_eq(layout_ghost_meet(t, (size_t)w1, 0, l, 1), 2);
	layout_lines_free(l, 1);
	trace_free(t);
	model_bench_free(b);
}
END_TEST

START_TEST(test_ghost_made)
{
	struct bench *b = demo();
	struct trace *t = trace_run(b);
	const struct ghost_set *gs = t->ghosts;
	long l1 = row_of(t, "L1"), pbs = row_of(t, "PBS1");
	const struct element *el = t->rows[l1].el;
	size_t mine = 0, nl, strays = 0, blocks = 0;
	double worst = -1;
	struct layout_line l[16];

	for (size_t i = 0; i < gs->n; i++) {
		const struct ghost *g = &gs->g[i];

		if (g->surf_el[0] == el || (g->order == 2 && g->surf_el[1] == el)) {
			mine++;
			if (!isnan(g->worst_ratio) && g->worst_ratio > worst)
				worst = g->worst_ratio;
		}
	}
	ck_assert_uint_gt(mine, 3);          /* its own two and pairs with the others */
	nl = layout_ghost_made(t, (size_t)l1, 0, 3, l, 16);
	/* three of them, then how many more */
	ck_assert_uint_eq(nl, 4);
	ck_assert_str_eq(l[0].label, "makes");
	ck_assert_str_eq(l[1].label, "");
	{
		char pct[32], want[80];

		layout_percent(pct, sizeof pct, worst);
		snprintf(want, sizeof want, " %s ", pct);
		ck_assert_ptr_nonnull(strstr(l[0].text, want));     /* the worst first */
	}
	{
		char want[80];

		snprintf(want, sizeof want, "+%zu more ghost", mine - 3);
		ck_assert_ptr_eq(strstr(l[3].text, want), l[3].text);
	}
	layout_lines_free(l, nl);
	/* PBS1 throws strays: one line each, those to block said so */
	for (size_t i = 0; i < gs->nstrays; i++)
		if (gs->strays[i].from == t->rows[pbs].el) {
			strays++;
			blocks += gs->strays[i].power >= b->stray_warn;
		}
	ck_assert_uint_gt(strays, 0);
	ck_assert_uint_gt(blocks, 0);
	{
		int any;
		size_t bk = 0;

		nl = layout_ghost_strays(t, (size_t)pbs, 0, &any, l, 16);
		ck_assert_uint_eq(nl, strays);
		ck_assert_str_eq(l[0].label, "strays");
		for (size_t i = 0; i < nl && i < 16; i++) {
			if (i > 0)
				ck_assert_str_eq(l[i].label, "");
			bk += strstr(l[i].text, "block it") != NULL;
		}
		ck_assert_uint_eq(bk, blocks);
		ck_assert_int_eq(any, 1);
		layout_lines_free(l, nl < 16 ? nl : 16);
		/* L1, untilted, throws none */
		ck_assert_uint_eq(layout_ghost_strays(t, (size_t)l1, 0, &any, l, 16), 0);
		ck_assert_int_eq(any, 0);
	}
	trace_free(t);
	model_bench_free(b);
}
END_TEST

/* ---- the margin line ---- */

START_TEST(test_margin_reflections)
{
	struct bench *b = demo();
	struct trace *t = trace_run(b);
	size_t block = layout_strays_to_block(t);
	char want[128], *s;
	char *cause = NULL;

	ck_assert_uint_eq(t->ghosts->nover, 0);
	ck_assert_uint_gt(block, 0);
	s = layout_margin_line(t, 0, 400, "saved 12:00");
	snprintf(want, sizeof want, "reflections: 0 ghosts over, %zu strays to block", block);
	ck_assert_ptr_nonnull(strstr(s, want));
	free(s);
	for (int w = 80; w <= 200; w++) {
		s = layout_margin_line(t, 0, w, w % 2 ? "saved 12:34" : NULL);
		ck_assert_msg((int)utf8_cols(s) <= w, "%d columns: %s", w, s);
		ck_assert_ptr_nonnull(strstr(s, "W1 109 % OVER"));
		ck_assert_ptr_nonnull(strstr(s, "safe source power"));
		ck_assert_ptr_nonnull(strstr(s, "hazards"));
		snprintf(want, sizeof want, "%zu strays", block);
		ck_assert_msg(strstr(s, want) != NULL, "%d columns: %s", w, s);
		free(s);
	}
	/* at 80 columns, nothing saved yet: still "worst:" and the headroom */
	s = layout_margin_line(t, 0, 80, NULL);
	ck_assert_ptr_eq(strstr(s, "worst: W1 109 % OVER \u00d70.9"), s);
	free(s);
	trace_free(t);
	/* strays under a raised level: nothing to block, said only with room */
	ck_assert_int_eq(edit_set_bench(b, "stray_warn", "1 W", &cause), 0);
	t = trace_run(b);
	ck_assert_uint_eq(layout_strays_to_block(t), 0);
	s = layout_margin_line(t, 0, 400, NULL);
	ck_assert_ptr_nonnull(strstr(s, "reflections: no ghost over, no stray to block"));
	free(s);
	s = layout_margin_line(t, 0, 80, NULL);
	ck_assert_ptr_null(strstr(s, "stray"));
	free(s);
	/* and saying nothing never costs the hazard count its detail */
	{
		char *full = layout_margin_line(t, 0, 400, NULL), *bar = strstr(full, "  \u2502  reflections");
		int w;

		ck_assert_ptr_nonnull(bar);
		w = (int)utf8_cols(full) - 1;
		free(full);
		s = layout_margin_line(t, 0, w, NULL);
		ck_assert_ptr_nonnull(strstr(s, "hazards: "));
		ck_assert_ptr_null(strstr(s, "reflections"));
		free(s);
	}
	trace_free(t);
	/* a window reflecting 80 % from each surface: its ghost is over upstream */
	ck_assert_int_eq(edit_set(b, "W1", "surface_reflectance", "0.8", &cause), 0);
	t = trace_run(b);
	ck_assert_uint_gt(t->ghosts->nover, 0);
	for (int w = 80; w <= 200; w += 7) {
		s = layout_margin_line(t, 0, w, NULL);
		snprintf(want, sizeof want, "%zu ghost%s over", t->ghosts->nover,
		    t->ghosts->nover == 1 ? "" : "s");
		ck_assert_msg(strstr(s, want) != NULL, "%d columns: %s", w, s);
		ck_assert_int_le((int)utf8_cols(s), w);
		free(s);
	}
	trace_free(t);
	/* the main beam alone says nothing of reflections */
	t = trace_rerun_opts(NULL, b, TRACE_NO_GHOSTS);
	s = layout_margin_line(t, 0, 400, NULL);
	ck_assert_ptr_null(strstr(s, "reflections"));
	ck_assert_ptr_null(strstr(s, "ghost"));
	free(s);
	trace_free(t);
	model_bench_free(b);
}
END_TEST

/* ---- labels and the value pane's order ---- */

START_TEST(test_key_labels)
{
	enum layout_key_group g;

	for (int k = 0; k < K_COUNT; k++) {
		const char *l = layout_key_label(k, &g);

		ck_assert_ptr_nonnull(l);
		/* a human label, not the file's key, in a real group */
		ck_assert_msg(strcmp(l, model_keys[k].name) != 0 || strlen(l) <= 6 ||
		    strchr(l, '_') == NULL, "key %s has no label", model_keys[k].name);
		ck_assert_msg(g != LKG_ELEMENT && g < LKG_COUNT, "key %s has no group",
		    model_keys[k].name);
		ck_assert_msg((int)utf8_cols(l) <= LAYOUT_LABEL_COLS, "label '%s' too wide", l);
		ck_assert_str_ne(layout_group_name(g), "");
	}
	/* each of the newer keys by name */
	{
		static const struct { int key; enum layout_key_group g; } want[] = {
			{ K_R1, LKG_OPTIC }, { K_R2, LKG_OPTIC }, { K_MATERIAL, LKG_MATERIAL },
			{ K_BREWSTER, LKG_OPTIC }, { K_SURF_R, LKG_REFLECTION },
			{ K_SURF_R_BACK, LKG_REFLECTION }, { K_LEAK, LKG_REFLECTION },
			{ K_REFLECTIVE, LKG_REFLECTION }, { K_ISOLATION, LKG_OPTIC },
		};

		for (int i = 0; i < NELEMS(want); i++) {
			const char *l = layout_key_label(want[i].key, &g);

			ck_assert_int_eq(g, want[i].g);
			ck_assert_str_ne(l, model_keys[want[i].key].name);
		}
	}
	/* on glass the angle is a tilt that decides ghost or stray */
	ck_assert_str_eq(layout_key_label_for(EL_LENS, K_AOI, &g), "tilt (aoi)");
	ck_assert_int_eq(g, LKG_REFLECTION);
	ck_assert_str_eq(layout_key_label_for(EL_MIRROR, K_AOI, &g), "angle of incidence");
	ck_assert_int_eq(g, LKG_OPTIC);
	/* the bench's keys too */
	for (const char *const *k = edit_bench_keys; *k != NULL; k++) {
		const char *l = layout_bench_key_label(*k, &g);

		ck_assert_msg((int)utf8_cols(l) <= LAYOUT_LABEL_COLS, "label '%s' too wide", l);
		ck_assert_msg(strchr(l, '_') == NULL && strchr(l, '.') == NULL,
		    "bench key %s has no label", *k);
	}
	layout_bench_key_label("stray_warn", &g);
	ck_assert_int_eq(g, LKG_REFLECTION);
	layout_bench_key_label("ghost_tilt", &g);
	ck_assert_int_eq(g, LKG_REFLECTION);
}
END_TEST

/* Every type: all fields once, the groups in the pane's order, the names
 * last. */
START_TEST(test_field_order)
{
	static const enum layout_key_group rank_of[LKG_COUNT] = {
		[LKG_OPTIC] = 0, [LKG_MATERIAL] = 1, [LKG_DAMAGE] = 2, [LKG_REFLECTION] = 3,
		[LKG_ELEMENT] = 4, [LKG_BENCH] = 9, [LKG_SOURCE] = 9,
	};
	struct element el;
	struct layout_field f[64];
	size_t n, order[64], no;
	unsigned char seen[64];
	int last = -1;
	char *cause = NULL;

	ck_assert_int_eq(edit_element_new(&el, model_type_name((enum elem_type)_i), "X1", NULL, 0,
	    &cause), 0);
	n = layout_fields(&el, f, 64);
	ck_assert_uint_le(n, 64);
	no = layout_field_order(&el, f, n, order);
	ck_assert_uint_eq(no, n);
	memset(seen, 0, sizeof seen);
	for (size_t i = 0; i < no; i++) {
		enum layout_key_group g = LKG_ELEMENT;
		int rank;

		ck_assert_uint_lt(order[i], n);
		ck_assert(!seen[order[i]]);
		seen[order[i]] = 1;
		if (f[order[i]].kind == LF_KEY)
			layout_key_label_for(el.type, f[order[i]].key, &g);
		rank = (int)rank_of[g];
		ck_assert_int_lt(rank, 9);
		ck_assert_int_ge(rank, last);
		last = rank;
	}
	model_element_release(&el);
}
END_TEST

/* ---- a ghost on the profile ---- */

/* The demo's L1.back ghost on the profile to W1: a point at every element
 * of the path it meets, at that element's column, higher for a wider
 * radius; the lean trace gives none (it keeps no rows). */
START_TEST(test_profile_ghost)
{
	struct bench *b = demo();
	struct trace *t = trace_run(b), *rt = trace_rerun_opts(NULL, b, TRACE_GHOST_ROWS);
	const struct ghost_set *gs = rt->ghosts;
	size_t sel = (size_t)row_of(rt, "W1"), *path, np = layout_profile_path(rt, sel, &path);
	long gi = -1;
	struct layout_plot pl;
	struct layout_gpoint gp[64];

	ck_assert_int_eq(gs->rows_kept, 1);
	/* the same ghosts, in the same order, as the workbench's lean trace */
	ck_assert_uint_eq(gs->n, t->ghosts->n);
	for (size_t i = 0; i < gs->n; i++) {
		CHECK_REL(gs->g[i].power_start, t->ghosts->g[i].power_start, 1e-12);
		if (gs->g[i].order == 1 && strcmp(gs->g[i].surf_el[0]->id, "L1") == 0 &&
		    gs->g[i].surf[0] == GS_BACK)
			gi = (long)i;
	}
	ck_assert_int_ge(gi, 0);
	for (int band = 0; band < 2; band++) {
		size_t want = 0, n;

		ck_assert_int_eq((band ? layout_profile_band : layout_profile)(rt, path, np, sel, 60,
		    12, 4, &pl), 0);
		for (size_t k = 0; k < gs->g[gi].nrows; k++)
			for (size_t i = 0; i < np; i++)
				want += path[i] == gs->rows[gs->g[gi].row0 + k].trace_row;
		ck_assert_uint_gt(want, 3);
		n = layout_profile_ghost(rt, (size_t)gi, path, np, &pl, band, gp, 64);
		ck_assert_uint_eq(n, want);
		for (size_t i = 0; i < n; i++) {
			const struct ghost_row *r = NULL;
			double wi;

			for (size_t k = 0; k < gs->g[gi].nrows; k++)
				if (gs->rows[gs->g[gi].row0 + k].trace_row == gp[i].trace_row)
					r = &gs->rows[gs->g[gi].row0 + k];
			ck_assert_ptr_nonnull(r);
			wi = r->wx > r->wy ? r->wx : r->wy;
			ck_assert_int_eq(gp[i].col, layout_map_col(rt->rows[gp[i].trace_row].z, pl.z0,
			    pl.z1, pl.w));
			ck_assert_int_ge(gp[i].row, 0);
			ck_assert_int_lt(gp[i].row2, pl.hr);
			ck_assert_int_eq(gp[i].beyond, wi > pl.rmax);
			if (band)
				ck_assert_int_eq(gp[i].row + gp[i].row2, 2 * ((pl.hr - 1) / 2));
			for (size_t j = 0; j < n; j++) {
				const struct ghost_row *q = NULL;

				for (size_t k = 0; k < gs->g[gi].nrows; k++)
					if (gs->rows[gs->g[gi].row0 + k].trace_row == gp[j].trace_row)
						q = &gs->rows[gs->g[gi].row0 + k];
				if ((q->wx > q->wy ? q->wx : q->wy) > wi)
					ck_assert_int_le(gp[j].row, gp[i].row);   /* wider: higher */
			}
		}
		layout_plot_release(&pl);
	}
	/* the lean trace keeps no rows: nothing to lay over */
	ck_assert_int_eq(layout_profile(t, path, np, sel, 60, 12, 4, &pl), 0);
	ck_assert_uint_eq(layout_profile_ghost(t, (size_t)gi, path, np, &pl, 0, gp, 64), 0);
	layout_plot_release(&pl);
	free(path);
	trace_free(rt);
	trace_free(t);
	model_bench_free(b);
}
END_TEST

int
main(void)
{
	Suite *s = suite_create("layout-ghost");
	TCase *tc = tcase_create("reflections");

	tcase_add_test(tc, test_reflections_order);
	tcase_add_test(tc, test_reflection_cells);
	tcase_add_test(tc, test_reflection_count);
	tcase_add_test(tc, test_ghost_meet);
	tcase_add_test(tc, test_ghost_made);
	tcase_add_test(tc, test_margin_reflections);
	tcase_add_test(tc, test_profile_ghost);
	suite_add_tcase(s, tc);
	tc = tcase_create("labels");
	tcase_add_test(tc, test_key_labels);
	tcase_add_loop_test(tc, test_field_order, 0, EL_NTYPES);
	suite_add_tcase(s, tc);
	return run_suite(s);
}
