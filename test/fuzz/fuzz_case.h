/*
 * fuzz_case.h - what every engine fuzz target shares: decoding the input
 * bytes into a pair of curves and a tolerance (see fuzz_engine.c for the
 * regimes), a counting allocator, property failures that abort with the
 * curves printed, and the entry point's frame (fuzz_run).  Each target
 * (fuzz_engine.c, fuzz_witness.c, fuzz_index.c, fuzz_pings.c) lists its
 * own properties and calls fuzz_run from LLVMFuzzerTestOneInput.
 */
#ifndef FUZZ_CASE_H
#define FUZZ_CASE_H

#include <float.h>
#include <math.h>
#include <stdarg.h>
#include <stdbool.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "frechet.h"

/* Each target uses its own share of the helpers below. */
#pragma clang diagnostic ignored "-Wunused-function"

#define FUZZ_MAX_VERTICES 192

/*
 * Relative slack of the properties that hold "within rounding".  The
 * distance is the decision threshold to adjacent doubles and README.md
 * promises that decide(d * (1 - 1e-9)) is false, so 1e-9 is our own bound.
 */
#define REL_TOL 1e-9

/*
 * Below DBL_MIN doubles are spaced 2^-1074 apart whatever their size, so a
 * relative bound cannot hold there: comparisons also allow a few steps.
 */
#define SUBNORMAL_SLACK (8 * DBL_TRUE_MIN)

/*
 * Known engine bugs, reported to the lead, each allowed here until fixed;
 * build with -DFUZZ_STRICT (make fuzz FUZZ_STRICT=1) to check strictly.
 *
 * Underflow (fixed in freespace.c: tiny curves are scaled up by a power of
 * two before any square): UNDERFLOW_FLOOR stays as the knob, now 0 in
 * both builds.
 *
 * Tangent end point (fixed in freespace.c: an end within eps keeps the
 * interval reaching it): TANGENT_ULPS stays as the knob, now 0 in both
 * builds.
 */
#ifdef FUZZ_STRICT
#define UNDERFLOW_FLOOR 0.0
#define TANGENT_ULPS 0
#else
#define UNDERFLOW_FLOOR 0.0
#define TANGENT_ULPS 0
#endif

/* One decoded input: two curves, a tolerance to decide at, and the test knobs. */
typedef struct fuzz_case
{
	double		a[FUZZ_MAX_VERTICES * 3];
	double		b[FUZZ_MAX_VERTICES * 3];
	fr_curve	p;
	fr_curve	q;
	double		eps;			/* a tolerance to decide at, >= 0, may be +Inf */
	int			regime;
	bool		large;			/* large curves: the costly checks are skipped */
	long		interrupt_after;	/* polls before the interrupt fires */
	double		scale;			/* largest coordinate spread of the pair */
	double		d;				/* the continuous distance, once computed */
	long		allocations;	/* allocations the distance made */
} fuzz_case;

/* Counting allocator state; the engine must release all it takes. */
typedef struct fuzz_heap
{
	long		live;
	long		total;
	long		fail_after;		/* < 0: never fail */
	long		polls;
	long		interrupt_after;	/* < 0: never interrupt */
} fuzz_heap;

/* A distance below the floor of the known underflow bug: not compared. */
static bool
underflows(double x)
{
	return x < UNDERFLOW_FLOOR;
}

/* Reports a violated property and aborts, so libFuzzer saves the input. */
static void
fail(const fuzz_case *c, const char *fmt,...)
{
	va_list		ap;

	va_start(ap, fmt);
	fprintf(stderr, "property violated (regime %d, n=%zu, m=%zu, dim=%d): ",
			c->regime, c->p.n, c->q.n, c->p.dim);
	vfprintf(stderr, fmt, ap);
	fputc('\n', stderr);
	va_end(ap);
	/* the curves themselves, exactly, for a reproducer in a unit test */
	if (c->p.n + c->q.n <= 24)
	{
		for (size_t i = 0; i < c->p.n * c->p.dim; i++)
			fprintf(stderr, "  p[%zu] = %a\n", i, c->p.coords[i]);
		for (size_t i = 0; i < c->q.n * c->q.dim; i++)
			fprintf(stderr, "  q[%zu] = %a\n", i, c->q.coords[i]);
	}
	abort();
}

