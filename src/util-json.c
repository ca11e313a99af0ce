/* util-json.c - JSON strings and numbers into a buffer.  See util-json.h. */
#include <config.h>

#include <math.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "util-json.h"

/* Bytes json_put_string copies one at a time into reserved room before it
 * takes the general way: ids, names and flags are shorter. */
#define STRING_FAST 62

/* The bytes a JSON string cannot hold as they are (RFC 8259 §7), NUL
 * among them: one test per byte where there were three. */
static const unsigned char json_escaped[256] = {
	[0] = 1, [1] = 1, [2] = 1, [3] = 1, [4] = 1, [5] = 1, [6] = 1, [7] = 1,
	[8] = 1, [9] = 1, [10] = 1, [11] = 1, [12] = 1, [13] = 1, [14] = 1, [15] = 1,
	[16] = 1, [17] = 1, [18] = 1, [19] = 1, [20] = 1, [21] = 1, [22] = 1, [23] = 1,
	[24] = 1, [25] = 1, [26] = 1, [27] = 1, [28] = 1, [29] = 1, [30] = 1, [31] = 1,
	['"'] = 1, ['\\'] = 1,
};

void
json_put_string(struct buf *b, const char *s)
{
	static const char hex[] = "0123456789abcdef";
	const unsigned char *p = (const unsigned char *)s;
	char *out;
	size_t k = 1;

	/* the quotes and a short plain string straight into the buffer */
	if (b->len + STRING_FAST + 3 > b->cap)
		buf_grow(b, STRING_FAST + 2);
	out = b->s + b->len;
	out[0] = '"';
	while (k <= STRING_FAST && !json_escaped[*p])
		out[k++] = (char)*p++;
	b->len += k;
	if (*p == '\0') {
		b->s[b->len++] = '"';
		b->s[b->len] = '\0';
		return;
	}
	b->s[b->len] = '\0';
	for (;;) {
		const unsigned char *run = p;

		/* the plain bytes in one piece: ids and names rarely need escapes */
		while (!json_escaped[*p])
			p++;
		if (p > run)
			buf_addn(b, (const char *)run, (size_t)(p - run));
		if (*p == '\0')
			break;
		switch (*p) {
		case '"':	buf_addn(b, "\\\"", 2); break;
		case '\\':	buf_addn(b, "\\\\", 2); break;
		case '\n':	buf_addn(b, "\\n", 2); break;
		case '\r':	buf_addn(b, "\\r", 2); break;
		case '\t':	buf_addn(b, "\\t", 2); break;
		default: {
			char esc[6] = { '\\', 'u', '0', '0', hex[*p >> 4], hex[*p & 15] };

			buf_addn(b, esc, sizeof esc);
		}
		}
		p++;
	}
	buf_addc(b, '"');
}

int
json_number_exact(const char *s, size_t len, double *out)
{
	static const double p10[] = { 1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8,
	    1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19,
	    1e20, 1e21, 1e22 };
	const char *p = s, *end = s + len;
	unsigned long long m = 0;
	int nd = 0, e = 0, neg = 0, eneg = 0, ex = 0;
	double v;

	if (p < end && *p == '-')
		neg = *p++ == '-';
	for (; p < end && *p >= '0' && *p <= '9'; p++) {
		nd += m != 0 || *p != '0';
		m = m * 10 + (unsigned)(*p - '0');
		if (nd > 19)
			return -1;
	}
	if (p < end && *p == '.')
		for (p++; p < end && *p >= '0' && *p <= '9'; p++, e--) {
			nd += m != 0 || *p != '0';
			m = m * 10 + (unsigned)(*p - '0');
			if (nd > 19)
				return -1;
		}
	if (p < end && (*p == 'e' || *p == 'E')) {
		if (++p < end && (*p == '+' || *p == '-'))
			eneg = *p++ == '-';
		for (; p < end && *p >= '0' && *p <= '9'; p++)
			if ((ex = ex * 10 + (*p - '0')) > 1000)
				return -1;
		e += eneg ? -ex : ex;
	}
	if (p != end || m >= (1ULL << 53) || e < -22 || e > 22)
		return -1;
	v = e >= 0 ? (double)m * p10[e] : (double)m / p10[-e];
	*out = neg ? -v : v;
	return 0;
}

void
fmt_exact(char *out, size_t n, double v)
{
	char tmp[40], best[40];
	int first = 0;

	if (!isfinite(v)) {
		snprintf(out, n, "%s", isnan(v) ? "nan" : v < 0 ? "-inf" : "inf");
		return;
	}
	if (v == 0) {
		/* -0 reads back as 0 anyway; write it so (a fixpoint) */
		snprintf(out, n, "0");
		return;
	}
	/* The first precision that reads back, or a few more digits when
	 * they are shorter to write ("10" rather than "1e+01"). */
	for (int prec = 1; prec <= 17; prec++) {
		snprintf(tmp, sizeof tmp, "%.*g", prec, v);
		if (strtod(tmp, NULL) != v)
			continue;
		if (first == 0 || strlen(tmp) < strlen(best)) {
			memcpy(best, tmp, sizeof best);
			if (first == 0)
				first = prec;
		}
		if (prec >= first + 5)
			break;
	}
	snprintf(out, n, "%s", best);
}

