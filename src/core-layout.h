/* core-layout.h - everything the workbench decides about what to show,
 * without curses: ratio bars and percentages, text fitted to columns,
 * choosing table columns for a width, key-hint lines, the bench chain
 * flattened into rows, friendly value text that reads back exactly, new
 * element ids, the status line, and the beam-profile plot laid out as a
 * grid of glyph codes.  The ui-* files only put these on the screen.
 *
 * Pure computation (no I/O, no globals); unit-tested in
 * tests/check_layout.c.  Owned by the workbench. */
#ifndef CORE_LAYOUT_H
#define CORE_LAYOUT_H

#include <stddef.h>

#include "core-model.h"
#include "core-trace.h"
#include "util-buf.h"

/* ---- numbers and words ---- */

/* A ratio-to-threshold bar exactly `width` columns wide: filled cells for
 * the ratio on a 0..100 % scale (UTF-8 eighth blocks, or '#' in ASCII),
 * a tick at `caution` (the ratio where caution starts, 1/safety factor;
 * NAN for none) and a final arrow when the ratio is past 100 %.  An unrated
 * (NAN) ratio gives blanks.  Writes into buf (truncating at n); returns the
 * number of columns written. */
int   layout_bar(char *buf, size_t n, double ratio, double caution, int width,
          int ascii);
/* "15.8 %", "109 %", "0.65 %", "<0.01 %"; "-" for NAN.  The one percent
 * form of every view (workbench, list, table). */
void  layout_percent(char *buf, size_t n, double ratio);
/* The status in words as the screen shows it: "ok", "caution", "OVER",
 * "unrated". */
const char *layout_status_word(enum damage_status);
/* A chain row's status word: "spark" where a pulsed focus in it breaks
 * down the air, "n/a" for a space without a rating (a gap has nothing to
 * damage), else layout_status_word. */
const char *layout_row_status_word(const struct trace_row *);
/* Radii as "3.00 mm" (equal at 3 digits) or "2.41/2.43 mm" (one unit) or
 * "265 µm/1.82 mm". */
void  layout_radius_text(char *buf, size_t n, double wx, double wy, int ascii);

/* ---- text in columns ---- */

/* s with every non-ASCII character replaced for a terminal that cannot
 * show UTF-8: the symbols the program prints get their ASCII forms ("µ"
 * "u", "²" "^2", "°" " deg", "→" "->", box lines "|" "-"), anything else
 * (a label typed in another script) becomes "?".  Caller frees. */
char *layout_ascii(const char *s);

enum layout_align { LAYOUT_LEFT, LAYOUT_RIGHT };
/* s fitted to exactly `cols` columns: padded, or cut with "…" ("~" in
 * ASCII).  UTF-8 safe (counts code points, as utf8_cols).  Returns buf. */
char *layout_fit_text(char *buf, size_t n, const char *s, int cols,
          enum layout_align, int ascii);

struct layout_col {
	const char *name;
	int         min, want;      /* columns; want < 0: takes what is left */
	int         prio;           /* 0 always shown; higher is dropped first */
};
/* Chooses widths for a table row of `width` columns with `gap` blanks
 * between shown columns: columns are dropped from the highest prio down
 * until the minima fit, then widened towards `want` in prio order, then
 * the flexible column (want < 0) takes the rest.  width_out[i] is 0 for a
 * hidden column.  Returns the columns used, or -1 when even prio 0 does not
 * fit (every width is then 0). */
int   layout_fit_columns(const struct layout_col *, size_t n, int width, int gap,
          int *width_out);

/* Breaks s into lines of at most `width` columns at blanks (a word longer
 * than the width is cut; '\n' always breaks).  starts[i] and lens[i] are
 * byte offsets and lengths into s.  Returns the number of lines (which may
 * exceed max; only max are stored). */
size_t layout_wrap(const char *s, int width, size_t *starts, size_t *lens, size_t max);

/* ---- key hints ---- */

struct layout_hint {
	const char *key;            /* "p", "Ins", "Enter" */
	const char *word;           /* "place" */
	int         prio;           /* 0 always; higher dropped first */
	int         group;          /* task; a change of group is marked on the line */
};
/* The key line's own signs: a key and its word are joined by the key sign
 * ("Ins›place"); two blanks part hints of one task, the group sign with a
 * blank each side parts tasks.  ASCII terminals get ">" and ":". */
