/*
 * ewkb.c - decodes PostGIS Extended WKB (EWKB, as ST_AsEWKB returns it) and
 * ISO/OGC WKB into engine curves.  No PostGIS headers: the format is read
 * from its published description (OGC Simple Features, WKB; PostGIS EWKB
 * flags).  Every read is bounds-checked against the buffer.
 *
 * Accepted: LineString (a curve) and Point (a one-point curve), 2-D or 3-D,
 * either byte order, with or without an SRID.  M values are dropped: the
 * metric uses X, Y and, when present, Z, so XYM counts as 2-D and XYZM as
 * 3-D.  Everything else gets an ERROR.
 */
#include "postgres.h"

#include <math.h>

#include "glue.h"
#include "ewkb.h"

/* EWKB flags in the high bits of the type word (PostGIS). */
#define EWKB_Z 0x80000000u
#define EWKB_M 0x40000000u
#define EWKB_SRID 0x20000000u

/* OGC type codes. */
#define WKB_POINT 1
#define WKB_LINESTRING 2
#define WKB_POLYGON 3
#define WKB_MULTIPOINT 4
#define WKB_MULTILINESTRING 5
#define WKB_MULTIPOLYGON 6
#define WKB_COLLECTION 7

/* A read cursor over the argument's bytes. */
typedef struct wkb_reader
{
	const uint8 *buf;
	size_t		len;
	size_t		pos;
	bool		big_endian;
	int			argno;
	bool		quiet;			/* on bad input set failed instead of raising an ERROR */
	bool		failed;
} wkb_reader;

/* Reports bytes that end before the geometry does. */
static void
truncated(const wkb_reader *r, const char *what)
{
	ereport(ERROR,
			(errcode(ERRCODE_INVALID_BINARY_REPRESENTATION),
			 errmsg("invalid EWKB: data ends too early"),
			 errdetail("Argument %d has %zu bytes and ends inside the %s at byte %zu.",
					   r->argno, r->len, what, r->pos)));
}

/* Bytes that end too early: an ERROR, or in quiet mode a failed reader. */
static void
short_read(wkb_reader *r, const char *what)
{
	if (r->quiet)
		r->failed = true;
	else
		truncated(r, what);
}

/* Reads one byte (0 after a short read in quiet mode). */
static uint8
read_u8(wkb_reader *r, const char *what)
{
	if (r->len - r->pos < 1)
	{
		short_read(r, what);
		return 0;
	}
	return r->buf[r->pos++];
}

/* Reads an unsigned 32-bit integer in the reader's byte order. */
static uint32
read_u32(wkb_reader *r, const char *what)
{
	const uint8 *p;

	if (r->len - r->pos < 4)
	{
		short_read(r, what);
		return 0;
	}
	p = r->buf + r->pos;
	r->pos += 4;
	if (r->big_endian)
		return ((uint32) p[0] << 24) | ((uint32) p[1] << 16) | ((uint32) p[2] << 8) | p[3];
	return ((uint32) p[3] << 24) | ((uint32) p[2] << 16) | ((uint32) p[1] << 8) | p[0];
}

/* Reads an IEEE 754 double in the reader's byte order (no bounds check: callers check). */
static double
read_f64_unchecked(wkb_reader *r)
{
	const uint8 *p = r->buf + r->pos;
	uint64		u = 0;
	double		d;

	for (int i = 0; i < 8; i++)
		u = (u << 8) | p[r->big_endian ? i : 7 - i];
	r->pos += 8;
	memcpy(&d, &u, sizeof(d));
	return d;
}

/* Reads the byte order marker: 0 big-endian (XDR), 1 little-endian (NDR); false if bad (quiet). */
static bool
read_byte_order(wkb_reader *r)
{
	uint8		bo = read_u8(r, "byte order marker");

	if (r->failed)
		return false;
	if (bo > 1 && r->quiet)
		return false;
	if (bo > 1)
		ereport(ERROR,
				(errcode(ERRCODE_INVALID_BINARY_REPRESENTATION),
				 errmsg("invalid EWKB: unknown byte order marker"),
				 errdetail("Argument %d has byte order marker %u at byte %zu; WKB allows 0 or 1.",
						   r->argno, bo, r->pos - 1)));
	r->big_endian = (bo == 0);
	return true;
}

