/* store-db.c - opening the bench database: recognising our files (and
 * refusing, untouched, anything else), the schema and its migrations, the
 * connection settings, cached statements and transactions.
 *
 * Schema, version 1 (PRAGMA user_version = 1, application_id = 0x424d4c47,
 * "BMLG").  Element values are stored once per distinct content, so a
 * revision that changes one value adds one element record and one small
 * revision row:
 *
 *   element(id, json, pinned)      one element without its side branch, as
 *                                  canonical compact JSON of the bench file
 *                                  (id, type, label, part, keys, damage);
 *                                  unique; pinned = 1 once a revision uses it
 *   head(id, json, pinned)         the bench's notes, safety_factor,
 *                                  air_breakdown and source (bench-file JSON
 *                                  without "format", "name" and "path")
 *   bench(id, name, created, updated, draft_head, draft_layout,
 *         draft_parts, draft_base) one row per bench; the draft is a head
 *                                  and a layout like a revision's, and
 *                                  draft_base is the revision it started from
 *   revision(id, bench, no, time, author, note, head, layout, parts)
 *                                  append-only; (bench, no) unique, no >= 1
 *   label(bench, name, rev, time)  a name for one revision, unique per bench
 *   part_version(id, name, json, added)
 *                                  every content a shelf part ever had
 *                                  (an element without id, as JSON)
 *   part(name, version)            the shelf: the current version of a name
 *
 * A layout is JSON: an array whose items are element ids, or
 * [id, "reflected"|"transmitted"|"rejected", [items...]] for an element with
 * a side port and its branch.  parts/draft_parts is a JSON object
 * {"part name": part_version id} of the shelf entries the elements were
 * placed from.  Times are UTC "YYYY-MM-DD HH:MM:SS".
 *
 * Durability: WAL with synchronous=FULL, so a commit that returned is on
 * disk, and a killed process leaves at worst an uncommitted transaction
 * that the next open rolls back. */
#include <config.h>

#include <errno.h>
#include <pwd.h>
#include <signal.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/resource.h>
#include <sys/stat.h>
#include <sys/statvfs.h>
#include <time.h>
#include <unistd.h>

#include "store-impl.h"
#include "util-buf.h"
#include "util-err.h"

/* Append-only: migrations[i] takes user_version i to i + 1. */
static const char *const migrations[] = {
	/* 0 -> 1 */
	"CREATE TABLE element (\n"
	"  id     INTEGER PRIMARY KEY,\n"
	"  json   TEXT NOT NULL UNIQUE,\n"
	"  pinned INTEGER NOT NULL DEFAULT 0 CHECK (pinned IN (0, 1))\n"
	") STRICT;\n"
	"CREATE INDEX element_unpinned ON element(id) WHERE pinned = 0;\n"
	"CREATE TABLE head (\n"
	"  id     INTEGER PRIMARY KEY,\n"
	"  json   TEXT NOT NULL UNIQUE,\n"
	"  pinned INTEGER NOT NULL DEFAULT 0 CHECK (pinned IN (0, 1))\n"
	") STRICT;\n"
	"CREATE TABLE bench (\n"
	"  id           INTEGER PRIMARY KEY,\n"
	"  name         TEXT NOT NULL UNIQUE CHECK (name <> ''),\n"
	"  created      TEXT NOT NULL,\n"
	"  updated      TEXT NOT NULL,\n"
	"  draft_head   INTEGER NOT NULL REFERENCES head(id),\n"
	"  draft_layout TEXT NOT NULL,\n"
	"  draft_parts  TEXT NOT NULL DEFAULT '{}',\n"
	"  draft_base   INTEGER NOT NULL DEFAULT 0\n"
	") STRICT;\n"
	"CREATE TABLE revision (\n"
	"  id     INTEGER PRIMARY KEY,\n"
	"  bench  INTEGER NOT NULL REFERENCES bench(id) ON DELETE CASCADE,\n"
	"  no     INTEGER NOT NULL CHECK (no >= 1),\n"
	"  time   TEXT NOT NULL,\n"
	"  author TEXT NOT NULL,\n"
	"  note   TEXT NOT NULL,\n"
	"  head   INTEGER NOT NULL REFERENCES head(id),\n"
	"  layout TEXT NOT NULL,\n"
	"  parts  TEXT NOT NULL DEFAULT '{}',\n"
	"  UNIQUE (bench, no)\n"
	") STRICT;\n"
	"CREATE INDEX revision_head ON revision(head);\n"
	"CREATE TABLE label (\n"
	"  bench INTEGER NOT NULL,\n"
	"  name  TEXT NOT NULL CHECK (name <> ''),\n"
	"  rev   INTEGER NOT NULL,\n"
	"  time  TEXT NOT NULL,\n"
	"  PRIMARY KEY (bench, name),\n"
	"  FOREIGN KEY (bench, rev) REFERENCES revision(bench, no) ON DELETE CASCADE\n"
	") STRICT;\n"
	"CREATE INDEX label_rev ON label(bench, rev);\n"
	"CREATE TABLE part_version (\n"
	"  id    INTEGER PRIMARY KEY,\n"
	"  name  TEXT NOT NULL CHECK (name <> ''),\n"
	"  json  TEXT NOT NULL,\n"
	"  added TEXT NOT NULL,\n"
	"  UNIQUE (name, json)\n"
	") STRICT;\n"
	"CREATE TABLE part (\n"
	"  name    TEXT PRIMARY KEY,\n"
	"  version INTEGER NOT NULL REFERENCES part_version(id)\n"
	") STRICT;\n"
	"CREATE INDEX part_version_ref ON part(version);\n",
};
#define SCHEMA_VERSION ((int)(sizeof migrations / sizeof *migrations))

