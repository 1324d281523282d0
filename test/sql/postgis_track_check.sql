-- frechet_track_check on geometry and geography, MULTILINESTRING tracks
-- (parts joined in order), Z on geography, and the nightly-batch pattern of
-- README.md ("Bad rows in a batch") on 100,000 geometry trips with about
-- 1 % bad rows: empty, NaN, another SRID, a polygon.
CREATE EXTENSION IF NOT EXISTS postgis;
CREATE EXTENSION frechet_ext_postgis;
SELECT setseed(0.75);

CREATE FUNCTION pg_temp.error_of(stmt text) RETURNS text
LANGUAGE plpgsql AS $$
DECLARE
	msg text;
	det text;
BEGIN
	EXECUTE stmt;
	RETURN 'no error';
EXCEPTION WHEN OTHERS THEN
	GET STACKED DIAGNOSTICS msg = MESSAGE_TEXT, det = PG_EXCEPTION_DETAIL;
	RETURN msg || ' / ' || det;
END $$;

-- The check speaks the words of the ERROR, and is NULL exactly when there is none.
CREATE TEMP TABLE gsamples (label text, g geometry);
INSERT INTO gsamples VALUES
	('line', 'SRID=32633;LINESTRING(0 0, 10 0, 20 5)'),
	('point', 'SRID=32633;POINT(3 4)'),
	('multiline', 'SRID=32633;MULTILINESTRING((0 0, 10 0),(12 1, 20 5))'),
	('line M', 'SRID=32633;LINESTRING M(0 0 100, 10 0 130)'),
	('empty line', 'SRID=32633;LINESTRING EMPTY'),
	('empty multiline', 'SRID=32633;MULTILINESTRING EMPTY'),
	('NaN', 'SRID=32633;LINESTRING(5 6, 10 0, NaN 1)'),
	('NaN in second part', 'SRID=32633;MULTILINESTRING((5 6, 10 0),(11 0, NaN 1))'),
	('polygon', 'SRID=32633;POLYGON((0 0, 1 0, 1 1, 0 0))'),
	('multipoint', 'SRID=32633;MULTIPOINT(0 0, 1 1)'),
	('collection', 'SRID=32633;GEOMETRYCOLLECTION(LINESTRING(0 0, 1 1))');
SELECT label, frechet_track_check(g) AS check_text,
       pg_temp.error_of(format('SELECT frechet_distance(%L::geometry, %L::geometry)', g, 'SRID=32633;LINESTRING(0 0, 20 0)')) AS error
FROM gsamples ORDER BY label;
SELECT label AS check_disagrees_with_error
FROM gsamples
WHERE (frechet_track_check(g) IS NULL) <>
      (pg_temp.error_of(format('SELECT frechet_distance(%L::geometry, %L::geometry)', g, 'SRID=32633;LINESTRING(0 0, 20 0)')) = 'no error')
   OR NOT starts_with(pg_temp.error_of(format('SELECT frechet_distance(%L::geometry, %L::geometry)', g, 'SRID=32633;LINESTRING(0 0, 20 0)')),
                      split_part(coalesce(frechet_track_check(g), 'no error'), ': ', 1));
-- the SRID a batch expects
SELECT frechet_track_check('SRID=4326;LINESTRING(0 0, 1 1)'::geometry, 32633) AS other_srid,
       frechet_track_check('SRID=32633;LINESTRING(0 0, 1 1)'::geometry, 32633) AS same_srid;
-- geography: longitude and latitude in range
SELECT frechet_track_check('LINESTRING(10 50, 10.1 50.1)'::geography) AS lonlat_ok,
       frechet_track_check('MULTILINESTRING((10 50, 10.1 50.1),(10.2 50.2, 10.3 50.3))'::geography) AS multi_ok,
       frechet_track_check('SRID=4326;LINESTRING(10 50, 10.1 50.1)'::geography, 4326) AS srid_ok;

-- A MULTILINESTRING is the track of all its vertices, parts in order (a
-- GPS gap becomes one segment): the same distance as the LineString
-- through them, on 200 generated tracks split at random places.
CREATE TEMP TABLE multis AS
SELECT i, ST_MakeLine(array_agg(ST_MakePoint(k * 10.0, 20 * sin(k + i) + random() * 4) ORDER BY k)) AS line,
       1 + floor(random() * 6)::int AS cut1, 8 + floor(random() * 6)::int AS cut2
