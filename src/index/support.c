/*
 * support.c - the planner support functions of frechet_at_most and
 * frechet_pings_at_most, one for every track type.  When an argument of
 * frechet_at_most(a, b, epsilon) is a column (or expression) with an index
 * of our operator classes, the planner asks for an index condition, and
 * gets
 *
 *     column |~~| frechet_reach(other, epsilon)
 *
 * which is necessary but not sufficient (lossy): the index returns every
 * track whose first vertex, last vertex and bounding-box sides lie within
 * epsilon of the route's, and frechet_at_most runs on each of them.  The
 * Fréchet distance is symmetric, so either argument may be the column.
 * frechet_pings_at_most gets "trip |~~~| frechet_reach(route, epsilon)"
 * the same way.  A strategy is one entry here: the operator's strategy
 * number, looked up in the index's operator family.
 *
 * frechet_reach validates epsilon, so with such an index a NaN or negative
 * epsilon raised 22023 even when no row qualified, while a sequential scan
 * that called frechet_at_most on no row returned nothing.  The function
 * raises on such an epsilon, so every plan now does: when epsilon is a
 * constant, it is checked while the call is simplified during planning.
 */
#include "postgres.h"

#include "catalog/pg_type.h"
#include "nodes/makefuncs.h"
#include "nodes/nodeFuncs.h"
#include "nodes/pathnodes.h"
#include "nodes/supportnodes.h"
#include "optimizer/optimizer.h"
#include "parser/parse_func.h"
#include "access/detoast.h"
#include "access/relation.h"
#include "catalog/pg_class.h"
#include "storage/bufmgr.h"
#include "utils/rel.h"
#include "optimizer/cost.h"
#include "utils/lsyscache.h"
#include "utils/syscache.h"

#include "index.h"
#include "postgis.h"

Oid
frechet_reach_function(Oid funcid, Oid routetype)
{
	Oid			argtypes[2] = {routetype, FLOAT8OID};

	return LookupFuncName(list_make2(makeString(get_namespace_name(get_func_namespace(funcid))),
									 makeString("frechet_reach")),
						  2, argtypes, true);
}

/*
 * "indexed OP frechet_reach(route, eps)", with OP the operator of the
 * index's operator family under strategy for (indexed's type,
 * frechet_key); NIL when there is none (an index of another class).
 * frechet_reach for the route's type is looked up in the schema of the
 * function being planned, never by search_path.
 */
static List *
reach_condition(SupportRequestIndexCondition *req, Node *indexed, Node *route, Node *eps,
				StrategyNumber strategy)
{
	Oid			reachfn,
				keytype,
				opno;
	Expr	   *reach;

	reachfn = frechet_reach_function(req->funcid, exprType(route));
	if (!OidIsValid(reachfn))
		return NIL;
	keytype = get_func_rettype(reachfn);
	opno = get_opfamily_member(req->opfamily, exprType(indexed), keytype, strategy);
	if (!OidIsValid(opno))
		return NIL;
	reach = (Expr *) makeFuncExpr(reachfn, keytype, list_make2(route, eps),
								  InvalidOid, InvalidOid, COERCE_EXPLICIT_CALL);
	req->lossy = true;
	return list_make1(make_opclause(opno, BOOLOID, false, (Expr *) indexed, reach,
									InvalidOid, InvalidOid));
}

/*
 * The call's indexed argument (req->indexarg, which must be one of those
 * in indexable, a bit mask) and the route and epsilon (arguments 2 and 3
 * in the call, the route being the other of the first two), which must be
 * constant during the scan; false otherwise.
 */
static bool
call_arguments(SupportRequestIndexCondition *req, int min_args, int max_args, int indexable,
			   Node **indexed, Node **route, Node **eps)
{
	FuncExpr   *call = (FuncExpr *) req->node;

	if (!is_funcclause(req->node) || list_length(call->args) < min_args ||
		list_length(call->args) > max_args || req->indexarg > 1 ||
		(indexable & (1 << req->indexarg)) == 0)
		return false;
	*indexed = (Node *) list_nth(call->args, req->indexarg);
	*route = (Node *) list_nth(call->args, 1 - req->indexarg);
	*eps = (Node *) lthird(call->args);
	return is_pseudo_constant_for_index(req->root, *route, req->index) &&
		is_pseudo_constant_for_index(req->root, *eps, req->index);
}

/*
 * SupportRequestSimplify of frechet_at_most (every input type): a constant
 * epsilon is validated as the function would, so that a bad one raises
 * 22023 whatever the plan, even one that calls the function on no row.
 */
