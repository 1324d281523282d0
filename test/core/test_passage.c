/*
 * test_passage.c - corridor search (src/core/passage.c): the stretch
 * matched whole against a part of the trip.  Checked against
 *   - the unwindowed partial matching of partial.c on the same pair with
 *     the roles reversed (our own slower reference): the same decisions at
 *     and around the distance, the same distance;
 *   - a brute-force search over trip parts with ends on a grid of 1/8 of
 *     an edge (the Fréchet distance is 1-Lipschitz in each curve: common
 *     practice), so passage <= brute <= passage + longest trip edge / 8;
 *   - GEOS (libgeos_c, Debian package libgeos-dev, LGPL-2.1): the passage
 *     distance is at least GEOSDistance from each end of the stretch to
 *     the trip (each end must be matched to some trip point), and at most
 *     GEOSFrechetDistance (discrete) between the stretch and any run of
 *     consecutive trip vertices (Eiter & Mannila 1994: the continuous
 *     distance never exceeds the discrete one).
 * And the passages of constructed trips: a loop driven twice, a stretch
 * driven backwards, a short stretch circled twice.
 */
#include <float.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdio.h>

#include <cmocka.h>

#include "bounds.h"
#include "geosutil.h"
#include "testutil.h"

#define PI 3.14159265358979323846

static bool
passes(const fr_curve *trip, const fr_curve *stretch, double eps)
{
	test_heap	h;
	fr_env		e = test_env(&h);
	bool		yes;

	assert_int_equal(fr_passes(&e, trip, stretch, eps, &yes, NULL), FR_OK);
	assert_int_equal(h.live, 0);
	return yes;
}

static double
passage_distance(const fr_curve *trip, const fr_curve *stretch)
{
	test_heap	h;
	fr_env		e = test_env(&h);
	double		d;

	assert_int_equal(fr_passage_distance(&e, trip, stretch, &d, NULL), FR_OK);
	assert_int_equal(h.live, 0);
	return d;
}

/* The reference: unwindowed partial matching, the stretch as partial.c's trip. */
static bool
reference_passes(const fr_curve *trip, const fr_curve *stretch, double eps)
{
	test_heap	h;
	fr_env		e = test_env(&h);
	bool		found;
	double		from,
				to,
				d;

	assert_int_equal(fr_partial_match(&e, stretch, trip, eps, &found, &from, &to, &d, NULL), FR_OK);
	assert_int_equal(h.live, 0);
	return found;
}

static double
reference_distance(const fr_curve *trip, const fr_curve *stretch)
{
	test_heap	h;
	fr_env		e = test_env(&h);
	double		d;

	assert_int_equal(fr_partial_distance(&e, stretch, trip, &d, NULL), FR_OK);
	assert_int_equal(h.live, 0);
	return d;
}

/* The passages at eps, copied out (caller frees); asserts no leak. */
static fr_passage *
passages(const fr_curve *trip, const fr_curve *stretch, double eps, size_t *count)
{
	test_heap	h;
	fr_env		e = test_env(&h);
	fr_passage *out,
			   *copy;

	assert_int_equal(fr_passages(&e, trip, stretch, eps, &out, count, NULL), FR_OK);
	copy = malloc((*count + 1) * sizeof(fr_passage));
	if (*count > 0)
		memcpy(copy, out, *count * sizeof(fr_passage));
	if (out)
		test_release(out, &h);
	assert_int_equal(h.live, 0);
	return copy;
}

/*
 * A random pair: a short stretch and a long trip; in half the cases the
 * trip drives a noisy copy of the stretch somewhere along its way.
 */
