/* core-point.c - operating points: named change lists applied to a copy of
 * the bench.  The changes go through the model's key table and the source
 * setter of core-edit, so a value in a point meets the same check as the
 * same value typed anywhere else. */
#include <config.h>

#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "core-edit.h"
#include "core-point.h"
#include "core-trace.h"
#include "util-buf.h"
#include "util-err.h"

static void
point_release(struct point *p)
{
	for (size_t i = 0; i < p->n; i++)
		free(p->change[i]);
	free(p->change);
	free(p->name);
	memset(p, 0, sizeof *p);
}

void
point_list_release(struct point_list *l)
{
	for (size_t i = 0; i < l->n; i++)
		point_release(&l->p[i]);
	free(l->p);
	memset(l, 0, sizeof *l);
}

void
point_add_change(struct point *p, const char *text)
{
	if (p->n == p->cap) {
		p->cap = p->cap ? 2 * p->cap : 4;
		p->change = xreallocarray(p->change, p->cap, sizeof *p->change);
	}
	p->change[p->n++] = xstrdup(text);
}

struct point *
point_list_push(struct point_list *l, const char *name)
{
	struct point *p;

	if (l->n == l->cap) {
		l->cap = l->cap ? 2 * l->cap : 4;
		l->p = xreallocarray(l->p, l->cap, sizeof *l->p);
	}
	p = &l->p[l->n++];
	memset(p, 0, sizeof *p);
	p->name = xstrdup(name);
	return p;
}

void
point_list_copy(struct point_list *dst, const struct point_list *src)
{
	memset(dst, 0, sizeof *dst);
	for (size_t i = 0; i < src->n; i++) {
		struct point *p = point_list_push(dst, src->p[i].name);

		for (size_t j = 0; j < src->p[i].n; j++)
			point_add_change(p, src->p[i].change[j]);
	}
}

struct point *
point_list_find(const struct point_list *l, const char *name)
{
	for (size_t i = 0; i < l->n; i++)
		if (strcmp(l->p[i].name, name) == 0)
			return &l->p[i];
	return NULL;
}

void
point_list_remove(struct point_list *l, size_t i)
{
	if (i >= l->n)
		return;
	point_release(&l->p[i]);
	memmove(&l->p[i], &l->p[i + 1], (l->n - 1 - i) * sizeof *l->p);
	l->n--;
}

int
point_name_check(const char *name, char **cause)
{
	size_t len = name != NULL ? strlen(name) : 0;

	if (len == 0)
		return fail_with(cause, "a point needs a name");
	if (!utf8_valid(name))
		return fail_with(cause, "point name is not valid UTF-8 text");
	if (strcmp(name, "base") == 0)
		return fail_with(cause, "point 'base': that name is the bench without a point");
	if (name[0] == ' ' || name[len - 1] == ' ' || strpbrk(name, "@=\t\n") != NULL)
		return fail_with(cause, "point '%s': a name has no '@', '=', tabs, line "
		    "breaks or spaces at its ends", name);
	return 0;
}

/* ---- the grammar ---- */

static char *
dupn(const char *s, size_t n)
{
	char *t = xmalloc(n + 1);

	memcpy(t, s, n);
	t[n] = '\0';
	return t;
}

struct change {
	enum { CH_SET, CH_OUT, CH_IN } op;
	char *id;                   /* owned: element id or "source" */
	char *key;                  /* owned: SET key; IN type */
	const char *value;          /* borrowed from the text: SET value */
	char *anchor;               /* owned: IN */
	int   before;
};

static void
change_release(struct change *c)
{
	free(c->id);
	free(c->key);
	free(c->anchor);
}

/* Splits a text into its parts; ID.KEY is split at the first '.' here and
 * resolved against the bench later. */
static int
change_parse(const char *text, struct change *c, char **cause)
{
	const char *eq, *dot, *colon, *at;

	memset(c, 0, sizeof *c);
	if (text[0] == '-') {
		if (text[1] == '\0')
			return fail_with(cause, "'-': which element comes out? write -ID");
		c->op = CH_OUT;
		c->id = xstrdup(text + 1);
		return 0;
	}
	if (text[0] == '+') {
		enum elem_type t;

		colon = strchr(text, ':');
		at = colon != NULL ? strchr(colon, '@') : NULL;
		if (colon == NULL || at == NULL || colon == text + 1 || at == colon + 1 ||
		    at[1] == '\0' || (at[1] == '^' && at[2] == '\0'))
			return fail_with(cause, "'%s': a new element is written "
			    "+TYPE:ID@AFTER or +TYPE:ID@^BEFORE", text);
		c->op = CH_IN;
		c->key = dupn(text + 1, (size_t)(colon - text - 1));
		c->id = dupn(colon + 1, (size_t)(at - colon - 1));
		c->before = at[1] == '^';
		c->anchor = xstrdup(at + 1 + c->before);
		if (model_type_parse(c->key, &t) != 0) {
			fail_with(cause, "'%s': '%s' is not an element type", text, c->key);
			change_release(c);
			return -1;
		}
		return 0;
	}
	eq = strchr(text, '=');
	dot = strchr(text, '.');
	if (eq == NULL || dot == NULL || dot > eq || dot == text || dot + 1 == eq)
		return fail_with(cause, "'%s': a change is ID.KEY=VALUE, source.KEY=VALUE, "
		    "-ID or +TYPE:ID@AFTER", text);
	c->op = CH_SET;
	c->id = dupn(text, (size_t)(dot - text));
	c->key = dupn(dot + 1, (size_t)(eq - dot - 1));
	c->value = eq + 1;
	return 0;
}

