/* check_store.c - the bench database: every test opens a fresh file in a
 * temporary directory and runs the store's own check (integrity, foreign
 * keys, layouts, no unused records, everything loads) after each change. */
#include <config.h>

#include <check.h>
#include <errno.h>
#include <fcntl.h>
#include <pwd.h>
#include <math.h>
#include <sqlite3.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

#include "bench-demo.h"
#include "bench-file.h"
#include "core-edit.h"
#include "store.h"
#include "util-err.h"

#include "check-util.h"

static char dir[64];
static char path[128];
static struct store *st;

static void
rm_db(const char *p)
{
	char side[300];

	unlink(p);
	snprintf(side, sizeof side, "%s-wal", p);
	unlink(side);
	snprintf(side, sizeof side, "%s-shm", p);
	unlink(side);
}

static void
setup(void)
{
	char *cause = NULL;

	snprintf(dir, sizeof dir, "/tmp/check_store.XXXXXX");
	ck_assert_ptr_nonnull(mkdtemp(dir));
	snprintf(path, sizeof path, "%s/t.db", dir);
	st = store_open(path, &cause);
	ck_assert_msg(st != NULL, "open: %s", cause);
}

static void
teardown(void)
{
	char cmd[160];

	store_close(st);
	st = NULL;
	rm_db(path);
	snprintf(cmd, sizeof cmd, "rm -rf '%s'", dir);
	if (system(cmd) != 0)
		fprintf(stderr, "could not remove %s\n", dir);
}

/* The store's own check finds nothing. */
static void
invariants(void)
{
	char *report = NULL, *cause = NULL;
	int rc = store_check(st, &report, &cause);

	ck_assert_msg(rc == 0, "store check: %s", rc < 0 ? cause : report);
	free(report);
}

static struct bench *
demo(const char *name)
{
	char *cause = NULL;
	struct bench *b = bench_file_parse(bench_demo_text, strlen(bench_demo_text), "demo",
	    &cause);

	ck_assert_msg(b != NULL, "%s", cause);
	if (name != NULL) {
		free(b->name);
		b->name = xstrdup(name);
	}
	return b;
}

static void
assert_same(const struct bench *a, const struct bench *b)
{
	char *ta = bench_file_dump(a), *tb = bench_file_dump(b);

	ck_assert_str_eq(ta, tb);
	free(ta);
	free(tb);
}

static long long
count_rows(const char *table)
{
	sqlite3 *db;
	sqlite3_stmt *q;
	char sql[96];
	long long n = -1;

	snprintf(sql, sizeof sql, "SELECT count(*) FROM %s", table);
	ck_assert_int_eq(sqlite3_open_v2(path, &db, SQLITE_OPEN_READONLY, NULL), SQLITE_OK);
	ck_assert_int_eq(sqlite3_prepare_v2(db, sql, -1, &q, NULL), SQLITE_OK);
	if (sqlite3_step(q) == SQLITE_ROW)
		n = sqlite3_column_int64(q, 0);
	sqlite3_finalize(q);
	sqlite3_close(db);
	return n;
}

static void
create_demo(const char *name)
{
	struct bench *b = demo(name);
	char *cause = NULL;

	ck_assert_msg(store_bench_create(st, b, "imported from demo", "tester", &cause) == 0,
	    "%s", cause);
	model_bench_free(b);
	invariants();
}

static void
set_draft(const char *name, const char *id, const char *key, const char *val)
{
	char *cause = NULL;
	struct bench *b = store_bench_load(st, name, "draft", NULL, &cause);

	ck_assert_msg(b != NULL, "%s", cause);
	ck_assert_msg(edit_set(b, id, key, val, &cause) == 0, "%s", cause);
	ck_assert_msg(store_draft_save(st, name, b, &cause) == 0, "%s", cause);
	model_bench_free(b);
	invariants();
}

/* ---- opening ---- */

START_TEST(test_open_schema)
{
	sqlite3 *db;
	sqlite3_stmt *q;

	ck_assert_int_eq(store_readonly(st), 0);
	ck_assert_str_eq(store_path(st), path);
	ck_assert_int_eq(sqlite3_open_v2(path, &db, SQLITE_OPEN_READONLY, NULL), SQLITE_OK);
	ck_assert_int_eq(sqlite3_prepare_v2(db, "SELECT application_id, user_version, "
	    "journal_mode FROM pragma_application_id, pragma_user_version, "
	    "pragma_journal_mode", -1, &q, NULL), SQLITE_OK);
	ck_assert_int_eq(sqlite3_step(q), SQLITE_ROW);
	ck_assert_int_eq(sqlite3_column_int(q, 0), 0x424d4c47);
	ck_assert_int_eq(sqlite3_column_int(q, 1), 1);
	ck_assert_str_eq((const char *)sqlite3_column_text(q, 2), "wal");
	sqlite3_finalize(q);
	/* Every table is STRICT. */
	ck_assert_int_eq(sqlite3_prepare_v2(db, "SELECT count(*) FROM pragma_table_list "
	    "WHERE schema = 'main' AND name NOT LIKE 'sqlite_%' AND strict = 0", -1, &q,
	    NULL), SQLITE_OK);
	ck_assert_int_eq(sqlite3_step(q), SQLITE_ROW);
	ck_assert_int_eq(sqlite3_column_int(q, 0), 0);
	sqlite3_finalize(q);
	sqlite3_close(db);
	invariants();
	/* Reopening a current file migrates nothing. */
	store_close(st);
	st = store_open(path, NULL);
	ck_assert_ptr_nonnull(st);
	invariants();
}
END_TEST

static void
write_file(const char *p, const void *data, size_t n)
{
	FILE *f = fopen(p, "wb");

	ck_assert_ptr_nonnull(f);
	ck_assert_uint_eq(fwrite(data, 1, n, f), n);
	fclose(f);
}

static char *
read_file(const char *p, size_t *n)
{
	char *cause = NULL, *t = bench_slurp(p, n, &cause);

	ck_assert_msg(t != NULL, "%s", cause);
	return t;
}

