/*
 * bench.c - side-by-side timings of the frechet_ext engine against its own
 * plain decider and against GEOS's discrete Fréchet distance.
 *
 * Every row of the report is one generated pair of curves; every column is
 * one method run on that same pair in the same process, so ratios between
 * columns are meaningful even where absolute timings are not.
 */
#define _POSIX_C_SOURCE 200809L
#define GEOS_USE_ONLY_R_API

#include <errno.h>
#include <inttypes.h>
#include <math.h>
#include <pthread.h>
#include <stdarg.h>
#include <stdbool.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>

#include <geos_c.h>

#include "frechet.h"
#include "geodesy.h"

#define BENCH_PI 3.14159265358979323846

#define MAX_SIZES 16
#define MIN_SIZE 20
#define MAX_SIZE 10000000
#define DEFAULT_MAX_CELLS 2e8
#define DEFAULT_REPS 7
#define REP_BUDGET_SEC 0.5
#define STACK_BASE_BYTES (64.0 * 1024 * 1024)
#define STACK_BYTES_PER_VERTEX 2048.0

#define TABLE_COLS 14
#define CELL_LEN 32
#define SKIPPED_TEXT "skipped (n*m > limit)"

/* GPS-like generator parameters, in metres. */
#define ROUTE_SEG_MIN 20.0
#define ROUTE_SEG_MAX 200.0
#define ROUTE_TURN_STD_DEG 15.0
#define ROUTE_TURN_MAX_DEG 40.0
#define SAMPLE_GAP_MIN 5.0
#define SAMPLE_GAP_MAX 30.0
#define NOISE_STD_MIN 5.0
#define NOISE_STD_MAX 15.0

/* Dense generator parameters, in metres: a 10 Hz receiver at walking pace. */
#define DENSE_GAP_MIN 0.1
#define DENSE_GAP_MAX 0.3
#define DENSE_DRIFT_STD 2.0		/* the receiver's slowly wandering error */
#define DENSE_DRIFT_KEEP 0.995	/* its correlation from one sample to the next */
#define DENSE_JITTER_STD 0.05

/* Zig-zag generator parameters: amplitude A, total drift, spike height S. */
#define ZIGZAG_AMP 100.0
#define ZIGZAG_DRIFT (0.1 * ZIGZAG_AMP)
#define ZIGZAG_SPIKE (1.2 * ZIGZAG_AMP)

typedef enum pair_kind
{
	KIND_GPS,
	KIND_ROUTE,
	KIND_DENSE,
	KIND_ZIGZAG
} pair_kind;

static const char *const kind_names[] = {"gps", "route", "dense", "adversarial"};

typedef enum method
{
	METHOD_DISTANCE,
	METHOD_DECIDE,
	METHOD_DECIDE_PLAIN,
	METHOD_GEOS_DISCRETE,
	METHOD_DISCRETE,
	METHOD_PROGRESS
} method;

static const char *const method_names[] = {
	"fr_distance", "fr_decide", "fr_decide_plain", "GEOS discrete", "fr_discrete_distance",
	"fr_progress"
};

typedef struct bench_opts
{
	size_t		sizes[MAX_SIZES];
	size_t		nsizes;
	double		max_cells;
	int			max_reps;
	uint64_t	seed;
	bool		quick;
} bench_opts;

typedef struct bench_rng
{
	uint64_t	state;
} bench_rng;

typedef struct point_buf
{
	double	   *xy;
	size_t		n;
	size_t		cap;
} point_buf;

typedef struct pair_data
{
	pair_kind	kind;
	point_buf	pbuf;
	point_buf	qbuf;
	fr_curve	p;
	fr_curve	q;
	GEOSGeometry *gp;
	GEOSGeometry *gq;
} pair_data;

typedef struct outcome
{
	double		value;
	bool		decision;
	fr_stats	stats;
} outcome;

typedef struct row_result
{
	pair_kind	kind;
	size_t		n;
	size_t		m;
	double		d;
	double		d_discrete;
	double		d_geos;
	uint64_t	decisions;
	uint64_t	distance_cells;
	double		ms_distance;
	double		ms_decide[2];
	double		ms_plain[2];
	double		ms_geos;
	double		ms_discrete;
	uint64_t	cells_decide[2];
	uint64_t	cells_plain[2];
	double		ms_progress;	/* the trip's first half in progress on the route, at 1.05d */
	bool		progress_found;
} row_result;

typedef char table_cell[CELL_LEN];

typedef struct text_table
{
	size_t		ncols;
	size_t		nrows;
	size_t		header_rows;
	table_cell (*cell)[TABLE_COLS];
} text_table;

static GEOSContextHandle_t geos_ctx;
static int	failures;

/* The eps factors applied to the distance d for the two decision columns. */
static const double eps_factor[2] = {1.05, 0.95};

/* Prints a message to stderr and exits with status 1. */
static void
die(const char *fmt,...)
{
	va_list		ap;

	va_start(ap, fmt);
	fputs("bench: ", stderr);
	vfprintf(stderr, fmt, ap);
	fputc('\n', stderr);
	va_end(ap);
	exit(1);
}

/* Records a result that contradicts the engine's contract or the baseline. */
static void
report_failure(const char *fmt,...)
{
	va_list		ap;

	va_start(ap, fmt);
	fputs("bench: INCONSISTENT: ", stderr);
	vfprintf(stderr, fmt, ap);
	fputc('\n', stderr);
	va_end(ap);
	failures++;
}

/* Engine allocator: plain malloc. */
static void *
bench_alloc(size_t size, void *arg)
{
	(void) arg;
	return malloc(size > 0 ? size : 1);
}

/* Engine deallocator: plain free. */
static void
bench_release(void *ptr, void *arg)
{
	(void) arg;
	free(ptr);
}

/* Engine interrupt callback: the benchmark never interrupts. */
static int
bench_interrupted(void *arg)
{
	(void) arg;
	return 0;
}

static const fr_env bench_env = {bench_alloc, bench_release, bench_interrupted, NULL};

