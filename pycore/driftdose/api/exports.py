"""Exports through the one door: ``handle({"kind": "export", "inputs": {...}})``.

The page's worker sends the reply it shows with the inputs that produced it; the answer is
``{"ok": True, "text": ..., "filename": ...}``: the CSV of :mod:`driftdose.export` (results or
curves) after a header block that says what the numbers are:

====================  ==========================================================================
row                   cells
====================  ==========================================================================
first                 ``Drift & Dose export``, the part (``results`` or ``curves``)
``tool_version``      the version of the package that wrote the file
``created_utc``       date and time of the export, ISO 8601, UTC
``calculation``       the calculation's name and title
``encoding``          ``UTF-8 with byte-order mark`` or ``UTF-8``
``inputs``            column names of the input rows: name, label, value, unit, value_si, si_unit
``input``             one row per input that applies: its name (``modes[1].median`` for a field
                      of a list item), label, the value and unit as entered (a choice: its
                      label, with its code as ``value_si``; an imported file: its size and
                      SHA-256), the value in SI and the SI unit
(empty row)           the end of the block; the table follows
====================  ==========================================================================

With ``"bom": true`` the text starts with U+FEFF, so that a spreadsheet opens it as UTF-8
(µ, ², ³ otherwise show as two or three wrong characters). Every cell goes through
:func:`driftdose.export.safe_cell`.
"""

from __future__ import annotations

import datetime
import hashlib
import io
from typing import Any

from .. import __version__
from ..export import csv_writer, curves_csv, results_csv
from ..unit_labels import unit_text
from .fields import Field, applies, entered, parse_fields
from .units import SI_UNIT, UNITS

__all__ = ["EXPORT_KIND", "PARTS", "export_csv", "header_rows"]

EXPORT_KIND = "export"
PARTS = ("results", "curves")
MARK = "Drift & Dose export"
_NAME_MAX = 40


def _error(field: str, message: str) -> dict[str, Any]:
    return {"ok": False, "errors": [{"field": field, "message": message}]}


def export_csv(request: Any, calculations: dict[str, Any]) -> dict[str, Any]:
    """Answer an export request (the ``inputs`` of a request of kind ``export``).

    Parameters
    ----------
    request : Any
        ``{"calculation": name, "part": "results" | "curves", "inputs": {...}, "reply":
        {...}, "bom": bool}``; anything else is refused with a message naming the entry.
    calculations : dict
        The registry of calculations (name -> module with ``TITLE`` and ``FIELDS``).

    Returns
    -------
    dict
        ``{"ok": True, "text": str, "filename": str}`` or ``{"ok": False, "errors": [...]}``.
    """
    if not isinstance(request, dict):
        return _error("", "An export needs an object with calculation, part, inputs and reply.")
    name = request.get("calculation")
    calc = calculations.get(name) if isinstance(name, str) else None
    if calc is None:
        shown = repr(name[:_NAME_MAX]) if isinstance(name, str) else "(missing)"
        return _error("calculation", f"Unknown calculation {shown} to export.")
    part = request.get("part", "results")
    if part not in PARTS:
        return _error("part", f"The part to export is one of {', '.join(PARTS)}.")
    bom = request.get("bom", False)
    if not isinstance(bom, bool):
        return _error("bom", "bom is true or false.")
    reply = request.get("reply")
    if not isinstance(reply, dict) or reply.get("ok") is not True:
        return _error("reply", "Only a computed reply (ok: true) can be exported.")
    for key in ("results", "curves"):
        if not isinstance(reply.get(key, {}), dict):
            return _error("reply", f"The reply's {key} must be an object.")
    inputs = request.get("inputs", {})
    values, errors = parse_fields(calc.FIELDS, inputs)
    if errors:  # the inputs of a shown reply were valid: these are not those inputs
        return {
            "ok": False,
            "errors": [{**e, "field": f"inputs.{e['field']}".rstrip(".")} for e in errors],
        }
    buffer = io.StringIO()
    w = csv_writer(buffer)
    for row in header_rows(name, calc, part, inputs, values, bom):
        w.writerow(row)
    w.writerow([])
    table = results_csv(reply) if part == "results" else curves_csv(reply)
    text = ("\ufeff" if bom else "") + buffer.getvalue() + table
    return {"ok": True, "text": text, "filename": f"drift-dose-{name}-{part}.csv"}


