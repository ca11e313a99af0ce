/* bench_report.c - how long the printed review takes: the demo bench's PDF
 * (target < 150 ms), a 200-element bench's PDF (target < 1 s), and the
 * demo's SVG plot and Markdown, each from a traced bench to the bytes in
 * memory (the file write is a rename and not timed); then the whole
 * `beamledger report --demo -o FILE.pdf` process, start-up included (and
 * the print module loaded), the same for Markdown (no module), and the
 * start of the program alone, `--version` (no command loads cairo or pango
 * but a PDF or SVG; report-print.h).
 * Prints its figures; asserts nothing. */
#include <config.h>

#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>
#include <fcntl.h>
#include <sys/wait.h>
#include <unistd.h>

#include "bench-demo.h"
#include "bench-file.h"
#include "core-model.h"
#include "core-trace.h"
#include "report-review.h"
#include "util-err.h"

static double
now(void)
{
	struct timespec ts;

	clock_gettime(CLOCK_MONOTONIC, &ts);
	return ts.tv_sec + ts.tv_nsec * 1e-9;
}

/* 200 elements: gaps, rated folding mirrors, a side pick-off every 40
 * elements into a dump, a dump at the end (invented). */
static struct bench *
long_bench(void)
{
	struct bench *b = model_bench_new("long-line");
	char id[32];

	b->src.wavelength = 1064e-9;
	b->src.power = 5;
	b->src.waist[0] = b->src.waist[1] = 1e-3;
	for (size_t i = 0; i < 199; i++) {
		struct element *el = model_branch_push(&b->path);

		snprintf(id, sizeof id, "E%zu", i);
		if (i % 2 == 0) {
			model_element_init(el, EL_SPACE, id);
			model_set(el, K_LENGTH, 0.05, NULL);
		} else if (i % 40 == 39) {
			struct element *d;

			model_element_init(el, EL_SPLITTER, id);
			model_set(el, K_REFLECTANCE, 0.01, NULL);
			el->side_port = PORT_REFLECTED;
			d = model_branch_push(&el->side);
			snprintf(id, sizeof id, "D%zu", i);
			model_element_init(d, EL_DUMP, id);
			model_set(d, K_MAX_POWER, 1, NULL);
		} else {
			model_element_init(el, EL_MIRROR, id);
			model_set(el, K_REFLECTANCE, 0.999, NULL);
			model_set(el, K_AOI, 45, NULL);
			model_set(el, K_DMG_CW_LINEAR, 1e5, NULL);
		}
	}
	model_element_init(model_branch_push(&b->path), EL_DUMP, "END");
	model_set(&b->path.el[b->path.n - 1], K_MAX_POWER, 10, NULL);
	return b;
}

static void
time_one(const char *what, struct bench *b, int form, double target_ms, int reps)
{
	char *cause = NULL, hash[] = "0000000000000000000000000000000000000000000000000000000000000000";
	double best = 1e9, t0;
	size_t len = 0;

	for (int r = 0; r < reps; r++) {
		struct trace *t;
		struct review rv;
		unsigned char *out;

		t0 = now();
		t = trace_run(b);
		rv = (struct review){ .bench = b, .trace = t, .setup = "setup #1",
			.time = "2026-01-01 00:00:00", .author = "bench", .note = "timing run",
			.origin = "benchmark", .hash = hash, .printed = "2026-01-01 00:00:00" };
		out = form == 0 ? review_pdf(&rv, &len, &cause) : form == 1 ?
		    review_svg(&rv, &len, &cause) : (unsigned char *)review_markdown(&rv);
		if (out == NULL) {
			fprintf(stderr, "bench_report: %s\n", cause);
			exit(1);
		}
		if (form == 2)
			len = strlen((char *)out);
		free(out);
		trace_free(t);
		if (now() - t0 < best)
			best = now() - t0;
	}
	if (target_ms > 0)
		printf("%-34s %8.1f ms  (%zu bytes; target < %.0f ms; best of %d)\n", what,
		    best * 1e3, len, target_ms, reps);
	else
		printf("%-34s %8.1f ms  (%zu bytes; best of %d)\n", what, best * 1e3, len, reps);
}

/* The whole process, fonts and all, best of a few runs. */
static void
time_process(const char *prog, const char *file, const char *what, const char *target)
{
	char dir[] = "/tmp/bench-report.XXXXXX", *cmd, *out;
	double best = 1e9;

	if (mkdtemp(dir) == NULL) {
		perror("bench_report: mkdtemp");
		return;
	}
	out = xasprintf("%s/%s", dir, file);
	cmd = xasprintf("'%s' report --demo -o '%s' >/dev/null", prog, out);
	for (int r = 0; r < 5; r++) {
		double t0 = now();

		if (system(cmd) != 0) {
			fprintf(stderr, "bench_report: '%s' failed\n", cmd);
			break;
		}
		if (now() - t0 < best)
			best = now() - t0;
	}
	printf("%-34s %8.1f ms  (%s; best of 5)\n", what, best * 1e3, target);
	unlink(out);
	rmdir(dir);
	free(out);
	free(cmd);
}

/* `prog --version` from fork to exit, without a shell: what every command
 * and the workbench pay before they start. */
static void
time_start(const char *prog)
{
	double best = 1e9;

	for (int r = 0; r < 20; r++) {
		double t0 = now();
		int st;
		pid_t pid = fork();

		if (pid == 0) {
			int fd = open("/dev/null", O_WRONLY);

			if (fd >= 0)
				dup2(fd, 1);
			execl(prog, prog, "--version", (char *)NULL);
			_exit(127);
		}
		if (pid < 0 || waitpid(pid, &st, 0) != pid || !WIFEXITED(st) ||
		    WEXITSTATUS(st) != 0) {
			fprintf(stderr, "bench_report: '%s --version' failed\n", prog);
			return;
		}
		if (now() - t0 < best)
			best = now() - t0;
	}
	printf("%-34s %8.2f ms  (no cairo or pango loaded; best of 20)\n",
	    "--version, process", best * 1e3);
}

int
main(int argc, char **argv)
{
	char *cause = NULL;
	struct bench *demo = bench_file_parse(bench_demo_text, strlen(bench_demo_text), "demo",
	    &cause), *big = long_bench();

	if (demo == NULL || model_validate(big, &cause) != 0) {
		fprintf(stderr, "bench_report: %s\n", cause);
		return 1;
	}
	time_one("demo review, PDF", demo, 0, 150, 5);
	time_one("200-element review, PDF", big, 0, 1000, 3);
	time_one("demo profile plots, SVG", demo, 1, 0, 5);
	time_one("demo review, Markdown", demo, 2, 0, 5);
	time_process(argc > 1 ? argv[1] : "./src/beamledger", "demo.pdf",
	    "report --demo -o demo.pdf, process", "target < 150 ms");
	time_process(argc > 1 ? argv[1] : "./src/beamledger", "demo.md",
	    "report --demo -o demo.md, process", "no print module");
	time_start(argc > 1 ? argv[1] : "./src/beamledger");
	model_bench_free(demo);
	model_bench_free(big);
	return 0;
}
