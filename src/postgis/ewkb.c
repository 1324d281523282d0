/*
 * ewkb.c - decodes PostGIS Extended WKB (EWKB, as ST_AsEWKB returns it) and
 * ISO/OGC WKB into engine curves.  No PostGIS headers: the format is read
 * from its published description (OGC Simple Features, WKB; PostGIS EWKB
 * flags).  Every read is bounds-checked against the buffer.
 *
 * Accepted: LineString (a curve), MultiLineString (its parts joined in
 * order into one curve) and Point (a one-point curve), 2-D or 3-D, either
 * byte order, with or without an SRID.  M values are dropped: the
 * metric uses X, Y and, when present, Z, so XYM counts as 2-D and XYZM as
 * 3-D.  Everything else gets an ERROR.
 */
#include "postgres.h"

#include <math.h>

#include "port/pg_bswap.h"

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

/* A read cursor over the argument's bytes; problems go to rep. */
typedef struct wkb_reader
{
	const uint8 *buf;
	size_t		len;
	size_t		pos;
	bool		big_endian;
	track_report *rep;
	bool		failed;
} wkb_reader;

/* Bytes that end before the geometry does: reported, and the reader failed. */
static void
short_read(wkb_reader *r, const char *what)
{
	if (!r->failed)
		track_problem(r->rep, ERRCODE_INVALID_BINARY_REPRESENTATION, NULL,
					  "invalid EWKB: data ends too early",
					  "%zu bytes and ends inside the %s at byte %zu", r->len, what, r->pos);
	r->failed = true;
}

/* Reads one byte (0 after a short read, which fails the reader). */
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
	uint64		u;
	double		d;

	/* the eight bytes at once, swapped when the value's byte order is not the machine's */
	memcpy(&u, r->buf + r->pos, sizeof(u));
#ifdef WORDS_BIGENDIAN
	if (!r->big_endian)
		u = pg_bswap64(u);
#else
	if (r->big_endian)
		u = pg_bswap64(u);
#endif
	r->pos += 8;
	memcpy(&d, &u, sizeof(d));
	return d;
}

