/*
 * gist.c - the GiST operator classes: frechet_track_ops on point[],
 * frechet_geometry_ops and frechet_geography_ops, one implementation for
 * the three (only compress and distance decode, through the track layer).
 *
 * Each entry is a frechet_key: for a leaf, the summary of one track (first
 * vertex, last vertex, bounding box); for an inner node, the ranges those
 * quantities take under it.  Range queries ("track |~~| frechet_reach(route,
 * eps)", which the planner support function derives from frechet_at_most)
 * descend into every entry whose lower bound is within eps.  k-nearest
 * queries ("ORDER BY track <-> route") get a lower bound of the Fréchet
 * distance as the entry's distance, with recheck, so the executor reorders
 * by the exact distance.
 */
#include "postgres.h"

#include "access/gist.h"
#include "access/stratnum.h"
#include "utils/array.h"
#include "utils/float.h"
#include "utils/memutils.h"
#include "utils/sortsupport.h"

#include "index.h"
#include "postgis.h"

/* GiST compress: leaf entries become the summary of their track (invalid ones: the all-covering key). */
static Datum
gist_compress_as(FunctionCallInfo fcinfo, track_type type, gist_key_format format)
{
	GISTENTRY  *entry = (GISTENTRY *) PG_GETARG_POINTER(0);
	GISTENTRY  *out;
	fr_key		key;

	if (!entry->leafkey)
		PG_RETURN_POINTER(entry);
	track_stored_key(track_calls(fcinfo, type), entry->key, type, &key);
	out = palloc(sizeof(GISTENTRY));
	gistentryinit(*out, frechet_index_key_make(&key, format), entry->rel, entry->page, entry->offset, false);
	PG_RETURN_POINTER(out);
}

static Datum
gist_compress(FunctionCallInfo fcinfo, track_type type)
{
	return gist_compress_as(fcinfo, type, GIST_KEY_WIDE);
}

static Datum
gist_compress_packed(FunctionCallInfo fcinfo, track_type type)
{
	return gist_compress_as(fcinfo, type, GIST_KEY_PACKED);
}

/*
 * May an entry hold a track within the query's reach?  Exact on leaves.
 * kind_known: the query key must be of the given kind of coordinates.
 * The geometry and geography classes share this function; their box
 * strategies go to postgis_box_consistent.
 */
static Datum
gist_consistent(FunctionCallInfo fcinfo, bool kind_known, frechet_key_kind kind, gist_key_format format)
{
	GISTENTRY  *entry = (GISTENTRY *) PG_GETARG_POINTER(0);
	StrategyNumber strategy = (StrategyNumber) PG_GETARG_UINT16(2);
	bool	   *recheck = (bool *) PG_GETARG_POINTER(4);
	fr_key		keybuf;
	fr_key	   *key = &keybuf;
	fr_key	   *query;

	frechet_index_key_read(entry->key, format, &keybuf);
	/* PostGIS's box operators, in the classes on geometry and geography */
	if (FRECHET_IS_BOX_STRATEGY(strategy))
		return postgis_box_consistent(fcinfo, key);
	query = PG_GETARG_FRECHET_KEY(1);
	if (kind_known)
		frechet_key_check_kind(query, kind, 0);

	/*
	 * On a leaf this is the very test of the strategy's operator (|~~|,
	 * |~~~|, |~~>|), so no recheck of it is needed; frechet_at_most,
	 * frechet_pings_at_most or frechet_passes still runs as the filter.
	 */
	*recheck = false;
	PG_RETURN_BOOL(frechet_key_admits(key, query, strategy));
}

/* Does a stored key pass the test of a range strategy with the query key? */
bool
frechet_key_admits(const fr_key *key, const fr_key *query, StrategyNumber strategy)
{
	switch (strategy)
	{
		case FRECHET_STRATEGY_REACH:
			return fr_key_bound(key, query) <= frechet_key_reach(query);
		case FRECHET_STRATEGY_PINGS:
			return frechet_key_ping_bound(key, query) <= frechet_key_reach(query);
		case FRECHET_STRATEGY_PASSES:
			return fr_key_passage_bound(key, query) <= frechet_key_reach(query);
	}
	elog(ERROR, "Fréchet operator classes: unknown strategy number %d", strategy);
	return false;				/* keep compilers quiet */
}

PG_FUNCTION_INFO_V1(frechet_gist_consistent);
/*
 * GiST consistent of release 0.1's operator classes, which do not say
 * their kind of coordinates: no check of the query key's kind.
 */
