/* core-layout-margin.c - what the workbench's frame says about the bench as
 * a whole, decided without curses: the list of hazards (every trace warning,
 * whatever its kind, plus the rows over or at caution and the unrated
 * optics that take power), the margin line, the header's beam summary, the
 * standing caution line, the one-line derivation of a damage limit, and
 * the operating point shown (its words, the next one, an override typed
 * while it is shown).
 * Split from core-layout.c; see core-layout.h.  Owned by the workbench. */
#include <config.h>

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "core-ghost.h"
#include "core-layout.h"
#include "core-point.h"
#include "util-err.h"

/* ---- hazards ---- */

/* An optic with no rating that takes power: not a space (a gap in air has
 * nothing to damage).  The level is "any power at all" (1 µW), so that a
 * forgotten rating never hides behind a small beam; the trace's own
 * warnings about unrated absorbers come on top of it. */
#define UNRATED_MIN_POWER 1e-6

static int
is_unrated_optic(const struct trace_row *r)
{
	return r->el->type != EL_SPACE && r->status == STATUS_UNRATED &&
	    r->power_in >= UNRATED_MIN_POWER;
}

/* A warning kind that already says "this absorber has no rating" (today
 * unrated_dump; any later kind whose name says unrated). */
static int
warn_is_unrated(enum trace_warn_kind k)
{
	return strstr(trace_warn_name(k), "unrated") != NULL;
}

static void
hz_push(struct layout_hazard **v, size_t *n, struct layout_hazard h)
{
	*v = xreallocarray(*v, *n + 1, sizeof **v);
	(*v)[(*n)++] = h;
}

size_t
layout_hazards(const struct trace *t, struct layout_hazard **out)
{
	struct layout_hazard *v = NULL;
	size_t n = 0;

	for (size_t i = 0; i < t->nrows; i++)
		if (t->rows[i].status == STATUS_OVER)
			hz_push(&v, &n, (struct layout_hazard){ LH_OVER, (long)i, NULL, t->rows[i].el });
	for (size_t i = 0; i < t->nwarn; i++)
		hz_push(&v, &n, (struct layout_hazard){ LH_WARNING, -1, &t->warn[i], t->warn[i].after });
	for (size_t i = 0; i < t->nrows; i++)
		if (t->rows[i].status == STATUS_CAUTION)
			hz_push(&v, &n, (struct layout_hazard){ LH_CAUTION, (long)i, NULL, t->rows[i].el });
	for (size_t i = 0; i < t->nrows; i++) {
		int told = 0;

		if (!is_unrated_optic(&t->rows[i]))
			continue;
		for (size_t k = 0; k < t->nwarn && !told; k++)
			told = warn_is_unrated(t->warn[k].kind) && t->warn[k].after == t->rows[i].el;
		if (!told)
			hz_push(&v, &n, (struct layout_hazard){ LH_UNRATED, (long)i, NULL, t->rows[i].el });
	}
	/* the row of a warning, for the screen's jump */
	for (size_t k = 0; k < n; k++)
		if (v[k].kind == LH_WARNING && v[k].el != NULL)
			for (size_t i = 0; i < t->nrows; i++)
				if (t->rows[i].el == v[k].el) {
					v[k].row = (long)i;
					break;
				}
	*out = v;
	return n;
}

const char *
layout_hazard_word(const struct layout_hazard *h)
{
	if (h->kind == LH_OVER)
		return "over";
	if (h->kind == LH_CAUTION)
		return "caution";
	if (h->kind == LH_UNRATED)
		return "unrated";
	switch (h->warn->kind) {
	case TW_AIR_BREAKDOWN:	return "spark";
	case TW_UNTERMINATED:	return "unterminated";
	case TW_SELF_FOCUSING:	return "self-focusing";
	case TW_B_INTEGRAL:	return "B-integral";
	default:
		/* a kind added later keeps its own name */
		return warn_is_unrated(h->warn->kind) ? "unrated" : trace_warn_name(h->warn->kind);
	}
}

