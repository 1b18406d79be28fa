#!/usr/bin/env bash
# Reruns this validation case: `colchem sensitivity` on the linear column of
# tests/solve/adjoint/linear_column.yaml against the closed-form steady state (README.md
# here). Usage: validation/solve/adjoint_linear_column/run.sh [path/to/colchem] [WORKDIR]
set -eu
here=$(cd "$(dirname "$0")" && pwd)
root=$(cd "$here/../../.." && pwd)
colchem=$(realpath "${1:-$root/build/src/colchem}")
work=${2:-$(mktemp -d)}
mkdir -p "$work"; cd "$work"
"$colchem" --log-level warn sensitivity "$root/tests/solve/adjoint/linear_column.yaml" \
  --objective column --species SO2 -o adjoint_linear_column.nc --check 1
/usr/bin/python3 "$here/check.py" adjoint_linear_column.nc
