/*
 * track_check.c - frechet_track_check: what is wrong with a track, in the
 * words of the ERROR the other functions would raise, or NULL when every
 * function accepts it.  It raises no ERROR itself, so a batch can filter
 * its bad rows (and a partial index can leave them out) in one condition.
 * The codecs report to a track_report in check mode (track_report.c).
 */
#include "postgres.h"

#include "fmgr.h"
#include "utils/array.h"
#include "utils/builtins.h"

#include "track.h"

/* The check's result: NULL (valid) or the problem's text. */
static Datum
check_result(FunctionCallInfo fcinfo, const track_report *rep)
{
	if (rep->problem == NULL)
		PG_RETURN_NULL();
	PG_RETURN_TEXT_P(cstring_to_text(rep->problem));
}

/*
 * frechet_track_check(track [, srid]): decoding as the functions decode
 * (point[]: shape, NULLs, finite coordinates in range; geometry and
 * geography: a Point or a LineString, not empty, finite coordinates in
 * range, M as time, lon/lat in range for geography), and with a second
 * argument the SRID.
 */
static Datum
track_check(FunctionCallInfo fcinfo, track_type type)
{
	track_report rep = {.argno = 1, .check = true};
	glue_track	t;

	if (track_decode_value(track_calls(fcinfo, type), PG_GETARG_DATUM(0), type,
						   TRACK_GEODESIC | TRACK_TIMES, &rep, &t) &&
		PG_NARGS() > 1)
	{
		int32		want = PG_GETARG_INT32(1);

		if (t.in.srid != want)
			track_problem(&rep, ERRCODE_INVALID_PARAMETER_VALUE, NULL,
						  "curves must have the same SRID", "SRID %d where %d is expected",
						  t.in.srid, want);
	}
	return check_result(fcinfo, &rep);
}

TRACK_FUNCTIONS(frechet_track_check, track_check)
