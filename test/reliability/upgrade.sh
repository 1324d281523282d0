#!/usr/bin/env bash
# Upgrades: for every extension of this tree (./*.control) and every older
# version the server offers (pg_available_extension_versions, fed by the
# sql/<ext>--<version>.sql and sql/<ext>--<from>--<to>.sql files that
# `make install` copies), CREATE EXTENSION ... VERSION '<old>' followed by
# ALTER EXTENSION ... UPDATE must give the same schema as a fresh install.
# New releases are covered as soon as their scripts exist; nothing here
# names a version.
#
# "Schema" is pg_dump --schema-only --binary-upgrade of the database (which
# writes out every member of an extension: functions with all their
# attributes, operators, types, operator classes, casts, comments, grants
# and membership), less the lines that carry OIDs or per-run keys.
#
# The comparison itself is tested on a synthetic older version built from
# the current install script (its COMMENT statements moved into an upgrade
# script): the correct upgrade must compare equal, and one that forgets a
# COMMENT, or a fresh install with one changed COST, must not.  Its two
# scripts are put into the server's extension directory for the run and
# removed afterwards (run under test/run's install lock).
set -uo pipefail
cd "$(dirname "$0")"
source ./lib.sh
ROOT=$(cd ../.. && pwd)
OUT=$(mktemp -d /tmp/frechet_upgrade.XXXXXX)
PG_BIN=${PG_BIN:-/usr/lib/postgresql/15/bin}
SHAREDIR=$("${PG_CONFIG:-$PG_BIN/pg_config}" --sharedir)/extension
DB=frechet_rel_upgrade

# The schema of database $1, normalised, on stdout: besides the lines that
# carry OIDs, the OIDs of extension configuration tables (PostGIS's
# spatial_ref_sys) and their transaction ids are blanked, and the list of
# an extension's required extensions is sorted (pg_dump prints it in
# pg_depend's physical order, which ALTER EXTENSION UPDATE rewrites).
schema_of() {
	"$PG_BIN/pg_dump" --schema-only --binary-upgrade -d "$1" | grep -vE '^--|^$|^\\(un)?restrict |binary_upgrade_set_next_|binary_upgrade_set_record_init_privs' |
		perl -pe "s/relfrozenxid = '\\d+', relminmxid = '\\d+'/relfrozenxid = 'X', relminmxid = 'X'/;
			s/^WHERE oid = '\\d+';\$/WHERE oid = 'X';/;
			if (/binary_upgrade_create_empty_extension/) {
				s/'\\{[0-9,]+\\}'/'{X}'/;
				s/ARRAY\\[([^\\]]+)\\]/'ARRAY[' . join(',', sort split(m{,}, \$1)) . ']'/e;
			}"
}

# Installs $1 (extension) at version $2 ('' for the default) into a fresh
# database and, when $3 is "update", updates it to the default version.
install_into() {
	local ext=$1 version=$2 mode=$3
	rpsql -d postgres -c "SET client_min_messages = warning" -c "DROP DATABASE IF EXISTS $DB" \
		-c "CREATE DATABASE $DB" >/dev/null || return 1
	rpsql -d "$DB" -c "CREATE EXTENSION $ext ${version:+VERSION '$version'} CASCADE" >/dev/null || return 1
	if [ "$mode" = update ]; then
		rpsql -d "$DB" -c "ALTER EXTENSION $ext UPDATE" >/dev/null || return 1
	fi
}

# Compares the schema after "old version + update" with a fresh install.
check_update() {
	local ext=$1 from=$2 default=$3 path
	path=$(rpsql -d "$DB" -c "SELECT path FROM pg_extension_update_paths('$ext') WHERE source = '$from' AND target = '$default'")
	if ! install_into "$ext" "$from" update; then
		tap 1 "upgrade: $ext $from -> $default: CREATE EXTENSION VERSION '$from' + ALTER EXTENSION UPDATE failed"
		return
	fi
	schema_of "$DB" >"$OUT/$ext-$from.schema"
	if diff -u "$OUT/$ext.fresh" "$OUT/$ext-$from.schema" >"$OUT/$ext-$from.diff"; then
		tap 0 "upgrade: $ext $from -> $default (path $path) gives the schema of a fresh install"
	else
		tap 1 "upgrade: $ext $from -> $default (path $path) differs from a fresh install:"
		head -40 "$OUT/$ext-$from.diff" | sed 's/^/    /'
	fi
}

