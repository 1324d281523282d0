/*
 * passage.c - corridor search: the parts of a long trip that drove a short
 * stretch.  This is partial matching (Alt & Godau 1995, section 5) with the
 * roles of partial.c: the stretch is matched whole (p, along x of the free
 * space) and the trip in part (q, along y).
 *
 * Windows.  A part of the trip within eps of the stretch lies, every point
 * of it, within eps of some point of the stretch, so inside the stretch's
 * bounding box widened by eps.  The part therefore lies in one run of
 * consecutive trip edges whose bounding boxes meet that widened box (its
 * window).  The sweeps run on the windows alone, as sub-curves of the
 * prepared trip, so they read the same local vertices as a sweep of the
 * whole trip: a long trip that passes near the stretch once costs a scan
 * of its edges and one small sweep.  The box is widened further by 1e-9 of
 * eps and 1e-12 of the coordinates, above the deciders' rounding.
 *
 * Passages.  A trip that drove the stretch twice (a bus on a loop) gives
 * two passages.  They are found in trip order: the next passage is the
 * matched part that ends first; the trip's visit to the eps-disc around
 * the stretch's last vertex that contains that end is the passage's visit;
 * the passage is the part chosen by partial matching inside it (ending
 * nearest to the stretch's last vertex, starting nearest to its first),
 * and the search for the next passage starts where the trip leaves that
 * disc.  So two passages are separate exactly when the trip leaves the
 * eps-disc of the stretch's end between them.
 */
#include <float.h>
#include <math.h>
#include <string.h>

#include "bounds.h"
#include "fr_internal.h"

/* A window: the trip's vertices a..b (b > a), whose edges meet the widened box. */
typedef struct window
{
	size_t		a,
				b;
} window;

/*
 * The windows of trip q for stretch p at eps, in trip order, into w (room
 * for q->n - 1); their count.
 */
static size_t
find_windows(const fr_prep *p, const fr_prep *q, double eps, window *w)
{
	double		lo[3] = {INFINITY, INFINITY, INFINITY},
				hi[3] = {-INFINITY, -INFINITY, -INFINITY},
				widen = eps + 1e-9 * eps + 1e-12 * fmax(fr_prep_magnitude(p), fr_prep_magnitude(q)) + 1e-300;
	size_t		count = 0;
	bool		open = false;

	for (size_t i = 0; i < p->n; i++)
	{
		const double c[3] = {p->v[i].x, p->v[i].y, p->v[i].z};

		for (int d = 0; d < 3; d++)
		{
			lo[d] = fmin(lo[d], c[d]);
			hi[d] = fmax(hi[d], c[d]);
		}
	}
	for (int d = 0; d < 3; d++)
	{
		lo[d] -= widen;
		hi[d] += widen;
	}
	for (size_t j = 0; j + 1 < q->n; j++)
	{
		const fr_pt *a = &q->v[j],
				   *b = &q->v[j + 1];
		bool		meets = fmax(a->x, b->x) >= lo[0] && fmin(a->x, b->x) <= hi[0] &&
			fmax(a->y, b->y) >= lo[1] && fmin(a->y, b->y) <= hi[1] &&
			fmax(a->z, b->z) >= lo[2] && fmin(a->z, b->z) <= hi[2];

		if (meets && open)
			w[count - 1].b = j + 1;
		else if (meets)
		{
			w[count].a = j;
			w[count].b = j + 1;
			count++;
		}
		open = meets;
	}
	return count;
}

/* The position on q of position pos on a sub-curve whose vertices lie at orig on q. */
static double
orig_pos(const double *orig, size_t n, double pos)
{
	size_t		k = (size_t) pos;
	double		t;

	if (k >= n - 1)
		return orig[n - 1];
	t = pos - (double) k;
	return t == 0 ? orig[k] : orig[k] + t * (orig[k + 1] - orig[k]);
}

/* Does the free interval of point c against trip edge j have a point? */
static inline bool
edge_meets(const fr_prep *q, size_t j, const fr_pt *c, double eps)
{
	double		lo,
				hi;

	fr_free_interval(c, &q->v[j], &q->s[j], &q->v[j + 1], eps, &lo, &hi);
	return lo <= hi;
}

/*
 * Narrows a window to the trip edges a passage can use: a path of the free
 * space starts on the left edge, in a row (trip edge) whose free interval
 * against the stretch's first vertex has a point, and ends on the right
 * edge in a row whose interval against its last vertex has one, no lower.
 * So the rows from the first of the former to the last of the latter hold
 * every path in the window (the sweep reads the same intervals).  False
 * when there are none: the window holds no passage, and nothing is swept.
 */
