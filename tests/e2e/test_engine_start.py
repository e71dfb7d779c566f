"""Engine start-up: bytecode built by the engine's own Python, the memory snapshot, fallbacks.

What is checked against what: the bytecode archives against the vendored sources they come
from (every module present, PEP 552 header flags), RECORD against the files' own SHA-256, the
build against a second build (same bytes), the snapshot refusals against the page actually
starting the normal way, and the sparse snapshot format against an independent reader in each
language.
"""

from __future__ import annotations

import base64
import hashlib
import json
import random
import re
import shutil
import struct
import subprocess
import zipfile
from pathlib import Path

import pytest

from .conftest import _load_build_module, new_watched_page, wait_ready

PYC_UNCHECKED_HASH = 0b01  # PEP 552 flags: hash-based (bit 0), check_source (bit 1) unset
ENGINE_NEEDLES = [
    (name, needle)
    for name, needles in _load_build_module().ENGINE_ASSUMPTIONS.items()
    for needle in needles
]


def _entries(path: Path) -> dict[str, bytes]:
    with zipfile.ZipFile(path) as z:
        return {i.filename: z.read(i) for i in z.infolist()}


def test_stdlib_archive_is_bytecode_of_every_vendored_module(dist_dir: Path, build_module):
    vendored = _entries(build_module.MODULES / "pyodide" / build_module.STDLIB)
    built = _entries(dist_dir / "pyodide" / build_module.STDLIB)
    sources = [n for n in vendored if n.endswith(".py")]
    assert len(sources) > 500
    assert not [n for n in built if n.endswith(".py")], "sources left in the bytecode archive"
    assert sorted(built) == sorted(n + "c" if n.endswith(".py") else n for n in vendored)
    for name, data in vendored.items():
        if not name.endswith(".py"):
            assert built[name] == data, name
    magics = {built[n + "c"][:4] for n in sources}
    assert len(magics) == 1 and next(iter(magics))[2:] == b"\r\n"
    for name in sources:
        (flags,) = struct.unpack_from("<I", built[name + "c"], 4)
        assert flags == PYC_UNCHECKED_HASH, name


def test_wheel_carries_bytecode_listed_in_record(dist_dir: Path):
    info = json.loads((dist_dir / "build-info.json").read_text())
    wheel = dist_dir / info["wheel"]
    assert hashlib.sha256(wheel.read_bytes()).hexdigest() == info["wheel_sha256"]
    files = _entries(wheel)
    record_name = next(n for n in files if n.endswith(".dist-info/RECORD"))
    record = {}
    for line in files[record_name].decode().splitlines():
        name, digest, size = line.rsplit(",", 2)
        record[name] = (digest, size)
    assert set(record) == set(files)
    for name, data in files.items():
        if name == record_name:
            assert record[name] == ("", "")
            continue
        want = base64.urlsafe_b64encode(hashlib.sha256(data).digest()).rstrip(b"=").decode()
        assert record[name] == (f"sha256={want}", str(len(data))), name
    modules = [n for n in files if n.startswith("driftdose/") and n.endswith(".py")]
    assert len(modules) > 20
    for name in modules:
        folder, _, stem = name.rpartition("/")
        pyc = files[f"{folder}/__pycache__/{stem[:-3]}.cpython-314.pyc"]
        assert struct.unpack_from("<I", pyc, 4)[0] == PYC_UNCHECKED_HASH, name


def test_build_info_records_engine_package_and_snapshot(dist_dir: Path, build_module):
    info = json.loads((dist_dir / "build-info.json").read_text())
    assert info["engine"] == {
        "version": info["pyodide"],
        "build_id": build_module.engine_build_id(),
    }
    snap = info["snapshot"]
    assert snap["engine_build_id"] == info["engine"]["build_id"]
    data = (dist_dir / snap["file"]).read_bytes()
    assert len(data) == snap["file_bytes"] < snap["memory_bytes"]
    memory = build_module.read_sparse(data)
    assert len(memory) == snap["memory_bytes"]
    words = struct.unpack_from("<4I8I", memory)
    assert words[0] == build_module.SNAPSHOT_MAGIC
    assert "".join(f"{w:08x}" for w in words[4:]) == info["engine"]["build_id"]
    assert snap["file"] == f"snapshot/{snap['stamp']}.bin"


def test_build_is_reproducible(dist_dir: Path, build_module, tmp_path: Path):
    again = tmp_path / "again"
    build_module.build(again)
    first = sorted(p.relative_to(dist_dir) for p in dist_dir.rglob("*") if p.is_file())
    second = sorted(p.relative_to(again) for p in again.rglob("*") if p.is_file())
    assert first == second
    differ = [p for p in first if (dist_dir / p).read_bytes() != (again / p).read_bytes()]
    assert differ == []


@pytest.mark.parametrize(("name", "needle"), ENGINE_NEEDLES)
def test_build_stops_when_the_engine_changes(build_module, tmp_path, monkeypatch, name, needle):
    modules = tmp_path / "node_modules"
    (modules / "pyodide").mkdir(parents=True)
    for other in build_module.ENGINE_ASSUMPTIONS:
        shutil.copyfile(build_module.MODULES / "pyodide" / other, modules / "pyodide" / other)
    path = modules / "pyodide" / name
    text = path.read_text(encoding="utf-8")
    assert needle in text
    path.write_text(text.replace(needle, "renamedInALaterRelease"), encoding="utf-8")
    monkeypatch.setattr(build_module, "MODULES", modules)
    with pytest.raises(build_module.BuildError, match=re.escape(needle)):
        build_module._check_engine()


