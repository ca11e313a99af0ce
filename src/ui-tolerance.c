/* ui-tolerance.c - the tolerance screen: every tolerance of the bench on
 * screen drawn at random at once (core-mc.c), a few thousand times, and
 * each rated optic's odds of over and of caution as a table with stacked
 * bars, the odds that anything is over, the 5th-percentile safe power,
 * what drives the selected optic and the histogram of its ratio.  The
 * first run takes a fraction of a second; a longer one (more samples, or
 * a count typed) shows its progress after a second, and Esc or Ctrl-C
 * stops it with the samples done so far shown as such.  Every figure says
 * it is an estimate.  Enter goes to the element.  Owned by the workbench. */
#include <config.h>

#include <math.h>
#include <signal.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>
#include <unistd.h>

#include "core-layout-tol.h"
#include "core-mc.h"
#include "ui-app.h"
#include "util-err.h"

#define TS_THREADS_MAX    8         /* more does not help on a workstation */
#define TS_PROGRESS_AFTER 1.0       /* s: a run shorter than this shows nothing */
#define TS_KEYS_KEPT      16        /* keys typed during a run kept for after */

struct tolscr {
	struct mc_result r;         /* owned when have */
	int              have;
	size_t           nparam;    /* tolerances on the bench; 0: nothing to run */
	uint64_t         seed;      /* of the last run done */
	size_t           samples;   /* asked of the last run done */
	size_t           max;       /* the most samples this bench is run with here */
	unsigned         threads;
	double           secs;      /* the last run's time */
	int              sel, top;
	int              table_y, table_rows;   /* where the last frame put the rows */
	char            *unrated;   /* owned: the optics no odds cover; NULL: none */
	char            *error;     /* owned: the screen's text when there is no run
	                             * to show (it failed, or stopped before any
	                             * sample); NULL */
};

/* Ctrl-C during a run: the terminal is in cbreak mode, so it arrives as
 * SIGINT, whose handler the run borrows from the workbench's (which would
 * quit) while it works.  The one piece of state a handler can reach. */
static volatile sig_atomic_t ts_interrupted;

static void
on_interrupt(int sig)
{
	(void)sig;
	ts_interrupted = 1;
}

/* What the progress callback needs: it runs on this thread, between the
 * workers' chunks, about ten times a second. */
struct ts_progress {
	struct app *a;
	double      t0;
	int         shown;          /* the box is on the screen */
	int         keys[TS_KEYS_KEPT]; /* read while it ran, given back after */
	int         nkeys;
};

static double
now(void)
{
	struct timespec t;

	clock_gettime(CLOCK_MONOTONIC, &t);
	return (double)t.tv_sec + 1e-9 * (double)t.tv_nsec;
}

/* Keys while a run works, read without waiting: Esc, Ctrl-C as a key (a
 * terminal in raw mode) and a request to quit stop it; the rest (a few,
 * the resize among them) are kept for the screen once the run is done, as
 * they would have waited without the polling.  Mouse events are dropped:
 * what they pointed at is not drawn yet. */
static void
poll_keys(struct ts_progress *g)
{
	int key;

	while ((key = ui_read_key(g->a, 0)) >= 0) {
		if (key == UI_ESC || key == UI_CTRL('c')) {
			ts_interrupted = 1;
		} else if (key == UI_FKEY(KEY_MOUSE)) {
			MEVENT ev;

			(void)getmouse(&ev);
		} else if (g->nkeys < TS_KEYS_KEPT) {
			g->keys[g->nkeys++] = key;
		}
	}
	if (ui_stop_requested())
		ts_interrupted = 1;
}

/* The kept keys back in the input queue, first typed first read (curses
 * gives the last pushed back first). */
static void
give_back_keys(const struct ts_progress *g)
{
	for (int i = g->nkeys; i-- > 0;) {
		int key = g->keys[i];

		if (key & UI_FKEY(0))
			ungetch(key & ~UI_FKEY(0));
		else
			unget_wch((wchar_t)key);
	}
}

/* The box over the middle of the screen: how far the run is, a bar, and
 * how to stop it. */
