/* core-units.c - quantities as text, both ways.  See core-units.h.
 *
 * A unit is read into integer exponents of m, J, s and V plus one power of
 * ten, so every accepted spelling reduces to a single comparison against the
 * dimension wanted, and the power of ten can be folded into the decimal
 * exponent of the number before strtod rounds it (one rounding, not two). */
#include <config.h>

#include <assert.h>
#include <locale.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "core-units.h"
#include "util-json.h"
#include "util-buf.h"
#include "util-err.h"

/* Exponent bases.  W and Hz are not bases: W = J/s, Hz = 1/s. */
enum { B_M, B_J, B_S, B_V, B_COUNT };

#define MICRO_SIGN	"\xc2\xb5"	/* U+00B5, what we write */
#define GREEK_MU	"\xce\xbc"	/* U+03BC, what some keyboards give */
#define SUP2		"\xc2\xb2"	/* U+00B2 */
#define SUP3		"\xc2\xb3"	/* U+00B3 */
#define MIDDLE_DOT	"\xc2\xb7"	/* U+00B7 */

#define NELEMS(a)	(sizeof (a) / sizeof (a)[0])
#define MAX_FACTORS	8	/* "W/cm^2" has two; more is a typo */
#define MAX_EXP10	999999999LL	/* beyond any double; keeps sums in range */

static const struct dim_info {
	const char	*name;
	signed char	 e[B_COUNT];	/* exponents of m, J, s, V */
	const char	*si[2];		/* SI unit, UTF-8 and ASCII */
	const char	*show[2];	/* unit displayed, before its prefix */
	int		 show_exp10;	/* one displayed unit is 10^this SI */
	int		 scientific;	/* no prefix: "kcm²/W" would mean nothing */
	const char	*example;	/* unit suggested when one is missing */
	int		 example_exp10;
} dims[DIM_COUNT] = {
	[DIM_NONE] = { "number", { 0, 0, 0, 0 },
	    { "", "" }, { "", "" }, 0, 0, "", 0 },
	[DIM_LENGTH] = { "length", { 1, 0, 0, 0 },
	    { "m", "m" }, { "m", "m" }, 0, 0, "mm", -3 },
	[DIM_POWER] = { "power", { 0, 1, -1, 0 },
	    { "W", "W" }, { "W", "W" }, 0, 0, "W", 0 },
	[DIM_ENERGY] = { "energy", { 0, 1, 0, 0 },
	    { "J", "J" }, { "J", "J" }, 0, 0, "mJ", -3 },
	[DIM_TIME] = { "time", { 0, 0, 1, 0 },
	    { "s", "s" }, { "s", "s" }, 0, 0, "ns", -9 },
	[DIM_FREQUENCY] = { "frequency", { 0, 0, -1, 0 },
	    { "Hz", "Hz" }, { "Hz", "Hz" }, 0, 0, "Hz", 0 },
	[DIM_LINEAR] = { "linear power density", { -1, 1, -1, 0 },
	    { "W/m", "W/m" }, { "W/cm", "W/cm" }, 2, 0, "kW/cm", 5 },
	[DIM_IRRADIANCE] = { "irradiance", { -2, 1, -1, 0 },
	    { "W/m" SUP2, "W/m^2" }, { "W/cm" SUP2, "W/cm^2" }, 4, 0,
	    "kW/cm^2", 7 },
	[DIM_FLUENCE] = { "fluence", { -2, 1, 0, 0 },
	    { "J/m" SUP2, "J/m^2" }, { "J/cm" SUP2, "J/cm^2" }, 4, 0,
	    "J/cm^2", 4 },
	[DIM_N2] = { "nonlinear index", { 2, -1, 1, 0 },
	    { "m" SUP2 "/W", "m^2/W" }, { "cm" SUP2 "/W", "cm^2/W" }, -4, 1,
	    "cm^2/W", -4 },
	[DIM_FIELD] = { "electric field", { -1, 0, 0, 1 },
	    { "V/m", "V/m" }, { "V/m", "V/m" }, 0, 0, "V/m", 0 },
};

/* NAME_LEN: a literal and its length, so that lookups need no strlen */
#define NAME_LEN(s)	s, sizeof s - 1

