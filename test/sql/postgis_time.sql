-- Time (M) and Z through the results of frechet_ext_postgis, and the
-- route an excursion skipped (route_length).  M is time in seconds, the
-- trajectory convention of PostGIS (ST_IsValidTrajectory: M increasing).
-- Outside sources: PostGIS's own ST_M, ST_Z, ST_Length, ST_LineSubstring
-- and ST_LineInterpolatePoint; hand-computed values are worked out in the
-- comments beside them.
CREATE EXTENSION IF NOT EXISTS postgis;
CREATE EXTENSION frechet_ext_postgis;

-- Bus 7 of the Kestrel Vale fleet (invented): a route along the x axis,
-- and a trip that leaves it between x = 200 and x = 300 (vertex 3 is 80 m
-- off), each vertex stamped with its time in seconds.
CREATE TEMP TABLE tv AS
SELECT 'SRID=32630;LINESTRING M(0 0 1000, 100 2 1010, 200 1 1020, 250 80 1030, 300 0 1045, 400 1 1050, 500 0 1060)'::geometry AS trip,
       'SRID=32630;LINESTRING(0 0, 250 0, 500 0)'::geometry AS route;

-- One excursion: the stretch from vertex 3 to vertex 5; its times are the
-- trip's M at those vertices (1020 and 1045).  The trip piece keeps M and
-- the SRID; PostGIS reads its first and last M back.
SELECT x.trip_from, x.trip_to, x.time_from, x.time_to,
       ST_M(ST_StartPoint(x.trip_piece)) AS piece_m_start, ST_M(ST_EndPoint(x.trip_piece)) AS piece_m_end,
       ST_Zmflag(x.trip_piece) AS zmflag, ST_SRID(x.trip_piece) AS srid
FROM tv, frechet_excursions(tv.trip, tv.route, 20) x;

-- route_length: the length of route between where the trip left it and
-- where it rejoined, against PostGIS's ST_Length of the same stretch cut
-- by ST_LineSubstring (the route's vertices are 250 m apart, so a position
-- k + t is the fraction (k - 1 + t) / 2 of its length).
SELECT round(x.route_length::numeric, 9) AS route_length,
       round(ST_Length(ST_LineSubstring(tv.route, (x.route_from - 1) / 2, (x.route_to - 1) / 2))::numeric, 9) AS postgis_length,
       round(ST_Length(frechet_track_piece(tv.route, x.route_from, x.route_to))::numeric, 9) AS piece_length
FROM tv, frechet_excursions(tv.trip, tv.route, 20) x;

-- Without M the times are NULL, and every spatial column is the same:
-- the answers never depend on M.
SELECT x.time_from IS NULL AND x.time_to IS NULL AS no_times,
       (x.trip_from, x.trip_to, x.route_from, x.route_to, x.max_leash, x.trip_length, x.route_length)
       = (y.trip_from, y.trip_to, y.route_from, y.route_to, y.max_leash, y.trip_length, y.route_length) AS same_answer,
       ST_Zmflag(x.trip_piece) AS zmflag
FROM tv, frechet_excursions(ST_Force2D(tv.trip), tv.route, 20) x, frechet_excursions(tv.trip, tv.route, 20) y;
SELECT frechet_distance(tv.trip, tv.route) = frechet_distance(ST_Force2D(tv.trip), tv.route) AS distance_ignores_m
FROM tv;

-- A fractional position's time, by hand: position 1.25 lies a quarter of
-- the way from vertex 1 (M 1000) to vertex 2 (M 1010): 1002.5; position
-- 4.6 lies 0.6 of the way from vertex 4 (M 1030) to vertex 5 (M 1045):
-- 1039.  X at 1.25 is 25 (a quarter of 0..100).
SELECT ST_AsText(ST_StartPoint(p)) AS start_point, ST_M(ST_EndPoint(p)) AS m_end, ST_NPoints(p) AS npoints
FROM tv, frechet_track_piece(tv.trip, 1.25, 4.6) p;

-- The same times from PostGIS: ST_LineInterpolatePoint interpolates M
-- along the length; on a segment that is the same linear blend, so its
-- point at the length share of position 4.6 has the same M.
SELECT round(ST_M(ST_EndPoint(frechet_track_piece(tv.trip, 1, 4.6)))::numeric, 9) AS ours,
       round(ST_M(ST_LineInterpolatePoint(tv.trip,
             (ST_Length(ST_MakeLine(ST_PointN(tv.trip, 1), ST_PointN(tv.trip, 2)))
              + ST_Length(ST_MakeLine(ST_PointN(tv.trip, 2), ST_PointN(tv.trip, 3)))
              + ST_Length(ST_MakeLine(ST_PointN(tv.trip, 3), ST_PointN(tv.trip, 4)))
              + 0.6 * ST_Length(ST_MakeLine(ST_PointN(tv.trip, 4), ST_PointN(tv.trip, 5)))) / ST_Length(tv.trip)))::numeric, 9) AS postgis