static void
draw_progress(struct app *a, size_t done, size_t total)
{
	int h = LINES, w = COLS, bw = w - 8 > 64 ? 64 : w - 8, bh = 6;
	int y = (h - bh) / 2, x = (w - bw) / 2, cells;
	char *line = layout_tol_progress(done, total, ts_interrupted != 0, a->ascii);

	if (bw < 20 || h < bh)
		return;
	ui_box(a, y, x, bh, bw, "tolerance run");
	ui_put(a, y + 1, x + 2, bw - 4, line, ts_interrupted ? UC_CAUTION : UC_INFO);
	free(line);
	cells = total > 0 ? (int)((double)(bw - 4) * (double)done / (double)total) : 0;
	for (int i = 0; i < bw - 4; i++)
		ui_put(a, y + 2, x + 2 + i, 1, i < cells ? (a->ascii ? "#" : "\u2588") :
		    (a->ascii ? "." : "\u00b7"), i < cells ? UC_INFO : UC_DIM);
	ui_put(a, y + 4, x + 2, bw - 4, "Esc or Ctrl-C stops it, keeping the samples done",
	    UC_DIM);
	refresh();
}

static void
on_progress(void *arg, size_t done, size_t total)
{
	struct ts_progress *g = arg;

	poll_keys(g);
	if (!g->shown && now() - g->t0 < TS_PROGRESS_AFTER)
		return;
	g->shown = 1;
	draw_progress(g->a, done, total);
}

/* Runs the Monte-Carlo on the bench on screen with this seed and sample
 * count, keeping the selection, with the progress and a way to stop.
 * 0: a run to show (complete or stopped early), 1: stopped before any
 * sample was done (the last run, if any, is kept as it was), -1: it
 * failed (d->error says why). */
static int
ts_run(struct app *a, struct tolscr *d, uint64_t seed, size_t samples)
{
	struct mc_param *p = mc_params(a->shown, &d->nparam);
	char *keep = NULL, *cause = NULL;
	struct mc_result r;
	struct mc_opts o;
	struct ts_progress g;
	struct sigaction sa, old;
	int rc, delay;

	mc_params_free(p, d->nparam);
	free(d->unrated);
	d->unrated = layout_tol_unrated_note(a->trace);
	if (d->nparam == 0)
		return -1;
	memset(&o, 0, sizeof o);
	o.samples = samples;
	o.seed = seed;
	o.threads = d->threads;
	o.keep_ratios = 1;
	o.stop = &ts_interrupted;
	o.progress = on_progress;
	o.arg = &g;
	memset(&g, 0, sizeof g);
	g.a = a;
	g.t0 = now();
	/* the keys are polled without waiting while it runs: the input mode
	 * and SIGINT's handler are the workbench's again afterwards */
	delay = wgetdelay(stdscr);
	ts_interrupted = 0;
	memset(&sa, 0, sizeof sa);
	sa.sa_handler = on_interrupt;
	sigemptyset(&sa.sa_mask);
	sigaction(SIGINT, &sa, &old);
	rc = mc_run(a->shown, &o, &r, &cause);
	sigaction(SIGINT, &old, NULL);
	timeout(delay);
	give_back_keys(&g);
	ts_interrupted = 0;
	if (rc != 0) {
		if (d->have)
			mc_result_release(&d->r);
		d->have = 0;
		free(d->error);
		d->error = xasprintf("The run failed: %s", cause != NULL ? cause : "no reason given");
		free(cause);
		return -1;
	}
	if (r.done == 0) {
		mc_result_release(&r);
		if (!d->have) {
			free(d->error);
			d->error = xstrdup("The run was stopped before any sample was done. n runs "
			    "it again (the next seed), m with twice the samples, s with a count "
			    "typed.");
		}
		return 1;
	}
	d->secs = now() - g.t0;
	if (d->have && d->sel >= 0 && (size_t)d->sel < d->r.nrated)
		keep = xstrdup(d->r.el[d->sel].id);
	if (d->have)
		mc_result_release(&d->r);
	d->r = r;
	d->have = 1;
	d->seed = seed;
	d->samples = samples;
	free(d->error);
	d->error = NULL;
	d->sel = d->r.nworst > 0 ? (int)d->r.worst[0] : 0;
	for (size_t j = 0; keep != NULL && j < d->r.nrated; j++)
		if (strcmp(d->r.el[j].id, keep) == 0)
			d->sel = (int)j;
	free(keep);
	return 0;
}

