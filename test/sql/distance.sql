-- frechet_distance and the <-> operator on point[]: good input.
-- Each check names its source: a published result or common practice.

-- Alt & Godau 1995: two single segments are at the larger end distance.
SELECT frechet_distance('{"(0,0)","(10,0)"}', '{"(0,3)","(10,4)"}') AS two_segments;

-- Worked by hand: a vertex 3 above a segment (a type b critical value).
SELECT round(frechet_distance('{"(0,0)","(10,0)"}', '{"(0,0)","(5,3)","(10,0)"}')::numeric, 12) AS tent;

-- Worked by hand: a back-and-forth move forces a passage at sqrt(2) (type c).
SELECT round(frechet_distance('{"(0,0)","(10,0)"}', '{"(0,0)","(6,1)","(4,-1)","(10,0)"}')::numeric, 12) AS passage,
       round(sqrt(2)::numeric, 12) AS sqrt2;

-- Order matters (the point of the measure): the same street driven backwards.
SELECT frechet_distance('{"(0,0)","(100,0)"}', '{"(100,0)","(0,0)"}') AS reversed;

-- Common practice: a translated copy is at the length of the shift.
SELECT round(frechet_distance(t, array(SELECT point(p[0] + 3, p[1] + 4) FROM unnest(t) AS p))::numeric, 12) AS shifted
FROM (SELECT '{"(0,0)","(2,5)","(7,1)","(9,9)","(12,3)"}'::point[] AS t) s;

-- Common practice: symmetric; <-> is the same function and its own commutator.
SELECT frechet_distance(a, b) = frechet_distance(b, a) AS symmetric,
       (a <-> b) = frechet_distance(a, b) AS operator_same
FROM (SELECT '{"(0,0)","(3,4)","(8,2)"}'::point[] AS a,
             '{"(1,0)","(2,2)","(5,5)","(9,1)"}'::point[] AS b) s;
SELECT oprname, oprcom::regoper AS commutator
FROM pg_operator WHERE oprname = '<->' AND oprleft = 'point[]'::regtype;

-- One-point curves are points: the farthest vertex of the other curve.
SELECT frechet_distance('{"(0,0)"}', '{"(3,4)","(0,1)","(-6,8)"}') AS point_to_curve,
       frechet_distance('{"(1,1)"}', '{"(4,5)"}') AS point_to_point;

-- Common practice: repeated fixes and collinear vertices change nothing.
SELECT frechet_distance('{"(0,0)","(0,0)","(5,0)","(10,0)","(10,0)"}', '{"(0,1)","(10,1)"}') AS repeated;

-- Web-Mercator-sized coordinates keep their precision (shift to a local origin).
SELECT round(frechet_distance('{"(10000000,5000000)","(10000010,5000000)"}',
                              '{"(10000000,5000000.25)","(10000005,5000001)","(10000010,5000000.25)"}')::numeric, 12) AS mercator;

-- Identical curves are at distance 0.
SELECT frechet_distance(t, t) AS same FROM (SELECT '{"(1,2)","(3,5)","(8,8)"}'::point[] AS t) s;

-- Labels the planner and the catalog see.
SELECT proname, provolatile, proisstrict, proparallel, procost > 1000 AS expensive,
       obj_description(oid, 'pg_proc') IS NOT NULL AS commented
FROM pg_proc WHERE proname IN ('frechet_distance', 'frechet_at_most', 'discrete_frechet_distance')
ORDER BY proname;
