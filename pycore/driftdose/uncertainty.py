"""Propagation of input uncertainty to regional dose and retained burden.

Interfaces: :class:`Spread` (a multiplicative uncertainty: uniform, triangular or lognormal
factor around the nominal value), :func:`design` (Latin-hypercube or plain Monte Carlo
sample of the factors from a recorded seed), :class:`DepositionTables` (regional deposition
tabulated once against size and interpolated for each sample), :func:`percentile`,
:func:`spearman` and :func:`propagate`.

Reproducibility: the only source of randomness is ``random.Random(seed).random()`` (the
Mersenne Twister, whose stream for a given integer seed is the same in every CPython
version); permutations are drawn by our own Fisher-Yates loop on that stream, and normal
quantiles come from ``statistics.NormalDist``. A seed therefore reproduces the same sample
in CPython and in the page; numbers derived from it agree to the last few bits of the
platform's ``exp`` and ``log``.

Speed: the ICRP 66 regional model is evaluated once per table node, not per sample: the
deposition fraction of each region (and the slow-cleared bronchial share of ICRP 66) is
tabulated on a grid in ln d from 1 nm to 100 um for a few densities and shape factors that
span the sampled ones, and each sample interpolates linearly in ln d, ln density and ln
shape factor. Each sample's lognormal modes are integrated by Gauss-Hermite quadrature.
The nominal case is computed with the full model, and every sample is the nominal value
times the ratio fast(sample) / fast(nominal) (a ratio estimator): the interpolation error,
which is nearly the same for nearby inputs, cancels to first order, and a propagation whose
ranges all have zero width returns the full model's nominal result exactly.
"""

from __future__ import annotations

import math
import random
from collections.abc import Callable, Sequence
from dataclasses import dataclass, field
from statistics import NormalDist
from typing import Any

from ._numerics import logspace
from .deposition import Subject
from .distribution import WEIGHTS, gauss_hermite
from .dose import deposition_curves
from .retention.model import slow_fraction

__all__ = [
    "INPUTS",
    "KINDS",
    "DepositionTables",
    "Spread",
    "design",
    "percentile",
    "propagate",
    "spearman",
]

KINDS = ("none", "uniform", "triangular", "lognormal")
"""Spread shapes: none, uniform and triangular factors (low, high; triangular peaks at 1),
lognormal factor with geometric mean 1 and a geometric standard deviation."""

INPUTS = ("median", "gsd", "density", "shape_factor", "breathing", "concentration")
"""Uncertain inputs, each a factor on its nominal value: every mode's median diameter and
GSD, particle density, dynamic shape factor, ventilation, and concentration."""

U_CLIP = 1e-4
"""Lognormal factors are drawn between the 0.01 % and 99.99 % points. [-]"""

REGIONS = ("ET1", "ET2", "BB", "bb", "AI")
COLUMNS = (*REGIONS, "total", "BB_slow", "bb_slow")
TABLE_STEP = 0.04  # grid step in ln d of the tables
NODE_SPACING = 0.15  # largest step in ln density and ln shape factor between table nodes
GH_NODES = 12


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


def table_nodes(nominal: float, lo: float, hi: float) -> list[float]:
    """Table nodes in ln(value) spanning nominal * [lo, hi], at most NODE_SPACING apart.

    Parameters
    ----------
    nominal : float
        Nominal value [unit of the value: kg/m^3 for a density, - for a shape factor].
    lo, hi : float
        Smallest and largest factor drawn [-].
    """
    if lo == hi == 1.0:
        return [nominal]
    a, b = math.log(nominal * lo), math.log(nominal * hi)
    m = max(2, math.ceil((b - a) / NODE_SPACING) + 1)
    return [math.exp(a + (b - a) * i / (m - 1)) for i in range(m)]