FROM generate_series(1, 200) i, generate_series(0, 15) k GROUP BY i;
SELECT count(*) AS tracks,
       count(*) FILTER (WHERE frechet_distance(ST_Collect(ARRAY[ST_MakeLine(ARRAY(SELECT (ST_DumpPoints(line)).geom LIMIT cut1)),
                                                          ST_MakeLine(ARRAY(SELECT (dp).geom FROM (SELECT ST_DumpPoints(line) AS dp) d OFFSET cut1 LIMIT cut2 - cut1)),
                                                          ST_MakeLine(ARRAY(SELECT (dp).geom FROM (SELECT ST_DumpPoints(line) AS dp) d OFFSET cut2))]),
                                          'LINESTRING(0 0, 150 0)'::geometry)
                          = frechet_distance(line, 'LINESTRING(0 0, 150 0)'::geometry)) AS same_distance
FROM multis;

-- Z on geography is ignored, as the README says: a 3-D trip against a 2-D route.
SELECT round(frechet_distance('LINESTRING Z(10 50 100, 10.01 50 140, 10.02 50.001 90)'::geography,
                              'LINESTRING(10 50, 10.02 50)'::geography)::numeric, 6)
     = round(frechet_distance('LINESTRING(10 50, 10.01 50, 10.02 50.001)'::geography,
                              'LINESTRING(10 50, 10.02 50)'::geography)::numeric, 6) AS z_ignored;
-- geometry still needs both 2-D or both 3-D
SELECT pg_temp.error_of($$SELECT frechet_distance('LINESTRING Z(0 0 1, 1 1 1)'::geometry, 'LINESTRING(0 0, 1 1)'::geometry)$$);

-- A geometry in lon/lat degrees given to a planar function: its answers
-- are in degrees, so a 50 "m" tolerance never fires.  One NOTICE per call
-- site (not per row); none for a projected SRID, SRID 0 or geography.
SELECT count(*) FILTER (WHERE frechet_at_most(g, 'SRID=4326;LINESTRING(10 50, 10.01 50)'::geometry, 50)) AS within_50_degrees
FROM (SELECT ST_SetSRID(ST_MakeLine(ST_MakePoint(10, 50 + i * 0.001), ST_MakePoint(10.01, 50 + i * 0.001)), 4326) AS g
      FROM generate_series(1, 5) i) s;
SELECT count(*) AS matching_rows FROM frechet_matching('SRID=4269;LINESTRING(-80 40, -80.01 40)'::geometry,
                                                       'SRID=4269;LINESTRING(-80 40.001, -80.01 40)'::geometry);
SELECT round(frechet_distance('SRID=27700;LINESTRING(0 0, 10 0)'::geometry, 'SRID=27700;LINESTRING(0 1, 10 1)'::geometry)::numeric, 6) AS projected,
       round(frechet_distance('LINESTRING(0 0, 10 0)'::geometry, 'LINESTRING(0 1, 10 1)'::geometry)::numeric, 6) AS srid_0,
       round(frechet_distance('SRID=4326;LINESTRING(10 50, 10.01 50)'::geography, 'SRID=4326;LINESTRING(10 50.001, 10.01 50)'::geography)::numeric, 1) AS geography_m;

-- The batch: 8 routes in UTM 33N, 100,000 trips through every stop within
-- 8 m (one in 50 within 40 m); every 100th row bad.
CREATE TABLE gbatch_routes AS
SELECT r AS route_id,
       ST_SetSRID(ST_MakeLine(array_agg(ST_MakePoint(500000.0 + 300 * r + 80 * k, 5000000.0 + 40 * (k % 3)) ORDER BY k)), 32633) AS route
