"""The measured-spectrum import at the api boundary: files with an instrument's notes above
the header, columns picked by (part of) a header name or number, the header line given by the
user, units from the headers for the page's choices, and every refusal named on the input that
is wrong (the file, a column, the header line) with its line number.

The spectrum numbers are the file's own (per-bin concentrations per cm³ times 1e6 for per m³,
the definition of the unit); the files are invented.
"""

from __future__ import annotations

import copy
import json

import pytest

from driftdose import api
from driftdose.api.files import describe_file_json

SIZER = (
    "Instrument;mobility sizer (invented)\n"
    "Date;04.03.2026\n"
    "Sheath flow;3,0 L/min\n"
    "\n"
    "Dp [nm];dN/dlogDp [#/cm³];dN [#/cm³];Remark\n"
    "20,5;1000;100;\n"
    "41,0;3000;300;ok\n"
    "82,0;2000;200;\n"
    "164,0;500;50;\n"
    "Total;;650;\n"
)


def _run(kind: str, **inputs):
    source = {"deposition": "distribution_source", "sampling": "spectrum_source"}[kind]
    request = {"kind": kind, "inputs": {source: "csv", "csv_text": SIZER, **inputs}}
    before = copy.deepcopy(request)
    reply = api.handle(request)
    assert request == before  # the api never changes what it is given
    return reply


def _errors(reply):
    assert not reply["ok"], reply
    return {e["field"]: e["message"] for e in reply["errors"]}


@pytest.mark.parametrize("kind", ["deposition", "sampling"])
def test_notes_above_the_header_and_columns_by_part_of_their_names(kind):
    reply = _run(
        kind,
        csv_diameter_column="dp",
        csv_concentration_column="dN [",
        csv_concentration_type="per_bin",
    )
    assert reply["ok"], reply
    assert "4 rows (lines 6–9)" in reply["results"]["csv_rows"]["text"]
    notes = " ".join(reply["warnings"])
    assert "3 line(s) of notes above the header were set aside" in notes
    assert "summary line" in notes  # the Total row is left out and said so


def test_columns_by_number_give_the_same_numbers_as_by_name():
    by_name = _run("deposition", csv_diameter_column="Dp [nm]", csv_concentration_column="dlogdp")
    by_number = _run("deposition", csv_diameter_column="1", csv_concentration_column="2")
    assert by_name["ok"] and by_number["ok"]
    assert by_name["results"] == by_number["results"]


def test_an_ambiguous_name_is_refused_at_its_picker_with_the_candidates():
    errors = _errors(_run("deposition", csv_diameter_column="1", csv_concentration_column="#/cm³"))
    assert set(errors) == {"csv_concentration_column"}
    message = errors["csv_concentration_column"]
    assert "2 'dN/dlogDp [#/cm³]'" in message and "3 'dN [#/cm³]'" in message


def test_a_column_that_does_not_exist_is_refused_at_its_picker():
    errors = _errors(_run("sampling", csv_diameter_column="9", csv_concentration_column="2"))
    assert set(errors) == {"csv_diameter_column"}
    assert "no column 9" in errors["csv_diameter_column"]


def test_a_header_line_given_wrong_is_refused_at_the_header_line_field():
    errors = _errors(_run("deposition", csv_header_line=40))
    assert set(errors) == {"csv_header_line"}
    assert "Line 40 does not exist" in errors["csv_header_line"]
    errors = _errors(_run("deposition", csv_header_line=4))
    assert "Line 4 is blank" in errors["csv_header_line"]


def test_a_header_line_given_as_the_notes_puts_the_fault_in_the_file_with_its_line():
    # line 3 as header: the real header (line 5) becomes a data row that is not numbers
    errors = _errors(_run("deposition", csv_header_line=3))
    assert set(errors) == {"csv_text"}
    assert errors["csv_text"].startswith("Line 5: the diameter cell 'Dp [nm]'")