static bool
trim_window(const fr_prep *p, const fr_prep *q, double eps, window *w)
{
	size_t		first = w->b,
				last = w->b;

	for (size_t j = w->a; j < w->b; j++)
		if (edge_meets(q, j, &p->v[0], eps))
		{
			first = j;
			break;
		}
	if (first == w->b)
		return false;
	for (size_t j = w->b; j-- > first;)
		if (edge_meets(q, j, &p->v[p->n - 1], eps))
		{
			last = j;
			break;
		}
	if (last == w->b)
		return false;
	w->a = first;
	w->b = last + 1;
	return true;
}

/*
 * The windowed partial decider: is some part of q within eps of all of p?
 * In the form the threshold search takes (row: room for p->n doubles).
 */
static fr_status
passes_decide(const fr_env *env, const fr_prep *p, const fr_prep *q, double eps, double *row,
			  bool *result, fr_stats *stats)
{
	window	   *w;
	size_t		count;
	fr_status	st = FR_OK;

	*result = false;
	if (isinf(eps))
	{
		*result = true;
		return FR_OK;
	}
	if (p->n == 1 || q->n == 1)
		return fr_partial_decide_prepared(env, p, q, eps, row, result, stats);
	w = fr_alloc(env, (q->n - 1) * sizeof(window));
	if (w == NULL)
		return FR_ENOMEM;
	count = find_windows(p, q, eps, w);
	for (size_t k = 0; k < count && st == FR_OK && !*result; k++)
	{
		fr_prep		sub = {0};
		double	   *orig = NULL;

		if (!trim_window(p, q, eps, &w[k]))
			continue;
		st = fr_prep_subcurve(env, q, (double) w[k].a, (double) w[k].b, false, &sub, &orig);
		if (st == FR_OK)
			st = fr_partial_decide_prepared(env, p, &sub, eps, row, result, stats);
		fr_release_prep(env, &sub);
		fr_free(env, orig);
	}
	fr_free(env, w);
	return st;
}

/* Distance from point c to segment a-b, dim 2 or 3 coordinates (raw input). */
static double
raw_point_segment(const double *c, const double *a, const double *b, int dim)
{
	double		ab2 = 0,
				t = 0,
				d2 = 0;

	for (int k = 0; k < dim; k++)
	{
		ab2 += (b[k] - a[k]) * (b[k] - a[k]);
		t += (c[k] - a[k]) * (b[k] - a[k]);
	}
	t = ab2 > 0 ? fmin(1.0, fmax(0.0, t / ab2)) : 0.0;
	for (int k = 0; k < dim; k++)
	{
		double		e = c[k] - (a[k] + t * (b[k] - a[k]));

		d2 += e * e;
	}
	return sqrt(d2);
}

/*
 * The vertex nearest c among the trip's consecutive vertices within eps of
 * it from *at on (the vertex at *at is within eps); *at becomes the last
 * of them.
 */
static size_t
nearest_in_visit(const fr_curve *trip, const double *c, double eps, size_t *at)
{
	const int	dim = trip->dim;
	size_t		best = *at;
	double		best_d = fr_raw_dist(trip->coords + best * dim, c, dim);

	for (size_t k = *at + 1; k < trip->n; k++)
	{
		double		d = fr_raw_dist(trip->coords + k * dim, c, dim);

		if (d > eps)
			break;
		*at = k;
		if (d < best_d)
		{
			best_d = d;
			best = k;
		}
	}
	return best;
}

/*
 * Cheap verdicts on "some part of the trip within eps of the stretch", on
 * the input coordinates, with no memory.  FR_FAR when no trip edge comes
 * within eps of the stretch's first vertex with a later (or the same) edge
 * within eps of its last (every passage starts and ends so); compared with
 * the slack of bounds.c added to eps, so rounding in the sweeps can never
 * make the answer true.  FR_NEAR when a part of the trip between a vertex
 * near the stretch's start and one near its end is within eps by
 * fr_cheap_decide (a greedy coupling of vertices; the Fréchet distance is
 * at most the discrete one, common practice), tried once for each visit of
 * the trip to the stretch's start, at most eight times.  Otherwise
 * FR_UNDECIDED.
 */
