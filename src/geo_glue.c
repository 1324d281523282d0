/*
 * geo_glue.c - the PostGIS layer: Fréchet functions on EWKB (bytea), on
 * PostGIS geometry (planar, in the units of the SRID) and on geography
 * (metres on WGS84), and the planner support function that lets
 * frechet_at_most use an existing PostGIS index.
 *
 * This library neither includes PostGIS headers nor links PostGIS.  A
 * geometry or geography argument reaches us as an opaque varlena; we call
 * PostGIS's own ST_AsEWKB on it through the function manager (looked up in
 * the schema of the postgis extension, never through search_path) and
 * decode the EWKB ourselves (ewkb.c).
 */
#include "postgres.h"

#include <math.h>

#include "access/genam.h"
#include "access/htup_details.h"
#include "access/table.h"
#include "catalog/indexing.h"
#include "catalog/pg_extension.h"
#include "catalog/pg_type.h"
#include "executor/spi.h"
#include "fmgr.h"
#include "nodes/makefuncs.h"
#include "nodes/nodeFuncs.h"
#include "nodes/supportnodes.h"
#include "optimizer/optimizer.h"
#include "parser/parse_func.h"
#include "parser/parse_oper.h"
#include "utils/builtins.h"
#include "utils/memutils.h"
#include "utils/fmgroids.h"
#include "utils/lsyscache.h"
#include "utils/syscache.h"

#include "lib/stringinfo.h"

#include "glue.h"
#include "index.h"
#include "ewkb.h"
#include "geo_glue.h"
#include "geodesy.h"

/* The PostGIS functions a call site needs, found once and kept in fn_extra. */
struct postgis_calls
{
	FmgrInfo	as_ewkb;		/* ST_AsEWKB(geometry) */
	FmgrInfo	to_geometry;	/* geometry(geography), for geography input */
	FmgrInfo	from_ewkb;		/* ST_GeomFromEWKB(bytea), for results */
	FmgrInfo	to_geography;	/* geography(geometry), for geography results */
	Oid			nsp;			/* the postgis schema */
	int32		srid_checked;	/* last SRID whose units were looked up (0: none) */
};

/* Schema of the installed postgis extension; ERROR when it is not installed. */
static Oid
postgis_namespace(void)
{
	Relation	rel;
	ScanKeyData key;
	SysScanDesc scan;
	HeapTuple	tup;
	Oid			nsp = InvalidOid;

	rel = table_open(ExtensionRelationId, AccessShareLock);
	ScanKeyInit(&key, Anum_pg_extension_extname, BTEqualStrategyNumber,
				F_NAMEEQ, CStringGetDatum("postgis"));
	scan = systable_beginscan(rel, ExtensionNameIndexId, true, NULL, 1, &key);
	tup = systable_getnext(scan);
	if (HeapTupleIsValid(tup))
		nsp = ((Form_pg_extension) GETSTRUCT(tup))->extnamespace;
	systable_endscan(scan);
	table_close(rel, AccessShareLock);
	if (!OidIsValid(nsp))
		ereport(ERROR,
				(errcode(ERRCODE_UNDEFINED_OBJECT),
				 errmsg("extension \"postgis\" is not installed"),
				 errdetail("The geometry and geography functions of frechet_ext call PostGIS.")));
	return nsp;
}

/* OID of a type of the postgis schema. */
static Oid
postgis_type(Oid nsp, const char *name)
{
	Oid			typ = GetSysCacheOid2(TYPENAMENSP, Anum_pg_type_oid,
									  CStringGetDatum(name), ObjectIdGetDatum(nsp));

	if (!OidIsValid(typ))
		elog(ERROR, "type %s not found in the schema of postgis", name);
	return typ;
}

/* OID of a function of the given schema, by name and argument types. */
static Oid
schema_function(Oid nsp, const char *name, int nargs, Oid *argtypes)
{
	List	   *qname = list_make2(makeString(get_namespace_name(nsp)),
								   makeString(pstrdup(name)));

	return LookupFuncName(qname, nargs, argtypes, false);
}

/* Finds ST_AsEWKB, ST_GeomFromEWKB and the casts, allocated in mcxt. */
postgis_calls *
geo_postgis_calls_new(MemoryContext mcxt)
{
	Oid			nsp = postgis_namespace();
	Oid			geometry = postgis_type(nsp, "geometry");
	Oid			geography = postgis_type(nsp, "geography");
	Oid			bytea_type = BYTEAOID;
	postgis_calls *calls = MemoryContextAllocZero(mcxt, sizeof(postgis_calls));

	fmgr_info_cxt(schema_function(nsp, "st_asewkb", 1, &geometry),
				  &calls->as_ewkb, mcxt);
	fmgr_info_cxt(schema_function(nsp, "geometry", 1, &geography),
				  &calls->to_geometry, mcxt);
	fmgr_info_cxt(schema_function(nsp, "st_geomfromewkb", 1, &bytea_type),
				  &calls->from_ewkb, mcxt);
	fmgr_info_cxt(schema_function(nsp, "geography", 1, &geometry),
				  &calls->to_geography, mcxt);
	calls->nsp = nsp;
	return calls;
}

/* The PostGIS look-ups of one call site, found once and kept in fn_extra. */
postgis_calls *
geo_calls_for(FunctionCallInfo fcinfo)
{
	if (fcinfo->flinfo->fn_extra == NULL)
		fcinfo->flinfo->fn_extra = geo_postgis_calls_new(fcinfo->flinfo->fn_mcxt);
	return (postgis_calls *) fcinfo->flinfo->fn_extra;
}

