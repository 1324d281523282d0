# Throwaway PostgreSQL 15 server for tests and the demo.  Source this file,
# then call pg_throwaway_start; it exports PGHOST (a socket directory),
# PGPORT, PGUSER and PGDATABASE, and stops the server on exit.
# The server runs as the postgres OS user (it refuses root) when we are root.

PG_BIN=${PG_BIN:-/usr/lib/postgresql/15/bin}

# Runs a command as the server's OS user.
pg_as_owner() {
	if [ "$(id -u)" -eq 0 ]; then
		runuser -u postgres -- "$@"
	else
		"$@"
	fi
}

# Creates, starts and exports a server in a fresh temporary directory.
pg_throwaway_start() {
	PG_TMP=$(mktemp -d /tmp/frechet_pg.XXXXXX)
	chmod 755 "$PG_TMP"
	[ "$(id -u)" -eq 0 ] && chown postgres: "$PG_TMP"
	export PGHOST="$PG_TMP"
	export PGPORT=${PGPORT:-54329}
	export PGUSER=postgres
	export PGDATABASE=postgres
	pg_as_owner "$PG_BIN/initdb" -D "$PG_TMP/data" -U postgres --auth=trust \
		--no-sync -E UTF8 --locale=C >"$PG_TMP/initdb.log" 2>&1 ||
		{ cat "$PG_TMP/initdb.log"; return 1; }
	pg_as_owner "$PG_BIN/pg_ctl" -D "$PG_TMP/data" -l "$PG_TMP/server.log" -w \
		-o "-k $PG_TMP -p $PGPORT -c listen_addresses='' -c fsync=off -c max_worker_processes=16 -c max_parallel_workers_per_gather=2" \
		start >/dev/null || { cat "$PG_TMP/server.log"; return 1; }
	trap pg_throwaway_stop EXIT
}

# Stops the server and removes its directory.
pg_throwaway_stop() {
	if [ -n "${PG_TMP:-}" ] && [ -d "$PG_TMP/data" ]; then
		pg_as_owner "$PG_BIN/pg_ctl" -D "$PG_TMP/data" -m immediate stop >/dev/null 2>&1 || true
		rm -rf "$PG_TMP"
	fi
}
