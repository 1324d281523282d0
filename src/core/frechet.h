/*
 * frechet.h - the frechet_ext engine: Fréchet distances between polygonal
 * curves in 2-D or 3-D.
 *
 * Plain C11, no PostgreSQL headers.  The caller supplies an allocator and an
 * interrupt callback (fr_env); the engine allocates nothing else, so a caller
 * whose interrupt callback long-jumps (PostgreSQL's CHECK_FOR_INTERRUPTS)
 * loses no memory that its own allocator does not own.
 *
 * Curves are given as fr_curve: n vertices of dimension 2 or 3, stored
 * contiguously (x0 y0 [z0] x1 y1 [z1] ...).  The engine trusts its input:
 * callers check at the border that n >= 1, dim is 2 or 3, every coordinate
 * is finite, and that coordinates lie within FR_MAX_ABS_COORD.
 */
#ifndef FRECHET_H
#define FRECHET_H

#include <stdbool.h>
#include <stddef.h>
#include <stdint.h>

/* Largest absolute coordinate accepted: squares of differences stay finite. */
#define FR_MAX_ABS_COORD 1e150

/*
 * Smallest nonzero coordinate magnitude in the frame where the engine works
 * (both curves shifted to a common origin; pairs tiny as a whole scaled up
 * by a power of two to an extent near 1).  From it up, two coordinates
 * that differ do so by at least 2^-502, so squared differences stay normal
 * numbers; below it squares underflow, and lengths and distances collapse
 * (a distance of 1e-200 beside an extent of 10 came back as 0).  Pairs with
 * such a coordinate get FR_ERANGE, never a number.
 */
#define FR_MIN_LOCAL_COORD 0x1p-450

typedef struct fr_env
{
	/* Returns memory or NULL; the engine frees with release(). */
	void	   *(*alloc) (size_t size, void *arg);
	void		(*release) (void *ptr, void *arg);

	/*
	 * Called at least every FR_INTERRUPT_CELLS units of work.  Returns
	 * nonzero to stop the computation (FR_EINTR); may also long-jump.  May
	 * be NULL.
	 */
	int			(*interrupted) (void *arg);
	void	   *arg;
} fr_env;

/* Work units (free-space cells, distance evaluations) between interrupt checks. */
#define FR_INTERRUPT_CELLS (1u << 14)

typedef struct fr_curve
{
	const double *coords;		/* n * dim doubles */
	size_t		n;				/* number of vertices, >= 1 */
	int			dim;			/* 2 or 3 */
} fr_curve;

typedef enum fr_status
{
	FR_OK = 0,
	FR_ENOMEM,					/* the allocator returned NULL */
	FR_EINTR,					/* the interrupt callback asked to stop */
	FR_EINVAL,					/* structurally invalid input */
	FR_ERANGE					/* a nonzero coordinate too small, in the pair's frame,
								 * for squared distances to keep their precision
								 * (FR_MIN_LOCAL_COORD) */
} fr_status;

/* Counters a caller may ask for; any pointer argument of this type may be NULL. */
typedef struct fr_stats
{
	uint64_t	decisions;		/* decider calls made */
	uint64_t	cells;			/* free-space cells visited by deciders */
	uint64_t	candidates;		/* critical values examined */
	uint64_t	walls;			/* decisions settled "no" near a wall of the vertex couplings */
} fr_stats;

/* Verdict of the cheap bounds on "distance <= eps". */
typedef enum fr_verdict
{
	FR_UNDECIDED = 0,			/* the bounds cannot tell; run the decider */
	FR_FAR,						/* a lower bound exceeds eps: the answer is false */
	FR_NEAR						/* a coupling within eps was found: the answer is true */
} fr_verdict;

/* Human-readable name of a status, for error messages. */
const char *fr_status_text(fr_status st);

/*
 * Whether every exact entry point can compute on the pair: false when a
 * nonzero coordinate is below FR_MIN_LOCAL_COORD in the pair's frame (they
 * return FR_ERANGE).  Linear, allocates nothing.
 */
bool		fr_pair_in_range(const fr_curve *p, const fr_curve *q);

/*
 * Bytes of scratch memory the engine may request for a distance or decision
 * between curves of n and m vertices (an upper bound, for limits checked
 * before any allocation).
 */
size_t		fr_scratch_bytes(size_t n, size_t m);

/*
 * Decision: is the continuous Fréchet distance between p and q at most eps?
 * eps must be >= 0 (may be +Inf).  O(nm) time, O(n+m) memory.
 */
fr_status	fr_decide(const fr_env *env, const fr_curve *p, const fr_curve *q,
					  double eps, bool *result, fr_stats *stats);

/*
 * fr_decide without its cheap filters, for callers that ran
 * fr_cheap_decide (bounds.h) themselves.  Same contract.
 */
