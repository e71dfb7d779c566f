"""Physical invariants of single-particle motion, checked with hypothesis.

No reference values: each property follows from the physics (stated beside it) and must hold
for any valid input. Sizes range over 1 nm to 1 mm, temperatures over -50 to 500 degC and
pressures over 10 to 200 kPa, the ranges the boundary accepts.
"""

from __future__ import annotations

import math

from hypothesis import given, settings
from hypothesis import strategies as st

from driftdose import gas, particle
from driftdose.constants import STANDARD_GRAVITY

FAST = settings(max_examples=320, deadline=None)


def log_uniform(lo: float, hi: float) -> st.SearchStrategy[float]:
    return st.floats(math.log(lo), math.log(hi)).map(math.exp)


diameters = log_uniform(1e-9, 1e-3)  # [m]
densities = st.floats(100.0, 25000.0)  # [kg/m^3]
heavy_densities = st.floats(1000.0, 25000.0)  # [kg/m^3]
shape_factors = st.floats(1.0, 5.0)  # [-]
temperatures = st.floats(223.15, 773.15)  # [K]
pressures = st.floats(10e3, 200e3)  # [Pa]
times = log_uniform(1e-3, 86400.0)  # [s]
ratios = st.floats(1.01, 100.0)  # [-]


@FAST
@given(diameters, ratios, temperatures, pressures)
def test_diffusion_coefficient_falls_with_size(d, k, T, P) -> None:
    # D = k T Cc / (3 pi mu d): Cc / d strictly decreases with d (Cc increases with Kn).
    assert particle.diffusion_coefficient(d * k, T, P) < particle.diffusion_coefficient(d, T, P)


@FAST
@given(log_uniform(1e-9, 0.5e-3), ratios, densities, temperatures, pressures)
def test_settling_velocity_rises_with_size(d, k, rho, T, P) -> None:
    # d^2 Cc(d) rises with d, and the Schiller & Naumann drag factor only slows the rise.
    assert particle.settling_velocity(d * k, rho, T, P) > particle.settling_velocity(d, rho, T, P)


@FAST
@given(diameters, temperatures, pressures)
def test_slip_correction_at_least_one(d, T, P) -> None:
    # Slip only lowers drag: Cc = 1 + Kn [alpha + beta exp(-gamma/Kn)] >= 1.
    assert particle.slip_correction(d, T, P) >= 1.0


@FAST
@given(log_uniform(0.1e-3, 1.0), temperatures, pressures)
def test_slip_correction_tends_to_one_for_large_sizes(d, T, P) -> None:
    # Continuum limit: Cc - 1 ~ 1.165 Kn; at d >= 0.1 mm and P >= 10 kPa, Kn < 0.03.
    kn = particle.knudsen_number(d, T, P)
    assert 0.0 < particle.slip_correction(d, T, P) - 1.0 <= 1.2 * kn


@FAST
@given(diameters, temperatures, pressures, ratios)
def test_slip_correction_rises_as_pressure_falls(d, T, P, k) -> None:
    # lambda ~ 1/P, and Cc rises with Kn.
    assert particle.slip_correction(d, T, P / k) > particle.slip_correction(d, T, P)


@FAST
@given(diameters, times, st.floats(1.5, 1e3), temperatures, pressures)
def test_rms_displacement_scales_as_sqrt_time(d, t, k, T, P) -> None:
    # x_rms = sqrt(2 D t).
    ratio = particle.rms_displacement(d, k * t, T, P) / particle.rms_displacement(d, t, T, P)
    assert math.isclose(ratio, math.sqrt(k), rel_tol=1e-12)


@FAST
@given(log_uniform(1e-9, 0.5e-3), densities, shape_factors, temperatures, pressures)
def test_aerodynamic_diameter_round_trip(d, rho, chi, T, P) -> None:
    d_ae = particle.aerodynamic_diameter(d, rho, chi, T, P)
    back = particle.volume_equivalent_diameter(d_ae, rho, chi, T, P)
    assert math.isclose(back, d, rel_tol=1e-9)


