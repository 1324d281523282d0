#!/usr/bin/env bash
# Our GiST index on a geometry column (frechet_geometry_ops) beside
# PostGIS's own (gist_geometry_ops_2d), on tables of GPS-like trips of two
# sizes in one run on a throwaway server: index builds and sizes, range
# queries (frechet_at_most) with no index, PostGIS's index, ours and both,
# k-nearest queries (ORDER BY geom <~~> route LIMIT 10), the planner's row
# estimates, JIT and parallel plans, and our point[] index beside them.
# Prints Markdown tables, one column per size.  See bench/README.md.
#
#   bash bench/postgis_bench.sh [--sizes "20000 200000"] [--range N] [--seq N]
#                               [--knn N] [--knn-seq N] [--knn-timeout S]
#                               [--est N] [--passes N] [--seed N]
#
# Defaults: sizes 20,000 and 200,000 trips; 100 range queries through each
# index configuration, the first 5 also by sequential scan (no index; about
# 4 s each at 200,000 trips); 20 k-nearest queries through our index, the
# first 2 also without it (a sort over the whole table), each of those
# under a statement timeout of 60 s (a mode whose query times out reads
# n/a and runs no more); 10 queries for estimated against actual rows.
# Index configurations run their queries --passes times (default 2) and
# report the best pass's mean, so that a burst of other work on a shared
# machine weighs less; sequential scans run once.  The default run takes
# about 12 minutes on a 2-core machine.
set -euo pipefail
cd "$(dirname "$0")/.."
sizes="20000 200000" nrange=100 nseq=5 nknn=20 nknnseq=2 knntimeout=60 nest=10 passes=2 seed=1
while [ $# -gt 0 ]; do
	[ $# -ge 2 ] || { echo "option $1 needs a value" >&2; exit 2; }
	case "$1" in
		--sizes) sizes=$2 ;;
		--range) nrange=$2 ;;
		--seq) nseq=$2 ;;
		--knn) nknn=$2 ;;
		--knn-seq) nknnseq=$2 ;;
		--knn-timeout) knntimeout=$2 ;;
		--est) nest=$2 ;;
		--passes) passes=$2 ;;
		--seed) seed=$2 ;;
		*) echo "unknown option $1" >&2; exit 2 ;;
	esac
	shift 2
done
for v in $sizes "$nrange" "$nseq" "$nknn" "$nknnseq" "$knntimeout" "$nest" "$passes" "$seed"; do
	[[ $v =~ ^[1-9][0-9]*$ ]] || { echo "option values must be positive integers (got '$v')" >&2; exit 2; }
done
[ -n "${sizes// /}" ] || { echo "--sizes is empty" >&2; exit 2; }

bash .ci/deps.sh
source .ci/pgserver.sh
WORK=$(mktemp -d /tmp/frechet_postgis_bench.XXXXXX)
chmod 755 "$WORK"
trap 'pg_throwaway_stop; rm -rf "$WORK"' EXIT
cc -O2 -std=c11 -Wall -Wextra -o "$WORK/index_gen" bench/index_gen.c -lm
llvmjit=0
[ -f "$(pg_config --pkglibdir)/llvmjit.so" ] && llvmjit=1

# Build once, under the machine-wide lock (as test/run and index_bench.sh).
exec 9>/tmp/frechet_ext.install.lock
flock 9
make -s all >/dev/null && make -s install >/dev/null
export PGPORT=${PGPORT:-54621}
# the server must not inherit the lock's descriptor (it would hold the lock
# for as long as it runs)
pg_throwaway_start 9>&-
trap 'pg_throwaway_stop; rm -rf "$WORK"' EXIT
exec 9>&-
LIBSO="$(pg_config --pkglibdir)/frechet_ext.so"
t_start=$(date +%s)

files=()
for n in $sizes; do
	db="postgis_bench_$n"
	echo "-- $(date +%T) $n trips: database $db" >&2
	psql -X -q -d postgres -c "SET client_min_messages = warning" -c "DROP DATABASE IF EXISTS $db" -c "CREATE DATABASE $db"
	# Every size loads the library in a new backend: take the lock again
	# (no install is half written while the backend loads it) and note the
	# md5 of the library this size runs; the session releases the lock once
	# its backend has loaded it (see postgis_bench.sql).  No reinstall here:
	# that would rebuild whatever the work tree holds by then.  Should
	# another checkout install meanwhile, the tables end with a warning.
	exec 9>/tmp/frechet_ext.install.lock
	flock 9
	libmd5=$(md5sum "$LIBSO" | cut -d' ' -f1)
	t0=$(date +%s)
	if ! psql -X -q -d "$db" -v gen="$WORK/index_gen" -v genopts="--tracks $n --seed $seed" \
		-v nrange="$nrange" -v nseq="$nseq" -v nknn="$nknn" -v nknnseq="$nknnseq" \
		-v knntimeout="${knntimeout}s" -v nest="$nest" -v npasses="$passes" -v llvmjit="$llvmjit" -v libmd5="$libmd5" \
		-f bench/postgis_bench.sql -A -F '|' -t -o "$WORK/results_$n.txt" 2>&1 | sed -u 's/^/   /' >&2; then
		echo "postgis_bench: the session for $n trips failed" >&2
		exit 1
	fi
	exec 9>&-
	echo "elapsed s|$(($(date +%s) - t0))" >>"$WORK/results_$n.txt"
	psql -X -q -d postgres -c "DROP DATABASE $db"
	files+=("$WORK/results_$n.txt")
