-- frechet_ext_postgis install script: Fréchet distances on PostGIS geometry
-- and geography.  The C functions live in the frechet_ext library, which
-- neither includes PostGIS headers nor links PostGIS: it asks PostGIS for
-- ST_AsEWKB of each argument and decodes the EWKB itself.
\echo Use "CREATE EXTENSION frechet_ext_postgis" to load this file. \quit

-- PostgreSQL 15 has no @extschema:postgis@ (nor @extschema:frechet_ext@);
-- while this script runs, the schemas of the required extensions are on
-- search_path after ours.  Make sure the type names below resolve to
-- PostGIS's own types; frechet_key and frechet_summary are frechet_ext's.
-- lint_sql: allow geometry geography frechet_key frechet_summary
DO $$
DECLARE
	pg_nsp oid := (SELECT extnamespace FROM pg_catalog.pg_extension WHERE extname = 'postgis');
BEGIN
	IF (SELECT typnamespace FROM pg_catalog.pg_type WHERE oid = 'geometry'::pg_catalog.regtype) <> pg_nsp
	   OR (SELECT typnamespace FROM pg_catalog.pg_type WHERE oid = 'geography'::pg_catalog.regtype) <> pg_nsp THEN
		RAISE EXCEPTION 'geometry or geography does not resolve to the types of postgis'
			USING DETAIL = 'Another type of that name is in the target schema.',
			      HINT = 'Install frechet_ext_postgis in the schema of postgis or in a schema without such types.';
	END IF;
END $$;

-- EWKB entry points: usable without PostGIS values, e.g. on EWKB from elsewhere.
CREATE FUNCTION @extschema@.frechet_distance_ewkb(a pg_catalog.bytea, b pg_catalog.bytea, geodetic pg_catalog.bool DEFAULT false)
RETURNS pg_catalog.float8
AS 'MODULE_PATHNAME', 'frechet_distance_ewkb'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 50000;

COMMENT ON FUNCTION @extschema@.frechet_distance_ewkb(pg_catalog.bytea, pg_catalog.bytea, pg_catalog.bool) IS
'continuous Fréchet distance between two EWKB/WKB LineStrings or Points; geodetic: lon/lat degrees, result in metres on WGS84';

CREATE FUNCTION @extschema@.frechet_at_most_ewkb(a pg_catalog.bytea, b pg_catalog.bytea, epsilon pg_catalog.float8, geodetic pg_catalog.bool DEFAULT false)
RETURNS pg_catalog.bool
AS 'MODULE_PATHNAME', 'frechet_at_most_ewkb'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 5000;

COMMENT ON FUNCTION @extschema@.frechet_at_most_ewkb(pg_catalog.bytea, pg_catalog.bytea, pg_catalog.float8, pg_catalog.bool) IS
'true when the continuous Fréchet distance between two EWKB/WKB curves is at most epsilon (metres on WGS84 when geodetic)';

CREATE FUNCTION @extschema@.discrete_frechet_distance_ewkb(a pg_catalog.bytea, b pg_catalog.bytea, geodetic pg_catalog.bool DEFAULT false)
RETURNS pg_catalog.float8
AS 'MODULE_PATHNAME', 'discrete_frechet_distance_ewkb'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 10000;

COMMENT ON FUNCTION @extschema@.discrete_frechet_distance_ewkb(pg_catalog.bytea, pg_catalog.bytea, pg_catalog.bool) IS
'discrete Fréchet distance between two EWKB/WKB curves; geodetic: lon/lat degrees, result in metres on WGS84';

-- Used by the index condition that the planner support function builds.
CREATE FUNCTION @extschema@.frechet_index_expansion(epsilon pg_catalog.float8, geodetic pg_catalog.bool)
RETURNS pg_catalog.float8
AS 'MODULE_PATHNAME', 'frechet_index_expansion'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

COMMENT ON FUNCTION @extschema@.frechet_index_expansion(pg_catalog.float8, pg_catalog.bool) IS
'how far a bounding box is expanded for the index filter of frechet_at_most (internal; validates epsilon)';

CREATE FUNCTION @extschema@.frechet_geo_at_most_support(internal)
RETURNS internal
AS 'MODULE_PATHNAME', 'frechet_geo_at_most_support'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

COMMENT ON FUNCTION @extschema@.frechet_geo_at_most_support(internal) IS
'planner support for frechet_at_most on geometry and geography: a lossy bounding-box index condition expanded by epsilon';

-- geometry: planar, in the units of the SRID; 3-D when both curves have Z.
CREATE FUNCTION @extschema@.frechet_distance(a geometry, b geometry)
RETURNS pg_catalog.float8
AS 'MODULE_PATHNAME', 'frechet_distance_geometry'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 50000;

COMMENT ON FUNCTION @extschema@.frechet_distance(geometry, geometry) IS
'continuous Fréchet distance between two LineStrings (or Points), in the units of their SRID; 3-D when both have Z';

CREATE FUNCTION @extschema@.frechet_at_most(a geometry, b geometry, epsilon pg_catalog.float8)
RETURNS pg_catalog.bool
AS 'MODULE_PATHNAME', 'frechet_at_most_geometry'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 5000
SUPPORT @extschema@.frechet_geo_at_most_support;

COMMENT ON FUNCTION @extschema@.frechet_at_most(geometry, geometry, pg_catalog.float8) IS
'true when the continuous Fréchet distance is at most epsilon (units of the SRID); uses a PostGIS index on either argument';

CREATE FUNCTION @extschema@.discrete_frechet_distance(a geometry, b geometry)
RETURNS pg_catalog.float8
AS 'MODULE_PATHNAME', 'discrete_frechet_distance_geometry'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 10000;

COMMENT ON FUNCTION @extschema@.discrete_frechet_distance(geometry, geometry) IS
'discrete Fréchet distance (vertex couplings only) between two LineStrings, in the units of their SRID';

-- geography: metres on the WGS84 ellipsoid (Earth-centred chord metric).
CREATE FUNCTION @extschema@.frechet_distance(a geography, b geography)
RETURNS pg_catalog.float8
AS 'MODULE_PATHNAME', 'frechet_distance_geography'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 50000;

COMMENT ON FUNCTION @extschema@.frechet_distance(geography, geography) IS
'continuous Fréchet distance between two lon/lat LineStrings, in metres on WGS84';

CREATE FUNCTION @extschema@.frechet_at_most(a geography, b geography, epsilon pg_catalog.float8)
RETURNS pg_catalog.bool
AS 'MODULE_PATHNAME', 'frechet_at_most_geography'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 5000
SUPPORT @extschema@.frechet_geo_at_most_support;

COMMENT ON FUNCTION @extschema@.frechet_at_most(geography, geography, pg_catalog.float8) IS
'true when the continuous Fréchet distance is at most epsilon metres on WGS84; uses a PostGIS geography index on either argument';

CREATE FUNCTION @extschema@.discrete_frechet_distance(a geography, b geography)
RETURNS pg_catalog.float8
AS 'MODULE_PATHNAME', 'discrete_frechet_distance_geography'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 10000;

COMMENT ON FUNCTION @extschema@.discrete_frechet_distance(geography, geography) IS
'discrete Fréchet distance between two lon/lat LineStrings, in metres on WGS84';

-- PostGIS already owns <-> on geometry and geography (box and centroid
-- distance for nearest-neighbour searches), so the Fréchet distance
-- operator of these types is spelled <~~> (no common extension uses it;
-- 0.1's <~> is a vector-search extension's Hamming distance).
CREATE OPERATOR @extschema@.<~~> (
	LEFTARG = geometry,
	RIGHTARG = geometry,
	FUNCTION = @extschema@.frechet_distance,
	COMMUTATOR = OPERATOR(@extschema@.<~~>)
);

COMMENT ON OPERATOR @extschema@.<~~> (geometry, geometry) IS
'continuous Fréchet distance, the same as frechet_distance(geometry, geometry)';

CREATE OPERATOR @extschema@.<~~> (
	LEFTARG = geography,
	RIGHTARG = geography,
	FUNCTION = @extschema@.frechet_distance,
	COMMUTATOR = OPERATOR(@extschema@.<~~>)
);

