/* ui-history.c - the bench's logbook: its recorded setups newest first,
 * each with its number, time, author, names, note, and what that setup
 * did to the bench (its worst element and safe source power, traced when
 * shown), with the draft on top.  Record, compare any two (the chain
 * changes and what they did to the margins), reinstate, mark.  Owned by
 * the workbench. */
#include <config.h>

#include <math.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include "cmd-report.h"
#include "core-diff.h"
#include "report-diff.h"
#include "bench-file.h"
#include "ui-app.h"
#include "util-buf.h"
#include "util-err.h"

struct hist {
	struct store_rev *revs;     /* owned, newest first */
	size_t            n;
	char            **margin;   /* owned: per setup, traced when first shown */
	enum damage_status *status; /* owned */
	int               sel, top, pin;    /* entry 0 is the draft; pin -1: none */
	int               per_page;
};

static void
hist_clear(struct hist *d)
{
	for (size_t i = 0; i < d->n; i++)
		free(d->margin != NULL ? d->margin[i] : NULL);
	free(d->margin);
	free(d->status);
	store_revs_free(d->revs, d->n);
	d->revs = NULL;
	d->margin = NULL;
	d->status = NULL;
	d->n = 0;
}

static void
hist_load(struct app *a, struct hist *d)
{
	char *cause = NULL;

	hist_clear(d);
	if (store_log(a->store, a->name, &d->revs, &d->n, &cause) != 0)
		app_msg_take(a, 1, cause);
	d->margin = xcalloc(d->n ? d->n : 1, sizeof *d->margin);
	d->status = xcalloc(d->n ? d->n : 1, sizeof *d->status);
	app_refresh_rev(a);
	if (d->sel > (int)d->n)
		d->sel = (int)d->n;
	if (d->pin > (int)d->n)
		d->pin = -1;
}

static void
hist_release(struct ui_pane *p)
{
	struct hist *d = p->data;

	hist_clear(d);
	free(d);
}

/* "draft" or "#3" as shown; ref: as the store takes it. */
static void
entry_name(const struct hist *d, int e, char *buf, size_t n)
{
	if (e == 0)
		snprintf(buf, n, "draft");
	else
		app_setup_name(d->revs[e - 1].no, buf, n);
}

static void
entry_ref(const struct hist *d, int e, char *buf, size_t n)
{
	if (e == 0)
		snprintf(buf, n, "draft");
	else
		app_setup_ref(d->revs[e - 1].no, buf, n);
}

/* What a trace says about the margins, in the words of the margin line. */
static char *
margin_words(const struct trace *t, enum damage_status *st)
{
	char pct[32], v[48];
	struct buf b;

	buf_init(&b);
	if (t->worst >= 0) {
		*st = t->rows[t->worst].status;
		layout_percent(pct, sizeof pct, t->worst_ratio);
		buf_printf(&b, "%s %s %s", layout_status_word(*st), t->rows[t->worst].el->id, pct);
	} else {
		*st = STATUS_UNRATED;
		buf_add(&b, "nothing rated");
	}
	if (isinf(t->safe_source_power)) {
		buf_add(&b, ", safe source power: no limit");
	} else if (isfinite(t->safe_source_power)) {
		units_format(v, sizeof v, t->safe_source_power, DIM_POWER, 3, 0);
		buf_printf(&b, ", safe source power %s", v);
	}
	return buf_take(&b);
}

/* Caller frees. */
static char *
entry_margin(struct app *a, struct hist *d, int e, enum damage_status *st)
{
	if (e == 0 && a->shown == a->bench)
		return margin_words(a->trace, st);
	if (e == 0) {
		/* a point is on the chain: the draft's own line is its base, as
		 * every setup's is */
		struct trace *t = trace_run(a->bench);
		char *m = margin_words(t, st);

		trace_free(t);
		return m;
	}
	if (d->margin[e - 1] == NULL) {
		char ref[24];
		struct bench *b;

		entry_ref(d, e, ref, sizeof ref);
		b = store_bench_load(a->store, a->name, ref, NULL, NULL);
		if (b == NULL) {
			d->margin[e - 1] = xstrdup("cannot load");
			d->status[e - 1] = STATUS_UNRATED;
		} else {
			struct trace *t = trace_run(b);

			d->margin[e - 1] = margin_words(t, &d->status[e - 1]);
			trace_free(t);
			model_bench_free(b);
		}
	}
	*st = d->status[e - 1];
	return xstrdup(d->margin[e - 1]);
}

