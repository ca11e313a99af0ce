/* check_units.c - unit tests for core-units: parsing quantities into SI,
 * the messages for bad input, display formatting, and the exact form that
 * must read back to the identical double. */
#include <config.h>

#include <check.h>
#include <float.h>
#include <math.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "core-units.h"
#include "core-edit.h"
#include "core-model.h"
#include "util-err.h"

#include "check-util.h"

/* A value units_parse must not touch when it fails. */
#define UNTOUCHED	-42.0

/*
 * Parsing.  Expected values are written as decimal literals; the parser
 * folds the unit's power of ten into the decimal exponent and rounds once,
 * as the compiler does for the literal, so the two must be identical.
 */
struct parse_case {
	const char	*text;
	enum unit_dim	 dim;
	double		 si;
};

/* Prefix factors: BIPM SI Brochure, 9th ed. (2019), Table 7 (SI prefixes).
 * "u" and U+03BC are accepted spellings of the micro sign U+00B5; "T" is
 * accepted because units_format prints it. */
static const struct parse_case prefix_cases[] = {
	{ "1 fm", DIM_LENGTH, 1e-15 },		/* femto, SI Table 7 */
	{ "1 pm", DIM_LENGTH, 1e-12 },		/* pico, SI Table 7 */
	{ "1 nm", DIM_LENGTH, 1e-9 },		/* nano, SI Table 7 */
	{ "1 um", DIM_LENGTH, 1e-6 },		/* micro, SI Table 7 */
	{ "1 \u00b5m", DIM_LENGTH, 1e-6 },	/* micro, SI Table 7 */
	{ "1 \u03bcm", DIM_LENGTH, 1e-6 },	/* micro, SI Table 7 */
	{ "1 mm", DIM_LENGTH, 1e-3 },		/* milli, SI Table 7 */
	{ "1 cm", DIM_LENGTH, 1e-2 },		/* centi, SI Table 7 */
	{ "1 km", DIM_LENGTH, 1e3 },		/* kilo, SI Table 7 */
	{ "1 Mm", DIM_LENGTH, 1e6 },		/* mega, SI Table 7 */
	{ "1 Gm", DIM_LENGTH, 1e9 },		/* giga, SI Table 7 */
	{ "1 Tm", DIM_LENGTH, 1e12 },		/* tera, SI Table 7 */
	{ "1 fs", DIM_TIME, 1e-15 },		/* femto, SI Table 7 */
	{ "1 ps", DIM_TIME, 1e-12 },		/* pico, SI Table 7 */
	{ "1 ns", DIM_TIME, 1e-9 },		/* nano, SI Table 7 */
	{ "1 us", DIM_TIME, 1e-6 },		/* micro, SI Table 7 */
	{ "1 \u00b5s", DIM_TIME, 1e-6 },	/* micro, SI Table 7 */
	{ "1 ms", DIM_TIME, 1e-3 },		/* milli, SI Table 7 */
	{ "1 cs", DIM_TIME, 1e-2 },		/* centi, SI Table 7 */
	{ "1 ks", DIM_TIME, 1e3 },		/* kilo, SI Table 7 */
	{ "1 Ms", DIM_TIME, 1e6 },		/* mega, SI Table 7 */
	{ "1 Gs", DIM_TIME, 1e9 },		/* giga, SI Table 7 */
	{ "1 fW", DIM_POWER, 1e-15 },		/* femto, SI Table 7 */
	{ "1 pW", DIM_POWER, 1e-12 },		/* pico, SI Table 7 */
	{ "1 nW", DIM_POWER, 1e-9 },		/* nano, SI Table 7 */
	{ "1 uW", DIM_POWER, 1e-6 },		/* micro, SI Table 7 */
	{ "1 \u00b5W", DIM_POWER, 1e-6 },	/* micro, SI Table 7 */
	{ "1 mW", DIM_POWER, 1e-3 },		/* milli, SI Table 7 */
	{ "1 cW", DIM_POWER, 1e-2 },		/* centi, SI Table 7 */
	{ "1 kW", DIM_POWER, 1e3 },		/* kilo, SI Table 7 */
	{ "1 MW", DIM_POWER, 1e6 },		/* mega, SI Table 7 */
	{ "1 GW", DIM_POWER, 1e9 },		/* giga, SI Table 7 */
	{ "1 TW", DIM_POWER, 1e12 },		/* tera, SI Table 7 */
	{ "1 fJ", DIM_ENERGY, 1e-15 },		/* femto, SI Table 7 */
	{ "1 pJ", DIM_ENERGY, 1e-12 },		/* pico, SI Table 7 */
	{ "1 nJ", DIM_ENERGY, 1e-9 },		/* nano, SI Table 7 */
	{ "1 uJ", DIM_ENERGY, 1e-6 },		/* micro, SI Table 7 */
	{ "1 \u03bcJ", DIM_ENERGY, 1e-6 },	/* micro, SI Table 7 */
	{ "1 mJ", DIM_ENERGY, 1e-3 },		/* milli, SI Table 7 */
	{ "1 kJ", DIM_ENERGY, 1e3 },		/* kilo, SI Table 7 */
	{ "1 MJ", DIM_ENERGY, 1e6 },		/* mega, SI Table 7 */
	{ "1 mHz", DIM_FREQUENCY, 1e-3 },	/* milli, SI Table 7 */
	{ "1 kHz", DIM_FREQUENCY, 1e3 },	/* kilo, SI Table 7 */
	{ "1 MHz", DIM_FREQUENCY, 1e6 },	/* mega, SI Table 7 */
	{ "1 GHz", DIM_FREQUENCY, 1e9 },	/* giga, SI Table 7 */
	{ "1 THz", DIM_FREQUENCY, 1e12 },	/* tera, SI Table 7 */
	{ "1 kV/m", DIM_FIELD, 1e3 },		/* kilo, SI Table 7 */
	{ "1 MV/m", DIM_FIELD, 1e6 },		/* mega, SI Table 7 */
	{ "1 GV/m", DIM_FIELD, 1e9 },		/* giga, SI Table 7 */
	{ "1 mV/m", DIM_FIELD, 1e-3 },		/* milli, SI Table 7 */
	/* A prefixed symbol is raised to the power as a whole,
	 * (cm)^2 = 1e-4 m^2: SI Brochure, 9th ed., sec. 3. */
	{ "1 cm^2/W", DIM_N2, 1e-4 },
	{ "1 mm^3/mm^2", DIM_LENGTH, 1e-3 },
};

