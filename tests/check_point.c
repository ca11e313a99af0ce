/* check_point.c - operating points: the grammar, applying a point to a copy
 * of the bench, the points section of the bench file, and the refusals
 * that name the point, the id and the key. */
#include <config.h>

#include <check.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "bench-file.h"
#include "core-diff.h"
#include "core-edit.h"
#include "core-point.h"
#include "core-trace.h"

#include "check-bench-util.h"
#include "check-util.h"

/* A 1 W CW line: M1, the absorbing ND1 (od 1), a splitter to a dump, and
 * a target.  The "alignment" point puts the source at 1 % and another ND
 * (od 2) in after ND1. */
#define ALIGN_BENCH \
	"{ 'format': 'beamledger-bench-1', 'name': 'align-test'," \
	"  'source': { 'wavelength': '1064 nm', 'power': '1 W', 'waist': '1 mm' }," \
	"  'path': [" \
	"    { 'id': 'S0', 'type': 'space', 'length': '100 mm' }," \
	"    { 'id': 'M1', 'type': 'mirror', 'reflectance': 0.99," \
	"      'damage': { 'cw_irradiance': '1 kW/cm^2' } }," \
	"    { 'id': 'S1', 'type': 'space', 'length': '100 mm' }," \
	"    { 'id': 'ND1', 'type': 'filter', 'od': 1, 'max_absorbed': '2 W' }," \
	"    { 'id': 'S2', 'type': 'space', 'length': '100 mm' }," \
	"    { 'id': 'FM1', 'type': 'mirror', 'reflectance': 0.5 }," \
	"    { 'id': 'S3', 'type': 'space', 'length': '100 mm' }," \
	"    { 'id': 'T1', 'type': 'target', 'max_power': '1 W' } ]%s }"

#define ALIGN_POINTS \
	", 'points': [ { 'name': 'alignment', 'changes': [ 'source.power=10 mW'," \
	"  '+filter:ND9@S2', 'ND9.od=2' ] }, { 'name': 'flip-down', 'changes': [ '-FM1' ] } ]"

static const struct row_power {
	const char *id;
	double base, align;     /* W arriving, by hand */
} align_rows[] = {
	/* base: 1 W; M1 reflects 0.99; ND1 passes 10^-1; FM1 0.5.
	 * alignment: 1 % of that up to ND9, then ND9 passes 10^-2 more. */
	{ "M1", 1.0, 0.01 },
	{ "ND1", 0.99, 0.0099 },
	{ "S2", 0.099, 0.00099 },
	{ "FM1", 0.099, 0.0000099 },
	{ "T1", 0.0495, 0.00000495 },
};

static const struct trace_row *
find_row(const struct trace *t, const char *id)
{
	for (size_t i = 0; i < t->nrows; i++)
		if (strcmp(t->rows[i].el->id, id) == 0)
			return &t->rows[i];
	return NULL;
}

/* An alignment point at 1 % with an ND in traces every element before that
 * ND at 1 % of the base power, and after it at 1 % x 10^-2 (by hand above). */
START_TEST(test_alignment_point)
{
	struct bench *b = bench_text("align.json", ALIGN_BENCH, ALIGN_POINTS), *a;
	struct trace *tb, *ta;
	char *cause = NULL;

	ck_assert_uint_eq(b->points.n, 2);
	a = point_apply(b, point_list_find(&b->points, "alignment"), &cause);
	ck_assert_msg(a != NULL, "%s", cause);
	ck_assert_uint_eq(a->points.n, 0);
	tb = trace_run(b);
	ta = trace_run(a);
	for (size_t i = 0; i < sizeof align_rows / sizeof *align_rows; i++) {
		const struct trace_row *rb = find_row(tb, align_rows[i].id);
		const struct trace_row *ra = find_row(ta, align_rows[i].id);

		ck_assert_ptr_nonnull(rb);
		ck_assert_ptr_nonnull(ra);
		ck_assert_double_eq_tol(rb->power_in, align_rows[i].base, 1e-12);
		ck_assert_double_eq_tol(ra->power_in, align_rows[i].align, 1e-12);
	}
	ck_assert_ptr_null(find_row(tb, "ND9"));
	ck_assert_ptr_nonnull(find_row(ta, "ND9"));
	/* the base bench is untouched */
	ck_assert_double_eq(b->src.power, 1.0);
	ck_assert_ptr_null(model_find(b, "ND9", NULL, NULL, NULL));
	trace_free(tb);
	trace_free(ta);
	model_bench_free(a);
	model_bench_free(b);
}
END_TEST

