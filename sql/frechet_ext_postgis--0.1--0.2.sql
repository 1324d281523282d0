-- frechet_ext_postgis 0.1 -> 0.2.
\echo Use "ALTER EXTENSION frechet_ext_postgis UPDATE TO '0.2'" to load this file. \quit
-- PostGIS's types, which PostgreSQL 15 offers no placeholder to qualify:
-- ALTER EXTENSION ... UPDATE finds them through the search_path it sets.
-- lint_sql: allow geometry geography frechet_key frechet_summary

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

-- The restriction estimator of the index conditions |~~|, |~~~| and |~~>|
-- on geometry and geography (selectivity.c, as frechet_key_restrict).
CREATE FUNCTION @extschema@.frechet_geo_key_restrict(internal, pg_catalog.oid, internal, pg_catalog.int4)
RETURNS pg_catalog.float8
AS 'MODULE_PATHNAME', 'frechet_key_restrict'
LANGUAGE C STABLE STRICT PARALLEL SAFE;

COMMENT ON FUNCTION @extschema@.frechet_geo_key_restrict(internal, pg_catalog.oid, internal, pg_catalog.int4) IS
'restriction estimator of the index conditions |~~|, |~~~| and |~~>| on geometry and geography (from our index on the column)';

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


-- GeoJSON needs WGS84: a geometry whose SRID is not in spatial_ref_sys
-- cannot be transformed; frechet_geometry_geojson raises 22023 through this
-- rather than let ST_Transform fail with an internal error.
CREATE FUNCTION @extschema@.frechet_geojson_check_srid(srid pg_catalog.int4, known pg_catalog.bool)
RETURNS pg_catalog.bool
AS 'MODULE_PATHNAME', 'frechet_geojson_check_srid'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

COMMENT ON FUNCTION @extschema@.frechet_geojson_check_srid(pg_catalog.int4, pg_catalog.bool) IS
'internal: true when known, else an error saying that GeoJSON cannot be written for a geometry of this SRID (not in spatial_ref_sys)';

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

-- Excursions gain route_length and times: a function's result columns cannot
-- change in place, so they are dropped and made again, with the GeoJSON
-- functions that read them (rebuilt below).
DROP FUNCTION @extschema@.frechet_geojson(geometry, geometry, pg_catalog.float8);
DROP FUNCTION @extschema@.frechet_geojson(geography, geography, pg_catalog.float8);
DROP FUNCTION @extschema@.frechet_excursions(geometry, geometry, pg_catalog.float8);
DROP FUNCTION @extschema@.frechet_excursions(geography, geography, pg_catalog.float8);

CREATE FUNCTION @extschema@.frechet_excursions(trip geometry, route geometry, epsilon pg_catalog.float8)
RETURNS TABLE (trip_from pg_catalog.float8, trip_to pg_catalog.float8,
	route_from pg_catalog.float8, route_to pg_catalog.float8,
	max_leash pg_catalog.float8, trip_length pg_catalog.float8, trip_piece geometry,
	route_length pg_catalog.float8, time_from pg_catalog.float8, time_to pg_catalog.float8)
AS 'MODULE_PATHNAME', 'frechet_excursions_geometry'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 100000 ROWS 2;

COMMENT ON FUNCTION @extschema@.frechet_excursions(geometry, geometry, pg_catalog.float8) IS
'stretches of the trip that no order-preserving matching keeps within epsilon (units of the SRID) of the route, with the trip piece as a LineString (Z and M kept), the length of route between where it left and rejoined, and the times (M) where the stretch begins and ends (NULL without M); no rows exactly when frechet_at_most is true';

CREATE FUNCTION @extschema@.frechet_excursions(trip geography, route geography, epsilon pg_catalog.float8)
RETURNS TABLE (trip_from pg_catalog.float8, trip_to pg_catalog.float8,
	route_from pg_catalog.float8, route_to pg_catalog.float8,
	max_leash pg_catalog.float8, trip_length pg_catalog.float8, trip_piece geography,
	route_length pg_catalog.float8, time_from pg_catalog.float8, time_to pg_catalog.float8)
