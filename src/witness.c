/*
 * witness.c - SQL functions that explain a distance: the matching, its
 * bottleneck, and partial matches of a trip against a route.  Positions in
 * SQL are k + t with 1-based vertex numbers, like array subscripts.
 */
#include "postgres.h"

#include <math.h>

#include "fmgr.h"
#include "funcapi.h"
#include "miscadmin.h"
#include "utils/array.h"
#include "utils/geo_decls.h"
#include "utils/memutils.h"
#include "utils/tuplestore.h"

#include "glue.h"

/*
 * Sets up a set-returning call's materialized result: a tuple store and
 * the result descriptor in per-query memory, as InitMaterializedSRF does.
 * That function asks get_call_result_type (unless told to copy the
 * expected descriptor, which a call in the select list does not have),
 * which leaves the OUT-parameter arrays it deconstructs in per-query
 * memory on every call: 80 to 160 bytes a call, measured, so one query
 * calling the function once a row grew without bound.  Here the
 * descriptor is worked out in a scratch context, deleted before
 * returning; only the copy that the executor frees after the call, and
 * the tuple store it ends, are left.
 */
void
glue_srf_materialize(FunctionCallInfo fcinfo)
{
	ReturnSetInfo *rsinfo = (ReturnSetInfo *) fcinfo->resultinfo;
	MemoryContext scratch,
				old;
	TupleDesc	desc;
	Tuplestorestate *store;

	if (rsinfo == NULL || !IsA(rsinfo, ReturnSetInfo) ||
		(rsinfo->allowedModes & SFRM_Materialize) == 0)
		ereport(ERROR,
				(errcode(ERRCODE_FEATURE_NOT_SUPPORTED),
				 errmsg("set-valued function called in context that cannot accept a set")));
	scratch = AllocSetContextCreate(CurrentMemoryContext, "frechet_ext result type",
									ALLOCSET_SMALL_SIZES);
	old = MemoryContextSwitchTo(scratch);
	if (rsinfo->expectedDesc != NULL)
		desc = rsinfo->expectedDesc;
	else if (get_call_result_type(fcinfo, NULL, &desc) != TYPEFUNC_COMPOSITE)
		elog(ERROR, "return type must be a row type");
	MemoryContextSwitchTo(rsinfo->econtext->ecxt_per_query_memory);
	desc = CreateTupleDescCopy(desc);
	store = tuplestore_begin_heap((rsinfo->allowedModes & SFRM_Materialize_Random) != 0,
								  false, work_mem);
	MemoryContextSwitchTo(old);
	MemoryContextDelete(scratch);
	rsinfo->returnMode = SFRM_Materialize;
	rsinfo->setResult = store;
	rsinfo->setDesc = desc;
}

/* A point datum at position pos (0-based k + t) of a 2-D curve. */
static Datum
point_at(const fr_curve *c, double pos)
{
	Point	   *pt = palloc(sizeof(Point));
	double		xy[2];

	fr_curve_point(c, pos, xy);
	pt->x = xy[0];
	pt->y = xy[1];
	return PointPGetDatum(pt);
}

/*
 * Runs the witness matching in scratch memory and copies the breakpoints
 * out into the caller's context.  eps < 0 asks for an optimal matching.
 */
fr_match_pt *
glue_matching(const fr_curve *p, const fr_curve *q, double eps, size_t *count,
			  const char *what)
{
	glue_env	g;
	fr_match_pt *pts,
			   *copy = NULL;
	bool		found;
	double		used;
	fr_status	st;

	glue_env_begin(&g, fr_matching_scratch_bytes(p->n, q->n), what);
	st = fr_matching(&g.env, p, q, eps, &pts, count, &found, &used, NULL);
	if (st == FR_OK && found)
	{
		copy = MemoryContextAllocHuge(MemoryContextGetParent(g.cxt), *count * sizeof(fr_match_pt));
		memcpy(copy, pts, *count * sizeof(fr_match_pt));
	}
	glue_env_end(&g);
	glue_check_status(st, what);
	if (!found)
		*count = 0;
	return copy;
}