/* Text wrapped from row y, at most `max` rows; the rows used. */
static int
put_wrapped(struct app *a, int y, int x, int w, int max, const char *text, enum ui_color c)
{
	size_t st[16], ln[16], nl = layout_wrap(text, w, st, ln, 16);
	int used = 0;

	for (size_t k = 0; k < nl && used < max; k++, used++) {
		/* the last row there is room for takes the rest, cut with "…" */
		char *part = used + 1 == max && k + 1 < nl ? xstrdup(text + st[k]) :
		    xasprintf("%.*s", (int)ln[k], text + st[k]);

		ui_put(a, y + used, x, w, part, c);
		free(part);
	}
	return used;
}

static void
draw_howto(struct app *a, struct tolscr *d, int h, int w)
{
	char *text = d->error != NULL ? xstrdup(d->error) : layout_tol_howto(a->shown, a->ascii);
	int y = 3;

	/* paragraph by paragraph: the examples keep their own lines */
	for (char *s = text, *nl; s != NULL && y < h - 4; s = nl != NULL ? nl + 1 : NULL) {
		nl = strchr(s, '\n');
		if (nl != NULL)
			*nl = '\0';
		y += put_wrapped(a, y, 2, w - 4, h - 4 - y, s, UC_NORMAL);
	}
	free(text);
}

/* The stacked bar of a row: over, caution, the rest ok. */
static void
draw_bar(struct app *a, int y, int x, int bw, const struct layout_tol_row *r, attr_t at)
{
	for (int i = 0; i < bw; i++) {
		int over = i < r->bar_over, caution = !over && i < r->bar_over + r->bar_caution;
		const char *g = over ? (a->ascii ? "#" : "\u2588") : caution ? (a->ascii ? ":" : "\u2592") :
		    (a->ascii ? "." : "\u00b7");

		ui_put_attr(a, y, x + i, 1, g, at | ui_attr(a, over ? UC_OVER : caution ? UC_CAUTION :
		    UC_DIM));
	}
}

struct cols {
	int id, nominal, over, caution, bar, bw, median, p95;
};

static void
columns(int w, struct cols *c)
{
	int idw = 8, bw = w - 65 - 1;

	if (bw > 40) {
		idw += bw - 40 > 11 ? 11 : bw - 40;
		bw = 40;
	}
	c->id = 1;
	c->nominal = c->id + idw + 1;
	c->over = c->nominal + 9;
	c->caution = c->over + 14;
	c->bar = c->caution + 14;
	c->bw = bw;
	c->median = c->bar + bw + 1;
	c->p95 = c->median + 9;
}

static void
draw_table(struct app *a, struct tolscr *d, int y, int rows, int w)
{
	struct cols c;
	const struct mc_result *r = &d->r;

	columns(w, &c);
	ui_put(a, y, c.id, c.nominal - c.id - 1, "element", UC_HEADER);
	ui_put_right(a, y, c.nominal, 8, "written", ui_attr(a, UC_HEADER));
	ui_put_right(a, y, c.over, 13, "P(over)", ui_attr(a, UC_HEADER));
	ui_put_right(a, y, c.caution, 13, "P(caution)", ui_attr(a, UC_HEADER));
	ui_put(a, y, c.bar, c.bw, a->ascii ? "#over :caution" : "\u2588over \u2592caution",
	    UC_HEADER);
	ui_put_right(a, y, c.median, 8, "median", ui_attr(a, UC_HEADER));
	ui_put_right(a, y, c.p95, 8, "95th pct", ui_attr(a, UC_HEADER));
	d->top = layout_scroll(d->sel, d->top, rows, (int)r->nrated);
	for (int k = 0; k < rows && d->top + k < (int)r->nrated; k++) {
		int j = d->top + k, yy = y + 1 + k;
		const struct mc_elem *e = &r->el[j];
		struct layout_tol_row row;
		attr_t at = j == d->sel ? ui_attr(a, UC_SELECT) : A_NORMAL;
		enum ui_color pc = e->p_over > 0 ? UC_OVER : e->p_caution > 0 ? UC_CAUTION : UC_OK;

		layout_tol_row(r, (size_t)j, c.bw, &row);
		ui_fill(a, yy, 0, w, at);
		if (e->p_over > 0)
			ui_put_attr(a, yy, 0, 1, ui_glyph(a, GL_HAZARD), at | ui_attr(a, UC_OVER));
		ui_put_attr(a, yy, c.id, c.nominal - c.id - 1, e->id, at | A_BOLD);
		ui_put_right(a, yy, c.nominal, 8, row.nominal, at);
		ui_put_right(a, yy, c.over, 13, row.over, at | ui_attr(a, pc) |
		    (e->p_over > 0 ? A_BOLD : 0));
		ui_put_right(a, yy, c.caution, 13, row.caution, at);
		draw_bar(a, yy, c.bar, c.bw, &row, at);
		ui_put_right(a, yy, c.median, 8, row.median, at);
		ui_put_right(a, yy, c.p95, 8, row.p95, at);
	}
	if (d->top + rows < (int)r->nrated)
		ui_put(a, y + rows, w - 2, 1, a->ascii ? "v" : "\u25be", UC_DIM);
}

