/* core-layout-text.c - the workbench's words and columns, kept out of the
 * curses code so they can be tested: the ratio bar, percentages and status
 * words, ASCII stand-ins, text cut and wrapped to a width, columns fitted
 * to the screen, and the key line's hints chosen to fit.  Owned by the
 * workbench; see core-layout.h. */
#include <config.h>

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

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