AS 'MODULE_PATHNAME', 'frechet_excursions_geography'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 100000 ROWS 2;

COMMENT ON FUNCTION @extschema@.frechet_excursions(geography, geography, pg_catalog.float8) IS
'stretches of the trip that no order-preserving matching keeps within epsilon (metres on WGS84) of the route, with the trip piece as a LineString (Z and M kept), the length of route between where it left and rejoined (metres), and the times (M) where the stretch begins and ends (NULL without M); no rows exactly when frechet_at_most is true';

-- (the GeoJSON functions follow, after the SRID check they call)

-- The GeoJSON functions of 0.1 named PostGIS's functions unqualified in
-- their standard SQL bodies, so an install into a schema where others can
-- create objects could bind look-alikes planted there.  Rebuilt as the
-- install script builds them, each PostGIS name qualified with PostGIS's
-- schema (the GeoJSON functions anew, as excursions changed above).
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
CREATE OR REPLACE FUNCTION @extschema@.frechet_geometry_geojson(g %1$I.geometry)
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

-- GeoJSON comments, lost with the drop above:
COMMENT ON FUNCTION @extschema@.frechet_geojson(geometry, geometry, pg_catalog.float8, pg_catalog.jsonb, pg_catalog.int4) IS
'a GeoJSON FeatureCollection of a pair for a map: both curves (roles a, b; with M their times, one a vertex), the leashes of an optimal matching (at most max_leashes, the longest always among them), the bottleneck and, with epsilon, the excursions of a from b (with their times); the caller''s properties (a JSON object) in every feature''s properties; distances in units of the SRID, coordinates in WGS84 lon/lat (transformed when the SRID is another known system; as stored when it is 0)';

COMMENT ON FUNCTION @extschema@.frechet_geojson(geography, geography, pg_catalog.float8, pg_catalog.jsonb, pg_catalog.int4) IS
'a GeoJSON FeatureCollection of a pair for a map: both curves (roles a, b; with M their times, one a vertex), the leashes of an optimal matching (at most max_leashes, the longest always among them), the bottleneck and, with epsilon, the excursions of a from b (with their times); the caller''s properties (a JSON object) in every feature''s properties; distances in metres on WGS84, coordinates lon/lat';

-- frechet_key records its kind of coordinates (planar or Earth-centred);
-- the operator classes' consistent functions now refuse a query key of
-- the other kind (22023) instead of comparing it silently.  Stored keys
-- are unchanged: no REINDEX is needed.  (PostGIS's types named with its
-- schema, as above.)
DO $do$
DECLARE
	gis pg_catalog.text := (SELECT n.nspname FROM pg_catalog.pg_extension e
		JOIN pg_catalog.pg_namespace n ON n.oid OPERATOR(pg_catalog.=) e.extnamespace
		WHERE e.extname OPERATOR(pg_catalog.=) 'postgis');
BEGIN
	EXECUTE pg_catalog.format($sql$
CREATE OR REPLACE FUNCTION @extschema@.frechet_geometry_gist_consistent(internal, %1$I.geometry, pg_catalog.int2, pg_catalog.oid, internal)
RETURNS pg_catalog.bool
AS 'MODULE_PATHNAME', 'frechet_gist_consistent_planar'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;
$sql$, gis);
	EXECUTE pg_catalog.format($sql$
CREATE OR REPLACE FUNCTION @extschema@.frechet_geography_gist_consistent(internal, %1$I.geography, pg_catalog.int2, pg_catalog.oid, internal)
RETURNS pg_catalog.bool
AS 'MODULE_PATHNAME', 'frechet_gist_consistent_earth'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;
$sql$, gis);
END $do$;

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

-- Operator names of our own: 0.1's &~ sat beside PostGIS's box operators,
-- where ~ means "contains", and <~> is a vector-search extension's Hamming
-- distance.  The range operator is now |~~| and the distance operator
-- <~~>.  Indexes keep working (same strategies and support functions, no
-- REINDEX); queries that spelled <~> in ORDER BY need the new name.
ALTER OPERATOR FAMILY @extschema@.frechet_geometry_ops USING gist DROP
	OPERATOR 1 (geometry, frechet_key),
	OPERATOR 15 (geometry, geometry);
