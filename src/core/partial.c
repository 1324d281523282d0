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

/*
 * Nearest distance from a vertex to a whole curve, and its position.  With
 * as_bound, in the deciders' arithmetic: where the nearest point is inside
 * a segment, the value at which the deciders open the free interval there
 * (fr_point_segment_opening, a few ulps below the height), so that the
 * value is a lower bound a threshold search may return; an interpolated
 * point's distance could round above the threshold.  Without it, the
 * distance to the interpolated nearest point (an answer in itself).
 */
static double
point_to_curve(const fr_pt *pt, const fr_prep *c, bool as_bound, double *pos)
{
	double		best = fr_pt_dist(pt, &c->v[0]);

	*pos = 0;
	for (size_t k = 1; k < c->n; k++)
	{
		double		d = fr_pt_dist(pt, &c->v[k]);

		if (d < best)
		{
			best = d;
			*pos = (double) k;
		}
	}
	for (size_t k = 0; k + 1 < c->n; k++)
	{
		double		t = fr_nearest_param(pt, c, k, 0.0, 1.0),
					d;

		if (!(t > 0.0 && t < 1.0))
			continue;			/* an end: its vertex was measured above */
		if (as_bound)
			d = fr_point_segment_opening(pt, &c->v[k], &c->s[k], &c->v[k + 1]);
		else
		{
			fr_pt		q = fr_prep_point(c, k, t);

			d = fr_pt_dist(pt, &q);
		}
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
 * A place on a route edge: segment row, parameter t in [0, 1].  Sweeps keep
 * the two apart: row + t as one double loses t's low bits on long routes,
 * and a start or end one rounding away from a tangency point is not free.
 */
typedef struct edge_pos
{
	size_t		row;
	double		t;
} edge_pos;

/* The position row + t of an edge place, as reported to callers. */
static double
edge_pos_value(edge_pos e)
{
	return (double) e.row + e.t;
}

/* The same place on the route reversed (m vertices). */
static edge_pos
edge_pos_reversed(edge_pos e, size_t m)
{
	edge_pos	r = {m - 2 - e.row, 1.0 - e.t};

	return r;
}

/*
 * Reachability sweep for partial matching, trip p along x, route q along y.
 * Paths start as the rule says (START_AT: at *start, on the left edge).
 * *found: some point of the right edge is reachable, or, when target is
 * not NULL, the right-edge point at *target is.  If best is not NULL it
 * receives the reachable right-edge place nearest to p's last vertex
 * (lowest on ties), or with earliest the lowest reachable right-edge
 * place; otherwise the sweep stops as soon as it knows the answer.
 */
static fr_status
partial_sweep(const fr_env *env, const fr_prep *p, const fr_prep *q, double eps,
			  start_rule rule, const edge_pos *start, const edge_pos *target,
			  double *row, bool *found, edge_pos *best, bool earliest, fr_stats *stats)
{
	const size_t n = p->n;
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
		start_row = start->row;
		start_t = start->t;
		if (start_t == 1.0 && start_row + 2 < q->n)
		{
			start_row++;		/* the top of a row is the bottom of the next */
			start_t = 0;
		}
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
	for (size_t j = 0; j + 1 < q->n; j++)
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
		if (target != NULL)
		{
			/* the target on this row, or at its top when it is the next row's bottom */
			double		t = j == target->row ? target->t :
				(j + 1 == target->row && target->t == 0.0) ? 1.0 : -1.0,
						lo,
						hi;

			if (t < 0)
				continue;
			fr_free_interval(end, &q->v[j], &q->s[j], &q->v[j + 1], eps, &lo, &hi);
			if (right <= t && t <= hi)
			{
				*found = true;
				return FR_OK;
			}
			continue;
		}
		*found = true;
		if (best == NULL)
			return FR_OK;
		if (earliest)
		{
			/* rows go up the route, so the first reachable right edge holds the lowest place */
			best->row = j;
			best->t = right;
			return FR_OK;
		}
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
				best->row = j;
				best->t = t;
			}
		}
	}

	/*
	 * The route's last point reached along the top of the last cell (as
	 * the deciders accept it): no row's right edge shows it, as it is the
	 * end of the last one.
	 */
	if (n >= 2 && row[n - 2] != FR_EMPTY && fr_pt_dist(end, &q->v[q->n - 1]) <= eps)
	{
		if (target != NULL)
		{
			if ((target->row == q->n - 2 && target->t == 1.0) || target->row == q->n - 1)
				*found = true;
			return FR_OK;
		}
		*found = true;
		if (best != NULL && fr_pt_dist(end, &q->v[q->n - 1]) < best_leash)
		{
			best->row = q->n - 2;
			best->t = 1.0;
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
	return partial_sweep(env, p, q, eps, START_ANYWHERE, NULL, NULL, row, result, NULL, false, stats);
}

/* Partial distance and match where the trip or the route is a single point. */
static double
degenerate_partial(const fr_prep *trip, const fr_prep *route, double *from, double *to)
{
	if (trip->n == 1)
	{
		double		pos,
					d = point_to_curve(&trip->v[0], route, false, &pos);

		*from = *to = pos;
		return d;
	}
	*from = *to = 0;
	return fr_point_curve_dist(&route->v[0], trip);
}

/*
 * Smallest Fréchet distance between the trip and any part of the route,
 * searched with the given partial decider (partial_decide here; the
 * windowed one of passage.c).
 */
fr_status
fr_partial_distance_with(const fr_env *env, const fr_curve *trip, const fr_curve *route,
						 fr_decider decide, double *result, fr_stats *stats)
{
	fr_prep		p,
				q;
	double	   *row;
	double		lo,
				hi,
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
	row = fr_alloc(env, (p.n + 1) * sizeof(double));
	if (row == NULL)
	{
		fr_release_pair(env, &p, &q);
		return FR_ENOMEM;
	}
	fr_partial_bounds(&p, &q, &lo, &hi);
	st = fr_threshold_search(env, &p, &q, decide, lo, hi, row, result, stats);
	fr_free(env, row);
	if (st == FR_OK)
		*result = fr_from_local(&p, *result);
	fr_release_pair(env, &p, &q);
	return st;
}

/* Smallest Fréchet distance between the trip and any part of the route. */
fr_status
fr_partial_distance(const fr_env *env, const fr_curve *trip, const fr_curve *route,
					double *result, fr_stats *stats)
{
	return fr_partial_distance_with(env, trip, route, partial_decide, result, stats);
}

/*
 * A start for the part ending at route position end, found in the forward
 * sweep's own arithmetic, for when the reversed sweep disagrees with it by
 * rounding (long route edges beside a short trip; coordinates absorbed
 * by larger ones).  A path may start anywhere on a free run of the left
 * edge, and from a run's lowest point it can climb the run, so the lowest
 * points of the runs are the only starts to try; the forward sweep found
 * end reachable from one of them.  They are tried from the latest, so the
 * part is the shortest such run start allows.
 */
static fr_status
forward_start(const fr_env *env, const fr_prep *p, const fr_prep *q, double eps,
			  edge_pos end, double *row, edge_pos *start, fr_stats *stats)
{
	start->row = 0;
	start->t = 0;
	for (size_t j = end.row + 1; j-- > 0;)
	{
		double		lo,
					hi,
					plo,
					phi;
		bool		reached = false;
		fr_status	st;

		edge_pos	at = {j, 0};

		fr_free_interval(&p->v[0], &q->v[j], &q->s[j], &q->v[j + 1], eps, &lo, &hi);
		if (lo > hi || (j == end.row && lo > end.t))
			continue;
		/* the lowest point of a run: the run does not come up from the row below */
		if (j > 0 && lo == 0.0)
		{
			fr_free_interval(&p->v[0], &q->v[j - 1], &q->s[j - 1], &q->v[j], eps, &plo, &phi);
			if (plo <= phi && phi == 1.0)
				continue;
		}
		at.t = lo;
		st = partial_sweep(env, p, q, eps, START_AT, &at, &end, row, &reached, NULL, false, stats);
		if (st != FR_OK)
			return st;
		if (reached)
		{
			*start = at;
			return FR_OK;
		}
	}
	return FR_OK;
}

/*
 * The part of the route that the trip follows within eps, on a prepared
 * pair in its local frame (eps and *distance local): it ends at the
 * reachable point of the right edge nearest to the trip's last vertex, and
 * starts at the point nearest to the trip's first vertex among those from
 * which that end can be reached (found by the same sweep on both curves
 * reversed, with the start fixed at the chosen end).
 */
fr_status
fr_partial_match_prepared(const fr_env *env, const fr_prep *p, const fr_prep *q, double eps,
						  bool *found, double *route_from, double *route_to,
						  double *distance, fr_stats *stats)
{
	fr_prep		rp = {0},
				rq = {0},
				sub = {0};
	double	   *row = NULL,
			   *rp_pos = NULL,
			   *rq_pos = NULL,
			   *sub_pos = NULL;
	edge_pos	end = {0, 0},
				start = {0, 0};
	double		from,
				to;
	fr_status	st;

	*found = false;
	if (p->n == 1 || q->n == 1)
	{
		*distance = degenerate_partial(p, q, route_from, route_to);
		*found = *distance <= eps;
		return FR_OK;
	}
	row = fr_alloc(env, (p->n + q->n) * sizeof(double));
	if (row == NULL)
		return FR_ENOMEM;
	st = partial_sweep(env, p, q, eps, START_ANYWHERE, NULL, NULL, row, found, &end, false, stats);
	if (st != FR_OK || !*found)
		goto done;

	/*
	 * Backwards from the chosen end: both curves reversed whole (their
	 * vertices exactly, no interpolated point), paths starting at the end
	 * point only.
	 */
	st = fr_prep_subcurve(env, p, 0, (double) (p->n - 1), true, &rp, &rp_pos);
	if (st == FR_OK)
		st = fr_prep_subcurve(env, q, 0, (double) (q->n - 1), true, &rq, &rq_pos);
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
			edge_pos	rstart = edge_pos_reversed(end, q->n),
						rbest = {0, 0};

			st = partial_sweep(env, &rp, &rq, eps * (1 + slack) + slack * fr_pt_dist(&p->v[0], &q->v[0]),
							   START_AT, &rstart, NULL, row, &back, &rbest, false, stats);
			if (st != FR_OK)
				goto done;
			if (back)
				start = edge_pos_reversed(rbest, q->n);
		}
		if (!back)
		{
			/* rounding beyond any slack: find the start going forward */
			st = forward_start(env, p, q, eps, end, row, &start, stats);
			if (st != FR_OK)
				goto done;
		}
	}
	to = edge_pos_value(end);
	from = fmin(edge_pos_value(start), to);

	/* the distance between the trip and that part of the route */
	st = fr_prep_subcurve(env, q, from, to, false, &sub, &sub_pos);
	if (st == FR_OK)
		st = fr_distance_prepared(env, p, &sub, distance, stats);

	/*
	 * A start that the reversed sweep found in its own rounding must still
	 * give a part within eps; where it does not by more than rounding
	 * (1e-9 of eps, 1e-12 of the coordinates), the forward start is used.
	 */
	if (st == FR_OK &&
		*distance > eps + 1e-9 * eps + 1e-12 * fmax(fr_prep_magnitude(p), fr_prep_magnitude(q)))
	{
		fr_release_prep(env, &sub);
		fr_free(env, sub_pos);
		sub_pos = NULL;
		st = forward_start(env, p, q, eps, end, row, &start, stats);
		from = fmin(edge_pos_value(start), to);
		if (st == FR_OK)
			st = fr_prep_subcurve(env, q, from, to, false, &sub, &sub_pos);
		if (st == FR_OK)
			st = fr_distance_prepared(env, p, &sub, distance, stats);
	}
	*route_from = from;
	*route_to = to;