#define LAYOUT_KEY_SIGN    "\u203a"
#define LAYOUT_GROUP_SIGN  "\u2506"
#define LAYOUT_GROUP_GAP   3
/* Picks which hints fit in `width` columns written as above, in their
 * given order: the least important are dropped one at a time (of equal
 * prio, the rightmost first); prio 0 is dropped only when nothing else is
 * left, from the right.  A few long words have a brief form (the table in
 * core-layout.c: "reflections" is "ghosts" there): when the next to go has
 * one, every hint with one takes it instead, once, and the dropping goes on
 * only if the line is still too long (so an 80-column line keeps more).
 * shown[i] is set to 0 (left out), 1 (its word) or 2 (its brief).
 * Returns how many are shown. */
size_t layout_hints_pick(const struct layout_hint *, size_t n, int width,
           unsigned char *shown);
/* The word hint h is written with for its shown[] value: its brief for 2. */
const char *layout_hint_word(const struct layout_hint *, unsigned char shown);
/* The chosen hints as one plain line (for tests and monochrome). */
char  *layout_hints_text(const struct layout_hint *, size_t n, int width); /* caller frees */

/* ---- the chain ---- */

enum layout_row_kind {
	LROW_ELEMENT,               /* an element */
	LROW_PORT                   /* the heading of el's side branch */
};
struct layout_row {
	enum layout_row_kind  kind;
	const struct element *el;       /* borrowed: the element, or the port's owner */
	const struct element *parent;   /* owner of the branch el is in; NULL on main */
	enum port             port;     /* LROW_PORT: el's side port */
	unsigned              depth;    /* indentation level */
	long                  trace_row;/* index into t->rows; -1 for a port row */
};
/* The bench as display rows: every element in path order, and after an
 * element with a side port a port row, followed by its branch one level
 * deeper (an empty branch still gets its port row, so elements can be put
 * into it).  t may be NULL (no trace indices).  Returns the count; *rows is
 * caller-freed. */
size_t layout_chain(const struct bench *, const struct trace *, struct layout_row **rows);
/* The row showing element id (kind LROW_ELEMENT, or the port row of id
 * when port != 0); -1 when absent. */
long   layout_chain_find(const struct layout_row *, size_t n, const char *id, int port);
/* First row to show so that `sel` is visible in `visible` rows of n,
 * keeping one row of context where there is room. */
int    layout_scroll(int sel, int top, int visible, int n);

/* ---- values ---- */

/* A key's value as short text that reads back to the same double ("250 mm"
 * rather than "0.25 m"); the given value or its default; its own tolerance
 * after it ("250 mm ± 2 mm", core-layout-tol.h).  Caller frees. */
char  *layout_value_text(const struct element *, enum model_key);
/* v as the shortest units_format text that reads back to v ("532 nm"). */
char  *layout_quantity_text(double v, enum unit_dim);                  /* caller frees */
/* What a bench-level key's value looks like ("with its unit, e.g. ..."). */
char  *layout_bench_key_hint(const char *key);                         /* caller frees */
/* A bench-level key (edit_bench_keys) the same way: "1.064 µm", "3 mm, 2 mm",
 * "2 W ± 5 %". */
char  *layout_bench_value_text(const struct bench *, const char *key);
/* The source's M² to three figures ("2.95" or "2.95, 3.54"): as shown
 * where it is derived from a measured divergence. */
char  *layout_source_m2_text(const struct source *);                  /* caller frees */
/* A new, empty bench with a starting source the user then edits:
 * 1064 nm, CW 1 W, waist 1 mm at the source, M² 1, linear 0°. */
struct bench *layout_bench_new(const char *name);            /* caller frees */
/* The key a new element of this type must be given to be valid, or -1. */
int    layout_required_key(enum elem_type);
/* The next free id for a new element of this type ("L2", "BS3"). */
char  *layout_new_id(const struct bench *, enum elem_type);   /* caller frees */
/* One line about a type for the add menu. */
const char *layout_type_help(enum elem_type);

/* The fields of an element's form, in order: id, label, part, side (for
 * types with side ports), then every key of model_keys the type takes. */
