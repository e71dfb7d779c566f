"""Statistics over periods from prepared columns: the fast path of
:func:`driftdose.shift.stats.stats_over`.

The definitions are those of :mod:`driftdose.shift.stats` (time-weighted mean, order
statistics with Hyndman & Fan 1996 definition 7, highest 15-minute mean of EN 689:2018,
background correction); only the arithmetic is arranged so that a period moved on the page
costs little: each column, its background and the series' reading intervals are prepared
once (:class:`driftdose.shift.ranges.ColumnRanges`), and a period asks for sums and order
statistics over ranges of readings. Sums are added by :func:`math.fsum` from block sums, so
they agree with the reading-by-reading sums to within a few units in the last place.

Used for columns without missing values, a background without missing values, and disjoint,
separated intervals; :func:`indexed_stats` returns None otherwise (the general path runs).
"""

from __future__ import annotations

import bisect
import math
from collections.abc import Sequence
from itertools import pairwise
from operator import mul, sub
from typing import Any

from .ranges import ColumnRanges, RangeArray
from .segments import clipped
from .series import TimeSeries

__all__ = ["indexed_stats"]

_KEPT = 6
"""Prepared columns kept (the near-field column, its background, a far-field column, ...)."""

_cache: list[tuple[tuple[Any, ...], Any, Any]] = []


def _kept(key: tuple[Any, ...], build: Any, value: Any = None) -> Any:
    """The object prepared for ``key`` (objects compared by identity) and ``value``
    (compared by value), built once."""
    for k, val, v in _cache:
        if val == value and len(k) == len(key) and all(a is b for a, b in zip(k, key, strict=True)):
            return v
    v = build()
    _cache.insert(0, (key, value, v))
    del _cache[_KEPT:]
    return v


def _series_parts(series: TimeSeries) -> tuple[RangeArray, RangeArray]:
    def build() -> tuple[RangeArray, RangeArray]:
        t, ends = series.t, series.ends
        jumps = [0.0, *map(abs, map(sub, t[1:], ends[:-1]))]
        return RangeArray(series.lengths), RangeArray(jumps)

    return _kept(("series", series), build)  # type: ignore[no-any-return]


def _column(series: TimeSeries, values: Sequence[float | None]) -> ColumnRanges | None:
    return _kept(("column", series, values), lambda: _prepare(series, values))[0]  # type: ignore[no-any-return]


def _prepare(
    series: TimeSeries, values: Sequence[float | None]
) -> tuple[ColumnRanges | None, RangeArray | None]:
    def build() -> tuple[ColumnRanges | None, RangeArray | None]:
        if None in values:
            return None, None
        col = ColumnRanges(values)  # type: ignore[arg-type]
        return col, RangeArray(list(map(mul, values, series.lengths)))  # type: ignore[arg-type]

    return build()


def _weighted(series: TimeSeries, values: Sequence[float | None]) -> RangeArray:
    return _kept(("column", series, values), lambda: _prepare(series, values))[1]  # type: ignore[no-any-return]


def _background(
    series: TimeSeries, values: Sequence[float], background: Sequence[float | None]
) -> tuple[RangeArray, RangeArray, RangeArray] | None:
    def build() -> tuple[RangeArray, RangeArray, RangeArray] | None:
        if None in background:
            return None
        lengths = series.lengths
        b_len, corr, below = [], [], []
        for c, b, d in zip(values, background, lengths, strict=True):
            diff = c - b  # type: ignore[operator]
            b_len.append(b * d)  # type: ignore[operator]
            corr.append(diff * d if diff > 0.0 else 0.0)
            below.append(d if diff < 0.0 else 0.0)
        return RangeArray(b_len), RangeArray(corr), RangeArray(below)

    return _kept(("background", series, values, background), build)  # type: ignore[no-any-return]


def _above(series: TimeSeries, values: Sequence[float], benchmark: float) -> RangeArray:
    def build() -> RangeArray:
        pairs = zip(values, series.lengths, strict=True)
        return RangeArray([d if c > benchmark else 0.0 for c, d in pairs])

    return _kept(("above", series, values), build, benchmark)  # type: ignore[no-any-return]


