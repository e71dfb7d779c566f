"""Shared test set-up: make the source tree's package importable without installation."""

from __future__ import annotations

import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
if str(ROOT / "pycore") not in sys.path:
    sys.path.insert(0, str(ROOT / "pycore"))
