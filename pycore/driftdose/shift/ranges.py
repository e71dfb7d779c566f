"""Range queries over one column of a logged series, prepared once per column.

Moving a period asks again for sums, order statistics and 15-minute means over a slightly
different range of readings. :class:`ColumnRanges` prepares the column once (blocks of
:data:`BLOCK` readings with their exact sums, sorted values, minima and maxima) so that each
question costs about ``n / BLOCK + 2 BLOCK`` element operations instead of ``n``:

- sums over a range: the blocks' sums (each by :func:`math.fsum`) and the readings at the
  range's ends, added by :func:`math.fsum` (within a few units in the last place of the
  exact sum);
- the k-th smallest value over ranges: a bisection over the column's sorted values,
  counting with :func:`bisect.bisect_right` in each sorted block (exact: order statistics
  are values of the column);
- minimum and maximum over a range;
- the highest sum of ``m`` consecutive readings: window sums from a running sum, the best
  ones added again exactly.

:class:`driftdose.shift.stats.stats_over` uses it for columns without missing values.
"""

from __future__ import annotations

import bisect
import heapq
import math
from collections.abc import Callable, Sequence
from itertools import accumulate, repeat
from operator import sub

__all__ = ["BLOCK", "ColumnRanges", "RangeArray"]

BLOCK = 512
"""Readings per block."""

EPS = 2.0**-52
"""Spacing of floats at 1 (double precision). [-]"""


class RangeArray:
    """One array of numbers with block sums, minima and maxima for range questions.

    Parameters
    ----------
    values : sequence of float
        The numbers, one per reading [any unit].
    """

    def __init__(self, values: Sequence[float]) -> None:
        self.values = values
        n = len(values)
        blocks = [values[k : k + BLOCK] for k in range(0, n, BLOCK)]
        self.sums = [math.fsum(b) for b in blocks]
        self._mins: list[float] | None = None
        self._maxs: list[float] | None = None
        self._blocks = blocks

    def _full(self, i: int, j: int) -> tuple[int, int]:
        """Blocks lying wholly inside [i, j): their indices b0 <= b < b1."""
        b0 = -(-i // BLOCK)
        b1 = j // BLOCK
        return b0, max(b0, b1)

    def terms(self, i: int, j: int) -> list[float]:
        """Numbers whose exact sum is the sum of values[i:j] (block sums and end readings)."""
        if j <= i:
            return []
        b0, b1 = self._full(i, j)
        if b1 <= b0:
            return list(self.values[i:j])
        v = self.values
        return [*v[i : b0 * BLOCK], *self.sums[b0:b1], *v[b1 * BLOCK : j]]

    def _edges(self, i: int, j: int, pick: Callable[..., float]) -> float:
        b0, b1 = self._full(i, j)
        if b1 <= b0:
            return pick(self.values[i:j])
        if self._mins is None or self._maxs is None:
            self._mins = [min(b) for b in self._blocks]
            self._maxs = [max(b) for b in self._blocks]
        whole = self._mins if pick is min else self._maxs
        parts = [pick(whole[b0:b1])]
        if i < b0 * BLOCK:
            parts.append(pick(self.values[i : b0 * BLOCK]))
        if b1 * BLOCK < j:
            parts.append(pick(self.values[b1 * BLOCK : j]))
        return pick(parts)

    def minimum(self, i: int, j: int) -> float:
        """Smallest of values[i:j] (j > i)."""
        return self._edges(i, j, min)

    def maximum(self, i: int, j: int) -> float:
        """Largest of values[i:j] (j > i)."""
        return self._edges(i, j, max)


class ColumnRanges(RangeArray):
    """A column of values (no missing ones) prepared for order statistics and window sums.

    Parameters
    ----------
    values : sequence of float
        One value per reading [SI of the quantity].
    """

    def __init__(self, values: Sequence[float]) -> None:
        super().__init__(values)
        self._sorted_blocks = [sorted(b) for b in self._blocks]
        self._all = sorted(values)
        self._windows: dict[int, tuple[list[float], RangeArray, float]] = {}

    def _pieces(self, ranges: Sequence[tuple[int, int]]) -> list[list[float]]:
        """Sorted lists whose union is the values over ``ranges``."""
        out: list[list[float]] = []
        for i, j in ranges:
            if j <= i:
                continue
            b0, b1 = self._full(i, j)
            if b1 <= b0:
                out.append(sorted(self.values[i:j]))
                continue
            out.extend(self._sorted_blocks[b0:b1])
            if i < b0 * BLOCK:
                out.append(sorted(self.values[i : b0 * BLOCK]))
            if b1 * BLOCK < j:
                out.append(sorted(self.values[b1 * BLOCK : j]))
        return out

    def order_statistics(self, ranges: Sequence[tuple[int, int]], ks: Sequence[int]) -> list[float]:
        """The k-th smallest value (k from 0) over the readings of ``ranges``, for each k.

        Parameters
        ----------
        ranges : sequence of (int, int)
            Disjoint index ranges [i, j) of readings.
        ks : sequence of int
            Ranks wanted, each 0 <= k < number of readings in the ranges.

        Returns
        -------
        list of float
            The values, in the order of ``ks`` [SI of the quantity].
        """
        pieces = self._pieces(ranges)
        everything = self._all

        def count(x: float) -> int:
            return sum(map(bisect.bisect_right, pieces, repeat(x)))

        out = []
        for k in ks:
            lo, hi = 0, len(everything) - 1  # smallest p with count(everything[p]) > k
            while lo < hi:
                mid = (lo + hi) // 2
                if count(everything[mid]) > k:
                    hi = mid
                else:
                    lo = mid + 1
            out.append(everything[lo])
        return out

    def highest_window(self, i: int, j: int, m: int) -> float:
        """Highest sum of ``m`` consecutive values among values[i:j] (j - i >= m).

        Window sums come from one running sum of the column; those within its rounding
        of the highest are summed again exactly (:func:`math.fsum`), and the largest is
        returned.
        """
        got = self._windows.get(m)
        if got is None:
            cum = list(accumulate(self.values, initial=0.0))
            sums = list(map(sub, cum[m:], cum[: len(self.values) - m + 1]))
            slack = 8.0 * EPS * max(map(abs, cum)) + 8.0 * EPS * max(map(abs, sums))
            got = (sums, RangeArray(sums), slack)
            self._windows[m] = got
        sums, ranges, slack = got
        last = j - m + 1  # windows start at i .. j - m
        top = ranges.maximum(i, last)
        near = _at_least(ranges, i, last, top - slack)
        if len(near) > 64:  # many windows alike: the best by the running sum
            near = heapq.nlargest(64, near, key=sums.__getitem__)
        return max(math.fsum(self.values[r : r + m]) for r in near)


def _at_least(array: RangeArray, i: int, j: int, level: float) -> list[int]:
    """Indices r in [i, j) with array.values[r] >= level (blocks below it are skipped)."""
    out: list[int] = []
    v = array.values
    k = i
    while k < j:
        stop = min(j, (k // BLOCK + 1) * BLOCK)
        if k % BLOCK == 0 and stop - k == BLOCK and array.maximum(k, stop) < level:
            k = stop
            continue
        out.extend(r for r in range(k, stop) if v[r] >= level)
        k = stop
    return out
