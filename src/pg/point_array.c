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

#include "points.h"

/* Rejects arrays that are not one-dimensional and non-empty. */
static bool
check_shape(ArrayType *arr, track_report *rep)
{
	if (ARR_NDIM(arr) == 0 || ArrayGetNItems(ARR_NDIM(arr), ARR_DIMS(arr)) == 0)
		return track_problem(rep, ERRCODE_INVALID_PARAMETER_VALUE, NULL,
							 "curve must have at least one point", "no points (an empty array)");
	if (ARR_NDIM(arr) != 1)
		return track_problem(rep, ERRCODE_ARRAY_SUBSCRIPT_ERROR, NULL,
							 "curve must be a one-dimensional array of points",
							 "%d dimensions", ARR_NDIM(arr));
	if (ARR_ELEMTYPE(arr) != POINTOID)
		elog(ERROR, "argument %d is not an array of point", rep->argno);
	return true;
}

/* Rejects arrays holding NULL elements, naming the first one. */
static bool
check_no_nulls(ArrayType *arr, track_report *rep)
{
	bits8	   *bitmap = ARR_NULLBITMAP(arr);
	int			n = ARR_DIMS(arr)[0];

	if (bitmap == NULL)
		return true;
	for (int i = 0; i < n; i++)
	{
		if ((bitmap[i / 8] & (1 << (i % 8))) == 0)
			return track_problem(rep, ERRCODE_NULL_VALUE_NOT_ALLOWED, NULL,
								 "curve must not contain null points",
								 "a null at subscript %d", ARR_LBOUND(arr)[0] + i);
	}
	return true;
}

/* Rejects NaN, infinite and out-of-range coordinates, naming the first one. */
static bool
check_coordinates(const Point *pts, int n, ArrayType *arr, track_report *rep)
{
	for (int i = 0; i < n; i++)
	{
		double		x = pts[i].x,
					y = pts[i].y;

		if (isnan(x) || isnan(y) || isinf(x) || isinf(y))
			return track_problem(rep, ERRCODE_DATA_EXCEPTION, NULL,
								 "curve coordinates must be finite",
								 "a NaN or infinite coordinate at subscript %d",
								 ARR_LBOUND(arr)[0] + i);
		if (fabs(x) > FR_MAX_ABS_COORD || fabs(y) > FR_MAX_ABS_COORD)
			return track_problem(rep, ERRCODE_NUMERIC_VALUE_OUT_OF_RANGE, NULL,
								 "curve coordinate out of range",
								 "a coordinate of magnitude above %g at subscript %d",
								 FR_MAX_ABS_COORD, ARR_LBOUND(arr)[0] + i);
	}
	return true;
}

/*
 * Decodes a point[] into a 2-D curve, reporting a bad one to rep.  Points
 * are fixed-size, double-aligned and stored contiguously in a NULL-free
 * array, so the coordinates are used in place.
 */
bool
point_array_track(ArrayType *arr, track_report *rep, fr_curve *out)
{
	const Point *pts;
	int			n;

	if (!check_shape(arr, rep) || !check_no_nulls(arr, rep))
		return false;
	n = ARR_DIMS(arr)[0];
	pts = (const Point *) ARR_DATA_PTR(arr);
	rep->start = (const double *) pts;
	rep->dim = 2;
	rep->n = (size_t) n;
	if (!check_coordinates(pts, n, arr, rep))
		return false;
	out->coords = (const double *) pts;
	out->n = (size_t) n;
	out->dim = 2;
	return true;
}

/* Decodes a point[] argument into a 2-D curve; a bad one raises an ERROR naming argno. */
void
point_array_curve(ArrayType *arr, int argno, fr_curve *out)
{
	track_report rep = {.argno = argno};

	point_array_track(arr, &rep, out);
}
