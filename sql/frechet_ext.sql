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

-- Witness and diagnosis: the matching, its bottleneck, partial matches.

CREATE FUNCTION @extschema@.frechet_matching(a pg_catalog.point[], b pg_catalog.point[],
	epsilon pg_catalog.float8 DEFAULT NULL)
RETURNS TABLE (step pg_catalog.int4, a_pos pg_catalog.float8, b_pos pg_catalog.float8,
	a_point pg_catalog.point, b_point pg_catalog.point, leash pg_catalog.float8)
AS 'MODULE_PATHNAME', 'frechet_matching_point_array'
LANGUAGE C IMMUTABLE CALLED ON NULL INPUT PARALLEL SAFE COST 100000 ROWS 200;

COMMENT ON FUNCTION @extschema@.frechet_matching(pg_catalog.point[], pg_catalog.point[], pg_catalog.float8) IS
'breakpoints of a monotone matching of two polylines (positions k + t, 1-based); optimal when epsilon is NULL, else any within epsilon, or no rows';

CREATE FUNCTION @extschema@.frechet_bottleneck(a pg_catalog.point[], b pg_catalog.point[])
RETURNS TABLE (a_pos pg_catalog.float8, b_pos pg_catalog.float8,
	a_point pg_catalog.point, b_point pg_catalog.point, leash pg_catalog.float8)
AS 'MODULE_PATHNAME', 'frechet_bottleneck_point_array'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 100000 ROWS 1;

COMMENT ON FUNCTION @extschema@.frechet_bottleneck(pg_catalog.point[], pg_catalog.point[]) IS
'where the longest leash of an optimal matching is: positions (k + t, 1-based), points and the leash, which equals the Fréchet distance';

CREATE FUNCTION @extschema@.frechet_partial_distance(trip pg_catalog.point[], route pg_catalog.point[])
RETURNS pg_catalog.float8
AS 'MODULE_PATHNAME', 'frechet_partial_distance_point_array'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 50000;

COMMENT ON FUNCTION @extschema@.frechet_partial_distance(pg_catalog.point[], pg_catalog.point[]) IS
'smallest Fréchet distance between the trip and any part of the route, exact to double precision';

CREATE FUNCTION @extschema@.frechet_partial_match(trip pg_catalog.point[], route pg_catalog.point[],
	epsilon pg_catalog.float8)
RETURNS TABLE (route_from pg_catalog.float8, route_to pg_catalog.float8, distance pg_catalog.float8)
AS 'MODULE_PATHNAME', 'frechet_partial_match_point_array'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 20000 ROWS 1;

COMMENT ON FUNCTION @extschema@.frechet_partial_match(pg_catalog.point[], pg_catalog.point[], pg_catalog.float8) IS
'the part of the route (positions k + t, 1-based) that the trip follows within epsilon, with the distance to it; no row if none';

CREATE FUNCTION @extschema@.frechet_excursions(trip pg_catalog.point[], route pg_catalog.point[],
	epsilon pg_catalog.float8)
RETURNS TABLE (trip_from pg_catalog.float8, trip_to pg_catalog.float8,
	route_from pg_catalog.float8, route_to pg_catalog.float8,
	max_leash pg_catalog.float8, trip_length pg_catalog.float8)
AS 'MODULE_PATHNAME', 'frechet_excursions_point_array'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 100000 ROWS 2;

COMMENT ON FUNCTION @extschema@.frechet_excursions(pg_catalog.point[], pg_catalog.point[], pg_catalog.float8) IS
'stretches of the trip (vertex numbers) that an order-preserving matching cannot keep within epsilon of the route, with where on the route it left and rejoined; no rows exactly when frechet_at_most is true';
