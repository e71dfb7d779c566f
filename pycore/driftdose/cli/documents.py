"""Reading what the user gives: files (through :mod:`driftdose.textfile`, as the page reads a
picked file), JSON texts and saved inputs or requests, with their size and nesting bounded.
"""

from __future__ import annotations

import json
import os
import stat
import sys
from pathlib import Path
from typing import Any

from .. import textfile
from .status import UserError

MAX_FILE_BYTES = 64 * 1024 * 1024  # a guard against reading huge files; the api sets the limits
MAX_JSON_DEPTH = 64  # nesting of a JSON input; saved inputs are about 5 levels deep
READ_PATHS: list[str] = []  # files read in this run: no output may overwrite one of them


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
        READ_PATHS.append(path)
    if len(data) > MAX_FILE_BYTES:
        raise UserError(field, f"{path!r} is larger than {MAX_FILE_BYTES // 2**20} MB.")
    return data


def accepted_suffixes(accept: object) -> tuple[str, ...]:
    """The lower-case name endings a field's ``accept`` list offers (``".csv,.txt"``), as the
    page's file control filters a folder; empty when it names none."""
    return tuple(s.strip().lower() for s in str(accept).split(",") if s.strip())


def read_text_file(path: str, field: str, limit: int | None = None) -> str:
    """Read a file's text as the page reads a file you pick, with the core's decoder.

    UTF-8, UTF-8 or UTF-16 with a byte-order mark, or Latin-1 (see :mod:`driftdose.textfile`),
    so the api sees the very text the page would send; a file over ``limit`` bytes (the
    field's ``max_bytes``) is refused, as the page refuses it, before it is read.
    """
    return read_decoded(path, field, limit).text


def file_record(path: str, decoded: textfile.DecodedText) -> dict[str, Any]:
    """``{name, sha256, bytes}`` of a file read, as the page records a picked file (the name
    without its folder, the SHA-256 of its bytes)."""
    name = "standard input" if path == "-" else os.path.basename(path)
    return {"name": name[:200], "sha256": decoded.sha256, "bytes": decoded.size}


def read_decoded(path: str, field: str, limit: int | None = None) -> textfile.DecodedText:
    """:func:`read_text_file` with what the decoder found (size, SHA-256, notes)."""
    if limit is not None and path != "-":
        try:
            size = Path(path).stat().st_size
        except OSError:
            size = 0  # reading it reports the problem
        if size > limit:
            raise UserError(field, textfile.too_large(size, limit, path))
    data = _read_bytes(path, field)
    try:
        return textfile.decode_text(data, MAX_FILE_BYTES if limit is None else limit)
    except textfile.TextFileError as exc:
        name = "standard input" if path == "-" else repr(path)
        raise UserError(field, f"{name}: {exc.message}") from None


def json_depth_over(value: Any, limit: int) -> bool:
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
        deep = json_depth_over(value, MAX_JSON_DEPTH)
    if deep:
        raise too_deep(field, what)
    return value


def too_deep(field: str, what: str) -> UserError:
    return UserError(
        field,
        f"{what}nested too deeply: JSON lists and objects inside each other more than "
        f"{MAX_JSON_DEPTH} levels deep are not read (saved inputs need about 5).",
    )


def parse_json_text(raw: str, field: str) -> Any:
    if raw.startswith("@"):
        path = raw[1:]
        source = read_text_file(path, field)
        return _json_value(source, field, f"{path!r} is ")
    return _json_value(raw, field, "")


def load_document(path: str) -> Any:
    text = read_text_file(path, "input")
    return _json_value(text, "input", f"{path!r} is ")


def document_kind(doc: Any) -> str | None:
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


def document_inputs(doc: Any, kind: str) -> dict[str, Any]:
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
