/* ui-list.c - the first screen: every bench in the database with its
 * latest setup, whether the draft has changed, and its worst element;
 * open, create, copy, delete, or load the demo bench.  On an empty
 * database it offers the demo at once.  Owned by the workbench. */
#include <config.h>

#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "bench-demo.h"
#include "bench-file.h"
#include "ui-app.h"
#include "util-err.h"

struct list {
	struct store_bench_row *rows;   /* owned */
	size_t                  n;
	char                  **worst;  /* owned: "W1 109 % OVER" per row */
	enum damage_status     *status; /* owned */
	int                     sel, top, visible;
	int                     offered;    /* the demo was offered once */
};

static void
list_clear(struct list *d)
{
	for (size_t i = 0; i < d->n; i++)
		free(d->worst[i]);
	free(d->worst);
	free(d->status);
	store_bench_rows_free(d->rows, d->n);
	d->rows = NULL;
	d->worst = NULL;
	d->status = NULL;
	d->n = 0;
}

static void
list_load(struct app *a, struct list *d)
{
	char *cause = NULL, *keep = NULL;

	if (d->sel >= 0 && (size_t)d->sel < d->n)
		keep = xstrdup(d->rows[d->sel].name);
	list_clear(d);
	if (store_benches(a->store, &d->rows, &d->n, &cause) != 0) {
		app_msg_take(a, 1, cause);
		d->n = 0;
	}
	d->worst = xcalloc(d->n ? d->n : 1, sizeof *d->worst);
	d->status = xcalloc(d->n ? d->n : 1, sizeof *d->status);
	for (size_t i = 0; i < d->n; i++) {
		struct bench *b = store_bench_load(a->store, d->rows[i].name, "draft", NULL, &cause);
		struct trace *t;
		char pct[32];

		if (b == NULL) {
			d->worst[i] = cause != NULL ? cause : xstrdup("cannot load");
			cause = NULL;
			continue;
		}
		t = trace_run(b);
		if (t->worst >= 0) {
			layout_percent(pct, sizeof pct, t->worst_ratio);
			d->status[i] = t->rows[t->worst].status;
			d->worst[i] = xasprintf("%s %s %s", layout_status_word(d->status[i]),
			    t->rows[t->worst].el->id, pct);
		} else {
			d->worst[i] = xstrdup("nothing rated");
		}
		trace_free(t);
		model_bench_free(b);
		if (keep != NULL && strcmp(keep, d->rows[i].name) == 0)
			d->sel = (int)i;
	}
	free(keep);
	if (d->sel >= (int)d->n)
		d->sel = (int)d->n - 1;
	if (d->sel < 0)
		d->sel = 0;
}

static void
list_release(struct ui_pane *p)
{
	struct list *d = p->data;

	list_clear(d);
	free(d);
}

static const struct layout_col list_cols[] = {
	{ "bench", 12, 28, 0 }, { "setup", 6, 7, 0 }, { "draft", 9, 9, 0 },
	{ "worst element", 18, 26, 0 }, { "updated (UTC)", 19, -1, 1 },
};
#define NLIST_COLS (sizeof list_cols / sizeof *list_cols)

