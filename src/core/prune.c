/*
 * prune.c - a decider that settles whole boxes of the free space from
 * their boundaries, after Bringmann, Künnemann & Nusser, "Walking the dog
 * fast in practice" (SoCG 2019), section 4.
 *
 * The free space is split recursively into boxes.  Reachability enters a
 * box through its left and bottom boundaries and leaves through its right
 * and top ones; only boundaries are ever stored (arrays H over columns and
 * V over rows, overwritten in place as boxes are solved from the lower
 * left), so memory stays O(n + m).  A box is settled without looking
 * inside when:
 *   - nothing reaches its left or bottom boundary: nothing leaves it;
 *   - an outgoing boundary is blocked in every cell: nothing leaves there;
 *   - an outgoing boundary is free in every cell and its starting corner is
 *     reachable along a free incoming boundary: all of it is reachable.
 * Otherwise the box is halved along its longer side; small boxes are solved
 * cell by cell with the same propagation as the plain decider, so both
 * deciders compute the same reachable sets and agree exactly.
 *
 * While propagating, the decider can also report the values of eps at
 * which a blocked step would open (critical values of types b and c of Alt
 * & Godau 1995, section 3): the distance search in distance.c tests those
 * instead of bisecting blindly.  For that each reachable lower end carries
 * the vertex whose free interval it came from.
 *
 * Before any of this, two certificates that need no sweep of the band: a
 * monotone vertex coupling within eps proves "yes" (discrete.c), and
 * where such couplings stop, a few rows swept from every free point of
 * one line may prove "no" (probe_wall below).
 */
#include <math.h>
#include <string.h>

#include "fr_internal.h"

/* Boxes of at most this many cells are solved cell by cell. */
#define BASE_CELLS 4096

/* Boxes entered through at most 1/SPARSE_RATIO of their sides are swept directly. */
#define SPARSE_RATIO 8

/* Cells of one row whose free intervals are computed in one batch. */
#define CHUNK 32

/*
 * Batches cover a multiple of BATCH_STEP cells (so that vector loops need
 * no scalar remainder); the arrays of p carry padding past the last vertex
 * for the cells a batch computes beyond the diagram, whose results are
 * never used.
 */
#define BATCH_STEP 4
#define PAD (CHUNK + BATCH_STEP)

/*
 * Batch kernels are compiled twice on x86-64 with GCC, for AVX2 and for the
 * baseline, and the loader picks one (function multi-versioning); elsewhere
 * the one portable build is used.  Both give the same results: every
 * operation in them is a correctly rounded IEEE operation.
 */
#if defined(__GNUC__) && !defined(__clang__) && defined(__x86_64__) && defined(__linux__)
#define FR_CLONES __attribute__((target_clones("avx2", "default")))
#else
#define FR_CLONES
#endif

/*
 * Work memory: the column curve p copied as structure of arrays, so batch
 * kernels load whole vectors of coordinates, then the boundary arrays.
 */
typedef struct prune_cols
{
	double	   *x,
			   *y,
			   *z;				/* n vertices */
	double	   *ux,
			   *uy,
			   *uz,
			   *len,
			   *inv;			/* n - 1 segments */
	double	   *dist;			/* dist[i] = |p[i] - q[row[i]]|, from the last batch over i */
	int32_t    *row;			/* -1: none yet */
	unsigned char *flags;		/* a row of flags for the coupling filter */
} prune_cols;

/* What fr_prune_setup finds once per pair and the decisions on it share. */
typedef struct prune_pair
{
	double		mean_len;		/* mean segment length of p */
	bool		planar;			/* every z of both curves is 0 */
} prune_pair;

/* The pair state's room at the start of the work memory (keeps the arrays 32-byte aligned). */
#define PAIR_BYTES 32

/* State of one pruned decision. */
typedef struct prune
{
	const fr_prep *p;
	const fr_prep *q;
	double		eps;
	prune_cols	c;				/* p as arrays */
	prune_pair *pair;
	double	   *H;				/* reachable lower end on the current horizontal boundary, per column */
	double	   *V;				/* ... on the current vertical boundary, per row */
	int32_t    *Hs;				/* source vertex (of q) of each H */
	int32_t    *Vs;				/* source vertex (of p) of each V */
	fr_cands   *cands;			/* where to report opening values, or NULL */
	fr_poll    *poll;
	fr_stats   *stats;
	size_t		limit;			/* cells solve_cells may still visit (wall probes) */
	bool		over;			/* it stopped at the limit */
	bool		stop;			/* interrupted */
} prune;

