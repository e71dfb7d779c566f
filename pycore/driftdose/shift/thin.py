"""Thinning a long series for drawing without losing its peaks.

The readings are cut into buckets of consecutive readings; each bucket keeps its first and
last time and, per column, its lowest and highest value in the order they occurred (the
min-max decimation common in plotting long signals). A gap in the logging starts a new bucket
and is marked by a point with no values, so a chart breaks its line there.
"""

from __future__ import annotations

from collections.abc import Sequence

__all__ = ["thin_minmax"]


def thin_minmax(
    t: Sequence[float],
    columns: Sequence[Sequence[float | None]],
    max_points: int = 2000,
    breaks: Sequence[float] = (),
) -> tuple[list[float], list[list[float | None]]]:
    """Keep each bucket's minimum and maximum of every column.

    Parameters
    ----------
    t : sequence of float
        Reading times, increasing. [s]
    columns : sequence of sequences of float or None
        Values per column, one per reading (None: missing).
    max_points : int
        Most points returned (about; two per bucket, plus one per gap) [-].
    breaks : sequence of float
        Times where a gap starts (a bucket never spans one; a point with None values is
        placed there). [s]

    Returns
    -------
    tuple
        Times and, per column, values; every column's highest and lowest value is kept.

    Examples
    --------
    >>> ts, (ys,) = thin_minmax(range(10), [[0, 1, 9, 2, 3, 4, 5, -1, 6, 7]], max_points=4)
    >>> max(ys), min(ys), len(ts) <= 6
    (9, -1, True)

    """
    n = len(t)
    if n <= max_points:
        return list(t), [list(c) for c in columns]
    size = max(1, -(-2 * n // max_points))  # readings per bucket
    gap_at = sorted(breaks)
    out_t: list[float] = []
    out_y: list[list[float | None]] = [[] for _ in columns]
    g = 0
    i = 0
    while i < n:
        j = min(n, i + size)
        while g < len(gap_at) and gap_at[g] <= t[i]:
            g += 1
        if g < len(gap_at) and t[j - 1] > gap_at[g]:  # stop the bucket at the gap
            k = i
            while k < j and t[k] <= gap_at[g]:
                k += 1
            j = max(k, i + 1)
        first, last = t[i], t[j - 1]
        pair: list[tuple[float | None, float | None]] = []
        for col in columns:
            lo_i = hi_i = -1
            for k in range(i, j):
                v = col[k]
                if v is None:
                    continue
                if lo_i < 0 or v < col[lo_i]:
                    lo_i = k
                if hi_i < 0 or v > col[hi_i]:
                    hi_i = k
            if lo_i < 0:
                pair.append((None, None))
            elif lo_i <= hi_i:
                pair.append((col[lo_i], col[hi_i]))
            else:
                pair.append((col[hi_i], col[lo_i]))
        out_t.append(first)
        for c, (a, _) in enumerate(pair):
            out_y[c].append(a)
        if last > first:
            out_t.append(last)
            for c, (_, b) in enumerate(pair):
                out_y[c].append(b)
        else:  # a bucket of one reading: both values are that reading
            pass
        if g < len(gap_at) and j < n and t[j] > gap_at[g] >= last:
            out_t.append(gap_at[g])
            for c in range(len(columns)):
                out_y[c].append(None)
        i = j
    return out_t, out_y
