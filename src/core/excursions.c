/*
 * excursions.c - where a trip left its route.
 *
 * Definition.  Let the trip T have vertices T_0..T_{n-1} and segments of
 * lengths l_0..l_{n-2}, and F be the free space of T (x) against the route
 * R (y) at eps.  A plan gives every trip vertex i a route position y_i,
 * non-decreasing, with y_0 = 0 and y_{n-1} = m-1 (both ends matched, as for
 * the Fréchet distance), and labels every trip segment on-route or
 * off-route.  An on-route segment i needs a monotone path inside F from
 * (i, y_i) to (i+1, y_{i+1}): the segment is matched within eps, in order,
 * to the route between y_i and y_{i+1}.  An off-route segment may move
 * ahead on the route freely.  A plan costs the total length of its
 * off-route segments plus 4 eps for each maximal run of them.  A curve that
 * crosses the route, or runs along it the wrong way, can stay within eps of
 * one route point for up to about 2 eps of its length; charging twice that
 * per excursion (a margin for GPS noise) keeps such brief contacts from
 * splitting one excursion into two.  The
 * excursions are the maximal runs of off-route segments of a plan of least
 * cost.  A plan without off-route segments is a matching within eps, so
 * there are no excursions exactly when the Fréchet distance is at most eps.
 * The resolution is one trip sample: an excursion begins and ends at trip
 * vertices.
 *
 * Computation.  Dynamic programming over the trip's vertices (the columns
 * of F), each column swept over the route's segments like the decider of
 * Alt & Godau (1995): O(nm) time.  Each boundary keeps a single (cost,
 * lowest point) pair: the least cost and, among equals, the lowest point.
 * That is exact unless a costlier state lower on the route would pay off
 * later (a trip that drives part of its route twice); then the plan found
 * is still valid but may count more of the trip off-route than the least
 * possible.  The plan is recovered by walking back, recomputing blocks of
 * columns from checkpoints as the witness matching does: O(m sqrt(n))
 * memory.
 */
#include <math.h>
#include <string.h>

#include "fr_internal.h"

#define NONE INFINITY

/* Origins of an on-free-interval state (a_orig); >= 0: on-route from that boundary. */
#define A_ANCHOR (-1)			/* column 0, reached up the left edge from (0,0) */
#define A_BOTTOM (-2)			/* on-route along the bottom edge from (0,0) */
#define A_OFF_W (-3)			/* landed by an off-route segment from w */
#define A_OFF_O (-4)			/* landed by an off-route segment from o */

/* Origins of an off-route chain state (o_orig). */
#define O_CHAIN 0				/* the previous segment was off-route too */
#define O_START 1				/* an excursion starts here, from the a state */

/* Origins of w[0] (w_arg[0]); w[j] with j > 0 stores the o index or these. */
#define W_CHAIN (-1)
#define W_START (-2)
#define W_ANCHOR (-3)

/* DP state of one trip vertex. */
typedef struct xcol
{
	double	   *a_c,
			   *a_l;			/* per route segment: on its free interval from a_l up, cost a_c */
	double	   *o_c,
			   *o_l;			/* per route segment: off-route there from o_l up (excursion paid) */
	double	   *w_c;			/* per height j = 0..m-1: least cost of states at or below j */
} xcol;

/* Origins of one trip vertex's states, for the walk back. */
typedef struct xorig
{
	double	   *a_l;
	int32_t    *a;
	uint8_t    *o;
	int32_t    *w;
} xorig;

/* One excursion computation. */
typedef struct xctx
{
	const fr_env *env;
	const fr_prep *t;			/* the trip */
	const fr_prep *r;			/* the route */
	double		eps;
	double		pen;			/* charge per excursion: 4 eps */
	double	   *bottom;			/* bottom edge reachability, n - 1 */
	size_t		bcols;			/* columns per block */
	xcol	   *ck;				/* checkpoints: column k * bcols */
	size_t		nck;
	xorig		col0;			/* origins of column 0 */
	xorig	   *blk;			/* loaded block: columns k*bcols+1 .. (k+1)*bcols */
	size_t		loaded;
	xcol		cur,
				next;			/* work columns of the block recomputation */
	double		end_c;			/* least cost of the whole plan */
	int32_t		end_kind;		/* 0: corner on the last a; 1: top edge flow; 2: off-route */
	int32_t		end_orig;		/* origin of the top edge flow */
	fr_poll		poll;
} xctx;

