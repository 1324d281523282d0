/*
 * distance.c - the continuous Fréchet distance, exact to double precision.
 *
 * Alt & Godau (1995, section 3) show the distance is one of three kinds of
 * critical values: (a) the end-point distances, (b) a vertex of one curve to
 * a segment of the other (a free interval appears), (c) the distance at
 * which a vertical or horizontal passage opens, where two vertices of one
 * curve are equidistant from a point of a segment of the other.  We take
 * the lower bound from (a) and an upper bound from a greedy vertex walk,
 * then search the type (b) values inside the bracket by sampling them
 * (never storing all n*m of them), and finally bisect the remaining
 * interval, which holds only type (c) values, down to adjacent doubles.
 */
#include <float.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "fr_internal.h"

/* Type (b) values sampled per round; the search does about log2 of it decisions. */
#define SAMPLE_SIZE 64

/* splitmix64: a small deterministic generator for reservoir sampling. */
static uint64_t
next_random(uint64_t *state)
{
	uint64_t	z = (*state += 0x9E3779B97F4A7C15ull);

	z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9ull;
	z = (z ^ (z >> 27)) * 0x94D049BB133111EBull;
	return z ^ (z >> 31);
}

/* Order for qsort on doubles. */
static int
cmp_double(const void *a, const void *b)
{
	double		x = *(const double *) a,
				y = *(const double *) b;

	return (x > y) - (x < y);
}

/*
 * An upper bound: the largest vertex distance along a greedy monotone
 * vertex walk.  Any vertex coupling, linearly interpolated, is a matching
 * whose leash never exceeds its largest vertex distance (the distance
 * between two linearly moving points is convex in time).
 */
double
fr_greedy_upper_bound(const fr_prep *p, const fr_prep *q)
{
	size_t		i = 0,
				j = 0;
	double		worst = fr_pt_dist(&p->v[0], &q->v[0]);

	while (i + 1 < p->n || j + 1 < q->n)
	{
		double		dd = INFINITY,
					di = INFINITY,
					dj = INFINITY,
					d;

		if (i + 1 < p->n && j + 1 < q->n)
			dd = fr_pt_dist(&p->v[i + 1], &q->v[j + 1]);
		if (i + 1 < p->n)
			di = fr_pt_dist(&p->v[i + 1], &q->v[j]);
		if (j + 1 < q->n)
			dj = fr_pt_dist(&p->v[i], &q->v[j + 1]);
		if (dd <= di && dd <= dj)
		{
			i++;
			j++;
			d = dd;
		}
		else if (di <= dj)
		{
			i++;
			d = di;
		}
		else
		{
			j++;
			d = dj;
		}
		if (d > worst)
			worst = d;
	}
	return worst;
}

/* State of the search for the distance: decide(lo) is false, decide(hi) true. */
typedef struct search
{
	const fr_env *env;
	fr_decider	decide;
	const fr_prep *p;
	const fr_prep *q;
	double	   *row;
	fr_stats   *stats;
	double		lo;
	double		hi;
	bool		hi_checked;		/* decide(hi) has been run and was true */
} search;

/* Runs the decider at eps and narrows the bracket accordingly. */
static fr_status
probe(search *s, double eps)
{
	bool		yes;
	fr_status	st = s->decide(s->env, s->p, s->q, eps, s->row, &yes, s->stats);

	if (st != FR_OK)
		return st;
	if (yes)
	{
		s->hi = eps;
		s->hi_checked = true;
	}
	else
		s->lo = eps;
	return FR_OK;
}

/*
 * One pass over all type (b) values (vertex of one curve to segment of the
 * other) strictly inside (lo, hi): counts them and keeps a uniform sample.
 */
static fr_status
sample_type_b(search *s, fr_poll *poll, double *sample, size_t *kept, uint64_t *count,
			  uint64_t *rng)
{
	const fr_prep *curves[2] = {s->p, s->q};

	*kept = 0;
	*count = 0;
	for (int side = 0; side < 2; side++)
	{
		const fr_prep *a = curves[side],
				   *b = curves[1 - side];

		for (size_t i = 0; i < a->n; i++)
		{
			for (size_t j = 0; j + 1 < b->n; j++)
			{
				double		v = fr_point_segment_dist(&a->v[i], &b->v[j], &b->s[j], &b->v[j + 1]);

				if (!(v > s->lo && v < s->hi))
					continue;
				(*count)++;
				if (*kept < SAMPLE_SIZE)
					sample[(*kept)++] = v;
				else
				{
					uint64_t	r = next_random(rng) % *count;

					if (r < SAMPLE_SIZE)
						sample[r] = v;
				}
			}
			if (fr_poll_add(poll, b->n))
				return FR_EINTR;
		}
	}
	if (s->stats)
		s->stats->candidates += *count;
	return FR_OK;
}

/* Order-preserving bit pattern of a non-negative double. */
static uint64_t
double_bits(double x)
{
	uint64_t	u;

	memcpy(&u, &x, sizeof(u));
	return u;
}

/* The double with a given bit pattern. */
static double
bits_double(uint64_t u)
{
	double		x;

	memcpy(&x, &u, sizeof(x));
	return x;
}

