/* core-diff.c - comparing two benches: elements matched by id, moves found
 * as what falls outside the longest common order of each branch (so an
 * insertion does not make everything after it "moved"), values compared
 * key by key, and the two traces compared row by row. */
#include <config.h>

#include <math.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "core-diff.h"
#include "core-tol.h"
#include "core-layout.h"
#include "core-point.h"
#include "core-edit.h"
#include "util-buf.h"
#include "util-err.h"

/* ---- one side of the comparison ---- */

struct einfo {
	const struct element *el;
	const char           *branch;   /* borrowed from side.names */
	const char           *after;    /* borrowed id, NULL: first */
	size_t                idx;      /* index in its branch */
};

struct side {
	struct einfo *v;
	size_t        n, cap;
	size_t       *slot;             /* id hash: index + 1, 0 empty */
	size_t        nslot;
	char        **names;            /* owned branch names */
	size_t        nnames, capnames;
};

static uint64_t
hash_id(const char *s)
{
	uint64_t h = 1469598103934665603ULL;    /* FNV-1a */

	for (; *s != '\0'; s++)
		h = (h ^ (unsigned char)*s) * 1099511628211ULL;
	return h;
}

static const char *
side_name(struct side *sd, char *name)
{
	if (sd->nnames == sd->capnames) {
		sd->capnames = sd->capnames ? 2 * sd->capnames : 8;
		sd->names = xreallocarray(sd->names, sd->capnames, sizeof *sd->names);
	}
	sd->names[sd->nnames++] = name;
	return name;
}

static void
collect(struct side *sd, const struct branch *br, const char *bname)
{
	for (size_t i = 0; i < br->n; i++) {
		const struct element *el = &br->el[i];

		if (sd->n == sd->cap) {
			sd->cap = sd->cap ? 2 * sd->cap : 32;
			sd->v = xreallocarray(sd->v, sd->cap, sizeof *sd->v);
		}
		sd->v[sd->n].el = el;
		sd->v[sd->n].branch = bname;
		sd->v[sd->n].after = i > 0 ? br->el[i - 1].id : NULL;
		sd->v[sd->n].idx = i;
		sd->n++;
		if (el->side_port != PORT_NONE)
			collect(sd, &el->side, side_name(sd, xasprintf("%s.%s", el->id,
			    model_port_name(el->side_port))));
	}
}

static void
side_init(struct side *sd, const struct bench *b)
{
	memset(sd, 0, sizeof *sd);
	collect(sd, &b->path, side_name(sd, xstrdup("main")));
	sd->nslot = 16;
	while (sd->nslot < 2 * sd->n)
		sd->nslot *= 2;
	sd->slot = xcalloc(sd->nslot, sizeof *sd->slot);
	for (size_t i = 0; i < sd->n; i++) {
		size_t h = (size_t)hash_id(sd->v[i].el->id) & (sd->nslot - 1);

		while (sd->slot[h] != 0)
			h = (h + 1) & (sd->nslot - 1);
		sd->slot[h] = i + 1;
	}
}

static struct einfo *
side_find(const struct side *sd, const char *id)
{
	size_t h = (size_t)hash_id(id) & (sd->nslot - 1);

	while (sd->slot[h] != 0) {
		struct einfo *e = &sd->v[sd->slot[h] - 1];

		if (strcmp(e->el->id, id) == 0)
			return e;
		h = (h + 1) & (sd->nslot - 1);
	}
	return NULL;
}

static void
side_release(struct side *sd)
{
	for (size_t i = 0; i < sd->nnames; i++)
		free(sd->names[i]);
	free(sd->names);
	free(sd->v);
	free(sd->slot);
}

/* ---- building the diff ---- */

/* Room for one more item in an array of n with room for *cap: doubling,
 * so n appends copy O(n) items in all.  One at a time, a reversed
 * 20,000-element chain took seconds under AddressSanitizer. */
static void *
grow(void *p, size_t n, size_t *cap, size_t size)
{
	if (n < *cap)
		return p;
	*cap = n < 4 ? 8 : 2 * n;     /* from n, not *cap: a hand-built diff has none */
	return xreallocarray(p, *cap, size);
}

