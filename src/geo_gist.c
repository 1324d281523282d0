/*
 * geo_gist.c - the GiST operator classes frechet_geometry_ops and
 * frechet_geography_ops: the index of frechet_track_ops (src/gist.c) on
 * PostGIS columns.  Each stored curve is summarised by the same frechet_key
 * (first vertex, last vertex, bounding box of x and y); union, penalty,
 * picksplit, same and the range-query consistent function are those of
 * gist.c.  What differs is decoding: compress turns the geometry into EWKB
 * through PostGIS's ST_AsEWKB (no PostGIS headers, no PostGIS link) and
 * decodes it with ewkb.c; geography becomes Earth-centred (ECEF) metres
 * first, and its keys summarise ECEF x and y.
 *
 * Why x and y alone give lower bounds: dropping coordinates never lengthens
 * a leash, so the Fréchet distance of the x,y shadows is at most that of
 * the curves (for geography, of the ECEF chord polylines; the metres of a
 * chord grow with its length).  Z reaches the engine's rounding, though, so
 * a 3-D curve's key is widened by the slack of its largest |z| (the same
 * 1e-12 of the magnitude that fr_bound_loosen takes for x and y).
 */
#include "postgres.h"

#include <math.h>

#include "access/gist.h"
#include "access/stratnum.h"
#include "utils/memutils.h"

#include "glue.h"
#include "index.h"
#include "ewkb.h"
#include "geo_glue.h"
#include "geodesy.h"

/* Largest |z| of a 3-D curve; 0 for a 2-D one. */
static double
curve_z_magnitude(const fr_curve *c)
{
	double		m = 0.0;

	if (c->dim < 3)
		return 0.0;
	for (size_t i = 0; i < c->n; i++)
		m = Max(m, fabs(c->coords[i * c->dim + 2]));
	return m;
}

/* The summary of an engine curve: x and y, widened by the rounding slack of its z. */
static void
geo_key_of_curve(const fr_curve *c, fr_key *key)
{
	double		widen;

	fr_key_of_curve(c, key);
	if (c->dim < 3)
		return;
	widen = fr_bound_slack(0.0, curve_z_magnitude(c));
	for (int i = 0; i < FR_KEY_NDIM; i++)
	{
		key->lo[i] -= widen;
		key->hi[i] += widen;
	}
}

/*
 * The summary of a stored value.  Values the functions would reject (not a
 * Point or LineString, empty, NaN, lon/lat out of range) get the key that
 * covers everything: the index returns them and the exact call raises its
 * error, as without the index.
 */
static void
stored_key(postgis_calls *calls, Datum g, bool geodetic, fr_key *key)
{
	bytea	   *ewkb = geo_datum_ewkb(calls, g, geodetic);
	ewkb_curve	c;
	fr_curve	fc;
	double	   *xyz = NULL;

	if (!ewkb_decode_quiet((const uint8 *) VARDATA_ANY(ewkb), VARSIZE_ANY_EXHDR(ewkb), &c))
	{
		fr_key_everything(key);
		pfree(ewkb);
		return;
	}
	pfree(ewkb);
	fc.n = c.n;
	fc.coords = c.coords;
	fc.dim = c.dim;
	if (geodetic)
	{
		xyz = palloc(sizeof(double) * 3 * c.n);
		for (size_t i = 0; i < c.n; i++)
		{
			double		lon = c.coords[i * c.dim],
						lat = c.coords[i * c.dim + 1];

			if (!fr_geo_valid(lon, lat))
			{
				fr_key_everything(key);
				pfree(xyz);
				pfree(c.coords);
				return;
			}
			fr_geo_to_ecef(lon, lat, xyz + 3 * i);
		}
		fc.coords = xyz;
		fc.dim = 3;
	}
	geo_key_of_curve(&fc, key);
	frechet_key_set_kind(key, geodetic ? FRECHET_KEY_EARTH : FRECHET_KEY_PLANAR);
	if (xyz != NULL)
		pfree(xyz);
	pfree(c.coords);
}

/* The PostGIS look-ups of a call site whose fn_extra holds nothing else. */
static postgis_calls *
calls_in_fn_extra(FunctionCallInfo fcinfo)
{
	if (fcinfo->flinfo->fn_extra == NULL)
		fcinfo->flinfo->fn_extra = geo_postgis_calls_new(fcinfo->flinfo->fn_mcxt);
	return (postgis_calls *) fcinfo->flinfo->fn_extra;
}

/* GiST compress: leaf entries become the summary of their curve. */
static Datum
geo_gist_compress(FunctionCallInfo fcinfo, bool geodetic)
{
	GISTENTRY  *entry = (GISTENTRY *) PG_GETARG_POINTER(0);
	GISTENTRY  *out;
	fr_key	   *key;

	if (!entry->leafkey)
		PG_RETURN_POINTER(entry);
	key = palloc(sizeof(fr_key));
	stored_key(calls_in_fn_extra(fcinfo), entry->key, geodetic, key);
	out = palloc(sizeof(GISTENTRY));
	gistentryinit(*out, PointerGetDatum(key), entry->rel, entry->page, entry->offset, false);
	PG_RETURN_POINTER(out);
}

