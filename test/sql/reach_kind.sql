-- frechet_key records the kind of coordinates it summarises: planar
-- (point[], geometry) or Earth-centred metres (geography; its text ends
-- with "earth").  A key of the other kind is refused with 22023, by the
-- operator and by the index alike, instead of being compared silently.
-- (Geometry and geography: postgis_reach_kind.sql.)
CREATE FUNCTION pg_temp.try(stmt text) RETURNS text
LANGUAGE plpgsql AS $$
DECLARE
	res text;
BEGIN
	EXECUTE stmt INTO res;
	RETURN res;
EXCEPTION WHEN OTHERS THEN
	RETURN SQLSTATE || ': ' || SQLERRM;
END $$;

-- text round trip: planar keys as before, Earth-centred ones marked
SELECT frechet_reach('{"(0,0)","(4,3)"}'::point[], 1.5) AS planar;
SELECT 'start=(0,0)..(0,0) end=(4,3)..(4,3) min=(0,0)..(0,0) max=(4,3)..(4,3) reach=1.5 earth'::frechet_key AS earth,
       'start=(0,0)..(0,0) end=(4,3)..(4,3) min=(0,0)..(0,0) max=(4,3)..(4,3) reach=1.5 planar'::frechet_key AS planar_spelt,
       'start=(0,0)..(0,0) end=(4,3)..(4,3) min=(0,0)..(0,0) max=(4,3)..(4,3) reach=0 earth'::frechet_key AS earth_zero,
       'start=(0,0)..(0,0) end=(4,3)..(4,3) min=(0,0)..(0,0) max=(4,3)..(4,3) reach=-0'::frechet_key AS minus_zero_is_planar;
SELECT pg_temp.try($$SELECT 'start=(0,0)..(0,0) end=(4,3)..(4,3) min=(0,0)..(0,0) max=(4,3)..(4,3) reach=1 round'::frechet_key::text$$) AS unknown_kind,
       pg_temp.try($$SELECT 'start=(0,0)..(0,0) end=(4,3)..(4,3) min=(0,0)..(0,0) max=(4,3)..(4,3) reach=-1 earth'::frechet_key::text$$) AS negative_reach;

-- the operator: planar keys work on point[], Earth-centred ones are refused
SELECT frechet_within_reach('{"(0,0)","(4,3)"}'::point[],
                            frechet_reach('{"(0,0.5)","(4,3)"}'::point[], 1)) AS planar_within,
       frechet_within_reach(frechet_reach('{"(0,0.5)","(4,3)"}'::point[], 1),
                            '{"(0,0)","(4,3)"}'::point[]) AS planar_within_swapped;
SELECT pg_temp.try($$SELECT frechet_within_reach('{"(0,0)","(4,3)"}'::point[],
    'start=(0,0.5)..(0,0.5) end=(4,3)..(4,3) min=(0,0.5)..(0,0.5) max=(4,3)..(4,3) reach=1 earth'::frechet_key)::text$$) AS earth_key_on_point_array,
       pg_temp.try($$SELECT ('start=(0,0.5)..(0,0.5) end=(4,3)..(4,3) min=(0,0.5)..(0,0.5) max=(4,3)..(4,3) reach=1000 earth'::frechet_key
    |~~| '{"(0,0)","(4,3)"}'::point[])::text$$) AS earth_key_swapped;

-- the index: the same refusal, also when no row would qualify
CREATE TABLE rk_tracks AS
SELECT i AS id, ARRAY[point(i, 0), point(i + 10, 1)] AS track FROM generate_series(1, 500) i;
CREATE INDEX ON rk_tracks USING gist (track frechet_track_ops);
ANALYZE rk_tracks;
SET enable_seqscan = off;
EXPLAIN (COSTS OFF)
SELECT count(*) FROM rk_tracks
WHERE track |~~| 'start=(0,0)..(0,0) end=(4,3)..(4,3) min=(0,0)..(0,0) max=(4,3)..(4,3) reach=1 earth'::frechet_key;
SELECT pg_temp.try($$SELECT count(*) FROM rk_tracks
    WHERE track |~~| 'start=(0,0)..(0,0) end=(4,3)..(4,3) min=(0,0)..(0,0) max=(4,3)..(4,3) reach=1 earth'::frechet_key$$) AS index_earth_key,
       pg_temp.try($$SELECT count(*) FROM rk_tracks
    WHERE track |~~| 'start=(100,0)..(100,0) end=(110,1)..(110,1) min=(100,0)..(100,0) max=(110,1)..(110,1) reach=1'::frechet_key$$) AS index_planar_key;
RESET enable_seqscan;
SET enable_indexscan = off;
SET enable_bitmapscan = off;
SELECT pg_temp.try($$SELECT count(*) FROM rk_tracks
    WHERE track |~~| 'start=(0,0)..(0,0) end=(4,3)..(4,3) min=(0,0)..(0,0) max=(4,3)..(4,3) reach=1 earth'::frechet_key$$) AS seq_earth_key,
       pg_temp.try($$SELECT count(*) FROM rk_tracks
    WHERE track |~~| 'start=(100,0)..(100,0) end=(110,1)..(110,1) min=(100,0)..(100,0) max=(110,1)..(110,1) reach=1'::frechet_key$$) AS seq_planar_key;
RESET enable_indexscan;
RESET enable_bitmapscan;
DROP TABLE rk_tracks;
