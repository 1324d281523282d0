-- Witness and diagnosis on point[]: the matching, its bottleneck, partial
-- matches and excursions.  Positions are k + t with 1-based vertex numbers.

-- Worked by hand: the back-and-forth curve; its turn (6,1) -> (4,-1) is
-- matched while the straight curve waits at (5,0), the bottleneck at sqrt(2).
SELECT step, round(a_pos::numeric, 9) AS a_pos, round(b_pos::numeric, 9) AS b_pos,
       round(leash::numeric, 9) AS leash
FROM frechet_matching('{"(0,0)","(10,0)"}', '{"(0,0)","(6,1)","(4,-1)","(10,0)"}');

SELECT round(a_pos::numeric, 9) AS a_pos, round(b_pos::numeric, 9) AS b_pos,
       b_point, round(leash::numeric, 9) AS leash
FROM frechet_bottleneck('{"(0,0)","(10,0)"}', '{"(0,0)","(6,1)","(4,-1)","(10,0)"}');

-- Every matching of 60 generated pairs, checked in SQL: from (1,1) to (n,m),
-- monotone, longest leash equal to the distance (the definition), and the
-- bottleneck's leash too.
CREATE TABLE witness_pairs AS
SELECT i,
       array(SELECT point(k * 10 + 4 * sin(i * k), 3 * cos(i + k)) FROM generate_series(0, 3 + i % 9) k) AS a,
       array(SELECT point(k * 8 + 3 * cos(i * k), 4 * sin(i - 2 * k)) FROM generate_series(0, 4 + i % 7) k) AS b
FROM generate_series(1, 60) i;

WITH m AS (
	SELECT p.i, f.*, frechet_distance(p.a, p.b) AS d,
	       array_length(p.a, 1) AS n_a, array_length(p.b, 1) AS n_b,
	       lag(f.a_pos) OVER w AS prev_a, lag(f.b_pos) OVER w AS prev_b
	FROM witness_pairs p, frechet_matching(p.a, p.b) f
	WINDOW w AS (PARTITION BY p.i ORDER BY f.step))
SELECT count(DISTINCT i) AS pairs,
       bool_and(a_pos >= coalesce(prev_a, 1) AND b_pos >= coalesce(prev_b, 1)) AS monotone,
       bool_and(leash <= d * (1 + 1e-9)) AS within_distance,
       count(*) FILTER (WHERE step = 1 AND a_pos = 1 AND b_pos = 1) AS starts,
       count(*) FILTER (WHERE a_pos = n_a AND b_pos = n_b) AS ends
FROM m;

SELECT count(*) FILTER (WHERE abs(worst - d) <= 1e-9 * d) AS longest_is_distance,
       count(*) FILTER (WHERE abs(bottleneck - d) <= 1e-9 * d) AS bottleneck_is_distance
FROM (SELECT frechet_distance(a, b) AS d,
             (SELECT max(leash) FROM frechet_matching(a, b)) AS worst,
             (SELECT leash FROM frechet_bottleneck(a, b)) AS bottleneck
      FROM witness_pairs) s;

-- With epsilon: a matching within it, or no rows at all.
SELECT count(*) FILTER (WHERE ok_above) AS found_at_1_1d,
       count(*) FILTER (WHERE none_below) AS none_at_0_9d
FROM (SELECT (SELECT max(leash) <= 1.1 * frechet_distance(a, b)
              FROM frechet_matching(a, b, 1.1 * frechet_distance(a, b))) AS ok_above,
             NOT EXISTS (SELECT FROM frechet_matching(a, b, 0.9 * frechet_distance(a, b))) AS none_below
      FROM witness_pairs) s;

-- A one-point curve is matched to every vertex of the other.
SELECT step, a_pos, b_pos, leash FROM frechet_matching('{"(0,0)"}', '{"(3,4)","(0,1)","(-6,8)"}');

-- NULL curves give no rows (the function accepts a NULL epsilon, so it is not STRICT).
SELECT count(*) AS rows_for_null FROM frechet_matching(NULL, '{"(0,0)"}');

-- Partial matching (Alt & Godau 1995): a trip along x = 30..60 of a 0..100 route.
SELECT round(frechet_partial_distance(array(SELECT point(x, 0.5) FROM generate_series(30, 60, 5) x),
                                      array(SELECT point(x, 0) FROM generate_series(0, 100, 10) x))::numeric, 9) AS partial_distance,
       round(frechet_distance(array(SELECT point(x, 0.5) FROM generate_series(30, 60, 5) x),
                              array(SELECT point(x, 0) FROM generate_series(0, 100, 10) x))::numeric, 9) AS full_distance;
SELECT round(route_from::numeric, 9) AS route_from, round(route_to::numeric, 9) AS route_to,
       round(distance::numeric, 9) AS distance
FROM frechet_partial_match(array(SELECT point(x, 0.5) FROM generate_series(30, 60, 5) x),
                           array(SELECT point(x, 0) FROM generate_series(0, 100, 10) x), 2);
SELECT count(*) AS rows_when_too_tight
FROM frechet_partial_match(array(SELECT point(x, 0.5) FROM generate_series(30, 60, 5) x),
                           array(SELECT point(x, 0) FROM generate_series(0, 100, 10) x), 0.25);

-- Excursions: a trip along a straight 0..1000 street with one detour of
-- 300 m between x = 400 and x = 600, sampled every 50 m.
CREATE TABLE detour AS
SELECT array(SELECT point(x, CASE WHEN x BETWEEN 450 AND 550 THEN 300 ELSE (x % 7) - 3 END)
             FROM generate_series(0, 1000, 50) x) AS trip,
       '{"(0,0)","(250,0)","(500,0)","(750,0)","(1000,0)"}'::point[] AS route;
SELECT trip_from, trip_to, round(route_from::numeric, 6) AS route_from, round(route_to::numeric, 6) AS route_to,
       round(max_leash::numeric, 6) AS max_leash, round(trip_length::numeric, 3) AS trip_length
FROM detour, frechet_excursions(trip, route, 20);
-- none exactly when frechet_at_most holds
SELECT frechet_at_most(trip, route, 300) AS close_at_300,
       (SELECT count(*) FROM frechet_excursions(trip, route, 300)) AS excursions_at_300
FROM detour;
-- the same street driven backwards is one excursion over all of it
SELECT trip_from, trip_to, round(trip_length::numeric, 3) AS trip_length
FROM frechet_excursions(array(SELECT point(x, 1) FROM generate_series(1000, 0, -50) x),
                        '{"(0,0)","(250,0)","(500,0)","(750,0)","(1000,0)"}', 20);

-- Labels the planner and the catalog see.
SELECT proname, provolatile, proisstrict, proparallel, procost >= 10000 AS expensive,
       obj_description(oid, 'pg_proc') IS NOT NULL AS commented
FROM pg_proc WHERE proname IN ('frechet_matching', 'frechet_bottleneck', 'frechet_partial_distance',
                               'frechet_partial_match', 'frechet_excursions')
ORDER BY proname;

DROP TABLE witness_pairs, detour;
