/*
 * bounds.h - summaries of curves for index keys, and cheap bounds on the
 * Fréchet distance computed from summaries and from the curves themselves.
 *
 * Plain C11, no PostgreSQL headers.  Every lower bound returned here has
 * already been loosened (fr_bound_loosen) so that it stays at or below what
 * the engine's decider accepts, even where rounding blurs the last digits:
 * a bound above a distance that fr_decide accepts would make an index drop
 * a row that the exact call keeps.
 */
#ifndef FR_BOUNDS_H
#define FR_BOUNDS_H

#include <stdbool.h>
#include <stddef.h>

#include "frechet.h"

/*
 * Intervals of a summary (fr_key.lo[i] .. fr_key.hi[i]): the x and y of the
 * first vertex, of the last vertex, then the four sides of the bounding box.
 */
enum
{
	FR_KEY_START_X = 0,
	FR_KEY_START_Y,
	FR_KEY_END_X,
	FR_KEY_END_Y,
	FR_KEY_MIN_X,
	FR_KEY_MIN_Y,
	FR_KEY_MAX_X,
	FR_KEY_MAX_Y,
	FR_KEY_NDIM
};

/*
 * Summary of a set of curves (one curve: every interval is a single value).
 * For each quantity above it holds the range the curves' values fall in.
 * A query key also carries reach: the tolerance epsilon of a range query.
 * Keys with infinite intervals cover every curve, including invalid ones.
 */
typedef struct fr_key
{
	double		lo[FR_KEY_NDIM];
	double		hi[FR_KEY_NDIM];
	double		reach;
} fr_key;

/*
 * Keys packed into float4 values for an index to store.  A key whose
 * every interval is one finite value below FLT_MAX in magnitude (a leaf's
 * key: one curve) packs into FR_KEY_PACKED_POINT floats, each the value
 * rounded to the nearest float; it unpacks to the floats either side of
 * that (round to nearest errs by at most half the gap to the neighbour on
 * the value's side, so the value lies between them).  Any other key packs
 * into FR_KEY_PACKED_RANGE floats, each low end rounded down and each high
 * end rounded up (beyond the float range: to infinity).  Either way the
 * unpacked key covers the packed one, interval by interval, and every
 * bound here only falls when a key's intervals widen (which the bounds of
 * a node, the union of its entries, already rely on), so a packed key
 * never lets the index drop a curve that the unpacked key would keep.
 */
#define FR_KEY_PACKED_POINT FR_KEY_NDIM
#define FR_KEY_PACKED_RANGE (2 * FR_KEY_NDIM)

/* Packs a key (its reach is not kept); returns the floats written to out. */
size_t		fr_key_pack(const fr_key *k, float *out);

/* Unpacks n floats written by fr_key_pack (reach 0); false if n is neither size. */
bool		fr_key_unpack(const float *in, size_t n, fr_key *out);

/* fr_verdict, the verdict of the cheap bounds, is in frechet.h. */

/* The summary of one curve (x and y only; z is ignored, which keeps bounds valid). */
void		fr_key_of_curve(const fr_curve *c, fr_key *key);

/* A key that covers every curve: infinite intervals, reach 0. */
void		fr_key_everything(fr_key *key);

/* Widens acc to cover what k covers. */
void		fr_key_union(fr_key *acc, const fr_key *k);

/* True when both keys cover exactly the same ranges. */
bool		fr_key_equal(const fr_key *a, const fr_key *b);

/* Sum of the interval lengths (infinite for keys with infinite intervals). */
double		fr_key_margin(const fr_key *k);

/* How much the margin of orig grows when it must also cover add. */
double		fr_key_penalty(const fr_key *orig, const fr_key *add);

/*
 * Slack that covers rounding in the engine: relative to the bound and to
 * the largest coordinate magnitude involved, plus an absolute floor for
 * squares that underflow.
 */
double		fr_bound_slack(double bound, double magnitude);

/* A computed lower bound minus its slack, never below 0. */
double		fr_bound_loosen(double bound, double magnitude);

/*
 * Lower bound on the Fréchet distance between any curve summarised by a and
 * any curve summarised by b: first vertices, last vertices and each side of
 * the bounding boxes must lie within the distance (a coupling matches the
 * first and last vertices, and every vertex lies within the distance of the
 * other curve, so the extreme ones bound the sides).  Loosened.
 */
double		fr_key_bound(const fr_key *a, const fr_key *b);

/*
 * Lower bound on the ping distance of the tracks summarised by trip to the
 * route summarised by route (one-sided box test, first and last vertices);
 * loosened like every bound here.
 */
double		fr_key_ping_bound(const fr_key *trip, const fr_key *route);

/* The same from the first and last vertices alone (for boxes larger than the vertices'). */
double		fr_key_ping_bound_ends(const fr_key *trip, const fr_key *route);

/*
 * fr_key_bound(node, qkey), raised by the largest distance from a vertex of
 * the query to the node's overall bounding box: every vertex of the query
 * lies within the distance of each curve, and each curve lies inside that
 * box.  hull holds the query's convex hull (nhull x,y pairs): the distance
 * to a box is convex, so its maximum over the vertices is at a hull vertex.
 * Loosened.
 */
double		fr_key_hull_bound(const fr_key *node, const fr_key *qkey,
							  const double *hull, size_t nhull);

/*
 * Lower bound on the passage distance (fr_passage_distance) from the
 * stretch summarised by stretch to a part of any trip summarised by node:
 * the stretch's ends within the distance of the node's overall box, the
 * trip's box covering the stretch's box shrunk by the distance.  With a
 * hull of the stretch's x,y vertices, raised by their distance to the
 * node's box.  Loosened.
 */
double		fr_key_passage_bound(const fr_key *node, const fr_key *stretch);
double		fr_key_passage_hull_bound(const fr_key *node, const fr_key *stretch,
									  const double *hull, size_t nhull);

/*
 * Convex hull of the curve's x,y vertices (Andrew's monotone chain).  sorted
 * needs room for 2 n doubles and hull for 4 n; returns the number of hull
 * vertices written to hull as x,y pairs (at least 1).  Allocates nothing.
 */
size_t		fr_convex_hull(const fr_curve *c, double *sorted, double *hull);

/*
 * Cheap bounds on "distance(p, q) <= eps", in O(n + m) time and no memory:
 * the summary bound, the distance from each vertex to the other curve's
 * bounding box, and a greedy monotone vertex coupling (its longest leash is
 * an upper bound, Eiter & Mannila 1994).  Never contradicts fr_decide_plain:
 * FR_FAR and FR_NEAR are given only with a margin above rounding.
 */
fr_verdict	fr_cheap_decide(const fr_curve *p, const fr_curve *q, double eps);

#endif							/* FR_BOUNDS_H */