int
point_change_check(const char *text, char **cause)
{
	struct change c;

	if (text == NULL || !utf8_valid(text))
		return fail_with(cause, "a change is not valid UTF-8 text");
	if (change_parse(text, &c, cause) != 0)
		return -1;
	change_release(&c);
	return 0;
}

/* ID.KEY with a '.' inside the id: the longest id that names an element. */
static struct element *
resolve(struct bench *b, struct change *c, const char *text)
{
	const char *eq = strchr(text, '=');
	struct element *el = model_find(b, c->id, NULL, NULL, NULL);

	for (const char *d = strchr(text + strlen(c->id) + 1, '.');
	    el == NULL && d != NULL && d < eq; d = strchr(d + 1, '.')) {
		char *id = dupn(text, (size_t)(d - text));

		if ((el = model_find(b, id, NULL, NULL, NULL)) != NULL) {
			free(c->id);
			free(c->key);
			c->id = id;
			c->key = dupn(d + 1, (size_t)(eq - d - 1));
		} else {
			free(id);
		}
	}
	return el;
}

static int
apply_set(struct bench *b, struct change *c, const char *text, char **cause)
{
	struct element *el;
	int k;

	if ((el = resolve(b, c, text)) == NULL)
		return fail_with(cause, "no element '%s' in the bench", c->id);
	if ((k = model_key_find(c->key)) < 0)
		return fail_with(cause, "element '%s': a %s has no key '%s'", el->id,
		    model_type_name(el->type), c->key);
	if (c->value[0] == '\0') {
		if (!model_key_applies((enum model_key)k, el->type))
			return fail_with(cause, "element '%s': a %s has no key '%s'",
			    el->id, model_type_name(el->type), c->key);
		model_unset(el, (enum model_key)k);
		return 0;
	}
	return model_set_text(el, (enum model_key)k, c->value, cause);
}

static int
apply_in(struct bench *b, struct change *c, char **cause)
{
	struct branch *where;
	struct element el;
	size_t at;

	if (model_find(b, c->id, NULL, NULL, NULL) != NULL)
		return fail_with(cause, "element '%s' is in the bench already", c->id);
	if (model_find(b, c->anchor, &where, &at, NULL) == NULL)
		return fail_with(cause, "no element '%s' to put '%s' %s", c->anchor,
		    c->id, c->before ? "before" : "after");
	if (edit_element_new(&el, c->key, c->id, NULL, 0, cause) != 0)
		return -1;
	model_branch_insert(where, c->before ? at : at + 1, &el);
	return 0;
}

static int
apply_one(struct bench *b, const char *text, int source_pass, char **cause)
{
	struct change c;
	struct branch *where;
	size_t at;
	int rc = 0;

	if (change_parse(text, &c, cause) != 0)
		return -1;
	if ((c.op == CH_SET && strcmp(c.id, "source") == 0) != source_pass) {
		change_release(&c);
		return 0;
	}
	switch (c.op) {
	case CH_SET:
		if (source_pass) {
			char *key = xasprintf("source.%s", c.key);

			rc = edit_set_bench_unchecked(b, key, c.value, cause);
			free(key);
		} else {
			rc = apply_set(b, &c, text, cause);
		}
		break;
	case CH_OUT:
		if (model_find(b, c.id, &where, &at, NULL) == NULL)
			rc = fail_with(cause, "no element '%s' to take out", c.id);
		else
			model_branch_remove(where, at, NULL);
		break;
	case CH_IN:
		rc = apply_in(b, &c, cause);
		break;
	}
	change_release(&c);
	return rc;
}

/* A copy of the base without its points (they are not copied at all). */
static struct bench *
dup_without_points(const struct bench *base)
{
	struct bench tmp = *base, *b;

	memset(&tmp.points, 0, sizeof tmp.points);
	b = model_bench_dup(&tmp);
	return b;
}

