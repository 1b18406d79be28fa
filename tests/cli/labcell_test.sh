#!/usr/bin/env bash
# The box-mode laboratory cell (configs/labcell_box.yaml): SO2 excited at 250-310 nm to its
# triplet, which either makes H2SO3 with water (branching ratio beta) or SO3 (then H2SO4) with
# SO2. Check values (common practice, no source): at low SO2/H2O a beta of 1-2 % already
# makes sulfurous-acid formation exceed sulfuric-acid formation; at SO2/H2O = 1 it does not.
set -eu
colchem=$1; root=$2; work=$3
mkdir -p "$work"; cd "$work"
run() {  # run NAME SET...
  local name=$1; shift
  "$colchem" box "$root/configs/labcell_box.yaml" -o "$name.nc" "$@" > "$name.log" 2>&1 || { cat "$name.log"; exit 1; }
}
run low1 --set chemistry.parameters.beta_h2so3=0.01
run low2 --set chemistry.parameters.beta_h2so3=0.02
run equal1 --set chemistry.parameters.beta_h2so3=0.01 --set 'box.initial.SO2=2.431e16 cm-3' \
    --set 'box.initial.H2O=2.431e16 cm-3'
/usr/bin/python3 - <<'PY'
import netCDF4
def rates(name):
    ds = netCDF4.Dataset(name + ".nc")
    eqs = [str(e) for e in ds["reaction_equation"][:]]
    r = ds["reaction_rate"][-1, :]
    get = lambda eq: float(r[eqs.index(eq)])
    return get("SO2(a3B1) + H2O -> H2SO3"), get("SO3 + 2 H2O -> H2SO4 + H2O")
for name, beta in (("low1", 0.01), ("low2", 0.02)):
    h2so3, h2so4 = rates(name)
    print(f"SO2/H2O = 0.02, beta = {beta}: H2SO3 {h2so3:.3e}, H2SO4 {h2so4:.3e} cm-3 s-1")
    assert h2so3 > h2so4, name
h2so3, h2so4 = rates("equal1")
print(f"SO2/H2O = 1, beta = 0.01: H2SO3 {h2so3:.3e}, H2SO4 {h2so4:.3e} cm-3 s-1")
assert h2so3 < h2so4
# Doubling beta doubles H2SO3 formation (first order in beta; analytic).
assert abs(rates("low2")[0] / rates("low1")[0] - 2.0) < 1e-3
print("ok: sulfurous acid out-paces sulfuric acid at low SO2/H2O for beta = 1-2 %")
PY
