/*
 * explain.c - SQL functions that explain a distance, on every track type:
 * the witness matching (as rows, or as leash segments for maps), its
 * bottleneck, partial matches of a trip against a route, and the
 * excursions where a trip left its route.  Positions in SQL are k + t
 * with 1-based vertex numbers, like array subscripts; for geography, t on
 * an edge cut along its geodesic is the share of the geodesic's length.
 * PostGIS types also get geometry results (points, route parts, trip
 * pieces) with the inputs' SRID, Z and M, and times where M is present.
 * M is time (PostGIS's trajectory convention): between vertices it is
 * linear in t, and a function that returns it checks that it never
 * decreases.
 */
#include "postgres.h"

#include <math.h>

#include "fmgr.h"
#include "funcapi.h"
#include "utils/memutils.h"
#include "utils/tuplestore.h"

#include "track.h"

/*
 * Runs the witness matching in scratch memory and copies the breakpoints
 * out into the caller's context.  eps < 0 asks for an optimal matching.
 */
static fr_match_pt *
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

/*
 * The partial distance (trip against any part of route), for every
 * caller: the search of fr_partial_distance with the windowed decider of
 * corridor search (the trip matched whole is corridor search's stretch),
 * which sweeps only the route's windows near the trip; equal values
 * (test_passage.c, fuzz_witness, bench/partial_bench).
 */
static double
glue_partial_distance(const fr_curve *trip, const fr_curve *route)
{
	glue_env	g;
	double		d;
	fr_status	st;

	glue_env_begin(&g, fr_passage_scratch_bytes(trip->n, route->n), "frechet_partial_distance");
	st = fr_passage_distance(&g.env, route, trip, &d, NULL);
	glue_env_end(&g);
	glue_check_status(st, "frechet_partial_distance");
	return d;
}

/*
 * The part of route that trip follows within eps, for every caller: *found,
 * and when found the positions (0-based) and the distance to that part.
 */
static void
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
static fr_excursion *
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

/* Tolerance argument 3 when given (else -1: optimal), validated, as the engine's. */
static double
optional_epsilon(FunctionCallInfo fcinfo, track_type type)
{
	double		eps;

	if (PG_ARGISNULL(2))
		return -1;
	eps = PG_GETARG_FLOAT8(2);
	glue_check_epsilon(eps, 3);
	return track_engine_epsilon(type, eps);
}

/* frechet_matching(a, b, epsilon DEFAULT NULL): breakpoints of a witness matching, with their points. */
static Datum
matching_rows(FunctionCallInfo fcinfo, track_type type)
{
	ReturnSetInfo *rsinfo = (ReturnSetInfo *) fcinfo->resultinfo;
	glue_track	a,
				b;
	fr_match_pt *pts;
	size_t		count;
	double		eps;

	glue_srf_materialize(fcinfo);
	if (PG_ARGISNULL(0) || PG_ARGISNULL(1))
		return (Datum) 0;
	track_decode_both(fcinfo, type, &a, &b);
	eps = optional_epsilon(fcinfo, type);
	track_check_times(&a, 1);
	track_check_times(&b, 2);
	pts = glue_matching(&a.curve, &b.curve, eps, &count, "frechet_matching");
	for (size_t k = 0; k < count; k++)
	{
		Datum		values[6];
		bool		nulls[6] = {false};
		double		a_pos = track_pos_in(&a, pts[k].a_pos),
					b_pos = track_pos_in(&b, pts[k].b_pos);

		values[0] = Int32GetDatum((int32) k + 1);
		values[1] = Float8GetDatum(a_pos + 1);
		values[2] = Float8GetDatum(b_pos + 1);
		values[3] = track_point_datum(fcinfo, &a, a_pos);
		values[4] = track_point_datum(fcinfo, &b, b_pos);
		values[5] = Float8GetDatum(track_out_distance(type, pts[k].leash));
		tuplestore_putvalues(rsinfo->setResult, rsinfo->setDesc, values, nulls);
	}
	return (Datum) 0;
}

/* frechet_matching_leashes(a, b, epsilon DEFAULT NULL): the matching as leash segments. */
static Datum
matching_leashes(FunctionCallInfo fcinfo, track_type type)
{
	glue_track	a,
				b;
	fr_match_pt *pts;
	size_t		count;
	double		eps;

	if (PG_ARGISNULL(0) || PG_ARGISNULL(1))
		PG_RETURN_NULL();
	track_decode_both(fcinfo, type, &a, &b);
	eps = optional_epsilon(fcinfo, type);
	track_check_times(&a, 1);
	track_check_times(&b, 2);
	pts = glue_matching(&a.curve, &b.curve, eps, &count, "frechet_matching_leashes");
	if (count == 0)
		PG_RETURN_NULL();
	PG_RETURN_DATUM(track_leashes_datum(fcinfo, &a, &b, pts, count));
}

