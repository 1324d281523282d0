/*
 * benchutil.h - what the small benchmark programs share (pings_bench.c,
 * partial_bench.c): a malloc environment for the engine, a seeded
 * generator and the monotonic clock.  Define BENCH_SEED before including.
 */
#ifndef FR_BENCHUTIL_H
#define FR_BENCHUTIL_H

#include <stdint.h>
#include <stdlib.h>
#include <time.h>

#include "frechet.h"

static void *
bench_alloc(size_t size, void *arg __attribute__((unused)))
{
	return malloc(size);
}

static void
bench_release(void *ptr, void *arg __attribute__((unused)))
{
	free(ptr);
}

static const fr_env env = {bench_alloc, bench_release, NULL, NULL};

static uint64_t rng = BENCH_SEED;

/* Uniform double in [lo, hi) (xorshift64*). */
static double
uniform(double lo, double hi)
{
	rng ^= rng >> 12;
	rng ^= rng << 25;
	rng ^= rng >> 27;
	return lo + (hi - lo) * ((double) ((rng * 0x2545F4914F6CDD1Dull) >> 11) / 9007199254740992.0);
}

/* Seconds of the monotonic clock. */
static double
now(void)
{
	struct timespec ts;

	clock_gettime(CLOCK_MONOTONIC, &ts);
	return ts.tv_sec + ts.tv_nsec * 1e-9;
}

#endif							/* FR_BENCHUTIL_H */
