"""Spectrum import with files as instruments and spreadsheets write them: notes above the
header, units in the header, decimal commas with semicolons, Latin-1 and UTF-16, gaps, a
spreadsheet's ``sep=`` first line, and numbers a person could read two ways.

Expected numbers are the file's own (per-bin concentrations in 1/cm³ times 1e6 for 1/m³, the
definition of the unit); a number written ``1,000`` is ambiguous (thousands separator or
decimal comma, common practice in European and English locales), so it is refused with its
line unless the file itself shows decimal commas.
"""

from __future__ import annotations

import codecs

import pytest

from driftdose.spectrum_import import SpectrumError, parse_spectrum_csv

INSTRUMENT = (
    "Instrument;mobility sizer (invented)\n"
    "Sample date;2026-03-04 10:15\n"
    "Sheath flow;3,0 L/min\n"
    "\n"
    "Größe [nm];Anzahl pro Klasse [1/cm³];Bemerkung\n"
    "10,5;1200,5;\n"
    "21,0;800;ok\n"
    "42,0;150,25;\n"
)


def per_bin(data, d="Größe [nm]", c="Anzahl pro Klasse [1/cm³]"):
    return parse_spectrum_csv(data, d, c, "per_bin")


@pytest.mark.parametrize(
    "encode",
    [
        pytest.param(lambda t: t.encode("utf-8"), id="utf-8"),
        pytest.param(lambda t: codecs.BOM_UTF8 + t.encode("utf-8"), id="utf-8-bom"),
        pytest.param(lambda t: t.encode("latin-1"), id="latin-1"),
        pytest.param(lambda t: t.replace("\n", "\r\n").encode("cp1252"), id="windows-crlf"),
        pytest.param(lambda t: codecs.BOM_UTF16_LE + t.encode("utf-16-le"), id="utf-16-le"),
        pytest.param(lambda t: codecs.BOM_UTF16_BE + t.encode("utf-16-be"), id="utf-16-be"),
    ],
)
def test_instrument_file_in_each_encoding_reads_the_same(encode):
    s = per_bin(encode(INSTRUMENT))
    assert s.diameters == pytest.approx((10.5e-9, 21.0e-9, 42.0e-9), rel=1e-15)
    assert s.numbers == pytest.approx((1200.5e6, 800e6, 150.25e6), rel=1e-15)
    assert s.report["header"][0] == "Größe [nm]"  # chosen by its Latin-1 name
    assert s.report["delimiter"] == "semicolon" and s.report["decimal_comma"]
    assert (s.report["first_line"], s.report["last_line"]) == (6, 8)
    assert any("3 line(s) of notes above the header" in n for n in s.report["notes"])


def test_latin1_header_chosen_by_name_with_other_case():
    s = per_bin(INSTRUMENT.encode("latin-1"), "GRÖßE [NM]", "anzahl pro klasse [1/CM³]")
    assert s.report["encoding"] == "windows-1252"
    assert len(s.numbers) == 3


def test_notes_above_header_with_columns_by_number():
    s = parse_spectrum_csv(INSTRUMENT, 1, 2, "per_bin")
    assert s.report["header"][1] == "Anzahl pro Klasse [1/cm³]"
    assert s.numbers[0] == pytest.approx(1200.5e6, rel=1e-15)


def test_a_note_with_a_number_above_the_header_is_set_aside_for_columns_by_number():
    # the header is the row above the data, so a note above it with a number in a chosen
    # column no longer needs the columns by name
    text = "Flow;0,3\nd [nm];dN\n10,5;100\n20,5;200\n"
    s = parse_spectrum_csv(text, 1, 2, "per_bin")
    assert s.report["header_line"] == 2 and s.report["rows"] == 2
    assert parse_spectrum_csv(text, "d [nm]", "dN", "per_bin").report["rows"] == 2


def test_a_header_line_given_by_the_user_wins():
    text = "Flow;0,3\nd [nm];dN\n10,5;100\n20,5;200\n"
    with pytest.raises(SpectrumError, match=r"^Line 2: the diameter cell 'd \[nm\]'") as exc:
        parse_spectrum_csv(text, 1, 2, "per_bin", header_line=1)
    assert exc.value.part == "file"
    with pytest.raises(SpectrumError, match="Line 9 does not exist") as exc:
        parse_spectrum_csv(text, 1, 2, "per_bin", header_line=9)
    assert exc.value.part == "header_line"


