-- Witnesses on geometry and geography (frechet_ext_postgis): matching,
-- bottleneck, partial matching and excursions, with geometry results for
-- maps.  The point[] functions on the same coordinates are the reference
-- for geometry; PostGIS's own measures check the geometry results.
CREATE EXTENSION IF NOT EXISTS postgis;
CREATE EXTENSION frechet_ext_postgis;

SELECT setseed(0.6);
CREATE TABLE wpairs AS
SELECT k, pa, pb,
       ST_SetSRID(ST_MakeLine(array(SELECT ST_MakePoint(q[0], q[1]) FROM unnest(pa) q)), 32630) AS ga,
       ST_SetSRID(ST_MakeLine(array(SELECT ST_MakePoint(q[0], q[1]) FROM unnest(pb) q)), 32630) AS gb
FROM (SELECT k,
             array(SELECT point(i * 10 + round((random() * 8)::numeric, 2), round((random() * 20)::numeric, 2))
                   FROM generate_series(1, 3 + k % 11) i WHERE k > 0) AS pa,
             array(SELECT point(i * 10 + round((random() * 8)::numeric, 2), round((random() * 20)::numeric, 2))
                   FROM generate_series(1, 2 + k % 7) i WHERE k > 0) AS pb
      FROM generate_series(1, 60) k) s;

-- matching: the same breakpoints, leashes and points as point[].
SELECT count(*) AS breakpoints,
       count(*) FILTER (WHERE g.a_pos = p.a_pos AND g.b_pos = p.b_pos AND g.leash = p.leash) AS same_positions,
       count(*) FILTER (WHERE ST_X(g.a_point) = p.a_point[0] AND ST_Y(g.a_point) = p.a_point[1]
                          AND ST_X(g.b_point) = p.b_point[0] AND ST_Y(g.b_point) = p.b_point[1]) AS same_points,
       count(*) FILTER (WHERE ST_SRID(g.a_point) = 32630 AND ST_SRID(g.b_point) = 32630) AS srid_kept
FROM wpairs w, LATERAL frechet_matching(w.ga, w.gb) g
JOIN LATERAL frechet_matching(w.pa, w.pb) p ON p.step = g.step;

-- leash segments: one line per breakpoint; the longest is the distance
-- (PostGIS ST_Length); the SRID is kept.
SELECT count(*) AS pairs,
       count(*) FILTER (WHERE ST_NumGeometries(l) = (SELECT count(*) FROM frechet_matching(ga, gb))) AS one_per_breakpoint,
       count(*) FILTER (WHERE abs((SELECT max(ST_Length(d.geom)) FROM ST_Dump(l) d) - frechet_distance(ga, gb))
                              <= 1e-9 * frechet_distance(ga, gb)) AS longest_is_distance,
       count(*) FILTER (WHERE ST_SRID(l) = 32630 AND GeometryType(l) = 'MULTILINESTRING') AS multilinestring_32630
FROM (SELECT ga, gb, frechet_matching_leashes(ga, gb) AS l FROM wpairs) s;

-- bottleneck, partial distance, partial match and excursions: as point[].
SELECT count(*) AS pairs,
       count(*) FILTER (WHERE (SELECT (a_pos, b_pos, leash) FROM frechet_bottleneck(ga, gb))
                              = (SELECT (a_pos, b_pos, leash) FROM frechet_bottleneck(pa, pb))) AS bottleneck_same,
       count(*) FILTER (WHERE frechet_partial_distance(gb, ga) = frechet_partial_distance(pb, pa)) AS partial_same,
       count(*) FILTER (WHERE (SELECT array_agg((route_from, route_to, distance)) FROM frechet_partial_match(gb, ga, 12))
                              IS NOT DISTINCT FROM (SELECT array_agg((route_from, route_to, distance)) FROM frechet_partial_match(pb, pa, 12))) AS partial_match_same,
       count(*) FILTER (WHERE (SELECT array_agg((trip_from, trip_to, route_from, route_to, max_leash, trip_length)) FROM frechet_excursions(ga, gb, 9))
                              IS NOT DISTINCT FROM (SELECT array_agg((trip_from, trip_to, route_from, route_to, max_leash, trip_length)) FROM frechet_excursions(pa, pb, 9))) AS excursions_same
FROM wpairs;

-- route_part is the part of the route matched: the trip's Fréchet distance
-- to that sub-line is the reported distance.
SELECT count(*) AS matches,
       count(*) FILTER (WHERE abs(frechet_distance(gb, m.route_part) - m.distance) <= 1e-9 * greatest(m.distance, 1)) AS distance_to_part,
       count(*) FILTER (WHERE ST_Distance(ST_StartPoint(m.route_part), ga) < 1e-9 AND ST_Distance(ST_EndPoint(m.route_part), ga) < 1e-9) AS ends_on_route
