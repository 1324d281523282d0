-- PostGIS in its own schema, not on search_path: frechet_ext_postgis still
-- installs, computes and uses the index, since it finds PostGIS's
-- functions and operators through the postgis extension's schema.
CREATE SCHEMA gis;
CREATE EXTENSION postgis SCHEMA gis;
CREATE EXTENSION frechet_ext_postgis;
SHOW search_path;
SELECT n.nspname AS postgis_schema FROM pg_extension e JOIN pg_namespace n ON n.oid = e.extnamespace WHERE e.extname = 'postgis';
SELECT n.nspname AS frechet_ext_postgis_schema FROM pg_extension e JOIN pg_namespace n ON n.oid = e.extnamespace WHERE e.extname = 'frechet_ext_postgis';

SELECT frechet_distance(gis.st_geomfromtext('LINESTRING(0 0,10 0)'), gis.st_geomfromtext('LINESTRING(0 0,6 1,4 -1,10 0)')) AS planar,
       round(frechet_distance(gis.st_geogfromtext('SRID=4326;POINT(0 0)'), gis.st_geogfromtext('SRID=4326;POINT(0 0.001)'))::numeric, 6) AS metres;

CREATE TABLE tracks AS
SELECT i AS id, gis.st_makeline(gis.st_makepoint(i, 0), gis.st_makepoint(i + 10, 1)) AS geom
FROM generate_series(1, 2000) i;
CREATE INDEX ON tracks USING gist (geom);
ANALYZE tracks;
EXPLAIN (COSTS OFF)
SELECT id FROM tracks WHERE frechet_at_most(geom, gis.st_geomfromtext('LINESTRING(500 0,510 1)'), 3);
SELECT array_agg(id ORDER BY id) AS within_3
FROM tracks WHERE frechet_at_most(geom, gis.st_geomfromtext('LINESTRING(500 0,510 1)'), 3);

DROP TABLE tracks;
DROP EXTENSION frechet_ext_postgis;
DROP EXTENSION postgis;
DROP SCHEMA gis;
