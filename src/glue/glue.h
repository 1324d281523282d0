/*
 * glue.h - the base of the glue (src/glue): what every layer above the
 * engine shares.  The engine environment and its limits, how a bad track
 * is reported, set-returning results, and the decoded track itself
 * (glue_track), which the codecs of src/pg and src/postgis fill and the
 * track layer (src/track) hands to the SQL functions and the index.
 * Nothing here knows a SQL type of tracks.
 */
#ifndef FRECHET_GLUE_H
#define FRECHET_GLUE_H

#include "postgres.h"
#include "fmgr.h"
#include "nodes/nodes.h"

#include "frechet.h"

/* Limit on the scratch memory of one call, in kB (frechet_ext.max_memory). */
extern int	frechet_max_memory_kb;

/* A scratch memory context and the engine environment that allocates in it. */
typedef struct glue_env
{
	MemoryContext cxt;
	fr_env		env;
} glue_env;

/* Creates scratch memory for one call after checking the limit; see module.c. */
void		glue_env_begin(glue_env *g, size_t scratch_bytes, const char *what);
void		glue_env_end(glue_env *g);

/* Turns a non-OK engine status into an ERROR. */
void		glue_check_status(fr_status st, const char *what);

/* Validates a tolerance argument (1-based argno): not NaN, not negative. */
void		glue_check_epsilon(double eps, int argno);

/* Validates a simplification tolerance (argument 2): not NaN, not negative. */
void		glue_check_tolerance(double tol);

/*
 * Where the problems of one track argument go (track_report.c): an ERROR
 * naming argument argno, or with check set the first problem's text (for
 * frechet_track_check).  start, dim and n describe the track once known.
 */
typedef struct track_report
{
	int			argno;
	bool		check;
	char	   *problem;		/* check mode: "message: what", palloc'd */
	int			sqlstate;		/* check mode: the SQLSTATE the ERROR would have */
	const double *start;
	int			dim;
	size_t		n;
} track_report;

/* A track's problem, raised or recorded; returns false.  See track_report.c. */
bool		track_problem(track_report *rep, int sqlstate, const char *hint, const char *msg,
						  const char *what,...) pg_attribute_printf(5, 6);

/* A set-returning call's tuple store and descriptor, nothing else left per call (srf.c). */
void		glue_srf_materialize(FunctionCallInfo fcinfo);

/*
 * The bytes of a query value kept across calls of one call site (srf.c),
 * so that a cache in fn_extra is reused while the value is unchanged.
 */
typedef struct glue_bytes
{
	Size		len;
	char	   *raw;			/* NULL: nothing kept */
} glue_bytes;

/* Does value have the kept bytes? */
bool		glue_bytes_same(const glue_bytes *kept, Datum value);

/* Forgets the kept bytes (before decoding a new value, which may fail). */
void		glue_bytes_forget(glue_bytes *kept);

/* Keeps a copy of value's bytes in mcxt (none for an expanded value, which may change in place). */
void		glue_bytes_keep(glue_bytes *kept, Datum value, MemoryContext mcxt);

/* How a SQL value holds a track. */
typedef enum track_type
{
	TRACK_POINTS,				/* point[]: planar x, y */
	TRACK_GEOMETRY,				/* PostGIS geometry: planar, units of the SRID */
	TRACK_GEOGRAPHY,			/* PostGIS geography: lon/lat on WGS84, metres */
	TRACK_EWKB_PLANAR,			/* EWKB bytea read as planar (the *_ewkb functions) */
	TRACK_EWKB_EARTH			/* EWKB bytea read as lon/lat, metres */
} track_type;

/* Are the type's coordinates lon/lat, measured in metres on WGS84? */
static inline bool
track_type_earth(track_type type)
{
	return type == TRACK_GEOGRAPHY || type == TRACK_EWKB_EARTH;
}

/* Is the type a PostGIS one, whose values reach us through PostGIS's functions? */
static inline bool
track_type_postgis(track_type type)
{
	return type == TRACK_GEOMETRY || type == TRACK_GEOGRAPHY;
}

/*
 * A track as given: n vertices of dim (2 or 3) coordinates X Y [Z], with
 * M values apart in m (NULL without M), and the SRID (0 for point[]).
 * Geography is in degrees here.  The EWKB decoder (src/postgis/ewkb.c)
 * fills it; for point[] it points into the array.
 */
typedef struct track_input
{
	double	   *coords;
	double	   *m;
	size_t		n;
	int			dim;
	bool		has_m;
	bool		has_srid;
	int32		srid;
} track_input;

/*
 * A decoded track: as given and as the engine sees it.  For planar types
 * the engine's curve is the input's coordinates; for lon/lat it is
 * Earth-centred metres, with long edges cut along their geodesics, and
 * first (NULL when no edge was cut) holds the engine vertex of each input
 * vertex.
 */
typedef struct glue_track
{
	track_type	type;
	track_input in;
	fr_curve	curve;
	size_t	   *first;
} glue_track;

/* Positions (0-based k + t): engine to input and back (track_units.c). */
double		track_pos_in(const glue_track *t, double pos);
double		track_pos_engine(const glue_track *t, double pos);

/* A distance from the engine in the type's units (metres for lon/lat), and back. */
double		track_out_distance(track_type type, double d);
double		track_engine_epsilon(track_type type, double eps);

/* M read as time: finite and non-decreasing (track_units.c); a fault goes to rep. */
bool		track_input_check_times(const track_input *c, track_report *rep);

/* The same, raising an ERROR that names argument argno; nothing to check without M. */
void		track_check_times(const glue_track *t, int argno);

/* The time (M) at input position pos, as a float8 Datum; *isnull without M. */
Datum		track_time_datum(const glue_track *t, double pos, bool *isnull);

/* One per-vertex value (stride apart) at position pos, linear in t, held at the ends. */
double		track_value_at(const double *v, size_t stride, size_t n, double pos);

#endif							/* FRECHET_GLUE_H */