static void
make_pair(int k, double **tc, size_t *tn, double **sc, size_t *sn)
{
	size_t		n = 1 + test_rand64() % 6,
				before = test_rand64() % 25,
				after = test_rand64() % 25;
	double	   *s = test_walk(n, 0, 0, 5);
	double	   *t = malloc(2 * (n + before + after + 1) * sizeof(double));
	double	   *pre = test_walk(before + 1, 30, 30, 12),
			   *post = test_walk(after + 1, -30, 20, 12);
	size_t		m = 0;

	for (size_t i = 0; i < before; i++, m++)
		memcpy(t + 2 * m, pre + 2 * i, 2 * sizeof(double));
	for (size_t i = 0; i < n; i++, m++)
	{
		t[2 * m] = s[2 * i] + (k % 2 ? test_uniform(-1, 1) : test_uniform(-20, 20));
		t[2 * m + 1] = s[2 * i + 1] + (k % 2 ? test_uniform(-1, 1) : test_uniform(-20, 20));
	}
	for (size_t i = 0; i < after; i++, m++)
		memcpy(t + 2 * m, post + 2 * i, 2 * sizeof(double));
	free(pre);
	free(post);
	*tc = t;
	*tn = m;
	*sc = s;
	*sn = n;
}

/* Decisions and distance equal the unwindowed reference on 400 pairs. */
static void
equals_unwindowed_reference(void **state)
{
	for (int k = 0; k < 400; k++)
	{
		double	   *tc,
				   *sc;
		size_t		tn,
					sn;
		fr_curve	trip,
					stretch;
		double		d,
					ref;

		make_pair(k, &tc, &tn, &sc, &sn);
		trip = (fr_curve) {tc, tn, 2};
		stretch = (fr_curve) {sc, sn, 2};
		d = passage_distance(&trip, &stretch);
		ref = reference_distance(&trip, &stretch);
		if (d != ref)
			fail_msg("pair %d: passage distance %.17g, unwindowed %.17g", k, d, ref);
		/* the threshold contract */
		assert_true(passes(&trip, &stretch, d));
		if (d > 0)
			assert_false(passes(&trip, &stretch, d * (1 - 1e-9)));
		for (int i = 0; i < 4; i++)
		{
			double		eps = test_uniform(0, 2 * d + 1);

			if (passes(&trip, &stretch, eps) != reference_passes(&trip, &stretch, eps))
				fail_msg("pair %d, eps %.17g: windowed and unwindowed decisions differ", k, eps);
		}
		free(tc);
		free(sc);
	}
}

/* Brute force over trip parts, and GEOS's bounds, on 60 small pairs. */
static void
brute_force_and_geos_bounds(void **state)
{
	for (int k = 0; k < 60; k++)
	{
		size_t		n = 2 + test_rand64() % 4,
					m = 2 + test_rand64() % 7;
		double	   *sc = test_walk(n, 0, 0, 4),
				   *tc = test_walk(m, 0, 0, 6);
		fr_curve	stretch = {sc, n, 2},
					trip = {tc, m, 2};
		double		d = passage_distance(&trip, &stretch),
					brute = INFINITY,
					discrete = INFINITY,
					start_gap,
					end_gap;
		GEOSGeometry *gt = geos_line(tc, m),
				   *gs = geos_line(sc, n),
				   *g0 = geos_line(sc, 1),
				   *g1 = geos_line(sc + 2 * (n - 1), 1);

		for (double a = 0; a <= m - 1; a += 0.125)
			for (double b = a; b <= m - 1; b += 0.125)
			{
				size_t		pn;
				double	   *pc = test_part_of(&trip, a, b, &pn);
				fr_curve	part = {pc, pn, 2};
				double		e = test_distance(&stretch, &part);

				brute = fmin(brute, e);
				free(pc);
			}
		if (!(d <= brute * (1 + 1e-9) && brute <= d + fr_longest_edge(&trip) / 8 + 1e-9))
			fail_msg("pair %d: passage %.17g, brute force %.17g", k, d, brute);
		/* GEOS: both ends of the stretch meet the trip within d */
		assert_int_equal(GEOSDistance_r(geos, g0, gt, &start_gap), 1);
		assert_int_equal(GEOSDistance_r(geos, g1, gt, &end_gap), 1);
		assert_true(fmax(start_gap, end_gap) <= d * (1 + 1e-12) + 1e-12);
		/* GEOS: discrete distance to every run of trip vertices bounds d from above */
		for (size_t i = 0; i < m; i++)
			for (size_t j = i; j < m; j++)
			{
				GEOSGeometry *run = geos_line(tc + 2 * i, j - i + 1);
				double		g;

				assert_int_equal(GEOSFrechetDistance_r(geos, gs, run, &g), 1);
				discrete = fmin(discrete, g);
				GEOSGeom_destroy_r(geos, run);
			}
		assert_true(d <= discrete * (1 + 1e-12));
		GEOSGeom_destroy_r(geos, gt);
		GEOSGeom_destroy_r(geos, gs);
		GEOSGeom_destroy_r(geos, g0);
		GEOSGeom_destroy_r(geos, g1);
		free(sc);
		free(tc);
	}
}

