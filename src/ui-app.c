/* ui-app.c - the workbench's main loop and its state: the pane stack, the
 * one place that paints, key dispatch through the panes' tables, and the
 * life cycle; the open bench (its trace, undo and redo, saving) is
 * ui-app-bench.c's.  Owned by the workbench. */
#include <config.h>

#include <stdarg.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>

#include "bench-demo.h"
#include "bench-file.h"
#include "ui-app.h"
#include "util-err.h"

/* ---- messages ---- */

void
app_msg(struct app *a, int error, const char *fmt, ...)
{
	va_list ap;

	/* A failure told while handling this key (a draft that could not be
	 * saved) outranks the action's own report of success. */
	if (!error && a->msg_error && a->msg != NULL && a->msg_seq == a->key_seq)
		return;
	free(a->msg);
	va_start(ap, fmt);
	a->msg = xvasprintf(fmt, ap);
	va_end(ap);
	a->msg_error = error;
	a->msg_seq = a->key_seq;
}

void
app_msg_take(struct app *a, int error, char *cause)
{
	if (!error && a->msg_error && a->msg != NULL && a->msg_seq == a->key_seq) {
		free(cause);
		return;
	}
	free(a->msg);
	a->msg = cause != NULL ? cause : xstrdup(error ? "failed" : "");
	a->msg_error = error;
	a->msg_seq = a->key_seq;
}

int
app_refuse_readonly(struct app *a)
{
	if (!a->readonly)
		return 0;
	app_msg(a, 1, "view only: the database is read-only, nothing can be changed");
	return 1;
}

/* ---- panes ---- */

/* A message told by an earlier key belongs to the screen it was told on. */
static void
drop_stale_msg(struct app *a)
{
	if (a->msg != NULL && a->msg_seq != a->key_seq) {
		free(a->msg);
		a->msg = NULL;
		a->msg_error = 0;
	}
	a->pane_seq++;
}

void
app_push(struct app *a, const struct ui_pane_ops *ops, void *data)
{
	struct ui_pane *p = xcalloc(1, sizeof *p);

	drop_stale_msg(a);
	p->ops = ops;
	p->data = data;
	p->below = a->top;
	a->top = p;
}

void
app_pop(struct app *a)
{
	struct ui_pane *p = a->top;

	if (p == NULL)
		return;
	drop_stale_msg(a);
	a->top = p->below;
	if (p->ops->release != NULL)
		p->ops->release(p);
	free(p);
	if (a->top != NULL && a->top->ops->enter != NULL)
		a->top->ops->enter(a, a->top);
}

/* ---- painting: the only place ---- */

static void
draw_too_small(struct app *a, int h, int w)
{
	char *t = xasprintf("terminal too small: %d%s%d", w, ui_glyph(a, GL_TIMES), h);
	char *u = xasprintf("the workbench needs at least %d%s%d", UI_MIN_W,
	    ui_glyph(a, GL_TIMES), UI_MIN_H);
	int y = h / 2 - 1;

	if (y < 0)
		y = 0;
	ui_put(a, y, 0, w, t, UC_OVER);
	if (y + 1 < h)
		ui_put(a, y + 1, 0, w, u, UC_NORMAL);
	if (y + 2 < h)
		ui_put(a, y + 2, 0, w, "enlarge the window, or q to quit", UC_DIM);
	free(t);
	free(u);
}

/* Paints from the topmost full-screen pane up through the modal ones. */
void
ui_app_frame(struct app *a)
{
	struct ui_pane *stack[32], *p;
	size_t n = 0;
	int h = LINES, w = COLS;

	a->cursor_y = a->cursor_x = -1;
	erase();
	a->too_small = h < UI_MIN_H || w < UI_MIN_W;
	if (a->too_small) {
		draw_too_small(a, h, w);
	} else {
		for (p = a->top; p != NULL && n < 32; p = p->below) {
			stack[n++] = p;
			if (!p->ops->modal)
				break;
		}
		while (n > 0) {
			p = stack[--n];
			p->ops->draw(a, p, h, w);
		}
	}
	if (a->cursor_y >= 0) {
		curs_set(1);
		move(a->cursor_y, a->cursor_x);
	} else {
		curs_set(0);
	}
	refresh();
}

