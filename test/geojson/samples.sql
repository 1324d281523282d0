-- GeoJSON samples for check.mjs: one line each, "label<TAB>kind<TAB>json".
-- Run with psql -At -F '<TAB>' -v postgis=0|1 on a database where this file
-- may create the extensions.
\set ON_ERROR_STOP 1
SET client_min_messages = warning;
CREATE EXTENSION IF NOT EXISTS frechet_ext;

CREATE TEMP TABLE pair (label text, a point[], b point[], eps float8);
INSERT INTO pair VALUES
	('point[] detour, eps 30', '{"(0,0)","(100,0)","(150,90)","(200,0)","(300,0)"}', '{"(0,0)","(300,0)"}', 30),
	('point[] detour, no eps', '{"(0,0)","(100,0)","(150,90)","(200,0)","(300,0)"}', '{"(0,0)","(300,0)"}', NULL),
	('point[] within eps', '{"(0,1)","(150,-2)","(300,1)"}', '{"(0,0)","(300,0)"}', 30),
	('point[] identical', '{"(5,5)","(6,7)","(9,9)"}', '{"(5,5)","(6,7)","(9,9)"}', 0),
	('point[] one point vs line', '{"(3,4)"}', '{"(0,0)","(10,0)"}', 2),
	('point[] one point vs one point', '{"(3,4)"}', '{"(0,0)"}', 1),
	('point[] reversed', '{"(300,0)","(150,3)","(0,0)"}', '{"(0,0)","(150,0)","(300,0)"}', 20),
	('point[] two excursions',
	 '{"(0,0)","(50,0)","(60,80)","(90,0)","(200,0)","(210,-70)","(230,0)","(400,0)"}', '{"(0,0)","(400,0)"}', 10);
INSERT INTO pair
SELECT 'point[] 300-point GPS-like pair',
	array_agg(point(i * 10 + 3 * sin(i), 40 * sin(i / 20.0) + 2 * cos(3 * i)) ORDER BY i),
	array_agg(point(i * 10, 40 * sin(i / 20.0)) ORDER BY i), 5
FROM generate_series(1, 300) AS i;

SELECT label, 'plain', frechet_geojson(a, b, eps)::text FROM pair ORDER BY label;

-- Negative controls: the validator must reject these (RFC 7946 section 7.1:
-- no "properties" member on a FeatureCollection; section 3.1.4: a
-- LineString has two or more positions).
SELECT 'control: properties on the FeatureCollection', 'invalid',
	(frechet_geojson(a, b, eps) || '{"properties": {}}')::text FROM pair WHERE label = 'point[] detour, eps 30';
SELECT 'control: one-position LineString', 'invalid',
	jsonb_set(frechet_geojson(a, b, eps), '{features,0,geometry,coordinates}', '[[0, 0]]')::text
FROM pair WHERE label = 'point[] detour, eps 30';

\if :postgis
CREATE EXTENSION IF NOT EXISTS postgis;
CREATE EXTENSION IF NOT EXISTS frechet_ext_postgis;
-- geometry without SRID: coordinates as stored
SELECT 'geometry SRID 0 ' || label, 'plain',
	frechet_geojson(ST_MakeLine(ARRAY(SELECT ST_MakePoint(p[0], p[1]) FROM unnest(a) p)),
	                ST_MakeLine(ARRAY(SELECT ST_MakePoint(p[0], p[1]) FROM unnest(b) p)), eps)::text
FROM pair WHERE cardinality(a) > 1 AND cardinality(b) > 1 ORDER BY label;
-- geometry in UTM 30N metres: coordinates transformed to lon/lat
SELECT 'geometry UTM 30N ' || label, 'lonlat',
	frechet_geojson(ST_SetSRID(ST_MakeLine(ARRAY(SELECT ST_MakePoint(500000 + p[0], 5900000 + p[1]) FROM unnest(a) p)), 32630),
	                ST_SetSRID(ST_MakeLine(ARRAY(SELECT ST_MakePoint(500000 + p[0], 5900000 + p[1]) FROM unnest(b) p)), 32630), eps)::text
FROM pair WHERE cardinality(a) > 1 AND cardinality(b) > 1 ORDER BY label;
SELECT 'geometry 3-D', 'plain',
	frechet_geojson('LINESTRING Z (0 0 0, 100 0 10, 150 90 20, 300 0 0)'::geometry,
	                'LINESTRING Z (0 0 0, 300 0 0)'::geometry, 30)::text;
SELECT 'geometry point vs line', 'plain',
	frechet_geojson('POINT(3 4)'::geometry, 'LINESTRING(0 0, 10 0)'::geometry, 5)::text;
-- geography: lon/lat, metres
SELECT 'geography Wrenmere-like pair', 'lonlat',
	frechet_geojson('SRID=4326;LINESTRING(-1.5010 53.4020, -1.4975 53.4031, -1.4960 53.4060, -1.4940 53.4049)'::geography,
	                'SRID=4326;LINESTRING(-1.5011 53.4021, -1.4976 53.4029, -1.4952 53.4041, -1.4941 53.4050)'::geography, 40)::text;
SELECT 'geography across the antimeridian', 'lonlat',
	frechet_geojson('SRID=4326;LINESTRING(179.9990 -16.80, -179.9990 -16.80)'::geography,
	                'SRID=4326;LINESTRING(179.9990 -16.8001, -179.9990 -16.8001)'::geography, 5)::text;
\endif
