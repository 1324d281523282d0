-- Corridor search on geometry (units of the SRID) and geography (metres):
-- frechet_passes, frechet_passage (with the trip's SRID, Z and M kept in
-- its part, and its times), frechet_passage_distance (<~~>>), and the
-- index strategies 31 and 32 of frechet_geometry_ops and
-- frechet_geography_ops against sequential scans.  Outside source for the
-- metres: PostGIS's own ellipsoidal ST_Distance(geography, geography).
CREATE EXTENSION IF NOT EXISTS postgis;
CREATE EXTENSION frechet_ext_postgis;

-- Mill Street from the bridge (west) to the station (east), 600 m in a
-- local metric SRID, and three buses with M = seconds since 06:00: one
-- drives it, one takes the road-works diversion north of it, one drives
-- it twice on a loop.
CREATE TABLE gc_trips (bus text, track geometry);
INSERT INTO gc_trips VALUES
	('drives it', 'SRID=3857;LINESTRING M (-300 5 0, 0 3 40, 200 -4 70, 400 6 100, 600 -2 130, 900 0 170)'),
	('diversion', 'SRID=3857;LINESTRING M (-300 5 0, 0 3 40, 100 200 90, 500 210 150, 600 2 200, 900 0 240)'),
	('loop', 'SRID=3857;LINESTRING M (-300 5 0, 0 3 40, 300 -3 80, 600 2 120, 700 300 180, -100 300 300, 0 -2 340, 300 4 380, 600 -3 420, 900 0 460)');
SELECT bus, frechet_passes(track, 'SRID=3857;LINESTRING(0 0, 300 0, 600 0)', 30) AS passes,
       round(frechet_passage_distance(track, 'SRID=3857;LINESTRING(0 0, 300 0, 600 0)')::numeric, 6) AS passage_distance
FROM gc_trips ORDER BY bus;
SELECT bus, round(p.trip_from::numeric, 6) AS trip_from, round(p.trip_to::numeric, 6) AS trip_to,
       round(p.distance::numeric, 6) AS distance, ST_AsText(p.trip_part) AS trip_part,
       ST_SRID(p.trip_part) AS srid, p.time_from, p.time_to
FROM gc_trips, frechet_passage(track, 'SRID=3857;LINESTRING(0 0, 300 0, 600 0)', 30) p
ORDER BY bus, p.trip_from;

-- The same numbers as the point[] functions on the same coordinates.
SELECT bool_and(frechet_passage_distance(track, s) =
                frechet_passage_distance(array(SELECT point(ST_X(g), ST_Y(g)) FROM ST_DumpPoints(track) d(path, g) ORDER BY path),
                                         ARRAY[point(0, 0), point(300, 0), point(600, 0)])) AS same_as_point_array
FROM gc_trips, (SELECT 'SRID=3857;LINESTRING(0 0, 300 0, 600 0)'::geometry AS s) q;

-- Geography: a 1.1 km stretch of a line at 51.5 N and a trip that drives
-- it among other roads.  Each end of the stretch must meet the trip within
-- the passage distance: at least PostGIS's ellipsoidal distance from each
-- end to the trip (within 0.1 %; ours is the chord metric).
CREATE TABLE gc_geo AS
SELECT 'LINESTRING(-0.02 51.49, 0 51.5, 0.008 51.5001, 0.016 51.4999, 0.03 51.51)'::geography AS trip,
       'LINESTRING(0 51.5002, 0.016 51.5002)'::geography AS stretch;
SELECT frechet_passes(trip, stretch, 40) AS passes_40,
       frechet_passes(trip, stretch, 20) AS passes_20,
       frechet_passage_distance(trip, stretch)
           >= greatest(ST_Distance('POINT(0 51.5002)'::geography, trip), ST_Distance('POINT(0.016 51.5002)'::geography, trip)) * (1 - 1e-3)
           AS at_least_postgis_end_distances,
       frechet_passage_distance(trip, stretch) <= frechet_partial_distance(stretch, trip) * (1 + 1e-12) AS is_partial_distance
FROM gc_geo;
SELECT round(trip_from::numeric, 4) AS trip_from, round(trip_to::numeric, 4) AS trip_to, round(distance::numeric, 1) AS metres,
       ST_NPoints(trip_part::geometry) AS points, time_from IS NULL AS no_times
FROM gc_geo, frechet_passage(trip, stretch, 40);