/* Seconds on the monotonic clock. */
static double
now_sec(void)
{
	struct timespec ts;

	if (clock_gettime(CLOCK_MONOTONIC, &ts) != 0)
		die("clock_gettime failed: %s", strerror(errno));
	return (double) ts.tv_sec + (double) ts.tv_nsec * 1e-9;
}

/* Next 64 pseudo-random bits (a splitmix64 step). */
static uint64_t
rng_next(bench_rng *rng)
{
	uint64_t	z = (rng->state += UINT64_C(0x9E3779B97F4A7C15));

	z = (z ^ (z >> 30)) * UINT64_C(0xBF58476D1CE4E5B9);
	z = (z ^ (z >> 27)) * UINT64_C(0x94D049BB133111EB);
	return z ^ (z >> 31);
}

/* Uniform double in [lo, hi). */
static double
rng_uniform(bench_rng *rng, double lo, double hi)
{
	double		unit = (double) (rng_next(rng) >> 11) * 0x1.0p-53;

	return lo + (hi - lo) * unit;
}

/* Standard normal deviate (Box-Muller, one of the pair). */
static double
rng_gauss(bench_rng *rng)
{
	double		u1 = 1.0 - rng_uniform(rng, 0.0, 1.0);
	double		u2 = rng_uniform(rng, 0.0, 1.0);

	return sqrt(-2.0 * log(u1)) * cos(2.0 * BENCH_PI * u2);
}

/* Generator for one pair, seeded from the run seed, the pair kind and the size only. */
static bench_rng
rng_for_pair(uint64_t seed, pair_kind kind, size_t size)
{
	bench_rng	rng;

	rng.state = seed ^ (UINT64_C(0xD1B54A32D192ED03) * ((uint64_t) size + 1));
	rng.state += UINT64_C(0x8CB92BA72F3D8DD7) * ((uint64_t) kind + 1);
	(void) rng_next(&rng);
	return rng;
}

/* Appends one 2-D point to a buffer, growing it as needed. */
static void
buf_push(point_buf *buf, double x, double y)
{
	if (buf->n == buf->cap)
	{
		size_t		cap = buf->cap > 0 ? 2 * buf->cap : 1024;
		double	   *xy = realloc(buf->xy, cap * 2 * sizeof(double));

		if (xy == NULL)
			die("out of memory for %zu points", cap);
		buf->xy = xy;
		buf->cap = cap;
	}
	buf->xy[2 * buf->n] = x;
	buf->xy[2 * buf->n + 1] = y;
	buf->n++;
}

/* Releases a point buffer. */
static void
buf_free(point_buf *buf)
{
	free(buf->xy);
	buf->xy = NULL;
	buf->n = buf->cap = 0;
}

/* A street-like route of at least length metres: 20-200 m segments joined by gentle turns. */
static point_buf
make_route(bench_rng *rng, double length)
{
	point_buf	route = {0};
	double		x = 0.0;
	double		y = 0.0;
	double		heading = rng_uniform(rng, 0.0, 2.0 * BENCH_PI);
	double		total = 0.0;
	double		turn_max = ROUTE_TURN_MAX_DEG * BENCH_PI / 180.0;

	buf_push(&route, x, y);
	while (total < length)
	{
		double		seg = rng_uniform(rng, ROUTE_SEG_MIN, ROUTE_SEG_MAX);
		double		turn = rng_gauss(rng) * ROUTE_TURN_STD_DEG * BENCH_PI / 180.0;

		if (turn > turn_max)
			turn = turn_max;
		else if (turn < -turn_max)
			turn = -turn_max;
		heading += turn;
		x += seg * cos(heading);
		y += seg * sin(heading);
		total += seg;
		buf_push(&route, x, y);
	}
	return route;
}

/*
 * How a receiver samples a route: a sample every gap_min to gap_max metres,
 * white noise of std sigma on each coordinate, and, when drift_std > 0, an
 * error that wanders slowly (first-order autoregressive, std drift_std,
 * correlation drift_keep from one sample to the next).
 */
typedef struct receiver
{
	double		gap_min;
	double		gap_max;
	double		sigma;
	double		drift_std;
	double		drift_keep;
} receiver;

/* One trip along the route as the receiver records it. */
static point_buf
sample_route(bench_rng *rng, const point_buf *route, const receiver *rx)
{
	point_buf	track = {0};
	size_t		seg = 0;
	double		along = 0.0,
				gap = 0.0,
				ox = 0.0,
				oy = 0.0,
				step = rx->drift_std * sqrt(1.0 - rx->drift_keep * rx->drift_keep);

	while (seg + 1 < route->n)
	{
		const double *a = &route->xy[2 * seg];
		const double *b = &route->xy[2 * seg + 2];
		double		len = hypot(b[0] - a[0], b[1] - a[1]);

		if (along + gap > len)
		{
			gap -= len - along;
			along = 0.0;
			seg++;
			continue;
		}
		along += gap;
		if (rx->drift_std > 0)
		{
			ox = rx->drift_keep * ox + step * rng_gauss(rng);
			oy = rx->drift_keep * oy + step * rng_gauss(rng);
		}
		buf_push(&track,
				 a[0] + (b[0] - a[0]) * along / len + ox + rx->sigma * rng_gauss(rng),
				 a[1] + (b[1] - a[1]) * along / len + oy + rx->sigma * rng_gauss(rng));
		gap = rng_uniform(rng, rx->gap_min, rx->gap_max);
	}
	if (rx->drift_std > 0)
		buf_push(&track, route->xy[2 * seg] + ox, route->xy[2 * seg + 1] + oy);
	else
		buf_push(&track, route->xy[2 * seg] + rx->sigma * rng_gauss(rng),
				 route->xy[2 * seg + 1] + rx->sigma * rng_gauss(rng));
	return track;
}

/* One drive along the route: samples 5-30 m apart plus gaussian noise of std sigma. */
static point_buf
drive_route(bench_rng *rng, const point_buf *route, double sigma)
{
	const receiver rx = {SAMPLE_GAP_MIN, SAMPLE_GAP_MAX, sigma, 0.0, 0.0};

	return sample_route(rng, route, &rx);
}