static const struct symbol {
	const char	*name;
	size_t		 len;
	signed char	 e[B_COUNT];
} symbols[] = {
	{ NAME_LEN("m"),	{ 1, 0, 0, 0 } },
	{ NAME_LEN("s"),	{ 0, 0, 1, 0 } },
	{ NAME_LEN("J"),	{ 0, 1, 0, 0 } },
	{ NAME_LEN("W"),	{ 0, 1, -1, 0 } },
	{ NAME_LEN("Hz"),	{ 0, 0, -1, 0 } },
	{ NAME_LEN("V"),	{ 0, 0, 0, 1 } },
};

static const struct prefix {
	const char	*name;
	size_t		 len;
	int		 exp10;
} prefixes[] = {
	{ NAME_LEN("f"), -15 }, { NAME_LEN("p"), -12 }, { NAME_LEN("n"), -9 },
	{ NAME_LEN("u"), -6 }, { NAME_LEN(MICRO_SIGN), -6 }, { NAME_LEN(GREEK_MU), -6 },
	{ NAME_LEN("m"), -3 }, { NAME_LEN("c"), -2 }, { NAME_LEN("k"), 3 },
	{ NAME_LEN("M"), 6 }, { NAME_LEN("G"), 9 },
	{ NAME_LEN("T"), 12 },	/* T: we print it */
};

/* Output prefixes by engineering exponent, 10^-15 .. 10^12; no "c". */
static const char *const out_prefix[2][10] = {
	{ "f", "p", "n", MICRO_SIGN, "m", "", "k", "M", "G", "T" },
	{ "f", "p", "n", "u", "m", "", "k", "M", "G", "T" },
};
#define OUT_PREFIX_MIN	(-15)

/* A number as written: the sign and digits are kept as text so that the
 * unit's power of ten can be added to the exponent before converting. */
struct number {
	const char	*start, *end;	/* sign, digits and point */
	long long	 exp10;		/* written exponent, clamped */
	int		 zero;		/* every digit is 0 */
};

struct unit {
	int		 e[B_COUNT];
	long long	 exp10;
};

/* What messages quote: the text without surrounding white space. */
struct quote {
	const char	*s;
	int		 len;
};

const char *
units_dim_name(enum unit_dim dim)
{
	assert(dim >= 0 && dim < DIM_COUNT);
	return dims[dim].name;
}

const char *
units_si_symbol(enum unit_dim dim, int ascii)
{
	assert(dim >= 0 && dim < DIM_COUNT);
	return dims[dim].si[ascii != 0];
}

/* " \t\n\v\f\r", C's isspace in the C locale */
static int
is_space(char c)
{
	return c == ' ' || (c >= '\t' && c <= '\r');
}

/* U+00A0 (no-break space) and U+202F (narrow no-break space, the SI
 * brochure's space between number and unit) are accepted where a space is;
 * returns their length in bytes, or 1 for an ASCII space, or 0. */
static size_t
space_len(const char *p, const char *end)
{
	if (p < end && is_space(*p))
		return 1;
	if (end - p >= 2 && memcmp(p, "\xc2\xa0", 2) == 0)
		return 2;
	if (end - p >= 3 && memcmp(p, "\xe2\x80\xaf", 3) == 0)
		return 3;
	return 0;
}

static int
is_digit(char c)
{
	return c >= '0' && c <= '9';
}

static const char *
article(const char *noun)
{
	return noun[0] != '\0' && strchr("aeiou", noun[0]) != NULL ? "an" : "a";
}

/* Length of the UTF-8 sequence `lit` if p starts with it, else 0. */
static size_t
starts(const char *p, const char *end, const char *lit)
{
	size_t n;

	if (p >= end || *p != lit[0])       /* most tries end at the first byte */
		return 0;
	n = strlen(lit);
	return (size_t)(end - p) >= n && memcmp(p, lit, n) == 0 ? n : 0;
}

/* Letters a unit symbol is made of: ASCII letters and both micro signs. */
static size_t
symbol_char(const char *p, const char *end)
{
	if ((*p >= 'a' && *p <= 'z') || (*p >= 'A' && *p <= 'Z'))
		return 1;
	if (starts(p, end, MICRO_SIGN))
		return strlen(MICRO_SIGN);
	return starts(p, end, GREEK_MU);
}

