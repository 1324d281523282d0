/*
 * testutil.h - helpers shared by the engine tests: a counting allocator,
 * an interrupt callback that can fire after a budget, curve generators.
 */
#ifndef FR_TESTUTIL_H
#define FR_TESTUTIL_H

#include <math.h>
#include <stdint.h>
#include <stdlib.h>
#include <string.h>

#include "frechet.h"

/* Allocator bookkeeping: live blocks, and an optional failure after N allocations. */
typedef struct test_heap
{
	long		live;
	long		total;
	long		fail_after;		/* < 0: never fail */
	long		interrupt_calls;
	long		interrupt_after;	/* < 0: never interrupt */
} test_heap;

/* Counting malloc for the engine. */
static inline void *
test_alloc(size_t size, void *arg)
{
	test_heap  *h = arg;

	if (h->fail_after >= 0 && h->total >= h->fail_after)
		return NULL;
	h->total++;
	h->live++;
	return malloc(size);
}

/* Counting free for the engine. */
static inline void
test_release(void *ptr, void *arg)
{
	test_heap  *h = arg;

	h->live--;
	free(ptr);
}

/* Interrupt callback that asks to stop after a number of calls. */
static inline int
test_interrupted(void *arg)
{
	test_heap  *h = arg;

	h->interrupt_calls++;
	return h->interrupt_after >= 0 && h->interrupt_calls > h->interrupt_after;
}

/* A fresh environment over a fresh heap record. */
static inline fr_env
test_env(test_heap *h)
{
	fr_env		e;

	memset(h, 0, sizeof(*h));
	h->fail_after = -1;
	h->interrupt_after = -1;
	e.alloc = test_alloc;
	e.release = test_release;
	e.interrupted = test_interrupted;
	e.arg = h;
	return e;
}

/* Deterministic generator (splitmix64) for test data. */
static uint64_t test_rng_state = 12345;

static inline uint64_t
test_rand64(void)
{
	uint64_t	z = (test_rng_state += 0x9E3779B97F4A7C15ull);

	z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9ull;
	z = (z ^ (z >> 27)) * 0x94D049BB133111EBull;
	return z ^ (z >> 31);
}

/* Uniform double in [lo, hi). */
static inline double
test_uniform(double lo, double hi)
{
	return lo + (hi - lo) * ((double) (test_rand64() >> 11) / 9007199254740992.0);
}

/* A random walk of n 2-D vertices with steps up to step, starting near (x0, y0). */
static inline double *
test_walk(size_t n, double x0, double y0, double step)
{
	double	   *c = malloc(2 * n * sizeof(double));
	double		x = x0,
				y = y0;

	for (size_t i = 0; i < n; i++)
	{
		c[2 * i] = x;
		c[2 * i + 1] = y;
		x += test_uniform(-step, step);
		y += test_uniform(-step, step);
	}
	return c;
}

/* A copy of a curve with each coordinate moved by up to noise. */
static inline double *
test_jitter(const double *c, size_t n, int dim, double noise)
{
	double	   *d = malloc(dim * n * sizeof(double));

	for (size_t i = 0; i < dim * n; i++)
		d[i] = c[i] + test_uniform(-noise, noise);
	return d;
}

/* Relative closeness with an absolute floor for values near zero. */
static inline int
test_close(double a, double b, double rel)
{
	double		scale = fmax(fabs(a), fabs(b));

	return fabs(a - b) <= rel * (scale > 1e-300 ? scale : 1e-300);
}

/* The part of a raw 2-D curve between positions from and to, as a new array. */
static inline double *
test_part_of(const fr_curve *c, double from, double to, size_t *n)
{
	double	   *out = malloc(2 * (c->n + 2) * sizeof(double));
	size_t		k = 1;

	fr_curve_point(c, from, out);
	for (size_t i = 0; i < c->n; i++)
		if ((double) i > from && (double) i < to)
		{
			out[2 * k] = c->coords[2 * i];
			out[2 * k + 1] = c->coords[2 * i + 1];
			k++;
		}
	if (to > from)
		fr_curve_point(c, to, out + 2 * k++);
	*n = k;
	return out;
}

/* Continuous distance through the public API, on a fresh environment. */
static inline double
test_distance(const fr_curve *a, const fr_curve *b)
{
	test_heap	h;
	fr_env		e = test_env(&h);
	double		d = -1;

	if (fr_distance(&e, a, b, &d, NULL) != FR_OK)
		abort();
	return d;
}

#endif							/* FR_TESTUTIL_H */
