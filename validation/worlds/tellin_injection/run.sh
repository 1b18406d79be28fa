#!/usr/bin/env bash
# Reruns the Tellin injection validation: ./run.sh [path/to/colchem]
set -euo pipefail
here=$(cd "$(dirname "$0")" && pwd)
colchem=${1:-$here/../../../build/src/colchem}
out=${OUT:-$(mktemp -d)/tellin_injection.nc}
"$colchem" run "$here/../../../configs/tellin.yaml" -o "$out"
/usr/bin/python3 "$here/analyse.py" "$out"