/* Unit definitions: BIPM SI Brochure, 9th ed. (2019), Table 4 (units with
 * special names: Hz = s^-1, J, W = J/s, V) and Table 6 (W/m^2, V/m); the
 * products and quotients W/m, J/m² and m²/W are coherent derived units by
 * the rule of sec. 2.3.4 (a coherent derived unit is a product of powers
 * of base units with factor one; from memory), listed in no table. */
static const struct parse_case unit_cases[] = {
	{ "1 m", DIM_LENGTH, 1 },		/* SI base unit */
	{ "1 s", DIM_TIME, 1 },			/* SI base unit */
	{ "1 J", DIM_ENERGY, 1 },		/* SI Table 4 */
	{ "1 W", DIM_POWER, 1 },		/* SI Table 4 */
	{ "1 J/s", DIM_POWER, 1 },		/* W = J/s, SI Table 4 */
	{ "1 Hz", DIM_FREQUENCY, 1 },		/* SI Table 4 */
	{ "1 s^-1", DIM_FREQUENCY, 1 },		/* Hz = s^-1, SI Table 4 */
	{ "1 ms^-1", DIM_FREQUENCY, 1e3 },	/* Hz = s^-1, SI Table 4 */
	{ "1 W*s", DIM_ENERGY, 1 },		/* J = W s, SI Table 4 */
	{ "1 W\u00b7s", DIM_ENERGY, 1 },	/* J = W s, SI Table 4 */
	{ "1 W/Hz", DIM_ENERGY, 1 },		/* J = W/Hz, SI Table 4 */
	{ "1 Hz*J", DIM_POWER, 1 },		/* W = J/s, SI Table 4 */
	{ "1 W/m", DIM_LINEAR, 1 },		/* coherent derived, SI sec. 2.3.4 */
	{ "1 J/m*s", DIM_LINEAR, 1 },		/* W = J/s; '/' takes all after */
	{ "1 W/m^2", DIM_IRRADIANCE, 1 },	/* SI Table 6 */
	{ "1 W/m\u00b2", DIM_IRRADIANCE, 1 },	/* SI Table 6 */
	{ "1 J/m2/s", DIM_IRRADIANCE, 1 },	/* W = J/s (SI Table 4) per m², Table 6 */
	{ "1 J/m^2", DIM_FLUENCE, 1 },		/* coherent derived, SI sec. 2.3.4 */
	{ "1 W*s/m2", DIM_FLUENCE, 1 },		/* J = W s, SI Table 4 */
	{ "1 m^2/W", DIM_N2, 1 },		/* coherent derived, SI sec. 2.3.4 */
	{ "1 m\u00b2/W", DIM_N2, 1 },		/* SI Table 4 */
	{ "1 m^2*s/J", DIM_N2, 1 },		/* W = J/s, SI Table 4 */
	{ "1 m^+2/W", DIM_N2, 1 },		/* SI Table 4 */
	{ "1 V/m", DIM_FIELD, 1 },		/* SI Table 6 */
	{ "1 m\u00b3/m^2", DIM_LENGTH, 1 },	/* SI base unit */
	{ "1 m^1", DIM_LENGTH, 1 },		/* SI base unit */
};

/* The bench units.  Lab conversions are derived from the prefixes above:
 * 1 W/cm = 1e2 W/m, 1 W/cm^2 = 1e4 W/m^2, 1 J/cm^2 = 1e4 J/m^2,
 * 1 cm^2/W = 1e-4 m^2/W. */
static const struct parse_case bench_cases[] = {
	{ "250 mm", DIM_LENGTH, 0.25 },			/* SI Table 7 */
	{ "1064 nm", DIM_LENGTH, 1064e-9 },		/* SI Table 7 */
	{ "2.5 W", DIM_POWER, 2.5 },			/* SI Table 4 */
	{ "500 mJ", DIM_ENERGY, 0.5 },			/* SI Table 7 */
	{ "8 ns", DIM_TIME, 8e-9 },			/* SI Table 7 */
	{ "10 Hz", DIM_FREQUENCY, 10 },			/* SI Table 4 */
	{ "5 kW/cm", DIM_LINEAR, 5e5 },			/* derived */
	{ "1 kW/cm^2", DIM_IRRADIANCE, 1e7 },		/* derived */
	{ "1 kW/cm2", DIM_IRRADIANCE, 1e7 },		/* derived */
	{ "1 kW/cm\u00b2", DIM_IRRADIANCE, 1e7 },	/* derived */
	{ "4 W/mm^2", DIM_IRRADIANCE, 4e6 },		/* derived */
	{ "10 J/cm^2", DIM_FLUENCE, 1e5 },		/* derived */
	{ "12 mJ/cm2", DIM_FLUENCE, 120 },		/* derived */
	{ "1 mJ/mm^2", DIM_FLUENCE, 1e3 },		/* derived */
	{ "2.7e-16 cm^2/W", DIM_N2, 2.7e-20 },		/* derived */
	{ "2.7e-16 cm\u00b2/W", DIM_N2, 2.7e-20 },	/* derived */
	{ "3 \u00b5m", DIM_LENGTH, 3e-6 },		/* SI Table 7 */
	{ "3 um", DIM_LENGTH, 3e-6 },			/* SI Table 7 */
	{ "1.5 MHz", DIM_FREQUENCY, 1.5e6 },		/* SI Table 7 */
	{ "100 fs", DIM_TIME, 100e-15 },		/* SI Table 7 */
	{ "3 MV/cm", DIM_FIELD, 3e8 },			/* derived */
	{ "1 J/cm2/ns", DIM_IRRADIANCE, 1e13 },		/* derived */
	{ "0", DIM_LENGTH, 0 },
};

