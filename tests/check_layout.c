/* check_layout.c - the workbench's layout core: bars, percentages, text in
 * columns, column fitting, key hints, the chain as rows, value text, new
 * ids, the status line and the beam-profile plot.  Table-driven where the
 * cases are many; the demo bench is the fixture for the rest. */
#include <config.h>

#include <check.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "bench-demo.h"
#include "bench-file.h"
#include "core-edit.h"
#include "core-layout.h"
#include "core-point.h"
#include "core-trace.h"
#include "report.h"

#include "check-util.h"

static struct bench *
demo(void)
{
	char *cause = NULL;
	struct bench *b = bench_file_parse(bench_demo_text, strlen(bench_demo_text),
	    "demo", &cause);

	ck_assert_msg(b != NULL, "demo: %s", cause ? cause : "?");
	return b;
}

/* ---- bars ---- */

static const struct {
	double ratio, caution;
	int width, ascii;
	const char *want;
} bar_cases[] = {
	{ 0.5, NAN, 10, 1, "#####....." },
	{ 0.0, 0.5, 4, 1, "..|." },
	{ 1.09, 0.5, 10, 1, "#########>" },
	{ 1.0, 0.5, 10, 1, "##########" },
	{ 0.01, NAN, 10, 1, "#........." },          /* any load shows */
	{ NAN, 0.5, 5, 1, "     " },                  /* unrated: blank */
	{ 0.25, 0.5, 8, 1, "##..|..." },
	{ 0.55, NAN, 4, 0, "\u2588\u2588\u258e\u00b7" }, /* 17.6 eighths -> 2 + 2/8 */
	{ 2.0, NAN, 3, 0, "\u2588\u2588\u25b6" },
	{ 0.001, NAN, 3, 0, "\u258f\u00b7\u00b7" },
	{ -1, NAN, 3, 1, "..." },
};

START_TEST(test_bar)
{
	char buf[128];
	int cols = layout_bar(buf, sizeof buf, bar_cases[_i].ratio, bar_cases[_i].caution,
	    bar_cases[_i].width, bar_cases[_i].ascii);

	ck_assert_str_eq(buf, bar_cases[_i].want);
	ck_assert_int_eq(cols, bar_cases[_i].width);
	ck_assert_int_eq((int)utf8_cols(buf), bar_cases[_i].width);
}
END_TEST

static const struct { double r; const char *want; } pct_cases[] = {
	{ 0.158, "15.8 %" }, { 1.0934, "109 %" }, { 0.0065, "0.65 %" },
	{ 1e-7, "<0.01 %" }, { NAN, "-" }, { 0, "0 %" }, { 0.9999, "100 %" },
	{ 12.5, "1250 %" }, { 5000, "5e+05 %" },
};

START_TEST(test_percent)
{
	char buf[32];

	layout_percent(buf, sizeof buf, pct_cases[_i].r);
	ck_assert_str_eq(buf, pct_cases[_i].want);
}
END_TEST

static const struct { double wx, wy; int ascii; const char *want; } radius_cases[] = {
	{ 3e-3, 3e-3, 0, "3.00 mm" },
	{ 2.41e-3, 2.43e-3, 0, "2.41/2.43 mm" },
	{ 265e-6, 1.82e-3, 0, "265 \u00b5m/1.82 mm" },
	{ 265e-6, 1.82e-3, 1, "265 um/1.82 mm" },
};

START_TEST(test_radius_text)
{
	char buf[64];

	layout_radius_text(buf, sizeof buf, radius_cases[_i].wx, radius_cases[_i].wy,
	    radius_cases[_i].ascii);
	ck_assert_str_eq(buf, radius_cases[_i].want);
}
END_TEST

/* ---- text in columns ---- */

static const struct {
	const char *s;
	int cols, right, ascii;
	const char *want;
} fit_cases[] = {
	{ "M1", 5, 0, 0, "M1   " },
	{ "M1", 5, 1, 0, "   M1" },
	{ "cell entrance window", 8, 0, 1, "cell en~" },
	{ "cell entrance window", 8, 0, 0, "cell en\u2026" },
	{ "1.2 \u00b5m", 6, 1, 0, "1.2 \u00b5m" },          /* exact fit, 6 columns */
	{ "\u00b5\u00b5\u00b5\u00b5", 3, 0, 0, "\u00b5\u00b5\u2026" }, /* cut at code points */
	{ "abc", 0, 0, 0, "" },
	{ "", 2, 0, 0, "  " },
};

START_TEST(test_fit_text)
{
	char buf[64];

	layout_fit_text(buf, sizeof buf, fit_cases[_i].s, fit_cases[_i].cols,
	    fit_cases[_i].right ? LAYOUT_RIGHT : LAYOUT_LEFT, fit_cases[_i].ascii);
	ck_assert_str_eq(buf, fit_cases[_i].want);
	ck_assert_int_eq((int)utf8_cols(buf), fit_cases[_i].cols);
}
END_TEST

static const struct { const char *in, *want; } ascii_cases[] = {
	{ "1.2 \u00b5m", "1.2 um" }, { "10 J/cm\u00b2", "10 J/cm^2" },
	{ "linear 0\u00b0", "linear 0 deg" }, { "r1 \u2192 r2", "r1 -> r2" },
	{ "\u2588\u2588\u258e\u00b7", "##?." },        /* a partial block has no twin */
	{ "caf\u00e9", "caf?" }, { "plain", "plain" }, { "", "" },
};

START_TEST(test_ascii)
{
	char *s = layout_ascii(ascii_cases[_i].in);

	ck_assert_str_eq(s, ascii_cases[_i].want);
	for (const char *p = s; *p; p++)
		ck_assert_int_lt((unsigned char)*p, 128);
	free(s);
}
END_TEST

static const struct layout_col cols[] = {
	{ "element", 6, 12, 0 }, { "type", 9, 9, 3 }, { "power", 8, 8, 1 },
	{ "bar", 5, 12, 2 }, { "status", 7, 7, 0 }, { "flags", 5, -1, 4 },
};
#define NCOLS (sizeof cols / sizeof *cols)

static const struct { int width; int want[NCOLS]; int used; } colfit_cases[] = {
	/* everything at its wish, the flexible flags take the rest */
	{ 80, { 12, 9, 8, 12, 7, 27 }, 80 },
	/* all minima fit (45): keep every column, widen the most important */
	{ 50, { 11, 9, 8, 5, 7, 5 }, 50 },
	/* flags (4) and type (3) dropped: 6+8+5+7 + 3 gaps = 29, element widened */
	{ 32, { 9, 0, 8, 5, 7, 0 }, 32 },
	/* only prio 0 fits */
	{ 20, { 12, 0, 0, 0, 7, 0 }, 20 },
	/* nothing fits */
	{ 10, { 0, 0, 0, 0, 0, 0 }, -1 },
};

START_TEST(test_fit_columns)
{
	int w[NCOLS], used = layout_fit_columns(cols, NCOLS, colfit_cases[_i].width, 1, w);

	ck_assert_int_eq(used, colfit_cases[_i].used);
	for (size_t i = 0; i < NCOLS; i++)
		ck_assert_msg(w[i] == colfit_cases[_i].want[i], "column %zu: %d, want %d",
		    i, w[i], colfit_cases[_i].want[i]);
}
END_TEST

static const struct { const char *s; int width; const char *want; } wrap_cases[] = {
	{ "element 'L1': focal: bad", 12, "element|'L1': focal:|bad" },
	{ "short", 20, "short" },
	{ "abcdefghij", 4, "abcd|efgh|ij" },            /* a long word is cut */
	{ "one\ntwo three", 5, "one|two|three" },
	{ "", 5, "" },
	{ "\u00b5\u00b5\u00b5 \u00b5\u00b5", 3, "\u00b5\u00b5\u00b5|\u00b5\u00b5" },
};

