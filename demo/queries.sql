-- The demo's queries: what a Wrenmere Valley Buses analyst asks.
\pset border 2
\pset null '-'
\set eps 60

\echo
\echo '== 1. The nightly check: which trips left their line by more than 60 m?'
\echo '   frechet_at_most answers yes/no without computing the distance.'
SELECT line_id, l.name, count(*) AS trips,
       count(*) FILTER (WHERE NOT frechet_at_most(t.track, l.route, :eps)) AS flagged
FROM trip t JOIN bus_line l USING (line_id)
GROUP BY line_id, l.name ORDER BY length(line_id), line_id;

\echo '   ... and the flagged trips ranked by how far they strayed (metres; the worst two of each kind).'
\echo '   The discrete value couples GPS fixes only, so sparse sampling inflates it.'
CREATE TEMP TABLE flagged AS
SELECT t.trip_id, t.vehicle, t.line_id, t.story, frechet_distance(t.track, l.route) AS frechet_m,
       discrete_frechet_distance(t.track, l.route) AS discrete_m
FROM trip t JOIN bus_line l USING (line_id)
WHERE NOT frechet_at_most(t.track, l.route, :eps);
SELECT rank, trip_id, vehicle, line_id, story, round(frechet_m::numeric) AS frechet_m,
       round(discrete_m::numeric) AS discrete_m
FROM (SELECT *, rank() OVER (ORDER BY frechet_m DESC) AS rank,
             row_number() OVER (PARTITION BY split_part(story, ' ', 1) ORDER BY frechet_m DESC) AS in_kind
      FROM flagged) r
WHERE in_kind <= 2 ORDER BY frechet_m DESC, trip_id;
SELECT count(*) AS flagged_trips, count(*) FILTER (WHERE story LIKE 'driven backwards') AS backwards,
       count(*) FILTER (WHERE story LIKE 'detour%') AS detours,
       count(*) FILTER (WHERE story IN ('turned back early', 'joined the line late', 'middle part of the line only')) AS partial,
       count(*) FILTER (WHERE story = 'GPS glitch') AS gps_glitches,
       count(*) FILTER (WHERE story = 'ordinary') AS ordinary
FROM flagged;

\echo '== 2. Where did each flagged trip leave its line? (the 15 farthest excursions)'
\echo '   Positions k + t: t of the way from vertex k to vertex k + 1 of the trip or the line.'
SELECT f.trip_id, f.line_id, f.story, x.trip_from, x.trip_to,
       round(x.route_from::numeric, 2) AS left_line_at, round(x.route_to::numeric, 2) AS rejoined_at,
       round(x.max_leash::numeric) AS farthest_m, round(x.trip_length::numeric) AS off_route_m
FROM flagged f JOIN trip t USING (trip_id) JOIN bus_line l ON l.line_id = f.line_id,
     frechet_excursions(t.track, l.route, :eps) x
WHERE f.story LIKE 'detour%' OR f.story = 'GPS glitch'
ORDER BY x.max_leash DESC LIMIT 15;

\echo '== 3. Order matters: a trip driven backwards stays on the streets of its line,'
\echo '   yet its Fréchet distance is far beyond GPS noise; against the reversed line it is small.'
SELECT t.trip_id, t.line_id, t.story,
       round(frechet_distance(t.track, l.route)::numeric) AS frechet_m,
       round(frechet_distance(t.track, demo_reverse(l.route))::numeric, 1) AS against_reversed_line_m
FROM trip t JOIN bus_line l USING (line_id)
WHERE t.story = 'driven backwards' ORDER BY t.trip_id LIMIT 6;

\echo '== 4. Unlabelled trips: the nearest line by Fréchet distance (operator <->)'
CREATE TEMP TABLE assigned AS
SELECT t.trip_id, t.story, c1.line_id AS nearest_line, c1.d AS frechet_m,
       c2.line_id AS runner_up, c2.d AS runner_up_m
FROM trip t,
     LATERAL (SELECT l.line_id, t.track <-> l.route AS d FROM bus_line l
              ORDER BY t.track <-> l.route LIMIT 1) c1,
     LATERAL (SELECT l.line_id, t.track <-> l.route AS d FROM bus_line l
              ORDER BY t.track <-> l.route OFFSET 1 LIMIT 1) c2
WHERE t.line_id IS NULL;
SELECT trip_id, story, nearest_line, round(frechet_m::numeric, 1) AS frechet_m,
       runner_up, round(runner_up_m::numeric) AS runner_up_m
FROM assigned ORDER BY trip_id LIMIT 12;
SELECT count(*) AS unlabelled_trips,
       count(*) FILTER (WHERE story = 'unlabelled, drove ' || nearest_line) AS assigned_to_the_line_driven,
       round(max(frechet_m)::numeric, 1) AS largest_distance_m,
       round(min(runner_up_m)::numeric) AS smallest_runner_up_m
FROM assigned;

