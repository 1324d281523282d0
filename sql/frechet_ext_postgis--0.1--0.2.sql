-- frechet_ext_postgis 0.1 -> 0.2.
\echo Use "ALTER EXTENSION frechet_ext_postgis UPDATE TO '0.2'" to load this file. \quit
-- PostGIS's types, which PostgreSQL 15 offers no placeholder to qualify:
-- ALTER EXTENSION ... UPDATE finds them through the search_path it sets.
-- lint_sql: allow geometry geography frechet_key

-- PostGIS's own box operators in both classes.  PostGIS's planner support
-- (postgis_index_supportfn) turns ST_DWithin, ST_Intersects, ST_Contains
-- and its other indexable predicates into a box condition on every GiST
-- index of the column, and fails at planning when the index's operator
-- family lacks the operator of the strategy it asks for: geometry && 3,
-- ~= 6, ~ 7, @ 8; geography && 3.  The consistent function answers them
-- from the box in our key (lossy, rechecked).  PostgreSQL 15 has no
-- @extschema:postgis@: the operators and types are named in the schema of
-- the installed postgis extension, never through search_path.
DO $$
DECLARE
	nsp pg_catalog.text := (SELECT n.nspname FROM pg_catalog.pg_extension e
	                        JOIN pg_catalog.pg_namespace n ON n.oid = e.extnamespace
	                        WHERE e.extname = 'postgis');
BEGIN
	EXECUTE pg_catalog.format(
		'ALTER OPERATOR FAMILY @extschema@.frechet_geometry_ops USING gist ADD '
		'OPERATOR 3 %1$I.&& (%1$I.geometry, %1$I.geometry), '
		'OPERATOR 6 %1$I.~= (%1$I.geometry, %1$I.geometry), '
		'OPERATOR 7 %1$I.~ (%1$I.geometry, %1$I.geometry), '
		'OPERATOR 8 %1$I.@ (%1$I.geometry, %1$I.geometry)', nsp);
	EXECUTE pg_catalog.format(
		'ALTER OPERATOR FAMILY @extschema@.frechet_geography_ops USING gist ADD '
		'OPERATOR 3 %1$I.&& (%1$I.geography, %1$I.geography)', nsp);
END $$;

CREATE FUNCTION @extschema@.frechet_geo_pings_support(internal)
RETURNS internal
AS 'MODULE_PATHNAME', 'frechet_pings_support'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

COMMENT ON FUNCTION @extschema@.frechet_geo_pings_support(internal) IS
'planner support of frechet_pings_at_most on geometry and geography: the index condition trip &~> frechet_reach(route, epsilon)';

-- Sparse pings matched in order to a route, on geometry (units of the SRID)
-- and geography (metres).  Not STRICT: a NULL max_gap means no limit.
CREATE FUNCTION @extschema@.frechet_pings_at_most(trip geometry, route geometry, epsilon pg_catalog.float8, max_gap pg_catalog.float8 DEFAULT NULL)
RETURNS pg_catalog.bool
AS 'MODULE_PATHNAME', 'frechet_pings_at_most_geometry'
LANGUAGE C IMMUTABLE CALLED ON NULL INPUT PARALLEL SAFE COST 500
SUPPORT @extschema@.frechet_geo_pings_support;

COMMENT ON FUNCTION @extschema@.frechet_pings_at_most(geometry, geometry, pg_catalog.float8, pg_catalog.float8) IS
'true when every ping (vertex) of the trip lies within epsilon (units of the SRID) of the route at non-decreasing route positions from its start to its end; max_gap (NULL: no limit) caps the route length between consecutive positions';

CREATE FUNCTION @extschema@.frechet_pings_distance(trip geometry, route geometry, max_gap pg_catalog.float8 DEFAULT NULL)
RETURNS pg_catalog.float8
AS 'MODULE_PATHNAME', 'frechet_pings_distance_geometry'
LANGUAGE C IMMUTABLE CALLED ON NULL INPUT PARALLEL SAFE COST 2000;

COMMENT ON FUNCTION @extschema@.frechet_pings_distance(geometry, geometry, pg_catalog.float8) IS
'smallest epsilon (units of the SRID) for which frechet_pings_at_most is true; Infinity when max_gap allows no matching';

CREATE FUNCTION @extschema@.frechet_pings_at_most(trip geography, route geography, epsilon pg_catalog.float8, max_gap pg_catalog.float8 DEFAULT NULL)
RETURNS pg_catalog.bool
AS 'MODULE_PATHNAME', 'frechet_pings_at_most_geography'
LANGUAGE C IMMUTABLE CALLED ON NULL INPUT PARALLEL SAFE COST 500
SUPPORT @extschema@.frechet_geo_pings_support;

COMMENT ON FUNCTION @extschema@.frechet_pings_at_most(geography, geography, pg_catalog.float8, pg_catalog.float8) IS
'true when every ping of the trip lies within epsilon metres of the route at non-decreasing route positions from its start to its end; max_gap in metres (NULL: no limit)';

CREATE FUNCTION @extschema@.frechet_pings_distance(trip geography, route geography, max_gap pg_catalog.float8 DEFAULT NULL)
RETURNS pg_catalog.float8
AS 'MODULE_PATHNAME', 'frechet_pings_distance_geography'
LANGUAGE C IMMUTABLE CALLED ON NULL INPUT PARALLEL SAFE COST 2000;

COMMENT ON FUNCTION @extschema@.frechet_pings_distance(geography, geography, pg_catalog.float8) IS
'smallest epsilon in metres for which frechet_pings_at_most is true; Infinity when max_gap allows no matching';

CREATE FUNCTION @extschema@.frechet_pings_within_reach(track geometry, reach frechet_key)
RETURNS pg_catalog.bool
AS 'MODULE_PATHNAME', 'frechet_pings_within_reach_geometry'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 100;

COMMENT ON FUNCTION @extschema@.frechet_pings_within_reach(geometry, frechet_key) IS
'true when the track''s first and last vertices and bounding box allow every vertex to lie within the reach''s epsilon of the route, in order (necessary for frechet_pings_at_most)';

CREATE OPERATOR @extschema@.&~> (
	LEFTARG = geometry,
	RIGHTARG = frechet_key,
	FUNCTION = @extschema@.frechet_pings_within_reach
);

COMMENT ON OPERATOR @extschema@.&~> (geometry, frechet_key) IS
'track &~> frechet_reach(route, epsilon): the index condition of frechet_pings_at_most';

ALTER OPERATOR FAMILY @extschema@.frechet_geometry_ops USING gist ADD
	OPERATOR 30 @extschema@.&~> (geometry, frechet_key);

CREATE FUNCTION @extschema@.frechet_pings_within_reach(track geography, reach frechet_key)
RETURNS pg_catalog.bool
AS 'MODULE_PATHNAME', 'frechet_pings_within_reach_geography'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 100;

COMMENT ON FUNCTION @extschema@.frechet_pings_within_reach(geography, frechet_key) IS
'true when the track''s first and last vertices and bounding box allow every vertex to lie within the reach''s epsilon of the route, in order (necessary for frechet_pings_at_most)';

CREATE OPERATOR @extschema@.&~> (
	LEFTARG = geography,
	RIGHTARG = frechet_key,
	FUNCTION = @extschema@.frechet_pings_within_reach
);

COMMENT ON OPERATOR @extschema@.&~> (geography, frechet_key) IS
'track &~> frechet_reach(route, epsilon): the index condition of frechet_pings_at_most';

ALTER OPERATOR FAMILY @extschema@.frechet_geography_ops USING gist ADD
	OPERATOR 30 @extschema@.&~> (geography, frechet_key);
