/* store-check.c - `beamledger check`: SQLite's own integrity and foreign-key
 * checks, then the rules the schema cannot state (layouts naming existing
 * records, revisions numbered without gaps, no unused records, every stored
 * bench loading and validating).  Read-only: it reports, it never repairs. */
#include <config.h>

#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "store-impl.h"
#include "util-buf.h"
#include "util-err.h"

/* Rows of a query, each as one problem line "<what>: col0 col1 ...". */
static int
problems(struct store *s, const char *sql, const char *what, struct buf *rep,
    int *found, char **cause)
{
	sqlite3_stmt *st = NULL;
	int rc = sqlite3_prepare_v2(s->db, sql, -1, &st, NULL);

	if (rc != SQLITE_OK) {
		store_fail(s, rc, cause, what);
		sqlite3_finalize(st);
		return -1;
	}
	while ((rc = sqlite3_step(st)) == SQLITE_ROW) {
		int n = sqlite3_column_count(st);

		if (n == 1 && sqlite3_column_type(st, 0) == SQLITE_TEXT &&
		    strcmp((const char *)sqlite3_column_text(st, 0), "ok") == 0)
			continue;               /* integrity_check's all-clear */
		buf_printf(rep, "%s:", what);
		for (int i = 0; i < n; i++) {
			const unsigned char *t = sqlite3_column_text(st, i);

			buf_printf(rep, " %s", t != NULL ? (const char *)t : "NULL");
		}
		buf_addc(rep, '\n');
		(*found)++;
	}
	sqlite3_finalize(st);
	if (rc != SQLITE_DONE) {
		/* A malformed layout stops json_tree: that is a finding too. */
		buf_printf(rep, "%s: %s\n", what, sqlite3_errmsg(s->db));
		(*found)++;
	}
	return 0;
}

static const struct {
	const char *what, *sql;
} rules[] = {
	{ "integrity_check", "PRAGMA integrity_check" },
	{ "foreign_key_check", "PRAGMA foreign_key_check" },
	{ "application_id is not 0x424d4c47", "SELECT application_id FROM "
	    "pragma_application_id WHERE application_id <> 0x424d4c47" },
	{ "setup layout names a missing element record (bench, setup, record)",
	  "SELECT r.bench, r.no, j.value FROM revision r, json_tree(r.layout) j "
	  "WHERE j.type = 'integer' AND j.value NOT IN (SELECT id FROM element)" },
	{ "draft layout names a missing element record (bench, record)",
	  "SELECT b.name, j.value FROM bench b, json_tree(b.draft_layout) j "
	  "WHERE j.type = 'integer' AND j.value NOT IN (SELECT id FROM element)" },
	{ "setups not numbered 1..N (bench, count, highest)",
	  "SELECT bench, count(*), max(no) FROM revision GROUP BY bench "
	  "HAVING count(*) <> max(no)" },
	/* a bench may have no setup yet: one made empty is recorded first as #1 */
	{ "draft based on a missing setup (bench, base)",
	  "SELECT name, draft_base FROM bench b WHERE draft_base < 0 OR draft_base > "
	  "coalesce((SELECT max(no) FROM revision r WHERE r.bench = b.id), 0)" },
	{ "element record used by a setup but not pinned",
	  "SELECT id FROM element WHERE pinned = 0 AND id IN (SELECT j.value FROM "
	  "revision r, json_tree(r.layout) j WHERE j.type = 'integer')" },
	{ "element record pinned but used by no setup",
	  "SELECT id FROM element WHERE pinned = 1 AND id NOT IN (SELECT j.value FROM "
	  "revision r, json_tree(r.layout) j WHERE j.type = 'integer')" },
	{ "element record used by nothing",
	  "SELECT id FROM element WHERE pinned = 0 AND id NOT IN (SELECT j.value FROM "
	  "bench b, json_tree(b.draft_layout) j WHERE j.type = 'integer')" },
	{ "head record used by a setup but not pinned",
	  "SELECT id FROM head WHERE pinned = 0 AND id IN (SELECT head FROM revision)" },
	{ "head record used by nothing", "SELECT id FROM head WHERE id NOT IN "
	  "(SELECT head FROM revision) AND id NOT IN (SELECT draft_head FROM bench)" },
	{ "part snapshot is not a JSON object (bench, setup)",
	  "SELECT bench, no FROM revision WHERE json_type(parts) IS NOT 'object' "
	  "UNION ALL SELECT name, 'draft' FROM bench WHERE json_type(draft_parts) "
	  "IS NOT 'object'" },
};

/* Every setup and draft must load and pass model_validate. */
static int
load_all(struct store *s, struct buf *rep, int *found, char **cause)
{
	sqlite3_stmt *st = NULL;
	int rc = sqlite3_prepare_v2(s->db, "SELECT b.name, r.no FROM revision r JOIN bench b "
	    "ON b.id = r.bench UNION ALL SELECT name, 0 FROM bench ORDER BY 1, 2", -1, &st, NULL);

	if (rc != SQLITE_OK) {
		sqlite3_finalize(st);
		return store_fail(s, rc, cause, "listing setups");
	}
	while ((rc = sqlite3_step(st)) == SQLITE_ROW) {
		char *name = xstrdup((const char *)sqlite3_column_text(st, 0)), rev[32];
		int no = sqlite3_column_int(st, 1);
		char *why = NULL;
		struct bench *b;

		if (no > 0)
			snprintf(rev, sizeof rev, "%d", no);
		else
			snprintf(rev, sizeof rev, "draft");
		b = store_bench_load(s, name, rev, NULL, &why);
		if (b == NULL) {
			buf_printf(rep, "bench '%s'@%s does not load: %s\n", name, rev,
			    why != NULL ? why : "?");
			(*found)++;
		}
		model_bench_free(b);
		free(why);
		free(name);
	}
	sqlite3_finalize(st);
	if (rc != SQLITE_DONE)
		return store_fail(s, rc, cause, "reading setups");
	return 0;
}

int
store_check(struct store *s, char **report, char **cause)
{
	struct buf rep;
	int found = 0, rc = 0;

	*report = NULL;
	buf_init(&rep);
	/* One read transaction: the checks see one state of the file. */
	if (store_exec(s, "BEGIN", cause) != 0) {
		buf_release(&rep);
		return -1;
	}
	for (size_t i = 0; i < sizeof rules / sizeof *rules && rc == 0; i++)
		rc = problems(s, rules[i].sql, rules[i].what, &rep, &found, cause);
	if (rc == 0)
		rc = load_all(s, &rep, &found, cause);
	sqlite3_exec(s->db, "COMMIT", NULL, NULL, NULL);
	if (rc != 0) {
		buf_release(&rep);
		return -1;
	}
	*report = buf_take(&rep);
	return found > 0;
}
