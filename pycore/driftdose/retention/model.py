"""Particle transport (clearance) of insoluble particles in the ICRP respiratory tract model.

Interfaces: :data:`RATE_SETS` (``icrp66``, ``icrp130``), :func:`slow_fraction`,
:func:`compartment_inputs` (deposition rate into each compartment for an aerosol),
:func:`work_schedule` (a work pattern as exposure blocks) and :func:`retained_burden`.

Only mechanical particle transport is modelled: the particles are taken as insoluble, with
no absorption to blood. Deposited material moves between compartments by first-order
transfers and leaves the respiratory tract to the gut (via ET2 and swallowing), to the
environment (nose blowing, from ET1) or stays in the lymph nodes (LNET, LNTH), which keep
it. Rates are quoted per day, as the ICRP tables give them, and converted to per second.

ICRP Publication 66 (1994), chapter 5, Table 17 and its figure of the compartment model
(recalled from the publication, *from memory*):

============  ==========  =========  ===========================================
from          to          k [1/d]    note
============  ==========  =========  ===========================================
AI1           bb1         0.02       30 % of AI deposit
AI2           bb1         0.001      60 % of AI deposit
AI3           bb1         0.0001     10 % of AI deposit
AI3           LNTH        0.00002
bb1           BB1         2          bb deposit: 0.993 - f_s
bb2           BB1         0.03       bb deposit: f_s
bbseq         LNTH        0.01       bb deposit: 0.007
BB1           ET2         10         BB deposit: 0.993 - f_s
BB2           ET2         0.03       BB deposit: f_s
BBseq         LNTH        0.01       BB deposit: 0.007
ET2           GI tract    100        ET2 deposit: 0.9995
ETseq         LNET        0.001      ET2 deposit: 0.0005
ET1           environment 1          ET1 deposit: all (nose blowing)
============  ==========  =========  ===========================================

The slow-cleared fraction f_s of the bronchial (BB) and bronchiolar (bb) deposit depends on
particle size (ICRP 66, chapter 5, as recalled): f_s = 0.5 for d_ae <= 2.5 sqrt(rho/chi) um,
f_s = 0.5 exp(-0.63 (d_ae sqrt(chi/rho) - 2.5)) above, with rho in g/cm^3.

ICRP Publication 130 (2015), Occupational Intakes of Radionuclides Part 1, revised the
transport model (recalled, *from memory*, less sure than the ICRP 66 values): the slow-cleared
bronchial fraction is dropped; the alveolar region is one compartment ALV cleared to bb'
(0.002 /d) and to the interstitium INT (0.001 /d), INT to LNTH (0.00003 /d); bb' to BB'
0.2 /d; BB' to ET2' 10 /d; ET2' to the gut 100 /d; ET1 to the environment 0.6 /d and to ET2'
1.5 /d; ETseq to LNET, BBseq and bbseq to LNTH 0.001 /d; sequestered shares 0.002 of the
ET2, BB and bb deposits.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass

from ..deposition import Subject
from ..distribution import WEIGHTS, Distribution
from ..dose import deposition_curves
from .kinetics import Network, Off, On, Repeat, Seq, block_duration, exposure_time

__all__ = [
    "DAY",
    "RATE_SETS",
    "REGION_GROUPS",
    "YEAR",
    "BurdenResult",
    "RateSet",
    "compartment_inputs",
    "deposition_rates",
    "retained_burden",
    "slow_fraction",
    "work_schedule",
]

DAY = 86400.0
"""One day. [s]"""

YEAR = 365.25 * DAY
"""One year (Julian). [s]"""

GUT = "GI"
ENVIRONMENT = "environment"


@dataclass(frozen=True)
class RateSet:
    """One published parameter set of the particle-transport model.

    Attributes
    ----------
    key, label : str
        Identifier and name with its publication.
    transfers : tuple of (str, str, float)
        (from, to, rate [1/d]).
    partition : dict
        ``partition[region]``: shares of a region's deposit by compartment; the share
        ``"fs"`` stands for the size-dependent slow-cleared fraction, ``"1-fs"`` for
        0.993 - f_s (ICRP 66).
    groups : dict
        Region (ET, BB, bb, AI, LN) -> compartments.

    """

    key: str
    label: str
    transfers: tuple[tuple[str, str, float], ...]
    partition: dict[str, dict[str, float | str]]
    groups: dict[str, tuple[str, ...]]

    @property
    def compartments(self) -> tuple[str, ...]:
        """Every compartment including the gut and environment sinks."""
        names: list[str] = []
        for g in self.groups.values():
            names.extend(g)
        return (*names, GUT, ENVIRONMENT)

    @property
    def uses_slow_fraction(self) -> bool:
        """Whether the deposit split needs f_s."""
        return any("fs" in p.values() or "1-fs" in p.values() for p in self.partition.values())

    def network(self) -> Network:
        """The compartment network with rates in [1/s]."""
        return Network(self.compartments, [(a, b, k / DAY) for a, b, k in self.transfers])


ICRP66 = RateSet(
    "icrp66",
    "ICRP Publication 66 (1994)",
    (
        ("AI1", "bb1", 0.02),
        ("AI2", "bb1", 0.001),
        ("AI3", "bb1", 0.0001),
        ("AI3", "LNTH", 0.00002),
        ("bb1", "BB1", 2.0),
        ("bb2", "BB1", 0.03),
        ("bbseq", "LNTH", 0.01),
        ("BB1", "ET2", 10.0),
        ("BB2", "ET2", 0.03),
        ("BBseq", "LNTH", 0.01),
        ("ET2", GUT, 100.0),
        ("ETseq", "LNET", 0.001),
        ("ET1", ENVIRONMENT, 1.0),
    ),
    {
        "ET1": {"ET1": 1.0},
        "ET2": {"ET2": 0.9995, "ETseq": 0.0005},
        "BB": {"BB1": "1-fs", "BB2": "fs", "BBseq": 0.007},
        "bb": {"bb1": "1-fs", "bb2": "fs", "bbseq": 0.007},
        "AI": {"AI1": 0.3, "AI2": 0.6, "AI3": 0.1},
    },
    {
        "ET": ("ET1", "ET2", "ETseq"),
        "BB": ("BB1", "BB2", "BBseq"),
        "bb": ("bb1", "bb2", "bbseq"),
        "AI": ("AI1", "AI2", "AI3"),
        "LN": ("LNET", "LNTH"),
    },
)

ICRP130 = RateSet(
    "icrp130",
    "ICRP Publication 130 (2015), revised transport",
    (
        ("ALV", "bb'", 0.002),
        ("ALV", "INT", 0.001),
        ("INT", "LNTH", 0.00003),
        ("bb'", "BB'", 0.2),
        ("bbseq", "LNTH", 0.001),
        ("BB'", "ET2'", 10.0),
        ("BBseq", "LNTH", 0.001),
        ("ET2'", GUT, 100.0),
        ("ETseq", "LNET", 0.001),
        ("ET1", ENVIRONMENT, 0.6),
        ("ET1", "ET2'", 1.5),
    ),
    {
        "ET1": {"ET1": 1.0},
        "ET2": {"ET2'": 0.998, "ETseq": 0.002},
        "BB": {"BB'": 0.998, "BBseq": 0.002},
        "bb": {"bb'": 0.998, "bbseq": 0.002},
        "AI": {"ALV": 1.0},
    },
    {
        "ET": ("ET1", "ET2'", "ETseq"),
        "BB": ("BB'", "BBseq"),
        "bb": ("bb'", "bbseq"),
        "AI": ("ALV", "INT"),
        "LN": ("LNET", "LNTH"),
    },
)

RATE_SETS = {"icrp66": ICRP66, "icrp130": ICRP130}
"""Published parameter sets by key."""

REGION_GROUPS = ("ET", "BB", "bb", "AI", "LN")
"""Regions of the retained amounts; ``lungs`` (BB + bb + AI) and the sinks are added."""

_NETWORKS: dict[str, Network] = {}


def network(key: str) -> Network:
    """The solved network of a rate set (decomposed once per process).

    Parameters
    ----------
    key : str
        The rate set: ``icrp66`` or ``icrp130``.
    """
    if key not in RATE_SETS:
        raise ValueError(f"unknown rate set {key!r}; valid: {', '.join(RATE_SETS)}")
    if key not in _NETWORKS:
        _NETWORKS[key] = RATE_SETS[key].network()
    return _NETWORKS[key]


def slow_fraction(d_ae: float, density: float, shape_factor: float) -> float:
    """Slow-cleared fraction f_s of the bronchial and bronchiolar deposit (ICRP 66).

    Parameters
    ----------
    d_ae : float
        Aerodynamic diameter. [m]
    density : float
        Particle density. [kg/m^3]
    shape_factor : float
        Dynamic shape factor. [-]

    Returns
    -------
    float
        f_s [-]: 0.5 for d_ae <= 2.5 sqrt(rho/chi) um, else
        0.5 exp(-0.63 (d_ae sqrt(chi/rho) - 2.5)) (d_ae in um, rho in g/cm^3).

    Notes
    -----
    ICRP (1994), Publication 66, chapter 5 (particle transport), recalled *from memory*.
    d_ae sqrt(chi/rho) is, without slip, the volume-equivalent diameter in um: about half of
    the deposit of particles up to 2.5 um clears slowly, less for larger ones.

    Examples
    --------
    >>> slow_fraction(1e-6, 1000.0, 1.0)
    0.5
    >>> round(slow_fraction(5e-6, 1000.0, 1.0), 4)  # 0.5 exp(-0.63 x 2.5)
    0.1035

    """
    rho = density / 1000.0
    x = d_ae * 1e6 * math.sqrt(shape_factor / rho)
    if x <= 2.5:
        return 0.5
    return 0.5 * math.exp(-0.63 * (x - 2.5))


def _modes(distribution: Distribution) -> tuple:
    return getattr(distribution, "modes", (distribution,))


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
    for mode in _modes(distribution):
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


def split_deposit(rate_set: str, regional: dict[str, float]) -> dict[str, float]:
    """Split regional deposition rates among compartments.

    Parameters
    ----------
    rate_set : str
        ``icrp66`` or ``icrp130``.
    regional : dict
        Deposition rate per region ET1, ET2, BB, bb, AI, and the slow-cleared parts BB_slow,
        bb_slow (integral of f_s times the deposit; needed by ``icrp66``). [unit/s]

    Returns
    -------
    dict
        Rate into each compartment. [unit/s]

    """
    rs = RATE_SETS[rate_set]
    out: dict[str, float] = {}
    for region, shares in rs.partition.items():
        total = regional[region]
        for comp, share in shares.items():
            if share == "fs":
                out[comp] = regional[f"{region}_slow"]
            elif share == "1-fs":
                out[comp] = 0.993 * total - regional[f"{region}_slow"]
            else:
                out[comp] = float(share) * total
    return out


def work_schedule(
    hours_per_shift: float,
    shifts_per_week: int,
    weeks_per_year: int,
    years: int,
) -> Seq | Repeat:
    """A work pattern as exposure blocks, starting with the first shift.

    Parameters
    ----------
    hours_per_shift : float
        Exposure per shift, above 0 and at most 24. [h]
    shifts_per_week : int
        1 to 7 shifts, on consecutive days, each starting at the same time of day [1/week].
    weeks_per_year : int
        1 to 52 working weeks, then the rest of the year off [1/year].
    years : int
        Working years, at least 1 [year].

    Returns
    -------
    Repeat
        ``years`` years of 365.25 days: ``weeks_per_year`` weeks of ``shifts_per_week`` days
        with a shift, then the remaining days of the week off; the rest of the year off.

    """
    if not (0.0 < hours_per_shift <= 24.0):
        raise ValueError("hours_per_shift must be above 0 and at most 24")
    if not (1 <= shifts_per_week <= 7 and 1 <= weeks_per_year <= 52 and years >= 1):
        raise ValueError("shifts per week 1-7, weeks per year 1-52, years at least 1")
    on = hours_per_shift * 3600.0
    day: On | Seq = On(on) if on >= DAY else Seq((On(on), Off(DAY - on)))
    week_parts: list = [Repeat(shifts_per_week, day)]
    if shifts_per_week < 7:
        week_parts.append(Off((7 - shifts_per_week) * DAY))
    week = Seq(tuple(week_parts))
    year_parts: list = [Repeat(weeks_per_year, week)]
    rest = YEAR - weeks_per_year * 7 * DAY
    if rest > 0.0:
        year_parts.append(Off(rest))
    return Repeat(years, Seq(tuple(year_parts)))


def single_exposure(duration: float) -> On:
    """One exposure of ``duration`` at time 0.

    Parameters
    ----------
    duration : float
        Exposure duration [s].
    """
    if not (duration > 0.0 and math.isfinite(duration)):
        raise ValueError("duration must be positive")
    return On(duration)


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
    Publication 130 (2015) (see the module docstring); the kinetics are solved in closed
    form (:mod:`driftdose.retention.kinetics`).

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


def exposure_end(schedule: On | Off | Seq | Repeat) -> float:
    """End of the last exposure of a schedule (trailing off-time excluded). [s]

    Parameters
    ----------
    schedule : On, Off, Seq or Repeat
        The exposure schedule.
    """
    if isinstance(schedule, On):
        return schedule.duration
    if isinstance(schedule, Off):
        return 0.0
    if isinstance(schedule, Seq):
        start, end = 0.0, 0.0
        for c in schedule.blocks:
            e = exposure_end(c)
            if e > 0.0:
                end = start + e
            start += block_duration(c)
        return end
    d1 = block_duration(schedule.block)
    return (schedule.count - 1) * d1 + exposure_end(schedule.block)
