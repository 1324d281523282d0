/*
 * test_prune.c - the pruning decider (Bringmann, Künnemann & Nusser 2019)
 * against the plain Alt & Godau decider: they must agree on every decision,
 * including eps exactly at a critical value and one double either side.
 */
#include <float.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdio.h>
#include <stdint.h>

#include <cmocka.h>

#include "testutil.h"
#include "fr_internal.h"

/*
 * The deciders on one input: fr_decide (filters, then pruning), the pruning
 * decider alone, and the plain one.  Fails with the input described when
 * they differ.
 */
static long walls_settled;		/* pruned decisions settled by a wall probe */

static void
agree(const fr_curve *a, const fr_curve *b, double eps, long *count)
{
	test_heap	h;
	fr_env		e = test_env(&h);
	fr_stats	st = {0};
	bool		fast,
				plain,
				pruned;

	assert_int_equal(fr_decide(&e, a, b, eps, &fast, NULL), FR_OK);
	assert_int_equal(fr_decide_plain(&e, a, b, eps, &plain, NULL), FR_OK);
	pruned = plain;
	if (a->n > 1 && b->n > 1)
	{
		fr_prep		pp,
					pq;
		void	   *w = malloc(fr_prune_work_bytes(a->n, b->n));

		assert_int_equal(fr_prepare_pair(&e, a, b, &pp, &pq), FR_OK);
		/* the pruning decider's own contract: both end pairs within eps */
		if (fr_pt_dist(&pp.v[0], &pq.v[0]) <= eps &&
			fr_pt_dist(&pp.v[a->n - 1], &pq.v[b->n - 1]) <= eps)
		{
			fr_prune_setup(w, &pp, &pq);
			assert_int_equal(fr_decide_pruned(&e, &pp, &pq, eps, w, &pruned, &st, NULL), FR_OK);
			walls_settled += (long) st.walls;
		}
		fr_release_pair(&e, &pp, &pq);
		free(w);
	}
	assert_int_equal(h.live, 0);
	if (fast != plain || pruned != plain)
		fail_msg("n=%zu m=%zu eps=%.17g: decide %d, pruned %d, plain %d",
				 a->n, b->n, eps, fast, pruned, plain);
	(*count)++;
}

/* Distance between vertex i of a and segment k of b, computed here. */
static double
vertex_segment(const fr_curve *a, size_t i, const fr_curve *b, size_t k)
{
	double		px = a->coords[2 * i],
				py = a->coords[2 * i + 1],
				ax = b->coords[2 * k],
				ay = b->coords[2 * k + 1],
				dx = b->coords[2 * k + 2] - ax,
				dy = b->coords[2 * k + 3] - ay,
				l2 = dx * dx + dy * dy,
				t = l2 > 0 ? ((px - ax) * dx + (py - ay) * dy) / l2 : 0;

	t = t < 0 ? 0 : t > 1 ? 1 : t;
	return hypot(px - ax - t * dx, py - ay - t * dy);
}

/* One family of inputs: random walks, noisy copies, zig-zags, GPS-like. */
static double *
make_curve(int kind, size_t n, const double *other, size_t on)
{
	double	   *c;

	switch (kind)
	{
		case 0:
			return test_walk(n, 0, 0, 5);
		case 1:
			return test_jitter(other, on, 2, 1.5);
		case 2:
			/* a zig-zag strip: nearly all of the free space open near eps = amplitude */
			c = malloc(2 * n * sizeof(double));
			for (size_t i = 0; i < n; i++)
			{
				c[2 * i] = (double) i + test_uniform(0, 0.3);
				c[2 * i + 1] = (i % 2) * 10 + test_uniform(-0.5, 0.5);
			}
			return c;
		default:
			/* GPS-like: a street with noise, sampled unevenly */
			c = malloc(2 * n * sizeof(double));
			{
				double		x = 0,
							y = 0,
							hd = 0;

				for (size_t i = 0; i < n; i++)
				{
					hd += test_uniform(-0.2, 0.2);
					x += test_uniform(5, 25) * cos(hd);
					y += test_uniform(5, 25) * sin(hd);
					c[2 * i] = x + test_uniform(-8, 8);
					c[2 * i + 1] = y + test_uniform(-8, 8);
				}
			}
			return c;
	}
}

