"""Boundary tests of the ``deposition`` calculation: replies, units, validation messages."""

from __future__ import annotations

import json

import pytest

from driftdose.api import handle, handle_json
from driftdose.api.deposition import DEMOS, demo_scenarios
from driftdose.compose.deposition import CURVE_POINTS
from driftdose.deposition import icrp66_lognormal
from driftdose.export import curve_x


def _run(**inputs):
    return handle({"kind": "deposition", "inputs": inputs})


def _mode(basis="count", median=(50, "nm"), gsd=1.8, conc=(10000, "1/cm3")):
    return {
        "basis": basis,
        "median": {"value": median[0], "unit": median[1]},
        "gsd": gsd,
        "concentration": {"value": conc[0], "unit": conc[1]},
    }


def _error(reply):
    assert reply["ok"] is False, reply
    return reply["errors"][0]


def test_deposition_defaults_ok():
    r = _run()
    assert r["ok"], r
    assert set(r["curves"]["deposition"]) == {"ET1", "ET2", "BB", "bb", "AI", "total"}
    curves = r["curves"]
    # 24 sizes per decade from 1 nm to 100 um (tests/core/test_compose_deposition.py: drawn
    # within 1e-3 of the model)
    assert len(curve_x(curves, curves["deposition"]["AI"])) == CURVE_POINTS == 121
    assert r["results"]["inhaled_volume"]["value"] == pytest.approx(9.6)
    keys = [s["key"] for s in r["sources"]]
    assert "icrp66" in keys and "icrp68" in keys


def test_deposition_reply_is_json_and_finite():
    text = handle_json(json.dumps({"kind": "deposition", "inputs": {}}))
    assert json.loads(text)["ok"] is True


def test_deposition_units_in_results():
    r = _run()
    res = r["results"]
    assert res["dose_AI_mass"]["unit"] == "ug"  # unit codes; labels come from describe()
    assert res["rate_AI_number"]["unit"] == "particles/h"
    assert res["dose_total_surface"]["unit"] == "mm2"
    assert res["dose_AI_mass"]["si_unit"] == "kg"
    assert res["number_concentration"]["value"] == pytest.approx(10000)


def test_deposition_mass_mode_matches_core_icrp66_lognormal():
    # one mass mode of 5 um MMAD, density 3, shape 1.5 = the ICRP worker aerosol
    r = _run(
        modes=[_mode("mass", (5, "um"), 2.5, (1, "mg/m3"))],
        particle_density={"value": 3, "unit": "g/cm3"},
        shape_factor=1.5,
    )
    assert r["ok"], r
    core = icrp66_lognormal(5e-6, 2.5, 3000.0, 1.5)
    assert r["results"]["fraction_ET1_mass"]["value"] == pytest.approx(core["ET1"], rel=0.01)
    assert r["results"]["mass_concentration"]["value"] == pytest.approx(1000.0)  # µg/m3


def test_deposition_dose_bars_and_overlay():
    r = _run(exposure_duration={"value": 2, "unit": "h"})
    bars = r["curves"]["dose_bars"]
    assert bars["keys"][-1] == "total"
    for w in ("number", "surface", "mass"):
        assert len(bars[w]["y"]) == 6
        assert bars[w]["y"][-1] == pytest.approx(2 * bars[w]["per_hour"][-1])
    overlay = r["curves"]["distribution"]["number"]["y"]
    assert max(overlay) == pytest.approx(1.0)


@pytest.mark.parametrize("demo", DEMOS, ids=[d["id"] for d in DEMOS])
def test_deposition_demo_scenarios_run(demo):
    assert demo["label"].startswith("Invented demo")
    assert _run(**demo["inputs"])["ok"]


def test_deposition_demos_in_describe():
    d = handle({"kind": "describe"})
    fields = d["calculations"]["deposition"]["fields"]
    assert [x["id"] for x in fields[0]["demos"]] == [x["id"] for x in demo_scenarios()]


def test_deposition_simplified_model():
    r = _run(model="simplified")
    assert set(r["curves"]["deposition"]) == {
        "head_airways",
        "tracheobronchial",
        "alveolar",
        "total",
    }
    assert any("simplified fits" in w for w in r["warnings"])