static const char *const q_sql[Q_COUNT] = {
	[Q_BENCH_ID] = "SELECT id FROM bench WHERE name = ?1",
	[Q_BENCH_DRAFT] = "SELECT id, draft_head, draft_layout, draft_parts, draft_base "
	    "FROM bench WHERE name = ?1",
	[Q_BENCH_INSERT] = "INSERT INTO bench (name, created, updated, draft_head, "
	    "draft_layout, draft_parts, draft_base) VALUES (?1, ?2, ?2, ?3, ?4, ?5, ?6)",
	[Q_BENCH_SET_DRAFT] = "UPDATE bench SET draft_head = ?2, draft_layout = ?3, "
	    "draft_parts = ?4, draft_base = ?5, updated = ?6 WHERE id = ?1",
	[Q_BENCH_TOUCH] = "UPDATE bench SET updated = ?2 WHERE id = ?1",
	[Q_BENCH_LIST] = "SELECT b.name, coalesce(r.no, 0), "
	    "r.no IS NULL OR r.head <> b.draft_head OR r.layout <> b.draft_layout, b.updated "
	    "FROM bench b LEFT JOIN revision r ON r.bench = b.id AND "
	    "r.no = (SELECT max(no) FROM revision WHERE bench = b.id) ORDER BY b.name",
	[Q_BENCH_DELETE] = "DELETE FROM bench WHERE id = ?1",
	[Q_REV_LATEST] = "SELECT no, head, layout FROM revision WHERE bench = ?1 "
	    "ORDER BY no DESC LIMIT 1",
	[Q_REV_GET] = "SELECT head, layout, parts FROM revision WHERE bench = ?1 AND no = ?2",
	[Q_REV_INSERT] = "INSERT INTO revision (bench, no, time, author, note, head, layout, parts) "
	    "VALUES (?1, ?2, ?3, ?4, ?5, ?6, ?7, ?8)",
	[Q_REV_LOG] = "SELECT r.no, r.time, r.author, r.note, "
	    "(SELECT group_concat(name, ', ') FROM (SELECT name FROM label l "
	    "WHERE l.bench = r.bench AND l.rev = r.no ORDER BY l.time, l.name)) "
	    "FROM revision r WHERE r.bench = ?1 ORDER BY r.no DESC",
	[Q_REV_EXISTS] = "SELECT max(no) FROM revision WHERE bench = ?1",
	[Q_HEAD_FIND] = "SELECT id FROM head WHERE json = ?1",
	[Q_HEAD_INSERT] = "INSERT INTO head (json) VALUES (?1)",
	[Q_HEAD_GET] = "SELECT json FROM head WHERE id = ?1",
	[Q_HEAD_PIN] = "UPDATE head SET pinned = 1 WHERE id = ?1 AND pinned = 0",
	[Q_EL_FIND] = "SELECT id FROM element WHERE json = ?1",
	[Q_EL_INSERT] = "INSERT INTO element (json) VALUES (?1)",
	[Q_EL_GET] = "SELECT json FROM element WHERE id = ?1",
	[Q_EL_PIN] = "UPDATE element SET pinned = 1 WHERE pinned = 0 AND id IN "
	    "(SELECT value FROM json_tree(?1) WHERE type = 'integer')",
	[Q_GC_ELEMENTS] = "DELETE FROM element WHERE pinned = 0 AND id NOT IN "
	    "(SELECT j.value FROM bench b, json_tree(b.draft_layout) j WHERE j.type = 'integer')",
	[Q_GC_HEADS] = "DELETE FROM head WHERE pinned = 0 AND id NOT IN "
	    "(SELECT draft_head FROM bench)",
	[Q_LABEL_FIND] = "SELECT rev FROM label WHERE bench = ?1 AND name = ?2",
	[Q_LABEL_INSERT] = "INSERT INTO label (bench, name, rev, time) VALUES (?1, ?2, ?3, ?4)",
	[Q_PART_CURRENT] = "SELECT v.id, v.json FROM part p JOIN part_version v "
	    "ON v.id = p.version WHERE p.name = ?1",
	[Q_PART_VFIND] = "SELECT id FROM part_version WHERE name = ?1 AND json = ?2",
	[Q_PART_VINSERT] = "INSERT INTO part_version (name, json, added) VALUES (?1, ?2, ?3)",
	[Q_PART_SET] = "INSERT INTO part (name, version) VALUES (?1, ?2) "
	    "ON CONFLICT (name) DO UPDATE SET version = excluded.version",
	[Q_PART_LIST] = "SELECT name FROM part ORDER BY name",
	[Q_PART_VGET] = "SELECT name, json FROM part_version WHERE id = ?1",
};

