"""Command line over :mod:`driftdose.api`: ``python -m driftdose`` (or ``driftdose``).

Every calculation in the registry gets a subcommand whose flags are generated from its field
descriptions (:func:`driftdose.api.describe`), so a new calculation needs no change here::

    python -m driftdose motion --particle-diameter 2.5um --diameter-type aerodynamic
    python -m driftdose motion --input saved.json --format csv --curves curves.csv
    python -m driftdose describe
    python -m driftdose run saved.json
    python -m driftdose batch <calculation> --spectra a.csv b.csv --out table.csv

Requests go through :func:`driftdose.api.handle_json`, the very path the page's worker uses, so
every number printed here equals the page's: tables use the page's rounding (four significant
figures, the semantics of JavaScript's ``Number.prototype.toPrecision``; see
``site/js/format.js``).

Exit status: 0 on success, 2 for invalid input (each problem printed as ``field: message`` on
standard error), 1 for an unexpected failure.

Standard library only (argparse, csv, json, decimal), so the module also imports under Pyodide.
"""

from __future__ import annotations

import argparse
import errno
import fnmatch
import io
import json
import math
import os
import re
import stat
import sys
import textwrap
import unicodedata
from collections.abc import Iterable, Sequence
from dataclasses import dataclass
from decimal import ROUND_HALF_UP, Decimal
from pathlib import Path
from typing import Any, NoReturn, TextIO

from . import __version__, api, export, textfile
from .api.units import unit_label

__all__ = ["UserError", "format_number", "main", "plain_number", "to_precision"]

PROG = "driftdose"
EXIT_OK, EXIT_FAILURE, EXIT_USAGE = 0, 1, 2
SIG_FIGS = 4  # as SIG_FIGS in site/js/format.js
COMMANDS = ("describe", "run", "batch")  # subcommands that are not calculations
QUANTITY_KINDS_EXCLUDED = ("choice", "integer", "text", "data")
MAX_FILE_BYTES = 64 * 1024 * 1024  # a guard against reading huge files; the api sets the limits
MAX_DIGITS = 17  # enough to write any double exactly; more digits would only be noise
MAX_JSON_DEPTH = 64  # nesting of a JSON input; saved inputs are about 5 levels deep
_SUPERSCRIPT = str.maketrans("-0123456789", "⁻⁰¹²³⁴⁵⁶⁷⁸⁹")
_READ_PATHS: list[str] = []  # files read in this run: no output may overwrite one of them
_KEY_VALUE = re.compile(r"^([A-Za-z_][A-Za-z0-9_]*)=(.*)$", re.S)
_NUMBER_THEN_UNIT = re.compile(
    r"^\s*([-+\u2212]?(?:\d[\d,_]*(?:\.[\d_]*)?|\.\d+)(?:[eE][-+]?\d+)?)\s*(.*?)\s*$"
)


class UserError(Exception):
    """A problem with what the user gave; printed as ``field: message``, exit status 2."""

    def __init__(self, field: str, message: str) -> None:
        super().__init__(message)
        self.field = field
        self.message = message


# --- numbers as the page shows them ---------------------------------------------------------


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


def _is_number(value: Any) -> bool:
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
    if not _is_number(value):
        return "—"
    if value == 0:
        return "0"
    if 1e-3 <= abs(value) < 1e6:
        text = to_precision(float(value), digits)
        # toPrecision writes 12350 as 1.235e+4; the page then writes the number out in full
        return _js_string(float(text)) if "e" in text else _trim_zeros(text)
    mantissa, exponent = to_exponential(float(value), digits - 1).split("e")
    return f"{_trim_zeros(mantissa)} × 10{str(int(exponent)).translate(_SUPERSCRIPT)}"


def plain_number(value: Any, digits: int = SIG_FIGS) -> str:
    """The page's number written for spreadsheets: same rounding, ``e`` for powers of ten.

    ``digits`` 0 gives the full precision (the shortest text that reads back exactly); a
    missing value gives an empty text.

    >>> plain_number(2.73456e-11), plain_number(0.12345), plain_number(12345.6)
    ('2.735e-11', '0.1235', '12350')
    """
    if not _is_number(value):
        return ""
    if digits <= 0:
        return repr(float(value))
    shown = format_number(value, digits)
    if " × 10" not in shown:
        return shown
    mantissa, power = shown.split(" × 10")
    return f"{mantissa}e{power.translate(str.maketrans('⁻⁰¹²³⁴⁵⁶⁷⁸⁹', '-0123456789'))}"


# --- field descriptions -> flags ------------------------------------------------------------


def _is_quantity(fd: dict[str, Any]) -> bool:
    return fd.get("kind") not in QUANTITY_KINDS_EXCLUDED and "units" in fd


def _is_file_field(fd: dict[str, Any]) -> bool:
    """A field whose value is the text of a file the user picks (a CSV spectrum, say).

    The field description marks it with ``accept`` (the file types the page's file picker
    offers) or ``max_bytes`` (the largest file taken).
    """
    return fd.get("kind") in ("text", "data") and ("accept" in fd or "max_bytes" in fd)


def _source_choice(fields: list[dict[str, Any]], file_field: dict[str, Any]) -> tuple[str, str]:
    """The choice that makes a calculation use its file field: ``("distribution_source",
    "csv")`` for a field ``csv_text``; ``("", "")`` when there is none.
    """
    prefix = file_field["name"].split("_")[0].lower()
    wanted = {prefix, "csv", "file", "spectrum"}
    for fd in fields:
        if fd.get("kind") == "choice":
            for c in fd.get("choices", []):
                if str(c["value"]).lower() in wanted:
                    return fd["name"], c["value"]
    return "", ""


def _flag(name: str) -> str:
    return "--" + name.replace("_", "-")


def _unit_text(unit: str) -> str:
    return "" if unit in ("–", "1", "") else unit