def test_sparse_snapshot_round_trip_in_python_and_javascript(build_module, tmp_path: Path):
    page = build_module.SNAPSHOT_PAGE
    rng = random.Random(7)
    memory = bytearray(page * 37 + 123)  # not a whole number of pages
    for i in (0, 3, 4, 20, 36, 37):
        start = i * page + rng.randrange(page // 2)
        memory[start : start + 100] = rng.randbytes(100)
    memory[-1] = 9
    path = tmp_path / "memory.bin"
    build_module.write_sparse(bytes(memory), path)
    data = path.read_bytes()
    assert len(data) < len(memory) / 4
    assert build_module.read_sparse(data) == bytes(memory)
    with pytest.raises(ValueError):
        build_module.read_sparse(data[:-1])
    script = (
        "import { readFileSync } from 'node:fs';"
        "import { createHash } from 'node:crypto';"
        f"import {{ expandSparse }} from '{build_module.SITE / 'js' / 'sparse.js'}';"
        "const b = readFileSync(process.argv[1]);"
        "const ab = b.buffer.slice(b.byteOffset, b.byteOffset + b.byteLength);"
        "const out = expandSparse(ab);"
        "let refused = '';"
        "try { expandSparse(ab.slice(0, ab.byteLength - 1)); } catch (e) { refused = e.message; }"
        "console.log(JSON.stringify({n: out.length, "
        "sha: createHash('sha256').update(out).digest('hex'), refused}));"
    )
    done = subprocess.run(
        ["node", "--input-type=module", "-e", script, str(path)],
        capture_output=True,
        text=True,
        check=True,
    )
    got = json.loads(done.stdout)
    assert got["n"] == len(memory)
    assert got["sha"] == hashlib.sha256(memory).hexdigest()
    assert "truncated" in got["refused"] or "wrong length" in got["refused"]


def _start_of(browser, url: str) -> tuple[str, str]:
    """Open ``url`` in a fresh context; return how the engine started and the worker's output."""
    context, page, watch = new_watched_page(browser, url)
    warnings = []
    page.on("worker", lambda w: w.on("console", lambda m: warnings.append(m.text)))
    try:
        page.goto(url)
        wait_ready(page)
        page.wait_for_function("() => document.querySelector('table.results')")
        start = page.evaluate("() => document.documentElement.dataset.engineStart")
        rows = page.locator("#panel-motion table.results tr").count()
    finally:
        context.close()
    assert not watch.errors and not watch.outside, (watch.errors, watch.outside)
    assert rows > 5
    return start, " ".join(warnings)


@pytest.mark.e2e
def test_page_starts_from_the_snapshot(browser, base_url: str):
    start, warnings = _start_of(browser, base_url)
    assert start == "snapshot", warnings


@pytest.mark.e2e
def test_forms_are_asked_for_once(watched, base_url: str):
    """boot.js asks for forms.json before the modules load; app.js takes that promise and the
    forms are built from it: one request for the descriptions per page load."""
    page, _ = watched
    asked: list[str] = []
    page.on("request", lambda r: asked.append(r.url) if r.url.endswith("/forms.json") else None)
    page.goto(base_url)
    wait_ready(page)
    page.wait_for_function("() => document.querySelector('#panel-motion table.results')")
    assert asked == [base_url.rstrip("/") + "/forms.json"]


def _served_copy(dist_dir: Path, build_module, tmp_path: Path, change) -> tuple[object, str]:
    copy = tmp_path / "site"
    shutil.copytree(dist_dir, copy)
    change(copy, json.loads((copy / "build-info.json").read_text()))
    server, _ = build_module.serve(copy, 0)
    host, port = server.server_address[:2]
    return server, f"http://{host}:{port}/"


def _other_engine_build(copy: Path, info: dict) -> None:
    path = copy / info["snapshot"]["file"]
    data = bytearray(path.read_bytes())
    # sparse file: 20-byte header, bitmap, then the kept pages; page 0 (the engine's snapshot
    # header, kept) comes first, and its bytes 16..47 hold the engine build id
    pages = -(-info["snapshot"]["memory_bytes"] // 4096)
    first_page = 20 + -(-pages // 8)
    data[first_page + 16 : first_page + 20] = b"\xff\xff\xff\xff"
    path.write_bytes(bytes(data))


def _other_stamp(copy: Path, info: dict) -> None:
    info["snapshot"]["stamp"] = "0" * 16
    (copy / "build-info.json").write_text(json.dumps(info))


def _truncated_file(copy: Path, info: dict) -> None:
    # the head and most pages arrive, the last page does not: the engine has been handed the
    # memory (and instantiated) before the file is found short, and must not restore it
    path = copy / info["snapshot"]["file"]
    path.write_bytes(path.read_bytes()[:-4096])


def _missing_file(copy: Path, info: dict) -> None:
    (copy / info["snapshot"]["file"]).unlink()


@pytest.mark.e2e
@pytest.mark.parametrize(
    ("change", "reason"),
    [
        (_other_engine_build, "build id mismatch"),
        (_other_stamp, "does not match this build"),
        (_missing_file, "HTTP 404"),
        (_truncated_file, "sparse snapshot is truncated"),
    ],
    ids=["engine-build-id", "stamp", "missing", "truncated"],
)
def test_refused_snapshot_falls_back_to_normal_start(
    browser, dist_dir: Path, build_module, tmp_path: Path, change, reason
):
    server, url = _served_copy(dist_dir, build_module, tmp_path, change)
    try:
        start, warnings = _start_of(browser, url)
    finally:
        server.shutdown()
    assert start == "normal"
    assert reason in warnings