static struct diff_change *
change_new(struct diff *d, enum diff_kind kind, const char *id, enum elem_type type)
{
	struct diff_change *c;

	d->ch = grow(d->ch, d->nch, &d->capch, sizeof *d->ch);
	c = &d->ch[d->nch++];
	memset(c, 0, sizeof *c);
	c->kind = kind;
	c->id = xstrdup(id);
	c->type = type;
	return c;
}

/* Takes the four strings. */
static void
value_add(struct diff_change *c, const char *key, char *ot, char *nt, char *oe, char *ne)
{
	struct diff_value *v;

	c->vals = grow(c->vals, c->nvals, &c->capvals, sizeof *c->vals);
	v = &c->vals[c->nvals++];
	v->key = xstrdup(key);
	v->old_text = ot;
	v->new_text = nt;
	v->old_exact = oe;
	v->new_exact = ne;
}

static int
str_differ(const char *a, const char *b)
{
	if (a == NULL || b == NULL)
		return a != b;
	return strcmp(a, b) != 0;
}

static void
text_value(struct diff_change *c, const char *key, const char *a, const char *b, int both)
{
	if (!both && a == NULL && b == NULL)
		return;
	if (both && !str_differ(a, b))
		return;
	value_add(c, key, a != NULL ? xstrdup(a) : NULL, b != NULL ? xstrdup(b) : NULL,
	    a != NULL ? xstrdup(a) : NULL, b != NULL ? xstrdup(b) : NULL);
}

static char *
exact_or_null(const struct element *el, enum model_key k)
{
	return el != NULL && model_has(el, k) ? model_value_text(el, k) : NULL;
}

static int
tol_same(const struct tol *a, const struct tol *b)
{
	if (a == NULL || b == NULL)
		return a == b;
	return a->amount == b->amount && a->rel == b->rel && a->uniform == b->uniform;
}

/* Values of a (old) and b (new); either may be NULL (added, removed). */
static void
compare_values(struct diff_change *c, const struct element *a, const struct element *b)
{
	int both = a != NULL && b != NULL;

	if (both && a->type != b->type)
		text_value(c, "type", model_type_name(a->type), model_type_name(b->type), 1);
	text_value(c, "label", a != NULL ? a->label : NULL, b != NULL ? b->label : NULL, both);
	text_value(c, "part", a != NULL ? a->part : NULL, b != NULL ? b->part : NULL, both);
	if ((a != NULL ? a->side_port : PORT_NONE) != (b != NULL ? b->side_port : PORT_NONE))
		text_value(c, "side", a != NULL && a->side_port != PORT_NONE ?
		    model_port_name(a->side_port) : both ? "none" : NULL,
		    b != NULL && b->side_port != PORT_NONE ? model_port_name(b->side_port) :
		    both ? "none" : NULL, 1);
	for (int i = 0; i < K_COUNT; i++) {
		enum model_key k = (enum model_key)i;
		int ha = a != NULL && model_has(a, k), hb = b != NULL && model_has(b, k);

		if (!ha && !hb)
			continue;
		if (ha && hb && a->val[k] == b->val[k] && tol_same(tol_of(a, k), tol_of(b, k)))
			continue;
		value_add(c, model_key_path(k),
		    a != NULL ? diff_key_show(a, k, 0) : NULL,
		    b != NULL ? diff_key_show(b, k, 0) : NULL,
		    exact_or_null(a, k), exact_or_null(b, k));
	}
}

static void
place_set(struct diff_place *p, const struct einfo *e)
{
	p->branch = xstrdup(e->branch);
	p->after = xstrdup(e->after);
}

/* Marks in `stable` the longest run of old indices that increases: those
 * elements kept their order; the rest of the branch moved. */
