/* core-mc.c - the tolerance Monte-Carlo: draws, traces and statistics.
 * Every sample's numbers land in their own slot, and every statistic is
 * reduced over the slots in sample order, so the thread count changes the
 * speed and nothing else.  See core-mc.h. */
#include <config.h>

#include <math.h>
#include <pthread.h>
#include <stdatomic.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>

#include "core-beam.h"
#include "core-mc.h"
#include "core-point.h"
#include "core-trace.h"
#include "util-err.h"

#define CHUNK 64                    /* samples claimed at once by a thread */

/* ---- the tolerances of a bench ---- */

struct collect {
	const struct bench *b;
	struct mc_param    *p;
	size_t              n, cap;
	long                index;
};

static struct mc_param *
param_push(struct collect *c)
{
	if (c->n == c->cap) {
		c->cap = c->cap ? 2 * c->cap : 16;
		c->p = xreallocarray(c->p, c->cap, sizeof *c->p);
	}
	memset(&c->p[c->n], 0, sizeof c->p[c->n]);
	return &c->p[c->n++];
}

static int
collect_fn(struct element *el, struct element *parent, size_t depth, void *arg)
{
	struct collect *c = arg;

	(void)parent;
	(void)depth;
	for (int k = 0; k < K_COUNT; k++) {
		const struct tol *t = tol_effective(c->b, el, (enum model_key)k);
		struct mc_param *p;

		if (t == NULL || model_keys[k].kind == KIND_BOOL || model_keys[k].kind == KIND_AXIS)
			continue;
		p = param_push(c);
		p->name = xasprintf("%s.%s", el->id, model_key_path((enum model_key)k));
		p->elem = c->index;
		p->key = (enum model_key)k;
		p->ts = TS_COUNT;
		p->t = *t;
		p->nominal = model_get(el, (enum model_key)k);
		p->width = tol_width(t, p->nominal);
		p->dim = model_keys[k].kind == KIND_QUANTITY ? model_keys[k].dim : DIM_NONE;
		if (p->width == 0) {
			free(p->name);
			c->n--;
		}
	}
	c->index++;
	return 0;
}

static void
src_put(struct source *s, enum tol_src ts, double v)
{
	switch (ts) {
	case TS_WAVELENGTH:     s->wavelength = v; break;
	case TS_POWER:          s->power = v; break;
	case TS_PULSE_ENERGY:   s->pulse_energy = v; break;
	case TS_REP_RATE:       s->rep_rate = v; break;
	case TS_PULSE_WIDTH:    s->pulse_width = v; break;
	case TS_WAIST_X:        s->waist[0] = v; break;
	case TS_WAIST_Y:        s->waist[1] = v; break;
	case TS_WAIST_POSITION: s->waist_position = v; break;
	case TS_M2_X:           s->m2[0] = v; break;
	case TS_M2_Y:           s->m2[1] = v; break;
	case TS_POLARIZATION:   s->pol_angle_deg = v; break;
	default:                break;
	}
}

/* Which source tolerances take part: those of values in use. */
static int
src_used(const struct source *s, enum tol_src ts)
{
	switch (ts) {
	case TS_POWER:          return !s->energy_given;
	case TS_PULSE_ENERGY:   return s->pulsed && s->energy_given;
	case TS_REP_RATE:
	case TS_PULSE_WIDTH:    return s->pulsed;
	case TS_WAIST_Y:        return s->waist_pair;
	case TS_M2_Y:           return s->m2_pair;
	case TS_POLARIZATION:   return s->pol == POL_LINEAR;
	default:                return 1;
	}
}

struct mc_param *
mc_params(const struct bench *b, size_t *n)
{
	struct collect c = { b, NULL, 0, 0, 0 };

	for (int i = 0; b->tol != NULL && i < TS_COUNT; i++) {
		const struct tol *t = &b->tol->src[i];
		struct mc_param *p;

		if (!tol_is_set(t) || !src_used(&b->src, (enum tol_src)i))
			continue;
		p = param_push(&c);
		p->elem = -1;
		p->ts = (enum tol_src)i;
		p->t = *t;
		p->nominal = tol_source_value(&b->src, (enum tol_src)i);
		p->width = tol_width(t, p->nominal);
		p->dim = tol_src_dim((enum tol_src)i);
		p->name = xstrdup(tol_src_name((enum tol_src)i));
		if (p->width == 0) {
			free(p->name);
			c.n--;
		}
	}
	model_walk((struct branch *)&b->path, collect_fn, &c);
	*n = c.n;
	return c.p;
}

