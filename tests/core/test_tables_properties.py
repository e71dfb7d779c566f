"""Properties of the measured-file reader (``driftdose.tables``): any table written by the
standard library's ``csv`` module (any of three separators, decimal points or commas, notes
above the header, LF or CRLF) reads back with its header, its numbers and its line numbers;
any text at all is read or refused with :class:`TableError`, never another error."""

from __future__ import annotations

import csv
import io
import json
import math

from hypothesis import given, settings
from hypothesis import strategies as st

from driftdose.tables import TableError, describe_table, pick_column, read_table

_NAME = st.text(
    alphabet=st.sampled_from("abcdefghijklmnopqrstuvwxyzABCDEFGHIJKLMNOPQRSTUVWXYZµÄö /[]()"),
    min_size=1,
    max_size=12,
).map(lambda s: "N" + s.strip())
_VALUE = st.floats(min_value=-1e9, max_value=1e9, allow_nan=False).filter(lambda x: x != 0)


@st.composite
def written_tables(draw):
    width = draw(st.integers(2, 6))
    names = draw(st.lists(_NAME, min_size=width, max_size=width, unique_by=str.casefold))
    n_rows = draw(st.integers(2, 25))
    first = sorted(draw(st.lists(st.integers(1, 10**6), min_size=n_rows, max_size=n_rows)))
    others = draw(
        st.lists(
            st.lists(_VALUE, min_size=width - 1, max_size=width - 1),
            min_size=n_rows,
            max_size=n_rows,
        )
    )
    delimiter = draw(st.sampled_from([",", ";", "\t"]))
    decimal = "point" if delimiter == "," else draw(st.sampled_from(["point", "comma"]))
    notes = draw(
        st.lists(
            st.text(alphabet="abcdefgh xyz:=", min_size=1, max_size=30).map(lambda s: "Z" + s),
            max_size=5,
        )
    )
    newline = draw(st.sampled_from(["\n", "\r\n"]))
    mark = "," if decimal == "comma" else "."
    rows = [
        [f"{f / 10:.1f}".replace(".", mark), *(repr(v).replace(".", mark) for v in vals)]
        for f, vals in zip(first, others, strict=True)
    ]
    out = io.StringIO()
    writer = csv.writer(out, delimiter=delimiter, lineterminator=newline)
    for note in notes:
        out.write(note + newline)
    writer.writerow(names)
    writer.writerows(rows)
    numbers = [[f / 10, *vals] for f, vals in zip(first, others, strict=True)]
    return out.getvalue(), names, numbers, len(notes), delimiter, decimal


_DELIMITER_NAMES = {",": "comma", ";": "semicolon", "\t": "tab"}


@settings(max_examples=150, deadline=None)
@given(written_tables())
def test_a_written_table_reads_back(case):
    text, names, numbers, n_notes, delimiter, decimal = case
    t = read_table(text)
    assert t.delimiter == _DELIMITER_NAMES[delimiter]
    assert t.decimal == decimal
    assert t.header == tuple(n.strip() for n in names)
    assert t.header_line == n_notes + 1
    assert len(t.metadata) == n_notes
    assert [n for n, _ in t.rows] == list(range(n_notes + 2, n_notes + 2 + len(numbers)))
    for i, name in enumerate(names):
        assert pick_column(t, name).index == i
        got = [v for _, v in t.numbers(i)]
        assert got == [row[i] for row in numbers]
    # the standard library reads the same data rows
    data = io.StringIO(text, newline="")
    expected = list(csv.reader(data, delimiter=delimiter))[n_notes + 1 :]
    assert [list(c) for _, c in t.rows] == [[c.strip() for c in r] for r in expected]
    # naming the header line found gives the same table
    again = read_table(text, header_line=t.header_line)
    assert again.rows == t.rows and again.header == t.header and again.header_given


@settings(max_examples=300, deadline=None)
@given(
    st.text(alphabet=st.sampled_from('ab1.,;\t \n\r"#-:e9µ'), max_size=200) | st.text(max_size=200)
)
def test_any_text_is_read_or_refused(text):
    try:
        t = read_table(text)
    except TableError as exc:
        assert exc.part == "file" and exc.message
        return
    lines = [n for n, _ in t.rows]
    assert lines == sorted(set(lines)) and lines[0] >= 1
    d = describe_table(t)
    json.dumps(d, allow_nan=False)  # the page gets plain JSON
    for c in t.columns:
        try:
            values = t.numbers(c)
        except TableError as exc:
            assert exc.line in lines
            continue
        assert all(v is None or isinstance(v, float) for _, v in values)


@settings(max_examples=100, deadline=None)
@given(written_tables(), st.integers(-1, 40))
def test_any_header_line_is_read_or_refused_beside_its_control(case, line):
    text = case[0]
    try:
        t = read_table(text, header_line=line)
    except TableError as exc:
        assert exc.part in ("header_line", "file")
        return
    if line > 0:
        assert t.header_line == line
    assert all(n > (t.header_line or 0) for n, _ in t.rows)


def test_numbers_are_finite_or_nan_as_written():
    t = read_table("d;n\n1;NaN\n2;3\n")
    assert math.isnan(t.numbers(1)[0][1])
