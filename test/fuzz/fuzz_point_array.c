/*
 * fuzz_point_array.c - libFuzzer target for point[] decoding: the glue's
 * point_array_curve (src/pg/point_array.c, compiled unchanged against the
 * PostgreSQL 15 headers; the server's error functions are stubbed in
 * pg_stubs.c).
 *
 * The input bytes describe an array value in the server's in-memory layout,
 * as array_in and array_recv build it: 0 to MAXDIM dimensions, any sizes
 * and lower bounds, an optional null bitmap, and points whose coordinates
 * are raw doubles or picked from the troublesome ones (NaN, +-Inf, the
 * 1e150 limit and its neighbours, subnormals, -0).  PostgreSQL's own
 * parsers check the varlena structure before our code sees it; this
 * harness feeds only structurally valid arrays and fuzzes what we check.
 *
 * Properties: the outcome is exactly the one README.md documents for the
 * first bad thing in the array (the harness computes it independently from
 * what it built), every ERROR has a lower-case message and a detail
 * sentence naming the argument (and the subscript, for element errors), and
 * an accepted array yields a curve over the array's own points.
 */
#include "postgres.h"

#include <ctype.h>
#include <float.h>
#include <limits.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>

#include "catalog/pg_type.h"
#include "utils/array.h"
#include "utils/geo_decls.h"

#include "glue.h"
#include "points.h"
#include "pg_stubs.h"

#undef snprintf
#undef fprintf
#undef vfprintf

/* What the decoder must answer for one array. */
typedef struct expectation
{
	int			sqlerrcode;		/* 0: accepted */
	bool		internal;		/* an elog: a can't-happen from SQL */
	int			subscript;		/* for element errors; else INT_MIN */
} expectation;

/* Reads input bytes one at a time; zeros once the input is used up. */
typedef struct reader
{
	const uint8 *data;
	size_t		size;
	size_t		pos;
} reader;

static uint8
read_u8(reader *r)
{
	return r->pos < r->size ? r->data[r->pos++] : 0;
}

static uint32
read_u32(reader *r)
{
	uint32		u = 0;

	for (int i = 0; i < 4; i++)
		u |= (uint32) read_u8(r) << (8 * i);
	return u;
}

static double
read_f64(reader *r)
{
	uint64		u = 0;
	double		x;

	for (int i = 0; i < 8; i++)
		u |= (uint64) read_u8(r) << (8 * i);
	memcpy(&x, &u, sizeof(x));
	return x;
}

/* A coordinate: raw, or one of the values at the edges of what is accepted. */
static double
read_coord(reader *r)
{
	uint8		sel = read_u8(r);

	switch (sel % 16)
	{
		case 0:
		case 1:
		case 2:
			return read_f64(r);
		case 3:
			return NAN;
		case 4:
			return INFINITY;
		case 5:
			return -INFINITY;
		case 6:
			return 1e150;
		case 7:
			return nextafter(1e150, INFINITY);
		case 8:
			return -1e150;
		case 9:
			return nextafter(-1e150, -INFINITY);
		case 10:
			return 5e-324;
		case 11:
			return -0.0;
		case 12:
			return DBL_MAX;
		case 13:
			return -NAN;
		default:
			return (int8) read_u8(r);
	}
}

/* The five-character SQLSTATE of an error code. */
static const char *
sqlstate(int code, char *buf)
{
	for (int i = 0; i < 5; i++)
	{
		buf[i] = PGUNSIXBIT(code);
		code >>= 6;
	}
	buf[5] = '\0';
	return buf;
}

/* Reports a violated property and aborts, so libFuzzer saves the input. */
static void
fail(const char *what, const expectation *want)
{
	char		a[6],
				b[6];

	fprintf(stderr, "property violated: %s (expected sqlstate %s, subscript %d; got %s: %s / %s)\n",
			what, want->sqlerrcode ? sqlstate(want->sqlerrcode, a) : "none",
			want->subscript, sqlstate(stub_error.sqlerrcode, b),
			stub_error.message, stub_error.detail);
	abort();
}

/*
 * Builds the array as construct_md_array lays it out (header, dimensions,
 * lower bounds, optional null bitmap, then the non-null points) and works
 * out what the decoder must say about it.
 */