/* Scans a C decimal floating literal; NULL if there is no digit.  Hex and
 * "inf"/"nan" are not accepted: they are never what a user meant. */
static const char *
scan_number(const char *p, const char *end, struct number *num)
{
	const char *q;
	int digits = 0, neg = 0;

	num->start = p;
	num->zero = 1;
	num->exp10 = 0;
	if (p < end && (*p == '+' || *p == '-'))
		p++;
	for (; p < end && is_digit(*p); p++, digits++)
		num->zero &= *p == '0';
	if (p < end && *p == '.')
		for (p++; p < end && is_digit(*p); p++, digits++)
			num->zero &= *p == '0';
	if (digits == 0)
		return NULL;
	num->end = p;

	/* An 'e' not followed by digits is left for the unit to reject. */
	if (p == end || (*p != 'e' && *p != 'E'))
		return p;
	q = p + 1;
	if (q < end && (*q == '+' || *q == '-'))
		neg = *q++ == '-';
	if (q == end || !is_digit(*q))
		return p;
	for (; q < end && is_digit(*q); q++)
		num->exp10 = num->exp10 < MAX_EXP10 ?
		    num->exp10 * 10 + (*q - '0') : MAX_EXP10;
	if (neg)
		num->exp10 = -num->exp10;
	return q;
}

/* number_value's general way: the digits and exponent as text, to strtod. */
static double
number_value_slow(const struct number *num, long long shift)
{
	struct buf b;
	const char *p;
	long long frac = 0;
	int in_frac = 0;
	double v;

	buf_init(&b);
	for (p = num->start; p < num->end; p++) {
		if (*p == '.')
			in_frac = 1;
		else {
			buf_addc(&b, *p);
			frac += in_frac;
		}
	}
	buf_printf(&b, "e%lld", num->exp10 - frac + shift);
	v = strtod(b.s, NULL);
	buf_release(&b);
	return v;
}

/* The number times 10^shift, rounded once.  The decimal point is dropped
 * (its place goes into the exponent), so strtod never meets the locale's
 * idea of one.  Where the digits make an integer below 2^53 and the
 * exponent is within 10^22, both it and the power of ten are exact
 * doubles, so one multiplication or division rounds the exact value once,
 * as strtod does (Clinger 1990, "How to read floating point numbers
 * accurately", the fast path): the same double, without a formatted
 * string (tests/check_units.c compares the two ways). */
static double
number_value(const struct number *num, long long shift)
{
	static const double p10[] = { 1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8,
	    1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19,
	    1e20, 1e21, 1e22 };
	const char *p = num->start;
	unsigned long long m = 0;
	long long frac = 0, e;
	int in_frac = 0, nd = 0, neg = 0;

	if (*p == '+' || *p == '-')
		neg = *p++ == '-';
	for (; p < num->end; p++) {
		if (*p == '.') {
			in_frac = 1;
			continue;
		}
		if (m != 0 || *p != '0')
			nd++;
		if (nd > 19)
			break;
		m = m * 10 + (unsigned)(*p - '0');
		frac += in_frac;
	}
	e = num->exp10 - frac + shift;
	if (p == num->end && m < (1ULL << 53) && e >= -22 && e <= 22) {
		double v = (double)m;

		v = e >= 0 ? v * p10[e] : v / p10[-e];
		return neg ? -v : v;
	}
	return number_value_slow(num, shift);
}

static const struct symbol *
find_symbol(const char *s, size_t len)
{
	size_t i;

	for (i = 0; i < NELEMS(symbols); i++)
		if (symbols[i].len == len && symbols[i].name[0] == s[0] &&
		    memcmp(symbols[i].name, s, len) == 0)
			return &symbols[i];
	return NULL;
}

/* Reads one "[prefix]symbol[exponent]" at *pp into u, with sign -1 in a
 * denominator. */
