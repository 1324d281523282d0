/*
 * srf.c - the materialized result of a set-returning SQL function.
 */
#include "postgres.h"

#include "fmgr.h"
#include "funcapi.h"
#include "miscadmin.h"
#include "utils/memutils.h"
#include "utils/tuplestore.h"

#include "glue.h"

/*
 * Sets up a set-returning call's materialized result: a tuple store and
 * the result descriptor in per-query memory, as InitMaterializedSRF does.
 * That function asks get_call_result_type (unless told to copy the
 * expected descriptor, which a call in the select list does not have),
 * which leaves the OUT-parameter arrays it deconstructs in per-query
 * memory on every call: 80 to 160 bytes a call, measured, so one query
 * calling the function once a row grew without bound.  Here the
 * descriptor is worked out in a scratch context, deleted before
 * returning; only the copy that the executor frees after the call, and
 * the tuple store it ends, are left.
 */
void
glue_srf_materialize(FunctionCallInfo fcinfo)
{
	ReturnSetInfo *rsinfo = (ReturnSetInfo *) fcinfo->resultinfo;
	MemoryContext scratch,
				old;
	TupleDesc	desc;
	Tuplestorestate *store;

	if (rsinfo == NULL || !IsA(rsinfo, ReturnSetInfo) ||
		(rsinfo->allowedModes & SFRM_Materialize) == 0)
		ereport(ERROR,
				(errcode(ERRCODE_FEATURE_NOT_SUPPORTED),
				 errmsg("set-valued function called in context that cannot accept a set")));
	scratch = AllocSetContextCreate(CurrentMemoryContext, "frechet_ext result type",
									ALLOCSET_SMALL_SIZES);
	old = MemoryContextSwitchTo(scratch);
	if (rsinfo->expectedDesc != NULL)
		desc = rsinfo->expectedDesc;
	else if (get_call_result_type(fcinfo, NULL, &desc) != TYPEFUNC_COMPOSITE)
		elog(ERROR, "return type must be a row type");
	MemoryContextSwitchTo(rsinfo->econtext->ecxt_per_query_memory);
	desc = CreateTupleDescCopy(desc);
	store = tuplestore_begin_heap((rsinfo->allowedModes & SFRM_Materialize_Random) != 0,
								  false, work_mem);
	MemoryContextSwitchTo(old);
	MemoryContextDelete(scratch);
	rsinfo->returnMode = SFRM_Materialize;
	rsinfo->setResult = store;
	rsinfo->setDesc = desc;
}