def _default_text(fd: dict[str, Any]) -> str:
    default = fd.get("default")
    if isinstance(default, dict):
        unit = next(
            (u["label"] for u in fd.get("units", []) if u["unit"] == default.get("unit")),
            default.get("unit", ""),
        )
        return f"{_js_string(default.get('value'))} {_unit_text(unit)}".strip()
    if default is None or default == "":
        return "none"
    if isinstance(default, str):
        return default
    text = json.dumps(default, ensure_ascii=False)
    return text if len(text) <= 160 else f"{text[:150]}… (in full: describe --format json)"


def _field_help(fd: dict[str, Any]) -> str:
    parts = [fd.get("label", fd["name"])]
    if fd.get("help"):
        parts.append(fd["help"].rstrip("."))
    if _is_quantity(fd):
        labels = [u["label"] for u in fd.get("units", [])]
        if len(labels) > 1:
            parts.append("units: " + ", ".join(labels))
    if fd.get("range"):
        parts.append(f"valid: {fd['range']}")
    if fd.get("kind") == "data" and not _is_file_field(fd):
        parts.append("JSON text, @FILE.json, or KEY=VALUE pairs (@FILE as a value reads a file)")
    elif _is_file_field(fd):
        parts.append("a file name")
    elif fd.get("kind") == "text":
        parts.append("text or @FILE")
    parts.append(f"default: {_default_text(fd)}")
    return ". ".join(parts).replace("%", "%%") + "."


@dataclass
class _FlagMap:
    """Which field each generated flag sets (``dest`` -> field description)."""

    values: dict[str, dict[str, Any]]
    units: dict[str, dict[str, Any]]
    options: dict[str, str]  # option string -> field name (for argparse's messages)
    fields: list[dict[str, Any]]


def _add_field_flags(parser: argparse.ArgumentParser, fields: list[dict[str, Any]]) -> _FlagMap:
    """Add one flag per field (and a unit flag for a quantity offered in several units).

    A flag that would clash with one of the command's own options becomes ``--field-<name>``.
    """
    fmap = _FlagMap({}, {}, {}, fields)
    group = parser.add_argument_group("inputs (a field left out takes the page's default)")
    taken = set(parser._option_string_actions)  # argparse keeps no public list

    def option(name: str) -> str:
        flag = _flag(name)
        return flag if flag not in taken else _flag("field_" + name)

    for fd in fields:
        name = fd["name"]
        flags = [option(name)]
        dest = f"field:{name}"
        kwargs: dict[str, Any] = {"dest": dest, "default": argparse.SUPPRESS}
        if fd.get("kind") == "choice":
            kwargs["choices"] = [c["value"] for c in fd.get("choices", [])]
            kwargs["metavar"] = "{" + ",".join(kwargs["choices"]) + "}"
        elif _is_quantity(fd):
            kwargs["metavar"] = "VALUE[UNIT]" if len(fd.get("units", [])) > 1 else "VALUE"
        elif fd.get("kind") == "integer":
            kwargs["metavar"] = "N"
        elif _is_file_field(fd):
            kwargs["metavar"] = "FILE"
            if _spectrum_alias(fd, fields) and "--spectrum" not in taken:
                flags.append("--spectrum")
        elif fd.get("kind") == "data":
            kwargs["metavar"] = "DATA"
            kwargs["nargs"] = "+"
        else:
            kwargs["metavar"] = "TEXT|@FILE"
        group.add_argument(*flags, help=_field_help(fd), **kwargs)
        taken.update(flags)
        fmap.values[dest] = fd
        fmap.options.update(dict.fromkeys(flags, name))
        if _is_quantity(fd) and len(fd.get("units", [])) > 1:
            unit_flag = option(name + "_unit")
            offered = ", ".join(u["unit"] for u in fd["units"])
            group.add_argument(
                unit_flag,
                dest=f"unit:{name}",
                default=argparse.SUPPRESS,
                metavar="UNIT",
                help=f"Unit of {flags[0]} when its value has none ({offered}; "
                f"default {fd['default']['unit']}).".replace("%", "%%"),
            )
            taken.add(unit_flag)
            fmap.units[f"unit:{name}"] = fd
            fmap.options[unit_flag] = name
    return fmap


def _spectrum_alias(fd: dict[str, Any], fields: list[dict[str, Any]]) -> bool:
    """Whether a file field also answers to ``--spectrum``: the first file field that names a
    spectrum, in a calculation with no field called ``spectrum``.
    """
    files = [f for f in fields if _is_file_field(f)]
    return (
        bool(files)
        and files[0] is fd
        and "spectrum" in f"{fd['name']} {fd.get('label', '')}".lower()
        and all(f["name"] != "spectrum" for f in fields)
    )


def _split_quantity(text: str) -> tuple[str, str | None]:
    """Split ``"100nm"`` or ``"100 nm"`` into value text and unit (None when there is none)."""
    m = _NUMBER_THEN_UNIT.match(text)
    if not m:
        return text, None  # not a number: the api says so, with the valid range
    return m.group(1), (m.group(2) or None)


def _flag_inputs(
    args: argparse.Namespace, fmap: _FlagMap, base: dict[str, Any], origins: dict[str, str]
) -> dict[str, Any]:
    """Inputs from the flags given, on top of ``base`` (the inputs of an --input file).

    A quantity's unit is, in this order: written after the number, its ``--<name>-unit``
    flag, the unit the --input file gave, the field's default unit (as the page's unit menu).
    ``origins`` records the file each file field was read from.
    """
    inputs = dict(base)
    given = vars(args)
    for dest, fd in fmap.values.items():
        if dest not in given:
            continue
        name, raw = fd["name"], given[dest]
        if _is_quantity(fd):
            value, unit = _split_quantity(raw)
            flag_unit = given.get(f"unit:{name}")
            if unit and flag_unit and unit != flag_unit:
                raise UserError(
                    name, f"unit given twice: {unit!r} in the value and {flag_unit!r} by its flag."
                )
            unit = unit or flag_unit or _unit_of(base.get(name)) or fd["default"]["unit"]
            inputs[name] = {"value": value, "unit": unit}
        elif _is_file_field(fd):
            path = raw.removeprefix("@")
            inputs[name] = _read_text_file(path, name, fd.get("max_bytes"))
            origins[name] = path
            choice, value = _source_choice(fmap.fields, fd)
            if choice and f"field:{choice}" not in given:
                inputs[choice] = value  # a file given means: use it (as choosing it on the page)
        elif fd.get("kind") == "data":
            inputs[name] = _data_value(raw, name, origins, fd)
        elif fd.get("kind") == "text" and raw.startswith("@"):
            inputs[name] = _read_text_file(raw[1:], name)
            origins[name] = raw[1:]
        else:
            inputs[name] = raw
    for dest, fd in fmap.units.items():  # a unit flag alone re-labels the value, as on the page
        name = fd["name"]
        if dest in given and f"field:{name}" not in given:
            current = base.get(name)
            value = current.get("value") if isinstance(current, dict) else current
            if value is None:
                value = fd["default"]["value"]
            inputs[name] = {"value": value, "unit": given[dest]}
    return inputs


