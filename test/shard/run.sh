#!/usr/bin/env bash
# Sharding test: a coordinator holds `trips` hash-partitioned into two
# postgres_fdw foreign partitions on two shards, three throwaway servers on
# Unix sockets in temporary directories (no TCP).  Checks that
# frechet_at_most (point[] and geometry) and the SQL wrapper frechet_geojson
# run inside the Remote SQL, that answers equal those of the same rows on
# one server, and that the wrappers work in remote sessions, which
# postgres_fdw runs with search_path = pg_catalog: the shards keep the
# extensions in schemas that are on no search_path.
# Expects the extensions installed (test/run installs them first).
# Prints TAP lines ("ok N - ...", "not ok N - ...") and "1..N"; exits
# non-zero on any failure.
#   SHARD_PORT=54643 bash test/shard/run.sh     (uses SHARD_PORT .. +2)
#   SHARD_SHOW=1 bash test/shard/run.sh         (also prints the plans it checks)
set -uo pipefail
cd "$(dirname "$0")/../.."
source .ci/pgserver.sh
BASE_PORT=${SHARD_PORT:-54643}
DIRS=()
n=0
bad=0

# Starts a throwaway server on a socket in a new temporary directory; sets
# the variable named $1 to that directory.
start_server() {
	local var=$1 port=$2 dir
	dir=$(mktemp -d /tmp/frechet_shard.XXXXXX)
	chmod 755 "$dir"
	[ "$(id -u)" -eq 0 ] && chown postgres: "$dir"
	DIRS+=("$dir")
	pg_as_owner "$PG_BIN/initdb" -D "$dir/data" -U postgres --auth=trust --no-sync -E UTF8 \
		--locale=C >"$dir/initdb.log" 2>&1 || { cat "$dir/initdb.log"; return 1; }
	pg_as_owner "$PG_BIN/pg_ctl" -D "$dir/data" -l "$dir/server.log" -w \
		-o "-k $dir -p $port -c listen_addresses='' -c fsync=off" start >/dev/null ||
		{ cat "$dir/server.log"; return 1; }
	printf -v "$var" '%s' "$dir"
}

# Stops every server this script started and removes its directory.
stop_servers() {
	local d
	for d in "${DIRS[@]}"; do
		pg_as_owner "$PG_BIN/pg_ctl" -D "$d/data" -m immediate stop >/dev/null 2>&1 || true
		rm -rf "$d"
	done
}
trap stop_servers EXIT

# Reports one check: ok when the command succeeds.
check() {
	local what=$1
	shift
	n=$((n + 1))
	if "$@"; then
		echo "ok $n - $what"
	else
		echo "not ok $n - $what"
		bad=$((bad + 1))
	fi
}

start_server COORD "$BASE_PORT" && start_server SHARD1 $((BASE_PORT + 1)) &&
	start_server SHARD2 $((BASE_PORT + 2)) || { echo "not ok 1 - start three servers"; echo "1..1"; exit 1; }
export PGUSER=postgres PGDATABASE=postgres
coord() { psql -X -q -At -v ON_ERROR_STOP=1 -h "$COORD" -p "$BASE_PORT" "$@"; }
shard1() { psql -X -q -At -v ON_ERROR_STOP=1 -h "$SHARD1" -p $((BASE_PORT + 1)) "$@"; }
shard2() { psql -X -q -At -v ON_ERROR_STOP=1 -h "$SHARD2" -p $((BASE_PORT + 2)) "$@"; }

POSTGIS=$(coord -c "SELECT count(*) FROM pg_available_extensions WHERE name = 'postgis'")
GEOM=""
[ "$POSTGIS" = 1 ] && GEOM=", geom gis.geometry"

# Shards: the extensions in schemas frechet and gis, on no search_path.
for s in shard1 shard2; do
	part=trips_p0
	[ "$s" = shard2 ] && part=trips_p1
	$s -c "CREATE SCHEMA frechet" -c "CREATE SCHEMA gis" -c "CREATE EXTENSION frechet_ext SCHEMA frechet" ||
		{ echo "not ok 1 - set up $s"; echo "1..1"; exit 1; }
	if [ "$POSTGIS" = 1 ]; then
		$s -c "CREATE EXTENSION postgis SCHEMA gis" -c "CREATE EXTENSION frechet_ext_postgis SCHEMA frechet" >/dev/null ||
			{ echo "not ok 1 - PostGIS on $s"; echo "1..1"; exit 1; }
	fi
	$s -c "CREATE TABLE public.$part (id int PRIMARY KEY, line_id int NOT NULL, track point[] NOT NULL $GEOM)" ||
		{ echo "not ok 1 - table on $s"; echo "1..1"; exit 1; }
