-- frechet_ext.max_memory is user-settable, like work_mem; its ceiling,
-- frechet_ext.max_memory_limit, only a superuser may change, and no role
-- can lift max_memory above it.  Run as a role without privileges.
SET client_min_messages = warning;
-- load the library, so that the settings exist
SELECT frechet_distance('{"(0,0)"}'::point[], '{"(0,1)"}'::point[]) AS loaded;
CREATE ROLE frechet_settings_user;
CREATE FUNCTION pg_temp.try(stmt text) RETURNS text
LANGUAGE plpgsql AS $$
BEGIN
	EXECUTE stmt;
	RETURN 'ok';
EXCEPTION WHEN OTHERS THEN
	RETURN SQLSTATE || ': ' || SQLERRM;
END $$;
CREATE FUNCTION pg_temp.try_detail(stmt text) RETURNS text
LANGUAGE plpgsql AS $$
DECLARE
	detail text;
	hint text;
BEGIN
	EXECUTE stmt;
	RETURN 'ok';
EXCEPTION WHEN OTHERS THEN
	GET STACKED DIAGNOSTICS detail = PG_EXCEPTION_DETAIL, hint = PG_EXCEPTION_HINT;
	RETURN SQLSTATE || ': ' || SQLERRM || ' / ' || detail || ' / ' || hint;
END $$;
SELECT name, setting, unit, context FROM pg_settings WHERE name LIKE 'frechet_ext.%' ORDER BY name;

SET ROLE frechet_settings_user;
SELECT current_user, (SELECT rolsuper FROM pg_roles WHERE rolname = current_user) AS superuser;
-- below the ceiling: the user may lower and raise max_memory
SELECT pg_temp.try($$SET frechet_ext.max_memory = '64kB'$$) AS lower,
       current_setting('frechet_ext.max_memory') AS now;
SELECT pg_temp.try($$SET frechet_ext.max_memory = '1GB'$$) AS up_to_the_ceiling,
       current_setting('frechet_ext.max_memory') AS now;
-- above it: refused; the ceiling itself cannot be changed
SELECT pg_temp.try_detail($$SET frechet_ext.max_memory = '2GB'$$) AS above_the_ceiling,
       current_setting('frechet_ext.max_memory') AS now;
SELECT pg_temp.try($$SET frechet_ext.max_memory = '2TB'$$) AS far_above;
SELECT pg_temp.try($$SET frechet_ext.max_memory_limit = '2TB'$$) AS raise_ceiling;
SELECT pg_temp.try($$SET frechet_ext.max_memory_limit = '64kB'$$) AS lower_ceiling;
SELECT pg_temp.try($$SELECT set_config('frechet_ext.max_memory', '4GB', false)$$) AS set_config;
SELECT pg_temp.try($$SELECT set_config('frechet_ext.max_memory_limit', '4GB', false)$$) AS set_config_ceiling;
SELECT current_setting('frechet_ext.max_memory') AS max_memory,
       current_setting('frechet_ext.max_memory_limit') AS max_memory_limit;
RESET frechet_ext.max_memory;
RESET ROLE;

-- A superuser lowers the ceiling below the user's max_memory: the user
-- can neither set max_memory above it nor use more than it, and the
-- error names the ceiling.
SET frechet_ext.max_memory = '256MB';
SET frechet_ext.max_memory_limit = '512kB';
SET ROLE frechet_settings_user;
SELECT current_setting('frechet_ext.max_memory') AS max_memory,
       current_setting('frechet_ext.max_memory_limit') AS max_memory_limit;
SELECT pg_temp.try($$SET frechet_ext.max_memory = '1MB'$$) AS above_lowered_ceiling;
SELECT pg_temp.try($$RESET frechet_ext.max_memory_limit$$) AS reset_ceiling;
SELECT pg_temp.try_detail($$SELECT frechet_distance(array(SELECT point(i, 0) FROM generate_series(1, 2000) i),
                                                    array(SELECT point(i, 1) FROM generate_series(1, 2000) i))$$) AS capped_by_ceiling;
SELECT pg_temp.try($$SELECT count(*) FROM frechet_matching(array(SELECT point(i, 0) FROM generate_series(1, 2000) i),
                                                            array(SELECT point(i, 1) FROM generate_series(1, 2000) i))$$) AS matching_capped;
-- small calls still run
SELECT frechet_distance('{"(0,0)","(10,0)"}'::point[], '{"(0,1)","(10,1)"}'::point[]) AS small_call;
-- the user's own lower max_memory still applies, with its own message
SET frechet_ext.max_memory = '64kB';
SELECT pg_temp.try_detail($$SELECT frechet_distance(array(SELECT point(i, 0) FROM generate_series(1, 2000) i),
                                                    array(SELECT point(i, 1) FROM generate_series(1, 2000) i))$$) AS capped_by_max_memory;
RESET frechet_ext.max_memory;
RESET ROLE;
RESET frechet_ext.max_memory_limit;
RESET frechet_ext.max_memory;
SELECT frechet_distance(array(SELECT point(i, 0) FROM generate_series(1, 2000) i),
                        array(SELECT point(i, 1) FROM generate_series(1, 2000) i)) AS fits_by_default;
DROP ROLE frechet_settings_user;
