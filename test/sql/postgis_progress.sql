-- frechet_progress on geometry and geography.  Outside source for the
-- share of the route: PostGIS's own ST_LineLocatePoint (planar).
CREATE EXTENSION IF NOT EXISTS postgis;
CREATE EXTENSION frechet_ext_postgis;

-- A trip halfway along a route in a projected SRID: the place, its share
-- of the length against ST_LineLocatePoint, SRID kept.
SELECT round(x.route_pos::numeric, 6) AS route_pos, round(x.route_fraction::numeric, 6) AS fraction,
       round(ST_LineLocatePoint(r.g, x.route_point)::numeric, 6) AS postgis_fraction,
       ST_SRID(x.route_point) AS srid, ST_AsText(x.route_point) AS point
FROM (SELECT 'SRID=27700;LINESTRING(430000 380000, 430400 380000, 430400 380300)'::geometry AS g) r,
     frechet_progress('SRID=27700;LINESTRING(430001 380002, 430150 379998, 430300 380003)'::geometry, r.g, 10) x;

-- geography in metres: a bus a quarter of the way along a 2 km street, within 15 m
SELECT round(x.route_fraction::numeric, 2) AS fraction, ST_AsText(x.route_point, 6) AS point
FROM frechet_progress('SRID=4326;LINESTRING(-1.5000 53.4000, -1.4925 53.40008)'::geography,
                      'SRID=4326;LINESTRING(-1.5000 53.4000, -1.4700 53.4000)'::geography, 15) x;
-- and 30 m off it: not on its route
SELECT count(*) AS off_route
FROM frechet_progress('SRID=4326;LINESTRING(-1.5000 53.4000, -1.4925 53.4004)'::geography,
                      'SRID=4326;LINESTRING(-1.5000 53.4000, -1.4700 53.4000)'::geography, 15);

DROP EXTENSION frechet_ext_postgis;
DROP EXTENSION postgis;
