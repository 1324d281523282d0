-- The bad-input matrix of ../shared/PRODUCT.md ("What bad input gets"),
-- generated for every member function and operator of the extension: each
-- bad value is put in each argument of its type, the other arguments get
-- good values, and the outcome must be the SQLSTATE that README.md
-- documents.  New functions are covered without editing this file; a new
-- argument type needs its rows in good_values and bad_values.  Only
-- mismatches are printed, so the output does not change as members are
-- added.  (bad_input.sql shows the messages and details of the same cases
-- for the point[] functions.)
SET client_min_messages = warning;

-- The outcome of a statement: 'ok', 'null' (NULL or no rows) or the SQLSTATE.
-- query_canceled must be named: WHEN OTHERS does not catch it.
CREATE FUNCTION pg_temp.outcome(stmt text) RETURNS text
LANGUAGE plpgsql AS $$
DECLARE
	r text;
BEGIN
	EXECUTE stmt INTO r;
	RETURN CASE WHEN r IS NULL THEN 'null' ELSE 'ok' END;
EXCEPTION
	WHEN query_canceled THEN
		RETURN SQLSTATE;
	WHEN OTHERS THEN
		RETURN SQLSTATE;
END $$;

CREATE TEMP TABLE members AS
SELECT d.classid, d.objid
FROM pg_depend d
JOIN pg_extension e ON d.refclassid = 'pg_extension'::regclass AND d.refobjid = e.oid
WHERE e.extname = 'frechet_ext' AND d.deptype = 'e';

-- Good values by type (argument k of a type gets value k; an argument named
-- epsilon gets the epsilon row).
CREATE TEMP TABLE good_values (typ text, k int, val text);
INSERT INTO good_values VALUES
	('point[]', 1, $$'{"(0,0)","(4,3)","(8,0)","(12,1)"}'::point[]$$),
	('point[]', 2, $$'{"(0,1)","(5,5)","(6,-1)","(12,0)"}'::point[]$$),
	('double precision', 1, $$1.0::float8$$),
	('double precision', 2, $$1.0::float8$$),
	('epsilon', 1, $$4.0::float8$$),
	('jsonb', 1, $$'{"trip_id": 17}'::jsonb$$),
	('max_leashes', 1, $$5$$),
	('integer', 1, $$2$$),
	('bigint', 1, $$9::int8$$),
	('boolean', 1, $$false$$),
	('frechet_key', 1, $$frechet_reach('{"(0,1)","(5,5)","(12,0)"}'::point[], 4)$$);

