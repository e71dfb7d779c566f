"""Where a curve crosses a level, and the size bands it passes at or above one.

Used by the sampling composer (50 % sizes of every stage, size bands passed by the chain).
"""

from __future__ import annotations

import math
from collections.abc import Sequence

__all__ = ["crossings", "pass_bands"]


def crossings(xs: Sequence[float], ys: Sequence[float], level: float) -> list[float]:
    """Sizes where a curve crosses ``level``.

    Parameters
    ----------
    xs : sequence of float
        Increasing positive sizes. [m]
    ys : sequence of float
        Curve values at those sizes. [-]
    level : float
        The level. [-]

    Returns
    -------
    list of float
        One size per crossing, interpolated linearly in y and logarithmically in x. [m]

    Examples
    --------
    >>> [round(x, 6) for x in crossings([1.0, 100.0], [1.0, 0.0], 0.5)]
    [10.0]

    """
    out = []
    for i in range(len(xs) - 1):
        y0, y1 = ys[i] - level, ys[i + 1] - level
        if (y0 < 0.0) != (y1 < 0.0):
            t = y0 / (y0 - y1)
            out.append(math.exp(math.log(xs[i]) + t * (math.log(xs[i + 1]) - math.log(xs[i]))))
    return out


def pass_bands(
    xs: Sequence[float], ys: Sequence[float], level: float = 0.5
) -> list[tuple[float | None, float | None]]:
    """Size bands where a curve is at or above ``level``.

    Parameters
    ----------
    xs : sequence of float
        Increasing positive sizes. [m]
    ys : sequence of float
        Curve values at those sizes. [-]
    level : float
        The level (50 % by default). [-]

    Returns
    -------
    list of tuple
        (lower, upper) edges [m] of each band; None where a band reaches an end of ``xs``.
        Empty when no size reaches the level; ``[(None, None)]`` when every size does.

    """
    above = [y >= level for y in ys]
    edges: list[float | None] = list(crossings(xs, ys, level))
    if above and above[0]:
        edges.insert(0, None)
    if above and above[-1]:
        edges.append(None)
    return [(edges[i], edges[i + 1]) for i in range(0, len(edges) - 1, 2)]
