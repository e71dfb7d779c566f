"""The motion calculation's reply: shape, units, curves, and agreement with the core.

Wiring checks: the numbers themselves are checked against sources in tests/core; here the
reply must carry exactly what the core functions return for the same SI inputs.
"""

from __future__ import annotations

import itertools
import json
import math

import pytest

from driftdose import gas, particle
from driftdose.api import handle
from driftdose.api.units import from_si, to_si
from driftdose.export import curve_x
from driftdose.sources import SOURCES

RESULT_KEYS = {
    "volume_equivalent_diameter",
    "aerodynamic_diameter",
    "mean_free_path",
    "air_viscosity",
    "knudsen_number",
    "slip_correction",
    "mobility",
    "diffusion_coefficient",
    "settling_velocity",
    "reynolds_number",
    "relaxation_time",
    "stopping_distance",
    "rms_displacement",
    "settling_distance",
    "displacement_ratio",
    "dominant",
    "crossover_diameter",
    "brownian_time",
    "settling_time",
    "settling_model",
    "initial_reynolds_number",
    "stopping_model",
}

CASES = {
    "defaults": {},
    "1um-quartz-1min": {
        "particle_diameter": {"value": 1, "unit": "um"},
        "particle_density": {"value": 2.65, "unit": "g/cm3"},
        "shape_factor": {"value": 1.36, "unit": "1"},
        "time": {"value": 1, "unit": "min"},
    },
    "5um-aerodynamic-hot-low-pressure": {
        "particle_diameter": {"value": 5, "unit": "\u00b5m"},
        "diameter_type": "aerodynamic",
        "particle_density": {"value": 3000, "unit": "kg/m3"},
        "shape_factor": {"value": 1.5, "unit": "1"},
        "temperature": {"value": 37, "unit": "\u00b0C"},
        "pressure": {"value": 0.8, "unit": "atm"},
        "time": {"value": 2, "unit": "h"},
        "reference_distance": {"value": 1, "unit": "m"},
        "initial_velocity": {"value": 30, "unit": "m/s"},
    },
    "2nm-short-time": {
        "particle_diameter": {"value": 2, "unit": "nm"},
        "time": {"value": 0.01, "unit": "s"},
    },
    "100um-heavy-fast": {
        "particle_diameter": {"value": 100, "unit": "um"},
        "particle_density": {"value": 8, "unit": "g/cm3"},
        "initial_velocity": {"value": 10, "unit": "m/s"},
    },
}


def _si_inputs(inputs: dict) -> dict:
    """The SI values the reply should be based on (defaults of the motion form)."""

    def q(name, kind, default):
        raw = inputs.get(name, default)
        return to_si(raw["value"], kind, raw["unit"])

    return {
        "d": q("particle_diameter", "length", {"value": 100, "unit": "nm"}),
        "aero": inputs.get("diameter_type", "volume_equivalent") == "aerodynamic",
        "rho": q("particle_density", "density", {"value": 1, "unit": "g/cm3"}),
        "chi": q("shape_factor", "dimensionless", {"value": 1, "unit": "1"}),
        "T": q("temperature", "temperature", {"value": 20, "unit": "degC"}),
        "P": q("pressure", "pressure", {"value": 101.325, "unit": "kPa"}),
        "t": q("time", "time", {"value": 1, "unit": "s"}),
        "L": q("reference_distance", "length", {"value": 0.2, "unit": "mm"}),
        "v0": q("initial_velocity", "velocity", {"value": 1, "unit": "m/s"}),
    }


@pytest.fixture(scope="module", params=list(CASES), ids=list(CASES))
def case(request):
    inputs = CASES[request.param]
    reply = handle({"kind": "motion", "inputs": inputs})
    assert reply["ok"] is True, reply
    return _si_inputs(inputs), reply


def test_handle_motion_reply_shape(case) -> None:
    _, reply = case
    assert set(reply) == {"ok", "results", "curves", "warnings", "sources"}
    assert set(reply["results"]) == RESULT_KEYS
    assert all(isinstance(w, str) for w in reply["warnings"])
    json.dumps(reply, allow_nan=False)  # raises on NaN or infinity


def test_handle_motion_result_rows(case) -> None:
    _, reply = case
    for key, row in reply["results"].items():
        assert isinstance(row["label"], str) and row["label"], key
        if "text" in row:
            assert isinstance(row["text"], str) and row["text"]
            continue
        assert set(row) >= {"label", "symbol", "value", "unit", "si", "si_unit", "note"}
        assert math.isfinite(row["value"]) and math.isfinite(row["si"])