-- Bad (and borderline good) values: expected is a SQLSTATE, 'ok' (no
-- error: a result, or no rows from a set-returning function), or 'strict'
-- (NULL from a STRICT function; from a non-STRICT one, anything but an
-- internal error).
CREATE TEMP TABLE bad_values (typ text, label text, val text, expected text);
INSERT INTO bad_values VALUES
	('point[]', 'empty array', $$'{}'::point[]$$, '22023'),
	('point[]', 'NULL element', $$'{"(0,0)",NULL,"(1,1)"}'::point[]$$, '22004'),
	('point[]', 'NULL element, lower bound 5', $$'[5:6]={"(0,0)",NULL}'::point[]$$, '22004'),
	('point[]', 'only NULL elements', $$'{NULL,NULL}'::point[]$$, '22004'),
	('point[]', 'two dimensions', $$'{{"(0,0)","(1,1)"},{"(2,2)","(3,3)"}}'::point[]$$, '2202E'),
	('point[]', 'three dimensions', $$'{{{"(0,0)"}}}'::point[]$$, '2202E'),
	('point[]', 'NaN', $$'{"(0,0)","(NaN,1)"}'::point[]$$, '22000'),
	('point[]', '+Infinity', $$'{"(0,0)","(1,Infinity)"}'::point[]$$, '22000'),
	('point[]', '-Infinity', $$'{"(-Infinity,0)","(1,1)"}'::point[]$$, '22000'),
	('point[]', 'above 1e150', $$'{"(0,0)","(1e200,1)"}'::point[]$$, '22003'),
	('point[]', 'just above 1e150', $$'{"(0,0)","(0,1.0000000000000001e150)"}'::point[]$$, '22003'),
	('point[]', 'at 1e150', $$'{"(-1e150,0)","(1e150,1)"}'::point[]$$, 'ok'),
	-- a nonzero coordinate below 2^-450 beside unit ones: squares of its
	-- differences underflow, so every function that measures distances
	-- (of two curves, or simplification) refuses it (22003); functions that
	-- only summarise or cut one track (keys, pieces) accept it
	('point[]', 'subnormal', $$'{"(0,0)","(5e-324,1)"}'::point[]$$, '22003 for pairs'),
	('point[]', 'one point', $$'{"(3,4)"}'::point[]$$, 'ok'),
	('point[]', 'repeated points', $$'{"(0,0)","(0,0)","(12,1)","(12,1)"}'::point[]$$, 'ok'),
	('point[]', 'NULL array', $$NULL::point[]$$, 'strict'),
	('epsilon', 'negative', $$-1::float8$$, '22023'),
	('epsilon', 'NaN', $$'NaN'::float8$$, '22023'),
	('epsilon', '-Infinity', $$'-Infinity'::float8$$, '22023'),
	('epsilon', '+Infinity', $$'Infinity'::float8$$, 'ok'),
	('epsilon', 'zero', $$0::float8$$, 'ok'),
	('epsilon', 'minus zero', $$'-0'::float8$$, 'ok'),
	('epsilon', 'NULL', $$NULL::float8$$, 'strict'),
	-- the GeoJSON functions' caller properties and leash cap
	('jsonb', 'array', $$'[1, 2]'::jsonb$$, '22023'),
	('jsonb', 'scalar', $$'"trip 17"'::jsonb$$, '22023'),
	('jsonb', 'NULL', $$NULL::jsonb$$, 'strict'),
	('max_leashes', 'zero', $$0$$, '22023'),
	('max_leashes', 'negative', $$-3$$, '22023'),
	('max_leashes', 'NULL', $$NULL::int4$$, 'strict');

-- Call templates: a function in FROM (scalar or set-returning), an operator
-- between its operands; %s are the arguments in order.
CREATE TEMP TABLE callables AS
SELECT p.oid::regprocedure::text AS member, p.proisstrict AS strict, p.proretset AS retset,
       format('SELECT pg_catalog.array_agg(x::text) FILTER (WHERE x::text IS NOT NULL) FROM %I.%I(%s) AS x',
              n.nspname, p.proname,
              (SELECT string_agg('%s', ', ') FROM unnest(p.proargtypes::oid[]))) AS template,
       ARRAY(SELECT CASE WHEN coalesce(p.proargnames[a.ord], '') IN ('epsilon', 'max_leashes') THEN p.proargnames[a.ord]
                         ELSE format_type(a.typ, NULL) END
             FROM unnest(p.proargtypes::oid[]) WITH ORDINALITY AS a(typ, ord) ORDER BY a.ord) AS argtypes
FROM members m JOIN pg_proc p ON m.classid = 'pg_proc'::regclass AND p.oid = m.objid
JOIN pg_namespace n ON n.oid = p.pronamespace
WHERE p.prokind = 'f' AND p.pronargs > 0
  -- what SQL can call: no pseudo-type argument (internal, cstring), no
  -- internal or cstring result, not a type's I/O function
  AND NOT EXISTS (SELECT 1 FROM unnest(p.proargtypes::oid[]) AS a(typ)
                  JOIN pg_type t ON t.oid = a.typ WHERE t.typtype = 'p')
  AND p.prorettype NOT IN ('internal'::regtype, 'cstring'::regtype)
  AND NOT EXISTS (SELECT 1 FROM pg_type t
                  WHERE p.oid IN (t.typinput, t.typoutput, t.typreceive, t.typsend,
                                  t.typmodin, t.typmodout, t.typanalyze))
