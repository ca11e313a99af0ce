/* store-setup.c - a bench's numbered setups (the schema's revisions): what
 * a setup reference means, recording the draft as the next setup, the
 * history, names for setups, reinstating one as the draft, and where the
 * draft stands.  The records themselves are store-bench.c's. */
#include <config.h>

#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "store-impl.h"
#include "util-buf.h"
#include "util-err.h"

/* ---- setups by number or name ---- */

/* A setup number: "2" or "#2"; "r2" as well, the older spelling, which
 * callers that still use it (and old notes) may pass.  Numbers come before
 * names: a name that an older version let through as all digits ("3")
 * is shadowed by setup #3, which is what a reader of "3" means now. */
static int
is_rev_number(const char *rev, int *no)
{
	const char *p = rev;
	char *end;
	long v;

	if (*p == '#' || *p == 'r')
		p++;
	if (*p < '0' || *p > '9')
		return 0;
	v = strtol(p, &end, 10);
	if (*end != '\0')
		return 0;
	*no = v > 0 && v < 1000000000L ? (int)v : -1;
	return 1;
}

int
store_resolve(struct store *s, long long bench, const char *name, const char *rev, int *no,
    char **cause)
{
	sqlite3_stmt *q;
	int latest, rc;

	if (rev == NULL || strcmp(rev, "draft") == 0) {
		*no = 0;
		return 0;
	}
	if (store_rev_latest(s, bench, &latest, NULL, cause) != 0)
		return -1;
	if (is_rev_number(rev, no)) {
		if (*no < 1 || *no > latest) {
			if (latest == 0)
				return fail_with(cause, "bench '%s' has no setup '%s' (none "
				    "recorded yet)", name, rev);
			return fail_with(cause, "bench '%s' has no setup '%s' (#1 to #%d)", name,
			    rev, latest);
		}
		return 0;
	}
	if ((q = store_q(s, Q_LABEL_FIND, cause)) == NULL)
		return -1;
	sqlite3_bind_int64(q, 1, bench);
	store_bind_text(q, 2, rev);
	rc = sqlite3_step(q);
	if (rc == SQLITE_ROW)
		*no = sqlite3_column_int(q, 0);
	store_q_done(q);
	if (rc == SQLITE_ROW)
		return 0;
	if (rc != SQLITE_DONE)
		return store_fail(s, rc, cause, "finding a setup's name");
	return fail_with(cause, "bench '%s' has no setup named '%s' (a setup is its number, "
	    "like 2 or #2, a name given with mark, or draft)", name, rev);
}

int
store_resolve_rev(struct store *s, const char *name, const char *rev, int *rev_no,
    char **cause)
{
	long long id = store_bench_id(s, name, cause);

	if (id == 0)
		return -1;
	return store_resolve(s, id, name, rev, rev_no, cause);
}

int
store_draft_changed(struct store *s, const char *name, int *changed, char **cause)
{
	struct store_state d = { 0, NULL, NULL }, r = { 0, NULL, NULL };
	long long id = store_draft_get(s, name, &d, NULL, cause);
	int no = 0, rc = -1;

	if (id != 0 && store_rev_latest(s, id, &no, &r, cause) == 0) {
		*changed = no == 0 || !store_state_equal(&d, &r);
		rc = 0;
	}
	store_state_release(&d);
	store_state_release(&r);
	return rc;
}

