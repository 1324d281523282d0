#!/usr/bin/env bash
# Memory: one query calls frechet_distance 1,000,000 times over
# generate_series, on small generated tracks, and the backend's resident
# memory (VmRSS of /proc/<backend pid>/status, read by the backend itself)
# must stay within 10 % of what it was after a warm-up with the same query
# shape.  A leak of 8 bytes a call would show as about 8 MB, over half of
# a fresh backend's RSS.  The other functions get shorter runs of the same
# check, and so does the error path (calls that raise, caught in PL/pgSQL);
# set-returning functions run both in FROM and in the select list, on
# point[] and, when PostGIS is installed, on geometry and geography.
#
# jit is off: with the functions' high COST, PostgreSQL would JIT-compile
# these queries, and LLVM's own memory (tens of MB) would blur the figure.
set -uo pipefail
cd "$(dirname "$0")"
source ./lib.sh

DB=frechet_rel_memory
MEMORY_CALLS=${MEMORY_CALLS:-1000000}
fresh_db "$DB" || { tap 1 "memory: database set-up"; exit 1; }
export PGDATABASE=$DB

# Small tracks that vary with i: one call in five takes the full search of
# the distance (type (b) sampling and bisection), the others end early.
A="CASE WHEN i % 5 = 0 THEN ARRAY[point(0, 0), point(1 + i % 7, 1), point(5, i % 3), point(9, 0)]
        ELSE ARRAY[point(0, 0), point(1 + i % 7, i % 2), point(9, 0)] END"
B="ARRAY[point(0, 1), point(4, (i % 5) - 2), point(9, 1)]"

