-- Row estimates on geometry and geography (frechet_ext_postgis): the
-- planner support functions estimate frechet_at_most,
-- frechet_pings_at_most and frechet_passes from our index and a sample of
-- the rows it admits (selectivity.c; test/sql/estimates.sql has the
-- point[] cases).  Within 3x of the actual rows on 6,000 trips along 12
-- routes, planar (EPSG:32632 metres) and lon/lat (metres on the WGS 84
-- ellipsoid); PostGIS's own index alone gives no estimate (a third).
CREATE EXTENSION IF NOT EXISTS postgis;
CREATE EXTENSION frechet_ext_postgis;
SELECT setseed(0.75);

CREATE TABLE pe_routes AS
SELECT r AS rid,
       ST_SetSRID(ST_MakeLine(array(SELECT ST_MakePoint(5e5 + x0 + 250 * k, 5.4e6 + y0 + 150 * (k % 2))
                                    FROM generate_series(0, 5 + r % 4) k)), 32632) AS geom
FROM (SELECT r, 100 * floor(random() * 30) AS x0, 100 * floor(random() * 30) AS y0
      FROM generate_series(1, 12) r) s;
CREATE TABLE pe_trips AS
SELECT t AS id, rid,
       CASE WHEN t % 5 = 0 THEN ST_Reverse(g) ELSE g END AS geom
FROM (SELECT t, rid,
             ST_SetSRID(ST_MakeLine(array(SELECT ST_MakePoint(ST_X(p) + (random() - 0.5) * noise, ST_Y(p) + (random() - 0.5) * noise)
                                          FROM ST_DumpPoints(ST_Segmentize(r.geom, 60)) d(path, p)
                                          WHERE t > 0)), 32632) AS g
      FROM (SELECT t, 1 + t % 12 AS rid, 4 + (t % 9) * 8 AS noise FROM generate_series(1, 6000) t) s
      JOIN pe_routes r USING (rid)) u;
ALTER TABLE pe_trips ADD COLUMN geog geography;
UPDATE pe_trips SET geog = ST_Transform(geom, 4326)::geography;
CREATE INDEX pe_trips_geom ON pe_trips USING gist (geom frechet_geometry_ops);
CREATE INDEX pe_trips_geog ON pe_trips USING gist (geog frechet_geography_ops);
ANALYZE pe_trips;

CREATE FUNCTION pg_temp.estimate(sql text) RETURNS float8
LANGUAGE plpgsql AS $$
DECLARE j json;
BEGIN
	EXECUTE 'EXPLAIN (FORMAT JSON) ' || sql INTO j;
	RETURN (j->0->'Plan'->>'Plan Rows')::float8;
END $$;
CREATE FUNCTION pg_temp.check_estimate(col text, f text, q int, e float8)
RETURNS TABLE (fn text, route int, eps float8, actual bigint, within_3x bool)
LANGUAGE plpgsql AS $$
DECLARE
	path text := (SELECT CASE col WHEN 'geom' THEN quote_literal(r.geom::text) || '::geometry'
	                              ELSE quote_literal(ST_Transform(r.geom, 4326)::geography::text) || '::geography' END
	              FROM pe_routes r WHERE rid = q);
	cond text := format('%s(%I, %s, %s)', f, col, path, e);
	est float8 := pg_temp.estimate('SELECT * FROM pe_trips WHERE ' || cond);
BEGIN
	EXECUTE 'SELECT count(*) FROM pe_trips WHERE ' || cond INTO actual;
	fn := f || ' on ' || col; route := q; eps := e;
	within_3x := est BETWEEN greatest(actual, 1) / 3.0 AND greatest(actual, 1) * 3.0;
	IF NOT within_3x THEN
		RAISE NOTICE '% route %: estimated % rows, actual %', fn, q, est, actual;
	END IF;
	RETURN NEXT;
END $$;

SELECT e.* FROM (VALUES ('geom'), ('geog')) c(col),
	(VALUES ('frechet_at_most', 1, 10.0::float8), ('frechet_at_most', 1, 30), ('frechet_at_most', 6, 25),
	        ('frechet_pings_at_most', 4, 20), ('frechet_passes', 9, 25)) v(f, q, eps),
	pg_temp.check_estimate(c.col, v.f, v.q, v.eps) e;

-- PostGIS's own index alone: no estimate of ours, the default third
DROP INDEX pe_trips_geom;
CREATE INDEX pe_trips_geom_postgis ON pe_trips USING gist (geom);
SELECT pg_temp.estimate($$SELECT * FROM pe_trips WHERE frechet_at_most(geom, 'SRID=32632;LINESTRING(0 0,100 0)', 10)$$)
	= round(6000 / 3.0) AS postgis_index_default;

DROP TABLE pe_trips, pe_routes;
DROP EXTENSION frechet_ext_postgis;
DROP EXTENSION postgis;
