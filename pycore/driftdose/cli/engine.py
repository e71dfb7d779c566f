"""Asking the api, as the page's worker does, and reporting its refusals."""

from __future__ import annotations

import json
from collections.abc import Sequence
from typing import Any, TextIO

from .. import api


def call_api(kind: str, inputs: dict[str, Any]) -> dict[str, Any]:
    """Ask the api exactly as the page's worker does: JSON text in, JSON text out."""
    return json.loads(api.handle_json(json.dumps({"kind": kind, "inputs": inputs})))


def print_errors(errors: Sequence[dict[str, Any]], stderr: TextIO, prefix: str = "") -> None:
    for e in errors:
        stderr.write(f"{prefix}{e.get('field') or 'error'}: {e.get('message', '')}\n")


def warn_unknown(kind: str, fields: list[dict[str, Any]], inputs: Any, stderr: TextIO) -> None:
    if not isinstance(inputs, dict):
        return
    known = {fd["name"] for fd in fields}
    for name in inputs:
        if name not in known:
            stderr.write(f"note: {kind} has no input {name!r}; it is ignored.\n")
