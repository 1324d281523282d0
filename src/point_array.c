/*
 * point_array.c - point[] arguments as engine curves.  Validation happens
 * here, once: shape, NULLs, finiteness and magnitude; the engine then
 * trusts its input.
 */
#include "postgres.h"

#include <math.h>

#include "catalog/pg_type.h"
#include "utils/array.h"
#include "utils/geo_decls.h"

#include "glue.h"

/* Rejects arrays that are not one-dimensional and non-empty. */
static void
check_shape(ArrayType *arr, int argno)
{
	if (ARR_NDIM(arr) == 0 || ArrayGetNItems(ARR_NDIM(arr), ARR_DIMS(arr)) == 0)
		ereport(ERROR,
				(errcode(ERRCODE_INVALID_PARAMETER_VALUE),
				 errmsg("curve must have at least one point"),
				 errdetail("Argument %d is an empty array.", argno)));
	if (ARR_NDIM(arr) != 1)
		ereport(ERROR,
				(errcode(ERRCODE_ARRAY_SUBSCRIPT_ERROR),
				 errmsg("curve must be a one-dimensional array of points"),
				 errdetail("Argument %d has %d dimensions.", argno, ARR_NDIM(arr))));
	if (ARR_ELEMTYPE(arr) != POINTOID)
		elog(ERROR, "argument %d is not an array of point", argno);
}

/* Rejects arrays holding NULL elements, naming the first one. */
static void
check_no_nulls(ArrayType *arr, int argno)
{
	bits8	   *bitmap = ARR_NULLBITMAP(arr);
	int			n = ARR_DIMS(arr)[0];

	if (bitmap == NULL)
		return;
	for (int i = 0; i < n; i++)
	{
		if ((bitmap[i / 8] & (1 << (i % 8))) == 0)
			ereport(ERROR,
					(errcode(ERRCODE_NULL_VALUE_NOT_ALLOWED),
					 errmsg("curve must not contain null points"),
					 errdetail("Argument %d has a null at subscript %d.",
							   argno, ARR_LBOUND(arr)[0] + i)));
	}
}

/* Rejects NaN, infinite and out-of-range coordinates, naming the first one. */
static void
check_coordinates(const Point *pts, int n, ArrayType *arr, int argno)
{
	for (int i = 0; i < n; i++)
	{
		double		x = pts[i].x,
					y = pts[i].y;

		if (isnan(x) || isnan(y) || isinf(x) || isinf(y))
			ereport(ERROR,
					(errcode(ERRCODE_DATA_EXCEPTION),
					 errmsg("curve coordinates must be finite"),
					 errdetail("Argument %d has a NaN or infinite coordinate at subscript %d.",
							   argno, ARR_LBOUND(arr)[0] + i)));
		if (fabs(x) > FR_MAX_ABS_COORD || fabs(y) > FR_MAX_ABS_COORD)
			ereport(ERROR,
					(errcode(ERRCODE_NUMERIC_VALUE_OUT_OF_RANGE),
					 errmsg("curve coordinate out of range"),
					 errdetail("Argument %d has a coordinate of magnitude above %g at subscript %d.",
							   argno, FR_MAX_ABS_COORD, ARR_LBOUND(arr)[0] + i)));
	}
}

/*
 * Decodes a point[] into a 2-D curve.  Points are fixed-size, double-aligned and stored
 * contiguously in a NULL-free array, so the coordinates are used in place.
 */
void
point_array_curve(ArrayType *arr, int argno, fr_curve *out)
{
	const Point *pts;
	int			n;

	check_shape(arr, argno);
	check_no_nulls(arr, argno);
	n = ARR_DIMS(arr)[0];
	pts = (const Point *) ARR_DATA_PTR(arr);
	check_coordinates(pts, n, arr, argno);
	out->coords = (const double *) pts;
	out->n = (size_t) n;
	out->dim = 2;
}
