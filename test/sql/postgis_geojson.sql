-- GeoJSON for dashboards on geometry and geography (frechet_ext_postgis).
-- The point[] version on the same coordinates is the reference for
-- geometry without SRID; PostGIS's ST_Transform (PROJ) the reference for
-- coordinates of projected geometry, which RFC 7946 (section 4) wants in
-- WGS84 lon/lat.  test/geojson/ runs an outside validator on such outputs.
CREATE EXTENSION IF NOT EXISTS postgis;
CREATE EXTENSION frechet_ext_postgis;

-- Every position of a GeoJSON object's features: feature, geometry type, x, y.
CREATE FUNCTION pg_temp.positions(j jsonb)
RETURNS TABLE (feature int, gtype text, seq int, x float8, y float8)
LANGUAGE sql AS $$
	SELECT o::int, f->'geometry'->>'type', row_number() OVER (PARTITION BY o)::int,
	       (c->>0)::float8, (c->>1)::float8
	FROM jsonb_array_elements(j->'features') WITH ORDINALITY AS e(f, o),
	     LATERAL (SELECT f->'geometry'->'coordinates' AS c WHERE f->'geometry'->>'type' = 'Point'
	              UNION ALL SELECT c FROM jsonb_array_elements(f->'geometry'->'coordinates') c
	                        WHERE f->'geometry'->>'type' = 'LineString'
	              UNION ALL SELECT c FROM jsonb_array_elements(f->'geometry'->'coordinates') l,
	                                     jsonb_array_elements(l) c
	                        WHERE f->'geometry'->>'type' = 'MultiLineString') AS p
$$;

CREATE TABLE gjp (id int, a point[], b point[], eps float8);
INSERT INTO gjp VALUES
	(1, '{"(0,0)","(100,0)","(150,90)","(200,0)","(300,0)"}', '{"(0,0)","(300,0)"}', 30),
	(2, '{"(0,0)","(100,0)","(150,90)","(200,0)","(300,0)"}', '{"(0,0)","(300,0)"}', NULL),
	(3, '{"(0,1)","(150,-2)","(300,1)"}', '{"(0,0)","(300,0)"}', 30),
	(4, '{"(0,0)","(50,0)","(60,80)","(90,0)","(200,0)","(210,-70)","(230,0)","(400,0)"}', '{"(0,0)","(400,0)"}', 10),
	(5, '{"(300,0)","(150,3)","(0,0)"}', '{"(0,0)","(150,0)","(300,0)"}', 20),
	(6, '{"(3,4)"}', '{"(0,0)","(10,0)"}', 2);
CREATE TABLE gjg AS
SELECT id, eps, frechet_geojson(a, b, eps) AS jp,
       frechet_geojson(CASE WHEN cardinality(a) = 1 THEN ST_MakePoint((a[1])[0], (a[1])[1])
                            ELSE ST_MakeLine(array(SELECT ST_MakePoint(p[0], p[1]) FROM unnest(a) p)) END,
                       ST_MakeLine(array(SELECT ST_MakePoint(p[0], p[1]) FROM unnest(b) p)), eps) AS jg
FROM gjp;

-- geometry without SRID: the same features, roles, properties and, to the
-- 9 decimals of ST_AsGeoJSON, the same positions as point[].  A one-point
-- trip's zero-length excursion is a Point for point[] (frechet_track_piece)
-- and a LineString of two equal positions for geometry (trip_piece).
SELECT id, (jg->'frechet') - 'srid' = jp->'frechet' AS summary_same, jg->'frechet'->>'srid' AS srid,
       (SELECT array_agg(f->'properties' ORDER BY o) FROM jsonb_array_elements(jg->'features') WITH ORDINALITY e(f, o))
       = (SELECT array_agg(f->'properties' ORDER BY o) FROM jsonb_array_elements(jp->'features') WITH ORDINALITY e(f, o))
         AS properties_same,
       (SELECT count(*) FROM pg_temp.positions(jg) g
        WHERE g.gtype = (SELECT min(p.gtype) FROM pg_temp.positions(jp) p WHERE p.feature = g.feature))
       = (SELECT count(*) FROM pg_temp.positions(jp) p
          WHERE p.gtype = (SELECT min(g.gtype) FROM pg_temp.positions(jg) g WHERE g.feature = p.feature))
         AS count_same,
       (SELECT string_agg(DISTINCT g.feature || ': ' || g.gtype || ' / ' || p.gtype, ', ')
        FROM pg_temp.positions(jg) g JOIN pg_temp.positions(jp) p USING (feature, seq)
        WHERE g.gtype <> p.gtype) AS types_differ,
       (SELECT max(greatest(abs(g.x - p.x), abs(g.y - p.y)))
        FROM pg_temp.positions(jg) g JOIN pg_temp.positions(jp) p USING (feature, seq)
        WHERE g.gtype = p.gtype) < 1e-8 AS positions_same