/* Carves the work memory for curves of n and m vertices; returns the pair state. */
static prune_pair *
carve(void *work, size_t n, size_t m, prune_cols *c, double **H, double **V,
	  int32_t **Hs, int32_t **Vs)
{
	double	   *d = (double *) ((char *) work + PAIR_BYTES);
	size_t		np = n + PAD;

	_Static_assert(sizeof(prune_pair) <= PAIR_BYTES, "pair state outgrows its room");
	c->x = d;
	c->y = c->x + np;
	c->z = c->y + np;
	c->ux = c->z + np;
	c->uy = c->ux + np;
	c->uz = c->uy + np;
	c->len = c->uz + np;
	c->inv = c->len + np;
	c->dist = c->inv + np;
	*H = c->dist + np;
	*V = *H + (n - 1);
	*Hs = (int32_t *) (*V + (m - 1));
	*Vs = *Hs + (n - 1);
	c->row = *Vs + (m - 1);
	c->flags = (unsigned char *) (c->row + np);
	return work;
}

/*
 * Fills work memory for deciding on p against q: the copy of p as arrays,
 * padded with copies of the last vertex (and zero-length segments), and the
 * pair state (whether both curves are planar, p's mean segment length).
 * Needed once per pair, before any number of fr_decide_pruned calls.
 */
void
fr_prune_setup(void *work, const fr_prep *p, const fr_prep *q)
{
	prune_cols	c;
	double	   *H,
			   *V;
	int32_t    *Hs,
			   *Vs;

	prune_pair *pair = carve(work, p->n, q->n, &c, &H, &V, &Hs, &Vs);
	double		length = 0;

	pair->planar = true;
	for (size_t i = 0; i < p->n && pair->planar; i++)
		pair->planar = p->v[i].z == 0.0;
	for (size_t j = 0; j < q->n && pair->planar; j++)
		pair->planar = q->v[j].z == 0.0;
	for (size_t i = 0; i < p->n + PAD; i++)
	{
		const fr_pt *v = &p->v[i < p->n ? i : p->n - 1];

		c.x[i] = v->x;
		c.y[i] = v->y;
		c.z[i] = v->z;
	}
	for (size_t i = 0; i < p->n + PAD; i++)
	{
		bool		real = i + 1 < p->n;

		c.ux[i] = real ? p->s[i].ux : 0.0;
		c.uy[i] = real ? p->s[i].uy : 0.0;
		c.uz[i] = real ? p->s[i].uz : 0.0;
		c.len[i] = real ? p->s[i].len : 0.0;
		c.inv[i] = real ? p->s[i].inv : 0.0;
		c.row[i] = -1;
		length += c.len[i];
	}
	pair->mean_len = length / (double) (p->n - 1);
}

/* Records an opening value if it lies strictly inside the bracket. */
static inline void
note(prune *s, double v)
{
	fr_cands   *c = s->cands;

	if (c == NULL || !(v > c->lo && v < c->hi))
		return;
	if (c->count < c->cap)
		c->v[c->count++] = v;
	else
		c->overflow = true;
}

/*
 * The eps at which the free intervals of vertices x and y on segment
 * a-b (direction s) meet: the point of the segment equidistant from both
 * (a type c critical value), or NaN if the bisector misses the segment.
 */
static double
passage_value(const fr_pt *x, const fr_pt *y, const fr_pt *a, const fr_seg *s)
{
	double		ex = y->x - x->x,
				ey = y->y - x->y,
				ez = y->z - x->z;
	double		mx = (x->x + y->x) / 2 - a->x,
				my = (x->y + y->y) / 2 - a->y,
				mz = (x->z + y->z) / 2 - a->z;
	double		de = s->ux * ex + s->uy * ey + s->uz * ez,
				r;
	fr_pt		c;

	if (s->len == 0.0 || de == 0.0)
		return NAN;
	/* arc length r along the segment where (point - midpoint) . e = 0 */
	r = (mx * ex + my * ey + mz * ez) / de;
	if (!(r >= 0 && r <= s->len))
		return NAN;
	c.x = a->x + r * s->ux;
	c.y = a->y + r * s->uy;
	c.z = a->z + r * s->uz;
	return fr_pt_dist(&c, x);
}

/*
 * The free interval of point (px,py,pz) against the segment from (ax,ay,az)
 * with direction (ux,uy,uz) and length len, given the distances da and db
 * from the point to the segment's ends: fr_interval_core of freespace.c
 * written without branches, every case computed and the right one selected,
 * so that a loop of them vectorises.  Each selected value is produced by
 * the same operations in the same order as there (da here is the square
 * root fr_interval_core takes of da2), so the two agree bit for bit; a unit
 * test compares them on random and degenerate inputs.
 */