done:
	fr_release_prep(env, &rp);
	fr_release_prep(env, &rq);
	fr_release_prep(env, &sub);
	fr_free(env, rp_pos);
	fr_free(env, rq_pos);
	fr_free(env, sub_pos);
	fr_free(env, row);
	if (st != FR_OK)
		*found = false;
	return st;
}

/* The part of the route that the trip follows within eps (fr_partial_match_prepared). */
fr_status
fr_partial_match(const fr_env *env, const fr_curve *trip, const fr_curve *route,
				 double eps, bool *found, double *route_from, double *route_to,
				 double *distance, fr_stats *stats)
{
	fr_prep		p,
				q;
	fr_status	st;

	*found = false;
	st = fr_prepare_pair(env, trip, route, &p, &q);
	if (st != FR_OK)
		return st;
	st = fr_partial_match_prepared(env, &p, &q, fr_to_local(&p, eps), found, route_from,
								   route_to, distance, stats);
	if (st == FR_OK && *found)
		*distance = fr_from_local(&p, *distance);
	fr_release_pair(env, &p, &q);
	return st;
}

/*
 * The lowest reachable place of the right edge when paths start anywhere
 * on the left edge (the earliest end of a part of q matched to all of p),
 * as a position on q; *found false when none.  row has room for p->n
 * doubles.
 */
