/* bench_ghost.c - what tracing the surface reflections costs: the demo's
 * trace with and without ghosts (target: at most 2 ms more), and the whole
 * trace of a chain of 100 glass elements (200 surfaces, about 20,000
 * second-order ghost paths; target: < 50 ms on one core).
 * Prints its figures; asserts nothing. */
#include <config.h>

#include <stdio.h>
#include <string.h>
#include <time.h>

#include "bench-demo.h"
#include "bench-file.h"
#include "core-ghost.h"
#include "core-model.h"
#include "core-trace.h"

static double
now(void)
{
	struct timespec ts;

	clock_gettime(CLOCK_MONOTONIC, &ts);
	return ts.tv_sec + ts.tv_nsec * 1e-9;
}

/* Best of `reps` runs, seconds. */
static double
time_trace(const struct bench *b, unsigned opts, int reps, size_t *nghosts)
{
	double best = 1e9;

	for (int r = 0; r < reps; r++) {
		double t0 = now();
		struct trace *t = trace_rerun_opts(NULL, b, opts);
		double dt = now() - t0;

		if (dt < best)
			best = dt;
		if (nghosts != NULL)
			*nghosts = t->ghosts != NULL ? t->ghosts->n : 0;
		trace_free(t);
	}
	return best;
}

/* Windows and lenses, 100 of them, 50 mm apart (invented). */
static struct bench *
glass_chain(size_t nglass)
{
	struct bench *b = model_bench_new("glass-chain");
	char id[32];

	b->src.wavelength = 1064e-9;
	b->src.power = 5;
	b->src.waist[0] = b->src.waist[1] = 1e-3;
	for (size_t i = 0; i < nglass; i++) {
		struct element *el = model_branch_push(&b->path);

		snprintf(id, sizeof id, "S%zu", i);
		model_element_init(el, EL_SPACE, id);
		model_set(el, K_LENGTH, 0.05, NULL);
		el = model_branch_push(&b->path);
		snprintf(id, sizeof id, "G%zu", i);
		if (i % 2) {
			model_element_init(el, EL_LENS, id);
			model_set(el, K_FOCAL, i % 4 == 1 ? 0.5 : -0.5, NULL);
		} else {
			model_element_init(el, EL_WINDOW, id);
		}
		model_set(el, K_DMG_CW_IRRADIANCE, 1e8, NULL);
	}
	model_element_init(model_branch_push(&b->path), EL_DUMP, "BD");
	return b;
}

int
main(void)
{
	struct bench *demo = bench_file_parse(bench_demo_text, strlen(bench_demo_text),
	    "demo", NULL), *chain = glass_chain(100);
	double d0 = time_trace(demo, TRACE_NO_GHOSTS, 50, NULL);
	double d1;
	size_t ng = 0;

	d1 = time_trace(demo, 0, 50, &ng);
	printf("demo: trace %.3f ms without ghosts, %.3f ms with (%zu ghosts): "
	    "%.3f ms for the reflections (target <= 2 ms)\n", d0 * 1e3, d1 * 1e3, ng,
	    (d1 - d0) * 1e3);
	d0 = time_trace(chain, TRACE_NO_GHOSTS, 5, NULL);
	d1 = time_trace(chain, 0, 5, &ng);
	printf("200-surface chain: whole trace %.1f ms with ghosts (%zu ghosts), "
	    "%.3f ms without (target < 50 ms)\n", d1 * 1e3, ng, d0 * 1e3);
	model_bench_free(demo);
	model_bench_free(chain);
	return 0;
}
