/* check-util.h - helpers shared by the Check suites: NELEMS, tolerance
 * checks, half_digit, a fixed-seed generator and main's run of the suite. */
#ifndef CHECK_UTIL_H
#define CHECK_UTIL_H

#include <check.h>
#include <math.h>
#include <stdint.h>
#include <stdlib.h>

#define NELEMS(a)	((int)(sizeof (a) / sizeof (a)[0]))

/* |got - want| <= tol·|want| */
#define CHECK_REL(got, want, tol) do {					\
	double g_ = (got), w_ = (want), t_ = (tol);			\
	ck_assert_msg(fabs(g_ - w_) <= t_ * fabs(w_),			\
	    "%s = %.17g, want %.17g (rel tol %g)", #got, g_, w_, t_);	\
} while (0)

/* |got - want| <= tol */
#define CHECK_ABS(got, want, tol) do {					\
	double g_ = (got), w_ = (want), t_ = (tol);			\
	ck_assert_msg(fabs(g_ - w_) <= t_,				\
	    "%s = %.17g, want %.17g (abs tol %g)", #got, g_, w_, t_);	\
} while (0)

/* A table value printed with `dec` decimals: half a unit of its last
 * digit, plus a hair for the binary representation. */
static inline double
half_digit(int dec)
{
	return 0.5 * pow(10, -dec) * (1 + 1e-9);
}

/*
 * A fixed-seed generator, so every run and every machine sees the same
 * "random" cases (Knuth's MMIX LCG constants; the high bits are the good
 * ones).
 */
static inline uint64_t
lcg_next(uint64_t *state)
{
	*state = *state * 6364136223846793005ULL + 1442695040888963407ULL;
	return *state;
}

/* Uniform in [lo, hi), from the top 53 bits. */
static inline double
lcg_uniform(uint64_t *state, double lo, double hi)
{
	double u = (double)(lcg_next(state) >> 11) / 9007199254740992.0;	/* 2^53 */

	return lo + (hi - lo) * u;
}

/* The same generator for the suites that build random benches: its state
 * and the number of the next fresh element id. */
struct gen {
	uint64_t st;
	unsigned next_id;
};

static inline uint64_t
gen_next(struct gen *g)
{
	return lcg_next(&g->st) >> 11;
}

static inline double
gen_uniform(struct gen *g, double lo, double hi)
{
	return lo + (hi - lo) * ((double)gen_next(g) / 9007199254740992.0);
}

static inline int
gen_chance(struct gen *g, double p)
{
	return gen_uniform(g, 0, 1) < p;
}

/* Runs every case of s (CK_ENV: the verbosity from the environment), frees
 * it, and gives main's exit status. */
static inline int
run_suite(Suite *s)
{
	SRunner *sr = srunner_create(s);
	int nf;

	srunner_run_all(sr, CK_ENV);
	nf = srunner_ntests_failed(sr);
	srunner_free(sr);
	return nf ? EXIT_FAILURE : EXIT_SUCCESS;
}

#endif /* CHECK_UTIL_H */
