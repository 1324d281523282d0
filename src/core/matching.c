/*
 * matching.c - a witness matching: a monotone path through the free space
 * (Alt & Godau 1995) from (0,0) to (n-1, m-1), reported as breakpoints.
 *
 * Memory.  Keeping every cell's reachable intervals would take O(nm)
 * memory.  Instead the forward pass keeps a checkpoint of the row state
 * every B rows; the backward pass recomputes one block of B rows at a time
 * from its checkpoint and walks back through it.  With X the shorter curve
 * along the rows and B about sqrt(rows / 2), memory is O(|X| sqrt(|Y|)) and
 * time two plain decisions (plus the distance search when eps is not given).
 *
 * Which matching.  Walking back from the end, in each cell the path goes to
 * the reachable point of the cell's left or bottom boundary that is nearest
 * to its partner (the smallest leash there), not merely to any reachable
 * one.  Every such step stays inside the free space at eps, so the longest
 * leash is at most eps (the distance, for an optimal matching), while where
 * the curves run close together the path follows the pairs of nearest
 * points.  This is a greedy approximation of the locally correct matchings
 * of Buchin, Buchin, Meulemans & Speckmann (ESA 2012): it is optimal in its
 * longest leash, but, unlike theirs, it does not recurse on the parts
 * before and after the bottleneck, so it is not guaranteed locally correct.
 */
#include <math.h>
#include <string.h>

#include "fr_internal.h"

/* Rows per checkpoint block for a diagram of `rows` rows. */
static size_t
block_rows(size_t rows)
{
	size_t		b = (size_t) ceil(sqrt((double) rows / 2.0));

	return b < 1 ? 1 : b;
}

/* Upper bound of the bytes fr_matching may request. */
size_t
fr_matching_scratch_bytes(size_t n, size_t m)
{
	size_t		nx = n < m ? n : m,
				ny = n < m ? m : n,
				rows = ny > 1 ? ny - 1 : 1,
				b = block_rows(rows),
				blocks = (rows + b - 1) / b;

	return fr_scratch_bytes(n, m)
		+ blocks * nx * sizeof(double) + blocks * sizeof(bool)	/* checkpoints */
		+ (2 * b + 1) * nx * sizeof(double)	/* one recomputed block */
		+ (n + m + 4) * sizeof(fr_match_pt) + 1024;
}

/* The point at position pos (k + t) of a raw curve. */
void
fr_curve_point(const fr_curve *c, double pos, double *out)
{
	size_t		k;
	double		t;

	if (!(pos > 0))
		pos = 0;
	if (pos >= (double) (c->n - 1))
	{
		memcpy(out, c->coords + (c->n - 1) * c->dim, c->dim * sizeof(double));
		return;
	}
	k = (size_t) pos;
	t = pos - (double) k;
	for (int d = 0; d < c->dim; d++)
	{
		double		a = c->coords[k * c->dim + d],
					b = c->coords[(k + 1) * c->dim + d];

		out[d] = t == 0 ? a : a + t * (b - a);
	}
}

/* State of one witness computation. */
typedef struct witness
{
	const fr_env *env;
	const fr_prep *x;			/* along the rows (cells i) */
	const fr_prep *y;			/* across the rows (rows j) */
	double		eps;
	size_t		brows;			/* rows per block */
	double	   *ck_row;			/* checkpoint rows, blocks x (nx-1) */
	bool	   *ck_open;		/* left edge still open at each checkpoint */
	double	   *blk_bottom;		/* loaded block: brows + 1 rows of nx-1 bottom lows */
	double	   *blk_left;		/* loaded block: brows x nx left lows */
	size_t		loaded;			/* index of the loaded block, or SIZE_MAX */
	fr_poll		poll;
} witness;

