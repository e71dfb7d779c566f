"""Unit conversion at the boundary: the only place where non-SI units exist.

Each unit kind maps accepted unit spellings to a linear factor to SI (or an affine pair for
temperature). Canonical spellings are ASCII (``um``, ``degC``, ``m3``); the usual typographic
alternatives (``µm``, ``μm``, ``°C``, ``m³``) are accepted as aliases.
"""

from __future__ import annotations

from ..unit_labels import unit_label, unit_text

__all__ = [
    "REPLY_UNITS",
    "SI_UNIT",
    "UNITS",
    "UNIT_CODES",
    "auto_unit",
    "canonical_unit",
    "from_si",
    "to_si",
    "unit_label",
    "unit_table",
]

UNITS: dict[str, dict[str, float]] = {
    "length": {"m": 1.0, "cm": 1e-2, "mm": 1e-3, "um": 1e-6, "nm": 1e-9},
    "density": {"kg/m3": 1.0, "g/cm3": 1000.0, "g/mL": 1000.0},
    "temperature": {"K": 1.0, "degC": 1.0, "degF": 5.0 / 9.0},
    "pressure": {
        "Pa": 1.0,
        "hPa": 100.0,
        "kPa": 1000.0,
        "bar": 1e5,
        "atm": 101325.0,
        "mmHg": 133.322387415,
        "psi": 6894.757293168,
    },
    "time": {"s": 1.0, "ms": 1e-3, "min": 60.0, "h": 3600.0},
    "flow": {"m3/s": 1.0, "L/min": 1e-3 / 60.0, "m3/h": 1.0 / 3600.0, "cm3/s": 1e-6},
    "velocity": {"m/s": 1.0, "cm/s": 1e-2, "mm/s": 1e-3, "um/s": 1e-6},
    "dimensionless": {"1": 1.0},
    "number_concentration": {"1/m3": 1.0, "1/cm3": 1e6},
    "mass_concentration": {"kg/m3": 1.0, "mg/m3": 1e-6, "ug/m3": 1e-9},
    "surface_concentration": {"m2/m3": 1.0, "um2/cm3": 1e-6},
    "area": {"m2": 1.0, "mm2": 1e-6, "um2": 1e-12},
    "mass": {"kg": 1.0, "mg": 1e-6, "ug": 1e-9},
    "volume": {"m3": 1.0, "L": 1e-3},
    "angle": {"deg": 0.017453292519943295, "rad": 1.0},
    "ventilation": {"m3/h": 1.0 / 3600.0, "L/min": 1e-3 / 60.0, "m3/s": 1.0},
}

REPLY_UNITS: dict[str, dict[str, float]] = {
    "dimensionless": {"%": 0.01, "particles": 1.0},
    "time": {"d": 86400.0},
    "number_rate": {"1/h": 1.0, "particles/h": 1.0},
    "mass_rate": {"kg/h": 1.0, "ug/h": 1e-9},
    "area_rate": {"m2/h": 1.0, "mm2/h": 1e-6},
    "diffusivity": {"m2/s": 1.0},
    "viscosity": {"Pa.s": 1.0},
    "mobility": {"s/kg": 1.0},
}
"""Units that results use but no field offers, by kind: factor to the kind's base unit (the
unit of factor 1; an amount per hour has the amount per hour as its base)."""

SI_UNIT: dict[str, str] = {
    kind: next(u for u, f in table.items() if f == 1.0) for kind, table in UNITS.items()
}

_OFFSET = {"degC": 273.15, "degF": 459.67}  # added before scaling: K = (x + offset) * f