for control in "$ROOT"/*.control; do
	ext=$(basename "$control" .control)
	default=$(sed -n "s/^default_version *= *'\(.*\)'.*/\1/p" "$control")
	if ! install_into "$ext" "" fresh 2>"$OUT/$ext.err"; then
		if grep -q 'is not available' "$OUT/$ext.err"; then
			echo "# upgrade: $ext skipped: a required extension is not installed"
		else
			tap 1 "upgrade: $ext: fresh install failed: $(head -1 "$OUT/$ext.err")"
		fi
		continue
	fi
	schema_of "$DB" >"$OUT/$ext.fresh"
	mapfile -t older < <(rpsql -d "$DB" -c "SELECT version FROM pg_available_extension_versions WHERE name = '$ext' AND version <> '$default' AND version NOT LIKE '%selftest%' ORDER BY version")
	if [ "${#older[@]}" -eq 0 ]; then
		echo "# upgrade: $ext: no released version before $default yet"
	fi
	for from in "${older[@]}"; do
		check_update "$ext" "$from" "$default"
	done
done

# Indexes built under 0.1 answer the same queries after the update, through
# the renamed operators (the strategies and support functions are kept):
# range and nearest-neighbour on point[] and geometry, index against a
# sequential scan.
if rpsql -d "$DB" -c "SELECT 1 FROM pg_available_extension_versions WHERE name = 'frechet_ext_postgis' AND version = '0.1'" | grep -q 1; then
	rpsql -d postgres -c "SET client_min_messages = warning" -c "DROP DATABASE IF EXISTS $DB" -c "CREATE DATABASE $DB" >/dev/null
	got=$(rpsql -d "$DB" -c "SET client_min_messages = warning" \
		-c "CREATE EXTENSION postgis" -c "CREATE EXTENSION frechet_ext VERSION '0.1'" \
		-c "CREATE EXTENSION frechet_ext_postgis VERSION '0.1'" \
		-c "CREATE TABLE u AS SELECT i, array[point(i % 97, i % 89), point(i % 97 + 3, i % 89 + 4)] AS tr,
			ST_MakeLine(ST_MakePoint(i % 97, i % 89), ST_MakePoint(i % 97 + 3, i % 89 + 4)) AS g,
			ST_MakeLine(ST_MakePoint(i % 97 * 0.01, 50 + i % 89 * 0.01), ST_MakePoint(i % 97 * 0.01 + 0.9, 50.2 + i % 89 * 0.01))::geography AS gg
			FROM generate_series(1, 5000) i" \
		-c "CREATE INDEX u_tr ON u USING gist (tr)" -c "CREATE INDEX u_g ON u USING gist (g frechet_geometry_ops)" \
		-c "CREATE INDEX u_gg ON u USING gist (gg frechet_geography_ops)" \
		-c "COMMENT ON INDEX u_tr IS 'trips by shape'" \
		-c "CREATE SCHEMA \"Up Schema\"" \
		-c "CREATE TABLE \"Up Schema\".pt (i int, d int, tr point[]) PARTITION BY RANGE (d)" \
		-c "CREATE TABLE \"Up Schema\".pt1 PARTITION OF \"Up Schema\".pt FOR VALUES FROM (0) TO (10)" \
		-c "CREATE TABLE \"Up Schema\".pt2 PARTITION OF \"Up Schema\".pt FOR VALUES FROM (10) TO (20)" \
		-c "INSERT INTO \"Up Schema\".pt SELECT i, i % 20, tr FROM u" \
		-c "CREATE INDEX \"Trip Shapes\" ON \"Up Schema\".pt USING gist (tr)" \
		-c "CREATE INDEX u_tr_late ON u USING gist (tr) WHERE i > 2500" \
		-c "SET enable_seqscan = off" \
		-c "CREATE TEMP TABLE before_update AS SELECT array_agg(i ORDER BY i) AS ids FROM u WHERE frechet_at_most(tr, '{\"(10,10)\",\"(13,14)\"}', 2)" \
		-c "RESET enable_seqscan" \
		-c "ALTER EXTENSION frechet_ext UPDATE" -c "ALTER EXTENSION frechet_ext_postgis UPDATE" \
		-c "CREATE TEMP TABLE after_update AS SELECT
			(SELECT ids FROM before_update) IS NOT DISTINCT FROM (SELECT array_agg(i ORDER BY i) FROM u WHERE frechet_at_most(tr, '{\"(10,10)\",\"(13,14)\"}', 2)) AS same_answer" \
		-c "CREATE TEMP TABLE q AS SELECT 'tr' AS what, array_agg(i ORDER BY i) AS ids FROM u WHERE frechet_at_most(tr, '{\"(10,10)\",\"(13,14)\"}', 2)
			UNION ALL SELECT 'g', array_agg(i ORDER BY i) FROM u WHERE frechet_at_most(g, 'LINESTRING(10 10, 13 14)'::geometry, 2)
			UNION ALL SELECT 'knn', array_agg(i) FROM (SELECT i FROM u ORDER BY g <~~> 'LINESTRING(10 10, 13 14)'::geometry, i LIMIT 5) k
			UNION ALL SELECT 'gg', array_agg(i ORDER BY i) FROM u WHERE frechet_at_most(gg, 'LINESTRING(0.1 50.1, 1.0 50.3)'::geography, 300)" \
		-c "SELECT 'before update: ' || same_answer FROM after_update" \
		-c "SET enable_indexscan = off" -c "SET enable_bitmapscan = off" \
		-c "SELECT count(*) FILTER (WHERE q.ids = s.ids) || ' of ' || count(*) FROM q JOIN (
			SELECT 'tr' AS what, array_agg(i ORDER BY i) AS ids FROM u WHERE frechet_at_most(tr, '{\"(10,10)\",\"(13,14)\"}', 2)
			UNION ALL SELECT 'g', array_agg(i ORDER BY i) FROM u WHERE frechet_at_most(g, 'LINESTRING(10 10, 13 14)'::geometry, 2)
			UNION ALL SELECT 'knn', array_agg(i) FROM (SELECT i FROM u ORDER BY frechet_distance(g, 'LINESTRING(10 10, 13 14)'::geometry), i LIMIT 5) k
			UNION ALL SELECT 'gg', array_agg(i ORDER BY i) FROM u WHERE frechet_at_most(gg, 'LINESTRING(0.1 50.1, 1.0 50.3)'::geography, 300)) s USING (what)
			WHERE cardinality(q.ids) > 0" 2>&1)
	before=$(echo "$got" | grep '^before update: ')
	got=$(echo "$got" | tail -1)
	if [ "$before" = "before update: true" ]; then
		tap 0 "upgrade: with the new library and 0.1's scripts (before ALTER EXTENSION UPDATE) a 0.1 index answers as after the update"
	else
		tap 1 "upgrade: a 0.1 index before the update, with the new library: ${before:-no answer}"
	fi
	if [ "$got" = "4 of 4" ]; then
		tap 0 "upgrade: indexes built under 0.1 (point[], geometry, geography: rebuilt by the update) give a sequential scan's answers after the update"
	else
		tap 1 "upgrade: indexes built under 0.1 after the update: $got of the queries equal a sequential scan"
	fi
	# The indexes themselves: built again with frechet_summary keys, their names and comment kept.
	keys=$(rpsql -d "$DB" -c "SELECT string_agg(c.relname || ' ' || a.atttypid::regtype::text || coalesce(' (' || obj_description(c.oid, 'pg_class') || ')', ''), ', ' ORDER BY c.relname COLLATE \"C\")
		FROM pg_class c JOIN pg_attribute a ON a.attrelid = c.oid AND a.attnum = 1
		WHERE c.relname IN ('u_tr', 'u_g', 'u_gg', 'u_tr_late', 'Trip Shapes', 'pt1_tr_idx', 'pt2_tr_idx')" 2>&1)
	want="Trip Shapes frechet_summary, pt1_tr_idx frechet_summary, pt2_tr_idx frechet_summary, u_g frechet_summary, u_gg frechet_summary, u_tr frechet_summary (trips by shape), u_tr_late frechet_summary"
	if [ "$keys" = "$want" ]; then
		tap 0 "upgrade: the update builds the indexes again with packed keys (point[], geometry, geography, partial, partitioned in a quoted schema), names and comment kept"
	else
		tap 1 "upgrade: after the update the indexes are: $keys (want: $want)"
	fi
fi

# The comparison tested on a synthetic older version of frechet_ext.
ext=frechet_ext
default=$(sed -n "s/^default_version *= *'\(.*\)'.*/\1/p" "$ROOT/$ext.control")
base=$default-selftest
script="$ROOT/sql/$ext.sql"
perl -0777 -ne 'print join "", grep { !/^\s*COMMENT ON /m || /\\echo/ } split /(?<=;\n)/' "$script" \
	>"$SHAREDIR/$ext--$base.sql"
{
	echo "\\echo Use \"ALTER EXTENSION $ext UPDATE\" to load this file. \\quit"
	perl -0777 -ne 'print join "", grep { /^\s*COMMENT ON /m && !/\\echo/ } split /(?<=;\n)/' "$script"
} >"$SHAREDIR/$ext--$base--$default.sql"
cleanup() {
	rm -f "$SHAREDIR/$ext--$base.sql" "$SHAREDIR/$ext--$base--$default.sql"
}
trap cleanup EXIT
if grep -q '^COMMENT ON' "$SHAREDIR/$ext--$base--$default.sql" && install_into "$ext" "" fresh; then
	schema_of "$DB" >"$OUT/$ext.fresh"
	check_update "$ext" "$base" "$default"
	# the same upgrade, one COMMENT short: must differ
	perl -0777 -i -pe 's/\nCOMMENT ON [^;]*;\n/\n/' "$SHAREDIR/$ext--$base--$default.sql"
	ok=1
	if install_into "$ext" "$base" update; then
		schema_of "$DB" >"$OUT/short.schema"
		cmp -s "$OUT/$ext.fresh" "$OUT/short.schema" || ok=0
	fi
	tap $ok "upgrade: the comparison tells an upgrade script that forgets a COMMENT from a fresh install"
	# a fresh install with one COST changed: must differ
	ok=1
	alter=$(rpsql -d "$DB" -c "SELECT format('ALTER FUNCTION %s COST 1', objid::regprocedure) FROM pg_depend WHERE refobjid = (SELECT oid FROM pg_extension WHERE extname = '$ext') AND classid = 'pg_proc'::regclass AND deptype = 'e' ORDER BY objid LIMIT 1")
	if install_into "$ext" "" fresh && rpsql -d "$DB" -c "$alter" >/dev/null; then
		schema_of "$DB" >"$OUT/cost.schema"
		cmp -s "$OUT/$ext.fresh" "$OUT/cost.schema" || ok=0
	fi
	tap $ok "upgrade: the comparison tells a changed COST ($alter) from a fresh install"
else
	tap 1 "upgrade: synthetic older version of $ext could not be built"
fi

rpsql -d postgres -c "DROP DATABASE IF EXISTS $DB" >/dev/null 2>&1
rm -rf "$OUT"
[ "$TAP_FAILED" -eq 0 ]
