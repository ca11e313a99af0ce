/* cmd-point.c - `beamledger point add|list|show|remove`: the operating
 * points of a bench.  add and remove edit the draft in one transaction
 * (a refused point stores nothing); list and show read a draft, a setup
 * or a bench file, and trace each point to give its worst element. */
#include <config.h>

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "cmd-store.h"
#include "core-layout.h"
#include "core-point.h"
#include "core-trace.h"
#include "util-buf.h"
#include "util-err.h"

struct add_arg {
	const char  *name;
	char *const *changes;
	size_t       n;
};

static int
add_fn(struct bench *b, void *arg, char **cause)
{
	struct add_arg *a = arg;

	return point_edit_add(b, a->name, a->changes, a->n, cause);
}

static int
remove_fn(struct bench *b, void *arg, char **cause)
{
	return point_edit_remove(b, arg, cause);
}

static int
edit(struct cmd_ctx *ctx, const char *bench, store_edit_fn fn, void *arg)
{
	struct store *s = cmd_store_open_existing(ctx);
	char *cause = NULL;

	if (s == NULL)
		return 2;
	if (store_draft_edit(s, bench, fn, arg, &cause) != 0) {
		if (cause != NULL && strncmp(cause, "bench '", 7) != 0 &&
		    strncmp(cause, "database", 8) != 0)
			cause_prefix(&cause, "bench '%s'", bench);
		return cmd_store_fail(s, cause);
	}
	store_close(s);
	return 0;
}

static void
worst_text(struct buf *out, const struct bench *b)
{
	struct trace *t = trace_run(b);

	if (t->worst >= 0) {
		char pct[32];

		/* the table's percent form and status word */
		layout_percent(pct, sizeof pct, t->rows[t->worst].ratio);
		buf_printf(out, "%s at %s (%s)", t->rows[t->worst].el->id, pct,
		    layout_status_word(t->rows[t->worst].status));
	} else
		buf_add(out, "nothing rated");
	trace_free(t);
}

static int
list(struct cmd_ctx *ctx, const char *ref, const char *only)
{
	struct bench *b, *a;
	struct buf out;
	char *cause = NULL, *origin = NULL;
	const struct point *p = NULL;
	int rc;

	if ((b = cmd_bench_open(ctx, ref, &origin, &cause)) == NULL)
		return cause != NULL ? cmd_fail(cause) : 2;
	if (only != NULL && (p = point_list_find(&b->points, only)) == NULL) {
		fail_with(&cause, "no point '%s' in bench '%s'", only, b->name);
		model_bench_free(b);
		free(origin);
		return cmd_fail(cause);
	}
	buf_init(&out);
	if (p != NULL) {
		buf_printf(&out, "Point %s of bench %s%s%s:\n", p->name, b->name,
		    origin != NULL ? " @ " : "", origin != NULL ? origin : "");
		for (size_t i = 0; i < p->n; i++)
			buf_printf(&out, "  %s\n", p->change[i]);
		if ((a = point_apply(b, p, &cause)) == NULL) {
			buf_release(&out);
			model_bench_free(b);
			free(origin);
			return cmd_fail(cause);
		}
		buf_add(&out, "Worst: ");
		worst_text(&out, a);
		buf_addc(&out, '\n');
		model_bench_free(a);
	} else {
		buf_printf(&out, "%-16s %7s  %s\n", "point", "changes", "worst");
		buf_printf(&out, "%-16s %7s  ", "base", "-");
		worst_text(&out, b);
		buf_addc(&out, '\n');
		for (size_t i = 0; i < b->points.n; i++) {
			p = &b->points.p[i];
			buf_printf(&out, "%-16s %7zu  ", p->name, p->n);
			if ((a = point_apply(b, p, &cause)) == NULL) {
				buf_release(&out);
				model_bench_free(b);
				free(origin);
				return cmd_fail(cause);
			}
			worst_text(&out, a);
			buf_addc(&out, '\n');
			model_bench_free(a);
		}
	}
	rc = cmd_print(out.s);
	buf_release(&out);
	model_bench_free(b);
	free(origin);
	return rc;
}

int
cmd_point(struct cmd_ctx *ctx, int argc, char **argv)
{
	const char *sub = argc > 1 ? argv[1] : NULL;
	int rc;

	if (sub == NULL)
		return cmd_usage("point: add, list, show or remove?");
	if (strcmp(sub, "--help") == 0 || strcmp(sub, "help") == 0) {
		printf("Usage: " PROG " point add BENCH NAME CHANGE...\n"
		    "       " PROG " point list BENCH[@SETUP] | FILE\n"
		    "       " PROG " point show BENCH[@SETUP] | FILE NAME\n"
		    "       " PROG " point remove BENCH NAME\n"
		    "A change is ID.KEY=VALUE, source.KEY=VALUE, -ID (taken out of the beam)\n"
		    "or +TYPE:ID@AFTER / +TYPE:ID@^BEFORE (put in; give its values as\n"
		    "ID.KEY=VALUE).  add and remove edit the draft.\n");
		return 0;
	}
	if (strcmp(sub, "add") == 0) {
		struct add_arg a;

		if (argc < 5)
			return cmd_usage(argc < 4 ? "point add: give BENCH NAME CHANGE..." :
			    "point add: point '%s' needs at least one change", argv[3]);
		a.name = argv[3];
		a.changes = argv + 4;
		a.n = (size_t)(argc - 4);
		if ((rc = edit(ctx, argv[2], add_fn, &a)) == 0)
			printf("bench '%s': point '%s' added (%zu change%s)\n", argv[2], argv[3],
			    a.n, a.n == 1 ? "" : "s");
		return rc;
	}
	if (strcmp(sub, "remove") == 0) {
		if (argc != 4)
			return cmd_usage("point remove: give BENCH NAME");
		if ((rc = edit(ctx, argv[2], remove_fn, argv[3])) == 0)
			printf("bench '%s': point '%s' removed\n", argv[2], argv[3]);
		return rc;
	}
	if (strcmp(sub, "list") == 0) {
		if (argc != 3)
			return cmd_usage("point list: give one BENCH or FILE");
		return list(ctx, argv[2], NULL);
	}
	if (strcmp(sub, "show") == 0) {
		if (argc != 4)
			return cmd_usage("point show: give BENCH NAME");
		return list(ctx, argv[2], argv[3]);
	}
	return cmd_usage("point: '%s' is not add, list, show or remove", sub);
}
