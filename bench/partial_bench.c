/*
 * partial_bench.c - partial matching on long routes, side by side in one
 * run (issue figures are the ratios).
 *
 * Pairs: an invented winding route of m vertices about 10 m apart, and a
 * trip that drives a tenth of it (from 40 % to 50 % of its vertices),
 * sampled every 8-14 m with up to 3 m of noise.  For each pair:
 *   - partial distance with the unwindowed partial decider (the engine's
 *     reference, src/core/partial.c), the sweep of the whole free space;
 *   - the same search with the windowed decider of corridor search
 *     (fr_passage_distance with the roles reversed: what the SQL function
 *     frechet_partial_distance runs);
 *   - fr_distance between the trip and the route part partial matching
 *     picks at that distance (the baseline the issue sets: "within 5x").
 * Both partial distances must be equal.  Times are medians of runs.
 *
 * Usage: partial_bench [route vertices ...]   (default 2000 10000)
 */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <time.h>

#define BENCH_SEED 0x9A97A1ull
#include "fr_internal.h"
#include "benchutil.h"

/* A winding route of m vertices, about 10 m apart. */
static double *
winding_route(size_t m)
{
	double	   *r = malloc(2 * m * sizeof(double)),
				heading = 0;

	r[0] = r[1] = 0;
	for (size_t k = 1; k < m; k++)
	{
		heading += uniform(-0.25, 0.25);
		r[2 * k] = r[2 * k - 2] + 10 * cos(heading);
		r[2 * k + 1] = r[2 * k - 1] + 10 * sin(heading);
	}
	return r;
}

/* A trip along route positions from..to, every 8-14 m of route, up to 3 m of noise. */
static double *
drive(const fr_curve *route, double from, double to, size_t *n)
{
	double	   *t = malloc(2 * (size_t) ((to - from) * 2 + 4) * sizeof(double));
	size_t		k = 0;

	for (double pos = from; pos < to; pos += uniform(0.8, 1.4))
	{
		fr_curve_point(route, pos, t + 2 * k);
		t[2 * k] += uniform(-3, 3);
		t[2 * k + 1] += uniform(-3, 3);
		k++;
	}
	fr_curve_point(route, to, t + 2 * k);
	*n = k + 1;
	return t;
}

/* The unwindowed partial distance (the reference decider of partial.c). */
static fr_status
unwindowed(const fr_curve *trip, const fr_curve *route, double *d)
{
	return fr_partial_distance_with(&env, trip, route, fr_partial_decide_prepared, d, NULL);
}

static int
cmp(const void *a, const void *b)
{
	double		x = *(const double *) a,
				y = *(const double *) b;

	return x < y ? -1 : x > y;
}

/* Median of runs of one computation, in ms. */
#define MEDIAN_MS(reps, expr) \
	({ double t_[reps]; for (int r_ = 0; r_ < (reps); r_++) { double s_ = now(); (expr); t_[r_] = (now() - s_) * 1e3; } \
	   qsort(t_, (reps), sizeof(double), cmp); t_[(reps) / 2]; })

int
main(int argc, char **argv)
{
	size_t		sizes[8] = {2000, 10000};
	int			nsizes = 2,
				bad = 0;

	if (argc > 1)
	{
		nsizes = 0;
		for (int i = 1; i < argc && nsizes < 8; i++)
			sizes[nsizes++] = (size_t) strtoul(argv[i], NULL, 10);
	}
	printf("| route vertices | trip vertices | partial distance | unwindowed ms | windowed ms | fr_distance to the part ms | unwindowed / windowed | windowed / part |\n");
	printf("|---|---|---|---|---|---|---|---|\n");
	for (int s = 0; s < nsizes; s++)
	{
		size_t		m = sizes[s],
					n;
		double	   *rc = winding_route(m);
		fr_curve	route = {rc, m, 2},
					trip;
		double	   *tc = drive(&route, 0.4 * (m - 1), 0.5 * (m - 1), &n),
					d_plain = -1,
					d_win = -1,
					d_part = -1,
					from,
					to,
					part_d,
				   *pc;
		bool		found = false;
		int			reps = m > 20000 ? 3 : 5;
		double		t_plain,
					t_win,
					t_part;
		size_t		pn = 0;

		trip = (fr_curve) {tc, n, 2};
		t_plain = MEDIAN_MS(reps, unwindowed(&trip, &route, &d_plain));
		t_win = MEDIAN_MS(reps, fr_passage_distance(&env, &route, &trip, &d_win, NULL));
		fr_partial_match(&env, &trip, &route, d_win, &found, &from, &to, &part_d, NULL);
		pc = malloc(2 * (m + 2) * sizeof(double));
		fr_curve_point(&route, from, pc);
		pn = 1;
		for (size_t k = (size_t) floor(from) + 1; (double) k < to; k++, pn++)
		{
			pc[2 * pn] = rc[2 * k];
			pc[2 * pn + 1] = rc[2 * k + 1];
		}
		fr_curve_point(&route, to, pc + 2 * pn++);
		{
			fr_curve	part = {pc, pn, 2};

			t_part = MEDIAN_MS(reps, fr_distance(&env, &trip, &part, &d_part, NULL));
		}
		if (d_plain != d_win || !found)
		{
			bad++;
			fprintf(stderr, "route %zu: unwindowed %.17g, windowed %.17g, found %d\n", m, d_plain, d_win, found);
		}
		printf("| %zu | %zu | %.3f | %.1f | %.1f | %.1f | %.1fx | %.1fx |\n",
			   m, n, d_win, t_plain, t_win, t_part, t_plain / t_win, t_win / t_part);
		free(rc);
		free(tc);
		free(pc);
	}
	return bad != 0;
}