def test_a_bad_cell_is_refused_at_the_file_with_its_line():
    text = SIZER.replace("82,0;2000", "82,0;2x00")
    reply = api.handle(
        {
            "kind": "deposition",
            "inputs": {
                "distribution_source": "csv",
                "csv_text": text,
                "csv_diameter_column": "1",
                "csv_concentration_column": "2",
            },
        }
    )
    assert _errors(reply) == {
        "csv_text": "Line 8: the concentration cell '2x00' (column 2) is not a number."
    }


@pytest.mark.parametrize("raw", [-2, 1_000_001, "x", 1.5, True])
def test_header_line_outside_its_range_is_refused_by_the_field(raw):
    errors = _errors(_run("deposition", csv_header_line=raw))
    assert "csv_header_line" in errors


# --- the page's description of a picked file ------------------------------------------------


def test_description_fills_the_pickers_and_the_unit_choices_from_the_headers():
    got = json.loads(describe_file_json("spectrum", SIZER))
    assert got["ok"]
    table = got["table"]
    for key in (
        "delimiter",
        "decimal",
        "header_line",
        "header_given",
        "units_line",
        "rows",
        "first_line",
        "last_line",
        "gaps",
        "metadata",
        "footer",
        "preview",
    ):
        assert key in table  # the keys site/js/preview.js reads
    assert (table["header_line"], table["decimal"], table["rows"]) == (5, "comma", 4)
    d = got["pickers"]["csv_diameter_column"]
    c = got["pickers"]["csv_concentration_column"]
    assert [o["label"] for o in d["options"]] == [
        "1: Dp [nm]",
        "2: dN/dlogDp [#/cm³]",
        "3: dN [#/cm³]",
        "4: Remark",
    ]
    assert (d["suggest"], c["suggest"]) == ("Dp [nm]", "dN/dlogDp [#/cm³]")
    assert d["fills"] == {"Dp [nm]": {"csv_diameter_unit": "nm"}}
    assert c["fills"]["dN/dlogDp [#/cm³]"] == {
        "csv_concentration_unit": "1/cm3",
        "csv_concentration_type": "dN/dlogDp",
    }
    assert c["fills"]["dN [#/cm³]"] == {"csv_concentration_unit": "1/cm3"}
    # the text column offered is refused at its picker when chosen
    errors = _errors(_run("deposition", csv_diameter_column="Remark", csv_concentration_column="2"))
    assert errors == {
        "csv_diameter_column": "Column 4 'Remark' holds text, not numbers; choose the diameter "
        "column."
    }


def test_description_of_a_file_without_header_offers_numbers():
    got = json.loads(describe_file_json("spectrum", "10;100\n20;200\n40;50\n"))
    options = got["pickers"]["csv_diameter_column"]["options"]
    assert [o["value"] for o in options] == ["1", "2"]
    assert got["pickers"]["csv_concentration_column"]["suggest"] == "2"


@pytest.mark.parametrize(
    ("purpose", "text", "line", "field"),
    [
        ("spectrum", "", 0, "csv_text"),
        ("spectrum", "just text\n", 0, "csv_text"),
        ("spectrum", SIZER, 99, "csv_header_line"),
        ("spectrum", None, 0, "csv_text"),
        ("spectrum", SIZER, "__proto__", None),
        ("nonsense", SIZER, 0, None),
        ({"kind": "spectrum"}, SIZER, 0, None),
    ],
)
def test_description_refusals_name_the_input_and_never_raise(purpose, text, line, field):
    got = json.loads(describe_file_json(purpose, text, line))
    if line == "__proto__":  # an unreadable line number is taken as "find the header"
        assert got["ok"] and got["table"]["header_line"] == 5
        return
    assert got["ok"] is False and got["message"]
    assert got["field"] == field


def test_a_long_file_is_described_from_its_first_lines_and_says_so():
    rows = "".join(f"{10 + i * 0.001:.3f};{i % 97}\n" for i in range(5000))
    got = json.loads(describe_file_json("spectrum", "Dp [nm];N [1/cm3]\n" + rows))
    table = got["table"]
    assert (table["examined_lines"], table["total_lines"]) == (2000, 5001)
    assert (table["rows"], table["last_line"]) == (1999, 2000)
    assert got["pickers"]["csv_diameter_column"]["suggest"] == "Dp [nm]"
