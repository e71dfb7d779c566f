"""Deposited dose per region: bookkeeping against the definitions and ICRP reference data."""

from __future__ import annotations

import math
from dataclasses import replace

import pytest

from driftdose.deposition import (
    REFERENCE_WORKER,
    Subject,
    activity,
    icrp66_curves,
    icrp66_lognormal,
    models,
    reference_worker,
)
from driftdose.deposition.models import deposition_curves
from driftdose.distribution import (
    GRID_LATTICE_STEP,
    BinnedSpectrum,
    LognormalMode,
    Multimodal,
    integrate,
)
from driftdose.dose import deposited_dose


def test_deposited_dose_reference_worker_shift_volume():
    # ICRP 66 / ICRP 68: 9.6 m3 of air in the reference worker's 8-h shift
    r = deposited_dose(LognormalMode(50e-9, 1.8, 1e10), REFERENCE_WORKER, 8 * 3600.0)
    assert r.inhaled_volume == pytest.approx(9.6, rel=1e-9)
    assert r.ventilation * 3600 == pytest.approx(1.2, rel=1e-9)


def test_deposited_dose_is_concentration_times_volume_times_fraction():
    mode = LognormalMode(80e-9, 2.0, 2e10, 1500.0, 1.2)
    r = deposited_dose(mode, REFERENCE_WORKER, 3 * 3600.0)

    def f(d):
        return icrp66_curves([d], 1500.0, 1.2)["AI"][0]

    expected = integrate(f, mode, "number") * r.inhaled_volume
    assert r.doses["AI"]["number"] == pytest.approx(expected, rel=1e-9)
    assert r.rates["AI"]["number"] * 3 * 3600.0 == pytest.approx(expected, rel=1e-9)


def test_deposited_dose_mass_fractions_match_icrp66_lognormal_5um():
    # the dose path (volume-equivalent grid) agrees with the AMAD path (aerodynamic grid)
    # for the ICRP worker aerosol; differences come from slip at the median conversion only
    from driftdose import particle

    mmd = particle.volume_equivalent_diameter(5e-6, 3000.0, 1.5)
    mode = LognormalMode.from_mass(mmd, 2.5, 1e-6, 3000.0, 1.5)
    r = deposited_dose(mode, REFERENCE_WORKER, 8 * 3600.0)
    ref = icrp66_lognormal(5e-6, 2.5, 3000.0, 1.5)
    for k in ("ET1", "ET2", "BB", "bb", "AI", "total"):
        assert r.fractions[k]["mass"] == pytest.approx(ref[k], rel=0.01)


def test_deposited_dose_scales_with_duration():
    m = LognormalMode(50e-9, 1.8, 1e10)
    a = deposited_dose(m, REFERENCE_WORKER, 3600.0)
    b = deposited_dose(m, REFERENCE_WORKER, 4 * 3600.0)
    assert b.doses["total"]["mass"] == pytest.approx(4 * a.doses["total"]["mass"], rel=1e-12)


def test_deposited_dose_regions_sum_to_total():
    m = Multimodal((LognormalMode(30e-9, 1.6, 1e11), LognormalMode(2e-6, 2.0, 1e7, 2500.0)))
    r = deposited_dose(m, Subject.single(activity("heavy_exercise")), 8 * 3600.0)
    for w in ("number", "surface", "mass"):
        parts = sum(r.doses[k][w] for k in ("ET1", "ET2", "BB", "bb", "AI"))
        assert parts == pytest.approx(r.doses["total"][w], rel=1e-12)


def test_deposited_dose_binned_spectrum():
    spec = BinnedSpectrum((20e-9, 40e-9, 80e-9), (1e9, 2e9, 1e9))
    r = deposited_dose(spec, REFERENCE_WORKER, 8 * 3600.0)
    c = icrp66_curves(list(spec.diameters))
    expected = sum(n * f for n, f in zip(spec.numbers, c["AI"], strict=True)) * 9.6
    assert r.doses["AI"]["number"] == pytest.approx(expected, rel=1e-12)


