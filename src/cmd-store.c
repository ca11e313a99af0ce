/* cmd-store.c - the database commands that read or move whole benches:
 * import, list, show, export, clone, delete, commit, log, label, restore,
 * check; and the helpers every database command shares.  Each command
 * opens the database, does one thing in one transaction, and prints only
 * once it has succeeded. */
#include <config.h>

#include <errno.h>
#include <fcntl.h>
#include <getopt.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

#include <jansson.h>

#include "bench-file.h"
#include "cmd-store.h"
#include "core-diff.h"
#include "core-trace.h"
#include "report.h"
#include "util-buf.h"
#include "util-err.h"

/* ---- shared helpers ---- */

struct store *
cmd_store_open(const struct cmd_ctx *ctx)
{
	char *cause = NULL;
	struct store *s = store_open(ctx->db_path != NULL && ctx->db_path[0] != '\0' ?
	    ctx->db_path : NULL, &cause);

	if (s == NULL) {
		cmd_fail(cause);
		return NULL;
	}
	if (store_readonly(s))
		fprintf(stderr, PROG ": database '%s' is read-only: changes are refused\n",
		    store_path(s));
	return s;
}

struct store *
cmd_store_open_existing(const struct cmd_ctx *ctx)
{
	char *path = ctx->db_path != NULL && ctx->db_path[0] != '\0' ?
	    xstrdup(ctx->db_path) : store_default_path();
	struct stat sb;

	if (stat(path, &sb) != 0 && errno == ENOENT) {
		fprintf(stderr, PROG ": no bench database at '%s' (import a bench first, or "
		    "check --db)\n", path);
		free(path);
		return NULL;
	}
	free(path);
	return cmd_store_open(ctx);
}

int
cmd_store_fail(struct store *s, char *cause)
{
	store_close(s);
	return cmd_fail(cause);
}

void
cmd_bench_ref(struct store *s, const char *arg, char **name, char **rev)
{
	const char *at = strrchr(arg, '@');
	int no;

	*rev = NULL;
	if (at == NULL || store_resolve_rev(s, arg, "draft", &no, NULL) == 0) {
		*name = xstrdup(arg);
		return;
	}
	*name = xstrdup(arg);
	(*name)[at - arg] = '\0';
	*rev = xstrdup(at + 1);
}

char *
cmd_rev_shown(const char *rev, int no)
{
	char tmp[24];

	if (no == 0)
		return xstrdup("draft");
	snprintf(tmp, sizeof tmp, "r%d", no);
	if (rev == NULL || strcmp(rev, tmp) == 0)
		return xstrdup(tmp);
	return xasprintf("%s (%s)", rev, tmp);
}

struct bench *
cmd_bench_load(struct store *s, const char *arg, char **name, char **shown, char **cause)
{
	char *rev;
	struct bench *b;
	int no = 0;

	cmd_bench_ref(s, arg, name, &rev);
	b = store_bench_load(s, *name, rev, &no, cause);
	if (b != NULL && shown != NULL)
		*shown = cmd_rev_shown(rev, no);
	free(rev);
	return b;
}

int
cmd_write_atomic(const char *path, const char *text, char **cause)
{
	char *tmp;
	size_t len = strlen(text), off = 0;
	mode_t mask = umask(0), mode;
	struct stat sb;
	int fd;

	umask(mask);
	mode = 0666 & ~mask;
	/* rename(2) would replace a file its owner made read-only, or a
	 * non-file; keep to what writing in place would be allowed to do */
	if (stat(path, &sb) == 0) {
		if (!S_ISREG(sb.st_mode))
			return fail_with(cause, "%s: not a regular file; nothing written", path);
		if ((sb.st_mode & 0222) == 0 || access(path, W_OK) != 0)
			return fail_with(cause, "%s: the file is read-only; nothing written", path);
		mode = sb.st_mode & 07777;
	}
	tmp = xasprintf("%s.XXXXXX", path);
	fd = mkstemp(tmp);
	if (fd < 0) {
		fail_with(cause, "%s: cannot create a temporary file: %s", path, strerror(errno));
		free(tmp);
		return -1;
	}
	(void)fchmod(fd, mode);
	while (off < len) {
		ssize_t w = write(fd, text + off, len - off);

		if (w < 0 && errno == EINTR)
			continue;
		if (w <= 0)
			break;
		off += (size_t)w;
	}
	if (off < len || fsync(fd) != 0) {
		fail_with(cause, "%s: %s", path, strerror(errno));
		close(fd);
		unlink(tmp);
		free(tmp);
		return -1;
	}
	if (close(fd) != 0 || rename(tmp, path) != 0) {
		fail_with(cause, "%s: %s", path, strerror(errno));
		unlink(tmp);
		free(tmp);
		return -1;
	}
	free(tmp);
	return 0;
}

