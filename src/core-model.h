/* core-model.h - the bench in memory: a source and a tree of elements.
 *
 * Element values live in one array indexed by enum model_key, described by a
 * single table (model_keys) that says each key's name, kind, unit, range and
 * the element types that take it.  The bench file reader, the CLI's
 * KEY=VALUE, the workbench's edit field, export and diff all go through that
 * table, so a key is checked the same way wherever it is typed.
 * Pure data and validation: no I/O. */
#ifndef CORE_MODEL_H
#define CORE_MODEL_H

#include <math.h>
#include <stddef.h>
#include <stdint.h>

#include "core-units.h"

#define MODEL_FORMAT     "beamledger-bench-1"
#define MODEL_MAX_DEPTH  900        /* nested side branches; deeper is refused */

enum elem_type {
	EL_SPACE, EL_MIRROR, EL_LENS, EL_SPLITTER, EL_WINDOW, EL_FILTER,
	EL_WAVEPLATE, EL_POLARIZER, EL_IRIS, EL_DUMP, EL_DETECTOR, EL_TARGET,
	EL_ISOLATOR,
	EL_NTYPES
};
#define EL_BIT(t)  (1u << (t))

enum port { PORT_NONE, PORT_REFLECTED, PORT_TRANSMITTED, PORT_REJECTED };

enum key_kind {
	KIND_QUANTITY,          /* dimensioned, SI inside, units in text */
	KIND_FRACTION,          /* plain number in [0, 1] */
	KIND_ANGLE,             /* plain number, degrees */
	KIND_NUMBER,            /* plain number (od, waves, ratio, index) */
	KIND_BOOL,              /* true/false */
	KIND_AXIS,              /* "both" | "x" | "y" */
	KIND_SURFACE,           /* fraction in [0, 1) or "uncoated" (MODEL_UNCOATED) */
	KIND_CHOICE             /* one of the row's `choices`, stored as its index */
};

enum model_key {
	K_LENGTH, K_REFLECTANCE, K_RS, K_RP, K_TP, K_TS, K_ROC, K_AOI,
	K_FOCAL, K_AXIS, K_TRANSMISSION, K_THICKNESS, K_N2, K_INDEX,
	K_POLARIZING, K_OD, K_MAX_ABSORBED, K_RETARDANCE, K_ANGLE,
	K_EXTINCTION, K_DIAMETER, K_MAX_POWER, K_APERTURE,
	K_R1, K_R2, K_MATERIAL, K_BREWSTER, K_PHASE,
	K_SURF_R, K_SURF_R_BACK, K_LEAK, K_REFLECTIVE, K_ISOLATION,
	K_DMG_CW_LINEAR, K_DMG_CW_IRRADIANCE, K_DMG_FLUENCE,
	K_DMG_WAVELENGTH, K_DMG_PULSE_WIDTH,
	K_COUNT
};
#define K_DMG_FIRST K_DMG_CW_LINEAR
#define KEY_BIT(k)  ((uint64_t)1 << (k))

/* surface_reflectance "uncoated": Fresnel from the index (ghost-conventions.md) */
#define MODEL_UNCOATED (-1.0)

enum axis_sel { AXIS_BOTH = 0, AXIS_X = 1, AXIS_Y = 2 };
/* Glasses of the `material` key, in the order of material_names[]
 * (core-material.h has their Sellmeier fits). */
enum material_id { MAT_FUSED_SILICA, MAT_N_BK7, MAT_CAF2, MAT_SAPPHIRE_O, MAT_COUNT };

struct model_key_def {
	const char     *name;       /* as in the file; damage keys without "damage." */
	enum key_kind   kind;
	enum unit_dim   dim;
	double          lo, hi;     /* allowed range (inclusive unless open) */
	unsigned        lo_open:1, hi_open:1, nonzero:1;
	unsigned        types;      /* EL_BIT mask of types taking it */
	double          dflt;       /* default when absent (NAN: none) */
	const char     *help;       /* one line for the workbench */
	const char *const *choices; /* KIND_CHOICE: the names, NULL-terminated */
};
extern const struct model_key_def model_keys[K_COUNT];

