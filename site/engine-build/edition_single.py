"""The single-file edition: ``python build.py --single-file [PATH]``.

One HTML file that runs from file:// with no server and no network. Every file of the served
edition (except the page shell and the service-worker/manifest machinery) is embedded as base64
in a non-executing ``<script type="application/octet-stream">``, gzip-compressed where that
pays. The browser side is ``site/single/`` (``loader.js`` inline, ``runtime.js``,
``pyodide.js``); see ``runtime.js``.
"""

from __future__ import annotations

import base64
import gzip
import hashlib
import io
import json
import mimetypes
import posixpath
import re
import tempfile
import zipfile
from pathlib import Path

from build_layout import DIST, MIME, MODULES, PYODIDE_FILES, SITE, STDLIB, BuildError
from edition_served import CSP_META, build

SINGLE_SRC = SITE / "single"
SINGLE_NAME = "drift-and-dose.html"
SINGLE_MAX_BYTES = 12_000_000


# served-only files: the page shell (rewritten, not embedded) and the offline/installable machinery
# (js/warm.js runs only once a service worker has taken control)
SINGLE_SKIP = {"index.html", "precache.json", "sw.js", "manifest.webmanifest", "js/warm.js"}


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


def _single_check_pyodide(built: Path, modules: Path) -> None:
    """Fail loudly when the Pyodide release breaks an assumption of the single-file edition."""
    for name in PYODIDE_FILES:
        if not (built / "pyodide" / name).exists():
            raise BuildError(f"single-file edition: pyodide/{name} is missing from the build")
    for name, needles in SINGLE_PYODIDE_ASSUMPTIONS.items():
        path = modules / "pyodide" / name if name.endswith(".d.ts") else built / "pyodide" / name
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
    if len(CSP_META.findall(html)) != 1:
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


def build_single_file(
    target: Path | None = None, built: Path | None = None, *, modules: Path = MODULES
) -> dict:
    """Write the single-file edition (default dist/drift-and-dose.html); return its figures.

    ``built`` is a served edition written by :func:`build` (built into a temporary folder when
    None). ``modules`` holds the vendored npm packages (Pyodide's type declarations are read
    there). The output depends only on the sources: same sources, same bytes.
    """
    target = Path(target) if target else DIST / SINGLE_NAME
    if built is None:
        with tempfile.TemporaryDirectory() as tmp:
            build(Path(tmp) / "site")
            return build_single_file(target, Path(tmp) / "site", modules=modules)
    built = Path(built)
    _single_check_pyodide(built, modules)
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
    info = json.loads(files["build-info.json"])
    # the standard library and the wheel are stored (entries uncompressed), so that the
    # edition's own gzip compresses across modules: the wheel so embedded takes about 0.3 MB
    # less than its deflated entries would (the wheel is loaded by URL, no digest is checked)
    for archive in (f"pyodide/{STDLIB}", info.get("wheel")):
        if archive in files:
            files[archive] = _stored_zip(files[archive])
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
    html = CSP_META.sub(
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
