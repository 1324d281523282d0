-- Geometry overloads (frechet_ext_postgis): the same engine as point[], so
-- the same coordinates give the same numbers; 3-D uses Z; lookups of
-- PostGIS functions do not depend on search_path.
CREATE EXTENSION IF NOT EXISTS postgis;
CREATE EXTENSION frechet_ext_postgis;

-- 200 random pairs of curves (deterministic), as point[] and as geometry.
SELECT setseed(0.4);
CREATE TABLE pairs AS
SELECT k,
       array(SELECT point(round((random() * 100)::numeric, 3), round((random() * 100)::numeric, 3))
             FROM generate_series(1, 2 + (k % 17)) WHERE k > 0) AS pa,
       array(SELECT point(round((random() * 100)::numeric, 3), round((random() * 100)::numeric, 3))
             FROM generate_series(1, 1 + (k % 13)) WHERE k > 0) AS pb
FROM generate_series(1, 200) k;
CREATE FUNCTION pg_temp.geom(p point[]) RETURNS geometry LANGUAGE sql AS
$$ SELECT CASE WHEN cardinality(p) = 1 THEN ST_MakePoint((p[1])[0], (p[1])[1])
               ELSE ST_MakeLine(array(SELECT ST_MakePoint(q[0], q[1]) FROM unnest(p) q)) END $$;
-- Z as a third axis: the curve (x, y) laid in the x-z plane, (x, 0, y).
CREATE FUNCTION pg_temp.geom_xz(p point[]) RETURNS geometry LANGUAGE sql AS
$$ SELECT ST_MakeLine(array(SELECT ST_MakePoint(q[0], 0, q[1]) FROM unnest(p || p[cardinality(p)]) q)) $$;

SELECT count(*) AS pairs,
       count(*) FILTER (WHERE frechet_distance(pg_temp.geom(pa), pg_temp.geom(pb)) = frechet_distance(pa, pb)) AS distance_same,
       count(*) FILTER (WHERE discrete_frechet_distance(pg_temp.geom(pa), pg_temp.geom(pb)) = discrete_frechet_distance(pa, pb)) AS discrete_same,
       count(*) FILTER (WHERE (pg_temp.geom(pa) <~~> pg_temp.geom(pb)) = (pa <-> pb)) AS operator_same,
       count(*) FILTER (WHERE frechet_at_most(pg_temp.geom(pa), pg_temp.geom(pb), 55) = frechet_at_most(pa, pb, 55)) AS at_most_same,
       count(*) FILTER (WHERE frechet_at_most(pa, pb, 55)) AS within_55,
       count(*) FILTER (WHERE frechet_distance(pg_temp.geom_xz(pa), pg_temp.geom_xz(pb)) = frechet_distance(pa || pa[cardinality(pa)], pb || pb[cardinality(pb)])) AS xz_same
FROM pairs;

-- Byte order of the EWKB does not matter either.
SELECT count(*) FILTER (WHERE frechet_distance_ewkb(ST_AsEWKB(pg_temp.geom(pa), 'XDR'), ST_AsEWKB(pg_temp.geom(pb), 'NDR'))
                              = frechet_distance(pa, pb)) AS xdr_ndr_same
FROM pairs;

-- The SRID's units: two 300 m lines 400 m apart in UTM 30N (EPSG:32630).
SELECT frechet_distance('SRID=32630;LINESTRING(500000 4000000,500300 4000000)'::geometry,
                        'SRID=32630;LINESTRING(500000 4000400,500300 4000400)'::geometry) AS metres_apart;

-- Independent of search_path: PostGIS functions are found through the
-- postgis extension's schema.
SET search_path = pg_catalog;
SELECT public.frechet_distance(public.st_geomfromtext('LINESTRING(0 0,10 0)'),
                               public.st_geomfromtext('LINESTRING(0 0,6 1,4 -1,10 0)')) AS with_empty_search_path;
RESET search_path;

DROP TABLE pairs;
DROP FUNCTION pg_temp.geom(point[]), pg_temp.geom_xz(point[]);
DROP EXTENSION frechet_ext_postgis;
DROP EXTENSION postgis;
