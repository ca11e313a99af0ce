/* check_report.c - the printed review's layout core (core-report.c) and
 * the content hash (util-sha256.c): labels spread so none overlaps,
 * pagination that loses no row, profile samples that pass through the
 * trace and follow Gaussian propagation, schematic cells that never share
 * a place, SHA-256 against the standard's examples; the words the review
 * shares with the table (compare's cells, the source line) and the
 * verdict's survey of every operating point. */
#include <config.h>

#include <check.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "bench-demo.h"
#include "bench-file.h"
#include "core-layout.h"
#include "core-report.h"
#include "core-trace.h"
#include "core-point.h"
#include "report-diff.h"
#include "report-review.h"
#include "report.h"
#include "util-err.h"
#include "util-sha256.h"

#include "check-util.h"

static struct bench *
parse(const char *text)
{
	char *cause = NULL;
	struct bench *b = bench_file_parse(text, strlen(text), "test", &cause);

	ck_assert_msg(b != NULL, "bench: %s", cause ? cause : "?");
	return b;
}

/* ---- SHA-256: FIPS 180-2, appendix B (B.1, B.2, B.3), and the empty
 * message (from memory; it is also what sha256sum prints for /dev/null) ---- */
static const struct { const char *msg; int million_a; const char *hex; } sha_cases[] = {
	{ "abc", 0, "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad" },
	{ "", 0, "e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855" },
	{ "abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq", 0,
	  "248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1" },
	{ NULL, 1, "cdc76e5c9914fb9281a1c7e284d73e67f1809a48a497200e046d39ccc7112cd0" },
};

START_TEST(test_sha256)
{
	char hex[65];

	if (sha_cases[_i].million_a) {
		char *a = malloc(1000000);

		memset(a, 'a', 1000000);
		sha256_hex(a, 1000000, hex);
		free(a);
	} else {
		sha256_hex(sha_cases[_i].msg, strlen(sha_cases[_i].msg), hex);
	}
	ck_assert_str_eq(hex, sha_cases[_i].hex);
}
END_TEST

/* ---- labels ---- */

START_TEST(test_labels_same_z)
{
	/* three labels at one z, 20 wide: one per level */
	double x[] = { 100, 100, 100, 300 }, w[] = { 20, 20, 20, 20 };
	int lv[4];
	size_t crowded;
	int used = rep_labels_spread(x, w, NULL, 4, 3, 6, lv, &crowded);

	ck_assert_int_eq(used, 3);
	ck_assert_int_eq(crowded, 0);
	ck_assert(lv[0] != lv[1] && lv[1] != lv[2] && lv[0] != lv[2]);
	ck_assert_int_eq(lv[3], 0);      /* far away: the first level */
}
END_TEST

START_TEST(test_labels_never_overlap)
{
	/* fixed-seed random labels: on a level, no two boxes come closer than gap */
	struct gen g = { 12345, 0 };
	double x[60], w[60], gap = 2;
	int lv[60];
	size_t crowded;

	for (int i = 0; i < 60; i++) {
		x[i] = gen_uniform(&g, 0, 500);
		w[i] = gen_uniform(&g, 5, 30);
	}
	rep_labels_spread(x, w, NULL, 60, gap, 100, lv, &crowded);
	ck_assert_int_eq(crowded, 0);
	for (int i = 0; i < 60; i++)
		for (int j = i + 1; j < 60; j++)
			if (lv[i] == lv[j])
				ck_assert_msg(x[i] + w[i] / 2 + gap <= x[j] - w[j] / 2 ||
				    x[j] + w[j] / 2 + gap <= x[i] - w[i] / 2,
				    "labels %d and %d overlap on level %d", i, j, lv[i]);
}
END_TEST

START_TEST(test_labels_crowded)
{
	/* three at one place, two levels: the one of least priority is left
	 * out, whatever its order */
	double x[] = { 50, 50, 50 }, w[] = { 10, 10, 10 };
	int lv[3], prio[] = { 0, 2, 1 };
	size_t crowded;

	ck_assert_int_eq(rep_labels_spread(x, w, prio, 3, 1, 2, lv, &crowded), 2);
	ck_assert_int_eq(crowded, 1);
	ck_assert_int_eq(lv[0], -1);
	ck_assert_int_eq(lv[1], 0);
	ck_assert_int_eq(lv[2], 1);
	ck_assert_int_eq(rep_labels_spread(x, w, NULL, 0, 1, 2, lv, &crowded), 0);
}
END_TEST

