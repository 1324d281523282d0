-- index_bench.sql - run by index_bench.sh in one psql session on a throwaway
-- server.  Variables: gen (the generator), genopts (its options), nrange, nrangeseq,
-- nknn, nknnseq, ncorr, ncorrseq.  Times are in milliseconds from clock_timestamp().
\set ON_ERROR_STOP 1
\pset footer off
SET client_min_messages = warning;
CREATE EXTENSION frechet_ext;
-- load the library now, then let other installs of the extension proceed
SELECT frechet_distance('{"(0,0)"}', '{"(0,0)"}') IS NOT NULL AS loaded \gset
\! flock -u 9 2>/dev/null || true
SET max_parallel_workers_per_gather = 0;
SET stats_fetch_consistency = none;

CREATE TABLE trips (id int PRIMARY KEY, route int, kind text, track point[]);
CREATE TABLE range_queries (qid int PRIMARY KEY, route int, eps float8, path point[]);
CREATE TABLE knn_queries (qid int PRIMARY KEY, route int, path point[]);
CREATE TABLE corridor_queries (qid int PRIMARY KEY, route int, eps float8, path point[]);
\set cmd :gen ' tracks ' :genopts
COPY trips FROM PROGRAM :'cmd';
\set cmd :gen ' range ' :genopts ' --queries ' :nrange
COPY range_queries FROM PROGRAM :'cmd';
\set cmd :gen ' knn ' :genopts ' --queries ' :nknn
COPY knn_queries FROM PROGRAM :'cmd';
\set cmd :gen ' corridor ' :genopts ' --queries ' :ncorr
COPY corridor_queries FROM PROGRAM :'cmd';
VACUUM ANALYZE trips;

CREATE TABLE results (item text PRIMARY KEY, value float8);
CREATE FUNCTION pg_temp.note(item text, value float8) RETURNS void
LANGUAGE sql AS $$ INSERT INTO results VALUES (item, value) ON CONFLICT (item) DO UPDATE SET value = EXCLUDED.value $$;
CREATE FUNCTION pg_temp.cheap_verdict(point[], point[], float8) RETURNS text
AS '$libdir/frechet_ext', 'frechet_cheap_verdict_point_array' LANGUAGE C IMMUTABLE STRICT;
CREATE FUNCTION pg_temp.passes_stage(point[], point[], float8) RETURNS text
AS '$libdir/frechet_ext', 'frechet_passes_stage_point_array' LANGUAGE C IMMUTABLE STRICT;

SELECT pg_temp.note('trips', count(*)), pg_temp.note('points mean', avg(cardinality(track))),
       pg_temp.note('points sd', stddev_pop(cardinality(track))),
       pg_temp.note('routes', count(DISTINCT route))
FROM trips;

-- Range and corridor queries, one statement each (planned each time, as
-- an application would): frechet_at_most against range_queries,
-- frechet_passes (which trips drove a 1 km stretch) against
-- corridor_queries; found rows counted per query.
CREATE TABLE range_found (mode text, qid int, found bigint, PRIMARY KEY (mode, qid));
CREATE TABLE corridor_found (mode text, qid int, found bigint, PRIMARY KEY (mode, qid));
CREATE FUNCTION pg_temp.run_counts(kind text, mode text, nq int) RETURNS float8
LANGUAGE plpgsql AS $$
DECLARE
	q record;
	c bigint;
	t0 timestamptz := clock_timestamp();
	fn text := CASE kind WHEN 'range' THEN 'frechet_at_most' ELSE 'frechet_passes' END;
BEGIN
	FOR q IN EXECUTE format('SELECT qid, path, eps FROM %I WHERE qid <= $1 ORDER BY qid', kind || '_queries') USING nq LOOP
		EXECUTE format('SELECT count(*) FROM trips WHERE %I(track, $1, $2)', fn) INTO c USING q.path, q.eps;
		EXECUTE format('INSERT INTO %I VALUES ($1, $2, $3)', kind || '_found') USING mode, q.qid, c;
	END LOOP;
	RETURN extract(epoch FROM clock_timestamp() - t0) * 1000;
END $$;

-- k-nearest, k = 10.
CREATE TABLE knn_found (mode text, qid int, ids int[], ds float8[], PRIMARY KEY (mode, qid));
CREATE FUNCTION pg_temp.run_knn(mode text, nq int) RETURNS float8
LANGUAGE plpgsql AS $$
DECLARE
	q record;
	ids int[];
	ds float8[];
	t0 timestamptz := clock_timestamp();
BEGIN
	FOR q IN SELECT * FROM knn_queries WHERE qid <= nq ORDER BY qid LOOP
		EXECUTE 'SELECT array_agg(id ORDER BY d), array_agg(d ORDER BY d)
		         FROM (SELECT id, track <-> $1 AS d FROM trips ORDER BY track <-> $1 LIMIT 10) s'
			INTO ids, ds USING q.path;
		INSERT INTO knn_found VALUES (mode, q.qid, ids, ds);
	END LOOP;
	RETURN extract(epoch FROM clock_timestamp() - t0) * 1000;
END $$;

CREATE FUNCTION pg_temp.index_tuples_read() RETURNS float8
LANGUAGE sql AS $$ SELECT coalesce(sum(idx_tup_read), 0)::float8 FROM pg_stat_user_indexes WHERE indexrelname = 'trips_track_idx' $$;

