#!/usr/bin/env bash
# Cancel: each call of cancel_calls.txt runs on an adversarial pair of
# 200,000 x 200,000 vertices under statement_timeout = '1s'.  The ERROR
# (57014, query_canceled) must arrive within CANCEL_BOUND_MS (1500) of the
# statement's start, in the same session, which must stay usable; the
# server must not restart.  Also: a cancel from another session
# (pg_cancel_backend) must land within USER_CANCEL_BOUND_MS (500), and the
# backend's memory must not grow over the cancelled calls (a leak of the
# scratch memory would show: about 29 MB a call).
#
# The pair: two zig-zags in opposite phase, so that nearly all of the free
# space stays open and no pruning can skip it (the decision at eps = 6
# visits all 4e10 cells).  A call that finishes within the second is a
# failure too: the pair would no longer test cancellation.
#
# Elapsed times are measured by the server's clock_timestamp() around the
# statement, in the same session (an upper bound: it includes a round trip).
set -uo pipefail
cd "$(dirname "$0")"
source ./lib.sh

CANCEL_BOUND_MS=${CANCEL_BOUND_MS:-1500}
USER_CANCEL_BOUND_MS=${USER_CANCEL_BOUND_MS:-500}
DB=frechet_rel_cancel
OUT=$(mktemp -d /tmp/frechet_cancel.XXXXXX)

fresh_db "$DB" || { tap 1 "cancel: database set-up"; exit 1; }
export PGDATABASE=$DB
rpsql <<'SQL' || { tap 1 "cancel: adversarial pair"; exit 1; }
-- Scattered points that keep the free space open but full of holes, then
-- two far points visited in opposite orders: no filter settles a decision,
-- nothing prunes, and the answer is known only at the very end.
CREATE TABLE adversarial_pair AS
SELECT '{"(0,0)"}'::point[] || array(SELECT point(cos(i * 2.4), sin(i * 1.7)) FROM generate_series(1, 200000) i)
           || '{"(0,20)","(20,20)","(10,0)"}'::point[] AS a,
       '{"(0,0)"}'::point[] || array(SELECT point(cos(i * 2.4 + 1), sin(i * 1.7 + 2)) FROM generate_series(1, 200000) i)
           || '{"(20,20)","(0,20)","(10,0)"}'::point[] AS b;
SQL

# One session for every call, so that "the session stays usable" is checked
# on the very connection that was cancelled.
mapfile -t calls < <(grep -vE '^\s*(#|$)' cancel_calls.txt)
{
	echo "SELECT pg_backend_pid() AS pid0, pg_postmaster_start_time() AS boot0 \\gset"
	echo "SET statement_timeout = '1s';"
	for k in "${!calls[@]}"; do
		echo "SELECT extract(epoch FROM clock_timestamp()) AS t0 \\gset"
		echo "SELECT ${calls[$k]} FROM adversarial_pair;"
		echo "\\echo RESULT $k :SQLSTATE"
		echo "SELECT 'ELAPSED $k ' || round((extract(epoch FROM clock_timestamp()) - :t0) * 1000)::int;"
		echo "SELECT 'ALIVE $k ' || (pg_backend_pid() = :pid0 AND pg_postmaster_start_time() = :'boot0');"
		echo "SELECT 'RSS $k ' || $RSS_SQL;"
	done
	# the same calls again: a leak grows the backend, the C library's
	# keeping of freed memory does not
	for k in "${!calls[@]}"; do
		echo "SELECT ${calls[$k]} FROM adversarial_pair;"
	done
	echo "SELECT 'RSS again ' || $RSS_SQL;"
} >"$OUT/session.sql"
psql -X -At -f "$OUT/session.sql" >"$OUT/session.out" 2>&1

field() {
	sed -n "s/^$1 $2 //p" "$OUT/session.out" | head -1
}
for k in "${!calls[@]}"; do
	state=$(field RESULT "$k")
	ms=$(field ELAPSED "$k")
	alive=$(field ALIVE "$k")
	what="cancel: ${calls[$k]} on 200,000 x 200,000 under statement_timeout 1s"
	if [ "$state" = "57014" ] && [ -n "$ms" ] && [ "$ms" -le "$CANCEL_BOUND_MS" ] && [ "$alive" = "true" ]; then
		tap 0 "$what: ERROR 57014 after $ms ms, session usable"
	else
		tap 1 "$what: sqlstate '${state:-none}' after '${ms:-?}' ms (bound $CANCEL_BOUND_MS), session usable: '${alive:-no}'"
		sed 's/^/    /' "$OUT/session.out" | head -20
	fi
done

# Memory over the cancelled calls: the first round warms up (the C library
# keeps freed memory, so calls of different sizes raise the backend's
# resident size once); a second round of the same calls must leave it
# within 10 %.
last=$((${#calls[@]} - 1))
rss0=$(field RSS "$last")
rss1=$(field RSS again)
if [ -n "$rss0" ] && [ -n "$rss1" ]; then
	growth=$(awk -v a="$rss0" -v b="$rss1" 'BEGIN { printf "%.1f", 100 * (b - a) / a }')
	tap "$(awk -v a="$rss0" -v b="$rss1" 'BEGIN { print (b <= 1.10 * a) ? 0 : 1 }')" \
		"cancel: backend RSS $rss0 kB after one round of cancelled calls, $rss1 kB after a second round ($growth %)"
else
	tap 1 "cancel: backend RSS not measured"
fi

# A cancel from another session (what a client's Ctrl-C sends).  Both ends
# are timed by the server's clock: when pg_cancel_backend is called, and
# when the cancelled session runs its next statement.
psql -X -At -c "SET statement_timeout = '30s'" \
	-c "SELECT frechet_distance(a, b) /* user-cancel */ FROM adversarial_pair" \
	-c "SELECT 'END ' || extract(epoch FROM clock_timestamp())" >"$OUT/user.out" 2>&1 &
bg=$!
for _ in $(seq 1 100); do
	n=$(rpsql -c "SELECT count(*) FROM pg_stat_activity WHERE state = 'active' AND query LIKE '%user-cancel%' AND pid <> pg_backend_pid()")
	[ "$n" = "1" ] && break
	sleep 0.05
done
sleep 0.3
t0=$(rpsql -c "SELECT extract(epoch FROM clock_timestamp()), pg_cancel_backend(pid) FROM pg_stat_activity WHERE query LIKE '%user-cancel%' AND pid <> pg_backend_pid()" | cut -d'|' -f1)
wait "$bg"
t1=$(sed -n 's/^END //p' "$OUT/user.out")
ms=$(awk -v a="${t0:-0}" -v b="${t1:-0}" 'BEGIN { printf "%d", (b - a) * 1000 }')
if grep -q "canceling statement due to user request" "$OUT/user.out" && [ -n "$t0" ] && [ -n "$t1" ] &&
	[ "$ms" -le "$USER_CANCEL_BOUND_MS" ]; then
	tap 0 "cancel: pg_cancel_backend from another session stops frechet_distance after $ms ms (bound $USER_CANCEL_BOUND_MS ms), session usable"
else
	tap 1 "cancel: pg_cancel_backend: '$(head -1 "$OUT/user.out")' after '$ms' ms (bound $USER_CANCEL_BOUND_MS)"
fi

rpsql -d postgres -c "DROP DATABASE $DB" >/dev/null
rm -rf "$OUT"
[ "$TAP_FAILED" -eq 0 ]
