"""File texts the engine keeps between requests, named by their SHA-256.

The page's worker sends a picked file's text (up to 5 MB) with a request once. A request
with ``"keep": true`` is answered with ``"kept": {field: sha256}`` for each file text it
carried (a field declared with ``max_bytes``); later requests may leave the text out and
name it instead: ``"kept": {field: sha256}`` beside ``inputs``. A name the engine does not
hold (a restarted worker, a text pushed out by newer ones) is answered with
``{"ok": false, "errors": [...], "resend": [field, ...]}``: the sender posts the text again.
The key is the SHA-256 of the text's UTF-8 bytes, so a key names one text only, whatever
the engine has seen before. A picked file can be kept as it is decoded
(:func:`decode_kept_json`): its first request then names it, and the text does not travel
back into the engine. The command line never uses this; links and saved inputs
files never carry keys.
"""

from __future__ import annotations

import hashlib
import json
import re
from collections import OrderedDict
from typing import Any

from ..textfile import MAX_BYTES, decode_text_reply
from .fields import Field

__all__ = ["KEPT_TEXTS", "decode_kept_json", "recall", "remember"]

KEPT_TEXTS = 4
"""Texts kept at most (the oldest is dropped first)."""

_HEX = re.compile(r"[0-9a-f]{64}")
_texts: OrderedDict[str, str] = OrderedDict()


def _file_fields(fields: tuple[Field, ...]) -> set[str]:
    return {f.name for f in fields if f.kind == "data" and "max_bytes" in f.extra}


def _key(text: str) -> str:
    return hashlib.sha256(text.encode("utf-8", "surrogatepass")).hexdigest()


def _keep(text: str, key: str | None = None) -> str:
    key = key or _key(text)
    _texts[key] = text
    _texts.move_to_end(key)
    while len(_texts) > KEPT_TEXTS:
        _texts.popitem(last=False)
    return key


def decode_kept_json(
    data: Any, limit: int = MAX_BYTES, name: str | None = None, size: int | None = None
) -> str:
    """Decode a picked file as :func:`driftdose.textfile.decode_text_json` does, and keep
    its text: the reply adds ``"kept"``, the key a request names it by.

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
    reply = decode_text_reply(data, limit, name, size)
    text = reply.get("text")
    if reply.get("ok") and isinstance(text, str) and text and len(text) <= MAX_BYTES:
        # UTF-8 read as it stands (no byte-order mark, nothing replaced): the text's UTF-8
        # bytes are the file's bytes, whose SHA-256 the decoder has just computed
        same = reply["encoding"] == "utf-8" and not reply["bom"] and not reply["replaced"]
        reply["kept"] = _keep(text, reply["sha256"] if same else None)
    return json.dumps(reply, ensure_ascii=False)


def recall(fields: tuple[Field, ...], inputs: Any, named: Any) -> tuple[Any, list[str], str | None]:
    """Put the texts a request names back into its inputs.

    Parameters
    ----------
    fields : tuple of Field
        The calculation's fields (only file-text fields can be named).
    inputs : dict
        The request's inputs (not changed; a copy is returned).
    named : dict
        ``{field: sha256}`` as the request sent it.

    Returns
    -------
    tuple
        The inputs with the texts, the fields whose text the engine does not hold, and a
        message when ``named`` is malformed (then nothing else is used).
    """
    if not isinstance(named, dict) or len(named) > 8:
        return inputs, [], "'kept' must name at most 8 file texts by their SHA-256."
    files = _file_fields(fields)
    out = dict(inputs) if isinstance(inputs, dict) else {}
    missing: list[str] = []
    for name, key in named.items():
        if name not in files or not isinstance(key, str) or not _HEX.fullmatch(key):
            shown = repr(name[:40]) if isinstance(name, str) else "a non-text name"
            return inputs, [], f"'kept' names {shown}, which is not a file text of this request."
        text = _texts.get(key)
        if text is None:
            missing.append(name)
            continue
        _texts.move_to_end(key)
        out[name] = text
    return out, missing, None


def remember(fields: tuple[Field, ...], inputs: Any) -> dict[str, str]:
    """Keep the file texts a request carried; their keys by field name.

    Parameters
    ----------
    fields : tuple of Field
        The calculation's fields.
    inputs : dict
        The request's inputs as sent (texts named by ``kept`` are not in them).

    Returns
    -------
    dict
        ``{field: sha256}`` for every non-empty file text carried.
    """
    if not isinstance(inputs, dict):
        return {}
    out = {}
    for name in sorted(_file_fields(fields)):
        text = inputs.get(name)
        if not isinstance(text, str) or not text or len(text) > MAX_BYTES:
            continue  # a text over the file limit is refused by its calculation
        out[name] = _keep(text)
    return out
