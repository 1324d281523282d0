/*
 * track_units.c - what every decoded track (glue_track) answers whatever
 * its SQL type: positions between the input's vertices and the engine's,
 * units (metres for lon/lat), and M read as time.
 */
#include "postgres.h"

#include <math.h>

#include "glue.h"
#include "geodesy.h"

/*
 * The input position (0-based k + t) of an engine position: the same
 * where no edge was cut; on a geography edge cut along its geodesic, t is
 * the share of the edge's geodesic length.
 */
double
track_pos_in(const glue_track *t, double pos)
{
	const size_t *first = t->first;
	size_t		n = t->in.n,
				lo = 0,
				hi;

	if (first == NULL || !(pos > 0))
		return first == NULL ? pos : 0.0;
	if (pos >= (double) first[n - 1])
		return (double) (n - 1);
	/* the input edge lo with first[lo] <= pos < first[lo + 1] */
	hi = n - 1;
	while (hi - lo > 1)
	{
		size_t		mid = lo + (hi - lo) / 2;

		if ((double) first[mid] <= pos)
			lo = mid;
		else
			hi = mid;
	}
	return (double) lo + (pos - (double) first[lo]) / (double) (first[lo + 1] - first[lo]);
}

/* The engine position of an input position (the inverse of track_pos_in). */
double
track_pos_engine(const glue_track *t, double pos)
{
	const size_t *first = t->first;
	size_t		n = t->in.n,
				k;

	if (first == NULL || !(pos > 0))
		return first == NULL ? pos : 0.0;
	if (pos >= (double) (n - 1))
		return (double) first[n - 1];
	k = (size_t) pos;
	return (double) first[k] + (pos - (double) k) * (double) (first[k + 1] - first[k]);
}

/* A distance from the engine in output units: metres for lon/lat (an infinite one stays). */
double
track_out_distance(track_type type, double d)
{
	return track_type_earth(type) && !isinf(d) ? fr_chord_to_metres(d) : d;
}

/* A tolerance in output units as the engine's: a chord for lon/lat. */
double
track_engine_epsilon(track_type type, double eps)
{
	return track_type_earth(type) ? fr_metres_to_chord(eps) : eps;
}

/*
 * One per-vertex value (stride apart) at position pos (0-based k + t),
 * linear in t between vertices and held at the ends.
 */
double
track_value_at(const double *v, size_t stride, size_t n, double pos)
{
	size_t		k;
	double		t;

	if (!(pos > 0))
		return v[0];
	if (pos >= (double) (n - 1))
		return v[(n - 1) * stride];
	k = (size_t) pos;
	t = pos - (double) k;
	return t == 0 ? v[k * stride] : v[k * stride] + t * (v[(k + 1) * stride] - v[k * stride]);
}

/* The time (M) at input position pos, as a float8 Datum; *isnull without M. */
Datum
track_time_datum(const glue_track *t, double pos, bool *isnull)
{
	*isnull = t->in.m == NULL;
	return Float8GetDatum(*isnull ? 0.0 : track_value_at(t->in.m, 1, t->in.n, pos));
}

/*
 * A function that reports times or M between vertices needs the track's
 * M to be time: finite and non-decreasing (else an ERROR naming argument
 * argno).  Nothing to check without M.
 */
void
track_check_times(const glue_track *t, int argno)
{
	track_report rep = {.argno = argno};

	track_input_check_times(&t->in, &rep);
}

/*
 * M read as time (the trajectory convention of PostGIS, seconds): finite,
 * and never decreasing from one vertex to the next.  A fault goes to rep
 * in the words of the ERROR the time-reporting functions raise.
 */
bool
track_input_check_times(const track_input *c, track_report *rep)
{
	static const char hint[] =
		"M is read as the time of each vertex (seconds, increasing along the track); "
		"ST_Force2D or ST_Force3DZ drops M for the functions that do not need it.";

	if (c->m == NULL)
		return true;
	rep->start = c->coords;
	rep->dim = c->dim;
	rep->n = c->n;
	for (size_t i = 0; i < c->n; i++)
	{
		if (!isfinite(c->m[i]))
			return track_problem(rep, ERRCODE_INVALID_PARAMETER_VALUE, hint,
								 "M values (times) must be finite",
								 "M %g at vertex %zu", c->m[i], i + 1);
		if (i > 0 && c->m[i] < c->m[i - 1])
			return track_problem(rep, ERRCODE_INVALID_PARAMETER_VALUE, hint,
								 "M values (times) must not decrease along the track",
								 "M %.15g at vertex %zu after M %.15g at vertex %zu",
								 c->m[i], i + 1, c->m[i - 1], i);
	}
	rep->start = NULL;
	return true;
}