/* ---- helpers shared by the store ---- */

sqlite3_stmt *
store_q(struct store *s, enum store_q q, char **cause)
{
	sqlite3_stmt *st = s->q[q];
	int rc;

	if (st != NULL) {
		sqlite3_reset(st);
		sqlite3_clear_bindings(st);
		return st;
	}
	rc = sqlite3_prepare_v3(s->db, q_sql[q], -1, SQLITE_PREPARE_PERSISTENT, &st, NULL);
	if (rc != SQLITE_OK) {
		store_fail(s, rc, cause, "preparing a statement");
		return NULL;
	}
	s->q[q] = st;
	return st;
}

void
store_q_done(sqlite3_stmt *st)
{
	if (st != NULL)
		sqlite3_reset(st);
}

/* ---- what an I/O error really means ---- */

/* The directory that holds path (caller frees). */
static char *
parent_dir(const char *path)
{
	const char *slash = strrchr(path, '/');

	if (slash == NULL)
		return xstrdup(".");
	if (slash == path)
		return xstrdup("/");
	return xasprintf("%.*s", (int)(slash - path), path);
}

/* SQLite needs room beside the database for its -wal and -shm files (a
 * -shm is 32 KiB at least); below a megabyte free the disk is taken to be
 * full. */
#define STORE_ROOM_NEEDED  (1024 * 1024)

static int
disk_full(const char *path)
{
	char *dir = parent_dir(path);
	struct statvfs v;
	int full = statvfs(dir, &v) == 0 &&
	    (unsigned long long)v.f_bavail * v.f_frsize < STORE_ROOM_NEEDED;

	free(dir);
	return full;
}

/* A message for an I/O failure whose plain SQLite text ("disk I/O error")
 * reads like damage, or NULL: a full disk, or the process's file-size limit
 * (SIGXFSZ is ignored, so the write fails with EFBIG instead of killing). */
static char *
io_cause(const char *path, int rc, const char *what)
{
	struct rlimit rl;
	int prim = rc & 0xff;

	if (prim != SQLITE_IOERR && prim != SQLITE_FULL && prim != SQLITE_CANTOPEN)
		return NULL;
	if (prim == SQLITE_FULL || disk_full(path))
		return xasprintf("database '%s': %s: the disk is full, so SQLite cannot "
		    "write its -wal and -shm files beside it; the database itself is "
		    "intact and nothing was changed. Free some space and try again",
		    path, what);
	if (getrlimit(RLIMIT_FSIZE, &rl) == 0 && rl.rlim_cur != RLIM_INFINITY)
		return xasprintf("database '%s': %s: the file-size limit of this process "
		    "(ulimit -f: %llu bytes) stops the database from growing; nothing "
		    "was changed. Raise the limit and try again", path, what,
		    (unsigned long long)rl.rlim_cur);
	return NULL;
}

