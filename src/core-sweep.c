/* core-sweep.c - sweeping one knob: each step is the one value set in place
 * and a rerun of the same trace result; crossings and the ends of safe
 * intervals are refined by bisection between the two steps that bracket
 * them, to 1e-6 of the range. */
#include <config.h>

#include <math.h>
#include <stdint.h>
#include <stdlib.h>
#include <string.h>

#include "core-sweep.h"
#include "util-err.h"

static const struct {
	const char     *name;
	enum sweep_src  src;
	enum unit_dim   dim;
} src_knobs[] = {
	{ "power", SRC_POWER, DIM_POWER }, { "pulse_energy", SRC_PULSE_ENERGY, DIM_ENERGY },
	{ "rep_rate", SRC_REP_RATE, DIM_FREQUENCY }, { "pulse_width", SRC_PULSE_WIDTH, DIM_TIME },
	{ "wavelength", SRC_WAVELENGTH, DIM_LENGTH }, { "waist", SRC_WAIST, DIM_LENGTH },
	{ "waist_position", SRC_WAIST_POSITION, DIM_LENGTH }, { "m2", SRC_M2, DIM_NONE },
	{ "polarization", SRC_POLARIZATION, DIM_NONE },
};

static int
element_knob(struct bench *b, const char *text, const char *end, struct element **el,
    enum model_key *key, char **cause)
{
	size_t n = (size_t)(end - text);
	char *t = xmalloc(n + 1), *dot;
	int k;

	memcpy(t, text, n);
	t[n] = '\0';
	/* the id is the longest prefix before a '.' that names an element */
	*el = NULL;
	for (dot = strrchr(t, '.'); dot != NULL; ) {
		*dot = '\0';
		if ((*el = model_find(b, t, NULL, NULL, NULL)) != NULL)
			break;
		char *prev = strrchr(t, '.');
		*dot = '.';
		dot = prev;
	}
	if (*el == NULL || dot == NULL) {
		dot = strchr(t, '.');
		if (dot == NULL) {
			fail_with(cause, "knob '%s': write ID.KEY or source.KEY", t);
		} else {
			*dot = '\0';
			fail_with(cause, "knob '%s.%s': no element '%s' in the bench", t, dot + 1, t);
		}
		free(t);
		return -1;
	}
	k = model_key_find(dot + 1);
	if (k < 0 || !model_key_applies((enum model_key)k, (*el)->type)) {
		fail_with(cause, "knob '%s.%s': a %s has no key '%s'", t, dot + 1,
		    model_type_name((*el)->type), dot + 1);
		free(t);
		return -1;
	}
	if (model_keys[k].kind == KIND_BOOL || model_keys[k].kind == KIND_AXIS ||
	    model_keys[k].kind == KIND_SURFACE) {
		fail_with(cause, "knob '%s.%s': %s is not a number, it cannot be swept",
		    t, dot + 1, dot + 1);
		free(t);
		return -1;
	}
	if (k == K_FOCAL && (model_has(*el, K_R1) || model_has(*el, K_R2))) {
		/* the trace takes such a lens by its radii: a swept focal
		 * would change nothing but the check */
		fail_with(cause, "knob '%s.focal': %s is given by r1/r2 as well, and the "
		    "trace uses the radii (focal only checks them): sweep %s.r1 or %s.r2",
		    t, t, t, t);
		free(t);
		return -1;
	}
	*key = (enum model_key)k;
	free(t);
	return 0;
}

int
sweep_knob_parse(struct bench *b, const char *text, struct sweep_knob *k, char **cause)
{
	const char *tilde = strchr(text, '~');

	memset(k, 0, sizeof *k);
	if (strncmp(text, "source.", 7) == 0) {
		for (size_t i = 0; i < sizeof src_knobs / sizeof *src_knobs; i++)
			if (strcmp(text + 7, src_knobs[i].name) == 0) {
				k->src = src_knobs[i].src;
				k->dim = src_knobs[i].dim;
				k->angle = k->src == SRC_POLARIZATION;
			}
		if (k->src == SRC_NONE)
			return fail_with(cause, "knob '%s': the source has no number '%s' "
			    "(power, pulse_energy, rep_rate, pulse_width, wavelength, waist, "
			    "waist_position, m2, polarization)", text, text + 7);
		if (!b->src.pulsed && (k->src == SRC_PULSE_ENERGY || k->src == SRC_REP_RATE ||
		    k->src == SRC_PULSE_WIDTH))
			return fail_with(cause, "knob '%s': the source is CW", text);
		if (k->src == SRC_POLARIZATION && b->src.pol != POL_LINEAR)
			return fail_with(cause, "knob '%s': the source is not linearly polarized",
			    text);
	} else {
		if (element_knob(b, text, tilde != NULL ? tilde : text + strlen(text),
		    &k->el, &k->key, cause) != 0)
			return -1;
		if (tilde != NULL) {
			enum model_key k2;

			if (element_knob(b, tilde + 1, tilde + 1 + strlen(tilde + 1), &k->el2,
			    &k2, cause) != 0)
				return -1;
			if (k->key != K_LENGTH || k2 != K_LENGTH || k->el == k->el2)
				return fail_with(cause, "knob '%s': a rail is ID1.length~ID2.length, "
				    "two different gaps", text);
			k->total = model_get(k->el, K_LENGTH) + model_get(k->el2, K_LENGTH);
		}
		k->dim = model_keys[k->key].dim;
		k->angle = model_keys[k->key].kind == KIND_ANGLE;
	}
	k->text = xstrdup(text);
	k->base = sweep_knob_get(k, b);
	return 0;
}

