#!/usr/bin/env bash
# Reruns this validation case: builds the tests if needed, runs the Catch2 test that writes
# the case's CSV, and compares it with the analytic solution.
# Usage: validation/transport/loss_column/run.sh [BUILD_DIR]   (default: build)
set -euo pipefail
ROOT=$(cd "$(dirname "$0")/../../.." && pwd)
BUILD=${1:-$ROOT/build}
if [ ! -x "$BUILD/tests/colchem_tests" ]; then
  cmake -S "$ROOT" -B "$BUILD" -DCMAKE_BUILD_TYPE=Release && cmake --build "$BUILD" -j2
fi
(cd "$BUILD/tests" && ./colchem_tests "[validation][transport]")
/usr/bin/python3 "$ROOT/validation/transport/compare.py" "$BUILD/tests/output/validation_loss_column.csv"
