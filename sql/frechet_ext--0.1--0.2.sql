-- frechet_ext 0.1 -> 0.2.
\echo Use "ALTER EXTENSION frechet_ext UPDATE TO '0.2'" to load this file. \quit

CREATE FUNCTION @extschema@.frechet_pings_support(internal)
RETURNS internal
AS 'MODULE_PATHNAME', 'frechet_pings_support'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

COMMENT ON FUNCTION @extschema@.frechet_pings_support(internal) IS
'planner support of frechet_pings_at_most: the index condition trip |~~~| frechet_reach(route, epsilon)';

-- Sparse pings matched in order to a route (src/core/pings.c).  Not STRICT:
-- a NULL max_gap means no limit; NULL trip, route or epsilon give NULL.
CREATE FUNCTION @extschema@.frechet_pings_at_most(trip pg_catalog.point[], route pg_catalog.point[], epsilon pg_catalog.float8, max_gap pg_catalog.float8 DEFAULT NULL)
RETURNS pg_catalog.bool
AS 'MODULE_PATHNAME', 'frechet_pings_at_most_point_array'
LANGUAGE C IMMUTABLE CALLED ON NULL INPUT PARALLEL SAFE COST 500
SUPPORT @extschema@.frechet_pings_support;

COMMENT ON FUNCTION @extschema@.frechet_pings_at_most(pg_catalog.point[], pg_catalog.point[], pg_catalog.float8, pg_catalog.float8) IS
'true when every ping of the trip lies within epsilon of the route at non-decreasing route positions, the first at the route''s start and the last at its end; max_gap (NULL: no limit) caps the route length between consecutive positions';

CREATE FUNCTION @extschema@.frechet_pings_distance(trip pg_catalog.point[], route pg_catalog.point[], max_gap pg_catalog.float8 DEFAULT NULL)
RETURNS pg_catalog.float8
AS 'MODULE_PATHNAME', 'frechet_pings_distance_point_array'
LANGUAGE C IMMUTABLE CALLED ON NULL INPUT PARALLEL SAFE COST 2000;

COMMENT ON FUNCTION @extschema@.frechet_pings_distance(pg_catalog.point[], pg_catalog.point[], pg_catalog.float8) IS
'smallest epsilon for which frechet_pings_at_most is true (Infinity when max_gap allows no matching); never above frechet_distance';

-- The restriction estimator of the index conditions |~~|, |~~~| and |~~>|:
-- the share of the table whose index entries the condition admits, from
-- a walk of at most 128 pages of our index on the column (selectivity.c);
-- 0.001, what contsel returns, without one.
CREATE FUNCTION @extschema@.frechet_key_restrict(internal, pg_catalog.oid, internal, pg_catalog.int4)
RETURNS pg_catalog.float8
AS 'MODULE_PATHNAME', 'frechet_key_restrict'
LANGUAGE C STABLE STRICT PARALLEL SAFE;

COMMENT ON FUNCTION @extschema@.frechet_key_restrict(internal, pg_catalog.oid, internal, pg_catalog.int4) IS
'restriction estimator of the index conditions |~~|, |~~~| and |~~>| (from our index on the column)';

-- The index condition of frechet_pings_at_most: the trip's first and last
-- vertices within reach of the route's, its box inside the route's box
-- widened by the reach (one-sided: the route may go anywhere between two
-- pings).  Strategy 30, far from the R-tree numbers PostGIS asks for.
CREATE FUNCTION @extschema@.frechet_pings_within_reach(track pg_catalog.point[], reach @extschema@.frechet_key)
RETURNS pg_catalog.bool
AS 'MODULE_PATHNAME', 'frechet_pings_within_reach_point_array'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 10;

COMMENT ON FUNCTION @extschema@.frechet_pings_within_reach(pg_catalog.point[], @extschema@.frechet_key) IS
'true when the track''s first and last vertices and bounding box allow every vertex to lie within the reach''s epsilon of the route, in order (necessary for frechet_pings_at_most)';

