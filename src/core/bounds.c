/*
 * bounds.c - curve summaries for index keys and cheap bounds on the Fréchet
 * distance.
 *
 * The lower bounds rest on two facts about any coupling of two curves
 * within distance d (Alt & Godau 1995, definition of the Fréchet distance):
 * it matches first vertices with first vertices and last with last, and
 * every point of one curve is matched to a point of the other within d, so
 * the directed Hausdorff distances, and with them the differences between
 * the sides of the bounding boxes, are at most d.  Range-query pipelines on
 * trajectory sets index exactly these quantities.  The upper bound is the
 * longest leash of a monotone vertex coupling, which bounds the continuous
 * distance from above (Eiter & Mannila 1994: d <= d_discrete).
 */
#include <float.h>
#include <math.h>

#include "bounds.h"

/* Relative slack on a bound (rounding in the decider is a few ulps). */
#define FR_SLACK_REL 1e-9
/* Slack per unit of coordinate magnitude (the decider rounds coordinate differences). */
#define FR_SLACK_MAG 1e-12
/* Absolute floor: squares of differences below about 1e-162 underflow. */
#define FR_SLACK_ABS 1e-150

/* Larger of two doubles (NaN-free inputs). */
static inline double
max2(double a, double b)
{
	return a > b ? a : b;
}

/* Distance between intervals [alo, ahi] and [blo, bhi]; 0 when they meet. */
static inline double
interval_gap(double alo, double ahi, double blo, double bhi)
{
	double		g = max2(blo - ahi, alo - bhi);

	/* infinite intervals give -Inf here, never NaN: lo is never +Inf, hi never -Inf */
	return g > 0.0 ? g : 0.0;
}

/* Euclidean distance between two x,y boxes given as interval pairs of two keys. */
static inline double
box_gap(const fr_key *a, const fr_key *b, int ix, int iy)
{
	double		dx = interval_gap(a->lo[ix], a->hi[ix], b->lo[ix], b->hi[ix]);
	double		dy = interval_gap(a->lo[iy], a->hi[iy], b->lo[iy], b->hi[iy]);

	return sqrt(dx * dx + dy * dy);
}

/*
 * How far the box of inner may reach beyond the box of outer, as side
 * intervals allow: the smallest min side outer's curves may have against
 * the largest min side of inner's, likewise the max sides.  A bound of a
 * one-sided test: every vertex of inner's curves within the distance of
 * outer's curves puts inner's box inside outer's widened by it.
 */
static inline double
box_inside_gap(const fr_key *inner, const fr_key *outer)
{
	return max2(max2(outer->lo[FR_KEY_MIN_X] - inner->hi[FR_KEY_MIN_X],
					 outer->lo[FR_KEY_MIN_Y] - inner->hi[FR_KEY_MIN_Y]),
				max2(inner->lo[FR_KEY_MAX_X] - outer->hi[FR_KEY_MAX_X],
					 inner->lo[FR_KEY_MAX_Y] - outer->hi[FR_KEY_MAX_Y]));
}

/* Largest coordinate magnitude a key covers: every vertex lies within its box sides. */
static double
key_magnitude(const fr_key *k)
{
	double		m = 0.0;

	for (int i = FR_KEY_MIN_X; i <= FR_KEY_MAX_Y; i++)
		m = max2(m, max2(fabs(k->lo[i]), fabs(k->hi[i])));
	return m;
}