/* Number syntax, white space, and zero without a unit. */
static const struct parse_case syntax_cases[] = {
	{ "+2.5 W", DIM_POWER, 2.5 },
	{ "-2.5 W", DIM_POWER, -2.5 },
	{ ".5 W", DIM_POWER, 0.5 },
	{ "5. W", DIM_POWER, 5 },
	{ "2.5e3 W", DIM_POWER, 2500 },
	{ "2.5E-3 W", DIM_POWER, 2.5e-3 },
	{ "25e-1W", DIM_POWER, 2.5 },
	{ "250mm", DIM_LENGTH, 0.25 },
	{ "  250 mm  ", DIM_LENGTH, 0.25 },
	{ "\t2.5\tW\n", DIM_POWER, 2.5 },
	{ "000250 mm", DIM_LENGTH, 0.25 },
	{ "0.000001064 mm", DIM_LENGTH, 1064e-12 },
	{ "1064e-3 nm", DIM_LENGTH, 1.064e-9 },
	{ "0.1 mm", DIM_LENGTH, 1e-4 },
	{ "0.3 kW", DIM_POWER, 300 },
	{ "1e-400 m", DIM_LENGTH, 0 },		/* underflow is not an error */
	{ "0 mm", DIM_LENGTH, 0 },
	{ "0.0", DIM_POWER, 0 },
	{ "-0", DIM_ENERGY, 0 },
	{ "0e10", DIM_TIME, 0 },
	{ " 0 ", DIM_FREQUENCY, 0 },
	{ "0", DIM_LINEAR, 0 },
	{ "0", DIM_IRRADIANCE, 0 },
	{ "0", DIM_FLUENCE, 0 },
	{ "0", DIM_N2, 0 },
	{ "0", DIM_FIELD, 0 },
	{ "0", DIM_NONE, 0 },
	{ "3.5", DIM_NONE, 3.5 },
	{ "-1e-3", DIM_NONE, -1e-3 },
	{ " 42 ", DIM_NONE, 42 },
};

static void
check_parse(const struct parse_case *c)
{
	char *cause = NULL;
	double v = UNTOUCHED;
	int rc;

	rc = units_parse(c->text, c->dim, &v, &cause);
	ck_assert_msg(rc == 0, "'%s' as %s: %s", c->text,
	    units_dim_name(c->dim), cause != NULL ? cause : "(no cause)");
	ck_assert_ptr_null(cause);
	ck_assert_msg(v == c->si, "'%s': got %.17g, want %.17g", c->text, v,
	    c->si);
	free(cause);
}

START_TEST(test_parse_prefix)
{
	check_parse(&prefix_cases[_i]);
}
END_TEST

START_TEST(test_parse_unit)
{
	check_parse(&unit_cases[_i]);
}
END_TEST

START_TEST(test_parse_bench)
{
	check_parse(&bench_cases[_i]);
}
END_TEST

START_TEST(test_parse_syntax)
{
	check_parse(&syntax_cases[_i]);
}
END_TEST

/* Every dimension: its SI symbol, both spellings, reads back as 1. */
START_TEST(test_parse_si_symbol)
{
	enum unit_dim dim = (enum unit_dim)_i;
	const char *name = units_dim_name(dim);
	char text[32], *cause = NULL;
	double v;
	int ascii;

	ck_assert_ptr_nonnull(name);
	ck_assert_int_gt(strlen(name), 0);
	ck_assert_msg(name[0] >= 'a' && name[0] <= 'z', "name '%s'", name);
	for (ascii = 0; ascii <= 1; ascii++) {
		const char *sym = units_si_symbol(dim, ascii);
		size_t i;

		ck_assert_ptr_nonnull(sym);
		if (dim == DIM_NONE) {
			ck_assert_str_eq(sym, "");
			continue;
		}
		for (i = 0; ascii && sym[i] != '\0'; i++)
			ck_assert_msg((unsigned char)sym[i] < 0x80,
			    "'%s' is not ASCII", sym);
		snprintf(text, sizeof text, "1 %s", sym);
		v = UNTOUCHED;
		ck_assert_msg(units_parse(text, dim, &v, &cause) == 0,
		    "'%s': %s", text, cause);
		ck_assert_msg(v == 1, "'%s': got %.17g", text, v);
	}
}
END_TEST

/*
 * Errors: -1, the value left alone, and a cause that opens with the text
 * (trimmed) in quotes and contains the expected words.
 */
