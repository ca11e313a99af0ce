/* check_ghost.c - surface reflections as beams (ghost-conventions.md):
 * ghost powers of lens surfaces from the published ray matrices, Fresnel
 * values, the power bookkeeping of a ghost through two splitters and an
 * isolator by hand, and a ghost focus that puts an upstream optic over. */
#include <config.h>

#include <check.h>
#include <complex.h>
#include <math.h>
#include <stdarg.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "bench-file.h"
#include "core-ghost.h"
#include "core-model.h"
#include "core-trace.h"

#include "check-bench-util.h"
#include "check-util.h"

#define HEAD "{'format':'beamledger-bench-1','name':'t',"

/* 2x2 ray matrices, reduced form: [[A, B], [C, D]]. */
struct m2 { double a, b, c, d; };

static struct m2
mul(struct m2 x, struct m2 y)           /* x after y */
{
	struct m2 r = { x.a * y.a + x.b * y.c, x.a * y.b + x.b * y.d,
	    x.c * y.a + x.d * y.c, x.c * y.b + x.d * y.d };

	return r;
}

/* Refraction at a spherical surface of radius R from n1 into n2, R > 0
 * when its centre lies in the direction of travel: [[1, 0], [-(n2 -
 * n1)/R, 1]] (Siegman, Lasers (1986), ch. 15 table of ray matrices;
 * REFERENCE §15).  Reflection off a mirror of radius R inside a medium of
 * index n, R > 0 concave toward the light: [[1, 0], [-2n/R, 1]] (Siegman,
 * the same table, in reduced slopes).  Going back, in the unfolded frame a
 * surface's radius changes sign (its centre is now behind the light). */
static struct m2
refract(double n1, double n2, double r)
{
	struct m2 m = { 1, 0, isinf(r) ? 0 : -(n2 - n1) / r, 1 };

	return m;
}

static struct m2
reflect(double n, double r_concave)
{
	struct m2 m = { 1, 0, isinf(r_concave) ? 0 : -2 * n / r_concave, 1 };

	return m;
}

/* The back-surface ghost of a thin lens: in through the front (1 -> n,
 * radius r1), off the back from inside (centre downstream, r2 > 0, is
 * convex seen from inside: concave radius -r2), out through the front
 * going back (n -> 1, radius -r1).  Its power is -C. */
static double
back_ghost_power_by_matrices(double n, double r1, double r2)
{
	struct m2 m = mul(refract(n, 1, -r1), mul(reflect(n, -r2), refract(1, n, r1)));

	return -m.c;
}

static const struct lens_case {
	const char *what;
	double r1, r2;          /* in units of f, at n = 1.5 */
	double ghost_over_f;    /* the contract's check value */
} lens_cases[] = {
	/* equi-convex: 1/f = 0.5 (1/r + 1/r) gives r = f; ghost f/4 */
	{ "equi-convex", 1, -1, 0.25 },
	/* plano-convex, flat side first: 1/f = 0.5 (0 - 1/r2), r2 = -f/2; f/6 */
	{ "plano-convex flat first", INFINITY, -0.5, 1.0 / 6 },
	/* curved side first: r1 = f/2, r2 flat; f/2 (common practice: this
	 * way round for a collimated beam) */
	{ "plano-convex curved first", 0.5, INFINITY, 0.5 },
};

START_TEST(test_lens_ghost_focal)
{
	const struct lens_case *lc = &lens_cases[_i];
	double n = 1.5, f = 0.2;
	double r1 = lc->r1 * f, r2 = lc->r2 * f;
	double p_mat = back_ghost_power_by_matrices(n, r1, r2);

	/* the lens itself: thin lensmaker's equation, (n - 1)(1/r1 - 1/r2) = 1/f */
	CHECK_REL((n - 1) * ((isinf(r1) ? 0 : 1 / r1) - (isinf(r2) ? 0 : 1 / r2)), 1 / f, 1e-12);
	CHECK_REL(1 / p_mat, lc->ghost_over_f * f, 1e-12);
	CHECK_REL(1 / ghost_power_back_inside(n, r1, r2), lc->ghost_over_f * f, 1e-12);
	/* front surface, outside: a mirror of concave radius -r1 in air */
	CHECK_REL(ghost_power_front_outside(r1), -reflect(1, -r1).c, 1e-12);
}
END_TEST

/* A lens with focal alone is taken as equi-convex in its index: the
 * engine's radii give back the focal length and the f/4 ghost. */
START_TEST(test_shape_assumed)
{
	struct element el;
	double r1, r2;
	int assumed;

	model_element_init(&el, EL_LENS, "L1");
	ck_assert_int_eq(model_set(&el, K_FOCAL, 0.1, NULL), 0);
	ck_assert_int_eq(model_set(&el, K_INDEX, 1.5, NULL), 0);
	ghost_radii(&el, 1064e-9, &r1, &r2, &assumed);
	ck_assert(assumed);
	CHECK_REL(r1, 0.1, 1e-12);      /* 2 (n - 1) f */
	CHECK_REL(r2, -0.1, 1e-12);
	CHECK_REL(1 / ghost_power_back_inside(1.5, r1, r2), 0.025, 1e-12);
	model_element_release(&el);
}
END_TEST