COMMENT ON OPERATOR @extschema@.<~~> (geography, geography) IS
'continuous Fréchet distance in metres, the same as frechet_distance(geography, geography)';

-- Witnesses on geometry (units of the SRID); results for maps keep the inputs' SRID.
CREATE FUNCTION @extschema@.frechet_matching(a geometry, b geometry, epsilon pg_catalog.float8 DEFAULT NULL)
RETURNS TABLE (step pg_catalog.int4, a_pos pg_catalog.float8, b_pos pg_catalog.float8,
	a_point geometry, b_point geometry, leash pg_catalog.float8)
AS 'MODULE_PATHNAME', 'frechet_matching_geometry'
LANGUAGE C IMMUTABLE CALLED ON NULL INPUT PARALLEL SAFE COST 100000 ROWS 200;

COMMENT ON FUNCTION @extschema@.frechet_matching(geometry, geometry, pg_catalog.float8) IS
'breakpoints of a monotone matching (positions k + t, 1-based) with their points; leash in units of the SRID; optimal when epsilon is NULL, else any within epsilon, or no rows';

CREATE FUNCTION @extschema@.frechet_matching_leashes(a geometry, b geometry, epsilon pg_catalog.float8 DEFAULT NULL)
RETURNS geometry
AS 'MODULE_PATHNAME', 'frechet_matching_leashes_geometry'
LANGUAGE C IMMUTABLE CALLED ON NULL INPUT PARALLEL SAFE COST 100000;

COMMENT ON FUNCTION @extschema@.frechet_matching_leashes(geometry, geometry, pg_catalog.float8) IS
'the matching of frechet_matching as a MultiLineString of leash segments (one per breakpoint), for a map; NULL when no matching within epsilon exists';

CREATE FUNCTION @extschema@.frechet_bottleneck(a geometry, b geometry)
RETURNS TABLE (a_pos pg_catalog.float8, b_pos pg_catalog.float8,
	a_point geometry, b_point geometry, leash pg_catalog.float8)
AS 'MODULE_PATHNAME', 'frechet_bottleneck_geometry'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 100000 ROWS 1;

COMMENT ON FUNCTION @extschema@.frechet_bottleneck(geometry, geometry) IS
'where the longest leash of an optimal matching is: positions, points and the leash (units of the SRID), which equals the Fréchet distance';

CREATE FUNCTION @extschema@.frechet_partial_distance(trip geometry, route geometry)
RETURNS pg_catalog.float8
AS 'MODULE_PATHNAME', 'frechet_partial_distance_geometry'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 50000;

COMMENT ON FUNCTION @extschema@.frechet_partial_distance(geometry, geometry) IS
'smallest Fréchet distance between the trip and any part of the route, in units of the SRID';

CREATE FUNCTION @extschema@.frechet_partial_match(trip geometry, route geometry, epsilon pg_catalog.float8)
RETURNS TABLE (route_from pg_catalog.float8, route_to pg_catalog.float8, distance pg_catalog.float8,
	route_part geometry)
AS 'MODULE_PATHNAME', 'frechet_partial_match_geometry'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 20000 ROWS 1;

COMMENT ON FUNCTION @extschema@.frechet_partial_match(geometry, geometry, pg_catalog.float8) IS
'the part of the route the trip follows within epsilon (units of the SRID): positions, distance and the route sub-line; no row if none';

CREATE FUNCTION @extschema@.frechet_excursions(trip geometry, route geometry, epsilon pg_catalog.float8)
RETURNS TABLE (trip_from pg_catalog.float8, trip_to pg_catalog.float8,
	route_from pg_catalog.float8, route_to pg_catalog.float8,
	max_leash pg_catalog.float8, trip_length pg_catalog.float8, trip_piece geometry,
	route_length pg_catalog.float8, time_from pg_catalog.float8, time_to pg_catalog.float8)
AS 'MODULE_PATHNAME', 'frechet_excursions_geometry'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 100000 ROWS 2;

COMMENT ON FUNCTION @extschema@.frechet_excursions(geometry, geometry, pg_catalog.float8) IS
'stretches of the trip that no order-preserving matching keeps within epsilon (units of the SRID) of the route, with the trip piece as a LineString (Z and M kept), the length of route between where it left and rejoined, and the times (M) where the stretch begins and ends (NULL without M); no rows exactly when frechet_at_most is true';

-- Witnesses on geography (metres on WGS84); results for maps keep the inputs' SRID.
CREATE FUNCTION @extschema@.frechet_matching(a geography, b geography, epsilon pg_catalog.float8 DEFAULT NULL)
RETURNS TABLE (step pg_catalog.int4, a_pos pg_catalog.float8, b_pos pg_catalog.float8,
	a_point geography, b_point geography, leash pg_catalog.float8)
AS 'MODULE_PATHNAME', 'frechet_matching_geography'
LANGUAGE C IMMUTABLE CALLED ON NULL INPUT PARALLEL SAFE COST 100000 ROWS 200;

COMMENT ON FUNCTION @extschema@.frechet_matching(geography, geography, pg_catalog.float8) IS
'breakpoints of a monotone matching (positions k + t, 1-based) with their points; leash in metres on WGS84; optimal when epsilon is NULL, else any within epsilon, or no rows';

CREATE FUNCTION @extschema@.frechet_matching_leashes(a geography, b geography, epsilon pg_catalog.float8 DEFAULT NULL)
RETURNS geography
AS 'MODULE_PATHNAME', 'frechet_matching_leashes_geography'
LANGUAGE C IMMUTABLE CALLED ON NULL INPUT PARALLEL SAFE COST 100000;

COMMENT ON FUNCTION @extschema@.frechet_matching_leashes(geography, geography, pg_catalog.float8) IS
'the matching of frechet_matching as a MultiLineString of leash segments (one per breakpoint), for a map; NULL when no matching within epsilon exists';

CREATE FUNCTION @extschema@.frechet_bottleneck(a geography, b geography)
RETURNS TABLE (a_pos pg_catalog.float8, b_pos pg_catalog.float8,
	a_point geography, b_point geography, leash pg_catalog.float8)
AS 'MODULE_PATHNAME', 'frechet_bottleneck_geography'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 100000 ROWS 1;

COMMENT ON FUNCTION @extschema@.frechet_bottleneck(geography, geography) IS
'where the longest leash of an optimal matching is: positions, points and the leash (metres on WGS84), which equals the Fréchet distance';

CREATE FUNCTION @extschema@.frechet_partial_distance(trip geography, route geography)
RETURNS pg_catalog.float8
AS 'MODULE_PATHNAME', 'frechet_partial_distance_geography'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 50000;

COMMENT ON FUNCTION @extschema@.frechet_partial_distance(geography, geography) IS
'smallest Fréchet distance between the trip and any part of the route, in metres on WGS84';

CREATE FUNCTION @extschema@.frechet_partial_match(trip geography, route geography, epsilon pg_catalog.float8)
RETURNS TABLE (route_from pg_catalog.float8, route_to pg_catalog.float8, distance pg_catalog.float8,
	route_part geography)
AS 'MODULE_PATHNAME', 'frechet_partial_match_geography'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 20000 ROWS 1;

COMMENT ON FUNCTION @extschema@.frechet_partial_match(geography, geography, pg_catalog.float8) IS
'the part of the route the trip follows within epsilon (metres on WGS84): positions, distance and the route sub-line; no row if none';

CREATE FUNCTION @extschema@.frechet_excursions(trip geography, route geography, epsilon pg_catalog.float8)
RETURNS TABLE (trip_from pg_catalog.float8, trip_to pg_catalog.float8,
	route_from pg_catalog.float8, route_to pg_catalog.float8,
	max_leash pg_catalog.float8, trip_length pg_catalog.float8, trip_piece geography,
	route_length pg_catalog.float8, time_from pg_catalog.float8, time_to pg_catalog.float8)
AS 'MODULE_PATHNAME', 'frechet_excursions_geography'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 100000 ROWS 2;

COMMENT ON FUNCTION @extschema@.frechet_excursions(geography, geography, pg_catalog.float8) IS
'stretches of the trip that no order-preserving matching keeps within epsilon (metres on WGS84) of the route, with the trip piece as a LineString (Z and M kept), the length of route between where it left and rejoined (metres), and the times (M) where the stretch begins and ends (NULL without M); no rows exactly when frechet_at_most is true';

