/*
 * simplify.c - frechet_simplify on every track type: fewer vertices,
 * within a tolerance in the Fréchet distance, as a value of the input's
 * type (point[], or geometry / geography with the input's SRID, Z and M).
 * Geography edges are geodesics: see simplify_geodesic.
 */
#include "postgres.h"

#include <math.h>

#include "fmgr.h"

#include "geodesy.h"
#include "postgis.h"
#include "track.h"

/*
 * A geography edge cannot join antipodal points (PostGIS refuses it), so
 * where the simplified track would have one, the track's own vertices
 * between its ends are put back.  The guarantee holds: that stretch is
 * then the track itself (distance 0), and the Fréchet distance of pieces
 * joined at shared vertices is the largest of the pieces'.  The input has
 * no antipodal edge (PostGIS would not have made the geography).
 */
static size_t *
keep_antipodal_spans(const glue_track *t, size_t *keep, size_t *count)
{
	size_t	   *out = palloc(t->in.n * sizeof(size_t));
	size_t		n = 0;

	for (size_t k = 0; k < *count; k++)
	{
		if (k > 0 && postgis_lonlat_antipodal(t->in.coords + keep[k - 1] * t->in.dim,
											  t->in.coords + keep[k] * t->in.dim))
			for (size_t v = keep[k - 1] + 1; v < keep[k]; v++)
				out[n++] = v;
		out[n++] = keep[k];
	}
	pfree(keep);
	*count = n;
	return out;
}

/* The kept vertices of c simplified within tol (engine units), palloc'd. */
static size_t *
simplify_within(const fr_curve *c, double tol, size_t *count)
{
	glue_env	g;
	size_t	   *keep,
			   *copy = NULL;
	fr_status	st;

	glue_env_begin(&g, fr_scratch_bytes(c->n, 1) + c->n * sizeof(size_t), "frechet_simplify");
	st = fr_simplify(&g.env, c, tol, &keep, count);
	if (st == FR_OK)
	{
		copy = palloc(*count * sizeof(size_t));
		memcpy(copy, keep, *count * sizeof(size_t));
	}
	glue_env_end(&g);
	glue_check_status(st, "frechet_simplify");
	return copy;
}

/* The largest sag bound (geodesy.c) of the edges between kept vertices of c (all when keep is NULL). */
static double
largest_sag(const fr_curve *c, const size_t *keep, size_t count)
{
	double		worst = 0;

	for (size_t k = 1; k < count; k++)
	{
		const double *a = c->coords + 3 * (keep ? keep[k - 1] : k - 1),
				   *b = c->coords + 3 * (keep ? keep[k] : k);

		worst = fmax(worst, fr_geo_sag(sqrt((b[0] - a[0]) * (b[0] - a[0]) + (b[1] - a[1]) * (b[1] - a[1])
											 + (b[2] - a[2]) * (b[2] - a[2]))));
	}
	return worst;
}

/*
 * Geography simplification with geodesic edges.  It simplifies the chords
 * between the vertices within a smaller tolerance t; an edge and its chord
 * are within the edge's sag of each other (matched by projection onto the
 * chord), so by the triangle inequality the simplified track's geodesics
 * are within sag(kept edges) + t + sag(input edges) of the track's, and
 * the engine's curves (within FR_GEO_EDGE_SAG of the geodesics) within
 * 2 FR_GEO_EDGE_SAG more.  t starts at the tolerance less the input's
 * sags and shrinks while the kept edges' sag exceeds what was allowed for
 * it; when no such t is found, every vertex is kept (distance 0).
 */
static size_t *
simplify_geodesic(const fr_curve *c, double tol, size_t *count)
{
	double		input_sag = largest_sag(c, NULL, c->n),
				allowed = 0;

	for (int round = 0; round < 8; round++)
	{
		double		t = tol - input_sag - allowed - 2 * FR_GEO_EDGE_SAG,
					kept_sag;
		size_t	   *keep;

		if (!(t >= 0))
			break;
		keep = simplify_within(c, t, count);
		kept_sag = largest_sag(c, keep, *count);
		if (kept_sag <= allowed)
			return keep;
		allowed = kept_sag;
		pfree(keep);
	}
	{
		size_t	   *all = palloc(c->n * sizeof(size_t));

		for (size_t k = 0; k < c->n; k++)
			all[k] = k;
		*count = c->n;
		return all;
	}
}

/* frechet_simplify(track, tolerance): fewer vertices within tolerance. */
static Datum
simplify(FunctionCallInfo fcinfo, track_type type)
{
	glue_track	t;
	double		tol = PG_GETARG_FLOAT8(1);
	size_t	   *keep,
				count = 0;

	/* the vertices alone: geography edges are measured as chords, their geodesics bounded above */
	track_decode_arg(fcinfo, 0, type, TRACK_MEASURES, &t);
	glue_check_tolerance(tol);
	if (!track_type_earth(type))
		keep = simplify_within(&t.curve, tol, &count);
	else
	{
		keep = simplify_geodesic(&t.curve, track_engine_epsilon(type, tol), &count);
		keep = keep_antipodal_spans(&t, keep, &count);
	}
	return track_vertices_datum(fcinfo, &t, keep, count);
}

TRACK_FUNCTIONS(frechet_simplify, simplify)
