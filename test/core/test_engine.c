/*
 * test_engine.c - unit tests of the engine (cmocka).  Each check names its
 * source: a published result (paper) or common practice.
 */
#include <float.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdio.h>

#include <cmocka.h>

#include "testutil.h"
#include "fr_internal.h"

/* Continuous distance through the public API, asserting success and no leak. */
static double
dist2(const double *a, size_t n, const double *b, size_t m)
{
	test_heap	h;
	fr_env		e = test_env(&h);
	fr_curve	p = {a, n, 2},
				q = {b, m, 2};
	double		d = -1;

	assert_int_equal(fr_distance(&e, &p, &q, &d, NULL), FR_OK);
	assert_int_equal(h.live, 0);
	return d;
}

/* Decision through the public API (fast or plain), asserting success and no leak. */
static bool
decide2(const double *a, size_t n, const double *b, size_t m, double eps, bool plain)
{
	test_heap	h;
	fr_env		e = test_env(&h);
	fr_curve	p = {a, n, 2},
				q = {b, m, 2};
	bool		yes;

	assert_int_equal(plain ? fr_decide_plain(&e, &p, &q, eps, &yes, NULL)
					 : fr_decide(&e, &p, &q, eps, &yes, NULL), FR_OK);
	assert_int_equal(h.live, 0);
	return yes;
}

/* Discrete distance through the public API. */
static double
discrete2(const double *a, size_t n, const double *b, size_t m)
{
	test_heap	h;
	fr_env		e = test_env(&h);
	fr_curve	p = {a, n, 2},
				q = {b, m, 2};
	double		d = -1;

	assert_int_equal(fr_discrete_distance(&e, &p, &q, &d), FR_OK);
	assert_int_equal(h.live, 0);
	return d;
}

/* Euclidean distance between 2-D vertices i of a and j of b. */
static double
vdist(const double *a, size_t i, const double *b, size_t j)
{
	double		dx = a[2 * i] - b[2 * j],
				dy = a[2 * i + 1] - b[2 * j + 1];

	return sqrt(dx * dx + dy * dy);
}

/*
 * Alt & Godau 1995 (Lemma 1 and the convexity of the free space of one
 * cell): two single segments are at distance max(|a0-b0|, |a1-b1|).
 */
static void
two_segments_take_the_larger_end_distance(void **state)
{
	for (int k = 0; k < 500; k++)
	{
		double		a[4],
					b[4];

		for (int i = 0; i < 4; i++)
		{
			a[i] = test_uniform(-100, 100);
			b[i] = test_uniform(-100, 100);
		}
		assert_true(test_close(dist2(a, 2, b, 2), fmax(vdist(a, 0, b, 0), vdist(a, 1, b, 1)), 1e-15));
	}
}

/* Common practice (follows from the definition): a translated copy is at distance |v|. */
static void
translated_copy_is_at_distance_of_the_shift(void **state)
{
	for (int k = 0; k < 100; k++)
	{
		size_t		n = 2 + test_rand64() % 40;
		double	   *a = test_walk(n, 0, 0, 10);
		double	   *b = malloc(2 * n * sizeof(double));
		double		vx = test_uniform(-5, 5),
					vy = test_uniform(-5, 5);

		for (size_t i = 0; i < n; i++)
		{
			b[2 * i] = a[2 * i] + vx;
			b[2 * i + 1] = a[2 * i + 1] + vy;
		}
		assert_true(test_close(dist2(a, n, b, n), hypot(vx, vy), 1e-12));
		free(a);
		free(b);
	}
}

/* Common practice (metric axioms): symmetry and the triangle inequality. */
static void
symmetric_and_triangle_inequality(void **state)
{
	for (int k = 0; k < 150; k++)
	{
		size_t		n = 1 + test_rand64() % 25,
					m = 1 + test_rand64() % 25,
					l = 1 + test_rand64() % 25;
		double	   *a = test_walk(n, 0, 0, 5);
		double	   *b = test_walk(m, 1, 1, 5);
		double	   *c = test_walk(l, 0, 2, 5);
		double		ab = dist2(a, n, b, m),
					ba = dist2(b, m, a, n),
					bc = dist2(b, m, c, l),
					ac = dist2(a, n, c, l);

		assert_true(test_close(ab, ba, 1e-12));
		assert_true(ac <= (ab + bc) * (1 + 1e-12));
		free(a);
		free(b);
		free(c);
	}
}