def indexed_stats(
    series: TimeSeries,
    values: Sequence[float | None],
    intervals: Sequence[tuple[float, float]],
    background: Sequence[float | None] | None = None,
    benchmark: float | None = None,
) -> Any:
    """:func:`~driftdose.shift.stats.stats_over` from prepared columns, or None when the
    column or the background has missing values or two intervals touch.

    Parameters
    ----------
    series : TimeSeries
        Reading times and intervals.
    values : sequence of float or None
        One value per reading. [SI]
    intervals : sequence of (float, float)
        Disjoint, increasing time intervals [start, end). [s from start]
    background : sequence of float or None, optional
        Background value per reading. [SI]
    benchmark : float, optional
        Value to compare with, > 0. [SI]

    Returns
    -------
    PeriodStats or None
        As :func:`~driftdose.shift.stats.stats_over` gives them.
    """
    from .stats import SHORT_TERM, PeriodStats, _peak

    if len(series.t) > 10_000_000 or any(b0 >= a1 for (_, b0), (a1, _) in pairwise(intervals)):
        return None
    col = _column(series, values)
    if col is None:
        return None
    weighted = _weighted(series, values)
    back = None
    if background is not None:
        back = _background(series, values, background)  # type: ignore[arg-type]
        if back is None:
            return None
    lengths, jumps = _series_parts(series)
    t, ends_all = series.t, series.ends
    vals: Sequence[float] = values  # type: ignore[assignment]
    m_terms: list[float] = []
    i_terms: list[float] = []
    bl_terms: list[float] = []
    c_terms: list[float] = []
    below_terms: list[float] = []
    above = _above(series, vals, benchmark) if benchmark is not None else None
    a_terms: list[float] = []
    ranges: list[tuple[int, int]] = []
    peak = None
    for a, b in intervals:
        i = max(0, bisect.bisect_right(t, a) - 1)
        j = bisect.bisect_left(t, b)
        if j <= i:
            continue
        last = j - 1
        s_f, e_f = max(t[i], a), min(ends_all[i], b)
        s_l, e_l = max(t[last], a), min(ends_all[last], b)
        # as _clipped: the last segment goes if it has no time left, then the first
        keep_first, keep_last = e_f > s_f, e_l > s_l
        edges = []
        if keep_first:
            edges.append((i, e_f - s_f))
        if keep_last and last != i:
            edges.append((last, e_l - s_l))
        i2, j2 = i + (not keep_first), j - (not keep_last)
        if j2 <= i2:
            continue
        ranges.append((i2, j2))
        m_terms += lengths.terms(i + 1, last)
        i_terms += weighted.terms(i + 1, last)
        for k, d in edges:
            m_terms.append(d)
            i_terms.append(vals[k] * d)
        if back is not None:
            bl, corr, below = back
            bl_terms += bl.terms(i + 1, last)
            c_terms += corr.terms(i + 1, last)
            below_terms += below.terms(i + 1, last)
            for k, d in edges:
                diff = vals[k] - background[k]  # type: ignore[index,operator]
                bl_terms.append(background[k] * d)  # type: ignore[index,operator]
                if diff > 0.0:
                    c_terms.append(diff * d)
                elif diff < 0.0:
                    below_terms.append(d)
        if above is not None:
            a_terms += above.terms(i + 1, last)
            a_terms += [d for k, d in edges if vals[k] > benchmark]  # type: ignore[operator]
        # the highest 15-min mean inside this interval
        if b - a < SHORT_TERM:
            continue
        p = None
        regular = keep_first and keep_last and s_f == a and e_l == b
        if regular:
            d = e_f - s_f
            n = j - i
            m = round(SHORT_TERM / d)
            tol = 1e-9 * d
            regular = 1 <= m <= n and abs(m * d - SHORT_TERM) <= 1e-9 * SHORT_TERM
            if regular and n > 1:
                worst_jump = abs(t[i + 1] - e_f)
                if i + 2 < j:
                    worst_jump = max(worst_jump, jumps.maximum(i + 2, j))
                spread = [e_l - s_l]
                if i + 1 < last:
                    spread += [lengths.minimum(i + 1, last), lengths.maximum(i + 1, last)]
                regular = worst_jump <= tol and max(abs(x - d) for x in spread) <= tol
            if regular:
                p = col.highest_window(i, j, m) / m
        if not regular:
            starts, ends, seg_vals, _, _, _ = clipped(series, values, [(a, b)])
            p = _peak(starts, ends, seg_vals, a, b)
        if p is not None and (peak is None or p > peak):
            peak = p
    duration = sum(b - a for a, b in intervals)
    measured = math.fsum(m_terms)
    integral = math.fsum(i_terms)
    readings = sum(j - i for i, j in ranges)
    mean = median = p95 = maximum = None
    if measured > 0.0:
        mean = integral / measured
        maximum = max(col.maximum(i, j) for i, j in ranges)
        wanted = sorted({k for q in (0.5, 0.95) for k in _ranks(readings, q)})
        found = dict(zip(wanted, col.order_statistics(ranges, wanted), strict=True))
        median = _percentile(found, readings, 0.5, maximum)
        p95 = _percentile(found, readings, 0.95, maximum)
    b_mean = corrected = below_share = None
    corr_int = b_time = 0.0
    if back is not None:
        b_time = measured
        corr_int = math.fsum(c_terms)
        if b_time > 0.0:
            b_mean = math.fsum(bl_terms) / b_time
            corrected = corr_int / b_time
            below_share = math.fsum(below_terms) / b_time
    ratio = share = None
    if benchmark is not None and mean is not None:
        ratio = mean / benchmark
        share = math.fsum(a_terms) / measured
    return PeriodStats(
        duration,
        measured,
        measured / duration if duration > 0 else 0.0,
        readings,
        mean,
        median,
        p95,
        maximum,
        peak,
        integral,
        b_mean,
        corrected,
        corr_int,
        b_time,
        below_share,
        ratio,
        share,
    )


def _ranks(n: int, q: float) -> tuple[int, ...]:
    lo = math.floor((n - 1) * q)
    return (lo,) if lo >= n - 1 else (lo, lo + 1)


def _percentile(found: dict[int, float], n: int, q: float, top: float) -> float:
    """The percentile of :func:`~driftdose.shift.stats.percentile` (Hyndman & Fan 1996,
    definition 7) from the order statistics at ranks lo and lo + 1 (``top``: the largest)."""
    lo = math.floor((n - 1) * q)
    if lo >= n - 1:
        return top
    h = (n - 1) * q
    x0, x1 = found[lo], found[lo + 1]
    return x0 + (h - lo) * (x1 - x0)  # percentile()'s formula at rank lo