fr_verdict
fr_passes_cheap(const fr_curve *trip, const fr_curve *stretch, double eps)
{
	const int	dim = trip->dim;
	const double *s0 = stretch->coords,
			   *s1 = stretch->coords + (stretch->n - 1) * dim;
	double		mag,
				reach;
	size_t		first_start = SIZE_MAX,
				last_end = SIZE_MAX;
	int			tries = 0;
	bool		sure;

	if (trip->n < 2 || stretch->n < 2)
		return FR_UNDECIDED;
	mag = fr_raw_magnitude(stretch, trip, &sure);
	/* pairs the sweeps refuse (FR_ERANGE) get no verdict here either */
	if (!sure && !fr_pair_in_range(stretch, trip))
		return FR_UNDECIDED;
	if (isinf(eps))
		return FR_NEAR;
	reach = eps + fr_bound_slack(eps, mag);
	for (size_t j = 0; j + 1 < trip->n; j++)
	{
		const double *a = trip->coords + j * dim,
				   *b = a + dim;
		bool		in_box = true;

		/* an edge whose box stays farther than the reach from both ends' x or y is neither */
		for (int k = 0; k < 2 && in_box; k++)
		{
			double		lo = fmin(a[k], b[k]) - reach,
						hi = fmax(a[k], b[k]) + reach;

			in_box = (s0[k] >= lo && s0[k] <= hi) || (s1[k] >= lo && s1[k] <= hi);
		}
		if (!in_box)
			continue;
		if (first_start == SIZE_MAX && raw_point_segment(s0, a, b, dim) <= reach)
			first_start = j;
		if (raw_point_segment(s1, a, b, dim) <= reach)
			last_end = j;
	}
	if (first_start == SIZE_MAX || last_end == SIZE_MAX || last_end < first_start)
		return FR_FAR;

	/* a try for each visit to the start: its vertex nearest the start, then the end's next visit */
	for (size_t i = first_start; i < trip->n && tries < 8; i++)
	{
		size_t		best_i,
					best_j,
					j;
		fr_curve	part;

		if (fr_raw_dist(trip->coords + i * dim, s0, dim) > eps)
			continue;
		best_i = nearest_in_visit(trip, s0, eps, &i);
		for (j = best_i; j < trip->n && fr_raw_dist(trip->coords + j * dim, s1, dim) > eps; j++)
			;
		if (j == trip->n)
			break;
		best_j = nearest_in_visit(trip, s1, eps, &j);
		part.coords = trip->coords + best_i * dim;
		part.n = best_j - best_i + 1;
		part.dim = dim;
		tries++;
		if (fr_cheap_decide(stretch, &part, eps) == FR_NEAR)
			return FR_NEAR;
		i = j;
	}
	return FR_UNDECIDED;
}

/* Is some part of the trip within Fréchet distance eps of the whole stretch? */
fr_status
fr_passes(const fr_env *env, const fr_curve *trip, const fr_curve *stretch, double eps,
		  bool *result, fr_stats *stats)
{
	fr_prep		p,
				q;
	double	   *row;
	fr_status	st;

	*result = false;
	st = fr_prepare_pair(env, stretch, trip, &p, &q);
	if (st != FR_OK)
		return st;
	row = fr_alloc(env, (p.n + 1) * sizeof(double));
	if (row == NULL)
		st = FR_ENOMEM;
	else
		st = passes_decide(env, &p, &q, fr_to_local(&p, eps), row, result, stats);
	fr_free(env, row);
	fr_release_pair(env, &p, &q);
	return st;
}

/*
 * The smallest eps for which fr_passes is true: the partial distance with
 * the stretch matched whole (fr_partial_distance(stretch, trip)), searched
 * with the windowed decider.
 */
fr_status
fr_passage_distance(const fr_env *env, const fr_curve *trip, const fr_curve *stretch,
					double *result, fr_stats *stats)
{
	return fr_partial_distance_with(env, stretch, trip, passes_decide, result, stats);
}

/*
 * Where the trip q, from position from on, first lies farther than eps
 * from c (in the deciders' free intervals); q->n - 1 when it never does.
 */
static double
leave_position(const fr_prep *q, const fr_pt *c, double eps, double from)
{
	size_t		j = (size_t) from;
	double		t = from - (double) j;

	if (j + 1 >= q->n)
		return (double) (q->n - 1);
	for (; j + 1 < q->n; j++, t = 0)
	{
		double		lo,
					hi;

		fr_free_interval(c, &q->v[j], &q->s[j], &q->v[j + 1], eps, &lo, &hi);
		/* on the first edge, from may round just before the visit begins */
		if (lo > t && j == (size_t) from && lo <= hi)
			t = lo;
		if (lo > hi || lo > t || hi < t)
			return (double) j + t;
		if (hi < 1.0)
			return (double) j + hi;
	}
	return (double) (q->n - 1);
}

/*
 * The passages of the trip through the stretch at eps (see the top of this
 * file): *out (allocated in env, *count entries, NULL when none) holds
 * each passage's trip positions (0-based k + t) and the Fréchet distance
 * between the stretch and that part of the trip.
 */
