/*
 * test_partial.c - partial matching (Alt & Godau 1995, section 5): the
 * trip against the best part of the route, checked against a brute-force
 * search over many parts on small inputs.
 */
#include <float.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdio.h>

#include <cmocka.h>

#include "testutil.h"

/* Partial distance through the public API, asserting no leak. */
static double
partial(const fr_curve *a, const fr_curve *b)
{
	test_heap	h;
	fr_env		e = test_env(&h);
	double		d;

	assert_int_equal(fr_partial_distance(&e, a, b, &d, NULL), FR_OK);
	assert_int_equal(h.live, 0);
	return d;
}

/* Partial match through the public API, asserting no leak. */
static bool
partial_match(const fr_curve *a, const fr_curve *b, double eps, double *from,
			  double *to, double *d)
{
	test_heap	h;
	fr_env		e = test_env(&h);
	bool		found;

	assert_int_equal(fr_partial_match(&e, a, b, eps, &found, from, to, d, NULL), FR_OK);
	assert_int_equal(h.live, 0);
	return found;
}

/*
 * Brute force: the smallest distance from the trip to the route's parts
 * with ends on a grid of 1/8 of a segment.  A true optimum lies within an
 * eighth of a segment of a grid part, and moving an end of the part by
 * arc length L changes the distance by at most L (common practice: the
 * Fréchet distance is 1-Lipschitz in each curve), so
 * partial <= brute <= partial + longest edge / 8.
 */
static void
partial_distance_matches_brute_force(void **state)
{
	for (int k = 0; k < 40; k++)
	{
		size_t		n = 2 + test_rand64() % 5,
					m = 2 + test_rand64() % 6;
		double	   *ct = test_walk(n, 0, 0, 4),
				   *cr = test_walk(m, 0, 0, 6);
		fr_curve	t = {ct, n, 2},
					r = {cr, m, 2};
		double		d = partial(&t, &r),
					brute = INFINITY,
					from,
					to,
					got;

		for (double a = 0; a <= m - 1; a += 0.125)
			for (double b = a; b <= m - 1; b += 0.125)
			{
				size_t		sn;
				double	   *sc = test_part_of(&r, a, b, &sn);
				fr_curve	s = {sc, sn, 2};
				double		e = test_distance(&t, &s);

				if (e < brute)
					brute = e;
				free(sc);
			}
		if (!(d <= brute * (1 + 1e-9) && brute <= d + fr_longest_edge(&r) / 8 + 1e-9))
			fail_msg("pair %d: partial %.17g, brute force %.17g", k, d, brute);
		/* the threshold contract, as for the full distance */
		assert_true(partial_match(&t, &r, d, &from, &to, &got));
		if (d > 0)
			assert_false(partial_match(&t, &r, d * (1 - 1e-9), &from, &to, &got));
		free(ct);
		free(cr);
	}
}

/* The partial distance never exceeds the full one (the route is one of its parts). */
static void
partial_at_most_full(void **state)
{
	for (int k = 0; k < 200; k++)
	{
		size_t		n = 1 + test_rand64() % 15,
					m = 1 + test_rand64() % 15;
		double	   *ct = test_walk(n, 0, 0, 4),
				   *cr = test_walk(m, 0, 0, 6);
		fr_curve	t = {ct, n, 2},
					r = {cr, m, 2};

		assert_true(partial(&t, &r) <= test_distance(&t, &r) * (1 + 1e-12));
		free(ct);
		free(cr);
	}
}

/*
 * A trip made from the middle third of a route plus noise matches that
 * third, with its ends within one route sample; the reported distance is
 * the distance to the reported part, and at most eps.
 */
static void
middle_third_is_found(void **state)
{
	for (int k = 0; k < 20; k++)
	{
		const size_t m = 90;
		double	   *cr = malloc(2 * m * sizeof(double));
		double	   *ct;
		size_t		n = 0;
		fr_curve	r = {cr, m, 2},
					t,
					s;
		double		from,
					to,
					d,
					eps = 6.0;
		double	   *sc;
		size_t		sn;

		/* a winding street: 20 m steps, slowly turning */
		for (size_t i = 0; i < m; i++)
		{
			double		heading = 0.3 * sin(i / 9.0 + k);

			cr[2 * i] = i == 0 ? 0 : cr[2 * i - 2] + 20 * cos(heading);
			cr[2 * i + 1] = i == 0 ? 0 : cr[2 * i - 1] + 20 * sin(heading);
		}
		/* the trip drives positions 30..60, sampled every ~0.7 segment, noise 2 m */
		ct = malloc(2 * 100 * sizeof(double));
		for (double pos = 30; pos <= 60.0001; pos += 0.5 + 0.4 * test_uniform(0, 1))
		{
			fr_curve_point(&r, pos > 60 ? 60 : pos, ct + 2 * n);
			ct[2 * n] += test_uniform(-2, 2);
			ct[2 * n + 1] += test_uniform(-2, 2);
			n++;
		}
		fr_curve_point(&r, 60, ct + 2 * n);
		n++;
		t = (fr_curve) {ct, n, 2};
		assert_true(partial_match(&t, &r, eps, &from, &to, &d));
		if (fabs(from - 30) > 1 || fabs(to - 60) > 1)
			fail_msg("case %d: matched %g..%g, expected 30..60", k, from, to);
		assert_true(d <= eps * (1 + 1e-12));
		sc = test_part_of(&r, from, to, &sn);
		s = (fr_curve) {sc, sn, 2};
		assert_true(test_close(d, test_distance(&t, &s), 1e-12));
		/* far too small a tolerance finds nothing */
		assert_false(partial_match(&t, &r, 0.5, &from, &to, &d));
		free(sc);
		free(cr);
		free(ct);
	}
}

/* One-point trips and routes: nearest point, and farthest vertex. */
static void
degenerate_parts(void **state)
{
	const double pt[] = {5, 3};
	const double line[] = {0, 0, 10, 0, 10, 10};
	fr_curve	p = {pt, 1, 2},
				l = {line, 3, 2};
	double		from,
				to,
				d;

	assert_true(partial(&p, &l) == 3.0);
	assert_true(partial_match(&p, &l, 3.0, &from, &to, &d));
	assert_true(from == 0.5 && to == 0.5 && d == 3.0);
	assert_false(partial_match(&p, &l, 2.9, &from, &to, &d));
	assert_true(partial(&l, &p) == hypot(5, 7));
}

int
main(void)
{
	const struct CMUnitTest tests[] = {
		cmocka_unit_test(partial_distance_matches_brute_force),
		cmocka_unit_test(partial_at_most_full),
		cmocka_unit_test(middle_third_is_found),
		cmocka_unit_test(degenerate_parts),
	};

	return cmocka_run_group_tests_name("partial", tests, NULL, NULL);
}