/*
 * A pair of one family of make_curve: kind 1 a walk and a noisy copy of
 * it, kind 3 a street and a second recording of it (both curves of one
 * length), kinds 0 and 2 two curves of their own; lengths 2 to max_n + 1
 * and 2 to max_m + 1.
 */
static void
family_pair(int kind, size_t max_n, size_t max_m, size_t *n, size_t *m, double **a, double **b)
{
	*n = 2 + test_rand64() % max_n;
	*m = kind == 1 || kind == 3 ? *n : 2 + test_rand64() % max_m;
	*a = make_curve(kind == 1 ? 0 : kind, *n, NULL, 0);
	*b = kind == 1 ? make_curve(1, *n, *a, *n) : kind == 3 ? test_jitter(*a, *n, 2, 6) :
		make_curve(kind, *m, NULL, 0);
}

/*
 * 100,000+ decisions: random eps, the distance and its neighbouring
 * doubles, and vertex-to-segment critical values (type b) and theirs.
 */
static void
pruned_agrees_with_plain(void **state)
{
	long		decisions = 0;

	for (int t = 0; decisions < 100000; t++)
	{
		int			kind = t % 4;
		size_t		n = 2 + test_rand64() % (t % 10 == 0 ? 160 : 40),
					m;
		double	   *ca = make_curve(kind == 1 ? 0 : kind, n, NULL, 0),
				   *cb;
		fr_curve	a,
					b;
		test_heap	h;
		fr_env		e = test_env(&h);
		double		d;

		test_rng_state ^= 0x1234;
		if (kind == 1)
		{
			m = n;
			cb = make_curve(1, n, ca, n);
		}
		else
		{
			m = 2 + test_rand64() % (t % 10 == 0 ? 160 : 40);
			cb = make_curve(kind, m, NULL, 0);
			if (kind == 2)
				for (size_t i = 0; i < m; i++)
					cb[2 * i + 1] = 10 - cb[2 * i + 1];
			if (kind == 3)
			{
				/* the same street driven again: start from a's track */
				free(cb);
				m = n;
				cb = test_jitter(ca, n, 2, 6);
			}
		}
		a = (fr_curve) {ca, n, 2};
		b = (fr_curve) {cb, m, 2};
		assert_int_equal(fr_distance(&e, &a, &b, &d, NULL), FR_OK);
		agree(&a, &b, d, &decisions);
		agree(&a, &b, nextafter(d, 0), &decisions);
		agree(&a, &b, nextafter(d, INFINITY), &decisions);
		agree(&a, &b, d * 1.05, &decisions);
		agree(&a, &b, d * 0.95, &decisions);
		for (int r = 0; r < 6; r++)
			agree(&a, &b, test_uniform(0, 2 * d), &decisions);
		for (int r = 0; r < 6; r++)
		{
			size_t		i = test_rand64() % n,
						k = test_rand64() % (m - 1);
			double		v = vertex_segment(&a, i, &b, k);

			agree(&a, &b, v, &decisions);
			agree(&a, &b, nextafter(v, 0), &decisions);
			agree(&a, &b, nextafter(v, INFINITY), &decisions);
		}
		free(ca);
		free(cb);
	}
	print_message("%ld decisions compared (%ld settled by wall probes)\n", decisions, walls_settled);
}

/*
 * A street and a second recording of it: the street's points every 5-25 m
 * with gentle turns (turn is the largest change of heading a point, in
 * radians), and the recording of it with noise up to 6 m.  back > 0 makes
 * the street turn round after back points and come back along itself 4 m
 * to the side, so that free space opens far from the band as well.
 */
static void
street_pair(size_t n, double turn, size_t back, double **a, double **b)
{
	double	   *c = malloc(2 * n * sizeof(double));
	double		x = 0,
				y = 0,
				hd = 0;

	for (size_t i = 0; i < n; i++)
	{
		if (back > 0 && i >= back && i < 2 * back)
		{
			/* retrace: the mirror of the way out, shifted to the side */
			c[2 * i] = c[2 * (2 * back - 1 - i)] + 4 * sin(hd);
			c[2 * i + 1] = c[2 * (2 * back - 1 - i) + 1] - 4 * cos(hd);
			x = c[2 * i];
			y = c[2 * i + 1];
			continue;
		}
		hd += test_uniform(-turn, turn);
		x += test_uniform(5, 25) * cos(hd);
		y += test_uniform(5, 25) * sin(hd);
		c[2 * i] = x + test_uniform(-3, 3);
		c[2 * i + 1] = y + test_uniform(-3, 3);
	}
	*a = c;
	*b = test_jitter(c, n, 2, 6);
}