-- The piece of a track between two positions (k + t, 1-based), as a map
-- draws an excursion: Z and M kept, interpolated at the ends.
CREATE FUNCTION @extschema@.frechet_track_piece(track geometry, pos_from pg_catalog.float8,
	pos_to pg_catalog.float8)
RETURNS geometry
AS 'MODULE_PATHNAME', 'frechet_track_piece_geometry'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 10;

COMMENT ON FUNCTION @extschema@.frechet_track_piece(geometry, pg_catalog.float8, pg_catalog.float8) IS
'the part of a track between two positions (k + t, 1-based) as a LineString, or a Point when they are equal; SRID, Z and M kept, interpolated at fractional positions';

CREATE FUNCTION @extschema@.frechet_track_piece(track geography, pos_from pg_catalog.float8,
	pos_to pg_catalog.float8)
RETURNS geography
AS 'MODULE_PATHNAME', 'frechet_track_piece_geography'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 10;

COMMENT ON FUNCTION @extschema@.frechet_track_piece(geography, pg_catalog.float8, pg_catalog.float8) IS
'the part of a track between two positions (k + t, 1-based; a fraction of an edge''s Earth-centred chord) as a LineString, or a Point when they are equal; Z and M kept, interpolated at fractional positions';

-- Simplification within a Fréchet tolerance, keeping the SRID.
CREATE FUNCTION @extschema@.frechet_simplify(track geometry, tolerance pg_catalog.float8)
RETURNS geometry
AS 'MODULE_PATHNAME', 'frechet_simplify_geometry'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 5000;

COMMENT ON FUNCTION @extschema@.frechet_simplify(geometry, pg_catalog.float8) IS
'a LineString through a subset of the track''s vertices, ends kept, within Fréchet distance tolerance (units of the SRID) of the track';

CREATE FUNCTION @extschema@.frechet_simplify(track geography, tolerance pg_catalog.float8)
RETURNS geography
AS 'MODULE_PATHNAME', 'frechet_simplify_geography'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 5000;

COMMENT ON FUNCTION @extschema@.frechet_simplify(geography, pg_catalog.float8) IS
'a LineString through a subset of the track''s vertices, ends kept, within Fréchet distance tolerance (metres on WGS84) of the track';
-- Index: our own GiST operator classes on geometry and geography, for
-- k-nearest (ORDER BY track <~~> route LIMIT k) and range queries
-- (frechet_at_most, through its planner support function).  Not the
-- default classes: PostGIS's stay the default, and a column may carry
-- both indexes.  The key type, frechet_key, and the GiST support functions
-- that need no decoding are those of frechet_ext (same C library).
-- While this script runs, the schema of frechet_ext (a required extension)
-- is on search_path; make sure frechet_key resolves to its type.
DO $$
DECLARE
	fx_nsp oid := (SELECT extnamespace FROM pg_catalog.pg_extension WHERE extname = 'frechet_ext');
BEGIN
	IF (SELECT typnamespace FROM pg_catalog.pg_type WHERE oid = 'frechet_key'::pg_catalog.regtype) <> fx_nsp THEN
		RAISE EXCEPTION 'frechet_key does not resolve to the type of frechet_ext'
			USING DETAIL = 'Another type of that name is in the target schema or on search_path.',
			      HINT = 'Install frechet_ext_postgis in the schema of frechet_ext or in a schema without such a type.';
	END IF;
END $$;

CREATE FUNCTION @extschema@.frechet_track_key(track geometry)
RETURNS frechet_key
AS 'MODULE_PATHNAME', 'frechet_track_key_geometry'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 10;

COMMENT ON FUNCTION @extschema@.frechet_track_key(geometry) IS
'the summary frechet_geometry_ops keeps for a curve: first vertex, last vertex, bounding box (x and y)';

CREATE FUNCTION @extschema@.frechet_track_key(track geography)
RETURNS frechet_key
AS 'MODULE_PATHNAME', 'frechet_track_key_geography'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 10;

COMMENT ON FUNCTION @extschema@.frechet_track_key(geography) IS
'the summary frechet_geography_ops keeps for a curve, in Earth-centred metres (x and y)';

CREATE FUNCTION @extschema@.frechet_reach(route geometry, epsilon pg_catalog.float8)
RETURNS frechet_key
AS 'MODULE_PATHNAME', 'frechet_reach_geometry'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 10;

COMMENT ON FUNCTION @extschema@.frechet_reach(geometry, pg_catalog.float8) IS
'the route''s summary with epsilon (units of the SRID) as its reach: the right operand of |~~| in range queries';

CREATE FUNCTION @extschema@.frechet_reach(route geography, epsilon pg_catalog.float8)
RETURNS frechet_key
AS 'MODULE_PATHNAME', 'frechet_reach_geography'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 10;

COMMENT ON FUNCTION @extschema@.frechet_reach(geography, pg_catalog.float8) IS
'the route''s summary with epsilon (metres, kept as the largest chord within them) as its reach: the right operand of |~~|';

CREATE FUNCTION @extschema@.frechet_within_reach(track geometry, reach frechet_key)
RETURNS pg_catalog.bool
AS 'MODULE_PATHNAME', 'frechet_within_reach_geometry'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 10;

COMMENT ON FUNCTION @extschema@.frechet_within_reach(geometry, frechet_key) IS
'false only when the curve cannot be within the reach''s epsilon of its route; a necessary condition for frechet_at_most';

CREATE FUNCTION @extschema@.frechet_within_reach(reach frechet_key, track geometry)
RETURNS pg_catalog.bool
AS 'MODULE_PATHNAME', 'frechet_reach_within_geometry'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 10;

COMMENT ON FUNCTION @extschema@.frechet_within_reach(frechet_key, geometry) IS
'frechet_within_reach with its operands swapped';

CREATE FUNCTION @extschema@.frechet_within_reach(track geography, reach frechet_key)
RETURNS pg_catalog.bool
AS 'MODULE_PATHNAME', 'frechet_within_reach_geography'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 10;

COMMENT ON FUNCTION @extschema@.frechet_within_reach(geography, frechet_key) IS
'false only when the curve cannot be within the reach''s epsilon (metres) of its route; a necessary condition for frechet_at_most';

CREATE FUNCTION @extschema@.frechet_within_reach(reach frechet_key, track geography)
RETURNS pg_catalog.bool
AS 'MODULE_PATHNAME', 'frechet_reach_within_geography'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 10;

COMMENT ON FUNCTION @extschema@.frechet_within_reach(frechet_key, geography) IS
'frechet_within_reach with its operands swapped';

-- The restriction estimator of the index conditions |~~|, |~~~| and |~~>|
-- on geometry and geography (selectivity.c, as frechet_key_restrict).
CREATE FUNCTION @extschema@.frechet_geo_key_restrict(internal, pg_catalog.oid, internal, pg_catalog.int4)
RETURNS pg_catalog.float8
AS 'MODULE_PATHNAME', 'frechet_key_restrict'
LANGUAGE C STABLE STRICT PARALLEL SAFE;

COMMENT ON FUNCTION @extschema@.frechet_geo_key_restrict(internal, pg_catalog.oid, internal, pg_catalog.int4) IS
'restriction estimator of the index conditions |~~|, |~~~| and |~~>| on geometry and geography (from our index on the column)';

CREATE OPERATOR @extschema@.|~~| (
	LEFTARG = geometry,
	RIGHTARG = frechet_key,
	FUNCTION = @extschema@.frechet_within_reach,
	COMMUTATOR = OPERATOR(@extschema@.|~~|),
	RESTRICT = @extschema@.frechet_geo_key_restrict,
	JOIN = pg_catalog.contjoinsel
);

CREATE OPERATOR @extschema@.|~~| (
	LEFTARG = frechet_key,
	RIGHTARG = geometry,
	FUNCTION = @extschema@.frechet_within_reach,
	COMMUTATOR = OPERATOR(@extschema@.|~~|),
	RESTRICT = @extschema@.frechet_geo_key_restrict,
	JOIN = pg_catalog.contjoinsel
);

