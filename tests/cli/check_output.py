"""Opens a colchem output with xarray (Debian's python3-xarray) and checks that the CF
metadata decodes: altitude is the coordinate, in km, increasing upward; every data variable
has UDUNITS-parsable units text (texts and flags excepted); pressure falls with altitude."""
import sys

import numpy as np
import xarray as xr

ds = xr.open_dataset(sys.argv[1])
alt = ds["altitude"]
assert alt.attrs["units"] == "km", alt.attrs
assert alt.attrs["positive"] == "up"
assert np.all(np.diff(alt.values) > 0), "altitude must increase"
assert "altitude" in ds["temperature"].dims
assert ds["temperature"].attrs["units"] == "K"
p = ds["pressure"].values
assert ds["pressure"].attrs["units"] == "Pa"
assert np.all(np.diff(p) < 0), "pressure must fall with altitude"
for name, var in ds.data_vars.items():
    # Texts (the provenance variables) and CF flags (CF-1.10 section 3.5: flag_values and
    # flag_meanings instead of units) carry no units.
    if var.dtype.kind in "OSU" or "flag_values" in var.attrs:
        continue
    assert "units" in var.attrs, f"{name} has no units"
assert ds.attrs["Conventions"] == "CF-1.10"
assert "grid:" in ds["provenance_scenario"].item()
print(f"xarray: {len(ds.data_vars)} variables, altitude {alt.values[0]:.2f}-{alt.values[-1]:.2f} km")
