/*
 * test_matching.c - the witness matching, checked independently of the
 * code that built it: monotone, end to end, and its leash, recomputed from
 * the raw coordinates at breakpoints and midpoints, never above the
 * distance (the definition of the Fréchet distance: a matching whose
 * longest leash is d).
 */
#include <float.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdio.h>

#include <cmocka.h>

#include "testutil.h"

/* Leash between positions pa on a and pb on b, from the raw coordinates. */
static double
leash_at(const fr_curve *a, double pa, const fr_curve *b, double pb)
{
	double		x[3],
				y[3],
				s = 0;

	fr_curve_point(a, pa, x);
	fr_curve_point(b, pb, y);
	for (int d = 0; d < a->dim; d++)
		s += (x[d] - y[d]) * (x[d] - y[d]);
	return sqrt(s);
}

/*
 * Checks a matching: starts at (0,0), ends at (n-1,m-1), monotone, and the
 * leash at breakpoints and at 7 interior points of each piece is at most
 * bound (with relative slack tol).  Returns the largest breakpoint leash.
 */
static double
check_matching(const fr_curve *a, const fr_curve *b, const fr_match_pt *pts,
			   size_t count, double bound, double tol)
{
	double		worst = 0;

	assert_true(count >= 1);
	assert_true(pts[0].a_pos == 0 && pts[0].b_pos == 0);
	assert_true(pts[count - 1].a_pos == (double) (a->n - 1));
	assert_true(pts[count - 1].b_pos == (double) (b->n - 1));
	for (size_t k = 0; k < count; k++)
	{
		double		l = leash_at(a, pts[k].a_pos, b, pts[k].b_pos);

		assert_true(test_close(l, pts[k].leash, 1e-9) || fabs(l - pts[k].leash) < 1e-9 * (bound + 1e-300));
		if (!(l <= bound * (1 + tol) + 1e-12 * bound))
			fail_msg("breakpoint %zu: leash %.17g above bound %.17g", k, l, bound);
		if (l > worst)
			worst = l;
		if (k == 0)
			continue;
		assert_true(pts[k].a_pos >= pts[k - 1].a_pos);
		assert_true(pts[k].b_pos >= pts[k - 1].b_pos);
		for (int s = 1; s < 8; s++)
		{
			double		t = s / 8.0;
			double		pa = pts[k - 1].a_pos + t * (pts[k].a_pos - pts[k - 1].a_pos),
						pb = pts[k - 1].b_pos + t * (pts[k].b_pos - pts[k - 1].b_pos);

			l = leash_at(a, pa, b, pb);
			if (!(l <= bound * (1 + tol) + 1e-12 * bound))
				fail_msg("piece %zu at %g: leash %.17g above bound %.17g", k, t, l, bound);
		}
	}
	return worst;
}

/* A matching from the public API; returns whether one was found. */
static bool
match(const fr_curve *a, const fr_curve *b, double eps, fr_match_pt **pts,
	  size_t *count, double *used)
{
	test_heap	h;
	fr_env		e = test_env(&h);
	bool		found;

	assert_int_equal(fr_matching(&e, a, b, eps, pts, count, &found, used, NULL), FR_OK);
	assert_int_equal(h.live, found ? 1 : 0);	/* only the result remains */
	return found;
}

/* 1,000 random pairs: the optimal matching is valid and its longest leash is d. */
static void
optimal_matchings_are_valid(void **state)
{
	for (int k = 0; k < 1000; k++)
	{
		size_t		n = 1 + test_rand64() % 30,
					m = 1 + test_rand64() % 30;
		double	   *ca = test_walk(n, 0, 0, 5),
				   *cb = k % 3 ? test_walk(m, 1, 1, 5) : test_jitter(ca, n, 2, 0.5);
		fr_curve	a,
					b;
		fr_match_pt *pts;
		size_t		count;
		double		used,
					d,
					worst;

		if (k % 3 == 0)
			m = n;
		a = (fr_curve) {ca, n, 2};
		b = (fr_curve) {cb, m, 2};
		d = test_distance(&a, &b);
		assert_true(match(&a, &b, -1, &pts, &count, &used));
		assert_true(used == d);
		worst = check_matching(&a, &b, pts, count, d, 1e-9);
		/* the longest leash of a matching is never below the distance */
		if (!test_close(worst, d, 1e-9))
			fail_msg("pair %d: longest leash %.17g, distance %.17g", k, worst, d);
		free(pts);
		free(ca);
		free(cb);
	}
}

/* With eps: a matching within eps when eps >= d, none when eps < d. */
static void
matchings_within_eps(void **state)
{
	for (int k = 0; k < 200; k++)
	{
		size_t		n = 2 + test_rand64() % 20,
					m = 2 + test_rand64() % 20;
		double	   *ca = test_walk(n, 0, 0, 5),
				   *cb = test_walk(m, 0, 0, 5);
		fr_curve	a = {ca, n, 2},
					b = {cb, m, 2};
		fr_match_pt *pts;
		size_t		count;
		double		used,
					d = test_distance(&a, &b);

		assert_true(match(&a, &b, d * 1.3, &pts, &count, &used));
		check_matching(&a, &b, pts, count, d * 1.3, 1e-12);
		free(pts);
		if (d > 0)
			assert_false(match(&a, &b, d * 0.99, &pts, &count, &used));
		free(ca);
		free(cb);
	}
}

