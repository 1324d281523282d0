-- Bad input: every case gets a clean ERROR with its SQLSTATE, and the
-- session goes on.  try() runs a statement and reports the outcome.
CREATE FUNCTION pg_temp.try(stmt text) RETURNS text
LANGUAGE plpgsql AS $$
DECLARE
	state text;
	msg text;
	detail text;
	r text;
BEGIN
	EXECUTE stmt INTO r;
	RETURN 'ok: ' || coalesce(r, 'NULL');
EXCEPTION WHEN OTHERS THEN
	GET STACKED DIAGNOSTICS state = RETURNED_SQLSTATE, msg = MESSAGE_TEXT, detail = PG_EXCEPTION_DETAIL;
	RETURN state || ': ' || msg || coalesce(' / ' || nullif(detail, ''), '');
END $$;

SELECT fn, label, pg_temp.try(format(f, a, b)) AS outcome
FROM (VALUES ('distance', 'SELECT frechet_distance(%s, %s)'),
             ('at_most', 'SELECT frechet_at_most(%s, %s, 1)'),
             ('discrete', 'SELECT discrete_frechet_distance(%s, %s)'),
             ('matching', 'SELECT count(*) FROM frechet_matching(%s, %s)'),
             ('bottleneck', 'SELECT leash FROM frechet_bottleneck(%s, %s)'),
             ('partial', 'SELECT frechet_partial_distance(%s, %s)'),
             ('partial_match', 'SELECT count(*) FROM frechet_partial_match(%s, %s, 1)'),
             ('excursions', 'SELECT count(*) FROM frechet_excursions(%s, %s, 1)')) AS fns(fn, f),
     (VALUES (1, 'empty first', $$'{}'::point[]$$, $$'{"(0,0)"}'::point[]$$),
             (2, 'empty second', $$'{"(0,0)"}'::point[]$$, $$'{}'::point[]$$),
             (3, 'null element', $$'{"(0,0)",NULL,"(1,1)"}'::point[]$$, $$'{"(0,0)"}'::point[]$$),
             (4, 'null, lower bound 5', $$'{"(0,0)"}'::point[]$$, $$'[5:6]={"(0,0)",NULL}'::point[]$$),
             (5, 'two-dimensional', $$'{{"(0,0)","(1,1)"},{"(2,2)","(3,3)"}}'::point[]$$, $$'{"(0,0)"}'::point[]$$),
             (6, 'NaN', $$'{"(0,0)","(NaN,1)"}'::point[]$$, $$'{"(0,0)"}'::point[]$$),
             (7, '+Infinity', $$'{"(0,0)"}'::point[]$$, $$'{"(0,0)","(1,Infinity)"}'::point[]$$),
             (8, '-Infinity', $$'{"(0,0)","(-Infinity,1)"}'::point[]$$, $$'{"(0,0)"}'::point[]$$),
             (9, 'huge', $$'{"(0,0)","(1e200,1)"}'::point[]$$, $$'{"(0,0)"}'::point[]$$),
             (10, 'NULL array', $$NULL::point[]$$, $$'{"(0,0)"}'::point[]$$),
             (11, 'one point each', $$'{"(0,0)"}'::point[]$$, $$'{"(3,4)"}'::point[]$$),
             (12, 'repeated points', $$'{"(0,0)","(0,0)","(0,0)"}'::point[]$$, $$'{"(3,4)","(3,4)"}'::point[]$$)) AS args(k, label, a, b)
ORDER BY fn, k;