void
sweep_knob_release(struct sweep_knob *k)
{
	free(k->text);
	k->text = NULL;
}

int
sweep_knob_value(const struct sweep_knob *k, const char *text, double *v, char **cause)
{
	char *end, *why = NULL;

	if (k->dim != DIM_NONE) {
		if (units_parse(text, k->dim, v, &why) != 0) {
			fail_with(cause, "knob '%s': '%s': %s", k->text, text, why);
			free(why);
			return -1;
		}
		return 0;
	}
	*v = strtod(text, &end);
	while (*end == ' ')
		end++;
	if (end == text || *end != '\0' || !isfinite(*v))
		return fail_with(cause, "knob '%s': '%s' is not a number%s", k->text, text,
		    k->angle ? " (degrees)" : "");
	return 0;
}

double
sweep_knob_get(const struct sweep_knob *k, const struct bench *b)
{
	const struct source *s = &b->src;

	switch (k->src) {
	case SRC_POWER:		return s->power;
	case SRC_PULSE_ENERGY:	return s->pulse_energy;
	case SRC_REP_RATE:	return s->rep_rate;
	case SRC_PULSE_WIDTH:	return s->pulse_width;
	case SRC_WAVELENGTH:	return s->wavelength;
	case SRC_WAIST:		return s->waist[0];
	case SRC_WAIST_POSITION: return s->waist_position;
	case SRC_M2:		return s->m2[0];
	case SRC_POLARIZATION:	return s->pol_angle_deg;
	default:		return model_get(k->el, k->key);
	}
}

/* The same derivations as `set --bench source.*` (core-edit.c). */
void
sweep_knob_set(const struct sweep_knob *k, struct bench *b, double v)
{
	struct source *s = &b->src;

	switch (k->src) {
	case SRC_POWER:
		s->power = v;
		s->energy_given = 0;
		if (s->pulsed)
			s->pulse_energy = v / s->rep_rate;
		break;
	case SRC_PULSE_ENERGY:
		s->pulse_energy = v;
		s->energy_given = 1;
		s->power = v * s->rep_rate;
		break;
	case SRC_REP_RATE:
		s->rep_rate = v;
		if (s->energy_given)
			s->power = s->pulse_energy * v;
		else
			s->pulse_energy = s->power / v;
		break;
	case SRC_PULSE_WIDTH:	s->pulse_width = v; break;
	case SRC_WAVELENGTH:
	case SRC_WAIST:
		if (k->src == SRC_WAVELENGTH)
			s->wavelength = v;
		else
			s->waist[0] = s->waist[1] = v;
		/* a measured divergence gives the M² of this waist and
		 * wavelength (end_check has refused an end below 1; M² is
		 * monotonic in both, so no step between is) */
		(void)model_source_m2_from_divergence(s, NULL);
		break;
	case SRC_WAIST_POSITION: s->waist_position = v; break;
	case SRC_M2:
		s->m2[0] = s->m2[1] = v;
		s->divergence_given = 0;    /* a swept M² replaces a measured divergence */
		break;
	case SRC_POLARIZATION:	s->pol_angle_deg = v; break;
	default:
		k->el->val[k->key] = v;
		k->el->set |= KEY_BIT(k->key);
		if (k->el2 != NULL) {
			k->el2->val[K_LENGTH] = k->total - v;
			k->el2->set |= KEY_BIT(K_LENGTH);
		}
		break;
	}
}

/* The bench at one end of the range: the value goes through the key's own
 * check (range, nonzero) and the whole bench through model_validate. */