static FR_ALWAYS_INLINE void
interval_select(double px, double py, double pz, double ax, double ay, double az,
				double ux, double uy, double uz, double len, double inv, double eps,
				double da, double db, bool planar, double *lo, double *hi)
{
	/*
	 * Each select tests one comparison (conjunctions are nested selects),
	 * the form GCC's vectoriser turns into vector blends.
	 */
	double		wx = ax - px,
				wy = ay - py,
				wz = az - pz;
	double		foot = -(ux * wx + uy * wy + uz * wz);
	double		cx = uy * wz - uz * wy,
				cy = uz * wx - ux * wz,
				cz = ux * wy - uy * wx;
	double		hh = cx * cx + cy * cy;
	/* fr_cross_norm; in the plane hh is 0, so the square root is never needed */
	double		h = planar ? fabs(cz) : hh == 0.0 ? fabs(cz) : sqrt(hh + cz * cz);
	double		disc = (eps - h) * (eps + h);
	double		tangent = h - eps <= FR_TANGENT_SLACK * h ? 0.0 : disc;
	double		disc0 = disc < 0.0 ? tangent : disc;
	double		root = sqrt(disc0 < 0.0 ? 0.0 : disc0);
	double		prod = (da - eps) * (da + eps);
	double		rhi1 = foot + root,
				rlo2 = foot - root;
	/* the other root from the product of roots: one division serves both cases */
	double		other = prod / (foot >= 0.0 ? rhi1 : rlo2);
	double		rlo1 = rhi1 > 0.0 ? other : 0.0,
				rhi2 = rlo2 < 0.0 ? other : 0.0;
	double		rlo = foot >= 0.0 ? rlo1 : rlo2,
				rhi = foot >= 0.0 ? rhi1 : rhi2;
	double		edge = da <= eps ? 0.0 : len;
	double		x,
				tlo,
				thi,
				elo,
				ehi;

	rlo = rlo > foot ? foot : rlo;
	rhi = rhi < foot ? foot : rhi;
	/* the line misses the disk: an end inside by rounding is all there is */
	rlo = disc0 < 0.0 ? edge : rlo;
	rhi = disc0 < 0.0 ? edge : rhi;
	tlo = da <= eps ? 0.0 : rlo * inv;
	thi = db <= eps ? 1.0 : rhi * inv;
	x = tlo > 1.0 ? 1.0 : tlo;
	tlo = db <= eps ? x : tlo;
	x = thi < 0.0 ? 0.0 : thi;
	thi = da <= eps ? x : thi;
	x = tlo <= 0.0 ? DBL_MIN : tlo;
	tlo = da <= eps ? tlo : x;
	x = thi >= 1.0 ? FR_ONE_MINUS : thi;
	thi = db <= eps ? thi : x;
	tlo = tlo > thi ? FR_EMPTY : tlo;
	/* neither end free and the nearest point an end, or the line misses */
	elo = foot <= 0.0 ? FR_EMPTY : tlo;
	elo = foot >= len ? FR_EMPTY : elo;
	elo = disc0 < 0.0 ? FR_EMPTY : elo;
	ehi = foot <= 0.0 ? 0.0 : thi;
	ehi = foot >= len ? 0.0 : ehi;
	ehi = disc0 < 0.0 ? 0.0 : ehi;
	x = db <= eps ? tlo : elo;
	tlo = da <= eps ? tlo : x;
	x = db <= eps ? thi : ehi;
	thi = da <= eps ? thi : x;
	/* both ends free: all of it (a disk is convex) */
	x = db <= eps ? 0.0 : tlo;
	tlo = da <= eps ? x : tlo;
	x = db <= eps ? 1.0 : thi;
	thi = da <= eps ? x : thi;
	/* a zero-length segment is a point: free or not as its end is */
	elo = da <= eps ? 0.0 : FR_EMPTY;
	ehi = da <= eps ? 1.0 : 0.0;
	*lo = len == 0.0 ? elo : tlo;
	*hi = len == 0.0 ? ehi : thi;
}

/* interval_select on one input, for the unit test that compares it with fr_interval_core. */
void
fr_interval_select_one(const fr_pt *p, const fr_pt *a, const fr_seg *s, double eps,
					   double da, double db, double *lo, double *hi)
{
	interval_select(p->x, p->y, p->z, a->x, a->y, a->z, s->ux, s->uy, s->uz, s->len,
					s->inv, eps, da, db, false, lo, hi);
}

/*
 * Free intervals of the w cells (a multiple of BATCH_STEP, at most CHUNK)
 * from column c0 of row j, in one batch:
 * right boundaries (vertex p[i+1] against segment q[j]) into ra/rb, tops
 * (vertex q[j+1] against segment p[i]) into tc/td, entry k for column
 * c0 + k.  The vertex distances are computed once each, as fr_pt_dist
 * computes them.  No branches in the loops, so they vectorise.
 */
