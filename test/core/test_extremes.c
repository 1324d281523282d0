/*
 * test_extremes.c - inputs at the edges of double arithmetic: vertices a
 * float step apart (a tangency at height 0 once made the opening search
 * loop forever), pairs whose coordinates span too many scales (refused with
 * FR_ERANGE rather than answered wrongly), long runs of repeated points
 * (a parked vehicle), each call under an alarm so that a hang is a failure.
 */
#include <setjmp.h>
#include <signal.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdio.h>
#include <unistd.h>

#include <cmocka.h>

#include "testutil.h"

/* Seconds a single call may take before the test counts it as a hang. */
#define HANG_SECONDS 20

/* SIGALRM: a call did not return; report and stop the binary (a failure). */
static void
on_alarm(int sig)
{
	static const char msg[] = "not ok - a call did not return within the alarm (hang)\n";

	(void) sig;
	(void) !write(STDOUT_FILENO, msg, sizeof(msg) - 1);
	_exit(3);
}

/* Distance of two raw curves under the hang alarm; returns the status. */
static fr_status
guarded_distance(const double *a, size_t na, const double *b, size_t nb, int dim, double *d)
{
	test_heap	h;
	fr_env		e = test_env(&h);
	fr_curve	p = {a, na, dim},
				q = {b, nb, dim};
	fr_status	st;

	signal(SIGALRM, on_alarm);
	alarm(HANG_SECONDS);
	st = fr_distance(&e, &p, &q, d, NULL);
	alarm(0);
	assert_int_equal(h.live, 0);
	return st;
}

/* The plain reference decider on raw curves. */
static bool
plain_decides(const double *a, size_t na, const double *b, size_t nb, int dim, double eps)
{
	test_heap	h;
	fr_env		e = test_env(&h);
	fr_curve	p = {a, na, dim},
				q = {b, nb, dim};
	bool		yes = false;

	assert_int_equal(fr_decide_plain(&e, &p, &q, eps, &yes, NULL), FR_OK);
	return yes;
}

/* d is the threshold of the plain decider: accepted, and the double below rejected. */
static void
assert_threshold(const double *a, size_t na, const double *b, size_t nb, int dim, double d)
{
	assert_true(plain_decides(a, na, b, nb, dim, d));
	if (d > 0)
		assert_false(plain_decides(a, na, b, nb, dim, nextafter(d, 0)));
}

/*
 * Issue 20, item 1: a vertex one float step from a segment's line, with its
 * foot inside the segment, has height 0 in the engine's arithmetic; the
 * tangency opening search then never ended.  Both reported pairs, and the
 * same shape at other magnitudes, must return the decider's threshold.
 */
static void
vertex_on_the_line_returns(void **state)
{
	const double a1[] = {1, -2, 0, 1.0000000000000002, 0, 1};
	const double b1[] = {1, -2, 0, 1};
	const double a2[] = {2.6467476451894023, 500063.55314100382,
		0.73999999999999988, 500066.42999999999,
	0.73999999999999999, 500066.42999999999};
	const double b2[] = {2.6467476451894023, 500063.55314100382,
	0.73999999999999999, 500066.42999999999};
	double		d;

	assert_int_equal(guarded_distance(a1, 3, b1, 2, 2, &d), FR_OK);
	assert_threshold(a1, 3, b1, 2, 2, d);
	assert_int_equal(guarded_distance(a2, 3, b2, 2, 2, &d), FR_OK);
	assert_threshold(a2, 3, b2, 2, 2, d);

	/* a trip vertex 1 to 3 float steps from the route's end vertex, at many scales */
	for (int k = 0; k < 300; k++)
	{
		double		s = ldexp(1.0, (int) (test_rand64() % 120) - 60),
					ex = test_uniform(-1, 1) * s,
					ey = test_uniform(-1, 1) * s,
					sx = test_uniform(-1, 1) * s,
					sy = test_uniform(-1, 1) * s,
					nx = ex,
					ny = ey;
		int			steps = 1 + (int) (test_rand64() % 3);

		for (int i = 0; i < steps; i++)
			ny = nextafter(ny, INFINITY);
		if (test_rand64() % 2)
			nx = nextafter(nx, -INFINITY);
		{
			const double a[] = {sx, sy, nx, ny, ex, ey};
			const double b[] = {sx, sy, ex, ey};

			assert_int_equal(guarded_distance(a, 3, b, 2, 2, &d), FR_OK);
			assert_threshold(a, 3, b, 2, 2, d);
		}
	}
}