/*
 * Common practice (the distance depends on the curve as a point set traced
 * in order, not on its parametrisation): adding collinear vertices inside
 * segments, or repeating vertices, changes nothing.
 */
static void
collinear_and_repeated_vertices_change_nothing(void **state)
{
	for (int k = 0; k < 100; k++)
	{
		size_t		n = 2 + test_rand64() % 20,
					m = 2 + test_rand64() % 20;
		double	   *a = test_walk(n, 0, 0, 5);
		double	   *b = test_walk(m, 1, 0, 5);
		double	   *dense = malloc(2 * (3 * n) * sizeof(double));
		size_t		nd = 0;

		for (size_t i = 0; i < n; i++)
		{
			dense[2 * nd] = a[2 * i];
			dense[2 * nd + 1] = a[2 * i + 1];
			nd++;
			if (i % 3 == 0)
			{
				/* a repeated fix */
				dense[2 * nd] = a[2 * i];
				dense[2 * nd + 1] = a[2 * i + 1];
				nd++;
			}
			if (i + 1 < n)
			{
				/* a vertex in the middle of the segment */
				dense[2 * nd] = a[2 * i] + 0.25 * (a[2 * i + 2] - a[2 * i]);
				dense[2 * nd + 1] = a[2 * i + 1] + 0.25 * (a[2 * i + 3] - a[2 * i + 1]);
				nd++;
			}
		}
		assert_true(test_close(dist2(a, n, b, m), dist2(dense, nd, b, m), 1e-12));
		free(a);
		free(b);
		free(dense);
	}
}

/*
 * The contract of the search (our own statement of "exact to double
 * precision"): decide(d) is true and decide(d * (1 - 1e-9)) is false.
 * The fast and the plain decider agree on both.
 */
static void
distance_is_the_decision_threshold(void **state)
{
	for (int k = 0; k < 200; k++)
	{
		size_t		n = 2 + test_rand64() % 30,
					m = 2 + test_rand64() % 30;
		double	   *a = test_walk(n, 0, 0, 5);
		double	   *b = k % 2 ? test_jitter(a, n, 2, 0.5) : test_walk(m, 0.5, 0.5, 5);
		double		d;

		if (k % 2)
			m = n;
		d = dist2(a, n, b, m);
		assert_true(decide2(a, n, b, m, d, false));
		assert_true(decide2(a, n, b, m, d, true));
		if (d > 0)
		{
			assert_false(decide2(a, n, b, m, d * (1 - 1e-9), false));
			assert_false(decide2(a, n, b, m, d * (1 - 1e-9), true));
		}
		free(a);
		free(b);
	}
}

/*
 * Eiter & Mannila 1994: d <= d_discrete(P', Q') <= d + longest edge, where
 * P', Q' are the curves with every segment cut into k equal pieces (the
 * discrete value on ever finer samplings converges to the continuous one).
 */
static void
densified_discrete_brackets_the_distance(void **state)
{
	const int	k = 16;

	for (int t = 0; t < 60; t++)
	{
		size_t		n = 2 + test_rand64() % 12,
					m = 2 + test_rand64() % 12;
		double	   *a = test_walk(n, 0, 0, 5);
		double	   *b = test_walk(m, 0, 1, 5);
		double	   *ad = malloc(2 * ((n - 1) * k + 1) * sizeof(double));
		double	   *bd = malloc(2 * ((m - 1) * k + 1) * sizeof(double));
		double		d = dist2(a, n, b, m),
					dd,
					edge = 0;
		fr_curve	ca,
					cb;

		for (int which = 0; which < 2; which++)
		{
			const double *src = which ? b : a;
			double	   *dst = which ? bd : ad;
			size_t		cnt = which ? m : n;

			for (size_t i = 0; i + 1 < cnt; i++)
				for (int s = 0; s < k; s++)
				{
					dst[2 * (i * k + s)] = src[2 * i] + (src[2 * i + 2] - src[2 * i]) * s / k;
					dst[2 * (i * k + s) + 1] = src[2 * i + 1] + (src[2 * i + 3] - src[2 * i + 1]) * s / k;
				}
			dst[2 * (cnt - 1) * k] = src[2 * (cnt - 1)];
			dst[2 * (cnt - 1) * k + 1] = src[2 * (cnt - 1) + 1];
		}
		ca = (fr_curve) {ad, (n - 1) * k + 1, 2};
		cb = (fr_curve) {bd, (m - 1) * k + 1, 2};
		edge = fmax(fr_longest_edge(&ca), fr_longest_edge(&cb));
		dd = discrete2(ad, ca.n, bd, cb.n);
		assert_true(d <= dd * (1 + 1e-12));
		assert_true(dd <= (d + edge) * (1 + 1e-12));
		free(a);
		free(b);
		free(ad);
		free(bd);
	}
}

