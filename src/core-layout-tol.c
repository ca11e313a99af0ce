/* core-layout-tol.c - tolerances as the workbench shows them: beside a
 * value, and the tolerance screen's cells and lines (its histogram is
 * core-layout-hist.c's).  Numbers
 * come from core-mc.c; this file only decides how they read, so that a
 * figure that is an estimate always says so.  See core-layout-tol.h. */
#include <config.h>

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "core-layout-tol.h"
#include "core-layout.h"
#include "core-tol.h"
#include "core-units.h"
#include "util-buf.h"
#include "util-err.h"

/* ---- a value with its tolerance ---- */

static enum unit_dim
key_dim(enum model_key k)
{
	return model_keys[k].kind == KIND_QUANTITY ? model_keys[k].dim : DIM_NONE;
}

/* The kinds a tolerance may sit on (model_set_text refuses the others). */
static int
key_takes_tol(int k)
{
	if (k < 0 || k >= K_COUNT)
		return 0;
	switch (model_keys[k].kind) {
	case KIND_BOOL:
	case KIND_AXIS:
	case KIND_CHOICE:
		return 0;
	default:
		return 1;
	}
}

int
layout_tol_suffix(char *buf, size_t n, const struct element *el, enum model_key k)
{
	const struct tol *t = key_takes_tol((int)k) ? tol_of(el, k) : NULL;

	if (t == NULL || isnan(model_get(el, k))) {
		if (n > 0)
			buf[0] = '\0';
		return 0;
	}
	return tol_format(buf, n, t, key_dim(k), 0);
}

int
layout_tol_src_suffix(char *buf, size_t n, const struct bench *b, const char *key, int axis)
{
	if (n > 0)
		buf[0] = '\0';
	if (b->tol == NULL)
		return 0;
	for (int i = 0; i < TS_COUNT; i++) {
		if (i == TS_WAIST_Y || i == TS_M2_Y || strcmp(key, tol_src_name((enum tol_src)i)) != 0)
			continue;
		if (axis == 1 && (i == TS_WAIST_X || i == TS_M2_X))
			i++;            /* the y entry of the pair */
		return tol_format(buf, n, &b->tol->src[i], tol_src_dim((enum tol_src)i), 0);
	}
	return 0;
}

char *
layout_tol_with_value(const struct element *el, enum model_key k, char *v)
{
	char t[96], *s;

	if (layout_tol_suffix(t, sizeof t, el, k) <= 0)
		return v;
	s = xasprintf("%s%s", v, t);
	free(v);
	return s;
}

char *
layout_tol_with_src(const struct bench *b, const char *key, char *v)
{
	char t0[96], t1[96], *comma, *r;

	layout_tol_src_suffix(t0, sizeof t0, b, key, 0);
	layout_tol_src_suffix(t1, sizeof t1, b, key, 1);
	if (v[0] == '\0' || (t0[0] == '\0' && t1[0] == '\0'))
		return v;
	comma = strcmp(key, "source.waist") == 0 ? strchr(v, ',') : NULL;
	if (comma == NULL) {
		r = xasprintf("%s%s", v, t0);
	} else {
		*comma = '\0';
		r = xasprintf("%s%s,%s%s", v, t0, comma + 1, t1);
	}
	free(v);
	return r;
}

char *
layout_tol_inherited(const struct bench *b, const struct element *el, enum model_key k,
    char *name, size_t n)
{
	const struct tol *t;
	char s[96];

	if (n > 0)
		name[0] = '\0';
	if (!key_takes_tol((int)k) || tol_of(el, k) != NULL)
		return NULL;
	t = tol_effective(b, el, k);
	if (t == NULL)
		return NULL;
	tol_format(s, sizeof s, t, key_dim(k), 0);
	for (size_t i = 0; i < b->tol->ndflt; i++)
		if (&b->tol->dflt[i].t == t)
			tol_default_name(&b->tol->dflt[i], name, n);
	return xstrdup(s + 1);
}

