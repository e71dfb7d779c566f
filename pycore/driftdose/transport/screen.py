"""Wire screens as fan-model filters: diffusion, interception and impaction on the wires.

Interface: :func:`screen_penetration` (stable name). Components:
:func:`fan_model_hydrodynamic_factor`, :func:`screen_parameter`,
:func:`single_wire_efficiency`.

Model: a stack of ``n`` identical screens is a fan-model filter (Cheng & Yeh 1980; Cheng,
Yeh & Brinsko 1985): P = exp(-B n eta), B = 4 alpha h / (pi (1 - alpha) d_f), with the
single-wire efficiency eta the sum of diffusion, interception and their interaction
(Cheng, Yeh & Brinsko 1985) and, where particles are large or fast enough, impaction on an
isolated cylinder (Landahl & Herrmann 1949), an optional estimate off by default.

Velocity convention (decided from the papers, from memory): the Peclet and Stokes numbers
use the face velocity U0 = Q / A (flow over the exposed screen area); the factor
1 / (1 - alpha) that turns U0 into the mean velocity between the wires lives in B only.
Cheng & Yeh (1980) define Pe = d_f U0 / D with U0 the face velocity and fitted the constant
2.7 with that definition. Using U0 / (1 - alpha) in Pe instead would lower eta_D by the
factor (1 - alpha)^(2/3), about 21 % at alpha = 0.3; the choice matters and is stated here
so a user can check it against the papers.
"""

from __future__ import annotations

import math
from collections.abc import Sequence

from .. import gas, particle
from ..constants import P_DEFAULT, T_DEFAULT

__all__ = [
    "SCREEN_SIZE_RANGE",
    "fan_model_hydrodynamic_factor",
    "screen_curve",
    "screen_parameter",
    "screen_penetration",
    "single_wire_efficiency",
]

SCREEN_SIZE_RANGE = (2e-9, 1e-6)
"""Particle sizes over which the fan-model screen efficiency has been tested: 0.01 to 1 um
by Cheng, Yeh & Brinsko (1985), down to about 2 nm by Ichitsubo et al. (1996) and Alonso
et al. (1997). [m]"""


def fan_model_hydrodynamic_factor(solidity: float, wire_knudsen: float = 0.0) -> float:
    """Hydrodynamic factor of the fan model filter.

    Parameters
    ----------
    solidity : float
        Solid volume fraction of the screen stack, alpha. [-]
    wire_knudsen : float
        Knudsen number of the wire, 2 lambda / d_f (slip on the wire). [-]

    Returns
    -------
    float
        k = -0.5 ln(alpha) - 0.52 + 0.64 alpha + 1.43 (1 - alpha) Kn_f (Kirsch & Stechkina
        1978, as used by Cheng, Yeh & Brinsko 1985, from memory). [-]

    Notes
    -----
    The slip term is negligible for wires thicker than about 10 um at 1 atm.

    """
    a = solidity
    return -0.5 * math.log(a) - 0.52 + 0.64 * a + 1.43 * (1.0 - a) * wire_knudsen


def screen_parameter(wire_diameter: float, solidity: float, thickness: float) -> float:
    """Screen parameter B = 4 alpha h / (pi (1 - alpha) d_f) of one screen.

    Parameters
    ----------
    wire_diameter : float
        Wire diameter d_f. [m]
    solidity : float
        Solid volume fraction alpha. [-]
    thickness : float
        Thickness of one screen h. [m]

    Returns
    -------
    float
        B (Cheng & Yeh 1980): wire length per unit face area times d_f / (1 - alpha),
        so that P = exp(-B n eta). [-]

    """
    return 4.0 * solidity * thickness / (math.pi * (1.0 - solidity) * wire_diameter)


