-- frechet_track_check on point[]: NULL for a track every function accepts,
-- otherwise the words of the ERROR the functions raise (message, then what
-- the argument has), never an ERROR itself; and the nightly-batch pattern
-- of README.md ("Bad rows in a batch") on 100,000 trips with about 1 % bad
-- rows: a partial index WHERE frechet_track_check(track) IS NULL, queries
-- with the same predicate use it and equal a sequential scan, and the flag
-- job skips and lists the bad rows, serially and in parallel.
SELECT setseed(0.5);

-- The message and detail a statement raises, or 'no error'.
CREATE FUNCTION pg_temp.error_of(stmt text) RETURNS text
LANGUAGE plpgsql AS $$
DECLARE
	msg text;
	det text;
BEGIN
	EXECUTE stmt;
	RETURN 'no error';
EXCEPTION WHEN OTHERS THEN
	GET STACKED DIAGNOSTICS msg = MESSAGE_TEXT, det = PG_EXCEPTION_DETAIL;
	RETURN msg || ' / ' || det;
END $$;

CREATE TEMP TABLE samples (label text, track point[]);
INSERT INTO samples VALUES
	('good', '{"(0,0)","(4,3)","(8,0)"}'),
	('one point', '{"(2,2)"}'),
	('repeated points', '{"(1,1)","(1,1)","(2,2)"}'),
	('at 1e150', array[point(1e150, 0), point(0, 0)]),
	('empty', '{}'),
	('NULL element', '{"(0,0)",NULL,"(1,1)"}'),
	('NULL element, lower bound 5', '[5:7]={"(0,0)","(1,1)",NULL}'),
	('NaN', array[point(0, 0), point(1, 1), point('NaN', 1)]),
	('+Infinity', array[point(3, 4), point('Infinity', 1)]),
	('above 1e150', array[point(7, 8), point(2e150, 0)]),
	('two dimensions', '{{"(0,0)"},{"(1,1)"}}');

-- The check's text is the ERROR's message, a colon, and what the argument
-- has; the ERROR's detail says the same and where the track starts.
SELECT label, frechet_track_check(track) AS check_text,
       pg_temp.error_of(format('SELECT frechet_distance(%L::point[], %L::point[])', track, '{"(0,0)","(8,0)"}')) AS error
FROM samples ORDER BY label;
SELECT label
FROM samples
WHERE (frechet_track_check(track) IS NULL) <>
      (pg_temp.error_of(format('SELECT frechet_distance(%L::point[], %L::point[])', track, '{"(0,0)","(8,0)"}')) = 'no error')
   OR NOT starts_with(pg_temp.error_of(format('SELECT frechet_distance(%L::point[], %L::point[])', track, '{"(0,0)","(8,0)"}')),
                      split_part(coalesce(frechet_track_check(track), 'no error'), ': ', 1));
-- as the second argument the ERROR names argument 2, the check is the same
SELECT pg_temp.error_of($$SELECT frechet_at_most('{"(0,0)"}'::point[], array[point(5, 6), point('NaN', 0)], 1)$$);

-- A batch: 12 bus lines, 100,000 trips through every stop of their line
-- within 8 units, one in 50 within 40, and 1 % of them bad in the ways a
-- nightly load goes wrong.
CREATE TABLE batch_lines AS
SELECT l AS line,
       array(SELECT point(200 * l + 60 * k, 30 * (k % 3) + 5 * l) FROM generate_series(0, 9) k) AS route
FROM generate_series(1, 12) l;
CREATE TABLE batch_trips (id int PRIMARY KEY, line int, track point[]);
INSERT INTO batch_trips
SELECT i, 1 + i % 12,
       array(SELECT point((r.route[k])[0] + (random() - 0.5) * (CASE WHEN i % 50 = 7 THEN 80 ELSE 16 END),
                          (r.route[k])[1] + (random() - 0.5) * 16)
             FROM generate_series(1, 10) k ORDER BY k)
FROM generate_series(1, 100000) s(i)
JOIN batch_lines r ON r.line = 1 + s.i % 12;
-- the bad rows: every 100th trip, in five ways
UPDATE batch_trips SET track = CASE (id / 100) % 5
		WHEN 0 THEN '{}'::point[]
		WHEN 1 THEN track[1:2] || NULL::point || track[3:]
		WHEN 2 THEN track[1:3] || point('NaN', 0) || track[4:]
		WHEN 3 THEN track || point('Infinity', 'Infinity')
		ELSE track[1:1] || point(1e200, 0) || track[2:]
	END
