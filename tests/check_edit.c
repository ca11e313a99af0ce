/* check_edit.c - edits are all-or-nothing: a refused edit leaves the bench
 * exactly as it was (compared through its exported text), an accepted one
 * leaves a bench that passes model_validate. */
#include <config.h>

#include <check.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "bench-demo.h"
#include "bench-file.h"
#include "core-edit.h"
#include "core-trace.h"

#include "check-bench-util.h"
#include "check-util.h"

/* Edits that must be refused, each with a word its message must contain. */
static const struct { const char *id, *key, *value, *word; } bad_sets[] = {
	{ "M1", "reflectance", "1.2", "reflectance" },       /* also needs rs/rp gone: exclusive */
	{ "L1", "focal", "0 mm", "focal" },
	{ "L1", "focal", "5 W", "length" },
	{ "L1", "focal", "250", "unit" },
	{ "L1", "od", "3", "no key 'od'" },
	{ "S0", "length", "-1 mm", "length" },
	{ "ND1", "transmission", "0.5", "not both" },         /* od is set */
	{ "HWP1", "damage.pulse_width", "", "pulse_width" },  /* fluence needs it */
	{ "NOPE", "length", "1 m", "no element 'NOPE'" },
	{ "S0", "id", "M1", "twice" },
	{ "BS1", "side", "rejected", "no rejected port" },
	{ "BS1", "side", "none", "remove them first" },
	{ "PD1", "bogus", "1", "unknown key 'bogus'" },
	/* a value of a sibling key's dimension names that key */
	{ "W1", "damage.cw_linear", "500 kW/cm^2", "use damage.cw_irradiance" },
	{ "W1", "damage.wavelength", "10 ns", "use damage.pulse_width" },
};

START_TEST(test_refused_set_changes_nothing)
{
	struct bench *b = demo();
	char *before = bench_file_dump(b), *after, *cause = NULL;

	ck_assert_int_ne(edit_set(b, bad_sets[_i].id, bad_sets[_i].key,
	    bad_sets[_i].value, &cause), 0);
	ck_assert_ptr_nonnull(cause);
	ck_assert_msg(strstr(cause, bad_sets[_i].word) != NULL,
	    "message '%s' lacks '%s'", cause, bad_sets[_i].word);
	after = bench_file_dump(b);
	ck_assert_str_eq(before, after);
	free(before);
	free(after);
	free(cause);
	model_bench_free(b);
}
END_TEST

START_TEST(test_set_and_unset)
{
	struct bench *b = demo();
	struct element *l1;
	char *cause = NULL;

	ck_assert_int_eq(edit_set(b, "L1", "focal", "250 mm", &cause), 0);
	l1 = model_find(b, "L1", NULL, NULL, NULL);
	ck_assert_double_eq_tol(l1->val[K_FOCAL], 0.25, 1e-15);
	ck_assert_int_eq(edit_set(b, "L1", "n2", "", &cause), 0);
	l1 = model_find(b, "L1", NULL, NULL, NULL);
	ck_assert(!model_has(l1, K_N2));
	ck_assert_int_eq(edit_set(b, "L1", "label", "new lens", &cause), 0);
	ck_assert_str_eq(model_find(b, "L1", NULL, NULL, NULL)->label, "new lens");
	ck_assert_ptr_null(cause);
	model_bench_free(b);
}
END_TEST

START_TEST(test_add_places)
{
	struct bench *b = demo();
	struct element el;
	struct edit_place after = { "S0", NULL, NULL, 0 }, into = { NULL, NULL, "BS1.reflected", 1 };
	struct branch *br;
	size_t i;
	char *kv[] = { "length=5 mm" }, *cause = NULL;

	ck_assert_int_eq(edit_element_new(&el, "space", "GAP", kv, 1, &cause), 0);
	ck_assert_int_eq(edit_add(b, &el, &after, &cause), 0);
	ck_assert_ptr_nonnull(model_find(b, "GAP", &br, &i, NULL));
	ck_assert_ptr_eq(br, &b->path);
	ck_assert_uint_eq(i, 1);
	ck_assert_int_eq(edit_element_new(&el, "iris", "IRX", (char *[]){ "diameter=2 mm" }, 1, &cause), 0);
	ck_assert_int_eq(edit_add(b, &el, &into, &cause), 0);
	ck_assert_ptr_nonnull(model_find(b, "IRX", &br, &i, NULL));
	ck_assert_str_eq(br->el[0].id, "IRX");
	/* after a terminator is refused, and the bench is unchanged */
	{
		char *before = bench_file_dump(b), *now;
		struct edit_place bad = { "T1", NULL, NULL, 0 };

		ck_assert_int_eq(edit_element_new(&el, "space", "LATE", (char *[]){ "length=1 m" }, 1, &cause), 0);
		ck_assert_int_ne(edit_add(b, &el, &bad, &cause), 0);
		ck_assert_ptr_nonnull(strstr(cause, "ends its branch"));
		now = bench_file_dump(b);
		ck_assert_str_eq(before, now);
		free(before);
		free(now);
		free(cause);
		cause = NULL;
	}
	/* a lens without its focal length is refused */
	ck_assert_int_eq(edit_element_new(&el, "lens", "LX", NULL, 0, &cause), 0);
	ck_assert_int_ne(edit_add(b, &el, NULL, &cause), 0);
	ck_assert_ptr_nonnull(strstr(cause, "focal"));
	free(cause);
	model_bench_free(b);
}
END_TEST