/* Allocates the arrays of a DP column. */
static bool
xcol_alloc(const fr_env *env, xcol *c, size_t m)
{
	c->a_c = fr_alloc(env, m * sizeof(double));
	c->a_l = fr_alloc(env, m * sizeof(double));
	c->o_c = fr_alloc(env, m * sizeof(double));
	c->o_l = fr_alloc(env, m * sizeof(double));
	c->w_c = fr_alloc(env, m * sizeof(double));
	return c->a_c && c->a_l && c->o_c && c->o_l && c->w_c;
}

/* Frees the arrays of a DP column. */
static void
xcol_free(const fr_env *env, xcol *c)
{
	fr_free(env, c->a_c);
	fr_free(env, c->a_l);
	fr_free(env, c->o_c);
	fr_free(env, c->o_l);
	fr_free(env, c->w_c);
}

/* Copies a DP column. */
static void
xcol_copy(xcol *dst, const xcol *src, size_t m)
{
	memcpy(dst->a_c, src->a_c, m * sizeof(double));
	memcpy(dst->a_l, src->a_l, m * sizeof(double));
	memcpy(dst->o_c, src->o_c, m * sizeof(double));
	memcpy(dst->o_l, src->o_l, m * sizeof(double));
	memcpy(dst->w_c, src->w_c, m * sizeof(double));
}

/* Allocates origin arrays. */
static bool
xorig_alloc(const fr_env *env, xorig *o, size_t m)
{
	o->a_l = fr_alloc(env, m * sizeof(double));
	o->a = fr_alloc(env, m * sizeof(int32_t));
	o->o = fr_alloc(env, m * sizeof(uint8_t));
	o->w = fr_alloc(env, m * sizeof(int32_t));
	return o->a_l && o->a && o->o && o->w;
}

/* Frees origin arrays. */
static void
xorig_free(const fr_env *env, xorig *o)
{
	fr_free(env, o->a_l);
	fr_free(env, o->a);
	fr_free(env, o->o);
	fr_free(env, o->w);
}

/* Is (c1, l1) better than (c2, l2): cheaper, or as cheap and lower. */
static inline bool
better(double c1, double l1, double c2, double l2)
{
	return c1 < c2 || (c1 == c2 && l1 < l2);
}

/* Builds w from o (prefix minimum over heights), given w[0]. */
static void
fill_w(const xcol *c, size_t m, int32_t *w_arg)
{
	for (size_t j = 0; j + 1 < m; j++)
	{
		if (c->o_c[j] < c->w_c[j])
		{
			c->w_c[j + 1] = c->o_c[j];
			if (w_arg)
				w_arg[j + 1] = (int32_t) j;
		}
		else
		{
			c->w_c[j + 1] = c->w_c[j];
			if (w_arg)
				w_arg[j + 1] = w_arg[j];
		}
	}
}

/* Column 0: up the left edge from (0,0) while free; the anchor at height 0. */
static void
init_column(xctx *x, xcol *c, xorig *orig)
{
	const size_t m = x->r->n;
	bool		open = true;

	for (size_t j = 0; j + 1 < m; j++)
	{
		double		lo = FR_EMPTY;

		c->a_c[j] = c->o_c[j] = NONE;
		c->a_l[j] = c->o_l[j] = 0;
		if (open)
			lo = fr_left_edge(x->t, x->r, j, x->eps, &open);
		if (lo == 0.0)
		{
			c->a_c[j] = 0;
			c->o_c[j] = x->pen;
		}
		if (orig)
		{
			orig->a_l[j] = 0;
			orig->a[j] = A_ANCHOR;
			orig->o[j] = O_START;
		}
	}
	c->w_c[0] = x->pen;
	if (orig)
		orig->w[0] = W_ANCHOR;
	fill_w(c, m, orig ? orig->w : NULL);
}

/*
 * One trip segment: the states of vertex i (in) give those of vertex i + 1
 * (out), and their origins if orig is not NULL.  At the last segment it
 * also settles the cost of the whole plan.
 */