CREATE OPERATOR @extschema@.|~~~| (
	LEFTARG = pg_catalog.point[],
	RIGHTARG = @extschema@.frechet_key,
	FUNCTION = @extschema@.frechet_pings_within_reach,
	RESTRICT = @extschema@.frechet_key_restrict,
	JOIN = pg_catalog.contjoinsel
);

COMMENT ON OPERATOR @extschema@.|~~~| (pg_catalog.point[], @extschema@.frechet_key) IS
'track |~~~| frechet_reach(route, epsilon): the index condition of frechet_pings_at_most';

ALTER OPERATOR FAMILY @extschema@.frechet_track_ops USING gist ADD
	OPERATOR 30 @extschema@.|~~~| (pg_catalog.point[], @extschema@.frechet_key);

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

CREATE FUNCTION @extschema@.frechet_pings_excursions(trip pg_catalog.point[], route pg_catalog.point[], epsilon pg_catalog.float8,
	OUT ping_from pg_catalog.int4, OUT ping_to pg_catalog.int4, OUT route_from pg_catalog.float8, OUT route_to pg_catalog.float8,
	OUT max_leash pg_catalog.float8, OUT trip_length pg_catalog.float8, OUT route_length pg_catalog.float8)
RETURNS SETOF pg_catalog.record
AS 'MODULE_PATHNAME', 'frechet_pings_excursions_point_array'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 2000 ROWS 2;

COMMENT ON FUNCTION @extschema@.frechet_pings_excursions(pg_catalog.point[], pg_catalog.point[], pg_catalog.float8) IS
'where sparse pings left the route: the runs of off-route pings of an in-order plan with the fewest (ping numbers, the route positions around each run, the farthest leash, the run''s length); no rows exactly when frechet_pings_at_most is true';

CREATE FUNCTION @extschema@.frechet_track_check(track pg_catalog.point[])
RETURNS pg_catalog.text
AS 'MODULE_PATHNAME', 'frechet_track_check_point_array'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 10;

COMMENT ON FUNCTION @extschema@.frechet_track_check(pg_catalog.point[]) IS
'NULL when every function accepts the track; otherwise what is wrong and where, in the words of the error the functions would raise; never raises an error (for the bad rows of a batch and a partial index)';

-- Operator names of our own (0.1's &~ sat beside PostGIS's box operators,
-- where ~ means "contains"): the range operator is now |~~|.  Indexes keep
-- working: the strategy and the support functions are unchanged, only the
-- operator's name is new, so no REINDEX is needed; queries that spelled
-- the operator (rare: frechet_at_most adds it) need the new name.
ALTER OPERATOR FAMILY @extschema@.frechet_track_ops USING gist DROP
	OPERATOR 1 (pg_catalog.point[], @extschema@.frechet_key);
DROP OPERATOR @extschema@.&~ (pg_catalog.point[], @extschema@.frechet_key);
DROP OPERATOR @extschema@.&~ (@extschema@.frechet_key, pg_catalog.point[]);

CREATE OPERATOR @extschema@.|~~| (
	LEFTARG = pg_catalog.point[],
	RIGHTARG = @extschema@.frechet_key,
	FUNCTION = @extschema@.frechet_within_reach,
	COMMUTATOR = OPERATOR(@extschema@.|~~|),
	RESTRICT = @extschema@.frechet_key_restrict,
	JOIN = pg_catalog.contjoinsel
);

CREATE OPERATOR @extschema@.|~~| (
	LEFTARG = @extschema@.frechet_key,
	RIGHTARG = pg_catalog.point[],
	FUNCTION = @extschema@.frechet_within_reach,
	COMMUTATOR = OPERATOR(@extschema@.|~~|),
	RESTRICT = @extschema@.frechet_key_restrict,
	JOIN = pg_catalog.contjoinsel
);

COMMENT ON OPERATOR @extschema@.|~~| (pg_catalog.point[], @extschema@.frechet_key) IS
'the track may lie within the reach''s epsilon of its route: the lossy index condition of frechet_at_most';

