/*
 * fuzz_pings.c - libFuzzer target for the ping functions (src/core/pings.c),
 * the vertices of the first curve as pings against the second as a route,
 * on the pairs of fuzz_case.h:
 *   - the ping distance is the decision's threshold, and never above the
 *     continuous distance (the vertices of a continuous matching are a
 *     ping matching);
 *   - a max_gap can only raise it;
 *   - the ping excursions are empty exactly when the decision accepts eps.
 */
#include "fuzz_case.h"

/* Ping decision through a fresh environment. */
static bool
pings_decide(const fuzz_case *c, double eps, double gap)
{
	fuzz_heap	h;
	fr_env		e = heap_env(&h);
	bool		yes = false;
	fr_status	st = fr_pings_decide(&e, &c->p, &c->q, eps, gap, &yes);

	if (st != FR_OK)
		fail(c, "fr_pings_decide returned %s", fr_status_text(st));
	if (h.live != 0)
		fail(c, "fr_pings_decide leaked %ld blocks", h.live);
	return yes;
}

/* Ping distance through a fresh environment. */
static double
pings_distance(const fuzz_case *c, double gap)
{
	fuzz_heap	h;
	fr_env		e = heap_env(&h);
	double		d = -1;
	fr_status	st = fr_pings_distance(&e, &c->p, &c->q, gap, &d, NULL);

	if (st != FR_OK)
		fail(c, "fr_pings_distance returned %s", fr_status_text(st));
	if (h.live != 0)
		fail(c, "fr_pings_distance leaked %ld blocks", h.live);
	return d;
}

/* The threshold, below the continuous distance, raised by a max_gap. */
static void
check_ping_distance(fuzz_case *c)
{
	double		dp,
				dg,
				gap,
				below;

	if (c->large)
		return;
	c->d = distance(c, &c->p, &c->q, NULL);
	dp = pings_distance(c, -1);
	if (!(dp >= 0) || dp > c->d * (1 + REL_TOL) + SUBNORMAL_SLACK)
		fail(c, "ping distance %.17g above the continuous distance %.17g", dp, c->d);
	if (!pings_decide(c, dp, -1))
		fail(c, "ping decision false at the ping distance %.17g", dp);
	/*
	 * Below the distance the decision is false, up to the rounding of
	 * places along segments, which is the coordinates' (found: true again
	 * 0.0156 below a distance of 8.6e6 on curves 1.4e14 across; README.md,
	 * "Exactness").
	 */
	below = fmin(dp * (1 - REL_TOL), dp - 4 * DBL_EPSILON * c->scale);
	if (below < dp && below >= 0 && pings_decide(c, below, -1))
	{
		/* where the decision flips, for the report */
		double		lo = 0,
					hi = dp;

		for (int k = 0; k < 200 && hi - lo > 0; k++)
		{
			double		mid = lo + (hi - lo) / 2;

			if (mid <= lo || mid >= hi)
				break;
			if (pings_decide(c, mid, -1))
				hi = mid;
			else
				lo = mid;
		}
		fail(c, "ping decision true below the ping distance %.17g (pair scale %g; true down to %.17g)", dp, c->scale, hi);
	}
	gap = isinf(c->eps) ? c->scale : c->eps;
	dg = pings_distance(c, gap);
	/*
	 * Both are thresholds of deciders whose free intervals carry the rounding
	 * of the coordinates, so where the distance is far below the pair's scale
	 * the two searches may stop a few ulps of the scale apart (found: 0.0077
	 * on a distance of 251995.55 between curves spanning 1.4e14).
	 */
	if (dg < dp * (1 - REL_TOL) - 4 * DBL_EPSILON * c->scale - SUBNORMAL_SLACK)
		fail(c, "max_gap %.17g lowered the ping distance from %.17g to %.17g (pair scale %g; without the gap the decision at %.17g says %d, with it %d)",
			 gap, dp, dg, c->scale, dg, pings_decide(c, dg, -1), pings_decide(c, dg, gap));
	if (!isinf(dg) && !pings_decide(c, dg, gap))
		fail(c, "ping decision with max_gap false at its distance %.17g", dg);
	below = fmin(dg * (1 - REL_TOL), dg - 4 * DBL_EPSILON * c->scale);
	if (!isinf(dg) && below < dg && below >= 0 && pings_decide(c, below, gap))
		fail(c, "ping decision with max_gap true below its distance %.17g", dg);
}

/* Ping excursions: none exactly when the decision accepts eps. */
static void
check_ping_excursions(fuzz_case *c)
{
	fuzz_heap	h;
	fr_env		e = heap_env(&h);
	fr_excursion *x = NULL;
	size_t		count = 0;
	bool		yes;

	if (c->large || isinf(c->eps))
		return;
	if (fr_pings_excursions(&e, &c->p, &c->q, c->eps, &x, &count) != FR_OK)
		fail(c, "fr_pings_excursions failed");
	if (x)
		heap_release(x, &h);
	if (h.live != 0)
		fail(c, "fr_pings_excursions leaked %ld blocks", h.live);
	yes = pings_decide(c, c->eps, -1);
	if ((count == 0) != yes)
		fail(c, "%zu ping excursions at eps %.17g, but the decision says %d", count, c->eps, yes);
}

static const fuzz_check fuzz_checks[] = {
	check_ping_distance,
	check_ping_excursions,
};

int			LLVMFuzzerTestOneInput(const uint8_t *data, size_t size);

/* libFuzzer entry point: decode, then check every property. */
int
LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
	return fuzz_run(data, size, fuzz_checks, sizeof(fuzz_checks) / sizeof(fuzz_checks[0]));
}
