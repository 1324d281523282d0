/*
 * fr_internal.h - shared pieces of the engine: prepared curves, free-space
 * intervals, scratch memory and interrupt polling.  Not part of the API.
 */
#ifndef FR_INTERNAL_H
#define FR_INTERNAL_H

#include <math.h>

#include "frechet.h"

/* A vertex in the local frame; 2-D curves carry z = 0, which is exact. */
typedef struct fr_pt
{
	double		x,
				y,
				z;
} fr_pt;

/* A segment from vertex k to k+1: unit direction and length (len 0: a point). */
typedef struct fr_seg
{
	double		ux,
				uy,
				uz,
				len;
} fr_seg;

/* A curve shifted to a local origin, with its segments precomputed. */
typedef struct fr_prep
{
	fr_pt	   *v;				/* n vertices */
	fr_seg	   *s;				/* n - 1 segments (NULL when n == 1) */
	size_t		n;
	double		scale;			/* local units per input unit: a power of two */
} fr_prep;

/* A length in input units as local units, and back (exact: powers of two). */
static inline double
fr_to_local(const fr_prep *c, double len)
{
	return len * c->scale;
}

static inline double
fr_from_local(const fr_prep *c, double len)
{
	double		r = len / c->scale;

	/*
	 * Exact unless the result is subnormal; then round up, so that a
	 * distance stays a threshold the deciders accept.
	 */
	if (r * c->scale < len)
		r = nextafter(r, INFINITY);
	return r;
}

/* Marker for an empty reachable interval: any value above 1 works. */
#define FR_EMPTY 2.0

/* Work counter that polls the interrupt callback every FR_INTERRUPT_CELLS units. */
typedef struct fr_poll
{
	const fr_env *env;
	size_t		budget;
} fr_poll;

void	   *fr_alloc(const fr_env *env, size_t size);
void		fr_free(const fr_env *env, void *ptr);

/* Adds work units; returns nonzero when the caller must stop (FR_EINTR). */
static inline int
fr_poll_add(fr_poll *poll, size_t units)
{
	if (poll->budget > units)
	{
		poll->budget -= units;
		return 0;
	}
	/* carry the overshoot, so polls come at least every FR_INTERRUPT_CELLS units */
	poll->budget = FR_INTERRUPT_CELLS - (units - poll->budget) % FR_INTERRUPT_CELLS;
	if (poll->env->interrupted == NULL)
		return 0;
	return poll->env->interrupted(poll->env->arg) != 0;
}

static inline void
fr_poll_init(fr_poll *poll, const fr_env *env)
{
	poll->env = env;
	poll->budget = FR_INTERRUPT_CELLS;
}

/* Is the pair structurally valid: a vertex or more each, one dimension, 2 or 3? */
static inline bool
fr_pair_valid(const fr_curve *p, const fr_curve *q)
{
	return p->n >= 1 && q->n >= 1 && p->dim == q->dim && p->dim >= 2 && p->dim <= 3;
}

/*
 * Prepares both curves in one local frame: the origin is chosen per axis so
 * that subtracting it is exact (Sterbenz) or, where it is not, left at 0.
 */
fr_status	fr_prepare_pair(const fr_env *env, const fr_curve *p, const fr_curve *q,
							fr_prep *pp, fr_prep *pq);
void		fr_release_pair(const fr_env *env, fr_prep *pp, fr_prep *pq);

/* Segments of a prepared curve from its vertices (freespace.c). */
fr_status	fr_prep_segments(const fr_env *env, fr_prep *out);

/* Points of a prepared curve at position k + t, or at a position k+t given as a double. */
fr_pt		fr_prep_point(const fr_prep *c, size_t k, double t);
fr_pt		fr_prep_point_at(const fr_prep *c, double pos);

/* A part of a prepared curve, optionally reversed, with vertex positions on c. */
fr_status	fr_prep_subcurve(const fr_env *env, const fr_prep *c, double from, double to,
							 bool reversed, fr_prep *out, double **orig);