def single_wire_efficiency(
    d: float,
    wire_diameter: float,
    solidity: float,
    face_velocity: float,
    density: float = 1000.0,
    T: float = T_DEFAULT,
    P: float = P_DEFAULT,
    impaction: bool = False,
) -> dict[str, float]:
    """Single-wire collection efficiency of a screen, by mechanism.

    Parameters
    ----------
    d : float
        Particle diameter. [m]
    wire_diameter : float
        Wire diameter d_f. [m]
    solidity : float
        Solid volume fraction alpha. [-]
    face_velocity : float
        Face velocity U0 = Q / A. [m/s]
    density : float
        Particle density (impaction only). [kg/m^3]
    T, P : float
        Temperature [K], pressure [Pa].
    impaction : bool
        Include the isolated-cylinder impaction estimate (off by default elsewhere).

    Returns
    -------
    dict
        ``diffusion``, ``interception``, ``interaction``, ``impaction`` and ``total``
        efficiencies [-], plus the ``peclet`` and ``stokes`` numbers [-].

    Notes
    -----
    Cheng, Yeh & Brinsko (1985), fan model (from memory):

    - diffusion eta_D = 2.7 Pe^(-2/3), Pe = d_f U0 / D (Cheng & Yeh 1980);
    - interception eta_R = R^2 / k, R = d / d_f;
    - diffusion-interception interaction eta_DR = 1.24 k^(-1/2) Pe^(-1/2) R^(2/3);

    with k from :func:`fan_model_hydrodynamic_factor`. Impaction, not part of their fit,
    is the isolated-cylinder curve eta_I = Stk^3 / (Stk^3 + 0.77 Stk^2 + 0.22) with
    Stk = rho_p Cc d^2 U0 / (9 mu d_f) (Landahl & Herrmann 1949, as cited by Friedlander
    1977, from memory). That fit was computed for wire Reynolds numbers of order 10; in the
    creeping flow through most screens (wire Re well below 1) viscous flow around the wire
    makes impaction weaker, so the term overstates it there. It is therefore optional and
    off unless asked for; the Stokes number is returned so a caller can warn when
    impaction may matter.

    References
    ----------
    .. [1] Cheng, Y. S., Yeh, H. C. (1980), Theory of a screen-type diffusion battery,
       J. Aerosol Sci. 11:313-320.
    .. [2] Cheng, Y. S., Yeh, H. C., Brinsko, K. J. (1985), Use of wire screens as a fan
       model filter, Aerosol Sci. Technol. 4:165-174.
    .. [3] Kirsch, A. A., Stechkina, I. B. (1978), The theory of aerosol filtration with
       fibrous filters, in Shaw, D. T. (ed.), Fundamentals of Aerosol Science, Wiley.
    .. [4] Landahl, H. D., Herrmann, K. (1949), Sampling of liquid aerosols by wires,
       cylinders and slides, J. Colloid Sci. 4:103-136.

    """
    diff = particle.diffusion_coefficient(d, T, P)
    kn_f = 2.0 * gas.mean_free_path(T, P) / wire_diameter
    k = fan_model_hydrodynamic_factor(solidity, kn_f)
    tau = particle.relaxation_time(d, density, T, P)
    eta_d, eta_r, eta_dr, eta_i, pe, stk = _wire_terms(
        d, diff, tau, wire_diameter, face_velocity, k, impaction
    )
    return {
        "diffusion": eta_d,
        "interception": eta_r,
        "interaction": eta_dr,
        "impaction": eta_i,
        "total": eta_d + eta_r + eta_dr + eta_i,
        "peclet": pe,
        "stokes": stk,
    }


def _wire_terms(
    d: float,
    diff: float,
    tau: float,
    wire_diameter: float,
    face_velocity: float,
    k: float,
    impaction: bool,
) -> tuple[float, float, float, float, float, float]:
    """The terms of :func:`single_wire_efficiency` and its Peclet and Stokes numbers [-].

    ``d`` [m], ``diff`` its diffusion coefficient [m^2/s], ``tau`` its relaxation time [s],
    ``k`` the fan model's hydrodynamic factor [-]; returns (diffusion, interception,
    interaction, impaction, Pe, Stk).
    """
    pe = wire_diameter * face_velocity / diff
    r = d / wire_diameter
    eta_d = 2.7 * pe ** (-2.0 / 3.0)  # [1], [2]
    eta_r = r * r / k  # [2]
    eta_dr = 1.24 * k**-0.5 * pe**-0.5 * r ** (2.0 / 3.0)  # [2]
    stk = 2.0 * tau * face_velocity / wire_diameter
    eta_i = stk**3 / (stk**3 + 0.77 * stk**2 + 0.22) if impaction else 0.0  # [4]
    return eta_d, eta_r, eta_dr, eta_i, pe, stk


