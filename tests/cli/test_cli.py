"""The command line (``python -m driftdose``): flags from fields, files in, table/CSV/JSON out.

Every number is compared with ``driftdose.api.handle`` for the same request; printed numbers
are compared with the page's own formatter (``site/js/format.js``, run in Node when it is
installed) and with an independent rounding written here from the ECMAScript definition of
``Number.prototype.toPrecision``. No physics is checked here: the api tests do that.
"""

from __future__ import annotations

import csv
import hashlib
import io
import json
import math
import os
import random
import re
import shutil
import subprocess
import sys
import types
from decimal import ROUND_HALF_UP, Decimal
from pathlib import Path

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from driftdose import api, cli, export
from driftdose.api.demos import _DEMO_CSV
from driftdose.api.fields import Field, FieldError
from driftdose.api.registry import CALCULATIONS
from driftdose.api.units import unit_label, unit_table

ROOT = Path(__file__).resolve().parents[2]
FORMAT_JS = ROOT / "site" / "js" / "format.js"
NODE = shutil.which("node")
SUPERSCRIPT = str.maketrans("⁻⁰¹²³⁴⁵⁶⁷⁸⁹", "-0123456789")
SHOWN = re.compile(r"^-?\d+(\.\d+)?(e[-+]\d+)?( × 10[⁻⁰¹²³⁴⁵⁶⁷⁸⁹]+)?$")

MOTION_FLAGS = [
    "--particle-diameter",
    "2.5um",
    "--diameter-type",
    "aerodynamic",
    "--particle-density",
    "2.2 g/cm3",
    "--temperature",
    "35",
    "--time",
    "10",
    "--time-unit",
    "min",
]
MOTION_INPUTS = {
    "particle_diameter": {"value": "2.5", "unit": "um"},
    "diameter_type": "aerodynamic",
    "particle_density": {"value": "2.2", "unit": "g/cm3"},
    "temperature": {"value": "35", "unit": "degC"},
    "time": {"value": "10", "unit": "min"},
}
SPECTRUM_FLAGS = [
    "--csv-diameter-column",
    "diameter_nm",
    "--csv-concentration-column",
    "dN/dlogDp_per_cm3",
]

UNIT_TABLE = unit_table()  # what describe() sends the page: labels of unit codes


# --- helpers -----------------------------------------------------------------------------------


def run_main(capsys, *argv: str) -> tuple[int, str, str]:
    """Run ``cli.main`` in this process; return (exit status, stdout, stderr)."""
    code = cli.main(list(argv))
    out, err = capsys.readouterr()
    return code, out, err


def run_module(*argv: str, cwd: Path | None = None) -> subprocess.CompletedProcess:
    """Run ``python -m driftdose`` in a new process, as a user would."""
    env = dict(os.environ)
    env["PYTHONPATH"] = os.pathsep.join([str(ROOT / "pycore"), env.get("PYTHONPATH", "")])
    env["PYTHONIOENCODING"] = "utf-8"
    return subprocess.run(
        [sys.executable, "-m", "driftdose", *argv],
        capture_output=True,
        text=True,
        encoding="utf-8",
        env=env,
        cwd=cwd or ROOT,
        timeout=120,
    )


def page_format(values: list[float]) -> list[str]:
    """Format numbers with the page's own ``formatNumber`` (site/js/format.js) in Node."""
    if NODE is None:
        pytest.skip("node is not installed")
    script = (
        FORMAT_JS.read_text(encoding="utf-8")
        + f"\nconst values = {json.dumps(values)};\n"
        + "process.stdout.write(JSON.stringify(values.map((v) => formatNumber(v))));\n"
    )
    done = subprocess.run(
        [NODE, "--input-type=module", "-"],
        input=script,
        capture_output=True,
        text=True,
        encoding="utf-8",
        timeout=60,
        check=True,
    )
    return json.loads(done.stdout)


def half_up_4(x: float) -> Decimal:
    """The exact binary value of ``x`` rounded to 4 significant figures, ties away from zero.

    ECMA-262, Number.prototype.toPrecision (step "let e and n be integers such that
    10^(p-1) <= n < 10^p and n x 10^(e-p+1) - x is as close to zero as possible; if there are
    two such sets, pick the one for which n x 10^(e-p+1) is larger"), which the page's
    ``formatNumber`` uses for 4 significant figures. Written here independently of the CLI.
    """
    exact = Decimal(x)
    if exact == 0:
        return Decimal(0)
    quantum = Decimal(1).scaleb(exact.adjusted() - 3)
    rounded = exact.quantize(quantum, rounding=ROUND_HALF_UP)
    if rounded.adjusted() > exact.adjusted():  # 9.9995 -> 10.00: one digit fewer after it
        rounded = exact.quantize(quantum * 10, rounding=ROUND_HALF_UP)
    return rounded


def parse_shown(text: str) -> Decimal:
    """Read a number as the page (and the CLI table) writes it, exactly, as a Decimal."""
    m = re.fullmatch(r"(-?[\d.]+(?:e[-+]\d+)?)(?: × 10([⁻⁰¹²³⁴⁵⁶⁷⁸⁹]+))?", text.strip())
    assert m, f"not a number as the page shows it: {text!r}"
    power = int(m.group(2).translate(SUPERSCRIPT)) if m.group(2) else 0
    return Decimal(m.group(1)).scaleb(power)


def table_rows(out: str) -> dict[str, tuple[str, str]]:
    """Map a row's label (as printed) -> (value text, unit text) from the table format."""
    lines = out.splitlines()
    start = lines.index("Results") + 1
    header = lines[start]
    value_col, unit_col = header.index("Value"), header.index("Unit")
    rows = {}
    for line in lines[start + 1 :]:
        if not line.strip():
            break
        label = line[:value_col].strip()
        value, unit = line[value_col:unit_col].strip(), line[unit_col:].strip()
        if not SHOWN.match(value):  # words (a text result) may run past the value column
            value, unit = line[value_col:].strip(), ""
        rows[label] = (value, unit)
    return rows


def shown_label(row: dict) -> str:
    label = row["label"] + (f" {row['symbol']}" if row.get("symbol") else "")
    return label + (f" ({row['note']})" if row.get("note") else "")


# --- numbers as the page shows them --------------------------------------------------------


