-- frechet_at_most on point[]: the decision agrees with the distance.
CREATE TABLE decide_pairs AS
SELECT i,
       array(SELECT point(k * 10 + 3 * sin(i * k), 2 * cos(i + k)) FROM generate_series(0, 5 + i % 7) k) AS a,
       array(SELECT point(k * 7 + 2 * cos(i * k), 3 * sin(i - k)) FROM generate_series(0, 8 + i % 5) k) AS b
FROM generate_series(1, 40) i;

-- The distance is the threshold: true at d, false just below (our exactness contract).
SELECT count(*) AS pairs,
       count(*) FILTER (WHERE frechet_at_most(a, b, d)) AS true_at_d,
       count(*) FILTER (WHERE NOT frechet_at_most(a, b, d * (1 - 1e-9))) AS false_below_d
FROM (SELECT a, b, frechet_distance(a, b) AS d FROM decide_pairs) s;

-- Common practice: the discrete distance bounds the continuous one from above
-- (Eiter & Mannila 1994: d <= d_discrete <= d + longest edge).
SELECT count(*) FILTER (WHERE frechet_distance(a, b) <= discrete_frechet_distance(a, b) * (1 + 1e-12)) AS bounded
FROM decide_pairs;

-- epsilon = +Infinity is always true; epsilon = 0 only for equal curves.
SELECT frechet_at_most('{"(0,0)","(1,1)"}', '{"(5,5)","(9,9)"}', 'Infinity') AS infinite,
       frechet_at_most('{"(0,0)","(1,1)"}', '{"(0,0)","(0.5,0.5)","(1,1)"}', 0) AS zero_equal,
       frechet_at_most('{"(0,0)","(1,1)"}', '{"(0,0)","(1,1.000001)"}', 0) AS zero_different;

-- A point against a curve.
SELECT frechet_at_most('{"(0,0)"}', '{"(3,4)","(0,1)"}', 5) AS point_yes,
       frechet_at_most('{"(0,0)"}', '{"(3,4)","(0,1)"}', 4.999) AS point_no;

DROP TABLE decide_pairs;
