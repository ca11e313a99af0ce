/* core-layout.c - the workbench's layout and formatting decisions, kept out
 * of the curses code so they can be tested: bars, columns, hints, the chain
 * as rows, value text, the status line and the profile plot.  Owned by the
 * workbench; see core-layout.h. */
#include <config.h>

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "core-edit.h"
#include "core-layout.h"
#include "util-err.h"

/* ---- numbers and words ---- */

static void
put(char *buf, size_t n, size_t *used, const char *s)
{
	size_t l = strlen(s);

	if (*used + l + 1 > n)
		return;
	memcpy(buf + *used, s, l + 1);
	*used += l;
}

int
layout_bar(char *buf, size_t n, double ratio, double caution, int width, int ascii)
{
	static const char *const eighth[8] = {
		"", "\u258f", "\u258e", "\u258d", "\u258c", "\u258b", "\u258a", "\u2589",
	};
	size_t used = 0;
	int tick = -1, full, part, over;

	if (n == 0)
		return 0;
	buf[0] = '\0';
	if (width <= 0)
		return 0;
	if (isnan(ratio)) {
		for (int i = 0; i < width; i++)
			put(buf, n, &used, " ");
		return width;
	}
	over = ratio > 1;
	if (ratio < 0)
		ratio = 0;
	if (ratio > 1)
		ratio = 1;
	/* in eighths of a cell; ASCII rounds to whole cells */
	full = (int)floor(ratio * width * 8 + 0.5);
	part = ascii ? 0 : full % 8;
	full = ascii ? (full + 4) / 8 : full / 8;
	if (ratio > 0 && full == 0 && part == 0) {
		if (ascii)
			full = 1;
		else
			part = 1;
	}
	if (isfinite(caution) && caution > 0 && caution < 1)
		tick = (int)floor(caution * width);
	for (int i = 0; i < width; i++) {
		if (over && i == width - 1)
			put(buf, n, &used, ascii ? ">" : "\u25b6");
		else if (i < full)
			put(buf, n, &used, ascii ? "#" : "\u2588");
		else if (i == full && part > 0)
			put(buf, n, &used, eighth[part]);
		else if (i == tick)
			put(buf, n, &used, ascii ? "|" : "\u2502");
		else
			put(buf, n, &used, ascii ? "." : "\u00b7");
	}
	return width;
}

void
layout_percent(char *buf, size_t n, double ratio)
{
	double p = ratio * 100;

	if (isnan(ratio))
		snprintf(buf, n, "-");
	else if (p == 0)
		snprintf(buf, n, "0 %%");
	else if (p < 0.01)
		snprintf(buf, n, "<0.01 %%");
	else if (p < 1)
		snprintf(buf, n, "%.2f %%", p);
	else if (p < 99.95)
		snprintf(buf, n, "%.1f %%", p);
	else if (p < 99999.5)
		snprintf(buf, n, "%.0f %%", p);
	else
		snprintf(buf, n, "%.2g %%", p);
}

const char *
layout_status_word(enum damage_status s)
{
	static const char *const words[] = { "unrated", "ok", "caution", "OVER" };

	return (unsigned)s < 4 ? words[s] : "?";
}

/* Splits a formatted quantity "2.41 mm" into number and unit. */
static void
split_unit(const char *s, char *num, size_t nn, const char **unit)
{
	const char *sp = strchr(s, ' ');
	size_t l = sp != NULL ? (size_t)(sp - s) : strlen(s);

	if (l >= nn)
		l = nn - 1;
	memcpy(num, s, l);
	num[l] = '\0';
	*unit = sp != NULL ? sp + 1 : "";
}

void
layout_radius_text(char *buf, size_t n, double wx, double wy, int ascii)
{
	char a[48], b[48], na[48], nb[48];
	const char *ua, *ub;

	units_format(a, sizeof a, wx, DIM_LENGTH, 3, ascii);
	units_format(b, sizeof b, wy, DIM_LENGTH, 3, ascii);
	if (strcmp(a, b) == 0) {
		snprintf(buf, n, "%s", a);
		return;
	}
	split_unit(a, na, sizeof na, &ua);
	split_unit(b, nb, sizeof nb, &ub);
	if (strcmp(ua, ub) == 0)
		snprintf(buf, n, "%s/%s %s", na, nb, ua);
	else
		snprintf(buf, n, "%s/%s", a, b);
}

/* ---- text in columns ---- */

