/* store-bench.c - benches, their drafts and the records of their setups
 * (store-setup.c names and reinstates setups; store-record.c writes and
 * reads the records).  A bench's content
 * is a head record plus a layout of element records (see store-db.c); the
 * draft and every revision point at records shared by content, so a commit
 * copies three small values and a one-value change stores one element. */
#include <config.h>

#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "bench-file.h"
#include "store-impl.h"
#include "util-buf.h"
#include "util-err.h"


void
store_state_release(struct store_state *st)
{
	free(st->layout);
	free(st->parts);
	st->layout = st->parts = NULL;
}

int
store_state_equal(const struct store_state *a, const struct store_state *b)
{
	return a->head == b->head && strcmp(a->layout, b->layout) == 0;
}

char *
store_col_text(sqlite3_stmt *st, int i)
{
	const unsigned char *t = sqlite3_column_text(st, i);

	return xstrdup(t != NULL ? (const char *)t : "");
}

/* ---- rows ---- */

long long
store_bench_id(struct store *s, const char *name, char **cause)
{
	sqlite3_stmt *st = store_q(s, Q_BENCH_ID, cause);
	long long id = 0;
	int rc;

	if (st == NULL)
		return 0;
	store_bind_text(st, 1, name);
	rc = sqlite3_step(st);
	if (rc == SQLITE_ROW)
		id = sqlite3_column_int64(st, 0);
	else if (rc == SQLITE_DONE)
		fail_with(cause, "bench '%s' not found", name);
	else
		store_fail(s, rc, cause, "finding a bench");
	store_q_done(st);
	return id;
}

/* The draft of a bench; *base (may be NULL) gets draft_base. */
long long
store_draft_get(struct store *s, const char *name, struct store_state *st, int *base,
    char **cause)
{
	sqlite3_stmt *q = store_q(s, Q_BENCH_DRAFT, cause);
	long long id = 0;
	int rc;

	if (q == NULL)
		return 0;
	store_bind_text(q, 1, name);
	rc = sqlite3_step(q);
	if (rc == SQLITE_ROW) {
		id = sqlite3_column_int64(q, 0);
		st->head = sqlite3_column_int64(q, 1);
		st->layout = store_col_text(q, 2);
		st->parts = store_col_text(q, 3);
		if (base != NULL)
			*base = sqlite3_column_int(q, 4);
	} else if (rc == SQLITE_DONE) {
		fail_with(cause, "bench '%s' not found", name);
	} else {
		store_fail(s, rc, cause, "reading a draft");
	}
	store_q_done(q);
	return id;
}

/* Revision no of bench id; 1 found, 0 missing, -1 error. */
int
store_rev_get(struct store *s, long long bench, int no, struct store_state *st,
    char **cause)
{
	sqlite3_stmt *q = store_q(s, Q_REV_GET, cause);
	int rc;

	if (q == NULL)
		return -1;
	sqlite3_bind_int64(q, 1, bench);
	sqlite3_bind_int(q, 2, no);
	rc = sqlite3_step(q);
	if (rc == SQLITE_ROW) {
		st->head = sqlite3_column_int64(q, 0);
		st->layout = store_col_text(q, 1);
		st->parts = store_col_text(q, 2);
		store_q_done(q);
		return 1;
	}
	store_q_done(q);
	if (rc == SQLITE_DONE)
		return 0;
	return store_fail(s, rc, cause, "reading a setup");
}

/* Latest revision number (0: none) and, when st is not NULL, its state. */
int
store_rev_latest(struct store *s, long long bench, int *no, struct store_state *st,
    char **cause)
{
	sqlite3_stmt *q = store_q(s, Q_REV_LATEST, cause);
	int rc;

	if (q == NULL)
		return -1;
	sqlite3_bind_int64(q, 1, bench);
	rc = sqlite3_step(q);
	*no = 0;
	if (rc == SQLITE_ROW) {
		*no = sqlite3_column_int(q, 0);
		if (st != NULL) {
			st->head = sqlite3_column_int64(q, 1);
			st->layout = store_col_text(q, 2);
			st->parts = xstrdup("");
		}
	}
	store_q_done(q);
	if (rc != SQLITE_ROW && rc != SQLITE_DONE)
		return store_fail(s, rc, cause, "reading setups");
	return 0;
}