def _data_value(
    args: list[str], name: str, origins: dict[str, str], fd: dict[str, Any] | None = None
) -> Any:
    """A data field's value: one JSON text or ``@file.json``, or ``KEY=VALUE`` pairs.

    Pairs make an object; a value ``@path`` is that file's text (a CSV file, say), any other
    value is read as JSON when it is JSON (numbers, lists) and kept as text otherwise. For a
    list of items (lognormal modes), pairs make the items instead: see :func:`_item_list`.
    """
    if len(args) == 1 and not _KEY_VALUE.match(args[0]):
        return _parse_json_text(args[0], name)
    pairs = []
    for arg in args:
        m = _KEY_VALUE.match(arg)
        if not m:
            raise UserError(
                name, f"give one JSON text, @FILE or KEY=VALUE pairs, not {arg[:30]!r}."
            )
        pairs.append(m.groups())
    if fd is not None and fd.get("item_fields"):
        return _item_list(pairs, fd, name)
    obj: dict[str, Any] = {}
    for key, value in pairs:
        if value.startswith("@"):
            obj[key] = _read_text_file(value[1:], name)
            origins[name] = f"{key} from {value[1:]}"
            continue
        try:
            obj[key] = json.loads(value)
        except ValueError:
            obj[key] = value
        except RecursionError:
            obj[key] = None
        if obj[key] is None or _json_depth_over(obj[key], MAX_JSON_DEPTH):
            raise _too_deep(name, f"{key}= is ")
    return obj


def _item_list(pairs: list[tuple[str, str]], fd: dict[str, Any], name: str) -> list[dict[str, Any]]:
    """Items of a list field from ``KEY=VALUE`` pairs, as the page's item forms send them.

    A key given again starts the next item (``basis=count median=30nm ... basis=mass ...``). A
    quantity takes its unit after the number (``30nm``) or, without one, the unit of the
    field's default item; keys left out take the default item's values.
    """
    fields = {f["name"]: f for f in fd["item_fields"]}
    template = (fd.get("default") or [{}])[0]
    items: list[dict[str, Any]] = []
    current: dict[str, Any] = {}
    for key, value in pairs:
        if key in current:
            items.append(current)
            current = {}
        f = fields.get(key)
        if f is not None and f.get("units"):
            number, unit = _split_quantity(value)
            default = template.get(key)
            if unit is None:
                unit = default.get("unit") if isinstance(default, dict) else f["units"][0]
            current[key] = {"value": number, "unit": unit}
        elif f is not None:
            current[key] = value  # choices and plain numbers travel as text, as from the form
        else:  # not an item field: read as JSON when it is JSON (the api names the key)
            try:
                current[key] = json.loads(value)
            except ValueError:
                current[key] = value
            except RecursionError:
                raise _too_deep(name, f"{key}= is ") from None
            if _json_depth_over(current[key], MAX_JSON_DEPTH):
                raise _too_deep(name, f"{key}= is ")
    items.append(current)
    return [{**template, **item} for item in items]


def _js_string(value: Any) -> str:
    """A default value written as the page's form writes it (JavaScript ``String(value)``)."""
    if not isinstance(value, float) or not math.isfinite(value):
        return str(value)
    if value.is_integer() and abs(value) < 1e21:
        return str(int(value))
    if 1e-6 <= abs(value) < 1e21:
        return format(Decimal(repr(value)), "f")  # shortest digits, no exponent
    mantissa, exponent = repr(value).split("e")
    return f"{mantissa}e{'-' if exponent.startswith('-') else '+'}{int(exponent[1:])}"


def _unit_of(raw: Any) -> str | None:
    return raw.get("unit") if isinstance(raw, dict) and isinstance(raw.get("unit"), str) else None


# --- files ------------------------------------------------------------------------------------


def _read_bytes(path: str, field: str) -> bytes:
    """A file's bytes (``-`` for standard input), at most :data:`MAX_FILE_BYTES`.

    Only regular files are read: a named pipe would block until something writes to it and a
    device may never end, so both are refused at once (use ``-`` to read a pipe).
    """
    if path == "-":
        try:
            data = sys.stdin.buffer.read(MAX_FILE_BYTES + 1)
        except OSError as exc:
            raise UserError(field, f"cannot read standard input: {exc.strerror or exc}.") from None
    else:
        try:
            # O_NONBLOCK: opening a named pipe must not wait for a writer
            fd = os.open(path, os.O_RDONLY | getattr(os, "O_NONBLOCK", 0))
        except IsADirectoryError:
            raise UserError(field, f"{path!r} is a folder, not a file.") from None
        except OSError as exc:
            raise UserError(field, f"cannot read {path!r}: {exc.strerror or exc}.") from None
        try:
            mode = os.fstat(fd).st_mode
            if stat.S_ISDIR(mode):
                raise UserError(field, f"{path!r} is a folder, not a file.")
            if not stat.S_ISREG(mode):
                raise UserError(
                    field,
                    f"{path!r} is not a regular file (a pipe or a device); save it to a file, "
                    "or give '-' to read standard input.",
                )
            os.set_blocking(fd, True)
            with os.fdopen(fd, "rb", closefd=False) as fh:
                data = fh.read(MAX_FILE_BYTES + 1)
        except OSError as exc:
            raise UserError(field, f"cannot read {path!r}: {exc.strerror or exc}.") from None
        finally:
            os.close(fd)
        _READ_PATHS.append(path)
    if len(data) > MAX_FILE_BYTES:
        raise UserError(field, f"{path!r} is larger than {MAX_FILE_BYTES // 2**20} MB.")
    return data


