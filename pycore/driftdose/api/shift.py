"""Calculation ``shift``: exposure and dose of a shift from logged concentrations.

Inputs (fields below): the near-field file's text (``series_text``) and its record
(``series_file`` ``{name, sha256, bytes}``), how its time stamps are written, the value
columns (``quantity_columns``: records ``{column, quantity: number|ldsa|mass|channel, unit,
diameter}``; a unit left out is read from the header), which column is summarised
(``quantity``: a ``column`` text of one record, default the first that is not a channel), an
optional far-field file with the same choices prefixed ``background_``, the periods
(records ``{label, kind: task|background|break, start, end, activity, route,
protection_factor}``; times as ``hh:mm[:ss]`` on the first reading's date, a clock time before
the first reading being the next day's, or as ``YYYY-MM-DDThh:mm[:ss]``), the background
method, what unmeasured time counts as, a benchmark ``{value, unit}`` and the dose choices.

Reply (besides ``ok``, ``warnings``, ``sources``):

- ``results.import``: ``{rows, columns: [{name, unit}], header_line, delimiter, decimal,
  interval_s, start, end, gaps: [{start, end, seconds}], gap_count, file: {name, sha256,
  bytes}, table}`` (``start``/``end`` ISO local date-times; gaps in ISO and seconds;
  ``delimiter`` and ``decimal`` in words as :mod:`driftdose.tables` gives them; ``table`` its
  :func:`~driftdose.tables.describe_table`); ``results.background_import`` the same for the
  far-field file; ``results.preview``: the reader's preview ``{header, rows: [{line,
  cells}]}``;
- ``results.tasks``: a table ``{label, unit, rows}``, a row per period in the order entered:
  ``index, period, kind, start, end, start_s, end_s, duration_s, coverage, readings, mean,
  median, p95, max, peak15, background, corrected_mean, below_background_share, ratio,
  share_above, activity, route, protection_factor, unit`` (concentrations in ``unit``, the
  code of the summarised column's unit, e.g. ``1/cm3``, ``um2/cm3``, ``ug/m3``; shares 0-1;
  None where nothing was measured);
- ``results.shift``: a table with one row, the same keys for the shift (breaks left out) plus
  ``twa8h, twa8h_corrected, twa_ratio, unmeasured_s, unmeasured_as, background_method``
  (words); and rows ``twa8h``, ``twa8h_corrected``, ``shift_mean``, ``shift_peak15``,
  ``shift_max``, ``coverage``, ``twa_rule``, ``background_method`` as plain result rows
  (label, value, unit, si, si_unit) for tables, the CLI and batch;
- ``results.dose`` (with a size source): ``{label, regions, region_labels, units: {number,
  surface, mass}, ldsa_unit, tasks: [{index, period, protection_factor, duration_s, number:
  [...], surface: [...], mass: [...], ldsa: {alveolar, tracheobronchial, total}}], total:
  {number, surface, mass}, rows}``, per region in ``regions`` order (``total`` last); units by
  code: ``1`` (particles), ``mm2``, ``ug``; LDSA of the inhaled air in ``um2/cm3``; ``rows``
  the same as a table for the CSV export;
- ``curves.series``: ``{start, x_label, x_unit, t_s, series: [{key, label, unit (code), y}],
  periods: [{index, label, kind, start_s, end_s}], gaps: [...]}`` thinned for drawing (each
  bucket keeps its lowest and highest values; a gap is a point with None values); the
  background used per reading is the series ``background``; ``curves.background`` the
  far-field file's columns likewise.

Errors name the path of the field at fault: ``series_text`` ("Line 1234: ..."),
``quantity_columns.0.column``, ``periods.2.end``.
"""

from __future__ import annotations

import functools
from dataclasses import replace
from typing import Any

