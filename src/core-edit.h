/* core-edit.h - the changes a person makes to a bench: add, set, unset,
 * remove, move, and the bench's own settings and source.  The command line
 * and the workbench both edit through these, so the same input meets the
 * same check and the same message.
 *
 * Every function is all-or-nothing: it works on a copy, validates the whole
 * bench, and only then replaces it; on failure the bench is untouched and
 * *cause says why.  Pure computation. */
#ifndef CORE_EDIT_H
#define CORE_EDIT_H

#include "core-model.h"

/* Where an element goes.  With none set: the end of the main path.
 * after/before name a sibling (the new element joins that sibling's list);
 * into names a side port, "BS1.reflected" (the element goes at its end, or
 * at its start when at_start != 0). */
struct edit_place {
	const char *after;
	const char *before;
	const char *into;
	int         at_start;
};

/* A new element from a type name, an id and KEY=VALUE texts ("focal=250 mm",
 * "damage.fluence=10 J/cm^2", "label=fold 1").  A splitter gets an empty
 * reflected branch unless a "side=transmitted" pair says otherwise. */
int  edit_element_new(struct element *out, const char *type, const char *id,
         char *const *kv, size_t nkv, char **cause);
/* Adds el at place; takes el on success, releases it on failure. */
int  edit_add(struct bench *, struct element *el, const struct edit_place *, char **cause);
/* KEY=VALUE on an element.  Keys: every key of the model's table
 * (damage.* included), label, part, id (rename), side (reflected,
 * transmitted, rejected, none: a splitter's or polarizer's side port).
 * An empty value unsets an optional key. */
int  edit_set(struct bench *, const char *id, const char *key, const char *text,
         char **cause);
int  edit_set_pairs(struct bench *, const char *id, char *const *kv, size_t nkv,
         char **cause);
int  edit_remove(struct bench *, const char *id, char **cause);
int  edit_move(struct bench *, const char *id, const struct edit_place *, char **cause);
/* Bench settings: name, notes, safety_factor, air_breakdown and source.*:
 * wavelength, power, pulsed (true/false), pulse_energy, rep_rate,
 * pulse_width, shape, waist ("3 mm" or "3 mm, 2 mm"), waist_position,
 * m2 ("1.3" or "1.3, 1.5"), polarization (degrees, circular, unpolarized). */
int  edit_set_bench(struct bench *, const char *key, const char *text, char **cause);
/* The same on b itself, without validating the whole bench: for a copy
 * that is validated once after several changes (operating points). */
int  edit_set_bench_unchecked(struct bench *, const char *key, const char *text,
         char **cause);
/* The bench-level keys edit_set_bench takes, NULL-terminated. */
extern const char *const edit_bench_keys[];
/* Current value of a bench-level key as text that edit_set_bench reads back. */
char *edit_bench_value(const struct bench *, const char *key);        /* caller frees */

/* Splits "KEY=VALUE" in place; returns the value or NULL without '='. */
char *edit_split_pair(char *kv);

/* For core-edit*.c: validates copy (owned, consumed) and swaps it into b,
 * freeing what it replaces; on failure b is untouched. */
int  edit_commit_copy(struct bench *b, struct bench *copy, char **cause);

#endif
