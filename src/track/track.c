/*
 * track.c - the one glue path: SQL values of every track type into
 * glue_track, through the type's codec, and results back.
 */
#include "postgres.h"

#include "catalog/pg_type.h"
#include "utils/syscache.h"
#include "utils/lsyscache.h"

#include "track.h"
#include "points.h"
#include "postgis.h"

/* The PostGIS look-ups of a call site for a PostGIS type; NULL for other types. */
postgis_calls *
track_calls(FunctionCallInfo fcinfo, track_type type)
{
	return track_type_postgis(type) ? geo_calls_for(fcinfo) : NULL;
}

/* Stage one: the value as given (the codec validates it). */
static bool
decode_input(postgis_calls *calls, Datum value, track_type type, track_report *rep,
			 glue_track *out)
{
	if (type == TRACK_POINTS)
		return points_decode(value, rep, out);
	memset(out, 0, sizeof(glue_track));
	out->type = type;
	return postgis_decode_input(calls, value, type, rep, &out->in);
}

/* Stage two: the engine's curve (lon/lat to Earth-centred metres). */
static bool
decode_engine(glue_track *t, int flags, track_report *rep)
{
	if (t->type == TRACK_POINTS)
		return true;
	return postgis_engine_curve(t, (flags & TRACK_GEODESIC) != 0, rep);
}

/* One value as a track; a bad one goes to rep (false). */
bool
track_decode_value(postgis_calls *calls, Datum value, track_type type, int flags,
				   track_report *rep, glue_track *out)
{
	if (!decode_input(calls, value, type, rep, out))
		return false;
	/* frechet_track_check also answers for the functions that read M as time */
	if ((flags & TRACK_TIMES) && rep->check && !track_input_check_times(&out->in, rep))
		return false;
	if (!decode_engine(out, flags, rep))
		return false;
	/* the vertex a later problem names is no longer the input's */
	if (out->type != TRACK_POINTS)
		rep->start = NULL;
	return true;
}

/* Argument argidx (0-based) of a call as a track; a bad one raises an ERROR naming it. */
void
track_decode_arg(FunctionCallInfo fcinfo, int argidx, track_type type, int flags, glue_track *out)
{
	track_report rep = {.argno = argidx + 1};

	decode_input(track_calls(fcinfo, type), PG_GETARG_DATUM(argidx), type, &rep, out);
	if ((flags & TRACK_MEASURES) && type == TRACK_GEOMETRY)
		postgis_note_degrees(fcinfo, out->in.srid);
	decode_engine(out, flags, &rep);
}

/*
 * Arguments 0 and 1 as two tracks of one call: both decoded, checked
 * together, then made the engine's curves.  A planar geometry call in
 * degrees gets its NOTICE.
 */
void
track_decode_pair(FunctionCallInfo fcinfo, track_type type, int flags_a, int flags_b,
				  glue_track *a, glue_track *b)
{
	postgis_calls *calls = track_calls(fcinfo, type);
	track_report rep_a = {.argno = 1},
				rep_b = {.argno = 2};

	decode_input(calls, PG_GETARG_DATUM(0), type, &rep_a, a);
	decode_input(calls, PG_GETARG_DATUM(1), type, &rep_b, b);
	if (type != TRACK_POINTS)
		postgis_check_pair(&a->in, &b->in, track_type_earth(type));
	if (type == TRACK_GEOMETRY)
		postgis_note_degrees(fcinfo, a->in.srid);
	decode_engine(a, flags_a, &rep_a);
	decode_engine(b, flags_b, &rep_b);
}

/* Frees what decoding allocated (nothing for point[], whose points are used in place). */
void
track_free(glue_track *t)
{
	if (t->type == TRACK_POINTS)
		return;
	if (t->curve.coords != NULL && t->curve.coords != t->in.coords)
		pfree((void *) t->curve.coords);
	if (t->in.coords != NULL)
		pfree(t->in.coords);
	if (t->in.m != NULL)
		pfree(t->in.m);
	if (t->first != NULL)
		pfree(t->first);
	t->curve.coords = NULL;
	t->in.coords = t->in.m = NULL;
	t->first = NULL;
}

/* The point at input position pos (0-based k + t). */
Datum
track_point_datum(FunctionCallInfo fcinfo, const glue_track *t, double pos)
{
	if (t->type == TRACK_POINTS)
		return points_point_datum(t, pos);
	return postgis_point_datum(fcinfo, t, pos);
}

/* The track between input positions from <= to: a point[], or a LineString (two points when equal). */
Datum
track_subline_datum(FunctionCallInfo fcinfo, const glue_track *t, double from, double to)
{
	if (t->type == TRACK_POINTS)
		return points_piece_datum(t, from, to);
	return postgis_subline_datum(fcinfo, t, from, to);
}

/* The same, as frechet_track_piece draws it: a PostGIS Point when from = to. */
Datum
track_piece_datum(FunctionCallInfo fcinfo, const glue_track *t, double from, double to)
{
	if (t->type != TRACK_POINTS && from == to)
		return postgis_point_datum(fcinfo, t, from);
	return track_subline_datum(fcinfo, t, from, to);
}

/* The given vertices (0-based indices) as a track of the same kind. */
Datum
track_vertices_datum(FunctionCallInfo fcinfo, const glue_track *t, const size_t *keep, size_t count)
{
	if (t->type == TRACK_POINTS)
		return points_vertices_datum(t, keep, count);
	return postgis_vertices_datum(fcinfo, t, keep, count);
}

/* The leashes of a matching as a MultiLineString (PostGIS types only). */
Datum
track_leashes_datum(FunctionCallInfo fcinfo, const glue_track *a, const glue_track *b,
					const fr_match_pt *pts, size_t count)
{
	if (a->type == TRACK_POINTS)
		elog(ERROR, "leashes are drawn for PostGIS types only");
	return postgis_leashes_datum(fcinfo, a, b, pts, count);
}