static void
draw_hist(struct app *a, struct tolscr *d, int y, int hh, int w)
{
	struct layout_hist hist;
	const char *id = d->r.el[d->sel].id;
	char axis[4 * LAYOUT_HIST_AXIS_MAX + 8], *cap;
	int cols = w - 4 > LAYOUT_HIST_MAX ? LAYOUT_HIST_MAX : w - 4, cw, x0;

	if (layout_hist_of(&d->r, (size_t)d->sel, cols, &hist) != 0)
		return;
	cap = layout_hist_caption(&hist, id);
	ui_put(a, y, 1, w - 2, cap, UC_HEADER);
	free(cap);
	/* each bin as wide as the room allows, the plot centred */
	cw = cols / hist.nbins;
	cw = cw < 1 ? 1 : cw;
	x0 = 2 + (cols - hist.nbins * cw) / 2;
	for (int b = 0; b < hist.nbins; b++) {
		enum damage_status st = layout_hist_status(&hist, b);
		enum ui_color c = st == STATUS_OVER ? UC_OVER : st == STATUS_CAUTION ? UC_CAUTION : UC_OK;

		for (int level = 0; level < hh; level++)
			for (int k = 0; k < cw; k++)
				ui_put(a, y + hh - level, x0 + b * cw + k, 1,
				    layout_hist_cell(&hist, b, level, hh, a->ascii), c);
	}
	layout_hist_axis(axis, sizeof axis, &hist, cw, a->ascii);
	ui_put(a, y + hh + 1, x0, hist.nbins * cw, axis, UC_DIM);
}

static void
ts_draw(struct app *a, struct ui_pane *p, int h, int w)
{
	struct tolscr *d = p->data;
	const char *pt = app_point_name(a);
	char *more = pt != NULL ? xasprintf("point %s", pt) : NULL, *s, *others = NULL;
	int y, avail, fixed, rows, hh, nrated;

	ui_frame(a, "tolerances", more, h, w);
	free(more);
	if (!d->have) {
		/* nothing to choose or run again: only the way back */
		static const struct layout_hint back[] = {
			{ "Esc", "back", 0, UG_LEAVE }, { "?", "help", 0, UG_COUNT },
		};

		draw_howto(a, d, h, w);
		ui_frame_bottom(a, back, 2, h, w);
		return;
	}
	s = layout_tol_head(&d->r, w - 2);
	ui_put(a, 2, 1, w - 2, s, d->r.stopped ? UC_ERROR : UC_INFO);
	free(s);
	s = layout_tol_bench_line(&d->r, a->ascii, w - 2);
	ui_put(a, 3, 1, w - 2, s, d->r.p_any > 0 ? UC_OVER : UC_NORMAL);
	free(s);
	nrated = (int)d->r.nrated;
	if (nrated == 0) {
		put_wrapped(a, 5, 2, w - 4, h - 9, "No element on this bench carries a damage "
		    "rating, so there are no odds to give: rate the optics first (damage.* "
		    "values; Enter on an element).", UC_NORMAL);
		ui_footer(a, p->ops->keys, h, w);
		return;
	}
	if (d->sel >= nrated)
		d->sel = nrated - 1;
	if (d->sel < 0)
		d->sel = 0;
	/* rows 4 .. h-4: the table, the histogram, its axis, the drivers */
	avail = h - 3 - 4;
	fixed = 1 + 1 + 1 + 1 + (d->unrated != NULL);  /* header, caption, axis, drivers, note */
	hh = avail - fixed - nrated;
	hh = hh < 3 ? 3 : hh > 16 ? 16 : hh;
	rows = avail - fixed - hh;
	if (rows > nrated) {
		rows = nrated;
	}
	if (rows < 1)
		rows = 1;
	y = 4;
	d->table_y = y + 1;
	d->table_rows = rows;
	draw_table(a, d, y, rows, w);
	y += 1 + rows;
	draw_hist(a, d, y, hh, w);
	y += hh + 2;
	s = layout_tol_drivers(&d->r, (size_t)d->sel, &others);
	{
		char *line = s != NULL ? xasprintf("drivers of %s (r): %s", d->r.el[d->sel].id, s) :
		    xasprintf("drivers are ranked for the worst only: %s", others);
		int room = h - 3 - (d->unrated != NULL) - y;

		y += put_wrapped(a, y, 1, w - 2, room < 1 ? 1 : room, line, UC_NORMAL);
		free(line);
	}
	free(s);
	free(others);
	if (d->unrated != NULL && y < h - 3)
		ui_put(a, y, 1, w - 2, d->unrated, UC_HAZARD);
	ui_footer(a, p->ops->keys, h, w);
}

