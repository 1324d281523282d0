#!/usr/bin/env bash
# Parallel query benchmark: SELECT count(*) FROM trips WHERE
# frechet_at_most(track, route, 10) on 100,000 trips, against one route, with 0 (serial), 1, 2
# and 4 parallel workers, in one run on a throwaway server.  Reports the best
# of --reps runs for each and the speed-up against serial.  See bench/README.md.
#
#   bash bench/parallel_bench.sh [--trips N] [--points N] [--reps N]
set -euo pipefail
cd "$(dirname "$0")/.."
trips=100000 points=80 reps=3
while [ $# -gt 0 ]; do
	case "$1" in
		--trips) trips=$2 ;;
		--points) points=$2 ;;
		--reps) reps=$2 ;;
		*) echo "unknown option $1" >&2; exit 2 ;;
	esac
	shift 2
done

bash .ci/deps.sh
exec 9>/tmp/frechet_ext.install.lock
flock 9
make -s all >/dev/null && make -s install >/dev/null
export PGPORT=${PGPORT:-54641}
source .ci/pgserver.sh
pg_throwaway_start
psql -X -q -c "CREATE EXTENSION frechet_ext"
# the backend has loaded the library; other checkouts may install now
exec 9>&-

echo "-- loading $trips trips of about $points points" >&2
psql -X -q -v ON_ERROR_STOP=1 -v trips="$trips" -v points="$points" <<'SQL'
SELECT setseed(0.25) \gset
-- One bus route through town (metres); every trip drives it with 3-8 m of
-- GPS noise, about one fix in five dropped; one in ten takes a detour of
-- 40-140 m.  Near eps = 10 m the cheap bounds settle few trips, so most
-- calls run the decider.
CREATE TABLE route (id int PRIMARY KEY, track point[]);
INSERT INTO route
SELECT 1, array(SELECT point(k * 20.0, 150 * sin(k / 8.0)) FROM generate_series(0, :points - 1) k);
CREATE TABLE trips AS
SELECT i AS id,
       array(SELECT point(k * 20.0 + 8 * random() - 4,
                          150 * sin(k / 8.0) + n * (2 * random() - 1)
                          + CASE WHEN i % 10 = 1 AND k BETWEEN 30 AND 40 THEN 40 + i % 100 ELSE 0 END)
             FROM generate_series(0, :points - 1) k, LATERAL (SELECT 3 + 5 * random() AS n) s
             WHERE k = 0 OR k = :points - 1 OR random() < 0.8) AS track
FROM generate_series(1, :trips) i;
VACUUM ANALYZE trips;
SQL

# Times one query with w workers (0: serial); prints the best of $reps in ms.
run() {
	local w=$1 jit=${2:-off}
	psql -X -q -At -v w="$w" -v reps="$reps" -v jit="$jit" <<'SQL'
SET jit = :jit;
SET bench.reps = :reps;
SET max_parallel_workers = 8;
SET max_parallel_workers_per_gather = :w;
ALTER TABLE trips SET (parallel_workers = :w);
CREATE TEMP TABLE t (ms float8, launched int);
-- EXPLAIN ANALYZE (TIMING OFF) runs the query with no row limit, so it may
-- go parallel (PL/pgSQL's SELECT INTO may not); its Execution Time is the
-- executor's wall time.
DO $$
DECLARE
	plan json;
	r int;
	route point[] := (SELECT track FROM route WHERE id = 1);
BEGIN
	FOR r IN 1 .. current_setting('bench.reps')::int LOOP
		EXECUTE 'EXPLAIN (ANALYZE, FORMAT JSON, TIMING OFF) SELECT count(*) FROM trips WHERE frechet_at_most(track, $1, 10)'
			INTO plan USING route;
		INSERT INTO pg_temp.t VALUES ((plan->0->>'Execution Time')::float8,
			coalesce((regexp_match(plan::text, '"Workers Launched": (\d+)'))[1]::int, 0));
	END LOOP;
END $$;
SELECT round(min(ms)::numeric, 0) || '|' ||
       (SELECT count(*) FROM trips, route WHERE route.id = 1 AND frechet_at_most(trips.track, route.track, 10))
       || '|' || min(launched) FROM t;
SQL
}

echo "-- timing: best of $reps runs each" >&2
base=""
printf '\n%s trips, %s MB heap (%s MB with TOAST), 2 CPU cores on this machine\n\n' "$trips" \
	"$(psql -X -At -c "SELECT pg_relation_size('trips') / 1048576")" \
	"$(psql -X -At -c "SELECT pg_total_relation_size('trips') / 1048576")"
echo "| workers | workers launched | best ms | speed-up vs serial | trips within 10 m |"
echo "|---|---|---|---|---|"
for w in 0 1 2 4; do
	IFS='|' read -r ms n launched < <(run "$w")
	[ -z "$base" ] && base=$ms
	printf '| %s | %s | %s | %.2fx | %s |\n' "$w" "$launched" "$ms" "$(awk -v a="$base" -v b="$ms" 'BEGIN { print a / b }')" "$n"
done
# JIT compiles a query whose estimated cost passes jit_above_cost, which
# these COSTs reach at a few hundred rows; measured once for the record.
IFS='|' read -r ms n launched < <(run 2 on)
printf '| 2, jit = on | %s | %s | %.2fx | %s |\n' "$launched" "$ms" "$(awk -v a="$base" -v b="$ms" 'BEGIN { print a / b }')" "$n"