START_TEST(test_wrap)
{
	size_t st[16], ln[16], n = layout_wrap(wrap_cases[_i].s, wrap_cases[_i].width, st, ln, 16);
	struct buf b;

	buf_init(&b);
	for (size_t i = 0; i < n; i++) {
		if (i > 0)
			buf_add(&b, "|");
		buf_addn(&b, wrap_cases[_i].s + st[i], ln[i]);
		ck_assert_int_le((int)ln[i], 4 * wrap_cases[_i].width);
	}
	ck_assert_str_eq(b.s, wrap_cases[_i].want);
	buf_release(&b);
}
END_TEST

/* ---- hints ---- */

/* Key, key sign, word; two blanks inside a task, " ┆ " between tasks. */
static const struct layout_hint hints[] = {
	{ "p", "place", 1, 1 }, { "l", "lift", 2, 1 }, { "Enter", "edit", 0, 2 },
	{ "z", "profile", 3, 3 }, { "?", "help", 0, 4 },
};

/* Widths by hand: p›place 7, l›lift 6, Enter›edit 10, z›profile 9,
 * ?›help 6; 2 inside a group, 3 across. */
static const struct { int width; const char *want; } hint_cases[] = {
	{ 80, "p\u203aplace  l\u203alift \u2506 Enter\u203aedit \u2506 z\u203aprofile \u2506 ?\u203ahelp" },
	{ 40, "p\u203aplace  l\u203alift \u2506 Enter\u203aedit \u2506 ?\u203ahelp" },   /* 37 */
	{ 36, "p\u203aplace \u2506 Enter\u203aedit \u2506 ?\u203ahelp" },               /* 29 */
	{ 30, "p\u203aplace \u2506 Enter\u203aedit \u2506 ?\u203ahelp" },
	{ 20, "Enter\u203aedit \u2506 ?\u203ahelp" },                                     /* 19 */
	{ 12, "Enter\u203aedit" },       /* not even prio 0 fits: from the right */
};

/* Of equal priority the rightmost goes first, one at a time. */
static const struct layout_hint tie_hints[] = {
	{ "p", "place", 1, 0 }, { "-", "undo", 1, 0 }, { "r", "record", 1, 1 },
	{ "?", "help", 0, 2 },
};

START_TEST(test_hints_ties)
{
	char *s = layout_hints_text(tie_hints, 4, 24);

	ck_assert_str_eq(s, "p\u203aplace  -\u203aundo \u2506 ?\u203ahelp");
	free(s);
}
END_TEST

/* A long word with a brief form gives way to it before its key is
 * dropped, and so does every other with one, once (core-layout.c's
 * table: "reflections" -> "ghosts", "tolerance" -> "odds").  Widths by
 * hand: p>place 7, f>reflections 13, t>tolerance 11, ?>help 6, briefs
 * f>ghosts 8, t>odds 6, q>list 6. */
static const struct layout_hint brief_hints[] = {
	{ "p", "place", 1, 0 }, { "q", "list", 3, 1 }, { "f", "reflections", 2, 2 },
	{ "t", "tolerance", 2, 2 }, { "?", "help", 0, 3 },
};
static const struct { int width; const char *want; } brief_cases[] = {
	/* all whole: 7+3+6+3+13+2+11+3+6 = 54 */
	{ 54, "p\u203aplace \u2506 q\u203alist \u2506 f\u203areflections  t\u203atolerance \u2506 ?\u203ahelp" },
	/* q goes first (prio 3, no brief): 45 */
	{ 53, "p\u203aplace \u2506 f\u203areflections  t\u203atolerance \u2506 ?\u203ahelp" },
	/* then t would go: both take their briefs instead, 35 */
	{ 44, "p\u203aplace \u2506 f\u203aghosts  t\u203aodds \u2506 ?\u203ahelp" },
	{ 35, "p\u203aplace \u2506 f\u203aghosts  t\u203aodds \u2506 ?\u203ahelp" },
	/* still too long: dropping goes on, t first, the briefs kept, 27 */
	{ 34, "p\u203aplace \u2506 f\u203aghosts \u2506 ?\u203ahelp" },
};

START_TEST(test_hints_brief)
{
	unsigned char shown[5];
	char *s = layout_hints_text(brief_hints, 5, brief_cases[_i].width);

	ck_assert_str_eq(s, brief_cases[_i].want);
	ck_assert_int_le((int)utf8_cols(s), brief_cases[_i].width);
	free(s);
	layout_hints_pick(brief_hints, 5, brief_cases[_i].width, shown);
	ck_assert_str_eq(layout_hint_word(&brief_hints[2], shown[2]),
	    brief_cases[_i].width >= 45 ? "reflections" : "ghosts");
	/* a word with no brief is its own whatever shown says */
	ck_assert_str_eq(layout_hint_word(&brief_hints[0], 2), "place");
}
END_TEST

START_TEST(test_hints)
{
	char *s = layout_hints_text(hints, sizeof hints / sizeof *hints, hint_cases[_i].width);

	ck_assert_str_eq(s, hint_cases[_i].want);
	ck_assert_int_le((int)utf8_cols(s), hint_cases[_i].width);
	free(s);
}
END_TEST

/* ---- the chain ---- */

START_TEST(test_chain_demo)
{
	struct bench *b = demo();
	struct trace *t = trace_run(b);
	struct layout_row *rows;
	size_t n = layout_chain(b, t, &rows), elems = 0, ports = 0;
	long i;

	for (size_t k = 0; k < n; k++) {
		if (rows[k].kind == LROW_PORT) {
			ports++;
			ck_assert_int_eq(rows[k].trace_row, -1);
			continue;
		}
		ck_assert_int_ge(rows[k].trace_row, 0);
		ck_assert_ptr_eq(t->rows[rows[k].trace_row].el, rows[k].el);
		ck_assert_uint_eq(t->rows[rows[k].trace_row].depth, rows[k].depth);
		elems++;
	}
	ck_assert_uint_eq(elems, model_count(&b->path));
	ck_assert_uint_eq(ports, 3);                 /* PBS1, POL1, BS1 */
	i = layout_chain_find(rows, n, "PBS1", 1);
	ck_assert_int_eq(i, layout_chain_find(rows, n, "PBS1", 0) + 1);
	ck_assert_str_eq(rows[i + 1].el->id, "S1r");
	ck_assert_uint_eq(rows[i + 1].depth, 1);
	ck_assert_ptr_eq(rows[i + 1].parent, rows[i].el);
	ck_assert_int_eq(layout_chain_find(rows, n, "nope", 0), -1);
	ck_assert_int_eq(layout_chain_find(rows, n, "M1", 1), -1);
	free(rows);
	trace_free(t);
	model_bench_free(b);
}
END_TEST

START_TEST(test_chain_empty_port)
{
	struct bench *b = demo();
	struct layout_row *rows;
	char *cause = NULL;
	size_t n;
	long i;

	/* an emptied side branch keeps its port row, so elements can go in */
	ck_assert_int_eq(edit_remove(b, "S4r", &cause), 0);
	n = layout_chain(b, NULL, &rows);
	i = layout_chain_find(rows, n, "POL1", 1);
	ck_assert_int_ge(i, 0);
	ck_assert_str_eq(rows[i + 1].el->id, "S5");
	ck_assert_uint_eq(rows[i + 1].depth, 0);
	free(rows);
	model_bench_free(b);
}
END_TEST

static const struct { int sel, top, vis, n, want; } scroll_cases[] = {
	{ 0, 0, 10, 30, 0 },
	{ 9, 0, 10, 30, 1 },         /* one row of context below */
	{ 29, 0, 10, 30, 20 },       /* the end stays full */
	{ 5, 10, 10, 30, 4 },        /* back up, one row above */
	{ 3, 0, 10, 5, 0 },          /* everything fits */
	{ 2, 0, 2, 30, 1 },          /* tiny: no margin */
	{ 40, 0, 10, 30, 20 },       /* clamped */
};

