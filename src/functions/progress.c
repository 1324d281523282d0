/*
 * progress.c - frechet_progress (a trip in progress on its route;
 * src/core/progress.c) on every track type.  One row (route_pos,
 * route_fraction, route_point) or none.
 */
#include "postgres.h"

#include "fmgr.h"
#include "funcapi.h"
#include "utils/tuplestore.h"

#include "track.h"

/* frechet_progress(trip, route, epsilon) */
static Datum
progress(FunctionCallInfo fcinfo, track_type type)
{
	ReturnSetInfo *rsinfo = (ReturnSetInfo *) fcinfo->resultinfo;
	glue_track	trip,
				route;
	glue_env	g;
	double		eps = PG_GETARG_FLOAT8(2),
				pos = 0,
				frac = 0;
	bool		found = false;
	fr_status	st;

	glue_srf_materialize(fcinfo);
	track_decode_both(fcinfo, type, &trip, &route);
	glue_check_epsilon(eps, 3);
	eps = track_engine_epsilon(type, eps);
	glue_env_begin(&g, fr_progress_scratch_bytes(trip.curve.n, route.curve.n), "frechet_progress");
	st = fr_progress(&g.env, &trip.curve, &route.curve, eps, &found, &pos, &frac);
	glue_env_end(&g);
	glue_check_status(st, "frechet_progress");
	if (found)
	{
		Datum		values[3];
		bool		nulls[3] = {false};

		pos = track_pos_in(&route, pos);	/* geography edges may have been cut */
		values[0] = Float8GetDatum(pos + 1);
		values[1] = Float8GetDatum(frac);
		/* with the route's Z and M: M of a timetabled route is the time due there */
		track_check_times(&route, 2);
		values[2] = track_point_datum(fcinfo, &route, pos);
		tuplestore_putvalues(rsinfo->setResult, rsinfo->setDesc, values, nulls);
	}
	return (Datum) 0;
}

TRACK_FUNCTIONS(frechet_progress, progress)