done
exts="frechet_ext"
[ "$POSTGIS" = 1 ] && exts="frechet_ext, frechet_ext_postgis, postgis"

# Coordinator: the same schemas, postgres_fdw, trips hash-partitioned onto
# the shards, and trips_local, the same rows on this one server.
coord >/dev/null <<SQL || { echo "not ok 1 - set up the coordinator"; echo "1..1"; exit 1; }
CREATE SCHEMA frechet;
CREATE SCHEMA gis;
CREATE EXTENSION frechet_ext SCHEMA frechet;
$( [ "$POSTGIS" = 1 ] && echo "CREATE EXTENSION postgis SCHEMA gis; CREATE EXTENSION frechet_ext_postgis SCHEMA frechet;" )
CREATE EXTENSION postgres_fdw;
CREATE SERVER shard1 FOREIGN DATA WRAPPER postgres_fdw
	OPTIONS (host '$SHARD1', port '$((BASE_PORT + 1))', dbname 'postgres', extensions '$exts', async_capable 'true');
CREATE SERVER shard2 FOREIGN DATA WRAPPER postgres_fdw
	OPTIONS (host '$SHARD2', port '$((BASE_PORT + 2))', dbname 'postgres', extensions '$exts', async_capable 'true');
CREATE USER MAPPING FOR postgres SERVER shard1 OPTIONS (user 'postgres');
CREATE USER MAPPING FOR postgres SERVER shard2 OPTIONS (user 'postgres');
CREATE TABLE trips (id int NOT NULL, line_id int NOT NULL, track point[] NOT NULL $GEOM) PARTITION BY HASH (id);
CREATE FOREIGN TABLE trips_p0 PARTITION OF trips FOR VALUES WITH (MODULUS 2, REMAINDER 0)
	SERVER shard1 OPTIONS (schema_name 'public', table_name 'trips_p0');
CREATE FOREIGN TABLE trips_p1 PARTITION OF trips FOR VALUES WITH (MODULUS 2, REMAINDER 1)
	SERVER shard2 OPTIONS (schema_name 'public', table_name 'trips_p1');

-- Six lines (metres), 600 trips: GPS noise, dropped fixes, some detours,
-- some driven backwards.
SELECT setseed(0.31);
CREATE TABLE line AS
SELECT l AS line_id, array(SELECT point(k * 40.0, 400 * l + 120 * sin(k / (5.0 + l))) FROM generate_series(0, 40) k) AS route
FROM generate_series(1, 6) l;
CREATE TABLE trips_local (id int PRIMARY KEY, line_id int NOT NULL, track point[] NOT NULL $GEOM);
INSERT INTO trips_local (id, line_id, track)
SELECT i, 1 + i % 6,
       array(SELECT point(k * 40.0 + 6 * random() - 3,
                          400 * (1 + i % 6) + 120 * sin(k / (6.0 + i % 6)) + 12 * random() - 6
                          + CASE WHEN i % 9 = 0 AND k BETWEEN 15 AND 22 THEN 50 + i % 150 ELSE 0 END)
             FROM generate_series(0, 40) k WHERE k IN (0, 40) OR random() < 0.85
             ORDER BY CASE WHEN i % 25 = 0 THEN -k ELSE k END)
FROM generate_series(1, 600) i;
$( [ "$POSTGIS" = 1 ] && echo "UPDATE trips_local SET geom = gis.ST_SetSRID(gis.ST_MakeLine(array(SELECT gis.ST_MakePoint(500000 + p[0], 5900000 + p[1]) FROM unnest(track) p)), 32630);" )
INSERT INTO trips SELECT * FROM trips_local;
SQL

ROUTE=$(coord -c "SELECT route FROM line WHERE line_id = 3")
ROUTE_BENT=$(coord -c "SELECT route FROM line WHERE line_id = 4")

# True when the output of a psql command on the coordinator contains a pattern
# (grep -E) at least $3 times.
coord_has() {
	local sql=$1 pat=$2 times=${3:-1} out
	out=$(coord -c "SET search_path = public, frechet, gis" -c "$sql" 2>&1)
	[ -n "${SHARD_SHOW:-}" ] && echo "$out" | sed 's/^/# /'
	[ "$(grep -cE -- "$pat" <<<"$out")" -ge "$times" ] || { echo "$out" | head -30 | sed 's/^/# /'; return 1; }
}

# True when two queries on the coordinator give the same non-empty result.
coord_same() {
	local a b
	a=$(coord -c "SET search_path = public, frechet, gis" -c "$1" 2>&1)
	b=$(coord -c "SET search_path = public, frechet, gis" -c "$2" 2>&1)
	[ -n "$a" ] && [ "$a" = "$b" ] || { echo "# sharded: $(head -c 300 <<<"$a")"; echo "# one server: $(head -c 300 <<<"$b")"; return 1; }
}

