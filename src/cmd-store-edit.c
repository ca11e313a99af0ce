/* cmd-store-edit.c - place, set, lift and shift: the edits of a bench's
 * draft from the shell.  Each goes through core-edit (the same checks and
 * messages as bench files and the workbench) inside one write transaction
 * (store_draft_edit), so a refused edit stores nothing. */
#include <config.h>

#include <getopt.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "cmd-store.h"
#include "core-edit.h"
#include "util-err.h"

struct place_opts {
	struct edit_place pl;
	int               n;            /* how many of after/before/into */
};

enum { O_AFTER = 'A', O_BEFORE = 'B', O_INTO = 'I', O_FIRST = 'F', O_PART = 'P',
    O_BENCH = 'S', O_HELP = 'h' };

static const struct option edit_opts[] = {
	{ "after", required_argument, NULL, O_AFTER },
	{ "before", required_argument, NULL, O_BEFORE },
	{ "into", required_argument, NULL, O_INTO },
	{ "first", no_argument, NULL, O_FIRST },
	{ "part", required_argument, NULL, O_PART },
	{ "bench", no_argument, NULL, O_BENCH },
	{ "help", no_argument, NULL, O_HELP },
	{ NULL, 0, NULL, 0 },
};

/* Options common to the edit commands; returns the option, 0 when it was
 * a place option taken here, or -1 after a usage message. */
static int
place_opt(int ch, struct place_opts *po)
{
	switch (ch) {
	case O_AFTER:
		po->pl.after = optarg;
		po->n++;
		return 0;
	case O_BEFORE:
		po->pl.before = optarg;
		po->n++;
		return 0;
	case O_INTO:
		po->pl.into = optarg;
		po->n++;
		return 0;
	case O_FIRST:
		po->pl.at_start = 1;
		return 0;
	default:
		return ch;
	}
}

static int
place_check(const char *cmd, const struct place_opts *po)
{
	if (po->n > 1)
		return cmd_usage("%s: give one of --after, --before and --into", cmd);
	if (po->pl.at_start && po->pl.into == NULL)
		return cmd_usage("%s: --first goes with --into SPLITTER.PORT", cmd);
	return 0;
}

static int
unknown(const char *cmd, int argc, char **argv)
{
	return cmd_usage("%s: unknown option or missing value in '%s'", cmd,
	    optind - 1 < argc ? argv[optind - 1] : "?");
}

/* Runs fn on the draft of bench `name` in one transaction. */
static int
edit_draft(struct cmd_ctx *ctx, const char *name, store_edit_fn fn, void *arg)
{
	struct store *s = cmd_store_open_existing(ctx);
	char *cause = NULL;

	if (s == NULL)
		return 2;
	if (store_draft_edit(s, name, fn, arg, &cause) != 0) {
		if (cause != NULL && strncmp(cause, "bench '", 7) != 0 &&
		    strncmp(cause, "database", 8) != 0)
			cause_prefix(&cause, "bench '%s'", name);
		return cmd_store_fail(s, cause);
	}
	store_close(s);
	return 0;
}

/* ---- place ---- */

struct add_arg {
	struct store      *s;
	const char        *type, *id, *part;
	char *const       *kv;
	size_t             nkv;
	struct edit_place *pl;
};

static int
add_fn(struct bench *b, void *arg, char **cause)
{
	struct add_arg *a = arg;
	struct element el;
	enum elem_type t;

	if (a->part == NULL) {
		if (edit_element_new(&el, a->type, a->id, a->kv, a->nkv, cause) != 0)
			return -1;
		return edit_add(b, &el, a->pl, cause);
	}
	if (model_type_parse(a->type, &t) != 0)
		return fail_with(cause, "unknown type '%s' (space, mirror, lens, splitter, "
		    "window, filter, waveplate, polarizer, iris, dump, detector, target, isolator)", a->type);
	if (a->id[0] == '\0')
		return fail_with(cause, "a new %s needs an id", a->type);
	if (store_part_get(a->s, a->part, &el, cause) != 0)
		return -1;
	if (el.type != t) {
		fail_with(cause, "part '%s' is a %s, not a %s", a->part,
		    model_type_name(el.type), a->type);
		model_element_release(&el);
		return -1;
	}
	free(el.id);
	el.id = xstrdup(a->id);
	if (t == EL_SPLITTER && el.side_port == PORT_NONE)
		el.side_port = PORT_REFLECTED;
	/* The part's values first, then the pairs over them; both or neither. */
	if (edit_add(b, &el, a->pl, cause) != 0)
		return -1;
	return a->nkv > 0 ? edit_set_pairs(b, a->id, a->kv, a->nkv, cause) : 0;
}