/* The summary of one curve. */
void
fr_key_of_curve(const fr_curve *c, fr_key *key)
{
	const double *v = c->coords;
	const double *last = c->coords + (c->n - 1) * c->dim;
	double		minx = v[0],
				miny = v[1],
				maxx = v[0],
				maxy = v[1];

	for (size_t i = 1; i < c->n; i++)
	{
		double		x = v[i * c->dim],
					y = v[i * c->dim + 1];

		if (x < minx)
			minx = x;
		if (x > maxx)
			maxx = x;
		if (y < miny)
			miny = y;
		if (y > maxy)
			maxy = y;
	}
	key->lo[FR_KEY_START_X] = key->hi[FR_KEY_START_X] = v[0];
	key->lo[FR_KEY_START_Y] = key->hi[FR_KEY_START_Y] = v[1];
	key->lo[FR_KEY_END_X] = key->hi[FR_KEY_END_X] = last[0];
	key->lo[FR_KEY_END_Y] = key->hi[FR_KEY_END_Y] = last[1];
	key->lo[FR_KEY_MIN_X] = key->hi[FR_KEY_MIN_X] = minx;
	key->lo[FR_KEY_MIN_Y] = key->hi[FR_KEY_MIN_Y] = miny;
	key->lo[FR_KEY_MAX_X] = key->hi[FR_KEY_MAX_X] = maxx;
	key->lo[FR_KEY_MAX_Y] = key->hi[FR_KEY_MAX_Y] = maxy;
	key->reach = 0.0;
}

/* A key covering every curve. */
void
fr_key_everything(fr_key *key)
{
	for (int i = 0; i < FR_KEY_NDIM; i++)
	{
		key->lo[i] = -INFINITY;
		key->hi[i] = INFINITY;
	}
	key->reach = 0.0;
}

/* The largest float not above v (-FLT_MAX below the range ... -Inf for -Inf). */
static float
float_down(double v)
{
	float		f = (float) v;

	if ((double) f > v)
		f = nextafterf(f, -INFINITY);
	return f;
}

/* The smallest float not below v. */
static float
float_up(double v)
{
	float		f = (float) v;

	if ((double) f < v)
		f = nextafterf(f, INFINITY);
	return f;
}

size_t
fr_key_pack(const fr_key *k, float *out)
{
	bool		point = true;

	for (int i = 0; i < FR_KEY_NDIM && point; i++)
		point = k->lo[i] == k->hi[i] && fabs(k->lo[i]) < FLT_MAX;
	if (point)
	{
		for (int i = 0; i < FR_KEY_NDIM; i++)
			out[i] = (float) k->lo[i];
		return FR_KEY_PACKED_POINT;
	}
	for (int i = 0; i < FR_KEY_NDIM; i++)
	{
		out[2 * i] = float_down(k->lo[i]);
		out[2 * i + 1] = float_up(k->hi[i]);
	}
	return FR_KEY_PACKED_RANGE;
}

bool
fr_key_unpack(const float *in, size_t n, fr_key *out)
{
	out->reach = 0.0;
	if (n == FR_KEY_PACKED_POINT)
	{
		for (int i = 0; i < FR_KEY_NDIM; i++)
		{
			out->lo[i] = nextafterf(in[i], -INFINITY);
			out->hi[i] = nextafterf(in[i], INFINITY);
		}
		return true;
	}
	if (n != FR_KEY_PACKED_RANGE)
		return false;
	for (int i = 0; i < FR_KEY_NDIM; i++)
	{
		out->lo[i] = in[2 * i];
		out->hi[i] = in[2 * i + 1];
	}
	return true;
}

/* Widens acc to cover k. */
void
fr_key_union(fr_key *acc, const fr_key *k)
{
	for (int i = 0; i < FR_KEY_NDIM; i++)
	{
		if (k->lo[i] < acc->lo[i])
			acc->lo[i] = k->lo[i];
		if (k->hi[i] > acc->hi[i])
			acc->hi[i] = k->hi[i];
	}
	acc->reach = max2(acc->reach, k->reach);
}

/* Equality of every interval and of reach. */
bool
fr_key_equal(const fr_key *a, const fr_key *b)
{
	for (int i = 0; i < FR_KEY_NDIM; i++)
		if (a->lo[i] != b->lo[i] || a->hi[i] != b->hi[i])
			return false;
	return a->reach == b->reach;
}

/* Sum of interval lengths. */
double
fr_key_margin(const fr_key *k)
{
	double		m = 0.0;

	for (int i = 0; i < FR_KEY_NDIM; i++)
		m += k->hi[i] - k->lo[i];
	return m;
}

