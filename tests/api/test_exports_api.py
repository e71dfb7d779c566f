"""CSV exports through the one door (``handle`` kind ``export``): the header block, the
byte-order mark for spreadsheets, and hostile requests refused with nothing changed."""

from __future__ import annotations

import copy
import csv
import datetime
import hashlib
import io
import json
import re

import pytest

from driftdose import __version__, api, export
from driftdose.api.exports import MARK, header_rows
from driftdose.api.registry import CALCULATIONS

MOTION_INPUTS = {
    "particle_diameter": {"value": "2.5", "unit": "um"},
    "particle_density": {"value": "2,2", "unit": "g/cm3"},  # decimal comma, as a person types
    "temperature": {"value": "35", "unit": "°C"},
}


def _export(calculation: str, inputs: dict, part: str = "results", bom: bool = True) -> dict:
    reply = api.handle({"kind": calculation, "inputs": inputs})
    assert reply["ok"], reply
    request = {"calculation": calculation, "part": part, "inputs": inputs, "reply": reply}
    return api.handle({"kind": "export", "inputs": {**request, "bom": bom}}), reply


def _split(text: str) -> tuple[list[list[str]], str]:
    head, sep, table = text.removeprefix("\ufeff").partition("\r\n\r\n")
    assert sep
    return list(csv.reader(io.StringIO(head, newline=""))), table


def test_header_block_names_version_date_calculation_and_every_input_with_unit():
    out, reply = _export("motion", MOTION_INPUTS)
    assert out["ok"], out
    head, table = _split(out["text"])
    assert head[0] == [MARK, "results"]
    assert head[1] == ["tool_version", __version__]
    assert head[2][0] == "created_utc"
    assert re.fullmatch(r"\d{4}-\d\d-\d\dT\d\d:\d\d:\d\dZ", head[2][1])
    stamp = datetime.datetime.strptime(head[2][1], "%Y-%m-%dT%H:%M:%SZ")
    now = datetime.datetime.now(datetime.UTC).replace(tzinfo=None)
    assert abs((now - stamp).total_seconds()) < 3600  # a hang check, not a speed target
    assert head[3] == ["calculation", "motion", CALCULATIONS["motion"].TITLE]
    assert head[4] == ["encoding", "UTF-8 with byte-order mark"]
    assert head[5] == ["inputs", "name", "label", "value", "unit", "value_si", "si_unit"]
    rows = {r[1]: r for r in head[6:]}
    assert all(r[0] == "input" for r in head[6:])
    # every field of the calculation appears (all apply to motion)
    assert set(rows) == {f.name for f in CALCULATIONS["motion"].FIELDS}
    d = rows["particle_diameter"]
    assert d[3:5] == ["2.5", "µm"] and float(d[5]) == pytest.approx(2.5e-6, rel=1e-15)
    assert d[6] == "m"
    rho = rows["particle_density"]
    assert rho[3:5] == ["2.2", "g/cm³"] and float(rho[5]) == 2200.0 and rho[6] == "kg/m³"
    t = rows["temperature"]
    assert t[3:5] == ["35", "°C"] and float(t[5]) == pytest.approx(308.15) and t[6] == "K"
    # defaults filled in are written as the defaults' values and units
    assert rows["time"][3:7] == ["1.0", "s", "1.0", "s"]
    assert rows["diameter_type"][5] == "volume_equivalent"
    # the table after the block is the core exporter's, byte for byte
    assert table == export.results_csv(reply)


def test_byte_order_mark_only_when_asked_and_units_survive_as_utf8():
    with_bom, _ = _export("motion", MOTION_INPUTS, bom=True)
    without, _ = _export("motion", MOTION_INPUTS, bom=False)
    raw = with_bom["text"].encode("utf-8")
    assert raw.startswith(b"\xef\xbb\xbf")  # UTF-8 byte-order mark (Unicode Standard, 23.8)
    assert not without["text"].startswith("\ufeff")
    assert ["encoding", "UTF-8"] in _split(without["text"])[0]
    # what a spreadsheet that honours the mark reads: µ, ² and ³ intact
    decoded = raw.decode("utf-8-sig")
    assert "µm" in decoded and "m²/s" in decoded and "kg/m³" in decoded
    # without the mark a reader that assumes a legacy code page shows mojibake: the reason
    assert "Âµm" in without["text"].encode("utf-8").decode("cp1252", errors="replace")


