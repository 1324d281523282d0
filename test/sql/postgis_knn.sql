-- Our own GiST operator classes on PostGIS columns: frechet_geometry_ops and
-- frechet_geography_ops.  ORDER BY track <~~> route LIMIT k walks the index
-- by a lower bound of the Fréchet distance (recheck on, the executor
-- reorders by the exact distance), and frechet_at_most(track, route, eps)
-- gets the lossy condition track |~~| frechet_reach(route, eps) from its
-- planner support function.  Answers must equal those of sequential scans.
-- A bound above an exact distance would show as different answers here, or
-- as the executor's "index returned tuples in wrong order" error.
CREATE EXTENSION IF NOT EXISTS postgis;
CREATE EXTENSION frechet_ext_postgis;
SELECT setseed(0.75);

-- The operator classes pass amvalidate; neither is the default for its type.
SELECT c.opcname, c.opcdefault, c.opcintype::regtype AS for_type,
       c.opckeytype::regtype AS key_type, amvalidate(c.oid) AS valid
FROM pg_opclass c
JOIN pg_depend d ON d.classid = 'pg_opclass'::regclass AND d.objid = c.oid AND d.deptype = 'e'
JOIN pg_extension e ON e.oid = d.refobjid AND e.extname = 'frechet_ext_postgis'
ORDER BY c.opcname;
SELECT c.opcname, o.amopstrategy AS strategy, o.amopopr::regoperator AS operator, o.amoppurpose AS purpose
FROM pg_amop o JOIN pg_opclass c ON c.opcfamily = o.amopfamily
WHERE c.opcname IN ('frechet_geometry_ops', 'frechet_geography_ops')
ORDER BY 1, 2;

-- Planar: 10,400 tracks as in index_range / index_knn, built as point[] on
-- an integer grid around x = 1e7 (Web Mercator sized, rounding at its
-- worst) and turned into geometry: noisy, partial, reversed and resampled
-- runs of 24 lines, one-point tracks (Points), exact duplicates, and
-- copies with a repeated vertex.
CREATE FUNCTION pg_temp.jitter(r point[], amp int) RETURNS point[]
LANGUAGE sql VOLATILE AS $$
	SELECT array(SELECT point(p[0] + floor(random() * (2 * amp + 1)) - amp,
	                          p[1] + floor(random() * (2 * amp + 1)) - amp)
	             FROM unnest(r) WITH ORDINALITY AS u(p, k) ORDER BY k)
$$;
CREATE FUNCTION pg_temp.geom(t point[]) RETURNS geometry
LANGUAGE sql IMMUTABLE AS $$
	SELECT ST_SetSRID(CASE WHEN cardinality(t) = 1 THEN ST_MakePoint((t[1])[0], (t[1])[1])
	                       ELSE ST_MakeLine(array(SELECT ST_MakePoint(p[0], p[1])
	                                              FROM unnest(t) WITH ORDINALITY AS u(p, k) ORDER BY k)) END, 3857)
$$;

CREATE TABLE gk_lines AS
SELECT l AS line,
       array(SELECT point(1e7 + bx + 40 * k + floor(random() * 21) - 10, by + floor(random() * 41) - 20)
             FROM generate_series(0, 2 + l % 7) k ORDER BY k) AS route
FROM (SELECT l, 50 * floor(random() * 12) AS bx, 50 * floor(random() * 12) AS by
      FROM generate_series(1, 24) l) s;
CREATE TABLE gk_arrays (id int PRIMARY KEY, line int, kind text, track point[]);
INSERT INTO gk_arrays
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
JOIN gk_lines USING (line);
INSERT INTO gk_arrays
SELECT 10000 + i, line, 'duplicate', track FROM generate_series(1, 300) i JOIN gk_arrays ON id = 1 + (i * 31) % 10000;
INSERT INTO gk_arrays
SELECT 10300 + i, line, 'repeated', track[1:1] || track
FROM (SELECT row_number() OVER (ORDER BY id)::int AS i, line, track FROM gk_arrays WHERE id % 97 = 5) s WHERE i <= 100;

