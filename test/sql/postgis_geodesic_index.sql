-- Index keys of geography summarise the edges' geodesics (a long edge
-- bulges away from its chord: 3.4 km over 417 km), so the index must keep
-- every trip the functions keep.  Tracks of long edges (invented
-- ferry legs of 20-120 km) in frechet_geography_ops: range queries, the
-- ping test and k-nearest, each against a sequential scan.  (A larger
-- run, 3,000 legs of 30-300 km and 60 range queries, caught keys of the
-- vertices alone, as in 0.1, losing 2 trips; it takes minutes, so the
-- suite runs this smaller one.)
CREATE EXTENSION IF NOT EXISTS postgis;
CREATE EXTENSION frechet_ext_postgis;

SELECT setseed(0.77);
CREATE TABLE legs AS
SELECT id, ST_MakeLine(array(SELECT ST_Project(ST_SetSRID(ST_MakePoint(lon0, lat0), 4326)::geography,
                                               (20000 + random() * 100000) * i, radians(az + random() * 4))::geometry
                             FROM generate_series(0, 1 + id % 4) i))::geography AS track
FROM (SELECT id, -20 + random() * 40 AS lon0, 30 + random() * 30 AS lat0, random() * 360 AS az
      FROM generate_series(1, 400) id) s;
-- For every 100th leg, twins: the same leg through points every 10 km of
-- PostGIS's ST_Segmentize (great circles of a sphere, metres off the
-- geodesics; the twin's vertex box holds the bulge the original's lacks),
-- and the leg moved about 2.2 km north.  The queries are those legs and
-- their segmentized twins.
INSERT INTO legs
SELECT 10000 + id, ST_Segmentize(track, 10000) FROM legs WHERE id % 100 = 7
UNION ALL
SELECT 20000 + id, ST_Translate(track::geometry, 0, 0.02)::geography FROM legs WHERE id % 100 = 7;
CREATE TABLE q AS
SELECT id AS qid, track AS route FROM legs WHERE id IN (7, 207) OR id IN (10007, 10207);
CREATE INDEX legs_frechet ON legs USING gist (track frechet_geography_ops);
ANALYZE legs;

CREATE FUNCTION pg_temp.answers(use_index bool)
RETURNS TABLE (what text, qid int, eps float8, ids int[])
LANGUAGE plpgsql AS $$
BEGIN
	EXECUTE format('SET LOCAL enable_indexscan = %s', use_index);
	EXECUTE format('SET LOCAL enable_bitmapscan = %s', use_index);
	EXECUTE format('SET LOCAL enable_seqscan = %s', NOT use_index);
	RETURN QUERY
	SELECT 'range', q.qid, e.eps, (SELECT array_agg(l.id ORDER BY l.id) FROM legs l WHERE frechet_at_most(l.track, q.route, e.eps))
	FROM q, (VALUES (100.0::float8), (500.0), (5000.0), (50000.0)) e(eps)
	UNION ALL
	SELECT 'pings', q.qid, e.eps, (SELECT array_agg(l.id ORDER BY l.id) FROM legs l WHERE frechet_pings_at_most(l.track, q.route, e.eps))
	FROM q, (VALUES (100.0::float8), (500.0), (50000.0)) e(eps)
	UNION ALL
	SELECT 'knn', q.qid, 0::float8, (SELECT array_agg(k.id) FROM (SELECT l.id FROM legs l ORDER BY l.track <~~> q.route, l.id LIMIT 5) k)
	FROM q;
END $$;

-- the index is used for the range and the ping queries
BEGIN;
SET LOCAL enable_seqscan = off;
EXPLAIN (COSTS OFF) SELECT id FROM legs WHERE frechet_at_most(track, (SELECT route FROM q WHERE qid = 7), 5000);
EXPLAIN (COSTS OFF) SELECT id FROM legs WHERE frechet_pings_at_most(track, (SELECT route FROM q WHERE qid = 7), 5000);
COMMIT;

CREATE TEMP TABLE with_index AS SELECT * FROM pg_temp.answers(true);
CREATE TEMP TABLE without_index AS SELECT * FROM pg_temp.answers(false);
SELECT what, count(*) AS queries,
       count(*) FILTER (WHERE i.ids IS NOT DISTINCT FROM s.ids) AS same_as_seqscan,
       sum(coalesce(cardinality(s.ids), 0)) AS rows_found
FROM with_index i JOIN without_index s USING (what, qid, eps)
GROUP BY what ORDER BY what;

DROP TABLE legs, q;
DROP EXTENSION frechet_ext_postgis;
DROP EXTENSION postgis;