/* The partial distance (trip against any part of route), for every caller. */
double
glue_partial_distance(const fr_curve *trip, const fr_curve *route)
{
	glue_env	g;
	double		d;
	fr_status	st;

	glue_env_begin(&g, fr_scratch_bytes(trip->n, route->n), "frechet_partial_distance");
	st = fr_partial_distance(&g.env, trip, route, &d, NULL);
	glue_env_end(&g);
	glue_check_status(st, "frechet_partial_distance");
	return d;
}

/*
 * The part of route that trip follows within eps, for every caller: *found,
 * and when found the positions (0-based) and the distance to that part.
 */
void
glue_partial_match(const fr_curve *trip, const fr_curve *route, double eps, bool *found,
				   double *from, double *to, double *d)
{
	glue_env	g;
	fr_status	st;

	/* the search holds up to three prepared pairs at once */
	glue_env_begin(&g, 3 * fr_scratch_bytes(trip->n, route->n), "frechet_partial_match");
	st = fr_partial_match(&g.env, trip, route, eps, found, from, to, d, NULL);
	glue_env_end(&g);
	glue_check_status(st, "frechet_partial_match");
}

/*
 * Runs the excursions in scratch memory and copies them out into the
 * caller's context (NULL when there are none).
 */
fr_excursion *
glue_excursions(const fr_curve *p, const fr_curve *q, double eps, size_t *count)
{
	glue_env	g;
	fr_excursion *x,
			   *copy = NULL;
	fr_status	st;

	glue_env_begin(&g, fr_excursions_scratch_bytes(p->n, q->n), "frechet_excursions");
	st = fr_excursions(&g.env, p, q, eps, &x, count, NULL);
	if (st == FR_OK && *count > 0)
	{
		copy = MemoryContextAlloc(MemoryContextGetParent(g.cxt), *count * sizeof(fr_excursion));
		memcpy(copy, x, *count * sizeof(fr_excursion));
	}
	glue_env_end(&g);
	glue_check_status(st, "frechet_excursions");
	return copy;
}

PG_FUNCTION_INFO_V1(frechet_matching_point_array);
/* frechet_matching(a, b, epsilon DEFAULT NULL): breakpoints of a witness matching. */
Datum
frechet_matching_point_array(PG_FUNCTION_ARGS)
{
	ReturnSetInfo *rsinfo = (ReturnSetInfo *) fcinfo->resultinfo;
	fr_curve	p,
				q;
	fr_match_pt *pts;
	size_t		count;
	double		eps = -1;

	glue_srf_materialize(fcinfo);
	if (PG_ARGISNULL(0) || PG_ARGISNULL(1))
		PG_RETURN_NULL();
	point_array_curve(PG_GETARG_ARRAYTYPE_P(0), 1, &p);
	point_array_curve(PG_GETARG_ARRAYTYPE_P(1), 2, &q);
	if (!PG_ARGISNULL(2))
	{
		eps = PG_GETARG_FLOAT8(2);
		glue_check_epsilon(eps, 3);
	}
	pts = glue_matching(&p, &q, eps, &count, "frechet_matching");
	for (size_t k = 0; k < count; k++)
	{
		Datum		values[6];
		bool		nulls[6] = {false};

		values[0] = Int32GetDatum((int32) k + 1);
		values[1] = Float8GetDatum(pts[k].a_pos + 1);
		values[2] = Float8GetDatum(pts[k].b_pos + 1);
		values[3] = point_at(&p, pts[k].a_pos);
		values[4] = point_at(&q, pts[k].b_pos);
		values[5] = Float8GetDatum(pts[k].leash);
		tuplestore_putvalues(rsinfo->setResult, rsinfo->setDesc, values, nulls);
	}
	return (Datum) 0;
}

