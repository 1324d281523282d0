-- GeoJSON for dashboards (point[]): frechet_track_piece, frechet_track_geojson
-- and frechet_geojson.  Structure checks follow RFC 7946 (sections 3.1-3.3,
-- 7.1); test/geojson/ also runs an outside validator on these outputs.
CREATE EXTENSION IF NOT EXISTS frechet_ext;

CREATE FUNCTION pg_temp.try(q text) RETURNS text LANGUAGE plpgsql AS $$
BEGIN
	EXECUTE q;
	RETURN 'ok';
EXCEPTION WHEN OTHERS THEN
	RETURN SQLSTATE || ': ' || SQLERRM;
END $$;

-- Pieces: end points interpolated, the vertices between copied.
SELECT frechet_track_piece('{"(0,0)","(10,0)","(10,10)"}', 1.5, 2.5) AS mid,
       frechet_track_piece('{"(0,0)","(10,0)","(10,10)"}', 1, 3) AS whole,
       frechet_track_piece('{"(0,0)","(10,0)","(10,10)"}', 2, 2) AS one_vertex,
       frechet_track_piece('{"(0,0)","(10,0)","(10,10)"}', 2.25, 2.75) AS inside_one_edge,
       frechet_track_piece('{"(7,8)"}', 1, 1) AS one_point_track;

-- Bad positions and tracks.
SELECT pg_temp.try($$SELECT frechet_track_piece('{"(0,0)","(10,0)"}', 0.5, 2)$$);
SELECT pg_temp.try($$SELECT frechet_track_piece('{"(0,0)","(10,0)"}', 1, 2.01)$$);
SELECT pg_temp.try($$SELECT frechet_track_piece('{"(0,0)","(10,0)"}', 'NaN', 2)$$);
SELECT pg_temp.try($$SELECT frechet_track_piece('{"(0,0)","(10,0)"}', 1.8, 1.2)$$);
SELECT pg_temp.try($$SELECT frechet_track_piece('{}', 1, 1)$$);
SELECT pg_temp.try($$SELECT frechet_track_geojson('{}')$$);
SELECT pg_temp.try($$SELECT frechet_track_geojson('{"(0,0)",NULL}')$$);
SELECT pg_temp.try($$SELECT frechet_geojson('{"(0,0)","(NaN,1)"}', '{"(0,0)"}')$$);
SELECT pg_temp.try($$SELECT frechet_geojson('{"(0,0)"}', '{"(0,0)"}', -1)$$);

-- Tracks as geometries: a one-point track is a Point (a LineString needs
-- two positions, RFC 7946 section 3.1.4).
SELECT frechet_track_geojson('{"(0,0)","(10,0)","(10,10)"}');
SELECT frechet_track_geojson('{"(3,4)"}');
SELECT frechet_geojson(NULL, '{"(0,0)"}') IS NULL AS null_in_null_out;

CREATE TABLE gj_pair (id int, a point[], b point[], eps float8);
INSERT INTO gj_pair VALUES
	(1, '{"(0,0)","(100,0)","(150,90)","(200,0)","(300,0)"}', '{"(0,0)","(300,0)"}', 30),
	(2, '{"(0,0)","(100,0)","(150,90)","(200,0)","(300,0)"}', '{"(0,0)","(300,0)"}', NULL),
	(3, '{"(0,1)","(150,-2)","(300,1)"}', '{"(0,0)","(300,0)"}', 30),
	(4, '{"(3,4)"}', '{"(0,0)","(10,0)"}', 2),
	(5, '{"(0,0)","(50,0)","(60,80)","(90,0)","(200,0)","(210,-70)","(230,0)","(400,0)"}', '{"(0,0)","(400,0)"}', 10),
	(6, '{"(300,0)","(150,3)","(0,0)"}', '{"(0,0)","(150,0)","(300,0)"}', 20);
CREATE TABLE gj AS SELECT id, a, b, eps, frechet_geojson(a, b, eps) AS j FROM gj_pair;

