#!/usr/bin/env bash
# Installs the Debian packages the build, the tests, the demo and the
# benchmark need, when any is missing.  Needs root (or sudo).
set -euo pipefail

FRECHET_PACKAGES=(
	build-essential pkg-config
	postgresql-15 postgresql-server-dev-15 postgresql-contrib
	postgresql-15-postgis-3
	libgeos-dev libcmocka-dev
	# PostGIS layer: PROJ's geodesics for the reference checks of the metres
	libproj-dev
	# Scale-out and demo: headless browser for the report's screenshot test,
	# Node.js for the GeoJSON validator (npm, test/geojson) and the checks
	chromium nodejs
)
# reliability (issue 7): clang with libFuzzer and the sanitizers (Debian 12
# ships libFuzzer in libclang-rt-14-dev), valgrind; pgbench comes with
# postgresql-15.
FRECHET_PACKAGES+=(clang libclang-rt-14-dev valgrind)

missing=()
for pkg in "${FRECHET_PACKAGES[@]}"; do
	dpkg-query -W -f='${Status}' "$pkg" 2>/dev/null | grep -q "install ok installed" || missing+=("$pkg")
done
if [ "${#missing[@]}" -gt 0 ]; then
	echo "installing: ${missing[*]}"
	SUDO=""
	[ "$(id -u)" -eq 0 ] || SUDO="sudo"
	export DEBIAN_FRONTEND=noninteractive
	$SUDO apt-get update -qq
	$SUDO apt-get install -y -qq --no-install-recommends "${missing[@]}" >/dev/null
fi

# npm: Debian's package, unless Node.js came with its own npm.
if ! command -v npm >/dev/null 2>&1; then
	SUDO=""
	[ "$(id -u)" -eq 0 ] || SUDO="sudo"
	DEBIAN_FRONTEND=noninteractive $SUDO apt-get install -y -qq --no-install-recommends npm >/dev/null
fi
# The GeoJSON validator, pinned by test/geojson/package-lock.json.
ROOT=$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)
if [ ! -d "$ROOT/test/geojson/node_modules/@placemarkio/check-geojson" ]; then
	echo "installing the GeoJSON validator (npm ci in test/geojson)"
	(cd "$ROOT/test/geojson" && npm ci --no-audit --no-fund --loglevel=error >/dev/null)
fi
