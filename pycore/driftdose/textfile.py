"""Decoding of text files as instruments and spreadsheets write them: the one decoder that the
page (through its calculation worker) and the command line both use, so a file reads the same
whichever front end opened it.

Interface: :func:`decode_text` turns a file's bytes into a :class:`DecodedText` (the text, the
encoding found, the file's size in bytes, the SHA-256 of the bytes for the record and notes
for the user) or raises
:class:`TextFileError` with a plain message; :func:`decode_text_json` is the same for the
worker (bytes in, JSON text out); :func:`size_text` writes a size as the messages do.

Order of the checks (common practice for text exchanged between office programs):

1. a UTF-8 byte-order mark: UTF-8 (the mark dropped; bytes that are not UTF-8 are replaced by
   U+FFFD and counted);
2. a UTF-16 byte-order mark (``FF FE`` little-endian, ``FE FF`` big-endian): UTF-16;
3. NUL bytes without a mark: refused (UTF-16 without a mark, or a binary file);
4. valid UTF-8: UTF-8;
5. anything else: Latin-1 as browsers read it (the WHATWG "windows-1252" table: ISO 8859-1
   with the printable characters of Windows-1252 at 0x80-0x9F), so ``Größe`` written by an
   older spreadsheet reads as ``Größe``.
"""

from __future__ import annotations

import codecs
import hashlib
import json
from dataclasses import dataclass, field
from typing import Any

__all__ = [
    "MAX_BYTES",
    "DecodedText",
    "LineError",
    "TextFileError",
    "decode_text",
    "decode_text_json",
    "decode_text_reply",
    "size_text",
    "too_large",
]

MAX_BYTES = 5 * 1024 * 1024
"""Largest file read, 5 MB (MB here and in every message: 1 048 576 bytes)."""

LATIN1 = "windows-1252"
"""The name reported for the Latin-1 fallback (the WHATWG label browsers use for it)."""

# Windows-1252 leaves five bytes undefined; WHATWG maps them to the C1 controls of ISO 8859-1.
_LATIN1_TABLE = "".join(bytes([b]).decode("cp1252", errors="ignore") or chr(b) for b in range(256))


class LineError(ValueError):
    """A problem at a place in a file: the base of the readers' errors.

    Attributes
    ----------
    message : str
        What is wrong, in plain words (without the line number).
    line : int or None
        The file's 1-based line where the problem lies, if any; the exception's own text
        starts with "Line N:" then.
    part : str
        Which input is wrong (``"file"``, ``"header_line"``, a column or a period part).

    """

    def __init__(self, message: str, line: int | None = None, part: str = "file") -> None:
        super().__init__(message if line is None else f"Line {line}: {message}")
        self.message = message
        self.line = line
        self.part = part


class TextFileError(ValueError):
    """A file that cannot be read as text; ``message`` says why in plain words."""

    def __init__(self, message: str) -> None:
        super().__init__(message)
        self.message = message


@dataclass(frozen=True)
class DecodedText:
    """A file's text and how it was read.

    Attributes
    ----------
    text : str
        The decoded text, without a byte-order mark.
    encoding : str
        ``utf-8``, ``utf-16-le``, ``utf-16-be`` or ``windows-1252`` (the Latin-1 fallback).
    bom : bool
        Whether a byte-order mark was found (and dropped).
    size : int
        The file's size in bytes. [B]
    replaced : int
        Characters that could not be decoded and were replaced by U+FFFD.
    notes : list of str
        What the user should know about the reading (an empty list for plain UTF-8).
    sha256 : str
        SHA-256 of the file's bytes as read (hex, 64 digits; FIPS 180-4), for the record.

    """

    text: str
    encoding: str
    bom: bool
    size: int
    replaced: int = 0
    notes: list[str] = field(default_factory=list)
    sha256: str = ""


def size_text(size: int) -> str:
    """Return a size in bytes as the messages write it (``"4.87 MB"``, ``"812 kB"``).

    Parameters
    ----------
    size : int
        The size [bytes].

    Examples
    --------
    >>> size_text(5_106_000), size_text(812 * 1024), size_text(17)
    ('4.87 MB', '812 kB', '17 bytes')

    """
    if size >= 1024 * 1024:
        return f"{size / 1048576:.3g} MB"
    if size >= 1024:
        return f"{size / 1024:.3g} kB"
    return f"{size} byte{'' if size == 1 else 's'}"


def too_large(size: int, limit: int = MAX_BYTES, name: str = "The file") -> str:
    """The refusal for a file of ``size`` bytes over ``limit`` (the page's words too).

    Parameters
    ----------
    size : int
        The file's size [bytes].
    limit : int
        The largest size taken [bytes].
    name : str
        How the message names the file.
    """
    return f"{name} is {size_text(size)}; the limit is {size_text(limit)}."


def nul_message(even: int, odd: int) -> str:
    """Explain NUL characters: UTF-16 text without a byte-order mark, or a binary file.

    Parameters
    ----------
    even, odd : int
        How many NUL bytes at even and at odd places of the file's start [-].
    """
    if max(even, odd) > 10 * (min(even, odd) + 1):  # one byte in two is NUL: UTF-16
        return (
            "The file looks like UTF-16 text without a byte-order mark; save it as UTF-8 "
            "(or plain text) CSV."
        )
    return "The file looks binary (it contains NUL characters); export it as plain text CSV."


