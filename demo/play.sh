#!/usr/bin/env bash
# Plays the demo on a running server (PGHOST, PGPORT, PGUSER as for psql)
# that has frechet_ext installed: creates the database wrenmere, loads the
# town (timed, with progress), runs the analyst's queries and writes the
# report.  demo/run starts a throwaway server and calls this; test/report
# calls it too.
#   bash demo/play.sh [OUTDIR]      (default demo/out; writes OUTDIR/report.html)
set -euo pipefail
cd "$(dirname "$0")/.."
OUT=${1:-demo/out}
mkdir -p "$OUT"
OUT=$(cd "$OUT" && pwd)
psql -X -q -d postgres -c "DROP DATABASE IF EXISTS wrenmere" -c "CREATE DATABASE wrenmere"
export PGDATABASE=wrenmere
psql -X -q -v ON_ERROR_STOP=1 -c "CREATE EXTENSION frechet_ext"
t0=$(date +%s.%N)
# through standard input, so that progress notices print without a file prefix
psql -X -q -v ON_ERROR_STOP=1 <demo/town.sql
t1=$(date +%s.%N)
load_s=$(awk -v a="$t0" -v b="$t1" 'BEGIN { printf "%.1f", b - a }')
echo "-- loaded in $load_s s"
{ cat demo/queries.sql; echo; cat demo/report.sql; } |
	psql -X -q -v ON_ERROR_STOP=1 -v load_s="$load_s" -v outfile="$OUT/report.html"
# The trajectories part needs PostGIS (installed by .ci/deps.sh).
if psql -X -q -At -c "SELECT 1 FROM pg_available_extensions WHERE name = 'postgis'" | grep -q 1; then
	psql -X -q -v ON_ERROR_STOP=1 -v eps=60 <demo/lonlat.sql
else
	echo "-- PostGIS is not installed: the trajectories part (demo/lonlat.sql) is skipped"
fi
echo
echo "-- report: $OUT/report.html ($(wc -c <"$OUT/report.html") bytes; open it in a browser)"