void
cmd_getopt_reset(void)
{
	optind = 0;             /* GNU: a full re-initialisation */
	opterr = 0;
}

/* Unknown options and missing arguments, in the house words. */
static int
bad_option(const char *cmd, int argc, char **argv)
{
	const char *arg = optind - 1 < argc ? argv[optind - 1] : "?";

	if (optopt != 0 && strchr(arg, '=') == NULL && arg[0] == '-' && arg[1] != '-' &&
	    arg[1] != '\0')
		return cmd_usage("%s: unknown option '-%c'", cmd, optopt);
	return cmd_usage("%s: unknown option or missing value in '%s'", cmd, arg);
}

/* ---- import ---- */

int
cmd_import(struct cmd_ctx *ctx, int argc, char **argv)
{
	static const struct option opts[] = {
		{ "name", required_argument, NULL, 'n' },
		{ "help", no_argument, NULL, 'h' },
		{ NULL, 0, NULL, 0 },
	};
	const char *name = NULL;
	struct bench *b;
	struct store *s;
	char *cause = NULL, *note;
	int ch, rc;

	cmd_getopt_reset();
	while ((ch = getopt_long(argc, argv, "n:", opts, NULL)) != -1) {
		if (ch == 'n')
			name = optarg;
		else if (ch == 'h')
			return printf("Usage: " PROG " import FILE [--name NAME]\n"
			    "A new bench from a bench file (- reads standard input); its draft "
			    "and r1 hold the file.\n"), 0;
		else
			return bad_option("import", argc, argv);
	}
	if (optind + 1 != argc)
		return cmd_usage(optind >= argc ? "import: which file?" :
		    "import: one file at a time ('%s' is extra)", argv[optind + 1]);
	if (name != NULL && name[0] == '\0')
		return cmd_usage("import: --name must not be empty");
	if ((b = bench_file_read(argv[optind], &cause)) == NULL)
		return cmd_fail(cause);
	if (name != NULL) {
		free(b->name);
		b->name = xstrdup(name);
	}
	if ((s = cmd_store_open(ctx)) == NULL) {
		model_bench_free(b);
		return 2;
	}
	note = xasprintf("imported from %s", argv[optind]);
	rc = store_bench_create(s, b, note, ctx->author, &cause);
	free(note);
	if (rc == 0)
		printf("imported bench '%s' as r1 (%zu elements)\n", b->name,
		    model_count(&b->path));
	model_bench_free(b);
	if (rc != 0)
		return cmd_store_fail(s, cause);
	store_close(s);
	return 0;
}

/* ---- list ---- */

static int
format_opt(const char *cmd, const char *arg, int *json)
{
	if (strcmp(arg, "json") == 0)
		*json = 1;
	else if (strcmp(arg, "table") == 0 || strcmp(arg, "text") == 0)
		*json = 0;
	else
		return cmd_usage("%s: --format must be table or json, not '%s'", cmd, arg);
	return 0;
}

