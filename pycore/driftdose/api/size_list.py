"""Sizes the user types, declared once: the field, its parser and the table of exact values.

The sampling and deposition calculations answer at a short list of particle sizes the user
types (``"25 nm, 0.3 µm, 4 µm"``), computed by the models at those diameters rather than read
off the chart's curves. :data:`SIZES` is the field both declare; :func:`sizes_table` shapes a
composer's :class:`~driftdose.compose.at_sizes.SizeAnswers` into a reply table.

How the text is read
--------------------
Each entry is a number with an optional length unit after it (``nm``, ``µm``/``um``,
``mm``, ``m``), else the unit chosen beside the field. Entries are separated by commas or
blanks (``25 nm, 0.3 µm, 4 µm``); when the text holds a semicolon, semicolons and blanks
separate the entries and a comma is a decimal mark (``0,3 µm; 4 µm``). Without a semicolon a
comma between two digits (``2,5``) could be either and is refused; with one, a comma followed
by exactly three digits (``1,000``) could be a thousands separator and is refused, as in every
number field. At most :data:`MAX_SIZES` entries and :data:`MAX_TEXT` characters; each size
from 1 nm to 100 µm (the range of the curves).
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass
from typing import Any

from ..compose.at_sizes import SIZE_RANGE, SizeAnswers
from .fields import Field, FieldError
from .reply import row
from .units import auto_unit, canonical_unit, from_si, to_si, unit_label

__all__ = ["MAX_SIZES", "MAX_TEXT", "SIZES", "SizeListField", "size_text", "sizes_table"]

MAX_SIZES = 12
"""Most sizes answered at once."""
MAX_TEXT = 300
"""Longest text read, in characters (12 sizes with units and separators fit easily)."""

_NUMBER = re.compile(r"[-+\u2212]?(?:\d+(?:\.\d+)?|\.\d+)(?:[eE][-+]?\d+)?")
_NUMBER_COMMA = re.compile(r"[-+\u2212]?(?:\d+(?:[.,]\d+)?|[.,]\d+)(?:[eE][-+]?\d+)?")
_UNIT = re.compile(r"[A-Za-z\u00b5\u03bc]+")


def size_text(d: float) -> str:
    """A size for a row's name: three significant figures in nm, µm, mm or m (``25 nm``).

    Parameters
    ----------
    d : float
        The size. [m]
    """
    unit = auto_unit("length", d)
    return f"{from_si(d, 'length', unit):.3g} {unit_label(unit)}"


@dataclass(frozen=True)
class SizeListField(Field):
    """A field holding up to :data:`MAX_SIZES` particle sizes, given as text.

    Sent as ``{"value": "25 nm, 0.3 µm", "unit": "um"}`` (the unit of entries that name
    none) or as plain text; parsed into a list of sizes [m] in the order typed, ``[]`` when
    empty. Published with kind ``sizes``, its offered units and ``max_sizes``.
    """

    def describe(self) -> dict[str, Any]:
        """JSON-ready description: the base description with units, default and range."""
        out = super().describe()
        value, unit = self.default
        out["default"] = {"value": value, "unit": unit}
        out["units"] = [{"unit": u, "label": unit_label(u)} for u in self.units]
        out["range"] = self.range_text()
        out["max_sizes"] = MAX_SIZES
        return out

    def range_text(self) -> str:
        """The valid input in words."""
        lo, hi = SIZE_RANGE
        return f"up to {MAX_SIZES} sizes, each from {size_text(lo)} to {size_text(hi)}"

    def default_input(self) -> Any:
        """The default as a raw input (``{"value", "unit"}``)."""
        return {"value": self.default[0], "unit": self.default[1]}

    def parse(self, raw: Any) -> list[float]:
        """Read the sizes typed; raise :class:`FieldError` naming the first bad entry."""
        if isinstance(raw, dict):
            text, unit = raw.get("value"), raw.get("unit", self.default[1])
        else:
            text, unit = raw, self.default[1]
        if text is None:
            return []
        if isinstance(text, bool) or not isinstance(text, str | int | float):
            raise FieldError(self.name, f"{self.label}: type sizes as text, {self._valid()}.")
        text = str(text)
        if len(text) > MAX_TEXT:
            raise FieldError(
                self.name,
                f"{self.label}: at most {MAX_TEXT} characters ({len(text)} were given); "
                f"{self._valid()}.",
            )
        try:
            if not isinstance(unit, str):
                raise KeyError(unit)
            unit = canonical_unit("length", unit)
        except KeyError:
            offered = ", ".join(unit_label(u) for u in self.units)
            raise FieldError(self.name, f"{self.label}: choose a unit ({offered}).") from None
        sizes = []
        for n, (number, own_unit) in enumerate(self._entries(text), start=1):
            if n > MAX_SIZES:
                raise FieldError(
                    self.name, f"{self.label}: at most {MAX_SIZES} sizes; more were given."
                )
            sizes.append(self._size(n, number, own_unit or unit))
        return sizes

    def _valid(self) -> str:
        return f"e.g. 25 nm, 0.3 µm, 4 µm ({self.range_text()})"

    def _entries(self, text: str):
        """(number text, unit text or None) per entry, in order; FieldError on a bad entry."""
        decimal_comma = ";" in text
        number_at, separators = (_NUMBER_COMMA, ";") if decimal_comma else (_NUMBER, ",")
        pos, n, end = 0, 0, len(text)
        while True:
            while pos < end and (text[pos].isspace() or (n and text[pos] in separators)):
                pos += 1
            if pos >= end:
                return
            n += 1
            m = number_at.match(text, pos)
            if not m:
                shown = text[pos : pos + 12]
                raise FieldError(
                    self.name,
                    f"{self.label}: size {n} ({shown!r}) is not a number; {self._valid()}.",
                )
            number, pos = m.group(), m.end()
            if (
                not decimal_comma
                and text[pos : pos + 1] == ","
                and text[pos + 1 : pos + 2].isdigit()
            ):
                raise FieldError(
                    self.name,
                    f"{self.label}: {text[m.start() : pos + 2]!r}… could be a decimal comma or "
                    "two sizes; separate sizes with a comma and a blank (25, 300), or with "
                    "semicolons when you write decimal commas (0,3 µm; 4 µm).",
                )
            after = pos
            while pos < end and text[pos].isspace():
                pos += 1
            u = _UNIT.match(text, pos)
            own = None
            if u:
                own, pos = u.group(), u.end()
            else:
                pos = after  # the blanks separate this size from the next
            if pos < end and not (text[pos].isspace() or text[pos] in separators):
                shown = text[m.start() : pos + 1]
                raise FieldError(
                    self.name,
                    f"{self.label}: size {n} ({shown!r}) is not a number with a length unit; "
                    "separate sizes with a comma or a blank (a semicolon with decimal commas).",
                )
            yield number, own

    def _size(self, n: int, number: str, unit: str) -> float:
        """One entry in metres, checked against the range."""
        plain = number.replace("\u2212", "-")
        if "," in plain:  # only with semicolons as separators
            whole, frac = plain.split(",")
            if len(frac) == 3 and whole.lstrip("+-") not in ("", "0"):
                raise FieldError(
                    self.name,
                    f"{self.label}: size {n} ({number!r}) is ambiguous; write it without a "
                    "thousands separator, with a point or a comma for decimals.",
                )
            plain = plain.replace(",", ".")
        value = float(plain)
        try:
            si = to_si(value, "length", canonical_unit("length", unit))
        except KeyError:
            offered = ", ".join(unit_label(u) for u in self.units)
            raise FieldError(
                self.name,
                f"{self.label}: size {n} has an unknown unit {unit[:12]!r}; use {offered}.",
            ) from None
        lo, hi = SIZE_RANGE
        if not math.isfinite(si) or si < lo * (1 - 1e-12) or si > hi * (1 + 1e-12):
            raise FieldError(
                self.name,
                f"{self.label}: size {n} ({number} {unit_label(unit)}) is outside "
                f"{size_text(lo)} to {size_text(hi)}.",
            )
        return si


SIZES = SizeListField(
    "sizes",
    "Values at these sizes",
    "sizes",
    ("", "nm"),
    ("nm", "um"),
    required=False,
    help="Type up to 12 particle sizes (e.g. 25 nm, 0.3 µm, 4 µm) for a table of the exact "
    "values there, computed by the models at each size; a size without a unit takes the "
    "unit chosen here. Sizes are on the chart's size axis.",
)
"""The sizes the user types, as the sampling and deposition calculations declare them."""


def sizes_table(
    answers: SizeAnswers, columns: list[tuple[str, str]], coordinate: str
) -> dict[str, Any]:
    """The exact values at the typed sizes as a reply table (one row per size).

    Parameters
    ----------
    answers : SizeAnswers
        The composer's values at the sizes.
    columns : list of tuple
        (series key of ``answers.values``, column label) in the order shown.
    coordinate : str
        The words of the size axis (``volume-equivalent``, ``mobility-equivalent``).

    Returns
    -------
    dict
        ``label``, ``coordinate``, ``columns`` (labels), ``rows``: per size its ``label``
        (``25 nm``) and ``quantities`` (rows of the shared builder: the diameter and the
        aerodynamic diameter in µm, then each column in %, ``None`` where not defined).
    """
    rows = []
    for i, (d, d_ae) in enumerate(zip(answers.sizes, answers.aerodynamic, strict=True)):
        quantities = [
            {**row(f"Diameter ({coordinate})", d, 1e-6, "um", "m"), "key": "diameter"},
            {**row("Aerodynamic diameter", d_ae, 1e-6, "um", "m"), "key": "aerodynamic"},
        ]
        for key, label in columns:
            p = answers.values[key][i]
            cell = row(label, p, 0.01, "%", "1") if p is not None else _blank(label)
            quantities.append({**cell, "key": key})
        rows.append({"label": size_text(d), "quantities": quantities})
    return {
        "label": "Values at your sizes",
        "coordinate": coordinate,
        "columns": [label for _, label in columns],
        "rows": rows,
    }


def _blank(label: str) -> dict[str, Any]:
    """A cell where the curve is not defined (a target beyond its range)."""
    return {"label": label, "text": "not defined", "note": ""}