@pytest.mark.parametrize(
    ("key", "si_unit"),
    [
        ("volume_equivalent_diameter", "m"),
        ("aerodynamic_diameter", "m"),
        ("mean_free_path", "m"),
        ("air_viscosity", "Pa.s"),
        ("mobility", "s/kg"),
        ("diffusion_coefficient", "m2/s"),
        ("settling_velocity", "m/s"),
        ("relaxation_time", "s"),
        ("stopping_distance", "m"),
        ("rms_displacement", "m"),
        ("settling_distance", "m"),
        ("brownian_time", "s"),
        ("settling_time", "s"),
        ("slip_correction", "1"),
        ("knudsen_number", "1"),
        ("reynolds_number", "1"),
    ],
)
def test_handle_motion_units(case, key: str, si_unit: str) -> None:
    _, reply = case
    row = reply["results"][key]
    assert row["si_unit"] == si_unit  # unit codes of the table describe() sends
    # The shown value is the SI value in the shown unit.
    kinds = {"m": "length", "m/s": "velocity", "s": "time"}
    if si_unit in kinds and row["unit"] != row["si_unit"]:
        assert row["value"] == pytest.approx(from_si(row["si"], kinds[si_unit], row["unit"]))


def test_handle_motion_equals_core(case) -> None:
    v, reply = case
    T, P, rho, chi, t = v["T"], v["P"], v["rho"], v["chi"], v["t"]
    if v["aero"]:
        d_ae = v["d"]
        d = particle.volume_equivalent_diameter(d_ae, rho, chi, T, P)
    else:
        d = v["d"]
        d_ae = particle.aerodynamic_diameter(d, rho, chi, T, P)
    vts = particle.settling_velocity(d, rho, T, P, chi)
    expected = {
        "volume_equivalent_diameter": d,
        "aerodynamic_diameter": d_ae,
        "mean_free_path": gas.mean_free_path(T, P),
        "air_viscosity": gas.air_viscosity(T),
        "knudsen_number": particle.knudsen_number(d, T, P),
        "slip_correction": particle.slip_correction(d, T, P),
        "mobility": particle.mobility(d, T, P, chi),
        "diffusion_coefficient": particle.diffusion_coefficient(d, T, P, chi),
        "settling_velocity": vts,
        "reynolds_number": particle.reynolds_number(d, vts, T, P),
        "relaxation_time": particle.relaxation_time(d, rho, T, P, chi),
        "stopping_distance": particle.stopping_distance(d, v["v0"], rho, T, P, chi),
        "rms_displacement": particle.rms_displacement(d, t, T, P, chi),
        "settling_distance": particle.settling_distance(d, t, rho, T, P, chi),
        "brownian_time": particle.brownian_time(d, v["L"], T, P, chi),
        "settling_time": particle.settling_time(d, v["L"], rho, T, P, chi),
        "crossover_diameter": particle.crossover_diameter(t, rho, T, P, chi),
    }
    for key, value in expected.items():
        assert reply["results"][key]["si"] == pytest.approx(value, rel=1e-12), key
    ratio = expected["rms_displacement"] / expected["settling_distance"]
    assert reply["results"]["displacement_ratio"]["si"] == pytest.approx(ratio, rel=1e-12)
    dominant = reply["results"]["dominant"]["text"]
    assert dominant == ("Brownian diffusion" if ratio > 1 else "Gravity settling")


def test_handle_motion_curves(case) -> None:
    v, reply = case
    curves = reply["curves"]
    for name in ("brownian", "settling"):
        x, y = curve_x(curves, curves[name]), curves[name]["y"]
        assert len(x) == len(y) >= 200
        # Log-spaced from 1 nm to 100 um, given in um.
        assert x[0] == pytest.approx(1e-3, rel=1e-12)
        assert x[-1] == pytest.approx(100.0, rel=1e-12)
        steps = [math.log(b / a) for a, b in itertools.pairwise(x)]
        assert max(steps) == pytest.approx(min(steps), rel=1e-9)
        assert all(yi > 0 and math.isfinite(yi) for yi in y)
    # unit codes only (the page labels them from the table sent with the forms)
    assert curves["x_unit"] == "um" and curves["y_unit"] == "m"
    # Brownian falls and settling rises with size along the x-axis.
    b, s = curves["brownian"]["y"], curves["settling"]["y"]
    assert all(p > q for p, q in itertools.pairwise(b))
    assert all(p < q for p, q in itertools.pairwise(s))
    assert curves["reference"]["y"] == [v["L"], v["L"]]
    results = reply["results"]
    assert curves["this_particle"]["y"] == [
        results["rms_displacement"]["si"],
        results["settling_distance"]["si"],
    ]
    shown = "aerodynamic_diameter" if v["aero"] else "volume_equivalent_diameter"
    assert curves["this_particle"]["x"][0] == pytest.approx(results[shown]["si"] * 1e6)