CREATE OPERATOR @extschema@.|~~| (
	LEFTARG = geography,
	RIGHTARG = frechet_key,
	FUNCTION = @extschema@.frechet_within_reach,
	COMMUTATOR = OPERATOR(@extschema@.|~~|),
	RESTRICT = @extschema@.frechet_geo_key_restrict,
	JOIN = pg_catalog.contjoinsel
);

CREATE OPERATOR @extschema@.|~~| (
	LEFTARG = frechet_key,
	RIGHTARG = geography,
	FUNCTION = @extschema@.frechet_within_reach,
	COMMUTATOR = OPERATOR(@extschema@.|~~|),
	RESTRICT = @extschema@.frechet_geo_key_restrict,
	JOIN = pg_catalog.contjoinsel
);

COMMENT ON OPERATOR @extschema@.|~~| (geometry, frechet_key) IS
'the curve may lie within the reach''s epsilon of its route: the lossy index condition of frechet_at_most';
COMMENT ON OPERATOR @extschema@.|~~| (frechet_key, geometry) IS
'the curve may lie within the reach''s epsilon of its route (operands swapped)';
COMMENT ON OPERATOR @extschema@.|~~| (geography, frechet_key) IS
'the curve may lie within the reach''s epsilon of its route: the lossy index condition of frechet_at_most';
COMMENT ON OPERATOR @extschema@.|~~| (frechet_key, geography) IS
'the curve may lie within the reach''s epsilon of its route (operands swapped)';

-- GiST support.  consistent, union, penalty, picksplit and same are the C
-- functions of frechet_track_ops; compress and distance decode PostGIS values.
CREATE FUNCTION @extschema@.frechet_geometry_gist_consistent(internal, geometry, pg_catalog.int2, pg_catalog.oid, internal)
RETURNS pg_catalog.bool
AS 'MODULE_PATHNAME', 'frechet_gist_consistent_packed_planar'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

CREATE FUNCTION @extschema@.frechet_geography_gist_consistent(internal, geography, pg_catalog.int2, pg_catalog.oid, internal)
RETURNS pg_catalog.bool
AS 'MODULE_PATHNAME', 'frechet_gist_consistent_packed_earth'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

CREATE FUNCTION @extschema@.frechet_geo_gist_union(internal, internal)
RETURNS frechet_summary
AS 'MODULE_PATHNAME', 'frechet_gist_union_packed'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

CREATE FUNCTION @extschema@.frechet_geometry_gist_compress(internal)
RETURNS internal
AS 'MODULE_PATHNAME', 'frechet_gist_compress_packed_geometry'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

CREATE FUNCTION @extschema@.frechet_geography_gist_compress(internal)
RETURNS internal
AS 'MODULE_PATHNAME', 'frechet_gist_compress_packed_geography'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

CREATE FUNCTION @extschema@.frechet_geo_gist_penalty(internal, internal, internal)
RETURNS internal
AS 'MODULE_PATHNAME', 'frechet_gist_penalty_packed'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

CREATE FUNCTION @extschema@.frechet_geo_gist_picksplit(internal, internal)
RETURNS internal
AS 'MODULE_PATHNAME', 'frechet_gist_picksplit_packed'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

CREATE FUNCTION @extschema@.frechet_geo_gist_same(frechet_summary, frechet_summary, internal)
RETURNS internal
AS 'MODULE_PATHNAME', 'frechet_gist_same_packed'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

CREATE FUNCTION @extschema@.frechet_geometry_gist_distance(internal, geometry, pg_catalog.int2, pg_catalog.oid, internal)
RETURNS pg_catalog.float8
AS 'MODULE_PATHNAME', 'frechet_gist_distance_packed_geometry'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

CREATE FUNCTION @extschema@.frechet_geography_gist_distance(internal, geography, pg_catalog.int2, pg_catalog.oid, internal)
RETURNS pg_catalog.float8
AS 'MODULE_PATHNAME', 'frechet_gist_distance_packed_geography'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

COMMENT ON FUNCTION @extschema@.frechet_geometry_gist_consistent(internal, geometry, pg_catalog.int2, pg_catalog.oid, internal) IS
'GiST support: may an entry hold a curve within the query''s reach';
COMMENT ON FUNCTION @extschema@.frechet_geography_gist_consistent(internal, geography, pg_catalog.int2, pg_catalog.oid, internal) IS
'GiST support: may an entry hold a curve within the query''s reach';
COMMENT ON FUNCTION @extschema@.frechet_geo_gist_union(internal, internal) IS
'GiST support: the key covering a set of entries';
COMMENT ON FUNCTION @extschema@.frechet_geometry_gist_compress(internal) IS
'GiST support: the summary of a geometry curve (through ST_AsEWKB)';
COMMENT ON FUNCTION @extschema@.frechet_geography_gist_compress(internal) IS
'GiST support: the summary of a geography curve in Earth-centred metres';
COMMENT ON FUNCTION @extschema@.frechet_geo_gist_penalty(internal, internal, internal) IS
'GiST support: growth of a node''s key when it takes an entry';
COMMENT ON FUNCTION @extschema@.frechet_geo_gist_picksplit(internal, internal) IS
'GiST support: split of a full page';
COMMENT ON FUNCTION @extschema@.frechet_geo_gist_same(frechet_summary, frechet_summary, internal) IS
'GiST support: equality of keys';
COMMENT ON FUNCTION @extschema@.frechet_geometry_gist_distance(internal, geometry, pg_catalog.int2, pg_catalog.oid, internal) IS
'GiST support: a lower bound of the Fréchet distance from the query route to the curves under an entry';
COMMENT ON FUNCTION @extschema@.frechet_geography_gist_distance(internal, geography, pg_catalog.int2, pg_catalog.oid, internal) IS
'GiST support: a lower bound in metres of the Fréchet distance from the query route to the curves under an entry';

CREATE OPERATOR CLASS @extschema@.frechet_geometry_ops
FOR TYPE geometry USING gist AS
	FUNCTION 1 @extschema@.frechet_geometry_gist_consistent(internal, geometry, pg_catalog.int2, pg_catalog.oid, internal),
	FUNCTION 2 @extschema@.frechet_geo_gist_union(internal, internal),
	FUNCTION 3 @extschema@.frechet_geometry_gist_compress(internal),
	FUNCTION 5 @extschema@.frechet_geo_gist_penalty(internal, internal, internal),
	FUNCTION 6 @extschema@.frechet_geo_gist_picksplit(internal, internal),
	FUNCTION 7 @extschema@.frechet_geo_gist_same(frechet_summary, frechet_summary, internal),
	FUNCTION 8 @extschema@.frechet_geometry_gist_distance(internal, geometry, pg_catalog.int2, pg_catalog.oid, internal),
	STORAGE frechet_summary;

CREATE OPERATOR CLASS @extschema@.frechet_geography_ops
FOR TYPE geography USING gist AS
	FUNCTION 1 @extschema@.frechet_geography_gist_consistent(internal, geography, pg_catalog.int2, pg_catalog.oid, internal),
	FUNCTION 2 @extschema@.frechet_geo_gist_union(internal, internal),
	FUNCTION 3 @extschema@.frechet_geography_gist_compress(internal),
	FUNCTION 5 @extschema@.frechet_geo_gist_penalty(internal, internal, internal),
	FUNCTION 6 @extschema@.frechet_geo_gist_picksplit(internal, internal),
	FUNCTION 7 @extschema@.frechet_geo_gist_same(frechet_summary, frechet_summary, internal),
	FUNCTION 8 @extschema@.frechet_geography_gist_distance(internal, geography, pg_catalog.int2, pg_catalog.oid, internal),
	STORAGE frechet_summary;

-- The range and ordering operators are members of the families, not of the
-- classes: 0.2 renamed them (from 0.1's &~, easy to misread beside
-- PostGIS's box operators, and <~>, a vector-search extension's Hamming
-- distance), and an upgrade can only add them to the families; a fresh
-- install does the same, so both give one schema.
ALTER OPERATOR FAMILY @extschema@.frechet_geometry_ops USING gist ADD
	OPERATOR 1 @extschema@.|~~| (geometry, frechet_key),
	OPERATOR 15 @extschema@.<~~> (geometry, geometry) FOR ORDER BY pg_catalog.float_ops;