def test_deposited_dose_simplified_model_regions():
    r = deposited_dose(LognormalMode(50e-9, 1.8, 1e10), REFERENCE_WORKER, 3600.0, "simplified")
    assert r.regions == ("head_airways", "tracheobronchial", "alveolar", "total")


def test_deposited_dose_benchmark_ratio():
    m = LognormalMode.from_mass(3e-6, 2.0, 2e-6, 2000.0)  # 2 mg/m3
    r = deposited_dose(m, REFERENCE_WORKER, 3600.0, benchmark_mass=1e-6)
    assert r.benchmark == {"mass": pytest.approx(2.0)}


@pytest.mark.parametrize("hours", [0.0, -1.0, 24.01, math.inf])
def test_deposited_dose_rejects_duration_outside_0_24h(hours):
    with pytest.raises(ValueError, match="24 h"):
        deposited_dose(LognormalMode(50e-9, 1.8, 1e10), REFERENCE_WORKER, hours * 3600.0)


@pytest.mark.parametrize(
    ("cmd", "gsd", "density", "shape_factor"),
    [
        (2e-9, 1.2, 1000.0, 1.0),
        (20e-9, 1.5, 1000.0, 1.0),
        (40e-9, 1.8, 3000.0, 1.5),
        (200e-9, 2.0, 1000.0, 1.0),
        (1e-6, 2.5, 3000.0, 1.5),
        (3e-6, 3.0, 1000.0, 1.0),
        (10e-6, 1.3, 3000.0, 1.5),
        (30e-6, 2.2, 1000.0, 1.0),
        (1.05e-9, 1.05, 1000.0, 1.0),
        (100e-9, 5.0, 1000.0, 1.0),
        (1e-6, 5.0, 8000.0, 1.0),
        (8e-6, 3.5, 2000.0, 1.2),
        (20e-6, 5.0, 1000.0, 1.0),
    ],
)
@pytest.mark.parametrize("route", ["nose", "mouth_breather"])
def test_deposited_fractions_default_step_match_a_fine_grid(cmd, gsd, density, shape_factor, route):
    # numerical check of the quadrature: the default ln-d step (ln GSD / 3, at most 0.2)
    # against a grid of step 0.0025 (up to 80x finer); fractions above 1e-4 agree to 1e-8
    # (measured: below 2e-10; a largest step of 0.25 gave 7e-9, 0.3 gave 1e-7)
    mode = LognormalMode(cmd, gsd, 1e10, density=density, shape_factor=shape_factor)
    subject = reference_worker(route)
    coarse = deposited_dose(mode, subject, 8 * 3600.0)
    fine = deposited_dose(mode, subject, 8 * 3600.0, step=0.0025)
    compared = 0
    for region, by_weight in fine.fractions.items():
        for weight, value in by_weight.items():
            if value > 1e-4:
                assert coarse.fractions[region][weight] == pytest.approx(value, rel=0, abs=1e-8)
                compared += 1
    assert compared >= 6


# ---------------------------------------------------------------------------------------------
# Curve cache of deposition_curves: the same numbers as a fresh evaluation, never shared lists
# ---------------------------------------------------------------------------------------------


@pytest.mark.parametrize("model", ["icrp66", "simplified"])
def test_deposition_curves_cache_returns_the_models_own_numbers(model, monkeypatch):
    sizes = [1e-9 * 10 ** (i / 8) for i in range(41)]
    worker = reference_worker("mouth_breather")
    first = deposition_curves(model, sizes, 3000.0, 1.5, worker)
    first["total"][0] = -1.0  # a caller changing its lists must not change the cache
    calls = []
    entry = models.DEPOSITION_MODELS[model]
    counted = replace(entry, curves=lambda *a: calls.append(a) or entry.curves(*a))
    monkeypatch.setitem(models.DEPOSITION_MODELS, model, counted)
    again = deposition_curves(model, sizes, 3000.0, 1.5, worker)
    assert calls == []  # kept: the model was not evaluated again
    models._curve_cache.clear()
    fresh = deposition_curves(model, sizes, 3000.0, 1.5, worker)
    assert len(calls) == 1
    assert again == fresh  # identical numbers, bit for bit
    assert again["total"][0] >= 0.0