static struct bench *
apply(const struct bench *base, const struct point *p, int validate, char **cause)
{
	struct bench *b = dup_without_points(base);

	for (int pass = 1; pass >= 0; pass--)
		for (size_t i = 0; i < p->n; i++)
			if (apply_one(b, p->change[i], pass, cause) != 0) {
				cause_prefix(cause, "point '%s': %s", p->name, p->change[i]);
				model_bench_free(b);
				return NULL;
			}
	if (validate && model_validate(b, cause) != 0) {
		cause_prefix(cause, "point '%s'", p->name);
		model_bench_free(b);
		return NULL;
	}
	return b;
}

struct bench *
point_apply(const struct bench *base, const struct point *p, char **cause)
{
	return apply(base, p, 1, cause);
}

static int
check_one(const struct bench *b, const struct point *p, char **cause)
{
	struct bench *applied;

	if (point_name_check(p->name, cause) != 0)
		return -1;
	for (size_t i = 0; i < p->n; i++)
		if (point_change_check(p->change[i], cause) != 0) {
			cause_prefix(cause, "point '%s'", p->name);
			return -1;
		}
	if ((applied = point_apply(b, p, cause)) == NULL)
		return -1;
	model_bench_free(applied);
	return 0;
}

int
point_check_all(const struct bench *b, char **cause)
{
	for (size_t i = 0; i < b->points.n; i++) {
		for (size_t j = 0; j < i; j++)
			if (strcmp(b->points.p[i].name, b->points.p[j].name) == 0)
				return fail_with(cause, "point '%s': name used twice",
				    b->points.p[i].name);
		if (check_one(b, &b->points.p[i], cause) != 0)
			return -1;
	}
	return 0;
}

int
point_edit_add(struct bench *b, const char *name, char *const *changes, size_t n,
    char **cause)
{
	struct point *p;

	if (point_name_check(name, cause) != 0)
		return -1;
	if (point_list_find(&b->points, name) != NULL)
		return fail_with(cause, "point '%s' exists already (remove it first)", name);
	if (n == 0)
		return fail_with(cause, "point '%s': give at least one change", name);
	p = point_list_push(&b->points, name);
	for (size_t i = 0; i < n; i++)
		point_add_change(p, changes[i]);
	if (check_one(b, p, cause) != 0) {
		point_list_remove(&b->points, b->points.n - 1);
		return -1;
	}
	return 0;
}

int
point_edit_remove(struct bench *b, const char *name, char **cause)
{
	for (size_t i = 0; i < b->points.n; i++)
		if (strcmp(b->points.p[i].name, name) == 0) {
			point_list_remove(&b->points, i);
			return 0;
		}
	return fail_with(cause, "no point '%s' in bench '%s'", name, b->name);
}

void
point_rename_id(struct bench *b, const char *old_id, const char *new_id)
{
	size_t n = strlen(old_id);

	for (size_t i = 0; i < b->points.n; i++) {
		struct point *p = &b->points.p[i];

		for (size_t j = 0; j < p->n; j++) {
			char *t = p->change[j], *nt = NULL, *at;

			if (t[0] == '-' && strcmp(t + 1, old_id) == 0)
				nt = xasprintf("-%s", new_id);
			else if (t[0] == '+' && (at = strchr(t, '@')) != NULL) {
				char *anchor = at + 1 + (at[1] == '^');

				if (strcmp(anchor, old_id) == 0)
					nt = xasprintf("%.*s%s", (int)(anchor - t), t, new_id);
			} else if (t[0] != '+' && strncmp(t, old_id, n) == 0 && t[n] == '.')
				nt = xasprintf("%s%s", new_id, t + n);
			if (nt != NULL) {
				free(t);
				p->change[j] = nt;
			}
		}
	}
}

/* ---- survey ---- */

/* The slot of an element; most points keep the base's order, so the slot
 * at the row's own index is tried first. */
static struct point_worst *
worst_slot(struct point_survey *sv, const char *id, size_t hint)
{
	if (hint < sv->nel && strcmp(sv->el[hint].id, id) == 0)
		return &sv->el[hint];
	for (size_t i = 0; i < sv->nel; i++)
		if (strcmp(sv->el[i].id, id) == 0)
			return &sv->el[i];
	sv->el = xreallocarray(sv->el, sv->nel + 1, sizeof *sv->el);
	memset(&sv->el[sv->nel], 0, sizeof *sv->el);
	sv->el[sv->nel].id = xstrdup(id);
	sv->el[sv->nel].ratio = NAN;
	sv->el[sv->nel].status = STATUS_UNRATED;
	return &sv->el[sv->nel++];
}

/* Ratios as they come, (point, slot, ratio), for the matrix at the end. */
struct cells {
	size_t (*v)[2];
	double  *r;
	size_t   n, cap;
};

