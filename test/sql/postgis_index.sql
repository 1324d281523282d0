-- Index use (frechet_ext_postgis): the planner support function turns
-- frechet_at_most(t.geom, r, eps) into the lossy condition
-- t.geom && ST_Expand(r, eps) (geography: _ST_Expand in metres, with our
-- margin) on an existing PostGIS GiST index.  Results must be identical
-- with and without the index.
CREATE EXTENSION IF NOT EXISTS postgis;
CREATE EXTENSION frechet_ext_postgis;
SELECT setseed(0.25);

-- Planar: 5 routes, 12,000 trips (noisy copies of a route, some reversed,
-- some shifted) in a 10 km square.
CREATE TABLE routes AS
SELECT r AS id, ST_MakeLine(array(SELECT ST_MakePoint(x0 + 400 * i, y0 + 300 * sin(i + r))
                                  FROM generate_series(0, 15) i)) AS geom
FROM (SELECT r, random() * 3000 AS x0, random() * 9000 AS y0 FROM generate_series(1, 5) r) s;
CREATE TABLE trips AS
SELECT t AS id, CASE WHEN t % 7 = 0 THEN ST_Reverse(g) ELSE g END AS geom
FROM (SELECT t, ST_MakeLine(array(SELECT ST_MakePoint(ST_X(p) + dx + (random() - 0.5) * noise, ST_Y(p) + dy + (random() - 0.5) * noise)
                                   FROM ST_DumpPoints((SELECT geom FROM routes WHERE id = 1 + t % 5)) d(path, p)
                                   WHERE t > 0)) AS g
      FROM (SELECT t, random() * 120 AS noise,
                   CASE WHEN t % 3 = 0 THEN (random() - 0.5) * 2000 ELSE 0 END AS dx,
                   CASE WHEN t % 3 = 0 THEN (random() - 0.5) * 2000 ELSE 0 END AS dy
            FROM generate_series(1, 12000) t) s) u;
CREATE INDEX trips_geom_idx ON trips USING gist (geom);
ANALYZE trips;
ANALYZE routes;

EXPLAIN (COSTS OFF)
SELECT id FROM trips WHERE frechet_at_most(geom, 'LINESTRING(0 0,100 100)'::geometry, 50);
-- the indexed curve may be either argument
EXPLAIN (COSTS OFF)
SELECT id FROM trips WHERE frechet_at_most('LINESTRING(0 0,100 100)'::geometry, geom, 50);
-- a join: one index scan per route
SET enable_hashjoin = off;
SET enable_mergejoin = off;
EXPLAIN (COSTS OFF)
SELECT r.id, t.id FROM routes r JOIN trips t ON frechet_at_most(t.geom, r.geom, 60);

-- Identical with and without the index, over 3 tolerances x 5 routes.
CREATE TEMP TABLE with_index AS
SELECT r.id AS route, eps, t.id AS trip FROM routes r, (VALUES (20.0), (60.0), (150.0)) e(eps), trips t
WHERE frechet_at_most(t.geom, r.geom, eps);
SET enable_seqscan = on;
SET enable_indexscan = off;
SET enable_bitmapscan = off;
EXPLAIN (COSTS OFF)
SELECT r.id, t.id FROM routes r JOIN trips t ON frechet_at_most(t.geom, r.geom, 60);
CREATE TEMP TABLE without_index AS
SELECT r.id AS route, eps, t.id AS trip FROM routes r, (VALUES (20.0), (60.0), (150.0)) e(eps), trips t
WHERE frechet_at_most(t.geom, r.geom, eps);
RESET enable_indexscan;
RESET enable_bitmapscan;
SELECT (SELECT count(*) FROM trips) AS rows,
       (SELECT count(*) FROM with_index) AS matches,
       (SELECT count(*) FROM (SELECT * FROM with_index EXCEPT SELECT * FROM without_index) d) AS only_with,
       (SELECT count(*) FROM (SELECT * FROM without_index EXCEPT SELECT * FROM with_index) d) AS only_without;