void
json_put_exact(struct buf *b, double v)
{
	char tmp[40];

	if (!isfinite(v)) {
		buf_add(b, "null");
		return;
	}
	fmt_exact(tmp, sizeof tmp, v);
	buf_add(b, tmp);
}

/* 10^k for 0 <= k <= 22 are exact doubles. */
static double
pow10_exact(int k)
{
	static const double p[] = { 1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8,
	    1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19,
	    1e20, 1e21, 1e22 };

	return p[k];
}

/* a·10^k for any k, in at most a few exact-power steps. */
static double
scale10(double a, int k)
{
	while (k > 22) {
		a *= 1e22;
		k -= 22;
	}
	while (k < -22) {
		a /= 1e22;
		k += 22;
	}
	return k >= 0 ? a * pow10_exact(k) : a / pow10_exact(-k);
}

/* p10[k + 31] is the double nearest 10^k (k = -31 ... 31). */
static const double p10[] = { 1e-31, 1e-30, 1e-29, 1e-28, 1e-27, 1e-26, 1e-25,
    1e-24, 1e-23, 1e-22, 1e-21, 1e-20, 1e-19, 1e-18, 1e-17, 1e-16, 1e-15, 1e-14,
    1e-13, 1e-12, 1e-11, 1e-10, 1e-9, 1e-8, 1e-7, 1e-6, 1e-5, 1e-4, 1e-3, 1e-2,
    1e-1, 1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12,
    1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22, 1e23, 1e24,
    1e25, 1e26, 1e27, 1e28, 1e29, 1e30, 1e31 };

/* floor(log10(v)) for v > 0.  Between 1e-30 and 1e30 by comparing with
 * powers of ten, which is exact but where v is the double nearest a power
 * of ten; there log10 may land either side too, and either exponent gives
 * the same ten digits (json_put_number's m is then 10^9 or 10^10 exactly),
 * so the text does not change (tests/check_units.c compares the two on
 * many values near powers of ten).  A log10 costs more than the rest of a
 * number. */
static int
decimal_exponent(double v)
{
	int e2, e;

	if (!(v >= 1e-30 && v < 1e30))
		return (int)floor(log10(v));
	{
		/* frexp's exponent, from the bits: v is a normal double here */
		uint64_t bits;

		memcpy(&bits, &v, sizeof bits);
		e2 = (int)((bits >> 52) & 0x7ff) - 1022;    /* 2^(e2-1) <= v < 2^e2 */
	}
	/* floor((e2 - 1) log10(2)) by a fixed-point multiplication (78913 /
	 * 2^18 is log10(2) to within 3e-7, exact over this range): e is
	 * floor(log10(v)) or one less */
	e = ((e2 - 1) * 78913) >> 18;
	if (e < -31)
		e = -31;
	while (e < 30 && v >= p10[e + 32])
		e++;
	while (e > -31 && v < p10[e + 31])
		e--;
	return e;
}

/* llround for x >= 0: below 2^52, x + 0.5 is exact, so truncating it
 * rounds half away from zero as llround does (m is near 10^9 here), without
 * a call into libm. */
static unsigned long long
round_pos(double x)
{
	if (x >= 1 && x < 4e15)
		return (unsigned long long)(long long)(x + 0.5);
	return (unsigned long long)llround(x);
}

/* x < 10^5 as five digits: x·⌈2^32/10^4⌉ holds the first digit above bit
 * 32 and the other four as a binary fraction, read two at a time by
 * multiplying by 100; the error, under x·0.071/2^32 < 2·10^-6 of one,
 * stays under one unit of the fourth digit (all 10^5 were compared with
 * "%05u" when this was written; tests/check_json.c compares the numbers
 * with the plain way). */
static void
five_digits(char *out, unsigned x)
{
	static const char pairs[] =
	    "00010203040506070809101112131415161718192021222324252627282930313233343536373839"
	    "40414243444546474849505152535455565758596061626364656667686970717273747576777879"
	    "8081828384858687888990919293949596979899";
	uint64_t y = (uint64_t)x * 429497;

	out[0] = (char)('0' + (y >> 32));
	y = (y & 0xffffffffu) * 100;
	memcpy(out + 1, pairs + 2 * (y >> 32), 2);
	y = (y & 0xffffffffu) * 100;
	memcpy(out + 3, pairs + 2 * (y >> 32), 2);
}

