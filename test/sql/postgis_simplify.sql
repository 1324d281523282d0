-- frechet_simplify on geometry and geography: the guarantee recomputed with
-- frechet_distance, the SRID kept, bad tolerance refused.
CREATE EXTENSION postgis;
CREATE EXTENSION frechet_ext_postgis;

CREATE TABLE simplify_geo AS
SELECT i, ST_SetSRID(ST_MakeLine(array(SELECT ST_MakePoint(k * 11 + 4 * sin(k * i), 3 * cos(k + i) + k % 4)
                                       FROM generate_series(0, 30 + i) k)), 3857) AS g
FROM generate_series(1, 20) i;

SELECT count(*) AS tracks,
       count(*) FILTER (WHERE frechet_distance(frechet_simplify(g, tol), g) <= tol * (1 + 1e-12)) AS within_tolerance,
       count(*) FILTER (WHERE ST_NPoints(frechet_simplify(g, tol)) < ST_NPoints(g)) AS smaller,
       count(*) FILTER (WHERE ST_SRID(frechet_simplify(g, tol)) = 3857) AS srid_kept
FROM simplify_geo, (VALUES (3.0), (10.0)) AS t(tol);

-- lon/lat: a tolerance in metres
SELECT count(*) AS tracks,
       count(*) FILTER (WHERE frechet_distance(frechet_simplify(gg, 25), gg) <= 25 * (1 + 1e-9)) AS within_25_m,
       count(*) FILTER (WHERE ST_NPoints(frechet_simplify(gg, 25)::geometry) < ST_NPoints(gg::geometry)) AS smaller
FROM (SELECT ST_Transform(g, 4326)::geography AS gg FROM simplify_geo) s;

SELECT ST_AsText(frechet_simplify('SRID=3857;POINT(1 2)'::geometry, 5)) AS one_point;
SELECT frechet_simplify('LINESTRING(0 0, 1 1)'::geometry, -1);

DROP TABLE simplify_geo;
DROP EXTENSION frechet_ext_postgis;
DROP EXTENSION postgis;
