"""Helpers that shape results for the page: values in display units, named by unit code.

Display units are chosen here, at the boundary; the core only ever sees SI. A row names its
units by code (``um``, ``1/cm3``, ``1`` for a pure number); the page, the command line, the
CSV export and the printed record label them from the one table (:func:`units.unit_table`).
"""

from __future__ import annotations

from typing import Any

from .units import SI_UNIT, UNIT_CODES, auto_unit, canonical_unit, from_si

__all__ = ["quantity", "row", "shared_axis", "text_result", "unit_code"]


def unit_code(unit: str) -> str:
    """Check that ``unit`` is a code of the unit table and return it.

    Parameters
    ----------
    unit : str
        A unit code (``um``, ``m2/s``, ``1``).

    Returns
    -------
    str
        The same code.

    Raises
    ------
    ValueError
        If the table has no such code (a label such as ``µm`` is not a code).
    """
    if unit not in UNIT_CODES:
        raise ValueError(f"not a unit code of the table: {unit!r}")
    return unit


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
    ``kind`` None, ``unit`` is the code of an SI unit shown as is (e.g. ``m2/s``).
    """
    if kind is None:
        code = unit_code(unit or "1")
        shown, unit_out, si_unit = si, code, code
    else:
        unit_out = canonical_unit(kind, unit or auto_unit(kind, si))
        shown, si_unit = from_si(si, kind, unit_out), SI_UNIT[kind]
    return {
        "label": label,
        "symbol": symbol,
        "value": shown,
        "unit": unit_out,
        "si": si,
        "si_unit": si_unit,
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
        Size of one display ``unit`` in SI units [-].
    unit : str
        Code of the display unit in the unit table (``ug``, ``1`` for a pure number).
    si_unit : str
        Code of the SI unit (``kg``).
    symbol : str
        Symbol shown beside the label.
    note : str
        A short remark.

    Returns
    -------
    dict
        ``label``, ``symbol``, ``value``, ``unit``, ``si``, ``si_unit`` and ``note``.

    Raises
    ------
    ValueError
        If ``unit`` or ``si_unit`` is not a code of the unit table.
    """
    return {
        "label": label,
        "symbol": symbol,
        "value": si / factor,
        "unit": unit_code(unit),
        "si": si,
        "si_unit": unit_code(si_unit),
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