int
cmd_list(struct cmd_ctx *ctx, int argc, char **argv)
{
	static const struct option opts[] = {
		{ "format", required_argument, NULL, 'f' },
		{ "help", no_argument, NULL, 'h' },
		{ NULL, 0, NULL, 0 },
	};
	struct store_bench_row *rows = NULL;
	struct store *s;
	struct buf out;
	json_t *arr = NULL;
	char *cause = NULL;
	size_t n, w = 5;
	int ch, json = 0, rc = 0;

	cmd_getopt_reset();
	while ((ch = getopt_long(argc, argv, "f:", opts, NULL)) != -1) {
		if (ch == 'f') {
			if (format_opt("list", optarg, &json) != 0)
				return 2;
		} else if (ch == 'h') {
			return printf("Usage: " PROG " list [--format table|json]\n"
			    "Every bench: latest revision, whether the draft changed since, "
			    "the worst damage status of the draft.\n"), 0;
		} else {
			return bad_option("list", argc, argv);
		}
	}
	if (optind < argc)
		return cmd_usage("list: takes no operands ('%s')", argv[optind]);
	if ((s = cmd_store_open(ctx)) == NULL)
		return 2;
	if (store_benches(s, &rows, &n, &cause) != 0)
		return cmd_store_fail(s, cause);
	buf_init(&out);
	for (size_t i = 0; i < n; i++)
		if (utf8_cols(rows[i].name) > w)
			w = utf8_cols(rows[i].name);
	if (json)
		arr = json_array();
	else if (n > 0)
		buf_printf(&out, "%-*s  latest  draft      worst    updated (UTC)\n", (int)w, "bench");
	for (size_t i = 0; i < n && rc == 0; i++) {
		struct bench *b = store_bench_load(s, rows[i].name, "draft", NULL, &cause);
		struct trace *t;
		enum damage_status worst;
		char rev[24];
		size_t start;

		if (b == NULL) {
			rc = -1;
			break;
		}
		t = trace_run(b);
		worst = diff_trace_worst(t);
		trace_free(t);
		model_bench_free(b);
		snprintf(rev, sizeof rev, "r%d", rows[i].latest_rev);
		if (json) {
			json_array_append_new(arr, json_pack("{s:s,s:i,s:b,s:s,s:s}", "name",
			    rows[i].name, "latest", rows[i].latest_rev, "draft_changed",
			    rows[i].draft_changed, "worst", damage_status_name(worst),
			    "updated", rows[i].updated));
			continue;
		}
		start = out.len;
		buf_add(&out, rows[i].name);
		buf_pad(&out, w + 2, start);
		buf_printf(&out, "%-6s  %-9s  %-7s  %s\n", rev,
		    rows[i].draft_changed ? "changed" : "same", damage_status_name(worst),
		    rows[i].updated);
	}
	store_bench_rows_free(rows, n);
	if (rc != 0) {
		json_decref(arr);
		buf_release(&out);
		return cmd_store_fail(s, cause);
	}
	store_close(s);
	if (json) {
		char *t = json_dumps(arr, JSON_INDENT(2));

		buf_printf(&out, "%s\n", t);
		free(t);
		json_decref(arr);
	} else if (n == 0) {
		fprintf(stderr, PROG ": no benches yet; add one with '" PROG " import FILE'\n");
	}
	rc = cmd_print(out.s);
	buf_release(&out);
	return rc;
}

/* ---- show ---- */

struct show_ctx {
	struct buf *out;
	size_t      wid, wtype, wpart, wlabel;
};

void
cmd_values_line(struct buf *b, const struct element *el)
{
	int first = 1;

	for (int k = 0; k < K_COUNT; k++) {
		char *v;

		if (!model_has(el, (enum model_key)k))
			continue;
		v = diff_key_show(el, (enum model_key)k, 0);
		buf_printf(b, "%s%s %s", first ? "" : ", ", model_key_path((enum model_key)k), v);
		free(v);
		first = 0;
	}
}

static void
widths(struct show_ctx *c, const struct branch *br, size_t depth)
{
	for (size_t i = 0; i < br->n; i++) {
		const struct element *el = &br->el[i];
		size_t w = 2 * depth + utf8_cols(el->id);

		if (w > c->wid)
			c->wid = w;
		if (el->part != NULL && utf8_cols(el->part) > c->wpart)
			c->wpart = utf8_cols(el->part);
		if (el->label != NULL && utf8_cols(el->label) > c->wlabel)
			c->wlabel = utf8_cols(el->label);
		if (el->side_port != PORT_NONE)
			widths(c, &el->side, depth + 1);
	}
}

