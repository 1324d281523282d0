/*
 * ewkb.h - EWKB/WKB Point and LineString decoding into engine curves; see ewkb.c.
 */
#ifndef FRECHET_EWKB_H
#define FRECHET_EWKB_H

#include "postgres.h"

#include "glue.h"

/*
 * A decoded curve: n vertices of dim (2 or 3) coordinates X Y [Z], and
 * with has_m their M values apart in m (NULL without M).
 */
typedef struct ewkb_curve
{
	double	   *coords;
	double	   *m;
	size_t		n;
	int			dim;
	bool		has_m;
	bool		has_srid;
	int32		srid;
} ewkb_curve;

/* Decodes buf[0..len); ERRORs name argument argno. */
void		ewkb_decode(const uint8 *buf, size_t len, int argno, ewkb_curve *out);

/* The same, reporting a bad geometry to rep (see glue.h); false when bad. */
bool		ewkb_decode_track(const uint8 *buf, size_t len, track_report *rep, ewkb_curve *out);

/* The same, returning false instead of raising an ERROR (for index keys of stored rows). */
bool		ewkb_decode_quiet(const uint8 *buf, size_t len, ewkb_curve *out);

/*
 * M read as time: finite and non-decreasing along the curve, as functions
 * that report times or interpolate M require; a fault goes to rep (false).
 * True for a curve without M.
 */
bool		ewkb_check_times(const ewkb_curve *c, track_report *rep);

#endif							/* FRECHET_EWKB_H */