enum layout_field_kind { LF_ID, LF_LABEL, LF_PART, LF_SIDE, LF_KEY };
struct layout_field {
	enum layout_field_kind kind;
	int                    key;     /* enum model_key for LF_KEY, else -1 */
	const char            *name;    /* "focal", "damage.fluence", "id" */
	const char            *help;    /* one line */
	int                    given;   /* a value is set (not a default) */
};
size_t layout_fields(const struct element *, struct layout_field *out, size_t max);
/* The text a field shows or starts its editor with ("" when unset and
 * without default).  Caller frees. */
char  *layout_field_value(const struct element *, const struct layout_field *);
/* One line of help for a bench-level key. */
const char *layout_bench_key_help(const char *key);

/* ---- labels and hints (core-layout-keys.c) ---- */

enum layout_key_group { LKG_ELEMENT, LKG_OPTIC, LKG_MATERIAL, LKG_DAMAGE, LKG_BENCH,
	LKG_SOURCE, LKG_REFLECTION, LKG_COUNT };
/* Columns the value pane gives a label: every label fits in them. */
#define LAYOUT_LABEL_COLS 18
/* "Damage rating", "Source", "Surface reflections", ... */
const char *layout_group_name(enum layout_key_group);
/* A model key's human label ("CW irradiance") and its group (never
 * LKG_ELEMENT, which is the element's names: id, label, part). */
const char *layout_key_label(int key, enum layout_key_group *group);
/* The same for a key of an element of type t: on glass (lens, window, ...)
 * aoi is a tilt, in the group of the surface reflections it decides. */
const char *layout_key_label_for(enum elem_type, int key, enum layout_key_group *group);
/* The value pane's order of fields f[0..n) of el (layout_fields): the
 * optic's values, its material, its rating, its surface reflections, then
 * id, label, part and side.  Writes n indices into order; returns n. */
struct layout_field;
size_t layout_field_order(const struct element *, const struct layout_field *f, size_t n,
           size_t *order);
/* The same for a bench-level key (edit_bench_keys): "waist position". */
const char *layout_bench_key_label(const char *key, enum layout_key_group *group);
/* What a value of this key looks like: its unit with an example and its
 * sign, or for a plain number its range ("a fraction, 0 to 1").  Caller
 * frees. */
char  *layout_key_hint(int key);
/* The keys that rate an element of this type on a pulsed or CW bench
 * (a dump: max_power; a mirror: damage.fluence and damage.pulse_width or
 * damage.cw_irradiance); 0 for a space. */
size_t layout_rating_keys(enum elem_type, int pulsed, int *out, size_t max);
/* What placing an element of this type asks, in order: the required key,
 * then what matters for the type (a mirror's angle, a filter's OD), then
 * its rating. */
size_t layout_place_keys(enum elem_type, int pulsed, int *out, size_t max);
/* "unrated: give max_power (Enter)"; for a space "n/a: ...".  Caller frees. */
char  *layout_rating_hint(enum elem_type, int pulsed);

/* ---- hazards and the margin line (core-layout-margin.c) ---- */

/* Everything on a bench that needs a person's attention: rows over and at
 * caution, every warning of the trace (whatever its kind, so that kinds
 * added to the trace later are listed too), and optics without a rating
 * that take power (a space is never one; an optic the trace already warns
 * about as unrated is listed once). */
enum layout_hazard_kind { LH_OVER, LH_WARNING, LH_CAUTION, LH_UNRATED };
struct layout_hazard {
	enum layout_hazard_kind      kind;
	long                         row;   /* trace row to jump to; -1: none */
	const struct trace_warning  *warn;  /* borrowed; LH_WARNING only */
	const struct element        *el;    /* borrowed; NULL: the source */
};
/* Over, warnings, caution, unrated, each in trace order.  Caller frees *out. */
size_t layout_hazards(const struct trace *, struct layout_hazard **out);
/* One word for a hazard: "over", "caution", "unrated", "spark",
 * "unterminated", "self-focusing", "B-integral", or a new kind's name. */
const char *layout_hazard_word(const struct layout_hazard *);
/* 1 when a chain row has a hazard of its own (status, flag or warning). */
int    layout_row_hazard(const struct trace *, size_t row);
/* How many times the power could rise before the ratio reaches 100 %:
 * "×1.21", "×0.917" (already over), "×∞"; "-" for NAN. */