void
glue_check_constant_epsilon(Node *rawreq)
{
	SupportRequestSimplify *req = (SupportRequestSimplify *) rawreq;
	Node	   *eps;

	if (list_length(req->fcall->args) != 3)
		return;
	eps = (Node *) lthird(req->fcall->args);
	if (IsA(eps, Const) && !((Const *) eps)->constisnull &&
		((Const *) eps)->consttype == FLOAT8OID)
		glue_check_epsilon(DatumGetFloat8(((Const *) eps)->constvalue), 3);
}

/*
 * Does the table have an index of our operator classes (one whose family
 * holds |~~| for the column's type) on the same plain column as the index
 * being planned?  Then frechet_at_most offers PostGIS's own index no
 * condition, and the planner takes ours: PostGIS's && keeps every trip
 * whose box meets the route's widened box, ours tests first and last
 * vertices and box sides too (10x fewer rows on the benchmark's table).
 */
static bool
our_index_beside(SupportRequestIndexCondition *req, Node *indexed)
{
	IndexOptInfo *index = req->index;
	int			column = index->indexkeys[req->indexcol];
	Oid			reachfn;
	ListCell   *lc;

	if (column == 0)
		return false;			/* an expression: not compared here */
	reachfn = frechet_reach_function(req->funcid, exprType(indexed));
	if (!OidIsValid(reachfn))
		return false;
	foreach(lc, index->rel->indexlist)
	{
		IndexOptInfo *other = (IndexOptInfo *) lfirst(lc);

		if (other == index || other->indexkeys[0] != column)
			continue;
		if (OidIsValid(get_opfamily_member(other->opfamily[0], exprType(indexed), get_func_rettype(reachfn),
										   FRECHET_STRATEGY_REACH)))
			return true;
	}
	return false;
}

/*
 * The work of one call in units of cpu_operator_cost: a base for the call
 * and its argument checks, and one unit per vertex of the two tracks
 * (their decoding and the cheap bounds, which settle most calls).
 * Measured on the benchmark's 260-vertex trips (bench/README.md): 2.2 us
 * for a call the bounds settle, 4.8 us for one near the route, against
 * about 6 ns for a built-in operator.  PostgreSQL charges no cost for
 * detoasting a value, for its own operators neither, so neither do we.
 */
#define CALL_COST_BASE 10.0
#define CALL_COST_PER_VERTEX 1.0

/* Bytes of the stored value per vertex: 16 for point[] and 2D PostGIS values. */
#define BYTES_PER_VERTEX 16.0

/* Estimated vertices of a constant track argument, from its size; -1 for others. */
static double
argument_vertices(Node *arg)
{
	while (arg != NULL && IsA(arg, RelabelType))
		arg = (Node *) ((RelabelType *) arg)->arg;
	if (arg == NULL)
		return -1;
	if (IsA(arg, Const))
		return ((Const *) arg)->constisnull ? 0 :
			toast_raw_datum_size(((Const *) arg)->constvalue) / BYTES_PER_VERTEX;
	return -1;
}

/*
 * Bytes a row keeps out of line: the size of its table's TOAST relation
 * over the table's estimated rows (0 without one).  The average width of
 * a column in the statistics counts a value moved there as its pointer,
 * and long tracks always are.
 */
static double
toast_bytes_per_row(Oid relid, double rows)
{
	Oid			toast = InvalidOid;
	HeapTuple	tup;
	Relation	rel;
	double		bytes;

	if (rows <= 0)
		return 0;
	tup = SearchSysCache1(RELOID, ObjectIdGetDatum(relid));
	if (HeapTupleIsValid(tup))
	{
		toast = ((Form_pg_class) GETSTRUCT(tup))->reltoastrelid;
		ReleaseSysCache(tup);
	}
	if (!OidIsValid(toast))
		return 0;
	rel = relation_open(toast, AccessShareLock);
	bytes = RelationGetNumberOfBlocks(rel) * (double) BLCKSZ / rows;
	relation_close(rel, AccessShareLock);
	return bytes;
}

/*
 * A plain column's average size: its width in the statistics plus what
 * its table keeps out of line a row; else 0.
 */
static double
column_width(PlannerInfo *root, Node *arg)
{
	Var		   *var = root != NULL ? frechet_plain_column(root, arg) : NULL;
	RangeTblEntry *rte;
	RelOptInfo *rel;

	if (var == NULL)
		return 0;
	rte = root->simple_rte_array[var->varno];
	rel = root->simple_rel_array[var->varno];
	if (rte == NULL || rte->rtekind != RTE_RELATION)
		return 0;
	return Max(0, get_attavgwidth(rte->relid, var->varattno)) + toast_bytes_per_row(rte->relid, rel->tuples);
}