-- The collection: its type, no "properties" member (RFC 7946 section 7.1),
-- the summary as a foreign member, the features' roles in order.
SELECT id, j->>'type' AS type, j ? 'properties' AS has_properties,
       (SELECT string_agg(f->'properties'->>'role', ',' ORDER BY o)
        FROM jsonb_array_elements(j->'features') WITH ORDINALITY AS e(f, o)) AS roles,
       j->'frechet'->>'epsilon' AS epsilon, j->'frechet'->>'within_epsilon' AS within,
       j->'frechet'->>'excursions' AS excursions
FROM gj ORDER BY id;

-- Every feature is a Feature with an object of properties and a geometry
-- whose positions are two numbers each.
SELECT count(*) AS features,
       count(*) FILTER (WHERE f->>'type' = 'Feature' AND jsonb_typeof(f->'properties') = 'object'
                        AND jsonb_typeof(f->'geometry') = 'object') AS well_formed
FROM gj, jsonb_array_elements(j->'features') f;
SELECT count(*) AS positions,
       count(*) FILTER (WHERE jsonb_array_length(p) = 2 AND jsonb_typeof(p->0) = 'number'
                        AND jsonb_typeof(p->1) = 'number') AS two_numbers
FROM gj, jsonb_array_elements(j->'features') f,
     LATERAL (SELECT f->'geometry'->'coordinates' AS p WHERE f->'geometry'->>'type' = 'Point'
              UNION ALL SELECT c FROM jsonb_array_elements(f->'geometry'->'coordinates') c
                        WHERE f->'geometry'->>'type' = 'LineString'
              UNION ALL SELECT c FROM jsonb_array_elements(f->'geometry'->'coordinates') l,
                                     jsonb_array_elements(l) c
                        WHERE f->'geometry'->>'type' = 'MultiLineString') AS pos;

-- Against the functions it summarises: distance, the tracks' coordinates,
-- one leash per matching breakpoint with its end points, the bottleneck,
-- each excursion and its piece of the trip.
SELECT id,
       (j->'frechet'->>'distance')::float8 = frechet_distance(a, b) AS distance_ok,
       j->'features'->0->'geometry' = frechet_track_geojson(a)
         AND j->'features'->1->'geometry' = frechet_track_geojson(b) AS tracks_ok,
       (SELECT jsonb_agg(jsonb_build_array(jsonb_build_array(m.a_point[0], m.a_point[1]),
                                           jsonb_build_array(m.b_point[0], m.b_point[1])) ORDER BY step)
        FROM frechet_matching(a, b) m) = j->'features'->2->'geometry'->'coordinates' AS leashes_ok,
       (SELECT (j->'features'->3->'properties'->>'leash')::float8 = bn.leash
               AND j->'features'->3->'geometry'->'coordinates' =
                   jsonb_build_array(jsonb_build_array(bn.a_point[0], bn.a_point[1]),
                                     jsonb_build_array(bn.b_point[0], bn.b_point[1]))
        FROM frechet_bottleneck(a, b) bn) AS bottleneck_ok,
       (SELECT count(*) FROM frechet_excursions(a, b, eps)) = jsonb_array_length(j->'features') - 4
         AS excursion_count_ok
FROM gj ORDER BY id;

SELECT g.id, x.n, (f->'properties'->>'trip_from')::float8 = x.trip_from AS from_ok,
       (f->'properties'->>'max_leash')::float8 = x.max_leash AS leash_ok,
       f->'geometry' = frechet_track_geojson(frechet_track_piece(g.a, x.trip_from, x.trip_to)) AS piece_ok,
       f->'geometry'->>'type' AS geom_type, jsonb_array_length(f->'geometry'->'coordinates') AS positions
FROM gj g, frechet_excursions(g.a, g.b, g.eps) WITH ORDINALITY
       AS x(trip_from, trip_to, route_from, route_to, max_leash, trip_length, route_length, n),
     LATERAL (SELECT j->'features'->(3 + x.n::int) AS f) ff
ORDER BY g.id, x.n;

