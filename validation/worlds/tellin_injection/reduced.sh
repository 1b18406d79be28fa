#!/usr/bin/env bash
# The Tellin injection on the reduced case (25 cells, 70 days; about a minute; CTest label
# slow, the default suite runs short.sh): the e-folding
# time of the injected SO2 within 10 % of the converged value recorded in
# converged_efolding_days.txt (the full case, 50 cells and 130 days, measured by run.sh, which
# also shows the reduced value within 5 % of the full one). ./reduced.sh [path/to/colchem]
set -euo pipefail
here=$(cd "$(dirname "$0")" && pwd)
colchem=${1:-$here/../../../build/src/colchem}
out=${OUT:-$(mktemp -d)/tellin_injection_reduced.nc}
ref=$(grep -v '^#' "$here/converged_efolding_days.txt" | head -1)
"$colchem" --log-level warn run "$here/../../../configs/tellin.yaml" --set grid.cells=25 \
  --set "solver.transient.end=70 day" \
  --set "solver.transient.outputs=[1 day, 5 day, 9 day, 11 day, 15 day, 20 day, 30 day, 40 day, 50 day, 60 day, 70 day]" \
  -o "$out"
lo=$(/usr/bin/python3 -c "print(0.9 * $ref)"); hi=$(/usr/bin/python3 -c "print(1.1 * $ref)")
echo "converged e-folding time (full case, converged_efolding_days.txt): $ref days"
/usr/bin/python3 "$here/analyse.py" "$out" "$lo" "$hi"
