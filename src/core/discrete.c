/*
 * discrete.c - the discrete Fréchet distance (Eiter & Mannila 1994):
 * couplings of vertices only, by dynamic programming over the n x m table
 * of vertex distances, one row at a time, O(min(n,m)) memory.
 */
#include <string.h>

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
 * p.  Squared distances are classified without square roots where plain
 * (fr_within_d2).
 *
 * Where a row has no reachable pair the sweep reports the row (a "wall":
 * the continuous free space is often blocked near there too, which
 * prune.c then tries to certify) and, if asked to go on, restarts from the
 * pairs within eps near where the band was.  Only the first pass, with no
 * restart, proves anything; the rows reported after a restart are hints.
 * The sweep gives up after budget pairs, so it costs little where it
 * cannot succeed.
 */
void
fr_coupling_begin(fr_coupling_sweep *c, const fr_prep *p, const fr_prep *q, double eps,
				  unsigned char *row, size_t budget, fr_poll *poll)
{
	c->p = p;
	c->poll = poll;
	c->q = q;
	c->w = fr_within_init(eps);
	c->row = row;
	c->budget = budget;
	c->visited = 0;
	c->restarted = false;
	c->lo = 0;
	c->hi = 0;
	c->j = 1;
	/* row 0: along q[0] from (0, 0) while the pairs stay within eps */
	c->dead = !fr_within_d2(&c->w, fr_pt_dist2(&p->v[0], &q->v[0]));
	if (c->dead)
		return;
	row[0] = 1;
	while (c->hi + 1 < p->n && fr_within_d2(&c->w, fr_pt_dist2(&p->v[c->hi + 1], &q->v[0])))
		row[++c->hi] = 1;
}

/* Columns on either side of the lost band that a restart looks at. */
#define RESTART_REACH 8

/*
 * Sweeps on to the next event: FR_SWEEP_THROUGH if the last pair is
 * reached on the first pass (a coupling within eps exists), FR_SWEEP_WALL
 * with *wall = the row with no reachable pair, FR_SWEEP_END when the
 * diagram ends after a restart or the budget is spent, FR_SWEEP_STOP if
 * the poll reports an interrupt (it is asked row by row).
 */
fr_sweep_event
fr_coupling_next(fr_coupling_sweep *c, size_t *wall)
{
	const fr_prep *p = c->p,
			   *q = c->q;
	const size_t n = p->n,
				m = q->n;
	unsigned char *row = c->row;

	if (c->dead)
		return FR_SWEEP_END;
	for (; c->j < m; c->j++)
	{
		const size_t j = c->j;
		size_t		nlo = n,
					nhi = 0,
					i = c->lo,
					hi = c->hi;
		bool		left = false,	/* (i-1, j) reachable */
					diag = false;	/* (i-1, j-1) reachable */

		/* columns lo .. hi + 1 can be entered from below; on, while the row runs */
		for (; i < n && (i <= hi + 1 || left); i++)
		{
			bool		below = (i <= hi) & (row[i] != 0),
						r;

			r = (below | left | diag) & fr_within_d2(&c->w, fr_pt_dist2(&p->v[i], &q->v[j]));
			diag = below;
			row[i] = r;
			left = r;
			nlo = (r & (nlo == n)) ? i : nlo;
			nhi = r ? i : nhi;
		}
		c->visited += i - c->lo;
		if (c->visited > c->budget)
		{
			c->dead = true;
			return FR_SWEEP_END;
		}
		if (c->poll && fr_poll_add(c->poll, i - c->lo + 1))
		{
			c->dead = true;
			return FR_SWEEP_STOP;
		}
		if (nlo == n)
		{
			/*
			 * A wall.  Restart from the pairs of this row within eps
			 * near the old band, or, if there are none, carry the old
			 * band on unchanged.
			 */
			size_t		a = c->lo > RESTART_REACH ? c->lo - RESTART_REACH : 0,
						b = hi + 2 * RESTART_REACH < n ? hi + 2 * RESTART_REACH : n - 1;

			for (size_t k = a; k <= b; k++)
			{
				bool		r = fr_within_d2(&c->w, fr_pt_dist2(&p->v[k], &q->v[j]));

				row[k] = r;
				nlo = (r & (nlo == n)) ? k : nlo;
				nhi = r ? k : nhi;
			}
			c->visited += b + 1 - a;
			if (nlo == n)
			{
				nlo = c->lo;
				nhi = hi;
				memset(row + nlo, 1, nhi + 1 - nlo);
			}
			c->lo = nlo;
			c->hi = nhi;
			c->restarted = true;
			*wall = c->j++;
			return FR_SWEEP_WALL;
		}
		c->lo = nlo;
		c->hi = nhi;
	}
	c->dead = true;
	return !c->restarted && c->hi == n - 1 && row[n - 1] ? FR_SWEEP_THROUGH : FR_SWEEP_END;
}

/* Is there a vertex coupling within eps? */
bool
fr_coupling_within(const fr_prep *p, const fr_prep *q, double eps, unsigned char *row)
{
	fr_coupling_sweep c;
	size_t		wall;

	fr_coupling_begin(&c, p, q, eps, row, SIZE_MAX, NULL);
	return fr_coupling_next(&c, &wall) == FR_SWEEP_THROUGH;
}
