/*
 * glue.h - shared pieces of the SQL glue: engine environment, limits,
 * argument decoding and error reporting.
 */
#ifndef FRECHET_GLUE_H
#define FRECHET_GLUE_H

#include "postgres.h"
#include "nodes/nodes.h"
#include "utils/array.h"

#include "frechet.h"

/* Limit on the scratch memory of one call, in kB (frechet_ext.max_memory). */
extern int	frechet_max_memory_kb;

/* A scratch memory context and the engine environment that allocates in it. */
typedef struct glue_env
{
	MemoryContext cxt;
	fr_env		env;
} glue_env;

/* Creates scratch memory for one call after checking the limit; see frechet_ext.c. */
void		glue_env_begin(glue_env *g, size_t scratch_bytes, const char *what);
void		glue_env_end(glue_env *g);

/* Turns a non-OK engine status into an ERROR. */
void		glue_check_status(fr_status st, const char *what);

/*
 * Where the problems of one track argument go (track_report.c): an ERROR
 * naming argument argno, or with check set the first problem's text (for
 * frechet_track_check).  start, dim and n describe the track once known.
 */
typedef struct track_report
{
	int			argno;
	bool		check;
	char	   *problem;		/* check mode: "message: what", palloc'd */
	int			sqlstate;		/* check mode: the SQLSTATE the ERROR would have */
	const double *start;
	int			dim;
	size_t		n;
} track_report;

/* A track's problem, raised or recorded; returns false.  See track_report.c. */
bool		track_problem(track_report *rep, int sqlstate, const char *hint, const char *msg,
						  const char *what,...) pg_attribute_printf(5, 6);

/* Decodes a point[] argument into a 2-D curve, validating it; see point_array.c. */
void		point_array_curve(ArrayType *arr, int argno, fr_curve *out);

/* The same, reporting to rep; false when the array is not a valid track. */
bool		point_array_track(ArrayType *arr, track_report *rep, fr_curve *out);

/*
 * The witness matching and the excursions, run in scratch memory and
 * copied into the caller's context; see witness.c.  glue_matching: eps < 0
 * asks for an optimal matching; NULL (count 0) when none within eps.
 */
fr_match_pt *glue_matching(const fr_curve *p, const fr_curve *q, double eps,
						   size_t *count, const char *what);
double		glue_partial_distance(const fr_curve *trip, const fr_curve *route);
void		glue_partial_match(const fr_curve *trip, const fr_curve *route, double eps,
							   bool *found, double *from, double *to, double *d);
fr_excursion *glue_excursions(const fr_curve *p, const fr_curve *q, double eps,
							  size_t *count);

/* Validates the positions of frechet_track_piece on a track of n vertices; see track_piece.c. */
void		glue_check_piece(double from, double to, size_t n);

/* A set-returning call's tuple store and descriptor, nothing else left per call. */
void		glue_srf_materialize(FunctionCallInfo fcinfo);

/* Validates a tolerance argument: not NaN, not negative. */
void		glue_check_epsilon(double eps, int argno);

/* Planner support of frechet_at_most: a constant epsilon validated while planning; see support.c. */
void		glue_check_constant_epsilon(Node *rawreq);

#endif							/* FRECHET_GLUE_H */