@pytest.mark.parametrize(
    ("value", "digits", "expected"),
    [
        # Exact binary ties round up (ECMA-262 toPrecision: "pick ... larger"), where
        # Python's format() rounds to even: 1.0625, 0.125 and 2.5 are exact in binary.
        pytest.param(1.0625, 4, "1.063", id="ecma262-toPrecision-tie-up"),
        pytest.param(0.125, 2, "0.13", id="ecma262-toPrecision-tie-small"),
        pytest.param(2.5, 1, "3", id="ecma262-toPrecision-tie-one-digit"),
        pytest.param(-1.0625, 4, "-1.063", id="ecma262-toPrecision-negative-tie"),
        # Exponential notation when the exponent is < -6 or >= digits (ECMA-262 step 10.c).
        pytest.param(12345.6, 4, "1.235e+4", id="ecma262-toPrecision-exponent-ge-p"),
        pytest.param(1.5e-7, 2, "1.5e-7", id="ecma262-toPrecision-exponent-lt-6"),
        pytest.param(0.000123456, 3, "0.000123", id="ecma262-toPrecision-small-fixed"),
        pytest.param(9999.6, 4, "1.000e+4", id="ecma262-toPrecision-rounds-to-next-power"),
        pytest.param(100.0, 4, "100.0", id="ecma262-toPrecision-trailing-zero"),
    ],
)
def test_to_precision_ecma262_cases(value, digits, expected):
    assert cli.to_precision(value, digits) == expected


@pytest.mark.parametrize(
    ("value", "expected"),
    [
        pytest.param(2.73456e-11, "2.735 × 10⁻¹¹", id="format.js-power-of-ten"),
        pytest.param(0.12345, "0.1235", id="format.js-fixed"),
        pytest.param(100.0, "100", id="format.js-trim-zeros"),
        pytest.param(0.0, "0", id="format.js-zero"),
        pytest.param(1e6, "1 × 10⁶", id="format.js-upper-edge"),
        pytest.param(0.001, "0.001", id="format.js-lower-edge"),
        pytest.param(float("nan"), "—", id="format.js-not-finite"),
        pytest.param(None, "—", id="format.js-not-a-number"),
    ],
)
def test_format_number_cases(value, expected):
    # Expected texts read off the branches of formatNumber in site/js/format.js.
    assert cli.format_number(value) == expected


def test_format_number_equals_page_formatter_in_node():
    """The Python port prints what site/js/format.js prints, for edge cases and 3000 randoms."""
    rng = random.Random(20261202)
    values = [
        0.0,
        1.0625,
        -1.0625,
        0.125,
        9999.5,
        9999.4,
        999999.5,
        1e6,
        1e-3,
        0.00099995,
        0.00099994,
        5e-324,
        1.7976931348623157e308,
        -2.5e-11,
        123456.5,
        12345.5,
        1234.5,
        0.1 + 0.2,
    ]
    values += [rng.uniform(-1, 1) * 10 ** rng.uniform(-30, 30) for _ in range(2000)]
    # decimal ties with 5 significant figures, where binary rounding decides the direction
    values += [rng.randrange(10000, 99999) / 10 + 0.05 for _ in range(1000)]
    assert [cli.format_number(v) for v in values] == page_format(values)


@settings(max_examples=300, deadline=None)
@given(st.floats(allow_nan=False, allow_infinity=False))
def test_format_number_rounds_half_up_on_exact_value(x):
    shown = cli.format_number(x)
    assert SHOWN.match(shown), shown
    assert parse_shown(shown) == half_up_4(x)
    # the CSV form of the same rounding reads back to the same number
    assert (Decimal(cli.plain_number(x)) if x else Decimal(0)) == half_up_4(x)


# --- a calculation subcommand ----------------------------------------------------------------


def test_main_motion_table_numbers_equal_page(capsys):
    """Each number the CLI prints equals the api's value as the page formats it."""
    code, out, err = run_main(capsys, "motion", *MOTION_FLAGS)
    assert code == 0, err
    reply = api.handle({"kind": "motion", "inputs": MOTION_INPUTS})
    assert reply["ok"]
    rows = table_rows(out)
    numeric = [(k, r) for k, r in reply["results"].items() if "value" in r]
    expected_text = page_format([r["value"] for _, r in numeric])
    for (key, row), page_text in zip(numeric, expected_text, strict=True):
        value_text, unit = rows[shown_label(row)]
        assert value_text == page_text, key
        assert parse_shown(value_text) == half_up_4(row["value"]), key
        assert unit == UNIT_TABLE[row["unit"]]["text"], key  # the page's label of the code
    for row in reply["results"].values():
        if "text" in row:
            assert rows[shown_label(row)][0] == row["text"]
    assert len(numeric) >= 15


def test_main_motion_table_independent_of_node(capsys):
    """Same check without Node: printed value == exact value rounded half up to 4 figures."""
    code, out, _ = run_main(capsys, "motion", "--particle-diameter", "37nm")
    assert code == 0
    reply = api.handle(
        {"kind": "motion", "inputs": {"particle_diameter": {"value": "37", "unit": "nm"}}}
    )
    rows = table_rows(out)
    checked = 0
    for row in reply["results"].values():
        if "value" in row:
            assert parse_shown(rows[shown_label(row)][0]) == half_up_4(row["value"])
            checked += 1
    assert checked >= 15


def test_main_motion_table_has_inputs_warnings_and_sources(capsys):
    code, out, _ = run_main(capsys, "motion", "--particle-diameter", "1nm", "--time", "1ms")
    assert code == 0
    reply = api.handle(
        {
            "kind": "motion",
            "inputs": {
                "particle_diameter": {"value": "1", "unit": "nm"},
                "time": {"value": "1", "unit": "ms"},
            },
        }
    )
    assert out.startswith(CALCULATIONS["motion"].TITLE)
    assert "Particle diameter" in out and "1 nm" in out  # the inputs, as given
    assert reply["warnings"]
    flat = " ".join(out.split())
    for warning in reply["warnings"]:
        assert " ".join(warning.split()) in flat
    for source in reply["sources"]:
        assert " ".join(source["citation"].split()) in flat


def test_module_motion_equals_in_process(capsys):
    """``python -m driftdose`` in a new process prints what main() prints."""
    code, out, _ = run_main(capsys, "motion", *MOTION_FLAGS)
    done = run_module("motion", *MOTION_FLAGS)
    assert done.returncode == code == 0, done.stderr
    assert done.stdout == out
    assert done.stderr == ""