/* Fresnel at normal incidence, R = ((n - 1)/(n + 1))² (Hecht sec. 4.6;
 * REFERENCE §15 check values); at Brewster's angle atan(n) rp = 0 (Hecht
 * sec. 4.7). */
static const struct { double n, r; } fresnel_cases[] = {
	{ 1.5, 0.04000 }, { 1.449631, 0.033691 }, { 1.754485, 0.075027 },
};

START_TEST(test_fresnel)
{
	double rs, rp;

	ghost_fresnel(fresnel_cases[_i].n, 0, &rs, &rp);
	CHECK_ABS(rs, fresnel_cases[_i].r, 5e-7);
	CHECK_ABS(rp, fresnel_cases[_i].r, 5e-7);
	ghost_fresnel(fresnel_cases[_i].n, atan(fresnel_cases[_i].n) * 180 / M_PI, &rs, &rp);
	CHECK_ABS(rp, 0, 1e-15);
	ck_assert(rs > fresnel_cases[_i].r);
}
END_TEST

/* A window's front-surface ghost back through a splitter, an isolator and
 * another splitter to the source, by hand:
 *   at W1: 1 W · 0.7 (BS1 T) · 0.9 (ISO1) · 0.6 (BS2 T) = 0.378 W;
 *   ghost: 0.378 · 0.02 = 7.56 mW (its back surface reflects nothing);
 *   BS2 returns its T share 0.6: 4.536 mW on, 0.4 · 7.56 = 3.024 mW out of
 *   its fourth port; ISO1 keeps 10^(-10/10) = 0.1: 0.4536 mW; BS1 returns
 *   0.7: 0.31752 mW reach the laser, 0.3 · 0.4536 = 0.13608 mW leave by its
 *   fourth port.  The splitters are at 45° (their backs make strays, not
 *   ghosts); ISO1 has no glass surfaces of its own here. */
START_TEST(test_bookkeeping)
{
	struct bench *b = bench_text("t", HEAD
	    "'source':{'wavelength':'1064 nm','power':'1 W','waist':'1 mm'},'path':["
	    "{'id':'BS1','type':'splitter','reflectance':0.3,'reflected':[{'id':'BD1','type':'dump'}]},"
	    "{'id':'S1','type':'space','length':'100 mm'},"
	    "{'id':'ISO1','type':'isolator','transmission':0.9,'isolation':10},"
	    "{'id':'S2','type':'space','length':'100 mm'},"
	    "{'id':'BS2','type':'splitter','reflectance':0.4,'reflected':[{'id':'BD2','type':'dump'}]},"
	    "{'id':'S3','type':'space','length':'100 mm'},"
	    "{'id':'W1','type':'window','surface_reflectance':[0.02, 0]},"
	    "{'id':'S4','type':'space','length':'100 mm'},"
	    "{'id':'BD3','type':'dump'}]}");
	struct trace *t = trace_rerun_opts(NULL, b, TRACE_GHOST_ROWS);
	const struct ghost_set *gs = t->ghosts;
	const struct ghost *g = NULL;
	int bs2 = 0, bs1 = 0;

	ck_assert_ptr_nonnull(gs);
	for (size_t i = 0; i < gs->n; i++)
		if (gs->g[i].order == 1 && gs->g[i].surf_el[0] == row_of(t, "W1")->el)
			g = &gs->g[i];
	ck_assert_ptr_nonnull(g);
	ck_assert_int_eq(g->surf[0], GS_FRONT);
	CHECK_REL(g->power_start, 0.378 * 0.02, 1e-12);
	for (size_t k = 0; k < g->nrows; k++) {
		const struct ghost_row *r = &gs->rows[g->row0 + k];

		if (strcmp(r->el->id, "BS2") == 0)
			CHECK_REL(r->power_in, 7.56e-3, 1e-9);
		if (strcmp(r->el->id, "ISO1") == 0)
			CHECK_REL(r->power_in, 4.536e-3, 1e-9);
		if (strcmp(r->el->id, "BS1") == 0)
			CHECK_REL(r->power_in, 0.4536e-3, 1e-9);
	}
	CHECK_REL(gs->return_power, 0.31752e-3, 1e-9);
	for (size_t i = 0; i < gs->nstrays; i++) {
		const struct ghost_stray *s = &gs->strays[i];

		if (strcmp(s->what, "fourth_port") != 0)
			continue;
		if (strcmp(s->from->id, "BS2") == 0) {
			CHECK_REL(s->power, 3.024e-3, 1e-9);
			bs2++;
		} else if (strcmp(s->from->id, "BS1") == 0) {
			CHECK_REL(s->power, 0.13608e-3, 1e-9);
			bs1++;
		}
	}
	ck_assert_int_eq(bs2, 1);
	ck_assert_int_eq(bs1, 1);
	trace_free(t);
	model_bench_free(b);
}
END_TEST