/* A 2-D curve lifted into space over hills (z from x and y), with noise up to jitter in z. */
static double *
lift(const double *c, size_t n, double jitter)
{
	double	   *d = malloc(3 * n * sizeof(double));

	for (size_t i = 0; i < n; i++)
	{
		d[3 * i] = c[2 * i];
		d[3 * i + 1] = c[2 * i + 1];
		d[3 * i + 2] = 15 * sin(c[2 * i] / 200) * cos(c[2 * i + 1] / 300) +
			test_uniform(-jitter, jitter);
	}
	return d;
}

/* street_pair in the plane (dim 2) or lifted into space over hills (dim 3, noise up to 4 in z). */
static void
street_pair_in(int dim, size_t n, double turn, size_t back, double **a, double **b)
{
	street_pair(n, turn, back, a, b);
	if (dim == 3)
	{
		double	   *la = lift(*a, n, 0),
				   *lb = lift(*b, n, 4);

		free(*a);
		free(*b);
		*a = la;
		*b = lb;
	}
}

/*
 * The wall probes of the pruning decider (prune.c) answer "no" from a few
 * rows of the free space, starting from every free point of a line.  On
 * long pairs of recordings of one street, some of which turn round and
 * come back along themselves (free points far from the band on the probe's
 * line), and some of which climb hills (curves in space, as geography
 * becomes), at eps below the distance, at it and one double either side:
 * the answers must be the plain decider's, and the probes must have
 * settled many of the "no"s, or this test would check nothing.
 */
static void
wall_probes_agree_with_plain(void **state)
{
	long		decisions = 0,
				no = 0,
				before = walls_settled,
				in_space = 0;

	(void) state;
	test_rng_state = 4242;
	for (int t = 0; t < 32; t++)
	{
		size_t		n = 200 + test_rand64() % 600,
					back = t % 3 == 2 ? n / 3 : 0;
		int			dim = t % 4 == 1 ? 3 : 2;
		double	   *ca,
				   *cb,
					d;
		fr_curve	a,
					b;
		test_heap	h;
		fr_env		e = test_env(&h);
		const double f[] = {0.6, 0.8, 0.9, 0.95, 0.99, 1.0, 1.05};

		street_pair_in(dim, n, t % 2 ? 0.5 : 0.1, back, &ca, &cb);
		a = (fr_curve) {ca, n, dim};
		b = (fr_curve) {cb, n, dim};
		assert_int_equal(fr_distance(&e, &a, &b, &d, NULL), FR_OK);
		{
			long		settled = walls_settled;

			for (size_t k = 0; k < sizeof(f) / sizeof(f[0]); k++)
			{
				agree(&a, &b, d * f[k], &decisions);
				no += f[k] < 1.0;
			}
			agree(&a, &b, nextafter(d, 0), &decisions);
			agree(&a, &b, nextafter(d, INFINITY), &decisions);
			no++;
			if (dim == 3)
				in_space += walls_settled - settled;
		}
		free(ca);
		free(cb);
	}
	print_message("%ld decisions compared, %ld settled by wall probes (%ld in space) of %ld below the distance\n",
				  decisions, walls_settled - before, in_space, no);
	assert_true(walls_settled - before >= no / 2);
	assert_true(in_space >= no / 16);
}

/*
 * The distance search lets probes inside a round be settled by couplings
 * or wall probes, which give no openings; a round then starts from a sweep
 * of its own.  On long street pairs (the family where that happens, some
 * in space) the result must still be exactly the reference search's, and
 * wall probes must have been used.
 */