static int
exists(const char *p)
{
	struct stat sb;

	return stat(p, &sb) == 0;
}

START_TEST(test_refuse_not_database)
{
	static const char junk[] = "{\"format\": \"beamledger-bench-1\"}\nnot a database\n";
	char p[160], side[170], *cause = NULL, *after;
	struct store *s2;
	size_t n;

	snprintf(p, sizeof p, "%s/junk.db", dir);
	write_file(p, junk, sizeof junk - 1);
	s2 = store_open(p, &cause);
	ck_assert_ptr_null(s2);
	ck_assert_ptr_nonnull(strstr(cause, "not a beamledger database"));
	ck_assert_ptr_nonnull(strstr(cause, p));
	free(cause);
	after = read_file(p, &n);
	ck_assert_uint_eq(n, sizeof junk - 1);
	ck_assert_int_eq(memcmp(after, junk, n), 0);
	free(after);
	snprintf(side, sizeof side, "%s-wal", p);
	ck_assert(!exists(side));
	snprintf(side, sizeof side, "%s-journal", p);
	ck_assert(!exists(side));
}
END_TEST

/* Makes an SQLite file by hand with the given ids and a table. */
static void
make_sqlite(const char *p, int app_id, int version)
{
	sqlite3 *db;
	char sql[160];

	ck_assert_int_eq(sqlite3_open(p, &db), SQLITE_OK);
	snprintf(sql, sizeof sql, "PRAGMA application_id = %d; PRAGMA user_version = %d; "
	    "CREATE TABLE t (x);", app_id, version);
	ck_assert_int_eq(sqlite3_exec(db, sql, NULL, NULL, NULL), SQLITE_OK);
	sqlite3_close(db);
}

static const struct {
	int         app_id, version;
	const char *msg;
} foreign_cases[] = {
	{ 0x424d4c47, 99, "newer than this beamledger" },
	{ 0x12345678, 1, "belongs to another program" },
	{ 0, 0, "another program" },
};

START_TEST(test_refuse_foreign)
{
	char p[160], *cause = NULL, *before, *after;
	size_t nb, na;

	snprintf(p, sizeof p, "%s/other.db", dir);
	make_sqlite(p, foreign_cases[_i].app_id, foreign_cases[_i].version);
	before = read_file(p, &nb);
	ck_assert_ptr_null(store_open(p, &cause));
	ck_assert_msg(strstr(cause, foreign_cases[_i].msg) != NULL, "%s", cause);
	ck_assert_ptr_nonnull(strstr(cause, "left untouched"));
	free(cause);
	after = read_file(p, &na);
	ck_assert_uint_eq(na, nb);
	ck_assert_int_eq(memcmp(before, after, na), 0);
	free(before);
	free(after);
	rm_db(p);
}
END_TEST

START_TEST(test_empty_file_initialised)
{
	char p[160], *cause = NULL;
	struct store *s2;

	snprintf(p, sizeof p, "%s/empty.db", dir);
	write_file(p, "", 0);
	s2 = store_open(p, &cause);
	ck_assert_msg(s2 != NULL, "%s", cause);
	store_close(s2);
	rm_db(p);
}
END_TEST

START_TEST(test_readonly)
{
	char *cause = NULL;
	struct bench *b;
	int no = -1;

	create_demo("ro");
	store_close(st);
	ck_assert_int_eq(chmod(path, 0444), 0);
	st = store_open(path, &cause);
	ck_assert_msg(st != NULL, "%s", cause);
	ck_assert_int_eq(store_readonly(st), 1);
	b = store_bench_load(st, "ro", "1", &no, &cause);
	ck_assert_msg(b != NULL, "%s", cause);
	ck_assert_int_eq(no, 1);
	ck_assert_int_eq(store_commit(st, "ro", "x", "me", NULL, &cause), -1);
	ck_assert_ptr_nonnull(strstr(cause, "read-only"));
	free(cause);
	cause = NULL;
	ck_assert_int_eq(store_draft_save(st, "ro", b, &cause), -1);
	ck_assert_ptr_nonnull(strstr(cause, "read-only"));
	free(cause);
	model_bench_free(b);
	invariants();
	chmod(path, 0644);
}
END_TEST

START_TEST(test_default_path)
{
	char *p;
	const char *home = getenv("HOME");
	char *saved_home = home != NULL ? xstrdup(home) : NULL;
	char *saved_x = getenv("XDG_DATA_HOME") != NULL ? xstrdup(getenv("XDG_DATA_HOME")) : NULL;

	setenv("HOME", "/home/somebody", 1);
	setenv("XDG_DATA_HOME", "/data/x", 1);
	p = store_default_path();
	ck_assert_str_eq(p, "/data/x/beamledger/benches.db");
	free(p);
	setenv("XDG_DATA_HOME", "", 1);
	p = store_default_path();
	ck_assert_str_eq(p, "/home/somebody/.local/share/beamledger/benches.db");
	free(p);
	setenv("XDG_DATA_HOME", "relative/dir", 1);
	p = store_default_path();
	ck_assert_str_eq(p, "/home/somebody/.local/share/beamledger/benches.db");
	free(p);
	unsetenv("XDG_DATA_HOME");
	p = store_default_path();
	ck_assert_str_eq(p, "/home/somebody/.local/share/beamledger/benches.db");
	free(p);
	if (saved_home != NULL)
		setenv("HOME", saved_home, 1);
	if (saved_x != NULL)
		setenv("XDG_DATA_HOME", saved_x, 1);
	free(saved_home);
	free(saved_x);
}
END_TEST

START_TEST(test_creates_directories)
{
	char p[200], *cause = NULL;
	struct store *s2;
	struct stat sb;

	snprintf(p, sizeof p, "%s/a/b/c.db", dir);
	s2 = store_open(p, &cause);
	ck_assert_msg(s2 != NULL, "%s", cause);
	store_close(s2);
	snprintf(p, sizeof p, "%s/a/b", dir);
	ck_assert_int_eq(stat(p, &sb), 0);
	ck_assert_int_eq(sb.st_mode & 0777, 0700);
	snprintf(p, sizeof p, "%s/a/b/c.db", dir);
	rm_db(p);
}
END_TEST

