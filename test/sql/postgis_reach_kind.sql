-- frechet_key's kind of coordinates on PostGIS values: frechet_reach and
-- frechet_track_key of a geography are Earth-centred (text ending in
-- "earth"), of a geometry planar.  Mixing them is refused with 22023 by
-- frechet_within_reach / |~~| and by both index operator classes, with and
-- without an index, instead of answering false.
CREATE EXTENSION IF NOT EXISTS postgis;
CREATE EXTENSION frechet_ext_postgis;
CREATE FUNCTION pg_temp.try(stmt text) RETURNS text
LANGUAGE plpgsql AS $$
DECLARE
	res text;
BEGIN
	EXECUTE stmt INTO res;
	RETURN res;
EXCEPTION WHEN OTHERS THEN
	RETURN SQLSTATE || ': ' || SQLERRM;
END $$;
CREATE FUNCTION pg_temp.uses_index(q text) RETURNS bool
LANGUAGE plpgsql AS $$
DECLARE
	line text;
BEGIN
	FOR line IN EXECUTE 'EXPLAIN (COSTS OFF) ' || q LOOP
		IF line ~ 'Index Scan using rkg_|Bitmap Index Scan on rkg_' THEN
			RETURN true;
		END IF;
	END LOOP;
	RETURN false;
END $$;

SELECT frechet_reach('LINESTRING(0 0,1 1)'::geometry, 1) AS geometry_reach;
SELECT right(frechet_reach('LINESTRING(0 0,1 1)'::geography, 1)::text, 6) AS geography_reach_ends,
       right(frechet_track_key('LINESTRING(0 0,1 1)'::geography)::text, 6) AS geography_key_ends;
-- the text of an Earth-centred key reads back as the same key
SELECT frechet_within_reach('LINESTRING(0 0,1 1)'::geography,
                            frechet_reach('LINESTRING(0 0,1 1)'::geography, 1)::text::frechet_key) AS round_trip;

-- same kind: as before
SELECT frechet_within_reach(frechet_reach('LINESTRING(0 0,1 1)'::geography, 1), 'LINESTRING(0 0,1 1)'::geography) AS geog_geog,
       frechet_within_reach('LINESTRING(0 0,1 1)'::geometry, frechet_reach('LINESTRING(0 0,1 1)'::geometry, 1)) AS geom_geom,
       frechet_within_reach('LINESTRING(0 0,1 1)'::geometry, frechet_reach('{"(0,0)","(1,1)"}'::point[], 1)) AS geom_point_array,
       frechet_within_reach('{"(0,0)","(1,1)"}'::point[], frechet_reach('LINESTRING(0 0,1 1)'::geometry, 1)) AS point_array_geom;
-- mixed: refused, whichever side the key is on
SELECT pg_temp.try($$SELECT frechet_within_reach(frechet_reach('LINESTRING(0 0,1 1)'::geography, 1), 'LINESTRING(0 0,1 1)'::geometry)::text$$) AS geog_key_geom;
SELECT pg_temp.try($$SELECT frechet_within_reach('LINESTRING(0 0,1 1)'::geometry, frechet_reach('LINESTRING(0 0,1 1)'::geography, 1))::text$$) AS geom_geog_key;
SELECT pg_temp.try($$SELECT frechet_within_reach('LINESTRING(0 0,1 1)'::geography, frechet_reach('LINESTRING(0 0,1 1)'::geometry, 1e7))::text$$) AS geog_geom_key;
SELECT pg_temp.try($$SELECT (frechet_reach('{"(0,0)","(1,1)"}'::point[], 1e7) |~~| 'LINESTRING(0 0,1 1)'::geography)::text$$) AS point_array_key_geog;
SELECT pg_temp.try($$SELECT ('{"(0,0)","(1,1)"}'::point[] |~~| frechet_reach('LINESTRING(0 0,1 1)'::geography, 1))::text$$) AS point_array_geog_key;

-- the indexes: the same refusal with and without them
CREATE TABLE rkg AS
SELECT i AS id, ST_MakeLine(ST_MakePoint(i * 0.01, 0), ST_MakePoint(i * 0.01 + 0.1, 0.01)) AS geom,
       ST_MakeLine(ST_MakePoint(i * 0.01, 0), ST_MakePoint(i * 0.01 + 0.1, 0.01))::geography AS geog
FROM generate_series(1, 500) i;
CREATE INDEX rkg_geom ON rkg USING gist (geom frechet_geometry_ops);
CREATE INDEX rkg_geog ON rkg USING gist (geog frechet_geography_ops);
ANALYZE rkg;
CREATE TEMP TABLE rk_queries (label text, q text);
INSERT INTO rk_queries VALUES
	('geog |~~| geog key', $$SELECT count(*)::text FROM rkg WHERE geog |~~| frechet_reach('LINESTRING(1 0,1.1 0.01)'::geography, 2000)$$),
	('geog |~~| geom key', $$SELECT count(*)::text FROM rkg WHERE geog |~~| frechet_reach('LINESTRING(1 0,1.1 0.01)'::geometry, 0.02)$$),
	('geog |~~| geom key, no row near', $$SELECT count(*)::text FROM rkg WHERE geog |~~| frechet_reach('LINESTRING(100 0,100.1 0.01)'::geometry, 0.02)$$),
	('geom |~~| geom key', $$SELECT count(*)::text FROM rkg WHERE geom |~~| frechet_reach('LINESTRING(1 0,1.1 0.01)'::geometry, 0.02)$$),
	('geom |~~| geog key', $$SELECT count(*)::text FROM rkg WHERE geom |~~| frechet_reach('LINESTRING(1 0,1.1 0.01)'::geography, 2000)$$),
	('geom |~~| geog key, no row near', $$SELECT count(*)::text FROM rkg WHERE geom |~~| frechet_reach('LINESTRING(100 0,100.1 0.01)'::geography, 2000)$$);
SET enable_seqscan = off;
CREATE TEMP TABLE rk_index AS SELECT label, pg_temp.uses_index(q) AS index_used, pg_temp.try(q) AS result FROM rk_queries;
RESET enable_seqscan;
SET enable_indexscan = off;
SET enable_bitmapscan = off;
CREATE TEMP TABLE rk_seq AS SELECT label, pg_temp.uses_index(q) AS index_used, pg_temp.try(q) AS result FROM rk_queries;
RESET enable_indexscan;
RESET enable_bitmapscan;
SELECT i.label, i.index_used, i.result AS with_index, s.index_used, s.result AS without_index
FROM rk_index i JOIN rk_seq s USING (label) ORDER BY i.label;

DROP TABLE rkg;
DROP EXTENSION frechet_ext_postgis;
DROP EXTENSION postgis;