/* What a knob touches, to put back exactly (a default stays a default, a
 * pulse energy stays the value given). */
struct saved {
	struct source src;
	uint64_t      set[2];
	double        val[2];
};

static void
save(struct saved *sv, const struct sweep_knob *k, const struct bench *b)
{
	memset(sv, 0, sizeof *sv);
	sv->src = b->src;
	if (k->el != NULL) {
		sv->set[0] = k->el->set;
		sv->val[0] = k->el->val[k->key];
	}
	if (k->el2 != NULL) {
		sv->set[1] = k->el2->set;
		sv->val[1] = k->el2->val[K_LENGTH];
	}
}

static void
restore(const struct saved *sv, const struct sweep_knob *k, struct bench *b)
{
	b->src = sv->src;
	if (k->el != NULL) {
		k->el->set = sv->set[0];
		k->el->val[k->key] = sv->val[0];
	}
	if (k->el2 != NULL) {
		k->el2->set = sv->set[1];
		k->el2->val[K_LENGTH] = sv->val[1];
	}
}

static int
end_check(struct bench *b, const struct sweep_knob *k, double v, const char *which,
    char **cause)
{
	struct saved sv;
	struct element tmp;
	char shown[64];
	int rc = 0;

	units_format(shown, sizeof shown, v, k->dim, 6, 0);
	if (k->src == SRC_NONE) {
		model_element_copy(&tmp, k->el);
		rc = model_set(&tmp, k->key, v, cause);
		model_element_release(&tmp);
		if (rc == 0 && k->el2 != NULL && k->total - v < 0)
			rc = fail_with(cause, "knob '%s': %s %s leaves %s a negative length",
			    k->text, which, shown, k->el2->id);
	}
	if (rc == 0) {
		save(&sv, k, b);
		sweep_knob_set(k, b, v);
		/* says which divergence, waist and wavelength give M² below 1 */
		rc = model_source_m2_from_divergence(&b->src, cause);
		if (rc == 0)
			rc = model_validate(b, cause);
		restore(&sv, k, b);
	}
	if (rc != 0)
		cause_prefix(cause, "sweep %s at %s %s", k->text, which, shown);
	return rc;
}

/* ---- the run ---- */

struct ctx {
	struct bench             *b;
	const struct sweep_knob  *k;
	struct trace             *t;
	const struct sweep       *sw;
	unsigned                  opts;     /* trace_rerun_opts: lean, maybe no ghosts */
};

/* Highest status at x: of one rated element (r >= 0) or of all. */
static enum damage_status
status_at(struct ctx *c, double x, long r)
{
	enum damage_status st = STATUS_UNRATED;

	sweep_knob_set(c->k, c->b, x);
	c->t = trace_rerun_opts(c->t, c->b, c->opts);
	for (size_t i = 0; i < c->sw->nrated; i++) {
		enum damage_status s;

		if (r >= 0 && (size_t)r != i)
			continue;
		s = c->t->rows[c->sw->rated[i].row].status;
		if (s > st)
			st = s;
	}
	return st;
}

/* The boundary between a (where the level is reached or not: `at_a`) and b
 * (the other), to the sweep's tolerance. */
static double
bisect(struct ctx *c, double a, double b, long r, enum damage_status level)
{
	int at_a = status_at(c, a, r) >= level;

	while (fabs(b - a) > c->sw->tol) {
		double m = 0.5 * (a + b);

		if ((status_at(c, m, r) >= level) == at_a)
			a = m;
		else
			b = m;
	}
	return 0.5 * (a + b);
}

static void
intervals(struct ctx *c, struct sweep *sw, enum damage_status level,
    struct sweep_interval **out, size_t *nout)
{
	size_t n = sw->nsteps;

	*out = NULL;
	*nout = 0;
	for (size_t i = 0; i < n; ) {
		size_t j;

		if (sw->status[i] >= level) {
			i++;
			continue;
		}
		for (j = i; j + 1 < n && sw->status[j + 1] < level; j++)
			;
		*out = xreallocarray(*out, *nout + 1, sizeof **out);
		(*out)[*nout].lo = i == 0 ? sw->x[0] : bisect(c, sw->x[i - 1], sw->x[i], -1, level);
		(*out)[*nout].hi = j == n - 1 ? sw->x[n - 1] :
		    bisect(c, sw->x[j], sw->x[j + 1], -1, level);
		(*nout)++;
		i = j + 1;
	}
}

