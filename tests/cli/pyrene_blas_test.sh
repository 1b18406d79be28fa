#!/usr/bin/env bash
# The 108-cell two-stream Pyrene solve (started by grid sequencing from direct-beam levels)
# under Debian's OpenBLAS as well as the default BLAS (issue 10). colchem calls BLAS only
# through PETSc (GMRES, vector operations), so the two runs differ by round-off alone; a
# steady state does not depend on where or how its solve goes (analytic property of the
# fixed point F(x) = 0), so both must converge and agree to 1e-6 relative wherever a mole
# fraction is above 1e-18 (both solved to a scaled residual of 1e-8). Before the fix the
# OpenBLAS run diverged (the first step from the direct-beam state at the warm 1e8 s
# pseudo-time step changed densities 1e10-fold) while the reference-BLAS run converged.
# Exit 77 (CTest SKIP_RETURN_CODE): OpenBLAS is not installed here, nothing is checked.
set -eu
colchem=$1; root=$2; work=$3
openblas=/usr/lib/x86_64-linux-gnu/openblas-pthread
if [ ! -e "$openblas/libblas.so.3" ]; then
  echo "SKIP: $openblas/libblas.so.3 not found (apt-get install libopenblas0-pthread)"
  exit 77
fi
mkdir -p "$work"; cd "$work"
deck="{scheme: two_stream, closure: quadrature, surface_albedo: {table: $root/configs/photolysis/pyrene_deck_albedo.csv}}"
"$colchem" --log-level warn run "$root/configs/pyrene_full.yaml" --set grid.cells=108 \
  --set "photolysis.radiative_transfer=$deck" -o ref.nc > ref.log 2>&1 || { cat ref.log; exit 1; }
LD_LIBRARY_PATH=$openblas${LD_LIBRARY_PATH:+:$LD_LIBRARY_PATH} OPENBLAS_NUM_THREADS=1 \
  "$colchem" --log-level warn run "$root/configs/pyrene_full.yaml" --set grid.cells=108 \
  --set "photolysis.radiative_transfer=$deck" -o openblas.nc > openblas.log 2>&1 \
  || { cat openblas.log; exit 1; }
/usr/bin/python3 - <<'PY'
import netCDF4
import numpy as np
a, b = netCDF4.Dataset("ref.nc"), netCDF4.Dataset("openblas.nc")
for name, ds in (("reference BLAS", a), ("OpenBLAS", b)):
    assert ds.getncattr("colchem_solver_status") == "converged", (name, ds.getncattr("colchem_solver_reason"))
    assert "(direct beam)" in ds.getncattr("colchem_grid_sequence"), ds.getncattr("colchem_grid_sequence")
x = np.asarray(a["mole_fraction"][:]); y = np.asarray(b["mole_fraction"][:])
m = np.maximum(x, y) > 1e-18
rel = np.max(np.abs(x[m] - y[m]) / np.maximum(x[m], y[m]))
assert rel < 1e-6, rel
print(f"ok: 108-cell two-stream solve, reference BLAS {int(a.getncattr('colchem_iterations'))} "
      f"iterations, OpenBLAS {int(b.getncattr('colchem_iterations'))}; states agree to {rel:.1e}")
PY