/* malloc with bookkeeping and an optional failure after N allocations. */
static void *
heap_alloc(size_t size, void *arg)
{
	fuzz_heap  *h = arg;

	if (h->fail_after >= 0 && h->total >= h->fail_after)
		return NULL;
	h->total++;
	h->live++;
	return malloc(size);
}

/* free with bookkeeping. */
static void
heap_release(void *ptr, void *arg)
{
	fuzz_heap  *h = arg;

	h->live--;
	free(ptr);
}

/* Interrupt callback that asks to stop after a number of polls. */
static int
heap_interrupted(void *arg)
{
	fuzz_heap  *h = arg;

	h->polls++;
	return h->interrupt_after >= 0 && h->polls > h->interrupt_after;
}

/* A fresh environment over a fresh heap record. */
static fr_env
heap_env(fuzz_heap *h)
{
	fr_env		e;

	memset(h, 0, sizeof(*h));
	h->fail_after = -1;
	h->interrupt_after = -1;
	e.alloc = heap_alloc;
	e.release = heap_release;
	e.interrupted = heap_interrupted;
	e.arg = h;
	return e;
}

/* Reads input bytes one at a time; zeros once the input is used up. */
typedef struct reader
{
	const uint8_t *data;
	size_t		size;
	size_t		pos;
} reader;

static uint8_t
read_u8(reader *r)
{
	return r->pos < r->size ? r->data[r->pos++] : 0;
}

static uint16_t
read_u16(reader *r)
{
	uint16_t	lo = read_u8(r);

	return (uint16_t) (lo | (read_u8(r) << 8));
}

static double
read_f64(reader *r)
{
	uint64_t	u = 0;
	double		x;

	for (int i = 0; i < 8; i++)
		u |= (uint64_t) read_u8(r) << (8 * i);
	memcpy(&x, &u, sizeof(x));
	return x;
}

/* Brings a value into the engine's input contract, as the SQL glue insists. */
static double
admissible(double x)
{
	if (!isfinite(x))
		return 0.0;
	if (x > FR_MAX_ABS_COORD)
		return FR_MAX_ABS_COORD;
	if (x < -FR_MAX_ABS_COORD)
		return -FR_MAX_ABS_COORD;
	return x;
}

/* One coordinate in the given regime. */
static double
read_coord(reader *r, int regime)
{
	int8_t		g = (int8_t) read_u8(r);

	switch (regime)
	{
		case 0:					/* raw doubles */
			return admissible(read_f64(r));
		case 1:					/* small grid: duplicates, collinear runs */
			return g / 4.0;
		case 2:					/* tiny, still far from underflow of squares */
			return g * 1e-140;
		case 3:					/* huge, near the accepted limit */
			return admissible(g * 1e148);
		case 4:					/* projected metres, a town near 1e7 */
			return 1e7 + (int16_t) read_u16(r) * 0.01 + g;
		case 5:					/* mixed exponents within one curve */
			return admissible(g * ldexp(1.0, (int) (read_u8(r) % 160) - 80));
		case 6:					/* near-identical: grid plus a few ulps of noise */
			return g + (int8_t) read_u8(r) * 1e-15;
		default:				/* tiny beyond the square's underflow, subnormal too */
			return g * ldexp(1.0, -(int) (read_u8(r) % 200) - 880);
	}
}