static const struct { const char *u, *a; } ascii_map[] = {
	{ "\u00b5", "u" }, { "\u03bc", "u" }, { "\u00b2", "^2" }, { "\u00b3", "^3" },
	{ "\u00b0", " deg" }, { "\u2192", "->" }, { "\u2190", "<-" }, { "\u2191", "^" },
	{ "\u2193", "v" }, { "\u00d7", "x" }, { "\u2026", "~" }, { "\u2502", "|" },
	{ "\u2500", "-" }, { "\u2514", "`" }, { "\u251c", "|" }, { "\u253c", "+" },
	{ "\u00b7", "." }, { "\u2588", "#" }, { "\u25b6", ">" }, { "\u25c6", "F" },
	{ "\u25cf", "*" }, { "\u2580", "=" }, { "\u2264", "<=" }, { "\u2265", ">=" },
	{ "\u00b1", "+/-" }, { "\u2014", "-" }, { "\u2013", "-" }, { "\u25b2", "^" },
	{ "\u25bc", "v" }, { "\u00b9", "1" },
};

char *
layout_ascii(const char *s)
{
	struct buf b;

	buf_init(&b);
	while (*s != '\0') {
		size_t l = 1, i;

		if ((unsigned char)*s < 0x80) {
			buf_addc(&b, *s++);
			continue;
		}
		while (((unsigned char)s[l] & 0xc0) == 0x80)
			l++;
		for (i = 0; i < sizeof ascii_map / sizeof *ascii_map; i++)
			if (strlen(ascii_map[i].u) == l && memcmp(s, ascii_map[i].u, l) == 0)
				break;
		buf_add(&b, i < sizeof ascii_map / sizeof *ascii_map ? ascii_map[i].a : "?");
		s += l;
	}
	return buf_take(&b);
}

/* Byte length of the first `cols` code points of s. */
static size_t
utf8_prefix(const char *s, int cols)
{
	size_t i = 0;
	int c = 0;

	while (s[i] != '\0') {
		if (((unsigned char)s[i] & 0xc0) != 0x80) {
			if (c == cols)
				break;
			c++;
		}
		i++;
	}
	return i;
}

char *
layout_fit_text(char *buf, size_t n, const char *s, int cols, enum layout_align al,
    int ascii)
{
	int have = (int)utf8_cols(s);
	size_t used = 0, l;

	if (n == 0)
		return buf;
	buf[0] = '\0';
	if (cols <= 0)
		return buf;
	if (have > cols) {
		l = utf8_prefix(s, cols - 1);
		if (l + 4 > n)
			l = n > 4 ? n - 4 : 0;
		memcpy(buf, s, l);
		buf[l] = '\0';
		used = l;
		put(buf, n, &used, ascii ? "~" : "\u2026");
		return buf;
	}
	if (al == LAYOUT_RIGHT)
		for (int i = have; i < cols; i++)
			put(buf, n, &used, " ");
	put(buf, n, &used, s);
	if (al == LAYOUT_LEFT)
		for (int i = have; i < cols; i++)
			put(buf, n, &used, " ");
	return buf;
}

int
layout_fit_columns(const struct layout_col *c, size_t n, int width, int gap, int *w)
{
	int maxprio = 0, total, cut;

	for (size_t i = 0; i < n; i++)
		if (c[i].prio > maxprio)
			maxprio = c[i].prio;
	/* drop the least important until the minima fit */
	for (cut = maxprio; cut >= 0; cut--) {
		int shown = 0;

		total = 0;
		for (size_t i = 0; i < n; i++)
			if (c[i].prio <= cut) {
				total += c[i].min;
				shown++;
			}
		if (shown > 0)
			total += gap * (shown - 1);
		if (total <= width)
			break;
	}
	if (cut < 0) {
		for (size_t i = 0; i < n; i++)
			w[i] = 0;
		return -1;
	}
	for (size_t i = 0; i < n; i++)
		w[i] = c[i].prio <= cut ? c[i].min : 0;
	/* widen towards `want`, the most important first */
	for (int p = 0; p <= cut; p++)
		for (size_t i = 0; i < n; i++) {
			int more;

			if (c[i].prio != p || c[i].want <= c[i].min)
				continue;
			more = c[i].want - c[i].min;
			if (more > width - total)
				more = width - total;
			if (more > 0) {
				w[i] += more;
				total += more;
			}
		}
	for (size_t i = 0; i < n; i++)
		if (w[i] > 0 && c[i].want < 0) {
			w[i] += width - total;
			total = width;
			break;
		}
	return total;
}

