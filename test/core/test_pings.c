/*
 * test_pings.c - sparse pings matched in order to a route (pings.c),
 * against a slow reference of our own: the same problem with the route
 * positions restricted to a fine grid, solved by dynamic programming with
 * plain hypot distances.  Grid positions are valid positions, so the grid
 * answer bounds the exact one from above; rounding each position of an
 * exact matching to the nearest grid point keeps the order and moves each
 * leash by at most half a step (distance to a point moving along the route
 * changes no faster than the point: the triangle inequality), so the grid
 * answer exceeds the exact one by at most half a step (and, with max_gap,
 * needs max_gap plus one step).
 */
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdio.h>

#include <cmocka.h>

#include "testutil.h"

/* The route point at arc length s (2-D raw curve with cumulative lengths cum). */
static void
route_point(const double *r, size_t m, const double *cum, double s, double *x, double *y)
{
	size_t		k = 0;

	while (k + 2 < m && cum[k + 1] < s)
		k++;
	{
		double		len = cum[k + 1] - cum[k],
					t = len > 0 ? (s - cum[k]) / len : 0;

		t = t < 0 ? 0 : t > 1 ? 1 : t;
		*x = r[2 * k] + t * (r[2 * k + 2] - r[2 * k]);
		*y = r[2 * k + 1] + t * (r[2 * k + 3] - r[2 * k + 1]);
	}
}

/*
 * The ping distance with positions on a grid of g + 1 equal steps of arc
 * length (gap < 0: no max_gap); step receives the grid step.
 */
static double
grid_reference(const double *p, size_t n, const double *r, size_t m, double gap, size_t g,
			   double *step)
{
	double	   *cum = malloc(m * sizeof(double)),
			   *gx = malloc((g + 1) * sizeof(double)),
			   *gy = malloc((g + 1) * sizeof(double)),
			   *prev = malloc((g + 1) * sizeof(double)),
			   *cur = malloc((g + 1) * sizeof(double));
	double		total,
				best;

	cum[0] = 0;
	for (size_t k = 0; k + 1 < m; k++)
		cum[k + 1] = cum[k] + hypot(r[2 * k + 2] - r[2 * k], r[2 * k + 3] - r[2 * k + 1]);
	total = cum[m - 1];
	*step = total / g;
	for (size_t j = 0; j <= g; j++)
		route_point(r, m, cum, j == g ? total : j * *step, &gx[j], &gy[j]);
	for (size_t j = 0; j <= g; j++)
		prev[j] = j == 0 ? hypot(p[0] - gx[0], p[1] - gy[0]) : INFINITY;
	for (size_t i = 1; i < n; i++)
	{
		for (size_t j = 0; j <= g; j++)
		{
			double		m_before = INFINITY,
						d = hypot(p[2 * i] - gx[j], p[2 * i + 1] - gy[j]);

			for (size_t u = 0; u <= j; u++)
				if (gap < 0 || (double) (j - u) * *step <= gap * (1 + 1e-12))
					m_before = fmin(m_before, prev[u]);
			cur[j] = fmax(d, m_before);
		}
		memcpy(prev, cur, (g + 1) * sizeof(double));
	}
	best = n == 1 ? INFINITY : prev[g];
	free(cum);
	free(gx);
	free(gy);
	free(prev);
	free(cur);
	return best;
}

/* Engine ping distance on raw 2-D curves. */
static double
pings_distance(const double *p, size_t n, const double *r, size_t m, double gap)
{
	test_heap	h;
	fr_env		e = test_env(&h);
	fr_curve	pc = {p, n, 2},
				rc = {r, m, 2};
	double		d = -1;

	assert_int_equal(fr_pings_distance(&e, &pc, &rc, gap, &d, NULL), FR_OK);
	assert_int_equal(h.live, 0);
	return d;
}

/* Engine ping decision on raw 2-D curves. */
static bool
pings_decide(const double *p, size_t n, const double *r, size_t m, double eps, double gap)
{
	test_heap	h;
	fr_env		e = test_env(&h);
	fr_curve	pc = {p, n, 2},
				rc = {r, m, 2};
	bool		yes = false;

	assert_int_equal(fr_pings_decide(&e, &pc, &rc, eps, gap, &yes), FR_OK);
	assert_int_equal(h.live, 0);
	return yes;
}