/* Growth of orig's margin when it must cover add; comparisons first, so Inf - Inf never occurs. */
double
fr_key_penalty(const fr_key *orig, const fr_key *add)
{
	double		p = 0.0;

	for (int i = 0; i < FR_KEY_NDIM; i++)
	{
		if (add->hi[i] > orig->hi[i])
			p += add->hi[i] - orig->hi[i];
		if (add->lo[i] < orig->lo[i])
			p += orig->lo[i] - add->lo[i];
	}
	return p;
}

/* Slack covering rounding in the engine around a bound. */
double
fr_bound_slack(double bound, double magnitude)
{
	return fabs(bound) * FR_SLACK_REL + magnitude * FR_SLACK_MAG + FR_SLACK_ABS;
}

/* A bound lowered by its slack, at least 0. */
double
fr_bound_loosen(double bound, double magnitude)
{
	double		b = bound - fr_bound_slack(bound, magnitude);

	/* written so that NaN (never expected) falls to 0, the safe side */
	return b > 0.0 ? b : 0.0;
}

/* Lower bound from two summaries: first vertices, last vertices, box sides. */
double
fr_key_bound(const fr_key *a, const fr_key *b)
{
	double		lb = max2(box_gap(a, b, FR_KEY_START_X, FR_KEY_START_Y),
						  box_gap(a, b, FR_KEY_END_X, FR_KEY_END_Y));

	for (int i = FR_KEY_MIN_X; i <= FR_KEY_MAX_Y; i++)
		lb = max2(lb, interval_gap(a->lo[i], a->hi[i], b->lo[i], b->hi[i]));
	return fr_bound_loosen(lb, max2(key_magnitude(a), key_magnitude(b)));
}

/*
 * Lower bound on the ping distance (pings.c) of the tracks a summary
 * covers (trip) to a route summary: the first ping at the route's start,
 * the last at its end, and every ping within the distance of the route,
 * so the trip's box inside the route's box widened by it.  One-sided,
 * unlike fr_key_bound: the route between two pings may reach anywhere.
 */
double
fr_key_ping_bound(const fr_key *trip, const fr_key *route)
{
	double		lb = max2(box_gap(trip, route, FR_KEY_START_X, FR_KEY_START_Y),
						  box_gap(trip, route, FR_KEY_END_X, FR_KEY_END_Y));

	/* the trips' boxes inside the route's widened by the distance */
	lb = max2(lb, box_inside_gap(trip, route));
	return fr_bound_loosen(lb, max2(key_magnitude(trip), key_magnitude(route)));
}

/*
 * The same from the first and last vertices alone, for summaries whose
 * box covers more than the vertices (geography, whose keys summarise the
 * edges' geodesics too): pings are vertices, so only the ends bound them.
 */
double
fr_key_ping_bound_ends(const fr_key *trip, const fr_key *route)
{
	double		lb = max2(box_gap(trip, route, FR_KEY_START_X, FR_KEY_START_Y),
						  box_gap(trip, route, FR_KEY_END_X, FR_KEY_END_Y));

	return fr_bound_loosen(lb, max2(key_magnitude(trip), key_magnitude(route)));
}

/* Distance from (x, y) to the overall bounding box of a key. */
static inline double
point_box_gap(const fr_key *k, double x, double y)
{
	double		dx = interval_gap(k->lo[FR_KEY_MIN_X], k->hi[FR_KEY_MAX_X], x, x);
	double		dy = interval_gap(k->lo[FR_KEY_MIN_Y], k->hi[FR_KEY_MAX_Y], y, y);

	return sqrt(dx * dx + dy * dy);
}

/*
 * Summary bound raised by the query hull's distance to the node's box.
 * Any subset of the query's vertices gives a valid bound, so a hull that
 * rounding made slightly too small weakens the bound but never breaks it.
 */
double
fr_key_hull_bound(const fr_key *node, const fr_key *qkey,
				  const double *hull, size_t nhull)
{
	double		lb = fr_key_bound(node, qkey);
	double		h = 0.0;

	for (size_t i = 0; i < nhull; i++)
		h = max2(h, point_box_gap(node, hull[2 * i], hull[2 * i + 1]));
	h = fr_bound_loosen(h, max2(key_magnitude(node), key_magnitude(qkey)));
	return max2(lb, h);
}