static void
distance_with_wall_probes_equals_reference(void **state)
{
	uint64_t	walls = 0;

	(void) state;
	test_rng_state = 777;
	for (int t = 0; t < 12; t++)
	{
		size_t		n = 300 + test_rand64() % 500;
		int			dim = t % 3 == 2 ? 3 : 2;
		double	   *ca,
				   *cb,
					fast,
					ref;
		fr_curve	a,
					b;
		test_heap	h;
		fr_env		e = test_env(&h);
		fr_stats	st = {0};

		street_pair_in(dim, n, t % 2 ? 0.5 : 0.1, t % 4 == 3 ? n / 3 : 0, &ca, &cb);
		a = (fr_curve) {ca, n, dim};
		b = (fr_curve) {cb, n, dim};
		assert_int_equal(fr_distance(&e, &a, &b, &fast, &st), FR_OK);
		assert_int_equal(fr_distance_plain(&e, &a, &b, &ref, NULL), FR_OK);
		assert_int_equal(h.live, 0);
		if (fast != ref)
			fail_msg("pair %d (n=%zu, dim %d): fast %.17g, reference %.17g", t, n, dim, fast, ref);
		walls += st.walls;
		free(ca);
		free(cb);
	}
	print_message("distances on street pairs: %llu decisions settled by wall probes\n",
				  (unsigned long long) walls);
	assert_true(walls > 0);
}

/*
 * The fast distance search returns exactly what the reference search
 * returns (both find the smallest double the deciders accept, and the
 * deciders agree), on 600 pairs of every family.
 */
static void
fast_distance_equals_reference(void **state)
{
	for (int t = 0; t < 600; t++)
	{
		int			kind = t % 4;
		size_t		n,
					m;
		double	   *ca,
				   *cb;
		test_heap	h;
		fr_env		e = test_env(&h);
		double		fast,
					ref;
		fr_curve	a,
					b;

		family_pair(kind, t % 10 == 0 ? 120 : 40, 40, &n, &m, &ca, &cb);
		a = (fr_curve) {ca, n, 2};
		b = (fr_curve) {cb, m, 2};

		if (kind == 2)
			for (size_t i = 0; i < m; i++)
				cb[2 * i + 1] = 10 - cb[2 * i + 1];
		assert_int_equal(fr_distance(&e, &a, &b, &fast, NULL), FR_OK);
		assert_int_equal(fr_distance_plain(&e, &a, &b, &ref, NULL), FR_OK);
		assert_int_equal(h.live, 0);
		if (fast != ref)
			fail_msg("pair %d (kind %d, n=%zu m=%zu): fast %.17g, reference %.17g", t, kind, n, m, fast, ref);
		free(ca);
		free(cb);
	}
}

/*
 * Long, densely sampled curves against sparse ones: the search narrows its
 * bracket with simplified curves there (distance.c); the result must still
 * equal the reference search's.
 */
static void
simplified_bounds_keep_the_result(void **state)
{
	for (int t = 0; t < 3; t++)
	{
		const size_t n = 6000,
					m = 120;
		double	   *a = malloc(2 * n * sizeof(double)),
				   *b = malloc(2 * m * sizeof(double));
		fr_curve	ca = {a, n, 2},
					cb = {b, m, 2};
		test_heap	h;
		fr_env		e = test_env(&h);
		double		fast,
					ref;

		for (size_t i = 0; i < n; i++)
		{
			double		u = 3.0 * i / (n - 1);

			a[2 * i] = 1000 * cos(u) + test_uniform(-0.01, 0.01);
			a[2 * i + 1] = 1000 * sin(u);
		}
		for (size_t i = 0; i < m; i++)
		{
			double		u = 3.0 * i / (m - 1);

			b[2 * i] = (1003 + t) * cos(u);
			b[2 * i + 1] = (1003 + t) * sin(u);
		}
		b[2 * (m / 2) + 1] += 20 + 10 * t;
		assert_int_equal(fr_distance(&e, &ca, &cb, &fast, NULL), FR_OK);
		assert_int_equal(fr_distance_plain(&e, &ca, &cb, &ref, NULL), FR_OK);
		assert_int_equal(h.live, 0);
		if (fast != ref)
			fail_msg("case %d: fast %.17g, reference %.17g", t, fast, ref);
		free(a);
		free(b);
	}
}

/*
 * One free interval both ways: fr_interval_core (branches, used by the plain
 * decider) and the branch-free form of the pruning decider's batches.  They
 * must agree bit for bit.
 */
