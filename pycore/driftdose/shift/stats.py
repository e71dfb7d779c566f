"""Statistics of logged concentrations over periods and over a shift; the 8-hour TWA.

Each reading stands for its own interval (sample and hold, see :mod:`driftdose.shift.series`);
a period's statistics use every reading whose interval overlaps the period, weighted by the
overlap. Definitions:

- **mean**: time-weighted mean over the measured part of the period, Σ cᵢ tᵢ / Σ tᵢ (the
  usual time-weighted average concentration; common practice);
- **median, 95th percentile**: of the readings, linear interpolation between order statistics
  (Hyndman & Fan 1996, Am. Stat. 50:361, definition 7; the default of spreadsheets and numpy);
- **maximum**: the highest reading;
- **highest 15-minute mean**: the highest time-weighted mean over any 15-minute window inside
  the period (for the shift: inside a stretch between breaks; windows at least half measured,
  the mean over their measured part), the
  short-term reference period of EN 689:2018 (15 min; common practice for short-term limits);
- **background-corrected mean**: Σ max(cᵢ − bᵢ, 0) tᵢ / Σ tᵢ over readings with a background
  value bᵢ; readings below the background count with zero and their time share is reported;
- **coverage**: measured time ÷ period length;
- **benchmark**: mean ÷ benchmark, and the share of measured time above the benchmark;
- **8-hour TWA** (:func:`twa8h`): TWA = Σ cᵢ tᵢ / 8 h over the shift (EN 689:2018, 8-h
  reference period; the same formula as the UK HSE's EH40/2005, from memory), with the
  unmeasured part of the 8 hours counted as zero, as the background, or left out (then the
  mean over the measured time).
"""

from __future__ import annotations

import bisect
import math
from collections.abc import Sequence
from dataclasses import dataclass
from itertools import accumulate, compress, repeat
from operator import gt, mul, sub

from .segments import against_background, clipped
from .series import TimeSeries

__all__ = [
    "SHORT_TERM",
    "TWA_REFERENCE",
    "UNMEASURED_RULES",
    "PeriodStats",
    "mean_over",
    "percentile",
    "stats_each",
    "stats_over",
    "twa8h",
]

SHORT_TERM = 900.0
"""Short-term reference period, 15 min (EN 689:2018). [s]"""

TWA_REFERENCE = 8 * 3600.0
"""Reference period of the daily time-weighted average, 8 h (EN 689:2018). [s]"""

WINDOW_MIN_COVERAGE = 0.5
"""A 15-minute window counts when at least this share of it was measured (our rule)."""

UNMEASURED_RULES = ("zero", "background", "excluded")
"""What the unmeasured part of the 8-h reference period counts as."""


@dataclass(frozen=True)
class PeriodStats:
    """Statistics of one quantity over a period (or the shift). Values in SI of the quantity.

    Attributes
    ----------
    duration : float
        Length of the period (breaks left out for the shift). [s]
    measured : float
        Time with readings. [s]
    coverage : float
        measured ÷ duration. [-]
    readings : int
        Readings that overlap the period.
    mean, median, p95, maximum : float or None
        Time-weighted mean; median, 95th percentile and maximum of the readings.
    peak15 : float or None
        Highest 15-minute time-weighted mean (None when no window qualifies).
    integral : float
        Σ cᵢ tᵢ over the period. [SI × s]
    background_mean : float or None
        Time-weighted mean of the background over readings that have one.
    corrected_mean : float or None
        Background-corrected mean (values below the background as zero).
    corrected_integral : float
        Σ max(cᵢ − bᵢ, 0) tᵢ over readings with a background. [SI × s]
    background_time : float
        Measured time with a background value. [s]
    below_background_share : float or None
        Share of that time with the reading below the background. [-]
    ratio : float or None
        mean ÷ benchmark. [-]
    share_above : float or None
        Share of measured time with readings above the benchmark. [-]

    """

    duration: float
    measured: float
    coverage: float
    readings: int
    mean: float | None
    median: float | None
    p95: float | None
    maximum: float | None
    peak15: float | None
    integral: float
    background_mean: float | None
    corrected_mean: float | None
    corrected_integral: float
    background_time: float
    below_background_share: float | None
    ratio: float | None
    share_above: float | None


def percentile(sorted_values: Sequence[float], q: float) -> float:
    """Percentile by linear interpolation between order statistics.

    Parameters
    ----------
    sorted_values : sequence of float
        Values in increasing order, at least one [unit of the values].
    q : float
        Probability, 0 to 1. [-]

    Returns
    -------
    float
        x[⌊h⌋] + (h − ⌊h⌋)(x[⌊h⌋+1] − x[⌊h⌋]) with h = (n − 1) q (Hyndman & Fan 1996,
        definition 7).

    Examples
    --------
    >>> percentile([1.0, 2.0, 3.0, 4.0], 0.5), round(percentile([1.0, 2.0, 3.0, 4.0], 0.95), 12)
    (2.5, 3.85)

    """
    n = len(sorted_values)
    h = (n - 1) * q
    lo = math.floor(h)
    if lo >= n - 1:
        return sorted_values[-1]
    return sorted_values[lo] + (h - lo) * (sorted_values[lo + 1] - sorted_values[lo])