static fr_status
step_column(xctx *x, size_t i, const xcol *in, xcol *out, xorig *orig)
{
	const size_t m = x->r->n;
	const fr_prep *t = x->t,
			   *r = x->r;
	const double len = t->s[i].len;
	double		bf_c = NONE,
				bf_l = 0,
				d_last = 0;
	int32_t		bf_o = A_BOTTOM;

	if (x->bottom[i] == 0.0)
		bf_c = 0;				/* the bottom edge, reachable along y = 0 */
	for (size_t j = 0; j + 1 < m; j++)
	{
		double		a,
					b,
					c,
					d,
					rc = NONE,
					rl = 0,
					tc = NONE,
					tl = 0;
		int32_t		ro = 0,
					to = 0;

		fr_free_interval(&t->v[i + 1], &r->v[j], &r->s[j], &r->v[j + 1], x->eps, &a, &b);
		fr_free_interval(&r->v[j + 1], &t->v[i], &t->s[i], &t->v[i + 1], x->eps, &c, &d);
		d_last = d;
		/* right boundary: on-route from the left or the bottom of cell (i, j) */
		if (in->a_c[j] < NONE)
		{
			double		l = a > in->a_l[j] ? a : in->a_l[j];

			if (l <= b)
			{
				rc = in->a_c[j];
				rl = l;
				ro = (int32_t) j;
			}
		}
		if (bf_c < NONE && a <= b && better(bf_c, a, rc, rl))
		{
			rc = bf_c;
			rl = a;
			ro = bf_o;
		}
		/* or landed by an off-route segment from anywhere not higher */
		if (a <= b)
		{
			if (better(in->w_c[j] + len, a, rc, rl))
			{
				rc = in->w_c[j] + len;
				rl = a;
				ro = A_OFF_W;
			}
			if (in->o_c[j] < NONE && in->o_l[j] <= b)
			{
				double		l = a > in->o_l[j] ? a : in->o_l[j];

				if (better(in->o_c[j] + len, l, rc, rl))
				{
					rc = in->o_c[j] + len;
					rl = l;
					ro = A_OFF_O;
				}
			}
		}
		out->a_c[j] = rc;
		out->a_l[j] = rl;
		if (orig)
		{
			orig->a[j] = ro;
			orig->a_l[j] = rl;
		}
		/* top boundary, the bottom of the next row */
		if (in->a_c[j] < NONE && c <= d)
		{
			tc = in->a_c[j];
			tl = c;
			to = (int32_t) j;
		}
		if (bf_c < NONE)
		{
			double		l = c > bf_l ? c : bf_l;

			if (l <= d && better(bf_c, l, tc, tl))
			{
				tc = bf_c;
				tl = l;
				to = bf_o;
			}
		}
		bf_c = tc;
		bf_l = tl;
		bf_o = to;
		if ((j & 0xFFFF) == 0xFFFF && fr_poll_add(&x->poll, 0x10000))
			return FR_EINTR;
	}
	if (fr_poll_add(&x->poll, (m - 1) & 0xFFFF))
		return FR_EINTR;

	/* off-route chains carry on; new excursions start from the a states */
	for (size_t j = 0; j + 1 < m; j++)
	{
		double		cc = in->o_c[j] + len,
					cl = in->o_l[j];
		uint8_t		co = O_CHAIN;

		if (out->a_c[j] < NONE && better(out->a_c[j] + x->pen, out->a_l[j], cc, cl))
		{
			cc = out->a_c[j] + x->pen;
			cl = out->a_l[j];
			co = O_START;
		}
		out->o_c[j] = cc;
		out->o_l[j] = cl;
		if (orig)
			orig->o[j] = co;
	}
	out->w_c[0] = in->w_c[0] + len;
	if (orig)
		orig->w[0] = W_CHAIN;
	if (out->a_c[0] < NONE && out->a_l[0] == 0.0 && out->a_c[0] + x->pen < out->w_c[0])
	{
		out->w_c[0] = out->a_c[0] + x->pen;
		if (orig)
			orig->w[0] = W_START;
	}
	fill_w(out, m, orig ? orig->w : NULL);

	if (i + 2 == t->n)
	{
		double		a,
					b;

		/* the end (n-1, m-1): on the last a, by the top edge, or off-route */
		x->end_c = in->w_c[m - 1] + len;
		x->end_kind = 2;
		fr_free_interval(&t->v[i + 1], &r->v[m - 2], &r->s[m - 2], &r->v[m - 1], x->eps, &a, &b);
		if (b == 1.0 && out->a_c[m - 2] <= x->end_c)
		{
			x->end_c = out->a_c[m - 2];
			x->end_kind = 0;
		}
		if (d_last == 1.0 && bf_c < x->end_c)
		{
			x->end_c = bf_c;
			x->end_kind = 1;
			x->end_orig = bf_o;
		}
	}
	return FR_OK;
}