-- epsilon: negative and NaN are errors; NULL gives NULL or no rows (STRICT),
-- except for frechet_matching, where a NULL epsilon asks for an optimal matching.
SELECT fn, pg_temp.try(format(f, e)) AS outcome
FROM (VALUES (1, 'at_most', $$SELECT frechet_at_most('{"(0,0)"}', '{"(1,1)"}', %s)$$),
             (2, 'matching', $$SELECT count(*) FROM frechet_matching('{"(0,0)"}', '{"(1,1)"}', %s)$$),
             (3, 'partial_match', $$SELECT count(*) FROM frechet_partial_match('{"(0,0)"}', '{"(1,1)"}', %s)$$),
             (4, 'excursions', $$SELECT count(*) FROM frechet_excursions('{"(0,0)"}', '{"(1,1)"}', %s)$$)) AS fns(k, fn, f),
     (VALUES (1, '-1'), (2, $$'NaN'$$), (3, 'NULL'), (4, $$'Infinity'$$)) AS eps(j, e)
ORDER BY k, j;

-- Inputs too large for the memory a call may use: reported before allocating.
SET frechet_ext.max_memory = '64kB';
SELECT pg_temp.try($$SELECT frechet_distance(array(SELECT point(i, 0) FROM generate_series(1, 2000) i),
                                             array(SELECT point(i, 1) FROM generate_series(1, 2000) i))$$) AS too_large;
SELECT pg_temp.try($$SELECT count(*) FROM frechet_matching(array(SELECT point(i, 0) FROM generate_series(1, 2000) i),
                                                            array(SELECT point(i, 1) FROM generate_series(1, 2000) i))$$) AS matching_too_large;
SELECT pg_temp.try($$SELECT count(*) FROM frechet_excursions(array(SELECT point(i, 0) FROM generate_series(1, 2000) i),
                                                              array(SELECT point(i, 9) FROM generate_series(1, 2000) i), 1)$$) AS excursions_too_large;
RESET frechet_ext.max_memory;
SELECT frechet_distance(array(SELECT point(i, 0) FROM generate_series(1, 2000) i),
                        array(SELECT point(i, 1) FROM generate_series(1, 2000) i)) AS fits_by_default;

-- A long computation obeys statement_timeout and the session stays usable:
-- two zig-zags in opposite phase keep nearly all of the free space open.
SET statement_timeout = '300ms';
SELECT frechet_distance(array(SELECT point(i, (i % 2) * 10) FROM generate_series(1, 6000) i),
       '{"(1,10)"}'::point[] || array(SELECT point(i, ((i + 1) % 2) * 10) FROM generate_series(2, 5999) i) || '{"(6000,0)"}'::point[]);
SELECT frechet_at_most(array(SELECT point(i, (i % 2) * 10) FROM generate_series(1, 30000) i),
       '{"(1,10)"}'::point[] || array(SELECT point(i, ((i + 1) % 2) * 10) FROM generate_series(2, 29999) i) || '{"(30000,0)"}'::point[], 6);
SELECT discrete_frechet_distance(array(SELECT point(i, 0) FROM generate_series(1, 60000) i),
                                 array(SELECT point(i, 1) FROM generate_series(1, 60000) i));
SELECT count(*) FROM frechet_matching(array(SELECT point(i, (i % 2) * 10) FROM generate_series(1, 6000) i),
       '{"(1,10)"}'::point[] || array(SELECT point(i, ((i + 1) % 2) * 10) FROM generate_series(2, 5999) i) || '{"(6000,0)"}'::point[]);
SELECT count(*) FROM frechet_excursions(array(SELECT point(i, (i % 2) * 10) FROM generate_series(1, 6000) i),
       '{"(1,10)"}'::point[] || array(SELECT point(i, ((i + 1) % 2) * 10) FROM generate_series(2, 5999) i) || '{"(6000,0)"}'::point[], 4);
SELECT frechet_partial_distance(array(SELECT point(i, (i % 2) * 10) FROM generate_series(1, 6000) i),
       '{"(1,10)"}'::point[] || array(SELECT point(i, ((i + 1) % 2) * 10) FROM generate_series(2, 5999) i) || '{"(6000,0)"}'::point[]);
RESET statement_timeout;
SELECT 'still connected' AS session;