/* frechet_bottleneck(a, b): where the longest leash of an optimal matching is. */
static Datum
bottleneck_row(FunctionCallInfo fcinfo, track_type type)
{
	ReturnSetInfo *rsinfo = (ReturnSetInfo *) fcinfo->resultinfo;
	glue_track	a,
				b;
	fr_match_pt *pts;
	size_t		count,
				worst = 0;
	double		a_pos,
				b_pos;
	Datum		values[5];
	bool		nulls[5] = {false};

	glue_srf_materialize(fcinfo);
	track_decode_both(fcinfo, type, &a, &b);
	track_check_times(&a, 1);
	track_check_times(&b, 2);
	pts = glue_matching(&a.curve, &b.curve, -1, &count, "frechet_bottleneck");
	if (count == 0)
		elog(ERROR, "frechet_bottleneck found no optimal matching");
	/* the leash is convex between breakpoints, so the longest is at one */
	for (size_t k = 1; k < count; k++)
		if (pts[k].leash > pts[worst].leash)
			worst = k;
	a_pos = track_pos_in(&a, pts[worst].a_pos);
	b_pos = track_pos_in(&b, pts[worst].b_pos);
	values[0] = Float8GetDatum(a_pos + 1);
	values[1] = Float8GetDatum(b_pos + 1);
	values[2] = track_point_datum(fcinfo, &a, a_pos);
	values[3] = track_point_datum(fcinfo, &b, b_pos);
	values[4] = Float8GetDatum(track_out_distance(type, pts[worst].leash));
	tuplestore_putvalues(rsinfo->setResult, rsinfo->setDesc, values, nulls);
	return (Datum) 0;
}

/* frechet_partial_distance(trip, route): best fit of the trip to any part of the route. */
static Datum
partial_distance(FunctionCallInfo fcinfo, track_type type)
{
	glue_track	a,
				b;

	track_decode_both(fcinfo, type, &a, &b);
	PG_RETURN_FLOAT8(track_out_distance(type, glue_partial_distance(&a.curve, &b.curve)));
}

/*
 * frechet_partial_match(trip, route, epsilon): the part of the route the
 * trip follows; PostGIS types add that part as a LineString.
 */
static Datum
partial_match_row(FunctionCallInfo fcinfo, track_type type)
{
	ReturnSetInfo *rsinfo = (ReturnSetInfo *) fcinfo->resultinfo;
	glue_track	a,
				b;
	double		eps = PG_GETARG_FLOAT8(2),
				from,
				to,
				d;
	bool		found;

	glue_srf_materialize(fcinfo);
	track_decode_both(fcinfo, type, &a, &b);
	glue_check_epsilon(eps, 3);
	track_check_times(&b, 2);
	glue_partial_match(&a.curve, &b.curve, track_engine_epsilon(type, eps), &found, &from, &to, &d);
	if (found)
	{
		Datum		values[4];
		bool		nulls[4] = {false};

		from = track_pos_in(&b, from);
		to = track_pos_in(&b, to);
		values[0] = Float8GetDatum(from + 1);
		values[1] = Float8GetDatum(to + 1);
		values[2] = Float8GetDatum(track_out_distance(type, d));
		if (type != TRACK_POINTS)
			values[3] = track_subline_datum(fcinfo, &b, from, to);
		tuplestore_putvalues(rsinfo->setResult, rsinfo->setDesc, values, nulls);
	}
	return (Datum) 0;
}

/*
 * frechet_excursions(trip, route, epsilon): the stretches where the trip
 * left its route.  Columns: trip_from, trip_to, route_from, route_to,
 * max_leash, trip_length, then for PostGIS types the trip's piece, then
 * route_length, then for PostGIS types the trip's times (M) where the
 * stretch begins and ends (NULL without M).  Lengths of geography are
 * along the chords; metres along the surface differ by below 1e-7 for
 * edges under 10 km.
 */
static Datum
excursion_rows(FunctionCallInfo fcinfo, track_type type)
{
	ReturnSetInfo *rsinfo = (ReturnSetInfo *) fcinfo->resultinfo;
	glue_track	a,
				b;
	double		eps = PG_GETARG_FLOAT8(2);
	fr_excursion *x;
	size_t		count;
	bool		postgis = type != TRACK_POINTS;

	glue_srf_materialize(fcinfo);
	track_decode_both(fcinfo, type, &a, &b);
	glue_check_epsilon(eps, 3);
	track_check_times(&a, 1);
	x = glue_excursions(&a.curve, &b.curve, track_engine_epsilon(type, eps), &count);
	for (size_t k = 0; k < count; k++)
	{
		Datum		values[10];
		bool		nulls[10] = {false};
		int			c = 0;
		double		trip_from = track_pos_in(&a, x[k].trip_from),
					trip_to = track_pos_in(&a, x[k].trip_to);

		values[c++] = Float8GetDatum(trip_from + 1);
		values[c++] = Float8GetDatum(trip_to + 1);
		values[c++] = Float8GetDatum(track_pos_in(&b, x[k].route_from) + 1);
		values[c++] = Float8GetDatum(track_pos_in(&b, x[k].route_to) + 1);
		values[c++] = Float8GetDatum(track_out_distance(type, x[k].max_leash));
		values[c++] = Float8GetDatum(x[k].trip_length);
		if (postgis)
			values[c++] = track_subline_datum(fcinfo, &a, trip_from, trip_to);
		values[c++] = Float8GetDatum(x[k].route_length);
		if (postgis)
		{
			values[c] = track_time_datum(&a, trip_from, &nulls[c]);
			c++;
			values[c] = track_time_datum(&a, trip_to, &nulls[c]);
			c++;
		}
		tuplestore_putvalues(rsinfo->setResult, rsinfo->setDesc, values, nulls);
	}
	return (Datum) 0;
}

TRACK_FUNCTIONS(frechet_matching, matching_rows)
TRACK_FUNCTIONS_POSTGIS(frechet_matching_leashes, matching_leashes)
TRACK_FUNCTIONS(frechet_bottleneck, bottleneck_row)
TRACK_FUNCTIONS(frechet_partial_distance, partial_distance)
TRACK_FUNCTIONS(frechet_partial_match, partial_match_row)
TRACK_FUNCTIONS(frechet_excursions, excursion_rows)
