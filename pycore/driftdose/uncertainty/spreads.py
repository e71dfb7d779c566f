"""Spreads of uncertain inputs and the sample design drawn from a recorded seed.

:class:`Spread` (a uniform, triangular or lognormal factor around the nominal value) and
:func:`design` (Latin hypercube or plain Monte Carlo, from ``random.Random(seed)``).
"""

from __future__ import annotations

import math
import random
from dataclasses import dataclass
from statistics import NormalDist

KINDS = ("none", "uniform", "triangular", "lognormal")
"""Spread shapes: none, uniform and triangular factors (low, high; triangular peaks at 1),
lognormal factor with geometric mean 1 and a geometric standard deviation."""

INPUTS = ("median", "gsd", "density", "shape_factor", "breathing", "concentration")
"""Uncertain inputs, each a factor on its nominal value: every mode's median diameter and
GSD, particle density, dynamic shape factor, ventilation, and concentration."""

U_CLIP = 1e-4
"""Lognormal factors are drawn between the 0.01 % and 99.99 % points. [-]"""


@dataclass(frozen=True)
class Spread:
    """Multiplicative uncertainty of one input.

    Attributes
    ----------
    kind : str
        ``none``, ``uniform`` (factor from ``low`` to ``high``), ``triangular`` (from
        ``low`` to ``high``, most likely 1) or ``lognormal`` (geometric mean 1, geometric
        standard deviation ``gsd``, drawn between its 0.01 % and 99.99 % points).
    low, high : float
        Factor bounds, 0 < low <= 1 <= high. [-]
    gsd : float
        Geometric standard deviation of a lognormal factor, >= 1. [-]

    """

    kind: str = "none"
    low: float = 1.0
    high: float = 1.0
    gsd: float = 1.0

    def __post_init__(self) -> None:
        """Check the parameters of the chosen shape."""
        if self.kind not in KINDS:
            raise ValueError(f"unknown spread {self.kind!r}; valid: {', '.join(KINDS)}")
        if not (0.0 < self.low <= 1.0 <= self.high and math.isfinite(self.high)):
            raise ValueError("factor bounds must satisfy 0 < low <= 1 <= high")
        if not (1.0 <= self.gsd and math.isfinite(self.gsd)):
            raise ValueError("a lognormal factor's GSD must be at least 1")

    @property
    def uncertain(self) -> bool:
        """Whether the factor can differ from 1."""
        if self.kind in ("uniform", "triangular"):
            return self.low < self.high
        if self.kind == "lognormal":
            return self.gsd > 1.0
        return False

    def factor(self, u: float) -> float:
        """The factor at cumulative probability ``u`` (inverse distribution function).

        Notes
        -----
        Uniform: low + u (high - low). Triangular with mode c = 1 (inverse CDF, e.g.
        Law 2015, Simulation Modeling and Analysis, §8.3.15): low + sqrt(u (high - low)
        (c - low)) for u < (c - low)/(high - low), else high - sqrt((1 - u)(high - low)
        (high - c)). Lognormal: exp(z ln GSD), z the standard normal quantile of u.
        Zero-width spreads return exactly 1.0.
        """
        if self.kind == "none":
            return 1.0
        a, b = self.low, self.high
        if self.kind == "uniform":
            return a + u * (b - a)
        if self.kind == "triangular":
            if b == a:
                return a
            fc = (1.0 - a) / (b - a)
            if u < fc:
                return a + math.sqrt(u * (b - a) * (1.0 - a))
            return b - math.sqrt((1.0 - u) * (b - a) * (b - 1.0))
        u = min(max(u, U_CLIP), 1.0 - U_CLIP)
        return math.exp(NormalDist().inv_cdf(u) * math.log(self.gsd))

    def bounds(self) -> tuple[float, float]:
        """Smallest and largest factor that can be drawn. [-]"""
        if self.kind == "lognormal":
            return self.factor(0.0), self.factor(1.0)
        if self.kind == "none":
            return 1.0, 1.0
        return self.low, self.high


def design(
    spreads: dict[str, Spread], n: int, seed: int, method: str = "lhs"
) -> dict[str, list[float]]:
    """Draw ``n`` samples of the factors of every input.

    Parameters
    ----------
    spreads : dict
        Input name -> :class:`Spread`, in the order the draws are made.
    n : int
        Number of samples, >= 1 [-].
    seed : int
        Seed of ``random.Random``.
    method : str
        ``lhs`` (Latin hypercube: each input's range cut into n equally likely strata, one
        draw in each, strata paired at random; McKay, Beckman & Conover 1979) or ``mc``
        (independent draws).

    Returns
    -------
    dict
        Input name -> list of n factors.

    """
    if n < 1:
        raise ValueError("at least one sample is needed")
    if method not in ("lhs", "mc"):
        raise ValueError("method must be 'lhs' or 'mc'")
    rng = random.Random(seed)
    out: dict[str, list[float]] = {}
    for name, spread in spreads.items():
        if method == "mc":
            us = [rng.random() for _ in range(n)]
        else:
            perm = list(range(n))
            for i in range(n - 1, 0, -1):  # Fisher-Yates on the recorded stream
                j = int(rng.random() * (i + 1))
                perm[i], perm[j] = perm[j], perm[i]
            us = [(perm[i] + rng.random()) / n for i in range(n)]
        out[name] = [spread.factor(u) for u in us]
    return out
