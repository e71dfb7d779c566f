"""Flags from field descriptions: one flag per field of :func:`driftdose.api.describe`, and
the inputs the flags given make.

Nothing here knows a field by its name: what a flag takes comes from the field's kind, units,
choices and the file it reads (``accept``/``max_bytes``); the choice that makes a calculation
use a file comes from that file field's ``applies_when``.
"""

from __future__ import annotations

import argparse
import json
import re
from dataclasses import dataclass
from typing import Any

from ..unit_labels import unit_text
from .documents import (
    MAX_JSON_DEPTH,
    accepted_suffixes,
    file_record,
    json_depth_over,
    parse_json_text,
    read_decoded,
    read_text_file,
    too_deep,
)
from .numbers import js_string
from .status import UserError

STRUCTURED_KINDS = ("data", "records")
"""Kinds given as JSON text, @FILE or KEY=VALUE pairs."""
QUANTITY_KINDS_EXCLUDED = ("choice", "integer", "text", "sizes", *STRUCTURED_KINDS)
_KEY_VALUE = re.compile(r"^([A-Za-z_][A-Za-z0-9_]*)=(.*)$", re.S)
_NUMBER_THEN_UNIT = re.compile(
    r"^\s*([-+\u2212]?(?:\d[\d,_]*(?:\.[\d_]*)?|\.\d+)(?:[eE][-+]?\d+)?)\s*(.*?)\s*$"
)


def is_quantity(fd: dict[str, Any]) -> bool:
    return fd.get("kind") not in QUANTITY_KINDS_EXCLUDED and "units" in fd


def is_file_field(fd: dict[str, Any]) -> bool:
    """A field whose value is the text of a file the user picks (a CSV spectrum, say).

    The field description marks it with ``accept`` (the file types the page's file picker
    offers) or ``max_bytes`` (the largest file taken).
    """
    return fd.get("kind") in ("text", "data") and ("accept" in fd or "max_bytes" in fd)


def source_choice(file_field: dict[str, Any]) -> tuple[str, str]:
    """The choice that makes a calculation use its file field, read from that field's
    ``applies_when`` (the choice under which the page shows it): ``(field, value)``, or
    ``("", "")`` for a file field that always applies.
    """
    rule = file_field.get("applies_when")
    if isinstance(rule, dict) and isinstance(rule.get("field"), str) and rule.get("values"):
        return rule["field"], rule["values"][0]
    return "", ""


def flag_name(name: str) -> str:
    return "--" + name.replace("_", "-")


def default_text(fd: dict[str, Any]) -> str:
    default = fd.get("default")
    if isinstance(default, dict):
        unit = unit_text(str(default.get("unit", "")))
        return f"{js_string(default.get('value'))} {unit}".strip()
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
    if is_quantity(fd):
        labels = [u["label"] for u in fd.get("units", [])]
        if len(labels) > 1:
            parts.append("units: " + ", ".join(labels))
    if fd.get("range"):
        parts.append(f"valid: {fd['range']}")
    if fd.get("kind") in STRUCTURED_KINDS and not is_file_field(fd):
        parts.append("JSON text, @FILE.json, or KEY=VALUE pairs (@FILE as a value reads a file)")
    elif is_file_field(fd):
        parts.append("a file name")
    elif fd.get("kind") == "text":
        parts.append("text or @FILE")
    parts.append(f"default: {default_text(fd)}")
    return ". ".join(parts).replace("%", "%%") + "."


@dataclass
class FlagMap:
    """Which field each generated flag sets (``dest`` -> field description)."""

    values: dict[str, dict[str, Any]]
    units: dict[str, dict[str, Any]]
    options: dict[str, str]  # option string -> field name (for argparse's messages)
    fields: list[dict[str, Any]]


