-- EWKB decoding (frechet_ext_postgis): byte orders, dimensions, M, Points,
-- and every kind of bad input.  try() reports the SQLSTATE of a failure.
CREATE EXTENSION IF NOT EXISTS postgis;
CREATE EXTENSION frechet_ext_postgis;
CREATE FUNCTION pg_temp.try(stmt text) RETURNS text
LANGUAGE plpgsql AS $$
DECLARE
	state text;
	msg text;
	detail text;
	hint text;
	r text;
BEGIN
	EXECUTE stmt INTO r;
	RETURN 'ok: ' || coalesce(r, 'NULL');
EXCEPTION WHEN OTHERS THEN
	GET STACKED DIAGNOSTICS state = RETURNED_SQLSTATE, msg = MESSAGE_TEXT,
		detail = PG_EXCEPTION_DETAIL, hint = PG_EXCEPTION_HINT;
	RETURN state || ': ' || msg || coalesce(' / ' || nullif(detail, ''), '') || coalesce(' / ' || nullif(hint, ''), '');
END $$;

-- Both byte orders (XDR big-endian, NDR little-endian) decode alike; the
-- point[] function on the same coordinates is the reference.
SELECT frechet_distance_ewkb(ST_AsEWKB(a, 'XDR'), ST_AsEWKB(b, 'NDR')) AS xdr_ndr,
       frechet_distance_ewkb(ST_AsEWKB(a, 'NDR'), ST_AsEWKB(b, 'XDR')) AS ndr_xdr,
       frechet_distance('{"(0,0)","(10,0)"}'::point[], '{"(0,0)","(6,1)","(4,-1)","(10,0)"}'::point[]) AS point_array
FROM (SELECT 'LINESTRING(0 0,10 0)'::geometry a, 'LINESTRING(0 0,6 1,4 -1,10 0)'::geometry b) g;
SELECT get_byte(ST_AsEWKB('POINT(1 2)'::geometry, 'XDR'), 0) AS xdr_marker,
       get_byte(ST_AsEWKB('POINT(1 2)'::geometry, 'NDR'), 0) AS ndr_marker;

-- ISO WKB (ST_AsBinary: type codes 1002, 2002, 3002, no SRID) decodes too.
SELECT frechet_distance_ewkb(ST_AsBinary('LINESTRING Z(0 0 0,10 0 0)'::geometry),
                             ST_AsBinary('LINESTRING Z(0 0 5,10 0 5)'::geometry)) AS iso_z,
       get_byte(ST_AsBinary('LINESTRING Z(0 0 0,10 0 0)'::geometry), 1) +
       256 * get_byte(ST_AsBinary('LINESTRING Z(0 0 0,10 0 0)'::geometry), 2) AS iso_code;

-- 3-D: Z enters the metric.  2-D vs 3-D: 5 apart in z only, 0 in plan.
SELECT frechet_distance('LINESTRING Z(0 0 0,10 0 0)'::geometry, 'LINESTRING Z(0 0 5,10 0 5)'::geometry) AS z_apart,
       round(frechet_distance('LINESTRING Z(0 0 0,10 0 0)'::geometry, 'LINESTRING Z(0 0 0,5 0 3,10 0 0)'::geometry)::numeric, 9) AS z_bump,
       frechet_distance('LINESTRING(0 0,10 0)'::geometry, 'LINESTRING(0 0,5 0,10 0)'::geometry) AS flat;

-- M is dropped: XYM is 2-D, XYZM is 3-D, whatever the M values.
SELECT frechet_distance('LINESTRING M(0 0 100,10 0 -7)'::geometry, 'LINESTRING(0 1,10 1)'::geometry) AS xym_vs_xy,
       frechet_distance('LINESTRING ZM(0 0 0 1,10 0 0 2)'::geometry, 'LINESTRING Z(0 0 2,10 0 2)'::geometry) AS xyzm_vs_xyz,
       frechet_distance_ewkb(ST_AsBinary('LINESTRING M(0 0 5,10 0 6)'::geometry), ST_AsBinary('LINESTRING M(0 3 0,10 3 0)'::geometry)) AS iso_m;

