"""The sampling calculation's reply: shape, validation messages, and agreement with the core.

Wiring checks: the models are checked against sources in tests/core; here the reply must carry
what the core returns for the same SI inputs, and every bad input must come back as a message
on its own field.
"""

from __future__ import annotations

import copy
import json
import math
from dataclasses import replace

import pytest

from driftdose import particle
from driftdose.api import deposition as deposition_api
from driftdose.api import describe, handle, handle_json
from driftdose.api import sampling as sampling_api
from driftdose.api.sampling import CURVE_POINTS, DEMOS, STAGE_FIELDS, TARGETS
from driftdose.api.spectrum_fields import import_spectrum
from driftdose.conventions import iso7708_fraction
from driftdose.deposition import REFERENCE_WORKER, icrp66_curves, simplified_icrp
from driftdose.export import curve_x
from driftdose.sources import SOURCES
from driftdose.transport import Bend, Chain, Cyclone, Impactor, ScreenStack, Tube


def _aerodynamic(curves: dict) -> list[float]:
    """The aerodynamic diameters of the curves' sizes [um] (the axis ``x_aerodynamic`` names)."""
    return curves["axes"][curves["x_aerodynamic"]]


def q(value, unit):
    return {"value": value, "unit": unit}


def request(stages, **inputs):
    return {"kind": "sampling", "inputs": {"stages": stages, **inputs}}


TUBE = {"type": "tube", "length": q(2, "m"), "tube_diameter": q(4, "mm")}
BEND = {
    "type": "bend",
    "tube_diameter": q(4, "mm"),
    "bend_angle": q(90, "deg"),
    "curvature_radius": q(3, "cm"),
}
CYCLONE = {"type": "cyclone", "curve": "lognormal", "d50": q(4, "um"), "curve_gsd": q(1.5, "1")}
IMPACTOR = {
    "type": "impactor",
    "jet": "round",
    "nozzle_diameter": q(1, "mm"),
    "n_nozzles": 1,
    "efficiency_width": q(1.2, "1"),
}
SCREENS = {
    "type": "screens",
    "wire_diameter": q(50, "um"),
    "solidity": q(0.3, "1"),
    "thickness": q(100, "um"),
    "screen_diameter": q(25, "mm"),
    "n_screens": 5,
}
ALL = [TUBE, BEND, CYCLONE, IMPACTOR, SCREENS]


def errors_by_field(reply):
    assert reply["ok"] is False
    return {e["field"]: e["message"] for e in reply["errors"]}


# --- former names -------------------------------------------------------------------------------


def test_former_stage_parameter_name_is_read() -> None:
    """Links and inputs files written before the rename give the cyclone's curve GSD and the
    impactor's curve width as ``steepness``: read as the current names (which win if both)."""
    old_cyclone = {k: v for k, v in CYCLONE.items() if k != "curve_gsd"} | {
        "steepness": q(1.7, "1")
    }
    old_impactor = {k: v for k, v in IMPACTOR.items() if k != "efficiency_width"}
    old_impactor["steepness"] = q(1.4, "1")
    new_cyclone = {**CYCLONE, "curve_gsd": q(1.7, "1")}
    new_impactor = {**IMPACTOR, "efficiency_width": q(1.4, "1")}
    old = handle(request([old_cyclone, old_impactor], flow=q(1.5, "L/min")))
    new = handle(request([new_cyclone, new_impactor], flow=q(1.5, "L/min")))
    assert old["ok"] is True, old.get("errors")
    assert old == new
    both = handle(request([{**new_cyclone, "steepness": q(9, "1")}], flow=q(1.5, "L/min")))
    assert both == handle(request([new_cyclone], flow=q(1.5, "L/min")))


# --- shape and agreement with the core --------------------------------------------------------