@dataclass
class DepositionTables:
    """Regional deposition fractions tabulated against size for a few densities and shapes.

    Parameters
    ----------
    subject : Subject
        Breathing (fixed across samples: the breathing factor scales the ventilation only).
    densities, shape_factors : sequence of float
        Table nodes, increasing. [kg/m^3], [-]
    thermodynamic : str
        How the shape factor enters diffusion (see :func:`driftdose.dose.deposition_curves`).

    Notes
    -----
    Fractions: ICRP 66 Annex D (through :func:`driftdose.dose.deposition_curves`); slow-
    cleared shares: :func:`driftdose.retention.model.slow_fraction` (ICRP 66 chapter 5).
    """

    subject: Subject
    densities: Sequence[float]
    shape_factors: Sequence[float]
    thermodynamic: str = "icrp66"
    ln_d: list[float] = field(init=False)
    tables: dict[tuple[int, int], list[tuple[float, ...]]] = field(init=False)
    rows: dict[tuple[int, int], list[tuple[tuple[float, ...], tuple[float, ...]]]] = field(
        init=False
    )

    def __post_init__(self) -> None:
        """Evaluate the full model at every node."""
        n = round(math.log(100e-6 / 1e-9) / TABLE_STEP) + 1
        sizes = logspace(1e-9, 100e-6, n)
        self.ln_d = [math.log(d) for d in sizes]
        self.tables = {}
        for i, rho in enumerate(self.densities):
            for j, chi in enumerate(self.shape_factors):
                c = deposition_curves("icrp66", sizes, rho, chi, self.subject, self.thermodynamic)
                fs = [slow_fraction(d, rho, chi) for d in c["d_ae"]]
                self.tables[(i, j)] = [
                    (
                        c["ET1"][k],
                        c["ET2"][k],
                        c["BB"][k],
                        c["bb"][k],
                        c["AI"][k],
                        c["total"][k],
                        c["BB"][k] * fs[k],
                        c["bb"][k] * fs[k],
                    )
                    for k in range(n)
                ]
        # each grid interval as (value at its start, difference to its end), by column
        self.rows = {
            key: [
                (t[k], tuple(b - a for a, b in zip(t[k], t[k + 1], strict=True)))
                for k in range(n - 1)
            ]
            for key, t in self.tables.items()
        }

    def _corner_weights(self, rho: float, chi: float) -> list[tuple[tuple[int, int], float]]:
        def axis(nodes: Sequence[float], x: float) -> list[tuple[int, float]]:
            if len(nodes) == 1:
                return [(0, 1.0)]
            lx = math.log(x)
            ln = [math.log(v) for v in nodes]  # a few nodes
            if lx <= ln[0]:
                return [(0, 1.0)]
            if lx >= ln[-1]:
                return [(len(ln) - 1, 1.0)]
            i = max(k for k in range(len(ln) - 1) if ln[k] <= lx)
            t = (lx - ln[i]) / (ln[i + 1] - ln[i])
            return [(i, 1.0 - t), (i + 1, t)]

        return [
            ((i, j), wi * wj)
            for i, wi in axis(self.densities, rho)
            for j, wj in axis(self.shape_factors, chi)
            if wi * wj != 0.0
        ]

    def integrals(
        self, distribution: Any, weights: Sequence[str] = WEIGHTS
    ) -> dict[str, dict[str, float]]:
        """Sum of deposition fraction times amount per volume of air, by column and weight.

        Returns ``out[weight][column]`` in [1/m^3], [m^2/m^3], [kg/m^3] for the columns ET1,
        ET2, BB, bb, AI, total, BB_slow, bb_slow. Gauss-Hermite quadrature in ln d (12 nodes per
        mode and weight), the tables interpolated linearly in ln d, ln density and ln shape
        factor.
        """
        xs, ws = gauss_hermite(GH_NODES)
        ncol = len(COLUMNS)
        out = {w: dict.fromkeys(COLUMNS, 0.0) for w in weights}
        lo, step, last = self.ln_d[0], TABLE_STEP, len(self.ln_d) - 1
        for mode in getattr(distribution, "modes", (distribution,)):
            corners = self._corner_weights(mode.density, mode.shape_factor)
            s = mode.ln_gsd * math.sqrt(2.0)
            for w in weights:
                total = mode.total(w) / math.sqrt(math.pi)
                mu = math.log(mode.median(w))
                acc = [0.0] * ncol
                for x, wt in zip(xs, ws, strict=True):
                    pos = (mu + s * x - lo) / step
                    if pos <= 0.0:
                        k, t = 0, 0.0
                    elif pos >= last:
                        k, t = last - 1, 1.0
                    else:
                        k = int(pos)
                        t = pos - k
                    q = total * wt
                    for key, cw in corners:
                        a, d = self.rows[key][k]
                        f = q * cw
                        ft = f * t
                        acc = [c + f * ai + ft * di for c, ai, di in zip(acc, a, d, strict=True)]
                o = out[w]
                for c, name in enumerate(COLUMNS):
                    o[name] += acc[c]
        return out


@dataclass(frozen=True)
class Propagation:
    """Outputs of every sample and their summary.

    Attributes
    ----------
    n, seed, method : int, int, str
        As requested.
    factors : dict
        Input name -> factors of the computed samples.
    outputs : dict
        Output key -> values of the computed samples.
    """

    n: int
    seed: int
    method: str
    factors: dict[str, list[float]]
    outputs: dict[str, list[float]]

    def summary(self, ps: Sequence[float] = (5.0, 50.0, 95.0)) -> dict[str, dict[str, Any]]:
        """Percentiles of each output and its rank correlation with each uncertain input."""
        out: dict[str, dict[str, Any]] = {}
        m = len(next(iter(self.outputs.values()), []))
        input_ranks = {
            name: _ranks(fs[:m])
            for name, fs in self.factors.items()
            if m >= 3 and len(set(fs[:m])) > 1
        }
        for key, values in self.outputs.items():
            entry: dict[str, Any] = {"percentiles": {p: percentile(values, p) for p in ps}}
            corr = {}
            if input_ranks:
                ry = _ranks(values)
                for name, rx in input_ranks.items():
                    corr[name] = _pearson(rx, ry)
            entry["spearman"] = corr
            ranked = [(abs(r), name) for name, r in corr.items() if r is not None]
            entry["leading"] = max(ranked)[1] if ranked else None
            out[key] = entry
        return out