ALTER OPERATOR FAMILY @extschema@.frechet_geography_ops USING gist DROP
	OPERATOR 1 (geography, frechet_key),
	OPERATOR 15 (geography, geography);
DROP OPERATOR @extschema@.&~ (geometry, frechet_key);
DROP OPERATOR @extschema@.&~ (frechet_key, geometry);
DROP OPERATOR @extschema@.&~ (geography, frechet_key);
DROP OPERATOR @extschema@.&~ (frechet_key, geography);
DROP OPERATOR @extschema@.<~> (geometry, geometry);
DROP OPERATOR @extschema@.<~> (geography, geography);

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

ALTER OPERATOR FAMILY @extschema@.frechet_geometry_ops USING gist ADD
	OPERATOR 1 @extschema@.|~~| (geometry, frechet_key),
	OPERATOR 15 @extschema@.<~~> (geometry, geometry) FOR ORDER BY pg_catalog.float_ops;
ALTER OPERATOR FAMILY @extschema@.frechet_geography_ops USING gist ADD
	OPERATOR 1 @extschema@.|~~| (geography, frechet_key),
	OPERATOR 15 @extschema@.<~~> (geography, geography) FOR ORDER BY pg_catalog.float_ops;

-- Comments that name the renamed operators.
COMMENT ON FUNCTION @extschema@.frechet_reach(geometry, pg_catalog.float8) IS
'the route''s summary with epsilon (units of the SRID) as its reach: the right operand of |~~| in range queries';
COMMENT ON FUNCTION @extschema@.frechet_reach(geography, pg_catalog.float8) IS
'the route''s summary with epsilon (metres, kept as the largest chord within them) as its reach: the right operand of |~~|';

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

-- Geography edges now follow their geodesics (0.1: the straight chords
-- between vertices), and the frechet_geography_ops keys summarise them: a
-- key of 0.1 can miss the bulge of a long edge.  Those indexes, like every
-- index of our classes, are built again at the end of this script (packed
-- keys).

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
AS 'MODULE_PATHNAME', 'frechet_gist_sortsupport'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

COMMENT ON FUNCTION @extschema@.frechet_geo_gist_sortsupport(internal) IS
'GiST sorted build of frechet_geometry_ops and frechet_geography_ops: keys in the order of a Hilbert curve through their boxes'' centres';

ALTER OPERATOR FAMILY @extschema@.frechet_geometry_ops USING gist ADD
	FUNCTION 11 (geometry, geometry) @extschema@.frechet_geo_gist_sortsupport(internal);
ALTER OPERATOR FAMILY @extschema@.frechet_geography_ops USING gist ADD
	FUNCTION 11 (geography, geography) @extschema@.frechet_geo_gist_sortsupport(internal);

-- Packed index keys (frechet_ext's frechet_summary, as in frechet_ext's
-- upgrade to 0.2): the indexes of both classes are dropped, the families
-- made again with the new storage and every member, and the indexes built
-- again from their definitions (same names, tablespaces, comments and
-- CLUSTER marks).  Until this update runs, a 0.1 index keeps working with
-- the new library: 0.1's C entry points still read wide keys.
DO $do$
DECLARE
	defs pg_catalog.jsonb := '[]';
	r record;
