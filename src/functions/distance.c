/*
 * distance.c - the continuous Fréchet distance, its decision and the
 * discrete distance, on every track type: point[], geometry (units of the
 * SRID), geography (metres on WGS84) and raw EWKB (bytea).
 */
#include "postgres.h"

#include "fmgr.h"

#include "bounds.h"
#include "track.h"

/* frechet_distance(a, b): continuous Fréchet distance. */
static Datum
distance(FunctionCallInfo fcinfo, track_type type)
{
	glue_track	a,
				b;
	glue_env	g;
	double		d;
	fr_status	st;

	track_decode_both(fcinfo, type, &a, &b);
	glue_env_begin(&g, fr_scratch_bytes(a.curve.n, b.curve.n), "frechet_distance");
	st = fr_distance(&g.env, &a.curve, &b.curve, &d, NULL);
	glue_env_end(&g);
	glue_check_status(st, "frechet_distance");
	PG_RETURN_FLOAT8(track_out_distance(type, d));
}

/* frechet_at_most(a, b, epsilon): is the distance at most epsilon? */
static Datum
at_most(FunctionCallInfo fcinfo, track_type type)
{
	glue_track	a,
				b;
	double		eps = PG_GETARG_FLOAT8(2);
	glue_env	g;
	bool		yes;
	fr_status	st;

	track_decode_both(fcinfo, type, &a, &b);
	glue_check_epsilon(eps, 3);
	eps = track_engine_epsilon(type, eps);
	/* cheap bounds first (src/core/bounds.c); the decider only when they cannot tell */
	switch (fr_cheap_decide(&a.curve, &b.curve, eps))
	{
		case FR_FAR:
			yes = false;
			break;
		case FR_NEAR:
			yes = true;
			break;
		default:
			glue_env_begin(&g, fr_scratch_bytes(a.curve.n, b.curve.n), "frechet_at_most");
			st = fr_decide_exact(&g.env, &a.curve, &b.curve, eps, &yes, NULL);
			glue_env_end(&g);
			glue_check_status(st, "frechet_at_most");
	}
	PG_RETURN_BOOL(yes);
}

/* discrete_frechet_distance(a, b): vertex couplings only. */
static Datum
discrete(FunctionCallInfo fcinfo, track_type type)
{
	glue_track	a,
				b;
	glue_env	g;
	double		d;
	fr_status	st;

	track_decode_both(fcinfo, type, &a, &b);
	glue_env_begin(&g, fr_scratch_bytes(a.curve.n, b.curve.n), "discrete_frechet_distance");
	st = fr_discrete_distance(&g.env, &a.curve, &b.curve, &d);
	glue_env_end(&g);
	glue_check_status(st, "discrete_frechet_distance");
	PG_RETURN_FLOAT8(track_out_distance(type, d));
}

TRACK_FUNCTIONS(frechet_distance, distance)
TRACK_FUNCTIONS(frechet_at_most, at_most)
TRACK_FUNCTIONS(discrete_frechet_distance, discrete)

/* The EWKB type of a raw-EWKB call, from its geodetic argument. */
static track_type
ewkb_type(FunctionCallInfo fcinfo, int geodetic_arg)
{
	return PG_GETARG_BOOL(geodetic_arg) ? TRACK_EWKB_EARTH : TRACK_EWKB_PLANAR;
}

PG_FUNCTION_INFO_V1(frechet_distance_ewkb);
/* frechet_distance_ewkb(bytea, bytea, geodetic bool): distance of two EWKB curves. */
Datum
frechet_distance_ewkb(PG_FUNCTION_ARGS)
{
	return distance(fcinfo, ewkb_type(fcinfo, 2));
}

PG_FUNCTION_INFO_V1(frechet_at_most_ewkb);
/* frechet_at_most_ewkb(bytea, bytea, float8, geodetic bool): is the distance at most epsilon? */
Datum
frechet_at_most_ewkb(PG_FUNCTION_ARGS)
{
	return at_most(fcinfo, ewkb_type(fcinfo, 3));
}

PG_FUNCTION_INFO_V1(discrete_frechet_distance_ewkb);
/* discrete_frechet_distance_ewkb(bytea, bytea, geodetic bool): discrete distance of two EWKB curves. */
Datum
discrete_frechet_distance_ewkb(PG_FUNCTION_ARGS)
{
	return discrete(fcinfo, ewkb_type(fcinfo, 2));
}