/* "± 2 mm" as "±2 mm". */
static void
tight_sign(char *out, size_t n, const char *tol)
{
	size_t sl = strlen(TOL_SIGN);

	if (strncmp(tol, TOL_SIGN " ", sl + 1) == 0)
		snprintf(out, n, "%s%s", TOL_SIGN, tol + sl + 1);
	else
		snprintf(out, n, "%s", tol);
}

/* "250 mm" and "2 mm" sharing the unit: "250±2 mm" into out; 0 when they
 * do not share it. */
static int
shared_unit(char *out, size_t n, const char *value, const char *amount)
{
	const char *vu = strchr(value, ' '), *au = strchr(amount, ' ');

	if (vu == NULL || au == NULL || strcmp(vu, au) != 0 || strchr(vu + 1, ' ') != NULL)
		return 0;
	snprintf(out, n, "%.*s%s%s", (int)(vu - value), value, TOL_SIGN, amount);
	return 1;
}

/* Columns s takes on the terminal: in ASCII "±" is written "+-". */
static int
shown_cols(const char *s, int ascii)
{
	char *t;
	int c;

	if (!ascii)
		return (int)utf8_cols(s);
	t = layout_ascii(s);
	c = (int)utf8_cols(t);
	free(t);
	return c;
}

char *
layout_tol_fit_value(char *buf, size_t n, const char *value, const char *inh,
    const char *name, int cols, int ascii)
{
	char cand[4][192], v[96], t[96];
	const char *sign = strstr(value, " " TOL_SIGN " ");
	int nc = 0;

	if (n == 0)
		return buf;
	if (inh == NULL && sign == NULL) {
		snprintf(buf, n, "%s", value);
		return buf;
	}
	if (inh == NULL) {
		/* its own: value, sign, amount */
		snprintf(v, sizeof v, "%.*s", (int)(sign - value), value);
		snprintf(cand[nc++], sizeof cand[0], "%s", value);
		tight_sign(t, sizeof t, sign + 1);
		snprintf(cand[nc++], sizeof cand[0], "%s %s", v, t);
		if (shared_unit(cand[nc], sizeof cand[0], v, sign + 1 + strlen(TOL_SIGN) + 1))
			nc++;
	} else {
		tight_sign(t, sizeof t, inh);
		if (name != NULL && name[0] != '\0')
			snprintf(cand[nc++], sizeof cand[0], "%s (%s for every %s)", value, inh, name);
		snprintf(cand[nc++], sizeof cand[0], "%s (%s, bench)", value, inh);
		snprintf(cand[nc++], sizeof cand[0], "%s (%s)", value, t);
		{
			/* "300 (±2) mm" */
			const char *vu = strchr(value, ' '), *au = strchr(inh, ' ');
			const char *au2 = au != NULL ? strchr(au + 1, ' ') : NULL;

			if (vu != NULL && au2 != NULL && strcmp(vu, au2) == 0)
				snprintf(cand[nc++], sizeof cand[0], "%.*s (%s%.*s)%s", (int)(vu - value),
				    value, TOL_SIGN, (int)(au2 - au - 1), au + 1, vu);
		}
	}
	for (int i = 0; i < nc; i++)
		if (shown_cols(cand[i], ascii) <= cols || i == nc - 1) {
			snprintf(buf, n, "%s", cand[i]);
			break;
		}
	return buf;
}

/* The example amount for a key's tolerance; NULL for a key that takes
 * none. */
static const char *
tol_example(int key, const char *bench_key)
{
	enum unit_dim dim = DIM_COUNT;

	if (key >= 0 && key_takes_tol(key))
		dim = key_dim((enum model_key)key);
	for (int i = 0; key < 0 && bench_key != NULL && i < TS_COUNT; i++)
		if (i != TS_WAIST_Y && i != TS_M2_Y && strcmp(bench_key, tol_src_name((enum tol_src)i)) == 0)
			dim = tol_src_dim((enum tol_src)i);
	switch (dim) {
	case DIM_COUNT:  return NULL;
	case DIM_LENGTH: return "2 mm";
	case DIM_NONE:   return "0.01";
	default:         return "5 %";
	}
}

