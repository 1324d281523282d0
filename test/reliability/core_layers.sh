#!/usr/bin/env bash
# The engine's layers (DEVELOPERS.md, "Rules of the engine"): every file of
# src/core calls only files listed before it here, so the engine has no
# cycle and reads bottom up.  Checked on objects compiled here: each fr_*
# symbol an object uses must be defined by an object of a lower layer.
# Prints one TAP-like line.
set -uo pipefail
cd "$(dirname "$0")/../.."
source test/reliability/lib.sh
LAYERS=(geodesy freespace reach bounds discrete simplify prune decide distance matching partial passage excursions pings progress)

OBJ=$(mktemp -d /tmp/frechet_layers.XXXXXX)
trap 'rm -rf "$OBJ"' EXIT
for f in src/core/*.c; do
	${CC:-cc} -std=c11 -O1 -c "$f" -o "$OBJ/$(basename "$f" .c).o" 2>"$OBJ/cc.log" ||
		{ tap 1 "core layers: $f does not compile"; sed 's/^/    /' "$OBJ/cc.log" | head -5; exit 1; }
done
declare -A rank owner
for i in "${!LAYERS[@]}"; do
	rank[${LAYERS[$i]}]=$i
done
bad=()
for f in src/core/*.c; do
	name=$(basename "$f" .c)
	[ -n "${rank[$name]+x}" ] || bad+=("$name.c is in no layer")
	while read -r sym; do
		owner[$sym]=$name
	done < <(nm --defined-only -g "$OBJ/$name.o" | awk '$3 ~ /^fr_/ { print $3 }')
done
for f in src/core/*.c; do
	name=$(basename "$f" .c)
	while read -r sym; do
		def=${owner[$sym]:-}
		[ -n "$def" ] || continue
		if [ "${rank[$def]:-99}" -ge "${rank[$name]:-0}" ]; then
			bad+=("$name.c calls $sym of $def.c, which is not below it")
		fi
	done < <(nm -u "$OBJ/$name.o" | awk '$2 ~ /^fr_/ { print $2 }')
done
if [ "${#bad[@]}" -eq 0 ]; then
	tap 0 "core layers: ${#LAYERS[@]} files of src/core call only files below them (${LAYERS[*]})"
else
	tap 1 "core layers: ${#bad[@]} calls break the order ${LAYERS[*]}"
	printf '    %s\n' "${bad[@]}" | head -20
fi
[ "${#bad[@]}" -eq 0 ]