/*
 * Worked examples whose answers are critical values of each type of Alt &
 * Godau 1995: (b) a vertex at height 3 over a segment; (c) a back-and-forth
 * excursion whose two vertices (6,1) and (4,-1) must share the point (5,0),
 * which is equidistant from both, at sqrt(2).  Values worked by hand.
 * Tolerance: the decider accepts tangencies up to 4 ulps early (see
 * TANGENT_SLACK in freespace.c), so the search may stop that far below.
 */
static void
critical_values_of_type_b_and_c(void **state)
{
	const double seg[] = {0, 0, 10, 0};
	const double tent[] = {0, 0, 5, 3, 10, 0};
	const double back[] = {0, 0, 6, 1, 4, -1, 10, 0};

	assert_true(test_close(dist2(seg, 2, tent, 3), 3.0, 8 * DBL_EPSILON));
	assert_true(test_close(dist2(seg, 2, back, 4), sqrt(2.0), 8 * DBL_EPSILON));
	assert_true(test_close(dist2(back, 4, seg, 2), sqrt(2.0), 8 * DBL_EPSILON));
}

/* Common practice: one-point curves are points; the distance is the farthest vertex. */
static void
one_point_curves(void **state)
{
	const double pt[] = {1, 1};
	const double line[] = {0, 0, 4, 1, 1, 5};
	const double pt2[] = {4, 5};

	assert_true(dist2(pt, 1, line, 3) == hypot(0, 4));
	assert_true(dist2(line, 3, pt, 1) == hypot(0, 4));
	assert_true(dist2(pt, 1, pt2, 1) == 5.0);
	assert_true(discrete2(pt, 1, line, 3) == 4.0);
	assert_true(decide2(pt, 1, line, 3, 4.0, false));
	assert_false(decide2(pt, 1, line, 3, nextafter(4.0, 0), false));
}

/* Our robustness contract: Web-Mercator-sized coordinates keep full precision. */
static void
large_coordinates_keep_precision(void **state)
{
	for (int k = 0; k < 50; k++)
	{
		size_t		n = 2 + test_rand64() % 20,
					m = 2 + test_rand64() % 20;
		double	   *a = malloc(2 * n * sizeof(double)),
				   *b = malloc(2 * m * sizeof(double)),
				   *a7 = malloc(2 * n * sizeof(double)),
				   *b7 = malloc(2 * m * sizeof(double));

		/* coordinates on a 1/1024 grid, so adding 1e7 is exact */
		for (size_t i = 0; i < 2 * n; i++)
		{
			a[i] = floor(test_uniform(0, 2000) * 1024) / 1024;
			a7[i] = a[i] + 1e7;
		}
		for (size_t i = 0; i < 2 * m; i++)
		{
			b[i] = floor(test_uniform(0, 2000) * 1024) / 1024;
			b7[i] = b[i] + 1e7;
		}
		assert_true(test_close(dist2(a, n, b, m), dist2(a7, n, b7, m), 1e-15));
		free(a);
		free(b);
		free(a7);
		free(b7);
	}
}

/*
 * Our robustness contract: tiny tracks keep full precision too.  Scaling a
 * pair by a power of two scales its distance exactly (common practice:
 * the distance is homogeneous), down to 2^-700 where squares of the raw
 * differences would underflow.
 */