int
layout_row_hazard(const struct trace *t, size_t row)
{
	const struct trace_row *r = &t->rows[row];

	if (r->status >= STATUS_CAUTION || is_unrated_optic(r) ||
	    (r->flags & (TF_AIR_BREAKDOWN | TF_SELF_FOCUSING)))
		return 1;
	for (size_t k = 0; k < t->nwarn; k++)
		if (t->warn[k].after == r->el && t->warn[k].kind != TW_UNTERMINATED)
			return 1;
	return 0;
}

/* "8 hazards: 1 over, 1 spark, ..." counted by word, in first-seen order. */
static void
hazard_counts(struct buf *b, const struct layout_hazard *h, size_t n, int detail)
{
	const char *words[32];
	size_t counts[32], nw = 0;

	if (n == 0) {
		buf_add(b, "no hazards");
		return;
	}
	buf_printf(b, "%zu hazard%s", n, n == 1 ? "" : "s");
	if (!detail)
		return;
	for (size_t i = 0; i < n; i++) {
		const char *w = layout_hazard_word(&h[i]);
		size_t k;

		for (k = 0; k < nw; k++)
			if (strcmp(words[k], w) == 0)
				break;
		if (k == nw && nw < 32) {
			words[nw] = w;
			counts[nw++] = 0;
		}
		if (k < nw)
			counts[k]++;
	}
	buf_add(b, ":");
	for (size_t k = 0; k < nw; k++)
		buf_printf(b, "%s %zu %s", k ? "," : "", counts[k], words[k]);
}

void
layout_headroom(char *buf, size_t n, double ratio, int ascii)
{
	const char *x = ascii ? "x" : "\u00d7";

	if (isnan(ratio))
		snprintf(buf, n, "-");
	else if (!(ratio > 0))
		snprintf(buf, n, "%s%s", x, ascii ? "inf" : "\u221e");
	else if (1 / ratio >= 100)
		snprintf(buf, n, "%s%.0f", x, 1 / ratio);
	else
		snprintf(buf, n, "%s%.3g", x, 1 / ratio);
}

/* One form of the margin line; a higher level is shorter. */
static char *
margin_text(const struct trace *t, const struct layout_hazard *h, size_t nh, int ascii,
    int level, int quiet, const char *tail)
{
	const char *sep = level >= 1 ? (ascii ? " | " : " \u2502 ") :
	    (ascii ? "  |  " : "  \u2502  ");
	struct buf b;
	char pct[32], v[48], hr[32];

	buf_init(&b);
	if (t->worst >= 0) {
		const struct trace_row *w = &t->rows[t->worst];

		layout_percent(pct, sizeof pct, t->worst_ratio);
		layout_headroom(hr, sizeof hr, t->worst_ratio, ascii);
		buf_printf(&b, "%s%s %s %s", level < 4 ? "worst: " : "", w->el->id, pct,
		    layout_status_word(w->status));
		if (level < 3)
			buf_printf(&b, ", headroom %s", hr);
		else if (level < 6)
			buf_printf(&b, " %s", hr);
	} else {
		buf_add(&b, "worst: nothing rated");
	}
	buf_add(&b, sep);
	if (isinf(t->safe_source_power)) {
		buf_add(&b, "safe source power: no limit");
	} else if (isfinite(t->safe_source_power)) {
		units_format(v, sizeof v, t->safe_source_power, DIM_POWER, 3, ascii);
		buf_printf(&b, "safe source power %s", v);
	} else {
		buf_add(&b, "safe source power: no ratings");
	}
	buf_add(&b, sep);
	hazard_counts(&b, h, nh, level < 2);
	if (t->ghosts != NULL) {
		/* surface reflections: ghosts over and strays to block, said in
		 * every step (shorter in the later ones); nothing to say is said
		 * only while there is room */
		size_t over = t->ghosts->nover, block = layout_strays_to_block(t);

		if (over > 0 || block > 0) {
			buf_add(&b, sep);
			if (level < 2)
				buf_printf(&b, "reflections: %zu ghost%s over, %zu stra%s to block", over,
				    over == 1 ? "" : "s", block, block == 1 ? "y" : "ys");
			else if (over > 0 && block > 0)
				buf_printf(&b, "%zu ghost%s over, %zu stra%s%s", over, over == 1 ? "" : "s",
				    block, block == 1 ? "y" : "ys", level < 3 ? " to block" : "");
			else if (over > 0)
				buf_printf(&b, "%zu ghost%s over", over, over == 1 ? "" : "s");
			else
				buf_printf(&b, "%zu stra%s%s", block, block == 1 ? "y" : "ys",
				    level < 3 ? " to block" : "");
		} else if (!quiet) {
			buf_add(&b, sep);
			buf_add(&b, "reflections: no ghost over, no stray to block");
		}
	}
	if (tail != NULL && tail[0] != '\0' && level < 5) {
		buf_add(&b, sep);
		buf_add(&b, tail);
	}
	return buf_take(&b);
}

