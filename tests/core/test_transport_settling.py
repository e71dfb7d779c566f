"""Gravitational settling in tubes: published limits and an independent trajectory solution.

Groups kept apart: published-formula limits (source beside each), a cross-check against
particle trajectories in Poiseuille flow integrated with scipy, and regression pins.
"""

from __future__ import annotations

import math

import pytest
from scipy import integrate, optimize

from driftdose import particle
from driftdose.transport import settling

# ---------------------------------------------------------------------------------------------
# Published forms and their limits
# ---------------------------------------------------------------------------------------------


def test_penetration_heyder_gebhart1977_complete_deposition_at_kappa_one() -> None:
    # Fuchs (1964) / Thomas (1958): every particle is deposited once kappa reaches 1, i.e.
    # L v_ts = (4/3) d_t U, the axial distance travelled by the particle entering at the top
    # of the centre plane while it falls one tube diameter.
    assert settling.penetration_heyder_gebhart1977(1.0) == 0.0
    assert settling.penetration_heyder_gebhart1977(1.0 - 1e-9) < 1e-4


def test_penetration_heyder_gebhart1977_small_kappa_limit() -> None:
    # For small kappa the loss is the flux settling through the horizontal section d_t L:
    # 1 - P = (4/pi) Z = (16 / (3 pi)) kappa, whatever the velocity profile (first-order
    # argument; the expansion of the Fuchs formula gives the same).
    kappa = 1e-6
    loss = 1.0 - settling.penetration_heyder_gebhart1977(kappa)
    assert loss == pytest.approx(16.0 / (3.0 * math.pi) * kappa, rel=1e-3)


def test_tube_settling_penetration_heyder_gebhart1977_vertical_tube() -> None:
    # Heyder & Gebhart (1977): kappa carries cos(theta); a vertical tube (theta = 90 deg) has
    # no settling loss to the wall.
    p = settling.tube_settling_penetration_heyder_gebhart1977(
        10e-6, 2.0, 1e-3 / 60, 5e-3, 1000.0, math.pi / 2
    )
    assert p == pytest.approx(1.0, abs=1e-12)


@pytest.mark.parametrize("angle_deg", [0.0, 30.0, 60.0])
def test_tube_settling_penetration_heyder_gebhart1977_cosine(angle_deg) -> None:
    # Inclined tube = horizontal tube with the length multiplied by cos(theta) (Heyder &
    # Gebhart 1977: kappa = (3/4) Z cos(theta)).
    d, length, flow, dt, rho = 8e-6, 3.0, 2e-3 / 60, 6e-3, 1000.0
    theta = math.radians(angle_deg)
    inclined = settling.tube_settling_penetration_heyder_gebhart1977(
        d, length, flow, dt, rho, theta
    )
    horizontal = settling.tube_settling_penetration_heyder_gebhart1977(
        d, length * math.cos(theta), flow, dt, rho, 0.0
    )
    assert inclined == pytest.approx(horizontal, rel=1e-12)


def test_tube_settling_penetration_schwendiman1975_formula() -> None:
    # Schwendiman et al. (1975): P = exp(-d_t L v_ts cos(theta) / Q); hand evaluation.
    d, length, flow, dt, rho = 5e-6, 4.0, 50e-3 / 60, 8e-3, 1500.0
    v = particle.settling_velocity(d, rho)
    expected = math.exp(-dt * length * v / flow)
    got = settling.tube_settling_penetration_schwendiman1975(d, length, flow, dt, rho)
    assert got == pytest.approx(expected, rel=1e-12)


def test_tube_settling_penetration_laminar_and_turbulent_agree_at_small_loss() -> None:
    # Both forms reduce to 1 - P = (4/pi) Z for small Z: settling through the projected area
    # does not depend on the velocity profile at first order.
    z = 1e-5
    lam = settling.penetration_heyder_gebhart1977(0.75 * z)
    turb = math.exp(-4.0 / math.pi * z)
    assert 1.0 - lam == pytest.approx(1.0 - turb, rel=1e-3)


# ---------------------------------------------------------------------------------------------
# Cross-check: trajectories in Poiseuille flow integrated with scipy
# ---------------------------------------------------------------------------------------------


def _deposited_fraction(kappa: float) -> float:
    """Fraction deposited in a horizontal tube, R = 1, U = 1, by direct integration.

    A particle entering at (x, y0) falls at v while moving axially at u = 2 (1 - x^2 - y^2);
    it reaches the wall y_w = -sqrt(1 - x^2) after the axial distance
    G(y0) / v with G = 2 [(1 - x^2)(y0 - y_w) - (y0^3 - y_w^3) / 3]. It is deposited when
    G(y0) <= L v = 8 kappa / 3. The flux deposited between y_w and y* is G(y*) again.
    """
    lv = 8.0 * kappa / 3.0

    def g(x: float, y0: float) -> float:
        a = 1.0 - x * x
        yw = -math.sqrt(a)
        return 2.0 * (a * (y0 - yw) - (y0**3 - yw**3) / 3.0)

    def inner(x: float) -> float:
        a = 1.0 - x * x
        lo, hi = -math.sqrt(a), math.sqrt(a)
        if g(x, hi) <= lv:
            return g(x, hi)
        y_star = optimize.brentq(lambda y: g(x, y) - lv, lo, hi, xtol=1e-14)
        return g(x, y_star)

    value, _ = integrate.quad(inner, -1.0, 1.0, epsabs=1e-12, epsrel=1e-12, limit=200)
    return value / math.pi


@pytest.mark.parametrize("kappa", [1e-3, 0.01, 0.1, 0.3, 0.5, 0.8, 0.95])
def test_penetration_heyder_gebhart1977_vs_trajectory_integration(kappa) -> None:
    # The Fuchs formula is exact for Poiseuille flow with uniform settling; quadrature to
    # 1e-10.
    expected = 1.0 - _deposited_fraction(kappa)
    assert settling.penetration_heyder_gebhart1977(kappa) == pytest.approx(expected, abs=1e-9)


# ---------------------------------------------------------------------------------------------
# Regression pins (no claim of truth)
# ---------------------------------------------------------------------------------------------


def test_tube_settling_penetration_regression_pin() -> None:
    # Regression pin: 5 um, density 1000, 2 m of 4 mm tube, 1 L/min, horizontal, laminar.
    p = settling.tube_settling_penetration(5e-6, 2.0, 1e-3 / 60, 4e-3, 1000.0)
    assert p == pytest.approx(0.67206, abs=1e-5)
