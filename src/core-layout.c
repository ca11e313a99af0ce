/* core-layout.c - the workbench's layout and formatting decisions, kept out
 * of the curses code so they can be tested: the chain as rows, value text
 * and the fields of an element (bars, columns and key hints are
 * core-layout-text.c's).  Owned by the workbench; see core-layout.h. */
#include <config.h>

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "core-edit.h"
#include "core-layout.h"
#include "core-layout-tol.h"
#include "util-err.h"

/* ---- the chain ---- */

struct chain_ctx {
	struct layout_row *rows;
	size_t             n, cap;
	const struct trace *t;
	size_t             next_trace;
};

static struct layout_row *
chain_push(struct chain_ctx *c)
{
	if (c->n == c->cap) {
		c->cap = c->cap ? 2 * c->cap : 32;
		c->rows = xreallocarray(c->rows, c->cap, sizeof *c->rows);
	}
	memset(&c->rows[c->n], 0, sizeof c->rows[c->n]);
	return &c->rows[c->n++];
}

/* Trace rows come in the same depth-first order as the walk below. */
static long
trace_index(struct chain_ctx *c, const struct element *el)
{
	if (c->t == NULL)
		return -1;
	if (c->next_trace < c->t->nrows && c->t->rows[c->next_trace].el == el)
		return (long)c->next_trace++;
	for (size_t i = 0; i < c->t->nrows; i++)
		if (c->t->rows[i].el == el)
			return (long)i;
	return -1;
}

/* Explicit stack: nesting may be deep (MODEL_MAX_DEPTH). */
struct chain_frame {
	const struct branch  *br;
	size_t                i;
	const struct element *parent;
};

size_t
layout_chain(const struct bench *b, const struct trace *t, struct layout_row **out)
{
	struct chain_ctx c = { NULL, 0, 0, t, 0 };
	struct chain_frame *st = NULL;
	size_t nst = 0, capst = 0;

	capst = 16;
	st = xreallocarray(NULL, capst, sizeof *st);
	st[nst++] = (struct chain_frame){ &b->path, 0, NULL };
	while (nst > 0) {
		struct chain_frame *f = &st[nst - 1];
		const struct element *el;
		struct layout_row *r;
		unsigned depth = (unsigned)(nst - 1);

		if (f->i >= f->br->n) {
			nst--;
			continue;
		}
		el = &f->br->el[f->i++];
		r = chain_push(&c);
		r->kind = LROW_ELEMENT;
		r->el = el;
		r->parent = f->parent;
		r->port = PORT_NONE;
		r->depth = depth;
		r->trace_row = trace_index(&c, el);
		if (el->side_port == PORT_NONE)
			continue;
		r = chain_push(&c);
		r->kind = LROW_PORT;
		r->el = el;
		r->parent = f->parent;
		r->port = el->side_port;
		r->depth = depth;
		r->trace_row = -1;
		if (nst == capst) {
			capst *= 2;
			st = xreallocarray(st, capst, sizeof *st);
		}
		st[nst++] = (struct chain_frame){ &el->side, 0, el };
	}
	free(st);
	*out = c.rows;
	return c.n;
}

long
layout_chain_find(const struct layout_row *rows, size_t n, const char *id, int port)
{
	if (id == NULL)
		return -1;
	for (size_t i = 0; i < n; i++)
		if ((rows[i].kind == LROW_PORT) == (port != 0) &&
		    strcmp(rows[i].el->id, id) == 0)
			return (long)i;
	return -1;
}

int
layout_scroll(int sel, int top, int visible, int n)
{
	int margin = visible >= 5 ? 1 : 0;

	if (visible <= 0 || n <= 0)
		return 0;
	if (sel < 0)
		sel = 0;
	if (sel >= n)
		sel = n - 1;
	if (sel - margin < top)
		top = sel - margin;
	if (sel + margin >= top + visible)
		top = sel + margin - visible + 1;
	if (top > n - visible)
		top = n - visible;
	if (top < 0)
		top = 0;
	return top;
}

/* ---- values ---- */

