"""Inertial impactor stages: jet velocity, Stokes number, cut diameter and efficiency curve.

Interfaces: :func:`impactor_cut_diameter` (stable name), :func:`impactor_stokes_number`,
:func:`impactor_efficiency`, :func:`impactor_penetration`.

Model: the Stokes number of the jet, Stk = rho_p Cc d^2 U / (9 mu W), reaches a fixed value
at the 50 % cut, Stk50 = 0.24 for round and 0.59 for rectangular jets (Marple & Willeke
1976, as summarised by Hinds 1999, ch. 5). The efficiency curve around the cut is a
documented sigmoid, not a published fit: a cumulative normal in ln(sqrt(Stk)).
"""

from __future__ import annotations

import math
from collections.abc import Sequence

from .. import gas, particle
from .._numerics import normal_cdf
from ..constants import P_DEFAULT, T_DEFAULT
from ..particle.equivalent import diameter_with_d2cc

__all__ = [
    "DEFAULT_EFFICIENCY_WIDTH",
    "JET_RE_RANGE",
    "STK50",
    "impactor_curve",
    "impactor_cut_diameter",
    "impactor_efficiency",
    "impactor_jet_reynolds_number",
    "impactor_penetration",
    "impactor_stokes_number",
    "jet_velocity",
]

STK50: dict[str, float] = {"round": 0.24, "rectangular": 0.59}
"""Stokes number at 50 % collection efficiency (Marple & Willeke 1976; Hinds 1999,
ch. 5 gives sqrt(Stk50) = 0.49 and 0.77), for well-designed impactors with jet-to-plate
distance of at least about one jet width and jet Reynolds numbers of 500 to 3000. [-]"""

JET_RE_RANGE = (500.0, 3000.0)
"""Jet Reynolds numbers over which Stk50 is nearly constant (Marple & Willeke 1976, via
Hinds 1999, ch. 5, from memory). [-]"""

DEFAULT_EFFICIENCY_WIDTH = 1.2
"""Default width of the efficiency curve, sqrt(Stk50 / Stk16) = sqrt(Stk84 / Stk50).
Our choice, not a published value: sharp enough for a well-designed stage; set it from a
calibration when one exists. [-]"""


def jet_velocity(
    nozzle_diameter: float,
    flow: float,
    n_nozzles: int = 1,
    jet: str = "round",
    slit_length: float | None = None,
) -> float:
    """Mean air velocity in the nozzle throat.

    Parameters
    ----------
    nozzle_diameter : float
        Nozzle diameter (round) or slit width (rectangular), W. [m]
    flow : float
        Total volumetric flow through the stage. [m^3/s]
    n_nozzles : int
        Number of identical nozzles sharing the flow. [-]
    jet : str
        ``round`` or ``rectangular``.
    slit_length : float or None
        Length of each slit (rectangular jets only). [m]

    Returns
    -------
    float
        U = 4 Q / (n pi W^2) for round jets, Q / (n W L) for slits. [m/s]

    """
    if jet == "round":
        return 4.0 * flow / (n_nozzles * math.pi * nozzle_diameter**2)
    if jet == "rectangular":
        if slit_length is None:
            raise ValueError("a rectangular jet needs slit_length")
        return flow / (n_nozzles * nozzle_diameter * slit_length)
    raise ValueError(f"unknown jet {jet!r}; valid: {sorted(STK50)}")


def impactor_jet_reynolds_number(
    nozzle_diameter: float,
    flow: float,
    n_nozzles: int = 1,
    jet: str = "round",
    slit_length: float | None = None,
    T: float = T_DEFAULT,
    P: float = P_DEFAULT,
) -> float:
    """Jet Reynolds number, rho_g U D_h / mu.

    Parameters
    ----------
    nozzle_diameter : float
        Nozzle diameter (round) or slit width (rectangular), W. [m]
    flow : float
        Total volumetric flow through the stage. [m^3/s]
    n_nozzles : int
        Number of identical nozzles sharing the flow. [-]
    jet : str
        ``round`` or ``rectangular``.
    slit_length : float or None
        Length of each slit (rectangular jets only). [m]
    T, P : float
        Temperature [K], pressure [Pa].

    Returns
    -------
    float
        Reynolds number based on the hydraulic diameter D_h of the throat: W for a round
        jet, 2 W L / (W + L) (about 2 W) for a slit. [-]

    """
    u = jet_velocity(nozzle_diameter, flow, n_nozzles, jet, slit_length)
    if jet == "round":
        dh = nozzle_diameter
    else:
        assert slit_length is not None
        dh = 2.0 * nozzle_diameter * slit_length / (nozzle_diameter + slit_length)
    return gas.air_density(T, P) * u * dh / gas.air_viscosity(T)


