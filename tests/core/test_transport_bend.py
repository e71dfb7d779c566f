"""Inertial losses in bends: the published fits of Pui, Romay-Novas & Liu (1987).

Published-form checks (source beside each; the forms were recalled, "from memory", as given
by Brockmann 2001) and regression pins, kept apart.
"""

from __future__ import annotations

import math

import pytest

from driftdose.transport import bend


def test_penetration_pui1987_laminar_half_at_stk_0171() -> None:
    # Pui et al. (1987) laminar fit as printed by Brockmann (2001) (from memory): with
    # Stk' = tau U / d_t, (Stk'/0.171)^n = 1 at Stk' = 0.171, so a 90 degree bend passes
    # 2^(-1) = 50 %; in Pui's Stk = 2 tau U / d_t that is 0.342.
    assert bend.penetration_pui1987_laminar(0.342, math.pi / 2) == pytest.approx(0.5, abs=1e-15)


def _plug_flow_penetration(stk_d: float, angle: float) -> float:
    """Plug flow through a bend: the section shifted by delta = tau U theta (derived).

    The overlap of two circles of radius a offset by delta, over pi a^2; Stk' = tau U / d_t
    so delta / a = 2 Stk' theta (the case of Crane & Evans 1977, from memory).
    """
    dl = 2.0 * stk_d * angle
    if dl >= 2.0:
        return 0.0
    return (2.0 * math.acos(dl / 2.0) - (dl / 2.0) * math.sqrt(4.0 - dl * dl)) / math.pi


@pytest.mark.parametrize("stk_d", [0.005, 0.01, 0.02, 0.03, 0.04, 0.05])
@pytest.mark.parametrize("angle_deg", [45.0, 90.0, 180.0])
def test_penetration_pui1987_laminar_below_plug_flow_loss_at_small_stk(stk_d, angle_deg):
    # Independent small-Stk limit: laminar flow is slow near the wall, so it loses fewer
    # particles than plug flow of the same mean speed (plug-flow crescent, Crane & Evans
    # 1977, from memory; derived in _plug_flow_penetration). Pui's fit read with 0.171 in
    # Stk' = tau U / d_t satisfies it; read with 0.171 in Pui's 2 tau U / d_t it loses twice
    # the plug-flow fraction at Stk' = 0.05 (checked below).
    theta = math.radians(angle_deg)
    laminar = bend.penetration_pui1987_laminar(2.0 * stk_d, theta)
    assert 1.0 - laminar <= 1.0 - _plug_flow_penetration(stk_d, theta)


def test_penetration_pui1987_laminar_other_reading_breaks_plug_flow_bound():
    # The reading that was used before (0.171 in Pui's Stk) violates the bound above.
    theta = math.pi / 2
    other = bend.penetration_pui1987_laminar(2.0 * 0.1, theta)  # Stk = 0.1 read as Stk'
    assert 1.0 - other > 2.0 * (1.0 - _plug_flow_penetration(0.05, theta))


def test_penetration_pui1987_plug_flow_small_stk_limit():
    # The plug-flow crescent 2 delta / (pi a) = (4/pi) Stk' theta for small Stk' (first
    # order in delta; derived).
    stk_d, theta = 1e-4, math.pi / 2
    loss = 1.0 - _plug_flow_penetration(stk_d, theta)
    assert loss == pytest.approx(4.0 / math.pi * stk_d * theta, rel=1e-3)


@pytest.mark.parametrize("stk", [0.05, 0.1, 0.3, 0.5, 1.0])
def test_penetration_pui1987_turbulent_90_degree_form(stk) -> None:
    # Pui et al. (1987) turbulent 90 degree fit as printed there: efficiency
    # 1 - 10^(-0.963 Stk), i.e. P = 10^(-0.963 Stk) (from memory).
    assert bend.penetration_pui1987_turbulent(stk, math.pi / 2) == pytest.approx(
        10.0 ** (-0.963 * stk), rel=1e-12
    )


@pytest.mark.parametrize("stk", [0.05, 0.2, 0.6])
def test_penetration_pui1987_turbulent_brockmann_form(stk) -> None:
    # Brockmann (2001) prints the same fit as exp(-2.823 Stk' theta) with Stk' = tau U / d_t
    # = Stk / 2 (from memory); 2.823 is printed to 4 digits.
    theta = math.radians(60.0)
    expected = math.exp(-2.823 * (stk / 2.0) * theta)
    assert bend.penetration_pui1987_turbulent(stk, theta) == pytest.approx(expected, rel=2e-4)


