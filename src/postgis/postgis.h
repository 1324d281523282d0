/*
 * postgis.h - the PostGIS codec: geometry, geography and EWKB values as
 * tracks, and geometry or geography results.  Calls only the glue base and
 * the engine (with geodesy.c); never PostGIS headers or PostGIS's library,
 * only PostGIS's SQL functions through the function manager.
 */
#ifndef FRECHET_POSTGIS_H
#define FRECHET_POSTGIS_H

#include "postgres.h"
#include "fmgr.h"
#include "nodes/supportnodes.h"

#include "frechet.h"
#include "glue.h"
#include "ewkb.h"

/* PostGIS's own functions, looked up in the schema of the postgis extension. */
typedef struct postgis_calls postgis_calls;

/* postgis.c: finding PostGIS, decoding. */
postgis_calls *geo_postgis_calls_new(MemoryContext mcxt);
postgis_calls *geo_calls_for(FunctionCallInfo fcinfo);
Oid			postgis_namespace(void);
Oid			postgis_type(Oid nsp, const char *name);
Oid			postgis_schema_function(Oid nsp, const char *name, int nargs, Oid *argtypes);

/*
 * A geometry, geography or EWKB value as given (stage one of decoding): a
 * bad one goes to rep (false).  calls may be NULL for EWKB (bytea) values.
 */
bool		postgis_decode_input(postgis_calls *calls, Datum value, track_type type,
								 track_report *rep, track_input *in);

/*
 * The engine's curve of a decoded value (stage two): planar input as it
 * is; lon/lat as Earth-centred metres, edges cut along their geodesics
 * when geodesic.  A longitude or latitude out of range goes to rep.
 */
bool		postgis_engine_curve(glue_track *t, bool geodesic, track_report *rep);

/* Two decoded inputs of one call: same SRID, and for planar ones the same dimension. */
void		postgis_check_pair(const track_input *a, const track_input *b, bool earth);

/* A NOTICE, once per call site and SRID, when a planar function gets degrees. */
void		postgis_note_degrees(FunctionCallInfo fcinfo, int32 srid);

/* ewkb_out.c: results as geometry (or geography for a geography track), with SRID, Z and M. */
Datum		postgis_point_datum(FunctionCallInfo fcinfo, const glue_track *t, double pos);
Datum		postgis_subline_datum(FunctionCallInfo fcinfo, const glue_track *t,
								  double from, double to);
Datum		postgis_vertices_datum(FunctionCallInfo fcinfo, const glue_track *t,
								   const size_t *keep, size_t count);
Datum		postgis_leashes_datum(FunctionCallInfo fcinfo, const glue_track *a,
								  const glue_track *b, const fr_match_pt *pts, size_t count);
bool		postgis_lonlat_antipodal(const double *a, const double *b);

/* A geometry (or, when geography, a geography) made by PostGIS from EWKB (postgis.c). */
Datum		postgis_from_ewkb(FunctionCallInfo fcinfo, bytea *ewkb, bool geography);

/*
 * box_strategies.c: what PostGIS's own index machinery needs of our
 * operator classes.  GiST consistent for PostGIS's box operators, and the
 * index condition of frechet_at_most on an index of PostGIS's own class.
 */
struct fr_key;
Datum		postgis_box_consistent(FunctionCallInfo fcinfo, const struct fr_key *key);
List	   *postgis_box_index_condition(SupportRequestIndexCondition *req, Node *key,
										Node *other, Node *eps);

#endif							/* FRECHET_POSTGIS_H */