COMMENT ON OPERATOR @extschema@.|~~| (@extschema@.frechet_key, pg_catalog.point[]) IS
'the track may lie within the reach''s epsilon of its route (operands swapped)';

ALTER OPERATOR FAMILY @extschema@.frechet_track_ops USING gist ADD
	OPERATOR 1 @extschema@.|~~| (pg_catalog.point[], @extschema@.frechet_key);

-- Comments that name the renamed operators.
COMMENT ON FUNCTION @extschema@.frechet_reach(pg_catalog.point[], pg_catalog.float8) IS
'the route''s summary with epsilon as its reach: the right operand of |~~| in range queries';
COMMENT ON FUNCTION @extschema@.frechet_at_most_support(internal) IS
'planner support for frechet_at_most: derives the lossy index condition track |~~| frechet_reach(route, epsilon)';

CREATE FUNCTION @extschema@.frechet_progress(trip pg_catalog.point[], route pg_catalog.point[], epsilon pg_catalog.float8,
	OUT route_pos pg_catalog.float8, OUT route_fraction pg_catalog.float8, OUT route_point pg_catalog.point)
RETURNS SETOF pg_catalog.record
AS 'MODULE_PATHNAME', 'frechet_progress_point_array'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 5000 ROWS 1;

COMMENT ON FUNCTION @extschema@.frechet_progress(pg_catalog.point[], pg_catalog.point[], pg_catalog.float8) IS
'a trip in progress: one row when all of the trip so far is within Fréchet distance epsilon of a prefix of the route (from its start), with where on the route it is now (position k + t, share of the length, the point); no row otherwise';

