"""Air flow in sampling lines: tube velocity and Reynolds number, flow regimes and the
laminar-turbulent interpolation, speed of sound and Mach number.

Conventions used by every stage: diameters are volume-equivalent sphere diameters [m] unless a
name says aerodynamic; flows are volumetric at the stated temperature and pressure [m^3/s];
angles are in radians.
"""

from __future__ import annotations

import math
from collections.abc import Callable

from .. import gas
from ..constants import AIR_MOLAR_MASS, GAS_CONSTANT, P_DEFAULT, T_DEFAULT

__all__ = [
    "HEAT_CAPACITY_RATIO",
    "MACH_ERROR",
    "MACH_WARNING",
    "REGIMES",
    "RE_LAMINAR_MAX",
    "RE_SWITCH",
    "RE_TURBULENT_MIN",
    "blend_curves",
    "blend_regimes",
    "flow_regime",
    "interpolate_regimes",
    "mach_number",
    "regime_weight",
    "speed_of_sound",
    "transition_weight",
    "tube_reynolds_number",
    "tube_velocity",
]

HEAT_CAPACITY_RATIO = 1.4
"""Ratio of specific heats of dry air near room temperature (common practice). [-]"""

RE_LAMINAR_MAX = 2000.0
"""Below this tube Reynolds number pipe flow is laminar (common practice). [-]"""

RE_TURBULENT_MIN = 4000.0
"""Above this tube Reynolds number pipe flow is fully turbulent (common practice). [-]"""

RE_SWITCH = 2300.0
"""The critical Reynolds number of pipe flow usually quoted (common practice). The models no
longer switch there: between :data:`RE_LAMINAR_MAX` and :data:`RE_TURBULENT_MIN` they are
interpolated (:func:`transition_weight`). [-]"""

REGIMES = ("auto", "laminar", "turbulent")
"""Regime choices of the tube and bend models: ``auto`` from the flow Reynolds number
(interpolated in the transition range, :func:`regime_weight`), or one form throughout."""

MACH_WARNING = 0.3
"""Mach number above which compressibility is no longer negligible (common practice); the
incompressible models are then extrapolated. [-]"""

MACH_ERROR = 0.7
"""Mach number treated as near sonic: inputs giving a mean speed at or above it are refused.
Our threshold (no published source): the density of air changes by more than about 20 % at
such speeds and none of the models applies. [-]"""


def tube_velocity(flow: float, tube_diameter: float) -> float:
    """Mean air velocity in a circular tube, U = 4 Q / (pi d_t^2).

    Parameters
    ----------
    flow : float
        Volumetric flow rate. [m^3/s]
    tube_diameter : float
        Inner diameter of the tube. [m]

    Returns
    -------
    float
        Mean velocity. [m/s]

    """
    return 4.0 * flow / (math.pi * tube_diameter * tube_diameter)


def tube_reynolds_number(
    flow: float, tube_diameter: float, T: float = T_DEFAULT, P: float = P_DEFAULT
) -> float:
    """Flow Reynolds number of a circular tube, Re = rho_g U d_t / mu.

    Parameters
    ----------
    flow : float
        Volumetric flow rate. [m^3/s]
    tube_diameter : float
        Inner diameter of the tube. [m]
    T : float
        Temperature. [K]
    P : float
        Pressure. [Pa]

    Returns
    -------
    float
        Reynolds number. [-]

    """
    u = tube_velocity(flow, tube_diameter)
    return gas.air_density(T, P) * u * tube_diameter / gas.air_viscosity(T)


def flow_regime(reynolds: float) -> str:
    """Return ``"laminar"`` below 2000, ``"transition"`` from 2000 to 4000, else
    ``"turbulent"`` (:data:`RE_LAMINAR_MAX`, :data:`RE_TURBULENT_MIN`; common practice).

    Parameters
    ----------
    reynolds : float
        Flow Reynolds number [-].
    """
    if reynolds < RE_LAMINAR_MAX:
        return "laminar"
    if reynolds <= RE_TURBULENT_MIN:
        return "transition"
    return "turbulent"


