"""The measured-file reader (``driftdose.tables``) with files written as instruments and
spreadsheets write them: notes above the header, units in the header or in a row below it,
decimal commas with semicolons, Latin-1 ``µ`` and ``³``, tabs, blank-aligned columns,
trailing separators, quoted fields, CRLF, blank lines, gaps, a summary row at the end.

Every file here is invented (no instrument's own format); the expected values are the file's
own numbers. Where the standard library's ``csv`` module applies (one-character separators,
quoting), the data rows are checked against what it reads from the same text.
"""

from __future__ import annotations

import codecs
import csv
import io

import pytest

from driftdose.tables import TableError, describe_table, pick_column, read_table
from driftdose.textfile import decode_text

CRLF = "\r\n"


def _decoded(data: bytes) -> str:
    return decode_text(data).text


def _csv_rows(text: str, delimiter: str, first_line: int, last_line: int) -> list[list[str]]:
    """The standard library's reading of the data lines (blank ones left out)."""
    lines = text.splitlines()[first_line - 1 : last_line]
    rows = csv.reader(io.StringIO("\n".join(lines), newline=""), delimiter=delimiter)
    return [[c.strip() for c in r] for r in rows if any(c.strip() for c in r)]


def _check_against_csv(text: str, delimiter: str) -> None:
    t = read_table(text)
    expected = _csv_rows(text, delimiter, t.rows[0][0], t.rows[-1][0])
    assert [list(cells) for _, cells in t.rows] == expected


# 1 ---------------------------------------------------------------------------------------------
SIZER_LATIN1 = CRLF.join(
    [
        "Instrument;mobility sizer (invented)",
        "Serial;0042",
        "Operator;A. Hygienist",
        "Date;04.03.2026",
        "Sheath flow;3,0 L/min",
        "",
        "Dp [nm];dN/dlogDp [#/cm³];dN [#/cm³]",
        "10,2;1200,5;104,4",
        "11,8;1510,0;95,6",
        "13,6;1800,25;113,1",
        "15,7;1650,75;103,4",
        "",
    ]
).encode("latin-1")


def test_sizer_export_in_latin1_with_notes_above_the_header():
    t = read_table(_decoded(SIZER_LATIN1))
    d = describe_table(t)
    assert (d["delimiter"], d["decimal"], d["header_line"]) == ("semicolon", "comma", 7)
    assert [m["line"] for m in d["metadata"]] == [1, 2, 3, 4, 5]
    assert (d["first_line"], d["last_line"], d["rows"]) == (8, 11, 4)
    cols = d["columns"]
    assert [(c["label"], c["unit"], c["unit_code"]) for c in cols] == [
        ("Dp", "nm", "nm"),
        ("dN/dlogDp", "#/cm³", "1/cm3"),
        ("dN", "#/cm³", "1/cm3"),
    ]
    assert cols[1]["distribution"] == "dN/dlogDp"
    assert [v for _, v in t.numbers(pick_column(t, "dlogdp"))] == [1200.5, 1510.0, 1800.25, 1650.75]
    _check_against_csv(_decoded(SIZER_LATIN1), ";")


# 2 ---------------------------------------------------------------------------------------------
OPC_TABS = (
    "Optical particle counter export (invented)\n"
    "Sample volume:\t2.83 L\n"
    "Location:\tHall 3\n"
    "Size (µm)\tCount (#/L)\t\n"
    "0.3\t15234\t\n"
    "0.5\t4210\t\n"
    "1.0\t812\t\n"
    "2.5\t95\t\n"
    "5.0\t11\t\n"
)


def test_optical_counter_with_tabs_and_a_trailing_tab():
    t = read_table(OPC_TABS)
    assert (t.delimiter, t.decimal, t.header_line) == ("tab", "point", 4)
    assert len(t.columns) == 2  # the trailing tab adds no column
    assert [c.unit.code for c in t.columns] == ["um", "1/L"]
    assert t.numbers(1)[-1] == (9, 11.0)
    _check_against_csv(OPC_TABS, "\t")


