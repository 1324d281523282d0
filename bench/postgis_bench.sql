-- postgis_bench.sql - run by postgis_bench.sh, once per table size, in one
-- psql session on a fresh database of a throwaway server.  Our GiST index
-- on a geometry column (frechet_geometry_ops) beside PostGIS's
-- (gist_geometry_ops_2d), and our point[] index (frechet_track_ops).
-- Variables: gen (the generator), genopts (its --tracks and --seed),
-- nrange (range queries through an index), nseq (range queries by
-- sequential scan), nknn (k-nearest queries through our index), nknnseq
-- (k-nearest queries that sort the whole table), knntimeout (statement
-- timeout of each of those, e.g. 60s), nest (queries for estimated against
-- actual rows), npasses (passes over the queries through an index; the
-- best pass's mean is reported), llvmjit (1 when llvmjit.so is installed),
-- libmd5 (the installed library's md5).
-- Writes item|value lines (the shell script turns them into tables).
-- Times are milliseconds from clock_timestamp(); all timings run with
-- max_parallel_workers_per_gather = 0 and jit = off except where the JIT
-- part sets them.
\set ON_ERROR_STOP 1
\pset footer off
SET client_min_messages = warning;
CREATE EXTENSION frechet_ext_postgis CASCADE;
-- load the library now, then let other installs of the extension proceed
SELECT frechet_distance('SRID=32632;LINESTRING(0 0,1 1)'::geometry,
                        'SRID=32632;LINESTRING(0 0,1 1)'::geometry) IS NOT NULL AS loaded \gset
\! flock -u 9 2>/dev/null || true

CREATE TABLE results (item text PRIMARY KEY, value text);
CREATE FUNCTION pg_temp.note(item text, value float8) RETURNS void
LANGUAGE sql AS $$ INSERT INTO results VALUES (item, value::text) ON CONFLICT (item) DO UPDATE SET value = EXCLUDED.value $$;
CREATE FUNCTION pg_temp.note_text(item text, value text) RETURNS void
LANGUAGE sql AS $$ INSERT INTO results VALUES (item, value) ON CONFLICT (item) DO UPDATE SET value = EXCLUDED.value $$;

-- The server's JIT setting before this session changes anything.
SELECT pg_temp.note_text('jit server setting', current_setting('jit')),
       pg_temp.note_text('jit available', CASE WHEN pg_jit_available() THEN 'yes' ELSE 'no' END),
       pg_temp.note_text('jit llvmjit.so', CASE WHEN :llvmjit = 1 THEN 'installed' ELSE 'missing' END),
       pg_temp.note_text('library md5', left(:'libmd5', 12)),
       pg_temp.note_text('postgis version', postgis_lib_version()),
       pg_temp.note_text('server version', current_setting('server_version'));
SET max_parallel_workers_per_gather = 0;
SET jit = off;

CREATE TABLE trips (id int PRIMARY KEY, route int, kind text, track point[], geom geometry(LineString, 32632));
-- Query routes: stored uncompressed so that a route handed to a query as
-- a parameter is a plain value (as a client's would be).
CREATE TABLE range_queries (qid int PRIMARY KEY, route int, eps float8, path point[], geom geometry(LineString, 32632));
CREATE TABLE knn_queries (qid int PRIMARY KEY, route int, path point[], geom geometry(LineString, 32632));
ALTER TABLE range_queries ALTER path SET STORAGE EXTERNAL, ALTER geom SET STORAGE EXTERNAL;
ALTER TABLE knn_queries ALTER path SET STORAGE EXTERNAL, ALTER geom SET STORAGE EXTERNAL;
\echo '  loading trips'
\set cmd :gen ' tracks ' :genopts ' --wkt 1'
COPY trips FROM PROGRAM :'cmd';
SELECT greatest(:nrange, :nseq, :nest) AS nrangegen, greatest(:nknn, :nknnseq) AS nknngen \gset
\set cmd :gen ' range ' :genopts ' --queries ' :nrangegen ' --wkt 1'
COPY range_queries FROM PROGRAM :'cmd';
\set cmd :gen ' knn ' :genopts ' --queries ' :nknngen ' --wkt 1'
COPY knn_queries FROM PROGRAM :'cmd';
\echo '  vacuum analyze'
VACUUM ANALYZE trips;
VACUUM ANALYZE range_queries;
VACUUM ANALYZE knn_queries;

SELECT pg_temp.note('trips', count(*)), pg_temp.note('points mean', avg(cardinality(track))),
       pg_temp.note('routes', count(DISTINCT route)),
       pg_temp.note('geometry differs from point[]', count(*) FILTER (WHERE ST_NPoints(geom) <> cardinality(track)
                    OR ST_X(ST_StartPoint(geom)) <> (track[1])[0] OR ST_Y(ST_EndPoint(geom)) <> (track[cardinality(track)])[1]))
FROM trips;
SELECT pg_temp.note('table MB', pg_table_size('trips') / 1048576.0),
       pg_temp.note('heap MB', pg_relation_size('trips') / 1048576.0);

-- Range queries: one statement each, planned each time with the route and
-- epsilon as parameters (as an application would send them); the count
-- found is kept per query and configuration.  Returns the mean ms a query.
CREATE TABLE range_found (mode text, qid int, found bigint, PRIMARY KEY (mode, qid));
CREATE FUNCTION pg_temp.run_range(col text, mode text, nq int) RETURNS float8
LANGUAGE plpgsql AS $$
DECLARE
	q record;
	c bigint;
	n int := 0;
	t0 timestamptz;
	total float8 := 0;
	sql text := CASE col
		WHEN 'geom' THEN 'SELECT count(*) FROM trips WHERE frechet_at_most(geom, $1, $2)'
		WHEN 'track' THEN 'SELECT count(*) FROM trips WHERE frechet_at_most(track, $1, $2)' END;
BEGIN
	FOR q IN SELECT qid, eps, path, geom FROM range_queries WHERE qid <= nq ORDER BY qid LOOP
		t0 := clock_timestamp();
		IF col = 'geom' THEN
			EXECUTE sql INTO c USING q.geom, q.eps;
		ELSE
			EXECUTE sql INTO c USING q.path, q.eps;
		END IF;
		total := total + extract(epoch FROM clock_timestamp() - t0) * 1000;
		n := n + 1;
		IF mode <> 'warm-up' THEN
			INSERT INTO range_found VALUES (mode, q.qid, c);
		END IF;
	END LOOP;
	RETURN total / greatest(n, 1);
END $$;

-- The best (lowest) mean of several passes over the same queries; pass 2
-- and later keep their answers under mode#pass, so they are compared too.
CREATE FUNCTION pg_temp.best_range(col text, mode text, nq int, passes int) RETURNS float8
LANGUAGE sql AS $$
	SELECT min(pg_temp.run_range(col, CASE WHEN p = 1 THEN mode ELSE mode || '#' || p END, nq))
	FROM generate_series(1, passes) p
$$;

-- The plan's first index (or "sequential scan") for range query 1.
CREATE FUNCTION pg_temp.range_plan(col text) RETURNS text
LANGUAGE plpgsql AS $$
DECLARE
	q record;
	j jsonb;
BEGIN
	SELECT * INTO q FROM range_queries WHERE qid = 1;
	EXECUTE format('EXPLAIN (FORMAT JSON) SELECT count(*) FROM trips WHERE frechet_at_most(%I, %L::%s, %L)',
	               col, CASE col WHEN 'geom' THEN q.geom::text ELSE q.path::text END,
	               CASE col WHEN 'geom' THEN 'geometry' ELSE 'point[]' END, q.eps) INTO j;
	RETURN coalesce(jsonb_path_query_first(j, 'strict $.**."Index Name"') #>> '{}', 'sequential scan');
END $$;

-- k-nearest, k = 10, by our ordering operator.  Returns the mean ms a query.
CREATE TABLE knn_found (mode text, qid int, ids int[], PRIMARY KEY (mode, qid));
CREATE FUNCTION pg_temp.run_knn(mode text, nq int) RETURNS float8
LANGUAGE plpgsql AS $$
DECLARE
	q record;
	ids int[];
	n int := 0;
	t0 timestamptz;
	total float8 := 0;
BEGIN
	FOR q IN SELECT qid, geom FROM knn_queries WHERE qid <= nq ORDER BY qid LOOP
		t0 := clock_timestamp();
		EXECUTE 'SELECT array_agg(id) FROM (SELECT id FROM trips ORDER BY geom <~~> $1 LIMIT 10) s' INTO ids USING q.geom;
		total := total + extract(epoch FROM clock_timestamp() - t0) * 1000;
		n := n + 1;
		INSERT INTO knn_found VALUES (mode, q.qid, ids);
	END LOOP;
	RETURN total / greatest(n, 1);
END $$;

CREATE FUNCTION pg_temp.best_knn(mode text, nq int, passes int) RETURNS float8
LANGUAGE sql AS $$
	SELECT min(pg_temp.run_knn(CASE WHEN p = 1 THEN mode ELSE mode || '#' || p END, nq))
	FROM generate_series(1, passes) p
$$;

-- One k-nearest query without our index (a sort over the whole table),
-- called as its own statement under statement_timeout: a query that runs
-- out of time is recorded as timed out and the mode's later queries are
-- skipped.
CREATE TABLE knn_slow (mode text, qid int, ms float8, PRIMARY KEY (mode, qid));
CREATE FUNCTION pg_temp.run_knn_slow(mode text, k int) RETURNS void
LANGUAGE plpgsql AS $$
DECLARE
	g geometry;
	ids int[];
	t0 timestamptz;
BEGIN
	IF EXISTS (SELECT 1 FROM knn_slow s WHERE s.mode = run_knn_slow.mode AND s.ms IS NULL) THEN
		RETURN;
	END IF;
	SELECT geom INTO g FROM knn_queries WHERE qid = k;
	t0 := clock_timestamp();
	BEGIN
		EXECUTE 'SELECT array_agg(id) FROM (SELECT id FROM trips ORDER BY geom <~~> $1 LIMIT 10) s' INTO ids USING g;
		INSERT INTO knn_slow VALUES (mode, k, extract(epoch FROM clock_timestamp() - t0) * 1000);
		INSERT INTO knn_found VALUES (mode, k, ids);
	EXCEPTION WHEN query_canceled THEN
		INSERT INTO knn_slow VALUES (mode, k, NULL);
	END;
END $$;
CREATE FUNCTION pg_temp.note_knn_slow(mode text, label text) RETURNS void
LANGUAGE sql AS $$
	SELECT pg_temp.note(label || ' ms', avg(ms)), pg_temp.note(label || ' queries', count(ms)),
	       pg_temp.note(label || ' timed out', count(*) FILTER (WHERE ms IS NULL))
	FROM knn_slow WHERE knn_slow.mode = note_knn_slow.mode
$$;

-- Estimated against actual rows of the plan's top node (the scan: SELECT *
-- has no other node) for range queries with the route as a literal, and
-- the index candidates (rows the scan fetched: returned plus removed by
-- the filter and the recheck).
CREATE TABLE est_rows (mode text, qid int, node text, est float8, actual float8, candidates float8, PRIMARY KEY (mode, qid));
CREATE FUNCTION pg_temp.run_est(mode text, nq int) RETURNS void
LANGUAGE plpgsql AS $$
DECLARE
	q record;
	j json;
	top json;
BEGIN
	FOR q IN SELECT qid, eps, geom FROM range_queries WHERE qid <= nq ORDER BY qid LOOP
		EXECUTE format('EXPLAIN (ANALYZE, FORMAT JSON) SELECT * FROM trips WHERE frechet_at_most(geom, %L::geometry, %L)',
		               q.geom, q.eps) INTO j;
		top := j -> 0 -> 'Plan';
		INSERT INTO est_rows VALUES (mode, q.qid, top ->> 'Node Type', (top ->> 'Plan Rows')::float8,
		                             (top ->> 'Actual Rows')::float8,
		                             (top ->> 'Actual Rows')::float8 + coalesce((top ->> 'Rows Removed by Filter')::float8, 0)
		                             + coalesce((top ->> 'Rows Removed by Index Recheck')::float8, 0));
	END LOOP;
END $$;
-- Ratios est/actual with both floored at one row (a query that finds
-- nothing would divide by zero); worst: the ratio furthest from 1.
CREATE FUNCTION pg_temp.note_est(mode text, label text) RETURNS void
LANGUAGE sql AS $$
	SELECT pg_temp.note(label || ' geomean est/actual', exp(avg(ln(r)))),
	       pg_temp.note(label || ' worst est/actual', (array_agg(r ORDER BY abs(ln(r)) DESC))[1]),
	       pg_temp.note(label || ' est queries', count(*)),
	       pg_temp.note(label || ' candidates', avg(candidates)),
	       pg_temp.note_text(label || ' node', string_agg(DISTINCT node, ' / '))
	FROM (SELECT greatest(est, 1) / greatest(actual, 1) AS r, candidates, node
	      FROM est_rows WHERE est_rows.mode = note_est.mode) s
$$;

-- JIT and parallel plan of range query 1 under the current settings:
-- execution ms, whether JIT compiled anything and its total ms, whether
-- the plan has a Gather and how many workers it launched.
CREATE FUNCTION pg_temp.jit_plan(label text) RETURNS void
LANGUAGE plpgsql AS $$
DECLARE
	q record;
	j jsonb;
BEGIN
	SELECT * INTO q FROM range_queries WHERE qid = 1;
	EXECUTE format('EXPLAIN (ANALYZE, FORMAT JSON) SELECT count(*) FROM trips WHERE frechet_at_most(geom, %L::geometry, %L)',
	               q.geom, q.eps) INTO j;
	j := j -> 0;
	PERFORM pg_temp.note(label || ' exec ms', (j ->> 'Execution Time')::float8),
	        pg_temp.note_text(label || ' jit used', CASE WHEN j ? 'JIT' THEN 'yes' ELSE 'no' END),
	        pg_temp.note(label || ' jit total ms', (j #>> '{JIT,Timing,Total}')::float8),
	        pg_temp.note(label || ' jit functions', (j #>> '{JIT,Functions}')::float8),
	        pg_temp.note(label || ' total cost', (j #>> '{Plan,Total Cost}')::float8),
	        pg_temp.note_text(label || ' gather',
	                          CASE WHEN jsonb_path_exists(j, 'strict $.**."Node Type" ? (@ like_regex "^Gather")') THEN 'yes' ELSE 'no' END),
	        pg_temp.note(label || ' workers launched',
	                     coalesce((jsonb_path_query_first(j, 'strict $.**."Workers Launched"') #>> '{}')::float8, 0));
END $$;

---------------------------------------------------------------------------
-- 1. No index.
\echo '  no index: range queries on geometry (jit off, then on)'
SELECT pg_temp.note('range seq ms', pg_temp.run_range('geom', 'seq', :nseq));
SET jit = on;
SELECT pg_temp.note('range seq jit ms', pg_temp.run_range('geom', 'seq jit', :nseq));
SELECT pg_temp.jit_plan('seq jit on');
-- default parallel settings (the server's max_parallel_workers_per_gather)
RESET max_parallel_workers_per_gather;
SELECT pg_temp.note_text('parallel workers per gather', current_setting('max_parallel_workers_per_gather'));
SELECT pg_temp.jit_plan('seq parallel jit on');
SET jit = off;
SELECT pg_temp.jit_plan('seq parallel jit off');
SET max_parallel_workers_per_gather = 0;
SELECT pg_temp.jit_plan('seq jit off');
\echo '  no index: range queries on point[]'
SELECT pg_temp.note('range track seq ms', pg_temp.run_range('track', 'track seq', :nseq));
\echo '  no index: k-nearest queries (whole-table sort, each under statement_timeout)'
SET statement_timeout = :'knntimeout';
SELECT format('SELECT pg_temp.run_knn_slow(%L, %s)', 'none', k) FROM generate_series(1, :nknnseq) k \gexec
RESET statement_timeout;
SELECT pg_temp.note_knn_slow('none', 'knn none');
-- what such a query costs: the table size times the mean time of one exact
-- distance, over 200 (query, trip) pairs
SELECT clock_timestamp() AS t0 \gset
SELECT count(d) AS sampled FROM (
	SELECT q.geom <~~> t.geom AS d
	FROM knn_queries q, generate_series(0, 19) k, trips t
	WHERE q.qid <= 10 AND t.id = 1 + ((q.qid * 7919 + k * 104729) % (SELECT count(*) FROM trips))) s \gset
SELECT pg_temp.note('knn none estimated ms',
                    extract(epoch FROM clock_timestamp() - :'t0') * 1000 / :sampled * (SELECT count(*) FROM trips));

---------------------------------------------------------------------------
-- 2. PostGIS's index only.
\echo '  building PostGIS''s index'
SELECT clock_timestamp() AS t0 \gset
CREATE INDEX trips_geom_postgis ON trips USING gist (geom);
SELECT pg_temp.note('postgis index build ms', extract(epoch FROM clock_timestamp() - :'t0') * 1000),
       pg_temp.note('postgis index MB', pg_relation_size('trips_geom_postgis') / 1048576.0);
SELECT pg_temp.note_text('plan postgis', pg_temp.range_plan('geom'));
\echo '  PostGIS''s index: range queries'
SELECT pg_temp.run_range('geom', 'warm-up', 1);
SELECT pg_temp.note('range postgis ms', pg_temp.best_range('geom', 'postgis', :nrange, :npasses));
SELECT pg_temp.run_est('postgis', :nest);
SELECT pg_temp.note_est('postgis', 'est postgis');
\echo '  PostGIS''s index: k-nearest queries (whole-table sort)'
SET statement_timeout = :'knntimeout';
SELECT format('SELECT pg_temp.run_knn_slow(%L, %s)', 'postgis', k) FROM generate_series(1, :nknnseq) k \gexec
RESET statement_timeout;
SELECT pg_temp.note_knn_slow('postgis', 'knn postgis');

---------------------------------------------------------------------------
-- 3. Both indexes.
\echo '  building our index on geometry'
SELECT clock_timestamp() AS t0 \gset
CREATE INDEX trips_geom_frechet ON trips USING gist (geom frechet_geometry_ops);
SELECT pg_temp.note('ours index build ms', extract(epoch FROM clock_timestamp() - :'t0') * 1000),
       pg_temp.note('ours index MB', pg_relation_size('trips_geom_frechet') / 1048576.0);
SELECT pg_temp.note_text('plan both', pg_temp.range_plan('geom'));
\echo '  both indexes: range and k-nearest queries'
SELECT pg_temp.run_range('geom', 'warm-up', 1);
SELECT pg_temp.note('range both ms', pg_temp.best_range('geom', 'both', :nrange, :npasses));
SELECT pg_temp.note('knn both ms', pg_temp.best_knn('both', :nknn, :npasses));

---------------------------------------------------------------------------
-- 4. Ours only.
DROP INDEX trips_geom_postgis;
SELECT pg_temp.note_text('plan ours', pg_temp.range_plan('geom'));
\echo '  our index: range and k-nearest queries, estimates, JIT'
SELECT pg_temp.note('range ours ms', pg_temp.best_range('geom', 'ours', :nrange, :npasses));
SELECT pg_temp.note('knn ours ms', pg_temp.best_knn('ours', :nknn, :npasses));
SELECT pg_temp.run_est('ours', :nest);
SELECT pg_temp.note_est('ours', 'est ours');
SET jit = on;
SELECT pg_temp.note('range ours jit ms', pg_temp.best_range('geom', 'ours jit', :nrange, :npasses));
SELECT pg_temp.jit_plan('index jit on');
SET jit = off;
SELECT pg_temp.jit_plan('index jit off');

---------------------------------------------------------------------------
-- 5. Our index on point[].
\echo '  building our index on point[]'
SELECT clock_timestamp() AS t0 \gset
CREATE INDEX trips_track_frechet ON trips USING gist (track);
SELECT pg_temp.note('track index build ms', extract(epoch FROM clock_timestamp() - :'t0') * 1000),
       pg_temp.note('track index MB', pg_relation_size('trips_track_frechet') / 1048576.0);
SELECT pg_temp.note_text('plan track', pg_temp.range_plan('track'));
\echo '  point[] index: range queries'
SELECT pg_temp.run_range('track', 'warm-up', 1);
SELECT pg_temp.note('range track ms', pg_temp.best_range('track', 'track idx', :nrange, :npasses));

---------------------------------------------------------------------------
-- Agreement: every configuration's count for each query it ran (geometry
-- configurations among themselves, point[] against geometry: same
-- coordinates, same answers); k-nearest ids of every configuration that
-- ran a query.
SELECT pg_temp.note('range mismatches', count(*) FILTER (WHERE n > 1)),
       pg_temp.note('range compared', count(*))
FROM (SELECT qid, count(DISTINCT found) AS n FROM range_found WHERE mode NOT LIKE 'track%' GROUP BY qid) s;
SELECT pg_temp.note('range track mismatches', count(*) FILTER (WHERE n > 1))
FROM (SELECT qid, count(DISTINCT found) AS n FROM range_found GROUP BY qid) s;
SELECT pg_temp.note('range found mean', avg(found)) FROM range_found WHERE mode = 'ours';
SELECT pg_temp.note('range found share', avg(found) / (SELECT count(*) FROM trips)) FROM range_found WHERE mode = 'ours';
SELECT pg_temp.note('knn mismatches', count(*) FILTER (WHERE n > 1)),
       pg_temp.note('knn compared', count(*) FILTER (WHERE m > 1))
FROM (SELECT qid, count(DISTINCT ids) AS n, count(*) AS m FROM knn_found GROUP BY qid) s;

SELECT item, value FROM results ORDER BY item;