static void
tiny_coordinates_keep_precision(void **state)
{
	const double pt[] = {0, 0},
				far[] = {1e-200, 0};

	assert_true(dist2(pt, 1, far, 1) == 1e-200);
	assert_true(discrete2(pt, 1, far, 1) == 1e-200);
	for (int k = 0; k < 50; k++)
	{
		size_t		n = 2 + test_rand64() % 20,
					m = 2 + test_rand64() % 20;
		double	   *a = test_walk(n, 0, 0, 5),
				   *b = test_walk(m, 1, 1, 5),
				   *ta = malloc(2 * n * sizeof(double)),
				   *tb = malloc(2 * m * sizeof(double));

		for (size_t i = 0; i < 2 * n; i++)
			ta[i] = ldexp(a[i], -700);
		for (size_t i = 0; i < 2 * m; i++)
			tb[i] = ldexp(b[i], -700);
		assert_true(dist2(ta, n, tb, m) == ldexp(dist2(a, n, b, m), -700));
		assert_true(discrete2(ta, n, tb, m) == ldexp(discrete2(a, n, b, m), -700));
		free(a);
		free(b);
		free(ta);
		free(tb);
	}
}

/*
 * The free interval of a point against a segment (Alt & Godau 1995,
 * section 2) checked by sampling: points well inside the disk lie inside
 * the interval and points well outside lie outside; also near 1e7.
 */
static void
free_interval_matches_sampled_distances(void **state)
{
	for (int k = 0; k < 2000; k++)
	{
		double		off = k % 2 ? 1e7 : 0;
		fr_pt		p = {off + test_uniform(-10, 10), off + test_uniform(-10, 10), 0},
					a = {off + test_uniform(-10, 10), off + test_uniform(-10, 10), 0},
					b = {off + test_uniform(-10, 10), off + test_uniform(-10, 10), 0},
					lp = {p.x - off, p.y - off, 0},
					la = {a.x - off, a.y - off, 0},
					lb = {b.x - off, b.y - off, 0};
		fr_seg		s = fr_seg_between(&la, &lb);
		double		eps = test_uniform(0, 12),
					lo,
					hi;

		fr_free_interval(&lp, &la, &s, &lb, eps, &lo, &hi);
		for (int i = 0; i <= 100; i++)
		{
			double		t = i / 100.0;
			double		dx = la.x + t * (lb.x - la.x) - lp.x,
						dy = la.y + t * (lb.y - la.y) - lp.y;
			double		d = hypot(dx, dy);

			if (d < eps * (1 - 1e-9))
				assert_true(lo <= t && t <= hi);
			if (d > eps * (1 + 1e-9))
				assert_false(lo <= t && t <= hi);
		}
	}
}

/*
 * Tangency (our robustness contract): a vertex exactly at eps from the line
 * of a segment gets a one-point interval, not an empty one.
 */
static void
free_interval_at_tangency_is_a_point(void **state)
{
	fr_pt		p = {3.7, 2.5, 0},
				a = {0, 0, 0},
				b = {10, 0, 0};
	fr_seg		s = fr_seg_between(&a, &b);
	double		lo,
				hi;

	fr_free_interval(&p, &a, &s, &b, 2.5, &lo, &hi);
	assert_true(lo <= hi);
	assert_true(test_close(lo, 0.37, 1e-12));
	fr_free_interval(&p, &a, &s, &b, nextafter(2.5, 0) * (1 - 1e-12), &lo, &hi);
	assert_true(lo > hi);
}

/* Eiter & Mannila 1994, by their recursive definition on the full table. */
static double
discrete_by_definition(const double *a, size_t n, const double *b, size_t m)
{
	double	   *ca = malloc(n * m * sizeof(double));
	double		r;

	for (size_t i = 0; i < n; i++)
		for (size_t j = 0; j < m; j++)
		{
			double		d = vdist(a, i, b, j),
						best;

			if (i == 0 && j == 0)
				best = d;
			else if (i == 0)
				best = ca[j - 1];
			else if (j == 0)
				best = ca[(i - 1) * m];
			else
				best = fmin(ca[(i - 1) * m + j], fmin(ca[i * m + j - 1], ca[(i - 1) * m + j - 1]));
			ca[i * m + j] = fmax(best, d);
		}
	r = ca[n * m - 1];
	free(ca);
	return r;
}

