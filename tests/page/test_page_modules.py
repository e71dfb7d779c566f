"""The page's own JavaScript modules, tested with Node's built-in runner (``node --test``).

The Node tests live in ``site/tests/`` (reading of links and inputs files, the depth and size
guard before posting to the engine, a generated corpus of hostile links and files). This test
runs them on the field descriptions of the package in this tree and fails when any fails.
"""

from __future__ import annotations

import json
import shutil
import subprocess
import sys
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[2]
NODE_TESTS = ROOT / "site" / "tests"


def test_page_modules_pass_their_node_tests(tmp_path: Path) -> None:
    node = shutil.which("node")
    if node is None:
        pytest.skip("node is not installed (bash .ci/setup needs it for the page's packages)")
    sys.path.insert(0, str(ROOT / "pycore"))
    try:
        from driftdose import api

        forms = api.describe()
    finally:
        sys.path.pop(0)
    forms_path = tmp_path / "forms.json"
    forms_path.write_text(json.dumps(forms), encoding="utf-8")
    files = sorted(str(p) for p in NODE_TESTS.glob("*.test.js"))
    assert files, "no Node tests found"
    done = subprocess.run(
        [node, "--test", *files],
        cwd=ROOT / "site",
        env={"PATH": "/usr/bin:/bin", "DRIFTDOSE_FORMS": str(forms_path)},
        capture_output=True,
        text=True,
        timeout=600,
        check=False,
    )
    failing = [line for line in done.stdout.splitlines() if line.startswith("not ok")]
    assert done.returncode == 0, (
        "\n".join(failing) + "\n" + done.stdout[-4000:] + done.stderr[-2000:]
    )