-- The leash lines stay within the distance: no leash longer than the bottleneck.
SELECT id, bool_and(sqrt(((l->0->>0)::float8 - (l->1->>0)::float8) ^ 2 + ((l->0->>1)::float8 - (l->1->>1)::float8) ^ 2)
                    <= (j->'frechet'->>'distance')::float8 * (1 + 1e-9)) AS leashes_within
FROM gj, jsonb_array_elements(j->'features'->2->'geometry'->'coordinates') l
GROUP BY id ORDER BY id;

-- The caller's properties (a trip id of the invented Kestrel Vale fleet)
-- are in every feature's properties; ours win on a shared key.
SELECT id, bool_and(f->'properties'->>'trip_id' = 'KV-0' || id) AS every_feature,
       bool_and(f->'properties'->>'role' <> 'mine') AS ours_win
FROM gj, jsonb_array_elements(frechet_geojson(a, b, eps, jsonb_build_object('trip_id', 'KV-0' || id, 'role', 'mine'))->'features') f
GROUP BY id ORDER BY id;

-- A cap on the leashes drawn: a long zigzag trip against a straight route
-- has a matching of many steps.  Under a cap of k at most k leashes are
-- drawn, the longest (the bottleneck's, computed apart) always among them,
-- and from a cap of 2 the first step's leash too; matching_steps counts
-- all of them.
CREATE TABLE gj_long AS
SELECT array(SELECT point(i, CASE WHEN i % 2 = 0 THEN 0 ELSE 1 + (i % 7) END) FROM generate_series(0, 3000) i) AS a,
       '{"(0,0)","(3000,0)"}'::point[] AS b;
SELECT k, (j->'features'->2->'properties'->>'count')::int AS drawn,
       (j->'features'->2->'properties'->>'count')::int <= k AS within_cap,
       (j->'features'->2->'properties'->>'matching_steps')::int = (SELECT count(*) FROM frechet_matching(a, b)) AS steps_counted,
       (SELECT max(sqrt(((l->0->>0)::float8 - (l->1->>0)::float8) ^ 2 + ((l->0->>1)::float8 - (l->1->>1)::float8) ^ 2))
        FROM jsonb_array_elements(j->'features'->2->'geometry'->'coordinates') l)
       = (SELECT leash FROM frechet_bottleneck(a, b)) AS longest_drawn,
       j->'features'->2->'geometry'->'coordinates'->0 = (SELECT jsonb_build_array(jsonb_build_array(m.a_point[0], m.a_point[1]),
                                                                                   jsonb_build_array(m.b_point[0], m.b_point[1]))
                                                          FROM frechet_matching(a, b) m WHERE m.step = 1) OR k = 1 AS first_drawn
FROM gj_long, unnest('{1,2,10,500}'::int[]) k, LATERAL (SELECT frechet_geojson(a, b, NULL, NULL, k) AS j) g
ORDER BY k;
SELECT (SELECT count(*) FROM frechet_matching(a, b)) > 500 AS matching_is_long,
       (frechet_geojson(a, b)->'features'->2->'properties'->>'count')::int = (SELECT count(*) FROM frechet_matching(a, b)) AS all_without_cap,
       length((frechet_geojson(a, b, NULL, NULL, 100)->'features'->2)::text) * 10
       < length((frechet_geojson(a, b)->'features'->2)::text) AS capped_is_smaller
FROM gj_long;
\set VERBOSITY terse
SELECT frechet_geojson(a, b, NULL, '[1]'::jsonb) FROM gj_long;
SELECT frechet_geojson(a, b, NULL, NULL, 0) FROM gj_long;
\set VERBOSITY default
DROP TABLE gj_long;

-- The standard SQL bodies are bound when the extension is created: the
-- functions work with only pg_catalog on the search_path (as in a
-- postgres_fdw remote session).
SELECT extnamespace::regnamespace AS schema FROM pg_extension WHERE extname = 'frechet_ext' \gset
SET search_path = pg_catalog;
SELECT :"schema".frechet_geojson(a, b, eps) = j AS same_under_pg_catalog FROM public.gj ORDER BY id;
RESET search_path;

DROP TABLE gj, gj_pair;
