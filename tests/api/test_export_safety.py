"""CSV exports never carry a spreadsheet formula: every text cell that begins with ``=``,
``+``, ``-``, ``@``, a tab or a carriage return is written with a leading apostrophe, and
numbers (negative ones too) stay numbers. Common practice for CSV sent to spreadsheets
(OWASP, "CSV Injection"). Every writer is covered: results, curves, tables of results (the
sampling stages), the corrected spectrum, and the command line's batch table.
"""

from __future__ import annotations

import copy
import csv
import io
import json
import re

import pytest

from driftdose import api, cli, export
from driftdose.api.sampling import DEMOS

HOSTILE = [
    "=1+1",
    '+HYPERLINK("http://127.0.0.1/x","click")',
    "-2+3",
    "@SUM(A1:A2)",
    "\t=1+1",
    "\r=1+1",
    "=cmd|' /C calc'!A0",
]
NUMBER = re.compile(r"^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$")
DANGER = ("=", "+", "-", "@", "\t", "\r")


def cells(text: str) -> list[str]:
    return [c for row in csv.reader(io.StringIO(text, newline="")) for c in row]


def assert_safe(text: str) -> None:
    """No cell a spreadsheet would run: each dangerous start is a plain number."""
    for c in cells(text):
        if c.startswith(DANGER):
            assert NUMBER.match(c), f"formula-like cell written as is: {c!r}"


def sampling_reply(names: list[str], spectrum: bool = False) -> dict:
    inputs = copy.deepcopy(DEMOS["respirable_line"]["inputs"])
    for stage, name in zip(inputs["stages"], names, strict=False):
        stage["name"] = name
    if spectrum:
        inputs["size_source"] = "csv"
        inputs["csv_text"] = "d_nm;dN\n500;100\n1000;200\n2000;150\n5000;20\n"
        inputs["csv_diameter_column"] = "d_nm"
        inputs["csv_concentration_column"] = "dN"
    reply = api.handle({"kind": "sampling", "inputs": inputs})
    assert reply["ok"], reply
    return reply


@pytest.mark.parametrize("name", HOSTILE)
def test_stage_names_in_results_tables_are_neutralised(name):
    text = export.results_csv(sampling_reply([name, "Pre-separator"]))
    assert_safe(text)
    assert "'" + name in cells(text)  # still there, shown as text


@pytest.mark.parametrize("name", HOSTILE)
def test_stage_names_in_curves_are_neutralised(name):
    reply = sampling_reply([name, name])
    text = export.curves_csv(reply)
    assert_safe(text)
    assert "'" + name in cells(text)


def test_corrected_spectrum_table_is_safe_and_keeps_numbers():
    reply = sampling_reply(["=1+1", "@x"], spectrum=True)
    assert any(isinstance(r, dict) and r.get("rows") for r in reply["results"].values())
    text = export.results_csv(reply)
    assert_safe(text)
    # the numbers are the reply's own, in full precision
    values = {export._num(r["value"]) for r in reply["results"].values() if "value" in r}
    assert values <= set(cells(text))


def test_negative_numbers_stay_numbers():
    reply = {
        "results": {
            "a": {
                "label": "=label",
                "symbol": "-x",
                "value": -2.5e-9,
                "unit": "m",
                "si": -2.5e-9,
                "si_unit": "m",
                "note": "+note",
            },
            "b": {"label": "plain", "value": -3, "unit": "", "si": -3, "si_unit": ""},
        },
        "curves": {"c": {"label": "-curve", "x": [-1.0, 2.0], "y": [-0.5, 1e-300]}},
    }
    rows = list(csv.reader(io.StringIO(export.results_csv(reply), newline="")))
    assert rows[1] == ["'=label", "'-x", "-2.5e-09", "m", "-2.5e-09", "m", "'+note"]
    assert rows[2][2] == "-3"
    curves = list(csv.reader(io.StringIO(export.curves_csv(reply), newline="")))
    assert curves[1:] == [["'-curve", "-1.0", "-0.5"], ["'-curve", "2.0", "1e-300"]]


def test_text_results_and_category_names_are_neutralised():
    reply = {
        "results": {"t": {"label": "note", "text": "=HYPERLINK(1)"}},
        "curves": {"g": {"keys": ["=a", "b"], "m": {"label": "@m", "unit": "1", "y": [1, -2]}}},
    }
    assert_safe(export.results_csv(reply))
    text = export.curves_csv(reply)
    assert_safe(text)
    assert ["'=a", "1"] in list(csv.reader(io.StringIO(text, newline="")))


@pytest.mark.parametrize(
    ("cell", "expected"),
    [
        ("=1+1", "'=1+1"),
        ("-1.5", "-1.5"),
        ("+3", "+3"),
        ("-1e-5", "-1e-5"),
        ("-", "'-"),
        ("-1,5", "'-1,5"),
        ("@", "'@"),
        ("\t1", "'\t1"),
        ("ok =1", "ok =1"),
        ("", ""),
    ],
)
def test_safe_cell(cell, expected):
    assert export.safe_cell(cell) == expected


@pytest.mark.parametrize("name", ["=1+1.csv", "+cmd.csv", "@x.csv", "-a.csv"])
def test_cli_batch_table_file_names_are_neutralised(capsys, tmp_path, monkeypatch, name):
    monkeypatch.chdir(tmp_path)
    (tmp_path / name).write_text("d_nm;n\n10;100\n20;200\n40;50\n", encoding="utf-8")
    (tmp_path / "bad.csv").write_text("d_nm;n\n10;=1+1\n", encoding="utf-8")
    code = cli.main(
        ["batch", "deposition", "--spectra", f"./{name}", "bad.csv", "--csv-diameter-column",
         "1", "--csv-concentration-column", "2", "--out", "table.csv"]
    )  # fmt: skip
    capsys.readouterr()
    assert code == 2  # the bad file
    text = (tmp_path / "table.csv").read_text(encoding="utf-8")
    assert_safe(text)
    assert f"./{name}" in cells(text)  # "./" keeps a file name safe by itself
    if name.startswith("-"):
        return  # argparse takes "-a.csv" for an option
    code = cli.main(
        ["batch", "deposition", "--spectra", name, "--csv-diameter-column", "1",
         "--csv-concentration-column", "2", "--out", "table2.csv"]
    )  # fmt: skip
    capsys.readouterr()
    text = (tmp_path / "table2.csv").read_text(encoding="utf-8")
    assert_safe(text)
    assert "'" + name in cells(text)


def test_cli_csv_output_is_the_safe_export(capsys, tmp_path):
    inputs = copy.deepcopy(DEMOS["respirable_line"]["inputs"])
    inputs["stages"][0]["name"] = "=1+1"
    path = tmp_path / "req.json"

    path.write_text(json.dumps({"kind": "sampling", "inputs": inputs}), encoding="utf-8")
    code = cli.main(
        ["sampling", "--input", str(path), "--format", "csv", "--curves", str(tmp_path / "c.csv")]
    )
    out, err = capsys.readouterr()
    assert code == 0, err
    assert_safe(out)
    assert_safe((tmp_path / "c.csv").read_text(encoding="utf-8"))
    assert "'=1+1" in cells(out)