from .. import textfile
from ..distribution import LognormalMode, Multimodal
from ..shift.background import BACKGROUND_METHODS, BackgroundError
from ..shift.clock import ClockError, TimeParser, clock_text, parse_iso
from ..shift.periods import MAX_PERIODS, PeriodError
from ..shift.series import ColumnSpec, SeriesError, TimeSeries, read_series
from ..tables import Table, TableError, pick_column, read_table
from . import shift_reply as reply
from .fields import Field, FieldError
from .particle_air_fields import PARTICLE_DENSITY, SHAPE_FACTOR
from .shift_inputs import (
    COLUMN_FIELDS,
    DEFAULT_UNIT,
    MAX_COLUMNS,
    MODE_FIELDS,
    PERIOD_FIELDS,
    canonical,
    column_records,
    parse_benchmark,
    parse_periods,
    quantity_scale,
)

TITLE = "Shift exposure and dose from logged data"

MAX_BYTES = textfile.MAX_BYTES
"""Largest time-series file, the shared 5 MB (a 24 h file at 1 s with ISO date-times and two
value columns is about 2.7 MB)."""

_TIME_FORMATS = (
    ("iso", "ISO 8601 (2026-03-05T08:00:00 or 2026-03-05 08:00:00)"),
    ("day_first", "Day first (05/03/2026 08:00:00)"),
    ("month_first", "Month first (03/05/2026 08:00:00, AM/PM allowed)"),
    ("elapsed_seconds", "Seconds elapsed since a start time"),
)


def _file_fields(prefix: str, label: str, far: bool) -> tuple[Field, ...]:
    when = ("background_method", ("far_field",)) if far else None
    fields = (
        Field(
            f"{prefix}text",
            label,
            "data",
            None,
            required=False,
            help="Plain text table with a time column; commas, semicolons or tabs; notes above "
            "the header row are skipped; at most 5 MB.",
            extra={"max_bytes": MAX_BYTES, "accept": ".csv,.txt,.tsv"},
        ),
        Field(f"{prefix}file", f"{label}: name and SHA-256", "data", None, required=False),
        Field(
            f"{prefix}header_line",
            "Header is on line (0: find it, -1: none)",
            "integer",
            0,
            minimum=-1,
            maximum=1000,
            required=False,
        ),
        Field(f"{prefix}time_format", "Time stamps", "choice", "iso", choices=_TIME_FORMATS),
        Field(
            f"{prefix}time_column",
            "Time column (header name or number)",
            "text",
            "1",
            required=False,
            extra={"max_length": 80},
        ),
        Field(
            f"{prefix}date_column",
            "Date column, when date and time are in two columns",
            "text",
            "",
            required=False,
            extra={"max_length": 80},
        ),
        Field(
            f"{prefix}start_time",
            "Start time of elapsed seconds (2026-03-05T08:00:00)",
            "text",
            "",
            required=False,
            extra={"max_length": 40},
            applies=(f"{prefix}time_format", ("elapsed_seconds",)),
        ),
    )
    return tuple(
        f if f.applies is not None or when is None else replace(f, applies=when) for f in fields
    )


_DOSE = ("size_source", ("channels", "modes", "spectrum"))


