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

/* Curves with this many vertices together try certified bounds from simplification. */
#define SIMPLIFY_MIN 2000

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

	/*
	 * (b): narrow to an interval holding no type (b) value.  Bounded: the
	 * values are finitely many (one a vertex-segment pair) and each round
	 * moves an end onto a sampled value strictly inside, so fewer remain.
	 */
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

		int			tries = 0;

		st = probe(s, up);
		for (double step = 4 * DBL_EPSILON; st == FR_OK && !s->hi_checked; step *= 2)
		{
			if (++tries > FR_STEP_UP_TRIES)
				return FR_ERANGE;
			st = probe(s, up * (1 + step));
		}
		if (st != FR_OK)
			return st;
	}

	/*
	 * (c): only passage values remain inside; bisect to adjacent doubles
	 * (bounded: the bit-pattern gap halves each step, at most 64 steps).
	 */
	for (;;)
	{
		uint64_t	lb = fr_double_bits(s->lo),
					hb = fr_double_bits(s->hi);

		if (hb - lb <= 1)
			break;
		st = probe(s, fr_bits_double(lb + (hb - lb) / 2));
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
 * The reference distance on prepared curves (two or more vertices each):
 * type (a) and greedy bounds, type (b) values sampled over all n*m pairs,
 * then bisection to adjacent doubles, every step with the plain decider.
 * Slow, simple, and kept to check the fast search against.
 */
static fr_status
reference_distance(const fr_env *env, const fr_prep *p, const fr_prep *q,
				   double *row, double *result, fr_stats *stats)
{
	double		lo = fmax(fr_pt_dist(&p->v[0], &q->v[0]),
						  fr_pt_dist(&p->v[p->n - 1], &q->v[q->n - 1]));

	return fr_threshold_search(env, p, q, fr_decide_prepared, lo,
							   fr_greedy_upper_bound(p, q), row, result, stats);
}

/* State of the fast search: decide(lo) false, decide(hi) true. */
typedef struct fast
{
	const fr_env *env;
	const fr_prep *p;
	const fr_prep *q;
	void	   *work;
	fr_cands	cands;
	fr_cands	next;			/* openings kept from the last rejected probe */
	double	   *list;			/* a round's sorted, distinct openings */
	fr_stats   *stats;
	double		lo;
	double		hi;
	double		greedy;
	bool		hi_decided;		/* a decision (not only a bound) accepted hi */
} fast;

/* One decision of the fast search, narrowing the bracket; may collect openings. */
static fr_status
fast_probe(fast *f, double eps, bool collect, bool *yes)
{
	fr_status	st = FR_OK;

	f->cands.collected = false;
	if (eps >= f->greedy)
		*yes = true;			/* the greedy walk is a matching within eps */
	else if (fr_pt_dist(&f->p->v[0], &f->q->v[0]) > eps ||
			 fr_pt_dist(&f->p->v[f->p->n - 1], &f->q->v[f->q->n - 1]) > eps)
		*yes = false;
	else
	{
		if (f->stats)
			f->stats->decisions++;
		/* openings at or below eps cannot matter, whatever the answer */
		f->cands.count = 0;
		f->cands.overflow = false;
		f->cands.lo = fmax(f->lo, eps);
		f->cands.hi = f->hi;
		st = fr_decide_pruned(f->env, f->p, f->q, eps, f->work, yes, f->stats,
							  collect ? &f->cands : NULL);
	}
	if (st == FR_OK)
	{
		if (*yes)
		{
			f->hi = eps;
			f->hi_decided = true;
		}
		else
			f->lo = eps;
	}
	return st;
}

/*
 * Bisection on the bit patterns of non-negative doubles, to adjacent
 * doubles (bounded: the gap halves each step, at most 64 steps).
 */
static fr_status
fast_bisect(fast *f)
{
	bool		yes;

	for (;;)
	{
		uint64_t	lb = fr_double_bits(f->lo),
					hb = fr_double_bits(f->hi);
		fr_status	st;

		if (hb - lb <= 1)
			return FR_OK;
		st = fast_probe(f, fr_bits_double(lb + (hb - lb) / 2), false, &yes);
		if (st != FR_OK)
			return st;
	}
}

/* A prepared curve through the vertices keep[0..k-1] of c. */
static fr_status
prep_through(const fr_env *env, const fr_prep *c, const size_t *keep, size_t k, fr_prep *out)
{
	out->n = k;
	out->scale = c->scale;
	out->s = NULL;
	out->v = fr_alloc(env, k * sizeof(fr_pt));
	if (out->v == NULL)
		return FR_ENOMEM;
	for (size_t i = 0; i < k; i++)
		out->v[i] = c->v[keep[i]];
	return fr_prep_segments(env, out);
}

/*
 * Certified bounds from simplified curves, where they pay: with P' and Q'
 * within delta of P and Q (fr_simplify, Agarwal et al. 2005), the triangle
 * inequality gives |d(P,Q) - d(P',Q')| <= 2 delta, and d(P',Q') is cheap
 * when P' and Q' are much shorter.  Each round takes delta as 1/64 of the
 * bracket, so a loose first bracket (a greedy walk gone astray) shrinks
 * fast; rounds stop when simplifying no longer shortens the curves four
 * times over.  Only narrows the bracket: every bound is still confirmed by
 * a decision on the curves themselves.
 */
static fr_status
simplified_bracket(fast *f)
{
	const fr_env *env = f->env;
	fr_status	st = FR_OK;

	if (f->p->n + f->q->n < SIMPLIFY_MIN)
		return FR_OK;
	for (int round = 0; round < 8 && st == FR_OK; round++)
	{
		double		delta = (f->hi - f->lo) / 64,
					d = 0;
		fr_curve	cp,
					cq;
		size_t	   *kp = NULL,
				   *kq = NULL,
					np = 0,
					nq = 0;
		fr_prep		sp = {0},
					sq = {0};
		bool		pays = false;

		if (!(delta > 0))
			break;
		/* simplify the prepared coordinates: a view of them as raw curves */
		cp = (fr_curve) {&f->p->v[0].x, f->p->n, 3};
		cq = (fr_curve) {&f->q->v[0].x, f->q->n, 3};
		/* each simplification stops as soon as it cannot pay */
		st = fr_simplify_upto(env, &cp, delta, f->p->n / 4, &kp, &np);
		if (st == FR_OK && np * 4 <= f->p->n)
			st = fr_simplify_upto(env, &cq, delta, f->q->n / 4, &kq, &nq);
		if (st == FR_OK && kq != NULL && nq * 4 <= f->q->n)
		{
			pays = true;
			st = prep_through(env, f->p, kp, np, &sp);
			if (st == FR_OK)
				st = prep_through(env, f->q, kq, nq, &sq);
			if (st == FR_OK)
				st = fr_distance_prepared(env, &sp, &sq, &d, f->stats);
		}
		if (st == FR_OK && pays)
		{
			/* a margin for rounding in the simplification's own decisions */
			double		slack = 2 * delta * (1 + 1e-9) + 1e-12 * d;

			f->lo = fmax(f->lo, d - slack);
			if (d + slack < f->hi)
				f->hi = d + slack;
		}
		fr_release_prep(env, &sp);
		fr_release_prep(env, &sq);
		fr_free(env, kp);
		fr_free(env, kq);
		if (!pays)
			break;
	}
	return st;
}

/*
 * The fast search for the distance, on prepared curves with two or more
 * vertices each:
 *  1. bounds: type (a) below, a greedy vertex walk above, both narrowed
 *     by simplified curves where that pays;
 *  2. bisection by value until the bracket is 1e-3 wide (relative);
 *  3. rounds: a decision at lo reports the values at which its blocked
 *     steps would open (critical values of types b and c, Alt & Godau 1995);
 *     those inside the bracket are tested by binary search; repeated until
 *     a round reports none, which means no decision changes inside;
 *  4. a check that the double just below hi is rejected, falling back to
 *     bisection on doubles if not (rounding can hide an opening).
 * Every decision is the pruning decider (prune.c), which agrees with the
 * plain one exactly, so the result is the same as the reference search's.
 */
static fr_status
fast_search(fast *f, bool confirm_first, double *result, bool *rejected)
{
	bool		yes,
				pending = false;	/* the next round's openings are at hand */
	fr_status	st;

	f->lo = fmax(fr_pt_dist(&f->p->v[0], &f->q->v[0]),
				 fr_pt_dist(&f->p->v[f->p->n - 1], &f->q->v[f->q->n - 1]));
	f->greedy = f->hi = fr_greedy_upper_bound(f->p, f->q);
	f->hi_decided = false;
	if (f->hi <= f->lo)
	{
		*result = f->lo;
		return FR_OK;
	}
	st = simplified_bracket(f);
	if (st != FR_OK)
		return st;
	st = fast_probe(f, f->lo, false, &yes);
	if (st != FR_OK || yes)
	{
		*result = f->lo;
		return st;
	}
	/*
	 * The upper bound is a matching (or within a proven margin of one); the
	 * decider should accept it, but is only asked when it must be: at the
	 * start when confirm_first is set, else at the end, if no decision has
	 * accepted a smaller value by then (a decision near a loose upper bound
	 * costs most, as the band it reaches is widest).
	 */
	f->greedy = INFINITY;
	if (confirm_first)
	{
		int			tries = 0;

		st = fast_probe(f, f->hi, false, &yes);
		for (double step = 4 * DBL_EPSILON; st == FR_OK && !yes; step *= 2)
		{
			if (++tries > FR_STEP_UP_TRIES)
				return FR_ERANGE;
			st = fast_probe(f, f->hi = f->hi * (1 + step), false, &yes);
		}
		if (st != FR_OK)
			return st;
	}

	/*
	 * Bisection by value; while hi is many times lo, at the geometric mean
	 * (or an eighth of hi when lo is tiny): a decision costs about the
	 * area of the band it reaches, which grows with eps, so probing low
	 * first is cheaper than halving a wide bracket from the top.
	 */
	while (f->hi - f->lo > 1e-3 * f->hi)
	{
		double		mid = f->lo + (f->hi - f->lo) / 2;

		if (f->hi > 4 * f->lo)
			mid = f->lo * 64 < f->hi ? f->hi / 8 : sqrt(f->lo) * sqrt(f->hi);

		/*
		 * Bounded: every probe strictly inside (lo, hi) moves one end to
		 * it, shrinking the bracket by a factor of at least 8/7 in value
		 * or halving its logarithmic width, so it narrows to 1e-3 within
		 * a few thousand probes over the whole double range.  A mid that
		 * rounding puts on an end (subnormal brackets) would not move it:
		 * leave to the bisection on bit patterns below.
		 */
		if (!(mid > f->lo && mid < f->hi))
			break;
		st = fast_probe(f, mid, false, &yes);
		if (st != FR_OK)
			return st;
	}

	/*
	 * Every probe of a round collects openings too, if it sweeps: a
	 * rejected probe's openings are those of the next round (it sets lo),
	 * so a round needs a probe of its own at lo only when the last
	 * rejection came cheaply, from a wall probe (prune.c), without them.
	 * Probes inside a round try the cheap ways first (optional openings):
	 * most are settled without a sweep.  A round whose probes are all
	 * accepted leaves no opening of its list inside, so it ends the
	 * search.
	 */
	for (int round = 0; round < 64; round++)
	{
		size_t		a,
					b,
					k = 0;
		bool		rejected_one = false,
					complete;

		if (!pending)
		{
			f->cands.optional = false;
			st = fast_probe(f, f->lo, true, &yes);
			if (st != FR_OK)
				return st;
		}
		else
			memcpy(f->cands.v, f->next.v, f->next.count * sizeof(double));
		if (pending)
			f->cands.count = f->next.count;
		complete = pending || !f->cands.overflow;
		pending = false;
		if (f->cands.count == 0)
			break;
		qsort(f->cands.v, f->cands.count, sizeof(double), cmp_double);
		for (size_t i = 0; i < f->cands.count; i++)
			if (k == 0 || f->cands.v[i] != f->list[k - 1])
				f->list[k++] = f->cands.v[i];
		if (f->stats)
			f->stats->candidates += k;
		a = 0;
		b = k;
		while (a < b)
		{
			size_t		mid = a + (b - a) / 2;
			double		v = f->list[mid];

			if (!(v > f->lo && v < f->hi))
			{
				if (v <= f->lo)
					a = mid + 1;
				else
					b = mid;
				continue;
			}
			f->cands.optional = true;
			st = fast_probe(f, v, true, &yes);
			if (st != FR_OK)
				return st;
			if (yes)
				b = mid;
			else
			{
				a = mid + 1;
				rejected_one = true;
				/* this probe's openings, if it swept and they are complete, are the next round's */
				pending = f->cands.collected && !f->cands.overflow;
				f->next.count = f->cands.count;
				memcpy(f->next.v, f->cands.v, f->cands.count * sizeof(double));
			}
		}
		if (!rejected_one && complete)
			break;				/* lo unchanged: its full list held nothing below hi */
	}

	/*
	 * No opening left inside: the double below hi must be rejected.  If
	 * rounding put a computed opening a few ulps above where the decider
	 * opens, step down from hi by growing amounts to a rejected value,
	 * then bisect the few doubles in between.
	 */
	if (nextafter(f->hi, 0) > f->lo)
	{
		double		step = 0;

		for (;;)
		{
			double		below = step == 0 ? nextafter(f->hi, 0) : f->hi - step;

			if (!(below > f->lo))
				break;
			st = fast_probe(f, below, false, &yes);
			if (st != FR_OK)
				return st;
			if (!yes)
				break;
			/*
			 * Bounded: the step grows fourfold from at least one ulp of
			 * hi (4 ulps of a subnormal hi may round to 0), so below
			 * passes lo within about 540 steps.
			 */
			step = step == 0 ? fmax(4 * DBL_EPSILON * f->hi, f->hi - nextafter(f->hi, 0)) : 4 * step;
		}
		st = fast_bisect(f);
		if (st != FR_OK)
			return st;
	}
	if (!f->hi_decided)
	{
		st = fast_probe(f, f->hi, false, &yes);
		if (st != FR_OK)
			return st;
		if (!yes)
		{
			*rejected = true;	/* the bound was not accepted: search again, confirming first */
			return FR_OK;
		}
	}
	*result = f->hi;
	return FR_OK;
}

/* The fast search, confirming the upper bound first only if the lazy run finds it rejected. */
static fr_status
fast_distance(fast *f, double *result)
{
	bool		rejected = false;
	fr_status	st = fast_search(f, false, result, &rejected);

	if (st == FR_OK && rejected)
		st = fast_search(f, true, result, &rejected);
	return st;
}


/* Continuous Fréchet distance on prepared curves (fast search). */
fr_status
fr_distance_prepared(const fr_env *env, const fr_prep *p, const fr_prep *q,
					 double *result, fr_stats *stats)
{
	fast		f;
	fr_status	st;

	if (p->n == 1 || q->n == 1)
	{
		*result = p->n == 1 ? fr_point_curve_dist(&p->v[0], q) : fr_point_curve_dist(&q->v[0], p);
		return FR_OK;
	}
	memset(&f, 0, sizeof(f));
	f.env = env;
	f.p = p;
	f.q = q;
	f.stats = stats;
	f.cands.cap = FR_CANDIDATES;
	f.work = fr_alloc(env, fr_prune_work_bytes(p->n, q->n));
	/* openings: as collected, as kept for the next round, as a sorted list */
	f.cands.v = fr_alloc(env, 3 * FR_CANDIDATES * sizeof(double));
	if (f.work == NULL || f.cands.v == NULL)
		st = FR_ENOMEM;
	else
	{
		f.next.v = f.cands.v + FR_CANDIDATES;
		f.list = f.next.v + FR_CANDIDATES;
		fr_prune_setup(f.work, p, q);
		st = fast_distance(&f, result);
	}
	fr_free(env, f.work);
	fr_free(env, f.cands.v);
	return st;
}

/* Scratch bytes for a decision or distance on curves of n and m vertices. */
size_t
fr_scratch_bytes(size_t n, size_t m)
{
	/* vertices and segments of both curves, the pruning decider's work, openings */
	size_t		base = (n + m) * (sizeof(fr_pt) + sizeof(fr_seg)) + 64 +
		fr_prune_work_bytes(n, m) + 3 * FR_CANDIDATES * sizeof(double) + 256;

	/*
	 * A distance may also simplify both curves (an index and a row each)
	 * and search on simplified curves of at most a quarter of the
	 * vertices, which may in turn do the same: a third more at most.
	 */
	return base + base / 3 + (n + m) * (sizeof(size_t) + sizeof(double));
}

/* Continuous Fréchet distance between two curves. */
fr_status
fr_distance(const fr_env *env, const fr_curve *p, const fr_curve *q,
			double *result, fr_stats *stats)
{
	fr_prep		pp,
				pq;
	fr_status	st;

	st = fr_prepare_pair(env, p, q, &pp, &pq);
	if (st != FR_OK)
		return st;
	fr_prep_drop_repeats(&pp);
	fr_prep_drop_repeats(&pq);
	st = fr_distance_prepared(env, &pp, &pq, result, stats);
	if (st == FR_OK)
		*result = fr_from_local(&pp, *result);
	fr_release_pair(env, &pp, &pq);
	return st;
}

/* The reference distance: the same value, by the plain decider only. */
fr_status
fr_distance_plain(const fr_env *env, const fr_curve *p, const fr_curve *q,
				  double *result, fr_stats *stats)
{
	fr_prep		pp,
				pq;
	fr_status	st;
	double	   *row;

	st = fr_prepare_pair(env, p, q, &pp, &pq);
	if (st != FR_OK)
		return st;
	if (pp.n == 1 || pq.n == 1)
	{
		*result = pp.n == 1 ? fr_point_curve_dist(&pp.v[0], &pq) : fr_point_curve_dist(&pq.v[0], &pp);
		*result = fr_from_local(&pp, *result);
		fr_release_pair(env, &pp, &pq);
		return FR_OK;
	}
	row = fr_alloc(env, pp.n * sizeof(double));
	if (row == NULL)
		st = FR_ENOMEM;
	else
		st = reference_distance(env, &pp, &pq, row, result, stats);
	if (st == FR_OK)
		*result = fr_from_local(&pp, *result);
	fr_free(env, row);
	fr_release_pair(env, &pp, &pq);
	return st;
}

/*
 * Length of the longest edge of a curve, scaled by each edge's largest
 * difference so that squares neither underflow nor overflow.
 */
double
fr_longest_edge(const fr_curve *c)
{
	double		worst = 0.0;

	for (size_t i = 0; i + 1 < c->n; i++)
	{
		double		d[3] = {0, 0, 0},
					big = 0.0,
					sum = 0.0;

		for (int k = 0; k < c->dim; k++)
		{
			d[k] = fabs(c->coords[(i + 1) * c->dim + k] - c->coords[i * c->dim + k]);
			if (d[k] > big)
				big = d[k];
		}
		if (big == 0.0)
			continue;
		for (int k = 0; k < c->dim; k++)
			sum += (d[k] / big) * (d[k] / big);
		if (big * sqrt(sum) > worst)
			worst = big * sqrt(sum);
	}
	return worst;
}