-- Excursions gain route_length (the route between where the trip left and
-- rejoined it).  A function's result columns cannot change in place, so
-- it is dropped and made again, with frechet_geojson that reads it (which
-- gains the caller's properties and a cap on the leashes drawn).
DROP FUNCTION @extschema@.frechet_geojson(pg_catalog.point[], pg_catalog.point[], pg_catalog.float8);
DROP FUNCTION @extschema@.frechet_excursions(pg_catalog.point[], pg_catalog.point[], pg_catalog.float8);

CREATE FUNCTION @extschema@.frechet_excursions(trip pg_catalog.point[], route pg_catalog.point[],
	epsilon pg_catalog.float8)
RETURNS TABLE (trip_from pg_catalog.float8, trip_to pg_catalog.float8,
	route_from pg_catalog.float8, route_to pg_catalog.float8,
	max_leash pg_catalog.float8, trip_length pg_catalog.float8, route_length pg_catalog.float8)
AS 'MODULE_PATHNAME', 'frechet_excursions_point_array'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 100000 ROWS 2;

COMMENT ON FUNCTION @extschema@.frechet_excursions(pg_catalog.point[], pg_catalog.point[], pg_catalog.float8) IS
'stretches of the trip (vertex numbers) that an order-preserving matching cannot keep within epsilon of the route, with where on the route it left and rejoined, the stretch''s length and the length of route between; no rows exactly when frechet_at_most is true';

-- Helpers of the GeoJSON functions (here and in frechet_ext_postgis).
CREATE FUNCTION @extschema@.frechet_geojson_properties(properties pg_catalog.jsonb)
RETURNS pg_catalog.jsonb
AS 'MODULE_PATHNAME', 'frechet_geojson_properties'
LANGUAGE C IMMUTABLE PARALLEL SAFE;

COMMENT ON FUNCTION @extschema@.frechet_geojson_properties(pg_catalog.jsonb) IS
'internal: the caller''s properties for every feature of frechet_geojson (''{}'' for NULL); an error unless a JSON object';

CREATE FUNCTION @extschema@.frechet_geojson_leash_drawn(step pg_catalog.int4, total pg_catalog.int8,
	longest pg_catalog.bool, max_leashes pg_catalog.int4)
RETURNS pg_catalog.bool
AS 'MODULE_PATHNAME', 'frechet_geojson_leash_drawn'
LANGUAGE C IMMUTABLE PARALLEL SAFE;

COMMENT ON FUNCTION @extschema@.frechet_geojson_leash_drawn(pg_catalog.int4, pg_catalog.int8, pg_catalog.bool, pg_catalog.int4) IS
'internal: whether frechet_geojson draws leash step of total under max_leashes (all when NULL): the longest, and the first of each of max_leashes - 1 equal runs of steps; an error when max_leashes < 1';

CREATE FUNCTION @extschema@.frechet_geojson(a pg_catalog.point[], b pg_catalog.point[],
	epsilon pg_catalog.float8 DEFAULT NULL, properties pg_catalog.jsonb DEFAULT NULL,
	max_leashes pg_catalog.int4 DEFAULT NULL)
RETURNS pg_catalog.jsonb
LANGUAGE sql IMMUTABLE PARALLEL SAFE COST 300000
BEGIN ATOMIC
	SELECT pg_catalog.jsonb_build_object(
		'type', 'FeatureCollection',
		'frechet', pg_catalog.jsonb_build_object(
			'distance', dd.d,
			'epsilon', epsilon,
			'within_epsilon', @extschema@.frechet_at_most(a, b, epsilon),
			'excursions', pg_catalog.jsonb_array_length(ex.features)),
		'features', pg_catalog.jsonb_build_array(
			pg_catalog.jsonb_build_object('type', 'Feature',
				'properties', o.p OPERATOR(pg_catalog.||) pg_catalog.jsonb_build_object('role', 'a',
					'vertices', pg_catalog.cardinality(a), 'distance', dd.d, 'epsilon', epsilon),
				'geometry', @extschema@.frechet_track_geojson(a)),
			pg_catalog.jsonb_build_object('type', 'Feature',
				'properties', o.p OPERATOR(pg_catalog.||) pg_catalog.jsonb_build_object('role', 'b',
					'vertices', pg_catalog.cardinality(b), 'distance', dd.d, 'epsilon', epsilon),
				'geometry', @extschema@.frechet_track_geojson(b)),
			pg_catalog.jsonb_build_object('type', 'Feature',
				'properties', o.p OPERATOR(pg_catalog.||) pg_catalog.jsonb_build_object('role', 'leashes',
					'count', ls.n, 'matching_steps', COALESCE(ls.total, 0)),
				'geometry', pg_catalog.jsonb_build_object('type', 'MultiLineString',
					'coordinates', COALESCE(ls.lines, '[]'::pg_catalog.jsonb))),
			pg_catalog.jsonb_build_object('type', 'Feature',
				'properties', o.p OPERATOR(pg_catalog.||) pg_catalog.jsonb_build_object('role', 'bottleneck',
					'leash', bn.leash, 'a_pos', bn.a_pos, 'b_pos', bn.b_pos),
				'geometry', pg_catalog.jsonb_build_object('type', 'LineString',
					'coordinates', pg_catalog.jsonb_build_array(
						pg_catalog.jsonb_build_array(bn.a_point[0], bn.a_point[1]),
						pg_catalog.jsonb_build_array(bn.b_point[0], bn.b_point[1])))))
			OPERATOR(pg_catalog.||) ex.features)
	FROM (SELECT @extschema@.frechet_geojson_properties(properties) AS p,
			@extschema@.frechet_geojson_leash_drawn(NULL, NULL, NULL, max_leashes) AS cap_checked) AS o,
		(SELECT @extschema@.frechet_distance(a, b) AS d) AS dd,
		@extschema@.frechet_bottleneck(a, b) AS bn,
		LATERAL (SELECT pg_catalog.count(*) AS n, pg_catalog.max(m.total) AS total,
				pg_catalog.jsonb_agg(pg_catalog.jsonb_build_array(
					pg_catalog.jsonb_build_array(m.a_point[0], m.a_point[1]),
					pg_catalog.jsonb_build_array(m.b_point[0], m.b_point[1])) ORDER BY m.step) AS lines
			FROM (SELECT mm.step, mm.a_point, mm.b_point, pg_catalog.count(*) OVER () AS total,
					pg_catalog.row_number() OVER (ORDER BY mm.leash DESC, mm.step) AS by_length
				FROM @extschema@.frechet_matching(a, b) AS mm) AS m
			WHERE @extschema@.frechet_geojson_leash_drawn(m.step, m.total,
				m.by_length OPERATOR(pg_catalog.=) 1, max_leashes)) AS ls,
		LATERAL (SELECT COALESCE(pg_catalog.jsonb_agg(pg_catalog.jsonb_build_object('type', 'Feature',
					'properties', o.p OPERATOR(pg_catalog.||) pg_catalog.jsonb_build_object('role', 'excursion',
						'number', x.n, 'trip_from', x.trip_from, 'trip_to', x.trip_to,
						'route_from', x.route_from, 'route_to', x.route_to,
						'max_leash', x.max_leash, 'trip_length', x.trip_length, 'route_length', x.route_length),
					'geometry', @extschema@.frechet_track_geojson(
						@extschema@.frechet_track_piece(a, x.trip_from, x.trip_to))) ORDER BY x.n),
				'[]'::pg_catalog.jsonb) AS features
			FROM @extschema@.frechet_excursions(a, b, epsilon) WITH ORDINALITY AS x(trip_from, trip_to,
				route_from, route_to, max_leash, trip_length, route_length, n)) AS ex;
END;

COMMENT ON FUNCTION @extschema@.frechet_geojson(pg_catalog.point[], pg_catalog.point[], pg_catalog.float8, pg_catalog.jsonb, pg_catalog.int4) IS
'a GeoJSON FeatureCollection of a pair for a map: both tracks (roles a, b), the leashes of an optimal matching (at most max_leashes of them, the longest always among them), the bottleneck leash and, with epsilon, the excursions of a from b; the caller''s properties (a JSON object) in every feature''s properties; a foreign member frechet with distance and epsilon (a FeatureCollection may not have properties); coordinates as stored';

-- Corridor search (src/core/passage.c): which trips drove a stretch, in
-- its direction, and which part of each trip it was: partial matching with
-- the stretch matched whole.  The index condition trip |~~>| frechet_reach
-- (strategy 31) needs the trip's box to cover the stretch's box shrunk by
-- epsilon and the stretch's ends within epsilon of it; <~~>> (strategy 32)
-- orders by the passage distance, bounded below by the stretch's hull.
CREATE FUNCTION @extschema@.frechet_passes_support(internal)
RETURNS internal
AS 'MODULE_PATHNAME', 'frechet_passes_support'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

COMMENT ON FUNCTION @extschema@.frechet_passes_support(internal) IS
'planner support of frechet_passes: the index condition trip |~~>| frechet_reach(stretch, epsilon)';

CREATE FUNCTION @extschema@.frechet_passes(trip pg_catalog.point[], stretch pg_catalog.point[], epsilon pg_catalog.float8)
RETURNS pg_catalog.bool
AS 'MODULE_PATHNAME', 'frechet_passes_point_array'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 5000
SUPPORT @extschema@.frechet_passes_support;

COMMENT ON FUNCTION @extschema@.frechet_passes(pg_catalog.point[], pg_catalog.point[], pg_catalog.float8) IS
'true when some part of the trip lies within Fréchet distance epsilon (coordinate units) of the whole stretch, driven in the stretch''s direction (partial matching with the stretch matched whole)';

CREATE FUNCTION @extschema@.frechet_passage_distance(trip pg_catalog.point[], stretch pg_catalog.point[])
RETURNS pg_catalog.float8
AS 'MODULE_PATHNAME', 'frechet_passage_distance_point_array'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 10000;

COMMENT ON FUNCTION @extschema@.frechet_passage_distance(pg_catalog.point[], pg_catalog.point[]) IS
'smallest epsilon (coordinate units) for which frechet_passes is true: the Fréchet distance between the stretch and the part of the trip nearest to it in that sense';

CREATE OPERATOR @extschema@.<~~>> (
	LEFTARG = pg_catalog.point[],
	RIGHTARG = pg_catalog.point[],
	FUNCTION = @extschema@.frechet_passage_distance
);

COMMENT ON OPERATOR @extschema@.<~~>> (pg_catalog.point[], pg_catalog.point[]) IS
'trip <~~>> stretch: frechet_passage_distance; in ORDER BY, the index finds the trips that drove nearest to the stretch';

CREATE FUNCTION @extschema@.frechet_passage(trip pg_catalog.point[], stretch pg_catalog.point[], epsilon pg_catalog.float8,
	OUT trip_from pg_catalog.float8, OUT trip_to pg_catalog.float8, OUT distance pg_catalog.float8,
	OUT trip_part pg_catalog.point[])
RETURNS SETOF pg_catalog.record
AS 'MODULE_PATHNAME', 'frechet_passage_point_array'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 20000 ROWS 1;

COMMENT ON FUNCTION @extschema@.frechet_passage(pg_catalog.point[], pg_catalog.point[], pg_catalog.float8) IS
'one row a passage of the trip through the stretch within epsilon (coordinate units), in trip order: the trip positions (k + t, 1-based), the Fréchet distance between the stretch and that part, the part; two passages are separate when the trip leaves the epsilon-disc around the stretch''s last vertex between them';

CREATE FUNCTION @extschema@.frechet_passes_within_reach(track pg_catalog.point[], reach @extschema@.frechet_key)
RETURNS pg_catalog.bool
AS 'MODULE_PATHNAME', 'frechet_passes_within_reach_point_array'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE COST 10;

COMMENT ON FUNCTION @extschema@.frechet_passes_within_reach(pg_catalog.point[], @extschema@.frechet_key) IS
'false only when no part of the track can lie within the reach''s epsilon of its stretch (the stretch''s ends too far from the track''s box, or a side of the stretch''s box beyond the track''s by more): a necessary condition for frechet_passes';

CREATE OPERATOR @extschema@.|~~>| (
	LEFTARG = pg_catalog.point[],
	RIGHTARG = @extschema@.frechet_key,
	FUNCTION = @extschema@.frechet_passes_within_reach,
	RESTRICT = @extschema@.frechet_key_restrict,
	JOIN = pg_catalog.contjoinsel
);

COMMENT ON OPERATOR @extschema@.|~~>| (pg_catalog.point[], @extschema@.frechet_key) IS
'trip |~~>| frechet_reach(stretch, epsilon): the index condition of frechet_passes';

ALTER OPERATOR FAMILY @extschema@.frechet_track_ops USING gist ADD
	OPERATOR 31 @extschema@.|~~>| (pg_catalog.point[], @extschema@.frechet_key),
	OPERATOR 32 @extschema@.<~~>> (pg_catalog.point[], pg_catalog.point[]) FOR ORDER BY pg_catalog.float_ops;

-- Sorted index builds (GiST support function 11): CREATE INDEX sorts the
-- keys along a Hilbert curve through their boxes' centres and packs pages
-- in that order instead of inserting keys one at a time (src/index/gist.c).
-- Only the build changes: existing indexes and answers are the same.
CREATE FUNCTION @extschema@.frechet_gist_sortsupport(internal)
RETURNS pg_catalog.void
AS 'MODULE_PATHNAME', 'frechet_gist_sortsupport'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

COMMENT ON FUNCTION @extschema@.frechet_gist_sortsupport(internal) IS
'GiST sorted build of frechet_track_ops: keys in the order of a Hilbert curve through their boxes'' centres';

ALTER OPERATOR FAMILY @extschema@.frechet_track_ops USING gist ADD
	FUNCTION 11 (pg_catalog.point[], pg_catalog.point[]) @extschema@.frechet_gist_sortsupport(internal);

-- Packed index keys.  0.2's operator class stores frechet_summary (32
-- bytes for a track: src/core/bounds.c, fr_key_pack) where 0.1's stored
-- frechet_key (136 bytes).  PostgreSQL has no command to change a class's
-- storage type, and an index keeps the key type it was built with (a
-- REINDEX too), so: the indexes of the class are dropped, the family is
-- made again with the new storage and every member, and the indexes are
-- built again from their definitions (same names, tablespaces, comments
-- and CLUSTER marks).  Until this update runs, a 0.1 index keeps working
-- with the new library: 0.1's C entry points still read wide keys.
CREATE TYPE @extschema@.frechet_summary;

