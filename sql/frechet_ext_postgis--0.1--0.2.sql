-- frechet_ext_postgis 0.1 -> 0.2.
\echo Use "ALTER EXTENSION frechet_ext_postgis UPDATE TO '0.2'" to load this file. \quit

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
