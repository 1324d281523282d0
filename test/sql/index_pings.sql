-- Range queries of frechet_pings_at_most through a GiST index: the planner
-- support function hands the index "trip |~~~| frechet_reach(route, eps)"
-- (first and last pings near the route's ends, the trip's box inside the
-- route's widened by eps), and the index never drops a trip that the
-- function keeps.  100,000 generated sparse-ping trips around x = 1e7 (a
-- Web-Mercator-sized offset, so rounding is at its worst) along 30
-- routes on an integer grid; some noisy, some backwards, some partial,
-- some single pings, some that wander off.
SELECT setseed(0.5);

CREATE TABLE ip_routes AS
SELECT r AS rid,
       array(SELECT point(1e7 + bx + 300 * k + floor(random() * 41) - 20, by + 200 * (k % 2) + floor(random() * 41) - 20)
             FROM generate_series(0, 3 + r % 6) k ORDER BY k) AS route
FROM (SELECT r, 100 * floor(random() * 40) AS bx, 100 * floor(random() * 40) AS by
      FROM generate_series(1, 30) r) s;

-- Pings at a few places along each route (a fraction f of the way along
-- segment k), moved by whole numbers up to amp.
CREATE FUNCTION pg_temp.pings(r point[], amp int, reverse bool, first_k int) RETURNS point[]
LANGUAGE sql VOLATILE AS $$
	SELECT array(SELECT point(p[0] + f * (q[0] - p[0]) + floor(random() * (2 * amp + 1)) - amp,
	                          p[1] + f * (q[1] - p[1]) + floor(random() * (2 * amp + 1)) - amp)
	             FROM (SELECT k, r[k] AS p, r[k + 1] AS q, f
	                   FROM generate_series(first_k, cardinality(r) - 1) k,
	                        unnest(ARRAY[0, 0.4, 0.8]) f
	                   UNION ALL SELECT cardinality(r), r[cardinality(r)], r[cardinality(r)], 0) s
	             ORDER BY CASE WHEN reverse THEN -(k + f) ELSE k + f END)
$$;

CREATE TABLE ip_trips (id int PRIMARY KEY, rid int, kind text, pings point[]);
INSERT INTO ip_trips
SELECT i, rid, kind,
       CASE kind
           WHEN 'noisy' THEN pg_temp.pings(route, 15, false, 1)
           WHEN 'backwards' THEN pg_temp.pings(route, 15, true, 1)
           WHEN 'partial' THEN pg_temp.pings(route, 10, false, 2)
           WHEN 'wandering' THEN pg_temp.pings(route, 15, false, 1) || point(1e7 + 5000 * random(), 5000 * random()) || route[cardinality(route)]
           ELSE ARRAY[point((route[1])[0] + floor(random() * 61) - 30, (route[1])[1])]
       END
FROM (SELECT i, 1 + i % 30 AS rid,
             CASE WHEN (i / 30) % 20 < 14 THEN 'noisy' WHEN (i / 30) % 20 < 16 THEN 'backwards'
                  WHEN (i / 30) % 20 < 18 THEN 'partial' WHEN (i / 30) % 20 = 18 THEN 'wandering' ELSE 'single ping' END AS kind
      FROM generate_series(1, 100000) i) s
JOIN ip_routes USING (rid);
SELECT kind, count(*), min(cardinality(pings)) AS min_pings, max(cardinality(pings)) AS max_pings
FROM ip_trips GROUP BY kind ORDER BY kind;

-- The answers without any index, for 8 routes at 3 tolerances each (and
-- a max_gap of 400 on one), taken before the index exists.
CREATE TABLE ip_queries AS
SELECT q, rid, eps, gap FROM (VALUES (1, 1, 10.0, NULL), (2, 1, 25, NULL), (3, 1, 60, NULL),
	(4, 7, 25, NULL), (5, 12, 25, NULL), (6, 18, 40, 400.0), (7, 23, 25, NULL), (8, 30, 200, NULL)) v(q, rid, eps, gap);
CREATE TABLE ip_seq AS
SELECT q, count(t.id) AS n, md5(string_agg(t.id::text, ',' ORDER BY t.id)) AS ids
FROM ip_queries qq JOIN ip_routes r USING (rid)
LEFT JOIN ip_trips t ON frechet_pings_at_most(t.pings, r.route, qq.eps, qq.gap)
GROUP BY q;

CREATE INDEX ip_trips_pings ON ip_trips USING gist (pings);
ANALYZE ip_trips;

-- The plan uses the index, with the function kept as the filter.
EXPLAIN (COSTS OFF)
SELECT id FROM ip_trips WHERE frechet_pings_at_most(pings, (SELECT route FROM ip_routes WHERE rid = 1), 25);

-- Through the index: the same rows for every query.
SET enable_seqscan = off;
CREATE TABLE ip_idx (q int, n bigint, ids text);
DO $$
DECLARE
	qq record;
BEGIN
	FOR qq IN SELECT q, route, eps, gap FROM ip_queries JOIN ip_routes USING (rid) ORDER BY q LOOP
		INSERT INTO ip_idx
		SELECT qq.q, count(*), md5(string_agg(id::text, ',' ORDER BY id))
		FROM ip_trips WHERE frechet_pings_at_most(pings, qq.route, qq.eps, qq.gap);
	END LOOP;
END $$;
RESET enable_seqscan;
SELECT q, s.n AS rows_seq, i.n AS rows_index, s.ids IS NOT DISTINCT FROM i.ids AS same_rows
FROM ip_seq s JOIN ip_idx i USING (q) ORDER BY q;

-- Which kinds each query keeps (route 1): noisy trips at a tolerance above
-- their noise; never backwards, partial or wandering ones.
SELECT t.kind, count(*) FILTER (WHERE frechet_pings_at_most(t.pings, r.route, 25)) AS kept_25,
       count(*) FILTER (WHERE frechet_pings_at_most(t.pings, r.route, 60)) AS kept_60, count(*) AS trips
FROM ip_trips t JOIN ip_routes r USING (rid) WHERE r.rid = 1 GROUP BY t.kind ORDER BY t.kind;

-- What the index passes on to the function, and what it keeps (route 1, eps 25).
SELECT count(*) FILTER (WHERE pings |~~~| frechet_reach(r.route, 25)) AS index_candidates,
       count(*) FILTER (WHERE frechet_pings_at_most(pings, r.route, 25)) AS rows_kept,
       count(*) AS table_rows
FROM ip_trips, ip_routes r WHERE r.rid = 1;

DROP TABLE ip_trips, ip_routes, ip_queries, ip_seq, ip_idx;
