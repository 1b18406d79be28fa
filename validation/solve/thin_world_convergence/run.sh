#!/usr/bin/env bash
# Grid convergence of the cold thin world Frigis (configs/frigid_thin.yaml): runs the steady
# state on uniform grids that double (default 70 140 280 560 cells), with the scenario's eddy
# profile and with a weakly mixed surface layer (profiles/frigis_eddy_weak.csv), and prints
# the mole fractions at 8 km with the observed order of each grid triple and the Richardson
# error estimate (table.py).
# Usage: validation/solve/thin_world_convergence/run.sh [BUILD_DIR] [CELLS...]
#   (default BUILD_DIR: build; the runs are written to BUILD_DIR/validation/thin_world)
set -euo pipefail
ROOT=$(cd "$(dirname "$0")/../../.." && pwd)
BUILD=${1:-$ROOT/build}
shift || true
CELLS=("$@")
[ ${#CELLS[@]} -gt 0 ] || CELLS=(70 140 280 560)
if [ ! -x "$BUILD/src/colchem" ]; then
  cmake -S "$ROOT" -B "$BUILD" -DCMAKE_BUILD_TYPE=Release && cmake --build "$BUILD" -j2
fi
OUT="$BUILD/validation/thin_world"
mkdir -p "$OUT"
# Two eddy profiles: the scenario's own, and a weakly mixed surface layer (--set).
for variant in shipped weak; do
  extra=()
  [ "$variant" = weak ] &&
    extra=(--set "atmosphere.eddy_diffusion.table=$ROOT/profiles/frigis_eddy_weak.csv")
  echo "== eddy diffusion: $variant"
  files=()
  for n in "${CELLS[@]}"; do
    f="$OUT/frigid_thin_${variant}_$n"
    "$BUILD/src/colchem" run "$ROOT/configs/frigid_thin.yaml" --set grid.cells="$n" \
      "${extra[@]}" -o "$f.nc" > "$f.log" 2>&1
    grep -E "^frigid_thin: steady" "$f.log"
    files+=("$f.nc")
  done
  /usr/bin/python3 "$(dirname "$0")/table.py" --altitude 8 "${files[@]}"
done