/* A 300 m street, west to east, five vertices. */
static const double street[] = {0, 0, 75, 4, 150, 0, 225, -4, 300, 0};

/* Appends n points of the circle of radius r around (cx, cy) from angle a0 to a1. */
static size_t
arc(double *out, size_t m, double cx, double cy, double r, double a0, double a1, size_t n)
{
	for (size_t i = 0; i < n; i++)
	{
		double		a = a0 + (a1 - a0) * (double) i / (double) (n - 1);

		out[2 * m] = cx + r * cos(a);
		out[2 * m + 1] = cy + r * sin(a);
		m++;
	}
	return m;
}

/*
 * A bus drives the street, loops back around a block 200 m north, drives
 * it again and leaves: two passages, in order, each over the street's
 * length, each within eps and at its own distance; driving the street
 * backwards gives none.
 */
static void
loop_gives_two_passages(void **state)
{
	double		t[2 * 64];
	size_t		m = 0,
				count;
	fr_curve	stretch = {street, 5, 2},
				trip;
	fr_passage *ps;

	t[m * 2] = -200, t[m * 2 + 1] = 2, m++;
	for (int i = 0; i <= 6; i++, m++)
		t[2 * m] = 50.0 * i, t[2 * m + 1] = 3.0 * ((i % 2) ? 1 : -1);
	/* up and around: a half circle over the street, back to its west end */
	m = arc(t, m, 150, 0, 350, 0.05, PI - 0.05, 12);
	t[2 * m] = -200, t[2 * m + 1] = 0, m++;
	for (int i = 0; i <= 6; i++, m++)
		t[2 * m] = 50.0 * i, t[2 * m + 1] = -2.0 * ((i % 2) ? 1 : -1);
	t[2 * m] = 500, t[2 * m + 1] = 100, m++;
	trip = (fr_curve) {t, m, 2};

	ps = passages(&trip, &stretch, 15, &count);
	assert_int_equal(count, 2);
	assert_true(ps[0].trip_to < ps[1].trip_from);
	for (size_t k = 0; k < count; k++)
	{
		size_t		pn;
		double	   *pc = test_part_of(&trip, ps[k].trip_from, ps[k].trip_to, &pn);
		fr_curve	part = {pc, pn, 2};

		assert_true(ps[k].distance <= 15);
		assert_true(test_close(ps[k].distance, test_distance(&stretch, &part), 1e-12));
		free(pc);
	}
	/*
	 * The first passage lies on the first drive (vertices 1..7, from 0 to
	 * 300 m east), the second on the second (vertices 21..27); each runs
	 * from the point nearest the street's west end to the one nearest its
	 * east end, within a metre of vertices 1 and 7 (21 and 27).
	 */
	assert_true(fabs(ps[0].trip_from - 1) < 0.02 && fabs(ps[0].trip_to - 7) < 0.02);
	assert_true(fabs(ps[1].trip_from - 21) < 0.02 && fabs(ps[1].trip_to - 27) < 0.02);
	assert_true(passes(&trip, &stretch, 15));
	free(ps);

	/* the same trip backwards drives the street east to west: no passage */
	{
		double		r[2 * 64];

		for (size_t i = 0; i < m; i++)
			r[2 * i] = t[2 * (m - 1 - i)], r[2 * i + 1] = t[2 * (m - 1 - i) + 1];
		trip = (fr_curve) {r, m, 2};
		ps = passages(&trip, &stretch, 15, &count);
		assert_int_equal(count, 0);
		assert_false(passes(&trip, &stretch, 15));
		free(ps);
	}
}

