"""Order statistics of a sample: percentiles and Spearman's rank correlation."""

from __future__ import annotations

import math
from collections.abc import Sequence


def percentile(values: Sequence[float], p: float) -> float:
    """The ``p``-th percentile (0-100) by linear interpolation between order statistics.

    Parameters
    ----------
    values : sequence of float
        The sample, in any order [unit of the values].
    p : float
        Percentile, 0 to 100 [%].

    Notes
    -----
    Hyndman & Fan (1996), Am. Stat. 50:361, definition 7 (numpy's default): h = (n - 1)
    p / 100, value x_(floor h) + (h - floor h)(x_(floor h + 1) - x_(floor h)).
    """
    xs = sorted(values)
    if not xs:
        raise ValueError("no values")
    h = (len(xs) - 1) * p / 100.0
    lo = math.floor(h)
    if lo + 1 >= len(xs):
        return xs[-1]
    return xs[lo] + (h - lo) * (xs[lo + 1] - xs[lo])


def _ranks(values: Sequence[float]) -> list[float]:
    """Ranks 1..n, tied values sharing the mean of their ranks."""
    n = len(values)
    order = sorted(range(n), key=values.__getitem__)
    ranks = [0.0] * n
    i = 0
    while i < n:
        j = i
        vi = values[order[i]]
        while j + 1 < n and values[order[j + 1]] == vi:
            j += 1
        mean_rank = (i + j) / 2.0 + 1.0
        for k in range(i, j + 1):
            ranks[order[k]] = mean_rank
        i = j + 1
    return ranks


def _pearson(rx: Sequence[float], ry: Sequence[float]) -> float | None:
    n = len(rx)
    mx, my = math.fsum(rx) / n, math.fsum(ry) / n
    sxy = math.fsum([(a - mx) * (b - my) for a, b in zip(rx, ry, strict=True)])
    sxx = math.fsum([(a - mx) ** 2 for a in rx])
    syy = math.fsum([(b - my) ** 2 for b in ry])
    if sxx == 0.0 or syy == 0.0:
        return None
    return max(-1.0, min(1.0, sxy / math.sqrt(sxx * syy)))


def spearman(x: Sequence[float], y: Sequence[float]) -> float | None:
    """Spearman rank correlation (Pearson's r of the ranks, ties ranked by their mean).

    Returns None when either sequence is constant. Spearman (1904), Am. J. Psychol. 15:72.

    Parameters
    ----------
    x, y : sequence of float
        Paired samples of equal length [any unit; ranks only are used].
    """
    if len(x) != len(y) or len(x) < 2:
        raise ValueError("two sequences of equal length >= 2 are needed")
    return _pearson(_ranks(x), _ranks(y))
