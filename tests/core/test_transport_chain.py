"""Wiring of the sampling chain: composition, reports, input errors, spectrum correction.

The numbers are checked at the function level; here only that the chain dispatches them
correctly (no reference values).
"""

from __future__ import annotations

import math

import pytest

from driftdose.transport import (
    Bend,
    Chain,
    Cyclone,
    Impactor,
    ScreenStack,
    StageInputError,
    Tube,
    bend_penetration,
    correct_spectrum,
    cyclone_penetration,
    impactor_penetration,
    screen_penetration,
    tube_diffusion_penetration,
    tube_settling_penetration,
)

Q = 1.5e-3 / 60


def make_chain() -> Chain:
    return Chain(
        (
            Tube(3.0, 4e-3, Q),
            Bend(4e-3, Q, math.pi / 2, 0.05),
            Cyclone(4e-6, 1.5),
            Impactor(1e-3, Q),
            ScreenStack(50e-6, 0.3, 100e-6, Q, 25e-3, 5),
        )
    )


def test_chain_evaluate_overall_is_product_of_stages() -> None:
    sizes = [3e-9, 30e-9, 300e-9, 3e-6, 30e-6]
    result = make_chain().evaluate(sizes, 1500.0)
    assert result.stage_names == ["Straight tube", "Bend", "Cyclone", "Impactor", "Wire screens"]
    for i in range(len(sizes)):
        product = math.prod(row[i] for row in result.stage_penetrations)
        assert result.overall[i] == pytest.approx(product, rel=1e-12)
        assert 0.0 <= result.overall[i] <= 1.0


def test_chain_stages_call_their_model_functions() -> None:
    d, rho, T, P = 2e-6, 1500.0, 293.15, 101325.0
    tube, bend, cyc, imp, scr = make_chain().stages
    expected_tube = tube_diffusion_penetration(d, 3.0, Q, T, P) * tube_settling_penetration(
        d, 3.0, Q, 4e-3, rho, 0.0, T, P
    )
    assert tube.penetration(d, rho, T, P) == pytest.approx(expected_tube, rel=1e-12)
    assert bend.penetration(d, rho, T, P) == bend_penetration(d, Q, 4e-3, math.pi / 2, rho)
    assert cyc.penetration(d, rho, T, P) == cyclone_penetration(d, 4e-6, 1.5, rho)
    assert imp.penetration(d, rho, T, P) == impactor_penetration(d, 1e-3, Q, 1, rho)
    u0 = Q / (math.pi * 25e-3**2 / 4)
    assert scr.penetration(d, rho, T, P) == pytest.approx(
        screen_penetration(d, 50e-6, 0.3, 100e-6, u0, 5, T, P, rho), rel=1e-12
    )


def test_tube_mechanisms_can_be_switched_off() -> None:
    d = 5e-6
    both = Tube(3.0, 4e-3, Q).penetration(d, 1000.0, 293.15, 101325.0)
    no_settling = Tube(3.0, 4e-3, Q, settling=False).penetration(d, 1000.0, 293.15, 101325.0)
    neither = Tube(3.0, 4e-3, Q, diffusion=False, settling=False)
    assert no_settling > both
    assert neither.penetration(d, 1000.0, 293.15, 101325.0) == 1.0


@pytest.mark.parametrize(
    ("factory", "parameter"),
    [
        (lambda: Tube(0.0, 4e-3, Q), "length"),
        (lambda: Tube(-1.0, 4e-3, Q), "length"),
        (lambda: Tube(1.0, 4e-3, 0.0), "flow"),
        (lambda: Tube(1.0, 4e-3, Q, inclination=2.0), "inclination"),
        (lambda: Bend(4e-3, Q, math.pi / 2, 1.5e-3), "curvature_radius"),
        (lambda: Bend(4e-3, Q, 0.0, 0.05), "bend_angle"),
        (lambda: Cyclone(4e-6, 1.0), "curve_gsd"),
        (lambda: Cyclone(-1.0, 1.5), "d50"),
        (lambda: Impactor(1e-3, Q, jet="rectangular"), "slit_length"),
        (lambda: Impactor(1e-3, Q, jet="rectangular", slit_length=0.5e-3), "slit_length"),
        (lambda: Impactor(1e-3, Q, n_nozzles=0), "n_nozzles"),
        (lambda: ScreenStack(50e-6, 0.0, 100e-6, Q, 25e-3), "solidity"),
        (lambda: ScreenStack(50e-6, 1.0, 100e-6, Q, 25e-3), "solidity"),
        (lambda: ScreenStack(50e-6, 0.3, 20e-6, Q, 25e-3), "thickness"),
        (lambda: ScreenStack(-5e-6, 0.3, 20e-6, Q, 25e-3), "wire_diameter"),
    ],
)
def test_stage_input_errors_name_the_parameter(factory, parameter) -> None:
    with pytest.raises(StageInputError) as info:
        factory()
    assert info.value.parameter == parameter
    assert info.value.message


