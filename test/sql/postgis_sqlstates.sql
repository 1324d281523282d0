-- Inputs that used to end in an internal error (XX000) or a wrong SQLSTATE
-- on PostGIS values; each now answers, or fails with a documented SQLSTATE.
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

-- Antipodal points: a geography edge between them has no path (PostGIS
-- refuses it), so leashes between them as geography are a clear 22023;
-- the matching itself, as rows of points, still works.  GeoJSON joins
-- positions straight in longitude and latitude (RFC 7946), so
-- frechet_geojson draws those leashes.
SELECT pg_temp.try($$SELECT ST_AsText(frechet_matching_leashes('LINESTRING(0 0, 1 0)'::geography, 'LINESTRING(180 0, 179 0)'::geography))$$) AS leashes;
SELECT pg_temp.try($$SELECT (g #>> '{features,2,geometry,type}') || ' of ' || jsonb_array_length(g #> '{features,2,geometry,coordinates}')
                                || ', first ' || (g #> '{features,2,geometry,coordinates,0}')::text
                                || ', last ' || (g #> '{features,2,geometry,coordinates,-1}')::text
                             FROM frechet_geojson('LINESTRING(0 0, 1 0)'::geography, 'LINESTRING(180 0, 179 0)'::geography) g$$) AS geojson_leashes;
SELECT count(*) AS matching_rows, round(max(leash)) AS longest_leash_m
FROM frechet_matching('LINESTRING(0 0, 1 0)'::geography, 'LINESTRING(180 0, 179 0)'::geography);
-- not antipodal (one degree short): a leash as usual
SELECT ST_NumGeometries(frechet_matching_leashes('LINESTRING(0 0, 1 0)'::geography, 'LINESTRING(179 0, 178 0)'::geography)::geometry) AS leashes_near_antipodal;
-- the geometry version draws them as straight lines
SELECT ST_AsText(frechet_matching_leashes('LINESTRING(0 0, 1 0)'::geometry, 'LINESTRING(180 0, 179 0)'::geometry)) AS planar_leashes;

-- Simplification never makes an antipodal edge: where it would, the
-- track's own vertices stay, and the result is within the tolerance.
SELECT ST_AsText(frechet_simplify('LINESTRING(0 0, 90 0, 180 0, -90 0, 0 0)'::geography, 1e7)) AS simplified,
       frechet_distance(frechet_simplify('LINESTRING(0 0, 90 0, 180 0, -90 0, 0 0)'::geography, 1e7),
                        'LINESTRING(0 0, 90 0, 180 0, -90 0, 0 0)'::geography) <= 1e7 AS within_tolerance;
SELECT ST_AsText(frechet_simplify('LINESTRING(0 0, 45 0, 90 0, 135 0, 180 0)'::geography, 2e7)) AS simplified_half_equator,
       frechet_distance(frechet_simplify('LINESTRING(0 0, 45 0, 90 0, 135 0, 180 0)'::geography, 2e7),
                        'LINESTRING(0 0, 45 0, 90 0, 135 0, 180 0)'::geography) <= 2e7 AS within_tolerance;
-- without an antipodal shortcut it simplifies as before
SELECT ST_AsText(frechet_simplify('LINESTRING(0 0, 0.5 0.0001, 1 0)'::geography, 1000)) AS simplified_short;

-- GeoJSON of a geometry whose SRID is not in spatial_ref_sys: it cannot be
-- transformed to WGS84, so 22023 (was ST_Transform's internal error); the
-- distance does not need spatial_ref_sys and still works.
SELECT pg_temp.try($$SELECT frechet_geojson(ST_SetSRID('LINESTRING(0 0, 1 0)'::geometry, 990001), ST_SetSRID('LINESTRING(0 1, 1 1)'::geometry, 990001))::text$$) AS geojson_unknown_srid;
SELECT pg_temp.try($$SELECT frechet_geometry_geojson(ST_SetSRID('LINESTRING(0 0, 1 0)'::geometry, 990001))::text$$) AS geometry_geojson_unknown_srid;
SELECT frechet_distance(ST_SetSRID('LINESTRING(0 0, 1 0)'::geometry, 990001), ST_SetSRID('LINESTRING(0 1, 1 1)'::geometry, 990001)) AS distance_unknown_srid;
-- SRIDs 0 and 4326 as stored, a known one transformed
SELECT frechet_geometry_geojson('LINESTRING(0 0, 1 0)'::geometry)::text AS srid_0,
       frechet_geometry_geojson(ST_SetSRID('LINESTRING(0 0, 1 0)'::geometry, 4326))::text AS srid_4326,
       frechet_geometry_geojson(ST_SetSRID('LINESTRING(0 0, 111319.49079327357 0)'::geometry, 3857))::text AS srid_3857;

-- PolyhedralSurface, TIN and Triangle (EWKB type codes 15, 16, 17) are
-- geometry types other than curves: 22023 naming them (was 22P03 "unknown
-- geometry type code 16" for a TIN, and a Triangle for a PolyhedralSurface).
SELECT pg_temp.try($$SELECT frechet_distance('POLYHEDRALSURFACE Z(((0 0 0,0 1 0,1 1 0,0 0 0)))'::geometry, 'POINT Z(0 0 0)'::geometry)::text$$) AS polyhedralsurface,
       pg_temp.try($$SELECT frechet_distance('TIN(((0 0 0,0 0 1,0 1 0,0 0 0)))'::geometry, 'POINT Z(0 0 0)'::geometry)::text$$) AS tin,
       pg_temp.try($$SELECT frechet_distance('TRIANGLE((0 0,0 1,1 0,0 0))'::geometry, 'POINT(0 0)'::geometry)::text$$) AS triangle;
SELECT get_byte(ST_AsEWKB('TIN(((0 0 0,0 0 1,0 1 0,0 0 0)))'::geometry), 1) AS tin_code,
       get_byte(ST_AsEWKB('TRIANGLE((0 0,0 1,1 0,0 0))'::geometry), 1) AS triangle_code,
       get_byte(ST_AsEWKB('POLYHEDRALSURFACE(((0 0 0,0 1 0,1 1 0,0 0 0)))'::geometry), 1) AS polyhedralsurface_code;
-- codes with no geometry type: 22P03 as before
SELECT pg_temp.try(format('SELECT frechet_distance_ewkb(%L::bytea, ST_AsEWKB(%L::geometry))::text',
                          '\x01' || lpad(to_hex(code), 2, '0') || '000000000000000000f03f000000000000f03f', 'POINT(0 0)')) AS outcome, code
FROM unnest(ARRAY[13, 14, 18]) AS code ORDER BY code;

-- NaN epsilon on geometry: the same 22023 with PostGIS's index, with ours,
-- and with a sequential scan, also when no row qualifies.
CREATE TABLE sq_tracks AS
SELECT i AS id, ST_MakeLine(ST_MakePoint(i, 0), ST_MakePoint(i + 10, 1)) AS geom FROM generate_series(1, 1000) i;
CREATE INDEX sq_postgis ON sq_tracks USING gist (geom);
CREATE INDEX sq_ours ON sq_tracks USING gist (geom frechet_geometry_ops);
ANALYZE sq_tracks;
CREATE TEMP TABLE sq_queries (k int, q text);
INSERT INTO sq_queries VALUES
	(1, $$SELECT count(*)::text FROM sq_tracks WHERE frechet_at_most(geom, 'LINESTRING(5000 0,5010 1)'::geometry, 'NaN')$$),
	(2, $$SELECT count(*)::text FROM sq_tracks WHERE id < 0 AND frechet_at_most(geom, 'LINESTRING(500 0,510 1)'::geometry, 'NaN')$$),
	(3, $$SELECT count(*)::text FROM sq_tracks WHERE frechet_at_most(geom, 'LINESTRING(500 0,510 1)'::geometry, 1)$$);
SET enable_seqscan = off;
DROP INDEX sq_ours;
CREATE TEMP TABLE sq_postgis_index AS SELECT k, pg_temp.try(q) AS result FROM sq_queries;
EXPLAIN (COSTS OFF) SELECT count(*) FROM sq_tracks WHERE frechet_at_most(geom, 'LINESTRING(500 0,510 1)'::geometry, 1);
CREATE INDEX sq_ours ON sq_tracks USING gist (geom frechet_geometry_ops);
DROP INDEX sq_postgis;
CREATE TEMP TABLE sq_our_index AS SELECT k, pg_temp.try(q) AS result FROM sq_queries;
EXPLAIN (COSTS OFF) SELECT count(*) FROM sq_tracks WHERE frechet_at_most(geom, 'LINESTRING(500 0,510 1)'::geometry, 1);
DROP INDEX sq_ours;
RESET enable_seqscan;
CREATE TEMP TABLE sq_seq AS SELECT k, pg_temp.try(q) AS result FROM sq_queries;
SELECT k, p.result AS postgis_index, o.result AS our_index, s.result AS sequential
FROM sq_postgis_index p JOIN sq_our_index o USING (k) JOIN sq_seq s USING (k) ORDER BY k;

DROP TABLE sq_tracks;
DROP EXTENSION frechet_ext_postgis;
DROP EXTENSION postgis;