/* ---- benches and revisions ---- */

START_TEST(test_create_load_roundtrip)
{
	struct bench *b = demo(NULL), *r1, *d;
	char *cause = NULL;
	int no = -1;

	ck_assert_int_eq(store_bench_create(st, b, "imported", "tester", &cause), 0);
	invariants();
	r1 = store_bench_load(st, b->name, "1", &no, &cause);
	ck_assert_msg(r1 != NULL, "%s", cause);
	ck_assert_int_eq(no, 1);
	assert_same(b, r1);
	d = store_bench_load(st, b->name, "draft", &no, &cause);
	ck_assert_ptr_nonnull(d);
	ck_assert_int_eq(no, 0);
	assert_same(b, d);
	ck_assert_int_eq(store_bench_create(st, b, "again", "tester", &cause), -1);
	ck_assert_ptr_nonnull(strstr(cause, "already exists"));
	free(cause);
	model_bench_free(b);
	model_bench_free(r1);
	model_bench_free(d);
	invariants();
}
END_TEST

START_TEST(test_commit_log)
{
	struct store_rev *revs;
	struct store_bench_row *rows;
	char *cause = NULL;
	size_t n;
	int changed = -1, no = 0;

	create_demo("line");
	ck_assert_int_eq(store_draft_changed(st, "line", &changed, NULL), 0);
	ck_assert_int_eq(changed, 0);
	ck_assert_int_eq(store_commit(st, "line", "same", "me", &no, &cause), -1);
	ck_assert_ptr_nonnull(strstr(cause, "nothing to record (draft = #1)"));
	free(cause);
	cause = NULL;
	set_draft("line", "L1", "focal", "150 mm");
	ck_assert_int_eq(store_draft_changed(st, "line", &changed, NULL), 0);
	ck_assert_int_eq(changed, 1);
	ck_assert_int_eq(store_benches(st, &rows, &n, NULL), 0);
	ck_assert_uint_eq(n, 1);
	ck_assert_str_eq(rows[0].name, "line");
	ck_assert_int_eq(rows[0].latest_rev, 1);
	ck_assert_int_eq(rows[0].draft_changed, 1);
	ck_assert_uint_eq(strlen(rows[0].updated), 19);
	store_bench_rows_free(rows, n);
	ck_assert_msg(store_commit(st, "line", "shorter focus", "ana", &no, &cause) == 0, "%s",
	    cause);
	ck_assert_int_eq(no, 2);
	invariants();
	ck_assert_int_eq(store_draft_changed(st, "line", &changed, NULL), 0);
	ck_assert_int_eq(changed, 0);
	ck_assert_int_eq(store_log(st, "line", &revs, &n, NULL), 0);
	ck_assert_uint_eq(n, 2);
	ck_assert_int_eq(revs[0].no, 2);
	ck_assert_str_eq(revs[0].note, "shorter focus");
	ck_assert_str_eq(revs[0].author, "ana");
	ck_assert_str_eq(revs[0].labels, "");
	ck_assert_int_eq(revs[1].no, 1);
	ck_assert_str_eq(revs[1].author, "tester");
	store_revs_free(revs, n);
	ck_assert_int_eq(store_log(st, "nope", &revs, &n, &cause), -1);
	ck_assert_str_eq(cause, "bench 'nope' not found");
	free(cause);
}
END_TEST

START_TEST(test_revisions_immutable)
{
	struct bench *r1a, *r1b;
	char *cause = NULL;

	create_demo("imm");
	r1a = store_bench_load(st, "imm", "1", NULL, &cause);
	ck_assert_ptr_nonnull(r1a);
	set_draft("imm", "M1", "rs", "0.9");
	ck_assert_int_eq(store_commit(st, "imm", "worse mirror", "me", NULL, NULL), 0);
	set_draft("imm", "L1", "focal", "100 mm");
	set_draft("imm", "L1", "focal", "120 mm");
	r1b = store_bench_load(st, "imm", "1", NULL, &cause);
	ck_assert_ptr_nonnull(r1b);
	assert_same(r1a, r1b);
	model_bench_free(r1a);
	model_bench_free(r1b);
	invariants();
}
END_TEST

START_TEST(test_one_value_one_record)
{
	long long before, after;

	create_demo("dedupe");
	before = count_rows("element");
	set_draft("dedupe", "L1", "focal", "150 mm");
	ck_assert_int_eq(store_commit(st, "dedupe", "one value", "me", NULL, NULL), 0);
	after = count_rows("element");
	ck_assert_int_eq(after, before + 1);
	/* Many draft saves leave no unused records behind. */
	for (int i = 0; i < 20; i++) {
		char v[32];

		snprintf(v, sizeof v, "%d mm", 100 + i);
		set_draft("dedupe", "L1", "focal", v);
	}
	ck_assert_int_eq(count_rows("element"), after + 1);
	ck_assert_int_eq(count_rows("head"), 1);
	/* A clone shares every record. */
	ck_assert_int_eq(store_clone(st, "dedupe", "2", "copy", "me", NULL), 0);
	ck_assert_int_eq(count_rows("element"), after + 1);
	invariants();
}
END_TEST

