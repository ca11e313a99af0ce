/* core-trace.c - the trace engine.  One pass over the element tree, depth
 * first without recursion (an explicit stack of branch cursors), so the cost
 * is linear in the number of elements and nesting cannot exhaust the C stack. */
#include <config.h>

#include <math.h>
#include <stdatomic.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "core-trace.h"
#include "core-ghost.h"
#include "core-material.h"
#include "core-polar.h"
#include "core-thick.h"
#include "util-err.h"

#define B_WARN_RAD 3.0          /* common practice: 3-5 rad, onset of break-up */
#define CLIP_WARN  0.01         /* REFERENCE §9, common practice */
#define CLIP_HARD  0.10

static const char *const flag_names[TF_COUNT] = {
	"clipping", "hard_clipping", "wavelength_scaled", "pulse_scaled",
	"pulse_scaling_out_of_range", "pulsed_rating_on_cw", "self_focusing",
	"focus", "air_breakdown", "above_critical_power", "ghosts",
};

const char *
trace_flag_name(unsigned bit)
{
	for (int i = 0; i < TF_COUNT; i++)
		if (bit == 1u << i)
			return flag_names[i];
	return "?";
}

const char *
trace_warn_name(enum trace_warn_kind k)
{
	static const char *const names[] = {
		"unterminated", "b_integral", "air_breakdown", "self_focusing",
		"unrated_dump", "unrated_absorber", "ghost_over", "stray", "return_power",
	};

	return names[k];
}

void
trace_branch_name(const struct element *parent, enum port port, char *buf, size_t n)
{
	if (parent == NULL)
		snprintf(buf, n, "main");
	else
		snprintf(buf, n, "%s.%s", parent->id, model_port_name(port));
}

/* A freed result whose memory the next fresh trace takes (trace_free);
 * owned; NULL: none. */
static _Atomic(struct trace *) spare;

/* The beam between elements. */
struct state {
	double           s[4];
	struct beam_axis x, y;
	double           z;
	double           b_total;
	int              b_warned;
	/* The radii of x and y when a gap's focus has computed them at
	 * the gap's end: the next row's radii, the same arithmetic on the
	 * same q (issue #12); have_w 0: not known. */
	int              have_w;
	double           wx, wy;
};

/* A branch being walked: where it is and what beam it carries. */
struct cursor {
	const struct branch  *br;
	size_t                i;
	const struct element *parent;
	enum port             port;
	struct state          st;
};

void
trace_add_warning(struct trace *t, enum trace_warn_kind kind, const struct element *parent,
    enum port port, const struct element *after, double value)
{
	struct trace_warning *w;

	if (t->nwarn == t->capwarn) {
		t->capwarn = t->capwarn ? 2 * t->capwarn : 8;
		t->warn = xreallocarray(t->warn, t->capwarn, sizeof *t->warn);
	}
	w = &t->warn[t->nwarn++];
	w->kind = kind;
	w->parent = parent;
	w->port = port;
	w->after = after;
	w->value = value;
	w->distance = NAN;
	w->ghost = 0;
	w->surface = NULL;
}

static void
warn(struct trace *t, enum trace_warn_kind kind, const struct cursor *c,
    const struct element *after, double value)
{
	trace_add_warning(t, kind, c->parent, c->port, after, value);
}

static void
start_state(const struct bench *b, struct state *st)
{
	const struct source *s = &b->src;

	switch (s->pol) {
	case POL_CIRCULAR:
		polar_circular(st->s, s->power);
		break;
	case POL_UNPOLARIZED:
		polar_unpolarized(st->s, s->power);
		break;
	default:
		polar_linear(st->s, s->power, s->pol_angle_deg);
		break;
	}
	/* q = -waist_position + i zR */
	st->x = beam_axis_from_waist(s->waist[0], s->m2[0], s->wavelength, -s->waist_position);
	st->y = beam_axis_from_waist(s->waist[1], s->m2[1], s->wavelength, -s->waist_position);
	st->z = 0;
	st->b_total = 0;
	st->b_warned = 0;
	st->have_w = 0;
}

/* What the element does to the polarization and power: the Mueller matrix
 * of the port that continues, and of the side port when it has one. */
/* The s-p phase difference of a reflection (`phase`, degrees): a retarder
 * with its axes along p (x) and s (y), applied before the reflection's
 * change of handedness (REFERENCE §15). */