/* The EWKB of a geometry (or, when geography, a geography) value, made by PostGIS. */
bytea *
geo_datum_ewkb(postgis_calls *calls, Datum g, bool geography)
{
	if (geography)
		g = FunctionCall1(&calls->to_geometry, g);
	return DatumGetByteaPP(FunctionCall1(&calls->as_ewkb, g));
}

/* The EWKB of a geometry or geography argument, made by PostGIS. */
static bytea *
argument_ewkb(FunctionCallInfo fcinfo, int argno, bool geography)
{
	return geo_datum_ewkb(geo_calls_for(fcinfo), PG_GETARG_DATUM(argno), geography);
}

/*
 * Checks that two decoded curves agree on SRID and, for geometry, on
 * dimension (geography ignores Z: its distances are on the ellipsoid).
 */
static void
check_compatible(const ewkb_curve *a, const ewkb_curve *b, bool geodetic)
{
	if (a->srid != b->srid)
		ereport(ERROR,
				(errcode(ERRCODE_INVALID_PARAMETER_VALUE),
				 errmsg("curves must have the same SRID"),
				 errdetail("Argument 1 has SRID %d and argument 2 has SRID %d.",
						   a->srid, b->srid),
				 errhint("Transform one of them first, e.g. with ST_Transform.")));
	if (a->dim != b->dim && !geodetic)
		ereport(ERROR,
				(errcode(ERRCODE_INVALID_PARAMETER_VALUE),
				 errmsg("curves must both be 2-D or both be 3-D"),
				 errdetail("Argument 1 is %d-D and argument 2 is %d-D.", a->dim, b->dim),
				 errhint("Use ST_Force2D or ST_Force3D on one of them.")));
}

/*
 * A lon/lat (degrees) curve as the engine sees it: WGS84 Earth-centred
 * points (Z is ignored), into out (3-D).  With geodesic, each edge
 * follows its geodesic: an edge whose chord could depart from it by more
 * than FR_GEO_EDGE_SAG is cut into equal geodesic pieces (geodesy.c), and
 * *first (palloc'd; NULL when no edge was cut) receives the engine vertex
 * of each input vertex.  A longitude or latitude out of range goes to rep
 * (false back).
 */
static bool
lonlat_track(const ewkb_curve *c, track_report *rep, bool geodesic, fr_curve *out, size_t **first)
{
	double	   *xyz = palloc(sizeof(double) * 3 * c->n),
			   *dense;
	size_t		total = c->n,
			   *at;

	*first = NULL;
	rep->start = c->coords;
	rep->dim = c->dim;
	rep->n = c->n;
	for (size_t i = 0; i < c->n; i++)
	{
		double		lon = c->coords[i * c->dim],
					lat = c->coords[i * c->dim + 1];

		if (!fr_geo_valid(lon, lat))
		{
			pfree(xyz);
			return track_problem(rep, ERRCODE_NUMERIC_VALUE_OUT_OF_RANGE, NULL,
								 "longitude or latitude out of range",
								 "(longitude %g, latitude %g) at vertex %zu; longitude must be in [-180, 180] and latitude in [-90, 90]",
								 lon, lat, i + 1);
		}
		fr_geo_to_ecef(lon, lat, xyz + 3 * i);
	}
	out->coords = xyz;
	out->n = c->n;
	out->dim = 3;
	if (!geodesic || c->n < 2)
		return true;

	/* count the pieces first (no geodesic is computed for short edges) */
	at = palloc(sizeof(size_t) * c->n);
	at[0] = 0;
	for (size_t i = 0; i + 1 < c->n; i++)
	{
		size_t		pieces = fr_geo_edge_pieces(c->coords + i * c->dim, c->coords + (i + 1) * c->dim,
												xyz + 3 * i, xyz + 3 * (i + 1));

		if (pieces > (MaxAllocSize / (3 * sizeof(double))) - total)
		{
			pfree(xyz);
			pfree(at);
			return track_problem(rep, ERRCODE_PROGRAM_LIMIT_EXCEEDED, NULL,
								 "geography track too long to follow its geodesics",
								 "edges that need more than %zu points along them",
								 (size_t) (MaxAllocSize / (3 * sizeof(double))));
		}
		total += pieces - 1;
		at[i + 1] = at[i] + pieces;
	}
	if (total == c->n)
	{
		pfree(at);
		return true;
	}
	dense = palloc(sizeof(double) * 3 * total);
	for (size_t i = 0; i < c->n; i++)
	{
		memcpy(dense + 3 * at[i], xyz + 3 * i, 3 * sizeof(double));
		if (i + 1 < c->n && at[i + 1] - at[i] > 1)
			fr_geo_edge_fill(c->coords + i * c->dim, c->coords + (i + 1) * c->dim,
							 at[i + 1] - at[i], dense + 3 * (at[i] + 1));
	}
	pfree(xyz);
	out->coords = dense;
	out->n = total;
	*first = at;
	return true;
}

/*
 * A decoded geography track as the engine and the index keys see it
 * (edges along their geodesics); a bad one goes to rep (false back).
 */
bool
geo_lonlat_engine(const ewkb_curve *c, track_report *rep, fr_curve *out)
{
	size_t	   *first;

	if (!lonlat_track(c, rep, true, out, &first))
		return false;
	if (first)
		pfree(first);
	return true;
}

/* The same, raising an ERROR that names argument argno. */
static void
to_engine(const ewkb_curve *c, int argno, bool geodesic, fr_curve *out, size_t **first)
{
	track_report rep = {.argno = argno};

	lonlat_track(c, &rep, geodesic, out, first);
}

