-- Sparse pings matched in order to a route on geometry (units of the SRID)
-- and geography (metres).  Outside source for the metres: PostGIS's own
-- ellipsoidal ST_Distance(geography, geography).
CREATE EXTENSION IF NOT EXISTS postgis;
CREATE EXTENSION frechet_ext_postgis;

-- A street route with corners in a local metric SRID, and pings every
-- 30 s that stay within 12 m of it while the chords cut the corners.
CREATE TABLE gping AS
SELECT ST_GeomFromText('LINESTRING(0 0, 400 0, 400 300, 800 300, 800 600)', 3857) AS route,
       ST_GeomFromText('LINESTRING(3 -5, 250 8, 392 150, 550 307, 700 291, 809 500, 795 604)', 3857) AS trip,
       ST_GeomFromText('LINESTRING(795 604, 809 500, 700 291, 550 307, 392 150, 250 8, 3 -5)', 3857) AS backwards;
SELECT frechet_at_most(trip, route, 50) AS continuous_50,
       frechet_pings_at_most(trip, route, 50) AS pings_50,
       frechet_pings_at_most(trip, route, 50, 450) AS pings_50_gap_450,
       round(frechet_pings_distance(trip, route)::numeric, 9) AS ping_distance,
       frechet_pings_at_most(backwards, route, 50) AS backwards_50,
       frechet_pings_distance(trip, route) = frechet_pings_distance(
           array(SELECT ST_X(g)::float8 || ',' || ST_Y(g) FROM ST_DumpPoints(trip) d(path, g) ORDER BY path)::text::point[]
           , '{"(0,0)","(400,0)","(400,300)","(800,300)","(800,600)"}'::point[]) AS same_as_point_array
FROM gping;

-- Where the pings left the route, on geometry and geography (metres).
SELECT x.* FROM gping, frechet_pings_excursions(ST_SetPoint(trip, 3, 'POINT(550 507)'::geometry), route, 50) x;
SELECT ping_from, ping_to, round(max_leash) AS max_leash_m
FROM frechet_pings_excursions('LINESTRING(0 51.5, 0.004 51.503, 0.01 51.51)'::geography,
                              'LINESTRING(0 51.5, 0.01 51.5, 0.01 51.51)'::geography, 50);

-- 3-D geometry: Z counts.
SELECT frechet_pings_distance('LINESTRING Z (0 0 0, 10 0 5)'::geometry, 'LINESTRING Z (0 0 0, 10 0 0)'::geometry) AS with_z;

-- Geography: a bus line of three stops near the prime meridian at 51.5 N
-- and pings beside it.  A single ping that is the farthest from the route
-- sets the distance: compare with PostGIS's geodesic distance of that ping
-- to the route's nearest point (within 0.1 %; ours is the chord metric on
-- the ellipsoid's Earth-centred coordinates, documented to 1e-6 relative
-- for short distances).
CREATE TABLE gping_geo AS
SELECT 'LINESTRING(0 51.5, 0.01 51.5, 0.01 51.51)'::geography AS route,
       'LINESTRING(0 51.5, 0.004 51.5001, 0.0101 51.503, 0.01 51.51)'::geography AS trip;
SELECT frechet_pings_at_most(trip, route, 15) AS pings_15,
       frechet_pings_at_most(trip, route, 10) AS pings_10,
       abs(frechet_pings_distance(trip, route)
           / ST_Distance('POINT(0.004 51.5001)'::geography, route, true) - 1) < 1e-3 AS metres_match_postgis,
       frechet_pings_distance(trip, route) <= frechet_distance(trip, route) AS not_above_continuous,
              -- the route is about 1.8 km; the pings sit about 280, 1030 and 1800 m along it
       frechet_pings_distance(trip, route, 800) = frechet_pings_distance(trip, route) AS gap_800_enough,
       frechet_pings_distance(trip, route, 700) > frechet_pings_distance(trip, route) AS gap_700_costs,
       frechet_pings_distance(trip, route, 100) AS gap_100
FROM gping_geo;

-- Bad input on the PostGIS overloads: the errors of the other functions.
SELECT frechet_pings_at_most('POLYGON((0 0, 1 0, 1 1, 0 0))'::geometry, 'LINESTRING(0 0, 1 1)'::geometry, 1);
SELECT frechet_pings_at_most('LINESTRING(0 0, 1 1)'::geography, 'LINESTRING(0 0, 1 1)'::geography, 1, -5);

DROP TABLE gping, gping_geo;
DROP EXTENSION frechet_ext_postgis;
DROP EXTENSION postgis;
