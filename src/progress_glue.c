/*
 * progress_glue.c - frechet_progress (a trip in progress on its route;
 * src/core/progress.c) on point[], geometry and geography: one path for
 * the three types, as ping_glue.c.  One row (route_pos, route_fraction,
 * route_point) or none.
 */
#include "postgres.h"

#include "fmgr.h"
#include "funcapi.h"
#include "utils/geo_decls.h"
#include "utils/tuplestore.h"

#include "geo_glue.h"
#include "geodesy.h"
#include "glue.h"

/* Which input type a call decodes. */
typedef enum progress_input
{
	PROGRESS_POINTS,
	PROGRESS_GEOMETRY,
	PROGRESS_GEOGRAPHY
} progress_input;

/* frechet_progress(trip, route, epsilon) for every input type. */
static Datum
progress(FunctionCallInfo fcinfo, progress_input input)
{
	ReturnSetInfo *rsinfo = (ReturnSetInfo *) fcinfo->resultinfo;
	geo_curves	gc;
	fr_curve	trip,
				route;
	glue_env	g;
	double		eps = PG_GETARG_FLOAT8(2),
				pos = 0,
				frac = 0;
	bool		found = false;
	fr_status	st;

	glue_srf_materialize(fcinfo);
	if (input == PROGRESS_POINTS)
	{
		point_array_curve(PG_GETARG_ARRAYTYPE_P(0), 1, &trip);
		point_array_curve(PG_GETARG_ARRAYTYPE_P(1), 2, &route);
	}
	else
	{
		geo_decode_args(fcinfo, input == PROGRESS_GEOGRAPHY, &gc);
		trip = gc.p;
		route = gc.q;
	}
	glue_check_epsilon(eps, 3);
	if (input == PROGRESS_GEOGRAPHY)
		eps = fr_metres_to_chord(eps);
	glue_env_begin(&g, fr_progress_scratch_bytes(trip.n, route.n), "frechet_progress");
	st = fr_progress(&g.env, &trip, &route, eps, &found, &pos, &frac);
	glue_env_end(&g);
	glue_check_status(st, "frechet_progress");
	if (found)
	{
		Datum		values[3];
		bool		nulls[3] = {false};

		if (input != PROGRESS_POINTS)
			pos = geo_pos_in(&gc, 1, pos);	/* geography edges may have been cut */
		values[0] = Float8GetDatum(pos + 1);
		values[1] = Float8GetDatum(frac);
		if (input == PROGRESS_POINTS)
		{
			Point	   *pt = palloc(sizeof(Point));
			double		xy[2];

			fr_curve_point(&route, pos, xy);
			pt->x = xy[0];
			pt->y = xy[1];
			values[2] = PointPGetDatum(pt);
		}
		else
		{
			/* with the route's Z and M: M of a timetabled route is the time due there */
			geo_check_times(&gc, 1);
			values[2] = geo_point_datum(fcinfo, &gc, 1, pos);
		}
		tuplestore_putvalues(rsinfo->setResult, rsinfo->setDesc, values, nulls);
	}
	return (Datum) 0;
}

PG_FUNCTION_INFO_V1(frechet_progress_point_array);
/* frechet_progress(point[], point[], float8) */
Datum
frechet_progress_point_array(PG_FUNCTION_ARGS)
{
	return progress(fcinfo, PROGRESS_POINTS);
}

PG_FUNCTION_INFO_V1(frechet_progress_geometry);
/* frechet_progress(geometry, geometry, float8): epsilon in the units of the SRID */
Datum
frechet_progress_geometry(PG_FUNCTION_ARGS)
{
	return progress(fcinfo, PROGRESS_GEOMETRY);
}

PG_FUNCTION_INFO_V1(frechet_progress_geography);
/* frechet_progress(geography, geography, float8): epsilon in metres */
Datum
frechet_progress_geography(PG_FUNCTION_ARGS)
{
	return progress(fcinfo, PROGRESS_GEOGRAPHY);
}
