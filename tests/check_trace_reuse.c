/* check_trace_reuse.c - a trace is the same whatever memory it is made
 * in: fresh, reusing an earlier result of another bench, or taking the
 * memory of a freed one (trace_free keeps the last for the next fresh
 * trace).  Rows, warnings and totals are compared field by field with ==
 * (NaN with NaN), on the demo bench and on a relay line of the kind
 * benches/bench_trace times, CW and pulsed.  Derived in the test: the
 * reference is the first fresh trace of each bench. */
#include <config.h>

#include <check.h>
#include <complex.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "bench-demo.h"
#include "bench-file.h"
#include "core-model.h"
#include "core-trace.h"

#include "check-bench-util.h"
#include "check-util.h"

/* A relay line: gaps, refocusing lenses, rated folding mirrors, a dump
 * (invented; the same pattern as benches/bench_trace).  Pulsed, the
 * mirrors also carry a fluence rating at another wavelength and width, so
 * that every scaling flag and the pulsed results are exercised. */
static struct bench *
relay(size_t n, int pulsed)
{
	struct bench *b = model_bench_new("relay");
	char *cause = NULL, id[32];

	b->src.wavelength = 1064e-9;
	b->src.power = 5;
	b->src.waist[0] = 1e-3;
	b->src.waist[1] = pulsed ? 0.7e-3 : 1e-3;
	if (pulsed) {
		b->src.pulsed = 1;
		b->src.rep_rate = 1e3;
		b->src.pulse_width = 10e-9;
		b->src.pulse_energy = 5e-3;
	}
	for (size_t i = 0; i + 1 < n; i++) {
		struct element *el = model_branch_push(&b->path);

		snprintf(id, sizeof id, "E%zu", i);
		switch (i % 4) {
		case 1:
			model_element_init(el, EL_MIRROR, id);
			model_set(el, K_REFLECTANCE, 0.99999, NULL);
			model_set(el, K_AOI, 45, NULL);
			model_set(el, K_DMG_CW_LINEAR, 1e6, NULL);
			if (pulsed) {
				model_set(el, K_DMG_FLUENCE, 1e4, NULL);
				model_set(el, K_DMG_PULSE_WIDTH, 1e-9, NULL);
				model_set(el, K_DMG_WAVELENGTH, 532e-9, NULL);
			}
			break;
		case 3:
			model_element_init(el, EL_LENS, id);
			model_set(el, K_FOCAL, 0.1, NULL);
			model_set(el, K_DMG_CW_IRRADIANCE, 1e9, NULL);
			break;
		default:
			model_element_init(el, EL_SPACE, id);
			model_set(el, K_LENGTH, 0.1, NULL);
			break;
		}
	}
	model_element_init(model_branch_push(&b->path), EL_DUMP, "END");
	ck_assert_msg(model_validate(b, &cause) == 0, "%s", cause);
	return b;
}

static int
same(double a, double b)
{
	return a == b || (isnan(a) && isnan(b));
}

#define SAME(f) ck_assert_msg(same(x->f, y->f), "%s row %zu (%s): %s %.17g != %.17g", \
	    what, i, x->el->id, #f, (double)x->f, (double)y->f)
#define EQ(f) ck_assert_msg(x->f == y->f, "%s row %zu (%s): %s differs", what, i, \
	    x->el->id, #f)

static void
same_rows(const char *what, const struct trace *a, const struct trace *b)
{
	ck_assert_msg(a->nrows == b->nrows, "%s: %zu rows != %zu", what, a->nrows, b->nrows);
	for (size_t i = 0; i < a->nrows; i++) {
		const struct trace_row *x = &a->rows[i], *y = &b->rows[i];

		EQ(el); EQ(parent); EQ(port); EQ(depth);
		SAME(z); SAME(stokes[0]); SAME(stokes[1]); SAME(stokes[2]); SAME(stokes[3]);
		SAME(qx.m2); SAME(qy.m2);
		ck_assert(same(creal(x->qx.q), creal(y->qx.q)) && same(cimag(x->qx.q), cimag(y->qx.q)));
		ck_assert(same(creal(x->qy.q), creal(y->qy.q)) && same(cimag(x->qy.q), cimag(y->qy.q)));
		SAME(power_in); SAME(power_out); SAME(power_lost); SAME(wx); SAME(wy);
		SAME(irradiance); SAME(linear_density); SAME(peak_irradiance); SAME(field);
		SAME(clip_loss); SAME(fluence); SAME(peak_power); SAME(b_integral); SAME(b_total);
		SAME(critical_power); SAME(collapse_distance); SAME(critical_ratio); SAME(ratio);
		SAME(limits.cw_linear); SAME(limits.cw_irradiance); SAME(limits.fluence);
		SAME(limits.max_power); SAME(limits.max_absorbed); EQ(limits.flags);
		EQ(status); EQ(flags); EQ(has_waist); EQ(has_focus);
		SAME(focus.z); SAME(focus.wx); SAME(focus.wy); SAME(focus.irradiance);
		SAME(focus.peak_irradiance); SAME(focus.concentration); EQ(focus.on);
		EQ(focus.air_breakdown);
	}
}

