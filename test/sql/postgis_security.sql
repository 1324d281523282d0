-- frechet_ext_postgis installed into a schema that others can create
-- objects in, with PostGIS in its own schema: look-alikes of PostGIS's
-- functions and operators planted there beforehand must not be bound by the
-- install script (its search_path starts with the target schema) nor be
-- found by the C functions.  Each look-alike of every PostGIS function and
-- operator raises an error that names it.  (The
-- frechet_ext side of this is test/sql/security.sql.)
SET client_min_messages = warning;
CREATE SCHEMA gis;
CREATE EXTENSION postgis SCHEMA gis;
CREATE SCHEMA app;
CREATE FUNCTION app.lookalike_called(what text) RETURNS void LANGUAGE plpgsql
AS $$BEGIN RAISE EXCEPTION 'look-alike % called', what; END$$;

-- What a clean install answers, for comparison.
CREATE EXTENSION frechet_ext_postgis SCHEMA app;
CREATE TEMP TABLE pairs (kind text, stmt text);
INSERT INTO pairs VALUES
	('geometry', $$SELECT app.frechet_geojson(gis.st_geomfromtext('LINESTRING(0 0,10 0,20 5)', 3857), gis.st_geomfromtext('LINESTRING(0 1,12 3,20 4)', 3857), 2.0)::text$$),
	('geometry 0', $$SELECT app.frechet_geojson(gis.st_geomfromtext('LINESTRING(0 0,10 0)'), gis.st_geomfromtext('LINESTRING(0 1,10 2)'))::text$$),
	('geometry_geojson', $$SELECT app.frechet_geometry_geojson(gis.st_geomfromtext('LINESTRING(0 0,10 0)', 3857))::text$$),
	('geography', $$SELECT app.frechet_geojson(gis.st_geogfromtext('LINESTRING(0 0,0.1 0,0.2 0.05)'), gis.st_geogfromtext('LINESTRING(0 0.01,0.12 0.03,0.2 0.04)'), 1000.0)::text$$),
	('distance', $$SELECT app.frechet_distance(gis.st_geomfromtext('LINESTRING(0 0,10 0)'), gis.st_geomfromtext('LINESTRING(0 1,10 2)'))::text$$),
	('matching', $$SELECT array_agg(m::text)::text FROM app.frechet_matching(gis.st_geogfromtext('LINESTRING(0 0,0.1 0)'), gis.st_geogfromtext('LINESTRING(0 0.01,0.1 0.02)')) AS m$$),
	('simplify', $$SELECT gis.st_astext(app.frechet_simplify(gis.st_geomfromtext('LINESTRING(0 0,1 0.1,2 0,3 0.1,4 0)'), 0.5))$$);
CREATE TEMP TABLE clean AS SELECT kind, NULL::text AS result FROM pairs;
DO $$
DECLARE
	r record;
	res text;
BEGIN
	FOR r IN SELECT * FROM pairs LOOP
		EXECUTE r.stmt INTO res;
		UPDATE clean SET result = res WHERE kind = r.kind;
	END LOOP;
END $$;
SELECT count(*) AS clean_results FROM clean WHERE result IS NOT NULL;
DROP EXTENSION frechet_ext_postgis;

-- The plant: a look-alike in app of every PostGIS function with the same
-- name and argument types, and of every PostGIS operator.
\set ECHO none
SELECT format('CREATE FUNCTION app.%I(%s) RETURNS %s%s LANGUAGE plpgsql AS %L',
              p.proname,
              (SELECT coalesce(string_agg(format_type(t, NULL), ', ' ORDER BY k), '')
               FROM unnest(p.proargtypes::oid[]) WITH ORDINALITY AS a(t, k)),
              CASE WHEN p.proretset THEN 'SETOF ' ELSE '' END,
              format_type(p.prorettype, NULL),
              format('BEGIN PERFORM app.lookalike_called(%L); END', p.oid::regprocedure::text))
FROM pg_proc p
WHERE p.pronamespace = 'gis'::regnamespace AND p.prokind = 'f'
  AND p.prorettype NOT IN ('internal'::regtype, 'cstring'::regtype, 'trigger'::regtype,
                           'event_trigger'::regtype, 'void'::regtype)
  AND NOT EXISTS (SELECT 1 FROM unnest(p.proargtypes::oid[]) AS a(t)
                  JOIN pg_type y ON y.oid = a.t WHERE y.typtype = 'p')
  AND (SELECT typtype FROM pg_type WHERE oid = p.prorettype) <> 'p'
