/* ui-history.c - the bench's revisions (time, author, note, labels) with
 * the draft on top: commit, diff any two (the chain changes and what they
 * did to the margins, as `beamledger diff` prints), restore, label.
 * Owned by the workbench. */
#include <config.h>

#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include "cmd-report.h"
#include "core-diff.h"
#include "report-diff.h"
#include "bench-file.h"
#include "ui-app.h"
#include "util-err.h"

struct hist {
	struct store_rev *revs;     /* owned, newest first */
	size_t            n;
	int               sel, top, mark;   /* row 0 is the draft; mark -1: none */
};

static void
hist_load(struct app *a, struct hist *d)
{
	char *cause = NULL;

	store_revs_free(d->revs, d->n);
	d->revs = NULL;
	d->n = 0;
	if (store_log(a->store, a->name, &d->revs, &d->n, &cause) != 0)
		app_msg_take(a, 1, cause);
	app_refresh_rev(a);
	if (d->sel > (int)d->n)
		d->sel = (int)d->n;
	if (d->mark > (int)d->n)
		d->mark = -1;
}

static void
hist_release(struct ui_pane *p)
{
	struct hist *d = p->data;

	store_revs_free(d->revs, d->n);
	free(d);
}

/* "draft" or "r3" for a row. */
static void
row_ref(const struct hist *d, int row, char *buf, size_t n)
{
	if (row == 0)
		snprintf(buf, n, "draft");
	else
		snprintf(buf, n, "r%d", d->revs[row - 1].no);
}

static void
hist_draw(struct app *a, struct ui_pane *p, int h, int w)
{
	struct hist *d = p->data;
	int rows = h - 6, y;
	char *t;

	ui_fill(a, 0, 0, w, ui_attr(a, UC_TITLE));
	t = xasprintf(" beamledger %s %s %s history: %zu revision%s", ui_glyph(a, GL_VBAR),
	    a->name, ui_glyph(a, GL_VBAR), d->n, d->n == 1 ? "" : "s");
	ui_put(a, 0, 0, w, t, UC_TITLE);
	free(t);
	ui_put(a, 2, 1, 6, "rev", UC_HEADER);
	ui_put(a, 2, 8, 19, "time (UTC)", UC_HEADER);
	ui_put(a, 2, 28, 12, "author", UC_HEADER);
	ui_put(a, 2, 41, w - 42, "[labels] note", UC_HEADER);
	d->top = layout_scroll(d->sel, d->top, rows, (int)d->n + 1);
	for (int r = 0; r < rows && d->top + r <= (int)d->n; r++) {
		int i = d->top + r;
		attr_t at = i == d->sel ? ui_attr(a, UC_SELECT) : A_NORMAL;
		char ref[24], *note;

		y = 3 + r;
		ui_fill(a, y, 0, w, at);
		row_ref(d, i, ref, sizeof ref);
		if (i == d->mark)
			ui_put_attr(a, y, 0, 1, "*", at | A_BOLD);
		ui_put_attr(a, y, 1, 6, ref, at | A_BOLD);
		if (i == 0) {
			note = xstrdup(a->latest_rev == 0 ? "(no revision yet)" : a->draft_changed ?
			    "uncommitted changes: c commits them" : "same as the latest revision");
			ui_put_attr(a, y, 8, w - 9, note, at | ui_attr(a, a->draft_changed ? UC_CAUTION : UC_DIM));
			free(note);
			continue;
		}
		{
			const struct store_rev *v = &d->revs[i - 1];

			ui_put_attr(a, y, 8, 19, v->time, at);
			ui_put_attr(a, y, 28, 12, v->author, at);
			note = v->labels[0] != '\0' ? xasprintf("[%s] %s", v->labels, v->note) :
			    xstrdup(v->note);
			ui_put_attr(a, y, 41, w - 42, note, at);
			free(note);
		}
	}
	{
		char from[24], to[24];
		int older = d->mark >= 0 ? (d->mark > d->sel ? d->mark : d->sel) : d->sel + 1;
		int newer = d->mark >= 0 ? (d->mark > d->sel ? d->sel : d->mark) : d->sel;

		if (older <= (int)d->n && older != newer) {
			row_ref(d, older, from, sizeof from);
			row_ref(d, newer, to, sizeof to);
			t = xasprintf("d compares %s %s %s%s", from, ui_glyph(a, GL_ARROW), to,
			    d->mark < 0 ? "   (Space marks a revision to compare with another)" : "");
			ui_put(a, h - 3, 1, w - 2, t, UC_DIM);
			free(t);
		}
	}
	ui_footer(a, p->ops->keys, h, w);
}

static enum ui_reaction
h_move(struct ui_pane *p, int by)
{
	struct hist *d = p->data;

	d->sel += by;
	if (d->sel > (int)d->n)
		d->sel = (int)d->n;
	if (d->sel < 0)
		d->sel = 0;
	return UI_REDRAW;
}

