/*
 * reach.c - one step of reachability in the free space (Alt & Godau 1995,
 * section 3): the reachable parts of the bottom edge and of a row's left
 * edge, and the propagation through one row of cells.  Every decider and
 * every explaining function builds on these; they call only the free
 * intervals below them (freespace.c).
 *
 * Layout used throughout the engine: curve p runs along the x axis of the
 * free space (cells i = 0..n-2), curve q along y (rows j = 0..m-2).  A
 * reachable set on a cell boundary is stored as the lower end of its
 * reachable part (FR_EMPTY if none); its upper end is always the free
 * interval's upper end, because reachability only ever cuts from below.
 */
#include <math.h>
#include <stdint.h>

#include "fr_internal.h"

/*
 * Bottom edge of the diagram (row 0's bottom boundaries), reachable from
 * (0,0) along y = 0 while fully free.  row gets n - 1 entries.
 */
void
fr_bottom_edge(const fr_prep *p, const fr_prep *q, double eps, double *row)
{
	bool		open = true;

	for (size_t i = 0; i + 1 < p->n; i++)
	{
		double		lo,
					hi;

		row[i] = FR_EMPTY;
		if (!open)
			continue;
		fr_free_interval(&q->v[0], &p->v[i], &p->s[i], &p->v[i + 1], eps, &lo, &hi);
		if (lo == 0.0)
			row[i] = 0.0;
		open = lo == 0.0 && hi == 1.0;
	}
}

/*
 * Left edge of row j: the free interval of p[0] against segment q[j].
 * Returns its lower end (FR_EMPTY if empty); *full says whether it is all of
 * [0,1].
 */
double
fr_left_edge(const fr_prep *p, const fr_prep *q, size_t j, double eps, bool *full)
{
	double		lo,
				hi;

	fr_free_interval(&p->v[0], &q->v[j], &q->s[j], &q->v[j + 1], eps, &lo, &hi);
	*full = lo == 0.0 && hi == 1.0;
	return lo <= hi ? lo : FR_EMPTY;
}

/*
 * One cell (i, j) of a row: from the reachable lower ends on its bottom
 * (*br) and left (*lr) boundaries to those on its top (*br) and right
 * (*lr) boundaries.  Called only when something enters.
 */
static inline void
cell_step(const fr_prep *p, size_t i, const fr_pt *qa, const fr_seg *qs, const fr_pt *qb,
		  double eps, double *br, double *lr)
{
	double		a,
				b,
				c,
				d,
				nlr;

	/* right boundary: vertex p[i+1] against segment q[j]q[j+1] */
	fr_free_interval(&p->v[i + 1], qa, qs, qb, eps, &a, &b);
	nlr = fr_reach_out(a, b, *br, *lr);
	/* top boundary: vertex q[j+1] against segment p[i]p[i+1] */
	fr_free_interval(qb, &p->v[i], &p->s[i], &p->v[i + 1], eps, &c, &d);
	*br = fr_reach_out(c, d, *lr, *br);
	*lr = nlr;
}

/*
 * Propagates reachability through row j.  On entry row[i] is the reachable
 * lower end on the bottom of cell (i, j) and lr the one on the left edge;
 * on return row[i] is that of the top of cell (i, j).  If left is not NULL,
 * left[i] receives the reachable lower end on the left boundary of cell
 * (i, j) for i = 0..n-1 (left[n-1]: the right edge of the diagram).
 * Returns the reachable lower end on the right edge; *any_top says whether
 * any top boundary is reachable.  FR_EINTR if interrupted.
 */
fr_status
fr_row_step(const fr_prep *p, const fr_prep *q, size_t j, double eps,
			double *row, double lr, double *left, double *right,
			bool *any_top, fr_poll *poll)
{
	const size_t n = p->n;
	const fr_pt *qa = &q->v[j],
			   *qb = &q->v[j + 1];
	const fr_seg *qs = &q->s[j];
	bool		any = false;

	for (size_t i = 0; i + 1 < n; i++)
	{
		double		br = row[i];

		if (left)
			left[i] = lr;
		if (br == FR_EMPTY && lr == FR_EMPTY)
			continue;			/* nothing enters: right and top stay empty */
		cell_step(p, i, qa, qs, qb, eps, &br, &lr);
		row[i] = br;
		any |= br != FR_EMPTY;
		/* long rows: poll inside the row as well (cancel within ~100 ms) */
		if ((i & 0xFFFF) == 0xFFFF && fr_poll_add(poll, 0x10000))
			return FR_EINTR;
	}
	if (left)
		left[n - 1] = lr;
	*right = lr;
	*any_top = any;
	if (fr_poll_add(poll, (n - 1) & 0xFFFF))
		return FR_EINTR;
	return FR_OK;
}

/*
 * fr_row_step over a band: on entry row[i] is FR_EMPTY outside
 * [*first, *last] (*first > *last: all empty), and lr the left edge's
 * reachable lower end.  Only the cells that something enters are visited:
 * from *first (or 0 when lr enters) until the band's end, and on while
 * reachability runs on through right boundaries.  On return *first and
 * *last bound the reachable tops in the same way.  The result equals
 * fr_row_step's; the cost is the band's width, not the row's.
 */
fr_status
fr_row_step_band(const fr_prep *p, const fr_prep *q, size_t j, double eps,
				 double *row, double lr, size_t *first, size_t *last, double *right,
				 bool *any_top, fr_poll *poll)
{
	const size_t n = p->n;
	const fr_pt *qa = &q->v[j],
			   *qb = &q->v[j + 1];
	const fr_seg *qs = &q->s[j];
	size_t		i = lr != FR_EMPTY ? 0 : *first,
				end = *last,
				nfirst = SIZE_MAX,
				nlast = 0,
				visited = 0;

	if (lr == FR_EMPTY && *first > *last)
	{
		*right = FR_EMPTY;
		*any_top = false;
		return FR_OK;
	}
	for (; i + 1 < n; i++)
	{
		double		br = row[i];

		if (br == FR_EMPTY && lr == FR_EMPTY)
		{
			if (i > end)
				break;			/* past the band, and nothing runs on */
			continue;
		}
		cell_step(p, i, qa, qs, qb, eps, &br, &lr);
		row[i] = br;
		if (br != FR_EMPTY)
		{
			if (nfirst == SIZE_MAX)
				nfirst = i;
			nlast = i;
		}
		if ((++visited & 0xFFFF) == 0 && fr_poll_add(poll, 0x10000))
			return FR_EINTR;
	}
	*right = i + 1 >= n ? lr : FR_EMPTY;
	*any_top = nfirst != SIZE_MAX;
	*first = nfirst;
	*last = nfirst == SIZE_MAX ? 0 : nlast;
	if (fr_poll_add(poll, (visited & 0xFFFF) + 1))
		return FR_EINTR;
	return FR_OK;
}
