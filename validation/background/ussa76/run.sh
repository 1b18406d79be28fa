#!/usr/bin/env bash
# Reruns the USSA76 validation: ./run.sh [path/to/colchem]
set -euo pipefail
here=$(cd "$(dirname "$0")" && pwd)
colchem=${1:-$here/../../../build/src/colchem}
out=${OUT:-$(mktemp -d)/ussa76.nc}
"$colchem" run "$here/scenario.yaml" -o "$out"
/usr/bin/python3 "$here/compare.py" "$out" "$here/reference.csv" 0.005