/* The discrete distance equals the table of the definition (Eiter & Mannila 1994). */
static void
discrete_matches_its_definition(void **state)
{
	for (int k = 0; k < 300; k++)
	{
		size_t		n = 1 + test_rand64() % 30,
					m = 1 + test_rand64() % 30;
		double	   *a = test_walk(n, 0, 0, 5),
				   *b = test_walk(m, 0, 0, 5);

		assert_true(discrete2(a, n, b, m) == discrete_by_definition(a, n, b, m));
		free(a);
		free(b);
	}
}

/*
 * Scattered points that keep the free space open but full of holes, ending
 * with two far points visited in opposite orders: no filter settles a
 * decision on this pair and nothing prunes.  Returns a malloc'd curve of
 * n + 4 vertices; phase selects one of the two curves.
 */
static double *
unprunable(size_t n, int phase)
{
	double	   *c = malloc(2 * (n + 4) * sizeof(double));
	const double tail_a[] = {0, 20, 20, 20, 10, 0},
				tail_b[] = {20, 20, 0, 20, 10, 0};

	c[0] = c[1] = 0;
	for (size_t i = 1; i <= n; i++)
	{
		c[2 * i] = cos(i * 2.4 + phase);
		c[2 * i + 1] = sin(i * 1.7 + 2 * phase);
	}
	memcpy(c + 2 * (n + 1), phase ? tail_b : tail_a, sizeof(tail_a));
	return c;
}

/* Engine contract: an interrupt stops the work and every block is released. */
static void
interrupt_stops_and_frees(void **state)
{
	size_t		n = 3000;
	double	   *a = unprunable(n, 0),
			   *b = unprunable(n, 1);
	fr_curve	p = {a, n + 4, 2},
				q = {b, n + 4, 2};
	test_heap	h;
	fr_env		e = test_env(&h);
	double		d;
	bool		yes;

	h.interrupt_after = 3;
	assert_int_equal(fr_distance(&e, &p, &q, &d, NULL), FR_EINTR);
	assert_int_equal(h.live, 0);
	e = test_env(&h);
	h.interrupt_after = 2;
	assert_int_equal(fr_decide(&e, &p, &q, 1.5, &yes, NULL), FR_EINTR);
	assert_int_equal(h.live, 0);
	e = test_env(&h);
	h.interrupt_after = 2;
	assert_int_equal(fr_decide_plain(&e, &p, &q, 1.5, &yes, NULL), FR_EINTR);
	assert_int_equal(h.live, 0);
	e = test_env(&h);
	h.interrupt_after = 2;
	assert_int_equal(fr_discrete_distance(&e, &p, &q, &d), FR_EINTR);
	assert_int_equal(h.live, 0);
	free(a);
	free(b);
}

/*
 * Engine contract: the interrupt callback is polled at least once per
 * FR_INTERRUPT_CELLS cells of a decision (so a cancel lands quickly).
 */
static void
interrupt_is_polled_often(void **state)
{
	size_t		n = 2000;
	double	   *a = test_walk(n, 0, 0, 1),
			   *b = test_jitter(a, n, 2, 0.1);
	fr_curve	p = {a, n, 2},
				q = {b, n, 2};
	test_heap	h;
	fr_env		e = test_env(&h);
	fr_stats	st = {0};
	bool		yes;

	assert_int_equal(fr_decide_plain(&e, &p, &q, 1e6, &yes, &st), FR_OK);
	assert_true(yes);
	assert_true(st.cells >= (uint64_t) (n - 1) * (n - 1));
	assert_true((uint64_t) h.interrupt_calls >= st.cells / FR_INTERRUPT_CELLS);
	free(a);
	free(b);
}

/*
 * Engine contract: the pruning decider polls as often, also when its sweep
 * starts from a few reachable cells and then covers most of the diagram
 * (the curves part at once, then wander together within eps).
 */
