/*
 * test_bounds.c - unit tests of the index summaries and cheap bounds
 * (cmocka).  The reference is the engine's own exact distance and plain
 * decider: a lower bound above the distance, or a cheap verdict that
 * contradicts the plain decider, is a bug that would make the index drop
 * rows or frechet_at_most answer wrongly.
 */
#include <float.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdio.h>

#include <cmocka.h>

#include "testutil.h"
#include "bounds.h"

/* Scales and offsets the pairs are tried at: plain, Web-Mercator-sized, tiny, huge. */
static const double scales[][2] = {{1.0, 0.0}, {1.0, 1e7}, {1e-170, 0.0}, {1e-158, 3e-157},
{1e140, 0.0}, {0.25, -6e6}};

/* Continuous distance, asserting success and no leak. */
static double
distance_of(const fr_curve *p, const fr_curve *q)
{
	test_heap	h;
	fr_env		e = test_env(&h);
	double		d = -1;

	assert_int_equal(fr_distance(&e, p, q, &d, NULL), FR_OK);
	assert_int_equal(h.live, 0);
	return d;
}

/* The plain decider's answer. */
static bool
plain_decides(const fr_curve *p, const fr_curve *q, double eps)
{
	test_heap	h;
	fr_env		e = test_env(&h);
	bool		yes = false;

	assert_int_equal(fr_decide_plain(&e, p, q, eps, &yes, NULL), FR_OK);
	assert_int_equal(h.live, 0);
	return yes;
}

/* Kinds of generated pairs. */
enum pair_kind
{
	PAIR_JITTER,				/* a walk and a noisy copy */
	PAIR_RESAMPLED,				/* a walk and a copy with extra midpoints */
	PAIR_REVERSED,				/* a walk and its reverse */
	PAIR_UNRELATED,				/* two walks */
	PAIR_POINT,					/* a point and a walk */
	PAIR_SAME,					/* a walk and itself */
	PAIR_KINDS
};

/* Fills a and b (room for 2 * 64 doubles each) with a pair of the given kind; returns n, sets *m. */
static size_t
make_pair(int kind, double *a, double *b, size_t *m)
{
	size_t		n = 1 + test_rand64() % 20;
	double	   *w = test_walk(n, test_uniform(-5, 5), test_uniform(-5, 5), 3.0);
	double	   *j;

	memcpy(a, w, 2 * n * sizeof(double));
	*m = n;
	switch (kind)
	{
		case PAIR_JITTER:
			j = test_jitter(w, n, 2, 0.7);
			memcpy(b, j, 2 * n * sizeof(double));
			free(j);
			break;
		case PAIR_RESAMPLED:
			*m = 0;
			for (size_t i = 0; i < n; i++)
			{
				b[2 * (*m)] = w[2 * i];
				b[2 * (*m) + 1] = w[2 * i + 1];
				(*m)++;
				if (i + 1 < n)
				{
					b[2 * (*m)] = (w[2 * i] + w[2 * i + 2]) / 2;
					b[2 * (*m) + 1] = (w[2 * i + 1] + w[2 * i + 3]) / 2 + test_uniform(-0.3, 0.3);
					(*m)++;
				}
			}
			break;
		case PAIR_REVERSED:
			for (size_t i = 0; i < n; i++)
			{
				b[2 * i] = w[2 * (n - 1 - i)];
				b[2 * i + 1] = w[2 * (n - 1 - i) + 1];
			}
			break;
		case PAIR_UNRELATED:
			free(w);
			*m = 1 + test_rand64() % 20;
			w = test_walk(*m, test_uniform(-5, 5), test_uniform(-5, 5), 3.0);
			memcpy(b, w, 2 * (*m) * sizeof(double));
			break;
		case PAIR_POINT:
			a[0] = test_uniform(-5, 5);
			a[1] = test_uniform(-5, 5);
			memcpy(b, w, 2 * n * sizeof(double));
			n = 1;
			break;
		default:
			memcpy(b, w, 2 * n * sizeof(double));
			break;
	}
	free(w);
	return n;
}

/* Scales and shifts a curve in place. */
static void
rescale(double *c, size_t n, double scale, double offset)
{
	for (size_t i = 0; i < 2 * n; i++)
		c[i] = c[i] * scale + offset;
}