/* The shortest units_format form of v that parses back to v. */
char *
layout_quantity_text(double v, enum unit_dim dim)
{
	char tmp[64];

	if (!isfinite(v)) {
		units_format_exact(tmp, sizeof tmp, v, dim);
		return xstrdup(isnan(v) ? "" : tmp);
	}
	for (int sig = 1; sig <= 17; sig++) {
		char *why = NULL;
		double back;

		units_format(tmp, sizeof tmp, v, dim, sig, 0);
		if (units_parse(tmp, dim, &back, &why) == 0 && back == v)
			return xstrdup(tmp);
		free(why);
	}
	units_format_exact(tmp, sizeof tmp, v, dim);
	return xstrdup(tmp);
}

static char *
plain_text(double v)
{
	char tmp[40];

	if (isnan(v))
		return xstrdup("");
	for (int p = 1; p <= 17; p++) {
		snprintf(tmp, sizeof tmp, "%.*g", p, v);
		if (strtod(tmp, NULL) == v)
			break;
	}
	return xstrdup(tmp);
}

char *
layout_value_text(const struct element *el, enum model_key k)
{
	const struct model_key_def *d = &model_keys[k];
	double v = model_get(el, k);
	char *s;

	if (isnan(v))
		return xstrdup("");
	switch (d->kind) {
	case KIND_QUANTITY:
		s = layout_quantity_text(v, d->dim);
		break;
	case KIND_BOOL:
	case KIND_AXIS:
	case KIND_CHOICE:
		return model_value_text(el, k);
	case KIND_SURFACE:
		if (v == MODEL_UNCOATED)
			return model_value_text(el, k);
		/* FALLTHROUGH */
	default:
		s = plain_text(v);
		break;
	}
	/* with its tolerance, as the editor reads it back (core-layout-tol.c) */
	return layout_tol_with_value(el, k, s);
}

static const struct {
	const char    *key;
	enum unit_dim  dim;
	const char    *help;
} bench_keys[] = {
	{ "name", DIM_COUNT, "the bench's name (unique in the database)" },
	{ "notes", DIM_COUNT, "free text about the bench" },
	{ "safety_factor", DIM_COUNT, "margin: caution from 1/factor of a threshold, > 1" },
	{ "air_breakdown", DIM_IRRADIANCE, "peak irradiance where a pulsed focus sparks in air" },
	{ "ghost_tilt", DIM_COUNT, "degrees of tilt from which reflections leave the axis as strays" },
	{ "stray_warn", DIM_POWER, "power from which a stray must be blocked (a warning)" },
	{ "source.wavelength", DIM_LENGTH, "vacuum wavelength" },
	{ "source.power", DIM_POWER, "average power" },
	{ "source.pulsed", DIM_COUNT, "true: pulsed source, false: CW" },
	{ "source.pulse_energy", DIM_ENERGY, "energy of one pulse (pulsed only)" },
	{ "source.rep_rate", DIM_FREQUENCY, "pulse repetition rate (pulsed only)" },
	{ "source.pulse_width", DIM_TIME, "pulse width, FWHM (pulsed only)" },
	{ "source.shape", DIM_COUNT, "pulse shape: gaussian, sech2 or square" },
	{ "source.waist", DIM_LENGTH, "1/e\u00b2 waist radius: \"3 mm\" or \"3 mm, 2 mm\" (x, y)" },
	{ "source.waist_position", DIM_LENGTH, "waist position, + downstream of the source" },
	{ "source.m2", DIM_COUNT, "beam quality M\u00b2: \"1.3\" or \"1.3, 1.5\" (x, y)" },
	{ "source.m2 derived", DIM_COUNT, "beam quality M\u00b2, derived from the divergence "
	    "(\u03c0\u00b7w0\u00b7\u03b8/\u03bb); a typed M\u00b2 replaces the divergence" },
	{ "source.divergence", DIM_COUNT, "measured far-field half-angle (1/e\u00b2, rad) "
	    "instead of M\u00b2: \"0.5e-3\" or \"0.5e-3, 0.6e-3\" (x, y)" },
	{ "source.polarization", DIM_COUNT, "degrees from horizontal, circular or unpolarized" },
	{ "source.max_return", DIM_POWER, "power the laser tolerates back (empty: not judged)" },
};
#define NBENCH_KEYS (sizeof bench_keys / sizeof *bench_keys)

const char *
layout_bench_key_help(const char *key)
{
	for (size_t i = 0; i < NBENCH_KEYS; i++)
		if (strcmp(bench_keys[i].key, key) == 0)
			return bench_keys[i].help;
	return "";
}