SELECT eps, count(*) FROM with_index GROUP BY eps ORDER BY eps;

-- A bad epsilon fails through the index as it does without it.
SELECT id FROM trips WHERE frechet_at_most(geom, 'LINESTRING(0 0,100 100)'::geometry, -1);

-- Geography: 10,000 trips in 20 places over the globe, some within a few
-- km of a pole and some across the antimeridian; tolerances in metres.
CREATE TABLE groutes AS
SELECT r AS id,
       ST_MakeLine(array(SELECT ST_Project(ST_SetSRID(ST_MakePoint(lon0, lat0), 4326)::geography, 150 * i, radians(az))::geometry
                         FROM generate_series(0, 12) i))::geography AS geog
FROM (SELECT r,
             CASE WHEN r % 8 = 1 THEN 179.999 WHEN r % 8 = 2 THEN -179.999 ELSE random() * 360 - 180 END AS lon0,
             CASE WHEN r % 8 = 3 THEN 89.99 WHEN r % 8 = 4 THEN -89.985 ELSE random() * 170 - 85 END AS lat0,
             random() * 360 AS az
      FROM generate_series(1, 20) r) s;
CREATE TABLE gtrips AS
SELECT t AS id,
       ST_MakeLine(array(SELECT ST_Project(p::geography, random() * noise, random() * 2 * pi())::geometry
                         FROM ST_DumpPoints((SELECT geog::geometry FROM groutes WHERE id = 1 + t % 20)) d(path, p)
                         WHERE t > 0))::geography AS geog
FROM (SELECT t, random() * 200 AS noise FROM generate_series(1, 10000) t) s;
CREATE INDEX gtrips_geog_idx ON gtrips USING gist (geog);
ANALYZE gtrips;
ANALYZE groutes;

SET enable_seqscan = off;
EXPLAIN (COSTS OFF)
SELECT r.id, t.id FROM groutes r JOIN gtrips t ON frechet_at_most(r.geog, t.geog, 80);
CREATE TEMP TABLE gwith_index AS
SELECT r.id AS route, eps, t.id AS trip FROM groutes r, (VALUES (40.0), (150.0)) e(eps), gtrips t
WHERE frechet_at_most(r.geog, t.geog, eps);
SET enable_seqscan = on;
SET enable_indexscan = off;
SET enable_bitmapscan = off;
CREATE TEMP TABLE gwithout_index AS
SELECT r.id AS route, eps, t.id AS trip FROM groutes r, (VALUES (40.0), (150.0)) e(eps), gtrips t
WHERE frechet_at_most(r.geog, t.geog, eps);
RESET enable_indexscan;
RESET enable_bitmapscan;
RESET enable_hashjoin;
RESET enable_mergejoin;
SELECT (SELECT count(*) FROM gtrips) AS rows,
       (SELECT count(*) FROM gwith_index) AS matches,
       (SELECT count(*) FROM (SELECT * FROM gwith_index EXCEPT SELECT * FROM gwithout_index) d) AS only_with,
       (SELECT count(*) FROM (SELECT * FROM gwithout_index EXCEPT SELECT * FROM gwith_index) d) AS only_without;
SELECT CASE WHEN route % 8 IN (1, 2) THEN 'antimeridian' WHEN route % 8 IN (3, 4) THEN 'polar' ELSE 'elsewhere' END AS place,
       eps, count(DISTINCT route) AS routes, count(*) AS matches
FROM gwith_index GROUP BY 1, 2 ORDER BY 1, 2;

-- The index condition is built without search_path.
SET search_path = pg_catalog;
EXPLAIN (COSTS OFF)
SELECT id FROM public.gtrips WHERE public.frechet_at_most(geog, 'SRID=4326;POINT(0 0)'::public.geography, 50);
RESET search_path;

DROP TABLE routes, trips, groutes, gtrips;
DROP EXTENSION frechet_ext_postgis;
DROP EXTENSION postgis;
