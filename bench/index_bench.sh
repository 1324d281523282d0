#!/usr/bin/env bash
# Index benchmark: range queries (frechet_at_most) and k-nearest queries
# (ORDER BY track <-> route LIMIT 10) on a table of GPS-like trips, with
# the GiST index and with a sequential scan, in one run on a throwaway
# server; reports times, ratios and the share of (query, trip) pairs each
# stage settles.  See bench/README.md.
#
#   bash bench/index_bench.sh [--tracks N] [--range N] [--range-seq N]
#                             [--knn N] [--knn-seq N] [--corridor N]
#                             [--corridor-seq N] [--seed N]
#
# Defaults: 20,000 trips, 1,000 range queries of which the first 100 also
# run by sequential scan (about 0.7 s each; --range-seq 1000 runs them all),
# 100 k-nearest queries.  A sequential k-nearest query computes 20,000 exact
# distances (about 25 minutes on the plain decider), so by default its time
# is estimated from 200 timed distances; --knn-seq N also runs N for real.
# Corridor queries (frechet_passes on 1 km stretches): 100, the first 10
# also by sequential scan.
# Ratios are per query.
set -euo pipefail
cd "$(dirname "$0")/.."
ROOT=$PWD
tracks=20000 nrange=1000 nrangeseq=100 nknn=100 nknnseq=0 ncorr=100 ncorrseq=10 seed=1
while [ $# -gt 0 ]; do
	case "$1" in
		--tracks) tracks=$2 ;;
		--range) nrange=$2 ;;
		--range-seq) nrangeseq=$2 ;;
		--knn) nknn=$2 ;;
		--knn-seq) nknnseq=$2 ;;
		--corridor) ncorr=$2 ;;
		--corridor-seq) ncorrseq=$2 ;;
		--seed) seed=$2 ;;
		*) echo "unknown option $1" >&2; exit 2 ;;
	esac
	shift 2
done

bash .ci/deps.sh
WORK=$(mktemp -d /tmp/frechet_index_bench.XXXXXX)
chmod 755 "$WORK"
cc -O2 -std=c11 -Wall -Wextra -o "$WORK/index_gen" bench/index_gen.c -lm

# Install under the machine-wide lock; the psql session releases it once its
# backend has loaded the library (see index_bench.sql).
exec 9>/tmp/frechet_ext.install.lock
flock 9
make -s all >/dev/null && make -s install >/dev/null
export PGPORT=${PGPORT:-54611}
source .ci/pgserver.sh
pg_throwaway_start
trap 'pg_throwaway_stop; rm -rf "$WORK"' EXIT

psql -X -q -v gen="$WORK/index_gen" -v genopts="--tracks $tracks --seed $seed" \
	-v nrange="$nrange" -v nrangeseq="$nrangeseq" -v nknn="$nknn" -v nknnseq="$nknnseq" -v ncorr="$ncorr" -v ncorrseq="$ncorrseq" \
	-f bench/index_bench.sql -A -F '|' -t -o "$WORK/results.txt" 2>&1 | grep -v '^$' || true
exec 9>&-

