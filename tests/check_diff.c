/* check_diff.c - comparing two benches (core-diff) and writing the result
 * (report-diff): each kind of chain change, moves found without blaming
 * the elements an insertion shifts, values old -> new with units, and the
 * effect on the damage margins of the demo bench. */
#include <config.h>

#include <check.h>
#include <jansson.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "bench-demo.h"
#include "bench-file.h"
#include "core-diff.h"
#include "core-edit.h"
#include "report-diff.h"
#include "util-err.h"

#include "check-bench-util.h"
#include "check-util.h"

static void
set(struct bench *b, const char *id, const char *key, const char *val)
{
	char *cause = NULL;

	ck_assert_msg(edit_set(b, id, key, val, &cause) == 0, "%s", cause);
}

static const struct diff_change *
find_change(const struct diff *d, const char *id)
{
	for (size_t i = 0; i < d->nch; i++)
		if (d->ch[i].id != NULL && strcmp(d->ch[i].id, id) == 0)
			return &d->ch[i];
	return NULL;
}

static const struct diff_effect *
find_effect(const struct diff *d, const char *id)
{
	for (size_t i = 0; i < d->nfx; i++)
		if (strcmp(d->fx[i].id, id) == 0)
			return &d->fx[i];
	return NULL;
}

START_TEST(test_identical)
{
	struct bench *a = demo(), *b = demo();
	struct diff *d = diff_run(a, b);

	ck_assert_uint_eq(d->nch, 0);
	ck_assert_uint_eq(d->nfx, 0);
	ck_assert_int_eq(d->traced, 1);
	/* the worst of the demo's own trace (W1, checked in check_layout) */
	{
		struct trace *t = trace_run(a);

		ck_assert_str_eq(d->worst_id[0], t->rows[t->worst].el->id);
		ck_assert_str_eq(d->worst_id[1], t->rows[t->worst].el->id);
		trace_free(t);
	}
	ck_assert_str_eq(d->worst_id[0], "W1");
	diff_free(d);
	model_bench_free(a);
	model_bench_free(b);
}
END_TEST

START_TEST(test_value_changed)
{
	struct bench *a = demo(), *b = demo();
	const struct diff_change *c;
	const struct diff_effect *fx;
	struct diff *d;

	set(b, "L1", "focal", "150 mm");
	d = diff_run(a, b);
	ck_assert_uint_eq(d->nch, 1);
	c = find_change(d, "L1");
	ck_assert_ptr_nonnull(c);
	ck_assert_int_eq(c->kind, DIFF_CHANGED);
	ck_assert_int_eq(c->type, EL_LENS);
	ck_assert_uint_eq(c->nvals, 1);
	ck_assert_str_eq(c->vals[0].key, "focal");
	ck_assert_str_eq(c->vals[0].old_text, "200 mm");
	ck_assert_str_eq(c->vals[0].new_text, "150 mm");
	ck_assert_str_eq(c->vals[0].old_exact, "0.2 m");
	ck_assert_str_eq(c->vals[0].new_exact, "0.15 m");
	ck_assert_str_eq(c->old_at.branch, "main");
	ck_assert_str_eq(c->old_at.after, "S8");
	/* W1 after the lens: over before, ok after; upstream untouched.  The
	 * ratios are those of the two benches' own traces (derived here, not
	 * pinned): a shorter focal length puts the focus 50 mm further from W1,
	 * so its beam is wider and its fluence lower. */
	fx = find_effect(d, "W1");
	ck_assert_ptr_nonnull(fx);
	{
		struct trace *ta = trace_run(a), *tb = trace_run(b);

		CHECK_REL(fx->ratio[0], row_of(ta, "W1")->ratio, 1e-15);
		CHECK_REL(fx->ratio[1], row_of(tb, "W1")->ratio, 1e-15);
		ck_assert(row_of(tb, "W1")->wx > row_of(ta, "W1")->wx);
		ck_assert_str_eq(d->worst_id[1], tb->rows[tb->worst].el->id);
		trace_free(ta);
		trace_free(tb);
	}
	ck_assert_int_eq(fx->status[0], STATUS_OVER);
	ck_assert_int_eq(fx->status[1], STATUS_OK);
	ck_assert(fx->ratio[0] > 1 && fx->ratio[1] < 0.5);
	/* upstream the main beam is untouched; only the lens's own ghosts,
	 * which go back up the beam, change M1's share, and by far less than
	 * a percent of its threshold */
	fx = find_effect(d, "M1");
	if (fx != NULL) {
		ck_assert_int_eq(fx->status[0], fx->status[1]);
		ck_assert(fabs(fx->ratio[1] - fx->ratio[0]) < 0.01);
	}
	ck_assert_ptr_null(find_effect(d, "S9"));           /* spaces are not listed */
	ck_assert_str_eq(d->worst_id[1], "ND1");
	ck_assert_int_eq(d->worst_status[1], STATUS_CAUTION);
	ck_assert(d->safe_power[1] > d->safe_power[0]);
	diff_free(d);
	model_bench_free(a);
	model_bench_free(b);
}
END_TEST