\gexec
SELECT format('CREATE FUNCTION app.op_impl_%s(%s, %s) RETURNS %s LANGUAGE plpgsql AS %L; ',
              o.oid, format_type(o.oprleft, NULL), format_type(o.oprright, NULL), format_type(o.oprresult, NULL),
              format('BEGIN PERFORM app.lookalike_called(%L); END', o.oid::regoperator::text))
       || format('CREATE OPERATOR app.%s (LEFTARG = %s, RIGHTARG = %s, FUNCTION = app.op_impl_%s)',
                 o.oprname, format_type(o.oprleft, NULL), format_type(o.oprright, NULL), o.oid)
FROM pg_operator o
WHERE o.oprnamespace = 'gis'::regnamespace AND o.oprleft <> 0 AND o.oprright <> 0
\gexec
\set ECHO all
SELECT count(*) > 500 AS functions_planted FROM pg_proc WHERE pronamespace = 'app'::regnamespace;
SELECT count(*) > 20 AS operators_planted FROM pg_operator WHERE oprnamespace = 'app'::regnamespace;
-- the plant is live: a call of app.st_srid reaches it
SELECT app.st_srid(gis.st_geomfromtext('POINT(0 0)'));

-- Members that depend on a function or operator of app that is not a
-- member (bound to a look-alike), and calls whose answer differs from the
-- clean install's, under the ordinary search_path and under the installer's.
CREATE TEMP VIEW bound_to_lookalikes AS
SELECT pg_describe_object(d.classid, d.objid, 0) AS member,
       pg_describe_object(d.refclassid, d.refobjid, 0) AS bound_to_lookalike
FROM pg_depend d
JOIN pg_depend m ON m.classid = d.classid AND m.objid = d.objid AND m.deptype = 'e'
                AND m.refobjid = (SELECT oid FROM pg_extension WHERE extname = 'frechet_ext_postgis')
WHERE d.deptype = 'n'
  AND ((d.refclassid = 'pg_proc'::regclass
        AND d.refobjid IN (SELECT oid FROM pg_proc WHERE pronamespace = 'app'::regnamespace))
    OR (d.refclassid = 'pg_operator'::regclass
        AND d.refobjid IN (SELECT oid FROM pg_operator WHERE oprnamespace = 'app'::regnamespace)))
  AND NOT EXISTS (SELECT 1 FROM pg_depend e WHERE e.classid = d.refclassid AND e.objid = d.refobjid
                  AND e.deptype = 'e');
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
CREATE TEMP VIEW differing AS
SELECT p.kind, pg_temp.try(p.stmt) AS planted, c.result AS clean
FROM pg_temp.pairs p JOIN pg_temp.clean c USING (kind)
WHERE pg_temp.try(p.stmt) IS DISTINCT FROM c.result;

-- A fresh install, with the script's usual search_path (app first, then
-- the schemas of frechet_ext and postgis).
CREATE EXTENSION frechet_ext_postgis SCHEMA app;
SELECT * FROM bound_to_lookalikes ORDER BY 1, 2;
SELECT * FROM differing ORDER BY 1;
SET search_path = app, public, gis;
SELECT * FROM pg_temp.differing ORDER BY 1;
RESET search_path;
DROP EXTENSION frechet_ext_postgis;

-- The release that bound look-alikes, then the update: it rebinds them.
CREATE EXTENSION frechet_ext_postgis VERSION '0.1' SCHEMA app;
SELECT count(*) > 0 AS old_release_bound_lookalikes FROM bound_to_lookalikes;
ALTER EXTENSION frechet_ext_postgis UPDATE;
SELECT * FROM bound_to_lookalikes ORDER BY 1, 2;
SELECT * FROM differing ORDER BY 1;
SET search_path = app, public, gis;
SELECT * FROM pg_temp.differing ORDER BY 1;
RESET search_path;

DROP EXTENSION frechet_ext_postgis;
DROP SCHEMA app CASCADE;
DROP EXTENSION postgis;
DROP SCHEMA gis;