static void
reflect_with_phase(struct mueller *m, const struct element *el)
{
	double phase = model_get(el, K_PHASE);

	if (phase != 0) {
		struct mueller r, out;

		polar_retarder(&r, phase / 360, 0);
		polar_mul(&out, &r, m);
		*m = out;
	}
	polar_reflect(m);
}

/* A window at Brewster's angle: p passes both faces without loss, s loses
 * Rs at each (Fresnel at θB, REFERENCE §6; the exit face, glass to air at
 * the internal Brewster angle, reflects the same Rs). */
static void
brewster_window(struct mueller *m, const struct element *el, double lambda, double t)
{
	double n = thick_index(el, lambda), rs, rp;

	material_fresnel(1, n, material_brewster_deg(1, n), &rs, &rp);
	polar_diattenuator(m, t, t * (1 - rs) * (1 - rs), 0);
}

static void
element_mueller(const struct element *el, double lambda, struct mueller *main_m,
    struct mueller *side_m)
{
	double r, rs, rp, tp, ts, t, t2;

	/* every case sets main_m whole; the identity only where it stays
	 * (no second fill of the matrix per element: issue #12) */
	if (el->side_port != PORT_NONE)
		polar_scalar(side_m, 0);
	switch (el->type) {
	case EL_MIRROR:
		if (model_has(el, K_RS) || model_has(el, K_RP)) {
			rs = model_has(el, K_RS) ? el->val[K_RS] : 1;
			rp = model_has(el, K_RP) ? el->val[K_RP] : 1;
			polar_diattenuator(main_m, rp, rs, 0);
		} else {
			polar_scalar(main_m, model_get(el, K_REFLECTANCE));
		}
		reflect_with_phase(main_m, el);
		break;
	case EL_SPLITTER: {
		struct mueller refl, trans;

		if (model_get(el, K_POLARIZING) != 0) {
			tp = model_has(el, K_TP) ? el->val[K_TP] : 1;
			rs = model_has(el, K_RS) ? el->val[K_RS] : 1;
			ts = model_has(el, K_TS) ? el->val[K_TS] : 1 - rs;
			rp = model_has(el, K_RP) ? el->val[K_RP] : 1 - tp;
			polar_diattenuator(&trans, tp, ts, 0);
			polar_diattenuator(&refl, rp, rs, 0);
		} else {
			r = el->val[K_REFLECTANCE];
			polar_scalar(&trans, 1 - r);
			polar_scalar(&refl, r);
		}
		reflect_with_phase(&refl, el);
		if (el->side_port == PORT_REFLECTED) {
			*main_m = trans;
			*side_m = refl;
		} else {
			*main_m = refl;
			*side_m = trans;
		}
		break;
	}
	case EL_WINDOW:
		if (model_get(el, K_BREWSTER) != 0) {
			brewster_window(main_m, el, lambda, model_get(el, K_TRANSMISSION));
			break;
		}
		/* fall through */
	case EL_LENS:
	case EL_ISOLATOR:
		polar_scalar(main_m, model_get(el, K_TRANSMISSION));
		break;
	case EL_FILTER:
		t = model_has(el, K_OD) ? pow(10, -el->val[K_OD]) : model_get(el, K_TRANSMISSION);
		polar_scalar(main_m, t);
		break;
	case EL_WAVEPLATE:
		polar_retarder(main_m, el->val[K_RETARDANCE], model_get(el, K_ANGLE));
		t = model_get(el, K_TRANSMISSION);
		for (int i = 0; i < 4; i++)
			for (int j = 0; j < 4; j++)
				main_m->m[i][j] *= t;
		break;
	case EL_POLARIZER:
		t = model_get(el, K_TRANSMISSION);
		t2 = model_has(el, K_EXTINCTION) ? t / el->val[K_EXTINCTION] : 0;
		polar_diattenuator(main_m, t, t2, model_get(el, K_ANGLE));
		if (el->side_port == PORT_REJECTED) {
			polar_diattenuator(side_m, 0, 1 - t2, model_get(el, K_ANGLE));
			polar_reflect(side_m);
		}
		break;
	case EL_DUMP:
	case EL_DETECTOR:
	case EL_TARGET:
		polar_scalar(main_m, 0);
		break;
	default:
		polar_identity(main_m);
		break;
	}
}

/* What the element does to the beam's size; returns how far z advances
 * through it (its glass; 0 for thin elements). */
