/*
 * pings.c - the ping functions (sparse samples matched in order to a
 * route; src/core/pings.c) on every track type.
 */
#include "postgres.h"

#include <math.h>

#include "fmgr.h"
#include "funcapi.h"
#include "utils/tuplestore.h"

#include "track.h"

/* A decoded ping call: trip and route, and the max_gap in engine units (-1: no limit). */
typedef struct ping_args
{
	glue_track	trip,
				route;
	double		max_gap;
} ping_args;

/*
 * Decodes trip and route (arguments 0 and 1) and the optional max_gap
 * (argument gap_argno; SQL NULL or absent: no limit).  Geography: the
 * route's edges follow their geodesics, the trip is its pings alone.
 * Route length along a geography is measured along the chords between
 * its vertices, which for edges under 100 km differs from the geodesic by
 * less than 1e-5 relative.
 */
static void
ping_decode(FunctionCallInfo fcinfo, track_type type, int gap_argno, ping_args *pa)
{
	track_decode_pair(fcinfo, type, 0, TRACK_GEODESIC, &pa->trip, &pa->route);
	pa->max_gap = -1;
	if (gap_argno < PG_NARGS() && !PG_ARGISNULL(gap_argno))
	{
		double		gap = PG_GETARG_FLOAT8(gap_argno);

		if (isnan(gap) || gap < 0)
			ereport(ERROR,
					(errcode(ERRCODE_INVALID_PARAMETER_VALUE),
					 errmsg("max_gap must be a non-negative number or NULL"),
					 errdetail("Argument %d is %s.", gap_argno + 1, isnan(gap) ? "NaN" : "negative"),
					 errhint("Pass NULL for no limit on the route length between consecutive pings.")));
		pa->max_gap = gap;
	}
}

/* frechet_pings_at_most(trip, route, epsilon [, max_gap]); NULL when trip, route or epsilon is NULL. */
static Datum
pings_at_most(FunctionCallInfo fcinfo, track_type type)
{
	ping_args	pa;
	glue_env	g;
	double		eps;
	bool		yes = false;
	fr_status	st;

	if (PG_ARGISNULL(0) || PG_ARGISNULL(1) || PG_ARGISNULL(2))
		PG_RETURN_NULL();
	ping_decode(fcinfo, type, 3, &pa);
	eps = PG_GETARG_FLOAT8(2);
	glue_check_epsilon(eps, 3);
	eps = track_engine_epsilon(type, eps);
	glue_env_begin(&g, fr_pings_scratch_bytes(pa.trip.curve.n, pa.route.curve.n),
				   "frechet_pings_at_most");
	st = fr_pings_decide(&g.env, &pa.trip.curve, &pa.route.curve, eps, pa.max_gap, &yes);
	glue_env_end(&g);
	glue_check_status(st, "frechet_pings_at_most");
	PG_RETURN_BOOL(yes);
}

/* frechet_pings_distance(trip, route [, max_gap]); NULL when trip or route is NULL. */
static Datum
pings_distance(FunctionCallInfo fcinfo, track_type type)
{
	ping_args	pa;
	glue_env	g;
	double		d = 0;
	fr_status	st;

	if (PG_ARGISNULL(0) || PG_ARGISNULL(1))
		PG_RETURN_NULL();
	ping_decode(fcinfo, type, 2, &pa);
	glue_env_begin(&g, fr_pings_scratch_bytes(pa.trip.curve.n, pa.route.curve.n),
				   "frechet_pings_distance");
	st = fr_pings_distance(&g.env, &pa.trip.curve, &pa.route.curve, pa.max_gap, &d, NULL);
	glue_env_end(&g);
	glue_check_status(st, "frechet_pings_distance");
	PG_RETURN_FLOAT8(track_out_distance(type, d));
}

/*
 * frechet_pings_excursions(trip, route, epsilon): one row a run of
 * off-route pings (ping numbers from 1, route positions k + t with
 * vertices from 1, the farthest ping's leash and the run's length along
 * the pings; metres for geography, lengths along the chords); PostGIS
 * types add the times of the run's first and last pings (NULL without M).
 */
static Datum
pings_excursions(FunctionCallInfo fcinfo, track_type type)
{
	ReturnSetInfo *rsinfo = (ReturnSetInfo *) fcinfo->resultinfo;
	ping_args	pa;
	glue_env	g;
	double		eps;
	fr_excursion *x = NULL;
	size_t		count = 0;
	fr_status	st;

	glue_srf_materialize(fcinfo);
	ping_decode(fcinfo, type, PG_NARGS(), &pa);
	eps = PG_GETARG_FLOAT8(2);
	glue_check_epsilon(eps, 3);
	track_check_times(&pa.trip, 1);
	eps = track_engine_epsilon(type, eps);
	glue_env_begin(&g, fr_pings_excursions_scratch_bytes(pa.trip.curve.n, pa.route.curve.n),
				   "frechet_pings_excursions");
	st = fr_pings_excursions(&g.env, &pa.trip.curve, &pa.route.curve, eps, &x, &count);
	if (st == FR_OK)
	{
		for (size_t k = 0; k < count; k++)
		{
			Datum		values[9];
			bool		nulls[9] = {false};

			values[0] = Int32GetDatum((int32) x[k].trip_from + 1);
			values[1] = Int32GetDatum((int32) x[k].trip_to + 1);
			values[2] = Float8GetDatum(track_pos_in(&pa.route, x[k].route_from) + 1);
			values[3] = Float8GetDatum(track_pos_in(&pa.route, x[k].route_to) + 1);
			values[4] = Float8GetDatum(track_out_distance(type, x[k].max_leash));
			values[5] = Float8GetDatum(x[k].trip_length);
			values[6] = Float8GetDatum(x[k].route_length);
			if (type != TRACK_POINTS)
			{
				values[7] = track_time_datum(&pa.trip, x[k].trip_from, &nulls[7]);
				values[8] = track_time_datum(&pa.trip, x[k].trip_to, &nulls[8]);
			}
			tuplestore_putvalues(rsinfo->setResult, rsinfo->setDesc, values, nulls);
		}
	}
	glue_env_end(&g);
	glue_check_status(st, "frechet_pings_excursions");
	return (Datum) 0;
}

TRACK_FUNCTIONS(frechet_pings_at_most, pings_at_most)
TRACK_FUNCTIONS(frechet_pings_distance, pings_distance)
TRACK_FUNCTIONS(frechet_pings_excursions, pings_excursions)