static FR_ALWAYS_INLINE void
row_batch_body(const prune_cols *c, const fr_prep *q, size_t j, size_t c0, size_t w, double eps,
			   double *restrict ra, double *restrict rb, double *restrict tc, double *restrict td,
			   bool planar)
{
	const fr_pt qa = q->v[j],
				qb = q->v[j + 1];
	const fr_seg qs = q->s[j];
	const double *restrict x = c->x + c0,
			   *restrict y = c->y + c0,
			   *restrict z = c->z + c0,
			   *restrict ux = c->ux + c0,
			   *restrict uy = c->uy + c0,
			   *restrict uz = c->uz + c0,
			   *restrict len = c->len + c0,
			   *restrict inv = c->inv + c0;
	double		dt[CHUNK + BATCH_STEP],	/* |p[c0+k] - q[j+1]| */
				db[CHUNK + BATCH_STEP];	/* |p[c0+k] - q[j]| */

	double	   *restrict dist = c->dist + c0;
	int32_t    *restrict row = c->row + c0;

	w = w / BATCH_STEP * BATCH_STEP;
	/* w + 1 vertices: a vector loop over w, then the last one */
	for (size_t k = 0; k < w; k++)
	{
		double		tx = x[k] - qb.x,
					ty = y[k] - qb.y,
					tz = z[k] - qb.z;

		dt[k] = sqrt(tx * tx + ty * ty + tz * tz);
		db[k] = dist[k];
	}
	{
		double		tx = x[w] - qb.x,
					ty = y[w] - qb.y,
					tz = z[w] - qb.z;

		dt[w] = sqrt(tx * tx + ty * ty + tz * tz);
		db[w] = dist[w];
	}
	/*
	 * The distances to q[j] were the previous row's distances to its
	 * q[j+1] wherever a batch covered the column then: only the others are
	 * computed here (same formula, so the same values).
	 */
	for (size_t k = 1; k <= w; k++)
		if (row[k] != (int32_t) j)
		{
			double		bx = x[k] - qa.x,
						by = y[k] - qa.y,
						bz = z[k] - qa.z;

			db[k] = sqrt(bx * bx + by * by + bz * bz);
		}
	for (size_t k = 0; k < w; k++)
	{
		interval_select(x[k + 1], y[k + 1], z[k + 1], qa.x, qa.y, qa.z,
						qs.ux, qs.uy, qs.uz, qs.len, qs.inv, eps, db[k + 1], dt[k + 1],
						planar, &ra[k], &rb[k]);
		interval_select(qb.x, qb.y, qb.z, x[k], y[k], z[k],
						ux[k], uy[k], uz[k], len[k], inv[k], eps, dt[k], dt[k + 1],
						planar, &tc[k], &td[k]);
	}
	for (size_t k = 0; k <= w; k++)
	{
		dist[k] = dt[k];
		row[k] = (int32_t) (j + 1);
	}
}

/* The batch for curves in the plane (every z is 0): no z terms to speak of. */
FR_CLONES static void
row_batch_planar(const prune_cols *c, const fr_prep *q, size_t j, size_t c0, size_t w, double eps,
				 double *restrict ra, double *restrict rb, double *restrict tc, double *restrict td)
{
	row_batch_body(c, q, j, c0, w, eps, ra, rb, tc, td, true);
}

/* The batch for curves in space. */
FR_CLONES static void
row_batch_space(const prune_cols *c, const fr_prep *q, size_t j, size_t c0, size_t w, double eps,
				double *restrict ra, double *restrict rb, double *restrict tc, double *restrict td)
{
	row_batch_body(c, q, j, c0, w, eps, ra, rb, tc, td, false);
}

/*
 * Cell-by-cell propagation through the box [x0,x1) x [y0,y1), visiting in
 * each row only the cells that something can enter: from the first column
 * reachable from below (or the left side) to the last one reachable from
 * below, and on while reachability keeps flowing right.  Cells left out
 * would stay empty in the plain propagation too.  The free intervals come
 * in batches from row_batch (a batch may cover a few cells the row then
 * does not need); the propagation itself is the plain decider's.  Stops
 * early (s->over) once it has visited more than s->limit cells.  Returns
 * whether anything reaches the top (y = y1).
 */
