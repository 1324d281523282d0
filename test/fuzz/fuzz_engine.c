/*
 * fuzz_engine.c - libFuzzer target for the engine (src/core).
 *
 * The input bytes decode into a pair of curves (2-D or 3-D, 1 to 32
 * vertices each, or 129 to 192 when the input asks for large curves, so
 * that a single decision polls for interrupts) in one of several
 * coordinate regimes:
 * raw doubles, a small integer grid (duplicates, collinear runs), the grid
 * scaled to tiny or huge magnitudes, Web-Mercator-sized offsets, and mixed
 * exponents.  Coordinates are made to satisfy the engine's input contract
 * (finite, |x| <= FR_MAX_ABS_COORD), as the SQL glue does.
 *
 * Each check below is one property; a violated property aborts with a
 * message, which libFuzzer records as a crash.  Built with AddressSanitizer
 * and UndefinedBehaviorSanitizer, so memory errors and undefined behaviour
 * abort too.  To cover a new engine entry point, add a check function and
 * list it in fuzz_checks[].
 */
#include "fuzz_case.h"

/*
 * The distance exists and is the decision threshold (README.md): decide(d)
 * is true for both deciders, and false just below d.
 */
static void
check_threshold(fuzz_case *c)
{
	double		below;

	if (c->large)
		return;
	c->d = distance(c, &c->p, &c->q, &c->allocations);
	if (!decide_true(c, c->d, false) || !decide_true(c, c->d, true))
		fail(c, "at_most(distance) is false at d = %.17g", c->d);
	below = c->d * (1 - REL_TOL);
	if (below < c->d && (decide(c, below, false) || decide(c, below, true)))
		fail(c, "at_most(d * (1 - 1e-9)) is true at d = %.17g", c->d);
	if (!decide(c, INFINITY, false))
		fail(c, "at_most(+Inf) is false");
}

/*
 * Both deciders answer the fuzzed tolerance as the distance says, except in
 * the rounding band around d.
 */
static void
check_decision_at_eps(fuzz_case *c)
{
	if (c->large)
		return;
	if (c->eps > c->d * (1 + REL_TOL) &&
		(!decide_true(c, c->eps, false) || !decide_true(c, c->eps, true)))
		fail(c, "at_most(%.17g) is false above d = %.17g", c->eps, c->d);
	if (c->eps < c->d * (1 - REL_TOL) && (decide(c, c->eps, false) || decide(c, c->eps, true)))
		fail(c, "at_most(%.17g) is true below d = %.17g", c->eps, c->d);
}

/* Common practice (metric axioms): the distance is symmetric, within rounding. */
static void
check_symmetry(fuzz_case *c)
{
	double		r;

	if (c->large)
		return;
	r = distance(c, &c->q, &c->p, NULL);
	if (underflows(fmax(r, c->d)))
		return;
	if (fabs(r - c->d) > REL_TOL * fmax(r, c->d) + SUBNORMAL_SLACK)
		fail(c, "d(p,q) = %.17g but d(q,p) = %.17g", c->d, r);
}

/*
 * Eiter & Mannila 1994: d <= d_discrete <= d + the longest edge of either
 * curve; and (Alt & Godau 1995) d is at least the larger end-point
 * distance, here computed with hypot so that no square can underflow.
 */
static void
check_bounds(fuzz_case *c)
{
	double		dd,
				edge,
				ends;

	if (c->large)
		return;
	dd = discrete(c);
	edge = fmax(fr_longest_edge(&c->p), fr_longest_edge(&c->q));
	ends = end_distance(c);
	if (underflows(fmax(dd, ends)))
		return;
	if (dd < c->d * (1 - REL_TOL))
		fail(c, "discrete %.17g below continuous %.17g", dd, c->d);
	if (dd > (c->d + edge) * (1 + REL_TOL))
		fail(c, "discrete %.17g above continuous %.17g + longest edge %.17g", dd, c->d, edge);
	if (c->d < ends * (1 - REL_TOL))
		fail(c, "distance %.17g below the end-point distance %.17g", c->d, ends);
}

/*
 * Scaling both curves by 2 scales the distance by 2 (common practice: a
 * similarity).  Skipped when doubling would leave the accepted range.
 */
