/*
 * ewkb_out.c - geometry and geography results: points, route parts, trip
 * pieces, simplified tracks and leashes, written as EWKB and made values
 * by PostGIS's ST_GeomFromEWKB (and geography() for geography).  They keep
 * the inputs' SRID, Z and M: at a vertex the input's own coordinates,
 * between vertices X Y on the engine's curve (for geography the point
 * below the engine's chord, within FR_GEO_EDGE_SAG of the geodesic) and Z
 * and M linear in t.
 */
#include "postgres.h"

#include <math.h>

#include "lib/stringinfo.h"

#include "postgis.h"
#include "geodesy.h"

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

/* A point of one track alone keeps that track's Z and M. */
static geo_layout
track_layout(const glue_track *t)
{
	geo_layout	l = {t->in.dim == 3, t->in.m != NULL};

	return l;
}

/* A shape joining points of two tracks keeps what both have. */
static geo_layout
pair_layout(const glue_track *a, const glue_track *b)
{
	geo_layout	l = {a->in.dim == 3 && b->in.dim == 3, a->in.m != NULL && b->in.m != NULL};

	return l;
}

/* Output coordinates of input position pos (0-based k + t): X Y, then Z and M as the layout asks. */
static void
output_point(const glue_track *t, double pos, geo_layout l, double *out)
{
	const track_input *orig = &t->in;
	double		k = floor(pos);
	int			at = 2;

	if (pos == k && k >= 0 && k < (double) orig->n)
		memcpy(out, orig->coords + (size_t) k * orig->dim, 2 * sizeof(double));
	else if (track_type_earth(t->type))
	{
		double		xyz[3];

		fr_curve_point(&t->curve, track_pos_engine(t, pos), xyz);
		fr_ecef_to_geo(xyz, &out[0], &out[1]);
	}
	else
	{
		double		xyz[3];

		fr_curve_point(&t->curve, pos, xyz);
		memcpy(out, xyz, 2 * sizeof(double));
	}
	if (l.z)
		out[at++] = track_value_at(orig->coords + 2, orig->dim, orig->n, pos);
	if (l.m)
		out[at++] = track_value_at(orig->m, 1, orig->n, pos);
}

/* Starts an EWKB geometry of the given OGC type and layout with the track's SRID. */
static void
begin_ewkb(StringInfo buf, const glue_track *t, uint32 type, geo_layout l)
{
	uint32		flags = 0x20000000u | (l.z ? 0x80000000u : 0) | (l.m ? 0x40000000u : 0);

	initStringInfo(buf);
	appendBinaryStringInfo(buf, "\x00\x00\x00\x00", VARHDRSZ);
	appendStringInfoChar(buf, 1);
	put_u32(buf, type | flags);
	put_u32(buf, (uint32) t->in.srid);
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
finish_ewkb(FunctionCallInfo fcinfo, const glue_track *t, StringInfo buf)
{
	SET_VARSIZE(buf->data, buf->len);
	return postgis_from_ewkb(fcinfo, (bytea *) buf->data, track_type_earth(t->type));
}

/* A Point at input position pos, with the track's Z and M. */
Datum
postgis_point_datum(FunctionCallInfo fcinfo, const glue_track *t, double pos)
{
	StringInfoData buf;
	geo_layout	l = track_layout(t);
	double		pt[4];

	output_point(t, pos, l, pt);
	begin_ewkb(&buf, t, 1, l);
	for (int i = 0; i < layout_dim(l); i++)
		put_f64(&buf, pt[i]);
	return finish_ewkb(fcinfo, t, &buf);
}

/* The part of the track between input positions from <= to, as a LineString with its Z and M. */
Datum
postgis_subline_datum(FunctionCallInfo fcinfo, const glue_track *t, double from, double to)
{
	StringInfoData buf;
	geo_layout	l = track_layout(t);
	int			odim = layout_dim(l);
	size_t		first = (size_t) floor(from) + 1,
				n = 0;
	double	   *pts = palloc(sizeof(double) * odim * ((size_t) (to - from) + 3));

	output_point(t, from, l, pts);
	n = 1;
	for (size_t k = first; (double) k < to; k++)
		output_point(t, (double) k, l, pts + odim * n++);
	output_point(t, to, l, pts + odim * n++);
	begin_ewkb(&buf, t, 2, l);
	put_points(&buf, pts, n, odim);
	return finish_ewkb(fcinfo, t, &buf);
}

/* A LineString through the given vertices (0-based indices), with their Z and M; a Point for one. */
Datum
postgis_vertices_datum(FunctionCallInfo fcinfo, const glue_track *t, const size_t *keep,
					   size_t count)
{
	StringInfoData buf;
	geo_layout	l = track_layout(t);
	int			odim = layout_dim(l);
	double	   *pts = palloc(sizeof(double) * odim * (count > 1 ? count : 2));

	for (size_t k = 0; k < count; k++)
		output_point(t, (double) keep[k], l, pts + odim * k);
	if (count == 1)
	{
		/* a one-point curve stays a point: a Point body is its coordinates */
		begin_ewkb(&buf, t, 1, l);
		for (int d = 0; d < odim; d++)
			put_f64(&buf, pts[d]);
		return finish_ewkb(fcinfo, t, &buf);
	}
	begin_ewkb(&buf, t, 2, l);
	put_points(&buf, pts, count, odim);
	return finish_ewkb(fcinfo, t, &buf);
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
postgis_lonlat_antipodal(const double *a, const double *b)
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
postgis_leashes_datum(FunctionCallInfo fcinfo, const glue_track *a, const glue_track *b,
					  const fr_match_pt *pts, size_t count)
{
	StringInfoData buf;
	geo_layout	l = pair_layout(a, b);
	int			odim = layout_dim(l);

	begin_ewkb(&buf, a, 5, l);
	put_u32(&buf, (uint32) count);
	for (size_t k = 0; k < count; k++)
	{
		double		seg[8];

		output_point(a, track_pos_in(a, pts[k].a_pos), l, seg);
		output_point(b, track_pos_in(b, pts[k].b_pos), l, seg + odim);
		if (track_type_earth(a->type) && postgis_lonlat_antipodal(seg, seg + odim))
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
	return finish_ewkb(fcinfo, a, &buf);
}