/* Recomputes block k (columns k*bcols+1 .. (k+1)*bcols) with origins. */
static fr_status
load_block(xctx *x, size_t k)
{
	const size_t n = x->t->n,
				m = x->r->n;
	size_t		first = k * x->bcols;

	xcol_copy(&x->cur, &x->ck[k], m);
	for (size_t i = first; i < first + x->bcols && i + 1 < n; i++)
	{
		xcol		tmp;
		fr_status	st = step_column(x, i, &x->cur, &x->next, &x->blk[i - first]);

		if (st != FR_OK)
			return st;
		tmp = x->cur;
		x->cur = x->next;
		x->next = tmp;
	}
	x->loaded = k;
	return FR_OK;
}

/* Origins of trip vertex i, loading its block when needed. */
static fr_status
origins_of(xctx *x, size_t i, xorig **o)
{
	size_t		k;
	fr_status	st;

	if (i == 0)
	{
		*o = &x->col0;
		return FR_OK;
	}
	k = (i - 1) / x->bcols;
	if (x->loaded != k)
	{
		st = load_block(x, k);
		if (st != FR_OK)
			return st;
	}
	*o = &x->blk[i - 1 - k * x->bcols];
	return FR_OK;
}

/* States of the walk back. */
enum walk_state
{
	AT_A,						/* on the free interval of route segment j */
	AT_O,						/* off-route within segment j */
	AT_W,						/* the least state at or below height j */
	DONE
};

/*
 * Walks back from the end, marking off-route segments in off[] and the
 * route position of vertices where it is known in y[] (NaN elsewhere).
 */
static fr_status
walk_back(xctx *x, bool *off, double *y)
{
	const size_t n = x->t->n,
				m = x->r->n;
	size_t		i = n - 1,
				j = m - 2;
	enum walk_state at;
	fr_status	st;

	for (size_t k = 0; k < n; k++)
		y[k] = NAN;
	y[n - 1] = (double) (m - 1);
	if (x->end_kind == 0)
		at = AT_A;
	else if (x->end_kind == 1)
	{
		off[n - 2] = false;
		i = n - 2;
		if (x->end_orig == A_BOTTOM)
			goto bottom_edge;
		j = (size_t) x->end_orig;
		at = AT_A;
	}
	else
	{
		off[n - 2] = true;
		i = n - 2;
		j = m - 1;
		at = AT_W;
	}
	while (at != DONE)
	{
		xorig	   *o;

		st = origins_of(x, i, &o);
		if (st != FR_OK)
			return st;
		if (at == AT_A)
		{
			int32_t		a = o->a[j];

			if (isnan(y[i]))
				y[i] = (double) j + o->a_l[j];
			if (i == 0 || a == A_ANCHOR)
				at = DONE;
			else if (a == A_BOTTOM)
			{
				i--;
				goto bottom_edge;
			}
			else if (a == A_OFF_W || a == A_OFF_O)
			{
				off[--i] = true;
				at = a == A_OFF_W ? AT_W : AT_O;
			}
			else
			{
				off[--i] = false;
				j = (size_t) a;
			}
		}
		else if (at == AT_O)
		{
			if (o->o[j] == O_START)
				at = AT_A;		/* the excursion starts at this vertex */
			else
				off[--i] = true;
		}
		else
		{
			int32_t		w = o->w[j];

			if (w >= 0)
			{
				j = (size_t) w;
				at = AT_O;
			}
			else if (w == W_START)
			{
				j = 0;
				at = AT_A;
			}
			else if (w == W_ANCHOR || i == 0)
			{
				y[i] = 0;
				at = DONE;
			}
			else
			{
				/* staying at height 0, off-route */
				j = 0;
				off[--i] = true;
			}
		}
	}
	return FR_OK;

bottom_edge:
	/* on-route along y = 0 from (0,0) to vertex i + 1 */
	for (size_t k = 0; k <= i; k++)
	{
		off[k] = false;
		if (isnan(y[k]))
			y[k] = 0;
	}
	return FR_OK;
}