static double
optics_axes(const struct element *el, double lambda, struct beam_axis *x,
    struct beam_axis *y)
{
	double fx, fy;

	switch (el->type) {
	case EL_MIRROR:
		if (!model_has(el, K_ROC))
			return 0;
		beam_mirror_focal(el->val[K_ROC], model_get(el, K_AOI), &fx, &fy);
		beam_lens(x, fx);
		beam_lens(y, fy);
		return 0;
	case EL_LENS:
	case EL_WINDOW:
		return thick_apply(el, lambda, x, y);
	default:
		return 0;
	}
}

static double
element_optics(const struct element *el, double lambda, struct state *st)
{
	return optics_axes(el, lambda, &st->x, &st->y);
}

void
trace_element_optics(const struct element *el, double lambda, struct beam_axis *x,
    struct beam_axis *y)
{
	(void)optics_axes(el, lambda, x, y);
}

void
trace_element_ports(const struct element *el, double lambda, const double s_in[4],
    double *main_out, double *side_out)
{
	struct mueller mm, ms;
	double s[4];

	*main_out = *side_out = 0;
	if (el->type == EL_SPACE) {
		*main_out = s_in[0];
		return;
	}
	element_mueller(el, lambda, &mm, &ms);
	polar_apply(&mm, s_in, s);
	*main_out = s[0] > 0 ? s[0] : 0;
	if (el->side_port != PORT_NONE) {
		polar_apply(&ms, s_in, s);
		*side_out = s[0] > 0 ? s[0] : 0;
	}
}

/* st is the beam after any clipping at the gap's start; next the element
 * after the gap (NULL: the branch ends with it).  A waist in the gap is
 * always reported; it is a focus when it concentrates the beam.  Air
 * breaks down at any waist in air: inside the gap, or on the plane of an
 * iris, an empty plane (a space) or the end of the branch; a waist on an
 * optic's surface is that optic's rating to judge. */
static void
gap_focus(const struct bench *b, struct trace_row *row, struct state *st,
    const struct element *next)
{
	double p = st->s[0], len = row->el->val[K_LENGTH];
	double dz, wx, wy, ex, ey, a0, a1, lam = b->src.wavelength;
	struct beam_axis x = st->x, y = st->y;
	int in_air = 1;

	if (!beam_gap_focus(&st->x, &st->y, lam, len, TRACE_PLANE_TOL, &dz, &wx, &wy))
		return;
	row->has_waist = 1;
	row->focus.z = st->z + dz;
	row->focus.wx = wx;
	row->focus.wy = wy;
	beam_space(&x, len);
	beam_space(&y, len);
	ex = beam_radius(&x, lam);
	ey = beam_radius(&y, lam);
	/* the radii at the next element's plane, once the gap is crossed */
	st->have_w = 1;
	st->wx = ex;
	st->wy = ey;
	a0 = row->wx * row->wy;
	a1 = ex * ey;
	/* a waist on the end plane is compared with the start alone */
	row->focus.concentration = (dz >= len - TRACE_PLANE_TOL ? a0 : damage_fmin(a0, a1)) /
	    (wx * wy);
	if (row->focus.concentration >= TRACE_FOCUS_CONCENTRATION) {
		row->has_focus = 1;
		row->flags |= TF_FOCUS;
	}
	if (dz >= len - TRACE_PLANE_TOL && next != NULL) {
		row->focus.on = next;
		in_air = next->type == EL_IRIS || next->type == EL_SPACE;
	}
	row->focus.irradiance = damage_peak_irradiance(p, wx, wy);
	if (b->src.pulsed) {
		double e = p / b->src.rep_rate;
		double ppk = damage_peak_power(b->src.shape, e, b->src.pulse_width);

		row->focus.peak_irradiance = damage_peak_irradiance(ppk, wx, wy);
		row->focus.air_breakdown = in_air &&
		    row->focus.peak_irradiance >= b->air_breakdown;
		if (row->focus.air_breakdown)
			row->flags |= TF_AIR_BREAKDOWN;
	} else {
		row->focus.peak_irradiance = row->focus.irradiance;
	}
}

/* Matrix round-off leaves ~1e-17 of the source (even negative) where an
 * ideal crossed polarizer passes nothing; below 1e-15 of the source power
 * (a femtowatt from a watt) a beam is taken to be gone, so that round-off
 * raises no unterminated-beam warning. */
