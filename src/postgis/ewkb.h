/*
 * ewkb.h - EWKB/WKB Point and LineString decoding into tracks as given
 * (track_input, glue.h); see ewkb.c.  Part of the PostGIS layer, but with
 * no PostGIS call: the bytes are read here.
 */
#ifndef FRECHET_EWKB_H
#define FRECHET_EWKB_H

#include "postgres.h"

#include "glue.h"

/* A decoded curve: X Y [Z] per vertex, M apart, SRID (track_input of glue.h). */
typedef track_input ewkb_curve;

/* Decodes buf[0..len); ERRORs name argument argno. */
void		ewkb_decode(const uint8 *buf, size_t len, int argno, ewkb_curve *out);

/* The same, reporting a bad geometry to rep (see glue.h); false when bad. */
bool		ewkb_decode_track(const uint8 *buf, size_t len, track_report *rep, ewkb_curve *out);

/* The same, returning false instead of raising an ERROR (for index keys of stored rows). */
bool		ewkb_decode_quiet(const uint8 *buf, size_t len, ewkb_curve *out);

#endif							/* FRECHET_EWKB_H */
