-- The demo's second part, with PostGIS: Wrenmere Vale placed on the globe
-- (an invented spot; the town is fiction) and its trips as trajectories,
-- geography LINESTRING M whose M is the time in epoch seconds, the
-- trajectory convention of PostGIS.  The timetable gives each line's
-- vertices the time a bus is due there.  Times are simulated: a trip
-- leaves up to 4.5 minutes after its scheduled time and drives at its
-- own steady speed.

\set VERBOSITY terse
CREATE EXTENSION IF NOT EXISTS frechet_ext_postgis CASCADE;

-- The local grid (metres east and north of the town hall) to longitude
-- and latitude around an invented origin, on a local tangent plane (good
-- to a metre over the town's 6 km); M from the distance driven so far.
CREATE FUNCTION pg_temp.trajectory(track point[], depart float8, metres_per_s float8)
RETURNS geography LANGUAGE sql IMMUTABLE AS $$
	SELECT ST_SetSRID(ST_MakeLine(array_agg(
	           ST_MakePointM(-1.62 + p[0] / (111320 * cos(radians(53.05))), 53.05 + p[1] / 111200,
	                         depart + driven / metres_per_s) ORDER BY i)), 4326)::geography
	FROM (SELECT i, p, coalesce(sum(step) OVER (ORDER BY i), 0) AS driven
	      FROM (SELECT i, p, p <-> lag(p) OVER (ORDER BY i) AS step
	            FROM unnest(track) WITH ORDINALITY AS u(p, i)) s) d
$$;

-- 07:00 UTC on Monday 2 March 2026, in epoch seconds: the first departure.
\set t0 1772434800
CREATE TABLE line_timetable AS
SELECT line_id, name, pg_temp.trajectory(route, :t0, 7.0) AS route   -- due at 7 m/s
FROM bus_line;
CREATE TABLE trajectory AS
SELECT t.trip_id, t.line_id, t.story,
       pg_temp.trajectory(t.track, :t0 + (t.trip_id % 4) * 90, 6.0 + (t.trip_id % 5) * 0.5) AS track
FROM trip t WHERE t.line_id IS NOT NULL;

\echo
\echo '== 10. Trajectories (geography with time in M): when did each detour leave its line,'
\echo '   and for how long?  route_length is the stretch of line it skipped meanwhile.'
SELECT x.trip_id, x.line_id, to_char(to_timestamp(x.time_from) AT TIME ZONE 'UTC', 'HH24:MI:SS') AS left_at,
       round(x.time_to - x.time_from) AS seconds_away, round(x.max_leash) AS farthest_m,
       round(x.trip_length) AS driven_m, round(x.route_length) AS line_skipped_m
FROM (SELECT j.trip_id, j.line_id, e.*
      FROM trajectory j JOIN line_timetable l USING (line_id),
           frechet_excursions(j.track, l.route, :eps) e
      WHERE j.story LIKE 'detour%') x
ORDER BY x.max_leash DESC LIMIT 8;

\echo
\echo '   Trips that joined late or turned back early drive little off the line,'
\echo '   yet skip kilometres of it: route_length shows what trip_length hides.'
SELECT trip_id, story, driven_off_m, line_skipped_m
FROM (SELECT j.trip_id, j.story, round(e.trip_length) AS driven_off_m, round(e.route_length) AS line_skipped_m,
             row_number() OVER (PARTITION BY j.story ORDER BY e.route_length DESC) AS k
      FROM trajectory j JOIN line_timetable l USING (line_id),
           frechet_excursions(j.track, l.route, :eps) e
      WHERE j.story IN ('turned back early', 'joined the line late')) x
WHERE k <= 3 ORDER BY story, line_skipped_m DESC;

\echo
\echo '== 11. A bus in progress: trip 1003 so far (its first 12 positions), where it is on'
\echo '   its line, and how late against the timetable (route M is the time due).'
SELECT j.trip_id, j.line_id, ST_NPoints(so_far::geometry) AS positions_so_far,
       round(p.route_fraction::numeric, 3) AS share_of_line,
       to_char(to_timestamp(ST_M(ST_EndPoint(so_far::geometry))) AT TIME ZONE 'UTC', 'HH24:MI:SS') AS now_utc,
       round(((ST_M(ST_EndPoint(so_far::geometry)) - ST_M(p.route_point::geometry)) / 60)::numeric, 1) AS minutes_late
FROM trajectory j JOIN line_timetable l USING (line_id),
     LATERAL (SELECT frechet_track_piece(j.track, 1, 12) AS so_far) s,
     frechet_progress(s.so_far, l.route, :eps) p
WHERE j.trip_id = 1003;
