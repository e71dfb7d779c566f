"""Runs the page's JavaScript unit tests (``tests/js/*.test.mjs``) with Node's built-in runner."""

from __future__ import annotations

import shutil
import subprocess
from pathlib import Path

import pytest

HERE = Path(__file__).resolve().parent


@pytest.mark.skipif(shutil.which("node") is None, reason="Node.js is not installed")
def test_node_unit_tests() -> None:
    files = sorted(str(p) for p in HERE.glob("*.test.mjs"))
    assert files, "no JavaScript test files found"
    done = subprocess.run(
        ["node", "--test", *files], capture_output=True, text=True, timeout=300, cwd=HERE
    )
    assert done.returncode == 0, done.stdout[-4000:] + done.stderr[-2000:]