/* A route driven twice, each track with about size points and its own noise level. */
static void
make_gps_pair(bench_rng *rng, size_t size, point_buf *p, point_buf *q)
{
	double		mean_gap = 0.5 * (SAMPLE_GAP_MIN + SAMPLE_GAP_MAX);
	point_buf	route = make_route(rng, (double) (size - 1) * mean_gap);

	*p = drive_route(rng, &route, rng_uniform(rng, NOISE_STD_MIN, NOISE_STD_MAX));
	*q = drive_route(rng, &route, rng_uniform(rng, NOISE_STD_MIN, NOISE_STD_MAX));
	buf_free(&route);
}

/*
 * A densely sampled track of a route: a sample every DENSE_GAP_MIN to
 * DENSE_GAP_MAX metres, off the route by an error that wanders slowly
 * (std DENSE_DRIFT_STD; receiver errors are correlated in time, common
 * practice in GNSS modelling) plus a little jitter.
 */
static point_buf
walk_route(bench_rng *rng, const point_buf *route)
{
	const receiver rx = {DENSE_GAP_MIN, DENSE_GAP_MAX, DENSE_JITTER_STD,
	DENSE_DRIFT_STD, DENSE_DRIFT_KEEP};

	return sample_route(rng, route, &rx);
}

/* A route walked twice with a dense receiver, each track with about size points. */
static void
make_dense_pair(bench_rng *rng, size_t size, point_buf *p, point_buf *q)
{
	point_buf	route = make_route(rng, (double) (size - 1) * 0.5 * (DENSE_GAP_MIN + DENSE_GAP_MAX));

	*p = walk_route(rng, &route);
	*q = walk_route(rng, &route);
	buf_free(&route);
}

/* A track of about size points against the planned route it was driven on (the route's own vertices). */
static void
make_route_pair(bench_rng *rng, size_t size, point_buf *p, point_buf *q)
{
	double		mean_gap = 0.5 * (SAMPLE_GAP_MIN + SAMPLE_GAP_MAX);

	*q = make_route(rng, (double) (size - 1) * mean_gap);
	*p = drive_route(rng, q, rng_uniform(rng, NOISE_STD_MIN, NOISE_STD_MAX));
}

/* Crossed zig-zags of amplitude A, n vertices each, with spikes near the end in opposite orders. */
static void
make_zigzag_pair(size_t n, point_buf *p, point_buf *q)
{
	double		drift = ZIGZAG_DRIFT / (double) (n - 1);
	size_t		up = (n - 12) | 1;
	size_t		down = up + 5;

	/*
	 * p swings along y and q along x, half a stroke apart, both through the
	 * centre: a swing vertex of one is about sqrt(2) A from every swing
	 * vertex of the other, but one curve can wait at the centre (within A)
	 * while the other swings, so for A < eps < sqrt(2) A every free-space
	 * cell is partly free and nearly all are reachable, while vertex-only
	 * walks fail.  p spikes to +S, then -S; q to -S, then +S (so no vertex
	 * lies outside the other curve's box): whichever spikes are matched, one
	 * of p's is left roughly S from q, so d is a little under S, and at
	 * 0.95 d the answer is settled only in the last rows and columns.
	 */
	*p = (point_buf) {0};
	*q = (point_buf) {0};
	for (size_t i = 0; i < n; i++)
	{
		double		along = drift * (double) i;
		double		swing = (i % 2 == 1) ? ZIGZAG_AMP : -ZIGZAG_AMP;

		if (i == 0 || i == n - 1)
			swing = 0.0;
		if (i == up)
		{
			buf_push(p, along, ZIGZAG_SPIKE);
			buf_push(q, 0.0, -ZIGZAG_SPIKE);
		}
		else if (i == down)
		{
			buf_push(p, along, -ZIGZAG_SPIKE);
			buf_push(q, 0.0, ZIGZAG_SPIKE);
		}
		else
		{
			buf_push(p, along, swing);
			buf_push(q, swing, along);
		}
	}
}

/* Prints GEOS errors and notices. */
static void
geos_message(const char *message, void *userdata)
{
	fprintf(stderr, "bench: GEOS %s: %s\n", (const char *) userdata, message);
}

/* A GEOS LineString over the same coordinates as a point buffer. */
static GEOSGeometry *
geos_line(const point_buf *buf)
{
	GEOSCoordSequence *seq;
	GEOSGeometry *line;

	if (buf->n > UINT32_MAX)
		die("curve too long for GEOS");
	seq = GEOSCoordSeq_copyFromBuffer_r(geos_ctx, buf->xy, (unsigned int) buf->n, 0, 0);
	if (seq == NULL)
		die("GEOSCoordSeq_copyFromBuffer_r failed");
	line = GEOSGeom_createLineString_r(geos_ctx, seq);
	if (line == NULL)
		die("GEOSGeom_createLineString_r failed");
	return line;
}

/* Builds the pair of the given kind and size, as engine curves and as GEOS geometries. */
static void
make_pair(pair_data *pd, pair_kind kind, size_t size, uint64_t seed)
{
	bench_rng	rng = rng_for_pair(seed, kind, size);

	pd->kind = kind;
	if (kind == KIND_GPS)
		make_gps_pair(&rng, size, &pd->pbuf, &pd->qbuf);
	else if (kind == KIND_ROUTE)
		make_route_pair(&rng, size, &pd->pbuf, &pd->qbuf);
	else if (kind == KIND_DENSE)
		make_dense_pair(&rng, size, &pd->pbuf, &pd->qbuf);
	else
		make_zigzag_pair(size, &pd->pbuf, &pd->qbuf);
	pd->p = (fr_curve) {pd->pbuf.xy, pd->pbuf.n, 2};
	pd->q = (fr_curve) {pd->qbuf.xy, pd->qbuf.n, 2};
	pd->gp = geos_line(&pd->pbuf);
	pd->gq = geos_line(&pd->qbuf);
}

