#!/usr/bin/env bash
# The README's "Results on Pyrene" table is what the current code computes (issue 17: "its
# results tables are produced by a script from the current code (a test fails when they
# drift)"): the demo's sweep (configs/pyrene_demo.yaml, 108 cells, one rank; the scores are
# identical on any rank count, README "Sweeps and MPI"), then scripts/results_table.py
# --check-readme compares its printed table with the block between the README's markers,
# character for character (the table's two and one significant decimals are far coarser than
# the solver tolerance, so a difference is a change of the physics or of the data).
set -eu
colchem=$1; root=$2; work=$3
rm -rf "$work"; mkdir -p "$work"; cd "$work"
"$colchem" --log-level warn sweep "$root/configs/pyrene_demo.yaml" -o demo.nc > sweep.log 2>&1 \
  || { tail -20 sweep.log; echo "FAIL: the demo's sweep"; exit 1; }
/usr/bin/python3 "$root/scripts/results_table.py" demo.nc --check-readme "$root/README.md"
