-- k-nearest tracks: ORDER BY track <-> route LIMIT k goes through the GiST
-- index, whose distance is a lower bound of the Fréchet distance with
-- recheck; the executor reorders by the exact distance.  A bound above the
-- true distance would show as different answers here, or as the executor's
-- "index returned tuples in wrong order" error.  10,400 generated tracks,
-- as in index_range: bus lines on an integer grid around x = 1e7, noisy,
-- partial, reversed and resampled runs, one-point tracks, exact duplicates.
SELECT setseed(0.5);

-- A copy of a route with every coordinate moved by a whole number in [-amp, amp].
CREATE FUNCTION pg_temp.jitter(r point[], amp int) RETURNS point[]
LANGUAGE sql VOLATILE AS $$
	SELECT array(SELECT point(p[0] + floor(random() * (2 * amp + 1)) - amp,
	                          p[1] + floor(random() * (2 * amp + 1)) - amp)
	             FROM unnest(r) WITH ORDINALITY AS u(p, k) ORDER BY k)
$$;

CREATE TABLE knn_lines AS
SELECT l AS line,
       array(SELECT point(1e7 + bx + 40 * k + floor(random() * 21) - 10, by + floor(random() * 41) - 20)
             FROM generate_series(0, 2 + l % 7) k ORDER BY k) AS route
FROM (SELECT l, 50 * floor(random() * 12) AS bx, 50 * floor(random() * 12) AS by
      FROM generate_series(1, 24) l) s;

CREATE TABLE knn_tracks (id int PRIMARY KEY, line int, kind text, track point[]);
INSERT INTO knn_tracks
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
JOIN knn_lines USING (line);
INSERT INTO knn_tracks
SELECT 10000 + i, line, 'duplicate', track FROM generate_series(1, 300) i JOIN knn_tracks ON id = 1 + (i * 31) % 10000;
INSERT INTO knn_tracks
SELECT 10300 + i, line, 'repeated', track[1:1] || track
FROM (SELECT row_number() OVER (ORDER BY id)::int AS i, line, track FROM knn_tracks WHERE id % 97 = 5) s WHERE i <= 100;
SELECT count(*) AS tracks, count(*) FILTER (WHERE cardinality(track) = 1) AS one_point FROM knn_tracks;

CREATE INDEX knn_tracks_track ON knn_tracks USING gist (track);
ANALYZE knn_tracks;

-- Query routes: stored tracks (their duplicates tie at distance 0), lines,
-- a one-point route, and a route far from every line.
CREATE TABLE knn_routes AS
SELECT row_number() OVER (ORDER BY src, n)::int AS rid, route, k
FROM (SELECT 1 AS src, id AS n, track AS route, 10 AS k FROM knn_tracks WHERE id % 1013 = 7 OR id IN (10001, 10302)
      UNION ALL SELECT 2, line, route, 10 FROM knn_lines WHERE line % 6 = 1
      UNION ALL SELECT 3, 0, ARRAY[point(1e7 + 300, 300)], 10
      UNION ALL SELECT 3, 1, ARRAY[point(1e7 + 5000, -4000), point(1e7 + 5400, -4000)], 10
      UNION ALL SELECT 4, id, track, k FROM knn_tracks, (VALUES (1), (50)) ks(k) WHERE id IN (40, 41)) s;
SELECT count(*) AS routes FROM knn_routes;

SET enable_seqscan = off;
EXPLAIN (COSTS OFF)
SELECT id FROM knn_tracks ORDER BY track <-> '{"(10000000,0)","(10000100,0)"}' LIMIT 10;
EXPLAIN (COSTS OFF)
SELECT id FROM knn_tracks ORDER BY '{"(10000000,0)","(10000100,0)"}' <-> track LIMIT 10;

-- The k nearest, in order, with their distances.
CREATE TABLE knn_with_index AS
SELECT r.rid, n.ord, n.id, n.d
FROM knn_routes r,
     LATERAL (SELECT row_number() OVER () AS ord, id, d
              FROM (SELECT id, track <-> r.route AS d FROM knn_tracks ORDER BY track <-> r.route LIMIT r.k) s) n;

RESET enable_seqscan;
SET enable_indexscan = off;
SET enable_bitmapscan = off;
EXPLAIN (COSTS OFF)
SELECT id FROM knn_tracks ORDER BY track <-> '{"(10000000,0)","(10000100,0)"}' LIMIT 10;
CREATE TABLE knn_without_index AS
SELECT r.rid, n.ord, n.id, n.d
FROM knn_routes r,
     LATERAL (SELECT row_number() OVER () AS ord, id, d
              FROM (SELECT id, track <-> r.route AS d FROM knn_tracks ORDER BY track <-> r.route, id LIMIT r.k) s) n;
RESET enable_indexscan;
RESET enable_bitmapscan;

-- Per query: the same distances in the same order, and the same rows
-- except where several rows tie with the k-th distance (which of them
-- fills the last places is not defined by ORDER BY ... LIMIT).
WITH w AS (SELECT rid, array_agg(d ORDER BY ord) AS ds, max(d) AS dk FROM knn_with_index GROUP BY rid),
     o AS (SELECT rid, array_agg(d ORDER BY ord) AS ds FROM knn_without_index GROUP BY rid)
SELECT count(*) AS queries,
       count(*) FILTER (WHERE w.ds IS DISTINCT FROM o.ds) AS distances_differ,
       count(*) FILTER (WHERE (SELECT array_agg(id ORDER BY id) FROM knn_with_index x WHERE x.rid = w.rid AND x.d < w.dk)
                   IS DISTINCT FROM (SELECT array_agg(id ORDER BY id) FROM knn_without_index y WHERE y.rid = w.rid AND y.d < w.dk))
           AS rows_differ,
       count(*) FILTER (WHERE (SELECT count(*) FROM knn_tracks t, knn_routes r WHERE r.rid = w.rid AND t.track <-> r.route = w.dk) > 1)
           AS ties_at_kth,
       count(*) FILTER (WHERE w.ds[1] = 0) AS nearest_at_zero
FROM w JOIN o USING (rid);
-- Rows in index order are in non-decreasing exact distance.
SELECT count(*) AS out_of_order
FROM knn_with_index a JOIN knn_with_index b ON a.rid = b.rid AND b.ord = a.ord + 1
WHERE b.d < a.d;

-- The whole table in index order (no LIMIT) matches a full sort.
SET enable_seqscan = off;
CREATE TABLE knn_full AS
SELECT row_number() OVER () AS ord, d
FROM (SELECT track <-> '{"(10000300,300)","(10000500,320)","(10000600,250)"}' AS d
      FROM knn_tracks ORDER BY track <-> '{"(10000300,300)","(10000500,320)","(10000600,250)"}') s;
RESET enable_seqscan;
SELECT count(*) AS ranked,
       count(*) FILTER (WHERE f.d IS DISTINCT FROM s.d) AS differ
FROM knn_full f
JOIN (SELECT row_number() OVER (ORDER BY d) AS ord, d
      FROM (SELECT track <-> '{"(10000300,300)","(10000500,320)","(10000600,250)"}' AS d FROM knn_tracks) x) s USING (ord);

DROP TABLE knn_lines, knn_tracks, knn_routes, knn_with_index, knn_without_index, knn_full;
