"""The bad-input corpus, generated from the field descriptions the API publishes.

Every numeric and choice field of every panel (top-level fields, the fields of a lognormal
mode and the fields of each sampling stage type) gets the same bad values; a new field in
``driftdose.api.describe()`` is covered without touching this file. Absurd combinations and
malformed files are listed by hand below.
"""

from __future__ import annotations

import codecs
from dataclasses import dataclass
from typing import Any

from driftdose.api.units import UNITS

from .driver import DESCRIPTION, PANELS

# (case name, typed text); "must fail" marks values no required field may accept.
NUMERIC_VALUES: tuple[tuple[str, str, bool], ...] = (
    ("empty", "", True),
    ("spaces", "   ", True),
    ("text", "abc", True),
    ("negative", "-1", False),
    ("zero", "0", False),
    ("nan", "NaN", True),
    ("infinity", "Infinity", True),
    ("huge", "1e308", True),
    ("tiny", "1e-308", False),
)
INTEGER_VALUES: tuple[tuple[str, str, bool], ...] = (("fraction", "2.5", True),)
WRONG_UNIT = "furlong"
WRONG_CHOICE = "not-a-choice"


@dataclass(frozen=True)
class Case:
    """One step of bad input: ``ops`` applied at once to one panel.

    ``ops`` are dicts with ``path`` (``stages.@<type>.<name>`` names the first stage of a
    type) and one of ``value`` (typed text), ``unit`` (a unit select set by script to a
    value it does not offer), ``inject`` / ``injectUnit`` (an option added by script and
    chosen). ``must_fail`` asks for an error reply; otherwise the API decides.
    """

    pid: str
    name: str
    ops: tuple[dict[str, Any], ...]
    must_fail: bool = False

    @property
    def id(self) -> str:
        return f"{self.pid}-{self.name}"

    @property
    def stage_types(self) -> set[str]:
        return {op["path"].split(".")[1][1:] for op in self.ops if ".@" in op["path"]}


def _numeric_cases(pid: str, path: str, f: dict[str, Any], units: list[str]) -> list[Case]:
    required = f.get("required", True)
    values = NUMERIC_VALUES + (INTEGER_VALUES if f["kind"] == "integer" else ())
    out = [
        Case(pid, f"{path}-{what}", ({"path": path, "value": text},), bad and required)
        for what, text, bad in values
    ]
    if len(units) > 1:
        # with a number typed (an empty optional field ignores its unit)
        default = f.get("default")
        number = default.get("value") if isinstance(default, dict) else None
        typed = {"path": path, "value": "1" if number is None else str(number)}
        out.append(Case(pid, f"{path}-unit-not-offered", ({**typed, "unit": WRONG_UNIT},), True))
        out.append(Case(pid, f"{path}-unit-injected", ({**typed, "injectUnit": WRONG_UNIT},), True))
    return out


def _choice_cases(pid: str, path: str) -> list[Case]:
    return [
        Case(pid, f"{path}-choice-not-offered", ({"path": path, "value": WRONG_CHOICE},), True),
        Case(pid, f"{path}-choice-injected", ({"path": path, "inject": WRONG_CHOICE},), True),
    ]


def _unit_names(f: dict[str, Any]) -> list[str]:
    return [u if isinstance(u, str) else u["unit"] for u in f.get("units") or []]


def covered_fields() -> dict[str, set[str]]:
    """Every numeric and choice field of every panel, as paths (stage fields by type)."""
    out: dict[str, set[str]] = {pid: set() for pid in PANELS}
    for pid in PANELS:
        for f in DESCRIPTION[pid]["fields"]:
            if f["kind"] in UNITS or f["kind"] in ("integer", "choice"):
                out[pid].add(f["name"])
            for item in f.get("item_fields", []):
                out[pid].add(f"{f['name']}.0.{item['name']}")
            for kind, spec in f.get("stage_types", {}).items():
                for sf in spec["fields"]:
                    if sf["kind"] in UNITS or sf["kind"] in ("integer", "choice"):
                        out[pid].add(f"{f['name']}.@{kind}.{sf['name']}")
    return out