START_TEST(test_scroll)
{
	ck_assert_int_eq(layout_scroll(scroll_cases[_i].sel, scroll_cases[_i].top,
	    scroll_cases[_i].vis, scroll_cases[_i].n), scroll_cases[_i].want);
}
END_TEST

/* ---- values ---- */

static const struct { const char *id; const char *key; const char *want; } value_cases[] = {
	{ "L1", "focal", "200 mm" },
	{ "L1", "n2", "2.7e-16 cm\u00b2/W" },
	{ "L1", "index", "1.45" },
	{ "M1", "rs", "0.998" },
	{ "CL1", "axis", "x" },
	{ "PBS1", "polarizing", "true" },
	{ "W1", "damage.fluence", "1.2 J/cm\u00b2" },
	{ "W1", "damage.pulse_width", "5 ns" },
	{ "IR1", "diameter", "6 mm" },
	{ "M1", "roc", "" },                    /* absent, no default */
	{ "HWP1", "angle", "11.25" },
};

START_TEST(test_value_text)
{
	struct bench *b = demo();
	struct element *el = model_find(b, value_cases[_i].id, NULL, NULL, NULL);
	int k = model_key_find(value_cases[_i].key);
	char *s;

	ck_assert_ptr_nonnull(el);
	ck_assert_int_ge(k, 0);
	s = layout_value_text(el, (enum model_key)k);
	ck_assert_str_eq(s, value_cases[_i].want);
	free(s);
	model_bench_free(b);
}
END_TEST

/* Every value of the demo, shown and typed back, is the same double. */
static int
roundtrip_fn(struct element *el, struct element *parent, size_t depth, void *arg)
{
	(void)parent;
	(void)depth;
	(void)arg;
	for (int k = 0; k < K_COUNT; k++) {
		struct element copy;
		char *s, *cause = NULL;

		if (!model_has(el, (enum model_key)k))
			continue;
		s = layout_value_text(el, (enum model_key)k);
		model_element_copy(&copy, el);
		ck_assert_msg(model_set_text(&copy, (enum model_key)k, s, &cause) == 0,
		    "%s.%s '%s': %s", el->id, model_key_path((enum model_key)k), s, cause);
		ck_assert_msg(copy.val[k] == el->val[k], "%s.%s: '%s' reads back %.17g, not %.17g",
		    el->id, model_key_path((enum model_key)k), s, copy.val[k], el->val[k]);
		model_element_release(&copy);
		free(s);
	}
	return 0;
}

START_TEST(test_value_roundtrip)
{
	struct bench *b = demo();

	model_walk(&b->path, roundtrip_fn, NULL);
	model_bench_free(b);
}
END_TEST

START_TEST(test_bench_values)
{
	struct bench *b = demo(), *c;
	char *cause = NULL;

	for (const char *const *k = edit_bench_keys; *k != NULL; k++) {
		char *s = layout_bench_value_text(b, *k);

		ck_assert_str_ne(layout_bench_key_help(*k), "");
		/* typed back, the bench is unchanged */
		c = model_bench_dup(b);
		if (s[0] != '\0' || strcmp(*k, "notes") == 0)
			ck_assert_msg(edit_set_bench(c, *k, s, &cause) == 0, "%s '%s': %s",
			    *k, s, cause);
		ck_assert_msg(memcmp(&c->src, &b->src, sizeof b->src) == 0 ||
		    strcmp(*k, "source.power") == 0, "%s '%s' changed the source", *k, s);
		model_bench_free(c);
		free(s);
	}
	{
		char *s = layout_bench_value_text(b, "source.wavelength");

		ck_assert_str_eq(s, "1.064 \u00b5m");
		free(s);
		s = layout_bench_value_text(b, "source.waist");
		ck_assert_str_eq(s, "3 mm");
		free(s);
	}
	model_bench_free(b);
}
END_TEST

/* A bench with a valid source and nothing else: what "new bench" gives. */
static struct bench *
bare(void)
{
	struct bench *b = layout_bench_new("bare");
	char *cause = NULL;

	ck_assert_msg(model_validate(b, &cause) == 0, "%s", cause);
	ck_assert_str_eq(b->name, "bare");
	ck_assert_double_eq_tol(b->src.power, 1, 1e-12);
	ck_assert_uint_eq(b->path.n, 0);
	return b;
}

/* The required key is what makes a new element valid: in step with
 * core-validate, type by type. */
START_TEST(test_required_keys)
{
	static const char *const sample[K_COUNT] = {
		[K_LENGTH] = "100 mm", [K_FOCAL] = "100 mm", [K_REFLECTANCE] = "0.5",
		[K_RETARDANCE] = "0.5", [K_DIAMETER] = "5 mm", [K_ISOLATION] = "30",
	};
	enum elem_type ty = (enum elem_type)_i;
	struct bench *b = bare();
	struct element el;
	char *cause = NULL, *id = layout_new_id(b, ty);
	int k = layout_required_key(ty), rc;

	ck_assert_ptr_nonnull(id);
	/* without it: refused (when there is one) */
	ck_assert_int_eq(edit_element_new(&el, model_type_name(ty), id, NULL, 0, &cause), 0);
	rc = edit_add(b, &el, NULL, &cause);
	ck_assert_int_eq(rc, k >= 0 ? -1 : 0);
	free(cause);
	cause = NULL;
	if (k >= 0) {
		char *kv = NULL;

		ck_assert_ptr_nonnull(sample[k]);
		kv = malloc(strlen(model_key_path((enum model_key)k)) + strlen(sample[k]) + 2);
		strcpy(kv, model_key_path((enum model_key)k));
		strcat(kv, "=");
		strcat(kv, sample[k]);
		ck_assert_int_eq(edit_element_new(&el, model_type_name(ty), id, &kv, 1, &cause), 0);
		ck_assert_msg(edit_add(b, &el, NULL, &cause) == 0, "%s", cause);
		free(kv);
	}
	ck_assert_ptr_nonnull(model_find(b, id, NULL, NULL, NULL));
	ck_assert_str_ne(layout_type_help(ty), "");
	free(id);
	model_bench_free(b);
}
END_TEST

static const struct { enum elem_type t; const char *want; } id_cases[] = {
	{ EL_LENS, "L2" }, { EL_SPLITTER, "BS2" }, { EL_SPACE, "S11" },
	{ EL_MIRROR, "M2" }, { EL_TARGET, "T2" }, { EL_FILTER, "F1" },
	{ EL_POLARIZER, "POL2" }, { EL_WAVEPLATE, "WP1" },
};

START_TEST(test_new_id)
{
	struct bench *b = demo();
	char *id = layout_new_id(b, id_cases[_i].t);

	ck_assert_str_eq(id, id_cases[_i].want);
	free(id);
	model_bench_free(b);
}
END_TEST

START_TEST(test_fields)
{
	struct bench *b = demo();
	struct element *pbs = model_find(b, "PBS1", NULL, NULL, NULL);
	struct layout_field f[64];
	size_t n = layout_fields(pbs, f, 64), want = 4;
	char *v;

	for (int k = 0; k < K_COUNT; k++)
		if (model_key_applies((enum model_key)k, EL_SPLITTER))
			want++;
	ck_assert_uint_eq(n, want);
	ck_assert_int_eq(f[0].kind, LF_ID);
	ck_assert_int_eq(f[3].kind, LF_SIDE);
	v = layout_field_value(pbs, &f[3]);
	ck_assert_str_eq(v, "reflected");
	free(v);
	for (size_t i = 4; i < n; i++) {
		ck_assert_int_eq(f[i].kind, LF_KEY);
		ck_assert_int_eq(f[i].given, model_has(pbs, (enum model_key)f[i].key));
	}
	/* asking for fewer still counts them all */
	ck_assert_uint_eq(layout_fields(pbs, f, 2), want);
	model_bench_free(b);
}
END_TEST

/* ---- hazards and the margin line ---- */

