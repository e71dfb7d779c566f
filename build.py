#!/usr/bin/env python3
"""Build the static site into dist/ and optionally serve it on 127.0.0.1.

    python build.py            # writes dist/
    python build.py --serve    # writes dist/, then serves it at http://127.0.0.1:8000/
    python build.py --single-file [PATH]   # also the single-file edition (dist/drift-and-dose.html)

The output holds the page and its scripts (site/), the vendored Pyodide core, chart library and
QR-code library (from site/node_modules, installed from site/package-lock.json), the driftdose
wheel built from pyproject.toml with the standard ``build`` tool, the form descriptions from
``driftdose.api``, and a precache list with content hashes for the service worker. The build is
deterministic: the same sources give the same bytes.

The work is done by build-time modules in ``site/engine-build/`` (never copied into dist/):
``edition_served.py`` (the served edition and the local server), ``edition_single.py`` (the
single-file edition), ``engine_prepare.py`` (bytecode and memory snapshot, run in the vendored
engine under Node) and ``build_layout.py`` (paths, the build's error).
"""

from __future__ import annotations

import argparse
import subprocess
import sys
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent / "site" / "engine-build"))

import edition_single  # found through the path set above
import engine_prepare
from build_layout import (
    DIST,
    MIME,
    MODULES,
    PYODIDE_FILES,
    ROOT,
    SITE,
    STDLIB,
    BuildError,
)
from edition_served import Handler, build, build_wheel, describe_forms, serve
from edition_single import SINGLE_NAME
from engine_prepare import (
    ENGINE_ASSUMPTIONS,
    SNAPSHOT_MAGIC,
    SNAPSHOT_PAGE,
    engine_build_id,
    read_sparse,
    write_sparse,
)

__all__ = [
    "DIST",
    "ENGINE_ASSUMPTIONS",
    "MIME",
    "MODULES",
    "PYODIDE_FILES",
    "ROOT",
    "SINGLE_NAME",
    "SITE",
    "SNAPSHOT_MAGIC",
    "SNAPSHOT_PAGE",
    "STDLIB",
    "BuildError",
    "build",
    "build_single_file",
    "build_wheel",
    "describe_forms",
    "engine_build_id",
    "main",
    "read_sparse",
    "serve",
    "write_sparse",
]

_Handler = Handler  # the local server's request handler (the benchmark counts bytes with it)


def _check_engine() -> None:
    """Stop when the vendored Pyodide (in :data:`MODULES`) changed what the build relies on."""
    engine_prepare.check_engine(MODULES)


def build_single_file(target: Path | None = None, built: Path | None = None) -> dict:
    """Write the single-file edition (default dist/drift-and-dose.html); return its figures.

    ``built`` is a served edition written by :func:`build` (built into a temporary folder when
    None); see ``site/engine-build/edition_single.py``.
    """
    return edition_single.build_single_file(target, built, modules=MODULES)


def main(argv: list[str] | None = None) -> int:
    """Command line of the build."""
    parser = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    parser.add_argument("--out", type=Path, default=DIST, help="output folder (default dist/)")
    parser.add_argument("--serve", action="store_true", help="serve the output on 127.0.0.1")
    parser.add_argument("--port", type=int, default=8000, help="port for --serve (0: any)")
    parser.add_argument(
        "--single-file",
        nargs="?",
        const="",
        metavar="PATH",
        help=f"also write the single-file edition (default: <out>/{SINGLE_NAME})",
    )
    args = parser.parse_args(argv)
    try:
        info = build(args.out)
        if args.single_file is not None:
            single = Path(args.single_file) if args.single_file else args.out / SINGLE_NAME
            figures = build_single_file(single, args.out)
            print(f"wrote {single} ({figures['bytes'] / 1e6:.2f} MB, {figures['files']} files)")
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