START_TEST(test_labels_random_crowded)
{
	/* many labels on few levels: what is shown never overlaps */
	struct gen g = { 777, 0 };
	double x[200], w[200];
	int lv[200], prio[200];
	size_t crowded, shown = 0;

	for (int i = 0; i < 200; i++) {
		x[i] = gen_uniform(&g, 0, 500);
		w[i] = gen_uniform(&g, 8, 20);
		prio[i] = gen_chance(&g, 0.1);
	}
	rep_labels_spread(x, w, prio, 200, 2, 4, lv, &crowded);
	ck_assert_uint_gt(crowded, 0);
	for (int i = 0; i < 200; i++) {
		shown += lv[i] >= 0;
		for (int j = i + 1; j < 200; j++)
			if (lv[i] >= 0 && lv[i] == lv[j])
				ck_assert(x[i] + w[i] / 2 + 2 <= x[j] - w[j] / 2 ||
				    x[j] + w[j] / 2 + 2 <= x[i] - w[i] / 2);
	}
	ck_assert_uint_eq(shown + crowded, 200);
	/* every label of priority was placed before any other was */
	for (int i = 0; i < 200; i++)
		if (prio[i])
			ck_assert_int_ge(lv[i], 0);
}
END_TEST

/* ---- pagination ---- */

START_TEST(test_paginate_counts)
{
	/* page one: 55 - 5 header = 50 -> 5 rows of 10; later pages 105 - 5 = 100
	 * -> 10 rows: 23 rows are 5 + 10 + 8 on 3 pages (by hand) */
	double h[23];
	size_t pg[23], per[3] = { 0, 0, 0 };

	for (int i = 0; i < 23; i++)
		h[i] = 10;
	ck_assert_int_eq(rep_paginate(h, 23, 55, 105, 5, pg), 3);
	for (int i = 0; i < 23; i++) {
		ck_assert_uint_lt(pg[i], 3);
		if (i > 0)
			ck_assert_uint_ge(pg[i], pg[i - 1]);
		per[pg[i]]++;
	}
	ck_assert_uint_eq(per[0], 5);
	ck_assert_uint_eq(per[1], 10);
	ck_assert_uint_eq(per[2], 8);
	ck_assert_uint_eq(rep_paginate(h, 0, 55, 105, 5, pg), 0);
}
END_TEST

START_TEST(test_paginate_fits)
{
	/* random heights: every page's rows plus its header fit, none is lost */
	struct gen g = { 99, 0 };
	double h[500], used[200];
	size_t pg[500], n;

	for (int i = 0; i < 500; i++)
		h[i] = gen_uniform(&g, 6, 30);
	n = rep_paginate(h, 500, 300, 760, 11, pg);
	ck_assert_uint_le(n, 200);
	memset(used, 0, sizeof used);
	for (int i = 0; i < 500; i++)
		used[pg[i]] += h[i];
	for (size_t p = 0; p < n; p++) {
		ck_assert_msg(used[p] + 11 <= (p == 0 ? 300 : 760) + 1e-9, "page %zu overfull", p);
		ck_assert(used[p] > 0);
	}
	/* a row taller than a page still gets a page of its own */
	h[0] = 2000;
	ck_assert_uint_ge(rep_paginate(h, 3, 300, 760, 11, pg), 1);
	ck_assert_uint_eq(pg[0], 0);
}
END_TEST

START_TEST(test_map)
{
	CHECK_ABS(rep_map(0.5, 0, 2, 100, 300), 150, 1e-12);
	CHECK_ABS(rep_map(2, 0, 2, 300, 100), 100, 1e-12);    /* upward y */
	CHECK_ABS(rep_map(1, 1, 1, 7, 9), 7, 0);
}
END_TEST

/* ---- the profile ---- */