START_TEST(test_added_removed)
{
	struct bench *a = demo(), *b = demo();
	struct edit_place after_s3 = { "S3", NULL, NULL, 0 };
	const struct diff_change *c;
	struct element el;
	struct diff *d;
	char *cause = NULL;

	ck_assert_int_eq(edit_element_new(&el, "mirror", "M9",
	    (char *[]){ "reflectance=0.99", "aoi=45" }, 2, &cause), 0);
	ck_assert_int_eq(edit_add(b, &el, &after_s3, &cause), 0);
	ck_assert_int_eq(edit_remove(b, "IR1", &cause), 0);
	d = diff_run(a, b);
	ck_assert_uint_eq(d->nch, 2);
	ck_assert_uint_eq(diff_count(d, DIFF_ADDED), 1);
	ck_assert_uint_eq(diff_count(d, DIFF_REMOVED), 1);
	c = find_change(d, "M9");
	ck_assert_int_eq(c->kind, DIFF_ADDED);
	ck_assert_str_eq(c->new_at.branch, "main");
	ck_assert_str_eq(c->new_at.after, "S3");
	ck_assert_ptr_null(c->old_at.branch);
	ck_assert_uint_eq(c->nvals, 2);
	ck_assert_str_eq(c->vals[0].key, "reflectance");
	ck_assert_ptr_null(c->vals[0].old_text);
	ck_assert_str_eq(c->vals[1].new_text, "45°");
	c = find_change(d, "IR1");
	ck_assert_int_eq(c->kind, DIFF_REMOVED);
	ck_assert_str_eq(c->old_at.after, "S6");
	ck_assert_ptr_nonnull(find_effect(d, "M9"));
	ck_assert_int_eq(find_effect(d, "M9")->present[0], 0);
	diff_free(d);
	model_bench_free(a);
	model_bench_free(b);
}
END_TEST

START_TEST(test_moves)
{
	struct bench *a = demo(), *b = demo();
	struct edit_place after_s4 = { "S4", NULL, NULL, 0 };
	struct edit_place into = { NULL, NULL, "BS1.reflected", 1 };
	const struct diff_change *c;
	struct diff *d;
	char *cause = NULL;

	ck_assert_int_eq(edit_move(b, "M1", &after_s4, &cause), 0);
	d = diff_benches(a, b);
	/* Only M1 moved, though S3, ND1 and S4 now stand one place earlier. */
	ck_assert_uint_eq(d->nch, 1);
	c = find_change(d, "M1");
	ck_assert_int_eq(c->kind, DIFF_MOVED);
	ck_assert_str_eq(c->old_at.after, "S2");
	ck_assert_str_eq(c->new_at.after, "S4");
	ck_assert_uint_eq(c->nvals, 0);
	diff_free(d);
	ck_assert_int_eq(edit_move(b, "S0", &into, &cause), 0);
	d = diff_benches(a, b);
	c = find_change(d, "S0");
	ck_assert_int_eq(c->kind, DIFF_MOVED);
	ck_assert_str_eq(c->old_at.branch, "main");
	ck_assert_str_eq(c->new_at.branch, "BS1.reflected");
	ck_assert_ptr_null(c->new_at.after);
	diff_free(d);
	model_bench_free(a);
	model_bench_free(b);
}
END_TEST

