/* bench_trace.c - how long the trace engine takes per element, for chains
 * of 10, 10^3 and 10^5 elements (target: <= 40 ns per element on one
 * core, within 2x of a bare loop of the same arithmetic timed here, and a
 * fresh result within 1.5x of a reused one), and how long the whole
 * `trace --format json` process takes on a 10^5-element bench file
 * (target: < 0.2 s) and its peak memory (max RSS, target: < 60 MB), and
 * on 10^4 elements against a pure-Python tracer of the same physics,
 * benches/trace_peer.py (target: 50 times faster).
 * The main beam alone (TRACE_NO_GHOSTS, --no-ghosts): what the surface
 * reflections add is bench_ghost's figure.
 * Prints its figures; asserts nothing. */
#include <config.h>

#include <complex.h>
#ifdef __GLIBC__
#include <malloc.h>
#endif
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>
#include <fcntl.h>
#include <sys/resource.h>
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

/* Resident memory of this process now (kB); -1 where /proc does not say. */
static long
self_rss_kb(void)
{
	FILE *f = fopen("/proc/self/statm", "r");
	long size, resident = -1;

	if (f != NULL) {
		if (fscanf(f, "%ld %ld", &size, &resident) != 2)
			resident = -1;
		fclose(f);
	}
	return resident < 0 ? -1 : resident * (sysconf(_SC_PAGESIZE) / 1024);
}

/* One run of `PROG trace --no-ghosts --format json FILE` to /dev/null: its
 * wall time and its peak memory (the child's ru_maxrss, kB).  0, or -1
 * when it could not run or exited other than 0 or 1 (something over). */