/* Distance from the x,y box of interval pair (ix, iy) of k to the overall box of node. */
static inline double
node_box_gap(const fr_key *node, const fr_key *k, int ix, int iy)
{
	double		dx = interval_gap(node->lo[FR_KEY_MIN_X], node->hi[FR_KEY_MAX_X], k->lo[ix], k->hi[ix]);
	double		dy = interval_gap(node->lo[FR_KEY_MIN_Y], node->hi[FR_KEY_MAX_Y], k->lo[iy], k->hi[iy]);

	return sqrt(dx * dx + dy * dy);
}

/*
 * Lower bound on the passage distance (passage.c) from the stretch
 * summarised by stretch to a part of any trip summarised by node: every
 * point of the stretch is matched to a trip point, which lies in the
 * node's overall box, so the stretch's first and last vertices lie within
 * the distance of that box, and each side of the stretch's box within the
 * distance of the side of the trip's (the trip's box covers the stretch's
 * box shrunk by the distance).  The trip's ends are free.  Loosened.
 */
double
fr_key_passage_bound(const fr_key *node, const fr_key *stretch)
{
	double		lb = max2(node_box_gap(node, stretch, FR_KEY_START_X, FR_KEY_START_Y),
						  node_box_gap(node, stretch, FR_KEY_END_X, FR_KEY_END_Y));

	/* the stretch's box inside the trips' widened by the distance */
	lb = max2(lb, box_inside_gap(stretch, node));
	return fr_bound_loosen(lb, max2(key_magnitude(node), key_magnitude(stretch)));
}

/* fr_key_passage_bound raised by the distance from each hull vertex of the stretch to the node's box. */
double
fr_key_passage_hull_bound(const fr_key *node, const fr_key *stretch,
						  const double *hull, size_t nhull)
{
	double		lb = fr_key_passage_bound(node, stretch);
	double		h = 0.0;

	for (size_t i = 0; i < nhull; i++)
		h = max2(h, point_box_gap(node, hull[2 * i], hull[2 * i + 1]));
	h = fr_bound_loosen(h, max2(key_magnitude(node), key_magnitude(stretch)));
	return max2(lb, h);
}

/* Lexicographic order of x,y pairs. */
static inline bool
pair_less(const double *a, const double *b)
{
	return a[0] < b[0] || (a[0] == b[0] && a[1] < b[1]);
}

/* Sifts pair i down a max-heap of n pairs. */
static void
sift_down(double *v, size_t i, size_t n)
{
	for (;;)
	{
		size_t		big = i,
					l = 2 * i + 1,
					r = 2 * i + 2;
		double		tx,
					ty;

		if (l < n && pair_less(&v[2 * big], &v[2 * l]))
			big = l;
		if (r < n && pair_less(&v[2 * big], &v[2 * r]))
			big = r;
		if (big == i)
			return;
		tx = v[2 * i];
		ty = v[2 * i + 1];
		v[2 * i] = v[2 * big];
		v[2 * i + 1] = v[2 * big + 1];
		v[2 * big] = tx;
		v[2 * big + 1] = ty;
		i = big;
	}
}

/* Heapsort of n x,y pairs in place (no allocation, O(n log n)). */
static void
sort_pairs(double *v, size_t n)
{
	for (size_t i = n / 2; i-- > 0;)
		sift_down(v, i, n);
	for (size_t end = n; end-- > 1;)
	{
		double		tx = v[0],
					ty = v[1];

		v[0] = v[2 * end];
		v[1] = v[2 * end + 1];
		v[2 * end] = tx;
		v[2 * end + 1] = ty;
		sift_down(v, 0, end);
	}
}

/* Cross product (b - a) x (c - a) of x,y pairs. */
static inline double
cross3(const double *a, const double *b, const double *c)
{
	return (b[0] - a[0]) * (c[1] - a[1]) - (b[1] - a[1]) * (c[0] - a[0]);
}