START_TEST(test_labels_resolve)
{
	char *cause = NULL;
	struct store_rev *revs;
	size_t n;
	int no = -1;

	create_demo("lab");
	set_draft("lab", "L1", "focal", "150 mm");
	ck_assert_int_eq(store_commit(st, "lab", "r2", "me", NULL, NULL), 0);
	ck_assert_msg(store_label(st, "lab", "1", "aligned", &cause) == 0, "%s", cause);
	ck_assert_int_eq(store_label(st, "lab", "1", "before-upgrade", NULL), 0);
	ck_assert_int_eq(store_label(st, "lab", "1", "aligned", NULL), 0);   /* again: fine */
	ck_assert_int_eq(store_label(st, "lab", "2", "aligned", &cause), -1);
	ck_assert_ptr_nonnull(strstr(cause, "name 'aligned' already marks #1"));
	free(cause);
	cause = NULL;
	/* a name that reads as a setup number, in any spelling, is refused */
	ck_assert_int_eq(store_label(st, "lab", "2", "r7", &cause), -1);
	free(cause);
	cause = NULL;
	ck_assert_int_eq(store_label(st, "lab", "2", "7", &cause), -1);
	ck_assert_ptr_nonnull(strstr(cause, "would read as a setup number"));
	free(cause);
	cause = NULL;
	ck_assert_int_eq(store_label(st, "lab", "2", "#7", &cause), -1);
	free(cause);
	cause = NULL;
	/* "7a" is not a number: a name like any other */
	ck_assert_int_eq(store_label(st, "lab", "2", "7a", NULL), 0);
	ck_assert_int_eq(store_label(st, "lab", "2", "draft", &cause), -1);
	free(cause);
	cause = NULL;
	ck_assert_int_eq(store_label(st, "lab", "draft", "x", &cause), -1);
	ck_assert_ptr_nonnull(strstr(cause, "not the draft"));
	free(cause);
	cause = NULL;
	ck_assert_int_eq(store_resolve_rev(st, "lab", "aligned", &no, NULL), 0);
	ck_assert_int_eq(no, 1);
	ck_assert_int_eq(store_resolve_rev(st, "lab", "draft", &no, NULL), 0);
	ck_assert_int_eq(no, 0);
	ck_assert_int_eq(store_resolve_rev(st, "lab", "2", &no, NULL), 0);
	ck_assert_int_eq(no, 2);
	no = -1;
	ck_assert_int_eq(store_resolve_rev(st, "lab", "#2", &no, NULL), 0);
	ck_assert_int_eq(no, 2);
	no = -1;
	ck_assert_int_eq(store_resolve_rev(st, "lab", "7a", &no, NULL), 0);
	ck_assert_int_eq(no, 2);
	/* the old spelling still reads at the API, for callers not yet moved */
	no = -1;
	ck_assert_int_eq(store_resolve_rev(st, "lab", "r2", &no, NULL), 0);
	ck_assert_int_eq(no, 2);
	ck_assert_int_eq(store_resolve_rev(st, "lab", "3", &no, &cause), -1);
	ck_assert_ptr_nonnull(strstr(cause, "no setup '3' (#1 to #2)"));
	free(cause);
	cause = NULL;
	ck_assert_int_eq(store_resolve_rev(st, "lab", "0", &no, &cause), -1);
	free(cause);
	cause = NULL;
	ck_assert_int_eq(store_resolve_rev(st, "lab", "nosuch", &no, &cause), -1);
	ck_assert_ptr_nonnull(strstr(cause, "no setup named 'nosuch'"));
	free(cause);
	ck_assert_int_eq(store_log(st, "lab", &revs, &n, NULL), 0);
	ck_assert_str_eq(revs[1].labels, "aligned, before-upgrade");
	ck_assert_str_eq(revs[0].labels, "7a");
	store_revs_free(revs, n);
	invariants();
}
END_TEST

START_TEST(test_restore)
{
	struct bench *r1, *d;
	char *cause = NULL;
	int changed;

	create_demo("res");
	set_draft("res", "L1", "focal", "150 mm");
	ck_assert_int_eq(store_commit(st, "res", "r2", "me", NULL, NULL), 0);
	ck_assert_int_eq(store_restore(st, "res", "1", 0, &cause), 0);   /* draft == r2 */
	invariants();
	r1 = store_bench_load(st, "res", "1", NULL, NULL);
	d = store_bench_load(st, "res", "draft", NULL, NULL);
	assert_same(r1, d);
	model_bench_free(d);
	ck_assert_int_eq(store_draft_changed(st, "res", &changed, NULL), 0);
	ck_assert_int_eq(changed, 1);          /* differs from r2, the latest */
	/* The restored draft is r1, unedited: another restore loses nothing. */
	ck_assert_int_eq(store_restore(st, "res", "2", 0, NULL), 0);
	set_draft("res", "M1", "rs", "0.5");
	ck_assert_int_eq(store_restore(st, "res", "1", 0, &cause), -1);
	ck_assert_ptr_nonnull(strstr(cause, "--force"));
	free(cause);
	cause = NULL;
	d = store_bench_load(st, "res", "draft", NULL, NULL);
	ck_assert_double_eq(d->path.el[6].val[K_RS], 0.5);      /* M1, untouched */
	model_bench_free(d);
	ck_assert_int_eq(store_restore(st, "res", "1", 1, &cause), 0);
	d = store_bench_load(st, "res", "draft", NULL, NULL);
	assert_same(r1, d);
	model_bench_free(d);
	model_bench_free(r1);
	ck_assert_int_eq(store_restore(st, "res", "draft", 1, &cause), -1);
	free(cause);
	invariants();
}
END_TEST