/* A long chain turned around: one element keeps its order, the rest moved;
 * the longest-increasing run keeps this fast at 20,000 elements. */
START_TEST(test_reversed_long)
{
	struct bench *a = model_bench_new("long"), *b = model_bench_new("long");
	struct diff *d;
	size_t n = 20000;

	for (size_t i = 0; i < n; i++) {
		char id[24];
		struct element *x = model_branch_push(&a->path), *y = model_branch_push(&b->path);

		snprintf(id, sizeof id, "S%zu", i);
		model_element_init(x, EL_SPACE, id);
		model_set(x, K_LENGTH, 0.01, NULL);
		snprintf(id, sizeof id, "S%zu", n - 1 - i);
		model_element_init(y, EL_SPACE, id);
		model_set(y, K_LENGTH, 0.01, NULL);
	}
	d = diff_benches(a, b);
	ck_assert_uint_eq(diff_count(d, DIFF_MOVED), n - 1);
	ck_assert_uint_eq(d->nch, n - 1);
	/* Arrays grow geometrically (issue 14 item 10): the capacity is kept
	 * and is within a factor two of what is used, never grown one by one
	 * (which took 12 s here under AddressSanitizer). */
	ck_assert_uint_ge(d->capch, d->nch);
	ck_assert_uint_le(d->capch, 2 * d->nch + 8);
	diff_free(d);
	d = diff_run(a, b);
	ck_assert_uint_ge(d->capfx, d->nfx);
	ck_assert_uint_le(d->capfx, 2 * d->nfx + 8);
	diff_free(d);
	model_bench_free(a);
	model_bench_free(b);
}
END_TEST

START_TEST(test_settings_labels)
{
	struct bench *a = demo(), *b = demo();
	const struct diff_change *c;
	struct diff *d;
	char *cause = NULL;

	ck_assert_int_eq(edit_set_bench(b, "source.wavelength", "1030 nm", &cause), 0);
	ck_assert_int_eq(edit_set_bench(b, "safety_factor", "3", &cause), 0);
	set(b, "M1", "label", "fold one");
	set(b, "M1", "part", "");
	set(b, "L1", "transmission", "");
	d = diff_benches(a, b);
	ck_assert_int_eq(d->ch[0].kind, DIFF_SETTINGS);
	ck_assert_ptr_null(d->ch[0].id);
	ck_assert_uint_eq(d->ch[0].nvals, 2);
	ck_assert_str_eq(d->ch[0].vals[0].key, "safety_factor");
	ck_assert_str_eq(d->ch[0].vals[1].key, "source.wavelength");
	ck_assert_str_eq(d->ch[0].vals[1].old_text, "1.064 µm");
	ck_assert_str_eq(d->ch[0].vals[1].new_text, "1.03 µm");
	c = find_change(d, "M1");
	ck_assert_uint_eq(c->nvals, 2);
	ck_assert_str_eq(c->vals[0].key, "label");
	ck_assert_str_eq(c->vals[0].new_text, "fold one");
	ck_assert_str_eq(c->vals[1].key, "part");
	ck_assert_ptr_null(c->vals[1].new_text);
	c = find_change(d, "L1");
	ck_assert_str_eq(c->vals[0].key, "transmission");
	ck_assert_str_eq(c->vals[0].old_text, "0.995");
	ck_assert_str_eq(c->vals[0].new_text, "(default 1)");
	ck_assert_ptr_null(c->vals[0].new_exact);
	diff_free(d);
	model_bench_free(a);
	model_bench_free(b);
}
END_TEST