def field_cases() -> list[Case]:
    """The generated corpus: every bad value for every numeric and choice field."""
    cases: list[Case] = []
    for pid in PANELS:
        for f in DESCRIPTION[pid]["fields"]:
            if f["kind"] in UNITS or f["kind"] == "integer":
                cases += _numeric_cases(pid, f["name"], f, _unit_names(f))
            elif f["kind"] == "choice":
                cases += _choice_cases(pid, f["name"])
            for item in f.get("item_fields", []):
                path = f"{f['name']}.0.{item['name']}"
                if item["kind"] == "choice":
                    cases += _choice_cases(pid, path)
                else:
                    cases += _numeric_cases(
                        pid, path, {**item, "required": True}, _unit_names(item)
                    )
            for kind, spec in f.get("stage_types", {}).items():
                for sf in spec["fields"]:
                    path = f"{f['name']}.@{kind}.{sf['name']}"
                    if sf["kind"] in UNITS or sf["kind"] == "integer":
                        cases += _numeric_cases(pid, path, sf, _unit_names(sf))
                    elif sf["kind"] == "choice":
                        cases += _choice_cases(pid, path)
    return cases


def _q(path: str, value: str, unit: str | None = None) -> dict[str, Any]:
    """One typed value (with its unit chosen, if given)."""
    return {"path": path, "value": value} | ({"unit": unit} if unit is not None else {})


def _combo(pid: str, name: str, *ops: dict[str, Any], fails: bool = False) -> Case:
    return Case(pid, name, ops, fails)


def combo_cases() -> list[Case]:
    """Absurd combinations of values that are each within range."""
    m, d, s = "motion", "deposition", "sampling"
    return [
        _combo(
            m,
            "combo-aerodynamic-diameter-too-small-for-density",
            _q("diameter_type", "aerodynamic"),
            _q("particle_diameter", "0.5", "nm"),
            _q("particle_density", "25", "g/cm3"),
            fails=True,
        ),
        _combo(
            m,
            "combo-huge-light-particle-aerodynamic",
            _q("diameter_type", "aerodynamic"),
            _q("particle_diameter", "1000", "um"),
            _q("particle_density", "0.1", "g/cm3"),
        ),
        _combo(
            m,
            "combo-smallest-particle-shortest-time-longest-distance",
            _q("particle_diameter", "0.5", "nm"),
            _q("time", "1", "s"),
            _q("reference_distance", "10", "m"),
        ),
        _combo(
            m,
            "combo-largest-densest-particle-longest-time-fastest",
            _q("particle_diameter", "1000", "um"),
            _q("particle_density", "25", "g/cm3"),
            _q("time", "24", "h"),
            _q("initial_velocity", "100", "m/s"),
        ),
        _combo(m, "combo-negative-kelvin", _q("temperature", "-50", "K"), fails=True),
        _combo(
            m,
            "combo-hot-thin-air-irregular-particle",
            _q("temperature", "500", "degC"),
            _q("pressure", "10", "kPa"),
            _q("shape_factor", "5"),
            _q("particle_diameter", "1000", "um"),
        ),
        _combo(
            d,
            "combo-tidal-volume-below-dead-space",
            _q("breathing", "custom"),
            _q("tidal_volume", "0.1", "L"),
            fails=True,
        ),
        _combo(
            d,
            "combo-shallow-slow-mouth-breathing",
            _q("breathing", "custom"),
            _q("tidal_volume", "0.15", "L"),
            _q("breathing_frequency", "4"),
            _q("nasal_fraction", "0"),
            fails=True,
        ),
        _combo(
            d,
            "combo-deepest-fastest-breathing",
            _q("breathing", "custom"),
            _q("tidal_volume", "4", "L"),
            _q("breathing_frequency", "60"),
        ),
        _combo(
            d,
            "combo-mass-mode-with-number-concentration",
            _q("modes.0.basis", "mass"),
            _q("modes.0.median", "5", "um"),
            _q("modes.0.concentration", "1000", "1/cm3"),
            fails=True,
        ),
        _combo(
            d,
            "combo-count-mode-with-mass-concentration",
            _q("modes.0.basis", "count"),
            _q("modes.0.concentration", "1", "mg/m3"),
            fails=True,
        ),
        _combo(
            d,
            "combo-widest-mode-at-the-size-limits",
            _q("modes.0.median", "1", "nm"),
            _q("modes.0.gsd", "5"),
            _q("modes.0.concentration", "1e9", "1/cm3"),
        ),
        _combo(
            d,
            "combo-lightest-coarsest-heaviest-mass-mode",
            _q("modes.0.basis", "mass"),
            _q("modes.0.median", "100", "um"),
            _q("modes.0.gsd", "5"),
            _q("modes.0.concentration", "1e4", "mg/m3"),
            _q("particle_density", "0.1", "g/cm3"),
        ),
        _combo(
            d,
            "combo-simplified-model-on-clusters",
            _q("model", "simplified"),
            _q("modes.0.median", "1", "nm"),
            _q("modes.0.gsd", "1.01"),
        ),
        _combo(
            d,
            "combo-tiny-benchmark-huge-concentration",
            _q("benchmark_number", "1e-6", "1/cm3"),
            _q("modes.0.concentration", "1e9", "1/cm3"),
        ),
        _combo(
            s,
            "combo-bend-radius-smaller-than-the-tube",
            _q("stages.@bend.tube_diameter", "4", "cm"),
            _q("stages.@bend.curvature_radius", "1", "cm"),
            fails=True,
        ),
        _combo(
            s,
            "combo-impactor-jet-beyond-sound",
            _q("stages.@impactor.nozzle_diameter", "10", "um"),
            _q("flow", "100", "L/min"),
            fails=True,
        ),
        _combo(
            s,
            "combo-long-capillary-beyond-sound",
            _q("stages.@tube.length", "1000", "m"),
            _q("stages.@tube.tube_diameter", "0.01", "mm"),
            fails=True,
        ),
        _combo(
            s,
            "combo-slit-shorter-than-its-width",
            _q("stages.@impactor.jet", "rectangular"),
            _q("stages.@impactor.nozzle_diameter", "100", "mm"),
            _q("stages.@impactor.slit_length", "0.001", "mm"),
            fails=True,
        ),
        _combo(s, "combo-solid-screen", _q("stages.@screens.solidity", "1"), fails=True),
        _combo(
            s,
            "combo-stage-flow-beyond-sound-in-narrow-tube",
            _q("stages.@tube.tube_diameter", "1", "mm"),
            _q("stages.@tube.flow", "6000", "L/min"),
            fails=True,
        ),
        _combo(
            s,
            "combo-wide-tube-trickle-flow",
            _q("stages.@tube.length", "1000", "m"),
            _q("stages.@tube.tube_diameter", "1", "m"),
            _q("flow", "0.001", "L/min"),
        ),
        _combo(
            s,
            "combo-sharpest-smallest-cyclone",
            _q("stages.@cyclone.d50", "0.05"),
            _q("stages.@cyclone.curve_gsd", "5"),
        ),
    ]