/* Largest distance from trip vertices from..to to the route between a and b. */
static double
leash_to_part(const fr_prep *t, size_t from, size_t to, const fr_prep *r, double a, double b)
{
	double		worst = 0;
	size_t		ka = (size_t) floor(a),
				kb = (size_t) ceil(b);

	if (kb >= r->n)
		kb = r->n - 1;
	for (size_t i = from; i <= to; i++)
	{
		double		best = INFINITY;

		for (size_t k = ka; k <= kb; k++)
		{
			double		lo = k == ka ? a - (double) ka : 0,
						hi = (double) k + 1 > b ? b - (double) k : 1;
			fr_pt		q;
			double		d;

			if (k + 1 >= r->n || hi < lo)
				q = fr_prep_point_at(r, k + 1 >= r->n ? (double) k : a);
			else
				q = fr_prep_point(r, k, fr_nearest_param(&t->v[i], r, k, lo, hi));
			d = fr_pt_dist(&t->v[i], &q);
			if (d < best)
				best = d;
		}
		if (best > worst)
			worst = best;
	}
	return worst;
}

/* Blocks of columns for a trip of n vertices. */
static size_t
block_cols(size_t n)
{
	size_t		b = (size_t) ceil(sqrt((double) (n > 1 ? n - 1 : 1)));

	return b < 1 ? 1 : b;
}

/* Upper bound of the bytes fr_excursions may request. */
size_t
fr_excursions_scratch_bytes(size_t n, size_t m)
{
	size_t		b = block_cols(n),
				nck = (n + b - 1) / b + 1;

	return fr_scratch_bytes(n, m)
		+ (nck + 2) * 5 * m * sizeof(double)	/* checkpoints, work columns */
		+ (b + 1) * m * (sizeof(double) + 2 * sizeof(int32_t) + 1)	/* origins */
		+ n * (2 * sizeof(double) + 1) + (n / 2 + 2) * sizeof(fr_excursion) + 4096;
}

/* Excursions where one curve is a single point: runs of vertices beyond eps. */
static size_t
degenerate(const fr_prep *t, const fr_prep *r, double eps, fr_excursion *out)
{
	size_t		count = 0;

	if (t->n == 1)
	{
		/* a one-point trip: one stationary excursion against the whole route */
		out[0].trip_from = out[0].trip_to = 0;
		out[0].route_from = 0;
		out[0].route_to = (double) (r->n - 1);
		out[0].max_leash = fr_point_curve_dist(&t->v[0], r);
		out[0].trip_length = 0;
		return 1;
	}
	/* a one-point route: segments are on-route when both ends are within eps */
	for (size_t i = 0; i + 1 < t->n; i++)
	{
		bool		on = fr_pt_dist(&t->v[i], &r->v[0]) <= eps &&
			fr_pt_dist(&t->v[i + 1], &r->v[0]) <= eps;

		if (on)
			continue;
		if (count > 0 && out[count - 1].trip_to == (double) i)
		{
			out[count - 1].trip_to = (double) (i + 1);
			out[count - 1].trip_length += t->s[i].len;
		}
		else
		{
			out[count].trip_from = (double) i;
			out[count].trip_to = (double) (i + 1);
			out[count].route_from = out[count].route_to = 0;
			out[count].trip_length = t->s[i].len;
			count++;
		}
	}
	for (size_t k = 0; k < count; k++)
	{
		double		worst = 0;

		for (size_t i = (size_t) out[k].trip_from; i <= (size_t) out[k].trip_to; i++)
			worst = fmax(worst, fr_pt_dist(&t->v[i], &r->v[0]));
		out[k].max_leash = worst;
	}
	return count;
}

