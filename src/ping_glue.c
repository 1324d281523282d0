/*
 * ping_glue.c - the ping functions (sparse samples matched in order to a
 * route; src/core/pings.c) on point[], geometry and geography.  One path
 * for all three types: decode, validate, call the engine, convert units.
 */
#include "postgres.h"

#include <math.h>

#include "fmgr.h"
#include "funcapi.h"
#include "utils/tuplestore.h"

#include "geo_glue.h"
#include "geodesy.h"
#include "glue.h"
#include "index.h"

/* Which input type a call decodes. */
typedef enum ping_input
{
	PING_POINTS,
	PING_GEOMETRY,
	PING_GEOGRAPHY
} ping_input;

/* A decoded ping call: trip and route as engine curves, units known. */
typedef struct ping_args
{
	fr_curve	trip,
				route;
	bool		geodetic;
	double		max_gap;		/* engine units; -1 for no limit */
	geo_curves	gc;				/* geometry and geography: as decoded */
} ping_args;

/*
 * Decodes trip and route (arguments 0 and 1) and the optional max_gap
 * (argument gap_argno; SQL NULL or absent: no limit).  Route length along
 * a geography is measured along the chords between its vertices, which for
 * edges under 100 km differs from the geodesic by less than 1e-5 relative.
 */
