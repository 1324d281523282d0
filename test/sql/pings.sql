-- Sparse pings matched in order to a route (frechet_pings_at_most,
-- frechet_pings_distance) on point[].

-- A street route with right-angle corners, and a bus pinged every 30 s:
-- each ping within 12 m of the route, corners between pings.
CREATE TABLE ping_route AS
SELECT '{"(0,0)","(400,0)","(400,300)","(800,300)","(800,600)"}'::point[] AS route;
CREATE TABLE ping_trip (id int, label text, track point[]);
INSERT INTO ping_trip VALUES
	(1, 'on route', '{"(3,-5)","(250,8)","(392,150)","(550,307)","(700,291)","(809,500)","(795,604)"}'),
	(2, 'backwards', '{"(795,604)","(809,500)","(700,291)","(550,307)","(392,150)","(250,8)","(3,-5)"}'),
	(3, 'detour', '{"(3,-5)","(250,8)","(392,150)","(550,507)","(700,291)","(809,500)","(795,604)"}'),
	(4, 'middle skipped', '{"(3,-5)","(250,8)","(809,500)","(809,500)","(809,500)","(809,500)","(795,604)"}');

-- The continuous distance measures the chords across the corners; the
-- pings, each within 12 m, pass at 50 m.  The ping distance is at most the
-- continuous one (common practice: the vertices of a continuous matching
-- are a ping matching).
SELECT id, label,
       frechet_at_most(track, route, 50) AS continuous_50,
       frechet_pings_at_most(track, route, 50) AS pings_50,
       frechet_pings_at_most(track, route, 50, 450) AS pings_50_gap_450,
       round(frechet_pings_distance(track, route)::numeric, 6) AS ping_distance,
       frechet_pings_distance(track, route) <= frechet_distance(track, route) AS not_above_continuous
FROM ping_trip, ping_route ORDER BY id;

-- Exact: the distance is the decision's threshold.
SELECT id,
       frechet_pings_at_most(track, route, d) AS at_d,
       frechet_pings_at_most(track, route, d * (1 - 1e-9)) AS below_d
FROM ping_trip, ping_route, LATERAL (SELECT frechet_pings_distance(track, route) AS d) x
ORDER BY id;

-- Worked by hand: a back-and-forth pair of pings on a 10 m route meets at
-- x = 5, sqrt(10) from both; one ping must be near the whole route.
SELECT abs(frechet_pings_distance('{"(0,0)","(8,1)","(2,1)","(10,0)"}'::point[], '{"(0,0)","(10,0)"}'::point[]) - sqrt(10)) < 1e-12 AS back_and_forth,
       frechet_pings_distance('{"(5,3)"}'::point[], '{"(0,0)","(10,0)"}'::point[]) = sqrt(34) AS one_ping,
       frechet_pings_distance('{"(0,1)","(10,-2)"}'::point[], '{"(0,0)","(10,0)"}'::point[], 9.5) AS gap_too_short,
       frechet_pings_distance('{"(0,1)","(10,-2)"}'::point[], '{"(0,0)","(10,0)"}'::point[], 10) AS gap_enough;

-- Where the pings left the route: runs of off-route pings of an in-order
-- plan with the fewest (ping numbers from 1, route positions k + t).
-- The detour's one ping; backwards, all but the one ping that can stay.
SELECT id, label, x.*
FROM ping_trip, ping_route, frechet_pings_excursions(track, route, 50) x
ORDER BY id, ping_from;
-- none exactly when the ping test passes
SELECT id, frechet_pings_at_most(track, route, 50) AS pings_50,
       (SELECT count(*) FROM frechet_pings_excursions(track, route, 50)) AS excursions
FROM ping_trip, ping_route ORDER BY id;

-- NULL: no limit for max_gap; NULL trip, route or epsilon give NULL.
SELECT frechet_pings_at_most(track, route, 50, NULL) AS null_gap,
       frechet_pings_at_most(NULL, route, 50) AS null_trip,
       frechet_pings_at_most(track, route, NULL) AS null_eps,
       frechet_pings_distance(track, NULL) AS null_route
FROM ping_trip, ping_route WHERE id = 1;

-- Bad input.
CREATE FUNCTION pg_temp.try(stmt text) RETURNS text
LANGUAGE plpgsql AS $$
BEGIN
	EXECUTE stmt;
	RETURN 'ok';
EXCEPTION WHEN OTHERS THEN
	RETURN SQLSTATE || ': ' || SQLERRM;
END
$$;
SELECT pg_temp.try($$SELECT frechet_pings_at_most('{"(0,0)","(1,1)"}'::point[], '{"(0,0)","(1,1)"}'::point[], 1, -1)$$) AS negative_gap,
       pg_temp.try($$SELECT frechet_pings_distance('{"(0,0)","(1,1)"}'::point[], '{"(0,0)","(1,1)"}'::point[], 'NaN')$$) AS nan_gap,
       pg_temp.try($$SELECT frechet_pings_at_most('{"(0,0)","(1,1)"}'::point[], '{"(0,0)","(1,1)"}'::point[], 'NaN')$$) AS nan_eps,
       pg_temp.try($$SELECT frechet_pings_at_most('{}'::point[], '{"(0,0)","(1,1)"}'::point[], 1)$$) AS empty_trip;

-- 10,000 pings against their route: every ping on the route, in order.
SELECT frechet_pings_at_most(array(SELECT point(i * 0.1, (i % 7) * 0.01) FROM generate_series(0, 10000) i),
                             array(SELECT point(i * 10, 0) FROM generate_series(0, 100) i), 0.07) AS long_trip,
       frechet_pings_at_most(array(SELECT point(i * 0.1, (i % 7) * 0.01) FROM generate_series(0, 10000) i),
                             array(SELECT point(i * 10, 0) FROM generate_series(0, 100) i), 0.05) AS long_trip_tight;

DROP TABLE ping_trip, ping_route;