def transition_weight(reynolds: float) -> float:
    """Weight of the turbulent form in the transition range, 0 below 2000, 1 above 4000.

    Parameters
    ----------
    reynolds : float
        Flow Reynolds number. [-]

    Returns
    -------
    float
        w = (Re - 2000) / 2000 limited to [0, 1]. [-]

    Notes
    -----
    Pipe flow between Re 2000 and 4000 may be laminar or turbulent, intermittently
    (common practice); no published deposition model covers it. This tool interpolates:
    P = (1 - w) P_laminar + w P_turbulent, as if the flow were turbulent a fraction w of
    the time, so the answer is continuous in the flow and lies between the two published
    forms. (Interpolating ln P instead would let a laminar form that reaches exactly 0,
    as laminar settling does, wipe out the turbulent answer.) The interpolation is this
    tool's choice, not a published method; the reply names both forms and says that they
    were interpolated.

    """
    return min(1.0, max(0.0, (reynolds - RE_LAMINAR_MAX) / (RE_TURBULENT_MIN - RE_LAMINAR_MAX)))


def interpolate_regimes(laminar: float, turbulent: float, weight: float) -> float:
    """Return (1 - weight) laminar + weight turbulent (see :func:`transition_weight`). [-]

    Parameters
    ----------
    laminar, turbulent : float
        Penetrations in laminar and in turbulent flow [-].
    weight : float
        Weight of the turbulent value, 0 to 1 [-].
    """
    if weight <= 0.0:
        return laminar
    if weight >= 1.0:
        return turbulent
    return (1.0 - weight) * laminar + weight * turbulent


def regime_weight(
    regime: str, flow: float, tube_diameter: float, T: float = T_DEFAULT, P: float = P_DEFAULT
) -> float:
    """Weight of the turbulent form for a regime choice of :data:`REGIMES`.

    Parameters
    ----------
    regime : str
        ``auto`` (the :func:`transition_weight` of the tube's Reynolds number), ``laminar``
        (0) or ``turbulent`` (1).
    flow : float
        Volumetric flow rate. [m^3/s]
    tube_diameter : float
        Inner diameter of the tube. [m]
    T, P : float
        Temperature [K], pressure [Pa].

    Returns
    -------
    float
        Weight w of the turbulent form, 0 to 1. [-]

    """
    if regime == "auto":
        return transition_weight(tube_reynolds_number(flow, tube_diameter, T, P))
    if regime == "laminar":
        return 0.0
    if regime == "turbulent":
        return 1.0
    raise ValueError(f"unknown regime {regime!r}; valid: {', '.join(REGIMES)}")


def blend_regimes(
    laminar: Callable[[], float], turbulent: Callable[[], float], weight: float
) -> float:
    """:func:`interpolate_regimes` of two forms, each computed only if it carries weight. [-]

    Parameters
    ----------
    laminar, turbulent : callable
        The penetration in laminar and in turbulent flow, computed on call [-].
    weight : float
        Weight of the turbulent form, 0 to 1 (:func:`regime_weight`) [-].
    """
    return interpolate_regimes(
        laminar() if weight < 1.0 else 1.0, turbulent() if weight > 0.0 else 1.0, weight
    )


def blend_curves(
    laminar: Callable[[], list[float]], turbulent: Callable[[], list[float]], weight: float
) -> list[float]:
    """:func:`interpolate_regimes` of two curves, each computed only if it carries weight. [-]

    Parameters
    ----------
    laminar, turbulent : callable
        The penetration curves in laminar and in turbulent flow, computed on call [-].
    weight : float
        Weight of the turbulent form, 0 to 1 (:func:`regime_weight`) [-].
    """
    if weight <= 0.0:
        return laminar()
    if weight >= 1.0:
        return turbulent()
    return [interpolate_regimes(a, b, weight) for a, b in zip(laminar(), turbulent(), strict=True)]


def speed_of_sound(T: float = T_DEFAULT) -> float:
    """Speed of sound in dry air as an ideal gas, c = sqrt(gamma R T / M).

    Parameters
    ----------
    T : float
        Temperature. [K]

    Returns
    -------
    float
        Speed of sound. [m/s]

    Examples
    --------
    About 343 m/s at 20 degrees C (handbook value):

    >>> round(speed_of_sound(293.15))
    343

    """
    return math.sqrt(HEAT_CAPACITY_RATIO * GAS_CONSTANT * T / AIR_MOLAR_MASS)


def mach_number(velocity: float, T: float = T_DEFAULT) -> float:
    """Mach number of a mean air ``velocity`` at temperature ``T``. [-]

    Parameters
    ----------
    velocity : float
        Mean air velocity [m/s].
    T : float
        Air temperature [K].
    """
    return abs(velocity) / speed_of_sound(T)