/* ---- keys ---- */

static enum ui_reaction
global_help(struct app *a, struct ui_pane *p)
{
	(void)p;
	ui_help_push(a);
	return UI_REDRAW;
}

static enum ui_reaction
global_redraw(struct app *a, struct ui_pane *p)
{
	(void)a;
	(void)p;
	clearok(curscr, TRUE);
	return UI_REDRAW;
}

static void
quit_anyway(struct app *a, void *arg, int yes)
{
	(void)arg;
	if (yes)
		a->quit = 1;
}

enum ui_reaction
app_quit(struct app *a)
{
	char *q;

	/* the draft is saved on every change; only a failed save can lose work */
	if (a->unsaved == NULL || app_save(a) == 0)
		return UI_QUIT;
	q = xasprintf("The draft of '%s' could not be saved (%s). Quit anyway and lose "
	    "the changes since the last save?", a->name, a->unsaved);
	ui_confirm(a, q, quit_anyway, NULL);
	free(q);
	return UI_REDRAW;
}

static enum ui_reaction
global_quit(struct app *a, struct ui_pane *p)
{
	(void)p;
	return app_quit(a);
}

const struct ui_key ui_global_keys[] = {
	{ { '?', UI_FKEY(KEY_F(1)) }, "?", "help", 0, "this help: every key by task, and the laser-safety cautions (also F1)",
	    global_help, 0, UG_LOOK },
	{ { 'Q' }, "Q", NULL, 0, "quit at once from any screen (the draft is always saved)",
	    global_quit, 0, UG_LEAVE },
	{ { UI_CTRL('l') }, "^L", NULL, 0, "paint the screen afresh", global_redraw, 0, UG_LOOK },
	UI_KEYS_END,
};

static enum ui_reaction
run_key(struct app *a, struct ui_pane *p, const struct ui_key *k)
{
	if ((k->flags & UI_K_EDITS) && app_refuse_readonly(a))
		return UI_REDRAW;
	return k->fn(a, p);
}

static enum ui_reaction
dispatch(struct app *a, int key)
{
	struct ui_pane *p = a->top;
	enum ui_reaction r;

	if (p == NULL)
		return UI_QUIT;
	if (key == UI_FKEY(KEY_MOUSE)) {
		MEVENT ev;

		if (getmouse(&ev) != OK || p->ops->click == NULL || a->too_small)
			return UI_NONE;
		if (ev.bstate & BUTTON4_PRESSED)
			key = UI_FKEY(KEY_UP);
		else if (ev.bstate & BUTTON5_PRESSED)
			key = UI_FKEY(KEY_DOWN);
		else
			return p->ops->click(a, p, ev.y, ev.x,
			    (ev.bstate & BUTTON1_DOUBLE_CLICKED) != 0);
	}
	if (a->too_small)           /* nothing is drawn to act on */
		return key == 'q' || key == 'Q' ? UI_QUIT : UI_NONE;
	for (const struct ui_key *k = p->ops->keys; k != NULL && k->fn != NULL; k++)
		if (ui_key_match(k, key))
			return run_key(a, p, k);
	if (p->ops->key != NULL) {
		r = p->ops->key(a, p, key);
		if (r != UI_NONE)
			return r;
		/* typing panes keep every printable key */
		if (p->ops->modal)
			return UI_NONE;
	}
	for (const struct ui_key *k = ui_global_keys; k->fn != NULL; k++)
		if (ui_key_match(k, key))
			return run_key(a, p, k);
	return UI_NONE;
}