def test_sampling_reply_shape_and_json() -> None:
    reply = handle(request(ALL, flow=q(1.5, "L/min"), target="respirable"))
    assert reply["ok"] is True, reply.get("errors")
    curves = reply["curves"]
    assert len(curves["stages"]) == 5
    for series in [*curves["stages"], curves["overall"], curves["target"]]:
        assert len(curve_x(curves, series)) == len(series["y"]) == CURVE_POINTS >= 200
    assert curve_x(curves, curves["overall"])[0] == pytest.approx(1e-3)  # 1 nm in um
    assert curve_x(curves, curves["overall"])[-1] == pytest.approx(100.0)  # 100 um
    results = reply["results"]
    for key in ("overall_10nm", "overall_100nm", "overall_1um", "overall_10um", "pass_band"):
        assert key in results
    assert "departure_max" in results and "departure_mean" in results
    assert len(results["stages_table"]["rows"]) == 5
    for src in reply["sources"]:
        assert SOURCES[src["key"]] == src["citation"]
    text = handle_json(json.dumps(request(ALL, target="thoracic")))
    assert json.loads(text)["ok"] is True


def test_sampling_curves_match_core_chain() -> None:
    reply = handle(
        request(
            ALL,
            flow=q(1.5, "L/min"),
            particle_density=q(2.0, "g/cm3"),
            temperature=q(30, "degC"),
            pressure=q(95, "kPa"),
        )
    )
    assert reply["ok"] is True
    Q, T, P, rho = 1.5e-3 / 60, 303.15, 95e3, 2000.0
    chain = Chain(
        (
            Tube(2.0, 4e-3, Q),
            Bend(4e-3, Q, math.pi / 2, 0.03),
            Cyclone(4e-6, 1.5),
            Impactor(1e-3, Q, efficiency_width=1.2),
            ScreenStack(50e-6, 0.3, 100e-6, Q, 25e-3, 5),
        )
    )
    xs = [x * 1e-6 for x in curve_x(reply["curves"], reply["curves"]["overall"])]
    for i in (0, 60, 120, 180, 240):
        d = xs[i]
        assert reply["curves"]["overall"]["y"][i] == pytest.approx(
            chain.penetration(d, rho, T, P), rel=1e-9, abs=1e-300
        )
        for k, stage in enumerate(chain.stages):
            assert reply["curves"]["stages"][k]["y"][i] == pytest.approx(
                stage.penetration(d, rho, T, P), rel=1e-9, abs=1e-300
            )
    p1 = chain.penetration(1e-6, rho, T, P)
    assert reply["results"]["overall_1um"]["value"] == pytest.approx(100 * p1, rel=1e-9)
    assert reply["results"]["overall_1um"]["si"] == pytest.approx(p1, rel=1e-9)


def test_sampling_target_overlay_and_departure() -> None:
    reply = handle(request([CYCLONE], target="respirable"))
    assert reply["ok"] is True
    curves = reply["curves"]
    xs_ae = [x * 1e-6 for x in _aerodynamic(curves)]
    ys = curves["target"]["y"]
    for x, y in zip(xs_ae, ys, strict=True):
        if x > 100e-6:
            assert y is None
        else:
            assert y == pytest.approx(iso7708_fraction(x, "respirable"), rel=1e-12)
    # Departure: max and mean of |P - E| over 0.1-100 um aerodynamic, in percentage points.
    overall = curves["overall"]["y"]
    diffs = [
        abs(p - e)
        for x, p, e in zip(xs_ae, overall, ys, strict=True)
        if e is not None and 0.1e-6 <= x <= 100e-6
    ]
    assert reply["results"]["departure_max"]["value"] == pytest.approx(100 * max(diffs))
    assert reply["results"]["departure_mean"]["value"] == pytest.approx(
        100 * sum(diffs) / len(diffs)
    )


def test_sampling_ideal_respirable_cyclone_has_no_departure_from_respirable() -> None:
    ideal = {"type": "cyclone", "curve": "iso7708_respirable"}
    reply = handle(request([ideal], target="respirable"))
    assert reply["results"]["departure_max"]["si"] == pytest.approx(0.0, abs=1e-12)


