/* core-layout-tol.h - what the workbench shows of tolerances, without
 * curses: a value's tolerance beside it in the value pane, and the
 * tolerance screen (a Monte-Carlo run of the open bench, core-mc.h): how
 * many samples for a bench, each rated element's odds as table cells and a
 * stacked bar, the bench-wide lines, what drives an element, and the
 * histogram of one element's ratio laid out as columns and an axis line.
 *
 * Pure computation (no I/O, no globals); unit-tested in
 * tests/check_layout_tol.c.  Owned by the workbench. */
#ifndef CORE_LAYOUT_TOL_H
#define CORE_LAYOUT_TOL_H

#include <stddef.h>

#include "core-mc.h"
#include "core-model.h"
#include "core-trace.h"

/* ---- a value with its tolerance ---- */

/* " ± 2 mm", " ± 5 %", " ± 0.004 uniform": element el's own tolerance on
 * key k as the value pane shows it after the value and the editor reads it
 * back; "" when it has none.  As snprintf. */
int   layout_tol_suffix(char *buf, size_t n, const struct element *, enum model_key);
/* The same for a source value of the settings pane ("source.power"; for a
 * pair key, axis 0 or 1); "" for a key that takes none or has none. */
int   layout_tol_src_suffix(char *buf, size_t n, const struct bench *, const char *key,
          int axis);
/* v (taken) with the tolerance after it: element el's on key k, or the
 * source's behind settings key `key` (after each of a pair's two).
 * Caller frees the result. */
char *layout_tol_with_value(const struct element *, enum model_key, char *v);
char *layout_tol_with_src(const struct bench *, const char *key, char *v);
/* The bench-wide default in effect on el's key k when el has none of its
 * own: "± 2 mm" (caller frees), NULL when none; which default into name
 * ("space.length", "*.length"). */
char *layout_tol_inherited(const struct bench *, const struct element *, enum model_key,
          char *name, size_t n);
/* A field's value text for `cols` columns: value (with its own tolerance,
 * "250 mm ± 2 mm"), or with the bench-wide one in brackets when inh is not
 * NULL ("300 mm (± 2 mm for every space.length)"), in the first of ever
 * shorter forms that fits ("250 mm ±2 mm", "250±2 mm"; "300 mm (± 2 mm,
 * bench)", "300 mm (±2 mm)", "300 (±2) mm"), else the shortest; columns
 * counted as an ASCII terminal shows them when ascii ("±" as "+-").
 * Display only: the editor starts from the value itself.  Returns buf. */
char *layout_tol_fit_value(char *buf, size_t n, const char *value, const char *inh,
          const char *name, int cols, int ascii);
/* What the editor says about typing a tolerance after the value of
 * element key `key` (>= 0), or else of settings key `bench_key`
 * ("source.power"): "tolerance after it: \"± 2 mm\" (normal) or \"± 1 %
 * uniform\"; \"± 0\" removes it", "" for keys that take none.  ascii: "+-"
 * for the sign.  Caller frees. */
char *layout_tol_edit_hint(int key, const char *bench_key, int ascii);
/* The same in 30 columns, for the line under the box: "+ tolerance: ± 2 mm
 * [uniform]"; "" for keys that take none.  Caller frees. */
char *layout_tol_edit_short(int key, const char *bench_key, int ascii);

/* ---- the run the screen makes ---- */

#define LAYOUT_TOL_SAMPLES  2000    /* for a bench of up to 64 trace rows */
#define LAYOUT_TOL_MORE_MAX 5       /* layout_tol_samples doubles at most 2^5 times */

/* The samples the screen runs for a bench with `nrows` trace rows, so that
 * a run stays well under a second: LAYOUT_TOL_SAMPLES up to 64 rows, half
 * as many for every doubling beyond (never fewer than 250), then doubled
 * `more` times (0 .. LAYOUT_TOL_MORE_MAX), at most MC_MAX_SAMPLES. */
size_t layout_tol_samples(size_t nrows, int more);
/* The most samples the screen runs for a bench of `nrows` trace rows: it
 * keeps every sample's ratio of every rated element for the histogram, so
 * at most LAYOUT_TOL_CELLS ratios (samples times rows), and never more
 * than MC_MAX_SAMPLES. */
#define LAYOUT_TOL_CELLS ((size_t)1 << 25)  /* 256 MiB of kept ratios */
size_t layout_tol_samples_max(size_t nrows);
/* A sample count typed on the screen ("20000", "20 000", "20k"): 0 and
 * *n set, or -1 with the reason in *cause (caller frees) for anything
 * but a whole number from 10 to max. */
int   layout_tol_parse_samples(const char *text, size_t max, size_t *n, char **cause);
/* The line a run shows while it works (after about a second): "sampling…
 * 12032 of 200000 samples (6 %)", "stopping… 12032 of 200000 samples
 * done" once stopped; "..." for "…" when ascii.  Caller frees. */
char *layout_tol_progress(size_t done, size_t total, int stopping, int ascii);

/* "1.2 %", "0.35 %", "<0.08 %" (none of n, with the rule-of-three bound),
 * ">99.92 %" (all of n), "0 %" / "100 %" when `exact` (every sample the
 * same, so the figure is no estimate). */
void  layout_tol_prob(char *buf, size_t n, double p, size_t nsamples, int exact);
/* The same with its standard error: "91.5 ± 0.6 %"; the bounds and exact
 * forms as layout_tol_prob (no ± there).  An error that would show as 0 at
 * the figure's decimals (a run of very many samples) is left out, and a
 * figure below 1 % or above 99 % then gets two significant digits of
 * itself or of what it falls short of 100 %: "0.00017 %", "99.99983 %",
 * never "0.00 ± 0.00 %" for what some samples did. */
