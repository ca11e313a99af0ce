/* core-tol.c - tolerances as text, where they are kept, and the random
 * draws of the Monte-Carlo.  The value before the sign is still read by the
 * unit parser of core-units.c; this file only reads what follows it.
 * See core-tol.h. */
#include <config.h>

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "core-tol.h"
#include "util-err.h"

static const struct {
	const char    *name;
	enum unit_dim  dim;
} src_info[TS_COUNT] = {
	[TS_WAVELENGTH] = { "source.wavelength", DIM_LENGTH },
	[TS_POWER] = { "source.power", DIM_POWER },
	[TS_PULSE_ENERGY] = { "source.pulse_energy", DIM_ENERGY },
	[TS_REP_RATE] = { "source.rep_rate", DIM_FREQUENCY },
	[TS_PULSE_WIDTH] = { "source.pulse_width", DIM_TIME },
	[TS_WAIST_X] = { "source.waist", DIM_LENGTH },
	[TS_WAIST_Y] = { "source.waist[y]", DIM_LENGTH },
	[TS_WAIST_POSITION] = { "source.waist_position", DIM_LENGTH },
	[TS_M2_X] = { "source.m2", DIM_NONE },
	[TS_M2_Y] = { "source.m2[y]", DIM_NONE },
	[TS_POLARIZATION] = { "source.polarization", DIM_NONE },
};

const char *
tol_src_name(enum tol_src s)
{
	return s < TS_COUNT ? src_info[s].name : "?";
}

enum unit_dim
tol_src_dim(enum tol_src s)
{
	return s < TS_COUNT ? src_info[s].dim : DIM_NONE;
}

void
tol_src_range(enum tol_src ts, double *lo, double *hi)
{
	*lo = 0x1p-1022;
	*hi = INFINITY;
	if (ts == TS_M2_X || ts == TS_M2_Y)
		*lo = 1;
	else if (ts == TS_WAIST_POSITION || ts == TS_POLARIZATION)
		*lo = -INFINITY;
}

/* ---- the bench's table ---- */

struct tol_bench *
tol_bench_dup(const struct tol_bench *t)
{
	struct tol_bench *d;

	if (t == NULL)
		return NULL;
	d = xcalloc(1, sizeof *d);
	*d = *t;
	d->dflt = t->ndflt ? xcalloc(t->ndflt, sizeof *d->dflt) : NULL;
	if (t->ndflt)
		memcpy(d->dflt, t->dflt, t->ndflt * sizeof *d->dflt);
	d->cap = t->ndflt;
	return d;
}

void
tol_bench_free(struct tol_bench *t)
{
	if (t == NULL)
		return;
	free(t->dflt);
	free(t);
}

struct tol_bench *
tol_bench_of(struct bench *b)
{
	if (b->tol == NULL)
		b->tol = xcalloc(1, sizeof *b->tol);
	return b->tol;
}

int
tol_bench_empty(const struct tol_bench *t)
{
	if (t == NULL)
		return 1;
	for (int i = 0; i < TS_COUNT; i++)
		if (tol_is_set(&t->src[i]))
			return 0;
	return t->ndflt == 0;
}

/* ---- text ---- */

int
tol_split(const char *text, size_t *vlen, const char **rest)
{
	const char *pm = strstr(text, TOL_SIGN), *ascii = strstr(text, "+-");

	if (pm == NULL || (ascii != NULL && ascii < pm)) {
		if (ascii == NULL)
			return 0;
		*vlen = (size_t)(ascii - text);
		*rest = ascii + 2;
		return 1;
	}
	*vlen = (size_t)(pm - text);
	*rest = pm + strlen(TOL_SIGN);
	return 1;
}

static int
is_blank(char c)
{
	return c == ' ' || c == '\t';
}