def propagate(
    spreads: dict[str, Spread],
    n: int,
    seed: int,
    build: Callable[[dict[str, float]], Any],
    subject: Subject,
    nominal: dict[str, float],
    outputs: Callable[[dict[str, dict[str, float]], float], dict[str, float]],
    nominal_exact: dict[str, dict[str, float]],
    method: str = "lhs",
    samples: range | None = None,
    tables: DepositionTables | None = None,
    thermodynamic: str = "icrp66",
) -> Propagation:
    """Propagate input spreads through regional deposition to any linear outputs.

    Parameters
    ----------
    spreads : dict
        Input name (of :data:`INPUTS`) -> :class:`Spread`.
    n : int
        Number of samples of the :func:`design` [-].
    seed : int
        Seed of the :func:`design`.
    build : callable
        Factors by input name -> the sample's distribution (modes with the sampled medians,
        GSDs, concentrations, densities and shape factors).
    subject : Subject
        Breathing; the ``breathing`` factor scales its ventilation.
    nominal : dict
        Nominal ``density`` [kg/m^3] and ``shape_factor`` [-], for the table nodes.
    outputs : callable
        (deposition rates ``[weight][column]`` [unit/s], factor) -> outputs by key; called
        with the ratio-scaled rates of each sample.
    nominal_exact : dict
        The full model's deposition rates ``[weight][column]`` at the nominal inputs.
    method : str
        ``lhs`` or ``mc``, as for :func:`design`.
    samples : range, optional
        Which samples to compute (default all): the propagation can run in blocks.
    tables : DepositionTables, optional
        Tables built by an earlier block of the same propagation.
    thermodynamic : str
        How the shape factor enters diffusion (for new tables).

    Returns
    -------
    Propagation
        The computed samples' factors and outputs (keys from ``outputs``).

    """
    factors = design(spreads, n, seed, method)
    if tables is None:
        tables = make_tables(spreads, factors, subject, nominal, thermodynamic)
    ventilation = subject.mean_ventilation
    base = tables.integrals(build(dict.fromkeys(spreads, 1.0)))
    rng = samples if samples is not None else range(n)
    outs: dict[str, list[float]] = {}
    for i in rng:
        f = {name: factors[name][i] for name in spreads}
        fast = tables.integrals(build(f))
        vf = f.get("breathing", 1.0)
        rates: dict[str, dict[str, float]] = {}
        for w in WEIGHTS:
            rates[w] = {}
            for c in COLUMNS:
                exact = nominal_exact[w][c]
                if base[w][c] > 0.0 and exact > 0.0:
                    rates[w][c] = exact * (fast[w][c] / base[w][c]) * vf
                else:
                    rates[w][c] = fast[w][c] * ventilation * vf
        for key, value in outputs(rates, vf).items():
            outs.setdefault(key, []).append(value)
    picked = {name: [factors[name][i] for i in rng] for name in spreads}
    return Propagation(n, seed, method, picked, outs)


def make_tables(
    spreads: dict[str, Spread],
    factors: dict[str, list[float]],
    subject: Subject,
    nominal: dict[str, float],
    thermodynamic: str = "icrp66",
) -> DepositionTables:
    """Tables whose nodes span the densities and shape factors drawn in ``factors``.

    Parameters
    ----------
    spreads : dict
        Input name (of :data:`INPUTS`) -> :class:`Spread`.
    factors : dict
        Input name -> the drawn factors [-] (as :func:`design` returns them).
    subject : Subject
        Breathing.
    nominal : dict
        Nominal ``density`` [kg/m^3] and ``shape_factor`` [-].
    thermodynamic : str
        How the shape factor enters diffusion: ``icrp66`` or ``mobility``.
    """

    def span(name: str) -> tuple[float, float]:
        fs = factors.get(name)
        if not fs or not spreads[name].uncertain:
            return 1.0, 1.0
        return min(min(fs), 1.0), max(max(fs), 1.0)

    return DepositionTables(
        subject,
        table_nodes(nominal["density"], *span("density")),
        table_nodes(nominal["shape_factor"], *span("shape_factor")),
        thermodynamic,
    )