/* Releases a pair. */
static void
free_pair(pair_data *pd)
{
	GEOSGeom_destroy_r(geos_ctx, pd->gp);
	GEOSGeom_destroy_r(geos_ctx, pd->gq);
	buf_free(&pd->pbuf);
	buf_free(&pd->qbuf);
}

/* Exits with a message unless an engine call succeeded. */
static void
check_status(fr_status st, const char *what, const pair_data *pd)
{
	if (st != FR_OK)
		die("%s failed on %s pair (n=%zu, m=%zu): %s", what, kind_names[pd->kind],
			pd->p.n, pd->q.n, fr_status_text(st));
}

/* Runs one method once on a pair, storing its answer. */
static void
run_method(method meth, const pair_data *pd, double eps, outcome *out)
{
	memset(out, 0, sizeof(*out));
	switch (meth)
	{
		case METHOD_DISTANCE:
			check_status(fr_distance(&bench_env, &pd->p, &pd->q, &out->value,
									 &out->stats), "fr_distance", pd);
			break;
		case METHOD_DECIDE:
			check_status(fr_decide(&bench_env, &pd->p, &pd->q, eps, &out->decision,
								   &out->stats), "fr_decide", pd);
			break;
		case METHOD_DECIDE_PLAIN:
			check_status(fr_decide_plain(&bench_env, &pd->p, &pd->q, eps,
										 &out->decision, &out->stats),
						 "fr_decide_plain", pd);
			break;
		case METHOD_GEOS_DISCRETE:
			if (GEOSFrechetDistance_r(geos_ctx, pd->gp, pd->gq, &out->value) != 1)
				die("GEOSFrechetDistance_r failed on %s pair (n=%zu, m=%zu)",
					kind_names[pd->kind], pd->p.n, pd->q.n);
			break;
		case METHOD_DISCRETE:
			check_status(fr_discrete_distance(&bench_env, &pd->p, &pd->q, &out->value),
						 "fr_discrete_distance", pd);
			break;
		case METHOD_PROGRESS:
			{
				/* a trip in progress: the first half of p, on the route q */
				fr_curve	half = {pd->p.coords, (pd->p.n + 1) / 2, pd->p.dim};
				double		frac;

				check_status(fr_progress(&bench_env, &half, &pd->q, eps, &out->decision,
										 &out->value, &frac), "fr_progress", pd);
			}
			break;
	}
}

/* Best time in ms of one method, repeated up to max_reps times within the time budget. */
static double
time_method(method meth, const pair_data *pd, double eps, outcome *out,
			const bench_opts *opts)
{
	double		best = INFINITY;
	double		spent = 0.0;
	outcome		again;

	for (int rep = 0; rep < opts->max_reps; rep++)
	{
		double		start = now_sec();
		double		elapsed;

		run_method(meth, pd, eps, rep == 0 ? out : &again);
		elapsed = now_sec() - start;
		if (elapsed < best)
			best = elapsed;
		spent += elapsed;
		if (rep > 0 && (again.value != out->value || again.decision != out->decision))
			report_failure("%s n=%zu: %s gave different answers on repetition",
						   kind_names[pd->kind], pd->p.n, method_names[meth]);
		if (spent + elapsed > REP_BUDGET_SEC)
			break;
	}
	return best * 1e3;
}

/* True when a quadratic method should be skipped for this pair. */
static bool
over_limit(const pair_data *pd, const bench_opts *opts)
{
	return (double) pd->p.n * (double) pd->q.n > opts->max_cells;
}

/* Prints a progress note to stderr. */
static void
progress(const pair_data *pd, const char *what)
{
	fprintf(stderr, "  %-11s n=%-7zu m=%-7zu %s\n", kind_names[pd->kind], pd->p.n,
			pd->q.n, what);
}

/* Compares two distances that must agree to a relative 1e-9. */
static bool
same_distance(double a, double b)
{
	return fabs(a - b) <= 1e-9 * fmax(1.0, fmax(fabs(a), fabs(b)));
}

/* Measures every method on one pair and checks the answers against each other. */
static void
bench_pair(const pair_data *pd, const bench_opts *opts, row_result *row)
{
	outcome		out;
	bool		skip = over_limit(pd, opts);

	memset(row, 0, sizeof(*row));
	row->kind = pd->kind;
	row->n = pd->p.n;
	row->m = pd->q.n;
	row->d = row->d_discrete = row->d_geos = NAN;
	row->ms_distance = row->ms_decide[0] = row->ms_decide[1] = NAN;
	row->ms_plain[0] = row->ms_plain[1] = row->ms_geos = row->ms_discrete = NAN;
	row->ms_progress = NAN;

	/* on the adversarial pairs every method is quadratic, the engine's too */
	if (skip && pd->kind == KIND_ZIGZAG)
		return;

	progress(pd, "fr_distance");
	row->ms_distance = time_method(METHOD_DISTANCE, pd, 0.0, &out, opts);
	row->d = out.value;
	row->decisions = out.stats.decisions;
	row->distance_cells = out.stats.cells;

	for (int k = 0; k < 2; k++)
	{
		double		eps = eps_factor[k] * row->d;
		bool		expect = (k == 0 || row->d == 0.0);
		bool		ours;

		progress(pd, k == 0 ? "fr_decide at 1.05d" : "fr_decide at 0.95d");
		row->ms_decide[k] = time_method(METHOD_DECIDE, pd, eps, &out, opts);
		row->cells_decide[k] = out.stats.cells;
		ours = out.decision;
		if (ours != expect)
			report_failure("%s n=%zu: fr_decide(%.2f d) = %s, expected %s",
						   kind_names[pd->kind], row->n, eps_factor[k],
						   ours ? "true" : "false", expect ? "true" : "false");
		if (skip)
			continue;
		progress(pd, k == 0 ? "fr_decide_plain at 1.05d" : "fr_decide_plain at 0.95d");
		row->ms_plain[k] = time_method(METHOD_DECIDE_PLAIN, pd, eps, &out, opts);
		row->cells_plain[k] = out.stats.cells;
		if (out.decision != ours)
			report_failure("%s n=%zu: fr_decide_plain(%.2f d) = %s but fr_decide = %s",
						   kind_names[pd->kind], row->n, eps_factor[k],
						   out.decision ? "true" : "false", ours ? "true" : "false");
	}
	if (row->d > 0)
	{
		progress(pd, "fr_progress at 1.05d");
		row->ms_progress = time_method(METHOD_PROGRESS, pd, eps_factor[0] * row->d, &out, opts);
		row->progress_found = out.decision;
	}
	if (skip)
		return;

	progress(pd, "GEOS discrete");
	row->ms_geos = time_method(METHOD_GEOS_DISCRETE, pd, 0.0, &out, opts);
	row->d_geos = out.value;
	progress(pd, "fr_discrete_distance");
	row->ms_discrete = time_method(METHOD_DISCRETE, pd, 0.0, &out, opts);
	row->d_discrete = out.value;

	if (!same_distance(row->d_geos, row->d_discrete))
		report_failure("%s n=%zu: GEOS discrete %.17g != fr_discrete_distance %.17g",
					   kind_names[pd->kind], row->n, row->d_geos, row->d_discrete);
	if (row->d > row->d_discrete && !same_distance(row->d, row->d_discrete))
		report_failure("%s n=%zu: continuous %.17g exceeds discrete %.17g",
					   kind_names[pd->kind], row->n, row->d, row->d_discrete);
}

