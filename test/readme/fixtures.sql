-- Tables and psql variables that README.md's examples refer to, so that
-- each example runs as printed (test/readme/run.sh).  Invented data, in
-- the demo's town: the point[] examples use `trips` (id, line_id, track
-- point[]) and `routes`, the geometry examples `trips` and `lines`
-- (geometry in a metric SRID); `trip` and `bus_line` are the demo's own.
-- point_many: the point[] tables with 150,000 trips (about 30 MB, the
-- size at which PostgreSQL plans two workers).
\set fixture_point 'CREATE TABLE routes AS SELECT l AS route_id, array(SELECT point(200.0 * l + 60 * k, 30.0 * (k % 3)) FROM generate_series(0, 9) k) AS route FROM generate_series(1, 6) l; CREATE TABLE trips AS SELECT i AS id, 1 + i % 6 AS route_id, 1 + i % 6 AS line_id, array(SELECT point((r.route[k])[0] + (i % 7) - 3, (r.route[k])[1] + (i % 5) - 2) FROM generate_series(1, 10) k) AS track FROM generate_series(1, 600) i JOIN routes r ON r.route_id = 1 + i % 6;'
\set fixture_point_many 'CREATE TABLE routes AS SELECT l AS route_id, array(SELECT point(200.0 * l + 60 * k, 30.0 * (k % 3)) FROM generate_series(0, 9) k) AS route FROM generate_series(1, 6) l; CREATE TABLE trips AS SELECT i AS id, 1 + i % 6 AS route_id, 1 + i % 6 AS line_id, array(SELECT point((r.route[k])[0] + (i % 7) - 3, (r.route[k])[1] + (i % 5) - 2) FROM generate_series(1, 10) k) AS track FROM generate_series(1, 150000) i JOIN routes r ON r.route_id = 1 + i % 6;'
\set fixture_geometry 'CREATE TABLE lines AS SELECT l AS id, ST_SetSRID(ST_MakeLine(ARRAY(SELECT ST_MakePoint(430000.0 + 200 * l + 60 * k, 380000.0 + 30 * (k % 3)) FROM generate_series(0, 9) k)), 27700) AS track FROM generate_series(1, 6) l; CREATE TABLE trips AS SELECT i AS id, 1 + i % 6 AS line_id, ST_SetSRID(ST_MakeLine(ARRAY(SELECT ST_Translate(d.geom, (i % 7) - 3, (i % 5) - 2) FROM ST_DumpPoints(l.track) d)), 27700) AS track FROM generate_series(1, 600) i JOIN lines l ON l.id = 1 + i % 6;'
