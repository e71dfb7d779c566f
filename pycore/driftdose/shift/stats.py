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
  the period (windows at least half measured, the mean over their measured part), the
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

from .series import TimeSeries

__all__ = [
    "SHORT_TERM",
    "TWA_REFERENCE",
    "UNMEASURED_RULES",
    "PeriodStats",
    "percentile",
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
        Values in increasing order, at least one.
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


def _segments(
    series: TimeSeries,
    values: Sequence[float | None],
    intervals: Sequence[tuple[float, float]],
) -> tuple[list[float], list[float], list[float], list[int]]:
    """Clipped reading intervals inside ``intervals``: starts, ends, values, reading index."""
    t, hold = series.t, series.hold
    s_out: list[float] = []
    e_out: list[float] = []
    v_out: list[float] = []
    i_out: list[int] = []
    for a, b in intervals:
        i = max(0, bisect.bisect_right(t, a) - 1)
        j = bisect.bisect_left(t, b)
        for k in range(i, j):
            c = values[k]
            if c is None:
                continue
            s = t[k] if t[k] > a else a
            e = t[k] + hold[k]
            if e > b:
                e = b
            if e > s:
                s_out.append(s)
                e_out.append(e)
                v_out.append(c)
                i_out.append(k)
    return s_out, e_out, v_out, i_out


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
    # cumulative integral and measured time at each segment start
    cum_i = [0.0] * (n + 1)
    cum_m = [0.0] * (n + 1)
    for k in range(n):
        d = ends[k] - starts[k]
        cum_i[k + 1] = cum_i[k] + vals[k] * d
        cum_m[k + 1] = cum_m[k] + d
    last = hi - w
    cand = {lo, last}
    for s, e in zip(starts, ends, strict=True):
        for x in (s, e, s - w, e - w):
            if lo <= x <= last:
                cand.add(x)
    xs = sorted(cand)

    def at(x: float, p: int) -> tuple[float, float, int]:
        while p < n and ends[p] <= x:
            p += 1
        ci, cm = cum_i[p], cum_m[p]
        if p < n and starts[p] < x:
            d = x - starts[p]
            ci += vals[p] * d
            cm += d
        return ci, cm, p

    best: float | None = None
    p0 = p1 = 0
    need = WINDOW_MIN_COVERAGE * w
    for x in xs:
        i0, m0, p0 = at(x, p0)
        i1, m1, p1 = at(x + w, p1)
        m = m1 - m0
        if m >= need - 1e-9:
            mean = (i1 - i0) / m
            if best is None or mean > best:
                best = mean
    return best


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
    starts, ends, vals, idx = _segments(series, values, intervals)
    duration = sum(b - a for a, b in intervals)
    dts = [e - s for s, e in zip(starts, ends, strict=True)]
    measured = math.fsum(dts)
    integral = math.fsum(c * d for c, d in zip(vals, dts, strict=True))
    readings = len(vals)
    mean = median = p95 = maximum = None
    if measured > 0.0:
        mean = integral / measured
        ordered = sorted(vals)
        median = percentile(ordered, 0.5)
        p95 = percentile(ordered, 0.95)
        maximum = ordered[-1]
    lo, hi = (intervals[0][0], intervals[-1][1]) if intervals else (0.0, 0.0)
    peak = _peak(starts, ends, vals, lo, hi)
    b_mean = corrected = below = None
    corr_int = b_time = 0.0
    if background is not None:
        b_sum = below_t = 0.0
        corr_terms: list[float] = []
        for k, c, d in zip(idx, vals, dts, strict=True):
            b = background[k]
            if b is None:
                continue
            b_time += d
            b_sum += b * d
            diff = c - b
            if diff > 0.0:
                corr_terms.append(diff * d)
            elif diff < 0.0:
                below_t += d
        corr_int = math.fsum(corr_terms)
        if b_time > 0.0:
            b_mean = b_sum / b_time
            corrected = corr_int / b_time
            below = below_t / b_time
    ratio = share = None
    if benchmark is not None and mean is not None:
        ratio = mean / benchmark
        share = math.fsum(d for c, d in zip(vals, dts, strict=True) if c > benchmark) / measured
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