def test_deposition_curves_cache_keys_on_every_argument():
    sizes = [1e-8, 1e-7, 1e-6, 1e-5]
    worker = reference_worker("mouth_breather")
    base = deposition_curves("icrp66", sizes, 3000.0, 1.5, worker)
    for other in (
        deposition_curves("icrp66", sizes, 2000.0, 1.5, worker),
        deposition_curves("icrp66", sizes, 3000.0, 1.2, worker),
        deposition_curves("icrp66", sizes, 3000.0, 1.5, reference_worker("nose")),
        deposition_curves("icrp66", sizes, 3000.0, 1.5, worker, "mobility"),
        deposition_curves("icrp66", [*sizes[:-1], 2e-5], 3000.0, 1.5, worker),
    ):
        assert other["total"] != base["total"]
    assert deposition_curves("icrp66", sizes, 3000.0, 1.5, worker) == base


def test_deposition_curves_cache_is_bounded():
    worker = reference_worker("mouth_breather")
    for i in range(models.CURVE_CACHE_SIZE + 10):
        deposition_curves("simplified", [1e-7, 1e-6], 1000.0 + i, 1.0, worker)
    assert len(models._curve_cache) == models.CURVE_CACHE_SIZE


def test_grid_nodes_lie_on_one_lattice_whatever_the_median():
    # nodes at ln d = k h: a mode whose median moves keeps the nodes both grids cover, so
    # per-size terms computed for one (the diffusion terms of ICRP 66) serve the other
    a = LognormalMode(1.0e-6, 2.5, 1e9)
    b = LognormalMode(1.3e-6, 2.5, 1e9)
    h = a.step()
    assert h == 2.0 * GRID_LATTICE_STEP  # ln GSD / 3 = 0.31, limited to 0.2: 0.192
    for d in a.grid():
        k = math.log(d) / h
        assert k == pytest.approx(round(k), abs=1e-9)
    shared = set(a.grid()) & set(b.grid())
    assert len(shared) >= len(a.grid()) - 3
    assert [d for d, _ in a.quadrature("mass")] == a.grid()


def test_grid_covers_seven_standard_deviations():
    mode = LognormalMode(50e-9, 1.8, 1e10)
    s = mode.ln_gsd
    grid = mode.grid()
    assert math.log(grid[0]) <= math.log(50e-9) - 7.0 * s
    assert math.log(grid[-1]) >= math.log(mode.median("mass")) + 7.0 * s
    assert math.log(grid[0]) > math.log(50e-9) - 7.0 * s - mode.step()


@pytest.mark.parametrize("gsd", [1.05, 1.2, 1.33, 1.5, 1.8, 2.5, 5.0])
def test_default_step_is_a_power_of_two_of_the_lattice_and_never_coarser(gsd):
    # the step is the curves' lattice step times a power of 2, never above the rule
    # min(ln GSD / 3, 0.2) whose accuracy the fine-grid test above checks
    mode = LognormalMode(200e-9, gsd, 1e9)
    h = mode.step()
    assert h <= min(math.log(gsd) / 3.0, 0.2)
    assert h > 0.5 * min(math.log(gsd) / 3.0, 0.2)
    ratio = h / GRID_LATTICE_STEP
    assert math.log2(ratio) == round(math.log2(ratio))
    # nodes on the lattice are the same floats as the deposition curves' sizes
    from driftdose.compose.deposition import _CURVE_SIZES

    shared = set(mode.grid()) & set(_CURVE_SIZES)
    inside = [d for d in mode.grid() if 1.000001e-9 < d < 0.999999e-4]  # ends: exact 1e-9, 1e-4
    if ratio >= 1.0:
        assert shared == set(inside)
    else:
        assert len(shared) >= len(inside) * ratio - 2
