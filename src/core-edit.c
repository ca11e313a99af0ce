/* core-edit.c - all-or-nothing edits of a bench.  Each edit runs on a deep
 * copy which must pass model_validate before it replaces the original, so a
 * refused edit can never leave a half-changed bench behind. */
#include <config.h>

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "core-edit.h"
#include "core-point.h"
#include "util-err.h"

/* Swaps the checked copy in; frees what it replaces. */
int
edit_commit_copy(struct bench *b, struct bench *copy, char **cause)
{
	struct bench tmp;

	if (model_validate(copy, cause) != 0) {
		model_bench_free(copy);
		return -1;
	}
	tmp = *b;
	*b = *copy;
	*copy = tmp;
	model_bench_free(copy);
	return 0;
}

char *
edit_split_pair(char *kv)
{
	char *eq = strchr(kv, '=');

	if (eq == NULL)
		return NULL;
	*eq = '\0';
	return eq + 1;
}

static int
parse_port(const char *text, enum port *p)
{
	if (strcmp(text, "reflected") == 0)
		*p = PORT_REFLECTED;
	else if (strcmp(text, "transmitted") == 0)
		*p = PORT_TRANSMITTED;
	else if (strcmp(text, "rejected") == 0)
		*p = PORT_REJECTED;
	else if (strcmp(text, "none") == 0 || text[0] == '\0')
		*p = PORT_NONE;
	else
		return -1;
	return 0;
}

/* One key on one element, with no whole-bench check. */
static int
set_one(struct element *el, const char *key, const char *text, char **cause)
{
	int k;

	if (strcmp(key, "label") == 0 || strcmp(key, "part") == 0) {
		char **dst = key[0] == 'l' ? &el->label : &el->part;

		free(*dst);
		*dst = text[0] != '\0' ? xstrdup(text) : NULL;
		return 0;
	}
	if (strcmp(key, "id") == 0) {
		if (text[0] == '\0')
			return fail_with(cause, "element '%s': id: must not be empty", el->id);
		free(el->id);
		el->id = xstrdup(text);
		return 0;
	}
	if (strcmp(key, "side") == 0) {
		enum port p;

		if (parse_port(text, &p) != 0)
			return fail_with(cause, "element '%s': side: '%s' is not reflected, "
			    "transmitted, rejected or none", el->id, text);
		if (p != PORT_NONE && !model_type_takes_port(el->type, p))
			return fail_with(cause, "element '%s': a %s has no %s port", el->id,
			    model_type_name(el->type), text);
		if (p == PORT_NONE && el->side.n > 0)
			return fail_with(cause, "element '%s': side: its %s branch still holds "
			    "%zu element(s); remove them first", el->id,
			    model_port_name(el->side_port), el->side.n);
		el->side_port = p;
		return 0;
	}
	k = model_key_find(key);
	if (k < 0)
		return fail_with(cause, "element '%s': unknown key '%s'", el->id, key);
	if (!model_key_applies((enum model_key)k, el->type))
		return fail_with(cause, "element '%s': a %s has no key '%s'", el->id,
		    model_type_name(el->type), key);
	if (text[0] == '\0') {
		model_unset(el, (enum model_key)k);
		return 0;
	}
	return model_set_text(el, (enum model_key)k, text, cause);
}

int
edit_element_new(struct element *out, const char *type, const char *id,
    char *const *kv, size_t nkv, char **cause)
{
	enum elem_type t;

	if (model_type_parse(type, &t) != 0)
		return fail_with(cause, "unknown type '%s' (space, mirror, lens, splitter, "
		    "window, filter, waveplate, polarizer, iris, dump, detector, target, isolator)", type);
	if (id == NULL || id[0] == '\0')
		return fail_with(cause, "a new %s needs an id", type);
	model_element_init(out, t, id);
	if (t == EL_SPLITTER)
		out->side_port = PORT_REFLECTED;
	for (size_t i = 0; i < nkv; i++) {
		char *pair = xstrdup(kv[i]), *val = edit_split_pair(pair);
		int rc;

		rc = val == NULL ?
		    fail_with(cause, "element '%s': '%s' is not KEY=VALUE", id, kv[i]) :
		    set_one(out, pair, val, cause);
		free(pair);
		if (rc != 0) {
			model_element_release(out);
			return -1;
		}
	}
	return 0;
}