static enum ui_reaction
h_up(struct app *a, struct ui_pane *p)
{
	(void)a;
	return h_move(p, -1);
}

static enum ui_reaction
h_down(struct app *a, struct ui_pane *p)
{
	(void)a;
	return h_move(p, 1);
}

static enum ui_reaction
h_mark(struct app *a, struct ui_pane *p)
{
	struct hist *d = p->data;
	char ref[24];

	d->mark = d->mark == d->sel ? -1 : d->sel;
	row_ref(d, d->sel, ref, sizeof ref);
	if (d->mark >= 0)
		app_msg(a, 0, "%s marked: select another and press d to compare", ref);
	else
		app_msg(a, 0, "mark cleared");
	return UI_REDRAW;
}

static struct bench *
load_row(struct app *a, struct hist *d, int row, char **cause)
{
	char ref[24];

	if (row == 0)
		return model_bench_dup(a->bench);
	row_ref(d, row, ref, sizeof ref);
	return store_bench_load(a->store, a->name, ref, NULL, cause);
}

static enum ui_reaction
h_diff(struct app *a, struct ui_pane *p)
{
	struct hist *d = p->data;
	int older = d->mark >= 0 ? (d->mark > d->sel ? d->mark : d->sel) : d->sel + 1;
	int newer = d->mark >= 0 ? (d->mark > d->sel ? d->sel : d->mark) : d->sel;
	struct bench *ob, *nb;
	struct diff *df;
	char from[24], to[24], *cause = NULL, *text, *title;

	if (older == newer || older > (int)d->n) {
		app_msg(a, 1, "nothing older to compare with: mark another revision with Space");
		return UI_REDRAW;
	}
	row_ref(d, older, from, sizeof from);
	row_ref(d, newer, to, sizeof to);
	ob = load_row(a, d, older, &cause);
	nb = ob != NULL ? load_row(a, d, newer, &cause) : NULL;
	if (nb == NULL) {
		model_bench_free(ob);
		app_msg_take(a, 1, cause);
		return UI_REDRAW;
	}
	df = diff_run(ob, nb);
	text = report_diff_text(df, a->name, from, to);
	title = xasprintf("diff %s %s %s", from, ui_glyph(a, GL_ARROW), to);
	ui_text_view(a, title, text);
	free(title);
	diff_free(df);
	model_bench_free(ob);
	model_bench_free(nb);
	return UI_REDRAW;
}

static void
restore_answer(struct app *a, void *arg, int yes)
{
	char *ref = arg, *cause = NULL;
	struct bench *b;

	if (!yes) {
		app_msg(a, 0, "not restored");
		free(ref);
		return;
	}
	if (store_restore(a->store, a->name, ref, 1, &cause) != 0 ||
	    (b = store_bench_load(a->store, a->name, "draft", NULL, &cause)) == NULL) {
		app_msg_take(a, 1, cause);
		free(ref);
		return;
	}
	app_replace_bench(a, b);
	app_msg(a, 0, "%s restored as the draft (u on the workbench brings the old draft back)", ref);
	free(ref);
}

static enum ui_reaction
h_restore(struct app *a, struct ui_pane *p)
{
	struct hist *d = p->data;
	char ref[24], *q;

	if (d->sel == 0) {
		app_msg(a, 1, "the draft is what you are editing: choose a revision to restore");
		return UI_REDRAW;
	}
	row_ref(d, d->sel, ref, sizeof ref);
	{
		/* nothing to ask when the draft already is that revision */
		struct bench *rb = store_bench_load(a->store, a->name, ref, NULL, NULL);
		char *rt = rb != NULL ? bench_file_dump(rb) : NULL, *dt = bench_file_dump(a->bench);
		int same = rt != NULL && strcmp(rt, dt) == 0;

		free(rt);
		free(dt);
		model_bench_free(rb);
		if (same) {
			app_msg(a, 0, "the draft already is %s: nothing to restore", ref);
			return UI_REDRAW;
		}
	}
	q = xasprintf("Make %s the draft?%s", ref, a->draft_changed ?
	    " The draft's uncommitted changes are replaced (u on the workbench brings them back "
	    "while it stays open)." : "");
	ui_confirm(a, q, restore_answer, xstrdup(ref));
	free(q);
	return UI_REDRAW;
}

static int
give_label(struct app *a, void *arg, const char *text, char **cause)
{
	const char *ref = arg;

	if (text[0] == '\0')
		return fail_with(cause, "a label must not be empty");
	if (store_label(a->store, a->name, ref, text, cause) != 0)
		return -1;
	app_msg(a, 0, "%s labelled '%s'", ref, text);
	return 0;
}