char *
layout_tol_edit_hint(int key, const char *bench_key, int ascii)
{
	const char *sign = ascii ? "+-" : TOL_SIGN, *ex = tol_example(key, bench_key);

	if (ex == NULL)
		return xstrdup("");
	return xasprintf("tolerance after it: \"%s %s\" (normal) or \"%s 1 %% uniform\"; "
	    "\"%s 0\" removes it", sign, ex, sign, sign);
}

char *
layout_tol_edit_short(int key, const char *bench_key, int ascii)
{
	const char *ex = tol_example(key, bench_key);

	if (ex == NULL)
		return xstrdup("");
	return xasprintf("+ tolerance: %s %s [uniform]", ascii ? "+-" : TOL_SIGN, ex);
}

/* ---- the run ---- */

size_t
layout_tol_samples(size_t nrows, int more)
{
	size_t n = LAYOUT_TOL_SAMPLES;

	for (size_t r = 64; r < nrows && n > 250; r *= 2)
		n /= 2;
	if (n < 250)
		n = 250;
	if (more < 0)
		more = 0;
	if (more > LAYOUT_TOL_MORE_MAX)
		more = LAYOUT_TOL_MORE_MAX;
	n <<= more;
	return n > MC_MAX_SAMPLES ? MC_MAX_SAMPLES : n;
}

size_t
layout_tol_samples_max(size_t nrows)
{
	size_t n = LAYOUT_TOL_CELLS / (nrows > 0 ? nrows : 1);

	return n > MC_MAX_SAMPLES ? MC_MAX_SAMPLES : n;
}

int
layout_tol_parse_samples(const char *text, size_t max, size_t *n, char **cause)
{
	unsigned long long v = 0;
	const char *s = text;
	int digits = 0;

	while (*s == ' ')
		s++;
	for (; *s != '\0'; s++) {
		if (*s >= '0' && *s <= '9') {
			/* far too many already: kept too many, whatever follows */
			v = v > 1000ULL * MC_MAX_SAMPLES ? v : v * 10 + (unsigned long long)(*s - '0');
			digits++;
		} else if (*s == ' ' && digits > 0 && s[1] >= '0' && s[1] <= '9') {
			continue;       /* "20 000" */
		} else if ((*s == 'k' || *s == 'K') && digits > 0) {
			v *= 1000;
			s++;
			break;
		} else {
			break;
		}
	}
	while (*s == ' ')
		s++;
	if (digits == 0 || *s != '\0')
		return fail_with(cause, "'%s' is not a sample count: type a whole number such "
		    "as 20000 or 20k", text);
	if (v < 10 || v > max)
		return fail_with(cause, "%s samples: give 10 to %zu here (beamledger tolerance "
		    "--samples N runs up to %d)", text, max, MC_MAX_SAMPLES);
	*n = (size_t)v;
	return 0;
}

char *
layout_tol_progress(size_t done, size_t total, int stopping, int ascii)
{
	const char *dots = ascii ? "..." : "\u2026";
	double pct = total > 0 ? 100.0 * (double)done / (double)total : 0;

	if (stopping)
		return xasprintf("stopping%s %zu of %zu samples done", dots, done, total);
	return xasprintf("sampling%s %zu of %zu samples (%.0f %%)", dots, done, total,
	    pct >= 99.5 && done < total ? 99.0 : pct);
}

/* p as a percentage with as many decimals as its size asks. */
static void
pct_plain(char *buf, size_t n, double p, int *decimals)
{
	double v = 100 * p;
	int d = v < 1 || v > 99 ? 2 : 1;

	if (decimals != NULL)
		*decimals = d;
	snprintf(buf, n, "%.*f", d, v);
}

/* The bound of "none of n" (one-sided 95 %, exact binomial: 1 − 0.05^(1/n),
 * about 3/n, the rule of three; Clopper & Pearson 1934, from memory). */
