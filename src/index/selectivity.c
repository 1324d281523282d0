/*
 * selectivity.c - row estimates for frechet_at_most, frechet_pings_at_most
 * and frechet_passes in a WHERE clause (the planner support functions'
 * SupportRequestSelectivity).
 *
 * PostgreSQL's default for a boolean function is a third of the table,
 * and no statistic of a point[], geometry or geography column describes
 * which tracks lie near a route.  Our index does: when the clause's track
 * column has an index of our classes and the other arguments are
 * constants, the estimate is
 *
 *     (index entries the strategy's key test admits)
 *       x (share of a sample of those rows that the function itself keeps)
 *
 * The first factor comes from a walk of the index that reads at most
 * PROBE_PAGES pages: level by level, every entry of a page is tested with
 * the key test of the index scan itself (frechet_key_admits); when the
 * next level has more admitted children than pages left, an evenly spaced
 * subset is read and each stands for the children it skipped (weights).
 * The second factor comes from up to PROBE_SAMPLES admitted entries,
 * chosen evenly by weight: their rows are fetched under the query's
 * snapshot and the clause's function runs on them, as the filter would.
 * When no more entries are admitted than the sample holds, all of them
 * are checked and the estimate is the exact count (rows not visible to
 * the query's snapshot count as not kept).  Entries whose key
 * covers everything (tracks the functions reject) are never checked: the
 * function would raise at planning time; they count as not kept.
 *
 * This reads index pages and up to PROBE_SAMPLES rows while planning, like
 * PostgreSQL's own look-ups of a b-tree's end values: about 1-2 ms on the
 * benchmark's 200,000 trips (a range query takes 15-100 ms), and at most
 * PROBE_MS of function calls.  Without such an index, with a route or
 * epsilon that is not a constant while planning (a parameter of a generic
 * plan), in a join clause, under row-level security or without SELECT on
 * the column (column_readable), the support function declines and the
 * default stays.
 */
#include "postgres.h"

#include "access/genam.h"
#include "access/gist_private.h"
#include "access/relation.h"
#include "access/table.h"
#include "access/tableam.h"
#include "catalog/pg_am_d.h"
#include "executor/tuptable.h"
#include "miscadmin.h"
#include "nodes/nodeFuncs.h"
#include "nodes/pathnodes.h"
#include "nodes/supportnodes.h"
#include "optimizer/optimizer.h"
#include "optimizer/pathnode.h"
#include "parser/parsetree.h"
#include "portability/instr_time.h"
#include "storage/bufmgr.h"
#include "utils/acl.h"
#include "utils/lsyscache.h"
#include "utils/memutils.h"
#include "utils/snapmgr.h"

#include "index.h"

/* Index pages the walk reads at most, rows it checks at most, and milliseconds of checks. */
#define PROBE_PAGES 128
#define PROBE_SAMPLES 32
#define PROBE_MS 20.0

/* A page to read, standing for weight pages of its level. */
typedef struct probe_page
{
	BlockNumber blkno;
	double		weight;
} probe_page;

/* An admitted leaf entry. */
typedef struct probe_match
{
	ItemPointerData tid;
	double		weight;
} probe_match;

/* What the walk found. */
typedef struct probe_walk
{
	double		admitted;		/* estimated admitted entries, all */
	double		checkable;		/* of them, with a key of a valid track */
	probe_match *matches;		/* the checkable ones read */
	int			nmatches;
	int			maxmatches;
} probe_walk;

Var *
frechet_plain_column(PlannerInfo *root, Node *node)
{
	Var		   *var;

	while (node != NULL && IsA(node, RelabelType))
		node = (Node *) ((RelabelType *) node)->arg;
	if (node == NULL || !IsA(node, Var))
		return NULL;
	var = (Var *) node;
	if (var->varlevelsup != 0 || var->varattno <= 0 || var->varno <= 0 ||
		var->varno >= root->simple_rel_array_size || root->simple_rel_array[var->varno] == NULL ||
		root->simple_rel_array[var->varno]->reloptkind == RELOPT_JOINREL)
		return NULL;
	return var;
}

/*
 * May the estimate read this column's rows and index entries?  Not under
 * row-level security (the policies' conditions are the RTE's security
 * quals) nor without SELECT on the table or the column for the user the
 * query runs as: the same rule by which PostgreSQL withholds a column's
 * statistics from functions that are not leakproof (examine_variable).
 */
