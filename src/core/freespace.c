/*
 * freespace.c - curves in a local frame and the free space of one cell
 * boundary (Alt & Godau 1995, section 2: the free space of a point against
 * a segment is one interval, because a disk meets a segment in a convex set).
 */
#include <float.h>
#include <math.h>
#include <string.h>

#include "fr_internal.h"

/* Allocates scratch memory through the caller's allocator. */
void *
fr_alloc(const fr_env *env, size_t size)
{
	return env->alloc(size == 0 ? 1 : size, env->arg);
}

/* Returns scratch memory to the caller's allocator. */
void
fr_free(const fr_env *env, void *ptr)
{
	if (ptr != NULL && env->release != NULL)
		env->release(ptr, env->arg);
}

/* Human-readable name of a status. */
const char *
fr_status_text(fr_status st)
{
	switch (st)
	{
		case FR_OK:
			return "ok";
		case FR_ENOMEM:
			return "out of memory";
		case FR_EINTR:
			return "interrupted";
		case FR_EINVAL:
			return "invalid input";
		case FR_ERANGE:
			return "coordinates span too many orders of magnitude";
	}
	return "unknown status";
}

/*
 * An origin for one axis such that x - origin is exact for every coordinate:
 * the midpoint of the range, kept only when Sterbenz's lemma (y/2 <= x <= 2y
 * implies x - y exact) holds for both extremes; otherwise 0, which is exact
 * trivially.  For Web-Mercator-sized data (about 1e7, spread of a town) the
 * midpoint is kept, so all later squares work on small numbers.
 */
static double
exact_origin(double lo, double hi)
{
	double		mid = lo + (hi - lo) / 2;

	if (lo > 0 && mid / 2 <= lo && hi <= 2 * mid)
		return mid;
	if (hi < 0 && mid / 2 >= hi && lo >= 2 * mid)
		return mid;
	return 0.0;
}

/* Ranges of every axis over a raw curve, in one pass (axes it lacks are 0). */
static void
axis_ranges(const fr_curve *c, double *lo, double *hi)
{
	const double *x = c->coords;
	const size_t d = (size_t) c->dim;
	double		l0 = lo[0],
				l1 = lo[1],
				h0 = hi[0],
				h1 = hi[1];

	/* branch-free selects, one pass per axis pair: the loop vectorises */
	for (size_t i = 0; i < c->n; i++)
	{
		double		a = x[i * d],
					b = x[i * d + 1];

		l0 = a < l0 ? a : l0;
		h0 = a > h0 ? a : h0;
		l1 = b < l1 ? b : l1;
		h1 = b > h1 ? b : h1;
	}
	lo[0] = l0;
	lo[1] = l1;
	hi[0] = h0;
	hi[1] = h1;
	for (size_t i = 0; i < c->n; i++)
	{
		double		z = d > 2 ? x[i * d + 2] : 0.0;

		lo[2] = z < lo[2] ? z : lo[2];
		hi[2] = z > hi[2] ? z : hi[2];
	}
}

/* Fills the n - 1 segments of a prepared curve from its vertices. */
static void
segments_into(fr_prep *out)
{
	for (size_t i = 0; i + 1 < out->n; i++)
		out->s[i] = fr_seg_between(&out->v[i], &out->v[i + 1]);
}

/*
 * Drops every vertex equal to the one before it, in the local frame, and
 * recomputes the segments in place.  A zero-length segment adds nothing to
 * the free space that its vertex does not (its free interval is all or
 * nothing, by the same vertex distance), so deciders and distances are
 * unchanged, bit for bit; curves that park for a long time (a million
 * repeated points) shrink to what moves.  Only for callers that report no
 * positions on the curve: vertex numbers change.
 */
void
fr_prep_drop_repeats(fr_prep *c)
{
	size_t		k = 1;

	for (size_t i = 1; i < c->n; i++)
		if (c->v[i].x != c->v[k - 1].x || c->v[i].y != c->v[k - 1].y ||
			c->v[i].z != c->v[k - 1].z)
			c->v[k++] = c->v[i];
	if (k == c->n)
		return;
	c->n = k;
	if (k < 2)
		c->s = NULL;
	else
		segments_into(c);
}