static double
none_bound(size_t n)
{
	return n > 0 ? 1 - pow(0.05, 1 / (double)n) : 1;
}

/* v (> 0) rounded up to two significant digits, and the decimals that
 * shows. */
static double
up2(double v, int *decimals)
{
	int e = (int)floor(log10(v));
	double scale = pow(10, e - 1);

	*decimals = e - 1 < 0 ? 1 - e : 0;
	return ceil(v / scale * (1 - 1e-12)) * scale;
}

/* The forms that are not an estimate with an error: no figure, an exact
 * one, and the bounds of none and of all.  1 when buf got one. */
static int
bound_form(char *buf, size_t n, double p, size_t nsamples, int exact)
{
	double x;
	int d;

	if (isnan(p)) {
		snprintf(buf, n, "-");
		return 1;
	}
	if (exact && (p == 0 || p == 1)) {
		snprintf(buf, n, "%s", p == 0 ? "0 %" : "100 %");
		return 1;
	}
	if (p != 0 && p != 1)
		return 0;
	x = up2(100 * none_bound(nsamples), &d);
	if (p == 0)
		snprintf(buf, n, "<%.*f %%", d, x);
	else
		snprintf(buf, n, ">%.*f %%", d, 100 - x);
	return 1;
}

void
layout_tol_prob(char *buf, size_t n, double p, size_t nsamples, int exact)
{
	char v[32];

	if (bound_form(buf, n, p, nsamples, exact))
		return;
	pct_plain(v, sizeof v, p, NULL);
	snprintf(buf, n, "%s %%", v);
}

void
layout_tol_prob_se(char *buf, size_t n, double p, double se, size_t nsamples, int exact)
{
	char v[32];
	int d;

	if (bound_form(buf, n, p, nsamples, exact))
		return;
	pct_plain(v, sizeof v, p, &d);
	if (!(100 * se < 0.5 * pow(10, -d))) {
		snprintf(buf, n, "%s %s %.*f %%", v, TOL_SIGN, d, 100 * se);
		return;
	}
	/* an error below the last digit says nothing: left out, and a rare
	 * or near-certain outcome (many samples) gets the digits to show
	 * it, never "0.00" or "100.00" for what some samples did */
	{
		double x = 100 * p, c = x < 1 ? x : x > 99 ? 100 - x : 0;

		if (c > 0) {
			int dd = 1 - (int)floor(log10(c));

			d = dd > d ? (dd > 6 ? 6 : dd) : d;
		}
		snprintf(buf, n, "%.*f %%", d, x);
	}
}

void
layout_tol_bar_cells(double p_over, double p_caution, int width, int *over, int *caution)
{
	double pa = p_over + p_caution;
	int o, oc;

	*over = *caution = 0;
	if (width <= 0 || isnan(p_over) || isnan(p_caution))
		return;
	o = (int)floor(p_over * width + 0.5);
	oc = (int)floor(pa * width + 0.5);
	if (p_over > 0 && o == 0)
		o = 1;
	if (p_over < 1 && o == width && width > 1)
		o = width - 1;
	if (oc < o)
		oc = o;
	if (p_caution > 0 && oc == o)
		oc = o + 1;
	if (pa < 1 && oc >= width && width > 1)
		oc = width - 1;
	if (oc > width)
		oc = width;
	if (o > oc)
		o = oc;
	*over = o;
	*caution = oc - o;
}

static int
kept_constant(const struct mc_result *r, size_t j)
{
	if (r->ratio == NULL || r->done == 0)
		return 0;
	for (size_t i = 1; i < r->done; i++)
		if (r->ratio[i * r->nrated + j] != r->ratio[j])
			return 0;
	return 1;
}