-- A Point is a one-point curve.
SELECT frechet_distance('POINT(0 0)'::geometry, 'POINT(3 4)'::geometry) AS point_point,
       frechet_distance('POINT(0 0)'::geometry, 'LINESTRING(3 4,-6 -8)'::geometry) AS point_line,
       frechet_distance('POINT Z(0 0 0)'::geometry, 'POINT Z(1 2 2)'::geometry) AS point_z,
       discrete_frechet_distance('POINT(1 1)'::geometry, 'LINESTRING(1 1,1 1)'::geometry) AS repeated;

-- SRIDs: kept through, must match; no SRID counts as 0.
SELECT frechet_distance('SRID=3857;LINESTRING(0 0,1 0)'::geometry, 'SRID=3857;LINESTRING(0 1,1 1)'::geometry) AS same_srid;

-- Bad input: one line each, the SQLSTATE first.
SELECT label, pg_temp.try(stmt) AS outcome
FROM (VALUES
  (1, 'srid mismatch', $$SELECT frechet_distance('SRID=3857;LINESTRING(0 0,1 0)'::geometry, 'SRID=4326;LINESTRING(0 1,1 1)'::geometry)$$),
  (2, 'srid vs none', $$SELECT frechet_at_most('SRID=3857;LINESTRING(0 0,1 0)'::geometry, 'LINESTRING(0 1,1 1)'::geometry, 1)$$),
  (3, '2-D vs 3-D', $$SELECT frechet_distance('LINESTRING(0 0,1 0)'::geometry, 'LINESTRING Z(0 1 0,1 1 0)'::geometry)$$),
  (4, 'xym vs xyz', $$SELECT discrete_frechet_distance('LINESTRING M(0 0 0,1 0 0)'::geometry, 'LINESTRING Z(0 1 0,1 1 0)'::geometry)$$),
  (5, 'empty linestring', $$SELECT frechet_distance('LINESTRING EMPTY'::geometry, 'LINESTRING(0 1,1 1)'::geometry)$$),
  (6, 'empty point', $$SELECT frechet_distance('POINT(0 1)'::geometry, 'POINT EMPTY'::geometry)$$),
  (7, 'polygon', $$SELECT frechet_distance('POLYGON((0 0,1 0,1 1,0 0))'::geometry, 'LINESTRING(0 1,1 1)'::geometry)$$),
  (8, 'multilinestring', $$SELECT frechet_distance('LINESTRING(0 1,1 1)'::geometry, 'MULTILINESTRING((0 0,1 0),(1 0,2 0))'::geometry)$$),
  (9, 'multipoint', $$SELECT frechet_distance('MULTIPOINT(0 0,1 0)'::geometry, 'LINESTRING(0 1,1 1)'::geometry)$$),
  (10, 'collection', $$SELECT frechet_distance('GEOMETRYCOLLECTION(LINESTRING(0 0,1 0))'::geometry, 'LINESTRING(0 1,1 1)'::geometry)$$),
  (11, 'circularstring', $$SELECT frechet_distance('CIRCULARSTRING(0 0,1 1,2 0)'::geometry, 'LINESTRING(0 1,1 1)'::geometry)$$),
  (12, 'NaN coordinate', $$SELECT frechet_distance('LINESTRING(0 0,NaN 1)'::geometry, 'LINESTRING(0 1,1 1)'::geometry)$$),
  (13, 'huge coordinate', $$SELECT frechet_distance('LINESTRING(0 0,1e200 1)'::geometry, 'LINESTRING(0 1,1 1)'::geometry)$$),
  (14, 'negative epsilon', $$SELECT frechet_at_most('LINESTRING(0 0,1 0)'::geometry, 'LINESTRING(0 1,1 1)'::geometry, -1)$$),
  (15, 'NaN epsilon', $$SELECT frechet_at_most('LINESTRING(0 0,1 0)'::geometry, 'LINESTRING(0 1,1 1)'::geometry, 'NaN')$$),
  (16, 'NULL geometry', $$SELECT frechet_distance(NULL::geometry, 'LINESTRING(0 1,1 1)'::geometry)$$),
  (17, 'byte order 2', $$SELECT frechet_distance_ewkb('\x0201000000000000000000f03f000000000000f03f'::bytea, ST_AsEWKB('POINT(0 0)'::geometry))$$),
  (18, 'empty bytea', $$SELECT frechet_distance_ewkb(''::bytea, ST_AsEWKB('POINT(0 0)'::geometry))$$),
  (19, 'unknown type 99', $$SELECT frechet_distance_ewkb(ST_AsEWKB('POINT(0 0)'::geometry), '\x0163000000000000000000f03f000000000000f03f'::bytea)$$),
  (20, 'iso code 4002', $$SELECT frechet_distance_ewkb('\x01a20f0000000000000000f03f000000000000f03f'::bytea, ST_AsEWKB('POINT(0 0)'::geometry))$$),
  (21, 'trailing byte', $$SELECT frechet_distance_ewkb(ST_AsEWKB('LINESTRING(0 0,1 1)'::geometry) || '\x00'::bytea, ST_AsEWKB('POINT(0 0)'::geometry))$$),
  (22, '4 billion points claimed', $$SELECT frechet_distance_ewkb('\x0102000000ffffffff000000000000f03f'::bytea, ST_AsEWKB('POINT(0 0)'::geometry))$$),
  (23, 'geodetic latitude 95', $$SELECT frechet_distance_ewkb(ST_AsEWKB('SRID=4326;LINESTRING(0 0,1 95)'::geometry), ST_AsEWKB('SRID=4326;POINT(0 0)'::geometry), true)$$),
  (24, 'geodetic longitude -181', $$SELECT frechet_at_most_ewkb(ST_AsEWKB('SRID=4326;POINT(0 0)'::geometry), ST_AsEWKB('SRID=4326;POINT(-181 0)'::geometry), 10, true)$$),
  (25, 'planar latitude 95 is fine', $$SELECT frechet_distance_ewkb(ST_AsEWKB('LINESTRING(0 0,1 95)'::geometry), ST_AsEWKB('POINT(0 0)'::geometry))$$)
) AS t(k, label, stmt)
ORDER BY k;

