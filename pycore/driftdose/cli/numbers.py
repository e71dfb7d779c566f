"""Numbers as the page shows them: the one number formatter of the command line.

Tables use the page's rounding (four significant figures, the semantics of JavaScript's
``Number.prototype.toPrecision``; see ``site/js/format.js``); CSV cells the same rounding with
``e`` for powers of ten, or full precision. Every number the command line writes goes through
this module.
"""

from __future__ import annotations

import math
import re
from decimal import ROUND_HALF_UP, Decimal
from typing import Any

SIG_FIGS = 4  # as SIG_FIGS in site/js/format.js
MAX_DIGITS = 17  # enough to write any double exactly; more digits would only be noise
_SUPERSCRIPT = str.maketrans("-0123456789", "⁻⁰¹²³⁴⁵⁶⁷⁸⁹")


def to_precision(value: float, digits: int) -> str:
    """Return ``value.toPrecision(digits)`` exactly as JavaScript writes it.

    ECMAScript's ``Number.prototype.toPrecision`` rounds the exact binary value to ``digits``
    significant figures, taking the larger candidate on an exact tie (half away from zero),
    and switches to exponential notation when the decimal exponent is below -6 or at least
    ``digits``. Python's ``format(x, ".4g")`` rounds ties to even and so differs on values
    such as 1.0625.

    >>> to_precision(1.0625, 4), to_precision(12345.6, 4), to_precision(-0.000123456, 3)
    ('1.063', '1.235e+4', '-0.000123')
    """
    digits_text, exponent = _round_significant(value, digits)
    sign = "-" if value < 0 else ""
    if exponent < -6 or exponent >= digits:
        mantissa = digits_text[0] + ("." + digits_text[1:] if digits > 1 else "")
        return f"{sign}{mantissa}e{'+' if exponent >= 0 else '-'}{abs(exponent)}"
    if exponent >= digits - 1:
        return sign + digits_text
    if exponent >= 0:
        return f"{sign}{digits_text[: exponent + 1]}.{digits_text[exponent + 1 :]}"
    return f"{sign}0.{'0' * (-exponent - 1)}{digits_text}"


def to_exponential(value: float, fraction_digits: int) -> str:
    """Return ``value.toExponential(fraction_digits)`` as JavaScript writes it (``2.735e-11``)."""
    digits_text, exponent = _round_significant(value, fraction_digits + 1)
    sign = "-" if value < 0 else ""
    mantissa = digits_text[0] + ("." + digits_text[1:] if fraction_digits else "")
    return f"{sign}{mantissa}e{'+' if exponent >= 0 else '-'}{abs(exponent)}"


def _round_significant(value: float, digits: int) -> tuple[str, int]:
    """Digits (``digits`` of them) and decimal exponent of ``|value|``, ties away from zero.

    ``quantize`` rounds the exact binary value once (a double has up to 767 significant
    decimal digits; arithmetic such as ``scaleb`` would first round it to the context's 28).
    """
    exact = abs(Decimal(value))  # the exact binary value, as the ECMAScript algorithm uses
    if exact == 0:
        return "0" * digits, 0
    exponent = exact.adjusted()
    rounded = exact.quantize(Decimal(1).scaleb(exponent - digits + 1), rounding=ROUND_HALF_UP)
    if rounded.adjusted() > exponent:  # rounded up to the next power of ten
        exponent += 1
        rounded = exact.quantize(Decimal(1).scaleb(exponent - digits + 1), rounding=ROUND_HALF_UP)
    return "".join(map(str, rounded.as_tuple().digits)), exponent


def _trim_zeros(text: str) -> str:
    if "." not in text or "e" in text:
        return text
    return re.sub(r"\.?0+$", "", text)


def is_number(value: Any) -> bool:
    """A finite int or float (``typeof value === "number"`` and finite, in the page's terms)."""
    if isinstance(value, bool) or not isinstance(value, int | float):
        return False
    try:
        return math.isfinite(value)
    except OverflowError:  # an int beyond the float range
        return False


def format_number(value: Any, digits: int = SIG_FIGS) -> str:
    """Format a number exactly as the page does (``formatNumber`` in ``site/js/format.js``).

    >>> format_number(2.73456e-11), format_number(0.12345), format_number(100.0), format_number(0)
    ('2.735 × 10⁻¹¹', '0.1235', '100', '0')
    """
    if not is_number(value):
        return "—"
    if value == 0:
        return "0"
    if 1e-3 <= abs(value) < 1e6:
        text = to_precision(float(value), digits)
        # toPrecision writes 12350 as 1.235e+4; the page then writes the number out in full
        return js_string(float(text)) if "e" in text else _trim_zeros(text)
    mantissa, exponent = to_exponential(float(value), digits - 1).split("e")
    return f"{_trim_zeros(mantissa)} × 10{str(int(exponent)).translate(_SUPERSCRIPT)}"


def plain_number(value: Any, digits: int = SIG_FIGS) -> str:
    """The page's number written for spreadsheets: same rounding, ``e`` for powers of ten.

    ``digits`` 0 gives the full precision (the shortest text that reads back exactly); a
    missing value gives an empty text.

    >>> plain_number(2.73456e-11), plain_number(0.12345), plain_number(12345.6)
    ('2.735e-11', '0.1235', '12350')
    """
    if not is_number(value):
        return ""
    if digits <= 0:
        return repr(float(value))
    shown = format_number(value, digits)
    if " × 10" not in shown:
        return shown
    mantissa, power = shown.split(" × 10")
    return f"{mantissa}e{power.translate(str.maketrans('⁻⁰¹²³⁴⁵⁶⁷⁸⁹', '-0123456789'))}"


def js_string(value: Any) -> str:
    """A default value written as the page's form writes it (JavaScript ``String(value)``)."""
    if not isinstance(value, float) or not math.isfinite(value):
        return str(value)
    if value.is_integer() and abs(value) < 1e21:
        return str(int(value))
    if 1e-6 <= abs(value) < 1e21:
        return format(Decimal(repr(value)), "f")  # shortest digits, no exponent
    mantissa, exponent = repr(value).split("e")
    return f"{mantissa}e{'-' if exponent.startswith('-') else '+'}{int(exponent[1:])}"


def number_text(value: Any, digits: int) -> str:
    """A number for the terminal: as the page shows it, or in full with ``digits`` 0."""
    if digits <= 0:
        return plain_number(value, 0) or "—"
    return format_number(value, digits)
