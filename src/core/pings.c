/*
 * pings.c - sparse samples (pings) matched in order to a continuous route.
 *
 * A trip given as pings p1..pn is within eps of a route R when there are
 * route positions s1 <= ... <= sn, s1 at the route's start and sn at its
 * end, with every pi within eps of R(si): a discrete curve matched to a
 * continuous one with monotone sample positions, the semi-discrete setting
 * of the map-matching uses of the Fréchet distance (Alt, Efrat, Rote &
 * Wenk 2003, "Matching planar maps"; Brakatsoulas, Pfoser, Salas & Wenk
 * 2005, "On map-matching vehicle tracking data").  The straight line
 * between two pings is never compared with the route, so a trip that cuts
 * the corner of a street between two pings is not flagged; a route loop
 * between two pings is never checked either, which an optional max_gap
 * (route length between consecutive positions) bounds.
 *
 * Every ping's positions within eps on a segment are the free interval of
 * the deciders (fr_free_interval), so the ping test uses the deciders'
 * arithmetic.  Without max_gap, the earliest feasible position of each
 * ping keeps every later option, so one forward scan decides (O(n + m)).
 * With it, the reachable positions of each ping are a union of intervals,
 * propagated ping by ping through the window "at most max_gap further".
 * The distance is the smallest eps the decision accepts, found by
 * bisection on the bit patterns of doubles between bounds that the
 * decision must reject and accept (at most 64 decisions).
 */
#include <math.h>
#include <string.h>

#include "fr_internal.h"

/* A place on the route: segment k, parameter t in [0, 1]. */
typedef struct route_at
{
	size_t		k;
	double		t;
} route_at;

/* An interval of route arc length. */
typedef struct arc_span
{
	double		from,
				to;
} arc_span;

/* Everything a decision needs, prepared once for a search. */
typedef struct ping_case
{
	const fr_env *env;
	const fr_prep *p;			/* the pings */
	const fr_prep *r;			/* the route */
	double		gap;			/* max_gap in local units; INFINITY for none */
	double	   *cum;			/* arc length at each route vertex (gap only) */
	arc_span   *a,
			   *b;				/* reachable spans of one ping and the next (gap only) */
	uint64_t	decisions;
} ping_case;

/* Scratch bytes of a ping decision or distance on n pings and an m-vertex route. */
size_t
fr_pings_scratch_bytes(size_t n, size_t m)
{
	return fr_scratch_bytes(n, m) + (m + 1) * (sizeof(double) + 2 * sizeof(arc_span)) + 64;
}

/*
 * The earliest place at or after *at where route segment k..m-2 comes
 * within eps of ping v; false when none does.  Cost: the segments passed.
 */
static bool
earliest_from(const ping_case *c, const fr_pt *v, double eps, route_at *at, fr_poll *poll,
			  bool *stop)
{
	const fr_prep *r = c->r;

	for (size_t k = at->k; k + 1 < r->n; k++)
	{
		double		lo,
					hi;

		fr_free_interval(v, &r->v[k], &r->s[k], &r->v[k + 1], eps, &lo, &hi);
		if (k == at->k && lo < at->t)
			lo = at->t;
		if (lo <= hi)
		{
			at->k = k;
			at->t = lo;
			return true;
		}
		/* polled per segment passed: a ping far from the route scans the rest */
		if (fr_poll_add(poll, 1))
		{
			*stop = true;
			return false;
		}
	}
	return false;
}

/* The ping decision without max_gap: one greedy forward scan. */
static fr_status
decide_greedy(const ping_case *c, double eps, bool *result)
{
	const fr_prep *p = c->p,
			   *r = c->r;
	route_at	at = {0, 0};
	fr_poll		poll;
	bool		stop = false;

	fr_poll_init(&poll, c->env);
	*result = false;
	/* the first ping at the route's start, the last at its end */
	if (fr_pt_dist(&p->v[0], &r->v[0]) > eps || fr_pt_dist(&p->v[p->n - 1], &r->v[r->n - 1]) > eps)
		return FR_OK;
	for (size_t i = 1; i + 1 < p->n; i++)
	{
		if (!earliest_from(c, &p->v[i], eps, &at, &poll, &stop))
			return stop ? FR_EINTR : FR_OK;
		if (fr_poll_add(&poll, 1))
			return FR_EINTR;
	}
	*result = true;
	return FR_OK;
}

/*
 * The ping decision with max_gap: the reachable arc-length spans of each
 * ping, widened by max_gap and cut to where the next ping is within eps.
 * Cost: for each ping, the route segments under its window.
 */