static const struct error_case {
	const char	*text;
	enum unit_dim	 dim;
	const char	*want;
} error_cases[] = {
	{ "5 mm", DIM_POWER, "'5 mm' is a length, expected a power" },
	{ "12 qq", DIM_LENGTH, "'12 qq': unknown unit 'qq'" },
	{ "abc", DIM_LENGTH, "'abc': not a number" },
	{ "0.25", DIM_LENGTH, "'0.25': a length needs a unit, e.g. '250 mm'" },
	{ "2.5", DIM_POWER, "'2.5': a power needs a unit, e.g. '2.5 W'" },
	{ "0.5", DIM_ENERGY, "'0.5': an energy needs a unit, e.g. '500 mJ'" },
	{ "8e-9", DIM_TIME, "'8e-9': a time needs a unit, e.g. '8 ns'" },
	{ "8", DIM_TIME, "'8': a time needs a unit, e.g. '8 s'" },
	{ "10", DIM_FREQUENCY, "'10': a frequency needs a unit, e.g. '10 Hz'" },
	{ "5e5", DIM_LINEAR,
	    "'5e5': a linear power density needs a unit, e.g. '5 kW/cm'" },
	{ "1e7", DIM_IRRADIANCE,
	    "'1e7': an irradiance needs a unit, e.g. '1 kW/cm^2'" },
	{ "1e5", DIM_FLUENCE, "'1e5': a fluence needs a unit, e.g. '10 J/cm^2'" },
	{ "2.7e-20", DIM_N2,
	    "'2.7e-20': a nonlinear index needs a unit, e.g. '2.7e-20 m^2/W'" },
	{ "100", DIM_FIELD,
	    "'100': an electric field needs a unit, e.g. '100 V/m'" },
	{ " -0.25 ", DIM_LENGTH, "'-0.25': a length needs a unit, e.g. '-250 mm'" },
	{ "", DIM_LENGTH, "'': no value, expected a length" },
	{ "   ", DIM_IRRADIANCE, "'': no value, expected an irradiance" },
	{ "nan", DIM_NONE, "'nan': not a number" },
	{ "NaN m", DIM_LENGTH, "'NaN m': not a number" },
	{ "inf", DIM_NONE, "'inf': not a number" },
	{ "-inf W", DIM_POWER, "'-inf W': not a number" },
	{ "infinity", DIM_LENGTH, "'infinity': not a number" },
	{ ".", DIM_LENGTH, "'.': not a number" },
	{ "-", DIM_LENGTH, "'-': not a number" },
	{ "+ mm", DIM_LENGTH, "'+ mm': not a number" },
	{ "e5", DIM_NONE, "'e5': not a number" },
	{ ".e5 m", DIM_LENGTH, "'.e5 m': not a number" },
	{ "- 5 m", DIM_LENGTH, "'- 5 m': not a number" },
	{ "mm", DIM_LENGTH, "'mm': not a number" },
	{ "0x10 m", DIM_LENGTH, "'0x10 m': unknown unit 'x'" },
	{ "5 mm junk", DIM_LENGTH, "'5 mm junk': unexpected ' junk'" },
	{ "5 mm,", DIM_LENGTH, "'5 mm,': unexpected ','" },
	{ "1,5 mm", DIM_LENGTH, "'1,5 mm': unexpected ',5 mm'" },
	{ "5 W/", DIM_IRRADIANCE, "'5 W/': incomplete unit" },
	{ "5 W*", DIM_ENERGY, "'5 W*': incomplete unit" },
	{ "5 W//cm", DIM_LINEAR, "'5 W//cm': unexpected '/cm'" },
	{ "5 W/ cm", DIM_LINEAR, "'5 W/ cm': unexpected ' cm'" },
	{ "5 /s", DIM_FREQUENCY, "'5 /s': unexpected '/s'" },
	{ "5 m m", DIM_LENGTH, "'5 m m': unexpected ' m'" },
	{ "5 m^", DIM_LENGTH, "'5 m^': bad exponent in 'm^'" },
	{ "5 m^x", DIM_LENGTH, "'5 m^x': bad exponent in 'm^'" },
	{ "5 m^-", DIM_LENGTH, "'5 m^-': bad exponent in 'm^-'" },
	{ "5 m^0", DIM_LENGTH, "'5 m^0': bad exponent in 'm^0'" },
	{ "5 m0", DIM_LENGTH, "'5 m0': bad exponent in 'm0'" },
	{ "5 m^10", DIM_LENGTH, "'5 m^10': bad exponent in 'm^10'" },
	{ "5 W/cm^2^2", DIM_IRRADIANCE, "'5 W/cm^2^2': unexpected '^2'" },
	{ "5 W/cm\u00b22", DIM_IRRADIANCE, "unexpected '2'" },
	{ "1e999 m", DIM_LENGTH, "'1e999 m': out of range" },
	{ "1e308 km", DIM_LENGTH, "'1e308 km': out of range" },
	{ "1e999", DIM_LENGTH, "'1e999': out of range" },
	{ "1e999", DIM_NONE, "'1e999': out of range" },
	{ "5 m", DIM_NONE, "'5 m' is a length, expected a number" },
	{ "5 m/m", DIM_NONE, "'5 m/m': a number takes no unit" },
	{ "1 m/mm", DIM_LENGTH, "'1 m/mm': 'm/mm' is not a length" },
	{ "5 m^3", DIM_LENGTH, "'5 m^3': 'm^3' is not a length" },
	{ "5 Hz", DIM_POWER, "'5 Hz' is a frequency, expected a power" },
	{ "5 J", DIM_POWER, "'5 J' is an energy, expected a power" },
	{ "5 W", DIM_ENERGY, "'5 W' is a power, expected an energy" },
	{ "5 ms", DIM_LENGTH, "'5 ms' is a time, expected a length" },
	{ "5 W/cm", DIM_IRRADIANCE,
	    "'5 W/cm' is a linear power density, expected an irradiance" },
	{ "5 W/cm^2", DIM_FLUENCE, "'5 W/cm^2' is an irradiance, expected a fluence" },
	{ "5 J/cm^2", DIM_IRRADIANCE, "'5 J/cm^2' is a fluence, expected an irradiance" },
	{ "5 cm^2/W", DIM_IRRADIANCE,
	    "'5 cm^2/W' is a nonlinear index, expected an irradiance" },
	{ "5 V/m", DIM_POWER, "'5 V/m' is an electric field, expected a power" },
	{ "5 MM", DIM_LENGTH, "'5 MM': unknown unit 'MM'" },
	{ "5 w", DIM_POWER, "'5 w': unknown unit 'w'" },
	{ "5 hz", DIM_FREQUENCY, "'5 hz': unknown unit 'hz'" },
	{ "5 c", DIM_LENGTH, "'5 c': unknown unit 'c'" },
	{ "5 mmm", DIM_LENGTH, "'5 mmm': unknown unit 'mmm'" },
	{ "5 dm", DIM_LENGTH, "'5 dm': unknown unit 'dm'" },
	{ "5 k\u00b5m", DIM_LENGTH, "unknown unit 'k\u00b5m'" },
	{ "5 Hzs", DIM_NONE, "'5 Hzs': unknown unit 'Hzs'" },
	{ "5 kW/qq", DIM_IRRADIANCE, "'5 kW/qq': unknown unit 'qq'" },
	{ "5 e", DIM_LENGTH, "'5 e': unknown unit 'e'" },
	{ "5e", DIM_LENGTH, "'5e': unknown unit 'e'" },
	{ "1e5e5 m", DIM_LENGTH, "'1e5e5 m': unknown unit 'e'" },
	{ "5 \u00b0C", DIM_NONE, "'5 \u00b0C': unexpected '\u00b0C'" },
	{ "5 m*m*m*m*m*m*m*m*m", DIM_NONE, "unit too long" },
};

