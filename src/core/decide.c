/*
 * decide.c - the decision "Fréchet distance <= eps" by reachability in the
 * free space (Alt & Godau 1995, section 3): reachable parts of cell
 * boundaries are propagated row by row; only one row is kept, O(n+m) memory.
 */
#include <math.h>

#include "fr_internal.h"

/*
 * Decision on prepared curves.  Curve p runs along the x axis of the free
 * space (cells i = 0..n-2), q along y (rows j = 0..m-2).  row[i] holds the
 * lower end of the reachable part of the bottom boundary of cell (i, j)
 * (FR_EMPTY if none); its upper end is always the free interval's upper end,
 * because reachability only ever cuts intervals from below.  row must have
 * room for n - 1 doubles.
 */
fr_status
fr_decide_prepared(const fr_env *env, const fr_prep *p, const fr_prep *q,
				   double eps, double *row, bool *result, fr_stats *stats)
{
	const size_t n = p->n,
				m = q->n;
	const fr_pt *pv = p->v,
			   *qv = q->v;
	fr_poll		poll;
	bool		open;
	double		lr = FR_EMPTY;

	if (stats)
		stats->decisions++;
	if (isinf(eps))
	{
		*result = true;
		return FR_OK;
	}
	if (n == 1 || m == 1)
	{
		double		d = n == 1 ? fr_point_curve_dist(&pv[0], q) : fr_point_curve_dist(&qv[0], p);

		*result = d <= eps;
		return FR_OK;
	}
	if (fr_pt_dist(&pv[0], &qv[0]) > eps || fr_pt_dist(&pv[n - 1], &qv[m - 1]) > eps)
	{
		*result = false;
		return FR_OK;
	}
	fr_poll_init(&poll, env);

	/* bottom edge of the diagram: reachable from (0,0) while fully free */
	open = true;
	for (size_t i = 0; i + 1 < n; i++)
	{
		double		lo,
					hi;

		row[i] = FR_EMPTY;
		if (!open)
			continue;
		fr_free_interval(&qv[0], &pv[i], &p->s[i], &pv[i + 1], eps, &lo, &hi);
		if (lo == 0.0)
			row[i] = 0.0;
		open = lo == 0.0 && hi == 1.0;
	}

	open = true;				/* the left edge, likewise */
	for (size_t j = 0; j + 1 < m; j++)
	{
		const fr_pt *qa = &qv[j],
				   *qb = &qv[j + 1];
		const fr_seg *qs = &q->s[j];
		bool		any_top = false;

		lr = FR_EMPTY;
		if (open)
		{
			double		lo,
						hi;

			fr_free_interval(&pv[0], qa, qs, qb, eps, &lo, &hi);
			if (lo == 0.0)
				lr = 0.0;
			open = lo == 0.0 && hi == 1.0;
		}
		for (size_t i = 0; i + 1 < n; i++)
		{
			double		br = row[i],
						a,
						b,
						c,
						d,
						nlr,
						nbr;

			if (br == FR_EMPTY && lr == FR_EMPTY)
				continue;		/* nothing enters: right and top stay empty */

			/* right boundary: vertex p[i+1] against segment q[j]q[j+1] */
			fr_free_interval(&pv[i + 1], qa, qs, qb, eps, &a, &b);
			if (br != FR_EMPTY)
				nlr = a <= b ? a : FR_EMPTY;
			else
			{
				nlr = a > lr ? a : lr;
				if (nlr > b)
					nlr = FR_EMPTY;
			}
			/* top boundary: vertex q[j+1] against segment p[i]p[i+1] */
			fr_free_interval(qb, &pv[i], &p->s[i], &pv[i + 1], eps, &c, &d);
			if (lr != FR_EMPTY)
				nbr = c <= d ? c : FR_EMPTY;
			else
			{
				nbr = c > br ? c : br;
				if (nbr > d)
					nbr = FR_EMPTY;
			}
			row[i] = nbr;
			lr = nlr;
			any_top |= nbr != FR_EMPTY;
			/* long rows: poll inside the row as well (cancel within ~100 ms) */
			if ((i & 0xFFFF) == 0xFFFF && fr_poll_add(&poll, 0x10000))
				return FR_EINTR;
		}
		if (stats)
			stats->cells += n - 1;
		/* nothing reaches the next row: no later row is reachable either */
		if (!any_top && !open && j + 2 < m)
		{
			*result = false;
			return FR_OK;
		}
		if (fr_poll_add(&poll, (n - 1) & 0xFFFF))
			return FR_EINTR;
	}
	/* the end point (1 on the last boundaries) is free, so non-empty means reached */
	*result = lr != FR_EMPTY || row[n - 2] != FR_EMPTY;
	return FR_OK;
}

/* Prepares, decides with the plain reachability propagation, releases. */
fr_status
fr_decide_plain(const fr_env *env, const fr_curve *p, const fr_curve *q,
				double eps, bool *result, fr_stats *stats)
{
	fr_prep		pp,
				pq;
	double	   *row;
	fr_status	st;

	st = fr_prepare_pair(env, p, q, &pp, &pq);
	if (st != FR_OK)
		return st;
	row = fr_alloc(env, (pp.n > 1 ? pp.n - 1 : 1) * sizeof(double));
	if (row == NULL)
		st = FR_ENOMEM;
	else
		st = fr_decide_prepared(env, &pp, &pq, eps, row, result, stats);
	fr_free(env, row);
	fr_release_pair(env, &pp, &pq);
	return st;
}

/*
 * The decision offered to callers.  For now it is the plain decider; faster
 * deciders must agree with fr_decide_plain and are tested against it.
 */
fr_status
fr_decide(const fr_env *env, const fr_curve *p, const fr_curve *q,
		  double eps, bool *result, fr_stats *stats)
{
	return fr_decide_plain(env, p, q, eps, result, stats);
}