def _read_text_file(path: str, field: str, limit: int | None = None) -> str:
    """Read a file's text as the page reads a file you pick, with the core's decoder.

    UTF-8, UTF-8 or UTF-16 with a byte-order mark, or Latin-1 (see :mod:`driftdose.textfile`),
    so the api sees the very text the page would send; a file over ``limit`` bytes (the
    field's ``max_bytes``) is refused, as the page refuses it, before it is read.
    """
    if limit is not None and path != "-":
        try:
            size = Path(path).stat().st_size
        except OSError:
            size = 0  # reading it reports the problem
        if size > limit:
            raise UserError(field, textfile.too_large(size, limit, path))
    data = _read_bytes(path, field)
    try:
        return textfile.decode_text(data, MAX_FILE_BYTES if limit is None else limit).text
    except textfile.TextFileError as exc:
        name = "standard input" if path == "-" else repr(path)
        raise UserError(field, f"{name}: {exc.message}") from None


def _json_depth_over(value: Any, limit: int) -> bool:
    """Tell whether lists and objects nest more than ``limit`` levels (no recursion)."""
    stack = [(value, 1)]
    while stack:
        node, depth = stack.pop()
        if isinstance(node, dict):
            node = list(node.values())
        if isinstance(node, list):
            if depth > limit:
                return True
            stack.extend((item, depth + 1) for item in node if isinstance(item, dict | list))
    return False


def _json_value(text: str, field: str, what: str) -> Any:
    """Parse JSON text from the user (``what`` names it in messages), nesting limited."""
    try:
        value = json.loads(text)
    except RecursionError:
        value = None
        deep = True
    except ValueError as exc:
        where = f" (line {exc.lineno}, column {exc.colno})" if hasattr(exc, "lineno") else ""
        raise UserError(field, f"{what}not valid JSON{where}.") from None
    else:
        deep = _json_depth_over(value, MAX_JSON_DEPTH)
    if deep:
        raise _too_deep(field, what)
    return value


def _too_deep(field: str, what: str) -> UserError:
    return UserError(
        field,
        f"{what}nested too deeply: JSON lists and objects inside each other more than "
        f"{MAX_JSON_DEPTH} levels deep are not read (saved inputs need about 5).",
    )


def _parse_json_text(raw: str, field: str) -> Any:
    if raw.startswith("@"):
        path = raw[1:]
        source = _read_text_file(path, field)
        return _json_value(source, field, f"{path!r} is ")
    return _json_value(raw, field, "")


def _load_document(path: str) -> Any:
    text = _read_text_file(path, "input")
    return _json_value(text, "input", f"{path!r} is ")


def _document_kind(doc: Any) -> str | None:
    """The calculation a request or saved state names, if any."""
    if isinstance(doc, dict):
        if isinstance(doc.get("kind"), str):
            return doc["kind"]
        panels = doc.get("panels")
        if isinstance(panels, dict) and len(panels) == 1:
            return next(iter(panels))
        if isinstance(doc.get("panel"), str):
            return doc["panel"]
    return None


def _document_inputs(doc: Any, kind: str) -> dict[str, Any]:
    """Inputs for ``kind`` from a request (``{"kind", "inputs"}``), a saved state or a dict.

    Accepted: ``{"inputs": {...}}`` with an optional ``"kind"``; a state of several panels
    ``{"panels": {kind: {...}}}``; or a plain object of field values.
    """
    if not isinstance(doc, dict):
        raise UserError("input", "the input file must hold a JSON object.")
    if isinstance(doc.get("kind"), str) and doc["kind"] != kind:
        raise UserError("kind", f"the input file is for {doc['kind']!r}, not {kind!r}.")
    if isinstance(doc.get("panels"), dict) and "inputs" not in doc:
        panels = doc["panels"]
        if kind not in panels:
            raise UserError("input", f"the saved state has no inputs for {kind!r}.")
        doc = panels[kind]
        if isinstance(doc, dict) and isinstance(doc.get("inputs"), dict):
            doc = doc["inputs"]
    elif "inputs" in doc:
        doc = doc["inputs"]
    if not isinstance(doc, dict):
        raise UserError("inputs", "inputs must be an object of named fields.")
    return doc


# --- output -----------------------------------------------------------------------------------


def _rows(results: Any) -> Iterable[tuple[str, dict[str, Any]]]:
    """Result rows (key, row) in reply order; anything not shaped as a row is skipped."""
    if not isinstance(results, dict):
        return
    for key, row in results.items():
        if isinstance(row, dict) and ("value" in row or "text" in row):
            yield key, row


def _row_label(row: dict[str, Any], symbol: bool = True) -> str:
    label = str(row.get("label", ""))
    if symbol and row.get("symbol"):
        label += f" {row['symbol']}"
    if row.get("note"):
        label += f" ({row['note']})"
    return label


def _with_unit(label: str, unit: str) -> str:
    unit = _unit_text(unit)
    return f"{label} [{unit}]" if unit else label


def _width(text: str) -> int:
    """Columns that ``text`` takes in a terminal (combining marks such as in V̇ take none)."""
    return sum(0 if unicodedata.combining(ch) else 1 for ch in text)


def _pad(text: str, width: int) -> str:
    return text + " " * max(0, width - _width(text))


def _shown(value: Any, digits: int) -> str:
    """A number for the terminal: as the page shows it, or in full with ``digits`` 0."""
    if digits <= 0:
        return plain_number(value, 0) or "—"
    return format_number(value, digits)