WHERE id % 100 = 0;
SELECT split_part(coalesce(frechet_track_check(track), 'valid'), ':', 1) AS check_says, count(*)
FROM batch_trips GROUP BY 1 ORDER BY 1;

-- Without the filter the flag job stops at the first bad row, and the
-- ERROR says where that track starts (or that it is empty), to find it.
SELECT pg_temp.error_of($$SELECT count(*) FROM batch_trips t JOIN batch_lines USING (line)
                          WHERE NOT frechet_at_most(t.track, route, 25) AND t.id BETWEEN 150 AND 250$$) AS first_error;

-- The partial index leaves the bad rows out; queries with the same predicate use it.
CREATE INDEX batch_trips_track ON batch_trips USING gist (track frechet_track_ops)
	WHERE frechet_track_check(track) IS NULL;
ANALYZE batch_trips;
EXPLAIN (COSTS OFF)
SELECT id FROM batch_trips
WHERE frechet_track_check(track) IS NULL
  AND frechet_at_most(track, (SELECT route FROM batch_lines WHERE line = 3), 25);

-- Index and sequential scan agree, for every line.
CREATE TEMP TABLE by_index AS
SELECT l.line, array_agg(t.id ORDER BY t.id) AS ids
FROM batch_lines l, LATERAL (SELECT id FROM batch_trips
                             WHERE frechet_track_check(track) IS NULL
                               AND frechet_at_most(track, l.route, 25)) t
GROUP BY l.line;
SET enable_indexscan = off;
SET enable_bitmapscan = off;
CREATE TEMP TABLE by_seqscan AS
SELECT l.line, array_agg(t.id ORDER BY t.id) AS ids
FROM batch_lines l, LATERAL (SELECT id FROM batch_trips
                             WHERE frechet_track_check(track) IS NULL
                               AND frechet_at_most(track, l.route, 25)) t
GROUP BY l.line;
RESET enable_indexscan;
RESET enable_bitmapscan;
SELECT count(*) AS lines, sum(cardinality(i.ids)) AS trips_within_25,
       bool_and(i.ids = s.ids) AS index_equals_seqscan
FROM by_index i FULL JOIN by_seqscan s USING (line);

-- The flag job: trips that left their line, the bad rows skipped and
-- listed; the same serially and with parallel workers.
CREATE TEMP TABLE flagged_serial AS
SELECT t.id FROM batch_trips t JOIN batch_lines USING (line)
WHERE frechet_track_check(t.track) IS NULL AND NOT frechet_at_most(t.track, route, 25);
SET max_parallel_workers_per_gather = 2;
SET parallel_setup_cost = 0;
SET parallel_tuple_cost = 0;
SET min_parallel_table_scan_size = 0;
EXPLAIN (COSTS OFF)
SELECT t.id FROM batch_trips t JOIN batch_lines USING (line)
WHERE frechet_track_check(t.track) IS NULL AND NOT frechet_at_most(t.track, route, 25);
CREATE TEMP TABLE flagged_parallel AS
SELECT t.id FROM batch_trips t JOIN batch_lines USING (line)
WHERE frechet_track_check(t.track) IS NULL AND NOT frechet_at_most(t.track, route, 25);
RESET max_parallel_workers_per_gather;
RESET parallel_setup_cost;
RESET parallel_tuple_cost;
RESET min_parallel_table_scan_size;
SELECT (SELECT count(*) FROM flagged_serial) AS flagged,
       (SELECT count(*) FROM flagged_serial WHERE id % 50 = 7) AS flagged_wide_ones,
       (SELECT array_agg(id ORDER BY id) FROM flagged_serial) = (SELECT array_agg(id ORDER BY id) FROM flagged_parallel) AS parallel_same;
SELECT id, frechet_track_check(track) AS skipped_because
FROM batch_trips WHERE frechet_track_check(track) IS NOT NULL ORDER BY id LIMIT 6;
SELECT count(*) AS skipped FROM batch_trips WHERE frechet_track_check(track) IS NOT NULL;

DROP TABLE batch_trips, batch_lines;