/* Largest coordinate spread over both curves, the scale of rounding errors. */
static double
pair_scale(const fuzz_case *c)
{
	double		s = 0.0;

	for (int k = 0; k < c->p.dim; k++)
	{
		double		lo = INFINITY,
					hi = -INFINITY;

		for (size_t i = 0; i < c->p.n; i++)
		{
			lo = fmin(lo, c->a[i * c->p.dim + k]);
			hi = fmax(hi, c->a[i * c->p.dim + k]);
		}
		for (size_t i = 0; i < c->q.n; i++)
		{
			lo = fmin(lo, c->b[i * c->q.dim + k]);
			hi = fmax(hi, c->b[i * c->q.dim + k]);
		}
		s = fmax(s, hi - lo);
	}
	return s;
}

/* Decodes the input into a case. */
static void
decode(const uint8_t *data, size_t size, fuzz_case *c)
{
	reader		r = {data, size, 0};
	uint8_t		flags = read_u8(&r);
	int			dim = (flags & 8) ? 3 : 2;
	size_t		n = 1 + read_u8(&r) % 32,
				m = 1 + read_u8(&r) % 32;
	uint8_t		eps_mode = read_u8(&r);

	c->large = (flags & 0x80) != 0;
	if (c->large)
	{
		n += 128;
		m += 128;
	}

	c->regime = flags & 7;
	c->interrupt_after = (flags >> 4) & 7;
	for (size_t i = 0; i < n * dim; i++)
		c->a[i] = read_coord(&r, c->regime);
	for (size_t i = 0; i < m * dim; i++)
		c->b[i] = read_coord(&r, c->regime);
	c->p.coords = c->a;
	c->p.n = n;
	c->p.dim = dim;
	c->q.coords = c->b;
	c->q.n = m;
	c->q.dim = dim;
	c->scale = pair_scale(c);
	/* eps: a raw double, a grid value, zero or +Inf */
	switch (eps_mode & 3)
	{
		case 0:
			c->eps = fabs(admissible(read_f64(&r)));
			break;
		case 1:
			c->eps = (eps_mode >> 2) / 8.0 * c->scale;
			break;
		case 2:
			c->eps = 0.0;
			break;
		default:
			c->eps = INFINITY;
			break;
	}
}

/* Distance of p to q through a fresh environment; checks status and leaks. */
static double
distance(const fuzz_case *c, const fr_curve *p, const fr_curve *q, long *allocations)
{
	fuzz_heap	h;
	fr_env		e = heap_env(&h);
	double		d = -1;
	fr_status	st = fr_distance(&e, p, q, &d, NULL);

	if (st != FR_OK)
		fail(c, "fr_distance returned %s", fr_status_text(st));
	if (h.live != 0)
		fail(c, "fr_distance leaked %ld blocks", h.live);
	if (!(d >= 0) || !isfinite(d))
		fail(c, "fr_distance gave %g", d);
	if (allocations)
		*allocations = h.total;
	return d;
}

/* A decision through a fresh environment, by the offered or the plain decider. */
static bool
decide(const fuzz_case *c, double eps, bool plain)
{
	fuzz_heap	h;
	fr_env		e = heap_env(&h);
	bool		yes = false;
	fr_status	st = plain ? fr_decide_plain(&e, &c->p, &c->q, eps, &yes, NULL)
		: fr_decide(&e, &c->p, &c->q, eps, &yes, NULL);

	if (st != FR_OK)
		fail(c, "%s returned %s", plain ? "fr_decide_plain" : "fr_decide", fr_status_text(st));
	if (h.live != 0)
		fail(c, "decision leaked %ld blocks", h.live);
	return yes;
}

/*
 * A decision that must be true; under the known tangent bug, also accepted
 * when it is true TANGENT_ULPS above eps.
 */
static bool
decide_true(const fuzz_case *c, double eps, bool plain)
{
	double		up = eps;

	if (decide(c, eps, plain))
		return true;
	for (int k = 0; k < TANGENT_ULPS; k++)
		up = nextafter(up, INFINITY);
	return up != eps && decide(c, up, plain);
}