int
store_fail(struct store *s, int rc, char **cause, const char *what)
{
	const char *path = s != NULL && s->path != NULL ? s->path : "database";

	switch (rc & 0xff) {
	case SQLITE_BUSY:
	case SQLITE_LOCKED:
		return fail_with(cause, "database is busy (another beamledger is writing); "
		    "try again");
	case SQLITE_READONLY:
		return fail_with(cause, "database '%s' is read-only: changes are refused", path);
	case SQLITE_FULL:
	case SQLITE_IOERR:
	case SQLITE_CANTOPEN: {
		char *why = io_cause(path, rc, what);

		if (why != NULL) {
			fail_with(cause, "%s", why);
			free(why);
			return -1;
		}
		return fail_with(cause, "database '%s': %s: %s", path, what,
		    s != NULL && s->db != NULL ? sqlite3_errmsg(s->db) : sqlite3_errstr(rc));
	}
	case SQLITE_CORRUPT:
	case SQLITE_NOTADB:
		return fail_with(cause, "database '%s' is damaged (%s); run '" "beamledger"
		    " --db %s check'", path, s != NULL && s->db != NULL ?
		    sqlite3_errmsg(s->db) : sqlite3_errstr(rc), path);
	default:
		return fail_with(cause, "database '%s': %s: %s", path, what,
		    s != NULL && s->db != NULL ? sqlite3_errmsg(s->db) : sqlite3_errstr(rc));
	}
}

int
store_exec(struct store *s, const char *sql, char **cause)
{
	int rc = sqlite3_exec(s->db, sql, NULL, NULL, NULL);

	return rc == SQLITE_OK ? 0 : store_fail(s, rc, cause, sql);
}

int
store_tx_begin(struct store *s, char **cause)
{
	if (s->readonly)
		return fail_with(cause, "database '%s' is read-only: changes are refused",
		    s->path);
	if (s->depth++ > 0)
		return 0;
	if (store_exec(s, "BEGIN IMMEDIATE", cause) != 0) {
		s->depth = 0;
		return -1;
	}
	return 0;
}

/* A read of several statements sees one snapshot (WAL), so that a writer
 * between them cannot make it mix two states.  Inside a write transaction
 * it is already one. */
int
store_read_begin(struct store *s)
{
	if (s->depth > 0 || !sqlite3_get_autocommit(s->db))
		return 0;
	return sqlite3_exec(s->db, "BEGIN", NULL, NULL, NULL) == SQLITE_OK;
}

void
store_read_end(struct store *s, int began)
{
	if (began)
		sqlite3_exec(s->db, "COMMIT", NULL, NULL, NULL);
}

int
store_tx_end(struct store *s, int rc, char **cause)
{
	if (s->depth <= 0)
		return rc;
	if (--s->depth > 0) {
		if (rc != 0) {
			/* An inner failure ends the whole transaction. */
			s->depth = 0;
			goto rollback;
		}
		return 0;
	}
	if (rc == 0) {
		int erc;

		for (int i = 0; i < Q_COUNT; i++)
			store_q_done(s->q[i]);
		erc = sqlite3_exec(s->db, "COMMIT", NULL, NULL, NULL);
		if (erc == SQLITE_OK)
			return 0;
		store_fail(s, erc, cause, "committing");
		rc = -1;
	}
rollback:
	for (int i = 0; i < Q_COUNT; i++)
		store_q_done(s->q[i]);
	if (!sqlite3_get_autocommit(s->db))
		sqlite3_exec(s->db, "ROLLBACK", NULL, NULL, NULL);
	return rc;
}

int
store_bind_text(sqlite3_stmt *st, int i, const char *text)
{
	if (text == NULL)
		return sqlite3_bind_null(st, i);
	return sqlite3_bind_text(st, i, text, -1, SQLITE_TRANSIENT);
}

char *
store_now(void)
{
	time_t t = time(NULL);
	struct tm tm;
	char buf[32];

	gmtime_r(&t, &tm);
	strftime(buf, sizeof buf, "%Y-%m-%d %H:%M:%S", &tm);
	return xstrdup(buf);
}

char *
store_json_text(const json_t *v)
{
	char *t = json_dumps(v, JSON_COMPACT | JSON_PRESERVE_ORDER | JSON_ENCODE_ANY |
	    JSON_REAL_PRECISION(17));

	if (t == NULL)          /* only out of memory, or a NaN that validation forbids */
		t = xstrdup("null");
	return t;
}