/* Computes the segments of a prepared curve from its vertices (allocating them). */
fr_status
fr_prep_segments(const fr_env *env, fr_prep *out)
{
	out->s = NULL;
	if (out->n < 2)
		return FR_OK;
	out->s = fr_alloc(env, (out->n - 1) * sizeof(fr_seg));
	if (out->s == NULL)
		return FR_ENOMEM;
	segments_into(out);
	return FR_OK;
}

/*
 * Copies one curve into the local frame and computes its segments, into
 * v (n vertices) and s (n - 1 segments) carved from the caller's block.
 */
static void
prepare_one(const fr_curve *c, const double *origin, double scale,
			fr_pt *v, fr_seg *s, fr_prep *out)
{
	out->n = c->n;
	out->scale = scale;
	out->v = v;
	out->s = c->n >= 2 ? s : NULL;
	out->block = NULL;
	for (size_t i = 0; i < c->n; i++)
	{
		const double *src = c->coords + i * c->dim;

		out->v[i].x = (src[0] - origin[0]) * scale;
		out->v[i].y = (src[1] - origin[1]) * scale;
		out->v[i].z = c->dim > 2 ? (src[2] - origin[2]) * scale : 0.0;
	}
	if (out->s != NULL)
		segments_into(out);
}

/* The point at position k + t of a prepared curve. */
fr_pt
fr_prep_point(const fr_prep *c, size_t k, double t)
{
	fr_pt		r = c->v[k];

	if (t > 0 && k + 1 < c->n)
	{
		r.x += t * (c->v[k + 1].x - r.x);
		r.y += t * (c->v[k + 1].y - r.y);
		r.z += t * (c->v[k + 1].z - r.z);
	}
	return r;
}

/* The point at position pos (a double k + t) of a prepared curve. */
fr_pt
fr_prep_point_at(const fr_prep *c, double pos)
{
	size_t		k;

	if (!(pos > 0))
		return c->v[0];
	if (pos >= (double) (c->n - 1))
		return c->v[c->n - 1];
	k = (size_t) pos;
	return fr_prep_point(c, k, pos - (double) k);
}

/*
 * The length along c (local units) between positions from <= to (0-based
 * k + t, clamped to the curve): the whole segments between them and the
 * parts of the two they cut.
 */
double
fr_prep_length_between(const fr_prep *c, double from, double to)
{
	double		len = 0.0;
	size_t		kf,
				kt;

	if (c->n < 2)
		return 0.0;
	from = fmin(fmax(from, 0.0), (double) (c->n - 1));
	to = fmin(fmax(to, 0.0), (double) (c->n - 1));
	if (!(to > from))
		return 0.0;
	kf = (size_t) from;
	kt = (size_t) to;
	if (kf == kt)
		return (to - from) * c->s[kf].len;
	len = ((double) (kf + 1) - from) * c->s[kf].len;
	for (size_t k = kf + 1; k < kt; k++)
		len += c->s[k].len;
	if (kt + 1 < c->n)
		len += (to - (double) kt) * c->s[kt].len;
	return len;
}

/*
 * The part of c from position `from` to `to` (from <= to) as a prepared
 * curve, optionally reversed; orig[k] receives the position on c of its
 * vertex k, so that sub-position k + t is orig[k] + t (orig[k+1] - orig[k]).
 */
