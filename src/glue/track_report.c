/*
 * track_report.c - where the problems of one track argument go.
 *
 * The codecs (src/pg/point_array.c, src/postgis/ewkb.c and postgis.c)
 * describe a bad track once, through track_problem.  Called by the distance functions, the
 * description becomes an ERROR that names the argument, the vertex and
 * where the track starts, so a failed batch points at its row; called by
 * frechet_track_check, the same words become its result and nothing is
 * raised.
 */
#include "postgres.h"

#include <stdarg.h>
#include <stdio.h>

#include "glue.h"

/* Room for one description; longer ones are cut (they never are in practice). */
#define PROBLEM_BYTES 256

/*
 * Reports a problem of the track: msg is the ERROR's message, what (a
 * printf format) says what the argument has, e.g. "a NaN coordinate at
 * vertex 3".  Raises an ERROR with the given SQLSTATE, or in check mode
 * keeps the first problem as "msg: what".  Returns false.
 */
bool
track_problem(track_report *rep, int sqlstate, const char *hint, const char *msg,
			  const char *what,...)
{
	char		buf[PROBLEM_BYTES];
	char		start[PROBLEM_BYTES];
	va_list		ap;

	va_start(ap, what);
	vsnprintf(buf, sizeof(buf), what, ap);
	va_end(ap);
	if (rep->check)
	{
		if (rep->problem == NULL)
		{
			size_t		len = strlen(msg) + 2 + strlen(buf) + 1;

			rep->problem = palloc(len);
			snprintf(rep->problem, len, "%s: %s", msg, buf);
			rep->sqlstate = sqlstate;
		}
		return false;
	}
	start[0] = '\0';
	if (rep->start != NULL && rep->dim == 3)
		snprintf(start, sizeof(start), " The track has %zu point%s and starts at (%.15g %.15g %.15g).",
				 rep->n, rep->n == 1 ? "" : "s", rep->start[0], rep->start[1], rep->start[2]);
	else if (rep->start != NULL)
		snprintf(start, sizeof(start), " The track has %zu point%s and starts at (%.15g %.15g).",
				 rep->n, rep->n == 1 ? "" : "s", rep->start[0], rep->start[1]);
	ereport(ERROR,
			(errcode(sqlstate),
			 errmsg("%s", msg),
			 errdetail("Argument %d has %s.%s", rep->argno, buf, start),
			 hint ? errhint("%s", hint) : 0));
	return false;
}