fr_status
fr_passages(const fr_env *env, const fr_curve *trip, const fr_curve *stretch, double eps,
			fr_passage **out, size_t *count, fr_stats *stats)
{
	fr_prep		p,
				q;
	window	   *w = NULL;
	double	   *row = NULL;
	fr_passage *list = NULL;
	size_t		nwin = 0,
				k = 0;
	double		u = 0,
				prev_visit = -1;
	fr_status	st;

	*out = NULL;
	*count = 0;
	st = fr_prepare_pair(env, stretch, trip, &p, &q);
	if (st != FR_OK)
		return st;
	eps = fr_to_local(&p, eps);
	if (p.n == 1 || q.n == 1)
	{
		/* a one-point stretch or trip: at most the one part partial matching picks */
		bool		found;
		double		from,
					to,
					d;

		st = fr_partial_match_prepared(env, &p, &q, eps, &found, &from, &to, &d, stats);
		if (st == FR_OK && found)
		{
			list = fr_alloc(env, sizeof(fr_passage));
			if (list == NULL)
				st = FR_ENOMEM;
			else
			{
				list[0].trip_from = from;
				list[0].trip_to = to;
				list[0].distance = fr_from_local(&p, d);
				*out = list;
				*count = 1;
			}
		}
		fr_release_pair(env, &p, &q);
		return st;
	}
	w = fr_alloc(env, (q.n - 1) * sizeof(window));
	row = fr_alloc(env, (p.n + 1) * sizeof(double));
	list = fr_alloc(env, q.n * sizeof(fr_passage));
	if (w == NULL || row == NULL || list == NULL)
	{
		st = FR_ENOMEM;
		goto done;
	}
	nwin = find_windows(&p, &q, eps, w);
	while (k < nwin && *count < q.n)
	{
		double		a = fmax((double) w[k].a, u),
					end_q = 0,
					visit_end,
					from,
					to,
					d;
		bool		found = false;
		fr_prep		sub = {0};
		double	   *orig = NULL;

		if (a >= (double) w[k].b)
		{
			k++;
			continue;
		}
		/* the earliest end of a part in this window, from u on */
		st = fr_prep_subcurve(env, &q, a, (double) w[k].b, false, &sub, &orig);
		if (st == FR_OK)
			st = fr_partial_earliest_end(env, &p, &sub, eps, row, &found, &end_q, stats);
		if (st == FR_OK && found)
			end_q = orig_pos(orig, sub.n, end_q);
		fr_release_prep(env, &sub);
		fr_free(env, orig);
		orig = NULL;
		if (st != FR_OK)
			goto done;
		if (!found)
		{
			k++;
			continue;
		}
		if (end_q <= prev_visit)
		{
			/* rounding put this end back in the previous visit: move on past it */
			u = floor(prev_visit) + 1;
			if (u >= (double) (q.n - 1))
				break;
			continue;
		}
		/* that end's visit to the disc of the stretch's end, and the part chosen in it */
		visit_end = fmin(leave_position(&q, &p.v[p.n - 1], eps, end_q), (double) w[k].b);

		/*
		 * The match runs to the vertex after the visit's last edge (the
		 * next one when the visit ends at a vertex, which may be rounding
		 * of a place just past it): a part cut at an interpolated point
		 * would round its end away from the disc; past the visit on that
		 * edge the trip stays out of the disc (a segment meets a disc in
		 * one interval), so no end lies there.
		 */
		st = fr_prep_subcurve(env, &q, a, fmin(floor(visit_end) + 1, (double) w[k].b), false, &sub, &orig);
		if (st == FR_OK)
			st = fr_partial_match_prepared(env, &p, &sub, eps, &found, &from, &to, &d, stats);
		if (st == FR_OK && found)
		{
			list[*count].trip_from = orig_pos(orig, sub.n, from);
			list[*count].trip_to = orig_pos(orig, sub.n, to);
			list[*count].distance = fr_from_local(&p, d);
			(*count)++;
		}
		fr_release_prep(env, &sub);
		fr_free(env, orig);
		if (st != FR_OK)
			goto done;
		/* on from where the trip leaves the disc (and after the passage); always forward */
		if (*count > 0)
			visit_end = fmax(visit_end, list[*count - 1].trip_to);
		prev_visit = visit_end;
		u = visit_end > u ? visit_end : floor(u) + 1;
		if (u >= (double) (q.n - 1))
			break;
	}

done:
	fr_free(env, w);
	fr_free(env, row);
	if (st == FR_OK && *count > 0)
		*out = list;
	else
	{
		fr_free(env, list);
		*count = 0;
	}
	fr_release_pair(env, &p, &q);
	return st;
}

/* Upper bound of the bytes fr_passes, fr_passage_distance and fr_passages may request. */
size_t
fr_passage_scratch_bytes(size_t n, size_t m)
{
	return 4 * fr_scratch_bytes(n, m) + m * (sizeof(window) + sizeof(fr_passage) + 2 * sizeof(double));
}