static bool
column_readable(PlannerInfo *root, Var *var)
{
	RangeTblEntry *rte = planner_rt_fetch(var->varno, root);
	Oid			userid;

	if (rte->rtekind != RTE_RELATION || rte->securityQuals != NIL)
		return false;
	userid = OidIsValid(rte->checkAsUser) ? rte->checkAsUser : GetUserId();
	return pg_class_aclcheck(rte->relid, userid, ACL_SELECT) == ACLCHECK_OK ||
		pg_attribute_aclcheck(rte->relid, var->varattno, userid, ACL_SELECT) == ACLCHECK_OK;
}

/* Does a key cover everything (the key of a track the functions reject)? */
static bool
key_covers_everything(const fr_key *key)
{
	for (int i = 0; i < FR_KEY_NDIM; i++)
		if (isinf(key->lo[i]) || isinf(key->hi[i]))
			return true;
	return false;
}

/* Reads one page: admitted leaf entries into w, admitted children appended to next. */
static void
probe_read_page(Relation irel, gist_key_format format, probe_page pg, const fr_key *query,
				StrategyNumber strategy, probe_walk *w, probe_page **next, int *nnext, int *maxnext)
{
	TupleDesc	td = RelationGetDescr(irel);
	Buffer		buf = ReadBuffer(irel, pg.blkno);
	Page		page;
	OffsetNumber maxoff;
	bool		leaf;

	LockBuffer(buf, GIST_SHARE);
	page = BufferGetPage(buf);
	if (PageIsNew(page) || GistPageIsDeleted(page))
	{
		UnlockReleaseBuffer(buf);
		return;
	}
	leaf = GistPageIsLeaf(page);
	maxoff = PageGetMaxOffsetNumber(page);
	for (OffsetNumber off = FirstOffsetNumber; off <= maxoff; off = OffsetNumberNext(off))
	{
		ItemId		iid = PageGetItemId(page, off);
		IndexTuple	itup;
		Datum		d;
		bool		isnull;
		fr_key		key;

		if (!ItemIdIsUsed(iid) || ItemIdIsDead(iid))
			continue;
		itup = (IndexTuple) PageGetItem(page, iid);
		if (GistTupleIsInvalid(itup))
			continue;
		d = index_getattr(itup, 1, td, &isnull);
		if (isnull)
			continue;
		frechet_index_key_read(d, format, &key);
		if (!frechet_key_admits(&key, query, strategy))
			continue;
		if (!leaf)
		{
			if (*nnext == *maxnext)
			{
				*maxnext *= 2;
				*next = repalloc(*next, *maxnext * sizeof(probe_page));
			}
			(*next)[(*nnext)++] = (probe_page)
			{
				ItemPointerGetBlockNumber(&itup->t_tid), pg.weight
			};
			continue;
		}
		w->admitted += pg.weight;
		if (key_covers_everything(&key))
			continue;
		w->checkable += pg.weight;
		if (w->nmatches == w->maxmatches)
		{
			w->maxmatches *= 2;
			w->matches = repalloc(w->matches, w->maxmatches * sizeof(probe_match));
		}
		w->matches[w->nmatches].tid = itup->t_tid;
		w->matches[w->nmatches].weight = pg.weight;
		w->nmatches++;
	}
	UnlockReleaseBuffer(buf);
}

/* Walks the index level by level within PROBE_PAGES pages. */
static void
probe_walk_index(Relation irel, gist_key_format format, const fr_key *query, StrategyNumber strategy,
				 probe_walk *w)
{
	int			maxcur = 64,
				maxnext = 64,
				ncur = 1,
				pages = 0;
	probe_page *cur = palloc(maxcur * sizeof(probe_page));
	probe_page *next = palloc(maxnext * sizeof(probe_page));

	w->maxmatches = 256;
	w->matches = palloc(w->maxmatches * sizeof(probe_match));
	cur[0] = (probe_page)
	{
		GIST_ROOT_BLKNO, 1.0
	};
	while (ncur > 0)
	{
		int			nnext = 0;
		int			left;

		for (int i = 0; i < ncur; i++)
		{
			CHECK_FOR_INTERRUPTS();
			probe_read_page(irel, format, cur[i], query, strategy, w, &next, &nnext, &maxnext);
			pages++;
		}
		/* the next level: all of it, or an evenly spaced subset carrying the others' weight */
		left = Max(1, PROBE_PAGES - pages);
		if (nnext > left)
		{
			double		total = 0,
						kept = 0;

			for (int i = 0; i < nnext; i++)
				total += next[i].weight;
			for (int i = 0; i < left; i++)
			{
				next[i] = next[(int) (((double) i + 0.5) * nnext / left)];
				kept += next[i].weight;
			}
			for (int i = 0; i < left; i++)
				next[i].weight *= total / kept;
			nnext = left;
		}
		/* swap the levels */
		{
			probe_page *t = cur;
			int			tm = maxcur;

			cur = next;
			maxcur = maxnext;
			next = t;
			maxnext = tm;
			ncur = nnext;
		}
	}
	pfree(cur);
	pfree(next);
}