static void
wrap_store(size_t *starts, size_t *lens, size_t max, size_t n, size_t a, size_t b)
{
	if (n < max) {
		starts[n] = a;
		lens[n] = b - a;
	}
}

size_t
layout_wrap(const char *s, int width, size_t *starts, size_t *lens, size_t max)
{
	size_t n = 0, line = 0, i = 0, brk = 0;
	int cols = 0, have_brk = 0;

	if (width < 1)
		width = 1;
	while (s[i] != '\0') {
		if (s[i] == '\n') {
			wrap_store(starts, lens, max, n++, line, i);
			line = ++i;
			cols = 0;
			have_brk = 0;
			continue;
		}
		if (s[i] == ' ') {
			brk = i;
			have_brk = 1;
		}
		if (((unsigned char)s[i] & 0xc0) != 0x80) {
			if (cols == width) {
				if (have_brk && brk > line) {
					wrap_store(starts, lens, max, n++, line, brk);
					line = i = brk + 1;
				} else {
					wrap_store(starts, lens, max, n++, line, i);
					line = i;
				}
				while (s[line] == ' ')
					line++;
				i = line;
				cols = 0;
				have_brk = 0;
				continue;
			}
			cols++;
		}
		i++;
	}
	if (i > line || n == 0)
		wrap_store(starts, lens, max, n++, line, i);
	return n;
}

/* ---- key hints ---- */

static int
hint_cols(const struct layout_hint *h)
{
	return (int)(utf8_cols(h->key) + 1 + utf8_cols(h->word));
}

size_t
layout_hints_pick(const struct layout_hint *h, size_t n, int width, unsigned char *shown)
{
	int total = 0;
	size_t count = 0;

	for (size_t i = 0; i < n; i++) {
		shown[i] = 1;
		total += (count ? 2 : 0) + hint_cols(&h[i]);
		count++;
	}
	/* drop one at a time: the least important, the rightmost of equals */
	while (total > width && count > 0) {
		size_t drop = n;

		for (size_t i = 0; i < n; i++)
			if (shown[i] && h[i].prio > 0 && (drop == n || h[i].prio >= h[drop].prio))
				drop = i;
		if (drop == n)
			break;
		shown[drop] = 0;
		total -= hint_cols(&h[drop]) + (count > 1 ? 2 : 0);
		count--;
	}
	/* not even the essentials: as many from the left as fit */
	if (total > width) {
		total = 0;
		count = 0;
		for (size_t i = 0; i < n; i++) {
			int need = (count ? 2 : 0) + hint_cols(&h[i]);

			shown[i] = shown[i] && total + need <= width;
			if (shown[i]) {
				total += need;
				count++;
			}
		}
	}
	return count;
}