START_TEST(test_move_and_remove)
{
	struct bench *b = demo();
	struct edit_place to = { "S0", NULL, NULL, 0 }, own = { NULL, NULL, "BS1.reflected", 0 };
	struct branch *br;
	size_t i;
	char *cause = NULL;
	size_t n = model_count(&b->path);

	ck_assert_int_eq(edit_move(b, "ND1", &to, &cause), 0);
	ck_assert_ptr_nonnull(model_find(b, "ND1", &br, &i, NULL));
	ck_assert_uint_eq(i, 1);
	/* a splitter cannot move into its own side branch */
	ck_assert_int_ne(edit_move(b, "BS1", &own, &cause), 0);
	free(cause);
	cause = NULL;
	/* removing a splitter removes its side branch with it */
	ck_assert_int_eq(edit_remove(b, "BS1", &cause), 0);
	ck_assert_uint_eq(model_count(&b->path), n - 5);
	ck_assert_ptr_null(model_find(b, "PD1", NULL, NULL, NULL));
	ck_assert_int_eq(model_validate(b, &cause), 0);
	model_bench_free(b);
}
END_TEST

START_TEST(test_bench_settings)
{
	struct bench *b = demo();
	char *cause = NULL, *v;

	ck_assert_int_eq(edit_set_bench(b, "source.waist", "2 mm, 1.5 mm", &cause), 0);
	ck_assert_double_eq_tol(b->src.waist[1], 1.5e-3, 1e-18);
	v = edit_bench_value(b, "source.waist");
	ck_assert_str_eq(v, "0.002 m, 0.0015 m");
	free(v);
	ck_assert_int_eq(edit_set_bench(b, "source.m2", "0.5", &cause), -1);
	ck_assert_ptr_nonnull(strstr(cause, "m2"));
	free(cause);
	cause = NULL;
	ck_assert_double_eq(b->src.m2[0], 1.3);
	/* 200 mJ at 10 Hz is 2 W; 20 Hz keeps the energy and doubles the power */
	ck_assert_int_eq(edit_set_bench(b, "source.rep_rate", "20 Hz", &cause), 0);
	ck_assert_double_eq_tol(b->src.power, 4, 1e-12);
	ck_assert_int_eq(edit_set_bench(b, "source.pulsed", "false", &cause), 0);
	ck_assert_int_eq(edit_set_bench(b, "source.pulse_energy", "1 mJ", &cause), -1);
	free(cause);
	cause = NULL;
	for (const char *const *k = edit_bench_keys; *k != NULL; k++) {
		char *text = edit_bench_value(b, *k);

		/* every value reads back to itself (empty: not applicable) */
		if (text[0] != '\0' && strcmp(*k, "notes") != 0)
			ck_assert_msg(edit_set_bench(b, *k, text, &cause) == 0, "%s=%s: %s",
			    *k, text, cause);
		free(text);
	}
	model_bench_free(b);
}
END_TEST

int
main(void)
{
	Suite *s = suite_create("edit");
	TCase *tc = tcase_create("core");

	tcase_add_loop_test(tc, test_refused_set_changes_nothing, 0, NELEMS(bad_sets));
	tcase_add_test(tc, test_set_and_unset);
	tcase_add_test(tc, test_add_places);
	tcase_add_test(tc, test_move_and_remove);
	tcase_add_test(tc, test_bench_settings);
	suite_add_tcase(s, tc);
	return run_suite(s);
}
