-- frechet_progress on point[]: a trip in progress on its route.  One row
-- when all of the trip so far is within epsilon of a prefix of the route,
-- with where it is now; no row otherwise.
SELECT setseed(0.125);

-- an L-shaped route 20 long; a trip along its first half
SELECT route_pos, route_fraction, route_point
FROM frechet_progress('{"(0,0.5)","(3,-0.4)","(5,0.3)"}'::point[], '{"(0,0)","(10,0)","(10,10)"}'::point[], 1);
-- not started (first point far from the route's start): no row
SELECT count(*) AS not_started
FROM frechet_progress('{"(5,5)","(6,5)"}'::point[], '{"(0,0)","(10,0)","(10,10)"}'::point[], 1);
-- finished: the route's end
SELECT route_pos, route_fraction
FROM frechet_progress('{"(0,0)","(10,0.5)","(10,10)"}'::point[], '{"(0,0)","(10,0)","(10,10)"}'::point[], 1);
-- a bus waiting at the first stop of a loop line is at the start, not the end
SELECT round(route_pos::numeric, 3) AS pos, round(route_fraction::numeric, 3) AS fraction
FROM frechet_progress('{"(0.2,0.1)","(0.1,-0.1)","(0.3,0.2)"}'::point[],
                      '{"(0,0)","(10,0)","(10,10)","(0,10)","(0,0)"}'::point[], 1);
-- left the route on the way: no row
SELECT count(*) AS left_route
FROM frechet_progress('{"(0,0)","(5,0)","(5,6)"}'::point[], '{"(0,0)","(10,0)","(10,10)"}'::point[], 1);

-- A bus along a 12-stop line, its trip so far after each ping: the trip
-- so far is within epsilon of the route up to the place reported (checked
-- with frechet_at_most on frechet_track_piece), and the place advances.
CREATE TEMP TABLE line AS
SELECT array(SELECT point(100 * k, 40 * sin(k)) FROM generate_series(0, 11) k) AS route;
CREATE TEMP TABLE pings AS
SELECT j, point((l.route[1 + j / 4])[0] + ((l.route[2 + j / 4])[0] - (l.route[1 + j / 4])[0]) * (j % 4) / 4.0 + (random() - 0.5) * 6,
                (l.route[1 + j / 4])[1] + ((l.route[2 + j / 4])[1] - (l.route[1 + j / 4])[1]) * (j % 4) / 4.0 + (random() - 0.5) * 6) AS p
FROM line l, generate_series(0, 43) j;
CREATE TEMP TABLE so_far AS
SELECT k, x.route_pos, x.route_fraction,
       frechet_at_most(t.trip, frechet_track_piece(l.route, 1, x.route_pos), 10 * (1 + 1e-9)) AS prefix_within_eps
FROM line l,
     LATERAL (SELECT k, array(SELECT p FROM pings WHERE j < k ORDER BY j) AS trip FROM generate_series(1, 44) k) t,
     LATERAL frechet_progress(t.trip, l.route, 10) x;
SELECT count(*) AS trips_so_far, bool_and(prefix_within_eps) AS all_prefixes_within_eps,
       bool_and(route_pos >= prev - 0.05) AS advances,
       round(min(route_fraction)::numeric, 3) AS first_fraction, round(max(route_fraction)::numeric, 3) AS last_fraction
FROM (SELECT *, lag(route_pos, 1, 1.0) OVER (ORDER BY k) AS prev FROM so_far) s;

-- bad input as elsewhere
SELECT count(*) FROM frechet_progress('{"(0,0)"}'::point[], '{"(0,0)","(1,0)"}'::point[], 'NaN');
SELECT count(*) FROM frechet_progress('{}'::point[], '{"(0,0)","(1,0)"}'::point[], 1);
SELECT count(*) AS strict_null FROM frechet_progress(NULL::point[], '{"(0,0)","(1,0)"}'::point[], 1);
