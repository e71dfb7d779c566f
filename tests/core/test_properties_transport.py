"""Physical invariants of the transport models, checked with hypothesis.

No reference values: each property follows from the physics (stated beside it) and must hold
for any valid input. Sizes range over 1 nm to 100 um (the chain's curve range), tube lengths
over 1 mm to 100 m, flows over 0.01 to 100 L/min.
"""

from __future__ import annotations

import math

from hypothesis import assume, given, settings
from hypothesis import strategies as st

from driftdose.transport import (
    Bend,
    Chain,
    Cyclone,
    Impactor,
    ScreenStack,
    Tube,
    bend,
    cyclone,
    impactor,
    screen,
    settling,
    tube,
)
from driftdose.transport.flow import tube_reynolds_number

FAST = settings(max_examples=260, deadline=None)


def log_uniform(lo: float, hi: float) -> st.SearchStrategy[float]:
    return st.floats(math.log(lo), math.log(hi)).map(math.exp)


diameters = log_uniform(1e-9, 100e-6)  # [m]
lengths = log_uniform(1e-3, 100.0)  # [m]
flows = log_uniform(0.01e-3 / 60, 100e-3 / 60)  # [m^3/s]
tube_diameters = log_uniform(1e-3, 50e-3)  # [m]
densities = st.floats(500.0, 12000.0)  # [kg/m^3]
angles = st.floats(-math.pi / 2, math.pi / 2)  # [rad]
bend_angles = st.floats(0.01, 2 * math.pi)  # [rad]
ratios = st.floats(1.01, 20.0)  # [-]
solidities = st.floats(0.05, 0.6)  # [-]
temperatures = st.floats(253.15, 373.15)  # [K]
pressures = st.floats(60e3, 110e3)  # [Pa]


def in_unit_interval(p: float) -> bool:
    return 0.0 <= p <= 1.0 and not math.isnan(p)


# --- penetration is a fraction ----------------------------------------------------------------


@FAST
@given(diameters, lengths, flows, tube_diameters, densities, angles, temperatures, pressures)
def test_tube_penetrations_in_unit_interval(d, length, flow, dt, rho, theta, T, P) -> None:
    assert in_unit_interval(tube.tube_diffusion_penetration(d, length, flow, T, P))
    assert in_unit_interval(tube.tube_diffusion_penetration(d, length, flow, T, P, "hinds1999"))
    assert in_unit_interval(tube.tube_diffusion_penetration_any(d, length, flow, dt, T, P))
    assert in_unit_interval(
        settling.tube_settling_penetration(d, length, flow, dt, rho, theta, T, P)
    )


@FAST
@given(diameters, flows, tube_diameters, bend_angles, densities)
def test_bend_penetration_in_unit_interval(d, flow, dt, angle, rho) -> None:
    for regime in ("laminar", "turbulent"):
        assert in_unit_interval(bend.bend_penetration(d, flow, dt, angle, rho, regime=regime))


@FAST
@given(diameters, log_uniform(0.5e-6, 20e-6), ratios, densities)
def test_cyclone_penetration_in_unit_interval(d, d50, sigma, rho) -> None:
    assert in_unit_interval(cyclone.cyclone_penetration(d, d50, sigma, rho))
    assert in_unit_interval(cyclone.cyclone_penetration(d, curve="iso7708_respirable"))


@FAST
@given(
    diameters,
    log_uniform(10e-6, 200e-6),
    solidities,
    st.floats(1.0, 3.0),
    log_uniform(1e-3, 1.0),
    st.integers(1, 50),
    st.booleans(),
)
def test_screen_penetration_in_unit_interval(d, wire, alpha, h_ratio, u0, n, imp) -> None:
    assert in_unit_interval(
        screen.screen_penetration(d, wire, alpha, wire * h_ratio, u0, n, impaction=imp)
    )


# --- monotonic in length ----------------------------------------------------------------------


@FAST
@given(diameters, lengths, ratios, flows, tube_diameters, densities)
def test_tube_penetration_falls_with_length(d, length, k, flow, dt, rho) -> None:
    # A longer tube gives more time to diffuse and settle to the wall: never more passes.
    assert tube.tube_diffusion_penetration(d, length * k, flow) <= tube.tube_diffusion_penetration(
        d, length, flow
    )
    assert tube.tube_diffusion_penetration_friedlander1977(
        d, length * k, flow, dt
    ) <= tube.tube_diffusion_penetration_friedlander1977(d, length, flow, dt)
    for regime in ("laminar", "turbulent"):
        assert settling.tube_settling_penetration(
            d, length * k, flow, dt, rho, regime=regime
        ) <= settling.tube_settling_penetration(d, length, flow, dt, rho, regime=regime)


# --- monotonic in flow, where the physics says so ----------------------------------------------


