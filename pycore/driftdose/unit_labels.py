"""Typographic labels of unit codes (``um`` -> ``µm``): one table for replies, exports and forms.

Replies name units by code; :func:`unit_label` gives the label people read and
:func:`unit_text` the label printed after a number (nothing for a pure number). The api sends
the whole table to the page with the forms (:func:`driftdose.api.units.unit_table`), and the
CSV export and the command line label with it, so a unit is spelled one way everywhere.
"""

from __future__ import annotations

__all__ = ["LABELS", "UNPRINTED", "unit_label", "unit_text"]

LABELS: dict[str, str] = {
    "um": "µm",
    "um/s": "µm/s",
    "degC": "°C",
    "degF": "°F",
    "kg/m3": "kg/m³",
    "g/cm3": "g/cm³",
    "m3/s": "m³/s",
    "m3/h": "m³/h",
    "cm3/s": "cm³/s",
    "1/cm3": "1/cm³",
    "1/m3": "1/m³",
    "mg/m3": "mg/m³",
    "ug/m3": "µg/m³",
    "m2/m3": "m²/m³",
    "um2/cm3": "µm²/cm³",
    "m2": "m²",
    "mm2": "mm²",
    "um2": "µm²",
    "ug": "µg",
    "m3": "m³",
    "1": "–",
    "deg": "°",
    "m2/s": "m²/s",
    "Pa.s": "Pa·s",
    "ug/h": "µg/h",
    "m2/h": "m²/h",
    "mm2/h": "mm²/h",
}
"""Label of every unit code whose label differs from the code."""


def unit_label(unit: str) -> str:
    """Typographic label of a unit code.

    Parameters
    ----------
    unit : str
        A unit code (``um``, ``degC``, ``1/cm3``, ``1`` for a pure number).

    Returns
    -------
    str
        Its label (``µm``, ``°C``, ``1/cm³``, ``–``); a code without an entry is its own label.
    """
    return LABELS.get(unit, unit)


UNPRINTED: frozenset[str] = frozenset({"1", ""})
"""Codes of pure numbers: a table column names them (``–``), nothing follows a number."""


def unit_text(unit: str) -> str:
    """The label printed after a number in a unit code: nothing for a pure number.

    Parameters
    ----------
    unit : str
        A unit code (``um``, ``1`` for a pure number).

    Returns
    -------
    str
        ``""`` for a pure number, else :func:`unit_label` (``µm``).
    """
    return "" if unit in UNPRINTED else unit_label(unit)