/* Convex hull by Andrew's monotone chain over the sorted vertices. */
size_t
fr_convex_hull(const fr_curve *c, double *sorted, double *hull)
{
	size_t		n = c->n,
				k = 0,
				lower;

	for (size_t i = 0; i < n; i++)
	{
		sorted[2 * i] = c->coords[i * c->dim];
		sorted[2 * i + 1] = c->coords[i * c->dim + 1];
	}
	sort_pairs(sorted, n);
	for (size_t i = 0; i < n; i++)
	{
		while (k >= 2 && cross3(&hull[2 * (k - 2)], &hull[2 * (k - 1)], &sorted[2 * i]) <= 0)
			k--;
		hull[2 * k] = sorted[2 * i];
		hull[2 * k + 1] = sorted[2 * i + 1];
		k++;
	}
	lower = k + 1;
	for (size_t i = n - 1; i-- > 0;)
	{
		while (k >= lower && cross3(&hull[2 * (k - 2)], &hull[2 * (k - 1)], &sorted[2 * i]) <= 0)
			k--;
		hull[2 * k] = sorted[2 * i];
		hull[2 * k + 1] = sorted[2 * i + 1];
		k++;
	}
	/* the chain ends where it began; drop the repeat (a single point stays) */
	return k > 1 ? k - 1 : k;
}

/* Largest distance from a vertex of c to the bounding box of key. */
static double
curve_box_gap(const fr_curve *c, const fr_key *key)
{
	double		h2 = 0.0;

	/* the largest square, then one root: sqrt is monotone, so the result is the same */
	for (size_t i = 0; i < c->n; i++)
	{
		double		x = c->coords[i * c->dim],
					y = c->coords[i * c->dim + 1];
		double		dx = interval_gap(key->lo[FR_KEY_MIN_X], key->hi[FR_KEY_MAX_X], x, x),
					dy = interval_gap(key->lo[FR_KEY_MIN_Y], key->hi[FR_KEY_MAX_Y], y, y);

		h2 = max2(h2, dx * dx + dy * dy);
	}
	return sqrt(h2);
}

/* Largest coordinate magnitude of a curve, in all dimensions. */
static double
curve_magnitude(const fr_curve *c)
{
	double		m = 0.0;

	for (size_t i = 0; i < c->n * c->dim; i++)
		m = max2(m, fabs(c->coords[i]));
	return m;
}

/* Squared distance between two vertices of dim coordinates. */
static inline double
vertex_dist2(const double *v, const double *a, int dim)
{
	double		s = 0.0;

	for (int k = 0; k < dim; k++)
		s += (a[k] - v[k]) * (a[k] - v[k]);
	return s;
}

/* Distance between vertex i of p and vertex j of q, in all dimensions. */
static inline double
vertex_dist(const fr_curve *p, size_t i, const fr_curve *q, size_t j)
{
	return sqrt(vertex_dist2(p->coords + i * p->dim, q->coords + j * q->dim, p->dim));
}

/* Distance from vertex i of c to the point at parameter t of segment j of d. */
static inline double
vertex_to_segment_point(const fr_curve *c, size_t i, const fr_curve *d, size_t j, double t)
{
	const double *v = c->coords + i * c->dim,
			   *a = d->coords + j * d->dim,
			   *b = a + d->dim;
	double		s = 0.0;

	for (int k = 0; k < c->dim; k++)
	{
		double		x = (a[k] + t * (b[k] - a[k])) - v[k];

		s += x * x;
	}
	return sqrt(s);
}

/*
 * Smallest t >= low in [0, 1] where segment j of d comes within lim of
 * vertex i of c, or -1.  The quadratic is solved approximately; the answer
 * is then checked by measuring the distance at t directly, so rounding can
 * only lose an exit, never admit one farther than lim.  The smallest root
 * lies on the circle of radius lim, where rounding puts the measured
 * distance above lim about as often as not; then t moves a hair towards
 * the foot (the distance falls that way) and is measured again.
 */
