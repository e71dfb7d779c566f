"""Published parameters of the particle-transport model: rate sets, deposit shares, f_s.

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
from dataclasses import dataclass

from .kinetics import Network

__all__ = [
    "DAY",
    "ENVIRONMENT",
    "GUT",
    "ICRP66",
    "ICRP130",
    "RATE_SETS",
    "REGION_GROUPS",
    "YEAR",
    "RateSet",
    "network",
    "slow_fraction",
    "split_deposit",
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
