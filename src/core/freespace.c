/*
 * freespace.c - curves in a local frame and the free space of one cell
 * boundary (Alt & Godau 1995, section 2: the free space of a point against
 * a segment is one interval, because a disk meets a segment in a convex set).
 */
#include <float.h>
#include <math.h>
#include <string.h>

#include "fr_internal.h"

/* Largest double below 1. */
#define ONE_MINUS (1.0 - DBL_EPSILON / 2)

/*
 * Relative slack under which a negative discriminant counts as a tangency:
 * rounding in h and eps can push (eps-h)(eps+h) a few ulps below zero when
 * the disk touches the line.
 */
#define TANGENT_SLACK (4 * DBL_EPSILON)

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
	}
	return "unknown status";
}

/* Scratch bytes for a decision or distance on curves of n and m vertices. */
size_t
fr_scratch_bytes(size_t n, size_t m)
{
	/* vertices and segments of both curves, reachability rows and sources, openings */
	return (n + m) * (sizeof(fr_pt) + sizeof(fr_seg) + 2 * sizeof(double) + sizeof(int32_t))
		+ 4096 * sizeof(double) + 256;
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

/* Range of one axis over a raw curve. */
static void
axis_range(const fr_curve *c, int axis, double *lo, double *hi)
{
	for (size_t i = 0; i < c->n; i++)
	{
		double		x = axis < c->dim ? c->coords[i * c->dim + axis] : 0.0;

		if (x < *lo)
			*lo = x;
		if (x > *hi)
			*hi = x;
	}
}

/* Copies one curve into the local frame and computes its segments. */
static fr_status
prepare_one(const fr_env *env, const fr_curve *c, const double *origin, double scale,
			fr_prep *out)
{
	out->n = c->n;
	out->scale = scale;
	out->v = fr_alloc(env, c->n * sizeof(fr_pt));
	out->s = NULL;
	if (out->v == NULL)
		return FR_ENOMEM;
	for (size_t i = 0; i < c->n; i++)
	{
		const double *src = c->coords + i * c->dim;

		out->v[i].x = (src[0] - origin[0]) * scale;
		out->v[i].y = (src[1] - origin[1]) * scale;
		out->v[i].z = c->dim > 2 ? (src[2] - origin[2]) * scale : 0.0;
	}
	return fr_prep_segments(env, out);
}

/* Computes the segments of a prepared curve from its vertices. */
fr_status
fr_prep_segments(const fr_env *env, fr_prep *out)
{
	out->s = NULL;
	if (out->n < 2)
		return FR_OK;
	out->s = fr_alloc(env, (out->n - 1) * sizeof(fr_seg));
	if (out->s == NULL)
		return FR_ENOMEM;
	for (size_t i = 0; i + 1 < out->n; i++)
	{
		double		dx = out->v[i + 1].x - out->v[i].x,
					dy = out->v[i + 1].y - out->v[i].y,
					dz = out->v[i + 1].z - out->v[i].z;
		double		len = sqrt(dx * dx + dy * dy + dz * dz);
		fr_seg	   *s = &out->s[i];

		/* a zero-length segment (repeated fix) is a point: len 0, no direction */
		if (!(len >= DBL_MIN))
		{
			s->ux = s->uy = s->uz = s->len = 0.0;
			continue;
		}
		s->ux = dx / len;
		s->uy = dy / len;
		s->uz = dz / len;
		s->len = len;
	}
	return FR_OK;
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
 * Prepares both curves in one local frame.  Tiny curves (an extent below
 * 2^-20 input units) are also scaled up by a power of two, so that squares
 * of coordinate differences never underflow; a power of two scales exactly,
 * and lengths convert back exactly (fr_to_local, fr_from_local).
 */
fr_status
fr_prepare_pair(const fr_env *env, const fr_curve *p, const fr_curve *q,
				fr_prep *pp, fr_prep *pq)
{
	double		origin[3],
				extent = 0,
				scale = 1;
	fr_status	st;

	memset(pp, 0, sizeof(*pp));
	memset(pq, 0, sizeof(*pq));
	pp->scale = pq->scale = 1;
	if (!fr_pair_valid(p, q))
		return FR_EINVAL;
	for (int axis = 0; axis < 3; axis++)
	{
		double		lo = INFINITY,
					hi = -INFINITY;

		axis_range(p, axis, &lo, &hi);
		axis_range(q, axis, &lo, &hi);
		origin[axis] = exact_origin(lo, hi);
		/* the largest local coordinate: the origin may be 0 */
		extent = fmax(extent, fmax(fabs(hi - origin[axis]), fabs(lo - origin[axis])));
	}
	if (extent > 0 && extent < 0x1p-20)
	{
		/* at most 2^1000: a subnormal extent must not overflow the scale */
		int			e = -ilogb(extent);

		scale = ldexp(1.0, e < 1000 ? e : 1000);
	}
	st = prepare_one(env, p, origin, scale, pp);
	if (st == FR_OK)
		st = prepare_one(env, q, origin, scale, pq);
	if (st != FR_OK)
		fr_release_pair(env, pp, pq);
	return st;
}

/* Frees what fr_prepare_pair allocated. */
void
fr_release_pair(const fr_env *env, fr_prep *pp, fr_prep *pq)
{
	fr_free(env, pp->v);
	fr_free(env, pp->s);
	fr_free(env, pq->v);
	fr_free(env, pq->s);
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
	*h = sqrt(cx * cx + cy * cy + cz * cz);
}

/* Distance from vertex p to the segment a-b (s holds its direction). */
double
fr_point_segment_dist(const fr_pt *p, const fr_pt *a, const fr_seg *s, const fr_pt *b)
{
	double		foot,
				h;

	if (s->len == 0.0)
		return fr_pt_dist(p, a);
	foot_and_height(p, a, s, &foot, &h);
	if (foot <= 0.0)
		return fr_pt_dist(p, a);
	if (foot >= s->len)
		return fr_pt_dist(p, b);
	return h;
}

/*
 * Free interval of point p against segment a-b at eps, as parameters in
 * [0,1].  In arc length r from a, |a + r u - p|^2 = r^2 - 2 foot r + |w|^2,
 * with roots foot -+ sqrt((eps-h)(eps+h)).  The root of larger magnitude is
 * taken directly and the other from the product of roots,
 * |w|^2 - eps^2 = (|w|-eps)(|w|+eps), so neither suffers cancellation.
 * Endpoint membership is decided by the endpoint distances themselves, so
 * the interval agrees exactly with the vertex-to-vertex tests elsewhere.
 */
void
fr_free_interval(const fr_pt *p, const fr_pt *a, const fr_seg *s, const fr_pt *b,
				 double eps, double *lo, double *hi)
{
	fr_free_interval_d(p, a, s, eps, fr_pt_dist(p, a),
					   s->len == 0.0 ? 0.0 : fr_pt_dist(p, b), lo, hi);
}

/* The same, given the distances da = |p - a| and db = |p - b| (callers cache them). */
void
fr_free_interval_d(const fr_pt *p, const fr_pt *a, const fr_seg *s,
				   double eps, double da, double db, double *lo, double *hi)
{
	bool		in_a = da <= eps,
				in_b;
	double		foot,
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
	in_b = db <= eps;
	if (in_a && in_b)
	{
		/* a disk is convex: both ends inside means the whole segment is */
		*lo = 0.0;
		*hi = 1.0;
		return;
	}
	foot_and_height(p, a, s, &foot, &h);
	disc = (eps - h) * (eps + h);
	if (disc < 0.0 && h - eps <= TANGENT_SLACK * h)
		disc = 0.0;				/* tangency pushed below zero by rounding */
	if (disc < 0.0)
	{
		/* the line misses the disk; an endpoint may still be inside by rounding */
		rlo = rhi = in_a ? 0.0 : in_b ? s->len : NAN;
		if (isnan(rlo))
		{
			*lo = FR_EMPTY;
			*hi = 0.0;
			return;
		}
	}
	else
	{
		double		root = sqrt(disc);
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
	tlo = in_a ? 0.0 : rlo / s->len;
	thi = in_b ? 1.0 : rhi / s->len;
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
		thi = ONE_MINUS;
	*lo = tlo;
	*hi = thi;
	if (tlo > thi)
		*lo = FR_EMPTY;
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