static void
longest_increasing(const size_t *old_idx, size_t n, unsigned char *stable)
{
	size_t *tail = xcalloc(n + 1, sizeof *tail), *prev = xcalloc(n + 1, sizeof *prev);
	size_t len = 0;

	for (size_t i = 0; i < n; i++) {
		size_t lo = 0, hi = len;

		while (lo < hi) {
			size_t mid = (lo + hi) / 2;

			if (old_idx[tail[mid]] < old_idx[i])
				lo = mid + 1;
			else
				hi = mid;
		}
		prev[i] = lo > 0 ? tail[lo - 1] : SIZE_MAX;
		tail[lo] = i;
		if (lo == len)
			len++;
	}
	for (size_t i = len > 0 ? tail[len - 1] : SIZE_MAX; i != SIZE_MAX; i = prev[i])
		stable[i] = 1;
	free(tail);
	free(prev);
}

struct moves {
	const struct side *old, *new_s;
	unsigned char     *moved;       /* per new einfo index */
};

/* Walks the new bench's branches; indexes into new_s->v follow the same
 * depth-first order as collect(). */
static void
find_moves(struct moves *m, const struct branch *br, size_t *pos)
{
	size_t first = *pos, n = 0, *idx = xcalloc(br->n + 1, sizeof *idx);
	size_t *which = xcalloc(br->n + 1, sizeof *which);
	unsigned char *stable;
	size_t at = first;

	/* Positions in new_s->v of this branch's elements. */
	for (size_t i = 0; i < br->n; i++) {
		which[i] = at;
		at++;
		if (br->el[i].side_port != PORT_NONE) {
			*pos = at;
			find_moves(m, &br->el[i].side, pos);
			at = *pos;
		}
	}
	*pos = at;
	stable = xcalloc(br->n + 1, 1);
	{
		size_t *map = xcalloc(br->n + 1, sizeof *map);

		for (size_t i = 0; i < br->n; i++) {
			const struct einfo *e = &m->new_s->v[which[i]];
			const struct einfo *o = side_find(m->old, e->el->id);

			if (o != NULL && strcmp(o->branch, e->branch) == 0) {
				map[n] = i;
				idx[n++] = o->idx;
			} else if (o != NULL) {
				m->moved[which[i]] = 1;
			}
		}
		longest_increasing(idx, n, stable);
		for (size_t j = 0; j < n; j++)
			if (!stable[j])
				m->moved[which[map[j]]] = 1;
		free(map);
	}
	free(stable);
	free(idx);
	free(which);
}

static char *
bench_key_show(const char *key, const char *exact)
{
	static const struct {
		const char   *key;
		enum unit_dim dim;
	} dims[] = {
		{ "air_breakdown", DIM_IRRADIANCE }, { "source.wavelength", DIM_LENGTH },
		{ "stray_warn", DIM_POWER }, { "source.max_return", DIM_POWER },
		{ "source.power", DIM_POWER }, { "source.pulse_energy", DIM_ENERGY },
		{ "source.rep_rate", DIM_FREQUENCY }, { "source.pulse_width", DIM_TIME },
		{ "source.waist", DIM_LENGTH }, { "source.waist_position", DIM_LENGTH },
	};
	struct buf out;
	char *t, *part, *save = NULL;

	if (exact[0] == '\0')
		return xstrdup("-");
	for (size_t i = 0; i < sizeof dims / sizeof *dims; i++) {
		if (strcmp(dims[i].key, key) != 0)
			continue;
		buf_init(&out);
		t = xstrdup(exact);
		for (part = strtok_r(t, ",", &save); part != NULL; part = strtok_r(NULL, ",", &save)) {
			const char *rest = NULL;
			size_t vlen;
			double v;
			char *s;

			/* a tolerance after the value is shown as written */
			if (tol_split(part, &vlen, &rest))
				part[vlen] = '\0';
			if (units_parse(part, dims[i].dim, &v, NULL) != 0) {
				buf_release(&out);
				free(t);
				return xstrdup(exact);
			}
			s = diff_value_show(v, dims[i].dim, 0);
			buf_printf(&out, "%s%s%s%s", out.len > 0 ? ", " : "", s,
			    rest != NULL ? " " TOL_SIGN : "", rest != NULL ? rest : "");
			free(s);
		}
		free(t);
		return buf_take(&out);
	}
	return xstrdup(exact);
}

/* The bench-wide tolerance defaults, as settings "tolerance.TYPE.KEY". */
static void
compare_defaults(struct diff *d, const struct bench *a, const struct bench *b,
    struct diff_change **c)
{
	const struct bench *side[2] = { a, b };