CREATE TABLE gk_tracks AS SELECT id, line, kind, pg_temp.geom(track) AS geom FROM gk_arrays;
SELECT kind, count(*), min(ST_NPoints(geom)) AS min_points, max(ST_NPoints(geom)) AS max_points,
       string_agg(DISTINCT GeometryType(geom), ',') AS types
FROM gk_tracks GROUP BY kind ORDER BY kind;

CREATE INDEX gk_tracks_frechet ON gk_tracks USING gist (geom frechet_geometry_ops);
ANALYZE gk_tracks;

-- The geometry distance is the point[] distance on the same coordinates.
SELECT count(*) AS pairs,
       count(*) FILTER (WHERE pg_temp.geom(a.track) <~~> pg_temp.geom(b.track) IS DISTINCT FROM a.track <-> b.track) AS differ
FROM gk_arrays a JOIN gk_arrays b ON b.id = a.id + 1 WHERE a.id % 50 = 0;

-- k-nearest.  Queries: stored tracks (duplicates tie at distance 0), lines,
-- a one-point route, a route far from every line; k = 10, and k = 1 and 50.
CREATE TABLE gk_routes AS
SELECT row_number() OVER (ORDER BY src, n)::int AS rid, pg_temp.geom(route) AS route, k
FROM (SELECT 1 AS src, id AS n, track AS route, 10 AS k FROM gk_arrays WHERE id % 1013 = 7 OR id IN (10001, 10302)
      UNION ALL SELECT 2, line, route, 10 FROM gk_lines WHERE line % 6 = 1
      UNION ALL SELECT 3, 0, ARRAY[point(1e7 + 300, 300)], 10
      UNION ALL SELECT 3, 1, ARRAY[point(1e7 + 5000, -4000), point(1e7 + 5400, -4000)], 10
      UNION ALL SELECT 4, id, track, k FROM gk_arrays, (VALUES (1), (50)) ks(k) WHERE id IN (40, 41)) s;
SELECT count(*) AS routes FROM gk_routes;

SET enable_seqscan = off;
EXPLAIN (COSTS OFF)
SELECT id FROM gk_tracks ORDER BY geom <~~> 'SRID=3857;LINESTRING(10000000 0,10000100 0)'::geometry LIMIT 10;
EXPLAIN (COSTS OFF)
SELECT id FROM gk_tracks ORDER BY 'SRID=3857;LINESTRING(10000000 0,10000100 0)'::geometry <~~> geom LIMIT 10;
CREATE TABLE gk_knn_index AS
SELECT r.rid, n.ord, n.id, n.d
FROM gk_routes r,
     LATERAL (SELECT row_number() OVER () AS ord, id, d
              FROM (SELECT id, geom <~~> r.route AS d FROM gk_tracks ORDER BY geom <~~> r.route LIMIT r.k) s) n;
RESET enable_seqscan;
SET enable_indexscan = off;
SET enable_bitmapscan = off;
EXPLAIN (COSTS OFF)
SELECT id FROM gk_tracks ORDER BY geom <~~> 'SRID=3857;LINESTRING(10000000 0,10000100 0)'::geometry LIMIT 10;
CREATE TABLE gk_knn_seq AS
SELECT r.rid, n.ord, n.id, n.d
FROM gk_routes r,
     LATERAL (SELECT row_number() OVER () AS ord, id, d
              FROM (SELECT id, geom <~~> r.route AS d FROM gk_tracks ORDER BY geom <~~> r.route, id LIMIT r.k) s) n;
RESET enable_indexscan;
RESET enable_bitmapscan;