/* Excursions of a trip from its route; see the top of this file. */
fr_status
fr_excursions(const fr_env *env, const fr_curve *trip, const fr_curve *route,
			  double eps, fr_excursion **out, size_t *count, fr_stats *stats)
{
	fr_prep		t,
				r;
	xctx		x;
	fr_excursion *res = NULL;
	bool	   *off = NULL;
	double	   *y = NULL,
			   *row = NULL;
	bool		close;
	fr_status	st;
	size_t		n,
				m,
				k = 0;

	*out = NULL;
	*count = 0;
	memset(&x, 0, sizeof(x));
	st = fr_prepare_pair(env, trip, route, &t, &r);
	if (st != FR_OK)
		return st;
	eps = fr_to_local(&t, eps);
	n = t.n;
	m = r.n;
	row = fr_alloc(env, (n + m) * sizeof(double));
	res = fr_alloc(env, (n / 2 + 2) * sizeof(fr_excursion));
	if (row == NULL || res == NULL)
	{
		st = FR_ENOMEM;
		goto done;
	}
	/* no excursion exactly when a matching within eps exists */
	st = fr_decide_prepared(env, &t, &r, eps, row, &close, stats);
	if (st != FR_OK || close)
		goto done;
	if (n == 1 || m == 1)
	{
		k = degenerate(&t, &r, eps, res);
		goto done;
	}

	x.env = env;
	x.t = &t;
	x.r = &r;
	x.eps = eps;
	x.pen = 4 * eps;
	x.bottom = row;
	fr_bottom_edge(&t, &r, eps, row);
	x.bcols = block_cols(n);
	x.nck = (n - 1 + x.bcols - 1) / x.bcols + 1;
	x.loaded = SIZE_MAX;
	fr_poll_init(&x.poll, env);
	x.ck = fr_alloc(env, x.nck * sizeof(xcol));
	x.blk = fr_alloc(env, x.bcols * sizeof(xorig));
	off = fr_alloc(env, n * sizeof(bool));
	y = fr_alloc(env, n * sizeof(double));
	if (!x.ck || !x.blk || !off || !y)
	{
		st = FR_ENOMEM;
		goto done;
	}
	memset(x.ck, 0, x.nck * sizeof(xcol));
	memset(x.blk, 0, x.bcols * sizeof(xorig));
	for (size_t c = 0; c < x.nck; c++)
		if (!xcol_alloc(env, &x.ck[c], m))
			st = FR_ENOMEM;
	for (size_t c = 0; c < x.bcols; c++)
		if (!xorig_alloc(env, &x.blk[c], m))
			st = FR_ENOMEM;
	if (!xorig_alloc(env, &x.col0, m) || !xcol_alloc(env, &x.cur, m) || !xcol_alloc(env, &x.next, m))
		st = FR_ENOMEM;
	if (st != FR_OK)
		goto done;

	/* forward, keeping every bcols-th column */
	init_column(&x, &x.ck[0], &x.col0);
	xcol_copy(&x.cur, &x.ck[0], m);
	for (size_t i = 0; i + 1 < n; i++)
	{
		xcol		tmp;

		st = step_column(&x, i, &x.cur, &x.next, NULL);
		if (st != FR_OK)
			goto done;
		tmp = x.cur;
		x.cur = x.next;
		x.next = tmp;
		if ((i + 1) % x.bcols == 0 && (i + 1) / x.bcols < x.nck)
			xcol_copy(&x.ck[(i + 1) / x.bcols], &x.cur, m);
	}
	if (stats)
		stats->cells += 2 * (uint64_t) (n - 1) * (m - 1);

	st = walk_back(&x, off, y);
	if (st != FR_OK)
		goto done;

	/* runs of off-route segments */
	for (size_t i = 0; i + 1 < n;)
	{
		size_t		e = i;
		double		length = 0;

		if (!off[i])
		{
			i++;
			continue;
		}
		while (e + 1 < n && off[e])
			length += t.s[e++].len;
		res[k].trip_from = (double) i;
		res[k].trip_to = (double) e;
		res[k].route_from = isnan(y[i]) ? 0 : y[i];
		res[k].route_to = isnan(y[e]) ? (double) (m - 1) : y[e];
		if (res[k].route_to < res[k].route_from)
			res[k].route_to = res[k].route_from;
		res[k].trip_length = length;
		res[k].max_leash = leash_to_part(&t, i, e, &r, res[k].route_from, res[k].route_to);
		k++;
		i = e;
	}

done:
	if (x.ck)
		for (size_t c = 0; c < x.nck; c++)
			xcol_free(env, &x.ck[c]);
	if (x.blk)
		for (size_t c = 0; c < x.bcols; c++)
			xorig_free(env, &x.blk[c]);
	xorig_free(env, &x.col0);
	xcol_free(env, &x.cur);
	xcol_free(env, &x.next);
	fr_free(env, x.ck);
	fr_free(env, x.blk);
	fr_free(env, off);
	fr_free(env, y);
	fr_free(env, row);
	if (st == FR_OK && k > 0)
	{
		/* lengths back in input units */
		for (size_t i = 0; i < k; i++)
		{
			res[i].max_leash = fr_from_local(&t, res[i].max_leash);
			res[i].trip_length = fr_from_local(&t, res[i].trip_length);
			res[i].route_length = fr_from_local(&r, fr_prep_length_between(&r, res[i].route_from,
																		   res[i].route_to));
		}
		*out = res;
		*count = k;
	}
	fr_release_pair(env, &t, &r);
	if (!(st == FR_OK && k > 0))
		fr_free(env, res);
	return st;
}
