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

/*
 * A positive filter for the deciders: is there a monotone vertex coupling
 * (a discrete Fréchet matching, Eiter & Mannila 1994) whose every pair is
 * within eps by the deciders' own vertex test (fr_pt_dist <= eps)?  Then
 * the deciders accept eps too: a coupled pair is a free corner of the free
 * space, a step between coupled pairs stays inside one convex cell (or
 * along a boundary both of whose ends are free), and the deciders' free
 * intervals contain a boundary's end exactly when its vertex test passes,
 * so the corner-to-corner path is one they propagate.  (Hence also
 * d <= d_discrete.)
 *
 * Reachable pairs are swept row by row (rows: vertices of q), visiting
 * only the columns something can enter; row holds one flag per vertex of
 * p.  Gives up (false) after budget pairs, so it costs little where it
 * cannot succeed.  Squared distances are classified without square roots
 * where plain (fr_within_d2).
 */
bool
fr_coupling_within(const fr_prep *p, const fr_prep *q, double eps, unsigned char *row,
				   size_t budget)
{
	const size_t n = p->n,
				m = q->n;
	const fr_within w = fr_within_init(eps);
	size_t		lo = 0,
				hi = 0,
				visited = 0;

	/* row 0: along q[0] from (0, 0) while the pairs stay within eps */
	if (!fr_within_d2(&w, fr_pt_dist2(&p->v[0], &q->v[0])))
		return false;
	row[0] = 1;
	while (hi + 1 < n && fr_within_d2(&w, fr_pt_dist2(&p->v[hi + 1], &q->v[0])))
		row[++hi] = 1;
	for (size_t j = 1; j < m; j++)
	{
		size_t		nlo = n,
					nhi = 0,
					i = lo;
		bool		left = false,	/* (i-1, j) reachable */
					diag = false;	/* (i-1, j-1) reachable */

		/* columns lo .. hi + 1 can be entered from below; on, while the row runs */
		for (; i < n && (i <= hi + 1 || left); i++)
		{
			bool		below = (i <= hi) & (row[i] != 0),
						r;

			r = (below | left | diag) & fr_within_d2(&w, fr_pt_dist2(&p->v[i], &q->v[j]));
			diag = below;
			row[i] = r;
			left = r;
			nlo = (r & (nlo == n)) ? i : nlo;
			nhi = r ? i : nhi;
		}
		visited += i - lo;
		if (nlo == n || visited > budget)
			return false;
		lo = nlo;
		hi = nhi;
	}
	return hi == n - 1 && row[n - 1];
}
