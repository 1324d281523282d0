/*
 * geodesy.c - WGS84 lon/lat to Earth-centred coordinates and chord/arc
 * conversions; see geodesy.h for the method and its error bound.
 */
#include <math.h>

#include <geodesic.h>

#include "geodesy.h"

#define DEG2RAD (3.14159265358979323846 / 180.0)

/* Is (lon, lat) in degrees a valid geographic position? */
bool
fr_geo_valid(double lon_deg, double lat_deg)
{
	return lon_deg >= -180.0 && lon_deg <= 180.0 &&
		lat_deg >= -90.0 && lat_deg <= 90.0;
}

/*
 * ECEF coordinates of a point at height 0: with N the prime vertical radius
 * of curvature, x = N cos(lat) cos(lon), y = N cos(lat) sin(lon),
 * z = N (1 - e^2) sin(lat) (common practice; e.g. Karney 2011,
 * "Transverse Mercator with an accuracy of a few nanometers", eq. 1).
 */
void
fr_geo_to_ecef(double lon_deg, double lat_deg, double *xyz)
{
	const double e2 = FR_WGS84_F * (2.0 - FR_WGS84_F);
	double		lon = lon_deg * DEG2RAD,
				lat = lat_deg * DEG2RAD;
	double		sl = sin(lat),
				cl = cos(lat);
	double		n = FR_WGS84_A / sqrt(1.0 - e2 * sl * sl);

	/* exact poles: cos(90 degrees) in double is 6e-17, not 0; keep x = y = 0 */
	if (lat_deg == 90.0 || lat_deg == -90.0)
		cl = 0.0;
	xyz[0] = n * cl * cos(lon);
	xyz[1] = n * cl * sin(lon);
	xyz[2] = n * (1.0 - e2) * sl;
}

/*
 * Geodetic longitude and latitude of an ECEF point near the surface (such
 * as a point on a chord between two surface points): the fixed-point
 * iteration lat = atan2(z + e^2 N(lat) sin(lat), p), common practice,
 * which converges to double precision within a few steps near the surface.
 */
void
fr_ecef_to_geo(const double *xyz, double *lon_deg, double *lat_deg)
{
	const double e2 = FR_WGS84_F * (2.0 - FR_WGS84_F);
	double		p = hypot(xyz[0], xyz[1]);
	double		lat = atan2(xyz[2], p * (1.0 - e2));

	for (int i = 0; i < 8; i++)
	{
		double		s = sin(lat);
		double		n = FR_WGS84_A / sqrt(1.0 - e2 * s * s);

		lat = atan2(xyz[2] + e2 * n * s, p);
	}
	*lon_deg = p == 0.0 ? 0.0 : atan2(xyz[1], xyz[0]) / DEG2RAD;
	*lat_deg = lat / DEG2RAD;
}

/* Metres along the surface for a chord of length c: the arc 2a asin(c / 2a). */
double
fr_chord_to_metres(double c)
{
	double		h = c / (2.0 * FR_WGS84_A);

	if (h >= 1.0)
		return 3.14159265358979323846 * FR_WGS84_A;
	return 2.0 * FR_WGS84_A * asin(h);
}

/*
 * The largest chord c whose arc does not exceed m.  Start from the exact
 * inverse 2a sin(m / 2a) and step by single ulps until rounding agrees, so
 * that "distance <= m" and "chord distance <= c" decide alike.
 */
double
fr_metres_to_chord(double m)
{
	double		c;

	if (m >= 3.14159265358979323846 * FR_WGS84_A)
		return 2.0 * FR_WGS84_A;
	c = 2.0 * FR_WGS84_A * sin(m / (2.0 * FR_WGS84_A));
	for (int i = 0; i < 64 && c > 0 && fr_chord_to_metres(c) > m; i++)
		c = nextafter(c, 0.0);
	for (int i = 0; i < 64 && fr_chord_to_metres(nextafter(c, INFINITY)) <= m; i++)
		c = nextafter(c, INFINITY);
	return c;
}