/* Discrete distance through a fresh environment. */
static double
discrete(const fuzz_case *c)
{
	fuzz_heap	h;
	fr_env		e = heap_env(&h);
	double		d = -1;
	fr_status	st = fr_discrete_distance(&e, &c->p, &c->q, &d);

	if (st != FR_OK)
		fail(c, "fr_discrete_distance returned %s", fr_status_text(st));
	if (h.live != 0)
		fail(c, "fr_discrete_distance leaked %ld blocks", h.live);
	return d;
}

/* Euclidean distance between vertex i of x and vertex j of y, by hypot (no underflow). */
static double
vertex_dist(const double *x, size_t i, const double *y, size_t j, int dim)
{
	double		s = hypot(x[i * dim] - y[j * dim], x[i * dim + 1] - y[j * dim + 1]);

	return dim == 3 ? hypot(s, x[i * dim + 2] - y[j * dim + 2]) : s;
}

/* The larger of the two end-point distances, a lower bound of the distance. */
static double
end_distance(const fuzz_case *c)
{
	return fmax(vertex_dist(c->a, 0, c->b, 0, c->p.dim),
				vertex_dist(c->a, c->p.n - 1, c->b, c->q.n - 1, c->p.dim));
}

/* Prints a curve as a SQL point[] literal (dim 2) or a coordinate list (dim 3). */
static void
print_curve(const char *name, const double *x, size_t n, int dim)
{
	fprintf(stderr, "%s = '{", name);
	for (size_t i = 0; i < n; i++)
	{
		fprintf(stderr, "%s\"(%.17g,%.17g", i ? "," : "", x[i * dim], x[i * dim + 1]);
		if (dim == 3)
			fprintf(stderr, ",%.17g", x[i * dim + 2]);
		fprintf(stderr, ")\"");
	}
	fprintf(stderr, "}'\n");
}

/* One property: aborts through fail() when violated. */
typedef void (*fuzz_check) (fuzz_case *c);

/*
 * Whether the pair spans too many scales to be computed exactly; then
 * every exact entry point must refuse it alike (FR_ERANGE), never answer.
 */
static bool
refused_as_out_of_range(const fuzz_case *c)
{
	fuzz_heap	h;
	fr_env		e = heap_env(&h);
	double		d;
	bool		yes;
	fr_status	st = fr_distance(&e, &c->p, &c->q, &d, NULL);

	if (st != FR_ERANGE)
		return false;
	if (fr_decide_plain(&e, &c->p, &c->q, c->eps, &yes, NULL) != FR_ERANGE ||
		fr_decide_exact(&e, &c->p, &c->q, c->eps, &yes, NULL) != FR_ERANGE ||
		fr_discrete_distance(&e, &c->p, &c->q, &d) != FR_ERANGE)
		fail(c, "fr_distance refused the pair as out of range, another entry point did not");
	if (h.live != 0)
		fail(c, "refusals leaked %ld blocks", h.live);
	return true;
}

/*
 * The entry point's frame: decode, print the case when FUZZ_PRINT is set
 * (SQL literals, to turn a crash into a reproducer), then every property
 * unless the pair is refused alike by every exact entry point.
 */
static int
fuzz_run(const uint8_t *data, size_t size, const fuzz_check *checks, size_t nchecks)
{
	fuzz_case  *c = malloc(sizeof(*c));

	memset(c, 0, sizeof(*c));
	decode(data, size, c);
	if (getenv("FUZZ_PRINT"))
	{
		print_curve("a", c->a, c->p.n, c->p.dim);
		print_curve("b", c->b, c->q.n, c->q.dim);
		fprintf(stderr, "epsilon = %.17g\n", c->eps);
	}
	if (!refused_as_out_of_range(c))
		for (size_t i = 0; i < nchecks; i++)
			checks[i] (c);
	free(c);
	return 0;
}

#endif							/* FUZZ_CASE_H */