done

echo
echo "## postgis_bench: $(date '+%d %B %Y'), $(hostname), $(nproc) cores; $(($(date +%s) - t_start)) s from server start to the last query"
echo
echo "Options: range $nrange queries through each index configuration (first $nseq also by sequential scan);" \
	"k-nearest $nknn through our index (first $nknnseq also by whole-table sort, timeout ${knntimeout} s each);" \
	"$nest queries for estimates; seed $seed.  Timings: max_parallel_workers_per_gather = 0 and jit = off" \
	"unless a row says otherwise; mean ms per query; through an index, the best of $passes passes over the queries."
awk -F'|' -v nrange="$nrange" -v nseq="$nseq" -v nknn="$nknn" -v nknnseq="$nknnseq" -v tmo="$knntimeout" -v nest="$nest" '
	FNR == 1 { nf++ }
	NF == 2 { v[nf, $1] = $2 }
	function has(f, k) { return ((f, k) in v) && v[f, k] != "" }
	function num(x,   a) {
		if (x == "") return "n/a"
		a = x < 0 ? -x : x
		if (a >= 100) return commas(sprintf("%.0f", x))
		if (a >= 10) return sprintf("%.1f", x)
		if (a >= 1) return sprintf("%.2f", x)
		return sprintf("%.3f", x)
	}
	function commas(s,   r) {
		r = ""
		while (length(s) > 3 && substr(s, length(s) - 3, 1) ~ /[0-9]/) { r = "," substr(s, length(s) - 2) r; s = substr(s, 1, length(s) - 3) }
		return s r
	}
	function val(f, k) { return has(f, k) ? num(v[f, k]) : "n/a" }
	function txt(f, k) { return has(f, k) ? v[f, k] : "n/a" }
	function ratio(f, a, b) { return has(f, a) && has(f, b) && v[f, b] > 0 ? sprintf("%.1fx", v[f, a] / v[f, b]) : "n/a" }
	function row(label, kind, a, b,   f, s, c) {
		s = "| " label " |"
		for (f = 1; f <= nf; f++) {
			if (kind == "num") c = val(f, a)
			else if (kind == "txt") c = txt(f, a)
			else if (kind == "ratio") c = ratio(f, a, b)
			else if (kind == "s") c = has(f, a) ? num(v[f, a] / 1000) : "n/a"
			else if (kind == "pct") c = has(f, a) ? sprintf("%.2f %%", 100 * v[f, a]) : "n/a"
			else if (kind == "slow") c = slow(f, a)
			else if (kind == "mism") c = has(f, a) ? v[f, a] " of " v[f, b] : "n/a"
			else if (kind == "jit") c = jit(f, a)
			else if (kind == "par") c = par(f, a)
			s = s " " c " |"
		}
		print s
	}
	function slow(f, m) {
		if (v[f, m " timed out"] > 0) return "n/a (over " tmo " s)"
		if (!has(f, m " ms")) return "n/a"
		return num(v[f, m " ms"]) " (" v[f, m " queries"] " run)"
	}
	function jit(f, p) {
		if (!has(f, p " jit used")) return "n/a"
		if (v[f, p " jit used"] == "no") return "no (plan cost " num(v[f, p " total cost"]) ")"
		return "yes: " num(v[f, p " jit total ms"]) " ms, " v[f, p " jit functions"] " functions (plan cost " num(v[f, p " total cost"]) ")"
	}
	function par(f, p) {
		if (!has(f, p " gather")) return "n/a"
		return (v[f, p " gather"] == "yes" ? "Gather (workers launched: " v[f, p " workers launched"] ")" : "no Gather") \
			", " num(v[f, p " exec ms"]) " ms" (v[f, p " jit used"] == "yes" ? ", JIT " num(v[f, p " jit total ms"]) " ms" : "")
	}
	function header(title,   f, s, d) {
		print ""; print "### " title; print ""
		s = "| measure |"; d = "|---|"
		for (f = 1; f <= nf; f++) { s = s " " commas(sprintf("%d", v[f, "trips"])) " trips |"; d = d "---|" }
		print s; print d
	}
	END {
		for (f = 1; f <= nf; f++) if (!has(f, "range mismatches")) { print "benchmark did not finish (size " f ")"; bad = 1 }
		if (bad) exit 1
		header("Data and index builds")
		row("points per trip (mean)", "num", "points mean")
		row("table size, heap + TOAST (MB)", "num", "table MB")
		row("PostGIS `gist (geom)`: build s", "s", "postgis index build ms")
		row("PostGIS `gist (geom)`: size MB", "num", "postgis index MB")
		row("ours `gist (geom frechet_geometry_ops)`: build s", "s", "ours index build ms")
		row("ours `gist (geom frechet_geometry_ops)`: size MB", "num", "ours index MB")
		row("ours `gist (track)` (point[], frechet_track_ops): build s", "s", "track index build ms")
		row("ours `gist (track)` (point[], frechet_track_ops): size MB", "num", "track index MB")
		row("load, index builds and all queries: elapsed s", "num", "elapsed s")

		header("Range: `count(*) WHERE frechet_at_most(geom, $1, $2)`, ms per query")
		row("no index: sequential scan (first " nseq " queries)", "num", "range seq ms")
		row("PostGIS index only (" nrange " queries)", "num", "range postgis ms")
		row("ours only (" nrange " queries)", "num", "range ours ms")
		row("both (" nrange " queries)", "num", "range both ms")
		row("index the planner takes with both", "txt", "plan both")
		row("PostGIS only / ours only", "ratio", "range postgis ms", "range ours ms")
		row("no index / ours only", "ratio", "range seq ms", "range ours ms")
		row("trips found per query (mean)", "num", "range found mean")
		row("trips found, share of the table", "pct", "range found share")
		row("rows the index hands over per query, PostGIS `&&` (first " nest " queries)", "num", "est postgis candidates")
		row("rows the index hands over per query, ours `\\|~~\\|` (first " nest " queries)", "num", "est ours candidates")
		row("queries whose counts differ between configurations", "mism", "range mismatches", "range compared")
		row("point[]: no index (first " nseq " queries)", "num", "range track seq ms")
		row("point[]: ours `frechet_track_ops` (" nrange " queries)", "num", "range track ms")
		row("point[] index / geometry, ours only", "ratio", "range track ms", "range ours ms")
		row("queries whose point[] count differs from geometry", "mism", "range track mismatches", "range compared")

		header("k-nearest, k = 10: `SELECT id FROM trips ORDER BY geom <~~> $1 LIMIT 10`, ms per query")
		row("ours only (" nknn " queries)", "num", "knn ours ms")
		row("both (" nknn " queries)", "num", "knn both ms")
		row("PostGIS index only: whole-table sort (first " nknnseq ")", "slow", "knn postgis")
		row("no index: whole-table sort (first " nknnseq ")", "slow", "knn none")
		row("no index, estimated: table size x mean exact distance (200 pairs)", "num", "knn none estimated ms")
		row("queries whose 10 ids differ between configurations", "mism", "knn mismatches", "knn compared")

		header("Row estimates: `EXPLAIN (ANALYZE) SELECT * WHERE frechet_at_most(geom, <literal>, eps)`, " nest " queries")
		row("ours only: scan node", "txt", "est ours node")
		row("ours only: geometric mean of estimated / actual rows", "num", "est ours geomean est/actual")
		row("ours only: worst estimated / actual", "num", "est ours worst est/actual")
		row("PostGIS index only: scan node", "txt", "est postgis node")
		row("PostGIS index only: geometric mean of estimated / actual rows", "num", "est postgis geomean est/actual")
		row("PostGIS index only: worst estimated / actual", "num", "est postgis worst est/actual")

		header("JIT and parallel plans of the range query (PostgreSQL defaults for jit_above_cost etc.)")
		row("`jit` in the server configuration", "txt", "jit server setting")
		row("llvmjit.so in the package library directory", "txt", "jit llvmjit.so")
		row("pg_jit_available()", "txt", "jit available")
		row("no index, jit = off (first " nseq " queries)", "num", "range seq ms")
		row("no index, jit = on (same queries)", "num", "range seq jit ms")
		row("no index, jit = on: JIT in EXPLAIN ANALYZE of query 1", "jit", "seq jit on")
		row("ours only, jit = off (" nrange " queries)", "num", "range ours ms")
		row("ours only, jit = on (same queries)", "num", "range ours jit ms")
		row("ours only, jit = on: JIT in EXPLAIN ANALYZE of query 1", "jit", "index jit on")
		row("query 1, no index, serial, jit = off: EXPLAIN ANALYZE ms", "num", "seq jit off exec ms")
		row("query 1, no index, default parallel settings, jit = on", "par", "seq parallel jit on")
		row("query 1, no index, default parallel settings, jit = off", "par", "seq parallel jit off")
		row("max_parallel_workers_per_gather (default of the server)", "txt", "parallel workers per gather")

		header("Versions")
		row("PostgreSQL", "txt", "server version")
		row("PostGIS", "txt", "postgis version")
		row("frechet_ext.so md5 (first 12)", "txt", "library md5")
		for (f = 2; f <= nf; f++) if (v[f, "library md5"] != v[1, "library md5"])
			print "\nWARNING: the sizes ran different builds of frechet_ext.so (another checkout installed during the run)"
		for (f = 1; f <= nf; f++) if (v[f, "geometry differs from point[]"] > 0)
			print "\nWARNING: " v[f, "geometry differs from point[]"] " trips have a geometry that differs from their point[]"
	}' "${files[@]}"