/* The row of element id (borrowed); there must be one. */
static const struct trace_row *
row_ptr(const struct trace *t, const char *id)
{
	for (size_t i = 0; i < t->nrows; i++)
		if (strcmp(t->rows[i].el->id, id) == 0)
			return &t->rows[i];
	ck_abort_msg("no row %s", id);
	return NULL;
}

/* The demo's hazards, read off bench-demo.c by hand: W1 over its rating;
 * ND1 and PD1 at caution; the beam out of POL1's rejected port after S4r
 * unterminated; the focus in S9 sparks; POL1, IR1, BS1, CL1 and T1 have
 * no rating and take power.  (Self-focusing in L1 and W1 is the trace's
 * own warning, counted whatever its number.) */
START_TEST(test_hazards_demo)
{
	struct bench *b = demo();
	struct trace *t = trace_run(b);
	struct layout_hazard *h;
	size_t n = layout_hazards(t, &h), over = 0, caution = 0, unrated = 0, warn = 0;
	static const char *const unrated_ids[] = { "POL1", "IR1", "BS1", "CL1", "T1", "ISO1" };

	for (size_t i = 0; i < n; i++) {
		ck_assert_ptr_nonnull(h[i].el);
		if (h[i].kind == LH_OVER) {
			over++;
			ck_assert_str_eq(h[i].el->id, "W1");
		} else if (h[i].kind == LH_CAUTION) {
			caution++;
			ck_assert_msg(strcmp(h[i].el->id, "ND1") == 0 || strcmp(h[i].el->id, "PD1") == 0,
			    "caution %s", h[i].el->id);
		} else if (h[i].kind == LH_UNRATED) {
			int known = 0;

			unrated++;
			for (size_t k = 0; k < 6; k++)
				known |= strcmp(h[i].el->id, unrated_ids[k]) == 0;
			ck_assert_msg(known, "unrated %s", h[i].el->id);
			ck_assert_int_ne(h[i].el->type, EL_SPACE);
		} else {
			warn++;
			ck_assert_int_ge(h[i].row, 0);
			ck_assert_ptr_eq(t->rows[h[i].row].el, h[i].el);
		}
	}
	ck_assert_uint_eq(over, 1);
	ck_assert_uint_eq(caution, 2);
	/* T1 takes 693 mW unrated: the trace warns (unrated_absorber, over its
	 * 0.5 W level), so it is listed once, as that warning, not again here */
	ck_assert_uint_eq(unrated, 5);     /* ISO1, the demo's isolator, too */
	{
		int t1 = 0;

		for (size_t i = 0; i < n; i++)
			t1 |= h[i].kind == LH_WARNING && strcmp(h[i].el->id, "T1") == 0 &&
			    strcmp(trace_warn_name(h[i].warn->kind), "unrated_absorber") == 0;
		ck_assert_msg(t1, "T1's unrated_absorber warning is listed");
	}
	/* every warning of the trace is there, once, whatever its kind */
	ck_assert_uint_eq(warn, t->nwarn);
	for (size_t k = 0; k < t->nwarn; k++) {
		size_t seen = 0;

		for (size_t i = 0; i < n; i++)
			seen += h[i].warn == &t->warn[k];
		ck_assert_uint_eq(seen, 1);
	}
	free(h);
	trace_free(t);
	model_bench_free(b);
}
END_TEST

static const struct { double r; const char *want; } headroom_cases[] = {
	{ 0.5, "\u00d72" }, { 0.8, "\u00d71.25" }, { 1.25, "\u00d70.8" },
	{ 0.001, "\u00d71000" }, { 0, "\u00d7\u221e" }, { NAN, "-" },
};

START_TEST(test_headroom)
{
	char buf[32];

	/* headroom = 1 / ratio: the factor the power may still grow by */
	layout_headroom(buf, sizeof buf, headroom_cases[_i].r, 0);
	ck_assert_str_eq(buf, headroom_cases[_i].want);
}
END_TEST

START_TEST(test_margin_line)
{
	struct bench *b = demo();
	struct trace *t = trace_rerun_opts(NULL, b, TRACE_NO_GHOSTS);  /* main beam */
	char *s = layout_margin_line(t, 0, 400, "saved 12:00");
	char *a = layout_margin_line(t, 1, 400, NULL);
	char *n80 = layout_margin_line(t, 0, 80, "saved 12:00");
	char *cause = NULL;

	/* Where the pinned figures come from (this test checks their words;
	 * the engine is checked in check_trace): W1 is rated 1.2 J/cm² at
	 * 532 nm, 5 ns and sees the demo's 1064 nm, 8 ns pulses, so its limit
	 * is 1.2 × 1064/532 × √(8/5) = 3.0358 J/cm² (REFERENCE §10 rules, by
	 * hand); the trace's fluence there over that limit is the 109 %; the
	 * safe source power is the source's over SF × that ratio; 728 µW is
	 * the rejected beam that leaves after S4r. */
	CHECK_REL(row_ptr(t, "W1")->limits.fluence / 1e4, 1.2 * 2 * sqrt(1.6), 1e-12);
	CHECK_ABS(100 * row_ptr(t, "W1")->fluence / row_ptr(t, "W1")->limits.fluence, 109, 0.5);
	CHECK_REL(t->safe_source_power, b->src.power / (2 * t->worst_ratio), 1e-12);
	CHECK_ABS(t->safe_source_power, 0.914, 0.0005);
	CHECK_ABS(t->leaving, 728e-6, 0.5e-6);
	ck_assert_ptr_nonnull(strstr(s, "worst: W1 109 % OVER, headroom \u00d70.9"));
	ck_assert_ptr_nonnull(strstr(s, "safe source power 914 mW"));
	ck_assert_ptr_nonnull(strstr(s, " hazards: 1 over,"));
	ck_assert_ptr_nonnull(strstr(s, "1 unterminated"));
	ck_assert_ptr_nonnull(strstr(s, "1 spark"));
	ck_assert_ptr_nonnull(strstr(s, "2 caution"));
	ck_assert_ptr_nonnull(strstr(s, "6 unrated"));
	ck_assert_ptr_nonnull(strstr(s, "saved 12:00"));
	for (const char *p = a; *p; p++)
		ck_assert_int_lt((unsigned char)*p, 128);
	/* at 80 columns: worst, headroom, safe source power, the count, the time */
	ck_assert_int_le((int)utf8_cols(n80), 80);
	ck_assert_ptr_nonnull(strstr(n80, "W1 109 % OVER \u00d70.9"));
	ck_assert_ptr_nonnull(strstr(n80, "safe source power 914 mW"));
	ck_assert_ptr_nonnull(strstr(n80, "hazards"));
	ck_assert_ptr_nonnull(strstr(n80, "saved 12:00"));
	free(s);
	free(a);
	free(n80);
	trace_free(t);
	/* terminate the rejected beam: it is no longer a hazard */
	{
		struct element el;
		struct edit_place pl = { NULL, NULL, "POL1.rejected", 0 };

		ck_assert_int_eq(edit_element_new(&el, "dump", "BD9", NULL, 0, &cause), 0);
		ck_assert_int_eq(model_set_text(&el, K_MAX_POWER, "1 W", &cause), 0);
		ck_assert_int_eq(edit_add(b, &el, &pl, &cause), 0);
	}
	t = trace_run(b);
	s = layout_margin_line(t, 0, 400, NULL);
	ck_assert_ptr_null(strstr(s, "unterminated"));
	free(s);
	trace_free(t);
	model_bench_free(b);
}
END_TEST

START_TEST(test_margin_unrated)
{
	struct bench *b = bare();
	struct trace *t = trace_run(b);
	char *s = layout_margin_line(t, 1, 400, NULL);

	ck_assert_ptr_nonnull(strstr(s, "worst: nothing rated"));
	ck_assert_ptr_nonnull(strstr(s, "safe source power: no ratings"));
	ck_assert_ptr_nonnull(strstr(s, "1 hazard: 1 unterminated"));
	free(s);
	trace_free(t);
	model_bench_free(b);
}
END_TEST