char *
layout_margin_line(const struct trace *t, int ascii, int width, const char *tail)
{
	struct layout_hazard *h;
	size_t nh = layout_hazards(t, &h);

	/* at each step first with "no ghost over, no stray to block" (only in
	 * the first two), then without: saying nothing never costs the rest */
	for (int level = 0;; level++)
		for (int quiet = level >= 2; quiet < 2; quiet++) {
			char *s = margin_text(t, h, nh, ascii, level, quiet, tail);

			if ((level == 6 && quiet) || (int)utf8_cols(s) <= width) {
				free(h);
				return s;
			}
			free(s);
		}
}

/* ---- the header and the caution line ---- */

const char *
layout_visibility(double wavelength)
{
	/* IEC 60825-1 takes 400-700 nm as the visible band for the eye's
	 * aversion response (from memory); outside it a beam is invisible. */
	if (wavelength < 400e-9)
		return "invisible (UV)";
	if (wavelength > 700e-9)
		return "invisible (IR)";
	return "visible";
}

char *
layout_beam_summary(const struct bench *b, int ascii)
{
	char *wlt = layout_quantity_text(b->src.wavelength, DIM_LENGTH);
	char wl[48], p[48], e[48], f[48], tau[48];

	/* the wavelength as it would be typed: "532 nm", "1.064 µm" */
	snprintf(wl, sizeof wl, "%s", wlt);
	free(wlt);
	if (ascii) {
		char *x = layout_ascii(wl);

		snprintf(wl, sizeof wl, "%s", x);
		free(x);
	}
	units_format(p, sizeof p, b->src.power, DIM_POWER, 3, ascii);
	if (!b->src.pulsed)
		return xasprintf("%s CW %s", wl, p);
	units_format(e, sizeof e, b->src.pulse_energy, DIM_ENERGY, 3, ascii);
	units_format(f, sizeof f, b->src.rep_rate, DIM_FREQUENCY, 3, ascii);
	units_format(tau, sizeof tau, b->src.pulse_width, DIM_TIME, 3, ascii);
	return xasprintf("%s %s pulsed (%s %s %s, %s)", wl, p, e, ascii ? "x" : "\u00d7", f, tau);
}

char *
layout_join_fit(const char *const *parts, const int *prio, size_t n, const char *sep,
    int width)
{
	unsigned char on[16];
	int maxp = 0;

	if (n > sizeof on)
		n = sizeof on;
	for (size_t i = 0; i < n; i++) {
		on[i] = parts[i] != NULL && parts[i][0] != '\0';
		if (prio[i] > maxp)
			maxp = prio[i];
	}
	for (int cut = maxp;; cut--) {
		struct buf b;

		buf_init(&b);
		for (size_t i = 0; i < n; i++)
			if (on[i] && prio[i] <= cut)
				buf_printf(&b, "%s%s", b.len ? sep : "", parts[i]);
		if ((int)utf8_cols(b.s != NULL ? b.s : "") <= width || cut <= 0)
			return buf_take(&b);
		buf_release(&b);
	}
}

char *
layout_caution_line(const struct bench *b, int ascii, int width)
{
	char wl[48], *beam, *s;
	const char *vis = layout_visibility(b->src.wavelength);
	const char *parts[3];
	static const int prio[3] = { 0, 0, 1 };

	{
		char *t = layout_quantity_text(b->src.wavelength, DIM_LENGTH);
		char *u = ascii ? layout_ascii(t) : xstrdup(t);

		snprintf(wl, sizeof wl, "%s", u);
		free(t);
		free(u);
	}
	beam = xasprintf("%s beam: %s", wl, strcmp(vis, "visible") == 0 ? "visible" : vis);
	parts[0] = "design estimate, not a safety assessment";
	parts[1] = beam;
	parts[2] = strcmp(vis, "visible") == 0 ? "eyewear rated for it" :
	    "eyewear rated for it; the beam cannot be seen";
	s = layout_join_fit(parts, prio, 3, ascii ? " - " : " \u2014 ", width);
	free(beam);
	return s;
}