int
tol_parse(const char *rest, enum unit_dim dim, struct tol *out, char **cause)
{
	char *t = xstrdup(rest), *end = t + strlen(t), *why = NULL, *p, *stop;
	struct tol r = { 0, 0, 0 };
	int rc = -1;

	while (end > t && is_blank(end[-1]))
		*--end = '\0';
	/* the shape word, last */
	if (end - t >= 7 && strcmp(end - 7, "uniform") == 0) {
		r.uniform = 1;
		end -= 7;
		*end = '\0';
	} else if (end - t >= 6 && strcmp(end - 6, "normal") == 0) {
		end -= 6;
		*end = '\0';
	}
	while (end > t && is_blank(end[-1]))
		*--end = '\0';
	for (p = t; is_blank(*p); p++)
		;
	if (*p == '\0') {
		fail_with(cause, "tolerance '%s': no amount after the sign (write "
		    "\"± 2 mm\" or \"± 5 %%\")", rest);
		goto out;
	}
	if (end > p && end[-1] == '%') {
		end[-1] = '\0';
		r.rel = 1;
		r.amount = strtod(p, &stop);
		while (is_blank(*stop))
			stop++;
		if (stop == p || *stop != '\0') {
			fail_with(cause, "tolerance '%s': '%s' is not a number of per cent",
			    rest, p);
			goto out;
		}
	} else if (dim == DIM_NONE) {
		r.amount = strtod(p, &stop);
		while (is_blank(*stop))
			stop++;
		if (stop == p || *stop != '\0') {
			fail_with(cause, "tolerance '%s': '%s' is not a plain number (or "
			    "N %%)", rest, p);
			goto out;
		}
	} else if (units_parse(p, dim, &r.amount, &why) != 0) {
		fail_with(cause, "tolerance '%s': %s", rest, why);
		free(why);
		goto out;
	}
	if (!isfinite(r.amount)) {
		fail_with(cause, "tolerance '%s': not a finite amount", rest);
		goto out;
	}
	if (r.amount < 0) {
		fail_with(cause, "tolerance '%s': %s must not be negative", rest,
		    r.uniform ? "a half-width" : "a standard deviation");
		goto out;
	}
	r.amount = r.amount == 0 ? 0.0 : r.amount;
	*out = r;
	rc = 0;
out:
	free(t);
	return rc;
}

int
tol_is_set(const struct tol *t)
{
	return t != NULL && t->amount > 0;
}

int
tol_format(char *buf, size_t n, const struct tol *t, enum unit_dim dim, int ascii)
{
	char a[64];

	if (!tol_is_set(t)) {
		if (n > 0)
			buf[0] = '\0';
		return 0;
	}
	units_format_shortest(a, sizeof a, t->amount, t->rel ? DIM_NONE : dim, ascii);
	return snprintf(buf, n, " %s %s%s%s", ascii ? "+-" : TOL_SIGN, a,
	    t->rel ? " %" : "", t->uniform ? " uniform" : "");
}

double
tol_width(const struct tol *t, double nominal)
{
	if (!tol_is_set(t))
		return 0;
	return t->rel ? fabs(nominal) * t->amount / 100 : t->amount;
}

/* ---- on elements ---- */

const struct tol *
tol_of(const struct element *el, enum model_key k)
{
	if (el->tol == NULL || !tol_is_set(&el->tol[k]))
		return NULL;
	return &el->tol[k];
}

void
tol_put(struct element *el, enum model_key k, const struct tol *t)
{
	if (!tol_is_set(t)) {
		if (el->tol != NULL)
			memset(&el->tol[k], 0, sizeof el->tol[k]);
		return;
	}
	if (el->tol == NULL)
		el->tol = xcalloc(K_COUNT, sizeof *el->tol);
	el->tol[k] = *t;
}

const struct tol *
tol_effective(const struct bench *b, const struct element *el, enum model_key k)
{
	const struct tol *own = tol_of(el, k);

	if (own != NULL || b->tol == NULL || !model_has(el, k))
		return own;
	/* a lens given by its radii is traced by them: a bench-wide focal
	 * tolerance does not reach it (core-validate.c refuses its own) */
	if (k == K_FOCAL && (model_has(el, K_R1) || model_has(el, K_R2)))
		return NULL;
	for (size_t i = 0; i < b->tol->ndflt; i++) {
		const struct tol_default *d = &b->tol->dflt[i];

		if (d->key == k && d->type == el->type)
			return &d->t;
	}
	for (size_t i = 0; i < b->tol->ndflt; i++) {
		const struct tol_default *d = &b->tol->dflt[i];

		if (d->key == k && d->type == EL_NTYPES)
			return &d->t;
	}
	return NULL;
}

