"""Reading the shift calculation's structured inputs: column records, periods, benchmark.

The column and period records arrive validated by their ``records`` fields
(:data:`COLUMN_FIELDS`, :data:`PERIOD_FIELDS`), as every other input: lists bounded, each
sub-field parsed by its declaration (choices, lengths, ranges), unknown keys ignored. Here is
checked what a declaration cannot say: a unit known for the column's quantity, a channel's
diameter, period times on the logged clock, and the benchmark (a value and its unit). Errors
name the path of the sub-field at fault, e.g. ``periods.2.end`` or
``quantity_columns.0.unit`` (indices from 0), and the message says the place in words
(period 3).
"""

from __future__ import annotations

import math
from dataclasses import replace
from typing import Any

from ..shift.clock import DAY, ClockError, parse_clock_time, parse_iso
from ..shift.periods import Period
from .declare import positive, ratio
from .exposure_fields import ACTIVITY, MODE_GSD, MODE_MEDIAN, ROUTE
from .fields import Field, FieldError, parse_number
from .spectrum_fields import D_RANGE
from .units import unit_label

__all__ = [
    "COLUMN_QUANTITIES",
    "MAX_COLUMNS",
    "QUANTITY_UNITS",
    "column_records",
    "parse_benchmark",
    "parse_periods",
    "quantity_scale",
]

MAX_COLUMNS = 128
"""Most column records (value columns and size channels)."""

COLUMN_QUANTITIES = ("number", "ldsa", "mass", "channel")
"""What a value column holds."""

QUANTITY_UNITS: dict[str, dict[str, float]] = {
    "number": {"1/cm3": 1e6, "1/m3": 1.0},
    "channel": {"1/cm3": 1e6, "1/m3": 1.0},
    "ldsa": {"um2/cm3": 1e-6, "m2/m3": 1.0},
    "mass": {"ug/m3": 1e-9, "mg/m3": 1e-6, "kg/m3": 1.0},
}
"""Accepted units per quantity, factor to SI (1/m³, m²/m³, kg/m³)."""

_UNIT_ALIASES = {
    "#/cm3": "1/cm3",
    "#/cm³": "1/cm3",
    "1/cm³": "1/cm3",
    "cm-3": "1/cm3",
    "cm^-3": "1/cm3",
    "pt/cc": "1/cm3",
    "p/cc": "1/cm3",
    "1/cc": "1/cm3",
    "#/cc": "1/cm3",
    "µm²/cm³": "um2/cm3",
    "μm²/cm³": "um2/cm3",
    "µm2/cm3": "um2/cm3",
    "um²/cm³": "um2/cm3",
    "um^2/cm^3": "um2/cm3",
    "m²/m³": "m2/m3",
    "µg/m³": "ug/m3",
    "µg/m3": "ug/m3",
    "μg/m3": "ug/m3",
    "μg/m³": "ug/m3",
    "ug/m³": "ug/m3",
    "mg/m³": "mg/m3",
    "1/m³": "1/m3",
    "m-3": "1/m3",
}

DEFAULT_UNIT = {"number": "1/cm3", "channel": "1/cm3", "ldsa": "um2/cm3", "mass": "ug/m3"}

SI_UNITS = {"number": "1/m3", "channel": "1/m3", "ldsa": "m2/m3", "mass": "kg/m3"}
"""Code of the SI unit of each quantity."""


COLUMN_FIELDS: tuple[Field, ...] = (
    Field(
        "column",
        "Column (header name, part of it, or number)",
        "text",
        None,
        extra={"max_length": 80},
    ),
    Field(
        "quantity",
        "Holds",
        "choice",
        "number",
        choices=(
            ("number", "Number concentration"),
            ("ldsa", "Lung-deposited surface area (LDSA)"),
            ("mass", "Mass concentration"),
            ("channel", "A size channel (particles in the channel)"),
        ),
    ),
    Field(
        "unit",
        "Unit (blank: from the header)",
        "text",
        "",
        required=False,
        help="1/cm³ or 1/m³ (number, channels); µm²/cm³ or m²/m³ (LDSA); µg/m³, mg/m³ or "
        "kg/m³ (mass).",
        extra={"max_length": 20},
    ),
    Field(
        "diameter",
        "Channel diameter",
        "length",
        (None, "nm"),
        ("nm", "um"),
        minimum=D_RANGE[0],
        maximum=D_RANGE[1],
        required=False,
        applies=("quantity", ("channel",)),
    ),
)
"""Sub-fields of a value-column record."""

_TASK = ("kind", ("task",))

PERIOD_FIELDS: tuple[Field, ...] = (
    Field("label", "Label", "text", "", required=False, extra={"max_length": 80}),
    Field(
        "kind",
        "Period is",
        "choice",
        "task",
        choices=(("task", "A task"), ("background", "Background"), ("break", "A break")),
    ),
    Field(
        "start",
        "Start (hh:mm[:ss] or 2026-03-05T08:00)",
        "text",
        None,
        extra={"max_length": 40},
    ),
    Field("end", "End (hh:mm[:ss] or 2026-03-05T08:00)", "text", None, extra={"max_length": 40}),
    replace(
        ACTIVITY,
        choices=tuple(sorted(ACTIVITY.choices, key=lambda c: c[0] == "sleep")),
        applies=_TASK,
    ),
    replace(ROUTE, applies=_TASK),
    ratio(
        "protection_factor",
        "Assigned protection factor of the respiratory protection worn (1: none)",
        1.0,
        1.0,
        100_000.0,
        help="The factor that applies to the device worn, from your own source; none is built in.",
        applies=_TASK,
    ),
)
"""Sub-fields of a period record."""

