/*
 * decide.c - the decision "Fréchet distance <= eps" by reachability in the
 * free space (Alt & Godau 1995, section 3): reachable parts of cell
 * boundaries are propagated row by row; only one row is kept, O(n+m) memory.
 *
 * Layout used throughout the engine: curve p runs along the x axis of the
 * free space (cells i = 0..n-2), curve q along y (rows j = 0..m-2).  A
 * reachable set on a cell boundary is stored as the lower end of its
 * reachable part (FR_EMPTY if none); its upper end is always the free
 * interval's upper end, because reachability only ever cuts from below.
 */
#include <math.h>

#include "fr_internal.h"
#include "bounds.h"

/*
 * Bottom edge of the diagram (row 0's bottom boundaries), reachable from
 * (0,0) along y = 0 while fully free.  row gets n - 1 entries.
 */
void
fr_bottom_edge(const fr_prep *p, const fr_prep *q, double eps, double *row)
{
	bool		open = true;

	for (size_t i = 0; i + 1 < p->n; i++)
	{
		double		lo,
					hi;

		row[i] = FR_EMPTY;
		if (!open)
			continue;
		fr_free_interval(&q->v[0], &p->v[i], &p->s[i], &p->v[i + 1], eps, &lo, &hi);
		if (lo == 0.0)
			row[i] = 0.0;
		open = lo == 0.0 && hi == 1.0;
	}
}

/*
 * Left edge of row j: the free interval of p[0] against segment q[j].
 * Returns its lower end (FR_EMPTY if empty); *full says whether it is all of
 * [0,1].
 */
double
fr_left_edge(const fr_prep *p, const fr_prep *q, size_t j, double eps, bool *full)
{
	double		lo,
				hi;

	fr_free_interval(&p->v[0], &q->v[j], &q->s[j], &q->v[j + 1], eps, &lo, &hi);
	*full = lo == 0.0 && hi == 1.0;
	return lo <= hi ? lo : FR_EMPTY;
}

/*
 * Propagates reachability through row j.  On entry row[i] is the reachable
 * lower end on the bottom of cell (i, j) and lr the one on the left edge;
 * on return row[i] is that of the top of cell (i, j).  If left is not NULL,
 * left[i] receives the reachable lower end on the left boundary of cell
 * (i, j) for i = 0..n-1 (left[n-1]: the right edge of the diagram).
 * Returns the reachable lower end on the right edge; *any_top says whether
 * any top boundary is reachable.  FR_EINTR if interrupted.
 */
fr_status
fr_row_step(const fr_prep *p, const fr_prep *q, size_t j, double eps,
			double *row, double lr, double *left, double *right,
			bool *any_top, fr_poll *poll)
{
	const size_t n = p->n;
	const fr_pt *pv = p->v,
			   *qa = &q->v[j],
			   *qb = &q->v[j + 1];
	const fr_seg *qs = &q->s[j];
	bool		any = false;

	for (size_t i = 0; i + 1 < n; i++)
	{
		double		br = row[i],
					a,
					b,
					c,
					d,
					nlr,
					nbr;

		if (left)
			left[i] = lr;
		if (br == FR_EMPTY && lr == FR_EMPTY)
			continue;			/* nothing enters: right and top stay empty */

		/* right boundary: vertex p[i+1] against segment q[j]q[j+1] */
		fr_free_interval(&pv[i + 1], qa, qs, qb, eps, &a, &b);
		nlr = fr_reach_out(a, b, br, lr);
		/* top boundary: vertex q[j+1] against segment p[i]p[i+1] */
		fr_free_interval(qb, &pv[i], &p->s[i], &pv[i + 1], eps, &c, &d);
		nbr = fr_reach_out(c, d, lr, br);
		row[i] = nbr;
		lr = nlr;
		any |= nbr != FR_EMPTY;
		/* long rows: poll inside the row as well (cancel within ~100 ms) */
		if ((i & 0xFFFF) == 0xFFFF && fr_poll_add(poll, 0x10000))
			return FR_EINTR;
	}
	if (left)
		left[n - 1] = lr;
	*right = lr;
	*any_top = any;
	if (fr_poll_add(poll, (n - 1) & 0xFFFF))
		return FR_EINTR;
	return FR_OK;
}