START_TEST(test_parse_error)
{
	const struct error_case *c = &error_cases[_i];
	const char *s = c->text, *end;
	char *cause = NULL;
	double v = UNTOUCHED;

	ck_assert_int_eq(units_parse(c->text, c->dim, &v, &cause), -1);
	ck_assert_msg(v == UNTOUCHED, "'%s': value written", c->text);
	ck_assert_ptr_nonnull(cause);
	ck_assert_msg(strstr(cause, c->want) != NULL, "'%s': cause \"%s\", "
	    "want \"%s\"", c->text, cause, c->want);

	/* Messages open with the offending text, trimmed, in quotes. */
	while (*s == ' ' || *s == '\t')
		s++;
	end = s + strlen(s);
	while (end > s && end[-1] == ' ')
		end--;
	ck_assert_msg(cause[0] == '\'' &&
	    strncmp(cause + 1, s, (size_t)(end - s)) == 0 &&
	    cause[1 + (end - s)] == '\'', "'%s': cause \"%s\"", c->text, cause);
	ck_assert_msg(cause[1 + (end - s) + 1] != '\0', "bare quote");
	free(cause);

	/* A NULL cause is allowed and still fails. */
	ck_assert_int_eq(units_parse(c->text, c->dim, &v, NULL), -1);
	ck_assert_msg(v == UNTOUCHED, "'%s': value written", c->text);
}
END_TEST

/*
 * Display formatting.  The conversions to the bench units are derived:
 * W/cm = SI / 1e2, W/cm^2 and J/cm^2 = SI / 1e4, cm^2/W = SI * 1e4.
 */
static const struct format_case {
	double		 v;
	enum unit_dim	 dim;
	int		 sig;
	const char	*utf8, *ascii;
} format_cases[] = {
	{ 1.2, DIM_POWER, 3, "1.20 W", "1.20 W" },
	{ 0.99996, DIM_POWER, 3, "1.00 W", "1.00 W" },	/* carries */
	{ 0.9994, DIM_POWER, 3, "999 mW", "999 mW" },
	{ 0.25, DIM_LENGTH, 3, "250 mm", "250 mm" },
	{ 250e-6, DIM_LENGTH, 3, "250 \u00b5m", "250 um" },
	{ 1.064e-6, DIM_LENGTH, 4, "1.064 \u00b5m", "1.064 um" },
	{ 1064e-9, DIM_LENGTH, 3, "1.06 \u00b5m", "1.06 um" },
	{ 9.9996e-7, DIM_LENGTH, 3, "1.00 \u00b5m", "1.00 um" },
	{ 999.96e-6, DIM_LENGTH, 3, "1.00 mm", "1.00 mm" },
	{ 0.01, DIM_LENGTH, 3, "10.0 mm", "10.0 mm" },	/* never "cm" */
	{ 0.05, DIM_LENGTH, 2, "50 mm", "50 mm" },
	{ 12.5, DIM_LENGTH, 3, "12.5 m", "12.5 m" },
	{ 1200, DIM_LENGTH, 3, "1.20 km", "1.20 km" },
	{ -250e-6, DIM_LENGTH, 3, "-250 \u00b5m", "-250 um" },
	{ 0.0, DIM_POWER, 3, "0 W", "0 W" },
	{ -0.0, DIM_POWER, 3, "0 W", "0 W" },
	{ 0.0, DIM_LENGTH, 3, "0 m", "0 m" },
	{ 0.0, DIM_IRRADIANCE, 3, "0 W/cm\u00b2", "0 W/cm^2" },
	{ 0.0, DIM_N2, 3, "0 cm\u00b2/W", "0 cm^2/W" },
	{ 0.0, DIM_NONE, 3, "0", "0" },
	{ 1.23e8, DIM_IRRADIANCE, 3, "12.3 kW/cm\u00b2", "12.3 kW/cm^2" },
	{ 1e10, DIM_IRRADIANCE, 3, "1.00 MW/cm\u00b2", "1.00 MW/cm^2" },
	{ 5e4, DIM_IRRADIANCE, 2, "5.0 W/cm\u00b2", "5.0 W/cm^2" },
	{ 3.54e4, DIM_FLUENCE, 3, "3.54 J/cm\u00b2", "3.54 J/cm^2" },
	{ 100, DIM_FLUENCE, 3, "10.0 mJ/cm\u00b2", "10.0 mJ/cm^2" },
	{ 5e5, DIM_LINEAR, 3, "5.00 kW/cm", "5.00 kW/cm" },
	{ 2.7e-20, DIM_N2, 3, "2.70e-16 cm\u00b2/W", "2.70e-16 cm^2/W" },
	{ -2.5, DIM_POWER, 3, "-2.50 W", "-2.50 W" },
	{ 8e-9, DIM_TIME, 3, "8.00 ns", "8.00 ns" },
	{ 1e-13, DIM_TIME, 3, "100 fs", "100 fs" },
	{ 1.5e6, DIM_FREQUENCY, 3, "1.50 MHz", "1.50 MHz" },
	{ 10, DIM_FREQUENCY, 3, "10.0 Hz", "10.0 Hz" },
	{ 1e6, DIM_FIELD, 3, "1.00 MV/m", "1.00 MV/m" },
	{ 0.5, DIM_ENERGY, 3, "500 mJ", "500 mJ" },
	{ 0.012, DIM_ENERGY, 2, "12 mJ", "12 mJ" },
	{ 1e-15, DIM_POWER, 3, "1.00 fW", "1.00 fW" },
	{ 999e12, DIM_POWER, 3, "999 TW", "999 TW" },
	{ 1e15, DIM_POWER, 3, "1.00e+15 W", "1.00e+15 W" },	/* past T */
	{ 1e-18, DIM_POWER, 3, "1.00e-18 W", "1.00e-18 W" },	/* below f */
	{ 260, DIM_POWER, 1, "300 W", "300 W" },
	{ 2.6, DIM_POWER, 1, "3 W", "3 W" },
	{ 1.2, DIM_POWER, 0, "1 W", "1 W" },		/* sig clamped to 1 */
	{ 1234, DIM_POWER, 6, "1.23400 kW", "1.23400 kW" },
	{ 1.0 / 3, DIM_POWER, 17, "333.33333333333331 mW",
	    "333.33333333333331 mW" },
	{ 1.0 / 3, DIM_POWER, 40, "333.33333333333331 mW",
	    "333.33333333333331 mW" },	/* sig clamped to 17 */
	{ NAN, DIM_POWER, 3, "-", "-" },
	{ INFINITY, DIM_IRRADIANCE, 3, "inf", "inf" },
	{ -INFINITY, DIM_LENGTH, 3, "-inf", "-inf" },
	{ 1.5, DIM_NONE, 3, "1.50", "1.50" },
	{ 100, DIM_NONE, 3, "100", "100" },
	{ 9.996, DIM_NONE, 3, "10.0", "10.0" },
	{ -0.5, DIM_NONE, 2, "-0.50", "-0.50" },
	{ 0.000123456, DIM_NONE, 3, "0.000123", "0.000123" },
	{ 1234567, DIM_NONE, 3, "1.23e+06", "1.23e+06" },
	{ 1e-5, DIM_NONE, 3, "1.00e-05", "1.00e-05" },
};