def _peak(
    starts: list[float], ends: list[float], vals: list[float], lo: float, hi: float
) -> float | None:
    """Highest mean over windows [x, x + 15 min] ⊂ [lo, hi], over their measured part.

    The window integral and measured time are piecewise linear in x with breaks where an
    edge meets a segment end; their ratio is monotone between breaks, so the maximum is at a
    break. The candidates are swept in order with two moving pointers.
    """
    w = SHORT_TERM
    if hi - lo < w or not starts:
        return None
    n = len(starts)
    regular = _regular_peak(starts, ends, vals, lo, hi)
    if regular is not None:
        return regular
    # cumulative integral and measured time at each segment start
    cum_i = [0.0] * (n + 1)
    cum_m = [0.0] * (n + 1)
    for k in range(n):
        d = ends[k] - starts[k]
        cum_i[k + 1] = cum_i[k] + vals[k] * d
        cum_m[k + 1] = cum_m[k] + d
    last = hi - w
    cand = {lo, last}
    cand.update(x for x in starts if lo <= x <= last)
    cand.update(x for x in ends if lo <= x <= last)
    cand.update(y for x in starts if lo <= (y := x - w) <= last)
    cand.update(y for x in ends if lo <= (y := x - w) <= last)
    xs = sorted(cand)
    best: float | None = None
    need = WINDOW_MIN_COVERAGE * w - 1e-9
    p0 = p1 = 0
    for x in xs:
        # integral and measured time up to x (pointer p0) and up to x + w (pointer p1)
        while p0 < n and ends[p0] <= x:
            p0 += 1
        i0, m0 = cum_i[p0], cum_m[p0]
        if p0 < n and starts[p0] < x:
            i0 += vals[p0] * (x - starts[p0])
            m0 += x - starts[p0]
        y = x + w
        while p1 < n and ends[p1] <= y:
            p1 += 1
        i1, m1 = cum_i[p1], cum_m[p1]
        if p1 < n and starts[p1] < y:
            i1 += vals[p1] * (y - starts[p1])
            m1 += y - starts[p1]
        m = m1 - m0
        if m >= need:
            mean = (i1 - i0) / m
            if best is None or mean > best:
                best = mean
    return best


def _regular_peak(
    starts: list[float], ends: list[float], vals: list[float], lo: float, hi: float
) -> float | None:
    """The highest 15-min mean when the readings tile [lo, hi] in equal steps that divide
    15 min (regular logging without holes): every window edge then crosses reading edges
    together, so the highest mean is that of some run of whole readings (None otherwise)."""
    n = len(starts)
    d = ends[0] - starts[0]
    if d <= 0.0 or starts[0] != lo or ends[-1] != hi:
        return None
    m = round(SHORT_TERM / d)
    if m < 1 or m > n or abs(m * d - SHORT_TERM) > 1e-9 * SHORT_TERM:
        return None
    tol = 1e-9 * d
    if n > 1:
        # every reading starts where the one before ends and lasts d (within tol); the
        # largest departure decides, as it would reading by reading
        if max(map(abs, map(sub, starts[1:], ends[:-1]))) > tol:
            return None
        lengths = map(sub, ends[1:], starts[1:])
        if max(map(abs, map(sub, lengths, repeat(d)))) > tol:
            return None
    cum = list(accumulate(vals, initial=0.0))
    return max(map(sub, cum[m:], cum[: n - m + 1])) / m


def mean_over(
    series: TimeSeries,
    values: Sequence[float | None],
    intervals: Sequence[tuple[float, float]],
) -> tuple[float | None, float, float]:
    """Time-weighted mean, Σ cᵢ tᵢ and Σ tᵢ over intervals (mean None if nothing measured).

    Parameters
    ----------
    series : TimeSeries
        Reading times and intervals.
    values : sequence of float or None
        One value per reading. [SI]
    intervals : sequence of (float, float)
        Disjoint, increasing intervals. [s from start]

    Returns
    -------
    tuple
        Mean [SI], integral [SI × s], measured time [s].

    """
    _, _, vals, _, dts, _ = clipped(series, values, intervals)
    measured = math.fsum(dts)
    integral = math.fsum(map(mul, vals, dts))
    return (integral / measured if measured > 0.0 else None), integral, measured


