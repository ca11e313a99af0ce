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
#include "core-trace.h"

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

static const struct layout_hint hints[] = {
	{ "a", "add", 1 }, { "x", "delete", 2 }, { "Enter", "edit", 0 },
	{ "p", "profile", 3 }, { "?", "help", 0 },
};

static const struct { int width; const char *want; } hint_cases[] = {
	{ 80, "a add  x delete  Enter edit  p profile  ? help" },
	{ 40, "a add  x delete  Enter edit  ? help" },
	{ 30, "a add  Enter edit  ? help" },
	{ 18, "Enter edit  ? help" },
	{ 12, "Enter edit" },       /* not even prio 0 fits: from the left */
	{ 38, "a add  x delete  Enter edit  ? help" },
};

/* Of equal priority the rightmost goes first, one at a time. */
static const struct layout_hint tie_hints[] = {
	{ "a", "add", 1 }, { "u", "undo", 1 }, { "c", "commit", 1 }, { "?", "help", 0 },
};

START_TEST(test_hints_ties)
{
	char *s = layout_hints_text(tie_hints, 4, 21);

	ck_assert_str_eq(s, "a add  u undo  ? help");
	free(s);
}
END_TEST

START_TEST(test_hints)
{
	char *s = layout_hints_text(hints, sizeof hints / sizeof *hints, hint_cases[_i].width);

	ck_assert_str_eq(s, hint_cases[_i].want);
	ck_assert_int_le((int)strlen(s), hint_cases[_i].width);
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

/* ---- status line ---- */

START_TEST(test_status_line)
{
	struct bench *b = demo();
	struct trace *t = trace_rerun_opts(NULL, b, TRACE_NO_GHOSTS);  /* main beam */
	char *s = layout_status_line(t, 0, 200), *a = layout_status_line(t, 1, 200);
	char *n80 = layout_status_line(t, 0, 79), *tiny = layout_status_line(t, 1, 10);
	char *cause = NULL;

	ck_assert_ptr_nonnull(strstr(s, "worst: W1 109 % OVER"));
	ck_assert_ptr_nonnull(strstr(s, "safe source power 914 mW"));
	ck_assert_ptr_nonnull(strstr(s, "unterminated: 728 \u00b5W after S4r (POL1.rejected)"));
	ck_assert_ptr_nonnull(strstr(a, "728 uW after S4r"));
	for (const char *p = a; *p; p++)
		ck_assert_int_lt((unsigned char)*p, 128);
	/* at 80 columns all three parts still fit, shorter */
	ck_assert_int_le((int)utf8_cols(n80), 79);
	ck_assert_ptr_nonnull(strstr(n80, "worst: W1 109 % OVER"));
	ck_assert_ptr_nonnull(strstr(n80, "914 mW"));
	ck_assert_ptr_nonnull(strstr(n80, "unterminated: 728 \u00b5W after S4r"));
	/* the shortest form comes back even when it is too wide */
	ck_assert_str_eq(tiny, "worst: W1 109 % OVER | safe power 914 mW | unterminated: 728 uW after S4r");
	free(s);
	free(a);
	free(n80);
	free(tiny);
	trace_free(t);
	/* terminate the rejected beam: the line says so */
	{
		struct element el;
		struct edit_place pl = { NULL, NULL, "POL1.rejected", 0 };

		ck_assert_int_eq(edit_element_new(&el, "dump", "BD9", NULL, 0, &cause), 0);
		ck_assert_int_eq(edit_add(b, &el, &pl, &cause), 0);
	}
	t = trace_run(b);
	s = layout_status_line(t, 0, 200);
	ck_assert_ptr_nonnull(strstr(s, "all beams terminated"));
	free(s);
	trace_free(t);
	model_bench_free(b);
}
END_TEST

START_TEST(test_status_unrated)
{
	struct bench *b = bare();
	struct trace *t = trace_run(b);
	char *s = layout_status_line(t, 1, 200);

	ck_assert_ptr_nonnull(strstr(s, "worst: nothing rated"));
	ck_assert_ptr_nonnull(strstr(s, "safe source power: no ratings"));
	ck_assert_ptr_nonnull(strstr(s, "unterminated: 1.00 W after the source (main)"));
	free(s);
	trace_free(t);
	model_bench_free(b);
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
	ck_assert_double_eq_tol(p.z1, 1.77, 1e-9);
	ck_assert_double_ge(p.rmax, 3.01e-3);
	ck_assert_double_le(p.rmax, 5e-3);
	ck_assert_double_ge(p.pmax, 2.0);
	ck_assert_int_eq(p.sel_col, layout_map_col(1.75, 0, 1.77, 60));
	for (size_t i = 0; i < p.nmark; i++)
		if (p.mark[i].focus) {
			foci++;
			focus_col = p.mark[i].col;
		}
	ck_assert_uint_eq(foci, 1);
	ck_assert_int_eq(focus_col, layout_map_col(1.650, 0, 1.77, 60));
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
	tcase_add_test(tc, test_status_line);
	tcase_add_test(tc, test_status_unrated);
	suite_add_tcase(s, tc);
	tc = tcase_create("profile");
	tcase_add_test(tc, test_profile_path);
	tcase_add_test(tc, test_profile_plot);
	LOOP(tc, test_nice_ceil, nice_cases);
	LOOP(tc, test_ticks, tick_cases);
	LOOP(tc, test_map_col, map_cases);
	suite_add_tcase(s, tc);
	return run_suite(s);
}