static int
pin(struct store *s, const struct store_state *st, char **cause)
{
	sqlite3_stmt *q = store_q(s, Q_HEAD_PIN, cause);
	int rc;

	if (q == NULL)
		return -1;
	sqlite3_bind_int64(q, 1, st->head);
	rc = sqlite3_step(q);
	store_q_done(q);
	if (rc != SQLITE_DONE)
		return store_fail(s, rc, cause, "marking a record");
	if ((q = store_q(s, Q_EL_PIN, cause)) == NULL)
		return -1;
	store_bind_text(q, 1, st->layout);
	rc = sqlite3_step(q);
	store_q_done(q);
	if (rc != SQLITE_DONE)
		return store_fail(s, rc, cause, "marking records");
	return 0;
}

int
store_step_done(struct store *s, sqlite3_stmt *q, char **cause, const char *what)
{
	int rc = sqlite3_step(q);

	store_q_done(q);
	if (rc == SQLITE_CONSTRAINT_UNIQUE || rc == SQLITE_CONSTRAINT_PRIMARYKEY)
		return fail_with(cause, "%s: already there", what);
	return rc == SQLITE_DONE ? 0 : store_fail(s, rc, cause, what);
}

int
store_rev_insert(struct store *s, long long bench, int no, const char *now, const char *author,
    const char *note, const struct store_state *st, char **cause)
{
	sqlite3_stmt *q = store_q(s, Q_REV_INSERT, cause);

	if (q == NULL)
		return -1;
	sqlite3_bind_int64(q, 1, bench);
	sqlite3_bind_int(q, 2, no);
	store_bind_text(q, 3, now);
	store_bind_text(q, 4, author != NULL && author[0] != '\0' ? author : "unknown");
	store_bind_text(q, 5, note != NULL ? note : "");
	sqlite3_bind_int64(q, 6, st->head);
	store_bind_text(q, 7, st->layout);
	store_bind_text(q, 8, st->parts);
	if (store_step_done(s, q, cause, "storing a setup") != 0)
		return -1;
	return pin(s, st, cause);
}

int
store_draft_set(struct store *s, long long bench, const struct store_state *st, int base,
    const char *now, char **cause)
{
	sqlite3_stmt *q = store_q(s, Q_BENCH_SET_DRAFT, cause);

	if (q == NULL)
		return -1;
	sqlite3_bind_int64(q, 1, bench);
	sqlite3_bind_int64(q, 2, st->head);
	store_bind_text(q, 3, st->layout);
	store_bind_text(q, 4, st->parts);
	sqlite3_bind_int(q, 5, base);
	store_bind_text(q, 6, now);
	return store_step_done(s, q, cause, "saving the draft");
}

int
store_gc_drafts(struct store *s, char **cause)
{
	sqlite3_stmt *q = store_q(s, Q_GC_ELEMENTS, cause);

	if (q == NULL || store_step_done(s, q, cause, "dropping unused records") != 0)
		return -1;
	if ((q = store_q(s, Q_GC_HEADS, cause)) == NULL)
		return -1;
	return store_step_done(s, q, cause, "dropping unused records");
}

int
store_gc_full(struct store *s, char **cause)
{
	if (store_exec(s, "UPDATE element SET pinned = 0 WHERE pinned = 1 AND id NOT IN "
	    "(SELECT j.value FROM revision r, json_tree(r.layout) j "
	    "WHERE j.type = 'integer')", cause) != 0 ||
	    store_exec(s, "UPDATE head SET pinned = 0 WHERE pinned = 1 AND id NOT IN "
	    "(SELECT head FROM revision)", cause) != 0)
		return -1;
	return store_gc_drafts(s, cause);
}

/* The state of bench `name` at rev; returns the bench id or 0. */
static long long
state_at(struct store *s, const char *name, const char *rev, int *no, struct store_state *st,
    int *base, char **cause)
{
	long long id = store_draft_get(s, name, st, base, cause);
	int n, rc;

	if (id == 0)
		return 0;
	if (store_resolve(s, id, name, rev, &n, cause) != 0) {
		store_state_release(st);
		return 0;
	}
	if (no != NULL)
		*no = n;
	if (n == 0)
		return id;
	store_state_release(st);
	rc = store_rev_get(s, id, n, st, cause);
	if (rc <= 0) {
		if (rc == 0)
			fail_with(cause, "bench '%s': setup #%d is missing", name, n);
		return 0;
	}
	return id;
}