START_TEST(test_format)
{
	const struct format_case *c = &format_cases[_i];
	char buf[64];
	int ascii, n;

	for (ascii = 0; ascii <= 1; ascii++) {
		const char *want = ascii ? c->ascii : c->utf8;

		memset(buf, 'x', sizeof buf);
		n = units_format(buf, sizeof buf, c->v, c->dim, c->sig, ascii);
		ck_assert_str_eq(buf, want);
		ck_assert_int_eq(n, (int)strlen(want));
		ck_assert_int_eq(units_format(NULL, 0, c->v, c->dim, c->sig,
		    ascii), n);
	}
}
END_TEST

/* Truncation is snprintf's, except that no half of a UTF-8 sequence is
 * left at the end ("250 µm" is seven bytes, µ being two). */
static const struct trunc_case {
	size_t		 n;
	const char	*want;
} trunc_cases[] = {
	{ 1, "" }, { 2, "2" }, { 5, "250 " }, { 6, "250 " },
	{ 7, "250 \u00b5" }, { 8, "250 \u00b5m" }, { 9, "250 \u00b5m" },
};

START_TEST(test_format_truncate)
{
	const struct trunc_case *c = &trunc_cases[_i];
	char buf[16];

	memset(buf, 'x', sizeof buf);
	ck_assert_int_eq(units_format(buf, c->n, 250e-6, DIM_LENGTH, 3, 0), 7);
	ck_assert_str_eq(buf, c->want);
	ck_assert_int_eq(buf[c->n], 'x');
}
END_TEST

/* Finite doubles spread over every magnitude: bit patterns for half
 * (every other one with a zero exponent field, i.e. subnormal), bench-sized
 * mantissas times 10^-20..10^21 for the rest. */
static double
lcg_double(uint64_t *state, int i)
{
	uint64_t bits;
	double v;

	if (i % 2 == 0) {
		do {
			bits = lcg_next(state);
			bits ^= lcg_next(state) >> 32;
			if (i % 4 == 2)
				bits &= 0x800fffffffffffffULL;
			memcpy(&v, &bits, sizeof v);
		} while (!isfinite(v));
		return v;
	}
	v = (double)(lcg_next(state) >> 11) / 9007199254740992.0;	/* 2^53 */
	return (1 + 9 * v) * pow(10, (int)(lcg_next(state) >> 59) * 41 / 31 - 20);
}

/* What people type comes back from what is shown, to its precision. */
START_TEST(test_format_parses_back)
{
	uint64_t state = 20190520;
	enum unit_dim dim;
	char buf[64], *cause = NULL;
	double v, back;
	int i, ascii;

	for (i = 0; i < 400; i++) {
		v = lcg_double(&state, 1);
		if (i % 3 == 0)
			v = -v;
		dim = (enum unit_dim)(i % DIM_COUNT);
		for (ascii = 0; ascii <= 1; ascii++) {
			units_format(buf, sizeof buf, v, dim, 6, ascii);
			back = UNTOUCHED;
			ck_assert_msg(units_parse(buf, dim, &back, &cause) == 0,
			    "%.17g shown as '%s': %s", v, buf, cause);
			ck_assert_msg(fabs(back - v) <= 5.000001e-6 * fabs(v),
			    "%.17g shown as '%s' reads %.17g", v, buf, back);
		}
	}
}
END_TEST

static const struct exact_case {
	double		 v;
	enum unit_dim	 dim;
	const char	*want;
} exact_cases[] = {
	{ 0.25, DIM_LENGTH, "0.25 m" },
	{ 1e-8, DIM_TIME, "1e-08 s" },
	{ 3.5, DIM_NONE, "3.5" },
	{ 100, DIM_LENGTH, "100 m" },
	{ 1064e-9, DIM_LENGTH, "1.064e-06 m" },
	{ 2.5, DIM_POWER, "2.5 W" },
	{ -2.5, DIM_POWER, "-2.5 W" },
	{ 0.5, DIM_ENERGY, "0.5 J" },
	{ 1.5e6, DIM_FREQUENCY, "1.5e+06 Hz" },
	{ 5e5, DIM_LINEAR, "5e+05 W/m" },
	{ 1.23e8, DIM_IRRADIANCE, "1.23e+08 W/m^2" },
	{ 1e5, DIM_FLUENCE, "1e+05 J/m^2" },
	{ 2.7e-20, DIM_N2, "2.7e-20 m^2/W" },
	{ 1e6, DIM_FIELD, "1e+06 V/m" },
	{ 1.0 / 3, DIM_POWER, "0.3333333333333333 W" },
	{ 0.1 + 0.2, DIM_NONE, "0.30000000000000004" },
	{ 0, DIM_POWER, "0 W" },
	{ -0.0, DIM_POWER, "0 W" },	/* -0 is 0 (issue 14 item 9) */
	{ 5e-324, DIM_LENGTH, "5e-324 m" },
	{ DBL_MAX, DIM_POWER, "1.7976931348623157e+308 W" },
	{ NAN, DIM_POWER, "-" },
	{ INFINITY, DIM_POWER, "inf" },
	{ -INFINITY, DIM_POWER, "-inf" },
};

START_TEST(test_format_exact)
{
	const struct exact_case *c = &exact_cases[_i];
	char buf[64];
	int n;

	n = units_format_exact(buf, sizeof buf, c->v, c->dim);
	ck_assert_str_eq(buf, c->want);
	ck_assert_int_eq(n, (int)strlen(c->want));
	ck_assert_int_eq(units_format_exact(NULL, 0, c->v, c->dim), n);
}
END_TEST