@FAST
@given(diameters, heavy_densities, temperatures, pressures)
def test_aerodynamic_diameter_not_below_geometric_for_dense_spheres(d, rho, T, P) -> None:
    # rho_p >= rho_0 and chi = 1: the particle settles at least as fast as a unit-density
    # sphere of its own size, so its aerodynamic diameter is at least d. The root is found
    # in ln d to about 1e-12 * |ln d| ~ 3e-11 relative, hence the 1e-10 allowance at rho = rho_0.
    assert particle.aerodynamic_diameter(d, rho, 1.0, T, P) >= d * (1 - 1e-10)


@FAST
@given(times, st.floats(1.5, 100.0), densities, temperatures, pressures)
def test_crossover_diameter_falls_as_time_grows(t, k, rho, T, P) -> None:
    # Settling distance grows as t, Brownian rms displacement as sqrt(t): over a longer time
    # settling overtakes diffusion at a smaller size.
    d1 = particle.crossover_diameter(t, rho, T, P)
    d2 = particle.crossover_diameter(k * t, rho, T, P)
    assert d1 is not None and d2 is not None
    assert d2 < d1


@FAST
@given(diameters, densities, shape_factors, temperatures, pressures)
def test_relaxation_time_times_g_is_stokes_velocity(d, rho, chi, T, P) -> None:
    # Hinds (1999) eq. 5.4: V_TS = tau g.
    tau = particle.relaxation_time(d, rho, T, P, chi)
    v = particle.settling_velocity_stokes(d, rho, T, P, chi)
    assert math.isclose(tau * STANDARD_GRAVITY, v, rel_tol=1e-12)


@FAST
@given(diameters, densities, shape_factors, temperatures, pressures)
def test_settling_velocity_not_above_stokes(d, rho, chi, T, P) -> None:
    # The Schiller & Naumann factor 1 + 0.15 Re^0.687 >= 1 only adds drag.
    v_sn = particle.settling_velocity(d, rho, T, P, chi)
    v_st = particle.settling_velocity_stokes(d, rho, T, P, chi)
    assert 0.0 < v_sn <= v_st * (1 + 1e-12)


@FAST
@given(diameters, temperatures, pressures, shape_factors)
def test_diffusion_coefficient_falls_with_shape_factor(d, T, P, chi) -> None:
    # B = Cc / (3 pi mu d chi): D scales as 1/chi.
    ratio = particle.diffusion_coefficient(d, T, P, chi) / particle.diffusion_coefficient(d, T, P)
    assert math.isclose(ratio, 1.0 / chi, rel_tol=1e-12)


@FAST
@given(temperatures, st.floats(1.01, 3.0))
def test_air_viscosity_rises_with_temperature(T, k) -> None:
    # Gas viscosity rises with temperature (kinetic theory; Sutherland's law).
    assert gas.air_viscosity(min(k * T, 1900.0)) > gas.air_viscosity(T)


@FAST
@given(temperatures, pressures, ratios)
def test_mean_free_path_inverse_in_pressure(T, P, k) -> None:
    # lambda is proportional to 1/P at constant T (Willeke 1976).
    assert math.isclose(gas.mean_free_path(T, P) / gas.mean_free_path(T, k * P), k, rel_tol=1e-12)


@FAST
@given(diameters, times, densities, shape_factors, temperatures, pressures)
def test_settling_and_brownian_times_invert_distances(d, t, rho, chi, T, P) -> None:
    # brownian_time and settling_time invert rms_displacement and settling_distance.
    x_b = particle.rms_displacement(d, t, T, P, chi)
    x_s = particle.settling_distance(d, t, rho, T, P, chi)
    assert math.isclose(particle.brownian_time(d, x_b, T, P, chi), t, rel_tol=1e-10)
    assert math.isclose(particle.settling_time(d, x_s, rho, T, P, chi), t, rel_tol=1e-10)