static int
scan_factor(const struct quote *q, const char **pp, const char *end,
    int sign, struct unit *u, char **cause)
{
	const char *p = *pp, *run = p;
	const struct symbol *sym;
	size_t i, k, len;
	int exp = 1, neg = 0, pexp = 0;

	while (p < end && (k = symbol_char(p, end)) != 0)
		p += k;
	len = (size_t)(p - run);
	if (len == 0 && run == end)
		return fail_with(cause, "'%.*s': incomplete unit", q->len, q->s);
	if (len == 0)
		return fail_with(cause, "'%.*s': unexpected '%.*s'",
		    q->len, q->s, (int)(end - run), run);

	/* A bare symbol wins over prefix + symbol: "m" is the metre. */
	sym = find_symbol(run, len);
	for (k = 0; sym == NULL && k < NELEMS(prefixes); k++)
		if ((i = prefixes[k].len) < len && run[0] == prefixes[k].name[0] &&
		    memcmp(run, prefixes[k].name, i) == 0 &&
		    (sym = find_symbol(run + i, len - i)) != NULL)
			pexp = prefixes[k].exp10;
	if (sym == NULL)
		return fail_with(cause, "'%.*s': unknown unit '%.*s'",
		    q->len, q->s, (int)len, run);

	if (p < end && (*p == '^' || is_digit(*p))) {
		if (*p == '^' && ++p < end && (*p == '-' || *p == '+'))
			neg = *p++ == '-';
		if (p == end || !is_digit(*p))
			exp = 0;
		else
			for (exp = 0; p < end && is_digit(*p); p++)
				exp = exp < 10 ? exp * 10 + (*p - '0') : exp;
		if (exp < 1 || exp > 9)
			return fail_with(cause, "'%.*s': bad exponent in '%.*s'",
			    q->len, q->s, (int)(p - run), run);
		if (neg)
			exp = -exp;
	} else if ((k = starts(p, end, SUP2)) != 0) {
		exp = 2;
		p += k;
	} else if ((k = starts(p, end, SUP3)) != 0) {
		exp = 3;
		p += k;
	}

	for (i = 0; i < B_COUNT; i++)
		u->e[i] += sign * exp * sym->e[i];
	u->exp10 += sign * exp * pexp;
	*pp = p;
	return 0;
}

/* "/" puts every factor after it in the denominator (W/cm^2, J/m*s). */
static int
scan_unit(const struct quote *q, const char *p, const char *end,
    struct unit *u, char **cause)
{
	int sign = 1, n;
	size_t k;

	memset(u, 0, sizeof *u);
	for (n = 1;; n++) {
		if (n > MAX_FACTORS)
			return fail_with(cause, "'%.*s': unit too long",
			    q->len, q->s);
		if (scan_factor(q, &p, end, sign, u, cause) != 0)
			return -1;
		if (p == end)
			return 0;
		if (*p == '/') {
			sign = -1;
			p++;
		} else if (*p == '*')
			p++;
		else if ((k = starts(p, end, MIDDLE_DOT)) != 0)
			p += k;
		else
			return fail_with(cause, "'%.*s': unexpected '%.*s'",
			    q->len, q->s, (int)(end - p), p);
	}
}

static int
unit_is(const struct unit *u, enum unit_dim dim)
{
	int i;

	for (i = 0; i < B_COUNT; i++)
		if (u->e[i] != dims[dim].e[i])
			return 0;
	return 1;
}

static int
wrong_dim(const struct quote *q, const char *unit, const char *end,
    const struct unit *u, enum unit_dim dim, char **cause)
{
	const char *want = dims[dim].name;
	int d;

	for (d = DIM_NONE + 1; d < DIM_COUNT; d++)
		if (unit_is(u, d))
			return fail_with(cause, "'%.*s' is %s %s, expected %s %s",
			    q->len, q->s, article(dims[d].name), dims[d].name,
			    article(want), want);
	if (dim == DIM_NONE)
		return fail_with(cause, "'%.*s': a number takes no unit",
		    q->len, q->s);
	return fail_with(cause, "'%.*s': '%.*s' is not %s %s", q->len, q->s,
	    (int)(end - unit), unit, article(want), want);
}