static double
first_free_param(const fr_curve *c, size_t i, const fr_curve *d, size_t j, double low, double lim)
{
	const double *v = c->coords + i * c->dim,
			   *a = d->coords + j * d->dim,
			   *b = a + d->dim;
	double		dd = 0.0,
				dw = 0.0,
				ww = 0.0,
				t;

	for (int k = 0; k < c->dim; k++)
	{
		double		e = b[k] - a[k],
					w = a[k] - v[k];

		dd += e * e;
		dw += e * w;
		ww += w * w;
	}
	if (!(dd > 0.0))
		t = low;				/* a repeated point: free everywhere or nowhere */
	else
	{
		double		foot = -dw / dd;
		double		h2 = ww - foot * foot * dd;
		double		half;

		if (h2 < 0.0)
			h2 = 0.0;
		if (h2 > lim * lim)
			return -1.0;
		half = sqrt((lim * lim - h2) / dd);
		if (foot + half < low)
			return -1.0;
		t = max2(low, foot - half);
		if (t > 1.0)
			return -1.0;
		if (vertex_to_segment_point(c, i, d, j, t) <= lim)
			return t;
		if (!(t < foot))
			return -1.0;
		t = fmin(t + (foot - t) * 0x1p-20, 1.0);
	}
	return vertex_to_segment_point(c, i, d, j, t) <= lim ? t : -1.0;
}

/* True when every vertex of d from index j on lies within lim of vertex i of c. */
static bool
rest_within(const fr_curve *c, size_t i, const fr_curve *d, size_t j, double lim)
{
	for (; j < d->n; j++)
		if (vertex_dist(c, i, d, j) > lim)
			return false;
	return true;
}

/* Most steps in one run of greedy_coupling. */
#define RUN_MAX 4096

/*
 * A run of greedy_coupling from (*i, *j), whose leash is r: steps taken
 * without measuring the leash.  Each pair (a, b) of the run is within
 * |p[a] - p[*i]| + r + |q[b] - q[*j]| of each other (triangle
 * inequality), so a step costs one distance, from the walker's new vertex
 * to where it began the run, instead of the three leashes a measured step
 * compares; the walker that has moved less steps next, so both keep pace.
 * The run stops before that bound passes room.  Returns the number of
 * steps taken; *i and *j move only if there are two or more (a single
 * step is better chosen by measuring).
 */
static size_t
coupling_run(const fr_curve *p, const fr_curve *q, size_t *i, size_t *j, double r, double room)
{
	size_t		a = *i,
				b = *j,
				steps = 0;
	double		dp = 0.0,		/* |p[a] - p[*i]| */
				dq = 0.0;		/* |q[b] - q[*j]| */

	while (steps < RUN_MAX && (a + 1 < p->n || b + 1 < q->n))
	{
		bool		step_p = a + 1 < p->n && (b + 1 >= q->n || dp <= dq);
		double		moved = step_p ? vertex_dist(p, a + 1, p, *i) : vertex_dist(q, b + 1, q, *j);

		if (!((step_p ? moved + dq : dp + moved) + r <= room))
			break;
		if (step_p)
		{
			dp = moved;
			a++;
		}
		else
		{
			dq = moved;
			b++;
		}
		steps++;
	}
	if (steps >= 2)
	{
		*i = a;
		*j = b;
	}
	return steps;
}

/*
 * Greedy monotone vertex coupling: from (first, first), step to whichever
 * of the next pairs (both advance, p advances, q advances) is closest, as
 * long as it stays within lim.  Reaching (last, last) proves the distance
 * is at most lim: on each step both walkers move linearly, so the leash is
 * convex in time and largest at the step's ends.  The greedy walks of
 * Bringmann, Künnemann & Nusser (SoCG 2019) are of this kind, and so are
 * its adaptive steps: where the leash r leaves room, a run of many steps
 * (coupling_run) is taken at the cost of one distance a step, using half
 * the room, (lim + r) / 2, so that the walk keeps some for what follows.
 * Runs are tried while the leash is under lim / 2 and they go two or more
 * steps; densely sampled tracks take long runs, sparse ones take unit
 * steps as before.  The runs' sums are of a few terms, so the slack in
 * lim covers their rounding.
 */