@pytest.mark.parametrize(
    "flags",
    [
        pytest.param(["--particle-diameter", "100nm"], id="suffix"),
        pytest.param(["--particle-diameter", "100 nm"], id="suffix-with-space"),
        pytest.param(["--particle-diameter", "100", "--particle-diameter-unit", "nm"], id="flag"),
        pytest.param(["--particle-diameter", "100"], id="default-unit-nm"),
        pytest.param(["--particle-diameter=0.1µm"], id="micro-sign"),
        pytest.param(["--particle-diameter", "0,1 um"], id="decimal-comma"),
        pytest.param(["--particle-diameter", "1e-7m"], id="exponent-metres"),
        pytest.param(["--particle-diameter-unit", "nm"], id="unit-only-keeps-default"),
    ],
)
def test_main_unit_flags_reach_same_si_value(capsys, flags):
    code, out, err = run_main(capsys, "motion", *flags, "--format", "json")
    assert code == 0, err
    reply = json.loads(out)
    si = reply["results"]["volume_equivalent_diameter"]["si"]
    assert si == pytest.approx(100e-9, rel=1e-12)


@pytest.mark.parametrize(
    ("flags", "inputs"),
    [
        pytest.param(
            ["--temperature", "-10degC"],
            {"temperature": {"value": "-10", "unit": "degC"}},
            id="negative-after-flag",
        ),
        pytest.param(
            ["--temperature", "263.15 K"],
            {"temperature": {"value": "263.15", "unit": "K"}},
            id="kelvin",
        ),
        pytest.param(["--pressure", "1atm"], {"pressure": {"value": "1", "unit": "atm"}}, id="atm"),
        pytest.param(
            ["--time", "2", "--time-unit", "h"], {"time": {"value": "2", "unit": "h"}}, id="hours"
        ),
        pytest.param(["--time", "2"], {"time": {"value": "2", "unit": "s"}}, id="default-unit-s"),
    ],
)
def test_main_units_are_passed_to_api(capsys, flags, inputs):
    code, out, err = run_main(capsys, "motion", *flags, "--format", "json")
    assert code == 0, err
    assert json.loads(out) == api.handle({"kind": "motion", "inputs": inputs})


def test_main_unit_given_twice_is_refused(capsys):
    code, out, err = run_main(
        capsys, "motion", "--particle-diameter", "100nm", "--particle-diameter-unit", "um"
    )
    assert code == 2
    assert out == ""
    assert err.startswith("particle_diameter: unit given twice")


@pytest.mark.parametrize(
    ("flags", "field", "words"),
    [
        pytest.param(
            ["--particle-diameter", "5mm"], "particle_diameter", "0.5 nm to 1 mm", id="range"
        ),
        pytest.param(
            ["--particle-diameter", "abc"], "particle_diameter", "number", id="not-number"
        ),
        pytest.param(
            ["--particle-diameter", "3 furlong"], "particle_diameter", "unknown unit", id="unit"
        ),
        pytest.param(["--temperature", "-60degC"], "temperature", "-50 °C", id="temperature"),
        pytest.param(["--diameter-type", "round"], "diameter_type", "invalid choice", id="choice"),
        pytest.param(["--time"], "time", "expected one argument", id="missing-value"),
    ],
)
def test_main_invalid_input_exits_2_with_field_message(capsys, flags, field, words):
    code, out, err = run_main(capsys, "motion", *flags)
    assert code == 2
    assert out == ""
    assert err.startswith(f"{field}: ")
    assert words in err
    assert "Traceback" not in err


def test_main_several_invalid_fields_each_reported(capsys):
    code, _, err = run_main(
        capsys, "motion", "--particle-diameter", "0", "--pressure", "1 kPa", "--time", "x"
    )
    assert code == 2
    fields = [line.split(":")[0] for line in err.splitlines()]
    assert fields == ["particle_diameter", "pressure", "time"]
    reply = api.handle(
        {
            "kind": "motion",
            "inputs": {
                "particle_diameter": {"value": "0", "unit": "nm"},
                "pressure": {"value": "1", "unit": "kPa"},
                "time": {"value": "x", "unit": "s"},
            },
        }
    )
    assert err.splitlines() == [f"{e['field']}: {e['message']}" for e in reply["errors"]]


@pytest.mark.parametrize(
    "argv",
    [
        pytest.param(["motion", "--particle-diameter", "-5nm"], id="negative-size"),
        pytest.param(["motion", "--input", "no-such-file.json"], id="missing-file"),
        pytest.param(["motion", "--nonsense"], id="unknown-flag"),
        pytest.param(["nonsense"], id="unknown-command"),
        pytest.param([], id="no-command"),
        pytest.param(["batch", "deposition", "--spectra", "no-such.csv"], id="batch-missing"),
        pytest.param(["motion", "--out", "/no/such/dir/x.txt"], id="unwritable-out"),
    ],
)
def test_module_user_errors_exit_2_without_traceback(argv):
    done = run_module(*argv)
    assert done.returncode == 2, done.stderr
    assert "Traceback" not in done.stderr
    assert done.stderr.strip()


# --- inputs from JSON files --------------------------------------------------------------------


def test_main_input_request_file_equals_api(capsys, tmp_path):
    path = tmp_path / "request.json"
    path.write_text(json.dumps({"kind": "motion", "inputs": MOTION_INPUTS}), encoding="utf-8")
    code, out, err = run_main(capsys, "motion", "--input", str(path), "--format", "json")
    assert code == 0, err
    assert json.loads(out) == api.handle({"kind": "motion", "inputs": MOTION_INPUTS})


def test_main_input_saved_page_state(capsys, tmp_path):
    """The JSON file the page's "save inputs" writes: several panels, one open."""
    state = {
        "format": "drift-and-dose-inputs",
        "version": 1,
        "tool_version": "0.1.0",
        "saved": "2026-12-02T10:00:00.000Z",
        "panel": "motion",
        "panels": {
            "motion": MOTION_INPUTS,
            "deposition": {"exposure_duration": {"value": "4", "unit": "h"}},
        },
    }
    path = tmp_path / "state.json"
    path.write_text(json.dumps(state), encoding="utf-8")
    expected = api.handle({"kind": "motion", "inputs": MOTION_INPUTS})
    code, out, err = run_main(capsys, "motion", "--input", str(path), "--format", "json")
    assert code == 0, err
    assert json.loads(out) == expected
    code, out, err = run_main(capsys, "run", str(path), "--format", "json")
    assert code == 0, err
    assert json.loads(out) == expected
    code, out, err = run_main(capsys, "run", str(path), "--kind", "deposition", "--format", "json")
    assert code == 0, err
    deposition = api.handle(
        {"kind": "deposition", "inputs": {"exposure_duration": {"value": "4", "unit": "h"}}}
    )
    assert json.loads(out) == deposition


