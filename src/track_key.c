/*
 * track_key.c - the frechet_key type (summaries of tracks, and the reach of
 * a range query), its text form, and the operator |~~| that the planner
 * support function hands to the index: "this track may lie within epsilon
 * of that route".  The operator is necessary, not sufficient: the exact
 * frechet_at_most call always runs after it.
 */
#include "postgres.h"

#include <math.h>
#include <string.h>

#include "catalog/pg_type.h"
#include "lib/stringinfo.h"
#include "utils/builtins.h"
#include "utils/float.h"
#include "utils/geo_decls.h"

#include "glue.h"
#include "index.h"

/* Labels of the text form, in order, with the x and y intervals each one shows. */
static const struct
{
	const char *label;
	int			ix,
				iy;
}			key_parts[] =
{
	{"start", FR_KEY_START_X, FR_KEY_START_Y},
	{"end", FR_KEY_END_X, FR_KEY_END_Y},
	{"min", FR_KEY_MIN_X, FR_KEY_MIN_Y},
	{"max", FR_KEY_MAX_X, FR_KEY_MAX_Y},
};

/* True when a point[] is a curve the SQL functions accept; fills out. */
static bool
array_is_valid_curve(ArrayType *arr, fr_curve *out)
{
	const Point *pts;
	int			n;

	if (ARR_NDIM(arr) != 1 || ARR_ELEMTYPE(arr) != POINTOID || ARR_HASNULL(arr))
		return false;
	n = ARR_DIMS(arr)[0];
	if (n < 1)
		return false;
	pts = (const Point *) ARR_DATA_PTR(arr);
	for (int i = 0; i < n; i++)
	{
		/* fabs(NaN) <= limit is false, so NaN fails here too */
		if (!(fabs(pts[i].x) <= FR_MAX_ABS_COORD && fabs(pts[i].y) <= FR_MAX_ABS_COORD))
			return false;
	}
	out->coords = (const double *) pts;
	out->n = (size_t) n;
	out->dim = 2;
	return true;
}

/* The summary of a stored track; invalid tracks get the key covering everything. */
void
track_key_of_array(ArrayType *arr, fr_key *key)
{
	fr_curve	c;

	if (array_is_valid_curve(arr, &c))
		fr_key_of_curve(&c, key);
	else
		fr_key_everything(key);
}

/* Raises the input syntax error of frechet_key. */
static void
key_syntax_error(const char *orig)
{
	ereport(ERROR,
			(errcode(ERRCODE_INVALID_TEXT_REPRESENTATION),
			 errmsg("invalid input syntax for type %s: \"%s\"", "frechet_key", orig),
			 errdetail("A frechet_key reads start=(x,y)..(x,y) end=(x,y)..(x,y) min=(x,y)..(x,y) max=(x,y)..(x,y) reach=r.")));
}

/* Skips spaces, then the literal lit, or raises the syntax error. */
static void
expect_literal(char **p, const char *lit, const char *orig)
{
	size_t		len = strlen(lit);

	while (**p == ' ')
		(*p)++;
	if (strncmp(*p, lit, len) != 0)
		key_syntax_error(orig);
	*p += len;
}

/* Reads one float8 (float8in's syntax, "Infinity" included). */
static double
read_number(char **p, const char *orig)
{
	return float8in_internal(*p, p, "frechet_key", orig);
}

