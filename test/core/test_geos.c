/*
 * test_geos.c - checks against sources outside the project:
 *   - GEOS (libgeos_c, Debian package libgeos-dev, LGPL-2.1): its discrete
 *     Fréchet distance, GEOSFrechetDistance_r, and its densified variant
 *     GEOSFrechetDistanceDensify_r;
 *   - Eiter & Mannila 1994: d <= d_discrete <= d + longest edge.
 */
#include <float.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdio.h>

#include <cmocka.h>

#include "geosutil.h"
#include "testutil.h"

#define PAIRS 1200

/* One generated pair: kind 0 random, 1 near-identical, 2 near 1e7, 3 near-identical near 1e7. */
static void
make_pair(int kind, double **a, size_t *n, double **b, size_t *m)
{
	double		off = kind >= 2 ? 1e7 : 0;

	*n = 2 + test_rand64() % 40;
	*a = test_walk(*n, off + test_uniform(-50, 50), off + test_uniform(-50, 50), 20);
	if (kind == 1 || kind == 3)
	{
		*m = *n;
		*b = test_jitter(*a, *n, 2, 1e-6);
	}
	else
	{
		*m = 2 + test_rand64() % 40;
		*b = test_walk(*m, off + test_uniform(-50, 50), off + test_uniform(-50, 50), 20);
	}
}

/* Our engine, one call, asserting success and no leaked scratch memory. */
static double
ours(int which, const double *a, size_t n, const double *b, size_t m)
{
	test_heap	h;
	fr_env		e = test_env(&h);
	fr_curve	p = {a, n, 2},
				q = {b, m, 2};
	double		d = -1;

	assert_int_equal(which ? fr_discrete_distance(&e, &p, &q, &d)
					 : fr_distance(&e, &p, &q, &d, NULL), FR_OK);
	assert_int_equal(h.live, 0);
	return d;
}

/* GEOS discrete Fréchet equals ours to 1e-12 relative on PAIRS pairs. */
static void
discrete_matches_geos(void **state)
{
	for (int k = 0; k < PAIRS; k++)
	{
		double	   *a,
				   *b,
					g;
		size_t		n,
					m;
		GEOSGeometry *ga,
				   *gb;

		make_pair(k % 4, &a, &n, &b, &m);
		ga = geos_line(a, n);
		gb = geos_line(b, m);
		assert_int_equal(GEOSFrechetDistance_r(geos, ga, gb, &g), 1);
		if (!test_close(ours(1, a, n, b, m), g, 1e-12))
			fail_msg("pair %d: ours %.17g, GEOS %.17g", k, ours(1, a, n, b, m), g);
		GEOSGeom_destroy_r(geos, ga);
		GEOSGeom_destroy_r(geos, gb);
		free(a);
		free(b);
	}
}

/*
 * Eiter & Mannila 1994 on the same pairs: continuous <= discrete <=
 * continuous + longest edge, with the discrete value taken from GEOS.  And
 * with GEOS's densified discrete value (each segment cut into 1/frac
 * pieces) within the same kind of bound, using the densified longest edge.
 */
static void
continuous_within_eiter_mannila_bounds_of_geos(void **state)
{
	const double frac = 0.125;

	for (int k = 0; k < PAIRS; k++)
	{
		double	   *a,
				   *b,
					g,
					gd,
					d,
					edge;
		size_t		n,
					m;
		GEOSGeometry *ga,
				   *gb;
		fr_curve	ca,
					cb;

		make_pair(k % 4, &a, &n, &b, &m);
		ga = geos_line(a, n);
		gb = geos_line(b, m);
		ca = (fr_curve) {a, n, 2};
		cb = (fr_curve) {b, m, 2};
		edge = fmax(fr_longest_edge(&ca), fr_longest_edge(&cb));
		assert_int_equal(GEOSFrechetDistance_r(geos, ga, gb, &g), 1);
		assert_int_equal(GEOSFrechetDistanceDensify_r(geos, ga, gb, frac, &gd), 1);
		d = ours(0, a, n, b, m);
		/* slack: relative rounding of the compared values */
		{
			double		tol = 1e-12 * fmax(d, g);

			if (!(d <= g + tol && g <= d + edge + tol))
				fail_msg("pair %d: d %.17g, GEOS discrete %.17g, edge %g", k, d, g, edge);
			if (!(d <= gd + tol && gd <= d + frac * edge + tol))
				fail_msg("pair %d: d %.17g, GEOS densified %.17g, edge %g", k, d, gd, frac * edge);
		}
		GEOSGeom_destroy_r(geos, ga);
		GEOSGeom_destroy_r(geos, gb);
		free(a);
		free(b);
	}
}