MODE_FIELDS: tuple[Field, ...] = (
    replace(MODE_MEDIAN, label="Count median diameter (volume-equivalent)", default=(50.0, "nm")),
    replace(MODE_GSD, default=(1.8, "1"), help=""),
    positive("share", "Share of the particle number", "dimensionless", (1.0, "1"), ("1",), 1e6),
)
"""Sub-fields of a lognormal mode giving the shape of a task's size distribution."""


def _offered(quantity: str) -> str:
    """The units accepted for ``quantity``, labelled, for a refusal's message."""
    return ", ".join(unit_label(u) for u in QUANTITY_UNITS[quantity])


def canonical(quantity: str, unit: Any) -> str | None:
    """Canonical spelling of ``unit`` for ``quantity``, or None when it is not one of its."""
    if not isinstance(unit, str):
        return None
    u = unit.strip()
    u = _UNIT_ALIASES.get(u, u)
    return u if u in QUANTITY_UNITS[quantity] else None


def quantity_scale(quantity: str, unit: str) -> float:
    """Factor from ``unit`` to SI for ``quantity``."""
    return QUANTITY_UNITS[quantity][unit]


def _number(raw: Any, path: str, what: str) -> float:
    """The number of a value or a ``{value, unit}`` pair, by the fields' own rule."""
    return parse_number(raw.get("value") if isinstance(raw, dict) else raw, path, what)


def column_records(
    records: list[dict[str, Any]] | None, field: str = "quantity_columns"
) -> list[dict[str, Any]]:
    """Value-column records validated by :data:`COLUMN_FIELDS`, with their units checked.

    Returns dicts with ``column`` (text), ``quantity``, ``unit`` (canonical or "" to read it
    from the header), ``diameter`` (m, channels only) and ``path``.
    """
    out = []
    for i, rec in enumerate(records or ()):
        path = f"{field}.{i}"
        where = f"Column {i + 1}"
        quantity = rec["quantity"]
        unit = ""
        if rec.get("unit"):
            unit = canonical(quantity, rec["unit"]) or ""
            if not unit:
                offered = _offered(quantity)
                raise FieldError(
                    f"{path}.unit",
                    f"{where}: unknown unit {str(rec['unit'])[:20]!r}; use one of {offered}.",
                )
        diameter = rec.get("diameter") if quantity == "channel" else None
        if quantity == "channel" and diameter is None:
            raise FieldError(f"{path}.diameter", f"{where}: a size channel needs its diameter.")
        out.append(
            {
                "column": rec["column"].strip(),
                "quantity": quantity,
                "unit": unit,
                "diameter": diameter,
                "path": path,
            }
        )
    return out


def parse_benchmark(raw: Any, quantity: str, field: str = "benchmark") -> float | None:
    """The benchmark ``{value, unit}`` in SI of ``quantity``; None when none is given."""
    if raw is None or raw == "" or (isinstance(raw, dict) and raw.get("value") in (None, "")):
        return None
    unit_raw = raw.get("unit") if isinstance(raw, dict) else None
    if isinstance(raw, dict) and set(raw) - {"value", "unit"}:
        raise FieldError(field, "The benchmark is a value and its unit.")
    unit = canonical(quantity, unit_raw if unit_raw is not None else DEFAULT_UNIT[quantity])
    if unit is None:
        offered = _offered(quantity)
        raise FieldError(
            field, f"The benchmark's unit must be one of {offered} (the summarised quantity's)."
        )
    x = _number(raw, field, "The benchmark")
    if not x > 0.0:
        raise FieldError(field, "The benchmark must be above 0.")
    return x * quantity_scale(quantity, unit)


def _time(raw: Any, path: str, what: str, start: float, end: float) -> float:
    """A period time as seconds from the first reading (``start``: its clock time)."""
    if isinstance(raw, bool) or not isinstance(raw, str) or not raw.strip():
        raise FieldError(path, f"{what}: give a time (hh:mm, hh:mm:ss or 2026-03-05T08:00).")
    text = raw.strip()
    if len(text) > 40:
        raise FieldError(path, f"{what}: a time is at most 40 characters.")
    try:
        if len(text) <= 12 and "-" not in text:
            of_day = parse_clock_time(text)
            first_day = math.floor(start / DAY) * DAY
            clock = first_day + of_day
            if clock < start and first_day + DAY + of_day <= end:
                clock += DAY  # a clock time before the first reading: the next day's
        else:
            clock, offset = parse_iso(text)
            if offset is not None:
                raise FieldError(path, f"{what}: write the local time without a UTC offset.")
    except ClockError as exc:
        if (text[:4].isdigit() and text[4:5] == "-") or ":" in text:
            raise FieldError(path, f"{what}: {exc.message}") from None
        raise FieldError(
            path,
            f"{what}: {text[:40]!r} is not a time; write a clock time hh:mm or hh:mm:ss, or "
            "a date and time 2026-03-05T08:00.",
        ) from None
    return clock - start


def parse_periods(
    records: list[dict[str, Any]] | None, start: float, end: float, field: str = "periods"
) -> list[Period]:
    """Period records validated by :data:`PERIOD_FIELDS` to
    :class:`~driftdose.shift.periods.Period` (times from the first reading, whose clock time is
    ``start``; ``end`` is the clock time of the logged end)."""
    out = []
    for i, rec in enumerate(records or ()):
        path = f"{field}.{i}"
        where = f"Period {i + 1}"
        kind = rec["kind"]
        label = (rec.get("label") or "").strip() or f"{kind.capitalize()} {i + 1}"
        t0 = _time(rec.get("start"), f"{path}.start", f"{where} start", start, end)
        t1 = _time(rec.get("end"), f"{path}.end", f"{where} end", start, end)
        out.append(
            Period(label, kind, t0, t1, rec["activity"], rec["route"], rec["protection_factor"])
        )
    return out