/* One free space of 5 m from a 1 mm waist at 1064 nm, M² 1, into a dump. */
static const char free_space[] =
	"{ \"format\": \"beamledger-bench-1\", \"name\": \"free\", \"source\": {"
	" \"wavelength\": \"1064 nm\", \"power\": \"1 W\", \"waist\": \"1 mm\", \"m2\": 1,"
	" \"polarization\": 0 }, \"path\": ["
	" { \"id\": \"S0\", \"type\": \"space\", \"length\": \"5 m\" },"
	" { \"id\": \"D1\", \"type\": \"dump\", \"max_power\": \"5 W\" } ] }";

START_TEST(test_profile_free_space)
{
	struct bench *b = parse(free_space);
	struct trace *t = trace_run(b);
	struct rep_profile p;
	size_t *ends, nb = rep_branch_ends(t, &ends);
	/* w(z) = w0 sqrt(1 + (z/zR)²), zR = π w0² / (M² λ) (Siegman, Lasers,
	 * 1986, ch. 17): zR = π·1e-6/1.064e-6 = 2.9526 m */
	double zr = M_PI * 1e-6 / 1.064e-6;

	ck_assert_uint_eq(nb, 1);
	ck_assert_int_eq(rep_profile_build(t, ends[0], 4, &p), 0);
	ck_assert_str_eq(p.branch, "main");
	for (size_t i = 0; i < p.ns; i++) {
		double z = p.s[i].z, w = 1e-3 * sqrt(1 + (z / zr) * (z / zr));

		CHECK_REL(p.s[i].wx, w, 1e-6);
		CHECK_REL(p.s[i].wy, w, 1e-6);
		/* 1 W all the way; after the dump's plane nothing goes on */
		CHECK_ABS(p.s[i].power, i + 1 < p.ns ? 1 : 0, 1e-12);
	}
	CHECK_ABS(p.z0, 0, 0);
	CHECK_ABS(p.z1, 5, 1e-12);
	/* samples at 0, 1.25, ... 5 m, then the dump's plane twice */
	ck_assert_uint_eq(p.ns, 7);
	CHECK_ABS(p.s[4].z, 5, 1e-12);
	/* the axis top: a round value above 1.9667 mm, w(5 m) by the formula */
	ck_assert(p.rmax >= 1.9667e-3 && p.rmax <= 2.5e-3);
	ck_assert_uint_eq(p.nmark, 1);
	rep_profile_release(&p);
	free(ends);
	trace_free(t);
	model_bench_free(b);
}
END_TEST

START_TEST(test_profile_demo_through_trace)
{
	struct bench *b = parse(bench_demo_text);
	struct trace *t = trace_run(b);
	size_t *ends, nb = rep_branch_ends(t, &ends);

	/* main, PBS1.reflected, POL1.rejected, BS1.reflected: four branches */
	ck_assert_uint_eq(nb, 4);
	ck_assert_str_eq(t->rows[ends[0]].el->id, "T1");
	ck_assert_str_eq(t->rows[ends[1]].el->id, "BD1");
	for (size_t k = 0; k < nb; k++) {
		struct rep_profile p;

		ck_assert_int_eq(rep_profile_build(t, ends[k], 8, &p), 0);
		/* every element plane on the path has a sample with the trace's radii */
		for (size_t i = 0; i < p.npath; i++) {
			const struct trace_row *r = &t->rows[p.path[i]];
			int found = 0;

			for (size_t j = 0; j < p.ns && !found; j++)
				found = p.s[j].z == r->z && p.s[j].wx == r->wx && p.s[j].wy == r->wy;
			ck_assert_msg(found, "no sample at %s", r->el->id);
		}
		for (size_t j = 1; j < p.ns; j++)
			ck_assert(p.s[j].z >= p.s[j - 1].z);
		for (size_t j = 0; j < p.ns; j++)
			ck_assert(p.s[j].wx <= p.rmax && p.s[j].power <= p.pmax);
		rep_profile_release(&p);
	}
	free(ends);
	trace_free(t);
	model_bench_free(b);
}
END_TEST

/* ---- the schematic ---- */

