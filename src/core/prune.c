/*
 * prune.c - a decider that settles whole boxes of the free space from
 * their boundaries, after Bringmann, Künnemann & Nusser, "Walking the dog
 * fast in practice" (SoCG 2019), section 4.
 *
 * The free space is split recursively into boxes.  Reachability enters a
 * box through its left and bottom boundaries and leaves through its right
 * and top ones; only boundaries are ever stored (arrays H over columns and
 * V over rows, overwritten in place as boxes are solved from the lower
 * left), so memory stays O(n + m).  A box is settled without looking
 * inside when:
 *   - nothing reaches its left or bottom boundary: nothing leaves it;
 *   - an outgoing boundary is blocked in every cell: nothing leaves there;
 *   - an outgoing boundary is free in every cell and its starting corner is
 *     reachable along a free incoming boundary: all of it is reachable.
 * Otherwise the box is halved along its longer side; small boxes are solved
 * cell by cell with the same propagation as the plain decider, so both
 * deciders compute the same reachable sets and agree exactly.
 *
 * While propagating, the decider can also report the values of eps at
 * which a blocked step would open (critical values of types b and c of Alt
 * & Godau 1995, section 3): the distance search in distance.c tests those
 * instead of bisecting blindly.  For that each reachable lower end carries
 * the vertex whose free interval it came from.
 */
#include <math.h>
#include <string.h>

#include "fr_internal.h"

/* Boxes of at most this many cells are solved cell by cell. */
#define BASE_CELLS 4096

/* Boxes entered through at most 1/SPARSE_RATIO of their sides are swept directly. */
#define SPARSE_RATIO 8

/* State of one pruned decision. */
typedef struct prune
{
	const fr_prep *p;
	const fr_prep *q;
	double		eps;
	double	   *H;				/* reachable lower end on the current horizontal boundary, per column */
	double	   *V;				/* ... on the current vertical boundary, per row */
	int32_t    *Hs;				/* source vertex (of q) of each H */
	int32_t    *Vs;				/* source vertex (of p) of each V */
	fr_cands   *cands;			/* where to report opening values, or NULL */
	double	   *dq;				/* dq[i] = |p[i] - q[dstamp[i]]|, a cache of vertex distances */
	int32_t    *dstamp;
	fr_poll    *poll;
	fr_stats   *stats;
	bool		stop;			/* interrupted */
} prune;

/* Records an opening value if it lies strictly inside the bracket. */
static inline void
note(prune *s, double v)
{
	fr_cands   *c = s->cands;

	if (c == NULL || !(v > c->lo && v < c->hi))
		return;
	if (c->count < c->cap)
		c->v[c->count++] = v;
	else
		c->overflow = true;
}

/*
 * The eps at which the free intervals of vertices x and y on segment
 * a-b (direction s) meet: the point of the segment equidistant from both
 * (a type c critical value), or NaN if the bisector misses the segment.
 */
static double
passage_value(const fr_pt *x, const fr_pt *y, const fr_pt *a, const fr_seg *s)
{
	double		ex = y->x - x->x,
				ey = y->y - x->y,
				ez = y->z - x->z;
	double		mx = (x->x + y->x) / 2 - a->x,
				my = (x->y + y->y) / 2 - a->y,
				mz = (x->z + y->z) / 2 - a->z;
	double		de = s->ux * ex + s->uy * ey + s->uz * ez,
				r;
	fr_pt		c;

	if (s->len == 0.0 || de == 0.0)
		return NAN;
	/* arc length r along the segment where (point - midpoint) . e = 0 */
	r = (mx * ex + my * ey + mz * ez) / de;
	if (!(r >= 0 && r <= s->len))
		return NAN;
	c.x = a->x + r * s->ux;
	c.y = a->y + r * s->uy;
	c.z = a->z + r * s->uz;
	return fr_pt_dist(&c, x);
}

/* |p[i] - q[j]|, from the cache when it holds that pair. */
static inline double
vertex_dist(prune *s, size_t i, size_t j)
{
	if (s->dstamp[i] != (int32_t) j)
	{
		s->dq[i] = fr_pt_dist(&s->p->v[i], &s->q->v[j]);
		s->dstamp[i] = (int32_t) j;
	}
	return s->dq[i];
}

/*
 * Cell-by-cell propagation through the box [x0,x1) x [y0,y1), visiting in
 * each row only the cells that something can enter: from the first column
 * reachable from below (or the left side) to the last one reachable from
 * below, and on while reachability keeps flowing right.  Cells left out
 * would stay empty in the plain propagation too.
 */
