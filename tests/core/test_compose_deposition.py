"""The deposition composer and the aerosol it composes from (compose/aerosol, deposition)."""

from __future__ import annotations

import ast
import math
from pathlib import Path

import numpy as np
import pytest

import driftdose.compose
from driftdose.compose.aerosol import ModeSpec, aerosol_from_modes, aerosol_from_spectrum
from driftdose.compose.deposition import CURVE_POINTS, breathing_subject, compose_deposition
from driftdose.deposition import icrp66_curves
from driftdose.diameters import ParticleDescription
from driftdose.distribution import BinnedSpectrum
from driftdose.dose import deposited_dose

UNIT = ParticleDescription(1000.0, 1.0, "material")


def test_composers_never_import_the_api():
    for path in Path(driftdose.compose.__file__).parent.glob("*.py"):
        tree = ast.parse(path.read_text(encoding="utf-8"))
        for node in ast.walk(tree):
            if isinstance(node, ast.ImportFrom):
                name = ("." * node.level) + (node.module or "")
                assert not name.startswith("..api") and "driftdose.api" not in name, path
            elif isinstance(node, ast.Import):
                assert all("driftdose.api" not in a.name for a in node.names), path


def test_spectrum_density_is_bin_total_over_log_width():
    """dN/dln d of a binned spectrum: the bin's count over the natural-log width of its edges
    (the definition; common practice), zero outside, looked up by bisection."""
    d = np.geomspace(10e-9, 1e-6, 200)
    n = np.abs(np.sin(np.arange(200))) * 1e9 + 1.0
    spec = BinnedSpectrum(tuple(d), tuple(n), 1500.0)
    e = np.array(spec.edges)
    probe = np.geomspace(1e-9, 10e-6, 997)
    idx = np.searchsorted(e, probe, side="right") - 1
    inside = (idx >= 0) & (idx < len(d))
    expected = np.where(
        inside,
        n[np.clip(idx, 0, len(d) - 1)] / np.log(e[1:] / e[:-1])[np.clip(idx, 0, len(d) - 1)],
        0.0,
    )
    got = np.array([spec.density_per_ln_d(x) for x in probe])
    assert got == pytest.approx(expected, rel=1e-12, abs=0.0)
    mass = spec.density_per_ln_d(d[17], "mass")
    assert mass == pytest.approx(
        n[17] * 1500.0 * math.pi / 6 * d[17] ** 3 / math.log(e[18] / e[17])
    )


def test_overlay_is_the_distributions_own_density_scaled_to_one():
    d = tuple(np.geomspace(20e-9, 2e-6, 40))
    n = tuple(float(x) for x in np.linspace(1e8, 5e9, 40))
    aerosol = aerosol_from_spectrum(d, n, "volume_equivalent", UNIT)
    out = compose_deposition(aerosol, breathing_subject("reference_worker"), 8 * 3600.0)
    for w in ("number", "mass"):
        own = [aerosol.distribution.density_per_ln_d(x, w) for x in out.overlay_sizes]
        assert max(out.overlay[w]) == pytest.approx(1.0)
        assert list(out.overlay[w]) == pytest.approx([y / max(own) for y in own], rel=1e-12)


def test_lognormal_overlay_peaks_at_the_count_median():
    """dN/dln d of a lognormal by count peaks at its count median (the mode of a normal in
    ln d; Hinds 1999, ch. 4, common practice)."""
    mode = ModeSpec("number", 200e-9, "volume_equivalent", 1.8, 1e10)
    out = compose_deposition(
        aerosol_from_modes([mode], UNIT), breathing_subject("reference_worker"), 3600.0
    )
    sizes = out.overlay_sizes
    peak = sizes[max(range(len(sizes)), key=lambda i: out.overlay["number"][i])]
    step = math.log(sizes[1] / sizes[0])
    assert abs(math.log(peak / 200e-9)) <= step


def test_composed_dose_is_the_dose_model_called_directly():
    """The composer adds no arithmetic of its own to the dose (composition check)."""
    modes = [
        ModeSpec("number", 40e-9, "mobility", 1.7, 1.5e11),
        ModeSpec("mass", 5e-6, "aerodynamic", 2.2, 2e-6),
    ]
    desc = ParticleDescription(2600.0, 1.4, "material")
    aerosol = aerosol_from_modes(modes, desc)
    subject = breathing_subject("activity", "mixed", "heavy_exercise")
    out = compose_deposition(aerosol, subject, 4 * 3600.0, benchmark_mass=1e-6)
    direct = deposited_dose(aerosol.distribution, subject, 4 * 3600.0, benchmark_mass=1e-6)
    # the composer runs the model once over its curves' sizes and the modes' grids together:
    # the aerodynamic diameters' Newton solves start from other neighbours there, so the
    # numbers agree within those solves' precision (about 1e-14), not to the last bit
    for got, want in ((out.dose.doses, direct.doses), (out.dose.fractions, direct.fractions)):
        assert got.keys() == want.keys()
        for region, by_weight in want.items():
            assert got[region] == pytest.approx(by_weight, rel=1e-12, abs=0)
    assert [m.entered for m in out.modes] == modes
    assert out.modes[1].mmad == pytest.approx(5e-6, rel=1e-9)  # entered as an MMAD
    ratio = direct.benchmark["mass"]
    assert ratio > 2.0  # the mass mode alone is twice the benchmark
    assert any(f"{ratio:.3g} times the benchmark" in w for w in out.warnings)
    assert all(0.0 <= y <= 1.0 for ys in out.fractions.values() for y in ys)


