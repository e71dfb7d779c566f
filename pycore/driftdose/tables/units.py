"""Units written in column headers: ``Dp [nm]``, ``dN/dlogDp (#/cm³)``, ``Dp / µm``,
``conc_mg/m3``, ``diameter_nm``.

Interface: :func:`header_unit` splits a header into its name and the unit written with it
and, where the unit is one this package converts, gives its canonical spelling (the api's
unit codes: ``nm``, ``um``, ``1/cm3``, ``mg/m3`` ...) and the kind of quantity. A unit in
square brackets is always taken as written; one in parentheses, after `` / `` or after the
last ``_`` or blank only when it is a known unit (``Sizer (invented)`` keeps its name).
:func:`is_unit` tells whether a cell is a known unit (for a row of units below the names).

Spellings are those instruments and spreadsheets use (common practice): ``µ``, ``μ`` or
``u`` for micro; ``³``, ``3``, ``^3`` or ``^-3`` for powers; ``#``, ``p``, ``1`` or ``per``
for a count (``#/cm³``, ``p/cc``, ``per_cm3``, ``cm-3``); ``cc`` for cm³.
"""

from __future__ import annotations

import re
from dataclasses import dataclass

__all__ = ["HeaderUnit", "header_unit", "is_unit", "unit_code"]

_KNOWN: dict[str, tuple[str, str]] = {
    # normalised spelling -> (canonical code, kind of quantity)
    "nm": ("nm", "length"),
    "um": ("um", "length"),
    "micron": ("um", "length"),
    "microns": ("um", "length"),
    "mm": ("mm", "length"),
    "cm": ("cm", "length"),
    "m": ("m", "length"),
    "1/cm3": ("1/cm3", "number_concentration"),
    "cm-3": ("1/cm3", "number_concentration"),
    "1/m3": ("1/m3", "number_concentration"),
    "m-3": ("1/m3", "number_concentration"),
    "1/l": ("1/L", "number_concentration"),
    "l-1": ("1/L", "number_concentration"),
    "mg/m3": ("mg/m3", "mass_concentration"),
    "ug/m3": ("ug/m3", "mass_concentration"),
    "ng/m3": ("ng/m3", "mass_concentration"),
    "g/m3": ("g/m3", "mass_concentration"),
    "um2/cm3": ("um2/cm3", "surface_concentration"),
    "nm2/cm3": ("nm2/cm3", "surface_concentration"),
    "s": ("s", "time"),
    "sec": ("s", "time"),
    "ms": ("ms", "time"),
    "min": ("min", "time"),
    "h": ("h", "time"),
    "hr": ("h", "time"),
    "degc": ("degC", "temperature"),
    "°c": ("degC", "temperature"),
    "c": ("degC", "temperature"),
    "k": ("K", "temperature"),
    "pa": ("Pa", "pressure"),
    "hpa": ("hPa", "pressure"),
    "kpa": ("kPa", "pressure"),
    "l/min": ("L/min", "flow"),
    "lpm": ("L/min", "flow"),
    "%": ("%", "fraction"),
}
_LOOSE = {"%", "s", "h", "nm", "um", "mm", "cm", "micron", "microns", "ms", "min", "sec", "lpm"}
"""Units read after ``_`` or a blank without brackets only if they are these, or contain a
``/`` or a power (a lone ``m``, ``c`` or ``k`` after a name is too often part of the name)."""

_BRACKETS = re.compile(r"^(?P<name>.*?)\s*\[(?P<unit>[^\[\]]*)\]\s*$")
_PARENS = re.compile(r"^(?P<name>.*?)\s*\((?P<unit>[^()]*)\)\s*$")
_SLASH = re.compile(r"^(?P<name>.*?\S)\s+/\s+(?P<unit>\S.*)$")
_SUFFIX = re.compile(r"^(?P<name>.*?[^_ ])[_ ](?P<unit>(per_|in_)?[^_ ]+)$")
_DISTRIBUTION = (
    (re.compile(r"d\s*n\s*/\s*d\s*log\s*(10\s*)?\(?\s*d", re.I), "dN/dlogDp"),
    (re.compile(r"d\s*n\s*/\s*d\s*d", re.I), "dN/dDp"),
)