static void
pruned_sweep_is_polled_often(void **state)
{
	size_t		n = 2000;
	double	   *a = malloc(2 * n * sizeof(double)),
			   *b = malloc(2 * n * sizeof(double));
	fr_curve	p = {a, n, 2},
				q = {b, n, 2};
	test_heap	h;
	fr_env		e = test_env(&h);
	fr_stats	st = {0};
	bool		yes;

	a[0] = a[1] = b[0] = b[1] = 0;
	for (size_t i = 1; i < n; i++)
	{
		a[2 * i] = 20 + test_uniform(-2, 2);
		a[2 * i + 1] = test_uniform(-2, 2);
		b[2 * i] = 20 + test_uniform(-2, 2);
		b[2 * i + 1] = test_uniform(-2, 2);
	}
	assert_int_equal(fr_decide_exact(&e, &p, &q, 8, &yes, &st), FR_OK);
	assert_true(yes);
	assert_true(st.cells >= (uint64_t) (n - 1) * (n - 1) / 2);
	assert_true((uint64_t) h.interrupt_calls >= st.cells / FR_INTERRUPT_CELLS);
	free(a);
	free(b);
}

/* Engine contract: a failed allocation is reported and nothing leaks. */
static void
allocation_failure_is_reported(void **state)
{
	double	   *a = test_walk(50, 0, 0, 1),
			   *b = test_walk(50, 0, 0, 1);
	fr_curve	p = {a, 50, 2},
				q = {b, 50, 2};

	long		needed;

	/* how many allocations a successful call makes */
	{
		test_heap	h;
		fr_env		e = test_env(&h);
		double		d;

		assert_int_equal(fr_distance(&e, &p, &q, &d, NULL), FR_OK);
		assert_int_equal(h.live, 0);
		needed = h.total;
		assert_true(needed >= 2);
	}
	/* failing any one of them is reported, and nothing leaks */
	for (long k = 0; k <= needed; k++)
	{
		test_heap	h;
		fr_env		e = test_env(&h);
		double		d;
		fr_status	st;

		h.fail_after = k;
		st = fr_distance(&e, &p, &q, &d, NULL);
		assert_int_equal(st, k < needed ? FR_ENOMEM : FR_OK);
		assert_int_equal(h.live, 0);
	}
	free(a);
	free(b);
}

/* Common practice: in 3-D, a curve lifted by a constant height is at that height. */
static void
three_dimensional_lift(void **state)
{
	double		a[3 * 10],
				b[3 * 10];
	test_heap	h;
	fr_env		e = test_env(&h);
	fr_curve	p = {a, 10, 3},
				q = {b, 10, 3};
	double		d;

	for (int i = 0; i < 10; i++)
	{
		a[3 * i] = b[3 * i] = test_uniform(0, 10);
		a[3 * i + 1] = b[3 * i + 1] = test_uniform(0, 10);
		a[3 * i + 2] = 0;
		b[3 * i + 2] = 2.5;
	}
	assert_int_equal(fr_distance(&e, &p, &q, &d, NULL), FR_OK);
	assert_true(test_close(d, 2.5, 1e-15));
	assert_int_equal(h.live, 0);
}

/* Engine contract: eps = +Inf is true; mismatched dimensions are invalid. */
static void
infinite_eps_and_invalid_input(void **state)
{
	const double a[] = {0, 0, 1, 1};
	const double b3[] = {0, 0, 0, 1, 1, 1};
	test_heap	h;
	fr_env		e = test_env(&h);
	fr_curve	p = {a, 2, 2},
				q = {b3, 2, 3};
	bool		yes = false;
	double		d;

	assert_true(decide2(a, 2, a, 2, INFINITY, false));
	assert_int_equal(fr_decide(&e, &p, &q, 1.0, &yes, NULL), FR_EINVAL);
	assert_int_equal(fr_distance(&e, &p, &q, &d, NULL), FR_EINVAL);
	assert_int_equal(h.live, 0);
}

/*
 * fr_row_step_band (the band sweep of frechet_progress) gives exactly the
 * rows of fr_row_step, the plain Alt & Godau propagation, on random pairs
 * near and far apart, with the left edge open or shut.
 */