int
store_commit(struct store *s, const char *name, const char *note, const char *author,
    int *rev_no, char **cause)
{
	struct store_state d = { 0, NULL, NULL }, r = { 0, NULL, NULL };
	char *now = NULL;
	long long id;
	int no = 0, rc = -1;

	if (!utf8_valid(note) || !utf8_valid(author))
		return fail_with(cause, "note or author: not valid UTF-8 text");
	if (store_tx_begin(s, cause) != 0)
		return -1;
	id = store_draft_get(s, name, &d, NULL, cause);
	if (id != 0 && store_rev_latest(s, id, &no, &r, cause) == 0) {
		if (no > 0 && store_state_equal(&d, &r)) {
			fail_with(cause, "bench '%s': nothing to record (draft = #%d)",
			    name, no);
		} else {
			now = store_now();
			rc = store_rev_insert(s, id, no + 1, now, author, note, &d, cause);
			if (rc == 0)
				rc = store_draft_set(s, id, &d, no + 1, now, cause);
		}
	}
	free(now);
	store_state_release(&d);
	store_state_release(&r);
	rc = store_tx_end(s, rc, cause);
	if (rc == 0 && rev_no != NULL)
		*rev_no = no + 1;
	return rc;
}

int
store_log(struct store *s, const char *name, struct store_rev **revs, size_t *n,
    char **cause)
{
	long long id = store_bench_id(s, name, cause);
	sqlite3_stmt *q;
	size_t cap = 0;
	int rc;

	*revs = NULL;
	*n = 0;
	if (id == 0 || (q = store_q(s, Q_REV_LOG, cause)) == NULL)
		return -1;
	sqlite3_bind_int64(q, 1, id);
	while ((rc = sqlite3_step(q)) == SQLITE_ROW) {
		struct store_rev *r;

		if (*n == cap) {
			cap = cap ? 2 * cap : 64;
			*revs = xreallocarray(*revs, cap, sizeof **revs);
		}
		r = &(*revs)[(*n)++];
		r->no = sqlite3_column_int(q, 0);
		r->time = store_col_text(q, 1);
		r->author = store_col_text(q, 2);
		r->note = store_col_text(q, 3);
		r->labels = store_col_text(q, 4);
	}
	store_q_done(q);
	if (rc != SQLITE_DONE) {
		store_revs_free(*revs, *n);
		*revs = NULL;
		*n = 0;
		return store_fail(s, rc, cause, "reading the history");
	}
	return 0;
}

void
store_revs_free(struct store_rev *revs, size_t n)
{
	for (size_t i = 0; i < n; i++) {
		free(revs[i].time);
		free(revs[i].author);
		free(revs[i].note);
		free(revs[i].labels);
	}
	free(revs);
}

int
store_label(struct store *s, const char *name, const char *rev, const char *label,
    char **cause)
{
	sqlite3_stmt *q;
	char *now;
	long long id;
	int no, other, rc;

	if (label == NULL || label[0] == '\0')
		return fail_with(cause, "a setup's name must not be empty");
	if (strcmp(label, "draft") == 0 || is_rev_number(label, &other))
		return fail_with(cause, "name '%s' would read as a setup number; choose "
		    "another name", label);
	if (!utf8_valid(label))
		return fail_with(cause, "a setup's name must be UTF-8 text");
	for (const char *p = label; *p != '\0'; p++)
		if (*p == '@' || (unsigned char)*p < 0x20 || *p == 0x7f)
			return fail_with(cause, "name '%s': '@' and control characters "
			    "are not allowed in a setup's name", label);
	if (store_tx_begin(s, cause) != 0)
		return -1;
	if ((id = store_bench_id(s, name, cause)) == 0 ||
	    store_resolve(s, id, name, rev, &no, cause) != 0)
		return store_tx_end(s, -1, cause);
	if (no == 0) {
		fail_with(cause, "bench '%s': a name marks a setup, not the draft; "
		    "record it first", name);
		return store_tx_end(s, -1, cause);
	}
	if ((q = store_q(s, Q_LABEL_FIND, cause)) == NULL)
		return store_tx_end(s, -1, cause);
	sqlite3_bind_int64(q, 1, id);
	store_bind_text(q, 2, label);
	rc = sqlite3_step(q);
	other = rc == SQLITE_ROW ? sqlite3_column_int(q, 0) : 0;
	store_q_done(q);
	if (rc == SQLITE_ROW) {
		if (other == no)
			return store_tx_end(s, 0, cause);
		fail_with(cause, "bench '%s': name '%s' already marks #%d", name, label, other);
		return store_tx_end(s, -1, cause);
	}
	if (rc != SQLITE_DONE) {
		store_fail(s, rc, cause, "finding a setup's name");
		return store_tx_end(s, -1, cause);
	}
	if ((q = store_q(s, Q_LABEL_INSERT, cause)) == NULL)
		return store_tx_end(s, -1, cause);
	now = store_now();
	sqlite3_bind_int64(q, 1, id);
	store_bind_text(q, 2, label);
	sqlite3_bind_int(q, 3, no);
	store_bind_text(q, 4, now);
	free(now);
	rc = store_step_done(s, q, cause, "storing a setup's name");
	return store_tx_end(s, rc, cause);
}