\echo '== 5. The 10 trips most like trip 1003 (a GiST index on the tracks, ORDER BY <-> LIMIT 10)'
CREATE INDEX trip_track_idx ON trip USING gist (track);
ANALYZE trip;
EXPLAIN (COSTS OFF)
SELECT trip_id FROM trip ORDER BY track <-> (SELECT track FROM trip WHERE trip_id = 1003) LIMIT 10;
SELECT trip_id, vehicle, coalesce(line_id, '(unlabelled)') AS line_id, story,
       round((track <-> (SELECT track FROM trip WHERE trip_id = 1003))::numeric, 1) AS frechet_m
FROM trip ORDER BY track <-> (SELECT track FROM trip WHERE trip_id = 1003) LIMIT 10;

\echo '== 6. Trips that covered only part of their line: which part, and how closely'
\echo '   (flagged against the whole line, yet within 60 m of a part of it)'
SELECT f.trip_id, f.line_id, f.story, round(f.frechet_m::numeric) AS whole_line_m,
       round(p.route_from::numeric, 2) AS from_pos, round(p.route_to::numeric, 2) AS to_pos,
       array_length(l.route, 1) AS line_vertices, round(p.distance::numeric, 1) AS part_m
FROM flagged f JOIN trip t USING (trip_id) JOIN bus_line l ON l.line_id = f.line_id,
     frechet_partial_match(t.track, l.route, :eps) p
WHERE frechet_partial_distance(t.track, l.route) <= :eps
ORDER BY length(f.line_id), f.line_id, f.trip_id LIMIT 16;
SELECT count(*) AS partial_trips_found,
       count(*) FILTER (WHERE f.story IN ('turned back early', 'joined the line late', 'middle part of the line only'))
         AS of_them_simulated_partial
FROM flagged f JOIN trip t USING (trip_id) JOIN bus_line l ON l.line_id = f.line_id
WHERE frechet_partial_distance(t.track, l.route) <= :eps;

\echo '== 7. The witness for one detour: the pair of points where the leash is longest'
SELECT t.trip_id, t.story, round(b.a_pos::numeric, 2) AS trip_pos,
       format('(%s, %s)', round(b.a_point[0]::numeric), round(b.a_point[1]::numeric)) AS trip_point,
       round(b.b_pos::numeric, 2) AS line_pos,
       format('(%s, %s)', round(b.b_point[0]::numeric), round(b.b_point[1]::numeric)) AS line_point,
       round(b.leash::numeric, 1) AS leash_m
FROM trip t JOIN bus_line l USING (line_id), frechet_bottleneck(t.track, l.route) b
WHERE t.trip_id = 104;

\echo '== 8. The new 30-second trackers: pings in order, not the chords between them'
\echo '   The straight line between two pings cuts the corners of the streets, so the'
\echo '   continuous test flags ordinary trips; the ping test asks whether every ping lies'
\echo '   within 60 m of the line, in order from its start to its end.  max_gap (the most a'
\echo '   bus drives between two pings, here 600 m) also checks that no part of the line was'
\echo '   skipped between two pings.'
SELECT p.story, count(*) AS trips,
       count(*) FILTER (WHERE NOT frechet_at_most(p.pings, l.route, :eps)) AS flagged_continuous,
       count(*) FILTER (WHERE NOT frechet_pings_at_most(p.pings, l.route, :eps)) AS flagged_pings,
       count(*) FILTER (WHERE NOT frechet_pings_at_most(p.pings, l.route, :eps, 600)) AS flagged_pings_gap_600,
       round(avg(frechet_distance(p.pings, l.route))::numeric) AS avg_continuous_m,
       round(avg(frechet_pings_distance(p.pings, l.route))::numeric) AS avg_pings_m
FROM ping_trip p JOIN bus_line l USING (line_id)
GROUP BY p.story ORDER BY p.story;

\echo
\echo '== 9. Road works on Mill Street: which buses went round by Tanners Row?'
\echo '   frechet_passes asks whether some part of a trip drove the whole stretch, in its'
\echo '   direction, within 30 m (the rest of the trip is free); the GiST index on the tracks'
\echo '   hands it only the trips whose box can hold such a part.'
SELECT w.story, count(*) FILTER (WHERE frechet_passes(w.track, s.stretch, 30)) AS drove_tanners_row,
       count(*) AS trips
FROM works_trip w, street s WHERE s.name = 'Tanners Row'
GROUP BY w.story ORDER BY w.story;

\echo '   ... where on each trip (positions k + t) and how closely, by frechet_passage:'
SELECT w.trip_id, round(p.trip_from::numeric, 2) AS trip_from, round(p.trip_to::numeric, 2) AS trip_to,
       round(p.distance::numeric, 1) AS metres
FROM works_trip w, street s, frechet_passage(w.track, s.stretch, 30) p
WHERE s.name = 'Tanners Row' ORDER BY w.trip_id;

\echo '   ... and the five trips that drove nearest to Mill Street (ORDER BY <~~>>, the index'
\echo '   bounding each branch by the street''s distance to its box):'
SELECT w.trip_id, w.story, round((w.track <~~>> s.stretch)::numeric, 1) AS metres
FROM works_trip w, street s WHERE s.name = 'Mill Street'
ORDER BY w.track <~~>> (SELECT stretch FROM street WHERE name = 'Mill Street') LIMIT 5;
