/* core-trace.h - walk a bench and compute what every element sees: power,
 * beam radii, irradiance, fluence, peak field, B-integral, damage ratio and
 * status; foci in the gaps; beams that leave the bench.
 *
 * Results for an element are taken at its plane, before it acts (for a
 * space: at its start).  The conventions are those of trace-conventions.md.
 * Pure computation: the only allocation is the result it returns. */
#ifndef CORE_TRACE_H
#define CORE_TRACE_H

#include <stddef.h>

#include "core-beam.h"
#include "core-damage.h"
#include "core-model.h"

enum trace_flag {
	TF_CLIPPING            = 1 << 0,   /* aperture passes < 99 % */
	TF_HARD_CLIP           = 1 << 1,   /* < 90 %: the Gaussian model after it is rough */
	TF_WAVELENGTH_SCALED   = 1 << 2,
	TF_PULSE_SCALED        = 1 << 3,
	TF_PULSE_RANGE         = 1 << 4,   /* "pulse_scaling_out_of_range" */
	TF_PULSED_RATING_ON_CW = 1 << 5,   /* only a fluence rating, CW beam */
	TF_SELF_FOCUSING       = 1 << 6,
	TF_FOCUS               = 1 << 7,   /* a focus lies in this gap */
	TF_AIR_BREAKDOWN       = 1 << 8,
	TF_ABOVE_CRITICAL      = 1 << 9,   /* P ≥ P_cr, but the collapse distance
	                                    * exceeds the thickness: a note */
	TF_GHOSTS              = 1 << 10,  /* the ratio counts ghosts meeting it */
};
#define TF_COUNT 11
const char *trace_flag_name(unsigned bit);     /* "clipping", ... ; bit is one flag */

/* A waist in a gap.  It is a focus when it concentrates the beam: the
 * smaller of the beam areas (wx·wy) at the gap's two ends over the area at
 * the waist is at least TRACE_FOCUS_CONCENTRATION; a collimated beam's
 * waist after a telescope is not. */
#define TRACE_FOCUS_CONCENTRATION 2.0
/* A waist this close to the next element's plane is on it (a pinhole at a
 * focus): the focus of the gap before. */
#define TRACE_PLANE_TOL 1e-9        /* m */

struct trace_focus {
	double z;                   /* m from the source along the branch */
	double wx, wy;
	double irradiance, peak_irradiance;
	double concentration;       /* min end area / waist area, >= 1 */
	const struct element *on;   /* borrowed: the element whose plane holds
	                             * the waist; NULL inside the gap or at the
	                             * end of the branch */
	int    air_breakdown;       /* pulsed, in air only */
};

struct trace_row {
	const struct element *el;       /* borrowed from the bench */
	const struct element *parent;   /* owner of the side branch; NULL on main */
	enum port             port;
	unsigned              depth;    /* 0 on main */
	double                z;
	double                stokes[4];  /* arriving */
	struct beam_axis      qx, qy;     /* arriving */
	double                power_in, power_out, power_lost;
	double                wx, wy;
	double                irradiance, linear_density, peak_irradiance, field;
	double                clip_loss;
	double                fluence, peak_power;        /* NAN for CW */
	double                b_integral, b_total;        /* NAN where no n2/thickness */
	double                critical_power;             /* NAN without n2 */
	double                collapse_distance;          /* m; NAN below P_cr or without n2 */
	double                critical_ratio;             /* P_pk/P_cr; NAN without n2 */
	double                ratio;                      /* NAN: unrated */
	struct damage_limits  limits;
	enum damage_status    status;
	unsigned              flags;
	int                   has_waist;  /* a waist lies in this gap (focus holds it) */
	int                   has_focus;  /* ... and it is a focus (concentration >= 2) */
	struct trace_focus    focus;
};

enum trace_warn_kind { TW_UNTERMINATED, TW_B_INTEGRAL, TW_AIR_BREAKDOWN, TW_SELF_FOCUSING,
	TW_UNRATED_DUMP,     /* a dump with no max_power takes power */
	TW_UNRATED_ABSORBER, /* another optic without any rating absorbs (or, a
	                      * detector or target, takes) more than
	                      * TRACE_UNRATED_LEVEL */
	TW_GHOST_OVER,       /* a ghost over at an element (after: it; value: ratio) */
	TW_STRAY,            /* a stray at or above stray_warn (after: its source; W) */
	TW_RETURN_POWER      /* more than max_return back at the source (W) */
};
/* Absorbed power above which an unrated optic is worth a warning: 0.5 W,
 * the CW limit of class 3B (IEC 60825-1, from memory), where a beam starts
 * to burn what stops it (common practice, no source for the choice). */
#define TRACE_UNRATED_LEVEL 0.5     /* W */