int
tol_key_in_range(enum model_key k, double v)
{
	return model_key_in_range(k, v);
}

int
tol_check_range(const struct element *el, enum model_key k, double v,
    const struct tol *t, char **cause)
{
	double w = tol_width(t, v);
	char a[64], b[64];

	if (t == NULL || !t->uniform || w == 0)
		return 0;
	if (tol_key_in_range(k, v - w) && tol_key_in_range(k, v + w))
		return 0;
	units_format_shortest(a, sizeof a, v - w, model_keys[k].kind == KIND_QUANTITY ?
	    model_keys[k].dim : DIM_NONE, 0);
	units_format_shortest(b, sizeof b, v + w, model_keys[k].kind == KIND_QUANTITY ?
	    model_keys[k].dim : DIM_NONE, 0);
	return fail_with(cause, "element '%s': %s: the uniform tolerance spans %s .. %s, "
	    "outside the key's range (narrow it, or make it normal: a normal "
	    "tolerance is truncated to the range)", el->id, model_key_path(k), a, b);
}

int
tol_default_set(struct bench *bench, const char *which, const char *text, char **cause)
{
	const char *dot = strchr(which, '.'), *rest;
	char type[32];
	enum elem_type ty;
	struct tol_bench *tb;
	struct tol t = { 0, 0, 0 };
	size_t vlen;
	int k;

	if (dot == NULL || (size_t)(dot - which) >= sizeof type)
		return fail_with(cause, "tolerance default '%s': expected TYPE.KEY "
		    "(\"space.length\", \"*.damage.fluence\")", which);
	memcpy(type, which, (size_t)(dot - which));
	type[dot - which] = '\0';
	if (strcmp(type, "*") == 0)
		ty = EL_NTYPES;
	else if (model_type_parse(type, &ty) != 0)
		return fail_with(cause, "tolerance default '%s': unknown type '%s'", which, type);
	k = model_key_find(dot + 1);
	if (k < 0 || (ty != EL_NTYPES && !model_key_applies((enum model_key)k, ty)))
		return fail_with(cause, "tolerance default '%s': %s%s has no key '%s'", which,
		    ty == EL_NTYPES ? "" : "a ", ty == EL_NTYPES ? "no type" : type, dot + 1);
	if (model_keys[k].kind == KIND_BOOL || model_keys[k].kind == KIND_AXIS)
		return fail_with(cause, "tolerance default '%s': '%s' is not a numeric key",
		    which, dot + 1);
	if (text[0] != '\0') {
		if (!tol_split(text, &vlen, &rest))
			return fail_with(cause, "tolerance default '%s': '%s' is not a "
			    "tolerance (write \"± 1 mm\")", which, text);
		for (size_t i = 0; i < vlen; i++)
			if (!is_blank(text[i]))
				return fail_with(cause, "tolerance default '%s': '%s': "
				    "a default has no value before the sign", which, text);
		if (tol_parse(rest, model_keys[k].kind == KIND_QUANTITY ?
		    model_keys[k].dim : DIM_NONE, &t, cause) != 0)
			return cause_prefix(cause, "tolerance default '%s'", which), -1;
	}
	tb = tol_bench_of(bench);
	for (size_t i = 0; i < tb->ndflt; i++)
		if (tb->dflt[i].type == ty && tb->dflt[i].key == (enum model_key)k) {
			if (tol_is_set(&t)) {
				tb->dflt[i].t = t;
			} else {
				memmove(&tb->dflt[i], &tb->dflt[i + 1],
				    (tb->ndflt - i - 1) * sizeof *tb->dflt);
				tb->ndflt--;
			}
			return 0;
		}
	if (!tol_is_set(&t))
		return 0;
	if (tb->ndflt == tb->cap) {
		tb->cap = tb->cap ? 2 * tb->cap : 4;
		tb->dflt = xreallocarray(tb->dflt, tb->cap, sizeof *tb->dflt);
	}
	tb->dflt[tb->ndflt].type = ty;
	tb->dflt[tb->ndflt].key = (enum model_key)k;
	tb->dflt[tb->ndflt].t = t;
	tb->ndflt++;
	return 0;
}