int
ui_app_key(struct app *a, int key)
{
	enum ui_reaction r;

	struct ui_pane *by = a->top;

	a->key_seq++;
	/* no screen acts on a rating without its reflections */
	ui_app_idle(a);
	if (key == UI_FKEY(KEY_RESIZE)) {
		/* the terminal may have kept or reflowed old cells: repaint all */
		clearok(curscr, TRUE);
		return 0;
	}
	r = dispatch(a, key);
	/* close the pane that took the key, even if it opened another */
	if (r & UI_POP) {
		if (a->top == by) {
			app_pop(a);
		} else {
			for (struct ui_pane *q = a->top; q != NULL; q = q->below)
				if (q->below == by) {
					q->below = by->below;
					if (by->ops->release != NULL)
						by->ops->release(by);
					free(by);
					break;
				}
		}
	}
	if (r & UI_QUIT)
		a->quit = 1;
	if (a->top == NULL)
		a->quit = 1;
	return a->quit;
}

/* ---- life cycle ---- */

struct app *
ui_app_new(const struct ui_opts *o, char **cause)
{
	struct app *a = xcalloc(1, sizeof *a);
	char *path = o->db_path != NULL ? xstrdup(o->db_path) : store_default_path();

	a->point = -1;

	a->author = xstrdup(o->author != NULL && o->author[0] != '\0' ? o->author : "unknown");
	{
		struct bench *demo = bench_file_parse(bench_demo_text, strlen(bench_demo_text),
		    "demo", NULL);

		a->demo_name = demo != NULL ? xstrdup(demo->name) : NULL;
		model_bench_free(demo);
	}
	a->store = store_open(path, cause);
	free(path);
	if (a->store == NULL) {
		ui_app_free(a);
		return NULL;
	}
	a->readonly = store_readonly(a->store);
	if (o->bench != NULL && app_open_bench(a, o->bench, cause) != 0) {
		struct stat sb;

		/* `open bench.json`: the workbench edits what the database holds */
		if (stat(o->bench, &sb) == 0 && S_ISREG(sb.st_mode) && cause != NULL) {
			free(*cause);
			*cause = NULL;
			fail_with(cause, "no bench '%s' in the database; that is a file: import it "
			    "first (beamledger import %s), then open the bench by the name import "
			    "gives", o->bench, o->bench);
		}
		ui_app_free(a);
		return NULL;
	}
	if (ui_term_open(a, o, cause) != 0) {
		ui_app_free(a);
		return NULL;
	}
	ui_list_push(a);
	if (a->bench != NULL)
		ui_bench_push(a);
	return a;
}

void
ui_app_free(struct app *a)
{
	if (a == NULL)
		return;
	while (a->top != NULL) {
		struct ui_pane *p = a->top;

		a->top = p->below;
		if (p->ops->release != NULL)
			p->ops->release(p);
		free(p);
	}
	ui_term_close();
	if (a->screen != NULL)
		delscreen(a->screen);
	app_close_bench(a);
	store_close(a->store);
	free(a->author);
	free(a->demo_name);
	free(a->msg);
	free(a);
}

int
ui_run(const struct ui_opts *o)
{
	char *cause = NULL;
	struct app *a = ui_app_new(o, &cause);
	int dirty = 1;

	if (a == NULL) {
		fprintf(stderr, "beamledger: %s\n", cause != NULL ? cause : "cannot start");
		free(cause);
		return 2;
	}
	while (!a->quit) {
		int key;

		if (dirty)
			ui_app_frame(a);
		dirty = 0;
		/* the reflections of the last change once no key waits */
		key = ui_read_key(a, a->ghosts_pending ? 0 : 250);
		if (key < 0 && ui_app_idle(a)) {
			dirty = 1;
			continue;
		}
		if (ui_stop_requested())
			break;
		if (key < 0)
			continue;
		ui_app_key(a, key);
		dirty = 1;
	}
	ui_app_free(a);
	return 0;
}