/* The summary bound and the hull bound never exceed the exact distance. */
static void
lower_bounds_stay_below_the_distance(void **state)
{
	double		a[128],
				b[128],
				sorted[256],
				hull[512];

	for (int iter = 0; iter < 3000; iter++)
	{
		int			kind = iter % PAIR_KINDS;
		size_t		m,
					n = make_pair(kind, a, b, &m);
		const double *sc = scales[(iter / PAIR_KINDS) % (sizeof(scales) / sizeof(scales[0]))];
		fr_curve	p = {a, n, 2},
					q = {b, m, 2};
		fr_key		kp,
					kq;
		size_t		nh;
		double		d;

		rescale(a, n, sc[0], sc[1]);
		rescale(b, m, sc[0], sc[1]);
		d = distance_of(&p, &q);
		fr_key_of_curve(&p, &kp);
		fr_key_of_curve(&q, &kq);
		nh = fr_convex_hull(&q, sorted, hull);
		if (fr_key_bound(&kp, &kq) > d || fr_key_hull_bound(&kp, &kq, hull, nh) > d)
			fail_msg("bound above distance: kind %d scale %g: %.17g, %.17g > %.17g", kind,
					 sc[0], fr_key_bound(&kp, &kq), fr_key_hull_bound(&kp, &kq, hull, nh), d);
		if (kind == PAIR_SAME)
			assert_true(fr_key_hull_bound(&kp, &kq, hull, nh) == 0.0);
	}
}

/* An inner node's bound is at most the bound of every entry under it. */
static void
node_bound_is_below_its_entries(void **state)
{
	double		a[128],
				b[128],
				sorted[256],
				hull[512];

	for (int iter = 0; iter < 300; iter++)
	{
		fr_key		node,
					keys[8],
					kq;
		size_t		m,
					n,
					nh;
		fr_curve	q;

		n = make_pair(PAIR_UNRELATED, a, b, &m);
		q = (fr_curve) {b, m, 2};
		fr_key_of_curve(&q, &kq);
		nh = fr_convex_hull(&q, sorted, hull);
		for (int k = 0; k < 8; k++)
		{
			double	   *w = test_walk(1 + k, test_uniform(-9, 9), test_uniform(-9, 9), 4.0);
			fr_curve	c = {w, 1 + k, 2};

			fr_key_of_curve(&c, &keys[k]);
			if (k == 0)
				node = keys[0];
			else
				fr_key_union(&node, &keys[k]);
			free(w);
		}
		(void) n;
		for (int k = 0; k < 8; k++)
		{
			assert_true(fr_key_bound(&node, &kq) <= fr_key_bound(&keys[k], &kq));
			assert_true(fr_key_hull_bound(&node, &kq, hull, nh) <= fr_key_hull_bound(&keys[k], &kq, hull, nh));
			assert_true(fr_key_penalty(&node, &keys[k]) == 0.0);
		}
	}
}

/*
 * Cheap verdicts never contradict the plain decider, at eps around the
 * distance (exactly at it, one double either side, and relative steps) and
 * far from it.
 */
static void
cheap_verdicts_agree_with_the_plain_decider(void **state)
{
	double		a[128],
				b[128];
	static const double factors[] = {0.0, 0.5, 0.9, 1 - 1e-9, 1.0, 1 + 1e-9, 1.1, 2.0};
	long		settled = 0,
				asked = 0;

	for (int iter = 0; iter < 3000; iter++)
	{
		int			kind = iter % PAIR_KINDS;
		size_t		m,
					n = make_pair(kind, a, b, &m);
		const double *sc = scales[(iter / PAIR_KINDS) % (sizeof(scales) / sizeof(scales[0]))];
		fr_curve	p = {a, n, 2},
					q = {b, m, 2};
		double		d;

		rescale(a, n, sc[0], sc[1]);
		rescale(b, m, sc[0], sc[1]);
		d = distance_of(&p, &q);
		for (int f = 0; f < (int) (sizeof(factors) / sizeof(factors[0])) + 2; f++)
		{
			double		eps = f < 8 ? d * factors[f] : f == 8 ? nextafter(d, 0) : nextafter(d, INFINITY);
			fr_verdict	v = fr_cheap_decide(&p, &q, eps);

			/* below about 1e-150 the slack swallows every bound: nothing settles there */
			asked += sc[0] > 1e-100;
			if (v == FR_UNDECIDED)
				continue;
			settled++;
			if ((v == FR_NEAR) != plain_decides(&p, &q, eps))
				fail_msg("cheap verdict %d contradicts the decider: kind %d scale %g eps %.17g d %.17g",
						 v, kind, sc[0], eps, d);
		}
	}
	printf("# cheap bounds settled %ld of %ld decisions at ordinary scales\n", settled, asked);
	/* the bounds must settle a fair share of these pairs, or they are not working */
	assert_true(settled * 4 > asked);
}

