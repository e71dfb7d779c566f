"""The invented demo shift: the same bytes every time, labelled invented, like a logger export.

The checks are of the generator's own promises (regression pins where a number is pinned), not
of any physics: the demo's levels are invented.
"""

from __future__ import annotations

import csv
import io
import itertools
import json
from datetime import datetime, timedelta

from driftdose.shift import demo


def _rows(text: str, header_line: int) -> list[list[str]]:
    return list(csv.reader(io.StringIO(text)))[header_line:]


def test_same_output_on_every_call() -> None:
    assert demo.demo_json() == demo.demo_json()
    assert json.loads(demo.demo_json()) == demo.demo_shift()


def test_labelled_invented_in_the_page_and_in_the_files() -> None:
    shift = demo.demo_shift()
    assert shift["label"].startswith("Invented demo")
    assert "not a measurement" in shift["note"]
    for part in ("series", "background"):
        assert shift[part]["text"].splitlines()[0].startswith("Invented demo data")
        assert shift[part]["name"].startswith("invented-demo")


def test_near_field_file_one_reading_a_second_with_metadata_and_one_gap() -> None:
    text = demo.demo_shift()["series"]["text"]
    lines = text.splitlines()
    header = lines.index("Time,Number (1/cm3),LDSA (um2/cm3),Mass (mg/m3)")
    assert header == 7  # six metadata lines and a blank one above it
    rows = _rows(text, header + 1)
    times = [datetime.fromisoformat(r[0]) for r in rows]
    steps = [(b - a).total_seconds() for a, b in itertools.pairwise(times)]
    # every step 1 s but one, the 90-s zeroing gap (pin: the generator's GAP)
    assert sorted(set(steps)) == [1.0, 91.0]
    assert steps.count(91.0) == 1
    assert times[-1] - times[0] == timedelta(seconds=8 * 3600 - 1)
    assert all(float(r[1]) > 0 and float(r[2]) > 0 and float(r[3]) > 0 for r in rows)


def test_far_field_file_every_ten_seconds() -> None:
    text = demo.demo_shift()["background"]["text"]
    header = text.splitlines().index("Time,Number (1/cm3),LDSA (um2/cm3)")
    times = [datetime.fromisoformat(r[0]) for r in _rows(text, header + 1)]
    assert {(b - a).total_seconds() for a, b in itertools.pairwise(times)} == {10.0}
    assert len(times) == 8 * 360


def test_periods_three_tasks_breaks_and_background_in_order_without_overlap() -> None:
    periods = demo.demo_shift()["periods"]
    kinds = [p["kind"] for p in periods]
    assert kinds.count("task") == 3
    assert kinds.count("break") == 2
    assert kinds.count("background") == 2
    spans = [(p["start"], p["end"]) for p in periods]
    assert all(a < b for a, b in spans)
    assert all(spans[i][1] <= spans[i + 1][0] for i in range(len(spans) - 1))
    assert all(p["protection_factor"] >= 1 for p in periods)


def test_tasks_stand_out_above_the_background() -> None:
    shift = demo.demo_shift()
    rows = _rows(shift["series"]["text"], 8)
    start = datetime.fromisoformat(rows[0][0])

    def mean_between(a: str, b: str) -> float:
        lo = datetime.fromisoformat(f"2026-03-10 {a}")
        hi = datetime.fromisoformat(f"2026-03-10 {b}")
        values = [float(r[1]) for r in rows if lo <= datetime.fromisoformat(r[0]) < hi]
        return sum(values) / len(values)

    assert start == datetime(2026, 3, 10, 6, 45)
    background = mean_between("06:45", "07:15")
    for p in shift["periods"]:
        if p["kind"] == "task":
            assert mean_between(p["start"], p["end"]) > 2 * background