/*
 * A stretch shorter than 2 eps (a 20 m crossing at eps 15) circled twice
 * at a radius of 60 m: two passages, not a continuum of them; the trip
 * never leaves the disc of the stretch's end while it waits there once,
 * so waiting gives one passage.
 */
static void
short_stretch_circled_twice(void **state)
{
	static const double crossing[] = {0, 0, 20, 0};
	double		t[2 * 80];
	size_t		m = 0,
				count;
	fr_curve	stretch = {crossing, 2, 2},
				trip;
	fr_passage *ps;

	/* two laps of a circle through the crossing, west to east at its bottom */
	m = arc(t, m, 10, 60, 60, -PI / 2 - 0.6, 3 * PI / 2 - 0.6 + 2 * PI, 60);
	trip = (fr_curve) {t, m, 2};
	ps = passages(&trip, &stretch, 15, &count);
	assert_int_equal(count, 2);
	assert_true(ps[0].trip_to < ps[1].trip_from);
	free(ps);

	/* parked on the crossing, pinging: one passage */
	m = 0;
	t[2 * m] = -40, t[2 * m + 1] = 0, m++;
	for (int i = 0; i < 10; i++, m++)
		t[2 * m] = 20 + 0.1 * (i % 3), t[2 * m + 1] = 0.2 * (i % 2);
	t[2 * m] = 20, t[2 * m + 1] = 200, m++;
	trip = (fr_curve) {t, m, 2};
	ps = passages(&trip, &stretch, 15, &count);
	assert_int_equal(count, 1);
	free(ps);
}

/* Passages exist exactly when fr_passes holds, are in order and within eps, on random pairs. */
static void
passages_agree_with_passes(void **state)
{
	for (int k = 0; k < 300; k++)
	{
		double	   *tc,
				   *sc;
		size_t		tn,
					sn,
					count;
		fr_curve	trip,
					stretch;
		double		eps;
		fr_passage *ps;

		make_pair(k, &tc, &tn, &sc, &sn);
		trip = (fr_curve) {tc, tn, 2};
		stretch = (fr_curve) {sc, sn, 2};
		eps = test_uniform(0, 1.5) * passage_distance(&trip, &stretch) + test_uniform(0, 1);
		ps = passages(&trip, &stretch, eps, &count);
		if ((count > 0) != passes(&trip, &stretch, eps))
			fail_msg("pair %d, eps %.17g: %zu passages but fr_passes says %d", k, eps, count,
					 passes(&trip, &stretch, eps));
		for (size_t i = 0; i < count; i++)
		{
			size_t		pn;
			double	   *pc = test_part_of(&trip, ps[i].trip_from, ps[i].trip_to, &pn);
			fr_curve	part = {pc, pn, 2};

			assert_true(ps[i].trip_from <= ps[i].trip_to);
			assert_true(i == 0 || ps[i - 1].trip_to <= ps[i].trip_from);
			assert_true(ps[i].distance <= eps * (1 + 1e-9) + 1e-12);
			assert_true(test_close(ps[i].distance, test_distance(&stretch, &part), 1e-9));
			free(pc);
		}
		free(ps);
		free(tc);
		free(sc);
	}
}

/*
 * The index's lower bounds (bounds.c) never exceed the passage distance:
 * from the trip's own summary and from unions with other trips' (an inner
 * node), with and without the stretch's hull, at several scales and
 * offsets.  A bound above the distance would make the index drop a trip
 * that frechet_passes keeps.
 */
