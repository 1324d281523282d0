/*
 * srf.c - what calls keep or return beyond one value: the materialized
 * result of a set-returning SQL function, and the bytes of a query value
 * that a per-call-site cache is keyed on.
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

/* Does value have the kept bytes? */
bool
glue_bytes_same(const glue_bytes *kept, Datum value)
{
	struct varlena *raw = (struct varlena *) DatumGetPointer(value);

	return kept->raw != NULL && !VARATT_IS_EXTERNAL_EXPANDED(raw) &&
		kept->len == VARSIZE_ANY(raw) && memcmp(kept->raw, raw, kept->len) == 0;
}

/* Forgets the kept bytes (before decoding a new value, which may fail). */
void
glue_bytes_forget(glue_bytes *kept)
{
	if (kept->raw != NULL)
		pfree(kept->raw);
	kept->raw = NULL;
}

/* Keeps a copy of value's bytes in mcxt (none for an expanded value, which may change in place). */
void
glue_bytes_keep(glue_bytes *kept, Datum value, MemoryContext mcxt)
{
	struct varlena *raw = (struct varlena *) DatumGetPointer(value);

	glue_bytes_forget(kept);
	if (VARATT_IS_EXTERNAL_EXPANDED(raw))
		return;
	kept->len = VARSIZE_ANY(raw);
	kept->raw = MemoryContextAlloc(mcxt, kept->len);
	memcpy(kept->raw, raw, kept->len);
}