CREATE FUNCTION @extschema@.frechet_summary_in(pg_catalog.cstring)
RETURNS @extschema@.frechet_summary
AS 'MODULE_PATHNAME', 'frechet_summary_in'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

CREATE FUNCTION @extschema@.frechet_summary_out(@extschema@.frechet_summary)
RETURNS pg_catalog.cstring
AS 'MODULE_PATHNAME', 'frechet_summary_out'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

CREATE TYPE @extschema@.frechet_summary (
	INPUT = @extschema@.frechet_summary_in,
	OUTPUT = @extschema@.frechet_summary_out,
	INTERNALLENGTH = VARIABLE,
	ALIGNMENT = int4,
	STORAGE = plain
);

COMMENT ON TYPE @extschema@.frechet_summary IS
'the packed summary a Fréchet GiST index stores: float4 values rounded outward from a frechet_key (32 bytes for a track)';

COMMENT ON FUNCTION @extschema@.frechet_summary_in(pg_catalog.cstring) IS
'text input of frechet_summary (a frechet_key''s text, packed)';

COMMENT ON FUNCTION @extschema@.frechet_summary_out(@extschema@.frechet_summary) IS
'text output of frechet_summary (the frechet_key it unpacks to)';

-- The indexes of the family, kept in a transaction-local setting until
-- they are built again below, and dropped.  Partitions' indexes come back
-- with their parent's.
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
		                AND f.opfname OPERATOR(pg_catalog.=) 'frechet_track_ops'
		                AND f.opfnamespace OPERATOR(pg_catalog.=) '@extschema@'::pg_catalog.regnamespace)
		  AND NOT EXISTS (SELECT 1 FROM pg_catalog.pg_inherits h WHERE h.inhrelid OPERATOR(pg_catalog.=) i.indexrelid)
	LOOP
		defs := defs OPERATOR(pg_catalog.||) pg_catalog.jsonb_build_array(pg_catalog.jsonb_build_object(
			'def', r.def, 'spc', r.spc, 'cmt', r.cmt, 'clustered', r.clustered, 'tbl', r.tbl, 'name', r.relname, 'nsp', r.nsp));
		EXECUTE pg_catalog.format('DROP INDEX %s', r.ix);
	END LOOP;
	PERFORM pg_catalog.set_config('frechet_ext_upgrade.indexes', defs::pg_catalog.text, true);