/* Reads the byte order marker: 0 big-endian (XDR), 1 little-endian (NDR); false if bad (reported). */
static bool
read_byte_order(wkb_reader *r)
{
	uint8		bo = read_u8(r, "byte order marker");

	if (r->failed)
		return false;
	if (bo > 1)
		return track_problem(r->rep, ERRCODE_INVALID_BINARY_REPRESENTATION, NULL,
							 "invalid EWKB: unknown byte order marker",
							 "byte order marker %u at byte %zu; WKB allows 0 or 1",
							 bo, r->pos - 1);
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

/* Rejects a geometry type that is not a track, with advice where there is some. */
static bool
reject_type(const wkb_reader *r, uint32 base)
{
	const char *name = type_name(base);
	const char *hint = NULL;

	if (name == NULL)
	{
		char		msg[64];

		snprintf(msg, sizeof(msg), "invalid EWKB: unknown geometry type code %u", base);
		return track_problem(r->rep, ERRCODE_INVALID_BINARY_REPRESENTATION, NULL, msg,
							 "a type code that neither OGC WKB nor EWKB defines");
	}
	if (base == WKB_MULTIPOINT)
		hint = "Make a line of its points in their order first, e.g. with ST_MakeLine(ARRAY(SELECT (ST_DumpPoints(g)).geom)).";
	else if (base == WKB_COLLECTION)
		hint = "Pick one part with ST_GeometryN, or keep its lines with ST_CollectionExtract(g, 2).";
	else if (base == WKB_POLYGON)
		hint = "A polygon's boundary is a line: ST_ExteriorRing.";
	return track_problem(r->rep, ERRCODE_INVALID_PARAMETER_VALUE, hint,
						 "curve must be a LineString, a MultiLineString or a Point",
						 "a geometry of type %s", name);
}

/* Is a coordinate finite and within the engine's range? */
static bool
coordinate_ok(double v)
{
	/* fabs(NaN) <= limit is false */
	return fabs(v) <= FR_MAX_ABS_COORD;
}

/* Reports a NaN, infinite or huge coordinate, naming the vertex (1-based). */
static bool
bad_coordinate(const wkb_reader *r, double v, size_t vertex)
{
	if (isnan(v) || isinf(v))
		return track_problem(r->rep, ERRCODE_DATA_EXCEPTION, NULL,
							 "curve coordinates must be finite",
							 "a NaN or infinite coordinate at vertex %zu", vertex);
	return track_problem(r->rep, ERRCODE_NUMERIC_VALUE_OUT_OF_RANGE, NULL,
						 "curve coordinate out of range",
						 "a coordinate of magnitude above %g at vertex %zu",
						 FR_MAX_ABS_COORD, vertex);
}

/* One geometry's header: byte order, type word (EWKB or ISO flags), SRID. */
typedef struct wkb_header
{
	uint32		base;			/* OGC type code without dimension flags */
	bool		has_z,
				has_m,
				has_srid;
	int32		srid;
} wkb_header;

/* Reads a geometry's header; false (reported) when bad or short. */
static bool
read_header(wkb_reader *r, wkb_header *h)
{
	uint32		type,
				iso;

	if (!read_byte_order(r))
		return false;
	type = read_u32(r, "geometry type");
	if (r->failed)
		return false;
	h->has_z = (type & EWKB_Z) != 0;
	h->has_m = (type & EWKB_M) != 0;
	h->has_srid = (type & EWKB_SRID) != 0;
	type &= 0x0fffffffu;
	/* ISO WKB: 1000s are Z, 2000s M, 3000s ZM */
	iso = type / 1000;
	h->base = type % 1000;
	if (iso > 3 || (iso > 0 && (h->has_z || h->has_m)))
	{
		char		msg[64];

		snprintf(msg, sizeof(msg), "invalid EWKB: unknown geometry type code %u", type);
		return track_problem(r->rep, ERRCODE_INVALID_BINARY_REPRESENTATION, NULL, msg,
							 "a type code that mixes ISO and EWKB dimension flags or is unknown");
	}
	h->has_z = h->has_z || iso == 1 || iso == 3;
	h->has_m = h->has_m || iso == 2 || iso == 3;
	h->srid = 0;
	if (h->has_srid)
	{
		h->srid = (int32) read_u32(r, "SRID");
		if (r->failed)
			return false;
	}
	return true;
}

/*
 * Reads npoints vertices of stride doubles into coords (dim a vertex) and,
 * when m is not NULL, their M (the last of the stride) into m, after the
 * `done` vertices already there; vertices are numbered from 1 across the
 * whole track in messages.  The bytes were checked by the caller.
 */
static bool
read_vertices(wkb_reader *r, uint32 base, uint32 npoints, int stride, int dim,
			  double *coords, double *m, size_t done)
{
	r->rep->n = done + npoints;
	r->rep->dim = dim;
	for (size_t i = done; i < done + npoints; i++)
	{
		double		v[4];

		for (int k = 0; k < stride; k++)
			v[k] = read_f64_unchecked(r);
		/* an empty Point is written as all-NaN coordinates (common practice) */
		if (base == WKB_POINT && isnan(v[0]) && isnan(v[1]))
			return track_problem(r->rep, ERRCODE_INVALID_PARAMETER_VALUE, NULL,
								 "curve must have at least one point", "no points (an empty Point)");
		for (int k = 0; k < dim; k++)
			coords[i * dim + k] = v[k];
		if (m)
			m[i] = v[stride - 1];
		if (i == 0)
			r->rep->start = coords;
		for (int k = 0; k < dim; k++)
		{
			if (!coordinate_ok(v[k]))
				return bad_coordinate(r, v[k], i + 1);
		}
	}
	return true;
}

/* Are there the bytes of npoints vertices of stride doubles?  Reported when not. */
static bool
vertices_fit(wkb_reader *r, uint32 npoints, int stride)
{
	if ((r->len - r->pos) / (8 * (size_t) stride) < npoints)
	{
		short_read(r, "coordinates");
		return false;
	}
	return true;
}

/*
 * The parts of a MultiLineString as one track, joined in order: the gap
 * between one part's last vertex and the next part's first becomes a
 * segment (a GPS gap).  Empty parts add nothing.  Coordinates palloc'd.
 */
static double *
read_multi(wkb_reader *r, const wkb_header *h, size_t *total, double **m)
{
	int			stride = 2 + (h->has_z ? 1 : 0) + (h->has_m ? 1 : 0),
				dim = h->has_z ? 3 : 2;
	uint32		nparts = read_u32(r, "number of parts");
	double	   *coords = NULL;

	*m = NULL;

	*total = 0;
	for (uint32 part = 0; part < nparts && !r->failed; part++)
	{
		wkb_header	ph;
		uint32		npoints;

		if (!read_header(r, &ph))
			break;
		if (ph.base != WKB_LINESTRING || ph.has_z != h->has_z || ph.has_m != h->has_m)
		{
			track_problem(r->rep, ERRCODE_INVALID_BINARY_REPRESENTATION, NULL,
						  "invalid EWKB: a MultiLineString part is not a LineString of its dimensions",
						  "part %u of type code %u", part + 1, ph.base);
			break;
		}
		npoints = read_u32(r, "number of points");
		if (r->failed || !vertices_fit(r, npoints, stride))
			break;
		if (npoints == 0)
			continue;
		coords = coords == NULL
			? palloc(sizeof(double) * dim * (size_t) npoints)
			: repalloc(coords, sizeof(double) * dim * (*total + npoints));
		if (h->has_m)
			*m = *m == NULL
				? palloc(sizeof(double) * (size_t) npoints)
				: repalloc(*m, sizeof(double) * (*total + npoints));
		r->rep->start = coords;
		if (!read_vertices(r, WKB_LINESTRING, npoints, stride, dim, coords, *m, *total))
			break;
		*total += npoints;
	}
	if (r->failed || r->rep->problem != NULL)
	{
		r->rep->start = NULL;
		if (coords)
			pfree(coords);
		if (*m)
			pfree(*m);
		*m = NULL;
		return NULL;
	}
	return coords;
}

/*
 * Decodes one EWKB or ISO WKB Point, LineString or MultiLineString (its
 * parts joined in order) from the reader's bytes into out: coordinates
 * palloc'd, X Y [Z] per vertex, and M apart.  Bad input goes to the
 * reader's report (an ERROR naming the argument, or in check mode a
 * recorded problem) and returns false.
 */
static bool
decode(wkb_reader *r, ewkb_curve *out)
{
	wkb_header	h;
	int			stride,
				dim;
	uint32		npoints;
	size_t		n;
	double	   *coords,
			   *m = NULL;

	if (!read_header(r, &h))
		return false;
	out->has_srid = h.has_srid;
	out->srid = h.srid;
	if (h.base != WKB_POINT && h.base != WKB_LINESTRING && h.base != WKB_MULTILINESTRING)
		return reject_type(r, h.base);

	stride = 2 + (h.has_z ? 1 : 0) + (h.has_m ? 1 : 0);
	dim = h.has_z ? 3 : 2;
	if (h.base == WKB_MULTILINESTRING)
	{
		coords = read_multi(r, &h, &n, &m);
		if (coords == NULL && (r->failed || r->rep->problem != NULL))
			return false;
		if (n == 0)
			return track_problem(r->rep, ERRCODE_INVALID_PARAMETER_VALUE, NULL,
								 "curve must have at least one point", "no points (an empty MultiLineString)");
	}
	else
	{
		npoints = h.base == WKB_POINT ? 1 : read_u32(r, "number of points");
		if (r->failed)
			return false;
		if (npoints == 0)
			return track_problem(r->rep, ERRCODE_INVALID_PARAMETER_VALUE, NULL,
								 "curve must have at least one point", "no points (an empty LineString)");
		/* checked before allocating: the bytes must be there */
		if (!vertices_fit(r, npoints, stride))
			return false;
		coords = palloc(sizeof(double) * dim * (size_t) npoints);
		if (h.has_m)
			m = palloc(sizeof(double) * (size_t) npoints);
		if (!read_vertices(r, h.base, npoints, stride, dim, coords, m, 0))
		{
			r->rep->start = NULL;
			pfree(coords);
			if (m)
				pfree(m);
			return false;
		}
		n = npoints;
	}
	if (r->pos != r->len)
	{
		pfree(coords);
		if (m)
			pfree(m);
		r->rep->start = NULL;
		return track_problem(r->rep, ERRCODE_INVALID_BINARY_REPRESENTATION, NULL,
							 "invalid EWKB: trailing bytes after the geometry",
							 "%zu bytes; the geometry ends at byte %zu", r->len, r->pos);
	}
	out->coords = coords;
	out->m = m;
	out->n = n;
	out->dim = dim;
	out->has_m = h.has_m;
	return true;
}

/* Decodes buf[0..len) into out, reporting a bad geometry to rep; false when bad. */
bool
ewkb_decode_track(const uint8 *buf, size_t len, track_report *rep, ewkb_curve *out)
{
	wkb_reader	r = {buf, len, 0, false, rep, false};

	return decode(&r, out);
}

/* Decodes buf[0..len) into out; bad input raises an ERROR naming argument argno. */
void
ewkb_decode(const uint8 *buf, size_t len, int argno, ewkb_curve *out)
{
	track_report rep = {.argno = argno};

	ewkb_decode_track(buf, len, &rep, out);
}

/* Decodes buf[0..len) into out; false, without an ERROR, when ewkb_decode would raise one. */
bool
ewkb_decode_quiet(const uint8 *buf, size_t len, ewkb_curve *out)
{
	track_report rep = {.check = true};
	bool		ok = ewkb_decode_track(buf, len, &rep, out);

	if (rep.problem)
		pfree(rep.problem);
	return ok;
}