static void
show_rows(struct show_ctx *c, const struct branch *br, size_t depth)
{
	struct buf *b = c->out;

	for (size_t i = 0; i < br->n; i++) {
		const struct element *el = &br->el[i];
		size_t start = b->len, x = 0;

		for (size_t d = 0; d < depth; d++)
			buf_add(b, "  ");
		buf_add(b, el->id);
		buf_pad(b, x += c->wid + 2, start);
		buf_add(b, model_type_name(el->type));
		buf_pad(b, x += c->wtype + 2, start);
		buf_add(b, el->part != NULL ? el->part : "-");
		buf_pad(b, x += c->wpart + 2, start);
		buf_add(b, el->label != NULL ? el->label : "-");
		buf_pad(b, x += c->wlabel + 2, start);
		cmd_values_line(b, el);
		buf_addc(b, '\n');
		if (el->side_port != PORT_NONE) {
			for (size_t d = 0; d < depth; d++)
				buf_add(b, "  ");
			buf_printf(b, "└ %s.%s\n", el->id, model_port_name(el->side_port));
			show_rows(c, &el->side, depth + 1);
		}
	}
}

int
cmd_show(struct cmd_ctx *ctx, int argc, char **argv)
{
	struct store *s;
	struct bench *b;
	struct buf out;
	struct show_ctx c;
	struct store_part_ref *refs = NULL;
	size_t nrefs = 0;
	char *cause = NULL, *name = NULL, *shown = NULL, *src;
	int changed = 0, rc;

	if (argc == 2 && strcmp(argv[1], "--help") == 0)
		return printf("Usage: " PROG " show BENCH[@REV]\n"
		    "The chain as a table: ids (side branches indented under their port), "
		    "type, part, label, values.\nREV is rN, a label or draft (the default).\n"), 0;
	if (argc != 2)
		return cmd_usage(argc < 2 ? "show: which bench?" :
		    "show: one bench at a time ('%s' is extra)", argv[2]);
	if ((s = cmd_store_open_existing(ctx)) == NULL)
		return 2;
	if ((b = cmd_bench_load(s, argv[1], &name, &shown, &cause)) == NULL) {
		free(name);
		return cmd_store_fail(s, cause);
	}
	if (strcmp(shown, "draft") == 0)
		store_draft_changed(s, name, &changed, NULL);
	{
		char *rev = NULL, *nm = NULL;

		cmd_bench_ref(s, argv[1], &nm, &rev);
		if (store_bench_parts(s, nm, rev, &refs, &nrefs, &cause) != 0) {
			free(nm);
			free(rev);
			free(name);
			free(shown);
			model_bench_free(b);
			return cmd_store_fail(s, cause);
		}
		free(nm);
		free(rev);
	}
	store_close(s);
	buf_init(&out);
	buf_printf(&out, "Bench %s @ %s%s\n", b->name, shown,
	    strcmp(shown, "draft") == 0 ? changed ? " (changed since the latest revision)" :
	    " (same as the latest revision)" : "");
	src = report_source_line(b, 0);
	buf_printf(&out, "Source: %s\n", src);
	free(src);
	buf_printf(&out, "Safety factor %.17g; air breakdown ", b->safety_factor);
	{
		char *ab = diff_value_show(b->air_breakdown, DIM_IRRADIANCE, 0);

		buf_printf(&out, "%s\n", ab);
		free(ab);
	}
	if (b->notes != NULL)
		buf_printf(&out, "Notes: %s\n", b->notes);
	buf_addc(&out, '\n');
	memset(&c, 0, sizeof c);
	c.out = &out;
	c.wid = 7;
	c.wtype = 9;
	c.wpart = 4;
	c.wlabel = 5;
	widths(&c, &b->path, 0);
	{
		size_t start = out.len, x = 0;

		buf_add(&out, "element");
		buf_pad(&out, x += c.wid + 2, start);
		buf_add(&out, "type");
		buf_pad(&out, x += c.wtype + 2, start);
		buf_add(&out, "part");
		buf_pad(&out, x += c.wpart + 2, start);
		buf_add(&out, "label");
		buf_pad(&out, x += c.wlabel + 2, start);
		buf_add(&out, "values\n");
	}
	show_rows(&c, &b->path, 0);
	if (nrefs > 0)
		buf_add(&out, "\nPlaced from the parts shelf:\n");
	for (size_t i = 0; i < nrefs; i++) {
		buf_printf(&out, "  %s: version %d", refs[i].name, refs[i].placed);
		if (refs[i].current == 0)
			buf_add(&out, " (no longer on the shelf)\n");
		else if (refs[i].current != refs[i].placed)
			buf_printf(&out, " (the shelf now has version %d)\n", refs[i].current);
		else
			buf_add(&out, " (as on the shelf now)\n");
	}
	store_part_refs_free(refs, nrefs);
	rc = cmd_print(out.s);
	buf_release(&out);
	model_bench_free(b);
	free(name);
	free(shown);
	return rc;
}