/* Issue 9.2: a dump without max_power taking power is a hazard, and its
 * hint names max_power, not the damage.* keys. */
START_TEST(test_unrated_dump)
{
	struct bench *b = bare();
	struct element el;
	struct edit_place pl = { NULL, NULL, NULL, 0 };
	char *cause = NULL, *s, *hint;
	struct trace *t;
	struct layout_hazard *h;
	size_t n, unrated = 0;

	ck_assert_int_eq(edit_element_new(&el, "space", "S1", NULL, 0, &cause), 0);
	ck_assert_int_eq(model_set_text(&el, K_LENGTH, "100 mm", &cause), 0);
	ck_assert_int_eq(edit_add(b, &el, &pl, &cause), 0);
	ck_assert_int_eq(edit_element_new(&el, "dump", "BD1", NULL, 0, &cause), 0);
	ck_assert_int_eq(edit_add(b, &el, &pl, &cause), 0);
	t = trace_run(b);
	n = layout_hazards(t, &h);
	for (size_t i = 0; i < n; i++)
		if (strcmp(layout_hazard_word(&h[i]), "unrated") == 0) {
			unrated++;
			ck_assert_str_eq(h[i].el->id, "BD1");
		}
	ck_assert_uint_eq(unrated, 1);      /* once, though the trace warns too */
	s = layout_margin_line(t, 0, 400, NULL);
	ck_assert_ptr_nonnull(strstr(s, "1 hazard: 1 unrated"));
	ck_assert_ptr_null(strstr(s, "no hazards"));
	hint = layout_rating_hint(EL_DUMP, 0);
	ck_assert_ptr_nonnull(strstr(hint, "max_power"));
	ck_assert_ptr_null(strstr(hint, "damage."));
	ck_assert_int_eq(layout_row_hazard(t, 1), 1);
	ck_assert_int_eq(layout_row_hazard(t, 0), 0);
	ck_assert_str_eq(layout_row_status_word(&t->rows[0]), "n/a");
	ck_assert_str_eq(layout_row_status_word(&t->rows[1]), "unrated");
	free(hint);
	free(s);
	free(h);
	trace_free(t);
	model_bench_free(b);
}
END_TEST

/* Issue 9.4, the demo's W1: rated 1.2 J/cm² at 532 nm and 5 ns, run at
 * 1064 nm and 8 ns.  By hand, with the scaling rules of DEVELOPERS.md
 * (threshold × λ/λ_spec, fluence × √(τ/τ_spec); rules of thumb, common
 * practice, no source): λ factor 1064/532 = 2, τ factor √(8/5) = 1.26491,
 * limit 1.2 × 2 × 1.26491 = 3.03579 J/cm² = 30357.9 J/m², caution at
 * half of it (safety factor 2). */
START_TEST(test_derivation)
{
	struct bench *b = demo();
	struct trace *t = trace_run(b);
	struct layout_derivation d;
	char *s;
	const struct trace_row *w1 = NULL, *nd1 = NULL;

	for (size_t i = 0; i < t->nrows; i++) {
		if (strcmp(t->rows[i].el->id, "W1") == 0)
			w1 = &t->rows[i];
		if (strcmp(t->rows[i].el->id, "ND1") == 0)
			nd1 = &t->rows[i];
	}
	ck_assert_int_eq(layout_derive(w1, b, &d), 0);
	ck_assert_int_eq(d.metric, LD_FLUENCE);
	ck_assert_int_eq(d.key, K_DMG_FLUENCE);
	ck_assert_double_eq_tol(d.rating, 1.2e4, 1e-6);
	ck_assert_double_eq_tol(d.lambda_factor, 2.0, 1e-12);
	ck_assert_double_eq_tol(d.tau_factor, 1.2649111, 1e-6);
	ck_assert_double_eq_tol(d.limit, 30357.9, 0.1);
	ck_assert_double_eq_tol(d.caution_level, 15178.9, 0.1);
	s = layout_derivation_text(w1, b, 0);
	ck_assert_ptr_nonnull(strstr(s, "fluence 1.20 J/cm\u00b2 \u00d7 2 \u03bb \u00d7 1.26 \u03c4 = "
	    "3.04 J/cm\u00b2 limit"));
	ck_assert_ptr_nonnull(strstr(s, "\u00f7 2 = 1.52 J/cm\u00b2 caution"));
	free(s);
	/* ND1: max_absorbed 1 W, a power rating, never scaled */
	ck_assert_int_eq(layout_derive(nd1, b, &d), 0);
	ck_assert_int_eq(d.metric, LD_MAX_ABSORBED);
	ck_assert_double_eq_tol(d.lambda_factor, 1, 1e-12);
	ck_assert_double_eq_tol(d.limit, 1, 1e-12);
	s = layout_derivation_text(nd1, b, 1);
	ck_assert_ptr_null(strstr(s, "lambda"));
	free(s);
	/* a space: nothing to derive */
	ck_assert_int_eq(layout_derive(&t->rows[0], b, &d), -1);
	ck_assert_ptr_null(layout_derivation_text(&t->rows[0], b, 0));
	trace_free(t);
	model_bench_free(b);
}
END_TEST

/* Issue 9.4 in the CLI's forms: the table writes the derivation under a
 * row at caution or over, the JSON gives the factors (values by hand as
 * in test_derivation: λ 1064/532 = 2, τ √(8/5) = 1.264911064). */
START_TEST(test_derivation_reports)
{
	struct bench *b = demo();
	struct trace *t = trace_run(b);
	struct report_opts o = { 0, 0, NULL, 0 };
	char *table = report_table(t, &o), *json = report_json(t);
	const char *w1 = strstr(table, "\nW1 "), *why;

	ck_assert_ptr_nonnull(w1);
	why = strchr(w1 + 1, '\n');
	ck_assert_ptr_nonnull(why);
	ck_assert_msg(strncmp(why + 1, "  \u2514 why: fluence 1.20 J/cm\u00b2 \u00d7 2 \u03bb \u00d7 1.26 \u03c4 "
	    "= 3.04 J/cm\u00b2 limit", 40) == 0, "under W1: %.80s", why + 1);
	/* a row at ok gets no note */
	ck_assert_int_eq(strncmp(strchr(strstr(table, "\nHWP1 ") + 1, '\n') + 1, "S1 ", 3), 0);
	/* one percent form: the workbench's */
	ck_assert_ptr_nonnull(strstr(table, "Worst: W1 at 109 % of its limit (OVER)"));
	ck_assert_ptr_nonnull(strstr(json, "\"rating_key\": \"damage.fluence\", \"rating\": 12000, "
	    "\"wavelength_factor\": 2, \"pulse_factor\": 1.264911064"));
	ck_assert_ptr_nonnull(strstr(json, "\"limit_derivation\": null"));
	free(table);
	free(json);
	trace_free(t);
	model_bench_free(b);
}
END_TEST