static void
no_shared_cells(const struct rep_schematic *sc)
{
	for (size_t i = 0; i < sc->n; i++)
		for (size_t j = i + 1; j < sc->n; j++)
			ck_assert_msg(sc->cell[i].col != sc->cell[j].col ||
			    sc->cell[i].lane != sc->cell[j].lane, "cells %zu and %zu share a place", i, j);
}

START_TEST(test_schematic_demo)
{
	struct bench *b = parse(bench_demo_text);
	struct trace *t = trace_run(b);
	struct rep_schematic sc;
	size_t elements = 0, main_n = 0;
	int lanes[8], row[64], strips;

	rep_schematic_build(t, &sc);
	for (size_t i = 0; i < t->nrows; i++)
		elements += t->rows[i].el->type != EL_SPACE;
	ck_assert_uint_eq(sc.n, elements);
	no_shared_cells(&sc);
	for (size_t k = 0; k < sc.n; k++) {
		const struct rep_cell *c = &sc.cell[k];

		if (t->rows[c->row].parent == NULL) {
			ck_assert_int_eq(c->lane, 0);
			ck_assert_int_eq(c->col, (int)main_n++);
		}
		if (c->owner >= 0) {
			ck_assert_int_eq(c->col, sc.cell[c->owner].col + 1);
			ck_assert_int_gt(c->lane, sc.cell[c->owner].lane);
		}
		if (c->prev >= 0) {
			ck_assert_int_eq(c->col, sc.cell[c->prev].col + 1);
			ck_assert_int_eq(c->lane, sc.cell[c->prev].lane);
		}
	}
	ck_assert_uint_eq(main_n, 12);   /* ISO1, HWP1 ... T1 */
	/* the spaces before ISO1 add up: S0 is 300 mm */
	CHECK_ABS(sc.cell[0].gap, 0.3, 1e-12);
	strips = rep_schematic_strips(&sc, 4, lanes, row);
	ck_assert_int_eq(strips, 3);
	for (size_t k = 0; k < sc.n; k++)
		ck_assert(row[k] >= 0 && row[k] < lanes[sc.cell[k].col / 4]);
	rep_schematic_release(&sc);
	trace_free(t);
	model_bench_free(b);
}
END_TEST

/* Splitter A's long branch takes lane 1 under the columns where the
 * branches of B and C would go: both go one lane further down, side by
 * side. */
static const char two_branches[] =
	"{ \"format\": \"beamledger-bench-1\", \"name\": \"two\", \"source\": {"
	" \"wavelength\": \"1064 nm\", \"power\": \"1 W\", \"waist\": \"1 mm\", \"m2\": 1,"
	" \"polarization\": 0 }, \"path\": ["
	" { \"id\": \"A\", \"type\": \"splitter\", \"reflectance\": 0.5, \"reflected\": ["
	"   { \"id\": \"a1\", \"type\": \"window\" }, { \"id\": \"a2\", \"type\": \"window\" },"
	"   { \"id\": \"a3\", \"type\": \"window\" }, { \"id\": \"a4\", \"type\": \"dump\" } ] },"
	" { \"id\": \"W\", \"type\": \"window\" },"
	" { \"id\": \"B\", \"type\": \"splitter\", \"reflectance\": 0.5, \"reflected\": ["
	"   { \"id\": \"b1\", \"type\": \"dump\" } ] },"
	" { \"id\": \"C\", \"type\": \"splitter\", \"reflectance\": 0.5, \"reflected\": ["
	"   { \"id\": \"c1\", \"type\": \"dump\" } ] },"
	" { \"id\": \"D\", \"type\": \"dump\" } ] }";

START_TEST(test_schematic_lanes)
{
	struct bench *b = parse(two_branches);
	struct trace *t = trace_run(b);
	struct rep_schematic sc;

	rep_schematic_build(t, &sc);
	no_shared_cells(&sc);
	for (size_t k = 0; k < sc.n; k++) {
		const char *id = t->rows[sc.cell[k].row].el->id;

		if (id[0] == 'a')
			ck_assert_int_eq(sc.cell[k].lane, 1);
		if (strcmp(id, "b1") == 0)      /* col 3: lane 1 is A's (cols 1..4) */
			ck_assert_int_eq(sc.cell[k].lane, 2);
		if (strcmp(id, "c1") == 0)      /* col 4: lane 1 is A's, lane 2 free after b1 */
			ck_assert_int_eq(sc.cell[k].lane, 2);
	}
	ck_assert_int_eq(sc.lanes, 3);
	ck_assert_int_eq(sc.cols, 5);
	rep_schematic_release(&sc);
	trace_free(t);
	model_bench_free(b);
}
END_TEST