/*
 * The input position (0-based k + t) of an engine position of curve which:
 * the same for planar curves and geography edges that were not cut; on a
 * cut edge, t is the share of its geodesic length.
 */
double
geo_pos_in(const geo_curves *gc, int which, double pos)
{
	const size_t *first = which ? gc->first_b : gc->first_a;
	size_t		n = which ? gc->b.n : gc->a.n,
				lo = 0,
				hi;

	if (first == NULL || !(pos > 0))
		return first == NULL ? pos : 0.0;
	if (pos >= (double) first[n - 1])
		return (double) (n - 1);
	/* the input edge lo with first[lo] <= pos < first[lo + 1] */
	hi = n - 1;
	while (hi - lo > 1)
	{
		size_t		mid = lo + (hi - lo) / 2;

		if ((double) first[mid] <= pos)
			lo = mid;
		else
			hi = mid;
	}
	return (double) lo + (pos - (double) first[lo]) / (double) (first[lo + 1] - first[lo]);
}

/* The engine position of an input position (the inverse of geo_pos_in). */
static double
pos_engine(const geo_curves *gc, int which, double pos)
{
	const size_t *first = which ? gc->first_b : gc->first_a;
	size_t		n = which ? gc->b.n : gc->a.n,
				k;

	if (first == NULL || !(pos > 0))
		return first == NULL ? pos : 0.0;
	if (pos >= (double) (n - 1))
		return (double) first[n - 1];
	k = (size_t) pos;
	return (double) first[k] + (pos - (double) k) * (double) (first[k + 1] - first[k]);
}

/* Does spatial_ref_sys say that srid's coordinates are longitude and latitude? */
static bool
srid_in_degrees(Oid nsp, int32 srid)
{
	bool		degrees = false;
	char	   *sql = psprintf("SELECT proj4text ~ '[+]proj=(longlat|latlong)' OR srtext ~ '^(GEOGCS|GEOGCRS|GEODCRS)'"
							   " FROM %s.spatial_ref_sys WHERE srid = %d",
							   quote_identifier(get_namespace_name(nsp)), srid);

	if (SPI_connect() != SPI_OK_CONNECT)
		elog(ERROR, "SPI_connect failed");
	if (SPI_execute(sql, true, 1) == SPI_OK_SELECT && SPI_processed == 1)
	{
		bool		isnull;
		Datum		v = SPI_getbinval(SPI_tuptable->vals[0], SPI_tuptable->tupdesc, 1, &isnull);

		degrees = !isnull && DatumGetBool(v);
	}
	SPI_finish();
	pfree(sql);
	return degrees;
}

/*
 * A planar (geometry) function given coordinates in degrees answers in
 * degrees, so a tolerance meant as metres never fires: a NOTICE, once per
 * call site and SRID (the look-up is kept in fn_extra).
 */
static void
note_planar_degrees(FunctionCallInfo fcinfo, int32 srid)
{
	postgis_calls *calls;

	if (fcinfo == NULL || srid <= 0)
		return;
	calls = geo_calls_for(fcinfo);
	if (calls->srid_checked == srid)
		return;
	calls->srid_checked = srid;
	if (srid_in_degrees(calls->nsp, srid))
		ereport(NOTICE,
				(errmsg("SRID %d measures in degrees, so this geometry function answers in degrees", srid),
				 errdetail("Distances and tolerances of the geometry functions are in the units of the SRID."),
				 errhint("For metres use geography (a::geography, b::geography), or ST_Transform both to a projected SRID.")));
}

/*
 * Decodes both EWKB arguments into engine curves, keeping the decoded
 * input; fcinfo (NULL for the raw EWKB functions) is the call site of a
 * planar function that may note degrees.
 */
static void
decode_curves(bytea *a, bytea *b, bool geodetic, geo_curves *gc, FunctionCallInfo fcinfo,
			  int geodesic)
{
	ewkb_decode((const uint8 *) VARDATA_ANY(a), VARSIZE_ANY_EXHDR(a), 1, &gc->a);
	ewkb_decode((const uint8 *) VARDATA_ANY(b), VARSIZE_ANY_EXHDR(b), 2, &gc->b);
	check_compatible(&gc->a, &gc->b, geodetic);
	if (!geodetic)
		note_planar_degrees(fcinfo, gc->a.srid);
	gc->geodetic = geodetic;
	gc->p.n = gc->a.n;
	gc->q.n = gc->b.n;
	gc->first_a = gc->first_b = NULL;
	if (geodetic)
	{
		to_engine(&gc->a, 1, (geodesic & GEO_EDGES_A) != 0, &gc->p, &gc->first_a);
		to_engine(&gc->b, 2, (geodesic & GEO_EDGES_B) != 0, &gc->q, &gc->first_b);
	}
	else
	{
		gc->p.coords = gc->a.coords;
		gc->q.coords = gc->b.coords;
		gc->p.dim = gc->q.dim = gc->a.dim;
	}
}

/* Decodes both EWKB arguments into engine curves, geodetic: lon/lat to ECEF. */
static void
decode_pair(bytea *a, bytea *b, bool geodetic, fr_curve *p, fr_curve *q, FunctionCallInfo fcinfo)
{
	geo_curves	gc;

	decode_curves(a, b, geodetic, &gc, fcinfo, GEO_EDGES_A | GEO_EDGES_B);
	*p = gc.p;
	*q = gc.q;
}

