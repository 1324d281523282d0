/*
 * track_check.c - frechet_track_check: what is wrong with a track, in the
 * words of the ERROR the other functions would raise, or NULL when every
 * function accepts it.  It raises no ERROR itself, so a batch can filter
 * its bad rows (and a partial index can leave them out) in one condition.
 * The decoders report to a track_report in check mode (track_report.c).
 */
#include "postgres.h"

#include "fmgr.h"
#include "utils/array.h"
#include "utils/builtins.h"

#include "glue.h"
#include "geo_glue.h"

/* The check's result: NULL (valid) or the problem's text. */
static Datum
check_result(FunctionCallInfo fcinfo, const track_report *rep)
{
	if (rep->problem == NULL)
		PG_RETURN_NULL();
	PG_RETURN_TEXT_P(cstring_to_text(rep->problem));
}

PG_FUNCTION_INFO_V1(frechet_track_check_point_array);
/* frechet_track_check(point[]): NULL, or what the functions would reject. */
Datum
frechet_track_check_point_array(PG_FUNCTION_ARGS)
{
	track_report rep = {.argno = 1, .check = true};
	fr_curve	c;

	point_array_track(PG_GETARG_ARRAYTYPE_P(0), &rep, &c);
	return check_result(fcinfo, &rep);
}

/*
 * The geometry and geography checks: decoding (a Point or a LineString,
 * not empty, finite coordinates in range), longitude and latitude for
 * geography, and with a second argument the SRID.
 */
static Datum
geo_check(FunctionCallInfo fcinfo, bool geodetic)
{
	track_report rep = {.argno = 1, .check = true};
	fr_curve	c;
	int32		srid;

	if (geo_datum_track(geo_calls_for(fcinfo), PG_GETARG_DATUM(0), geodetic, &rep, &c, &srid) &&
		PG_NARGS() > 1)
	{
		int32		want = PG_GETARG_INT32(1);

		if (srid != want)
			track_problem(&rep, ERRCODE_INVALID_PARAMETER_VALUE, NULL,
						  "curves must have the same SRID", "SRID %d where %d is expected", srid, want);
	}
	return check_result(fcinfo, &rep);
}

PG_FUNCTION_INFO_V1(frechet_track_check_geometry);
/* frechet_track_check(geometry [, srid]) */
Datum
frechet_track_check_geometry(PG_FUNCTION_ARGS)
{
	return geo_check(fcinfo, false);
}

PG_FUNCTION_INFO_V1(frechet_track_check_geography);
/* frechet_track_check(geography [, srid]) */
Datum
frechet_track_check_geography(PG_FUNCTION_ARGS)
{
	return geo_check(fcinfo, true);
}