UNION ALL
SELECT o.oid::regoperator::text, f.proisstrict, false,
       format('SELECT ((%%s) OPERATOR(%I.%s) (%%s))::text', n.nspname, o.oprname),
       ARRAY[format_type(o.oprleft, NULL), format_type(o.oprright, NULL)]
FROM members m JOIN pg_operator o ON m.classid = 'pg_operator'::regclass AND o.oid = m.objid
JOIN pg_namespace n ON n.oid = o.oprnamespace
JOIN pg_proc f ON f.oid = o.oprcode;

-- Good arguments of each member: value k of its type for its k-th argument of that type.
CREATE TEMP TABLE good_args AS
SELECT c.member, a.ord, g.val
FROM callables c
CROSS JOIN LATERAL unnest(c.argtypes) WITH ORDINALITY AS a(typ, ord)
LEFT JOIN good_values g ON g.typ = a.typ
     AND g.k = (SELECT count(*) FROM unnest(c.argtypes) WITH ORDINALITY AS b(typ, ord)
                WHERE b.typ = a.typ AND b.ord <= a.ord);

-- Members with an argument type that has no good value (add rows above).
SELECT DISTINCT member AS no_good_value FROM good_args WHERE val IS NULL ORDER BY 1;

-- Every member with good arguments gives a result (or, set-returning, no rows).
SELECT c.member, pg_temp.outcome(format(c.template, VARIADIC array_agg(g.val ORDER BY g.ord))) AS good_call
FROM callables c JOIN good_args g USING (member)
GROUP BY c.member, c.template, c.retset
HAVING pg_temp.outcome(format(c.template, VARIADIC array_agg(g.val ORDER BY g.ord)))
       NOT IN ('ok', CASE WHEN c.retset OR c.member LIKE 'frechet_track_check(%' THEN 'null' ELSE 'ok' END)
ORDER BY 1;

-- Each bad value in each argument of its type.
CREATE TEMP TABLE cases AS
SELECT c.member, c.strict, c.retset, a.ord, b.label, b.expected,
       format(c.template, VARIADIC array_agg(CASE WHEN g.ord = a.ord THEN b.val ELSE g.val END ORDER BY g.ord)) AS stmt
FROM callables c
CROSS JOIN LATERAL unnest(c.argtypes) WITH ORDINALITY AS a(typ, ord)
JOIN bad_values b ON b.typ = a.typ
JOIN good_args g ON g.member = c.member
GROUP BY c.member, c.strict, c.retset, a.ord, b.label, b.expected, c.template;
ALTER TABLE cases ADD COLUMN outcome text;
UPDATE cases SET outcome = pg_temp.outcome(stmt);

