#!/usr/bin/env bash
# Reruns the condensed-exchange validation: ./run.sh [path/to/colchem]
set -euo pipefail
here=$(cd "$(dirname "$0")" && pwd)
colchem=${1:-$here/../../../build/src/colchem}
out=${OUT:-$(mktemp -d)/condensed_exchange.nc}
"$colchem" --log-level warn run "$here/column.yaml" -o "$out"
/usr/bin/python3 "$here/check.py" "$out" "$here/initial.csv"