void		fr_release_prep(const fr_env *env, fr_prep *c);

/* Euclidean distance between two vertices. */
static inline double
fr_pt_dist(const fr_pt *a, const fr_pt *b)
{
	double		dx = a->x - b->x,
				dy = a->y - b->y,
				dz = a->z - b->z;

	return sqrt(dx * dx + dy * dy + dz * dz);
}

/* Distance from vertex p to the segment starting at a with geometry s. */
double		fr_point_segment_dist(const fr_pt *p, const fr_pt *a, const fr_seg *s,
								  const fr_pt *b);

/*
 * The free interval {t in [0,1] : |a + t(b-a) - p| <= eps}.  Sets *lo, *hi;
 * the interval is empty when *lo > *hi.  lo == 0 exactly iff |a-p| <= eps,
 * hi == 1 exactly iff |b-p| <= eps.
 */
void		fr_free_interval(const fr_pt *p, const fr_pt *a, const fr_seg *s,
							 const fr_pt *b, double eps, double *lo, double *hi);
void		fr_free_interval_d(const fr_pt *p, const fr_pt *a, const fr_seg *s,
							   double eps, double da, double db,
							   double *lo, double *hi);

/* Row-by-row reachability pieces shared by the deciders and witnesses (decide.c). */
void		fr_bottom_edge(const fr_prep *p, const fr_prep *q, double eps, double *row);
double		fr_left_edge(const fr_prep *p, const fr_prep *q, size_t j, double eps, bool *full);
fr_status	fr_row_step(const fr_prep *p, const fr_prep *q, size_t j, double eps,
						double *row, double lr, double *left, double *right,
						bool *any_top, fr_poll *poll);

/* Decision on prepared curves (plain Alt & Godau reachability). */
fr_status	fr_decide_prepared(const fr_env *env, const fr_prep *p, const fr_prep *q,
							   double eps, double *row, bool *result, fr_stats *stats);

/* Opening values (critical values) a pruned decision reports inside (lo, hi). */
typedef struct fr_cands
{
	double	   *v;
	size_t		count;
	size_t		cap;
	double		lo;
	double		hi;
	bool		overflow;
} fr_cands;

/* The pruning decider (prune.c); curves of two or more vertices, ends within eps. */
fr_status	fr_decide_pruned(const fr_env *env, const fr_prep *p, const fr_prep *q, double eps,
							 void *work, bool *result, fr_stats *stats, fr_cands *cands);
size_t		fr_prune_work_bytes(size_t n, size_t m);

/* A decider on prepared curves; row has room for p->n - 1 doubles. */
typedef fr_status (*fr_decider) (const fr_env *env, const fr_prep *p, const fr_prep *q,
								 double eps, double *row, bool *result, fr_stats *stats);

/* Smallest eps a decider accepts, between bounds (distance.c). */
fr_status	fr_threshold_search(const fr_env *env, const fr_prep *p, const fr_prep *q,
								fr_decider decide, double lo, double hi, double *row,
								double *result, fr_stats *stats);

/* Largest vertex distance along a greedy monotone vertex walk: an upper bound (distance.c). */
double		fr_greedy_upper_bound(const fr_prep *p, const fr_prep *q);

/* Continuous distance on prepared curves (distance.c). */
fr_status	fr_distance_prepared(const fr_env *env, const fr_prep *p, const fr_prep *q,
								 double *result, fr_stats *stats);

/* Opening values a search round keeps at most. */
#define FR_CANDIDATES 4096

/* Parameter in [lo, hi] of segment k of c nearest to p (freespace.c). */
double		fr_nearest_param(const fr_pt *p, const fr_prep *c, size_t k, double lo, double hi);

/* Max distance from a single vertex to the vertices of a curve (one-point cases). */
double		fr_point_curve_dist(const fr_pt *pt, const fr_prep *c);

#endif							/* FR_INTERNAL_H */