/*
 * The greedy coupling's adaptive runs (steps taken on a bound of the
 * leash, bounds.c): densely sampled parallel tracks (0.01 between samples,
 * runs of dozens of steps) 0.2 apart are settled near at
 * eps = 1, and a single spike in one of them, between dense samples, is
 * never run over: at the same eps the verdict is no longer near.  The
 * spike points back along the track, so it stays within the other track's
 * box and near it, and only the greedy walks could (wrongly) settle it.
 * The plain decider agrees with both answers.
 */
static void
greedy_runs_do_not_skip_a_spike(void **state)
{
	const size_t n = 3000;
	double	   *a = malloc(2 * n * sizeof(double)),
			   *b = malloc(2 * n * sizeof(double));
	fr_curve	p = {a, n, 2},
				q = {b, n, 2};

	(void) state;
	for (size_t i = 0; i < n; i++)
	{
		a[2 * i] = 0.01 * (double) i;
		a[2 * i + 1] = 0.0;
		b[2 * i] = 0.01 * (double) i + 0.001 * sin((double) i);
		b[2 * i + 1] = 0.2 + 0.001 * cos((double) i);
	}
	assert_int_equal(fr_cheap_decide(&p, &q, 1.0), FR_NEAR);
	assert_true(plain_decides(&p, &q, 1.0));
	a[2 * (n / 2)] -= 10.0;
	assert_int_not_equal(fr_cheap_decide(&p, &q, 1.0), FR_NEAR);
	assert_false(plain_decides(&p, &q, 1.0));
	free(a);
	free(b);
}

/*
 * The greedy walk through the free space (bounds.c) proves near a track
 * that follows a planned route of few vertices, 100 m segments sampled
 * every 2 m with up to 3 m of sideways noise, at eps = 10 m: only the walk
 * can (a track point between two route vertices is far from both, so no
 * vertex coupling works).  Its entries lie on circles of radius eps, where
 * rounding puts the measured distance above eps about every other time; a
 * walk that gave up there would stop within the first segments.  The plain
 * decider agrees.
 */
static void
greedy_walk_follows_a_planned_route(void **state)
{
	const size_t m = 11,
				n = 501;
	double		route[2 * 11],
			   *track = malloc(2 * n * sizeof(double));
	fr_curve	p = {track, n, 2},
				q = {route, m, 2};

	(void) state;
	for (size_t j = 0; j < m; j++)
	{
		route[2 * j] = 100.0 * (double) j;
		route[2 * j + 1] = 30.0 * (double) (j % 2);
	}
	for (size_t i = 0; i < n; i++)
	{
		double		u = (double) i / 50.0;	/* route parameter: segment floor(u) */
		size_t		j = i + 1 < n ? (size_t) u : m - 2;
		double		f = u - (double) j;

		track[2 * i] = route[2 * j] + f * (route[2 * j + 2] - route[2 * j]);
		track[2 * i + 1] = route[2 * j + 1] + f * (route[2 * j + 3] - route[2 * j + 1]) +
			(i == 0 || i + 1 == n ? 0.0 : test_uniform(-3, 3));
	}
	assert_int_equal(fr_cheap_decide(&p, &q, 10.0), FR_NEAR);
	assert_true(plain_decides(&p, &q, 10.0));
	free(track);
}