/*
 * Quality (our documented approximation of locally correct matchings,
 * Buchin, Buchin, Meulemans & Speckmann 2012): two copies of a curve, one
 * with a single spike, are matched with a leash near 0 away from the spike.
 */
static void
spike_leaves_the_rest_matched_closely(void **state)
{
	const size_t n = 200,
				spike = 120;
	double	   *ca = malloc(2 * n * sizeof(double)),
			   *cb = malloc(2 * n * sizeof(double));
	fr_curve	a = {ca, n, 2},
				b = {cb, n, 2};
	fr_match_pt *pts;
	size_t		count;
	double		used;

	/* a street-like track: steady progress east with small wiggles */
	for (size_t i = 0; i < n; i++)
	{
		ca[2 * i] = 10.0 * i + test_uniform(-2, 2);
		ca[2 * i + 1] = test_uniform(-3, 3);
	}
	memcpy(cb, ca, 2 * n * sizeof(double));
	cb[2 * spike + 1] += 40;
	assert_true(match(&a, &b, -1, &pts, &count, &used));
	assert_true(used > 10);
	check_matching(&a, &b, pts, count, used, 1e-9);
	for (size_t k = 0; k < count; k++)
	{
		if (fabs(pts[k].a_pos - spike) <= 2.0 || fabs(pts[k].b_pos - spike) <= 2.0)
			continue;
		if (pts[k].leash > 1e-9 * used)
			fail_msg("breakpoint %zu at (%g, %g), away from the spike: leash %g",
					 k, pts[k].a_pos, pts[k].b_pos, pts[k].leash);
	}
	free(pts);
	free(ca);
	free(cb);
}

/* One-point curves: the point is matched to every vertex of the other. */
static void
point_matchings(void **state)
{
	const double pt[] = {0, 0};
	const double line[] = {3, 4, 0, 1, -6, 8};
	fr_curve	a = {pt, 1, 2},
				b = {line, 3, 2};
	fr_match_pt *pts;
	size_t		count;
	double		used;

	assert_true(match(&a, &b, -1, &pts, &count, &used));
	assert_true(used == 10);
	assert_int_equal(count, 3);
	check_matching(&a, &b, pts, count, 10, 0);
	free(pts);
	assert_true(match(&b, &a, 10, &pts, &count, &used));
	check_matching(&b, &a, pts, count, 10, 0);
	free(pts);
	assert_false(match(&b, &a, 9.99, &pts, &count, &used));
}

/* A long pair exercises many checkpoint blocks; memory stays sub-quadratic. */
static void
long_pair_and_memory_bound(void **state)
{
	const size_t n = 3000,
				m = 2000;
	double	   *ca = test_walk(n, 0, 0, 3),
			   *cb = malloc(2 * m * sizeof(double));
	fr_curve	a = {ca, n, 2},
				b = {cb, m, 2};
	fr_match_pt *pts;
	size_t		count;
	double		used,
				d;

	for (size_t i = 0; i < m; i++)
	{
		double		pos = (double) i * (n - 1) / (m - 1);
		double		pt[2];

		fr_curve_point(&a, pos, pt);
		cb[2 * i] = pt[0] + test_uniform(-1, 1);
		cb[2 * i + 1] = pt[1] + test_uniform(-1, 1);
	}
	d = test_distance(&a, &b);
	assert_true(match(&a, &b, -1, &pts, &count, &used));
	assert_true(test_close(check_matching(&a, &b, pts, count, d, 1e-9), d, 1e-9));
	free(pts);
	/* the documented bound: 20k x 20k within the default 256 MB */
	assert_true(fr_matching_scratch_bytes(20000, 20000) < 256u * 1024 * 1024);
	/* checkpoints ~23 min sqrt(max); the distance search's curves and work ~200 bytes a vertex */
	assert_true(fr_matching_scratch_bytes(20000, 20000) < 23.0 * 20000 * sqrt(20000.0) + 200.0 * 40000 + 65536);
	free(ca);
	free(cb);
}

/* Engine contract: an interrupt stops the witness and frees everything. */
static void
matching_interrupt_frees(void **state)
{
	double	   *ca = test_walk(800, 0, 0, 1),
			   *cb = test_jitter(ca, 800, 2, 0.3);
	fr_curve	a = {ca, 800, 2},
				b = {cb, 800, 2};
	test_heap	h;
	fr_env		e = test_env(&h);
	fr_match_pt *pts;
	size_t		count;
	bool		found;
	double		used;

	h.interrupt_after = 5;
	assert_int_equal(fr_matching(&e, &a, &b, -1, &pts, &count, &found, &used, NULL), FR_EINTR);
	assert_int_equal(h.live, 0);
	assert_null(pts);
	free(ca);
	free(cb);
}

int
main(void)
{
	const struct CMUnitTest tests[] = {
		cmocka_unit_test(optimal_matchings_are_valid),
		cmocka_unit_test(matchings_within_eps),
		cmocka_unit_test(spike_leaves_the_rest_matched_closely),
		cmocka_unit_test(point_matchings),
		cmocka_unit_test(long_pair_and_memory_bound),
		cmocka_unit_test(matching_interrupt_frees),
	};

	return cmocka_run_group_tests_name("matching", tests, NULL, NULL);
}