def _table_text(
    title: str, inputs: list[tuple[str, str]], reply: dict[str, Any], digits: int
) -> str:
    """The reply as the page shows it: inputs, results (label, value, unit), warnings, sources."""
    out: list[str] = [title, "=" * len(title), ""]
    if inputs:
        out.append("Inputs")
        width = max(_width(k) for k, _ in inputs)
        out += [f"  {_pad(k, width)}  {v}".rstrip() for k, v in inputs]
        out.append("")
    lines = [("Quantity", "Value", "Unit")]
    for _, row in _rows(reply.get("results")):
        if "text" in row:
            lines.append((_row_label(row), str(row["text"]), ""))
        else:
            unit = _unit_text(str(row.get("unit", "")))
            lines.append((_row_label(row), _shown(row.get("value"), digits), unit))
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
    if _is_number(value):
        return _shown(value, digits)
    if isinstance(value, list) and all(isinstance(v, str | int | float) for v in value):
        return ", ".join(_scalar_text(v, digits) for v in value)
    return "" if value is None else str(value)


def _aligned(lines: list[tuple[str, str, str]], indent: str = "  ") -> list[str]:
    """Lines of (label, value, unit) in columns; a line with neither value nor unit is a title."""
    cells = [(a, b, c) for a, b, c in lines if b or c]
    w0 = max((_width(a) for a, _, _ in cells), default=0)
    w1 = max((_width(b) for a, b, c in cells if c), default=0)  # words may run past
    return [
        f"{indent}{_pad(a, w0)}  {_pad(b, w1)}  {c}".rstrip() if (b or c) else f"{indent}{a}"
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
        header = [_with_unit(_words(c), str(entry.get(f"{c}_unit", ""))) for c in columns]
        body = [[_scalar_text(r.get(c), digits) for c in columns] for r in plain]
        widths = [max(_width(x) for x in col) for col in zip(header, *body, strict=True)]
        for line in [header, *body]:
            out.append("  " + "  ".join(_pad(x, w) for x, w in zip(line, widths, strict=True)))
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
                    unit = _unit_text(str(r.get("unit", "")))
                    lines.append((f"  {prefix}{_row_label(r)}", _shown(r["value"], digits), unit))
                elif "text" in r:
                    lines.append((f"  {prefix}{_row_label(r)}", str(r["text"]), ""))
        lines += [(f"  warning: {w}", "", "") for w in row.get("warnings") or []]
    return out + _aligned(lines)


def _groups(row: dict[str, Any]) -> dict[str, list[dict[str, Any]]]:
    """The lists of result rows that a table row holds, by key."""
    return {
        k: v
        for k, v in row.items()
        if isinstance(v, list) and v and all(isinstance(r, dict) and "label" in r for r in v)
    }


def _write(path: str | None, text: str, stdout: TextIO) -> None:
    """Write ``text`` to the file ``path`` or, for None or ``-``, to standard output.

    A named pipe is opened without waiting: if nothing reads it, that is said at once. Any
    failure (a full disk, a closed pipe) becomes one line naming where the writing failed.
    """
    if path in (None, "-"):
        try:
            stdout.write(text)
            stdout.flush()
        except BrokenPipeError:
            raise
        except OSError as exc:
            _silence_stdout(stdout)
            raise UserError(
                "out", f"cannot write to standard output: {exc.strerror or exc}."
            ) from None
        return
    try:
        fd = os.open(
            path, os.O_WRONLY | os.O_CREAT | os.O_TRUNC | getattr(os, "O_NONBLOCK", 0), 0o666
        )
    except OSError as exc:
        reason = exc.strerror or str(exc)
        if exc.errno == errno.ENXIO:
            reason = "it is a named pipe that no program is reading"
        raise UserError("out", f"cannot write {path!r}: {reason}.") from None
    try:
        os.set_blocking(fd, True)
        with open(fd, "w", encoding="utf-8", newline="") as fh:
            fh.write(text)
    except OSError as exc:
        raise UserError("out", f"cannot write {path!r}: {exc.strerror or exc}.") from None


def _silence_stdout(stdout: TextIO) -> None:
    """After standard output failed: drop what is buffered, so exiting prints nothing more."""
    if stdout is sys.__stdout__:
        try:
            devnull = os.open(os.devnull, os.O_WRONLY)
            os.dup2(devnull, stdout.fileno())
            os.close(devnull)
        except OSError:
            pass


def _same_file(a: str, b: str) -> bool:
    """Tell whether two paths name one file (hard links and ``./`` spellings included)."""
    try:
        return os.path.samefile(a, b)
    except OSError:
        return os.path.realpath(a) == os.path.realpath(b)


def _check_outputs(opts: argparse.Namespace, reads: Sequence[str] = ()) -> None:
    """Refuse outputs that would overwrite each other, a file this run has read or ``reads``."""
    outs = [
        (flag, p)
        for flag, p in (("out", opts.out), ("curves", getattr(opts, "curves", None)))
        if p not in (None, "-")
    ]
    if len(outs) == 2 and _same_file(outs[0][1], outs[1][1]):
        raise UserError(
            "curves",
            f"--curves and --out name the same file ({outs[1][1]!r}); the curves would "
            "overwrite the results. Give two different files.",
        )
    for flag, p in outs:
        for read in [*_READ_PATHS, *reads]:
            if read != "-" and _same_file(p, read):
                raise UserError(
                    flag, f"--{flag} names {p!r}, a file this run reads; it would be overwritten."
                )


def _input_summary(
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
        if raw is None or (_is_quantity(fd) and isinstance(raw, dict) and raw.get("value") is None):
            shown = "—"
        elif name in origins:
            shown = f"from {origins[name]}"
        elif isinstance(raw, dict) and _is_quantity(fd):
            unit = next(
                (u["label"] for u in fd.get("units", []) if u["unit"] == raw.get("unit")),
                str(raw.get("unit", "")),
            )
            shown = f"{_js_string(raw.get('value'))} {_unit_text(unit)}".strip()
        elif fd.get("kind") == "choice":
            shown = next((c["label"] for c in fd.get("choices", []) if c["value"] == raw), str(raw))
        elif isinstance(raw, str):
            lines = raw.count("\n") + 1
            shown = raw if lines == 1 and len(raw) <= 60 else f"(text, {lines} lines)"
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
    noun = "Stage" if fd.get("stage_types") else "Mode" if fd["name"] == "modes" else "Item"
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
                unit = _unit_text(_item_unit_label(f, value.get("unit")))
                if value.get("value") in (None, ""):
                    continue
                parts.append(f"{label}: {_js_string(value.get('value'))} {unit}".strip())
            elif f.get("kind") == "choice":
                choices = f.get("choices", [])
                choice = next((c["label"] for c in choices if c["value"] == value), value)
                choice = choice if spec else str(value).replace("_", "-")
                parts.append(f"{label}: {choice}")
            else:
                parts.append(f"{label}: {_js_string(value)}")
        title = f"{noun} {i}" + (f" ({spec['label']})" if spec else "")
        rows.append((title, "; ".join(parts)))
    return rows


def _item_unit_label(f: dict[str, Any], unit: Any) -> str:
    for u in f.get("units", []):
        code, label = (u, unit_label(u)) if isinstance(u, str) else (u["unit"], u["label"])
        if code == unit:
            return label
    return str(unit or "")


# --- running ----------------------------------------------------------------------------------


def _call(kind: str, inputs: dict[str, Any]) -> dict[str, Any]:
    """Ask the api exactly as the page's worker does: JSON text in, JSON text out."""
    return json.loads(api.handle_json(json.dumps({"kind": kind, "inputs": inputs})))


def _print_errors(errors: Sequence[dict[str, Any]], stderr: TextIO, prefix: str = "") -> None:
    for e in errors:
        stderr.write(f"{prefix}{e.get('field') or 'error'}: {e.get('message', '')}\n")


def _warn_unknown(kind: str, fields: list[dict[str, Any]], inputs: Any, stderr: TextIO) -> None:
    if not isinstance(inputs, dict):
        return
    known = {fd["name"] for fd in fields}
    for name in inputs:
        if name not in known:
            stderr.write(f"note: {kind} has no input {name!r}; it is ignored.\n")


def _compute(
    kind: str,
    description: dict[str, Any],
    inputs: dict[str, Any],
    origins: dict[str, str],
    opts: argparse.Namespace,
    stdout: TextIO,
    stderr: TextIO,
) -> int:
    """Run one calculation and write its reply in the chosen format."""
    fields = description["fields"]
    _check_outputs(opts)
    _warn_unknown(kind, fields, inputs, stderr)
    reply = _call(kind, inputs)
    if not reply.get("ok"):
        _print_errors(reply.get("errors", []), stderr)
        return EXIT_USAGE
    if opts.format == "json":
        text = json.dumps(reply, indent=2, ensure_ascii=False) + "\n"
    elif opts.format == "csv":
        text = export.results_csv(reply)  # the page's "Download results (CSV)", byte for byte
        for w in reply.get("warnings", []):
            stderr.write(f"warning: {w}\n")
    else:
        summary = _input_summary(fields, inputs, origins)
        text = _table_text(description["title"], summary, reply, _digits(opts, 4))
    _write(opts.out, text, stdout)
    if getattr(opts, "curves", None):
        _write(opts.curves, export.curves_csv(reply), stdout)
    return EXIT_OK


def _digits(opts: argparse.Namespace, default: int) -> int:
    return default if opts.digits is None else opts.digits


def _batch(
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
    _check_outputs(opts, opts.files)
    _warn_unknown(kind, fields, base, stderr)
    name = file_field["name"]
    records: list[tuple[str, dict[str, Any]]] = []
    for path in opts.files:
        try:
            text = _read_text_file(path, name, file_field.get("max_bytes"))
            reply = _call(kind, {**base, name: text})
        except UserError as exc:
            reply = {"ok": False, "errors": [{"field": exc.field, "message": exc.message}]}
        if not reply.get("ok"):
            _print_errors(reply.get("errors", []), stderr, prefix=f"{path}: ")
        records.append((path, reply))
    status = EXIT_OK if all(r.get("ok") for _, r in records) else EXIT_USAGE

    if opts.format == "json":
        doc = [{"file": p, **r} for p, r in records]
        _write(opts.out, json.dumps(doc, indent=2, ensure_ascii=False) + "\n", stdout)
        return status
    digits = _digits(opts, 4 if opts.format == "table" else 0)
    table = _batch_table(records, opts.columns, digits, opts.format == "table")
    if opts.format == "table":
        widths = [max(_width(r[i]) for r in table) for i in range(len(table[0]))]
        text = "".join(
            "  ".join(_pad(c, w) for c, w in zip(r, widths, strict=True)).rstrip() + "\n"
            for r in table
        )
    else:
        buf = io.StringIO()
        export.csv_writer(buf).writerows(table)  # as the page's CSV exports
        text = buf.getvalue()
    _write(opts.out, text, stdout)
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
        for key, row in _rows(reply.get("results") if reply.get("ok") else None):
            if patterns and not any(fnmatch.fnmatchcase(key, p) for p in patterns):
                continue
            if key in columns and columns[key][2] is not None:
                continue
            unit = "" if "text" in row else _unit_text(str(row.get("unit", "")))
            si, value = row.get("si"), row.get("value")
            per_si = value / si if _is_number(si) and si and _is_number(value) else None
            columns[key] = (_row_label(row, symbol=False), unit, per_si)
    header = ["file", *(_with_unit(lab, unit) for lab, unit, _ in columns.values())]
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
                if _unit_text(str(row.get("unit", ""))) != unit and per_si is not None:
                    value = row["si"] * per_si  # in the column's unit, not this row's
                line.append(_shown(value, digits) if for_terminal else plain_number(value, digits))
        line.append(" | ".join(map(str, reply.get("warnings", []))))
        line.append(
            " | ".join(
                f"{e.get('field') or 'error'}: {e.get('message', '')}"
                for e in reply.get("errors", [])
            )
        )
        table.append(line)
    return table


# --- the parser -------------------------------------------------------------------------------


class _Parser(argparse.ArgumentParser):
    """argparse with messages naming the field (``field: message``) and exit status 2."""

    field_options: dict[str, str]

    def __init__(self, *args: Any, **kwargs: Any) -> None:
        super().__init__(*args, **kwargs)
        self.field_options = {}
        # Let values such as -10degC follow a flag (argparse takes them for options otherwise).
        if hasattr(self, "_negative_number_matcher"):
            self._negative_number_matcher = re.compile(r"^-\.?\d")

    def error(self, message: str) -> NoReturn:
        """Print the problem (naming the field when a field's flag is at fault) and exit 2."""
        m = re.match(r"argument (\S+?)(?:/\S+)?: (.*)", message, re.S)
        if m and m.group(1) in self.field_options:
            self.exit(EXIT_USAGE, f"{self.field_options[m.group(1)]}: {m.group(2)}\n")
        self.print_usage(sys.stderr)
        self.exit(EXIT_USAGE, f"{self.prog}: error: {message}\n")

    def _print_message(self, message: str, file: Any = None) -> None:
        """Print help or usage; unlike argparse, say so when standard output cannot take it."""
        if not message:
            return
        file = sys.stdout if file is None else file
        try:
            file.write(message)
            file.flush()
        except BrokenPipeError:
            raise
        except OSError as exc:
            if file is sys.stderr:
                return
            _silence_stdout(file)
            raise UserError(
                "out", f"cannot write to standard output: {exc.strerror or exc}."
            ) from None


def _output_options(parser: argparse.ArgumentParser, batch: bool = False) -> None:
    out = parser.add_argument_group("output")
    out.add_argument(
        "--format",
        choices=("table", "csv", "json"),
        default="csv" if batch else "table",
        help=(
            "csv (one row per file; units in the header), table or json. Default: %(default)s."
            if batch
            else "table (as the page shows it), csv (the page's results CSV: quantity, "
            "value, unit, ...) or json (the full reply). Default: %(default)s."
        ),
    )
    out.add_argument("--out", metavar="FILE", help="write there instead of standard output")
    if not batch:
        out.add_argument(
            "--curves", metavar="FILE", help="also write the curves (the page's charts) as CSV"
        )
    out.add_argument(
        "--digits",
        type=int,
        metavar="N",
        help=f"significant figures in a table (default {SIG_FIGS}, as the page shows them; 0 "
        "for full precision)"
        + ("; in CSV numbers are in full precision unless this is given" if batch else ""),
    )


def _example(kind: str, fields: list[dict[str, Any]]) -> str:
    for fd in fields:
        if _is_quantity(fd) and fd["default"].get("value") is not None:
            d = fd["default"]
            return f"example: {PROG} {kind} {_flag(fd['name'])} {_js_string(d['value'])}{d['unit']}"
    return f"example: {PROG} {kind}"


def _build_parser(description: dict[str, Any]) -> tuple[_Parser, dict[str, Any]]:
    calcs = description["calculations"]
    parser = _Parser(
        prog=PROG,
        description="Drift & Dose on the command line: the page's calculations, with the "
        "same inputs, checks and numbers.",
        epilog=f"'{PROG} <calculation> --help' lists a calculation's inputs.",
    )
    parser.add_argument("--version", action="version", version=f"{PROG} {__version__}")
    sub = parser.add_subparsers(dest="command", metavar="<command>", required=True)
    info: dict[str, Any] = {"calc": {}, "batch": {}}

    for kind, calc in calcs.items():
        if kind in COMMANDS:
            continue  # a calculation may not shadow a command; describe() still lists it
        p = sub.add_parser(
            kind,
            help=calc["title"],
            description=calc["title"],
            epilog=_example(kind, calc["fields"]),
        )
        p.add_argument(
            "--input",
            metavar="FILE",
            help='inputs from a JSON file: a request {"kind", "inputs"} or a state the '
            "page saved; flags given as well take precedence ('-' reads standard input)",
        )
        _output_options(p)
        fmap = _add_field_flags(p, calc["fields"])
        p.field_options = fmap.options
        info["calc"][kind] = fmap

    p = sub.add_parser("run", help="run a saved request or page state (JSON) as it stands")
    p.add_argument(
        "file", metavar="FILE", help='JSON: a request {"kind", "inputs"} or a state the page saved'
    )
    p.add_argument(
        "--kind",
        choices=[k for k in calcs if k not in COMMANDS],
        help="the calculation to run from a saved state of several panels (default: the panel "
        "that was open)",
    )
    _output_options(p)

    p = sub.add_parser("describe", help="list the calculations and their inputs")
    p.add_argument("kinds", nargs="*", metavar="CALCULATION", help="only these calculations")
    p.add_argument("--format", choices=("text", "json"), default="text")

    batchable = {
        kind: [fd for fd in calc["fields"] if _is_file_field(fd)]
        for kind, calc in calcs.items()
        if kind not in COMMANDS
    }
    batchable = {k: v for k, v in batchable.items() if v}
    if batchable:
        bp = sub.add_parser(
            "batch",
            help="run a calculation for many files, one row per file: "
            + ", ".join(sorted(batchable)),
            description="Run a calculation once per input file and write one table, one row "
            "per file, a column for each result (units in the header).",
        )
        bsub = bp.add_subparsers(dest="batch_kind", metavar="<calculation>", required=True)
        for kind, file_fields in batchable.items():
            calc = calcs[kind]
            ff = file_fields[0]
            p = bsub.add_parser(kind, help=calc["title"], description=calc["title"])
            p.add_argument(
                "--spectra",
                "--files",
                dest="files",
                nargs="+",
                required=True,
                metavar="FILE",
                help=f"files, one run each, read into {ff['label']!r} ({ff['name']})",
            )
            p.add_argument(
                "--input", metavar="FILE", help="the other inputs from a JSON file (as above)"
            )
            p.add_argument(
                "--columns",
                nargs="+",
                metavar="PATTERN",
                help="only the results whose keys match these shell-style patterns "
                "(e.g. 'dose_*'; 'describe --format json' or '--format json' shows the keys)",
            )
            _output_options(p, batch=True)
            others = [fd for fd in calc["fields"] if fd["name"] != ff["name"]]
            fmap = _add_field_flags(p, others)
            p.field_options = fmap.options
            info["batch"][kind] = (fmap, ff)
    return parser, info


def _describe_text(description: dict[str, Any], kinds: Sequence[str]) -> str:
    out = [f"{PROG} {description.get('version', __version__)}", ""]
    for kind, calc in description["calculations"].items():
        if kinds and kind not in kinds:
            continue
        out.append(f"{kind}: {calc['title']}")
        for fd in calc["fields"]:
            kind_text = fd.get("kind", "")
            flag = _flag(fd["name"])
            if _spectrum_alias(fd, calc["fields"]):
                flag += " (or --spectrum)"
            out.append(f"  {flag}  ({fd['name']}, {kind_text})")
            details = [fd.get("label", "")]
            if fd.get("help"):
                details.append(fd["help"].rstrip("."))
            if _is_quantity(fd):
                details.append("units: " + ", ".join(f"{u['unit']}" for u in fd.get("units", [])))
            if fd.get("choices"):
                details.append(
                    "choices: " + "; ".join(f"{c['value']} ({c['label']})" for c in fd["choices"])
                )
            if fd.get("range"):
                details.append(f"valid: {fd['range']}")
            details.append(f"default: {_default_text(fd)}")
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


def _run(argv: Sequence[str] | None, stdout: TextIO, stderr: TextIO) -> int:
    description = api.describe()
    parser, info = _build_parser(description)
    opts = parser.parse_args(argv)
    calcs = description["calculations"]
    _READ_PATHS.clear()
    digits = getattr(opts, "digits", None)
    if digits is not None and not 0 <= digits <= MAX_DIGITS:
        raise UserError(
            "digits",
            f"--digits must be from 0 to {MAX_DIGITS} significant figures (0 for full "
            f"precision), not {digits}.",
        )

    if opts.command == "describe":
        unknown = [k for k in opts.kinds if k not in calcs]
        if unknown:
            raise UserError(
                "kind", f"unknown calculation {unknown[0]!r}; valid: {', '.join(calcs)}."
            )
        if opts.format == "json":
            if opts.kinds:
                description = {
                    **description,
                    "calculations": {k: v for k, v in calcs.items() if k in opts.kinds},
                }
            _write(None, json.dumps(description, indent=2, ensure_ascii=False) + "\n", stdout)
        else:
            _write(None, _describe_text(description, opts.kinds), stdout)
        return EXIT_OK

    if opts.command == "run":
        doc = _load_document(opts.file)
        kind = opts.kind or _document_kind(doc)
        if kind is None:
            raise UserError("kind", "the file names no calculation ('kind').")
        if kind not in calcs or kind in COMMANDS:
            valid = ", ".join(k for k in calcs if k not in COMMANDS)
            raise UserError("kind", f"unknown calculation {kind!r}; valid: {valid}.")
        return _compute(kind, calcs[kind], _document_inputs(doc, kind), {}, opts, stdout, stderr)

    origins: dict[str, str] = {}
    if opts.command == "batch":
        kind = opts.batch_kind
        fmap, file_field = info["batch"][kind]
        base = _document_inputs(_load_document(opts.input), kind) if opts.input else {}
        base = _flag_inputs(opts, fmap, base, origins)
        choice, value = _source_choice(calcs[kind]["fields"], file_field)
        if choice:  # every run reads its file, as choosing the file on the page
            given = getattr(opts, f"field:{choice}", value)
            if given != value:
                raise UserError(choice, f"batch runs read each file: {choice} must be {value!r}.")
            base[choice] = value
        return _batch(kind, calcs[kind], base, file_field, opts, stdout, stderr)

    kind = opts.command
    base = _document_inputs(_load_document(opts.input), kind) if opts.input else {}
    inputs = _flag_inputs(opts, info["calc"][kind], base, origins)
    return _compute(kind, calcs[kind], inputs, origins, opts, stdout, stderr)


def main(argv: Sequence[str] | None = None) -> int:
    """Run the command line; return the exit status (0 ok, 2 invalid input, 1 failure)."""
    stdout, stderr = sys.stdout, sys.stderr
    for stream in (stdout, stderr):  # never fail on a console that cannot show µ or ⁻¹¹
        if isinstance(stream, io.TextIOWrapper) and stream.encoding.lower() not in (
            "utf-8",
            "utf8",
        ):
            stream.reconfigure(errors="replace")
    code = _main(argv, stdout, stderr)
    try:  # what argparse printed (--help) is still buffered: fail here, not at exit
        stdout.flush()
    except BrokenPipeError:
        _silence_stdout(stdout)
        return EXIT_FAILURE
    except OSError as exc:
        _silence_stdout(stdout)
        stderr.write(f"out: cannot write to standard output: {exc.strerror or exc}.\n")
        return EXIT_USAGE
    return code


def _main(argv: Sequence[str] | None, stdout: TextIO, stderr: TextIO) -> int:
    try:
        return _run(argv, stdout, stderr)
    except UserError as exc:
        stderr.write(f"{exc.field}: {exc.message}\n")
        return EXIT_USAGE
    except SystemExit as exc:  # argparse: --help, --version, usage errors
        code = exc.code
        return code if isinstance(code, int) else (EXIT_OK if code is None else EXIT_USAGE)
    except BrokenPipeError:  # e.g. piped into `head`
        _silence_stdout(stdout)
        return EXIT_FAILURE
    except KeyboardInterrupt:
        stderr.write("interrupted\n")
        return 130
    except Exception as exc:  # a fault of this program, not of the input: one line, status 1
        if os.environ.get("DRIFTDOSE_DEBUG"):
            raise
        what = " ".join(str(exc).split())[:200]
        stderr.write(
            f"internal error: {type(exc).__name__}{': ' + what if what else ''} (a fault in "
            "driftdose, not in your input; set DRIFTDOSE_DEBUG=1 for the details)\n"
        )
        return EXIT_FAILURE


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
