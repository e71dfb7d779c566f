"""The prepared-column path of the shift statistics against the reading-by-reading path.

``stats_over`` answers from prepared columns (block sums, sorted blocks, window sums) when a
column has no missing values; ``stats_each`` reads every reading. The two must give the same
statistics: order statistics and counts exactly, sums within a few units in the last place
(limit 1e-12 relative, the precision promised for the re-summary), on regular and irregular
logging, periods cut mid-reading, several intervals, a background and a benchmark. Python's
``sorted`` stands in as the reference for the order statistics.
"""

from __future__ import annotations

import itertools
import math
import random

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from driftdose.compose.shift import compose_shift
from driftdose.shift.periods import Period
from driftdose.shift.ranges import BLOCK, ColumnRanges
from driftdose.shift.rangestats import indexed_stats
from driftdose.shift.series import TimeSeries
from driftdose.shift.stats import stats_each, stats_over

REL = 1e-12


def test_missing_values_take_the_general_path():
    s = series_of([0.0, 1.0, 2.0], [1.0, 2.0, 3.0], 1.0)
    gappy = (1.0, None, 3.0)
    assert indexed_stats(s, gappy, [(0.0, 3.0)]) is None
    assert stats_over(s, gappy, [(0.0, 3.0)]).readings == 2


def series_of(times: list[float], values: list[float], interval: float) -> TimeSeries:
    """A series held reading to reading (the last for one interval); a spacing over two
    intervals is a gap, the reading before it held for one interval (the reader's rule)."""
    spacing = [b - a for a, b in itertools.pairwise(times)]
    hold = [d if d <= 2 * interval else interval for d in spacing] + [interval]
    return TimeSeries(
        0.0,
        tuple(times),
        tuple(hold),
        {"0": tuple(values)},
        tuple(range(2, len(times) + 2)),
        interval,
        (),
    )


def close(a: float | None, b: float | None) -> bool:
    if a is None or b is None:
        return a is b
    return math.isclose(a, b, rel_tol=REL, abs_tol=1e-300)


def assert_same(fast, slow) -> None:
    assert fast.readings == slow.readings
    assert fast.median == slow.median and fast.p95 == slow.p95
    assert fast.maximum == slow.maximum
    for name in (
        "duration",
        "measured",
        "coverage",
        "mean",
        "peak15",
        "integral",
        "background_mean",
        "corrected_mean",
        "corrected_integral",
        "background_time",
        "below_background_share",
        "ratio",
        "share_above",
    ):
        assert close(getattr(fast, name), getattr(slow, name)), name


@settings(max_examples=80, deadline=None)
@given(
    n=st.integers(3, 3 * BLOCK),
    step=st.sampled_from([1.0, 10.0, 60.0, 0.5]),
    jitter=st.booleans(),
    seed=st.integers(0, 10_000),
    cuts=st.lists(st.floats(0.0, 1.0), min_size=2, max_size=6),
    with_background=st.sampled_from(["none", "level", "series"]),
    benchmark=st.one_of(st.none(), st.floats(1.0, 5e4)),
)
def test_prepared_columns_agree_with_reading_by_reading(
    n, step, jitter, seed, cuts, with_background, benchmark
):
    rnd = random.Random(seed)
    times = [0.0]
    for _ in range(n - 1):
        gap = 7.0 if rnd.random() < 0.02 else 1.0
        times.append(times[-1] + gap * (step * rnd.uniform(0.7, 1.3) if jitter else step))
    values = [rnd.lognormvariate(8.0, 1.2) * (50 if rnd.random() < 0.01 else 1) for _ in times]
    values[rnd.randrange(n)] = values[rnd.randrange(n)]  # a tie
    s = series_of(times, values, step)
    background = None
    if with_background == "level":
        background = (2000.0,) * n
    elif with_background == "series":
        background = tuple(rnd.uniform(500.0, 5000.0) for _ in times)
    # disjoint intervals, some on reading edges, some cut mid-reading
    ends = s.ends
    edges = sorted(
        {
            rnd.choice([round(c * s.end, 3), times[int(c * (n - 1))], ends[int(c * (n - 1))]])
            for c in cuts
        }
    )
    intervals = [(a, b) for a, b in zip(edges[::2], edges[1::2], strict=False) if b > a]
    if not intervals:
        intervals = [(0.0, s.end)]
    fast = indexed_stats(s, s.values["0"], intervals, background, benchmark)
    assert fast is not None  # the prepared path answers (no missing values, apart intervals)
    slow = stats_each(s, s.values["0"], intervals, background, benchmark)
    assert_same(fast, slow)


