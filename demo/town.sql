-- The demo scenario, invented for this project: the town of Wrenmere Vale
-- and its small bus company, Wrenmere Valley Buses.  Coordinates are metres
-- on a local grid (x east, y north) with the town hall at (0, 0).
-- Everything here is fiction; the GPS noise and sampling are simulated.

\echo '-- loading Wrenmere Vale: 4 bus lines, 63 trips'
SELECT setseed(0.42) \gset

CREATE TABLE bus_line (
	line_id   text PRIMARY KEY,
	name      text NOT NULL,
	route     point[] NOT NULL
);

INSERT INTO bus_line VALUES
	('W1', 'Harbour - Town Hall - Millpond',
	 '{"(-2400,-300)","(-1600,-250)","(-900,-80)","(0,0)","(650,120)","(1300,400)","(2100,380)","(2700,900)"}'),
	('W2', 'Quarry Hill - Market - Station',
	 '{"(-300,2600)","(-250,1800)","(-120,1100)","(0,0)","(150,-800)","(500,-1500)","(520,-2300)"}'),
	('W3', 'Orchard Loop',
	 '{"(900,900)","(1500,1300)","(2200,1250)","(2500,1800)","(2000,2400)","(1300,2300)","(900,1700)","(950,1000)"}'),
	('W4', 'Riverside Express',
	 '{"(-2600,1500)","(-1800,1200)","(-1000,700)","(-400,300)","(300,-200)","(1200,-700)","(2300,-900)"}');

-- Drives a route once: uneven sampling (every 15-60 m) and GPS noise of up
-- to `noise` metres on each axis.  Simulation only.
CREATE FUNCTION demo_drive(route point[], noise float8) RETURNS point[]
LANGUAGE plpgsql AS $$
DECLARE
	track point[] := '{}';
	i int;
	len float8;
	pos float8;
BEGIN
	FOR i IN 1 .. array_length(route, 1) - 1 LOOP
		len := route[i] <-> route[i + 1];
		pos := 0;
		WHILE pos < len LOOP
			track := track || point((route[i])[0] + ((route[i + 1])[0] - (route[i])[0]) * pos / len + noise * (2 * random() - 1),
			                        (route[i])[1] + ((route[i + 1])[1] - (route[i])[1]) * pos / len + noise * (2 * random() - 1));
			pos := pos + 15 + 45 * random();
		END LOOP;
	END LOOP;
	RETURN track || point((route[array_length(route, 1)])[0] + noise * (2 * random() - 1),
	                      (route[array_length(route, 1)])[1] + noise * (2 * random() - 1));
END $$;

-- A route with a detour inserted after vertex k: out `far` metres and back.
CREATE FUNCTION demo_detour(route point[], k int, far float8) RETURNS point[]
LANGUAGE sql AS $$
	SELECT route[1:k]
	       || point(((route[k])[0] + (route[k + 1])[0]) / 2 + far * 0.6, ((route[k])[1] + (route[k + 1])[1]) / 2 + far)
	       || route[k + 1:]
$$;

-- The reverse of a route.
CREATE FUNCTION demo_reverse(route point[]) RETURNS point[]
LANGUAGE sql AS $$
	SELECT array_agg(route[i] ORDER BY i DESC) FROM generate_subscripts(route, 1) AS i
$$;

CREATE TABLE trip (
	trip_id   int PRIMARY KEY,
	vehicle   text NOT NULL,
	line_id   text REFERENCES bus_line,  -- the planned line; NULL when unlabelled
	story     text NOT NULL,             -- what the simulation did (for the demo only)
	track     point[] NOT NULL
);

\echo '-- simulating 48 ordinary trips'
INSERT INTO trip
SELECT row_number() OVER (), 'bus-' || (10 + (n % 9)), l.line_id, 'ordinary', demo_drive(l.route, 6 + 8 * random())
FROM bus_line l, generate_series(1, 12) AS n;

\echo '-- simulating 6 trips with detours, 3 driven backwards, 3 unlabelled'
INSERT INTO trip
SELECT 100 + row_number() OVER (), 'bus-2' || n, l.line_id, 'detour of ' || far || ' m',
       demo_drive(demo_detour(l.route, 2 + n % 3, far), 8)
FROM bus_line l, generate_series(1, 2) AS n, LATERAL (SELECT (150 + 250 * n)::int AS far) f
WHERE l.line_id IN ('W1', 'W2', 'W4');

INSERT INTO trip
SELECT 200 + row_number() OVER (), 'bus-30', l.line_id, 'driven backwards', demo_drive(demo_reverse(l.route), 8)
FROM bus_line l WHERE l.line_id IN ('W1', 'W2', 'W3');

INSERT INTO trip
SELECT 300 + row_number() OVER (), 'hire-' || l.line_id, NULL, 'unlabelled, drove ' || l.line_id, demo_drive(l.route, 10)
FROM bus_line l WHERE l.line_id IN ('W2', 'W3', 'W4');

\echo '-- simulating 3 trips that turned back early (part of their line only)'
INSERT INTO trip
SELECT 400 + row_number() OVER (), 'bus-40', l.line_id, 'covered part of the line',
       demo_drive(l.route[2:array_length(l.route, 1) - 2], 8)
FROM bus_line l WHERE l.line_id IN ('W1', 'W2', 'W4');

SELECT count(*) AS trips, sum(array_length(track, 1)) AS gps_fixes FROM trip;