/* Name of an OGC geometry type code, for messages. */
static const char *
type_name(uint32 base)
{
	switch (base)
	{
		case WKB_POINT:
			return "Point";
		case WKB_LINESTRING:
			return "LineString";
		case WKB_POLYGON:
			return "Polygon";
		case WKB_MULTIPOINT:
			return "MultiPoint";
		case WKB_MULTILINESTRING:
			return "MultiLineString";
		case WKB_MULTIPOLYGON:
			return "MultiPolygon";
		case WKB_COLLECTION:
			return "GeometryCollection";
		case 8:
			return "CircularString";
		case 9:
			return "CompoundCurve";
		case 10:
			return "CurvePolygon";
		case 11:
			return "MultiCurve";
		case 12:
			return "MultiSurface";
		case 15:
			return "PolyhedralSurface";
		case 16:
			return "TIN";
		case 17:
			return "Triangle";
		default:
			return NULL;
	}
}

/* Rejects a geometry type other than Point and LineString, with advice. */
static void
reject_type(const wkb_reader *r, uint32 base)
{
	const char *name = type_name(base);

	if (name == NULL)
		ereport(ERROR,
				(errcode(ERRCODE_INVALID_BINARY_REPRESENTATION),
				 errmsg("invalid EWKB: unknown geometry type code %u", base),
				 errdetail("Argument %d has a type code that neither OGC WKB nor EWKB defines.",
						   r->argno)));
	if (base == WKB_MULTILINESTRING)
		ereport(ERROR,
				(errcode(ERRCODE_INVALID_PARAMETER_VALUE),
				 errmsg("curve must be a LineString or a Point, not a MultiLineString"),
				 errdetail("Argument %d is a MultiLineString.", r->argno),
				 errhint("Merge it into one line first, e.g. with ST_LineMerge, or pick one part with ST_GeometryN.")));
	ereport(ERROR,
			(errcode(ERRCODE_INVALID_PARAMETER_VALUE),
			 errmsg("curve must be a LineString or a Point, not a %s", name),
			 errdetail("Argument %d is a %s.", r->argno, name)));
}

/* Is a coordinate finite and within the engine's range? */
static bool
coordinate_ok(double v)
{
	/* fabs(NaN) <= limit is false */
	return fabs(v) <= FR_MAX_ABS_COORD;
}

/* Rejects NaN, infinite and huge coordinates, naming the vertex (1-based). */
static void
check_coordinate(double v, int argno, size_t vertex)
{
	if (isnan(v) || isinf(v))
		ereport(ERROR,
				(errcode(ERRCODE_DATA_EXCEPTION),
				 errmsg("curve coordinates must be finite"),
				 errdetail("Argument %d has a NaN or infinite coordinate at vertex %zu.",
						   argno, vertex)));
	if (fabs(v) > FR_MAX_ABS_COORD)
		ereport(ERROR,
				(errcode(ERRCODE_NUMERIC_VALUE_OUT_OF_RANGE),
				 errmsg("curve coordinate out of range"),
				 errdetail("Argument %d has a coordinate of magnitude above %g at vertex %zu.",
						   argno, FR_MAX_ABS_COORD, vertex)));
}

/*
 * Decodes one EWKB or ISO WKB Point or LineString from the reader's bytes
 * into out: coordinates palloc'd, X Y [Z] per vertex, M dropped.  Bad input
 * raises an ERROR naming the argument, or in quiet mode returns false.
 */
