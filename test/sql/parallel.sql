-- Parallel query: the functions' COST makes a scan of 100,000 trips with
-- no usable index run as a Parallel Seq Scan, and the workers' answers
-- equal the serial ones.  (Plans only; speed-ups are bench/parallel_bench.sh's.)
SET jit = off;
SET max_parallel_workers_per_gather = 2;
SET max_parallel_workers = 8;
SELECT setseed(0.5);
-- 12-point tracks along 1.1 km, in 7 lanes 5 m apart: about 24 MB of heap,
-- so PostgreSQL's size rule (min_parallel_table_scan_size) allows 2 workers.
CREATE TABLE par_trips AS
SELECT i AS id,
       array(SELECT point(k * 100 + 8 * random(), (i % 7) * 5 + 8 * random()) FROM generate_series(0, 11) k) AS track
FROM generate_series(1, 100000) i;
ANALYZE par_trips;
SELECT count(*) AS trips, pg_relation_size('par_trips') > 8 * 1024 * 1024 AS heap_over_8mb FROM par_trips;

-- The nightly check, no index: Parallel Seq Scan with workers.
EXPLAIN (COSTS OFF)
SELECT count(*) FROM par_trips WHERE frechet_at_most(track, '{"(0,0)","(1100,0)"}', 20);
EXPLAIN (COSTS OFF)
SELECT count(*) FROM par_trips WHERE NOT frechet_at_most(track, '{"(0,0)","(1100,0)"}', 20);
EXPLAIN (COSTS OFF)
SELECT max(frechet_distance(track, '{"(0,0)","(1100,0)"}')) FROM par_trips;
EXPLAIN (COSTS OFF)
SELECT id FROM par_trips ORDER BY track <-> '{"(0,0)","(1100,0)"}' LIMIT 10;

-- It is the cost that does it: the planner support function prices a
-- call by the vertices of both tracks (SupportRequestCost, support.c), so
-- a 12-vertex trip against a 2-vertex route costs about 36 operators a
-- row and the scan goes parallel, whatever COST the function declares
-- (the support function's price replaces it; before, a COST of 1 made
-- this plan serial).
BEGIN;
ALTER FUNCTION frechet_at_most(point[], point[], float8) COST 1;
EXPLAIN (COSTS OFF)
SELECT count(*) FROM par_trips WHERE frechet_at_most(track, '{"(0,0)","(1100,0)"}', 20);
ROLLBACK;
-- Per row, the cost grows with the route's vertices: 2, then 1,000.
CREATE FUNCTION pg_temp.cost_per_row(route point[]) RETURNS float8
LANGUAGE plpgsql AS $$
DECLARE j json;
BEGIN
	SET LOCAL max_parallel_workers_per_gather = 0;
	EXECUTE format('EXPLAIN (FORMAT JSON) SELECT frechet_at_most(track, %L::point[], 20) FROM par_trips', route) INTO j;
	RETURN (j->0->'Plan'->>'Total Cost')::float8 / 100000;
END $$;
SELECT pg_temp.cost_per_row(array(SELECT point(k, 0) FROM generate_series(0, 999) k))
       > 20 * pg_temp.cost_per_row('{"(0,0)","(1100,0)"}') AS cost_grows_with_route;

-- The workers' answer equals the serial one (the leader stays out, so the
-- workers evaluate every row).
SET max_parallel_workers_per_gather = 0;
CREATE TEMP TABLE serial_answer AS
SELECT count(*) FILTER (WHERE frechet_at_most(track, '{"(0,0)","(1100,0)"}', 20)) AS within_20,
       count(*) FILTER (WHERE frechet_at_most(track, '{"(0,0)","(600,30)","(1100,0)"}', 12)) AS within_12_bent
FROM par_trips;
SET max_parallel_workers_per_gather = 2;
SET parallel_leader_participation = off;
EXPLAIN (ANALYZE, COSTS OFF, TIMING OFF, SUMMARY OFF)
SELECT count(*) FROM par_trips WHERE frechet_at_most(track, '{"(0,0)","(1100,0)"}', 20);
SELECT s.within_20 = p.within_20 AND s.within_12_bent = p.within_12_bent AS parallel_equals_serial,
       s.within_20 > 0 AND s.within_20 < 100000 AS within_20_is_a_real_split
FROM serial_answer s,
     (SELECT count(*) FILTER (WHERE frechet_at_most(track, '{"(0,0)","(1100,0)"}', 20)) AS within_20,
             count(*) FILTER (WHERE frechet_at_most(track, '{"(0,0)","(600,30)","(1100,0)"}', 12)) AS within_12_bent
      FROM par_trips) p;
RESET parallel_leader_participation;

-- Long GPS tracks are TOASTed: the heap holds only pointers, stays under
-- min_parallel_table_scan_size, and PostgreSQL plans no workers whatever
-- the COST; the table's parallel_workers setting overrides the size rule.
CREATE TABLE par_long AS
SELECT i AS id,
       array(SELECT point(k * 5 + random(), (i % 7) * 5 + random()) FROM generate_series(0, 399) k) AS track
FROM generate_series(1, 2000) i;
ANALYZE par_long;
SELECT pg_relation_size('par_long') < 8 * 1024 * 1024 AS heap_small,
       pg_total_relation_size('par_long') > 8 * 1024 * 1024 AS with_toast_large;
EXPLAIN (COSTS OFF)
SELECT count(*) FROM par_long WHERE frechet_at_most(track, '{"(0,0)","(2000,0)"}', 20);
ALTER TABLE par_long SET (parallel_workers = 2);
EXPLAIN (COSTS OFF)
SELECT count(*) FROM par_long WHERE frechet_at_most(track, '{"(0,0)","(2000,0)"}', 20);

RESET max_parallel_workers_per_gather;
RESET max_parallel_workers;
RESET jit;
DROP TABLE par_trips, par_long;