Datum
frechet_gist_consistent(PG_FUNCTION_ARGS)
{
	return gist_consistent(fcinfo, false, FRECHET_KEY_PLANAR, GIST_KEY_WIDE);
}

PG_FUNCTION_INFO_V1(frechet_gist_consistent_planar);
/* GiST consistent of frechet_track_ops and frechet_geometry_ops: planar query keys only. */
Datum
frechet_gist_consistent_planar(PG_FUNCTION_ARGS)
{
	return gist_consistent(fcinfo, true, FRECHET_KEY_PLANAR, GIST_KEY_WIDE);
}

PG_FUNCTION_INFO_V1(frechet_gist_consistent_earth);
/* GiST consistent of frechet_geography_ops: Earth-centred query keys only. */
Datum
frechet_gist_consistent_earth(PG_FUNCTION_ARGS)
{
	return gist_consistent(fcinfo, true, FRECHET_KEY_EARTH, GIST_KEY_WIDE);
}

PG_FUNCTION_INFO_V1(frechet_gist_consistent_packed_planar);
/* GiST consistent of 0.2's frechet_track_ops and frechet_geometry_ops (packed keys). */
Datum
frechet_gist_consistent_packed_planar(PG_FUNCTION_ARGS)
{
	return gist_consistent(fcinfo, true, FRECHET_KEY_PLANAR, GIST_KEY_PACKED);
}

PG_FUNCTION_INFO_V1(frechet_gist_consistent_packed_earth);
/* GiST consistent of 0.2's frechet_geography_ops (packed keys). */
Datum
frechet_gist_consistent_packed_earth(PG_FUNCTION_ARGS)
{
	return gist_consistent(fcinfo, true, FRECHET_KEY_EARTH, GIST_KEY_PACKED);
}

/* The key covering a set of entries. */
static Datum
gist_union(FunctionCallInfo fcinfo, gist_key_format format)
{
	GistEntryVector *entryvec = (GistEntryVector *) PG_GETARG_POINTER(0);
	int		   *size = (int *) PG_GETARG_POINTER(1);
	fr_key		acc,
				k;
	Datum		out;

	frechet_index_key_read(entryvec->vector[0].key, format, &acc);
	for (int i = 1; i < entryvec->n; i++)
	{
		frechet_index_key_read(entryvec->vector[i].key, format, &k);
		fr_key_union(&acc, &k);
	}
	out = frechet_index_key_make(&acc, format);
	*size = format == GIST_KEY_WIDE ? sizeof(fr_key) : VARSIZE(DatumGetPointer(out));
	PG_RETURN_DATUM(out);
}

/* Cost of adding an entry under a node: growth of the node's summed interval lengths. */
static Datum
gist_penalty(FunctionCallInfo fcinfo, gist_key_format format)
{
	GISTENTRY  *orig = (GISTENTRY *) PG_GETARG_POINTER(0);
	GISTENTRY  *add = (GISTENTRY *) PG_GETARG_POINTER(1);
	float	   *result = (float *) PG_GETARG_POINTER(2);
	fr_key		ko,
				ka;

	frechet_index_key_read(orig->key, format, &ko);
	frechet_index_key_read(add->key, format, &ka);
	*result = (float) fr_key_penalty(&ko, &ka);
	PG_RETURN_POINTER(result);
}

/* An entry of a page being split, with its position along one interval. */
typedef struct split_item
{
	double		center;
	OffsetNumber off;
} split_item;

/* Orders split items by center. */
static int
split_item_cmp(const void *a, const void *b)
{
	double		x = ((const split_item *) a)->center,
				y = ((const split_item *) b)->center;

	return x < y ? -1 : x > y ? 1 : 0;
}

/* Midpoint of an interval; an interval infinite on both sides sorts last. */
static double
interval_center(const fr_key *k, int dim)
{
	double		c = k->lo[dim] / 2 + k->hi[dim] / 2;

	return isnan(c) ? get_float8_infinity() : c;
}

/*
 * Splits a page: for each of the key's intervals, sort the entries by its
 * midpoint and try every cut that leaves 30-70 % on each side; keep the cut
 * whose two halves have the smallest summed margins (the margin criterion
 * of the R*-tree, Beckmann, Kriegel, Schneider & Seeger 1990).
 */
