/*
 * geo_gist.c - the GiST operator classes frechet_geometry_ops and
 * frechet_geography_ops: the index of frechet_track_ops (src/gist.c) on
 * PostGIS columns.  Each stored curve is summarised by the same frechet_key
 * (first vertex, last vertex, bounding box of x and y); union, penalty,
 * picksplit, same and the range-query consistent function are those of
 * gist.c.  What differs is decoding: compress turns the geometry into EWKB
 * through PostGIS's ST_AsEWKB (no PostGIS headers, no PostGIS link) and
 * decodes it with ewkb.c; geography becomes Earth-centred (ECEF) metres
 * first, and its keys summarise ECEF x and y.  The classes also answer
 * PostGIS's own box operators (&&, ~=, ~, @), which PostGIS's planner
 * support puts on any GiST index of a column it filters (see the end).
 *
 * Why x and y alone give lower bounds: dropping coordinates never lengthens
 * a leash, so the Fréchet distance of the x,y shadows is at most that of
 * the curves (for geography, of the ECEF chord polylines; the metres of a
 * chord grow with its length).  Z reaches the engine's rounding, though, so
 * a 3-D curve's key is widened by the slack of its largest |z| (the same
 * 1e-12 of the magnitude that fr_bound_loosen takes for x and y).
 */
#include "postgres.h"

#include <float.h>
#include <math.h>

#include "access/gist.h"
#include "access/htup_details.h"
#include "access/stratnum.h"
#include "catalog/pg_type.h"
#include "nodes/value.h"
#include "parser/parse_func.h"
#include "utils/float.h"
#include "utils/lsyscache.h"
#include "utils/memutils.h"
#include "utils/syscache.h"

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
		/* as the functions see it: edges along their geodesics */
		track_report rep = {.check = true};

		if (!geo_lonlat_engine(&c, &rep, &fc))
		{
			fr_key_everything(key);
			if (rep.problem)
				pfree(rep.problem);
			pfree(c.coords);
			return;
		}
		xyz = (double *) fc.coords;
	}
	geo_key_of_curve(&fc, key);
	frechet_key_set_kind(key, geodetic ? FRECHET_KEY_EARTH : FRECHET_KEY_PLANAR);
	if (xyz != NULL)
		pfree(xyz);
	pfree(c.coords);
	if (c.m)
		pfree(c.m);
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
	stored_key(geo_calls_for(fcinfo), entry->key, geodetic, key);
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

	/* the route is the right operand of track <~~> route: argument 2 */
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
 * rechecks leaves with <~~> and reorders.
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
void
geo_argument_key(FunctionCallInfo fcinfo, int argno, bool geodetic, fr_key *key)
{
	fr_curve	c;

	geo_datum_curve(geo_calls_for(fcinfo), PG_GETARG_DATUM(argno - 1), geodetic, argno, &c);
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

	geo_argument_key(fcinfo, 1, false, key);
	PG_RETURN_POINTER(key);
}

PG_FUNCTION_INFO_V1(frechet_track_key_geography);
/* frechet_track_key(geography): the summary frechet_geography_ops stores (ECEF metres). */
Datum
frechet_track_key_geography(PG_FUNCTION_ARGS)
{
	fr_key	   *key = palloc(sizeof(fr_key));

	geo_argument_key(fcinfo, 1, true, key);
	PG_RETURN_POINTER(key);
}

