/* check_json.c - the fast paths of issue #12 against what they replaced:
 * the ten-digit number writer and the string escaper (util-json.c), the
 * streamed JSON report (report-json.c) and the element-by-element bench
 * reader (bench-file-scan.c).  Each must give the same bytes, the same
 * bench or the same message as the plain way, which lives here as the
 * reference (derived in the test: the code as it was before). */
#include <config.h>

#include <check.h>
#include <math.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "bench-demo.h"
#include "bench-file.h"
#include "check-util.h"
#include "core-trace.h"
#include "core-units.h"
#include "report.h"
#include "util-buf.h"
#include "util-err.h"
#include "util-json.h"

/* xorshift64*: reproducible values without the libc generator */
static uint64_t
rnd(uint64_t *s)
{
	*s ^= *s >> 12;
	*s ^= *s << 25;
	*s ^= *s >> 27;
	return *s * 2685821657736338717ULL;
}

/* ---- the reference writer: json_put_number before this change, which
 * took the exponent from floor(log10(v)) and formatted with snprintf ---- */
static double
ref_scale10(double a, int k)
{
	static const double p[] = { 1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8,
	    1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19,
	    1e20, 1e21, 1e22 };

	while (k > 22) {
		a *= 1e22;
		k -= 22;
	}
	while (k < -22) {
		a /= 1e22;
		k += 22;
	}
	return k >= 0 ? a * p[k] : a / p[-k];
}

