-- Security of the extension's objects, after PostgreSQL's "Security
-- Considerations for Extension Scripts" (documentation, section 38.17):
-- no SECURITY DEFINER; plain CREATE (never OR REPLACE), so that an object
-- planted beforehand makes CREATE EXTENSION fail instead of being adopted;
-- and every function works unchanged under a hostile search_path.
-- Everything is generated from the extension's members, so new functions
-- and operators are covered without editing this file; a new argument type
-- needs one sample row below.  The generated statements are not echoed, so
-- this file's output does not change as members are added.
-- (The static side, unqualified names in sql/*.sql, is checked by
-- test/reliability/lint_sql.pl; PostGIS look-alikes planted in the target
-- schema are test/sql/postgis_security.sql.)
SET client_min_messages = warning;

CREATE TEMP TABLE members AS
SELECT d.classid, d.objid, pg_describe_object(d.classid, d.objid, 0) AS what
FROM pg_depend d
JOIN pg_extension e ON d.refclassid = 'pg_extension'::regclass AND d.refobjid = e.oid
WHERE e.extname = 'frechet_ext' AND d.deptype = 'e';

-- Member functions SQL can call: no pseudo-type argument (internal,
-- cstring), no internal or cstring result, not a type's I/O function.
CREATE TEMP VIEW callable_functions AS
SELECT p.*
FROM members m JOIN pg_proc p ON m.classid = 'pg_proc'::regclass AND p.oid = m.objid
WHERE p.prokind = 'f'
  AND NOT EXISTS (SELECT 1 FROM unnest(p.proargtypes::oid[]) AS a(typ)
                  JOIN pg_type t ON t.oid = a.typ WHERE t.typtype = 'p')
  AND p.prorettype NOT IN ('internal'::regtype, 'cstring'::regtype)
  AND NOT EXISTS (SELECT 1 FROM pg_type t
                  WHERE p.oid IN (t.typinput, t.typoutput, t.typreceive, t.typsend,
                                  t.typmodin, t.typmodout, t.typanalyze));

-- No SECURITY DEFINER function; every function and operator has a comment.
SELECT count(*) > 0 AS has_functions,
       count(*) FILTER (WHERE p.prosecdef) AS security_definer
FROM members m JOIN pg_proc p ON m.classid = 'pg_proc'::regclass AND p.oid = m.objid;
SELECT what AS without_comment
FROM members
WHERE classid IN ('pg_proc'::regclass, 'pg_operator'::regclass)
  AND obj_description(objid, classid::regclass::text) IS NULL
ORDER BY what;

-- Sample arguments by type: argument k of a type gets sample k of it.
CREATE TEMP TABLE samples (typ text, k int, val text);
INSERT INTO samples VALUES
	('point[]', 1, $$'{"(0,0)","(4,3)","(8,0)","(12,1)"}'::pg_catalog.point[]$$),
	('point[]', 2, $$'{"(0,1)","(5,5)","(6,-1)","(12,0)"}'::pg_catalog.point[]$$),
	('double precision', 1, $$1.0::pg_catalog.float8$$),
	('double precision', 2, $$1.0::pg_catalog.float8$$),
	('jsonb', 1, $$'{"trip_id": 17}'::pg_catalog.jsonb$$),
	('integer', 1, $$1$$),
	('integer', 2, $$3$$),
	('bigint', 1, $$9::pg_catalog.int8$$),
	('boolean', 1, $$false$$),
	('frechet_key', 1, $$'start=(0,1)..(0,1) end=(12,0)..(12,0) min=(0,0)..(0,0) max=(12,5)..(12,5) reach=4'::public.frechet_key$$);

-- One statement a member function or operator, calling it schema-qualified.
CREATE TEMP TABLE calls AS
WITH args AS (
	SELECT p.oid, a.ord, s.val
	FROM callable_functions p
	CROSS JOIN LATERAL unnest(p.proargtypes::oid[]) WITH ORDINALITY AS a(typ, ord)
	LEFT JOIN LATERAL (
		SELECT count(*) + 1 AS k
		FROM unnest(p.proargtypes::oid[]) WITH ORDINALITY AS b(typ, ord)
		WHERE b.typ = a.typ AND b.ord < a.ord) r ON true
	LEFT JOIN samples s ON s.typ = format_type(a.typ, NULL) AND s.k = r.k)
SELECT p.oid::regprocedure::text AS member,
       format('SELECT pg_catalog.array_agg(x::text ORDER BY x::text) FROM %I.%I(%s) AS x',
              n.nspname, p.proname, string_agg(args.val, ', ' ORDER BY args.ord)) AS stmt,
       bool_and(args.val IS NOT NULL) AS sampled
FROM args JOIN pg_proc p ON p.oid = args.oid JOIN pg_namespace n ON n.oid = p.pronamespace
GROUP BY p.oid, n.nspname, p.proname
UNION ALL
SELECT o.oid::regoperator::text,
       format('SELECT (%s OPERATOR(%I.%s) %s)::text', l.val, n.nspname, o.oprname, r.val),
       l.val IS NOT NULL AND r.val IS NOT NULL
FROM members m
JOIN pg_operator o ON m.classid = 'pg_operator'::regclass AND o.oid = m.objid
JOIN pg_namespace n ON n.oid = o.oprnamespace
LEFT JOIN samples l ON l.typ = format_type(o.oprleft, NULL) AND l.k = 1
LEFT JOIN samples r ON r.typ = format_type(o.oprright, NULL)
                   AND r.k = CASE WHEN o.oprright = o.oprleft THEN 2 ELSE 1 END;

-- Members no sample can call (add a sample row for their argument types).
SELECT member AS not_sampled FROM calls WHERE NOT sampled ORDER BY member;

-- The hostile schema: a look-alike of every member function and operator,
-- and of catalog functions and operators that SQL wrappers commonly use,
-- each raising an error when called.
\set ECHO none
CREATE SCHEMA hostile;
CREATE FUNCTION hostile.trap() RETURNS void LANGUAGE plpgsql
AS $$BEGIN RAISE EXCEPTION 'hostile look-alike called'; END$$;
SELECT format('CREATE FUNCTION hostile.%I(%s) RETURNS %s LANGUAGE plpgsql AS %L',
              p.proname, pg_get_function_arguments(p.oid), pg_get_function_result(p.oid),
              'BEGIN PERFORM hostile.trap(); END')
FROM callable_functions p
\gexec
SELECT format('CREATE FUNCTION hostile.op_%s(%s, %s) RETURNS %s LANGUAGE plpgsql AS %L',
              o.oid, o.oprleft::regtype, o.oprright::regtype, o.oprresult::regtype,
              'BEGIN PERFORM hostile.trap(); END')
       || format('; CREATE OPERATOR hostile.%s (LEFTARG = %s, RIGHTARG = %s, FUNCTION = hostile.op_%s)',
                 o.oprname, o.oprleft::regtype, o.oprright::regtype, o.oid)
FROM members m JOIN pg_operator o ON m.classid = 'pg_operator'::regclass AND o.oid = m.objid
\gexec
CREATE TEMP TABLE catalog_lookalikes (name text, args text, result text);
INSERT INTO catalog_lookalikes VALUES
	('abs', 'float8', 'float8'), ('sqrt', 'float8', 'float8'),
	('point', 'float8, float8', 'point'),
	('array_length', 'anyarray, int4', 'int4'), ('array_ndims', 'anyarray', 'int4'),
	('array_lower', 'anyarray, int4', 'int4'), ('array_upper', 'anyarray, int4', 'int4'),
	('cardinality', 'anyarray', 'int4'), ('array_cat', 'anycompatiblearray, anycompatiblearray', 'anycompatiblearray'),
	('op_ff_f', 'float8, float8', 'float8'), ('op_ff_b', 'float8, float8', 'bool'),
	('op_ii_i', 'int4, int4', 'int4'), ('op_ii_b', 'int4, int4', 'bool'),
	('op_pp_f', 'point, point', 'float8');
SELECT format('CREATE FUNCTION hostile.%I(%s) RETURNS %s LANGUAGE plpgsql AS %L',
              name, args, result, 'BEGIN PERFORM hostile.trap(); END')
FROM catalog_lookalikes
\gexec
SELECT format('CREATE OPERATOR hostile.%s (LEFTARG = %s, RIGHTARG = %s, FUNCTION = hostile.%s)',
              op, l, r, f)
FROM (VALUES ('+', 'float8', 'float8', 'op_ff_f'), ('-', 'float8', 'float8', 'op_ff_f'),
             ('*', 'float8', 'float8', 'op_ff_f'), ('/', 'float8', 'float8', 'op_ff_f'),
             ('=', 'float8', 'float8', 'op_ff_b'), ('<', 'float8', 'float8', 'op_ff_b'),
             ('<=', 'float8', 'float8', 'op_ff_b'), ('>', 'float8', 'float8', 'op_ff_b'),
             ('>=', 'float8', 'float8', 'op_ff_b'), ('+', 'int4', 'int4', 'op_ii_i'),
             ('-', 'int4', 'int4', 'op_ii_i'), ('=', 'int4', 'int4', 'op_ii_b'),
             ('<', 'int4', 'int4', 'op_ii_b'), ('<->', 'point', 'point', 'op_pp_f')) AS v(op, l, r, f)
\gexec

-- Results under the ordinary search_path, then under the hostile one (and
-- under an empty one); all must be the same.
CREATE TEMP TABLE results (path text, member text, result text);
SELECT format('INSERT INTO pg_temp.results VALUES (%L, %L, (%s))', 'ordinary', member, stmt)
FROM calls WHERE sampled
\gexec
SET search_path = hostile, pg_catalog, public;
SELECT pg_catalog.format('INSERT INTO pg_temp.results VALUES (%L, %L, (%s))', 'hostile', member, stmt)
FROM pg_temp.calls WHERE sampled
\gexec
SET search_path = '';
SELECT pg_catalog.format('INSERT INTO pg_temp.results VALUES (%L, %L, (%s))', 'empty', member, stmt)
FROM pg_temp.calls WHERE sampled
\gexec
RESET search_path;
\set ECHO all

SELECT count(DISTINCT member) > 0 AS members_called,
       count(*) FILTER (WHERE result IS NOT NULL) > 0 AS some_results
FROM results;
SELECT o.member, h.path, o.result AS ordinary, h.result AS other
FROM results o JOIN results h ON h.member = o.member AND h.path <> 'ordinary'
WHERE o.path = 'ordinary' AND h.result IS DISTINCT FROM o.result
ORDER BY 1, 2;

-- The trap is live: unqualified calls under the hostile path reach it.
CREATE FUNCTION pg_temp.try(stmt text) RETURNS text
LANGUAGE plpgsql AS $$
BEGIN
	EXECUTE stmt;
	RETURN 'ok';
EXCEPTION WHEN OTHERS THEN
	RETURN SQLSTATE || ': ' || SQLERRM;
END $$;
SET search_path = hostile, pg_catalog, public;
SELECT pg_temp.try($$SELECT frechet_distance('{"(0,0)"}'::point[], '{"(1,1)"}'::point[])$$) AS unqualified_call,
       pg_temp.try($$SELECT 1.5::float8 + 2.5::float8$$) AS unqualified_operator;
RESET search_path;
DROP SCHEMA hostile CASCADE;

-- An object planted before CREATE EXTENSION, with the name and signature of
-- a member, makes the install fail (42723 duplicate_function, 42710
-- duplicate_object for a type) rather than be adopted: for each member
-- type, and each member function and operator whose types exist without
-- the extension, in turn.  (With OR REPLACE the planted object would be
-- replaced, or, on PostgreSQL releases since August 2022, the install
-- would fail with another SQLSTATE; either way a row below.)
CREATE TEMP TABLE member_types AS
SELECT objid AS typ FROM members WHERE classid = 'pg_type'::regclass;
CREATE TEMP TABLE planted AS
SELECT what, '42723' AS expected,
       format('CREATE FUNCTION trap.%I(%s) RETURNS %s LANGUAGE plpgsql AS %L',
              p.proname, pg_get_function_identity_arguments(p.oid),
              pg_get_function_result(p.oid), 'BEGIN RAISE EXCEPTION ''planted''; END') AS plant
FROM callable_functions p JOIN members m ON m.classid = 'pg_proc'::regclass AND m.objid = p.oid
WHERE NOT EXISTS (SELECT 1 FROM unnest(coalesce(p.proallargtypes, p.proargtypes::oid[]) || p.prorettype) AS a(typ)
                  WHERE a.typ IN (SELECT typ FROM member_types))
UNION ALL
SELECT what, '42723',
       format('CREATE FUNCTION trap.op_impl(%s, %s) RETURNS %s LANGUAGE plpgsql AS %L; ',
              o.oprleft::regtype, o.oprright::regtype, o.oprresult::regtype, 'BEGIN RAISE EXCEPTION ''planted''; END')
       || format('CREATE OPERATOR trap.%s (LEFTARG = %s, RIGHTARG = %s, FUNCTION = trap.op_impl)',
                 o.oprname, o.oprleft::regtype, o.oprright::regtype)
FROM members m JOIN pg_operator o ON m.classid = 'pg_operator'::regclass AND o.oid = m.objid
WHERE o.oprleft NOT IN (SELECT typ FROM member_types) AND o.oprright NOT IN (SELECT typ FROM member_types)
UNION ALL
SELECT what, '42710', format('CREATE TYPE trap.%I', t.typname)
FROM members m JOIN pg_type t ON m.classid = 'pg_type'::regclass AND t.oid = m.objid
WHERE t.typtype <> 'c';
DROP EXTENSION frechet_ext;
CREATE TEMP TABLE plant_outcome (what text, expected text, outcome text);
DO $$
DECLARE
	r record;
	state text;
BEGIN
	FOR r IN SELECT * FROM planted LOOP
		CREATE SCHEMA trap;
		EXECUTE r.plant;
		BEGIN
			CREATE EXTENSION frechet_ext SCHEMA trap;
			state := 'installed';
			DROP EXTENSION frechet_ext;
		EXCEPTION WHEN OTHERS THEN
			state := SQLSTATE;
		END;
		INSERT INTO plant_outcome VALUES (r.what, r.expected, state);
		DROP SCHEMA trap CASCADE;
	END LOOP;
END $$;
SELECT count(*) > 0 AS members_planted FROM plant_outcome;
SELECT what AS not_blocked, expected, outcome FROM plant_outcome WHERE outcome <> expected ORDER BY what;
CREATE EXTENSION frechet_ext;
