"""Replies and inputs as text for the terminal: the page's results table, tables of structured
results, the record of inputs and the ``describe`` listing. Numbers through :mod:`.numbers`.
"""

from __future__ import annotations

import json
import textwrap
import unicodedata
from collections.abc import Iterable, Sequence
from typing import Any

from .. import __version__
from ..unit_labels import unit_text
from .flags import default_text, file_alias, flag_name, is_quantity
from .numbers import is_number, js_string, number_text
from .status import PROG


def result_rows(results: Any) -> Iterable[tuple[str, dict[str, Any]]]:
    """Result rows (key, row) in reply order; anything not shaped as a row is skipped."""
    if not isinstance(results, dict):
        return
    for key, row in results.items():
        if isinstance(row, dict) and ("value" in row or "text" in row):
            yield key, row


def row_label(row: dict[str, Any], symbol: bool = True) -> str:
    label = str(row.get("label", ""))
    if symbol and row.get("symbol"):
        label += f" {row['symbol']}"
    if row.get("note"):
        label += f" ({row['note']})"
    return label


def with_unit(label: str, unit: str) -> str:
    unit = unit_text(unit)
    return f"{label} [{unit}]" if unit else label


def text_width(text: str) -> int:
    """Columns that ``text`` takes in a terminal (combining marks such as in V̇ take none)."""
    return sum(0 if unicodedata.combining(ch) else 1 for ch in text)


def pad(text: str, width: int) -> str:
    return text + " " * max(0, width - text_width(text))


def table_text(
    title: str, inputs: list[tuple[str, str]], reply: dict[str, Any], digits: int
) -> str:
    """The reply as the page shows it: inputs, results (label, value, unit), warnings, sources."""
    out: list[str] = [title, "=" * len(title), ""]
    if inputs:
        out.append("Inputs")
        width = max(text_width(k) for k, _ in inputs)
        out += [f"  {pad(k, width)}  {v}".rstrip() for k, v in inputs]
        out.append("")
    lines = [("Quantity", "Value", "Unit")]
    for _, row in result_rows(reply.get("results")):
        if "text" in row:
            lines.append((row_label(row), str(row["text"]), ""))
        else:
            unit = unit_text(str(row.get("unit", "")))
            lines.append((row_label(row), number_text(row.get("value"), digits), unit))
    out.append("Results")
    out += _aligned(lines)
    for key, entry in reply.get("results", {}).items():
        if isinstance(entry, dict) and not ("value" in entry or "text" in entry):
            out += ["  " + line if line else line for line in _structured_block(key, entry, digits)]
    if reply.get("warnings"):
        out += ["", "Warnings"]
        wrap = textwrap.TextWrapper(width=100, initial_indent="  - ", subsequent_indent="    ")
        out += [wrap.fill(str(w)) for w in reply["warnings"]]
    if reply.get("sources"):
        out += ["", "Published methods used"]
        for i, s in enumerate(reply["sources"], 1):
            text = s.get("citation", s) if isinstance(s, dict) else s
            out.append(
                textwrap.fill(str(text), 100, initial_indent=f"  {i}. ", subsequent_indent="     ")
            )
    return "\n".join(out) + "\n"


_SKIP_KEYS = frozenset({"index", "name", "label", "type", "type_label", "rows", "warnings"})


def _words(key: str) -> str:
    return key.replace("_", " ")


def _scalar_text(value: Any, digits: int) -> str:
    if isinstance(value, bool):
        return "yes" if value else "no"
    if is_number(value):
        return number_text(value, digits)
    if isinstance(value, list) and all(isinstance(v, str | int | float) for v in value):
        return ", ".join(_scalar_text(v, digits) for v in value)
    return "" if value is None else str(value)


def _aligned(lines: list[tuple[str, str, str]], indent: str = "  ") -> list[str]:
    """Lines of (label, value, unit) in columns; a line with neither value nor unit is a title."""
    cells = [(a, b, c) for a, b, c in lines if b or c]
    w0 = max((text_width(a) for a, _, _ in cells), default=0)
    w1 = max((text_width(b) for a, b, c in cells if c), default=0)  # words may run past
    return [
        f"{indent}{pad(a, w0)}  {pad(b, w1)}  {c}".rstrip() if (b or c) else f"{indent}{a}"
        for a, b, c in lines
    ]