START_TEST(test_clone_delete)
{
	struct bench *a, *b;
	char *cause = NULL;
	struct store_rev *revs;
	size_t n;

	create_demo("orig");
	set_draft("orig", "L1", "focal", "150 mm");
	ck_assert_int_eq(store_commit(st, "orig", "r2", "me", NULL, NULL), 0);
	ck_assert_msg(store_clone(st, "orig", "1", "copy", "me", &cause) == 0, "%s", cause);
	ck_assert_int_eq(store_clone(st, "orig", "1", "copy", "me", &cause), -1);
	free(cause);
	cause = NULL;
	a = store_bench_load(st, "orig", "1", NULL, NULL);
	b = store_bench_load(st, "copy", "1", NULL, NULL);
	ck_assert_str_eq(b->name, "copy");
	free(b->name);
	b->name = xstrdup("orig");
	assert_same(a, b);
	model_bench_free(a);
	model_bench_free(b);
	ck_assert_int_eq(store_log(st, "copy", &revs, &n, NULL), 0);
	ck_assert_uint_eq(n, 1);
	ck_assert_str_eq(revs[0].note, "copied from orig@1");
	store_revs_free(revs, n);
	ck_assert_int_eq(store_label(st, "orig", "2", "aligned", NULL), 0);
	invariants();
	ck_assert_int_eq(store_bench_delete(st, "orig", NULL), 0);
	invariants();
	/* Foreign keys are on: the revisions and the label went with the bench. */
	ck_assert_int_eq(count_rows("revision"), 1);
	ck_assert_int_eq(count_rows("label"), 0);
	ck_assert_ptr_null(store_bench_load(st, "orig", "1", NULL, &cause));
	ck_assert_str_eq(cause, "bench 'orig' not found");
	free(cause);
	b = store_bench_load(st, "copy", "1", NULL, NULL);
	ck_assert_ptr_nonnull(b);
	model_bench_free(b);
	ck_assert_int_eq(store_bench_delete(st, "copy", NULL), 0);
	ck_assert_int_eq(count_rows("element"), 0);
	ck_assert_int_eq(count_rows("head"), 0);
	invariants();
}
END_TEST

static const char *const odd_names[] = {
	"it's \"quoted\"", "a; DROP TABLE bench; --", "Ablation Tisch 3 – Strahlweg ü",
	"光路",
};

/* '@' separates BENCH@REV, so a bench name may not hold one. */
START_TEST(test_at_in_name_refused)
{
	struct bench *b = demo("x@y");
	char *cause = NULL;

	ck_assert_int_ne(store_bench_create(st, b, "n", "a", &cause), 0);
	ck_assert_ptr_nonnull(strstr(cause, "'@'"));
	free(cause);
	model_bench_free(b);
}
END_TEST

/* A name is typed as an operand: one starting with '-' would read as an
 * option, a control character would break the list; refused when made,
 * copied or renamed. */
START_TEST(test_option_like_name_refused)
{
	static const char *const bad[] = { "-x", "--demo", "tab\there", "line\nbreak" };
	struct bench *ok = demo("plain");
	char *cause = NULL;

	ck_assert_int_eq(store_bench_create(st, ok, "n", "a", &cause), 0);
	for (size_t i = 0; i < sizeof bad / sizeof *bad; i++) {
		struct bench *b = demo(bad[i]);

		ck_assert_int_ne(store_bench_create(st, b, "n", "a", &cause), 0);
		ck_assert_msg(strstr(cause, bad[i][0] == '-' ? "may not start with '-'" :
		    "control characters") != NULL, "%s: %s", bad[i], cause);
		free(cause);
		cause = NULL;
		ck_assert_int_ne(store_bench_rename(st, "plain", bad[i], &cause), 0);
		ck_assert_ptr_nonnull(cause);
		free(cause);
		cause = NULL;
		ck_assert_int_ne(store_clone(st, "plain", NULL, bad[i], "a", &cause), 0);
		ck_assert_ptr_nonnull(cause);
		free(cause);
		cause = NULL;
		ck_assert_ptr_null(store_bench_load(st, bad[i], NULL, NULL, NULL));
		model_bench_free(b);
	}
	model_bench_free(ok);
}
END_TEST

START_TEST(test_odd_names)
{
	struct bench *b = demo(odd_names[_i]), *back;
	struct store_bench_row *rows;
	char *cause = NULL;
	size_t n;

	ck_assert_msg(store_bench_create(st, b, odd_names[_i], odd_names[_i], &cause) == 0,
	    "%s", cause);
	back = store_bench_load(st, odd_names[_i], NULL, NULL, &cause);
	ck_assert_msg(back != NULL, "%s", cause);
	assert_same(b, back);
	ck_assert_int_eq(store_label(st, odd_names[_i], "1", "ü; 'x'", &cause), 0);
	ck_assert_int_eq(store_benches(st, &rows, &n, NULL), 0);
	ck_assert_uint_eq(n, 1);
	ck_assert_str_eq(rows[0].name, odd_names[_i]);
	store_bench_rows_free(rows, n);
	model_bench_free(b);
	model_bench_free(back);
	invariants();
}
END_TEST

/* ---- a bench started empty, where the draft stands, renaming, authors ---- */

START_TEST(test_first_record_is_1)
{
	struct bench *b = demo("fresh");
	struct store_bench_row *rows;
	struct store_rev *revs;
	struct store_draft_status ds;
	char *cause = NULL;
	size_t n;
	int no = -1, changed = -1;

	/* note NULL: a draft only, nothing recorded */
	ck_assert_msg(store_bench_create(st, b, NULL, "tester", &cause) == 0, "%s", cause);
	model_bench_free(b);
	invariants();
	ck_assert_int_eq(count_rows("revision"), 0);
	ck_assert_int_eq(store_log(st, "fresh", &revs, &n, NULL), 0);
	ck_assert_uint_eq(n, 0);
	store_revs_free(revs, n);
	ck_assert_int_eq(store_draft_status(st, "fresh", &ds, NULL), 0);
	ck_assert_int_eq(ds.latest, 0);
	ck_assert_int_eq(ds.base, 0);
	ck_assert_int_eq(ds.same_as, 0);
	ck_assert_int_eq(store_draft_changed(st, "fresh", &changed, NULL), 0);
	ck_assert_int_eq(changed, 1);
	ck_assert_int_eq(store_benches(st, &rows, &n, NULL), 0);
	ck_assert_uint_eq(n, 1);
	ck_assert_int_eq(rows[0].latest_rev, 0);
	store_bench_rows_free(rows, n);
	ck_assert_int_eq(store_resolve_rev(st, "fresh", "1", &no, &cause), -1);
	ck_assert_ptr_nonnull(strstr(cause, "none recorded yet"));
	free(cause);
	cause = NULL;
	ck_assert_int_eq(store_restore(st, "fresh", "1", 1, &cause), -1);
	free(cause);
	cause = NULL;
	/* the first record is #1 */
	ck_assert_msg(store_commit(st, "fresh", "first", "me", &no, &cause) == 0, "%s", cause);
	ck_assert_int_eq(no, 1);
	ck_assert_int_eq(store_draft_status(st, "fresh", &ds, NULL), 0);
	ck_assert_int_eq(ds.latest, 1);
	ck_assert_int_eq(ds.same_as, 1);
	invariants();
}
END_TEST