def _replaced(data: bytes, encoding: str) -> tuple[str, int]:
    """Decode with U+FFFD for what cannot be decoded; return (text, count replaced)."""
    try:
        return data.decode(encoding), 0
    except UnicodeDecodeError:
        pass
    text = data.decode(encoding, errors="replace")
    return text, text.count("\ufffd") - data.decode(encoding, errors="ignore").count("\ufffd")


def decode_text(data: bytes | bytearray | memoryview, limit: int = MAX_BYTES) -> DecodedText:
    """Decode a text file's bytes (see the module notes for the order of the checks).

    Parameters
    ----------
    data : bytes-like
        The file's content.
    limit : int
        Largest size accepted. [B]

    Raises
    ------
    TextFileError
        For an empty file, a file over ``limit``, or NUL bytes without a UTF-16 mark.

    Examples
    --------
    >>> d = decode_text("Größe;n\\n".encode("cp1252"))
    >>> d.text, d.encoding, d.size
    ('Größe;n\\n', 'windows-1252', 8)
    >>> decode_text(codecs.BOM_UTF16_BE + "µm".encode("utf-16-be")).text
    'µm'

    """
    raw = bytes(data)
    size = len(raw)
    if size > limit:
        raise TextFileError(too_large(size, limit))
    if size == 0:
        raise TextFileError("The file is empty.")
    notes: list[str] = []
    if raw.startswith(codecs.BOM_UTF8):
        text, replaced = _replaced(raw[3:], "utf-8")
        encoding, bom = "utf-8", True
        notes.append("A UTF-8 byte-order mark at the start was ignored.")
    elif raw.startswith((codecs.BOM_UTF16_LE, codecs.BOM_UTF16_BE)):
        little = raw.startswith(codecs.BOM_UTF16_LE)
        encoding = "utf-16-le" if little else "utf-16-be"
        text, replaced = _replaced(raw[2:], encoding)
        bom = True
        notes.append(
            f"The file is UTF-16 text ({'little' if little else 'big'}-endian, marked by a "
            "byte-order mark); it was read as such."
        )
    elif b"\x00" in raw:
        raise TextFileError(nul_message(raw[:4096:2].count(0), raw[1:4096:2].count(0)))
    else:
        bom, replaced = False, 0
        try:
            text, encoding = raw.decode("utf-8"), "utf-8"
        except UnicodeDecodeError:
            text, encoding = raw.decode("latin-1").translate(_LATIN1_TABLE_MAP), LATIN1
            notes.append("The file is not UTF-8; it was read as Latin-1 (Windows-1252).")
    if replaced:
        notes.append(f"{replaced} character(s) that could not be read were replaced by �.")
    digest = hashlib.sha256(raw).hexdigest()
    return DecodedText(text, encoding, bom, size, replaced, notes, digest)


_LATIN1_TABLE_MAP = {i: ch for i, ch in enumerate(_LATIN1_TABLE) if ord(ch) != i}


def decode_text_json(
    data: Any, limit: int = MAX_BYTES, name: str | None = None, size: int | None = None
) -> str:
    """:func:`decode_text` for the page's worker: bytes in, JSON text out.

    ``data`` may be a JavaScript ``Uint8Array`` as Pyodide passes it (read with its
    ``to_bytes``), or None with the file's ``size`` and ``name`` for a file too large to read
    at all. The reply is ``{"ok": true, "text", "encoding", "bom", "size", "size_text",
    "replaced", "notes", "sha256"}`` or ``{"ok": false, "message", "size"}``; it never raises.

    Parameters
    ----------
    data : bytes, Uint8Array or None
        The file's content.
    limit : int
        Largest file read [bytes].
    name : str, optional
        The file's name, for messages.
    size : int, optional
        The file's size when ``data`` is None [bytes].
    """
    return json.dumps(decode_text_reply(data, limit, name, size), ensure_ascii=False)


def decode_text_reply(
    data: Any, limit: int = MAX_BYTES, name: str | None = None, size: int | None = None
) -> dict[str, Any]:
    """The reply of :func:`decode_text_json` as a dict.

    Parameters
    ----------
    data : bytes, Uint8Array or None
        The file's content.
    limit : int
        Largest file read [bytes].
    name : str, optional
        The file's name, for messages.
    size : int, optional
        The file's size when ``data`` is None [bytes].
    """
    if data is None:
        size = int(size or 0)
        return {"ok": False, "message": too_large(size, limit, name or "The file"), "size": size}
    if not isinstance(data, bytes | bytearray | memoryview):
        data = data.to_bytes()  # a JavaScript Uint8Array in the page's worker
    raw = bytes(data)
    if raw and len(raw) > limit and name:
        return {"ok": False, "message": too_large(len(raw), limit, name), "size": len(raw)}
    try:
        d = decode_text(raw, limit)
    except TextFileError as exc:
        return {"ok": False, "message": exc.message, "size": len(raw)}
    return {
        "ok": True,
        "text": d.text,
        "encoding": d.encoding,
        "bom": d.bom,
        "size": d.size,
        "size_text": size_text(d.size),
        "replaced": d.replaced,
        "notes": d.notes,
        "sha256": d.sha256,
    }
