"""The JSON boundary: describe(), error replies, and that no exception ever crosses it.

The boundary (DEVELOPERS.md, "Architecture"): a reply is ``{"ok": true, ...}`` or
``{"ok": false, "errors": [{"field", "message"}]}``; no exception crosses; a reply never holds
NaN or infinity.
"""

from __future__ import annotations

import json
import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from driftdose import __version__
from driftdose.api import describe, handle, handle_json
from driftdose.api.registry import CALCULATIONS
from driftdose.api.units import UNITS, canonical_unit

FAST = settings(max_examples=100, deadline=None)


def _is_error_reply(reply: dict) -> bool:
    return (
        reply.get("ok") is False
        and set(reply) == {"ok", "errors"}
        and len(reply["errors"]) >= 1
        and all(
            set(e) == {"field", "message"}
            and isinstance(e["field"], str)
            and isinstance(e["message"], str)
            and e["message"]
            for e in reply["errors"]
        )
    )


def _well_formed(reply: dict) -> None:
    assert isinstance(reply, dict)
    json.dumps(reply, allow_nan=False)  # no NaN or infinity anywhere
    if reply["ok"]:
        assert {"results", "curves", "warnings", "sources"} <= set(reply) or "calculations" in reply
    else:
        assert _is_error_reply(reply), reply


# ---------------------------------------------------------------------------------------------
# describe()
# ---------------------------------------------------------------------------------------------


def test_describe_shape() -> None:
    out = describe()
    assert out["ok"] is True
    assert out["version"] == __version__
    assert set(out["calculations"]) == set(CALCULATIONS)
    json.dumps(out, allow_nan=False)
    for name, calc in out["calculations"].items():
        assert isinstance(calc["title"], str) and calc["title"], name
        names = [f["name"] for f in calc["fields"]]
        assert len(names) == len(set(names)), name
        for f in calc["fields"]:
            assert {"name", "label", "kind", "help", "required", "default"} <= set(f)
            if f["kind"] in UNITS:
                assert set(f["default"]) == {"value", "unit"}
                offered = [u["unit"] for u in f["units"]]
                assert f["default"]["unit"] in offered
                for u in f["units"]:
                    assert set(u) == {"unit", "label"}
                    assert canonical_unit(f["kind"], u["unit"]) == u["unit"]
                    assert canonical_unit(f["kind"], u["label"]) == u["unit"]
                assert isinstance(f["range"], str)
            if f["kind"] == "choice":
                values = [c["value"] for c in f["choices"]]
                assert f["default"] in values
                assert all(set(c) == {"value", "label"} for c in f["choices"])


def test_describe_motion_fields() -> None:
    fields = describe()["calculations"]["motion"]["fields"]
    assert [f["name"] for f in fields] == [
        "particle_diameter",
        "diameter_type",
        "particle_density",
        "shape_factor",
        "temperature",
        "pressure",
        "time",
        "reference_distance",
        "initial_velocity",
    ]
    diameter = fields[0]
    assert diameter["default"] == {"value": 100.0, "unit": "nm"}
    assert diameter["range"] == "from 0.5 nm to 1 mm"
    assert [u["label"] for u in diameter["units"]] == ["nm", "\u00b5m"]


def test_handle_describe_equals_describe() -> None:
    assert handle({"kind": "describe"}) == describe()
    assert json.loads(handle_json('{"kind": "describe"}')) == describe()


# ---------------------------------------------------------------------------------------------
# Garbage requests
# ---------------------------------------------------------------------------------------------