/* A database from before: a bench made empty recorded an empty #1, and its
 * first real record was #2.  It still reads, lists and checks clean. */
START_TEST(test_old_empty_first_setup_reads)
{
	struct bench *b = demo("old");
	struct bench *one;
	char *cause = NULL;
	int no = 0;

	model_branch_release(&b->path);
	memset(&b->path, 0, sizeof b->path);
	ck_assert_msg(store_bench_create(st, b, "new bench: the source alone, no elements yet",
	    "tester", &cause) == 0, "%s", cause);
	model_bench_free(b);
	b = demo("old");
	ck_assert_msg(store_draft_save(st, "old", b, &cause) == 0, "%s", cause);
	ck_assert_msg(store_commit(st, "old", "laid out", "me", &no, &cause) == 0, "%s", cause);
	ck_assert_int_eq(no, 2);
	one = store_bench_load(st, "old", "1", NULL, &cause);
	ck_assert_msg(one != NULL, "%s", cause);
	ck_assert_uint_eq(model_count(&one->path), 0);
	model_bench_free(one);
	one = store_bench_load(st, "old", "#2", NULL, &cause);
	ck_assert_msg(one != NULL, "%s", cause);
	assert_same(one, b);
	model_bench_free(one);
	model_bench_free(b);
	invariants();
}
END_TEST

START_TEST(test_draft_status)
{
	struct store_draft_status ds;

	create_demo("ds");
	ck_assert_int_eq(store_draft_status(st, "ds", &ds, NULL), 0);
	ck_assert_int_eq(ds.latest, 1);
	ck_assert_int_eq(ds.base, 1);
	ck_assert_int_eq(ds.same_as, 1);
	set_draft("ds", "L1", "focal", "150 mm");
	ck_assert_int_eq(store_draft_status(st, "ds", &ds, NULL), 0);
	ck_assert_int_eq(ds.base, 1);
	ck_assert_int_eq(ds.same_as, 0);        /* changed since #1 */
	ck_assert_int_eq(store_commit(st, "ds", "shorter", "me", NULL, NULL), 0);
	ck_assert_int_eq(store_restore(st, "ds", "1", 0, NULL), 0);
	ck_assert_int_eq(store_draft_status(st, "ds", &ds, NULL), 0);
	ck_assert_int_eq(ds.latest, 2);
	ck_assert_int_eq(ds.base, 1);
	ck_assert_int_eq(ds.same_as, 1);        /* the older setup, not "changed" */
	/* edited back to what #2 holds: the draft equals the latest */
	set_draft("ds", "L1", "focal", "150 mm");
	ck_assert_int_eq(store_draft_status(st, "ds", &ds, NULL), 0);
	ck_assert_int_eq(ds.same_as, 2);
	ck_assert_int_eq(store_draft_status(st, "nosuch", &ds, NULL), -1);
}
END_TEST

static int
edit_rename(struct bench *b, void *arg, char **cause)
{
	free(b->name);
	b->name = xstrdup(arg);
	return edit_set(b, "L1", "focal", "120 mm", cause);
}

START_TEST(test_rename)
{
	struct store_rev *revs;
	struct bench *b;
	char *cause = NULL;
	size_t n;

	create_demo("before");
	create_demo("taken");
	ck_assert_int_eq(store_label(st, "before", "1", "aligned", NULL), 0);
	ck_assert_msg(store_bench_rename(st, "before", "after – ü", &cause) == 0, "%s", cause);
	invariants();
	ck_assert_ptr_null(store_bench_load(st, "before", "draft", NULL, &cause));
	ck_assert_str_eq(cause, "bench 'before' not found");
	free(cause);
	cause = NULL;
	b = store_bench_load(st, "after – ü", "aligned", NULL, &cause);
	ck_assert_msg(b != NULL, "%s", cause);
	ck_assert_str_eq(b->name, "after – ü");    /* old setups carry the new name */
	model_bench_free(b);
	ck_assert_int_eq(store_log(st, "after – ü", &revs, &n, NULL), 0);
	ck_assert_uint_eq(n, 1);
	store_revs_free(revs, n);
	/* refused: taken, empty, '@', missing; nothing changes */
	ck_assert_int_eq(store_bench_rename(st, "after – ü", "taken", &cause), -1);
	ck_assert_str_eq(cause, "bench 'taken' already exists");
	free(cause);
	cause = NULL;
	ck_assert_int_eq(store_bench_rename(st, "after – ü", "", &cause), -1);
	free(cause);
	cause = NULL;
	ck_assert_int_eq(store_bench_rename(st, "after – ü", "a@b", &cause), -1);
	ck_assert_ptr_nonnull(strstr(cause, "'@'"));
	free(cause);
	cause = NULL;
	ck_assert_int_eq(store_bench_rename(st, "nosuch", "x", &cause), -1);
	free(cause);
	cause = NULL;
	ck_assert_int_eq(store_bench_rename(st, "after – ü", "after – ü", NULL), 0);
	/* through a draft edit: the rename and the edit together, or neither */
	ck_assert_int_eq(store_draft_edit(st, "after – ü", edit_rename, "taken", &cause), -1);
	free(cause);
	cause = NULL;
	b = store_bench_load(st, "after – ü", "draft", NULL, NULL);
	ck_assert_ptr_nonnull(b);
	ck_assert_double_eq(model_get(model_find(b, "L1", NULL, NULL, NULL), K_FOCAL), 0.2);
	model_bench_free(b);
	ck_assert_msg(store_draft_edit(st, "after – ü", edit_rename, "third", &cause) == 0, "%s",
	    cause);
	b = store_bench_load(st, "third", "draft", NULL, NULL);
	ck_assert_ptr_nonnull(b);
	ck_assert_double_eq_tol(model_get(model_find(b, "L1", NULL, NULL, NULL), K_FOCAL), 0.12,
	    1e-15);
	model_bench_free(b);
	invariants();
}
END_TEST