def test_main_flags_override_input_file_and_keep_its_unit(capsys, tmp_path):
    path = tmp_path / "request.json"
    path.write_text(json.dumps({"inputs": MOTION_INPUTS}), encoding="utf-8")
    code, out, err = run_main(
        capsys, "motion", "--input", str(path), "--particle-diameter", "4", "--format", "json"
    )
    assert code == 0, err
    inputs = {**MOTION_INPUTS, "particle_diameter": {"value": "4", "unit": "um"}}
    assert json.loads(out) == api.handle({"kind": "motion", "inputs": inputs})


@pytest.mark.parametrize(
    ("content", "field", "words"),
    [
        pytest.param(
            '{"kind": "deposition", "inputs": {}}', "kind", "'deposition'", id="other-kind"
        ),
        pytest.param("{not json", "input", "not valid JSON (line 1", id="bad-json"),
        pytest.param("[1, 2]", "input", "JSON object", id="not-object"),
        pytest.param('{"inputs": 3}', "inputs", "object of named fields", id="inputs-not-object"),
        pytest.param(
            '{"inputs": {"particle_diameter": {"value": "2", "unit": "parsec"}}}',
            "particle_diameter",
            "unknown unit",
            id="api-validates-file",
        ),
    ],
)
def test_main_bad_input_file_exits_2(capsys, tmp_path, content, field, words):
    path = tmp_path / "request.json"
    path.write_text(content, encoding="utf-8")
    code, out, err = run_main(capsys, "motion", "--input", str(path))
    assert code == 2
    assert out == ""
    assert err.startswith(f"{field}: ")
    assert words in err


def test_main_unknown_input_names_are_noted(capsys, tmp_path):
    path = tmp_path / "request.json"
    path.write_text(json.dumps({"inputs": {"diameter": "5"}}), encoding="utf-8")
    code, _, err = run_main(capsys, "motion", "--input", str(path), "--format", "json")
    assert code == 0
    assert "no input 'diameter'" in err


def test_main_input_from_standard_input(monkeypatch, capsys):
    text = json.dumps({"kind": "motion", "inputs": MOTION_INPUTS})
    monkeypatch.setattr(sys, "stdin", types.SimpleNamespace(buffer=io.BytesIO(text.encode())))
    code, out, _ = run_main(capsys, "motion", "--input", "-", "--format", "json")
    assert code == 0
    assert json.loads(out) == api.handle({"kind": "motion", "inputs": MOTION_INPUTS})


# --- output formats ----------------------------------------------------------------------------


def test_main_csv_equals_page_export(capsys):
    """--format csv writes the page's "results (CSV)" export of the same reply."""
    code, out, err = run_main(capsys, "motion", *MOTION_FLAGS, "--format", "csv")
    assert code == 0, err
    reply = api.handle({"kind": "motion", "inputs": MOTION_INPUTS})
    assert out == export.results_csv(reply)
    rows = list(csv.reader(io.StringIO(out)))
    assert rows[0][:4] == ["quantity", "symbol", "value", "unit"]
    by_label = {r[0]: r for r in rows[1:]}
    for row in reply["results"].values():
        if "value" in row:
            assert float(by_label[row["label"]][2]) == row["value"]
            assert by_label[row["label"]][3] == UNIT_TABLE[row["unit"]]["text"]


def test_main_json_is_full_reply(capsys):
    code, out, _ = run_main(capsys, "motion", *MOTION_FLAGS, "--format", "json")
    assert code == 0
    assert json.loads(out) == api.handle({"kind": "motion", "inputs": MOTION_INPUTS})


def test_main_curves_csv_names_quantities_and_units(capsys, tmp_path):
    path = tmp_path / "curves.csv"
    out_path = tmp_path / "results.txt"
    code, out, err = run_main(
        capsys, "motion", *MOTION_FLAGS, "--curves", str(path), "--out", str(out_path)
    )
    assert code == 0, err
    assert out == ""
    reply = api.handle({"kind": "motion", "inputs": MOTION_INPUTS})
    text = path.read_bytes().decode("utf-8")
    assert text == export.curves_csv(reply)  # the page's "curves (CSV)" export, byte for byte
    rows = list(csv.reader(io.StringIO(text)))
    c = reply["curves"]
    assert rows[0] == [
        "curve",
        f"{c['x_label']} [{unit_label(c['x_unit'])}]",  # the reply's unit codes, labelled
        f"{c['y_label']} [{unit_label(c['y_unit'])}]",
    ]
    brownian = [r for r in rows[1:] if r[0] == c["brownian"]["label"]]
    assert [float(r[1]) for r in brownian] == export.curve_x(c, c["brownian"])
    assert [float(r[2]) for r in brownian] == c["brownian"]["y"]
    assert out_path.read_text(encoding="utf-8").startswith(CALCULATIONS["motion"].TITLE)


def test_main_digits_zero_prints_full_precision(capsys):
    code, out, _ = run_main(capsys, "motion", *MOTION_FLAGS, "--digits", "0")
    assert code == 0
    reply = api.handle({"kind": "motion", "inputs": MOTION_INPUTS})
    row = reply["results"]["air_viscosity"]
    assert table_rows(out)[shown_label(row)][0] == repr(row["value"])


# --- describe, help, version -----------------------------------------------------------------


def test_main_describe_lists_every_calculation_and_field(capsys):
    code, out, _ = run_main(capsys, "describe")
    assert code == 0
    description = api.describe()
    for kind, calc in description["calculations"].items():
        assert f"{kind}: {calc['title']}" in out
        for fd in calc["fields"]:
            flag = f"--{fd['name'].replace('_', '-')}"
            assert re.search(rf"^  {flag}( \(or --\S+\))?  \({fd['name']}, ", out, re.M)
            if fd.get("range"):
                assert fd["range"] in " ".join(out.split())

    assert "--csv-text (or --spectrum)  (csv_text, data)" in out


def test_main_describe_json_equals_api(capsys):
    code, out, _ = run_main(capsys, "describe", "--format", "json")
    assert code == 0
    assert json.loads(out) == api.describe()
    code, out, _ = run_main(capsys, "describe", "motion", "--format", "json")
    assert list(json.loads(out)["calculations"]) == ["motion"]


def test_main_every_calculation_has_subcommand_with_title(capsys):
    code, out, _ = run_main(capsys, "--help")
    assert code == 0
    flat = " ".join(out.split())
    for kind, calc in CALCULATIONS.items():
        assert kind in out
        assert " ".join(calc.TITLE.split()) in flat
        code, sub_help, _ = run_main(capsys, kind, "--help")
        assert code == 0
        for f in calc.FIELDS:
            flag = "--" + f.name.replace("_", "-")
            if f.extra.get("bookkeeping"):  # the page's own: accepted, not listed
                assert flag not in sub_help
                continue
            assert flag in sub_help
            for value, _label in f.choices:
                assert value in sub_help


