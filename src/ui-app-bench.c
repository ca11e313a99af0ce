/* ui-app-bench.c - the workbench's open bench: the selection, the bench
 * shown (at an operating point or the base) and its trace, the setup it
 * stands on, undo and redo snapshots, and the save to the draft after every
 * change, only if the stored draft is still the one last seen, so that
 * quitting is always safe.  Owned by the workbench. */
#include <config.h>

#include <stdlib.h>
#include <string.h>
#include <time.h>

#include "bench-file.h"
#include "ui-app.h"
#include "util-err.h"

#define UNDO_MAX 500

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
