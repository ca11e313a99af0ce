/* cmd-store-setup.c - the database commands of a bench's setups: record
 * the draft as a numbered setup, its history with each setup's margin,
 * mark one, reinstate one as the draft; and check, the database's own
 * integrity.  Each opens the database, does one thing in one transaction,
 * and prints only once it has succeeded. */
#include <config.h>

#include <getopt.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <jansson.h>

#include "bench-file.h"
#include "cmd-store.h"
#include "core-diff.h"
#include "core-layout.h"
#include "core-trace.h"
#include "util-buf.h"
#include "util-err.h"

/* ---- record, history, mark, reinstate ---- */

int
cmd_record(struct cmd_ctx *ctx, int argc, char **argv)
{
	static const struct option opts[] = {
		{ "note", required_argument, NULL, 'n' },
		{ "author", required_argument, NULL, 'a' },
		{ "help", no_argument, NULL, 'h' },
		{ NULL, 0, NULL, 0 },
	};
	const char *note = NULL, *author = ctx->author;
	struct store *s;
	char *cause = NULL;
	int ch, no = 0;

	cmd_getopt_reset();
	while ((ch = getopt_long(argc, argv, "n:a:", opts, NULL)) != -1) {
		if (ch == 'n')
			note = optarg;
		else if (ch == 'a')
			author = optarg;
		else if (ch == 'h')
			return printf("Usage: " PROG " record BENCH --note NOTE [--author NAME]\n"
			    "The draft becomes the next numbered setup (#1, #2, ...), with UTC "
			    "time, author\n($USER, else the login name, unless --author) and "
			    "note (-n NOTE for short).\n"), 0;
		else
			return cmd_bad_option("record", argc, argv);
	}
	if (optind + 1 != argc)
		return cmd_usage(optind >= argc ? "record: which bench?" :
		    "record: one bench at a time ('%s' is extra)", argv[optind + 1]);
	if (note == NULL)
		return cmd_usage("record: say what this setup is with --note NOTE");
	if ((s = cmd_store_open_existing(ctx)) == NULL)
		return 2;
	if (store_commit(s, argv[optind], note, author, &no, &cause) != 0)
		return cmd_store_fail(s, cause);
	store_close(s);
	printf("bench '%s': recorded #%d\n", argv[optind], no);
	fflush(stdout);
	return 0;
}

/* What a lab wants to see when it looks back: per setup, the worst status
 * of its trace and its safe source power. */
struct margin {
	enum damage_status worst;
	double             safe;        /* W; NAN nothing rated, INFINITY no limit */
};

static struct margin *
setup_margins(struct store *s, const char *name, const struct store_rev *revs, size_t n,
    char **cause)
{
	struct margin *mg = xcalloc(n + 1, sizeof *mg);

	for (size_t i = 0; i < n; i++) {
		char ref[24];
		struct bench *b;
		struct trace *t;

		snprintf(ref, sizeof ref, "%d", revs[i].no);
		if ((b = store_bench_load(s, name, ref, NULL, cause)) == NULL) {
			free(mg);
			return NULL;
		}
		t = trace_run(b);
		mg[i].worst = diff_trace_worst(t);
		mg[i].safe = t->safe_source_power;
		trace_free(t);
		model_bench_free(b);
	}
	return mg;
}