FIELDS: tuple[Field, ...] = (
    *_file_fields("series_", "Near-field (worker) time series file", False),
    Field(
        "quantity_columns",
        "Value columns",
        "records",
        [{"column": "2", "quantity": "number", "unit": ""}],
        help="Each logged column used: number concentration, LDSA, mass concentration, or a "
        "size channel with its diameter. A unit left out is read from the header.",
        item_fields=COLUMN_FIELDS,
        min_items=1,
        max_items=MAX_COLUMNS,
        item_label="Column",
    ),
    Field(
        "quantity",
        "Summarise column",
        "text",
        "",
        required=False,
        help="The column (as named in the value columns) whose statistics and TWA are shown.",
        extra={"max_length": 80},
    ),
    *_file_fields("background_", "Far-field (background) time series file", True),
    Field(
        "background_column",
        "Far-field column of the same quantity",
        "text",
        "2",
        required=False,
        extra={"max_length": 80},
        applies=("background_method", ("far_field",)),
    ),
    Field(
        "background_unit",
        "Its unit (blank: from its header, else the near-field unit)",
        "text",
        "",
        required=False,
        extra={"max_length": 20},
        applies=("background_method", ("far_field",)),
    ),
    Field(
        "periods",
        "Periods (tasks, background, breaks)",
        "records",
        [],
        required=False,
        item_fields=PERIOD_FIELDS,
        max_items=MAX_PERIODS,
        item_label="Period",
    ),
    Field(
        "background_method",
        "Background",
        "choice",
        "none",
        choices=(
            ("none", "No background correction"),
            ("marked_mean", "Mean of the periods marked as background"),
            ("pre_post", "Interpolated between background periods before and after"),
            ("far_field", "Concurrent far-field series (second file)"),
        ),
    ),
    Field(
        "unmeasured_as",
        "Unmeasured time of the 8 h counts as",
        "choice",
        "zero",
        choices=(
            ("zero", "Zero exposure"),
            ("background", "The background"),
            ("excluded", "Left out (mean over measured time)"),
        ),
        help="Time of the 8-h reference period without readings, and breaks.",
    ),
    Field(
        "benchmark",
        "Benchmark for the summarised quantity (optional)",
        "data",
        None,
        required=False,
        help="A value you choose to compare with, with its source; none is built in.",
    ),
    Field(
        "size_source",
        "Dose per task from",
        "choice",
        "none",
        choices=(
            ("none", "No dose"),
            ("channels", "The task mean of the size channels"),
            ("modes", "Lognormal modes scaled to the task's measurement"),
            ("spectrum", "An imported spectrum scaled to the task's measurement"),
        ),
    ),
    Field(
        "channel_type",
        "Size channels hold",
        "choice",
        "per_bin",
        choices=(("per_bin", "particles per channel (dN)"), ("dN/dlogDp", "dN/dlogDp")),
        applies=("size_source", ("channels",)),
    ),
    Field(
        "modes",
        "Shape of the size distribution (lognormal modes, count medians)",
        "records",
        [{"median": {"value": 50, "unit": "nm"}, "gsd": 1.8, "share": 1.0}],
        required=False,
        help="Count median (volume-equivalent), GSD and the share of the particle number "
        "of each mode; the amount comes from the task's measurement.",
        applies=("size_source", ("modes",)),
        item_fields=MODE_FIELDS,
        min_items=1,
        max_items=4,
        item_label="Mode",
    ),
    Field(
        "spectrum_text",
        "Spectrum CSV file (shape)",
        "data",
        None,
        required=False,
        extra={"max_bytes": 5 * 1024 * 1024, "accept": ".csv,.txt,.tsv"},
        applies=("size_source", ("spectrum",)),
    ),
    Field(
        "spectrum_diameter_column",
        "Diameter column",
        "text",
        "1",
        required=False,
        applies=("size_source", ("spectrum",)),
    ),
    Field(
        "spectrum_concentration_column",
        "Concentration column",
        "text",
        "2",
        required=False,
        applies=("size_source", ("spectrum",)),
    ),
    Field(
        "spectrum_concentration_type",
        "Spectrum concentration is given",
        "choice",
        "dN/dlogDp",
        choices=(
            ("per_bin", "per size bin (dN)"),
            ("dN/dlogDp", "per log10 of diameter (dN/dlogDp)"),
            ("dN/dDp", "per unit diameter (dN/dDp)"),
        ),
        applies=("size_source", ("spectrum",)),
    ),
    Field(
        "spectrum_diameter_unit",
        "Diameter unit in the file",
        "choice",
        "nm",
        choices=(("nm", "nm"), ("um", "µm")),
        applies=("size_source", ("spectrum",)),
    ),
    Field(
        "scale_column",
        "Scale the shape to column",
        "text",
        "",
        required=False,
        help="A number, mass or LDSA column (blank: the summarised column).",
        extra={"max_length": 80},
        applies=("size_source", ("modes", "spectrum")),
    ),
    Field(
        "dose_basis",
        "Dose from",
        "choice",
        "measured",
        choices=(
            ("measured", "Measured concentrations (what was breathed)"),
            ("corrected", "Background-corrected concentrations (the tasks' own share)"),
        ),
        applies=_DOSE,
    ),
    replace(PARTICLE_DENSITY, applies=_DOSE),
    replace(SHAPE_FACTOR, applies=_DOSE),
    Field(
        "model",
        "Deposition model",
        "choice",
        "icrp66",
        choices=(
            ("icrp66", "ICRP 66 full regional model (ET1, ET2, BB, bb, AI)"),
            ("simplified", "Simplified fits to ICRP 66 (Hinds 1999)"),
        ),
        applies=_DOSE,
    ),
)