fr_status
fr_prep_subcurve(const fr_env *env, const fr_prep *c, double from, double to,
				 bool reversed, fr_prep *out, double **orig)
{
	size_t		first = (size_t) ceil(from),
				last = (size_t) floor(to),
				n = 0,
				cap;
	double	   *pos;

	out->s = NULL;
	*orig = NULL;
	cap = (last >= first ? last - first + 1 : 0) + 2;
	out->v = fr_alloc(env, cap * sizeof(fr_pt));
	pos = fr_alloc(env, cap * sizeof(double));
	if (out->v == NULL || pos == NULL)
	{
		fr_free(env, out->v);
		fr_free(env, pos);
		out->v = NULL;
		return FR_ENOMEM;
	}
	pos[n++] = from;
	for (size_t k = first; k <= last && k < c->n; k++)
		if ((double) k > from && (double) k < to)
			pos[n++] = (double) k;
	if (to > from)
		pos[n++] = to;
	if (reversed)
	{
		for (size_t i = 0; i < n / 2; i++)
		{
			double		t = pos[i];

			pos[i] = pos[n - 1 - i];
			pos[n - 1 - i] = t;
		}
	}
	for (size_t i = 0; i < n; i++)
		out->v[i] = fr_prep_point_at(c, pos[i]);
	out->n = n;
	out->scale = c->scale;
	out->block = NULL;
	*orig = pos;
	return fr_prep_segments(env, out);
}

/* Frees a prepared curve made by fr_prep_subcurve. */
void
fr_release_prep(const fr_env *env, fr_prep *c)
{
	fr_free(env, c->v);
	fr_free(env, c->s);
	c->v = NULL;
	c->s = NULL;
}

/*
 * The local frame of a pair: origin[3] (exact per axis) and the returned
 * scale, a power of two (1 unless the pair is tiny as a whole).
 */
static double
pair_frame(const fr_curve *p, const fr_curve *q, double *origin)
{
	double		lo[3] = {INFINITY, INFINITY, INFINITY},
				hi[3] = {-INFINITY, -INFINITY, -INFINITY},
				extent = 0;

	axis_ranges(p, lo, hi);
	axis_ranges(q, lo, hi);
	for (int axis = 0; axis < 3; axis++)
	{
		origin[axis] = exact_origin(lo[axis], hi[axis]);
		/* the largest local coordinate: the origin may be 0 */
		extent = fmax(extent, fmax(fabs(hi[axis] - origin[axis]), fabs(lo[axis] - origin[axis])));
	}
	if (extent > 0 && extent < 0x1p-20)
	{
		/* at most 2^1000: a subnormal extent must not overflow the scale */
		int			e = -ilogb(extent);

		return ldexp(1.0, e < 1000 ? e : 1000);
	}
	return 1.0;
}

/* Whether a local coordinate is 0 or at least FR_MIN_LOCAL_COORD in magnitude. */
static inline bool
local_in_range(double c)
{
	return c == 0.0 || fabs(c) >= FR_MIN_LOCAL_COORD;
}

/* Whether the pair's coordinates all pass local_in_range in its frame (no allocation). */
bool
fr_pair_in_range(const fr_curve *p, const fr_curve *q)
{
	double		origin[3],
				scale = pair_frame(p, q, origin);
	bool		ok = true;

	for (int k = 0; k < 2; k++)
	{
		const fr_curve *c = k == 0 ? p : q;

		for (size_t i = 0; i < c->n; i++)
			for (int axis = 0; axis < c->dim; axis++)
				ok &= local_in_range((c->coords[i * c->dim + axis] - origin[axis]) * scale);
	}
	return ok;
}

/* Whether every local coordinate of c is 0 or at least FR_MIN_LOCAL_COORD in magnitude. */
static bool
coords_in_range(const fr_prep *c)
{
	bool		ok = true;

	for (size_t i = 0; i < c->n; i++)
		ok &= local_in_range(c->v[i].x) && local_in_range(c->v[i].y) && local_in_range(c->v[i].z);
	return ok;
}

/* Bytes from off rounded up to a multiple of 16, so carved arrays stay aligned. */
static size_t
align16(size_t off)
{
	return (off + 15) & ~(size_t) 15;
}