ALTER OPERATOR FAMILY @extschema@.frechet_geography_ops USING gist ADD
	OPERATOR 1 @extschema@.|~~| (geography, frechet_key),
	OPERATOR 15 @extschema@.<~~> (geography, geography) FOR ORDER BY pg_catalog.float_ops;

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

-- The times (M) of a track's vertices for the GeoJSON functions, checked.
CREATE FUNCTION @extschema@.frechet_geojson_times(track geometry, argno pg_catalog.int4)
RETURNS pg_catalog.float8[]
AS 'MODULE_PATHNAME', 'frechet_geojson_times_geometry'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

COMMENT ON FUNCTION @extschema@.frechet_geojson_times(geometry, pg_catalog.int4) IS
'internal: the M (time) of each vertex for frechet_geojson, NULL without M; an error naming argument argno when M is not finite or decreases';

CREATE FUNCTION @extschema@.frechet_geojson_times(track geography, argno pg_catalog.int4)
RETURNS pg_catalog.float8[]
AS 'MODULE_PATHNAME', 'frechet_geojson_times_geography'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

COMMENT ON FUNCTION @extschema@.frechet_geojson_times(geography, pg_catalog.int4) IS
'internal: the M (time) of each vertex for frechet_geojson, NULL without M; an error naming argument argno when M is not finite or decreases';

-- GeoJSON needs WGS84: a geometry whose SRID is not in spatial_ref_sys
-- cannot be transformed; frechet_geometry_geojson raises 22023 through this
-- rather than let ST_Transform fail with an internal error.
CREATE FUNCTION @extschema@.frechet_geojson_check_srid(srid pg_catalog.int4, known pg_catalog.bool)
RETURNS pg_catalog.bool
AS 'MODULE_PATHNAME', 'frechet_geojson_check_srid'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

COMMENT ON FUNCTION @extschema@.frechet_geojson_check_srid(pg_catalog.int4, pg_catalog.bool) IS
'internal: true when known, else an error saying that GeoJSON cannot be written for a geometry of this SRID (not in spatial_ref_sys)';

-- Maps and dashboards: a pair's matching as GeoJSON (RFC 7946).  The bodies
-- are standard SQL bodies, parsed while this script runs and bound by OID
-- then, so the functions work under any search_path, including a
-- postgres_fdw remote session's pg_catalog.  The names in them must not be
-- left to this script's search_path: it starts with the target schema,
-- where whoever can create objects could plant an st_srid(geometry) that
-- would be bound instead of PostGIS's.  PostgreSQL 15 has no
-- @extschema:postgis@, so the statements are built here with PostGIS's
-- schema, read from pg_extension, qualifying every PostGIS function, type
-- and cast they name.  (Objects a DO block creates in an extension script
-- are members of the extension.)  sql/frechet_ext_postgis--0.1--0.2.sql
-- builds the same functions with CREATE OR REPLACE; keep the two alike.

DO $do$
DECLARE
	fx pg_catalog.text := (SELECT n.nspname FROM pg_catalog.pg_extension e
		JOIN pg_catalog.pg_namespace n ON n.oid OPERATOR(pg_catalog.=) e.extnamespace
		WHERE e.extname OPERATOR(pg_catalog.=) 'frechet_ext');
	gis pg_catalog.text := (SELECT n.nspname FROM pg_catalog.pg_extension e
		JOIN pg_catalog.pg_namespace n ON n.oid OPERATOR(pg_catalog.=) e.extnamespace
		WHERE e.extname OPERATOR(pg_catalog.=) 'postgis');
