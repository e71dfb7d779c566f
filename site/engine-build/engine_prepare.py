"""Engine start prepared at build time: the bytecode and the memory snapshot.

Runs the vendored Pyodide under Node (``engine.mjs`` beside this file) on
``engine_precompile.py`` (bytecode of the standard library and of the wheel) and
``engine_snapshot.py`` (the engine's memory with the package imported, written without its
all-zero pages). The build stops if an option, message or header layout relied on is missing
from the vendored engine (:data:`ENGINE_ASSUMPTIONS`).
"""

from __future__ import annotations

import hashlib
import json
import re
import shutil
import struct
import subprocess
import tempfile
from pathlib import Path

from build_layout import ENGINE_RUNNER, MODULES, SOURCE_DATE_EPOCH, TOOLS, BuildError

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
        # js/worker.js hands over the snapshot before it has all arrived: fsInit is awaited as a
        # run dependency, so the module resolves, and its memory is restored, only after it
        'addRunDependency("fsInitHook");try{await e(',
        "r=await Re(i,n);Fe(r,t);let a=Ae(r,s,t)",
        'BUILD_ID:"',  # the engine's build id, which a snapshot must carry
        "thisProgram:e._sysExecutable",  # the build-time runner sets it as a browser does
    ),
    "pyodide.asm.mjs": (
        "_makeSnapshot",  # option needed to make a snapshot
        "static makeMemorySnapshot(",
        "Snapshot build id mismatch",  # the engine refuses a snapshot of another build
        f"$r={SNAPSHOT_MAGIC},Ze=48",  # magic number and header size
        'if(Module["instantiateWasm"])',  # js/warm.js: the factory waits on this hook
    ),
    "pyodide.d.ts": (
        "_makeSnapshot?: boolean;",
        "_loadSnapshot?: Uint8Array | ArrayBuffer | PromiseLike<Uint8Array | ArrayBuffer>;",
    ),
}
_BUILD_ID = re.compile(r'BUILD_ID:"([0-9a-f]{64})"')


def check_engine(modules: Path = MODULES) -> None:
    """Stop the build when the vendored Pyodide loader changed what the build relies on."""
    for name, needles in ENGINE_ASSUMPTIONS.items():
        text = (modules / "pyodide" / name).read_text(encoding="utf-8")
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