def impactor_stokes_number(
    d: float,
    nozzle_diameter: float,
    flow: float,
    n_nozzles: int = 1,
    density: float = 1000.0,
    jet: str = "round",
    T: float = T_DEFAULT,
    P: float = P_DEFAULT,
    slit_length: float | None = None,
) -> float:
    """Impactor Stokes number Stk = rho_p Cc d^2 U / (9 mu W).

    Parameters
    ----------
    d : float
        Particle diameter. [m]
    nozzle_diameter : float
        Nozzle diameter or slit width W. [m]
    flow : float
        Total volumetric flow. [m^3/s]
    n_nozzles : int
        Number of nozzles. [-]
    density : float
        Particle density. [kg/m^3]
    jet : str
        ``round`` or ``rectangular``.
    T, P : float
        Temperature [K], pressure [Pa].
    slit_length : float or None
        Slit length (rectangular jets). [m]

    Returns
    -------
    float
        Stk = tau U / (W/2) (Hinds 1999, ch. 5). [-]

    """
    u = jet_velocity(nozzle_diameter, flow, n_nozzles, jet, slit_length)
    tau = particle.relaxation_time(d, density, T, P)
    return 2.0 * tau * u / nozzle_diameter


def impactor_cut_diameter(
    nozzle_diameter: float,
    flow: float,
    n_nozzles: int = 1,
    density: float = 1000.0,
    jet: str = "round",
    T: float = T_DEFAULT,
    P: float = P_DEFAULT,
    slit_length: float | None = None,
) -> float:
    """Particle diameter collected with 50 % efficiency (stable interface).

    Parameters
    ----------
    nozzle_diameter : float
        Nozzle diameter (round) or slit width (rectangular). [m]
    flow : float
        Total volumetric flow through the stage. [m^3/s]
    n_nozzles : int
        Number of identical nozzles. [-]
    density : float
        Particle density. [kg/m^3]
    jet : str
        ``round`` (Stk50 = 0.24) or ``rectangular`` (Stk50 = 0.59).
    T, P : float
        Temperature [K], pressure [Pa].
    slit_length : float or None
        Length of each slit, required for rectangular jets. [m]

    Returns
    -------
    float
        Cut diameter d50 (volume-equivalent at ``density``; aerodynamic when density is
        1000 kg/m^3). [m]

    Notes
    -----
    d50^2 Cc(d50) = 9 mu W Stk50 / (rho_p U) (Hinds 1999, ch. 5, with slip). Because Cc
    depends on d50 the equation is solved in ln d
    (:func:`driftdose.particle.equivalent.diameter_with_d2cc`, the solve of the aerodynamic
    diameter), so the slip correction is evaluated at the cut size itself rather than
    assumed.

    Examples
    --------
    A single round 1 mm nozzle at 1 L/min (U = 21 m/s), unit density:

    >>> round(impactor_cut_diameter(1e-3, 1e-3 / 60) * 1e6, 2)
    1.28

    """
    if jet not in STK50:
        raise ValueError(f"unknown jet {jet!r}; valid: {sorted(STK50)}")
    u = jet_velocity(nozzle_diameter, flow, n_nozzles, jet, slit_length)
    mu = gas.air_viscosity(T)
    target = 9.0 * mu * nozzle_diameter * STK50[jet] / (density * u)  # d^2 Cc [m^2]
    return diameter_with_d2cc(target, T, P)