static bool
decode(wkb_reader *r, ewkb_curve *out)
{
	int			argno = r->argno;
	uint32		type,
				base,
				iso;
	bool		has_z,
				has_m;
	int			stride,
				dim;
	uint32		npoints;
	double	   *coords;

	if (!read_byte_order(r))
		return false;
	type = read_u32(r, "geometry type");
	if (r->failed)
		return false;
	has_z = (type & EWKB_Z) != 0;
	has_m = (type & EWKB_M) != 0;
	out->has_srid = (type & EWKB_SRID) != 0;
	type &= 0x0fffffffu;
	/* ISO WKB: 1000s are Z, 2000s M, 3000s ZM */
	iso = type / 1000;
	base = type % 1000;
	if (iso > 3 || (iso > 0 && (has_z || has_m)))
	{
		if (r->quiet)
			return false;
		ereport(ERROR,
				(errcode(ERRCODE_INVALID_BINARY_REPRESENTATION),
				 errmsg("invalid EWKB: unknown geometry type code %u", type),
				 errdetail("Argument %d mixes ISO and EWKB dimension flags or uses an unknown code.",
						   argno)));
	}
	has_z = has_z || iso == 1 || iso == 3;
	has_m = has_m || iso == 2 || iso == 3;
	out->srid = 0;
	if (out->has_srid)
	{
		out->srid = (int32) read_u32(r, "SRID");
		if (r->failed)
			return false;
	}
	if (base != WKB_POINT && base != WKB_LINESTRING)
	{
		if (r->quiet)
			return false;
		reject_type(r, base);
	}

	stride = 2 + (has_z ? 1 : 0) + (has_m ? 1 : 0);
	dim = has_z ? 3 : 2;
	if (base == WKB_POINT)
		npoints = 1;
	else
	{
		npoints = read_u32(r, "number of points");
		if (r->failed)
			return false;
	}
	if (npoints == 0)
	{
		if (r->quiet)
			return false;
		ereport(ERROR,
				(errcode(ERRCODE_INVALID_PARAMETER_VALUE),
				 errmsg("curve must have at least one point"),
				 errdetail("Argument %d is an empty LineString.", argno)));
	}
	/* checked before allocating: the bytes must be there */
	if ((r->len - r->pos) / (8 * (size_t) stride) < npoints)
	{
		short_read(r, "coordinates");
		return false;
	}

	coords = palloc(sizeof(double) * dim * (size_t) npoints);
	for (size_t i = 0; i < npoints; i++)
	{
		double		v[4];

		for (int k = 0; k < stride; k++)
			v[k] = read_f64_unchecked(r);
		/* an empty Point is written as all-NaN coordinates (common practice) */
		if (base == WKB_POINT && isnan(v[0]) && isnan(v[1]))
		{
			if (r->quiet)
			{
				pfree(coords);
				return false;
			}
			ereport(ERROR,
					(errcode(ERRCODE_INVALID_PARAMETER_VALUE),
					 errmsg("curve must have at least one point"),
					 errdetail("Argument %d is an empty Point.", argno)));
		}
		for (int k = 0; k < dim; k++)
		{
			if (!coordinate_ok(v[k]))
			{
				if (r->quiet)
				{
					pfree(coords);
					return false;
				}
				check_coordinate(v[k], argno, i + 1);
			}
			coords[i * dim + k] = v[k];
		}
	}
	if (r->pos != r->len)
	{
		if (r->quiet)
		{
			pfree(coords);
			return false;
		}
		ereport(ERROR,
				(errcode(ERRCODE_INVALID_BINARY_REPRESENTATION),
				 errmsg("invalid EWKB: trailing bytes after the geometry"),
				 errdetail("Argument %d has %zu bytes; the geometry ends at byte %zu.",
						   argno, r->len, r->pos)));
	}
	out->coords = coords;
	out->n = npoints;
	out->dim = dim;
	out->has_m = has_m;
	return true;
}

/* Decodes buf[0..len) into out; bad input raises an ERROR naming argument argno. */
void
ewkb_decode(const uint8 *buf, size_t len, int argno, ewkb_curve *out)
{
	wkb_reader	r = {buf, len, 0, false, argno, false, false};

	decode(&r, out);
}

/* Decodes buf[0..len) into out; false, without an ERROR, when ewkb_decode would raise one. */
bool
ewkb_decode_quiet(const uint8 *buf, size_t len, ewkb_curve *out)
{
	wkb_reader	r = {buf, len, 0, false, 0, true, false};

	return decode(&r, out);
}