void
mc_params_free(struct mc_param *p, size_t n)
{
	for (size_t i = 0; i < n; i++)
		free(p[i].name);
	free(p);
}

/* ---- one thread's share ---- */

struct shared {
	const struct bench   *base;
	const struct mc_opts *o;
	struct mc_param      *param;
	size_t                nparam, nrated, nchunks, n;
	const size_t         *rows;     /* [nrated] trace rows of the rated elements */
	double                nominal_power;
	/* per sample, slot i */
	double               *ratio;    /* [n * nrated] */
	unsigned char        *status;   /* [n * nrated] */
	float                *z;        /* [n * nparam] standardized draws */
	double               *safe;     /* [n] */
	atomic_size_t         next, done_samples;
	unsigned              finished;     /* under lock */
	pthread_mutex_t       lock;
	pthread_cond_t        wake;         /* a worker finished */
	atomic_uchar         *chunk_done;   /* [nchunks] */
};

struct worker {
	struct shared   *sh;
	struct bench    *b;             /* owned copy */
	struct element **els;           /* owned array of borrowed: walk order */
	size_t           nels, cap;
	struct trace    *t;
	pthread_t        tid;
};

static int
els_fn(struct element *el, struct element *parent, size_t depth, void *arg)
{
	struct worker *w = arg;

	(void)parent;
	(void)depth;
	if (w->nels == w->cap) {
		w->cap = w->cap ? 2 * w->cap : 64;
		w->els = xreallocarray(w->els, w->cap, sizeof *w->els);
	}
	w->els[w->nels++] = el;
	return 0;
}

static void
sample_one(struct worker *w, size_t i)
{
	struct shared *sh = w->sh;
	struct source *s = &w->b->src;
	struct tol_rng rng;
	double power;

	tol_rng_init(&rng, sh->o->seed, i);
	for (size_t p = 0; p < sh->nparam; p++) {
		const struct mc_param *q = &sh->param[p];
		double z, v, lo, hi;

		if (q->elem >= 0) {
			struct element *el = w->els[q->elem];

			v = tol_draw(&q->t, q->nominal, (int)q->key, 0, 0, &rng, &z);
			el->val[q->key] = v;
			el->set |= KEY_BIT(q->key);
		} else {
			tol_src_range(q->ts, &lo, &hi);
			v = tol_draw(&q->t, q->nominal, -1, lo, hi, &rng, &z);
			src_put(s, q->ts, v);
		}
		sh->z[i * sh->nparam + p] = (float)z;
	}
	/* values derived from the ones drawn, as the file reader derives them */
	if (!s->waist_pair)
		s->waist[1] = s->waist[0];
	if (!s->m2_pair)
		s->m2[1] = s->m2[0];
	if (s->pulsed && s->energy_given)
		s->power = s->pulse_energy * s->rep_rate;
	else if (s->pulsed)
		s->pulse_energy = s->power / s->rep_rate;
	/* a measured divergence: the M² of the drawn waist and wavelength,
	 * π·w0·θ/λ (ISO 11146-1) as the reader derives it, held at 1 where
	 * the draw would take it below (the truncation of an M² draw) */
	if (s->divergence_given)
		for (int a = 0; a < 2; a++) {
			s->m2[a] = beam_m2_from_divergence(s->waist[a], s->divergence[a],
			    s->wavelength);
			if (!(s->m2[a] >= 1))
				s->m2[a] = 1;
		}
	power = s->power;
	/* the ratings alone: the same ratios as a full trace (TRACE_LEAN) */
	w->t = trace_rerun_opts(w->t, w->b, TRACE_LEAN |
	    (sh->o->no_ghosts ? TRACE_NO_GHOSTS : 0));
	for (size_t j = 0; j < sh->nrated; j++) {
		const struct trace_row *r = &w->t->rows[sh->rows[j]];
		double x = isnan(r->ratio) ? 0 : r->ratio;

		sh->ratio[i * sh->nrated + j] = x;
		sh->status[i * sh->nrated + j] = (unsigned char)(x >= 1 ? STATUS_OVER :
		    x >= 1 / w->b->safety_factor ? STATUS_CAUTION : STATUS_OK);
	}
	/* the setting of the source that would put this sample's worst element
	 * at caution: its own safe power, scaled back by the power's draw */
	sh->safe[i] = w->t->worst >= 0 ? w->t->safe_source_power * sh->nominal_power / power :
	    INFINITY;
}

