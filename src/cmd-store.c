/* cmd-store.c - the database commands that read or move whole benches:
 * import, list, chain, export, copy, delete; and the helpers every database
 * command shares (the setups' commands are cmd-store-setup.c's).  Each command
 * opens the database, does one thing in one transaction, and prints only
 * once it has succeeded. */
#include <config.h>

#include <errno.h>
#include <fcntl.h>
#include <getopt.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

#include <jansson.h>

#include "bench-file.h"
#include "cmd-store.h"
#include "core-diff.h"
#include "core-layout.h"
#include "core-trace.h"
#include "report.h"
#include "util-buf.h"
#include "util-err.h"
#include "util-file.h"

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
	snprintf(tmp, sizeof tmp, "#%d", no);
	if (rev == NULL || strcmp(rev, tmp) == 0 || strcmp(rev, tmp + 1) == 0)
		return xstrdup(tmp);
	return xasprintf("%s (%s)", rev, tmp);
}

int
cmd_rev_check(const char *rev, char **cause)
{
	const char *p = rev;

	/* setups used to be written r1, r2; the store still reads that for
	 * old callers, but the command line speaks of setups only */
	if (p == NULL || p[0] != 'r' || p[1] < '0' || p[1] > '9')
		return 0;
	for (p++; *p >= '0' && *p <= '9'; p++)
		;
	if (*p != '\0')
		return 0;
	return fail_with(cause, "'%s' is not a setup: setups are numbered, write %s (or #%s)",
	    rev, rev + 1, rev + 1);
}

char *
cmd_draft_words(struct store *s, const char *name, char **cause)
{
	struct store_draft_status ds;

	if (store_draft_status(s, name, &ds, cause) != 0)
		return NULL;
	if (ds.same_as > 0)
		return xasprintf("draft = #%d", ds.same_as);
	if (ds.base > 0)
		return xasprintf("draft: changed since #%d, not recorded", ds.base);
	return xstrdup(ds.latest > 0 ? "draft: changed, not recorded" :
	    "draft: not recorded yet");
}

struct bench *
cmd_bench_load(struct store *s, const char *arg, char **name, char **shown, char **cause)
{
	char *rev;
	struct bench *b;
	int no = 0;

	cmd_bench_ref(s, arg, name, &rev);
	if (cmd_rev_check(rev, cause) != 0) {
		free(rev);
		return NULL;
	}
	b = store_bench_load(s, *name, rev, &no, cause);
	if (b != NULL && shown != NULL)
		*shown = cmd_rev_shown(rev, no);
	free(rev);
	return b;
}

int
cmd_write_atomic(const char *path, const char *text, char **cause)
{
	return file_write_atomic(path, text, strlen(text), cause);
}

void
cmd_getopt_reset(void)
{
	optind = 0;             /* GNU: a full re-initialisation */
	opterr = 0;
}

int
cmd_bad_option(const char *cmd, int argc, char **argv)
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
			    "and setup #1 hold the file.\n"), 0;
		else
			return cmd_bad_option("import", argc, argv);
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
	if (rc == 0) {
		size_t n = model_count(&b->path);

		printf("imported bench '%s': recorded #1 (%zu %s)\n", b->name, n,
		    n == 1 ? "element" : "elements");
	}
	model_bench_free(b);
	if (rc != 0)
		return cmd_store_fail(s, cause);
	store_close(s);
	return 0;
}

/* ---- list ---- */