# Runs one query twice in one session (warm-up of 10,000 rows, then the
# measured run) and checks the RSS.  $1 label, $2 the query, where ROWS
# stands for the number of rows, $3 that number; $4, when given, a bound
# in kB on the growth of RssAnon too (the heap, which a leak grows first).
measure_query() {
	local label=$1 query=$2 rows=$3 max_anon=${4:-} out before after anon0 anon1 rc
	out=$(rpsql <<SQL
SET jit = off;
${query//ROWS/10000};
SELECT 'BEFORE ' || $RSS_SQL || ' ' || $ANON_SQL;
${query//ROWS/$rows};
SELECT 'AFTER ' || $RSS_SQL || ' ' || $ANON_SQL;
SQL
	)
	read -r before anon0 < <(sed -n 's/^BEFORE //p' <<<"$out")
	read -r after anon1 < <(sed -n 's/^AFTER //p' <<<"$out")
	if [ -z "${before:-}" ] || [ -z "${after:-}" ]; then
		tap 1 "memory: $label: not measured"
		sed 's/^/    /' <<<"$out" | head -10
		return
	fi
	rc=$(awk -v a="$before" -v b="$after" -v a0="$anon0" -v a1="$anon1" -v m="$max_anon" \
		'BEGIN { print (b <= 1.10 * a && (m == "" || a1 - a0 <= m)) ? 0 : 1 }')
	tap "$rc" "memory: $label, $rows calls in one query: VmRSS $before -> $after kB ($(awk -v a="$before" -v b="$after" 'BEGIN { printf "%+.1f", 100 * (b - a) / a }') %), RssAnon $anon0 -> $anon1 kB"
}

# One scalar expression over i in the select list.  $1 label, $2 the
# expression, $3 number of rows.
measure() {
	measure_query "$1" "SELECT count($2) FROM (SELECT generate_series(1, ROWS) AS i) s" "$3"
}

# A set-returning call over i, both in FROM (a function scan, LATERAL) and
# in the select list (ProjectSet); each runs the function once a row.
# $1 label, $2 the call, $3 number of rows.  Besides VmRSS, RssAnon may
# grow by at most 512 kB: 25 bytes a call over 20,000 calls.
measure_srf() {
	measure_query "$1 in FROM" "SELECT count(*) FROM (SELECT generate_series(1, ROWS) AS i) s, LATERAL $2 AS r" "$3" 512
	measure_query "$1 in the select list" "SELECT count(r) FROM (SELECT $2 AS r FROM (SELECT generate_series(1, ROWS) AS i) s) t" "$3" 512
}

measure "frechet_distance" "frechet_distance($A, $B)" "$MEMORY_CALLS"
measure "frechet_at_most" "frechet_at_most($A, $B, 1.5)" 100000
measure "discrete_frechet_distance" "discrete_frechet_distance($A, $B)" 100000
measure "<->" "($A) <-> ($B)" 100000

# Set-returning functions (materialized results: a tuple store and its
# descriptor each call).
measure_srf "frechet_matching" "frechet_matching($A, $B)" 30000
measure_srf "frechet_excursions" "frechet_excursions($A, $B, 1.5)" 30000
measure_srf "frechet_partial_match" "frechet_partial_match($B, $A, 1.5)" 30000
measure_srf "frechet_bottleneck" "frechet_bottleneck($A, $B)" 30000
measure_srf "frechet_progress" "frechet_progress($A, $B, 1.5)" 30000
measure_srf "frechet_pings_excursions" "frechet_pings_excursions($A, $B, 1.5)" 30000

# The same on geometry and geography, when PostGIS is installed.
if rpsql -c "SET client_min_messages = warning" -c "CREATE EXTENSION frechet_ext_postgis CASCADE" >/dev/null 2>&1; then
	GA="ST_MakeLine(ARRAY[ST_MakePoint(0, 0), ST_MakePoint(1 + i % 7, i % 2), ST_MakePoint(9, 0)])"
	GB="ST_MakeLine(ARRAY[ST_MakePoint(0, 1), ST_MakePoint(4, (i % 5) - 2), ST_MakePoint(9, 1)])"
	measure_srf "frechet_matching(geometry)" "frechet_matching($GA, $GB)" 20000
	measure_srf "frechet_excursions(geometry)" "frechet_excursions($GA, $GB, 1.5)" 20000
	measure_srf "frechet_partial_match(geometry)" "frechet_partial_match($GB, $GA, 1.5)" 20000
	measure_srf "frechet_bottleneck(geometry)" "frechet_bottleneck($GA, $GB)" 20000
	# geography at a thousandth of the scale (edges of about 1 km, as tracks
	# have them: longer edges are cut along their geodesics, and cost more)
	GGA="ST_Scale($GA, 0.001, 0.001)::geography"
	GGB="ST_Scale($GB, 0.001, 0.001)::geography"
	measure_srf "frechet_matching(geography)" "frechet_matching($GGA, $GGB)" 20000
	measure_srf "frechet_excursions(geography)" "frechet_excursions($GGA, $GGB, 150)" 20000
	measure_srf "frechet_progress(geography)" "frechet_progress($GGA, $GGB, 150)" 20000
else
	tap 0 "memory: # SKIP PostGIS is not installed: no geometry or geography runs"
fi

# The error path: each call raises (a NaN coordinate), PL/pgSQL catches it.
rpsql >/dev/null <<'SQL'
CREATE FUNCTION raise_many(n int) RETURNS int LANGUAGE plpgsql AS $$
DECLARE
	caught int := 0;
BEGIN
	FOR i IN 1..n LOOP
		BEGIN
			PERFORM frechet_distance(ARRAY[point(0, 0), point(i, 'NaN')], ARRAY[point(0, 1)]);
		EXCEPTION WHEN data_exception THEN
			caught := caught + 1;
		END;
	END LOOP;
	RETURN caught;
END $$;
SQL
measure "errors caught in PL/pgSQL" "raise_many(i % 2 + 9)" 10000

rpsql -d postgres -c "DROP DATABASE $DB" >/dev/null
[ "$TAP_FAILED" -eq 0 ]
