"""What the page shows about a picked measured file before any calculation: the table found
(separator, decimal mark, header line, notes set aside, preview, gaps) and how the file's
headers fill the column pickers and unit choices. The worker calls
:func:`describe_file_json` when a file is loaded or its header line changes; the file field
names its describer in its description (``"describe": "spectrum"``).
"""

from __future__ import annotations

import json
from collections.abc import Callable
from typing import Any

from .period_file import describe_period_file
from .spectrum_fields import describe_spectrum_file

__all__ = ["DESCRIBERS", "describe_file_json"]

DESCRIBERS: dict[str, Callable[[Any, Any], dict[str, Any]]] = {
    "spectrum": describe_spectrum_file,
    "periods": describe_period_file,
}
"""Describer of each kind of measured file, by the name a file field gives."""


def describe_file_json(purpose: Any, text: Any, header_line: Any = 0) -> str:
    """Describe a decoded file for the page: JSON text in the shape of the describer's reply
    (see :func:`~driftdose.api.spectrum_fields.describe_spectrum_file`); never raises.

    Examples
    --------
    >>> import json
    >>> r = json.loads(describe_file_json("spectrum", "Dp [nm];dN [1/cm3]\\n10;1\\n20;2\\n"))
    >>> r["table"]["header_line"], r["pickers"]["csv_diameter_column"]["suggest"]
    (1, 'Dp [nm]')

    """
    describer = DESCRIBERS.get(purpose) if isinstance(purpose, str) else None
    if describer is None:
        return json.dumps({"ok": False, "field": None, "message": "Unknown kind of file."})
    try:
        reply = describer(text, header_line)
    except Exception as exc:
        reply = {"ok": False, "field": None, "message": f"internal error: {exc}"[:300]}
    return json.dumps(reply, ensure_ascii=False, allow_nan=False)
