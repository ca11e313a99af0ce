/* ui-app.c - the workbench's main loop and its state: the pane stack, the
 * one place that paints, key dispatch through the panes' tables, and the
 * open bench with its trace, undo and redo, saved to the draft after every
 * change so that quitting is always safe.  Owned by the workbench. */
#include <config.h>

#include <stdarg.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>
#include <sys/stat.h>

#include "bench-demo.h"
#include "bench-file.h"
#include "ui-app.h"
#include "util-err.h"

#define UNDO_MAX 500

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

/* ---- the open bench ---- */

static void
free_stack(struct bench **s, size_t *n)
{
	for (size_t i = 0; i < *n; i++)
		model_bench_free(s[i]);
	*n = 0;
}

const struct layout_row *
app_sel_row(const struct app *a)
{
	if (a->bench == NULL || a->nrows == 0 || a->sel < 0 || (size_t)a->sel >= a->nrows)
		return NULL;
	return &a->rows[a->sel];
}

const struct trace_row *
app_sel_trace(const struct app *a)
{
	const struct layout_row *r = app_sel_row(a);

	if (r == NULL || r->trace_row < 0 || a->trace == NULL)
		return NULL;
	return &a->trace->rows[r->trace_row];
}

void
app_select_id(struct app *a, const char *id, int port)
{
	long i = layout_chain_find(a->rows, a->nrows, id, port);

	if (i >= 0)
		a->sel = (int)i;
}

/* Retraces and reselects the row of element `id` (a port row when port).
 * The id is a copy taken before any edit: the old rows point into the
 * bench as it was, which an edit may have freed. */
/* The bench on screen: the draft, or a copy with the shown point applied
 * (back to the base, said, when the point is gone or no longer applies). */
static void
set_shown(struct app *a)
{
	if (a->shown_owned)
		model_bench_free(a->shown);
	a->shown = a->bench;
	a->shown_owned = 0;
	if (a->have_survey) {
		point_survey_release(&a->survey);
		a->have_survey = 0;
	}
	if (a->bench == NULL)
		return;
	if (a->point >= (long)a->bench->points.n) {
		app_msg(a, 0, "that operating point is gone: the base is shown");
		a->point = -1;
	}
	if (a->point >= 0) {
		char *cause = NULL;
		struct bench *b = point_apply(a->bench, &a->bench->points.p[a->point], &cause);

		if (b == NULL) {
			app_msg(a, 1, "%s: the base is shown", cause != NULL ? cause : "point");
			free(cause);
			a->point = -1;
		} else {
			a->shown = b;
			a->shown_owned = 1;
		}
	}
}

const char *
app_point_name(const struct app *a)
{
	return a->bench != NULL && a->point >= 0 && a->point < (long)a->bench->points.n ?
	    a->bench->points.p[a->point].name : NULL;
}

static void
retrace_select(struct app *a, const char *id, int port, int old)
{
	char *cause = NULL;

	trace_free(a->trace);
	free(a->rows);
	set_shown(a);
	/* the main beam now, drawn at once; the reflections, which cost
	 * ~40 ms on a 200-element bench, as soon as no key waits */
	a->trace = trace_rerun_opts(NULL, a->shown, TRACE_NO_GHOSTS);
	a->ghosts_pending = 1;
	a->nrows = layout_chain(a->shown, a->trace, &a->rows);
	if (trace_check(a->trace, &cause) != 0)
		app_msg_take(a, 1, cause);
	a->sel = old;
	if (id != NULL) {
		long i = layout_chain_find(a->rows, a->nrows, id, port);

		if (i >= 0)
			a->sel = (int)i;
	}
	if (a->sel >= (int)a->nrows)
		a->sel = (int)a->nrows - 1;
	if (a->sel < 0)
		a->sel = 0;
}

int
ui_app_idle(struct app *a)
{
	char *cause = NULL;

	if (!a->ghosts_pending || a->trace == NULL)
		return 0;
	a->ghosts_pending = 0;
	trace_add_ghosts(a->trace, 0);
	/* the same rows, with the ratings that count the ghosts */
	free(a->rows);
	a->nrows = layout_chain(a->shown, a->trace, &a->rows);
	if (trace_check(a->trace, &cause) != 0)
		app_msg_take(a, 1, cause);
	return 1;
}

/* The selected row's element id (caller frees; NULL: none) while the rows
 * still match the bench. */
static char *
sel_id(const struct app *a, int *port)
{
	const struct layout_row *r = app_sel_row(a);

	*port = r != NULL && r->kind == LROW_PORT;
	return r != NULL ? xstrdup(r->el->id) : NULL;
}

void
app_retrace(struct app *a)
{
	int port;
	char *id = sel_id(a, &port);

	retrace_select(a, id, port, a->sel);
	free(id);
}

void
app_setup_name(int no, char *buf, size_t n)
{
	snprintf(buf, n, "#%d", no);
}