/* The distance is the decision's threshold: accepted at d, rejected one double below. */
static void
assert_threshold(const double *p, size_t n, const double *r, size_t m, double gap, double d)
{
	if (isinf(d))
	{
		assert_false(pings_decide(p, n, r, m, 1e300, gap));
		return;
	}
	assert_true(pings_decide(p, n, r, m, d, gap));
	if (d > 0)
		assert_false(pings_decide(p, n, r, m, nextafter(d, 0), gap));
}

/* Random pings and routes: bracketed by the grid reference, with and without max_gap. */
static void
matches_the_grid_reference(void **state)
{
	for (int trial = 0; trial < 400; trial++)
	{
		size_t		n = 2 + test_rand64() % 8,
					m = 2 + test_rand64() % 6;
		double	   *r = test_walk(m, 0, 0, 10),
				   *p = test_jitter(r, 1, 2, 3),
				   *pings = malloc(2 * n * sizeof(double)),
					step,
					len = 0;
		double		gap = -1;

		/* pings scattered around the route, the first near its start, the last near its end */
		for (size_t k = 0; k + 1 < m; k++)
			len += hypot(r[2 * k + 2] - r[2 * k], r[2 * k + 3] - r[2 * k + 1]);
		for (size_t i = 0; i < n; i++)
		{
			size_t		k = i == 0 ? 0 : i == n - 1 ? m - 1 : test_rand64() % m;

			pings[2 * i] = r[2 * k] + test_uniform(-4, 4);
			pings[2 * i + 1] = r[2 * k + 1] + test_uniform(-4, 4);
		}
		if (trial % 2)
			gap = test_uniform(0.3, 1.2) * len / (double) (n - 1) * 2;
		{
			double		d = pings_distance(pings, n, r, m, gap),
						ref = grid_reference(pings, n, r, m, gap, 1500, &step),
						ref_wide = gap < 0 ? ref : grid_reference(pings, n, r, m, gap + step, 1500, &step);

			assert_threshold(pings, n, r, m, gap, d);
			/* grid positions are positions: the grid answer is never below */
			assert_true(d <= ref * (1 + 1e-12) + 1e-12 || isinf(ref));
			/* and the exact matching rounded to the grid costs at most half a step more */
			if (!isinf(d))
				assert_true(ref_wide <= d + step / 2 + 1e-9);
			else
				assert_true(isinf(ref));
		}
		free(r);
		free(p);
		free(pings);
	}
}

/*
 * The cheap verdicts (fr_pings_cheap, the greedy scan on the input
 * coordinates) never contradict the exact threshold: FR_NEAR only at or
 * above the ping distance, FR_FAR only below it, at the distance, one
 * double below it, one part in 1e9 either side and at random tolerances;
 * both verdicts occur, and max_gap gets none.
 */
static void
cheap_verdicts_agree(void **state)
{
	int			near = 0,
				far = 0;

	for (int trial = 0; trial < 400; trial++)
	{
		size_t		n = 2 + test_rand64() % 12,
					m = 2 + test_rand64() % 10;
		double	   *r = test_walk(m, 1e6 * (trial % 3), 0, 10),
				   *pings = malloc(2 * n * sizeof(double));
		fr_curve	pc,
					rc = {r, m, 2};
		double		d,
					tries[6];

		for (size_t i = 0; i < n; i++)
		{
			size_t		k = i == 0 ? 0 : i == n - 1 ? m - 1 : test_rand64() % m;

			pings[2 * i] = r[2 * k] + test_uniform(-4, 4);
			pings[2 * i + 1] = r[2 * k + 1] + test_uniform(-4, 4);
		}
		pc = (fr_curve) {pings, n, 2};
		d = pings_distance(pings, n, r, m, -1);
		tries[0] = d;
		tries[1] = nextafter(d, 0);
		tries[2] = d * (1 + 1e-9);
		tries[3] = d * (1 - 1e-9);
		tries[4] = test_uniform(0, 2 * d);
		tries[5] = test_uniform(0, 2 * d);
		for (int i = 0; i < 6; i++)
		{
			fr_verdict	v = fr_pings_cheap(&pc, &rc, tries[i], -1);

			if ((v == FR_NEAR && tries[i] < d) || (v == FR_FAR && tries[i] >= d))
				fail_msg("trial %d: verdict %d at eps %.17g, ping distance %.17g", trial, v, tries[i], d);
			near += v == FR_NEAR;
			far += v == FR_FAR;
		}
		assert_int_equal(fr_pings_cheap(&pc, &rc, d, 1e9), FR_UNDECIDED);
		free(r);
		free(pings);
	}
	assert_true(near > 0 && far > 0);
}