BEGIN
	FOR r IN
		SELECT i.indexrelid::pg_catalog.regclass AS ix,
		       pg_catalog.replace(pg_catalog.pg_get_indexdef(i.indexrelid), ' ON ONLY ', ' ON ') AS def,
		       (SELECT t.spcname FROM pg_catalog.pg_tablespace t WHERE t.oid OPERATOR(pg_catalog.=) c.reltablespace) AS spc,
		       pg_catalog.obj_description(i.indexrelid, 'pg_class') AS cmt,
		       i.indisclustered AS clustered, i.indrelid::pg_catalog.regclass::pg_catalog.text AS tbl, c.relname,
		       c.relnamespace::pg_catalog.regnamespace::pg_catalog.text AS nsp
		FROM pg_catalog.pg_index i
		JOIN pg_catalog.pg_class c ON c.oid OPERATOR(pg_catalog.=) i.indexrelid
		WHERE EXISTS (SELECT 1 FROM pg_catalog.pg_opclass oc JOIN pg_catalog.pg_opfamily f ON f.oid OPERATOR(pg_catalog.=) oc.opcfamily
		              WHERE oc.oid OPERATOR(pg_catalog.=) ANY (i.indclass::pg_catalog.oid[])
		                AND f.opfname OPERATOR(pg_catalog.=) ANY (ARRAY['frechet_geometry_ops', 'frechet_geography_ops'])
		                AND f.opfnamespace OPERATOR(pg_catalog.=) '@extschema@'::pg_catalog.regnamespace)
		  AND NOT EXISTS (SELECT 1 FROM pg_catalog.pg_inherits h WHERE h.inhrelid OPERATOR(pg_catalog.=) i.indexrelid)
	LOOP
		defs := defs OPERATOR(pg_catalog.||) pg_catalog.jsonb_build_array(pg_catalog.jsonb_build_object(
			'def', r.def, 'spc', r.spc, 'cmt', r.cmt, 'clustered', r.clustered, 'tbl', r.tbl, 'name', r.relname, 'nsp', r.nsp));
		EXECUTE pg_catalog.format('DROP INDEX %s', r.ix);
	END LOOP;
	PERFORM pg_catalog.set_config('frechet_ext_upgrade.geo_indexes', defs::pg_catalog.text, true);
END $do$;

DROP OPERATOR FAMILY @extschema@.frechet_geometry_ops USING gist;
DROP OPERATOR FAMILY @extschema@.frechet_geography_ops USING gist;

CREATE OR REPLACE FUNCTION @extschema@.frechet_geometry_gist_consistent(internal, geometry, pg_catalog.int2, pg_catalog.oid, internal)
RETURNS pg_catalog.bool
AS 'MODULE_PATHNAME', 'frechet_gist_consistent_packed_planar'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

CREATE OR REPLACE FUNCTION @extschema@.frechet_geography_gist_consistent(internal, geography, pg_catalog.int2, pg_catalog.oid, internal)
RETURNS pg_catalog.bool
AS 'MODULE_PATHNAME', 'frechet_gist_consistent_packed_earth'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

DROP FUNCTION @extschema@.frechet_geo_gist_union(internal, internal);

CREATE FUNCTION @extschema@.frechet_geo_gist_union(internal, internal)
RETURNS frechet_summary
AS 'MODULE_PATHNAME', 'frechet_gist_union_packed'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

COMMENT ON FUNCTION @extschema@.frechet_geo_gist_union(internal, internal) IS
'GiST support: the key covering a set of entries';

CREATE OR REPLACE FUNCTION @extschema@.frechet_geometry_gist_compress(internal)
RETURNS internal
AS 'MODULE_PATHNAME', 'frechet_gist_compress_packed_geometry'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

CREATE OR REPLACE FUNCTION @extschema@.frechet_geography_gist_compress(internal)
RETURNS internal
AS 'MODULE_PATHNAME', 'frechet_gist_compress_packed_geography'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

CREATE OR REPLACE FUNCTION @extschema@.frechet_geo_gist_penalty(internal, internal, internal)
RETURNS internal
AS 'MODULE_PATHNAME', 'frechet_gist_penalty_packed'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

CREATE OR REPLACE FUNCTION @extschema@.frechet_geo_gist_picksplit(internal, internal)
RETURNS internal
AS 'MODULE_PATHNAME', 'frechet_gist_picksplit_packed'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

DROP FUNCTION @extschema@.frechet_geo_gist_same(frechet_key, frechet_key, internal);

CREATE FUNCTION @extschema@.frechet_geo_gist_same(frechet_summary, frechet_summary, internal)
RETURNS internal
AS 'MODULE_PATHNAME', 'frechet_gist_same_packed'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