def screen_curve(
    diameters: Sequence[float],
    diffusion_coefficients: Sequence[float],
    relaxation_times: Sequence[float],
    wire_diameter: float,
    solidity: float,
    thickness: float,
    face_velocity: float,
    n_screens: int = 1,
    T: float = T_DEFAULT,
    P: float = P_DEFAULT,
    impaction: bool = False,
) -> list[float]:
    """:func:`screen_penetration` at many sizes, from their diffusion coefficients and
    relaxation times.

    Parameters
    ----------
    diameters : sequence of float
        Particle diameters. [m]
    diffusion_coefficients : sequence of float
        Their diffusion coefficients. [m^2/s]
    relaxation_times : sequence of float
        Their relaxation times. [s]
    wire_diameter : float
        Wire diameter. [m]
    solidity : float
        Solid volume fraction of the screen. [-]
    thickness : float
        Thickness of one screen. [m]
    face_velocity : float
        Air velocity approaching the screen. [m/s]
    n_screens : int
        Number of identical screens in series. [-]
    T : float
        Temperature. [K]
    P : float
        Pressure. [Pa]
    impaction : bool
        Whether impaction on the wires is added.

    Returns
    -------
    list of float
        Penetration at each size [-] (fan model of Cheng & Yeh 1980 and Cheng, Yeh &
        Brinsko 1985, as :func:`single_wire_efficiency`).

    """
    kn_f = 2.0 * gas.mean_free_path(T, P) / wire_diameter
    k = fan_model_hydrodynamic_factor(solidity, kn_f)
    b = screen_parameter(wire_diameter, solidity, thickness)
    out = []
    for d, diff, tau in zip(diameters, diffusion_coefficients, relaxation_times, strict=True):
        eta_d, eta_r, eta_dr, eta_i, _, _ = _wire_terms(
            d, diff, tau, wire_diameter, face_velocity, k, impaction
        )
        out.append(math.exp(-b * n_screens * (eta_d + eta_r + eta_dr + eta_i)))
    return out


def screen_penetration(
    d: float,
    wire_diameter: float,
    solidity: float,
    thickness: float,
    face_velocity: float,
    n_screens: int = 1,
    T: float = T_DEFAULT,
    P: float = P_DEFAULT,
    density: float = 1000.0,
    impaction: bool = False,
) -> float:
    """Penetration of particles through a stack of identical wire screens (stable interface).

    Parameters
    ----------
    d : float
        Particle diameter. [m]
    wire_diameter : float
        Wire diameter. [m]
    solidity : float
        Solid volume fraction of a screen, in (0, 1). [-]
    thickness : float
        Thickness of one screen (about twice the wire diameter for plain-woven screens). [m]
    face_velocity : float
        Flow divided by the exposed screen area. [m/s]
    n_screens : int
        Number of screens in the stack. [-]
    T, P : float
        Temperature [K], pressure [Pa].
    density : float
        Particle density (impaction only). [kg/m^3]
    impaction : bool
        Add the isolated-cylinder impaction estimate (see :func:`single_wire_efficiency`).

    Returns
    -------
    float
        P = exp(-B n eta) (Cheng & Yeh 1980). [-]

    Examples
    --------
    >>> p1 = screen_penetration(20e-9, 50e-6, 0.3, 100e-6, 0.05)
    >>> p5 = screen_penetration(20e-9, 50e-6, 0.3, 100e-6, 0.05, n_screens=5)
    >>> abs(p5 - p1**5) < 1e-12
    True

    """
    eta = single_wire_efficiency(
        d, wire_diameter, solidity, face_velocity, density, T, P, impaction
    )["total"]
    return math.exp(-screen_parameter(wire_diameter, solidity, thickness) * n_screens * eta)
