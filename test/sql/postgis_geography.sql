-- Geography overloads (frechet_ext_postgis): metres on WGS84 by the
-- Earth-centred chord metric.  Outside source: PostGIS's own ellipsoidal
-- ST_Distance(geography, geography) (use_spheroid, Karney's geodesics as
-- PostGIS computes them) for one-point curves and endpoint bounds.
CREATE EXTENSION IF NOT EXISTS postgis;
CREATE EXTENSION frechet_ext_postgis;

-- 1,000 point pairs 1 m - 100 km apart over the whole globe: our metres
-- agree with PostGIS's geodesic distance within 1e-6 relative.
SELECT setseed(0.7);
CREATE TABLE pts AS
SELECT k, ST_SetSRID(ST_MakePoint(lon, lat), 4326)::geography AS p,
       ST_Project(ST_SetSRID(ST_MakePoint(lon, lat), 4326)::geography,
                  exp(random() * ln(1e5)), random() * 2 * pi()) AS q
FROM (SELECT k, random() * 360 - 180 AS lon, degrees(asin(random() * 2 - 1)) AS lat
      FROM generate_series(1, 1000) k) s;
SELECT count(*) AS pairs,
       count(*) FILTER (WHERE abs(frechet_distance(p, q) / ST_Distance(p, q, true) - 1) <= 1e-6) AS within_1e_6,
       round(min(ST_Distance(p, q, true))::numeric, 0) >= 1 AS shortest_at_least_1m,
       round(max(ST_Distance(p, q, true))::numeric, -3) <= 100000 AS longest_at_most_100km
FROM pts;

-- A lon/lat geometry cast to geography works the same.
SELECT round(frechet_distance('SRID=4326;POINT(0 0)'::geometry::geography,
                              'SRID=4326;POINT(0 0.001)'::geometry::geography)::numeric, 6) AS metres,
       round(ST_Distance('SRID=4326;POINT(0 0)'::geography, 'SRID=4326;POINT(0 0.001)'::geography, true)::numeric, 6) AS postgis;