static void
solve_cells(prune *s, size_t x0, size_t x1, size_t y0, size_t y1)
{
	const fr_prep *p = s->p,
			   *q = s->q;
	const fr_pt *pv = p->v,
			   *qv = q->v;
	const double eps = s->eps;
	size_t		hlo = x1,
				hhi = x0,
				visited = 0;

	/* the columns reachable from below: [hlo, hhi] */
	for (size_t i = x0; i < x1; i++)
		if (s->H[i] != FR_EMPTY)
		{
			if (hlo == x1)
				hlo = i;
			hhi = i;
		}
	for (size_t j = y0; j < y1; j++)
	{
		const fr_pt *qa = &qv[j],
				   *qb = &qv[j + 1];
		const fr_seg *qs = &q->s[j];
		double		lr = s->V[j];
		int32_t		ls = s->Vs[j];
		size_t		i = lr != FR_EMPTY ? x0 : hlo,
					nlo = x1,
					nhi = x0;

		for (; i < x1 && (i <= hhi || lr != FR_EMPTY); i++)
		{
			double		br = s->H[i],
						a,
						b,
						c,
						d,
						nlr,
						nbr,
						d_tl,
						d_br,
						d_tr;
			int32_t		bs = s->Hs[i],
						nls,
						nbs;

			if (br == FR_EMPTY && lr == FR_EMPTY)
				continue;
			visited++;

			/*
			 * The four vertex distances of the cell: each is computed once and
			 * shared with the neighbouring cells through the cache.
			 */
			d_tl = vertex_dist(s, i, j + 1);
			d_br = vertex_dist(s, i + 1, j);
			d_tr = vertex_dist(s, i + 1, j + 1);

			/* right boundary: vertex p[i+1] against segment q[j] */
			fr_free_interval_d(&pv[i + 1], qa, qs, eps, d_br, d_tr, &a, &b);
			nls = (int32_t) (i + 1);
			if (br != FR_EMPTY)
				nlr = a <= b ? a : FR_EMPTY;
			else if (a >= lr)
				nlr = a <= b ? a : FR_EMPTY;
			else
			{
				nlr = lr <= b ? lr : FR_EMPTY;
				nls = ls;
			}
			if (nlr == FR_EMPTY && s->cands)
			{
				if (a > b)
					note(s, fr_point_segment_dist(&pv[i + 1], qa, qs, qb));
				else
					note(s, passage_value(&pv[ls], &pv[i + 1], qa, qs));
			}
			/* top boundary: vertex q[j+1] against segment p[i] */
			fr_free_interval_d(qb, &pv[i], &p->s[i], eps, d_tl, d_tr, &c, &d);
			nbs = (int32_t) (j + 1);
			if (lr != FR_EMPTY)
				nbr = c <= d ? c : FR_EMPTY;
			else if (c >= br)
				nbr = c <= d ? c : FR_EMPTY;
			else
			{
				nbr = br <= d ? br : FR_EMPTY;
				nbs = bs;
			}
			if (nbr == FR_EMPTY && s->cands)
			{
				if (c > d)
					note(s, fr_point_segment_dist(qb, &pv[i], &p->s[i], &pv[i + 1]));
				else
					note(s, passage_value(&qv[bs], qb, &pv[i], &p->s[i]));
			}
			s->H[i] = nbr;
			s->Hs[i] = nbs;
			if (nbr != FR_EMPTY)
			{
				if (nlo == x1)
					nlo = i;
				nhi = i;
			}
			lr = nlr;
			ls = nls;
		}
		/* the row ended early only where nothing flows right any more */
		s->V[j] = i == x1 ? lr : FR_EMPTY;
		s->Vs[j] = ls;
		hlo = nlo;
		hhi = nhi;
	}
	if (s->stats)
		s->stats->cells += visited;
	if (fr_poll_add(s->poll, visited + (y1 - y0)))
		s->stop = true;
}

/* Is every cell of the horizontal line y = j, columns [x0,x1), free (vertices within eps)? */
static bool
row_line_free(const prune *s, size_t j, size_t x0, size_t x1)
{
	for (size_t i = x0; i <= x1; i++)
		if (fr_pt_dist(&s->q->v[j], &s->p->v[i]) > s->eps)
			return false;
	return true;
}

/* Is every cell of the vertical line x = i, rows [y0,y1), free? */
static bool
col_line_free(const prune *s, size_t i, size_t y0, size_t y1)
{
	for (size_t j = y0; j <= y1; j++)
		if (fr_pt_dist(&s->p->v[i], &s->q->v[j]) > s->eps)
			return false;
	return true;
}

/* Is every cell of the horizontal line y = j, columns [x0,x1), blocked? */
static bool
row_line_blocked(const prune *s, size_t j, size_t x0, size_t x1)
{
	for (size_t i = x0; i < x1; i++)
	{
		double		lo,
					hi;

		fr_free_interval(&s->q->v[j], &s->p->v[i], &s->p->s[i], &s->p->v[i + 1], s->eps, &lo, &hi);
		if (lo <= hi)
			return false;
	}
	return true;
}

/* Is every cell of the vertical line x = i, rows [y0,y1), blocked? */
static bool
col_line_blocked(const prune *s, size_t i, size_t y0, size_t y1)
{
	for (size_t j = y0; j < y1; j++)
	{
		double		lo,
					hi;

		fr_free_interval(&s->p->v[i], &s->q->v[j], &s->q->s[j], &s->q->v[j + 1], s->eps, &lo, &hi);
		if (lo <= hi)
			return false;
	}
	return true;
}