/* ---- one vocabulary (issue 9 item 18): compare's status cells use the
 * table's percent form and status words ("OVER", as the table and the
 * workbench write it), and the source line writes the wavelength as the
 * workbench does, the shortest form that reads back ("532 nm") ---- */
static const struct { int present; double ratio; enum damage_status st; const char *want; }
    word_cases[] = {
	{ 1, 1.094, STATUS_OVER, "109 % OVER" },
	{ 1, 0.413, STATUS_OK, "41.3 % ok" },
	{ 1, 0.0091, STATUS_OK, "0.91 % ok" },
	{ 1, 0.00005, STATUS_OK, "<0.01 % ok" },
	{ 1, 0.6, STATUS_CAUTION, "60.0 % caution" },
	{ 1, NAN, STATUS_UNRATED, "unrated" },
	{ 0, 0.5, STATUS_OK, "absent" },
};

START_TEST(test_diff_words)
{
	char buf[64];

	report_diff_status(buf, sizeof buf, word_cases[_i].present, word_cases[_i].ratio,
	    word_cases[_i].st);
	ck_assert_str_eq(buf, word_cases[_i].want);
}
END_TEST

/* The source line writes values as typed (issue 9 item 8): "5 W", not "5.00 W". */
static const struct { const char *wl; int ascii; const char *start; } source_cases[] = {
	{ "532 nm", 0, "532 nm, CW 5 W" },
	{ "1064 nm", 0, "1.064 \u00b5m, CW 5 W" },
	{ "1064 nm", 1, "1.064 um, CW 5 W" },
	{ "632.8 nm", 0, "632.8 nm, CW 5 W" },
};

START_TEST(test_source_line_wavelength)
{
	char text[400], *line, *beam;
	struct bench *b;

	snprintf(text, sizeof text, "{\"format\": \"beamledger-bench-1\", \"name\": \"w\", "
	    "\"source\": {\"wavelength\": \"%s\", \"power\": \"5 W\", \"waist\": \"1 mm\"}, "
	    "\"path\": [{\"id\": \"S1\", \"type\": \"space\", \"length\": \"1 m\"}]}",
	    source_cases[_i].wl);
	b = parse(text);
	line = report_source_line(b, source_cases[_i].ascii);
	ck_assert_msg(strncmp(line, source_cases[_i].start, strlen(source_cases[_i].start)) == 0,
	    "'%s' does not start with '%s'", line, source_cases[_i].start);
	/* the same words as the workbench's beam summary */
	beam = layout_beam_summary(b, source_cases[_i].ascii);
	ck_assert_msg(strncmp(line, beam, strcspn(line, ",")) == 0, "'%s' vs '%s'", line, beam);
	free(beam);
	free(line);
	model_bench_free(b);
}
END_TEST

/* ---- the review of every operating point: the verdict's list and the
 * table's cell come from the survey, worst first ---- */
static struct bench *
demo_with_points(void)
{
	const char *at = strstr(bench_demo_text, "  \"path\": [");
	char *text;
	struct bench *b;

	ck_assert_ptr_nonnull(at);
	text = xasprintf("%.*s  \"points\": [ { \"name\": \"full\", \"changes\": "
	    "[\"source.pulse_energy=250 mJ\"] }, { \"name\": \"low\", \"changes\": "
	    "[\"source.pulse_energy=20 mJ\"] } ],\n%s", (int)(at - bench_demo_text),
	    bench_demo_text, at);
	b = parse(text);
	free(text);
	return b;
}

