"""The reply as JSON text, with arrays that recur from reply to reply written once.

Writing a float as JSON text (its shortest repr) is most of what encoding a reply costs in
the page's engine, and several arrays recur unchanged from one reply to the next: the
diameters of the deposition curves and of the overlay, or the overlay itself when only the
particle density changed. :func:`kept_array` returns such an array as a :class:`KeptArray`,
a plain list (every reader sees a list) that carries its JSON text, written when its values
were first seen and kept for the last :data:`KEPT_ARRAYS` arrays. :func:`encode_reply` writes
a reply with ``json.dumps`` and puts the kept texts in place of those arrays: the same text,
byte for byte, as ``json.dumps`` of the reply itself (``tests/api/test_reply_encoding.py``).
"""

from __future__ import annotations

import json
import math
import secrets
from collections import OrderedDict
from collections.abc import Sequence
from typing import Any

__all__ = ["KEPT_ARRAYS", "KeptArray", "encode_reply", "kept_array"]

KEPT_ARRAYS = 32
"""Arrays whose JSON text :func:`kept_array` keeps (least recently used dropped first)."""


class KeptArray(list):
    """A list of numbers with the JSON text of its values when it was made.

    Attributes
    ----------
    values : tuple of float
        The values the text was written from (the list is checked against them before its
        text is used, so a list changed after it was made is written afresh).
    text : str
        ``json.dumps`` of those values (``allow_nan=False``, ``ensure_ascii=False``).
    """

    __slots__ = ("text", "values")


_kept: OrderedDict[tuple[float, tuple[float, ...]], KeptArray] = OrderedDict()


def kept_array(values: Sequence[float], scale: float = 1.0) -> list[float]:
    """``values`` times ``scale`` as a list whose JSON text is kept for the next replies.

    Parameters
    ----------
    values : sequence of float
        The numbers, e.g. sizes in metres [any unit].
    scale : float
        Factor to the unit the reply sends them in, e.g. 1e6 for metres to micrometres [-].

    Returns
    -------
    list of float
        A fresh :class:`KeptArray` (a list: the caller may change it, and its text is then
        not used); the same numbers as ``[v * scale for v in values]`` (``list(values)``
        when ``scale`` is 1).

    Notes
    -----
    Arrays are kept by their values (and ``scale``): equal values give the kept text.
    Floats compare equal to their negative zero, so an array holding -0.0 is not kept (a
    plain list is returned): a kept 0.0 must not stand for it. An array that cannot be
    written (NaN or infinity) gets no text and is written, and refused, with the rest of the
    reply.
    """
    key = (scale, tuple(values))
    if 0.0 in key[1] and any(math.copysign(1.0, v) < 0.0 for v in key[1] if v == 0.0):
        return [v * scale for v in key[1]]  # not kept: -0.0 and 0.0 are equal keys
    found = _kept.get(key)
    if found is None:
        found = KeptArray(key[1] if scale == 1.0 else [v * scale for v in key[1]])
        found.values = tuple(found)
        try:
            found.text = json.dumps(found, allow_nan=False, ensure_ascii=False)
        except ValueError:
            found.text = ""
        _kept[key] = found
        while len(_kept) > KEPT_ARRAYS:
            _kept.popitem(last=False)
    else:
        _kept.move_to_end(key)
    out = KeptArray(found.values)
    out.values, out.text = found.values, found.text
    return out


_MARK = "\ufdd0" + secrets.token_hex(8) + ":"  # a noncharacter, then a random tag
_QUOTED_MARK = '"' + _MARK


def encode_reply(reply: dict[str, Any]) -> str:
    """``json.dumps(reply, allow_nan=False, ensure_ascii=False)``, kept texts put in place.

    Parameters
    ----------
    reply : dict
        A reply of :func:`driftdose.api.handle`; its ``curves`` (and the dictionaries within,
        not lists) are searched for :class:`KeptArray` values whose values are unchanged.

    Returns
    -------
    str
        The reply as JSON text, the same bytes as ``json.dumps`` with those options.

    Raises
    ------
    ValueError
        As ``json.dumps`` (NaN or infinity in the reply).

    Notes
    -----
    Each kept array is replaced by a mark (a string no reply writes: a Unicode noncharacter
    and a random tag with the array's index) while the reply is written, and the mark's text
    by the array's. Unless every mark is found exactly once (a string of the reply that
    imitates one would add another), the reply is written again without marks.
    """
    swaps: list[tuple[dict[str, Any], str, KeptArray]] = []
    curves = reply.get("curves")
    if isinstance(curves, dict):
        _mark_kept(curves, swaps, 3)
    if not swaps:
        return json.dumps(reply, allow_nan=False, ensure_ascii=False)
    try:
        text = json.dumps(reply, allow_nan=False, ensure_ascii=False)
    finally:
        for holder, key, array in swaps:
            holder[key] = array
    parts = text.split(_QUOTED_MARK)
    if len(parts) == len(swaps) + 1:
        seen = set()
        for i in range(1, len(parts)):
            part = parts[i]
            end = part.find('"')
            index = part[:end]
            if end < 1 or not index.isdigit() or index in seen or int(index) >= len(swaps):
                break
            seen.add(index)
            parts[i] = swaps[int(index)][2].text + part[end + 1 :]
        else:
            return "".join(parts)
    return json.dumps(reply, allow_nan=False, ensure_ascii=False)


def _mark_kept(
    obj: dict[str, Any], swaps: list[tuple[dict[str, Any], str, KeptArray]], depth: int
) -> None:
    """Replace the unchanged kept arrays of ``obj`` (and its dictionaries) by marks."""
    found = []
    for key, value in obj.items():
        if isinstance(value, KeptArray):
            if value.text and len(value) == len(value.values) and tuple(value) == value.values:
                found.append((key, value))
        elif isinstance(value, dict) and depth > 0:
            _mark_kept(value, swaps, depth - 1)
    for key, value in found:
        obj[key] = f"{_MARK}{len(swaps)}"
        swaps.append((obj, key, value))