static void
record_step(struct sweep *sw, size_t s, const struct trace *t)
{
	double best = -1;

	sw->worst[s] = -1;
	sw->status[s] = STATUS_UNRATED;
	for (size_t i = 0; i < sw->nrated; i++) {
		const struct trace_row *r = &t->rows[sw->rated[i].row];

		sw->ratio[s * sw->nrated + i] = r->ratio;
		if (!isnan(r->ratio) && r->ratio > best) {
			best = r->ratio;
			sw->worst[s] = (long)i;
		}
		if (r->status > sw->status[s])
			sw->status[s] = r->status;
	}
	for (size_t i = 0, j = 0; i < t->nrows; i++)
		if (model_type_is_terminator(t->rows[i].el->type))
			sw->term_power[s * sw->nterm + j++] = t->rows[i].power_in;
	sw->unterminated[s] = sw->breakdown[s] = 0;
	for (size_t i = 0; i < t->nwarn; i++) {
		if (t->warn[i].kind == TW_UNTERMINATED)
			sw->unterminated[s] = 1;
		if (t->warn[i].kind == TW_AIR_BREAKDOWN)
			sw->breakdown[s] = 1;
	}
	if (sw->status[s] == STATUS_OVER)
		sw->any_over = 1;
}

static void
setup(struct sweep *sw, const struct trace *t)
{
	for (size_t i = 0; i < t->nrows; i++) {
		if (damage_rated(&t->rows[i].limits)) {
			sw->rated = xreallocarray(sw->rated, sw->nrated + 1, sizeof *sw->rated);
			sw->rated[sw->nrated].row = i;
			sw->rated[sw->nrated].id = t->rows[i].el->id;
			sw->rated[sw->nrated].caution = sw->rated[sw->nrated].over = NAN;
			sw->nrated++;
		}
		if (model_type_is_terminator(t->rows[i].el->type)) {
			sw->term_id = xreallocarray(sw->term_id, sw->nterm + 1, sizeof *sw->term_id);
			sw->term_id[sw->nterm++] = t->rows[i].el->id;
		}
	}
	sw->ratio = xcalloc(sw->nsteps * (sw->nrated ? sw->nrated : 1), sizeof *sw->ratio);
	sw->term_power = xcalloc(sw->nsteps * (sw->nterm ? sw->nterm : 1), sizeof *sw->term_power);
	sw->worst = xcalloc(sw->nsteps, sizeof *sw->worst);
	sw->status = xcalloc(sw->nsteps, sizeof *sw->status);
	sw->unterminated = xcalloc(sw->nsteps, 1);
	sw->breakdown = xcalloc(sw->nsteps, 1);
}

struct sweep *
sweep_run(struct bench *b, const struct sweep_knob *k, double from, double to,
    size_t steps, unsigned flags, char **cause)
{
	int log = (flags & SWEEP_LOG) != 0;
	struct sweep *sw;
	struct saved saved;
	struct ctx c;

	if (steps < 2) {
		fail_with(cause, "sweep %s: --steps %zu: at least 2 steps", k->text, steps);
		return NULL;
	}
	if (from == to || !isfinite(from) || !isfinite(to)) {
		fail_with(cause, "sweep %s: FROM and TO must be two different finite values",
		    k->text);
		return NULL;
	}
	if (log && !(from * to > 0)) {
		fail_with(cause, "sweep %s: a log sweep needs both ends nonzero and of one "
		    "sign (it cannot pass through zero)", k->text);
		return NULL;
	}
	if (model_keys[k->key].nonzero && k->src == SRC_NONE && !(from * to > 0)) {
		fail_with(cause, "sweep %s: the range passes through 0, which %s does not take",
		    k->text, model_key_path(k->key));
		return NULL;
	}
	if (end_check(b, k, from, "FROM", cause) != 0 || end_check(b, k, to, "TO", cause) != 0)
		return NULL;
	save(&saved, k, b);
	sw = xcalloc(1, sizeof *sw);
	sw->nsteps = steps;
	sw->tol = 1e-6 * fabs(to - from);
	sw->x = xcalloc(steps, sizeof *sw->x);
	for (size_t i = 0; i < steps; i++) {
		double f = (double)i / (double)(steps - 1);

		sw->x[i] = log ? from * pow(to / from, f) : from + (to - from) * f;
	}
	sw->x[steps - 1] = to;
	c.b = b;
	c.k = k;
	c.sw = sw;
	sweep_knob_set(k, b, sw->x[0]);
	/* every step reads ratings and warnings only */
	c.opts = TRACE_LEAN | (flags & SWEEP_NO_GHOSTS ? TRACE_NO_GHOSTS : 0);
	c.t = trace_rerun_opts(NULL, b, c.opts);
	setup(sw, c.t);
	for (size_t s = 0; s < steps; s++) {
		if (s > 0) {
			sweep_knob_set(k, b, sw->x[s]);
			c.t = trace_rerun_opts(c.t, b, c.opts);
		}
		/* reflections beyond the bound (a tilt knob can bring them):
		 * never a silent main-beam-only step */
		if (trace_check(c.t, cause) != 0) {
			cause_prefix(cause, "sweep %s at step %zu", k->text, s + 1);
			restore(&saved, k, b);
			trace_free(c.t);
			sweep_free(sw);
			return NULL;
		}
		record_step(sw, s, c.t);
	}
	for (size_t i = 0; i < sw->nrated; i++) {
		enum damage_status lv[2] = { STATUS_CAUTION, STATUS_OVER };

		for (int l = 0; l < 2; l++) {
			double *at = l ? &sw->rated[i].over : &sw->rated[i].caution;

			for (size_t s = 0; s < steps; s++) {
				if (damage_status_of(sw->ratio[s * sw->nrated + i],
				    b->safety_factor) < lv[l])
					continue;
				*at = s == 0 ? sw->x[0] :
				    bisect(&c, sw->x[s - 1], sw->x[s], (long)i, lv[l]);
				break;
			}
		}
	}
	intervals(&c, sw, STATUS_OVER, &sw->safe, &sw->nsafe);
	intervals(&c, sw, STATUS_CAUTION, &sw->calm, &sw->ncalm);
	restore(&saved, k, b);
	trace_free(c.t);
	return sw;
}