/* The older and the newer entry a compare takes: the pinned one and the
 * selection, or the selection and the one before it. */
static int
compare_pair(const struct app *a, const struct hist *d, int *older, int *newer)
{
	*older = d->pin >= 0 ? (d->pin > d->sel ? d->pin : d->sel) : d->sel + 1;
	*newer = d->pin >= 0 ? (d->pin > d->sel ? d->sel : d->pin) : d->sel;
	/* the draft that is the latest setup: compare that setup with the one
	 * before it, not with itself */
	if (d->pin < 0 && d->sel == 0 && d->n > 0 && a->base_rev == d->revs[0].no &&
	    a->base_text != NULL && a->stored != NULL && strcmp(a->base_text, a->stored) == 0) {
		*older = 2;
		*newer = 1;
	}
	return *older != *newer && *older <= (int)d->n;
}

static void
hist_draw(struct app *a, struct ui_pane *p, int h, int w)
{
	struct hist *d = p->data;
	int y;
	char *t;

	t = xasprintf("logbook %s %zu setup%s recorded", ui_glyph(a, GL_DOT), d->n,
	    d->n == 1 ? "" : "s");
	ui_frame(a, t, NULL, h, w);
	free(t);
	d->per_page = (h - 6) / 2;
	if (d->per_page < 1)
		d->per_page = 1;
	d->top = layout_scroll(d->sel, d->top, d->per_page, (int)d->n + 1);
	for (int r = 0; r < d->per_page && d->top + r <= (int)d->n; r++) {
		int e = d->top + r;
		attr_t at = e == d->sel ? ui_attr(a, UC_SELECT) : A_NORMAL;
		char name[24], *l1, *l2;
		enum damage_status st;
		char *m;

		y = 2 + 2 * r;
		ui_fill(a, y, 0, w, at);
		ui_fill(a, y + 1, 0, w, at);
		entry_name(d, e, name, sizeof name);
		if (e == d->pin)
			ui_put_attr(a, y, 0, 2, ui_glyph(a, GL_PIN), at | A_BOLD);
		if (e == 0) {
			char state[96];

			app_draft_words(a, state, sizeof state);
			/* "draft = #3" is said as "draft  = #3" in the draft's row */
			l1 = xasprintf("%-6s %s", name, strncmp(state, "draft: ", 7) == 0 ||
			    strncmp(state, "draft, ", 7) == 0 ? state + 7 :
			    strncmp(state, "draft ", 6) == 0 ? state + 6 : state);
		} else {
			const struct store_rev *v = &d->revs[e - 1];
			char *badge = NULL;

			if (v->labels[0] != '\0')
				badge = xasprintf("  %s%s%s", a->ascii ? "<" : "\u2039", v->labels,
				    a->ascii ? ">" : "\u203a");
			l1 = xasprintf("%-6s %.16s  %s%s", name, v->time, v->author,
			    badge != NULL ? badge : "");
			free(badge);
		}
		ui_put_attr(a, y, 2, w - 3, l1, at | A_BOLD);
		free(l1);
		m = entry_margin(a, d, e, &st);
		ui_put_attr(a, y + 1, 9, 28 < w - 10 ? (int)utf8_cols(m) < w - 10 ?
		    (int)utf8_cols(m) : w - 10 : w - 10, m, at | ui_status_attr(a, st));
		l2 = e == 0 ? xstrdup("") : xasprintf("\"%s\"", d->revs[e - 1].note);
		{
			int mx = 9 + (int)utf8_cols(m) + 3;

			if (mx < w - 4 && l2[0] != '\0')
				ui_put_attr(a, y + 1, mx, w - mx - 1, l2, at);
		}
		free(l2);
		free(m);
	}
	ui_footer(a, p->ops->keys, h, w);
	{
		char from[24], to[24];
		int older, newer;

		if (compare_pair(a, d, &older, &newer)) {
			entry_name(d, older, from, sizeof from);
			entry_name(d, newer, to, sizeof to);
			t = xasprintf("Enter compares %s %s %s%s", from, ui_glyph(a, GL_ARROW), to,
			    d->pin < 0 ? "   (Space pins a setup to compare others with)" : "");
			ui_put(a, h - 4, 1, w - 2, t, UC_DIM);
			free(t);
		}
	}
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
h_pgup(struct app *a, struct ui_pane *p)
{
	(void)a;
	return h_move(p, -((struct hist *)p->data)->per_page);
}

static enum ui_reaction
h_pgdn(struct app *a, struct ui_pane *p)
{
	(void)a;
	return h_move(p, ((struct hist *)p->data)->per_page);
}

static enum ui_reaction
h_home(struct app *a, struct ui_pane *p)
{
	(void)a;
	return h_move(p, -(int)((struct hist *)p->data)->n - 1);
}

static enum ui_reaction
h_end(struct app *a, struct ui_pane *p)
{
	(void)a;
	return h_move(p, (int)((struct hist *)p->data)->n + 1);
}

static enum ui_reaction
h_pin(struct app *a, struct ui_pane *p)
{
	struct hist *d = p->data;
	char name[24];

	d->pin = d->pin == d->sel ? -1 : d->sel;
	entry_name(d, d->sel, name, sizeof name);
	if (d->pin >= 0)
		app_msg(a, 0, "%s pinned: choose another and press Enter to compare them", name);
	else
		app_msg(a, 0, "pin taken off");
	return UI_REDRAW;
}

static struct bench *
load_entry(struct app *a, struct hist *d, int e, char **cause)
{
	char ref[24];

	if (e == 0)
		return model_bench_dup(a->bench);
	entry_ref(d, e, ref, sizeof ref);
	return store_bench_load(a->store, a->name, ref, NULL, cause);
}

static void
show_compare(struct app *a, struct bench *ob, struct bench *nb, const char *from,
    const char *to)
{
	struct diff *df = diff_run(ob, nb);
	char *text = report_diff_text(df, a->name, from, to), *title;

	title = xasprintf("compare %s %s %s", from, ui_glyph(a, GL_ARROW), to);
	ui_text_view(a, title, text);
	free(title);
	diff_free(df);
}

static enum ui_reaction
h_compare(struct app *a, struct ui_pane *p)
{
	struct hist *d = p->data;
	int older, newer;
	struct bench *ob, *nb;
	char from[24], to[24], *cause = NULL;

	if (!compare_pair(a, d, &older, &newer)) {
		app_msg(a, 1, "nothing older to compare with: pin another setup with Space");
		return UI_REDRAW;
	}
	entry_name(d, older, from, sizeof from);
	entry_name(d, newer, to, sizeof to);
	ob = load_entry(a, d, older, &cause);
	nb = ob != NULL ? load_entry(a, d, newer, &cause) : NULL;
	if (nb == NULL) {
		model_bench_free(ob);
		app_msg_take(a, 1, cause);
		return UI_REDRAW;
	}
	show_compare(a, ob, nb, from, to);
	model_bench_free(ob);
	model_bench_free(nb);
	return UI_REDRAW;
}

void
ui_compare_draft(struct app *a)
{
	char ref[24], name[24], *cause = NULL;
	struct bench *ob;

	if (a->bench == NULL)
		return;
	if (a->base_rev == 0) {
		app_msg(a, 1, "nothing recorded yet to compare the draft with: r records it");
		return;
	}
	app_setup_ref(a->base_rev, ref, sizeof ref);
	app_setup_name(a->base_rev, name, sizeof name);
	ob = store_bench_load(a->store, a->name, ref, NULL, &cause);
	if (ob == NULL) {
		app_msg_take(a, 1, cause);
		return;
	}
	show_compare(a, ob, a->bench, name, "draft");
	model_bench_free(ob);
}

struct reinstate_arg {
	char ref[24], name[24];
	int  no;
};

static void
reinstate_answer(struct app *a, void *arg, int yes)
{
	struct reinstate_arg *r = arg;
	char *cause = NULL;
	struct bench *b;

	if (!yes) {
		app_msg(a, 0, "not reinstated");
		free(r);
		return;
	}
	if (store_restore(a->store, a->name, r->ref, 1, &cause) != 0 ||
	    (b = store_bench_load(a->store, a->name, "draft", NULL, &cause)) == NULL) {
		app_msg_take(a, 1, cause);
		free(r);
		return;
	}
	app_replace_bench(a, b);
	app_set_base(a, r->no);
	app_msg(a, 0, "%s reinstated: draft = %s (- on the workbench brings the old draft back)",
	    r->name, r->name);
	free(r);
}

static enum ui_reaction
h_reinstate(struct app *a, struct ui_pane *p)
{
	struct hist *d = p->data;
	struct reinstate_arg *r;
	char *q, state[96];

	if (d->sel == 0) {
		app_msg(a, 1, "the draft is what you are editing: choose a setup to reinstate");
		return UI_REDRAW;
	}
	r = xcalloc(1, sizeof *r);
	entry_ref(d, d->sel, r->ref, sizeof r->ref);
	entry_name(d, d->sel, r->name, sizeof r->name);
	r->no = d->revs[d->sel - 1].no;
	{
		/* nothing to ask when the draft already is that setup */
		struct bench *rb = store_bench_load(a->store, a->name, r->ref, NULL, NULL);
		char *rt = rb != NULL ? bench_file_dump(rb) : NULL, *dt = bench_file_dump(a->bench);
		int same = rt != NULL && strcmp(rt, dt) == 0;

		free(rt);
		free(dt);
		model_bench_free(rb);
		if (same) {
			app_msg(a, 0, "the draft already is %s: nothing to reinstate", r->name);
			free(r);
			return UI_REDRAW;
		}
	}
	app_draft_words(a, state, sizeof state);
	q = xasprintf("Make %s the draft again?%s", r->name,
	    strstr(state, "not recorded") != NULL ?
	    " The draft's changes that are not recorded are replaced (- on the workbench "
	    "brings them back while it stays open)." : "");
	ui_confirm(a, q, reinstate_answer, r);
	free(q);
	return UI_REDRAW;
}

struct mark_arg {
	char ref[24], name[24];
};

static int
give_mark(struct app *a, void *arg, const char *text, char **cause)
{
	const struct mark_arg *m = arg;

	if (text[0] == '\0')
		return fail_with(cause, "a mark needs a name");
	if (store_label(a->store, a->name, m->ref, text, cause) != 0)
		return -1;
	app_msg(a, 0, "%s marked '%s'", m->name, text);
	return 0;
}

static enum ui_reaction
h_mark(struct app *a, struct ui_pane *p)
{
	struct hist *d = p->data;
	struct mark_arg *m;
	char *help;

	if (d->sel == 0) {
		app_msg(a, 1, "marks name recorded setups: record the draft first (r)");
		return UI_REDRAW;
	}
	m = xcalloc(1, sizeof *m);
	entry_ref(d, d->sel, m->ref, sizeof m->ref);
	entry_name(d, d->sel, m->name, sizeof m->name);
	help = xasprintf("A name for %s, e.g. \"aligned\" (not a number, not draft; unique "
	    "in the bench). It can then stand for %s in commands (BENCH@aligned).", m->name,
	    m->name);
	ui_prompt(a, "mark a setup", help, "", give_mark, m, free);
	free(help);
	return UI_REDRAW;
}

static int
do_record(struct app *a, void *arg, const char *text, char **cause)
{
	int no = 0;
	char name[24];

	(void)arg;
	if (text[0] == '\0')
		return fail_with(cause, "say in a few words what changed (the note is kept with the setup)");
	if (a->unsaved != NULL && app_save(a) != 0)
		return fail_with(cause, "the draft is not saved, so it cannot be recorded: %s",
		    a->unsaved);
	if (store_commit(a->store, a->name, text, a->author, &no, cause) != 0)
		return -1;
	app_refresh_rev(a);
	app_set_base(a, no);
	app_setup_name(no, name, sizeof name);
	app_msg(a, 0, "recorded %s: \"%s\"", name, text);
	return 0;
}

void
ui_record_prompt(struct app *a)
{
	char *help, name[24];

	if (app_refuse_readonly(a))
		return;
	app_setup_name(a->latest_rev + 1, name, sizeof name);
	help = xasprintf("The draft becomes setup %s. A note for the logbook (what changed, why):",
	    name);
	ui_prompt(a, "record", help, "", do_record, NULL, NULL);
	free(help);
}

static enum ui_reaction
h_record(struct app *a, struct ui_pane *p)
{
	(void)p;
	ui_record_prompt(a);
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
	int e = d->top + (y - 2) / 2;

	(void)x;
	if (y < 2 || e > (int)d->n)
		return UI_NONE;
	d->sel = e;
	return dbl ? h_compare(a, p) : UI_REDRAW;
}

static void
h_enter(struct app *a, struct ui_pane *p)
{
	hist_load(a, p->data);
}

/* A cause wider than the message line (the print module's names where it
 * looked and that the Markdown form needs none) on a text screen of its
 * own, wrapped to the terminal, rather than cut. */
static void
review_failed(struct app *a, char *cause)
{
	int w = COLS > 40 ? COLS - 1 : 79;
	size_t n, *st, *ln;
	struct buf b;

	if ((int)utf8_cols(cause) <= w) {
		app_msg_take(a, 1, cause);
		return;
	}
	n = layout_wrap(cause, w, NULL, NULL, 0);
	st = xcalloc(n + 1, sizeof *st);
	ln = xcalloc(n + 1, sizeof *ln);
	n = layout_wrap(cause, w, st, ln, n);
	buf_init(&b);
	for (size_t i = 0; i < n; i++) {
		buf_addn(&b, cause + st[i], ln[i]);
		buf_addc(&b, '\n');
	}
	free(st);
	free(ln);
	free(cause);
	app_msg(a, 1, "the review was not written: Esc goes back");
	ui_text_view(a, "review not written", buf_take(&b));
}

/* The printed review of the chosen setup, as a PDF in the current folder. */
static enum ui_reaction
h_review(struct app *a, struct ui_pane *p)
{
	struct hist *d = p->data;
	char ref[24], *cause = NULL, *path, *cwd;
	struct review_src *g;

	entry_ref(d, d->sel, ref, sizeof ref);
	if ((g = review_src_record(a->store, a->name, d->sel == 0 ? NULL : ref, NULL,
	    &cause)) == NULL) {
		app_msg_take(a, 1, cause);
		return UI_REDRAW;
	}
	path = xasprintf("%s.pdf", review_src_stem(g));
	if (review_src_write(g, path, 1, &cause) != 0) {
		review_failed(a, cause);
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
	{ { UI_FKEY(KEY_UP) }, "\u2191\u2193", "choose", 3, "choose a setup (the mouse too)", h_up, 0, UG_MOVE },
	{ { UI_FKEY(KEY_DOWN) }, "\u2193", NULL, 0, NULL, h_down, 0, UG_MOVE },
	{ { UI_FKEY(KEY_PPAGE) }, "PgUp", NULL, 0, "a page up", h_pgup, 0, UG_MOVE },
	{ { UI_FKEY(KEY_NPAGE) }, "PgDn", NULL, 0, "a page down", h_pgdn, 0, UG_MOVE },
	{ { UI_FKEY(KEY_HOME) }, "Home", NULL, 0, "the draft, on top", h_home, 0, UG_MOVE },
	{ { UI_FKEY(KEY_END) }, "End", NULL, 0, "the first setup", h_end, 0, UG_MOVE },
	{ { ' ' }, "Space", "pin", 1, "pin a setup; Enter then compares the selected one with it", h_pin, 0, UG_RECORD },
	{ { '\r', '\n', UI_FKEY(KEY_ENTER), 'c' }, "Enter", "compare", 0,
	    "what changed and what it did to the margins (also c)", h_compare, 0, UG_RECORD },
	{ { 'r' }, "r", "record", 1, "record the draft as a new setup, with a note", h_record, UI_K_EDITS, UG_RECORD },
	{ { 'R' }, "R", "reinstate", 2, "make the selected setup the draft again (asks first)", h_reinstate, UI_K_EDITS, UG_RECORD },
	{ { 'm' }, "m", "mark", 2, "give the selected setup a name", h_mark, UI_K_EDITS, UG_RECORD },
	{ { 'v' }, "v", "review", 2, "write the printed review (PDF) of the selected setup in the current folder", h_review, 0, UG_RECORD },
	{ { UI_ESC, 'q', 'h' }, "Esc", "back", 0, "back to the workbench (also q, h)", h_back, 0, UG_LEAVE },
	UI_KEYS_END,
};

const struct ui_pane_ops ui_history_ops = {
	"logbook (history)", 0, hist_keys, hist_draw, NULL, h_click, h_enter, NULL, hist_release,
};

void
ui_history_push(struct app *a)
{
	struct hist *d = xcalloc(1, sizeof *d);

	d->pin = -1;
	app_push(a, &ui_history_ops, d);
	hist_load(a, d);
}
