/*
 * geosutil.h - GEOS (libgeos_c, Debian package libgeos-dev, LGPL-2.1) as a
 * reference in the engine tests: one context and 2-D LineStrings.
 */
#ifndef FR_GEOSUTIL_H
#define FR_GEOSUTIL_H

#include <stddef.h>

#include <geos_c.h>

static GEOSContextHandle_t geos;

/* A GEOS LineString (or a doubled point, GEOS needs two) from 2-D coordinates. */
static GEOSGeometry *
geos_line(const double *c, size_t n)
{
	GEOSCoordSequence *seq = GEOSCoordSeq_create_r(geos, n > 1 ? n : 2, 2);

	for (size_t i = 0; i < (n > 1 ? n : 2); i++)
	{
		size_t		k = n > 1 ? i : 0;

		GEOSCoordSeq_setXY_r(geos, seq, i, c[2 * k], c[2 * k + 1]);
	}
	return GEOSGeom_createLineString_r(geos, seq);
}

#endif							/* FR_GEOSUTIL_H */