int
cmd_place(struct cmd_ctx *ctx, int argc, char **argv)
{
	struct place_opts po = { { NULL, NULL, NULL, 0 }, 0 };
	struct add_arg a;
	char *cause = NULL;
	int ch;

	memset(&a, 0, sizeof a);
	cmd_getopt_reset();
	while ((ch = getopt_long(argc, argv, "", edit_opts, NULL)) != -1) {
		if ((ch = place_opt(ch, &po)) == 0)
			continue;
		if (ch == O_PART) {
			a.part = optarg;
		} else if (ch == O_HELP) {
			printf("Usage: " PROG " place BENCH TYPE ID [--part NAME] [KEY=VALUE...]\n"
			    "          [--after ID | --before ID | --into SPLITTER.PORT [--first]]\n"
			    "Puts an element into the draft: at the end of the main path, or where\n"
			    "the option says.  Values as in bench files, with units (focal=250 mm,\n"
			    "damage.fluence=10 J/cm^2, label=fold 1).  --part NAME starts from the\n"
			    "shelf part NAME (its type must be TYPE) and records part=NAME; the\n"
			    "pairs then override its values.  A splitter gets an empty reflected\n"
			    "branch unless side=transmitted.\n");
			return 0;
		} else {
			return unknown("place", argc, argv);
		}
	}
	if (place_check("place", &po) != 0)
		return 2;
	if (argc - optind < 3)
		return cmd_usage("place: give BENCH, TYPE and ID");
	a.type = argv[optind + 1];
	a.id = argv[optind + 2];
	a.kv = argv + optind + 3;
	a.nkv = (size_t)(argc - optind - 3);
	a.pl = &po.pl;
	if ((a.s = cmd_store_open_existing(ctx)) == NULL)
		return 2;
	if (store_draft_edit(a.s, argv[optind], add_fn, &a, &cause) != 0) {
		if (strncmp(cause, "bench '", 7) != 0 && strncmp(cause, "database", 8) != 0)
			cause_prefix(&cause, "bench '%s'", argv[optind]);
		return cmd_store_fail(a.s, cause);
	}
	store_close(a.s);
	printf("bench '%s': placed %s %s\n", argv[optind], a.type, a.id);
	return 0;
}

/* ---- set ---- */

struct set_arg {
	const char   *id;               /* NULL: bench settings */
	char *const  *kv;
	size_t        nkv;
};

static int
set_fn(struct bench *b, void *arg, char **cause)
{
	struct set_arg *a = arg;

	if (a->id != NULL)
		return edit_set_pairs(b, a->id, a->kv, a->nkv, cause);
	for (size_t i = 0; i < a->nkv; i++) {
		char *pair = xstrdup(a->kv[i]), *val = edit_split_pair(pair);
		int rc;

		if (val == NULL)
			rc = fail_with(cause, "'%s' is not KEY=VALUE", a->kv[i]);
		else if (strcmp(pair, "name") == 0)
			/* store_draft_edit renames the bench in the same transaction */
			rc = val[0] == '\0' ? fail_with(cause, "name: a bench needs a name") :
			    (free(b->name), b->name = xstrdup(val), 0);
		else
			rc = edit_set_bench(b, pair, val, cause);
		free(pair);
		if (rc != 0)
			return -1;
	}
	return 0;
}

