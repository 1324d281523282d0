/*
 * key.c - the frechet_key type (summaries of tracks, and the reach of a
 * range query), its text form, the summary of a track of any type, and the
 * operators the planner support functions hand to the index: |~~| "this
 * track may lie within epsilon of that route" and |~~~| "these pings may
 * follow that route within epsilon".  The operators are necessary, not
 * sufficient: the exact call always runs after them.
 */
#include "postgres.h"

#include <math.h>
#include <string.h>

#include "catalog/pg_type.h"
#include "lib/stringinfo.h"
#include "utils/builtins.h"
#include "utils/float.h"
#include "utils/geo_decls.h"

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

/* The text form of a key. */
static char *
key_text(const fr_key *key)
{
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
	return buf.data;
}

PG_FUNCTION_INFO_V1(frechet_key_out);
/* frechet_key text output. */
Datum
frechet_key_out(PG_FUNCTION_ARGS)
{
	PG_RETURN_CSTRING(key_text(PG_GETARG_FRECHET_KEY(0)));
}

/*
 * frechet_summary: the packed key our operator classes store since 0.2
 * (fr_key_pack: 8 float4 for a track, 16 for a node's ranges), a varlena.
 * Its text form is frechet_key's, of the key it unpacks to (reach 0);
 * reading one packs the key read.
 */
void
frechet_index_key_read(Datum d, gist_key_format format, fr_key *out)
{
	struct varlena *v;
	float		buf[FR_KEY_PACKED_RANGE];
	size_t		len;

	if (format == GIST_KEY_WIDE)
	{
		*out = *DatumGetFrechetKey(d);
		return;
	}
	v = PG_DETOAST_DATUM_PACKED(d);
	len = VARSIZE_ANY_EXHDR(v);
	if (len % sizeof(float) != 0 || len > sizeof(buf))
		elog(ERROR, "frechet_summary of %zu bytes", len);
	/* an index's short varlena header leaves the floats unaligned: copy them */
	memcpy(buf, VARDATA_ANY(v), len);
	if (!fr_key_unpack(buf, len / sizeof(float), out))
		elog(ERROR, "frechet_summary of %zu bytes", len);
}

Datum
frechet_index_key_make(const fr_key *key, gist_key_format format)
{
	float		buf[FR_KEY_PACKED_RANGE];
	size_t		n;
	struct varlena *v;

	if (format == GIST_KEY_WIDE)
	{
		fr_key	   *copy = palloc(sizeof(fr_key));

		*copy = *key;
		return PointerGetDatum(copy);
	}
	n = fr_key_pack(key, buf);
	v = palloc(VARHDRSZ + n * sizeof(float));
	SET_VARSIZE(v, VARHDRSZ + n * sizeof(float));
	memcpy(VARDATA(v), buf, n * sizeof(float));
	return PointerGetDatum(v);
}

PG_FUNCTION_INFO_V1(frechet_summary_in);
/* frechet_summary text input: a frechet_key's text, packed. */
Datum
frechet_summary_in(PG_FUNCTION_ARGS)
{
	Datum		key = DirectFunctionCall1(frechet_key_in, PG_GETARG_DATUM(0));

	PG_RETURN_DATUM(frechet_index_key_make(DatumGetFrechetKey(key), GIST_KEY_PACKED));
}

