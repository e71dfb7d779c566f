"""Composers of the sampling and motion calculations: SI in, frozen dataclasses out.

Checks against definitions and the physics modules themselves (independent of the api's
wording): the ideal ISO 7708 respirable pre-separator matches the respirable target exactly,
a lognormal curve crosses 50 % at its cut size (its definition), and the motion composer
returns the numbers of :mod:`driftdose.particle`.
"""

from __future__ import annotations

import dataclasses
import math
from pathlib import Path

import pytest

from driftdose import conventions, particle
from driftdose.compose import motion as compose_motion_module
from driftdose.compose import sampling as compose_sampling_module
from driftdose.compose.motion import compose_motion
from driftdose.compose.sampling import (
    TARGETS,
    compose_sampling,
    crossings,
    departure,
    pass_bands,
    target_curve,
)
from driftdose.transport import build_stage


def test_composers_never_import_the_api() -> None:
    for module in (compose_sampling_module, compose_motion_module):
        text = Path(module.__file__).read_text(encoding="utf-8")
        assert ".api" not in text.replace(":mod:`driftdose.api`", "")


def test_sampling_result_is_frozen_and_ideal_respirable_stage_meets_its_target() -> None:
    # A pre-separator with the ideal ISO 7708 respirable curve, unit density: the chain is
    # the convention itself (ISO 7708:1995), so its departure from that target is zero.
    stage = build_stage(
        "cyclone", {"d50": 4e-6, "curve_gsd": 1.5, "curve": "iso7708_respirable"}, 0.0, "ideal"
    )
    r = compose_sampling([stage], 1000.0, 293.15, 101325.0, target="respirable")
    assert dataclasses.is_dataclass(r)
    with pytest.raises(dataclasses.FrozenInstanceError):
        r.overall = []  # type: ignore[misc]
    assert r.target is not None and r.target.departure is not None
    assert r.target.departure.largest == pytest.approx(0.0, abs=1e-12)
    for x, y in zip(r.aerodynamic_diameters, r.target.values, strict=True):
        assert y == pytest.approx(conventions.respirable(x), abs=1e-15)
    # ISO 7708: 50 % of total airborne particles at 4 um; the chain's 50 % size is there
    # (linear interpolation between grid sizes 2 % apart; tolerance 0.5 %).
    assert r.stages[0].half_penetration_sizes == [pytest.approx(4e-6, rel=5e-3)]
    assert r.stages[0].name == "ideal"  # no names given: the stage's own


def test_lognormal_cut_is_where_the_chain_crosses_half() -> None:
    # Definition of the lognormal curve: P(d50) = 0.5 (common practice).
    stage = build_stage("cyclone", {"d50": 2.5e-6, "curve_gsd": 1.3}, 0.0, "cut")
    r = compose_sampling([stage], 1000.0, 293.15, 101325.0, names=[""])
    assert r.stages[0].name == ""
    assert r.stages[0].half_penetration_sizes == [pytest.approx(2.5e-6, rel=1e-3)]
    assert r.pass_bands == [(None, pytest.approx(2.5e-6, rel=1e-3))]
    assert r.target is None and r.spectrum is None


def test_crossings_and_bands_on_a_known_curve() -> None:
    xs = [1.0, 10.0, 100.0, 1000.0]
    ys = [0.0, 1.0, 1.0, 0.0]
    assert [round(x, 9) for x in crossings(xs, ys, 0.5)] == [
        round(math.sqrt(10), 9),
        round(math.sqrt(1e5), 9),
    ]
    assert pass_bands(xs, ys) == [(pytest.approx(math.sqrt(10)), pytest.approx(math.sqrt(1e5)))]
    assert pass_bands(xs, [0.1] * 4) == []
    assert pass_bands(xs, [0.9] * 4) == [(None, None)]


def test_departure_counts_only_given_sizes_in_range() -> None:
    d = departure([1e-7, 1e-6, 1e-5], [0.5, 0.5, 0.5], [None, 0.3, 0.6], (1e-7, 1e-5))
    assert d is not None
    assert d.largest == pytest.approx(0.2) and d.at == 1e-6
    assert d.mean == pytest.approx(0.15)
    assert departure([1e-9], [0.5], [None]) is None


def test_target_keys_and_unknown_target() -> None:
    assert set(conventions.CONVENTIONS) <= set(TARGETS)
    ys = target_curve("icrp66_total", [1e-9, 1e-6, 1e-3]).values
    assert ys[2] is None and all(0.0 <= y <= 1.0 for y in ys[:2])
    with pytest.raises(ValueError, match="valid"):
        target_curve("nasal", [1e-6])


def test_motion_composer_returns_particle_numbers() -> None:
    r = compose_motion(1e-6, False, 1000.0, 1.0, 293.15, 101325.0, 1.0, 2e-4, 1.0)
    with pytest.raises(dataclasses.FrozenInstanceError):
        r.diameter = 0.0  # type: ignore[misc]
    assert r.diffusion_coefficient == particle.diffusion_coefficient(1e-6)
    assert r.settling_velocity == particle.settling_velocity(1e-6, 1000.0)
    assert r.rms_displacement == pytest.approx(math.sqrt(2 * r.diffusion_coefficient))
    assert len(r.curve_diameters) == len(r.brownian) == len(r.settling) == 241
    aero = compose_motion(1e-6, True, 4000.0, 1.0, 293.15, 101325.0, 1.0, 2e-4, 1.0)
    assert aero.aerodynamic_diameter == 1e-6
    assert particle.aerodynamic_diameter(aero.diameter, 4000.0) == pytest.approx(1e-6, rel=1e-12)
    with pytest.raises(ValueError, match=r"0\.5 nm"):
        compose_motion(0.6e-9, True, 20000.0, 1.0, 293.15, 101325.0, 1.0, 2e-4, 1.0)
