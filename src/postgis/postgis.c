/*
 * postgis.c - the PostGIS codec's decoding: geometry, geography and EWKB
 * values as tracks.
 *
 * This library neither includes PostGIS headers nor links PostGIS.  A
 * geometry or geography argument reaches us as an opaque varlena; we call
 * PostGIS's own ST_AsEWKB on it through the function manager (looked up in
 * the schema of the postgis extension, never through search_path) and
 * decode the EWKB ourselves (ewkb.c).  Geography becomes Earth-centred
 * metres, its long edges cut along their geodesics (geodesy.c).
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
#include "parser/parse_func.h"
#include "utils/builtins.h"
#include "utils/fmgroids.h"
#include "utils/lsyscache.h"
#include "utils/memutils.h"
#include "utils/syscache.h"

#include "postgis.h"
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
Oid
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
Oid
postgis_type(Oid nsp, const char *name)
{
	Oid			typ = GetSysCacheOid2(TYPENAMENSP, Anum_pg_type_oid,
									  CStringGetDatum(name), ObjectIdGetDatum(nsp));

	if (!OidIsValid(typ))
		elog(ERROR, "type %s not found in the schema of postgis", name);
	return typ;
}

/* OID of a function of the given schema, by name and argument types. */
Oid
postgis_schema_function(Oid nsp, const char *name, int nargs, Oid *argtypes)
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

	fmgr_info_cxt(postgis_schema_function(nsp, "st_asewkb", 1, &geometry),
				  &calls->as_ewkb, mcxt);
	fmgr_info_cxt(postgis_schema_function(nsp, "geometry", 1, &geography),
				  &calls->to_geometry, mcxt);
	fmgr_info_cxt(postgis_schema_function(nsp, "st_geomfromewkb", 1, &bytea_type),
				  &calls->from_ewkb, mcxt);
	fmgr_info_cxt(postgis_schema_function(nsp, "geography", 1, &geometry),
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
static bytea *
geo_datum_ewkb(postgis_calls *calls, Datum g, bool geography)
{
	if (geography)
		g = FunctionCall1(&calls->to_geometry, g);
	return DatumGetByteaPP(FunctionCall1(&calls->as_ewkb, g));
}

/*
 * Checks that two decoded curves agree on SRID and, for geometry, on
 * dimension (geography ignores Z: its distances are on the ellipsoid).
 */
void
postgis_check_pair(const track_input *a, const track_input *b, bool earth)
{
	if (a->srid != b->srid)
		ereport(ERROR,
				(errcode(ERRCODE_INVALID_PARAMETER_VALUE),
				 errmsg("curves must have the same SRID"),
				 errdetail("Argument 1 has SRID %d and argument 2 has SRID %d.",
						   a->srid, b->srid),
				 errhint("Transform one of them first, e.g. with ST_Transform.")));
	if (a->dim != b->dim && !earth)
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
void
postgis_note_degrees(FunctionCallInfo fcinfo, int32 srid)
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
 * A geometry, geography or EWKB (bytea) value as given: a bad one goes to
 * rep (false).  calls may be NULL for EWKB.
 */
bool
postgis_decode_input(postgis_calls *calls, Datum value, track_type type, track_report *rep,
					 track_input *in)
{
	bytea	   *ewkb;
	bool		ok;

	if (track_type_postgis(type))
		ewkb = geo_datum_ewkb(calls, value, type == TRACK_GEOGRAPHY);
	else
		ewkb = DatumGetByteaPP(value);
	ok = ewkb_decode_track((const uint8 *) VARDATA_ANY(ewkb), VARSIZE_ANY_EXHDR(ewkb), rep, in);
	if (track_type_postgis(type))
		pfree(ewkb);
	return ok;
}

/*
 * The engine's curve of a decoded value: planar input as it is; lon/lat
 * as Earth-centred metres, edges cut along their geodesics when geodesic
 * (t->first then maps input vertices to engine ones).  A longitude or
 * latitude out of range goes to rep (false).
 */
bool
postgis_engine_curve(glue_track *t, bool geodesic, track_report *rep)
{
	t->first = NULL;
	t->curve.n = t->in.n;
	if (!track_type_earth(t->type))
	{
		t->curve.coords = t->in.coords;
		t->curve.dim = t->in.dim;
		return true;
	}
	return lonlat_track(&t->in, rep, geodesic, &t->curve, &t->first);
}

/* A geometry (or, when geography, a geography) made by PostGIS from EWKB. */
Datum
postgis_from_ewkb(FunctionCallInfo fcinfo, bytea *ewkb, bool geography)
{
	postgis_calls *calls = geo_calls_for(fcinfo);
	Datum		g = FunctionCall1(&calls->from_ewkb, PointerGetDatum(ewkb));

	return geography ? FunctionCall1(&calls->to_geography, g) : g;
}