@pytest.mark.parametrize(
    "function", [bend.penetration_pui1987_laminar, bend.penetration_pui1987_turbulent]
)
def test_penetration_pui1987_angle_composition(function) -> None:
    # Both fits carry the angle in the exponent (2 theta / pi): two 45 degree bends pass as
    # much as one 90 degree bend, and a zero angle passes everything.
    stk = 0.25
    p45 = function(stk, math.pi / 4)
    assert p45 * p45 == pytest.approx(function(stk, math.pi / 2), rel=1e-12)
    assert function(stk, 0.0) == 1.0


def test_bend_stokes_number_from_hinds_relaxation_time() -> None:
    # Stk = 2 tau U / d_t (Pui et al. 1987: rho Cc d^2 U / (9 mu d_t)). Hinds (1999)
    # Appendix A11 lists tau = 3.1e-4 s for a 10 um unit-density sphere at 20 degC (from
    # memory); at U = 1 m/s in a 4 mm tube Stk = 2 (3.1e-4)(1) / 0.004 = 0.155, to the 2
    # digits printed (half a unit: 1.6 %).
    dt = 4e-3
    flow = 1.0 * math.pi * dt**2 / 4.0
    stk = bend.bend_stokes_number(10e-6, flow, dt, 1000.0)
    assert stk == pytest.approx(0.155, rel=0.05 / 3.1)


def test_bend_penetration_regime_by_reynolds_number() -> None:
    # Laminar fit below Re = 2000, turbulent above 4000 (common practice for pipe flow).
    d, dt, rho = 5e-6, 5e-3, 1000.0
    nu = 1.81e-5 / 1.204
    slow = 1000 * nu * math.pi * dt / 4
    fast = 6000 * nu * math.pi * dt / 4
    stk_slow = bend.bend_stokes_number(d, slow, dt, rho)
    stk_fast = bend.bend_stokes_number(d, fast, dt, rho)
    assert bend.bend_penetration(d, slow, dt, math.pi / 2, rho) == (
        bend.penetration_pui1987_laminar(stk_slow, math.pi / 2)
    )
    assert bend.bend_penetration(d, fast, dt, math.pi / 2, rho) == (
        bend.penetration_pui1987_turbulent(stk_fast, math.pi / 2)
    )


def test_penetration_pui1987_laminar_overflow_guard() -> None:
    # Very large Stokes numbers pass nothing instead of overflowing.
    assert bend.penetration_pui1987_laminar(1e6, math.pi / 2) == 0.0


def test_bend_penetration_transition_interpolates_between_fits() -> None:
    # Between Re 2000 and 4000 the answer lies between the two published fits, equal to
    # each at the ends (this tool's interpolation, linear in P).
    d, dt, rho = 5e-6, 5e-3, 1000.0
    from driftdose.transport.flow import tube_reynolds_number

    nu_flow = tube_reynolds_number(1.0, dt) / 1.0  # Re per unit flow
    for re in (2000.0, 2500.0, 3000.0, 3999.0, 4000.0):
        flow = re / nu_flow
        stk = bend.bend_stokes_number(d, flow, dt, rho)
        lam = bend.penetration_pui1987_laminar(stk, math.pi / 2)
        turb = bend.penetration_pui1987_turbulent(stk, math.pi / 2)
        p = bend.bend_penetration(d, flow, dt, math.pi / 2, rho)
        assert min(lam, turb) - 1e-12 <= p <= max(lam, turb) + 1e-12
        w = (re - 2000.0) / 2000.0
        assert p == pytest.approx((1 - w) * lam + w * turb, rel=1e-9)


def test_bend_penetration_regression_pin() -> None:
    # Regression pin: 10 um, unit density, 4 mm tube at 1 L/min (laminar), 90 degrees.
    # It was 0.37211 with 0.171 read in Pui's Stokes number (see the bend module).
    p = bend.bend_penetration(10e-6, 1e-3 / 60, 4e-3, math.pi / 2, 1000.0)
    assert p == pytest.approx(0.78092, abs=1e-5)
