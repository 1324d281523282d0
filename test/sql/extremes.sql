-- Inputs at the edges of double arithmetic (issue 20): each statement here
-- once hung, or returned a wrong number; now each returns the decider's
-- answer or a documented error.
CREATE FUNCTION pg_temp.try(stmt text) RETURNS text
LANGUAGE plpgsql AS $$
DECLARE
	r text;
BEGIN
	EXECUTE stmt INTO r;
	RETURN 'ok: ' || coalesce(r, 'NULL');
EXCEPTION WHEN OTHERS THEN
	RETURN 'ERROR ' || SQLSTATE || ': ' || SQLERRM;
END
$$;

-- A vertex one float step from a segment's line (height 0) looped forever,
-- deaf to cancel; statement_timeout would not have stopped it either.
SET statement_timeout = '20s';
SELECT frechet_distance('{"(1,-2)","(0,1.0000000000000002)","(0,1)"}'::point[],
                        '{"(1,-2)","(0,1)"}'::point[]) AS on_the_line;
SELECT frechet_distance('{"(2.6467476451894023,500063.55314100382)","(0.73999999999999988,500066.42999999999)","(0.73999999999999999,500066.42999999999)"}'::point[],
                        '{"(2.6467476451894023,500063.55314100382)","(0.73999999999999999,500066.42999999999)"}'::point[]) > 0 AS one_step_apart;
-- the distance is the decision's threshold there
WITH d AS (SELECT frechet_distance('{"(1,-2)","(0,1.0000000000000002)","(0,1)"}'::point[],
                                   '{"(1,-2)","(0,1)"}'::point[]) AS d)
SELECT frechet_at_most('{"(1,-2)","(0,1.0000000000000002)","(0,1)"}'::point[], '{"(1,-2)","(0,1)"}'::point[], d) AS at_d,
       frechet_at_most('{"(1,-2)","(0,1.0000000000000002)","(0,1)"}'::point[], '{"(1,-2)","(0,1)"}'::point[], d * (1 - 1e-9)) AS below_d
FROM d;
SELECT count(*) AS matching_steps FROM frechet_matching('{"(1,-2)","(0,1.0000000000000002)","(0,1)"}'::point[], '{"(1,-2)","(0,1)"}'::point[]);
RESET statement_timeout;

-- Coordinates spanning more than 2^300 (squares would underflow): refused
-- with 22003 by every function, never answered wrongly.
SELECT pg_temp.try($$SELECT frechet_distance('{"(-1.6e-162,0)","(0,0)"}'::point[], '{"(0,0)","(0,1)","(0,0)"}'::point[])$$) AS tiny_edge;
SELECT pg_temp.try($$SELECT frechet_distance('{"(0,0)","(10,0)"}'::point[], '{"(0,1e-200)","(10,0)"}'::point[])$$) AS offset_1e_200;
SELECT pg_temp.try($$SELECT frechet_at_most('{"(0,0)","(10,0)"}'::point[], '{"(0,1e-160)","(10,0)"}'::point[], 0)$$) AS decision_1e_160;
SELECT pg_temp.try($$SELECT discrete_frechet_distance('{"(0,0)","(10,0)"}'::point[], '{"(0,1e-160)","(10,0)"}'::point[])$$) AS discrete_1e_160;
SELECT pg_temp.try($$SELECT frechet_partial_distance('{"(0,0)","(10,0)"}'::point[], '{"(0,1e-160)","(10,0)"}'::point[])$$) AS partial_1e_160;
-- within range the offset comes back exactly: the distance of two
-- segments that share an end and start delta apart is delta
SELECT frechet_distance('{"(0,0)","(10,0)"}'::point[], '{"(0,1e-80)","(10,0)"}'::point[]) = 1e-80 AS offset_1e_80;
-- a pair tiny as a whole is scaled, not refused
SELECT frechet_distance('{"(0,0)","(1e-200,0)"}'::point[], '{"(0,1e-210)","(1e-200,0)"}'::point[]) = 1e-210 AS tiny_pair;

-- A partial match never returns a part farther than epsilon.
SELECT route_from, route_to, distance <= 1 AS within_eps
FROM frechet_partial_match('{"(0,0.0671)","(1.436,1.436)"}'::point[], '{"(1.436,1.436)","(-1e11,-1e11)"}'::point[], 1.0);
SELECT route_from, route_to, distance < 1e-15 AS within_rounding
FROM frechet_partial_match('{"(1e-17,0)","(0,0)"}'::point[], '{"(0,0)","(1e-17,0)","(-100,-100)","(0,0)"}'::point[], 0);

-- A million parked points at exactly epsilon: settled at once (it took
-- minutes when every vertex pair had to be visited).
SET statement_timeout = '20s';
SET frechet_ext.max_memory = '1GB';
SELECT frechet_at_most(array_fill(point(1,1), array[1000000]), array_fill(point(1,2), array[1000000]), 1) AS parked_at_eps,
       frechet_at_most(array_fill(point(1,1), array[1000000]), array_fill(point(1,2), array[1000000]), 0.999999) AS parked_below,
       frechet_distance(array_fill(point(1,1), array[1000000]), array_fill(point(1,2), array[1000000])) AS parked_distance;
RESET frechet_ext.max_memory;
RESET statement_timeout;