static void
band_step_equals_plain_step(void **state)
{
	for (int t = 0; t < 300; t++)
	{
		size_t		n = 2 + test_rand64() % 40,
					m = 2 + test_rand64() % 40;
		double	   *ca = test_walk(n, 0, 0, 5),
				   *cb = t % 3 ? test_jitter(ca, n, 2, 2.0 + t % 7) : test_walk(m, 0, 0, 5);
		fr_curve	a,
					b;
		test_heap	h;
		fr_env		e = test_env(&h);
		fr_prep		pa,
					pb;
		double	   *plain,
				   *band,
					eps = 1.0 + (double) (t % 11);
		fr_poll		poll;
		bool		open = true;
		size_t		first = 0,
					last = 0;

		if (t % 3)
			m = n;
		a = (fr_curve) {ca, n, 2};
		b = (fr_curve) {cb, m, 2};
		assert_int_equal(fr_prepare_pair(&e, &a, &b, &pa, &pb), FR_OK);
		plain = malloc(pa.n * sizeof(double));
		band = malloc(pa.n * sizeof(double));
		fr_poll_init(&poll, &e);
		fr_bottom_edge(&pa, &pb, eps, plain);
		memcpy(band, plain, pa.n * sizeof(double));
		while (last + 1 < pa.n && band[last] != FR_EMPTY)
			last++;
		if (last == 0)
			first = 1;
		else
			last--;
		for (size_t j = 0; j + 1 < pb.n; j++)
		{
			double		lr = FR_EMPTY,
						r1,
						r2;
			bool		any1,
						any2;

			if (open)
				lr = fr_left_edge(&pa, &pb, j, eps, &open);
			assert_int_equal(fr_row_step(&pa, &pb, j, eps, plain, lr, NULL, &r1, &any1, &poll), FR_OK);
			assert_int_equal(fr_row_step_band(&pa, &pb, j, eps, band, lr, &first, &last, &r2, &any2, &poll), FR_OK);
			assert_int_equal(any1, any2);
			assert_true(r1 == r2);
			for (size_t i = 0; i + 1 < pa.n; i++)
			{
				if (plain[i] != band[i])
					fail_msg("pair %d row %zu cell %zu: plain %g, band %g", t, j, i, plain[i], band[i]);
				/* the band bounds every reachable top */
				if (band[i] != FR_EMPTY)
					assert_true(i >= first && i <= last);
			}
		}
		free(plain);
		free(band);
		fr_release_pair(&e, &pa, &pb);
		assert_int_equal(h.live, 0);
		free(ca);
		free(cb);
	}
}

int
main(void)
{
	const struct CMUnitTest tests[] = {
		cmocka_unit_test(two_segments_take_the_larger_end_distance),
		cmocka_unit_test(translated_copy_is_at_distance_of_the_shift),
		cmocka_unit_test(symmetric_and_triangle_inequality),
		cmocka_unit_test(collinear_and_repeated_vertices_change_nothing),
		cmocka_unit_test(distance_is_the_decision_threshold),
		cmocka_unit_test(densified_discrete_brackets_the_distance),
		cmocka_unit_test(critical_values_of_type_b_and_c),
		cmocka_unit_test(one_point_curves),
		cmocka_unit_test(large_coordinates_keep_precision),
		cmocka_unit_test(tiny_coordinates_keep_precision),
		cmocka_unit_test(free_interval_matches_sampled_distances),
		cmocka_unit_test(free_interval_at_tangency_is_a_point),
		cmocka_unit_test(discrete_matches_its_definition),
		cmocka_unit_test(interrupt_stops_and_frees),
		cmocka_unit_test(interrupt_is_polled_often),
		cmocka_unit_test(pruned_sweep_is_polled_often),
		cmocka_unit_test(allocation_failure_is_reported),
		cmocka_unit_test(three_dimensional_lift),
		cmocka_unit_test(infinite_eps_and_invalid_input),
		cmocka_unit_test(band_step_equals_plain_step),
	};

	return cmocka_run_group_tests_name("engine", tests, NULL, NULL);
}