static void
settle(double s[4], double source_power)
{
	if (s[0] <= 1e-15 * source_power)
		s[0] = s[1] = s[2] = s[3] = 0;
}

/* Fills one row and advances the state through the element; returns the
 * state of the side port through *side. */
static void
visit(struct trace *t, const struct cursor *c, struct trace_row *row,
    struct state *st, struct state *side, unsigned depth, double inv_sf)
{
	const struct bench *b = t->bench;
	const struct source *src = &b->src;
	const struct element *el = &c->br->el[c->i];
	struct mueller mm, ms;
	struct damage_exposure ex;
	double p, a, lam = src->wavelength, glass = 0;

	/* Every field is written below, once: no memset of the row first
	 * (issue #12: it was an eighth of the time per element). */
	row->el = el;
	row->parent = c->parent;
	row->port = c->port;
	row->depth = depth;
	row->z = st->z;
	memcpy(row->stokes, st->s, sizeof st->s);
	row->qx = st->x;
	row->qy = st->y;
	p = row->power_in = st->s[0];
	if (st->have_w) {
		row->wx = st->wx;
		row->wy = st->wy;
	} else {
		row->wx = beam_radius(&st->x, lam);
		row->wy = beam_radius(&st->y, lam);
	}
	st->have_w = 0;
	row->irradiance = damage_peak_irradiance(p, row->wx, row->wy);
	row->linear_density = damage_linear_density(p, row->wx, row->wy);
	row->fluence = row->peak_power = NAN;
	row->b_integral = row->critical_power = row->collapse_distance = NAN;
	row->critical_ratio = NAN;
	row->b_total = st->b_total;
	row->clip_loss = 0;
	row->flags = 0;
	row->has_waist = row->has_focus = 0;
	row->focus.z = row->focus.wx = row->focus.wy = 0;
	row->focus.irradiance = row->focus.peak_irradiance = 0;
	row->focus.concentration = 0;
	row->focus.on = NULL;
	row->focus.air_breakdown = 0;
	if (src->pulsed) {
		double e = p / src->rep_rate;

		row->fluence = damage_fluence(e, row->wx, row->wy);
		row->peak_power = damage_peak_power(src->shape, e, src->pulse_width);
		row->peak_irradiance = damage_peak_irradiance(row->peak_power, row->wx, row->wy);
	} else {
		row->peak_irradiance = row->irradiance;
	}
	row->field = damage_peak_field(row->peak_irradiance);

	/* Clip first, then let the element act. */
	/* An iris in a mount clips at the smaller of its opening and the mount. */
	a = model_has(el, K_APERTURE) ? el->val[K_APERTURE] : NAN;
	if (el->type == EL_IRIS && !(a < el->val[K_DIAMETER]))
		a = el->val[K_DIAMETER];
	if (!isnan(a)) {
		double tr = beam_clip_transmission(row->wx, row->wy, a / 2);

		row->clip_loss = 1 - tr;
		for (int i = 0; i < 4; i++)
			st->s[i] *= tr;
		if (row->clip_loss > CLIP_WARN)
			row->flags |= TF_CLIPPING;
		if (row->clip_loss > CLIP_HARD)
			row->flags |= TF_HARD_CLIP;
	}
	if (el->type != EL_SPACE) {         /* a gap of air leaves power alone */
		element_mueller(el, lam, &mm, &ms);
		if (el->side_port != PORT_NONE) {
			*side = *st;
			polar_apply(&ms, st->s, side->s);
			settle(side->s, src->power);
		}
		polar_apply(&mm, st->s, st->s);
		settle(st->s, src->power);
		glass = element_optics(el, lam, st);
		side->x = st->x;
		side->y = st->y;
	}
	row->power_out = st->s[0] + (el->side_port != PORT_NONE ? side->s[0] : 0);
	row->power_lost = p - row->power_out;