/* A flip mirror down: the element is skipped as if absent, so the target
 * gets ND1's output, 0.099 W, instead of half of it. */
START_TEST(test_taken_out)
{
	struct bench *b = bench_text("align.json", ALIGN_BENCH, ALIGN_POINTS), *a;
	struct trace *t;
	char *cause = NULL;

	a = point_apply(b, point_list_find(&b->points, "flip-down"), &cause);
	ck_assert_msg(a != NULL, "%s", cause);
	ck_assert_ptr_null(model_find(a, "FM1", NULL, NULL, NULL));
	t = trace_run(a);
	ck_assert_double_eq_tol(find_row(t, "T1")->power_in, 0.099, 1e-12);
	trace_free(t);
	model_bench_free(a);
	model_bench_free(b);
}
END_TEST

/* The section reads back as written. */
START_TEST(test_file_round_trip)
{
	struct bench *b = bench_text("align.json", ALIGN_BENCH, ALIGN_POINTS), *c;
	char *text = bench_file_dump(b), *again, *cause = NULL;

	ck_assert_ptr_nonnull(strstr(text, "\"points\""));
	c = bench_file_parse(text, strlen(text), "dump", &cause);
	ck_assert_msg(c != NULL, "%s", cause);
	ck_assert_uint_eq(c->points.n, 2);
	ck_assert_str_eq(c->points.p[0].name, "alignment");
	ck_assert_uint_eq(c->points.p[0].n, 3);
	ck_assert_str_eq(c->points.p[0].change[1], "+filter:ND9@S2");
	again = bench_file_dump(c);
	ck_assert_str_eq(text, again);
	free(text);
	free(again);
	model_bench_free(b);
	model_bench_free(c);
}
END_TEST

/* A bench without the section has no points and writes none. */
START_TEST(test_no_section)
{
	struct bench *b = bench_text("plain.json", ALIGN_BENCH, "");
	char *text = bench_file_dump(b);

	ck_assert_uint_eq(b->points.n, 0);
	ck_assert_ptr_null(strstr(text, "points"));
	free(text);
	model_bench_free(b);
}
END_TEST

/* Points in a file that must be refused, with the words the message needs:
 * the file, the point, the id and the key. */
static const struct { const char *points, *words[3]; } bad_files[] = {
	{ ", 'points': [ { 'name': 'p', 'changes': [ 'NOPE.od=2' ] } ]",
	  { "point 'p'", "NOPE", NULL } },
	{ ", 'points': [ { 'name': 'p', 'changes': [ 'ND1.focal=2 mm' ] } ]",
	  { "point 'p'", "ND1", "focal" } },
	{ ", 'points': [ { 'name': 'p', 'changes': [ 'ND1.od=lots' ] } ]",
	  { "point 'p'", "ND1", "od" } },
	{ ", 'points': [ { 'name': 'p', 'changes': [ 'ND1.bogus=1' ] } ]",
	  { "point 'p'", "ND1", "bogus" } },
	{ ", 'points': [ { 'name': 'p', 'changes': [ 'source.power=3 m' ] } ]",
	  { "point 'p'", "source.power", NULL } },
	{ ", 'points': [ { 'name': 'p', 'changes': [ '-NOPE' ] } ]",
	  { "point 'p'", "NOPE", NULL } },
	{ ", 'points': [ { 'name': 'p', 'changes': [ '+filter:ND9@NOPE' ] } ]",
	  { "point 'p'", "NOPE", NULL } },
	{ ", 'points': [ { 'name': 'p', 'changes': [ '+flange:X1@S0' ] } ]",
	  { "point 'p'", "flange", NULL } },
	{ ", 'points': [ { 'name': 'p', 'changes': [ '+filter:M1@S0' ] } ]",
	  { "point 'p'", "M1", "already" } },
	{ ", 'points': [ { 'name': 'p', 'changes': [ 'just text' ] } ]",
	  { "point 'p'", "ID.KEY=VALUE", NULL } },
	{ ", 'points': [ { 'name': 'p', 'changes': [] } ]", { "point 'p'", "changes", NULL } },
	{ ", 'points': [ { 'name': 'p', 'changes': [ 'ND1.od=2' ], 'x': 1 } ]",
	  { "point 'p'", "'x'", NULL } },
	{ ", 'points': [ { 'name': 'p', 'changes': [ 'ND1.od=2' ] },"
	  " { 'name': 'p', 'changes': [ 'ND1.od=3' ] } ]", { "point 'p'", "twice", NULL } },
	{ ", 'points': [ { 'name': 'base', 'changes': [ 'ND1.od=2' ] } ]", { "'base'", NULL, NULL } },
	{ ", 'points': { 'p': [] }", { "points", "array", NULL } },
	/* a terminator put before another element: refused by the bench's rules */
	{ ", 'points': [ { 'name': 'p', 'changes': [ '+dump:BD9@S0' ] } ]",
	  { "point 'p'", "BD9", NULL } },
};