BEGIN
	EXECUTE pg_catalog.format($sql$
CREATE FUNCTION @extschema@.frechet_geometry_geojson(g %1$I.geometry)
RETURNS pg_catalog.jsonb
LANGUAGE sql IMMUTABLE STRICT PARALLEL SAFE COST 100
RETURN %1$I.st_asgeojson(CASE WHEN %1$I.st_srid(g) OPERATOR(pg_catalog.=) ANY ('{0,4326}'::pg_catalog.int4[]) THEN g
	WHEN @extschema@.frechet_geojson_check_srid(%1$I.st_srid(g),
		EXISTS (SELECT FROM %1$I.spatial_ref_sys s WHERE s.srid OPERATOR(pg_catalog.=) %1$I.st_srid(g)))
	THEN %1$I.st_transform(g, 4326) END, 9, 0)::pg_catalog.jsonb;
$sql$, gis);
	EXECUTE pg_catalog.format($sql$
CREATE FUNCTION @extschema@.frechet_geojson(a %1$I.geometry, b %1$I.geometry, epsilon pg_catalog.float8 DEFAULT NULL,
	properties pg_catalog.jsonb DEFAULT NULL, max_leashes pg_catalog.int4 DEFAULT NULL)
RETURNS pg_catalog.jsonb
LANGUAGE sql IMMUTABLE PARALLEL SAFE COST 300000
BEGIN ATOMIC
	SELECT pg_catalog.jsonb_build_object(
		'type', 'FeatureCollection',
		'frechet', pg_catalog.jsonb_build_object(
			'distance', dd.d,
			'epsilon', epsilon,
			'within_epsilon', @extschema@.frechet_at_most(a, b, epsilon),
			'excursions', pg_catalog.jsonb_array_length(ex.features),
			'srid', %1$I.st_srid(a)),
		'features', pg_catalog.jsonb_build_array(
			pg_catalog.jsonb_build_object('type', 'Feature',
				'properties', o.p OPERATOR(pg_catalog.||) pg_catalog.jsonb_build_object('role', 'a',
					'vertices', %1$I.st_npoints(a), 'distance', dd.d, 'epsilon', epsilon)
					OPERATOR(pg_catalog.||) o.times_a,
				'geometry', @extschema@.frechet_geometry_geojson(a)),
			pg_catalog.jsonb_build_object('type', 'Feature',
				'properties', o.p OPERATOR(pg_catalog.||) pg_catalog.jsonb_build_object('role', 'b',
					'vertices', %1$I.st_npoints(b), 'distance', dd.d, 'epsilon', epsilon)
					OPERATOR(pg_catalog.||) o.times_b,
				'geometry', @extschema@.frechet_geometry_geojson(b)),
			pg_catalog.jsonb_build_object('type', 'Feature',
				'properties', o.p OPERATOR(pg_catalog.||) pg_catalog.jsonb_build_object('role', 'leashes',
					'count', ls.n, 'matching_steps', COALESCE(ls.total, 0)),
				'geometry', @extschema@.frechet_geometry_geojson(ls.g)),
			pg_catalog.jsonb_build_object('type', 'Feature',
				'properties', o.p OPERATOR(pg_catalog.||) pg_catalog.jsonb_build_object('role', 'bottleneck',
					'leash', bn.leash, 'a_pos', bn.a_pos, 'b_pos', bn.b_pos),
				'geometry', @extschema@.frechet_geometry_geojson(%1$I.st_makeline(bn.a_point, bn.b_point))))
			OPERATOR(pg_catalog.||) ex.features)
	FROM (SELECT %2$I.frechet_geojson_properties(properties) AS p,
			%2$I.frechet_geojson_leash_drawn(NULL, NULL, NULL, max_leashes) AS cap_checked,
			(SELECT CASE WHEN t.m IS NULL THEN '{}'::pg_catalog.jsonb ELSE pg_catalog.jsonb_build_object('times', t.m) END
				FROM (SELECT @extschema@.frechet_geojson_times(a, 1) AS m) AS t) AS times_a,
			(SELECT CASE WHEN t.m IS NULL THEN '{}'::pg_catalog.jsonb ELSE pg_catalog.jsonb_build_object('times', t.m) END
				FROM (SELECT @extschema@.frechet_geojson_times(b, 2) AS m) AS t) AS times_b) AS o,
		(SELECT @extschema@.frechet_distance(a, b) AS d) AS dd,
		@extschema@.frechet_bottleneck(a, b) AS bn,
		LATERAL (SELECT pg_catalog.count(*) AS n, pg_catalog.max(m.total) AS total,
				%1$I.st_collect(%1$I.st_makeline(m.a_point, m.b_point) ORDER BY m.step) AS g
			FROM (SELECT mm.step, mm.a_point, mm.b_point, pg_catalog.count(*) OVER () AS total,
					pg_catalog.row_number() OVER (ORDER BY mm.leash DESC, mm.step) AS by_length
				FROM @extschema@.frechet_matching(a, b) AS mm) AS m
			WHERE %2$I.frechet_geojson_leash_drawn(m.step, m.total,
				m.by_length OPERATOR(pg_catalog.=) 1, max_leashes)) AS ls,
		LATERAL (SELECT COALESCE(pg_catalog.jsonb_agg(pg_catalog.jsonb_build_object('type', 'Feature',
					'properties', o.p OPERATOR(pg_catalog.||) pg_catalog.jsonb_strip_nulls(pg_catalog.jsonb_build_object(
						'role', 'excursion', 'number', x.n, 'trip_from', x.trip_from, 'trip_to', x.trip_to,
						'route_from', x.route_from, 'route_to', x.route_to,
						'max_leash', x.max_leash, 'trip_length', x.trip_length, 'route_length', x.route_length,
						'time_from', x.time_from, 'time_to', x.time_to)),
					'geometry', @extschema@.frechet_geometry_geojson(x.trip_piece)) ORDER BY x.n),
				'[]'::pg_catalog.jsonb) AS features
			FROM @extschema@.frechet_excursions(a, b, epsilon) WITH ORDINALITY AS x(trip_from, trip_to,
				route_from, route_to, max_leash, trip_length, trip_piece, route_length, time_from, time_to, n)) AS ex;
END;
$sql$, gis, fx);
	EXECUTE pg_catalog.format($sql$
CREATE FUNCTION @extschema@.frechet_geojson(a %1$I.geography, b %1$I.geography, epsilon pg_catalog.float8 DEFAULT NULL,
	properties pg_catalog.jsonb DEFAULT NULL, max_leashes pg_catalog.int4 DEFAULT NULL)
RETURNS pg_catalog.jsonb
LANGUAGE sql IMMUTABLE PARALLEL SAFE COST 300000
BEGIN ATOMIC
	SELECT pg_catalog.jsonb_build_object(
		'type', 'FeatureCollection',
		'frechet', pg_catalog.jsonb_build_object(
			'distance', dd.d,
			'epsilon', epsilon,
			'within_epsilon', @extschema@.frechet_at_most(a, b, epsilon),
			'excursions', pg_catalog.jsonb_array_length(ex.features),
			'units', 'metres'),
		'features', pg_catalog.jsonb_build_array(
			pg_catalog.jsonb_build_object('type', 'Feature',
				'properties', o.p OPERATOR(pg_catalog.||) pg_catalog.jsonb_build_object('role', 'a',
					'vertices', %1$I.st_npoints(a::%1$I.geometry), 'distance', dd.d, 'epsilon', epsilon)
					OPERATOR(pg_catalog.||) o.times_a,
				'geometry', %1$I.st_asgeojson(a, 9, 0)::pg_catalog.jsonb),
			pg_catalog.jsonb_build_object('type', 'Feature',
				'properties', o.p OPERATOR(pg_catalog.||) pg_catalog.jsonb_build_object('role', 'b',
					'vertices', %1$I.st_npoints(b::%1$I.geometry), 'distance', dd.d, 'epsilon', epsilon)
					OPERATOR(pg_catalog.||) o.times_b,
				'geometry', %1$I.st_asgeojson(b, 9, 0)::pg_catalog.jsonb),
			pg_catalog.jsonb_build_object('type', 'Feature',
				'properties', o.p OPERATOR(pg_catalog.||) pg_catalog.jsonb_build_object('role', 'leashes',
					'count', ls.n, 'matching_steps', COALESCE(ls.total, 0)),
				'geometry', %1$I.st_asgeojson(ls.g, 9, 0)::pg_catalog.jsonb),
			pg_catalog.jsonb_build_object('type', 'Feature',
				'properties', o.p OPERATOR(pg_catalog.||) pg_catalog.jsonb_build_object('role', 'bottleneck',
					'leash', bn.leash, 'a_pos', bn.a_pos, 'b_pos', bn.b_pos),
				'geometry', %1$I.st_asgeojson(%1$I.st_makeline(bn.a_point::%1$I.geometry, bn.b_point::%1$I.geometry), 9, 0)::pg_catalog.jsonb))
			OPERATOR(pg_catalog.||) ex.features)
	FROM (SELECT %2$I.frechet_geojson_properties(properties) AS p,
			%2$I.frechet_geojson_leash_drawn(NULL, NULL, NULL, max_leashes) AS cap_checked,
			(SELECT CASE WHEN t.m IS NULL THEN '{}'::pg_catalog.jsonb ELSE pg_catalog.jsonb_build_object('times', t.m) END
				FROM (SELECT @extschema@.frechet_geojson_times(a, 1) AS m) AS t) AS times_a,
			(SELECT CASE WHEN t.m IS NULL THEN '{}'::pg_catalog.jsonb ELSE pg_catalog.jsonb_build_object('times', t.m) END
				FROM (SELECT @extschema@.frechet_geojson_times(b, 2) AS m) AS t) AS times_b) AS o,
		(SELECT @extschema@.frechet_distance(a, b) AS d) AS dd,
		@extschema@.frechet_bottleneck(a, b) AS bn,
		LATERAL (SELECT pg_catalog.count(*) AS n, pg_catalog.max(m.total) AS total,
				%1$I.st_collect(%1$I.st_makeline(m.a_point::%1$I.geometry, m.b_point::%1$I.geometry) ORDER BY m.step) AS g
			FROM (SELECT mm.step, mm.a_point, mm.b_point, pg_catalog.count(*) OVER () AS total,
					pg_catalog.row_number() OVER (ORDER BY mm.leash DESC, mm.step) AS by_length
				FROM @extschema@.frechet_matching(a, b) AS mm) AS m
			WHERE %2$I.frechet_geojson_leash_drawn(m.step, m.total,
				m.by_length OPERATOR(pg_catalog.=) 1, max_leashes)) AS ls,
		LATERAL (SELECT COALESCE(pg_catalog.jsonb_agg(pg_catalog.jsonb_build_object('type', 'Feature',
					'properties', o.p OPERATOR(pg_catalog.||) pg_catalog.jsonb_strip_nulls(pg_catalog.jsonb_build_object(
						'role', 'excursion', 'number', x.n, 'trip_from', x.trip_from, 'trip_to', x.trip_to,
						'route_from', x.route_from, 'route_to', x.route_to,
						'max_leash', x.max_leash, 'trip_length', x.trip_length, 'route_length', x.route_length,
						'time_from', x.time_from, 'time_to', x.time_to)),
					'geometry', %1$I.st_asgeojson(x.trip_piece, 9, 0)::pg_catalog.jsonb) ORDER BY x.n),
				'[]'::pg_catalog.jsonb) AS features
			FROM @extschema@.frechet_excursions(a, b, epsilon) WITH ORDINALITY AS x(trip_from, trip_to,
				route_from, route_to, max_leash, trip_length, trip_piece, route_length, time_from, time_to, n)) AS ex;
END;
$sql$, gis, fx);
END $do$;

COMMENT ON FUNCTION @extschema@.frechet_geometry_geojson(geometry) IS
'a geometry as an RFC 7946 GeoJSON geometry: transformed to WGS84 lon/lat when its SRID is neither 0 nor 4326, no crs member';

COMMENT ON FUNCTION @extschema@.frechet_geojson(geometry, geometry, pg_catalog.float8, pg_catalog.jsonb, pg_catalog.int4) IS
'a GeoJSON FeatureCollection of a pair for a map: both curves (roles a, b; with M their times, one a vertex), the leashes of an optimal matching (at most max_leashes, the longest always among them), the bottleneck and, with epsilon, the excursions of a from b (with their times); the caller''s properties (a JSON object) in every feature''s properties; distances in units of the SRID, coordinates in WGS84 lon/lat (transformed when the SRID is another known system; as stored when it is 0)';

COMMENT ON FUNCTION @extschema@.frechet_geojson(geography, geography, pg_catalog.float8, pg_catalog.jsonb, pg_catalog.int4) IS
'a GeoJSON FeatureCollection of a pair for a map: both curves (roles a, b; with M their times, one a vertex), the leashes of an optimal matching (at most max_leashes, the longest always among them), the bottleneck and, with epsilon, the excursions of a from b (with their times); the caller''s properties (a JSON object) in every feature''s properties; distances in metres on WGS84, coordinates lon/lat';