def test_a_gap_is_refused_with_its_line():
    text = INSTRUMENT.replace("21,0;800;ok", "21,0;;ok")
    with pytest.raises(
        SpectrumError, match=r"^Line 7: the concentration cell \(column 2\) is empty"
    ):
        per_bin(text)


# --- ambiguous numbers -----------------------------------------------------------------------


@pytest.mark.parametrize(
    "text",
    [
        pytest.param('d,n\n10,"1,000"\n20,"2,500"\n', id="quoted-in-comma-file"),
        pytest.param('d,n\n10,5\n20,"1,000"\n', id="quoted-second-row"),
        pytest.param("d;n\n10;1,000\n20;2,500\n", id="semicolon-only-three-decimals"),
        pytest.param("d;n\n10.5;1,000\n20.5;2\n", id="points-elsewhere"),
        pytest.param('d,n\n"1,000",5\n"2,000",6\n', id="diameter"),
        pytest.param("d\tn\n10\t-1,000\n20\t5\n", id="signed"),
    ],
)
def test_ambiguous_thousands_refused_with_the_line(text):
    with pytest.raises(SpectrumError, match=r"^Line [23]: the .* is ambiguous"):
        parse_spectrum_csv(text, "d", "n", "per_bin")


@pytest.mark.parametrize(
    ("text", "expected"),
    [
        pytest.param("d;n\n10,5;1,000\n20,5;2,250\n", (1.0, 2.25), id="decimal-commas-shown"),
        pytest.param('d,n\n10,"0,125"\n20,"1,000"\n', (0.125, 1.0), id="quoted-0-comma"),
        pytest.param("d;n\n10;1234,567\n20;1,5\n", (1234.567, 1.5), id="four-digit-whole"),
        pytest.param("d;n\n10;0,500\n20;1,25\n", (0.5, 1.25), id="leading-zero"),
        pytest.param('d,n\n10,"1,5"\n20,1000\n', (1.5, 1000.0), id="not-three-decimals"),
    ],
)
def test_numbers_that_are_not_ambiguous_are_read(text, expected):
    s = parse_spectrum_csv(text, "d", "n", "per_bin", 1e-9, 1.0)
    assert s.numbers == pytest.approx(expected, rel=1e-15)


def test_underscore_is_not_a_digit_separator():
    """``float("1_000")`` is 1000 in Python, but neither a file nor a form means that (and
    JavaScript's ``Number("1_000")`` is NaN)."""
    with pytest.raises(SpectrumError, match=r"^Line 2: .*'1_000' .*not a number"):
        parse_spectrum_csv("d,n\n10,1_000\n20,5\n", "d", "n", "per_bin")


# --- a spreadsheet's sep= line ---------------------------------------------------------------


@pytest.mark.parametrize(
    ("first", "body", "delimiter"),
    [
        ("sep=,", "d,n\n10,100\n20,200\n", "comma"),
        ('"sep=,"', "d,n\n10,100\n20,200\n", "comma"),
        ("sep=;", "d;n\n10,5;100\n20,5;200\n", "semicolon"),
        ("SEP=\t", "d\tn\n10\t100\n20\t200\n", "tab"),
    ],
)
def test_sep_first_line_names_the_separator(first, body, delimiter):
    for newline in ("\n", "\r\n"):
        text = (first + "\n" + body).replace("\n", newline)
        s = parse_spectrum_csv(text, "d", "n", "per_bin", 1e-9, 1.0)
        assert s.report["delimiter"] == delimiter
        assert s.report["header"] == ["d", "n"]
        assert s.report["first_line"] == 3  # the file's own line numbers
        assert s.numbers[1] == 200.0
        assert any("named the separator" in n for n in s.report["notes"])


def test_sep_line_keeps_line_numbers_in_messages():
    with pytest.raises(SpectrumError, match=r"^Line 4: .*'x'"):
        parse_spectrum_csv("sep=;\nd;n\n10;1\n20;x\n", "d", "n", "per_bin")


def test_sep_line_with_an_unread_separator_is_refused():
    with pytest.raises(SpectrumError, match=r"^Line 1: .*'\|'"):
        parse_spectrum_csv("sep=|\nd|n\n10|1\n20|2\n", "d", "n", "per_bin")


def test_sep_line_after_a_byte_order_mark():
    data = codecs.BOM_UTF8 + b"sep=;\r\nd;n\r\n10;1\r\n20;2\r\n"
    assert parse_spectrum_csv(data, "d", "n", "per_bin").report["delimiter"] == "semicolon"