static void
ref_number(char *out, size_t n, double v)
{
	char digits[16];
	unsigned long long m;
	int e, nd, pos = 0;

	if (!isfinite(v)) {
		snprintf(out, n, "null");
		return;
	}
	if (v == 0) {
		snprintf(out, n, "0");
		return;
	}
	if (v < 0) {
		out[pos++] = '-';
		v = -v;
	}
	if (v < 1e-300 || v > 1e300) {
		snprintf(out + pos, n - (size_t)pos, "%.10g", v);
		return;
	}
	e = (int)floor(log10(v));
	m = (unsigned long long)llround(ref_scale10(v, 9 - e));
	if (m >= 10000000000ULL) {
		m = (m + 5) / 10;
		e++;
	} else if (m < 1000000000ULL) {
		e--;
		m = (unsigned long long)llround(ref_scale10(v, 9 - e));
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
		snprintf(out + pos, n - (size_t)pos, "e%c%02d", e < 0 ? '-' : '+',
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
}

static void
check_number(struct buf *b, double v)
{
	char want[64];

	buf_reset(b);
	json_put_number(b, v);
	ref_number(want, sizeof want, v);
	ck_assert_msg(strcmp(b->s, want) == 0, "%.17g: wrote %s, the reference %s",
	    v, b->s, want);
}

/* Any double (random bits), and random magnitudes over the usual range. */
START_TEST(test_number_random)
{
	uint64_t s = 0x9e3779b97f4a7c15ULL + (uint64_t)_i;
	struct buf b;

	buf_init(&b);
	for (int i = 0; i < 200000; i++) {
		uint64_t bits = rnd(&s);
		double v;

		memcpy(&v, &bits, sizeof v);
		check_number(&b, v);
		/* log-uniform over 1e-35 .. 1e35, either sign */
		v = pow(10, (double)(rnd(&s) % 70000000) / 1e6 - 35);
		check_number(&b, rnd(&s) & 1 ? -v : v);
		/* short decimals, as typed: 1.25e-3 */
		v = (double)(rnd(&s) % 100000) * pow(10, (int)(rnd(&s) % 40) - 20);
		check_number(&b, v);
	}
	buf_release(&b);
}
END_TEST

/* One number after another in one buffer, as a report writes them: the
 * bytes the writer copies past a number's end must never show (nor its
 * length be off), the buffer growing as it goes. */
START_TEST(test_number_appended)
{
	uint64_t s = 4242;
	struct buf got, want;
	char one[64];

	buf_init(&got);
	buf_init(&want);
	for (int i = 0; i < 100000; i++) {
		double v = (double)(rnd(&s) % 100000) * pow(10, (int)(rnd(&s) % 44) - 22);

		if (i % 7 == 0)
			v = (double)(rnd(&s) % 1000);
		json_put_number(&got, v);
		ref_number(one, sizeof one, v);
		buf_add(&want, one);
		if (i % 3 == 0) {
			buf_addc(&got, ',');
			buf_addc(&want, ',');
		}
	}
	ck_assert_uint_eq(got.len, strlen(got.s));
	ck_assert_uint_eq(got.len, want.len);
	ck_assert(strcmp(got.s, want.s) == 0);
	buf_release(&got);
	buf_release(&want);
}
END_TEST

/* Next to every power of ten, where the exponent by table and by log10
 * may differ: up to 64 doubles either side, and the halves 5·10^k; whole
 * numbers. */
START_TEST(test_number_near_powers)
{
	struct buf b;

	buf_init(&b);
	for (int k = -320; k <= 320; k++) {
		double p;
		char lit[16];

		snprintf(lit, sizeof lit, "1e%d", k);
		p = strtod(lit, NULL);
		for (int side = 0; side < 2; side++) {
			double v = p;

			for (int j = 0; j < 64; j++) {
				check_number(&b, v);
				check_number(&b, -v);
				check_number(&b, 5 * v);
				check_number(&b, 9.9999999995 * v);
				v = nextafter(v, side ? INFINITY : 0);
			}
		}
	}
	/* whole numbers, which take a shorter way */
	for (int i = -100000; i <= 100000; i++)
		check_number(&b, i);
	for (double v = 1; v < 1e13; v = v * 3 + 1) {
		check_number(&b, v);
		check_number(&b, v - 1);
		check_number(&b, nextafter(v, 0));
		check_number(&b, nextafter(v, INFINITY));
	}
	check_number(&b, 9999999999.0);
	check_number(&b, 9999999999.5);
	check_number(&b, 10000000000.0);
	check_number(&b, NAN);
	check_number(&b, INFINITY);
	check_number(&b, -0.0);
	check_number(&b, 4.9406564584124654e-324);
	check_number(&b, 1.7976931348623157e308);
	buf_release(&b);
}
END_TEST

/* Exact halves at the tenth digit, where the rounding of the scaled value
 * decides the last digit (round half away from zero, as llround): whole
 * ten-digit m plus one half, and the same scaled by powers of two, which
 * keeps the half exact in binary. */
START_TEST(test_number_halves)
{
	uint64_t s = 777;
	struct buf b;

	buf_init(&b);
	for (int i = 0; i < 100000; i++) {
		double m = (double)(1000000000ULL + rnd(&s) % 9000000000ULL) + 0.5;

		check_number(&b, m);
		check_number(&b, m / 1024);
		check_number(&b, m * 1024);
		check_number(&b, nextafter(m, 0));
		check_number(&b, nextafter(m, INFINITY));
	}
	buf_release(&b);
}
END_TEST

/* Ten significant digits, read back within half a unit of the tenth
 * digit of the value written (what "%.10g" promises, derived in the test). */
START_TEST(test_number_ten_digits)
{
	uint64_t s = 12345;
	struct buf b;

	buf_init(&b);
	for (int i = 0; i < 200000; i++) {
		double v = pow(10, (double)(rnd(&s) % 60000000) / 1e6 - 30), back, ulp10;
		int sig = 0;

		buf_reset(&b);
		json_put_number(&b, v);
		back = strtod(b.s, NULL);
		ulp10 = pow(10, floor(log10(back)) - 9);
		ck_assert_msg(fabs(back - v) <= 0.5 * ulp10 * (1 + 1e-9), "%.17g wrote %s", v, b.s);
		for (const char *p = b.s; *p != '\0' && *p != 'e'; p++)
			sig += *p >= '0' && *p <= '9';
		ck_assert_msg(sig <= 10 + 9, "%s", b.s);   /* leading zeros of 0.000x */
	}
	buf_release(&b);
}
END_TEST

/* ---- quantities: units_parse rounded every number through strtod of
 * its digits and exponent as text; now the integer-and-exact-power way
 * where it is exact.  The reference is the text way, here. ---- */
static double
ref_quantity(const char *digits, long long exp10)
{
	char text[160];

	snprintf(text, sizeof text, "%se%lld", digits, exp10);
	return strtod(text, NULL);
}

START_TEST(test_quantity_random)
{
	static const struct { const char *unit; enum unit_dim dim; int exp10; } units[] = {
		{ "", DIM_NONE, 0 }, { " m", DIM_LENGTH, 0 }, { " mm", DIM_LENGTH, -3 },
		{ "nm", DIM_LENGTH, -9 }, { " km", DIM_LENGTH, 3 },
		{ " kW/cm^2", DIM_IRRADIANCE, 7 }, { " J/cm2", DIM_FLUENCE, 4 },
		{ " fs", DIM_TIME, -15 }, { " GW", DIM_POWER, 9 }, { " cm^2/W", DIM_N2, -4 },
	};
	uint64_t s = 0x5eed;

	for (int i = 0; i < 300000; i++) {
		char text[200], digits[64];
		size_t nd = 0, len = 0;
		int nint = (int)(rnd(&s) % 21), nfrac = (int)(rnd(&s) % 21), frac = 0;
		long long e = 0;
		int ui = (int)(rnd(&s) % (sizeof units / sizeof *units));
		double got = -42, want;
		char *cause = NULL;

		if (nint + nfrac == 0)
			nint = 1;
		if (rnd(&s) % 4 == 0)
			digits[nd++] = text[len++] = rnd(&s) % 2 ? '-' : '+';
		for (int k = 0; k < nint + nfrac; k++) {
			/* runs of zeros: leading, trailing and inside */
			char c = (char)(rnd(&s) % 3 == 0 ? '0' : '0' + rnd(&s) % 10);

			if (k == nint)
				text[len++] = '.';
			text[len++] = digits[nd++] = c;
			frac += k >= nint;
		}
		digits[nd] = '\0';
		if (rnd(&s) % 2) {
			e = (long long)(rnd(&s) % 81) - 40;
			len += (size_t)snprintf(text + len, sizeof text - len, "e%lld", e);
		}
		snprintf(text + len, sizeof text - len, "%s", units[ui].unit);
		want = ref_quantity(digits, e - frac + units[ui].exp10);
		if (want == 0)
			want = 0;               /* -0 reads as 0 */
		if (units[ui].dim != DIM_NONE && want != 0 && units[ui].unit[0] == '\0')
			continue;
		ck_assert_msg(units_parse(text, units[ui].dim, &got, &cause) == 0,
		    "'%s': %s", text, cause);
		ck_assert_msg(memcmp(&got, &want, sizeof got) == 0,
		    "'%s' read as %a, the text way %a", text, got, want);
	}
}
END_TEST

/* The scanner's JSON numbers: json_number_exact, where it answers, is
 * strtod bit for bit; and it answers for the short decimals files hold. */
START_TEST(test_json_number_exact)
{
	uint64_t s = 0xdec;
	int answered = 0;

	for (int i = 0; i < 300000; i++) {
		char text[80];
		int len = 0, nint = 1 + (int)(rnd(&s) % 18), nfrac = (int)(rnd(&s) % 18);
		double got, want;

		if (rnd(&s) % 3 == 0)
			text[len++] = '-';
		for (int k = 0; k < nint; k++)      /* JSON: no leading zero but "0" */
			text[len++] = (char)(k == 0 && nint > 1 ? '1' + rnd(&s) % 9 :
			    rnd(&s) % 3 == 0 ? '0' : '0' + rnd(&s) % 10);
		if (nfrac > 0) {
			text[len++] = '.';
			for (int k = 0; k < nfrac; k++)
				text[len++] = (char)(rnd(&s) % 3 == 0 ? '0' : '0' + rnd(&s) % 10);
		}
		if (rnd(&s) % 2)
			len += snprintf(text + len, sizeof text - (size_t)len, "%s%d",
			    rnd(&s) % 2 ? "e" : "E-", (int)(rnd(&s) % 40));
		text[len] = '\0';
		if (json_number_exact(text, (size_t)len, &got) != 0)
			continue;
		answered++;
		want = strtod(text, NULL);
		ck_assert_msg(memcmp(&got, &want, sizeof got) == 0, "'%s' read as %a, strtod %a",
		    text, got, want);
	}
	ck_assert_int_gt(answered, 50000);
	ck_assert_int_eq(json_number_exact("0.99999", 7, &(double){ 0 }), 0);
	ck_assert_int_eq(json_number_exact("1e23", 4, &(double){ 0 }), -1);
	ck_assert_int_eq(json_number_exact("9007199254740993", 16, &(double){ 0 }), -1);
}
END_TEST

/* ---- strings: the escaper before this change ---- */
static void
ref_string(struct buf *b, const char *s)
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

START_TEST(test_string_random)
{
	uint64_t s = 777;
	struct buf got, want;
	char str[160];        /* past json_put_string's short way (62) */

	buf_init(&got);
	buf_init(&want);
	for (int i = 0; i < 100000; i++) {
		size_t n = rnd(&s) % (sizeof str - 1);

		for (size_t j = 0; j < n; j++) {
			/* mostly plain, sometimes a byte that needs escaping */
			uint64_t r = rnd(&s);

			str[j] = (char)(r % 4 ? 'a' + r % 26 : 1 + (r >> 8) % 255);
		}
		str[n] = '\0';
		buf_reset(&got);
		buf_reset(&want);
		json_put_string(&got, str);
		ref_string(&want, str);
		ck_assert_str_eq(got.s, want.s);
	}
	buf_release(&got);
	buf_release(&want);
}
END_TEST

/* ---- the bench reader: fast against the whole tree ---- */

/* Invented benches in the shapes files take: the demo, a side branch and
 * a rejected port, a pulsed source, tolerances (non-ASCII: jansson reads
 * those elements), escapes, labels. */
static const char branches_text[] =
    "{\"format\": \"beamledger-bench-1\", \"name\": \"seed pulsed\", \"safety_factor\": 3,"
    " \"air_breakdown\": \"1e10 W/cm^2\", \"source\": {\"wavelength\": \"1064 nm\","
    " \"pulsed\": {\"rep_rate\": \"10 Hz\", \"pulse_width\": \"8 ns\", \"shape\": \"sech2\","
    " \"pulse_energy\": \"200 mJ\"}, \"waist\": [\"2 mm\", 0.0015], \"waist_position\":"
    " \"-100 mm\", \"m2\": [1.2, 1.4], \"polarization\": 30}, \"path\": [{\"id\": \"HWP\","
    " \"type\": \"waveplate\", \"retardance\": 0.5, \"angle\": 22.5}, {\"id\": \"PBS\","
    " \"type\": \"splitter\", \"polarizing\": true, \"tp\": 0.97, \"rs\": 0.99, \"reflected\":"
    " [{\"id\": \"S3\", \"type\": \"space\", \"length\": 0.2}, {\"id\": \"D1\", \"type\":"
    " \"detector\", \"max_power\": \"10 mW\"}]}, {\"id\": \"F1\", \"type\": \"filter\","
    " \"od\": 2, \"max_absorbed\": \"1 W\"}, {\"id\": \"POL\", \"type\": \"polarizer\","
    " \"angle\": 90, \"extinction\": 1e4, \"rejected\": [{\"id\": \"BD2\", \"type\": \"dump\"}]},"
    " {\"id\": \"IR\", \"type\": \"iris\", \"diameter\": \"3 mm\", \"aperture\": \"25 mm\"},"
    " {\"id\": \"W1\", \"type\": \"window\", \"thickness\": \"5 mm\", \"damage\": {\"fluence\":"
    " \"10 J/cm^2\", \"pulse_width\": \"10 ns\", \"wavelength\": \"1064 nm\"}},"
    " {\"id\": \"T\", \"type\": \"target\", \"label\": \"sample \\u00b5\"}]}";

static const char tol_text[] =
    "\xef\xbb\xbf{ \"format\": \"beamledger-bench-1\", \"name\": \"tol \\\"q\\\"\",\n"
    "  \"source\": { \"wavelength\": \"1064 nm\", \"power\": \"2 W \xc2\xb1 5 %\", \"waist\": \"1 mm\" },\n"
    "  \"path\": [\r\n"
    "\t{ \"id\": \"L1\", \"type\": \"lens\", \"focal\": \"200 mm \xc2\xb1 2 mm\" },\n"
    "    { \"id\": \"G1\", \"type\": \"space\", \"length\": \"250 mm +- 1 mm uniform\" },\n"
    "    { \"id\": \"M1\", \"type\": \"mirror\", \"reflectance\": 0.995, \"aoi\": -0,"
    " \"label\": \"fold\\tone\", \"damage\": { \"cw_irradiance\": 1.5e9 } },\n"
    "    { \"id\": \"D\", \"type\": \"dump\", \"max_power\": 10 }\n  ] }\n";

/* Elements the fast reader sets straight into the model (id, type, plain
 * numbers, integers, quantities, a damage object, one empty) beside ones it
 * leaves to jansson (a tolerance, a label, a surface pair, a boolean, a
 * choice, a key of another type), in one path. */
static const char plain_text[] =
    "{\"format\": \"beamledger-bench-1\", \"name\": \"plain\",\n"
    " \"source\": {\"wavelength\": \"1064 nm\", \"power\": \"5 W\", \"waist\": \"1 mm\"},\n"
    " \"path\": [\n"
    "  {\"id\": \"S0\", \"type\": \"space\", \"length\": \"100 mm\"},\n"
    "  {\"type\": \"mirror\", \"id\": \"M1\", \"reflectance\": 0.99, \"aoi\": 45,"
    " \"roc\": -0.5, \"damage\": {\"cw_linear\": \"10 kW/cm\", \"cw_irradiance\": 1e9}},\n"
    "  {\"id\": \"S1\", \"type\": \"space\", \"length\": 2},\n"
    "  {\"id\": \"L1\", \"type\": \"lens\", \"focal\": \"100 mm\", \"damage\": {}},\n"
    "  {\"id\": \"W1\", \"type\": \"window\", \"thickness\": \"5 mm\","
    " \"n2\": \"3e-16 cm^2/W\", \"index\": 1.45, \"surface_reflectance\": [0.01, 0.02]},\n"
    "  {\"id\": \"P1\", \"type\": \"polarizer\", \"angle\": 10, \"extinction\": 1000},\n"
    "  {\"id\": \"F1\", \"type\": \"filter\", \"od\": 1, \"aperture\": \"10 mm\","
    " \"damage\": {\"cw_irradiance\": \"1 kW/cm^2\"}},\n"
    "  {\"id\": \"S2\", \"type\": \"space\", \"length\": \"1 m \\u00b1 1 mm\"},\n"
    "  {\"id\": \"S3\", \"type\": \"space\", \"length\": \"1 m +- 1 mm\"},\n"
    "  {\"id\": \"I1\", \"type\": \"iris\", \"diameter\": \"2 mm\", \"label\": \"pinhole\"},\n"
    "  {\"id\": \"D1\", \"type\": \"dump\", \"max_power\": \"10 W\"}\n"
    " ]}\n";

static char *
dump_or_cause(struct bench *b, char *cause)
{
	char *s = b != NULL ? bench_file_dump(b) : xasprintf("error: %s", cause);

	model_bench_free(b);
	free(cause);
	return s;
}

/* The fast reader accepts only what the tree reader accepts, giving the
 * same bench; bench_file_parse gives the tree reader's bench or message. */
static int
compare_readers(const char *text, size_t len)
{
	char *c_tree = NULL, *c_all = NULL;
	size_t skip = len >= 3 && memcmp(text, "\xef\xbb\xbf", 3) == 0 ? 3 : 0;
	struct bench *fast = bench_file_parse_fast(text + skip, len - skip);
	struct bench *bt = bench_file_parse_tree(text, len, "t.json", &c_tree);
	struct bench *ba = bench_file_parse(text, len, "t.json", &c_all);
	char *tree, *all;
	int fast_ok = fast != NULL;

	ck_assert_msg(bt != NULL || c_tree != NULL, "no bench and no message");
	tree = dump_or_cause(bt, c_tree);
	all = dump_or_cause(ba, c_all);

	if (fast != NULL) {
		char *f = dump_or_cause(fast, NULL);

		ck_assert_msg(strcmp(f, tree) == 0, "fast reader: %s\ntree reader: %s\ninput: %.*s",
		    f, tree, (int)len, text);
		free(f);
	}
	ck_assert_msg(strcmp(all, tree) == 0, "bench_file_parse: %s\ntree reader: %s\ninput: %.*s",
	    all, tree, (int)len, text);
	free(tree);
	free(all);
	return fast_ok;
}

static const char *const reader_texts[] = { NULL /* the demo */, branches_text, tol_text,
	plain_text };

START_TEST(test_reader_valid)
{
	const char *text = reader_texts[_i] != NULL ? reader_texts[_i] : bench_demo_text;
	struct bench *b = bench_file_parse_tree(text, strlen(text), "t", NULL);
	char *dumped = bench_file_dump(b);

	/* the fast way must be taken on valid files, else nothing is gained */
	ck_assert_msg(compare_readers(text, strlen(text)), "fast reader refused text %d", _i);
	ck_assert_msg(compare_readers(dumped, strlen(dumped)), "fast reader refused dump %d", _i);
	free(dumped);
	model_bench_free(b);
}
END_TEST

/* Long paths, whose array the reader sizes from its first 64 elements
 * (2 MB pages from about 5,600, at least 32 MiB of address space): a
 * steady chain; one whose first elements are padded so that the guess
 * falls short of the 32 MiB and the array grows past it (read the fast
 * way only: the tree reader's 10^5-element tree is 100 MB); every 97th
 * element has a label, which the jansson way reads. */
START_TEST(test_reader_long)
{
	const int n = _i == 0 ? 30000 : 100000, pad = _i == 0 ? 0 : 400;
	struct buf text;
	struct bench *b;

	buf_init(&text);
	buf_add(&text, "{\"format\": \"beamledger-bench-1\", \"name\": \"long\", \"source\": "
	    "{\"wavelength\": \"1064 nm\", \"power\": \"5 W\", \"waist\": \"1 mm\"}, \"path\": [");
	for (int i = 0; i < n; i++)
		buf_printf(&text, "%s{\"id\": \"E%d\",%*s \"type\": \"space\", \"length\": "
		    "\"%d mm\"%s}", i ? ", " : "", i, i < 1024 ? pad : 0, "",
		    1 + i % 50, i % 97 == 0 ? ", \"label\": \"x\"" : "");
	buf_add(&text, ", {\"id\": \"END\", \"type\": \"dump\"}]}");
	if (_i == 0)
		ck_assert_msg(compare_readers(text.s, text.len), "fast reader refused the long path");
	b = bench_file_parse_fast(text.s, text.len);
	ck_assert(b != NULL);
	ck_assert_uint_eq(b->path.n, (size_t)n + 1);
	ck_assert_uint_ge(b->path.cap, b->path.n);
	if (_i == 1)            /* the case is what it says: past 32 MiB */
		ck_assert_uint_gt(b->path.n * sizeof *b->path.el, (size_t)32 << 20);
	for (int i = 0; i < n; i++) {
		char id[16];
		double mm = 1 + i % 50;

		snprintf(id, sizeof id, "E%d", i);
		ck_assert_str_eq(b->path.el[i].id, id);
		/* "N mm" is N / 10^3 rounded once (core-units.c) */
		ck_assert(b->path.el[i].val[K_LENGTH] == mm / 1e3);
		ck_assert(i % 97 == 0 ? b->path.el[i].label != NULL &&
		    strcmp(b->path.el[i].label, "x") == 0 : b->path.el[i].label == NULL);
	}
	ck_assert_str_eq(b->path.el[n].id, "END");
	model_bench_free(b);
	buf_release(&text);
}
END_TEST

/* Damaged copies: bytes deleted, replaced by JSON's own punctuation or
 * any byte, duplicated keys, truncation. */
START_TEST(test_reader_damaged)
{
	const char *text = reader_texts[_i] != NULL ? reader_texts[_i] : bench_demo_text;
	static const char punct[] = "{}[],:\"\\ 0-.eE+tfn\x01\x80\xc2";
	size_t len = strlen(text);
	char *copy = xmalloc(len + 64);
	uint64_t s = 4242 + (uint64_t)_i;

	for (int round = 0; round < 3000; round++) {
		size_t n = len, at;
		int edits = 1 + (int)(rnd(&s) % 3);

		memcpy(copy, text, len);
		for (int e = 0; e < edits && n > 1; e++) {
			uint64_t r = rnd(&s);

			at = (size_t)(r >> 8) % n;
			switch (r % 5) {
			case 0:         /* delete */
				memmove(copy + at, copy + at + 1, n - at - 1);
				n--;
				break;
			case 1:         /* punctuation */
				copy[at] = punct[(r >> 40) % (sizeof punct - 1)];
				break;
			case 2:         /* any byte */
				copy[at] = (char)(r >> 40);
				break;
			case 3:         /* insert punctuation */
				memmove(copy + at + 1, copy + at, n - at);
				copy[at] = punct[(r >> 40) % (sizeof punct - 1)];
				n++;
				break;
			default:        /* truncate */
				n = at + 1;
				break;
			}
		}
		compare_readers(copy, n);
	}
	free(copy);
}
END_TEST

START_TEST(test_reader_duplicates)
{
	static const char *const texts[] = {
		"{'format':'beamledger-bench-1','name':'d','source':{'wavelength':'1064 nm',"
		    "'power':'1 W','waist':'1 mm'},'path':[{'id':'A','type':'space','length':1,"
		    "'length':2}]}",
		"{'format':'beamledger-bench-1','name':'d','source':{'wavelength':'1064 nm',"
		    "'power':'1 W','waist':'1 mm'},'path':[],'path':[{'id':'A','type':'dump'}]}",
		"{'format':'beamledger-bench-1','name':'d','name':'e','source':{'wavelength':"
		    "'1064 nm','power':'1 W','waist':'1 mm'},'path':[{'id':'A','type':'dump'}]}",
		"{'format':'beamledger-bench-1','name':'d','source':{'wavelength':'1064 nm',"
		    "'power':'1 W','waist':'1 mm'},'path':[{'id':'A','type':'space','length':"
		    "123456789012345678901234567890},{'id':'B','type':'dump'}]}",
		"{'format':'beamledger-bench-1','name':'d','source':{'wavelength':'1064 nm',"
		    "'power':'1 W','waist':'1 mm'},'path':[{'id':'A','type':'space','length':1e999}]}",
		"{'format':'beamledger-bench-1','name':'d','source':{'wavelength':'1064 nm',"
		    "'power':'1 W','waist':'1 mm'},'p\\u0061th':[{'id':'A','type':'dump'}],'path':[]}",
	};
	char *t = xstrdup(texts[_i]);

	for (char *p = t; *p != '\0'; p++)
		if (*p == '\'')
			*p = '"';
	compare_readers(t, strlen(t));
	free(t);
}
END_TEST

/* ---- the report: streamed in pieces, the same text as in one string ---- */
static void
check_streamed(const struct bench *b, unsigned opts)
{
	struct trace *t = trace_rerun_opts(NULL, b, opts);
	char *whole = report_json(t), *got = NULL;
	size_t len = 0;
	FILE *f = open_memstream(&got, &len);

	ck_assert_ptr_nonnull(f);
	ck_assert_int_eq(report_json_write(t, f), 0);
	ck_assert_int_eq(fclose(f), 0);
	ck_assert_uint_eq(len, strlen(whole));
	ck_assert_msg(memcmp(got, whole, len) == 0, "streamed text differs");
	free(got);
	if (opts & TRACE_NO_GHOSTS) {
		/* and row by row as trace_stream makes them, no rows held: the
		 * same text, the same summary (trace --no-ghosts --format json) */
		struct report_json_stream *s;
		struct trace *st;

		got = NULL;
		len = 0;
		f = open_memstream(&got, &len);
		ck_assert_ptr_nonnull(f);
		s = report_json_stream_begin(b, f);
		st = trace_stream(NULL, b, report_json_stream_row, s);
		ck_assert_int_eq(report_json_stream_end(s, st), 0);
		ck_assert_int_eq(fclose(f), 0);
		ck_assert_uint_eq(len, strlen(whole));
		ck_assert_msg(memcmp(got, whole, len) == 0, "text written row by row differs");
		ck_assert(st->worst_el == (t->worst >= 0 ? t->rows[t->worst].el : NULL));
		ck_assert(st->nwarn == t->nwarn && st->nonfinite == t->nonfinite);
		ck_assert(st->safe_source_power == t->safe_source_power ||
		    (isnan(st->safe_source_power) && isnan(t->safe_source_power)));
		free(got);
		trace_free(st);
	}
	free(whole);
	trace_free(t);
}

START_TEST(test_report_streamed)
{
	char *cause = NULL;
	struct bench *b = bench_file_parse(bench_demo_text, strlen(bench_demo_text), "demo",
	    &cause);
	struct buf chain;

	ck_assert_msg(b != NULL, "%s", cause);
	check_streamed(b, TRACE_GHOST_ROWS);
	check_streamed(b, TRACE_NO_GHOSTS);
	model_bench_free(b);
	/* long enough that the buffer is emptied many times (about 1.5 MB) */
	buf_init(&chain);
	buf_add(&chain, "{\"format\": \"beamledger-bench-1\", \"name\": \"long\", \"source\": "
	    "{\"wavelength\": \"1064 nm\", \"power\": \"5 W\", \"waist\": \"1 mm\"}, \"path\": [");
	for (int i = 0; i < 2000; i++)
		buf_printf(&chain, "%s{\"id\": \"G%d\", \"type\": \"space\", \"length\": \"100 mm\"}, "
		    "{\"id\": \"L%d\", \"type\": \"lens\", \"focal\": \"100 mm\", \"damage\": "
		    "{\"cw_irradiance\": \"100 kW/cm^2\"}}", i ? ", " : "", i, i);
	buf_add(&chain, ", {\"id\": \"END\", \"type\": \"dump\"}]}");
	b = bench_file_parse(chain.s, chain.len, "long", &cause);
	ck_assert_msg(b != NULL, "%s", cause);
	check_streamed(b, TRACE_NO_GHOSTS);
	model_bench_free(b);
	buf_release(&chain);
}
END_TEST

int
main(void)
{
	Suite *s = suite_create("json");
	TCase *tn = tcase_create("numbers");
	TCase *tr = tcase_create("reader");

	tcase_add_loop_test(tn, test_number_random, 0, 2);
	tcase_add_test(tn, test_number_appended);
	tcase_add_test(tn, test_number_near_powers);
	tcase_add_test(tn, test_number_halves);
	tcase_add_test(tn, test_number_ten_digits);
	tcase_add_test(tn, test_string_random);
	tcase_add_test(tn, test_quantity_random);
	tcase_add_test(tn, test_json_number_exact);
	tcase_add_test(tn, test_report_streamed);
	tcase_set_timeout(tn, 60);
	suite_add_tcase(s, tn);
	tcase_add_loop_test(tr, test_reader_valid, 0, sizeof reader_texts / sizeof *reader_texts);
	tcase_add_loop_test(tr, test_reader_damaged, 0, sizeof reader_texts / sizeof *reader_texts);
	tcase_add_loop_test(tr, test_reader_duplicates, 0, 6);
	tcase_add_loop_test(tr, test_reader_long, 0, 2);
	tcase_set_timeout(tr, 120);
	suite_add_tcase(s, tr);
	return run_suite(s);
}
