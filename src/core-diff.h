/* core-diff.h - what changed between two states of a bench, and what the
 * change did to the results.
 *
 * The chain: elements added, removed or moved (matched by id), each value
 * that differs (old -> new, as display text with units and as exact text
 * that KEY=VALUE reads back), and the bench settings and source.  The
 * effect: per element, power arriving, peak irradiance, fluence (pulsed),
 * damage ratio and status on both sides, for every element whose results
 * differ (rated on either side, ending a branch, added or removed).  The
 * workbench and `beamledger diff` both use it; report-diff.h
 * turns it into text or JSON.
 *
 * Pure computation.  A diff owns copies of everything it holds, so it
 * outlives the benches and traces it came from. */
#ifndef CORE_DIFF_H
#define CORE_DIFF_H

#include <stddef.h>

#include "core-damage.h"
#include "core-model.h"
#include "core-trace.h"

enum diff_kind {
	DIFF_ADDED,             /* only in the new bench */
	DIFF_REMOVED,           /* only in the old bench */
	DIFF_MOVED,             /* in both, at another place (values may differ too) */
	DIFF_CHANGED,           /* in both, same place, some value differs */
	DIFF_SETTINGS           /* the bench's settings or source (id is NULL) */
};

/* One value.  key is a model key path ("focal", "damage.fluence"), one of
 * "type", "label", "part", "side", or a bench key ("safety_factor",
 * "source.power").  The exact text is NULL on a side that does not give
 * the value; its display text then says "(default 1)" or "-", or is NULL
 * too when the element is absent there (added, removed). */
struct diff_value {
	char *key;                  /* owned */
	char *old_text, *new_text;  /* owned: display, "200 mm", "(default 1)" */
	char *old_exact, *new_exact;/* owned: exact, "0.2 m" */
};

/* Where an element stands: its branch ("main", "BS1.reflected") and the
 * element before it there (NULL: first in its branch). */
struct diff_place {
	char *branch;               /* owned; NULL when the element is absent */
	char *after;                /* owned, may be NULL */
};

struct diff_change {
	enum diff_kind     kind;
	char              *id;          /* owned; NULL for DIFF_SETTINGS */
	enum elem_type     type;        /* the new type (the old one when removed) */
	struct diff_place  old_at, new_at;
	struct diff_value *vals;        /* owned; added/removed: every value it has */
	size_t             nvals, capvals;
};

/* Results on the two sides: [0] old, [1] new.  NAN where absent or not
 * applicable (fluence of a CW beam, ratio of an unrated element). */
struct diff_effect {
	char              *id;          /* owned */
	enum elem_type     type;
	int                present[2];
	double             power[2];    /* W arriving */
	double             peak[2];     /* W/m², peak irradiance */
	double             fluence[2];  /* J/m² */
	double             ratio[2];    /* of the scaled threshold */
	enum damage_status status[2];
};

struct diff {
	struct diff_change *ch;         /* owned, chain order (new side first) */
	size_t              nch, capch;
	struct diff_effect *fx;         /* owned, new path order, then removed ones */
	size_t              nfx, capfx;
	int                 traced;     /* fx and the fields below are filled */
	int                 pulsed[2];
	char               *worst_id[2];        /* owned, NULL: nothing rated */
	double              worst_ratio[2];
	enum damage_status  worst_status[2];
	double              safe_power[2];      /* W, NAN: nothing rated */
};

/* The chain and settings only. */
struct diff *diff_benches(const struct bench *old, const struct bench *new_b); /* caller frees */
/* Adds the effect on the results from the two traces of those benches. */
void         diff_add_traces(struct diff *, const struct trace *old, const struct trace *new_t);
/* Both: traces the two benches (which must be valid) and compares. */
struct diff *diff_run(const struct bench *old, const struct bench *new_b);     /* caller frees */
void         diff_free(struct diff *);                                         /* NULL ok */
/* Number of chain changes of each kind, for summaries. */
size_t       diff_count(const struct diff *, enum diff_kind);

/* A value for people: the fewest significant digits (3 at least) that
 * still tell it apart from its neighbours at 1e-12, in the unit of the
 * dimension ("250 mm", "12.5 kW/cm²").  ascii: "u" and "^2". */
char        *diff_value_show(double v, enum unit_dim dim, int ascii);  /* caller frees */
/* A key of an element for people: "250 mm", "0.995", "45°", "x", "true";
 * an absent key with a default shows "(default 1)", without one "-". */
char        *diff_key_show(const struct element *, enum model_key, int ascii); /* caller frees */
/* Worst status of a trace (STATUS_UNRATED when nothing is rated). */
enum damage_status diff_trace_worst(const struct trace *);

#endif
