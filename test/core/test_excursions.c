/*
 * test_excursions.c - where a trip left its route.  Constructed detours
 * must come out as excursions, and every reported plan is checked
 * independently: between excursions the trip must be within eps of the
 * route part it was assigned, in order (the definition of an order-
 * preserving matching within eps), and the route length reported
 * between where it left and rejoined is the length of that route part.
 */
#include <float.h>
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdio.h>

#include <cmocka.h>

#include "testutil.h"

/* Excursions through the public API, asserting no leak. */
static fr_excursion *
excursions(const fr_curve *t, const fr_curve *r, double eps, size_t *count)
{
	test_heap	h;
	fr_env		e = test_env(&h);
	fr_excursion *x;

	assert_int_equal(fr_excursions(&e, t, r, eps, &x, count, NULL), FR_OK);
	assert_int_equal(h.live, *count > 0 ? 1 : 0);
	return x;
}

/*
 * Checks a plan independently: excursions in trip order, route positions
 * non-decreasing, and every on-route run (from the end of one excursion to
 * the start of the next, vertex 0 at route 0 and the last vertex at the
 * route's end) within eps of its route part.
 */
static void
check_plan(const fr_curve *t, const fr_curve *r, double eps, const fr_excursion *x, size_t count)
{
	double		tv = 0,
				rv = 0;

	for (size_t k = 0; k <= count; k++)
	{
		double		tw = k < count ? x[k].trip_from : (double) (t->n - 1),
					rw = k < count ? x[k].route_from : (double) (r->n - 1);

		assert_true(tw >= tv && rw >= rv);
		if (tw > tv)
		{
			size_t		nt,
						nr;
			double	   *pt = test_part_of(t, tv, tw, &nt),
					   *pr = test_part_of(r, rv, rw, &nr);
			fr_curve	ct = {pt, nt, 2},
						cr = {pr, nr, 2};
			double		d = test_distance(&ct, &cr);

			if (!(d <= eps * (1 + 1e-9)))
				fail_msg("on-route run %g..%g (route %g..%g) at distance %g > eps %g", tv, tw, rv, rw, d, eps);
			free(pt);
			free(pr);
		}
		if (k < count)
		{
			/* route_length: the route part between, measured apart */
			size_t		np;
			double	   *pp = test_part_of(r, x[k].route_from, x[k].route_to, &np),
						len = 0;

			for (size_t i = 0; i + 1 < np; i++)
				len += hypot(pp[2 * i + 2] - pp[2 * i], pp[2 * i + 3] - pp[2 * i + 1]);
			free(pp);
			if (!(fabs(x[k].route_length - len) <= 1e-9 * (1 + len)))
				fail_msg("excursion %zu: route_length %.17g, the route part is %.17g long", k, x[k].route_length, len);
			assert_true(x[k].trip_to > x[k].trip_from);
			assert_true(x[k].route_to >= x[k].route_from);
			assert_true(x[k].trip_length > 0);
			tv = x[k].trip_to;
			rv = x[k].route_to;
		}
	}
}

/* A winding street of m vertices 20 m apart. */
static double *
street(size_t m, double phase)
{
	double	   *c = malloc(2 * m * sizeof(double));

	for (size_t i = 0; i < m; i++)
	{
		double		heading = 0.4 * sin(i / 11.0 + phase);

		c[2 * i] = i == 0 ? 0 : c[2 * i - 2] + 20 * cos(heading);
		c[2 * i + 1] = i == 0 ? 0 : c[2 * i - 1] + 20 * sin(heading);
	}
	return c;
}

/*
 * A trip along the route from position 0 to its end, sampled every 0.5-0.9
 * segment with noise, leaving it between the positions in out[] pairs
 * (rectangular detours of 200 m); *leave / *back receive the trip vertex
 * indices of the last sample before and the first after each detour.
 */
static double *
drive(const fr_curve *r, const double *detours, int ndetours, size_t *n,
	  size_t *leave, size_t *back)
{
	double	   *c = malloc(2 * 4 * r->n * sizeof(double));
	size_t		k = 0;
	int			d = 0;

	for (double pos = 0; pos < (double) (r->n - 1); pos += 0.5 + 0.4 * test_uniform(0, 1))
	{
		double		p[2],
					q[2];

		if (d < ndetours && pos >= detours[2 * d])
		{
			/* out 200 m to the left, along, and back */
			double		a = detours[2 * d],
						b = detours[2 * d + 1],
						nx,
						ny,
						len;

			fr_curve_point(r, a, p);
			fr_curve_point(r, a + 0.01, q);
			len = hypot(q[0] - p[0], q[1] - p[1]);
			nx = -(q[1] - p[1]) / len;
			ny = (q[0] - p[0]) / len;
			leave[d] = k - 1;
			for (double s = 50; s <= 200; s += 50)
			{
				c[2 * k] = p[0] + s * nx;
				c[2 * k + 1] = p[1] + s * ny;
				k++;
			}
			for (double s = a + 0.8; s < b; s += 0.8)
			{
				fr_curve_point(r, s, q);
				c[2 * k] = q[0] + 200 * nx;
				c[2 * k + 1] = q[1] + 200 * ny;
				k++;
			}
			fr_curve_point(r, b, q);
			for (double s = 200; s >= 50; s -= 50)
			{
				c[2 * k] = q[0] + s * nx;
				c[2 * k + 1] = q[1] + s * ny;
				k++;
			}
			back[d] = k;
			pos = b;
			d++;
		}
		fr_curve_point(r, pos, p);
		c[2 * k] = p[0] + test_uniform(-2, 2);
		c[2 * k + 1] = p[1] + test_uniform(-2, 2);
		k++;
	}
	fr_curve_point(r, (double) (r->n - 1), c + 2 * k);
	k++;
	*n = k;
	return c;
}

