"""Command line over :mod:`driftdose.api`: ``python -m driftdose`` (or ``driftdose``).

Every calculation in the registry gets a subcommand whose flags are generated from its field
descriptions (:func:`driftdose.api.describe`), so a new calculation needs no change here::

    python -m driftdose motion --particle-diameter 2.5um --diameter-type aerodynamic
    python -m driftdose motion --input saved.json --format csv --curves curves.csv
    python -m driftdose describe
    python -m driftdose run saved.json
    python -m driftdose batch <calculation> --spectra a.csv b.csv --out table.csv

Requests go through :func:`driftdose.api.handle_json`, the very path the page's worker uses, so
every number printed here equals the page's (see :mod:`.numbers`).

Exit status: 0 on success, 2 for invalid input (each problem printed as ``field: message`` on
standard error), 1 for an unexpected failure.

One module per job: :mod:`.flags` (flags from the field descriptions and the inputs they
make), :mod:`.documents` (files, JSON texts, saved inputs), :mod:`.numbers` (the one number
formatter), :mod:`.render` (tables for the terminal), :mod:`.outputs` (writing), :mod:`.batch`
(one run per file), :mod:`.parser` and :mod:`.commands` (the subcommands). Standard library
only (argparse, csv, json, decimal), so the package also imports under Pyodide.
"""

from __future__ import annotations

from .commands import main
from .numbers import format_number, plain_number, to_precision
from .status import UserError

__all__ = ["UserError", "format_number", "main", "plain_number", "to_precision"]
