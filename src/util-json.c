/* util-json.c - JSON strings and numbers into a buffer.  See util-json.h. */
#include <config.h>

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "util-json.h"

void
json_put_string(struct buf *b, const char *s)
{
	static const char hex[] = "0123456789abcdef";

	buf_addc(b, '"');
	for (const unsigned char *p = (const unsigned char *)s; *p != '\0'; p++) {
		switch (*p) {
		case '"':	buf_add(b, "\\\""); break;
		case '\\':	buf_add(b, "\\\\"); break;
		case '\n':	buf_add(b, "\\n"); break;
		case '\r':	buf_add(b, "\\r"); break;
		case '\t':	buf_add(b, "\\t"); break;
		default:
			if (*p < 0x20) {
				char esc[7] = { '\\', 'u', '0', '0', hex[*p >> 4], hex[*p & 15], 0 };
				buf_add(b, esc);
			} else {
				buf_addc(b, (char)*p);
			}
		}
	}
	buf_addc(b, '"');
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

/* Ten significant digits, formatted like "%.10g" (trailing zeros dropped,
 * exponent form below 1e-4 and from 1e10), without the cost of printf's
 * arbitrary-precision conversion.  The last digit can differ from printf's
 * by one in rare halfway cases; this is output for reading, not for
 * reading back (json_put_exact is). */
void
json_put_number(struct buf *b, double v)
{
	char digits[16], out[40];
	unsigned long long m;
	int e, nd, pos = 0;

	if (!isfinite(v)) {
		buf_add(b, "null");
		return;
	}
	if (v == 0) {
		buf_addc(b, '0');
		return;
	}
	if (v < 0) {
		out[pos++] = '-';
		v = -v;
	}
	if (v < 1e-300 || v > 1e300) {          /* leave the extremes to printf */
		snprintf(out + pos, sizeof out - (size_t)pos, "%.10g", v);
		buf_add(b, out);
		return;
	}
	e = (int)floor(log10(v));
	m = (unsigned long long)llround(scale10(v, 9 - e));
	if (m >= 10000000000ULL) {
		m = (m + 5) / 10;
		e++;
	} else if (m < 1000000000ULL) {
		e--;
		m = (unsigned long long)llround(scale10(v, 9 - e));
	}
	nd = 10;
	while (nd > 1 && m % 10 == 0) {
		m /= 10;
		nd--;
	}
	for (int i = nd - 1; i >= 0; i--) {
		digits[i] = (char)('0' + m % 10);
		m /= 10;
	}
	if (e < -4 || e >= 10) {
		out[pos++] = digits[0];
		if (nd > 1) {
			out[pos++] = '.';
			for (int i = 1; i < nd; i++)
				out[pos++] = digits[i];
		}
		snprintf(out + pos, sizeof out - (size_t)pos, "e%c%02d", e < 0 ? '-' : '+',
		    e < 0 ? -e : e);
	} else if (e < 0) {
		out[pos++] = '0';
		out[pos++] = '.';
		for (int i = -1; i > e; i--)
			out[pos++] = '0';
		for (int i = 0; i < nd; i++)
			out[pos++] = digits[i];
		out[pos] = '\0';
	} else {
		for (int i = 0; i <= e || i < nd; i++) {
			if (i == e + 1)
				out[pos++] = '.';
			out[pos++] = i < nd ? digits[i] : '0';
		}
		out[pos] = '\0';
	}
	buf_add(b, out);
}