START_TEST(test_bad_points)
{
	char text[8192], *cause = NULL;
	struct bench *b;
	int n = snprintf(text, sizeof text, ALIGN_BENCH, bad_files[_i].points);

	ck_assert(n > 0 && (size_t)n < sizeof text);
	bench_quote(text);
	b = bench_file_parse(text, strlen(text), "bad.json", &cause);
	ck_assert_ptr_null(b);
	ck_assert_ptr_nonnull(cause);
	ck_assert_msg(strncmp(cause, "bad.json", 8) == 0, "no file name: %s", cause);
	for (int w = 0; w < 3 && bad_files[_i].words[w] != NULL; w++)
		ck_assert_msg(strstr(cause, bad_files[_i].words[w]) != NULL,
		    "message '%s' lacks '%s'", cause, bad_files[_i].words[w]);
	free(cause);
}
END_TEST

/* point_edit_add and point_edit_remove are all-or-nothing. */
START_TEST(test_edit_add_remove)
{
	struct bench *b = bench_text("plain.json", ALIGN_BENCH, "");
	char *good[] = { "source.power=20 mW", "ND1.od=3" };
	char *bad[] = { "ND1.od=3", "NOPE.length=1 m" };
	char *cause = NULL;

	ck_assert_int_eq(point_edit_add(b, "align", good, 2, &cause), 0);
	ck_assert_uint_eq(b->points.n, 1);
	ck_assert_int_ne(point_edit_add(b, "align", good, 2, &cause), 0);
	ck_assert_ptr_nonnull(strstr(cause, "exists"));
	free(cause);
	cause = NULL;
	ck_assert_int_ne(point_edit_add(b, "other", bad, 2, &cause), 0);
	ck_assert_ptr_nonnull(strstr(cause, "NOPE"));
	free(cause);
	cause = NULL;
	ck_assert_uint_eq(b->points.n, 1);
	ck_assert_int_eq(model_validate(b, &cause), 0);
	ck_assert_int_ne(point_edit_remove(b, "nope", &cause), 0);
	ck_assert_ptr_nonnull(strstr(cause, "no point 'nope'"));
	free(cause);
	ck_assert_int_eq(point_edit_remove(b, "align", NULL), 0);
	ck_assert_uint_eq(b->points.n, 0);
	model_bench_free(b);
}
END_TEST

/* The bench's own edits keep its points valid: removing an element a
 * point changes is refused and names the point. */
START_TEST(test_point_guards_base)
{
	struct bench *b = bench_text("align.json", ALIGN_BENCH, ALIGN_POINTS);
	struct bench *c = model_bench_dup(b);
	struct branch *where;
	char *cause = NULL;
	size_t at;

	ck_assert_uint_eq(c->points.n, 2);
	ck_assert_ptr_nonnull(model_find(c, "FM1", &where, &at, NULL));
	model_branch_remove(where, at, NULL);
	ck_assert_int_ne(model_validate(c, &cause), 0);
	ck_assert_ptr_nonnull(strstr(cause, "point 'flip-down'"));
	free(cause);
	model_bench_free(c);
	model_bench_free(b);
}
END_TEST

/* Through the edits: removing FM1, which 'flip-down' takes out, is refused
 * and changes nothing; renaming S2 (the anchor of ND9) and ND1 carries the
 * points along, and they still apply. */