def _structured_block(key: str, entry: dict[str, Any], digits: int) -> list[str]:
    """Text lines for a result that is a table, not a row (generic over its shape).

    An entry holds ``rows``. A row holding lists of result rows (``{label, value, unit}``)
    becomes a titled group of them; rows of plain values become the lines of a table whose
    columns are their keys (with the unit of column ``c`` from the entry's ``c_unit``). The
    entry's other plain fields are listed first.
    """
    out = ["", str(entry.get("label", _words(key)))]
    facts = [
        (_words(k), _scalar_text(v, digits), "")
        for k, v in entry.items()
        if k not in _SKIP_KEYS and not isinstance(v, dict | list) and v is not None
    ]
    out += _aligned(facts)
    rows = entry.get("rows")
    if not isinstance(rows, list):
        return [*out, "  (see --format json)"]
    plain = [r for r in rows if isinstance(r, dict) and not _groups(r)]
    if plain and len(plain) == len(rows):  # a table of plain values
        columns = list(dict.fromkeys(k for r in plain for k in r))
        header = [with_unit(_words(c), str(entry.get(f"{c}_unit", ""))) for c in columns]
        body = [[_scalar_text(r.get(c), digits) for c in columns] for r in plain]
        widths = [max(text_width(x) for x in col) for col in zip(header, *body, strict=True)]
        for line in [header, *body]:
            out.append("  " + "  ".join(pad(x, w) for x, w in zip(line, widths, strict=True)))
            out[-1] = out[-1].rstrip()
        return out
    lines: list[tuple[str, str, str]] = []
    for i, row in enumerate(rows, 1):
        if not isinstance(row, dict):
            lines.append((str(i), _scalar_text(row, digits), ""))
            continue
        groups = _groups(row)
        title = str(row.get("name") or row.get("label") or i)
        if row.get("type_label"):
            title += f" ({row['type_label']})"
        lines.append((title, "", ""))
        for k, v in row.items():
            if k not in _SKIP_KEYS and k not in groups and not isinstance(v, dict | list):
                lines.append((f"  {_words(k)}", _scalar_text(v, digits), ""))
        for k, group in groups.items():
            prefix = "" if k == "quantities" else f"{_words(k)}: "
            for r in group:
                if "value" in r:
                    unit = unit_text(str(r.get("unit", "")))
                    lines.append(
                        (f"  {prefix}{row_label(r)}", number_text(r["value"], digits), unit)
                    )
                elif "text" in r:
                    lines.append((f"  {prefix}{row_label(r)}", str(r["text"]), ""))
        lines += [(f"  warning: {w}", "", "") for w in row.get("warnings") or []]
    return out + _aligned(lines)


def _groups(row: dict[str, Any]) -> dict[str, list[dict[str, Any]]]:
    """The lists of result rows that a table row holds, by key."""
    return {
        k: v
        for k, v in row.items()
        if isinstance(v, list) and v and all(isinstance(r, dict) and "label" in r for r in v)
    }


