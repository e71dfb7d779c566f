"""A shift's periods from a table file (a task log kept in a spreadsheet), for the page's file
control beside the periods table and for the command line's ``--periods @periods.csv``.

The file becomes the ``periods`` records the shift calculation takes (reading:
:mod:`driftdose.shift.periodfile`); the page puts them in its periods table, where they can be
edited and dragged like typed ones, and the command line sends them as if given in JSON. A file
that cannot be used changes nothing: the reply names the line and column at fault.
"""

from __future__ import annotations

from typing import Any

from ..shift.periodfile import PeriodFileError, read_period_file
from ..tables import describe_table

__all__ = ["PERIOD_FILE", "PERIOD_FILE_BYTES", "describe_period_file"]

PERIOD_FILE_BYTES = 256 * 1024
"""Largest periods file read: 200 periods with long labels fit many times over. [bytes]"""

PERIOD_FILE: dict[str, Any] = {
    "describe": "periods",
    "accept": ".csv,.txt,.tsv",
    "max_bytes": PERIOD_FILE_BYTES,
}
"""How the ``periods`` field says it can be read from a file (its description's
``table_file``): the describer to ask, the file types and the largest size."""


def describe_period_file(text: Any, header_line: Any = 0) -> dict[str, Any]:
    """The periods of a decoded task-log file, as the page and the command line take them.

    Parameters
    ----------
    text : str
        The decoded file (:func:`driftdose.textfile.decode_text`).
    header_line : int
        The line of the column names: 0 to find it, -1 for a file without one. [-]

    Returns
    -------
    dict
        ``{"ok": true, "records": [{label, kind, start, end, activity, route,
        protection_factor}, ...], "lines": [file line of each], "columns": {part: header},
        "table": <tables.describe_table reply>}`` (parts the file leaves out are absent from
        a record: the calculation's defaults apply), or ``{"ok": false, "field": "periods",
        "message": "Line N: ...", "line": N or null, "part": ...}``.

    Examples
    --------
    >>> r = describe_period_file("Label,Start,End\\nGrinding,06:30,09:00\\n")
    >>> r["records"], r["lines"]
    ([{'label': 'Grinding', 'start': '06:30', 'end': '09:00'}], [2])

    """
    if not isinstance(text, str):
        return _refused("The periods file must be given as text.")
    if len(text.encode("utf-8", "surrogatepass")) > PERIOD_FILE_BYTES:
        return _refused(
            f"The periods file is larger than {PERIOD_FILE_BYTES // 1024} KB; a task log of "
            "200 periods is far smaller. Is it the logged data file?"
        )
    try:
        line = int(header_line or 0)
    except (TypeError, ValueError):
        line = 0
    try:
        rows = read_period_file(text, max(line, -1))
    except PeriodFileError as exc:
        return _refused(str(exc), exc.line, exc.part)
    return {
        "ok": True,
        "records": [dict(r) for r in rows.records],
        "lines": list(rows.lines),
        "columns": rows.columns,
        "table": describe_table(rows.table),
    }


def _refused(message: str, line: int | None = None, part: str = "file") -> dict[str, Any]:
    return {"ok": False, "field": "periods", "message": message, "line": line, "part": part}
