/*
 * progress.c - where a trip in progress is on its route.
 *
 * The trip so far matches a prefix of the route when the free space of
 * (route, trip) at eps has a monotone path from (0, 0) to a point (s, end
 * of the trip): the reachability of Alt & Godau (1995, section 3) with
 * the route's end left free, as in their partial matching with a fixed
 * start.  The reachable places s form intervals on the diagram's top
 * line (one per route segment, each the free interval of the trip's last
 * point cut from below); the first connected stretch of them (nearest the
 * route's start) is the stretch the trip is on, and within it the place
 * nearest the trip's last point is where the trip is now.  So a bus
 * waiting at the first stop of a loop line is at its start, not its end.
 *
 * Cost: one sweep of the free space row by row, visiting only the band
 * of cells that reachability enters (fr_row_step_band), so on a real
 * trip near its route about the band's width a row, not the route's
 * length; the rows stop early when nothing reaches the next one.  Layout as in reach.c: the route
 * runs along x (cells i), the trip along y (rows j).
 */
#include <math.h>

#include "fr_internal.h"

/* Scratch bytes of fr_progress on a trip of n and a route of m vertices. */
size_t
fr_progress_scratch_bytes(size_t n, size_t m)
{
	return fr_scratch_bytes(m, n) + (m + 1) * sizeof(double) + 64;
}

/*
 * The place of the first connected stretch of reachable places on the top
 * line nearest the trip's last point; row[i] the reachable lower end on
 * top of cell i (FR_EMPTY: none).  False when no place is reachable.
 */
static bool
nearest_in_first_stretch(const fr_prep *route, const fr_pt *last, double eps,
						 const double *row, double *pos)
{
	double		best = INFINITY;
	bool		started = false;

	for (size_t i = 0; i + 1 < route->n; i++)
	{
		double		lo,
					hi,
					t,
					d;
		fr_pt		pt;

		if (row[i] == FR_EMPTY)
		{
			if (started)
				break;
			continue;
		}
		fr_free_interval(last, &route->v[i], &route->s[i], &route->v[i + 1], eps, &lo, &hi);
		/* a stretch continues into this cell only from its start */
		if (started && row[i] > 0.0)
			break;
		started = true;
		t = fr_nearest_param(last, route, i, row[i], fmax(row[i], hi));
		pt = fr_prep_point(route, i, t);
		d = fr_pt_dist(last, &pt);
		if (d < best)
		{
			best = d;
			*pos = (double) i + t;
		}
		/* the stretch goes on only through the segment's end */
		if (hi < 1.0)
			break;
	}
	return started;
}

/*
 * Is the trip so far (all of it) within eps of a prefix of the route, and
 * where on the route is it now?  *found says whether there is such a
 * prefix; *route_pos (0-based k + t) is the place described above and
 * *fraction its share of the route's length (0 for a route of one point).
 */
fr_status
fr_progress(const fr_env *env, const fr_curve *trip, const fr_curve *route, double eps,
			bool *found, double *route_pos, double *fraction)
{
	fr_prep		pr,
				pt;
	double	   *row;
	fr_poll		poll;
	fr_status	st;
	bool		open = true;
	size_t		first,
				last;

	*found = false;
	*route_pos = 0.0;
	*fraction = 0.0;
	if (!fr_pair_valid(trip, route))
		return FR_EINVAL;
	st = fr_prepare_pair(env, route, trip, &pr, &pt);
	if (st != FR_OK)
		return st;
	eps = fr_to_local(&pr, eps);
	if (isinf(eps))
		eps = DBL_MAX;
	if (pr.n == 1)
	{
		/* a route of one point: the whole trip near it */
		*found = true;
		for (size_t j = 0; j < pt.n && *found; j++)
			*found = fr_pt_dist(&pt.v[j], &pr.v[0]) <= eps;
		fr_release_pair(env, &pr, &pt);
		return FR_OK;
	}
	if (fr_pt_dist(&pt.v[0], &pr.v[0]) > eps)
	{
		fr_release_pair(env, &pr, &pt);
		return FR_OK;
	}
	row = fr_alloc(env, (pr.n - 1) * sizeof(double));
	if (row == NULL)
	{
		fr_release_pair(env, &pr, &pt);
		return FR_ENOMEM;
	}
	fr_poll_init(&poll, env);
	fr_bottom_edge(&pr, &pt, eps, row);
	/* the reachable part of the bottom edge is a prefix of cells */
	first = 0;
	last = 0;
	while (last + 1 < pr.n && row[last] != FR_EMPTY)
		last++;
	if (last == 0)
		first = 1;				/* empty band */
	else
		last--;
	for (size_t j = 0; j + 1 < pt.n; j++)
	{
		double		lr = FR_EMPTY,
					right;
		bool		any_top;

		if (open)
		{
			lr = fr_left_edge(&pr, &pt, j, eps, &open);
			if (lr != 0.0)
				lr = FR_EMPTY;
		}
		/* only the band of cells that reachability enters (cost: its width) */
		st = fr_row_step_band(&pr, &pt, j, eps, row, lr, &first, &last, &right, &any_top, &poll);
		if (st != FR_OK)
			break;
		/* nothing reaches the next row: the trip left every prefix (row is all empty) */
		if (!any_top && !open)
			break;
	}
	if (st == FR_OK && nearest_in_first_stretch(&pr, &pt.v[pt.n - 1], eps, row, route_pos))
	{
		double		total = 0.0,
					upto = 0.0;
		size_t		k = (size_t) floor(*route_pos);

		for (size_t i = 0; i + 1 < pr.n; i++)
		{
			total += pr.s[i].len;
			if (i < k)
				upto += pr.s[i].len;
		}
		if (k + 1 < pr.n)
			upto += (*route_pos - (double) k) * pr.s[k].len;
		*fraction = total > 0.0 ? fmin(1.0, upto / total) : 0.0;
		*found = true;
	}
	fr_free(env, row);
	fr_release_pair(env, &pr, &pt);
	return st;
}
