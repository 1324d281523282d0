/*
 * geo_witness.c - the matching, bottleneck, partial matching and
 * excursions on PostGIS geometry (units of the SRID) and geography (metres
 * on WGS84), with geometry results for maps: points, leash segments, route
 * parts and trip pieces, all with the inputs' SRID, Z and M.  Positions
 * are k + t with 1-based vertex numbers, as for point[]; for geography
 * they are fractions of the straight (Earth-centred) chord of an edge.  M
 * is time (PostGIS's trajectory convention): between vertices it is
 * linear in t, and a function that returns it checks that it never
 * decreases.
 */
#include "postgres.h"

#include <math.h>

#include "fmgr.h"
#include "funcapi.h"
#include "catalog/pg_type.h"
#include "utils/array.h"
#include "utils/tuplestore.h"

#include "geodesy.h"
#include "glue.h"
#include "geo_glue.h"

/* Tolerance argument 3 when given (else -1: optimal), validated, as the engine's. */
static double
optional_epsilon(FunctionCallInfo fcinfo, const geo_curves *gc)
{
	double		eps;

	if (PG_ARGISNULL(2))
		return -1;
	eps = PG_GETARG_FLOAT8(2);
	glue_check_epsilon(eps, 3);
	return geo_engine_epsilon(gc, eps);
}

/* frechet_matching(a, b, epsilon DEFAULT NULL): breakpoints with their points. */
static Datum
matching_rows(FunctionCallInfo fcinfo, bool geodetic)
{
	ReturnSetInfo *rsinfo = (ReturnSetInfo *) fcinfo->resultinfo;
	geo_curves	gc;
	fr_match_pt *pts;
	size_t		count;
	double		eps;

	glue_srf_materialize(fcinfo);
	if (PG_ARGISNULL(0) || PG_ARGISNULL(1))
		return (Datum) 0;
	geo_decode_args(fcinfo, geodetic, &gc);
	eps = optional_epsilon(fcinfo, &gc);
	geo_check_times(&gc, 0);
	geo_check_times(&gc, 1);
	pts = glue_matching(&gc.p, &gc.q, eps, &count, "frechet_matching");
	for (size_t k = 0; k < count; k++)
	{
		Datum		values[6];
		bool		nulls[6] = {false};

		double		a_pos = geo_pos_in(&gc, 0, pts[k].a_pos),
					b_pos = geo_pos_in(&gc, 1, pts[k].b_pos);

		values[0] = Int32GetDatum((int32) k + 1);
		values[1] = Float8GetDatum(a_pos + 1);
		values[2] = Float8GetDatum(b_pos + 1);
		values[3] = geo_point_datum(fcinfo, &gc, 0, a_pos);
		values[4] = geo_point_datum(fcinfo, &gc, 1, b_pos);
		values[5] = Float8GetDatum(geo_result_distance(&gc, pts[k].leash));
		tuplestore_putvalues(rsinfo->setResult, rsinfo->setDesc, values, nulls);
	}
	return (Datum) 0;
}

/* frechet_matching_leashes(a, b, epsilon DEFAULT NULL): the matching as leash segments. */
static Datum
matching_leashes(FunctionCallInfo fcinfo, bool geodetic)
{
	geo_curves	gc;
	fr_match_pt *pts;
	size_t		count;
	double		eps;

	if (PG_ARGISNULL(0) || PG_ARGISNULL(1))
		PG_RETURN_NULL();
	geo_decode_args(fcinfo, geodetic, &gc);
	eps = optional_epsilon(fcinfo, &gc);
	geo_check_times(&gc, 0);
	geo_check_times(&gc, 1);
	pts = glue_matching(&gc.p, &gc.q, eps, &count, "frechet_matching_leashes");
	if (count == 0)
		PG_RETURN_NULL();
	PG_RETURN_DATUM(geo_leashes_datum(fcinfo, &gc, pts, count));
}