/*
 * Prepares both curves in one local frame.  Tiny curves (an extent below
 * 2^-20 input units) are also scaled up by a power of two, so that squares
 * of coordinate differences never underflow; a power of two scales exactly,
 * and lengths convert back exactly (fr_to_local, fr_from_local).
 *
 * Everything lives in one allocation, together with extra bytes of work
 * memory for the caller (*extra_out, 16-byte aligned, when extra > 0): one
 * block instead of five keeps allocator traffic down, and an allocator that
 * recycles a freed block of the same size (as malloc does once it has seen
 * one) hands it back without fresh pages.
 */
fr_status
fr_prepare_pair_extra(const fr_env *env, const fr_curve *p, const fr_curve *q,
					  fr_prep *pp, fr_prep *pq, size_t extra, void **extra_out)
{
	double		origin[3],
				scale;
	size_t		off_pv,
				off_ps,
				off_qv,
				off_qs,
				off_extra,
				total;
	char	   *block;

	memset(pp, 0, sizeof(*pp));
	memset(pq, 0, sizeof(*pq));
	pp->scale = pq->scale = 1;
	if (extra_out)
		*extra_out = NULL;
	if (!fr_pair_valid(p, q))
		return FR_EINVAL;
	scale = pair_frame(p, q, origin);
	off_pv = 0;
	off_ps = align16(off_pv + p->n * sizeof(fr_pt));
	off_qv = align16(off_ps + p->n * sizeof(fr_seg));
	off_qs = align16(off_qv + q->n * sizeof(fr_pt));
	off_extra = align16(off_qs + q->n * sizeof(fr_seg));
	total = off_extra + extra;
	block = fr_alloc(env, total);
	if (block == NULL)
		return FR_ENOMEM;
	prepare_one(p, origin, scale, (fr_pt *) (block + off_pv), (fr_seg *) (block + off_ps), pp);
	prepare_one(q, origin, scale, (fr_pt *) (block + off_qv), (fr_seg *) (block + off_qs), pq);
	pp->block = block;
	if (!coords_in_range(pp) || !coords_in_range(pq))
	{
		fr_free(env, block);
		memset(pp, 0, sizeof(*pp));
		memset(pq, 0, sizeof(*pq));
		pp->scale = pq->scale = 1;
		return FR_ERANGE;
	}
	if (extra_out && extra > 0)
		*extra_out = block + off_extra;
	return FR_OK;
}

/* Prepares both curves in one local frame, with no extra work memory. */
fr_status
fr_prepare_pair(const fr_env *env, const fr_curve *p, const fr_curve *q,
				fr_prep *pp, fr_prep *pq)
{
	return fr_prepare_pair_extra(env, p, q, pp, pq, 0, NULL);
}

/* Frees what fr_prepare_pair allocated (one block, owned by pp). */
void
fr_release_pair(const fr_env *env, fr_prep *pp, fr_prep *pq)
{
	fr_free(env, pp->block);
	pp->block = pq->block = NULL;
	pp->v = pq->v = NULL;
	pp->s = pq->s = NULL;
}

/*
 * Position of the foot of p on the line of the segment (arc length from a)
 * and the distance h from p to that line.  With w = a - p and unit
 * direction u: foot = -(u.w), h = |u x w| (no cancellation of |w|^2 - foot^2).
 */
static inline void
foot_and_height(const fr_pt *p, const fr_pt *a, const fr_seg *s,
				double *foot, double *h)
{
	double		wx = a->x - p->x,
				wy = a->y - p->y,
				wz = a->z - p->z;
	double		cx = s->uy * wz - s->uz * wy,
				cy = s->uz * wx - s->ux * wz,
				cz = s->ux * wy - s->uy * wx;

	*foot = -(s->ux * wx + s->uy * wy + s->uz * wz);
	*h = fr_cross_norm(cx, cy, cz);
}

/*
 * Distance from vertex p to the segment a-b (s holds its direction);
 * *inside says whether the nearest point lies strictly inside the segment
 * (then the distance is the height over the line).
 */