void   layout_headroom(char *buf, size_t n, double ratio, int ascii);
/* "worst: W1 109 % OVER, headroom ×0.914  │  safe source power 914 mW  │
 * 8 hazards: 1 over, 1 spark, ...  │  reflections: 1 ghost over, 3 strays
 * to block  │  TAIL" (tail: e.g. the saved time;
 * may be NULL).  Shorter in steps when wider than `width` (narrow
 * separators; the hazard count alone; "worst: W1 109 % OVER ×0.914"; "W1
 * 109 % OVER ×0.914"; no tail; no headroom); the last step is returned even
 * if still too wide.  The
 * words "safe source power" and the hazard count stay in every step, and
 * so do the ghosts over and strays to block when there are any ("1 ghost
 * over, 3 strays"; the reflections part is left out for a trace without
 * ghosts, and says "no ghost over" only in the first two steps).
 * Caller frees. */
char  *layout_margin_line(const struct trace *, int ascii, int width, const char *tail);

/* "invisible (IR)", "invisible (UV)" or "visible" (400-700 nm). */
const char *layout_visibility(double wavelength);
/* "1.064 µm 2.00 W pulsed (200 mJ × 10.0 Hz, 8.00 ns)", "532.0 nm CW 5.00 W". */
char  *layout_beam_summary(const struct bench *, int ascii);            /* caller frees */
/* The standing caution: design estimate, not a safety assessment; the
 * wavelength and whether it is invisible.  Fitted to width. */
char  *layout_caution_line(const struct bench *, int ascii, int width); /* caller frees */
/* parts[] joined by sep, dropping the highest prio first until it fits
 * (prio 0 parts are always kept); NULL or "" parts are skipped. */
char  *layout_join_fit(const char *const *parts, const int *prio, size_t n,
           const char *sep, int width);                                 /* caller frees */

/* How an element's governing limit came from its rating: rating × λ factor
 * × τ factor = limit, ÷ safety factor = caution level.  The factors come
 * from damage_limits itself (once with the pulse as rated, once as run). */
enum layout_metric { LD_CW_LINEAR, LD_CW_IRRADIANCE, LD_FLUENCE, LD_MAX_POWER,
	LD_MAX_ABSORBED, LD_NMETRICS };
struct layout_derivation {
	enum layout_metric metric;  /* the one that gives the row's ratio */
	int                key;     /* enum model_key of the rating */
	const char        *what;    /* "pulse fluence" */
	enum unit_dim      dim;
	double             rating, lambda_factor, tau_factor, limit;
	double             safety_factor, caution_level, ratio;
};
/* -1 when the row is unrated. */
int    layout_derive(const struct trace_row *, const struct bench *, struct layout_derivation *);
/* "fluence 1.20 J/cm² × 2 λ × 1.26 τ = 3.04 J/cm² limit; ÷ 2 = 1.52 J/cm²
 * caution"; NULL when unrated.  Caller frees. */
char  *layout_derivation_text(const struct trace_row *, const struct bench *, int ascii);

/* ---- operating points (core-layout-margin.c) ---- */

/* The point after `cur` in the cycle base, first point, ..., last, base:
 * -1 is the base, else an index into b->points. */
long   layout_point_next(const struct bench *, long cur);
/* What the margin line says is shown: "point alignment 1/2", or
 * "base (O: 2 points)"; NULL when the bench has no points.  Caller frees. */
char  *layout_point_words(const struct bench *, long cur);
/* Sets one override of point `name` to "ID.KEY=VALUE" (id NULL: key is a
 * bench-level key, and only the source's, "source.KEY", are a point's;
 * "safety_factor" is refused): the point's change of the same key is replaced
 * where it stands, else the change is added at its end.  The base's values
 * are untouched.  Refused, with the point as it was, when the change is
 * malformed or the point no longer applies. */
int    layout_point_override(struct bench *, const char *name, const char *id,
           const char *key, const char *value, char **cause);
/* The entry of element id in a survey of every point; -1: none. */
struct point_survey;
long   layout_survey_find(const struct point_survey *, const char *id);

/* ---- the beam profile ---- */