struct trace_warning {
	enum trace_warn_kind  kind;
	const struct element *parent;   /* branch owner; NULL: main */
	enum port             port;
	const struct element *after;    /* borrowed; NULL: straight after the source */
	double                value;    /* W (unterminated, self_focusing), rad, W/m² */
	double                distance; /* self_focusing: collapse distance, m;
	                                 * a ghost's spark: m to the nearest element */
	int                   ghost;    /* air_breakdown at a ghost's focus */
	const char           *surface;  /* static: a stray's kind ("back",
	                                 * "fourth_port", ...); NULL otherwise */
};

struct trace {
	const struct bench   *bench;    /* borrowed: outlives the trace */
	struct trace_row     *rows;     /* owned, depth-first path order */
	size_t                nrows, caprows;
	struct trace_warning *warn;     /* owned */
	size_t                nwarn, capwarn;
	long                  worst;    /* row index, -1 when nothing is rated */
	const struct element *worst_el; /* borrowed: its element; NULL with -1 */
	double                worst_ratio;
	double                safe_source_power;   /* NAN when nothing is rated; INFINITY when no rated element gets power */
	double                absorbed, leaving;   /* W: sum of power_lost; sum left on the table */
	const struct element *nonfinite;        /* borrowed: first element with a result that
	                                         * is not a finite number; NULL: none */
	const char           *nonfinite_what;   /* static: which result ("beam radius") */
	struct ghost_set     *ghosts;   /* owned (core-ghost.h); NULL: main beam only */
	struct ghost_scratch *gscratch; /* owned (core-ghost.h): the ghost engine's
	                                 * buffers, kept for the next trace_rerun */
};

/* trace_rerun_opts: the main beam alone, exactly as before ghosts were
 * traced (--no-ghosts). */
#define TRACE_NO_GHOSTS 1u
/* ... and every ghost's row at every element it meets (JSON, CSV): the
 * ratings are the same without; see ghost_run. */
#define TRACE_GHOST_ROWS 2u
/* ... or only what the ratings and warnings need (a sweep, a tolerance
 * run): every ratio, status, worst, safe_source_power and warning is
 * exactly the full trace's, but the ghosts' summaries (ghost_set.at:
 * empty) and their flag "ghosts" at unrated elements are left out, and so
 * are ghost foci that cannot spark (every CW one).  See ghost_run. */
#define TRACE_LEAN 4u

/* The main beam with no rows kept: each row is handed to `fn` as it is
 * made (fn may be NULL) and then overwritten, so a 10^5-element trace
 * holds two rows, not 38 MB of them.  Everything else of the result is
 * there (warnings, worst_el, worst_ratio, safe_source_power, nonfinite);
 * rows, nrows and worst are not to be read.  Implies TRACE_NO_GHOSTS (the
 * reflections need every row).  For `trace --format json` of a long
 * chain: a first pass checks, the second writes. */
typedef void trace_row_fn(void *arg, const struct trace *, const struct trace_row *);
struct trace *trace_stream(struct trace *t, const struct bench *, trace_row_fn *fn,
                  void *arg);

/* The bench must have passed model_validate.  Never fails. */
struct trace *trace_run(const struct bench *);     /* caller frees */
/* The same, reusing the memory of an earlier result t (which it returns;
 * NULL t allocates).  The workbench retraces on every edit this way, and a
 * large bench then costs no fresh pages. */
struct trace *trace_rerun(struct trace *t, const struct bench *);
struct trace *trace_rerun_opts(struct trace *t, const struct bench *, unsigned opts);
/* A trace made with TRACE_NO_GHOSTS made whole: its reflections added,
 * exactly as trace_rerun_opts without TRACE_NO_GHOSTS would have (opts:
 * TRACE_GHOST_ROWS or 0).  Nothing when it has them already. */
void          trace_add_ghosts(struct trace *, unsigned opts);
void          trace_free(struct trace *);          /* NULL ok */
/* 0, or -1 with *cause naming the element when some result of the trace is
 * not a finite number (values at the edge of their ranges, multiplied
 * together).  Such a trace is an error, never a safe reading: a rated
 * element with no finite ratio is also marked over (ratio INFINITY). */
int           trace_check(const struct trace *, char **cause);

/* "main" or "<parent id>.<port>", into buf. */
void          trace_branch_name(const struct element *parent, enum port,
                  char *buf, size_t n);
const char   *trace_warn_name(enum trace_warn_kind);
/* For the ghost engine: what an element does to q (lenses, curved
 * mirrors), and the power it sends to its continuing and side ports from
 * the Stokes vector s_in that reaches it after clipping. */
void          trace_element_optics(const struct element *, double lambda,
                  struct beam_axis *x, struct beam_axis *y);
void          trace_element_ports(const struct element *, double lambda,
                  const double s_in[4], double *main_out, double *side_out);
void          trace_add_warning(struct trace *, enum trace_warn_kind,
                  const struct element *parent, enum port,
                  const struct element *after, double value);
/* Radii dz past the start of a row's plane (inside a space). */
void          trace_radius_at(const struct trace *, const struct trace_row *,
                  double dz, double *wx, double *wy);

#endif