static bool
solve_cells(prune *s, size_t x0, size_t x1, size_t y0, size_t y1)
{
	const fr_prep *p = s->p,
			   *q = s->q;
	const fr_pt *pv = p->v,
			   *qv = q->v;
	const double eps = s->eps;
	size_t		hlo = x1,
				hhi = x0,
				visited = 0,
				polled = 0;
	double		ra[CHUNK],
				rb[CHUNK],
				tc[CHUNK],
				td[CHUNK];

	/* the columns reachable from below: [hlo, hhi] */
	for (size_t i = x0; i < x1; i++)
		if (s->H[i] != FR_EMPTY)
		{
			if (hlo == x1)
				hlo = i;
			hhi = i;
		}
	for (size_t j = y0; j < y1; j++)
	{
		const fr_pt *qa = &qv[j],
				   *qb = &qv[j + 1];
		const fr_seg *qs = &q->s[j];
		double		lr = s->V[j];
		int32_t		ls = s->Vs[j];
		size_t		i = lr != FR_EMPTY ? x0 : hlo,
					nlo = x1,
					nhi = x0;

		while (i < x1 && (i <= hhi || lr != FR_EMPTY))
		{
			size_t		c0,
						c1;

			/* skip columns nothing enters */
			if (lr == FR_EMPTY)
			{
				while (i <= hhi && s->H[i] == FR_EMPTY)
					i++;
				if (i > hhi)
					break;
			}
			/* through the last column reachable from below, and a little on */
			c0 = i;
			c1 = hhi + 1 > c0 ? hhi + 1 : c0 + 1;
			c1 = c0 + (c1 - c0 + BATCH_STEP - 1) / BATCH_STEP * BATCH_STEP;
			if (c1 > c0 + CHUNK)
				c1 = c0 + CHUNK;
			if (s->pair->planar)
				row_batch_planar(&s->c, q, j, c0, c1 - c0, eps, ra, rb, tc, td);
			else
				row_batch_space(&s->c, q, j, c0, c1 - c0, eps, ra, rb, tc, td);
			if (c1 > x1)
				c1 = x1;

			if (s->cands == NULL)
			{
				/*
				 * Nothing to report: sources are not kept, and the
				 * propagation below (the same rules as the branching one
				 * after it, written as selects) has no branch but the
				 * loop's.  A cell nothing enters yields empty outputs here
				 * as well.
				 */
				for (; i < c1 && (i <= hhi || lr != FR_EMPTY); i++)
				{
					double		br = s->H[i],
								a = ra[i - c0],
								b = rb[i - c0],
								c = tc[i - c0],
								d = td[i - c0];
					double		m = ((br != FR_EMPTY) | (a >= lr)) ? a : lr,
								t = ((lr != FR_EMPTY) | (c >= br)) ? c : br;
					double		nbr = t <= d ? t : FR_EMPTY;

					visited += (br != FR_EMPTY) | (lr != FR_EMPTY);
					lr = m <= b ? m : FR_EMPTY;
					s->H[i] = nbr;
					nlo = ((nlo == x1) & (nbr != FR_EMPTY)) ? i : nlo;
					nhi = nbr != FR_EMPTY ? i : nhi;
				}
				continue;
			}

			for (; i < c1 && (i <= hhi || lr != FR_EMPTY); i++)
			{
				double		br = s->H[i],
							a = ra[i - c0],
							b = rb[i - c0],
							c = tc[i - c0],
							d = td[i - c0],
							nlr,
							nbr;
				int32_t		bs = s->Hs[i],
							nls,
							nbs;

				if (br == FR_EMPTY && lr == FR_EMPTY)
					continue;
				visited++;

				/* right boundary: vertex p[i+1] against segment q[j] */
				nls = (int32_t) (i + 1);
				if (br != FR_EMPTY)
					nlr = a <= b ? a : FR_EMPTY;
				else if (a >= lr)
					nlr = a <= b ? a : FR_EMPTY;
				else
				{
					nlr = lr <= b ? lr : FR_EMPTY;
					nls = ls;
				}
				if (nlr == FR_EMPTY && s->cands)
				{
					if (a > b)
						note(s, fr_point_segment_opening(&pv[i + 1], qa, qs, qb));
					else
						note(s, passage_value(&pv[ls], &pv[i + 1], qa, qs));
				}
				/* top boundary: vertex q[j+1] against segment p[i] */
				nbs = (int32_t) (j + 1);
				if (lr != FR_EMPTY)
					nbr = c <= d ? c : FR_EMPTY;
				else if (c >= br)
					nbr = c <= d ? c : FR_EMPTY;
				else
				{
					nbr = br <= d ? br : FR_EMPTY;
					nbs = bs;
				}
				if (nbr == FR_EMPTY && s->cands)
				{
					if (c > d)
						note(s, fr_point_segment_opening(qb, &pv[i], &p->s[i], &pv[i + 1]));
					else
						note(s, passage_value(&qv[bs], qb, &pv[i], &p->s[i]));
				}
				s->H[i] = nbr;
				s->Hs[i] = nbs;
				if (nbr != FR_EMPTY)
				{
					if (nlo == x1)
						nlo = i;
					nhi = i;
				}
				lr = nlr;
				ls = nls;
			}
		}
		/* the row ended early only where nothing flows right any more */
		s->V[j] = i >= x1 ? lr : FR_EMPTY;
		s->Vs[j] = ls;
		hlo = nlo;
		hhi = nhi;
		if (visited > s->limit)
		{
			s->over = true;
			break;
		}
		/*
		 * Poll row by row: a sweep that starts sparse may still cover a
		 * large part of the diagram, and cancelling must not wait for it.
		 */
		if (fr_poll_add(s->poll, visited - polled + 1))
		{
			s->stop = true;
			break;
		}
		polled = visited;
	}
	s->limit -= visited < s->limit ? visited : s->limit;
	if (s->stats)
		s->stats->cells += visited;
	return hlo < x1;
}