def add_field_flags(parser: argparse.ArgumentParser, fields: list[dict[str, Any]]) -> FlagMap:
    """Add one flag per field (and a unit flag for a quantity offered in several units).

    A flag that would clash with one of the command's own options becomes ``--field-<name>``.
    """
    fmap = FlagMap({}, {}, {}, fields)
    group = parser.add_argument_group("inputs (a field left out takes the page's default)")
    taken = set(parser._option_string_actions)  # argparse keeps no public list

    def option(name: str) -> str:
        flag = flag_name(name)
        return flag if flag not in taken else flag_name("field_" + name)

    for fd in fields:
        name = fd["name"]
        flags = [option(name)]
        dest = f"field:{name}"
        kwargs: dict[str, Any] = {"dest": dest, "default": argparse.SUPPRESS}
        if fd.get("kind") == "choice":
            kwargs["choices"] = [c["value"] for c in fd.get("choices", [])]
            kwargs["metavar"] = "{" + ",".join(kwargs["choices"]) + "}"
        elif is_quantity(fd):
            kwargs["metavar"] = "VALUE[UNIT]" if len(fd.get("units", [])) > 1 else "VALUE"
        elif fd.get("kind") == "integer":
            kwargs["metavar"] = "N"
        elif fd.get("kind") == "sizes":  # a list of sizes, each with its unit (or nm)
            kwargs["metavar"] = "SIZES"
        elif is_file_field(fd):
            kwargs["metavar"] = "FILE"
            alias = file_alias(fd, fields)
            if alias and alias not in taken:
                flags.append(alias)
        elif fd.get("kind") in STRUCTURED_KINDS:
            kwargs["metavar"] = "DATA"
            kwargs["nargs"] = "+"
        else:
            kwargs["metavar"] = "TEXT|@FILE"
        # a page's own bookkeeping (``bookkeeping`` in the description) is accepted, unlisted
        shown = argparse.SUPPRESS if fd.get("bookkeeping") else _field_help(fd)
        group.add_argument(*flags, help=shown, **kwargs)
        taken.update(flags)
        fmap.values[dest] = fd
        fmap.options.update(dict.fromkeys(flags, name))
        for old in fd.get("formerly", []):  # a field's former name still works, unlisted
            former = flag_name(old)
            if former not in taken:
                group.add_argument(former, help=argparse.SUPPRESS, **kwargs)
                taken.add(former)
                fmap.options[former] = name
        if is_quantity(fd) and len(fd.get("units", [])) > 1:
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


def file_alias(fd: dict[str, Any], fields: list[dict[str, Any]]) -> str:
    """The short flag a calculation's first file field also answers to, or ``""``.

    It is the first word of the field's label (``--spectrum`` for "Spectrum CSV file"), unless
    a field of the calculation has that name.
    """
    files = [f for f in fields if is_file_field(f)]
    words = str(fd.get("label", "")).split()
    if not files or files[0] is not fd or not words:
        return ""
    word = words[0].lower()
    if not word.isidentifier() or any(f["name"] == word for f in fields):
        return ""
    return flag_name(word)


def split_quantity(text: str) -> tuple[str, str | None]:
    """Split ``"100nm"`` or ``"100 nm"`` into value text and unit (None when there is none)."""
    m = _NUMBER_THEN_UNIT.match(text)
    if not m:
        return text, None  # not a number: the api says so, with the valid range
    return m.group(1), (m.group(2) or None)