END $do$;

DROP OPERATOR FAMILY @extschema@.frechet_track_ops USING gist;

CREATE OR REPLACE FUNCTION @extschema@.frechet_gist_consistent(internal, pg_catalog.point[], pg_catalog.int2, pg_catalog.oid, internal)
RETURNS pg_catalog.bool
AS 'MODULE_PATHNAME', 'frechet_gist_consistent_packed_planar'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

DROP FUNCTION @extschema@.frechet_gist_union(internal, internal);

CREATE FUNCTION @extschema@.frechet_gist_union(internal, internal)
RETURNS @extschema@.frechet_summary
AS 'MODULE_PATHNAME', 'frechet_gist_union_packed'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

COMMENT ON FUNCTION @extschema@.frechet_gist_union(internal, internal) IS
'GiST support: the key covering a set of entries';

CREATE OR REPLACE FUNCTION @extschema@.frechet_gist_compress(internal)
RETURNS internal
AS 'MODULE_PATHNAME', 'frechet_gist_compress_packed_point_array'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

CREATE OR REPLACE FUNCTION @extschema@.frechet_gist_penalty(internal, internal, internal)
RETURNS internal
AS 'MODULE_PATHNAME', 'frechet_gist_penalty_packed'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

CREATE OR REPLACE FUNCTION @extschema@.frechet_gist_picksplit(internal, internal)
RETURNS internal
AS 'MODULE_PATHNAME', 'frechet_gist_picksplit_packed'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