FROM tv;

-- Equal positions give a Point; the SRID is kept; positions off the track
-- and a backwards piece are errors.
SELECT ST_AsEWKT(frechet_track_piece(tv.trip, 2.5, 2.5)) FROM tv;
SELECT frechet_track_piece(tv.trip, 0.5, 2) FROM tv;
SELECT frechet_track_piece(tv.trip, 3, 2) FROM tv;

-- Z and M together: a piece keeps both (ZM), interpolated by hand: at
-- 1.5 Z is halfway from 10 to 30 (20) and M halfway from 0 to 60 (30).
SELECT ST_AsText(frechet_track_piece('LINESTRING ZM(0 0 10 0, 10 0 30 60, 20 0 30 120)'::geometry, 1.5, 3));

-- The matching's points and the leashes keep what their curves have: the
-- trip's point has M, the route's does not; a leash joins both, so it
-- keeps only what both have (here neither Z nor M).
SELECT bool_and(ST_Zmflag(m.a_point) = 1) AS trip_points_m, bool_and(ST_Zmflag(m.b_point) = 0) AS route_points_2d,
       -- M at k + t is M_k + t (M_{k+1} - M_k), from the vertices (ST_PointN)
       bool_and(abs(ST_M(m.a_point) - (ST_M(ST_PointN(tv.trip, floor(m.a_pos)::int))
                + (m.a_pos - floor(m.a_pos)) * coalesce(ST_M(ST_PointN(tv.trip, floor(m.a_pos)::int + 1))
                                                        - ST_M(ST_PointN(tv.trip, floor(m.a_pos)::int)), 0))) < 1e-9) AS m_interpolated,
       count(*) FILTER (WHERE m.a_pos <> floor(m.a_pos)) > 0 AS some_between_vertices
FROM tv, frechet_matching(tv.trip, tv.route) m;
SELECT ST_Zmflag(frechet_matching_leashes(tv.trip, tv.route)) AS leashes_zm,
       ST_Zmflag(frechet_matching_leashes(tv.trip, ST_AddMeasure(tv.route, 0, 100))) AS leashes_both_m
FROM tv;
SELECT ST_M(b.a_point) AS trip_time_at_bottleneck, ST_Zmflag(b.b_point) AS route_zm
FROM tv, frechet_bottleneck(tv.trip, tv.route) b;

-- A partial match's route part keeps the route's Z and M.  By hand: the
-- short trip follows the route from x = 100 to x = 300, positions 1.5 and
-- 2.5 of a route with vertices at x = 0, 200, 400 and M 0, 100, 300, so M
-- 50 and 200, Z halfway between the vertices' (5 -> 15, 25 -> 35).
SELECT round(m.route_from::numeric, 9) AS route_from, round(m.route_to::numeric, 9) AS route_to,
       ST_AsText(m.route_part) AS route_part
FROM frechet_partial_match('LINESTRING Z(100 1 15, 300 1 35)'::geometry,
                           'LINESTRING ZM(0 0 5 0, 200 0 25 100, 400 0 45 300)'::geometry, 2) m;

-- frechet_simplify keeps the Z and M of the vertices it keeps: every kept
-- vertex is one of the input's, with its own Z and M.
WITH t AS (SELECT 'LINESTRING ZM(0 0 1 100, 10 0.1 2 110, 20 0 3 120, 30 0.1 4 130, 40 30 5 140, 50 0 6 150)'::geometry AS g)
SELECT ST_AsText(frechet_simplify(g, 1)) AS simplified,
       (SELECT bool_and(EXISTS (SELECT FROM ST_DumpPoints(g) o
                                WHERE ST_X(o.geom) = ST_X(s.geom) AND ST_Z(o.geom) = ST_Z(s.geom) AND ST_M(o.geom) = ST_M(s.geom)))
        FROM ST_DumpPoints(frechet_simplify(g, 1)) s) AS own_vertices
FROM t;

-- Time must not run backwards where it is reported: 22023 naming the
-- argument and the vertex.  The spatial functions still answer, and
-- frechet_track_check reports it in the same words.
\set VERBOSITY default
SELECT * FROM frechet_excursions('LINESTRING M(0 0 10, 100 50 30, 200 0 20)'::geometry, 'LINESTRING(0 0, 200 0)'::geometry, 5);
SELECT frechet_track_piece('LINESTRING M(0 0 10, 100 50 30, 200 0 20)'::geometry, 1, 2);
SELECT * FROM frechet_partial_match('LINESTRING(0 0, 100 0)'::geometry, 'LINESTRING M(0 0 5, 100 0 3, 200 0 9)'::geometry, 5);
SELECT * FROM frechet_excursions('LINESTRING M(0 0 10, 100 50 NaN, 200 0 20)'::geometry, 'LINESTRING(0 0, 200 0)'::geometry, 5);
\set VERBOSITY terse
SELECT frechet_distance('LINESTRING M(0 0 10, 100 50 30, 200 0 20)'::geometry, 'LINESTRING(0 0, 200 0)'::geometry) AS distance;
SELECT frechet_track_check('LINESTRING M(0 0 10, 100 50 30, 200 0 20)'::geometry) AS check_geometry,
       frechet_track_check('LINESTRING M(0 0 10, 1 1 30, 2 0 20)'::geography) AS check_geography,
       frechet_track_check('LINESTRING M(0 0 10, 100 50 10, 200 0 20)'::geometry) AS equal_times_ok;