/* frechet_reach(route, epsilon): the route's summary with its reach (a chord for geography). */
static Datum
geo_reach(FunctionCallInfo fcinfo, bool geodetic)
{
	double		eps = PG_GETARG_FLOAT8(1);
	fr_key	   *key = palloc(sizeof(fr_key));

	geo_argument_key(fcinfo, 1, geodetic, key);
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

/* The test behind |~~| on curve argument argno: its summary within the reach of the route's. */
static bool
geo_within_reach(FunctionCallInfo fcinfo, int argno, bool geodetic, const fr_key *reach)
{
	fr_key		key;

	frechet_key_check_kind(reach, geodetic ? FRECHET_KEY_EARTH : FRECHET_KEY_PLANAR, argno);
	geo_argument_key(fcinfo, argno, geodetic, &key);
	return fr_key_bound(&key, reach) <= frechet_key_reach(reach);
}

PG_FUNCTION_INFO_V1(frechet_within_reach_geometry);
/* geometry |~~| frechet_key */
Datum
frechet_within_reach_geometry(PG_FUNCTION_ARGS)
{
	PG_RETURN_BOOL(geo_within_reach(fcinfo, 1, false, PG_GETARG_FRECHET_KEY(1)));
}

PG_FUNCTION_INFO_V1(frechet_reach_within_geometry);
/* frechet_key |~~| geometry */
Datum
frechet_reach_within_geometry(PG_FUNCTION_ARGS)
{
	PG_RETURN_BOOL(geo_within_reach(fcinfo, 2, false, PG_GETARG_FRECHET_KEY(0)));
}

PG_FUNCTION_INFO_V1(frechet_within_reach_geography);
/* geography |~~| frechet_key */
Datum
frechet_within_reach_geography(PG_FUNCTION_ARGS)
{
	PG_RETURN_BOOL(geo_within_reach(fcinfo, 1, true, PG_GETARG_FRECHET_KEY(1)));
}

PG_FUNCTION_INFO_V1(frechet_reach_within_geography);
/* frechet_key |~~| geography */
Datum
frechet_reach_within_geography(PG_FUNCTION_ARGS)
{
	PG_RETURN_BOOL(geo_within_reach(fcinfo, 2, true, PG_GETARG_FRECHET_KEY(0)));
}

/*
 * PostGIS's box operators (&&, ~=, ~, @) on our keys.
 *
 * PostGIS's planner support function turns ST_DWithin, ST_Intersects,
 * ST_Contains and the other indexable predicates into a lossy box condition
 * ("col && ST_Expand(other, r)", "col ~ other", ...) on every GiST index of
 * the column, looking the operator up in the index's operator family by its
 * strategy number; so our classes carry PostGIS's own operators, and their
 * consistent function answers them from the bounding box in our key.  Leaves
 * are always rechecked with PostGIS's operator, and the filter keeps the
 * predicate itself, so a test here only has to be necessary: it may never
 * refuse an entry under which the predicate holds for some row.
 *
 * The query's box is the one PostGIS's operators compare: PostGIS's own
 * GiST compress function makes it (its 2-D float box for geometry, its
 * geocentric box on the unit sphere for geography, in which _ST_Expand
 * widens the box without moving the vertices).  It covers the query's
 * points, rounded outward to float.  Our comparisons allow a relative
 * 1e-6 for that rounding (float carries 24 bits, 6e-8).
 */

/* A box in the x,y plane of PostGIS's box operators. */
typedef struct plane_box
{
	double		xmin,
				xmax,
				ymin,
				ymax;
} plane_box;

/* The query of a box strategy, decoded once per query value and kept in fn_extra. */
typedef struct box_query
{
	Oid			subtype;		/* geometry or geography (the operator's right type) */
	bool		geodetic;
	FmgrInfo	compress;		/* PostGIS's GiST compress of that type */
	Size		rawlen;
	char	   *raw;			/* the query datum's bytes, as passed */
	bool		known;			/* false: empty or unboxable; every entry passes */
	plane_box	box;
} box_query;

/* Finds PostGIS's GiST compress for the type (geometry or geography), in the type's schema. */
static void
box_query_init(box_query *bq, Oid subtype, MemoryContext mcxt)
{
	HeapTuple	tup = SearchSysCache1(TYPEOID, ObjectIdGetDatum(subtype));
	Form_pg_type typ;
	const char *compress;
	Oid			nsp;
	Oid			argtype = INTERNALOID;
	Oid			fn;

	if (!HeapTupleIsValid(tup))
		elog(ERROR, "cache lookup failed for type %u", subtype);
	typ = (Form_pg_type) GETSTRUCT(tup);
	nsp = typ->typnamespace;
	if (strcmp(NameStr(typ->typname), "geometry") == 0)
		bq->geodetic = false;
	else if (strcmp(NameStr(typ->typname), "geography") == 0)
		bq->geodetic = true;
	else
		elog(ERROR, "box strategies of the Fréchet operator classes need geometry or geography, not type %u",
			 subtype);
	ReleaseSysCache(tup);
	compress = bq->geodetic ? "geography_gist_compress" : "geometry_gist_compress_2d";
	fn = LookupFuncName(list_make2(makeString(get_namespace_name(nsp)), makeString(pstrdup(compress))),
						1, &argtype, false);
	fmgr_info_cxt(fn, &bq->compress, mcxt);
	bq->subtype = subtype;
}

/*
 * A box from four floats in PostGIS's order (x min, x max, y min, y max).
 * False for an empty box (NaN).  PostGIS writes +-FLT_MAX for an unbounded
 * side; it becomes infinite here.
 */
static bool
box_of_floats(const float *f, plane_box *b)
{
	double		v[4];

	for (int i = 0; i < 4; i++)
	{
		v[i] = f[i];
		if (isnan(v[i]))
			return false;
		if (v[i] >= FLT_MAX)
			v[i] = get_float8_infinity();
		else if (v[i] <= -FLT_MAX)
			v[i] = -get_float8_infinity();
	}
	b->xmin = v[0];
	b->xmax = v[1];
	b->ymin = v[2];
	b->ymax = v[3];
	return true;
}

/*
 * The box PostGIS's operators see for a query value: its GiST compress
 * function's key, a float box (geometry: x min, x max, y min, y max;
 * geography: the same pairs for geocentric x, y, z, of which we read x, y).
 */
static void
box_query_decode(box_query *bq, Datum query)
{
	GISTENTRY	in;
	GISTENTRY  *out;
	float		f[4];

	gistentryinit(in, query, NULL, NULL, 0, true);
	out = (GISTENTRY *) DatumGetPointer(FunctionCall1(&bq->compress, PointerGetDatum(&in)));
	bq->known = false;
	if (bq->geodetic)
	{
		struct varlena *gidx = (struct varlena *) DatumGetPointer(out->key);

		/* an empty or unboxable geography gets a key of no dimension */
		if (VARSIZE_ANY_EXHDR(gidx) < sizeof(f))
			return;
		memcpy(f, VARDATA_ANY(gidx), sizeof(f));
	}
	else
		memcpy(f, DatumGetPointer(out->key), sizeof(f));
	bq->known = box_of_floats(f, &bq->box);
}

/* The decoded query, from the cache when its bytes are unchanged. */
static box_query *
box_query_get(FunctionCallInfo fcinfo, Datum query, Oid subtype)
{
	box_query  *bq = (box_query *) fcinfo->flinfo->fn_extra;
	struct varlena *raw = (struct varlena *) DatumGetPointer(query);
	Size		rawlen = VARSIZE_ANY(raw);
	bool		cacheable = !VARATT_IS_EXTERNAL_EXPANDED(raw);

	if (bq != NULL && bq->subtype == subtype && cacheable && bq->raw != NULL &&
		bq->rawlen == rawlen && memcmp(bq->raw, raw, rawlen) == 0)
		return bq;
	if (bq == NULL || bq->subtype != subtype)
	{
		bq = MemoryContextAllocZero(fcinfo->flinfo->fn_mcxt, sizeof(box_query));
		box_query_init(bq, subtype, fcinfo->flinfo->fn_mcxt);
		fcinfo->flinfo->fn_extra = bq;
	}
	if (bq->raw != NULL)
		pfree(bq->raw);
	bq->raw = NULL;
	box_query_decode(bq, query);
	if (cacheable)
	{
		bq->raw = MemoryContextAlloc(fcinfo->flinfo->fn_mcxt, rawlen);
		memcpy(bq->raw, raw, rawlen);
		bq->rawlen = rawlen;
	}
	return bq;
}

/* Widens b to cover the point (x, y). */
static void
plane_box_add(plane_box *b, double x, double y)
{
	b->xmin = Min(b->xmin, x);
	b->xmax = Max(b->xmax, x);
	b->ymin = Min(b->ymin, y);
	b->ymax = Max(b->ymax, y);
}

/*
 * An interval of ECEF metres (x or y) as an interval of PostGIS's unit
 * sphere, on which a vertex is (cos lat cos lon, cos lat sin lon, sin lat)
 * with the geodetic latitude: the ECEF x and y of a vertex are those times
 * the prime vertical radius N(lat), between a and a / sqrt(1 - e^2).
 * Divided by whichever of the two moves each end outward.
 */
static void
unit_interval(double lo, double hi, double *ulo, double *uhi)
{
	const double e2 = FR_WGS84_F * (2.0 - FR_WGS84_F);
	const double nmax = FR_WGS84_A / sqrt(1.0 - e2);

	*ulo = Min(lo / FR_WGS84_A, lo / nmax);
	*uhi = Max(hi / FR_WGS84_A, hi / nmax);
}

/*
 * Widens a unit-sphere x,y box b, which holds the x,y of some vertices, to
 * the x,y of every great-circle arc between them, as PostGIS's geography
 * boxes count them.  A minor arc is its chord pushed radially onto the
 * sphere: a chord point m becomes m / |m|, so its x,y is scaled by
 * s = 1 / |m| >= 1 and stays in the unit disk.  The chord's x,y lie in b
 * (b is convex), so each arc point lies on a segment from a point v of b
 * towards v / |v| on the unit circle.  When b holds the origin that is the
 * whole disk; otherwise the directions v / |v| form an arc of the circle
 * between the directions of two corners of b, whose box is that of the
 * corners' directions and of the axis directions it passes.
 */
static void
arc_shadow(plane_box *b)
{
	const double xs[2] = {b->xmin, b->xmax};
	const double ys[2] = {b->ymin, b->ymax};
	bool		spans_x = b->xmin <= 0.0 && b->xmax >= 0.0;
	bool		spans_y = b->ymin <= 0.0 && b->ymax >= 0.0;

	if (spans_x && spans_y)
	{
		plane_box_add(b, -1.0, -1.0);
		plane_box_add(b, 1.0, 1.0);
		return;
	}
	for (int i = 0; i < 2; i++)
		for (int j = 0; j < 2; j++)
		{
			double		r = hypot(xs[i], ys[j]);

			plane_box_add(b, xs[i] / r, ys[j] / r);
		}
	/* an axis direction is passed when its ray meets b */
	if (spans_y && b->xmax > 0.0)
		plane_box_add(b, 1.0, 0.0);
	if (spans_y && b->xmin < 0.0)
		plane_box_add(b, -1.0, 0.0);
	if (spans_x && b->ymax > 0.0)
		plane_box_add(b, 0.0, 1.0);
	if (spans_x && b->ymin < 0.0)
		plane_box_add(b, 0.0, -1.0);
}

/*
 * The box, in the plane of PostGIS's operators, that covers every curve
 * under an entry: the box sides of the key (geometry: the vertices' box,
 * which is the curve's), or for geography the unit-sphere box of its arcs.
 * False when the key covers everything (values that are not curves, and
 * invalid ones), which only the recheck can judge.
 */
static bool
entry_box(const fr_key *k, bool geodetic, plane_box *b)
{
	b->xmin = k->lo[FR_KEY_MIN_X];
	b->xmax = k->hi[FR_KEY_MAX_X];
	b->ymin = k->lo[FR_KEY_MIN_Y];
	b->ymax = k->hi[FR_KEY_MAX_Y];
	if (!isfinite(b->xmin) || !isfinite(b->xmax) || !isfinite(b->ymin) || !isfinite(b->ymax))
		return false;
	if (geodetic)
	{
		unit_interval(b->xmin, b->xmax, &b->xmin, &b->xmax);
		unit_interval(b->ymin, b->ymax, &b->ymin, &b->ymax);
		arc_shadow(b);
	}
	return true;
}

/* a <= b, allowing the float rounding of PostGIS's boxes (relative 1e-6, and a tiny absolute). */
static inline bool
loose_le(double a, double b)
{
	return a <= b + 1e-6 * Max(fabs(a), fabs(b)) + 1e-37;
}

/* Do the boxes overlap (within the rounding allowance)? */
static bool
loose_overlaps(const plane_box *a, const plane_box *b)
{
	return loose_le(a->xmin, b->xmax) && loose_le(b->xmin, a->xmax) &&
		loose_le(a->ymin, b->ymax) && loose_le(b->ymin, a->ymax);
}

/* Does a contain b (within the rounding allowance)? */
static bool
loose_contains(const plane_box *a, const plane_box *b)
{
	return loose_le(a->xmin, b->xmin) && loose_le(b->xmax, a->xmax) &&
		loose_le(a->ymin, b->ymin) && loose_le(b->ymax, a->ymax);
}

/*
 * GiST consistent for &&, ~=, ~ and @ (column operator query), lossy.
 * Overlap: the entry's box meets the query's.  ~ (the row contains the
 * query) and ~= (same box): the entry's box contains the query's, which
 * also holds for the union of boxes at an inner node.  @ (the row lies in
 * the query): on a planar leaf the box lies in the query's; at inner nodes,
 * and for geography, whose entry boxes are enlarged, they overlap.
 */
Datum
geo_gist_box_consistent(FunctionCallInfo fcinfo)
{
	GISTENTRY  *entry = (GISTENTRY *) PG_GETARG_POINTER(0);
	StrategyNumber strategy = (StrategyNumber) PG_GETARG_UINT16(2);
	Oid			subtype = PG_GETARG_OID(3);
	bool	   *recheck = (bool *) PG_GETARG_POINTER(4);
	box_query  *bq = box_query_get(fcinfo, PG_GETARG_DATUM(1), subtype);
	plane_box	node;

	*recheck = true;
	if (!bq->known || !entry_box(DatumGetFrechetKey(entry->key), bq->geodetic, &node))
		PG_RETURN_BOOL(true);
	switch (strategy)
	{
		case RTOverlapStrategyNumber:
			PG_RETURN_BOOL(loose_overlaps(&node, &bq->box));
		case RTContainsStrategyNumber:
		case RTSameStrategyNumber:
			PG_RETURN_BOOL(loose_contains(&node, &bq->box));
		case RTContainedByStrategyNumber:
			if (GIST_LEAF(entry) && !bq->geodetic)
				PG_RETURN_BOOL(loose_contains(&bq->box, &node));
			PG_RETURN_BOOL(loose_overlaps(&node, &bq->box));
	}
	elog(ERROR, "Fréchet operator classes: unknown box strategy number %d", strategy);
	PG_RETURN_BOOL(false);
}