static bool
greedy_coupling(const fr_curve *p, const fr_curve *q, double lim)
{
	size_t		i = 0,
				j = 0;
	double		r = vertex_dist(p, 0, q, 0);

	if (r > lim)
		return false;
	while (i + 1 < p->n || j + 1 < q->n)
	{
		double		best = INFINITY,
					d;
		size_t		ni = i,
					nj = j;

		if (r < lim / 2 && coupling_run(p, q, &i, &j, r, (lim + r) / 2) >= 2)
		{
			r = vertex_dist(p, i, q, j);
			continue;
		}

		if (i + 1 < p->n && j + 1 < q->n)
		{
			best = vertex_dist(p, i + 1, q, j + 1);
			ni = i + 1;
			nj = j + 1;
		}
		if (i + 1 < p->n && (d = vertex_dist(p, i + 1, q, j)) < best)
		{
			best = d;
			ni = i + 1;
			nj = j;
		}
		if (j + 1 < q->n && (d = vertex_dist(p, i, q, j + 1)) < best)
		{
			best = d;
			ni = i;
			nj = j + 1;
		}
		if (!(best <= lim))
			return false;
		i = ni;
		j = nj;
		r = best;
	}
	return true;
}

/*
 * Squared distance from vertex v to segment a-b (dim coordinates each), no
 * square root; the nearest point is clamped to the segment.
 */
static inline double
point_segment_dist2(const double *v, const double *a, const double *b, int dim)
{
	double		dd = 0.0,
				dw = 0.0,
				ww = 0.0,
				s = 0.0,
				t;

	for (int k = 0; k < dim; k++)
	{
		dd += (b[k] - a[k]) * (b[k] - a[k]);
		dw += (b[k] - a[k]) * (a[k] - v[k]);
		ww += (a[k] - v[k]) * (a[k] - v[k]);
	}
	if (dw >= 0.0)
		return ww;				/* the foot lies before a: a is the nearest point */
	if (!(dd < INFINITY && fabs(dw) < INFINITY))
		return 0.0;				/* overflow: call it close, which is always safe */
	t = dd > 0.0 ? -dw / dd : 0.0;
	t = t > 0.0 ? (t < 1.0 ? t : 1.0) : 0.0;	/* NaN falls to 0 */
	for (int k = 0; k < dim; k++)
	{
		double		x = (a[k] + t * (b[k] - a[k])) - v[k];

		s += x * x;
	}
	return s;
}

/*
 * Is some vertex of c farther than lim from every point of d?  Then the
 * distance exceeds lim (the negative filter of Bringmann, Künnemann &
 * Nusser, SoCG 2019: the directed Hausdorff distance bounds the Fréchet
 * distance from below).  Each vertex searches d's segments outward from
 * where the previous vertex found a close one, so matching curves cost
 * about O(n + m); the search gives up (false) after budget segment visits.
 *
 * Squared distances are compared with lim^2 (1 + 2^-40): rounding can only
 * call a vertex close that is a hair too far, which weakens the filter and
 * never makes it wrong.  dim is a constant in each instance below, so the
 * loops over coordinates unroll.
 */
static inline bool
vertex_far_dim(const fr_curve *c, const fr_curve *d, double lim, size_t budget, int dim)
{
	size_t		nseg = d->n > 1 ? d->n - 1 : 1,
				hint = 0;
	double		lim2 = lim * lim * (1.0 + 0x1p-40);

	for (size_t i = 0; i < c->n; i++)
	{
		const double *v = c->coords + i * dim;
		bool		close = false;

		/*
		 * hint+1, hint, hint+2, hint-1, hint+3, ... while either side
		 * remains: both curves move forward, so the segment after the last
		 * close one is the likeliest.
		 */
		for (size_t r = 1; !close && (hint + r < nseg || r <= hint + 1); r++)
		{
			for (int side = 0; side < 2 && !close; side++)
			{
				size_t		j;
				const double *a;

				if (side == 0 ? hint + r >= nseg : r > hint + 1)
					continue;
				j = side == 0 ? hint + r : hint + 1 - r;
				if (budget-- == 0)
					return false;
				a = d->coords + j * dim;
				/* the segment's first vertex often settles it, with no division */
				if (vertex_dist2(v, a, dim) <= lim2 ||
					point_segment_dist2(v, a, d->n > 1 ? a + dim : a, dim) <= lim2)
				{
					close = true;
					hint = j;
				}
			}
		}
		if (!close)
			return true;
	}
	return false;
}