def test_near_sonic_flow_is_refused() -> None:
    # 100 L/min through one 0.5 mm nozzle: U = 8500 m/s.
    stage = Impactor(0.5e-3, 100e-3 / 60)
    with pytest.raises(StageInputError) as info:
        stage.report(293.15, 101325.0)
    assert info.value.parameter == "flow"
    assert "speed of sound" in info.value.message


def test_reports_warn_in_transition_and_outside_ranges() -> None:
    nu = 1.81e-5 / 1.204
    dt = 10e-3
    flow = 3000 * nu * math.pi * dt / 4  # Re about 3000
    report = Tube(1.0, dt, flow).report(293.15, 101325.0)
    assert report.regime == "transition"
    text = " ".join(report.warnings)
    assert "transition" in text and "interpolated" in text
    assert "Gormley & Kennedy" in text and "Friedlander" in text
    assert {"gormley_kennedy1949", "friedlander1977"} <= set(report.sources)
    slow = Impactor(3e-3, 0.5e-3 / 60).report(293.15, 101325.0)  # jet Re about 240
    assert any("500 to 3000" in w for w in slow.warnings)


def test_correct_spectrum_divides_and_flags() -> None:
    chain = make_chain()
    sizes = [5e-9, 50e-9, 500e-9, 5e-6]
    measured = [100.0, 200.0, 300.0, 400.0]
    out = correct_spectrum(chain, sizes, measured, 1000.0)
    for d, m, p, c, flag in zip(
        sizes, measured, out.penetration, out.corrected, out.unreliable, strict=True
    ):
        assert p == pytest.approx(chain.penetration(d, 1000.0), rel=1e-12)
        assert flag == (p < 0.5)
        if p > 1e-6:
            assert c == pytest.approx(m / p, rel=1e-12)
        else:
            assert c is None
    assert out.unreliable[-1]  # 5 um is cut by the cyclone and impactor
    with pytest.raises(ValueError, match="same length"):
        correct_spectrum(chain, sizes, measured[:2])


def test_stage_kinds_registry_builds_every_kind() -> None:
    # Each registry entry builds a stage of its own class and kind from named SI parameters.
    from driftdose.transport import STAGE_KINDS, build_stage

    parameters = {
        "tube": {"length": 1.0, "tube_diameter": 4e-3, "inclination": 0.3},
        "bend": {"tube_diameter": 4e-3, "bend_angle": math.pi / 2, "curvature_radius": 0.05},
        "cyclone": {"d50": 4e-6, "curve_gsd": 1.5},
        "impactor": {"nozzle_diameter": 1e-3, "efficiency_width": 1.2},
        "screens": {
            "wire_diameter": 5e-5,
            "solidity": 0.3,
            "thickness": 1e-4,
            "screen_diameter": 0.025,
        },
    }
    assert list(STAGE_KINDS) == list(parameters)
    for key, entry in STAGE_KINDS.items():
        stage = build_stage(key, parameters[key], 2.5e-5, f"my {key}")
        assert isinstance(stage, entry.stage)
        assert stage.kind == key and stage.name == f"my {key}"
        assert entry.uses_flow == hasattr(stage, "flow")
    assert build_stage("tube", parameters["tube"], 2.5e-5, "t").inclination == 0.3
    with pytest.raises(ValueError, match="valid: tube, bend"):
        build_stage("pipe", {}, 1e-5, "x")