int
cmd_set(struct cmd_ctx *ctx, int argc, char **argv)
{
	struct set_arg a = { NULL, NULL, 0 };
	int ch, bench = 0, first, rc;

	cmd_getopt_reset();
	while ((ch = getopt_long(argc, argv, "", edit_opts, NULL)) != -1) {
		if (ch == O_BENCH) {
			bench = 1;
		} else if (ch == O_HELP) {
			printf("Usage: " PROG " set BENCH ID KEY=VALUE...\n"
			    "       " PROG " set BENCH --bench KEY=VALUE...\n"
			    "Changes values of an element of the draft (every key of bench files,\n"
			    "damage.* included, and label, part, id, side), or with --bench the\n"
			    "bench's settings: name (renames the bench, its draft and every setup),\n"
			    "notes, safety_factor, air_breakdown, source.wavelength,\n"
			    "source.power, source.pulsed, source.pulse_energy, source.rep_rate,\n"
			    "source.pulse_width, source.shape, source.waist, source.waist_position,\n"
			    "source.m2, source.divergence (rad; M² follows), source.polarization.\n"
			    "An empty value unsets an optional key.\n"
			    "All pairs apply, or none.\n");
			return 0;
		} else {
			return unknown("set", argc, argv);
		}
	}
	first = optind + (bench ? 1 : 2);
	if (argc - optind < (bench ? 1 : 2))
		return cmd_usage(bench ? "set: which bench?" : "set: give BENCH and ID (or "
		    "--bench) and KEY=VALUE pairs");
	if (first >= argc)
		return cmd_usage("set: no KEY=VALUE given");
	a.id = bench ? NULL : argv[optind + 1];
	a.kv = argv + first;
	a.nkv = (size_t)(argc - first);
	rc = edit_draft(ctx, argv[optind], set_fn, &a);
	if (rc == 0)
		printf("bench '%s': set %zu %s on %s\n", argv[optind], a.nkv,
		    a.nkv == 1 ? "value" : "values", bench ? "the bench" : a.id);
	return rc;
}

/* ---- lift, shift ---- */

struct id_arg {
	const char        *id;
	struct edit_place *pl;
	size_t             removed;
};

static int
remove_fn(struct bench *b, void *arg, char **cause)
{
	struct id_arg *a = arg;
	size_t before = model_count(&b->path);

	if (edit_remove(b, a->id, cause) != 0)
		return -1;
	a->removed = before - model_count(&b->path);
	return 0;
}

int
cmd_lift(struct cmd_ctx *ctx, int argc, char **argv)
{
	struct id_arg a = { NULL, NULL, 0 };
	int rc;

	if (argc == 2 && strcmp(argv[1], "--help") == 0)
		return printf("Usage: " PROG " lift BENCH ID\n"
		    "Takes an element (with its side branch) out of the draft.\n"), 0;
	if (argc != 3)
		return cmd_usage("lift: give BENCH and ID");
	a.id = argv[2];
	rc = edit_draft(ctx, argv[1], remove_fn, &a);
	if (rc == 0) {
		if (a.removed > 1)
			printf("bench '%s': lifted %s and the %zu %s of its side branch\n",
			    argv[1], a.id, a.removed - 1, a.removed == 2 ? "element" : "elements");
		else
			printf("bench '%s': lifted %s\n", argv[1], a.id);
	}
	return rc;
}

static int
move_fn(struct bench *b, void *arg, char **cause)
{
	struct id_arg *a = arg;

	return edit_move(b, a->id, a->pl, cause);
}

int
cmd_shift(struct cmd_ctx *ctx, int argc, char **argv)
{
	struct place_opts po = { { NULL, NULL, NULL, 0 }, 0 };
	struct id_arg a = { NULL, NULL, 0 };
	int ch, rc;

	cmd_getopt_reset();
	while ((ch = getopt_long(argc, argv, "", edit_opts, NULL)) != -1) {
		if ((ch = place_opt(ch, &po)) == 0)
			continue;
		if (ch == O_HELP)
			return printf("Usage: " PROG " shift BENCH ID --after ID | --before ID |"
			    " --into SPLITTER.PORT [--first]\n"
			    "Puts an element (with its side branch) somewhere else in the "
			    "draft's chain.\n"), 0;
		return unknown("shift", argc, argv);
	}
	if (place_check("shift", &po) != 0)
		return 2;
	if (argc - optind != 2)
		return cmd_usage("shift: give BENCH and ID, and where (--after, --before or "
		    "--into)");
	if (po.n == 0)
		return cmd_usage("shift: where to? give --after ID, --before ID or --into "
		    "SPLITTER.PORT");
	a.id = argv[optind + 1];
	a.pl = &po.pl;
	rc = edit_draft(ctx, argv[optind], move_fn, &a);
	if (rc == 0)
		printf("bench '%s': shifted %s\n", argv[optind], a.id);
	return rc;
}