/* The back-surface ghost of an equi-convex f = 100 mm lens (n = 1.5,
 * surface_reflectance 4 %) focuses f/4 = 25 mm upstream, on a window
 * rated 10 kW/cm²: by hand the ghost carries 10 W · 0.96² · 0.04 =
 * 0.369 W into a waist of λ(f/4)/(π w) = 1.064 µm · 25 mm / (π · 2 mm) =
 * 4.23 µm (the 2 mm beam is collimated: zR = 11.8 m), about 1.3 MW/cm²;
 * the main beam gives the window 2 · 10 W / (π (2 mm)²) = 159 W/cm². */
START_TEST(test_ghost_focus_over)
{
	const char *text = HEAD
	    "'source':{'wavelength':'1064 nm','power':'10 W','waist':'2 mm'},'path':["
	    "{'id':'S0','type':'space','length':'100 mm'},"
	    "{'id':'W0','type':'window','surface_reflectance':0,"
	    " 'damage':{'cw_irradiance':'10 kW/cm^2'}},"
	    "{'id':'S1','type':'space','length':'25 mm'},"
	    "{'id':'L1','type':'lens','focal':'100 mm','index':1.5,'surface_reflectance':0.04},"
	    "{'id':'S2','type':'space','length':'100 mm'},"
	    "{'id':'BD','type':'dump'}]}";
	struct bench *b = bench_text("t", "%s", text);
	struct trace *t0 = trace_rerun_opts(NULL, b, TRACE_NO_GHOSTS);
	struct trace *t = trace_rerun_opts(NULL, b, TRACE_GHOST_ROWS);
	const struct trace_row *w0 = row_of(t, "W0");
	const struct ghost_set *gs = t->ghosts;
	double w_hand = 1.064e-6 * 0.025 / (M_PI * 2e-3);
	int seen = 0;

	/* 100 mm from the waist the area grows by (z/zR)² = 7e-5 */
	CHECK_REL(row_of(t0, "W0")->ratio, 2 * 10 / (M_PI * 4e-6) / 1e8, 1e-4);
	ck_assert_int_eq(row_of(t0, "W0")->status, STATUS_OK);
	ck_assert_int_eq(w0->status, STATUS_OVER);
	ck_assert(w0->flags & TF_GHOSTS);
	ck_assert(count_warn(t, TW_GHOST_OVER) >= 1);
	for (size_t i = 0; i < gs->n; i++) {
		const struct ghost *g = &gs->g[i];

		if (g->order != 1 || strcmp(g->surf_el[0]->id, "L1") != 0 || g->surf[0] != GS_BACK)
			continue;
		ck_assert(g->flags & GF_SHAPE_ASSUMED);
		CHECK_REL(g->power_start, 10 * 0.96 * 0.96 * 0.04, 1e-12);
		for (size_t k = 0; k < g->nrows; k++) {
			const struct ghost_row *r = &gs->rows[g->row0 + k];

			if (strcmp(r->el->id, "W0") == 0) {
				CHECK_REL(r->wx, w_hand, 2e-3);
				ck_assert_int_eq(r->status, STATUS_OVER);
				seen = 1;
			}
		}
	}
	ck_assert(seen);
	trace_free(t0);
	trace_free(t);
	model_bench_free(b);
}
END_TEST

/* Second order between two flat windows, by hand (ghost-conventions.md):
 * 1 W reaches W2 (transmission 1); its front sends 0.02 W back; W1 passes
 * it back whole and reflects it forward off its back from outside,
 * 0.02 · 0.01 = 2e-4 W, or, in through its back and off its front inside,
 * 0.02 · (1 - 0.01)² · 0.01 = 1.9602e-4 W.  Both then travel to the dump. */
START_TEST(test_second_order_pair)
{
	struct bench *b = bench_text("t", HEAD
	    "'source':{'wavelength':'1064 nm','power':'1 W','waist':'1 mm'},'path':["
	    "{'id':'W1','type':'window','surface_reflectance':0.01},"
	    "{'id':'S1','type':'space','length':'50 mm'},"
	    "{'id':'W2','type':'window','surface_reflectance':[0.02, 0]},"
	    "{'id':'S2','type':'space','length':'50 mm'},"
	    "{'id':'BD','type':'dump'}]}");
	struct trace *t = trace_rerun_opts(NULL, b, TRACE_GHOST_ROWS);
	const struct ghost_set *gs = t->ghosts;
	int outside = 0, inside = 0;

	for (size_t i = 0; i < gs->n; i++) {
		const struct ghost *g = &gs->g[i];

		if (g->order != 2 || strcmp(g->surf_el[0]->id, "W2") != 0)
			continue;
		ck_assert_str_eq(g->surf_el[1]->id, "W1");
		ck_assert_str_eq(gs->rows[g->row0 + g->nrows - 1].el->id, "BD");
		if (g->surf[1] == GS_BACK) {
			CHECK_REL(g->power_start, 2e-4, 1e-12);
			outside++;
		} else {
			CHECK_REL(g->power_start, 1.9602e-4, 1e-12);
			inside++;
		}
	}
	ck_assert_int_eq(outside, 1);
	ck_assert_int_eq(inside, 1);
	trace_free(t);
	model_bench_free(b);
}
END_TEST