static void
check_exact_round_trip(double v, enum unit_dim dim)
{
	char buf[64], *cause = NULL;
	double back = UNTOUCHED;

	units_format_exact(buf, sizeof buf, v, dim);
	ck_assert_msg(units_parse(buf, dim, &back, &cause) == 0,
	    "%a as '%s': %s", v, buf, cause);
	/* bit for bit, except that -0 comes back as +0 on purpose */
	ck_assert_msg(v == 0 ? back == 0 && !signbit(back) :
	    memcmp(&back, &v, sizeof v) == 0,
	    "%a as '%s' reads back as %a", v, buf, back);
}

static const double edge_values[] = {
	1.0 / 3, 2.0 / 3, 0.1, 0.1 + 0.2, 1e-300, 1e300, 1e-8, 1064e-9,
	DBL_MIN, DBL_TRUE_MIN, DBL_MAX, -DBL_MAX, DBL_EPSILON, 1 + DBL_EPSILON,
	2.2250738585072009e-308,	/* largest subnormal */
	4.9406564584124654e-324, 1.5e-323, 3e-310, 1e23, 9007199254740993.0,
	3.141592653589793, -1e-10, 0.0, -0.0, 5e-324, 123456789012345678.0,
};

START_TEST(test_exact_edges)
{
	int dim;

	for (dim = 0; dim < DIM_COUNT; dim++)
		check_exact_round_trip(edge_values[_i], (enum unit_dim)dim);
}
END_TEST

START_TEST(test_exact_random)
{
	uint64_t state = 0x5eed;
	int i;

	for (i = 0; i < 600; i++)
		check_exact_round_trip(lcg_double(&state, i),
		    (enum unit_dim)(i % DIM_COUNT));
}
END_TEST

/*
 * Robustness (issue 14).  Formatting must survive any double, however it
 * scales into the displayed unit: n2 is shown in cm²/W, i.e. × 1e4, so
 * 1.8e305 m²/W is finite in SI and infinite on screen.  These crashed.
 */
static const struct { double v; enum unit_dim dim; } overflow_cases[] = {
	{ 1.8e305, DIM_N2 }, { -1.8e305, DIM_N2 }, { DBL_MAX, DIM_N2 },
	{ DBL_MAX, DIM_IRRADIANCE }, { -DBL_MAX, DIM_FLUENCE },
	{ DBL_MAX, DIM_LINEAR }, { DBL_TRUE_MIN, DIM_N2 },
	{ NAN, DIM_N2 }, { INFINITY, DIM_N2 }, { -INFINITY, DIM_LENGTH },
};

START_TEST(test_format_overflow)
{
	char buf[64];

	for (int sig = 1; sig <= 17; sig++) {
		units_format(buf, sizeof buf, overflow_cases[_i].v,
		    overflow_cases[_i].dim, sig, sig % 2);
		ck_assert_msg(buf[0] != '\0', "empty text");
		units_format_shortest(buf, sizeof buf, overflow_cases[_i].v,
		    overflow_cases[_i].dim, sig % 2);
		ck_assert_msg(buf[0] != '\0', "empty text");
	}
	/* beyond a double once shown: says so, with no unit */
	if (overflow_cases[_i].dim == DIM_N2 && isfinite(overflow_cases[_i].v) &&
	    fabs(overflow_cases[_i].v) > 1e305) {
		units_format(buf, sizeof buf, overflow_cases[_i].v,
		    overflow_cases[_i].dim, 6, 0);
		ck_assert_str_eq(buf, overflow_cases[_i].v < 0 ? "-inf" : "inf");
	}
}
END_TEST

/* SI Brochure, 9th ed., 5.4.3: a space separates number and unit; U+00A0
 * and U+202F are the no-break spaces typesetting uses for it. */
static const struct parse_case nbsp_cases[] = {
	{ "1\u00a0mm", DIM_LENGTH, 1e-3 },
	{ "1\u202fmm", DIM_LENGTH, 1e-3 },
	{ "2.5 \u202fW", DIM_POWER, 2.5 },
	{ "10\u00a0J/cm^2", DIM_FLUENCE, 10e4 },	/* 1 cm² = 1e-4 m² */
};

START_TEST(test_parse_nbsp)
{
	double v = UNTOUCHED;
	char *cause = NULL;

	ck_assert_msg(units_parse(nbsp_cases[_i].text, nbsp_cases[_i].dim, &v,
	    &cause) == 0, "'%s': %s", nbsp_cases[_i].text, cause);
	ck_assert(v == nbsp_cases[_i].si);
}
END_TEST

/* -0 reads as +0 (issue 14 item 9): export then import is a fixpoint. */
START_TEST(test_parse_negative_zero)
{
	double v = UNTOUCHED;
	char buf[64];

	ck_assert_int_eq(units_parse("-0 mm", DIM_LENGTH, &v, NULL), 0);
	ck_assert(v == 0 && !signbit(v));
	ck_assert_int_eq(units_parse("-0.0e5", DIM_NONE, &v, NULL), 0);
	ck_assert(v == 0 && !signbit(v));
	units_format_shortest(buf, sizeof buf, -0.0, DIM_LENGTH, 1);
	ck_assert_str_eq(buf, "0 m");
	units_format_shortest(buf, sizeof buf, -0.0, DIM_NONE, 1);
	ck_assert_str_eq(buf, "0");
}
END_TEST

/* Issue 9 item 8: shown as typed.  Each text is what a person types; the
 * value is the double the compiler makes of the same literal, and the
 * shortest display form must be that text again (not "1.1000000000000001"). */
static const struct { const char *typed; double v; enum unit_dim dim; } typed_cases[] = {
	{ "1.1", 1.1, DIM_NONE },
	{ "1.3", 1.3, DIM_NONE },
	{ "0.1", 0.1, DIM_NONE },
	{ "0.3", 0.3, DIM_NONE },
	{ "45", 45, DIM_NONE },
	{ "2.5", 2.5, DIM_NONE },
	{ "250 mm", 250e-3, DIM_LENGTH },
	{ "1.1 mm", 1.1e-3, DIM_LENGTH },
	{ "800 nm", 800e-9, DIM_LENGTH },
	{ "532 nm", 532e-9, DIM_LENGTH },
	{ "5 W", 5, DIM_POWER },
	{ "10 ns", 10e-9, DIM_TIME },
	{ "1.2 J/cm^2", 1.2e4, DIM_FLUENCE },
	{ "2.7e-16 cm^2/W", 2.7e-20, DIM_N2 },
};

