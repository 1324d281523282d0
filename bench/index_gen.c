/*
 * index_gen.c - data for the index benchmarks (index_bench.sh,
 * postgis_bench.sh): a table of GPS-like trips in clusters of shared routes,
 * and the range and k-nearest queries run against it.  Writes PostgreSQL
 * COPY text to stdout.
 *
 *   index_gen tracks  --tracks N --routes R --clusters C --seed S
 *   index_gen range   --queries Q ... (same routes: same --routes, --clusters, --seed)
 *   index_gen knn     --queries Q ...
 *   index_gen corridor --queries Q ...
 *
 * Columns: tracks: id, route, kind, track; range and corridor: qid, route,
 * epsilon, path; knn: qid, route, path.  The track or path is a point[]
 * literal.  With --wkt 1 every row has one more column, the same curve as
 * EWKT, SRID=32632;LINESTRING(x y,x y,...), with the same %.2f numbers
 * (for a geometry(LineString,32632) column); --wkt 0, the default, leaves
 * the output as it was without the option.
 *
 * Routes: each cluster has a hub (a bus station, say) at a random place in
 * a 40 km square of projected metres around (450000, 5400000); each of its
 * routes leaves the hub within 300 m and runs 0.7-11.5 km along 20-200 m
 * segments with gentle turns.  Trips drive a route (65 %), part of it
 * (25 %: from 0-35 % to 65-100 % of its length) or all of it backwards
 * (10 %), sampled every 10-30 m with gaussian noise of 3-8 m; with the
 * default 80 routes in 8 clusters they have about 260 points on average
 * (standard deviation about 150).  Queries are fresh drives of the routes
 * (not rows of the table); range queries use epsilon 25, 40 or 60 m.
 * Corridor queries are 1 km stretches of the routes (a point every 10-30 m
 * on the route itself) with epsilon 25 or 40 m.
 */
#define _POSIX_C_SOURCE 200809L

#include <math.h>
#include <stdbool.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#define GEN_PI 3.14159265358979323846
#define ORIGIN_X 450000.0
#define ORIGIN_Y 5400000.0
#define AREA 40000.0

typedef struct gen_rng
{
	uint64_t	state;
} gen_rng;

typedef struct pts
{
	double	   *xy;
	size_t		n,
				cap;
} pts;

typedef struct gen_opts
{
	const char *mode;
	long		tracks;
	long		routes;
	long		clusters;
	long		queries;
	uint64_t	seed;
	bool		wkt;			/* --wkt 1: append the curve as EWKT */
} gen_opts;

/* Prints an error and exits. */
static void
die(const char *msg)
{
	fprintf(stderr, "index_gen: %s\n", msg);
	exit(2);
}

/* Next 64 pseudo-random bits (splitmix64). */
static uint64_t
rng_next(gen_rng *r)
{
	uint64_t	z = (r->state += UINT64_C(0x9E3779B97F4A7C15));

	z = (z ^ (z >> 30)) * UINT64_C(0xBF58476D1CE4E5B9);
	z = (z ^ (z >> 27)) * UINT64_C(0x94D049BB133111EB);
	return z ^ (z >> 31);
}

/* Uniform double in [lo, hi). */
static double
uniform(gen_rng *r, double lo, double hi)
{
	return lo + (hi - lo) * ((double) (rng_next(r) >> 11) * 0x1.0p-53);
}

/* Standard normal deviate (Box-Muller). */
static double
gauss(gen_rng *r)
{
	double		u1 = 1.0 - uniform(r, 0, 1),
				u2 = uniform(r, 0, 1);

	return sqrt(-2.0 * log(u1)) * cos(2.0 * GEN_PI * u2);
}

/* A generator for one purpose and index, independent of everything else generated. */
static gen_rng
rng_for(uint64_t seed, uint64_t purpose, uint64_t index)
{
	gen_rng		r = {seed ^ (UINT64_C(0xD1B54A32D192ED03) * (purpose + 1))};

	r.state += UINT64_C(0x8CB92BA72F3D8DD7) * (index + 1);
	(void) rng_next(&r);
	return r;
}

/* Appends a point. */
static void
push(pts *p, double x, double y)
{
	if (p->n == p->cap)
	{
		p->cap = p->cap ? 2 * p->cap : 256;
		p->xy = realloc(p->xy, p->cap * 2 * sizeof(double));
		if (p->xy == NULL)
			die("out of memory");
	}
	p->xy[2 * p->n] = x;
	p->xy[2 * p->n + 1] = y;
	p->n++;
}