/*
 * The search for the smallest eps the decider accepts, given a lower bound
 * s->lo and an upper bound s->hi that a valid matching attains.
 */
static fr_status
search_threshold(search *s, double *result)
{
	double		sample[SAMPLE_SIZE];
	uint64_t	rng = 0x5EED0000ull ^ (s->p->n * 31 + s->q->n);
	fr_poll		poll;
	fr_status	st;

	fr_poll_init(&poll, s->env);
	s->hi_checked = false;
	if (s->hi <= s->lo)
	{
		*result = s->lo;
		return FR_OK;
	}
	st = probe(s, s->lo);
	if (st != FR_OK || s->hi == s->lo)
	{
		*result = s->lo;
		return st;
	}

	/* (b): narrow to an interval holding no type (b) value */
	for (;;)
	{
		size_t		kept,
					a,
					b;
		uint64_t	count;

		st = sample_type_b(s, &poll, sample, &kept, &count, &rng);
		if (st != FR_OK)
			return st;
		if (count == 0)
			break;
		qsort(sample, kept, sizeof(double), cmp_double);
		/* binary search for the first sampled value whose decision is true */
		a = 0;
		b = kept;
		while (a < b)
		{
			size_t		mid = a + (b - a) / 2;

			st = probe(s, sample[mid]);
			if (st != FR_OK)
				return st;
			if (s->hi == sample[mid])
				b = mid;
			else
				a = mid + 1;
		}
		if (count <= SAMPLE_SIZE)
			break;				/* the sample held every value: none left inside */
	}
	if (!s->hi_checked)
	{
		/* the greedy bound is a matching; should rounding disagree, step up */
		double		up = s->hi;

		st = probe(s, up);
		for (double step = 4 * DBL_EPSILON; st == FR_OK && !s->hi_checked; step *= 2)
			st = probe(s, up * (1 + step));
		if (st != FR_OK)
			return st;
	}

	/* (c): only passage values remain inside; bisect to adjacent doubles */
	for (;;)
	{
		uint64_t	lb = double_bits(s->lo),
					hb = double_bits(s->hi);

		if (hb - lb <= 1)
			break;
		st = probe(s, bits_double(lb + (hb - lb) / 2));
		if (st != FR_OK)
			return st;
	}
	*result = s->hi;
	return FR_OK;
}

/*
 * Smallest eps accepted by a decider on prepared curves (two or more
 * vertices each), searched from the bounds lo and hi; row has room for
 * p->n - 1 doubles.
 */
fr_status
fr_threshold_search(const fr_env *env, const fr_prep *p, const fr_prep *q,
					fr_decider decide, double lo, double hi, double *row,
					double *result, fr_stats *stats)
{
	search		s;

	memset(&s, 0, sizeof(s));
	s.env = env;
	s.decide = decide;
	s.p = p;
	s.q = q;
	s.row = row;
	s.stats = stats;
	s.lo = lo;
	s.hi = hi;
	return search_threshold(&s, result);
}

/*
 * Continuous Fréchet distance on prepared curves; row has room for
 * p->n - 1 doubles (unused when a curve is a single point).
 */
fr_status
fr_distance_prepared(const fr_env *env, const fr_prep *p, const fr_prep *q,
					 double *row, double *result, fr_stats *stats)
{
	double		lo;

	if (p->n == 1 || q->n == 1)
	{
		*result = p->n == 1 ? fr_point_curve_dist(&p->v[0], q) : fr_point_curve_dist(&q->v[0], p);
		return FR_OK;
	}
	/* (a): both end pairs must be matched, so the distance is at least this */
	lo = fmax(fr_pt_dist(&p->v[0], &q->v[0]), fr_pt_dist(&p->v[p->n - 1], &q->v[q->n - 1]));
	return fr_threshold_search(env, p, q, fr_decide_prepared, lo,
							   fr_greedy_upper_bound(p, q), row, result, stats);
}

/* Continuous Fréchet distance between two curves. */
fr_status
fr_distance(const fr_env *env, const fr_curve *p, const fr_curve *q,
			double *result, fr_stats *stats)
{
	fr_prep		pp,
				pq;
	fr_status	st;
	double	   *row;

	st = fr_prepare_pair(env, p, q, &pp, &pq);
	if (st != FR_OK)
		return st;
	row = fr_alloc(env, pp.n * sizeof(double));
	if (row == NULL)
		st = FR_ENOMEM;
	else
		st = fr_distance_prepared(env, &pp, &pq, row, result, stats);
	fr_free(env, row);
	fr_release_pair(env, &pp, &pq);
	return st;
}

/* Length of the longest edge of a curve. */
double
fr_longest_edge(const fr_curve *c)
{
	double		worst = 0.0;

	for (size_t i = 0; i + 1 < c->n; i++)
	{
		double		sum = 0.0;

		for (int k = 0; k < c->dim; k++)
		{
			double		d = c->coords[(i + 1) * c->dim + k] - c->coords[i * c->dim + k];

			sum += d * d;
		}
		if (sqrt(sum) > worst)
			worst = sqrt(sum);
	}
	return worst;
}