/* ---- the API ---- */

int
store_benches(struct store *s, struct store_bench_row **rows, size_t *n, char **cause)
{
	sqlite3_stmt *q = store_q(s, Q_BENCH_LIST, cause);
	size_t cap = 0;
	int rc;

	*rows = NULL;
	*n = 0;
	if (q == NULL)
		return -1;
	while ((rc = sqlite3_step(q)) == SQLITE_ROW) {
		struct store_bench_row *r;

		if (*n == cap) {
			cap = cap ? 2 * cap : 8;
			*rows = xreallocarray(*rows, cap, sizeof **rows);
		}
		r = &(*rows)[(*n)++];
		r->name = store_col_text(q, 0);
		r->latest_rev = sqlite3_column_int(q, 1);
		r->draft_changed = sqlite3_column_int(q, 2) != 0;
		r->updated = store_col_text(q, 3);
	}
	store_q_done(q);
	if (rc != SQLITE_DONE) {
		store_bench_rows_free(*rows, *n);
		*rows = NULL;
		*n = 0;
		return store_fail(s, rc, cause, "listing benches");
	}
	return 0;
}

void
store_bench_rows_free(struct store_bench_row *rows, size_t n)
{
	for (size_t i = 0; i < n; i++) {
		free(rows[i].name);
		free(rows[i].updated);
	}
	free(rows);
}

static int name_free(struct store *, const char *name, char **cause);

/* A new bench row with the draft set to st, and setup #1 too unless note
 * is NULL (then the first record makes #1). */
static int
create_from_state(struct store *s, const char *name, struct store_state *st, const char *note,
    const char *author, char **cause)
{
	sqlite3_stmt *q;
	char *now = NULL;
	long long id;
	int rc = -1;

	/* '@' separates BENCH@SETUP: a name holding one would make a
	 * reference to another bench's setup ambiguous */
	if (name_free(s, name, cause) != 0)
		return -1;
	if ((note != NULL && !utf8_valid(note)) || (author != NULL && !utf8_valid(author)))
		return fail_with(cause, "note or author: not valid UTF-8 text");
	if ((q = store_q(s, Q_BENCH_INSERT, cause)) == NULL)
		return -1;
	now = store_now();
	store_bind_text(q, 1, name);
	store_bind_text(q, 2, now);
	sqlite3_bind_int64(q, 3, st->head);
	store_bind_text(q, 4, st->layout);
	store_bind_text(q, 5, st->parts);
	sqlite3_bind_int(q, 6, note != NULL ? 1 : 0);
	rc = store_step_done(s, q, cause, "creating a bench");
	id = sqlite3_last_insert_rowid(s->db);
	if (rc == 0 && note != NULL)
		rc = store_rev_insert(s, id, 1, now, author, note, st, cause);
	free(now);
	return rc;
}

int
store_bench_create(struct store *s, const struct bench *b, const char *note,
    const char *author, char **cause)
{
	struct store_state st = { 0, NULL, NULL };
	int rc;

	if (b->name == NULL || b->name[0] == '\0')
		return fail_with(cause, "a bench needs a name");
	if (store_bench_check(b, cause) != 0)
		return -1;
	if (store_tx_begin(s, cause) != 0)
		return -1;
	rc = store_state_of(s, b, &st, cause);
	if (rc == 0)
		st.parts = store_parts_snapshot(s, b, NULL, cause);
	if (rc == 0 && st.parts == NULL)
		rc = -1;
	if (rc == 0)
		rc = create_from_state(s, b->name, &st, note, author, cause);
	store_state_release(&st);
	return store_tx_end(s, rc, cause);
}

int
store_bench_delete(struct store *s, const char *name, char **cause)
{
	sqlite3_stmt *q;
	long long id;
	int rc = -1;

	if (store_tx_begin(s, cause) != 0)
		return -1;
	id = store_bench_id(s, name, cause);
	if (id != 0 && (q = store_q(s, Q_BENCH_DELETE, cause)) != NULL) {
		sqlite3_bind_int64(q, 1, id);
		rc = store_step_done(s, q, cause, "deleting a bench");
	}
	if (rc == 0)
		rc = store_gc_full(s, cause);
	return store_tx_end(s, rc, cause);
}