/* Trace row indices along the path of row `sel`: from the source down the
 * main path, through each splitter into the side branches that lead to
 * `sel`, and on to the end of sel's own branch.  Returns the count; *idx is
 * caller-freed. */
size_t layout_profile_path(const struct trace *, size_t sel, size_t **idx);

enum layout_glyph {
	LG_EMPTY, LG_WX, LG_WY, LG_WXY, LG_POWER, LG_FOCUS, LG_SEL, LG_COUNT
};
struct layout_mark {
	int    col;
	size_t row;                 /* trace row index */
	int    focus;               /* 1: a focus in the gap `row`, at col */
};
struct layout_plot {
	int                 w, hr, hp;      /* columns, radius rows, power rows */
	unsigned char      *cell;           /* owned: w * (hr + hp) glyphs, row major */
	double              z0, z1;         /* z at the left edge and right edge */
	double              rmax, pmax;     /* top of the radius and power rows */
	struct layout_mark *mark;           /* owned: elements and foci by column */
	size_t              nmark;
	int                 sel_col;        /* column of the selected row, -1 */
};
/* Samples both 1/e² radii and the power along `path` (from
 * layout_profile_path) into a w × (hr + hp) grid: radii in the top hr rows
 * (row hr-1 is r = 0, the top row rmax, a "nice" value), the power as a
 * step line in the bottom hp rows (0..pmax).  sel is a trace row index to
 * mark (or (size_t)-1).  Returns 0, or -1 when w, hr or hp is below 2. */
int    layout_profile(const struct trace *, const size_t *path, size_t npath,
           size_t sel, int w, int hr, int hp, struct layout_plot *out);
/* The same plot with the radius rows drawn as the beam lies on the table:
 * the axis in row (hr-1)/2, LG_WX filling ±x radius about it, LG_WY at
 * the ±y radius where it differs, foci on the axis; rmax is then the
 * distance from the axis to the top row. */
int    layout_profile_band(const struct trace *, const size_t *path, size_t npath,
           size_t sel, int w, int hr, int hp, struct layout_plot *out);
void   layout_plot_release(struct layout_plot *);
/* A "nice" number >= x (1, 2, 2.5, 5 × 10^k); 0 stays 0. */
double layout_nice_ceil(double x);
/* Nice tick values inside [lo, hi], at most maxn; returns the count. */
size_t layout_ticks(double lo, double hi, size_t maxn, double *out);
/* Where the ids under the profile's axis go: label i (len[i] columns) as
 * near col[i] as it can without overlapping another (marks at the same z
 * are put side by side), the selected one (sel, or -1) first and exactly
 * under its mark; at[i] is its start column, -1 when it does not fit in
 * width.  cols must be in ascending order.  Returns how many are placed. */
int    layout_place_labels(const int *col, const int *len, size_t n, long sel, int width,
           int *at);
/* Column of z in [z0, z1] mapped onto w columns (clamped). */
int    layout_map_col(double z, double z0, double z1, int w);

/* ---- surface reflections (core-layout-ghost.c) ---- */

/* Works from a trace's ghost summaries (ghost_set.g, .strays, .at); the
 * workbench's lean trace keeps no per-ghost rows and needs none here. */
struct ghost;
struct ghost_set;
/* "L1.back", "L2.front → L1.back" ("->" in ASCII). */
void   layout_ghost_name(const struct ghost *, int ascii, char *buf, size_t n);
/* Strays at or above the bench's stray_warn: each must be blocked. */
size_t layout_strays_to_block(const struct trace *);

enum layout_refl_kind { LR_GHOST, LR_STRAY };
struct layout_refl {
	enum layout_refl_kind   kind;
	size_t                  index;  /* into ghost_set.g or .strays */
	long                    row;    /* trace row to go to: a ghost's worst element
	                                 * (unrated: the element of its last
	                                 * reflection), a stray's source; -1 none */
	int                     severity;   /* 2: a ghost over somewhere or whose
	                                     * focus sparks; 1: a ghost at caution,
	                                     * a stray to block; 0: the rest */
	const struct ghost_set *set;    /* borrowed: the trace's */
};
/* Every ghost and stray, worst first: by severity, and in each tier the
 * ghosts by worst_ratio (unrated last), then the strays by power; ties in
 * the trace's order.  (So a focus that sparks and a stray to block are
 * never below a ghost that harms nothing.)  Returns the count (0 when the
 * trace has no ghosts); *out caller-freed. */