/* Appends a row to a table and returns it for filling. */
static table_cell *
table_add_row(text_table *t)
{
	void	   *cells = realloc(t->cell, (t->nrows + 1) * sizeof(*t->cell));

	if (cells == NULL)
		die("out of memory for table");
	t->cell = cells;
	memset(t->cell[t->nrows], 0, sizeof(*t->cell));
	return t->cell[t->nrows++];
}

/* Prints a table: first column left-aligned, others right-aligned, a rule under the header. */
static void
table_print(const text_table *t)
{
	size_t		width[TABLE_COLS] = {0};
	size_t		total = 0;

	for (size_t r = 0; r < t->nrows; r++)
		for (size_t c = 0; c < t->ncols; c++)
			if (strlen(t->cell[r][c]) > width[c])
				width[c] = strlen(t->cell[r][c]);
	for (size_t c = 0; c < t->ncols; c++)
		total += width[c] + (c > 0 ? 2 : 0);

	for (size_t r = 0; r < t->nrows; r++)
	{
		if (r == t->header_rows)
		{
			for (size_t i = 0; i < total; i++)
				putchar('-');
			putchar('\n');
		}
		for (size_t c = 0; c < t->ncols; c++)
		{
			if (c == 0)
				printf("%-*s", (int) width[c], t->cell[r][c]);
			else
				printf("  %*s", (int) width[c], t->cell[r][c]);
		}
		putchar('\n');
	}
}

/* Releases a table's rows. */
static void
table_free(text_table *t)
{
	free(t->cell);
	t->cell = NULL;
	t->nrows = 0;
}

/* Fills a header cell pair (two header rows) for one column. */
static void
set_header(table_cell *top, table_cell *bottom, size_t col,
		   const char *line1, const char *line2)
{
	snprintf(top[col], CELL_LEN, "%s", line1);
	snprintf(bottom[col], CELL_LEN, "%s", line2);
}

/* Formats a time in ms, or the skip marker. */
static void
fmt_ms(char *dst, double ms)
{
	if (isnan(ms))
		snprintf(dst, CELL_LEN, "%s", SKIPPED_TEXT);
	else if (ms < 1.0)
		snprintf(dst, CELL_LEN, "%.4f", ms);
	else if (ms < 100.0)
		snprintf(dst, CELL_LEN, "%.2f", ms);
	else
		snprintf(dst, CELL_LEN, "%.0f", ms);
}

/* Formats the ratio num/den, or "n/a" when either side was skipped. */
static void
fmt_ratio(char *dst, double num, double den)
{
	double		r = num / den;

	if (isnan(num) || isnan(den) || den <= 0.0)
		snprintf(dst, CELL_LEN, "n/a");
	else if (r < 100.0)
		snprintf(dst, CELL_LEN, "%.2f", r);
	else
		snprintf(dst, CELL_LEN, "%.0f", r);
}

/* Formats a distance, or the skip marker. */
static void
fmt_dist(char *dst, double d)
{
	if (isnan(d))
		snprintf(dst, CELL_LEN, "%s", SKIPPED_TEXT);
	else
		snprintf(dst, CELL_LEN, "%.6f", d);
}

/* Formats a rate in units per second in engineering style. */
static void
fmt_rate(char *dst, double units, double ms)
{
	if (isnan(ms))
		snprintf(dst, CELL_LEN, "%s", SKIPPED_TEXT);
	else if (ms <= 0.0)
		snprintf(dst, CELL_LEN, "inf");
	else
		snprintf(dst, CELL_LEN, "%.3g", units / (ms * 1e-3));
}

