-- Real GPS data (frechet_ext_postgis): the 1998 track log of 739 fixes
-- shipped by Debian's gpsman package (GPL; see test/data/README.md).
-- Plausibility checks, each against an outside source named beside it.
CREATE EXTENSION IF NOT EXISTS postgis;
CREATE EXTENSION frechet_ext_postgis;

CREATE TABLE gps_raw (k serial, line text);
\copy gps_raw (line) FROM 'test/data/gpsman-larouco-1998.txt' WITH (FORMAT text, DELIMITER E'\x1f')
-- fix lines: TAB date time TAB lat "d m s" TAB lon "d m s"; the sign is the degrees'
CREATE TABLE gps_fix AS
SELECT row_number() OVER (ORDER BY k) AS i,
       to_timestamp(m[1], 'DD-Mon-YYYY HH24:MI:SS')::timestamp AS at,
       (CASE WHEN m[2] LIKE '-%' THEN -1 ELSE 1 END) * (abs(m[2]::float8) + m[3]::float8 / 60 + m[4]::float8 / 3600) AS lat,
       (CASE WHEN m[5] LIKE '-%' THEN -1 ELSE 1 END) * (abs(m[5]::float8) + m[6]::float8 / 60 + m[7]::float8 / 3600) AS lon
FROM (SELECT k, regexp_match(line, '^\t(\S+ \S+)\t(-?\d+) (\d+) ([\d.]+)\s*\t(-?\d+) (\d+) ([\d.]+)') AS m FROM gps_raw) s
WHERE m IS NOT NULL;
SELECT count(*) AS fixes, min(at) AS first_fix, max(at) AS last_fix,
       round(min(lat)::numeric, 4) AS min_lat, round(max(lat)::numeric, 4) AS max_lat,
       round(min(lon)::numeric, 4) AS min_lon, round(max(lon)::numeric, 4) AS max_lon
FROM gps_fix;

-- The whole track, and two "recordings" of the same flight made from it:
-- the odd-numbered and the even-numbered fixes, as two receivers logging
-- at half the rate, out of step.
CREATE TABLE gps_track AS
SELECT (SELECT ST_MakeLine(array_agg(ST_SetSRID(ST_MakePoint(lon, lat), 4326) ORDER BY i))::geography FROM gps_fix) AS full_track,
       (SELECT ST_MakeLine(array_agg(ST_SetSRID(ST_MakePoint(lon, lat), 4326) ORDER BY i))::geography FROM gps_fix WHERE i % 2 = 1) AS odd,
       (SELECT ST_MakeLine(array_agg(ST_SetSRID(ST_MakePoint(lon, lat), 4326) ORDER BY i))::geography FROM gps_fix WHERE i % 2 = 0) AS even,
       (SELECT max(ST_Distance(a, b, true)) FROM
          (SELECT ST_SetSRID(ST_MakePoint(lon, lat), 4326)::geography AS a,
                  lead(ST_SetSRID(ST_MakePoint(lon, lat), 4326)::geography) OVER (ORDER BY i) AS b FROM gps_fix) s) AS longest_step;

-- (1) The two half-rate recordings follow each other closely: the distance
-- is at least their endpoint leashes (PostGIS ST_Distance on the
-- spheroid) and, because each is within one step of the full track, at
-- most twice the longest step (triangle inequality of the Fréchet metric).
SELECT round(frechet_distance(odd, even)::numeric, 1) AS odd_vs_even_m,
       frechet_distance(odd, even) >= greatest(ST_Distance(ST_StartPoint(odd::geometry)::geography, ST_StartPoint(even::geometry)::geography, true),
                                               ST_Distance(ST_EndPoint(odd::geometry)::geography, ST_EndPoint(even::geometry)::geography, true)) AS above_endpoints,
       frechet_distance(full_track, odd) <= longest_step AND frechet_distance(full_track, even) <= longest_step AS each_within_one_step,
       frechet_distance(odd, even) <= frechet_distance(full_track, odd) + frechet_distance(full_track, even) AS triangle,
       round(longest_step::numeric, 1) AS longest_step_m
FROM gps_track;

-- (2) Metres on WGS84 against a projected metric: the same tracks in UTM
-- zone 29N (EPSG:32629, through PostGIS's ST_Transform and PROJ; scale
-- 0.9997 here) give the same distance within 0.1 %.
SELECT round((frechet_distance(odd, even) /
              frechet_distance(ST_Transform(odd::geometry, 32629), ST_Transform(even::geometry, 32629)))::numeric, 4) AS wgs84_over_utm,
       round((frechet_distance(full_track, odd) /
              frechet_distance(ST_Transform(full_track::geometry, 32629), ST_Transform(odd::geometry, 32629)))::numeric, 4) AS full_over_utm
FROM gps_track;

-- (3) Order matters: the track against itself backwards is at least as far
-- as its start is from its end (endpoint leash, PostGIS ST_Distance), and
-- far more than the two recordings are from each other.
SELECT round(ST_Distance(ST_StartPoint(full_track::geometry)::geography, ST_EndPoint(full_track::geometry)::geography, true)::numeric, 0) AS start_to_end_m,
       frechet_distance(full_track, ST_Reverse(full_track::geometry)::geography)
         >= ST_Distance(ST_StartPoint(full_track::geometry)::geography, ST_EndPoint(full_track::geometry)::geography, true) AS reversed_above_endpoints,
       frechet_distance(full_track, ST_Reverse(full_track::geometry)::geography) > 10 * frechet_distance(odd, even) AS reversed_far
FROM gps_track;

-- (4) Eiter & Mannila 1994: d <= d_discrete <= d + the longest edge (an
-- edge of a half-rate recording spans two steps of the log).
SELECT discrete_frechet_distance(odd, even) >= frechet_distance(odd, even) AS discrete_above,
       discrete_frechet_distance(odd, even) <= frechet_distance(odd, even)
         + 2 * longest_step AS discrete_within_edge,
       frechet_at_most(odd, even, frechet_distance(odd, even)) AS at_most_at_d
FROM gps_track;

DROP TABLE gps_raw, gps_fix, gps_track;
DROP EXTENSION frechet_ext_postgis;
DROP EXTENSION postgis;
