/* store.h - the bench database: every bench, its draft and its append-only
 * numbered setups, and the parts shelf, in one SQLite file.  (The schema
 * and the C names say "revision" for a setup, and "label" for its name.)
 *
 * The only layer that includes <sqlite3.h> is store-*.  Every function that
 * changes the file runs in one BEGIN IMMEDIATE transaction: it either
 * happens whole or not at all.  Errors return -1 (or NULL) with *cause set:
 * "bench 'x' not found", "database is busy (another beamledger is writing);
 * try again", ...
 *
 * A setup is immutable and self-contained: the element values (which
 * already carry whatever a part supplied when it was placed) are copied
 * into it, so changing a part later never changes an old setup.
 * REV strings: "draft", "N" or "#N" (N >= 1), or a name given by
 * store_label.  The older spelling "rN" still reads as N here, for callers
 * not yet moved; the command line refuses it. */
#ifndef STORE_H
#define STORE_H

#include <stddef.h>

#include "core-model.h"

struct store;                                   /* opaque */

/* $XDG_DATA_HOME/beamledger/benches.db, or ~/.local/share/... when
 * XDG_DATA_HOME is unset, empty or relative. */
char         *store_default_path(void);        /* caller frees */
/* Who records a setup: given (--author) when not empty, else $USER, else
 * the login name of the real user id in the password database, else
 * "unknown". */
char         *store_author(const char *given);  /* caller frees */
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
	int   draft_changed;        /* draft differs from the latest setup (or none) */
	char *updated;              /* owned, UTC "YYYY-MM-DD HH:MM:SS" */
};
int   store_benches(struct store *, struct store_bench_row **rows, size_t *n, char **cause);
void  store_bench_rows_free(struct store_bench_row *, size_t n);

/* A new bench named bench->name with the draft and setup #1 set to
 * `bench` (note e.g. "imported from FILE").  With note NULL only the draft
 * is made, and the bench's first store_commit records #1 (a bench started
 * empty records nothing empty).  Fails when the name is taken. */
int   store_bench_create(struct store *, const struct bench *, const char *note,
          const char *author, char **cause);
int   store_bench_delete(struct store *, const char *name, char **cause);
/* Loads a setup or the draft; *rev_no (may be NULL) gets N, or 0 for the draft. */
struct bench *store_bench_load(struct store *, const char *name, const char *rev,
          int *rev_no, char **cause);          /* caller frees */
/* Replaces the draft of bench `name` (the bench must be valid; its own
 * name field must equal `name`). */
int   store_draft_save(struct store *, const char *name, const struct bench *draft,
          char **cause);
int   store_draft_changed(struct store *, const char *name, int *changed, char **cause);
/* Draft -> setup N+1 ("record").  Refuses when the draft equals the latest
 * setup ("nothing to record"). */
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
/* Where the draft stands: the latest setup, the setup it was last recorded
 * as or reinstated from (base), and the setup it equals now (same_as: base
 * or the latest; 0 when it equals none: "changed since #base"). */
struct store_draft_status {
	int latest, base, same_as;  /* 0: none */
};
int   store_draft_status(struct store *, const char *name, struct store_draft_status *,
          char **cause);
int   store_resolve_rev(struct store *, const char *name, const char *rev, int *rev_no,
          char **cause);                       /* "draft" gives 0 */
/* A name ("mark") for one setup of a bench; it must not look like a setup
 * number or "draft", and is unique within the bench. */
int   store_label(struct store *, const char *name, const char *rev, const char *label,
          char **cause);
/* Setup -> draft ("reinstate").  Refuses to drop draft changes no setup
 * holds unless force. */
int   store_restore(struct store *, const char *name, const char *rev, int force,
          char **cause);
/* A new bench from a setup (or the draft) of another ("copy"). */
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
 * *cause set to store nothing.  When fn changes the bench's name the bench
 * is renamed too (store_bench_rename), in the same transaction. */
typedef int (*store_edit_fn)(struct bench *, void *arg, char **cause);
int   store_draft_edit(struct store *, const char *name, store_edit_fn fn, void *arg,
          char **cause);
/* A new name for a bench, its draft and every setup (the name belongs to
 * the bench, not to a setup).  The rules of a new bench's name apply; the
 * same name again changes nothing. */
int   store_bench_rename(struct store *, const char *name, const char *newname,
          char **cause);
/* Several shelf entries at once, all or nothing. */
int   store_parts_put(struct store *, char *const *names, const struct element *els,
          size_t n, char **cause);
/* A parts file (format "beamledger-parts-1", see beamledger(1)) onto the
 * shelf, all or nothing; *n gets the number of parts. */
int   store_parts_import(struct store *, const char *path, size_t *n, char **cause);
/* The shelf parts a setup's (or the draft's) elements were placed from:
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
 * every layout names existing element records, setups are numbered
 * 1..N, no record is left unused, every setup and draft loads and
 * validates.  *report gets one line per problem ("" when none; caller
 * frees).  Returns 0 clean, 1 problems found, -1 (with *cause) when the
 * check itself could not run. */
int   store_check(struct store *, char **report, char **cause);

#endif
