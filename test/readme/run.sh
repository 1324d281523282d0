#!/usr/bin/env bash
# Runs every ```sql example of README.md as printed, in a database that has
# both extensions (and PostGIS) installed, as users have them together:
# an example must not fail there (the first query once failed with
# "function frechet_distance(unknown, unknown) is not unique").  Each
# example runs in its own fresh database built from a template holding the
# demo's tables (demo/town.sql) and, where the HTML comment before the
# block says `<!-- readme-test: fixture NAME -->`, the tables of that
# fixture (test/readme/fixtures.sql) and the psql variable :route.  A block
# marked `<!-- readme-test: skip (why) -->` is a sketch (other servers, say)
# and is reported as skipped.  CREATE EXTENSION statements run as
# IF NOT EXISTS, since the template has the extensions already; the
# first example also runs in an empty database exactly as printed.
# Needs a running server (PGHOST, PGPORT, PGUSER); prints TAP lines.
set -uo pipefail
cd "$(dirname "$0")/../.."
WORK=$(mktemp -d /tmp/frechet_readme.XXXXXX)
TEMPLATE=frechet_readme_template
n=0
status=0
psql_q() { psql -X -q -v ON_ERROR_STOP=1 "$@"; }

psql_q -d postgres -c "SET client_min_messages = warning" -c "DROP DATABASE IF EXISTS $TEMPLATE" \
	-c "CREATE DATABASE $TEMPLATE" || exit 1
psql_q -d "$TEMPLATE" -c "SET client_min_messages = warning" \
	-c "CREATE EXTENSION frechet_ext_postgis CASCADE" -f demo/town.sql >/dev/null || exit 1

# The blocks: one file each, with the marker that precedes it.
perl -ne '
	BEGIN { $n = 0; $mark = "" }
	if (/^<!-- readme-test: (.*?) -->/) { $mark = $1; next }
	if (/^```sql\s*$/) { $n++; open(OUT, ">", "'"$WORK"'/block$n.sql"); open(M, ">", "'"$WORK"'/block$n.mark"); print M "$mark\n"; close M; $in = 1; $mark = ""; next }
	if ($in && /^```/) { $in = 0; close OUT; next }
	print OUT $_ if $in;
	$mark = "" if !$in && /\S/;
' README.md

run_block() {
	local k=$1 db=$2 fixture=$3 route=$4
	psql_q -d postgres -c "SET client_min_messages = warning" -c "DROP DATABASE IF EXISTS $db" \
		-c "CREATE DATABASE $db TEMPLATE $TEMPLATE" || return 1
	{
		echo "\\set ON_ERROR_STOP 1"
		echo "\\i test/readme/fixtures.sql"
		if [ -n "$fixture" ]; then echo ":fixture_$fixture"; fi
		echo "\\set route '$route'"
		perl -pe 's/^(\s*CREATE EXTENSION) (?!IF NOT EXISTS)/$1 IF NOT EXISTS /i' "$WORK/block$k.sql"
	} >"$WORK/run$k.sql"
	psql -X -q -d "$db" -f "$WORK/run$k.sql" >"$WORK/out$k.txt" 2>&1
}

for f in $(ls "$WORK"/block*.sql | sort -V); do
	k=$(basename "$f" .sql)
	k=${k#block}
	mark=$(cat "$WORK/block$k.mark")
	line=$(grep -m1 -v '^\s*--' "$f" | cut -c1-60)
	n=$((n + 1))
	case "$mark" in
		skip*)
			echo "ok $n - README example $k skipped: ${mark#skip }"
			continue ;;
		"fixture point" | "fixture point_many")
			fixture=${mark#fixture } route="(SELECT route FROM routes WHERE route_id = 3)" ;;
		"fixture geometry")
			fixture=geometry route="(SELECT track FROM lines WHERE id = 4)" ;;
		*)
			fixture="" route="NULL" ;;
	esac
	if run_block "$k" frechet_readme "$fixture" "$route"; then
		# the results the example prints in its comments ("--  1.414...",
		# rows of numbers, t/f) must be in its output
		missing=$(perl -ne 'next unless /^--\s{2,}(.*)$/; for (split /[\s|]+/, $1) { print "$_\n" if /^(-?\d+(\.\d+)?|t|f)$/ }' "$f" |
			while read -r v; do grep -qw -- "$v" "$WORK/out$k.txt" || echo "$v"; done | tr '\n' ' ')
		if [ -n "$missing" ]; then
			status=1
			echo "not ok $n - README example $k prints results it does not give: $missing"
			continue
		fi
		echo "ok $n - README example $k runs with both extensions installed, with the results it shows ($line)"
	else
		status=1
		echo "not ok $n - README example $k fails with both extensions installed ($line):"
		grep -m3 -E "ERROR|error" "$WORK/out$k.txt" | sed 's/^/    /'
	fi
done

# The first example exactly as printed, in an empty database.
n=$((n + 1))
psql_q -d postgres -c "SET client_min_messages = warning" -c "DROP DATABASE IF EXISTS frechet_readme" -c "CREATE DATABASE frechet_readme"
if psql -X -q -v ON_ERROR_STOP=1 -d frechet_readme -f "$WORK/block1.sql" >"$WORK/first.txt" 2>&1; then
	echo "ok $n - README's first example runs as printed in an empty database"
else
	status=1
	echo "not ok $n - README's first example fails in an empty database:"
	grep -m3 ERROR "$WORK/first.txt" | sed 's/^/    /'
fi
echo "1..$n"
psql_q -d postgres -c "SET client_min_messages = warning" -c "DROP DATABASE IF EXISTS frechet_readme" -c "DROP DATABASE IF EXISTS $TEMPLATE"
rm -rf "$WORK"
exit $status