/* ---- keys ---- */

static enum ui_reaction
ts_move(struct app *a, struct ui_pane *p, int by)
{
	struct tolscr *d = p->data;

	(void)a;
	if (!d->have)
		return UI_NONE;
	d->sel += by;
	if (d->sel >= (int)d->r.nrated)
		d->sel = (int)d->r.nrated - 1;
	if (d->sel < 0)
		d->sel = 0;
	return UI_REDRAW;
}

static enum ui_reaction
ts_up(struct app *a, struct ui_pane *p)
{
	return ts_move(a, p, -1);
}

static enum ui_reaction
ts_down(struct app *a, struct ui_pane *p)
{
	return ts_move(a, p, 1);
}

static enum ui_reaction
ts_home(struct app *a, struct ui_pane *p)
{
	return ts_move(a, p, -(1 << 20));
}

static enum ui_reaction
ts_end(struct app *a, struct ui_pane *p)
{
	return ts_move(a, p, 1 << 20);
}

/* What a run says on the message line: a stopped one the count it got to. */
static void
said(struct app *a, struct tolscr *d, int rc, const char *what)
{
	if (rc == 1)
		app_msg(a, 1, "stopped before any sample was done%s", d->have ?
		    ": the figures shown are still those of the last run" : "");
	else if (rc == 0 && d->r.stopped)
		app_msg(a, 1, "stopped after %zu of %zu samples (%.1f s); n, m or s runs again",
		    d->r.done, d->r.asked, d->secs);
	else if (rc == 0)
		app_msg(a, 0, "seed %llu: %zu samples in %.2f s; %s", (unsigned long long)d->r.seed,
		    d->r.done, d->secs, what);
}

static enum ui_reaction
ts_seed(struct app *a, struct ui_pane *p)
{
	struct tolscr *d = p->data;

	if (d->nparam == 0)
		return UI_NONE;
	said(a, d, ts_run(a, d, d->seed + 1, d->samples), "the figures move by about their \u00b1");
	return UI_REDRAW;
}

static enum ui_reaction
ts_more(struct app *a, struct ui_pane *p)
{
	struct tolscr *d = p->data;
	size_t n = d->samples * 2;

	if (d->nparam == 0)
		return UI_NONE;
	if (d->samples >= d->max) {
		app_msg(a, 1, "%zu samples is the most here; for more: beamledger tolerance %s "
		    "--samples N", d->max, a->name);
		return UI_REDRAW;
	}
	said(a, d, ts_run(a, d, d->seed, n < d->max ? n : d->max),
	    "twice as many, so the \u00b1 shrink by about 1/\u221a2");
	return UI_REDRAW;
}

/* The count typed in the dialog: a run with it, the dialog closed. */
static int
count_typed(struct app *a, void *arg, const char *text, char **cause)
{
	struct tolscr *d = arg;
	size_t n;

	if (layout_tol_parse_samples(text, d->max, &n, cause) != 0)
		return -1;
	said(a, d, ts_run(a, d, d->seed, n), "the \u00b1 shrink as 1/\u221a(samples)");
	return 0;
}

