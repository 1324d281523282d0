/*
 * test_simplify.c - simplification with a Fréchet guarantee (Agarwal,
 * Har-Peled, Mustafa & Wang 2005): the guarantee is recomputed with the
 * exact distance, and the result must be smaller where the curve allows.
 */
#include <float.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdio.h>

#include <cmocka.h>

#include "testutil.h"
#include "fr_internal.h"

/* Simplifies and returns the kept curve's coordinates (count in *k). */
static double *
simplified(const fr_curve *c, double tol, size_t *k)
{
	test_heap	h;
	fr_env		e = test_env(&h);
	size_t	   *keep;
	double	   *out;

	assert_int_equal(fr_simplify(&e, c, tol, &keep, k), FR_OK);
	assert_int_equal(h.live, 1);
	assert_true(keep[0] == 0 && keep[*k - 1] == c->n - 1);
	out = malloc(2 * *k * sizeof(double));
	for (size_t i = 0; i < *k; i++)
	{
		if (i > 0)
			assert_true(keep[i] > keep[i - 1]);
		out[2 * i] = c->coords[2 * keep[i]];
		out[2 * i + 1] = c->coords[2 * keep[i] + 1];
	}
	free(keep);
	return out;
}

/* The guarantee, recomputed: the simplified curve is within tol of the input. */
static void
within_tolerance(void **state)
{
	for (int t = 0; t < 300; t++)
	{
		size_t		n = 1 + test_rand64() % 200,
					k;
		double	   *c = test_walk(n, 0, 0, 5),
				   *s,
					tol = test_uniform(0, 10),
					d;
		fr_curve	a = {c, n, 2},
					b;
		test_heap	h;
		fr_env		e = test_env(&h);

		s = simplified(&a, tol, &k);
		b = (fr_curve) {s, k, 2};
		assert_int_equal(fr_distance(&e, &a, &b, &d, NULL), FR_OK);
		if (!(d <= tol * (1 + 1e-12) + 1e-12))
			fail_msg("case %d: n=%zu tol=%g kept %zu, distance %.17g", t, n, tol, k, d);
		assert_true(k <= n);
		free(c);
		free(s);
	}
}

/*
 * Common practice: collinear and repeated vertices go at any tolerance above
 * rounding (1e-9 here; at exactly 0 rounding decides).
 */
static void
straight_line_keeps_its_ends(void **state)
{
	double		c[2 * 50];
	fr_curve	a = {c, 50, 2};
	size_t		k;
	double	   *s;

	for (int i = 0; i < 50; i++)
	{
		c[2 * i] = i / 2;		/* each position twice: repeated fixes */
		c[2 * i + 1] = 3 * (i / 2);
	}
	s = simplified(&a, 1e-9, &k);
	assert_int_equal(k, 2);
	free(s);
}

/* A noisy straight street shrinks to a few vertices at a tolerance above the noise. */
static void
noisy_street_shrinks(void **state)
{
	const size_t n = 2000;
	double	   *c = malloc(2 * n * sizeof(double));
	fr_curve	a = {c, n, 2};
	size_t		k;
	double	   *s;

	for (size_t i = 0; i < n; i++)
	{
		c[2 * i] = 10.0 * i + test_uniform(-3, 3);
		c[2 * i + 1] = test_uniform(-3, 3);
	}
	s = simplified(&a, 10, &k);
	assert_true(k < n / 20);
	free(s);
	free(c);
}

/*
 * The one-row decision simplify.c runs on each piece equals the plain
 * decider on the same free space, on random pieces and at eps exactly at
 * a vertex's distance to the segment's line or ends and one double either
 * side.
 */
static void
one_row_equals_plain(void **state)
{
	long		count = 0,
				accepted = 0;

	(void) state;
	test_rng_state = 7;
	for (int it = 0; it < 20000; it++)
	{
		size_t		n = 2 + it % 23;
		double	   *c = test_walk(n, 0, 0, 1 + it % 5);
		double		ends[4] = {c[0] + test_uniform(-0.5, 0.5), c[1] + test_uniform(-0.5, 0.5),
		c[2 * n - 2] + test_uniform(-0.5, 0.5), c[2 * n - 1] + test_uniform(-0.5, 0.5)};
		fr_curve	piece = {c, n, 2},
					seg = {ends, 2, 2};
		test_heap	h;
		fr_env		e = test_env(&h);
		fr_prep		pp,
					ps;
		double	   *row = malloc(n * sizeof(double));
		double		eps;
		bool		plain,
					fast;
		size_t		k = 1 + (size_t) it % (n - 1);

		assert_int_equal(fr_prepare_pair(&e, &piece, &seg, &pp, &ps), FR_OK);
		switch (it % 4)
		{
			case 0:
				eps = test_uniform(0.1, 4);
				break;
			case 1:
				eps = fr_point_segment_opening(&pp.v[k], &ps.v[0], &ps.s[0], &ps.v[1]);
				break;
			case 2:
				eps = nextafter(fr_point_segment_opening(&pp.v[k], &ps.v[0], &ps.s[0], &ps.v[1]), 0);
				break;
			default:
				eps = fr_pt_dist(&pp.v[k], &ps.v[it % 8 < 4 ? 0 : 1]);
				break;
		}
		assert_int_equal(fr_decide_prepared(&e, &pp, &ps, eps, row, &plain, NULL), FR_OK);
		fast = fr_one_row_decide(&pp, &ps, eps, row);
		if (fast != plain)
			fail_msg("n=%zu eps=%.17g: one row %d, plain %d", n, eps, fast, plain);
		count++;
		accepted += fast;
		fr_release_pair(&e, &pp, &ps);
		free(row);
		free(c);
	}
	print_message("one-row decisions compared: %ld (%ld accepted)\n", count, accepted);
	/* both answers must be well represented, or the comparison says little */
	assert_true(accepted > count / 10 && accepted < count - count / 10);
}

int
main(void)
{
	const struct CMUnitTest tests[] = {
		cmocka_unit_test(one_row_equals_plain),
		cmocka_unit_test(within_tolerance),
		cmocka_unit_test(straight_line_keeps_its_ends),
		cmocka_unit_test(noisy_street_shrinks),
	};

	return cmocka_run_group_tests_name("simplify", tests, NULL, NULL);
}
