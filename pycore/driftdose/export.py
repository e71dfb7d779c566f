"""Plain-text exports of a reply: results and curves as CSV (stdlib ``csv``).

The page (through the worker) and the command line both use these, so a CSV file is the same
whichever front end wrote it. Header rows name each quantity and its unit.
"""

from __future__ import annotations

import csv
import io
import json
from typing import Any

__all__ = ["curves_csv", "curves_csv_json", "results_csv", "results_csv_json"]


def _writer(buffer: io.StringIO) -> Any:
    return csv.writer(buffer, lineterminator="\r\n")


def results_csv(reply: dict[str, Any]) -> str:
    """Results rows as CSV: quantity, symbol, value, unit, value in SI, SI unit, note."""
    buffer = io.StringIO()
    w = _writer(buffer)
    w.writerow(["quantity", "symbol", "value", "unit", "value_si", "si_unit", "note"])
    for row in reply.get("results", {}).values():
        if not isinstance(row, dict) or "label" not in row:
            continue
        if "text" in row:
            w.writerow([row["label"], "", row["text"], "", "", "", row.get("note", "")])
        else:
            unit = "" if row.get("unit") == "–" else row.get("unit", "")
            si_unit = "" if row.get("si_unit") == "–" else row.get("si_unit", "")
            w.writerow([row["label"], row.get("symbol", ""), repr(float(row["value"])), unit,
                        repr(float(row["si"])), si_unit, row.get("note", "")])
    return buffer.getvalue()


def curves_csv(reply: dict[str, Any]) -> str:
    """Every plotted curve as CSV in long form: curve, x (with unit), y (with unit).

    Curve groups follow the reply's layout: a curve is a dict with ``x`` and ``y`` lists; the
    axis titles and units come from the ``x_label``/``x_unit``/``y_label``/``y_unit`` keys of
    the group that holds it (or of the curve itself).
    """
    buffer = io.StringIO()
    w = _writer(buffer)
    rows: list[list[str]] = []
    header: list[str] | None = None
    for group_name, curve, axes in _walk(reply.get("curves", {})):
        x_head = f"{axes.get('x_label', 'x')} [{axes.get('x_unit', '')}]".replace(" []", "")
        y_head = f"{axes.get('y_label', 'y')} [{axes.get('y_unit', '')}]".replace(" []", "")
        header = header or ["curve", x_head, y_head]
        label = curve.get("label", group_name)
        for x, y in zip(curve["x"], curve["y"], strict=False):
            rows.append([label, "" if x is None else repr(float(x)),
                         "" if y is None else repr(float(y))])
    w.writerow(header or ["curve", "x", "y"])
    w.writerows(rows)
    return buffer.getvalue()


def _walk(curves: dict[str, Any], axes: dict[str, Any] | None = None, name: str = ""):
    axes = {**(axes or {}), **{k: v for k, v in curves.items()
                               if k in ("x_label", "x_unit", "y_label", "y_unit")}}
    if isinstance(curves.get("x"), list) and isinstance(curves.get("y"), list):
        yield name, curves, axes
        return
    for key, value in curves.items():
        if isinstance(value, dict):
            yield from _walk(value, axes, key)


def results_csv_json(reply_json: str) -> str:
    """:func:`results_csv` of a reply given as JSON text (the browser worker's form)."""
    return results_csv(json.loads(reply_json))


def curves_csv_json(reply_json: str) -> str:
    """:func:`curves_csv` of a reply given as JSON text (the browser worker's form)."""
    return curves_csv(json.loads(reply_json))
