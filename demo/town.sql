-- The demo scenario, invented for this project: the town of Wrenmere Vale
-- and its bus company, Wrenmere Valley Buses.  Coordinates are metres on a
-- local grid (x east, y north) with the town hall at (0, 0).
-- Everything here is fiction; the GPS noise and sampling are simulated.

\set VERBOSITY terse
\echo '-- loading Wrenmere Vale: 10 bus lines, 1,010 simulated trips'
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
	 '{"(-2600,1500)","(-1800,1200)","(-1000,700)","(-400,300)","(300,-200)","(1200,-700)","(2300,-900)"}'),
	('W5', 'Hospital - University - Fenwick Park',
	 '{"(-2800,-1800)","(-2000,-1500)","(-1300,-1350)","(-600,-1000)","(-150,-350)","(200,400)","(150,1300)","(500,2000)"}'),
	('W6', 'Ashby Lane - Crowthorne',
	 '{"(2800,-2600)","(2000,-2000)","(1500,-1200)","(900,-600)","(600,300)","(700,1200)","(400,2000)","(600,2900)"}'),
	('W7', 'Canal Circular',
	 '{"(-1500,500)","(-800,900)","(-200,1200)","(500,1000)","(900,400)","(600,-300)","(-100,-600)","(-900,-400)","(-1450,150)"}'),
	('W8', 'Heathside Night Bus',
	 '{"(-3000,2500)","(-2200,2200)","(-1600,2600)","(-900,2300)","(-300,2700)","(400,2500)","(1100,2900)","(1800,2700)"}'),
	('W9', 'Linwood School Run',
	 '{"(-600,-2800)","(-700,-2000)","(-1100,-1500)","(-1800,-900)","(-2300,-100)","(-2500,700)"}'),
	('W10', 'Airport Shuttle',
	 '{"(3200,1200)","(2500,700)","(1600,100)","(800,-200)","(0,-300)","(-900,-700)","(-1900,-1200)","(-3100,-1300)"}');

-- A standard normal deviate (Box-Muller).  Simulation only.
CREATE FUNCTION demo_gauss() RETURNS float8
LANGUAGE sql AS $$
	SELECT sqrt(-2 * ln(1 - random())) * cos(2 * pi() * random())
$$;

-- Drives a route once, the way a GPS logger records it: a fix every 10-60 m
-- (uneven), now and then a gap of 150-400 m (signal lost under trees or
-- between tall buildings), and gaussian noise of `sd` metres on each axis.
-- Simulation only.
CREATE FUNCTION demo_drive(route point[], sd float8) RETURNS point[]
LANGUAGE plpgsql AS $$
DECLARE
	track point[] := '{}';
	i int;
	len float8;
	pos float8;
	a point;
	b point;
	n int := array_length(route, 1);
BEGIN
	FOR i IN 1 .. n - 1 LOOP
		a := route[i];
		b := route[i + 1];
		len := a <-> b;
		pos := CASE WHEN i = 1 THEN 0 ELSE 60 * random() END;
		WHILE pos < len LOOP
			track := track || point(a[0] + (b[0] - a[0]) * pos / len + sd * demo_gauss(),
			                        a[1] + (b[1] - a[1]) * pos / len + sd * demo_gauss());
			pos := pos + 10 + 50 * random() + CASE WHEN random() < 0.02 THEN 150 + 250 * random() ELSE 0 END;
		END LOOP;
	END LOOP;
	RETURN track || point((route[n])[0] + sd * demo_gauss(), (route[n])[1] + sd * demo_gauss());
END $$;

-- A route with a detour around a block on its k-th segment: it leaves at
-- 30 % of the segment, drives `far` metres to the side, and comes back at 70 %.
CREATE FUNCTION demo_detour(route point[], k int, far float8) RETURNS point[]
LANGUAGE sql AS $$
	SELECT route[1:k]
	       || point(a[0] + 0.3 * dx - far * dy / len, a[1] + 0.3 * dy + far * dx / len)
	       || point(a[0] + 0.7 * dx - far * dy / len, a[1] + 0.7 * dy + far * dx / len)
	       || route[k + 1:]
	FROM (SELECT route[k] AS a, (route[k + 1])[0] - (route[k])[0] AS dx, (route[k + 1])[1] - (route[k])[1] AS dy,
	             route[k] <-> route[k + 1] AS len) s
