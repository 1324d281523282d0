/*
 * geo_glue.h - shared pieces of the PostGIS layer: decoding geometry or
 * geography arguments into engine curves, and building geometry or
 * geography results; see geo_glue.c.
 */
#ifndef FRECHET_GEO_GLUE_H
#define FRECHET_GEO_GLUE_H

#include "postgres.h"
#include "fmgr.h"

#include "bounds.h"
#include "frechet.h"
#include "ewkb.h"

/* Both curve arguments: as decoded (lon/lat for geography) and as the engine sees them. */
typedef struct geo_curves
{
	ewkb_curve	a,
				b;
	fr_curve	p,
				q;
	bool		geodetic;
	/* geography: the engine vertex of each input vertex (NULL: the same) */
	size_t	   *first_a,
			   *first_b;
} geo_curves;

/* Which curves get geography edges along their geodesics. */
#define GEO_EDGES_A 1
#define GEO_EDGES_B 2

/* PostGIS's own functions, looked up in the schema of the postgis extension. */
typedef struct postgis_calls postgis_calls;

postgis_calls *geo_postgis_calls_new(MemoryContext mcxt);

/* The PostGIS look-ups of a call site, kept in its fn_extra (which must be free). */
postgis_calls *geo_calls_for(FunctionCallInfo fcinfo);
bytea	   *geo_datum_ewkb(postgis_calls *calls, Datum g, bool geography);
bool		geo_datum_track(postgis_calls *calls, Datum g, bool geodetic, track_report *rep,
							fr_curve *out, int32 *srid);
void		geo_datum_curve(postgis_calls *calls, Datum g, bool geodetic, int argno,
							fr_curve *out);

void		geo_decode_args(FunctionCallInfo fcinfo, bool geodetic, geo_curves *gc);
void		geo_decode_one(FunctionCallInfo fcinfo, bool geodetic, bool measures, int geodesic,
						   geo_curves *gc);
void		geo_decode_edges(FunctionCallInfo fcinfo, bool geodetic, int geodesic, geo_curves *gc);
double		geo_pos_in(const geo_curves *gc, int which, double pos);
bool		geo_lonlat_engine(const ewkb_curve *c, track_report *rep, fr_curve *out);
Datum		geo_vertices_datum(FunctionCallInfo fcinfo, const geo_curves *gc,
							   const size_t *keep, size_t count);
Datum		geo_time_datum(const geo_curves *gc, int which, double pos, bool *isnull);
void		geo_check_times(const geo_curves *gc, int which);
Datum		geo_point_datum(FunctionCallInfo fcinfo, const geo_curves *gc, int which, double pos);
Datum		geo_subline_datum(FunctionCallInfo fcinfo, const geo_curves *gc, int which,
							  double from, double to);
Datum		geo_leashes_datum(FunctionCallInfo fcinfo, const geo_curves *gc,
							  const fr_match_pt *pts, size_t count);
double		geo_result_distance(const geo_curves *gc, double d);
bool		geo_lonlat_antipodal(const double *a, const double *b);
double		geo_engine_epsilon(const geo_curves *gc, double eps);

/* The index summary of curve argument argno (1-based); see geo_gist.c. */
void		geo_argument_key(FunctionCallInfo fcinfo, int argno, bool geodetic, fr_key *key);

#endif							/* FRECHET_GEO_GLUE_H */
