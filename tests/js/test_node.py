"""The page's JavaScript modules, tested with Node's built-in runner (``node --test``).

The Node tests live beside this file (``*.test.mjs``): reading of links and inputs files with
the depth and size guard before posting to the engine and a generated corpus of hostile links
and files (``intake``), file decoding, SHA-256 and the inputs fingerprint, the sparse snapshot
reader. The field descriptions the link reader needs come from the package in this tree,
written to a file named by ``DRIFTDOSE_FORMS``. The test fails when any Node test fails.
"""

from __future__ import annotations

import json
import shutil
import subprocess
import sys
from pathlib import Path

import pytest

HERE = Path(__file__).resolve().parent
ROOT = HERE.parents[1]


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
    files = sorted(str(p) for p in HERE.glob("*.test.mjs"))
    assert len(files) >= 5, f"Node tests missing: {files}"
    done = subprocess.run(
        [node, "--test", *files],
        cwd=HERE,
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