static void
list_draw(struct app *a, struct ui_pane *p, int h, int w)
{
	struct list *d = p->data;
	int cw[NLIST_COLS], x, y;
	char *t;

	t = xasprintf("%zu bench%s%s", d->n, d->n == 1 ? "" : "es",
	    a->readonly ? " (VIEW ONLY: read-only)" : "");
	ui_frame(a, t, store_path(a->store), h, w);
	free(t);
	layout_fit_columns(list_cols, NLIST_COLS, w - 2, 2, cw);
	x = 1;
	for (size_t c = 0; c < NLIST_COLS; c++)
		if (cw[c] > 0) {
			ui_put(a, 2, x, cw[c], list_cols[c].name, UC_HEADER);
			x += cw[c] + 2;
		}
	d->visible = h - 6;
	d->top = layout_scroll(d->sel, d->top, d->visible, (int)d->n);
	if (d->n == 0) {
		ui_put(a, 4, 2, w - 4, "No benches in this database yet.", UC_NORMAL);
		ui_put(a, 5, 2, w - 4, a->readonly ? "It is read-only: nothing can be added." :
		    "d loads the demo bench (an invented ablation line), n starts a new bench.",
		    UC_NORMAL);
	}
	for (int r = 0; r < d->visible && d->top + r < (int)d->n; r++) {
		int i = d->top + r;
		const struct store_bench_row *br = &d->rows[i];
		attr_t sel = i == d->sel ? ui_attr(a, UC_SELECT) : A_NORMAL;
		char rev[24];

		y = 3 + r;
		ui_fill(a, y, 0, w, sel);
		if (br->latest_rev > 0)
			app_setup_name(br->latest_rev, rev, sizeof rev);
		else
			snprintf(rev, sizeof rev, "-");
		x = 1;
		for (size_t c = 0; c < NLIST_COLS; c++) {
			const char *s = c == 0 ? br->name : c == 1 ? rev :
			    c == 2 ? (br->draft_changed ? "changed" : "= setup") :
			    c == 3 ? d->worst[i] : br->updated;
			attr_t at = sel;

			if (cw[c] == 0)
				continue;
			if (c == 3)
				at |= ui_status_attr(a, d->status[i]);
			ui_put_attr(a, y, x, cw[c], s, at);
			x += cw[c] + 2;
		}
	}
	ui_footer(a, p->ops->keys, h, w);
}

/* ---- actions ---- */

static enum ui_reaction
list_move(struct ui_pane *p, int by)
{
	struct list *d = p->data;

	d->sel += by;
	if (d->sel >= (int)d->n)
		d->sel = (int)d->n - 1;
	if (d->sel < 0)
		d->sel = 0;
	return UI_REDRAW;
}

static enum ui_reaction
list_up(struct app *a, struct ui_pane *p)
{
	(void)a;
	return list_move(p, -1);
}

static enum ui_reaction
list_down(struct app *a, struct ui_pane *p)
{
	(void)a;
	return list_move(p, 1);
}

static enum ui_reaction
list_open(struct app *a, struct ui_pane *p)
{
	struct list *d = p->data;
	char *cause = NULL;

	if (d->n == 0) {
		app_msg(a, 1, "no bench to open: d loads the demo, n starts a new one");
		return UI_REDRAW;
	}
	if (app_open_bench(a, d->rows[d->sel].name, &cause) != 0) {
		app_msg_take(a, 1, cause);
		return UI_REDRAW;
	}
	free(a->msg);
	a->msg = NULL;
	ui_bench_push(a);
	return UI_REDRAW;
}

static int
create_and_open(struct app *a, struct bench *b, const char *note, char **cause)
{
	if (store_bench_create(a->store, b, note, a->author, cause) != 0)
		return -1;
	if (app_open_bench(a, b->name, cause) != 0)
		return -1;
	if (a->demo_name == NULL || strcmp(b->name, a->demo_name) != 0)
		app_msg(a, 0, "bench '%s' created, recorded #1; every change is saved to its draft",
		    b->name);
	ui_bench_push(a);
	return 0;
}

static void
load_demo(struct app *a)
{
	char *cause = NULL;
	struct bench *b = bench_file_parse(bench_demo_text, strlen(bench_demo_text), "demo",
	    &cause);

	if (b == NULL) {
		app_msg_take(a, 1, cause);
		return;
	}
	if (store_resolve_rev(a->store, b->name, "draft", NULL, &cause) == 0) {
		free(cause);
		cause = NULL;
		if (app_open_bench(a, b->name, &cause) == 0) {
			app_msg(a, 0, "the demo bench '%s' was already here: opened it", b->name);
			ui_bench_push(a);
		} else {
			app_msg_take(a, 1, cause);
		}
		model_bench_free(b);
		return;
	}
	free(cause);
	cause = NULL;
	if (create_and_open(a, b, "demo bench, loaded in the workbench", &cause) != 0)
		app_msg_take(a, 1, cause);
	model_bench_free(b);
}

