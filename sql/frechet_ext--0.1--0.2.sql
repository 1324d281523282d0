-- frechet_ext 0.1 -> 0.2.
\echo Use "ALTER EXTENSION frechet_ext UPDATE TO '0.2'" to load this file. \quit

-- 0.1 compared the row count with an unqualified =, resolved with the
-- install script's search_path; the operator is now named in full.
CREATE OR REPLACE FUNCTION @extschema@.frechet_track_geojson(track pg_catalog.point[])
RETURNS pg_catalog.jsonb
LANGUAGE sql IMMUTABLE STRICT PARALLEL SAFE COST 20
RETURN (
	SELECT CASE WHEN pg_catalog.count(*) OPERATOR(pg_catalog.=) 1
		THEN pg_catalog.jsonb_build_object('type', 'Point',
			'coordinates', (pg_catalog.array_agg(pg_catalog.jsonb_build_array(u.p[0], u.p[1])))[1])
		ELSE pg_catalog.jsonb_build_object('type', 'LineString',
			'coordinates', pg_catalog.jsonb_agg(pg_catalog.jsonb_build_array(u.p[0], u.p[1]) ORDER BY u.i))
		END
	FROM pg_catalog.unnest(@extschema@.frechet_track_piece(track, 1, pg_catalog.cardinality(track)))
		WITH ORDINALITY AS u(p, i));

-- frechet_key records its kind of coordinates (planar or Earth-centred);
-- the operator class's consistent function now refuses a query key of
-- the other kind (22023) instead of comparing it silently.  Stored keys
-- are unchanged: no REINDEX is needed.
CREATE OR REPLACE FUNCTION @extschema@.frechet_gist_consistent(internal, pg_catalog.point[], pg_catalog.int2, pg_catalog.oid, internal)
RETURNS pg_catalog.bool
AS 'MODULE_PATHNAME', 'frechet_gist_consistent_planar'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;