$$;

-- The reverse of a route.
CREATE FUNCTION demo_reverse(route point[]) RETURNS point[]
LANGUAGE sql AS $$
	SELECT array_agg(route[i] ORDER BY i DESC) FROM generate_subscripts(route, 1) AS i
$$;

-- A GPS glitch (multipath off a tall building): one fix thrown `far` metres.
CREATE FUNCTION demo_glitch(track point[], far float8) RETURNS point[]
LANGUAGE sql AS $$
	SELECT track[1:k - 1] || point((track[k])[0] + far * 0.8, (track[k])[1] - far * 0.6) || track[k + 1:]
	FROM (SELECT array_length(track, 1) / 2 AS k) s
$$;

CREATE TABLE trip (
	trip_id   int PRIMARY KEY,
	vehicle   text NOT NULL,
	line_id   text REFERENCES bus_line,  -- the planned line; NULL when unlabelled
	story     text NOT NULL,             -- what the simulation did (for the demo only)
	track     point[] NOT NULL
);

-- Per line: 80 ordinary trips, 4 with detours (ids 100-139), 2 driven
-- backwards (200-219), 10 unlabelled (300-399), 4 that turned back early
-- or joined late (400-439), 1 with a GPS glitch (500-509); 101 a line.
DO $$
DECLARE
	l record;
	li int := 0;
	j int;
	total int := 0;
	far float8;
	p_from float8;
	p_to float8;
	nv int;
BEGIN
	FOR l IN SELECT * FROM bus_line ORDER BY length(line_id), line_id LOOP
		nv := array_length(l.route, 1);
		FOR j IN 1 .. 80 LOOP
			INSERT INTO trip VALUES (1000 + li * 80 + j, 'bus-' || (10 + (li * 80 + j) % 37), l.line_id,
			                         'ordinary', demo_drive(l.route, 4 + 8 * random()));
		END LOOP;
		FOR j IN 1 .. 4 LOOP
			far := 150 + 150 * j + 60 * random();
			INSERT INTO trip VALUES (100 + li * 4 + j - 1, 'bus-2' || j, l.line_id,
			                         'detour of ' || round(far) || ' m',
			                         demo_drive(demo_detour(l.route, 1 + (j + li) % (nv - 1), far), 6));
		END LOOP;
		FOR j IN 1 .. 2 LOOP
			INSERT INTO trip VALUES (200 + li * 2 + j - 1, 'bus-30', l.line_id, 'driven backwards',
			                         demo_drive(demo_reverse(l.route), 6));
		END LOOP;
		FOR j IN 1 .. 10 LOOP
			INSERT INTO trip VALUES (300 + li * 10 + j - 1, 'hire-' || (li * 10 + j) % 7, NULL,
			                         'unlabelled, drove ' || l.line_id, demo_drive(l.route, 5 + 5 * random()));
		END LOOP;
		FOR j IN 1 .. 4 LOOP
			p_from := 1 + (nv - 1) * (CASE WHEN j % 2 = 1 THEN 0.15 + 0.25 * random() ELSE 0 END);
			p_to := nv - (nv - 1) * (CASE WHEN j % 2 = 0 OR j = 3 THEN 0.15 + 0.25 * random() ELSE 0 END);
			INSERT INTO trip VALUES (400 + li * 4 + j - 1, 'bus-40', l.line_id,
			                         CASE WHEN p_from > 1 AND p_to < nv THEN 'middle part of the line only'
			                              WHEN p_from > 1 THEN 'joined the line late' ELSE 'turned back early' END,
			                         demo_drive(frechet_track_piece(l.route, p_from, p_to), 6));
		END LOOP;
		INSERT INTO trip VALUES (500 + li, 'bus-' || (11 + li), l.line_id, 'GPS glitch',
		                         demo_glitch(demo_drive(l.route, 6), 180 + 60 * random()));
		li := li + 1;
		total := total + 101;
		RAISE NOTICE 'line % (%): % of 1010 trips simulated', l.line_id, l.name, total;
	END LOOP;
END $$;