/* The radical inverse of i in base 2 (van der Corput): 0, 1/2, 1/4, 3/4, 1/8, ... */
static double
radical_inverse(unsigned int i)
{
	double		r = 0,
				f = 0.5;

	for (; i > 0; i >>= 1, f /= 2)
		if (i & 1)
			r += f;
	return r;
}

/*
 * The matches to check, in the order to check them: with nsamples equal
 * to the matches (all of weight 1), each once; else nsamples places spread
 * by weight.  Either way in the order of the radical inverse, so that the
 * checks made before PROBE_MS runs out are spread over the whole index
 * order (which groups similar trips), not its start.
 */
static void
sample_order(const probe_walk *w, int nsamples, int *order)
{
	int			n = w->nmatches;

	if (nsamples == n)
	{
		unsigned int span = 1;
		int			k = 0;

		while (span < (unsigned int) n)
			span <<= 1;
		for (unsigned int i = 0; i < span; i++)
		{
			int			j = (int) (radical_inverse(i) * span);

			if (j < n)
				order[k++] = j;
		}
		return;
	}
	{
		double	   *cum = palloc((n + 1) * sizeof(double));

		cum[0] = 0;
		for (int i = 0; i < n; i++)
			cum[i + 1] = cum[i] + w->matches[i].weight;
		for (int s = 0; s < nsamples; s++)
		{
			double		target = fmod(radical_inverse(s) + 0.5 / nsamples, 1.0) * cum[n];
			int			lo = 0,
						hi = n - 1;

			while (lo < hi)
			{
				int			mid = (lo + hi) / 2;

				if (cum[mid + 1] <= target)
					lo = mid + 1;
				else
					hi = mid;
			}
			order[s] = lo;
		}
		pfree(cum);
	}
}

/*
 * Runs the clause's function on the rows of nsamples matches
 * (sample_order): *tried matches (fewer when PROBE_MS runs out), *kept
 * of them whose row is visible and for which it returned true.  args: the
 * call's arguments, the column's at position colarg.
 */
static void
probe_check_rows(PlannerInfo *root, SupportRequestSelectivity *req, Var *var, int colarg,
				 Const **args, int nargs, probe_walk *w, int nsamples, int *tried, int *kept)
{
	RangeTblEntry *rte = planner_rt_fetch(var->varno, root);
	Relation	heap = table_open(rte->relid, NoLock);
	IndexFetchTableData *scan = table_index_fetch_begin(heap);
	TupleTableSlot *slot = table_slot_create(heap, NULL);
	Snapshot	snapshot = GetActiveSnapshot();
	MemoryContext callcxt = AllocSetContextCreate(CurrentMemoryContext, "frechet_ext estimate",
												  ALLOCSET_DEFAULT_SIZES);
	MemoryContext old;
	FmgrInfo	flinfo;
	int		   *order = palloc(nsamples * sizeof(int));
	instr_time	start,
				now;

	LOCAL_FCINFO(fc, FUNC_MAX_ARGS);

	fmgr_info_cxt(req->funcid, &flinfo, callcxt);
	sample_order(w, nsamples, order);
	INSTR_TIME_SET_CURRENT(start);
	*tried = *kept = 0;
	for (int s = 0; s < nsamples; s++)
	{
		bool		call_again = false,
					all_dead = false,
					isnull,
					anynull = false;
		Datum		value;
		int			j = order[s];

		ExecClearTuple(slot);
		(*tried)++;
		if (!table_index_fetch_tuple(scan, &w->matches[j].tid, snapshot, slot, &call_again, &all_dead))
			continue;
		value = slot_getattr(slot, var->varattno, &isnull);
		InitFunctionCallInfoData(*fc, &flinfo, nargs, req->inputcollid, NULL, NULL);
		for (int a = 0; a < nargs; a++)
		{
			fc->args[a].value = a == colarg ? value : args[a]->constvalue;
			fc->args[a].isnull = a == colarg ? isnull : args[a]->constisnull;
			anynull |= fc->args[a].isnull;
		}
		if (!(anynull && flinfo.fn_strict))
		{
			Datum		r;

			old = MemoryContextSwitchTo(callcxt);
			r = FunctionCallInvoke(fc);
			MemoryContextSwitchTo(old);
			if (!fc->isnull && DatumGetBool(r))
				(*kept)++;
		}
		INSTR_TIME_SET_CURRENT(now);
		INSTR_TIME_SUBTRACT(now, start);
		if (s >= 8 && INSTR_TIME_GET_MILLISEC(now) > PROBE_MS)
			break;
	}
	pfree(order);
	ExecDropSingleTupleTableSlot(slot);
	table_index_fetch_end(scan);
	table_close(heap, NoLock);
	MemoryContextDelete(callcxt);
}

