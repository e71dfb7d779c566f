"""Wire screens as fan-model filters (Cheng & Yeh 1980; Cheng, Yeh & Brinsko 1985).

Published-form checks (hand calculations from the printed equations, recalled "from memory"
and named beside each), scaling laws the published forms imply, and regression pins.
"""

from __future__ import annotations

import math

import pytest

from driftdose import particle
from driftdose.transport import screen

WIRE, ALPHA, THICK = 50e-6, 0.3, 100e-6  # a generic screen for the checks [m], [-], [m]


def test_screen_parameter_hand_calculation() -> None:
    # Cheng & Yeh (1980): B = 4 alpha h / (pi (1 - alpha) d_f). By hand for d_f = 50 um,
    # alpha = 0.3, h = 100 um: 4 (0.3)(100) / (pi (0.7)(50)) = 120 / 109.956 = 1.09135.
    assert screen.screen_parameter(WIRE, ALPHA, THICK) == pytest.approx(1.09135, abs=1e-5)


def test_fan_model_hydrodynamic_factor_hand_calculation() -> None:
    # Kirsch & Stechkina (1978): k = -0.5 ln(alpha) - 0.52 + 0.64 alpha (no slip). By hand
    # at alpha = 0.3: 0.601986 - 0.52 + 0.192 = 0.273986.
    assert screen.fan_model_hydrodynamic_factor(0.3) == pytest.approx(0.273986, abs=1e-6)


def test_single_wire_efficiency_diffusion_term() -> None:
    # Cheng & Yeh (1980): eta_D = 2.7 Pe^(-2/3) with Pe = d_f U0 / D (face velocity U0).
    d, u0 = 10e-9, 0.05
    pe = WIRE * u0 / particle.diffusion_coefficient(d)
    eta = screen.single_wire_efficiency(d, WIRE, ALPHA, u0)
    assert eta["peclet"] == pytest.approx(pe, rel=1e-12)
    assert eta["diffusion"] == pytest.approx(2.7 * pe ** (-2.0 / 3.0), rel=1e-12)


@pytest.mark.parametrize("n", [2, 5, 20])
def test_screen_penetration_stack_is_power_of_one(n) -> None:
    # Fan model (Cheng & Yeh 1980): P = exp(-B n eta), so n identical screens pass P1^n.
    for d in (3e-9, 30e-9, 300e-9, 3e-6):
        p1 = screen.screen_penetration(d, WIRE, ALPHA, THICK, 0.1)
        pn = screen.screen_penetration(d, WIRE, ALPHA, THICK, 0.1, n_screens=n)
        assert pn == pytest.approx(p1**n, rel=1e-9)


def test_screen_penetration_diffusion_regime_velocity_scaling() -> None:
    # Where diffusion dominates, -ln P = B n 2.7 (d_f U0 / D)^(-2/3), so -ln P scales as
    # U0^(-2/3) (Cheng & Yeh 1980). At 3 nm interception and interaction are below 0.3 % of
    # eta_D; that bounds the tolerance.
    d = 3e-9
    ln1 = -math.log(screen.screen_penetration(d, WIRE, ALPHA, THICK, 0.02))
    ln2 = -math.log(screen.screen_penetration(d, WIRE, ALPHA, THICK, 0.16))
    assert ln2 / ln1 == pytest.approx(8.0 ** (-2.0 / 3.0), rel=0.003)


def test_single_wire_efficiency_interception_term() -> None:
    # Cheng, Yeh & Brinsko (1985): eta_R = R^2 / k and eta_DR = 1.24 k^-1/2 Pe^-1/2 R^2/3.
    d, u0 = 2e-6, 0.05
    eta = screen.single_wire_efficiency(d, WIRE, ALPHA, u0)
    k = screen.fan_model_hydrodynamic_factor(ALPHA, 2 * 0.0665e-6 / WIRE)
    r = d / WIRE
    assert eta["interception"] == pytest.approx(r * r / k, rel=1e-3)
    assert eta["interaction"] == pytest.approx(
        1.24 * k**-0.5 * eta["peclet"] ** -0.5 * r ** (2 / 3), rel=1e-3
    )


def test_single_wire_efficiency_impaction_limits() -> None:
    # Landahl & Herrmann (1949) isolated-cylinder curve: eta_I = Stk^3 / (Stk^3 + 0.77 Stk^2
    # + 0.22) tends to 1 at large Stk as 1 - 0.77 / Stk; at Stk = 1 it is 1 / 1.99 (hand
    # calculation).
    on = screen.single_wire_efficiency(50e-6, WIRE, ALPHA, 1.0, impaction=True)
    assert on["stokes"] > 100
    assert (1.0 - on["impaction"]) * on["stokes"] == pytest.approx(0.77, rel=0.01)
    off = screen.single_wire_efficiency(50e-6, WIRE, ALPHA, 1.0, impaction=False)
    assert off["impaction"] == 0.0
    # find the face velocity giving Stk = 1 for 5 um
    tau = particle.relaxation_time(5e-6, 1000.0)
    u0 = WIRE / (2 * tau)
    eta = screen.single_wire_efficiency(5e-6, WIRE, ALPHA, u0, impaction=True)
    assert eta["stokes"] == pytest.approx(1.0, rel=1e-12)
    assert eta["impaction"] == pytest.approx(1.0 / 1.99, rel=1e-12)


def test_screen_penetration_regression_pin() -> None:
    # Regression pin: 20 nm through 10 screens of the generic screen at 5 cm/s.
    p = screen.screen_penetration(20e-9, WIRE, ALPHA, THICK, 0.05, n_screens=10)
    assert p == pytest.approx(0.39750, abs=1e-5)
