/*
 * geojson.c - helpers of the GeoJSON functions (whose bodies are SQL, in
 * the install scripts): the caller's feature properties, checked, which
 * leashes of a long matching are drawn under a cap, the times (M) of a
 * track's vertices, and the SRID check of a geometry.
 */
#include "postgres.h"

#include "fmgr.h"
#include "catalog/pg_type.h"
#include "utils/array.h"
#include "utils/jsonb.h"

#include "track.h"

PG_FUNCTION_INFO_V1(frechet_geojson_properties);
/*
 * frechet_geojson_properties(properties jsonb): the caller's properties to
 * merge into every feature: '{}' for NULL, the object itself, and 22023
 * for any other JSON value (|| would append to an array instead).
 */
Datum
frechet_geojson_properties(PG_FUNCTION_ARGS)
{
	Jsonb	   *props;

	if (PG_ARGISNULL(0))
	{
		JsonbParseState *state = NULL;
		JsonbValue *v;

		pushJsonbValue(&state, WJB_BEGIN_OBJECT, NULL);
		v = pushJsonbValue(&state, WJB_END_OBJECT, NULL);
		PG_RETURN_JSONB_P(JsonbValueToJsonb(v));
	}
	props = PG_GETARG_JSONB_P(0);
	if (!JB_ROOT_IS_OBJECT(props) || JB_ROOT_IS_SCALAR(props))
		ereport(ERROR,
				(errcode(ERRCODE_INVALID_PARAMETER_VALUE),
				 errmsg("properties must be a JSON object"),
				 errdetail("Argument 4 is a JSON %s.",
						   JB_ROOT_IS_SCALAR(props) ? "scalar" : "array"),
				 errhint("For example jsonb_build_object('trip_id', t.id); its members are added to every feature's properties.")));
	PG_RETURN_JSONB_P(props);
}

PG_FUNCTION_INFO_V1(frechet_geojson_leash_drawn);
/*
 * frechet_geojson_leash_drawn(step int4, total int8, longest bool, cap
 * int4): is leash `step` (1-based) of a matching of `total` drawn when at
 * most `cap` may be?  All when cap is NULL or total <= cap; else the
 * longest (longest is true for exactly one step) and the first step of
 * each of cap - 1 equal runs of steps, so never more than cap.  cap below
 * 1 is an error (22023).
 */
Datum
frechet_geojson_leash_drawn(PG_FUNCTION_ARGS)
{
	int64		step,
				total,
				cap;

	if (PG_ARGISNULL(3))
		PG_RETURN_BOOL(true);
	cap = PG_GETARG_INT32(3);
	if (cap < 1)
		ereport(ERROR,
				(errcode(ERRCODE_INVALID_PARAMETER_VALUE),
				 errmsg("max_leashes must be at least 1"),
				 errdetail("Argument 5 is %lld.", (long long) cap),
				 errhint("Pass NULL to draw every leash; the longest is always drawn.")));
	if (PG_ARGISNULL(0) || PG_ARGISNULL(1))
		PG_RETURN_BOOL(false);
	step = PG_GETARG_INT32(0);
	total = PG_GETARG_INT64(1);
	if (total <= cap || (!PG_ARGISNULL(2) && PG_GETARG_BOOL(2)))
		PG_RETURN_BOOL(true);
	if (step < 1 || step > total)
		PG_RETURN_BOOL(false);
	/* run r of steps is those s with floor((s - 1) (cap - 1) / total) = r */
	if (cap < 2)
		PG_RETURN_BOOL(false);
	PG_RETURN_BOOL(step == 1 ||
				   ((step - 1) * (cap - 1)) / total != ((step - 2) * (cap - 1)) / total);
}

/*
 * frechet_geojson_times(track, argno): the M (time) of each vertex for the
 * GeoJSON functions, checked as time in the words of an ERROR that names
 * argument argno of the caller; NULL when the track has no M.
 */
static Datum
geojson_times(FunctionCallInfo fcinfo, track_type type)
{
	glue_track	t;
	track_report rep = {.argno = PG_GETARG_INT32(1)};
	Datum	   *elems;

	track_decode_arg(fcinfo, 0, type, 0, &t);
	if (t.in.m == NULL)
		PG_RETURN_NULL();
	track_input_check_times(&t.in, &rep);
	elems = palloc(sizeof(Datum) * t.in.n);
	for (size_t k = 0; k < t.in.n; k++)
		elems[k] = Float8GetDatum(t.in.m[k]);
	PG_RETURN_ARRAYTYPE_P(construct_array(elems, (int) t.in.n, FLOAT8OID, sizeof(float8),
										  FLOAT8PASSBYVAL, TYPALIGN_DOUBLE));
}

TRACK_FUNCTIONS_POSTGIS(frechet_geojson_times, geojson_times)

PG_FUNCTION_INFO_V1(frechet_geojson_check_srid);
/*
 * frechet_geojson_check_srid(srid, known): true, or 22023 when the SRID of
 * a geometry that GeoJSON needs in WGS84 is not in spatial_ref_sys (known
 * is whether it is), so ST_Transform could only fail with an internal
 * error.  Used by frechet_geometry_geojson.
 */
Datum
frechet_geojson_check_srid(PG_FUNCTION_ARGS)
{
	int32		srid = PG_GETARG_INT32(0);

	if (!PG_GETARG_BOOL(1))
		ereport(ERROR,
				(errcode(ERRCODE_INVALID_PARAMETER_VALUE),
				 errmsg("cannot write GeoJSON of a geometry with SRID %d", srid),
				 errdetail("GeoJSON needs WGS84 longitude and latitude, and SRID %d is not in spatial_ref_sys, so the geometry cannot be transformed.", srid),
				 errhint("Add the SRID's definition to spatial_ref_sys, or use ST_SetSRID(g, 0) to write the coordinates as stored.")));
	PG_RETURN_BOOL(true);
}