	/* Nonlinear phase and self-focusing in transmissive parts. */
	if ((el->type == EL_LENS || el->type == EL_WINDOW) && model_has(el, K_N2) &&
	    model_has(el, K_THICKNESS)) {
		double ppk = src->pulsed ? row->peak_power : p;

		double n0 = thick_index(el, lam);

		row->critical_power = damage_critical_power(lam, n0, el->val[K_N2]);
		row->critical_ratio = ppk / row->critical_power;
		/* At or above P_cr the beam would collapse after the collapse
		 * distance (infinite at P_cr itself); it does so inside the
		 * element only when that is shorter than the thickness.  A
		 * longer one is a note: the B-integral carries the risk. */
		if (row->critical_power > 0 && ppk >= row->critical_power) {
			row->collapse_distance = damage_self_focus_distance(lam,
			    n0, sqrt(row->wx * row->wy), row->critical_ratio);
			if (row->collapse_distance < glass)
				row->flags |= TF_SELF_FOCUSING;
			else
				row->flags |= TF_ABOVE_CRITICAL;
		}
		row->b_integral = damage_b_integral(lam, el->val[K_N2],
		    row->peak_irradiance, glass);
		st->b_total += row->b_integral;
		row->b_total = st->b_total;
		if (st->b_total > B_WARN_RAD && !st->b_warned) {
			st->b_warned = 1;
			warn(t, TW_B_INTEGRAL, c, el, st->b_total);
		}
		if (row->flags & TF_SELF_FOCUSING) {
			warn(t, TW_SELF_FOCUSING, c, el, ppk);
			t->warn[t->nwarn - 1].distance = row->collapse_distance;
		}
	}
	side->b_total = st->b_total;
	side->b_warned = st->b_warned;
	st->z += glass;         /* a thick element occupies its glass along z */

	damage_limits(el, src, &row->limits);
	if (row->limits.flags & DAMAGE_WL_SCALED)
		row->flags |= TF_WAVELENGTH_SCALED;
	if (row->limits.flags & DAMAGE_PULSE_SCALED)
		row->flags |= TF_PULSE_SCALED;
	if (row->limits.flags & DAMAGE_PULSE_RANGE)
		row->flags |= TF_PULSE_RANGE;
	if (row->limits.flags & DAMAGE_CW_ONLY_PULSED)
		row->flags |= TF_PULSED_RATING_ON_CW;
	ex.power_in = p;
	ex.power_lost = row->power_lost;
	ex.linear_density = row->linear_density;
	ex.irradiance = row->irradiance;
	ex.fluence = row->fluence;
	row->ratio = damage_ratio(&row->limits, &ex);
	row->status = damage_status_by(row->ratio, inv_sf);
	/* Dumps have their own warning (branch_end); a gap absorbs nothing. */
	if (el->type != EL_SPACE && el->type != EL_DUMP && !damage_rated(&row->limits) &&
	    row->power_lost > TRACE_UNRATED_LEVEL)
		warn(t, TW_UNRATED_ABSORBER, c, el, row->power_lost);

	if (el->type == EL_SPACE) {
		gap_focus(b, row, st, c->i + 1 < c->br->n ? &c->br->el[c->i + 1] : NULL);
		if (row->focus.air_breakdown)
			warn(t, TW_AIR_BREAKDOWN, c, el, row->focus.peak_irradiance);
		beam_space(&st->x, el->val[K_LENGTH]);
		beam_space(&st->y, el->val[K_LENGTH]);
		st->z += el->val[K_LENGTH];
	}
}

/* A branch has ended: what is left either went into its terminator or
 * leaves the bench. */
static void
branch_end(struct trace *t, const struct cursor *c, const struct trace_row *prev)
{
	const struct element *last = c->br->n ? &c->br->el[c->br->n - 1] : c->parent;

	if (c->br->n && model_type_is_terminator(last->type)) {
		/* a beam must end in a dump rated for it (the usual caution) */
		/* the terminator, having no side port, is the row just made */
		if (last->type == EL_DUMP && !model_has(last, K_MAX_POWER) &&
		    prev != NULL && prev->el == last && prev->power_in > 0)
			warn(t, TW_UNRATED_DUMP, c, last, prev->power_in);
		return;
	}
	if (c->st.s[0] > 0) {
		warn(t, TW_UNTERMINATED, c, last, c->st.s[0]);
		t->leaving += c->st.s[0];
	}
}

/* The first result of a row that is not a finite number, or NULL.
 * Results that are NAN by design (fluence on CW, B-integral without n2)
 * are left out. */