/* One detour gives exactly one excursion, within one sample at each end. */
static void
one_detour_one_excursion(void **state)
{
	for (int t = 0; t < 10; t++)
	{
		const size_t m = 100;
		double	   *cr = street(m, t);
		fr_curve	r = {cr, m, 2};
		double		det[2] = {30 + t, 45 + t};
		size_t		n,
					leave,
					back,
					count;
		double	   *ct = drive(&r, det, 1, &n, &leave, &back);
		fr_curve	tr = {ct, n, 2};
		fr_excursion *x = excursions(&tr, &r, 15, &count);

		assert_int_equal(count, 1);
		if (fabs(x[0].trip_from - leave) > 1 || fabs(x[0].trip_to - back) > 1)
			fail_msg("case %d: excursion %g..%g, detour %zu..%zu", t, x[0].trip_from, x[0].trip_to, leave, back);
		assert_true(fabs(x[0].route_from - det[0]) <= 1.5 && fabs(x[0].route_to - det[1]) <= 1.5);
		assert_true(x[0].max_leash > 150 && x[0].max_leash < 220);
		check_plan(&tr, &r, 15, x, count);
		free(x);
		free(ct);
		free(cr);
	}
}

/* Two detours give two excursions. */
static void
two_detours_two_excursions(void **state)
{
	for (int t = 0; t < 10; t++)
	{
		const size_t m = 120;
		double	   *cr = street(m, 2 * t);
		fr_curve	r = {cr, m, 2};
		double		det[4] = {20, 35, 70 + t, 90 + t};
		size_t		n,
					leave[2],
					back[2],
					count;
		double	   *ct = drive(&r, det, 2, &n, leave, back);
		fr_curve	tr = {ct, n, 2};
		fr_excursion *x = excursions(&tr, &r, 15, &count);

		assert_int_equal(count, 2);
		for (int k = 0; k < 2; k++)
			if (fabs(x[k].trip_from - leave[k]) > 1 || fabs(x[k].trip_to - back[k]) > 1)
				fail_msg("case %d: excursion %d %g..%g, detour %zu..%zu", t, k,
						 x[k].trip_from, x[k].trip_to, leave[k], back[k]);
		check_plan(&tr, &r, 15, x, count);
		free(x);
		free(ct);
		free(cr);
	}
}

/* A trip driving the route backwards is one excursion over essentially all of it. */
static void
backwards_is_one_excursion(void **state)
{
	for (int t = 0; t < 10; t++)
	{
		const size_t m = 80;
		double	   *cr = street(m, t),
				   *rev = malloc(2 * m * sizeof(double));
		fr_curve	r = {cr, m, 2},
					rr;
		size_t		n,
					count;
		double	   *ct,
					total = 0;
		fr_curve	tr;
		fr_excursion *x;

		for (size_t i = 0; i < m; i++)
		{
			rev[2 * i] = cr[2 * (m - 1 - i)];
			rev[2 * i + 1] = cr[2 * (m - 1 - i) + 1];
		}
		rr = (fr_curve) {rev, m, 2};
		ct = drive(&rr, NULL, 0, &n, NULL, NULL);
		tr = (fr_curve) {ct, n, 2};
		x = excursions(&tr, &r, 15, &count);
		assert_int_equal(count, 1);
		for (size_t i = 0; i + 1 < n; i++)
			total += hypot(ct[2 * i + 2] - ct[2 * i], ct[2 * i + 3] - ct[2 * i + 1]);
		assert_true(x[0].trip_length >= 0.95 * total);
		check_plan(&tr, &r, 15, x, count);
		free(x);
		free(ct);
		free(cr);
		free(rev);
	}
}

/*
 * No excursion exactly when the distance is at most eps (the definition);
 * random pairs, at eps = d and just below it, plans checked.
 */
static void
none_exactly_when_close(void **state)
{
	for (int t = 0; t < 300; t++)
	{
		size_t		n = 1 + test_rand64() % 25,
					m = 1 + test_rand64() % 25,
					count;
		double	   *ca = test_walk(n, 0, 0, 5),
				   *cb = t % 2 ? test_walk(m, 0, 0, 5) : test_jitter(ca, n, 2, 1.0);
		fr_curve	a,
					b;
		double		d;
		fr_excursion *x;

		if (t % 2 == 0)
			m = n;
		a = (fr_curve) {ca, n, 2};
		b = (fr_curve) {cb, m, 2};
		d = test_distance(&a, &b);
		x = excursions(&a, &b, d, &count);
		assert_int_equal(count, 0);
		if (d > 0)
		{
			x = excursions(&a, &b, d * 0.9, &count);
			assert_true(count >= 1);
			if (n > 1 && m > 1)
				check_plan(&a, &b, d * 0.9, x, count);
			free(x);
		}
		free(ca);
		free(cb);
	}
}

int
main(void)
{
	const struct CMUnitTest tests[] = {
		cmocka_unit_test(one_detour_one_excursion),
		cmocka_unit_test(two_detours_two_excursions),
		cmocka_unit_test(backwards_is_one_excursion),
		cmocka_unit_test(none_exactly_when_close),
	};

	return cmocka_run_group_tests_name("excursions", tests, NULL, NULL);
}
