-- Load-test data (invented, Wrenmere Valley Buses): 8 bus lines of 100
-- vertices in projected metres, and 10,000 trips that follow them with GPS
-- noise of up to 15 m and dropped fixes; one trip in ten is driven
-- backwards, one in twenty takes a 400 m detour.
SET client_min_messages = warning;
CREATE EXTENSION IF NOT EXISTS frechet_ext;
SELECT setseed(0.42);

CREATE TABLE routes (id int PRIMARY KEY, track point[] NOT NULL);
INSERT INTO routes
SELECT r, array(SELECT point(1000 * r + 40 * k + 300 * sin(k / 10.0 + r),
                             500 * r + 60 * k * cos(r) + 200 * sin(k / 7.0))
                FROM generate_series(0, 99) k ORDER BY k)
FROM generate_series(1, 8) r;

CREATE TABLE trips (id int PRIMARY KEY, route_id int NOT NULL REFERENCES routes, track point[] NOT NULL);
INSERT INTO trips
SELECT t, r.id,
       array(SELECT point(v[0] + (random() - 0.5) * 30
                          + CASE WHEN t % 20 = 0 AND k BETWEEN 40 AND 50 THEN 400 ELSE 0 END,
                          v[1] + (random() - 0.5) * 30)
             FROM unnest(r.track) WITH ORDINALITY AS u(v, k)
             WHERE k IN (1, 100) OR random() < 0.8
             ORDER BY CASE WHEN t % 10 = 0 THEN -k ELSE k END)
FROM generate_series(1, 10000) t
JOIN routes r ON r.id = 1 + t % 8;
ANALYZE routes;
ANALYZE trips;