void
layout_tol_row(const struct mc_result *r, size_t j, int bar_w, struct layout_tol_row *o)
{
	const struct mc_elem *e = &r->el[j];

	memset(o, 0, sizeof *o);
	o->exact = kept_constant(r, j);
	layout_percent(o->nominal, sizeof o->nominal, e->nominal);
	layout_tol_prob_se(o->over, sizeof o->over, e->p_over, e->se_over, r->done, o->exact);
	layout_tol_prob_se(o->caution, sizeof o->caution, e->p_caution, e->se_caution, r->done,
	    o->exact);
	layout_percent(o->median, sizeof o->median, e->median);
	layout_percent(o->p95, sizeof o->p95, e->p95);
	layout_tol_bar_cells(e->p_over, e->p_caution, bar_w, &o->bar_over, &o->bar_caution);
	for (size_t q = 0; q < r->nworst; q++)
		if (r->worst[q] == j)
			o->worst = (int)q + 1;
}

char *
layout_tol_head(const struct mc_result *r, int cols)
{
	char stop[96] = "", *s;
	const char *tn = r->nparam == 1 ? "" : "s";
	unsigned long long seed = (unsigned long long)r->seed;

	if (r->stopped) {
		/* the count done first, however narrow: the figures rest on it */
		snprintf(stop, sizeof stop, "STOPPED after %zu of %zu samples; ", r->done, r->asked);
		s = xasprintf("%sstatistical estimates from those (seed %llu) of %zu tolerance%s; "
		    "%s is one standard error", stop, seed, r->nparam, tn, TOL_SIGN);
		if ((int)utf8_cols(s) <= cols)
			return s;
		free(s);
		s = xasprintf("%sestimates from those only: seed %llu, %zu tolerance%s, %s one "
		    "standard error", stop, seed, r->nparam, tn, TOL_SIGN);
		if ((int)utf8_cols(s) <= cols)
			return s;
		free(s);
		return xasprintf("%sthe figures are of those only", stop);
	}
	s = xasprintf("Statistical estimates from %zu random samples (seed %llu) of %zu "
	    "tolerance%s; %s is one standard error", r->done, seed, r->nparam, tn, TOL_SIGN);
	if ((int)utf8_cols(s) <= cols)
		return s;
	free(s);
	return xasprintf("Statistical: %zu samples, seed %llu, %zu tolerance%s; %s one "
	    "standard error", r->done, seed, r->nparam, tn, TOL_SIGN);
}

static void
power_text(char *buf, size_t n, double w, int ascii)
{
	if (isnan(w))
		snprintf(buf, n, "-");
	else if (isinf(w))
		snprintf(buf, n, "any");
	else
		units_format(buf, n, w, DIM_POWER, 3, ascii);
}

char *
layout_tol_bench_line(const struct mc_result *r, int ascii, int cols)
{
	char p[48], s5[48], s0[48], *s = NULL;
	const char *bar = ascii ? "|" : "\u2502";

	int exact = r->nparam == 0 || r->ratio != NULL;

	/* exact when no sample differs from the bench as written */
	for (size_t j = 0; exact && r->nparam > 0 && j < r->nrated; j++)
		exact = kept_constant(r, j);
	layout_tol_prob_se(p, sizeof p, r->p_any, r->se_any, r->done, exact);
	power_text(s5, sizeof s5, r->safe_p5, ascii);
	power_text(s0, sizeof s0, r->nominal_safe, ascii);
	/* the longest that fits, the last whatever its length */
	for (int form = 0; form < 4; form++) {
		free(s);
		switch (form) {
		case 0:
			s = xasprintf("P(anything over) %s %s safe source power, 5th percentile %s "
			    "(as written %s)", p, bar, s5, s0);
			break;
		case 1:
			s = xasprintf("P(any over) %s %s safe source power, 5th percentile %s "
			    "(as written %s)", p, bar, s5, s0);
			break;
		case 2:
			s = xasprintf("P(any over) %s %s safe source power 5th pct %s (as written %s)",
			    p, bar, s5, s0);
			break;
		default:
			s = xasprintf("P(any over) %s %s safe source power 5th pct %s", p, bar, s5);
			break;
		}
		if ((int)utf8_cols(s) <= cols)
			break;
	}
	if (ascii) {
		char *t = layout_ascii(s);

		free(s);
		s = t;
	}
	return s;
}