-- Per query: the same distances in the same order, and the same rows
-- except where several rows tie with the k-th distance (which of them
-- fills the last places is not defined by ORDER BY ... LIMIT).
WITH w AS (SELECT rid, array_agg(d ORDER BY ord) AS ds, max(d) AS dk FROM gk_knn_index GROUP BY rid),
     o AS (SELECT rid, array_agg(d ORDER BY ord) AS ds FROM gk_knn_seq GROUP BY rid)
SELECT count(*) AS queries,
       count(*) FILTER (WHERE w.ds IS DISTINCT FROM o.ds) AS distances_differ,
       count(*) FILTER (WHERE (SELECT array_agg(id ORDER BY id) FROM gk_knn_index x WHERE x.rid = w.rid AND x.d < w.dk)
                   IS DISTINCT FROM (SELECT array_agg(id ORDER BY id) FROM gk_knn_seq y WHERE y.rid = w.rid AND y.d < w.dk))
           AS rows_differ,
       count(*) FILTER (WHERE (SELECT count(*) FROM gk_tracks t, gk_routes r WHERE r.rid = w.rid AND t.geom <~~> r.route = w.dk) > 1)
           AS ties_at_kth,
       count(*) FILTER (WHERE w.ds[1] = 0) AS nearest_at_zero
FROM w JOIN o USING (rid);

-- The whole table in index order (no LIMIT) matches a full sort.
SET enable_seqscan = off;
CREATE TABLE gk_full AS
SELECT row_number() OVER () AS ord, d
FROM (SELECT geom <~~> 'SRID=3857;LINESTRING(10000300 300,10000500 320,10000600 250)'::geometry AS d
      FROM gk_tracks ORDER BY geom <~~> 'SRID=3857;LINESTRING(10000300 300,10000500 320,10000600 250)'::geometry) s;
RESET enable_seqscan;
SELECT count(*) AS ranked, count(*) FILTER (WHERE f.d IS DISTINCT FROM s.d) AS differ
FROM gk_full f
JOIN (SELECT row_number() OVER (ORDER BY d) AS ord, d
      FROM (SELECT geom <~~> 'SRID=3857;LINESTRING(10000300 300,10000500 320,10000600 250)'::geometry AS d FROM gk_tracks) x) s USING (ord);

-- Range queries through frechet_at_most's support function: stored tracks
-- as routes (duplicates and distance-0 copies match at eps = 0), lines, a
-- one-point route; fixed tolerances and tolerances equal to an exact
-- distance, where a row sits on the boundary.
CREATE TABLE gk_queries AS
SELECT rid, route, eps, NULL::int AS boundary_id
FROM gk_routes, unnest(ARRAY[0, 1, 2.5, 6, 15, 60]::float8[]) eps WHERE k = 10
UNION ALL
SELECT rid, route, t.geom <~~> r.route, t.id
FROM gk_routes r
JOIN LATERAL (SELECT id, geom FROM gk_tracks t WHERE t.id % 1000 = r.rid ORDER BY id LIMIT 2) t ON true
WHERE r.k = 10;
SELECT count(*) AS queries, count(boundary_id) AS at_a_distance, count(*) FILTER (WHERE eps = 0) AS at_zero
FROM gk_queries;

SET enable_seqscan = off;
EXPLAIN (COSTS OFF)
SELECT id FROM gk_tracks WHERE frechet_at_most(geom, 'SRID=3857;LINESTRING(10000000 0,10000100 0)'::geometry, 5);
EXPLAIN (COSTS OFF)
SELECT id FROM gk_tracks WHERE frechet_at_most('SRID=3857;LINESTRING(10000000 0,10000100 0)'::geometry, geom, 5);
EXPLAIN (COSTS OFF)
SELECT q.rid, t.id FROM gk_queries q JOIN gk_tracks t ON frechet_at_most(t.geom, q.route, q.eps);
CREATE TABLE gk_range_index AS
SELECT q.rid, q.eps, q.boundary_id,
       array(SELECT t.id FROM gk_tracks t WHERE frechet_at_most(t.geom, q.route, q.eps) ORDER BY t.id) AS ids