static void
ping_decode(FunctionCallInfo fcinfo, ping_input input, int gap_argno, ping_args *pa)
{
	if (input == PING_POINTS)
	{
		point_array_curve(PG_GETARG_ARRAYTYPE_P(0), 1, &pa->trip);
		point_array_curve(PG_GETARG_ARRAYTYPE_P(1), 2, &pa->route);
		pa->geodetic = false;
		/* no cut edges: positions map to themselves (geo_pos_in) */
		pa->gc.first_a = pa->gc.first_b = NULL;
	}
	else
	{
		/* geography: the route's edges follow their geodesics; the trip is its pings alone */
		geo_decode_edges(fcinfo, input == PING_GEOGRAPHY, GEO_EDGES_B, &pa->gc);
		pa->trip = pa->gc.p;
		pa->route = pa->gc.q;
		pa->geodetic = pa->gc.geodetic;
	}
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

/* frechet_pings_at_most for every input type; NULL when trip, route or epsilon is NULL. */
static Datum
pings_at_most(FunctionCallInfo fcinfo, ping_input input)
{
	ping_args	pa;
	glue_env	g;
	double		eps;
	bool		yes = false;
	fr_status	st;

	if (PG_ARGISNULL(0) || PG_ARGISNULL(1) || PG_ARGISNULL(2))
		PG_RETURN_NULL();
	ping_decode(fcinfo, input, 3, &pa);
	eps = PG_GETARG_FLOAT8(2);
	glue_check_epsilon(eps, 3);
	if (pa.geodetic)
		eps = fr_metres_to_chord(eps);
	glue_env_begin(&g, fr_pings_scratch_bytes(pa.trip.n, pa.route.n), "frechet_pings_at_most");
	st = fr_pings_decide(&g.env, &pa.trip, &pa.route, eps, pa.max_gap, &yes);
	glue_env_end(&g);
	glue_check_status(st, "frechet_pings_at_most");
	PG_RETURN_BOOL(yes);
}

/* frechet_pings_distance for every input type; NULL when trip or route is NULL. */
static Datum
pings_distance(FunctionCallInfo fcinfo, ping_input input)
{
	ping_args	pa;
	glue_env	g;
	double		d = 0;
	fr_status	st;

	if (PG_ARGISNULL(0) || PG_ARGISNULL(1))
		PG_RETURN_NULL();
	ping_decode(fcinfo, input, 2, &pa);
	glue_env_begin(&g, fr_pings_scratch_bytes(pa.trip.n, pa.route.n), "frechet_pings_distance");
	st = fr_pings_distance(&g.env, &pa.trip, &pa.route, pa.max_gap, &d, NULL);
	glue_env_end(&g);
	glue_check_status(st, "frechet_pings_distance");
	PG_RETURN_FLOAT8(pa.geodetic && !isinf(d) ? fr_chord_to_metres(d) : d);
}

PG_FUNCTION_INFO_V1(frechet_pings_at_most_point_array);
/* frechet_pings_at_most(point[], point[], float8, max_gap float8): pings in order within epsilon? */
Datum
frechet_pings_at_most_point_array(PG_FUNCTION_ARGS)
{
	return pings_at_most(fcinfo, PING_POINTS);
}

PG_FUNCTION_INFO_V1(frechet_pings_distance_point_array);
/* frechet_pings_distance(point[], point[], max_gap float8): smallest such epsilon. */
Datum
frechet_pings_distance_point_array(PG_FUNCTION_ARGS)
{
	return pings_distance(fcinfo, PING_POINTS);
}

PG_FUNCTION_INFO_V1(frechet_pings_at_most_geometry);
/* frechet_pings_at_most(geometry, geometry, float8, max_gap float8): units of the SRID. */
Datum
frechet_pings_at_most_geometry(PG_FUNCTION_ARGS)
{
	return pings_at_most(fcinfo, PING_GEOMETRY);
}

PG_FUNCTION_INFO_V1(frechet_pings_distance_geometry);
/* frechet_pings_distance(geometry, geometry, max_gap float8): units of the SRID. */
Datum
frechet_pings_distance_geometry(PG_FUNCTION_ARGS)
{
	return pings_distance(fcinfo, PING_GEOMETRY);
}

PG_FUNCTION_INFO_V1(frechet_pings_at_most_geography);
/* frechet_pings_at_most(geography, geography, float8, max_gap float8): metres. */
Datum
frechet_pings_at_most_geography(PG_FUNCTION_ARGS)
{
	return pings_at_most(fcinfo, PING_GEOGRAPHY);
}

PG_FUNCTION_INFO_V1(frechet_pings_distance_geography);
/* frechet_pings_distance(geography, geography, max_gap float8): metres. */
Datum
frechet_pings_distance_geography(PG_FUNCTION_ARGS)
{
	return pings_distance(fcinfo, PING_GEOGRAPHY);
}

/*
 * track |~~~| reach: the index condition of frechet_pings_at_most, the test
 * of fr_key_ping_bound on the track's summary (necessary, not sufficient).
 */
static Datum
pings_within_reach(FunctionCallInfo fcinfo, ping_input input)
{
	fr_key		key;
	const fr_key *reach = PG_GETARG_FRECHET_KEY(1);

	frechet_key_check_kind(reach, input == PING_GEOGRAPHY ? FRECHET_KEY_EARTH : FRECHET_KEY_PLANAR, 2);
	if (input == PING_POINTS)
	{
		fr_curve	c;

		point_array_curve(PG_GETARG_ARRAYTYPE_P(0), 1, &c);
		fr_key_of_curve(&c, &key);
	}
	else
		geo_argument_key(fcinfo, 1, input == PING_GEOGRAPHY, &key);
	PG_RETURN_BOOL(frechet_key_ping_bound(&key, reach) <= frechet_key_reach(reach));
}

PG_FUNCTION_INFO_V1(frechet_pings_within_reach_point_array);
/* point[] |~~~| frechet_key */
Datum
frechet_pings_within_reach_point_array(PG_FUNCTION_ARGS)
{
	return pings_within_reach(fcinfo, PING_POINTS);
}

PG_FUNCTION_INFO_V1(frechet_pings_within_reach_geometry);
/* geometry |~~~| frechet_key */
Datum
frechet_pings_within_reach_geometry(PG_FUNCTION_ARGS)
{
	return pings_within_reach(fcinfo, PING_GEOMETRY);
}

PG_FUNCTION_INFO_V1(frechet_pings_within_reach_geography);
/* geography |~~~| frechet_key */
Datum
frechet_pings_within_reach_geography(PG_FUNCTION_ARGS)
{
	return pings_within_reach(fcinfo, PING_GEOGRAPHY);
}

/*
 * frechet_pings_excursions for every input type: one row a run of
 * off-route pings (ping numbers from 1, route positions k + t with
 * vertices from 1, the farthest ping's leash and the run's length along
 * the pings; metres for geography, lengths along the chords).
 */
static Datum
pings_excursions(FunctionCallInfo fcinfo, ping_input input)
{
	ReturnSetInfo *rsinfo = (ReturnSetInfo *) fcinfo->resultinfo;
	ping_args	pa;
	glue_env	g;
	double		eps;
	fr_excursion *x = NULL;
	size_t		count = 0;
	fr_status	st;

	glue_srf_materialize(fcinfo);
	ping_decode(fcinfo, input, PG_NARGS(), &pa);
	eps = PG_GETARG_FLOAT8(2);
	glue_check_epsilon(eps, 3);
	if (input != PING_POINTS)
		geo_check_times(&pa.gc, 0);
	if (pa.geodetic)
		eps = fr_metres_to_chord(eps);
	glue_env_begin(&g, fr_pings_excursions_scratch_bytes(pa.trip.n, pa.route.n),
				   "frechet_pings_excursions");
	st = fr_pings_excursions(&g.env, &pa.trip, &pa.route, eps, &x, &count);
	if (st == FR_OK)
	{
		for (size_t k = 0; k < count; k++)
		{
			Datum		values[9];
			bool		nulls[9] = {false};

			values[0] = Int32GetDatum((int32) x[k].trip_from + 1);
			values[1] = Int32GetDatum((int32) x[k].trip_to + 1);
			values[2] = Float8GetDatum(geo_pos_in(&pa.gc, 1, x[k].route_from) + 1);
			values[3] = Float8GetDatum(geo_pos_in(&pa.gc, 1, x[k].route_to) + 1);
			values[4] = Float8GetDatum(pa.geodetic ? fr_chord_to_metres(x[k].max_leash) : x[k].max_leash);
			values[5] = Float8GetDatum(x[k].trip_length);
			values[6] = Float8GetDatum(x[k].route_length);
			if (input != PING_POINTS)
			{
				/* the times of the run's first and last pings; NULL without M */
				values[7] = geo_time_datum(&pa.gc, 0, x[k].trip_from, &nulls[7]);
				values[8] = geo_time_datum(&pa.gc, 0, x[k].trip_to, &nulls[8]);
			}
			tuplestore_putvalues(rsinfo->setResult, rsinfo->setDesc, values, nulls);
		}
	}
	glue_env_end(&g);
	glue_check_status(st, "frechet_pings_excursions");
	return (Datum) 0;
}

PG_FUNCTION_INFO_V1(frechet_pings_excursions_point_array);
/* frechet_pings_excursions(point[], point[], float8): runs of off-route pings. */
Datum
frechet_pings_excursions_point_array(PG_FUNCTION_ARGS)
{
	return pings_excursions(fcinfo, PING_POINTS);
}

PG_FUNCTION_INFO_V1(frechet_pings_excursions_geometry);
/* frechet_pings_excursions(geometry, geometry, float8): units of the SRID. */
Datum
frechet_pings_excursions_geometry(PG_FUNCTION_ARGS)
{
	return pings_excursions(fcinfo, PING_GEOMETRY);
}

PG_FUNCTION_INFO_V1(frechet_pings_excursions_geography);
/* frechet_pings_excursions(geography, geography, float8): metres. */
Datum
frechet_pings_excursions_geography(PG_FUNCTION_ARGS)
{
	return pings_excursions(fcinfo, PING_GEOGRAPHY);
}