def test_deposition_custom_breathing():
    r = _run(
        breathing="custom",
        tidal_volume={"value": 1.0, "unit": "L"},
        breathing_frequency=15,
        nasal_fraction=0.6,
    )
    assert r["ok"], r
    assert r["results"]["ventilation"]["value"] == pytest.approx(0.9)  # 1 L x 15 /min


def test_deposition_custom_breathing_below_dead_space():
    e = _error(_run(breathing="custom", tidal_volume={"value": 0.12, "unit": "L"}))
    assert e["field"] == "tidal_volume" and "dead space" in e["message"]


@pytest.mark.parametrize(
    ("mode", "path", "text"),
    [
        (_mode(gsd=1.0), "gsd", "greater than 1"),
        (_mode(gsd=0.8), "gsd", "greater than 1"),
        (_mode(gsd=6), "gsd", "at most 5"),
        (_mode(median=(0.5, "nm")), "median", "1 nm to 100 µm"),
        (_mode(median=(200, "um")), "median", "1 nm to 100 µm"),
        (_mode(conc=(-5, "1/cm3")), "concentration", "must be from"),
        (_mode(conc=(1e12, "1/cm3")), "concentration", "10⁹ 1/cm³"),
        (_mode("mass", (2, "um"), 2, (20000, "mg/m3")), "concentration", "10⁴ mg/m³"),
        (_mode(conc=(5, "mg/m3")), "concentration", "unknown unit"),
        (_mode(median=("abc", "nm")), "median", "must be a number"),
        (_mode(median=("1,000", "nm")), "median", "ambiguous"),
    ],
    ids=[
        "gsd-1",
        "gsd-below-1",
        "gsd-6",
        "median-small",
        "median-large",
        "negative",
        "absurd-number",
        "absurd-mass",
        "wrong-unit-kind",
        "non-numeric",
        "thousands-separator",
    ],
)
def test_deposition_mode_validation(mode, path, text):
    """Each mode value is checked by its sub-field's declaration, as a plain field is, and
    the error names the path of the wrong value (modes.<index>.<name>)."""
    e = _error(_run(modes=[mode]))
    assert e["field"] == f"modes.0.{path}"
    assert text in e["message"]
    assert e["message"].startswith("Mode 1")


def test_deposition_too_many_modes():
    e = _error(_run(modes=[_mode()] * 5))
    assert e["field"] == "modes"
    assert "at most 4" in e["message"]


@pytest.mark.parametrize(
    "duration", [{"value": 25, "unit": "h"}, {"value": 0, "unit": "h"}, {"value": -1, "unit": "h"}]
)
def test_deposition_duration_outside_0_24h(duration):
    e = _error(_run(exposure_duration=duration))
    assert e["field"] == "exposure_duration"


@pytest.mark.parametrize(
    ("csv_text", "text"),
    [
        ("", "Choose a CSV file"),
        ("d,n\n10,1\nabc,2\n", "Line 3"),
        ("d,n\n10,1\n5,2\n", "Line 3"),
        ("d,n\n10,1\n10,2\n", "Line 3"),
        ("d,n\n-10,1\n20,2\n", "Line 2"),
        ("d,n\n10,1\n", "only one data row"),
        ("d;n\n1e9;1\n2e9;2\n", "1 nm to 100 µm"),
        ("\x00\x01", "binary"),
    ],
    ids=[
        "missing",
        "non-numeric",
        "unsorted",
        "duplicate",
        "negative",
        "single-row",
        "out-of-range",
        "binary",
    ],
)
def test_deposition_csv_errors(csv_text, text):
    e = _error(_run(size_source="csv", csv_text=csv_text, csv_concentration_type="per_bin"))
    assert e["field"] == "csv_text"
    assert text in e["message"]


def test_deposition_csv_decimal_comma_reported():
    r = _run(
        size_source="csv",
        csv_text="\ufeffd;n\n10,5;100\n20;200\n40;50\n",
        csv_diameter_column="d",
        csv_concentration_column="n",
    )
    assert r["ok"], r
    assert any("Decimal commas" in w for w in r["warnings"])
    assert any("byte-order" in w for w in r["warnings"])


def test_deposition_benchmark_comparison():
    r = _run(benchmark_number={"value": 5000, "unit": "1/cm3"})
    assert r["results"]["benchmark_number"]["value"] == pytest.approx(2.0)
    assert any("2 times the benchmark" in w for w in r["warnings"])
