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
"""

from __future__ import annotations

import argparse
import base64
import functools
import gzip
import hashlib
import http.server
import io
import json
import mimetypes
import os
import posixpath
import re
import shutil
import struct
import subprocess
import sys
import tempfile
import threading
import zipfile
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
STDLIB = "python_stdlib.zip"  # replaced in dist/ by its bytecode edition (see precompile())
TOOLS = SITE / "engine-build"  # build-time only: not copied into dist/ (SITE_SKIP)
ENGINE_RUNNER = TOOLS / "engine.mjs"  # runs the vendored Pyodide under Node at build time
SNAPSHOT_DIR = "snapshot"  # dist/snapshot/<stamp>.bin: the started engine's memory, sparse
SNAPSHOT_PAGE = 4096  # bytes per page of the sparse snapshot file (see write_sparse)
SNAPSHOT_MAGIC = 1886286592  # first 32-bit word of an engine snapshot (pyodide.asm.mjs)
SPARSE_MAGIC = b"DDSPARSE"
# what the build relies on in the vendored engine, checked before every build. The snapshot
# options are private to Pyodide (`_makeSnapshot`, `_loadSnapshot`, `makeMemorySnapshot`):
# snapshot layout, 32-bit words: [magic, data offset, JSON length, 0, 8 words of build id]
ENGINE_ASSUMPTIONS = {
    "pyodide.mjs": (
        '"python_stdlib.zip"',  # the standard library is fetched from indexURL under this name
        "/lib/python${i}${s}.zip",  # ...and mounted there (the code objects carry this path)
        "_loadSnapshot",  # option: restore this memory instead of starting Python
        "INITIAL_MEMORY=i.length",  # ...sized from the snapshot
        "restoreSnapshot(t)",
        'BUILD_ID:"',  # the engine's build id, which a snapshot must carry
        "thisProgram:e._sysExecutable",  # the build-time runner sets it as a browser does
    ),
    "pyodide.asm.mjs": (
        "_makeSnapshot",  # option needed to make a snapshot
        "static makeMemorySnapshot(",
        "Snapshot build id mismatch",  # the engine refuses a snapshot of another build
        f"$r={SNAPSHOT_MAGIC},Ze=48",  # magic number and header size
    ),
    "pyodide.d.ts": (
        "_makeSnapshot?: boolean;",
        "_loadSnapshot?: Uint8Array | ArrayBuffer | PromiseLike<Uint8Array | ArrayBuffer>;",
    ),
}
_BUILD_ID = re.compile(r'BUILD_ID:"([0-9a-f]{64})"')
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


def _check_engine() -> None:
    """Stop the build when the vendored Pyodide loader changed what the build relies on."""
    for name, needles in ENGINE_ASSUMPTIONS.items():
        text = (MODULES / "pyodide" / name).read_text(encoding="utf-8")
        for needle in needles:
            if needle not in text:
                raise BuildError(
                    f"pyodide/{name} no longer contains {needle!r}; the Pyodide release changed "
                    "something the bytecode or snapshot build relies on (see site/engine-build/)"
                )


def engine_build_id() -> str:
    """The vendored engine's build id (a snapshot restores only into the same build)."""
    found = _BUILD_ID.findall((MODULES / "pyodide" / "pyodide.mjs").read_text(encoding="utf-8"))
    if len(found) != 1:
        raise BuildError("pyodide.mjs: expected exactly one BUILD_ID; the loader changed")
    return found[0]