/* ---- export, clone, delete ---- */

int
cmd_export(struct cmd_ctx *ctx, int argc, char **argv)
{
	static const struct option opts[] = {
		{ "output", required_argument, NULL, 'o' },
		{ "help", no_argument, NULL, 'h' },
		{ NULL, 0, NULL, 0 },
	};
	const char *outpath = NULL;
	struct store *s;
	struct bench *b;
	char *cause = NULL, *name = NULL, *text;
	int ch, rc;

	cmd_getopt_reset();
	while ((ch = getopt_long(argc, argv, "o:", opts, NULL)) != -1) {
		if (ch == 'o')
			outpath = optarg;
		else if (ch == 'h')
			return printf("Usage: " PROG " export BENCH[@REV] [-o FILE]\n"
			    "The bench file of a revision or the draft (the default), on "
			    "standard output or written atomically to FILE.\n"), 0;
		else
			return bad_option("export", argc, argv);
	}
	if (optind + 1 != argc)
		return cmd_usage(optind >= argc ? "export: which bench?" :
		    "export: one bench at a time ('%s' is extra)", argv[optind + 1]);
	if ((s = cmd_store_open_existing(ctx)) == NULL)
		return 2;
	b = cmd_bench_load(s, argv[optind], &name, NULL, &cause);
	free(name);
	if (b == NULL)
		return cmd_store_fail(s, cause);
	store_close(s);
	text = bench_file_dump(b);
	model_bench_free(b);
	if (outpath != NULL && strcmp(outpath, "-") != 0) {
		rc = cmd_write_atomic(outpath, text, &cause) == 0 ? 0 : cmd_fail(cause);
	} else {
		rc = cmd_print(text);
	}
	free(text);
	return rc;
}

int
cmd_clone(struct cmd_ctx *ctx, int argc, char **argv)
{
	struct store *s;
	char *cause = NULL, *name, *rev;
	int rc;

	if (argc == 2 && strcmp(argv[1], "--help") == 0)
		return printf("Usage: " PROG " clone BENCH[@REV] NEWNAME\n"
		    "A new bench whose draft and r1 are a revision (or the draft) of another.\n"),
		    0;
	if (argc != 3)
		return cmd_usage("clone: give BENCH[@REV] and NEWNAME");
	if (argv[2][0] == '\0')
		return cmd_usage("clone: the new name must not be empty");
	if ((s = cmd_store_open_existing(ctx)) == NULL)
		return 2;
	cmd_bench_ref(s, argv[1], &name, &rev);
	rc = store_clone(s, name, rev, argv[2], ctx->author, &cause);
	free(name);
	free(rev);
	if (rc != 0)
		return cmd_store_fail(s, cause);
	store_close(s);
	printf("cloned %s into bench '%s' (r1)\n", argv[1], argv[2]);
	return 0;
}

int
cmd_delete(struct cmd_ctx *ctx, int argc, char **argv)
{
	struct store_rev *revs = NULL;
	struct store *s;
	char *cause = NULL;
	const char *name = NULL;
	size_t n = 0;
	int force = 0;

	for (int i = 1; i < argc; i++) {
		if (strcmp(argv[i], "--force") == 0 || strcmp(argv[i], "-f") == 0)
			force = 1;
		else if (strcmp(argv[i], "--help") == 0)
			return printf("Usage: " PROG " delete BENCH --force\n"
			    "Drops a bench with its draft, every revision and label.\n"), 0;
		else if (name == NULL)
			name = argv[i];
		else
			return cmd_usage("delete: one bench at a time ('%s' is extra)", argv[i]);
	}
	if (name == NULL)
		return cmd_usage("delete: which bench?");
	if ((s = cmd_store_open_existing(ctx)) == NULL)
		return 2;
	if (store_log(s, name, &revs, &n, &cause) != 0)
		return cmd_store_fail(s, cause);
	store_revs_free(revs, n);
	if (!force)
		return cmd_store_fail(s, xasprintf("bench '%s': deleting it drops its %zu "
		    "revision(s) and draft; add --force to do so", name, n));
	if (store_bench_delete(s, name, &cause) != 0)
		return cmd_store_fail(s, cause);
	store_close(s);
	printf("deleted bench '%s' (%zu revision(s))\n", name, n);
	return 0;
}