GARBAGE = [
    pytest.param(None, "", id="none"),
    pytest.param([], "", id="empty-list"),
    pytest.param([{"kind": "motion"}], "", id="list-of-request"),
    pytest.param("motion", "", id="string"),
    pytest.param(42, "", id="number"),
    pytest.param(math.nan, "", id="nan"),
    pytest.param(True, "", id="bool"),
    pytest.param({}, "kind", id="missing-kind"),
    pytest.param({"inputs": {}}, "kind", id="inputs-without-kind"),
    pytest.param({"kind": "nonsense"}, "kind", id="unknown-kind"),
    pytest.param({"kind": ""}, "kind", id="empty-kind"),
    pytest.param({"kind": None}, "kind", id="null-kind"),
    pytest.param({"kind": 5}, "kind", id="number-kind"),
    pytest.param({"kind": ["motion"]}, "kind", id="list-kind"),
    pytest.param({"kind": {"a": 1}}, "kind", id="object-kind"),
    pytest.param({"kind": "x" * 1_000_000}, "kind", id="huge-kind"),
    pytest.param({"kind": "MOTION"}, "kind", id="wrong-case-kind"),
    pytest.param({"kind": "motion", "inputs": None}, "", id="null-inputs"),
    pytest.param({"kind": "motion", "inputs": []}, "", id="list-inputs"),
    pytest.param({"kind": "motion", "inputs": "d=1"}, "", id="string-inputs"),
    pytest.param({"kind": "motion", "inputs": 3}, "", id="number-inputs"),
    pytest.param(
        {"kind": "motion", "inputs": {"particle_diameter": "9" * 1_000_000}},
        "particle_diameter",
        id="huge-number-string",
    ),
    pytest.param(
        {"kind": "motion", "inputs": {"particle_diameter": "x" * 1_000_000}},
        "particle_diameter",
        id="huge-text",
    ),
    pytest.param(
        {"kind": "motion", "inputs": {"particle_diameter": {"value": 1, "unit": "u" * 10**6}}},
        "particle_diameter",
        id="huge-unit",
    ),
    pytest.param(
        {"kind": "motion", "inputs": {"temperature": {"value": 10**400, "unit": "K"}}},
        "temperature",
        id="int-beyond-float",
    ),
]


@pytest.mark.parametrize(("request_", "field"), GARBAGE)
def test_handle_garbage_gives_error_reply(request_, field: str) -> None:
    reply = handle(request_)
    assert _is_error_reply(reply), reply
    assert reply["errors"][0]["field"] == field
    assert len(reply["errors"][0]["message"]) < 300  # long inputs are not echoed back
    json.dumps(reply, allow_nan=False)


def test_handle_unknown_kind_lists_valid() -> None:
    message = handle({"kind": "nonsense"})["errors"][0]["message"]
    for name in CALCULATIONS:
        assert name in message


def test_handle_missing_inputs_uses_defaults() -> None:
    assert handle({"kind": "motion"})["ok"] is True
    assert handle({"kind": "motion", "inputs": {}})["ok"] is True


def test_handle_internal_error_becomes_reply(monkeypatch) -> None:
    # An unexpected exception inside a calculation becomes an error reply, not a raise.
    motion = CALCULATIONS["motion"]

    def broken(_values):
        raise ZeroDivisionError("boom")

    monkeypatch.setattr(motion, "run", broken)
    reply = handle({"kind": "motion", "inputs": {}})
    assert _is_error_reply(reply)
    assert "ZeroDivisionError" in reply["errors"][0]["message"]


def test_handle_non_finite_result_becomes_error(monkeypatch) -> None:
    motion = CALCULATIONS["motion"]
    monkeypatch.setattr(motion, "run", lambda _v: {"results": {"x": {"si": math.nan}}})
    reply = handle({"kind": "motion", "inputs": {}})
    assert _is_error_reply(reply)


# ---------------------------------------------------------------------------------------------
# handle_json
# ---------------------------------------------------------------------------------------------


@pytest.mark.parametrize(
    "text",
    [
        pytest.param("", id="empty"),
        pytest.param("{", id="truncated"),
        pytest.param("{'kind': 'motion'}", id="single-quotes"),
        pytest.param("kind=motion", id="form-encoded"),
        pytest.param("[" * 100_000 + "]" * 100_000, id="deep-nesting"),
        pytest.param('{"kind": "motion"} trailing', id="trailing-garbage"),
        pytest.param("1" * 5000, id="too-many-digits"),
        pytest.param(None, id="none"),
        pytest.param(42, id="number"),
    ],
)
def test_handle_json_invalid(text) -> None:
    out = handle_json(text)
    reply = json.loads(out)
    assert _is_error_reply(reply)
    assert reply["errors"][0]["message"] == "Request is not valid JSON."