static void *
worker_main(void *arg)
{
	struct worker *w = arg;
	struct shared *sh = w->sh;

	for (;;) {
		size_t c, from, to;

		if (sh->o->stop != NULL && *sh->o->stop)
			break;
		c = atomic_fetch_add(&sh->next, 1);
		if (c >= sh->nchunks)
			break;
		from = c * CHUNK;
		to = from + CHUNK < sh->n ? from + CHUNK : sh->n;
		for (size_t i = from; i < to; i++)
			sample_one(w, i);
		atomic_store(&sh->chunk_done[c], 1);
		atomic_fetch_add(&sh->done_samples, to - from);
	}
	pthread_mutex_lock(&sh->lock);
	sh->finished++;
	pthread_cond_signal(&sh->wake);
	pthread_mutex_unlock(&sh->lock);
	return NULL;
}

/* ---- statistics over the slots, in sample order ---- */

/* The k-th smallest (0-based) of a[0..n-1], which it reorders: Wirth's
 * selection (Algorithms + Data Structures = Programs, 1976, from memory),
 * O(n) on average.  The value is the order statistic itself, whatever the
 * order the slots were in.  No NaN reaches it. */
static double
select_kth(double *a, size_t n, size_t k)
{
	long l = 0, m = (long)n - 1, kk = (long)k;

	while (l < m) {
		double x = a[kk], tmp;
		long i = l, j = m;

		do {
			while (a[i] < x)
				i++;
			while (x < a[j])
				j--;
			if (i <= j) {
				tmp = a[i];
				a[i] = a[j];
				a[j] = tmp;
				i++;
				j--;
			}
		} while (i <= j);
		if (j < kk)
			l = i;
		if (kk < i)
			m = j;
	}
	return a[kk];
}

/* Nearest rank: the ceil(q·n)-th smallest (Hyndman & Fan 1996, definition
 * 1, from memory). */
static double
nearest_rank(double *v, size_t n, double q)
{
	size_t k = (size_t)ceil(q * (double)n);

	if (n == 0)
		return NAN;
	if (k < 1)
		k = 1;
	if (k > n)
		k = n;
	return select_kth(v, n, k - 1);
}

static double
correlation(const struct shared *sh, size_t n, size_t j, size_t p)
{
	double mx = 0, my = 0, sxx = 0, syy = 0, sxy = 0;

	for (size_t i = 0; i < n; i++) {
		mx += sh->z[i * sh->nparam + p];
		my += sh->ratio[i * sh->nrated + j];
	}
	mx /= (double)n;
	my /= (double)n;
	for (size_t i = 0; i < n; i++) {
		double dx = sh->z[i * sh->nparam + p] - mx, dy = sh->ratio[i * sh->nrated + j] - my;

		sxx += dx * dx;
		syy += dy * dy;
		sxy += dx * dy;
	}
	return sxx > 0 && syy > 0 && isfinite(syy) ? sxy / sqrt(sxx * syy) : 0;
}

