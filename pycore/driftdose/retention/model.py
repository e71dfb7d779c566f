"""Particle transport (clearance) of insoluble particles in the ICRP respiratory tract model.

Interfaces: :data:`RATE_SETS` (``icrp66``, ``icrp130``), :func:`slow_fraction`,
:func:`compartment_inputs` (deposition rate into each compartment for an aerosol),
:func:`work_schedule` (a work pattern as exposure blocks) and :func:`retained_burden`.

Only mechanical particle transport is modelled: the particles are taken as insoluble, with
no absorption to blood. Deposited material moves between compartments by first-order
transfers and leaves the respiratory tract to the gut (via ET2 and swallowing), to the
environment (nose blowing, from ET1) or stays in the lymph nodes (LNET, LNTH), which keep
it. Rates are quoted per day, as the ICRP tables give them, and converted to per second.

The published parameters (ICRP 66 and its ICRP 130 revision, the size-dependent slow-cleared
fraction) are in :mod:`.rates`, the work patterns in :mod:`.schedule`; both are re-exported
here.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass

from ..deposition import Subject
from ..distribution import WEIGHTS, Distribution, parts
from ..dose import deposition_curves
from .kinetics import Off, On, Repeat, Seq, exposure_time
from .rates import (
    DAY,
    ENVIRONMENT,
    GUT,
    ICRP66,
    ICRP130,
    RATE_SETS,
    REGION_GROUPS,
    YEAR,
    RateSet,
    network,
    slow_fraction,
    split_deposit,
)
from .schedule import exposure_end, single_exposure, work_schedule

__all__ = [
    "DAY",
    "ENVIRONMENT",
    "GUT",
    "ICRP66",
    "ICRP130",
    "RATE_SETS",
    "REGION_GROUPS",
    "YEAR",
    "BurdenResult",
    "RateSet",
    "compartment_inputs",
    "deposition_rates",
    "exposure_end",
    "network",
    "retained_burden",
    "single_exposure",
    "slow_fraction",
    "split_deposit",
    "work_schedule",
]


def deposition_rates(
    distribution: Distribution,
    subject: Subject,
    step: float | None = None,
    thermodynamic: str = "icrp66",
) -> dict[str, dict[str, float]]:
    """Regional deposition rates and their slow-cleared bronchial parts, by weight.

    Parameters
    ----------
    distribution : LognormalMode, Multimodal or BinnedSpectrum
        Airborne particles.
    subject : Subject
        Breathing during exposure.
    step : float, optional
        Integration grid step in ln d [-] (as :func:`driftdose.dose.deposited_dose`).
    thermodynamic : str
        How the shape factor enters diffusion (as :func:`driftdose.dose.deposited_dose`).

    Returns
    -------
    dict
        ``out[weight][key]`` for the keys ET1, ET2, BB, bb, AI, total (equal to the rates of
        :func:`driftdose.dose.deposited_dose`) and BB_slow, bb_slow (the integral of f_s
        times the BB and bb deposit): [1/s], [m^2/s], [kg/s].

    Notes
    -----
    Regional deposition: ICRP 66 Annex D; f_s: :func:`slow_fraction` (ICRP 66, chapter 5),
    evaluated per particle size.

    """
    ventilation = subject.mean_ventilation
    regions = ("ET1", "ET2", "BB", "bb", "AI", "total")
    sums = {w: dict.fromkeys(regions, 0.0) for w in WEIGHTS}
    slow = {w: {"BB": 0.0, "bb": 0.0} for w in WEIGHTS}
    for mode in parts(distribution):
        sizes = mode.grid(step)
        curves = deposition_curves(
            "icrp66", sizes, mode.density, mode.shape_factor, subject, thermodynamic
        )
        fs = [slow_fraction(d, mode.density, mode.shape_factor) for d in curves["d_ae"]]
        for w in WEIGHTS:
            quad = mode.quadrature(w, step)
            for r in regions:
                sums[w][r] += math.fsum(q * f for (_, q), f in zip(quad, curves[r], strict=True))
            for r in ("BB", "bb"):
                slow[w][r] += math.fsum(
                    q * f * s for (_, q), f, s in zip(quad, curves[r], fs, strict=True)
                )
    out: dict[str, dict[str, float]] = {}
    for w in WEIGHTS:
        rates = {r: sums[w][r] * ventilation for r in regions}
        rates["BB_slow"] = slow[w]["BB"] * ventilation
        rates["bb_slow"] = slow[w]["bb"] * ventilation
        out[w] = rates
    return out


def compartment_inputs(
    distribution: Distribution,
    subject: Subject,
    rate_set: str = "icrp66",
    step: float | None = None,
    thermodynamic: str = "icrp66",
) -> dict[str, dict[str, float]]:
    """Deposition rate into each compartment during exposure, by weight.

    Parameters
    ----------
    distribution : LognormalMode, Multimodal or BinnedSpectrum
        Airborne particles.
    subject : Subject
        Breathing during exposure.
    rate_set : str
        ``icrp66`` or ``icrp130``.
    step : float, optional
        Integration grid step in ln d [-] (as :func:`driftdose.dose.deposited_dose`).
    thermodynamic : str
        How the shape factor enters diffusion (as :func:`driftdose.dose.deposited_dose`).

    Returns
    -------
    dict
        ``out[weight][compartment]``: [1/s], [m^2/s], [kg/s]; also ``out[weight]["_region_"
        + region]`` for the regional deposition rates (ET1, ET2, BB, bb, AI), equal to those
        of :func:`driftdose.dose.deposited_dose`.

    Notes
    -----
    The regional deposition is the ICRP 66 model (Annex D); each region's deposit is split
    among its compartments by the shares of the rate set, f_s evaluated per particle size
    (ICRP 66, chapter 5).

    """
    if rate_set not in RATE_SETS:
        raise ValueError(f"unknown rate set {rate_set!r}; valid: {', '.join(RATE_SETS)}")
    rates = deposition_rates(distribution, subject, step, thermodynamic)
    out: dict[str, dict[str, float]] = {}
    for w in WEIGHTS:
        comp = split_deposit(rate_set, rates[w])
        comp.update({f"_region_{r}": rates[w][r] for r in ("ET1", "ET2", "BB", "bb", "AI")})
        out[w] = comp
    return out


@dataclass(frozen=True)
class BurdenResult:
    """Amounts in the respiratory tract over time, by weight.

    Attributes
    ----------
    rate_set : str
        Key of the transport parameters.
    times : tuple of float
        Times from the start of the first exposure. [s]
    compartments : dict
        ``compartments[weight][name]``: amounts at ``times`` [1], [m^2], [kg].
    regions : dict
        ``regions[weight][group]``: ET, BB, bb, AI, LN, ``lungs`` (BB + bb + AI),
        ``GI`` (cleared to the gut, cumulative), ``environment`` (removed by nose blowing),
        ``deposited`` (cumulative).
    exposure_end : float
        End of the last exposure. [s]

    """

    rate_set: str
    times: tuple[float, ...]
    compartments: dict[str, dict[str, list[float]]]
    regions: dict[str, dict[str, list[float]]]
    exposure_end: float


def retained_burden(
    inputs: dict[str, dict[str, float]],
    schedule: On | Off | Seq | Repeat,
    times: Sequence[float],
    rate_set: str = "icrp66",
    weights: Sequence[str] = WEIGHTS,
) -> BurdenResult:
    """Retained amounts by compartment and region at given times, solved exactly.

    Parameters
    ----------
    inputs : dict
        ``inputs[weight][compartment]``: deposition rate during exposure (from
        :func:`compartment_inputs`). [unit/s]
    schedule : block
        Exposure pattern (:func:`work_schedule` or :func:`single_exposure`).
    times : sequence of float
        Times from the start of the first exposure. [s]
    rate_set : str
        ``icrp66`` or ``icrp130``.
    weights : sequence of str
        Weights to compute.

    Returns
    -------
    BurdenResult

    Notes
    -----
    Transport model of ICRP Publication 66 (1994) chapter 5 or its revision in ICRP
    Publication 130 (2015) (the rates and shares in :mod:`.rates`); the kinetics are solved
    in closed form (:mod:`driftdose.retention.kinetics`).

    """
    rs = RATE_SETS[rate_set]
    net = network(rate_set)
    z = {
        w: net.modal_input({c: r for c, r in inputs[w].items() if c in net.order}) for w in weights
    }
    comp = {w: {c: [] for c in net.order} for w in weights}
    for t in times:
        g = net.responses(schedule, t)
        for w in weights:
            x = net.amounts(z[w], g)
            for c, v in zip(net.order, x, strict=True):
                comp[w][c].append(v)
    regions: dict[str, dict[str, list[float]]] = {}
    exposed = [exposure_time(schedule, t) for t in times]
    for w in weights:
        reg = {
            g: [math.fsum(vals) for vals in zip(*(comp[w][c] for c in rs.groups[g]), strict=True)]
            for g in REGION_GROUPS
        }
        reg["lungs"] = [a + b + c for a, b, c in zip(reg["BB"], reg["bb"], reg["AI"], strict=True)]
        reg[GUT] = list(comp[w][GUT])
        reg[ENVIRONMENT] = list(comp[w][ENVIRONMENT])
        rate = math.fsum(inputs[w].get(c, 0.0) for c in net.order)
        reg["deposited"] = [rate * e for e in exposed]
        regions[w] = reg
    return BurdenResult(rate_set, tuple(times), comp, regions, exposure_end(schedule))