COMMENT ON FUNCTION @extschema@.frechet_geo_gist_same(frechet_summary, frechet_summary, internal) IS
'GiST support: equality of keys';

CREATE OR REPLACE FUNCTION @extschema@.frechet_geometry_gist_distance(internal, geometry, pg_catalog.int2, pg_catalog.oid, internal)
RETURNS pg_catalog.float8
AS 'MODULE_PATHNAME', 'frechet_gist_distance_packed_geometry'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

CREATE OR REPLACE FUNCTION @extschema@.frechet_geography_gist_distance(internal, geography, pg_catalog.int2, pg_catalog.oid, internal)
RETURNS pg_catalog.float8
AS 'MODULE_PATHNAME', 'frechet_gist_distance_packed_geography'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

CREATE OR REPLACE FUNCTION @extschema@.frechet_geo_gist_sortsupport(internal)
RETURNS pg_catalog.void
AS 'MODULE_PATHNAME', 'frechet_gist_sortsupport_packed'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

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

ALTER OPERATOR FAMILY @extschema@.frechet_geometry_ops USING gist ADD
	OPERATOR 1 @extschema@.|~~| (geometry, frechet_key),
	OPERATOR 15 @extschema@.<~~> (geometry, geometry) FOR ORDER BY pg_catalog.float_ops,
	OPERATOR 30 @extschema@.|~~~| (geometry, frechet_key),
	OPERATOR 31 @extschema@.|~~>| (geometry, frechet_key),
	OPERATOR 32 @extschema@.<~~>> (geometry, geometry) FOR ORDER BY pg_catalog.float_ops,
	FUNCTION 11 (geometry, geometry) @extschema@.frechet_geo_gist_sortsupport(internal);
ALTER OPERATOR FAMILY @extschema@.frechet_geography_ops USING gist ADD
	OPERATOR 1 @extschema@.|~~| (geography, frechet_key),
	OPERATOR 15 @extschema@.<~~> (geography, geography) FOR ORDER BY pg_catalog.float_ops,
	OPERATOR 30 @extschema@.|~~~| (geography, frechet_key),
	OPERATOR 31 @extschema@.|~~>| (geography, frechet_key),
	OPERATOR 32 @extschema@.<~~>> (geography, geography) FOR ORDER BY pg_catalog.float_ops,
	FUNCTION 11 (geography, geography) @extschema@.frechet_geo_gist_sortsupport(internal);

-- PostGIS's box operators again (see the start of this script).
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

-- The indexes again, with packed keys.
DO $do$
DECLARE
	d pg_catalog.jsonb;
	ix pg_catalog.regclass;
BEGIN
	FOR d IN SELECT pg_catalog.jsonb_array_elements(pg_catalog.current_setting('frechet_ext_upgrade.geo_indexes')::pg_catalog.jsonb)
	LOOP
		EXECUTE d OPERATOR(pg_catalog.->>) 'def';
		ix := pg_catalog.format('%s.%I', d OPERATOR(pg_catalog.->>) 'nsp', d OPERATOR(pg_catalog.->>) 'name')::pg_catalog.regclass;
		IF d OPERATOR(pg_catalog.->>) 'spc' IS NOT NULL THEN
			EXECUTE pg_catalog.format('ALTER INDEX %s SET TABLESPACE %I', ix, d OPERATOR(pg_catalog.->>) 'spc');
		END IF;
		IF d OPERATOR(pg_catalog.->>) 'cmt' IS NOT NULL THEN
			EXECUTE pg_catalog.format('COMMENT ON INDEX %s IS %L', ix, d OPERATOR(pg_catalog.->>) 'cmt');
		END IF;
		IF (d OPERATOR(pg_catalog.->>) 'clustered')::pg_catalog.bool THEN
			EXECUTE pg_catalog.format('ALTER TABLE %s CLUSTER ON %I', d OPERATOR(pg_catalog.->>) 'tbl', d OPERATOR(pg_catalog.->>) 'name');
		END IF;
	END LOOP;
END $do$;