/* Decodes the first two arguments (geometry, or geography when geodetic). */
void
geo_decode_args(FunctionCallInfo fcinfo, bool geodetic, geo_curves *gc)
{
	geo_decode_edges(fcinfo, geodetic, GEO_EDGES_A | GEO_EDGES_B, gc);
}

/*
 * The same, with geography edges as geodesics only for the curves in
 * geodesic (GEO_EDGES_A, GEO_EDGES_B): the ping functions read the trip's
 * vertices alone.
 */
void
geo_decode_edges(FunctionCallInfo fcinfo, bool geodetic, int geodesic, geo_curves *gc)
{
	decode_curves(argument_ewkb(fcinfo, 0, geodetic), argument_ewkb(fcinfo, 1, geodetic),
				  geodetic, gc, fcinfo, geodesic);
}

/*
 * Decodes the first argument alone (the curve of a one-curve function), as
 * both a and b; measures says whether the function measures in the
 * coordinates' units (then a planar call in degrees gets its NOTICE), and
 * geodesic which of the two copies gets geodesic geography edges.
 */
void
geo_decode_one(FunctionCallInfo fcinfo, bool geodetic, bool measures, int geodesic, geo_curves *gc)
{
	bytea	   *a = argument_ewkb(fcinfo, 0, geodetic);

	decode_curves(a, a, geodetic, gc, measures ? fcinfo : NULL, geodesic);
}

/*
 * One geometry (or, when geodetic, geography) value as an engine curve:
 * geography as Earth-centred coordinates with its edges along their
 * geodesics (as the index keys summarise it), and its SRID when srid is not
 * NULL.  A bad one goes to rep, in the words of the distance functions'
 * ERROR; false then.
 */
bool
geo_datum_track(postgis_calls *calls, Datum g, bool geodetic, track_report *rep, fr_curve *out,
				int32 *srid)
{
	bytea	   *ewkb = geo_datum_ewkb(calls, g, geodetic);
	ewkb_curve	c;
	bool		ok;

	ok = ewkb_decode_track((const uint8 *) VARDATA_ANY(ewkb), VARSIZE_ANY_EXHDR(ewkb), rep, &c);
	pfree(ewkb);
	if (!ok)
		return false;
	/* frechet_track_check also answers for the functions that read M as time */
	if (rep->check && !ewkb_check_times(&c, rep))
		return false;
	if (c.m)
		pfree(c.m);
	if (srid)
		*srid = c.srid;
	out->n = c.n;
	out->coords = c.coords;
	out->dim = c.dim;
	if (geodetic)
	{
		bool		ok = geo_lonlat_engine(&c, rep, out);

		pfree(c.coords);
		rep->start = NULL;
		return ok;
	}
	return true;
}

/* The same, raising the distance functions' ERROR, naming argument argno. */
void
geo_datum_curve(postgis_calls *calls, Datum g, bool geodetic, int argno, fr_curve *out)
{
	track_report rep = {.argno = argno};

	geo_datum_track(calls, g, geodetic, &rep, out, NULL);
}

/* Appends a little-endian 32-bit integer. */
static void
put_u32(StringInfo buf, uint32 v)
{
	for (int i = 0; i < 4; i++)
		appendStringInfoChar(buf, (char) ((v >> (8 * i)) & 0xff));
}

/* Appends a little-endian IEEE 754 double. */
static void
put_f64(StringInfo buf, double d)
{
	uint64		u;

	memcpy(&u, &d, sizeof(u));
	for (int i = 0; i < 8; i++)
		appendStringInfoChar(buf, (char) ((u >> (8 * i)) & 0xff));
}

/* What an output point carries besides X and Y: Z, M, or both. */
typedef struct geo_layout
{
	bool		z,
				m;
} geo_layout;

/* Doubles per output vertex. */
static int
layout_dim(geo_layout l)
{
	return 2 + (l.z ? 1 : 0) + (l.m ? 1 : 0);
}

/* A point of curve which alone keeps that curve's Z and M. */
static geo_layout
curve_layout(const geo_curves *gc, int which)
{
	const ewkb_curve *c = which ? &gc->b : &gc->a;
	geo_layout	l = {c->dim == 3, c->m != NULL};

	return l;
}

/* A shape joining points of both curves keeps what both have. */
static geo_layout
pair_layout(const geo_curves *gc)
{
	geo_layout	l = {gc->a.dim == 3 && gc->b.dim == 3, gc->a.m != NULL && gc->b.m != NULL};

	return l;
}

/*
 * One per-vertex value (stride apart) at position pos (0-based k + t),
 * linear in t between vertices and held at the ends.
 */
static double
value_at(const double *v, size_t stride, size_t n, double pos)
{
	size_t		k;
	double		t;

	if (!(pos > 0))
		return v[0];
	if (pos >= (double) (n - 1))
		return v[(n - 1) * stride];
	k = (size_t) pos;
	t = pos - (double) k;
	return t == 0 ? v[k * stride] : v[k * stride] + t * (v[(k + 1) * stride] - v[k * stride]);
}

/*
 * Output coordinates of input position pos (0-based k + t) of curve which
 * (0: a, 1: b): X Y, then Z and M as the layout asks.  At a vertex they
 * are the input's own; between vertices X Y follow the engine's curve
 * (for geography the point below the engine's chord, within
 * FR_GEO_EDGE_SAG of the geodesic), and Z and M are linear in t.
 */