/* Issue 9.6: what placing asks for, type by type. */
START_TEST(test_place_keys)
{
	int k[8];

	ck_assert_uint_eq(layout_place_keys(EL_MIRROR, 1, k, 8), 3);
	ck_assert_int_eq(k[0], K_AOI);
	ck_assert_int_eq(k[1], K_DMG_FLUENCE);
	ck_assert_int_eq(k[2], K_DMG_PULSE_WIDTH);
	ck_assert_uint_eq(layout_place_keys(EL_FILTER, 0, k, 8), 3);
	ck_assert_int_eq(k[0], K_OD);
	ck_assert_int_eq(k[1], K_MAX_ABSORBED);
	ck_assert_int_eq(k[2], K_DMG_CW_IRRADIANCE);
	ck_assert_uint_eq(layout_place_keys(EL_DUMP, 0, k, 8), 1);
	ck_assert_int_eq(k[0], K_MAX_POWER);
	ck_assert_uint_eq(layout_place_keys(EL_DETECTOR, 1, k, 8), 1);
	ck_assert_int_eq(k[0], K_MAX_POWER);
	ck_assert_uint_eq(layout_place_keys(EL_SPACE, 1, k, 8), 1);
	ck_assert_int_eq(k[0], K_LENGTH);
	ck_assert_uint_eq(layout_place_keys(EL_LENS, 0, k, 8), 2);
	ck_assert_int_eq(k[0], K_FOCAL);
	/* every key asked is one the type takes */
	for (int t = 0; t < EL_NTYPES; t++) {
		size_t n = layout_place_keys((enum elem_type)t, t % 2, k, 8);

		for (size_t i = 0; i < n; i++)
			ck_assert_msg(model_key_applies((enum model_key)k[i], (enum elem_type)t),
			    "%s does not take %s", model_type_name((enum elem_type)t),
			    model_key_path((enum model_key)k[i]));
	}
}
END_TEST

/* Issue 9.17: a hint says what the value is: a unit for a quantity, a
 * range for a plain number, no unit talk for a fraction. */
START_TEST(test_key_hints)
{
	char *r = layout_key_hint(K_REFLECTANCE), *l = layout_key_hint(K_LENGTH);
	char *a = layout_key_hint(K_AOI), *od = layout_key_hint(K_OD);
	enum layout_key_group g;

	ck_assert_ptr_nonnull(strstr(r, "fraction, 0 to 1"));
	ck_assert_ptr_null(strstr(r, "unit"));
	ck_assert_ptr_nonnull(strstr(l, "unit"));
	ck_assert_ptr_nonnull(strstr(a, "degrees, 0 to 90"));
	ck_assert_ptr_null(strstr(od, "unit"));
	ck_assert_str_eq(layout_key_label(K_DMG_CW_IRRADIANCE, &g), "CW irradiance");
	ck_assert_str_eq(layout_group_name(g), "Damage rating");
	ck_assert_str_eq(layout_bench_key_label("source.waist_position", &g), "waist position");
	ck_assert_str_eq(layout_group_name(g), "Source");
	free(r);
	free(l);
	free(a);
	free(od);
}
END_TEST

/* Issue 9.5: IEC 60825-1's visible band, 400-700 nm (from memory). */
START_TEST(test_visibility)
{
	struct bench *b = demo();
	char *s = layout_caution_line(b, 0, 200), *n = layout_caution_line(b, 0, 80);

	ck_assert_str_eq(layout_visibility(532e-9), "visible");
	ck_assert_str_eq(layout_visibility(1064e-9), "invisible (IR)");
	ck_assert_str_eq(layout_visibility(355e-9), "invisible (UV)");
	ck_assert_ptr_nonnull(strstr(s, "design estimate, not a safety assessment"));
	ck_assert_ptr_nonnull(strstr(s, "1.064 \u00b5m beam: invisible (IR)"));
	ck_assert_int_le((int)utf8_cols(n), 80);
	ck_assert_ptr_nonnull(strstr(n, "invisible (IR)"));
	free(s);
	free(n);
	model_bench_free(b);
}
END_TEST

/* The header's parts: the droppable ones go first, the rest stay. */
START_TEST(test_join_fit)
{
	static const char *const parts[] = { "1.064 \u00b5m 2.00 W", "demo", "draft = #1", "29 elements" };
	static const int prio[] = { 0, 0, 0, 1 };
	char *all = layout_join_fit(parts, prio, 4, " > ", 80);
	char *cut = layout_join_fit(parts, prio, 4, " > ", 40);
	char *tiny = layout_join_fit(parts, prio, 4, " > ", 5);

	ck_assert_str_eq(all, "1.064 \u00b5m 2.00 W > demo > draft = #1 > 29 elements");
	ck_assert_str_eq(cut, "1.064 \u00b5m 2.00 W > demo > draft = #1");   /* 36 columns */
	ck_assert_str_eq(tiny, cut);        /* prio 0 is never dropped */
	free(all);
	free(cut);
	free(tiny);
}
END_TEST

/* At every width from 80 up the margin line fits and keeps its words. */
START_TEST(test_margin_widths)
{
	struct bench *b = demo();
	struct trace *t = trace_rerun_opts(NULL, b, TRACE_NO_GHOSTS);  /* main beam */

	for (int w = 80; w <= 200; w++) {
		char *s = layout_margin_line(t, 0, w, "saved 12:34");

		ck_assert_msg((int)utf8_cols(s) <= w, "%d columns: %s", w, s);
		ck_assert_ptr_nonnull(strstr(s, "W1 109 % OVER"));
		ck_assert_ptr_nonnull(strstr(s, "safe source power 914 mW"));
		ck_assert_ptr_nonnull(strstr(s, "hazards"));
		free(s);
	}
	trace_free(t);
	model_bench_free(b);
}
END_TEST

/* Issue 9.13: ids under the profile's axis never overlap. */
START_TEST(test_place_labels)
{
	int col[3], len[3], at[3];

	/* two marks at the same z: side by side */
	col[0] = col[1] = 10;
	len[0] = len[1] = 2;
	ck_assert_int_eq(layout_place_labels(col, len, 2, -1, 40, at), 2);
	ck_assert_int_eq(at[0], 10);
	ck_assert_int_eq(at[1], 13);
	/* the selected one keeps its place, the other steps over it */
	col[0] = col[1] = 5;
	col[2] = 30;
	len[0] = len[1] = len[2] = 3;
	ck_assert_int_eq(layout_place_labels(col, len, 3, 1, 40, at), 3);
	ck_assert_int_eq(at[1], 5);
	ck_assert_int_eq(at[0], 9);
	ck_assert_int_eq(at[2], 30);
	/* at the right edge: pulled in; no room at all: left out */
	col[0] = 38;
	len[0] = 4;
	ck_assert_int_eq(layout_place_labels(col, len, 1, -1, 40, at), 1);
	ck_assert_int_eq(at[0], 36);
	col[0] = 36;
	col[1] = 37;
	len[0] = len[1] = 4;
	ck_assert_int_eq(layout_place_labels(col, len, 2, -1, 40, at), 1);
	ck_assert_int_eq(at[1], -1);
	/* no two placed labels share a column */
	{
		int c[6] = { 0, 0, 0, 2, 2, 9 }, l[6] = { 3, 3, 3, 2, 2, 4 }, x[6];

		layout_place_labels(c, l, 6, 2, 20, x);
		for (int i = 0; i < 6; i++)
			for (int j = 0; j < 6; j++)
				if (i != j && x[i] >= 0 && x[j] >= 0)
					ck_assert_msg(x[i] + l[i] <= x[j] || x[j] + l[j] <= x[i],
					    "labels %d and %d overlap", i, j);
	}
}
END_TEST

/* ---- profile ---- */

static size_t
row_of(const struct trace *t, const char *id)
{
	for (size_t i = 0; i < t->nrows; i++)
		if (strcmp(t->rows[i].el->id, id) == 0)
			return i;
	ck_abort_msg("no row %s", id);
	return 0;
}

START_TEST(test_profile_path)
{
	static const char *const want[] = {
		"S0", "ISO1", "HWP1", "S1", "PBS1", "S2", "M1", "S3", "ND1", "S4", "POL1", "S5",
		"CM1", "S6", "IR1", "S7", "BS1", "S7r", "CL1", "S8r", "PD1",
	};
	struct bench *b = demo();
	struct trace *t = trace_run(b);
	size_t *idx, n = layout_profile_path(t, row_of(t, "CL1"), &idx);

	ck_assert_uint_eq(n, sizeof want / sizeof *want);
	for (size_t i = 0; i < n; i++)
		ck_assert_str_eq(t->rows[idx[i]].el->id, want[i]);
	free(idx);
	/* a main-path element: the whole main path, no side rows */
	n = layout_profile_path(t, row_of(t, "L1"), &idx);
	for (size_t i = 0; i < n; i++)
		ck_assert_uint_eq(t->rows[idx[i]].depth, 0);
	ck_assert_str_eq(t->rows[idx[n - 1]].el->id, "T1");
	free(idx);
	trace_free(t);
	model_bench_free(b);
}
END_TEST