PG_FUNCTION_INFO_V1(frechet_key_in);
/* frechet_key text input. */
Datum
frechet_key_in(PG_FUNCTION_ARGS)
{
	char	   *orig = PG_GETARG_CSTRING(0);
	char	   *p = orig;
	fr_key	   *key = palloc(sizeof(fr_key));
	bool		earth;

	for (int k = 0; k < lengthof(key_parts); k++)
	{
		int			ix = key_parts[k].ix,
					iy = key_parts[k].iy;

		expect_literal(&p, key_parts[k].label, orig);
		expect_literal(&p, "=(", orig);
		key->lo[ix] = read_number(&p, orig);
		expect_literal(&p, ",", orig);
		key->lo[iy] = read_number(&p, orig);
		expect_literal(&p, ")..(", orig);
		key->hi[ix] = read_number(&p, orig);
		expect_literal(&p, ",", orig);
		key->hi[iy] = read_number(&p, orig);
		expect_literal(&p, ")", orig);
	}
	expect_literal(&p, "reach=", orig);
	key->reach = read_number(&p, orig);
	while (*p == ' ')
		p++;
	earth = strncmp(p, "earth", 5) == 0;
	if (earth)
		p += 5;
	else if (strncmp(p, "planar", 6) == 0)
		p += 6;
	while (*p == ' ')
		p++;
	if (*p != '\0')
		key_syntax_error(orig);
	for (int i = 0; i < FR_KEY_NDIM; i++)
	{
		/* lo <= hi fails for NaN; lo = +Inf or hi = -Inf would cover nothing */
		if (!(key->lo[i] <= key->hi[i]) || key->lo[i] == INFINITY || key->hi[i] == -INFINITY)
			ereport(ERROR,
					(errcode(ERRCODE_INVALID_PARAMETER_VALUE),
					 errmsg("invalid frechet_key: \"%s\"", orig),
					 errdetail("Each interval must run from a lower to a higher number, and none may be NaN.")));
	}
	if (!(key->reach >= 0))
		ereport(ERROR,
				(errcode(ERRCODE_INVALID_PARAMETER_VALUE),
				 errmsg("invalid frechet_key: \"%s\"", orig),
				 errdetail("The reach must be a non-negative number.")));
	/* the sign bit holds the kind: "reach=-0" is a planar 0 */
	key->reach = fabs(key->reach);
	frechet_key_set_kind(key, earth ? FRECHET_KEY_EARTH : FRECHET_KEY_PLANAR);
	PG_RETURN_POINTER(key);
}

PG_FUNCTION_INFO_V1(frechet_key_out);
/* frechet_key text output. */
Datum
frechet_key_out(PG_FUNCTION_ARGS)
{
	fr_key	   *key = PG_GETARG_FRECHET_KEY(0);
	StringInfoData buf;

	initStringInfo(&buf);
	for (int k = 0; k < lengthof(key_parts); k++)
	{
		int			ix = key_parts[k].ix,
					iy = key_parts[k].iy;

		appendStringInfo(&buf, "%s%s=(%s,%s)..(%s,%s)", k > 0 ? " " : "", key_parts[k].label,
						 float8out_internal(key->lo[ix]), float8out_internal(key->lo[iy]),
						 float8out_internal(key->hi[ix]), float8out_internal(key->hi[iy]));
	}
	appendStringInfo(&buf, " reach=%s", float8out_internal(frechet_key_reach(key)));
	if (frechet_key_kind_of(key) == FRECHET_KEY_EARTH)
		appendStringInfoString(&buf, " earth");
	PG_RETURN_CSTRING(buf.data);
}

/* Raises 22023 when a reach key and a curve are of different kinds of coordinates. */
void
frechet_key_check_kind(const fr_key *reach, frechet_key_kind kind, int argno)
{
	static const char *const names[] = {"planar (point[] or geometry)",
	"Earth-centred metres (geography)"};
	frechet_key_kind have = frechet_key_kind_of(reach);

	if (have == kind)
		return;
	if (argno > 0)
		ereport(ERROR,
				(errcode(ERRCODE_INVALID_PARAMETER_VALUE),
				 errmsg("frechet_key and curve summarise different kinds of coordinates"),
				 errdetail("The key is %s, but argument %d is %s.", names[have], argno, names[kind]),
				 errhint("Make the key with frechet_reach on a value of the curve's type.")));
	ereport(ERROR,
			(errcode(ERRCODE_INVALID_PARAMETER_VALUE),
			 errmsg("frechet_key and indexed column summarise different kinds of coordinates"),
			 errdetail("The key is %s, but the index is on %s.", names[have], names[kind]),
			 errhint("Make the key with frechet_reach on a value of the column's type.")));
}

