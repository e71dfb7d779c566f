"""Each stage's curve on a size grid equals its penetration computed size by size.

The curves of a chain are computed from the particle's properties taken once per size grid
(``driftdose.particle.particle_grid``); the one-size path (reference sizes, sizes typed, a
measured spectrum) computes them again per size. The two must give the same numbers: the
same formulas in the same order, so equal to the last bit but for the aerodynamic diameters,
which the grid solves from neighbouring sizes (within 1e-13, tests/core/test_numerics.py).
No published values here: the models themselves are checked in the test_transport_* files.
"""

from __future__ import annotations

import math

import pytest

from driftdose import particle
from driftdose._numerics import logspace
from driftdose.transport import Bend, Chain, Cyclone, Impactor, ScreenStack, Tube, correct_spectrum

SIZES = logspace(1e-9, 100e-6, 241)
LPM = 1e-3 / 60.0

STAGES = [
    pytest.param(Tube(10.0, 4e-3, 1.5 * LPM), id="tube-laminar"),
    pytest.param(Tube(3.0, 4e-3, 20 * LPM, inclination=0.4), id="tube-transition-inclined"),
    pytest.param(Tube(3.0, 10e-3, 300 * LPM), id="tube-turbulent"),
    pytest.param(Tube(1.0, 4e-3, 2 * LPM, settling=False), id="tube-diffusion-only"),
    pytest.param(Tube(1.0, 4e-3, 2 * LPM, diffusion=False, regime="turbulent"), id="tube-settling"),
    pytest.param(Bend(4e-3, 1.5 * LPM), id="bend-laminar"),
    pytest.param(Bend(4e-3, 20 * LPM, math.pi), id="bend-transition"),
    pytest.param(Cyclone(4e-6, 1.5), id="cyclone-lognormal"),
    pytest.param(Cyclone(curve="iso7708_respirable"), id="cyclone-respirable"),
    pytest.param(Impactor(0.5e-3, 2 * LPM, n_nozzles=3), id="impactor-round"),
    pytest.param(
        Impactor(0.3e-3, 2 * LPM, jet="rectangular", slit_length=5e-3, efficiency_width=1.4),
        id="impactor-slit",
    ),
    pytest.param(ScreenStack(50e-6, 0.3, 100e-6, 1.5 * LPM, 25e-3, 10), id="screens"),
    pytest.param(
        ScreenStack(30e-6, 0.25, 60e-6, 4 * LPM, 10e-3, 3, impaction=True), id="screens-impaction"
    ),
]


@pytest.mark.parametrize("stage", STAGES)
@pytest.mark.parametrize(("rho", "T", "P"), [(1000.0, 293.15, 101325.0), (2500.0, 263.15, 80e3)])
def test_stage_curve_equals_penetration_size_by_size(stage, rho, T, P) -> None:
    grid = particle.particle_grid(SIZES, rho, T, P)
    curve = stage.penetrations(grid)
    one_by_one = [stage.penetration(d, rho, T, P) for d in SIZES]
    assert len(curve) == len(SIZES)
    if isinstance(stage, Cyclone) and rho != 1000.0:
        assert curve == pytest.approx(one_by_one, rel=1e-12, abs=1e-15)
    else:
        assert curve == one_by_one


def test_chain_evaluate_matches_its_own_penetration() -> None:
    chain = Chain(tuple(p.values[0] for p in STAGES[:3] + STAGES[5:6] + STAGES[11:12]))
    result = chain.evaluate(SIZES, 1800.0)
    for d, overall in zip(SIZES, result.overall, strict=True):
        assert overall == pytest.approx(chain.penetration(d, 1800.0), rel=1e-14, abs=1e-300)
    # a second evaluation with another flow reuses the particle properties and still agrees
    faster = Chain((Tube(10.0, 4e-3, 3 * LPM),))
    again = faster.evaluate(SIZES, 1800.0)
    assert again.overall == [faster.penetration(d, 1800.0) for d in SIZES]


def test_spectrum_correction_uses_the_chains_penetration_at_each_bin() -> None:
    chain = Chain((Tube(10.0, 4e-3, 1.5 * LPM), Bend(4e-3, 1.5 * LPM)))
    bins = [20e-9 * 1.3**i for i in range(30)]
    counts = [1e6 * (i + 1) for i in range(30)]
    corrected = correct_spectrum(chain, bins, counts, 1500.0)
    assert corrected.penetration == [chain.penetration(d, 1500.0) for d in bins]
    assert corrected.corrected == [
        c / p if p > 1e-6 else None for c, p in zip(counts, corrected.penetration, strict=True)
    ]