START_TEST(test_author_fallback)
{
	char *saved = getenv("USER") != NULL ? xstrdup(getenv("USER")) : NULL, *a;
	char want[1024], line[1024];
	FILE *f = fopen("/etc/passwd", "r");

	/* the login name, read here from /etc/passwd by hand (name:pw:uid:...)
	 * rather than through getpwuid(3) as the store does */
	snprintf(want, sizeof want, "unknown");
	while (f != NULL && fgets(line, sizeof line, f) != NULL) {
		char *c1 = strchr(line, ':'), *c2 = c1 != NULL ? strchr(c1 + 1, ':') : NULL;

		if (c2 != NULL && strtol(c2 + 1, NULL, 10) == (long)getuid() && c1 > line) {
			*c1 = '\0';
			snprintf(want, sizeof want, "%s", line);
			break;
		}
	}
	if (f != NULL)
		fclose(f);
	if (strcmp(want, "unknown") == 0 && getpwuid(getuid()) != NULL)
		return;                 /* the account is not in /etc/passwd (NSS): no check */
	a = store_author("Ana Ösz");
	ck_assert_str_eq(a, "Ana Ösz");
	free(a);
	setenv("USER", "from-env", 1);
	a = store_author(NULL);
	ck_assert_str_eq(a, "from-env");
	free(a);
	a = store_author("");                   /* --author= is no author */
	ck_assert_str_eq(a, "from-env");
	free(a);
	unsetenv("USER");
	a = store_author(NULL);
	ck_assert_str_eq(a, want);
	free(a);
	setenv("USER", "", 1);
	a = store_author(NULL);
	ck_assert_str_eq(a, want);
	free(a);
	if (saved != NULL)
		setenv("USER", saved, 1);
	else
		unsetenv("USER");
	free(saved);
}
END_TEST

/* ---- edits in one transaction ---- */

static int
edit_fail(struct bench *b, void *arg, char **cause)
{
	(void)arg;
	if (edit_set(b, "L1", "focal", "0.1 m", cause) != 0)
		return -1;
	return edit_set(b, "M1", "reflectance", "1.5", cause);     /* refused */
}

static int
edit_ok(struct bench *b, void *arg, char **cause)
{
	return edit_set(b, "L1", "focal", arg, cause);
}

START_TEST(test_draft_edit)
{
	struct bench *d;
	char *cause = NULL;

	create_demo("ed");
	ck_assert_int_eq(store_draft_edit(st, "ed", edit_fail, NULL, &cause), -1);
	ck_assert_ptr_nonnull(strstr(cause, "M1"));
	free(cause);
	cause = NULL;
	d = store_bench_load(st, "ed", "draft", NULL, NULL);
	ck_assert_double_eq(model_get(model_find(d, "L1", NULL, NULL, NULL), K_FOCAL), 0.2);
	model_bench_free(d);
	ck_assert_msg(store_draft_edit(st, "ed", edit_ok, "300 mm", &cause) == 0, "%s", cause);
	d = store_bench_load(st, "ed", "draft", NULL, NULL);
	ck_assert_double_eq_tol(model_get(model_find(d, "L1", NULL, NULL, NULL), K_FOCAL),
	    0.3, 1e-15);
	model_bench_free(d);
	ck_assert_int_eq(store_draft_edit(st, "missing", edit_ok, "1 m", &cause), -1);
	ck_assert_str_eq(cause, "bench 'missing' not found");
	free(cause);
	invariants();
}
END_TEST

START_TEST(test_draft_save_checks)
{
	struct bench *b = demo("chk");
	char *cause = NULL;

	ck_assert_int_eq(store_bench_create(st, b, "", "", NULL), 0);
	ck_assert_int_eq(store_draft_save(st, "other", b, &cause), -1);
	ck_assert_ptr_nonnull(strstr(cause, "renamed"));
	free(cause);
	cause = NULL;
	b->path.el[0].val[K_LENGTH] = -1;           /* bypassing model_set */
	ck_assert_int_eq(store_draft_save(st, "chk", b, &cause), -1);
	free(cause);
	model_bench_free(b);
	invariants();
}
END_TEST

/* ---- parts ---- */