def _loglog_interp(x: list, y: list, x0: float) -> float:
    i = next(i for i in range(len(x) - 1) if x[i] <= x0 <= x[i + 1])
    f = math.log(x0 / x[i]) / math.log(x[i + 1] / x[i])
    return math.exp(math.log(y[i]) + f * math.log(y[i + 1] / y[i]))


def test_handle_motion_crossover_on_both_curves(case) -> None:
    v, reply = case
    curves = reply["curves"]
    assert "crossover" in curves  # all cases here have a crossover in range
    x0, y0 = curves["crossover"]["x"][0], curves["crossover"]["y"][0]
    # Exactly: both distances are equal at the crossover size.
    d_cross = reply["results"]["crossover_diameter"]["si"]
    T, P, rho, chi, t = v["T"], v["P"], v["rho"], v["chi"], v["t"]
    assert y0 == pytest.approx(particle.settling_distance(d_cross, t, rho, T, P, chi), rel=1e-9)
    assert y0 == pytest.approx(particle.rms_displacement(d_cross, t, T, P, chi), rel=1e-9)
    # On the plotted curves: log-log interpolation between neighbouring points (spacing
    # 10^(5/240), curves nearly straight in log-log) reproduces y0 closely.
    for name in ("brownian", "settling"):
        y = _loglog_interp(curve_x(curves, curves[name]), curves[name]["y"], x0)
        assert y == pytest.approx(y0, rel=1e-3), name


def test_handle_motion_sources_known(case) -> None:
    _, reply = case
    keys = [s["key"] for s in reply["sources"]]
    assert keys and all(k in SOURCES for k in keys)
    assert all(s["citation"] == SOURCES[s["key"]] for s in reply["sources"])


def test_handle_motion_warnings_for_short_time_and_large_re() -> None:
    reply = handle(
        {
            "kind": "motion",
            "inputs": {
                "particle_diameter": {"value": 1, "unit": "mm"},
                "particle_density": {"value": 25, "unit": "g/cm3"},
                "time": {"value": 1, "unit": "ms"},
            },
        }
    )
    assert reply["ok"] is True
    text = " ".join(reply["warnings"])
    # Re ~ 1800: beyond Schiller & Naumann's 800 but inside Clift & Gauvin's range (Clift,
    # Grace & Weber 1978 Table 5.2): the reply names the drag law, no extrapolation warning
    assert "Clift & Gauvin" in text
    assert "extrapolated" not in text
    assert "relaxation times" in text
    assert "100 \u00b5m" in text
    assert "Clift & Gauvin" in reply["results"]["settling_model"]["text"]
    assert "equation of motion" in reply["results"]["stopping_model"]["text"].lower()


def test_handle_motion_names_stokes_regime_for_small_particles() -> None:
    # Hinds (1999) ch. 3: a 1 um unit-density sphere settles at Re ~ 2e-6, Stokes's regime
    reply = handle({"kind": "motion", "inputs": {"particle_diameter": {"value": 1, "unit": "um"}}})
    assert reply["ok"] is True
    assert reply["results"]["settling_model"]["text"].startswith("Stokes")
    assert reply["results"]["initial_reynolds_number"]["si"] < 0.1


def test_handle_motion_aerodynamic_too_small_is_a_field_error() -> None:
    # 0.5 nm aerodynamic at 25 g/cm3 is far below 0.5 nm volume-equivalent.
    reply = handle(
        {
            "kind": "motion",
            "inputs": {
                "particle_diameter": {"value": 0.5, "unit": "nm"},
                "diameter_type": "aerodynamic",
                "particle_density": {"value": 25, "unit": "g/cm3"},
            },
        }
    )
    assert reply["ok"] is False
    assert reply["errors"][0]["field"] == "particle_diameter"


def test_handle_motion_unit_choice_does_not_change_results() -> None:
    a = handle({"kind": "motion", "inputs": {"particle_diameter": {"value": 250, "unit": "nm"}}})
    b = handle(
        {"kind": "motion", "inputs": {"particle_diameter": {"value": 0.25, "unit": "\u03bcm"}}}
    )
    for key, row in a["results"].items():
        if "si" in row:
            assert b["results"][key]["si"] == pytest.approx(row["si"], rel=1e-12), key