static fr_status
decide_gap(const ping_case *c, double eps, bool *result)
{
	const fr_prep *p = c->p,
			   *r = c->r;
	const double *cum = c->cum;
	arc_span   *cur = c->a,
			   *next = c->b;
	size_t		ncur = 1;
	double		total = cum[r->n - 1];
	fr_poll		poll;

	fr_poll_init(&poll, c->env);
	*result = false;
	if (fr_pt_dist(&p->v[0], &r->v[0]) > eps || fr_pt_dist(&p->v[p->n - 1], &r->v[r->n - 1]) > eps)
		return FR_OK;
	cur[0].from = cur[0].to = 0;
	for (size_t i = 1; i + 1 < p->n; i++)
	{
		size_t		nnext = 0,
					w = 0,
					k;

		/* the first segment that reaches the window's start */
		k = 0;
		while (k + 2 < r->n && cum[k + 1] < cur[0].from)
			k++;
		for (; k + 1 < r->n && w < ncur; k++)
		{
			double		lo,
						hi,
						from,
						to;

			if (cum[k] > cur[ncur - 1].to + c->gap)
				break;			/* past the last window */
			fr_free_interval(&p->v[i], &r->v[k], &r->s[k], &r->v[k + 1], eps, &lo, &hi);
			if (fr_poll_add(&poll, 1))
				return FR_EINTR;
			if (lo > hi)
				continue;
			from = cum[k] + lo * r->s[k].len;
			to = cum[k] + hi * r->s[k].len;
			/* intersect [from, to] with the windows [cur.from, cur.to + gap] */
			while (w < ncur && cur[w].to + c->gap < from)
				w++;
			for (size_t u = w; u < ncur && cur[u].from <= to; u++)
			{
				double		a = fmax(from, cur[u].from),
							b = fmin(to, cur[u].to + c->gap);

				if (a > b)
					continue;
				if (nnext > 0 && a <= next[nnext - 1].to)
					next[nnext - 1].to = fmax(next[nnext - 1].to, b);
				else
				{
					next[nnext].from = a;
					next[nnext].to = b;
					nnext++;
				}
			}
		}
		if (nnext == 0)
			return FR_OK;
		{
			arc_span   *t = cur;

			cur = next;
			next = t;
			ncur = nnext;
		}
	}
	/* the last ping at the route's end, at most max_gap after the one before */
	*result = cur[ncur - 1].to + c->gap >= total;
	return FR_OK;
}

/* One ping decision on the prepared case. */
static fr_status
decide_case(ping_case *c, double eps, bool *result)
{
	c->decisions++;
	if (isinf(eps))
		eps = DBL_MAX;
	return isinf(c->gap) ? decide_greedy(c, eps, result) : decide_gap(c, eps, result);
}

/*
 * Prepares a ping case; *trivial is set (with *dist) where a formula gives
 * the distance: one ping (the continuous distance of a point: its farthest
 * route vertex) or a route of one point (the farthest ping).
 */
static fr_status
case_begin(const fr_env *env, const fr_curve *pings, const fr_curve *route, double max_gap,
		   fr_prep *pp, fr_prep *pr, ping_case *c)
{
	fr_status	st;

	memset(c, 0, sizeof(*c));
	st = fr_prepare_pair(env, pings, route, pp, pr);
	if (st != FR_OK)
		return st;
	fr_prep_drop_repeats(pr);
	c->env = env;
	c->p = pp;
	c->r = pr;
	c->gap = max_gap >= 0 && !isinf(max_gap) ? fr_to_local(pp, max_gap) : INFINITY;
	if (!isinf(c->gap) && pr->n >= 2)
	{
		c->cum = fr_alloc(env, pr->n * sizeof(double) + 2 * pr->n * sizeof(arc_span));
		if (c->cum == NULL)
		{
			fr_release_pair(env, pp, pr);
			return FR_ENOMEM;
		}
		c->a = (arc_span *) (c->cum + pr->n);
		c->b = c->a + pr->n;
		c->cum[0] = 0;
		for (size_t k = 0; k + 1 < pr->n; k++)
			c->cum[k + 1] = c->cum[k] + pr->s[k].len;
	}
	return FR_OK;
}

/* Releases what case_begin allocated. */
static void
case_end(ping_case *c, fr_prep *pp, fr_prep *pr)
{
	fr_free(c->env, c->cum);
	fr_release_pair(c->env, pp, pr);
}

/* The distance where one side is a single point (see case_begin). */
static double
degenerate_distance(const fr_prep *p, const fr_prep *r)
{
	double		d = 0;

	if (p->n == 1)
		return fr_point_curve_dist(&p->v[0], r);
	for (size_t i = 0; i < p->n; i++)
		d = fmax(d, fr_pt_dist(&p->v[i], &r->v[0]));
	return d;
}

/* Is the ping distance of pings to route (with max_gap; < 0 for none) at most eps? */
fr_status
fr_pings_decide(const fr_env *env, const fr_curve *pings, const fr_curve *route,
				double eps, double max_gap, bool *result)
{
	fr_prep		pp,
				pr;
	ping_case	c;
	fr_status	st;

	st = case_begin(env, pings, route, max_gap, &pp, &pr, &c);
	if (st != FR_OK)
		return st;
	eps = fr_to_local(&pp, eps);
	if (pp.n == 1 || pr.n == 1)
		*result = degenerate_distance(&pp, &pr) <= eps;
	else
		st = decide_case(&c, eps, result);
	case_end(&c, &pp, &pr);
	return st;
}

/* Route segments a guess looks ahead for each ping's nearest place. */
#define GUESS_WINDOW 16