CREATE FUNCTION @extschema@.frechet_geo_pings_support(internal)
RETURNS internal
AS 'MODULE_PATHNAME', 'frechet_pings_support'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

COMMENT ON FUNCTION @extschema@.frechet_geo_pings_support(internal) IS
'planner support of frechet_pings_at_most on geometry and geography: the index condition trip |~~~| frechet_reach(route, epsilon)';

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

CREATE OPERATOR @extschema@.|~~~| (
	LEFTARG = geometry,
	RIGHTARG = frechet_key,
	FUNCTION = @extschema@.frechet_pings_within_reach,
	RESTRICT = @extschema@.frechet_geo_key_restrict,
	JOIN = pg_catalog.contjoinsel
);

COMMENT ON OPERATOR @extschema@.|~~~| (geometry, frechet_key) IS
'track |~~~| frechet_reach(route, epsilon): the index condition of frechet_pings_at_most';

ALTER OPERATOR FAMILY @extschema@.frechet_geometry_ops USING gist ADD
	OPERATOR 30 @extschema@.|~~~| (geometry, frechet_key);

CREATE FUNCTION @extschema@.frechet_pings_within_reach(track geography, reach frechet_key)
RETURNS pg_catalog.bool
AS 'MODULE_PATHNAME', 'frechet_pings_within_reach_geography'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 100;

COMMENT ON FUNCTION @extschema@.frechet_pings_within_reach(geography, frechet_key) IS
'true when the track''s first and last vertices and bounding box allow every vertex to lie within the reach''s epsilon of the route, in order (necessary for frechet_pings_at_most)';

CREATE OPERATOR @extschema@.|~~~| (
	LEFTARG = geography,
	RIGHTARG = frechet_key,
	FUNCTION = @extschema@.frechet_pings_within_reach,
	RESTRICT = @extschema@.frechet_geo_key_restrict,
	JOIN = pg_catalog.contjoinsel
);

COMMENT ON OPERATOR @extschema@.|~~~| (geography, frechet_key) IS
'track |~~~| frechet_reach(route, epsilon): the index condition of frechet_pings_at_most';

ALTER OPERATOR FAMILY @extschema@.frechet_geography_ops USING gist ADD
	OPERATOR 30 @extschema@.|~~~| (geography, frechet_key);

CREATE FUNCTION @extschema@.frechet_pings_excursions(trip geometry, route geometry, epsilon pg_catalog.float8,
	OUT ping_from pg_catalog.int4, OUT ping_to pg_catalog.int4, OUT route_from pg_catalog.float8, OUT route_to pg_catalog.float8,
	OUT max_leash pg_catalog.float8, OUT trip_length pg_catalog.float8, OUT route_length pg_catalog.float8,
	OUT time_from pg_catalog.float8, OUT time_to pg_catalog.float8)
RETURNS SETOF pg_catalog.record
AS 'MODULE_PATHNAME', 'frechet_pings_excursions_geometry'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 2000 ROWS 2;

COMMENT ON FUNCTION @extschema@.frechet_pings_excursions(geometry, geometry, pg_catalog.float8) IS
'where sparse pings left the route (units of the SRID): the runs of off-route pings of an in-order plan with the fewest, the route length around each run and the times (M) of its first and last pings; no rows exactly when frechet_pings_at_most is true';

CREATE FUNCTION @extschema@.frechet_pings_excursions(trip geography, route geography, epsilon pg_catalog.float8,
	OUT ping_from pg_catalog.int4, OUT ping_to pg_catalog.int4, OUT route_from pg_catalog.float8, OUT route_to pg_catalog.float8,
	OUT max_leash pg_catalog.float8, OUT trip_length pg_catalog.float8, OUT route_length pg_catalog.float8,
	OUT time_from pg_catalog.float8, OUT time_to pg_catalog.float8)
RETURNS SETOF pg_catalog.record
AS 'MODULE_PATHNAME', 'frechet_pings_excursions_geography'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 2000 ROWS 2;

COMMENT ON FUNCTION @extschema@.frechet_pings_excursions(geography, geography, pg_catalog.float8) IS
'where sparse pings left the route (metres): the runs of off-route pings of an in-order plan with the fewest, the route length around each run and the times (M) of its first and last pings; no rows exactly when frechet_pings_at_most is true';

CREATE FUNCTION @extschema@.frechet_track_check(track geometry)
RETURNS pg_catalog.text
AS 'MODULE_PATHNAME', 'frechet_track_check_geometry'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 50;

COMMENT ON FUNCTION @extschema@.frechet_track_check(geometry) IS
'NULL when every function accepts the track (a Point or LineString, not empty, finite coordinates); otherwise what is wrong and where, in the words of the error the functions would raise; never raises an error';

CREATE FUNCTION @extschema@.frechet_track_check(track geometry, srid pg_catalog.int4)
RETURNS pg_catalog.text
AS 'MODULE_PATHNAME', 'frechet_track_check_geometry'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 50;

COMMENT ON FUNCTION @extschema@.frechet_track_check(geometry, pg_catalog.int4) IS
'as frechet_track_check(track), and the track''s SRID must be srid (a batch compared with routes of one SRID)';

CREATE FUNCTION @extschema@.frechet_track_check(track geography)
RETURNS pg_catalog.text
AS 'MODULE_PATHNAME', 'frechet_track_check_geography'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 50;

COMMENT ON FUNCTION @extschema@.frechet_track_check(geography) IS
'NULL when every function accepts the track (a Point or LineString, not empty, longitude and latitude in range); otherwise what is wrong and where, in the words of the error the functions would raise; never raises an error';

CREATE FUNCTION @extschema@.frechet_track_check(track geography, srid pg_catalog.int4)
RETURNS pg_catalog.text
AS 'MODULE_PATHNAME', 'frechet_track_check_geography'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 50;

COMMENT ON FUNCTION @extschema@.frechet_track_check(geography, pg_catalog.int4) IS
'as frechet_track_check(track), and the track''s SRID must be srid';

CREATE FUNCTION @extschema@.frechet_progress(trip geometry, route geometry, epsilon pg_catalog.float8,
	OUT route_pos pg_catalog.float8, OUT route_fraction pg_catalog.float8, OUT route_point geometry)
RETURNS SETOF pg_catalog.record
AS 'MODULE_PATHNAME', 'frechet_progress_geometry'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 5000 ROWS 1;

COMMENT ON FUNCTION @extschema@.frechet_progress(geometry, geometry, pg_catalog.float8) IS
'a trip in progress (units of the SRID): one row when all of the trip so far is within epsilon of a prefix of the route, with where on the route it is now; no row otherwise';

CREATE FUNCTION @extschema@.frechet_progress(trip geography, route geography, epsilon pg_catalog.float8,
	OUT route_pos pg_catalog.float8, OUT route_fraction pg_catalog.float8, OUT route_point geography)
RETURNS SETOF pg_catalog.record
AS 'MODULE_PATHNAME', 'frechet_progress_geography'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 5000 ROWS 1;

COMMENT ON FUNCTION @extschema@.frechet_progress(geography, geography, pg_catalog.float8) IS
'a trip in progress (metres): one row when all of the trip so far is within epsilon of a prefix of the route, with where on the route it is now; no row otherwise';

-- Corridor search on geometry (units of the SRID) and geography (metres):
-- frechet_passes, frechet_passage_distance (<~~>>), frechet_passage, and
-- their index strategies 31 and 32 in our operator classes.
CREATE FUNCTION @extschema@.frechet_geo_passes_support(internal)
RETURNS internal
AS 'MODULE_PATHNAME', 'frechet_passes_support'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

COMMENT ON FUNCTION @extschema@.frechet_geo_passes_support(internal) IS
'planner support of frechet_passes on geometry and geography: the index condition trip |~~>| frechet_reach(stretch, epsilon)';

CREATE FUNCTION @extschema@.frechet_passes(trip geometry, stretch geometry, epsilon pg_catalog.float8)
RETURNS pg_catalog.bool
AS 'MODULE_PATHNAME', 'frechet_passes_geometry'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 5000
SUPPORT @extschema@.frechet_geo_passes_support;