size_t layout_reflections(const struct trace *, struct layout_refl **out);
/* The cells of one row of the reflections screen. */
struct layout_refl_cells {
	char               kind[16];    /* "ghost", "ghost²", "stray" */
	char               name[200];   /* surfaces, or "PBS1 fourth port" */
	char               power[48];   /* a ghost's power_start, a stray's power */
	char               where[48];   /* a ghost's worst element ("-": none rated);
	                                 * a stray's "focus at" or "no focus" */
	char               ratio[48];   /* its ratio there; a stray's focus distance */
	const char        *word;        /* static: "ok", "OVER", "spark", "block", "low" */
	enum damage_status status;      /* for the colour: a stray to block is caution,
	                                 * a ghost focus that sparks over */
	char               note[160];   /* "focus in S8 sparks, 43.9 mm from an optic" */
};
void   layout_reflection_cells(const struct trace *, const struct layout_refl *, int ascii,
           struct layout_refl_cells *);
/* One sentence about it, for the screen's foot.  Caller frees. */
char  *layout_reflection_text(const struct trace *, const struct layout_refl *, int ascii);
/* "61 ghosts: 0 over, 1 at caution · 21 strays: 3 to block · 35.0 µW back
 * at the source", shorter when wider than width ("1 caution", "back to
 * source 35.0 µW", then without it, then "61 ghosts, 0 over · 3 strays to
 * block").  Caller frees. */
char  *layout_reflection_count(const struct trace *, int ascii, int width);

/* Lines of an element's results: a label (static; "" continues the one
 * above), the text (owned) and the status its colour follows. */
struct layout_line {
	const char        *label;
	char              *text;
	enum damage_status level;
};
void   layout_lines_free(struct layout_line *, size_t n);
/* What the ghosts bring to trace row `row`: "ghosts in" (how many, their
 * summed peak irradiance, the main beam's own ratio and the combined one)
 * and "most" (the ghost that counts most there).  None when no ghost meets
 * it.  Returns the count (may exceed max; only max are stored). */
size_t layout_ghost_meet(const struct trace *, size_t row, int ascii,
           struct layout_line *out, size_t max);
/* 1 when the ghosts that meet row `row` change what its rating says: its
 * status, or its ratio by a factor LAYOUT_GHOST_MATTERS or more over the
 * main beam's own (then the results say them beside the rating; else after
 * the rest, where a small pane may leave them out).  0 for an unrated row. */
#define LAYOUT_GHOST_MATTERS 1.1
int    layout_ghost_matters(const struct trace *, size_t row);
/* What the element of row `row` sends off: "makes", one line per ghost one
 * of whose reflections is its surface, worst first, at most `each` of them
 * and then "+N more". */
size_t layout_ghost_made(const struct trace *, size_t row, int ascii, size_t each,
           struct layout_line *out, size_t max);
/* "strays", one line per stray the element throws, with its power and
 * ": block it" at or above stray_warn (*blocks is then 1: the results say
 * them beside the rating). */
size_t layout_ghost_strays(const struct trace *, size_t row, int ascii, int *blocks,
           struct layout_line *out, size_t max);

/* Ghost gi of rt, a trace that keeps its ghosts' rows (TRACE_GHOST_ROWS;
 * the workbench traces one so when a ghost is asked for on the profile),
 * on plot pl laid out for path (layout_profile or, band, layout_profile_band
 * of the same bench): one point per element of the path it meets, at that
 * element's column, at the radius rows of its larger 1/e² radius (curves:
 * row; band: row above the axis and row2 below it), clamped to the plot
 * (beyond: 1, it is wider than the plot's top).  Returns the count (may
 * exceed max; only max are stored); 0 when rt keeps no rows. */
struct layout_gpoint {
	int    col, row, row2;
	size_t trace_row;
	int    beyond;
};
size_t layout_profile_ghost(const struct trace *rt, size_t gi, const size_t *path,
           size_t npath, const struct layout_plot *pl, int band,
           struct layout_gpoint *out, size_t max);

#endif