-- Sequential scans first (no index exists yet).
\echo sequential scan: range queries
SELECT pg_temp.note('range seq ms', pg_temp.run_counts('range', 'seq', :nrangeseq));
SELECT pg_temp.note('range seq queries', count(*)) FROM range_found WHERE mode = 'seq';
\echo sequential scan: corridor queries
SELECT pg_temp.note('corridor seq ms', pg_temp.run_counts('corridor', 'seq', :ncorrseq));
SELECT pg_temp.note('corridor seq queries', count(*)) FROM corridor_found WHERE mode = 'seq';
\echo sequential scan: k-nearest queries
SELECT :nknnseq > 0 AS do_knn_seq \gset
\if :do_knn_seq
SELECT pg_temp.note('knn seq ms', pg_temp.run_knn('seq', :nknnseq));
SELECT pg_temp.note('knn seq queries', count(*)) FROM knn_found WHERE mode = 'seq';
\endif
-- A sequential k-nearest scan computes one exact distance per trip; its
-- cost is estimated as the table size times the mean time of an exact
-- distance between a query and a trip, over 200 pairs.
SELECT clock_timestamp() AS t0 \gset
SELECT count(d) AS sampled FROM (
	SELECT q.path <-> t.track AS d
	FROM knn_queries q, generate_series(0, 1) k, trips t
	WHERE t.id = 1 + ((q.qid * 7919 + k * 104729) % (SELECT count(*) FROM trips))
	ORDER BY q.qid, k LIMIT 200) s \gset
SELECT pg_temp.note('knn seq estimated ms/query',
                    extract(epoch FROM clock_timestamp() - :'t0') * 1000 / :sampled * (SELECT count(*) FROM trips));

\echo building the index
SELECT clock_timestamp() AS t0 \gset
CREATE INDEX trips_track_idx ON trips USING gist (track);
SELECT pg_temp.note('index build ms', extract(epoch FROM clock_timestamp() - :'t0') * 1000),
       pg_temp.note('index MB', pg_relation_size('trips_track_idx') / 1048576.0);
ANALYZE trips;
\echo plans
EXPLAIN (COSTS OFF) SELECT count(*) FROM trips WHERE frechet_at_most(track, (SELECT path FROM range_queries WHERE qid = 1), 40);
EXPLAIN (COSTS OFF) SELECT id FROM trips ORDER BY track <-> (SELECT path FROM knn_queries WHERE qid = 1) LIMIT 10;

\echo index: range queries
SELECT pg_stat_force_next_flush();
SELECT pg_temp.note('range idx tuples before', pg_temp.index_tuples_read());
SELECT pg_temp.note('range idx ms', pg_temp.run_counts('range', 'index', :nrange));
SELECT pg_stat_force_next_flush();
SELECT pg_temp.note('range idx tuples after', pg_temp.index_tuples_read());
\echo index: corridor queries
SELECT pg_temp.note('corridor idx ms', pg_temp.run_counts('corridor', 'index', :ncorr));
\echo index: k-nearest queries
SELECT pg_stat_force_next_flush();
SELECT pg_temp.note('knn idx tuples before', pg_temp.index_tuples_read());
SELECT pg_temp.note('knn idx ms', pg_temp.run_knn('index', :nknn));
SELECT pg_stat_force_next_flush();
SELECT pg_temp.note('knn idx tuples after', pg_temp.index_tuples_read());

-- Agreement of the two plans on the queries both ran.
SELECT pg_temp.note('range mismatches', count(*) FILTER (WHERE s.found IS DISTINCT FROM i.found)),
       pg_temp.note('range found', sum(i.found))
FROM range_found s JOIN range_found i ON i.qid = s.qid AND i.mode = 'index' WHERE s.mode = 'seq';
SELECT pg_temp.note('range found all', sum(found)) FROM range_found WHERE mode = 'index';
SELECT pg_temp.note('corridor mismatches', count(*) FILTER (WHERE s.found IS DISTINCT FROM i.found))
FROM corridor_found s JOIN corridor_found i ON i.qid = s.qid AND i.mode = 'index' WHERE s.mode = 'seq';
SELECT pg_temp.note('corridor found all', sum(found)) FROM corridor_found WHERE mode = 'index';
SELECT pg_temp.note('knn mismatches', count(*) FILTER (WHERE s.ds IS DISTINCT FROM i.ds))
FROM knn_found s JOIN knn_found i ON i.qid = s.qid AND i.mode = 'index' WHERE s.mode = 'seq';

-- Stages of the range queries: what the index key lets through, what the
-- cheap bounds settle, what reaches the decider.
\echo counting stages
SELECT pg_temp.note('range candidates', count(*)),
       pg_temp.note('range cheap far', count(*) FILTER (WHERE v = 'far')),
       pg_temp.note('range cheap near', count(*) FILTER (WHERE v = 'near')),
       pg_temp.note('range decider', count(*) FILTER (WHERE v = 'undecided'))
FROM (SELECT pg_temp.cheap_verdict(t.track, q.path, q.eps) AS v
      FROM range_queries q JOIN trips t ON t.track |~~| frechet_reach(q.path, q.eps)) s;

-- Stages of the corridor queries: what the index key lets through, what
-- the cheap verdicts settle (no edge near the stretch's start before one
-- near its end; a greedy coupling within epsilon), what the windows
-- settle without a sweep, what reaches a sweep of the free space.
SELECT pg_temp.note('corridor candidates', count(*)),
       pg_temp.note('corridor cheap far', count(*) FILTER (WHERE v = 'cheap far')),
       pg_temp.note('corridor cheap near', count(*) FILTER (WHERE v = 'cheap near')),
       pg_temp.note('corridor windows', count(*) FILTER (WHERE v = 'windows')),
       pg_temp.note('corridor decider', count(*) FILTER (WHERE v = 'decider'))
FROM (SELECT pg_temp.passes_stage(t.track, q.path, q.eps) AS v
      FROM corridor_queries q JOIN trips t ON t.track |~~>| frechet_reach(q.path, q.eps)) s;

SELECT item, round(value::numeric, 3) AS value FROM results ORDER BY item;