/* Is every cell of the horizontal line y = j, columns [x0,x1), free (vertices within eps)? */
static bool
row_line_free(const prune *s, size_t j, size_t x0, size_t x1)
{
	for (size_t i = x0; i <= x1; i++)
		if (fr_pt_dist(&s->q->v[j], &s->p->v[i]) > s->eps)
			return false;
	return true;
}

/* Is every cell of the vertical line x = i, rows [y0,y1), free? */
static bool
col_line_free(const prune *s, size_t i, size_t y0, size_t y1)
{
	for (size_t j = y0; j <= y1; j++)
		if (fr_pt_dist(&s->p->v[i], &s->q->v[j]) > s->eps)
			return false;
	return true;
}

/* Is every cell of the horizontal line y = j, columns [x0,x1), blocked? */
static bool
row_line_blocked(const prune *s, size_t j, size_t x0, size_t x1)
{
	for (size_t i = x0; i < x1; i++)
	{
		double		lo,
					hi;

		fr_free_interval(&s->q->v[j], &s->p->v[i], &s->p->s[i], &s->p->v[i + 1], s->eps, &lo, &hi);
		if (lo <= hi)
			return false;
	}
	return true;
}

/* Is every cell of the vertical line x = i, rows [y0,y1), blocked? */
static bool
col_line_blocked(const prune *s, size_t i, size_t y0, size_t y1)
{
	for (size_t j = y0; j < y1; j++)
	{
		double		lo,
					hi;

		fr_free_interval(&s->p->v[i], &s->q->v[j], &s->q->s[j], &s->q->v[j + 1], s->eps, &lo, &hi);
		if (lo <= hi)
			return false;
	}
	return true;
}

/* Solves the box [x0,x1) x [y0,y1): inputs in H, V; outputs written over them. */
static void
solve_box(prune *s, size_t x0, size_t x1, size_t y0, size_t y1)
{
	size_t		w = x1 - x0,
				h = y1 - y0,
				first_v = SIZE_MAX,
				first_h = SIZE_MAX,
				entering = 0;
	int			top = 0,		/* 1: all reachable, -1: none, 0: unknown */
				right = 0;

	if (s->stop)
		return;

	for (size_t j = y0; j < y1; j++)
		if (s->V[j] != FR_EMPTY)
		{
			if (first_v == SIZE_MAX)
				first_v = j;
			entering++;
		}
	for (size_t i = x0; i < x1; i++)
		if (s->H[i] != FR_EMPTY)
		{
			if (first_h == SIZE_MAX)
				first_h = i;
			entering++;
		}
	if (entering == 0)
		return;					/* nothing enters: H and V stay empty here */

	/*
	 * Small boxes, and boxes that reachability enters through only a few
	 * cells (a narrow band, as between two recordings of one route), are
	 * swept cell by cell, visiting only cells it can reach.
	 */
	if (w * h <= BASE_CELLS || entering * SPARSE_RATIO <= w + h)
	{
		solve_cells(s, x0, x1, y0, y1);
		return;
	}
	if (fr_poll_add(s->poll, 2 * (w + h)))
	{
		s->stop = true;
		return;
	}

	/* the top: blocked, or free with its left corner reachable up the left side */
	if (row_line_blocked(s, y1, x0, x1))
		top = -1;
	else if (first_v != SIZE_MAX && row_line_free(s, y1, x0, x1) &&
			 col_line_free(s, x0, first_v + 1, y1 - 1))
		top = 1;
	/* the right: blocked, or free with its bottom corner reachable along the bottom */
	if (col_line_blocked(s, x1, y0, y1))
		right = -1;
	else if (first_h != SIZE_MAX && col_line_free(s, x1, y0, y1) &&
			 row_line_free(s, y0, first_h + 1, x1 - 1))
		right = 1;
	if (top != 0 && right != 0)
	{
		for (size_t i = x0; i < x1; i++)
		{
			s->H[i] = top > 0 ? 0.0 : FR_EMPTY;
			s->Hs[i] = (int32_t) y1;
		}
		for (size_t j = y0; j < y1; j++)
		{
			s->V[j] = right > 0 ? 0.0 : FR_EMPTY;
			s->Vs[j] = (int32_t) x1;
		}
		return;
	}
	if (w >= h)
	{
		solve_box(s, x0, x0 + w / 2, y0, y1);
		solve_box(s, x0 + w / 2, x1, y0, y1);
	}
	else
	{
		solve_box(s, x0, x1, y0, y0 + h / 2);
		solve_box(s, x0, x1, y0 + h / 2, y1);
	}
}

