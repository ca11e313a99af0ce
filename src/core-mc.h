/* core-mc.h - the Monte-Carlo over every tolerance of a bench at once: per
 * rated element the chance of over and of caution, the median and 95th
 * percentile of its ratio; the chance that anything is over; the source
 * power that keeps 95 % of the samples safe; and which tolerances move the
 * worst elements' ratios most.
 *
 * Sample i draws every tolerance from its own counter-based stream
 * (tol_rng of seed and i) in one fixed order, and its results go to slot
 * i, so the numbers are the same for any number of threads.  Threads
 * (pthreads) share nothing but a chunk counter; each traces its own copy of
 * the bench with one reused result.  Pure computation: no I/O (progress is
 * a callback, stopping a flag). */
#ifndef CORE_MC_H
#define CORE_MC_H

#include <signal.h>
#include <stddef.h>
#include <stdint.h>

#include "core-model.h"
#include "core-tol.h"

#define MC_MAX_SAMPLES 1000000
#define MC_SENS_MAX    5            /* tolerances listed per element */
#define MC_SENS_ELEMS  3            /* elements whose sensitivities are listed */

struct mc_param {
	char          *name;        /* owned: "L1.focal", "source.power" */
	long           elem;        /* index in walk order; -1: the source */
	enum model_key key;
	enum tol_src   ts;
	struct tol     t;
	double         nominal;
	double         width;       /* σ or half-width in the value's unit */
	enum unit_dim  dim;
};

struct mc_sens {
	size_t param;               /* index into param */
	double r;                   /* correlation of the draw with the ratio */
};

struct mc_elem {
	char          *id;          /* owned */
	size_t         row;         /* trace row */
	double         nominal;     /* ratio of the bench as written */
	double         p_over, se_over, p_caution, se_caution;
	double         median, p95;
	size_t         nsens;
	struct mc_sens sens[MC_SENS_MAX];
};

struct mc_result {
	uint64_t         seed;
	size_t           asked, done;   /* samples asked for; done (a prefix: 0 .. done-1) */
	int              stopped;       /* stopped early; done < asked */
	size_t           nparam;
	struct mc_param *param;         /* owned */
	size_t           nrated;
	struct mc_elem  *el;            /* owned, trace order */
	size_t           worst[MC_SENS_ELEMS];  /* indices into el, by P(over) then p95 */
	size_t           nworst;
	double           p_any, se_any;
	double           safe_p5;       /* W: 5th percentile of the safe source power */
	double           nominal_safe;  /* W: of the bench as written */
	double           safety_factor;
	int              no_ghosts;     /* mc_opts.no_ghosts: main beam only */
	/* with mc_opts.keep_ratios: every sample's ratio of every rated
	 * element, ratio[i * nrated + j] for sample i < done (owned; NULL
	 * otherwise), for a histogram */
	double          *ratio;
};

struct mc_opts {
	size_t                 samples;
	uint64_t               seed;
	unsigned               threads;     /* 0: 1 */
	volatile sig_atomic_t *stop;        /* NULL: never; nonzero: stop soon */
	/* Called from the calling thread about ten times a second. */
	void                 (*progress)(void *arg, size_t done, size_t total);
	void                  *arg;
	int                    keep_ratios; /* keep the per-sample ratios in the result */
	int                    no_ghosts;   /* the main beam alone (--no-ghosts): no
	                                     * surface reflections in the ratios */
};

/* The bench must have passed model_validate (its points are not used).
 * Fails on bad options (no samples, too many) and on a bench whose trace
 * fails trace_check (reflections beyond the work bound: never a silent
 * main-beam-only run; no_ghosts traces the main beam). */
int  mc_run(const struct bench *, const struct mc_opts *, struct mc_result *,
         char **cause);
void mc_result_release(struct mc_result *);

/* The tolerances of the bench, in the order they are drawn (caller
 * releases with mc_params_free).  Exposed for the tests. */
struct mc_param *mc_params(const struct bench *, size_t *n);
void             mc_params_free(struct mc_param *, size_t n);

#endif