/* Solves the box [x0,x1) x [y0,y1): inputs in H, V; outputs written over them. */
static void
solve_box(prune *s, size_t x0, size_t x1, size_t y0, size_t y1)
{
	size_t		w = x1 - x0,
				h = y1 - y0,
				first_v = SIZE_MAX,
				first_h = SIZE_MAX,
				entering = 0;
	int			top = 0,		/* 1: all reachable, -1: none, 0: unknown */
				right = 0;

	if (s->stop)
		return;

	for (size_t j = y0; j < y1; j++)
		if (s->V[j] != FR_EMPTY)
		{
			if (first_v == SIZE_MAX)
				first_v = j;
			entering++;
		}
	for (size_t i = x0; i < x1; i++)
		if (s->H[i] != FR_EMPTY)
		{
			if (first_h == SIZE_MAX)
				first_h = i;
			entering++;
		}
	if (entering == 0)
		return;					/* nothing enters: H and V stay empty here */

	/*
	 * Small boxes, and boxes that reachability enters through only a few
	 * cells (a narrow band, as between two recordings of one route), are
	 * swept cell by cell, visiting only cells it can reach.
	 */
	if (w * h <= BASE_CELLS || entering * SPARSE_RATIO <= w + h)
	{
		solve_cells(s, x0, x1, y0, y1);
		return;
	}
	if (fr_poll_add(s->poll, 2 * (w + h)))
	{
		s->stop = true;
		return;
	}

	/* the top: blocked, or free with its left corner reachable up the left side */
	if (row_line_blocked(s, y1, x0, x1))
		top = -1;
	else if (first_v != SIZE_MAX && row_line_free(s, y1, x0, x1) &&
			 col_line_free(s, x0, first_v + 1, y1 - 1))
		top = 1;
	/* the right: blocked, or free with its bottom corner reachable along the bottom */
	if (col_line_blocked(s, x1, y0, y1))
		right = -1;
	else if (first_h != SIZE_MAX && col_line_free(s, x1, y0, y1) &&
			 row_line_free(s, y0, first_h + 1, x1 - 1))
		right = 1;
	if (top != 0 && right != 0)
	{
		for (size_t i = x0; i < x1; i++)
		{
			s->H[i] = top > 0 ? 0.0 : FR_EMPTY;
			s->Hs[i] = (int32_t) y1;
		}
		for (size_t j = y0; j < y1; j++)
		{
			s->V[j] = right > 0 ? 0.0 : FR_EMPTY;
			s->Vs[j] = (int32_t) x1;
		}
		return;
	}
	if (w >= h)
	{
		solve_box(s, x0, x0 + w / 2, y0, y1);
		solve_box(s, x0 + w / 2, x1, y0, y1);
	}
	else
	{
		solve_box(s, x0, x1, y0, y0 + h / 2);
		solve_box(s, x0, x1, y0 + h / 2, y1);
	}
}

/*
 * The pruning decision on prepared curves (two or more vertices each, both
 * end pairs within eps).  work must hold fr_prune_work_bytes(n, m) bytes.
 */
fr_status
fr_decide_pruned(const fr_env *env, const fr_prep *p, const fr_prep *q, double eps,
				 void *work, bool *result, fr_stats *stats, fr_cands *cands)
{
	const size_t n = p->n,
				m = q->n;
	prune		s;
	fr_poll		poll;
	bool		open = true;

	memset(&s, 0, sizeof(s));
	s.p = p;
	s.q = q;
	s.eps = eps;
	/* doubles first, then the int32 arrays, so every array is aligned */
	s.H = work;
	s.V = s.H + (n - 1);
	s.dq = s.V + (m - 1);
	s.Hs = (int32_t *) (s.dq + n);
	s.Vs = s.Hs + (n - 1);
	s.dstamp = s.Vs + (m - 1);
	s.cands = cands;
	for (size_t i = 0; i < n; i++)
		s.dstamp[i] = -1;
	s.stats = stats;
	fr_poll_init(&poll, env);
	s.poll = &poll;

	fr_bottom_edge(p, q, eps, s.H);
	for (size_t i = 0; i + 1 < n; i++)
		s.Hs[i] = 0;
	for (size_t j = 0; j + 1 < m; j++)
	{
		double		lr = FR_EMPTY;

		if (open)
		{
			lr = fr_left_edge(p, q, j, eps, &open);
			if (lr != 0.0)
				lr = FR_EMPTY;
		}
		s.V[j] = lr;
		s.Vs[j] = 0;
	}
	solve_box(&s, 0, n - 1, 0, m - 1);
	if (s.stop)
		return FR_EINTR;
	*result = s.V[m - 2] != FR_EMPTY || s.H[n - 2] != FR_EMPTY;
	return FR_OK;
}

/* Bytes of work memory fr_decide_pruned needs. */
size_t
fr_prune_work_bytes(size_t n, size_t m)
{
	/* H, V and their sources; the distance cache and its stamps */
	return (n + m) * (sizeof(double) + sizeof(int32_t)) + n * (sizeof(double) + sizeof(int32_t)) + 64;
}
