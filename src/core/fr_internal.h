/*
 * fr_internal.h - shared pieces of the engine: prepared curves, free-space
 * intervals, scratch memory and interrupt polling.  Not part of the API.
 */
#ifndef FR_INTERNAL_H
#define FR_INTERNAL_H

#include <float.h>
#include <math.h>
#include <stdbool.h>
#include <string.h>

#include "frechet.h"

/* A vertex in the local frame; 2-D curves carry z = 0, which is exact. */
typedef struct fr_pt
{
	double		x,
				y,
				z;
} fr_pt;

/*
 * A segment from vertex k to k+1: unit direction, length and its
 * reciprocal (all 0: a point).  Free-interval ends are arc lengths times
 * inv, one multiplication where a division would cost many cycles; every
 * decider uses the same inv, so they agree exactly.
 */
typedef struct fr_seg
{
	double		ux,
				uy,
				uz,
				len,
				inv;
} fr_seg;

/* The segment from a to b, as every part of the engine computes it. */
static inline fr_seg
fr_seg_between(const fr_pt *a, const fr_pt *b)
{
	double		dx = b->x - a->x,
				dy = b->y - a->y,
				dz = b->z - a->z;
	double		len = sqrt(dx * dx + dy * dy + dz * dz);
	fr_seg		s = {0, 0, 0, 0, 0};

	/* a zero-length segment (repeated fix) is a point: len 0, no direction */
	if (len >= 0x1p-1022)
	{
		s.ux = dx / len;
		s.uy = dy / len;
		s.uz = dz / len;
		s.len = len;
		s.inv = 1.0 / len;
	}
	return s;
}