@pytest.mark.parametrize(
    "text",
    [
        pytest.param('{"kind": "motion", "inputs": {"time": NaN}}', id="nan-literal"),
        pytest.param('{"kind": "motion", "inputs": {"time": Infinity}}', id="infinity-literal"),
        pytest.param('{"kind": "motion", "inputs": {"time": 1e999}}', id="overflowing-number"),
        pytest.param("NaN", id="bare-nan"),
        pytest.param("null", id="null"),
        pytest.param('"motion"', id="bare-string"),
        pytest.param('{"kind": "motion", "inputs": {"time": "' + "x" * 10**6 + '"}}', id="huge"),
    ],
)
def test_handle_json_valid_but_bad(text: str) -> None:
    out = handle_json(text)
    assert "NaN" not in out and "Infinity" not in out
    assert _is_error_reply(json.loads(out))


def test_handle_json_round_trip() -> None:
    request = {"kind": "motion", "inputs": {"particle_diameter": {"value": 1, "unit": "µm"}}}
    out = handle_json(json.dumps(request))
    assert json.loads(out) == json.loads(json.dumps(handle(request), allow_nan=False))
    assert '"symbol": "λ"' in out  # ensure_ascii=False: symbols cross as they are
    assert '"unit": "um"' in out  # units cross as codes, labelled by the page


# ---------------------------------------------------------------------------------------------
# Fuzzing: any JSON-like request gives a well-formed reply
# ---------------------------------------------------------------------------------------------

json_scalars = (
    st.none()
    | st.booleans()
    | st.integers(-(10**30), 10**30)
    | st.floats(allow_nan=True, allow_infinity=True)
    | st.text(max_size=30)
)
json_values = st.recursive(
    json_scalars,
    lambda inner: st.lists(inner, max_size=4) | st.dictionaries(st.text(max_size=8), inner),
    max_leaves=12,
)
field_names = st.sampled_from([f.name for f in CALCULATIONS["motion"].FIELDS] + ["unknown", ""])
unit_names = st.sampled_from(
    [u for table in UNITS.values() for u in table] + ["µm", "°C", "", "furlong"]
)
quantities = st.fixed_dictionaries(
    {"value": json_scalars, "unit": unit_names | json_scalars},
)
motion_inputs = st.dictionaries(field_names, quantities | json_values, max_size=9)


@FAST
@given(json_values)
def test_handle_never_raises_on_any_value(request_) -> None:
    _well_formed(handle(request_))


@FAST
@given(motion_inputs)
def test_handle_never_raises_on_motion_inputs(inputs) -> None:
    _well_formed(handle({"kind": "motion", "inputs": inputs}))


@FAST
@given(st.text(max_size=200))
def test_handle_json_never_raises_on_any_text(text: str) -> None:
    reply = json.loads(handle_json(text))
    assert isinstance(reply, dict) and "ok" in reply


@settings(max_examples=40, deadline=None)
@given(
    st.floats(0.5e-9, 1e-3),
    st.sampled_from(["volume_equivalent", "aerodynamic"]),
    st.floats(100.0, 25000.0),
    st.floats(1.0, 5.0),
    st.floats(223.15, 773.15),
    st.floats(10e3, 200e3),
    st.floats(1e-3, 86400.0),
)
def test_handle_valid_inputs_always_finite(d, kind, rho, chi, T, P, t) -> None:
    # Anywhere in the accepted ranges the reply is finite (or a field error for an
    # aerodynamic size whose volume-equivalent size falls below 0.5 nm).
    reply = handle(
        {
            "kind": "motion",
            "inputs": {
                "particle_diameter": d,
                "diameter_type": kind,
                "particle_density": rho,
                "shape_factor": chi,
                "temperature": T,
                "pressure": P,
                "time": t,
            },
        }
    )
    _well_formed(reply)
    if not reply["ok"]:
        assert kind == "aerodynamic" and reply["errors"][0]["field"] == "particle_diameter"