/* Route r: leaves its cluster's hub and runs 1-8 km with gentle turns. */
static pts
make_route(const gen_opts *o, long r)
{
	gen_rng		hub = rng_for(o->seed, 1, (uint64_t) (r % o->clusters));
	gen_rng		g = rng_for(o->seed, 2, (uint64_t) r);
	double		hx = ORIGIN_X + uniform(&hub, 0, AREA),
				hy = ORIGIN_Y + uniform(&hub, 0, AREA);
	double		x = hx + uniform(&g, -300, 300),
				y = hy + uniform(&g, -300, 300);
	double		heading = uniform(&g, 0, 2 * GEN_PI);
	double		length = uniform(&g, 700, 11500),
				total = 0;
	pts			route = {0};

	push(&route, x, y);
	while (total < length)
	{
		double		seg = uniform(&g, 20, 200);
		double		turn = fmax(-0.7, fmin(0.7, gauss(&g) * 0.26));

		heading += turn;
		x += seg * cos(heading);
		y += seg * sin(heading);
		total += seg;
		push(&route, x, y);
	}
	return route;
}

/* Point at arc length s along a route (clamped to its ends). */
static void
point_at(const pts *route, const double *cum, double s, double *x, double *y)
{
	size_t		k = 0;

	if (s <= 0)
		s = 0;
	while (k + 2 < route->n && cum[k + 1] < s)
		k++;
	{
		double		len = cum[k + 1] - cum[k];
		double		t = len > 0 ? fmin(1.0, (s - cum[k]) / len) : 0;

		*x = route->xy[2 * k] + t * (route->xy[2 * k + 2] - route->xy[2 * k]);
		*y = route->xy[2 * k + 1] + t * (route->xy[2 * k + 3] - route->xy[2 * k + 1]);
	}
}

/* One drive from arc length s0 to s1 (s1 < s0: backwards), a sample every 10-30 m, noise sigma. */
static pts
drive(gen_rng *g, const pts *route, double s0, double s1, double sigma)
{
	double	   *cum = malloc(route->n * sizeof(double));
	double		dir = s1 >= s0 ? 1 : -1,
				s = s0,
				x,
				y;
	pts			t = {0};

	if (cum == NULL)
		die("out of memory");
	cum[0] = 0;
	for (size_t k = 1; k < route->n; k++)
		cum[k] = cum[k - 1] + hypot(route->xy[2 * k] - route->xy[2 * k - 2],
									route->xy[2 * k + 1] - route->xy[2 * k - 1]);
	for (;;)
	{
		point_at(route, cum, s, &x, &y);
		push(&t, x + sigma * gauss(g), y + sigma * gauss(g));
		if ((s1 - s) * dir <= 0)
			break;
		s += dir * uniform(g, 10, 30);
		if ((s1 - s) * dir < 0)
			s = s1;
	}
	free(cum);
	return t;
}

/* Total length of a route. */
static double
route_length(const pts *route)
{
	double		l = 0;

	for (size_t k = 1; k < route->n; k++)
		l += hypot(route->xy[2 * k] - route->xy[2 * k - 2], route->xy[2 * k + 1] - route->xy[2 * k - 1]);
	return l;
}

/* Writes a point[] literal. */
static void
print_track(const pts *t)
{
	putchar('{');
	for (size_t i = 0; i < t->n; i++)
		printf("%s\"(%.2f,%.2f)\"", i ? "," : "", t->xy[2 * i], t->xy[2 * i + 1]);
	putchar('}');
}

/* Writes the same curve as EWKT (UTM zone 32N, the projected metres of the data). */
static void
print_ewkt(const pts *t)
{
	fputs("SRID=32632;LINESTRING(", stdout);
	for (size_t i = 0; i < t->n; i++)
		printf("%s%.2f %.2f", i ? "," : "", t->xy[2 * i], t->xy[2 * i + 1]);
	putchar(')');
}

/* Writes the curve column(s) of a row and ends it: point[], then EWKT with --wkt 1. */
static void
print_curve(const gen_opts *o, const pts *t)
{
	print_track(t);
	if (o->wkt)
	{
		putchar('\t');
		print_ewkt(t);
	}
	putchar('\n');
}