START_TEST(test_profile_plot)
{
	struct bench *b = demo();
	struct trace *t = trace_run(b);
	size_t *idx, n = layout_profile_path(t, row_of(t, "W1"), &idx), foci = 0;
	struct layout_plot p;
	int focus_col = -1, min_row_col = -1, min_row = 99;

	ck_assert_int_eq(layout_profile(t, idx, n, row_of(t, "W1"), 60, 10, 4, &p), 0);
	ck_assert_double_eq_tol(p.z0, 0, 1e-12);
	/* the plot ends at T1, the path's end: the sum of the demo's gaps
	 * and glass (the demo file), 1.77 m by hand */
	ck_assert_double_eq_tol(row_ptr(t, "T1")->z, 1.77, 1e-9);
	ck_assert_double_eq_tol(p.z1, 1.77, 1e-9);
	ck_assert_double_ge(p.rmax, 3.01e-3);
	ck_assert_double_le(p.rmax, 5e-3);
	ck_assert_double_ge(p.pmax, 2.0);
	ck_assert_int_eq(p.sel_col, layout_map_col(row_ptr(t, "W1")->z, 0, 1.77, 60));
	for (size_t i = 0; i < p.nmark; i++)
		if (p.mark[i].focus) {
			foci++;
			focus_col = p.mark[i].col;
		}
	ck_assert_uint_eq(foci, 1);
	/* the one focus is the lens focus in S9, where the trace puts it */
	ck_assert(row_ptr(t, "S9")->has_focus);
	ck_assert_int_eq(focus_col, layout_map_col(row_ptr(t, "S9")->focus.z, 0, 1.77, 60));
	/* every column has both radii in the radius band and power below */
	for (int c = 0; c < 60; c++) {
		int x = 0, y = 0, pw = 0;

		for (int r = 0; r < 10; r++) {
			unsigned char g = p.cell[r * 60 + c];

			x |= g == LG_WX || g == LG_WXY || g == LG_FOCUS;
			y |= g == LG_WY || g == LG_WXY || g == LG_FOCUS;
			if ((g == LG_WX || g == LG_WXY) && r > 0 && c > 0 && c < 59) {
				/* the beam is lowest (closest to r = 0) near the focus */
				int lowest = r;

				for (int rr = r + 1; rr < 10; rr++)
					if (p.cell[rr * 60 + c] == LG_WX || p.cell[rr * 60 + c] == LG_WXY)
						lowest = rr;
				if (9 - lowest < min_row) {
					min_row = 9 - lowest;
					min_row_col = c;
				}
			}
		}
		for (int r = 10; r < 14; r++)
			pw |= p.cell[r * 60 + c] == LG_POWER;
		ck_assert_msg(x && y, "column %d lacks a radius", c);
		ck_assert_msg(pw, "column %d lacks the power", c);
	}
	ck_assert_int_ge(focus_col, min_row_col - 3);
	ck_assert_int_le(focus_col, min_row_col + 6);
	/* power: full scale at the source, lower at the end */
	ck_assert_int_eq(p.cell[(10 + 0) * 60 + 0] == LG_POWER ||
	    p.cell[(10 + 1) * 60 + 0] == LG_POWER, 1);
	layout_plot_release(&p);
	ck_assert_int_eq(layout_profile(t, idx, n, (size_t)-1, 1, 10, 4, &p), -1);
	layout_plot_release(&p);
	free(idx);
	trace_free(t);
	model_bench_free(b);
}
END_TEST

/* The band: symmetric about the middle row, as wide as the x radius. */
START_TEST(test_profile_band)
{
	struct bench *b = demo();
	struct trace *t = trace_run(b);
	size_t *idx, n = layout_profile_path(t, row_of(t, "W1"), &idx);
	struct layout_plot p;
	int mid = (11 - 1) / 2, half = 0;

	ck_assert_int_eq(layout_profile_band(t, idx, n, (size_t)-1, 60, 11, 4, &p), 0);
	for (int c = 0; c < 60; c++) {
		ck_assert_msg(p.cell[mid * 60 + c] == LG_WX || p.cell[mid * 60 + c] == LG_FOCUS,
		    "column %d: no beam on the axis", c);
		for (int d = 1; d <= mid; d++)
			ck_assert_int_eq(p.cell[(mid - d) * 60 + c] == LG_WX,
			    p.cell[(mid + d) * 60 + c] == LG_WX);
	}
	/* at the source the radius is 3.00 mm (demo: waist 3 mm, z_R of
	 * π·(3 mm)²/(1.3·1064 nm) ≈ 20 m, so it has not grown): half-height
	 * 3 mm / rmax × 5 rows, rounded */
	for (int d = 0; d <= mid; d++)
		if (p.cell[(mid - d) * 60 + 0] == LG_WX)
			half = d;
	ck_assert_int_eq(half, (int)floor(3e-3 / p.rmax * mid + 0.5));
	layout_plot_release(&p);
	free(idx);
	trace_free(t);
	model_bench_free(b);
}
END_TEST

static const struct { double x, want; } nice_cases[] = {
	{ 3.01e-3, 5e-3 }, { 2.1, 2.5 }, { 1, 1 }, { 0, 0 }, { 7.2, 10 },
	{ 0.0011, 0.002 }, { 250, 250 },
};

START_TEST(test_nice_ceil)
{
	ck_assert_double_eq_tol(layout_nice_ceil(nice_cases[_i].x), nice_cases[_i].want,
	    nice_cases[_i].want * 1e-12 + 1e-300);
}
END_TEST

static const struct { double lo, hi; size_t maxn; size_t n; double first, last; } tick_cases[] = {
	{ 0, 1.77, 6, 4, 0, 1.5 },          /* step 0.5 */
	{ 0, 1.77, 10, 9, 0, 1.6 },         /* step 0.2 */
	{ 0.4, 1.5, 12, 12, 0.4, 1.5 },     /* step 0.1 */
	{ 0, 0, 5, 0, 0, 0 },
	{ -1, 1, 3, 3, -1, 1 },
};

START_TEST(test_ticks)
{
	double v[16];
	size_t n = layout_ticks(tick_cases[_i].lo, tick_cases[_i].hi, tick_cases[_i].maxn, v);

	ck_assert_uint_eq(n, tick_cases[_i].n);
	ck_assert_uint_le(n, tick_cases[_i].maxn);
	if (n > 0) {
		ck_assert_double_eq_tol(v[0], tick_cases[_i].first, 1e-9);
		ck_assert_double_eq_tol(v[n - 1], tick_cases[_i].last, 1e-9);
	}
}
END_TEST

static const struct { double z, z0, z1; int w, want; } map_cases[] = {
	{ 0, 0, 1, 10, 0 }, { 1, 0, 1, 10, 9 }, { 0.55, 0, 1, 10, 5 },
	{ -3, 0, 1, 10, 0 }, { 5, 0, 1, 10, 9 }, { 1, 1, 1, 10, 0 },
};

START_TEST(test_map_col)
{
	ck_assert_int_eq(layout_map_col(map_cases[_i].z, map_cases[_i].z0, map_cases[_i].z1,
	    map_cases[_i].w), map_cases[_i].want);
}
END_TEST

/* ---- operating points on the frame and in the chain ---- */

static void
add_point(struct bench *b, const char *name, const char *change)
{
	char *cause = NULL, *ch[1];

	ch[0] = (char *)change;
	ck_assert_msg(point_edit_add(b, name, ch, 1, &cause) == 0, "%s: %s", name,
	    cause ? cause : "?");
}