def test_custom_mouth_breathing_is_warned_of():
    aerosol = aerosol_from_modes([ModeSpec("number", 1e-6, "volume_equivalent", 2.0, 1e9)], UNIT)
    nose = breathing_subject("custom", tidal_volume=1e-3, frequency=0.25, nasal_fraction=1.0)
    mouth = breathing_subject("custom", tidal_volume=1e-3, frequency=0.25, nasal_fraction=0.4)
    said = "breathed through the mouth"
    assert not any(
        said in w for w in compose_deposition(aerosol, nose, 3600.0, custom_breathing=True).warnings
    )
    assert any(
        said in w
        for w in compose_deposition(aerosol, mouth, 3600.0, custom_breathing=True).warnings
    )


@pytest.mark.parametrize(
    ("density", "chi", "route"),
    [(1000.0, 1.0, "mixed"), (3000.0, 1.5, "mouth_breather"), (300.0, 2.0, "nose")],
)
def test_deposition_curves_drawn_on_fewer_sizes_look_the_same(density, chi, route):
    """The chart joins the curves' sizes by straight lines on a logarithmic size axis; drawn so,
    every region's curve stays within 1e-3 of the model at 1201 sizes in between (a third of
    a pixel of a 0–1 axis 300 pixels high: our drawing criterion, not a published value)."""
    desc = ParticleDescription(density, chi, "material")
    mode = ModeSpec("number", 200e-9, "volume_equivalent", 2.0, 1e10)
    out = compose_deposition(
        aerosol_from_modes([mode], desc), breathing_subject("reference_worker", route), 3600.0
    )
    assert len(out.sizes) == CURVE_POINTS
    # every other size of the 241 the curves had before
    assert out.sizes == pytest.approx(np.geomspace(1e-9, 100e-6, 241)[::2], rel=1e-12)
    fine = np.geomspace(1e-9, 100e-6, 1201)
    model = icrp66_curves(list(fine), density, chi, breathing_subject("reference_worker", route))
    for region, drawn in out.fractions.items():
        shown = np.interp(np.log(fine), np.log(out.sizes), drawn)
        assert np.max(np.abs(shown - np.clip(model[region], 0.0, 1.0))) < 1e-3, region


def test_fractions_limited_to_0_1_as_the_element_wise_rule():
    from driftdose.compose.deposition import _within_0_1

    def rule(ys):
        return tuple((y if y < 1.0 else 1.0) if y > 0.0 else 0.0 for y in ys)

    for ys in (
        [0.3, 0.5, 0.999],
        [0.0, 0.5],
        [-0.0, 0.5],
        [1e-300, 1.0],
        [0.2, 1.0000000000000002],
        [-1e-17, 0.4],
        [],
    ):
        got = _within_0_1(ys)
        assert got == rule(ys)
        assert [math.copysign(1.0, y) for y in got] == [math.copysign(1.0, y) for y in rule(ys)]


@pytest.mark.parametrize("model", ["icrp66", "simplified"])
def test_the_model_runs_once_for_the_curves_and_the_dose(model, monkeypatch):
    from dataclasses import replace

    from driftdose.compose.deposition import _CURVE_SIZES
    from driftdose.deposition import models
    from driftdose.dose import deposition_curves

    modes = [
        ModeSpec("number", 40e-9, "volume_equivalent", 1.8, 1e11),
        ModeSpec("mass", 5e-6, "volume_equivalent", 2.5, 1e-6),
    ]
    aerosol = aerosol_from_modes(modes, ParticleDescription(3000.0, 1.5, "material"))
    subject = breathing_subject("reference_worker", "mouth_breather")
    entry = models.DEPOSITION_MODELS[model]
    calls = []
    counted = replace(entry, curves=lambda *a: calls.append(len(a[0])) or entry.curves(*a))
    monkeypatch.setitem(models.DEPOSITION_MODELS, model, counted)
    models._curve_cache.clear()
    out = compose_deposition(aerosol, subject, 8 * 3600.0, model=model)
    grids = [m.grid() for m in aerosol.distribution.modes]
    union = set(_CURVE_SIZES).union(*grids)
    assert calls == [len(union)]  # once, every size once
    assert len(union) < len(_CURVE_SIZES) + sum(len(g) for g in grids) - 60  # shared sizes
    # the same numbers as the curves evaluated on their own (within the solves' precision)
    alone = deposition_curves(model, list(_CURVE_SIZES), 3000.0, 1.5, subject)
    for region, ys in out.fractions.items():
        assert list(ys) == pytest.approx([min(max(y, 0.0), 1.0) for y in alone[region]], rel=1e-12)
    direct = deposited_dose(aerosol.distribution, subject, 8 * 3600.0, model)
    for region, by_weight in direct.fractions.items():
        assert out.dose.fractions[region] == pytest.approx(by_weight, rel=1e-12, abs=0)
    # a second composition of another density: evaluated again, not taken from the first
    calls.clear()
    other = aerosol_from_modes(modes, ParticleDescription(2000.0, 1.5, "material"))
    again = compose_deposition(other, subject, 8 * 3600.0, model=model)
    assert len(calls) == 1
    assert again.dose.fractions != out.dose.fractions