/* printf writes the locale's decimal point; our text always has '.'. */
static void
c_decimal_point(char *s)
{
	const char *dp = localeconv()->decimal_point;
	size_t n = strlen(dp);
	char *p;

	if (n == 0 || strcmp(dp, ".") == 0 || (p = strstr(s, dp)) == NULL)
		return;
	*p = '.';
	memmove(p + 1, p + n, strlen(p + n) + 1);
}

/* v (SI) in a unit that is 10^exp10 SI.  Scaling by an exact power of ten
 * (10^n, n <= 22) rounds once; multiplying by 1e-4, itself inexact, would
 * round twice. */
static double
si_to(double v, int exp10)
{
	double p = 1;
	int i;

	assert(exp10 >= -22 && exp10 <= 22);
	for (i = 0; i < abs(exp10); i++)
		p *= 10;
	return exp10 >= 0 ? v / p : v * p;
}

/* "'0.25': a length needs a unit, e.g. '250 mm'": the example reads the
 * bare number as SI, in the example unit when that reads plainly. */
static int
missing_unit(const struct quote *q, double v, enum unit_dim dim, char **cause)
{
	const struct dim_info *d = &dims[dim];
	double x = si_to(v, d->example_exp10);
	char num[40];

	snprintf(num, sizeof num, "%.12g", x);
	c_decimal_point(num);
	if (fabs(x) >= 1e-3 && fabs(x) < 1e5)
		return fail_with(cause, "'%.*s': %s %s needs a unit, e.g. '%s %s'",
		    q->len, q->s, article(d->name), d->name, num, d->example);
	return fail_with(cause, "'%.*s': %s %s needs a unit, e.g. '%.*s %s'",
	    q->len, q->s, article(d->name), d->name, q->len, q->s, d->si[1]);
}

int
units_parse(const char *text, enum unit_dim dim, double *out, char **cause)
{
	struct quote q;
	struct number num;
	struct unit u = { { 0 }, 0 };
	const char *s = text, *end, *p;
	double v;

	assert(text != NULL && dim >= 0 && dim < DIM_COUNT);
	while (is_space(*s))
		s++;
	end = s + strlen(s);
	while (end > s && is_space(end[-1]))
		end--;
	q.s = s;
	q.len = (int)(end - s);
	if (s == end)
		return fail_with(cause, "'%.*s': no value, expected %s %s",
		    q.len, q.s, article(dims[dim].name), dims[dim].name);

	if ((p = scan_number(s, end, &num)) == NULL)
		return fail_with(cause, "'%.*s': not a number", q.len, q.s);
	for (size_t k; (k = space_len(p, end)) != 0;)
		p += k;

	if (p == end) {
		v = number_value(&num, 0);
		if (dim != DIM_NONE && !num.zero && isfinite(v))
			return missing_unit(&q, v, dim, cause);
	} else {
		if (scan_unit(&q, p, end, &u, cause) != 0)
			return -1;
		if (dim == DIM_NONE || !unit_is(&u, dim))
			return wrong_dim(&q, p, end, &u, dim, cause);
		v = number_value(&num, u.exp10);
	}
	if (!isfinite(v))
		return fail_with(cause, "'%.*s': out of range", q.len, q.s);
	/* -0 is 0: one value, one text, one record. */
	*out = v == 0 ? 0.0 : v;
	return 0;
}

/* Cuts a UTF-8 sequence that snprintf truncation left half written. */
static int
utf8_trim(char *buf, size_t n, int want)
{
	size_t len, i, need;
	unsigned char c;

	if (want < 0 || n == 0 || (size_t)want < n)
		return want;
	len = n - 1;
	for (i = len; i > 0 && ((unsigned char)buf[i - 1] & 0xc0) == 0x80; i--)
		;
	if (i > 0) {
		c = (unsigned char)buf[i - 1];
		need = c >= 0xf0 ? 4 : c >= 0xe0 ? 3 : c >= 0xc0 ? 2 : 1;
		if (len - (i - 1) < need)
			buf[i - 1] = '\0';
	}
	return want;
}