FROM generate_series(1, 8) r, generate_series(0, 9) k GROUP BY r;
CREATE TABLE gbatch_trips (id int PRIMARY KEY, route_id int, track geometry);
INSERT INTO gbatch_trips
SELECT i, 1 + i % 8,
       ST_SetSRID(ST_MakeLine(ARRAY(
           SELECT ST_MakePoint(ST_X(p) + (random() - 0.5) * (CASE WHEN i % 50 = 7 THEN 80 ELSE 16 END),
                               ST_Y(p) + (random() - 0.5) * 16)
           FROM (SELECT (ST_DumpPoints(route)).geom AS p) d)), 32633)
FROM generate_series(1, 100000) i JOIN gbatch_routes ON route_id = 1 + i % 8;
UPDATE gbatch_trips SET track = CASE (id / 100) % 4
		WHEN 0 THEN 'SRID=32633;LINESTRING EMPTY'::geometry
		WHEN 1 THEN ST_SetPoint(track, 3, 'SRID=32633;POINT(NaN 5000000)'::geometry)
		WHEN 2 THEN ST_Transform(track, 4326)
		ELSE ST_Buffer(track, 5)
	END
WHERE id % 100 = 0;
SELECT split_part(coalesce(frechet_track_check(track, 32633), 'valid'), ':', 1) AS check_says, count(*)
FROM gbatch_trips GROUP BY 1 ORDER BY 1;

CREATE INDEX gbatch_trips_track ON gbatch_trips USING gist (track frechet_geometry_ops)
	WHERE frechet_track_check(track, 32633) IS NULL;
ANALYZE gbatch_trips;
EXPLAIN (COSTS OFF)
SELECT id FROM gbatch_trips
WHERE frechet_track_check(track, 32633) IS NULL
  AND frechet_at_most(track, (SELECT route FROM gbatch_routes WHERE route_id = 3), 25);

CREATE TEMP TABLE gby_index AS
SELECT r.route_id, array_agg(t.id ORDER BY t.id) AS ids
FROM gbatch_routes r, LATERAL (SELECT id FROM gbatch_trips
                               WHERE frechet_track_check(track, 32633) IS NULL
                                 AND frechet_at_most(track, r.route, 25)) t
GROUP BY r.route_id;
SET enable_indexscan = off;
SET enable_bitmapscan = off;
CREATE TEMP TABLE gby_seqscan AS
SELECT r.route_id, array_agg(t.id ORDER BY t.id) AS ids
FROM gbatch_routes r, LATERAL (SELECT id FROM gbatch_trips
                               WHERE frechet_track_check(track, 32633) IS NULL
                                 AND frechet_at_most(track, r.route, 25)) t
GROUP BY r.route_id;
RESET enable_indexscan;
RESET enable_bitmapscan;
SELECT count(*) AS routes, sum(cardinality(i.ids)) AS trips_within_25,
       bool_and(i.ids = s.ids) AS index_equals_seqscan
FROM gby_index i FULL JOIN gby_seqscan s USING (route_id);

-- The flag job, in parallel: the bad rows skipped, and listed.
SET max_parallel_workers_per_gather = 2;
SET parallel_setup_cost = 0;
SET parallel_tuple_cost = 0;
SET min_parallel_table_scan_size = 0;
SELECT count(*) AS flagged, count(*) FILTER (WHERE t.id % 50 = 7) AS flagged_wide_ones
FROM gbatch_trips t JOIN gbatch_routes USING (route_id)
WHERE frechet_track_check(t.track, 32633) IS NULL AND NOT frechet_at_most(t.track, route, 25);
RESET max_parallel_workers_per_gather;
RESET parallel_setup_cost;
RESET parallel_tuple_cost;
RESET min_parallel_table_scan_size;
SELECT id, frechet_track_check(track, 32633) AS skipped_because
FROM gbatch_trips WHERE frechet_track_check(track, 32633) IS NOT NULL ORDER BY id LIMIT 4;
-- without the filter, the first bad row stops the job and its ERROR points at it
SELECT pg_temp.error_of($$SELECT count(*) FROM gbatch_trips t JOIN gbatch_routes USING (route_id)
                          WHERE NOT frechet_at_most(t.track, route, 25) AND t.id BETWEEN 150 AND 250$$) AS first_error;

DROP TABLE gbatch_trips, gbatch_routes;

DROP TABLE gsamples, multis;
DROP EXTENSION frechet_ext_postgis;
DROP EXTENSION postgis;
