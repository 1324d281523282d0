# Shared helpers of the reliability scripts (sourced).  They expect the
# PG* variables of a running server (see .ci/pgserver.sh) and print
# TAP-like lines, "ok N - ..." and "not ok N - ...", that test/run counts.

TAP_N=${TAP_N:-0}
TAP_FAILED=${TAP_FAILED:-0}

# Prints one result line; $1 is 0 for a pass.
tap() {
	local rc=$1
	shift
	TAP_N=$((TAP_N + 1))
	if [ "$rc" -eq 0 ]; then
		echo "ok $TAP_N - $*"
	else
		TAP_FAILED=$((TAP_FAILED + 1))
		echo "not ok $TAP_N - $*"
	fi
}

# psql without the user's settings, stopping at the first error, tuples only.
rpsql() {
	psql -X -q -v ON_ERROR_STOP=1 -At "$@"
}

# Creates a fresh database with the extension; prints nothing.
fresh_db() {
	rpsql -d postgres -c "SET client_min_messages = warning" -c "DROP DATABASE IF EXISTS $1" \
		-c "CREATE DATABASE $1" >/dev/null &&
		rpsql -d "$1" -c "CREATE EXTENSION frechet_ext" >/dev/null
}

# SQL for the resident memory of the backend that runs it, in kB, read
# from its own /proc/<pid>/status (needs a superuser, as pg_read_file does).
RSS_SQL="(regexp_match(pg_catalog.pg_read_file('/proc/self/status'), 'VmRSS:\\s+(\\d+) kB'))[1]::int"
ANON_SQL="(regexp_match(pg_catalog.pg_read_file('/proc/self/status'), 'RssAnon:\\s+(\\d+) kB'))[1]::int"