/* Resolves a place to a branch and an index in the copy. */
static int
locate(struct bench *b, const struct edit_place *pl, struct branch **br, size_t *at,
    char **cause)
{
	struct element *el;
	size_t i;

	if (pl == NULL || (pl->after == NULL && pl->before == NULL && pl->into == NULL)) {
		*br = &b->path;
		*at = b->path.n;
		return 0;
	}
	if (pl->into != NULL) {
		char *id = xstrdup(pl->into), *dot = strrchr(id, '.');
		enum port p = PORT_NONE;

		if (dot != NULL) {
			*dot = '\0';
			if (parse_port(dot + 1, &p) != 0 || p == PORT_NONE)
				dot = NULL;
		}
		if (dot == NULL) {
			fail_with(cause, "'%s' is not SPLITTER.PORT (e.g. BS1.reflected)", pl->into);
			free(id);
			return -1;
		}
		el = model_find(b, id, NULL, NULL, NULL);
		if (el == NULL) {
			fail_with(cause, "no element '%s' in bench '%s'", id, b->name);
			free(id);
			return -1;
		}
		if (el->side_port != p) {
			fail_with(cause, "element '%s' has no %s branch%s%s", id,
			    model_port_name(p), el->side_port != PORT_NONE ? "; its side port is " : "",
			    el->side_port != PORT_NONE ? model_port_name(el->side_port) : "");
			free(id);
			return -1;
		}
		free(id);
		*br = &el->side;
		*at = pl->at_start ? 0 : el->side.n;
		return 0;
	}
	el = model_find(b, pl->after != NULL ? pl->after : pl->before, br, &i, NULL);
	if (el == NULL)
		return fail_with(cause, "no element '%s' in bench '%s'",
		    pl->after != NULL ? pl->after : pl->before, b->name);
	*at = pl->after != NULL ? i + 1 : i;
	return 0;
}

int
edit_add(struct bench *b, struct element *el, const struct edit_place *pl, char **cause)
{
	struct bench *copy;
	struct branch *br;
	size_t at;

	if (model_find(b, el->id, NULL, NULL, NULL) != NULL) {
		fail_with(cause, "element '%s': id used twice", el->id);
		model_element_release(el);
		return -1;
	}
	copy = model_bench_dup(b);
	if (locate(copy, pl, &br, &at, cause) != 0) {
		model_bench_free(copy);
		model_element_release(el);
		return -1;
	}
	model_branch_insert(br, at, el);
	return edit_commit_copy(b, copy, cause);
}

int
edit_set_pairs(struct bench *b, const char *id, char *const *kv, size_t nkv, char **cause)
{
	struct bench *copy = model_bench_dup(b);
	struct element *el = model_find(copy, id, NULL, NULL, NULL);

	if (el == NULL) {
		model_bench_free(copy);
		return fail_with(cause, "no element '%s' in bench '%s'", id, b->name);
	}
	for (size_t i = 0; i < nkv; i++) {
		char *pair = xstrdup(kv[i]), *val = edit_split_pair(pair);
		int rc = val == NULL ?
		    fail_with(cause, "element '%s': '%s' is not KEY=VALUE", id, kv[i]) :
		    set_one(el, pair, val, cause);

		free(pair);
		if (rc != 0) {
			model_bench_free(copy);
			return -1;
		}
	}
	if (strcmp(el->id, id) != 0)
		point_rename_id(copy, id, el->id);    /* operating points follow a rename */
	return edit_commit_copy(b, copy, cause);
}

int
edit_set(struct bench *b, const char *id, const char *key, const char *text, char **cause)
{
	char *pair = xasprintf("%s=%s", key, text);
	int rc = edit_set_pairs(b, id, &pair, 1, cause);

	free(pair);
	return rc;
}

int
edit_remove(struct bench *b, const char *id, char **cause)
{
	struct branch *br;
	size_t i;

	if (model_find(b, id, &br, &i, NULL) == NULL)
		return fail_with(cause, "no element '%s' in bench '%s'", id, b->name);
	if (b->points.n > 0) {
		/* an operating point may change or put something after it */
		struct bench *copy = model_bench_dup(b);

		model_find(copy, id, &br, &i, NULL);
		model_branch_remove(br, i, NULL);
		return edit_commit_copy(b, copy, cause);
	}
	/* Removing never breaks a rule the bench already kept, except a
	 * terminator that now stands last by accident of order: none can. */
	model_branch_remove(br, i, NULL);
	return 0;
}

static int
contains(const struct element *el, const char *id)
{
	for (size_t i = 0; i < el->side.n; i++)
		if (strcmp(el->side.el[i].id, id) == 0 || contains(&el->side.el[i], id))
			return 1;
	return 0;
}

int
edit_move(struct bench *b, const char *id, const struct edit_place *pl, char **cause)
{
	struct bench *copy;
	struct element moving, *target;
	struct branch *br;
	size_t i, at;
	const char *ref = pl == NULL ? NULL :
	    pl->after != NULL ? pl->after : pl->before != NULL ? pl->before : pl->into;

	if (ref != NULL && strcmp(ref, id) == 0)
		return fail_with(cause, "element '%s' cannot move next to itself", id);
	copy = model_bench_dup(b);
	if ((target = model_find(copy, id, &br, &i, NULL)) == NULL) {
		model_bench_free(copy);
		return fail_with(cause, "no element '%s' in bench '%s'", id, b->name);
	}
	if (ref != NULL) {
		char *rid = xstrdup(ref), *dot = pl->into != NULL ? strrchr(rid, '.') : NULL;

		if (dot != NULL)
			*dot = '\0';
		if (strcmp(rid, id) == 0 || contains(target, rid)) {
			fail_with(cause, "element '%s' cannot move into its own side branch", id);
			free(rid);
			model_bench_free(copy);
			return -1;
		}
		free(rid);
	}
	model_branch_remove(br, i, &moving);
	if (locate(copy, pl, &br, &at, cause) != 0) {
		model_element_release(&moving);
		model_bench_free(copy);
		return -1;
	}
	model_branch_insert(br, at, &moving);
	return edit_commit_copy(b, copy, cause);
}