static void
interval_both_ways(const fr_pt *p, const fr_pt *a, const fr_pt *b, double eps, long *count)
{
	fr_seg		s = fr_seg_between(a, b);	/* the segment as the engine prepares it */
	double		lo1,
				hi1,
				lo2,
				hi2,
				da2 = fr_pt_dist2(p, a),
				da = sqrt(da2),
				db = fr_pt_dist(p, b);

	fr_interval_core(p, a, &s, eps, da <= eps, db <= eps, da2, &lo1, &hi1);
	fr_interval_select_one(p, a, &s, eps, da, db, &lo2, &hi2);
	if (memcmp(&lo1, &lo2, sizeof(double)) != 0 || memcmp(&hi1, &hi2, sizeof(double)) != 0)
		fail_msg("p=(%.17g,%.17g) a=(%.17g,%.17g) b=(%.17g,%.17g) eps=%.17g: "
				 "branches [%.17g, %.17g], branch-free [%.17g, %.17g]",
				 p->x, p->y, a->x, a->y, b->x, b->y, eps, lo1, hi1, lo2, hi2);
	(*count)++;
}

/*
 * The batch kernel's free interval equals the plain one on random inputs
 * and on the degenerate ones: eps exactly at an end's distance or at the
 * distance to the line (tangency), feet before, on and past the ends,
 * zero-length segments, tiny and huge scales.
 */
static void
branch_free_interval_matches(void **state)
{
	long		count = 0;

	(void) state;
	test_rng_state = 20261202;
	for (int it = 0; it < 200000; it++)
	{
		double		scale = pow(10.0, test_uniform(-12, 12));
		fr_pt		p = {test_uniform(-1, 1) * scale, test_uniform(-1, 1) * scale, 0},
					a = {test_uniform(-1, 1) * scale, test_uniform(-1, 1) * scale, 0},
					b = {test_uniform(-1, 1) * scale, test_uniform(-1, 1) * scale, 0};
		double		eps;
		int			kind = it % 8;

		if (kind == 1)
			b = a;				/* zero-length segment */
		else if (kind == 2)
			b.y = a.y;			/* axis-parallel, p's foot easy to place */
		if (kind == 3)
		{
			/* 3-D */
			p.z = test_uniform(-1, 1) * scale;
			a.z = test_uniform(-1, 1) * scale;
			b.z = test_uniform(-1, 1) * scale;
		}
		switch (it % 5)
		{
			case 0:
			case 1:
				/* exactly at an end's distance, or one double either side */
				eps = fr_pt_dist(&p, it % 5 == 0 ? &a : &b);
				if (it % 3 == 1)
					eps = nextafter(eps, INFINITY);
				else if (it % 3 == 2)
					eps = nextafter(eps, 0);
				break;
			case 2:
				{
					/* the distance to the line: tangency, then one double either side */
					double		dx = b.x - a.x,
								dy = b.y - a.y,
								l = hypot(dx, dy);

					eps = l > 0 ? fabs(dx * (a.y - p.y) - dy * (a.x - p.x)) / l : fr_pt_dist(&p, &a);
					if (it % 3 == 1)
						eps = nextafter(eps, INFINITY);
					else if (it % 3 == 2)
						eps = nextafter(eps, 0);
					break;
				}
			default:
				eps = test_uniform(0, 2) * scale;
		}
		interval_both_ways(&p, &a, &b, eps, &count);
	}
	print_message("branch-free free intervals checked: %ld\n", count);
}

/*
 * The coupling filter: with room enough it answers exactly "discrete
 * distance <= eps" (fr_discrete_distance, itself checked against GEOS in
 * test_geos.c), at eps equal to the discrete distance and one double
 * below; and whenever it says yes, the plain decider says yes (the filter
 * must never claim what the deciders would not).
 */
