/*
 * geodesy.c - WGS84 lon/lat to Earth-centred coordinates and chord/arc
 * conversions; see geodesy.h for the method and its error bound.
 */
#include <math.h>

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