/* frechet_bottleneck(a, b): the longest leash of an optimal matching. */
static Datum
bottleneck_row(FunctionCallInfo fcinfo, bool geodetic)
{
	ReturnSetInfo *rsinfo = (ReturnSetInfo *) fcinfo->resultinfo;
	geo_curves	gc;
	fr_match_pt *pts;
	size_t		count,
				worst = 0;
	Datum		values[5];
	bool		nulls[5] = {false};

	glue_srf_materialize(fcinfo);
	geo_decode_args(fcinfo, geodetic, &gc);
	geo_check_times(&gc, 0);
	geo_check_times(&gc, 1);
	pts = glue_matching(&gc.p, &gc.q, -1, &count, "frechet_bottleneck");
	if (count == 0)
		elog(ERROR, "frechet_bottleneck found no optimal matching");
	/* the leash is convex between breakpoints, so the longest is at one */
	for (size_t k = 1; k < count; k++)
		if (pts[k].leash > pts[worst].leash)
			worst = k;
	values[0] = Float8GetDatum(geo_pos_in(&gc, 0, pts[worst].a_pos) + 1);
	values[1] = Float8GetDatum(geo_pos_in(&gc, 1, pts[worst].b_pos) + 1);
	values[2] = geo_point_datum(fcinfo, &gc, 0, geo_pos_in(&gc, 0, pts[worst].a_pos));
	values[3] = geo_point_datum(fcinfo, &gc, 1, geo_pos_in(&gc, 1, pts[worst].b_pos));
	values[4] = Float8GetDatum(geo_result_distance(&gc, pts[worst].leash));
	tuplestore_putvalues(rsinfo->setResult, rsinfo->setDesc, values, nulls);
	return (Datum) 0;
}

/* frechet_partial_distance(trip, route): best fit of the trip to any part of the route. */
static Datum
partial_distance(FunctionCallInfo fcinfo, bool geodetic)
{
	geo_curves	gc;

	geo_decode_args(fcinfo, geodetic, &gc);
	PG_RETURN_FLOAT8(geo_result_distance(&gc, glue_partial_distance(&gc.p, &gc.q)));
}

/* frechet_partial_match(trip, route, epsilon): the route part, with its sub-line. */
static Datum
partial_match_row(FunctionCallInfo fcinfo, bool geodetic)
{
	ReturnSetInfo *rsinfo = (ReturnSetInfo *) fcinfo->resultinfo;
	geo_curves	gc;
	double		eps = PG_GETARG_FLOAT8(2),
				from,
				to,
				d;
	bool		found;

	glue_srf_materialize(fcinfo);
	geo_decode_args(fcinfo, geodetic, &gc);
	glue_check_epsilon(eps, 3);
	geo_check_times(&gc, 1);
	glue_partial_match(&gc.p, &gc.q, geo_engine_epsilon(&gc, eps), &found, &from, &to, &d);
	if (found)
	{
		Datum		values[4];
		bool		nulls[4] = {false};

		from = geo_pos_in(&gc, 1, from);
		to = geo_pos_in(&gc, 1, to);
		values[0] = Float8GetDatum(from + 1);
		values[1] = Float8GetDatum(to + 1);
		values[2] = Float8GetDatum(geo_result_distance(&gc, d));
		values[3] = geo_subline_datum(fcinfo, &gc, 1, from, to);
		tuplestore_putvalues(rsinfo->setResult, rsinfo->setDesc, values, nulls);
	}
	return (Datum) 0;
}

/* frechet_excursions(trip, route, epsilon): the stretches off the route, with the trip pieces. */
static Datum
excursion_rows(FunctionCallInfo fcinfo, bool geodetic)
{
	ReturnSetInfo *rsinfo = (ReturnSetInfo *) fcinfo->resultinfo;
	geo_curves	gc;
	double		eps = PG_GETARG_FLOAT8(2);
	fr_excursion *copy;
	size_t		count;

	glue_srf_materialize(fcinfo);
	geo_decode_args(fcinfo, geodetic, &gc);
	glue_check_epsilon(eps, 3);
	geo_check_times(&gc, 0);
	copy = glue_excursions(&gc.p, &gc.q, geo_engine_epsilon(&gc, eps), &count);
	for (size_t k = 0; k < count; k++)
	{
		Datum		values[10];
		bool		nulls[10] = {false};

		/* positions on the inputs' vertices (geography edges may have been cut) */
		copy[k].trip_from = geo_pos_in(&gc, 0, copy[k].trip_from);
		copy[k].trip_to = geo_pos_in(&gc, 0, copy[k].trip_to);
		copy[k].route_from = geo_pos_in(&gc, 1, copy[k].route_from);
		copy[k].route_to = geo_pos_in(&gc, 1, copy[k].route_to);

		values[0] = Float8GetDatum(copy[k].trip_from + 1);
		values[1] = Float8GetDatum(copy[k].trip_to + 1);
		values[2] = Float8GetDatum(copy[k].route_from + 1);
		values[3] = Float8GetDatum(copy[k].route_to + 1);
		values[4] = Float8GetDatum(geo_result_distance(&gc, copy[k].max_leash));
		/* chord lengths; metres along the surface differ by below 1e-7 for edges under 10 km */
		values[5] = Float8GetDatum(copy[k].trip_length);
		values[6] = geo_subline_datum(fcinfo, &gc, 0, copy[k].trip_from, copy[k].trip_to);
		values[7] = Float8GetDatum(copy[k].route_length);
		/* the trip's M (time) where the stretch begins and ends; NULL without M */
		values[8] = geo_time_datum(&gc, 0, copy[k].trip_from, &nulls[8]);
		values[9] = geo_time_datum(&gc, 0, copy[k].trip_to, &nulls[9]);
		tuplestore_putvalues(rsinfo->setResult, rsinfo->setDesc, values, nulls);
	}
	return (Datum) 0;
}