# 3 ---------------------------------------------------------------------------------------------
CPC_SERIES = CRLF.join(
    [
        "Condensation counter log (invented)",
        "Start,2026-03-04T08:00:00",
        "Time,Concentration (#/cm³),Flow (L/min)",
        "2026-03-04T08:00:00,12500,0.70",
        "2026-03-04T08:00:01,12650,0.70",
        "2026-03-04T08:00:02,,0.70",
        "2026-03-04T08:00:03,12710,",
        "2026-03-04T08:00:04,,0.71",
        "",
    ]
)


def test_counter_time_series_reports_gaps_with_their_lines():
    t = read_table(CPC_SERIES)
    d = describe_table(t)
    assert d["header_line"] == 3 and d["rows"] == 5
    assert [c["kind"] for c in d["columns"]] == ["time", "number", "number"]
    assert d["gaps"] == [
        {"number": 2, "name": "Concentration (#/cm³)", "count": 2, "lines": [6, 8]},
        {"number": 3, "name": "Flow (L/min)", "count": 1, "lines": [7]},
    ]
    assert [v for _, v in t.numbers(pick_column(t, "conc"))] == [12500, 12650, None, 12710, None]
    assert t.columns[2].unit.code == "L/min"
    _check_against_csv(CPC_SERIES, ",")


# 4 ---------------------------------------------------------------------------------------------
LDSA_SERIES = (
    "Diffusion charger (invented);serial 17\n"
    "Averaging;10 s\n"
    "Date;Time;LDSA [µm²/cm³];N [1/cm³];d [nm]\n"
    "04.03.2026;08:00:00;35,2;10250;45,1\n"
    "04.03.2026;08:00:10;36,8;10890;44,7\n"
    "04.03.2026;08:00:20;1210,5;250100;38,2\n"
)


def test_charger_series_with_day_first_dates_and_decimal_commas():
    t = read_table(LDSA_SERIES)
    assert (t.delimiter, t.decimal, t.header_line) == ("semicolon", "comma", 3)
    assert [c.kind for c in t.columns] == ["time", "time", "number", "number", "number"]
    assert t.columns[2].unit.code == "um2/cm3"
    assert t.columns[2].unit.quantity == "surface_concentration"
    assert [v for _, v in t.numbers(2)] == [35.2, 36.8, 1210.5]
    _check_against_csv(LDSA_SERIES, ";")


# 5 ---------------------------------------------------------------------------------------------
PHOTOMETER_BLANKS = (
    "# photometer log (invented)\n"
    "# calibration factor 1.00\n"
    "elapsed_s   conc_mg/m3   rh_%\n"
    "0           0.052        41\n"
    "60          0.061        41\n"
    "120         0.734        42\n"
    "\n"
    "180         0.058        42\n"
)


def test_photometer_with_blank_aligned_columns_and_comment_lines():
    t = read_table(PHOTOMETER_BLANKS)
    d = describe_table(t)
    assert (d["delimiter"], d["header_line"], d["rows"]) == ("whitespace", 3, 4)
    assert [c["unit_code"] for c in d["columns"]] == ["s", "mg/m3", "%"]
    assert d["skipped_lines"] == 1
    assert t.numbers(pick_column(t, "conc"))[-1] == (8, 0.058)


# 6 ---------------------------------------------------------------------------------------------
QUOTED = (
    '"Diameter, nm","dN/dlogDp, cm-3","Remark"\n'
    '"10.0","1500","start, warm-up"\n'
    '"20.0","2500",""\n'
    '"40.0","900","note ""a"""\n'
)


def test_quoted_headers_and_cells_with_commas_and_quotes():
    t = read_table(QUOTED)
    assert t.header == ("Diameter, nm", "dN/dlogDp, cm-3", "Remark")
    assert t.rows[2][1][2] == 'note "a"'
    assert [c.kind for c in t.columns] == ["number", "number", "text"]
    assert pick_column(t, "diameter").index == 0
    _check_against_csv(QUOTED, ",")