/* Parses --name value options. */
static void
parse(int argc, char **argv, gen_opts *o)
{
	if (argc < 2)
		die("usage: index_gen tracks|range|knn|corridor [--tracks N] [--routes R] [--clusters C] [--queries Q] [--seed S] [--wkt 0|1]");
	o->mode = argv[1];
	for (int i = 2; i + 1 < argc; i += 2)
	{
		long		v = strtol(argv[i + 1], NULL, 10);

		if (strcmp(argv[i], "--wkt") == 0)
		{
			if (strcmp(argv[i + 1], "0") != 0 && strcmp(argv[i + 1], "1") != 0)
				die("--wkt takes 0 or 1");
			o->wkt = v == 1;
			continue;
		}
		if (v <= 0)
			die("option values must be positive integers");
		if (strcmp(argv[i], "--tracks") == 0)
			o->tracks = v;
		else if (strcmp(argv[i], "--routes") == 0)
			o->routes = v;
		else if (strcmp(argv[i], "--clusters") == 0)
			o->clusters = v;
		else if (strcmp(argv[i], "--queries") == 0)
			o->queries = v;
		else if (strcmp(argv[i], "--seed") == 0)
			o->seed = (uint64_t) v;
		else
			die("unknown option");
	}
}

int
main(int argc, char **argv)
{
	gen_opts	o = {NULL, 20000, 80, 8, 1000, 1, false};
	pts		   *routes;

	parse(argc, argv, &o);
	routes = calloc(o.routes, sizeof(pts));
	if (routes == NULL)
		die("out of memory");
	for (long r = 0; r < o.routes; r++)
		routes[r] = make_route(&o, r);

	if (strcmp(o.mode, "tracks") == 0)
	{
		for (long i = 0; i < o.tracks; i++)
		{
			gen_rng		g = rng_for(o.seed, 3, (uint64_t) i);
			long		r = (long) (rng_next(&g) % (uint64_t) o.routes);
			double		len = route_length(&routes[r]);
			double		kind = uniform(&g, 0, 1);
			double		sigma = uniform(&g, 3, 8);
			const char *kname = kind < 0.65 ? "full" : kind < 0.90 ? "partial" : "backwards";
			pts			t;

			if (kind < 0.65)
				t = drive(&g, &routes[r], 0, len, sigma);
			else if (kind < 0.90)
				t = drive(&g, &routes[r], uniform(&g, 0, 0.35) * len, uniform(&g, 0.65, 1) * len, sigma);
			else
				t = drive(&g, &routes[r], len, 0, sigma);
			printf("%ld\t%ld\t%s\t", i + 1, r + 1, kname);
			print_curve(&o, &t);
			free(t.xy);
		}
	}
	else if (strcmp(o.mode, "range") == 0 || strcmp(o.mode, "knn") == 0)
	{
		bool		range = strcmp(o.mode, "range") == 0;

		for (long q = 0; q < o.queries; q++)
		{
			gen_rng		g = rng_for(o.seed, range ? 4 : 5, (uint64_t) q);
			long		r = (long) (rng_next(&g) % (uint64_t) o.routes);
			static const double eps_choices[] = {25, 40, 60};

			/* the query is a reference drive of the route, not stored in the table */
			pts			t = drive(&g, &routes[r], 0, route_length(&routes[r]), uniform(&g, 3, 8));

			printf("%ld\t%ld\t", q + 1, r + 1);
			if (range)
				printf("%g\t", eps_choices[rng_next(&g) % 3]);
			print_curve(&o, &t);
			free(t.xy);
		}
	}
	else if (strcmp(o.mode, "corridor") == 0)
	{
		for (long q = 0; q < o.queries; q++)
		{
			gen_rng		g = rng_for(o.seed, 6, (uint64_t) q);
			long		r = (long) (rng_next(&g) % (uint64_t) o.routes);
			double		len = route_length(&routes[r]),
						s0 = len > 1000 ? uniform(&g, 0, len - 1000) : 0;
			static const double eps_choices[] = {25, 40};

			/* a 1 km stretch of the route (all of a shorter one), a point every 10-30 m on it */
			pts			t = drive(&g, &routes[r], s0, fmin(len, s0 + 1000), 0);

			printf("%ld\t%ld\t%g\t", q + 1, r + 1, eps_choices[rng_next(&g) % 2]);
			print_curve(&o, &t);
			free(t.xy);
		}
	}
	else
		die("mode must be tracks, range, knn or corridor");
	for (long r = 0; r < o.routes; r++)
		free(routes[r].xy);
	free(routes);
	return 0;
}
