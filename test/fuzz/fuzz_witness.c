/*
 * fuzz_witness.c - libFuzzer target for the functions that explain a
 * distance (src/core/matching.c, excursions.c, partial.c), on the pairs of
 * fuzz_case.h.  Properties:
 *   - the optimal matching runs monotonically from (0,0) to the last
 *     vertices, and its longest leash is the distance;
 *   - the excursions are empty exactly when the decision accepts eps;
 *   - a partial match's route part is within eps of the trip (the decider
 *     on the part, up to the rounding of the part's two positions), and the
 *     partial distance is at most the distance;
 *   - a trip in progress is found whenever the whole route matches, and
 *     the route's prefix up to the place found is within eps (up to the
 *     rounding of the place as one double k + t);
 *   - corridor search (passage.c, the first curve as the stretch, the
 *     second as the trip): the windowed decision equals the unwindowed
 *     partial match's, the cheap verdicts never contradict it, and there
 *     are passages exactly when it holds, in order, each within eps.
 */
#include "fuzz_case.h"

/* The continuous distance, computed once for the checks below. */
static void
check_distance(fuzz_case *c)
{
	if (!c->large)
		c->d = distance(c, &c->p, &c->q, NULL);
}

/* The optimal matching: monotone, from start to end, longest leash = distance. */
static void
check_matching(fuzz_case *c)
{
	fuzz_heap	h;
	fr_env		e = heap_env(&h);
	fr_match_pt *pts = NULL;
	size_t		count = 0;
	bool		found = false;
	double		used = 0,
				longest = 0;
	fr_status	st;

	if (c->large)
		return;
	st = fr_matching(&e, &c->p, &c->q, -1, &pts, &count, &found, &used, NULL);
	if (st != FR_OK || !found || count == 0)
		fail(c, "fr_matching returned %s, found %d, %zu points", fr_status_text(st), found, count);
	if (pts[0].a_pos != 0 || pts[0].b_pos != 0 ||
		pts[count - 1].a_pos != (double) (c->p.n - 1) || pts[count - 1].b_pos != (double) (c->q.n - 1))
		fail(c, "matching runs from (%g,%g) to (%g,%g)", pts[0].a_pos, pts[0].b_pos,
			 pts[count - 1].a_pos, pts[count - 1].b_pos);
	for (size_t k = 0; k < count; k++)
	{
		if (k > 0 && (pts[k].a_pos < pts[k - 1].a_pos || pts[k].b_pos < pts[k - 1].b_pos))
			fail(c, "matching goes back at breakpoint %zu", k);
		longest = fmax(longest, pts[k].leash);
	}
	/*
	 * A breakpoint's leash is measured between points interpolated at double
	 * positions, so it carries the rounding of the coordinates themselves: a
	 * few units in the last place of the pair's scale (found: a leash of
	 * 2.84e-14 for a distance of 2.7e-14 on coordinates near 91).
	 */
	if (fabs(longest - c->d) > REL_TOL * c->d + 4 * DBL_EPSILON * c->scale + SUBNORMAL_SLACK)
		fail(c, "the matching's longest leash %.17g is not the distance %.17g", longest, c->d);
	heap_release(pts, &h);
	if (h.live != 0)
		fail(c, "fr_matching leaked %ld blocks", h.live);
}

/* Excursions: none exactly when the decision accepts eps. */
static void
check_excursions(fuzz_case *c)
{
	fuzz_heap	h;
	fr_env		e = heap_env(&h);
	fr_excursion *x = NULL;
	size_t		count = 0;
	fr_status	st;
	bool		yes;

	if (c->large || isinf(c->eps))
		return;
	st = fr_excursions(&e, &c->p, &c->q, c->eps, &x, &count, NULL);
	if (st != FR_OK)
		fail(c, "fr_excursions returned %s", fr_status_text(st));
	if (x)
		heap_release(x, &h);
	if (h.live != 0)
		fail(c, "fr_excursions leaked %ld blocks", h.live);
	yes = decide(c, c->eps, false);
	if ((count == 0) != yes)
		fail(c, "%zu excursions at eps %.17g, but the decision says %d (d = %.17g)", count, c->eps, yes, c->d);
}

/* Partial matching: the part within eps, the partial distance at most the distance. */
static void
check_partial(fuzz_case *c)
{
	fuzz_heap	h;
	fr_env		e = heap_env(&h);
	bool		found = false;
	double		from,
				to,
				part_d,
				pd;
	fr_status	st;

	if (c->large || isinf(c->eps))
		return;
	st = fr_partial_match(&e, &c->p, &c->q, c->eps, &found, &from, &to, &part_d, NULL);
	if (st != FR_OK)
		fail(c, "fr_partial_match returned %s", fr_status_text(st));
	if (found && !(from <= to))
		fail(c, "partial match from %.17g to %.17g", from, to);
	/* the distance to the part as returned, up to the rounding of its positions */
	if (found && part_d > c->eps * (1 + 1e-9) + 1e-12 * c->scale + SUBNORMAL_SLACK)
		fail(c, "partial match at eps %.17g has a part at distance %.17g", c->eps, part_d);
	st = fr_partial_distance(&e, &c->p, &c->q, &pd, NULL);
	if (st != FR_OK)
		fail(c, "fr_partial_distance returned %s", fr_status_text(st));
	if (pd > c->d * (1 + REL_TOL) + SUBNORMAL_SLACK)
		fail(c, "partial distance %.17g above the distance %.17g", pd, c->d);
	if (h.live != 0)
		fail(c, "partial matching leaked %ld blocks", h.live);
}