/*
 * A geography edge cannot join antipodal points (PostGIS refuses it), so
 * where the simplified track would have one, the track's own vertices
 * between its ends are put back.  The guarantee holds: that stretch is
 * then the track itself (distance 0), and the Fréchet distance of pieces
 * joined at shared vertices is the largest of the pieces'.  The input has
 * no antipodal edge (PostGIS would not have made the geography).
 */
static size_t *
keep_antipodal_spans(const geo_curves *gc, size_t *keep, size_t *count)
{
	size_t	   *out = palloc(gc->a.n * sizeof(size_t));
	size_t		n = 0;

	for (size_t k = 0; k < *count; k++)
	{
		if (k > 0 && geo_lonlat_antipodal(gc->a.coords + keep[k - 1] * gc->a.dim,
										  gc->a.coords + keep[k] * gc->a.dim))
			for (size_t v = keep[k - 1] + 1; v < keep[k]; v++)
				out[n++] = v;
		out[n++] = keep[k];
	}
	pfree(keep);
	*count = n;
	return out;
}

/* The kept vertices of c simplified within tol (engine units), palloc'd. */
static size_t *
simplify_within(const fr_curve *c, double tol, size_t *count)
{
	glue_env	g;
	size_t	   *keep,
			   *copy = NULL;
	fr_status	st;

	glue_env_begin(&g, fr_scratch_bytes(c->n, 1) + c->n * sizeof(size_t), "frechet_simplify");
	st = fr_simplify(&g.env, c, tol, &keep, count);
	if (st == FR_OK)
	{
		copy = palloc(*count * sizeof(size_t));
		memcpy(copy, keep, *count * sizeof(size_t));
	}
	glue_env_end(&g);
	glue_check_status(st, "frechet_simplify");
	return copy;
}

/* The largest sag bound (geodesy.c) of the edges between kept vertices of c (all when keep is NULL). */
static double
largest_sag(const fr_curve *c, const size_t *keep, size_t count)
{
	double		worst = 0;

	for (size_t k = 1; k < count; k++)
	{
		const double *a = c->coords + 3 * (keep ? keep[k - 1] : k - 1),
				   *b = c->coords + 3 * (keep ? keep[k] : k);

		worst = fmax(worst, fr_geo_sag(sqrt((b[0] - a[0]) * (b[0] - a[0]) + (b[1] - a[1]) * (b[1] - a[1])
											 + (b[2] - a[2]) * (b[2] - a[2]))));
	}
	return worst;
}

/*
 * Geography simplification with geodesic edges.  It simplifies the chords
 * between the vertices within a smaller tolerance t; an edge and its chord
 * are within the edge's sag of each other (matched by projection onto the
 * chord), so by the triangle inequality the simplified track's geodesics
 * are within sag(kept edges) + t + sag(input edges) of the track's, and
 * the engine's curves (within FR_GEO_EDGE_SAG of the geodesics) within
 * 2 FR_GEO_EDGE_SAG more.  t starts at the tolerance less the input's
 * sags and shrinks while the kept edges' sag exceeds what was allowed for
 * it; when no such t is found, every vertex is kept (distance 0).
 */
static size_t *
simplify_geodesic(const fr_curve *c, double tol, size_t *count)
{
	double		input_sag = largest_sag(c, NULL, c->n),
				allowed = 0;

	for (int round = 0; round < 8; round++)
	{
		double		t = tol - input_sag - allowed - 2 * FR_GEO_EDGE_SAG,
					kept_sag;
		size_t	   *keep;

		if (!(t >= 0))
			break;
		keep = simplify_within(c, t, count);
		kept_sag = largest_sag(c, keep, *count);
		if (kept_sag <= allowed)
			return keep;
		allowed = kept_sag;
		pfree(keep);
	}
	{
		size_t	   *all = palloc(c->n * sizeof(size_t));

		for (size_t k = 0; k < c->n; k++)
			all[k] = k;
		*count = c->n;
		return all;
	}
}

