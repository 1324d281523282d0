-- discrete_frechet_distance on point[] (Eiter & Mannila 1994).

-- Worked by hand: vertex couplings only, so a vertex far from the other
-- curve's vertices counts in full even where the continuous leash is short.
SELECT discrete_frechet_distance('{"(0,0)","(10,0)"}', '{"(0,1)","(5,1)","(10,1)"}') AS discrete,
       frechet_distance('{"(0,0)","(10,0)"}', '{"(0,1)","(5,1)","(10,1)"}') AS continuous;

SELECT discrete_frechet_distance('{"(0,0)"}', '{"(3,4)","(6,8)"}') AS point_to_curve;

-- Symmetric (common practice).
SELECT discrete_frechet_distance(a, b) = discrete_frechet_distance(b, a) AS symmetric
FROM (SELECT '{"(0,0)","(3,4)","(8,2)"}'::point[] AS a,
             '{"(1,0)","(2,2)","(5,5)","(9,1)"}'::point[] AS b) s;
