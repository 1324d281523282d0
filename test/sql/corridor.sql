-- Corridor search: frechet_passes (some part of the trip within epsilon of
-- the whole stretch, in its direction), frechet_passage (one row a
-- passage), frechet_passage_distance and its ordering operator <~~>>, and
-- the index: the planner support function hands it "trip |~~>|
-- frechet_reach(stretch, eps)", which must never drop a trip the function
-- keeps.  100,000 generated trips around x = 1e7 (a Web-Mercator-sized
-- offset, so rounding is at its worst) along 30 routes on an integer grid:
-- noisy, backwards, partial (joining late), with a detour, and single
-- points.  Stretches are one or two edges of a route, a route whole, and
-- a stretch no route drives.
SELECT setseed(0.25);

CREATE TABLE cs_routes AS
SELECT r AS rid,
       array(SELECT point(1e7 + bx + 300 * k + floor(random() * 41) - 20, by + 200 * (k % 2) + floor(random() * 41) - 20)
             FROM generate_series(0, 3 + r % 6) k ORDER BY k) AS route
FROM (SELECT r, 100 * floor(random() * 40) AS bx, 100 * floor(random() * 40) AS by
      FROM generate_series(1, 30) r) s;

-- A trip along route r: four samples a segment (from segment first_k on),
-- moved by whole numbers up to amp, optionally backwards.
CREATE FUNCTION pg_temp.drive(r point[], amp int, reverse bool, first_k int) RETURNS point[]
LANGUAGE sql VOLATILE AS $$
	SELECT array(SELECT point(p[0] + f * (q[0] - p[0]) + floor(random() * (2 * amp + 1)) - amp,
	                          p[1] + f * (q[1] - p[1]) + floor(random() * (2 * amp + 1)) - amp)
	             FROM (SELECT k, r[k] AS p, r[k + 1] AS q, f
	                   FROM generate_series(first_k, cardinality(r) - 1) k,
	                        unnest(ARRAY[0, 0.25, 0.5, 0.75]) f
	                   UNION ALL SELECT cardinality(r), r[cardinality(r)], r[cardinality(r)], 0) s
	             ORDER BY CASE WHEN reverse THEN -(k + f) ELSE k + f END)
$$;

CREATE TABLE cs_trips (id int PRIMARY KEY, rid int, kind text, track point[]);
INSERT INTO cs_trips
SELECT i, rid, kind,
       CASE kind
           WHEN 'noisy' THEN pg_temp.drive(route, 12, false, 1)
           WHEN 'backwards' THEN pg_temp.drive(route, 12, true, 1)
           WHEN 'partial' THEN pg_temp.drive(route, 8, false, 3)
           WHEN 'detour' THEN pg_temp.drive(route[1:2], 8, false, 1)
                || point((route[2])[0] + 150, (route[2])[1] + 400) || pg_temp.drive(route[3:], 8, false, 1)
           ELSE ARRAY[point((route[2])[0] + floor(random() * 61) - 30, (route[2])[1])]
       END
FROM (SELECT i, 1 + i % 30 AS rid,
             CASE WHEN (i / 30) % 20 < 13 THEN 'noisy' WHEN (i / 30) % 20 < 15 THEN 'backwards'
                  WHEN (i / 30) % 20 < 17 THEN 'partial' WHEN (i / 30) % 20 < 19 THEN 'detour' ELSE 'single point' END AS kind
      FROM generate_series(1, 100000) i) s
JOIN cs_routes USING (rid);
SELECT kind, count(*), min(cardinality(track)) AS min_points, max(cardinality(track)) AS max_points
FROM cs_trips GROUP BY kind ORDER BY kind;

-- Stretches: route 1's second edge at three tolerances, route 7's second
-- and third edges, route 12's second edge (which detours leave), route 18
-- whole, route 23's first edge backwards, and a stretch no route drives.
CREATE TABLE cs_queries AS
SELECT q, stretch, eps FROM (VALUES
	(1, (SELECT route[2:3] FROM cs_routes WHERE rid = 1), 10.0),
	(2, (SELECT route[2:3] FROM cs_routes WHERE rid = 1), 25.0),
	(3, (SELECT route[2:3] FROM cs_routes WHERE rid = 1), 60.0),
	(4, (SELECT route[2:4] FROM cs_routes WHERE rid = 7), 25.0),
	(5, (SELECT route[2:3] FROM cs_routes WHERE rid = 12), 25.0),
	(6, (SELECT route FROM cs_routes WHERE rid = 18), 30.0),
	(7, (SELECT ARRAY[route[2], route[1]] FROM cs_routes WHERE rid = 23), 25.0),
	(8, ARRAY[point(1e7 - 900, -900), point(1e7 - 600, -900)], 50.0)) v(q, stretch, eps);

