"""The served edition: ``dist/`` as a web server hands it out, and a local server for it.

The page and its scripts (``site/``), the vendored Pyodide core, chart library and QR-code
library, the driftdose wheel (with its bytecode), the engine's memory snapshot, the form
descriptions, the build info and the service worker's precache list with content hashes.
"""

from __future__ import annotations

import functools
import hashlib
import http.server
import json
import os
import re
import shutil
import subprocess
import sys
import tempfile
import threading
from pathlib import Path
from typing import ClassVar

from build_layout import (
    DIST,
    MIME,
    MODULES,
    PYODIDE_FILES,
    ROOT,
    SITE,
    SOURCE_DATE_EPOCH,
    STDLIB,
    BuildError,
    sha256_hex,
)
from engine_prepare import check_engine, engine_build_id, make_snapshot, precompile

VENDOR_FILES = {
    "chart.js/dist/chart.umd.min.js": "vendor/chart.umd.min.js",
    "qrcode-generator/dist/qrcode.js": "vendor/qrcode.js",
}
SITE_SKIP = {
    "node_modules",
    "package.json",
    "package-lock.json",
    ".installed-lock",
    "engine-build",
    "single",
}  # single: see below
CSP_META = re.compile(r'<meta http-equiv="Content-Security-Policy" content="[^"]*">')


def check_node_modules() -> dict[str, str]:
    lock = json.loads((SITE / "package-lock.json").read_text())
    versions = {}
    for name in ("pyodide", "chart.js", "qrcode-generator"):
        pkg = MODULES / name / "package.json"
        if not pkg.exists():
            raise BuildError(f"site/node_modules/{name} is missing: run `npm ci --prefix site`")
        have = json.loads(pkg.read_text())["version"]
        want = lock["packages"][f"node_modules/{name}"]["version"]
        if have != want:
            raise BuildError(
                f"{name} {have} installed but the lock file pins {want}: run `npm ci --prefix site`"
            )
        versions[name] = have
    if not versions["pyodide"].startswith("314."):
        raise BuildError(
            f"Pyodide {versions['pyodide']} is not a 314.x release; the page and "
            "the single-file edition are tested with 314.x only"
        )
    return versions


def build_wheel(out: Path) -> Path:
    """Build the driftdose wheel with ``python -m build`` into ``out``; return its path."""
    env = dict(os.environ, SOURCE_DATE_EPOCH=SOURCE_DATE_EPOCH, PYTHONHASHSEED="0")
    with tempfile.TemporaryDirectory() as tmp:
        # cwd=tmp: run from elsewhere so `-m build` cannot resolve to this very file
        done = subprocess.run(
            [
                sys.executable,
                "-m",
                "build",
                "--wheel",
                "--no-isolation",
                "--outdir",
                tmp,
                str(ROOT),
            ],
            env=env,
            cwd=tmp,
            capture_output=True,
            text=True,
        )
        if done.returncode:
            raise BuildError(f"wheel build failed:\n{done.stdout}\n{done.stderr}")
        wheels = list(Path(tmp).glob("driftdose-*.whl"))
        if len(wheels) != 1:
            raise BuildError(f"expected one wheel, got {wheels}")
        out.mkdir(parents=True, exist_ok=True)
        target = out / wheels[0].name
        shutil.copyfile(wheels[0], target)
    for leftover in (ROOT / "build", ROOT / "pycore" / "driftdose.egg-info"):
        shutil.rmtree(leftover, ignore_errors=True)
    return target


def describe_forms() -> dict:
    """Return ``driftdose.api.describe()`` from the source tree (the page's form data)."""
    sys.path.insert(0, str(ROOT / "pycore"))
    try:
        from driftdose import api

        return api.describe()
    finally:
        sys.path.pop(0)


