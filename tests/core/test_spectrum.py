"""CSV import of measured spectra: detection, conversion and every refusal with its line."""

from __future__ import annotations

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from driftdose.spectrum_import import MAX_BYTES, SpectrumError, parse_spectrum_csv


def _parse(text, *args, **kw):
    kw.setdefault("concentration_type", "per_bin")
    return parse_spectrum_csv(text, *args, **kw)


@pytest.mark.parametrize(
    ("text", "delimiter"),
    [
        ("d,n\n10,1\n20,2\n", "comma"),
        ("d;n\n10;1\n20;2\n", "semicolon"),
        ("d\tn\n10\t1\n20\t2\n", "tab"),
    ],
    ids=["comma", "semicolon", "tab"],
)
def test_parse_spectrum_csv_detects_delimiter(text, delimiter):
    s = _parse(text, "d", "n")
    assert s.report["delimiter"] == delimiter
    assert s.diameters == pytest.approx((10e-9, 20e-9))
    assert s.numbers == pytest.approx((1e6, 2e6))


def test_parse_spectrum_csv_bom_and_decimal_comma():
    s = _parse("\ufeffd;n\n10,5;1,5\n20;2\n", "d", "n")
    assert s.report["bom"] and s.report["decimal_comma"]
    assert s.diameters[0] == pytest.approx(10.5e-9)
    assert s.numbers[0] == pytest.approx(1.5e6)
    assert any("byte-order" in n for n in s.report["notes"])


def test_parse_spectrum_csv_bytes_with_bom_and_crlf():
    s = _parse(b"\xef\xbb\xbfd,n\r\n10,1\r\n20,2\r\n", "d", "n")
    assert s.report["bom"] and s.report["rows"] == 2


def test_parse_spectrum_csv_columns_by_number_without_header():
    s = _parse("x,10,5\ny,20,6\n", 2, "3")
    assert s.report["header"] is None
    assert s.numbers == pytest.approx((5e6, 6e6))


def test_parse_spectrum_csv_dndlogdp_conversion():
    # N_i = (dN/dlogDp)_i * log10(e_i+1 / e_i); for bins a factor 2 apart each bin is
    # log10(2) wide (common practice for mid-point spectra)
    s = parse_spectrum_csv("d,v\n10,100\n20,100\n40,100\n", "d", "v", "dN/dlogDp", 1e-9, 1e6)
    for n in s.numbers:
        assert n == pytest.approx(100e6 * math.log10(2.0))


def test_parse_spectrum_csv_dnddp_conversion():
    # dN/dDp per cm3 per nm times the bin width in nm
    s = parse_spectrum_csv("d,v\n10,1\n20,1\n", "d", "v", "dN/dDp", 1e-9, 1e6)
    widths_nm = [(b - a) * 1e9 for a, b in zip(s.edges, s.edges[1:], strict=False)]
    assert s.numbers == pytest.approx(tuple(1e6 * w for w in widths_nm))


@pytest.mark.parametrize(
    ("content", "message", "line"),
    [
        ("", "empty", None),
        ("   \n\n", "no text", None),
        (b"\x00\x01\x02binary", "binary", None),
        ("d\n10\n20\n", "separator", None),
        ("d,n\n10,1\nabc,2\n", "not a number", 3),
        ("d,n\n10,1\n20,x1\n", "not a number", 3),
        ("d,n\n-10,1\n20,2\n", "positive", 2),
        ("d,n\n0,1\n20,2\n", "positive", 2),
        ("d,n\n10,1\n5,2\n", "sort", 3),
        ("d,n\n10,1\n10,2\n", "repeats", 3),
        ("d,n\n10,-1\n20,2\n", "negative", 2),
        ("d,n\n10,1\n", "only one data row", 2),
        ("d,n\n", "no data rows", None),
        ("d,n\n10,1\n20\n", "column", 3),
        ("d,n\n10,nan\n20,1\n", "finite", 2),
    ],
    ids=[
        "empty",
        "blank",
        "binary",
        "no-separator",
        "non-numeric-diameter",
        "non-numeric-concentration",
        "negative-diameter",
        "zero-diameter",
        "unsorted",
        "duplicate",
        "negative-concentration",
        "single-row",
        "header-only",
        "short-row",
        "nan",
    ],
)
def test_parse_spectrum_csv_refusals(content, message, line):
    with pytest.raises(SpectrumError) as exc:
        _parse(content, 1, 2)
    assert message in str(exc.value).lower()
    assert exc.value.line == line
    if line is not None:
        assert str(exc.value).startswith(f"Line {line}:")


def test_parse_spectrum_csv_refuses_more_than_5_mb():
    big = "d,n\n" + "1,1\n" * (MAX_BYTES // 4 + 10)
    with pytest.raises(SpectrumError, match="5 MB"):
        _parse(big, 1, 2)


def test_parse_spectrum_csv_unknown_header_name_lists_header():
    with pytest.raises(SpectrumError, match="'dia'"):
        _parse("dia,n\n10,1\n20,2\n", "diameter", "n")


def test_parse_spectrum_csv_skips_comments_and_blank_lines():
    s = _parse("# instrument export\n\nd,n\n10,1\n\n20,2\n", "d", "n")
    assert s.report["skipped_lines"] == 3
    assert s.report["first_line"] == 4 and s.report["last_line"] == 6


@settings(max_examples=200, deadline=None)
@given(st.text(max_size=300) | st.binary(max_size=300))
def test_parse_spectrum_csv_property_never_crashes(data):
    # any content either imports or is refused with a SpectrumError, never another error
    try:
        s = _parse(data, 1, 2)
    except SpectrumError:
        return
    assert len(s.diameters) >= 2
    assert all(b > a for a, b in zip(s.diameters, s.diameters[1:], strict=False))
