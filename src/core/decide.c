/*
 * decide.c - the decision "Fréchet distance <= eps" by reachability in the
 * free space (Alt & Godau 1995, section 3): reachable parts of cell
 * boundaries are propagated row by row (reach.c); only one row is kept,
 * O(n+m) memory.  The plain decider, the exact one (the pruning decider of
 * prune.c where there is a diagram) and the one offered to callers (the
 * cheap bounds of bounds.c first).
 */
#include <math.h>

#include "fr_internal.h"
#include "bounds.h"

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