PG_FUNCTION_INFO_V1(frechet_summary_out);
/* frechet_summary text output: the key it unpacks to. */
Datum
frechet_summary_out(PG_FUNCTION_ARGS)
{
	fr_key		key;

	frechet_index_key_read(PG_GETARG_DATUM(0), GIST_KEY_PACKED, &key);
	PG_RETURN_CSTRING(key_text(&key));
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

/* Largest |z| of a 3-D curve; 0 for a 2-D one. */
static double
curve_z_magnitude(const fr_curve *c)
{
	double		m = 0.0;

	if (c->dim < 3)
		return 0.0;
	for (size_t i = 0; i < c->n; i++)
		m = Max(m, fabs(c->coords[i * c->dim + 2]));
	return m;
}

/*
 * The summary of a decoded track: x and y of the engine's curve (for
 * geography, Earth-centred x and y of its geodesic pieces), of its kind.
 *
 * Why x and y alone give lower bounds: dropping coordinates never
 * lengthens a leash, so the Fréchet distance of the x,y shadows is at most
 * that of the curves (for geography, of the ECEF chord polylines; the
 * metres of a chord grow with its length).  Z reaches the engine's
 * rounding, though, so a 3-D curve's key is widened by the slack of its
 * largest |z| (the same 1e-12 of the magnitude that fr_bound_loosen takes
 * for x and y).
 */
void
track_key_of(const glue_track *t, fr_key *key)
{
	const fr_curve *c = &t->curve;

	fr_key_of_curve(c, key);
	if (c->dim == 3)
	{
		double		widen = fr_bound_slack(0.0, curve_z_magnitude(c));

		for (int i = 0; i < FR_KEY_NDIM; i++)
		{
			key->lo[i] -= widen;
			key->hi[i] += widen;
		}
	}
	frechet_key_set_kind(key, track_key_kind(t->type));
}

/*
 * The summary of a stored value; one the functions would reject gets the
 * key that covers everything.  Geography is summarised as the functions
 * see it: edges along their geodesics.
 */
void
track_stored_key(struct postgis_calls *calls, Datum value, track_type type, fr_key *key)
{
	track_report rep = {.check = true};
	glue_track	t;

	if (track_decode_value(calls, value, type, TRACK_GEODESIC, &rep, &t))
		track_key_of(&t, key);
	else
		fr_key_everything(key);
	if (rep.problem)
		pfree(rep.problem);
	track_free(&t);
}

/* The summary of track argument argidx (0-based) of a call, raising the functions' errors. */
void
track_argument_key(FunctionCallInfo fcinfo, int argidx, track_type type, fr_key *key)
{
	glue_track	t;

	track_decode_arg(fcinfo, argidx, type, TRACK_GEODESIC, &t);
	track_key_of(&t, key);
	track_free(&t);
}

/* frechet_track_key(track): the summary the index stores for a track. */
static Datum
track_key(FunctionCallInfo fcinfo, track_type type)
{
	fr_key	   *key = palloc(sizeof(fr_key));

	track_argument_key(fcinfo, 0, type, key);
	PG_RETURN_POINTER(key);
}

/* frechet_reach(route, epsilon): the route's summary with its reach (a chord for geography). */
static Datum
reach(FunctionCallInfo fcinfo, track_type type)
{
	double		eps = PG_GETARG_FLOAT8(1);
	fr_key	   *key = palloc(sizeof(fr_key));

	track_argument_key(fcinfo, 0, type, key);
	glue_check_epsilon(eps, 2);
	key->reach = track_engine_epsilon(type, eps);
	frechet_key_set_kind(key, track_key_kind(type));
	PG_RETURN_POINTER(key);
}

/*
 * The test behind an index operator (|~~| or |~~~|) on track argument
 * argidx: bound(track's summary, route's) within the reach.  Necessary,
 * not sufficient: the exact call always runs after it.
 */
static bool
within_reach(FunctionCallInfo fcinfo, int argidx, track_type type, const fr_key *reach,
			 double (*bound) (const fr_key *, const fr_key *))
{
	fr_key		key;

	frechet_key_check_kind(reach, track_key_kind(type), argidx + 1);
	track_argument_key(fcinfo, argidx, type, &key);
	return bound(&key, reach) <= frechet_key_reach(reach);
}

/* track |~~| reach: the condition of frechet_at_most. */
static Datum
within_reach_left(FunctionCallInfo fcinfo, track_type type)
{
	PG_RETURN_BOOL(within_reach(fcinfo, 0, type, PG_GETARG_FRECHET_KEY(1), fr_key_bound));
}

/* reach |~~| track, the commutator. */
static Datum
within_reach_right(FunctionCallInfo fcinfo, track_type type)
{
	PG_RETURN_BOOL(within_reach(fcinfo, 1, type, PG_GETARG_FRECHET_KEY(0), fr_key_bound));
}

/* track |~~~| reach: the condition of frechet_pings_at_most (fr_key_ping_bound). */
static Datum
pings_within_reach(FunctionCallInfo fcinfo, track_type type)
{
	PG_RETURN_BOOL(within_reach(fcinfo, 0, type, PG_GETARG_FRECHET_KEY(1), frechet_key_ping_bound));
}

/* trip |~~>| reach: the condition of frechet_passes (fr_key_passage_bound). */
static Datum
passes_within_reach(FunctionCallInfo fcinfo, track_type type)
{
	PG_RETURN_BOOL(within_reach(fcinfo, 0, type, PG_GETARG_FRECHET_KEY(1), fr_key_passage_bound));
}

TRACK_FUNCTIONS(frechet_track_key, track_key)
TRACK_FUNCTIONS(frechet_reach, reach)
TRACK_FUNCTIONS(frechet_within_reach, within_reach_left)
TRACK_FUNCTIONS(frechet_reach_within, within_reach_right)
TRACK_FUNCTIONS(frechet_pings_within_reach, pings_within_reach)
TRACK_FUNCTIONS(frechet_passes_within_reach, passes_within_reach)

PG_FUNCTION_INFO_V1(frechet_cheap_verdict_point_array);
/*
 * Which cheap bound settles "distance <= epsilon": 'far', 'near' or
 * 'undecided'.  Not part of the extension's SQL: the index benchmark binds
 * it to a temporary function to count the pairs each stage settles.
 */
Datum
frechet_cheap_verdict_point_array(PG_FUNCTION_ARGS)
{
	glue_track	a,
				b;
	double		eps = PG_GETARG_FLOAT8(2);
	fr_verdict	v;

	track_decode_pair(fcinfo, TRACK_POINTS, 0, 0, &a, &b);
	glue_check_epsilon(eps, 3);
	v = fr_cheap_decide(&a.curve, &b.curve, eps);
	PG_RETURN_TEXT_P(cstring_to_text(v == FR_FAR ? "far" : v == FR_NEAR ? "near" : "undecided"));
}
