-- Operator names of our own: no operator of frechet_ext or
-- frechet_ext_postgis shares its name with an operator of core PostgreSQL,
-- PostGIS or a common contrib extension (trigram, cube, hstore, ltree,
-- intarray, btree_gist, earthdistance), except <->, which is a distance
-- everywhere, as it is here.  The catalogue of this very database is the
-- source: the extensions are installed and their operators read back.
CREATE EXTENSION IF NOT EXISTS postgis;
CREATE EXTENSION frechet_ext_postgis;
CREATE EXTENSION pg_trgm;
CREATE EXTENSION cube;
CREATE EXTENSION earthdistance;
CREATE EXTENSION hstore;
CREATE EXTENSION ltree;
CREATE EXTENSION intarray;
CREATE EXTENSION btree_gist;

CREATE TEMP TABLE op_owner AS
SELECT o.oid, o.oprname, coalesce(e.extname, 'core') AS owner
FROM pg_operator o
LEFT JOIN pg_depend d ON d.classid = 'pg_operator'::regclass AND d.objid = o.oid AND d.deptype = 'e'
LEFT JOIN pg_extension e ON e.oid = d.refobjid;

SELECT ours.oprname AS our_operator,
       coalesce(string_agg(DISTINCT other.owner, ', ' ORDER BY other.owner), '(none)') AS also_named_so_by
FROM (SELECT DISTINCT oprname FROM op_owner WHERE owner IN ('frechet_ext', 'frechet_ext_postgis')) ours
LEFT JOIN op_owner other ON other.oprname = ours.oprname AND other.owner NOT IN ('frechet_ext', 'frechet_ext_postgis')
GROUP BY ours.oprname
ORDER BY 1;

-- The vector-search extension is not packaged for this server here; its
-- operators, from memory of its documentation: <-> (L2), <#> (negative
-- inner product), <=> (cosine), <+> (L1), <~> (Hamming), <%> (Jaccard).
SELECT oprname AS shared_with_vector_search
FROM (SELECT DISTINCT oprname FROM op_owner WHERE owner IN ('frechet_ext', 'frechet_ext_postgis')) ours
WHERE oprname IN ('<#>', '<=>', '<+>', '<~>', '<%>');

DROP EXTENSION btree_gist, intarray, ltree, hstore, earthdistance, cube, pg_trgm;

DROP EXTENSION frechet_ext_postgis;
DROP EXTENSION postgis;
