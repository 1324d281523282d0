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
)

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