static enum ui_reaction
h_label(struct app *a, struct ui_pane *p)
{
	struct hist *d = p->data;
	char ref[24], *help;

	if (d->sel == 0) {
		app_msg(a, 1, "labels name revisions: commit the draft first (c)");
		return UI_REDRAW;
	}
	row_ref(d, d->sel, ref, sizeof ref);
	help = xasprintf("A name for %s, e.g. \"aligned\" (not rN or draft; unique in the bench):", ref);
	ui_prompt(a, "label", help, "", give_label, xstrdup(ref), free);
	free(help);
	return UI_REDRAW;
}

static int
do_commit(struct app *a, void *arg, const char *text, char **cause)
{
	int no = 0;

	(void)arg;
	if (text[0] == '\0')
		return fail_with(cause, "say in a few words what changed (the note is kept with the revision)");
	if (a->unsaved != NULL && app_save(a) != 0)
		return fail_with(cause, "the draft is not saved, so it cannot be committed: %s",
		    a->unsaved);
	if (store_commit(a->store, a->name, text, a->author, &no, cause) != 0)
		return -1;
	app_refresh_rev(a);
	app_msg(a, 0, "committed r%d: \"%s\"", no, text);
	return 0;
}

void
ui_commit_prompt(struct app *a)
{
	if (app_refuse_readonly(a))
		return;
	ui_prompt(a, "commit", "The draft becomes a new revision. A note for it (what changed, why):",
	    "", do_commit, NULL, NULL);
}

static enum ui_reaction
h_commit(struct app *a, struct ui_pane *p)
{
	(void)p;
	ui_commit_prompt(a);
	return UI_REDRAW;
}

static enum ui_reaction
h_back(struct app *a, struct ui_pane *p)
{
	(void)a;
	(void)p;
	return UI_POP | UI_REDRAW;
}

static enum ui_reaction
h_click(struct app *a, struct ui_pane *p, int y, int x, int dbl)
{
	struct hist *d = p->data;
	int i = d->top + y - 3;

	(void)x;
	if (y < 3 || i > (int)d->n)
		return UI_NONE;
	d->sel = i;
	return dbl ? h_diff(a, p) : UI_REDRAW;
}

static void
h_enter(struct app *a, struct ui_pane *p)
{
	hist_load(a, p->data);
}

/* The printed review of the chosen setup, as a PDF in the current folder. */
static enum ui_reaction
h_review(struct app *a, struct ui_pane *p)
{
	struct hist *d = p->data;
	char ref[24], *cause = NULL, *path, *cwd;
	struct review_src *g;

	row_ref(d, d->sel, ref, sizeof ref);
	if ((g = review_src_record(a->store, a->name, d->sel == 0 ? NULL : ref, NULL,
	    &cause)) == NULL) {
		app_msg_take(a, 1, cause);
		return UI_REDRAW;
	}
	path = xasprintf("%s.pdf", review_src_stem(g));
	if (review_src_write(g, path, 1, &cause) != 0) {
		app_msg_take(a, 1, cause);
	} else {
		cwd = getcwd(NULL, 0);
		app_msg(a, 0, "review of %s written to %s/%s", review_src_setup(g),
		    cwd != NULL ? cwd : ".", path);
		free(cwd);
	}
	free(path);
	review_src_free(g);
	return UI_REDRAW;
}

static const struct ui_key hist_keys[] = {
	{ { UI_FKEY(KEY_UP), 'k' }, "\u2191\u2193", "choose", 3, "choose a revision (also k, j)", h_up, 0 },
	{ { UI_FKEY(KEY_DOWN), 'j' }, "\u2193", NULL, 0, NULL, h_down, 0 },
	{ { ' ' }, "Space", "mark", 1, "mark a revision; d then compares it with the selected one", h_mark, 0 },
	{ { 'd', '\r', '\n', UI_FKEY(KEY_ENTER) }, "d", "diff", 0,
	    "what changed and what it did to the margins (also Enter)", h_diff, 0 },
	{ { 'c' }, "c", "commit", 1, "commit the draft with a note", h_commit, UI_K_EDITS },
	{ { 'r' }, "r", "restore", 2, "make the selected revision the draft (asks first)", h_restore, UI_K_EDITS },
	{ { 'l' }, "l", "label", 2, "name the selected revision", h_label, UI_K_EDITS },
	{ { 'v' }, "v", "review", 2, "write the printed review (PDF) of the selected revision in the current folder", h_review, 0 },
	{ { UI_ESC, 'q', 'h' }, "Esc", "back", 0, "back to the workbench (also q, h)", h_back, 0 },
	{ { 0 }, NULL, NULL, 0, NULL, NULL, 0 },
};

const struct ui_pane_ops ui_history_ops = {
	"history", 0, hist_keys, hist_draw, NULL, h_click, h_enter, NULL, hist_release,
};

void
ui_history_push(struct app *a)
{
	struct hist *d = xcalloc(1, sizeof *d);

	d->mark = -1;
	app_push(a, &ui_history_ops, d);
	hist_load(a, d);
}
