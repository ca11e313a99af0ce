/* store-impl.h - what the store-*.c files share and nobody else sees: the
 * connection, cached prepared statements, nested write transactions and
 * the mapping of SQLite errors to messages people can act on. */
#ifndef STORE_IMPL_H
#define STORE_IMPL_H

#include <jansson.h>
#include <sqlite3.h>

#include "store.h"

#define STORE_APP_ID        0x424d4c47      /* 'BMLG' */
#define STORE_BUSY_MS       5000

/* Every statement the store runs more than once; prepared on first use
 * and kept until store_close. */
enum store_q {
	Q_BENCH_ID, Q_BENCH_DRAFT, Q_BENCH_INSERT, Q_BENCH_SET_DRAFT, Q_BENCH_TOUCH,
	Q_BENCH_LIST, Q_BENCH_DELETE,
	Q_REV_LATEST, Q_REV_GET, Q_REV_INSERT, Q_REV_LOG, Q_REV_EXISTS,
	Q_HEAD_FIND, Q_HEAD_INSERT, Q_HEAD_GET, Q_HEAD_PIN,
	Q_EL_FIND, Q_EL_INSERT, Q_EL_GET, Q_EL_PIN,
	Q_GC_ELEMENTS, Q_GC_HEADS,
	Q_LABEL_FIND, Q_LABEL_INSERT,
	Q_PART_CURRENT, Q_PART_VFIND, Q_PART_VINSERT, Q_PART_SET, Q_PART_LIST,
	Q_PART_VGET,
	Q_COUNT
};

struct store {
	sqlite3      *db;
	char         *path;             /* owned */
	int           readonly;
	int           depth;            /* nesting of tx_begin */
	sqlite3_stmt *q[Q_COUNT];       /* owned, lazily prepared */
};

/* The statement for q, reset and with its bindings cleared; NULL with
 * *cause set when it cannot be prepared. */
sqlite3_stmt *store_q(struct store *, enum store_q, char **cause);
/* Resets a cached statement so that it holds no read lock. */
void          store_q_done(sqlite3_stmt *);
/* Fails with a message for the last error of the connection ("database is
 * busy ...", "... is read-only ...", "disk full", or SQLite's own text),
 * prefixed by what was being done.  Always returns -1. */
int           store_fail(struct store *, int rc, char **cause, const char *what);
int           store_exec(struct store *, const char *sql, char **cause);

/* Write transactions nest: only the outermost BEGIN IMMEDIATE / COMMIT
 * reaches SQLite.  tx_end(s, 0) commits, tx_end(s, -1) rolls back the whole
 * outermost transaction (an inner failure poisons it). */
int           store_tx_begin(struct store *, char **cause);
int           store_tx_end(struct store *, int rc, char **cause);
/* One snapshot for a multi-statement read: returns whether it began a
 * transaction, which store_read_end then ends. */
int           store_read_begin(struct store *);
void          store_read_end(struct store *, int began);

/* Binds text (NULL binds NULL). */
int           store_bind_text(sqlite3_stmt *, int i, const char *);
/* Current UTC time "YYYY-MM-DD HH:MM:SS" (caller frees). */
char         *store_now(void);

/* Canonical compact JSON of a jansson value (caller frees). */
char         *store_json_text(const json_t *);

/* Full garbage collection (after a bench is dropped): pinned flags are
 * recomputed from the revisions and unreferenced records deleted. */
int           store_gc_full(struct store *, char **cause);
int           store_gc_drafts(struct store *, char **cause);

/* The bench row id for a name; 0 with *cause "bench 'x' not found". */
long long     store_bench_id(struct store *, const char *name, char **cause);

/* ---- what store-bench.c and store-setup.c share ---- */

/* One stored state: the head record, the layout text and the parts map. */
struct store_state {
	long long head;
	char     *layout;           /* owned */
	char     *parts;            /* owned */
};
void          store_state_release(struct store_state *);
int           store_state_equal(const struct store_state *, const struct store_state *);
/* The records of a bench (store-record.c): stores them and fills
 * st->head and st->layout; the bench back from a state (caller frees;
 * NULL with *cause); and the check of what is about to be stored, values
 * set in place included. */
int           store_state_of(struct store *, const struct bench *, struct store_state *st,
                  char **cause);
struct bench *store_state_load(struct store *, const char *name,
                  const struct store_state *st, char **cause);
int           store_bench_check(const struct bench *, char **cause);
/* Column i as an allocated string ("" for NULL; caller frees). */
char         *store_col_text(sqlite3_stmt *, int i);
/* Steps q once and resets it: 0 when done, -1 with *cause (what failed). */
int           store_step_done(struct store *, sqlite3_stmt *q, char **cause, const char *what);
/* The draft of a bench into st; *base (may be NULL) gets draft_base.
 * Returns the bench id, 0 with *cause. */
long long     store_draft_get(struct store *, const char *name, struct store_state *st,
                  int *base, char **cause);
/* Setup `no` of a bench: 1 found, 0 missing, -1 error. */
int           store_rev_get(struct store *, long long bench, int no, struct store_state *st,
                  char **cause);
/* The latest setup number (0: none) and, st not NULL, its state. */
int           store_rev_latest(struct store *, long long bench, int *no,
                  struct store_state *st, char **cause);
int           store_rev_insert(struct store *, long long bench, int no, const char *now,
                  const char *author, const char *note, const struct store_state *st,
                  char **cause);
int           store_draft_set(struct store *, long long bench, const struct store_state *st,
                  int base, const char *now, char **cause);
/* A setup reference of bench `bench` (named name, for messages) to its
 * number; "draft" and NULL give 0. */
int           store_resolve(struct store *, long long bench, const char *name,
                  const char *rev, int *no, char **cause);

/* Part-shelf snapshot for a draft: {"name": version, ...} (caller frees);
 * names already in old_parts keep their version. */
char         *store_parts_snapshot(struct store *, const struct bench *,
                  const char *old_parts, char **cause);

#endif