@dataclass(frozen=True)
class HeaderUnit:
    """A header split into name and unit.

    Attributes
    ----------
    label : str
        The name without the unit (the whole header if no unit is written).
    unit : str or None
        The unit as written (``#/cm³``), or None.
    code : str or None
        Its canonical spelling (``1/cm3``) if known, else None.
    quantity : str or None
        ``length``, ``number_concentration``, ``mass_concentration``,
        ``surface_concentration``, ``time``, ``temperature``, ``pressure``, ``flow`` or
        ``fraction``; None if the unit is unknown.
    distribution : str or None
        ``dN/dlogDp`` or ``dN/dDp`` when the name says the column is a size distribution.

    """

    label: str
    unit: str | None = None
    code: str | None = None
    quantity: str | None = None
    distribution: str | None = None


def _normalise(unit: str) -> str:
    u = unit.strip().lower().replace(" ", "")
    for a, b in (("µ", "u"), ("μ", "u"), ("³", "3"), ("²", "2"), ("⁻", "-"), ("¹", "1")):
        u = u.replace(a, b)
    u = u.replace("**", "").replace("^", "").replace("cc", "cm3").replace("cm33", "cm3")
    u = re.sub(r"^(#|p|n|pt|particles|counts?|per_?|1)/", "1/", u)
    u = re.sub(r"^per_?", "1/", u)
    u = re.sub(r"^/", "1/", u)
    u = u.replace("in_", "")
    return u


def unit_code(unit: str) -> tuple[str, str] | None:
    """Return (canonical code, kind of quantity) of a written unit, or None if unknown.

    Parameters
    ----------
    unit : str
        The unit as written (``#/cm³``, ``µg/m3``).

    Examples
    --------
    >>> unit_code("#/cm³"), unit_code("µg/m3"), unit_code("p/cc"), unit_code("furlongs")
    (('1/cm3', 'number_concentration'), ('ug/m3', 'mass_concentration'), \
('1/cm3', 'number_concentration'), None)

    """
    return _KNOWN.get(_normalise(unit))


def is_unit(cell: str) -> bool:
    """Tell whether a cell is a known unit, with or without brackets (``nm``, ``[#/cm³]``).

    Parameters
    ----------
    cell : str
        The cell's text.
    """
    s = cell.strip()
    if len(s) >= 2 and s[0] + s[-1] in ("[]", "()"):
        s = s[1:-1]
    return bool(s) and unit_code(s) is not None


def _distribution(label: str) -> str | None:
    for pattern, name in _DISTRIBUTION:
        if pattern.search(label):
            return name
    return None


def _made(label: str, unit: str | None) -> HeaderUnit:
    known = unit_code(unit) if unit else None
    code, quantity = known if known else (None, None)
    return HeaderUnit(label, unit, code, quantity, _distribution(label))


def header_unit(header: str) -> HeaderUnit:
    """Split a column header into its name and the unit written with it.

    Parameters
    ----------
    header : str
        The header cell.

    Returns
    -------
    HeaderUnit
        Name, unit as written, canonical code and kind of quantity.

    Examples
    --------
    >>> h = header_unit("dN/dlogDp (#/cm³)")
    >>> h.label, h.unit, h.code, h.distribution
    ('dN/dlogDp', '#/cm³', '1/cm3', 'dN/dlogDp')
    >>> header_unit("conc_mg/m3").code, header_unit("Dp [nm]").label
    ('mg/m3', 'Dp')
    >>> header_unit("Sizer (invented)").unit is None
    True

    """
    h = header.strip()
    m = _BRACKETS.match(h)
    if m and m["unit"].strip():
        return _made(m["name"].strip() or h, m["unit"].strip())
    for pattern in (_PARENS, _SLASH):
        m = pattern.match(h)
        if m and unit_code(m["unit"]) is not None:
            return _made(m["name"].strip() or h, m["unit"].strip())
    m = _SUFFIX.match(h)
    if m:
        norm = _normalise(m["unit"])
        if norm in _KNOWN and (norm in _LOOSE or "/" in norm or norm[-1].isdigit()):
            return _made(m["name"].strip(), m["unit"])
    return _made(h, None)
