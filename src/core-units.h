/* core-units.h - physical quantities as people write them ("250 mm",
 * "10 J/cm^2") and as the program shows them ("12.3 kW/cm²").
 *
 * Inside the program every value is SI base units (m, W, J, s, Hz, W/m,
 * W/m², J/m², m²/W).  Pure computation: no I/O, no global state. */
#ifndef CORE_UNITS_H
#define CORE_UNITS_H

#include <stddef.h>

enum unit_dim {
	DIM_NONE = 0,           /* a plain number */
	DIM_LENGTH,             /* m */
	DIM_POWER,              /* W */
	DIM_ENERGY,             /* J */
	DIM_TIME,               /* s */
	DIM_FREQUENCY,          /* Hz */
	DIM_LINEAR,             /* W/m, linear power density */
	DIM_IRRADIANCE,         /* W/m² */
	DIM_FLUENCE,            /* J/m² */
	DIM_N2,                 /* m²/W, nonlinear index */
	DIM_FIELD,              /* V/m, electric field (output only) */
	DIM_COUNT
};

/* "length", "power", ... for messages. */
const char *units_dim_name(enum unit_dim);

/* The SI unit written out ("m", "W/m^2"); UTF-8 or ASCII. */
const char *units_si_symbol(enum unit_dim, int ascii);

/* Parses "<number> [unit]" into SI.  The number is a C floating literal
 * (sign, decimals, exponent); white space around it and between number and
 * unit is allowed (also U+00A0 and U+202F between number and unit).  Units: m s J W Hz V and products/quotients of them with
 * '/' and exponents written ^2, 2, ², ³ (e.g. W/cm^2, J/cm2, cm²/W, kW/cm),
 * each with an optional SI prefix f p n u µ m c k M G.  A unit of another
 * dimension than `dim` is an error.  For DIM_NONE no unit is allowed.  For
 * other dimensions a unit is required (a bare number in text is ambiguous:
 * write "0.25 m"), unless the number is exactly zero.  -0 reads as 0.
 * Returns 0, or -1 with *cause set ("'5 mm' is a length, expected a power"). */
int units_parse(const char *text, enum unit_dim dim, double *out, char **cause);

/* Formats v (SI) with `sig` significant digits in the unit people use for
 * that dimension on a bench: lengths in nm/µm/mm/m, powers in W with a
 * prefix, irradiance in W/cm² (kW/cm², MW/cm², ...), fluence in J/cm²
 * (mJ/cm², ...), linear density in W/cm (kW/cm), n2 in cm²/W.  The prefix is
 * chosen so the mantissa lies in [1, 1000); zero prints as "0 <base unit>";
 * NaN prints "-", infinities "inf".  ascii != 0 writes "u" and "^2" for
 * µ and ².  Writes at most n bytes including the NUL (truncating); returns
 * the length it wanted, like snprintf. */
int units_format(char *buf, size_t n, double v, enum unit_dim dim, int sig,
    int ascii);

/* Formats v in the exact SI form used in text that is read back (export
 * to the CLI's KEY=VALUE): shortest "%.17g" that round-trips, then the SI
 * unit ("0.25 m").  Returns as snprintf. */
int units_format_exact(char *buf, size_t n, double v, enum unit_dim dim);

/* Formats v the way a person would type it back: in the display unit of
 * units_format, with the fewest significant digits that units_parse reads
 * back to the identical double ("1.1", "250 mm", "1.2 J/cm²"); plain
 * numbers in the shortest "%g" form that round-trips.  -0 prints as 0;
 * NaN "-", infinities "inf".  Returns as snprintf. */
int units_format_shortest(char *buf, size_t n, double v, enum unit_dim dim,
    int ascii);

#endif