char *
layout_bench_key_hint(const char *key)
{
	for (size_t i = 0; i < NBENCH_KEYS; i++)
		if (strcmp(bench_keys[i].key, key) == 0 && bench_keys[i].dim != DIM_COUNT) {
			static const struct { enum unit_dim d; const char *ex; } ex[] = {
				{ DIM_LENGTH, "3 mm" }, { DIM_POWER, "5 W" },
				{ DIM_ENERGY, "200 mJ" }, { DIM_FREQUENCY, "10 Hz" },
				{ DIM_TIME, "8 ns" }, { DIM_IRRADIANCE, "10 GW/cm^2" },
			};

			if (strcmp(key, "source.wavelength") == 0)
				return xstrdup("with its unit, e.g. \"532 nm\"");
			for (size_t k = 0; k < sizeof ex / sizeof *ex; k++)
				if (ex[k].d == bench_keys[i].dim)
					return xasprintf("with its unit, e.g. \"%s\"", ex[k].ex);
		}
	if (strcmp(key, "safety_factor") == 0)
		return xstrdup("a plain number above 1");
	if (strcmp(key, "source.pulsed") == 0)
		return xstrdup("true or false");
	if (strcmp(key, "source.m2") == 0)
		return xstrdup("a plain number, 1 or more");
	if (strcmp(key, "source.divergence") == 0)
		return xstrdup("radians, above 0; empty: none (M\u00b2 as it is)");
	return xstrdup("");
}

char *
layout_source_m2_text(const struct source *s)
{
	char x[48], y[48];

	units_format(x, sizeof x, s->m2[0], DIM_NONE, 3, 1);
	if (!s->m2_pair)
		return xstrdup(x);
	units_format(y, sizeof y, s->m2[1], DIM_NONE, 3, 1);
	return xasprintf("%s, %s", x, y);
}

static char *bench_value_text(const struct bench *, const char *key);

char *
layout_bench_value_text(const struct bench *b, const char *key)
{
	size_t i;

	for (i = 0; i < NBENCH_KEYS; i++)
		if (strcmp(bench_keys[i].key, key) == 0)
			break;
	if (i == NBENCH_KEYS || bench_keys[i].dim == DIM_COUNT)
		return edit_bench_value(b, key);
	/* with its tolerance, as the editor reads it back (core-layout-tol.c) */
	return layout_tol_with_src(b, key, bench_value_text(b, key));
}

static char *
bench_value_text(const struct bench *b, const char *key)
{
	const struct source *s = &b->src;

	if (!s->pulsed && (strcmp(key, "source.pulse_energy") == 0 ||
	    strcmp(key, "source.rep_rate") == 0 || strcmp(key, "source.pulse_width") == 0))
		return xstrdup("");
	if (strcmp(key, "air_breakdown") == 0)
		return layout_quantity_text(b->air_breakdown, DIM_IRRADIANCE);
	if (strcmp(key, "stray_warn") == 0)
		return layout_quantity_text(b->stray_warn, DIM_POWER);
	if (strcmp(key, "source.max_return") == 0)
		return isnan(s->max_return) ? xstrdup("") : layout_quantity_text(s->max_return, DIM_POWER);
	if (strcmp(key, "source.wavelength") == 0)
		return layout_quantity_text(s->wavelength, DIM_LENGTH);
	if (strcmp(key, "source.power") == 0)
		return layout_quantity_text(s->power, DIM_POWER);
	if (strcmp(key, "source.pulse_energy") == 0)
		return layout_quantity_text(s->pulse_energy, DIM_ENERGY);
	if (strcmp(key, "source.rep_rate") == 0)
		return layout_quantity_text(s->rep_rate, DIM_FREQUENCY);
	if (strcmp(key, "source.pulse_width") == 0)
		return layout_quantity_text(s->pulse_width, DIM_TIME);
	if (strcmp(key, "source.waist_position") == 0)
		return layout_quantity_text(s->waist_position, DIM_LENGTH);
	/* source.waist */
	{
		char *x = layout_quantity_text(s->waist[0], DIM_LENGTH), *y, *r;

		if (!s->waist_pair)
			return x;
		y = layout_quantity_text(s->waist[1], DIM_LENGTH);
		r = xasprintf("%s, %s", x, y);
		free(x);
		free(y);
		return r;
	}
}