/* frechet_simplify(track, tolerance): fewer vertices within tolerance, as a geometry. */
static Datum
simplify_line(FunctionCallInfo fcinfo, bool geodetic)
{
	geo_curves	gc;
	double		tol = PG_GETARG_FLOAT8(1);
	size_t	   *copy,
				count = 0;

	/* the vertices alone: edges are measured as chords, their geodesics bounded above */
	geo_decode_one(fcinfo, geodetic, true, 0, &gc);
	if (isnan(tol) || tol < 0)
		ereport(ERROR,
				(errcode(ERRCODE_INVALID_PARAMETER_VALUE),
				 errmsg("tolerance must be a non-negative number"),
				 errdetail("Argument 2 is %s.", isnan(tol) ? "NaN" : "negative")));
	if (!geodetic)
	{
		copy = simplify_within(&gc.p, tol, &count);
		return geo_vertices_datum(fcinfo, &gc, copy, count);
	}
	copy = simplify_geodesic(&gc.p, geo_engine_epsilon(&gc, tol), &count);
	copy = keep_antipodal_spans(&gc, copy, &count);
	return geo_vertices_datum(fcinfo, &gc, copy, count);
}

/*
 * frechet_track_piece(track, pos_from, pos_to): the track between two
 * positions (k + t, 1-based), with its Z and M interpolated at the ends;
 * a Point when the two are equal.
 */
static Datum
track_piece(FunctionCallInfo fcinfo, bool geodetic)
{
	geo_curves	gc;
	double		from = PG_GETARG_FLOAT8(1),
				to = PG_GETARG_FLOAT8(2);

	geo_decode_one(fcinfo, geodetic, false, GEO_EDGES_A, &gc);
	glue_check_piece(from, to, gc.a.n);
	geo_check_times(&gc, 0);
	if (from == to)
		return geo_point_datum(fcinfo, &gc, 0, from - 1);
	return geo_subline_datum(fcinfo, &gc, 0, from - 1, to - 1);
}

/*
 * frechet_geojson_times(track, argno): the M (time) of each vertex for the
 * GeoJSON functions, checked as time in the words of an ERROR that names
 * argument argno of the caller; NULL when the track has no M.
 */
static Datum
geojson_times(FunctionCallInfo fcinfo, bool geodetic)
{
	geo_curves	gc;
	track_report rep = {.argno = PG_GETARG_INT32(1)};
	Datum	   *elems;

	geo_decode_one(fcinfo, geodetic, false, 0, &gc);
	if (gc.a.m == NULL)
		PG_RETURN_NULL();
	ewkb_check_times(&gc.a, &rep);
	elems = palloc(sizeof(Datum) * gc.a.n);
	for (size_t k = 0; k < gc.a.n; k++)
		elems[k] = Float8GetDatum(gc.a.m[k]);
	PG_RETURN_ARRAYTYPE_P(construct_array(elems, (int) gc.a.n, FLOAT8OID, sizeof(float8),
										  FLOAT8PASSBYVAL, TYPALIGN_DOUBLE));
}

#define GEO_PAIR(sqlname, impl) \
PG_FUNCTION_INFO_V1(sqlname##_geometry); \
Datum sqlname##_geometry(PG_FUNCTION_ARGS) { return impl(fcinfo, false); } \
PG_FUNCTION_INFO_V1(sqlname##_geography); \
Datum sqlname##_geography(PG_FUNCTION_ARGS) { return impl(fcinfo, true); }

/* The SQL-callable pairs: geometry (planar) and geography (metres on WGS84). */
GEO_PAIR(frechet_matching, matching_rows)
GEO_PAIR(frechet_matching_leashes, matching_leashes)
GEO_PAIR(frechet_bottleneck, bottleneck_row)
GEO_PAIR(frechet_partial_distance, partial_distance)
GEO_PAIR(frechet_partial_match, partial_match_row)
GEO_PAIR(frechet_excursions, excursion_rows)
GEO_PAIR(frechet_simplify, simplify_line)
GEO_PAIR(frechet_track_piece, track_piece)
GEO_PAIR(frechet_geojson_times, geojson_times)