-- The answers without any index, taken before the index exists.
CREATE TABLE cs_seq AS
SELECT q, count(t.id) AS n, md5(string_agg(t.id::text, ',' ORDER BY t.id)) AS ids
FROM cs_queries qq LEFT JOIN cs_trips t ON frechet_passes(t.track, qq.stretch, qq.eps)
GROUP BY q;
SELECT q, n FROM cs_seq ORDER BY q;

-- Which kinds drive route 12's second edge: its noisy trips do; partial
-- ones (which join at its third vertex), detours (which leave it there)
-- and backwards trips do not.
SELECT t.kind, count(*) FILTER (WHERE frechet_passes(t.track, qq.stretch, qq.eps)) AS passing, count(*) AS trips
FROM cs_trips t, cs_queries qq WHERE qq.q = 5 AND t.rid = 12 GROUP BY t.kind ORDER BY t.kind;

CREATE INDEX cs_trips_track ON cs_trips USING gist (track);
ANALYZE cs_trips;

-- The plan uses the index, with the function kept as the filter.
EXPLAIN (COSTS OFF)
SELECT id FROM cs_trips WHERE frechet_passes(track, (SELECT stretch FROM cs_queries WHERE q = 2), 25);

-- Through the index: the same rows for every query.
SET enable_seqscan = off;
CREATE TABLE cs_idx (q int, n bigint, ids text);
DO $$
DECLARE
	qq record;
BEGIN
	FOR qq IN SELECT q, stretch, eps FROM cs_queries ORDER BY q LOOP
		INSERT INTO cs_idx
		SELECT qq.q, count(*), md5(string_agg(id::text, ',' ORDER BY id))
		FROM cs_trips WHERE frechet_passes(track, qq.stretch, qq.eps);
	END LOOP;
END $$;
RESET enable_seqscan;
SELECT s.q, s.n, i.n AS n_index, s.ids IS NOT DISTINCT FROM i.ids AS same_rows
FROM cs_seq s JOIN cs_idx i USING (q) ORDER BY q;

-- The index condition alone keeps every passing trip and few others: the
-- share of the table it hands to frechet_passes, per query (under 5 %).
SELECT q, count(*) FILTER (WHERE track |~~>| frechet_reach(stretch, eps)) AS index_keeps,
       count(*) FILTER (WHERE frechet_passes(track, stretch, eps)) AS passing,
       bool_and(NOT frechet_passes(track, stretch, eps) OR track |~~>| frechet_reach(stretch, eps)) AS never_drops,
       count(*) FILTER (WHERE track |~~>| frechet_reach(stretch, eps)) < 5000 AS under_5_percent
FROM cs_queries, cs_trips GROUP BY q ORDER BY q;

-- The nearest passages: ORDER BY trip <~~>> stretch LIMIT 10 through the
-- index gives the distances of a sequential sort (rechecked exactly).
SET enable_seqscan = off;
CREATE TABLE cs_knn_idx AS
SELECT q, array_agg(round(d::numeric, 6) ORDER BY d) AS dists
FROM cs_queries qq, LATERAL (SELECT track <~~>> qq.stretch AS d FROM cs_trips
                             ORDER BY track <~~>> qq.stretch LIMIT 10) k
WHERE q IN (2, 4, 5, 8) GROUP BY q;
RESET enable_seqscan;
EXPLAIN (COSTS OFF)
SELECT id FROM cs_trips ORDER BY track <~~>> (SELECT stretch FROM cs_queries WHERE q = 2) LIMIT 10;
SET enable_indexscan = off;
SET enable_bitmapscan = off;
CREATE TABLE cs_knn_seq AS
SELECT q, array_agg(round(d::numeric, 6) ORDER BY d) AS dists
FROM cs_queries qq, LATERAL (SELECT track <~~>> qq.stretch AS d FROM cs_trips
                             ORDER BY track <~~>> qq.stretch LIMIT 10) k