/* ---- opening ---- */

char *
store_default_path(void)
{
	const char *x = getenv("XDG_DATA_HOME"), *home = getenv("HOME");

	if (x != NULL && x[0] == '/')
		return xasprintf("%s/beamledger/benches.db", x);
	if (home == NULL || home[0] == '\0')
		home = ".";
	return xasprintf("%s/.local/share/beamledger/benches.db", home);
}

char *
store_author(const char *given)
{
	const char *user = getenv("USER");
	struct passwd *pw;

	if (given != NULL && given[0] != '\0')
		return xstrdup(given);
	if (user != NULL && user[0] != '\0')
		return xstrdup(user);
	/* a container or a cron job often has no USER: the account the
	 * process runs as still has a name */
	pw = getpwuid(getuid());
	if (pw != NULL && pw->pw_name != NULL && pw->pw_name[0] != '\0')
		return xstrdup(pw->pw_name);
	return xstrdup("unknown");
}

/* mkdir -p of the directory that holds path, new directories 0700. */
static int
make_parent(const char *path, char **cause)
{
	char *dir = xstrdup(path), *p;
	int rc = 0;

	p = strrchr(dir, '/');
	if (p == NULL || p == dir) {
		free(dir);
		return 0;
	}
	*p = '\0';
	for (p = dir + 1; ; p++) {
		if (*p == '/' || *p == '\0') {
			char c = *p;

			*p = '\0';
			if (mkdir(dir, 0700) != 0 && errno != EEXIST) {
				rc = fail_with(cause, "cannot create directory '%s': %s", dir,
				    strerror(errno));
				break;
			}
			*p = c;
			if (c == '\0')
				break;
		}
	}
	free(dir);
	return rc;
}

static void
configure(sqlite3 *db)
{
	sqlite3_extended_result_codes(db, 1);
	sqlite3_busy_timeout(db, STORE_BUSY_MS);
	sqlite3_db_config(db, SQLITE_DBCONFIG_ENABLE_FKEY, 1, NULL);
	sqlite3_db_config(db, SQLITE_DBCONFIG_DEFENSIVE, 1, NULL);
	sqlite3_db_config(db, SQLITE_DBCONFIG_DQS_DML, 0, NULL);
	sqlite3_db_config(db, SQLITE_DBCONFIG_DQS_DDL, 0, NULL);
	sqlite3_db_config(db, SQLITE_DBCONFIG_TRUSTED_SCHEMA, 0, NULL);
}

/* One integer from a pragma or query; -1 on error with *rc set. */
static long long
query_int(sqlite3 *db, const char *sql, int *rc)
{
	sqlite3_stmt *st = NULL;
	long long v = -1;

	*rc = sqlite3_prepare_v2(db, sql, -1, &st, NULL);
	if (*rc == SQLITE_OK) {
		*rc = sqlite3_step(st);
		if (*rc == SQLITE_ROW) {
			v = sqlite3_column_int64(st, 0);
			*rc = SQLITE_OK;
		} else if (*rc == SQLITE_DONE) {
			v = 0;
			*rc = SQLITE_OK;
		}
	}
	sqlite3_finalize(st);
	return v;
}

struct probe {
	long long app_id, version, objects;
};

/* A database in a folder this process cannot write: SQLite cannot create
 * the -shm (and -wal) a WAL database is read through.  With no -wal file
 * there is nothing outside the main file and nobody can be writing (a
 * writer would need a -wal there), so the file is opened as immutable,
 * which SQLite reads without any -shm (sqlite.org/wal.html, "Read-Only
 * Databases"; uri.html, "immutable").  Returns 1 when that is the way,
 * 0 when a plain read-only open will do, -1 with *cause when neither can
 * work. */
static int
folder_readonly(const char *path, char **cause)
{
	char *dir = parent_dir(path), *wal = xasprintf("%s-wal", path),
	    *shm = xasprintf("%s-shm", path);
	int rc = 0;

	if (access(dir, W_OK | X_OK) != 0) {
		if (access(wal, F_OK) != 0)
			rc = 1;
		else if (access(shm, R_OK) != 0)
			rc = fail_with(cause, "'%s' cannot be read here: its folder '%s' is "
			    "read-only, and SQLite needs a -shm file beside the database to "
			    "read the changes still in its -wal file. Copy the database with "
			    "its -wal file to a folder you can write, or have its owner open "
			    "it once", path, dir);
	}
	free(dir);
	free(wal);
	free(shm);
	return rc;
}