/*
 * Never above the continuous Fréchet distance (the vertices of an optimal
 * continuous matching are a ping matching), on random walks.
 */
static void
never_above_the_continuous_distance(void **state)
{
	for (int trial = 0; trial < 300; trial++)
	{
		size_t		n = 1 + test_rand64() % 12,
					m = 1 + test_rand64() % 12;
		double	   *p = test_walk(n, 0, 0, 3),
				   *r = test_walk(m, 0.5, -0.5, 3);
		fr_curve	pc = {p, n, 2},
					rc = {r, m, 2};
		double		d = pings_distance(p, n, r, m, -1),
					cont = test_distance(&pc, &rc);

		assert_true(d <= cont);
		assert_threshold(p, n, r, m, -1, d);
		free(p);
		free(r);
	}
}

/* A route of city blocks with right-angle corners: (0,0) east 400, north 300, east 400, north 300. */
static const double blocks[] = {0, 0, 400, 0, 400, 300, 800, 300, 800, 600};

/*
 * Pings along a polyline at the given arc lengths (2-D raw), each moved by
 * up to noise on each axis.
 */
static double *
pings_at(const double *r, size_t m, const double *arc, size_t n, double noise)
{
	double	   *cum = malloc(m * sizeof(double)),
			   *p = malloc(2 * n * sizeof(double));

	cum[0] = 0;
	for (size_t k = 0; k + 1 < m; k++)
		cum[k + 1] = cum[k] + hypot(r[2 * k + 2] - r[2 * k], r[2 * k + 3] - r[2 * k + 1]);
	for (size_t i = 0; i < n; i++)
	{
		route_point(r, m, cum, arc[i], &p[2 * i], &p[2 * i + 1]);
		p[2 * i] += test_uniform(-noise, noise);
		p[2 * i + 1] += test_uniform(-noise, noise);
	}
	free(cum);
	return p;
}

/*
 * Sparse pings along a street route with corners: a bus pinged every 30 s
 * at 5 to 10 m/s (150 to 300 m apart), each ping within 12 m of the route.
 * Corners fall between pings, so the continuous distance is the chord
 * across a corner (over 75 m), while the ping distance is at most the
 * noise.  Driven backwards, with the middle skipped (caught by max_gap) or
 * with a 200 m detour, the pings fail.
 */
