#!/usr/bin/env bash
# The glue's layers (DEVELOPERS.md, "Layers of the glue"): a file may call
# the engine, files of its own folder and files of the folders of lower
# layers, nothing else.  Folders of one layer (the two codecs; the index
# and the SQL functions) do not call each other.  Checked on objects
# compiled here against the PostgreSQL 15 server headers: each symbol an
# object uses that another glue object defines must come from its own
# folder or a lower layer.  Prints one TAP-like line.
set -uo pipefail
cd "$(dirname "$0")/../.."
source test/reliability/lib.sh
# folder:layer, bottom up
LAYERS=(glue:0 pg:1 postgis:1 track:2 index:3 functions:3)

PG_CONFIG=${PG_CONFIG:-$(ls /usr/lib/postgresql/15/bin/pg_config 2>/dev/null || command -v pg_config)}
if [ -z "$PG_CONFIG" ]; then
	tap 1 "glue layers: no pg_config to compile the glue with"
	exit 1
fi
OBJ=$(mktemp -d /tmp/frechet_glue_layers.XXXXXX)
trap 'rm -rf "$OBJ"' EXIT
declare -A rank owner
includes=(-Isrc/core -I"$("$PG_CONFIG" --includedir-server)")
for entry in "${LAYERS[@]}"; do
	rank[${entry%%:*}]=${entry##*:}
	includes+=(-Isrc/"${entry%%:*}")
done
bad=()
files=0
for dir in src/*/; do
	dir=$(basename "$dir")
	[ "$dir" = core ] && continue
	[ -n "${rank[$dir]+x}" ] || bad+=("src/$dir is in no layer")
done
for entry in "${LAYERS[@]}"; do
	dir=${entry%%:*}
	for f in src/"$dir"/*.c; do
		o="$OBJ/$dir.$(basename "$f" .c).o"
		${CC:-cc} -std=gnu11 -O0 -c "${includes[@]}" "$f" -o "$o" 2>"$OBJ/cc.log" ||
			{ tap 1 "glue layers: $f does not compile"; sed 's/^/    /' "$OBJ/cc.log" | head -5; exit 1; }
		files=$((files + 1))
		while read -r sym; do
			owner[$sym]=$dir
		done < <(nm --defined-only -g "$o" | awk '{ print $3 }')
	done
done
for o in "$OBJ"/*.o; do
	name=$(basename "$o" .o)
	dir=${name%%.*}
	while read -r sym; do
		def=${owner[$sym]:-}
		[ -n "$def" ] && [ "$def" != "$dir" ] || continue
		if [ "${rank[$def]}" -ge "${rank[$dir]}" ]; then
			bad+=("src/$dir/${name#*.}.c calls $sym of src/$def, which is not below it")
		fi
	done < <(nm -u "$o" | awk '{ print $2 }')
done
order=$(printf '%s ' "${LAYERS[@]}")
if [ "${#bad[@]}" -eq 0 ]; then
	tap 0 "glue layers: $files files call only the engine, their folder and lower layers (${order% })"
else
	tap 1 "glue layers: ${#bad[@]} calls break the order ${order% }"
	printf '    %s\n' "${bad[@]}" | head -20
fi
[ "${#bad[@]}" -eq 0 ]