/* A curve shifted to a local origin, with its segments precomputed. */
typedef struct fr_prep
{
	fr_pt	   *v;				/* n vertices */
	fr_seg	   *s;				/* n - 1 segments (NULL when n == 1) */
	size_t		n;
	double		scale;			/* local units per input unit: a power of two */
	void	   *block;			/* the allocation holding v and s, when shared (fr_prepare_pair) */
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

/* Order-preserving bit pattern of a non-negative double. */
static inline uint64_t
fr_double_bits(double x)
{
	uint64_t	u;

	memcpy(&u, &x, sizeof(u));
	return u;
}

/* The double with a given bit pattern. */
static inline double
fr_bits_double(uint64_t u)
{
	double		x;

	memcpy(&x, &u, sizeof(x));
	return x;
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

/* The same, with extra bytes of 16-byte aligned work memory in the same allocation. */
fr_status	fr_prepare_pair_extra(const fr_env *env, const fr_curve *p, const fr_curve *q,
								  fr_prep *pp, fr_prep *pq, size_t extra, void **extra_out);

/* Drops repeated consecutive vertices of a prepared curve (freespace.c). */
void		fr_prep_drop_repeats(fr_prep *c);

/* Segments of a prepared curve from its vertices (freespace.c). */
fr_status	fr_prep_segments(const fr_env *env, fr_prep *out);

/* Points of a prepared curve at position k + t, or at a position k+t given as a double. */
fr_pt		fr_prep_point(const fr_prep *c, size_t k, double t);
fr_pt		fr_prep_point_at(const fr_prep *c, double pos);
double		fr_prep_length_between(const fr_prep *c, double from, double to);

/* A part of a prepared curve, optionally reversed, with vertex positions on c. */
fr_status	fr_prep_subcurve(const fr_env *env, const fr_prep *c, double from, double to,
							 bool reversed, fr_prep *out, double **orig);
void		fr_release_prep(const fr_env *env, fr_prep *c);

/* Largest local coordinate magnitude of a prepared curve. */
static inline double
fr_prep_magnitude(const fr_prep *c)
{
	double		m = 0;

	for (size_t i = 0; i < c->n; i++)
		m = fmax(m, fmax(fabs(c->v[i].x), fmax(fabs(c->v[i].y), fabs(c->v[i].z))));
	return m;
}

/*
 * The largest coordinate magnitude of two input curves, for the slack of
 * cheap verdicts; and whether fr_pair_in_range surely holds: when every
 * nonzero coordinate is at least 1e-100 in magnitude, a nonzero local
 * coordinate (a difference of two such doubles, or of one and the frame's
 * origin, then scaled up by a power of two) is at least an ulp of 1e-100,
 * far above FR_MIN_LOCAL_COORD.  Otherwise *sure is false and the caller
 * asks fr_pair_in_range.
 */
static inline double
fr_raw_magnitude(const fr_curve *p, const fr_curve *q, bool *sure)
{
	double		mag = 0,
				least = INFINITY;

	for (int k = 0; k < 2; k++)
	{
		const fr_curve *c = k == 0 ? p : q;

		for (size_t i = 0; i < c->n * c->dim; i++)
		{
			double		a = fabs(c->coords[i]);

			mag = a > mag ? a : mag;
			if (a != 0 && a < least)
				least = a;
		}
	}
	*sure = least >= 1e-100;
	return mag;
}

/* Distance between two vertices of input coordinates (dim 2 or 3), unprepared. */
static inline double
fr_raw_dist(const double *a, const double *b, int dim)
{
	double		d2 = 0;

	for (int k = 0; k < dim; k++)
		d2 += (a[k] - b[k]) * (a[k] - b[k]);
	return sqrt(d2);
}

/* Squared Euclidean distance between two vertices. */
static inline double
fr_pt_dist2(const fr_pt *a, const fr_pt *b)
{
	double		dx = a->x - b->x,
				dy = a->y - b->y,
				dz = a->z - b->z;

	return dx * dx + dy * dy + dz * dz;
}

/* Euclidean distance between two vertices. */
static inline double
fr_pt_dist(const fr_pt *a, const fr_pt *b)
{
	return sqrt(fr_pt_dist2(a, b));
}

/*
 * "Is a squared distance d2 within eps?" without a square root where the
 * answer is plain: thresholds eps^2 (1 -+ 2^-49) lie far beyond the
 * rounding of eps^2 and of sqrt, so d2 below the lower one has sqrt(d2) <=
 * eps and d2 above the upper one has sqrt(d2) > eps; in between (and when
 * eps^2 would leave the normal range) sqrt(d2) <= eps is evaluated exactly
 * as fr_pt_dist(...) <= eps, so the answer never differs from it.
 */
typedef struct fr_within
{
	double		eps;
	double		in2;			/* d2 <= in2: within */
	double		out2;			/* d2 > out2: not within */
} fr_within;

static inline fr_within
fr_within_init(double eps)
{
	fr_within	w;

	w.eps = eps;
	w.in2 = -1.0;
	w.out2 = INFINITY;
	if (eps >= 0x1p-500 && eps <= 0x1p500)
	{
		w.in2 = eps * eps * (1.0 - 0x1p-49);
		w.out2 = eps * eps * (1.0 + 0x1p-49);
	}
	return w;
}

static inline bool
fr_within_d2(const fr_within *w, double d2)
{
	if (d2 <= w->in2)
		return true;
	if (d2 > w->out2)
		return false;
	return sqrt(d2) <= w->eps;
}

/* Distance from vertex p to the segment starting at a with geometry s. */
double		fr_point_segment_dist(const fr_pt *p, const fr_pt *a, const fr_seg *s,
								  const fr_pt *b);

/*
 * Length of a cross product (the distance from a point to a line, when one
 * factor is a unit vector).  In the plane only cz is non-zero, and its
 * absolute value is the length with no square root (and no underflow of
 * its square); every part of the engine takes the length this way.
 */
static inline double
fr_cross_norm(double cx, double cy, double cz)
{
	double		hh = cx * cx + cy * cy;

	return hh == 0.0 ? fabs(cz) : sqrt(hh + cz * cz);
}

/* The smallest eps at which the deciders find p's free interval on a-b non-empty. */
double		fr_point_segment_opening(const fr_pt *p, const fr_pt *a, const fr_seg *s,
									 const fr_pt *b);

/* Largest double below 1. */
#define FR_ONE_MINUS (1.0 - DBL_EPSILON / 2)

/*
 * Relative slack under which a negative discriminant counts as a tangency:
 * rounding in h and eps can push (eps-h)(eps+h) a few ulps below zero when
 * the disk touches the line.
 */
#define FR_TANGENT_SLACK (4 * DBL_EPSILON)

/* Cap on the single-ulp steps that place a tangency opening (freespace.c). */
#define FR_OPENING_STEPS 64

/*
 * Cap on the growing steps that push an upper bound (a matching's leash,
 * rounded) up to where the decider accepts it (distance.c): 4 ulps doubled
 * 64 times is a factor of about 7,000, far beyond any rounding; a bound
 * still rejected then means the pair is beyond what the arithmetic can
 * settle, and the search reports FR_ERANGE instead of a number.
 */
#define FR_STEP_UP_TRIES 64

/*
 * The free interval {t in [0,1] : |a + t(b-a) - p| <= eps} of point p
 * against segment a-b (direction and length in s), given whether each end
 * is within eps (in_a, in_b, decided from the vertex distances, so the
 * interval agrees exactly with vertex tests elsewhere) and da2 = |p - a|^2
 * as fr_pt_dist2 computes it.  Sets *lo and *hi; the interval is empty
 * when *lo > *hi (then *lo is FR_EMPTY).  lo == 0 exactly iff in_a, hi == 1
 * exactly iff in_b.
 *
 * In arc length r from a, |a + r u - p|^2 = r^2 - 2 foot r + |w|^2 (w = a -
 * p, foot = -(u.w)), with roots foot -+ sqrt((eps-h)(eps+h)) where h = |u x
 * w| is the distance to the line (no cancellation of |w|^2 - foot^2).  The
 * root of larger magnitude is taken directly and the other from the product
 * of roots, |w|^2 - eps^2 = (|w|-eps)(|w|+eps), so neither suffers
 * cancellation.  When neither end is within eps and the foot lies outside
 * the segment, the nearest point is an end: the interval is empty, with no
 * root taken at all.
 *
 * Inline, so that the pruning decider's inner loop has no call in it; every
 * caller gets the same arithmetic.
 */
#if defined(__GNUC__)
#define FR_ALWAYS_INLINE inline __attribute__((always_inline))
#else
#define FR_ALWAYS_INLINE inline
#endif

static FR_ALWAYS_INLINE void
fr_interval_core(const fr_pt *p, const fr_pt *a, const fr_seg *s, double eps,
				 bool in_a, bool in_b, double da2, double *lo, double *hi)
{
	double		wx,
				wy,
				wz,
				foot,
				h,
				disc,
				rlo,
				rhi,
				tlo,
				thi;

	if (s->len == 0.0)
	{
		*lo = in_a ? 0.0 : FR_EMPTY;
		*hi = in_a ? 1.0 : 0.0;
		return;
	}
	if (in_a && in_b)
	{
		/* a disk is convex: both ends inside means the whole segment is */
		*lo = 0.0;
		*hi = 1.0;
		return;
	}
	wx = a->x - p->x;
	wy = a->y - p->y;
	wz = a->z - p->z;
	foot = -(s->ux * wx + s->uy * wy + s->uz * wz);
	if (!in_a && !in_b && (foot <= 0.0 || foot >= s->len))
	{
		*lo = FR_EMPTY;
		*hi = 0.0;
		return;
	}
	{
		double		cx = s->uy * wz - s->uz * wy,
					cy = s->uz * wx - s->ux * wz,
					cz = s->ux * wy - s->uy * wx;

		h = fr_cross_norm(cx, cy, cz);
	}
	disc = (eps - h) * (eps + h);
	if (disc < 0.0 && h - eps <= FR_TANGENT_SLACK * h)
		disc = 0.0;				/* tangency pushed below zero by rounding */
	if (disc < 0.0)
	{
		/* the line misses the disk; an endpoint may still be inside by rounding */
		if (!in_a && !in_b)
		{
			*lo = FR_EMPTY;
			*hi = 0.0;
			return;
		}
		rlo = rhi = in_a ? 0.0 : s->len;
	}
	else
	{
		double		root = sqrt(disc);
		double		da = sqrt(da2);
		double		prod = (da - eps) * (da + eps);

		if (foot >= 0.0)
		{
			rhi = foot + root;
			rlo = rhi > 0.0 ? prod / rhi : 0.0;
		}
		else
		{
			rlo = foot - root;
			rhi = rlo < 0.0 ? prod / rlo : 0.0;
		}
		/* the foot lies inside whenever disc >= 0; rounding must not lose it */
		if (rlo > foot)
			rlo = foot;
		if (rhi < foot)
			rhi = foot;
	}
	tlo = in_a ? 0.0 : rlo * s->inv;
	thi = in_b ? 1.0 : rhi * s->inv;
	/*
	 * Endpoints are in or out exactly as their distances say: a free end
	 * keeps the interval reaching it even when rounding put the other root
	 * past it (a foot beyond the end, at exactly eps from it).
	 */
	if (in_b && tlo > 1.0)
		tlo = 1.0;
	if (in_a && thi < 0.0)
		thi = 0.0;
	if (!in_a && tlo <= 0.0)
		tlo = DBL_MIN;
	if (!in_b && thi >= 1.0)
		thi = FR_ONE_MINUS;
	*lo = tlo;
	*hi = thi;
	if (tlo > thi)
		*lo = FR_EMPTY;
}

/*
 * The free interval {t in [0,1] : |a + t(b-a) - p| <= eps}.  Sets *lo, *hi;
 * the interval is empty when *lo > *hi.  lo == 0 exactly iff |a-p| <= eps,
 * hi == 1 exactly iff |b-p| <= eps.
 */
void		fr_free_interval(const fr_pt *p, const fr_pt *a, const fr_seg *s,
							 const fr_pt *b, double eps, double *lo, double *hi);

/*
 * One propagation step (Alt & Godau 1995): the reachable lower end on an
 * outgoing boundary of a cell whose free interval is [lo, hi].  If the
 * cell is entered across (through the incoming boundary facing the other
 * outgoing one), all of the free interval is reachable; otherwise only
 * from where reachability on the parallel incoming boundary (along)
 * begins.  FR_EMPTY where nothing is.
 */
static inline double
fr_reach_out(double lo, double hi, double across, double along)
{
	double		x;

	if (across != FR_EMPTY)
		return lo <= hi ? lo : FR_EMPTY;
	x = lo > along ? lo : along;
	return x > hi ? FR_EMPTY : x;
}

/* Row-by-row reachability pieces shared by the deciders and witnesses (decide.c). */
void		fr_bottom_edge(const fr_prep *p, const fr_prep *q, double eps, double *row);
double		fr_left_edge(const fr_prep *p, const fr_prep *q, size_t j, double eps, bool *full);
fr_status	fr_row_step(const fr_prep *p, const fr_prep *q, size_t j, double eps,
						double *row, double lr, double *left, double *right,
						bool *any_top, fr_poll *poll);
fr_status	fr_row_step_band(const fr_prep *p, const fr_prep *q, size_t j, double eps,
							 double *row, double lr, size_t *first, size_t *last,
							 double *right, bool *any_top, fr_poll *poll);

/* Decision on prepared curves (plain Alt & Godau reachability). */
fr_status	fr_decide_prepared(const fr_env *env, const fr_prep *p, const fr_prep *q,
							   double eps, double *row, bool *result, fr_stats *stats);

/* fr_simplify, giving up once more than max_keep vertices are kept (simplify.c). */
fr_status	fr_simplify_upto(const fr_env *env, const fr_curve *c, double tol, size_t max_keep,
							 size_t **keep, size_t *count);

/* The plain decision on a one-row free space, as simplify.c runs it on each piece. */
bool		fr_one_row_decide(const fr_prep *piece, const fr_prep *seg, double eps, double *row);

/* Is there a vertex coupling within eps (a positive filter for the deciders; discrete.c)? */
bool		fr_coupling_within(const fr_prep *p, const fr_prep *q, double eps,
							   unsigned char *row);

/*
 * The same sweep of vertex couplings, resumable: it stops at each row
 * where no coupling pair is reachable (a wall) and can go on from there
 * (discrete.c).
 */
typedef struct fr_coupling_sweep
{
	const fr_prep *p;
	const fr_prep *q;
	fr_within	w;
	unsigned char *row;			/* one flag per vertex of p */
	size_t		lo;				/* reachable columns of the last row: lo .. hi */
	size_t		hi;
	size_t		j;				/* the next row */
	size_t		visited;		/* pairs visited */
	size_t		budget;			/* ... at most */
	fr_poll    *poll;			/* for interrupts, or NULL */
	bool		restarted;		/* a wall was passed: reaching the end proves nothing */
	bool		dead;			/* nothing more to report */
} fr_coupling_sweep;

typedef enum fr_sweep_event
{
	FR_SWEEP_THROUGH,			/* a coupling within eps: the answer is yes */
	FR_SWEEP_WALL,				/* a row with no reachable pair */
	FR_SWEEP_END,				/* nothing more: the end after a restart, or the budget spent */
	FR_SWEEP_STOP				/* interrupted */
} fr_sweep_event;

void		fr_coupling_begin(fr_coupling_sweep *c, const fr_prep *p, const fr_prep *q,
							  double eps, unsigned char *row, size_t budget, fr_poll *poll);
fr_sweep_event fr_coupling_next(fr_coupling_sweep *c, size_t *wall);

/* Opening values (critical values) a pruned decision reports inside (lo, hi). */
typedef struct fr_cands
{
	double	   *v;
	size_t		count;
	size_t		cap;
	double		lo;
	double		hi;
	bool		overflow;
	bool		optional;		/* in: settle cheaply if possible; collect only if the whole sweep runs */
	bool		collected;		/* out: the openings are those of a whole sweep */
} fr_cands;

/* The pruning decider (prune.c); curves of two or more vertices, ends within eps. */
fr_status	fr_decide_pruned(const fr_env *env, const fr_prep *p, const fr_prep *q, double eps,
							 void *work, bool *result, fr_stats *stats, fr_cands *cands);
size_t		fr_prune_work_bytes(size_t n, size_t m);
void		fr_prune_setup(void *work, const fr_prep *p, const fr_prep *q);

/* The branch-free free interval of the pruning decider's batches, on one input (for tests). */
void		fr_interval_select_one(const fr_pt *p, const fr_pt *a, const fr_seg *s, double eps,
								   double da, double db, double *lo, double *hi);

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

/*
 * Partial matching on prepared pairs (partial.c): p matched whole, q in
 * part, eps and distances in the local frame.
 */
fr_status	fr_partial_match_prepared(const fr_env *env, const fr_prep *p, const fr_prep *q,
									  double eps, bool *found, double *q_from, double *q_to,
									  double *distance, fr_stats *stats);
fr_status	fr_partial_earliest_end(const fr_env *env, const fr_prep *p, const fr_prep *q,
									double eps, double *row, bool *found, double *end,
									fr_stats *stats);
fr_status	fr_partial_decide_prepared(const fr_env *env, const fr_prep *p, const fr_prep *q,
									   double eps, double *row, bool *result, fr_stats *stats);
void		fr_partial_bounds(const fr_prep *p, const fr_prep *q, double *lo, double *hi);
fr_status	fr_partial_distance_with(const fr_env *env, const fr_curve *trip, const fr_curve *route,
									 fr_decider decide, double *result, fr_stats *stats);

/* Opening values a search round keeps at most. */
#define FR_CANDIDATES 4096

/* Parameter in [lo, hi] of segment k of c nearest to p (freespace.c). */
double		fr_nearest_param(const fr_pt *p, const fr_prep *c, size_t k, double lo, double hi);

/* Max distance from a single vertex to the vertices of a curve (one-point cases). */
double		fr_point_curve_dist(const fr_pt *pt, const fr_prep *c);

#endif							/* FR_INTERNAL_H */