/*
 * Decision on prepared curves.  row must have room for n - 1 doubles.
 */
fr_status
fr_decide_prepared(const fr_env *env, const fr_prep *p, const fr_prep *q,
				   double eps, double *row, bool *result, fr_stats *stats)
{
	const size_t n = p->n,
				m = q->n;
	fr_poll		poll;
	bool		open = true;
	double		right = FR_EMPTY;

	if (stats)
		stats->decisions++;
	if (isinf(eps))
	{
		*result = true;
		return FR_OK;
	}
	if (n == 1 || m == 1)
	{
		double		d = n == 1 ? fr_point_curve_dist(&p->v[0], q) : fr_point_curve_dist(&q->v[0], p);

		*result = d <= eps;
		return FR_OK;
	}
	if (fr_pt_dist(&p->v[0], &q->v[0]) > eps || fr_pt_dist(&p->v[n - 1], &q->v[m - 1]) > eps)
	{
		*result = false;
		return FR_OK;
	}
	fr_poll_init(&poll, env);
	fr_bottom_edge(p, q, eps, row);
	for (size_t j = 0; j + 1 < m; j++)
	{
		double		lr = FR_EMPTY;
		bool		any_top;
		fr_status	st;

		/* the left edge is reachable from (0,0) while fully free */
		if (open)
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
		/* nothing reaches the next row: no later row is reachable either */
		if (!any_top && !open && j + 2 < m)
		{
			*result = false;
			return FR_OK;
		}
	}
	/* the end point (1 on the last boundaries) is free, so non-empty means reached */
	*result = right != FR_EMPTY || row[n - 2] != FR_EMPTY;
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
	eps = fr_to_local(&pp, eps);
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
 * The decision without the cheap filters: prepared curves, then the
 * pruning decider (the plain one where there is no diagram to prune).
 * For callers that have already run fr_cheap_decide.
 */
fr_status
fr_decide_exact(const fr_env *env, const fr_curve *p, const fr_curve *q,
				double eps, bool *result, fr_stats *stats)
{
	fr_prep		pp,
				pq;
	void	   *work;
	fr_status	st;

	/* the pruning decider's work memory comes in the same block as the curves */
	if (!fr_pair_valid(p, q))
		return FR_EINVAL;
	st = fr_prepare_pair_extra(env, p, q, &pp, &pq, fr_prune_work_bytes(p->n, q->n), &work);
	if (st != FR_OK)
		return st;
	fr_prep_drop_repeats(&pp);
	fr_prep_drop_repeats(&pq);
	eps = fr_to_local(&pp, eps);
	if (isinf(eps) || pp.n == 1 || pq.n == 1)
	{
		double		row;

		/* no diagram to prune: the plain decider is O(n + m) here */
		st = fr_decide_prepared(env, &pp, &pq, eps, &row, result, stats);
		fr_release_pair(env, &pp, &pq);
		return st;
	}
	if (stats)
		stats->decisions++;
	/* the pruning decider's own contract: both end pairs within eps */
	if (fr_pt_dist(&pp.v[0], &pq.v[0]) > eps ||
		fr_pt_dist(&pp.v[pp.n - 1], &pq.v[pq.n - 1]) > eps)
		*result = false;
	else
	{
		fr_prune_setup(work, &pp, &pq);
		st = fr_decide_pruned(env, &pp, &pq, eps, work, result, stats, NULL);
	}
	fr_release_pair(env, &pp, &pq);
	return st;
}

/*
 * The decision offered to callers: the cheap bounds of bounds.c (end
 * points, boxes, greedy couplings, far vertices; in spirit Bringmann,
 * Künnemann & Nusser 2019, section 3), which need no memory, then the
 * pruning decider.  It agrees with fr_decide_plain on every input (tests
 * compare them).
 */
fr_status
fr_decide(const fr_env *env, const fr_curve *p, const fr_curve *q,
		  double eps, bool *result, fr_stats *stats)
{
	if (!fr_pair_valid(p, q))
		return FR_EINVAL;
	switch (fr_cheap_decide(p, q, eps))
	{
		case FR_NEAR:
			*result = true;
			return FR_OK;
		case FR_FAR:
			*result = false;
			return FR_OK;
		default:
			return fr_decide_exact(env, p, q, eps, result, stats);
	}
}