/* The one place that spells a setup the way the store takes it: its
 * number alone ("2"; the store reads 2, #2, a name or draft). */
void
app_setup_ref(int no, char *buf, size_t n)
{
	snprintf(buf, n, "%d", no);
}

void
app_set_base(struct app *a, int no)
{
	free(a->base_text);
	a->base_text = a->stored != NULL ? xstrdup(a->stored) : NULL;
	a->base_rev = no;
}

/* Which setup the draft is, or came from: the newest it equals (only the
 * ten newest are looked at, so that opening a long history stays quick),
 * else the latest. */
static void
find_base(struct app *a)
{
	struct store_rev *revs = NULL;
	size_t n = 0;

	free(a->base_text);
	a->base_text = NULL;
	a->base_rev = 0;
	if (a->bench == NULL || store_log(a->store, a->name, &revs, &n, NULL) != 0)
		return;
	for (size_t i = 0; i < n && i < 10; i++) {
		char ref[24], *text;
		struct bench *b;

		app_setup_ref(revs[i].no, ref, sizeof ref);
		b = store_bench_load(a->store, a->name, ref, NULL, NULL);
		text = b != NULL ? bench_file_dump(b) : NULL;
		model_bench_free(b);
		if (i == 0) {                   /* changed since the latest, unless ... */
			a->base_rev = revs[i].no;
			a->base_text = text != NULL ? xstrdup(text) : NULL;
		}
		if (text != NULL && a->stored != NULL && strcmp(text, a->stored) == 0) {
			free(a->base_text);
			a->base_text = text;    /* ... it is this one */
			a->base_rev = revs[i].no;
			break;
		}
		free(text);
	}
	store_revs_free(revs, n);
}

void
app_draft_words(const struct app *a, char *buf, size_t n)
{
	char no[24];

	if (a->latest_rev == 0 || a->base_rev == 0) {
		snprintf(buf, n, "draft, nothing recorded yet");
		return;
	}
	app_setup_name(a->base_rev, no, sizeof no);
	if (a->base_text != NULL && a->stored != NULL && strcmp(a->base_text, a->stored) == 0)
		snprintf(buf, n, "draft = %s", no);
	else
		snprintf(buf, n, "draft: changed since %s, not recorded", no);
}

void
app_refresh_rev(struct app *a)
{
	struct store_rev *revs = NULL;
	size_t n = 0;
	char *cause = NULL;

	if (store_log(a->store, a->name, &revs, &n, &cause) == 0) {
		a->latest_rev = n > 0 ? revs[0].no : 0;
		store_revs_free(revs, n);
	}
	free(cause);
	cause = NULL;
	if (store_draft_changed(a->store, a->name, &a->draft_changed, &cause) != 0)
		a->draft_changed = 1;
	free(cause);
}

/* Inside the store's write transaction: the stored draft is replaced only
 * if it is still the one this workbench last saw. */
struct save_ctx {
	const struct app *a;
	int               conflict;
};

static int
save_if_unchanged(struct bench *stored, void *arg, char **cause)
{
	struct save_ctx *c = arg;
	char *now = bench_file_dump(stored);
	struct bench *copy, tmp;
	int same = c->a->stored == NULL || strcmp(now, c->a->stored) == 0;

	free(now);
	if (!same) {
		c->conflict = 1;
		return fail_with(cause, "another beamledger changed this bench's draft; "
		    "this change is kept here but not saved (your next change replaces "
		    "theirs; q and reopen the bench to take theirs instead)");
	}
	copy = model_bench_dup(c->a->bench);
	tmp = *stored;
	*stored = *copy;
	*copy = tmp;
	model_bench_free(copy);
	return 0;
}

static void
remember_stored(struct app *a)
{
	free(a->stored);
	a->stored = a->bench != NULL ? bench_file_dump(a->bench) : NULL;
}

int
app_save(struct app *a)
{
	struct save_ctx ctx = { a, 0 };
	char *cause = NULL;

	if (a->bench == NULL || a->readonly)
		return 0;
	if (store_draft_edit(a->store, a->name, save_if_unchanged, &ctx, &cause) != 0) {
		if (ctx.conflict) {
			/* told once: what is stored now is what the next change replaces */
			struct bench *theirs = store_bench_load(a->store, a->name, "draft", NULL, NULL);

			free(a->stored);
			a->stored = theirs != NULL ? bench_file_dump(theirs) : NULL;
			model_bench_free(theirs);
		}
		free(a->unsaved);
		a->unsaved = cause != NULL ? cause : xstrdup("the draft could not be saved");
		app_msg(a, 1, "draft NOT saved: %s (kept in memory; saved again on the next change)",
		    a->unsaved);
		return -1;
	}
	free(a->unsaved);
	a->unsaved = NULL;
	remember_stored(a);
	a->saved_at = (long long)time(NULL);
	{
		int ch = 1;

		if (store_draft_changed(a->store, a->name, &ch, &cause) == 0)
			a->draft_changed = ch;
		free(cause);
		/* back to the latest setup, by edits or undo: the draft is it */
		if (!a->draft_changed && a->latest_rev > 0 && (a->base_rev != a->latest_rev ||
		    a->base_text == NULL || strcmp(a->base_text, a->stored) != 0))
			app_set_base(a, a->latest_rev);
	}
	return 0;
}

