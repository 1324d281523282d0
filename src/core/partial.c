/*
 * partial.c - partial matching (Alt & Godau 1995, section 5): a trip
 * against the best-fitting part of a route.  In the free space of the trip
 * (x) and the route (y), a part of the route matched to the whole trip is
 * a monotone path from any point of the left edge to any point of the right
 * edge, so the decision only changes where paths may start and end.
 */
#include <float.h>
#include <math.h>
#include <string.h>

#include "fr_internal.h"

/* Nearest distance from a vertex to a whole curve, and its position. */
static double
point_to_curve(const fr_pt *pt, const fr_prep *c, double *pos)
{
	double		best = fr_pt_dist(pt, &c->v[0]);

	*pos = 0;
	for (size_t k = 0; k + 1 < c->n; k++)
	{
		double		t = fr_nearest_param(pt, c, k, 0.0, 1.0);
		fr_pt		q = fr_prep_point(c, k, t);
		double		d = fr_pt_dist(pt, &q);

		if (d < best)
		{
			best = d;
			*pos = (double) k + t;
		}
	}
	return best;
}

/* Where paths may start in a partial sweep. */
typedef enum start_rule
{
	START_ANYWHERE,				/* any free point of the left edge */
	START_ORIGIN,				/* only (0,0) */
	START_AT					/* only the left-edge point at a given position */
} start_rule;

/*
 * Reachability sweep for partial matching, trip p along x, route q along y.
 * Paths start as the rule says (START_AT: at position start_at of q, on the
 * left edge).  *found: some point of the right edge is reachable.  If best
 * is not NULL it receives the reachable right-edge position nearest to p's
 * last vertex (lowest on ties); otherwise the sweep stops at the first
 * reachable right-edge point.
 */
static fr_status
partial_sweep(const fr_env *env, const fr_prep *p, const fr_prep *q, double eps,
			  start_rule rule, double start_at, double *row, bool *found,
			  double *best, fr_stats *stats)
{
	const size_t n = p->n,
				m = q->n;
	const fr_pt *end = &p->v[n - 1];
	double		best_leash = INFINITY;
	bool		open = true;
	size_t		start_row = 0;
	double		start_t = 0;
	fr_poll		poll;

	*found = false;
	if (stats)
		stats->decisions++;
	if (rule == START_AT)
	{
		start_row = start_at >= (double) (m - 1) ? m - 2 : (size_t) start_at;
		start_t = start_at - (double) start_row;
		if (start_t != 0)
			open = false;		/* (0,0) is no start */
	}
	if (rule == START_ORIGIN && fr_pt_dist(&p->v[0], &q->v[0]) > eps)
		return FR_OK;
	fr_poll_init(&poll, env);
	fr_bottom_edge(p, q, eps, row);
	if (rule == START_AT && !(start_row == 0 && start_t == 0))
		for (size_t i = 0; i + 1 < n; i++)
			row[i] = FR_EMPTY;	/* the bottom edge is reachable only from (0,0) */
	for (size_t j = 0; j + 1 < m; j++)
	{
		double		lr = FR_EMPTY,
					right;
		bool		any_top,
					full;
		fr_status	st;

		if (rule == START_ANYWHERE)
			lr = fr_left_edge(p, q, j, eps, &full);
		else if (rule == START_AT && j == start_row && start_t != 0)
		{
			double		lo = fr_left_edge(p, q, j, eps, &full),
						hi;

			/* from the start point up the left edge while it is free */
			fr_free_interval(&p->v[0], &q->v[j], &q->s[j], &q->v[j + 1], eps, &lo, &hi);
			lr = start_t > lo ? start_t : lo;
			if (lr > hi)
				lr = FR_EMPTY;
			open = lr != FR_EMPTY && hi == 1.0;
		}
		else if (open && (rule == START_ORIGIN || j >= start_row))
		{
			lr = fr_left_edge(p, q, j, eps, &open);
			if (lr != 0.0)
				lr = FR_EMPTY;
		}
		st = fr_row_step(p, q, j, eps, row, lr, NULL, &right, &any_top, &poll);
		if (st != FR_OK)
			return st;
		if (stats)
			stats->cells += n - 1;
		if (right == FR_EMPTY)
			continue;
		*found = true;
		if (best == NULL)
			return FR_OK;
		{
			double		lo,
						hi,
						t,
						d;
			fr_pt		c;

			fr_free_interval(end, &q->v[j], &q->s[j], &q->v[j + 1], eps, &lo, &hi);
			t = fr_nearest_param(end, q, j, right, hi);
			c = fr_prep_point(q, j, t);
			d = fr_pt_dist(end, &c);
			if (d < best_leash)
			{
				best_leash = d;
				*best = (double) j + t;
			}
		}
	}
	return FR_OK;
}

/* The partial decider in the form the threshold search takes. */
static fr_status
partial_decide(const fr_env *env, const fr_prep *p, const fr_prep *q, double eps,
			   double *row, bool *result, fr_stats *stats)
{
	if (isinf(eps))
	{
		*result = true;
		return FR_OK;
	}
	return partial_sweep(env, p, q, eps, START_ANYWHERE, 0, row, result, NULL, stats);
}

