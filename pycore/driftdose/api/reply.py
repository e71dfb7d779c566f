"""Helpers that shape results for the page: values in display units, with labels.

Display units are chosen here, at the boundary; the core only ever sees SI.
"""

from __future__ import annotations

from typing import Any

from .units import SI_UNIT, auto_unit, from_si, unit_label

__all__ = ["quantity", "row", "shared_axis", "text_result"]


def quantity(
    label: str,
    si: float,
    kind: str | None = None,
    unit: str | None = None,
    symbol: str = "",
    note: str = "",
) -> dict[str, Any]:
    """One result row: ``value`` in the display ``unit`` plus the SI value.

    With ``kind`` a unit kind of :mod:`units`, ``unit`` defaults to :func:`auto_unit`; with
    ``kind`` None, ``unit`` is an SI unit label shown as is (e.g. ``m²/s``).
    """
    if kind is None:
        shown, label_unit, si_unit = si, unit or "", unit or ""
    else:
        unit = unit or auto_unit(kind, si)
        shown, label_unit, si_unit = from_si(si, kind, unit), unit_label(unit), SI_UNIT[kind]
    return {
        "label": label,
        "symbol": symbol,
        "value": shown,
        "unit": label_unit,
        "si": si,
        "si_unit": unit_label(si_unit),
        "note": note,
    }


def text_result(label: str, text: str, note: str = "") -> dict[str, Any]:
    """Return a result row whose value is words, not a number."""
    return {"label": label, "text": text, "note": note}


def row(
    label: str,
    si: float,
    factor: float,
    unit: str,
    si_unit: str,
    symbol: str = "",
    note: str = "",
) -> dict[str, Any]:
    """One result row in a fixed display unit: ``value = si / factor``.

    Parameters
    ----------
    label : str
        What the value is.
    si : float
        The value in SI units (``si_unit``).
    factor : float
        Size of one display ``unit`` in SI units.
    unit : str
        Label of the display unit.
    si_unit : str
        Label of the SI unit.
    symbol : str
        Symbol shown beside the label.
    note : str
        A short remark.

    Returns
    -------
    dict
        ``label``, ``symbol``, ``value``, ``unit``, ``si``, ``si_unit`` and ``note``.
    """
    return {
        "label": label,
        "symbol": symbol,
        "value": si / factor,
        "unit": unit,
        "si": si,
        "si_unit": si_unit,
        "note": note,
    }


def shared_axis(curves: dict[str, Any], name: str, values: list[float]) -> str:
    """Send an x array once: store it in ``curves["axes"][name]`` and return ``name``.

    Curves that share their x values (the 241 diameters of every deposition or penetration
    curve, the output times of every retained amount) carry ``"x": name`` instead of a copy
    of the list; readers resolve it with :func:`driftdose.export.curve_x` (Python) or
    ``curveX`` of ``site/js/chartparts.js`` (page).

    Parameters
    ----------
    curves : dict
        The reply's ``curves`` object (changed in place).
    name : str
        The axis name, unique within the reply.
    values : list of float
        The x values, in the unit the curves' ``x_unit`` names.

    Returns
    -------
    str
        ``name``, to be used as the curves' ``x``.
    """
    curves.setdefault("axes", {})[name] = values
    return name