static void
sparse_pings_on_street_corners(void **state)
{
	const size_t m = 5,
				n = 7;
	/* corners at arc lengths 400, 700 and 1100 */
	const double arc[] = {0, 250, 550, 850, 1000, 1300, 1400};
	const double gap = 450;		/* 1.5 times the longest drive between pings */
	fr_curve	rc = {blocks, m, 2};

	for (int trial = 0; trial < 50; trial++)
	{
		double	   *p = pings_at(blocks, m, arc, n, 12 / sqrt(2));
		fr_curve	pc = {p, n, 2};
		double		back[2 * 7],
					skip[2 * 7];

		assert_true(test_distance(&pc, &rc) > 75);
		assert_true(pings_decide(p, n, blocks, m, 50, -1));
		assert_true(pings_distance(p, n, blocks, m, -1) <= 12);
		assert_true(pings_decide(p, n, blocks, m, 50, gap));

		/* driven backwards */
		for (size_t i = 0; i < n; i++)
		{
			back[2 * i] = p[2 * (n - 1 - i)];
			back[2 * i + 1] = p[2 * (n - 1 - i) + 1];
		}
		assert_false(pings_decide(back, n, blocks, m, 50, -1));

		/* the middle skipped: pings 2 to 4 at the fifth ping's place */
		memcpy(skip, p, sizeof(skip));
		for (size_t i = 2; i <= 4; i++)
		{
			skip[2 * i] = p[2 * 5];
			skip[2 * i + 1] = p[2 * 5 + 1];
		}
		assert_true(pings_decide(skip, n, blocks, m, 50, -1));	/* unseen without a gap */
		assert_false(pings_decide(skip, n, blocks, m, 50, gap));

		/* a detour: one ping 200 m off the route, between its neighbours */
		memcpy(skip, p, sizeof(skip));
		skip[2 * 3 + 1] += 200;
		assert_false(pings_decide(skip, n, blocks, m, 50, -1));
		assert_true(pings_distance(skip, n, blocks, m, -1) >= 150);
		free(p);
	}
}

/* Engine ping excursions on raw 2-D curves; returns the count, *off_pings the pings in runs. */
static size_t
pings_excursions(const double *p, size_t n, const double *r, size_t m, double eps, size_t *off_pings)
{
	test_heap	h;
	fr_env		e = test_env(&h);
	fr_curve	pc = {p, n, 2},
				rc = {r, m, 2};
	fr_excursion *x = NULL;
	size_t		count = 0;

	assert_int_equal(fr_pings_excursions(&e, &pc, &rc, eps, &x, &count), FR_OK);
	*off_pings = 0;
	for (size_t k = 0; k < count; k++)
	{
		assert_true(x[k].trip_from <= x[k].trip_to);
		assert_true(x[k].route_from <= x[k].route_to);
		assert_true(x[k].max_leash > eps || n == 1);
		*off_pings += (size_t) (x[k].trip_to - x[k].trip_from) + 1;
	}
	if (x)
		test_release(x, &h);
	assert_int_equal(h.live, 0);
	return count;
}

/*
 * The fewest off-route pings, by brute force over every subset: a subset
 * can stay on the route when the decision accepts its pings in order,
 * framed by the route's own start (if the first ping is off-route, its
 * place is still the start) and end.
 */
static size_t
fewest_off_brute(const double *p, size_t n, const double *r, size_t m, double eps)
{
	size_t		best = n;
	double	   *sub = malloc(2 * (n + 2) * sizeof(double));

	for (unsigned mask = 0; mask < (1u << n); mask++)
	{
		size_t		k = 0,
					offs = (size_t) __builtin_popcount(mask);

		if (offs >= best)
			continue;
		if (mask & 1u)
		{
			sub[2 * k] = r[0];
			sub[2 * k + 1] = r[1];
			k++;
		}
		for (size_t i = 0; i < n; i++)
			if (!(mask & (1u << i)))
			{
				sub[2 * k] = p[2 * i];
				sub[2 * k + 1] = p[2 * i + 1];
				k++;
			}
		if (mask & (1u << (n - 1)))
		{
			sub[2 * k] = r[2 * (m - 1)];
			sub[2 * k + 1] = r[2 * (m - 1) + 1];
			k++;
		}
		if (k >= 2 && pings_decide(sub, k, r, m, eps, -1))
			best = offs;
	}
	free(sub);
	return best;
}

/*
 * Excursions: none exactly when the decision accepts; the off-route pings
 * they hold are the fewest possible (brute force over subsets on small
 * cases); a detour ping is the one excursion of a street trip.
 */