/* Pairs the coupling sweep of a decision may visit; see fr_decide_pruned. */
static size_t
coupling_budget(const prune *s)
{
	double		width = 2 + 2 * s->eps / s->pair->mean_len,
				budget = 4 * width * (double) (s->p->n + s->q->n);

	/* NaN (length 0) and overflow both fall to the largest budget */
	return budget < 0x1p60 ? (size_t) budget : (size_t) 0x1p60;
}

/* Rows a wall probe starts before the row where the vertex couplings stop, and goes on after it. */
#define PROBE_BEFORE 8
#define PROBE_AFTER 24

/* Walls probed in one decision. */
#define PROBES 8

/* Free cells on a probe's first line beyond which the probe is not tried (no band there). */
#define PROBE_WIDTH 256

/*
 * A certificate for "no" at a wall that the vertex-coupling sweep found
 * (fr_coupling_next).  Every monotone path from the start to the end of
 * the free space crosses the horizontal line y = j0, so what the deciders
 * find reachable above it is contained in what they would find starting
 * from every free point of that line (and every free point of the left
 * edge above it): the propagation rules are monotone in their inputs.  If
 * that relaxed start dies out before line j1 and never reaches the right
 * edge, nothing reaches the end: the answer is no, exactly as the plain
 * decider would say.  Walls in the free space of two recordings of one
 * route are local, so a few rows around a wall of the couplings usually
 * settle it at a cost of O(n) plus a few rows of the band, instead of a
 * sweep of the whole band.
 *
 * The free points of line j0 are found with a conservative test first: a
 * vertex q[j0] whose free interval on segment p[i] is not empty lies
 * within eps of the segment by the deciders' arithmetic, so within
 * eps + len of p[i], up to a few ulps (the test allows 2^-20, relative,
 * and underflow); only the segments passing it get a free interval.
 * Probes are for bands: a line with more than PROBE_WIDTH free cells is
 * not tried, and all probes of a decision share a limit of cells
 * (s->limit); a probe that reaches it proves nothing.
 */
static bool
probe_wall(prune *s, size_t wall)
{
	const fr_prep *p = s->p,
			   *q = s->q;
	const size_t n = p->n,
				m = q->n;
	const double eps = s->eps;
	const prune_cols *c = &s->c;
	size_t		j0 = wall > PROBE_BEFORE ? wall - PROBE_BEFORE : 1,
				j1 = wall + PROBE_AFTER < m - 1 ? wall + PROBE_AFTER : m - 1;
	const fr_pt *v;
	size_t		width = 0;
	bool		full;

	if (j1 <= j0)
		return false;
	v = &q->v[j0];
	for (size_t i = 0; i + 1 < n; i++)
	{
		double		dx = c->x[i] - v->x,
					dy = c->y[i] - v->y,
					dz = c->z[i] - v->z,
					r = eps + c->len[i];

		s->H[i] = dx * dx + dy * dy + dz * dz <= r * r * (1.0 + 0x1p-20) + 0x1p-900 ? 0.0 : FR_EMPTY;
	}
	for (size_t i = 0; i + 1 < n; i++)
		if (s->H[i] == 0.0)
		{
			double		lo,
						hi;

			if (++width > PROBE_WIDTH)
				return false;
			fr_free_interval(v, &p->v[i], &p->s[i], &p->v[i + 1], eps, &lo, &hi);
			s->H[i] = lo <= hi ? lo : FR_EMPTY;
		}
	for (size_t j = j0; j < j1; j++)
		s->V[j] = fr_left_edge(p, q, j, eps, &full);
	if (solve_cells(s, 0, n - 1, j0, j1) || s->stop || s->over)
		return false;
	for (size_t j = j0; j < j1; j++)
		if (s->V[j] != FR_EMPTY)
			return false;
	return true;
}