check "rows landed on both shards" \
	test "$(shard1 -c "SELECT count(*) FROM trips_p0"):$(shard2 -c "SELECT count(*) FROM trips_p1")" \
	= "$(coord -c "SELECT count(*) FILTER (WHERE satisfies_hash_partition('trips'::regclass, 2, 0, id)) || ':' || count(*) FILTER (WHERE NOT satisfies_hash_partition('trips'::regclass, 2, 0, id)) FROM trips_local")"
check "EXPLAIN VERBOSE: frechet_at_most (point[]) in the Remote SQL of both shards" \
	coord_has "EXPLAIN (VERBOSE, COSTS OFF) SELECT id FROM trips WHERE frechet_at_most(track, '$ROUTE', 60)" \
	'Remote SQL: SELECT .* WHERE \(frechet\.frechet_at_most\(track, ' 2
check "EXPLAIN VERBOSE: the shards scan asynchronously (async_capable)" \
	coord_has "EXPLAIN (VERBOSE, COSTS OFF) SELECT id FROM trips WHERE frechet_at_most(track, '$ROUTE', 60)" \
	'Async Foreign Scan' 2
check "EXPLAIN VERBOSE: frechet_distance and NOT frechet_at_most pushed down" \
	coord_has "EXPLAIN (VERBOSE, COSTS OFF) SELECT id FROM trips WHERE NOT frechet_at_most(track, '$ROUTE', 60) AND frechet_distance(track, '$ROUTE') < 400" \
	'Remote SQL: .*NOT frechet\.frechet_at_most.*frechet\.frechet_distance' 2
check "EXPLAIN VERBOSE: the SQL wrapper frechet_geojson in the Remote SQL" \
	coord_has "EXPLAIN (VERBOSE, COSTS OFF) SELECT id FROM trips WHERE frechet_geojson(track, '$ROUTE', 60) @> '{\"frechet\": {\"within_epsilon\": false}}'" \
	'Remote SQL: .*frechet\.frechet_geojson\(track, ' 2
check "same trips within 60 m sharded as on one server" \
	coord_same "SELECT string_agg(id::text, ',' ORDER BY id) FROM trips WHERE line_id = 3 AND frechet_at_most(track, '$ROUTE', 60)" \
	"SELECT string_agg(id::text, ',' ORDER BY id) FROM trips_local WHERE line_id = 3 AND frechet_at_most(track, '$ROUTE', 60)"
check "same flagged trips (NOT frechet_at_most) sharded as on one server" \
	coord_same "SELECT count(*) || ':' || string_agg(id::text, ',' ORDER BY id) FROM trips WHERE NOT frechet_at_most(track, '$ROUTE_BENT', 45)" \
	"SELECT count(*) || ':' || string_agg(id::text, ',' ORDER BY id) FROM trips_local WHERE NOT frechet_at_most(track, '$ROUTE_BENT', 45)"
check "same count with partitionwise aggregate sharded as on one server" \
	coord_same "SET enable_partitionwise_aggregate = on; SELECT count(*) FROM trips WHERE frechet_at_most(track, '$ROUTE_BENT', 45)" \
	"SELECT count(*) FROM trips_local WHERE frechet_at_most(track, '$ROUTE_BENT', 45)"
check "same distances computed on the shards (WHERE frechet_distance < 200)" \
	coord_same "SELECT string_agg(id::text, ',' ORDER BY id) FROM trips WHERE frechet_distance(track, '$ROUTE') < 200" \
	"SELECT string_agg(id::text, ',' ORDER BY id) FROM trips_local WHERE frechet_distance(track, '$ROUTE') < 200"
check "same trips selected by frechet_geojson run in the shards' sessions" \
	coord_same "SELECT string_agg(id::text, ',' ORDER BY id) FROM trips WHERE frechet_geojson(track, '$ROUTE', 60) @> '{\"frechet\": {\"within_epsilon\": false}}'" \
	"SELECT string_agg(id::text, ',' ORDER BY id) FROM trips_local WHERE frechet_geojson(track, '$ROUTE', 60) @> '{\"frechet\": {\"within_epsilon\": false}}'"
check "same 10 nearest trips (ORDER BY track <-> route LIMIT 10) sharded as on one server" \
	coord_same "SELECT string_agg(id::text, ',') FROM (SELECT id FROM trips ORDER BY track <-> '$ROUTE', id LIMIT 10) s" \
	"SELECT string_agg(id::text, ',') FROM (SELECT id FROM trips_local ORDER BY track <-> '$ROUTE', id LIMIT 10) s"

