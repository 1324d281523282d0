/*
 * index.h - the index layer (src/index), one for every track type: the
 * frechet_key SQL type, the strategy numbers of the GiST operator classes,
 * and the summaries of tracks decoded by the track layer (src/track).
 */
#ifndef FRECHET_INDEX_H
#define FRECHET_INDEX_H

#include "postgres.h"

#include <math.h>

#include "fmgr.h"
#include "access/stratnum.h"
#include "utils/array.h"

#include "bounds.h"
#include "glue.h"
#include "track.h"

/* Strategy of "track |~~| frechet_reach(route, epsilon)": the range-query condition. */
#define FRECHET_STRATEGY_REACH 1
/* Strategy of "track <-> route" in ORDER BY: k-nearest tracks. */
#define FRECHET_STRATEGY_DISTANCE 15
/*
 * Strategy of "track |~~~| frechet_reach(route, epsilon)": the range-query
 * condition of frechet_pings_at_most (fr_key_ping_bound).  Numbered far
 * from the R-tree numbers PostGIS's planner support asks of every GiST
 * index on a column (see below), so no box strategy can ever reach it.
 */
#define FRECHET_STRATEGY_PINGS 30
/*
 * Strategy of "trip |~~>| frechet_reach(stretch, epsilon)": the range-query
 * condition of frechet_passes (fr_key_passage_bound).
 */
#define FRECHET_STRATEGY_PASSES 31
/* Strategy of "trip <~~>> stretch" in ORDER BY: the nearest passages. */
#define FRECHET_STRATEGY_PASSAGE_DISTANCE 32

/*
 * The geometry and geography classes also hold PostGIS's box operators
 * under the R-tree strategy numbers PostGIS's planner support asks for
 * (access/stratnum.h): && 3, ~= 6, ~ 7, @ 8.  None is 1 or 15.
 */
#define FRECHET_IS_BOX_STRATEGY(s) \
	((s) == RTOverlapStrategyNumber || (s) == RTSameStrategyNumber || \
	 (s) == RTContainsStrategyNumber || (s) == RTContainedByStrategyNumber)

/*
 * How an index stores its keys: release 0.1's classes store fr_key as it
 * is (frechet_key, 136 bytes); 0.2's store it packed (frechet_summary,
 * fr_key_pack: 32 bytes for a track).  Each support function exists once
 * for each format, as the index's class says.
 */
typedef enum gist_key_format
{
	GIST_KEY_WIDE,
	GIST_KEY_PACKED
} gist_key_format;

/* The key an index entry holds, in the index's format (key.c). */
void		frechet_index_key_read(Datum d, gist_key_format format, fr_key *out);

/* An index entry's datum for a key, in the index's format (palloc'd). */
Datum		frechet_index_key_make(const fr_key *key, gist_key_format format);

/* frechet_key values are fr_key structs stored as they are (fixed length, by reference). */
#define DatumGetFrechetKey(d) ((fr_key *) DatumGetPointer(d))
#define PG_GETARG_FRECHET_KEY(n) DatumGetFrechetKey(PG_GETARG_DATUM(n))

/*
 * The kind of coordinates a key summarises: planar (point[], geometry) or
 * Earth-centred metres (geography).  fr_key has no spare field, and its
 * length is the frechet_key type's INTERNALLENGTH, kept in existing
 * indexes, so the kind lives in the sign bit of reach, which is never
 * negative otherwise: clear for planar, set for Earth-centred (-0.0 for a
 * reach of 0).  Keys made before the kind was recorded read as planar.
 * Read the reach through frechet_key_reach, never key->reach.
 */
typedef enum frechet_key_kind
{
	FRECHET_KEY_PLANAR = 0,
	FRECHET_KEY_EARTH = 1
} frechet_key_kind;

/* The reach (epsilon, or its chord for geography) of a key, without its kind. */
static inline double
frechet_key_reach(const fr_key *key)
{
	return fabs(key->reach);
}

/* The kind of coordinates a key summarises. */
static inline frechet_key_kind
frechet_key_kind_of(const fr_key *key)
{
	return signbit(key->reach) ? FRECHET_KEY_EARTH : FRECHET_KEY_PLANAR;
}

/* Records the kind of a key, keeping its reach. */
static inline void
frechet_key_set_kind(fr_key *key, frechet_key_kind kind)
{
	key->reach = kind == FRECHET_KEY_EARTH ? -fabs(key->reach) : fabs(key->reach);
}

/*
 * The ping bound of a track summary against a route's: geography keys
 * summarise the edges' geodesics, a box larger than the pings', so only
 * the first and last vertices bound them (fr_key_ping_bound_ends).
 */
static inline double
frechet_key_ping_bound(const fr_key *trip, const fr_key *route)
{
	return frechet_key_kind_of(route) == FRECHET_KEY_EARTH
		? fr_key_ping_bound_ends(trip, route) : fr_key_ping_bound(trip, route);
}

/*
 * Raises 22023 unless a reach key is of the kind of the curve it is tested
 * against (argno, 1-based; 0 for an index's column).
 */
void		frechet_key_check_kind(const fr_key *reach, frechet_key_kind kind, int argno);

/*
 * The summary of a stored value (keys.c).  A track the SQL functions would
 * reject (empty, NULLs, non-finite or out-of-range coordinates, lon/lat out
 * of range, ...) gets a key that covers everything, so the index returns
 * its row and the exact call raises the same error it raises without an
 * index.  calls: PostGIS look-ups for PostGIS types (NULL for point[]).
 */
void		track_stored_key(struct postgis_calls *calls, Datum value, track_type type, fr_key *key);

/* The summary of a decoded track, of its kind of coordinates (keys.c). */
void		track_key_of(const glue_track *t, fr_key *key);

/* The summary of track argument argidx (0-based) of a call, raising the functions' errors. */
void		track_argument_key(FunctionCallInfo fcinfo, int argidx, track_type type, fr_key *key);

/* The kind of coordinates of a track type's keys. */
static inline frechet_key_kind
track_key_kind(track_type type)
{
	return track_type_earth(type) ? FRECHET_KEY_EARTH : FRECHET_KEY_PLANAR;
}

/*
 * Does a stored key pass the test of range strategy REACH, PINGS or
 * PASSES with a query key (gist.c)?  Exact on leaves, necessary on nodes.
 */
bool		frechet_key_admits(const fr_key *key, const fr_key *query, StrategyNumber strategy);

/*
 * The lookup of frechet_reach(route type, float8) in the schema of the
 * function being planned, never by search_path (support.c); InvalidOid
 * when there is none.
 */
Oid			frechet_reach_function(Oid funcid, Oid routetype);

/*
 * The selectivity of a restriction clause of a range strategy's function
 * (selectivity.c): on a column with an index of our classes and constant
 * other arguments, from the index and a sample of the rows it admits;
 * false when it cannot tell (PostgreSQL's default then applies).
 */
/*
 * The plain column (a Var of a base relation of this query level, under
 * any RelabelType) that node is, or NULL (selectivity.c).
 */
struct PlannerInfo;
struct Var *frechet_plain_column(struct PlannerInfo *root, Node *node);

struct SupportRequestSelectivity;
bool		frechet_estimate_selectivity(struct SupportRequestSelectivity *req, int min_args, int max_args,
										 int indexable, StrategyNumber strategy);

/* Planner support of the deciders: a constant epsilon validated while planning (support.c). */
void		glue_check_constant_epsilon(Node *rawreq);

#endif							/* FRECHET_INDEX_H */