/*
 * A trip in progress (the first curve on the second): found whenever the
 * whole route matches, and then the route's prefix up to the place found
 * is within eps of the trip (up to the rounding of the interpolated end).
 */
static void
check_progress(fuzz_case *c)
{
	static double prefix[FUZZ_MAX_VERTICES * 3 + 3];
	fuzz_heap	h;
	fr_env		e = heap_env(&h);
	bool		found = false,
				yes = false;
	double		pos = -1,
				frac = -1;
	size_t		k;
	fr_curve	pre;
	fr_status	st;

	if (c->large || isinf(c->eps))
		return;
	st = fr_progress(&e, &c->p, &c->q, c->eps, &found, &pos, &frac);
	if (st != FR_OK)
		fail(c, "fr_progress returned %s", fr_status_text(st));
	if (h.live != 0)
		fail(c, "fr_progress leaked %ld blocks", h.live);
	if (!found)
	{
		if (decide(c, c->eps, true))
			fail(c, "the whole route is within eps %.17g, but fr_progress found no prefix", c->eps);
		return;
	}
	if (!(pos >= 0 && pos <= (double) (c->q.n - 1)) || !(frac >= 0 && frac <= 1))
		fail(c, "fr_progress place %.17g, fraction %.17g", pos, frac);
	k = (size_t) floor(pos);
	memcpy(prefix, c->q.coords, (k + 1) * c->q.dim * sizeof(double));
	pre.coords = prefix;
	pre.dim = c->q.dim;
	pre.n = k + 1;
	if (pos > (double) k)
	{
		fr_curve_point(&c->q, pos, prefix + (k + 1) * c->q.dim);
		pre.n++;
	}
	/*
	 * The place comes back as one double k + t, whose t keeps only the
	 * bits k leaves: the prefix's interpolated end may lie an ulp of pos
	 * times the edge's length from the place found.
	 */
	st = fr_decide_plain(&e, &c->p, &pre, c->eps * (1 + REL_TOL) + 4 * DBL_EPSILON * c->scale + SUBNORMAL_SLACK
						 + 2 * (nextafter(pos, INFINITY) - pos) * fr_longest_edge(&c->q),
						 &yes, NULL);
	if (st == FR_OK && !yes)
		fail(c, "the route's prefix up to %.17g is not within eps %.17g of the trip", pos, c->eps);
}

/* Corridor search against partial matching with the roles reversed. */
static void
check_passage(fuzz_case *c)
{
	fuzz_heap	h;
	fr_env		e = heap_env(&h);
	bool		yes = false,
				found = false;
	double		from,
				to,
				part_d;
	fr_passage *ps = NULL;
	size_t		count = 0;
	fr_verdict	v;
	fr_status	st;

	if (c->large || isinf(c->eps))
		return;
	st = fr_passes(&e, &c->q, &c->p, c->eps, &yes, NULL);
	if (st != FR_OK)
		fail(c, "fr_passes returned %s", fr_status_text(st));
	st = fr_partial_match(&e, &c->p, &c->q, c->eps, &found, &from, &to, &part_d, NULL);
	if (st != FR_OK)
		fail(c, "fr_partial_match returned %s", fr_status_text(st));
	if (yes != found)
		fail(c, "at eps %.17g fr_passes says %d, the unwindowed partial match %d", c->eps, yes, found);
	v = fr_passes_cheap(&c->q, &c->p, c->eps);
	if ((v == FR_FAR && yes) || (v == FR_NEAR && !yes))
		fail(c, "at eps %.17g the cheap verdict %d contradicts fr_passes %d", c->eps, v, yes);
	st = fr_passages(&e, &c->q, &c->p, c->eps, &ps, &count, NULL);
	if (st != FR_OK)
		fail(c, "fr_passages returned %s", fr_status_text(st));
	if ((count > 0) != yes)
		fail(c, "at eps %.17g %zu passages, fr_passes %d", c->eps, count, yes);
	for (size_t k = 0; k < count; k++)
	{
		if (!(ps[k].trip_from <= ps[k].trip_to) || (k > 0 && ps[k - 1].trip_to > ps[k].trip_from))
			fail(c, "passage %zu from %.17g to %.17g out of order", k, ps[k].trip_from, ps[k].trip_to);
		if (ps[k].distance > c->eps * (1 + 1e-9) + 1e-12 * c->scale + SUBNORMAL_SLACK)
			fail(c, "passage %zu at distance %.17g above eps %.17g", k, ps[k].distance, c->eps);
	}
	if (ps)
		e.release(ps, e.arg);
	if (h.live != 0)
		fail(c, "corridor search leaked %ld blocks", h.live);
}

static const fuzz_check fuzz_checks[] = {
	check_distance,
	check_matching,
	check_excursions,
	check_partial,
	check_progress,
	check_passage,
};

int			LLVMFuzzerTestOneInput(const uint8_t *data, size_t size);

/* libFuzzer entry point: decode, then check every property. */
int
LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
	return fuzz_run(data, size, fuzz_checks, sizeof(fuzz_checks) / sizeof(fuzz_checks[0]));
}