SELECT count(*) > 0 AS cases_run, count(DISTINCT member) > 0 AS members_covered FROM cases;
SELECT member, ord AS argument, label, expected, outcome
FROM cases
WHERE NOT (outcome = expected
           OR (expected = '22003 for pairs'
               AND outcome = CASE WHEN member LIKE '%point[],point[]%' OR member LIKE 'frechet_simplify(%'
                                   THEN '22003' ELSE 'ok' END)
           OR (expected = 'ok' AND outcome = 'null' AND retset)
           OR (expected = 'strict' AND strict AND outcome = 'null')
           OR (expected = 'strict' AND NOT strict AND outcome NOT IN ('XX000', 'XX001'))
           -- frechet_track_check raises nothing: a text for what the others
           -- reject, NULL for what they accept (the range of a pair is not
           -- the track's: '22003 for pairs')
           OR (member LIKE 'frechet_track_check(%'
               AND outcome = CASE WHEN expected IN ('ok', '22003 for pairs') THEN 'null' ELSE 'ok' END))
ORDER BY 1, 2, 3;

-- Members whose work is linear in the input and needs no scratch memory
-- (the index summaries, track pieces and their GeoJSON, the track check, the ping
-- excursions (a linear scan with a bounded frontier), and
-- frechet_simplify's O(n log n) greedy): they
-- neither hit the memory limit nor run long, so the two checks below leave
-- them out.  frechet_at_most and frechet_passes are left out of the memory
-- check only: when their cheap verdicts settle the answer they allocate
-- nothing (identical curves here).
CREATE FUNCTION pg_temp.linear_members() RETURNS text[] LANGUAGE sql AS $$
	SELECT pg_catalog.array_agg(c.member) FROM callables c
	WHERE c.member LIKE '|~~%' OR c.member LIKE 'frechet_reach%' OR c.member LIKE 'frechet_track_key%'
	   OR c.member LIKE 'frechet_within_reach%' OR c.member LIKE 'frechet_pings_within_reach%'
	   OR c.member LIKE 'frechet_passes_within_reach%'
	   OR c.member LIKE 'frechet_pings_excursions%'
	   OR c.member LIKE 'frechet_simplify%'
	   OR c.member LIKE 'frechet_track_piece%' OR c.member LIKE 'frechet_track_geojson%'
	   OR c.member LIKE 'frechet_track_check%'
$$;

-- Inputs needing more scratch memory than frechet_ext.max_memory allows:
-- 54000, raised before allocating, for every function of two curves.
SET frechet_ext.max_memory = '64kB';
SELECT member, outcome
FROM (SELECT c.member,
             pg_temp.outcome(format(c.template, VARIADIC array_agg(
                 CASE WHEN g.val LIKE '%point[]' THEN 'array(SELECT point(i, (i % 3) * 1.0) FROM generate_series(1, 4000) i)'
                      ELSE g.val END ORDER BY g.ord))) AS outcome
      FROM callables c JOIN good_args g USING (member)
      WHERE 'point[]' = ANY (c.argtypes) AND NOT c.member = ANY (pg_temp.linear_members())
      GROUP BY c.member, c.template) s
WHERE outcome <> '54000' AND member NOT LIKE 'frechet_at_most%' AND member NOT LIKE 'frechet_passes(%'
ORDER BY 1;
RESET frechet_ext.max_memory;

-- statement_timeout stops every function of two curves on a long input
-- (scattered points that keep the free space open but full of holes, with
-- two far points visited in opposite orders, so nothing prunes),
-- unless the function refuses it at once for its memory limit (54000).
-- One statement a call, so that each gets its own timeout.
CREATE TEMP TABLE timeout_outcome (member text, outcome text);
SET statement_timeout = '300ms';
\set ECHO none
SELECT format('INSERT INTO timeout_outcome VALUES (%L, pg_temp.outcome(%L))', c.member,
              format(c.template, VARIADIC array_agg(
                  CASE WHEN g.val LIKE '%point[]' AND g.ord = 1
                       THEN $$'{"(0,0)"}'::point[] || array(SELECT point(cos(i * 2.4), sin(i * 1.7)) FROM generate_series(1, 30000) i) || '{"(0,20)","(20,20)","(10,0)"}'::point[]$$
                       WHEN g.val LIKE '%point[]'
                       THEN $$'{"(0,0)"}'::point[] || array(SELECT point(cos(i * 2.4 + 1), sin(i * 1.7 + 2)) FROM generate_series(1, 30000) i) || '{"(20,20)","(0,20)","(10,0)"}'::point[]$$
                       WHEN g.val LIKE '%float8' THEN '1.5::float8'
                       ELSE g.val END ORDER BY g.ord)))
FROM callables c JOIN good_args g USING (member)
WHERE 'point[]' = ANY (c.argtypes) AND NOT c.member = ANY (pg_temp.linear_members())
GROUP BY c.member, c.template
\gexec
\set ECHO all
RESET statement_timeout;
SELECT count(*) > 0 AS timeouts_run FROM timeout_outcome;
SELECT member, outcome FROM timeout_outcome WHERE outcome NOT IN ('57014', '54000') ORDER BY 1;
SELECT 'still connected' AS session;