/*
 * Issue 20, item 3: squares of coordinate differences below about 1e-154
 * lose precision and below about 1e-162 vanish.  Pairs with a nonzero
 * coordinate below FR_MIN_LOCAL_COORD in their frame are refused by every
 * exact entry point with FR_ERANGE; pairs within range keep their exact
 * answer.  Reference values: the distance of two segments that share
 * an end point and start delta apart is delta (both walkers move at
 * proportional speed; the start points already are delta apart).
 */
static void
pairs_beyond_the_scale_range_are_refused(void **state)
{
	const double tiny_seg[] = {-1.6e-162, 0, 0, 0};
	const double spike[] = {0, 0, 0, 1, 0, 0};
	const double offsets[] = {1e-80, 1e-60, 1e-30, 1e-89, 1e-130};
	const double refused[] = {1e-137, 1e-140, 1e-160, 1e-200, 4.9e-324};
	double		d;

	assert_int_equal(guarded_distance(tiny_seg, 2, spike, 3, 2, &d), FR_ERANGE);

	for (size_t k = 0; k < sizeof(offsets) / sizeof(offsets[0]); k++)
	{
		const double a[] = {0, 0, 10, 0};
		const double b[] = {0, offsets[k], 10, 0};

		assert_int_equal(guarded_distance(a, 2, b, 2, 2, &d), FR_OK);
		assert_true(test_close(d, offsets[k], 1e-15));
		assert_threshold(a, 2, b, 2, 2, d);
	}
	for (size_t k = 0; k < sizeof(refused) / sizeof(refused[0]); k++)
	{
		const double a[] = {0, 0, 10, 0};
		const double b[] = {0, refused[k], 10, 0};
		test_heap	h;
		fr_env		e = test_env(&h);
		fr_curve	p = {a, 2, 2},
					q = {b, 2, 2};
		bool		yes;
		bool		found;
		double		from,
					to;
		fr_match_pt *pts;
		size_t		count;

		assert_int_equal(guarded_distance(a, 2, b, 2, 2, &d), FR_ERANGE);
		assert_int_equal(fr_decide_plain(&e, &p, &q, 0.0, &yes, NULL), FR_ERANGE);
		assert_int_equal(fr_decide_exact(&e, &p, &q, 0.0, &yes, NULL), FR_ERANGE);
		assert_int_equal(fr_decide(&e, &p, &q, 1.0, &yes, NULL), FR_ERANGE);
		assert_int_equal(fr_decide(&e, &p, &q, INFINITY, &yes, NULL), FR_ERANGE);
		assert_false(fr_pair_in_range(&p, &q));
		assert_int_equal(fr_discrete_distance(&e, &p, &q, &d), FR_ERANGE);
		assert_int_equal(fr_partial_distance(&e, &p, &q, &d, NULL), FR_ERANGE);
		assert_int_equal(fr_partial_match(&e, &p, &q, 1.0, &found, &from, &to, &d, NULL), FR_ERANGE);
		assert_int_equal(fr_matching(&e, &p, &q, -1, &pts, &count, &found, &d, NULL), FR_ERANGE);
		assert_int_equal(h.live, 0);
	}

	/* coordinates from 1e-130 to 1e150 in one pair are fine: no square underflows */
	{
		const double a[] = {-1e150, 0, 1e150, 1e-130};
		const double b[] = {-1e150, 1, 1e150, 1e-130};

		assert_int_equal(guarded_distance(a, 2, b, 2, 2, &d), FR_OK);
		assert_true(d == 1.0);
	}
	/* a whole pair that is tiny is scaled, not refused: the offset comes back */
	{
		const double a[] = {0, 0, 1e-200, 0};
		const double b[] = {0, 1e-210, 1e-200, 0};

		assert_int_equal(guarded_distance(a, 2, b, 2, 2, &d), FR_OK);
		assert_true(test_close(d, 1e-210, 1e-15));
	}
}

/*
 * Issue 20, item 9: a million repeated points against a million others at
 * exactly eps once made the decision quadratic (every vertex pair within
 * eps, so no filter and no pruning could help).  Repeated vertices are
 * dropped from the prepared curves; the alarm catches a return to
 * quadratic time, and the verdicts at eps and one double below stay the
 * plain decider's.
 */