def test_regular_day_at_one_second_with_a_break():
    # the case the page moves most: 1-s logging, a shift with a break, a period moved
    rnd = random.Random(3)
    n = 6 * 3600
    values = [5000.0 + 40_000.0 * (3600 <= k < 9000) + rnd.uniform(0, 997) for k in range(n)]
    s = series_of([float(k) for k in range(n)], values, 1.0)
    b = (4000.0,) * n
    for end in (14_000.0, 14_060.0, 15_000.5, float(n)):
        intervals = [(0.0, 7200.0), (7800.0, end)]
        assert_same(
            indexed_stats(s, s.values["0"], intervals, b, 20_000.0),
            stats_each(s, s.values["0"], intervals, b, 20_000.0),
        )


def test_order_statistics_are_those_of_sorted_values():
    rnd = random.Random(9)
    values = [float(rnd.randint(0, 400)) for _ in range(5 * BLOCK + 17)]  # many ties
    col = ColumnRanges(values)
    for _ in range(30):
        i = rnd.randrange(len(values) - 2)
        j = rnd.randrange(i + 1, len(values) + 1)
        k = rnd.randrange(j, len(values) + 1)
        ranges = [(i, j), (k, len(values))] if k < len(values) else [(i, j)]
        chosen = sorted(v for a, b in ranges for v in values[a:b])
        ks = sorted({0, len(chosen) // 2, len(chosen) - 1})
        assert col.order_statistics(ranges, ks) == [chosen[r] for r in ks]
        assert col.maximum(i, j) == max(values[i:j]) and col.minimum(i, j) == min(values[i:j])
        assert math.fsum(col.terms(i, j)) == pytest.approx(math.fsum(values[i:j]), rel=1e-15)


def test_a_period_moved_and_moved_back_gives_the_first_answer():
    # results kept between calls must never answer for other periods
    rnd = random.Random(4)
    n = 4 * 3600
    s = series_of([float(k) for k in range(n)], [rnd.uniform(1e3, 1e5) for _ in range(n)], 1.0)

    def periods(end: float) -> list[Period]:
        return [
            Period("Background", "background", 0.0, 1800.0),
            Period("Task", "task", 2000.0, end),
            Period("Break", "break", end, end + 600.0),
        ]

    first = compose_shift(s, "0", periods(9000.0), "marked_mean")
    moved = compose_shift(s, "0", periods(9500.0), "marked_mean")
    back = compose_shift(s, "0", periods(9000.0), "marked_mean")
    assert back.periods == first.periods and back.shift == first.shift
    assert moved.periods[1][1].duration == 7500.0 and first.periods[1][1].duration == 7000.0
    fresh = stats_each(s, s.values["0"], [(2000.0, 9500.0)], moved.background.values)
    assert_same(moved.periods[1][1], fresh)


def test_periods_on_the_edges_of_a_gap():
    # readings every 10 s with a gap from 1000 s (end of the reading at 990 s) to 1500 s;
    # periods that start or end exactly on the gap's edges, on reading edges and inside
    times = [10.0 * k for k in range(100)] + [1500.0 + 10.0 * k for k in range(300)]
    rnd = random.Random(1)
    s = series_of(times, [rnd.uniform(10.0, 1e4) for _ in times], 10.0)
    assert s.ends[99] == 1000.0 and s.t[100] == 1500.0
    bounds = [(1000.0, 2500.0), (0.0, 1000.0), (995.0, 1500.0), (1000.0, 1500.0), (0.0, 1200.0)]
    bounds += [(1200.0, 1500.0), (985.0, 1505.0), (10.0, 990.0), (5.0, 3000.0)]
    for a, b in bounds:
        fast = indexed_stats(s, s.values["0"], [(a, b)], (100.0,) * len(times), 500.0)
        assert fast is not None
        assert_same(fast, stats_each(s, s.values["0"], [(a, b)], (100.0,) * len(times), 500.0))