FROM gk_queries q;
RESET enable_seqscan;
SET enable_indexscan = off;
SET enable_bitmapscan = off;
CREATE TABLE gk_range_seq AS
SELECT q.rid, q.eps, q.boundary_id,
       array(SELECT t.id FROM gk_tracks t WHERE frechet_at_most(t.geom, q.route, q.eps) ORDER BY t.id) AS ids
FROM gk_queries q;
RESET enable_indexscan;
RESET enable_bitmapscan;
SELECT count(*) AS queries,
       count(*) FILTER (WHERE w.ids IS DISTINCT FROM o.ids) AS differ,
       sum(cardinality(o.ids)) AS rows_found,
       count(*) FILTER (WHERE cardinality(o.ids) > 0 AND cardinality(o.ids) < 10400) AS selective,
       count(*) FILTER (WHERE o.eps = 0 AND cardinality(o.ids) > 1) AS zero_eps_with_company,
       count(*) FILTER (WHERE o.boundary_id = ANY (o.ids)) AS boundary_row_found
FROM gk_range_index w
JOIN gk_range_seq o ON o.rid = w.rid AND o.eps = w.eps AND o.boundary_id IS NOT DISTINCT FROM w.boundary_id;
-- The index condition alone never drops a row that frechet_at_most keeps.
SELECT count(*) AS missed
FROM gk_queries q JOIN gk_tracks t ON frechet_at_most(t.geom, q.route, q.eps)
WHERE NOT (t.geom |~~| frechet_reach(q.route, q.eps));

