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
- ``curves.series``: ``{start, x_label, x_unit, key, held, t_s, series: [{key, label, unit
  (code), y}], periods: [{index, label, kind, start_s, end_s}], gaps: [...]}`` thinned for
  drawing (each bucket keeps its lowest and highest values; a gap is a point with None
  values); the background used per reading is the series ``background``;
  ``curves.background`` the far-field file's columns likewise. ``key`` is a digest of the
  thinned times, values, labels and units; when the request's ``series_drawn`` names it (the
  page keeps that series), ``held`` is true and ``t_s`` and the columns' ``y`` are left out.
  The ``background`` series, which moves with the periods, has a key of its own for its
  values (``values_key``, with ``held`` likewise).

Errors name the path of the field at fault: ``series_text`` ("Line 1234: ..."),
``quantity_columns.0.column``, ``periods.2.end``.
"""

from __future__ import annotations

import functools
import gc
import itertools
import math
from typing import Any

from ..diameters import ParticleDescription
from ..distribution import LognormalMode, Multimodal, bin_edges
from ..shift.background import BACKGROUND_METHODS, BackgroundError
from ..shift.clock import ClockError, TimeParser, parse_iso
from ..shift.periods import PeriodError
from ..shift.series import ColumnSpec, SeriesError, TimeSeries, read_series, with_sum
from ..tables import TableError, pick_column, read_table
from . import shift_reply as reply
from .fields import FieldError
from .shift_fields import FIELDS, MAX_BYTES
from .shift_inputs import (
    DEFAULT_UNIT,
    canonical,
    column_records,
    parse_benchmark,
    parse_periods,
    quantity_scale,
)

TITLE = "Shift exposure and dose from logged data"


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
) -> tuple[reply.TableFacts, TimeSeries, tuple[str, ...]]:
    """What the reply says of the table, the series and the unit of each column (cached:
    moving a period re-reads nothing; the table's rows are not kept, only the series)."""
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
    return reply.table_facts(table), series, tuple(units)


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


CHANNEL_TOTAL = "Total of the size channels"
"""The column summarised when a file holds only size channels."""

_TOTALS: list[tuple[TimeSeries, tuple[Any, ...], TimeSeries]] = []


def _channel_total(
    v: dict[str, Any], series: TimeSeries, columns: list[dict[str, Any]], units: tuple[str, ...]
) -> tuple[TimeSeries, list[dict[str, Any]], tuple[str, ...]]:
    """For a file of size channels only: their total number concentration as one more column
    (the sum of the channels, or of dN/dlog10 d times each channel's width in log10 d), so the
    shift can be summarised. The total of a series read earlier is kept (the last two)."""
    chans = sorted((c["diameter"], i) for i, c in enumerate(columns) if c["quantity"] == "channel")
    per_log10 = v.get("channel_type") == "dN/dlogDp"
    if not chans or (per_log10 and len(chans) < 2):
        raise FieldError("quantity_columns", "Add a number, LDSA or mass column to summarise.")
    if per_log10:
        edges = bin_edges([d for d, _ in chans])
        weights = tuple(math.log10(b / a) for a, b in itertools.pairwise(edges))
    else:
        weights = (1.0,) * len(chans)
    keys = tuple(str(i) for _, i in chans)
    key = str(len(columns))
    cache = (keys, weights, key)
    hit = next((t for s, k, t in _TOTALS if s is series and k == cache), None)
    if hit is None:
        hit = with_sum(series, keys, weights, key)
        _TOTALS.insert(0, (series, cache, hit))
        del _TOTALS[2:]
    record = {
        "column": CHANNEL_TOTAL,
        "quantity": "number",
        "unit": units[chans[0][1]],
        "diameter": None,
        "path": "quantity_columns",
    }
    return hit, [*columns, record], (*units, units[chans[0][1]])


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


def _modes(raw: Any, desc: ParticleDescription) -> Multimodal:
    """The modes (records already in SI; count medians volume-equivalent) as the shape of the
    task's distribution, on the models' size axis (a mobility median with an effective
    density, as the deposition calculation converts a mode)."""
    if not isinstance(raw, list) or not raw:
        raise FieldError("modes", "Give at least one lognormal mode.")
    rho, chi = desc.model_density, desc.model_shape_factor
    return Multimodal(
        tuple(
            LognormalMode(
                desc.to_model(m["median"], "volume_equivalent"), m["gsd"], m["share"], rho, chi
            )
            for m in raw
        )
    )


def run(v: dict[str, Any]) -> dict[str, Any]:
    """Compute the shift reply from validated inputs (see the module notes).

    The collector of cyclic garbage is paused meanwhile: reading a file makes hundreds of
    thousands of lists and tuples, none of them garbage, and summarising makes many small
    objects; each pass of the collector would walk them (and the engine's older objects)
    again. In the page's engine this was most of the reading time and about a third of a
    moved period's. Nothing is lost: cycles left behind are collected after the request.
    """
    paused = gc.isenabled()
    gc.disable()
    try:
        return _run(v)
    finally:
        if paused:
            gc.enable()


def _run(v: dict[str, Any]) -> dict[str, Any]:
    from ..compose.shift import compose_shift

    columns = column_records(v.get("quantity_columns"))
    if not columns:
        raise FieldError("quantity_columns", "Add at least one value column.")
    table, series, units = _series(v, "series_", columns, "near-field time series")
    if all(c["quantity"] == "channel" for c in columns):
        series, columns, units = _channel_total(v, series, columns, units)
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


__all__ = ["FIELDS", "MAX_BYTES", "TITLE", "run"]
