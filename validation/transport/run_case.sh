#!/usr/bin/env bash
# Reruns one transport validation case: builds the tests if needed, runs the Catch2 tests
# tagged [validation][transport] (they write the cases' CSVs), and compares the case's CSV
# with its analytic solution.
# Usage: validation/transport/run_case.sh CASE [BUILD_DIR]   (default BUILD_DIR: build)
set -euo pipefail
ROOT=$(cd "$(dirname "$0")/../.." && pwd)
CASE=$1
BUILD=${2:-$ROOT/build}
if [ ! -x "$BUILD/tests/colchem_tests" ]; then
  cmake -S "$ROOT" -B "$BUILD" -DCMAKE_BUILD_TYPE=Release && cmake --build "$BUILD" -j2
fi
(cd "$BUILD/tests" && ./colchem_tests "[validation][transport]")
/usr/bin/python3 "$ROOT/validation/transport/compare.py" "$BUILD/tests/output/validation_$CASE.csv"