struct bench *
layout_bench_new(const char *name)
{
	struct bench *b = model_bench_new(name);

	b->src.wavelength = 1064e-9;
	b->src.power = 1;
	b->src.waist[0] = b->src.waist[1] = 1e-3;
	b->src.waist_position = 0;
	return b;
}

int
layout_required_key(enum elem_type t)
{
	switch (t) {
	case EL_SPACE:		return K_LENGTH;
	case EL_LENS:		return K_FOCAL;
	case EL_SPLITTER:	return K_REFLECTANCE;
	case EL_WAVEPLATE:	return K_RETARDANCE;
	case EL_IRIS:		return K_DIAMETER;
	case EL_ISOLATOR:	return K_ISOLATION;
	default:		return -1;
	}
}

static const struct {
	const char *prefix;
	const char *help;
} type_info[EL_NTYPES] = {
	[EL_SPACE] = { "S", "free space between two elements" },
	[EL_MIRROR] = { "M", "flat or curved mirror (reflectance, roc, aoi)" },
	[EL_LENS] = { "L", "thin lens, spherical or cylindrical" },
	[EL_SPLITTER] = { "BS", "beam splitter with a side branch" },
	[EL_WINDOW] = { "W", "window or plate the beam passes" },
	[EL_FILTER] = { "F", "absorbing or reflective filter (od)" },
	[EL_WAVEPLATE] = { "WP", "waveplate (retardance, angle)" },
	[EL_POLARIZER] = { "POL", "polarizer with a rejected port" },
	[EL_IRIS] = { "IR", "iris or aperture that clips the beam" },
	[EL_DUMP] = { "BD", "beam dump: ends a branch" },
	[EL_DETECTOR] = { "PD", "detector or power meter: ends a branch" },
	[EL_TARGET] = { "T", "sample or target: ends a branch" },
	[EL_ISOLATOR] = { "ISO", "optical isolator: passes forward, blocks light going back" },
};

const char *
layout_type_help(enum elem_type t)
{
	return (unsigned)t < EL_NTYPES ? type_info[t].help : "";
}

char *
layout_new_id(const struct bench *b, enum elem_type t)
{
	const char *p = (unsigned)t < EL_NTYPES ? type_info[t].prefix : "E";

	for (unsigned long i = 1;; i++) {
		char *id = xasprintf("%s%lu", p, i);

		if (model_find((struct bench *)b, id, NULL, NULL, NULL) == NULL)
			return id;
		free(id);
	}
}

size_t
layout_fields(const struct element *el, struct layout_field *out, size_t max)
{
	size_t n = 0;

#define ADD(k_, key_, name_, help_, given_) do { if (n < max) { \
	out[n].kind = (k_); out[n].key = (key_); out[n].name = (name_); \
	out[n].help = (help_); out[n].given = (given_); } n++; } while (0)
	ADD(LF_ID, -1, "id", "unique name of the element in the bench", 1);
	ADD(LF_LABEL, -1, "label", "what it is, in words (optional)", el->label != NULL);
	ADD(LF_PART, -1, "part", "parts-shelf name it came from (optional)", el->part != NULL);
	if (el->type == EL_SPLITTER)
		ADD(LF_SIDE, -1, "side", "side port: reflected or transmitted", 1);
	else if (el->type == EL_POLARIZER)
		ADD(LF_SIDE, -1, "side", "rejected: trace the rejected beam; none: drop it",
		    el->side_port != PORT_NONE);
	for (int k = 0; k < K_COUNT; k++)
		if (model_key_applies((enum model_key)k, el->type))
			ADD(LF_KEY, k, model_key_path((enum model_key)k), model_keys[k].help,
			    model_has(el, (enum model_key)k));
#undef ADD
	return n;
}

char *
layout_field_value(const struct element *el, const struct layout_field *f)
{
	switch (f->kind) {
	case LF_ID:
		return xstrdup(el->id);
	case LF_LABEL:
		return xstrdup(el->label != NULL ? el->label : "");
	case LF_PART:
		return xstrdup(el->part != NULL ? el->part : "");
	case LF_SIDE:
		return xstrdup(el->side_port == PORT_NONE ? "none" : model_port_name(el->side_port));
	default:
		return layout_value_text(el, (enum model_key)f->key);
	}
}

