/*
 * support.c - the planner support function of frechet_at_most.  When one
 * argument of frechet_at_most(a, b, epsilon) is a column (or expression)
 * with a frechet_track_ops GiST index, the planner asks this function for
 * an index condition.  We hand it
 *
 *     column |~~| frechet_reach(other, epsilon)
 *
 * which is necessary but not sufficient (lossy): the index returns every
 * track whose first vertex, last vertex and bounding-box sides lie within
 * epsilon of the route's, and frechet_at_most runs on each of them.  The
 * Fréchet distance is symmetric, so either argument may be the column.
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
#include "nodes/supportnodes.h"
#include "optimizer/optimizer.h"
#include "parser/parse_func.h"
#include "utils/lsyscache.h"
#include "utils/syscache.h"

#include "glue.h"
#include "index.h"

/* Builds "indexed |~~| frechet_reach(route, eps)" if the index's opfamily is ours. */
static List *
reach_index_condition(SupportRequestIndexCondition *req)
{
	FuncExpr   *call = (FuncExpr *) req->node;
	Node	   *indexed,
			   *route,
			   *eps;
	Oid			nsp,
				keytype,
				opno,
				reachfn;
	Oid			argtypes[2] = {POINTARRAYOID, FLOAT8OID};
	Expr	   *reach;

	if (!is_funcclause(req->node) || list_length(call->args) != 3 || req->indexarg > 1)
		return NIL;
	indexed = (Node *) list_nth(call->args, req->indexarg);
	route = (Node *) list_nth(call->args, 1 - req->indexarg);
	eps = (Node *) list_nth(call->args, 2);
	if (exprType(indexed) != POINTARRAYOID || exprType(route) != POINTARRAYOID)
		return NIL;
	if (!is_pseudo_constant_for_index(req->root, route, req->index) ||
		!is_pseudo_constant_for_index(req->root, eps, req->index))
		return NIL;

	/* our objects live in frechet_at_most's schema; never look them up by search_path */
	nsp = get_func_namespace(req->funcid);
	keytype = GetSysCacheOid2(TYPENAMENSP, Anum_pg_type_oid,
							  CStringGetDatum("frechet_key"), ObjectIdGetDatum(nsp));
	if (!OidIsValid(keytype))
		return NIL;
	opno = get_opfamily_member(req->opfamily, POINTARRAYOID, keytype, FRECHET_STRATEGY_REACH);
	if (!OidIsValid(opno))
		return NIL;				/* another operator class on point[] */
	reachfn = LookupFuncName(list_make2(makeString(get_namespace_name(nsp)),
										makeString("frechet_reach")),
							 2, argtypes, true);
	if (!OidIsValid(reachfn))
		return NIL;

	reach = (Expr *) makeFuncExpr(reachfn, keytype, list_make2(route, eps),
								  InvalidOid, InvalidOid, COERCE_EXPLICIT_CALL);
	req->lossy = true;
	return list_make1(make_opclause(opno, BOOLOID, false, (Expr *) indexed, reach,
									InvalidOid, InvalidOid));
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

PG_FUNCTION_INFO_V1(frechet_at_most_support);
/* Planner support for frechet_at_most: a lossy index condition. */
Datum
frechet_at_most_support(PG_FUNCTION_ARGS)
{
	Node	   *rawreq = (Node *) PG_GETARG_POINTER(0);

	if (IsA(rawreq, SupportRequestSimplify))
		glue_check_constant_epsilon(rawreq);
	if (IsA(rawreq, SupportRequestIndexCondition))
	{
		List	   *conds = reach_index_condition((SupportRequestIndexCondition *) rawreq);

		if (conds != NIL)
			PG_RETURN_POINTER(conds);
	}
	PG_RETURN_POINTER(NULL);
}

/*
 * "trip |~~~| frechet_reach(route, epsilon)" for frechet_pings_at_most(trip,
 * route, epsilon[, max_gap]) when trip has an index of ours, on any input
 * type: frechet_reach for the route's type is looked up in the schema of
 * the function being planned (never by search_path), and the operator in
 * the index's operator family under FRECHET_STRATEGY_PINGS.  The route
 * may reach anywhere between two pings, so only the trip can be the
 * indexed argument.
 */
static List *
pings_index_condition(SupportRequestIndexCondition *req)
{
	FuncExpr   *call = (FuncExpr *) req->node;
	Node	   *trip,
			   *route,
			   *eps;
	Oid			argtypes[2],
				reachfn,
				keytype,
				opno;
	Expr	   *reach;

	if (!is_funcclause(req->node) || list_length(call->args) < 3 || req->indexarg != 0)
		return NIL;
	trip = (Node *) linitial(call->args);
	route = (Node *) lsecond(call->args);
	eps = (Node *) lthird(call->args);
	if (!is_pseudo_constant_for_index(req->root, route, req->index) ||
		!is_pseudo_constant_for_index(req->root, eps, req->index))
		return NIL;
	argtypes[0] = exprType(route);
	argtypes[1] = FLOAT8OID;
	reachfn = LookupFuncName(list_make2(makeString(get_namespace_name(get_func_namespace(req->funcid))),
										makeString("frechet_reach")),
							 2, argtypes, true);
	if (!OidIsValid(reachfn))
		return NIL;
	keytype = get_func_rettype(reachfn);
	opno = get_opfamily_member(req->opfamily, exprType(trip), keytype, FRECHET_STRATEGY_PINGS);
	if (!OidIsValid(opno))
		return NIL;				/* an index of another operator class */
	reach = (Expr *) makeFuncExpr(reachfn, keytype, list_make2(route, eps),
								  InvalidOid, InvalidOid, COERCE_EXPLICIT_CALL);
	req->lossy = true;
	return list_make1(make_opclause(opno, BOOLOID, false, (Expr *) trip, reach,
									InvalidOid, InvalidOid));
}

PG_FUNCTION_INFO_V1(frechet_pings_support);
/* Planner support for frechet_pings_at_most on every input type: a lossy index condition. */
Datum
frechet_pings_support(PG_FUNCTION_ARGS)
{
	Node	   *rawreq = (Node *) PG_GETARG_POINTER(0);

	if (IsA(rawreq, SupportRequestIndexCondition))
	{
		List	   *conds = pings_index_condition((SupportRequestIndexCondition *) rawreq);

		if (conds != NIL)
			PG_RETURN_POINTER(conds);
	}
	PG_RETURN_POINTER(NULL);
}