-- With PostGIS's own index on the same column too: k-nearest still uses
-- ours (PostGIS's has no <~~>), and so does frechet_at_most: its support
-- function offers PostGIS's index no condition while one of ours indexes
-- the same column (ours also tests first and last vertices and box
-- sides).  The answers stay those of a sequential scan; without our index
-- PostGIS's serves frechet_at_most through &&.
CREATE INDEX gk_tracks_postgis ON gk_tracks USING gist (geom);
ANALYZE gk_tracks;
SET enable_seqscan = off;
EXPLAIN (COSTS OFF)
SELECT id FROM gk_tracks ORDER BY geom <~~> 'SRID=3857;LINESTRING(10000000 0,10000100 0)'::geometry LIMIT 10;
EXPLAIN (COSTS OFF)
SELECT id FROM gk_tracks WHERE frechet_at_most(geom, 'SRID=3857;LINESTRING(10000000 0,10000100 0)'::geometry, 5);
SELECT count(*) AS queries,
       count(*) FILTER (WHERE o.ids IS DISTINCT FROM array(SELECT t.id FROM gk_tracks t WHERE frechet_at_most(t.geom, q.route, q.eps) ORDER BY t.id)) AS differ
FROM gk_queries q JOIN gk_range_seq o ON o.rid = q.rid AND o.eps = q.eps AND o.boundary_id IS NOT DISTINCT FROM q.boundary_id;
DROP INDEX gk_tracks_frechet;
EXPLAIN (COSTS OFF)
SELECT id FROM gk_tracks WHERE frechet_at_most(geom, 'SRID=3857;LINESTRING(10000000 0,10000100 0)'::geometry, 5);
RESET enable_seqscan;

-- 3-D tracks: the key uses x and y (the 3-D distance is at least the 2-D
-- one), widened by the rounding slack of z; z values up to 1e9.
CREATE TABLE gk_3d AS
SELECT id, ST_MakeLine(array(SELECT ST_MakePoint(ST_X(p), ST_Y(p), 1e9 + floor(random() * 5) * (id % 3))
                             FROM ST_DumpPoints(geom) d(path, p) ORDER BY path)) AS geom
FROM gk_tracks WHERE id % 5 = 0;
CREATE INDEX ON gk_3d USING gist (geom frechet_geometry_ops);
ANALYZE gk_3d;
SET enable_seqscan = off;
CREATE TABLE gk_3d_index AS
SELECT q.id AS qid, n.ord, n.d
FROM (SELECT id, geom FROM gk_3d WHERE id % 400 = 5) q,
     LATERAL (SELECT row_number() OVER () AS ord, d
              FROM (SELECT t.geom <~~> q.geom AS d FROM gk_3d t ORDER BY t.geom <~~> q.geom LIMIT 10) s) n;
RESET enable_seqscan;
SET enable_indexscan = off;
SET enable_bitmapscan = off;
CREATE TABLE gk_3d_seq AS
SELECT q.id AS qid, n.ord, n.d
FROM (SELECT id, geom FROM gk_3d WHERE id % 400 = 5) q,
     LATERAL (SELECT row_number() OVER () AS ord, d
              FROM (SELECT t.geom <~~> q.geom AS d FROM gk_3d t ORDER BY t.geom <~~> q.geom LIMIT 10) s) n;
RESET enable_indexscan;
RESET enable_bitmapscan;
SELECT count(*) AS rows, count(DISTINCT qid) AS queries,
       count(*) FILTER (WHERE a.d IS DISTINCT FROM b.d) AS differ
FROM gk_3d_index a JOIN gk_3d_seq b USING (qid, ord);

-- Values the functions reject (Polygon, empty, MultiLineString) still
-- index; a query that reaches them fails with the same error with or
-- without the index.
CREATE TABLE gk_bad (id int, geom geometry);
INSERT INTO gk_bad VALUES (1, 'LINESTRING(0 0,10 0)'), (2, 'POLYGON((0 0,1 0,1 1,0 0))'),
    (3, 'LINESTRING EMPTY'), (4, 'MULTILINESTRING((0 0,1 1),(2 2,3 3))'), (5, NULL), (6, 'POINT(50 50)');
CREATE INDEX ON gk_bad USING gist (geom frechet_geometry_ops);
SELECT id, frechet_track_key(geom) IS NOT NULL AS has_key FROM gk_bad WHERE id IN (1, 6) ORDER BY id;
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
SELECT pg_temp.outcome($$SELECT string_agg(id::text, ',' ORDER BY id) FROM gk_bad WHERE frechet_at_most(geom, 'LINESTRING(0 0,10 0)', 1)$$) AS range_with_index;
SELECT pg_temp.outcome($$SELECT string_agg(id::text, ',') FROM (SELECT id FROM gk_bad ORDER BY geom <~~> 'LINESTRING(0 0,10 0)' LIMIT 3) s$$) AS knn_with_index;
SELECT pg_temp.outcome($$SELECT string_agg(id::text, ',' ORDER BY id) FROM gk_bad WHERE id IN (1, 5, 6) AND frechet_at_most(geom, 'LINESTRING(0 0,10 0)', 1)$$) AS good_rows_only;
RESET enable_seqscan;
SET enable_indexscan = off;
SET enable_bitmapscan = off;
SELECT pg_temp.outcome($$SELECT string_agg(id::text, ',' ORDER BY id) FROM gk_bad WHERE frechet_at_most(geom, 'LINESTRING(0 0,10 0)', 1)$$) AS range_without_index;
SELECT pg_temp.outcome($$SELECT string_agg(id::text, ',') FROM (SELECT id FROM gk_bad ORDER BY geom <~~> 'LINESTRING(0 0,10 0)' LIMIT 3) s$$) AS knn_without_index;
RESET enable_indexscan;
RESET enable_bitmapscan;
-- Bad query routes and tolerances.
SELECT frechet_reach('POLYGON((0 0,1 0,1 1,0 0))'::geometry, 1);
SELECT frechet_reach('LINESTRING(0 0,1 1)'::geometry, -1);
SELECT id FROM gk_bad ORDER BY geom <~~> 'LINESTRING EMPTY'::geometry LIMIT 1;

-- Geography: 10,000 trips of 20 routes (150 m steps) in places chosen to
-- strain the key (it keeps Earth-centred x and y): the Wrenmere latitude,
-- the equator (north-south moves barely change x and y there), within
-- 1 km of each pole, and across the antimeridian; plus duplicates and
-- one-point trips.  Tolerances in metres.
CREATE TABLE gg_routes AS
SELECT r AS id,
       ST_MakeLine(array(SELECT ST_Project(ST_SetSRID(ST_MakePoint(lon0, lat0), 4326)::geography, 150 * i, radians(az))::geometry
                         FROM generate_series(0, 2 + r % 9) i ORDER BY i))::geography AS geog
FROM (SELECT r,
             CASE r % 5 WHEN 0 THEN -1.5 + random() * 0.05 WHEN 1 THEN random() * 40 - 20
                        WHEN 4 THEN 179.999 ELSE random() * 360 - 180 END AS lon0,
             CASE r % 5 WHEN 0 THEN 53.40 + random() * 0.05 WHEN 1 THEN random() * 0.02 - 0.01
                        WHEN 2 THEN 89.992 WHEN 3 THEN -89.992 ELSE -16.8 END AS lat0,
             CASE WHEN r % 5 = 1 THEN 180 * floor(random() * 2) ELSE random() * 360 END AS az
      FROM generate_series(1, 20) r) s;
CREATE TABLE gg_trips AS
SELECT t AS id, route,
       CASE WHEN t % 25 = 0 THEN ST_PointN(g::geometry, 1)::geography ELSE g END AS geog
FROM (SELECT t, 1 + t % 20 AS route,
             ST_MakeLine(array(SELECT ST_Project(p::geography, random() * noise, random() * 2 * pi())::geometry
                               FROM ST_DumpPoints((SELECT geog::geometry FROM gg_routes WHERE id = 1 + t % 20)) d(path, p)
                               ORDER BY path))::geography AS g
      FROM (SELECT t, random() * 60 AS noise FROM generate_series(1, 9800) t) s) u;
INSERT INTO gg_trips SELECT 9800 + i, route, geog FROM generate_series(1, 200) i JOIN gg_trips ON id = 1 + (i * 37) % 9800;
CREATE INDEX gg_trips_frechet ON gg_trips USING gist (geog frechet_geography_ops);
ANALYZE gg_trips;
SELECT count(*) AS trips, count(*) FILTER (WHERE GeometryType(geog::geometry) = 'POINT') AS one_point FROM gg_trips;

CREATE TABLE gg_queries AS
SELECT row_number() OVER (ORDER BY src, n)::int AS qid, geog, k
FROM (SELECT 1 AS src, id AS n, geog, 10 AS k FROM gg_routes
      UNION ALL SELECT 2, id, geog, 10 FROM gg_trips WHERE id % 997 = 3 OR id IN (9801, 25)
      UNION ALL SELECT 3, 0, 'SRID=4326;POINT(-1.49 53.41)'::geography, 5) s;
SET enable_seqscan = off;
EXPLAIN (COSTS OFF)
SELECT id FROM gg_trips ORDER BY geog <~~> 'SRID=4326;LINESTRING(-1.5 53.4,-1.49 53.41)'::geography LIMIT 10;
EXPLAIN (COSTS OFF)
SELECT id FROM gg_trips WHERE frechet_at_most(geog, 'SRID=4326;LINESTRING(-1.5 53.4,-1.49 53.41)'::geography, 50);
CREATE TABLE gg_knn_index AS
SELECT q.qid, n.ord, n.id, n.d
FROM gg_queries q,
     LATERAL (SELECT row_number() OVER () AS ord, id, d
              FROM (SELECT id, geog <~~> q.geog AS d FROM gg_trips ORDER BY geog <~~> q.geog LIMIT q.k) s) n;
CREATE TABLE gg_range_index AS
SELECT q.qid, e.eps,
       array(SELECT t.id FROM gg_trips t WHERE frechet_at_most(t.geog, q.geog, e.eps) ORDER BY t.id) AS ids
FROM gg_queries q, (VALUES (0.0), (20.0), (60.0), (200.0)) e(eps);
RESET enable_seqscan;
SET enable_indexscan = off;
SET enable_bitmapscan = off;
CREATE TABLE gg_knn_seq AS
SELECT q.qid, n.ord, n.id, n.d
FROM gg_queries q,
     LATERAL (SELECT row_number() OVER () AS ord, id, d
              FROM (SELECT id, geog <~~> q.geog AS d FROM gg_trips ORDER BY geog <~~> q.geog, id LIMIT q.k) s) n;
CREATE TABLE gg_range_seq AS
SELECT q.qid, e.eps,
       array(SELECT t.id FROM gg_trips t WHERE frechet_at_most(t.geog, q.geog, e.eps) ORDER BY t.id) AS ids
FROM gg_queries q, (VALUES (0.0), (20.0), (60.0), (200.0)) e(eps);
RESET enable_indexscan;
RESET enable_bitmapscan;
WITH w AS (SELECT qid, array_agg(d ORDER BY ord) AS ds, max(d) AS dk FROM gg_knn_index GROUP BY qid),
     o AS (SELECT qid, array_agg(d ORDER BY ord) AS ds FROM gg_knn_seq GROUP BY qid)
SELECT count(*) AS queries,
       count(*) FILTER (WHERE w.ds IS DISTINCT FROM o.ds) AS distances_differ,
       count(*) FILTER (WHERE (SELECT array_agg(id ORDER BY id) FROM gg_knn_index x WHERE x.qid = w.qid AND x.d < w.dk)
                   IS DISTINCT FROM (SELECT array_agg(id ORDER BY id) FROM gg_knn_seq y WHERE y.qid = w.qid AND y.d < w.dk))
           AS rows_differ,
       count(*) FILTER (WHERE w.ds[1] = 0) AS nearest_at_zero
FROM w JOIN o USING (qid);
SELECT count(*) AS queries,
       count(*) FILTER (WHERE w.ids IS DISTINCT FROM o.ids) AS differ,
       sum(cardinality(o.ids)) AS rows_found,
       count(*) FILTER (WHERE o.eps = 0 AND cardinality(o.ids) > 1) AS zero_eps_with_company
FROM gg_range_index w JOIN gg_range_seq o USING (qid, eps);
SELECT CASE q.qid % 5 WHEN 0 THEN 'wrenmere' WHEN 1 THEN 'equator' WHEN 4 THEN 'antimeridian' ELSE 'polar' END AS place,
       count(*) AS queries, sum(cardinality(o.ids)) AS rows_found
FROM gg_range_seq o JOIN gg_queries q USING (qid) WHERE q.qid <= 20 AND o.eps = 60 GROUP BY 1 ORDER BY 1;

-- The index conditions and the k-nearest scan work without search_path.
SET search_path = pg_catalog;
EXPLAIN (COSTS OFF)
SELECT id FROM public.gg_trips WHERE public.frechet_at_most(geog, 'SRID=4326;POINT(0 0)'::public.geography, 50);
SELECT count(*) FROM (SELECT id FROM public.gg_trips
                      ORDER BY geog OPERATOR(public.<~~>) 'SRID=4326;POINT(-1.49 53.41)'::public.geography LIMIT 3) s;
RESET search_path;

DROP TABLE gk_lines, gk_arrays, gk_tracks, gk_routes, gk_knn_index, gk_knn_seq, gk_full, gk_queries,
    gk_range_index, gk_range_seq, gk_3d, gk_3d_index, gk_3d_seq, gk_bad,
    gg_routes, gg_trips, gg_queries, gg_knn_index, gg_knn_seq, gg_range_index, gg_range_seq;
DROP FUNCTION pg_temp.geom(point[]);
DROP EXTENSION frechet_ext_postgis;
DROP EXTENSION postgis;
