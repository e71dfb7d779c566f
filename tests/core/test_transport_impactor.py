"""Impactor cut size and efficiency curve.

Published-value checks (Marple & Willeke 1976 via Hinds 1999), a cross-check of the
slip-consistent cut size against scipy's root finder, and regression pins, kept apart.
"""

from __future__ import annotations

import math

import pytest
from scipy import optimize

from driftdose import gas, particle
from driftdose.transport import impactor

# ---------------------------------------------------------------------------------------------
# Published values
# ---------------------------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("jet", "stk50", "kwargs"),
    [
        # Marple & Willeke (1976): Stk50 = 0.24 for round jets (Hinds 1999, ch. 5).
        pytest.param("round", 0.24, {}, id="marple_willeke1976-round-0.24"),
        # Marple & Willeke (1976): Stk50 = 0.59 for rectangular jets.
        pytest.param(
            "rectangular", 0.59, {"slit_length": 20e-3}, id="marple_willeke1976-rectangular-0.59"
        ),
    ],
)
@pytest.mark.parametrize("nozzle", [0.3e-3, 1e-3, 5e-3])
def test_impactor_cut_diameter_stokes_number_at_cut(jet, stk50, kwargs, nozzle) -> None:
    # The Stokes number of the returned cut size is the published Stk50.
    flow = 2e-3 / 60
    d50 = impactor.impactor_cut_diameter(nozzle, flow, jet=jet, **kwargs)
    stk = impactor.impactor_stokes_number(d50, nozzle, flow, jet=jet, **kwargs)
    assert stk == pytest.approx(stk50, rel=1e-9)


@pytest.mark.parametrize(
    ("jet", "sqrt_stk50"),
    [
        # Hinds (1999), ch. 5: sqrt(Stk50) = 0.49 round, 0.77 rectangular (from
        # memory); printed to 2 digits: half a unit, 0.005.
        pytest.param("round", 0.49, id="hinds1999-round-0.49"),
        pytest.param("rectangular", 0.77, id="hinds1999-rectangular-0.77"),
    ],
)
def test_stk50_matches_hinds_square_roots(jet, sqrt_stk50) -> None:
    assert math.sqrt(impactor.STK50[jet]) == pytest.approx(sqrt_stk50, abs=0.005)


def test_impactor_cut_diameter_round_jet_closed_form() -> None:
    # Round jet: d50 sqrt(Cc) = [9 pi mu n W^3 Stk50 / (4 rho_p Q)]^(1/2) (Hinds 1999,
    # ch. 5, with n nozzles sharing Q; from memory).
    w, flow, n, rho = 0.8e-3, 5e-3 / 60, 4, 2000.0
    d50 = impactor.impactor_cut_diameter(w, flow, n, rho)
    rhs = math.sqrt(9 * math.pi * gas.air_viscosity() * n * w**3 * 0.24 / (4 * rho * flow))
    assert d50 * math.sqrt(particle.slip_correction(d50)) == pytest.approx(rhs, rel=1e-10)


def test_impactor_cut_diameter_continuum_flow_scaling() -> None:
    # Continuum regime (Cc ~ 1): d50 is proportional to Q^(-1/2) for a round jet (Hinds 1999,
    # ch. 5). At d50 near 10 um slip changes Cc by under 2 %, which sets the tolerance
    # (Cc(10 um) = 1.016, Seinfeld & Pandis 2006, Table 9.3).
    w = 10e-3
    d1 = impactor.impactor_cut_diameter(w, 5e-3 / 60)
    d2 = impactor.impactor_cut_diameter(w, 20e-3 / 60)
    assert d1 > 5e-6
    assert d2 / d1 == pytest.approx(0.5, rel=0.02)


def test_impactor_cut_diameter_density_scaling() -> None:
    # Continuum regime: the aerodynamic cut is fixed, so d50(rho) = d50(1000) sqrt(1000/rho)
    # (Hinds 1999, eq. 3.27, aerodynamic diameter); tolerance for slip as above.
    w, flow = 10e-3, 5e-3 / 60
    unit = impactor.impactor_cut_diameter(w, flow, density=1000.0)
    dense = impactor.impactor_cut_diameter(w, flow, density=4000.0)
    assert dense / unit == pytest.approx(0.5, rel=0.02)


def test_impactor_efficiency_half_at_stk50() -> None:
    # By construction of the documented sigmoid: E(Stk50) = 0.5; and one "efficiency_width" above
    # the cut in sqrt(Stk) it is Phi(1) = 0.8413 (standard normal table, Abramowitz & Stegun
    # 1964, Table 26.1), printed to 4 digits.
    assert impactor.impactor_efficiency(0.24, "round") == pytest.approx(0.5, abs=1e-15)
    stk = 0.59 * 1.2**2
    assert impactor.impactor_efficiency(stk, "rectangular", 1.2) == pytest.approx(0.8413, abs=5e-5)


def test_jet_velocity_rectangular_needs_slit_length() -> None:
    with pytest.raises(ValueError, match="slit_length"):
        impactor.jet_velocity(1e-3, 1e-4, jet="rectangular")
    with pytest.raises(ValueError, match="valid"):
        impactor.impactor_cut_diameter(1e-3, 1e-4, jet="oval")


# ---------------------------------------------------------------------------------------------
# Cross-check: the slip-consistent cut size with scipy's brentq
# ---------------------------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("w", "flow", "n"),
    [(1e-3, 1e-3 / 60, 1), (0.15e-3, 10e-3 / 60, 200), (5e-3, 30e-3 / 60, 1)],
)
def test_impactor_cut_diameter_vs_scipy_brentq(w, flow, n) -> None:
    rho = 1000.0
    u = 4 * flow / (n * math.pi * w**2)
    target = 9 * gas.air_viscosity() * w * 0.24 / (rho * u)
    expected = optimize.brentq(
        lambda d: d * d * particle.slip_correction(d) - target, 1e-10, 1e-3, xtol=1e-18, rtol=1e-13
    )
    got = impactor.impactor_cut_diameter(w, flow, n, rho)
    assert got == pytest.approx(expected, rel=1e-9)


# ---------------------------------------------------------------------------------------------
# Regression pins (no claim of truth)
# ---------------------------------------------------------------------------------------------


def test_impactor_cut_diameter_regression_pin() -> None:
    # Regression pin: one round 1 mm nozzle at 1 L/min, unit density, 20 degC, 1 atm.
    assert impactor.impactor_cut_diameter(1e-3, 1e-3 / 60) == pytest.approx(1.28342e-6, rel=1e-5)
