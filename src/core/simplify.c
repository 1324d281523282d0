/*
 * simplify.c - simplification with a Fréchet guarantee (Agarwal,
 * Har-Peled, Mustafa & Wang, "Near-linear time approximation algorithms for
 * curve simplification", Algorithmica 2005).  Greedily, from the last kept
 * vertex i, take the vertex j as far along as an exponential then binary
 * search finds with the piece P[i..j] within tol of the segment P_i P_j
 * (Fréchet distance); keep j, repeat.  Each piece is within tol of its
 * segment, and matchings of consecutive pieces concatenate, so the result is
 * within tol of the curve.  They show the result has no more vertices than
 * an optimal simplification with error tol / 2 (our reading of their
 * analysis).  Each test is a decision on a 1-row free space, so the whole
 * takes O(n log n) time.
 */
#include <math.h>
#include <string.h>

#include "fr_internal.h"

/*
 * The plain decider (fr_decide_prepared) on a free space of one row: the
 * piece along the columns, one segment along the row.  Tops of cells feed
 * nothing in a single row, so only the last one, which carries the answer,
 * is computed: one free interval per vertex instead of two, with the same
 * operations in the same order as fr_row_step, so the answers are the same
 * (test_simplify compares them).
 */
bool
fr_one_row_decide(const fr_prep *piece, const fr_prep *seg, double eps, double *row)
{
	const size_t n = piece->n;
	const fr_pt *pv = piece->v,
			   *qa = &seg->v[0],
			   *qb = &seg->v[1];
	const fr_seg *qs = &seg->s[0];
	bool		open;
	double		lr,
				top = FR_EMPTY;

	if (isinf(eps))
		return true;
	if (fr_pt_dist(&pv[0], qa) > eps || fr_pt_dist(&pv[n - 1], qb) > eps)
		return false;
	fr_bottom_edge(piece, seg, eps, row);
	lr = fr_left_edge(piece, seg, 0, eps, &open);
	if (lr != 0.0)
		lr = FR_EMPTY;
	for (size_t i = 0; i + 1 < n; i++)
	{
		double		br = row[i],
					a,
					b,
					nlr;

		if (br == FR_EMPTY && lr == FR_EMPTY)
			return false;		/* the bottom's reachable part is a prefix: nothing enters later */
		fr_free_interval(&pv[i + 1], qa, qs, qb, eps, &a, &b);
		nlr = fr_reach_out(a, b, br, lr);
		if (i + 2 == n)
		{
			double		c,
						d;

			/* the last cell's top: vertex q[1] against segment p[i] */
			fr_free_interval(qb, &pv[i], &piece->s[i], &pv[i + 1], eps, &c, &d);
			top = fr_reach_out(c, d, lr, br);
		}
		lr = nlr;
	}
	return lr != FR_EMPTY || top != FR_EMPTY;
}

/* Is the piece c[i..j] within tol of the segment from c[i] to c[j]? */
static void
piece_fits(const fr_prep *c, size_t i, size_t j, double tol, double *row, bool *fits)
{
	fr_prep		piece,
				seg;
	fr_pt		ends[2];
	fr_seg		s;

	if (j <= i + 1)
	{
		*fits = true;			/* a single segment is its own simplification */
		return;
	}
	piece.v = c->v + i;
	piece.s = c->s + i;
	piece.n = j - i + 1;
	ends[0] = c->v[i];
	ends[1] = c->v[j];
	s = fr_seg_between(&ends[0], &ends[1]);
	seg.v = ends;
	seg.s = &s;
	seg.n = 2;
	/* the piece runs along the columns: a row of j - i cells */
	*fits = fr_one_row_decide(&piece, &seg, tol, row);
}

/* Simplification of a curve within tol; see the top of this file. */
fr_status
fr_simplify(const fr_env *env, const fr_curve *c, double tol, size_t **keep, size_t *count)
{
	return fr_simplify_upto(env, c, tol, c->n, keep, count);
}

/*
 * The same, giving up once more than max_keep vertices are kept: then
 * *count is max_keep + 1 and *keep holds only the first of them.  For
 * callers that want a simplification only when it is short.
 */
fr_status
fr_simplify_upto(const fr_env *env, const fr_curve *c, double tol, size_t max_keep,
				 size_t **keep, size_t *count)
{
	fr_prep		p,
				unused;
	fr_curve	none = {c->coords, 1, c->dim};
	size_t	   *out = NULL;
	double	   *row = NULL;
	size_t		k = 0,
				i = 0;
	fr_status	st;
	fr_poll		poll;

	*keep = NULL;
	*count = 0;
	st = fr_prepare_pair(env, c, &none, &p, &unused);
	if (st != FR_OK)
		return st;
	tol = fr_to_local(&p, tol);
	out = fr_alloc(env, c->n * sizeof(size_t));
	row = fr_alloc(env, c->n * sizeof(double));
	if (out == NULL || row == NULL)
	{
		st = FR_ENOMEM;
		goto done;
	}
	fr_poll_init(&poll, env);
	out[k++] = 0;
	while (i + 1 < p.n)
	{
		size_t		step = 1,
					good = i + 1,
					bad = SIZE_MAX;
		bool		fits;

		/* exponential search for a piece that no longer fits */
		while (bad == SIZE_MAX)
		{
			size_t		j = i + step < p.n - 1 ? i + step : p.n - 1;

			piece_fits(&p, i, j, tol, row, &fits);
			if (fits)
				good = j;
			else
				bad = j;
			if (j == p.n - 1)
				break;
			step *= 2;
			if (fr_poll_add(&poll, j - i))
			{
				st = FR_EINTR;
				goto done;
			}
		}
		/* then binary search between the last fit and the first misfit */
		while (bad != SIZE_MAX && bad - good > 1)
		{
			size_t		mid = good + (bad - good) / 2;

			piece_fits(&p, i, mid, tol, row, &fits);
			if (fits)
				good = mid;
			else
				bad = mid;
			if (fr_poll_add(&poll, mid - i))
			{
				st = FR_EINTR;
				goto done;
			}
		}
		out[k++] = good;
		i = good;
		if (k > max_keep)
			break;
	}

done:
	fr_free(env, row);
	fr_release_pair(env, &p, &unused);
	if (st == FR_OK)
	{
		*keep = out;
		*count = k;
	}
	else
		fr_free(env, out);
	return st;
}