# --- malformed spectrum files ----------------------------------------------------------------

GOOD_CSV = "diameter_nm,dN\n20,1000\n40,3000\n80,2000\n160,500\n"

# expectation: "line" (a content problem: message names the line), "error" (a message),
# "ok" (computed), "refused" (refused by the page before reading: too large)


@dataclass(frozen=True)
class FileCase:
    """A file for a file field: ``content`` bytes (or ``size`` for a generated big file)."""

    name: str
    filename: str
    content: bytes
    expect: str
    columns: tuple[str, str] | None = None  # column mapping typed before the file is chosen
    size: int = 0


def _rows(n: int, sep: str = ",") -> str:
    return "".join(f"{10 + i * 0.01:.2f}{sep}{100 + i % 7}\n" for i in range(n))


def csv_cases() -> list[FileCase]:
    """Malformed (and odd but valid) spectrum files."""
    u = lambda s: s.encode("utf-8")  # noqa: E731
    return [
        FileCase("empty", "empty.csv", b"", "error"),
        FileCase("blank-lines-only", "blank.csv", b"\n\n  \n\t\n", "error"),
        FileCase("binary", "noise.csv", bytes(range(256)) * 40, "error"),
        FileCase("png-image", "picture.csv", b"\x89PNG\r\n\x1a\n" + bytes(500), "error"),
        FileCase("twenty-megabytes", "huge.csv", b"", "refused", size=20 * 1024 * 1024),
        FileCase("pipe-delimiter", "pipes.csv", u("d|n\n10|100\n20|200\n"), "error"),
        # columns separated by blanks (aligned columns) are read
        FileCase("space-delimiter", "spaces.csv", u("d n\n10 100\n20 200\n"), "ok"),
        FileCase("byte-order-mark", "bom.csv", codecs.BOM_UTF8 + u(GOOD_CSV), "ok"),
        FileCase(
            "decimal-commas", "commas.csv", u("d;n\n10,5;100,25\n20,5;200,5\n40,5;50\n"), "ok"
        ),
        FileCase("crlf-line-ends", "crlf.csv", u(GOOD_CSV.replace("\n", "\r\n")), "ok"),
        FileCase("tabs-and-quotes", "tabs.tsv", u('"d"\t"n"\n"10"\t"100"\n"20"\t"200"\n'), "ok"),
        FileCase("windows-1252", "cp1252.csv", "d µm;n\n10;100\n20;200\n".encode("cp1252"), "ok"),
        FileCase("non-numeric-cell", "text.csv", u("d,n\n10,100\n20,abc\n40,50\n"), "line"),
        FileCase("negative-diameter", "neg.csv", u("d,n\n10,100\n-20,200\n"), "line"),
        FileCase("zero-diameter", "zero.csv", u("d,n\n0,100\n20,200\n"), "line"),
        FileCase("negative-concentration", "negc.csv", u("d,n\n10,100\n20,-5\n"), "line"),
        FileCase("unsorted-diameters", "unsorted.csv", u("d,n\n10,100\n40,200\n20,300\n"), "line"),
        FileCase("duplicate-bins", "dup.csv", u("d,n\n10,100\n20,200\n20,300\n"), "line"),
        FileCase("single-row", "one.csv", u("d,n\n10,100\n"), "line"),
        FileCase("nan-and-inf-cells", "nan.csv", u("d,n\n10,nan\n20,inf\n"), "line"),
        FileCase("overflowing-number", "big.csv", u("d,n\n10,1e308\n20,1e308\n"), "error"),
        FileCase("hundred-thousand-rows", "rows.csv", u("d,n\n" + _rows(100_000)), "line"),
        FileCase(
            "twenty-thousand-rows-at-the-limit", "limit.csv", u("d,n\n" + _rows(20_000)), "ok"
        ),
        FileCase("header-only", "header.csv", u("d,n\n"), "error"),
        FileCase("comments-only", "comments.csv", u("# size spectrum\n# nothing yet\n"), "error"),
        FileCase(
            "mixed-delimiters", "mixed.csv", u("d,n\n10,100\n20;200\n30,300\n40;400\n"), "line"
        ),
        FileCase("very-long-line", "long.csv", u("d,n\n10," + "9" * 1_000_000 + "\n"), "line"),
        FileCase("nul-bytes", "nul.csv", u("d,n\n10,100\n") + b"\x00\x00" + u("20,200\n"), "error"),
        FileCase("utf-16-with-byte-order-mark", "utf16.csv", GOOD_CSV.encode("utf-16"), "ok"),
        FileCase("utf-16-without-mark", "utf16le.csv", GOOD_CSV.encode("utf-16-le"), "error"),
        FileCase("missing-column", "short.csv", u("d,n\n10,100\n20\n30,300\n"), "line"),
        FileCase(
            "html-page", "page.csv", u("<html><body><p>not a table</p></body></html>"), "error"
        ),
        FileCase(
            "diameters-in-metres-read-as-nm", "units.csv", u("d,n\n0.01,100\n0.02,200\n"), "error"
        ),
        FileCase(
            "column-name-pointing-nowhere",
            "named.csv",
            u(GOOD_CSV),
            "error",
            columns=("size_um", "dN"),
        ),
        FileCase(
            "column-number-pointing-nowhere",
            "numbered.csv",
            u(GOOD_CSV),
            "error",
            columns=("1", "9"),
        ),
        FileCase("column-number-zero", "zeroth.csv", u(GOOD_CSV), "error", columns=("0", "2")),
        FileCase("same-column-twice", "twice.csv", u(GOOD_CSV), "error", columns=("dN", "dN")),
    ]


