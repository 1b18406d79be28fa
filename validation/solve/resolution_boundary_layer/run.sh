#!/usr/bin/env bash
# Reruns the resolution validation on the closed-form thin boundary layer: the Catch2 checks
# (they print the orders and errors as warnings), then `colchem resolve` on the uniform
# family and on an equidistributed grid, writing into WORKDIR.
# Usage: validation/solve/resolution_boundary_layer/run.sh [BUILD_DIR] [WORKDIR]
#        (defaults: build, a temporary directory)
set -euo pipefail
ROOT=$(cd "$(dirname "$0")/../../.." && pwd)
BUILD=${1:-$ROOT/build}
WORK=${2:-$(mktemp -d)}
if [ ! -x "$BUILD/tests/colchem_tests" ]; then
  cmake -S "$ROOT" -B "$BUILD" -DCMAKE_BUILD_TYPE=Release && cmake --build "$BUILD" -j2
fi
SCENARIO=$ROOT/tests/analysis/data/boundary_layer.yaml
(cd "$BUILD/tests" && ./colchem_tests "[resolution][validation]" -r compact)
mkdir -p "$WORK"
echo "== uniform 50, 100, 200 cells"
"$BUILD/src/colchem" --log-level warn resolve "$SCENARIO" --cells 50 -o "$WORK/uniform.nc"
echo "== equidistributed 50 cells (2 passes), then 100, 200"
"$BUILD/src/colchem" --log-level warn resolve "$SCENARIO" --cells 50 --equidistribute 50 \
  -o "$WORK/adapted.nc" --grid-out "$WORK/adapted.grid.yaml"
echo "== outputs in $WORK (the adapted grid section: $WORK/adapted.grid.yaml)"
