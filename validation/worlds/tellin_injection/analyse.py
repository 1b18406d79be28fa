"""Tellin SO2 injection: e-folding time of the injected SO2 column and the altitude of the
sulfate layer, from the snapshots of a transient run (configs/tellin.yaml).

Check values: the e-folding time of stratospheric SO2 after a large volcanic injection is
about a month (about 35 days for Pinatubo 1991: Bluth et al. 1992, Geophys. Res. Lett. 19,
151; from memory); the sulfate layer forms at 15-20 km (common practice, no source).
Usage: analyse.py RUN.nc [min_days max_days]. Exits 1 outside the accepted range
(default 20-60 days; peak of the sulfate layer within 14-22 km)."""
import sys

import netCDF4
import numpy as np

ds = netCDF4.Dataset(sys.argv[1])
lo, hi = (float(sys.argv[2]), float(sys.argv[3])) if len(sys.argv) > 3 else (20.0, 60.0)
names = [str(s) for s in ds["species_name"][:]]
t = ds["snapshot"][:] / 86400.0
col = ds["snapshot_column_density"][:]          # (snapshot, species)
so2 = col[:, names.index("SO2")]
inj = float(ds.getncattr("colchem_injection_time_s")) / 86400.0 if "colchem_injection_time_s" in ds.ncattrs() else 10.0
before = so2[t < inj]
background = before[-1] if before.size else 0.0
after = t > inj + 0.5
excess = so2[after] - background
tt = t[after]
ok = excess > 0
# e-folding time from a least-squares fit of log(excess) against time.
slope, intercept = np.polyfit(tt[ok], np.log(excess[ok]), 1)
tau = -1.0 / slope
print(f"SO2 column: background {background:.3e} cm-2, excess at {tt[0]:.1f} d {excess[0]:.3e} cm-2")
print(f"e-folding time of the injected SO2: {tau:.1f} days (accepted {lo:.4g}-{hi:.4g})")
alt = ds["altitude"][:]
nd = ds["snapshot_number_density"][:]          # (snapshot, species, altitude)
sulfate = [n for n in names if n.startswith("H2SO4")]
layer = sum(nd[-1, names.index(n), :] for n in sulfate)
peak = float(alt[int(np.argmax(layer))])
print(f"sulfate ({' + '.join(sulfate)}) peaks at {peak:.1f} km at day {t[-1]:.0f} (accepted 14-22)")
sys.exit(0 if lo <= tau <= hi and 14.0 <= peak <= 22.0 else 1)