static void
coupling_filter_is_the_discrete_decision(void **state)
{
	long		yes_count = 0,
				count = 0;

	(void) state;
	test_rng_state = 99;
	for (int t = 0; t < 3000; t++)
	{
		int			kind = t % 4;
		size_t		n,
					m;
		double	   *ca,
				   *cb;
		fr_curve	a,
					b;
		test_heap	h;
		fr_env		e = test_env(&h);
		fr_prep		pp,
					pq;
		double		dd,
					eps[3];
		unsigned char *row;

		family_pair(kind, 40, 40, &n, &m, &ca, &cb);
		a = (fr_curve) {ca, n, 2};
		b = (fr_curve) {cb, m, 2};
		row = malloc(n);

		assert_int_equal(fr_discrete_distance(&e, &a, &b, &dd), FR_OK);
		assert_int_equal(fr_prepare_pair(&e, &a, &b, &pp, &pq), FR_OK);
		eps[0] = fr_to_local(&pp, dd);
		eps[1] = nextafter(eps[0], 0);
		eps[2] = eps[0] * test_uniform(0.5, 1.5);
		for (int k = 0; k < 3; k++)
		{
			bool		c = fr_coupling_within(&pp, &pq, eps[k], row),
						plain;
			double	   *r = malloc(n * sizeof(double));

			/* the engine's discrete distance is the largest coupled vertex distance */
			if (c != (eps[k] >= eps[0]))
				fail_msg("pair %d (kind %d, n=%zu m=%zu) eps=%.17g, discrete %.17g: coupling says %d",
						 t, kind, n, m, eps[k], eps[0], c);
			assert_int_equal(fr_decide_prepared(&e, &pp, &pq, eps[k], r, &plain, NULL), FR_OK);
			if (c && !plain)
				fail_msg("pair %d: coupling within %.17g but the plain decider says no", t, eps[k]);
			yes_count += c;
			count++;
			free(r);
		}
		fr_release_pair(&e, &pp, &pq);
		free(row);
		free(ca);
		free(cb);
	}
	print_message("coupling filter checked: %ld (%ld yes)\n", count, yes_count);
	assert_true(yes_count > count / 4 && yes_count < count - count / 4);
}

/*
 * Engine contract: the coupling sweep polls for interrupts row by row (at
 * least once per FR_INTERRUPT_CELLS pairs) and stops when told, also where
 * it covers whole rows (two curves within eps of each other throughout).
 */
static void
coupling_sweep_is_polled(void **state)
{
	const size_t n = 1500;
	double	   *a = malloc(2 * n * sizeof(double)),
			   *b = malloc(2 * n * sizeof(double));
	fr_curve	ca = {a, n, 2},
				cb = {b, n, 2};
	unsigned char *row = malloc(n);
	test_heap	h;
	fr_env		e = test_env(&h);
	fr_prep		pp,
				pq;
	fr_poll		poll;
	fr_coupling_sweep c;
	size_t		wall;

	(void) state;
	for (size_t i = 0; i < 2 * n; i++)
	{
		a[i] = test_uniform(-1, 1);
		b[i] = test_uniform(-1, 1);
	}
	assert_int_equal(fr_prepare_pair(&e, &ca, &cb, &pp, &pq), FR_OK);
	fr_poll_init(&poll, &e);
	fr_coupling_begin(&c, &pp, &pq, fr_to_local(&pp, 10), row, SIZE_MAX, &poll);
	assert_int_equal(fr_coupling_next(&c, &wall), FR_SWEEP_THROUGH);
	assert_true(c.visited >= n * (n - 1));
	assert_true((size_t) h.interrupt_calls >= c.visited / FR_INTERRUPT_CELLS);
	h.interrupt_after = h.interrupt_calls + 2;
	fr_poll_init(&poll, &e);
	fr_coupling_begin(&c, &pp, &pq, fr_to_local(&pp, 10), row, SIZE_MAX, &poll);
	assert_int_equal(fr_coupling_next(&c, &wall), FR_SWEEP_STOP);
	assert_true(c.visited <= 4 * FR_INTERRUPT_CELLS);
	fr_release_pair(&e, &pp, &pq);
	assert_int_equal(h.live, 0);
	free(row);
	free(a);
	free(b);
}

int
main(void)
{
	const struct CMUnitTest tests[] = {
		cmocka_unit_test(branch_free_interval_matches),
		cmocka_unit_test(coupling_filter_is_the_discrete_decision),
		cmocka_unit_test(coupling_sweep_is_polled),
		cmocka_unit_test(pruned_agrees_with_plain),
		cmocka_unit_test(wall_probes_agree_with_plain),
		cmocka_unit_test(fast_distance_equals_reference),
		cmocka_unit_test(distance_with_wall_probes_equals_reference),
		cmocka_unit_test(simplified_bounds_keep_the_result),
	};

	return cmocka_run_group_tests_name("prune", tests, NULL, NULL);
}
