"""Plain-text exports of a reply: results and curves as CSV (stdlib ``csv``).

The page (through the worker) and the command line both use these, so a CSV file is the same
whichever front end wrote it. Header rows name each quantity and its unit. Where a reply holds
several kinds of result or curve (a table of stages, curves on other axes), each kind is
written as its own block with its own header row, blocks separated by an empty line.

Every text cell that a spreadsheet would take for a formula (one beginning with ``=``, ``+``,
``-``, ``@``, a tab or a carriage return: a stage named ``=1+1``, a file named
``+HYPERLINK(...)``) is written with a leading apostrophe, which spreadsheets show as text;
numbers, negative ones included, are written as they are. This is the common practice for CSV
sent to spreadsheets (OWASP, "CSV Injection").
"""

from __future__ import annotations

import csv
import io
import json
import re
from collections.abc import Iterator
from typing import Any

from .unit_labels import unit_text

__all__ = [
    "csv_writer",
    "curve_x",
    "curves_csv",
    "curves_csv_json",
    "results_csv",
    "results_csv_json",
    "safe_cell",
]

_AXIS_KEYS = ("x_label", "x_unit", "y_label", "y_unit")


_FORMULA_START = ("=", "+", "-", "@", "\t", "\r")
_PLAIN_NUMBER = re.compile(r"^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$")


def safe_cell(value: Any) -> Any:
    """Return a CSV cell a spreadsheet will not run as a formula.

    Text beginning with ``= + - @``, a tab or a carriage return gets a leading apostrophe;
    a plain number (``-2.5e-09``) and anything that is not text are returned unchanged.

    Parameters
    ----------
    value : object
        The cell's content.

    Examples
    --------
    >>> safe_cell("=1+1"), safe_cell("-2.5e-09"), safe_cell("@SUM(A1)"), safe_cell("tube")
    ("'=1+1", '-2.5e-09', "'@SUM(A1)", 'tube')

    """
    if isinstance(value, str) and value.startswith(_FORMULA_START):
        if not _PLAIN_NUMBER.match(value):
            return "'" + value
    return value


class _SafeWriter:
    """A ``csv.writer`` that passes every cell through :func:`safe_cell`."""

    def __init__(self, buffer: Any) -> None:
        self._writer = csv.writer(buffer, lineterminator="\r\n")

    def writerow(self, row: Any) -> Any:
        return self._writer.writerow([safe_cell(c) for c in row])

    def writerows(self, rows: Any) -> None:
        for row in rows:
            self.writerow(row)


def csv_writer(buffer: Any) -> _SafeWriter:
    """A CSV writer as every export uses: CRLF line ends, formula-like cells neutralised.

    Parameters
    ----------
    buffer : file-like
        Where the rows are written (a text stream opened with ``newline=""``).
    """
    return _SafeWriter(buffer)


def _writer(buffer: io.StringIO) -> Any:
    return csv_writer(buffer)


def _num(x: Any) -> str:
    if x is None:
        return ""
    if isinstance(x, bool) or not isinstance(x, int | float):
        return str(x)
    return str(x) if isinstance(x, int) else repr(float(x))


def _unit(u: Any) -> str:
    """A unit as a file shows it: a unit code labelled (``um`` -> ``µm``), none for pure numbers."""
    return "" if u is None else unit_text(str(u))


def results_csv(reply: dict[str, Any]) -> str:
    """Results as CSV: quantity, symbol, value, unit, value in SI, SI unit, note.

    Results that are tables themselves (a row per stage, per bin...) follow as blocks.

    Parameters
    ----------
    reply : dict
        A reply of :func:`driftdose.api.handle` (its ``results``).
    """
    buffer = io.StringIO()
    w = _writer(buffer)
    w.writerow(["quantity", "symbol", "value", "unit", "value_si", "si_unit", "note"])
    tables = []
    for row in reply.get("results", {}).values():
        if not isinstance(row, dict) or "label" not in row:
            continue
        if isinstance(row.get("rows"), list):
            tables.append(row)
        elif "text" in row:
            w.writerow([row["label"], "", row["text"], "", "", "", row.get("note", "")])
        elif "value" in row:
            w.writerow(
                [
                    row["label"],
                    row.get("symbol", ""),
                    _num(row["value"]),
                    _unit(row.get("unit")),
                    _num(row.get("si")),
                    _unit(row.get("si_unit")),
                    row.get("note", ""),
                ]
            )
    for table in tables:
        w.writerow([])
        _table_block(w, table)
    return buffer.getvalue()


def _table_block(w: Any, table: dict[str, Any]) -> None:
    """One table result: a column per scalar field, and per listed quantity (with unit)."""
    scalar: list[str] = []
    quantities: list[tuple[str, str]] = []
    for row in table["rows"]:
        for key, value in row.items():
            if key == "quantities" and isinstance(value, list):
                for q in value:
                    head = (q.get("label", ""), _unit(q.get("unit")))
                    if head not in quantities:
                        quantities.append(head)
            elif not isinstance(value, dict | list) and key not in scalar:
                scalar.append(key)
    w.writerow([table["label"]])
    w.writerow(scalar + [f"{label} [{unit}]" if unit else label for label, unit in quantities])
    for row in table["rows"]:
        by_head = {
            (q.get("label", ""), _unit(q.get("unit"))): q.get("value", q.get("text"))
            for q in row.get("quantities", [])
        }
        w.writerow([_num(row.get(k)) for k in scalar] + [_num(by_head.get(h)) for h in quantities])