if [ "$POSTGIS" = 1 ]; then
	GROUTE=$(coord -c "SELECT gis.ST_SetSRID(gis.ST_MakeLine(array(SELECT gis.ST_MakePoint(500000 + p[0], 5900000 + p[1]) FROM unnest(route) p)), 32630) FROM line WHERE line_id = 3")
	check "EXPLAIN VERBOSE: frechet_at_most (geometry) in the Remote SQL of both shards" \
		coord_has "EXPLAIN (VERBOSE, COSTS OFF) SELECT id FROM trips WHERE frechet_at_most(geom, '$GROUTE'::geometry, 60)" \
		'Remote SQL: SELECT .* WHERE \(frechet\.frechet_at_most\(geom, .*::gis\.geometry' 2
	check "EXPLAIN VERBOSE: frechet_geojson (geometry, a PostGIS-using wrapper) in the Remote SQL" \
		coord_has "EXPLAIN (VERBOSE, COSTS OFF) SELECT id FROM trips WHERE frechet_geojson(geom, '$GROUTE'::geometry, 60) @> '{\"frechet\": {\"within_epsilon\": false}}'" \
		'Remote SQL: .*frechet\.frechet_geojson\(geom, ' 2
	check "same trips within 60 m (geometry) sharded as on one server" \
		coord_same "SELECT string_agg(id::text, ',' ORDER BY id) FROM trips WHERE frechet_at_most(geom, '$GROUTE'::geometry, 60)" \
		"SELECT string_agg(id::text, ',' ORDER BY id) FROM trips_local WHERE frechet_at_most(geom, '$GROUTE'::geometry, 60)"
	check "geometry answers equal point[] answers on the same coordinates" \
		coord_same "SELECT string_agg(id::text, ',' ORDER BY id) FROM trips WHERE frechet_at_most(geom, '$GROUTE'::geometry, 60)" \
		"SELECT string_agg(id::text, ',' ORDER BY id) FROM trips WHERE frechet_at_most(track, '$ROUTE', 60)"
	check "same GeoJSON (geometry wrapper run in the shards' sessions) as on one server" \
		coord_same "SELECT md5(string_agg(frechet_geojson(geom, '$GROUTE'::geometry, 60)::text, ',' ORDER BY id)) FROM trips WHERE id % 50 = 3 AND frechet_geojson(geom, '$GROUTE'::geometry, 60) @> '{\"type\": \"FeatureCollection\"}'" \
		"SELECT md5(string_agg(frechet_geojson(geom, '$GROUTE'::geometry, 60)::text, ',' ORDER BY id)) FROM trips_local WHERE id % 50 = 3"
fi

# (The GeoJSON tests above use jsonb containment: postgres_fdw in
# PostgreSQL 15 ships neither a cast through text such as
# (j->>'n')::int nor j->'key' (a text key of the default collation), and
# evaluates such a condition on the coordinator instead.)

# Negative control: a wrapper whose body names frechet_at_most unqualified,
# made a member of frechet_ext so postgres_fdw ships it, fails in the
# shards' sessions (search_path = pg_catalog).  This is what the check above
# guards against.
ctl_create="SET check_function_bodies = off; CREATE FUNCTION frechet.unqualified_at_most(a point[], b point[], eps float8) RETURNS boolean
	LANGUAGE sql IMMUTABLE PARALLEL SAFE AS 'SELECT frechet_at_most(a, b, eps) FROM (SELECT 1) AS one';
	ALTER EXTENSION frechet_ext ADD FUNCTION frechet.unqualified_at_most(point[], point[], float8);"
coord -c "$ctl_create" && shard1 -c "$ctl_create" && shard2 -c "$ctl_create"
unqualified_fails() {
	local out
	out=$(coord -c "SELECT count(*) FROM trips WHERE frechet.unqualified_at_most(track, '$ROUTE', 60)" 2>&1)
	grep -q 'function frechet_at_most(point\[\], point\[\], double precision) does not exist' <<<"$out" ||
		{ echo "# $out" | head -5; return 1; }
}
check "control: an unqualified wrapper fails in the remote session" unqualified_fails
check "control: the same unqualified wrapper works on the coordinator's own table" \
	test "$(coord -c "SET search_path = public, frechet" -c "SELECT count(*) FROM trips_local WHERE frechet.unqualified_at_most(track, '$ROUTE', 60)")" \
	= "$(coord -c "SELECT count(*) FROM trips_local WHERE frechet.frechet_at_most(track, '$ROUTE', 60)")"

echo "1..$n"
[ "$bad" -eq 0 ]