char *
layout_hints_text(const struct layout_hint *h, size_t n, int width)
{
	unsigned char *shown = xcalloc(n ? n : 1, 1);
	struct buf b;

	buf_init(&b);
	layout_hints_pick(h, n, width, shown);
	for (size_t i = 0; i < n; i++)
		if (shown[i])
			buf_printf(&b, "%s%s %s", b.len ? "  " : "", h[i].key, h[i].word);
	free(shown);
	return buf_take(&b);
}

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
static char *
quantity_text(double v, enum unit_dim dim)
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

	if (isnan(v))
		return xstrdup("");
	switch (d->kind) {
	case KIND_QUANTITY:
		return quantity_text(v, d->dim);
	case KIND_BOOL:
	case KIND_AXIS:
		return model_value_text(el, k);
	case KIND_SURFACE:
		if (v == MODEL_UNCOATED)
			return model_value_text(el, k);
		return plain_text(v);
	default:
		return plain_text(v);
	}
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
layout_bench_value_text(const struct bench *b, const char *key)
{
	const struct source *s = &b->src;
	size_t i;

	for (i = 0; i < NBENCH_KEYS; i++)
		if (strcmp(bench_keys[i].key, key) == 0)
			break;
	if (i == NBENCH_KEYS || bench_keys[i].dim == DIM_COUNT)
		return edit_bench_value(b, key);
	if (!s->pulsed && (strcmp(key, "source.pulse_energy") == 0 ||
	    strcmp(key, "source.rep_rate") == 0 || strcmp(key, "source.pulse_width") == 0))
		return xstrdup("");
	if (strcmp(key, "air_breakdown") == 0)
		return quantity_text(b->air_breakdown, DIM_IRRADIANCE);
	if (strcmp(key, "stray_warn") == 0)
		return quantity_text(b->stray_warn, DIM_POWER);
	if (strcmp(key, "source.max_return") == 0)
		return isnan(s->max_return) ? xstrdup("") : quantity_text(s->max_return, DIM_POWER);
	if (strcmp(key, "source.wavelength") == 0)
		return quantity_text(s->wavelength, DIM_LENGTH);
	if (strcmp(key, "source.power") == 0)
		return quantity_text(s->power, DIM_POWER);
	if (strcmp(key, "source.pulse_energy") == 0)
		return quantity_text(s->pulse_energy, DIM_ENERGY);
	if (strcmp(key, "source.rep_rate") == 0)
		return quantity_text(s->rep_rate, DIM_FREQUENCY);
	if (strcmp(key, "source.pulse_width") == 0)
		return quantity_text(s->pulse_width, DIM_TIME);
	if (strcmp(key, "source.waist_position") == 0)
		return quantity_text(s->waist_position, DIM_LENGTH);
	/* source.waist */
	{
		char *x = quantity_text(s->waist[0], DIM_LENGTH), *y, *r;

		if (!s->waist_pair)
			return x;
		y = quantity_text(s->waist[1], DIM_LENGTH);
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

/* ---- the status line ---- */

/* One form of the status line; `level` makes it shorter. */
static char *
status_text(const struct trace *t, int ascii, int level)
{
	const char *sep = level >= 1 ? (ascii ? " | " : " \u2502 ") :
	    (ascii ? "  |  " : "  \u2502  ");
	struct buf b;
	char pct[32], v[48], br[160];
	size_t nun = 0;

	buf_init(&b);
	if (t->worst >= 0) {
		const struct trace_row *w = &t->rows[t->worst];

		layout_percent(pct, sizeof pct, t->worst_ratio);
		buf_printf(&b, "worst: %s %s %s", w->el->id, pct, layout_status_word(w->status));
	} else {
		buf_add(&b, "worst: nothing rated");
	}
	buf_add(&b, sep);
	if (isfinite(t->safe_source_power)) {
		units_format(v, sizeof v, t->safe_source_power, DIM_POWER, 3, ascii);
		buf_printf(&b, level >= 3 ? "safe power %s" : "safe source power %s", v);
	} else {
		buf_add(&b, level >= 3 ? "safe power: no ratings" : "safe source power: no ratings");
	}
	buf_add(&b, sep);
	for (size_t i = 0; i < t->nwarn; i++)
		if (t->warn[i].kind == TW_UNTERMINATED)
			nun++;
	if (nun == 0) {
		buf_add(&b, "all beams terminated");
	} else {
		size_t k = 0;

		buf_printf(&b, "unterminated%s: ", nun > 1 ? " beams" : "");
		for (size_t i = 0; i < t->nwarn; i++) {
			const struct trace_warning *w = &t->warn[i];

			if (w->kind != TW_UNTERMINATED)
				continue;
			units_format(v, sizeof v, w->value, DIM_POWER, 3, ascii);
			buf_printf(&b, "%s%s after %s", k++ ? ", " : "", v,
			    w->after != NULL ? w->after->id : "the source");
			if (level < 2) {
				trace_branch_name(w->parent, w->port, br, sizeof br);
				buf_printf(&b, " (%s)", br);
			}
		}
	}
	return buf_take(&b);
}

char *
layout_status_line(const struct trace *t, int ascii, int width)
{
	for (int level = 0;; level++) {
		char *s = status_text(t, ascii, level);

		if (level == 3 || (int)utf8_cols(s) <= width)
			return s;
		free(s);
	}
}

/* ---- the beam profile ---- */

static int
same_branch(const struct trace_row *r, const struct element *parent)
{
	return r->parent == parent;
}

size_t
layout_profile_path(const struct trace *t, size_t sel, size_t **idx)
{
	const struct element **anc = NULL;
	size_t nanc = 0, n = 0, level = 0;
	size_t *out;

	*idx = NULL;
	if (sel >= t->nrows)
		return 0;
	/* ancestors of sel's branch, innermost first: owners of side branches */
	for (const struct element *p = t->rows[sel].parent; p != NULL;) {
		const struct element *up = NULL;

		anc = xreallocarray(anc, nanc + 1, sizeof *anc);
		anc[nanc++] = p;
		for (size_t i = 0; i < t->nrows; i++)
			if (t->rows[i].el == p) {
				up = t->rows[i].parent;
				break;
			}
		p = up;
	}
	out = xreallocarray(NULL, t->nrows ? t->nrows : 1, sizeof *out);
	/* walk from main (parent NULL) down: the branch at `level` is owned by
	 * anc[nanc - level] (NULL at level 0) and is followed up to the owner of
	 * the next level's branch, or to its end at the last level */
	for (level = 0; level <= nanc; level++) {
		const struct element *owner = level == 0 ? NULL : anc[nanc - level];
		const struct element *stop = level < nanc ? anc[nanc - level - 1] : NULL;

		for (size_t i = 0; i < t->nrows; i++) {
			if (!same_branch(&t->rows[i], owner))
				continue;
			out[n++] = i;
			if (stop != NULL && t->rows[i].el == stop)
				break;
		}
	}
	free(anc);
	*idx = out;
	return n;
}

double
layout_nice_ceil(double x)
{
	static const double steps[] = { 1, 2, 2.5, 5, 10 };
	double e, m;

	if (!(x > 0) || !isfinite(x))
		return x > 0 ? x : 0;
	e = pow(10, floor(log10(x)));
	m = x / e;
	for (size_t i = 0; i < sizeof steps / sizeof *steps; i++)
		if (m <= steps[i] * (1 + 1e-12))
			return steps[i] * e;
	return 10 * e;
}

size_t
layout_ticks(double lo, double hi, size_t maxn, double *out)
{
	static const double mult[] = { 1, 2, 5, 10 };
	double span = hi - lo, base, step = 0;
	size_t n = 0;

	if (maxn == 0 || !(span > 0) || !isfinite(span))
		return 0;
	base = pow(10, floor(log10(span / (double)maxn)));
	for (int k = 0; k < 2 && step == 0; k++, base *= 10)
		for (size_t i = 0; i < sizeof mult / sizeof *mult; i++) {
			double s = base * mult[i];

			if (floor(hi / s) - ceil(lo / s) + 1 <= (double)maxn) {
				step = s;
				break;
			}
		}
	if (step == 0)
		return 0;
	for (double v = ceil(lo / step - 1e-9) * step; v <= hi + step * 1e-9 && n < maxn;
	    v += step)
		out[n++] = fabs(v) < step * 1e-9 ? 0 : v;
	return n;
}

int
layout_map_col(double z, double z0, double z1, int w)
{
	int c;

	if (w <= 0)
		return 0;
	if (!(z1 > z0))
		return 0;
	c = (int)floor((z - z0) / (z1 - z0) * w);
	return c < 0 ? 0 : c >= w ? w - 1 : c;
}

static int
value_row(double v, double top, int h)
{
	int r;

	if (!(top > 0) || !isfinite(v))
		return h - 1;
	r = (h - 1) - (int)floor(v / top * (h - 1) + 0.5);
	return r < 0 ? 0 : r > h - 1 ? h - 1 : r;
}

static void
setc(struct layout_plot *p, int row, int col, unsigned char g)
{
	unsigned char *c = &p->cell[(size_t)row * (size_t)p->w + (size_t)col];

	if ((*c == LG_WX && g == LG_WY) || (*c == LG_WY && g == LG_WX))
		*c = LG_WXY;
	else if (*c == LG_EMPTY || g == LG_FOCUS || (*c == LG_SEL && g != LG_SEL))
		*c = g;
}

/* Puts glyph g in `col` from row a to row b of the plot band starting at base. */
static void
vline(struct layout_plot *p, int base, int col, int a, int b, unsigned char g)
{
	if (a > b) {
		int t = a;

		a = b;
		b = t;
	}
	for (int r = a; r <= b; r++)
		setc(p, base + r, col, g);
}

static double
row_length(const struct trace_row *r)
{
	return r->el->type == EL_SPACE ? model_get(r->el, K_LENGTH) : 0;
}

int
layout_profile(const struct trace *t, const size_t *path, size_t npath, size_t sel,
    int w, int hr, int hp, struct layout_plot *p)
{
	double *wx, *wy, *pw, rmax = 0, pmax = 0;
	int prev_x = -1, prev_y = -1, prev_p = -1;

	memset(p, 0, sizeof *p);
	p->sel_col = -1;
	if (w < 2 || hr < 2 || hp < 2 || npath == 0)
		return -1;
	p->w = w;
	p->hr = hr;
	p->hp = hp;
	p->cell = xcalloc((size_t)w * (size_t)(hr + hp), 1);
	p->z0 = t->rows[path[0]].z;
	p->z1 = t->rows[path[npath - 1]].z + row_length(&t->rows[path[npath - 1]]);
	if (!(p->z1 > p->z0))
		p->z1 = p->z0 + 1e-3;
	wx = xcalloc((size_t)w, sizeof *wx);
	wy = xcalloc((size_t)w, sizeof *wy);
	pw = xcalloc((size_t)w, sizeof *pw);
	/* sample the middle of each column inside the gap that holds it */
	for (int c = 0, k = 0; c < w; c++) {
		double z = p->z0 + (c + 0.5) * (p->z1 - p->z0) / w;
		const struct trace_row *r;

		while ((size_t)k + 1 < npath && t->rows[path[k + 1]].z <= z)
			k++;
		r = &t->rows[path[k]];
		if (r->el->type == EL_SPACE)
			trace_radius_at(t, r, z - r->z, &wx[c], &wy[c]);
		else {
			wx[c] = r->wx;
			wy[c] = r->wy;
		}
		pw[c] = r->el->type == EL_SPACE ? r->power_in : r->power_out;
		if (wx[c] > rmax)
			rmax = wx[c];
		if (wy[c] > rmax)
			rmax = wy[c];
		if (pw[c] > pmax)
			pmax = pw[c];
	}
	for (size_t i = 0; i < npath; i++) {
		const struct trace_row *r = &t->rows[path[i]];

		if (r->wx > rmax)
			rmax = r->wx;
		if (r->wy > rmax)
			rmax = r->wy;
		if (r->power_in > pmax)
			pmax = r->power_in;
	}
	p->rmax = layout_nice_ceil(rmax * 1.05);
	p->pmax = layout_nice_ceil(pmax * 1.05);
	if (sel != (size_t)-1)
		for (size_t i = 0; i < npath; i++)
			if (path[i] == sel) {
				p->sel_col = layout_map_col(t->rows[sel].z, p->z0, p->z1, w);
				vline(p, 0, p->sel_col, 0, hr - 1, LG_SEL);
				vline(p, hr, p->sel_col, 0, hp - 1, LG_SEL);
			}
	for (int c = 0; c < w; c++) {
		int ry = value_row(wy[c], p->rmax, hr), rx = value_row(wx[c], p->rmax, hr);
		int rp = value_row(pw[c], p->pmax, hp);

		/* join to the previous column so steep curves stay connected */
		vline(p, 0, c, ry, prev_y < 0 ? ry : prev_y + (prev_y < ry ? 1 : prev_y > ry ? -1 : 0), LG_WY);
		vline(p, 0, c, rx, prev_x < 0 ? rx : prev_x + (prev_x < rx ? 1 : prev_x > rx ? -1 : 0), LG_WX);
		vline(p, hr, c, rp, prev_p < 0 ? rp : prev_p, LG_POWER);
		prev_x = rx;
		prev_y = ry;
		prev_p = rp;
	}
	for (size_t i = 0; i < npath; i++) {
		const struct trace_row *r = &t->rows[path[i]];

		if (r->el->type != EL_SPACE) {
			p->mark = xreallocarray(p->mark, p->nmark + 1, sizeof *p->mark);
			p->mark[p->nmark++] = (struct layout_mark){
				layout_map_col(r->z, p->z0, p->z1, w), path[i], 0 };
		}
		if (r->has_focus) {
			int c = layout_map_col(r->focus.z, p->z0, p->z1, w);
			double fw = r->focus.wx < r->focus.wy ? r->focus.wx : r->focus.wy;

			p->mark = xreallocarray(p->mark, p->nmark + 1, sizeof *p->mark);
			p->mark[p->nmark++] = (struct layout_mark){ c, path[i], 1 };
			setc(p, value_row(fw, p->rmax, hr), c, LG_FOCUS);
		}
	}
	free(wx);
	free(wy);
	free(pw);
	return 0;
}

void
layout_plot_release(struct layout_plot *p)
{
	free(p->cell);
	free(p->mark);
	memset(p, 0, sizeof *p);
	p->sel_col = -1;
}