static void
parked_vehicles_decide_at_once(void **state)
{
	const size_t n = 1000000;
	double	   *a = malloc(2 * n * sizeof(double)),
			   *b = malloc(2 * n * sizeof(double));
	test_heap	h;
	fr_env		e = test_env(&h);
	fr_curve	p = {a, n, 2},
				q = {b, n, 2};
	bool		yes = false;
	double		d = -1;

	for (size_t i = 0; i < n; i++)
	{
		a[2 * i] = a[2 * i + 1] = 1;
		b[2 * i] = 1;
		b[2 * i + 1] = 2;
	}
	signal(SIGALRM, on_alarm);
	alarm(HANG_SECONDS);
	assert_int_equal(fr_decide(&e, &p, &q, 1.0, &yes, NULL), FR_OK);
	assert_true(yes);
	assert_int_equal(fr_decide_exact(&e, &p, &q, nextafter(1.0, 0), &yes, NULL), FR_OK);
	assert_false(yes);
	assert_int_equal(fr_distance(&e, &p, &q, &d, NULL), FR_OK);
	alarm(0);
	assert_true(d == 1.0);
	assert_int_equal(h.live, 0);
	free(a);
	free(b);
}

/*
 * Dropping repeated vertices changes no answer: on random walks with runs
 * of repeated vertices (a vehicle waiting at lights), the distance is the
 * plain decider's threshold on the curves as given, and the fast decider
 * agrees with the plain one at it and one double below.
 */
static void
repeated_vertices_keep_every_answer(void **state)
{
	for (int trial = 0; trial < 200; trial++)
	{
		size_t		n = 2 + test_rand64() % 30,
					m = 2 + test_rand64() % 30;
		double	   *a = test_walk(n, 0, 0, 1),
				   *b = test_walk(m, 0.3, 0.2, 1);
		test_heap	h;
		fr_env		e = test_env(&h);
		fr_curve	p = {a, n, 2},
					q = {b, m, 2};
		double		d;
		bool		fast,
					plain;

		/* runs of repeats, at the ends too */
		for (size_t i = 1; i < n; i++)
			if (test_rand64() % 3 == 0)
				memcpy(&a[2 * i], &a[2 * (i - 1)], 2 * sizeof(double));
		for (size_t j = 1; j < m; j++)
			if (test_rand64() % 3 == 0)
				memcpy(&b[2 * j], &b[2 * (j - 1)], 2 * sizeof(double));
		assert_int_equal(guarded_distance(a, n, b, m, 2, &d), FR_OK);
		assert_threshold(a, n, b, m, 2, d);
		for (int k = 0; k < 2; k++)
		{
			double		eps = k == 0 ? d : nextafter(d, 0);

			assert_int_equal(fr_decide_exact(&e, &p, &q, eps, &fast, NULL), FR_OK);
			assert_int_equal(fr_decide_plain(&e, &p, &q, eps, &plain, NULL), FR_OK);
			assert_true(fast == plain);
		}
		assert_int_equal(h.live, 0);
		free(a);
		free(b);
	}
}

/* Largest coordinate magnitude of two raw 2-D curves. */
static double
magnitude(const double *a, size_t na, const double *b, size_t nb)
{
	double		m = 0;

	for (size_t i = 0; i < 2 * na; i++)
		m = fmax(m, fabs(a[i]));
	for (size_t i = 0; i < 2 * nb; i++)
		m = fmax(m, fabs(b[i]));
	return m;
}

/*
 * The part a partial match returns is within eps of the trip, up to the
 * rounding of positions on the route (1e-9 of eps, 1e-12 of the
 * coordinates); a match exists at the partial distance; and the partial
 * distance is at most the distance to the whole route (the whole route is
 * one of its parts).
 */