/* Forward pass with checkpoints; *found says whether (nx-1, ny-1) is reachable. */
static fr_status
forward(witness *w, double *row, bool *found)
{
	const size_t nx = w->x->n,
				ny = w->y->n;
	bool		open = true;
	double		right = FR_EMPTY;

	fr_bottom_edge(w->x, w->y, w->eps, row);
	for (size_t j = 0; j + 1 < ny; j++)
	{
		double		lr = FR_EMPTY;
		bool		any_top;
		fr_status	st;

		if (j % w->brows == 0)
		{
			memcpy(w->ck_row + (j / w->brows) * (nx - 1), row, (nx - 1) * sizeof(double));
			w->ck_open[j / w->brows] = open;
		}
		if (open)
		{
			lr = fr_left_edge(w->x, w->y, j, w->eps, &open);
			if (lr != 0.0)
				lr = FR_EMPTY;
		}
		st = fr_row_step(w->x, w->y, j, w->eps, row, lr, NULL, &right, &any_top, &w->poll);
		if (st != FR_OK)
			return st;
	}
	*found = right != FR_EMPTY || row[nx - 2] != FR_EMPTY;
	return FR_OK;
}

/* Recomputes block b from its checkpoint, keeping every boundary of it. */
static fr_status
load_block(witness *w, size_t b)
{
	const size_t nx = w->x->n,
				ny = w->y->n;
	size_t		j0 = b * w->brows,
				j1 = j0 + w->brows < ny - 1 ? j0 + w->brows : ny - 1;
	bool		open = w->ck_open[b];

	memcpy(w->blk_bottom, w->ck_row + b * (nx - 1), (nx - 1) * sizeof(double));
	for (size_t j = j0; j < j1; j++)
	{
		double	   *bottom = w->blk_bottom + (j - j0) * (nx - 1);
		double		lr = FR_EMPTY,
					right;
		bool		any_top;
		fr_status	st;

		if (open)
		{
			lr = fr_left_edge(w->x, w->y, j, w->eps, &open);
			if (lr != 0.0)
				lr = FR_EMPTY;
		}
		/* the step turns bottoms into tops in place: do it on the next slot */
		memcpy(bottom + (nx - 1), bottom, (nx - 1) * sizeof(double));
		st = fr_row_step(w->x, w->y, j, w->eps, bottom + (nx - 1), lr,
						 w->blk_left + (j - j0) * nx, &right, &any_top, &w->poll);
		if (st != FR_OK)
			return st;
	}
	w->loaded = b;
	return FR_OK;
}

/* A breakpoint in free-space coordinates, with its leash. */
static fr_match_pt
make_point(const witness *w, size_t xi, double xt, size_t yj, double yt)
{
	fr_pt		a = fr_prep_point(w->x, xi, xt),
				b = fr_prep_point(w->y, yj, yt);
	fr_match_pt r;

	r.a_pos = (double) xi + xt;
	r.b_pos = (double) yj + yt;
	r.leash = fr_pt_dist(&a, &b);
	return r;
}

/*
 * Walks back from (nx-1, ny-1) to (0,0), writing breakpoints in reverse
 * into out.  The current point is on a vertical line (x = I, y = J + s) or
 * a horizontal one (y = J, x = I + s), with s in [0, 1]; the cell it was
 * reached through is (I-1, J) or (I, J-1) respectively.  Each step moves to
 * a cell one lower in i + j, so there are at most n + m breakpoints.
 */