def csv_spectrum(text, **fields):
    """Inputs that correct a spectrum given as CSV text (the deposition panel's fields)."""
    return {"size_source": "csv", "csv_text": text, **fields}


def test_sampling_spectrum_bins_corrected_and_flagged() -> None:
    diameters = [5, 20, 100, 500, 3000, 8000]  # nm
    values = [1000.0, 2000.0, 3000.0, 400.0, 10.0, 2.0]  # per cm3 per bin
    text = "d_nm,n\n" + "".join(f"{d},{c}\n" for d, c in zip(diameters, values, strict=True))
    inputs = csv_spectrum(text, csv_concentration_type="per_bin")
    reply = handle(request([TUBE, CYCLONE], flow=q(1, "L/min"), **inputs))
    assert reply["ok"] is True, reply.get("errors")
    table = reply["results"]["spectrum_table"]
    chain = Chain((Tube(2.0, 4e-3, 1e-3 / 60), Cyclone(4e-6, 1.5)))
    flags = []
    for row, d_nm, c in zip(table["rows"], diameters, values, strict=True):
        p = chain.penetration(d_nm * 1e-9, 1000.0)
        assert row["diameter"] == pytest.approx(d_nm * 1e-3)
        assert row["measured"] == pytest.approx(c, rel=1e-12)
        assert row["penetration"] == pytest.approx(p, rel=1e-12)
        assert row["corrected"] == pytest.approx(c / p, rel=1e-12)
        assert row["unreliable"] == (p < 0.5)
        flags.append(row["unreliable"])
    assert any(flags) and not all(flags)  # the check sees both kinds of bin
    assert reply["curves"]["spectrum"]["corrected"]["y"][0] == table["rows"][0]["corrected"]
    assert reply["curves"]["spectrum"]["unreliable"] == flags
    assert any("unreliable" in w for w in reply["warnings"])


def test_sampling_spectrum_aerodynamic_diameters_converted() -> None:
    rho = 3000.0
    inputs = csv_spectrum(
        "2,1\n3,1\n",
        csv_diameter_unit="um",
        csv_concentration_type="per_bin",
        spectrum_diameter_type="aerodynamic",
    )
    reply = handle(request([CYCLONE], particle_density=q(3, "g/cm3"), **inputs))
    assert reply["ok"] is True, reply.get("errors")
    d_ve = particle.volume_equivalent_diameter(2e-6, rho)
    p = Cyclone(4e-6, 1.5).penetration(d_ve, rho, 293.15, 101325.0)
    row = reply["results"]["spectrum_table"]["rows"][0]
    assert row["penetration"] == pytest.approx(p)
    assert row["diameter"] == pytest.approx(2.0)  # shown as given in the file
    assert reply["results"]["spectrum_table"]["diameter_type"] == "aerodynamic"


def test_sampling_spectrum_from_csv() -> None:
    inputs = csv_spectrum(
        "d_nm;dN\n10;100\n100;50\n1000;10\n",
        csv_diameter_column="d_nm",
        csv_concentration_column="dN",
        csv_concentration_type="per_bin",
        csv_diameter_unit="nm",
        csv_concentration_unit="1/cm3",
    )
    reply = handle(request([TUBE], **inputs))
    assert reply["ok"] is True, reply.get("errors")
    rows = reply["results"]["spectrum_table"]["rows"]
    assert [r["measured"] for r in rows] == pytest.approx([100.0, 50.0, 10.0])
    assert "3 rows" in reply["results"]["csv_rows"]["text"]


def test_sampling_spectrum_ignored_unless_chosen() -> None:
    inputs = csv_spectrum("not, a spectrum\n", size_source="none")
    reply = handle(request([TUBE], **inputs))
    assert reply["ok"] is True
    assert "spectrum_table" not in reply["results"]
    assert "spectrum" not in reply["curves"]