-- The new trackers of Wrenmere Valley Buses ping every 30 s: at 5-10 m/s a
-- fix every 150-300 m, within a few metres of the road.  Simulation only.
CREATE FUNCTION demo_ping(route point[], sd float8) RETURNS point[]
LANGUAGE plpgsql AS $$
DECLARE
	track point[] := ARRAY[point((route[1])[0] + sd * demo_gauss(), (route[1])[1] + sd * demo_gauss())];
	i int;
	len float8;
	pos float8 := 150 + 150 * random();
	a point;
	b point;
	n int := array_length(route, 1);
BEGIN
	FOR i IN 1 .. n - 1 LOOP
		a := route[i];
		b := route[i + 1];
		len := a <-> b;
		WHILE pos < len LOOP
			track := track || point(a[0] + (b[0] - a[0]) * pos / len + sd * demo_gauss(),
			                        a[1] + (b[1] - a[1]) * pos / len + sd * demo_gauss());
			pos := pos + 150 + 150 * random();
		END LOOP;
		pos := pos - len;
	END LOOP;
	RETURN track || point((route[n])[0] + sd * demo_gauss(), (route[n])[1] + sd * demo_gauss());
END $$;

-- 12 pinged trips a line: 10 ordinary, one that left the line on a detour,
-- one that cut out the middle of its line (it rejoined further on).
CREATE TABLE ping_trip (
	trip_id   int PRIMARY KEY,
	line_id   text NOT NULL REFERENCES bus_line,
	story     text NOT NULL,
	pings     point[] NOT NULL
);
INSERT INTO ping_trip
SELECT 5000 + 12 * li + j, line_id,
       CASE j WHEN 10 THEN 'detour of 400 m' WHEN 11 THEN 'cut out the middle' ELSE 'ordinary' END,
       CASE j WHEN 10 THEN demo_ping(demo_detour(route, 2, 400), 5)
              WHEN 11 THEN demo_ping(route[1:2] || route[array_length(route, 1) - 1:], 5)
              ELSE demo_ping(route, 5) END
FROM (SELECT line_id, route, row_number() OVER (ORDER BY length(line_id), line_id) - 1 AS li FROM bus_line) l,
     generate_series(0, 11) j;

ANALYZE trip;
SELECT (SELECT count(*) FROM bus_line) AS lines, count(*) AS trips, count(*) FILTER (WHERE line_id IS NULL) AS unlabelled,
       sum(array_length(track, 1)) AS gps_fixes,
       round(avg(array_length(track, 1))) AS fixes_per_trip FROM trip;

-- Road works on Mill Street, the stretch of line W1 from the Town Hall
-- (0, 0) east to the Weir Bridge (650, 120), in the week of the 14th: the
-- depot sent some W1 buses round by Tanners Row, north of it, and some
-- stayed on Mill Street.  The week's trips from the new depot system: 20
-- on W1 (6 round by Tanners Row), 10 on W2 and 10 on W5, lines that
-- cross the area.  Simulation only.
CREATE TABLE street (
	name      text PRIMARY KEY,
	stretch   point[] NOT NULL           -- in the direction of travel
);
INSERT INTO street VALUES
	('Mill Street', '{"(0,0)","(650,120)"}'),
	('Tanners Row', '{"(60,260)","(330,320)","(590,330)"}');
CREATE TABLE works_trip (
	trip_id   int PRIMARY KEY,
	line_id   text NOT NULL REFERENCES bus_line,
	story     text NOT NULL,             -- what the simulation did (for the demo only)
	track     point[] NOT NULL
);
INSERT INTO works_trip
SELECT 7000 + j, 'W1', CASE WHEN j % 10 < 3 THEN 'sent round by Tanners Row' ELSE 'stayed on Mill Street' END,
       demo_drive(CASE WHEN j % 10 < 3
                       THEN route[1:4] || (SELECT stretch FROM street WHERE name = 'Tanners Row') || route[5:]
                       ELSE route END, 4 + 6 * random())
FROM bus_line, generate_series(0, 19) j WHERE line_id = 'W1';
INSERT INTO works_trip
SELECT 7100 + 10 * (line_id = 'W5')::int + j, line_id, 'ordinary', demo_drive(route, 4 + 6 * random())
FROM bus_line, generate_series(0, 9) j WHERE line_id IN ('W2', 'W5');
CREATE INDEX works_trip_track_idx ON works_trip USING gist (track);
ANALYZE works_trip;