WHERE q IN (2, 4, 5, 8) GROUP BY q;
RESET enable_indexscan;
RESET enable_bitmapscan;
SELECT q, s.dists = i.dists AS same_distances, s.dists[1] AS nearest
FROM cs_knn_seq s JOIN cs_knn_idx i USING (q) ORDER BY q;

-- frechet_passage_distance is the partial distance with the stretch
-- matched whole (frechet_partial_distance with the roles reversed), and
-- frechet_passes holds exactly from it on.
SELECT count(*) AS pairs,
       count(*) FILTER (WHERE frechet_passage_distance(t.track, qq.stretch)
                              = frechet_partial_distance(qq.stretch, t.track)) AS equal,
       bool_and(frechet_passes(t.track, qq.stretch, frechet_passage_distance(t.track, qq.stretch))) AS passes_at_distance,
       bool_and(frechet_passage_distance(t.track, qq.stretch) = 0
                OR NOT frechet_passes(t.track, qq.stretch, frechet_passage_distance(t.track, qq.stretch) * (1 - 1e-9))) AS fails_below
FROM cs_trips t, cs_queries qq WHERE t.id % 997 = 0 AND qq.q IN (2, 5, 6);

-- frechet_passage: rows exactly for the passing trips, each within epsilon,
-- its distance that of the stretch to its part (frechet_distance), its
-- part the track's piece between its positions (frechet_track_piece, up
-- to the rounding of the 1-based positions).
SELECT count(DISTINCT t.id) FILTER (WHERE p.trip_from IS NOT NULL) AS trips_with_rows,
       count(DISTINCT t.id) FILTER (WHERE frechet_passes(t.track, qq.stretch, qq.eps)) AS trips_passing,
       bool_and(p.distance <= qq.eps) AS within_eps,
       bool_and(abs(p.distance - frechet_distance(qq.stretch, p.trip_part)) <= 1e-6) AS distance_of_part,
       bool_and(cardinality(p.trip_part) = cardinality(frechet_track_piece(t.track, p.trip_from, p.trip_to))
                AND frechet_distance(p.trip_part, frechet_track_piece(t.track, p.trip_from, p.trip_to)) < 1e-6) AS part_is_piece
FROM cs_trips t CROSS JOIN cs_queries qq
LEFT JOIN LATERAL frechet_passage(t.track, qq.stretch, qq.eps) p ON true
WHERE qq.q IN (2, 4, 5) AND t.rid IN (1, 7, 12) AND t.id % 7 = 0;

-- A bus on a loop (Tollgate Lane, west to east, then around the block and
-- again): two passages; driven east to west: none.  A 20 m crossing
-- circled twice at 60 m: two passages, not a continuum.
WITH loop(track) AS (
	SELECT ARRAY[point(-200, 2), point(0, -3), point(50, 3), point(100, -3), point(150, 3), point(200, -3),
	             point(250, 3), point(300, -3), point(480, 150), point(150, 350), point(-180, 150),
	             point(-200, 0), point(0, 2), point(50, -2), point(100, 2), point(150, -2), point(200, 2),
	             point(250, -2), point(300, 2), point(500, 100)])
SELECT 'loop' AS trip, trip_from, trip_to, round(distance::numeric, 3) AS distance
FROM loop, frechet_passage(track, ARRAY[point(0, 0), point(150, 0), point(300, 0)], 15)
UNION ALL
SELECT 'loop backwards', trip_from, trip_to, round(distance::numeric, 3)
FROM loop, frechet_passage((SELECT array_agg(p ORDER BY k DESC) FROM unnest(track) WITH ORDINALITY u(p, k)),
                           ARRAY[point(0, 0), point(150, 0), point(300, 0)], 15);
SELECT count(*) AS passages
FROM frechet_passage((SELECT array_agg(point(10 + 60 * cos(a), 60 + 60 * sin(a)) ORDER BY a)
                      FROM generate_series(0, 59) g, LATERAL (SELECT -pi() / 2 - 0.6 + g * 4 * pi() / 59 AS a) s),
                     ARRAY[point(0, 0), point(20, 0)], 15);

-- Bad input: as the other functions.
SELECT frechet_passes(ARRAY[point(0, 0)], ARRAY[point(0, 0)], 'NaN');
SELECT frechet_passage(ARRAY[point(0, 0)], '{}', 1);

DROP TABLE cs_routes, cs_trips, cs_queries, cs_seq, cs_idx, cs_knn_idx, cs_knn_seq;
