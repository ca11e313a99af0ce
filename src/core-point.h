/* core-point.h - operating points: the bench as it is really run.
 *
 * A point is a name and a short list of changes to the base bench, each a
 * line of text in one grammar (the command line and the bench file alike):
 *
 *   ID.KEY=VALUE        a value of an element (a key of the model's table;
 *                       an empty VALUE unsets an optional key)
 *   source.KEY=VALUE    a value of the source (the keys of `set --bench`)
 *   -ID                 the element is taken out of the beam (with its side
 *                       branch), as if absent
 *   +TYPE:ID@AFTER      a new element put in after element AFTER, in
 *   +TYPE:ID@^BEFORE    AFTER's branch (or before BEFORE); its values come
 *                       from ID.KEY=VALUE changes of the same point
 *
 * Source changes apply first, then the rest in the order written; the
 * result must pass model_validate.  Pure computation. */
#ifndef CORE_POINT_H
#define CORE_POINT_H

#include <stddef.h>

#include "core-damage.h"
#include "core-model.h"

struct point {
	char   *name;               /* owned; unique in the bench */
	char  **change;             /* owned array of owned texts */
	size_t  n, cap;
};

/* struct point_list is declared in core-model.h (the bench holds one). */
void          point_list_release(struct point_list *);
void          point_list_copy(struct point_list *dst, const struct point_list *src);
struct point *point_list_find(const struct point_list *, const char *name);  /* borrowed; NULL */
/* A new empty point at the end (borrowed; moves when the list grows). */
struct point *point_list_push(struct point_list *, const char *name);
void          point_list_remove(struct point_list *, size_t i);
void          point_add_change(struct point *, const char *text);

/* Checks a point's name: non-empty, UTF-8, no '@' or '=' or spaces at its
 * ends ("base" is the name of the bench without a point). */
int           point_name_check(const char *name, char **cause);

/* Checks the grammar of one change text, without the bench. */
int           point_change_check(const char *text, char **cause);

/* A copy of the bench with the point applied (the copy holds no points).
 * Messages name the point, the id and the key: "point 'align': ND9.od: ...". */
struct bench *point_apply(const struct bench *, const struct point *,
                  char **cause);                           /* caller frees */

/* Every point of the bench applies cleanly (called by model_validate). */
int           point_check_all(const struct bench *, char **cause);

/* All-or-nothing edits of a bench's points: the named point is added (and
 * refused when it exists, a change is malformed, or it does not apply), or
 * removed (refused when it does not exist). */
int           point_edit_add(struct bench *, const char *name,
                  char *const *changes, size_t n, char **cause);
int           point_edit_remove(struct bench *, const char *name, char **cause);

/* An element of the base renamed: every change that names it follows. */
void          point_rename_id(struct bench *, const char *old_id, const char *new_id);

/* The base and every point traced: per point its worst element, per
 * element its worst ratio over all of them and at which point.  Index 0 is
 * the base; index 1 + i is b->points.p[i] (or the one point asked for).
 * The points share one copy of the bench and one trace result in turn, so
 * a survey costs about one copy and one trace per point. */
struct trace;
struct point_summary {
	const char         *name;       /* borrowed: "base" or the point's name */
	char               *worst_id;   /* owned; NULL: nothing rated */
	double              worst_ratio;
	double              safe_source_power;
	enum damage_status  status;     /* the highest at that point */
};
struct point_worst {
	char               *id;         /* owned */
	double              ratio;      /* NAN: unrated everywhere */
	enum damage_status  status;
	size_t              at;         /* index of the point (0: base) */
	size_t              present;    /* how many of the points hold it */
};
struct point_survey {
	size_t                n;        /* 1 + number of points traced */
	struct point_summary *pt;       /* owned [n] */
	struct point_worst   *el;       /* owned, base order then elements put in */
	size_t                nel;
	double               *ratio;    /* owned [n * nel]: element j at point i is
	                                 * ratio[i * nel + j]; NAN: unrated or absent */
	int                   any_over;
	struct trace         *base_trace;   /* owned: of the base */
	struct bench         *last;         /* owned: the last point applied; NULL when n == 1 */
	struct trace         *last_trace;   /* owned: of `last`; traced whole (opts) when
	                                     * only_one names it, else TRACE_LEAN
	                                     * (its ratings and warnings exact, the
	                                     * ghosts' summaries not all there) */
};
/* The bench must have passed model_validate (which applies every point).
 * only_one: trace just the point of that name (NULL: every point). */
int  point_survey_run(const struct bench *, const char *only_one,
         struct point_survey *out, char **cause);
/* The same with trace_rerun_opts options for every trace (TRACE_GHOST_ROWS). */
int  point_survey_run_opts(const struct bench *, const char *only_one, unsigned opts,
         struct point_survey *out, char **cause);
void point_survey_release(struct point_survey *);

#endif