/* The back-surface ghost of a cylindrical lens (axis x) focuses in x
 * only: the same hand values as test_ghost_focus_over on x (f/4 = 25 mm,
 * w = λ(f/4)/(π w0)), while in y the collimated 2 mm beam (zR = 11.8 m)
 * keeps its radius over the 50 mm back to W0.  A round beam through a
 * round optic is worked out on one axis; this one must not be. */
START_TEST(test_cylinder_ghost_one_axis)
{
	struct bench *b = bench_text("t", HEAD
	    "'source':{'wavelength':'1064 nm','power':'10 W','waist':'2 mm'},'path':["
	    "{'id':'S0','type':'space','length':'100 mm'},"
	    "{'id':'W0','type':'window','surface_reflectance':0,"
	    " 'damage':{'cw_irradiance':'10 kW/cm^2'}},"
	    "{'id':'S1','type':'space','length':'25 mm'},"
	    "{'id':'L1','type':'lens','focal':'100 mm','axis':'x','index':1.5,"
	    " 'surface_reflectance':0.04},"
	    "{'id':'S2','type':'space','length':'100 mm'},"
	    "{'id':'BD','type':'dump'}]}");
	struct trace *t = trace_rerun_opts(NULL, b, TRACE_GHOST_ROWS);
	const struct ghost_set *gs = t->ghosts;
	double w_hand = 1.064e-6 * 0.025 / (M_PI * 2e-3);
	int seen = 0;

	for (size_t i = 0; i < gs->n; i++) {
		const struct ghost *g = &gs->g[i];

		if (g->order != 1 || strcmp(g->surf_el[0]->id, "L1") != 0 || g->surf[0] != GS_BACK)
			continue;
		for (size_t k = 0; k < g->nrows; k++) {
			const struct ghost_row *r = &gs->rows[g->row0 + k];

			if (strcmp(r->el->id, "W0") == 0) {
				CHECK_REL(r->wx, w_hand, 2e-3);
				CHECK_REL(r->wy, 2e-3, 1e-4);
				seen = 1;
			}
		}
	}
	ck_assert(seen);
	trace_free(t);
	model_bench_free(b);

	/* and a round ghost meeting it: W1's double bounce (flat, 2 mm,
	 * collimated) crosses C1 and, 100 mm on at W0, is at C1's x focus,
	 * λf/(π w0) = 16.9 µm (Siegman, Lasers, eq. 17.8: the waist behind a
	 * lens of a collimated beam), and still 2 mm in y */
	b = bench_text("t", HEAD
	    "'source':{'wavelength':'1064 nm','power':'10 W','waist':'2 mm'},'path':["
	    "{'id':'W1','type':'window','surface_reflectance':0.04},"
	    "{'id':'S1','type':'space','length':'50 mm'},"
	    "{'id':'C1','type':'lens','focal':'100 mm','axis':'x','surface_reflectance':0},"
	    "{'id':'S2','type':'space','length':'100 mm'},"
	    "{'id':'W0','type':'window','surface_reflectance':0,"
	    " 'damage':{'cw_irradiance':'10 kW/cm^2'}},"
	    "{'id':'BD','type':'dump'}]}");
	t = trace_rerun_opts(NULL, b, TRACE_GHOST_ROWS);
	gs = t->ghosts;
	seen = 0;
	for (size_t i = 0; i < gs->n; i++) {
		const struct ghost *g = &gs->g[i];

		if (g->order != 2 || g->surf_el[0] != g->surf_el[1] ||
		    strcmp(g->surf_el[0]->id, "W1") != 0)
			continue;
		for (size_t k = 0; k < g->nrows; k++) {
			const struct ghost_row *r = &gs->rows[g->row0 + k];

			if (strcmp(r->el->id, "W0") == 0) {
				CHECK_REL(r->wx, 1.064e-6 * 0.1 / (M_PI * 2e-3), 1e-3);
				CHECK_REL(r->wy, 2e-3, 1e-4);
				seen = 1;
			}
		}
	}
	ck_assert(seen);
	trace_free(t);
	model_bench_free(b);
}
END_TEST

/* Keeping every ghost's rows (JSON, CSV) or only their sums (the
 * workbench, sweeps, tolerances) gives the same ratings and the same
 * ghosts, on a bench with every kind of optic a ghost crosses: round and
 * cylindrical thin lenses, a thick lens by its radii, a thick and a
 * Brewster window, a curved mirror off axis, a splitter and an isolator;
 * and each ghost's worst is the largest of its kept rows. */