static bool
vertex_far_from_curve(const fr_curve *c, const fr_curve *d, double lim, size_t budget)
{
	if (!(lim * lim < INFINITY))
		return false;			/* lim^2 overflows: the filter does not apply */
	return c->dim == 2 ? vertex_far_dim(c, d, lim, budget, 2) : vertex_far_dim(c, d, lim, budget, 3);
}

/*
 * Greedy monotone walk through the free space at lim, along cell
 * boundaries (Alt & Godau 1995: within a cell the free space is convex, so
 * a straight move between two free boundary points stays free).  In cell
 * (i, j), entered on its bottom edge at p's parameter s (q at vertex j) or
 * on its left edge at q's parameter t (p at vertex i), it leaves through
 * the top-right corner if that is free, else through whichever of the right
 * and top edges it can enter lowest.  Reaching the far corner proves the
 * distance is at most lim.  Greedy walks of this kind are the positive
 * filters of Bringmann, Künnemann & Nusser (SoCG 2019).  O(n + m).
 */
static bool
greedy_walk(const fr_curve *p, const fr_curve *q, double lim)
{
	size_t		i = 0,
				j = 0;
	bool		on_left = false;	/* entered on the left edge (else the bottom) */
	double		pos = 0.0;		/* the entry parameter on that edge */

	if (vertex_dist(p, 0, q, 0) > lim)
		return false;
	for (;;)
	{
		double		right,
					top;

		if (i + 1 == p->n)		/* p waits at its last vertex: q must finish near it */
			return rest_within(p, i, q, j + 1, lim);
		if (j + 1 == q->n)
			return rest_within(q, j, p, i + 1, lim);
		if (vertex_dist(p, i + 1, q, j + 1) <= lim)
		{
			i++;
			j++;
			on_left = false;
			pos = 0.0;
			continue;
		}
		/* right edge: p's vertex i+1 against q's segment j; top edge: q's vertex j+1 against p's segment i */
		right = first_free_param(p, i + 1, q, j, on_left ? pos : 0.0, lim);
		top = first_free_param(q, j + 1, p, i, on_left ? 0.0 : pos, lim);
		if (right < 0.0 && top < 0.0)
			return false;
		if (top < 0.0 || (right >= 0.0 && right <= top))
		{
			i++;
			on_left = true;
			pos = right;
		}
		else
		{
			j++;
			on_left = false;
			pos = top;
		}
	}
}

/* Cheap verdict on "distance(p, q) <= eps"; see bounds.h. */
fr_verdict
fr_cheap_decide(const fr_curve *p, const fr_curve *q, double eps)
{
	fr_key		kp,
				kq;
	double		mag,
				lim;
	size_t		budget;

	/* pairs the exact deciders refuse (FR_ERANGE) get no verdict here either */
	if (!fr_pair_in_range(p, q))
		return FR_UNDECIDED;
	if (isinf(eps))
		return FR_NEAR;
	fr_key_of_curve(p, &kp);
	fr_key_of_curve(q, &kq);
	if (fr_key_bound(&kp, &kq) > eps)
		return FR_FAR;
	mag = max2(curve_magnitude(p), curve_magnitude(q));
	if (fr_bound_loosen(max2(curve_box_gap(p, &kq), curve_box_gap(q, &kp)), mag) > eps)
		return FR_FAR;
	/* a coupling must clear eps by more than rounding, so the decider agrees */
	lim = eps - fr_bound_slack(eps, mag);
	if (lim > 0.0 && (greedy_coupling(p, q, lim) || greedy_walk(p, q, lim)))
		return FR_NEAR;
	/* and a far vertex must lie beyond eps by more than rounding */
	lim = eps + fr_bound_slack(eps, mag);
	budget = 8 * (p->n + q->n);
	if (vertex_far_from_curve(p, q, lim, budget) || vertex_far_from_curve(q, p, lim, budget))
		return FR_FAR;
	return FR_UNDECIDED;
}