/*
 * An index of our classes on the column, not partial: one whose family
 * holds operator opno under a range strategy (*strategy is set), or, with
 * no opno, holds *strategy's operator for the column's type and keytype.
 * InvalidOid when there is none.
 */
static Oid
our_index(RelOptInfo *rel, Var *var, Oid opno, Oid keytype, StrategyNumber *strategy)
{
	ListCell   *lc;

	foreach(lc, rel->indexlist)
	{
		IndexOptInfo *index = (IndexOptInfo *) lfirst(lc);

		if (index->relam != GIST_AM_OID || index->indexkeys[0] != var->varattno ||
			index->indpred != NIL)
			continue;
		if (OidIsValid(opno))
		{
			int			s = get_op_opfamily_strategy(opno, index->opfamily[0]);

			if (s != FRECHET_STRATEGY_REACH && s != FRECHET_STRATEGY_PINGS && s != FRECHET_STRATEGY_PASSES)
				continue;
			*strategy = s;
			return index->indexoid;
		}
		if (OidIsValid(get_opfamily_member(index->opfamily[0], var->vartype, keytype, *strategy)))
			return index->indexoid;
	}
	return InvalidOid;
}

/*
 * Walks an index for the entries a query key admits; false if its keys
 * are of neither of our formats (frechet_key of 0.1's classes, or the
 * packed frechet_summary).
 */
static bool
probe_index(Oid indexoid, const fr_key *query, StrategyNumber strategy, probe_walk *w)
{
	Relation	irel = index_open(indexoid, AccessShareLock);
	int			attlen = TupleDescAttr(RelationGetDescr(irel), 0)->attlen;
	bool		ours = attlen == sizeof(fr_key) || attlen == -1;

	if (ours)
		probe_walk_index(irel, attlen == -1 ? GIST_KEY_PACKED : GIST_KEY_WIDE, query, strategy, w);
	index_close(irel, AccessShareLock);
	return ours;
}

/* What contsel, the estimator these operators had, returns: PostgreSQL's default for containment. */
#define DEFAULT_REACH_SELECTIVITY 0.001

PG_FUNCTION_INFO_V1(frechet_key_restrict);
/*
 * The restriction estimator of |~~|, |~~~| and |~~>| (track OP
 * frechet_key, either way round): the share of the table whose index
 * entries the strategy's key test admits, counted by the walk of the
 * index (the operator is that very test on a leaf).  Without our index on
 * the column or a constant key: DEFAULT_REACH_SELECTIVITY.
 */