START_TEST(test_rows_kept_same_ratings)
{
	struct bench *b = bench_text("t", HEAD
	    "'source':{'wavelength':'1064 nm','power':'10 W','waist':'1 mm'},'path':["
	    "{'id':'S0','type':'space','length':'100 mm'},"
	    "{'id':'ISO','type':'isolator','transmission':0.9,'isolation':30,"
	    " 'damage':{'cw_irradiance':'1 kW/cm^2'}},"
	    "{'id':'S1','type':'space','length':'50 mm'},"
	    "{'id':'L1','type':'lens','focal':'200 mm','surface_reflectance':0.01,"
	    " 'damage':{'cw_irradiance':'1 kW/cm^2'}},"
	    "{'id':'S2','type':'space','length':'60 mm'},"
	    "{'id':'M1','type':'mirror','roc':'500 mm','aoi':10,"
	    " 'damage':{'cw_irradiance':'1 kW/cm^2'}},"
	    "{'id':'S3','type':'space','length':'40 mm'},"
	    "{'id':'C1','type':'lens','focal':'-150 mm','axis':'y','surface_reflectance':0.02},"
	    "{'id':'S4','type':'space','length':'30 mm'},"
	    "{'id':'BS','type':'splitter','reflectance':0.3,'reflected':["
	    "  {'id':'SR','type':'space','length':'20 mm'},"
	    "  {'id':'WR','type':'window','thickness':'5 mm','surface_reflectance':0.03},"
	    "  {'id':'BDR','type':'dump'}]},"
	    "{'id':'S5','type':'space','length':'30 mm'},"
	    "{'id':'L2','type':'lens','r1':'50 mm','r2':'-80 mm','thickness':'4 mm',"
	    " 'index':1.5,'surface_reflectance':0.04,'damage':{'cw_irradiance':'1 kW/cm^2'}},"
	    "{'id':'S6','type':'space','length':'40 mm'},"
	    "{'id':'W2','type':'window','thickness':'3 mm','brewster':true,'index':1.45},"
	    "{'id':'S7','type':'space','length':'40 mm'},"
	    "{'id':'BD','type':'dump','damage':{'cw_irradiance':'1 kW/cm^2'}}]}");
	struct trace *lean = trace_run(b), *kept = trace_rerun_opts(NULL, b, TRACE_GHOST_ROWS);
	struct trace *bare = trace_rerun_opts(NULL, b, TRACE_NO_GHOSTS);
	const struct ghost_set *gl = lean->ghosts, *gk = kept->ghosts;
	size_t second = 0;

	ck_assert(!gl->rows_kept && gk->rows_kept);
	ck_assert_uint_eq(lean->nrows, kept->nrows);
	for (size_t i = 0; i < lean->nrows; i++) {
		ck_assert(lean->rows[i].ratio == kept->rows[i].ratio ||
		    (isnan(lean->rows[i].ratio) && isnan(kept->rows[i].ratio)));
		ck_assert_int_eq(lean->rows[i].status, kept->rows[i].status);
	}
	ck_assert(lean->safe_source_power == kept->safe_source_power);
	ck_assert_uint_eq(gl->n, gk->n);
	ck_assert_uint_eq(gl->nstrays, gk->nstrays);
	ck_assert(gl->return_power == gk->return_power);
	for (size_t i = 0; i < gl->n; i++) {
		const struct ghost *a = &gl->g[i], *g = &gk->g[i];
		double top = NAN;

		second += g->order == 2;
		ck_assert_uint_eq(a->nrows, g->nrows);
		ck_assert_uint_eq(a->nfoci, g->nfoci);
		ck_assert_int_eq(a->worst_row, g->worst_row);
		ck_assert(a->power_start == g->power_start);
		ck_assert(a->flags == g->flags);
		for (size_t k = 0; k < g->nrows; k++) {
			double r = gk->rows[g->row0 + k].ratio;

			if (!isnan(r) && (isnan(top) || r > top))
				top = r;
		}
		ck_assert(g->worst_row < 0 ? isnan(top) : top == g->worst_ratio);
	}
	ck_assert_uint_gt(second, 0);
	/* each element's summary is its kept rows, summed, and the one that
	 * counts most among them */
	for (size_t u = 0; u < kept->nrows; u++) {
		const struct ghost_at *at = &gl->at[u];
		size_t n = 0;
		double pw = 0, best = -1;
		long top = -1;

		for (size_t i = 0; i < gk->n; i++)
			for (size_t k = 0; k < gk->g[i].nrows; k++) {
				const struct ghost_row *r = &gk->rows[gk->g[i].row0 + k];
				double key = isnan(r->ratio) ? r->irradiance : r->ratio;

				if (r->trace_row != u)
					continue;
				n++;
				pw += r->power_in;
				if (key > best) {
					best = key;
					top = (long)i;
				}
			}
		ck_assert_uint_eq(at->nmet, n);
		CHECK_REL(at->power_in + 1e-300, pw + 1e-300, 1e-12);
		ck_assert_int_eq(at->top, top);
		/* and the main beam's own share is the trace without ghosts */
		ck_assert(at->main_ratio == bare->rows[u].ratio ||
		    (isnan(at->main_ratio) && isnan(bare->rows[u].ratio)));
	}
	trace_free(bare);
	trace_free(lean);
	trace_free(kept);
	model_bench_free(b);
}
END_TEST

