"""Compile the standard library and the driftdose wheel to bytecode, inside the engine.

Run by ``site/engine-build/engine.mjs`` under Node in the vendored Pyodide, so the bytecode
comes from the very interpreter that will run it in the page (same magic number, same cache
tag). Reads ``/job/config.json`` (paths in the engine's file system); writes the compiled archives.

The ``.pyc`` files are *unchecked hash-based* (PEP 552): they carry a hash of their source but
the import system does not check it, and no timestamp. The same inputs give the same bytes.
The package keeps its sources beside the bytecode; the standard library ships bytecode only.
"""

import base64
import hashlib
import importlib.util
import json
import sys
import sysconfig
import zipfile
from importlib._bootstrap_external import _code_to_hash_pyc


def _pyc(source: bytes, filename: str) -> bytes:
    code = compile(source, filename, "exec", dont_inherit=True, optimize=0)
    return bytes(_code_to_hash_pyc(code, importlib.util.source_hash(source), checked=False))


def _copy(zout: zipfile.ZipFile, info: zipfile.ZipInfo, name: str, data: bytes) -> None:
    entry = zipfile.ZipInfo(name, date_time=info.date_time)
    entry.compress_type = zipfile.ZIP_DEFLATED if data else zipfile.ZIP_STORED
    entry.external_attr = info.external_attr
    zout.writestr(entry, data, compresslevel=9)


def compile_stdlib(src: str, dst: str, prefix: str) -> int:
    """Copy the standard-library archive with each ``name.py`` replaced by ``name.pyc``.

    zipimport finds ``name.pyc`` in an archive before ``name.py``; the sources are left out to
    keep the download small (a traceback through the standard library then shows no source
    line). ``prefix`` is where the engine mounts the archive (``/lib/python314.zip/``): the code
    objects carry the file names zipimport gives them when it compiles the sources itself.
    """
    count = 0
    with zipfile.ZipFile(src) as zin, zipfile.ZipFile(dst, "w") as zout:
        for info in zin.infolist():
            data = zin.read(info)
            if info.filename.endswith(".py"):
                _copy(zout, info, info.filename + "c", _pyc(data, prefix + info.filename))
                count += 1
            else:
                _copy(zout, info, info.filename, data)
    return count


def _record_line(name: str, data: bytes) -> str:
    digest = base64.urlsafe_b64encode(hashlib.sha256(data).digest()).rstrip(b"=").decode()
    return f"{name},sha256={digest},{len(data)}"


def compile_wheel(src: str, dst: str, site_packages: str) -> int:
    """Copy the wheel, adding ``__pycache__/<module>.<cache tag>.pyc`` for each module.

    The code objects carry the installed file names (``site_packages``/...); RECORD lists
    the added files with their hashes, as an installer would.
    """
    tag = sys.implementation.cache_tag
    count = 0
    with zipfile.ZipFile(src) as zin, zipfile.ZipFile(dst, "w") as zout:
        infos = zin.infolist()
        record_info = next(i for i in infos if i.filename.endswith(".dist-info/RECORD"))
        record = zin.read(record_info).decode().splitlines()
        added = []
        for info in infos:
            if info is record_info:
                continue
            data = zin.read(info)
            _copy(zout, info, info.filename, data)
            if info.filename.endswith(".py"):
                folder, _, stem = info.filename.rpartition("/")
                name = f"{folder}/__pycache__/{stem[:-3]}.{tag}.pyc"
                pyc = _pyc(data, f"{site_packages}/{info.filename}")
                _copy(zout, info, name, pyc)
                added.append(_record_line(name, pyc))
                count += 1
        own = [line for line in record if line.startswith(record_info.filename + ",")]
        lines = [line for line in record if line not in own] + added + own
        _copy(zout, record_info, record_info.filename, ("\n".join(lines) + "\n").encode())
    return count


config = json.loads(open("/job/config.json").read())
_archive = next(p for p in sys.path if p.endswith(".zip"))  # where the engine mounts the stdlib
_site_packages = sysconfig.get_path("purelib")
json.dumps(
    {
        "stdlib_modules": compile_stdlib(config["stdlib_in"], config["stdlib_out"], _archive + "/"),
        "package_modules": compile_wheel(config["wheel_in"], config["wheel_out"], _site_packages),
        "magic": importlib.util.MAGIC_NUMBER.hex(),
        "cache_tag": sys.implementation.cache_tag,
    }
)
