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

#include "bounds.h"
#include "fr_internal.h"

/* A place on the route: segment k, parameter t in [0, 1]. */
typedef struct route_at
{
	size_t		k;
	double		t;
} route_at;

/* A stretch of the route between two places, in (segment, parameter) order. */
typedef struct route_span
{
	route_at	from,
				to;
} route_span;

/* Everything a decision needs, prepared once for a search. */
typedef struct ping_case
{
	const fr_env *env;
	const fr_prep *p;			/* the pings */
	const fr_prep *r;			/* the route */
	double		gap;			/* max_gap in local units; INFINITY for none */
	double	   *cum;			/* arc length at each route vertex (gap only) */
	route_span *a,
			   *b;				/* reachable spans of one ping and the next (gap only) */
	size_t		cap;			/* spans a and b hold */
	uint64_t	decisions;
} ping_case;

/* Scratch bytes of a ping decision or distance on n pings and an m-vertex route. */
size_t
fr_pings_scratch_bytes(size_t n, size_t m)
{
	return fr_scratch_bytes(n, m) + (m + 1) * (sizeof(double) + 2 * sizeof(route_span)) + 64;
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

/* Is place x before or at place y along the route? */
static inline bool
at_le(route_at x, route_at y)
{
	return x.k < y.k || (x.k == y.k && x.t <= y.t);
}

/* Arc length of a place on the route. */
static inline double
arc_of(const ping_case *c, route_at x)
{
	return c->cum[x.k] + x.t * c->r->s[x.k].len;
}

/*
 * The parameter on segment k where the window of span u ends (the span's
 * end plus max_gap of route length, never before the span's own end):
 * 1 when the window covers the whole segment, < 0 when it ends before
 * the segment.
 */
static double
window_end_on(const ping_case *c, const route_span *u, double end_arc, size_t k)
{
	double		len = c->r->s[k].len,
				t;

	if (k < u->to.k)
		return 1.0;
	t = len > 0 ? (end_arc - c->cum[k]) / len : (end_arc >= c->cum[k] ? 1.0 : -1.0);
	if (k == u->to.k)
		t = fmax(t, u->to.t);
	return fmin(t, 1.0);
}

/* Doubles the span arrays; false when out of memory. */
static bool
grow_spans(ping_case *c, route_span **cur, route_span **next)
{
	size_t		cap = 2 * c->cap;
	route_span *a = fr_alloc(c->env, 2 * cap * sizeof(route_span));

	if (a == NULL)
		return false;
	memcpy(a, *cur, c->cap * sizeof(route_span));
	memcpy(a + cap, *next, c->cap * sizeof(route_span));
	if (c->a != (route_span *) (c->cum + c->r->n))
		fr_free(c->env, c->a < c->b ? c->a : c->b);
	c->a = a;
	c->b = a + cap;
	*cur = c->a;
	*next = c->b;
	c->cap = cap;
	return true;
}

/*
 * The ping decision with max_gap: the reachable stretches of each ping,
 * widened by max_gap of route length and cut to where the next ping is
 * within eps.  Places are ordered as (segment, parameter) pairs, exactly
 * as the greedy scan orders them, so a max_gap can only remove matchings
 * (found by fuzzing: ordered by arc length, two places on one long
 * segment rounded to one and the gap test accepted a step back); arc
 * length measures only the gap.  Cost: for each ping, the route segments
 * under its windows.
 */
static fr_status
decide_gap(ping_case *c, double eps, bool *result)
{
	const fr_prep *p = c->p,
			   *r = c->r;
	route_span *cur = c->a,
			   *next = c->b;
	size_t		ncur = 1;
	fr_poll		poll;

	fr_poll_init(&poll, c->env);
	*result = false;
	if (fr_pt_dist(&p->v[0], &r->v[0]) > eps || fr_pt_dist(&p->v[p->n - 1], &r->v[r->n - 1]) > eps)
		return FR_OK;
	cur[0].from.k = cur[0].to.k = 0;
	cur[0].from.t = cur[0].to.t = 0;
	for (size_t i = 1; i + 1 < p->n; i++)
	{
		size_t		nnext = 0,
					w = 0;
		double		last_end = arc_of(c, cur[ncur - 1].to) + c->gap;

		for (size_t k = cur[0].from.k; k + 1 < r->n && w < ncur; k++)
		{
			double		lo,
						hi;

			if (k > cur[ncur - 1].to.k && c->cum[k] > last_end)
				break;			/* past the last window */
			fr_free_interval(&p->v[i], &r->v[k], &r->s[k], &r->v[k + 1], eps, &lo, &hi);
			if (fr_poll_add(&poll, 1))
				return FR_EINTR;
			/* windows that end before this segment end before every later one */
			while (w < ncur && window_end_on(c, &cur[w], arc_of(c, cur[w].to) + c->gap, k) < 0)
				w++;
			if (lo > hi)
				continue;
			for (size_t u = w; u < ncur && (cur[u].from.k < k || (cur[u].from.k == k && cur[u].from.t <= hi)); u++)
			{
				double		a = cur[u].from.k == k ? fmax(lo, cur[u].from.t) : lo,
							b = fmin(hi, window_end_on(c, &cur[u], arc_of(c, cur[u].to) + c->gap, k));
				route_span *last = nnext > 0 ? &next[nnext - 1] : NULL;

				if (a > b)
					continue;
				if (last && (at_le((route_at) {k, a}, last->to) ||
							 (last->to.k + 1 == k && last->to.t == 1.0 && a == 0.0)))
				{
					if (at_le(last->to, (route_at) {k, b}))
						last->to = (route_at) {k, b};
					continue;
				}
				if (nnext == c->cap && !grow_spans(c, &cur, &next))
					return FR_ENOMEM;
				next[nnext].from = (route_at) {k, a};
				next[nnext].to = (route_at) {k, b};
				nnext++;
			}
		}
		if (nnext == 0)
			return FR_OK;
		{
			route_span *t = cur;

			cur = next;
			next = t;
			ncur = nnext;
		}
	}
	/* the last ping at the route's end, at most max_gap after the one before */
	*result = (cur[ncur - 1].to.k == r->n - 2 && cur[ncur - 1].to.t == 1.0) ||
		arc_of(c, cur[ncur - 1].to) + c->gap >= c->cum[r->n - 1];
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
		c->cum = fr_alloc(env, pr->n * sizeof(double) + 2 * pr->n * sizeof(route_span));
		if (c->cum == NULL)
		{
			fr_release_pair(env, pp, pr);
			return FR_ENOMEM;
		}
		c->a = (route_span *) (c->cum + pr->n);
		c->b = c->a + pr->n;
		c->cap = pr->n;
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
	if (c->cum && c->a != (route_span *) (c->cum + c->r->n))
		fr_free(c->env, c->a < c->b ? c->a : c->b);
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

/*
 * The greedy scan of decide_greedy on the input coordinates (dim 2 or 3),
 * with no preparation and no memory: each inner ping at the earliest place
 * at or after the previous one's within e, found by solving
 * |a + t (b - a) - v|^2 <= e^2 on the route's segments in order.
 */
static bool
raw_greedy(const fr_curve *pings, const fr_curve *route, double e)
{
	const int	dim = pings->dim;
	const double *r = route->coords;
	size_t		k = 0;
	double		t0 = 0;

	if (fr_raw_dist(pings->coords, r, dim) > e ||
		fr_raw_dist(pings->coords + (pings->n - 1) * dim, r + (route->n - 1) * dim, dim) > e)
		return false;
	for (size_t i = 1; i + 1 < pings->n; i++)
	{
		const double *v = pings->coords + i * dim;
		bool		placed = false;

		for (; k + 1 < route->n; k++, t0 = 0)
		{
			const double *a = r + k * dim,
					   *b = a + dim;
			double		ab2 = 0,
						wab = 0,
						h2 = 0,
						foot,
						half,
						lo,
						hi;

			/*
			 * The places within e of v: around the foot of v on the line,
			 * half-width sqrt((e^2 - h^2) / |ab|^2) with h the distance to
			 * the line, taken from the perpendicular vector itself (no
			 * cancellation, unlike the roots of the quadratic).
			 */
			for (int d = 0; d < dim; d++)
			{
				wab += (v[d] - a[d]) * (b[d] - a[d]);
				ab2 += (b[d] - a[d]) * (b[d] - a[d]);
			}
			if (ab2 == 0)
			{
				if (fr_raw_dist(v, a, dim) > e)
					continue;
				lo = 0;
				hi = 1;
			}
			else
			{
				foot = wab / ab2;
				for (int d = 0; d < dim; d++)
				{
					double		perp = (v[d] - a[d]) - foot * (b[d] - a[d]);

					h2 += perp * perp;
				}
				if (h2 > e * e)
					continue;
				half = sqrt((e * e - h2) / ab2);
				lo = fmax(0.0, foot - half);
				hi = fmin(1.0, foot + half);
			}
			lo = fmax(lo, t0);
			if (lo <= hi)
			{
				t0 = lo;
				placed = true;
				break;
			}
		}
		if (!placed)
			return false;
	}
	return true;
}

/*
 * Cheap verdicts on the ping decision without max_gap, with no memory:
 * the greedy scan on the input coordinates at eps less the slack of
 * bounds.c (FR_NEAR when it places every ping) and at eps plus it (FR_FAR
 * when it cannot), so rounding can never make the exact answer differ.
 * The greedy is exact for this measure: the earliest place for each ping
 * keeps every later option open.  FR_UNDECIDED otherwise, with max_gap,
 * for single points and for pairs the exact decider refuses.
 */
fr_verdict
fr_pings_cheap(const fr_curve *pings, const fr_curve *route, double eps, double max_gap)
{
	double		mag,
				slack;
	bool		sure;

	if ((max_gap >= 0 && isfinite(max_gap)) || pings->n < 2 || route->n < 2 || isnan(eps))
		return FR_UNDECIDED;
	mag = fr_raw_magnitude(pings, route, &sure);
	/* pairs the exact decider refuses (FR_ERANGE) get no verdict here either */
	if (!sure && !fr_pair_in_range(pings, route))
		return FR_UNDECIDED;
	if (isinf(eps))
		return FR_NEAR;
	slack = fr_bound_slack(eps, mag);
	if (eps - slack > 0 && raw_greedy(pings, route, eps - slack))
		return FR_NEAR;
	if (!raw_greedy(pings, route, eps + slack))
		return FR_FAR;
	return FR_UNDECIDED;
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

	/* the greedy scan on the input first; the prepared pair only when it cannot tell */
	switch (fr_pings_cheap(pings, route, eps, max_gap))
	{
		case FR_NEAR:
			*result = true;
			return FR_OK;
		case FR_FAR:
			*result = false;
			return FR_OK;
		default:
			break;
	}
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

/* Entries a frontier of the ping excursions keeps (see fr_pings_excursions). */
#define PING_FRONTIER 16

/* One state of the excursion search: off-route pings so far, place, how it came. */
typedef struct ping_state
{
	size_t		off;			/* off-route pings so far */
	route_at	at;				/* place of the last ping */
	size_t		parent;			/* index in the log of the state before; SIZE_MAX at the start */
	bool		on;				/* this ping on-route */
} ping_state;

/* Scratch bytes of fr_pings_excursions on n pings and an m-vertex route. */
size_t
fr_pings_excursions_scratch_bytes(size_t n, size_t m)
{
	return fr_scratch_bytes(n, m) + (n + 2) * PING_FRONTIER * sizeof(ping_state) +
		(n + 1) * (sizeof(bool) + sizeof(fr_excursion)) + 64;
}

/* Adds a state to the next frontier (kept sorted by off count, then place; Pareto). */
static void
frontier_add(ping_state *front, size_t *count, ping_state st)
{
	size_t		i = 0;

	/* dominated: as many off-route pings or fewer, and as early or earlier */
	for (; i < *count; i++)
		if (front[i].off <= st.off &&
			(front[i].at.k < st.at.k || (front[i].at.k == st.at.k && front[i].at.t <= st.at.t)))
			return;
	/* drop the states it dominates, keep order by off count */
	for (i = 0; i < *count;)
	{
		if (front[i].off >= st.off &&
			(st.at.k < front[i].at.k || (st.at.k == front[i].at.k && st.at.t <= front[i].at.t)))
		{
			memmove(&front[i], &front[i + 1], (*count - i - 1) * sizeof(ping_state));
			(*count)--;
		}
		else
			i++;
	}
	for (i = *count; i > 0 && front[i - 1].off > st.off; i--)
		front[i] = front[i - 1];
	front[i] = st;
	(*count)++;
	if (*count > PING_FRONTIER)
		*count = PING_FRONTIER;	/* the most off-route pings go first */
}

/* Distance from ping v to the route between places a and b (a <= b). */
static double
ping_to_route_part(const fr_prep *r, const fr_pt *v, route_at a, route_at b)
{
	double		best = INFINITY;

	for (size_t k = a.k; k <= b.k && k + 1 < r->n; k++)
	{
		double		t = fr_nearest_param(v, r, k, k == a.k ? a.t : 0.0, k == b.k ? b.t : 1.0);
		fr_pt		pt = fr_prep_point(r, k, t);

		best = fmin(best, fr_pt_dist(v, &pt));
	}
	return best;
}

/*
 * Where the pings left the route at eps (no max_gap): a plan gives every
 * ping a route place, non-decreasing, the first at the route's start and
 * the last at its end, and labels each ping on-route (within eps of its
 * place) or off-route; the excursions are the runs of off-route pings of a
 * plan with the fewest off-route pings (then the earliest places).  The
 * search keeps, after each ping, the best place for each count of
 * off-route pings (a Pareto frontier: fewer off-route pings, or an earlier
 * place), at most PING_FRONTIER of them, those with the fewest; beyond
 * that, a trip that wanders back and forth along its route may get more
 * off-route pings than the least possible, though every plan reported is
 * valid.  Positions are 0-based (k + t).  max_leash is the farthest ping
 * of a run from the route between the places around it (the first and
 * last pings: from the route's start and end, their only places).  For
 * one ping: one excursion when it is farther than eps from some route
 * vertex.
 */
fr_status
fr_pings_excursions(const fr_env *env, const fr_curve *pings, const fr_curve *route,
					double eps, fr_excursion **out, size_t *count)
{
	fr_prep		pp,
				pr;
	ping_case	c;
	ping_state *log = NULL,
			   *front,
			   *next;
	size_t		nfront = 0,
				nnext,
				nlog = 0,
				best;
	bool	   *off = NULL;
	fr_poll		poll;
	fr_status	st;
	route_at	start = {0, 0},
				end;

	*out = NULL;
	*count = 0;
	st = case_begin(env, pings, route, -1, &pp, &pr, &c);
	if (st != FR_OK)
		return st;
	eps = fr_to_local(&pp, eps);
	if (pp.n == 1 || pr.n == 1)
	{
		if (degenerate_distance(&pp, &pr) > eps)
		{
			*out = fr_alloc(env, sizeof(fr_excursion));
			if (*out == NULL)
				st = FR_ENOMEM;
			else
			{
				(*out)[0].trip_from = (*out)[0].trip_to = 0;
				(*out)[0].route_from = 0;
				(*out)[0].route_to = (double) (pr.n - 1);
				(*out)[0].max_leash = fr_from_local(&pp, degenerate_distance(&pp, &pr));
				(*out)[0].trip_length = 0;
				(*out)[0].route_length = fr_from_local(&pr, fr_prep_length_between(&pr, 0, (double) (pr.n - 1)));
				*count = 1;
			}
		}
		case_end(&c, &pp, &pr);
		return st;
	}
	end.k = pr.n - 2;
	end.t = 1.0;
	log = fr_alloc(env, (pp.n + 2) * PING_FRONTIER * sizeof(ping_state));
	off = fr_alloc(env, pp.n * sizeof(bool));
	if (log == NULL || off == NULL)
	{
		st = FR_ENOMEM;
		goto done;
	}
	fr_poll_init(&poll, env);
	/* the first ping at the route's start */
	front = log;
	front[0].off = fr_pt_dist(&pp.v[0], &pr.v[0]) <= eps ? 0 : 1;
	front[0].on = front[0].off == 0;
	front[0].at = start;
	front[0].parent = SIZE_MAX;
	nfront = 1;
	nlog = 1;
	for (size_t i = 1; i < pp.n; i++)
	{
		bool		last = i + 1 == pp.n;

		next = log + nlog;
		nnext = 0;
		for (size_t e = 0; e < nfront; e++)
		{
			ping_state	st_on = front[e],
						st_off = front[e];
			bool		stop = false;

			st_on.parent = st_off.parent = (size_t) (front + e - log);
			if (last ? fr_pt_dist(&pp.v[i], &pr.v[pr.n - 1]) <= eps
				: earliest_from(&c, &pp.v[i], eps, &st_on.at, &poll, &stop))
			{
				if (last)
					st_on.at = end;
				st_on.on = true;
				frontier_add(next, &nnext, st_on);
			}
			if (stop)
			{
				st = FR_EINTR;
				goto done;
			}
			st_off.off++;
			st_off.on = false;
			if (last)
				st_off.at = end;
			frontier_add(next, &nnext, st_off);
		}
		if (fr_poll_add(&poll, nfront))
		{
			st = FR_EINTR;
			goto done;
		}
		front = next;
		nfront = nnext;
		nlog += nnext;
	}

	/* the plan with the fewest off-route pings, labels read back */
	best = 0;
	for (size_t e = 1; e < nfront; e++)
		if (front[e].off < front[best].off)
			best = e;
	{
		size_t		at = (size_t) (front + best - log),
					i = pp.n;
		size_t		runs = 0;
		route_at   *place;

		while (at != SIZE_MAX)
		{
			off[--i] = !log[at].on;
			at = log[at].parent;
		}
		for (size_t k = 0; k < pp.n; k++)
			runs += off[k] && (k == 0 || !off[k - 1]);
		if (runs == 0)
			goto done;
		*out = fr_alloc(env, runs * sizeof(fr_excursion) + pp.n * sizeof(route_at));
		if (*out == NULL)
		{
			st = FR_ENOMEM;
			goto done;
		}
		place = (route_at *) (*out + runs);
		at = (size_t) (front + best - log);
		for (i = pp.n; at != SIZE_MAX; at = log[at].parent)
			place[--i] = log[at].at;
		for (size_t k = 0; k < pp.n; k++)
		{
			size_t		b = k;
			fr_excursion *x;
			route_at	from,
						to;

			if (!off[k] || (k > 0 && off[k - 1]))
				continue;
			while (b + 1 < pp.n && off[b + 1])
				b++;
			/* from the on-route ping before the run to the one after it */
			from = k == 0 ? start : place[k - 1];
			to = b + 1 == pp.n ? end : place[b + 1];
			x = &(*out)[(*count)++];
			x->trip_from = (double) k;
			x->trip_to = (double) b;
			x->route_from = (double) from.k + from.t;
			x->route_to = (double) to.k + to.t;
			x->max_leash = 0;
			x->trip_length = 0;
			for (size_t u = k; u <= b; u++)
			{
				/* the first and last pings have one place each: the route's ends */
				double		leash = u == 0 ? fr_pt_dist(&pp.v[0], &pr.v[0]) :
					u + 1 == pp.n ? fr_pt_dist(&pp.v[u], &pr.v[pr.n - 1]) :
					ping_to_route_part(&pr, &pp.v[u], from, to);

				x->max_leash = fmax(x->max_leash, leash);
				if (u > k)
					x->trip_length += fr_pt_dist(&pp.v[u - 1], &pp.v[u]);
			}
			x->max_leash = fr_from_local(&pp, x->max_leash);
			x->trip_length = fr_from_local(&pp, x->trip_length);
			x->route_length = fr_from_local(&pr, fr_prep_length_between(&pr, x->route_from, x->route_to));
		}
	}

done:
	fr_free(env, log);
	fr_free(env, off);
	if (st != FR_OK)
	{
		fr_free(env, *out);
		*out = NULL;
		*count = 0;
	}
	case_end(&c, &pp, &pr);
	return st;
}