int
app_open_bench(struct app *a, const char *name, char **cause)
{
	struct bench *b = store_bench_load(a->store, name, "draft", NULL, cause);

	if (b == NULL)
		return -1;
	app_close_bench(a);
	a->name = xstrdup(name);
	a->bench = b;
	a->sel = 0;
	a->scroll = 0;
	remember_stored(a);
	app_retrace(a);
	app_refresh_rev(a);
	find_base(a);
	a->saved_at = 0;
	if (!a->demo_told && a->demo_name != NULL && strcmp(name, a->demo_name) == 0) {
		a->demo_told = 1;
		app_msg(a, 0, "the demo bench is invented data: an imagined lab and its parts");
	}
	return 0;
}

void
app_close_bench(struct app *a)
{
	if (a->bench != NULL && a->unsaved != NULL)
		app_save(a);
	free(a->name);
	if (a->shown_owned)
		model_bench_free(a->shown);
	a->shown = NULL;
	a->shown_owned = 0;
	a->point = -1;
	a->worst_all = 0;
	if (a->have_survey)
		point_survey_release(&a->survey);
	a->have_survey = 0;
	model_bench_free(a->bench);
	trace_free(a->trace);
	free(a->rows);
	free_stack(a->undo, &a->nundo);
	free_stack(a->redo, &a->nredo);
	free(a->undo);              /* the arrays too, not only what they hold */
	free(a->redo);
	a->undo = a->redo = NULL;
	free(a->unsaved);
	free(a->stored);
	a->stored = NULL;
	free(a->base_text);
	a->base_text = NULL;
	a->base_rev = 0;
	a->name = NULL;
	a->bench = NULL;
	a->trace = NULL;
	a->rows = NULL;
	a->unsaved = NULL;
	a->nrows = 0;
}

static void
push_snapshot(struct bench ***s, size_t *n, struct bench *b)
{
	if (*n == UNDO_MAX) {
		model_bench_free((*s)[0]);
		memmove(*s, *s + 1, (*n - 1) * sizeof **s);
		(*n)--;
	}
	*s = xreallocarray(*s, *n + 1, sizeof **s);
	(*s)[(*n)++] = b;
}

int
app_edit(struct app *a, app_edit_fn fn, void *arg, char **cause)
{
	struct bench *snap;
	char *id;
	int port;

	if (a->bench == NULL)
		return fail_with(cause, "no bench is open");
	if (a->readonly)
		return fail_with(cause, "view only: the database is read-only, nothing can be changed");
	if (app_point_name(a) != NULL && !a->point_edit)
		return fail_with(cause, "point %s is shown: the layout is the base's; O until the "
		    "base is shown, then change it", app_point_name(a));
	snap = model_bench_dup(a->bench);
	id = sel_id(a, &port);          /* before fn frees what the rows point at */
	if (fn(a->bench, arg, cause) != 0) {
		model_bench_free(snap);
		free(id);
		return -1;
	}
	push_snapshot(&a->undo, &a->nundo, snap);
	free_stack(a->redo, &a->nredo);
	retrace_select(a, id, port, a->sel);
	free(id);
	app_save(a);
	return 0;
}

static int
swap_from(struct app *a, struct bench ***from, size_t *nfrom, struct bench ***to,
    size_t *nto)
{
	if (*nfrom == 0)
		return -1;
	push_snapshot(to, nto, a->bench);
	a->bench = (*from)[--*nfrom];
	app_retrace(a);
	app_save(a);
	/* undoing a reinstate or a record: which setup is the draft now */
	if (a->base_text == NULL || a->stored == NULL || strcmp(a->base_text, a->stored) != 0)
		find_base(a);
	return 0;
}

int
app_undo(struct app *a)
{
	if (app_refuse_readonly(a))
		return -1;
	return swap_from(a, &a->undo, &a->nundo, &a->redo, &a->nredo);
}

int
app_redo(struct app *a)
{
	if (app_refuse_readonly(a))
		return -1;
	return swap_from(a, &a->redo, &a->nredo, &a->undo, &a->nundo);
}

void
app_replace_bench(struct app *a, struct bench *b)
{
	push_snapshot(&a->undo, &a->nundo, a->bench);
	free_stack(a->redo, &a->nredo);
	a->bench = b;
	remember_stored(a);
	app_retrace(a);
	app_refresh_rev(a);
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