def test_sampling_spectrum_fields_are_the_deposition_fields() -> None:
    """One declaration for both calculations: the same fields, in the same order; each applies
    by its own calculation's source choice."""
    names = [
        "csv_text",
        "csv_diameter_column",
        "csv_concentration_column",
        "csv_concentration_type",
        "csv_diameter_unit",
        "csv_concentration_unit",
    ]
    ours = {f.name: f for f in sampling_api.FIELDS}
    theirs = {f.name: f for f in deposition_api.FIELDS}
    for name in names:
        assert replace(ours[name], applies=None) == replace(theirs[name], applies=None), name
        assert ours[name].applies == ("size_source", ("csv",)), name
        assert theirs[name].applies == ("size_source", ("csv",)), name
    assert [f.name for f in sampling_api.FIELDS if f.name in names] == names


def test_sampling_spectrum_csv_equals_deposition_import() -> None:
    """The same CSV text gives the same bins (particles per cm3) in both calculations; the
    table gives them back in the file's own terms (dN/dlogDp per cm3), the chart per bin."""
    text = "size,dNdlogDp\n20,1000\n40,3000\n80,2000\n160,500\n"
    inputs = csv_spectrum(text, csv_diameter_column="size", csv_concentration_column="dNdlogDp")
    reply = handle(request([TUBE], **inputs))
    assert reply["ok"] is True, reply.get("errors")
    binned, _ = import_spectrum(
        {
            "csv_text": text,
            "csv_diameter_column": "size",
            "csv_concentration_column": "dNdlogDp",
            "csv_concentration_type": "dN/dlogDp",
            "csv_diameter_unit": "nm",
            "csv_concentration_unit": "1/cm3",
        }
    )
    measured = reply["curves"]["spectrum"]["measured"]["y"]
    assert measured == pytest.approx([n / 1e6 for n in binned.numbers])
    rows = reply["results"]["spectrum_table"]["rows"]
    assert [r["measured"] for r in rows] == pytest.approx([1000.0, 3000.0, 2000.0, 500.0])


def test_sampling_stage_flow_overrides_sampling_flow() -> None:
    own = dict(TUBE, flow=q(5, "L/min"))
    a = handle(request([own], flow=q(1, "L/min")))
    b = handle(request([TUBE], flow=q(5, "L/min")))
    assert a["curves"]["overall"]["y"] == b["curves"]["overall"]["y"]


@pytest.mark.parametrize("name", sorted(DEMOS))
def test_sampling_demos_run_and_are_labelled_invented(name) -> None:
    demo = DEMOS[name]
    assert "invented" in demo["label"].lower()
    reply = handle({"kind": "sampling", "inputs": demo["inputs"]})
    assert reply["ok"] is True, reply.get("errors")


def test_sampling_describe_offers_stage_types_and_demos() -> None:
    desc = describe()["calculations"]["sampling"]
    stages = next(f for f in desc["fields"] if f["name"] == "stages")
    assert set(stages["stage_types"]) == set(STAGE_FIELDS)
    assert set(stages["demos"]) == set(DEMOS)
    json.dumps(desc)  # JSON-ready


# --- bad input: one clear message on its field ---------------------------------------------


def with_param(stage, **params):
    out = copy.deepcopy(stage)
    out.update(params)
    return out


