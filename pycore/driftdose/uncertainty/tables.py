"""Regional deposition tabulated once against size, interpolated for each sample.

The ICRP 66 fractions (and the slow-cleared bronchial shares) on a grid in ln d for a few
densities and shape factors spanning the sampled ones; each sample interpolates linearly in
ln d, ln density and ln shape factor and integrates its lognormal modes by Gauss-Hermite
quadrature.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass, field
from typing import Any

from .._numerics import gauss_hermite, logspace
from ..deposition import Subject
from ..distribution import WEIGHTS, parts
from ..dose import deposition_curves
from ..retention.rates import slow_fraction
from .spreads import Spread

REGIONS = ("ET1", "ET2", "BB", "bb", "AI")
COLUMNS = (*REGIONS, "total", "BB_slow", "bb_slow")
TABLE_STEP = 0.04  # grid step in ln d of the tables
NODE_SPACING = 0.15  # largest step in ln density and ln shape factor between table nodes
GH_NODES = 12


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
    cleared shares: :func:`driftdose.retention.rates.slow_fraction` (ICRP 66 chapter 5).
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
        for mode in parts(distribution):
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
