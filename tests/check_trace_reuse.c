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
#include "core-ghost.h"
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

/* The reflections themselves, summary by summary. */
static void
same_ghosts(const char *what, const struct trace *a, const struct trace *b)
{
	const struct ghost_set *x = a->ghosts, *y = b->ghosts;

	ck_assert_msg(x != NULL && y != NULL, "%s: no ghosts", what);
	ck_assert_msg(x->n == y->n && x->nfoci == y->nfoci && x->nstrays == y->nstrays &&
	    x->nover == y->nover, "%s: %zu ghosts, %zu foci, %zu strays != %zu, %zu, %zu",
	    what, x->n, x->nfoci, x->nstrays, y->n, y->nfoci, y->nstrays);
	ck_assert(same(x->return_power, y->return_power) && same(x->work, y->work));
	for (size_t i = 0; i < x->n; i++)
		ck_assert_msg(x->g[i].nrows == y->g[i].nrows && x->g[i].worst_row == y->g[i].worst_row &&
		    same(x->g[i].power_start, y->g[i].power_start) && same(x->g[i].worst_ratio, y->g[i].worst_ratio),
		    "%s: ghost %zu differs", what, i);
	for (size_t u = 0; u < a->nrows; u++) {
		const struct ghost_at *p = &x->at[u], *q = &y->at[u];

		ck_assert_msg(p->nmet == q->nmet && p->top == q->top && same(p->power_in, q->power_in) &&
		    same(p->irradiance, q->irradiance) && same(p->main_ratio, q->main_ratio) &&
		    same(p->fluence, q->fluence), "%s: the summary at row %zu differs", what, u);
	}
	for (size_t k = 0; k < x->nfoci; k++)
		ck_assert(same(x->foci[k].z, y->foci[k].z) &&
		    same(x->foci[k].peak_irradiance, y->foci[k].peak_irradiance));
	for (size_t k = 0; k < x->nstrays; k++)
		ck_assert(same(x->strays[k].power, y->strays[k].power) &&
		    x->strays[k].from == y->strays[k].from);
}

/* The ghost engine keeps its buffers in the result (trace_rerun): a
 * result retraced after benches with more and fewer rows and ghosts, with
 * rows kept and without, gives every ghost, summary, focus and stray of
 * a fresh trace. */
START_TEST(test_ghost_buffers_reused)
{
	struct bench *b[3] = { demo(), relay(41, 1), relay(9, 0) };
	struct trace *ref[3], *t = NULL;
	char what[64];

	for (int i = 0; i < 3; i++) {
		ref[i] = trace_rerun_opts(NULL, b[i], 0);
		ck_assert(ref[i]->ghosts != NULL && ref[i]->ghosts->n > 0);
	}
	for (int round = 0; round < 4; round++)
		for (int i = 0; i < 3; i++) {
			int j = (i + 1 + round) % 3;

			t = trace_rerun_opts(t, b[j], round % 2 ? TRACE_GHOST_ROWS : 0);
			t = trace_rerun_opts(t, b[i], 0);
			snprintf(what, sizeof what, "bench %d after bench %d, round %d", i, j, round);
			same_trace(what, ref[i], t);
			same_ghosts(what, ref[i], t);
		}
	trace_free(t);
	for (int i = 0; i < 3; i++) {
		trace_free(ref[i]);
		model_bench_free(b[i]);
	}
}
END_TEST

/* TRACE_LEAN (sweeps, tolerance runs) leaves out what no rating reads:
 * every ratio, status, worst, safe source power and warning must still
 * be the full trace's, bit for bit.  The demo is pulsed with a ghost
 * focus that sparks (the warning must survive); its source is then
 * turned down and up, and the relay lines add a CW and a pulsed chain. */
START_TEST(test_lean_same_ratings)
{
	struct bench *b[3] = { demo(), relay(41, 1), relay(61, 0) };
	static const double scale[] = { 1, 0.01, 0.3, 3, 30 };
	struct trace *full = NULL, *lean = NULL;
	size_t sparks = 0;
	char what[80];

	for (int i = 0; i < 3; i++) {
		double p0 = b[i]->src.power, e0 = b[i]->src.pulse_energy;

		for (int k = 0; k < NELEMS(scale); k++) {
			b[i]->src.power = p0 * scale[k];
			b[i]->src.pulse_energy = e0 * scale[k];
			full = trace_rerun_opts(full, b[i], 0);
			lean = trace_rerun_opts(lean, b[i], TRACE_LEAN);
			snprintf(what, sizeof what, "bench %d at %g of its power", i, scale[k]);
			ck_assert_msg(full->nwarn == lean->nwarn, "%s: %zu warnings != %zu", what,
			    full->nwarn, lean->nwarn);
			for (size_t w = 0; w < full->nwarn; w++) {
				const struct trace_warning *x = &full->warn[w], *y = &lean->warn[w];

				ck_assert_msg(x->kind == y->kind && x->after == y->after &&
				    x->ghost == y->ghost && same(x->value, y->value) &&
				    same(x->distance, y->distance), "%s: warning %zu differs", what, w);
				sparks += x->kind == TW_AIR_BREAKDOWN && x->ghost;
			}
			for (size_t r = 0; r < full->nrows; r++) {
				const struct trace_row *x = &full->rows[r], *y = &lean->rows[r];

				ck_assert_msg(same(x->ratio, y->ratio) && x->status == y->status,
				    "%s: row %zu (%s) ratio %.17g != %.17g", what, r, x->el->id,
				    x->ratio, y->ratio);
				/* the flag "ghosts" may be missing only where unrated */
				ck_assert((x->flags & ~(unsigned)TF_GHOSTS) == (y->flags & ~(unsigned)TF_GHOSTS));
				if (damage_rated(&x->limits))
					ck_assert(x->flags == y->flags);
			}
			ck_assert(full->worst == lean->worst && same(full->worst_ratio, lean->worst_ratio));
			ck_assert(same(full->safe_source_power, lean->safe_source_power));
			ck_assert(full->ghosts->nover == lean->ghosts->nover);
		}
		b[i]->src.power = p0;
		b[i]->src.pulse_energy = e0;
	}
	ck_assert_msg(sparks > 0, "no ghost spark: the test would not see one dropped");
	trace_free(full);
	trace_free(lean);
	for (int i = 0; i < 3; i++)
		model_bench_free(b[i]);
}
END_TEST

int
main(void)
{
	Suite *s = suite_create("trace_reuse");
	TCase *tc = tcase_create("memory");

	tcase_add_test(tc, test_same_in_any_memory);
	tcase_add_test(tc, test_ghosts_in_any_memory);
	tcase_add_test(tc, test_ghost_buffers_reused);
	tcase_add_test(tc, test_lean_same_ratings);
	tcase_set_timeout(tc, 60);
	suite_add_tcase(s, tc);
	return run_suite(s);
}