/* ---- why a limit is what it is ---- */

static const struct {
	int          key;           /* the rating as given */
	const char  *what;          /* the metric the ratio compares */
	enum unit_dim dim;
	int          lambda, tau;   /* scaled by λ, by τ */
} metric_info[LD_NMETRICS] = {
	[LD_CW_LINEAR]     = { K_DMG_CW_LINEAR, "CW linear power density", DIM_LINEAR, 1, 0 },
	[LD_CW_IRRADIANCE] = { K_DMG_CW_IRRADIANCE, "CW irradiance", DIM_IRRADIANCE, 1, 0 },
	[LD_FLUENCE]       = { K_DMG_FLUENCE, "pulse fluence", DIM_FLUENCE, 1, 1 },
	[LD_MAX_POWER]     = { K_MAX_POWER, "power taken", DIM_POWER, 0, 0 },
	[LD_MAX_ABSORBED]  = { K_MAX_ABSORBED, "power absorbed", DIM_POWER, 0, 0 },
};

static double
limit_of(const struct damage_limits *l, enum layout_metric m)
{
	switch (m) {
	case LD_CW_LINEAR:	return l->cw_linear;
	case LD_CW_IRRADIANCE:	return l->cw_irradiance;
	case LD_FLUENCE:	return l->fluence;
	case LD_MAX_POWER:	return l->max_power;
	default:		return l->max_absorbed;
	}
}

/* The ratio of one metric alone, through damage_ratio itself. */
static double
ratio_of(const struct trace_row *r, enum layout_metric m)
{
	struct damage_limits one = { NAN, NAN, NAN, NAN, NAN, 0 };
	struct damage_exposure e = { r->power_in, r->power_lost, r->linear_density,
		r->irradiance, r->fluence };
	double lim = limit_of(&r->limits, m);

	if (isnan(lim))
		return NAN;
	switch (m) {
	case LD_CW_LINEAR:	one.cw_linear = lim; break;
	case LD_CW_IRRADIANCE:	one.cw_irradiance = lim; break;
	case LD_FLUENCE:	one.fluence = lim; break;
	case LD_MAX_POWER:	one.max_power = lim; break;
	default:		one.max_absorbed = lim; break;
	}
	return damage_ratio(&one, &e);
}

int
layout_derive(const struct trace_row *r, const struct bench *b, struct layout_derivation *d)
{
	double best = NAN;

	memset(d, 0, sizeof *d);
	d->metric = LD_NMETRICS;
	if (isnan(r->ratio))
		return -1;
	for (int m = 0; m < LD_NMETRICS; m++) {
		double x = ratio_of(r, (enum layout_metric)m);

		if (!isnan(x) && (isnan(best) || x > best)) {
			best = x;
			d->metric = (enum layout_metric)m;
		}
	}
	if (d->metric == LD_NMETRICS)
		return -1;
	d->key = metric_info[d->metric].key;
	d->what = metric_info[d->metric].what;
	d->dim = metric_info[d->metric].dim;
	d->rating = r->el->val[d->key];
	d->limit = limit_of(&r->limits, d->metric);
	d->lambda_factor = d->tau_factor = 1;
	if (metric_info[d->metric].lambda || metric_info[d->metric].tau) {
		/* the limit with the pulse as rated: what λ alone does */
		struct source s = b->src;
		struct damage_limits l;

		if (metric_info[d->metric].tau && model_has(r->el, K_DMG_PULSE_WIDTH))
			s.pulse_width = r->el->val[K_DMG_PULSE_WIDTH];
		damage_limits(r->el, &s, &l);
		d->lambda_factor = limit_of(&l, d->metric) / d->rating;
		d->tau_factor = d->limit / limit_of(&l, d->metric);
	}
	d->safety_factor = b->safety_factor;
	d->caution_level = d->limit / b->safety_factor;
	d->ratio = best;
	return 0;
}