def impactor_efficiency(
    stk: float, jet: str = "round", efficiency_width: float = DEFAULT_EFFICIENCY_WIDTH
) -> float:
    """Return the collection efficiency of an impactor stage at Stokes number ``stk``.

    Parameters
    ----------
    stk : float
        Impactor Stokes number. [-]
    jet : str
        ``round`` or ``rectangular`` (selects Stk50).
    efficiency_width : float
        Geometric width of the curve in sqrt(Stk), > 1 (1.2 default; smaller is sharper). [-]

    Returns
    -------
    float
        E = Phi(ln(sqrt(Stk / Stk50)) / ln(efficiency_width)). [-]

    Notes
    -----
    A cumulative normal in ln sqrt(Stk), centred on sqrt(Stk50). In the continuum regime
    sqrt(Stk) is proportional to d, so ``efficiency_width`` is then the curve's geometric standard
    deviation in particle size, d50/d16 = d84/d50. Measured curves of real stages are
    asymmetric; this is a documented idealisation, not a published fit.

    Examples
    --------
    >>> impactor_efficiency(0.24)
    0.5

    """
    if stk <= 0.0:
        return 0.0
    return normal_cdf(0.5 * math.log(stk / STK50[jet]) / math.log(efficiency_width))


def impactor_penetration(
    d: float,
    nozzle_diameter: float,
    flow: float,
    n_nozzles: int = 1,
    density: float = 1000.0,
    jet: str = "round",
    efficiency_width: float = DEFAULT_EFFICIENCY_WIDTH,
    T: float = T_DEFAULT,
    P: float = P_DEFAULT,
    slit_length: float | None = None,
) -> float:
    """Fraction of particles passing an impactor stage, 1 - E(Stk).

    Parameters
    ----------
    d : float
        Particle diameter. [m]
    nozzle_diameter : float
        Nozzle diameter (round) or slit width (rectangular). [m]
    flow : float
        Total volumetric flow through the stage. [m^3/s]
    n_nozzles : int
        Number of identical nozzles. [-]
    density : float
        Particle density. [kg/m^3]
    jet : str
        ``round`` or ``rectangular`` (see :func:`impactor_cut_diameter`).
    efficiency_width : float
        Width of the efficiency curve, :func:`impactor_efficiency`. [-]
    T, P : float
        Temperature [K], pressure [Pa].
    slit_length : float or None
        Length of each slit, required for rectangular jets. [m]

    Returns
    -------
    float
        Penetration (particles not collected on the plate; wall losses not included). [-]

    """
    stk = impactor_stokes_number(
        d, nozzle_diameter, flow, n_nozzles, density, jet, T, P, slit_length
    )
    return 1.0 - impactor_efficiency(stk, jet, efficiency_width)


def impactor_curve(
    relaxation_times: Sequence[float],
    nozzle_diameter: float,
    flow: float,
    n_nozzles: int = 1,
    jet: str = "round",
    efficiency_width: float = DEFAULT_EFFICIENCY_WIDTH,
    slit_length: float | None = None,
) -> list[float]:
    """:func:`impactor_penetration` at many sizes, from their relaxation times.

    Parameters
    ----------
    relaxation_times : sequence of float
        Particle relaxation times, one per size. [s]
    nozzle_diameter : float
        Nozzle diameter (round) or slit width (rectangular). [m]
    flow : float
        Volumetric flow rate through the stage. [m^3/s]
    n_nozzles : int
        Number of nozzles. [-]
    jet : str
        ``round`` or ``rectangular``.
    efficiency_width : float
        Width of the efficiency curve, sqrt(Stk50 / Stk16). [-]
    slit_length : float, optional
        Slit length of a rectangular jet. [m]

    Returns
    -------
    list of float
        1 - efficiency at Stk = 2 tau U / W at each size [-] (Marple & Willeke 1976; Hinds
        1999, ch. 5), as :func:`impactor_penetration`.

    """
    u = jet_velocity(nozzle_diameter, flow, n_nozzles, jet, slit_length)
    return [
        1.0 - impactor_efficiency(2.0 * tau * u / nozzle_diameter, jet, efficiency_width)
        for tau in relaxation_times
    ]