void
sweep_free(struct sweep *sw)
{
	if (sw == NULL)
		return;
	free(sw->x);
	free(sw->rated);
	free(sw->ratio);
	free(sw->worst);
	free(sw->status);
	free(sw->term_id);
	free(sw->term_power);
	free(sw->unterminated);
	free(sw->breakdown);
	free(sw->safe);
	free(sw->calm);
	free(sw);
}

/* ---- the plot ---- */

void
sweep_plot_layout(const struct sweep *sw, double sf, size_t w, size_t h, size_t nseries,
    struct sweep_plot *p)
{
	double peak[64];
	size_t nr = sw->nrated < 64 ? sw->nrated : 64;

	memset(p, 0, sizeof *p);
	p->w = w;
	p->h = h;
	p->cell = xcalloc(w * h > 0 ? w * h : 1, 1);
	if (nseries > 8)
		nseries = 8;
	/* the series: the elements with the highest peak ratio */
	for (size_t i = 0; i < nr; i++) {
		peak[i] = -1;
		for (size_t s = 0; s < sw->nsteps; s++) {
			double r = sw->ratio[s * sw->nrated + i];

			if (!isnan(r) && r > peak[i])
				peak[i] = r;
		}
	}
	p->ymax = 1.25;
	while (p->nseries < nseries) {
		long best = -1;

		for (size_t i = 0; i < nr; i++)
			if (peak[i] >= 0 && (best < 0 || peak[i] > peak[best]))
				best = (long)i;
		if (best < 0)
			break;
		p->series[p->nseries++] = (size_t)best;
		if (peak[best] * 1.05 > p->ymax)
			p->ymax = peak[best] * 1.05;
		peak[best] = -1;
	}
	if (w < 2 || h < 2)
		return;
	for (int l = 0; l < 2; l++) {
		double y = l ? 1 : 1 / sf;
		long row = lround((1 - y / p->ymax) * (double)(h - 1));

		if (row >= 0 && (size_t)row < h)
			for (size_t col = 0; col < w; col++)
				p->cell[(size_t)row * w + col] = l ? SWEEP_PLOT_OVER : SWEEP_PLOT_CAUTION;
	}
	for (size_t col = 0; col < w; col++) {
		size_t s = (size_t)lround((double)col * (double)(sw->nsteps - 1) / (double)(w - 1));

		for (size_t q = p->nseries; q-- > 0; ) {
			double r = sw->ratio[s * sw->nrated + p->series[q]];
			long row;

			if (isnan(r))
				continue;
			row = lround((1 - r / p->ymax) * (double)(h - 1));
			if (row < 0)
				row = 0;
			if ((size_t)row >= h)
				row = (long)h - 1;
			p->cell[(size_t)row * w + col] = (unsigned char)(1 + q);
		}
	}
}

void
sweep_plot_release(struct sweep_plot *p)
{
	free(p->cell);
	p->cell = NULL;
}
