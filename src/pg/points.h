/*
 * points.h - the point[] codec: point[] values as tracks, and results as
 * point and point[] values.  Calls only the glue base and the engine.
 */
#ifndef FRECHET_POINTS_H
#define FRECHET_POINTS_H

#include "postgres.h"
#include "utils/array.h"

#include "glue.h"

/* Decodes a point[] into a 2-D curve, reporting a bad one to rep (point_array.c). */
bool		point_array_track(ArrayType *arr, track_report *rep, fr_curve *out);

/* The same, raising an ERROR that names argument argno. */
void		point_array_curve(ArrayType *arr, int argno, fr_curve *out);

/* A point[] value as a track (points.c); false, after reporting to rep, when bad. */
bool		points_decode(Datum value, track_report *rep, glue_track *out);

/* The point at input position pos (0-based k + t). */
Datum		points_point_datum(const glue_track *t, double pos);

/* The track between two positions: those points and the vertices strictly between. */
Datum		points_piece_datum(const glue_track *t, double from, double to);

/* A point[] of the given vertices (0-based indices). */
Datum		points_vertices_datum(const glue_track *t, const size_t *keep, size_t count);

#endif							/* FRECHET_POINTS_H */
