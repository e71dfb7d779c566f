"""The settling-velocity solve against scipy, over sizes, densities, air states and drag laws.

No published values here (those are in test_particle.py): the force balance
V f(Re(V)) = V_Stokes is written out independently and solved with scipy's ``brentq`` to
near machine precision; the core's safeguarded Newton solve must agree to 1e-13 relative
(its stopping rule leaves an error of order 1e-14). The Brent solve the core used before
(rtol 1e-13) is kept here as a second reference: the two differ by at most its tolerance.
"""

from __future__ import annotations

import math

import pytest
from scipy.optimize import brentq

from driftdose import gas, particle
from driftdose._numerics import brent_root
from driftdose.constants import STANDARD_GRAVITY


def _clift_gauvin(re: float) -> float:
    # Clift & Gauvin (1970) as in Clift, Grace & Weber (1978) Table 5.2, written out here
    if re <= 0.0:
        return 1.0
    return 1.0 + 0.15 * re**0.687 + (0.42 / 24.0) * re / (1.0 + 42500.0 * re**-1.16)


def _schiller_naumann(re: float) -> float:
    return 1.0 + 0.15 * max(re, 0.0) ** 0.687


LAWS = {"clift_gauvin1970": _clift_gauvin, "schiller_naumann1933": _schiller_naumann}


def _stokes_and_k(d, rho, chi, T, P):
    mu, rho_g = gas.air_viscosity(T), gas.air_density(T, P)
    cc = particle.slip_correction(d, T, P)
    v_st = rho * d * d * cc * STANDARD_GRAVITY / (18.0 * mu * chi)
    return v_st, rho_g * d / mu


def _scipy_velocity(d, rho, chi, T, P, model) -> float:
    v_st, k = _stokes_and_k(d, rho, chi, T, P)
    f = LAWS[model]
    if f(k * v_st) - 1.0 < 1e-15:
        return v_st / f(k * v_st)
    return brentq(lambda v: v * f(k * v) - v_st, 0.0, v_st, xtol=v_st * 1e-17, rtol=8.9e-16)


def _previous_brent_velocity(d, rho, chi, T, P, model) -> float:
    # the solve the core used before: Brent's method on V, rtol 1e-13
    v_st, k = _stokes_and_k(d, rho, chi, T, P)
    f = LAWS[model]
    if f(k * v_st) - 1.0 < 1e-12:
        return v_st
    return brent_root(lambda v: v * f(k * v) - v_st, 0.0, v_st, xtol=v_st * 1e-14, rtol=1e-13)


SIZES = [1e-10 * 10 ** (i * 7.5 / 150) for i in range(151)]  # 0.1 nm to 3 mm
CASES = [
    (rho, chi, T, P, model)
    for model in LAWS
    for rho, chi in ((100.0, 1.0), (1000.0, 1.0), (2650.0, 1.36), (19300.0, 1.0))
    for T, P in ((293.15, 101325.0), (243.15, 60e3), (373.15, 120e3))
]


@pytest.mark.parametrize(("rho", "chi", "T", "P", "model"), CASES)
def test_settling_velocity_vs_brentq_over_sizes(rho, chi, T, P, model) -> None:
    worst_scipy = worst_previous = 0.0
    for d in SIZES:
        got = particle.settling_velocity(d, rho, T, P, chi, model)
        ref = _scipy_velocity(d, rho, chi, T, P, model)
        worst_scipy = max(worst_scipy, abs(got - ref) / ref)
        prev = _previous_brent_velocity(d, rho, chi, T, P, model)
        worst_previous = max(worst_previous, abs(got - prev) / prev)
    assert worst_scipy < 1e-13
    # the previous solve stopped within 2 rtol |V| + xtol / 2 (5e-13 relative)
    assert worst_previous < 5e-13


def test_settling_velocity_reaches_newton_regime() -> None:
    # a 3 mm gold sphere settles at Re of several thousand; the solve still agrees
    d, rho = 3e-3, 19300.0
    v = particle.settling_velocity(d, rho)
    assert particle.reynolds_number(d, v) > 1e3
    assert v == pytest.approx(
        _scipy_velocity(d, rho, 1.0, 293.15, 101325.0, "clift_gauvin1970"), rel=1e-13
    )
    assert math.isfinite(v)
