"""Where the build reads and writes, and the error it stops with (see ``build.py``)."""

from __future__ import annotations

import hashlib
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]  # site/engine-build/ -> the repository
SITE = ROOT / "site"
MODULES = SITE / "node_modules"
DIST = ROOT / "dist"
SOURCE_DATE_EPOCH = "1767225600"  # 2026-01-01T00:00:00Z: fixed zip timestamps in the wheel
PYODIDE_FILES = (
    "pyodide.mjs",
    "pyodide.asm.mjs",
    "pyodide.asm.wasm",
    "python_stdlib.zip",
    "pyodide-lock.json",
)
STDLIB = "python_stdlib.zip"  # replaced in dist/ by its bytecode edition (see precompile())
TOOLS = SITE / "engine-build"  # build-time only: not copied into dist/ (SITE_SKIP)
ENGINE_RUNNER = TOOLS / "engine.mjs"  # runs the vendored Pyodide under Node at build time
MIME = {
    ".mjs": "text/javascript",
    ".js": "text/javascript",
    ".wasm": "application/wasm",
    ".whl": "application/zip",
    ".json": "application/json",
    ".webmanifest": "application/manifest+json",
    ".svg": "image/svg+xml",
}


class BuildError(RuntimeError):
    """A build assumption failed (missing package, unexpected Pyodide layout...)."""


def sha256_hex(path: Path) -> str:
    return hashlib.sha256(path.read_bytes()).hexdigest()