@pytest.mark.parametrize(
    ("stages", "field"),
    [
        pytest.param([with_param(TUBE, length=q(0, "m"))], "stages.0.length", id="zero-length"),
        pytest.param([with_param(TUBE, length=q(-3, "m"))], "stages.0.length", id="neg-length"),
        pytest.param(
            [TUBE, with_param(TUBE, tube_diameter=q(0, "mm"))],
            "stages.1.tube_diameter",
            id="zero-diameter",
        ),
        pytest.param([with_param(TUBE, flow=q(-1, "L/min"))], "stages.0.flow", id="neg-flow"),
        pytest.param(
            [with_param(SCREENS, solidity=q(0, "1"))], "stages.0.solidity", id="solidity-0"
        ),
        pytest.param(
            [with_param(SCREENS, solidity=q(1, "1"))], "stages.0.solidity", id="solidity-1"
        ),
        pytest.param(
            [with_param(SCREENS, solidity=q(1.4, "1"))], "stages.0.solidity", id="solidity-1.4"
        ),
        pytest.param(
            [with_param(SCREENS, thickness=q(10, "um"))], "stages.0.thickness", id="thin-screen"
        ),
        pytest.param(
            [TUBE, TUBE, with_param(BEND, curvature_radius=q(1.5, "mm"))],
            "stages.2.curvature_radius",
            id="bend-radius-below-tube-radius",
        ),
        pytest.param(
            [with_param(IMPACTOR, jet="rectangular", slit_length=q(0.5, "mm"))],
            "stages.0.slit_length",
            id="slit-shorter-than-wide",
        ),
        pytest.param(
            [with_param(IMPACTOR, nozzle_diameter=q(0.2, "mm"), flow=q(10, "L/min"))],
            "stages.0.flow",
            id="sonic-jet",
        ),
        pytest.param([with_param(IMPACTOR, n_nozzles=0)], "stages.0.n_nozzles", id="no-nozzle"),
        pytest.param([with_param(CYCLONE, curve_gsd=q(1, "1"))], "stages.0.curve_gsd", id="sigma1"),
        pytest.param([{"type": "pipe"}], "stages.0.type", id="unknown-type"),
        pytest.param(["tube"], "stages.0.type", id="not-an-object"),
        pytest.param([], "stages", id="empty-chain"),
        pytest.param("tube", "stages", id="not-a-list"),
    ],
)
def test_sampling_bad_input_message_on_field(stages, field) -> None:
    errors = errors_by_field(handle(request(stages)))
    assert field in errors
    assert errors[field]
    if field.startswith("stages."):
        index = int(field.split(".")[1])
        assert errors[field].startswith((f"Stage {index + 1} (", f"Stage {index + 1}: "))


def test_sampling_sonic_sampling_flow_reported_on_flow_field() -> None:
    # The stage has no flow of its own: the fault is the sampling flow.
    errors = errors_by_field(handle(request([TUBE], flow=q(0.09, "m3/s"))))
    assert "flow" in errors
    assert "speed of sound" in errors["flow"]


def test_sampling_reports_several_faulty_stages_at_once() -> None:
    stages = [with_param(TUBE, length=q(0, "m")), with_param(SCREENS, solidity=q(2, "1"))]
    errors = errors_by_field(handle(request(stages)))
    assert {"stages.0.length", "stages.1.solidity"} <= set(errors)


@pytest.mark.parametrize(
    ("inputs", "field"),
    [
        pytest.param({"csv_text": None}, "csv_text", id="no-file"),
        pytest.param({"csv_text": "   "}, "csv_text", id="empty-text"),
        pytest.param({"csv_text": {"d": 1}}, "csv_text", id="not-text"),
        pytest.param({"csv_text": "d;n\n10;x\n20;3\n"}, "csv_text", id="not-a-number"),
        pytest.param({"csv_text": "d;n\n20;1\n10;3\n"}, "csv_text", id="unsorted"),
        pytest.param({"csv_text": "d;n\n10;-1\n20;3\n"}, "csv_text", id="negative"),
        pytest.param({"csv_text": "d;n\n10;1\n"}, "csv_text", id="one-row"),
        pytest.param({"csv_text": "1e9;1\n2e9;1\n"}, "csv_text", id="beyond-100um"),
        pytest.param(
            {"csv_text": "d;n\n10;1\n20;3\n", "csv_diameter_column": "size"},
            "csv_diameter_column",  # the column picker is the control that is wrong
            id="unknown-column",
        ),
        pytest.param(
            {"csv_text": "10;1\n20;3\n", "csv_diameter_unit": "furlong"},
            "csv_diameter_unit",
            id="unknown-unit",
        ),
        pytest.param(
            {"csv_text": "10;1\n20;3\n", "spectrum_diameter_type": "stokes"},
            "spectrum_diameter_type",
            id="unknown-diameter-type",
        ),
        pytest.param(
            {"csv_text": "10;1\n20;3\n", "size_source": "bins"},
            "size_source",
            id="unknown-source",
        ),
    ],
)
def test_sampling_bad_spectrum_message_on_field(inputs, field) -> None:
    errors = errors_by_field(handle(request([TUBE], **{"size_source": "csv", **inputs})))
    assert field in errors
    assert errors[field]


