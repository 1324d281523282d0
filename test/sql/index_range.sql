-- Range queries: with a GiST index on point[], WHERE frechet_at_most(track,
-- route, eps) goes through the index (a lossy condition from the planner
-- support function, then the exact call) and returns exactly the rows a
-- sequential scan returns.  10,400 generated tracks around x = 1e7 (a
-- Web-Mercator-sized offset, so rounding is at its worst): noisy copies of
-- 24 bus lines on an integer grid (so many distances tie exactly), partial
-- and reversed runs, resampled copies at distance 0, one-point tracks, and
-- exact duplicates.
SELECT setseed(0.25);

-- A copy of a route with every coordinate moved by a whole number in [-amp, amp].
CREATE FUNCTION pg_temp.jitter(r point[], amp int) RETURNS point[]
LANGUAGE sql VOLATILE AS $$
	SELECT array(SELECT point(p[0] + floor(random() * (2 * amp + 1)) - amp,
	                          p[1] + floor(random() * (2 * amp + 1)) - amp)
	             FROM unnest(r) WITH ORDINALITY AS u(p, k) ORDER BY k)
$$;

CREATE TABLE idx_lines AS
SELECT l AS line,
       array(SELECT point(1e7 + bx + 40 * k + floor(random() * 21) - 10, by + floor(random() * 41) - 20)
             FROM generate_series(0, 2 + l % 7) k ORDER BY k) AS route
FROM (SELECT l, 50 * floor(random() * 12) AS bx, 50 * floor(random() * 12) AS by
      FROM generate_series(1, 24) l) s;

CREATE TABLE idx_tracks (id int PRIMARY KEY, line int, kind text, track point[]);
INSERT INTO idx_tracks
SELECT i, line, kind,
       CASE kind
           WHEN 'noisy' THEN pg_temp.jitter(route, 3)
           WHEN 'partial' THEN pg_temp.jitter(route[2:], 2)
           WHEN 'reversed' THEN pg_temp.jitter(array(SELECT route[k] FROM generate_series(cardinality(route), 1, -1) k), 3)
           WHEN 'resampled' THEN array(SELECT p FROM (SELECT k, 0 AS h, route[k] AS p FROM generate_series(1, cardinality(route)) k
                                                 UNION ALL
                                                 SELECT k, 1, point(((route[k])[0] + (route[k + 1])[0]) / 2, ((route[k])[1] + (route[k + 1])[1]) / 2)
                                                 FROM generate_series(1, cardinality(route) - 1) k) v ORDER BY k, h)
           ELSE pg_temp.jitter(ARRAY[route[1 + floor(random() * cardinality(route))::int]], 4)
       END
FROM (SELECT i, 1 + i % 24 AS line,
             CASE WHEN i % 20 < 14 THEN 'noisy' WHEN i % 20 < 16 THEN 'partial'
                  WHEN i % 20 < 18 THEN 'reversed' WHEN i % 20 = 18 THEN 'resampled' ELSE 'point' END AS kind
      FROM generate_series(1, 10000) i) s
JOIN idx_lines USING (line);
-- exact duplicates of 300 tracks, and 100 copies with a repeated vertex (distance 0, other arrays)
INSERT INTO idx_tracks
SELECT 10000 + i, line, 'duplicate', track FROM generate_series(1, 300) i JOIN idx_tracks ON id = 1 + (i * 31) % 10000;
INSERT INTO idx_tracks
SELECT 10300 + i, line, 'repeated', track[1:1] || track
FROM (SELECT row_number() OVER (ORDER BY id)::int AS i, line, track FROM idx_tracks WHERE id % 97 = 5) s WHERE i <= 100;
SELECT kind, count(*), min(cardinality(track)) AS min_points, max(cardinality(track)) AS max_points
FROM idx_tracks GROUP BY kind ORDER BY kind;

CREATE INDEX idx_tracks_track ON idx_tracks USING gist (track);
ANALYZE idx_tracks;

-- Queries: stored tracks (so duplicates and distance-0 copies match at eps = 0),
-- the lines themselves, and one-point routes; each at fixed tolerances and at
-- tolerances equal to an exact distance, where a row sits on the boundary.
CREATE TABLE idx_routes AS
SELECT row_number() OVER (ORDER BY src, n)::int AS rid, route, line
FROM (SELECT 1 AS src, id AS n, track AS route, line FROM idx_tracks WHERE id % 877 = 3
      UNION ALL SELECT 2, line, route, line FROM idx_lines WHERE line % 4 = 1
      UNION ALL SELECT 3, id, track, line FROM idx_tracks WHERE kind = 'point' AND id % 2000 = 19
      UNION ALL SELECT 4, 0, ARRAY[point(1e7 + 300, 300)], NULL) s;
CREATE TABLE idx_queries AS
SELECT rid, route, eps, NULL::int AS boundary_id
FROM idx_routes, unnest(ARRAY[0, 1, 2.5, 4, 6, 15, 60]::float8[]) eps
UNION ALL
SELECT rid, route, frechet_distance(t.track, r.route), t.id
FROM idx_routes r
JOIN LATERAL (SELECT id, track FROM idx_tracks t
              WHERE t.line = r.line AND t.kind IN ('noisy', 'partial', 'point')
              ORDER BY (t.id * 7919 + r.rid) % 1009 LIMIT 3) t ON true;
SELECT count(*) AS queries, count(DISTINCT rid) AS routes, count(boundary_id) AS at_a_distance,
       count(*) FILTER (WHERE eps = 0) AS at_zero
FROM idx_queries;