def test_curves_part_and_structured_inputs_each_item_field_its_own_row():
    inputs = {
        "modes": [
            {
                "basis": "count",
                "median": {"value": "30", "unit": "nm"},
                "diameter_type": "volume_equivalent",
                "gsd": "1.6",
                "concentration": {"value": "1e5", "unit": "1/cm3"},
            },
            {
                "basis": "mass",
                "median": {"value": "2", "unit": "um"},
                "diameter_type": "aerodynamic",
                "gsd": "2",
                "concentration": {"value": "0.5", "unit": "mg/m3"},
            },
        ]
    }
    out, reply = _export("deposition", inputs, part="curves")
    assert out["ok"], out
    head, table = _split(out["text"])
    assert head[0] == [MARK, "curves"]
    rows = {r[1]: r for r in head[6:]}
    assert rows["modes[1].median"][3:5] == ["30", "nm"]
    assert rows["modes[2].concentration"][3:5] == ["0.5", "mg/m³"]
    assert float(rows["modes[1].median"][5]) == pytest.approx(3e-8, rel=1e-15)
    assert rows["modes[1].median"][6] == "m"
    assert rows["modes[2].concentration"][5:7] == [repr(0.5e-6), "kg/m³"]
    assert rows["modes[2].diameter_type"][5] == "aerodynamic"  # the code; its label before it
    assert rows["modes[1].gsd"][3] == "1.6"
    # the spectrum inputs do not apply to modes: not written
    assert "csv_text" not in rows and "csv_diameter_unit" not in rows
    assert table == export.curves_csv(reply)


SPECTRUM_TEXT = "diameter_nm,dN/dlogDp\n10,1000\n20,3000\n50,2000\n100,500\n"


def _spectrum_export_rows(source_key: str) -> tuple[dict, dict]:
    """Export of a deposition on SPECTRUM_TEXT, its choice of source under ``source_key``:
    the reply and its input rows by name (the header block after its six fixed rows)."""
    inputs = {
        source_key: "csv",
        "csv_text": SPECTRUM_TEXT,
        "csv_diameter_column": "diameter_nm",
        "csv_concentration_column": "dN/dlogDp",
    }
    out, _ = _export("deposition", inputs)
    assert out["ok"], out
    head, _ = _split(out["text"])
    return out, {r[1]: r for r in head[6:]}


def test_imported_text_is_named_by_size_and_sha256_not_copied():
    text = SPECTRUM_TEXT
    out, rows = _spectrum_export_rows("size_source")
    digest = hashlib.sha256(text.encode("utf-8")).hexdigest()
    assert rows["csv_text"][3] == f"imported text, {len(text)} bytes as UTF-8, SHA-256 {digest}"
    assert "10,1000" not in out["text"].split("\r\n\r\n")[0]
    assert rows["csv_diameter_column"][3] == "diameter_nm"
    assert "modes[1].median" not in rows  # modes do not apply to an imported spectrum
    assert rows["size_source"][5] == "csv"


def test_input_under_a_former_name_is_written_under_todays_name():
    # distribution_source: the name before size_source; links still carry it
    _, rows = _spectrum_export_rows("distribution_source")
    assert rows["size_source"][5] == "csv" and "distribution_source" not in rows
    assert "csv_text" in rows and "modes[1].median" not in rows


def test_header_rows_with_a_fixed_clock():
    calc = CALCULATIONS["motion"]
    values, errors = api.parse_fields(calc.FIELDS, {})
    assert not errors
    when = datetime.datetime(2026, 12, 2, 9, 5, 7, tzinfo=datetime.UTC)
    rows = header_rows("motion", calc, "curves", {}, values, False, now=when)
    assert rows[2] == ["created_utc", "2026-12-02T09:05:07Z"]


def test_formula_like_inputs_written_as_text():
    stages = [
        {
            "type": "tube",
            "name": "=HYPERLINK(1)",
            "length": {"value": "1", "unit": "m"},
            "tube_diameter": {"value": "4", "unit": "mm"},
        }
    ]
    out, _ = _export("sampling", {"stages": stages})
    assert out["ok"], out
    cells = [c for row in csv.reader(io.StringIO(out["text"], newline="")) for c in row]
    assert "'=HYPERLINK(1)" in cells and "=HYPERLINK(1)" not in cells