def flag_inputs(
    args: argparse.Namespace, fmap: FlagMap, base: dict[str, Any], origins: dict[str, str]
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
        if is_quantity(fd):
            value, unit = split_quantity(raw)
            flag_unit = given.get(f"unit:{name}")
            if unit and flag_unit and unit != flag_unit:
                raise UserError(
                    name, f"unit given twice: {unit!r} in the value and {flag_unit!r} by its flag."
                )
            unit = unit or flag_unit or _unit_of(base.get(name)) or fd["default"]["unit"]
            inputs[name] = {"value": value, "unit": unit}
        elif is_file_field(fd):
            path = raw.removeprefix("@")
            decoded = read_decoded(path, name, fd.get("max_bytes"))
            inputs[name] = decoded.text
            origins[name] = path
            record = fd.get("record_field")
            if isinstance(record, str) and f"field:{record}" not in given:
                inputs[record] = file_record(path, decoded)  # name and SHA-256, as the page
            choice, value = source_choice(fd)
            if choice and f"field:{choice}" not in given:
                inputs[choice] = value  # a file given means: use it (as choosing it on the page)
        elif fd.get("kind") in STRUCTURED_KINDS:
            inputs[name] = data_value(raw, name, origins, fd)
        elif fd.get("kind") == "text" and raw.startswith("@"):
            inputs[name] = read_text_file(raw[1:], name)
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


def data_value(
    args: list[str], name: str, origins: dict[str, str], fd: dict[str, Any] | None = None
) -> Any:
    """A data field's value: one JSON text or ``@file.json``, or ``KEY=VALUE`` pairs.

    Pairs make an object; a value ``@path`` is that file's text (a CSV file, say), any other
    value is read as JSON when it is JSON (numbers, lists) and kept as text otherwise. For a
    list of items (lognormal modes), pairs make the items instead: see :func:`_item_list`.
    """
    if len(args) == 1 and not _KEY_VALUE.match(args[0]):
        records = table_file_records(args[0], name, fd, origins)
        if records is not None:
            return records
        return parse_json_text(args[0], name)
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
            obj[key] = read_text_file(value[1:], name)
            origins[name] = f"{key} from {value[1:]}"
            continue
        try:
            obj[key] = json.loads(value)
        except ValueError:
            obj[key] = value
        except RecursionError:
            obj[key] = None
        if obj[key] is None or json_depth_over(obj[key], MAX_JSON_DEPTH):
            raise too_deep(name, f"{key}= is ")
    return obj


def table_file_records(
    arg: str, name: str, fd: dict[str, Any] | None, origins: dict[str, str]
) -> list[dict[str, Any]] | None:
    """The records of a list field read from a table file (``@periods.csv``), or None.

    A field whose description has ``table_file`` (``{describe, accept, max_bytes}``) takes a
    file of one of the ``accept`` types as the page's file control beside it does: the
    file's text goes to the describer the field names (the worker's door,
    :func:`driftdose.api.files.describe_file_json`), and its records are the value. Any other
    ``@FILE`` is JSON.
    """
    spec = fd.get("table_file") if fd is not None else None
    if not (isinstance(spec, dict) and arg.startswith("@")):
        return None
    path = arg[1:]
    suffixes = accepted_suffixes(spec.get("accept", ""))
    if not (suffixes and path.lower().endswith(suffixes)):
        return None
    from ..api.files import describe_file_json

    text = read_text_file(path, name, spec.get("max_bytes"))
    reply = json.loads(describe_file_json(spec.get("describe"), text, 0))
    if not reply.get("ok"):
        raise UserError(name, f"{path!r}: {reply.get('message', 'cannot be read.')}")
    origins[name] = path
    return reply["records"]


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
        if f is not None and len(f.get("units") or ()) > 1:
            number, unit = split_quantity(value)
            default = template.get(key)
            if unit is None:
                first = f["units"][0]
                unit = default.get("unit") if isinstance(default, dict) else first["unit"]
            current[key] = {"value": number, "unit": unit}
        elif f is not None:
            current[key] = value  # choices and plain numbers travel as text, as from the form
        else:  # not an item field: read as JSON when it is JSON (the api names the key)
            try:
                current[key] = json.loads(value)
            except ValueError:
                current[key] = value
            except RecursionError:
                raise too_deep(name, f"{key}= is ") from None
            if json_depth_over(current[key], MAX_JSON_DEPTH):
                raise too_deep(name, f"{key}= is ")
    items.append(current)
    return [{**template, **item} for item in items]


def _unit_of(raw: Any) -> str | None:
    return raw.get("unit") if isinstance(raw, dict) and isinstance(raw.get("unit"), str) else None