FROM wpairs, LATERAL frechet_partial_match(gb, ga, 12) m;

-- trip_piece runs from trip vertex trip_from to trip vertex trip_to.
SELECT count(*) AS excursions,
       count(*) FILTER (WHERE ST_Equals(ST_StartPoint(x.trip_piece), ST_PointN(ga, x.trip_from::int))
                          AND ST_Equals(ST_EndPoint(x.trip_piece), ST_PointN(ga, x.trip_to::int))
                          AND ST_NPoints(x.trip_piece) = x.trip_to - x.trip_from + 1) AS piece_is_stretch,
       count(*) FILTER (WHERE abs(ST_Length(x.trip_piece) - x.trip_length) <= 1e-9 * x.trip_length) AS length_matches
FROM wpairs, LATERAL frechet_excursions(ga, gb, 9) x;

-- 3-D: points keep Z.
SELECT a_pos, b_pos, ST_AsText(a_point) AS a_point, ST_AsText(b_point) AS b_point, leash
FROM frechet_bottleneck('LINESTRING Z(0 0 0,10 0 0)'::geometry, 'LINESTRING Z(0 0 0,5 0 3,10 0 0)'::geometry);

-- Geography: leashes in metres agree with PostGIS's geodesic distance
-- between the reported points (ST_Distance on the spheroid), within
-- 1e-6 plus the chord sag of the edge (points are shown on the surface).
SELECT count(*) AS breakpoints,
       count(*) FILTER (WHERE abs(leash - ST_Distance(a_point, b_point, true)) <= 1e-6 * leash + 0.01) AS agree,
       abs(max(leash) - frechet_distance(a, b)) <= 1e-9 * frechet_distance(a, b) AS longest_is_distance
FROM (SELECT 'SRID=4326;LINESTRING(-7.72 41.88,-7.73 41.89,-7.74 41.88,-7.745 41.885)'::geography AS a,
             'SRID=4326;LINESTRING(-7.7201 41.8801,-7.7305 41.8898,-7.7399 41.8802,-7.7448 41.8853)'::geography AS b) s,
     LATERAL frechet_matching(a, b) m
GROUP BY a, b;

-- A trip that follows the middle of a route across the antimeridian,
-- 11 m to its side: the matched part is the middle, in lon/lat.
SELECT round(route_from::numeric, 6) AS route_from, round(route_to::numeric, 6) AS route_to,
       round(distance::numeric, 3) AS metres, ST_AsText(route_part, 6) AS route_part, ST_SRID(route_part) AS srid
FROM frechet_partial_match('SRID=4326;LINESTRING(179.999 0.0001,-179.999 0.0001)'::geography,
                           'SRID=4326;LINESTRING(179.99 0,-179.99 0)'::geography, 20);
SELECT round(frechet_partial_distance('SRID=4326;LINESTRING(179.999 0.0001,-179.999 0.0001)'::geography,
                                      'SRID=4326;LINESTRING(179.99 0,-179.99 0)'::geography)::numeric, 3) AS partial_metres;

-- A detour near the South Pole, in metres.
SELECT trip_from, trip_to, round(max_leash::numeric, 1) AS max_leash_m, ST_NPoints(trip_piece::geometry) AS piece_points
FROM frechet_excursions('SRID=4326;LINESTRING(0 -89.9,0 -89.8,1 -89.7,0 -89.6,0 -89.5)'::geography,
                        'SRID=4326;LINESTRING(0 -89.9,0 -89.5)'::geography, 100);

-- No matching within epsilon: no rows, NULL leashes; bad input as elsewhere.
SELECT count(*) AS rows_within_1 FROM frechet_matching('LINESTRING(0 0,10 0)'::geometry, 'LINESTRING(0 5,10 5)'::geometry, 1);
SELECT frechet_matching_leashes('LINESTRING(0 0,10 0)'::geometry, 'LINESTRING(0 5,10 5)'::geometry, 1) IS NULL AS no_leashes;
SELECT * FROM frechet_partial_match('SRID=3857;LINESTRING(0 0,1 0)'::geometry, 'SRID=4326;LINESTRING(0 0,1 0)'::geometry, 1);
SELECT * FROM frechet_excursions('LINESTRING(0 0,1 0)'::geometry, 'POLYGON((0 0,1 0,1 1,0 0))'::geometry, 1);
SELECT * FROM frechet_matching('LINESTRING(0 0,1 0)'::geometry, 'LINESTRING(0 0,1 0)'::geometry, -1);

DROP TABLE wpairs;
DROP EXTENSION frechet_ext_postgis;
DROP EXTENSION postgis;