# 7 ---------------------------------------------------------------------------------------------
TOTALS = "Dp [nm];dN [#/cm³]\n10;100\n20;250\n40;50\nTotal;400\n"


def test_a_totals_row_after_the_data_is_left_out_and_named():
    t = read_table(TOTALS)
    d = describe_table(t)
    assert d["rows"] == 3 and d["footer"] == [{"line": 5, "text": "Total;400"}]
    assert any("summary line" in n for n in d["notes"])


# 8 ---------------------------------------------------------------------------------------------
UNITS_ROW = "Sizer (invented)\nDp;dN/dlogDp;Time\nnm;#/cm³;s\n10;1000;0\n20;1500;0\n"


def test_a_units_row_below_the_names():
    t = read_table(UNITS_ROW)
    assert (t.header_line, t.units_line) == (2, 3)
    assert [c.unit.code for c in t.columns] == ["nm", "1/cm3", "s"]
    assert [c.name for c in t.columns] == ["Dp", "dN/dlogDp", "Time"]


# 9 ---------------------------------------------------------------------------------------------
TRAILING = "Dp (nm),N (1/cm3),\n10,5,\n20,6,\n30,7,\n"


def test_trailing_commas_add_no_column():
    t = read_table(TRAILING)
    assert len(t.columns) == 2 and t.columns[1].unit.code == "1/cm3"
    _check_against_csv(TRAILING, ",")


# 10 --------------------------------------------------------------------------------------------
SEP_LINE = CRLF.join(["sep=;", "d;n", "10,5;1", "", "20,5;2", "", ""])


def test_spreadsheet_sep_line_with_crlf_and_blank_lines_keeps_line_numbers():
    t = read_table(SEP_LINE)
    assert t.delimiter == "semicolon" and t.header_line == 2
    assert [n for n, _ in t.rows] == [3, 5]
    assert t.numbers(0) == [(3, 10.5), (5, 20.5)]


# 11 --------------------------------------------------------------------------------------------
CHANNELS = (
    "Size channels (invented)\n"
    "Time;10,0;11,5;13,3;15,4\n"
    "08:00:00;120;340;560;410\n"
    "08:01:00;130;;570;400\n"
    "08:02:00;125;350;565;405\n"
)


def test_size_channels_as_numbers_in_the_header():
    t = read_table(CHANNELS)
    assert t.header_line == 2 and t.header[1:] == ("10,0", "11,5", "13,3", "15,4")
    assert t.columns[0].kind == "time"
    assert describe_table(t)["gaps"][0]["lines"] == [4]


# 12 --------------------------------------------------------------------------------------------
def test_utf16_export_with_byte_order_mark():
    text = "Dp [µm]\tdM/dlogDp [µg/m³]\r\n0,5\t12,5\r\n1,0\t30,25\r\n"
    t = read_table(_decoded(codecs.BOM_UTF16_LE + text.encode("utf-16-le")))
    assert t.decimal == "comma" and t.columns[1].unit.code == "ug/m3"
    assert t.numbers(1) == [(2, 12.5), (3, 30.25)]


# 13 --------------------------------------------------------------------------------------------
TWO_NAME_ROWS = "Dp;Conc\nDiameter of the bin;Number per bin\n10;1\n20;2\n"


def test_header_line_override_picks_the_names_row():
    found = read_table(TWO_NAME_ROWS)
    assert found.header_line == 2 and not found.header_given
    given = read_table(TWO_NAME_ROWS, header_line=1)
    assert given.header == ("Dp", "Conc") and given.header_given
    assert given.metadata == ()
    assert [n for n, _ in given.rows] == [2, 3, 4]  # the second names row is now a data row
    with pytest.raises(TableError, match=r"^Line 2: .*'Diameter of the bin' is not a number"):
        given.numbers(0)
    with pytest.raises(TableError) as exc:
        read_table(TWO_NAME_ROWS, header_line=40)
    assert exc.value.part == "header_line" and "4 lines" in exc.value.message