static void
check_scaling(fuzz_case *c)
{
	fuzz_case  *s;
	double		r;

	if (c->large || c->scale > FR_MAX_ABS_COORD / 4)
		return;
	s = malloc(sizeof(*s));
	*s = *c;
	for (size_t i = 0; i < c->p.n * c->p.dim; i++)
		s->a[i] = 2 * c->a[i];
	for (size_t i = 0; i < c->q.n * c->q.dim; i++)
		s->b[i] = 2 * c->b[i];
	s->p.coords = s->a;
	s->q.coords = s->b;
	r = distance(s, &s->p, &s->q, NULL);
	if (!underflows(c->d) && fabs(r - 2 * c->d) > REL_TOL * r + SUBNORMAL_SLACK)
		fail(c, "d(2p,2q) = %.17g but 2 d(p,q) = %.17g", r, 2 * c->d);
	free(s);
}

/*
 * Engine contract (frechet.h): an interrupt stops the call with FR_EINTR or
 * lets it finish with the same answer; a failed allocation gives
 * FR_ENOMEM; either way nothing leaks.
 */
static void
check_interrupt_and_oom(fuzz_case *c)
{
	fuzz_heap	h;
	fr_env		e = heap_env(&h);
	double		d = -1;
	fr_status	st;

	if (c->large)
		return;
	h.interrupt_after = c->interrupt_after;
	st = fr_distance(&e, &c->p, &c->q, &d, NULL);
	if (!(st == FR_EINTR || (st == FR_OK && d == c->d)) || h.live != 0)
		fail(c, "interrupted distance: status %s, d %.17g, %ld blocks live",
			 fr_status_text(st), d, h.live);
	if (st == FR_EINTR && h.polls <= c->interrupt_after)
		fail(c, "FR_EINTR without the callback asking");

	for (long k = 0; k < c->allocations; k++)
	{
		e = heap_env(&h);
		h.fail_after = k;
		st = fr_distance(&e, &c->p, &c->q, &d, NULL);
		if (st != FR_ENOMEM || h.live != 0)
			fail(c, "allocation %ld failing: status %s, %ld blocks live",
				 k, fr_status_text(st), h.live);
	}
}

/*
 * Large curves, without the costly distance: the offered decider agrees
 * with the plain one outside a rounding band; the discrete coupling is a
 * matching, so decide(d_discrete) is true (Eiter & Mannila 1994); below
 * the end-point distance the decision is false; and interrupts polled
 * inside the deciders, the discrete distance and the distance stop them
 * without leaks (engine contract, frechet.h).
 */
static void
check_large(fuzz_case *c)
{
	double		dd,
				ends;
	fuzz_heap	h;
	fr_env		e;
	fr_status	st;
	bool		yes;
	double		d;

	if (!c->large)
		return;
	if (decide(c, c->eps, false) ? !decide_true(c, c->eps * (1 + REL_TOL), true)
		: decide(c, c->eps * (1 - REL_TOL), true))
		fail(c, "fr_decide and fr_decide_plain disagree at %.17g", c->eps);
	dd = discrete(c);
	if (!decide_true(c, dd, false))
		fail(c, "at_most(discrete distance %.17g) is false", dd);
	ends = end_distance(c);
	if (!underflows(ends) && ends * (1 - REL_TOL) < ends &&
		decide(c, ends * (1 - REL_TOL), false))
		fail(c, "at_most is true below the end-point distance %.17g", ends);

	for (int which = 0; which < 3; which++)
	{
		e = heap_env(&h);
		h.interrupt_after = c->interrupt_after;
		if (which == 0)
			st = fr_decide(&e, &c->p, &c->q, dd, &yes, NULL);
		else if (which == 1)
			st = fr_discrete_distance(&e, &c->p, &c->q, &d);
		else
			st = fr_distance(&e, &c->p, &c->q, &d, NULL);
		if (!(st == FR_OK || st == FR_EINTR) || h.live != 0)
			fail(c, "interrupted call %d: status %s, %ld blocks live",
				 which, fr_status_text(st), h.live);
		if (st == FR_EINTR && h.polls <= c->interrupt_after)
			fail(c, "FR_EINTR without the callback asking");
		if (which == 1 && st == FR_OK && d != dd)
			fail(c, "discrete distance changed under polling: %.17g vs %.17g", d, dd);
	}
}

/*
 * The properties, in order; check_threshold sets c->d for the others.
 * Large cases run check_large only.
 */
static const fuzz_check fuzz_checks[] = {
	check_threshold,
	check_decision_at_eps,
	check_symmetry,
	check_bounds,
	check_scaling,
	check_interrupt_and_oom,
	check_large,
};

int			LLVMFuzzerTestOneInput(const uint8_t *data, size_t size);

/* libFuzzer entry point: decode, then check every property. */
int
LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
	return fuzz_run(data, size, fuzz_checks, sizeof(fuzz_checks) / sizeof(fuzz_checks[0]));
}
