-- Operator classes of the extension pass their access method's validator
-- (amvalidate), and frechet_track_ops is the default GiST class of point[],
-- so CREATE INDEX ... USING gist (track) needs no opclass name.
SELECT c.opcname, a.amname, c.opcdefault, c.opcintype::regtype AS for_type,
       c.opckeytype::regtype AS key_type, amvalidate(c.oid) AS valid
FROM pg_opclass c
JOIN pg_am a ON a.oid = c.opcmethod
JOIN pg_depend d ON d.classid = 'pg_opclass'::regclass AND d.objid = c.oid AND d.deptype = 'e'
JOIN pg_extension e ON e.oid = d.refobjid AND e.extname = 'frechet_ext'
ORDER BY c.opcname;

-- Every strategy and support function the class lists.
SELECT o.amopstrategy AS strategy, o.amopopr::regoperator AS operator,
       o.amoppurpose AS purpose,
       (SELECT f.opfname FROM pg_opfamily f WHERE f.oid = o.amopsortfamily) AS sort_family
FROM pg_amop o JOIN pg_opclass c ON c.opcfamily = o.amopfamily
WHERE c.opcname = 'frechet_track_ops'
ORDER BY 1;

SELECT p.amprocnum AS support, p.amproc::regprocedure AS function
FROM pg_amproc p JOIN pg_opclass c ON c.opcfamily = p.amprocfamily
WHERE c.opcname = 'frechet_track_ops'
ORDER BY 1;

-- frechet_at_most carries the planner support function.
SELECT p.proname, p.prosupport::regproc
FROM pg_proc p
WHERE p.proname = 'frechet_at_most';

-- The key type's text form reads back unchanged; bad text and bad keys are refused.
SELECT frechet_track_key('{"(0,0)","(10,1)","(5,-3)"}') AS track_key;
SELECT frechet_reach('{"(0,0)","(10,1)"}', 2.5) AS reach;
SELECT frechet_reach('{"(0,0)","(10,1)"}', 2.5)::text::frechet_key::text = frechet_reach('{"(0,0)","(10,1)"}', 2.5)::text AS round_trip;
SELECT 'start=(-Infinity,-Infinity)..(Infinity,Infinity) end=(0,0)..(1,1) min=(0,0)..(0,0) max=(1,1)..(1,1) reach=0'::frechet_key;
SELECT 'start=(0,0)..(0,0)'::frechet_key;
SELECT 'start=(1,0)..(0,0) end=(0,0)..(1,1) min=(0,0)..(0,0) max=(1,1)..(1,1) reach=0'::frechet_key;
SELECT 'start=(0,0)..(0,0) end=(0,0)..(1,1) min=(0,0)..(0,0) max=(1,1)..(1,1) reach=-1'::frechet_key;
SELECT 'start=(NaN,0)..(0,0) end=(0,0)..(1,1) min=(0,0)..(0,0) max=(1,1)..(1,1) reach=0'::frechet_key;
SELECT 'start=(0,0)..(0,0) end=(0,0)..(1,1) min=(0,0)..(0,0) max=(1,1)..(1,1) reach=0 extra'::frechet_key;
SELECT frechet_reach('{"(0,0)"}', -1);
SELECT frechet_reach('{}', 1);

-- |~~| is the necessary condition: start, end and box sides within the reach.
SELECT '{"(0,0)","(10,0)"}'::point[] |~~| frechet_reach('{"(0,1)","(10,1)"}', 1) AS sides_at_reach,
       '{"(0,0)","(10,0)"}'::point[] |~~| frechet_reach('{"(0,1)","(10,1)"}', 0.999) AS sides_beyond,
       frechet_reach('{"(0,1)","(10,1)"}', 1) |~~| '{"(0,0)","(10,0)"}'::point[] AS commuted,
       '{"(0,0)","(5,4)","(10,0)"}'::point[] |~~| frechet_reach('{"(0,0)","(10,0)"}', 3) AS box_too_tall,
       '{"(0,0)","(5,4)","(10,0)"}'::point[] |~~| frechet_reach('{"(0,0)","(10,0)"}', 4) AS box_within;