/* Prints the timing table: ms per method and ratios against the side-by-side baselines. */
static void
print_timings(const row_result *rows, size_t nrows)
{
	text_table	t = {TABLE_COLS, 0, 2, NULL};
	table_cell *top;
	table_cell *bottom;

	table_add_row(&t);
	table_add_row(&t);
	top = t.cell[0];
	bottom = t.cell[1];
	set_header(top, bottom, 0, "pair", "");
	set_header(top, bottom, 1, "n", "");
	set_header(top, bottom, 2, "m", "");
	set_header(top, bottom, 3, "fr_distance", "ms");
	set_header(top, bottom, 4, "fr_decide", "1.05d ms");
	set_header(top, bottom, 5, "fr_decide", "0.95d ms");
	set_header(top, bottom, 6, "decide_plain", "1.05d ms");
	set_header(top, bottom, 7, "decide_plain", "0.95d ms");
	set_header(top, bottom, 8, "geos_discrete", "ms");
	set_header(top, bottom, 9, "fr_discrete", "ms");
	set_header(top, bottom, 10, "plain/decide", "1.05d");
	set_header(top, bottom, 11, "plain/decide", "0.95d");
	set_header(top, bottom, 12, "geos/distance", "");
	set_header(top, bottom, 13, "decisions", "per distance");

	for (size_t i = 0; i < nrows; i++)
	{
		const row_result *r = &rows[i];
		table_cell *c = table_add_row(&t);

		snprintf(c[0], CELL_LEN, "%s", kind_names[r->kind]);
		snprintf(c[1], CELL_LEN, "%zu", r->n);
		snprintf(c[2], CELL_LEN, "%zu", r->m);
		fmt_ms(c[3], r->ms_distance);
		fmt_ms(c[4], r->ms_decide[0]);
		fmt_ms(c[5], r->ms_decide[1]);
		fmt_ms(c[6], r->ms_plain[0]);
		fmt_ms(c[7], r->ms_plain[1]);
		fmt_ms(c[8], r->ms_geos);
		fmt_ms(c[9], r->ms_discrete);
		fmt_ratio(c[10], r->ms_plain[0], r->ms_decide[0]);
		fmt_ratio(c[11], r->ms_plain[1], r->ms_decide[1]);
		fmt_ratio(c[12], r->ms_geos, r->ms_distance);
		if (isnan(r->ms_distance))
			snprintf(c[13], CELL_LEN, "n/a");
		else
			snprintf(c[13], CELL_LEN, "%" PRIu64, r->decisions);
	}
	table_print(&t);
	table_free(&t);
}

/* Prints the distances each method found, so the timings can be read against equal answers. */
static void
print_values(const row_result *rows, size_t nrows)
{
	text_table	t = {7, 0, 1, NULL};
	table_cell *c = table_add_row(&t);

	snprintf(c[0], CELL_LEN, "pair");
	snprintf(c[1], CELL_LEN, "n");
	snprintf(c[2], CELL_LEN, "m");
	snprintf(c[3], CELL_LEN, "d (continuous)");
	snprintf(c[4], CELL_LEN, "fr_discrete");
	snprintf(c[5], CELL_LEN, "geos_discrete");
	snprintf(c[6], CELL_LEN, "cells per distance");
	for (size_t i = 0; i < nrows; i++)
	{
		const row_result *r = &rows[i];

		c = table_add_row(&t);
		snprintf(c[0], CELL_LEN, "%s", kind_names[r->kind]);
		snprintf(c[1], CELL_LEN, "%zu", r->n);
		snprintf(c[2], CELL_LEN, "%zu", r->m);
		fmt_dist(c[3], r->d);
		fmt_dist(c[4], r->d_discrete);
		fmt_dist(c[5], r->d_geos);
		if (isnan(r->ms_distance))
			snprintf(c[6], CELL_LEN, "n/a");
		else
			snprintf(c[6], CELL_LEN, "%" PRIu64, r->distance_cells);
	}
	table_print(&t);
	table_free(&t);
}

/*
 * Prints the cost of a trip in progress (fr_progress on the first half of
 * the trip, at 1.05d) beside the decision on the whole pair at 1.05d.
 */
static void
print_progress(const row_result *rows, size_t nrows)
{
	text_table	t = {6, 0, 1, NULL};
	table_cell *c = table_add_row(&t);

	snprintf(c[0], CELL_LEN, "pair");
	snprintf(c[1], CELL_LEN, "n");
	snprintf(c[2], CELL_LEN, "m");
	snprintf(c[3], CELL_LEN, "fr_progress ms");
	snprintf(c[4], CELL_LEN, "progress/decide");
	snprintf(c[5], CELL_LEN, "found");
	for (size_t i = 0; i < nrows; i++)
	{
		const row_result *r = &rows[i];

		if (isnan(r->ms_progress))
			continue;
		c = table_add_row(&t);
		snprintf(c[0], CELL_LEN, "%s", kind_names[r->kind]);
		snprintf(c[1], CELL_LEN, "%zu", r->n);
		snprintf(c[2], CELL_LEN, "%zu", r->m);
		fmt_ms(c[3], r->ms_progress);
		fmt_ratio(c[4], r->ms_progress, r->ms_decide[0]);
		snprintf(c[5], CELL_LEN, "%s", r->progress_found ? "yes" : "no");
	}
	table_print(&t);
	table_free(&t);
}

/*
 * The price of geodesic geography edges on tracks whose edges are short
 * (the gps pairs read as metres east and north of 52 N 1 W): the check
 * that leaves such edges alone (fr_geo_edge_pieces, one chord length an
 * edge, after the lon/lat -> ECEF conversion that was always done),
 * against fr_distance on the pair, in the same run.
 */