struct bench *
store_bench_load(struct store *s, const char *name, const char *rev, int *rev_no,
    char **cause)
{
	struct store_state st = { 0, NULL, NULL };
	struct bench *b = NULL;
	int began = store_read_begin(s);

	if (state_at(s, name, rev, rev_no, &st, NULL, cause) != 0)
		b = store_state_load(s, name, &st, cause);
	store_read_end(s, began);
	store_state_release(&st);
	return b;
}

int
store_draft_save(struct store *s, const char *name, const struct bench *draft,
    char **cause)
{
	struct store_state old = { 0, NULL, NULL }, st = { 0, NULL, NULL };
	char *now = NULL;
	long long id;
	int base = 0, rc = -1;

	if (draft->name == NULL || strcmp(draft->name, name) != 0)
		return fail_with(cause, "bench '%s': the draft is named '%s'; a bench "
		    "cannot be renamed", name, draft->name != NULL ? draft->name : "");
	if (store_bench_check(draft, cause) != 0)
		return -1;
	if (store_tx_begin(s, cause) != 0)
		return -1;
	id = store_draft_get(s, name, &old, &base, cause);
	if (id != 0 && store_state_of(s, draft, &st, cause) == 0 &&
	    (st.parts = store_parts_snapshot(s, draft, old.parts, cause)) != NULL) {
		if (store_state_equal(&st, &old) && strcmp(st.parts, old.parts) == 0) {
			rc = 0;
		} else {
			now = store_now();
			rc = store_draft_set(s, id, &st, base, now, cause);
			if (rc == 0)
				rc = store_gc_drafts(s, cause);
		}
	}
	free(now);
	store_state_release(&old);
	store_state_release(&st);
	return store_tx_end(s, rc, cause);
}

int
store_clone(struct store *s, const char *name, const char *rev, const char *newname,
    const char *author, char **cause)
{
	struct store_state st = { 0, NULL, NULL };
	char *note;
	int no = 0, rc = -1;

	if (store_tx_begin(s, cause) != 0)
		return -1;
	if (state_at(s, name, rev, &no, &st, NULL, cause) != 0) {
		note = no > 0 ? xasprintf("copied from %s@%d", name, no) :
		    xasprintf("copied from the draft of %s", name);
		rc = create_from_state(s, newname, &st, note, author, cause);
		free(note);
	}
	store_state_release(&st);
	return store_tx_end(s, rc, cause);
}

/* The rules of create_from_state for a name, and that it is free. */
static int
name_free(struct store *s, const char *name, char **cause)
{
	sqlite3_stmt *q;
	int rc;

	if (name == NULL || name[0] == '\0')
		return fail_with(cause, "a bench needs a name");
	if (strchr(name, '@') != NULL || !utf8_valid(name))
		return fail_with(cause, "bench name '%s': '@' and text that is not UTF-8 are "
		    "not allowed in a bench name", utf8_valid(name) ? name : "?");
	/* a name is typed as an operand: '-x' would read as an option, and a
	 * tab or line break would break the list's columns */
	if (name[0] == '-')
		return fail_with(cause, "bench name '%s': a name may not start with '-' (it "
		    "would read as an option on the command line)", name);
	for (const unsigned char *p = (const unsigned char *)name; *p != '\0'; p++)
		if (*p < 0x20 || *p == 0x7f)
			return fail_with(cause, "bench name: tabs, line breaks and other control "
			    "characters are not allowed in a bench name");
	if ((q = store_q(s, Q_BENCH_ID, cause)) == NULL)
		return -1;
	store_bind_text(q, 1, name);
	rc = sqlite3_step(q);
	store_q_done(q);
	if (rc == SQLITE_ROW)
		return fail_with(cause, "bench '%s' already exists", name);
	if (rc != SQLITE_DONE)
		return store_fail(s, rc, cause, "finding a bench");
	return 0;
}