static void
survey_trace(struct point_survey *sv, size_t i, const struct trace *t, struct cells *cl)
{
	struct point_summary *ps = &sv->pt[i];

	ps->worst_id = t->worst >= 0 ? xstrdup(t->rows[t->worst].el->id) : NULL;
	ps->worst_ratio = t->worst_ratio;
	ps->safe_source_power = t->safe_source_power;
	ps->status = STATUS_UNRATED;
	for (size_t r = 0; r < t->nrows; r++) {
		const struct trace_row *row = &t->rows[r];
		struct point_worst *w = worst_slot(sv, row->el->id, r);

		w->present++;
		if (!isnan(row->ratio)) {
			if (cl->n == cl->cap) {
				cl->cap = cl->cap ? 2 * cl->cap : 64;
				cl->v = xreallocarray(cl->v, cl->cap, sizeof *cl->v);
				cl->r = xreallocarray(cl->r, cl->cap, sizeof *cl->r);
			}
			cl->v[cl->n][0] = i;
			cl->v[cl->n][1] = (size_t)(w - sv->el);
			cl->r[cl->n++] = row->ratio;
		}
		if (row->status > ps->status)
			ps->status = row->status;
		if (!isnan(row->ratio) && (isnan(w->ratio) || row->ratio > w->ratio)) {
			w->ratio = row->ratio;
			w->status = row->status;
			w->at = i;
		}
	}
	if (ps->status == STATUS_OVER)
		sv->any_over = 1;
}

int
point_survey_run(const struct bench *b, const char *only, struct point_survey *sv,
    char **cause)
{
	return point_survey_run_opts(b, only, 0, sv, cause);
}

int
point_survey_run_opts(const struct bench *b, const char *only, unsigned opts,
    struct point_survey *sv, char **cause)
{
	const struct point *one = NULL;
	struct cells cl = { NULL, NULL, 0, 0 };

	memset(sv, 0, sizeof *sv);
	if (only != NULL && (one = point_list_find(&b->points, only)) == NULL)
		return fail_with(cause, "no point '%s' in bench '%s'%s", only, b->name,
		    b->points.n == 0 ? " (it has no points)" : "");
	sv->n = one != NULL ? 2 : 1 + b->points.n;
	sv->pt = xcalloc(sv->n, sizeof *sv->pt);
	sv->pt[0].name = "base";
	sv->base_trace = trace_rerun_opts(NULL, b, opts);
	/* reflections beyond the bound: refused as trace refuses them,
	 * never surveyed on the main beam unasked */
	if (trace_check(sv->base_trace, cause) != 0) {
		point_survey_release(sv);
		return -1;
	}
	survey_trace(sv, 0, sv->base_trace, &cl);
	for (size_t i = 1; i < sv->n; i++) {
		const struct point *p = one != NULL ? one : &b->points.p[i - 1];

		sv->pt[i].name = p->name;
		model_bench_free(sv->last);
		/* b passed model_validate, which applied every point and
		 * validated the result: no need to do it twice */
		if ((sv->last = apply(b, p, 0, cause)) == NULL) {
			free(cl.v);
			free(cl.r);
			point_survey_release(sv);
			return -1;
		}
		/* every point but the one asked for is read for its ratings
		 * alone (survey_trace): the lean trace gives them exactly */
		sv->last_trace = trace_rerun_opts(sv->last_trace, sv->last,
		    one != NULL ? opts : (opts & TRACE_NO_GHOSTS) | TRACE_LEAN);
		if (trace_check(sv->last_trace, cause) != 0) {
			cause_prefix(cause, "point '%s'", p->name);
			free(cl.v);
			free(cl.r);
			point_survey_release(sv);
			return -1;
		}
		survey_trace(sv, i, sv->last_trace, &cl);
	}
	sv->ratio = xcalloc(sv->n * (sv->nel ? sv->nel : 1), sizeof *sv->ratio);
	for (size_t i = 0; i < sv->n * sv->nel; i++)
		sv->ratio[i] = NAN;
	for (size_t c = 0; c < cl.n; c++)
		sv->ratio[cl.v[c][0] * sv->nel + cl.v[c][1]] = cl.r[c];
	free(cl.v);
	free(cl.r);
	return 0;
}

void
point_survey_release(struct point_survey *sv)
{
	for (size_t i = 0; i < sv->n && sv->pt != NULL; i++)
		free(sv->pt[i].worst_id);
	for (size_t i = 0; i < sv->nel; i++)
		free(sv->el[i].id);
	free(sv->pt);
	free(sv->el);
	free(sv->ratio);
	trace_free(sv->base_trace);
	trace_free(sv->last_trace);
	model_bench_free(sv->last);
	memset(sv, 0, sizeof *sv);
}