	for (int s = 0; s < 2; s++) {
		const struct tol_bench *tb = side[s]->tol;

		for (size_t i = 0; tb != NULL && i < tb->ndflt; i++) {
			char name[96], *key, *ea, *eb;

			tol_default_name(&tb->dflt[i], name, sizeof name);
			key = xasprintf("tolerance.%s", name);
			ea = edit_bench_value(a, key);
			eb = edit_bench_value(b, key);
			/* the second pass only adds what the first could not see */
			if (strcmp(ea, eb) != 0 && (s == 0 || ea[0] == '\0')) {
				if (*c == NULL) {
					*c = change_new(d, DIFF_SETTINGS, NULL, EL_SPACE);
					free((*c)->id);
					(*c)->id = NULL;
				}
				value_add(*c, key, xstrdup(ea[0] ? ea : "-"), xstrdup(eb[0] ? eb : "-"),
				    ea[0] != '\0' ? xstrdup(ea) : NULL,
				    eb[0] != '\0' ? xstrdup(eb) : NULL);
			}
			free(key);
			free(ea);
			free(eb);
		}
	}
}

static void
compare_settings(struct diff *d, const struct bench *a, const struct bench *b)
{
	struct diff_change *c = NULL;

	for (size_t i = 0; edit_bench_keys[i] != NULL; i++) {
		const char *key = edit_bench_keys[i];
		char *ea, *eb;

		if (strcmp(key, "name") == 0)
			continue;
		ea = edit_bench_value(a, key);
		eb = edit_bench_value(b, key);
		if (strcmp(ea, eb) != 0) {
			if (c == NULL) {
				c = change_new(d, DIFF_SETTINGS, NULL, EL_SPACE);
				free(c->id);
				c->id = NULL;
			}
			value_add(c, key, bench_key_show(key, ea), bench_key_show(key, eb),
			    ea[0] != '\0' ? xstrdup(ea) : NULL, eb[0] != '\0' ? xstrdup(eb) : NULL);
		}
		free(ea);
		free(eb);
	}
	compare_defaults(d, a, b, &c);
}

/* A point as text: its changes, then its worst element there (the effect
 * of the point on the margins, as the diff's effect list gives the base's). */
static char *
point_show(const struct bench *b, const struct point *p, int exact)
{
	struct bench *applied;
	struct trace *t;
	struct buf out;

	if (p == NULL)
		return exact ? NULL : xstrdup("-");
	buf_init(&out);
	for (size_t i = 0; i < p->n; i++)
		buf_printf(&out, "%s%s", i ? " " : "", p->change[i]);
	if (exact || (applied = point_apply(b, p, NULL)) == NULL)
		return buf_take(&out);
	t = trace_run(applied);
	if (t->worst >= 0) {
		char pct[32];

		layout_percent(pct, sizeof pct, t->rows[t->worst].ratio);
		buf_printf(&out, " (worst %s %s %s)", t->rows[t->worst].el->id, pct,
		    layout_status_word(t->rows[t->worst].status));
	}
	trace_free(t);
	model_bench_free(applied);
	return buf_take(&out);
}

/* Points added, removed or changed: a settings value "point.NAME" each. */
static void
compare_points(struct diff *d, const struct bench *a, const struct bench *b)
{
	struct diff_change *c = NULL;

	for (int side = 0; side < 2; side++) {
		const struct point_list *l = side ? &a->points : &b->points;

		for (size_t i = 0; i < l->n; i++) {
			const struct point *pa = point_list_find(&a->points, l->p[i].name);
			const struct point *pb = point_list_find(&b->points, l->p[i].name);
			char *ea = point_show(a, pa, 1), *eb = point_show(b, pb, 1), *key;

			if ((side && pb != NULL) || (ea != NULL && eb != NULL && strcmp(ea, eb) == 0)) {
				free(ea);
				free(eb);
				continue;
			}
			if (c == NULL) {
				for (size_t j = 0; j < d->nch && c == NULL; j++)
					if (d->ch[j].kind == DIFF_SETTINGS)
						c = &d->ch[j];
				if (c == NULL) {
					c = change_new(d, DIFF_SETTINGS, NULL, EL_SPACE);
					free(c->id);
					c->id = NULL;
				}
			}
			key = xasprintf("point.%s", l->p[i].name);
			value_add(c, key, point_show(a, pa, 0), point_show(b, pb, 0), ea, eb);
			free(key);
		}
	}
}