# 14 --------------------------------------------------------------------------------------------
def test_ambiguous_name_is_refused_with_the_candidates():
    t = read_table(_decoded(SIZER_LATIN1))
    with pytest.raises(TableError) as exc:
        pick_column(t, "#/cm³", "concentration")
    assert exc.value.part == "column"
    assert exc.value.candidates == ["dN/dlogDp [#/cm³]", "dN [#/cm³]"]
    assert pick_column(t, "DN").index == 2  # the whole name without its unit wins
    with pytest.raises(TableError, match="no column 7"):
        pick_column(t, 7)


# 15 --------------------------------------------------------------------------------------------
FIXED_WIDTH = (
    "  Dp(nm)     dN/dlogDp(cm-3)\n"
    "   10.00        1.234e+03\n"
    "   20.00        2.500e+03\n"
    "   40.00        9.000e+02\n"
)


def test_fixed_width_columns_with_exponents():
    t = read_table(FIXED_WIDTH)
    assert t.delimiter == "whitespace" and t.header_line == 1
    assert [c.unit.code for c in t.columns] == ["nm", "1/cm3"]
    assert t.numbers(1)[0] == (2, 1234.0)


# 16 --------------------------------------------------------------------------------------------
def test_errors_carry_line_numbers():
    text = "Dp;N\n10;1\n20;abc\n30;3\n"
    t = read_table(text)
    with pytest.raises(TableError, match=r"^Line 3: .*'abc' is not a number"):
        t.numbers(1)
    with pytest.raises(TableError, match=r"^Line 2: .*ambiguous"):
        read_table("d;n\n10;1,000\n20;2\n").numbers(1)


def test_a_file_without_header_names_its_columns_by_number():
    t = read_table("1;2\n3;4\n")
    assert t.header is None and [c.name for c in t.columns] == ["Column 1", "Column 2"]
    with pytest.raises(TableError, match="no header row"):
        pick_column(t, "dp")


@pytest.mark.parametrize(
    ("text", "message"),
    [
        ("", "empty"),
        ("\n \n", "no text"),
        ("just one column\n1\n2\n", "separator"),
        ("a;b\n", "no data rows"),
        ("a;b\x00\x00\x00\x00;c\n", "binary"),
    ],
)
def test_refusals(text, message):
    with pytest.raises(TableError) as exc:
        read_table(text)
    assert message in str(exc.value).lower()
    assert exc.value.part == "file"


# units written in headers (spellings as instruments and spreadsheets write them: common practice)
@pytest.mark.parametrize(
    ("header", "label", "code"),
    [
        ("Dp [nm]", "Dp", "nm"),
        ("Dp (µm)", "Dp", "um"),
        ("Dp / um", "Dp", "um"),
        ("diameter_nm", "diameter", "nm"),
        ("dN/dlogDp (#/cm³)", "dN/dlogDp", "1/cm3"),
        ("dN/dlogDp_per_cm3", "dN/dlogDp", "1/cm3"),
        ("N [cm^-3]", "N", "1/cm3"),
        ("N (p/cc)", "N", "1/cm3"),
        ("conc_mg/m3", "conc", "mg/m3"),
        ("PM2.5 [µg/m³]", "PM2.5", "ug/m3"),
        ("LDSA (um2/cm3)", "LDSA", "um2/cm3"),
        ("Temp [°C]", "Temp", "degC"),
        ("Sizer (invented)", "Sizer (invented)", None),
        ("Sample date", "Sample date", None),
        ("Remark [free text]", "Remark", None),
    ],
)
def test_units_read_from_headers(header, label, code):
    from driftdose.tables import header_unit

    h = header_unit(header)
    assert (h.label, h.code) == (label, code)


def test_a_point_thousands_group_in_a_file_of_decimal_commas_is_refused():
    t = read_table("d;n\n10,5;1\n20,5;1.000\n")
    assert t.decimal == "comma"
    with pytest.raises(TableError, match=r"^Line 3: .*'1.000' is ambiguous"):
        t.numbers(1)