static enum ui_reaction
list_demo(struct app *a, struct ui_pane *p)
{
	(void)p;
	load_demo(a);
	return UI_REDRAW;
}

static void
offer_answer(struct app *a, void *arg, int yes)
{
	(void)arg;
	if (yes)
		load_demo(a);
	else
		app_msg(a, 0, "d loads the demo later; n starts a new bench");
}

static int
new_bench(struct app *a, void *arg, const char *text, char **cause)
{
	struct bench *b;
	int rc;

	(void)arg;
	if (text[0] == '\0')
		return fail_with(cause, "a bench needs a name");
	b = layout_bench_new(text);
	rc = create_and_open(a, b, "new bench: the source alone, no elements yet", cause);
	model_bench_free(b);
	if (rc == 0)
		app_msg(a, 0, "new bench '%s': b sets the beam (it starts at 1064 nm, CW 1 W), "
		    "p places elements", text);
	return rc;
}

static enum ui_reaction
list_new(struct app *a, struct ui_pane *p)
{
	(void)p;
	ui_prompt(a, "new bench", "Name of the new bench. It starts with a 1064 nm, 1 W CW "
	    "source and no elements.", "", new_bench, NULL, NULL);
	return UI_REDRAW;
}

static int
copy_bench(struct app *a, void *arg, const char *text, char **cause)
{
	const char *from = arg;

	if (text[0] == '\0')
		return fail_with(cause, "the copy needs a name");
	if (store_clone(a->store, from, "draft", text, a->author, cause) != 0)
		return -1;
	app_msg(a, 0, "'%s' copied from the draft of '%s'", text, from);
	if (a->top != NULL && a->top->below != NULL && a->top->below->ops == &ui_list_ops)
		list_load(a, a->top->below->data);
	return 0;
}

static enum ui_reaction
list_copy(struct app *a, struct ui_pane *p)
{
	struct list *d = p->data;
	char *init;

	if (d->n == 0)
		return UI_NONE;
	init = xasprintf("%s-copy", d->rows[d->sel].name);
	ui_prompt(a, "copy bench", "Name of the new bench, a copy of this bench's draft:",
	    init, copy_bench, xstrdup(d->rows[d->sel].name), free);
	free(init);
	return UI_REDRAW;
}

static void
delete_answer(struct app *a, void *arg, int yes)
{
	char *name = arg, *cause = NULL;

	if (yes) {
		if (store_bench_delete(a->store, name, &cause) != 0)
			app_msg_take(a, 1, cause);
		else
			app_msg(a, 0, "bench '%s' deleted", name);
		if (a->top != NULL && a->top->ops == &ui_list_ops)
			list_load(a, a->top->data);
	}
	free(name);
}

static enum ui_reaction
list_delete(struct app *a, struct ui_pane *p)
{
	struct list *d = p->data;
	char *q;

	if (d->n == 0)
		return UI_NONE;
	q = xasprintf("Delete bench '%s' with its draft and all %d recorded setup%s? This cannot "
	    "be taken back.", d->rows[d->sel].name, d->rows[d->sel].latest_rev,
	    d->rows[d->sel].latest_rev == 1 ? "" : "s");
	ui_confirm(a, q, delete_answer, xstrdup(d->rows[d->sel].name));
	free(q);
	return UI_REDRAW;
}

static enum ui_reaction
list_quit(struct app *a, struct ui_pane *p)
{
	(void)p;
	return app_quit(a);
}

