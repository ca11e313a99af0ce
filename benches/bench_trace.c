/* bench_trace.c - how long the trace engine takes per element, for chains
 * of 10, 10^3 and 10^5 elements (target: <= 100 ns per element on one
 * core, linear in length), and how long the whole `trace --format json`
 * process takes on a 10^5-element bench file (target: < 1 s).
 * The main beam alone (TRACE_NO_GHOSTS, --no-ghosts): what the surface
 * reflections add is bench_ghost's figure.
 * Prints its figures; asserts nothing. */
#include <config.h>

#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>
#include <sys/wait.h>
#include <unistd.h>

#include "bench-file.h"
#include "core-model.h"
#include "core-trace.h"
#include "util-err.h"

static double
now(void)
{
	struct timespec ts;

	clock_gettime(CLOCK_MONOTONIC, &ts);
	return ts.tv_sec + ts.tv_nsec * 1e-9;
}

/* A long relay line: gaps, lenses that refocus, folding mirrors with
 * ratings, a window with n2, and a dump at the end (invented). */
static struct bench *
make_chain(size_t n)
{
	struct bench *b = model_bench_new("relay");
	char id[32];

	b->src.wavelength = 1064e-9;
	b->src.power = 5;
	b->src.waist[0] = b->src.waist[1] = 1e-3;
	for (size_t i = 0; i + 1 < n; i++) {
		struct element *el = model_branch_push(&b->path);

		snprintf(id, sizeof id, "E%zu", i);
		switch (i % 4) {
		case 0:
			model_element_init(el, EL_SPACE, id);
			model_set(el, K_LENGTH, 0.1, NULL);
			break;
		case 1:
			model_element_init(el, EL_MIRROR, id);
			model_set(el, K_REFLECTANCE, 0.99999, NULL);
			model_set(el, K_AOI, 45, NULL);
			model_set(el, K_DMG_CW_LINEAR, 1e6, NULL);
			break;
		case 2:
			model_element_init(el, EL_SPACE, id);
			model_set(el, K_LENGTH, 0.1, NULL);
			break;
		default:
			model_element_init(el, EL_LENS, id);
			model_set(el, K_FOCAL, 0.1, NULL);
			model_set(el, K_DMG_CW_IRRADIANCE, 1e9, NULL);
			break;
		}
	}
	model_element_init(model_branch_push(&b->path), EL_DUMP, "END");
	return b;
}

int
main(int argc, char **argv)
{
	static const size_t sizes[] = { 10, 1000, 100000 };
	const char *prog = argc > 1 ? argv[1] : "./src/beamledger";
	char *cause = NULL;

	printf("trace engine, one core:\n");
	for (size_t s = 0; s < sizeof sizes / sizeof *sizes; s++) {
		struct bench *b = make_chain(sizes[s]);
		size_t reps = 2000000 / sizes[s] + 3, done = 0;
		double t0, best = 1e9, best_reuse = 1e9;
		struct trace *t = NULL;

		if (model_validate(b, &cause) != 0) {
			fprintf(stderr, "bench_trace: %s\n", cause);
			return 2;
		}
		for (int round = 0; round < 5; round++) {
			t0 = now();
			for (size_t r = 0; r < reps; r++)
				trace_free(trace_rerun_opts(NULL, b, TRACE_NO_GHOSTS));
			done = reps;
			double per = (now() - t0) / (double)(done * sizes[s]);
			if (per < best)
				best = per;
			t0 = now();
			for (size_t r = 0; r < reps; r++)
				t = trace_rerun_opts(t, b, TRACE_NO_GHOSTS);
			per = (now() - t0) / (double)(done * sizes[s]);
			if (per < best_reuse)
				best_reuse = per;
		}
		trace_free(t);
		printf("  %6zu elements: %7.1f ns per element reusing the result (trace_rerun), "
		    "%7.1f ns with a fresh result each time\n"
		    "                  (best of 5 rounds of %zu traces; target <= 100 ns)\n",
		    sizes[s], best_reuse * 1e9, best * 1e9, reps);
		if (s + 1 == sizeof sizes / sizeof *sizes) {
			char path[] = "/tmp/bench_trace.XXXXXX";
			char *text = bench_file_dump(b), cmd[512];
			int fd = mkstemp(path);
			FILE *f = fd >= 0 ? fdopen(fd, "w") : NULL;

			if (f == NULL || fputs(text, f) == EOF || fclose(f) != 0) {
				perror("bench_trace: temporary file");
				return 2;
			}
			snprintf(cmd, sizeof cmd, "%s trace --no-ghosts --format json %s >/dev/null", prog, path);
			best = 1e9;
			for (int round = 0; round < 3; round++) {
				t0 = now();
				int rc = system(cmd);
				double dt = now() - t0;

				if (rc == -1 || (WEXITSTATUS(rc) != 0 && WEXITSTATUS(rc) != 1)) {
					fprintf(stderr, "bench_trace: '%s' failed\n", cmd);
					return 2;
				}
				if (dt < best)
					best = dt;
			}
			printf("whole process, trace --format json on %zu elements (%zu kB file): "
			    "%.3f s (best of 3)\n", sizes[s], strlen(text) / 1024, best);
			unlink(path);
			free(text);
		}
		model_bench_free(b);
	}
	return 0;
}