int
cmd_history(struct cmd_ctx *ctx, int argc, char **argv)
{
	static const struct option opts[] = {
		{ "format", required_argument, NULL, 'f' },
		{ "margins", no_argument, NULL, 'm' },
		{ "help", no_argument, NULL, 'h' },
		{ NULL, 0, NULL, 0 },
	};
	struct store_rev *revs;
	struct margin *mg = NULL;
	struct store *s;
	struct buf out;
	char *cause = NULL, *words;
	size_t n, wa = 6, wn = 4;
	int ch, json = 0, margins = 0, rc;

	cmd_getopt_reset();
	while ((ch = getopt_long(argc, argv, "f:m", opts, NULL)) != -1) {
		if (ch == 'f') {
			if (cmd_format_opt("history", optarg, &json) != 0)
				return 2;
		} else if (ch == 'm') {
			margins = 1;
		} else if (ch == 'h') {
			return printf("Usage: " PROG " history BENCH [--margins] [--format table|json]\n"
			    "The setups, newest first: number, UTC time, author, names, note; "
			    "then where the draft stands.\nWith --margins each setup is traced: "
			    "its worst status and safe source power.\n"), 0;
		} else {
			return cmd_bad_option("history", argc, argv);
		}
	}
	if (optind + 1 != argc)
		return cmd_usage(optind >= argc ? "history: which bench?" :
		    "history: one bench at a time ('%s' is extra)", argv[optind + 1]);
	if ((s = cmd_store_open_existing(ctx)) == NULL)
		return 2;
	if (store_log(s, argv[optind], &revs, &n, &cause) != 0)
		return cmd_store_fail(s, cause);
	if ((words = cmd_draft_words(s, argv[optind], &cause)) == NULL ||
	    (margins && (mg = setup_margins(s, argv[optind], revs, n, &cause)) == NULL)) {
		free(words);
		store_revs_free(revs, n);
		return cmd_store_fail(s, cause);
	}
	store_close(s);
	buf_init(&out);
	if (json) {
		json_t *arr = json_array();
		char *t;

		for (size_t i = 0; i < n; i++) {
			json_t *o = json_pack("{s:i,s:s,s:s,s:s,s:s}", "setup",
			    revs[i].no, "time", revs[i].time, "author", revs[i].author,
			    "names", revs[i].labels, "note", revs[i].note);

			if (mg != NULL) {
				json_object_set_new(o, "worst", json_string(damage_status_name(
				    mg[i].worst)));
				json_object_set_new(o, "safe_source_power", isfinite(mg[i].safe) ?
				    json_real(mg[i].safe) : json_null());
			}
			json_array_append_new(arr, o);
		}
		t = json_dumps(arr, JSON_INDENT(2) | JSON_PRESERVE_ORDER);
		buf_printf(&out, "%s\n", t);
		free(t);
		json_decref(arr);
	} else if (n == 0) {
		buf_printf(&out, "no setup recorded yet: '" PROG " record %s --note NOTE' makes #1\n",
		    argv[optind]);
	} else {
		for (size_t i = 0; i < n; i++) {
			if (utf8_cols(revs[i].author) > wa)
				wa = utf8_cols(revs[i].author);
			if (utf8_cols(revs[i].labels) > wn)
				wn = utf8_cols(revs[i].labels);
		}
		buf_printf(&out, "setup  recorded (UTC)       %-*s  %-*s  %snote\n", (int)wa,
		    "author", (int)wn, "name", mg != NULL ? "worst    safe source power  " : "");
		for (size_t i = 0; i < n; i++) {
			char rev[24];
			size_t start = out.len;

			snprintf(rev, sizeof rev, "#%d", revs[i].no);
			buf_printf(&out, "%-6s %s  ", rev, revs[i].time);
			buf_add(&out, revs[i].author);
			buf_pad(&out, 6 + 1 + 19 + 2 + wa + 2, start);
			buf_add(&out, revs[i].labels[0] != '\0' ? revs[i].labels : "-");
			buf_pad(&out, 6 + 1 + 19 + 2 + wa + 2 + wn + 2, start);
			if (mg != NULL) {
				char v[32];

				if (isnan(mg[i].safe))
					snprintf(v, sizeof v, "-");
				else if (isinf(mg[i].safe))
					snprintf(v, sizeof v, "no limit");
				else
					units_format(v, sizeof v, mg[i].safe, DIM_POWER, 3, 0);
				buf_printf(&out, "%-7s  ", layout_status_word(mg[i].worst));
				buf_add(&out, v);
				buf_pad(&out, 6 + 1 + 19 + 2 + wa + 2 + wn + 2 + 9 + 19, start);
			}
			buf_printf(&out, "%s\n", revs[i].note);
		}
		buf_printf(&out, "%s\n", words);
	}
	free(words);
	free(mg);
	store_revs_free(revs, n);
	rc = cmd_print(out.s);
	buf_release(&out);
	return rc;
}

int
cmd_mark(struct cmd_ctx *ctx, int argc, char **argv)
{
	struct store *s;
	char *cause = NULL;
	int no = 0;

	if (argc == 2 && strcmp(argv[1], "--help") == 0)
		return printf("Usage: " PROG " mark BENCH SETUP NAME\n"
		    "Gives a setup a name (\"aligned\", \"before-upgrade\"); a name is unique in "
		    "its bench\nand may stand wherever a SETUP goes: BENCH@aligned.\n"), 0;
	if (argc != 4)
		return cmd_usage("mark: give BENCH, SETUP and NAME");
	if (cmd_rev_check(argv[2], &cause) != 0)
		return cmd_fail(cause);
	if ((s = cmd_store_open_existing(ctx)) == NULL)
		return 2;
	if (store_label(s, argv[1], argv[2], argv[3], &cause) != 0 ||
	    store_resolve_rev(s, argv[1], argv[3], &no, &cause) != 0)
		return cmd_store_fail(s, cause);
	store_close(s);
	printf("bench '%s': #%d is named '%s'\n", argv[1], no, argv[3]);
	return 0;
}

int
cmd_reinstate(struct cmd_ctx *ctx, int argc, char **argv)
{
	struct store *s;
	char *cause = NULL, *words;
	const char *pos[2] = { NULL, NULL };
	int force = 0, npos = 0, no = 0;

	for (int i = 1; i < argc; i++) {
		if (strcmp(argv[i], "--force") == 0 || strcmp(argv[i], "-f") == 0)
			force = 1;
		else if (strcmp(argv[i], "--help") == 0)
			return printf("Usage: " PROG " reinstate BENCH SETUP [--force]\n"
			    "Makes a setup the draft again.  Refuses when the draft holds "
			    "changes no setup has,\nunless --force.\n"), 0;
		else if (npos < 2)
			pos[npos++] = argv[i];
		else
			return cmd_usage("reinstate: '%s' is extra", argv[i]);
	}
	if (npos != 2)
		return cmd_usage("reinstate: give BENCH and SETUP");
	if (cmd_rev_check(pos[1], &cause) != 0)
		return cmd_fail(cause);
	if ((s = cmd_store_open_existing(ctx)) == NULL)
		return 2;
	if (store_restore(s, pos[0], pos[1], force, &cause) != 0 ||
	    store_resolve_rev(s, pos[0], pos[1], &no, &cause) != 0 ||
	    (words = cmd_draft_words(s, pos[0], &cause)) == NULL)
		return cmd_store_fail(s, cause);
	store_close(s);
	printf("bench '%s': #%d reinstated (%s)\n", pos[0], no, words);
	free(words);
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
		    "then that every setup and draft loads.\nExit status: 0 sound, 1 "
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
