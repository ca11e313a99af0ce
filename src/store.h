/* store.h - the bench database: every bench, its draft and its append-only
 * revisions, and the parts shelf, in one SQLite file.
 *
 * The only layer that includes <sqlite3.h> is store-*.  Every function that
 * changes the file runs in one BEGIN IMMEDIATE transaction: it either
 * happens whole or not at all.  Errors return -1 (or NULL) with *cause set:
 * "bench 'x' not found", "database is busy (another beamledger is writing);
 * try again", ...
 *
 * A revision is immutable and self-contained: the element values (which
 * already carry whatever a part supplied when it was placed) are copied
 * into it, so changing a part later never changes an old revision.
 * REV strings: "draft", "rN" (N >= 1), or a label. */
#ifndef STORE_H
#define STORE_H

#include <stddef.h>

#include "core-model.h"

struct store;                                   /* opaque */

/* $XDG_DATA_HOME/beamledger/benches.db, or ~/.local/share/... when
 * XDG_DATA_HOME is unset, empty or relative. */
char         *store_default_path(void);        /* caller frees */
/* Opens (creating file and directories, mode 0700, when missing and
 * writable).  A file that is not a beamledger database, or is from a newer
 * schema, is refused and left untouched.  A read-only file opens read-only
 * (store_readonly() says so; writes then fail with a clear message). */
struct store *store_open(const char *path, char **cause);
void          store_close(struct store *);      /* NULL ok */
int           store_readonly(const struct store *);
const char   *store_path(const struct store *); /* borrowed */

struct store_bench_row {
	char *name;                 /* owned */
	int   latest_rev;           /* 0: none yet */
	int   draft_changed;        /* draft differs from the latest revision */
	char *updated;              /* owned, UTC "YYYY-MM-DD HH:MM:SS" */
};
int   store_benches(struct store *, struct store_bench_row **rows, size_t *n, char **cause);
void  store_bench_rows_free(struct store_bench_row *, size_t n);

/* A new bench named bench->name with the draft and r1 set to `bench`
 * (note e.g. "imported from FILE"). Fails when the name is taken. */
int   store_bench_create(struct store *, const struct bench *, const char *note,
          const char *author, char **cause);
int   store_bench_delete(struct store *, const char *name, char **cause);
/* Loads a revision or the draft; *rev_no (may be NULL) gets N, or 0 for the draft. */
struct bench *store_bench_load(struct store *, const char *name, const char *rev,
          int *rev_no, char **cause);          /* caller frees */
/* Replaces the draft of bench `name` (the bench must be valid; its own
 * name field must equal `name`). */
int   store_draft_save(struct store *, const char *name, const struct bench *draft,
          char **cause);
int   store_draft_changed(struct store *, const char *name, int *changed, char **cause);
/* Draft -> revision N+1.  Refuses when the draft equals the latest revision
 * ("nothing to commit"). */
int   store_commit(struct store *, const char *name, const char *note,
          const char *author, int *rev_no, char **cause);

struct store_rev {
	int   no;
	char *time;                 /* owned, UTC "YYYY-MM-DD HH:MM:SS" */
	char *author;               /* owned */
	char *note;                 /* owned */
	char *labels;               /* owned, "aligned, before-upgrade" or "" */
};
int   store_log(struct store *, const char *name, struct store_rev **revs, size_t *n,
          char **cause);                       /* newest first */
void  store_revs_free(struct store_rev *, size_t n);
int   store_resolve_rev(struct store *, const char *name, const char *rev, int *rev_no,
          char **cause);                       /* "draft" gives 0 */
/* A label names one revision of a bench; it must not look like "rN" or
 * "draft", and is unique within the bench. */
int   store_label(struct store *, const char *name, const char *rev, const char *label,
          char **cause);
/* Revision -> draft.  Refuses to drop uncommitted draft changes unless force. */
int   store_restore(struct store *, const char *name, const char *rev, int force,
          char **cause);
/* A new bench from a revision (or the draft) of another. */
int   store_clone(struct store *, const char *name, const char *rev, const char *newname,
          const char *author, char **cause);

/* The parts shelf: named components (an element without id: type, values,
 * damage).  Putting a name that exists replaces the shelf entry only. */
int   store_part_put(struct store *, const char *name, const struct element *el,
          char **cause);
int   store_part_get(struct store *, const char *name, struct element *out,
          char **cause);                       /* out owned by the caller */
int   store_parts(struct store *, char ***names, size_t *n, char **cause); /* caller frees each and the array */

/* ---- added with the store (not in the first contract) ---- */

/* Loads the draft of `name`, lets fn change it, and saves it, in one write
 * transaction, so that no other writer slips in between.  fn returns 0 to
 * save (nothing is written when the bench did not change), or -1 with
 * *cause set to store nothing. */
typedef int (*store_edit_fn)(struct bench *, void *arg, char **cause);
int   store_draft_edit(struct store *, const char *name, store_edit_fn fn, void *arg,
          char **cause);
/* Several shelf entries at once, all or nothing. */
int   store_parts_put(struct store *, char *const *names, const struct element *els,
          size_t n, char **cause);
/* A parts file (format "beamledger-parts-1", see beamledger(1)) onto the
 * shelf, all or nothing; *n gets the number of parts. */
int   store_parts_import(struct store *, const char *path, size_t *n, char **cause);
/* The shelf parts a revision's (or the draft's) elements were placed from:
 * the version each had then and the shelf's version now (1, 2, ... per
 * name; current 0: no longer on the shelf).  Sorted by name. */
struct store_part_ref {
	char *name;                 /* owned */
	int   placed, current;
};
int   store_bench_parts(struct store *, const char *name, const char *rev,
          struct store_part_ref **refs, size_t *n, char **cause);
void  store_part_refs_free(struct store_part_ref *, size_t n);
/* PRAGMA integrity_check and foreign_key_check, then the store's own rules:
 * every layout names existing element records, revisions are numbered
 * 1..N, no record is left unused, every revision and draft loads and
 * validates.  *report gets one line per problem ("" when none; caller
 * frees).  Returns 0 clean, 1 problems found, -1 (with *cause) when the
 * check itself could not run. */
int   store_check(struct store *, char **report, char **cause);

#endif