GOOD = None


def _good() -> dict:
    global GOOD
    if GOOD is None:
        reply = api.handle({"kind": "motion", "inputs": {}})
        GOOD = {"calculation": "motion", "part": "results", "inputs": {}, "reply": reply}
    return copy.deepcopy(GOOD)


def _nested(depth: int) -> dict:
    node: dict = {}
    for _ in range(depth):
        node = {"a": node}
    return node


HOSTILE = [
    ("not an object", lambda g: [1, 2], ""),
    ("no calculation", lambda g: {k: v for k, v in g.items() if k != "calculation"}, "calculation"),
    ("unknown calculation", lambda g: {**g, "calculation": "x" * 10_000}, "calculation"),
    ("export of an export", lambda g: {**g, "calculation": "export"}, "calculation"),
    ("describe", lambda g: {**g, "calculation": "describe"}, "calculation"),
    ("prototype key", lambda g: {**g, "calculation": "__proto__"}, "calculation"),
    ("calculation not text", lambda g: {**g, "calculation": ["motion"]}, "calculation"),
    ("bad part", lambda g: {**g, "part": "../../etc/passwd"}, "part"),
    ("part not text", lambda g: {**g, "part": {"results": 1}}, "part"),
    ("bom not bool", lambda g: {**g, "bom": "yes"}, "bom"),
    ("bom a number", lambda g: {**g, "bom": 1}, "bom"),
    ("no reply", lambda g: {k: v for k, v in g.items() if k != "reply"}, "reply"),
    ("failed reply", lambda g: {**g, "reply": {"ok": False, "errors": []}}, "reply"),
    ("reply ok as text", lambda g: {**g, "reply": {**g["reply"], "ok": "true"}}, "reply"),
    ("results a list", lambda g: {**g, "reply": {**g["reply"], "results": [1]}}, "reply"),
    ("curves text", lambda g: {**g, "reply": {**g["reply"], "curves": "x"}}, "reply"),
    (
        "bad input",
        lambda g: {**g, "inputs": {"particle_diameter": {"value": "abc", "unit": "nm"}}},
        "inputs.particle_diameter",
    ),
    (
        "bad unit",
        lambda g: {**g, "inputs": {"time": {"value": "1", "unit": "fortnight"}}},
        "inputs.time",
    ),
    ("inputs a list", lambda g: {**g, "inputs": [1]}, "inputs"),
]


@pytest.mark.parametrize(("name", "make", "field"), HOSTILE, ids=[h[0] for h in HOSTILE])
def test_hostile_export_requests_refused_naming_the_entry(name, make, field):
    request = make(_good())
    before = copy.deepcopy(request)
    out = api.handle({"kind": "export", "inputs": request})
    assert out["ok"] is False, name
    assert out["errors"][0]["field"] == field, out
    assert "Internal error" not in out["errors"][0]["message"]
    assert len(out["errors"][0]["message"]) < 300
    assert request == before  # nothing changed
    # the JSON door answers the same way
    assert json.loads(api.handle_json(json.dumps({"kind": "export", "inputs": request}))) == out


def test_hostile_reply_contents_never_escape_the_boundary():
    good = _good()
    for reply in (
        {**good["reply"], "results": {"x": {"label": "=cmd", "value": float("1e308")}}},
        {**good["reply"], "results": {"x": {"label": ["a"], "value": "v"}}},
        {**good["reply"], "curves": _nested(5000)},
        {**good["reply"], "results": {"__proto__": {"label": "p", "value": 1}}},
        {**good["reply"], "curves": {"c": {"x": [1, 2], "y": [1]}}},
    ):
        out = api.handle({"kind": "export", "inputs": {**good, "reply": reply}})
        assert isinstance(out, dict) and "ok" in out
        if out["ok"]:
            cells = [c for row in csv.reader(io.StringIO(out["text"], newline="")) for c in row]
            assert "=cmd" not in cells


def test_export_kind_not_listed_as_a_calculation():
    assert "export" not in api.describe()["calculations"]