struct diff *
diff_benches(const struct bench *a, const struct bench *b)
{
	struct diff *d = xcalloc(1, sizeof *d);
	struct side sa, sb;
	struct moves m;
	size_t pos = 0;

	side_init(&sa, a);
	side_init(&sb, b);
	compare_settings(d, a, b);
	compare_points(d, a, b);
	m.old = &sa;
	m.new_s = &sb;
	m.moved = xcalloc(sb.n + 1, 1);
	find_moves(&m, &b->path, &pos);
	for (size_t i = 0; i < sb.n; i++) {
		const struct einfo *e = &sb.v[i], *o = side_find(&sa, e->el->id);
		struct diff_change *c;

		if (o == NULL) {
			c = change_new(d, DIFF_ADDED, e->el->id, e->el->type);
			place_set(&c->new_at, e);
			compare_values(c, NULL, e->el);
			continue;
		}
		c = change_new(d, m.moved[i] ? DIFF_MOVED : DIFF_CHANGED, e->el->id, e->el->type);
		place_set(&c->old_at, o);
		place_set(&c->new_at, e);
		compare_values(c, o->el, e->el);
		if (!m.moved[i] && c->nvals == 0) {
			/* Same place, same values: not a change after all. */
			free(c->id);
			free(c->old_at.branch);
			free(c->old_at.after);
			free(c->new_at.branch);
			free(c->new_at.after);
			d->nch--;
		}
	}
	for (size_t i = 0; i < sa.n; i++) {
		const struct einfo *o = &sa.v[i];
		struct diff_change *c;

		if (side_find(&sb, o->el->id) != NULL)
			continue;
		c = change_new(d, DIFF_REMOVED, o->el->id, o->el->type);
		place_set(&c->old_at, o);
		compare_values(c, o->el, NULL);
	}
	free(m.moved);
	side_release(&sa);
	side_release(&sb);
	for (int i = 0; i < 2; i++) {
		d->worst_ratio[i] = NAN;
		d->safe_power[i] = NAN;
	}
	return d;
}

/* ---- effects ---- */

static int
num_differ(double a, double b)
{
	if (isnan(a) || isnan(b))
		return isnan(a) != isnan(b);
	return fabs(a - b) > 1e-9 * fmax(fabs(a), fabs(b));
}

static void
effect_side(struct diff_effect *fx, int i, const struct trace_row *r)
{
	fx->present[i] = r != NULL;
	fx->power[i] = r != NULL ? r->power_in : NAN;
	fx->peak[i] = r != NULL ? r->peak_irradiance : NAN;
	fx->fluence[i] = r != NULL ? r->fluence : NAN;
	fx->ratio[i] = r != NULL ? r->ratio : NAN;
	fx->status[i] = r != NULL ? r->status : STATUS_UNRATED;
}

static void
effect_add(struct diff *d, const struct trace_row *ra, const struct trace_row *rb)
{
	const struct trace_row *r = rb != NULL ? rb : ra;
	struct diff_effect *fx;

	if (ra != NULL && rb != NULL && ra->status == rb->status &&
	    !num_differ(ra->power_in, rb->power_in) &&
	    !num_differ(ra->peak_irradiance, rb->peak_irradiance) &&
	    !num_differ(ra->fluence, rb->fluence) && !num_differ(ra->ratio, rb->ratio))
		return;
	/* What matters for the margins: rated elements, the ends of branches
	 * (what reaches a target or a dump), and what came or went.  Spaces
	 * and unrated optics would only repeat their neighbours' numbers. */
	if (ra != NULL && rb != NULL && isnan(ra->ratio) && isnan(rb->ratio) &&
	    ra->status == rb->status && !model_type_is_terminator(r->el->type))
		return;
	d->fx = grow(d->fx, d->nfx, &d->capfx, sizeof *d->fx);
	fx = &d->fx[d->nfx++];
	memset(fx, 0, sizeof *fx);
	fx->id = xstrdup(r->el->id);
	fx->type = r->el->type;
	effect_side(fx, 0, ra);
	effect_side(fx, 1, rb);
}