def test_page_bookkeeping_field_is_accepted_but_not_listed(capsys, tmp_path):
    """The shift panel's series_drawn (keys of the series the page keeps drawn) is no input:
    not in --help, yet a request carrying it (as saved from the page) still runs."""
    code, sub_help, _ = run_main(capsys, "shift", "--help")
    assert code == 0 and "--series-drawn" not in sub_help and "series_drawn" not in sub_help
    log = tmp_path / "log.csv"
    log.write_text(INVENTED_LOG, encoding="utf-8")
    args = ["shift", "--series-text", str(log), "--format", "json"]
    code, plain, _ = run_main(capsys, *args)
    assert code == 0
    code, held, _ = run_main(capsys, *args, "--series-drawn", "0" * 32)
    assert code == 0
    assert json.loads(held)["results"] == json.loads(plain)["results"]


# A calculation on a logged file has no default file: the file is the user's measurement.
# Without one its command names the missing file; with a small invented one it runs.
NEEDS_FILE = {"shift": "series_text"}
INVENTED_LOG = "time,number [1/cm3]\n" + "".join(
    f"2026-03-05T08:{m:02d}:00,{1000 + 10 * m}\n" for m in range(60)
)


def _file_flags(kind: str, tmp_path) -> list[str]:
    if kind not in NEEDS_FILE:
        return []
    path = tmp_path / f"{kind}-log.csv"
    path.write_text(INVENTED_LOG, encoding="utf-8")
    return ["--" + NEEDS_FILE[kind].replace("_", "-"), str(path)]


def test_main_every_calculation_runs_with_defaults(capsys, tmp_path):
    for kind in CALCULATIONS:
        code, out, err = run_main(capsys, kind, "--format", "json")
        if kind in NEEDS_FILE:
            assert code == 2 and NEEDS_FILE[kind] in err, (kind, err)
            flags = _file_flags(kind, tmp_path)
            code, out, err = run_main(capsys, kind, "--format", "json", *flags)
            assert code == 0, (kind, err)
            data = INVENTED_LOG.encode("utf-8")
            # the file's name and SHA-256 are recorded beside its text, as the page does
            record = {
                "name": f"{kind}-log.csv",
                "sha256": hashlib.sha256(data).hexdigest(),
                "bytes": len(data),
            }
            inputs = {NEEDS_FILE[kind]: INVENTED_LOG, "series_file": record}
            assert json.loads(out) == api.handle({"kind": kind, "inputs": inputs})
            assert json.loads(out)["results"]["import"]["file"] == record
            continue
        assert code == 0, (kind, err)
        assert json.loads(out) == api.handle({"kind": kind, "inputs": {}})


@pytest.mark.parametrize("fmt", ["table", "csv", "json"])
def test_main_every_calculation_every_format(capsys, tmp_path, fmt):
    """Every registered calculation prints in every format and writes its curves, no crash."""
    for kind in CALCULATIONS:
        curves = tmp_path / f"{kind}-{fmt}.csv"
        flags = _file_flags(kind, tmp_path)
        code, out, err = run_main(capsys, kind, "--format", fmt, "--curves", str(curves), *flags)
        assert code == 0, (kind, err)
        assert out.strip()
        assert "Traceback" not in err
        assert curves.read_text(encoding="utf-8").strip()
        if fmt == "csv":
            assert out.startswith("quantity,")


def test_main_version(capsys):
    code, out, _ = run_main(capsys, "--version")
    assert code == 0
    assert api.describe()["version"] in out


# --- generic over the registry: a calculation added later gets its subcommand -----------------


def _fake_calculation() -> types.ModuleType:
    mod = types.ModuleType("fake")
    mod.TITLE = "A test calculation with every kind of field"
    mod.FIELDS = (
        Field("length", "Length", "length", (1.0, "mm"), ("mm", "um"), minimum=0.0, maximum=1.0),
        Field("count", "Count", "integer", 3, minimum=1, maximum=10),
        Field("colour", "Colour", "choice", "red", choices=(("red", "Red"), ("blue", "Blue"))),
        Field("note", "Note", "text", "", required=False, extra={"max_length": 50}),
        Field("table", "Table", "data", [1, 2], required=False),
        Field("format", "A field named like an option", "dimensionless", (2.0, "1"), ("1",)),
    )

    def run(v):
        if v["count"] == 7:
            raise FieldError("count", "Seven is not allowed here.")
        return {
            "results": {
                "sum": {
                    "label": "Sum",
                    "symbol": "",
                    "value": v["length"] * 1000 * v["count"]
                    + (sum(v["table"]) if isinstance(v["table"], list) else 0)
                    + v["format"],
                    "unit": "mm",
                    "si": 0.0,
                    "si_unit": "m",
                    "note": "",
                },
                "words": {"label": "Words", "text": f"{v['colour']} {v['note'] or ''}".strip()},
                "table": {"label": "Table", "text": json.dumps(v["table"], sort_keys=True)},
            },
            "curves": {},
            "warnings": [],
            "sources": [],
        }

    mod.run = run
    return mod


def test_main_new_calculation_gets_subcommand_and_flags(capsys, monkeypatch, tmp_path):
    monkeypatch.setitem(CALCULATIONS, "fake", _fake_calculation())
    table = tmp_path / "table.json"
    table.write_text("[10, 20]", encoding="utf-8")
    note = tmp_path / "note.txt"
    note.write_text("from a file", encoding="utf-8")
    code, out, err = run_main(
        capsys,
        "fake",
        "--length",
        "500um",
        "--count",
        "2",
        "--colour",
        "blue",
        "--note",
        f"@{note}",
        "--table",
        f"@{table}",
        "--field-format",
        "3",
        "--format",
        "json",
    )
    assert code == 0, err
    results = json.loads(out)["results"]
    assert results["sum"]["value"] == pytest.approx(0.5 * 2 + 30 + 3)
    assert results["words"]["text"] == "blue from a file"

    code, out, err = run_main(capsys, "fake", "--table", "[1, 2, 3]", "--note", "plain")
    assert code == 0, err
    rows = table_rows(out)
    assert rows["Sum"] == ("11", "mm")  # 1 mm x 3 + (1 + 2 + 3) + 2
    assert rows["Words"][0] == "red plain"