static enum ui_reaction
ts_count(struct app *a, struct ui_pane *p)
{
	struct tolscr *d = p->data;
	char *help, init[32];

	if (d->nparam == 0)
		return UI_NONE;
	help = xasprintf("How many samples (10 to %zu here; \"20k\" is 20000)? A run over a "
	    "second shows its progress; Esc or Ctrl-C stops it, keeping what is done.", d->max);
	snprintf(init, sizeof init, "%zu", d->samples);
	ui_prompt(a, "samples", help, init, count_typed, d, NULL);
	free(help);
	return UI_REDRAW;
}

static enum ui_reaction
ts_jump(struct app *a, struct ui_pane *p)
{
	struct tolscr *d = p->data;

	if (d->have && d->sel >= 0 && (size_t)d->sel < d->r.nrated) {
		char *id = xstrdup(d->r.el[d->sel].id);

		app_select_id(a, id, 0);
		app_msg(a, 0, "%s selected: Enter edits its values and their tolerances", id);
		free(id);
	}
	return UI_POP | UI_REDRAW;
}

/* A click on a row selects it; a double click goes to it. */
static enum ui_reaction
ts_click(struct app *a, struct ui_pane *p, int y, int x, int dbl)
{
	struct tolscr *d = p->data;
	int j = d->top + y - d->table_y;

	(void)x;
	if (!d->have || y < d->table_y || y >= d->table_y + d->table_rows || j < 0 ||
	    j >= (int)d->r.nrated)
		return UI_NONE;
	d->sel = j;
	return dbl ? ts_jump(a, p) : UI_REDRAW;
}

static enum ui_reaction
ts_back(struct app *a, struct ui_pane *p)
{
	(void)a;
	(void)p;
	return UI_POP | UI_REDRAW;
}

static const struct ui_key ts_keys[] = {
	{ { UI_FKEY(KEY_UP) }, "\u2191\u2193", "choose", 2, "choose a rated element: its histogram and drivers", ts_up, 0, UG_MOVE },
	{ { UI_FKEY(KEY_DOWN) }, "\u2193", NULL, 0, NULL, ts_down, 0, UG_MOVE },
	{ { UI_FKEY(KEY_HOME), UI_FKEY(KEY_PPAGE) }, "Home", NULL, 0, "the first element (also PgUp)", ts_home, 0, UG_MOVE },
	{ { UI_FKEY(KEY_END), UI_FKEY(KEY_NPAGE) }, "End", NULL, 0, "the last element (also PgDn)", ts_end, 0, UG_MOVE },
	{ { '\r', '\n', UI_FKEY(KEY_ENTER) }, "Enter", "go to element", 0,
	    "back to the workbench with the element selected", ts_jump, 0, UG_LOOK },
	{ { 'n' }, "n", "new seed", 3, "run again with the next seed: how much the figures move", ts_seed, 0, UG_LOOK },
	{ { 'm' }, "m", "more samples", 3, "run again with twice the samples (smaller standard errors, longer run)", ts_more, 0, UG_LOOK },
	{ { 's' }, "s", "sample count", 2, "run again with a sample count typed; a run over a second shows its progress, and Esc or Ctrl-C stops it with the samples done so far", ts_count, 0, UG_LOOK },
	{ { UI_ESC, 'q', 't' }, "Esc", "back", 0, "back to the workbench (also q, t)", ts_back, 0, UG_LEAVE },
	UI_KEYS_END,
};

static void
ts_release(struct ui_pane *p)
{
	struct tolscr *d = p->data;

	if (d->have)
		mc_result_release(&d->r);
	free(d->unrated);
	free(d->error);
	free(d);
}

const struct ui_pane_ops ui_tolerance_ops = {
	"tolerances (t)", 0, ts_keys, ts_draw, NULL, ts_click, NULL, NULL, ts_release,
};

void
ui_tolerance_push(struct app *a)
{
	struct tolscr *d = xcalloc(1, sizeof *d);
	long cores = sysconf(_SC_NPROCESSORS_ONLN);
	int rc;

	d->seed = 1;
	d->samples = layout_tol_samples(a->trace->nrows, 0);
	d->max = layout_tol_samples_max(a->trace->nrows);
	d->threads = cores < 1 ? 1 : cores > TS_THREADS_MAX ? TS_THREADS_MAX : (unsigned)cores;
	rc = ts_run(a, d, d->seed, d->samples);
	app_push(a, &ui_tolerance_ops, d);
	said(a, d, rc, "every tolerance drawn at random in each");
}