char *
layout_tol_drivers(const struct mc_result *r, size_t j, char **others)
{
	struct buf b;
	int ranked = 0;

	*others = NULL;
	for (size_t q = 0; q < r->nworst; q++)
		ranked |= r->worst[q] == j;
	if (!ranked) {
		buf_init(&b);
		for (size_t q = 0; q < r->nworst; q++)
			buf_printf(&b, "%s%s", q ? ", " : "", r->el[r->worst[q]].id);
		*others = buf_take(&b);
		return NULL;
	}
	if (kept_constant(r, j))
		return xstrdup("none: no tolerance moves its ratio");
	buf_init(&b);
	for (size_t k = 0; k < r->el[j].nsens; k++) {
		double x = r->el[j].sens[k].r;

		/* no "-0.00": a correlation that rounds to 0 is 0 */
		buf_printf(&b, "%s%s %+.2f", k ? ", " : "", r->param[r->el[j].sens[k].param].name,
		    fabs(x) < 0.005 ? 0.0 : x);
	}
	if (r->el[j].nsens == 0)
		buf_add(&b, "-");
	return buf_take(&b);
}

char *
layout_tol_unrated_note(const struct trace *t)
{
	struct layout_hazard *hz;
	size_t n = layout_hazards(t, &hz), k = 0;
	struct buf b;

	buf_init(&b);
	for (size_t i = 0; i < n; i++) {
		const struct element *el = hz[i].kind == LH_UNRATED ? hz[i].el :
		    hz[i].kind == LH_WARNING && strcmp(layout_hazard_word(&hz[i]), "unrated") == 0 ?
		    hz[i].warn->after : NULL;

		if (el != NULL)
			buf_printf(&b, "%s%s", k++ ? ", " : "", el->id);
	}
	free(hz);
	if (k == 0) {
		buf_release(&b);
		return NULL;
	}
	{
		char *s = xasprintf("not in these odds: %s take%s power with no rating", b.s,
		    k == 1 ? "s" : "");

		buf_release(&b);
		return s;
	}
}

char *
layout_tol_howto(const struct bench *b, int ascii)
{
	const char *s = ascii ? "+-" : TOL_SIGN;
	int energy = b->src.pulsed && b->src.energy_given;
	char v[48], ex[3][96], what[3][96];
	struct buf out;

	/* the source's own value as the example, on the key that takes it */
	units_format_shortest(v, sizeof v, energy ? b->src.pulse_energy : b->src.power,
	    energy ? DIM_ENERGY : DIM_POWER, ascii);
	snprintf(ex[0], sizeof ex[0], "250 mm %s 2 mm", s);
	snprintf(what[0], sizeof what[0], "normal, standard deviation 2 mm");
	snprintf(ex[1], sizeof ex[1], "%s %s 5 %%", v, s);
	snprintf(what[1], sizeof what[1], "normal, 5 %% of the value");
	snprintf(ex[2], sizeof ex[2], "0.99 %s 0.004 uniform", s);
	snprintf(what[2], sizeof what[2], "anywhere within %s 0.004", s);
	buf_init(&out);
	buf_printf(&out, "No value on this bench carries a tolerance, so every sample would "
	    "be the bench as written: there are no odds to estimate.\n"
	    "To give a value a tolerance, edit it (Enter on an element; b for the source's "
	    "%s) and type the tolerance after the value:\n", energy ? "pulse energy" : "power");
	for (int i = 0; i < 3; i++) {
		size_t from = out.len;

		buf_printf(&out, "  %s", ex[i]);
		buf_pad(&out, 26, from);
		buf_printf(&out, "%s\n", what[i]);
	}
	buf_add(&out, "The damage ratings may carry one too (the least certain numbers on a "
	    "bench).  Then t again.");
	return buf_take(&out);
}