PG_FUNCTION_INFO_V1(frechet_gist_compress_geometry);
/* GiST compress of frechet_geometry_ops. */
Datum
frechet_gist_compress_geometry(PG_FUNCTION_ARGS)
{
	return geo_gist_compress(fcinfo, false);
}

PG_FUNCTION_INFO_V1(frechet_gist_compress_geography);
/* GiST compress of frechet_geography_ops. */
Datum
frechet_gist_compress_geography(PG_FUNCTION_ARGS)
{
	return geo_gist_compress(fcinfo, true);
}

/*
 * The query route of a k-nearest scan, decoded once: its summary and the
 * convex hull of its x,y.  Kept in fn_extra and reused while the query
 * value has the same bytes.
 */
typedef struct geo_route_cache
{
	postgis_calls *calls;
	Size		rawlen;
	char	   *raw;			/* the query datum's bytes, as passed */
	fr_key		key;
	double	   *hull;
	size_t		nhull;
} geo_route_cache;

/* The decoded query route, from the cache when its bytes are unchanged. */
static geo_route_cache *
geo_route_get(FunctionCallInfo fcinfo, Datum query, bool geodetic)
{
	geo_route_cache *rc = (geo_route_cache *) fcinfo->flinfo->fn_extra;
	struct varlena *raw = (struct varlena *) DatumGetPointer(query);
	Size		rawlen = VARSIZE_ANY(raw);
	bool		cacheable = !VARATT_IS_EXTERNAL_EXPANDED(raw);
	MemoryContext old;
	fr_curve	c;
	double	   *sorted;

	if (rc != NULL && cacheable && rc->raw != NULL &&
		rc->rawlen == rawlen && memcmp(rc->raw, raw, rawlen) == 0)
		return rc;
	if (rc == NULL)
	{
		rc = MemoryContextAllocZero(fcinfo->flinfo->fn_mcxt, sizeof(geo_route_cache));
		rc->calls = geo_postgis_calls_new(fcinfo->flinfo->fn_mcxt);
		fcinfo->flinfo->fn_extra = rc;
	}
	if (rc->raw != NULL)
		pfree(rc->raw);
	if (rc->hull != NULL)
		pfree(rc->hull);
	rc->raw = NULL;
	rc->hull = NULL;

	/* the route is the right operand of track <~> route: argument 2 */
	geo_datum_curve(rc->calls, query, geodetic, 2, &c);
	geo_key_of_curve(&c, &rc->key);
	old = MemoryContextSwitchTo(fcinfo->flinfo->fn_mcxt);
	sorted = palloc(2 * c.n * sizeof(double));
	rc->hull = palloc(4 * c.n * sizeof(double));
	rc->nhull = fr_convex_hull(&c, sorted, rc->hull);
	pfree(sorted);
	if (cacheable)
	{
		rc->raw = palloc(rawlen);
		memcpy(rc->raw, raw, rawlen);
		rc->rawlen = rawlen;
	}
	MemoryContextSwitchTo(old);
	pfree((void *) c.coords);
	return rc;
}

/*
 * GiST distance: a lower bound of the Fréchet distance from the query route
 * to every curve under the entry (metres for geography); the executor
 * rechecks leaves with <~> and reorders.
 */
static Datum
geo_gist_distance(FunctionCallInfo fcinfo, bool geodetic)
{
	GISTENTRY  *entry = (GISTENTRY *) PG_GETARG_POINTER(0);
	StrategyNumber strategy = (StrategyNumber) PG_GETARG_UINT16(2);
	bool	   *recheck = (bool *) PG_GETARG_POINTER(4);
	geo_route_cache *rc;
	double		d;

	if (strategy != FRECHET_STRATEGY_DISTANCE)
		elog(ERROR, "%s: unknown ordering strategy number %d",
			 geodetic ? "frechet_geography_ops" : "frechet_geometry_ops", strategy);
	rc = geo_route_get(fcinfo, PG_GETARG_DATUM(1), geodetic);
	*recheck = true;
	d = fr_key_hull_bound(DatumGetFrechetKey(entry->key), &rc->key, rc->hull, rc->nhull);
	/* metres grow with the chord, so a lower bound of the chord gives one of the metres */
	PG_RETURN_FLOAT8(geodetic ? fr_chord_to_metres(d) : d);
}

PG_FUNCTION_INFO_V1(frechet_gist_distance_geometry);
/* GiST distance of frechet_geometry_ops, in the units of the SRID. */
Datum
frechet_gist_distance_geometry(PG_FUNCTION_ARGS)
{
	return geo_gist_distance(fcinfo, false);
}