int
store_bench_rename(struct store *s, const char *name, const char *newname, char **cause)
{
	sqlite3_stmt *q = NULL;
	long long id;
	int rc = -1;

	if (store_tx_begin(s, cause) != 0)
		return -1;
	if ((id = store_bench_id(s, name, cause)) == 0)
		goto done;
	if (strcmp(name, newname) == 0) {
		rc = 0;
		goto done;
	}
	if (name_free(s, newname, cause) != 0)
		goto done;
	/* the name lives in the bench row only (heads are stored without
	 * it), so every setup and the draft follow */
	rc = sqlite3_prepare_v2(s->db, "UPDATE bench SET name = ?1 WHERE id = ?2", -1, &q,
	    NULL);
	if (rc != SQLITE_OK) {
		rc = store_fail(s, rc, cause, "renaming a bench");
		goto done;
	}
	store_bind_text(q, 1, newname);
	sqlite3_bind_int64(q, 2, id);
	rc = sqlite3_step(q);
	rc = rc == SQLITE_DONE ? 0 : store_fail(s, rc, cause, "renaming a bench");
done:
	sqlite3_finalize(q);
	return store_tx_end(s, rc, cause);
}

int
store_draft_edit(struct store *s, const char *name, store_edit_fn fn, void *arg,
    char **cause)
{
	struct bench *b;
	int rc = -1;

	if (store_tx_begin(s, cause) != 0)
		return -1;
	b = store_bench_load(s, name, "draft", NULL, cause);
	if (b != NULL && fn(b, arg, cause) == 0) {
		char *newname = NULL;

		/* fn renamed the bench: the draft is saved under the old name,
		 * then the bench takes the new one, in the same transaction */
		if (b->name == NULL || strcmp(b->name, name) != 0) {
			newname = b->name;
			b->name = xstrdup(name);
		}
		rc = store_draft_save(s, name, b, cause);
		if (rc == 0 && newname != NULL)
			rc = store_bench_rename(s, name, newname, cause);
		free(newname);
	}
	model_bench_free(b);
	return store_tx_end(s, rc, cause);
}

static int
ref_cmp(const void *a, const void *b)
{
	return strcmp(((const struct store_part_ref *)a)->name,
	    ((const struct store_part_ref *)b)->name);
}

int
store_bench_parts(struct store *s, const char *name, const char *rev,
    struct store_part_ref **refs, size_t *n, char **cause)
{
	struct store_state st = { 0, NULL, NULL };
	sqlite3_stmt *q = NULL;
	json_t *map = NULL, *v;
	const char *pname;
	int rc = -1;

	*refs = NULL;
	*n = 0;
	if (state_at(s, name, rev, NULL, &st, NULL, cause) == 0)
		goto done;
	map = json_loads(st.parts, 0, NULL);
	if (!json_is_object(map)) {
		fail_with(cause, "bench '%s': its part snapshot is not a JSON object", name);
		goto done;
	}
	rc = sqlite3_prepare_v2(s->db, "SELECT (SELECT count(*) FROM part_version "
	    "WHERE name = ?1 AND id <= ?2), (SELECT count(*) FROM part_version "
	    "WHERE name = ?1 AND id <= (SELECT version FROM part WHERE name = ?1))",
	    -1, &q, NULL);
	if (rc != SQLITE_OK) {
		rc = store_fail(s, rc, cause, "reading part versions");
		goto done;
	}
	*refs = xcalloc(json_object_size(map) + 1, sizeof **refs);
	json_object_foreach(map, pname, v) {
		struct store_part_ref *r = &(*refs)[*n];

		sqlite3_reset(q);
		store_bind_text(q, 1, pname);
		sqlite3_bind_int64(q, 2, json_integer_value(v));
		rc = sqlite3_step(q);
		if (rc != SQLITE_ROW) {
			rc = store_fail(s, rc, cause, "reading part versions");
			goto done;
		}
		r->name = xstrdup(pname);
		r->placed = sqlite3_column_int(q, 0);
		r->current = sqlite3_column_int(q, 1);
		(*n)++;
	}
	qsort(*refs, *n, sizeof **refs, ref_cmp);
	rc = 0;
done:
	if (rc != 0) {
		store_part_refs_free(*refs, *n);
		*refs = NULL;
		*n = 0;
	}
	sqlite3_finalize(q);
	json_decref(map);
	store_state_release(&st);
	return rc;
}

void
store_part_refs_free(struct store_part_ref *refs, size_t n)
{
	for (size_t i = 0; i < n; i++)
		free(refs[i].name);
	free(refs);
}