@pytest.mark.parametrize(
    ("flags", "field", "words"),
    [
        pytest.param(["--count", "2.5"], "count", "whole number", id="integer"),
        pytest.param(["--count", "7"], "count", "Seven", id="run-raises-field-error"),
        pytest.param(["--table", "[1,"], "table", "not valid JSON", id="data-json"),
        pytest.param(["--table", "@missing.json"], "table", "cannot read", id="data-file"),
        pytest.param(["--note", "x" * 60], "note", "at most 50", id="text-length"),
        pytest.param(["--colour", "green"], "colour", "invalid choice", id="choice"),
    ],
)
def test_main_new_calculation_errors_name_field(capsys, monkeypatch, flags, field, words):
    monkeypatch.setitem(CALCULATIONS, "fake", _fake_calculation())
    code, out, err = run_main(capsys, "fake", *flags)
    assert code == 2
    assert out == ""
    assert err.startswith(f"{field}: ")
    assert words in err


# --- deposition: spectrum files and batch ------------------------------------------------------


def _spectrum(tmp_path: Path, name: str, scale: float) -> Path:
    """An invented spectrum (the api's own invented demo, concentrations scaled)."""
    lines = []
    for line in _DEMO_CSV.splitlines():
        if line and line[0].isdigit():
            d, n = line.split(";")
            line = f"{d};{float(n) * scale:g}"
        lines.append(line)
    path = tmp_path / name
    path.write_text("\n".join(lines) + "\n", encoding="utf-8")
    return path


def _deposition_inputs(path: Path) -> dict:
    return {
        "size_source": "csv",
        "csv_text": path.read_text(encoding="utf-8"),
        "csv_diameter_column": "diameter_nm",
        "csv_concentration_column": "dN/dlogDp_per_cm3",
    }


def test_main_deposition_spectrum_file_equals_api(capsys, tmp_path):
    path = _spectrum(tmp_path, "a.csv", 1.0)
    code, out, err = run_main(
        capsys, "deposition", "--spectrum", str(path), *SPECTRUM_FLAGS, "--format", "json"
    )
    assert code == 0, err
    expected = api.handle({"kind": "deposition", "inputs": _deposition_inputs(path)})
    assert expected["ok"]
    assert json.loads(out) == expected
    # the field's own flag, with @, gives the same
    code, out2, _ = run_main(
        capsys, "deposition", "--csv-text", f"@{path}", *SPECTRUM_FLAGS, "--format", "json"
    )
    assert code == 0
    assert out2 == out


def test_main_deposition_table_numbers_equal_page(capsys, tmp_path):
    path = _spectrum(tmp_path, "a.csv", 1.0)
    code, out, err = run_main(capsys, "deposition", "--spectrum", str(path), *SPECTRUM_FLAGS)
    assert code == 0, err
    reply = api.handle({"kind": "deposition", "inputs": _deposition_inputs(path)})
    rows = table_rows(out)
    numeric = [r for r in reply["results"].values() if "value" in r]
    for row, page_text in zip(numeric, page_format([r["value"] for r in numeric]), strict=True):
        label = shown_label(row)
        if label not in rows:  # a label with a combining mark shifts the columns by one
            continue
        assert rows[label][0] == page_text, label
    assert sum(shown_label(r) in rows for r in numeric) >= 50
    assert f"from {path}" in out


def test_main_deposition_modes_as_json(capsys, tmp_path):
    modes = [
        {
            "basis": "mass",
            "median": {"value": 5, "unit": "um"},
            "gsd": 2.0,
            "concentration": {"value": 1, "unit": "mg/m3"},
        }
    ]
    path = tmp_path / "modes.json"
    path.write_text(json.dumps(modes), encoding="utf-8")
    expected = api.handle({"kind": "deposition", "inputs": {"modes": modes}})
    for value in (json.dumps(modes), f"@{path}"):
        code, out, err = run_main(capsys, "deposition", "--modes", value, "--format", "json")
        assert code == 0, err
        assert json.loads(out) == expected


def test_main_deposition_bad_spectrum_gives_line_number(capsys, tmp_path):
    path = tmp_path / "bad.csv"
    path.write_text("diameter_nm;n\n10;5\n20;abc\n", encoding="utf-8")
    code, out, err = run_main(capsys, "deposition", "--spectrum", str(path))
    assert code == 2
    assert out == ""
    assert err.startswith("csv_text: Line 3")


def test_main_spectrum_file_read_as_page_reads_it(capsys, tmp_path):
    """A BOM is dropped and undecodable bytes replaced, as the browser's File.text() does
    (WHATWG Encoding, "UTF-8 decode"), so the api gets the text the page would send.
    """
    plain = _spectrum(tmp_path, "plain.csv", 1.0).read_text(encoding="utf-8")
    path = tmp_path / "bom.csv"
    path.write_bytes(b"\xef\xbb\xbf# size \xb5m\n" + plain.encode("utf-8"))
    code, out, err = run_main(
        capsys, "deposition", "--spectrum", str(path), *SPECTRUM_FLAGS, "--format", "json"
    )
    assert code == 0, err
    inputs = {**_deposition_inputs(tmp_path / "plain.csv"), "csv_text": "# size \ufffdm\n" + plain}
    assert json.loads(out) == api.handle({"kind": "deposition", "inputs": inputs})


def test_main_spectrum_file_over_limit_refused(capsys, tmp_path):
    path = tmp_path / "big.csv"
    path.write_bytes(b"10;1\n" * 1_300_000)  # 6.5 MB, over the field's 5 MB
    code, out, err = run_main(capsys, "deposition", "--spectrum", str(path))
    assert code == 2
    assert out == ""
    assert err.startswith("csv_text: ") and "the limit is 5 MB" in err


def test_main_batch_deposition_one_row_per_file(capsys, tmp_path):
    files = [_spectrum(tmp_path, f"{n}.csv", s) for n, s in (("a", 1.0), ("b", 2.5), ("c", 0.1))]
    out_path = tmp_path / "table.csv"
    code, out, err = run_main(
        capsys,
        "batch",
        "deposition",
        "--spectra",
        *map(str, files),
        *SPECTRUM_FLAGS,
        "--exposure-duration",
        "4h",
        "--out",
        str(out_path),
    )
    assert code == 0, err
    assert out == ""
    rows = list(csv.reader(io.StringIO(out_path.read_text(encoding="utf-8"))))
    header, body = rows[0], rows[1:]
    assert [r[0] for r in body] == [str(f) for f in files]
    assert header[0] == "file" and header[-2:] == ["warnings", "errors"]
    for path, line in zip(files, body, strict=True):
        inputs = {**_deposition_inputs(path), "exposure_duration": {"value": "4", "unit": "h"}}
        reply = api.handle({"kind": "deposition", "inputs": inputs})
        assert reply["ok"]
        cells = dict(zip(header, line, strict=True))
        for region in ("ET1", "ET2", "BB", "bb", "AI", "total"):
            for metric in ("number", "surface", "mass"):
                row = reply["results"][f"dose_{region}_{metric}"]
                column = f"{row['label']} [{UNIT_TABLE[row['unit']]['text']}]"
                assert float(cells[column]) == row["value"], column  # full precision
        assert cells["errors"] == ""
    units = " ".join(header)
    assert "[particles]" in units and "[mm²]" in units and "[µg]" in units