static Datum
gist_picksplit(FunctionCallInfo fcinfo, gist_key_format format)
{
	GistEntryVector *entryvec = (GistEntryVector *) PG_GETARG_POINTER(0);
	GIST_SPLITVEC *v = (GIST_SPLITVEC *) PG_GETARG_POINTER(1);
	int			n = entryvec->n - FirstOffsetNumber;
	fr_key	   *keys = palloc(entryvec->n * sizeof(fr_key));	/* by offset */
	split_item *items = palloc(n * sizeof(split_item));
	split_item *best_items = palloc(n * sizeof(split_item));
	fr_key	   *prefix = palloc(n * sizeof(fr_key));
	fr_key	   *suffix = palloc(n * sizeof(fr_key));
	double		best_cost = get_float8_infinity();
	int			best_cut = n / 2;
	int			min_cut = Max(1, (n * 3) / 10),
				max_cut = Min(n - 1, n - (n * 3) / 10);
	fr_key	   *left = palloc(sizeof(fr_key)),
			   *right = palloc(sizeof(fr_key));

	for (int i = 0; i < n; i++)
	{
		best_items[i].off = i + FirstOffsetNumber;
		best_items[i].center = 0;
		frechet_index_key_read(entryvec->vector[i + FirstOffsetNumber].key, format, &keys[i + FirstOffsetNumber]);
	}
	for (int dim = 0; dim < FR_KEY_NDIM; dim++)
	{
		for (int i = 0; i < n; i++)
		{
			items[i].off = i + FirstOffsetNumber;
			items[i].center = interval_center(&keys[items[i].off], dim);
		}
		qsort(items, n, sizeof(split_item), split_item_cmp);
		for (int i = 0; i < n; i++)
		{
			prefix[i] = keys[items[i].off];
			if (i > 0)
				fr_key_union(&prefix[i], &prefix[i - 1]);
		}
		for (int i = n - 1; i >= 0; i--)
		{
			suffix[i] = keys[items[i].off];
			if (i < n - 1)
				fr_key_union(&suffix[i], &suffix[i + 1]);
		}
		for (int cut = min_cut; cut <= max_cut; cut++)
		{
			double		cost = fr_key_margin(&prefix[cut - 1]) + fr_key_margin(&suffix[cut]);

			/* with infinite margins everywhere, the first cut of the first interval stays */
			if (cost < best_cost)
			{
				best_cost = cost;
				best_cut = cut;
				memcpy(best_items, items, n * sizeof(split_item));
			}
		}
	}

	v->spl_left = palloc(n * sizeof(OffsetNumber));
	v->spl_right = palloc(n * sizeof(OffsetNumber));
	v->spl_nleft = v->spl_nright = 0;
	for (int i = 0; i < n; i++)
	{
		const fr_key *k = &keys[best_items[i].off];

		if (i < best_cut)
		{
			if (v->spl_nleft == 0)
				*left = *k;
			else
				fr_key_union(left, k);
			v->spl_left[v->spl_nleft++] = best_items[i].off;
		}
		else
		{
			if (v->spl_nright == 0)
				*right = *k;
			else
				fr_key_union(right, k);
			v->spl_right[v->spl_nright++] = best_items[i].off;
		}
	}
	v->spl_ldatum = frechet_index_key_make(left, format);
	v->spl_rdatum = frechet_index_key_make(right, format);
	pfree(left);
	pfree(right);
	pfree(keys);
	pfree(items);
	pfree(best_items);
	pfree(prefix);
	pfree(suffix);
	PG_RETURN_POINTER(v);
}

/* Are two keys the same? */
static Datum
gist_same(FunctionCallInfo fcinfo, gist_key_format format)
{
	fr_key		a,
				b;
	bool	   *result = (bool *) PG_GETARG_POINTER(2);

	frechet_index_key_read(PG_GETARG_DATUM(0), format, &a);
	frechet_index_key_read(PG_GETARG_DATUM(1), format, &b);
	*result = fr_key_equal(&a, &b);
	PG_RETURN_POINTER(result);
}

/*
 * union, penalty, picksplit and same in both formats: release 0.1's
 * classes (frechet_key, the plain names) and 0.2's (frechet_summary).
 */