PG_FUNCTION_INFO_V1(frechet_track_key_point_array);
/* frechet_track_key(point[]): the summary the index stores for a track. */
Datum
frechet_track_key_point_array(PG_FUNCTION_ARGS)
{
	ArrayType  *arr = PG_GETARG_ARRAYTYPE_P(0);
	fr_key	   *key = palloc(sizeof(fr_key));
	fr_curve	c;

	point_array_curve(arr, 1, &c);
	fr_key_of_curve(&c, key);
	PG_FREE_IF_COPY(arr, 0);
	PG_RETURN_POINTER(key);
}

PG_FUNCTION_INFO_V1(frechet_reach_point_array);
/* frechet_reach(point[], float8): the route's summary with epsilon as its reach. */
Datum
frechet_reach_point_array(PG_FUNCTION_ARGS)
{
	ArrayType  *arr = PG_GETARG_ARRAYTYPE_P(0);
	double		eps = PG_GETARG_FLOAT8(1);
	fr_key	   *key = palloc(sizeof(fr_key));
	fr_curve	c;

	point_array_curve(arr, 1, &c);
	glue_check_epsilon(eps, 2);
	fr_key_of_curve(&c, key);
	key->reach = eps;
	PG_FREE_IF_COPY(arr, 0);
	PG_RETURN_POINTER(key);
}

/* The test behind |~~|: the track's summary lies within the reach's epsilon of the route's. */
static bool
within_reach(ArrayType *arr, int argno, const fr_key *reach)
{
	fr_key		key;
	fr_curve	c;

	point_array_curve(arr, argno, &c);
	frechet_key_check_kind(reach, FRECHET_KEY_PLANAR, argno);
	fr_key_of_curve(&c, &key);
	return fr_key_bound(&key, reach) <= frechet_key_reach(reach);
}

PG_FUNCTION_INFO_V1(frechet_within_reach_point_array);
/* track |~~| reach */
Datum
frechet_within_reach_point_array(PG_FUNCTION_ARGS)
{
	ArrayType  *arr = PG_GETARG_ARRAYTYPE_P(0);
	bool		yes = within_reach(arr, 1, PG_GETARG_FRECHET_KEY(1));

	PG_FREE_IF_COPY(arr, 0);
	PG_RETURN_BOOL(yes);
}

PG_FUNCTION_INFO_V1(frechet_reach_within_point_array);
/* reach |~~| track, the commutator */
Datum
frechet_reach_within_point_array(PG_FUNCTION_ARGS)
{
	ArrayType  *arr = PG_GETARG_ARRAYTYPE_P(1);
	bool		yes = within_reach(arr, 2, PG_GETARG_FRECHET_KEY(0));

	PG_FREE_IF_COPY(arr, 1);
	PG_RETURN_BOOL(yes);
}

PG_FUNCTION_INFO_V1(frechet_cheap_verdict_point_array);
/*
 * Which cheap bound settles "distance <= epsilon": 'far', 'near' or
 * 'undecided'.  Not part of the extension's SQL: the index benchmark binds
 * it to a temporary function to count the pairs each stage settles.
 */
Datum
frechet_cheap_verdict_point_array(PG_FUNCTION_ARGS)
{
	ArrayType  *a = PG_GETARG_ARRAYTYPE_P(0);
	ArrayType  *b = PG_GETARG_ARRAYTYPE_P(1);
	double		eps = PG_GETARG_FLOAT8(2);
	fr_curve	p,
				q;
	fr_verdict	v;

	point_array_curve(a, 1, &p);
	point_array_curve(b, 2, &q);
	glue_check_epsilon(eps, 3);
	v = fr_cheap_decide(&p, &q, eps);
	PG_FREE_IF_COPY(a, 0);
	PG_FREE_IF_COPY(b, 1);
	PG_RETURN_TEXT_P(cstring_to_text(v == FR_FAR ? "far" : v == FR_NEAR ? "near" : "undecided"));
}