void
tol_default_name(const struct tol_default *d, char *name, size_t n)
{
	snprintf(name, n, "%s.%s", d->type == EL_NTYPES ? "*" : model_type_name(d->type),
	    model_key_path(d->key));
}

/* ---- random draws ---- */

/* SplitMix64's output function (Steele, Lea & Flood 2014): a bijective
 * mix of a 64-bit counter with full avalanche. */
static uint64_t
mix64(uint64_t z)
{
	z = (z ^ (z >> 30)) * UINT64_C(0xbf58476d1ce4e5b9);
	z = (z ^ (z >> 27)) * UINT64_C(0x94d049bb133111eb);
	return z ^ (z >> 31);
}

void
tol_rng_init(struct tol_rng *r, uint64_t seed, uint64_t sample)
{
	r->seed = seed;
	r->sample = sample;
	r->n = 0;
}

/* The stream's key is (seed, sample) hashed once; draw n is the key's
 * SplitMix64 sequence at position n, so any draw of any sample is found
 * without the ones before it. */
uint64_t
tol_rng_next(struct tol_rng *r)
{
	uint64_t key = mix64(r->seed ^ mix64(r->sample + UINT64_C(0x632be59bd9b4e019)));

	return mix64(key + ++r->n * UINT64_C(0x9e3779b97f4a7c15));
}

double
tol_rng_uniform(struct tol_rng *r)
{
	/* 53 random bits, centred in their cell: never 0, never 1 */
	return ((double)(tol_rng_next(r) >> 11) + 0.5) * 0x1p-53;
}

double
tol_rng_normal(struct tol_rng *r)
{
	double u1 = tol_rng_uniform(r), u2 = tol_rng_uniform(r);

	/* Box & Muller 1958: √(−2 ln u1) cos(2π u2) is standard normal */
	return sqrt(-2 * log(u1)) * cos(2 * M_PI * u2);
}

#define TOL_REDRAWS 64

double
tol_draw(const struct tol *t, double nominal, int k, double lo, double hi,
    struct tol_rng *r, double *z)
{
	double w = tol_width(t, nominal);

	if (w == 0) {
		if (z != NULL)
			*z = 0;
		return nominal;
	}
	for (int i = 0; i < TOL_REDRAWS; i++) {
		double d = t->uniform ? 2 * tol_rng_uniform(r) - 1 : tol_rng_normal(r);
		double v = nominal + w * d;
		int ok = k >= 0 ? tol_key_in_range((enum model_key)k, v) :
		    (v >= lo && v <= hi);

		if (ok) {
			if (z != NULL)
				*z = d;
			return v;
		}
	}
	/* the range holds almost none of the distribution: keep the value */
	if (z != NULL)
		*z = 0;
	return nominal;
}

double
tol_source_value(const struct source *s, enum tol_src ts)
{
	switch (ts) {
	case TS_WAVELENGTH:     return s->wavelength;
	case TS_POWER:          return s->power;
	case TS_PULSE_ENERGY:   return s->pulse_energy;
	case TS_REP_RATE:       return s->rep_rate;
	case TS_PULSE_WIDTH:    return s->pulse_width;
	case TS_WAIST_X:        return s->waist[0];
	case TS_WAIST_Y:        return s->waist[1];
	case TS_WAIST_POSITION: return s->waist_position;
	case TS_M2_X:           return s->m2[0];
	case TS_M2_Y:           return s->m2[1];
	case TS_POLARIZATION:   return s->pol_angle_deg;
	default:                return NAN;
	}
}