/* Diagonal of the bounding box of two 2-D curves. */
static double
extent_of(const fr_curve *a, const fr_curve *b)
{
	double		lo[2] = {INFINITY, INFINITY},
				hi[2] = {-INFINITY, -INFINITY};
	const fr_curve *c[2] = {a, b};

	for (int k = 0; k < 2; k++)
		for (size_t i = 0; i < c[k]->n; i++)
			for (int d = 0; d < 2; d++)
			{
				lo[d] = fmin(lo[d], c[k]->coords[2 * i + d]);
				hi[d] = fmax(hi[d], c[k]->coords[2 * i + d]);
			}
	return hypot(hi[0] - lo[0], hi[1] - lo[1]);
}

/*
 * The bottleneck (the longest leash of our optimal matching) equals the
 * distance and is at least GEOS's densified discrete Fréchet distance minus
 * the Eiter & Mannila 1994 slack (the longest densified edge).
 */
static void
bottleneck_against_geos(void **state)
{
	const double frac = 0.125;

	for (int k = 0; k < 400; k++)
	{
		double	   *a,
				   *b,
					gd,
					d,
					used,
					worst = 0,
					edge;
		size_t		n,
					m,
					count;
		GEOSGeometry *ga,
				   *gb;
		fr_curve	ca,
					cb;
		fr_match_pt *pts;
		bool		found;
		test_heap	h;
		fr_env		e = test_env(&h);

		make_pair(k % 4, &a, &n, &b, &m);
		ga = geos_line(a, n);
		gb = geos_line(b, m);
		ca = (fr_curve) {a, n, 2};
		cb = (fr_curve) {b, m, 2};
		edge = fmax(fr_longest_edge(&ca), fr_longest_edge(&cb));
		assert_int_equal(GEOSFrechetDistanceDensify_r(geos, ga, gb, frac, &gd), 1);
		d = ours(0, a, n, b, m);
		assert_int_equal(fr_matching(&e, &ca, &cb, -1, &pts, &count, &found, &used, NULL), FR_OK);
		assert_true(found);
		for (size_t i = 0; i < count; i++)
			worst = fmax(worst, pts[i].leash);
		/*
		 * Equal to 1e-9 relative, or to rounding of the breakpoint positions
		 * (a few ulps of the curves' extent) for nearly identical curves.
		 */
		if (!(fabs(worst - d) <= fmax(1e-9 * d, 8 * DBL_EPSILON * extent_of(&ca, &cb))))
			fail_msg("pair %d (kind %d): bottleneck %.17g, distance %.17g", k, k % 4, worst, d);
		if (!(worst >= gd - frac * edge - 1e-12 * gd))
			fail_msg("pair %d: bottleneck %.17g, GEOS densified %.17g", k, worst, gd);
		free(pts);
		GEOSGeom_destroy_r(geos, ga);
		GEOSGeom_destroy_r(geos, gb);
		free(a);
		free(b);
	}
}

int
main(void)
{
	const struct CMUnitTest tests[] = {
		cmocka_unit_test(discrete_matches_geos),
		cmocka_unit_test(continuous_within_eiter_mannila_bounds_of_geos),
		cmocka_unit_test(bottleneck_against_geos),
	};
	int			rc;

	geos = GEOS_init_r();
	rc = cmocka_run_group_tests_name("geos_reference", tests, NULL, NULL);
	GEOS_finish_r(geos);
	return rc;
}