def run_engine(script: Path, files: dict[str, Path], outputs: dict[str, Path], **job) -> dict:
    """Run a Python ``script`` in the vendored Pyodide under Node; return its JSON result.

    ``files`` are copied into the engine's file system before the script runs and ``outputs``
    copied back after it (engine path -> host path). Other keywords go into the job as they are
    (``snapshot``: a host path for a memory snapshot; ``stdLibURL``: another standard library).
    """
    node = shutil.which("node")
    if node is None:
        raise BuildError("Node.js is needed to build (it runs Pyodide to compile the bytecode)")
    with tempfile.TemporaryDirectory() as tmp:
        spec = {
            "indexURL": str(MODULES / "pyodide") + "/",
            "env": {"PYTHONHASHSEED": "0", "SOURCE_DATE_EPOCH": SOURCE_DATE_EPOCH},
            "clock": int(SOURCE_DATE_EPOCH),
            "entropy": "driftdose build",
            "files": {k: str(v) for k, v in files.items()},
            "outputs": {k: str(v) for k, v in outputs.items()},
            "script": str(script),
            **job,
        }
        done = subprocess.run(
            [node, str(ENGINE_RUNNER)],
            input=json.dumps(spec),
            capture_output=True,
            text=True,
            cwd=tmp,
        )
    if done.returncode:
        tail = (done.stdout + "\n" + done.stderr)[-3000:]
        raise BuildError(f"{script.name} failed in the engine:\n{tail}")
    answer = json.loads(done.stdout.strip().splitlines()[-1])
    answer["result"] = json.loads(answer["result"]) if answer["result"] else None
    return answer


def precompile(stdlib: Path, wheel: Path, stdlib_out: Path, wheel_out: Path) -> dict:
    """Write the bytecode editions of the standard library and of the wheel.

    Compiled by the engine's own Python (``site/engine-build/engine_precompile.py``), so the page's
    interpreter imports them without compiling anything; see that script for the format.
    """
    config = {
        "stdlib_in": "/job/stdlib.zip",
        "stdlib_out": "/job/stdlib-out.zip",
        "wheel_in": "/job/in.whl",
        "wheel_out": "/job/out.whl",
    }
    with tempfile.TemporaryDirectory() as tmp:
        (Path(tmp) / "config.json").write_text(json.dumps(config))
        answer = run_engine(
            TOOLS / "engine_precompile.py",
            {
                "/job/config.json": Path(tmp) / "config.json",
                "/job/stdlib.zip": stdlib,
                "/job/in.whl": wheel,
            },
            {"/job/stdlib-out.zip": stdlib_out, "/job/out.whl": wheel_out},
        )
    return {**answer["result"], "engine": answer["facts"]["version"]}