/* The workbench draws the main beam first and adds the reflections when
 * no key waits: the trace made whole that way is the whole trace. */
START_TEST(test_add_ghosts_later_same)
{
	struct bench *b = demo();
	struct trace *t = trace_run(b), *later = trace_rerun_opts(NULL, b, TRACE_NO_GHOSTS);

	ck_assert_ptr_null(later->ghosts);
	trace_add_ghosts(later, 0);
	ck_assert_ptr_nonnull(later->ghosts);
	ck_assert_uint_eq(later->ghosts->n, t->ghosts->n);
	ck_assert_uint_eq(later->nwarn, t->nwarn);
	ck_assert_int_eq(later->worst, t->worst);
	ck_assert(later->safe_source_power == t->safe_source_power);
	for (size_t i = 0; i < t->nrows; i++) {
		ck_assert(later->rows[i].ratio == t->rows[i].ratio ||
		    (isnan(later->rows[i].ratio) && isnan(t->rows[i].ratio)));
		ck_assert_uint_eq(later->rows[i].flags, t->rows[i].flags);
	}
	trace_add_ghosts(later, 0);     /* twice: nothing more */
	ck_assert_uint_eq(later->nwarn, t->nwarn);
	trace_free(t);
	trace_free(later);
	model_bench_free(b);
}
END_TEST

/* A ghost going upstream crosses a thick lens the other way round: a
 * plano-convex lens (r1 = 50 mm, flat back, 10 mm of n = 1.5) meets the
 * W2 front ghost flat side first.  By hand from the ray matrices (the
 * table above; a plate of t is [[1, t/n], [0, 1]] reduced, Siegman,
 * Lasers, ch. 15): M = refract(n, 1, -r1) · plate · refract(1, n, -r2),
 * each radius changing sign on the return trip, and q' = (Aq + B)/(Cq + D)
 * (Kogelnik & Li 1966, eq. 21).  The forward matrix would put the plate
 * on the other side of the curved face and miss by far more than 1e-9. */
START_TEST(test_thick_lens_crossed_back)
{
	struct bench *b = bench_text("t", HEAD
	    "'source':{'wavelength':'1064 nm','power':'1 W','waist':'1 mm'},'path':["
	    "{'id':'W0','type':'window','surface_reflectance':0,"
	    " 'damage':{'cw_irradiance':'10 kW/cm^2'}},"
	    "{'id':'S1','type':'space','length':'50 mm'},"
	    "{'id':'L1','type':'lens','r1':'50 mm','thickness':'10 mm','index':1.5,"
	    " 'surface_reflectance':0},"
	    "{'id':'S2','type':'space','length':'100 mm'},"
	    "{'id':'W2','type':'window','surface_reflectance':[0.04, 0]},"
	    "{'id':'S3','type':'space','length':'50 mm'},"
	    "{'id':'BD','type':'dump'}]}");
	struct trace *t = trace_rerun_opts(NULL, b, TRACE_GHOST_ROWS);
	const struct ghost_set *gs = t->ghosts;
	double n = 1.5, lam = 1.064e-6, w_hand, w_fwd;
	struct m2 plate = { 1, 0.010 / n, 0, 1 };
	struct m2 mb = mul(refract(n, 1, -0.05), mul(plate, refract(1, n, INFINITY)));
	struct m2 mf = mul(refract(n, 1, INFINITY), mul(plate, refract(1, n, 0.05)));
	double complex q0 = row_of(t, "W2")->qx.q + 0.100, q, qf;
	int seen = 0;

	q = (mb.a * q0 + mb.b) / (mb.c * q0 + mb.d) + 0.050;
	qf = (mf.a * q0 + mf.b) / (mf.c * q0 + mf.d) + 0.050;
	w_hand = sqrt(lam * cabs(q) * cabs(q) / (M_PI * cimag(q)));
	w_fwd = sqrt(lam * cabs(qf) * cabs(qf) / (M_PI * cimag(qf)));
	ck_assert(fabs(w_fwd / w_hand - 1) > 1e-6);     /* the two ways differ */
	for (size_t i = 0; i < gs->n; i++) {
		const struct ghost *g = &gs->g[i];

		if (g->order != 1 || strcmp(g->surf_el[0]->id, "W2") != 0)
			continue;
		for (size_t k = 0; k < g->nrows; k++) {
			const struct ghost_row *r = &gs->rows[g->row0 + k];

			if (strcmp(r->el->id, "W0") == 0) {
				CHECK_REL(r->wx, w_hand, 1e-9);
				seen = 1;
			}
		}
	}
	ck_assert(seen);
	trace_free(t);
	model_bench_free(b);
}
END_TEST

