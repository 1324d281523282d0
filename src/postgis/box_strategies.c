/*
 * box_strategies.c - what PostGIS's own index machinery needs of the
 * Fréchet operator classes on geometry and geography, and of
 * frechet_at_most on PostGIS's own index: box strategies in our classes
 * (see below), and "key && expand(other, eps)" where only PostGIS's
 * class indexes the column.
 */
#include "postgres.h"

#include <float.h>
#include <math.h>

#include "access/gist.h"
#include "access/htup_details.h"
#include "access/stratnum.h"
#include "catalog/pg_type.h"
#include "nodes/makefuncs.h"
#include "nodes/nodeFuncs.h"
#include "nodes/value.h"
#include "optimizer/optimizer.h"
#include "parser/parse_func.h"
#include "parser/parse_oper.h"
#include "utils/float.h"
#include "utils/lsyscache.h"
#include "utils/memutils.h"
#include "utils/syscache.h"

#include "bounds.h"
#include "postgis.h"
#include "geodesy.h"

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
	glue_bytes	query;			/* the query datum's bytes, as passed */
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

	if (bq != NULL && bq->subtype == subtype && glue_bytes_same(&bq->query, query))
		return bq;
	if (bq == NULL || bq->subtype != subtype)
	{
		bq = MemoryContextAllocZero(fcinfo->flinfo->fn_mcxt, sizeof(box_query));
		box_query_init(bq, subtype, fcinfo->flinfo->fn_mcxt);
		fcinfo->flinfo->fn_extra = bq;
	}
	glue_bytes_forget(&bq->query);
	box_query_decode(bq, query);
	glue_bytes_keep(&bq->query, query, fcinfo->flinfo->fn_mcxt);
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
postgis_box_consistent(FunctionCallInfo fcinfo, const fr_key *key)
{
	GISTENTRY  *entry = (GISTENTRY *) PG_GETARG_POINTER(0);
	StrategyNumber strategy = (StrategyNumber) PG_GETARG_UINT16(2);
	Oid			subtype = PG_GETARG_OID(3);
	bool	   *recheck = (bool *) PG_GETARG_POINTER(4);
	box_query  *bq = box_query_get(fcinfo, PG_GETARG_DATUM(1), subtype);
	plane_box	node;

	*recheck = true;
	if (!bq->known || !entry_box(key, bq->geodetic, &node))
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

/*
 * The lossy index condition for frechet_at_most(a, b, eps) on an index of
 * a (or b) that is not of our classes, PostGIS's own: key && expand(other,
 * expansion); NIL when the column is not geometry or geography, or the
 * index's operator family has no &&.  A Fréchet distance of at most
 * eps puts every vertex of one curve within eps of the other curve, so the
 * bounding boxes overlap once one is expanded by eps.
 */
List *
postgis_box_index_condition(SupportRequestIndexCondition *req, Node *key, Node *other, Node *eps)
{
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

	nsp = postgis_namespace();
	geometry = postgis_type(nsp, "geometry");
	geography = postgis_type(nsp, "geography");
	keytype = exprType(key);
	if (keytype != geometry && keytype != geography)
		return NIL;
	geodetic = (keytype == geography);

	/* && of the postgis schema; only if the index's operator family has it */
	opno = OpernameGetOprid(list_make2(makeString(get_namespace_name(nsp)), makeString("&&")),
							keytype, keytype);
	if (!OidIsValid(opno) || !op_in_opfamily(opno, req->opfamily))
		return NIL;

	argtypes[0] = keytype;
	argtypes[1] = FLOAT8OID;
	expand_fn = postgis_schema_function(nsp, geodetic ? "_st_expand" : "st_expand", 2, argtypes);
	argtypes[0] = FLOAT8OID;
	argtypes[1] = BOOLOID;
	expansion_fn = postgis_schema_function(get_func_namespace(req->funcid),
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