/* A tolerance on a value (core-tol.h): the spread the Monte-Carlo draws. */
struct tol {
	double        amount;       /* σ or half-width: SI (degrees, plain), or per cent when rel */
	unsigned char rel;          /* written "± N %" */
	unsigned char uniform;      /* uniform over ± amount; else normal with σ = amount */
};
struct tol_bench;               /* the source's tolerances and bench defaults */

struct element;
struct branch {
	struct element *el;         /* owned array */
	size_t          n, cap;
};

struct element {
	char           *id;         /* owned; unique in the bench */
	char           *label;      /* owned, may be NULL */
	char           *part;       /* owned, may be NULL: parts-shelf name */
	enum elem_type  type;
	enum port       side_port;  /* PORT_NONE: no side branch */
	uint64_t        set;        /* KEY_BIT of every key given */
	struct branch   side;       /* owned */
	struct tol     *tol;        /* owned [K_COUNT]; NULL: no tolerance */
	/* last: what a trace reads of every element (type, set, side) shares
	 * its first cache line, the values it reads follow */
	double          val[K_COUNT];
};

enum pulse_shape { PULSE_GAUSSIAN, PULSE_SECH2, PULSE_SQUARE };
const char *model_shape_name(enum pulse_shape);              /* "gaussian", ... */
int         model_shape_parse(const char *s, enum pulse_shape *out);  /* 0 / -1; NULL s: -1 */
enum pol_kind { POL_LINEAR, POL_CIRCULAR, POL_UNPOLARIZED };

struct source {
	double           wavelength;         /* m, vacuum */
	double           power;              /* W average (derived when pulse_energy given) */
	int              pulsed;
	int              energy_given;       /* pulse_energy, not power, was written */
	double           rep_rate;           /* Hz */
	double           pulse_width;        /* s, FWHM */
	enum pulse_shape shape;
	double           pulse_energy;       /* J (derived when power given) */
	double           waist[2];           /* m, x and y */
	int              waist_pair;         /* written as [x, y] */
	double           waist_position;     /* m, + downstream */
	double           m2[2];
	int              m2_pair;
	double           divergence[2];      /* rad, far-field half-angle; when
	                                      * given, m2 = π·w0·θ/λ (ISO 11146-1) */
	int              divergence_given;   /* written instead of m2 */
	enum pol_kind    pol;
	double           pol_angle_deg;
	double           max_return;         /* W tolerable back at the source; NAN: not judged */
};

/* Operating points (core-point.h): named lists of changes to the bench. */
struct point;
struct point_list {
	struct point  *p;           /* owned array */
	size_t         n, cap;
};

struct bench {
	char          *name;        /* owned */
	char          *notes;       /* owned, may be NULL */
	double         safety_factor;   /* > 1 */
	double         air_breakdown;   /* W/m² */
	int            safety_given, air_given;
	double         ghost_tilt;      /* degrees: at or above, reflections are strays */
	double         stray_warn;      /* W: a stray at or above warns */
	int            tilt_given, stray_given;
	struct source  src;
	struct branch  path;        /* owned */
	struct point_list points;   /* owned; empty for most benches */
	struct tol_bench *tol;      /* owned; NULL: no source tolerance or default */
};

/* Life cycle. */
struct bench   *model_bench_new(const char *name);        /* caller frees */
void            model_bench_free(struct bench *);         /* NULL ok */
struct bench   *model_bench_dup(const struct bench *);    /* deep copy */
void            model_source_defaults(struct source *);
void            model_element_init(struct element *, enum elem_type, const char *id);
void            model_element_release(struct element *);
void            model_element_copy(struct element *dst, const struct element *src); /* deep */
void            model_branch_release(struct branch *);
/* Appends a zeroed slot and returns it (borrowed; moves when the branch grows). */
struct element *model_branch_push(struct branch *);
/* Inserts `el` (taken by value: the branch owns its strings now) at index i. */
void            model_branch_insert(struct branch *, size_t i, struct element *el);
/* Removes element i into *out (the caller owns it then), or releases it if out is NULL. */
void            model_branch_remove(struct branch *, size_t i, struct element *out);