/* The filters do fire where they should: a far shift, a close noisy copy, a reversal. */
static void
cheap_verdicts_fire_on_clear_cases(void **state)
{
	double		w[2 * 12],
				s[2 * 12],
				r[2 * 12];

	for (int i = 0; i < 12; i++)
	{
		w[2 * i] = i * 10.0;
		w[2 * i + 1] = (i % 3) * 4.0;
		s[2 * i] = w[2 * i] + 30.0;
		s[2 * i + 1] = w[2 * i + 1] + 40.0;
		r[2 * (11 - i)] = w[2 * i] + 0.5;
		r[2 * (11 - i) + 1] = w[2 * i + 1];
	}
	{
		fr_curve	p = {w, 12, 2},
					shifted = {s, 12, 2},
					reversed = {r, 12, 2};

		/* common practice: a translate by v is at distance |v| = 50 */
		assert_int_equal(fr_cheap_decide(&p, &shifted, 49.0), FR_FAR);
		assert_int_equal(fr_cheap_decide(&p, &shifted, 50.5), FR_NEAR);
		assert_int_equal(fr_cheap_decide(&p, &shifted, 50.0), FR_UNDECIDED);
		assert_int_equal(fr_cheap_decide(&p, &reversed, 20.0), FR_FAR);
		assert_int_equal(fr_cheap_decide(&p, &p, 0.0), FR_UNDECIDED);
		assert_int_equal(fr_cheap_decide(&p, &p, 1e-9), FR_NEAR);
		assert_int_equal(fr_cheap_decide(&p, &shifted, INFINITY), FR_NEAR);
	}
}

/* The hull holds only input vertices, and the farthest vertex from any box is on it. */
static void
hull_keeps_the_farthest_vertex(void **state)
{
	double		sorted[2 * 200],
				hull[4 * 200];

	for (int iter = 0; iter < 500; iter++)
	{
		size_t		n = 1 + test_rand64() % 200;
		double	   *w = test_walk(n, 0, 0, iter % 2 ? 5.0 : 1e-3);
		fr_curve	c = {w, n, 2};
		size_t		nh = fr_convex_hull(&c, sorted, hull);
		fr_key		box,
					pt;
		double		x = test_uniform(-20, 20),
					y = test_uniform(-20, 20);
		double		all = 0.0,
					on_hull = 0.0;

		assert_true(nh >= 1 && nh <= 2 * n);
		for (size_t h = 0; h < nh; h++)
		{
			bool		found = false;

			for (size_t i = 0; i < n && !found; i++)
				found = hull[2 * h] == w[2 * i] && hull[2 * h + 1] == w[2 * i + 1];
			assert_true(found);
		}
		/* a one-point box at (x, y): the bound is then the farthest vertex's distance */
		for (int k = 0; k < FR_KEY_NDIM; k++)
		{
			box.lo[k] = box.hi[k] = (k % 2 == 0) ? x : y;
			pt.lo[k] = pt.hi[k] = (k % 2 == 0) ? x : y;
		}
		box.reach = pt.reach = 0.0;
		for (size_t i = 0; i < n; i++)
			all = fmax(all, hypot(w[2 * i] - x, w[2 * i + 1] - y));
		on_hull = fr_key_hull_bound(&box, &pt, hull, nh);
		assert_true(on_hull <= all);
		assert_true(test_close(on_hull, all, 1e-8));
		free(w);
	}
}

/* The all-covering key of invalid tracks: bound 0, absorbs unions, no NaN anywhere. */
static void
everything_key_covers_all(void **state)
{
	double		w[] = {1, 2, 3, 4, -5, 6};
	fr_curve	c = {w, 3, 2};
	fr_key		all,
				k,
				u;

	fr_key_everything(&all);
	fr_key_of_curve(&c, &k);
	k.reach = 1.0;
	assert_true(fr_key_bound(&all, &k) == 0.0);
	assert_true(fr_key_bound(&k, &all) == 0.0);
	assert_true(fr_key_bound(&all, &all) == 0.0);
	assert_true(fr_key_hull_bound(&all, &k, w, 3) == 0.0);
	u = k;
	fr_key_union(&u, &all);
	assert_true(fr_key_equal(&u, &all) == false);	/* reach differs */
	u.reach = 0.0;
	assert_true(fr_key_equal(&u, &all));
	assert_true(isinf(fr_key_penalty(&k, &all)));
	assert_true(fr_key_penalty(&all, &k) == 0.0);
	assert_true(fr_key_penalty(&all, &all) == 0.0);
	assert_true(isinf(fr_key_margin(&all)));
}

/*
 * Packed keys (float4, for the index to store) cover the keys they pack,
 * interval by interval, at every scale (and to infinity beyond float4's
 * range), and no bound rises when computed on them: the index keeps every
 * curve with packed keys that it keeps with full ones.
 */