static fr_status
walk_back(witness *w, fr_match_pt *out, size_t *count)
{
	const size_t nx = w->x->n;
	bool		vert = true;
	size_t		I = nx - 1,
				J = w->y->n - 2,
				n = 0;
	double		s = 1.0;

	out[n++] = make_point(w, nx - 1, 0, w->y->n - 1, 0);
	for (;;)
	{
		size_t		ci,
					cj,
					r;
		double		llo,
					lhi,
					blo,
					bhi,
					u = 0,
					v = 0,
					lu = INFINITY,
					lv = INFINITY;
		fr_status	st;

		if ((vert && I == 0) || (!vert && J == 0))
		{
			/*
			 * On the left or bottom edge, reachable only along the open edge:
			 * a breakpoint at every vertex on the way, so each piece of the
			 * matching stays within one cell and its leash is convex there.
			 */
			for (size_t k = vert ? J + 1 : I + 1; k-- > 0;)
				out[n++] = vert ? make_point(w, 0, 0, k, 0) : make_point(w, k, 0, 0, 0);
			break;
		}
		ci = vert ? I - 1 : I;
		cj = vert ? J : J - 1;
		if (w->loaded != cj / w->brows)
		{
			st = load_block(w, cj / w->brows);
			if (st != FR_OK)
				return st;
		}
		r = cj - (cj / w->brows) * w->brows;
		llo = w->blk_left[r * nx + ci];
		blo = w->blk_bottom[r * (nx - 1) + ci];

		/* left boundary of the cell: vertex x[ci] against segment y[cj] */
		if (llo != FR_EMPTY)
		{
			double		flo;

			fr_free_interval(&w->x->v[ci], &w->y->v[cj], &w->y->s[cj], &w->y->v[cj + 1],
							 w->eps, &flo, &lhi);
			if (vert && s < lhi)
				lhi = s;		/* must not rise above the current point */
			if (llo <= lhi)
			{
				fr_pt		q;

				u = fr_nearest_param(&w->x->v[ci], w->y, cj, llo, lhi);
				q = fr_prep_point(w->y, cj, u);
				lu = fr_pt_dist(&w->x->v[ci], &q);
			}
		}
		/* bottom boundary of the cell: vertex y[cj] against segment x[ci] */
		if (blo != FR_EMPTY)
		{
			double		flo;

			fr_free_interval(&w->y->v[cj], &w->x->v[ci], &w->x->s[ci], &w->x->v[ci + 1],
							 w->eps, &flo, &bhi);
			if (!vert && s < bhi)
				bhi = s;
			if (blo <= bhi)
			{
				fr_pt		q;

				v = fr_nearest_param(&w->y->v[cj], w->x, ci, blo, bhi);
				q = fr_prep_point(w->x, ci, v);
				lv = fr_pt_dist(&w->y->v[cj], &q);
			}
		}
		if (isinf(lu) && isinf(lv))
			return FR_EINVAL;	/* cannot happen: the point was reached through this cell */
		/*
		 * The chosen point stays attached to the cell that produced its
		 * reachability: a left point (ci, cj + u) is an output of cell
		 * (ci-1, cj), a bottom point (ci + v, cj) one of cell (ci, cj-1),
		 * corners included.
		 */
		if (lu <= lv)
		{
			out[n++] = make_point(w, ci, 0, cj, u);
			vert = true;
			s = u;
		}
		else
		{
			out[n++] = make_point(w, ci, v, cj, 0);
			vert = false;
			s = v;
		}
		I = ci;
		J = cj;
		if (n > nx + w->y->n)
			return FR_EINVAL;	/* cannot happen: every step leaves a cell behind */
	}
	*count = n;
	return FR_OK;
}

/*
 * Matching for curves where one is a single point: it meets every vertex.
 * Written backwards, like walk_back.
 */
static void
point_matching(const fr_prep *p, const fr_prep *q, fr_match_pt *out, size_t *count)
{
	bool		p_is_point = p->n == 1;
	const fr_prep *c = p_is_point ? q : p;
	const fr_pt *pt = p_is_point ? &p->v[0] : &q->v[0];

	for (size_t k = 0; k < c->n; k++)
	{
		size_t		i = c->n - 1 - k;

		out[k].a_pos = p_is_point ? 0.0 : (double) i;
		out[k].b_pos = p_is_point ? (double) i : 0.0;
		out[k].leash = fr_pt_dist(pt, &c->v[i]);
	}
	*count = c->n;
}

/* Reverses the breakpoints, swaps axes back if needed, drops repeats. */
static size_t
finish_points(fr_match_pt *out, size_t n, bool swapped)
{
	size_t		k = 0;

	for (size_t i = 0; i < n / 2; i++)
	{
		fr_match_pt t = out[i];

		out[i] = out[n - 1 - i];
		out[n - 1 - i] = t;
	}
	for (size_t i = 0; i < n; i++)
	{
		fr_match_pt r = out[i];

		if (swapped)
		{
			double		t = r.a_pos;

			r.a_pos = r.b_pos;
			r.b_pos = t;
		}
		if (k > 0 && out[k - 1].a_pos == r.a_pos && out[k - 1].b_pos == r.b_pos)
			continue;
		out[k++] = r;
	}
	return k;
}