START_TEST(test_bench_key_hint_examples)
{
	char *t = layout_bench_key_hint("source.wavelength");

	/* a wavelength's example is a wavelength, not a waist size */
	ck_assert_str_eq(t, "with its unit, e.g. \"532 nm\"");
	free(t);
	t = layout_bench_key_hint("source.waist");
	ck_assert_str_eq(t, "with its unit, e.g. \"3 mm\"");
	free(t);
}
END_TEST

START_TEST(test_point_cycle)
{
	struct bench *b = demo();
	char *t;

	/* no points: the base only, and nothing to say */
	ck_assert_int_eq(layout_point_next(b, -1), -1);
	ck_assert_ptr_null(layout_point_words(b, -1));
	add_point(b, "alignment", "source.power=20 mW");
	add_point(b, "full", "source.pulse_energy=600 mJ");
	/* base first, then each point in its order, then the base again */
	ck_assert_int_eq(layout_point_next(b, -1), 0);
	ck_assert_int_eq(layout_point_next(b, 0), 1);
	ck_assert_int_eq(layout_point_next(b, 1), -1);
	t = layout_point_words(b, -1);
	ck_assert_str_eq(t, "base (O: 2 points)");
	free(t);
	t = layout_point_words(b, 1);
	ck_assert_str_eq(t, "point full 2/2");
	free(t);
	model_bench_free(b);
}
END_TEST

static double
s0_length(const struct bench *b)
{
	const struct element *el = model_find((struct bench *)b, "S0", NULL, NULL, NULL);

	ck_assert_ptr_nonnull(el);
	return model_get(el, K_LENGTH);
}

START_TEST(test_point_override)
{
	struct bench *b = demo();
	struct point *pt;
	struct bench *ap;
	char *cause = NULL;
	double base_len = s0_length(b);

	add_point(b, "half", "source.power=1 W");
	/* the same key again: replaced where it stands, not added */
	ck_assert_int_eq(layout_point_override(b, "half", NULL, "source.power", "500 mW", &cause),
	    0);
	pt = point_list_find(&b->points, "half");
	ck_assert_uint_eq(pt->n, 1);
	ck_assert_str_eq(pt->change[0], "source.power=500 mW");
	/* an element's value: added after it; the base keeps its own */
	ck_assert_int_eq(layout_point_override(b, "half", "S0", "length", "250 mm", &cause), 0);
	pt = point_list_find(&b->points, "half");
	ck_assert_uint_eq(pt->n, 2);
	ck_assert_str_eq(pt->change[1], "S0.length=250 mm");
	ck_assert(s0_length(b) == base_len);
	ap = point_apply(b, pt, &cause);
	ck_assert_ptr_nonnull(ap);
	ck_assert(fabs(s0_length(ap) - 0.25) < 1e-12);
	model_bench_free(ap);
	/* refused: the point as it was, with the reason */
	ck_assert_int_eq(layout_point_override(b, "half", "S0", "length", "banana", &cause), -1);
	ck_assert_ptr_nonnull(cause);
	free(cause);
	cause = NULL;
	ck_assert_int_eq(layout_point_override(b, "half", "NOPE", "length", "1 mm", &cause), -1);
	free(cause);
	cause = NULL;
	/* the safety factor is the bench's, never a point's */
	ck_assert_int_eq(layout_point_override(b, "half", NULL, "safety_factor", "3", &cause), -1);
	ck_assert(strstr(cause, "safety_factor") != NULL);
	free(cause);
	cause = NULL;
	pt = point_list_find(&b->points, "half");
	ck_assert_uint_eq(pt->n, 2);
	ck_assert_str_eq(pt->change[0], "source.power=500 mW");
	ck_assert_str_eq(pt->change[1], "S0.length=250 mm");
	ck_assert_int_eq(layout_point_override(b, "none", "S0", "length", "1 mm", &cause), -1);
	ck_assert(strstr(cause, "none") != NULL);
	free(cause);
	model_bench_free(b);
}
END_TEST

START_TEST(test_survey_find)
{
	struct bench *b = demo();
	struct point_survey sv;
	char *cause = NULL;
	long j;

	add_point(b, "full", "source.pulse_energy=600 mJ");
	ck_assert_int_eq(point_survey_run(b, NULL, &sv, &cause), 0);
	j = layout_survey_find(&sv, "W1");
	ck_assert_int_ge(j, 0);
	ck_assert_str_eq(sv.el[j].id, "W1");
	ck_assert_int_eq(layout_survey_find(&sv, "NOPE"), -1);
	/* W1's worst is at 'full': three times the pulse energy (200 -> 600 mJ)
	 * on the same spot is three times the fluence, so three times the
	 * ratio (fluence = E / area is linear in E; hand derivation, a
	 * self-consistency check) */
	ck_assert_uint_eq(sv.el[j].at, 1);
	ck_assert_str_eq(sv.pt[sv.el[j].at].name, "full");
	ck_assert(fabs(sv.el[j].ratio / sv.ratio[0 * sv.nel + (size_t)j] - 3) < 1e-9);
	point_survey_release(&sv);
	model_bench_free(b);
}
END_TEST

#define LOOP(tc, fn, arr) tcase_add_loop_test(tc, fn, 0, (int)(sizeof arr / sizeof *arr))

int
main(void)
{
Suite *s = suite_create("layout");
	TCase *tc = tcase_create("format");

	LOOP(tc, test_bar, bar_cases);
	LOOP(tc, test_percent, pct_cases);
	LOOP(tc, test_radius_text, radius_cases);
	LOOP(tc, test_fit_text, fit_cases);
	LOOP(tc, test_ascii, ascii_cases);
	LOOP(tc, test_fit_columns, colfit_cases);
	LOOP(tc, test_hints, hint_cases);
	tcase_add_test(tc, test_hints_ties);
	LOOP(tc, test_hints_brief, brief_cases);
	LOOP(tc, test_wrap, wrap_cases);
	suite_add_tcase(s, tc);
	tc = tcase_create("chain");
	tcase_add_test(tc, test_chain_demo);
	tcase_add_test(tc, test_chain_empty_port);
	LOOP(tc, test_scroll, scroll_cases);
	suite_add_tcase(s, tc);
	tc = tcase_create("values");
	LOOP(tc, test_value_text, value_cases);
	tcase_add_test(tc, test_value_roundtrip);
	tcase_add_test(tc, test_bench_values);
	tcase_add_loop_test(tc, test_required_keys, 0, EL_NTYPES);
	LOOP(tc, test_new_id, id_cases);
	tcase_add_test(tc, test_fields);
	tcase_add_test(tc, test_hazards_demo);
	LOOP(tc, test_headroom, headroom_cases);
	tcase_add_test(tc, test_margin_line);
	tcase_add_test(tc, test_margin_unrated);
	tcase_add_test(tc, test_unrated_dump);
	tcase_add_test(tc, test_derivation);
	tcase_add_test(tc, test_derivation_reports);
	tcase_add_test(tc, test_place_keys);
	tcase_add_test(tc, test_key_hints);
	tcase_add_test(tc, test_visibility);
	tcase_add_test(tc, test_place_labels);
	tcase_add_test(tc, test_join_fit);
	tcase_add_test(tc, test_margin_widths);
	tcase_add_test(tc, test_point_cycle);
	tcase_add_test(tc, test_bench_key_hint_examples);
	tcase_add_test(tc, test_point_override);
	tcase_add_test(tc, test_survey_find);
	suite_add_tcase(s, tc);
	tc = tcase_create("profile");
	tcase_add_test(tc, test_profile_path);
	tcase_add_test(tc, test_profile_plot);
	tcase_add_test(tc, test_profile_band);
	LOOP(tc, test_nice_ceil, nice_cases);
	LOOP(tc, test_ticks, tick_cases);
	LOOP(tc, test_map_col, map_cases);
	suite_add_tcase(s, tc);
	return run_suite(s);
}