def test_main_batch_columns_filter_and_table_format(capsys, tmp_path):
    files = [_spectrum(tmp_path, f"{n}.csv", s) for n, s in (("a", 1.0), ("b", 3.0))]
    code, out, err = run_main(
        capsys,
        "batch",
        "deposition",
        "--spectra",
        *map(str, files),
        *SPECTRUM_FLAGS,
        "--columns",
        "dose_AI_*",
        "--format",
        "csv",
    )
    assert code == 0, err
    rows = list(csv.reader(io.StringIO(out)))
    assert len(rows[0]) == 1 + 3 + 2
    assert all("AI" in h for h in rows[0][1:4])
    code, out, err = run_main(
        capsys,
        "batch",
        "deposition",
        "--spectra",
        *map(str, files),
        *SPECTRUM_FLAGS,
        "--columns",
        "dose_AI_mass",
        "--format",
        "table",
    )
    assert code == 0, err
    reply = api.handle({"kind": "deposition", "inputs": _deposition_inputs(files[1])})
    value = reply["results"]["dose_AI_mass"]["value"]
    line = out.splitlines()[2]
    assert line.split()[0] == str(files[1])
    assert line.split()[1] == page_format([value])[0]


def test_main_batch_bad_file_keeps_row_and_exits_2(capsys, tmp_path):
    good = _spectrum(tmp_path, "good.csv", 1.0)
    bad = tmp_path / "bad.csv"
    bad.write_bytes(b"\x00\x01\x02binary")
    code, out, err = run_main(
        capsys, "batch", "deposition", "--spectra", str(good), str(bad), *SPECTRUM_FLAGS
    )
    assert code == 2
    rows = list(csv.reader(io.StringIO(out)))
    assert [r[0] for r in rows[1:]] == [str(good), str(bad)]
    assert rows[1][-1] == ""
    assert rows[2][-1].startswith("csv_text: ") and "binary" in rows[2][-1]
    assert err.startswith(f"{bad}: csv_text: ")
    assert "Traceback" not in err


@pytest.mark.parametrize("flag", ["--size-source", "--distribution-source"])
def test_main_batch_refuses_other_size_source(capsys, tmp_path, flag):
    # --distribution-source is the field's former name: still accepted, not listed in --help
    good = _spectrum(tmp_path, "good.csv", 1.0)
    code, _, err = run_main(
        capsys,
        "batch",
        "deposition",
        "--spectra",
        str(good),
        flag,
        "lognormal",
    )
    assert code == 2
    assert err.startswith("size_source: ")


def test_module_batch_deposition(tmp_path):
    """The batch mode in a new process, with relative file names."""
    for name, scale in (("a", 1.0), ("b", 2.0)):
        _spectrum(tmp_path, f"{name}.csv", scale)
    done = run_module(
        "batch",
        "deposition",
        "--spectra",
        "a.csv",
        "b.csv",
        *SPECTRUM_FLAGS,
        "--out",
        "doses.csv",
        cwd=tmp_path,
    )
    assert done.returncode == 0, done.stderr
    rows = list(csv.reader(io.StringIO((tmp_path / "doses.csv").read_text(encoding="utf-8"))))
    assert [r[0] for r in rows[1:]] == ["a.csv", "b.csv"]
    col = next(i for i, h in enumerate(rows[0]) if h.startswith("Total: mass deposited"))
    assert float(rows[2][col]) == pytest.approx(2 * float(rows[1][col]), rel=1e-9)


# --- a data field given as KEY=VALUE pairs with a file (sampling's spectrum) -----------------


def test_main_sampling_spectrum_file_equals_api(capsys, tmp_path):
    path = _spectrum(tmp_path, "a.csv", 1.0)
    argv = ["sampling", "--spectrum", str(path), *SPECTRUM_FLAGS, "--target", "thoracic"]
    code, out, err = run_main(capsys, *argv, "--format", "json")
    assert code == 0, err
    inputs = {
        "size_source": "csv",
        "csv_text": path.read_text(encoding="utf-8"),
        "csv_diameter_column": "diameter_nm",
        "csv_concentration_column": "dN/dlogDp_per_cm3",
        "target": "thoracic",
    }
    expected = api.handle({"kind": "sampling", "inputs": inputs})
    assert expected["ok"]
    assert json.loads(out) == expected


def test_main_batch_sampling_is_offered_too(capsys, tmp_path):
    """Batch comes with any calculation that has a file input, not only deposition."""
    files = [_spectrum(tmp_path, f"{n}.csv", s) for n, s in (("a", 1.0), ("b", 2.0))]
    code, out, err = run_main(
        capsys, "batch", "sampling", "--spectra", *map(str, files), *SPECTRUM_FLAGS
    )
    assert code == 0, err
    rows = list(csv.reader(io.StringIO(out)))
    assert [r[0] for r in rows[1:]] == [str(f) for f in files]
    reply = api.handle(
        {"kind": "sampling", "inputs": _deposition_inputs(files[0]) | {"size_source": "csv"}}
    )
    header = rows[0]
    for key, row in reply["results"].items():
        if "value" in row:
            label = row["label"] + (f" ({row['note']})" if row.get("note") else "")
            column = header.index(f"{label} [{unit_label(row['unit'])}]".replace(" [–]", ""))
            assert float(rows[1][column]) == row["value"], key


def test_main_pairs_read_json_values(capsys, monkeypatch, tmp_path):
    monkeypatch.setitem(CALCULATIONS, "fake", _fake_calculation())
    note = tmp_path / "note.csv"
    note.write_bytes(b"\xef\xbb\xbfa;b\n1;2\n")
    code, out, err = run_main(
        capsys, "fake", "--table", "a=[1, 2]", "b=x", "c=2.5", f"d=@{note}", "--format", "json"
    )
    assert code == 0, err
    table = json.loads(json.loads(out)["results"]["table"]["text"])
    assert table == {"a": [1, 2], "b": "x", "c": 2.5, "d": "a;b\n1;2\n"}
    code, _, err = run_main(capsys, "fake", "--table", "a=1", "not a pair")
    assert code == 2
    assert err.startswith("table: give one JSON text")


