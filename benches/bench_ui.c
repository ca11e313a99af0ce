/* bench_ui.c - how fast the workbench answers.  Prints, never asserts:
 *   1. start to first full screen on a database whose bench has 1,000
 *      revisions (target <= 100 ms): the bench list, and `open BENCH`;
 *   2. one value edited on a 200-element bench, retraced, saved to the
 *      draft and redrawn (target <= 10 ms), replayed as keys; then, as
 *      the workbench does once no key waits, its reflections counted and
 *      the screen drawn again (printed, no target of its own);
 *   3. the sweep screen's cursor moved one step on the demo (target <= 10
 *      ms), over the plot and over the chain at the cursor.
 * The real UI code draws through newterm() into /dev/null at 80x24 and
 * 200x60.  Owned by the workbench. */
#include <config.h>

#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>
#include <unistd.h>
#include <curses.h>

#include "bench-demo.h"
#include "bench-file.h"
#include "core-edit.h"
#include "core-ghost.h"
#include "core-layout.h"
#include "store.h"
#include "ui-app.h"
#include "util-err.h"

static double
now_ms(void)
{
	struct timespec ts;

	clock_gettime(CLOCK_MONOTONIC, &ts);
	return ts.tv_sec * 1e3 + ts.tv_nsec / 1e6;
}

static int
cmp_double(const void *a, const void *b)
{
	double x = *(const double *)a, y = *(const double *)b;

	return x < y ? -1 : x > y;
}

static void
report(const char *what, double *v, size_t n, double target)
{
	qsort(v, n, sizeof *v, cmp_double);
	if (target > 0)
		printf("%-58s median %7.2f ms  max %7.2f ms  (target %g ms, %zu runs)\n", what,
		    v[n / 2], v[n - 1], target, n);
	else
		printf("%-58s median %7.2f ms  max %7.2f ms  (%zu runs)\n", what, v[n / 2],
		    v[n - 1], n);
}

static void
die(const char *what, char *cause)
{
	fprintf(stderr, "bench_ui: %s: %s\n", what, cause != NULL ? cause : "failed");
	exit(2);
}

/* The demo bench with `revs` revisions (L1's focal length walks). */
static void
make_history(struct store *s, int revs)
{
	char *cause = NULL;
	struct bench *b = bench_file_parse(bench_demo_text, strlen(bench_demo_text), "demo",
	    &cause);

	if (b == NULL || store_bench_create(s, b, "demo", "bench", &cause) != 0)
		die("create", cause);
	for (int i = 2; i <= revs; i++) {
		char focal[32], note[48];

		snprintf(focal, sizeof focal, "%d mm", 150 + i % 100);
		snprintf(note, sizeof note, "focal %s", focal);
		if (edit_set(b, "L1", "focal", focal, &cause) != 0 ||
		    store_draft_save(s, b->name, b, &cause) != 0 ||
		    store_commit(s, b->name, note, "bench", NULL, &cause) != 0)
			die("commit", cause);
	}
	model_bench_free(b);
}

/* 200 elements: a source, then pairs of space and a rated optic. */
static void
make_big(struct store *s, const char *name)
{
	struct bench *b = layout_bench_new(name);
	char *cause = NULL;

	for (int i = 0; i < 100; i++) {
		struct element el;
		char id[16], *kv[2];

		snprintf(id, sizeof id, "S%d", i);
		kv[0] = "length=50 mm";
		if (edit_element_new(&el, "space", id, kv, 1, &cause) != 0 ||
		    edit_add(b, &el, NULL, &cause) != 0)
			die("space", cause);
		snprintf(id, sizeof id, i % 2 ? "L%d" : "W%d", i);
		kv[0] = i % 2 ? "focal=500 mm" : "transmission=0.99";
		kv[1] = "damage.cw_irradiance=10 kW/cm^2";
		if (edit_element_new(&el, i % 2 ? "lens" : "window", id, kv, 2, &cause) != 0 ||
		    edit_add(b, &el, NULL, &cause) != 0)
			die("optic", cause);
	}
	if (store_bench_create(s, b, "200 elements", "bench", &cause) != 0)
		die("create big", cause);
	model_bench_free(b);
}

static struct app *
open_ui(const char *db, const char *bench, FILE *out, FILE *in)
{
	struct ui_opts o = { db, bench, "bench", out, in, "xterm-256color", 0, 1 };
	char *cause = NULL;
	struct app *a = ui_app_new(&o, &cause);

	if (a == NULL)
		die("ui_app_new", cause);
	return a;
}

static void
keys(struct app *a, const char *s)
{
	for (; *s != '\0'; s++)
		ui_app_key(a, (unsigned char)*s);
}

static void
sizes(int cols, int lines)
{
	char c[16], l[16];

	snprintf(c, sizeof c, "%d", cols);
	snprintf(l, sizeof l, "%d", lines);
	setenv("COLUMNS", c, 1);
	setenv("LINES", l, 1);
}