static void
output_point(const geo_curves *gc, int which, double pos, geo_layout l, double *out)
{
	const fr_curve *c = which ? &gc->q : &gc->p;
	const ewkb_curve *orig = which ? &gc->b : &gc->a;
	double		k = floor(pos);
	int			at = 2;

	if (pos == k && k >= 0 && k < (double) orig->n)
		memcpy(out, orig->coords + (size_t) k * orig->dim, 2 * sizeof(double));
	else if (gc->geodetic)
	{
		double		xyz[3];

		fr_curve_point(c, pos_engine(gc, which, pos), xyz);
		fr_ecef_to_geo(xyz, &out[0], &out[1]);
	}
	else
	{
		double		xyz[3];

		fr_curve_point(c, pos, xyz);
		memcpy(out, xyz, 2 * sizeof(double));
	}
	if (l.z)
		out[at++] = value_at(orig->coords + 2, orig->dim, orig->n, pos);
	if (l.m)
		out[at++] = value_at(orig->m, 1, orig->n, pos);
}

/* The time (M) at input position pos of curve which, as a float8 Datum; *isnull without M. */
Datum
geo_time_datum(const geo_curves *gc, int which, double pos, bool *isnull)
{
	const ewkb_curve *orig = which ? &gc->b : &gc->a;

	*isnull = orig->m == NULL;
	return Float8GetDatum(*isnull ? 0.0 : value_at(orig->m, 1, orig->n, pos));
}

/*
 * A function that reports times or M between vertices needs curve
 * which's M to be time: finite and non-decreasing (else an ERROR naming
 * the argument).  Nothing to check without M.
 */
void
geo_check_times(const geo_curves *gc, int which)
{
	track_report rep = {.argno = which + 1};

	ewkb_check_times(which ? &gc->b : &gc->a, &rep);
}

/* Starts an EWKB geometry of the given OGC type and layout with the inputs' SRID. */
static void
begin_ewkb(StringInfo buf, const geo_curves *gc, uint32 type, geo_layout l)
{
	uint32		flags = 0x20000000u | (l.z ? 0x80000000u : 0) | (l.m ? 0x40000000u : 0);

	initStringInfo(buf);
	appendBinaryStringInfo(buf, "\x00\x00\x00\x00", VARHDRSZ);
	appendStringInfoChar(buf, 1);
	put_u32(buf, type | flags);
	put_u32(buf, (uint32) gc->a.srid);
}

/* Appends a LineString body (no header) through n output points of odim doubles. */
static void
put_points(StringInfo buf, const double *pts, size_t n, int odim)
{
	put_u32(buf, (uint32) n);
	for (size_t i = 0; i < n * odim; i++)
		put_f64(buf, pts[i]);
}

/* Turns the EWKB in buf into a geometry (or geography) Datum through PostGIS. */
static Datum
finish_ewkb(FunctionCallInfo fcinfo, const geo_curves *gc, StringInfo buf)
{
	postgis_calls *calls = geo_calls_for(fcinfo);
	Datum		g;

	SET_VARSIZE(buf->data, buf->len);
	g = FunctionCall1(&calls->from_ewkb, PointerGetDatum(buf->data));
	if (gc->geodetic)
		g = FunctionCall1(&calls->to_geography, g);
	return g;
}

/* A Point at input position pos of curve which, as geometry or geography, with its Z and M. */
Datum
geo_point_datum(FunctionCallInfo fcinfo, const geo_curves *gc, int which, double pos)
{
	StringInfoData buf;
	geo_layout	l = curve_layout(gc, which);
	double		pt[4];

	output_point(gc, which, pos, l, pt);
	begin_ewkb(&buf, gc, 1, l);
	for (int i = 0; i < layout_dim(l); i++)
		put_f64(&buf, pt[i]);
	return finish_ewkb(fcinfo, gc, &buf);
}

/* The part of curve which between input positions from <= to, as a LineString with its Z and M. */
Datum
geo_subline_datum(FunctionCallInfo fcinfo, const geo_curves *gc, int which,
				  double from, double to)
{
	StringInfoData buf;
	geo_layout	l = curve_layout(gc, which);
	int			odim = layout_dim(l);
	size_t		first = (size_t) floor(from) + 1,
				n = 0;
	double	   *pts = palloc(sizeof(double) * odim * ((size_t) (to - from) + 3));

	output_point(gc, which, from, l, pts);
	n = 1;
	for (size_t k = first; (double) k < to; k++)
		output_point(gc, which, (double) k, l, pts + odim * n++);
	output_point(gc, which, to, l, pts + odim * n++);
	begin_ewkb(&buf, gc, 2, l);
	put_points(&buf, pts, n, odim);
	return finish_ewkb(fcinfo, gc, &buf);
}

/* A LineString through the given vertices (0-based indices) of curve a, with their Z and M. */
Datum
geo_vertices_datum(FunctionCallInfo fcinfo, const geo_curves *gc, const size_t *keep, size_t count)
{
	StringInfoData buf;
	geo_layout	l = curve_layout(gc, 0);
	int			odim = layout_dim(l);
	double	   *pts = palloc(sizeof(double) * odim * (count > 1 ? count : 2));

	for (size_t k = 0; k < count; k++)
		output_point(gc, 0, (double) keep[k], l, pts + odim * k);
	if (count == 1)
	{
		/* a one-point curve stays a point: a Point body is its coordinates */
		begin_ewkb(&buf, gc, 1, l);
		for (int d = 0; d < odim; d++)
			put_f64(&buf, pts[d]);
		return finish_ewkb(fcinfo, gc, &buf);
	}
	begin_ewkb(&buf, gc, 2, l);
	put_points(&buf, pts, count, odim);
	return finish_ewkb(fcinfo, gc, &buf);
}