/* ---- commit, log, label, restore ---- */

int
cmd_commit(struct cmd_ctx *ctx, int argc, char **argv)
{
	static const struct option opts[] = {
		{ "message", required_argument, NULL, 'm' },
		{ "author", required_argument, NULL, 'a' },
		{ "help", no_argument, NULL, 'h' },
		{ NULL, 0, NULL, 0 },
	};
	const char *note = NULL, *author = ctx->author;
	struct store *s;
	char *cause = NULL;
	int ch, no = 0;

	cmd_getopt_reset();
	while ((ch = getopt_long(argc, argv, "m:a:", opts, NULL)) != -1) {
		if (ch == 'm')
			note = optarg;
		else if (ch == 'a')
			author = optarg;
		else if (ch == 'h')
			return printf("Usage: " PROG " commit BENCH -m NOTE [--author NAME]\n"
			    "The draft becomes the next revision, with UTC time, author "
			    "($USER unless --author) and note.\n"), 0;
		else
			return bad_option("commit", argc, argv);
	}
	if (optind + 1 != argc)
		return cmd_usage(optind >= argc ? "commit: which bench?" :
		    "commit: one bench at a time ('%s' is extra)", argv[optind + 1]);
	if (note == NULL)
		return cmd_usage("commit: say what changed with -m NOTE");
	if ((s = cmd_store_open_existing(ctx)) == NULL)
		return 2;
	if (store_commit(s, argv[optind], note, author, &no, &cause) != 0)
		return cmd_store_fail(s, cause);
	store_close(s);
	printf("committed bench '%s' as r%d\n", argv[optind], no);
	fflush(stdout);
	return 0;
}

int
cmd_log(struct cmd_ctx *ctx, int argc, char **argv)
{
	static const struct option opts[] = {
		{ "format", required_argument, NULL, 'f' },
		{ "help", no_argument, NULL, 'h' },
		{ NULL, 0, NULL, 0 },
	};
	struct store_rev *revs;
	struct store *s;
	struct buf out;
	char *cause = NULL;
	size_t n, wa = 6;
	int ch, json = 0, rc;

	cmd_getopt_reset();
	while ((ch = getopt_long(argc, argv, "f:", opts, NULL)) != -1) {
		if (ch == 'f') {
			if (format_opt("log", optarg, &json) != 0)
				return 2;
		} else if (ch == 'h') {
			return printf("Usage: " PROG " log BENCH [--format table|json]\n"
			    "Revisions, newest first: number, UTC time, author, labels, note.\n"), 0;
		} else {
			return bad_option("log", argc, argv);
		}
	}
	if (optind + 1 != argc)
		return cmd_usage(optind >= argc ? "log: which bench?" :
		    "log: one bench at a time ('%s' is extra)", argv[optind + 1]);
	if ((s = cmd_store_open_existing(ctx)) == NULL)
		return 2;
	if (store_log(s, argv[optind], &revs, &n, &cause) != 0)
		return cmd_store_fail(s, cause);
	store_close(s);
	buf_init(&out);
	if (json) {
		json_t *arr = json_array();
		char *t;

		for (size_t i = 0; i < n; i++)
			json_array_append_new(arr, json_pack("{s:i,s:s,s:s,s:s,s:s}", "rev",
			    revs[i].no, "time", revs[i].time, "author", revs[i].author,
			    "labels", revs[i].labels, "note", revs[i].note));
		t = json_dumps(arr, JSON_INDENT(2) | JSON_PRESERVE_ORDER);
		buf_printf(&out, "%s\n", t);
		free(t);
		json_decref(arr);
	} else {
		for (size_t i = 0; i < n; i++)
			if (utf8_cols(revs[i].author) > wa)
				wa = utf8_cols(revs[i].author);
		for (size_t i = 0; i < n; i++) {
			char rev[24];
			size_t start = out.len;

			snprintf(rev, sizeof rev, "r%d", revs[i].no);
			buf_printf(&out, "%-6s %s  ", rev, revs[i].time);
			buf_add(&out, revs[i].author);
			buf_pad(&out, 6 + 1 + 19 + 2 + wa + 2, start);
			if (revs[i].labels[0] != '\0')
				buf_printf(&out, "[%s] ", revs[i].labels);
			buf_printf(&out, "%s\n", revs[i].note);
		}
	}
	store_revs_free(revs, n);
	rc = cmd_print(out.s);
	buf_release(&out);
	return rc;
}