START_TEST(test_format_shortest)
{
	char buf[64];
	double back = UNTOUCHED;
	int n;

	n = units_format_shortest(buf, sizeof buf, typed_cases[_i].v,
	    typed_cases[_i].dim, 1);
	ck_assert_str_eq(buf, typed_cases[_i].typed);
	ck_assert_int_eq(n, (int)strlen(buf));
	ck_assert_int_eq(units_parse(buf, typed_cases[_i].dim, &back, NULL), 0);
	ck_assert(back == typed_cases[_i].v);
}
END_TEST

/* The workbench and `show` edit a bench value from edit_bench_value's
 * text: what was typed is what is shown (issue 9 item 8). */
static const struct { const char *key, *typed; } edit_typed[] = {
	{ "source.m2", "1.1" },
	{ "source.m2", "1.3, 1.7" },
	{ "source.polarization", "22.5" },
	{ "source.polarization", "0.1" },
	{ "safety_factor", "1.1" },
	{ "safety_factor", "2.3" },
};

START_TEST(test_edit_shows_typed)
{
	struct bench *b = model_bench_new("t");
	char *cause = NULL, *shown;

	b->src.wavelength = 1064e-9;
	b->src.power = 1;
	b->src.waist[0] = b->src.waist[1] = 1e-3;
	ck_assert_msg(edit_set_bench(b, edit_typed[_i].key, edit_typed[_i].typed,
	    &cause) == 0, "%s", cause);
	shown = edit_bench_value(b, edit_typed[_i].key);
	ck_assert_str_eq(shown, edit_typed[_i].typed);
	free(shown);
	model_bench_free(b);
}
END_TEST

/* Issue 14 item 8: messages show invisible characters by name; visible
 * text, newlines and tabs stay as they are, and so do bytes that are not
 * UTF-8 (they are the caller's). */
static const struct { const char *in, *out; } escape_cases[] = {
	{ "\xef\xbb\xbf{", "U+FEFF{" },			/* byte-order mark */
	{ "1\xc2\xa0mm", "1U+00A0mm" },			/* no-break space */
	{ "1\xe2\x80\xafmm", "1U+202Fmm" },			/* narrow no-break space */
	{ "a\xe2\x80\x8b" "b", "aU+200Bb" },			/* zero-width space */
	{ "x\xe2\x80\xaey", "xU+202Ey" },			/* right-to-left override */
	{ "bell\a", "bellU+0007" },
	{ "esc\x1b[2J", "escU+001B[2J" },
	{ "line\nnext\ttab", "line\nnext\ttab" },
	{ "250 \xc2\xb5m caf\xc3\xa9 \xc2\xb2", "250 \xc2\xb5m caf\xc3\xa9 \xc2\xb2" },
	{ "bad \xff byte", "bad \xff byte" },
};

START_TEST(test_escape_invisible)
{
	char *got = util_escape_invisible(escape_cases[_i].in), *cause = NULL;

	ck_assert_str_eq(got, escape_cases[_i].out);
	free(got);
	/* fail_with and cause_prefix escape what they are given */
	fail_with(&cause, "'%s'", escape_cases[_i].in);
	cause_prefix(&cause, "%s", escape_cases[_i].in);
	got = xasprintf("%s: '%s'", escape_cases[_i].out, escape_cases[_i].out);
	ck_assert_str_eq(cause, got);
	free(got);
	free(cause);
}
END_TEST

/* Any double comes back exactly from its shortest form. */
START_TEST(test_shortest_round_trip)
{
	uint64_t state = 0x7e57;

	for (int i = 0; i < 2000; i++) {
		double v = lcg_double(&state, i), back = UNTOUCHED;
		enum unit_dim dim = (enum unit_dim)(i % DIM_COUNT);
		char buf[64], *cause = NULL;

		if (!isfinite(v))
			continue;
		units_format_shortest(buf, sizeof buf, v, dim, i % 2);
		ck_assert_msg(units_parse(buf, dim, &back, &cause) == 0,
		    "%a as '%s': %s", v, buf, cause);
		ck_assert_msg(back == v, "%a as '%s' reads back as %a", v, buf, back);
	}
}
END_TEST

int
main(void)
{
	Suite *s = suite_create("units");
	TCase *tc = tcase_create("core");

	tcase_add_loop_test(tc, test_parse_prefix, 0, NELEMS(prefix_cases));
	tcase_add_loop_test(tc, test_parse_unit, 0, NELEMS(unit_cases));
	tcase_add_loop_test(tc, test_parse_bench, 0, NELEMS(bench_cases));
	tcase_add_loop_test(tc, test_parse_syntax, 0, NELEMS(syntax_cases));
	tcase_add_loop_test(tc, test_parse_si_symbol, 0, DIM_COUNT);
	tcase_add_loop_test(tc, test_parse_error, 0, NELEMS(error_cases));
	tcase_add_loop_test(tc, test_format, 0, NELEMS(format_cases));
	tcase_add_loop_test(tc, test_format_truncate, 0, NELEMS(trunc_cases));
	tcase_add_test(tc, test_format_parses_back);
	tcase_add_loop_test(tc, test_format_exact, 0, NELEMS(exact_cases));
	tcase_add_loop_test(tc, test_exact_edges, 0, NELEMS(edge_values));
	tcase_add_test(tc, test_exact_random);
	tcase_add_loop_test(tc, test_format_overflow, 0, NELEMS(overflow_cases));
	tcase_add_loop_test(tc, test_parse_nbsp, 0, NELEMS(nbsp_cases));
	tcase_add_test(tc, test_parse_negative_zero);
	tcase_add_loop_test(tc, test_format_shortest, 0, NELEMS(typed_cases));
	tcase_add_test(tc, test_shortest_round_trip);
	tcase_add_loop_test(tc, test_edit_shows_typed, 0, NELEMS(edit_typed));
	tcase_add_loop_test(tc, test_escape_invisible, 0, NELEMS(escape_cases));
	suite_add_tcase(s, tc);
	return run_suite(s);
}