/*
 * A guess at the ping distance: each ping in turn at its nearest place on
 * the next GUESS_WINDOW route segments at or after the previous ping's
 * place (a monotone matching, so without max_gap its largest leash bounds
 * the distance from above), with leashes measured as the deciders open
 * them (fr_point_segment_opening, a few ulps below the height at an
 * interior foot).  On real tracks one ping's distance to the route is the
 * ping distance, and this finds it: two decisions then confirm it.
 */
static double
guess_distance(const ping_case *c)
{
	const fr_prep *p = c->p,
			   *r = c->r;
	route_at	at = {0, 0};
	double		worst = fmax(fr_pt_dist(&p->v[0], &r->v[0]),
							 fr_pt_dist(&p->v[p->n - 1], &r->v[r->n - 1]));

	for (size_t i = 1; i + 1 < p->n; i++)
	{
		double		best = INFINITY;
		route_at	best_at = at;

		for (size_t k = at.k; k + 1 < r->n && k < at.k + GUESS_WINDOW; k++)
		{
			double		t = fr_nearest_param(&p->v[i], r, k, k == at.k ? at.t : 0.0, 1.0),
						d;
			fr_pt		pt = fr_prep_point(r, k, t);

			d = t > 0.0 && t < 1.0 && !(k == at.k && t == at.t)
				? fr_point_segment_opening(&p->v[i], &r->v[k], &r->s[k], &r->v[k + 1])
				: fr_pt_dist(&p->v[i], &pt);
			if (d < best)
			{
				best = d;
				best_at.k = k;
				best_at.t = t;
			}
		}
		at = best_at;
		worst = fmax(worst, best);
	}
	return worst;
}

/*
 * The ping distance: the smallest eps the decision accepts (+Infinity when
 * max_gap allows no matching at all).  First the guess: accepted, and its
 * double below rejected, it is the answer.  Otherwise bounds: the decision rejects below
 * the larger end distance, and without max_gap accepts where every ping
 * but the last is within eps of the route's start and the last of its end
 * (all at the start, the last at the end).  Between them, bisection on
 * the bit patterns of doubles: the gap halves at every decision.
 */
fr_status
fr_pings_distance(const fr_env *env, const fr_curve *pings, const fr_curve *route,
				  double max_gap, double *result, uint64_t *decisions)
{
	fr_prep		pp,
				pr;
	ping_case	c;
	fr_status	st;
	double		lo,
				hi;
	bool		yes = false;

	st = case_begin(env, pings, route, max_gap, &pp, &pr, &c);
	if (st != FR_OK)
		return st;
	if (pp.n == 1 || pr.n == 1)
	{
		*result = fr_from_local(&pp, degenerate_distance(&pp, &pr));
		case_end(&c, &pp, &pr);
		return FR_OK;
	}
	lo = fmax(fr_pt_dist(&pp.v[0], &pr.v[0]), fr_pt_dist(&pp.v[pp.n - 1], &pr.v[pr.n - 1]));
	hi = fr_pt_dist(&pp.v[pp.n - 1], &pr.v[pr.n - 1]);
	for (size_t i = 0; i + 1 < pp.n; i++)
		hi = fmax(hi, fr_pt_dist(&pp.v[i], &pr.v[0]));
	if (!isinf(c.gap))
		hi = INFINITY;			/* the gaps may need more, or no eps at all */
	{
		double		guess = guess_distance(&c);

		if (guess > lo && guess < hi)
		{
			st = decide_case(&c, guess, &yes);
			if (st == FR_OK && yes)
			{
				hi = guess;
				st = decide_case(&c, nextafter(guess, 0), &yes);
				if (st == FR_OK && !yes)
					lo = nextafter(guess, 0);	/* the guess is the distance */
			}
			else if (st == FR_OK)
				lo = guess;
		}
	}
	if (st != FR_OK || fr_double_bits(hi) - fr_double_bits(lo) <= 1)
		;						/* settled by the guess (or stopped) */
	else if ((st = decide_case(&c, lo, &yes)) == FR_OK && yes)
		hi = lo;
	else if (st == FR_OK)
	{
		st = decide_case(&c, hi, &yes);
		if (st == FR_OK && !yes && !isinf(hi))
		{
			/* rounding disagreed with the bound: search up to +Infinity */
			lo = hi;
			hi = INFINITY;
			st = decide_case(&c, hi, &yes);
		}
		if (st == FR_OK && !yes)
			lo = hi = INFINITY;	/* max_gap leaves no matching */
		/* invariant: lo rejected, hi accepted; at most 64 halvings of the gap */
		while (st == FR_OK && fr_double_bits(hi) - fr_double_bits(lo) > 1)
		{
			double		mid = fr_bits_double(fr_double_bits(lo) +
											 (fr_double_bits(hi) - fr_double_bits(lo)) / 2);

			st = decide_case(&c, mid, &yes);
			if (yes)
				hi = mid;
			else
				lo = mid;
		}
	}
	if (st == FR_OK)
		*result = isinf(hi) ? INFINITY : fr_from_local(&pp, hi);
	if (decisions)
		*decisions = c.decisions;
	case_end(&c, &pp, &pr);
	return st;
}
