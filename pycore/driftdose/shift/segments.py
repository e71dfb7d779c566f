"""The readings of a series inside time intervals, each clipped to them, and the sums of
a period against its background; shared by the statistics (:mod:`driftdose.shift.stats`)
and their prepared-column path (:mod:`driftdose.shift.rangestats`)."""

from __future__ import annotations

import bisect
import math
from collections.abc import Sequence
from functools import reduce
from itertools import compress, repeat
from operator import add, gt, lt, mul, sub

from .series import TimeSeries

__all__ = ["against_background", "clipped", "segments"]


def segments(
    series: TimeSeries,
    values: Sequence[float | None],
    intervals: Sequence[tuple[float, float]],
) -> tuple[list[float], list[float], list[float], list[int]]:
    """Clipped reading intervals inside ``intervals``: starts, ends, values, reading index.

    Parameters
    ----------
    series : TimeSeries
        Reading times and intervals.
    values : sequence of float or None
        One value per reading (None: missing). [SI]
    intervals : sequence of (float, float)
        Disjoint, increasing time intervals [start, end). [s from start]

    Returns
    -------
    tuple of lists
        Start [s], end [s], value [SI] and reading index of each segment.

    """
    starts, ends, vals, idx, _, _ = clipped(series, values, intervals)
    return starts, ends, vals, idx


def clipped(
    series: TimeSeries,
    values: Sequence[float | None],
    intervals: Sequence[tuple[float, float]],
    background: Sequence[float | None] | None = None,
) -> tuple[list[float], list[float], list[float], list[int], list[float], list[float | None]]:
    """As :func:`segments`, with each segment's length and its background value.

    Readings without a missing value are taken as slices of the series' own arrays
    (:attr:`TimeSeries.ends`, :attr:`TimeSeries.lengths`); only the two clipped edge
    segments of each interval are computed here, with the same arithmetic as the rest.

    Parameters
    ----------
    series : TimeSeries
        Reading times and intervals.
    values : sequence of float or None
        One value per reading (None: missing). [SI]
    intervals : sequence of (float, float)
        Disjoint, increasing time intervals [start, end). [s from start]
    background : sequence of float or None, optional
        Background value per reading. [SI]

    Returns
    -------
    tuple of lists
        Starts [s], ends [s], values [SI], reading indices, lengths [s] and background
        values [SI] (empty without ``background``).

    """
    t, ends_all, lengths = series.t, series.ends, series.lengths
    s_out: list[float] = []
    e_out: list[float] = []
    v_out: list[float] = []
    i_out: list[int] = []
    d_out: list[float] = []
    b_out: list[float | None] = []
    for a, b in intervals:
        i = max(0, bisect.bisect_right(t, a) - 1)
        j = bisect.bisect_left(t, b)
        if j <= i:
            continue
        vs = values[i:j]
        if None in vs:
            ks = [k for k in range(i, j) if values[k] is not None]
            if not ks:
                continue
            starts = [t[k] for k in ks]
            ends = [ends_all[k] for k in ks]
            vals = [values[k] for k in ks]
            dts = [lengths[k] for k in ks]
            bs = [background[k] for k in ks] if background is not None else []
        else:
            ks = list(range(i, j))
            starts = list(t[i:j])
            ends = list(ends_all[i:j])
            vals = list(vs)
            dts = list(lengths[i:j])
            bs = list(background[i:j]) if background is not None else []
        # clip the first and last readings to the interval; drop one left with no time
        for k in {0, len(starts) - 1}:
            starts[k] = max(starts[k], a)
            ends[k] = min(ends[k], b)
            dts[k] = ends[k] - starts[k]
        if ends[-1] <= starts[-1]:
            del starts[-1], ends[-1], vals[-1], ks[-1], dts[-1]
            if bs:
                del bs[-1]
        if starts and ends[0] <= starts[0]:
            del starts[0], ends[0], vals[0], ks[0], dts[0]
            if bs:
                del bs[0]
        s_out += starts
        e_out += ends
        v_out += vals
        i_out += ks
        d_out += dts
        b_out += bs
    return s_out, e_out, v_out, i_out, d_out, b_out


def against_background(
    vals: list[float], dts: list[float], bvals: list[float | None]
) -> tuple[float, float, float, float]:
    """Σ tᵢ, Σ bᵢ tᵢ, Σ max(cᵢ − bᵢ, 0) tᵢ and the time below the background, over readings
    with a background value (sums taken in reading order, the corrected one exactly).

    Parameters
    ----------
    vals : list of float
        Values of the segments. [SI]
    dts : list of float
        Their lengths. [s]
    bvals : list of float or None
        Their background values (None: none). [SI]

    Returns
    -------
    tuple of float
        Time with a background [s], Σ bᵢ tᵢ [SI × s], corrected integral [SI × s], time
        below the background [s].

    """
    if None in bvals:
        keep = [b is not None for b in bvals]
        vals = list(compress(vals, keep))
        dts = list(compress(dts, keep))
        bvals = list(compress(bvals, keep))
    b_time = reduce(add, dts, 0.0)
    b_sum = reduce(add, map(mul, bvals, dts), 0.0)  # type: ignore[arg-type]
    diffs = list(map(sub, vals, bvals))  # type: ignore[arg-type]
    above = list(map(gt, diffs, repeat(0.0)))
    corr_int = math.fsum(map(mul, compress(diffs, above), compress(dts, above)))
    below_t = reduce(add, compress(dts, map(lt, diffs, repeat(0.0))), 0.0)
    return b_time, b_sum, corr_int, below_t