/* Expansion in metres of a geography bounding box filter for tolerance eps. */
double
fr_geog_index_expansion(double eps_metres)
{
	return FR_GEOG_INDEX_FACTOR * eps_metres + FR_GEOG_INDEX_SLACK;
}

/*
 * Geography edges follow the geodesic.  A geodesic's curvature in space is
 * the surface's normal curvature along it, at most 1 / R_min with R_min =
 * a (1 - f)^2 = b^2 / a, the meridian radius of curvature at the equator
 * (the smallest on WGS84).  A curve of curvature at most 1/R departs from
 * its chord of length L by at most the sag of a circle of radius R over
 * that chord, R - sqrt(R^2 - L^2 / 4) (comparison with the circle, common
 * practice).  So an edge whose chord is at most FR_GEO_PIECE_MAX is within
 * FR_GEO_EDGE_SAG of its geodesic, and a longer one is cut into equal
 * geodesic pieces no longer than that (a piece's chord is shorter than
 * its arc).
 */
static double
min_radius(void)
{
	return FR_WGS84_A * (1.0 - FR_WGS84_F) * (1.0 - FR_WGS84_F);
}

double
fr_geo_sag(double chord)
{
	double		r = min_radius(),
				h = chord / 2.0;

	if (h >= r)
		return r;
	/* r - sqrt(r^2 - h^2), written without cancellation */
	return h * h / (r + sqrt(r * r - h * h));
}

/* The longest chord within FR_GEO_EDGE_SAG of its geodesic: 2 sqrt(R^2 - (R - s)^2). */
static double
piece_max(void)
{
	double		r = min_radius(),
				s = FR_GEO_EDGE_SAG;

	/* 0.999: room for the rounding of the lengths compared against it */
	return 0.999 * 2.0 * sqrt(s * (2.0 * r - s));
}

/* WGS84 for PROJ's geodesic routines (Karney 2013), made once. */
static const struct geod_geodesic *
wgs84(void)
{
	static struct geod_geodesic g;
	static bool ready = false;

	if (!ready)
	{
		geod_init(&g, FR_WGS84_A, FR_WGS84_F);
		ready = true;
	}
	return &g;
}

/*
 * How many pieces the edge from a to b (lon/lat degrees; xa, xb their ECEF
 * points) becomes: 1 when its chord is already within FR_GEO_EDGE_SAG of
 * the geodesic (no geodesic is computed then), else the geodesic length
 * over FR_GEO_PIECE_MAX, rounded up.
 */
size_t
fr_geo_edge_pieces(const double *a, const double *b, const double *xa, const double *xb)
{
	double		dx = xb[0] - xa[0],
				dy = xb[1] - xa[1],
				dz = xb[2] - xa[2],
				s12 = 0.0;

	if (sqrt(dx * dx + dy * dy + dz * dz) <= piece_max())
		return 1;
	geod_inverse(wgs84(), a[1], a[0], b[1], b[0], &s12, NULL, NULL);
	return (size_t) ceil(s12 / piece_max());
}

/*
 * The pieces - 1 points that cut the geodesic from a to b (lon/lat
 * degrees) into equal lengths, as ECEF points into xyz (3 doubles each),
 * through PROJ's geod_inverseline and geod_position.
 */
void
fr_geo_edge_fill(const double *a, const double *b, size_t pieces, double *xyz)
{
	struct geod_geodesicline line;

	geod_inverseline(&line, wgs84(), a[1], a[0], b[1], b[0], 0);
	for (size_t k = 1; k < pieces; k++)
	{
		double		lat,
					lon;

		geod_position(&line, line.s13 * (double) k / (double) pieces, &lat, &lon, NULL);
		fr_geo_to_ecef(lon, lat, xyz + 3 * (k - 1));
	}
}