Datum
frechet_key_restrict(PG_FUNCTION_ARGS)
{
	PlannerInfo *root = (PlannerInfo *) PG_GETARG_POINTER(0);
	Oid			opno = PG_GETARG_OID(1);
	List	   *args = (List *) PG_GETARG_POINTER(2);
	int			varRelid = PG_GETARG_INT32(3);
	Var		   *var;
	Node	   *other;
	RelOptInfo *rel;
	StrategyNumber strategy;
	Oid			indexoid;
	probe_walk	w = {0};
	fr_key		query;

	if (list_length(args) != 2)
		PG_RETURN_FLOAT8(DEFAULT_REACH_SELECTIVITY);
	var = frechet_plain_column(root, linitial(args));
	other = lsecond(args);
	if (var == NULL)
	{
		/* frechet_key OP track: the commutator is the family's member */
		var = frechet_plain_column(root, lsecond(args));
		other = linitial(args);
		opno = get_commutator(opno);
	}
	if (var == NULL || !OidIsValid(opno) || (varRelid != 0 && varRelid != var->varno) ||
		!column_readable(root, var))
		PG_RETURN_FLOAT8(DEFAULT_REACH_SELECTIVITY);
	other = estimate_expression_value(root, other);
	if (!IsA(other, Const))
		PG_RETURN_FLOAT8(DEFAULT_REACH_SELECTIVITY);
	if (((Const *) other)->constisnull)
		PG_RETURN_FLOAT8(0.0);
	rel = find_base_rel(root, var->varno);
	indexoid = our_index(rel, var, opno, InvalidOid, &strategy);
	if (rel->tuples <= 0 || !OidIsValid(indexoid))
		PG_RETURN_FLOAT8(DEFAULT_REACH_SELECTIVITY);
	memcpy(&query, DatumGetPointer(((Const *) other)->constvalue), sizeof(fr_key));
	if (!probe_index(indexoid, &query, strategy, &w))
		PG_RETURN_FLOAT8(DEFAULT_REACH_SELECTIVITY);
	pfree(w.matches);
	PG_RETURN_FLOAT8(Min(1.0, w.admitted / rel->tuples));
}

bool
frechet_estimate_selectivity(SupportRequestSelectivity *req, int min_args, int max_args,
							 int indexable, StrategyNumber strategy)
{
	PlannerInfo *root = req->root;
	int			nargs = list_length(req->args);
	Const	   *args[4] = {NULL};
	Var		   *var = NULL;
	int			colarg = -1;
	RelOptInfo *rel;
	Oid			reachfn,
				indexoid;
	Datum		reach;
	fr_key		query;
	probe_walk	w = {0};
	int			tried = 0,
				kept = 0,
				nsamples;
	double		rows;

	if (req->is_join || nargs < min_args || nargs > max_args || nargs > 4 || root == NULL ||
		!ActiveSnapshotSet())
		return false;
	/* the column: one of the indexable arguments; every other argument a constant */
	for (int a = 0; a < nargs; a++)
	{
		Node	   *arg = (Node *) list_nth(req->args, a);
		Var		   *v = (a < 2 && (indexable & (1 << a))) ? frechet_plain_column(root, arg) : NULL;

		if (v != NULL && var == NULL)
		{
			var = v;
			colarg = a;
			continue;
		}
		arg = estimate_expression_value(root, arg);
		if (!IsA(arg, Const))
			return false;
		args[a] = (Const *) arg;
	}
	if (var == NULL || (req->varRelid != 0 && req->varRelid != var->varno) ||
		!column_readable(root, var))
		return false;
	rel = find_base_rel(root, var->varno);
	if (rel->tuples <= 0)
		return false;
	/* the query key: frechet_reach(route, epsilon), as the index condition computes it */
	if (args[1 - colarg]->constisnull || args[2]->constisnull)
	{
		req->selectivity = 0.0;	/* the functions are strict in route and epsilon */
		return true;
	}
	reachfn = frechet_reach_function(req->funcid, args[1 - colarg]->consttype);
	if (!OidIsValid(reachfn))
		return false;
	indexoid = our_index(rel, var, InvalidOid, get_func_rettype(reachfn), &strategy);
	if (!OidIsValid(indexoid))
		return false;
	reach = OidFunctionCall2(reachfn, args[1 - colarg]->constvalue, args[2]->constvalue);
	memcpy(&query, DatumGetPointer(reach), sizeof(fr_key));
	if (!probe_index(indexoid, &query, strategy, &w))
		return false;

	/* every match when the sample can hold them all (an exact count), else PROBE_SAMPLES by weight */
	nsamples = w.nmatches <= PROBE_SAMPLES && w.checkable == w.nmatches ? w.nmatches : PROBE_SAMPLES;
	if (w.nmatches > 0)
		probe_check_rows(root, req, var, colarg, args, nargs, &w, nsamples, &tried, &kept);
	if (tried == 0)
		rows = 0;
	else if (tried == w.nmatches && w.checkable == w.nmatches)
		rows = kept;			/* every admitted row checked */
	else
		rows = w.checkable * Max(kept, 0.5) / tried;
	req->selectivity = Min(1.0, rows / rel->tuples);
	pfree(w.matches);
	return true;
}