def curves_csv(reply: dict[str, Any]) -> str:
    """Every plotted curve as CSV: one block per pair of axes (curve, x [unit], y [unit]).

    A curve is a dict with equal-length ``x`` and ``y`` lists (``x`` may name a shared axis of
    ``curves["axes"]``, see :func:`curve_x`); its axis titles and units come
    from the nearest ``x_label``/``x_unit``/``y_label``/``y_unit`` keys (its own or a parent
    group's). Category data (a dict with ``keys`` and metric dicts holding ``y``) is written
    as a block per metric with the categories as rows.

    Parameters
    ----------
    reply : dict
        A reply of :func:`driftdose.api.handle` (its ``curves``).
    """
    buffer = io.StringIO()
    w = _writer(buffer)
    blocks: dict[tuple[str, ...], list[list[str]]] = {}
    curves = reply.get("curves", {})
    for label, x_values, curve, axes in _walk(curves, curves, {}, ""):
        x_head = _head(axes.get("x_label", "x"), axes.get("x_unit"))
        y_head = _head(axes.get("y_label", "y"), axes.get("y_unit"))
        rows = blocks.setdefault(("curve", x_head, y_head), [])
        for x, y in zip(x_values, curve["y"], strict=False):
            rows.append([label, _num(x), _num(y)])
    for header, rows in blocks.items():
        if buffer.tell():
            w.writerow([])
        w.writerow(list(header))
        w.writerows(rows)
    for group in _category_groups(reply.get("curves", {})):
        categories = group.get("regions") or group["keys"]
        for metric in group.values():
            if not (isinstance(metric, dict) and isinstance(metric.get("y"), list)):
                continue
            if buffer.tell():
                w.writerow([])
            unit = metric.get("unit", "")
            header = ["category", _head(metric.get("label", "value"), unit)]
            if isinstance(metric.get("per_hour"), list):
                per_hour = str(
                    metric.get("per_hour_label") or f"{metric.get('label', 'value')}, per hour"
                )
                header.append(_head(per_hour, f"{unit}/h" if unit else ""))
            w.writerow(header)
            for i, name in enumerate(categories):
                row = [name, _num(metric["y"][i])]
                if len(header) == 3:
                    row.append(_num(metric["per_hour"][i]))
                w.writerow(row)
    if not buffer.tell():
        w.writerow(["curve", "x", "y"])
    return buffer.getvalue()


def curve_x(curves: dict[str, Any], curve: dict[str, Any]) -> list[Any] | None:
    """The x values of one curve of a reply: its own list, or the shared axis it names.

    A reply sends an x array shared by several curves once, in ``curves["axes"]``, and each of
    those curves names it (``"x": "diameter"``); a curve with x values of its own carries the
    list. Anything else (an unknown name, a non-list) gives None.

    Parameters
    ----------
    curves : dict
        The reply's ``curves`` object (holding ``axes``).
    curve : dict
        One curve (``x``, ``y``).

    Returns
    -------
    list or None
        The x values.
    """
    x = curve.get("x")
    if isinstance(x, str):
        axes = curves.get("axes") if isinstance(curves, dict) else None
        x = axes.get(x) if isinstance(axes, dict) else None
    return x if isinstance(x, list) else None


def _head(label: str, unit: Any) -> str:
    unit = _unit(unit)
    return f"{label} [{unit}]" if unit else str(label)


def _walk(
    node: Any, curves: dict[str, Any], axes: dict[str, Any], name: str
) -> Iterator[tuple[str, list[Any], dict, dict]]:
    if isinstance(node, list):
        for i, item in enumerate(node):
            yield from _walk(item, curves, axes, f"{name} {i + 1}".strip())
        return
    if not isinstance(node, dict):
        return
    axes = {**axes, **{k: node[k] for k in _AXIS_KEYS if isinstance(node.get(k), str)}}
    x, y = curve_x(curves, node), node.get("y")
    if isinstance(x, list) and isinstance(y, list) and len(x) == len(y):
        yield str(node.get("label", name)), x, node, axes
        return
    for key, value in node.items():
        if isinstance(value, dict | list) and key not in ("keys", "regions", "axes"):
            yield from _walk(value, curves, axes, key)


def _category_groups(node: Any) -> Iterator[dict[str, Any]]:
    if isinstance(node, dict):
        if isinstance(node.get("keys"), list):
            yield node
            return
        for value in node.values():
            yield from _category_groups(value)


def results_csv_json(reply_json: str) -> str:
    """:func:`results_csv` of a reply given as JSON text (the browser worker's form).

    Parameters
    ----------
    reply_json : str
        The reply as JSON text.
    """
    return results_csv(json.loads(reply_json))


def curves_csv_json(reply_json: str) -> str:
    """:func:`curves_csv` of a reply given as JSON text (the browser worker's form).

    Parameters
    ----------
    reply_json : str
        The reply as JSON text.
    """
    return curves_csv(json.loads(reply_json))
