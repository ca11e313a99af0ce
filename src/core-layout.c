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
#include "core-layout-tol.h"
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

const char *
layout_row_status_word(const struct trace_row *r)
{
	if (r->flags & TF_AIR_BREAKDOWN)
		return "spark";
	if (r->status == STATUS_UNRATED && r->el->type == EL_SPACE)
		return "n/a";
	return layout_status_word(r->status);
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
	{ "\u00b1", "+-" }, { "\u2014", "-" }, { "\u2013", "-" }, { "\u25b2", "^" },
	{ "\u25bc", "v" }, { "\u00b9", "1" }, { "\u203a", ">" }, { "\u2506", ":" },
	{ "\u00f7", "/" }, { "\u03bb", "lambda" }, { "\u03c4", "tau" }, { "\u221e", "inf" },
	{ "\u21c4", "<>" }, { "\u2592", ":" }, { "\u25b8", ">" }, { "\u2039", "<" },
	{ "\u21b3", "`->" }, { "\u2591", "." },
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

/* The brief forms: the words of the keys a new user most needs to find
 * on an 80-column line, where the whole words leave no room for them. */
static const struct {
	const char *word, *brief;
} hint_briefs[] = {
	{ "reflections", "ghosts" }, { "tolerance", "odds" },
	{ "new seed", "seed" }, { "more samples", "more" }, { "sample count", "samples" },
};

static const char *
brief_of(const struct layout_hint *h)
{
	for (size_t i = 0; i < sizeof hint_briefs / sizeof *hint_briefs; i++)
		if (strcmp(h->word, hint_briefs[i].word) == 0)
			return hint_briefs[i].brief;
	return NULL;
}

const char *
layout_hint_word(const struct layout_hint *h, unsigned char shown)
{
	const char *b = shown == 2 ? brief_of(h) : NULL;

	return b != NULL ? b : h->word;
}

static int
hint_cols(const struct layout_hint *h, unsigned char shown)
{
	return (int)(utf8_cols(h->key) + 1 + utf8_cols(layout_hint_word(h, shown)));
}

/* Width of the shown hints: two blanks inside a group, the group sign
 * with a blank each side between groups. */
static int
hints_width(const struct layout_hint *h, size_t n, const unsigned char *shown)
{
	int total = 0, prev = -1;

	for (size_t i = 0; i < n; i++) {
		if (!shown[i])
			continue;
		if (prev >= 0)
			total += h[i].group != h[prev].group ? LAYOUT_GROUP_GAP : 2;
		total += hint_cols(&h[i], shown[i]);
		prev = (int)i;
	}
	return total;
}

size_t
layout_hints_pick(const struct layout_hint *h, size_t n, int width, unsigned char *shown)
{
	size_t count = n;
	int briefs = 0;

	for (size_t i = 0; i < n; i++)
		shown[i] = 1;
	/* drop one at a time: the least important, the rightmost of equals;
	 * the first one that has a brief word makes every brief taken instead */
	while (hints_width(h, n, shown) > width && count > 0) {
		size_t drop = n;

		for (size_t i = 0; i < n; i++)
			if (shown[i] && h[i].prio > 0 && (drop == n || h[i].prio >= h[drop].prio))
				drop = i;
		if (drop == n)
			break;
		if (!briefs && brief_of(&h[drop]) != NULL) {
			briefs = 1;
			for (size_t i = 0; i < n; i++)
				if (shown[i] && brief_of(&h[i]) != NULL)
					shown[i] = 2;
			continue;
		}
		shown[drop] = 0;
		count--;
	}
	/* not even the essentials: drop from the right */
	while (count > 0 && hints_width(h, n, shown) > width) {
		for (size_t i = n; i-- > 0;)
			if (shown[i]) {
				shown[i] = 0;
				break;
			}
		count--;
	}
	return count;
}

char *
layout_hints_text(const struct layout_hint *h, size_t n, int width)
{
	unsigned char *shown = xcalloc(n ? n : 1, 1);
	struct buf b;
	int prev = -1;

	buf_init(&b);
	layout_hints_pick(h, n, width, shown);
	for (size_t i = 0; i < n; i++)
		if (shown[i]) {
			if (prev >= 0)
				buf_add(&b, h[i].group != h[prev].group ? " " LAYOUT_GROUP_SIGN " " : "  ");
			buf_printf(&b, "%s" LAYOUT_KEY_SIGN "%s", h[i].key,
			    layout_hint_word(&h[i], shown[i]));
			prev = (int)i;
		}
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