char *
layout_derivation_text(const struct trace_row *r, const struct bench *b, int ascii)
{
	static const char *const shortname[LD_NMETRICS] = {
		[LD_CW_LINEAR] = "CW linear", [LD_CW_IRRADIANCE] = "CW irradiance",
		[LD_FLUENCE] = "fluence", [LD_MAX_POWER] = "power rating",
		[LD_MAX_ABSORBED] = "absorbed rating",
	};
	struct layout_derivation d;
	char rating[48], lim[48], caut[48];
	const char *x = ascii ? "x" : "\u00d7", *dv = ascii ? "/" : "\u00f7";
	struct buf out;

	if (layout_derive(r, b, &d) != 0)
		return NULL;
	units_format(rating, sizeof rating, d.rating, d.dim, 3, ascii);
	units_format(lim, sizeof lim, d.limit, d.dim, 3, ascii);
	units_format(caut, sizeof caut, d.caution_level, d.dim, 3, ascii);
	buf_init(&out);
	buf_printf(&out, "%s %s", shortname[d.metric], rating);
	if (metric_info[d.metric].lambda)
		buf_printf(&out, " %s %.3g %s", x, d.lambda_factor, ascii ? "lambda" : "\u03bb");
	if (metric_info[d.metric].tau)
		buf_printf(&out, " %s %.3g %s", x, d.tau_factor, ascii ? "tau" : "\u03c4");
	buf_printf(&out, " = %s limit; %s %g = %s caution", lim, dv, d.safety_factor, caut);
	return buf_take(&out);
}

/* ---- operating points on the frame and in the chain ---- */

long
layout_point_next(const struct bench *b, long cur)
{
	if (b->points.n == 0 || cur + 1 >= (long)b->points.n)
		return -1;
	return cur < 0 ? 0 : cur + 1;
}

char *
layout_point_words(const struct bench *b, long cur)
{
	if (b->points.n == 0)
		return NULL;
	if (cur < 0 || cur >= (long)b->points.n)
		return xasprintf("base (O: %zu point%s)", b->points.n, b->points.n == 1 ? "" : "s");
	return xasprintf("point %s %ld/%zu", b->points.p[cur].name, cur + 1, b->points.n);
}

int
layout_point_override(struct bench *b, const char *name, const char *id, const char *key,
    const char *value, char **cause)
{
	struct point *pt = point_list_find(&b->points, name);
	char *text, *prefix, *old = NULL;
	struct bench *applied;
	size_t i, plen;

	if (pt == NULL)
		return fail_with(cause, "bench '%s' has no point '%s'", b->name, name);
	/* of the bench's settings a point changes only the source's */
	if (id == NULL && strncmp(key, "source.", 7) != 0)
		return fail_with(cause, "%s is the bench's, not point %s's: the base changes it",
		    key, name);
	prefix = id != NULL ? xasprintf("%s.%s=", id, key) : xasprintf("%s=", key);
	text = xasprintf("%s%s", prefix, value);
	plen = strlen(prefix);
	for (i = 0; i < pt->n; i++)
		if (strncmp(pt->change[i], prefix, plen) == 0)
			break;
	free(prefix);
	if (point_change_check(text, cause) != 0) {
		free(text);
		return -1;
	}
	if (i < pt->n) {
		old = pt->change[i];
		pt->change[i] = text;
	} else {
		point_add_change(pt, text);
		free(text);
	}
	if ((applied = point_apply(b, pt, cause)) == NULL) {
		pt = point_list_find(&b->points, name);
		if (old != NULL) {
			free(pt->change[i]);
			pt->change[i] = old;
		} else {
			free(pt->change[--pt->n]);
		}
		return -1;
	}
	model_bench_free(applied);
	free(old);
	return 0;
}

long
layout_survey_find(const struct point_survey *sv, const char *id)
{
	for (size_t j = 0; j < sv->nel; j++)
		if (strcmp(sv->el[j].id, id) == 0)
			return (long)j;
	return -1;
}
