"""Reading one cell of a measured table: numbers with a decimal point or a decimal comma,
dates and times, and the numbers a person could read two ways.

A number written ``1,000`` is one thousand with a thousands separator in English locales and
one with a decimal comma in most European ones (common practice). It is read only when the
file's other numbers settle the question (the table's ``decimal`` is ``"comma"``); otherwise
:func:`number` refuses it with :class:`CellError`. ``1_000`` is not a number (Python's
``float`` would read it, JavaScript's ``Number`` would not, and no file means it).
"""

from __future__ import annotations

import re

__all__ = ["CellError", "is_number", "is_time", "is_value", "number"]

_POINT_DECIMAL = re.compile(r"^[+-]?\d*\.\d+([eE][+-]?\d+)?$")
"""A number with a decimal point (``12.5``, ``.5``, ``1.5e3``)."""
_COMMA_DECIMAL = re.compile(r"^[+-]?\d*,\d+([eE][+-]?\d+)?$")
"""A number with a decimal comma (``12,5``, ``,5``)."""
_AMBIGUOUS = re.compile(r"^[+-]?[1-9]\d{0,2},\d{3}$")
"""A thousands group or a decimal comma: ``1,000``."""
_POINT_THOUSANDS = re.compile(r"^[+-]?[1-9]\d{0,2}\.\d{3}$")
"""A thousands group or a decimal point: ``1.000`` in a file of decimal commas."""
_PLAIN = re.compile(r"^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$|^[+-]?(nan|inf|infinity)$", re.I)
"""What :func:`number` hands to ``float`` after the comma is settled."""
_TIME = re.compile(
    r"^(\d{1,4}[-./]\d{1,2}[-./]\d{1,4}([ T]+\d{1,2}:\d{2}(:\d{2}([.,]\d+)?)?)?"
    r"|\d{1,2}:\d{2}(:\d{2}([.,]\d+)?)?)"
    r"( ?(AM|PM|am|pm))?(Z|[+-]\d{2}:?\d{2})?$"
)
"""A date, a date and time, or a time of day (ISO 8601, day-first or month-first)."""
_POINT_AMBIGUOUS = (
    "'{}' is ambiguous in a file with decimal commas: one thousand with a point as thousands "
    "separator, or one with a decimal point? Write numbers without a thousands separator."
)


class CellError(ValueError):
    """A cell that cannot be read as a number; ``message`` says why in plain words."""

    def __init__(self, message: str) -> None:
        super().__init__(message)
        self.message = message


def _clean(cell: str) -> str:
    """The cell without surrounding blanks and quotes, with a typographic minus as ``-``
    and no-break spaces (a thousands space in some locales) removed."""
    return cell.strip().strip('"').strip().replace("\u2212", "-").replace("\u00a0", "")


def number(cell: str, decimal: str = "point") -> float | None:
    """Read one cell as a number.

    Parameters
    ----------
    cell : str
        The cell as the file has it.
    decimal : str
        The table's decimal mark, ``"point"`` or ``"comma"`` (see :mod:`driftdose.tables`).

    Returns
    -------
    float or None
        The number (``nan`` and ``inf`` as written), or None for an empty cell.

    Raises
    ------
    CellError
        If the cell is text, or a number that reads two ways (``1,000`` where the file does
        not show decimal commas; ``1.000`` where it does).

    Examples
    --------
    >>> number("12,5"), number("1,000", "comma"), number(" 3e-2 "), number("")
    (12.5, 1.0, 0.03, None)

    """
    if cell.isascii() and not any(ch in cell for ch in ',_"') and cell.strip():
        try:  # the common case, read as fast as the engine can: ASCII without a comma
            value = float(cell)
        except ValueError:
            raise CellError(f"{cell.strip()[:30]!r} is not a number.") from None
        if decimal == "comma" and _POINT_THOUSANDS.match(cell.strip()):
            raise CellError(_POINT_AMBIGUOUS.format(cell.strip()))
        return value
    s = _clean(cell)
    if not s:
        return None
    if "_" in s:
        raise CellError(f"{s[:30]!r} is not a number.")
    if _COMMA_DECIMAL.match(s):
        if decimal != "comma" and _AMBIGUOUS.match(s):
            raise CellError(
                f"{s!r} is ambiguous: one thousand with a thousands separator, or one with a "
                "decimal comma? Write numbers without a thousands separator, with a point or a "
                "comma for decimals."
            )
        s = s.replace(",", ".")
    elif decimal == "comma" and _POINT_THOUSANDS.match(s):
        raise CellError(_POINT_AMBIGUOUS.format(s))
    if not _PLAIN.match(s):
        raise CellError(f"{s[:30]!r} is not a number.")
    return float(s)


def is_number(cell: str) -> bool:
    """Tell whether a cell reads as a number with either decimal mark (ambiguous ones too).

    Parameters
    ----------
    cell : str
        The cell's text.

    Examples
    --------
    >>> is_number("1,000"), is_number("Größe"), is_number("")
    (True, False, False)

    """
    s = _clean(cell)
    if not s or "_" in s:
        return False
    return bool(_PLAIN.match(s) or _COMMA_DECIMAL.match(s))


def is_time(cell: str) -> bool:
    """Tell whether a cell is a date, a date and time, or a time of day.

    Parameters
    ----------
    cell : str
        The cell's text.

    Examples
    --------
    >>> is_time("2026-03-04 10:15:00"), is_time("04.03.2026"), is_time("10:15"), is_time("a")
    (True, True, True, False)

    """
    return bool(_TIME.match(_clean(cell)))


def is_value(cell: str) -> bool:
    """Tell whether a cell holds a measured value: a number, a date or a time.

    Parameters
    ----------
    cell : str
        The cell's text.
    """
    return is_number(cell) or is_time(cell)


def decimal_evidence(cell: str) -> tuple[bool, bool]:
    """Return (shows a decimal comma, shows a decimal point) for one cell.

    A comma shows a decimal comma only where it cannot be a thousands group (``12,5``,
    ``0,125``, ``1234,567``); a point shows a decimal point likewise (``12.5``, ``0.125``).

    Parameters
    ----------
    cell : str
        The cell's text.
    """
    s = _clean(cell)
    if _COMMA_DECIMAL.match(s):
        return (not _AMBIGUOUS.match(s), False)
    if _POINT_DECIMAL.match(s):
        return (False, not _POINT_THOUSANDS.match(s))
    return (False, False)