fr_status	fr_decide_exact(const fr_env *env, const fr_curve *p, const fr_curve *q,
							double eps, bool *result, fr_stats *stats);

/*
 * The plain Alt & Godau (1995) decider, kept as the reference path that
 * faster deciders are tested against.  Same contract as fr_decide.
 */
fr_status	fr_decide_plain(const fr_env *env, const fr_curve *p, const fr_curve *q,
							double eps, bool *result, fr_stats *stats);

/*
 * Continuous Fréchet distance, exact to double precision: the returned d
 * satisfies decide(d) and, unless d == 0, !decide(d') for the largest
 * double d' < d whose decision the search examined (adjacent doubles).
 */
fr_status	fr_distance(const fr_env *env, const fr_curve *p, const fr_curve *q,
						double *result, fr_stats *stats);

/*
 * The same distance by the reference search: every decision by the plain
 * decider, critical values of type (b) sampled over all n*m pairs.  Much
 * slower; kept to test fr_distance against (the results are identical).
 */
fr_status	fr_distance_plain(const fr_env *env, const fr_curve *p, const fr_curve *q,
							  double *result, fr_stats *stats);

/*
 * Discrete Fréchet distance (Eiter & Mannila 1994): couplings of vertices
 * only.  O(nm) time, O(min(n,m)) memory.
 */
fr_status	fr_discrete_distance(const fr_env *env, const fr_curve *p,
								 const fr_curve *q, double *result);

/*
 * A breakpoint of a matching: positions on p and q as k + t (0-based vertex
 * k, fraction t of the way to vertex k+1) and the leash between them.
 */
typedef struct fr_match_pt
{
	double		a_pos;
	double		b_pos;
	double		leash;
} fr_match_pt;

/*
 * A witness: a monotone matching of p and q, as breakpoints from (0,0) to
 * (n-1, m-1); moving linearly between consecutive breakpoints keeps the
 * leash within eps.  eps < 0 or NaN asks for an optimal matching (eps =
 * the distance, stored in *used_eps).  *found is false (and *out NULL) when
 * no matching within eps exists.  *out is allocated through env and holds
 * *count breakpoints.  Memory: see fr_matching_scratch_bytes.
 */
fr_status	fr_matching(const fr_env *env, const fr_curve *p, const fr_curve *q,
						double eps, fr_match_pt **out, size_t *count, bool *found,
						double *used_eps, fr_stats *stats);

/*
 * Upper bound of the bytes fr_matching may request: about
 * 23 * min(n,m) * sqrt(max(n,m)) + 100 * (n + m) bytes (checkpointed rows).
 */
size_t		fr_matching_scratch_bytes(size_t n, size_t m);

/*
 * Partial matching (Alt & Godau 1995): the smallest Fréchet distance
 * between the trip and any part (subcurve) of the route; exact to double
 * precision like fr_distance.
 */
fr_status	fr_partial_distance(const fr_env *env, const fr_curve *trip,
								const fr_curve *route, double *result, fr_stats *stats);

/*
 * The part of the route, from *route_from to *route_to (positions k + t,
 * 0-based), that the trip follows within eps, and the Fréchet distance
 * between the trip and that part.  The part ends at the route point nearest
 * to the trip's end among those a matching within eps can end at, and
 * starts at the nearest to the trip's start among those from which that
 * end is reachable.  *found is false when no part is within eps.
 */
fr_status	fr_partial_match(const fr_env *env, const fr_curve *trip, const fr_curve *route,
							 double eps, bool *found, double *route_from, double *route_to,
							 double *distance, fr_stats *stats);

/*
 * Corridor search (passage.c): the stretch matched whole against a part of
 * the trip, in the stretch's direction (partial matching with the roles of
 * fr_partial_match reversed).  fr_passes: is some part of the trip within
 * Fréchet distance eps of the stretch?  fr_passage_distance: the smallest
 * such eps (equal to fr_partial_distance(stretch, trip)).  Both sweep only
 * the windows of the trip near the stretch.
 */
fr_status	fr_passes(const fr_env *env, const fr_curve *trip, const fr_curve *stretch,
					  double eps, bool *result, fr_stats *stats);
fr_status	fr_passage_distance(const fr_env *env, const fr_curve *trip, const fr_curve *stretch,
								double *result, fr_stats *stats);

/* A passage: the trip's part from trip_from to trip_to (0-based k + t) and its distance to the stretch. */
typedef struct fr_passage
{
	double		trip_from;
	double		trip_to;
	double		distance;
} fr_passage;

/*
 * Every passage of the trip through the stretch within eps, in trip order
 * (*out allocated in env; NULL, 0 when none).  Two passages are separate
 * when the trip leaves the eps-disc of the stretch's last vertex between
 * them; each is the part that partial matching picks in its visit (see
 * passage.c).
 */