-- Geography with M and Z: metres, times, Z kept in the piece.  The trip
-- (about 0.0009 degrees north of the route in its middle, about 100 m)
-- leaves the route for one stretch.  route_length is along the chords of
-- the route: PostGIS's geodesic ST_Length of the same piece differs by
-- far less than a millimetre on edges this short.
WITH g AS (SELECT 'SRID=4326;LINESTRING ZM(-1.5 52.5 40 0, -1.499 52.5 41 30, -1.498 52.5009 42 60, -1.497 52.5 43 90, -1.496 52.5 44 120)'::geography AS trip,
                  'SRID=4326;LINESTRING(-1.5 52.5, -1.496 52.5)'::geography AS route)
SELECT x.trip_from, x.trip_to, x.time_from, x.time_to,
       abs(x.route_length - ST_Length(frechet_track_piece(g.route, x.route_from, x.route_to))) < 1e-3 AS route_length_ok,
       ST_Zmflag(x.trip_piece::geometry) AS zmflag, ST_Z(ST_StartPoint(x.trip_piece::geometry)) AS z_start
FROM g, frechet_excursions(g.trip, g.route, 30) x;

-- point[] excursions gain route_length too: the same value as geometry on
-- the same coordinates.
SELECT p.route_length = x.route_length AS same_route_length
FROM tv, frechet_excursions(array(SELECT point(ST_X(d.geom), ST_Y(d.geom)) FROM ST_DumpPoints(tv.trip) d),
                            '{"(0,0)","(250,0)","(500,0)"}'::point[], 20) p,
     frechet_excursions(tv.trip, tv.route, 20) x;

-- Sparse pings: each run's times are the M of its first and last pings.
SELECT x.ping_from, x.ping_to, x.time_from, x.time_to, round(x.route_length::numeric, 6) AS route_length
FROM tv, frechet_pings_excursions(tv.trip, tv.route, 20) x;

-- A trip in progress against a timetabled route (M = the time due at each
-- stop): route_point carries the time due where the bus is now, so
-- lateness is the trip's last time minus that.  By hand: the last ping
-- (396, 2) is nearest route x = 396, due at 1000 + 396/400 * 200 = 1198 s;
-- the ping is at 1290 s: 92 s late.
SELECT round(ST_X(p.route_point)::numeric, 6) AS x, round(ST_M(p.route_point)::numeric, 6) AS due,
       round((ST_M(ST_EndPoint(trip)) - ST_M(p.route_point))::numeric, 6) AS seconds_late
FROM (SELECT 'LINESTRING M(2 1 1005, 150 3 1100, 300 -2 1200, 396 2 1290)'::geometry AS trip) t,
     frechet_progress(t.trip, 'LINESTRING M(0 0 1000, 400 0 1200, 800 0 1400)'::geometry, 10) p;

-- GeoJSON for dashboards: with M, each track feature carries its times,
-- one a vertex (ST_M of each vertex, from PostGIS), and each excursion its
-- time_from and time_to; the caller's properties are in every feature.
SELECT (j->'features'->0->'properties'->'times')
       = (SELECT jsonb_agg(ST_M(d.geom) ORDER BY d.path) FROM ST_DumpPoints(tv.trip) d) AS trip_times,
       j->'features'->1->'properties' ? 'times' AS route_has_times,
       j->'features'->4->'properties'->>'time_from' AS excursion_from,
       j->'features'->4->'properties'->>'time_to' AS excursion_to,
       (SELECT bool_and(f->'properties'->>'bus' = '7') FROM jsonb_array_elements(j->'features') f) AS bus_everywhere
FROM tv, LATERAL (SELECT frechet_geojson(tv.trip, tv.route, 20, '{"bus": 7}') AS j) g;
SELECT (frechet_geojson(tv.trip::geography, ST_Transform(tv.route, 4326)::geography, 20)->'features'->0->'properties'->'times')
       = (SELECT jsonb_agg(ST_M(d.geom) ORDER BY d.path) FROM ST_DumpPoints(tv.trip) d) AS geography_trip_times
FROM (SELECT ST_Transform(trip, 4326) AS trip, route FROM tv) tv;
\set VERBOSITY default
SELECT frechet_geojson('LINESTRING(0 0, 200 0)'::geometry, 'LINESTRING M(0 0 10, 100 50 30, 200 0 20)'::geometry);
\set VERBOSITY terse

DROP TABLE tv;
DROP EXTENSION frechet_ext_postgis;
DROP EXTENSION postgis;
