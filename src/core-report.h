/* core-report.h - the geometry of the printed review (`beamledger report`)
 * decided without a drawing library: which branches get a profile plot and
 * the curve samples along each, axis scales and ticks, element labels of a
 * plot spread so that none overlaps another, the table split into pages,
 * and the chain schematic as cells on a grid with side branches on lanes of
 * their own.  report-pdf*.c only draws what these say.
 *
 * Pure computation (no I/O); unit-tested in tests/check_report.c. */
#ifndef CORE_REPORT_H
#define CORE_REPORT_H

#include <stddef.h>

#include "core-trace.h"

/* ---- the beam profile of one branch ---- */

struct rep_sample {
	double z;                   /* m from the source */
	double wx, wy;              /* 1/e² radii, m */
	double power;               /* W travelling at z */
};
struct rep_mark {
	size_t row;                 /* trace row index */
	double z;                   /* the element's plane, or the focus */
	int    focus;               /* 1: the focus in the gap `row` */
};
struct rep_profile {
	char              branch[160];   /* "main", "BS1.reflected" */
	size_t           *path;          /* owned: trace rows from the source */
	size_t            npath;
	struct rep_sample *s;            /* owned, z ascending */
	size_t            ns;
	struct rep_mark  *mark;          /* owned: elements (not spaces) and foci */
	size_t            nmark;
	double            z0, z1;        /* the z range plotted */
	double            rmax, pmax;    /* top of the radius and power axes ("nice") */
};
/* The trace row that ends each branch, main first then in path order
 * (one profile plot each).  Returns the count; *ends is caller-freed. */
size_t rep_branch_ends(const struct trace *, size_t **ends);
/* Samples the path from the source to row `end`: both radii and the power
 * at every element plane exactly (so that a plot passes through the
 * trace's numbers there) and `per_gap` points inside every space.
 * Returns 0, or -1 when the path is empty. */
int    rep_profile_build(const struct trace *, size_t end, int per_gap,
           struct rep_profile *out);
void   rep_profile_release(struct rep_profile *);
/* v in [v0, v1] onto [p0, p1] (linear; p1 < p0 for an upward y axis). */
double rep_map(double v, double v0, double v1, double p0, double p1);

/* ---- labels that must not overlap ---- */

/* Labels centred at x[i], each w[i] wide, are put on levels 0, 1, ...:
 * taken by prio (higher first; prio may be NULL) and then left to right,
 * each gets the lowest level where it keeps `gap` clear of every label
 * already there.  A label that finds no room on max_levels levels gets
 * level -1 (not shown) and is counted in *crowded (may be NULL).  Returns
 * the levels used. */
int    rep_labels_spread(const double *x, const double *w, const int *prio, size_t n,
           double gap, int max_levels, int *level, size_t *crowded);

/* ---- the element table over pages ---- */

/* Rows of heights h[0..n-1] onto pages: the first page has `first` points
 * free for the table, every later one `rest`; each page repeats a header
 * `header` high.  A row never splits.  page[i] gets row i's page (0 is the
 * table's first page); returns the number of pages (0 when n == 0). */
size_t rep_paginate(const double *h, size_t n, double first, double rest,
           double header, size_t *page);

/* ---- the chain schematic ---- */

struct rep_cell {
	size_t row;                 /* trace row index; spaces are not drawn as cells */
	int    col;                 /* position along the beam, 0 first */
	int    lane;                /* 0 main; a side branch gets a lane below its owner */
	long   prev;                /* cell before it in its branch, -1: first */
	long   owner;               /* first of a branch: the cell of its splitter, else -1 */
	double gap;                 /* m of free space before it (sum of spaces) */
};
struct rep_schematic {
	struct rep_cell *cell;      /* owned, trace order */
	size_t           n;
	int              cols, lanes;
};
/* Places every non-space element: along its branch one column after the
 * other, a side branch starting one column after its splitter on the
 * lowest lane below the splitter's where its cells meet nothing placed
 * before.  The drop from the splitter is drawn half a column after it,
 * between cells, so it can cross a beam line but never a symbol. */
void   rep_schematic_build(const struct trace *, struct rep_schematic *out);
void   rep_schematic_release(struct rep_schematic *);
/* The schematic cut into strips of at most `per_strip` columns for a page
 * width.  strip_lanes[k] (caller gives room for the strip count) gets how
 * many lanes strip k uses, and lane_row[i] the row of cell i within its
 * strip (lanes empty in that strip are squeezed out).  Returns the strip
 * count. */
int    rep_schematic_strips(const struct rep_schematic *, int per_strip,
           int *strip_lanes, int *lane_row);

#endif
