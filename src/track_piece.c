/*
 * track_piece.c - the piece of a point[] track between two positions k + t
 * (1-based, like array subscripts): what a map draws for an excursion or
 * for the part of a route a partial trip followed.  The geometry and
 * geography pieces are in geo_witness.c and share the position checks.
 */
#include "postgres.h"

#include <math.h>

#include "fmgr.h"
#include "catalog/pg_type.h"
#include "utils/array.h"
#include "utils/geo_decls.h"

#include "glue.h"

/* Checks that a position lies on a curve of n vertices (1 <= pos <= n). */
static void
check_position(double pos, size_t n, int argno)
{
	if (isnan(pos) || pos < 1.0 || pos > (double) n)
		ereport(ERROR,
				(errcode(ERRCODE_INVALID_PARAMETER_VALUE),
				 errmsg("position %g is not on the track", pos),
				 errdetail("Argument %d must lie between 1 and the track's %zu vertices.",
						   argno, n),
				 errhint("Positions are k + t: t of the way from vertex k to vertex k + 1.")));
}

/*
 * Checks the positions of a piece of a track of n vertices: both on it,
 * pos_from (argument 2) not after pos_to (argument 3).
 */
void
glue_check_piece(double from, double to, size_t n)
{
	check_position(from, n, 2);
	check_position(to, n, 3);
	if (from > to)
		ereport(ERROR,
				(errcode(ERRCODE_INVALID_PARAMETER_VALUE),
				 errmsg("pos_from %g is after pos_to %g", from, to),
				 errdetail("Argument 2 must not exceed argument 3."),
				 errhint("To walk the track backwards, reverse the piece afterwards.")));
}

/* Appends the point at a 0-based position of a 2-D curve. */
static void
append_point(Point *out, int *count, const fr_curve *c, double pos)
{
	double		xy[2];

	fr_curve_point(c, pos, xy);
	out[*count].x = xy[0];
	out[*count].y = xy[1];
	(*count)++;
}

PG_FUNCTION_INFO_V1(frechet_track_piece_point_array);
/* frechet_track_piece(track, pos_from, pos_to): the track between two positions. */
Datum
frechet_track_piece_point_array(PG_FUNCTION_ARGS)
{
	ArrayType  *arr = PG_GETARG_ARRAYTYPE_P(0);
	double		from = PG_GETARG_FLOAT8(1);
	double		to = PG_GETARG_FLOAT8(2);
	fr_curve	c;
	Point	   *pts;
	int			count = 0;
	size_t		k;
	Datum	   *elems;
	int			i;
	ArrayType  *result;

	point_array_curve(arr, 1, &c);
	glue_check_piece(from, to, c.n);

	/* the two end points and the vertices strictly between them */
	pts = palloc(sizeof(Point) * (c.n + 2));
	append_point(pts, &count, &c, from - 1.0);
	for (k = (size_t) floor(from) + 1; (double) k < to; k++)
		append_point(pts, &count, &c, (double) k - 1.0);
	if (to > from)
		append_point(pts, &count, &c, to - 1.0);

	elems = palloc(sizeof(Datum) * count);
	for (i = 0; i < count; i++)
		elems[i] = PointPGetDatum(&pts[i]);
	result = construct_array(elems, count, POINTOID, sizeof(Point), false,
							 TYPALIGN_DOUBLE);
	PG_FREE_IF_COPY(arr, 0);
	PG_RETURN_ARRAYTYPE_P(result);
}
