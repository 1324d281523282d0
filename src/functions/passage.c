/*
 * passage.c - corridor search on every track type (src/core/passage.c):
 * which part of a trip drove a stretch, in the stretch's direction.
 * frechet_passes (the decision, with an index condition through its
 * planner support), frechet_passage_distance (the smallest epsilon that
 * passes; the ordering operator <~~>>) and frechet_passage (one row a
 * passage, with the trip's part and, for PostGIS types, its times).
 */
#include "postgres.h"

#include "fmgr.h"
#include "funcapi.h"
#include "utils/builtins.h"
#include "utils/tuplestore.h"

#include "bounds.h"
#include "track.h"

/* The stage of frechet_passes that settled a pair (see frechet_passes_stage_point_array). */
typedef enum passes_stage
{
	STAGE_CHEAP_FAR,
	STAGE_CHEAP_NEAR,
	STAGE_WINDOWS,
	STAGE_DECIDER
} passes_stage;

/*
 * frechet_passes on decoded arguments (eps in engine units): the cheap
 * verdicts first (src/core/passage.c), the sweeps only when they cannot
 * tell; *stage says which settled it.
 */
static bool
passes_decided(const glue_track *trip, const glue_track *stretch, double eps, passes_stage *stage)
{
	glue_env	g;
	bool		yes = false;
	fr_stats	stats = {0};
	fr_status	st;

	switch (fr_passes_cheap(&trip->curve, &stretch->curve, eps))
	{
		case FR_FAR:
			*stage = STAGE_CHEAP_FAR;
			return false;
		case FR_NEAR:
			*stage = STAGE_CHEAP_NEAR;
			return true;
		default:
			break;
	}
	glue_env_begin(&g, fr_passage_scratch_bytes(stretch->curve.n, trip->curve.n), "frechet_passes");
	st = fr_passes(&g.env, &trip->curve, &stretch->curve, eps, &yes, &stats);
	glue_env_end(&g);
	glue_check_status(st, "frechet_passes");
	*stage = stats.decisions > 0 ? STAGE_DECIDER : STAGE_WINDOWS;
	return yes;
}

/* frechet_passes(trip, stretch, epsilon): does some part of the trip drive the stretch within epsilon? */
static Datum
passes(FunctionCallInfo fcinfo, track_type type)
{
	glue_track	trip,
				stretch;
	double		eps = PG_GETARG_FLOAT8(2);
	passes_stage stage;

	track_decode_both(fcinfo, type, &trip, &stretch);
	glue_check_epsilon(eps, 3);
	PG_RETURN_BOOL(passes_decided(&trip, &stretch, track_engine_epsilon(type, eps), &stage));
}

/* frechet_passage_distance(trip, stretch): the smallest epsilon for which frechet_passes is true. */
static Datum
passage_distance(FunctionCallInfo fcinfo, track_type type)
{
	glue_track	trip,
				stretch;
	glue_env	g;
	double		d = 0;
	fr_status	st;

	track_decode_both(fcinfo, type, &trip, &stretch);
	glue_env_begin(&g, fr_passage_scratch_bytes(stretch.curve.n, trip.curve.n),
				   "frechet_passage_distance");
	st = fr_passage_distance(&g.env, &trip.curve, &stretch.curve, &d, NULL);
	glue_env_end(&g);
	glue_check_status(st, "frechet_passage_distance");
	PG_RETURN_FLOAT8(track_out_distance(type, d));
}

/*
 * frechet_passage(trip, stretch, epsilon): one row a passage, in trip
 * order: trip_from, trip_to (positions k + t, 1-based), distance (the
 * Fréchet distance between the stretch and that part), trip_part (point[]
 * or LineString), and for PostGIS types time_from, time_to (the trip's M
 * there; NULL without M).
 */
static Datum
passage_rows(FunctionCallInfo fcinfo, track_type type)
{
	ReturnSetInfo *rsinfo = (ReturnSetInfo *) fcinfo->resultinfo;
	glue_track	trip,
				stretch;
	double		eps = PG_GETARG_FLOAT8(2);
	glue_env	g;
	fr_passage *ps = NULL;
	size_t		count = 0;
	fr_status	st;

	glue_srf_materialize(fcinfo);
	track_decode_both(fcinfo, type, &trip, &stretch);
	glue_check_epsilon(eps, 3);
	track_check_times(&trip, 1);
	glue_env_begin(&g, fr_passage_scratch_bytes(stretch.curve.n, trip.curve.n), "frechet_passage");
	st = fr_passages(&g.env, &trip.curve, &stretch.curve, track_engine_epsilon(type, eps), &ps, &count, NULL);
	if (st == FR_OK && count > 0)
	{
		fr_passage *copy = MemoryContextAlloc(MemoryContextGetParent(g.cxt), count * sizeof(fr_passage));

		memcpy(copy, ps, count * sizeof(fr_passage));
		ps = copy;
	}
	glue_env_end(&g);
	glue_check_status(st, "frechet_passage");
	for (size_t k = 0; k < count; k++)
	{
		Datum		values[6];
		bool		nulls[6] = {false};
		double		from = track_pos_in(&trip, ps[k].trip_from),
					to = track_pos_in(&trip, ps[k].trip_to);

		values[0] = Float8GetDatum(from + 1);
		values[1] = Float8GetDatum(to + 1);
		values[2] = Float8GetDatum(track_out_distance(type, ps[k].distance));
		values[3] = track_subline_datum(fcinfo, &trip, from, to);
		if (type != TRACK_POINTS)
		{
			values[4] = track_time_datum(&trip, from, &nulls[4]);
			values[5] = track_time_datum(&trip, to, &nulls[5]);
		}
		tuplestore_putvalues(rsinfo->setResult, rsinfo->setDesc, values, nulls);
	}
	return (Datum) 0;
}

TRACK_FUNCTIONS(frechet_passes, passes)
TRACK_FUNCTIONS(frechet_passage_distance, passage_distance)
TRACK_FUNCTIONS(frechet_passage, passage_rows)

PG_FUNCTION_INFO_V1(frechet_passes_stage_point_array);
/*
 * Which stage of frechet_passes settles a pair: 'cheap far' or 'cheap
 * near' (fr_passes_cheap), 'windows' (no window of the trip survives
 * trimming: settled by the scan of its edges) or 'decider' (a sweep of
 * the free space ran).  Not part of the extension's SQL: the index
 * benchmark binds it to a temporary function to count the pairs each
 * stage settles.
 */
Datum
frechet_passes_stage_point_array(PG_FUNCTION_ARGS)
{
	static const char *const names[] = {"cheap far", "cheap near", "windows", "decider"};
	glue_track	trip,
				stretch;
	double		eps = PG_GETARG_FLOAT8(2);
	passes_stage stage;

	track_decode_both(fcinfo, TRACK_POINTS, &trip, &stretch);
	glue_check_epsilon(eps, 3);
	(void) passes_decided(&trip, &stretch, eps, &stage);
	PG_RETURN_TEXT_P(cstring_to_text(names[stage]));
}