static const struct trace_row *
row_by_id(const struct trace *t, size_t *slot, size_t nslot, const char *id)
{
	size_t h = (size_t)hash_id(id) & (nslot - 1);

	while (slot[h] != 0) {
		const struct trace_row *r = &t->rows[slot[h] - 1];

		if (strcmp(r->el->id, id) == 0)
			return r;
		h = (h + 1) & (nslot - 1);
	}
	return NULL;
}

static size_t *
row_index(const struct trace *t, size_t *nslot)
{
	size_t *slot;

	*nslot = 16;
	while (*nslot < 2 * t->nrows)
		*nslot *= 2;
	slot = xcalloc(*nslot, sizeof *slot);
	for (size_t i = 0; i < t->nrows; i++) {
		size_t h = (size_t)hash_id(t->rows[i].el->id) & (*nslot - 1);

		while (slot[h] != 0)
			h = (h + 1) & (*nslot - 1);
		slot[h] = i + 1;
	}
	return slot;
}

enum damage_status
diff_trace_worst(const struct trace *t)
{
	enum damage_status w = STATUS_UNRATED;

	for (size_t i = 0; i < t->nrows; i++)
		if (t->rows[i].status > w)
			w = t->rows[i].status;
	return w;
}

void
diff_add_traces(struct diff *d, const struct trace *ta, const struct trace *tb)
{
	const struct trace *t[2] = { ta, tb };
	size_t na, nb, *ia = row_index(ta, &na), *ib = row_index(tb, &nb);

	for (size_t i = 0; i < tb->nrows; i++)
		effect_add(d, row_by_id(ta, ia, na, tb->rows[i].el->id), &tb->rows[i]);
	for (size_t i = 0; i < ta->nrows; i++)
		if (row_by_id(tb, ib, nb, ta->rows[i].el->id) == NULL)
			effect_add(d, &ta->rows[i], NULL);
	for (int i = 0; i < 2; i++) {
		d->pulsed[i] = t[i]->bench->src.pulsed;
		free(d->worst_id[i]);
		d->worst_id[i] = t[i]->worst >= 0 ? xstrdup(t[i]->rows[t[i]->worst].el->id) : NULL;
		d->worst_ratio[i] = t[i]->worst >= 0 ? t[i]->worst_ratio : NAN;
		d->worst_status[i] = diff_trace_worst(t[i]);
		d->safe_power[i] = t[i]->safe_source_power;
	}
	d->traced = 1;
	free(ia);
	free(ib);
}

struct diff *
diff_run(const struct bench *a, const struct bench *b)
{
	struct diff *d = diff_benches(a, b);
	struct trace *ta = trace_run(a), *tb = trace_run(b);

	diff_add_traces(d, ta, tb);
	trace_free(ta);
	trace_free(tb);
	return d;
}

size_t
diff_count(const struct diff *d, enum diff_kind kind)
{
	size_t n = 0;

	for (size_t i = 0; i < d->nch; i++)
		n += d->ch[i].kind == kind;
	return n;
}

void
diff_free(struct diff *d)
{
	if (d == NULL)
		return;
	for (size_t i = 0; i < d->nch; i++) {
		struct diff_change *c = &d->ch[i];

		for (size_t j = 0; j < c->nvals; j++) {
			free(c->vals[j].key);
			free(c->vals[j].old_text);
			free(c->vals[j].new_text);
			free(c->vals[j].old_exact);
			free(c->vals[j].new_exact);
		}
		free(c->vals);
		free(c->id);
		free(c->old_at.branch);
		free(c->old_at.after);
		free(c->new_at.branch);
		free(c->new_at.after);
	}
	free(d->ch);
	for (size_t i = 0; i < d->nfx; i++)
		free(d->fx[i].id);
	free(d->fx);
	free(d->worst_id[0]);
	free(d->worst_id[1]);
	free(d);
}