static void
reduce(struct shared *sh, size_t n, struct mc_result *res)
{
	double *col = xcalloc(n ? n : 1, sizeof *col);
	size_t any = 0;

	for (size_t i = 0; i < n; i++)
		for (size_t j = 0; j < sh->nrated; j++)
			if (sh->status[i * sh->nrated + j] == STATUS_OVER) {
				any++;
				break;
			}
	res->p_any = n ? (double)any / (double)n : NAN;
	res->se_any = n ? sqrt(res->p_any * (1 - res->p_any) / (double)n) : NAN;
	for (size_t j = 0; j < sh->nrated; j++) {
		struct mc_elem *e = &res->el[j];
		size_t over = 0, caution = 0;

		for (size_t i = 0; i < n; i++) {
			unsigned char st = sh->status[i * sh->nrated + j];

			over += st == STATUS_OVER;
			caution += st == STATUS_CAUTION;
			col[i] = sh->ratio[i * sh->nrated + j];
		}
		/* binomial standard error √(p(1−p)/n) */
		e->p_over = n ? (double)over / (double)n : NAN;
		e->se_over = n ? sqrt(e->p_over * (1 - e->p_over) / (double)n) : NAN;
		e->p_caution = n ? (double)caution / (double)n : NAN;
		e->se_caution = n ? sqrt(e->p_caution * (1 - e->p_caution) / (double)n) : NAN;
		e->median = nearest_rank(col, n, 0.5);
		e->p95 = nearest_rank(col, n, 0.95);
	}
	memcpy(col, sh->safe, n * sizeof *col);
	res->safe_p5 = nearest_rank(col, n, 0.05);
	free(col);
	/* the worst: highest P(over), then highest 95th percentile */
	res->nworst = 0;
	for (size_t q = 0; q < MC_SENS_ELEMS && q < sh->nrated; q++) {
		long best = -1;

		for (size_t j = 0; j < sh->nrated; j++) {
			int taken = 0;

			for (size_t k = 0; k < res->nworst; k++)
				taken |= res->worst[k] == j;
			if (taken)
				continue;
			if (best < 0 || res->el[j].p_over > res->el[best].p_over ||
			    (res->el[j].p_over == res->el[best].p_over &&
			    res->el[j].p95 > res->el[best].p95))
				best = (long)j;
		}
		res->worst[res->nworst++] = (size_t)best;
	}
	for (size_t q = 0; q < res->nworst && n > 1; q++) {
		struct mc_elem *e = &res->el[res->worst[q]];

		e->nsens = 0;
		for (size_t p = 0; p < sh->nparam; p++) {
			struct mc_sens s = { p, correlation(sh, n, res->worst[q], p) };
			size_t at = e->nsens;

			/* insertion into the top MC_SENS_MAX by |r|, ties by order */
			while (at > 0 && fabs(e->sens[at - 1].r) < fabs(s.r))
				at--;
			if (at >= MC_SENS_MAX)
				continue;
			if (e->nsens < MC_SENS_MAX)
				e->nsens++;
			memmove(&e->sens[at + 1], &e->sens[at],
			    (e->nsens - 1 - at) * sizeof *e->sens);
			e->sens[at] = s;
		}
	}
}

/* ---- the run ---- */

