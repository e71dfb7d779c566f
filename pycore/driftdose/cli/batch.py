"""Batch runs: one calculation per file, one table with a row per file."""

from __future__ import annotations

import argparse
import fnmatch
import io
import json
import os
from collections.abc import Sequence
from typing import Any, TextIO

from .. import export
from ..unit_labels import unit_text
from .documents import accepted_suffixes, file_record, read_decoded
from .engine import call_api, print_errors, warn_unknown
from .numbers import is_number, number_text, plain_number
from .outputs import check_outputs, digits_option, write_text
from .render import pad, result_rows, row_label, text_width, with_unit
from .status import EXIT_OK, EXIT_USAGE, UserError


def expand_folders(paths: Sequence[str], accept: str) -> list[str]:
    """The files to run: each path as given, a folder replaced by its files whose names end
    in one of the ``accept`` suffixes (``".csv,.txt"``; any file when empty), sorted by name,
    hidden files left out (a folder of survey files, say)."""
    suffixes = accepted_suffixes(accept)
    out: list[str] = []
    for path in paths:
        if path != "-" and os.path.isdir(path):
            names = sorted(
                n
                for n in os.listdir(path)
                if not n.startswith(".")
                and os.path.isfile(os.path.join(path, n))
                and (not suffixes or n.lower().endswith(suffixes))
            )
            out.extend(os.path.join(path, n) for n in names)
        else:
            out.append(path)
    return out


def run_batch(
    kind: str,
    description: dict[str, Any],
    base: dict[str, Any],
    file_field: dict[str, Any],
    opts: argparse.Namespace,
    stdout: TextIO,
    stderr: TextIO,
) -> int:
    """Run ``kind`` once per file and write one table: one row per file, one column per result.

    Numbers are in full precision in CSV (as the page's CSV exports) and as the page shows
    them in the table format; ``--digits`` overrides both. A file that fails keeps its row,
    with the messages in the ``errors`` column; the exit status is then 2.
    """
    fields = description["fields"]
    opts.files = expand_folders(opts.files, file_field.get("accept", ""))
    if not opts.files:
        raise UserError("files", "the folders hold no file of the accepted types.")
    check_outputs(opts, opts.files)
    warn_unknown(kind, fields, base, stderr)
    name = file_field["name"]
    records: list[tuple[str, dict[str, Any]]] = []
    for path in opts.files:
        try:
            decoded = read_decoded(path, name, file_field.get("max_bytes"))
            inputs = {**base, name: decoded.text}
            record = file_field.get("record_field")
            if isinstance(record, str):  # each file's own name and SHA-256, as the page
                inputs[record] = file_record(path, decoded)
            reply = call_api(kind, inputs)
        except UserError as exc:
            reply = {"ok": False, "errors": [{"field": exc.field, "message": exc.message}]}
        if not reply.get("ok"):
            print_errors(reply.get("errors", []), stderr, prefix=f"{path}: ")
        records.append((path, reply))
    status = EXIT_OK if all(r.get("ok") for _, r in records) else EXIT_USAGE

    if opts.format == "json":
        doc = [{"file": p, **r} for p, r in records]
        write_text(opts.out, json.dumps(doc, indent=2, ensure_ascii=False) + "\n", stdout)
        return status
    digits = digits_option(opts, 4 if opts.format == "table" else 0)
    table = _batch_table(records, opts.columns, digits, opts.format == "table")
    if opts.format == "table":
        widths = [max(text_width(r[i]) for r in table) for i in range(len(table[0]))]
        text = "".join(
            "  ".join(pad(c, w) for c, w in zip(r, widths, strict=True)).rstrip() + "\n"
            for r in table
        )
    else:
        buf = io.StringIO()
        export.csv_writer(buf).writerows(table)  # as the page's CSV exports
        text = buf.getvalue()
    write_text(opts.out, text, stdout)
    return status


def _batch_table(
    records: list[tuple[str, dict[str, Any]]],
    patterns: Sequence[str] | None,
    digits: int,
    for_terminal: bool,
) -> list[list[str]]:
    """Rows of the batch table, header first: file, one column per result key, warnings,
    errors. ``patterns`` (shell-style, on result keys) select the result columns.
    """
    # key -> (label, unit, display value per SI value); the first file that has a key sets it
    columns: dict[str, tuple[str, str, float | None]] = {}
    for _, reply in records:
        for key, row in result_rows(reply.get("results") if reply.get("ok") else None):
            if patterns and not any(fnmatch.fnmatchcase(key, p) for p in patterns):
                continue
            if key in columns and columns[key][2] is not None:
                continue
            unit = "" if "text" in row else unit_text(str(row.get("unit", "")))
            si, value = row.get("si"), row.get("value")
            per_si = value / si if is_number(si) and si and is_number(value) else None
            columns[key] = (row_label(row, symbol=False), unit, per_si)
    header = ["file", *(with_unit(lab, unit) for lab, unit, _ in columns.values())]
    table = [[*header, "warnings", "errors"]]
    for path, reply in records:
        results = reply.get("results", {}) if reply.get("ok") else {}
        line = [path]
        for key, (_, unit, per_si) in columns.items():
            row = results.get(key)
            if not isinstance(row, dict):
                line.append("")
            elif "text" in row:
                line.append(str(row["text"]))
            else:
                value = row.get("value")
                if unit_text(str(row.get("unit", ""))) != unit and per_si is not None:
                    value = row["si"] * per_si  # in the column's unit, not this row's
                line.append(
                    number_text(value, digits) if for_terminal else plain_number(value, digits)
                )
        line.append(" | ".join(map(str, reply.get("warnings", []))))
        line.append(
            " | ".join(
                f"{e.get('field') or 'error'}: {e.get('message', '')}"
                for e in reply.get("errors", [])
            )
        )
        table.append(line)
    return table