awk -F'|' '
	NF == 2 { v[$1] = $2 }
	function pct(a, b) { return b > 0 ? sprintf("%.2f %%", 100 * a / b) : "n/a" }
	END {
		if (!("range idx ms" in v)) { print "benchmark did not finish"; exit 1 }
		rq = v["range seq queries"]; nr = '"$nrange"'; kq = v["knn seq queries"]; nk = '"$nknn"'
		rs = v["range seq ms"] / rq; ri = v["range idx ms"] / nr
		ki = v["knn idx ms"] / nk
		if (kq > 0) { ks = v["knn seq ms"] / kq; kl = sprintf("measured on the first %d", kq) }
		else { ks = v["knn seq estimated ms/query"]; kl = "estimated from 200 distances" }
		pairs = v["trips"] * nr; cand = v["range candidates"]
		printf "\n%d trips, %.0f points mean (sd %.0f), %d routes; index %.1f MB, built in %.1f s\n\n",
			v["trips"], v["points mean"], v["points sd"], v["routes"], v["index MB"], v["index build ms"] / 1000
		printf "| queries | sequential scan | GiST index | ratio (seq / index) |\n|---|---|---|---|\n"
		printf "| range, %d (seq: first %d) | %.1f ms/query (%.1f s total) | %.2f ms/query (%.2f s total) | %.0fx |\n",
			nr, rq, rs, v["range seq ms"] / 1000, ri, v["range idx ms"] / 1000, rs / ri
		printf "| k-nearest k=10, %d (seq: %s) | %.0f ms/query | %.1f ms/query (%.2f s total) | %.0fx |\n\n",
			nk, kl, ks, ki, v["knn idx ms"] / 1000, ks / ki
		printf "answers: range %d rows found, %d of %d queries differ between plans; k-nearest %d of %d differ\n\n",
			v["range found all"], v["range mismatches"], rq, v["knn mismatches"] + 0, kq + 0
		printf "| range stage | (query, trip) pairs settled | share of all pairs | share of index candidates |\n|---|---|---|---|\n"
		printf "| index key (never fetched) | %d | %s | |\n", pairs - cand, pct(pairs - cand, pairs)
		printf "| cheap bounds: far | %d | %s | %s |\n", v["range cheap far"], pct(v["range cheap far"], pairs), pct(v["range cheap far"], cand)
		printf "| cheap bounds: near | %d | %s | %s |\n", v["range cheap near"], pct(v["range cheap near"], pairs), pct(v["range cheap near"], cand)
		printf "| decider | %d | %s | %s |\n\n", v["range decider"], pct(v["range decider"], pairs), pct(v["range decider"], cand)
		kt = v["knn idx tuples after"] - v["knn idx tuples before"]; kp = v["trips"] * nk
		printf "| k-nearest stage | (query, trip) pairs | share |\n|---|---|---|\n"
		printf "| index bound (no exact distance) | %d | %s |\n", kp - kt, pct(kp - kt, kp)
		printf "| exact distance computed | %d | %s |\n\n", kt, pct(kt, kp)
		cq = v["corridor seq queries"]; nc = '"$ncorr"'
		cs = v["corridor seq ms"] / cq; ci = v["corridor idx ms"] / nc
		printf "| corridor (frechet_passes, 1 km stretch) | sequential scan | GiST index | ratio (seq / index) |\n|---|---|---|---|\n"
		printf "| %d queries (seq: first %d) | %.1f ms/query | %.2f ms/query | %.0fx |\n\n", nc, cq, cs, ci, cs / ci
		printf "answers: corridor %d rows found, %d of %d queries differ between plans\n\n",
			v["corridor found all"], v["corridor mismatches"], cq
		cp = v["trips"] * nc; cc = v["corridor candidates"]
		printf "| corridor stage | (query, trip) pairs settled | share of all pairs | share of index candidates |\n|---|---|---|---|\n"
		printf "| index key (never fetched) | %d | %s | |\n", cp - cc, pct(cp - cc, cp)
		printf "| cheap: far (no edge near the start before one near the end) | %d | %s | %s |\n", v["corridor cheap far"], pct(v["corridor cheap far"], cp), pct(v["corridor cheap far"], cc)
		printf "| cheap: near (a greedy coupling within epsilon) | %d | %s | %s |\n", v["corridor cheap near"], pct(v["corridor cheap near"], cp), pct(v["corridor cheap near"], cc)
		printf "| windows (none survives trimming) | %d | %s | %s |\n", v["corridor windows"], pct(v["corridor windows"], cp), pct(v["corridor windows"], cc)
		printf "| decider (sweeps of the windows) | %d | %s | %s |\n", v["corridor decider"], pct(v["corridor decider"], cp), pct(v["corridor decider"], cc)
	}' "$WORK/results.txt"
