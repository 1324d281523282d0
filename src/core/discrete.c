/*
 * discrete.c - the discrete Fréchet distance (Eiter & Mannila 1994):
 * couplings of vertices only, by dynamic programming over the n x m table
 * of vertex distances, one row at a time, O(min(n,m)) memory.
 */
#include "fr_internal.h"

/* Discrete Fréchet distance between two curves. */
fr_status
fr_discrete_distance(const fr_env *env, const fr_curve *p, const fr_curve *q,
					 double *result)
{
	fr_prep		pp,
				pq;
	const fr_prep *rows,
			   *cols;
	double	   *row;
	fr_poll		poll;
	fr_status	st;

	st = fr_prepare_pair(env, p, q, &pp, &pq);
	if (st != FR_OK)
		return st;
	/* keep the row along the shorter curve */
	rows = pp.n >= pq.n ? &pp : &pq;
	cols = pp.n >= pq.n ? &pq : &pp;
	row = fr_alloc(env, cols->n * sizeof(double));
	if (row == NULL)
	{
		fr_release_pair(env, &pp, &pq);
		return FR_ENOMEM;
	}
	fr_poll_init(&poll, env);

	/* row[j]: smallest coupling leash reaching vertex pair (i, j) */
	row[0] = fr_pt_dist(&rows->v[0], &cols->v[0]);
	for (size_t j = 1; j < cols->n; j++)
	{
		double		d = fr_pt_dist(&rows->v[0], &cols->v[j]);

		row[j] = d > row[j - 1] ? d : row[j - 1];
	}
	for (size_t i = 1; i < rows->n; i++)
	{
		double		diag = row[0],
					d = fr_pt_dist(&rows->v[i], &cols->v[0]);

		row[0] = d > row[0] ? d : row[0];
		for (size_t j = 1; j < cols->n; j++)
		{
			double		up = row[j],
						best = up;

			if (row[j - 1] < best)
				best = row[j - 1];
			if (diag < best)
				best = diag;
			d = fr_pt_dist(&rows->v[i], &cols->v[j]);
			row[j] = d > best ? d : best;
			diag = up;
		}
		if (fr_poll_add(&poll, cols->n))
		{
			st = FR_EINTR;
			break;
		}
	}
	if (st == FR_OK)
		*result = fr_from_local(&pp, row[cols->n - 1]);
	fr_free(env, row);
	fr_release_pair(env, &pp, &pq);
	return st;
}
