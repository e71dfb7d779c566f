"""Propagation of the sampled factors through the tabulated deposition to any outputs.

Every sample is the full model's nominal value times the ratio fast(sample) / fast(nominal)
of the tabulated model (a ratio estimator), and the summary gives percentiles and rank
correlations with the inputs.
"""

from __future__ import annotations

from collections.abc import Callable, Sequence
from dataclasses import dataclass
from typing import Any

from ..deposition import Subject
from ..distribution import WEIGHTS
from .ranks import _pearson, _ranks, percentile
from .spreads import Spread, design
from .tables import COLUMNS, DepositionTables, make_tables


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
