/*
 * module.c - module set-up (settings), the engine environment (palloc
 * into a scratch context, CHECK_FOR_INTERRUPTS) and the checks every SQL
 * function shares: engine status, tolerances.
 */
#include "postgres.h"

#include <limits.h>
#include <math.h>

#include "fmgr.h"
#include "miscadmin.h"
#include "catalog/pg_type.h"
#include "utils/builtins.h"
#include "utils/geo_decls.h"
#include "utils/guc.h"
#include "utils/memutils.h"

#include "glue.h"

PG_MODULE_MAGIC;

int			frechet_max_memory_kb = 256 * 1024;
int			frechet_max_memory_limit_kb = 1024 * 1024;

void		_PG_init(void);

/*
 * Check hook of frechet_ext.max_memory: a SET in a session (or a client's
 * connection option) above frechet_ext.max_memory_limit is refused.  Values
 * from the configuration file, ALTER DATABASE or ALTER ROLE are accepted,
 * as the two settings may arrive in any order there; glue_env_begin uses
 * the smaller of the two in every case.
 */
static bool
check_max_memory(int *newval, void **extra, GucSource source)
{
	if (source >= PGC_S_CLIENT && source != PGC_S_TEST &&
		*newval > frechet_max_memory_limit_kb)
	{
		GUC_check_errcode(ERRCODE_INVALID_PARAMETER_VALUE);
		GUC_check_errmsg("frechet_ext.max_memory cannot exceed frechet_ext.max_memory_limit");
		GUC_check_errdetail("%d kB was asked for; the limit a superuser set is %d kB.",
							*newval, frechet_max_memory_limit_kb);
		GUC_check_errhint("Ask a superuser to raise frechet_ext.max_memory_limit.");
		return false;
	}
	return true;
}

/* Registers the settings of the extension. */
void
_PG_init(void)
{
	DefineCustomIntVariable("frechet_ext.max_memory_limit",
							"Ceiling of frechet_ext.max_memory; only superusers may change it.",
							"Every call is limited by the smaller of the two settings.",
							&frechet_max_memory_limit_kb,
							1024 * 1024,
							64,
							MAX_KILOBYTES,
							PGC_SUSET,
							GUC_UNIT_KB,
							NULL, NULL, NULL);
	DefineCustomIntVariable("frechet_ext.max_memory",
							"Largest scratch memory one frechet_ext call may use.",
							"Checked before any allocation; calls that would need more fail.  At most frechet_ext.max_memory_limit.",
							&frechet_max_memory_kb,
							256 * 1024,
							64,
							MAX_KILOBYTES,
							PGC_USERSET,
							GUC_UNIT_KB,
							check_max_memory, NULL, NULL);
	MarkGUCPrefixReserved("frechet_ext");
}

/* Engine allocator: scratch memory in the call's own context. */
static void *
glue_alloc(size_t size, void *arg)
{
	return MemoryContextAllocExtended((MemoryContext) arg, size,
									  MCXT_ALLOC_HUGE | MCXT_ALLOC_NO_OOM);
}

/* Engine release: pfree. */
static void
glue_release(void *ptr, void *arg)
{
	pfree(ptr);
}

/* Engine interrupt callback: a cancel or statement_timeout long-jumps out from here. */
static int
glue_interrupted(void *arg)
{
	CHECK_FOR_INTERRUPTS();
	return 0;
}

/*
 * Checks the memory limit (the smaller of frechet_ext.max_memory and its
 * ceiling frechet_ext.max_memory_limit), then creates the scratch context
 * for one call.
 */
void
glue_env_begin(glue_env *g, size_t scratch_bytes, const char *what)
{
	bool		ceiling = frechet_max_memory_limit_kb < frechet_max_memory_kb;
	int			limit_kb = ceiling ? frechet_max_memory_limit_kb : frechet_max_memory_kb;

	if (scratch_bytes > (size_t) limit_kb * 1024)
	{
		if (ceiling)
			ereport(ERROR,
					(errcode(ERRCODE_PROGRAM_LIMIT_EXCEEDED),
					 errmsg("%s needs more memory than frechet_ext.max_memory_limit allows", what),
					 errdetail("The call needs about %zu kB of scratch memory; frechet_ext.max_memory is %d kB, but a superuser limited it to %d kB.",
							   scratch_bytes / 1024 + 1, frechet_max_memory_kb, limit_kb),
					 errhint("Ask a superuser to raise frechet_ext.max_memory_limit, or simplify the curves first.")));
		ereport(ERROR,
				(errcode(ERRCODE_PROGRAM_LIMIT_EXCEEDED),
				 errmsg("%s needs more memory than frechet_ext.max_memory allows", what),
				 errdetail("The call needs about %zu kB of scratch memory; the limit is %d kB.",
						   scratch_bytes / 1024 + 1, limit_kb),
				 errhint("Raise frechet_ext.max_memory (up to frechet_ext.max_memory_limit, %d kB), or simplify the curves first.",
						 frechet_max_memory_limit_kb)));
	}
	g->cxt = AllocSetContextCreate(CurrentMemoryContext, "frechet_ext scratch",
								   ALLOCSET_DEFAULT_SIZES);
	g->env.alloc = glue_alloc;
	g->env.release = glue_release;
	g->env.interrupted = glue_interrupted;
	g->env.arg = g->cxt;
}

/* Frees the scratch context of one call. */
void
glue_env_end(glue_env *g)
{
	MemoryContextDelete(g->cxt);
}

/* Turns a non-OK engine status into an ERROR. */
void
glue_check_status(fr_status st, const char *what)
{
	if (st == FR_OK)
		return;
	if (st == FR_ENOMEM)
		ereport(ERROR,
				(errcode(ERRCODE_OUT_OF_MEMORY),
				 errmsg("out of memory in %s", what)));
	if (st == FR_ERANGE)
		ereport(ERROR,
				(errcode(ERRCODE_NUMERIC_VALUE_OUT_OF_RANGE),
				 errmsg("coordinates of %s span too many orders of magnitude to compute exactly", what),
				 errdetail("A nonzero coordinate, measured from the curves' common centre (and scaled up when the curves are tiny as a whole), is below 2^-450 (about 3.5e-136), where squared distances underflow."),
				 errhint("Round the coordinates to a sensible resolution, for example 1e-9 of the curves' extent.")));
	elog(ERROR, "%s failed in the engine: %s", what, fr_status_text(st));
}

/* Validates a tolerance argument: not NaN, not negative. */
void
glue_check_epsilon(double eps, int argno)
{
	if (isnan(eps) || eps < 0)
		ereport(ERROR,
				(errcode(ERRCODE_INVALID_PARAMETER_VALUE),
				 errmsg("epsilon must be a non-negative number"),
				 errdetail("Argument %d is %s.", argno, isnan(eps) ? "NaN" : "negative")));
}

/* Validates a simplification tolerance (argument 2): not NaN, not negative. */
void
glue_check_tolerance(double tol)
{
	if (isnan(tol) || tol < 0)
		ereport(ERROR,
				(errcode(ERRCODE_INVALID_PARAMETER_VALUE),
				 errmsg("tolerance must be a non-negative number"),
				 errdetail("Argument 2 is %s.", isnan(tol) ? "NaN" : "negative")));
}