static void
print_geodesic_check(const row_result *rows, size_t nrows, const bench_opts *opts)
{
	text_table	t = {6, 0, 1, NULL};
	table_cell *c = table_add_row(&t);

	snprintf(c[0], CELL_LEN, "pair");
	snprintf(c[1], CELL_LEN, "n");
	snprintf(c[2], CELL_LEN, "edges cut");
	snprintf(c[3], CELL_LEN, "check ms");
	snprintf(c[4], CELL_LEN, "fr_distance ms");
	snprintf(c[5], CELL_LEN, "check/distance");
	for (size_t s = 0; s < opts->nsizes; s++)
	{
		pair_data	pd;
		size_t		n,
					cut = 0;
		double	   *ll,
				   *xyz,
					best = INFINITY;
		const row_result *r = NULL;

		for (size_t i = 0; i < nrows; i++)
			if (rows[i].kind == KIND_GPS && rows[i].n >= opts->sizes[s] * 9 / 10 &&
				rows[i].n <= opts->sizes[s] * 11 / 10 && r == NULL)
				r = &rows[i];
		if (r == NULL || isnan(r->ms_distance))
			continue;
		make_pair(&pd, KIND_GPS, opts->sizes[s], opts->seed);
		n = pd.p.n;
		ll = malloc(2 * n * sizeof(double));
		xyz = malloc(3 * n * sizeof(double));
		for (size_t i = 0; i < n; i++)
		{
			ll[2 * i] = -1.0 + pd.p.coords[2 * i] / (111320.0 * cos(52.0 * 3.14159265358979 / 180.0));
			ll[2 * i + 1] = 52.0 + pd.p.coords[2 * i + 1] / 111200.0;
		}
		for (int rep = 0; rep < 5; rep++)
		{
			double		start = now_sec();

			cut = 0;
			for (size_t i = 0; i < n; i++)
				fr_geo_to_ecef(ll[2 * i], ll[2 * i + 1], xyz + 3 * i);
			for (size_t i = 0; i + 1 < n; i++)
				cut += fr_geo_edge_pieces(ll + 2 * i, ll + 2 * i + 2, xyz + 3 * i, xyz + 3 * i + 3) > 1;
			best = fmin(best, now_sec() - start);
		}
		c = table_add_row(&t);
		snprintf(c[0], CELL_LEN, "gps");
		snprintf(c[1], CELL_LEN, "%zu", n);
		snprintf(c[2], CELL_LEN, "%zu", cut);
		fmt_ms(c[3], best * 1e3);
		fmt_ms(c[4], r->ms_distance);
		fmt_ratio(c[5], best * 1e3, r->ms_distance);
		free(ll);
		free(xyz);
		free_pair(&pd);
	}
	table_print(&t);
	table_free(&t);
}

/* Prints decider throughput on the adversarial pairs, in cells and in n*m per second. */
static void
print_throughput(const row_result *rows, size_t nrows)
{
	text_table	t = {8, 0, 2, NULL};
	table_cell *top;
	table_cell *bottom;

	table_add_row(&t);
	table_add_row(&t);
	top = t.cell[0];
	bottom = t.cell[1];
	set_header(top, bottom, 0, "pair", "");
	set_header(top, bottom, 1, "n", "");
	set_header(top, bottom, 2, "m", "");
	set_header(top, bottom, 3, "eps", "");
	set_header(top, bottom, 4, "decide_plain", "cells/s");
	set_header(top, bottom, 5, "fr_decide", "cells/s");
	set_header(top, bottom, 6, "decide_plain", "n*m/s");
	set_header(top, bottom, 7, "fr_decide", "n*m/s");
	for (size_t i = 0; i < nrows; i++)
	{
		const row_result *r = &rows[i];
		double		nm = (double) r->n * (double) r->m;

		if (r->kind != KIND_ZIGZAG)
			continue;
		for (int k = 0; k < 2; k++)
		{
			table_cell *c = table_add_row(&t);

			snprintf(c[0], CELL_LEN, "%s", kind_names[r->kind]);
			snprintf(c[1], CELL_LEN, "%zu", r->n);
			snprintf(c[2], CELL_LEN, "%zu", r->m);
			snprintf(c[3], CELL_LEN, "%.2fd", eps_factor[k]);
			fmt_rate(c[4], (double) r->cells_plain[k], r->ms_plain[k]);
			fmt_rate(c[5], (double) r->cells_decide[k], r->ms_decide[k]);
			fmt_rate(c[6], nm, r->ms_plain[k]);
			fmt_rate(c[7], nm, r->ms_decide[k]);
		}
	}
	table_print(&t);
	table_free(&t);
}

/* Prints the command-line help. */
static void
usage(FILE *out)
{
	fprintf(out,
			"usage: bench [--quick] [--sizes N,N,...] [--max-cells N] [--reps N] [--seed N]\n"
			"  --sizes N,...   curve sizes to run (default 1000,10000)\n"
			"  --max-cells N   when n*m > N, skip the O(n*m) methods: decide_plain,\n"
			"                  GEOS discrete, fr_discrete, and on adversarial pairs\n"
			"                  every method (default 2e8)\n"
			"  --reps N        at most N repetitions per measurement, best time\n"
			"                  reported (default %d; repeats stop after %.1f s)\n"
			"  --seed N        seed of the gps pairs (default 1)\n"
			"  --quick         smoke run: sizes 200,1000 and one repetition\n",
			DEFAULT_REPS, REP_BUDGET_SEC);
}

/* Value of option name at argv[*i] ("--name V" or "--name=V"), or NULL for another option. */
static const char *
option_value(int argc, char **argv, int *i, const char *name)
{
	size_t		len = strlen(name);

	if (strncmp(argv[*i], name, len) != 0)
		return NULL;
	if (argv[*i][len] == '=')
		return argv[*i] + len + 1;
	if (argv[*i][len] != '\0')
		return NULL;
	if (*i + 1 >= argc)
		die("option %s needs a value", name);
	return argv[++*i];
}

/* Parses an unsigned integer option value, exiting on malformed input. */
static uint64_t
parse_uint(const char *text, const char *name)
{
	char	   *end;
	unsigned long long v;

	errno = 0;
	if (*text == '-' || *text == '\0')
		die("bad value for %s: \"%s\"", name, text);
	v = strtoull(text, &end, 10);
	if (errno != 0 || *end != '\0')
		die("bad value for %s: \"%s\"", name, text);
	return (uint64_t) v;
}

/* Parses a comma-separated size list into opts. */
static void
parse_sizes(const char *text, bench_opts *opts)
{
	const char *s = text;

	opts->nsizes = 0;
	while (*s != '\0')
	{
		char		item[32];
		size_t		len = strcspn(s, ",");
		uint64_t	v;

		if (len == 0 || len >= sizeof(item))
			die("bad size list: \"%s\"", text);
		if (opts->nsizes == MAX_SIZES)
			die("at most %d sizes", MAX_SIZES);
		memcpy(item, s, len);
		item[len] = '\0';
		v = parse_uint(item, "--sizes");
		if (v < MIN_SIZE || v > MAX_SIZE)
			die("size %" PRIu64 " out of range %d..%d", v, MIN_SIZE, MAX_SIZE);
		opts->sizes[opts->nsizes++] = (size_t) v;
		s += len;
		if (*s == ',')
			s++;
	}
	if (opts->nsizes == 0)
		die("empty size list");
}