/*
 * The pruning decision on prepared curves (two or more vertices each, both
 * end pairs within eps).  work must hold fr_prune_work_bytes(n, m) bytes
 * and have been filled by fr_prune_setup for this pair.
 */
fr_status
fr_decide_pruned(const fr_env *env, const fr_prep *p, const fr_prep *q, double eps,
				 void *work, bool *result, fr_stats *stats, fr_cands *cands)
{
	const size_t n = p->n,
				m = q->n;
	prune		s;
	fr_poll		poll;
	bool		open = true;

	memset(&s, 0, sizeof(s));
	s.p = p;
	s.q = q;
	s.eps = eps;
	s.pair = carve(work, n, m, &s.c, &s.H, &s.V, &s.Hs, &s.Vs);
	s.stats = stats;
	fr_poll_init(&poll, env);
	s.poll = &poll;
	s.limit = SIZE_MAX;

	/*
	 * A vertex coupling within eps settles the answer (positive filter),
	 * and where the couplings stop, a few rows of the free space may
	 * settle it the other way (probe_wall).  Not when openings are
	 * required: they come from the whole sweep (optional openings are
	 * collected only if it runs).  The coupling sweep costs one vertex
	 * distance a pair against two free intervals a cell below, and the
	 * pairs it reaches are corners of cells the sweep below reaches too (a
	 * coupling is a path through the free space), so where it fails it
	 * has added a fraction of the sweep's cost, as long as the band is
	 * not settled by whole boxes there.  Its budget is a few times the
	 * band a row of pairs about 2 eps wide would make along p's mean
	 * segment length, so dense tracks get a wide band, and a region that
	 * is free throughout (the boxes' case: a vehicle parked in both
	 * recordings) cannot take it far.
	 */
	if (cands)
		cands->collected = false;
	if (cands == NULL || cands->optional)
	{
		fr_coupling_sweep sweep;
		size_t		wall,
					from = 0;	/* the row the couplings (re)started from */
		fr_sweep_event ev;

		fr_coupling_begin(&sweep, p, q, eps, s.c.flags, coupling_budget(&s), &poll);
		ev = fr_coupling_next(&sweep, &wall);
		if (ev == FR_SWEEP_STOP)
			return FR_EINTR;
		if (ev == FR_SWEEP_THROUGH)
		{
			*result = true;
			return FR_OK;
		}
		/*
		 * A wall only PROBE_BEFORE rows or fewer after the couplings
		 * (re)started is taken for a trace of sparse sampling (a vertex of
		 * q far from every vertex of p, as with a planned route of few
		 * points against a track), not of a blocked free space: it is
		 * passed over, and only a few of those are looked at.
		 */
		s.limit = n + m;
		for (int k = 0, seen = 0;
			 k < PROBES && seen < 4 * PROBES && ev == FR_SWEEP_WALL && !s.over; seen++)
		{
			if (wall >= from + PROBE_BEFORE)
			{
				k++;
				if (probe_wall(&s, wall))
				{
					if (stats)
						stats->walls++;
					*result = false;
					return FR_OK;
				}
				if (s.stop)
					return FR_EINTR;
			}
			from = wall + 1;
			ev = fr_coupling_next(&sweep, &wall);
			if (ev == FR_SWEEP_STOP)
				return FR_EINTR;
		}
		s.limit = SIZE_MAX;
	}

	s.cands = cands;
	if (cands)
		cands->collected = true;
	fr_bottom_edge(p, q, eps, s.H);
	for (size_t i = 0; i + 1 < n; i++)
		s.Hs[i] = 0;
	for (size_t j = 0; j + 1 < m; j++)
	{
		double		lr = FR_EMPTY;

		if (open)
		{
			lr = fr_left_edge(p, q, j, eps, &open);
			if (lr != 0.0)
				lr = FR_EMPTY;
		}
		s.V[j] = lr;
		s.Vs[j] = 0;
	}
	solve_box(&s, 0, n - 1, 0, m - 1);
	if (s.stop)
		return FR_EINTR;
	*result = s.V[m - 2] != FR_EMPTY || s.H[n - 2] != FR_EMPTY;
	return FR_OK;
}

/* Bytes of work memory fr_decide_pruned needs. */
size_t
fr_prune_work_bytes(size_t n, size_t m)
{
	/* p as padded arrays (3 per vertex, 5 per segment, distance cache), H, V and their sources */
	return PAIR_BYTES + 9 * (n + PAD) * sizeof(double) + (n + PAD) * (sizeof(int32_t) + 1) +
		(n + m) * (sizeof(double) + sizeof(int32_t)) + 64;
}