#define GIST_FUNCTION_FORMATS(name, impl) \
PG_FUNCTION_INFO_V1(name); \
Datum name(PG_FUNCTION_ARGS) { return impl(fcinfo, GIST_KEY_WIDE); } \
PG_FUNCTION_INFO_V1(name##_packed); \
Datum name##_packed(PG_FUNCTION_ARGS) { return impl(fcinfo, GIST_KEY_PACKED); }

GIST_FUNCTION_FORMATS(frechet_gist_union, gist_union)
GIST_FUNCTION_FORMATS(frechet_gist_penalty, gist_penalty)
GIST_FUNCTION_FORMATS(frechet_gist_picksplit, gist_picksplit)
GIST_FUNCTION_FORMATS(frechet_gist_same, gist_same)

/*
 * The query route of a k-nearest scan, decoded once: its summary and the
 * convex hull of its x,y.  Kept in fn_extra and reused while the query
 * value has the same bytes (a new value, after a rescan, is decoded again).
 */
typedef struct route_cache
{
	struct postgis_calls *calls;	/* PostGIS types: look-ups in fn_mcxt */
	glue_bytes	query;			/* the query datum's bytes, as passed */
	fr_key		key;
	double	   *hull;
	size_t		nhull;
} route_cache;

/* The decoded query route, from the cache when its bytes are unchanged. */
static route_cache *
route_cache_get(FunctionCallInfo fcinfo, Datum query, track_type type)
{
	route_cache *rc = (route_cache *) fcinfo->flinfo->fn_extra;
	/* the route is the right operand of track <-> route: argument 2 */
	track_report rep = {.argno = 2};
	MemoryContext old;
	glue_track	t;
	double	   *sorted;

	if (rc != NULL && glue_bytes_same(&rc->query, query))
		return rc;
	if (rc == NULL)
	{
		rc = MemoryContextAllocZero(fcinfo->flinfo->fn_mcxt, sizeof(route_cache));
		if (track_type_postgis(type))
			rc->calls = geo_postgis_calls_new(fcinfo->flinfo->fn_mcxt);
		fcinfo->flinfo->fn_extra = rc;
	}
	glue_bytes_forget(&rc->query);
	if (rc->hull != NULL)
		pfree(rc->hull);
	rc->hull = NULL;

	track_decode_value(rc->calls, query, type, TRACK_GEODESIC, &rep, &t);
	track_key_of(&t, &rc->key);
	old = MemoryContextSwitchTo(fcinfo->flinfo->fn_mcxt);
	sorted = palloc(2 * t.curve.n * sizeof(double));
	rc->hull = palloc(4 * t.curve.n * sizeof(double));
	rc->nhull = fr_convex_hull(&t.curve, sorted, rc->hull);
	pfree(sorted);
	MemoryContextSwitchTo(old);
	glue_bytes_keep(&rc->query, query, fcinfo->flinfo->fn_mcxt);
	track_free(&t);
	return rc;
}

/*
 * GiST distance: a lower bound of the Fréchet distance from the query
 * route to every track under the entry (metres for geography); the
 * executor rechecks leaves with the exact distance and reorders.
 */
static Datum
gist_distance_as(FunctionCallInfo fcinfo, track_type type, gist_key_format format)
{
	GISTENTRY  *entry = (GISTENTRY *) PG_GETARG_POINTER(0);
	StrategyNumber strategy = (StrategyNumber) PG_GETARG_UINT16(2);
	bool	   *recheck = (bool *) PG_GETARG_POINTER(4);
	route_cache *rc;
	double		d;
	fr_key		key;

	if (strategy != FRECHET_STRATEGY_DISTANCE && strategy != FRECHET_STRATEGY_PASSAGE_DISTANCE)
		elog(ERROR, "Fréchet operator classes: unknown ordering strategy number %d", strategy);
	rc = route_cache_get(fcinfo, PG_GETARG_DATUM(1), type);
	*recheck = true;
	frechet_index_key_read(entry->key, format, &key);
	if (strategy == FRECHET_STRATEGY_PASSAGE_DISTANCE)
		d = fr_key_passage_hull_bound(&key, &rc->key, rc->hull, rc->nhull);
	else
		d = fr_key_hull_bound(&key, &rc->key, rc->hull, rc->nhull);
	/* metres grow with the chord, so a lower bound of the chord gives one of the metres */
	PG_RETURN_FLOAT8(track_out_distance(type, d));
}

/* The support functions that decode: one per operator class (frechet_track_ops has no suffix). */
PG_FUNCTION_INFO_V1(frechet_gist_compress);
Datum
frechet_gist_compress(PG_FUNCTION_ARGS)
{
	return gist_compress(fcinfo, TRACK_POINTS);
}

static Datum
gist_distance(FunctionCallInfo fcinfo, track_type type)
{
	return gist_distance_as(fcinfo, type, GIST_KEY_WIDE);
}

static Datum
gist_distance_packed(FunctionCallInfo fcinfo, track_type type)
{
	return gist_distance_as(fcinfo, type, GIST_KEY_PACKED);
}

PG_FUNCTION_INFO_V1(frechet_gist_distance);
Datum
frechet_gist_distance(PG_FUNCTION_ARGS)
{
	return gist_distance(fcinfo, TRACK_POINTS);
}

/* 0.2's classes store packed keys: frechet_gist_compress_packed_point_array and so on. */
TRACK_FUNCTIONS_POSTGIS(frechet_gist_compress, gist_compress)
TRACK_FUNCTIONS_POSTGIS(frechet_gist_distance, gist_distance)
TRACK_FUNCTIONS(frechet_gist_compress_packed, gist_compress_packed)
TRACK_FUNCTIONS(frechet_gist_distance_packed, gist_distance_packed)

/*
 * Sorted builds (GiST's support function 11, PostgreSQL 14+): CREATE INDEX
 * sorts the leaf keys along a Hilbert curve through the centres of their
 * boxes and packs them into pages in that order, then builds the upper
 * levels from those pages, instead of inserting one key at a time with
 * penalty and picksplit.  The curve runs over the bit patterns of the
 * centres rounded to float4, mapped so that their order as unsigned
 * integers is the numbers' order; every key gets a place (an all-covering
 * key's centre is NaN, which maps to the curve's end).  Only the order
 * comes from here: the keys and so the answers are the same either way.
 */

/* A float4's bits as an unsigned integer in the order of the numbers (NaN last). */
static uint32
float_order_bits(double v)
{
	float		f = (float) v;
	uint32		u;

	if (isnan(v))
		return PG_UINT32_MAX;
	memcpy(&u, &f, sizeof(u));
	return (u & 0x80000000u) ? ~u : (u | 0x80000000u);
}

/* The distance along the Hilbert curve of order 32 of the cell (x, y) (Hilbert 1891; the iterative form of Butz 1971). */
static uint64
hilbert_index(uint32 x, uint32 y)
{
	uint64		d = 0;

	for (uint32 s = 0x80000000u; s > 0; s >>= 1)
	{
		uint32		rx = (x & s) ? 1 : 0,
					ry = (y & s) ? 1 : 0;

		d += (uint64) s * s * ((3 * rx) ^ ry);
		if (ry == 0)
		{
			uint32		t;

			if (rx == 1)
			{
				x = ~x;
				y = ~y;
			}
			t = x;
			x = y;
			y = t;
		}
	}
	return d;
}

/* The place of a key on the curve: the centre of its box. */
static uint64
key_curve_place(Datum d, SortSupport ssup)
{
	fr_key		key;
	const fr_key *k = &key;
	double		cx,
				cy;

	frechet_index_key_read(d, ssup->ssup_extra == NULL ? GIST_KEY_WIDE : GIST_KEY_PACKED, &key);
	cx = k->lo[FR_KEY_MIN_X] / 2 + k->hi[FR_KEY_MAX_X] / 2;
	cy = k->lo[FR_KEY_MIN_Y] / 2 + k->hi[FR_KEY_MAX_Y] / 2;

	return hilbert_index(float_order_bits(cx), float_order_bits(cy));
}

static int
curve_cmp(uint64 a, uint64 b)
{
	return a < b ? -1 : a > b ? 1 : 0;
}

/* Comparators: on whole keys, and on their abbreviations (the curve place itself). */
static int
key_cmp_full(Datum a, Datum b, SortSupport ssup)
{
	return curve_cmp(key_curve_place(a, ssup), key_curve_place(b, ssup));
}

static int
key_cmp_abbrev(Datum a, Datum b, SortSupport ssup)
{
	return curve_cmp(DatumGetUInt64(a), DatumGetUInt64(b));
}

static Datum
key_abbrev_convert(Datum d, SortSupport ssup)
{
	return UInt64GetDatum(key_curve_place(d, ssup));
}

/* The abbreviation is the whole sort key: never worth abandoning. */
static bool
key_abbrev_abort(int memtupcount, SortSupport ssup)
{
	return false;
}

/* GiST support function 11 of the three classes; ssup_extra non-NULL for packed keys. */
static Datum
gist_sortsupport(FunctionCallInfo fcinfo, gist_key_format format)
{
	SortSupport ssup = (SortSupport) PG_GETARG_POINTER(0);
	static const int packed_mark = 1;

	ssup->ssup_extra = format == GIST_KEY_PACKED ? (void *) &packed_mark : NULL;
	/* the abbreviation is 64 bits: only where a Datum holds them */
	if (ssup->abbreviate && SIZEOF_DATUM >= 8)
	{
		ssup->comparator = key_cmp_abbrev;
		ssup->abbrev_converter = key_abbrev_convert;
		ssup->abbrev_abort = key_abbrev_abort;
		ssup->abbrev_full_comparator = key_cmp_full;
	}
	else
		ssup->comparator = key_cmp_full;
	PG_RETURN_VOID();
}

GIST_FUNCTION_FORMATS(frechet_gist_sortsupport, gist_sortsupport)