static double
nearest_on_segment(const fr_pt *p, const fr_pt *a, const fr_seg *s, const fr_pt *b,
				   bool *inside)
{
	double		foot,
				h;

	*inside = false;
	if (s->len == 0.0)
		return fr_pt_dist(p, a);
	foot_and_height(p, a, s, &foot, &h);
	if (foot <= 0.0)
		return fr_pt_dist(p, a);
	if (foot >= s->len)
		return fr_pt_dist(p, b);
	*inside = true;
	return h;
}

/* Distance from vertex p to the segment a-b (s holds its direction). */
double
fr_point_segment_dist(const fr_pt *p, const fr_pt *a, const fr_seg *s, const fr_pt *b)
{
	bool		inside;

	return nearest_on_segment(p, a, s, b, &inside);
}

/*
 * The smallest eps at which fr_interval_core finds the free interval of p
 * against segment a-b non-empty (a critical value of type b, Alt & Godau
 * 1995, as the deciders see it).  Where the nearest point is an end, that
 * is the end's distance.  Where it lies inside, the interval opens where
 * the tangency slack admits it, h - eps <= FR_TANGENT_SLACK h, a few ulps
 * below the distance h to the line: that double is found exactly (h - eps
 * is exact there, by Sterbenz's lemma).  Reporting it, not h, spares the
 * distance search its final bisection over doubles.
 */
double
fr_point_segment_opening(const fr_pt *p, const fr_pt *a, const fr_seg *s, const fr_pt *b)
{
	bool		inside;
	double		h = nearest_on_segment(p, a, s, b, &inside),
				sh,
				e;

	if (!inside)
		return h;				/* an end is nearest: its distance, exactly */
	sh = FR_TANGENT_SLACK * h;
	e = h - sh;
	if (!(h > 0.0 && sh > 0.0 && e >= h / 2))
		return h;				/* on the line, or not a normal tangency (h tiny or not finite) */

	/*
	 * Bounded: e = h - sh rounded lies within one ulp of h of the exact
	 * value, and every step moves h - e (exact) by one ulp of e, at most one
	 * ulp of h and at least half of one, so each loop takes at most a few
	 * steps; FR_OPENING_STEPS only guards against a rounding mode that the
	 * build does not use.  With sh > 0 the second loop ends once h - e
	 * exceeds sh, at the latest when e reaches 0.
	 */
	for (int i = 0; i < FR_OPENING_STEPS && h - e > sh; i++)
		e = nextafter(e, INFINITY);
	for (int i = 0; i < FR_OPENING_STEPS && h - nextafter(e, 0) <= sh; i++)
		e = nextafter(e, 0);
	return e;
}

/* The free interval of p against segment a-b at eps (see fr_interval_core). */
void
fr_free_interval(const fr_pt *p, const fr_pt *a, const fr_seg *s, const fr_pt *b,
				 double eps, double *lo, double *hi)
{
	double		da2 = fr_pt_dist2(p, a);

	fr_interval_core(p, a, s, eps, sqrt(da2) <= eps,
					 s->len == 0.0 || fr_pt_dist(p, b) <= eps, da2, lo, hi);
}

/*
 * The parameter in [lo, hi] of segment k of c nearest to point p (the
 * leash is convex along a segment, so clamping the foot is exact).
 */
double
fr_nearest_param(const fr_pt *p, const fr_prep *c, size_t k, double lo, double hi)
{
	const fr_seg *s = &c->s[k];
	double		foot;

	if (s->len == 0.0)
		return lo;
	foot = (s->ux * (p->x - c->v[k].x) + s->uy * (p->y - c->v[k].y) +
			s->uz * (p->z - c->v[k].z)) / s->len;
	return foot < lo ? lo : foot > hi ? hi : foot;
}

/* Max distance from one vertex to the vertices of a curve. */
double
fr_point_curve_dist(const fr_pt *pt, const fr_prep *c)
{
	double		d = 0.0;

	/* the distance to a convex-combination path peaks at vertices */
	for (size_t i = 0; i < c->n; i++)
	{
		double		e = fr_pt_dist(pt, &c->v[i]);

		if (e > d)
			d = e;
	}
	return d;
}