static void
excursions_are_the_fewest_off_route_pings(void **state)
{
	for (int trial = 0; trial < 300; trial++)
	{
		size_t		n = 2 + test_rand64() % 8,
					m = 2 + test_rand64() % 5,
					off_pings;
		double	   *r = test_walk(m, 0, 0, 10),
				   *p = malloc(2 * n * sizeof(double)),
					eps = test_uniform(1, 5);

		for (size_t i = 0; i < n; i++)
		{
			size_t		k = i == 0 ? 0 : i == n - 1 ? m - 1 : test_rand64() % m;

			p[2 * i] = r[2 * k] + test_uniform(-6, 6);
			p[2 * i + 1] = r[2 * k + 1] + test_uniform(-6, 6);
		}
		{
			size_t		runs = pings_excursions(p, n, r, m, eps, &off_pings);

			assert_true((runs == 0) == pings_decide(p, n, r, m, eps, -1));
			assert_int_equal(off_pings, fewest_off_brute(p, n, r, m, eps));
		}
		free(r);
		free(p);
	}
	{
		const double arc[] = {0, 250, 550, 850, 1000, 1300, 1400};
		double	   *p = pings_at(blocks, 5, arc, 7, 5);
		size_t		off_pings;

		p[2 * 3 + 1] += 200;
		assert_int_equal(pings_excursions(p, 7, blocks, 5, 50, &off_pings), 1);
		assert_int_equal(off_pings, 1);
		free(p);
	}
}

/* Small cases worked by hand. */
static void
worked_examples(void **state)
{
	const double route[] = {0, 0, 10, 0};
	const double one[] = {5, 3};
	const double two[] = {0, 1, 10, -2};
	const double back_and_forth[] = {0, 0, 8, 1, 2, 1, 10, 0};
	const double point_route[] = {1, 1};
	double		d;

	/* one ping: within eps of the whole route, its farthest vertex: hypot(5, 3) */
	d = pings_distance(one, 1, route, 2, -1);
	assert_true(d == hypot(5, 3));
	/* two pings: the end distances, 1 and 2 */
	assert_true(pings_distance(two, 2, route, 2, -1) == 2);
	/* back and forth: ping 3 at x=2 must sit at or after x=8 where ping 2 sits: the
	 * best positions meet at x=5 (ping 2 at 3 from x=8 ... both sqrt(9 + 1)) */
	d = pings_distance(back_and_forth, 4, route, 2, -1);
	assert_true(test_close(d, sqrt(10), 1e-12));
	/* a route of one point: the farthest ping */
	assert_true(test_close(pings_distance(two, 2, point_route, 1, -1), hypot(9, 3), 1e-15));
	/* max_gap: two pings on a route of length 10 need a gap of 10; below, no eps works */
	assert_true(isinf(pings_distance(two, 2, route, 2, 9.5)));
	assert_true(pings_distance(two, 2, route, 2, 10) == 2);
}

/*
 * A max_gap only removes matchings, so it never lowers the distance (found
 * by fuzzing): after a route segment of 1e17 every place on the next,
 * short one has the same arc length, and ordered by arc length a ping
 * could step back there.  Pings at y = 8 then y = 2 beside a 10-long
 * final segment: the second must sit at or after the first, eps = 3.
 */
static void
gap_keeps_the_order_past_a_long_segment(void **state)
{
	const double route[] = {0, 0, 1e17, 0, 1e17, 10};
	const double pings[] = {0, 0, 1e17, 8, 1e17, 2, 1e17, 10};
	double		plain = pings_distance(pings, 4, route, 3, -1);

	assert_true(test_close(plain, 3, 1e-12));
	assert_true(pings_distance(pings, 4, route, 3, 1e18) == plain);
	assert_true(pings_distance(pings, 4, route, 3, 1e17 + 64) == plain);
}

int
main(void)
{
	const struct CMUnitTest tests[] = {
		cmocka_unit_test(worked_examples),
		cmocka_unit_test(matches_the_grid_reference),
		cmocka_unit_test(never_above_the_continuous_distance),
		cmocka_unit_test(sparse_pings_on_street_corners),
		cmocka_unit_test(excursions_are_the_fewest_off_route_pings),
		cmocka_unit_test(gap_keeps_the_order_past_a_long_segment),
		cmocka_unit_test(cheap_verdicts_agree),
	};

	return cmocka_run_group_tests_name("pings", tests, NULL, NULL);
}