static const char *
row_nonfinite(const struct bench *b, const struct trace_row *r)
{
	/* The common case in one test: an infinite or NaN term makes the sum
	 * infinite or NaN, so a finite sum means every term is finite (a sum
	 * that overflows from finite terms takes the exact checks below, which
	 * find nothing); summed in pairs, not in a chain of additions */
	double f = ((r->z + r->stokes[0]) + (r->stokes[1] + r->stokes[2])) +
	    ((r->stokes[3] + r->power_in) + (r->power_out + r->power_lost)) +
	    ((r->wx + r->wy) + (r->irradiance + r->peak_irradiance)) +
	    ((r->linear_density + r->field) + r->b_total);

	if (isfinite(f) && !isinf(r->b_integral) && !r->has_focus &&
	    (!b->src.pulsed || isfinite(r->fluence + r->peak_power)) &&
	    !(damage_rated(&r->limits) && !isfinite(r->ratio)))
		return NULL;
	if (!isfinite(r->z))
		return "position";
	for (int i = 0; i < 4; i++)
		if (!isfinite(r->stokes[i]))
			return "polarization";
	if (!isfinite(r->power_in) || !isfinite(r->power_out) || !isfinite(r->power_lost))
		return "power";
	if (!isfinite(r->wx) || !isfinite(r->wy))
		return "beam radius";
	if (!isfinite(r->irradiance) || !isfinite(r->peak_irradiance) ||
	    !isfinite(r->linear_density) || !isfinite(r->field))
		return "irradiance";
	if (b->src.pulsed && (!isfinite(r->fluence) || !isfinite(r->peak_power)))
		return "fluence";
	if (!isfinite(r->b_total) || isinf(r->b_integral))
		return "B-integral";
	if (damage_rated(&r->limits) && !isfinite(r->ratio))
		return "damage ratio";
	if (r->has_focus && (!isfinite(r->focus.z) || !isfinite(r->focus.wx) ||
	    !isfinite(r->focus.wy) || !isfinite(r->focus.peak_irradiance)))
		return "focus";
	return NULL;
}

int
trace_check(const struct trace *t, char **cause)
{
	if (t->ghosts != NULL && t->ghosts->refused)
		return fail_with(cause, "its surface reflections would take about %.2g "
		    "ghost-element visits, more than the %.0e this program allows (hours of "
		    "work and memory); trace it with --no-ghosts for the main beam alone, or "
		    "tilt glass past ghost_tilt so that its reflections leave as strays",
		    t->ghosts->work, GHOST_WORK_LIMIT);
	if (t->nonfinite == NULL)
		return 0;
	return fail_with(cause, "element '%s': the trace gives no finite %s there "
	    "(values at the edges of their ranges multiply beyond what can be "
	    "computed); check this element and the source", t->nonfinite->id,
	    t->nonfinite_what);
}

struct trace *
trace_run(const struct bench *b)
{
	return trace_rerun(NULL, b);
}

struct trace *
trace_rerun(struct trace *t, const struct bench *b)
{
	return trace_rerun_opts(t, b, 0);
}

static struct trace *trace_walk(struct trace *, const struct bench *, unsigned opts,
    trace_row_fn *fn, void *arg);

struct trace *
trace_rerun_opts(struct trace *t, const struct bench *b, unsigned opts)
{
	return trace_walk(t, b, opts, NULL, NULL);
}

#define TRACE_STREAM 0x100u     /* trace_walk: rows handed out, not kept */

struct trace *
trace_stream(struct trace *t, const struct bench *b, trace_row_fn *fn, void *arg)
{
	return trace_walk(t, b, TRACE_STREAM | TRACE_NO_GHOSTS, fn, arg);
}