def build(dist: Path = DIST, *, bytecode: bool = True, snapshot: bool = True) -> dict:
    """Write the served edition into ``dist``; return the build info.

    ``bytecode=False`` ships the standard library and the wheel as sources and ``snapshot=False``
    leaves the memory snapshot out: slower editions, kept for the benchmark's comparison.
    """
    versions = check_node_modules()
    check_engine()
    if dist.exists():
        shutil.rmtree(dist)
    shutil.copytree(SITE, dist, ignore=lambda d, names: [n for n in names if n in SITE_SKIP])
    for name in PYODIDE_FILES:
        src = MODULES / "pyodide" / name
        if not src.exists():
            raise BuildError(f"Pyodide file {name} not found; did the npm package change?")
        (dist / "pyodide").mkdir(exist_ok=True)
        if name != STDLIB or not bytecode:
            shutil.copyfile(src, dist / "pyodide" / name)
    for src, dst in VENDOR_FILES.items():
        (dist / dst).parent.mkdir(parents=True, exist_ok=True)
        shutil.copyfile(MODULES / src, dist / dst)
    with tempfile.TemporaryDirectory() as tmp:
        source_wheel = build_wheel(Path(tmp))
        wheel = dist / "wheels" / source_wheel.name
        wheel.parent.mkdir()
        if bytecode:
            stdlib = dist / "pyodide" / STDLIB
            precompile(MODULES / "pyodide" / STDLIB, source_wheel, stdlib, wheel)
        else:
            shutil.copyfile(source_wheel, wheel)
    # each build's wheel in a folder named by its content: a page of one build never loads the
    # engine of another (on a server that holds only the new build, the old page's wheel is
    # missing and the page says so); the page reads the wheel's path from its forms.json
    named = dist / "wheels" / sha256_hex(wheel)[:16] / wheel.name
    named.parent.mkdir()
    wheel = wheel.rename(named)
    engine = {"version": versions["pyodide"], "build_id": engine_build_id()}
    frozen = make_snapshot(stdlib, wheel, dist) if bytecode and snapshot else None
    forms = describe_forms()
    forms["wheel"] = wheel.relative_to(dist).as_posix()
    (dist / "forms.json").write_text(json.dumps(forms, ensure_ascii=False, indent=1) + "\n")
    files = sorted(p for p in dist.rglob("*") if p.is_file())
    precache = [{"url": p.relative_to(dist).as_posix(), "sha256": sha256_hex(p)} for p in files]
    digest = hashlib.sha256(json.dumps(precache).encode()).hexdigest()[:16]
    info = {
        "version": forms["version"],
        "pyodide": versions["pyodide"],
        "chartjs": versions["chart.js"],
        "wheel": forms["wheel"],
        "wheel_sha256": sha256_hex(wheel),
        "bytecode": bytecode,
        "engine": engine,
        "build": digest,
    }
    if frozen:
        info["snapshot"] = frozen
    (dist / "build-info.json").write_text(json.dumps(info, indent=1) + "\n")
    precache.append({"url": "build-info.json", "sha256": sha256_hex(dist / "build-info.json")})
    (dist / "precache.json").write_text(
        json.dumps({"build": digest, "files": precache}, indent=1) + "\n"
    )
    return info


def served_policy(directory: Path = SITE) -> str:
    """The Content-Security-Policy to send as a header with every file of the served edition.

    The page's own meta policy (``index.html``, one element) plus what a meta element cannot
    say: ``frame-ancestors 'none'`` (no other site may frame the page). Sent as a header, the
    policy also governs the calculation worker, which a meta element in the page does not.
    """
    metas = CSP_META.findall((directory / "index.html").read_text(encoding="utf-8"))
    if len(metas) != 1:
        raise BuildError("index.html must hold exactly one Content-Security-Policy meta element")
    policy = metas[0].split('content="', 1)[1].rsplit('"', 1)[0]
    return f"{policy}; frame-ancestors 'none'"


class Handler(http.server.SimpleHTTPRequestHandler):
    extensions_map: ClassVar[dict[str, str]] = {
        **http.server.SimpleHTTPRequestHandler.extensions_map,
        **MIME,
    }
    policy = ""  # set per server by serve()

    def end_headers(self) -> None:
        self.send_header("Cache-Control", "no-cache")
        if self.policy:
            self.send_header("Content-Security-Policy", self.policy)
        self.send_header("X-Content-Type-Options", "nosniff")
        super().end_headers()

    def log_message(self, format: str, *args: object) -> None:
        if os.environ.get("DRIFTDOSE_SERVER_LOG"):
            super().log_message(format, *args)


def serve(
    directory: Path = DIST, port: int = 8000
) -> tuple[http.server.ThreadingHTTPServer, threading.Thread]:
    """Serve ``directory`` on 127.0.0.1:``port`` (0 picks a free port) in a daemon thread."""
    handler_class = type("_PolicyHandler", (Handler,), {"policy": served_policy(directory)})
    handler = functools.partial(handler_class, directory=str(directory))
    server = http.server.ThreadingHTTPServer(("127.0.0.1", port), handler)
    thread = threading.Thread(target=server.serve_forever, daemon=True)
    thread.start()
    return server, thread
