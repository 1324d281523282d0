#!/usr/bin/env bash
# Memory: one query calls frechet_distance 1,000,000 times over
# generate_series, on small generated tracks, and the backend's resident
# memory (VmRSS of /proc/<backend pid>/status, read by the backend itself)
# must stay within 10 % of what it was after a warm-up with the same query
# shape.  A leak of 8 bytes a call would show as about 8 MB, over half of
# a fresh backend's RSS.  The other functions get shorter runs of the same
# check, and so does the error path (calls that raise, caught in PL/pgSQL).
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

# Runs one query shape twice in one session (warm-up of 10,000 rows, then
# the measured run) and checks the RSS.  $1 label, $2 select-list
# expression over i, $3 number of rows.
measure() {
	local label=$1 expr=$2 rows=$3 out before after anon0 anon1
	out=$(rpsql <<SQL
SET jit = off;
SELECT count($expr) FROM (SELECT generate_series(1, 10000) AS i) s;
SELECT 'BEFORE ' || $RSS_SQL || ' ' || $ANON_SQL;
SELECT count($expr) FROM (SELECT generate_series(1, $rows) AS i) s;
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
	tap "$(awk -v a="$before" -v b="$after" 'BEGIN { print (b <= 1.10 * a) ? 0 : 1 }')" \
		"memory: $label, $rows calls in one query: VmRSS $before -> $after kB ($(awk -v a="$before" -v b="$after" 'BEGIN { printf "%+.1f", 100 * (b - a) / a }') %), RssAnon $anon0 -> $anon1 kB"
}

measure "frechet_distance" "frechet_distance($A, $B)" "$MEMORY_CALLS"
measure "frechet_at_most" "frechet_at_most($A, $B, 1.5)" 100000
measure "discrete_frechet_distance" "discrete_frechet_distance($A, $B)" 100000
measure "<->" "($A) <-> ($B)" 100000

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
