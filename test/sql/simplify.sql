-- frechet_simplify: fewer vertices within a Fréchet tolerance (Agarwal,
-- Har-Peled, Mustafa & Wang 2005).  The guarantee is recomputed here with
-- frechet_distance on generated tracks.
CREATE TABLE simplify_tracks AS
SELECT i, array(SELECT point(k * 7 + 3 * sin(k * i), 2 * cos(k + i) + k % 5)
                FROM generate_series(0, 20 + i * 3) k) AS t
FROM generate_series(1, 40) i;

SELECT count(*) AS tracks,
       count(*) FILTER (WHERE frechet_distance(frechet_simplify(t, tol), t) <= tol * (1 + 1e-12)) AS within_tolerance,
       count(*) FILTER (WHERE array_length(frechet_simplify(t, tol), 1) < array_length(t, 1)) AS smaller,
       count(*) FILTER (WHERE (frechet_simplify(t, tol))[1] ~= t[1]
                          AND (frechet_simplify(t, tol))[array_length(frechet_simplify(t, tol), 1)] ~= t[array_length(t, 1)]) AS ends_kept
FROM simplify_tracks, (VALUES (2.0), (5.0), (20.0)) AS tols(tol);

-- A straight street with repeated fixes keeps only its ends.
SELECT frechet_simplify('{"(0,0)","(0,0)","(1,1)","(2,2)","(2,2)","(3,3)"}', 1e-9) AS straight;
-- A single point stays a point; tolerance 'Infinity' keeps the ends.
SELECT frechet_simplify('{"(4,5)"}', 1) AS point_track,
       frechet_simplify('{"(0,0)","(5,9)","(1,1)"}', 'Infinity') AS infinite;

-- Bad tolerance.
SELECT frechet_simplify('{"(0,0)","(1,1)"}', -1);
SELECT frechet_simplify('{"(0,0)","(1,1)"}', 'NaN');
SELECT frechet_simplify('{}', 1);

DROP TABLE simplify_tracks;