int
store_restore(struct store *s, const char *name, const char *rev, int force,
    char **cause)
{
	struct store_state d = { 0, NULL, NULL }, r = { 0, NULL, NULL }, b = { 0, NULL, NULL };
	char *now = NULL;
	long long id;
	int base = 0, no = 0, latest = 0, rc = -1;

	if (store_tx_begin(s, cause) != 0)
		return -1;
	id = store_draft_get(s, name, &d, &base, cause);
	if (id == 0 || store_resolve(s, id, name, rev, &no, cause) != 0)
		goto done;
	if (no == 0) {
		fail_with(cause, "bench '%s': reinstate takes a setup (its number or name), "
		    "not the draft", name);
		goto done;
	}
	if (!force) {
		int saved = 0;

		if (base > 0 && store_rev_get(s, id, base, &b, cause) > 0)
			saved = store_state_equal(&d, &b);
		store_state_release(&b);
		if (!saved && store_rev_latest(s, id, &latest, &b, cause) == 0)
			saved = latest > 0 && store_state_equal(&d, &b);
		if (!saved) {
			if (base > 0)
				fail_with(cause, "bench '%s': draft: changed since #%d, not "
				    "recorded; record it, or reinstate with --force to drop "
				    "the changes", name, base);
			else
				fail_with(cause, "bench '%s': draft: not recorded; record it, "
				    "or reinstate with --force to drop it", name);
			goto done;
		}
	}
	if (store_rev_get(s, id, no, &r, cause) <= 0) {
		fail_with(cause, "bench '%s': setup #%d is missing", name, no);
		goto done;
	}
	now = store_now();
	rc = store_draft_set(s, id, &r, no, now, cause);
	if (rc == 0)
		rc = store_gc_drafts(s, cause);
done:
	free(now);
	store_state_release(&d);
	store_state_release(&r);
	store_state_release(&b);
	return store_tx_end(s, rc, cause);
}

int
store_draft_status(struct store *s, const char *name, struct store_draft_status *ds,
    char **cause)
{
	struct store_state d = { 0, NULL, NULL }, r = { 0, NULL, NULL };
	int began = store_read_begin(s), rc = -1;
	long long id;

	memset(ds, 0, sizeof *ds);
	id = store_draft_get(s, name, &d, &ds->base, cause);
	if (id == 0 || store_rev_latest(s, id, &ds->latest, NULL, cause) != 0)
		goto done;
	if (ds->base > 0 && ds->base <= ds->latest) {
		if (store_rev_get(s, id, ds->base, &r, cause) < 0)
			goto done;
		if (r.layout != NULL && store_state_equal(&d, &r))
			ds->same_as = ds->base;
		store_state_release(&r);
	}
	if (ds->same_as == 0 && ds->latest > 0 && ds->latest != ds->base) {
		if (store_rev_get(s, id, ds->latest, &r, cause) < 0)
			goto done;
		if (r.layout != NULL && store_state_equal(&d, &r))
			ds->same_as = ds->latest;
	}
	rc = 0;
done:
	store_state_release(&d);
	store_state_release(&r);
	store_read_end(s, began);
	return rc;
}
