-- frechet_ext install script: Fréchet distances on point[].
\echo Use "CREATE EXTENSION frechet_ext" to load this file. \quit

CREATE FUNCTION @extschema@.frechet_distance(a pg_catalog.point[], b pg_catalog.point[])
RETURNS pg_catalog.float8
AS 'MODULE_PATHNAME', 'frechet_distance_point_array'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 50000;

COMMENT ON FUNCTION @extschema@.frechet_distance(pg_catalog.point[], pg_catalog.point[]) IS
'continuous Fréchet distance between two polylines, exact to double precision, in coordinate units';

CREATE FUNCTION @extschema@.frechet_at_most(a pg_catalog.point[], b pg_catalog.point[], epsilon pg_catalog.float8)
RETURNS pg_catalog.bool
AS 'MODULE_PATHNAME', 'frechet_at_most_point_array'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 5000;

COMMENT ON FUNCTION @extschema@.frechet_at_most(pg_catalog.point[], pg_catalog.point[], pg_catalog.float8) IS
'true when the continuous Fréchet distance between two polylines is at most epsilon; cheaper than computing the distance';

CREATE FUNCTION @extschema@.discrete_frechet_distance(a pg_catalog.point[], b pg_catalog.point[])
RETURNS pg_catalog.float8
AS 'MODULE_PATHNAME', 'discrete_frechet_distance_point_array'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 10000;

COMMENT ON FUNCTION @extschema@.discrete_frechet_distance(pg_catalog.point[], pg_catalog.point[]) IS
'discrete Fréchet distance (vertex-to-vertex couplings only) between two polylines, in coordinate units';

CREATE OPERATOR @extschema@.<-> (
	LEFTARG = pg_catalog.point[],
	RIGHTARG = pg_catalog.point[],
	FUNCTION = @extschema@.frechet_distance,
	COMMUTATOR = OPERATOR(@extschema@.<->)
);

COMMENT ON OPERATOR @extschema@.<-> (pg_catalog.point[], pg_catalog.point[]) IS
'continuous Fréchet distance, the same as frechet_distance';