-- The planner uses the index for the predicate alone, either argument order,
-- and inside a join.
SET enable_seqscan = off;
EXPLAIN (COSTS OFF)
SELECT id FROM idx_tracks WHERE frechet_at_most(track, '{"(10000000,0)","(10000100,0)"}', 5);
EXPLAIN (COSTS OFF)
SELECT id FROM idx_tracks WHERE frechet_at_most('{"(10000000,0)","(10000100,0)"}', track, 5);
EXPLAIN (COSTS OFF)
SELECT q.rid, t.id FROM idx_queries q JOIN idx_tracks t ON frechet_at_most(t.track, q.route, q.eps);

CREATE TABLE idx_with_index AS
SELECT q.rid, q.eps, q.boundary_id,
       array(SELECT t.id FROM idx_tracks t WHERE frechet_at_most(t.track, q.route, q.eps) ORDER BY t.id) AS ids,
       array(SELECT t.id FROM idx_tracks t WHERE frechet_at_most(q.route, t.track, q.eps) ORDER BY t.id) AS ids_swapped
FROM idx_queries q;
CREATE TABLE idx_join_index AS
SELECT q.rid, q.eps, q.boundary_id, t.id
FROM idx_queries q JOIN idx_tracks t ON frechet_at_most(t.track, q.route, q.eps);

RESET enable_seqscan;
SET enable_indexscan = off;
SET enable_bitmapscan = off;
EXPLAIN (COSTS OFF)
SELECT id FROM idx_tracks WHERE frechet_at_most(track, '{"(10000000,0)","(10000100,0)"}', 5);
CREATE TABLE idx_without_index AS
SELECT q.rid, q.eps, q.boundary_id,
       array(SELECT t.id FROM idx_tracks t WHERE frechet_at_most(t.track, q.route, q.eps) ORDER BY t.id) AS ids
FROM idx_queries q;
RESET enable_indexscan;
RESET enable_bitmapscan;

-- Identical answers, query by query; boundary rows are found; the join agrees.
SELECT count(*) AS queries,
       count(*) FILTER (WHERE w.ids IS DISTINCT FROM o.ids) AS differ,
       count(*) FILTER (WHERE w.ids_swapped IS DISTINCT FROM o.ids) AS differ_swapped,
       sum(cardinality(o.ids)) AS rows_found,
       count(*) FILTER (WHERE cardinality(o.ids) > 0 AND cardinality(o.ids) < 10400) AS selective,
       count(*) FILTER (WHERE o.eps = 0 AND cardinality(o.ids) > 1) AS zero_eps_with_company
FROM idx_with_index w
JOIN idx_without_index o ON o.rid = w.rid AND o.eps = w.eps AND o.boundary_id IS NOT DISTINCT FROM w.boundary_id;
SELECT count(*) AS boundary_queries,
       count(*) FILTER (WHERE boundary_id = ANY (ids)) AS boundary_row_found
FROM idx_with_index WHERE boundary_id IS NOT NULL;
SELECT count(*) AS join_rows,
       (SELECT sum(cardinality(ids)) FROM idx_without_index) AS expected_rows,
       count(*) FILTER (WHERE NOT EXISTS (SELECT 1 FROM idx_without_index o
                                           WHERE o.rid = j.rid AND o.eps = j.eps
                                             AND o.boundary_id IS NOT DISTINCT FROM j.boundary_id
                                             AND j.id = ANY (o.ids))) AS join_extra
FROM idx_join_index j;

-- The index condition alone never drops a row that frechet_at_most keeps.
SELECT count(*) AS missed
FROM idx_queries q JOIN idx_tracks t ON frechet_at_most(t.track, q.route, q.eps)
WHERE NOT (t.track |~~| frechet_reach(q.route, q.eps));

-- Rows the SQL functions reject (empty, NULL element, NaN, 2-D) still index;
-- a query that reaches them fails with the same error with or without the index.
CREATE TABLE idx_bad (id int, track point[]);
INSERT INTO idx_bad VALUES (1, '{"(0,0)","(10,0)"}'), (2, '{}'), (3, '{"(0,0)",NULL}'),
    (4, '{"(0,0)","(NaN,1)"}'), (5, '{{"(0,0)"},{"(1,1)"}}'), (6, NULL), (7, '{"(50,50)"}');
CREATE INDEX ON idx_bad USING gist (track);
CREATE FUNCTION pg_temp.outcome(stmt text) RETURNS text
LANGUAGE plpgsql AS $$
DECLARE
	r text;
BEGIN
	EXECUTE stmt INTO r;
	RETURN 'ok: ' || coalesce(r, 'NULL');
EXCEPTION WHEN OTHERS THEN
	RETURN SQLSTATE || ': ' || SQLERRM;
END $$;
SET enable_seqscan = off;
SELECT pg_temp.outcome($$SELECT string_agg(id::text, ',' ORDER BY id) FROM idx_bad WHERE frechet_at_most(track, '{"(0,0)","(10,0)"}', 1)$$) AS with_index;
SELECT pg_temp.outcome($$SELECT string_agg(id::text, ',' ORDER BY id) FROM idx_bad WHERE id IN (1, 6, 7) AND frechet_at_most(track, '{"(0,0)","(10,0)"}', 1)$$) AS good_rows_only;
RESET enable_seqscan;
SET enable_indexscan = off;
SET enable_bitmapscan = off;
SELECT pg_temp.outcome($$SELECT string_agg(id::text, ',' ORDER BY id) FROM idx_bad WHERE frechet_at_most(track, '{"(0,0)","(10,0)"}', 1)$$) AS without_index;
RESET enable_indexscan;
RESET enable_bitmapscan;

DROP TABLE idx_lines, idx_tracks, idx_routes, idx_queries, idx_with_index, idx_join_index, idx_without_index, idx_bad;