/* Fills opts from the command line. */
static void
parse_args(int argc, char **argv, bench_opts *opts)
{
	const char *sizes = NULL;
	long long	reps = -1;

	memset(opts, 0, sizeof(*opts));
	opts->max_cells = DEFAULT_MAX_CELLS;
	opts->seed = 1;
	for (int i = 1; i < argc; i++)
	{
		const char *v;

		if (strcmp(argv[i], "--quick") == 0)
			opts->quick = true;
		else if (strcmp(argv[i], "--help") == 0 || strcmp(argv[i], "-h") == 0)
		{
			usage(stdout);
			exit(0);
		}
		else if ((v = option_value(argc, argv, &i, "--sizes")) != NULL)
			sizes = v;
		else if ((v = option_value(argc, argv, &i, "--max-cells")) != NULL)
		{
			char	   *end;

			opts->max_cells = strtod(v, &end);
			if (*v == '\0' || *end != '\0' || !(opts->max_cells >= 0.0) ||
				isinf(opts->max_cells))
				die("bad value for --max-cells: \"%s\"", v);
		}
		else if ((v = option_value(argc, argv, &i, "--reps")) != NULL)
		{
			uint64_t	r = parse_uint(v, "--reps");

			if (r < 1 || r > 1000)
				die("--reps must be in 1..1000");
			reps = (long long) r;
		}
		else if ((v = option_value(argc, argv, &i, "--seed")) != NULL)
			opts->seed = parse_uint(v, "--seed");
		else
		{
			fprintf(stderr, "bench: unknown argument \"%s\"\n", argv[i]);
			usage(stderr);
			exit(1);
		}
	}
	if (sizes != NULL)
		parse_sizes(sizes, opts);
	else
		parse_sizes(opts->quick ? "200,1000" : "1000,10000", opts);
	if (reps > 0)
		opts->max_reps = (int) reps;
	else
		opts->max_reps = opts->quick ? 1 : DEFAULT_REPS;
}

/* Stack for the measuring thread: GEOS 3.11's discrete Fréchet recurses about n+m deep. */
static size_t
worker_stack_bytes(const bench_opts *opts)
{
	double		largest = 0.0;
	double		side;

	for (size_t s = 0; s < opts->nsizes; s++)
		largest = fmax(largest, (double) opts->sizes[s]);
	/* 8 MB overflows near 10,000 points; GEOS runs only while n*m <= max_cells */
	side = 1.1 * fmin(largest, sqrt(opts->max_cells));
	return (size_t) (STACK_BASE_BYTES + 2.0 * side * STACK_BYTES_PER_VERTEX);
}

/* Thread body: runs every pair kind at every size and prints the report. */
static void *
run_benchmark(void *arg)
{
	const bench_opts *opts = arg;
	row_result *rows;
	size_t		nrows = 0;

	rows = calloc((KIND_ZIGZAG + 1) * opts->nsizes, sizeof(*rows));
	if (rows == NULL)
		die("out of memory");

	printf("frechet_ext bench: seed %" PRIu64 ", max-cells %.3g, best of up to %d "
		   "repetition(s) (%.1f s budget each), GEOS %s\n",
		   opts->seed, opts->max_cells, opts->max_reps, REP_BUDGET_SEC, GEOSversion());
	fflush(stdout);

	for (int kind = KIND_GPS; kind <= KIND_ZIGZAG; kind++)
	{
		for (size_t s = 0; s < opts->nsizes; s++)
		{
			pair_data	pd;

			make_pair(&pd, (pair_kind) kind, opts->sizes[s], opts->seed);
			bench_pair(&pd, opts, &rows[nrows++]);
			free_pair(&pd);
		}
	}

	printf("\nTimes (ms, best of repetitions) and ratios; d = fr_distance result:\n\n");
	print_timings(rows, nrows);
	printf("\nDistances found:\n\n");
	print_values(rows, nrows);
	printf("\nAdversarial decide throughput (cells/s: free-space cells the decider "
		   "reports visiting; n*m/s: full diagram size per second):\n\n");
	print_throughput(rows, nrows);
	printf("\nA trip in progress (fr_progress on the trip's first half, at 1.05d) beside\n"
		   "fr_decide on the whole pair at 1.05d, in the same run:\n\n");
	print_progress(rows, nrows);
	printf("\nGeography edges follow their geodesics: the check on short edges (the gps\n"
		   "pairs as lon/lat tracks) beside fr_distance on the pair, in the same run:\n\n");
	print_geodesic_check(rows, nrows, opts);
	free(rows);
	return NULL;
}

/* Parses the options, runs the measurements on a large-stack thread, reports failures. */
int
main(int argc, char **argv)
{
	bench_opts	opts;
	pthread_attr_t attr;
	pthread_t	worker;
	int			err;

	parse_args(argc, argv, &opts);
	geos_ctx = GEOS_init_r();
	if (geos_ctx == NULL)
		die("GEOS_init_r failed");
	GEOSContext_setErrorMessageHandler_r(geos_ctx, geos_message, (void *) "error");
	GEOSContext_setNoticeMessageHandler_r(geos_ctx, geos_message, (void *) "notice");

	if ((err = pthread_attr_init(&attr)) != 0 ||
		(err = pthread_attr_setstacksize(&attr, worker_stack_bytes(&opts))) != 0 ||
		(err = pthread_create(&worker, &attr, run_benchmark, &opts)) != 0 ||
		(err = pthread_join(worker, NULL)) != 0)
		die("cannot run the worker thread: %s", strerror(err));
	pthread_attr_destroy(&attr);

	GEOS_finish_r(geos_ctx);
	if (failures > 0)
	{
		fprintf(stderr, "bench: %d inconsistent result(s)\n", failures);
		return 1;
	}
	return 0;
}