def test_sampling_bad_spectrum_line_number_in_message() -> None:
    errors = errors_by_field(handle(request([TUBE], **csv_spectrum("d;n\n10;1\n20;abc\n"))))
    assert errors["csv_text"].startswith("Line 3")


# --- deposition curves as targets -----------------------------------------------------------
# Wiring checks: the deposition models themselves are checked against ICRP 66 and Hinds (1999)
# in tests/core; here the target must be those models' curves for unit-density spheres of the
# chain's aerodynamic diameters, and missing outside 1 nm to 100 um.


def _targets(prefix):
    return [value for value, _ in TARGETS if value.startswith(prefix)]


@pytest.mark.parametrize("target", _targets("icrp66_"))
def test_sampling_target_icrp66_is_reference_worker_unit_density_curve(target) -> None:
    region = target.removeprefix("icrp66_")
    reply = handle(request([CYCLONE], target=target, particle_density=q(2.5, "g/cm3")))
    assert reply["ok"] is True, reply.get("errors")
    curves = reply["curves"]
    xs_ae = [x * 1e-6 for x in _aerodynamic(curves)]
    inside = [i for i, x in enumerate(xs_ae) if 1e-9 <= x <= 100e-6]
    expected = icrp66_curves(
        [xs_ae[i] for i in inside], 1000.0, 1.0, REFERENCE_WORKER, "aerodynamic"
    )[region]
    ys = curves["target"]["y"]
    for i, e in zip(inside, expected, strict=True):
        assert ys[i] == pytest.approx(min(1.0, max(0.0, e)), rel=1e-12, abs=1e-15)
    assert all(ys[i] is None for i in range(len(ys)) if i not in inside)
    assert ys[-1] is None  # 100 um at 2.5 g/cm3 is beyond 100 um aerodynamic
    keys = [s["key"] for s in reply["sources"]]
    assert "icrp66" in keys and "icrp68" in keys
    assert any("reference worker" in w and "unit-density" in w for w in reply["warnings"])


@pytest.mark.parametrize("target", _targets("simplified_"))
def test_sampling_target_simplified_is_hinds_fit_at_aerodynamic_size(target) -> None:
    region = target.removeprefix("simplified_")
    reply = handle(request([TUBE], target=target))
    assert reply["ok"] is True, reply.get("errors")
    curves = reply["curves"]
    for x, y in zip(_aerodynamic(curves), curves["target"]["y"], strict=True):
        if 1e-3 <= x <= 100.0:
            e = simplified_icrp(x * 1e-6)[region]
            assert y == pytest.approx(min(1.0, max(0.0, e)), rel=1e-12, abs=1e-15)
    assert "hinds1999_ch11" in [s["key"] for s in reply["sources"]]


def test_sampling_target_deposition_missing_below_1nm_aerodynamic() -> None:
    # At 0.2 g/cm3 the smallest sizes have aerodynamic diameters below 1 nm.
    reply = handle(request([TUBE], target="icrp66_AI", particle_density=q(0.2, "g/cm3")))
    assert reply["ok"] is True
    xs = _aerodynamic(reply["curves"])
    ys = reply["curves"]["target"]["y"]
    assert xs[0] < 1e-3
    for x, y in zip(xs, ys, strict=True):
        assert (y is None) == (x < 1e-3 or x > 100.0)