_ALIASES = {
    "m²/m³": "m2/m3",
    "µm²/cm³": "um2/cm3",
    "μm²/cm³": "um2/cm3",
    "m²": "m2",
    "mm²": "mm2",
    "µm²": "um2",
    "μm²": "um2",
    "µg": "ug",
    "μg": "ug",
    "µm": "um",
    "μm": "um",
    "µm/s": "um/s",
    "μm/s": "um/s",
    "micron": "um",
    "microns": "um",
    "°C": "degC",
    "C": "degC",
    "℃": "degC",
    "°F": "degF",
    "F": "degF",
    "kg/m³": "kg/m3",
    "g/cm³": "g/cm3",
    "g/ml": "g/mL",
    "m³/s": "m3/s",
    "m³/h": "m3/h",
    "cm³/s": "cm3/s",
    "l/min": "L/min",
    "lpm": "L/min",
    "1/cm³": "1/cm3",
    "cm-3": "1/cm3",
    "#/cm3": "1/cm3",
    "1/m³": "1/m3",
    "m-3": "1/m3",
    "mg/m³": "mg/m3",
    "µg/m3": "ug/m3",
    "µg/m³": "ug/m3",
    "μg/m3": "ug/m3",
    "μg/m³": "ug/m3",
    "m³": "m3",
    "l": "L",
    "sec": "s",
    "hr": "h",
    "-": "1",
    "\u2013": "1",  # the label shown for dimensionless quantities
    "": "1",
    "°": "deg",
}


def canonical_unit(kind: str, unit: str) -> str:
    """Return the canonical spelling of ``unit`` for ``kind``; raise KeyError if unknown."""
    table = UNITS[kind]
    u = unit.strip()
    if u in table:
        return u
    u = _ALIASES.get(u, u)
    if u in table:
        return u
    raise KeyError(unit)


def unit_table() -> dict[str, dict[str, float | str]]:
    """Every unit code with its label and its conversion to SI, for the page.

    Returns
    -------
    dict
        ``{code: {"label": ..., "text": ..., "kind": ..., "factor": ..., "offset": ...}}``: a
        value x in the unit is ``(x + offset) * factor`` in the base unit of its kind;
        ``label`` names the unit in a table column (``–`` for a pure number) and ``text`` is
        printed after a number (empty for a pure number). Replies carry unit codes only (a
        row's ``unit`` and ``si_unit``, ``x_unit: "um"``); the page labels and converts them
        with this table, sent once with the forms. A code shared by two kinds (``m3/h`` for
        flow and ventilation) has the same factor in both.
    """
    out: dict[str, dict[str, float | str]] = {}
    for units in (UNITS, REPLY_UNITS):
        for kind, table in units.items():
            for code, factor in table.items():
                out.setdefault(
                    code,
                    {
                        "label": unit_label(code),
                        "text": unit_text(code),
                        "kind": kind,
                        "factor": factor,
                        "offset": _OFFSET.get(code, 0.0),
                    },
                )
    return out


UNIT_CODES: frozenset[str] = frozenset(unit_table())
"""Every unit code a reply may carry."""


def to_si(value: float, kind: str, unit: str) -> float:
    """Convert ``value`` in ``unit`` of ``kind`` to SI."""
    u = canonical_unit(kind, unit)
    return (value + _OFFSET.get(u, 0.0)) * UNITS[kind][u]


def from_si(value: float, kind: str, unit: str) -> float:
    """Convert an SI ``value`` of ``kind`` to ``unit``."""
    u = canonical_unit(kind, unit)
    return value / UNITS[kind][u] - _OFFSET.get(u, 0.0)


_LADDERS: dict[str, list[tuple[float, str]]] = {
    # (upper bound in SI, unit): the first whose bound exceeds |value| is used
    "length": [(1e-6, "nm"), (1e-3, "um"), (1.0, "mm"), (float("inf"), "m")],
    "time": [(1.0, "ms"), (120.0, "s"), (7200.0, "min"), (float("inf"), "h")],
    "velocity": [(1e-3, "um/s"), (0.1, "mm/s"), (float("inf"), "m/s")],
}


def auto_unit(kind: str, si: float, default: str | None = None) -> str:
    """Pick a readable display unit for an SI value of ``kind`` (``default`` if no ladder)."""
    for bound, unit in _LADDERS.get(kind, []):
        if abs(si) < bound:
            return unit
    return default or SI_UNIT[kind]