/* A witness matching; see frechet.h. */
fr_status
fr_matching(const fr_env *env, const fr_curve *p, const fr_curve *q, double eps,
			fr_match_pt **out, size_t *count, bool *found, double *used_eps,
			fr_stats *stats)
{
	fr_prep		pp,
				pq;
	witness		w;
	double	   *row = NULL;
	fr_match_pt *pts = NULL;
	fr_status	st;
	bool		swapped;
	size_t		nx,
				ny,
				blocks;

	*out = NULL;
	*count = 0;
	*found = false;
	st = fr_prepare_pair(env, p, q, &pp, &pq);
	if (st != FR_OK)
		return st;
	memset(&w, 0, sizeof(w));
	swapped = pq.n < pp.n;		/* the shorter curve runs along the rows */
	w.env = env;
	w.x = swapped ? &pq : &pp;
	w.y = swapped ? &pp : &pq;
	nx = w.x->n;
	ny = w.y->n;
	fr_poll_init(&w.poll, env);
	row = fr_alloc(env, (nx + ny) * sizeof(double));
	pts = fr_alloc(env, (nx + ny + 4) * sizeof(fr_match_pt));
	if (row == NULL || pts == NULL)
	{
		st = FR_ENOMEM;
		goto done;
	}
	if (isnan(eps) || eps < 0)
	{
		st = fr_distance_prepared(env, w.x, w.y, &eps, stats);
		if (st != FR_OK)
			goto done;
	}
	else
		eps = fr_to_local(&pp, eps);
	*used_eps = fr_from_local(&pp, eps);
	w.eps = eps;
	if (nx == 1 || ny == 1)
	{
		point_matching(w.x, w.y, pts, count);
		for (size_t k = 0; k < *count; k++)
			if (pts[k].leash > eps)
				goto done;		/* not found */
		*count = finish_points(pts, *count, swapped);
		*found = true;
		goto done;
	}
	if (fr_pt_dist(&w.x->v[0], &w.y->v[0]) > eps ||
		fr_pt_dist(&w.x->v[nx - 1], &w.y->v[ny - 1]) > eps)
		goto done;

	w.brows = block_rows(ny - 1);
	blocks = (ny - 1 + w.brows - 1) / w.brows;
	w.ck_row = fr_alloc(env, blocks * (nx - 1) * sizeof(double));
	w.ck_open = fr_alloc(env, blocks * sizeof(bool));
	w.blk_bottom = fr_alloc(env, (w.brows + 1) * (nx - 1) * sizeof(double));
	w.blk_left = fr_alloc(env, w.brows * nx * sizeof(double));
	w.loaded = SIZE_MAX;
	if (!w.ck_row || !w.ck_open || !w.blk_bottom || !w.blk_left)
	{
		st = FR_ENOMEM;
		goto done;
	}
	if (stats)
		stats->decisions += 2;
	st = forward(&w, row, found);
	if (st != FR_OK || !*found)
		goto done;
	st = walk_back(&w, pts, count);
	if (st == FR_OK)
		*count = finish_points(pts, *count, swapped);

done:
	fr_free(env, w.ck_row);
	fr_free(env, w.ck_open);
	fr_free(env, w.blk_bottom);
	fr_free(env, w.blk_left);
	fr_free(env, row);
	if (st == FR_OK && *found)
	{
		/* leashes back in input units */
		for (size_t k = 0; k < *count; k++)
			pts[k].leash = fr_from_local(&pp, pts[k].leash);
		*out = pts;
	}
	fr_release_pair(env, &pp, &pq);
	if (!(st == FR_OK && *found))
	{
		fr_free(env, pts);
		*found = st == FR_OK && *found;
		*count = 0;
	}
	return st;
}
