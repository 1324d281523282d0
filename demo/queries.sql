-- The demo's queries: what a Wrenmere Valley Buses analyst asks.
\pset border 2
\pset null '-'

\echo
\echo '== 1. How closely did each trip follow its planned line? (the worst 12, metres)'
\echo '   The discrete value couples GPS fixes only, so sparse sampling inflates it;'
\echo '   the continuous Fréchet distance does not depend on where the fixes fall.'
SELECT t.trip_id, t.vehicle, t.line_id, t.story,
       round(frechet_distance(t.track, l.route)::numeric, 1) AS frechet_m,
       round(discrete_frechet_distance(t.track, l.route)::numeric, 1) AS discrete_m
FROM trip t JOIN bus_line l USING (line_id)
ORDER BY frechet_distance(t.track, l.route) DESC
LIMIT 12;

\echo '== 2. The nightly check: which trips left their line by more than 60 m?'
\echo '   (frechet_at_most answers yes/no without computing the distance)'
SELECT line_id,
       count(*) AS trips,
       count(*) FILTER (WHERE NOT frechet_at_most(t.track, l.route, 60)) AS flagged,
       string_agg(trip_id::text, ', ' ORDER BY trip_id) FILTER (WHERE NOT frechet_at_most(t.track, l.route, 60)) AS flagged_trips
FROM trip t JOIN bus_line l USING (line_id)
GROUP BY line_id ORDER BY line_id;

\echo '== 3. Order matters: a trip driven backwards stays on the streets of its line,'
\echo '   yet its Fréchet distance is far beyond GPS noise; against the reversed line it is small.'
SELECT t.trip_id, t.story,
       round(frechet_distance(t.track, l.route)::numeric, 0) AS frechet_m,
       round(frechet_distance(t.track, demo_reverse(l.route))::numeric, 1) AS against_reversed_line_m
FROM trip t JOIN bus_line l USING (line_id)
WHERE t.story = 'driven backwards' ORDER BY t.trip_id;

\echo '== 4. Unlabelled trips: the nearest line by Fréchet distance (operator <->)'
SELECT t.trip_id, t.story, best.line_id AS nearest_line, round(best.d::numeric, 1) AS frechet_m
FROM trip t,
     LATERAL (SELECT l.line_id, t.track <-> l.route AS d
              FROM bus_line l ORDER BY t.track <-> l.route LIMIT 1) best
WHERE t.line_id IS NULL ORDER BY t.trip_id;

\echo '== 5. Where did each flagged trip leave its line? (positions: vertex numbers along trip and line)'
SELECT t.trip_id, t.story, x.trip_from, x.trip_to,
       round(x.route_from::numeric, 2) AS left_line_at, round(x.route_to::numeric, 2) AS rejoined_at,
       round(x.max_leash::numeric, 0) AS farthest_m, round(x.trip_length::numeric, 0) AS off_route_m
FROM trip t JOIN bus_line l USING (line_id), frechet_excursions(t.track, l.route, 60) x
WHERE t.story NOT LIKE 'driven backwards' AND t.story NOT LIKE 'covered part%'
ORDER BY t.trip_id, x.trip_from;

\echo '== 6. Trips that covered only part of their line: which part, and how closely'
SELECT t.trip_id, t.story,
       round(frechet_distance(t.track, l.route)::numeric, 0) AS whole_line_m,
       round(p.route_from::numeric, 2) AS from_pos, round(p.route_to::numeric, 2) AS to_pos,
       array_length(l.route, 1) AS line_vertices, round(p.distance::numeric, 1) AS part_m
FROM trip t JOIN bus_line l USING (line_id),
     frechet_partial_match(t.track, l.route, 60) p
WHERE NOT frechet_at_most(t.track, l.route, 60) AND frechet_partial_distance(t.track, l.route) <= 60
ORDER BY t.trip_id;

\echo '== 7. The witness for one detour: the pair of points where the leash is longest'
SELECT t.trip_id, round(b.a_pos::numeric, 2) AS trip_pos,
       format('(%s, %s)', round(b.a_point[0]::numeric), round(b.a_point[1]::numeric)) AS trip_point,
       round(b.b_pos::numeric, 2) AS line_pos,
       format('(%s, %s)', round(b.b_point[0]::numeric), round(b.b_point[1]::numeric)) AS line_point,
       round(b.leash::numeric, 1) AS leash_m
FROM trip t JOIN bus_line l USING (line_id), frechet_bottleneck(t.track, l.route) b
WHERE t.trip_id = 104;