PG_FUNCTION_INFO_V1(frechet_gist_distance_geography);
/* GiST distance of frechet_geography_ops, in metres. */
Datum
frechet_gist_distance_geography(PG_FUNCTION_ARGS)
{
	return geo_gist_distance(fcinfo, true);
}

/* The summary of curve argument argno (1-based) of a call, raising the functions' errors. */
static void
argument_key(FunctionCallInfo fcinfo, int argno, bool geodetic, fr_key *key)
{
	fr_curve	c;

	geo_datum_curve(calls_in_fn_extra(fcinfo), PG_GETARG_DATUM(argno - 1), geodetic, argno, &c);
	geo_key_of_curve(&c, key);
	frechet_key_set_kind(key, geodetic ? FRECHET_KEY_EARTH : FRECHET_KEY_PLANAR);
	pfree((void *) c.coords);
}

PG_FUNCTION_INFO_V1(frechet_track_key_geometry);
/* frechet_track_key(geometry): the summary frechet_geometry_ops stores. */
Datum
frechet_track_key_geometry(PG_FUNCTION_ARGS)
{
	fr_key	   *key = palloc(sizeof(fr_key));

	argument_key(fcinfo, 1, false, key);
	PG_RETURN_POINTER(key);
}

PG_FUNCTION_INFO_V1(frechet_track_key_geography);
/* frechet_track_key(geography): the summary frechet_geography_ops stores (ECEF metres). */
Datum
frechet_track_key_geography(PG_FUNCTION_ARGS)
{
	fr_key	   *key = palloc(sizeof(fr_key));

	argument_key(fcinfo, 1, true, key);
	PG_RETURN_POINTER(key);
}

/* frechet_reach(route, epsilon): the route's summary with its reach (a chord for geography). */
static Datum
geo_reach(FunctionCallInfo fcinfo, bool geodetic)
{
	double		eps = PG_GETARG_FLOAT8(1);
	fr_key	   *key = palloc(sizeof(fr_key));

	argument_key(fcinfo, 1, geodetic, key);
	glue_check_epsilon(eps, 2);
	key->reach = geodetic ? fr_metres_to_chord(eps) : eps;
	frechet_key_set_kind(key, geodetic ? FRECHET_KEY_EARTH : FRECHET_KEY_PLANAR);
	PG_RETURN_POINTER(key);
}

PG_FUNCTION_INFO_V1(frechet_reach_geometry);
/* frechet_reach(geometry, float8). */
Datum
frechet_reach_geometry(PG_FUNCTION_ARGS)
{
	return geo_reach(fcinfo, false);
}

PG_FUNCTION_INFO_V1(frechet_reach_geography);
/* frechet_reach(geography, float8): epsilon in metres. */
Datum
frechet_reach_geography(PG_FUNCTION_ARGS)
{
	return geo_reach(fcinfo, true);
}

/* The test behind &~ on curve argument argno: its summary within the reach of the route's. */
static bool
geo_within_reach(FunctionCallInfo fcinfo, int argno, bool geodetic, const fr_key *reach)
{
	fr_key		key;

	frechet_key_check_kind(reach, geodetic ? FRECHET_KEY_EARTH : FRECHET_KEY_PLANAR, argno);
	argument_key(fcinfo, argno, geodetic, &key);
	return fr_key_bound(&key, reach) <= frechet_key_reach(reach);
}

PG_FUNCTION_INFO_V1(frechet_within_reach_geometry);
/* geometry &~ frechet_key */
Datum
frechet_within_reach_geometry(PG_FUNCTION_ARGS)
{
	PG_RETURN_BOOL(geo_within_reach(fcinfo, 1, false, PG_GETARG_FRECHET_KEY(1)));
}

PG_FUNCTION_INFO_V1(frechet_reach_within_geometry);
/* frechet_key &~ geometry */
Datum
frechet_reach_within_geometry(PG_FUNCTION_ARGS)
{
	PG_RETURN_BOOL(geo_within_reach(fcinfo, 2, false, PG_GETARG_FRECHET_KEY(0)));
}

PG_FUNCTION_INFO_V1(frechet_within_reach_geography);
/* geography &~ frechet_key */
Datum
frechet_within_reach_geography(PG_FUNCTION_ARGS)
{
	PG_RETURN_BOOL(geo_within_reach(fcinfo, 1, true, PG_GETARG_FRECHET_KEY(1)));
}

PG_FUNCTION_INFO_V1(frechet_reach_within_geography);
/* frechet_key &~ geography */
Datum
frechet_reach_within_geography(PG_FUNCTION_ARGS)
{
	PG_RETURN_BOOL(geo_within_reach(fcinfo, 2, true, PG_GETARG_FRECHET_KEY(0)));
}