PG_FUNCTION_INFO_V1(frechet_bottleneck_point_array);
/* frechet_bottleneck(a, b): where the longest leash of an optimal matching is. */
Datum
frechet_bottleneck_point_array(PG_FUNCTION_ARGS)
{
	ReturnSetInfo *rsinfo = (ReturnSetInfo *) fcinfo->resultinfo;
	fr_curve	p,
				q;
	fr_match_pt *pts;
	size_t		count,
				worst = 0;
	Datum		values[5];
	bool		nulls[5] = {false};

	glue_srf_materialize(fcinfo);
	point_array_curve(PG_GETARG_ARRAYTYPE_P(0), 1, &p);
	point_array_curve(PG_GETARG_ARRAYTYPE_P(1), 2, &q);
	pts = glue_matching(&p, &q, -1, &count, "frechet_bottleneck");
	if (count == 0)
		elog(ERROR, "frechet_bottleneck found no optimal matching");
	/* the leash is convex between breakpoints, so the longest is at one */
	for (size_t k = 1; k < count; k++)
		if (pts[k].leash > pts[worst].leash)
			worst = k;
	values[0] = Float8GetDatum(pts[worst].a_pos + 1);
	values[1] = Float8GetDatum(pts[worst].b_pos + 1);
	values[2] = point_at(&p, pts[worst].a_pos);
	values[3] = point_at(&q, pts[worst].b_pos);
	values[4] = Float8GetDatum(pts[worst].leash);
	tuplestore_putvalues(rsinfo->setResult, rsinfo->setDesc, values, nulls);
	return (Datum) 0;
}

PG_FUNCTION_INFO_V1(frechet_partial_distance_point_array);
/* frechet_partial_distance(trip, route): best fit of the trip to any part of the route. */
Datum
frechet_partial_distance_point_array(PG_FUNCTION_ARGS)
{
	fr_curve	p,
				q;

	point_array_curve(PG_GETARG_ARRAYTYPE_P(0), 1, &p);
	point_array_curve(PG_GETARG_ARRAYTYPE_P(1), 2, &q);
	PG_RETURN_FLOAT8(glue_partial_distance(&p, &q));
}

PG_FUNCTION_INFO_V1(frechet_partial_match_point_array);
/* frechet_partial_match(trip, route, epsilon): the part of the route the trip follows. */
Datum
frechet_partial_match_point_array(PG_FUNCTION_ARGS)
{
	ReturnSetInfo *rsinfo = (ReturnSetInfo *) fcinfo->resultinfo;
	fr_curve	p,
				q;
	double		eps = PG_GETARG_FLOAT8(2),
				from,
				to,
				d;
	bool		found;

	glue_srf_materialize(fcinfo);
	point_array_curve(PG_GETARG_ARRAYTYPE_P(0), 1, &p);
	point_array_curve(PG_GETARG_ARRAYTYPE_P(1), 2, &q);
	glue_check_epsilon(eps, 3);
	glue_partial_match(&p, &q, eps, &found, &from, &to, &d);
	if (found)
	{
		Datum		values[3];
		bool		nulls[3] = {false};

		values[0] = Float8GetDatum(from + 1);
		values[1] = Float8GetDatum(to + 1);
		values[2] = Float8GetDatum(d);
		tuplestore_putvalues(rsinfo->setResult, rsinfo->setDesc, values, nulls);
	}
	return (Datum) 0;
}

PG_FUNCTION_INFO_V1(frechet_excursions_point_array);
/* frechet_excursions(trip, route, epsilon): the stretches where the trip left its route. */
Datum
frechet_excursions_point_array(PG_FUNCTION_ARGS)
{
	ReturnSetInfo *rsinfo = (ReturnSetInfo *) fcinfo->resultinfo;
	fr_curve	p,
				q;
	double		eps = PG_GETARG_FLOAT8(2);
	fr_excursion *copy;
	size_t		count;

	glue_srf_materialize(fcinfo);
	point_array_curve(PG_GETARG_ARRAYTYPE_P(0), 1, &p);
	point_array_curve(PG_GETARG_ARRAYTYPE_P(1), 2, &q);
	glue_check_epsilon(eps, 3);
	copy = glue_excursions(&p, &q, eps, &count);
	for (size_t k = 0; k < count; k++)
	{
		Datum		values[7];
		bool		nulls[7] = {false};

		values[0] = Float8GetDatum(copy[k].trip_from + 1);
		values[1] = Float8GetDatum(copy[k].trip_to + 1);
		values[2] = Float8GetDatum(copy[k].route_from + 1);
		values[3] = Float8GetDatum(copy[k].route_to + 1);
		values[4] = Float8GetDatum(copy[k].max_leash);
		values[5] = Float8GetDatum(copy[k].trip_length);
		values[6] = Float8GetDatum(copy[k].route_length);
		tuplestore_putvalues(rsinfo->setResult, rsinfo->setDesc, values, nulls);
	}
	return (Datum) 0;
}
