/*
 * geodesy.h - lon/lat on the WGS84 ellipsoid as 3-D Earth-centred (ECEF)
 * coordinates in metres, and the conversion between straight-line (chord)
 * lengths and metres along the surface.  Plain C11, no PostgreSQL headers.
 *
 * The method (see DEVELOPERS.md, "Distances in metres"): each vertex
 * (longitude, latitude) becomes its ECEF point on the ellipsoid (height 0);
 * the engine computes the Fréchet distance between the two 3-D polylines
 * (straight chords between consecutive vertices); the resulting chord
 * length c is reported as the arc 2a asin(c / 2a) of a sphere of the
 * equatorial radius a.  Against true geodesic distances on WGS84 (checked
 * with PROJ's geod_inverse, Karney 2013) the point-to-point error is below
 * 1e-6 relative up to 100 km and a few 1e-4 at continental distances.
 */
#ifndef FR_GEODESY_H
#define FR_GEODESY_H

#include <stdbool.h>
#include <stddef.h>

/* WGS84 semi-major axis (metres) and flattening. */
#define FR_WGS84_A 6378137.0
#define FR_WGS84_F (1.0 / 298.257223563)

/*
 * Factor by which a PostGIS geography bounding box filter (unit sphere,
 * geodetic latitude used as spherical latitude, scaled by the mean radius)
 * may stretch our ECEF chord lengths: the mean radius over the smallest
 * meridian radius of curvature, 6371008.8 / 6335439.3 = 1.00561; we use 1.01
 * plus FR_GEOG_INDEX_SLACK metres (float rounding, the chords' sag).
 */
#define FR_GEOG_INDEX_FACTOR 1.01
#define FR_GEOG_INDEX_SLACK 1.0

/* Is (lon, lat) in degrees a valid geographic position? */
bool		fr_geo_valid(double lon_deg, double lat_deg);

/* ECEF coordinates (metres) of (lon, lat) in degrees on the WGS84 ellipsoid. */
void		fr_geo_to_ecef(double lon_deg, double lat_deg, double *xyz);

/* Longitude and latitude (degrees) of the surface point below an ECEF point. */
void		fr_ecef_to_geo(const double *xyz, double *lon_deg, double *lat_deg);

/* Metres along the surface for a chord of length c (monotone, 0 .. pi a). */
double		fr_chord_to_metres(double c);

/* The largest chord c with fr_chord_to_metres(c) <= m (m >= 0, may be +Inf). */
double		fr_metres_to_chord(double m);

/* Expansion in metres of a geography bounding box filter for tolerance eps. */
double		fr_geog_index_expansion(double eps_metres);

/*
 * Geography edges follow the geodesic (see geodesy.c): an edge whose chord
 * could depart from its geodesic by more than FR_GEO_EDGE_SAG metres is
 * cut into equal geodesic pieces (points from PROJ's geodesic routines,
 * Karney 2013), so every piece's chord is within that of the geodesic.
 */
#define FR_GEO_EDGE_SAG 0.01

/* An upper bound on how far a geodesic departs from its chord of this length (metres). */
double		fr_geo_sag(double chord);

/* Pieces of the edge a -> b (lon/lat degrees; ECEF points xa, xb); 1 when short enough. */
size_t		fr_geo_edge_pieces(const double *a, const double *b, const double *xa, const double *xb);

/* The pieces - 1 ECEF points (3 doubles each) that cut the geodesic a -> b into equal lengths. */
void		fr_geo_edge_fill(const double *a, const double *b, size_t pieces, double *xyz);

#endif							/* FR_GEODESY_H */