static void
packed_keys_cover_and_never_raise_bounds(void **state)
{
	double		a[128],
				b[128],
				sorted[256],
				hull[512];
	static const double key_scales[][2] = {{1.0, 0.0}, {1.0, 1e7}, {1e-40, 0.0}, {1e-170, 0.0},
	{1e35, 0.0}, {1e39, 0.0}, {1e300, 0.0}, {0.25, -6e6}};

	for (size_t sc = 0; sc < sizeof(key_scales) / sizeof(key_scales[0]); sc++)
	{
		for (int iter = 0; iter < 300; iter++)
		{
			fr_key		ka,
						kb,
						node,
						unpacked[3];
			const fr_key *orig[3] = {&ka, &kb, &node};
			float		packed[FR_KEY_PACKED_RANGE];
			size_t		m,
						n,
						nh;
			fr_curve	p,
						q;

			n = make_pair((enum pair_kind) (iter % PAIR_KINDS), a, b, &m);
			for (size_t i = 0; i < 2 * n; i++)
				a[i] = a[i] * key_scales[sc][0] + key_scales[sc][1];
			for (size_t i = 0; i < 2 * m; i++)
				b[i] = b[i] * key_scales[sc][0] + key_scales[sc][1];
			p = (fr_curve) {a, n, 2};
			q = (fr_curve) {b, m, 2};
			fr_key_of_curve(&p, &ka);
			fr_key_of_curve(&q, &kb);
			node = ka;
			fr_key_union(&node, &kb);
			nh = fr_convex_hull(&q, sorted, hull);
			for (int k = 0; k < 3; k++)
			{
				size_t		np = fr_key_pack(orig[k], packed);

				/* one curve's key packs small unless its values leave float4's range */
				if (k < 2 && key_scales[sc][0] < 1e38)
					assert_int_equal(np, FR_KEY_PACKED_POINT);
				if (k == 2 && !fr_key_equal(&ka, &kb))
					assert_int_equal(np, FR_KEY_PACKED_RANGE);
				assert_true(fr_key_unpack(packed, np, &unpacked[k]));
				for (int i = 0; i < FR_KEY_NDIM; i++)
				{
					assert_true(unpacked[k].lo[i] <= orig[k]->lo[i]);
					assert_true(unpacked[k].hi[i] >= orig[k]->hi[i]);
				}
			}
			kb.reach = 1.0;
			for (int k = 0; k < 3; k += 2)
			{
				assert_true(fr_key_bound(&unpacked[k], &kb) <= fr_key_bound(orig[k], &kb));
				assert_true(fr_key_ping_bound(&unpacked[k], &kb) <= fr_key_ping_bound(orig[k], &kb));
				assert_true(fr_key_ping_bound_ends(&unpacked[k], &kb) <= fr_key_ping_bound_ends(orig[k], &kb));
				assert_true(fr_key_passage_bound(&unpacked[k], &kb) <= fr_key_passage_bound(orig[k], &kb));
				assert_true(fr_key_hull_bound(&unpacked[k], &kb, hull, nh) <= fr_key_hull_bound(orig[k], &kb, hull, nh));
				assert_true(fr_key_passage_hull_bound(&unpacked[k], &kb, hull, nh) <=
							fr_key_passage_hull_bound(orig[k], &kb, hull, nh));
			}
		}
	}
	{
		float		junk[3] = {0};
		fr_key		k;

		assert_false(fr_key_unpack(junk, 3, &k));
	}
}

int
main(void)
{
	const struct CMUnitTest tests[] = {
		cmocka_unit_test(lower_bounds_stay_below_the_distance),
		cmocka_unit_test(node_bound_is_below_its_entries),
		cmocka_unit_test(cheap_verdicts_agree_with_the_plain_decider),
		cmocka_unit_test(cheap_verdicts_fire_on_clear_cases),
		cmocka_unit_test(greedy_runs_do_not_skip_a_spike),
		cmocka_unit_test(greedy_walk_follows_a_planned_route),
		cmocka_unit_test(hull_keeps_the_farthest_vertex),
		cmocka_unit_test(everything_key_covers_all),
		cmocka_unit_test(packed_keys_cover_and_never_raise_bounds),
	};

	return cmocka_run_group_tests(tests, NULL, NULL);
}
