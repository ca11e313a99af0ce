/* bench_sweep.c - what a sweep and --every-point cost: a 1,000-step sweep
 * of the demo bench's half-wave plate (engine time, target < 30 ms, with
 * its bisections; beside it 1,000 bare traces), and tracing the base and
 * 10 operating points (target: no more than 10 whole traces; the points
 * are traced lean, TRACE_LEAN, as they are read for their ratings only).
 * Prints its figures; asserts nothing. */
#include <config.h>

#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>

#include "bench-demo.h"
#include "bench-file.h"
#include "core-point.h"
#include "core-sweep.h"
#include "core-trace.h"

static double
now(void)
{
	struct timespec ts;

	clock_gettime(CLOCK_MONOTONIC, &ts);
	return ts.tv_sec + ts.tv_nsec * 1e-9;
}

int
main(void)
{
	char *cause = NULL;
	struct bench *b = bench_file_parse(bench_demo_text, strlen(bench_demo_text), "demo", &cause);
	struct sweep_knob k;
	struct trace *t = NULL;
	double best_sweep = 1e9, best_traces = 1e9, best_survey = 1e9, best_pt = 1e9;
	size_t nrated = 0;

	if (b == NULL || sweep_knob_parse(b, "HWP1.angle", &k, &cause) != 0) {
		fprintf(stderr, "bench_sweep: %s\n", cause);
		return 2;
	}
	for (int round = 0; round < 5; round++) {
		double t0 = now();
		struct sweep *sw = sweep_run(b, &k, 0, 45, 1000, 0, &cause);
		double dt = now() - t0;

		if (sw == NULL) {
			fprintf(stderr, "bench_sweep: %s\n", cause);
			return 2;
		}
		nrated = sw->nrated;
		sweep_free(sw);
		if (dt < best_sweep)
			best_sweep = dt;
		t0 = now();
		for (int s = 0; s < 1000; s++) {
			sweep_knob_set(&k, b, 45.0 * s / 999);
			t = trace_rerun(t, b);
		}
		sweep_knob_set(&k, b, k.base);
		dt = now() - t0;
		if (dt < best_traces)
			best_traces = dt;
	}
	{
		struct sweep *sw = sweep_run(b, &k, 0, 45, 201, 0, &cause);
		struct sweep_plot pl;
		double t0 = now(), dt;

		for (int r = 0; r < 1000; r++) {
			sweep_plot_layout(sw, b->safety_factor, 90, 22, 4, &pl);
			sweep_plot_release(&pl);
		}
		dt = (now() - t0) / 1000;
		printf("workbench sweep cursor: the plot laid out again in %.1f us "
		    "(90 x 22 cells, 201 steps; the screen's target for a redraw is < 10 ms)\n",
		    dt * 1e6);
		sweep_free(sw);
	}
	printf("sweep of the demo (%zu elements, %zu rated), HWP1.angle 0..45 in 1000 steps:\n"
	    "  %.2f ms engine time with crossings and safe intervals (target < 30 ms)\n"
	    "  %.2f ms for 1000 whole traces of the same bench (best of 5; the sweep traces lean)\n",
	    model_count(&b->path), nrated, best_sweep * 1e3, best_traces * 1e3);

	/* 10 operating points: the source at other energies, the ND changed */
	for (int i = 0; i < 10; i++) {
		char name[16], e[40], od[40];
		char *ch[2] = { e, od };

		snprintf(name, sizeof name, "p%d", i);
		snprintf(e, sizeof e, "source.pulse_energy=%d mJ", 20 + 20 * i);
		snprintf(od, sizeof od, "ND1.od=%g", 0.3 + 0.1 * i);
		if (point_edit_add(b, name, ch, 2, &cause) != 0) {
			fprintf(stderr, "bench_sweep: %s\n", cause);
			return 2;
		}
	}
	for (int round = 0; round < 5; round++) {
		struct point_survey sv;
		double t0 = now(), dt;

		for (int r = 0; r < 100; r++) {
			if (point_survey_run(b, NULL, &sv, &cause) != 0) {
				fprintf(stderr, "bench_sweep: %s\n", cause);
				return 2;
			}
			point_survey_release(&sv);
		}
		dt = (now() - t0) / 100;
		if (dt < best_survey)
			best_survey = dt;
		t0 = now();
		for (int r = 0; r < 100; r++)
			for (int p = 0; p < 11; p++)
				trace_free(trace_run(b));
		dt = (now() - t0) / 100;
		if (dt < best_pt)
			best_pt = dt;
	}
	printf("--every-point on the demo with 10 points (base + 10):\n"
	    "  %.1f us per survey (copy, apply and trace each; the points lean)\n"
	    "  %.1f us for 11 whole traces: the survey costs %.2f traces (target <= 10)\n",
	    best_survey * 1e6, best_pt * 1e6, 11 * best_survey / best_pt);
	trace_free(t);
	sweep_knob_release(&k);
	model_bench_free(b);
	return 0;
}