static void
same_trace(const char *what, const struct trace *a, const struct trace *b)
{
	same_rows(what, a, b);
	ck_assert_msg(a->nwarn == b->nwarn, "%s: %zu warnings != %zu", what, a->nwarn, b->nwarn);
	for (size_t i = 0; i < a->nwarn; i++) {
		const struct trace_warning *x = &a->warn[i], *y = &b->warn[i];

		ck_assert(x->kind == y->kind && x->parent == y->parent && x->port == y->port &&
		    x->after == y->after && x->ghost == y->ghost);
		ck_assert(same(x->value, y->value) && same(x->distance, y->distance));
	}
	ck_assert(a->bench == b->bench && a->worst == b->worst);
	ck_assert(same(a->worst_ratio, b->worst_ratio));
	ck_assert(same(a->safe_source_power, b->safe_source_power));
	ck_assert(same(a->absorbed, b->absorbed) && same(a->leaving, b->leaving));
	ck_assert(a->nonfinite == b->nonfinite && a->nonfinite_what == b->nonfinite_what);
}

/* Four benches of different sizes and kinds; each is traced fresh first
 * (the reference), then again in every other way, after the others have
 * left their rows and warnings in the memory it gets. */
START_TEST(test_same_in_any_memory)
{
	struct bench *b[4] = { demo(), relay(1001, 0), relay(203, 1), relay(10, 0) };
	struct trace *ref[4], *t = NULL;
	char what[64];

	for (int i = 0; i < 4; i++) {
		ref[i] = trace_rerun_opts(NULL, b[i], TRACE_NO_GHOSTS);
		ck_assert(ref[i]->nrows > 0);
	}
	ck_assert_msg(ref[0]->nwarn > 0 || ref[2]->nwarn > 0,
	    "some bench must leave warnings behind for the test to mean anything");
	for (int round = 0; round < 3; round++)
		for (int i = 0; i < 4; i++) {
			int j = (i + 1 + round) % 4;
			struct trace *f;

			/* another bench's result freed just before: its memory is
			 * the one a fresh trace now takes */
			trace_free(trace_rerun_opts(NULL, b[j], TRACE_NO_GHOSTS));
			f = trace_rerun_opts(NULL, b[i], TRACE_NO_GHOSTS);
			snprintf(what, sizeof what, "bench %d fresh after bench %d", i, j);
			same_trace(what, ref[i], f);
			trace_free(f);
			/* a result kept and retraced, last holding bench j */
			t = trace_rerun_opts(t, b[j], TRACE_NO_GHOSTS);
			t = trace_rerun_opts(t, b[i], TRACE_NO_GHOSTS);
			snprintf(what, sizeof what, "bench %d reusing bench %d", i, j);
			same_trace(what, ref[i], t);
		}
	trace_free(t);
	for (int i = 0; i < 4; i++) {
		trace_free(ref[i]);
		model_bench_free(b[i]);
	}
}
END_TEST

/* With its reflections the result is also the same, fresh or in memory a
 * ghost trace of another bench left (the ghost set is never kept). */
START_TEST(test_ghosts_in_any_memory)
{
	struct bench *d = demo(), *r = relay(41, 1);
	struct trace *ref = trace_rerun_opts(NULL, d, 0), *f;

	ck_assert(ref->ghosts != NULL);
	trace_free(trace_rerun_opts(NULL, r, 0));
	f = trace_rerun_opts(NULL, d, 0);
	ck_assert(f->ghosts != NULL);
	same_trace("demo with ghosts, fresh after the relay", ref, f);
	trace_free(f);
	trace_free(ref);
	model_bench_free(r);
	model_bench_free(d);
}
END_TEST

int
main(void)
{
	Suite *s = suite_create("trace_reuse");
	TCase *tc = tcase_create("memory");

	tcase_add_test(tc, test_same_in_any_memory);
	tcase_add_test(tc, test_ghosts_in_any_memory);
	tcase_set_timeout(tc, 60);
	suite_add_tcase(s, tc);
	return run_suite(s);
}