-- Truncated input: every proper prefix of a valid 3-D EWKB with SRID fails
-- cleanly with 22P03 invalid_binary_representation, never reading past
-- the buffer.
SELECT substring(outcome FROM '^[0-9A-Z]{5}') AS sqlstate, count(*) AS prefixes, min(n) AS shortest, max(n) AS longest
FROM (SELECT n, pg_temp.try(format('SELECT frechet_distance_ewkb(%L::bytea, %L::bytea)',
                                   substring(e FROM 1 FOR n), e)) AS outcome
      FROM (SELECT ST_AsEWKB('SRID=3857;LINESTRING Z(0 0 0,1 1 1,2 0 2)'::geometry) AS e) v,
           generate_series(0, length(ST_AsEWKB('SRID=3857;LINESTRING Z(0 0 0,1 1 1,2 0 2)'::geometry)) - 1) n) t
GROUP BY 1 ORDER BY 1;

-- Garbage: 2,000 deterministic pseudo-random byte strings (md5 chains),
-- each with a valid or an invalid first byte; all fail cleanly.
SELECT substring(outcome FROM '^[0-9A-Z]{5}|^ok') AS outcome, count(*)
FROM (SELECT pg_temp.try(format('SELECT frechet_distance_ewkb(%L::bytea, %L::bytea)',
                                decode(lpad(to_hex(i % 2), 2, '0') ||
                                       repeat(md5(i::text), 1 + i % 5) , 'hex'),
                                ST_AsEWKB('POINT(0 0)'::geometry))) AS outcome
      FROM generate_series(1, 2000) i) t
GROUP BY 1 ORDER BY 1;

-- Garbage behind a valid LineString header (random point counts and
-- coordinate bits): each fails cleanly or, where the bytes happen to
-- form a well-formed curve, gives a number.
SELECT substring(outcome FROM '^[0-9A-Z]{5}|^ok') AS outcome, count(*)
FROM (SELECT pg_temp.try(format('SELECT frechet_distance_ewkb(%L::bytea, %L::bytea)',
                                '\x0102000000'::bytea || decode(lpad(to_hex(i % 4), 2, '0') || '000000' ||
                                       repeat(md5(i::text), i % 4), 'hex'),
                                ST_AsEWKB('POINT(0 0)'::geometry))) AS outcome
      FROM generate_series(1, 2000) i) t
GROUP BY 1 ORDER BY 1;

DROP EXTENSION frechet_ext_postgis;
DROP EXTENSION postgis;
