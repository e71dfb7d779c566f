"""The JSON boundary shared by the browser worker and the command line.

``handle(request) -> reply`` takes ``{"kind": ..., "inputs": {...}}`` and returns either
``{"ok": True, "results": ..., "curves": ..., "warnings": [...], "sources": [...]}`` or
``{"ok": False, "errors": [{"field": ..., "message": ...}]}``. No exception crosses it.
``{"kind": "describe"}`` lists every calculation with its fields for building forms;
``{"kind": "export", "inputs": {...}}`` writes a shown reply as CSV with a header block
(:mod:`driftdose.api.exports`). ``"keep": true`` and ``"kept": {field: sha256}`` beside
``inputs`` let the page send a file's text once (:mod:`driftdose.api.kept`).
"""

from __future__ import annotations

import json
import math
import traceback
from typing import Any

from .. import __version__
from . import kept
from .encoding import encode_reply
from .exports import EXPORT_KIND, export_csv
from .fields import FieldError, parse_fields
from .registry import CALCULATIONS
from .units import unit_table

__all__ = ["describe", "handle", "handle_json"]


def describe() -> dict[str, Any]:
    """Describe every calculation (title, fields with labels, units, defaults) and every unit.

    ``units`` is the one table of unit labels and SI factors (:func:`units.unit_table`):
    replies carry unit codes, and the page labels them from this table.
    """
    return {
        "ok": True,
        "version": __version__,
        "units": unit_table(),
        "calculations": {
            name: {"title": calc.TITLE, "fields": [f.describe() for f in calc.FIELDS]}
            for name, calc in CALCULATIONS.items()
        },
    }


def handle(request: Any) -> dict[str, Any]:
    """Answer one request; never raises."""
    return _guarded(request, check=True)


def _guarded(request: Any, check: bool) -> dict[str, Any]:
    try:
        return _handle(request, check)
    except Exception as exc:  # the boundary: nothing escapes
        detail = traceback.format_exception_only(type(exc), exc)[-1].strip()
        return {
            "ok": False,
            "errors": [
                {"field": "", "message": f"Internal error, please report it: {detail[:200]}"}
            ],
        }


def _handle(request: Any, check: bool = True) -> dict[str, Any]:
    if not isinstance(request, dict):
        return _error("", "Request must be an object with 'kind' and 'inputs'.")
    kind = request.get("kind")
    if kind == "describe":
        return describe()
    if kind == EXPORT_KIND:
        return export_csv(request.get("inputs"), CALCULATIONS)
    calc = CALCULATIONS.get(kind) if isinstance(kind, str) else None
    if calc is None:
        return _error(
            "kind",
            f"Unknown calculation {_short(kind)}; valid: {', '.join(sorted(CALCULATIONS))}.",
        )
    inputs = request.get("inputs", {})
    if "kept" in request:  # file texts sent earlier, named by their SHA-256 (api.kept)
        inputs, missing, problem = kept.recall(calc.FIELDS, inputs, request["kept"])
        if problem:
            return _error("", problem)
        if missing:
            message = "The engine no longer holds this file; the page sends it again."
            errors = [{"field": name, "message": message} for name in missing]
            return {"ok": False, "errors": errors, "resend": missing}
    reply = _run(calc, inputs, check)
    if request.get("keep") is True:
        reply["kept"] = kept.remember(calc.FIELDS, request.get("inputs"))
    return reply


def _run(calc: Any, inputs: Any, check: bool) -> dict[str, Any]:
    values, errors = parse_fields(calc.FIELDS, inputs)
    if errors:
        return {"ok": False, "errors": errors}
    try:
        out = calc.run(values)
    except FieldError as exc:
        return _error(exc.field, exc.message)
    if out.get("ok") is False:  # a calculation that reports several field errors at once
        return {"ok": False, "errors": out["errors"]}
    reply = {"ok": True, "results": {}, "curves": {}, "warnings": [], "sources": []}
    reply.update(out)
    if check:
        _check_finite(reply)
    return reply


def _short(value: Any) -> str:
    """Quote a text for a message, cut to 40 characters; name the type of anything else."""
    if isinstance(value, str):
        return repr(value[:40])
    return "(missing)" if value is None else f"of type {type(value).__name__}"


def _error(field: str, message: str) -> dict[str, Any]:
    return {"ok": False, "errors": [{"field": field, "message": message}]}


def _check_finite(obj: Any, path: str = "") -> None:
    """Refuse to send NaN or infinity anywhere in a reply (None is allowed for gaps)."""
    if isinstance(obj, float) and not math.isfinite(obj):
        raise ValueError(f"non-finite number in reply at {path}")
    if isinstance(obj, dict):
        for k, v in obj.items():
            _check_finite(v, f"{path}.{k}")
    elif isinstance(obj, list):
        for i, v in enumerate(obj):
            _check_finite(v, f"{path}[{i}]")


def handle_json(text: str) -> str:
    """JSON string in, JSON string out: the form the browser worker uses."""
    try:
        request = json.loads(text)
    except (ValueError, TypeError, RecursionError):  # RecursionError: nesting too deep
        return json.dumps(_error("", "Request is not valid JSON."))
    try:
        # json.dumps refuses NaN and infinity itself: no separate walk over the reply first
        # arrays kept from earlier replies (api.encoding) are written from their kept text
        return encode_reply(_guarded(request, check=False))
    except (ValueError, TypeError, RecursionError):
        pass  # answer again as handle() does, whose check names where the number is
    try:
        return json.dumps(handle(request), allow_nan=False, ensure_ascii=False)
    except (ValueError, TypeError, RecursionError) as exc:  # never expected; never escapes
        return json.dumps(_error("", f"Internal error, please report it: {type(exc).__name__}"))