# --- malformed "Load inputs (JSON)" files ------------------------------------------------------

STATE_FORMAT = "drift-and-dose-inputs"


def _state(panels: Any, **extra: Any) -> bytes:
    import json

    return json.dumps(
        {"format": STATE_FORMAT, "version": 1, "panel": "motion", "panels": panels, **extra}
    ).encode()


def json_cases() -> list[FileCase]:
    """Malformed or odd inputs files; "refused" means the tool message says why."""
    import json

    deep = "[" * 100_000 + "]" * 100_000
    return [
        FileCase("empty", "empty.json", b"", "refused"),
        FileCase("binary", "noise.json", bytes(range(256)) * 40, "refused"),
        FileCase("twenty-megabytes", "huge.json", b"", "refused", size=20 * 1024 * 1024),
        FileCase("truncated", "cut.json", _state({"motion": {}})[:-7], "refused"),
        FileCase("utf-16", "utf16.json", _state({}).decode().encode("utf-16"), "ok"),
        FileCase(
            "utf-16-without-mark",
            "utf16le.json",
            _state({}).decode().encode("utf-16-le"),
            "refused",
        ),
        FileCase("nul-bytes", "nul.json", b"\x00" + _state({}), "refused"),
        FileCase("array", "array.json", b"[]", "refused"),
        FileCase("null", "nothing.json", b"null", "refused"),
        FileCase("number", "number.json", b"42", "refused"),
        FileCase(
            "other-format",
            "other.json",
            json.dumps({"format": "x", "panels": {}}).encode(),
            "refused",
        ),
        FileCase("panels-a-string", "panels.json", _state("motion"), "refused"),
        FileCase(
            "nan-literal", "nan.json", b'{"format": "drift-and-dose-inputs", "x": NaN}', "refused"
        ),
        FileCase(
            "byte-order-mark",
            "bom.json",
            codecs.BOM_UTF8 + _state({"motion": {"time": {"value": "2", "unit": "s"}}}),
            "ok",
        ),
        FileCase("panels-null", "pnull.json", _state(None), "ok"),
        FileCase(
            "unknown-panel-and-fields",
            "unknown.json",
            _state({"nowhere": {"a": 1}, "motion": {"nofield": "1"}}),
            "notice",
        ),
        FileCase("other-version", "version.json", _state({"motion": {}}, version=999), "notice"),
        FileCase(
            "values-of-wrong-types",
            "types.json",
            _state(
                {
                    "motion": {
                        "particle_diameter": 5,
                        "time": [1, 2],
                        "pressure": True,
                        "temperature": None,
                        "diameter_type": {"a": 1},
                    }
                }
            ),
            "fields",
        ),
        FileCase(
            "object-as-number",
            "object.json",
            _state({"motion": {"particle_diameter": {"value": {"x": 1}, "unit": {"y": 2}}}}),
            "fields",
        ),
        FileCase(
            "modes-not-a-list",
            "modes.json",
            _state({"deposition": {"size_source": "lognormal", "modes": "many"}}),
            "fields",
        ),
        FileCase(
            "thousand-modes",
            "modes1000.json",
            _state(
                {
                    "deposition": {
                        "size_source": "lognormal",
                        "modes": [{"basis": "count"}] * 1000,
                    }
                }
            ),
            "fields",
        ),
        FileCase(
            "stages-not-a-list",
            "stages.json",
            _state({"sampling": {"stages": {"type": "tube"}}}),
            "fields",
        ),
        FileCase(
            "thousand-stages",
            "stages1000.json",
            _state({"sampling": {"stages": [{"type": "tube"}] * 1000}}),
            "fields",
        ),
        FileCase(
            "stage-of-unknown-type",
            "stagetype.json",
            _state({"sampling": {"stages": [{"type": "rocket"}, 7, None]}}),
            "fields",
        ),
        FileCase(
            "spectrum-text-not-text",
            "csvnum.json",
            _state({"deposition": {"size_source": "csv", "csv_text": 12345}}),
            "fields",
        ),
        FileCase(
            "deep-nesting",
            "deep.json",
            _state({"motion": {"time": "@@"}}).replace(b'"@@"', deep.encode()),
            "any",
        ),
        FileCase(
            "megabyte-string",
            "long.json",
            _state({"motion": {"particle_diameter": {"value": "9" * 900_000, "unit": "nm"}}}),
            "fields",
        ),
        FileCase(
            "prototype-keys",
            "proto.json",
            b'{"format": "drift-and-dose-inputs", "version": 1, "panels": {"__proto__": {"x": 1},'
            b' "motion": {"constructor": "1", "__proto__": {"time": "1"}}}}',
            "notice",
        ),
    ]