START_TEST(test_parts)
{
	struct element el, got;
	char *cause = NULL, **names;
	struct bench *d, *r2;
	size_t n;

	create_demo("pb");
	ck_assert_int_eq(edit_element_new(&el, "mirror", "x", (char *[]){ "aoi=45",
	    "reflectance=0.999", "damage.cw_irradiance=1 MW/cm^2", "label=2-inch 45° mirror" },
	    4, &cause), 0);
	ck_assert_msg(store_part_put(st, "m2in-45", &el, &cause) == 0, "%s", cause);
	model_element_release(&el);
	ck_assert_int_eq(store_part_get(st, "m2in-45", &got, &cause), 0);
	ck_assert_str_eq(got.id, "");
	ck_assert_str_eq(got.part, "m2in-45");
	ck_assert_int_eq(got.type, EL_MIRROR);
	ck_assert_double_eq(got.val[K_REFLECTANCE], 0.999);
	ck_assert_str_eq(got.label, "2-inch 45° mirror");
	/* Place it, commit, then change the shelf: the revision keeps its values. */
	d = store_bench_load(st, "pb", "draft", NULL, NULL);
	free(got.id);
	got.id = xstrdup("M9");
	ck_assert_int_eq(edit_add(d, &got, &(struct edit_place){ "S3", NULL, NULL, 0 },
	    &cause), 0);
	ck_assert_int_eq(store_draft_save(st, "pb", d, &cause), 0);
	model_bench_free(d);
	ck_assert_int_eq(store_commit(st, "pb", "add M9", "me", NULL, NULL), 0);
	ck_assert_int_eq(edit_element_new(&el, "mirror", "x", (char *[]){ "reflectance=0.5" },
	    1, &cause), 0);
	ck_assert_int_eq(store_part_put(st, "m2in-45", &el, &cause), 0);
	model_element_release(&el);
	r2 = store_bench_load(st, "pb", "2", NULL, NULL);
	ck_assert_double_eq(model_find(r2, "M9", NULL, NULL, NULL)->val[K_REFLECTANCE], 0.999);
	model_bench_free(r2);
	/* The revision remembers the shelf version it was placed from; the
	 * demo's own M1 names a part that was never on the shelf. */
	{
		struct store_part_ref *refs;
		size_t nr;

		ck_assert_int_eq(store_bench_parts(st, "pb", "2", &refs, &nr, &cause), 0);
		ck_assert_uint_eq(nr, 1);
		ck_assert_str_eq(refs[0].name, "m2in-45");
		ck_assert_int_eq(refs[0].placed, 1);
		ck_assert_int_eq(refs[0].current, 2);
		store_part_refs_free(refs, nr);
		ck_assert_int_eq(store_bench_parts(st, "pb", "1", &refs, &nr, &cause), 0);
		ck_assert_uint_eq(nr, 0);
		store_part_refs_free(refs, nr);
	}
	ck_assert_int_eq(store_part_get(st, "m2in-45", &got, NULL), 0);
	ck_assert_double_eq(got.val[K_REFLECTANCE], 0.5);
	model_element_release(&got);
	ck_assert_int_eq(store_parts(st, &names, &n, NULL), 0);
	ck_assert_uint_eq(n, 1);
	ck_assert_str_eq(names[0], "m2in-45");
	free(names[0]);
	free(names);
	ck_assert_int_eq(store_part_get(st, "none", &got, &cause), -1);
	ck_assert_str_eq(cause, "part 'none' is not on the shelf");
	free(cause);
	cause = NULL;
	/* An invalid part is refused: a fluence without its pulse width. */
	ck_assert_int_eq(edit_element_new(&el, "window", "x",
	    (char *[]){ "damage.fluence=1 J/cm^2" }, 1, &cause), 0);
	ck_assert_int_eq(store_part_put(st, "bad", &el, &cause), -1);
	ck_assert_ptr_nonnull(strstr(cause, "pulse_width"));
	free(cause);
	model_element_release(&el);
	invariants();
}
END_TEST

START_TEST(test_parts_import_all_or_nothing)
{
	static const char good[] = "{\"format\":\"beamledger-parts-1\",\"parts\":["
	    "{\"name\":\"lens-f200\",\"type\":\"lens\",\"focal\":\"200 mm\"},"
	    "{\"name\":\"nd03\",\"type\":\"filter\",\"od\":0.3,\"max_absorbed\":\"1 W\"}]}";
	static const char bad[] = "{\"format\":\"beamledger-parts-1\",\"parts\":["
	    "{\"name\":\"ok-one\",\"type\":\"lens\",\"focal\":\"100 mm\"},"
	    "{\"name\":\"broken\",\"type\":\"mirror\",\"reflectance\":1.2}]}";
	char p[160], *cause = NULL, **names;
	size_t n, k;

	snprintf(p, sizeof p, "%s/parts.json", dir);
	write_file(p, good, sizeof good - 1);
	ck_assert_msg(store_parts_import(st, p, &n, &cause) == 0, "%s", cause);
	ck_assert_uint_eq(n, 2);
	write_file(p, bad, sizeof bad - 1);
	ck_assert_int_eq(store_parts_import(st, p, &n, &cause), -1);
	ck_assert_msg(strstr(cause, "parts[1]: element 'broken': reflectance") != NULL,
	    "%s", cause);
	free(cause);
	ck_assert_int_eq(store_parts(st, &names, &k, NULL), 0);
	ck_assert_uint_eq(k, 2);                /* ok-one was not stored */
	for (size_t i = 0; i < k; i++)
		free(names[i]);
	free(names);
	invariants();
}
END_TEST

int
main(void)
{
	Suite *s = suite_create("store");
	TCase *tc = tcase_create("store");

	tcase_add_checked_fixture(tc, setup, teardown);
	tcase_set_timeout(tc, 20);
	tcase_add_test(tc, test_open_schema);
	tcase_add_test(tc, test_refuse_not_database);
	tcase_add_loop_test(tc, test_refuse_foreign, 0, NELEMS(foreign_cases));
	tcase_add_test(tc, test_empty_file_initialised);
	tcase_add_test(tc, test_at_in_name_refused);
	tcase_add_test(tc, test_option_like_name_refused);
	tcase_add_test(tc, test_readonly);
	tcase_add_test(tc, test_default_path);
	tcase_add_test(tc, test_creates_directories);
	tcase_add_test(tc, test_create_load_roundtrip);
	tcase_add_test(tc, test_commit_log);
	tcase_add_test(tc, test_revisions_immutable);
	tcase_add_test(tc, test_one_value_one_record);
	tcase_add_test(tc, test_labels_resolve);
	tcase_add_test(tc, test_restore);
	tcase_add_test(tc, test_clone_delete);
	tcase_add_loop_test(tc, test_odd_names, 0, NELEMS(odd_names));
	tcase_add_test(tc, test_first_record_is_1);
	tcase_add_test(tc, test_old_empty_first_setup_reads);
	tcase_add_test(tc, test_draft_status);
	tcase_add_test(tc, test_rename);
	tcase_add_test(tc, test_author_fallback);
	tcase_add_test(tc, test_draft_edit);
	tcase_add_test(tc, test_draft_save_checks);
	tcase_add_test(tc, test_parts);
	tcase_add_test(tc, test_parts_import_all_or_nothing);
	suite_add_tcase(s, tc);
	return run_suite(s);
}