int
mc_run(const struct bench *b, const struct mc_opts *o, struct mc_result *res,
    char **cause)
{
	struct shared sh;
	struct worker *w;
	struct trace *nom;
	unsigned nthreads = o->threads ? o->threads : 1;
	size_t *rows, n = o->samples, done;

	memset(res, 0, sizeof *res);
	if (n == 0 || n > MC_MAX_SAMPLES)
		return fail_with(cause, "the number of samples must be 1 .. %d, not %zu",
		    MC_MAX_SAMPLES, n);
	if (nthreads > 256)
		nthreads = 256;
	memset(&sh, 0, sizeof sh);
	sh.base = b;
	sh.o = o;
	sh.n = n;
	nom = trace_rerun_opts(NULL, b, o->no_ghosts ? TRACE_NO_GHOSTS : 0);
	if (trace_check(nom, cause) != 0) {
		trace_free(nom);
		return -1;
	}
	sh.param = mc_params(b, &sh.nparam);
	sh.nominal_power = b->src.power;
	rows = xcalloc(nom->nrows ? nom->nrows : 1, sizeof *rows);
	for (size_t r = 0; r < nom->nrows; r++)
		if (damage_rated(&nom->rows[r].limits))
			rows[sh.nrated++] = r;
	sh.rows = rows;
	res->seed = o->seed;
	res->asked = n;
	res->safety_factor = b->safety_factor;
	res->no_ghosts = o->no_ghosts;
	res->nparam = sh.nparam;
	res->param = sh.param;
	res->nrated = sh.nrated;
	res->el = xcalloc(sh.nrated ? sh.nrated : 1, sizeof *res->el);
	for (size_t j = 0; j < sh.nrated; j++) {
		res->el[j].id = xstrdup(nom->rows[rows[j]].el->id);
		res->el[j].row = rows[j];
		res->el[j].nominal = isnan(nom->rows[rows[j]].ratio) ? 0 : nom->rows[rows[j]].ratio;
	}
	res->nominal_safe = nom->safe_source_power;
	trace_free(nom);
	sh.ratio = xcalloc(n * (sh.nrated ? sh.nrated : 1), sizeof *sh.ratio);
	sh.status = xcalloc(n * (sh.nrated ? sh.nrated : 1), sizeof *sh.status);
	sh.z = xcalloc(n * (sh.nparam ? sh.nparam : 1), sizeof *sh.z);
	sh.safe = xcalloc(n, sizeof *sh.safe);
	sh.nchunks = (n + CHUNK - 1) / CHUNK;
	sh.chunk_done = xcalloc(sh.nchunks, sizeof *sh.chunk_done);
	atomic_init(&sh.next, 0);
	atomic_init(&sh.done_samples, 0);
	sh.finished = 0;
	pthread_mutex_init(&sh.lock, NULL);
	pthread_cond_init(&sh.wake, NULL);
	if (nthreads > sh.nchunks)
		nthreads = (unsigned)sh.nchunks;
	w = xcalloc(nthreads, sizeof *w);
	for (unsigned k = 0; k < nthreads; k++) {
		w[k].sh = &sh;
		w[k].b = model_bench_dup(b);
		point_list_release(&w[k].b->points);
		model_walk(&w[k].b->path, els_fn, &w[k]);
		if (pthread_create(&w[k].tid, NULL, worker_main, &w[k]) != 0) {
			/* fewer threads than asked: the ones running do the work */
			model_bench_free(w[k].b);
			free(w[k].els);
			nthreads = k;
			break;
		}
	}
	if (nthreads == 0) {
		struct worker one = { &sh, model_bench_dup(b), NULL, 0, 0, NULL, 0 };

		model_walk(&one.b->path, els_fn, &one);
		worker_main(&one);
		trace_free(one.t);
		free(one.els);
		model_bench_free(one.b);
	}
	/* the workers wake this thread when they finish, and it wakes itself
	 * ten times a second for the progress: a short run waits for nothing */
	pthread_mutex_lock(&sh.lock);
	while (sh.finished < nthreads) {
		struct timespec until;

		clock_gettime(CLOCK_REALTIME, &until);
		until.tv_nsec += 100 * 1000 * 1000;
		if (until.tv_nsec >= 1000000000L) {
			until.tv_sec++;
			until.tv_nsec -= 1000000000L;
		}
		pthread_cond_timedwait(&sh.wake, &sh.lock, &until);
		if (o->progress != NULL && sh.finished < nthreads) {
			pthread_mutex_unlock(&sh.lock);
			o->progress(o->arg, atomic_load(&sh.done_samples), n);
			pthread_mutex_lock(&sh.lock);
		}
	}
	pthread_mutex_unlock(&sh.lock);
	for (unsigned k = 0; k < nthreads; k++) {
		pthread_join(w[k].tid, NULL);
		trace_free(w[k].t);
		free(w[k].els);
		model_bench_free(w[k].b);
	}
	free(w);
	/* only a prefix of whole chunks counts: the first `done` samples, the
	 * same ones any run with this seed draws first */
	for (done = 0; done < sh.nchunks && sh.chunk_done[done]; done++)
		;
	done = done * CHUNK < n ? done * CHUNK : n;
	if (o->progress != NULL)
		o->progress(o->arg, done, n);
	res->done = done;
	res->stopped = done < n;
	reduce(&sh, done, res);
	if (o->keep_ratios)
		res->ratio = sh.ratio;  /* reduce() read it and left it in sample order */
	else
		free(sh.ratio);
	free(sh.status);
	free(sh.z);
	free(sh.safe);
	free((void *)sh.chunk_done);
	pthread_mutex_destroy(&sh.lock);
	pthread_cond_destroy(&sh.wake);
	free(rows);
	return 0;
}

void
mc_result_release(struct mc_result *r)
{
	mc_params_free(r->param, r->nparam);
	for (size_t j = 0; j < r->nrated; j++)
		free(r->el[j].id);
	free(r->el);
	free(r->ratio);
	memset(r, 0, sizeof *r);
}