/* Partial distance and match where the trip or the route is a single point. */
static double
degenerate_partial(const fr_prep *trip, const fr_prep *route, double *from, double *to)
{
	if (trip->n == 1)
	{
		double		pos,
					d = point_to_curve(&trip->v[0], route, &pos);

		*from = *to = pos;
		return d;
	}
	*from = *to = 0;
	return fr_point_curve_dist(&route->v[0], trip);
}

/* Smallest Fréchet distance between the trip and any part of the route. */
fr_status
fr_partial_distance(const fr_env *env, const fr_curve *trip, const fr_curve *route,
					double *result, fr_stats *stats)
{
	fr_prep		p,
				q;
	double	   *row;
	double		lo,
				pos,
				from,
				to;
	fr_status	st;

	st = fr_prepare_pair(env, trip, route, &p, &q);
	if (st != FR_OK)
		return st;
	if (p.n == 1 || q.n == 1)
	{
		*result = fr_from_local(&p, degenerate_partial(&p, &q, &from, &to));
		fr_release_pair(env, &p, &q);
		return FR_OK;
	}
	row = fr_alloc(env, p.n * sizeof(double));
	if (row == NULL)
	{
		fr_release_pair(env, &p, &q);
		return FR_ENOMEM;
	}
	/* both trip ends must meet the route somewhere */
	lo = fmax(point_to_curve(&p.v[0], &q, &pos), point_to_curve(&p.v[p.n - 1], &q, &pos));
	/* the whole route is one of the parts: a greedy matching bounds from above */
	st = fr_threshold_search(env, &p, &q, partial_decide, lo,
							 fr_greedy_upper_bound(&p, &q), row, result, stats);
	fr_free(env, row);
	if (st == FR_OK)
		*result = fr_from_local(&p, *result);
	fr_release_pair(env, &p, &q);
	return st;
}

/*
 * The part of the route that the trip follows within eps: it ends at the
 * reachable point of the right edge nearest to the trip's last vertex, and
 * starts at the point nearest to the trip's first vertex among those from
 * which that end can be reached (found by the same sweep on both curves
 * reversed, with the start fixed at the chosen end).
 */
fr_status
fr_partial_match(const fr_env *env, const fr_curve *trip, const fr_curve *route,
				 double eps, bool *found, double *route_from, double *route_to,
				 double *distance, fr_stats *stats)
{
	fr_prep		p,
				q,
				rp = {0},
				rq = {0},
				sub = {0};
	double	   *row = NULL,
			   *rp_pos = NULL,
			   *rq_pos = NULL,
			   *sub_pos = NULL;
	double		end = 0,
				start = 0;
	fr_status	st;

	*found = false;
	st = fr_prepare_pair(env, trip, route, &p, &q);
	if (st != FR_OK)
		return st;
	eps = fr_to_local(&p, eps);
	if (p.n == 1 || q.n == 1)
	{
		*distance = degenerate_partial(&p, &q, route_from, route_to);
		*found = *distance <= eps;
		*distance = fr_from_local(&p, *distance);
		fr_release_pair(env, &p, &q);
		return FR_OK;
	}
	row = fr_alloc(env, (p.n + q.n) * sizeof(double));
	if (row == NULL)
	{
		st = FR_ENOMEM;
		goto done;
	}
	st = partial_sweep(env, &p, &q, eps, START_ANYWHERE, 0, row, found, &end, stats);
	if (st != FR_OK || !*found)
		goto done;

	/*
	 * Backwards from the chosen end: both curves reversed whole (their
	 * vertices exactly, no interpolated point), paths starting at the end
	 * point only.
	 */
	st = fr_prep_subcurve(env, &p, 0, (double) (p.n - 1), true, &rp, &rp_pos);
	if (st == FR_OK)
		st = fr_prep_subcurve(env, &q, 0, (double) (q.n - 1), true, &rq, &rq_pos);
	if (st != FR_OK)
		goto done;
	{
		bool		back = false;
		double		slack = 0;

		/*
		 * Rounding may differ on reversed segments: widen eps by a few ulps
		 * at a time until the reversed sweep agrees (the distance below is
		 * computed exactly anyway).
		 */
		for (int tries = 0; tries < 12 && !back; tries++, slack = slack == 0 ? 4 * DBL_EPSILON : slack * 8)
		{
			double		rpos = 0;

			st = partial_sweep(env, &rp, &rq, eps * (1 + slack) + slack * fr_pt_dist(&p.v[0], &q.v[0]),
							   START_AT, (double) (q.n - 1) - end, row, &back, &rpos, stats);
			if (st != FR_OK)
				goto done;
			if (back)
				start = (double) (q.n - 1) - rpos;
		}
		if (!back)
			start = 0;			/* rounding beyond any slack: the whole prefix */
	}
	if (start > end)
		start = end;
	*route_from = start;
	*route_to = end;

	/* the distance between the trip and that part of the route */
	st = fr_prep_subcurve(env, &q, start, end, false, &sub, &sub_pos);
	if (st == FR_OK)
		st = fr_distance_prepared(env, &p, &sub, distance, stats);

done:
	fr_release_prep(env, &rp);
	fr_release_prep(env, &rq);
	fr_release_prep(env, &sub);
	fr_free(env, rp_pos);
	fr_free(env, rq_pos);
	fr_free(env, sub_pos);
	fr_free(env, row);
	if (st == FR_OK && *found)
		*distance = fr_from_local(&p, *distance);
	fr_release_pair(env, &p, &q);
	if (st != FR_OK)
		*found = false;
	return st;
}