START_TEST(test_report_text_json)
{
	struct bench *a = demo(), *b = demo();
	struct diff *d;
	char *text;
	json_t *j, *fx;
	json_error_t jerr;

	set(b, "L1", "focal", "150 mm");
	d = diff_run(a, b);
	text = report_diff_text(d, "table3-ablation", "r1", "draft");
	ck_assert_ptr_nonnull(strstr(text, "Bench table3-ablation: r1 → draft"));
	ck_assert_ptr_nonnull(strstr(text, "changed  L1 (lens): focal 200 mm → 150 mm"));
	/* the status word of the table and the workbench: OVER */
	ck_assert_ptr_nonnull(strstr(text, "109 % OVER → 41.3 % ok"));
	/* ND1's own share is the trace's (ghosts included), tested there */
	ck_assert_ptr_nonnull(strstr(text, "Worst: W1 109 % OVER → ND1 8"));
	ck_assert_ptr_nonnull(strstr(text, "% caution"));
	free(text);
	text = report_diff_json(d, "table3-ablation", "r1", "draft");
	j = json_loads(text, 0, &jerr);
	ck_assert_msg(j != NULL, "%s", jerr.text);
	ck_assert_str_eq(json_string_value(json_object_get(j, "from")), "r1");
	ck_assert_str_eq(json_string_value(json_object_get(json_array_get(
	    json_object_get(j, "changes"), 0), "kind")), "changed");
	fx = json_object_get(j, "effects");
	ck_assert(json_array_size(fx) >= 1);
	{
		/* upstream elements may come first: the lens's ghosts reach them */
		json_t *w1 = NULL;

		for (size_t i = 0; i < json_array_size(fx); i++)
			if (strcmp(json_string_value(json_object_get(json_array_get(fx, i), "id")),
			    "W1") == 0)
				w1 = json_array_get(fx, i);
		ck_assert_ptr_nonnull(w1);
		ck_assert_str_eq(json_string_value(json_object_get(json_object_get(w1, "old"),
		    "status")), "over");
	}
	json_decref(j);
	free(text);
	diff_free(d);
	model_bench_free(a);
	model_bench_free(b);
}
END_TEST

static const struct {
	double        v;
	enum unit_dim dim;
	const char   *text;
} show_cases[] = {
	{ 0.25, DIM_LENGTH, "250 mm" }, { 0.0025, DIM_LENGTH, "2.5 mm" },
	{ 0.020001, DIM_LENGTH, "20.001 mm" }, { 1064e-9, DIM_LENGTH, "1.064 µm" },
	{ 1000, DIM_NONE, "1000" }, { 0.995, DIM_NONE, "0.995" }, { 1.3, DIM_NONE, "1.3" },
	{ 1e5, DIM_FLUENCE, "10 J/cm²" }, { 2, DIM_POWER, "2 W" }, { 0, DIM_LENGTH, "0 m" },
	{ 0.1 + 0.2, DIM_NONE, "0.3" },
};

START_TEST(test_value_show)
{
	char *t = diff_value_show(show_cases[_i].v, show_cases[_i].dim, 0);

	ck_assert_str_eq(t, show_cases[_i].text);
	free(t);
}
END_TEST

START_TEST(test_key_show)
{
	struct element el;
	char *t;

	model_element_init(&el, EL_WINDOW, "W");
	t = diff_key_show(&el, K_TRANSMISSION, 0);
	ck_assert_str_eq(t, "(default 1)");
	free(t);
	t = diff_key_show(&el, K_N2, 0);
	ck_assert_str_eq(t, "-");
	free(t);
	model_set(&el, K_N2, 2.7e-20, NULL);
	t = diff_key_show(&el, K_N2, 1);
	ck_assert_ptr_nonnull(strstr(t, "cm^2/W"));
	free(t);
	model_element_release(&el);
}
END_TEST

int
main(void)
{
	Suite *s = suite_create("diff");
	TCase *tc = tcase_create("diff");

	tcase_add_test(tc, test_identical);
	tcase_add_test(tc, test_value_changed);
	tcase_add_test(tc, test_added_removed);
	tcase_add_test(tc, test_moves);
	tcase_add_test(tc, test_reversed_long);
	tcase_add_test(tc, test_settings_labels);
	tcase_add_test(tc, test_report_text_json);
	tcase_add_loop_test(tc, test_value_show, 0, NELEMS(show_cases));
	tcase_add_test(tc, test_key_show);
	suite_add_tcase(s, tc);
	return run_suite(s);
}
