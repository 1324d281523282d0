#!/usr/bin/env bash
# Screenshot test of the demo report: plays the demo (demo/play.sh) on a
# running server (PGHOST, PGPORT, PGUSER), checks the analyst's answers
# printed, then renders demo report.html in headless Chromium (Debian's
# chromium), dumps the DOM and takes a screenshot, and checks both
# (check.mjs).  Prints TAP lines and "1..N"; exits non-zero on failure.
set -uo pipefail
cd "$(dirname "$0")/../.."
WORK=$(mktemp -d /tmp/frechet_report.XXXXXX)
trap 'rm -rf "$WORK"' EXIT
n=0
bad=0
# Reports one check: ok when the command succeeds.
check() {
	local what=$1
	shift
	n=$((n + 1))
	if "$@"; then echo "ok $n - $what"; else echo "not ok $n - $what"; bad=$((bad + 1)); fi
}
# True when the demo's output has a table row matching the pattern.
said() { grep -qE -- "$1" "$WORK/play.log" || { echo "# not in the demo output: $1"; return 1; }; }

check "the demo plays (load, queries, report)" bash -c "bash demo/play.sh '$WORK/out' >'$WORK/play.log' 2>&1 || { tail -20 '$WORK/play.log'; exit 1; }"
check "the demo loaded 1,010 trips on 10 lines" said '^ *10 \| +1010 \| +100 \| +[0-9]+ \| +[0-9]+ *$'
check "no ordinary trip flagged; all 110 simulated off-route trips flagged" said '^\| +110 \| +20 \| +40 \| +40 \| +10 \| +0 \|$'
check "all 100 unlabelled trips assigned to the line they drove" said '^\| +100 \| +100 \| +[0-9.]+ \| +[0-9]+ \|$'
check "the 10 most similar trips come through the GiST index" said 'Index Scan using trip_track_idx on trip'
check "all 40 partial trips found, and only those" said '^\| +40 \| +40 \|$'
check "road works: the 6 trips sent round by Tanners Row drove it" said '^\| sent round by Tanners Row +\| +6 \| +6 \|$'
check "road works: none of the 14 that stayed on Mill Street, nor the 20 other trips, did" \
	bash -c "grep -qE '^\| stayed on Mill Street +\| +0 \| +14 \|\$' '$WORK/play.log' && grep -qE '^\| ordinary +\| +0 \| +20 \|\$' '$WORK/play.log'"

CHROME=(chromium --headless --no-sandbox --disable-gpu --disable-quic --no-first-run
	--disable-background-networking --disable-component-update --disable-sync
	--window-size=1280,2400)
mkdir -p "$WORK/profile1" "$WORK/profile2"
timeout 120 "${CHROME[@]}" --user-data-dir="$WORK/profile1" --dump-dom "file://$WORK/out/report.html" \
	>"$WORK/dom.html" 2>"$WORK/chrome1.log"
check "chromium dumps the rendered DOM" test -s "$WORK/dom.html"
timeout 120 "${CHROME[@]}" --user-data-dir="$WORK/profile2" --screenshot="$WORK/shot.png" \
	"file://$WORK/out/report.html" >"$WORK/chrome2.log" 2>&1
check "chromium takes a screenshot" test -s "$WORK/shot.png"
[ -n "${REPORT_SHOT:-}" ] && cp "$WORK/shot.png" "$REPORT_SHOT"
if [ -s "$WORK/dom.html" ] && [ -s "$WORK/shot.png" ]; then
	node test/report/check.mjs "$WORK/dom.html" "$WORK/shot.png" >"$WORK/check.log"
	rc=$?
	while read -r line; do
		case "$line" in
			"ok "*) n=$((n + 1)); echo "ok $n - ${line#ok * - }" ;;
			"not ok "*) n=$((n + 1)); bad=$((bad + 1)); echo "not ok $n - ${line#not ok * - }" ;;
		esac
	done <"$WORK/check.log"
	[ "$rc" -eq 0 ] || grep -q '^not ok' "$WORK/check.log" || { n=$((n + 1)); bad=$((bad + 1)); echo "not ok $n - check.mjs failed"; cat "$WORK/check.log"; }
fi
echo "1..$n"
[ "$bad" -eq 0 ]