def input_summary(
    fields: list[dict[str, Any]], inputs: dict[str, Any], origins: dict[str, str]
) -> list[tuple[str, str]]:
    """(label, value as given) for every field that applies, defaults filled in, for the table's
    record. Lists of items (modes, stages) get a row per item with its values and units.
    """
    out: list[tuple[str, str]] = []
    current = {fd["name"]: inputs.get(fd["name"], fd.get("default")) for fd in fields}
    for fd in fields:
        name = fd["name"]
        rule = fd.get("applies_when")
        if rule and current.get(rule["field"]) not in rule["values"]:
            continue  # does not apply to these choices (the page hides it)
        raw = current[name]
        if (
            isinstance(raw, list)
            and name not in origins
            and (fd.get("item_fields") or fd.get("stage_types"))
        ):
            out.extend(_item_rows(fd, raw))
            continue
        if raw is None or (is_quantity(fd) and isinstance(raw, dict) and raw.get("value") is None):
            shown = "—"
        elif name in origins:
            shown = f"from {origins[name]}"
        elif isinstance(raw, dict) and is_quantity(fd):
            unit = unit_text(str(raw.get("unit", "")))
            shown = f"{js_string(raw.get('value'))} {unit}".strip()
        elif fd.get("kind") == "choice":
            shown = next((c["label"] for c in fd.get("choices", []) if c["value"] == raw), str(raw))
        elif isinstance(raw, str):
            lines = raw.count("\n") + 1
            shown = raw if lines == 1 and len(raw) <= 60 else f"(text, {lines} lines)"
        elif isinstance(raw, dict) and isinstance(raw.get("sha256"), str) and "name" in raw:
            # a file's record: its name and the SHA-256 of its bytes, in full
            size = raw.get("bytes")
            shown = f"{str(raw['name'])[:80]}, SHA-256 {raw['sha256'][:64]}"
            shown += f", {size} bytes" if isinstance(size, int) else ""
        else:
            text = json.dumps(raw, ensure_ascii=False)
            n = len(raw) if isinstance(raw, list) else len(text)
            many = f"{n} item" if isinstance(raw, list) else f"{n} character"
            many += "" if n == 1 else "s"
            shown = text if len(text) <= 60 else f"({many})"
        out.append((fd.get("label", name), shown))
    return out


def _item_rows(fd: dict[str, Any], items: list[Any]) -> list[tuple[str, str]]:
    """A row per item of a list input: "Mode 1" / "by count, median 30 nm, GSD 1.6, ..."."""
    rows = []
    noun = fd["name"].removesuffix("s").replace("_", " ").capitalize()  # "modes": "Mode 1"
    for i, item in enumerate(items, start=1):
        if not isinstance(item, dict):
            rows.append((f"{noun} {i}", json.dumps(item, ensure_ascii=False)[:60]))
            continue
        spec = (fd.get("stage_types") or {}).get(item.get("type"))
        item_fields = spec["fields"] if spec else fd.get("item_fields") or []
        parts = []
        for f in item_fields:
            value = item.get(f["name"])
            if value is None or value == "":
                continue
            # stage fields have short labels; mode fields are named by their key ("gsd: 1.6")
            label = f.get("label", f["name"]) if spec else f["name"].replace("_", " ")
            if isinstance(value, dict):
                unit = unit_text(str(value.get("unit") or ""))
                if value.get("value") in (None, ""):
                    continue
                parts.append(f"{label}: {js_string(value.get('value'))} {unit}".strip())
            elif f.get("kind") == "choice":
                choices = f.get("choices", [])
                choice = next((c["label"] for c in choices if c["value"] == value), value)
                choice = choice if spec else str(value).replace("_", "-")
                parts.append(f"{label}: {choice}")
            else:
                parts.append(f"{label}: {js_string(value)}")
        title = f"{noun} {i}" + (f" ({spec['label']})" if spec else "")
        rows.append((title, "; ".join(parts)))
    return rows


def describe_text(description: dict[str, Any], kinds: Sequence[str]) -> str:
    out = [f"{PROG} {description.get('version', __version__)}", ""]
    for kind, calc in description["calculations"].items():
        if kinds and kind not in kinds:
            continue
        out.append(f"{kind}: {calc['title']}")
        for fd in calc["fields"]:
            kind_text = fd.get("kind", "")
            flag = flag_name(fd["name"])
            alias = file_alias(fd, calc["fields"])
            if alias:
                flag += f" (or {alias})"
            out.append(f"  {flag}  ({fd['name']}, {kind_text})")
            details = [fd.get("label", "")]
            if fd.get("help"):
                details.append(fd["help"].rstrip("."))
            if is_quantity(fd):
                details.append("units: " + ", ".join(f"{u['unit']}" for u in fd.get("units", [])))
            if fd.get("choices"):
                details.append(
                    "choices: " + "; ".join(f"{c['value']} ({c['label']})" for c in fd["choices"])
                )
            if fd.get("range"):
                details.append(f"valid: {fd['range']}")
            details.append(f"default: {default_text(fd)}")
            out.append(
                textwrap.fill(
                    ". ".join(details) + ".",
                    100,
                    initial_indent="      ",
                    subsequent_indent="      ",
                )
            )
        out.append("")
    return "\n".join(out)