@FAST
@given(diameters, lengths, flows, ratios, tube_diameters, densities)
def test_tube_penetration_rises_with_flow(d, length, flow, k, dt, rho) -> None:
    # Within one regime a faster flow leaves less residence time: diffusion (laminar: mu =
    # DL/Q; turbulent: -ln P ~ U^-1/4) and settling losses both fall.
    assert tube.tube_diffusion_penetration(d, length, flow * k) >= tube.tube_diffusion_penetration(
        d, length, flow
    )
    assert tube.tube_diffusion_penetration_friedlander1977(
        d, length, flow * k, dt
    ) >= tube.tube_diffusion_penetration_friedlander1977(d, length, flow, dt)
    for regime in ("laminar", "turbulent"):
        assert settling.tube_settling_penetration(
            d, length, flow * k, dt, rho, regime=regime
        ) >= settling.tube_settling_penetration(d, length, flow, dt, rho, regime=regime)


@FAST
@given(diameters, flows, ratios, tube_diameters, bend_angles, densities)
def test_bend_penetration_falls_with_flow_and_angle(d, flow, k, dt, angle, rho) -> None:
    # Bend losses grow with the Stokes number (faster flow) and with the angle turned.
    for regime in ("laminar", "turbulent"):
        base = bend.bend_penetration(d, flow, dt, angle, rho, regime=regime)
        assert bend.bend_penetration(d, flow * k, dt, angle, rho, regime=regime) <= base
        assert bend.bend_penetration(
            d, flow, dt, min(angle * k, 2 * math.pi), rho, regime=regime
        ) <= (base)


@FAST
@given(log_uniform(0.1e-3, 10e-3), flows, ratios, st.integers(1, 100), densities)
def test_impactor_cut_diameter_falls_with_flow(w, flow, k, n, rho) -> None:
    # A faster jet raises every particle's Stokes number, so a smaller size is cut.
    u = 4 * flow * k / (n * math.pi * w * w)
    assume(u < 200.0)
    assert impactor.impactor_cut_diameter(w, flow * k, n, rho) < impactor.impactor_cut_diameter(
        w, flow, n, rho
    )


@FAST
@given(diameters, ratios, log_uniform(0.1e-3, 5e-3), flows, densities)
def test_impactor_penetration_falls_with_size(d, k, w, flow, rho) -> None:
    # d^2 Cc(d) rises with d, so the Stokes number and the efficiency do.
    assert impactor.impactor_penetration(d * k, w, flow, 1, rho) <= impactor.impactor_penetration(
        d, w, flow, 1, rho
    )


@FAST
@given(diameters, log_uniform(10e-6, 200e-6), solidities, log_uniform(1e-3, 1.0), ratios)
def test_screen_penetration_rises_with_face_velocity_without_impaction(d, wire, alpha, u0, k):
    # Diffusion and its interaction term fall with Pe, interception does not depend on the
    # velocity: without impaction a faster flow passes more.
    h = 2 * wire
    assert screen.screen_penetration(d, wire, alpha, h, u0 * k) >= screen.screen_penetration(
        d, wire, alpha, h, u0
    )


@FAST
@given(
    diameters, log_uniform(10e-6, 200e-6), solidities, log_uniform(1e-3, 1.0), st.integers(1, 30)
)
def test_screen_penetration_falls_with_number_of_screens(d, wire, alpha, u0, n) -> None:
    h = 2 * wire
    assert screen.screen_penetration(d, wire, alpha, h, u0, n + 1) <= screen.screen_penetration(
        d, wire, alpha, h, u0, n
    )


# --- the chain -------------------------------------------------------------------------------


@FAST
@given(diameters, lengths, flows, log_uniform(3e-3, 20e-3), densities)
def test_chain_overall_not_above_any_stage(d, length, flow, dt, rho) -> None:
    # Penetrations multiply: the chain passes no more than its most selective stage.
    assume(tube_reynolds_number(flow, dt) < 1e5)
    chain = Chain(
        (
            Tube(length, dt, flow),
            Bend(dt, flow, math.pi / 2, 10 * dt),
            Cyclone(4e-6, 1.5),
            ScreenStack(50e-6, 0.3, 100e-6, flow, 25e-3, 3),
        )
    )
    overall = chain.penetration(d, rho)
    assert in_unit_interval(overall)
    for stage in chain.stages:
        assert overall <= stage.penetration(d, rho, 293.15, 101325.0) + 1e-15


@FAST
@given(diameters, flows, log_uniform(0.2e-3, 5e-3))
def test_impactor_stage_penetration_in_unit_interval(d, flow, w) -> None:
    stage = Impactor(w, flow)
    assert in_unit_interval(stage.penetration(d, 1000.0, 293.15, 101325.0))
