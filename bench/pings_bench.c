/*
 * pings_bench.c - the ping functions against the continuous ones on the
 * same pairs, side by side in one run (issue figures are the ratios).
 *
 * Pairs: an invented street route of right-angle blocks (80 to 250 m) and
 * a trip of pings along it, each ping within 12 m of the route, spaced as
 * a tracker reporting every 30 s at 4 to 12 m/s would space them.  For
 * each pair: the ping distance d_p, the continuous distance d_c; the ping
 * decision at 1.05 d_p, 0.95 d_p and 1.05 d_c against the continuous
 * decision (fr_decide, what frechet_at_most runs) at the same eps; the
 * ping distance against fr_distance.  Times are medians of repeated runs.
 *
 * Usage: pings_bench [pings]   (default 10000)
 */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <time.h>

#define BENCH_SEED 0x5EED5EEDull
#include "frechet.h"
#include "benchutil.h"

/* A street route of m vertices: blocks east or north, turning at each. */
static double *
street_route(size_t m)
{
	double	   *r = malloc(2 * m * sizeof(double));

	r[0] = r[1] = 0;
	for (size_t k = 1; k < m; k++)
	{
		double		len = uniform(80, 250);
		int			dir = (int) (k % 2);	/* alternate east / north, sometimes south */

		r[2 * k] = r[2 * k - 2] + (dir == 0 ? len : 0);
		r[2 * k + 1] = r[2 * k - 1] + (dir == 1 ? (uniform(0, 1) < 0.3 ? -len : len) : 0);
	}
	return r;
}

/* n pings along route r (m vertices), 30 s apart at 4-12 m/s, within 12 m. */
static double *
pings_along(const double *r, size_t m, size_t n)
{
	double	   *p = malloc(2 * n * sizeof(double)),
				total = 0,
				s = 0;
	size_t		k = 0;
	double		k_start = 0;

	for (size_t j = 0; j + 1 < m; j++)
		total += hypot(r[2 * j + 2] - r[2 * j], r[2 * j + 3] - r[2 * j + 1]);
	for (size_t i = 0; i < n; i++)
	{
		double		len,
					t,
					a;

		s = i == n - 1 ? total : (i == 0 ? 0 : fmin(s + uniform(120, 360) * total / (240.0 * (n - 1)) , total));
		while (k + 2 < m && k_start + hypot(r[2 * k + 2] - r[2 * k], r[2 * k + 3] - r[2 * k + 1]) < s)
		{
			k_start += hypot(r[2 * k + 2] - r[2 * k], r[2 * k + 3] - r[2 * k + 1]);
			k++;
		}
		len = hypot(r[2 * k + 2] - r[2 * k], r[2 * k + 3] - r[2 * k + 1]);
		t = len > 0 ? fmin(1, (s - k_start) / len) : 0;
		a = uniform(0, 2 * M_PI);
		p[2 * i] = r[2 * k] + t * (r[2 * k + 2] - r[2 * k]) + uniform(0, 12) * cos(a);
		p[2 * i + 1] = r[2 * k + 1] + t * (r[2 * k + 3] - r[2 * k + 1]) + uniform(0, 12) * sin(a);
	}
	return p;
}

typedef enum op
{
	OP_PING_DECIDE,
	OP_CONT_DECIDE,
	OP_PING_DISTANCE,
	OP_CONT_DISTANCE
} op;

/* Median seconds of reps runs of one operation; *answer receives its result. */
static double
time_op(op o, const fr_curve *p, const fr_curve *q, double eps, int reps, double *answer)
{
	double		t[15];

	for (int r = 0; r < reps; r++)
	{
		double		t0 = now(),
					d = 0;
		bool		yes = false;

		switch (o)
		{
			case OP_PING_DECIDE:
				fr_pings_decide(&env, p, q, eps, -1, &yes);
				d = yes;
				break;
			case OP_CONT_DECIDE:
				fr_decide(&env, p, q, eps, &yes, NULL);
				d = yes;
				break;
			case OP_PING_DISTANCE:
				fr_pings_distance(&env, p, q, -1, &d, NULL);
				break;
			case OP_CONT_DISTANCE:
				fr_distance(&env, p, q, &d, NULL);
				break;
		}
		t[r] = now() - t0;
		*answer = d;
	}
	for (int i = 1; i < reps; i++)
		for (int j = i; j > 0 && t[j] < t[j - 1]; j--)
		{
			double		x = t[j];

			t[j] = t[j - 1];
			t[j - 1] = x;
		}
	return t[reps / 2];
}

int
main(int argc, char **argv)
{
	size_t		n = argc > 1 ? (size_t) atol(argv[1]) : 10000,
				m = 3 * n / 2 + 2;	/* blocks of 165 m on average, pings 240 m apart */
	const int	pairs = 5,
				reps = 5;

	printf("pings: %zu pings against a street route of %zu vertices, %d pairs, medians of %d runs\n",
		   n, m, pairs, reps);
	printf("%4s %10s %10s | %-22s %10s %10s %7s\n", "pair", "d_pings", "d_cont", "eps", "pings ms", "cont ms", "ratio");
	for (int k = 0; k < pairs; k++)
	{
		double	   *r = street_route(m),
				   *pg = pings_along(r, m, n);
		fr_curve	p = {pg, n, 2},
					q = {r, m, 2};
		double		dp,
					dc,
					a,
					b,
					tp,
					tc;

		tp = time_op(OP_PING_DISTANCE, &p, &q, 0, reps, &dp);
		tc = time_op(OP_CONT_DISTANCE, &p, &q, 0, reps, &dc);
		printf("%4d %10.3f %10.3f | %-22s %10.3f %10.3f %7.1f\n", k, dp, dc, "distance", tp * 1e3, tc * 1e3, tc / tp);
		for (int f = 0; f < 3; f++)
		{
			/* 1.05 and 0.95 of the ping distance, and 1.05 of the continuous one */
			double		eps = f == 2 ? dc * 1.05 : dp * (f == 0 ? 1.05 : 0.95);
			char		label[32];

			tp = time_op(OP_PING_DECIDE, &p, &q, eps, reps, &a);
			tc = time_op(OP_CONT_DECIDE, &p, &q, eps, reps, &b);
			snprintf(label, sizeof(label), "decide %.2f d_%s (%s/%s)", f == 1 ? 0.95 : 1.05,
					 f == 2 ? "c" : "p", a ? "y" : "n", b ? "y" : "n");
			printf("%4d %10s %10s | %-22s %10.3f %10.3f %7.1f\n", k, "", "", label, tp * 1e3, tc * 1e3, tc / tp);
		}
		free(r);
		free(pg);
	}
	return 0;
}