FROM gjg ORDER BY id;

-- Projected geometry (UTM 30N): distances in metres of the SRID, positions
-- transformed to lon/lat, no "crs" member (RFC 7946 appendix B.1).
CREATE TABLE gju AS
SELECT id, eps, ga, gb, frechet_geojson(ga, gb, eps) AS j
FROM (SELECT id, eps,
             ST_SetSRID(ST_MakeLine(array(SELECT ST_MakePoint(500000 + p[0], 5900000 + p[1]) FROM unnest(a) p)), 32630) AS ga,
             ST_SetSRID(ST_MakeLine(array(SELECT ST_MakePoint(500000 + p[0], 5900000 + p[1]) FROM unnest(b) p)), 32630) AS gb
      FROM gjp WHERE cardinality(a) > 1) s;
SELECT id, (j->'frechet'->>'distance')::float8 = frechet_distance(ga, gb) AS distance_ok,
       j->'frechet'->>'srid' AS srid, j::text LIKE '%"crs"%' AS has_crs,
       (SELECT max(greatest(abs(p.x - ST_X(d.geom)), abs(p.y - ST_Y(d.geom))))
        FROM pg_temp.positions(j) p JOIN ST_DumpPoints(ST_Transform(ga, 4326)) d ON d.path[1] = p.seq
        WHERE p.feature = 1) < 1e-8 AS trip_lonlat_ok,
       (SELECT bool_and(x BETWEEN -4 AND -2 AND y BETWEEN 53 AND 54) FROM pg_temp.positions(j)) AS all_near_wrenmere
FROM gju ORDER BY id;

-- geography: metres on WGS84, positions lon/lat as stored.
CREATE TABLE gjy AS
SELECT 'SRID=4326;LINESTRING(-1.5010 53.4020, -1.4975 53.4031, -1.4960 53.4060, -1.4940 53.4049)'::geography AS a,
       'SRID=4326;LINESTRING(-1.5011 53.4021, -1.4976 53.4029, -1.4952 53.4041, -1.4941 53.4050)'::geography AS b;
SELECT (j->'frechet'->>'distance')::float8 = frechet_distance(a, b) AS distance_ok,
       round((j->'frechet'->>'distance')::numeric, 1) AS metres, j->'frechet'->>'units' AS units,
       j->'frechet'->>'excursions' AS excursions,
       (SELECT count(*) FROM frechet_excursions(a, b, 40)) AS excursions_direct,
       j->'features'->0->'geometry' = ST_AsGeoJSON(a, 9, 0)::jsonb AS trip_as_stored,
       (SELECT max(abs(ST_Distance(ST_MakePoint(l.x, l.y)::geography, ST_MakePoint(r.x, r.y)::geography)
                   - (j->'features'->3->'properties'->>'leash')::float8))
        FROM pg_temp.positions(j) l JOIN pg_temp.positions(j) r ON l.feature = r.feature AND r.seq = l.seq + 1
        WHERE l.feature = 4 AND l.seq = 1) < 0.01 AS bottleneck_length_ok
FROM gjy, LATERAL (SELECT frechet_geojson(a, b, 40) AS j) s;

-- Bound when the extension was created: the same under search_path = pg_catalog.
SELECT extnamespace::regnamespace AS schema FROM pg_extension WHERE extname = 'frechet_ext_postgis' \gset
SET search_path = pg_catalog;
SELECT :"schema".frechet_geojson(ga, gb, eps) = j AS same_under_pg_catalog FROM public.gju ORDER BY id;
RESET search_path;

-- NULL in, NULL out; bad input fails like the functions it calls.
SELECT frechet_geojson(NULL::geometry, 'POINT(0 0)'::geometry) IS NULL AS null_geometry,
       frechet_geojson('POINT(0 0)'::geography, NULL::geography) IS NULL AS null_geography;
DO $$
BEGIN
	PERFORM frechet_geojson('SRID=4326;LINESTRING(0 0, 1 1)'::geometry, 'SRID=3857;LINESTRING(0 0, 1 1)'::geometry);
EXCEPTION WHEN OTHERS THEN
	RAISE NOTICE 'mixed SRIDs: % %', SQLSTATE, SQLERRM;
END $$;

DROP TABLE gjp, gjg, gju, gjy;
DROP EXTENSION frechet_ext_postgis;
DROP EXTENSION postgis;