/* The unit vector of a lon/lat point (degrees) on the sphere, as PostGIS's geography takes it. */
static void
lonlat_unit_vector(const double *lonlat, double *v)
{
	double		lon = lonlat[0] * (M_PI / 180.0),
				lat = lonlat[1] * (M_PI / 180.0);

	v[0] = cos(lat) * cos(lon);
	v[1] = cos(lat) * sin(lon);
	v[2] = sin(lat);
}

/*
 * True when two lon/lat points (degrees) are antipodal for a geography
 * edge: PostGIS refuses an edge between points whose unit vectors are
 * opposite to within 1e-12 in every coordinate ("Antipodal edge
 * detected", an internal error), as no great circle through them is
 * preferred.  We test at 1e-10 (about 0.6 mm), to stay on the safe side.
 */
bool
geo_lonlat_antipodal(const double *a, const double *b)
{
	double		va[3],
				vb[3];

	lonlat_unit_vector(a, va);
	lonlat_unit_vector(b, vb);
	for (int i = 0; i < 3; i++)
		if (fabs(va[i] + vb[i]) > 1e-10)
			return false;
	return true;
}

/*
 * A MultiLineString of the leashes at the given breakpoints of a matching,
 * with the Z and M that both curves have.
 */
Datum
geo_leashes_datum(FunctionCallInfo fcinfo, const geo_curves *gc,
				  const fr_match_pt *pts, size_t count)
{
	StringInfoData buf;
	geo_layout	l = pair_layout(gc);
	int			odim = layout_dim(l);

	begin_ewkb(&buf, gc, 5, l);
	put_u32(&buf, (uint32) count);
	for (size_t k = 0; k < count; k++)
	{
		double		seg[8];

		output_point(gc, 0, geo_pos_in(gc, 0, pts[k].a_pos), l, seg);
		output_point(gc, 1, geo_pos_in(gc, 1, pts[k].b_pos), l, seg + odim);
		if (gc->geodetic && geo_lonlat_antipodal(seg, seg + odim))
			ereport(ERROR,
					(errcode(ERRCODE_INVALID_PARAMETER_VALUE),
					 errmsg("a leash of the matching joins two antipodal points"),
					 errdetail("Leash %zu runs from (longitude %g, latitude %g) to (longitude %g, latitude %g), the opposite point of the Earth: a geography edge between them has no defined path.",
							   k + 1, seg[0], seg[1], seg[odim], seg[odim + 1]),
					 errhint("frechet_matching and frechet_bottleneck give the leashes' points; the geometry versions draw them as straight lines.")));
		appendStringInfoChar(&buf, 1);
		put_u32(&buf, 2 | (l.z ? 0x80000000u : 0) | (l.m ? 0x40000000u : 0));
		put_points(&buf, seg, 2, odim);
	}
	return finish_ewkb(fcinfo, gc, &buf);
}

/* A distance from the engine in output units: metres when geodetic. */
double
geo_result_distance(const geo_curves *gc, double d)
{
	return gc->geodetic ? fr_chord_to_metres(d) : d;
}

/* A tolerance in output units as the engine's: a chord when geodetic. */
double
geo_engine_epsilon(const geo_curves *gc, double eps)
{
	return gc->geodetic ? fr_metres_to_chord(eps) : eps;
}

/* Continuous distance of two encoded curves; in metres when geodetic. */
static double
distance_of(bytea *a, bytea *b, bool geodetic, FunctionCallInfo fcinfo)
{
	fr_curve	p,
				q;
	glue_env	g;
	double		d;
	fr_status	st;

	decode_pair(a, b, geodetic, &p, &q, fcinfo);
	glue_env_begin(&g, fr_scratch_bytes(p.n, q.n), "frechet_distance");
	st = fr_distance(&g.env, &p, &q, &d, NULL);
	glue_env_end(&g);
	glue_check_status(st, "frechet_distance");
	return geodetic ? fr_chord_to_metres(d) : d;
}

/* Decision on two encoded curves; eps in metres when geodetic. */
static bool
at_most_of(bytea *a, bytea *b, double eps, bool geodetic, FunctionCallInfo fcinfo)
{
	fr_curve	p,
				q;
	glue_env	g;
	bool		yes;
	fr_status	st;

	decode_pair(a, b, geodetic, &p, &q, fcinfo);
	glue_check_epsilon(eps, 3);
	glue_env_begin(&g, fr_scratch_bytes(p.n, q.n), "frechet_at_most");
	st = fr_decide(&g.env, &p, &q, geodetic ? fr_metres_to_chord(eps) : eps, &yes, NULL);
	glue_env_end(&g);
	glue_check_status(st, "frechet_at_most");
	return yes;
}

/* Discrete distance of two encoded curves; in metres when geodetic. */
static double
discrete_of(bytea *a, bytea *b, bool geodetic, FunctionCallInfo fcinfo)
{
	fr_curve	p,
				q;
	glue_env	g;
	double		d;
	fr_status	st;

	decode_pair(a, b, geodetic, &p, &q, fcinfo);
	glue_env_begin(&g, fr_scratch_bytes(p.n, q.n), "discrete_frechet_distance");
	st = fr_discrete_distance(&g.env, &p, &q, &d);
	glue_env_end(&g);
	glue_check_status(st, "discrete_frechet_distance");
	return geodetic ? fr_chord_to_metres(d) : d;
}

