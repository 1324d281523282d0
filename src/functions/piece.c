/*
 * piece.c - the piece of a track between two positions k + t (1-based,
 * like array subscripts), on every track type: what a map draws for an
 * excursion or for the part of a route a partial trip followed.
 */
#include "postgres.h"

#include <math.h>

#include "fmgr.h"
#include "track.h"

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
static void
check_piece(double from, double to, size_t n)
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

/*
 * frechet_track_piece(track, pos_from, pos_to): the track between two
 * positions (k + t, 1-based): the points there and the vertices between.
 * PostGIS types keep Z and M, interpolated at the ends, and give a Point
 * when the two are equal.
 */
static Datum
track_piece(FunctionCallInfo fcinfo, track_type type)
{
	glue_track	t;
	double		from = PG_GETARG_FLOAT8(1),
				to = PG_GETARG_FLOAT8(2);

	track_decode_arg(fcinfo, 0, type, TRACK_GEODESIC, &t);
	check_piece(from, to, t.in.n);
	track_check_times(&t, 1);
	return track_piece_datum(fcinfo, &t, from - 1, to - 1);
}

TRACK_FUNCTIONS(frechet_track_piece, track_piece)