static struct trace *
trace_walk(struct trace *t, const struct bench *b, unsigned opts, trace_row_fn *fn,
    void *arg)
{
	/* a side branch in a side branch is rare: the C stack holds the
	 * first levels, the heap takes deeper nesting (no allocation per
	 * trace of an ordinary bench) */
	struct cursor local[16], *stack = local;
	size_t top = 0, cap = sizeof local / sizeof *local, nrow = 0;
	double inv_sf = 1 / b->safety_factor;
	int stream;

	if (t == NULL)
		t = atomic_exchange(&spare, NULL);
	if (t == NULL)
		t = xcalloc(1, sizeof *t);
	t->bench = b;
	t->nrows = model_count(&b->path);
	/* streamed: two rows in turn, the one being made and the one before
	 * (branch_end reads it) */
	stream = (opts & TRACE_STREAM) != 0;
	if ((stream ? 2 : t->nrows) > t->caprows || t->rows == NULL) {
		/* every row is filled whole by visit(): no need to zero them */
		free(t->rows);
		t->caprows = stream ? 2 : t->nrows ? t->nrows : 1;
		t->rows = xmalloc(t->caprows * sizeof *t->rows);
	}
	t->nwarn = 0;
	t->absorbed = t->leaving = 0;
	t->worst = -1;
	t->worst_el = NULL;
	t->worst_ratio = NAN;
	t->safe_source_power = NAN;
	t->nonfinite = NULL;
	t->nonfinite_what = NULL;
	ghost_recycle(t);
	memset(&stack[0], 0, sizeof stack[0]);
	stack[0].br = &b->path;
	start_state(b, &stack[0].st);
	top = 1;
	while (top > 0) {
		struct cursor *c = &stack[top - 1];
		struct state side;
		const struct element *el;
		struct trace_row *row;

		if (c->i >= c->br->n) {
			branch_end(t, c, nrow > 0 ? &t->rows[stream ? (nrow - 1) & 1 : nrow - 1] : NULL);
			top--;
			continue;
		}
		el = &c->br->el[c->i];
		row = &t->rows[stream ? nrow & 1 : nrow];
		nrow++;
		visit(t, c, row, &c->st, &side, (unsigned)(top - 1), inv_sf);
		{
			/* never NaN read as safe: a rated element without a
			 * finite ratio is over, and the trace says where */
			const char *bad = row_nonfinite(b, row);

			if (bad != NULL && t->nonfinite == NULL) {
				t->nonfinite = el;
				t->nonfinite_what = bad;
			}
			if (damage_rated(&row->limits) && !isfinite(row->ratio)) {
				row->ratio = INFINITY;
				row->status = STATUS_OVER;
			}
		}
		t->absorbed += row->power_lost;
		if (!isnan(row->ratio) && (t->worst < 0 || row->ratio > t->worst_ratio)) {
			t->worst = (long)nrow - 1;
			t->worst_el = el;
			t->worst_ratio = row->ratio;
		}
		if (fn != NULL)
			fn(arg, t, row);
		c->i++;
		if (el->side_port != PORT_NONE) {
			if (top == cap) {
				cap *= 2;
				if (stack == local) {
					stack = xreallocarray(NULL, cap, sizeof *stack);
					memcpy(stack, local, sizeof local);
				} else {
					stack = xreallocarray(stack, cap, sizeof *stack);
				}
				c = &stack[top - 1];
			}
			stack[top].br = &el->side;
			stack[top].i = 0;
			stack[top].parent = el;
			stack[top].port = el->side_port;
			stack[top].st = side;
			top++;
		}
	}
	if (stack != local)
		free(stack);
	/* A worst ratio of 0 (rated, but no power reaches it) allows any power. */
	if (t->worst >= 0)
		t->safe_source_power = t->worst_ratio > 0 ?
		    b->src.power / (b->safety_factor * t->worst_ratio) : INFINITY;
	if (!(opts & TRACE_NO_GHOSTS))
		/* adds the reflections and rates them */
		ghost_run(t, (opts & TRACE_GHOST_ROWS ? GHOST_ROWS : 0) |
		    (opts & TRACE_LEAN ? GHOST_LEAN : 0));
	return t;
}

void
trace_add_ghosts(struct trace *t, unsigned opts)
{
	if (t->ghosts == NULL)
		ghost_run(t, opts & TRACE_GHOST_ROWS ? GHOST_ROWS : 0);
}

static void
trace_release(struct trace *t)
{
	if (t == NULL)
		return;
	free(t->rows);
	free(t->warn);
	ghost_set_free(t->ghosts);
	ghost_scratch_free(t->gscratch);
	free(t);
}

/* The last result freed is kept (its rows and warnings, and the ghost
 * engine's buffers emptied) for the next fresh trace: a 10^5-element result is larger
 * than the C library hands back without fresh pages, and a fresh result
 * then cost 2.7 times a reused one in page faults (issue #12).  One for
 * the whole process, swapped atomically (the tolerance run traces from
 * several threads); the one it displaces is freed. */
void
trace_free(struct trace *t)
{
	if (t == NULL)
		return;
	ghost_recycle(t);
	trace_release(atomic_exchange(&spare, t));
}

void
trace_radius_at(const struct trace *t, const struct trace_row *row, double dz,
    double *wx, double *wy)
{
	struct beam_axis x = row->qx, y = row->qy;

	beam_space(&x, dz);
	beam_space(&y, dz);
	*wx = beam_radius(&x, t->bench->src.wavelength);
	*wy = beam_radius(&y, t->bench->src.wavelength);
}