COMMENT ON FUNCTION @extschema@.frechet_passes(geometry, geometry, pg_catalog.float8) IS
'true when some part of the trip lies within Fréchet distance epsilon (units of the SRID) of the whole stretch, driven in the stretch''s direction (partial matching with the stretch matched whole)';

CREATE FUNCTION @extschema@.frechet_passage_distance(trip geometry, stretch geometry)
RETURNS pg_catalog.float8
AS 'MODULE_PATHNAME', 'frechet_passage_distance_geometry'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 10000;

COMMENT ON FUNCTION @extschema@.frechet_passage_distance(geometry, geometry) IS
'smallest epsilon (units of the SRID) for which frechet_passes is true: the Fréchet distance between the stretch and the part of the trip nearest to it in that sense';

CREATE OPERATOR @extschema@.<~~>> (
	LEFTARG = geometry,
	RIGHTARG = geometry,
	FUNCTION = @extschema@.frechet_passage_distance
);

COMMENT ON OPERATOR @extschema@.<~~>> (geometry, geometry) IS
'trip <~~>> stretch: frechet_passage_distance; in ORDER BY, the index finds the trips that drove nearest to the stretch';

CREATE FUNCTION @extschema@.frechet_passage(trip geometry, stretch geometry, epsilon pg_catalog.float8,
	OUT trip_from pg_catalog.float8, OUT trip_to pg_catalog.float8, OUT distance pg_catalog.float8,
	OUT trip_part geometry, OUT time_from pg_catalog.float8, OUT time_to pg_catalog.float8)
RETURNS SETOF pg_catalog.record
AS 'MODULE_PATHNAME', 'frechet_passage_geometry'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 20000 ROWS 1;

COMMENT ON FUNCTION @extschema@.frechet_passage(geometry, geometry, pg_catalog.float8) IS
'one row a passage of the trip through the stretch within epsilon (units of the SRID), in trip order: the trip positions (k + t, 1-based), the Fréchet distance between the stretch and that part, the part and the trip''s times (M) there (NULL without M); two passages are separate when the trip leaves the epsilon-disc around the stretch''s last vertex between them';

CREATE FUNCTION @extschema@.frechet_passes_within_reach(track geometry, reach frechet_key)
RETURNS pg_catalog.bool
AS 'MODULE_PATHNAME', 'frechet_passes_within_reach_geometry'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 100;

COMMENT ON FUNCTION @extschema@.frechet_passes_within_reach(geometry, frechet_key) IS
'false only when no part of the track can lie within the reach''s epsilon of its stretch (the stretch''s ends too far from the track''s box, or a side of the stretch''s box beyond the track''s by more): a necessary condition for frechet_passes';

CREATE OPERATOR @extschema@.|~~>| (
	LEFTARG = geometry,
	RIGHTARG = frechet_key,
	FUNCTION = @extschema@.frechet_passes_within_reach,
	RESTRICT = @extschema@.frechet_geo_key_restrict,
	JOIN = pg_catalog.contjoinsel
);

COMMENT ON OPERATOR @extschema@.|~~>| (geometry, frechet_key) IS
'trip |~~>| frechet_reach(stretch, epsilon): the index condition of frechet_passes';

ALTER OPERATOR FAMILY @extschema@.frechet_geometry_ops USING gist ADD
	OPERATOR 31 @extschema@.|~~>| (geometry, frechet_key),
	OPERATOR 32 @extschema@.<~~>> (geometry, geometry) FOR ORDER BY pg_catalog.float_ops;

CREATE FUNCTION @extschema@.frechet_passes(trip geography, stretch geography, epsilon pg_catalog.float8)
RETURNS pg_catalog.bool
AS 'MODULE_PATHNAME', 'frechet_passes_geography'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 5000
SUPPORT @extschema@.frechet_geo_passes_support;

COMMENT ON FUNCTION @extschema@.frechet_passes(geography, geography, pg_catalog.float8) IS
'true when some part of the trip lies within Fréchet distance epsilon (metres on WGS84) of the whole stretch, driven in the stretch''s direction (partial matching with the stretch matched whole)';

CREATE FUNCTION @extschema@.frechet_passage_distance(trip geography, stretch geography)
RETURNS pg_catalog.float8
AS 'MODULE_PATHNAME', 'frechet_passage_distance_geography'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 10000;

COMMENT ON FUNCTION @extschema@.frechet_passage_distance(geography, geography) IS
'smallest epsilon (metres on WGS84) for which frechet_passes is true: the Fréchet distance between the stretch and the part of the trip nearest to it in that sense';

CREATE OPERATOR @extschema@.<~~>> (
	LEFTARG = geography,
	RIGHTARG = geography,
	FUNCTION = @extschema@.frechet_passage_distance
);

COMMENT ON OPERATOR @extschema@.<~~>> (geography, geography) IS
'trip <~~>> stretch: frechet_passage_distance; in ORDER BY, the index finds the trips that drove nearest to the stretch';

CREATE FUNCTION @extschema@.frechet_passage(trip geography, stretch geography, epsilon pg_catalog.float8,
	OUT trip_from pg_catalog.float8, OUT trip_to pg_catalog.float8, OUT distance pg_catalog.float8,
	OUT trip_part geography, OUT time_from pg_catalog.float8, OUT time_to pg_catalog.float8)
RETURNS SETOF pg_catalog.record
AS 'MODULE_PATHNAME', 'frechet_passage_geography'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 20000 ROWS 1;

COMMENT ON FUNCTION @extschema@.frechet_passage(geography, geography, pg_catalog.float8) IS
'one row a passage of the trip through the stretch within epsilon (metres on WGS84), in trip order: the trip positions (k + t, 1-based), the Fréchet distance between the stretch and that part, the part and the trip''s times (M) there (NULL without M); two passages are separate when the trip leaves the epsilon-disc around the stretch''s last vertex between them';

CREATE FUNCTION @extschema@.frechet_passes_within_reach(track geography, reach frechet_key)
RETURNS pg_catalog.bool
AS 'MODULE_PATHNAME', 'frechet_passes_within_reach_geography'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 100;

COMMENT ON FUNCTION @extschema@.frechet_passes_within_reach(geography, frechet_key) IS
'false only when no part of the track can lie within the reach''s epsilon of its stretch (the stretch''s ends too far from the track''s box, or a side of the stretch''s box beyond the track''s by more): a necessary condition for frechet_passes';

CREATE OPERATOR @extschema@.|~~>| (
	LEFTARG = geography,
	RIGHTARG = frechet_key,
	FUNCTION = @extschema@.frechet_passes_within_reach,
	RESTRICT = @extschema@.frechet_geo_key_restrict,
	JOIN = pg_catalog.contjoinsel
);

COMMENT ON OPERATOR @extschema@.|~~>| (geography, frechet_key) IS
'trip |~~>| frechet_reach(stretch, epsilon): the index condition of frechet_passes';

ALTER OPERATOR FAMILY @extschema@.frechet_geography_ops USING gist ADD
	OPERATOR 31 @extschema@.|~~>| (geography, frechet_key),
	OPERATOR 32 @extschema@.<~~>> (geography, geography) FOR ORDER BY pg_catalog.float_ops;

-- Sorted index builds (GiST support function 11), as for frechet_track_ops.
CREATE FUNCTION @extschema@.frechet_geo_gist_sortsupport(internal)
RETURNS pg_catalog.void
AS 'MODULE_PATHNAME', 'frechet_gist_sortsupport_packed'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

COMMENT ON FUNCTION @extschema@.frechet_geo_gist_sortsupport(internal) IS
'GiST sorted build of frechet_geometry_ops and frechet_geography_ops: keys in the order of a Hilbert curve through their boxes'' centres';

ALTER OPERATOR FAMILY @extschema@.frechet_geometry_ops USING gist ADD
	FUNCTION 11 (geometry, geometry) @extschema@.frechet_geo_gist_sortsupport(internal);
ALTER OPERATOR FAMILY @extschema@.frechet_geography_ops USING gist ADD
	FUNCTION 11 (geography, geography) @extschema@.frechet_geo_gist_sortsupport(internal);
