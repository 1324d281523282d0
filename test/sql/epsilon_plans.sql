-- A NaN or negative epsilon raises 22023 in frechet_at_most.  Every plan
-- must agree: with the index's condition (which builds frechet_reach(route,
-- epsilon)) and with a sequential scan, even when no row would reach the
-- function, and on an empty table.
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
CREATE FUNCTION pg_temp.plan_of(q text) RETURNS text
LANGUAGE plpgsql AS $$
DECLARE
	line text;
	plan text := '';
BEGIN
	-- "index" for an index scan or a bitmap scan (one node or two), "seq" for a sequential one
	FOR line IN EXECUTE 'EXPLAIN (COSTS OFF) ' || q LOOP
		plan := plan || CASE WHEN line ~ 'Index Scan|Bitmap Heap Scan' AND plan !~ 'index' THEN 'index '
		                     WHEN line ~ 'Seq Scan' THEN 'seq ' ELSE '' END;
	END LOOP;
	RETURN trim(plan);
EXCEPTION WHEN OTHERS THEN
	RETURN SQLSTATE || ': ' || SQLERRM;
END $$;

CREATE TABLE ep_tracks AS
SELECT i AS id, ARRAY[point(i, 0), point(i + 10, 1)] AS track FROM generate_series(1, 1000) i;
CREATE INDEX ON ep_tracks USING gist (track);
CREATE TABLE ep_empty (id int, track point[]);
CREATE INDEX ON ep_empty USING gist (track);
ANALYZE ep_tracks;
ANALYZE ep_empty;
CREATE TEMP TABLE ep_queries (k int, label text, q text);
INSERT INTO ep_queries VALUES
	(1, 'NaN, rows far away', $$SELECT count(*)::text FROM ep_tracks WHERE frechet_at_most(track, '{"(5000,0)","(5010,1)"}'::point[], 'NaN')$$),
	(2, 'NaN, other condition false', $$SELECT count(*)::text FROM ep_tracks WHERE id < 0 AND frechet_at_most(track, '{"(500,0)","(510,1)"}'::point[], 'NaN')$$),
	(3, 'negative, rows far away', $$SELECT count(*)::text FROM ep_tracks WHERE frechet_at_most('{"(5000,0)","(5010,1)"}'::point[], track, -1)$$),
	(4, 'NaN, empty table', $$SELECT count(*)::text FROM ep_empty WHERE frechet_at_most(track, '{"(5000,0)","(5010,1)"}'::point[], 'NaN')$$),
	(5, 'epsilon 1, rows near', $$SELECT count(*)::text FROM ep_tracks WHERE frechet_at_most(track, '{"(500,0)","(510,1)"}'::point[], 1)$$),
	(6, 'NULL epsilon', $$SELECT count(*)::text FROM ep_tracks WHERE frechet_at_most(track, '{"(500,0)","(510,1)"}'::point[], NULL)$$);
SET enable_seqscan = off;
CREATE TEMP TABLE ep_index AS SELECT k, label, pg_temp.plan_of(q) AS plan, pg_temp.try(q) AS result FROM ep_queries;
RESET enable_seqscan;
SET enable_indexscan = off;
SET enable_bitmapscan = off;
CREATE TEMP TABLE ep_seq AS SELECT k, label, pg_temp.plan_of(q) AS plan, pg_temp.try(q) AS result FROM ep_queries;
RESET enable_indexscan;
RESET enable_bitmapscan;
SELECT i.label, i.result AS with_index, s.result AS sequential, i.result IS NOT DISTINCT FROM s.result AS agree
FROM ep_index i JOIN ep_seq s USING (k) ORDER BY k;
-- the two plans, shown for the valid epsilon (with a bad one planning
-- fails; with NULL the planner folds the call away)
SELECT i.label, i.plan AS with_index, s.plan AS sequential
FROM ep_index i JOIN ep_seq s USING (k) WHERE k = 5;
DROP TABLE ep_tracks, ep_empty;