def test_sampling_target_deposition_departure_over_1nm_to_100um() -> None:
    reply = handle(request([TUBE, BEND], target="icrp66_AI"))
    curves = reply["curves"]
    xs_ae = [x * 1e-6 for x in _aerodynamic(curves)]
    diffs = [
        abs(p - e)
        for x, p, e in zip(xs_ae, curves["overall"]["y"], curves["target"]["y"], strict=True)
        if e is not None and 1e-9 <= x <= 100e-6
    ]
    assert len(diffs) == CURVE_POINTS  # unit density: every size is inside
    assert reply["results"]["departure_max"]["si"] == pytest.approx(max(diffs))
    assert reply["results"]["departure_mean"]["si"] == pytest.approx(sum(diffs) / len(diffs))
    assert "1 nm" in reply["results"]["departure_max"]["label"]


@pytest.mark.parametrize("target", [value for value, _ in TARGETS])
def test_sampling_every_target_runs(target) -> None:
    reply = handle(request(ALL, target=target))
    assert reply["ok"] is True, reply.get("errors")
    assert ("target" in reply["curves"]) == (target != "none")
    assert ("departure_max" in reply["results"]) == (target != "none")


def test_sampling_unknown_target_message_on_field() -> None:
    assert "target" in errors_by_field(handle(request([TUBE], target="icrp66_lungs")))


def test_sampling_warns_in_transition_flow() -> None:
    # 10 mm tube at about Re 3000: 0.0181 / 1.204 * 3000 * pi * 0.01 / 4 m3/s = 21 L/min.
    stage = with_param(TUBE, tube_diameter=q(10, "mm"))
    reply = handle(request([stage], flow=q(21, "L/min")))
    assert reply["ok"] is True
    assert any("transition" in w for w in reply["warnings"])
    # the regime is shown as transition and both published forms are named (common
    # practice: pipe flow may be either between Re 2000 and 4000)
    row = reply["results"]["stages_table"]["rows"][0]
    assert row["regime"] == "transition"
    text = " ".join(reply["warnings"])
    assert "interpolated" in text and "Gormley & Kennedy" in text and "Friedlander" in text
    keys = {s["key"] for s in reply["sources"]}
    assert {"gormley_kennedy1949", "friedlander1977"} <= keys


def test_sampling_regime_named_laminar_and_turbulent_outside_transition() -> None:
    # 10 mm tube: 5 L/min is Re ~ 700 (laminar), 60 L/min Re ~ 8500 (turbulent)
    stage = with_param(TUBE, tube_diameter=q(10, "mm"))
    slow = handle(request([stage], flow=q(5, "L/min")))
    fast = handle(request([stage], flow=q(60, "L/min")))
    assert slow["results"]["stages_table"]["rows"][0]["regime"] == "laminar"
    assert fast["results"]["stages_table"]["rows"][0]["regime"] == "turbulent"
    assert not any("interpolated" in w for w in slow["warnings"] + fast["warnings"])


def test_former_source_names_are_read_as_size_source():
    # ``spectrum_source`` (sampling) and ``distribution_source`` (deposition) became
    # ``size_source``; requests, links and saved files with the old names still read.
    for kind, old in (("sampling", "spectrum_source"), ("deposition", "distribution_source")):
        fields = {f["name"]: f for f in describe()["calculations"][kind]["fields"]}
        assert fields["size_source"]["formerly"] == [old]
        assert old not in fields
    text = "d_nm;dN\n500;100\n1000;200\n"
    inputs = {
        "stages": [TUBE],
        "csv_text": text,
        "csv_diameter_column": "d_nm",
        "csv_concentration_column": "dN",
    }
    old = handle({"kind": "sampling", "inputs": {**inputs, "spectrum_source": "csv"}})
    new = handle({"kind": "sampling", "inputs": {**inputs, "size_source": "csv"}})
    assert old["ok"] and "spectrum_table" in old["results"]
    assert old == new
    # the current name wins when both are given
    both = handle(
        {"kind": "sampling", "inputs": {**inputs, "size_source": "none", "spectrum_source": "csv"}}
    )
    assert both["ok"] and "spectrum_table" not in both["results"]