START_TEST(test_edits_keep_points)
{
	struct bench *b = bench_text("align.json", ALIGN_BENCH, ALIGN_POINTS);
	char *before = bench_file_dump(b), *after, *cause = NULL;
	struct point *p;
	char *more[] = { "ND1.od=2" };

	ck_assert_int_ne(edit_remove(b, "FM1", &cause), 0);
	ck_assert_ptr_nonnull(strstr(cause, "point 'flip-down'"));
	free(cause);
	cause = NULL;
	after = bench_file_dump(b);
	ck_assert_str_eq(before, after);
	free(after);
	ck_assert_int_eq(edit_set(b, "S2", "id", "S2a", &cause), 0);
	ck_assert_int_eq(point_edit_add(b, "thick", more, 1, &cause), 0);
	ck_assert_int_eq(edit_set(b, "ND1", "id", "NDX", &cause), 0);
	p = point_list_find(&b->points, "alignment");
	ck_assert_str_eq(p->change[1], "+filter:ND9@S2a");
	ck_assert_str_eq(point_list_find(&b->points, "thick")->change[0], "NDX.od=2");
	ck_assert_int_eq(model_validate(b, &cause), 0);
	/* a removal nothing refers to still goes through */
	ck_assert_int_eq(edit_remove(b, "S3", &cause), 0);
	free(before);
	model_bench_free(b);
}
END_TEST

/* The survey: per point and per element.  At 'alignment' M1 gets 1 % of
 * the base (ratio 1 % of the base's, as irradiance is linear in power);
 * ND9 exists only there; at 'flip-down' T1 gets twice the base (FM1 out,
 * 0.099 W instead of 0.0495 W into its 1 W rating). */
START_TEST(test_survey)
{
	struct bench *b = bench_text("align.json", ALIGN_BENCH, ALIGN_POINTS);
	struct point_survey sv;
	char *cause = NULL;
	size_t m1 = 99, t1 = 99;

	ck_assert_int_eq(point_survey_run(b, NULL, &sv, &cause), 0);
	ck_assert_uint_eq(sv.n, 3);
	ck_assert_str_eq(sv.pt[0].name, "base");
	ck_assert_str_eq(sv.pt[2].name, "flip-down");
	for (size_t j = 0; j < sv.nel; j++) {
		if (strcmp(sv.el[j].id, "M1") == 0)
			m1 = j;
		if (strcmp(sv.el[j].id, "T1") == 0)
			t1 = j;
	}
	ck_assert(m1 < sv.nel && t1 < sv.nel);
	/* The main beam scales exactly; at 'alignment' M1 also meets the
	 * ghosts of the added ND9 (0.5 % of ~1 mW against its 10 mW): a few
	 * 1e-5 more, never less. */
	ck_assert(sv.ratio[1 * sv.nel + m1] >= 0.01 * sv.ratio[m1] * (1 - 1e-15));
	ck_assert(sv.ratio[1 * sv.nel + m1] <= 0.01 * sv.ratio[m1] * (1 + 1e-4));
	/* T1 by hand, plus the double bounce inside ND1 (ghost-conventions.md:
	 * P(1 - R)R·R(1 - R)T³, R = 0.5 % assumed, T = 10^-od): at the base
	 * 0.99·0.995²·0.005²·1e-3·0.5 W = 1.2253e-8 W, FM1 out twice that. */
	ck_assert_double_eq_tol(sv.ratio[t1], 0.0495 + 0.99 * 0.995 * 0.995 * 25e-6 * 1e-3 * 0.5,
	    1e-12);                                                    /* base */
	ck_assert_double_eq_tol(sv.ratio[2 * sv.nel + t1], 0.099 + 0.99 * 0.995 * 0.995 * 25e-6 *
	    1e-3, 1e-12);                                              /* FM1 out */
	ck_assert_uint_eq(sv.el[t1].at, 2);
	ck_assert_str_eq(sv.el[sv.nel - 1].id, "ND9");
	ck_assert_uint_eq(sv.el[sv.nel - 1].present, 1);
	point_survey_release(&sv);
	ck_assert_int_ne(point_survey_run(b, "nope", &sv, &cause), 0);
	ck_assert_ptr_nonnull(strstr(cause, "no point 'nope'"));
	free(cause);
	model_bench_free(b);
}
END_TEST

/* The survey applies value-only points in place on one copy and puts each
 * back: no point may see another's change.  Each column must equal the
 * trace of that point applied on its own copy (point_apply, checked by hand
 * above); T1's ratio at 'half-power' is half the base's by hand. */