static ArrayType *
build_array(reader *r, expectation *want, bool **isnull_out, Point **pts_out)
{
	uint8		shape = read_u8(r);
	int			ndim = Min(shape % 8, MAXDIM);
	bool		bitmap = (shape & 0x08) != 0;
	Oid			elemtype = (shape & 0x30) == 0x30 && (shape & 0x40) ? FLOAT8OID : POINTOID;
	int			dims[MAXDIM],
				lbs[MAXDIM];
	int			nitems,
				nonnull = 0;
	bool	   *isnull;
	Point	   *pts;
	Size		nbytes;
	int32		dataoffset;
	ArrayType  *arr;

	if (shape & 0x80)
		ndim = 1;				/* most arrays in real use are 1-D */
	nitems = ndim > 0 ? 1 : 0;
	for (int d = 0; d < ndim; d++)
	{
		dims[d] = ndim == 1 ? read_u8(r) : read_u8(r) % 4;
		/* lower bounds such that lb + size - 1 fits an int, as the server insists */
		lbs[d] = (int) (read_u32(r) >> 2) - (1 << 29);
		nitems *= dims[d];
	}
	isnull = calloc(Max(nitems, 1), sizeof(bool));
	pts = calloc(Max(nitems, 1), sizeof(Point));
	for (int i = 0; i < nitems; i++)
	{
		isnull[i] = bitmap && (read_u8(r) % 8 == 0);
		if (!isnull[i])
		{
			pts[nonnull].x = read_coord(r);
			pts[nonnull].y = read_coord(r);
			nonnull++;
		}
	}

	if (bitmap && nitems > 0)
	{
		dataoffset = ARR_OVERHEAD_WITHNULLS(ndim, nitems);
		nbytes = dataoffset + nonnull * sizeof(Point);
	}
	else
	{
		dataoffset = 0;
		nbytes = ARR_OVERHEAD_NONULLS(ndim) + nonnull * sizeof(Point);
	}
	arr = calloc(1, nbytes);
	SET_VARSIZE(arr, nbytes);
	arr->ndim = ndim;
	arr->dataoffset = dataoffset;
	arr->elemtype = elemtype;
	memcpy(ARR_DIMS(arr), dims, ndim * sizeof(int));
	memcpy(ARR_LBOUND(arr), lbs, ndim * sizeof(int));
	if (dataoffset != 0)
	{
		bits8	   *bits = ARR_NULLBITMAP(arr);

		for (int i = 0; i < nitems; i++)
			if (!isnull[i])
				bits[i / 8] |= 1 << (i % 8);
	}
	memcpy(ARR_DATA_PTR(arr), pts, nonnull * sizeof(Point));

	/* the documented outcome (README.md, "Errors"), checked in this order */
	want->sqlerrcode = 0;
	want->internal = false;
	want->subscript = INT_MIN;
	if (nitems == 0)
		want->sqlerrcode = ERRCODE_INVALID_PARAMETER_VALUE;
	else if (ndim != 1)
		want->sqlerrcode = ERRCODE_ARRAY_SUBSCRIPT_ERROR;
	else if (elemtype != POINTOID)
	{
		want->sqlerrcode = ERRCODE_INTERNAL_ERROR;
		want->internal = true;
	}
	else
	{
		for (int i = 0; i < nitems && want->sqlerrcode == 0; i++)
		{
			if (isnull[i])
			{
				want->sqlerrcode = ERRCODE_NULL_VALUE_NOT_ALLOWED;
				want->subscript = lbs[0] + i;
			}
		}
		for (int i = 0; i < nonnull && want->sqlerrcode == 0; i++)
		{
			double		x = pts[i].x,
						y = pts[i].y;

			if (!isfinite(x) || !isfinite(y))
				want->sqlerrcode = ERRCODE_DATA_EXCEPTION;
			else if (fabs(x) > 1e150 || fabs(y) > 1e150)
				want->sqlerrcode = ERRCODE_NUMERIC_VALUE_OUT_OF_RANGE;
			if (want->sqlerrcode != 0)
				want->subscript = lbs[0] + i;	/* no NULLs here: i is the position */
		}
	}
	*isnull_out = isnull;
	*pts_out = pts;
	return arr;
}

/* Checks the style of an ERROR: lower-case message, detail naming the argument. */
static void
check_error_style(int argno, const expectation *want)
{
	char		prefix[32];
	size_t		len = strlen(stub_error.detail);

	if (stub_error.message[0] == '\0' || isupper((unsigned char) stub_error.message[0]) ||
		stub_error.message[strlen(stub_error.message) - 1] == '.')
		fail("errmsg is not a lower-case phrase without a period", want);
	if (want->internal)
		return;
	snprintf(prefix, sizeof(prefix), "Argument %d ", argno);
	if (strncmp(stub_error.detail, prefix, strlen(prefix)) != 0 ||
		len == 0 || stub_error.detail[len - 1] != '.')
		fail("errdetail is not a sentence naming the argument", want);
	if (want->subscript != INT_MIN)
	{
		char		sub[48];

		snprintf(sub, sizeof(sub), "subscript %d.", want->subscript);
		if (strstr(stub_error.detail, sub) == NULL)
			fail("errdetail does not name the subscript", want);
	}
}

int			LLVMFuzzerTestOneInput(const uint8 *data, size_t size);

/* libFuzzer entry point: build an array, decode it, compare with the documented outcome. */
int
LLVMFuzzerTestOneInput(const uint8 *data, size_t size)
{
	reader		r = {data, size, 0};
	int			argno = 1 + read_u8(&r) % 3;
	expectation want;
	bool	   *isnull;
	Point	   *pts;
	ArrayType  *arr = build_array(&r, &want, &isnull, &pts);
	sigjmp_buf	jb;
	fr_curve	curve;

	memset(&curve, 0, sizeof(curve));
	stub_error.sqlerrcode = 0;
	if (sigsetjmp(jb, 0) == 0)
	{
		stub_catch = &jb;
		point_array_curve(arr, argno, &curve);
		stub_catch = NULL;
		if (want.sqlerrcode != 0)
			fail("accepted an array it must reject", &want);
		if (curve.n != (size_t) ARR_DIMS(arr)[0] || curve.dim != 2 ||
			curve.coords != (const double *) ARR_DATA_PTR(arr))
			fail("accepted array decoded to the wrong curve", &want);
		if (memcmp(curve.coords, pts, curve.n * sizeof(Point)) != 0)
			fail("decoded coordinates differ from the array's", &want);
	}
	else
	{
		stub_catch = NULL;
		if (stub_error.sqlerrcode != want.sqlerrcode || stub_error.internal != want.internal)
			fail("wrong outcome", &want);
		check_error_style(argno, &want);
	}
	free(arr);
	free(isnull);
	free(pts);
	return 0;
}
