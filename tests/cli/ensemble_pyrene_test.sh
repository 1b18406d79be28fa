#!/usr/bin/env bash
# Members of a real network converge (issue 15): a seeded 12-member ensemble of Pyrene
# (configs/pyrene_full.yaml at its 54 cells, seed 1, Latin hypercube) must have at most
# MAX_FAILED failed members. Before the fix of a zero pseudo-time step after an undone
# clipped step (solve/steady_state.cpp) and the continuation in the rate factors
# (solve/continuation.hpp), 6 of these 12 members failed (measured on the code before, on
# this machine); now 2 fail (both stall near a residual of 1 on the continuation path and
# from the cold start at this unresolved 54-cell grid). The bound, 3, leaves a margin of one
# member for round-off (a member near a fold of the continuation path may need one more
# halving) and still fails if the failure fraction returns to half or more. It also
# checks that a failed member is recorded with its reason and left out of the count of
# converged members, and that a member that converged by continuation says so.
set -eu
colchem=$1; root=$2; work=$3
MAX_FAILED=3
mkdir -p "$work"; cd "$work"
"$colchem" --log-level warn ensemble "$root/configs/pyrene_full.yaml" -n 12 --seed 1 \
  -o pyrene12.nc > pyrene12.log
grep "converged," pyrene12.log
/usr/bin/python3 - "$MAX_FAILED" <<'PY'
import sys, netCDF4, numpy as np
max_failed = int(sys.argv[1])
e = netCDF4.Dataset("pyrene12.nc")
conv = np.asarray(e["member_converged"][:]).astype(int)
status = [str(s) for s in e["member_status"][:]]
failed = int(np.sum(conv == 0))
for m, (c, s) in enumerate(zip(conv, status)):
    print(f"member {m + 1}: {s}")
    assert (c == 1) == s.startswith("converged"), (m, c, s)
    assert c == 1 or len(s) > 20, ("a failed member needs its reason", m, s)
assert int(e.getncattr("ensemble_converged")) == 12 - failed
assert any(s.startswith("converged by continuation (s = ") for s in status), status
assert failed <= max_failed, f"{failed} of 12 members failed (at most {max_failed} allowed)"
print(f"ok: {failed} of 12 members failed (bound {max_failed})")
PY