def stats_over(
    series: TimeSeries,
    values: Sequence[float | None],
    intervals: Sequence[tuple[float, float]],
    background: Sequence[float | None] | None = None,
    benchmark: float | None = None,
) -> PeriodStats:
    """Statistics of one quantity over one or more disjoint intervals (see the module notes).

    Parameters
    ----------
    series : TimeSeries
        Reading times and intervals.
    values : sequence of float or None
        One value per reading (None: missing). [SI]
    intervals : sequence of (float, float)
        Disjoint, increasing time intervals [start, end). [s from start]
    background : sequence of float or None, optional
        Background value per reading (None: no background for it). [SI]
    benchmark : float, optional
        Value to compare with, > 0. [SI]

    Returns
    -------
    PeriodStats
        The statistics; the values are None where nothing was measured.

    """
    from .rangestats import indexed_stats  # prepared columns: a moved period costs little

    fast = indexed_stats(series, values, intervals, background, benchmark)
    if fast is not None:
        return fast  # type: ignore[no-any-return]
    return stats_each(series, values, intervals, background, benchmark)


def stats_each(
    series: TimeSeries,
    values: Sequence[float | None],
    intervals: Sequence[tuple[float, float]],
    background: Sequence[float | None] | None = None,
    benchmark: float | None = None,
) -> PeriodStats:
    """:func:`stats_over` reading by reading: the general path, for columns with missing
    values (and the reference of the prepared path in the tests).

    Parameters
    ----------
    series : TimeSeries
        Reading times and intervals.
    values : sequence of float or None
        One value per reading (None: missing). [SI]
    intervals : sequence of (float, float)
        Disjoint, increasing time intervals [start, end). [s from start]
    background : sequence of float or None, optional
        Background value per reading (None: no background for it). [SI]
    benchmark : float, optional
        Value to compare with, > 0. [SI]

    Returns
    -------
    PeriodStats
        The statistics; the values are None where nothing was measured.

    """
    starts, ends, vals, _, dts, bvals = clipped(series, values, intervals, background)
    duration = sum(b - a for a, b in intervals)
    measured = math.fsum(dts)
    integral = math.fsum(map(mul, vals, dts))
    readings = len(vals)
    mean = median = p95 = maximum = None
    if measured > 0.0:
        mean = integral / measured
        ordered = sorted(vals)
        median = percentile(ordered, 0.5)
        p95 = percentile(ordered, 0.95)
        maximum = ordered[-1]
    peak = None
    for a, b in intervals:  # windows lie inside one interval (not across a break)
        k0, k1 = bisect.bisect_left(ends, a), bisect.bisect_left(starts, b)
        p = _peak(starts[k0:k1], ends[k0:k1], vals[k0:k1], a, b)
        if p is not None and (peak is None or p > peak):
            peak = p
    b_mean = corrected = below = None
    corr_int = b_time = 0.0
    if background is not None:
        b_time, b_sum, corr_int, below_t = against_background(vals, dts, bvals)
        if b_time > 0.0:
            b_mean = b_sum / b_time
            corrected = corr_int / b_time
            below = below_t / b_time
    ratio = share = None
    if benchmark is not None and mean is not None:
        ratio = mean / benchmark
        share = math.fsum(compress(dts, map(gt, vals, repeat(benchmark)))) / measured
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
        below,
        ratio,
        share,
    )


def twa8h(
    integral: float, measured: float, unmeasured_as: str, background: float | None = None
) -> float | None:
    """The 8-hour time-weighted average of a shift.

    Parameters
    ----------
    integral : float
        Σ cᵢ tᵢ over the shift's measured time. [SI × s]
    measured : float
        Measured time of the shift. [s]
    unmeasured_as : str
        ``zero``: TWA = Σ cᵢ tᵢ / 8 h; ``background``: the unmeasured rest of the 8 hours
        (if any) at ``background``; ``excluded``: Σ cᵢ tᵢ / Σ tᵢ (the mean over measured
        time, not an 8-h TWA when less than 8 h were measured).
    background : float, optional
        Concentration for unmeasured time with ``background``. [SI]

    Returns
    -------
    float or None
        The TWA [SI], None when nothing was measured (``excluded``).

    Notes
    -----
    TWA₈ₕ = Σ cᵢ tᵢ / 8 h, the daily exposure over an 8-h reference period (EN 689:2018;
    the same formula in HSE EH40/2005, from memory). A shift longer than 8 h still divides
    by 8 h.

    Examples
    --------
    >>> twa8h(2.0 * 4 * 3600, 4 * 3600.0, "zero")  # 4 h at 2, then nothing
    1.0
    >>> twa8h(2.0 * 4 * 3600, 4 * 3600.0, "background", 0.5)
    1.25

    """
    if unmeasured_as == "zero":
        return integral / TWA_REFERENCE
    if unmeasured_as == "background":
        if background is None:
            raise ValueError("a background value is needed to count unmeasured time as it")
        rest = max(0.0, TWA_REFERENCE - measured)
        return (integral + background * rest) / TWA_REFERENCE
    if unmeasured_as == "excluded":
        return integral / measured if measured > 0.0 else None
    raise ValueError(f"unknown rule {unmeasured_as!r}; valid: {', '.join(UNMEASURED_RULES)}")