static int
run_whole(const char *prog, const char *file, double *dt, long *maxrss_kb)
{
	struct rusage ru;
	double t0 = now();
	int st;
	pid_t pid = fork();

	if (pid < 0)
		return -1;
	if (pid == 0) {
		int fd = open("/dev/null", O_WRONLY);

		if (fd < 0 || dup2(fd, STDOUT_FILENO) < 0)
			_exit(127);
		execlp(prog, prog, "trace", "--no-ghosts", "--format", "json", file, (char *)NULL);
		_exit(127);
	}
	if (wait4(pid, &st, 0, &ru) != pid)
		return -1;
	*dt = now() - t0;
	*maxrss_kb = ru.ru_maxrss;
	return WIFEXITED(st) && (WEXITSTATUS(st) == 0 || WEXITSTATUS(st) == 1) ? 0 : -1;
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

/* The per-element arithmetic of a trace as a bare C loop, the yardstick
 * issue #12 sets the engine against: two ABCD updates of a complex q, both
 * radii, a Mueller matrix times the Stokes vector, the irradiance, a ratio
 * and one result row written.  Invented but fixed matrices; no branches
 * on element types, no allocation. */
struct bare_row { double p, wx, wy, irr, ratio, s[4]; };

static double
bare_loop(size_t n, struct bare_row *out, int reps)
{
	double best = 1e9;

	for (int round = 0; round < reps; round++) {
		double complex qx = 0.1 + 3.0 * I, qy = 0.1 + 2.9 * I;
		double s[4] = { 5, 1, 0, 0 }, t0 = now();
		static const double m[16] = {
			0.99, 0.01, 0, 0, 0.01, 0.99, 0, 0, 0, 0, 0.98, 0.02, 0, 0, -0.02, 0.98 };

		for (size_t i = 0; i < n; i++) {
			double a = 1, b = 0.1, c = i % 2 ? -1.0 / 0.5 : 0, d = 1, r[4];
			double ex, ix, ey, iy;

			qx = (a * qx + b) / (c * qx + d);
			qy = (a * qy + b) / (c * qy + d);
			ex = creal(qx), ix = cimag(qx), ey = creal(qy), iy = cimag(qy);
			out[i].wx = sqrt(1.064e-6 * (ex * ex + ix * ix) / (M_PI * ix));
			out[i].wy = sqrt(1.064e-6 * (ey * ey + iy * iy) / (M_PI * iy));
			for (int k = 0; k < 4; k++)
				r[k] = m[4 * k] * s[0] + m[4 * k + 1] * s[1] + m[4 * k + 2] * s[2] +
				    m[4 * k + 3] * s[3];
			memcpy(s, r, sizeof s);
			memcpy(out[i].s, s, sizeof s);
			out[i].p = s[0];
			out[i].irr = 2 * s[0] / (M_PI * out[i].wx * out[i].wy);
			out[i].ratio = out[i].irr / 1e9;
			if (!(ix > 0))      /* keep q a beam: a lens pair that runs away */
				qx = 0.1 + 3.0 * I;
			if (!(iy > 0))
				qy = 0.1 + 2.9 * I;
		}
		double per = (now() - t0) / (double)n;
		if (per < best)
			best = per;
	}
	return best;
}

/* Wall time of a shell command, best of `rounds`; -1 when it fails. */
static double
time_cmd(const char *cmd, int rounds)
{
	double best = 1e9;

	for (int round = 0; round < rounds; round++) {
		double t0 = now(), dt;
		int rc = system(cmd);

		dt = now() - t0;
		if (rc == -1 || (WEXITSTATUS(rc) != 0 && WEXITSTATUS(rc) != 1))
			return -1;
		if (dt < best)
			best = dt;
	}
	return best;
}

/* The whole process on 10^4 elements against benches/trace_peer.py, a
 * straightforward pure-Python tracer of the same physics that reads the
 * same file and writes JSON (target: at least 50 times faster).  Their
 * ratios are compared too, so that the race is between equals. */
static int
peer_figure(const char *prog, const char *peer)
{
	struct bench *b = make_chain(10000);
	char path[] = "/tmp/bench_trace_peer.XXXXXX", cmd[1024], line[256];
	char *text = bench_file_dump(b);
	int fd = mkstemp(path);
	FILE *f = fd >= 0 ? fdopen(fd, "w") : NULL;
	double tb, tp, diff = NAN;

	if (f == NULL || fputs(text, f) == EOF || fclose(f) != 0) {
		perror("bench_trace: temporary file");
		return 2;
	}
	snprintf(cmd, sizeof cmd, "%s trace --no-ghosts --format json %s >/dev/null", prog, path);
	tb = time_cmd(cmd, 5);
	snprintf(cmd, sizeof cmd, "python3 '%s' %s >/dev/null 2>&1", peer, path);
	tp = time_cmd(cmd, 3);
	/* the same ratios: the largest relative difference over the elements */
	snprintf(cmd, sizeof cmd, "python3 -c '"
	    "import json, subprocess, sys\n"
	    "a = json.loads(subprocess.run([\"python3\", sys.argv[1], sys.argv[3]], "
	    "capture_output=True).stdout)\n"
	    "b = json.loads(subprocess.run([sys.argv[2], \"trace\", \"--no-ghosts\", "
	    "\"--format\", \"json\", sys.argv[3]], capture_output=True).stdout)\n"
	    "ra = {e[\"id\"]: e[\"ratio\"] for e in a[\"elements\"]}\n"
	    "print(max(abs(ra[e[\"id\"]] - e[\"ratio\"]) / e[\"ratio\"] for e in "
	    "b[\"elements\"] if e.get(\"ratio\")))' '%s' '%s' %s 2>/dev/null", peer, prog, path);
	if ((f = popen(cmd, "r")) != NULL) {
		if (fgets(line, sizeof line, f) != NULL)
			diff = strtod(line, NULL);
		pclose(f);
	}
	unlink(path);
	free(text);
	model_bench_free(b);
	if (tb < 0) {
		fprintf(stderr, "bench_trace: '%s trace' failed\n", prog);
		return 2;
	}
	if (tp < 0) {
		printf("whole process on 10000 elements: %.3f s; plain Python peer: - "
		    "(python3 or %s not found)\n", tb, peer);
		return 0;
	}
	printf("whole process, trace --format json on 10000 elements: %.4f s; the plain-Python "
	    "tracer (%s) %.3f s:\n  %.1f x faster (target >= 50 x); their ratios agree to "
	    "%.1e relative\n", tb, peer, tp, tp / tb, diff);
	return 0;
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
		{
			struct bare_row *out = xcalloc(sizes[s], sizeof *out);
			double bare = bare_loop(sizes[s], out, sizes[s] < 1000 ? 200000 : 2000);

			free(out);
			printf("  %6zu elements: %7.1f ns per element reusing the result (trace_rerun), "
			    "%7.1f ns with a fresh result each time\n"
			    "                  bare loop of the same arithmetic %5.1f ns: the engine is "
			    "%.2f x it reusing (target <= 40 ns and <= 2 x), fresh %.2f x reusing "
			    "(target <= 1.5 x)\n"
			    "                  (best of 5 rounds of %zu traces)\n",
			    sizes[s], best_reuse * 1e9, best * 1e9, bare * 1e9, best_reuse / bare,
			    best / best_reuse, reps);
		}
		if (s + 1 == sizeof sizes / sizeof *sizes) {
			char path[] = "/tmp/bench_trace.XXXXXX";
			char *text = bench_file_dump(b);
			size_t text_kb = strlen(text) / 1024;
			int fd = mkstemp(path);
			FILE *f = fd >= 0 ? fdopen(fd, "w") : NULL;
			long peak_kb = 0, own_kb;

			if (f == NULL || fputs(text, f) == EOF || fclose(f) != 0) {
				perror("bench_trace: temporary file");
				return 2;
			}
			/* the bench goes before the child is made: a child's
			 * ru_maxrss counts what its parent held when it forked */
			free(text);
			model_bench_free(b);
			b = NULL;
#ifdef __GLIBC__
			malloc_trim(0);     /* and what malloc keeps of it */
#endif
			own_kb = self_rss_kb();
			best = 1e9;
			for (int round = 0; round < 3; round++) {
				double dt;
				long kb;

				if (run_whole(prog, path, &dt, &kb) != 0) {
					fprintf(stderr, "bench_trace: '%s trace --no-ghosts --format json "
					    "%s' failed\n", prog, path);
					unlink(path);
					return 2;
				}
				if (dt < best)
					best = dt;
				if (kb > peak_kb)
					peak_kb = kb;
			}
			printf("whole process, trace --no-ghosts --format json on %zu elements "
			    "(%zu kB file): %.3f s (best of 3; target < 0.2 s)\n"
			    "                  peak memory %.1f MiB (max RSS, largest of 3; "
			    "target < 60 MB = %.1f MiB)%s\n", sizes[s], text_kb, best,
			    peak_kb / 1024.0, 60e6 / 1048576,
			    own_kb < 0 || peak_kb <= own_kb ? ", at most: this bench held as much "
			    "when it started the run" : "");
			unlink(path);
		}
		model_bench_free(b);
	}
	return peer_figure(prog, argc > 2 ? argv[2] : "benches/trace_peer.py");
}