static enum ui_reaction
list_click(struct app *a, struct ui_pane *p, int y, int x, int dbl)
{
	struct list *d = p->data;
	int i = d->top + y - 3;

	(void)x;
	if (y < 3 || i >= (int)d->n)
		return UI_NONE;
	d->sel = i;
	return dbl ? list_open(a, p) : UI_REDRAW;
}

static void
list_enter(struct app *a, struct ui_pane *p)
{
	app_close_bench(a);
	list_load(a, p->data);
}

static enum ui_reaction
list_home(struct app *a, struct ui_pane *p)
{
	(void)a;
	return list_move(p, -(int)((struct list *)p->data)->n);
}

static enum ui_reaction
list_end(struct app *a, struct ui_pane *p)
{
	(void)a;
	return list_move(p, (int)((struct list *)p->data)->n);
}

static enum ui_reaction
list_pgup(struct app *a, struct ui_pane *p)
{
	(void)a;
	return list_move(p, -(((struct list *)p->data)->visible - 1));
}

static enum ui_reaction
list_pgdn(struct app *a, struct ui_pane *p)
{
	(void)a;
	return list_move(p, ((struct list *)p->data)->visible - 1);
}

static const struct ui_key list_keys[] = {
	{ { UI_FKEY(KEY_UP) }, "\u2191\u2193", "choose", 2, "choose a bench (the mouse too)", list_up, 0, UG_MOVE },
	{ { UI_FKEY(KEY_DOWN) }, "\u2193", NULL, 0, NULL, list_down, 0, UG_MOVE },
	{ { UI_FKEY(KEY_PPAGE) }, "PgUp", NULL, 0, "a page up", list_pgup, 0, UG_MOVE },
	{ { UI_FKEY(KEY_NPAGE) }, "PgDn", NULL, 0, "a page down", list_pgdn, 0, UG_MOVE },
	{ { UI_FKEY(KEY_HOME) }, "Home", NULL, 0, "the first bench", list_home, 0, UG_MOVE },
	{ { UI_FKEY(KEY_END) }, "End", NULL, 0, "the last bench", list_end, 0, UG_MOVE },
	{ { '\r', '\n', UI_FKEY(KEY_ENTER) }, "Enter", "open", 0, "open the bench on the workbench", list_open, 0, UG_BENCHES },
	{ { 'n', UI_FKEY(KEY_IC) }, "n", "new", 1, "a new bench (name it; it starts with a 1 W CW source; also Insert)", list_new, UI_K_EDITS, UG_BENCHES },
	{ { 'd' }, "d", "demo", 1, "load the demo bench (invented data: an ablation line)", list_demo, UI_K_EDITS, UG_BENCHES },
	{ { 'c' }, "c", "copy", 3, "copy the bench's draft to a new bench", list_copy, UI_K_EDITS, UG_BENCHES },
	{ { UI_FKEY(KEY_DC), 'D' }, "Del", "delete", 4, "delete the bench and all its setups (asks first; also D)", list_delete, UI_K_EDITS, UG_BENCHES },
	{ { 'q', UI_ESC }, "q", "quit", 0, "quit (everything is already saved)", list_quit, 0, UG_LEAVE },
	UI_KEYS_END,
};

const struct ui_pane_ops ui_list_ops = {
	"bench list", 0, list_keys, list_draw, NULL, list_click, list_enter, NULL, list_release,
};

void
ui_list_push(struct app *a)
{
	struct list *d = xcalloc(1, sizeof *d);

	app_push(a, &ui_list_ops, d);
	list_load(a, d);
	if (d->n == 0 && !a->readonly && !d->offered) {
		d->offered = 1;
		ui_confirm(a, "This database has no benches yet. Load the demo bench "
		    "'table3-ablation' (an invented 1064 nm ablation line with an optic over "
		    "its threshold)?", offer_answer, NULL);
	} else if (d->n == 0 && a->readonly) {
		app_msg(a, 1, "view only: the database is read-only and empty");
	}
}