START_TEST(test_survey_in_place)
{
	struct bench *b = bench_text("align.json", ALIGN_BENCH,
	    ", 'points': [ { 'name': 'dim-m1', 'changes': [ 'M1.reflectance=0.5' ] },"
	    " { 'name': 'half-power', 'changes': [ 'source.power=0.5 W' ] },"
	    " { 'name': 'flip-down', 'changes': [ '-FM1' ] },"
	    " { 'name': 'nd-off', 'changes': [ 'ND1.od=', 'ND1.transmission=1' ] },"
	    " { 'name': 'both', 'changes': [ 'source.power=2 W', 'M1.reflectance=0.9' ] } ]");
	struct point_survey sv;
	char *cause = NULL, *before = bench_file_dump(b), *after;

	ck_assert_int_eq(point_survey_run(b, NULL, &sv, &cause), 0);
	ck_assert_uint_eq(sv.n, 6);
	for (size_t i = 1; i < sv.n; i++) {
		struct bench *a = point_apply(b, &b->points.p[i - 1], &cause);
		struct trace *t;

		ck_assert_msg(a != NULL, "%s", cause);
		t = trace_run(a);
		for (size_t j = 0; j < sv.nel; j++) {
			const struct trace_row *r = find_row(t, sv.el[j].id);
			double got = sv.ratio[i * sv.nel + j];

			if (r == NULL || isnan(r->ratio))
				ck_assert_msg(isnan(got), "%s at %s", sv.el[j].id, sv.pt[i].name);
			else
				ck_assert_msg(fabs(got - r->ratio) <= 1e-15 * r->ratio,
				    "%s at %s: %g, alone %g", sv.el[j].id, sv.pt[i].name,
				    got, r->ratio);
		}
		trace_free(t);
		model_bench_free(a);
	}
	for (size_t j = 0; j < sv.nel; j++)
		if (strcmp(sv.el[j].id, "T1") == 0)
			ck_assert_double_eq_tol(sv.ratio[2 * sv.nel + j], 0.5 * sv.ratio[j], 1e-15);
	point_survey_release(&sv);
	after = bench_file_dump(b);
	ck_assert_str_eq(before, after);
	free(before);
	free(after);
	model_bench_free(b);
}
END_TEST

/* compare: a point added is a settings change "point.NAME" whose new
 * text gives its changes and its worst element there; a point that is the
 * same on both sides is no change. */
START_TEST(test_diff_point)
{
	struct bench *a = bench_text("plain.json", ALIGN_BENCH, "");
	struct bench *b = bench_text("align.json", ALIGN_BENCH, ALIGN_POINTS);
	struct diff *d = diff_benches(a, b), *same = diff_benches(b, b);
	int found = 0;

	for (size_t i = 0; i < d->nch; i++)
		for (size_t j = 0; d->ch[i].kind == DIFF_SETTINGS && j < d->ch[i].nvals; j++)
			if (strcmp(d->ch[i].vals[j].key, "point.alignment") == 0) {
				found = 1;
				ck_assert_ptr_null(d->ch[i].vals[j].old_exact);
				ck_assert_ptr_nonnull(strstr(d->ch[i].vals[j].new_text, "ND9.od=2"));
				ck_assert_ptr_nonnull(strstr(d->ch[i].vals[j].new_text, "worst"));
			}
	ck_assert(found);
	ck_assert_uint_eq(same->nch, 0);
	diff_free(d);
	diff_free(same);
	model_bench_free(a);
	model_bench_free(b);
}
END_TEST

int
main(void)
{
	Suite *s = suite_create("point");
	TCase *tc = tcase_create("core");

	tcase_add_test(tc, test_alignment_point);
	tcase_add_test(tc, test_taken_out);
	tcase_add_test(tc, test_file_round_trip);
	tcase_add_test(tc, test_no_section);
	tcase_add_loop_test(tc, test_bad_points, 0, sizeof bad_files / sizeof *bad_files);
	tcase_add_test(tc, test_edit_add_remove);
	tcase_add_test(tc, test_point_guards_base);
	tcase_add_test(tc, test_diff_point);
	tcase_add_test(tc, test_survey);
	tcase_add_test(tc, test_survey_in_place);
	tcase_add_test(tc, test_edits_keep_points);
	suite_add_tcase(s, tc);
	return run_suite(s);
}