int
units_format(char *buf, size_t n, double v, enum unit_dim dim, int sig,
    int ascii)
{
	const struct dim_info *d;
	const char *unit, *prefix = "", *p;
	char e[40], num[48];
	size_t i, len = 0;
	int x, eng, shift, nd;

	assert(dim >= 0 && dim < DIM_COUNT);
	d = &dims[dim];
	unit = d->show[ascii != 0];
	sig = sig < 1 ? 1 : sig > 17 ? 17 : sig;
	if (!isfinite(v) || v == 0) {
		snprintf(num, sizeof num, "%s", isnan(v) ? "-" : v == 0 ? "0" :
		    v < 0 ? "-inf" : "inf");
		unit = v == 0 ? unit : "";
		goto out;
	}

	/* %e does the rounding, carry included (999.96 -> 1.00e+03); the
	 * prefix is then chosen from the exponent it settled on. */
	v = si_to(v, d->show_exp10);
	if (!isfinite(v)) {
		/* finite in SI, beyond a double in the displayed unit */
		snprintf(num, sizeof num, "%s", v < 0 ? "-inf" : "inf");
		unit = "";
		goto out;
	}
	snprintf(e, sizeof e, "%.*e", sig - 1, v);
	c_decimal_point(e);
	if ((p = strchr(e, 'e')) == NULL) {
		memcpy(num, e, sizeof e);
		goto out;
	}
	x = atoi(p + 1);
	eng = x >= 0 ? x / 3 * 3 : -((-x + 2) / 3) * 3;
	if (dim == DIM_NONE && x >= -4 && x < sig) {
		/* Plain numbers read best without prefix or exponent. */
		snprintf(num, sizeof num, "%.*f", x < sig - 1 ? sig - 1 - x : 0,
		    v);
		c_decimal_point(num);
		goto out;
	}
	if (dim == DIM_NONE || d->scientific || eng < OUT_PREFIX_MIN ||
	    eng > OUT_PREFIX_MIN + 27) {
		memcpy(num, e, sizeof e);
		goto out;
	}

	/* Move the point right by x - eng places, padding when sig is short:
	 * "2.50e-04" becomes "250" and the prefix µ. */
	shift = x - eng;
	if (v < 0)
		num[len++] = '-';
	for (i = 0, nd = 0; e[i] != 'e'; i++) {
		if (!is_digit(e[i]))
			continue;
		if (nd++ == shift + 1)
			num[len++] = '.';
		num[len++] = e[i];
	}
	for (; nd <= shift; nd++)
		num[len++] = '0';
	num[len] = '\0';
	prefix = out_prefix[ascii != 0][(eng - OUT_PREFIX_MIN) / 3];
out:
	return utf8_trim(buf, n, snprintf(buf, n, "%s%s%s%s", num,
	    unit[0] != '\0' ? " " : "", prefix, unit));
}

int
units_format_exact(char *buf, size_t n, double v, enum unit_dim dim)
{
	const char *unit;
	char s[40];

	assert(dim >= 0 && dim < DIM_COUNT);
	unit = dims[dim].si[1];
	if (!isfinite(v))
		return units_format(buf, n, v, DIM_NONE, 1, 1);
	/* The shortest text strtod brings back to the same double (in the
	 * locale's notation; units_parse rounds as strtod). */
	fmt_exact(s, sizeof s, v);
	c_decimal_point(s);
	return snprintf(buf, n, "%s%s%s", s, unit[0] != '\0' ? " " : "", unit);
}

int
units_format_shortest(char *buf, size_t n, double v, enum unit_dim dim,
    int ascii)
{
	char tmp[64];

	assert(dim >= 0 && dim < DIM_COUNT);
	if (!isfinite(v))
		return units_format(buf, n, v, dim, 1, ascii);
	if (dim == DIM_NONE) {
		fmt_exact(tmp, sizeof tmp, v == 0 ? 0.0 : v);
		c_decimal_point(tmp);
		return utf8_trim(buf, n, snprintf(buf, n, "%s", tmp));
	}
	/* The display form with the fewest digits that reads back: what was
	 * typed ("1.1 mm") comes back as typed. */
	for (int sig = 1; sig <= 17; sig++) {
		double back;

		units_format(tmp, sizeof tmp, v, dim, sig, ascii);
		if (units_parse(tmp, dim, &back, NULL) == 0 && back == v)
			return utf8_trim(buf, n, snprintf(buf, n, "%s", tmp));
	}
	return units_format_exact(buf, n, v, dim);
}