fr_status
fr_partial_earliest_end(const fr_env *env, const fr_prep *p, const fr_prep *q, double eps,
						double *row, bool *found, double *end, fr_stats *stats)
{
	edge_pos	best = {0, 0};
	fr_status	st;

	if (q->n == 1 || p->n == 1)
	{
		double		from,
					to;

		*found = degenerate_partial(p, q, &from, &to) <= eps;
		*end = to;
		if (*found && p->n == 1)
		{
			/* a one-point p: the first place of q within eps of it */
			for (size_t j = 0; j + 1 < q->n; j++)
			{
				double		lo,
							hi;

				fr_free_interval(&p->v[0], &q->v[j], &q->s[j], &q->v[j + 1], eps, &lo, &hi);
				if (lo <= hi)
				{
					*end = (double) j + lo;
					break;
				}
			}
		}
		return FR_OK;
	}
	st = partial_sweep(env, p, q, eps, START_ANYWHERE, NULL, NULL, row, found, &best, true, stats);
	*end = edge_pos_value(best);
	return st;
}

/* The partial decider on prepared curves (paths from anywhere on the left edge to the right). */
fr_status
fr_partial_decide_prepared(const fr_env *env, const fr_prep *p, const fr_prep *q, double eps,
						   double *row, bool *result, fr_stats *stats)
{
	if (p->n == 1 || q->n == 1)
	{
		double		from,
					to;

		*result = degenerate_partial(p, q, &from, &to) <= eps;
		return FR_OK;
	}
	return partial_decide(env, p, q, eps, row, result, stats);
}

/*
 * The bounds of the partial distance's search: both ends of the trip p
 * must meet q somewhere (below); every part of q bounds it from above
 * through a greedy matching: all of q, and the part between the vertices
 * around the places nearest p's first and last vertices, when in order
 * (on a long route the search then starts near the answer, where the
 * windowed decider sweeps little).
 */
void
fr_partial_bounds(const fr_prep *p, const fr_prep *q, double *lo, double *hi)
{
	double		from,
				to;

	*lo = fmax(point_to_curve(&p->v[0], q, true, &from), point_to_curve(&p->v[p->n - 1], q, true, &to));
	*hi = fr_greedy_upper_bound(p, q);
	if (from <= to)
	{
		size_t		i = (size_t) floor(from),
					j = (size_t) ceil(to);
		fr_prep		part = *q;

		/* a view of vertices i..j of q, their segments with them */
		if (j >= q->n)
			j = q->n - 1;
		if (j > i)
		{
			part.v = q->v + i;
			part.s = q->s + i;
			part.n = j - i + 1;
			part.block = NULL;
			*hi = fmin(*hi, fr_greedy_upper_bound(p, &part));
		}
	}
}