/*
 * SupportRequestCost: CALL_COST_BASE + CALL_COST_PER_VERTEX x (vertices
 * of both tracks), times cpu_operator_cost.  A column's track is taken as
 * long as column_width says, and every track at least as long as the
 * other (trips are compared with routes of their kind; a parameter's size
 * is unknown).  The declared COST stays for
 * calls the planner shows no expression of.  Sized so that the planner
 * still evaluates these calls after PostgreSQL's own operators and
 * weighs parallel plans, without a full (inlined, optimised) JIT
 * compilation of ordinary scans whose time is the calls' own.
 */
static bool
call_cost(SupportRequestCost *req)
{
	FuncExpr   *call = (FuncExpr *) req->node;
	double		v[2];

	if (call == NULL || !IsA(call, FuncExpr) || list_length(call->args) < 2)
		return false;
	for (int a = 0; a < 2; a++)
	{
		Node	   *arg = (Node *) list_nth(call->args, a);

		v[a] = argument_vertices(arg);
		if (v[a] < 0)
			v[a] = column_width(req->root, arg) / BYTES_PER_VERTEX;
	}
	for (int a = 0; a < 2; a++)
		v[a] = Max(v[a], v[1 - a]);
	req->startup = 0;
	req->per_tuple = cpu_operator_cost * (CALL_COST_BASE + CALL_COST_PER_VERTEX * (v[0] + v[1]));
	return true;
}

/*
 * A planner support function for one strategy: a constant epsilon checked
 * while planning (check_eps), and "indexed OP frechet_reach(route, eps)"
 * for a call of min_args..max_args arguments whose indexed argument is
 * one of indexable (bit mask of the first two); with postgis, on an index
 * of PostGIS's own class, the && condition of box_strategies.c instead.
 */
static Datum
strategy_support(FunctionCallInfo fcinfo, int min_args, int max_args, int indexable,
				 StrategyNumber strategy, bool check_eps, bool postgis)
{
	Node	   *rawreq = (Node *) PG_GETARG_POINTER(0);

	if (check_eps && IsA(rawreq, SupportRequestSimplify))
		glue_check_constant_epsilon(rawreq);
	if (IsA(rawreq, SupportRequestCost) && call_cost((SupportRequestCost *) rawreq))
		PG_RETURN_POINTER(rawreq);
	if (IsA(rawreq, SupportRequestSelectivity) &&
		frechet_estimate_selectivity((SupportRequestSelectivity *) rawreq, min_args, max_args,
									 indexable, strategy))
		PG_RETURN_POINTER(rawreq);
	if (IsA(rawreq, SupportRequestIndexCondition))
	{
		SupportRequestIndexCondition *req = (SupportRequestIndexCondition *) rawreq;
		Node	   *indexed,
				   *route,
				   *eps;
		List	   *conds = NIL;

		if (call_arguments(req, min_args, max_args, indexable, &indexed, &route, &eps))
		{
			conds = reach_condition(req, indexed, route, eps, strategy);
			if (conds == NIL && postgis && !our_index_beside(req, indexed))
				conds = postgis_box_index_condition(req, indexed, route, eps);
		}
		if (conds != NIL)
			PG_RETURN_POINTER(conds);
	}
	PG_RETURN_POINTER(NULL);
}

/*
 * The strategies.  frechet_at_most: either argument may be indexed (the
 * distance is symmetric).  frechet_pings_at_most(trip, route, epsilon[,
 * max_gap]): the trip only, as the route may reach anywhere between two
 * pings.  frechet_passes(trip, stretch, epsilon): the trip only, matched
 * in part.
 */
PG_FUNCTION_INFO_V1(frechet_at_most_support);
Datum
frechet_at_most_support(PG_FUNCTION_ARGS)
{
	return strategy_support(fcinfo, 3, 3, 0x3, FRECHET_STRATEGY_REACH, true, false);
}

PG_FUNCTION_INFO_V1(frechet_geo_at_most_support);
Datum
frechet_geo_at_most_support(PG_FUNCTION_ARGS)
{
	return strategy_support(fcinfo, 3, 3, 0x3, FRECHET_STRATEGY_REACH, true, true);
}

PG_FUNCTION_INFO_V1(frechet_pings_support);
Datum
frechet_pings_support(PG_FUNCTION_ARGS)
{
	return strategy_support(fcinfo, 3, 4, 0x1, FRECHET_STRATEGY_PINGS, false, false);
}

PG_FUNCTION_INFO_V1(frechet_passes_support);
Datum
frechet_passes_support(PG_FUNCTION_ARGS)
{
	return strategy_support(fcinfo, 3, 3, 0x1, FRECHET_STRATEGY_PASSES, true, false);
}
