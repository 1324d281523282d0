/*
 * points.c - point[] values as tracks, and the point and point[] values
 * of results.  A point[] is planar, 2-D, without M or SRID, and the engine
 * reads its points in place.
 */
#include "postgres.h"

#include <math.h>

#include "catalog/pg_type.h"
#include "utils/array.h"
#include "utils/geo_decls.h"

#include "points.h"

/* A point[] value as a track; false, after reporting to rep, when bad. */
bool
points_decode(Datum value, track_report *rep, glue_track *out)
{
	ArrayType  *arr = DatumGetArrayTypeP(value);

	memset(out, 0, sizeof(glue_track));
	out->type = TRACK_POINTS;
	if (!point_array_track(arr, rep, &out->curve))
		return false;
	out->in.coords = (double *) out->curve.coords;
	out->in.n = out->curve.n;
	out->in.dim = 2;
	return true;
}

/* The point at input position pos (0-based k + t). */
Datum
points_point_datum(const glue_track *t, double pos)
{
	Point	   *pt = palloc(sizeof(Point));
	double		xy[2];

	fr_curve_point(&t->curve, pos, xy);
	pt->x = xy[0];
	pt->y = xy[1];
	return PointPGetDatum(pt);
}

/* A point[] of count points. */
static Datum
point_array_datum(Point *pts, int count)
{
	Datum	   *elems = palloc(sizeof(Datum) * (count > 0 ? count : 1));

	for (int i = 0; i < count; i++)
		elems[i] = PointPGetDatum(&pts[i]);
	return PointerGetDatum(construct_array(elems, count, POINTOID, sizeof(Point), false,
										   TYPALIGN_DOUBLE));
}

/* Appends the point at a 0-based position of the track. */
static void
append_point(Point *out, int *count, const glue_track *t, double pos)
{
	double		xy[2];

	fr_curve_point(&t->curve, pos, xy);
	out[*count].x = xy[0];
	out[*count].y = xy[1];
	(*count)++;
}

/*
 * The track between positions from <= to (0-based): the two end points
 * and the vertices strictly between them; one point when they are equal.
 */
Datum
points_piece_datum(const glue_track *t, double from, double to)
{
	Point	   *pts = palloc(sizeof(Point) * (t->curve.n + 2));
	int			count = 0;

	append_point(pts, &count, t, from);
	for (size_t k = (size_t) floor(from) + 1; (double) k < to; k++)
		append_point(pts, &count, t, (double) k);
	if (to > from)
		append_point(pts, &count, t, to);
	return point_array_datum(pts, count);
}

/* A point[] of the given vertices (0-based indices). */
Datum
points_vertices_datum(const glue_track *t, const size_t *keep, size_t count)
{
	const Point *in = (const Point *) t->curve.coords;
	Point	   *pts = palloc(sizeof(Point) * (count > 0 ? count : 1));

	for (size_t k = 0; k < count; k++)
		pts[k] = in[keep[k]];
	return point_array_datum(pts, (int) count);
}
