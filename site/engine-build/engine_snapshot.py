"""Start the engine with the driftdose package imported, for a memory snapshot.

Run by ``site/engine-build/engine.mjs`` under Node in the vendored Pyodide (with
``_makeSnapshot``) on the bytecode standard library; the runner then writes the engine's memory
to a file that the page's worker restores instead of starting Python (see
``site/js/worker.js``). Reads ``/job/config.json``: the wheel to unpack and the stamp the
worker checks after a restore.

The wheel is unpacked with ``zipfile`` rather than installed with the engine's package loader,
whose state cannot be snapshotted. Every module of the package the worker can reach is imported
here (the package imports nothing inside functions), so a restored engine needs no package
files. Leaves ``DRIFTDOSE_SNAPSHOT`` (the stamp) in ``__main__``.
"""

import json


def _prepare() -> dict:
    import gc
    import importlib
    import pkgutil
    import sys
    import sysconfig
    import zipfile

    config = json.loads(open("/job/config.json").read())
    with zipfile.ZipFile(config["wheel"]) as wheel:
        wheel.extractall(sysconfig.get_path("purelib"))
    importlib.invalidate_caches()  # the build's fixed clock leaves the folder's time unchanged
    import driftdose

    skip = {"driftdose.cli", "driftdose.__main__"}  # the command line is not used in the page

    def import_all(path: list[str], prefix: str) -> None:  # skipped packages are not entered
        for module in pkgutil.iter_modules(path, prefix):
            if module.name not in skip:
                imported = importlib.import_module(module.name)
                if module.ispkg:
                    import_all(imported.__path__, module.name + ".")

    import_all(driftdose.__path__, "driftdose.")
    archive = next(p for p in sys.path if p.endswith(".zip"))
    compiled, from_source = 0, []
    for name, module in sorted(sys.modules.items()):
        origin = getattr(getattr(module, "__spec__", None), "origin", None) or ""
        if origin.startswith(archive + "/"):
            if origin.endswith(".pyc"):
                compiled += 1
            else:
                from_source.append(name)
    if from_source:
        raise RuntimeError(f"standard-library modules imported from source: {from_source}")
    api = importlib.import_module("driftdose.api")
    described = json.loads(api.handle_json(json.dumps({"kind": "describe"})))
    if "random" in sys.modules:  # seeded from the OS at import; the worker reseeds it
        sys.modules["random"].seed(0)
    gc.collect()
    return {
        "stamp": config["stamp"],
        "modules": len(sys.modules),
        "stdlib_from_bytecode": compiled,
        "version": described["version"],
    }


_facts = _prepare()
DRIFTDOSE_SNAPSHOT = _facts["stamp"]
json.dumps(_facts)
