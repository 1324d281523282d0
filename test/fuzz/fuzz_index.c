/*
 * fuzz_index.c - libFuzzer target for what the index and the filters rely
 * on (src/core/bounds.c, simplify.c), on the pairs of fuzz_case.h:
 *   - every lower bound from summaries (fr_key_bound, the hull bound of
 *     k-nearest searches, fr_key_ping_bound) is never above the exact
 *     distance it bounds: above it, an index would drop a row;
 *   - a cheap verdict never contradicts the plain decider;
 *   - a simplification keeps both ends and stays within its tolerance
 *     (Agarwal, Har-Peled, Mustafa & Wang 2005 promise a Fréchet bound).
 */
#include "fuzz_case.h"
#include "bounds.h"

/* Summary bounds never above the distances they bound. */
static void
check_summary_bounds(fuzz_case *c)
{
	fr_key		kp,
				kq;
	double	   *sorted,
			   *hull,
				b;
	size_t		nh;
	fuzz_heap	h;
	fr_env		e = heap_env(&h);
	double		pd;

	if (c->large)
		return;
	c->d = distance(c, &c->p, &c->q, NULL);
	fr_key_of_curve(&c->p, &kp);
	fr_key_of_curve(&c->q, &kq);
	b = fr_key_bound(&kp, &kq);
	if (b > c->d)
		fail(c, "fr_key_bound %.17g above the distance %.17g", b, c->d);
	sorted = malloc(2 * c->q.n * sizeof(double));
	hull = malloc(4 * c->q.n * sizeof(double));
	nh = fr_convex_hull(&c->q, sorted, hull);
	b = fr_key_hull_bound(&kp, &kq, hull, nh);
	free(sorted);
	free(hull);
	if (b > c->d)
		fail(c, "hull bound %.17g above the distance %.17g", b, c->d);
	/* the ping distance of p's vertices to q */
	if (fr_pings_distance(&e, &c->p, &c->q, -1, &pd, NULL) != FR_OK)
		fail(c, "fr_pings_distance failed");
	b = fr_key_ping_bound(&kp, &kq);
	if (b > pd)
		fail(c, "fr_key_ping_bound %.17g above the ping distance %.17g", b, pd);
	if (h.live != 0)
		fail(c, "leaked %ld blocks", h.live);
}

/* Cheap verdicts agree with the plain decider. */
static void
check_cheap_verdict(fuzz_case *c)
{
	fr_verdict	v;

	if (c->large)
		return;
	v = fr_cheap_decide(&c->p, &c->q, c->eps);
	if (v == FR_FAR && decide(c, c->eps, true))
		fail(c, "cheap verdict 'far' at eps %.17g, the plain decider says yes", c->eps);
	if (v == FR_NEAR && !decide(c, c->eps, true))
		fail(c, "cheap verdict 'near' at eps %.17g, the plain decider says no", c->eps);
}

/* A simplification keeps the ends and stays within its tolerance. */
static void
check_simplify(fuzz_case *c)
{
	fuzz_heap	h;
	fr_env		e = heap_env(&h);
	size_t	   *keep = NULL,
				count = 0;
	double	   *kept;
	fr_curve	s;
	bool		yes = false;
	double		tol = isinf(c->eps) ? c->scale : c->eps;

	if (c->large)
		return;
	{
		fr_status	st = fr_simplify(&e, &c->p, tol, &keep, &count);

		/* one curve in its own frame may span too many scales, though the pair did not */
		if (st == FR_ERANGE)
			return;
		if (st != FR_OK)
			fail(c, "fr_simplify returned %s", fr_status_text(st));
	}
	if (count < 1 || keep[0] != 0 || keep[count - 1] != c->p.n - 1)
		fail(c, "simplification keeps %zu vertices, not both ends", count);
	kept = malloc(count * c->p.dim * sizeof(double));
	for (size_t k = 0; k < count; k++)
	{
		if (k > 0 && keep[k] <= keep[k - 1])
			fail(c, "simplification keeps vertices out of order");
		memcpy(&kept[k * c->p.dim], &c->p.coords[keep[k] * c->p.dim], c->p.dim * sizeof(double));
	}
	s.coords = kept;
	s.n = count;
	s.dim = c->p.dim;
	heap_release(keep, &h);
	if (fr_decide_plain(&e, &c->p, &s, tol * (1 + REL_TOL) + SUBNORMAL_SLACK, &yes, NULL) != FR_OK || !yes)
		fail(c, "simplification at tolerance %.17g is farther than it", tol);
	free(kept);
	if (h.live != 0)
		fail(c, "leaked %ld blocks", h.live);
}

static const fuzz_check fuzz_checks[] = {
	check_summary_bounds,
	check_cheap_verdict,
	check_simplify,
};

int			LLVMFuzzerTestOneInput(const uint8_t *data, size_t size);

/* libFuzzer entry point: decode, then check every property. */
int
LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
	return fuzz_run(data, size, fuzz_checks, sizeof(fuzz_checks) / sizeof(fuzz_checks[0]));
}