@functools.lru_cache(maxsize=4)
def _read(
    text: str,
    header_line: int,
    time_format: str,
    time_column: str,
    date_column: str,
    start_time: str,
    columns: tuple[tuple[str, str, str, str], ...],
    prefix: str,
) -> tuple[Table, TimeSeries, tuple[str, ...]]:
    """Table, series and the unit of each column (cached: moving a period re-reads nothing)."""
    field = f"{prefix}text"
    try:
        table = read_table(text, header_line)
    except TableError as exc:
        where = f"{prefix}header_line" if exc.part == "header_line" else field
        raise FieldError(where, str(exc)) from None
    try:
        t_index = pick_column(table, time_column or "1", "time").index
    except TableError as exc:
        raise FieldError(f"{prefix}time_column", str(exc)) from None
    d_index = None
    if date_column:
        try:
            d_index = pick_column(table, date_column, "date").index
        except TableError as exc:
            raise FieldError(f"{prefix}date_column", str(exc)) from None
    start = 0.0
    if time_format == "elapsed_seconds":
        if not start_time:
            raise FieldError(f"{prefix}start_time", "Give the start time of the elapsed seconds.")
        try:
            start, _offset = parse_iso(start_time)
        except ClockError as exc:
            raise FieldError(f"{prefix}start_time", exc.message) from None
    specs, units = [], []
    for key, (spec, quantity, unit, fallback) in enumerate(columns):
        near = prefix == "series_"
        path = f"quantity_columns.{key}" if near else f"{prefix}column"
        try:
            column = pick_column(table, spec, "value")
        except TableError as exc:
            raise FieldError(f"{path}.column" if near else path, str(exc)) from None
        if not unit:
            unit = canonical(quantity, column.unit.code or column.unit.unit or "") or fallback
        if not unit:
            head = column.unit.unit
            why = f"its header's unit {head!r} is not one" if head else "its header names none"
            raise FieldError(
                f"{path}.unit" if near else f"{prefix}unit",
                f"Give the unit of column {column.name!r} ({why}).",
            )
        specs.append(ColumnSpec(column.index, str(key), quantity_scale(quantity, unit)))
        units.append(unit)
    try:
        parser = TimeParser(time_format, start)
        series = read_series(table, parser, t_index, specs, d_index, field)
    except SeriesError as exc:
        raise FieldError(field, exc.message) from None
    return table, series, tuple(units)


def _file_text(v: dict[str, Any], prefix: str, what: str) -> str:
    text = v.get(f"{prefix}text")
    if text is None or (isinstance(text, str) and not text.strip()):
        raise FieldError(f"{prefix}text", f"Choose the {what} file.")
    if not isinstance(text, str):
        raise FieldError(f"{prefix}text", "The file must be sent as text.")
    if len(text.encode("utf-8", "surrogatepass")) > MAX_BYTES:
        raise FieldError(f"{prefix}text", "The file is larger than 5 MB.")
    return text