/* "file:" URI of path, with every byte a URI path may not hold escaped. */
static char *
immutable_uri(const char *path)
{
	struct buf b;

	buf_init(&b);
	buf_add(&b, "file:");
	for (const unsigned char *p = (const unsigned char *)path; *p != '\0'; p++) {
		if ((*p >= 'a' && *p <= 'z') || (*p >= 'A' && *p <= 'Z') ||
		    (*p >= '0' && *p <= '9') || strchr("/-._~", *p) != NULL)
			buf_addc(&b, (char)*p);
		else
			buf_printf(&b, "%%%02X", *p);
	}
	buf_add(&b, "?immutable=1");
	return buf_take(&b);
}

/* Opens path read-only, as immutable where its folder is read-only. */
static int
open_readonly(const char *path, sqlite3 **db, char **cause)
{
	int how = folder_readonly(path, cause), rc;
	char *uri;

	*db = NULL;
	if (how < 0)
		return -1;
	if (how == 0)
		return sqlite3_open_v2(path, db, SQLITE_OPEN_READONLY, NULL);
	uri = immutable_uri(path);
	rc = sqlite3_open_v2(uri, db, SQLITE_OPEN_READONLY | SQLITE_OPEN_URI, NULL);
	free(uri);
	return rc;
}

/* What a file holds, read through a read-only connection so that nothing
 * in it can change.  The caller decides. */
static int
probe_file(const char *path, struct probe *p, char **cause)
{
	char *why = NULL;
	sqlite3 *db = NULL;
	int rc = open_readonly(path, &db, cause);

	if (rc < 0)
		return -1;
	if (rc == SQLITE_OK) {
		configure(db);
		p->app_id = query_int(db, "PRAGMA application_id", &rc);
	}
	if (rc == SQLITE_OK)
		p->version = query_int(db, "PRAGMA user_version", &rc);
	if (rc == SQLITE_OK)
		p->objects = query_int(db, "SELECT count(*) FROM sqlite_schema", &rc);
	if (rc != SQLITE_OK) {
		if ((rc & 0xff) == SQLITE_NOTADB)
			fail_with(cause, "'%s' is not a beamledger database (not an SQLite "
			    "file); it was left untouched", path);
		else if ((rc & 0xff) == SQLITE_BUSY)
			fail_with(cause, "database is busy (another beamledger is writing); "
			    "try again");
		else if ((why = io_cause(path, rc, "opening")) != NULL)
			fail_with(cause, "%s", why);
		else
			fail_with(cause, "'%s': cannot read it as a database: %s", path,
			    db != NULL ? sqlite3_errmsg(db) : sqlite3_errstr(rc));
		free(why);
		sqlite3_close_v2(db);
		return -1;
	}
	sqlite3_close_v2(db);
	return 0;
}

static int
check_probe(const char *path, const struct probe *p, char **cause)
{
	if (p->app_id != 0 && p->app_id != STORE_APP_ID)
		return fail_with(cause, "'%s' is not a beamledger database (application_id "
		    "0x%08llx belongs to another program); it was left untouched", path,
		    (unsigned long long)(p->app_id & 0xffffffffLL));
	if (p->app_id == 0 && (p->objects > 0 || p->version != 0))
		return fail_with(cause, "'%s' is not a beamledger database (an SQLite file "
		    "of another program); it was left untouched", path);
	if (p->version > SCHEMA_VERSION)
		return fail_with(cause, "database '%s' has schema version %lld, newer than "
		    "this beamledger understands (%d); use a newer beamledger. The file "
		    "was left untouched", path, p->version, SCHEMA_VERSION);
	return 0;
}

