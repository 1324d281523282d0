-- frechet_ext 0.1 -> 0.2.
\echo Use "ALTER EXTENSION frechet_ext UPDATE TO '0.2'" to load this file. \quit

-- Sparse pings matched in order to a route (src/core/pings.c).  Not STRICT:
-- a NULL max_gap means no limit; NULL trip, route or epsilon give NULL.
CREATE FUNCTION @extschema@.frechet_pings_at_most(trip pg_catalog.point[], route pg_catalog.point[], epsilon pg_catalog.float8, max_gap pg_catalog.float8 DEFAULT NULL)
RETURNS pg_catalog.bool
AS 'MODULE_PATHNAME', 'frechet_pings_at_most_point_array'
LANGUAGE C IMMUTABLE CALLED ON NULL INPUT PARALLEL SAFE COST 500;

COMMENT ON FUNCTION @extschema@.frechet_pings_at_most(pg_catalog.point[], pg_catalog.point[], pg_catalog.float8, pg_catalog.float8) IS
'true when every ping of the trip lies within epsilon of the route at non-decreasing route positions, the first at the route''s start and the last at its end; max_gap (NULL: no limit) caps the route length between consecutive positions';

CREATE FUNCTION @extschema@.frechet_pings_distance(trip pg_catalog.point[], route pg_catalog.point[], max_gap pg_catalog.float8 DEFAULT NULL)
RETURNS pg_catalog.float8
AS 'MODULE_PATHNAME', 'frechet_pings_distance_point_array'
LANGUAGE C IMMUTABLE CALLED ON NULL INPUT PARALLEL SAFE COST 2000;

COMMENT ON FUNCTION @extschema@.frechet_pings_distance(pg_catalog.point[], pg_catalog.point[], pg_catalog.float8) IS
'smallest epsilon for which frechet_pings_at_most is true (Infinity when max_gap allows no matching); never above frechet_distance';