def header_rows(
    name: str,
    calc: Any,
    part: str,
    inputs: dict[str, Any],
    values: dict[str, Any],
    bom: bool,
    now: datetime.datetime | None = None,
) -> list[list[str]]:
    """Rows of the header block (see the module docstring), without the closing empty row.

    Parameters
    ----------
    name : str
        The calculation's name.
    calc : module
        The calculation (``TITLE``, ``FIELDS``).
    part : str
        ``results`` or ``curves``.
    inputs : dict
        The inputs as sent (values and units as entered).
    values : dict
        The same inputs validated, in SI (from :func:`~driftdose.api.fields.parse_fields`).
    bom : bool
        Whether the text starts with a byte-order mark.
    now : datetime, optional
        The time written (UTC); the clock's time when omitted.

    Returns
    -------
    list of list of str
    """
    now = now or datetime.datetime.now(datetime.UTC)
    rows = [
        [MARK, part],
        ["tool_version", __version__],
        ["created_utc", now.strftime("%Y-%m-%dT%H:%M:%SZ")],
        ["calculation", name, calc.TITLE],
        ["encoding", "UTF-8 with byte-order mark" if bom else "UTF-8"],
        ["inputs", "name", "label", "value", "unit", "value_si", "si_unit"],
    ]
    current = {f.name: _plain(entered(f, inputs), f) for f in calc.FIELDS}
    for f in calc.FIELDS:
        if not applies(f.describe(), current):
            continue
        rows.extend(_input_rows(f, entered(f, inputs), values.get(f.name)))
    return rows


def _plain(raw: Any, f: Field) -> Any:
    """An input as the applies rule reads it: a choice's value, the default when absent."""
    return f.default if raw is None and f.kind not in UNITS else raw


def _input_rows(f: Field, raw: Any, si: Any, name: str = "", label: str = "") -> list[list[str]]:
    name, label = name or f.name, label or f.label
    if f.kind in UNITS:
        if si is None:
            return []
        value, unit = (raw.get("value"), raw.get("unit")) if isinstance(raw, dict) else (raw, None)
        if raw is None:
            value, unit = f.default
        unit = unit if isinstance(unit, str) else SI_UNIT[f.kind]
        return [
            [
                "input",
                name,
                label,
                _entered(value),
                _label(unit),
                repr(si),
                _label(SI_UNIT[f.kind]),
            ]
        ]
    if f.kind == "choice":
        shown = dict(f.choices).get(si, str(si))
        return [["input", name, label, shown, "", str(si), ""]]
    if f.kind == "records":
        return _record_rows(f, raw, si)
    if f.kind == "data":
        return _data_rows(f, si)
    return [["input", name, label, "" if si is None else str(si), "", "", ""]]


def _record_rows(f: Field, raw: Any, records: Any) -> list[list[str]]:
    """One row per value of each record (``modes[1].median``), as a plain field's row."""
    if not isinstance(records, list):
        return []
    items = raw if isinstance(raw, list) and len(raw) == len(records) else [{}] * len(records)
    rows = []
    for i, (item, record) in enumerate(zip(items, records, strict=True)):
        item = item if isinstance(item, dict) else {}
        for sub in f.item_fields:
            decl = sub.variant_for(record)
            rows.extend(
                _input_rows(
                    decl,
                    item.get(sub.name),
                    record.get(sub.name),
                    f"{f.name}[{i + 1}].{sub.name}",
                    f"{f.item_label} {i + 1}: {decl.label}",
                )
            )
    return rows


def _entered(value: Any) -> str:
    """A validated number as entered, with a decimal comma written as a point."""
    text = str(value).strip().replace("\u2212", "-").replace(" ", "")
    if text.count(",") == 1 and "." not in text:
        text = text.replace(",", ".")
    return text


def _data_rows(f: Field, raw: Any) -> list[list[str]]:
    if raw is None:
        return []
    if isinstance(raw, str):
        size = len(raw.encode("utf-8"))
        digest = hashlib.sha256(raw.encode("utf-8")).hexdigest()
        note = f"imported text, {size} bytes as UTF-8, SHA-256 {digest}"
        return [["input", f.name, f.label, note, "", "", ""]]
    if isinstance(raw, list):
        rows = []
        for i, item in enumerate(raw[:100]):
            if not isinstance(item, dict):
                rows.append(["input", f"{f.name}[{i + 1}]", f.label, str(item)[:200], "", "", ""])
                continue
            for key, value in list(item.items())[:40]:
                entry = f"{f.name}[{i + 1}].{str(key)[:_NAME_MAX]}"
                if isinstance(value, dict):
                    unit = value.get("unit")
                    rows.append(
                        [
                            "input",
                            entry,
                            f.label,
                            str(value.get("value"))[:200],
                            _label(unit) if isinstance(unit, str) else "",
                            "",
                            "",
                        ]
                    )
                else:
                    rows.append(["input", entry, f.label, str(value)[:200], "", "", ""])
        return rows
    return [["input", f.name, f.label, str(raw)[:200], "", "", ""]]


def _label(unit: str) -> str:
    return unit_text(unit) if isinstance(unit, str) else str(unit)