def test_main_table_shows_results_that_are_tables(capsys, tmp_path):
    """Results shaped as tables (sampling's stages and spectrum) appear in the table format,
    each number as the page formats it.
    """
    path = _spectrum(tmp_path, "a.csv", 1.0)
    argv = ["sampling", "--spectrum", str(path), *SPECTRUM_FLAGS]
    code, out, err = run_main(capsys, *argv)
    assert code == 0, err
    reply = json.loads(run_main(capsys, *argv, "--format", "json")[1])
    tables = [v for v in reply["results"].values() if isinstance(v.get("rows"), list)]
    assert len(tables) >= 2
    lines = out.splitlines()
    numbers = [
        x
        for table in tables
        for row in table["rows"]
        for v in row.values()
        for x in (
            [r.get("value") for r in v if isinstance(r, dict)] if isinstance(v, list) else [v]
        )
        if isinstance(x, int | float) and not isinstance(x, bool)
    ]
    text = dict(zip(numbers, page_format(numbers), strict=True))  # one call to Node
    checked = 0
    for table in tables:
        start = next(i for i, line in enumerate(lines) if line.strip() == table["label"])
        block = lines[start : start + 200]
        for row in table["rows"]:
            nested = [r for v in row.values() if isinstance(v, list) for r in v]
            quantities = [r for r in nested if isinstance(r, dict) and "value" in r]
            if quantities:  # groups of result rows: label then the page's number
                for q in quantities:
                    shown = text[q["value"]]
                    assert any(q["label"] in line and shown in line.split() for line in block)
                    checked += 1
        plain = [r for r in table["rows"] if not any(isinstance(v, list) for v in r.values())]
        if plain:  # a table of plain values: a header of keys, then one line per row
            keys = list(plain[0])
            head = next(
                i for i, line in enumerate(block) if all(k.replace("_", " ") in line for k in keys)
            )
            for row, line in zip(plain, block[head + 1 :], strict=False):
                cells = line.split()
                for k, cell in zip(keys, cells, strict=True):
                    if isinstance(row[k], float):
                        assert cell == text[row[k]], k
                        checked += 1
    assert checked >= 30


def test_main_csv_writes_tables_as_blocks_after_the_rows(capsys):
    code, out, _err = run_main(capsys, "sampling", "--format", "csv")
    assert code == 0
    reply = api.handle({"kind": "sampling", "inputs": {}})
    row_keys = [k for k, v in reply["results"].items() if "value" in v or "text" in v]
    tables = [v for v in reply["results"].values() if isinstance(v.get("rows"), list)]
    rows = list(csv.reader(io.StringIO(out)))
    assert rows[len(row_keys) + 1] == []  # the rows end with an empty line
    assert len(rows) > 1 + len(row_keys)
    for table in tables:
        assert [table["label"]] in rows
    assert out == export.results_csv(reply)


# --- packaging -----------------------------------------------------------------------------


def test_cli_imports_without_numpy_or_scipy():
    code = (
        "import sys; sys.modules['numpy'] = None; sys.modules['scipy'] = None\n"
        "import driftdose.cli, driftdose.__main__\n"
        "print(sorted(m for m in sys.modules if m.split('.')[0] in ('numpy', 'scipy')"
        " and sys.modules[m] is not None))"
    )
    env = {**os.environ, "PYTHONPATH": str(ROOT / "pycore")}
    done = subprocess.run(
        [sys.executable, "-c", code], capture_output=True, text=True, env=env, timeout=60
    )
    assert done.returncode == 0, done.stderr
    assert done.stdout.strip() == "[]"


def test_console_script_when_installed():
    script = Path(sys.executable).with_name("driftdose")
    if not script.exists():
        pytest.skip("the package is not installed in this environment")
    done = subprocess.run(
        [str(script), "motion", "--format", "json"], capture_output=True, text=True, timeout=60
    )
    assert done.returncode == 0, done.stderr
    assert math.isclose(
        json.loads(done.stdout)["results"]["volume_equivalent_diameter"]["si"], 100e-9
    )


def test_modes_as_key_value_pairs_work_as_the_readme_says(capsys):
    """``--modes basis=count median=30nm gsd=1.6 concentration=1e5`` is one count mode, the
    same request as its JSON form; a repeated key starts a second mode."""
    code, out, err = run_main(
        capsys,
        "deposition",
        "--format",
        "json",
        "--modes",
        "basis=count",
        "median=30nm",
        "gsd=1.6",
        "concentration=1e5",
    )
    assert code == 0, err
    pairs = json.loads(out)
    code, out, err = run_main(
        capsys,
        "deposition",
        "--format",
        "json",
        "--modes",
        '[{"basis": "count", "median": {"value": "30", "unit": "nm"}, "gsd": "1.6",'
        ' "concentration": {"value": "1e5", "unit": "1/cm3"},'
        ' "diameter_type": "volume_equivalent"}]',
    )
    assert code == 0, err
    assert pairs["results"] == json.loads(out)["results"]
    # 1e5 in the default mode's unit (1/cm3): 1e5 per cm3, by definition of the input
    number = pairs["results"]["number_concentration"]
    assert number["si"] == pytest.approx(1e11, rel=1e-12)

    code, out, err = run_main(
        capsys,
        "deposition",
        "--modes",
        "basis=count",
        "median=30nm",
        "gsd=1.6",
        "concentration=1e5",
        "basis=mass",
        "median=5um",
        "gsd=2",
        "concentration=1mg/m3",
    )
    assert code == 0, err
    assert re.search(
        r"Mode 1\s+basis: count; median: 30 nm;.*gsd: 1\.6; concentration: 1e5 1/cm³", out
    )
    assert re.search(r"Mode 2\s+basis: mass; median: 5 µm;.*concentration: 1 mg/m³", out)


def test_table_leaves_out_inputs_that_do_not_apply(capsys):
    """Lognormal modes: no spectrum columns; reference worker: no custom breathing inputs.
    A spectrum: its columns, and no modes."""
    code, out, err = run_main(capsys, "deposition")
    assert code == 0, err
    inputs = out.split("Results")[0]
    for absent in ("Spectrum CSV file", "Diameter column", "Tidal volume", "Activity level"):
        assert absent not in inputs, absent
    assert re.search(r"Mode 1\s+basis: count; median: 50 nm", inputs)
    assert "Breathing route" in inputs
    code, out, err = run_main(capsys, "deposition", "--breathing", "custom")
    assert code == 0, err
    inputs = out.split("Results")[0]
    assert "Tidal volume" in inputs and "Breathing route" not in inputs