START_TEST(test_survey_texts)
{
	struct bench *b = demo_with_points();
	struct point_survey sv;
	struct review rv;
	char *cause = NULL, *s, cell[64], want[160], pct[32];
	const struct point_worst *w1;
	double base_w1 = NAN;
	size_t ncaution = 0;

	ck_assert_msg(point_survey_run(b, NULL, &sv, &cause) == 0, "%s", cause);
	memset(&rv, 0, sizeof rv);
	rv.bench = b;
	rv.trace = sv.base_trace;
	rv.survey = &sv;
	rv.npoints = b->points.n;
	/* hand: 'full' raises the pulse energy 200 -> 250 mJ and nothing else,
	 * so W1's fluence and ratio are 1.25 times the base's; 'low' lowers it */
	for (size_t i = 0; i < sv.base_trace->nrows; i++)
		if (strcmp(sv.base_trace->rows[i].el->id, "W1") == 0)
			base_w1 = sv.base_trace->rows[i].ratio;
	w1 = review_survey_worst(&sv, "W1");
	ck_assert_ptr_nonnull(w1);
	ck_assert_str_eq(sv.pt[w1->at].name, "full");
	ck_assert_double_eq_tol(w1->ratio / base_w1, 1.25, 1e-9);
	review_survey_cell(&sv, "W1", cell, sizeof cell);
	layout_percent(pct, sizeof pct, 1.25 * base_w1);
	snprintf(want, sizeof want, "%s at full", pct);
	ck_assert_str_eq(cell, want);
	review_survey_cell(&sv, "S0", cell, sizeof cell);
	ck_assert_str_eq(cell, "-");
	/* the list: worst first; with max 1 the rest are counted */
	for (size_t i = 0; i < sv.nel; i++)
		if (!isnan(sv.el[i].ratio) && sv.el[i].status >= STATUS_CAUTION)
			ncaution++;
	ck_assert_uint_ge(ncaution, 2);
	s = review_survey_list_text(&rv, 1);
	snprintf(want, sizeof want, "Over or at caution at some point: W1 %s OVER at full; "
	    "and %zu more", pct, ncaution - 1);
	ck_assert_msg(strncmp(s, want, strlen(want)) == 0, "'%s' vs '%s'", s, want);
	free(s);
	s = review_points_text(&rv);
	/* over at the base (W1 109 %) and at full; not at low (20 mJ: 1/10) */
	ck_assert_str_eq(s, "Operating points: 2 besides the base; something is over at 2 of "
	    "the 3 traced (the base included)");
	free(s);
	s = review_survey_worst_text(&rv);
	snprintf(want, sizeof want, "Worst over the base and every point: W1, %s", pct);
	ck_assert_msg(strncmp(s, want, strlen(want)) == 0, "'%s'", s);
	free(s);
	point_survey_release(&sv);
	model_bench_free(b);
}
END_TEST

#define LOOP(tc, fn, arr) tcase_add_loop_test(tc, fn, 0, (int)(sizeof arr / sizeof *arr))

int
main(void)
{
	Suite *s = suite_create("report");
	TCase *tc = tcase_create("hash");

	LOOP(tc, test_sha256, sha_cases);
	suite_add_tcase(s, tc);
	tc = tcase_create("layout");
	tcase_add_test(tc, test_labels_same_z);
	tcase_add_test(tc, test_labels_never_overlap);
	tcase_add_test(tc, test_labels_crowded);
	tcase_add_test(tc, test_labels_random_crowded);
	tcase_add_test(tc, test_paginate_counts);
	tcase_add_test(tc, test_paginate_fits);
	tcase_add_test(tc, test_map);
	suite_add_tcase(s, tc);
	tc = tcase_create("profile");
	tcase_add_test(tc, test_profile_free_space);
	tcase_add_test(tc, test_profile_demo_through_trace);
	suite_add_tcase(s, tc);
	tc = tcase_create("words");
	LOOP(tc, test_diff_words, word_cases);
	LOOP(tc, test_source_line_wavelength, source_cases);
	tcase_add_test(tc, test_survey_texts);
	suite_add_tcase(s, tc);
	tc = tcase_create("schematic");
	tcase_add_test(tc, test_schematic_demo);
	tcase_add_test(tc, test_schematic_lanes);
	suite_add_tcase(s, tc);
	return run_suite(s);
}