/* What all ghosts lose by one splitter's fourth port is one stray, their
 * shares summed (that is the beam to block there).  By hand: BS (R = 0.5,
 * no loss) passes 0.5 W to W1; W1's front returns 0.5 · 0.02 = 10 mW and
 * its back 0.5 · 0.98² · 0.01 = 4.802 mW; BS sends R of each out of its
 * fourth port: 0.5 · 14.802 mW = 7.401 mW (ghost-conventions.md,
 * reciprocity). */
START_TEST(test_fourth_port_summed)
{
	struct bench *b = bench_text("t", HEAD
	    "'source':{'wavelength':'1064 nm','power':'1 W','waist':'1 mm'},'path':["
	    "{'id':'BS','type':'splitter','reflectance':0.5,'reflected':[{'id':'BDR','type':'dump'}]},"
	    "{'id':'S1','type':'space','length':'100 mm'},"
	    "{'id':'W1','type':'window','surface_reflectance':[0.02, 0.01]},"
	    "{'id':'S2','type':'space','length':'100 mm'},"
	    "{'id':'BD','type':'dump'}]}");
	struct trace *t = trace_run(b);
	const struct ghost_set *gs = t->ghosts;
	int n = 0;

	for (size_t i = 0; i < gs->nstrays; i++)
		if (strcmp(gs->strays[i].what, "fourth_port") == 0) {
			ck_assert_str_eq(gs->strays[i].from->id, "BS");
			CHECK_REL(gs->strays[i].power, 7.401e-3, 1e-9);
			n++;
		}
	ck_assert_int_eq(n, 1);
	trace_free(t);
	model_bench_free(b);
}
END_TEST

/* A ghost focus in air that sparks is an air_breakdown warning like the
 * main beam's, said to be a reflection's.  The back ghost of the f = 100
 * mm equi-convex lens (test_ghost_focus_over) focuses f/4 = 25 mm
 * upstream, 15 mm from W0 in the 40 mm gap.  Pulsed 100 mJ, 10 ns
 * Gaussian: the ghost carries 0.1 J · 0.96² · 0.04 = 3.6864 mJ, a peak of
 * 2√(ln2/π) · E/τ (the Gaussian pulse's peak, trace-conventions.md) into
 * w = λ(f/4)/(π w0) = 4.23 µm: 2 P/(π w²) ≈ 1.2e16 W/m², far over the
 * default 1e14. */
START_TEST(test_ghost_spark_warned)
{
	struct bench *b = bench_text("t", HEAD
	    "'source':{'wavelength':'1064 nm','waist':'2 mm',"
	    " 'pulsed':{'rep_rate':'10 Hz','pulse_width':'10 ns','pulse_energy':'100 mJ'}},"
	    "'path':["
	    "{'id':'W0','type':'window','surface_reflectance':0},"
	    "{'id':'S1','type':'space','length':'40 mm'},"
	    "{'id':'L1','type':'lens','focal':'100 mm','index':1.5,'surface_reflectance':0.04},"
	    "{'id':'S2','type':'space','length':'50 mm'},"
	    "{'id':'BD','type':'dump'}]}");
	struct trace *t = trace_run(b), *t0 = trace_rerun_opts(NULL, b, TRACE_NO_GHOSTS);
	double w = 1.064e-6 * 0.025 / (M_PI * 2e-3);
	double pk = 2 * sqrt(log(2.0) / M_PI) * 0.1 * 0.96 * 0.96 * 0.04 / 10e-9;
	int n = 0;

	ck_assert_int_eq(count_warn(t0, TW_AIR_BREAKDOWN), 0);
	for (size_t i = 0; i < t->nwarn; i++) {
		const struct trace_warning *x = &t->warn[i];

		if (x->kind != TW_AIR_BREAKDOWN)
			continue;
		/* (L1's double bounce, forward again, sparks in S2 as well) */
		ck_assert(x->ghost);
		if (strcmp(x->after->id, "S1") != 0)
			continue;
		n++;
		CHECK_REL(x->value, 2 * pk / (M_PI * w * w), 5e-3);
		CHECK_REL(x->distance, 0.015, 1e-3);
	}
	ck_assert_int_eq(n, 1);
	trace_free(t);
	trace_free(t0);
	model_bench_free(b);
}
END_TEST

/* A long glass chain is walked as two halves, in two threads: the halves
 * add up to the single walk (the same ghosts in the same order, sums
 * equal but for the order of addition) and to themselves run after run. */