static void
index_bounds_below_distance(void **state)
{
	for (int k = 0; k < 400; k++)
	{
		double	   *tc,
				   *sc,
				   *oc;
		size_t		tn,
					sn,
					on = 1 + test_rand64() % 10,
					nhull;
		double		scale = (k % 4 == 0) ? 1e-6 : (k % 4 == 1) ? 1e6 : 1,
					shift = (k % 3 == 0) ? 1e7 : 0;
		fr_curve	trip,
					stretch,
					other;
		fr_key		tkey,
					skey,
					okey,
					node;
		double		d,
					sorted[64],
					hull[128];

		make_pair(k, &tc, &tn, &sc, &sn);
		oc = test_walk(on, -50, -50, 20);
		for (size_t i = 0; i < 2 * tn; i++)
			tc[i] = tc[i] * scale + shift;
		for (size_t i = 0; i < 2 * sn; i++)
			sc[i] = sc[i] * scale + shift;
		for (size_t i = 0; i < 2 * on; i++)
			oc[i] = oc[i] * scale + shift;
		trip = (fr_curve) {tc, tn, 2};
		stretch = (fr_curve) {sc, sn, 2};
		other = (fr_curve) {oc, on, 2};
		d = passage_distance(&trip, &stretch);
		fr_key_of_curve(&trip, &tkey);
		fr_key_of_curve(&stretch, &skey);
		fr_key_of_curve(&other, &okey);
		node = tkey;
		fr_key_union(&node, &okey);
		nhull = fr_convex_hull(&stretch, sorted, hull);
		if (!(fr_key_passage_bound(&tkey, &skey) <= d &&
			  fr_key_passage_bound(&node, &skey) <= d &&
			  fr_key_passage_hull_bound(&tkey, &skey, hull, nhull) <= d &&
			  fr_key_passage_hull_bound(&node, &skey, hull, nhull) <= d))
			fail_msg("pair %d: a bound %.17g / %.17g above the passage distance %.17g", k,
					 fr_key_passage_bound(&tkey, &skey),
					 fr_key_passage_hull_bound(&tkey, &skey, hull, nhull), d);
		free(tc);
		free(sc);
		free(oc);
	}
}

/*
 * The cheap verdicts never contradict the sweeps: FR_FAR only when
 * fr_passes is false, FR_NEAR only when it is true, at and around the
 * passage distance (one part in 1e9 either side) and at random tolerances;
 * and both verdicts occur.
 */
static void
cheap_verdicts_agree(void **state)
{
	int			far = 0,
				near = 0;

	for (int k = 0; k < 400; k++)
	{
		double	   *tc,
				   *sc;
		size_t		tn,
					sn;
		fr_curve	trip,
					stretch;
		double		d,
					tries[5];

		make_pair(k, &tc, &tn, &sc, &sn);
		trip = (fr_curve) {tc, tn, 2};
		stretch = (fr_curve) {sc, sn, 2};
		d = passage_distance(&trip, &stretch);
		tries[0] = d;
		tries[1] = d * (1 + 1e-9);
		tries[2] = d * (1 - 1e-9);
		tries[3] = test_uniform(0, 2 * d + 1);
		tries[4] = 3 * d + 1;
		for (int i = 0; i < 5; i++)
		{
			fr_verdict	v = fr_passes_cheap(&trip, &stretch, tries[i]);
			bool		yes = passes(&trip, &stretch, tries[i]);

			if ((v == FR_FAR && yes) || (v == FR_NEAR && !yes))
				fail_msg("pair %d, eps %.17g: cheap verdict %d, sweep %d", k, tries[i], v, yes);
			far += v == FR_FAR;
			near += v == FR_NEAR;
		}
		free(tc);
		free(sc);
	}
	assert_true(far > 0 && near > 0);
}

int
main(void)
{
	const struct CMUnitTest tests[] = {
		cmocka_unit_test(equals_unwindowed_reference),
		cmocka_unit_test(brute_force_and_geos_bounds),
		cmocka_unit_test(loop_gives_two_passages),
		cmocka_unit_test(short_stretch_circled_twice),
		cmocka_unit_test(passages_agree_with_passes),
		cmocka_unit_test(index_bounds_below_distance),
		cmocka_unit_test(cheap_verdicts_agree),
	};
	int			rc;

	geos = GEOS_init_r();
	rc = cmocka_run_group_tests_name("passage", tests, NULL, NULL);
	GEOS_finish_r(geos);
	return rc;
}