PG_FUNCTION_INFO_V1(frechet_distance_ewkb);
/* frechet_distance_ewkb(bytea, bytea, geodetic bool): distance of two EWKB curves. */
Datum
frechet_distance_ewkb(PG_FUNCTION_ARGS)
{
	PG_RETURN_FLOAT8(distance_of(PG_GETARG_BYTEA_PP(0), PG_GETARG_BYTEA_PP(1),
								 PG_GETARG_BOOL(2), NULL));
}

PG_FUNCTION_INFO_V1(frechet_at_most_ewkb);
/* frechet_at_most_ewkb(bytea, bytea, float8, geodetic bool): is the distance at most epsilon? */
Datum
frechet_at_most_ewkb(PG_FUNCTION_ARGS)
{
	PG_RETURN_BOOL(at_most_of(PG_GETARG_BYTEA_PP(0), PG_GETARG_BYTEA_PP(1),
							  PG_GETARG_FLOAT8(2), PG_GETARG_BOOL(3), NULL));
}

PG_FUNCTION_INFO_V1(discrete_frechet_distance_ewkb);
/* discrete_frechet_distance_ewkb(bytea, bytea, geodetic bool): discrete distance of two EWKB curves. */
Datum
discrete_frechet_distance_ewkb(PG_FUNCTION_ARGS)
{
	PG_RETURN_FLOAT8(discrete_of(PG_GETARG_BYTEA_PP(0), PG_GETARG_BYTEA_PP(1),
								 PG_GETARG_BOOL(2), NULL));
}

PG_FUNCTION_INFO_V1(frechet_distance_geometry);
/* frechet_distance(geometry, geometry): in the units of the SRID. */
Datum
frechet_distance_geometry(PG_FUNCTION_ARGS)
{
	PG_RETURN_FLOAT8(distance_of(argument_ewkb(fcinfo, 0, false),
								 argument_ewkb(fcinfo, 1, false), false, fcinfo));
}

PG_FUNCTION_INFO_V1(frechet_at_most_geometry);
/* frechet_at_most(geometry, geometry, float8): epsilon in the units of the SRID. */
Datum
frechet_at_most_geometry(PG_FUNCTION_ARGS)
{
	PG_RETURN_BOOL(at_most_of(argument_ewkb(fcinfo, 0, false),
							  argument_ewkb(fcinfo, 1, false),
							  PG_GETARG_FLOAT8(2), false, fcinfo));
}

PG_FUNCTION_INFO_V1(discrete_frechet_distance_geometry);
/* discrete_frechet_distance(geometry, geometry): in the units of the SRID. */
Datum
discrete_frechet_distance_geometry(PG_FUNCTION_ARGS)
{
	PG_RETURN_FLOAT8(discrete_of(argument_ewkb(fcinfo, 0, false),
								 argument_ewkb(fcinfo, 1, false), false, fcinfo));
}

PG_FUNCTION_INFO_V1(frechet_distance_geography);
/* frechet_distance(geography, geography): metres on WGS84. */
Datum
frechet_distance_geography(PG_FUNCTION_ARGS)
{
	PG_RETURN_FLOAT8(distance_of(argument_ewkb(fcinfo, 0, true),
								 argument_ewkb(fcinfo, 1, true), true, fcinfo));
}

PG_FUNCTION_INFO_V1(frechet_at_most_geography);
/* frechet_at_most(geography, geography, float8): epsilon in metres on WGS84. */
Datum
frechet_at_most_geography(PG_FUNCTION_ARGS)
{
	PG_RETURN_BOOL(at_most_of(argument_ewkb(fcinfo, 0, true),
							  argument_ewkb(fcinfo, 1, true),
							  PG_GETARG_FLOAT8(2), true, fcinfo));
}

PG_FUNCTION_INFO_V1(discrete_frechet_distance_geography);
/* discrete_frechet_distance(geography, geography): metres on WGS84. */
Datum
discrete_frechet_distance_geography(PG_FUNCTION_ARGS)
{
	PG_RETURN_FLOAT8(discrete_of(argument_ewkb(fcinfo, 0, true),
								 argument_ewkb(fcinfo, 1, true), true, fcinfo));
}

PG_FUNCTION_INFO_V1(frechet_index_expansion);
/*
 * frechet_index_expansion(epsilon, geodetic): how far the index filter
 * expands the other curve's bounding box.  Planar: epsilon.  Geodetic:
 * metres for PostGIS's _ST_Expand(geography), which works on a unit sphere
 * (see geodesy.h for the factor).  Validates epsilon like frechet_at_most,
 * so an index scan with a bad epsilon fails as the function would.
 */
Datum
frechet_index_expansion(PG_FUNCTION_ARGS)
{
	double		eps = PG_GETARG_FLOAT8(0);

	glue_check_epsilon(eps, 3);
	PG_RETURN_FLOAT8(PG_GETARG_BOOL(1) ? fr_geog_index_expansion(eps) : eps);
}

/*
 * The lossy index condition for frechet_at_most on an index of our own
 * operator classes (geo_gist.c): key |~~| frechet_reach(other, eps), the
 * test of first vertices, last vertices and box sides.  NIL when the
 * index's operator family has no |~~| for (keytype, frechet_key).
 */