-- The index: 20,000 trips as geometry (Web Mercator metres) and as
-- geography (near 0 N 0 E), some joining late (every fifth: all of route
-- 1's), some backwards (every seventh); range
-- queries and nearest passages through frechet_geometry_ops and
-- frechet_geography_ops against sequential scans.
SELECT setseed(0.75);
CREATE TABLE gc_routes AS
SELECT r AS rid, array(SELECT point(400 * k + floor(random() * 41) - 20, 300 * (r % 10) + 150 * (k % 2) + floor(random() * 41) - 20)
                       FROM generate_series(0, 5) k ORDER BY k) AS route
FROM generate_series(1, 20) r;
CREATE TABLE gc_many AS
SELECT i AS id, ST_SetSRID(ST_MakeLine(array(
           SELECT ST_MakePoint(x + floor(random() * 25) - 12, y + floor(random() * 25) - 12)
           FROM (SELECT k, f, (route[k])[0] + f * ((route[k + 1])[0] - (route[k])[0]) AS x,
                        (route[k])[1] + f * ((route[k + 1])[1] - (route[k])[1]) AS y
                 FROM generate_series(CASE WHEN i % 5 = 0 THEN 3 ELSE 1 END, 5) k, unnest(ARRAY[0, 0.3, 0.6]) f) s
           ORDER BY CASE WHEN i % 7 = 0 THEN -(k + f) ELSE k + f END)), 3857) AS track
FROM generate_series(1, 20000) i JOIN gc_routes ON rid = 1 + i % 20;
ALTER TABLE gc_many ADD COLUMN geog geography;
UPDATE gc_many SET geog = ST_Transform(track, 4326)::geography;
CREATE TABLE gc_q AS
SELECT q, ST_SetSRID(ST_MakeLine(ST_MakePoint((route[a])[0], (route[a])[1]), ST_MakePoint((route[a + 1])[0], (route[a + 1])[1])), 3857) AS stretch, eps
FROM (VALUES (1, 2, 2, 20.0), (2, 4, 3, 30.0), (3, 9, 4, 15.0), (4, 13, 1, 40.0)) v(q, rid, a, eps) JOIN gc_routes USING (rid);
CREATE TABLE gc_seq AS
SELECT q, count(m.id) FILTER (WHERE frechet_passes(m.track, q.stretch, q.eps)) AS n_geom,
       md5(string_agg(m.id::text, ',' ORDER BY m.id) FILTER (WHERE frechet_passes(m.track, q.stretch, q.eps))) AS ids_geom,
       count(m.id) FILTER (WHERE frechet_passes(m.geog, ST_Transform(q.stretch, 4326)::geography, q.eps)) AS n_geog,
       md5(string_agg(m.id::text, ',' ORDER BY m.id) FILTER (WHERE frechet_passes(m.geog, ST_Transform(q.stretch, 4326)::geography, q.eps))) AS ids_geog
FROM gc_q q CROSS JOIN gc_many m GROUP BY q;
CREATE INDEX gc_many_track ON gc_many USING gist (track frechet_geometry_ops);
CREATE INDEX gc_many_geog ON gc_many USING gist (geog frechet_geography_ops);
ANALYZE gc_many;
EXPLAIN (COSTS OFF)
SELECT id FROM gc_many WHERE frechet_passes(geog, (SELECT ST_Transform(stretch, 4326)::geography FROM gc_q WHERE q = 1), 20);
SET enable_seqscan = off;
CREATE TABLE gc_idx AS
SELECT q, (SELECT count(*) FROM gc_many m WHERE frechet_passes(m.track, q.stretch, q.eps)) AS n_geom,
       (SELECT md5(string_agg(id::text, ',' ORDER BY id)) FROM gc_many m WHERE frechet_passes(m.track, q.stretch, q.eps)) AS ids_geom,
       (SELECT count(*) FROM gc_many m WHERE frechet_passes(m.geog, ST_Transform(q.stretch, 4326)::geography, q.eps)) AS n_geog,
       (SELECT md5(string_agg(id::text, ',' ORDER BY id)) FROM gc_many m WHERE frechet_passes(m.geog, ST_Transform(q.stretch, 4326)::geography, q.eps)) AS ids_geog
FROM gc_q q;
RESET enable_seqscan;
SELECT s.q, s.n_geom, i.n_geom = s.n_geom AND i.ids_geom IS NOT DISTINCT FROM s.ids_geom AS same_geom,
       s.n_geog, i.n_geog = s.n_geog AND i.ids_geog IS NOT DISTINCT FROM s.ids_geog AS same_geog
FROM gc_seq s JOIN gc_idx i USING (q) ORDER BY q;

-- Nearest passages in metres on geography: the index's order equals a sort.
SET enable_seqscan = off;
CREATE TABLE gc_knn_idx AS
SELECT q, array_agg(round(d::numeric, 4) ORDER BY d) AS dists
FROM gc_q, LATERAL (SELECT geog <~~>> ST_Transform(stretch, 4326)::geography AS d FROM gc_many
                    ORDER BY geog <~~>> ST_Transform(stretch, 4326)::geography LIMIT 5) k GROUP BY q;
RESET enable_seqscan;
SET enable_indexscan = off;
SET enable_bitmapscan = off;
CREATE TABLE gc_knn_seq AS
SELECT q, array_agg(round(d::numeric, 4) ORDER BY d) AS dists
FROM gc_q, LATERAL (SELECT geog <~~>> ST_Transform(stretch, 4326)::geography AS d FROM gc_many
                    ORDER BY geog <~~>> ST_Transform(stretch, 4326)::geography LIMIT 5) k GROUP BY q;
RESET enable_indexscan;
RESET enable_bitmapscan;
SELECT q, s.dists = i.dists AS same_distances FROM gc_knn_seq s JOIN gc_knn_idx i USING (q) ORDER BY q;

-- Bad input: the errors of the other functions.
SELECT frechet_passes('SRID=3857;LINESTRING(0 0, 1 1)'::geometry, 'SRID=4326;LINESTRING(0 0, 1 1)'::geometry, 1);
SELECT frechet_passage('LINESTRING M (0 0 5, 1 1 2)'::geometry, 'LINESTRING(0 0, 1 1)'::geometry, 1);

DROP TABLE gc_trips, gc_geo, gc_routes, gc_many, gc_q, gc_seq, gc_idx, gc_knn_idx, gc_knn_seq;
DROP EXTENSION frechet_ext_postgis;
DROP EXTENSION postgis;