int
main(int argc, char **argv)
{
	char dir[] = "/tmp/bench-ui.XXXXXX", db[64], *cause = NULL;
	struct store *s;
	FILE *out = fopen("/dev/null", "w"), *in = fopen("/dev/null", "r");
	double t[40], tg[40], tr[40], t0, t1;
	int revs = argc > 1 ? atoi(argv[1]) : 1000;
	struct app *a;

	if (out == NULL || in == NULL || mkdtemp(dir) == NULL) {
		perror("bench_ui");
		return 2;
	}
	snprintf(db, sizeof db, "%s/b.db", dir);
	if ((s = store_open(db, &cause)) == NULL)
		die("store_open", cause);
	t0 = now_ms();
	make_history(s, revs);
	make_big(s, "big200");
	printf("setup: %d revisions of the demo bench and a 200-element bench in %.0f ms\n",
	    revs, now_ms() - t0);
	store_close(s);

	for (int pass = 0; pass < 2; pass++) {
		int cols = pass ? 200 : 80, lines = pass ? 60 : 24;
		char what[96];

		sizes(cols, lines);
		for (int i = 0; i < 15; i++) {
			t0 = now_ms();
			a = open_ui(db, NULL, out, in);
			ui_app_frame(a);
			t[i] = now_ms() - t0;
			ui_app_free(a);
		}
		snprintf(what, sizeof what, "start to bench list, %d revisions (%dx%d)", revs, cols, lines);
		report(what, t, 15, 100);
		for (int i = 0; i < 15; i++) {
			t0 = now_ms();
			a = open_ui(db, "table3-ablation", out, in);
			ui_app_frame(a);
			t[i] = now_ms() - t0;
			ui_app_free(a);
		}
		snprintf(what, sizeof what, "start to `open BENCH` workbench (%dx%d)", cols, lines);
		report(what, t, 15, 100);
		a = open_ui(db, "big200", out, in);
		ui_app_frame(a);
		/* lens L69, in the middle of the chain */
		app_select_id(a, "L69", 0);
		ui_app_frame(a);
		for (int i = 0; i < 40; i++) {
			char v[32];

			/* Enter (edit the marked field), ^U, the value: untimed */
			keys(a, "\r\025");
			snprintf(v, sizeof v, "%d mm", 300 + i * 7);
			keys(a, v);
			ui_app_frame(a);
			/* the timed part: Enter applies, retraces, saves, redraws */
			t0 = now_ms();
			ui_app_key(a, '\r');
			ui_app_frame(a);
			t[i] = now_ms() - t0;
			if (a->msg_error)
				die("edit refused", xstrdup(a->msg));
			/* and, no key waiting, the reflections and the frame again */
			t1 = now_ms();
			if (ui_app_idle(a))
				ui_app_frame(a);
			tg[i] = now_ms() - t0;
			tr[i] = now_ms() - t1;
			ui_app_key(a, UI_ESC);
			ui_app_frame(a);
		}
		snprintf(what, sizeof what, "edit on a 200-element bench: retrace+save+redraw (%dx%d)",
		    cols, lines);
		report(what, t, 40, 10);
		snprintf(what, sizeof what, "  then its %zu reflections counted and redrawn",
		    a->trace != NULL && a->trace->ghosts != NULL ? a->trace->ghosts->n : 0);
		report(what, tr, 40, 0);
		snprintf(what, sizeof what, "  edit to the screen with the reflections in");
		report(what, tg, 40, 0);
		for (int i = 0; i < 40; i++) {
			t0 = now_ms();
			ui_app_key(a, '-');
			ui_app_frame(a);
			t[i] = now_ms() - t0;
			if (ui_app_idle(a))
				ui_app_frame(a);
		}
		snprintf(what, sizeof what, "undo on a 200-element bench (%dx%d)", cols, lines);
		report(what, t, 40, 10);
		ui_app_free(a);
		/* the sweep screen's cursor on the demo: the plot, then the
		 * chain at the cursor (one trace a step) */
		a = open_ui(db, "table3-ablation", out, in);
		ui_app_frame(a);
		app_select_id(a, "HWP1", 0);
		keys(a, "v");
		ui_app_key(a, '\r');
		ui_app_frame(a);
		for (int pass2 = 0; pass2 < 2; pass2++) {
			for (int i = 0; i < 40; i++) {
				t0 = now_ms();
				ui_app_key(a, UI_FKEY(KEY_RIGHT));
				ui_app_frame(a);
				t[i] = now_ms() - t0;
			}
			snprintf(what, sizeof what, "sweep cursor, one step: %s (%dx%d)",
			    pass2 ? "the chain there" : "the plot", cols, lines);
			report(what, t, 40, 10);
			ui_app_key(a, '\t');
		}
		ui_app_free(a);
	}
	fclose(out);
	fclose(in);
	{
		char cmd[128];

		snprintf(cmd, sizeof cmd, "rm -rf '%s'", dir);
		if (system(cmd) != 0)
			fprintf(stderr, "bench_ui: could not remove %s\n", dir);
	}
	return 0;
}