static int
migrate(struct store *s, char **cause)
{
	struct probe p;
	int rc;

	if (store_tx_begin(s, cause) != 0)
		return -1;
	/* Again inside the lock: another process may have got here first. */
	p.app_id = query_int(s->db, "PRAGMA application_id", &rc);
	if (rc == SQLITE_OK)
		p.version = query_int(s->db, "PRAGMA user_version", &rc);
	if (rc == SQLITE_OK)
		p.objects = query_int(s->db, "SELECT count(*) FROM sqlite_schema", &rc);
	if (rc != SQLITE_OK) {
		store_fail(s, rc, cause, "reading the schema version");
		return store_tx_end(s, -1, cause);
	}
	if (check_probe(s->path, &p, cause) != 0)
		return store_tx_end(s, -1, cause);
	for (long long v = p.version; v < SCHEMA_VERSION; v++) {
		char pragma[64];

		if (store_exec(s, migrations[v], cause) != 0)
			return store_tx_end(s, -1, cause);
		snprintf(pragma, sizeof pragma, "PRAGMA user_version = %lld", v + 1);
		if (store_exec(s, pragma, cause) != 0)
			return store_tx_end(s, -1, cause);
	}
	if (p.app_id == 0) {
		char pragma[64];

		snprintf(pragma, sizeof pragma, "PRAGMA application_id = %d", STORE_APP_ID);
		if (store_exec(s, pragma, cause) != 0)
			return store_tx_end(s, -1, cause);
	}
	return store_tx_end(s, 0, cause);
}

struct store *
store_open(const char *path, char **cause)
{
	struct store *s = xcalloc(1, sizeof *s);
	struct probe p = { 0, 0, 0 };
	struct stat sb;
	int rc, exists, flags;

	/* Over the file-size limit a write fails with EFBIG and says so,
	 * instead of the signal killing the process without a word. */
	signal(SIGXFSZ, SIG_IGN);
	s->path = path != NULL ? xstrdup(path) : store_default_path();
	/* SQLite reads "file:..." as a URI, which stat(2) would not see: make
	 * it a plain relative path so the checks below look at the same file. */
	if (strncmp(s->path, "file:", 5) == 0) {
		char *rel = xasprintf("./%s", s->path);

		free(s->path);
		s->path = rel;
	}
	exists = stat(s->path, &sb) == 0;
	if (exists && !S_ISREG(sb.st_mode)) {
		fail_with(cause, "'%s' is not a regular file", s->path);
		goto fail;
	}
	if (exists && sb.st_size > 0) {
		if (probe_file(s->path, &p, cause) != 0 || check_probe(s->path, &p, cause) != 0)
			goto fail;
	}
	if (!exists && make_parent(s->path, cause) != 0)
		goto fail;
	/* Mode bits count, not only access(2): root may write anything, but a
	 * file made read-only was made so on purpose. */
	/* A writable file in a read-only folder is read-only too: WAL needs
	 * its -wal and -shm beside it. */
	{
		char *dir = parent_dir(s->path);

		s->readonly = exists && ((sb.st_mode & 0222) == 0 ||
		    access(s->path, W_OK) != 0 || access(dir, W_OK | X_OK) != 0);
		free(dir);
	}
	if (s->readonly) {
		rc = open_readonly(s->path, &s->db, cause);
		if (rc < 0)
			goto fail;
	} else {
		flags = SQLITE_OPEN_READWRITE | SQLITE_OPEN_CREATE;
		rc = sqlite3_open_v2(s->path, &s->db, flags, NULL);
	}
	if (rc != SQLITE_OK) {
		fail_with(cause, "cannot open database '%s': %s", s->path,
		    s->db != NULL ? sqlite3_errmsg(s->db) : sqlite3_errstr(rc));
		goto fail;
	}
	configure(s->db);
	if (s->readonly) {
		if (p.version < SCHEMA_VERSION) {
			fail_with(cause, "database '%s' is read-only and %s; it cannot be "
			    "used as it is", s->path, p.version == 0 ? "empty" :
			    "needs an upgrade to the current schema");
			goto fail;
		}
		return s;
	}
	if (store_exec(s, "PRAGMA journal_mode = WAL", cause) != 0 ||
	    store_exec(s, "PRAGMA synchronous = FULL", cause) != 0)
		goto fail;
	if (p.version < SCHEMA_VERSION || p.app_id == 0 || !exists || sb.st_size == 0)
		if (migrate(s, cause) != 0)
			goto fail;
	return s;
fail:
	store_close(s);
	return NULL;
}

void
store_close(struct store *s)
{
	if (s == NULL)
		return;
	for (int i = 0; i < Q_COUNT; i++)
		sqlite3_finalize(s->q[i]);
	sqlite3_close_v2(s->db);
	free(s->path);
	free(s);
}

int
store_readonly(const struct store *s)
{
	return s->readonly;
}

const char *
store_path(const struct store *s)
{
	return s->path;
}