/* Names. */
const char     *model_type_name(enum elem_type);
int             model_type_parse(const char *s, enum elem_type *out);   /* 0 / -1 */
const char     *model_port_name(enum port);
int             model_type_is_terminator(enum elem_type);
/* The side ports a type may carry (EL_SPLITTER: reflected/transmitted). */
int             model_type_takes_port(enum elem_type, enum port);
int             model_key_find(const char *name);        /* "damage.fluence" or "fluence" for damage keys with prefix; -1 */
/* Full key name for messages and files ("damage.fluence"). */
const char     *model_key_path(enum model_key);
int             model_key_applies(enum model_key, enum elem_type);

/* Value of a key: the given value or its default (NAN when absent with no default). */
/* Inline: the trace asks several times per element (issue #12). */
static inline int
model_has(const struct element *el, enum model_key k)
{
	return (el->set & KEY_BIT(k)) != 0;
}
/* Defaults that depend on the type (a splitter meets the beam at 45°). */
static inline double
model_get(const struct element *el, enum model_key k)
{
	if (model_has(el, k))
		return el->val[k];
	switch (k) {
	case K_AOI:
		return el->type == EL_SPLITTER ? 45 : 0;
	case K_REFLECTANCE:
		return el->type == EL_MIRROR ? 1 : NAN;
	default:
		return model_keys[k].dflt;
	}
}

/* 1 when v is finite and inside key k's range (and whole, for a kind that
 * counts); the one range test model_set and the tolerances share. */
int             model_key_in_range(enum model_key, double v);
/* Checks one value for a key on an element type (range, kind) and stores it.
 * Messages name the element and key: "element 'M1': reflectance 1.2 is outside 0..1". */
int             model_set(struct element *, enum model_key, double v, char **cause);
void            model_unset(struct element *, enum model_key);
/* Parses text for a key ("250 mm", "0.99", "true", "x") and sets it.  A
 * tolerance after the value ("250 mm ± 2 mm", core-tol.h) is kept with it;
 * text that is only a tolerance ("± 1 %") keeps the value; a value without
 * one keeps the tolerance the key had ("± 0" removes it). */
int             model_set_text(struct element *, enum model_key, const char *text, char **cause);
/* Formats a key's value for text that is read back exactly ("0.25 m", "x",
 * "true"), with its tolerance when it has one ("0.25 m ± 2 mm"). */
char           *model_value_text(const struct element *, enum model_key);     /* caller frees */

/* Cross-field checks over the whole bench: ids unique and non-empty,
 * terminators last, exactly one side branch on a splitter, no side branch
 * where none belongs, reflectance xor rs/rp, od xor transmission, a fluence
 * rating with its pulse width, required keys present, source consistent,
 * nesting within MODEL_MAX_DEPTH.  Messages name the element and key. */
int             model_validate(const struct bench *, char **cause);
int             model_source_validate(const struct source *, char **cause);
/* M² of a source given by its measured divergence (divergence_given):
 * M² = π·w0·θ/λ per axis (ISO 11146-1), refused below 1 with a message
 * naming the values.  Nothing to do without a divergence, or before the
 * waist and wavelength are known.  The one rule for files and edits. */
int             model_source_m2_from_divergence(struct source *, char **cause);

/* Depth-first walk over every element (path order, side branches right
 * after their element).  Stops and returns fn's value when it is nonzero. */
typedef int   (*model_walk_fn)(struct element *, struct element *parent,
                    size_t depth, void *arg);
int             model_walk(struct branch *, model_walk_fn, void *arg);
size_t          model_count(const struct branch *);   /* every element of every branch */

/* Finds an element by id anywhere in the tree; where, index and parent (each
 * may be NULL) say where it lives (borrowed). */
struct element *model_find(struct bench *, const char *id,
                    struct branch **where, size_t *index, struct element **parent);

#endif