DROP FUNCTION @extschema@.frechet_gist_same(@extschema@.frechet_key, @extschema@.frechet_key, internal);

CREATE FUNCTION @extschema@.frechet_gist_same(@extschema@.frechet_summary, @extschema@.frechet_summary, internal)
RETURNS internal
AS 'MODULE_PATHNAME', 'frechet_gist_same_packed'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

COMMENT ON FUNCTION @extschema@.frechet_gist_same(@extschema@.frechet_summary, @extschema@.frechet_summary, internal) IS
'GiST support: equality of keys';

CREATE OR REPLACE FUNCTION @extschema@.frechet_gist_distance(internal, pg_catalog.point[], pg_catalog.int2, pg_catalog.oid, internal)
RETURNS pg_catalog.float8
AS 'MODULE_PATHNAME', 'frechet_gist_distance_packed_point_array'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

CREATE OR REPLACE FUNCTION @extschema@.frechet_gist_sortsupport(internal)
RETURNS pg_catalog.void
AS 'MODULE_PATHNAME', 'frechet_gist_sortsupport_packed'
LANGUAGE C IMMUTABLE STRICT PARALLEL SAFE;

CREATE OPERATOR CLASS @extschema@.frechet_track_ops
DEFAULT FOR TYPE pg_catalog.point[] USING gist AS
	OPERATOR 15 @extschema@.<-> (pg_catalog.point[], pg_catalog.point[]) FOR ORDER BY pg_catalog.float_ops,
	FUNCTION 1 @extschema@.frechet_gist_consistent(internal, pg_catalog.point[], pg_catalog.int2, pg_catalog.oid, internal),
	FUNCTION 2 @extschema@.frechet_gist_union(internal, internal),
	FUNCTION 3 @extschema@.frechet_gist_compress(internal),
	FUNCTION 5 @extschema@.frechet_gist_penalty(internal, internal, internal),
	FUNCTION 6 @extschema@.frechet_gist_picksplit(internal, internal),
	FUNCTION 7 @extschema@.frechet_gist_same(@extschema@.frechet_summary, @extschema@.frechet_summary, internal),
	FUNCTION 8 @extschema@.frechet_gist_distance(internal, pg_catalog.point[], pg_catalog.int2, pg_catalog.oid, internal),
	STORAGE @extschema@.frechet_summary;

ALTER OPERATOR FAMILY @extschema@.frechet_track_ops USING gist ADD
	OPERATOR 1 @extschema@.|~~| (pg_catalog.point[], @extschema@.frechet_key),
	OPERATOR 30 @extschema@.|~~~| (pg_catalog.point[], @extschema@.frechet_key),
	OPERATOR 31 @extschema@.|~~>| (pg_catalog.point[], @extschema@.frechet_key),
	OPERATOR 32 @extschema@.<~~>> (pg_catalog.point[], pg_catalog.point[]) FOR ORDER BY pg_catalog.float_ops,
	FUNCTION 11 (pg_catalog.point[], pg_catalog.point[]) @extschema@.frechet_gist_sortsupport(internal);

-- The indexes again, with packed keys.
DO $do$
DECLARE
	d pg_catalog.jsonb;
	ix pg_catalog.regclass;
BEGIN
	FOR d IN SELECT pg_catalog.jsonb_array_elements(pg_catalog.current_setting('frechet_ext_upgrade.indexes')::pg_catalog.jsonb)
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