int
cmd_format_opt(const char *cmd, const char *arg, int *json)
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
			if (cmd_format_opt("list", optarg, &json) != 0)
				return 2;
		} else if (ch == 'h') {
			return printf("Usage: " PROG " list [--format table|json]\n"
			    "Every bench: its latest setup, whether the draft changed since, "
			    "the worst damage status of the draft.\n"), 0;
		} else {
			return cmd_bad_option("list", argc, argv);
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
		struct store_draft_status ds;
		struct trace *t;
		enum damage_status worst;
		char rev[24], draft[24];
		size_t start;

		if (b != NULL && store_draft_status(s, rows[i].name, &ds, &cause) != 0) {
			model_bench_free(b);
			b = NULL;
		}
		if (b == NULL) {
			rc = -1;
			break;
		}
		t = trace_run(b);
		worst = diff_trace_worst(t);
		trace_free(t);
		model_bench_free(b);
		if (rows[i].latest_rev > 0)
			snprintf(rev, sizeof rev, "#%d", rows[i].latest_rev);
		else
			snprintf(rev, sizeof rev, "none");
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
		if (ds.same_as > 0)
			snprintf(draft, sizeof draft, "= #%d", ds.same_as);
		else
			snprintf(draft, sizeof draft, ds.latest > 0 ? "changed" : "new");
		buf_printf(&out, "%-6s  %-9s  %-7s  %s\n", rev, draft, layout_status_word(worst),
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

/* ---- chain ---- */

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
cmd_chain(struct cmd_ctx *ctx, int argc, char **argv)
{
	struct store *s;
	struct bench *b;
	struct buf out;
	struct show_ctx c;
	struct store_part_ref *refs = NULL;
	size_t nrefs = 0;
	char *cause = NULL, *name = NULL, *shown = NULL, *src, *words = NULL;
	int rc;

	if (argc == 2 && strcmp(argv[1], "--help") == 0)
		return printf("Usage: " PROG " chain BENCH[@SETUP]\n"
		    "The chain as a table: ids (side branches indented under their port), "
		    "type, part, label, values.\nSETUP is a setup's number (2 or #2), its "
		    "name, or draft (the default).\n"), 0;
	if (argc != 2)
		return cmd_usage(argc < 2 ? "chain: which bench?" :
		    "chain: one bench at a time ('%s' is extra)", argv[2]);
	if ((s = cmd_store_open_existing(ctx)) == NULL)
		return 2;
	if ((b = cmd_bench_load(s, argv[1], &name, &shown, &cause)) == NULL) {
		free(name);
		return cmd_store_fail(s, cause);
	}
	if (strcmp(shown, "draft") == 0)
		words = cmd_draft_words(s, name, NULL);
	{
		char *rev = NULL, *nm = NULL;

		cmd_bench_ref(s, argv[1], &nm, &rev);
		if (store_bench_parts(s, nm, rev, &refs, &nrefs, &cause) != 0) {
			free(nm);
			free(rev);
			free(name);
			free(shown);
			free(words);
			model_bench_free(b);
			return cmd_store_fail(s, cause);
		}
		free(nm);
		free(rev);
	}
	store_close(s);
	buf_init(&out);
	if (words != NULL)
		buf_printf(&out, "Bench %s @ %s (%s)\n", b->name, shown, words);
	else
		buf_printf(&out, "Bench %s @ %s\n", b->name, shown);
	free(words);
	src = report_source_line(b, 0);
	buf_printf(&out, "Source: %s\n", src);
	free(src);
	{
		char sf[40];

		units_format_shortest(sf, sizeof sf, b->safety_factor, DIM_NONE, 1);
		buf_printf(&out, "Safety factor %s; air breakdown ", sf);
	}
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

/* ---- export, copy, delete ---- */

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
			return printf("Usage: " PROG " export BENCH[@SETUP] [-o FILE]\n"
			    "The bench file of a setup or the draft (the default), on "
			    "standard output or written atomically to FILE.  Values carry\n"
			    "their units as a person would type them (\"1064 nm\", \"5 W\") and read\n"
			    "back to the same numbers.\n"), 0;
		else
			return cmd_bad_option("export", argc, argv);
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
cmd_copy(struct cmd_ctx *ctx, int argc, char **argv)
{
	struct store *s;
	char *cause = NULL, *name, *rev;
	int rc;

	if (argc == 2 && strcmp(argv[1], "--help") == 0)
		return printf("Usage: " PROG " copy BENCH[@SETUP] NEWNAME\n"
		    "A new bench whose draft and setup #1 are a setup (or the draft) of "
		    "another.\n"), 0;
	if (argc != 3)
		return cmd_usage("copy: give BENCH[@SETUP] and NEWNAME");
	if (argv[2][0] == '\0')
		return cmd_usage("copy: the new name must not be empty");
	if ((s = cmd_store_open_existing(ctx)) == NULL)
		return 2;
	cmd_bench_ref(s, argv[1], &name, &rev);
	rc = cmd_rev_check(rev, &cause);
	if (rc == 0)
		rc = store_clone(s, name, rev, argv[2], ctx->author, &cause);
	free(name);
	free(rev);
	if (rc != 0)
		return cmd_store_fail(s, cause);
	store_close(s);
	printf("copied %s into bench '%s': recorded #1\n", argv[1], argv[2]);
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
			    "Drops a bench with its draft, every setup and their names.\n"), 0;
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
		    "%s and draft; add --force to do so", name, n, n == 1 ? "setup" : "setups"));
	if (store_bench_delete(s, name, &cause) != 0)
		return cmd_store_fail(s, cause);
	store_close(s);
	printf("deleted bench '%s' (%zu %s)\n", name, n, n == 1 ? "setup" : "setups");
	return 0;
}