fr_status	fr_passages(const fr_env *env, const fr_curve *trip, const fr_curve *stretch,
						double eps, fr_passage **out, size_t *count, fr_stats *stats);

/* Cheap verdicts for fr_passes, with no memory (see passage.c). */
fr_verdict	fr_passes_cheap(const fr_curve *trip, const fr_curve *stretch, double eps);

/* Upper bound of the bytes the corridor functions may request. */
size_t		fr_passage_scratch_bytes(size_t n, size_t m);

/*
 * An excursion: a stretch of the trip, between vertices trip_from and
 * trip_to (0-based), that the chosen order-preserving matching cannot keep
 * within eps; it left the route at route_from and rejoined it at route_to
 * (positions k + t, 0-based).  max_leash: the largest distance from a trip
 * vertex of the stretch to that part of the route; trip_length: the
 * stretch's length along the trip.
 */
typedef struct fr_excursion
{
	double		trip_from;
	double		trip_to;
	double		route_from;
	double		route_to;
	double		max_leash;
	double		trip_length;
	double		route_length;
} fr_excursion;

/*
 * Excursions of a trip from its route at eps; see excursions.c for the
 * exact definition.  *out (allocated through env, NULL when none) holds
 * *count excursions in trip order; none exactly when the Fréchet distance
 * is at most eps.
 */
fr_status	fr_excursions(const fr_env *env, const fr_curve *trip, const fr_curve *route,
						  double eps, fr_excursion **out, size_t *count, fr_stats *stats);

/* Upper bound of the bytes fr_excursions may request. */
size_t		fr_excursions_scratch_bytes(size_t n, size_t m);

/*
 * Sparse pings matched in order to a continuous route (pings.c): is there
 * a non-decreasing route position for every ping, the first at the route's
 * start and the last at its end, each ping within eps of its position, and
 * (max_gap >= 0 and finite) consecutive positions at most max_gap apart
 * along the route?  A single ping must be within eps of the whole route.
 */
fr_status	fr_pings_decide(const fr_env *env, const fr_curve *pings, const fr_curve *route,
							double eps, double max_gap, bool *result);

/* Cheap verdicts on the ping decision without max_gap, with no memory (pings.c). */
fr_verdict	fr_pings_cheap(const fr_curve *pings, const fr_curve *route, double eps, double max_gap);

/*
 * The smallest eps that fr_pings_decide accepts (+Infinity when max_gap
 * allows no matching); *decisions (may be NULL) counts the decisions made.
 */
fr_status	fr_pings_distance(const fr_env *env, const fr_curve *pings, const fr_curve *route,
							  double max_gap, double *result, uint64_t *decisions);

/* Scratch bytes of a ping decision or distance. */
size_t		fr_pings_scratch_bytes(size_t n, size_t m);

/*
 * Where sparse pings left the route at eps (pings.c): runs of off-route
 * pings of a plan with the fewest; trip_from/trip_to are ping numbers
 * (0-based), route_from/route_to the places of the on-route pings around
 * the run, max_leash the farthest ping of the run from that part of the
 * route, trip_length the run's length along the pings.  None exactly when
 * fr_pings_decide is true (without max_gap).
 */
fr_status	fr_pings_excursions(const fr_env *env, const fr_curve *pings, const fr_curve *route,
								double eps, fr_excursion **out, size_t *count);

/* Scratch bytes of fr_pings_excursions. */
size_t		fr_pings_excursions_scratch_bytes(size_t n, size_t m);

/*
 * A trip in progress (progress.c): is all of the trip within Fréchet
 * distance eps of a prefix of the route (its first point near the route's
 * start)?  *found says so; *route_pos (0-based k + t) is where the trip is
 * now: in the first connected stretch of places where such a prefix can
 * end, the place nearest the trip's last point; *fraction is its share of
 * the route's length (0 for a one-point route).
 */
fr_status	fr_progress(const fr_env *env, const fr_curve *trip, const fr_curve *route, double eps,
						bool *found, double *route_pos, double *fraction);

/* Scratch bytes of fr_progress. */
size_t		fr_progress_scratch_bytes(size_t n, size_t m);

/* The point at position pos (k + t, 0-based) of a curve, into out[dim]. */
void		fr_curve_point(const fr_curve *c, double pos, double *out);

/*
 * Simplification within tol (Agarwal, Har-Peled, Mustafa & Wang 2005): the
 * indices of the kept vertices, first and last included, in *keep
 * (allocated through env, *count of them); the curve through them is
 * within Fréchet distance tol of c.  tol >= 0.
 */
fr_status	fr_simplify(const fr_env *env, const fr_curve *c, double tol,
						size_t **keep, size_t *count);

/* Length of the longest edge of a curve (0 for one vertex). */
double		fr_longest_edge(const fr_curve *c);

#endif							/* FRECHET_H */
