#!/usr/bin/env python3
"""Build the static site into dist/ and optionally serve it on 127.0.0.1.

    python build.py            # writes dist/
    python build.py --serve    # writes dist/, then serves it at http://127.0.0.1:8000/

The output holds the page and its scripts (site/), the vendored Pyodide core and chart library
(from site/node_modules, installed from site/package-lock.json), the driftdose wheel built from
pyproject.toml with the standard ``build`` tool, the form descriptions from ``driftdose.api``,
and a precache list with content hashes for the service worker. The build is deterministic:
the same sources give the same bytes.
"""

from __future__ import annotations

import argparse
import functools
import hashlib
import http.server
import json
import os
import shutil
import subprocess
import sys
import tempfile
import threading
from pathlib import Path
from typing import ClassVar

ROOT = Path(__file__).resolve().parent
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
VENDOR_FILES = {"chart.js/dist/chart.umd.min.js": "vendor/chart.umd.min.js"}
SITE_SKIP = {"node_modules", "package.json", "package-lock.json"}
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


def _check_node_modules() -> dict[str, str]:
    lock = json.loads((SITE / "package-lock.json").read_text())
    versions = {}
    for name in ("pyodide", "chart.js"):
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


def _sha256(path: Path) -> str:
    return hashlib.sha256(path.read_bytes()).hexdigest()


def build(dist: Path = DIST) -> dict:
    """Write the served edition into ``dist``; return the build info."""
    versions = _check_node_modules()
    if dist.exists():
        shutil.rmtree(dist)
    shutil.copytree(SITE, dist, ignore=lambda d, names: [n for n in names if n in SITE_SKIP])
    for name in PYODIDE_FILES:
        src = MODULES / "pyodide" / name
        if not src.exists():
            raise BuildError(f"Pyodide file {name} not found; did the npm package change?")
        (dist / "pyodide").mkdir(exist_ok=True)
        shutil.copyfile(src, dist / "pyodide" / name)
    for src, dst in VENDOR_FILES.items():
        (dist / dst).parent.mkdir(parents=True, exist_ok=True)
        shutil.copyfile(MODULES / src, dist / dst)
    wheel = build_wheel(dist / "wheels")
    forms = describe_forms()
    (dist / "forms.json").write_text(json.dumps(forms, ensure_ascii=False, indent=1) + "\n")
    files = sorted(p for p in dist.rglob("*") if p.is_file())
    precache = [{"url": p.relative_to(dist).as_posix(), "sha256": _sha256(p)} for p in files]
    digest = hashlib.sha256(json.dumps(precache).encode()).hexdigest()[:16]
    info = {
        "version": forms["version"],
        "pyodide": versions["pyodide"],
        "chartjs": versions["chart.js"],
        "wheel": f"wheels/{wheel.name}",
        "build": digest,
    }
    (dist / "build-info.json").write_text(json.dumps(info, indent=1) + "\n")
    precache.append({"url": "build-info.json", "sha256": _sha256(dist / "build-info.json")})
    (dist / "precache.json").write_text(
        json.dumps({"build": digest, "files": precache}, indent=1) + "\n"
    )
    return info


class _Handler(http.server.SimpleHTTPRequestHandler):
    extensions_map: ClassVar[dict[str, str]] = {
        **http.server.SimpleHTTPRequestHandler.extensions_map,
        **MIME,
    }

    def end_headers(self) -> None:
        self.send_header("Cache-Control", "no-cache")
        super().end_headers()

    def log_message(self, format: str, *args: object) -> None:
        if os.environ.get("DRIFTDOSE_SERVER_LOG"):
            super().log_message(format, *args)


def serve(
    directory: Path = DIST, port: int = 8000
) -> tuple[http.server.ThreadingHTTPServer, threading.Thread]:
    """Serve ``directory`` on 127.0.0.1:``port`` (0 picks a free port) in a daemon thread."""
    handler = functools.partial(_Handler, directory=str(directory))
    server = http.server.ThreadingHTTPServer(("127.0.0.1", port), handler)
    thread = threading.Thread(target=server.serve_forever, daemon=True)
    thread.start()
    return server, thread


def main(argv: list[str] | None = None) -> int:
    """Command line of the build."""
    parser = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    parser.add_argument("--out", type=Path, default=DIST, help="output folder (default dist/)")
    parser.add_argument("--serve", action="store_true", help="serve the output on 127.0.0.1")
    parser.add_argument("--port", type=int, default=8000, help="port for --serve (0: any)")
    args = parser.parse_args(argv)
    try:
        info = build(args.out)
    except (BuildError, subprocess.CalledProcessError) as exc:
        print(f"build failed: {exc}", file=sys.stderr)
        return 1
    print(
        f"built {args.out} (driftdose {info['version']}, Pyodide {info['pyodide']}, "
        f"build {info['build']})"
    )
    if args.serve:
        server, thread = serve(args.out, args.port)
        host, port = server.server_address[:2]
        print(f"serving at http://{host}:{port}/  (Ctrl+C to stop)", flush=True)
        try:
            thread.join()
        except KeyboardInterrupt:
            server.shutdown()
    return 0


if __name__ == "__main__":
    sys.exit(main())