static void
assert_partial_sound(const double *a, size_t na, const double *b, size_t nb, double eps)
{
	test_heap	h;
	fr_env		e = test_env(&h);
	fr_curve	p = {a, na, 2},
				q = {b, nb, 2};
	bool		found = false;
	double		from,
				to,
				d,
				pd,
				whole;

	assert_int_equal(fr_partial_match(&e, &p, &q, eps, &found, &from, &to, &d, NULL), FR_OK);
	if (found)
	{
		size_t		k;
		double	   *part = test_part_of(&q, from, to, &k);
		fr_curve	pc = {part, k, 2};

		assert_true(from <= to);
		assert_true(d <= eps + 1e-9 * eps + 1e-12 * magnitude(a, na, b, nb));
		assert_true(test_close(test_distance(&p, &pc), d, 1e-12) ||
					fabs(test_distance(&p, &pc) - d) <= 1e-12 * magnitude(a, na, b, nb));
		free(part);
	}
	assert_int_equal(fr_partial_distance(&e, &p, &q, &pd, NULL), FR_OK);
	assert_int_equal(fr_distance(&e, &p, &q, &whole, NULL), FR_OK);
	assert_true(pd <= whole);
	assert_int_equal(fr_partial_match(&e, &p, &q, pd, &found, &from, &to, &d, NULL), FR_OK);
	assert_true(found);
	assert_int_equal(h.live, 0);
}

/*
 * Issue 20, item 4: a route edge far longer than eps (1e11 against 1), or
 * a trip below the route's rounding (1e-17 beside 100), made the reversed
 * sweep that finds the part's start disagree with the forward one, and the
 * fallback returned the whole route (distance 1.98 at eps 1; 141 at eps 0).
 */
static void
partial_match_part_is_within_eps(void **state)
{
	const double a1[] = {0, 0.0671, 1.436, 1.436};
	const double b1[] = {1.436, 1.436, -1e11, -1e11};
	const double a2[] = {1e-17, 0, 0, 0};
	const double b2[] = {0, 0, 1e-17, 0, -100, -100, 0, 0};

	assert_partial_sound(a1, 2, b1, 2, 1.0);
	assert_partial_sound(a2, 2, b2, 4, 0.0);

	/* short trips against routes with very long edges, at several eps */
	for (int trial = 0; trial < 300; trial++)
	{
		size_t		n = 2 + test_rand64() % 4,
					m = 2 + test_rand64() % 4;
		double	   *a = test_walk(n, 0, 0, 2),
				   *b = test_walk(m, test_uniform(-2, 2), test_uniform(-2, 2), 2);
		double		eps = test_uniform(0, 3);

		/* one route vertex far away: an edge of 1e3 to 1e11 */
		{
			size_t		j = test_rand64() % m;
			double		far = pow(10, test_uniform(3, 11));

			b[2 * j] = test_uniform(-1, 1) * far;
			b[2 * j + 1] = test_uniform(-1, 1) * far;
		}
		assert_partial_sound(a, n, b, m, eps);
		free(a);
		free(b);
	}
}

/*
 * Found by fuzz_witness: the partial distance of a curve to itself came
 * back as 3.6e-15 (a lower bound measured at an interpolated point, which
 * rounding put off the route, was returned as the answer), and a path
 * reaching the route's last point along the top of the last cell was not
 * seen.  A curve is its own part, so the partial distance is 0.
 */
static void
partial_distance_to_itself_is_zero(void **state)
{
	const double found[] = {1.5, 0, 0, 0, 27, 0.25};
	test_heap	h;
	fr_env		e = test_env(&h);
	fr_curve	p = {found, 3, 2};
	double		pd = -1;

	assert_int_equal(fr_partial_distance(&e, &p, &p, &pd, NULL), FR_OK);
	assert_true(pd == 0.0);
	for (int trial = 0; trial < 200; trial++)
	{
		size_t		n = 2 + test_rand64() % 12;
		double	   *a = test_walk(n, test_uniform(-1e3, 1e3), test_uniform(-1e3, 1e3), 50);
		fr_curve	c = {a, n, 2};

		assert_int_equal(fr_partial_distance(&e, &c, &c, &pd, NULL), FR_OK);
		assert_true(pd == 0.0);
		free(a);
	}
	assert_int_equal(h.live, 0);
}

int
main(void)
{
	const struct CMUnitTest tests[] = {
		cmocka_unit_test(vertex_on_the_line_returns),
		cmocka_unit_test(pairs_beyond_the_scale_range_are_refused),
		cmocka_unit_test(parked_vehicles_decide_at_once),
		cmocka_unit_test(repeated_vertices_keep_every_answer),
		cmocka_unit_test(partial_match_part_is_within_eps),
		cmocka_unit_test(partial_distance_to_itself_is_zero),
	};

	return cmocka_run_group_tests_name("extremes", tests, NULL, NULL);
}
