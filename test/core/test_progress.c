/*
 * test_progress.c - trips in progress (progress.c), against a slow
 * reference of our own: every place s on a fine grid of the route (and
 * every vertex) is tried with the plain decider on the trip and the
 * route's prefix up to s; the first run of consecutive accepted places is
 * the first connected stretch, and the engine's place must lie in it (to a
 * grid step) and be at least as near the trip's last point as the best
 * grid place.  Worked examples by hand, and trips cut at known places of
 * their route.
 */
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdio.h>

#include <cmocka.h>

#include "testutil.h"

/* The engine's answer on raw 2-D curves; false when not found. */
static bool
progress(const double *t, size_t n, const double *r, size_t m, double eps, double *pos, double *frac)
{
	test_heap	h;
	fr_env		e = test_env(&h);
	fr_curve	tc = {t, n, 2},
				rc = {r, m, 2};
	bool		found = false;

	assert_int_equal(fr_progress(&e, &tc, &rc, eps, &found, pos, frac), FR_OK);
	assert_int_equal(h.live, 0);
	return found;
}

/* Does the trip match the route's prefix up to place s within eps (plain decider)? */
static bool
prefix_ok(const double *t, size_t n, const fr_curve *route, double s, double eps)
{
	test_heap	h;
	fr_env		e = test_env(&h);
	size_t		k;
	double	   *pre = test_part_of(route, 0.0, s, &k);
	fr_curve	tc = {t, n, 2},
				pc = {pre, k, 2};
	bool		yes = false;

	if (s == 0.0)
		pc.n = 1;
	assert_int_equal(fr_decide_plain(&e, &tc, &pc, eps, &yes, NULL), FR_OK);
	free(pre);
	return yes;
}

static void
worked_examples(void **state)
{
	/* an L-shaped route 20 long; a trip along its first half */
	const double route[] = {0, 0, 10, 0, 10, 10};
	const double half[] = {0, 0.5, 3, -0.4, 5, 0.3};
	const double not_started[] = {5, 5, 6, 5};
	const double done[] = {0, 0, 10, 0.5, 10, 10};
	/* a loop line back to its start; a bus waiting at the first stop */
	const double loop[] = {0, 0, 10, 0, 10, 10, 0, 10, 0, 0};
	const double waiting[] = {0.2, 0.1, 0.1, -0.1, 0.3, 0.2};
	double		pos,
				frac;

	assert_true(progress(half, 3, route, 3, 1, &pos, &frac));
	assert_true(test_close(pos, 0.5, 1e-12));	/* (5, 0): position 1.5 in SQL */
	assert_true(test_close(frac, 0.25, 1e-12));
	assert_false(progress(not_started, 2, route, 3, 1, &pos, &frac));
	assert_true(progress(done, 3, route, 3, 1, &pos, &frac));
	assert_true(pos == 2.0 && frac == 1.0);
	assert_true(progress(waiting, 3, loop, 5, 1, &pos, &frac));
	assert_true(pos < 0.05 && frac < 0.02);	/* at the start, not the end */
	/* a one-point trip at the start: the route's start */
	assert_true(progress(waiting, 1, route, 3, 1, &pos, &frac));
	assert_true(pos < 0.03);
}

/* Trips cut at a known place of their route, with noise below eps. */
static void
cut_at_known_places(void **state)
{
	test_rng_state = 17;
	for (int rep = 0; rep < 300; rep++)
	{
		size_t		m = 3 + test_rand64() % 12,
					k;
		double	   *r = test_walk(m, 0, 0, 100);
		fr_curve	rc = {r, m, 2};
		double		cut = test_uniform(0.2, (double) (m - 1) - 0.2),
					eps = 5,
					pos,
					frac;
		double	   *part = test_part_of(&rc, 0.0, cut, &k);
		double	   *trip = test_jitter(part, k, 2, 1.0);
		double		cut_pt[2],
					got_pt[2];

		assert_true(progress(trip, k, r, m, eps, &pos, &frac));
		fr_curve_point(&rc, cut, cut_pt);
		fr_curve_point(&rc, pos, got_pt);
		/* the trip's last point is within 1.5 of the cut place, so the place found is within eps + 1.5 */
		assert_true(hypot(got_pt[0] - trip[2 * k - 2], got_pt[1] - trip[2 * k - 1]) <= eps);
		assert_true(prefix_ok(trip, k, &rc, pos, eps * (1 + 1e-9)));
		assert_true(frac >= 0 && frac <= 1);
		free(r);
		free(part);
		free(trip);
	}
}

/* Against the grid reference on random trips. */
static void
matches_the_grid_reference(void **state)
{
	int			compared = 0;

	test_rng_state = 29;
	for (int rep = 0; rep < 120; rep++)
	{
		size_t		m = 2 + test_rand64() % 6,
					n = 1 + test_rand64() % 6,
					g = 40;
		double	   *r = test_walk(m, 0, 0, 10);
		double	   *t = test_walk(n, r[0] + test_uniform(-2, 2), r[1] + test_uniform(-2, 2), 8);
		fr_curve	rc = {r, m, 2};
		double		eps = test_uniform(2, 9),
					pos = -1,
					frac,
					best = INFINITY,
					first = -1,
					last_in = -1;
		bool		found = progress(t, n, r, m, eps, &pos, &frac),
					in_run = false,
					run_done = false;

		/* the grid: g steps a segment, each place tried with the plain decider */
		for (size_t i = 0; i + 1 < m && !run_done; i++)
			for (size_t u = 0; u <= g && !run_done; u++)
			{
				double		s = (double) i + (double) u / g,
							xy[2],
							d;

				if (u == g && i + 2 < m)
					continue;	/* the next segment's u = 0 */
				if (prefix_ok(t, n, &rc, s, eps))
				{
					if (!in_run)
						first = s;
					in_run = true;
					last_in = s;
					fr_curve_point(&rc, s, xy);
					d = hypot(xy[0] - t[2 * n - 2], xy[1] - t[2 * n - 1]);
					best = fmin(best, d);
				}
				else if (in_run)
					run_done = true;
			}
		if (in_run)
		{
			double		xy[2];

			/* a stretch the grid sees is one the engine sees */
			assert_true(found);
			assert_true(pos >= first - 1.0 / g - 1e-9 && pos <= last_in + 1.0 / g + 1e-9);
			fr_curve_point(&rc, pos, xy);
			assert_true(hypot(xy[0] - t[2 * n - 2], xy[1] - t[2 * n - 1]) <= best + 1e-9);
			compared++;
		}
		if (found)
			assert_true(prefix_ok(t, n, &rc, pos, eps * (1 + 1e-9)));
		free(r);
		free(t);
	}
	print_message("cases with a stretch compared: %d of 120\n", compared);
	assert_true(compared >= 30);
}

int
main(void)
{
	const struct CMUnitTest tests[] = {
		cmocka_unit_test(worked_examples),
		cmocka_unit_test(cut_at_known_places),
		cmocka_unit_test(matches_the_grid_reference),
	};

	return cmocka_run_group_tests_name("progress", tests, NULL, NULL);
}