int
cmd_label(struct cmd_ctx *ctx, int argc, char **argv)
{
	struct store *s;
	char *cause = NULL;
	int no = 0;

	if (argc == 2 && strcmp(argv[1], "--help") == 0)
		return printf("Usage: " PROG " label BENCH REV NAME\n"
		    "Names a revision (\"aligned\", \"before-upgrade\"); a label is unique in "
		    "its bench and may stand wherever a REV goes.\n"), 0;
	if (argc != 4)
		return cmd_usage("label: give BENCH, REV and NAME");
	if ((s = cmd_store_open_existing(ctx)) == NULL)
		return 2;
	if (store_label(s, argv[1], argv[2], argv[3], &cause) != 0 ||
	    store_resolve_rev(s, argv[1], argv[3], &no, &cause) != 0)
		return cmd_store_fail(s, cause);
	store_close(s);
	printf("bench '%s': r%d is labelled '%s'\n", argv[1], no, argv[3]);
	return 0;
}

int
cmd_restore(struct cmd_ctx *ctx, int argc, char **argv)
{
	struct store *s;
	char *cause = NULL;
	const char *pos[2] = { NULL, NULL };
	int force = 0, npos = 0, no = 0;

	for (int i = 1; i < argc; i++) {
		if (strcmp(argv[i], "--force") == 0 || strcmp(argv[i], "-f") == 0)
			force = 1;
		else if (strcmp(argv[i], "--help") == 0)
			return printf("Usage: " PROG " restore BENCH REV [--force]\n"
			    "Copies a revision into the draft.  Refuses when the draft holds "
			    "changes no revision has, unless --force.\n"), 0;
		else if (npos < 2)
			pos[npos++] = argv[i];
		else
			return cmd_usage("restore: '%s' is extra", argv[i]);
	}
	if (npos != 2)
		return cmd_usage("restore: give BENCH and REV");
	if ((s = cmd_store_open_existing(ctx)) == NULL)
		return 2;
	if (store_restore(s, pos[0], pos[1], force, &cause) != 0 ||
	    store_resolve_rev(s, pos[0], pos[1], &no, &cause) != 0)
		return cmd_store_fail(s, cause);
	store_close(s);
	printf("bench '%s': the draft is now r%d\n", pos[0], no);
	return 0;
}

/* ---- check ---- */

int
cmd_check(struct cmd_ctx *ctx, int argc, char **argv)
{
	struct store *s;
	char *cause = NULL, *report = NULL;
	int rc;

	if (argc == 2 && strcmp(argv[1], "--help") == 0)
		return printf("Usage: " PROG " check\n"
		    "Checks the database: SQLite's integrity_check and foreign_key_check, "
		    "then that every revision and draft loads.\nExit status: 0 sound, 1 "
		    "problems found (listed), 2 trouble.\n"), 0;
	if (argc != 1)
		return cmd_usage("check: takes no operands ('%s')", argv[1]);
	if ((s = cmd_store_open_existing(ctx)) == NULL)
		return 2;
	rc = store_check(s, &report, &cause);
	if (rc < 0)
		return cmd_store_fail(s, cause);
	if (rc == 0)
		printf("database '%s': ok\n", store_path(s));
	else
		printf("database '%s': problems found:\n%s", store_path(s), report);
	free(report);
	store_close(s);
	return rc;
}
