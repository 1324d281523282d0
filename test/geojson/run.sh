#!/usr/bin/env bash
# Validates frechet_geojson output as GeoJSON (RFC 7946) with
# @placemarkio/check-geojson (npm; installed into test/geojson/node_modules
# by .ci/deps.sh).  Needs a running server (PGHOST, PGPORT, PGUSER) with the
# extension installed; creates and drops the database frechet_geojson.
# Prints TAP lines (ok / not ok) and exits non-zero on any failure.
set -uo pipefail
cd "$(dirname "$0")"
psql -X -q -d postgres -c "DROP DATABASE IF EXISTS frechet_geojson" -c "CREATE DATABASE frechet_geojson" || exit 1
postgis=$(psql -X -At -d postgres -c "SELECT count(*) FROM pg_available_extensions WHERE name = 'postgis'")
psql -X -q -At -F $'\t' -v postgis="$postgis" -d frechet_geojson -f samples.sql >samples.out
rc=$?
node check.mjs <samples.out
rc2=$?
psql -X -q -d postgres -c "DROP DATABASE frechet_geojson"
rm -f samples.out
[ "$rc" -eq 0 ] && [ "$rc2" -eq 0 ]