START_TEST(test_halves_add_up)
{
	struct bench *b = model_bench_new("chain");
	struct trace *one, *two, *again;
	char id[32];

	b->src.wavelength = 1064e-9;
	b->src.power = 5;
	b->src.waist[0] = b->src.waist[1] = 1e-3;
	for (int i = 0; i < 60; i++) {
		struct element *el = model_branch_push(&b->path);

		snprintf(id, sizeof id, "S%d", i);
		model_element_init(el, EL_SPACE, id);
		model_set(el, K_LENGTH, 0.05, NULL);
		el = model_branch_push(&b->path);
		snprintf(id, sizeof id, "G%d", i);
		if (i % 2) {
			model_element_init(el, EL_LENS, id);
			model_set(el, K_FOCAL, i % 4 == 1 ? 0.5 : -0.5, NULL);
		} else {
			model_element_init(el, EL_WINDOW, id);
			model_set(el, K_APERTURE, 4e-3, NULL);
		}
		model_set(el, K_DMG_CW_IRRADIANCE, 1e8, NULL);
	}
	model_element_init(model_branch_push(&b->path), EL_DUMP, "BD");
	one = trace_rerun_opts(NULL, b, TRACE_NO_GHOSTS);
	ghost_run(one, GHOST_ONE_PART);
	two = trace_run(b);
	again = trace_run(b);
	ck_assert_uint_gt(two->ghosts->n, 1000);
	ck_assert_uint_eq(one->ghosts->n, two->ghosts->n);
	ck_assert_uint_eq(one->ghosts->nstrays, two->ghosts->nstrays);
	CHECK_REL(one->ghosts->return_power, two->ghosts->return_power, 1e-12);
	for (size_t i = 0; i < one->ghosts->n; i++) {
		const struct ghost *g1 = &one->ghosts->g[i], *g2 = &two->ghosts->g[i];

		ck_assert(g1->power_start == g2->power_start);
		ck_assert(g1->surf_el[0] == g2->surf_el[0] && g1->surf_el[1] == g2->surf_el[1]);
		ck_assert_uint_eq(g1->nrows, g2->nrows);
		ck_assert_int_eq(g1->worst_row, g2->worst_row);
		ck_assert(g1->worst_ratio == g2->worst_ratio ||
		    (isnan(g1->worst_ratio) && isnan(g2->worst_ratio)));
	}
	for (size_t u = 0; u < one->nrows; u++) {
		if (!isnan(one->rows[u].ratio))
			CHECK_REL(two->rows[u].ratio, one->rows[u].ratio, 1e-12);
		ck_assert_uint_eq(one->ghosts->at[u].nmet, two->ghosts->at[u].nmet);
		ck_assert_int_eq(one->ghosts->at[u].top, two->ghosts->at[u].top);
		ck_assert(two->rows[u].ratio == again->rows[u].ratio ||
		    (isnan(two->rows[u].ratio) && isnan(again->rows[u].ratio)));
	}
	trace_free(one);
	trace_free(two);
	trace_free(again);
	model_bench_free(b);
}
END_TEST

/* --no-ghosts is the main beam alone: no ghost set, and every row the
 * same as the ghost trace's before ghosts are added (ratios aside). */
START_TEST(test_no_ghosts_same_rows)
{
	struct bench *b = demo();
	struct trace *t0 = trace_rerun_opts(NULL, b, TRACE_NO_GHOSTS), *t = trace_run(b);

	ck_assert_ptr_null(t0->ghosts);
	ck_assert_ptr_nonnull(t->ghosts);
	ck_assert_uint_eq(t0->nrows, t->nrows);
	for (size_t i = 0; i < t->nrows; i++) {
		ck_assert(t0->rows[i].power_in == t->rows[i].power_in);
		ck_assert(t0->rows[i].wx == t->rows[i].wx);
		ck_assert(!(t0->rows[i].flags & TF_GHOSTS));
		/* ghosts only add: a share never falls */
		if (!isnan(t0->rows[i].ratio))
			ck_assert(t->rows[i].ratio >= t0->rows[i].ratio);
	}
	trace_free(t0);
	trace_free(t);
	model_bench_free(b);
}
END_TEST

int
main(void)
{
	Suite *s = suite_create("ghost");
	TCase *tc = tcase_create("core");

	tcase_add_loop_test(tc, test_lens_ghost_focal, 0, NELEMS(lens_cases));
	tcase_add_test(tc, test_shape_assumed);
	tcase_add_loop_test(tc, test_fresnel, 0, NELEMS(fresnel_cases));
	tcase_add_test(tc, test_bookkeeping);
	tcase_add_test(tc, test_ghost_focus_over);
	tcase_add_test(tc, test_second_order_pair);
	tcase_add_test(tc, test_no_ghosts_same_rows);
	tcase_add_test(tc, test_cylinder_ghost_one_axis);
	tcase_add_test(tc, test_rows_kept_same_ratings);
	tcase_add_test(tc, test_add_ghosts_later_same);
	tcase_add_test(tc, test_thick_lens_crossed_back);
	tcase_add_test(tc, test_fourth_port_summed);
	tcase_add_test(tc, test_ghost_spark_warned);
	tcase_add_test(tc, test_halves_add_up);
	suite_add_tcase(s, tc);
	return run_suite(s);
}