-- Across the antimeridian: two parallel tracks 0.0001 degrees (11 m) apart,
-- crossing 180 degrees; not half the world.  The first track's one 2.2 km
-- edge follows its geodesic (a chord would run 9.5 cm below the surface
-- under the second track's middle vertex and give 11.0577), so the
-- distance is PostGIS's leash.
SELECT round(frechet_distance('SRID=4326;LINESTRING(179.99 0,-179.99 0)'::geography,
                              'SRID=4326;LINESTRING(179.99 0.0001,-179.995 0.0001,-179.99 0.0001)'::geography)::numeric, 4) AS across_180,
       round(ST_Distance('SRID=4326;POINT(179.99 0)'::geography, 'SRID=4326;POINT(179.99 0.0001)'::geography, true)::numeric, 4) AS postgis_leash;

-- Over the North Pole: two crossing tracks through the pole (a vertex at 90);
-- the distance is that of their endpoints, by symmetry.
SELECT round(frechet_distance('SRID=4326;LINESTRING(0 89.999,0 90,180 89.999)'::geography,
                              'SRID=4326;LINESTRING(90 89.999,45 90,-90 89.999)'::geography)::numeric, 4) AS over_pole,
       round(ST_Distance('SRID=4326;POINT(0 89.999)'::geography, 'SRID=4326;POINT(90 89.999)'::geography, true)::numeric, 4) AS postgis_endpoints;
-- Near the South Pole: a circle of 12 points at latitude -89.99 and the
-- same circle started 180 degrees later: the leash must span the circle.
SELECT round(frechet_distance(a, b)::numeric, 1) AS circle_shifted,
       round(ST_Distance('SRID=4326;POINT(0 -89.99)'::geography, 'SRID=4326;POINT(180 -89.99)'::geography, true)::numeric, 1) AS postgis_diameter
FROM (SELECT ST_MakeLine(array(SELECT ST_SetSRID(ST_MakePoint(-180 + 30 * i, -89.99), 4326) FROM generate_series(0, 12) i))::geography AS a,
             ST_MakeLine(array(SELECT ST_SetSRID(ST_MakePoint(30 * i - (CASE WHEN 30 * i > 180 THEN 360 ELSE 0 END), -89.99), 4326) FROM generate_series(0, 12) i))::geography AS b) c;

-- at_most agrees with the distance, in metres, at its own result.
SELECT frechet_at_most(a, b, d) AS at_d, frechet_at_most(a, b, d * (1 - 1e-9)) AS just_below,
       frechet_at_most(a, b, 'Infinity') AS infinite,
       round(d::numeric, 3) AS d, round(discrete_frechet_distance(a, b)::numeric, 3) AS discrete,
       round((a <~~> b)::numeric, 3) AS operator
FROM (SELECT a, b, frechet_distance(a, b) AS d
      FROM (SELECT 'SRID=4326;LINESTRING(-7.72 41.88,-7.73 41.89,-7.74 41.88)'::geography AS a,
                   'SRID=4326;LINESTRING(-7.7201 41.8801,-7.7305 41.8898,-7.7399 41.8802)'::geography AS b) s) t;

-- Whole tracks against PostGIS: a track and a copy displaced by up to
-- 20 m per vertex; the distance is at least the endpoint leashes and at
-- most the largest vertex displacement (the vertex-wise matching).
SELECT count(*) AS tracks,
       count(*) FILTER (WHERE d >= greatest(ST_Distance(ST_StartPoint(a::geometry)::geography, ST_StartPoint(b::geometry)::geography, true),
                                            ST_Distance(ST_EndPoint(a::geometry)::geography, ST_EndPoint(b::geometry)::geography, true)) * (1 - 1e-6)
                        AND d <= maxmove * (1 + 1e-6)) AS within_bounds
FROM (SELECT a, b, frechet_distance(a, b) AS d,
             (SELECT max(ST_Distance(ST_PointN(a::geometry, i)::geography, ST_PointN(b::geometry, i)::geography, true))
              FROM generate_series(1, ST_NPoints(a::geometry)) i) AS maxmove
      FROM (SELECT ST_MakeLine(array_agg(p ORDER BY i))::geography AS a, ST_MakeLine(array_agg(q ORDER BY i))::geography AS b
            FROM (SELECT t, i, ST_SetSRID(ST_MakePoint(lon0 + i * 0.001, lat0 + sin(i) * 0.0005), 4326) AS p,
                         ST_Project(ST_SetSRID(ST_MakePoint(lon0 + i * 0.001, lat0 + sin(i) * 0.0005), 4326)::geography,
                                    random() * 20, random() * 2 * pi())::geometry AS q
                  FROM (SELECT t, random() * 300 - 150 AS lon0, random() * 160 - 80 AS lat0 FROM generate_series(1, 50) t) s,
                       generate_series(0, 20) i) v
            GROUP BY t) w) x;

-- Latitude or longitude out of range does not reach us through geography
-- (PostGIS coerces it on input, with a NOTICE); through EWKB it is an
-- ERROR (see postgis_ewkb).  Mixed SRIDs are an ERROR here too.
SELECT frechet_distance('SRID=4326;POINT(0 0)'::geography, 'SRID=4269;POINT(0 0)'::geography);

-- Long edges (50-70 km, each cut along its geodesic into about 90
-- pieces): the matching's positions are on the input's vertices (k + t,
-- t the share of the edge's geodesic), non-decreasing, and its points are
-- the points of frechet_track_piece at those positions; every leash is
-- PostGIS's spheroidal ST_Distance between its points (within 1e-5 and
-- 5 cm, leashes up to about 150 km).
SELECT setseed(0.3);
CREATE TABLE lp AS
SELECT k, ST_MakeLine(array(SELECT ST_MakePoint(10 + i * 0.6 + random() * 0.2, 45 + random() * 0.3) FROM generate_series(0, 3 + k % 4) i))::geography AS a,
          ST_MakeLine(array(SELECT ST_MakePoint(10 + i * 0.9 + random() * 0.2, 45.1 + random() * 0.3) FROM generate_series(0, 2 + k % 3) i))::geography AS b
FROM generate_series(1, 10) k;
SELECT count(*) > 3000 AS many_breakpoints,
       count(*) FILTER (WHERE ST_Distance(m.a_point, frechet_track_piece(lp.a, m.a_pos, m.a_pos), false) < 1e-6
                          AND ST_Distance(m.b_point, frechet_track_piece(lp.b, m.b_pos, m.b_pos), false) < 1e-6)
       = count(*) AS points_at_positions,
       count(*) FILTER (WHERE abs(m.leash - ST_Distance(m.a_point, m.b_point, true)) <= 1e-5 * m.leash + 0.05)
       = count(*) AS leashes_are_postgis_distances,
       count(*) FILTER (WHERE m.a_pos <> floor(m.a_pos)) > count(*) / 2 AS mostly_between_vertices
FROM lp, frechet_matching(lp.a, lp.b) m;
SELECT bool_and(ok) AS positions_monotone FROM (
  SELECT m.a_pos >= lag(m.a_pos, 1, 1.0) OVER w AND m.b_pos >= lag(m.b_pos, 1, 1.0) OVER w AS ok
  FROM lp, frechet_matching(lp.a, lp.b) m WINDOW w AS (PARTITION BY lp.k ORDER BY m.step)) s;
DROP TABLE lp;

DROP TABLE pts;
-- Geography edges follow the geodesic.  A vessel sails a 417 km
-- two-waypoint route (invented) exactly: its positions every 2 km come
-- from PostGIS's ST_Project along ST_Azimuth (the direct and inverse
-- geodesic problems on the spheroid).  Within 1 cm of the route, where a
-- straight chord through the Earth would put it 3.4 km off.  (PostGIS's
-- own point-to-edge distance reads an edge as a great circle of a sphere,
-- about 11 m from the ellipsoid's geodesic here.)
WITH r AS (SELECT 'SRID=4326;POINT(4.3 50.8)'::geography AS a, 'SRID=4326;POINT(-1.6 51.3)'::geography AS b),
v AS (SELECT ST_MakeLine(array_agg(ST_Project(r.a, s, ST_Azimuth(r.a, r.b))::geometry ORDER BY s) || r.b::geometry)::geography AS vessel,
             ST_MakeLine(r.a::geometry, r.b::geometry)::geography AS route, ST_Distance(r.a, r.b) AS len
      FROM r, generate_series(0, floor(ST_Distance(r.a, r.b))::int - 1, 2000) s GROUP BY r.a, r.b)
SELECT round(len / 1000) AS route_km, ST_NPoints(vessel::geometry) AS vessel_points,
       frechet_distance(vessel, route) <= 0.011 AS within_1cm, frechet_at_most(vessel, route, 0.02) AS at_most_2cm,
       NOT frechet_at_most(vessel, route, 0.005) AS not_within_half_cm
FROM v;

DROP EXTENSION frechet_ext_postgis;
DROP EXTENSION postgis;
