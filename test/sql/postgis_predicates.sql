-- PostGIS's own predicates on a column that carries one of our operator
-- classes (frechet_geometry_ops, frechet_geography_ops).  PostGIS's planner
-- support function asks every GiST index on the column for its box
-- operators (&&, ~, @, ~= by their strategy numbers); our classes answer
-- them from the bounding box in the key.  Each predicate below must give
-- the answer of a plain sequential scan (computed first, before any index
-- exists): (a) with our index alone, (b) beside PostGIS's default index,
-- (c) with index scans disabled, (d) in a join where only the other table
-- has our index.  Data are fixed formulas, no random().
CREATE EXTENSION IF NOT EXISTS postgis;
CREATE EXTENSION frechet_ext_postgis;

-- The rows a query returns (one column, id), as a count and an md5 of the sorted ids.
CREATE FUNCTION pg_temp.answer(q text) RETURNS text
LANGUAGE plpgsql AS $$
DECLARE
	r text;
BEGIN
	EXECUTE 'SELECT count(*) || '' '' || md5(coalesce(string_agg(id::text, '','' ORDER BY id), '''')) FROM ('
		|| q || ') s' INTO r;
	RETURN r;
END $$;

-- Planar: 3,000 polylines of 6 vertices in a 10 km square (rows k, k + 1000
-- and k + 2000 are the same curve, the last one reversed), a few buffers
-- (polygons: not curves, so their keys cover everything), single points,
-- an empty line and a NULL.
CREATE TABLE pp AS
SELECT i AS id,
       CASE WHEN k % 250 = 0 THEN ST_Buffer(ST_MakePoint(x0, y0), 100, 2)
            WHEN k % 333 = 1 THEN ST_MakePoint(x0, y0)
            WHEN i > 2000 THEN ST_Reverse(line)
            ELSE line END AS geom
FROM (SELECT i, k, x0, y0,
             ST_MakeLine(array(SELECT ST_MakePoint(x0 + j * 80 * cos(k) + 15 * sin(3 * j + k),
                                                   y0 + j * 80 * sin(k) + 15 * cos(2 * j + k))
                               FROM generate_series(0, 5) j)) AS line
      FROM (SELECT i, i % 1000 AS k, (i % 1000 * 37 % 100) * 100.0 AS x0,
                   (i % 1000 * 61 % 100) * 100.0 AS y0
            FROM generate_series(1, 3000) i) s) u
UNION ALL SELECT 3001, 'LINESTRING EMPTY'::geometry
UNION ALL SELECT 3002, NULL;

-- The other side of the joins: 24 shapes (end points of rows, boxes, lines,
-- copies of rows).
CREATE TABLE pq AS
SELECT q AS id,
       CASE q % 4
            WHEN 0 THEN (SELECT ST_EndPoint(geom) FROM pp WHERE id = q * 53)
            WHEN 1 THEN ST_MakeEnvelope(q * 380, q * 390, q * 380 + 900, q * 390 + 700)
            WHEN 2 THEN ST_MakeLine(ST_MakePoint(q * 410, 0), ST_MakePoint(10000 - q * 300, 10000))
            ELSE (SELECT geom FROM pp WHERE id = q * 37)
       END AS geom
FROM generate_series(1, 24) q;

CREATE TABLE pp_predicates (name text, q text);
INSERT INTO pp_predicates VALUES
('st_dwithin',      $$SELECT id FROM pp WHERE ST_DWithin(geom, 'POINT(5000 5000)'::geometry, 500)$$),
('st_intersects',   $$SELECT id FROM pp WHERE ST_Intersects(geom, 'POLYGON((2000 2000,4000 2000,4000 3500,2000 3500,2000 2000))'::geometry)$$),
('st_contains',     $$SELECT id FROM pp WHERE ST_Contains(geom, (SELECT ST_PointN(geom, 3) FROM pp WHERE id = 17))$$),
('st_within',       $$SELECT id FROM pp WHERE ST_Within(geom, 'POLYGON((0 0,3000 0,3000 3000,0 3000,0 0))'::geometry)$$),
('st_covers',       $$SELECT id FROM pp WHERE ST_Covers(geom, (SELECT ST_StartPoint(geom) FROM pp WHERE id = 23))$$),
('st_coveredby',    $$SELECT id FROM pp WHERE ST_CoveredBy((SELECT ST_PointN(geom, 2) FROM pp WHERE id = 29), geom)$$),
('st_touches',      $$SELECT id FROM pp WHERE ST_Touches(geom, (SELECT ST_MakeLine(ST_StartPoint(geom), ST_Translate(ST_StartPoint(geom), -500, -450)) FROM pp WHERE id = 5))$$),
('st_crosses',      $$SELECT id FROM pp WHERE ST_Crosses('LINESTRING(0 5000,10000 5100)'::geometry, geom)$$),
('st_overlaps',     $$SELECT id FROM pp WHERE ST_Overlaps(geom, (SELECT ST_MakeLine(ST_LineSubstring(geom, 0.5, 1), ST_Translate(ST_EndPoint(geom), 300, 700)) FROM pp WHERE id = 8))$$),
('st_equals',       $$SELECT id FROM pp WHERE ST_Equals(geom, (SELECT geom FROM pp WHERE id = 42))$$),
('st_dfullywithin', $$SELECT id FROM pp WHERE ST_DFullyWithin(geom, 'POINT(5000 5000)'::geometry, 800)$$),
-- more predicates PostGIS indexes the same way
('st_containsproperly', $$SELECT id FROM pp WHERE ST_ContainsProperly(geom, (SELECT ST_PointN(geom, 4) FROM pp WHERE id = 19))$$),
('st_orderingequals',   $$SELECT id FROM pp WHERE ST_OrderingEquals(geom, (SELECT geom FROM pp WHERE id = 42))$$),
('join st_dwithin',      $$SELECT t.id * 100 + q.id AS id FROM pp t JOIN pq q ON ST_DWithin(t.geom, q.geom, 150)$$),
('join st_intersects',   $$SELECT t.id * 100 + q.id AS id FROM pp t JOIN pq q ON ST_Intersects(q.geom, t.geom)$$),
('join st_contains',     $$SELECT t.id * 100 + q.id AS id FROM pp t JOIN pq q ON ST_Contains(q.geom, t.geom)$$),
('join st_within',       $$SELECT t.id * 100 + q.id AS id FROM pp t JOIN pq q ON ST_Within(t.geom, q.geom)$$),
('join st_covers',       $$SELECT t.id * 100 + q.id AS id FROM pp t JOIN pq q ON ST_Covers(t.geom, q.geom)$$),
('join st_coveredby',    $$SELECT t.id * 100 + q.id AS id FROM pp t JOIN pq q ON ST_CoveredBy(t.geom, q.geom)$$),
('join st_touches',      $$SELECT t.id * 100 + q.id AS id FROM pp t JOIN pq q ON ST_Touches(q.geom, t.geom)$$),
('join st_crosses',      $$SELECT t.id * 100 + q.id AS id FROM pp t JOIN pq q ON ST_Crosses(t.geom, q.geom)$$),
('join st_overlaps',     $$SELECT t.id * 100 + q.id AS id FROM pp t JOIN pq q ON ST_Overlaps(t.geom, q.geom)$$),
('join st_equals',       $$SELECT t.id * 100 + q.id AS id FROM pp t JOIN pq q ON ST_Equals(q.geom, t.geom)$$),
('join st_dfullywithin', $$SELECT t.id * 100 + q.id AS id FROM pp t JOIN pq q ON ST_DFullyWithin(t.geom, q.geom, 400)$$);

-- Geography: 3,000 short tracks (5 km steps) over the globe, and rows whose
-- great-circle edges leave the box of their vertices: along the equator,
-- along a meridian, over the north pole, across the antimeridian; a polygon,
-- an empty line and a NULL.
CREATE TABLE gg AS
SELECT i AS id,
       ST_MakeLine(array(SELECT ST_MakePoint(lon0 + j * 0.05 * cos(i), lat0 + j * 0.05 * sin(i))
                         FROM generate_series(0, 4) j))::geography AS geog
FROM (SELECT i, (i * 37 % 360) - 180 + 0.5 AS lon0, (i * 53 % 160) - 80 + 0.25 AS lat0
      FROM generate_series(1, 3000) i) s
UNION ALL SELECT 3001, 'LINESTRING(-10 0,10 0)'::geography
UNION ALL SELECT 3002, 'LINESTRING(0 -60,0 60)'::geography
UNION ALL SELECT 3003, 'LINESTRING(0 80,180 80)'::geography
UNION ALL SELECT 3004, 'LINESTRING(179.5 10,-179.5 10)'::geography
UNION ALL SELECT 3005, 'LINESTRING(-45 30,45 30)'::geography
UNION ALL SELECT 3006, 'POLYGON((20 20,21 20,21 21,20 21,20 20))'::geography
UNION ALL SELECT 3007, 'LINESTRING EMPTY'::geography
UNION ALL SELECT 3008, NULL;

CREATE TABLE gq AS
SELECT q AS id,
       CASE q % 3
            WHEN 0 THEN ST_MakePoint(q * 14 - 175, q * 6.5 - 80)::geography
            WHEN 1 THEN ST_MakeEnvelope(q * 14 - 175, q * 6.5 - 80, q * 14 - 165, q * 6.5 - 72, 4326)::geography
            ELSE (SELECT geog FROM gg WHERE id = q * 41)
       END AS geog
FROM generate_series(1, 24) q
UNION ALL SELECT 25, 'POINT(0 0)'::geography
UNION ALL SELECT 26, 'POINT(0 90)'::geography
UNION ALL SELECT 27, 'POINT(180 10.01)'::geography
UNION ALL SELECT 28, 'POINT(20.5 20.5)'::geography;

CREATE TABLE gg_predicates (name text, q text);
INSERT INTO gg_predicates VALUES
('st_dwithin',             $$SELECT id FROM gg WHERE ST_DWithin(geog, 'POINT(0 0)'::geography, 50000)$$),
('st_dwithin antimeridian', $$SELECT id FROM gg WHERE ST_DWithin('POINT(180 10.01)'::geography, geog, 2000)$$),
('st_dwithin sphere',      $$SELECT id FROM gg WHERE ST_DWithin(geog, 'POINT(10 45)'::geography, 300000, false)$$),
('st_intersects',          $$SELECT id FROM gg WHERE ST_Intersects(geog, 'POLYGON((-1 -1,1 -1,1 1,-1 1,-1 -1))'::geography)$$),
('st_intersects pole',     $$SELECT id FROM gg WHERE ST_Intersects(geog, 'POINT(0 90)'::geography)$$),
('st_intersects north',    $$SELECT id FROM gg WHERE ST_Intersects('POLYGON((-5 35,5 35,5 40,-5 40,-5 35))'::geography, geog)$$),
('st_covers',              $$SELECT id FROM gg WHERE ST_Covers(geog, 'POINT(20.5 20.5)'::geography)$$),
('st_coveredby',           $$SELECT id FROM gg WHERE ST_CoveredBy(geog, 'POLYGON((-30 -30,30 -30,30 30,-30 30,-30 -30))'::geography)$$),
('join st_dwithin',        $$SELECT g.id * 100 + q.id AS id FROM gg g JOIN gq q ON ST_DWithin(g.geog, q.geog, 20000)$$),
('join st_intersects',     $$SELECT g.id * 100 + q.id AS id FROM gg g JOIN gq q ON ST_Intersects(q.geog, g.geog)$$),
('join st_covers',         $$SELECT g.id * 100 + q.id AS id FROM gg g JOIN gq q ON ST_Covers(g.geog, q.geog)$$),
('join st_coveredby',      $$SELECT g.id * 100 + q.id AS id FROM gg g JOIN gq q ON ST_CoveredBy(g.geog, q.geog)$$);

ANALYZE pp;
ANALYZE pq;
ANALYZE gg;
ANALYZE gq;

-- The reference: no index anywhere, so every answer comes from sequential scans.
CREATE TABLE pp_reference AS SELECT name, pg_temp.answer(q) AS answer FROM pp_predicates;
CREATE TABLE gg_reference AS SELECT name, pg_temp.answer(q) AS answer FROM gg_predicates;
-- how many rows each predicate finds (none of them is trivially empty)
SELECT name, split_part(answer, ' ', 1)::int AS rows FROM pp_reference ORDER BY name;
SELECT name, split_part(answer, ' ', 1)::int AS rows FROM gg_reference ORDER BY name;

-- (a) Our index alone, index scans preferred (the joins: on the big table).
CREATE INDEX pp_frechet ON pp USING gist (geom frechet_geometry_ops);
CREATE INDEX gg_frechet ON gg USING gist (geog frechet_geography_ops);
SET enable_seqscan = off;
EXPLAIN (COSTS OFF)
SELECT id FROM pp WHERE ST_DWithin(geom, 'POINT(5000 5000)'::geometry, 500);
EXPLAIN (COSTS OFF)
SELECT id FROM pp WHERE ST_Contains(geom, 'POINT(5000 5000)'::geometry);
EXPLAIN (COSTS OFF)
SELECT id FROM pp WHERE ST_Within(geom, 'POLYGON((0 0,3000 0,3000 3000,0 3000,0 0))'::geometry);
EXPLAIN (COSTS OFF)
SELECT id FROM pp WHERE ST_Equals(geom, 'LINESTRING(0 0,1 1)'::geometry);
EXPLAIN (COSTS OFF)
SELECT id FROM gg WHERE ST_DWithin(geog, 'POINT(0 0)'::geography, 50000);
SELECT p.name, pg_temp.answer(p.q) = r.answer AS same_as_seqscan
FROM pp_predicates p JOIN pp_reference r USING (name) ORDER BY p.name;
SELECT p.name, pg_temp.answer(p.q) = r.answer AS same_as_seqscan
FROM gg_predicates p JOIN gg_reference r USING (name) ORDER BY p.name;

-- (b) Beside PostGIS's default index.
CREATE INDEX pp_postgis ON pp USING gist (geom);
CREATE INDEX gg_postgis ON gg USING gist (geog);
SELECT p.name, pg_temp.answer(p.q) = r.answer AS same_as_seqscan
FROM pp_predicates p JOIN pp_reference r USING (name) ORDER BY p.name;
SELECT p.name, pg_temp.answer(p.q) = r.answer AS same_as_seqscan
FROM gg_predicates p JOIN gg_reference r USING (name) ORDER BY p.name;

-- (c) Both indexes present, index scans disabled: planning must still succeed.
RESET enable_seqscan;
SET enable_indexscan = off;
SET enable_bitmapscan = off;
EXPLAIN (COSTS OFF)
SELECT id FROM pp WHERE ST_DWithin(geom, 'POINT(5000 5000)'::geometry, 500);
SELECT p.name, pg_temp.answer(p.q) = r.answer AS same_as_seqscan
FROM pp_predicates p JOIN pp_reference r USING (name) ORDER BY p.name;
SELECT p.name, pg_temp.answer(p.q) = r.answer AS same_as_seqscan
FROM gg_predicates p JOIN gg_reference r USING (name) ORDER BY p.name;
RESET enable_indexscan;
RESET enable_bitmapscan;

-- (d) Joins where only the other table has our index.
DROP INDEX pp_frechet, pp_postgis, gg_frechet, gg_postgis;
CREATE INDEX pq_frechet ON pq USING gist (geom frechet_geometry_ops);
CREATE INDEX gq_frechet ON gq USING gist (geog frechet_geography_ops);
SET enable_hashjoin = off;
SET enable_mergejoin = off;
SET enable_seqscan = off;
EXPLAIN (COSTS OFF)
SELECT t.id, q.id FROM pp t JOIN pq q ON ST_Contains(t.geom, q.geom);
EXPLAIN (COSTS OFF)
SELECT g.id, q.id FROM gg g JOIN gq q ON ST_Intersects(q.geog, g.geog);
SELECT p.name, pg_temp.answer(p.q) = r.answer AS same_as_seqscan
FROM pp_predicates p JOIN pp_reference r USING (name) WHERE p.name LIKE 'join%' ORDER BY p.name;
SELECT p.name, pg_temp.answer(p.q) = r.answer AS same_as_seqscan
FROM gg_predicates p JOIN gg_reference r USING (name) WHERE p.name LIKE 'join%' ORDER BY p.name;
RESET enable_hashjoin;
RESET enable_mergejoin;
RESET enable_seqscan;

-- Geography: points along 400 long great-circle arcs (tens of degrees, any
-- direction, some over a pole), where an arc leaves the box of its two
-- vertices by up to hundreds of km.  Each point must find its own arc
-- through our index on the arcs.
CREATE TABLE ga AS
SELECT i AS id, ST_MakeLine(ST_MakePoint(lon0, lat0), ST_MakePoint(lon1, lat1))::geography AS geog
FROM (SELECT i, (i * 47 % 360) - 179.5 AS lon0, (i * 31 % 170) - 84.5 AS lat0,
             ((i * 47 % 360) + 20 + i * 13 % 150) % 360 - 179.5 AS lon1,
             (i * 71 % 170) - 84.5 AS lat1
      FROM generate_series(1, 400) i) s;
CREATE TABLE gap AS
SELECT row_number() OVER (ORDER BY a.id, d.path[1]) AS id, a.id AS arc, d.geom::geography AS geog
FROM ga a, ST_DumpPoints(ST_Segmentize(a.geog, 300000)::geometry) d;
ANALYZE ga;
ANALYZE gap;
CREATE TABLE ga_reference AS
SELECT (SELECT count(*) FROM gap) AS points,
       pg_temp.answer($$SELECT p.id FROM gap p JOIN ga a ON a.id = p.arc AND ST_Intersects(a.geog, p.geog)$$) AS answer;
CREATE INDEX ga_frechet ON ga USING gist (geog frechet_geography_ops);
SET enable_hashjoin = off;
SET enable_mergejoin = off;
SET enable_seqscan = off;
EXPLAIN (COSTS OFF)
SELECT p.id FROM gap p JOIN ga a ON a.id = p.arc AND ST_Intersects(a.geog, p.geog);
SELECT points, split_part(answer, ' ', 1)::int = points AS all_on_their_arc,
       pg_temp.answer($$SELECT p.id FROM gap p JOIN ga a ON a.id = p.arc AND ST_Intersects(a.geog, p.geog)$$) = answer AS same_as_seqscan
FROM ga_reference;
RESET enable_hashjoin;
RESET enable_mergejoin;
RESET enable_seqscan;

-- The Fréchet strategies still work on the same index (curves only: the
-- Fréchet functions refuse polygons).
CREATE TABLE pl AS SELECT id, geom FROM pp WHERE ST_GeometryType(geom) = 'ST_LineString' AND NOT ST_IsEmpty(geom);
ANALYZE pl;
CREATE TABLE pl_reference AS
SELECT pg_temp.answer($$SELECT id FROM pl WHERE frechet_at_most(geom, (SELECT geom FROM pl WHERE id = 42), 30)$$) AS range,
       (SELECT array_agg(id) FROM (SELECT id FROM pl ORDER BY geom <~~> (SELECT geom FROM pl WHERE id = 42), id LIMIT 5) s) AS knn;
CREATE INDEX pl_frechet ON pl USING gist (geom frechet_geometry_ops);
SET enable_seqscan = off;
EXPLAIN (COSTS OFF)
SELECT id FROM pl WHERE frechet_at_most(geom, 'LINESTRING(0 0,100 100)'::geometry, 30);
EXPLAIN (COSTS OFF)
SELECT id FROM pl ORDER BY geom <~~> 'LINESTRING(0 0,100 100)'::geometry LIMIT 5;
SELECT pg_temp.answer($$SELECT id FROM pl WHERE frechet_at_most(geom, (SELECT geom FROM pl WHERE id = 42), 30)$$) = range AS range_same,
       split_part(range, ' ', 1)::int AS range_rows,
       (SELECT array_agg(id) FROM (SELECT id FROM pl ORDER BY geom <~~> (SELECT geom FROM pl WHERE id = 42), id LIMIT 5) s) = knn AS knn_same
FROM pl_reference;
RESET enable_seqscan;

DROP TABLE pp, pq, gg, gq, ga, gap, ga_reference, pl, pp_predicates, gg_predicates, pp_reference, gg_reference, pl_reference;
DROP EXTENSION frechet_ext_postgis;
DROP EXTENSION postgis;