static List *
reach_index_condition(SupportRequestIndexCondition *req, Node *key, Node *other,
					  Node *eps, Oid keytype)
{
	Oid			argtypes[2] = {keytype, FLOAT8OID};
	Oid			reachfn,
				reachtype,
				opno;
	Expr	   *reach;

	/* frechet_reach(geometry|geography, float8) lives beside frechet_at_most */
	reachfn = LookupFuncName(list_make2(makeString(get_namespace_name(get_func_namespace(req->funcid))),
										makeString("frechet_reach")),
							 2, argtypes, true);
	if (!OidIsValid(reachfn))
		return NIL;
	reachtype = get_func_rettype(reachfn);
	opno = get_opfamily_member(req->opfamily, keytype, reachtype, FRECHET_STRATEGY_REACH);
	if (!OidIsValid(opno))
		return NIL;
	reach = (Expr *) makeFuncExpr(reachfn, reachtype, list_make2(other, eps),
								  InvalidOid, InvalidOid, COERCE_EXPLICIT_CALL);
	req->lossy = true;
	return list_make1(make_opclause(opno, BOOLOID, false, (Expr *) key, reach,
									InvalidOid, InvalidOid));
}

/*
 * The lossy index condition for frechet_at_most(a, b, eps) on an index of
 * a (or b): key && expand(other, expansion).  A Fréchet distance of at most
 * eps puts every vertex of one curve within eps of the other curve, so the
 * bounding boxes overlap once one is expanded by eps.
 */
static List *
at_most_index_condition(SupportRequestIndexCondition *req)
{
	FuncExpr   *call = (FuncExpr *) req->node;
	Node	   *key,
			   *other,
			   *eps;
	Oid			keytype,
				nsp,
				geometry,
				geography,
				opno,
				expand_fn,
				expansion_fn;
	Oid			argtypes[2];
	bool		geodetic;
	Expr	   *expansion,
			   *expanded;
	List	   *reach;

	if (!IsA(call, FuncExpr) || list_length(call->args) != 3 || req->indexarg > 1)
		return NIL;
	key = list_nth(call->args, req->indexarg);
	other = list_nth(call->args, 1 - req->indexarg);
	eps = list_nth(call->args, 2);
	if (!is_pseudo_constant_for_index(req->root, other, req->index) ||
		!is_pseudo_constant_for_index(req->root, eps, req->index))
		return NIL;

	nsp = postgis_namespace();
	geometry = postgis_type(nsp, "geometry");
	geography = postgis_type(nsp, "geography");
	keytype = exprType(key);
	if (keytype != geometry && keytype != geography)
		return NIL;
	geodetic = (keytype == geography);

	/* an index of frechet_geometry_ops or frechet_geography_ops: key |~~| frechet_reach(other, eps) */
	reach = reach_index_condition(req, key, other, eps, keytype);
	if (reach != NIL)
		return reach;

	/* && of the postgis schema; only if the index's operator family has it */
	opno = OpernameGetOprid(list_make2(makeString(get_namespace_name(nsp)), makeString("&&")),
							keytype, keytype);
	if (!OidIsValid(opno) || !op_in_opfamily(opno, req->opfamily))
		return NIL;

	argtypes[0] = keytype;
	argtypes[1] = FLOAT8OID;
	expand_fn = schema_function(nsp, geodetic ? "_st_expand" : "st_expand", 2, argtypes);
	argtypes[0] = FLOAT8OID;
	argtypes[1] = BOOLOID;
	expansion_fn = schema_function(get_func_namespace(req->funcid),
								   "frechet_index_expansion", 2, argtypes);

	expansion = (Expr *) makeFuncExpr(expansion_fn, FLOAT8OID,
									  list_make2(eps, makeBoolConst(geodetic, false)),
									  InvalidOid, InvalidOid, COERCE_EXPLICIT_CALL);
	expanded = (Expr *) makeFuncExpr(expand_fn, keytype,
									 list_make2(other, expansion),
									 InvalidOid, InvalidOid, COERCE_EXPLICIT_CALL);
	req->lossy = true;
	return list_make1(make_opclause(opno, BOOLOID, false, (Expr *) key, expanded,
									InvalidOid, InvalidOid));
}

PG_FUNCTION_INFO_V1(frechet_geo_at_most_support);
/* Planner support for frechet_at_most on geometry and geography: index conditions. */
Datum
frechet_geo_at_most_support(PG_FUNCTION_ARGS)
{
	Node	   *rawreq = (Node *) PG_GETARG_POINTER(0);

	if (IsA(rawreq, SupportRequestSimplify))
		glue_check_constant_epsilon(rawreq);
	if (IsA(rawreq, SupportRequestIndexCondition))
	{
		List	   *conds = at_most_index_condition((SupportRequestIndexCondition *) rawreq);

		if (conds != NIL)
			PG_RETURN_POINTER(conds);
	}
	PG_RETURN_POINTER(NULL);
}

PG_FUNCTION_INFO_V1(frechet_geojson_check_srid);
/*
 * frechet_geojson_check_srid(srid, known): true, or 22023 when the SRID of
 * a geometry that GeoJSON needs in WGS84 is not in spatial_ref_sys (known
 * is whether it is), so ST_Transform could only fail with an internal
 * error.  Used by frechet_geometry_geojson.
 */
Datum
frechet_geojson_check_srid(PG_FUNCTION_ARGS)
{
	int32		srid = PG_GETARG_INT32(0);

	if (!PG_GETARG_BOOL(1))
		ereport(ERROR,
				(errcode(ERRCODE_INVALID_PARAMETER_VALUE),
				 errmsg("cannot write GeoJSON of a geometry with SRID %d", srid),
				 errdetail("GeoJSON needs WGS84 longitude and latitude, and SRID %d is not in spatial_ref_sys, so the geometry cannot be transformed.", srid),
				 errhint("Add the SRID's definition to spatial_ref_sys, or use ST_SetSRID(g, 0) to write the coordinates as stored.")));
	PG_RETURN_BOOL(true);
}
