"""Units of colchem files through pint.

The files carry UDUNITS-2 unit strings in their `units` attributes (`cm-3`, `cm2 s-1`,
`m s-2`, `1`) and the observation files carry them in their headers (`value [nmol/mol]`,
`[ppb]`, `[%]`). pint reads the products and powers once the UDUNITS exponent form
(`cm-3`) is rewritten as pint's (`cm**-3`). pint 0.19 does not know the dimensionless
constants `ppm`, `ppb`, `ppt` and `%`; those are taken from the UDUNITS-2 database itself
(the one colchem's C++ side reads, udunits2-common.xml: every unit whose definition is a
plain number), so Python and C++ agree and no unit is written down here.
"""
import functools
import os
import re
import xml.etree.ElementTree as ET

import pint

# UDUNITS writes powers as a signed integer after the symbol (cm-3, cm2); pint wants **.
_POWER = re.compile(r"(?<![\w.])([A-Za-z_]+)(-?\d+)(?![\w.])")
_XML_DIRS = ("/usr/share/xml/udunits", "/usr/local/share/udunits", "/usr/share/udunits")


def _udunits_xml():
    """The UDUNITS-2 database colchem reads (UDUNITS2_XML_PATH, as in src/core/units.cpp)."""
    path = os.environ.get("UDUNITS2_XML_PATH")
    if path and os.path.isfile(path):
        return path
    for d in _XML_DIRS:
        p = os.path.join(d, "udunits2.xml")
        if os.path.isfile(p):
            return p
    return None


def _udunits_constants(path):
    """(name, value) of every UDUNITS unit defined by a plain number (percent, ppm, ...)."""
    out = []
    folder = os.path.dirname(path)
    files = [path] + [os.path.join(folder, e.text) for e in ET.parse(path).getroot().iter("import")
                      if e.text and os.path.isfile(os.path.join(folder, e.text))]
    for f in files:
        for unit in ET.parse(f).getroot().iter("unit"):
            d = unit.find("def")
            if d is None or d.text is None:
                continue
            try:
                value = float(d.text)
            except ValueError:
                continue
            names = [e.text for e in unit.iter("symbol")] + [e.text for e in unit.iter("singular")]
            out += [(n.strip(), value) for n in names if n and n.strip()]
    return out


def _preprocess(text):
    text = text.strip()
    if text in ("", "1"):
        return "dimensionless"
    return _POWER.sub(r"\1**\2", text.replace("%", "percent"))


@functools.lru_cache(maxsize=1)
def registry():
    """One pint registry for the package (cached; pint registries are not mixed)."""
    ureg = pint.UnitRegistry(preprocessors=[_preprocess], on_redefinition="ignore")
    xml = _udunits_xml()
    if xml:
        for name, value in _udunits_constants(xml):
            if name == "%":
                name = "percent"
            if not re.fullmatch(r"[A-Za-z_]+", name):
                continue
            # Only names pint does not define itself (it reads ppt as pico-pint).
            if name in getattr(ureg, "_units", {}):
                continue
            ureg.define(f"{name} = {value!r}")
    return ureg


def unit(text, where="unit"):
    """The pint unit of a UDUNITS-style string; ValueError naming `where` if unknown."""
    try:
        return registry().Unit(text)
    except Exception as e:  # pint raises several kinds
        raise ValueError(f"{where}: expected a unit pint or UDUNITS-2 knows, found {text!r} ({e})")


def factor(from_unit, to_unit, where="unit"):
    """The number that converts a value in from_unit to to_unit (e.g. nmol/mol -> 1: 1e-9)."""
    q = registry().Quantity(1.0, unit(from_unit, where))
    try:
        return float(q.to(unit(to_unit, where)).magnitude)
    except pint.errors.DimensionalityError as e:
        raise ValueError(f"{where}: expected a unit convertible to {to_unit!r}, found "
                         f"{from_unit!r} ({e})")


def quantity(da):
    """A DataArray's values as a pint Quantity from its `units` attribute."""
    u = da.attrs.get("units")
    if u is None:
        raise ValueError(f"{da.name}: expected a `units` attribute, found none")
    return registry().Quantity(da.values, unit(u, f"{da.name}:units"))


def convert(da, to_unit):
    """A DataArray converted to to_unit (values scaled, `units` attribute replaced)."""
    f = factor(da.attrs.get("units", "1"), to_unit, f"{da.name}:units")
    out = da * f
    out.attrs = dict(da.attrs, units=to_unit)
    return out