#define NUMBER_MAX 39         /* characters json_put_number may write */
#define DIGITS_COPY 16        /* bytes of digits it copies at a time */

/* json_put_number's extremes, by printf (out of line: the common numbers
 * keep their registers); the length written from out. */
static __attribute__((noinline)) size_t
number_printf(char *out, int pos, double v)
{
	snprintf(out + pos, NUMBER_MAX + 1 - (size_t)pos, "%.10g", v);
	return strlen(out);
}

/* Ten significant digits, formatted like "%.10g" (trailing zeros dropped,
 * exponent form below 1e-4 and from 1e10), without the cost of printf's
 * arbitrary-precision conversion.  The last digit can differ from printf's
 * by one in rare halfway cases; this is output for reading, not for
 * reading back (json_put_exact is).  Written into a local array and added
 * once: a 10^5-element trace writes three million of them. */
void
json_put_number(struct buf *b, double v)
{
	/* ten digits, then zeros that fixed-size copies may read */
	char *out, digits[10 + DIGITS_COPY] = { 0 };
	unsigned long long m;
	int e, nd, pos = 0;

	if (!isfinite(v)) {
		buf_addn(b, "null", 4);
		return;
	}
	if (v == 0) {
		buf_addc(b, '0');
		return;
	}
	/* written in place: room for the longest number, "-1.234567891e-300" */
	if (b->len + NUMBER_MAX + 1 > b->cap)
		buf_grow(b, NUMBER_MAX);
	out = b->s + b->len;
	if (v < 0) {
		out[pos++] = '-';
		v = -v;
	}
	if (v < 1e-300 || v > 1e300) {          /* leave the extremes to printf */
		b->len += number_printf(out, pos, v);
		return;
	}
	if (v < 1e10 && v >= 1 && v == (double)(long long)v) {
		/* a whole number of at most ten digits is its own ten digits
		 * (powers, counts and zeros are half of a trace's numbers):
		 * written without its leading zeros */
		unsigned w = (unsigned)((long long)v % 100000);
		int lead = 5;

		if (v >= 100000) {
			five_digits(digits, (unsigned)((long long)v / 100000));
			lead = 0;
		}
		five_digits(digits + 5, w);
		while (digits[lead] == '0')
			lead++;
		memcpy(out + pos, digits + lead, DIGITS_COPY);
		b->len += (size_t)(pos + 10 - lead);
		b->s[b->len] = '\0';
		return;
	}
	e = decimal_exponent(v);
	m = round_pos(scale10(v, 9 - e));
	if (m >= 10000000000ULL) {
		m = (m + 5) / 10;
		e++;
	} else if (m < 1000000000ULL) {
		e--;
		m = round_pos(scale10(v, 9 - e));
	}
	/* ten digits (m has ten; the low ten were always the ones written),
	 * as two halves of five; then the trailing zeros dropped */
	if (m >= 10000000000ULL)
		m %= 10000000000ULL;
	{
		unsigned hi = (unsigned)(m / 100000), lo = (unsigned)(m - hi * 100000ULL);

		five_digits(digits, hi);
		five_digits(digits + 5, lo);
		nd = lo != 0 ? 10 : 5;
	}
	while (nd > 1 && digits[nd - 1] == '0')
		nd--;
	/* The pieces are copied DIGITS_COPY bytes at a time, whatever their
	 * length: fixed-size copies cost a few moves where a variable one is
	 * a call.  What lies past the number is overwritten by the next
	 * append and is never part of the text (NUMBER_MAX + 1 bytes of room
	 * hold the longest copy, at most 28 bytes from the number's start). */
	if (e >= 0 && e < 10) {
		memcpy(out + pos, digits, DIGITS_COPY);
		if (nd > e + 1) {
			out[pos + e + 1] = '.';
			memcpy(out + pos + e + 2, digits + e + 1, DIGITS_COPY);
			pos += nd + 1;
		} else {
			/* whole: the digits past nd are the zeros up to the point */
			pos += e + 1;
		}
	} else if (e < 0 && e >= -4) {
		memcpy(out + pos, "0.0000", 6);
		pos += 1 - e;
		memcpy(out + pos, digits, DIGITS_COPY);
		pos += nd;
	} else {
		int ae = e < 0 ? -e : e;

		out[pos] = digits[0];
		out[pos + 1] = '.';
		memcpy(out + pos + 2, digits + 1, DIGITS_COPY);
		pos += nd > 1 ? nd + 1 : 1;
		out[pos++] = 'e';
		out[pos++] = e < 0 ? '-' : '+';
		if (ae >= 100)
			out[pos++] = (char)('0' + ae / 100);
		out[pos++] = (char)('0' + ae / 10 % 10);
		out[pos++] = (char)('0' + ae % 10);
	}
	b->len += (size_t)pos;
	b->s[b->len] = '\0';
}