void  layout_tol_prob_se(char *buf, size_t n, double p, double se, size_t nsamples, int exact);

/* One rated element of a run as the table shows it. */
struct layout_tol_row {
	char   nominal[24];         /* ratio as written: "109 %" */
	char   over[32], caution[32];   /* P with its standard error */
	char   median[24], p95[24];
	int    bar_over, bar_caution;   /* cells of the stacked bar; the rest is ok */
	int    exact;               /* every sample gave the same ratio (needs the
	                             * kept ratios; 0 without them) */
	int    worst;               /* 1.. its rank among the worst, 0: not ranked */
};
void  layout_tol_row(const struct mc_result *, size_t j, int bar_w, struct layout_tol_row *);
/* The stacked bar's cells for `width` columns: over, then caution, the rest
 * ok.  A share above 0 gets a cell, a share below 1 leaves one (so a rare
 * outcome is never hidden, a likely one never shown as certain). */
void  layout_tol_bar_cells(double p_over, double p_caution, int width, int *over,
          int *caution);

/* "Statistical estimates from 4000 random samples (seed 1) of 16
 * tolerances; ± is one standard error", or "Statistical: 4000 samples, seed
 * 1, 16 tolerances; ± one standard error" when that is wider than cols.  A
 * run stopped early says so first, "STOPPED after 1000 of 4000 samples; "
 * and then "statistical estimates from those (seed 1) of 16 tolerances; ±
 * is one standard error", or "estimates from those only: seed 1, 16
 * tolerances, ± one standard error", or "the figures are of those only",
 * the first that fits.  Caller frees. */
char *layout_tol_head(const struct mc_result *, int cols);
/* "P(anything over) 91.5 ± 0.6 % │ safe source power, 5th percentile 821 mW
 * (as written 913 mW)", shorter in steps to fit cols ("P(any over) ...",
 * "... 5th pct ...", without the written one); the odds exact ("0 %") when
 * the kept ratios show no sample differs from the bench as written.
 * Caller frees. */
char *layout_tol_bench_line(const struct mc_result *, int ascii, int cols);
/* What moves element j's ratio: "source.pulse_energy +0.79, S9.length
 * -0.62, ..." (correlation r of the draw with the ratio; "none: ..." when
 * every kept sample is the same), or NULL when j is
 * not among the worst the run ranks (they are named in *others then,
 * "W1, ND1, PD1", caller frees both). */
char *layout_tol_drivers(const struct mc_result *, size_t j, char **others);
/* Optics that take power without a rating, which no odds cover: "not in
 * these odds: POL1, T1 take power with no rating", NULL for none.  Caller
 * frees. */
char *layout_tol_unrated_note(const struct trace *);
/* The screen's text when no value carries a tolerance: what that means and
 * how to give one, with the bench's own source value as an example (its
 * pulse energy when the source is given by it).  Lines end in '\n'.
 * ascii: "+-" for the sign.  Caller frees. */
char *layout_tol_howto(const struct bench *, int ascii);

/* ---- the histogram of one element's ratio ---- */

#define LAYOUT_HIST_MAX 200

struct layout_hist {
	int    nbins;
	double lo, width;           /* bin b holds lo + b·width <= ratio < lo + (b+1)·width */
	double min, max;            /* of the samples */
	size_t n, top;              /* samples; the fullest bin's count */
	size_t count[LAYOUT_HIST_MAX];
	size_t over[LAYOUT_HIST_MAX], caution[LAYOUT_HIST_MAX]; /* of count, by status */
	size_t n_over, n_caution;   /* over every bin */
	double caution_at;          /* the ratio where caution starts (1/safety factor) */
	int    constant;            /* every sample the same ratio */
};

/* Bins v[0], v[stride], ... (n samples) over the samples' range into as
 * many bins as the samples fill (2·n^(1/3), at least 8) but at most
 * maxbins, with an edge at 100 % where it lies inside; statuses as the run
 * counts them (over >= 1, caution >= caution_at).  0, or -1 for no
 * samples. */
int   layout_hist_make(const double *v, size_t n, size_t stride, double caution_at,
          int maxbins, struct layout_hist *);
/* The kept ratios of element j of a run (mc_opts.keep_ratios). */
int   layout_hist_of(const struct mc_result *, size_t j, int maxbins, struct layout_hist *);
/* The glyph of column b in row `level` (0 the bottom) of a plot `height`
 * rows high: a full block, an eighth-block top or blank ('#' or ' ' in
 * ASCII, whole cells).  A bin with any sample shows at least a sliver. */
const char *layout_hist_cell(const struct layout_hist *, int b, int level, int height,
          int ascii);
/* The status most of column b's samples have (ties to the worse). */
enum damage_status layout_hist_status(const struct layout_hist *, int b);
/* The column where ratio x lies: -1 left of the plot, nbins right of it. */
int   layout_hist_col(const struct layout_hist *, double x);
/* The line under the plot, its bins `cw` columns wide each (nbins·cw
 * columns, at most LAYOUT_HIST_AXIS_MAX): the lowest ratio at the left
 * end, the highest at the right, and a mark with its name under the first
 * column of the bin where caution and where over begin when they lie
 * inside; a label that would overlap another is left out (over first, then
 * caution, then the ends).  UTF-8 ("▲"; ascii: "^").  Returns buf. */
#define LAYOUT_HIST_AXIS_MAX 400
char *layout_hist_axis(char *buf, size_t n, const struct layout_hist *, int cw, int ascii);
/* "W1's ratio in 4000 samples: 84.0 % to 122 %; 3660 over, 340 caution, 0
 * ok" (the constant case: "W1's ratio: 15.9 % in every one of 4000
 * samples ...").  Caller frees. */
char *layout_hist_caption(const struct layout_hist *, const char *id);

#endif
