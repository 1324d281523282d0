/*
 * track.h - the one glue path between SQL values and the engine.  Every
 * SQL function and the index decode their track arguments here, whatever
 * the SQL type (point[], geometry, geography, EWKB), into a glue_track
 * (glue.h), and turn positions back into point or geometry values here.
 * This layer only dispatches: each type's decoding lives once, in its
 * codec (src/pg for point[], src/postgis for the rest).
 */
#ifndef FRECHET_TRACK_H
#define FRECHET_TRACK_H

#include "postgres.h"
#include "fmgr.h"

#include "glue.h"

struct postgis_calls;

/* Decoding options. */
#define TRACK_GEODESIC 0x1		/* lon/lat edges follow their geodesics (cut into pieces) */
#define TRACK_MEASURES 0x2		/* the function measures in the SRID's units: NOTICE for degrees */
#define TRACK_TIMES 0x4			/* check mode: M must also be time (frechet_track_check) */

/*
 * The PostGIS look-ups of a call site for a PostGIS type (kept in its
 * fn_extra, which must then be free); NULL for other types.
 */
struct postgis_calls *track_calls(FunctionCallInfo fcinfo, track_type type);

/*
 * One value as a track; a bad one goes to rep (false).  calls: from
 * track_calls, or a caller's own for PostGIS types.
 */
bool		track_decode_value(struct postgis_calls *calls, Datum value, track_type type, int flags,
							   track_report *rep, glue_track *out);

/* Argument argidx (0-based) of a call as a track; a bad one raises an ERROR naming it. */
void		track_decode_arg(FunctionCallInfo fcinfo, int argidx, track_type type, int flags,
							 glue_track *out);

/*
 * Arguments 0 and 1 as two tracks of one call: both decoded, then checked
 * together (same SRID; planar ones of the same dimension), then made the
 * engine's curves; flags_a and flags_b say which get geodesic edges.
 */
void		track_decode_pair(FunctionCallInfo fcinfo, track_type type, int flags_a, int flags_b,
							  glue_track *a, glue_track *b);

/* The two curves of a call, both with geography edges along their geodesics. */
static inline void
track_decode_both(FunctionCallInfo fcinfo, track_type type, glue_track *a, glue_track *b)
{
	track_decode_pair(fcinfo, type, TRACK_GEODESIC, TRACK_GEODESIC, a, b);
}

/* Frees what decoding allocated (nothing for point[], whose points are used in place). */
void		track_free(glue_track *t);

/* Results, as the track's own kind of value: point, or geometry / geography. */
Datum		track_point_datum(FunctionCallInfo fcinfo, const glue_track *t, double pos);
Datum		track_subline_datum(FunctionCallInfo fcinfo, const glue_track *t, double from, double to);
Datum		track_piece_datum(FunctionCallInfo fcinfo, const glue_track *t, double from, double to);
Datum		track_vertices_datum(FunctionCallInfo fcinfo, const glue_track *t,
								 const size_t *keep, size_t count);
Datum		track_leashes_datum(FunctionCallInfo fcinfo, const glue_track *a, const glue_track *b,
								const fr_match_pt *pts, size_t count);

/*
 * The SQL-callable functions of one implementation impl(fcinfo, type), one
 * for each SQL type: sqlname_point_array, sqlname_geometry and
 * sqlname_geography (the point[] ones belong to frechet_ext, the others to
 * frechet_ext_postgis; one library holds both).
 */
#define TRACK_FUNCTIONS_POSTGIS(sqlname, impl) \
PG_FUNCTION_INFO_V1(sqlname##_geometry); \
Datum sqlname##_geometry(PG_FUNCTION_ARGS) { return impl(fcinfo, TRACK_GEOMETRY); } \
PG_FUNCTION_INFO_V1(sqlname##_geography); \
Datum sqlname##_geography(PG_FUNCTION_ARGS) { return impl(fcinfo, TRACK_GEOGRAPHY); }

#define TRACK_FUNCTIONS(sqlname, impl) \
PG_FUNCTION_INFO_V1(sqlname##_point_array); \
Datum sqlname##_point_array(PG_FUNCTION_ARGS) { return impl(fcinfo, TRACK_POINTS); } \
TRACK_FUNCTIONS_POSTGIS(sqlname, impl)

#endif							/* FRECHET_TRACK_H */