def write_sparse(memory: bytes, out: Path) -> None:
    """Write ``memory`` leaving out its all-zero pages (most of a fresh engine's memory).

    Format (little-endian): ``DDSPARSE``, u32 total length, u32 page size, u32 number of pages
    kept, a bitmap with one bit per page (1: kept), then the kept pages in order. The worker
    expands it into a zeroed buffer (``expandSparse`` in site/js/worker.js).
    """
    pages = (len(memory) + SNAPSHOT_PAGE - 1) // SNAPSHOT_PAGE
    zero = bytes(SNAPSHOT_PAGE)
    bitmap = bytearray((pages + 7) // 8)
    kept = []
    for i in range(pages):
        page = memory[i * SNAPSHOT_PAGE : (i + 1) * SNAPSHOT_PAGE]
        if page != zero[: len(page)]:
            bitmap[i // 8] |= 1 << (i % 8)
            kept.append(page.ljust(SNAPSHOT_PAGE, b"\0"))
    header = SPARSE_MAGIC + struct.pack("<III", len(memory), SNAPSHOT_PAGE, len(kept))
    out.write_bytes(header + bytes(bitmap) + b"".join(kept))


def read_sparse(data: bytes) -> bytes:
    """Inverse of :func:`write_sparse` (used by the tests)."""
    if data[:8] != SPARSE_MAGIC:
        raise ValueError("not a sparse snapshot")
    total, size, count = struct.unpack_from("<III", data, 8)
    pages = (total + size - 1) // size
    bitmap = data[20 : 20 + (pages + 7) // 8]
    memory = bytearray(pages * size)
    pos = 20 + len(bitmap)
    for i in range(pages):
        if bitmap[i // 8] >> (i % 8) & 1:
            memory[i * size : (i + 1) * size] = data[pos : pos + size]
            pos += size
    if pos != len(data) or sum(bin(b).count("1") for b in bitmap) != count:
        raise ValueError("sparse snapshot has the wrong length")
    return bytes(memory[:total])


def make_snapshot(stdlib: Path, wheel: Path, dist: Path) -> dict:
    """Write the engine's memory with the package imported to ``dist/snapshot/``.

    The engine runs on the bytecode standard library ``stdlib`` (the worker must load the very
    same archive: the engine keeps its directory in memory). The file is named after its stamp,
    a digest of the engine build id, the standard library and the wheel; the worker checks the
    stamp inside the restored engine against ``build-info.json``.
    """
    build_id = engine_build_id()
    stamp_of = hashlib.sha256(build_id.encode())
    for part in (stdlib, wheel):
        stamp_of.update(hashlib.sha256(part.read_bytes()).digest())
    stamp = stamp_of.hexdigest()[:16]
    with tempfile.TemporaryDirectory() as tmp:
        (Path(tmp) / "config.json").write_text(
            json.dumps({"wheel": "/job/package.whl", "stamp": stamp})
        )
        raw = Path(tmp) / "memory.bin"
        answer = run_engine(
            TOOLS / "engine_snapshot.py",
            {"/job/config.json": Path(tmp) / "config.json", "/job/package.whl": wheel},
            {},
            snapshot=str(raw),
            stdLibURL=str(stdlib),
        )
        memory = raw.read_bytes()
    words = struct.unpack_from("<4I8I", memory)
    found = "".join(f"{w:08x}" for w in words[4:])
    if words[0] != SNAPSHOT_MAGIC or found != build_id:
        raise BuildError(
            "the engine's snapshot header changed (magic number or build id not where expected)"
        )
    if answer["result"]["stamp"] != stamp:
        raise BuildError("the snapshot script did not record the stamp")
    target = dist / SNAPSHOT_DIR / f"{stamp}.bin"
    target.parent.mkdir(parents=True, exist_ok=True)
    write_sparse(memory, target)
    return {
        "file": target.relative_to(dist).as_posix(),
        "stamp": stamp,
        "engine_build_id": build_id,
        "memory_bytes": len(memory),
        "file_bytes": target.stat().st_size,
        "modules": answer["result"]["modules"],
    }


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


def build(dist: Path = DIST, *, bytecode: bool = True, snapshot: bool = True) -> dict:
    """Write the served edition into ``dist``; return the build info.

    ``bytecode=False`` ships the standard library and the wheel as sources and ``snapshot=False``
    leaves the memory snapshot out: slower editions, kept for the benchmark's comparison.
    """
    versions = _check_node_modules()
    _check_engine()
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
    named = dist / "wheels" / _sha256(wheel)[:16] / wheel.name
    named.parent.mkdir()
    wheel = wheel.rename(named)
    engine = {"version": versions["pyodide"], "build_id": engine_build_id()}
    frozen = make_snapshot(stdlib, wheel, dist) if bytecode and snapshot else None
    forms = describe_forms()
    forms["wheel"] = wheel.relative_to(dist).as_posix()
    (dist / "forms.json").write_text(json.dumps(forms, ensure_ascii=False, indent=1) + "\n")
    files = sorted(p for p in dist.rglob("*") if p.is_file())
    precache = [{"url": p.relative_to(dist).as_posix(), "sha256": _sha256(p)} for p in files]
    digest = hashlib.sha256(json.dumps(precache).encode()).hexdigest()[:16]
    info = {
        "version": forms["version"],
        "pyodide": versions["pyodide"],
        "chartjs": versions["chart.js"],
        "wheel": forms["wheel"],
        "wheel_sha256": _sha256(wheel),
        "bytecode": bytecode,
        "engine": engine,
        "build": digest,
    }
    if frozen:
        info["snapshot"] = frozen
    (dist / "build-info.json").write_text(json.dumps(info, indent=1) + "\n")
    precache.append({"url": "build-info.json", "sha256": _sha256(dist / "build-info.json")})
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
    metas = _CSP_META.findall((directory / "index.html").read_text(encoding="utf-8"))
    if len(metas) != 1:
        raise BuildError("index.html must hold exactly one Content-Security-Policy meta element")
    policy = metas[0].split('content="', 1)[1].rsplit('"', 1)[0]
    return f"{policy}; frame-ancestors 'none'"


class _Handler(http.server.SimpleHTTPRequestHandler):
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
    handler_class = type("_PolicyHandler", (_Handler,), {"policy": served_policy(directory)})
    handler = functools.partial(handler_class, directory=str(directory))
    server = http.server.ThreadingHTTPServer(("127.0.0.1", port), handler)
    thread = threading.Thread(target=server.serve_forever, daemon=True)
    thread.start()
    return server, thread


# =================================================================================================
# Single-file edition: `python build.py --single-file [PATH]`
# One HTML file that runs from file:// with no server and no network. Every file of the served
# edition (except the page shell and the service-worker/manifest machinery) is embedded as base64
# in a non-executing <script type="application/octet-stream">, gzip-compressed where that pays.
# The browser side is site/single/ (loader.js inline, runtime.js, pyodide.js); see runtime.js.
# =================================================================================================

SINGLE_SRC = SITE / "single"
SINGLE_NAME = "drift-and-dose.html"
SINGLE_MAX_BYTES = 12_000_000
# served-only files: the page shell (rewritten, not embedded) and the offline/installable machinery
SINGLE_SKIP = {"index.html", "precache.json", "sw.js", "manifest.webmanifest"}
# the memory snapshot (13 MB) would not fit the size budget: the edition starts the engine from
# its bytecode instead (build-info.json embedded without the "snapshot" entry)
SINGLE_SKIP_DIRS = ("snapshot/",)
SINGLE_RUNTIME = "single/runtime.js"
SINGLE_WORKER = "js/worker.js"
SINGLE_FORMS = "forms.json"
SINGLE_OWN_MODULES = ("js/", "single/")  # our ES modules: import specifiers rewritten
SINGLE_UNMODIFIED_MODULES = ("pyodide/pyodide.mjs", "pyodide/pyodide.asm.mjs")
# an import of the key from any module but the value itself is pointed at the value
SINGLE_ALIASES = {"pyodide/pyodide.mjs": "single/pyodide.js"}
# what the single-file edition relies on in Pyodide 314, checked in the files it embeds
SINGLE_PYODIDE_ASSUMPTIONS = {
    "pyodide.d.ts": (
        "indexURL?: string",
        "lockFileContents?: Lockfile | string | Promise<Lockfile | string>",
        "packageBaseUrl?: string",
        "createPyodideModule?: CreatePyodideModuleFn",
    ),
    "pyodide.mjs": (
        "createPyodideModule",  # used instead of import(indexURL + "pyodide.asm.mjs")
        "lockFileContents",
        "packageBaseUrl",
        '"pyodide.asm.wasm"',  # fetched from indexURL: answered by the runtime's fetch()
        '"python_stdlib.zip"',  # likewise
        "instantiateStreaming",  # the wasm response needs Content-Type application/wasm
        " as loadPyodide",
        " as version",
    ),
    "pyodide.asm.mjs": ("export default ",),
}
SINGLE_CSP = (
    "default-src 'none'; script-src {loader} blob: 'wasm-unsafe-eval'; worker-src blob:; "
    "connect-src blob:; style-src {styles}; img-src data: blob:; object-src 'none'; "
    "base-uri 'none'; form-action 'none'"
)

_CSP_META = re.compile(r'<meta http-equiv="Content-Security-Policy" content="[^"]*">')
_STATIC_IMPORT = re.compile(
    r"""(?m)^[ \t]*(?:import|export)\b[^;'"`]*?\bfrom[ \t]*(["'])([^"'\n]+)\1"""
)
_SIDE_EFFECT_IMPORT = re.compile(r"""(?m)^[ \t]*import[ \t]*(["'])([^"'\n]+)\1""")
_DYNAMIC_IMPORT = re.compile(r"""(?<![\w$.])import\s*\(\s*(["'])([^"'\n]+)\1\s*\)""")
_ANY_DYNAMIC_IMPORT = re.compile(r"(?<![\w$.])import\s*\(")
_MINIFIED_IMPORT = re.compile(
    r"""(?:^|[;}\s])(?:import|export)\s*(?:[\w$]+\s*,?\s*)?"""
    r"""(?:\{[^}]*\}|\*\s*as\s+[\w$]+|\*)?\s*from\s*(["'])([^"']+)\1"""
)
_ATTR = re.compile(r"""([\w:-]+)(?:\s*=\s*(?:"([^"]*)"|'([^']*)'|([^\s>]+)))?""")


def _single_check_pyodide(built: Path) -> None:
    """Fail loudly when the Pyodide release breaks an assumption of the single-file edition."""
    for name in PYODIDE_FILES:
        if not (built / "pyodide" / name).exists():
            raise BuildError(f"single-file edition: pyodide/{name} is missing from the build")
    for name, needles in SINGLE_PYODIDE_ASSUMPTIONS.items():
        path = MODULES / "pyodide" / name if name.endswith(".d.ts") else built / "pyodide" / name
        if not path.exists():
            raise BuildError(f"single-file edition: {path} is missing")
        text = path.read_text(encoding="utf-8")
        for needle in needles:
            if needle not in text:
                raise BuildError(
                    f"single-file edition: {name} no longer contains {needle!r}; the Pyodide "
                    "release changed something the edition relies on (see site/single/)"
                )
    for path in SINGLE_UNMODIFIED_MODULES:
        found = _MINIFIED_IMPORT.search((built / path).read_text(encoding="utf-8"))
        if found:
            raise BuildError(
                f"single-file edition: {path} now imports {found.group(2)!r}; it is embedded "
                "unmodified and cannot resolve imports"
            )


def _single_mime(path: str) -> str:
    suffix = Path(path).suffix
    return MIME.get(suffix) or mimetypes.guess_type(path)[0] or "application/octet-stream"


def _single_resolve(importer: str, specifier: str, files: dict[str, bytes]) -> str:
    if not specifier.startswith(("./", "../")) or "?" in specifier or "#" in specifier:
        raise BuildError(
            f"single-file edition: {importer} imports {specifier!r}; only plain relative "
            "specifiers of embedded files can be resolved"
        )
    target = posixpath.normpath(posixpath.join(posixpath.dirname(importer), specifier))
    alias = SINGLE_ALIASES.get(target)
    if alias and alias != importer:
        target = alias
    if target not in files:
        raise BuildError(f"single-file edition: {importer} imports {specifier!r}, not embedded")
    return target


def _single_rewrite_module(path: str, source: str, files: dict[str, bytes]) -> tuple[str, set]:
    """Replace relative import specifiers and ``import.meta.url`` by the runtime's tokens."""
    spans = []
    for pattern in (_STATIC_IMPORT, _SIDE_EFFECT_IMPORT, _DYNAMIC_IMPORT):
        spans += [(m.start(2), m.end(2), m.group(2)) for m in pattern.finditer(source)]
    literal = {m.start() for m in _DYNAMIC_IMPORT.finditer(source)}
    for m in _ANY_DYNAMIC_IMPORT.finditer(source):
        if m.start() not in literal:
            raise BuildError(
                f"single-file edition: {path} has an import() of a computed specifier; "
                "only string-literal relative imports can be embedded"
            )
    deps = set()
    out, pos = [], 0
    for start, end, specifier in sorted(set(spans)):
        target = _single_resolve(path, specifier, files)
        deps.add(target)
        out += [source[pos:start], f"@@dd-module:{target}@@"]
        pos = end
    out.append(source[pos:])
    rewritten = "".join(out).replace("import.meta.url", f'"@@dd-url:{path}@@"')
    if "import.meta" in rewritten:
        raise BuildError(f"single-file edition: {path} uses import.meta beyond import.meta.url")
    return rewritten, deps


def _single_check_cycles(graph: dict[str, set]) -> None:
    state: dict[str, int] = {}

    def visit(node: str, trail: list[str]) -> None:
        if state.get(node) == 2:
            return
        if state.get(node) == 1:
            raise BuildError(f"single-file edition: import cycle {' -> '.join([*trail, node])}")
        state[node] = 1
        for dep in sorted(graph.get(node, ())):
            visit(dep, [*trail, node])
        state[node] = 2

    for node in sorted(graph):
        visit(node, [])


def _single_attrs(tag: str) -> dict[str, str]:
    inner = re.sub(r"^<\w+|/?>$", "", tag)
    return {
        m.group(1).lower(): next((g for g in m.groups()[1:] if g is not None), "")
        for m in _ATTR.finditer(inner)
    }


def _single_csp_hash(text: str) -> str:
    return "'sha256-" + base64.b64encode(hashlib.sha256(text.encode()).digest()).decode() + "'"


def _single_shell(html: str, files: dict[str, bytes]) -> tuple[str, list[str], list[dict]]:
    """Rewrite the served index.html: returns (html, inline styles, page scripts in order)."""
    if len(_CSP_META.findall(html)) != 1:
        raise BuildError("single-file edition: index.html must have exactly one CSP meta element")
    styles: list[str] = []

    def link(m: re.Match) -> str:
        attrs = _single_attrs(m.group(0))
        rel, href = attrs.get("rel", "").lower(), attrs.get("href", "")
        if rel == "manifest":
            return ""  # an installable app needs a server; the single file is the offline edition
        if href not in files:
            raise BuildError(f"single-file edition: <link rel={rel!r} href={href!r}> not embedded")
        if rel == "stylesheet":
            css = files[href].decode("utf-8")
            if re.search(r"url\(\s*['\"]?(?!data:)|@import|</style", css, re.IGNORECASE):
                raise BuildError(f"single-file edition: {href} refers to other files")
            styles.append(css)
            return f"<style>{css}</style>"
        if rel in ("icon", "apple-touch-icon"):
            data = base64.b64encode(files[href]).decode()
            return m.group(0).replace(f'"{href}"', f'"data:{_single_mime(href)};base64,{data}"')
        raise BuildError(f"single-file edition: no rule for <link rel={rel!r}>")

    html = re.sub(r"<link\b[^>]*>", link, html)
    scripts: list[dict] = []

    def script(m: re.Match) -> str:
        attrs = _single_attrs(m.group(1))
        src = attrs.get("src")
        if src is None or m.group(2).strip():
            raise BuildError("single-file edition: index.html has an inline script")
        if src not in files:
            raise BuildError(f"single-file edition: script {src!r} is not embedded")
        scripts.append({"path": src, "module": attrs.get("type") == "module"})
        return ""

    html = re.sub(r"<script\b([^>]*)>(.*?)</script>\n?", script, html, flags=re.DOTALL)
    leftover = re.search(r"""\s(?:src|href)=["'](?![#]|data:|https?:|mailto:)[^"']+""", html)
    if leftover:
        raise BuildError(f"single-file edition: index.html refers to a file: {leftover.group(0)}")
    if html.count("</body>") != 1:
        raise BuildError("single-file edition: index.html must have one </body>")
    return html, styles, scripts


def _stored_zip(data: bytes) -> bytes:
    """The same archive with every entry stored uncompressed (same names, times, order)."""
    out = io.BytesIO()
    with zipfile.ZipFile(io.BytesIO(data)) as zin, zipfile.ZipFile(out, "w") as zout:
        for info in zin.infolist():
            entry = zipfile.ZipInfo(info.filename, date_time=info.date_time)
            entry.external_attr = info.external_attr
            zout.writestr(entry, zin.read(info), compress_type=zipfile.ZIP_STORED)
    return out.getvalue()


def build_single_file(target: Path | None = None, built: Path | None = None) -> dict:
    """Write the single-file edition (default dist/drift-and-dose.html); return its figures.

    ``built`` is a served edition written by :func:`build` (built into a temporary folder when
    None). The output depends only on the sources: same sources, same bytes.
    """
    target = Path(target) if target else DIST / SINGLE_NAME
    if built is None:
        with tempfile.TemporaryDirectory() as tmp:
            build(Path(tmp) / "site")
            return build_single_file(target, Path(tmp) / "site")
    built = Path(built)
    _single_check_pyodide(built)
    files: dict[str, bytes] = {}
    for p in sorted(built.rglob("*")):
        rel = p.relative_to(built).as_posix()
        earlier = p.name == SINGLE_NAME or p.resolve() == target.resolve()  # no nesting
        skip = rel in SINGLE_SKIP or rel.startswith(SINGLE_SKIP_DIRS) or earlier
        if p.is_file() and not skip:
            files[rel] = p.read_bytes()
    for p in sorted(SINGLE_SRC.glob("*.js")):
        if p.name != "loader.js":
            files[f"single/{p.name}"] = p.read_bytes()
    for need in (SINGLE_RUNTIME, SINGLE_WORKER, SINGLE_FORMS, *SINGLE_ALIASES.values()):
        if need not in files:
            raise BuildError(f"single-file edition: {need} is missing from the build")
    stdlib = f"pyodide/{STDLIB}"
    if stdlib in files:  # stored, so that the edition's own gzip compresses across modules
        files[stdlib] = _stored_zip(files[stdlib])
    info = json.loads(files["build-info.json"])
    if info.pop("snapshot", None):
        files["build-info.json"] = (json.dumps(info, indent=1) + "\n").encode()
    if info.get("wheel") not in files:
        raise BuildError(f"single-file edition: the wheel {info.get('wheel')!r} is missing")

    graph: dict[str, set] = {}
    meta: dict[str, dict] = {}
    for path in sorted(files):
        own = path.startswith(SINGLE_OWN_MODULES) and path.endswith(".js")
        meta[path] = {"type": _single_mime(path), "tokens": own and path != SINGLE_RUNTIME}
        if path == SINGLE_RUNTIME:
            runtime = files[path].decode("utf-8")
            if _STATIC_IMPORT.search(runtime) or "import.meta" in runtime:
                raise BuildError(f"{path} must have no imports and no import.meta")
        elif own:
            text, graph[path] = _single_rewrite_module(path, files[path].decode("utf-8"), files)
            files[path] = text.encode("utf-8")
        elif path in SINGLE_UNMODIFIED_MODULES:
            graph[path] = set()
    _single_check_cycles(graph)
    for source, alias in SINGLE_ALIASES.items():
        if not any(alias in deps for deps in graph.values()):
            raise BuildError(
                f"single-file edition: no module imports {source} any more, so its stand-in "
                f"{alias} is unused and Pyodide would import its parts from URLs"
            )

    html, styles, scripts = _single_shell((built / "index.html").read_text("utf-8"), files)
    loader = (SINGLE_SRC / "loader.js").read_text("utf-8")
    if "</script" in loader.lower():
        raise BuildError("single-file edition: site/single/loader.js must not contain '</script'")
    csp = SINGLE_CSP.format(
        loader=_single_csp_hash(loader), styles=" ".join(map(_single_csp_hash, styles)) or "'none'"
    )
    html = _CSP_META.sub(
        lambda _: f'<meta http-equiv="Content-Security-Policy" content="{csp}">', html
    )
    blocks = []
    for number, path in enumerate(sorted(files), 1):
        data = files[path]
        packed = gzip.compress(data, compresslevel=9, mtime=0)
        use_gzip = path != SINGLE_RUNTIME and len(packed) <= 0.9 * len(data)
        meta[path].update(id=f"dd-{number}", gzip=use_gzip)
        encoded = base64.b64encode(packed if use_gzip else data).decode("ascii")
        blocks.append(
            f'<script type="application/octet-stream" id="dd-{number}" data-path="{path}">'
            f"{encoded}</script>\n"
        )
    manifest = {
        "runtime": SINGLE_RUNTIME,
        "forms": SINGLE_FORMS,
        "scripts": scripts,
        "files": meta,
    }
    manifest_json = json.dumps(manifest, sort_keys=True, separators=(",", ":")).replace(
        "<", "\\u003c"
    )
    tail = (
        "".join(blocks)
        + f'<script type="application/json" id="dd-manifest">{manifest_json}</script>\n'
        + f"<script>{loader}</script>\n</body>"
    )
    html = html.replace("</body>", tail)
    out = html.encode("utf-8")
    if len(out) > SINGLE_MAX_BYTES:
        raise BuildError(
            f"single-file edition: {len(out)} bytes, more than the {SINGLE_MAX_BYTES} allowed"
        )
    target.parent.mkdir(parents=True, exist_ok=True)
    target.write_bytes(out)
    return {"path": target, "bytes": len(out), "files": len(files), "version": info["version"]}


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