def _series(v: dict[str, Any], prefix: str, columns: list[dict[str, Any]], what: str) -> Any:
    text = _file_text(v, prefix, what)
    key = tuple((c["column"], c["quantity"], c["unit"], c.get("fallback", "")) for c in columns)
    return _read(
        text,
        int(v.get(f"{prefix}header_line") or 0),
        v[f"{prefix}time_format"],
        v.get(f"{prefix}time_column") or "1",
        v.get(f"{prefix}date_column") or "",
        v.get(f"{prefix}start_time") or "",
        key,
        prefix,
    )


def _summarised(v: dict[str, Any], columns: list[dict[str, Any]]) -> int:
    choice = (v.get("quantity") or "").strip()
    if choice:
        for i, c in enumerate(columns):
            if c["column"].lower() == choice.lower():
                if c["quantity"] == "channel":
                    raise FieldError("quantity", "A size channel cannot be summarised alone.")
                return i
        raise FieldError("quantity", f"{choice[:40]!r} is none of the value columns.")
    for i, c in enumerate(columns):
        if c["quantity"] != "channel":
            return i
    raise FieldError("quantity_columns", "Add a number, LDSA or mass column to summarise.")


def _modes(raw: Any, density: float, shape_factor: float) -> Multimodal:
    """The modes (records already in SI) as the shape of the task's distribution."""
    if not isinstance(raw, list) or not raw:
        raise FieldError("modes", "Give at least one lognormal mode.")
    return Multimodal(
        tuple(LognormalMode(m["median"], m["gsd"], m["share"], density, shape_factor) for m in raw)
    )


def run(v: dict[str, Any]) -> dict[str, Any]:
    """Compute the shift reply from validated inputs (see the module notes)."""
    from ..compose.shift import compose_shift

    columns = column_records(v.get("quantity_columns"))
    if not columns:
        raise FieldError("quantity_columns", "Add at least one value column.")
    table, series, units = _series(v, "series_", columns, "near-field time series")
    q_index = _summarised(v, columns)
    q_col = columns[q_index]
    quantity, unit = q_col["quantity"], units[q_index]
    key = str(q_index)
    periods = parse_periods(v.get("periods"), series.start, series.start + series.end)
    benchmark = parse_benchmark(v.get("benchmark"), quantity)
    method = v["background_method"]
    far = far_table = None
    far_unit = ""
    if method == "far_field" or (
        isinstance(v.get("background_text"), str) and v["background_text"]
    ):
        b_unit = ""
        if v.get("background_unit"):
            b_unit = canonical(quantity, v["background_unit"]) or ""
            if not b_unit:
                raise FieldError(
                    "background_unit",
                    f"The far-field unit must be a unit of {quantity} (e.g. "
                    f"{DEFAULT_UNIT[quantity]}).",
                )
        spec = [
            {
                "column": v.get("background_column") or "2",
                "quantity": quantity,
                "unit": b_unit,
                "fallback": unit,
            }
        ]
        far_table, far, far_units = _series(v, "background_", spec, "far-field time series")
        far_unit = far_units[0]
    if v["unmeasured_as"] == "background" and method == "none":
        raise FieldError(
            "unmeasured_as", "Choose a background method to count unmeasured time as background."
        )
    dose_setup = reply.dose_setup(v, columns, units, q_index, _modes)
    try:
        result = compose_shift(
            series,
            key,
            periods,
            method if method in BACKGROUND_METHODS else "none",
            v["unmeasured_as"],
            benchmark,
            far,
            "0" if far is not None else None,
            dose_setup,
        )
    except PeriodError as exc:
        where = f"periods.{exc.index}.{exc.part}" if exc.index >= 0 else "periods"
        raise FieldError(where, exc.message) from None
    except BackgroundError as exc:
        raise FieldError("background_method", exc.message) from None
    return reply.shape(
        v, table, series, columns, units, q_index, unit, result, far_table, far, far_unit
    )


__all__ = ["FIELDS", "TITLE", "clock_text", "run"]
