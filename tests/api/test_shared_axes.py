"""Replies send an x array shared by several curves once (``curves["axes"]``), and every
reader (CSV export, command line) finds each curve's x values through ``export.curve_x``."""

from __future__ import annotations

import copy
import json

import pytest

from driftdose import api, export

# the heaviest request of each calculation that draws curves on a shared axis
MODES = [
    {
        "basis": "count",
        "median": {"value": 40, "unit": "nm"},
        "gsd": 1.8,
        "concentration": {"value": 1e5, "unit": "1/cm3"},
    },
    {
        "basis": "mass",
        "median": {"value": 5, "unit": "um"},
        "gsd": 2.5,
        "concentration": {"value": 1, "unit": "mg/m3"},
    },
]
REQUESTS = {
    "motion": {},
    "deposition": {"modes": MODES, "route": "mouth_breather"},
    "sampling": {
        "stages": [
            {"type": "tube", "length": {"value": 2, "unit": "m"}},
            {"type": "cyclone", "curve": "iso7708_respirable"},
        ],
        "target": "respirable",
    },
    "burden": {"modes": MODES, "working_years": 2},
}
SHARED = {"motion": 2, "deposition": 8, "sampling": 4, "burden": 18}  # curves per shared axis


def _reply(kind: str) -> dict:
    reply = api.handle({"kind": kind, "inputs": REQUESTS[kind]})
    assert reply["ok"], reply
    return reply


def _x_lists(node, out: list) -> list:
    """Every x array of the curves: own ``x`` lists, the shared axes, ``x_aerodynamic``."""
    if isinstance(node, list):
        for v in node:
            _x_lists(v, out)
    elif isinstance(node, dict):
        for key, v in node.items():
            if key == "axes":
                out.extend(v.values())
            elif key in ("x", "x_aerodynamic") and isinstance(v, list):
                out.append(v)
            else:
                _x_lists(v, out)
    return out


def _expanded(curves):
    """The curves with every axis name replaced by a copy of its list (the former shape)."""
    axes = curves.get("axes", {})

    def walk(node):
        if isinstance(node, dict):
            out = {k: walk(v) for k, v in node.items() if k != "axes"}
            if isinstance(node.get("x"), str):
                out["x"] = list(axes[node["x"]])
            return out
        if isinstance(node, list):
            return [walk(v) for v in node]
        return node

    return walk(curves)


@pytest.mark.parametrize("kind", sorted(REQUESTS))
def test_no_x_array_is_sent_twice(kind):
    reply = _reply(kind)
    lists = [json.dumps(x) for x in _x_lists(reply["curves"], []) if len(x) > 2]
    assert lists and len(lists) == len(set(lists)), kind
    # every named axis exists and has as many values as each curve that names it
    curves = reply["curves"]
    named = []

    def walk(node):
        if isinstance(node, dict):
            if isinstance(node.get("x"), str):
                named.append(node["x"])
                assert len(curves["axes"][node["x"]]) == len(node["y"]), kind
            if isinstance(node.get("x_aerodynamic"), str):
                named.append(node["x_aerodynamic"])
            for key, value in node.items():
                if key != "axes":
                    walk(value)
        elif isinstance(node, list):
            for value in node:
                walk(value)

    walk(curves)
    assert len(named) >= SHARED[kind]
    assert set(named) == set(curves["axes"])  # no axis sent that no curve names


def test_deposition_reply_shrinks_by_the_repeats():
    reply = _reply("deposition")
    size = len(json.dumps(reply))
    former = len(json.dumps({**reply, "curves": _expanded(reply["curves"])}))
    # an axis named by n curves was sent n times in the former shape: n - 1 copies are saved
    # (less the names and the "axes" key: a few hundred characters)
    curves = reply["curves"]
    named = [c["x"] for c in (*curves["deposition"].values(), curves["distribution"]["number"])]
    named.append(curves["distribution"]["mass"]["x"])
    saved = sum(
        (named.count(name) - 1) * len(json.dumps(axis)) for name, axis in curves["axes"].items()
    )
    assert saved > 4 * 2000  # several copies of axes of over 100 sizes
    assert former - size > saved - 300, (size, former, saved)


@pytest.mark.parametrize("kind", sorted(REQUESTS))
def test_curves_csv_is_the_same_as_with_the_arrays_repeated(kind):
    reply = _reply(kind)
    expanded = {**reply, "curves": _expanded(reply["curves"])}
    assert "axes" in reply["curves"] and "axes" not in expanded["curves"]
    text = export.curves_csv(reply)
    assert text == export.curves_csv(expanded)
    assert text.count("\n") > 200


@pytest.mark.parametrize(
    ("curves", "curve"),
    [
        ({"axes": {"d": [1.0, 2.0]}}, {"x": "e", "y": [1.0, 2.0]}),  # unknown name
        ({"axes": {"d": [1.0, 2.0]}}, {"x": "__proto__", "y": [1.0, 2.0]}),
        ({"axes": {"d": [1.0, 2.0]}}, {"x": "constructor", "y": [1.0, 2.0]}),
        ({"axes": [[1.0, 2.0]]}, {"x": "0", "y": [1.0, 2.0]}),  # axes not a mapping
        ({"axes": {"d": "1,2"}}, {"x": "d", "y": [1.0, 2.0]}),  # axis not a list
        ({"axes": {"d": {"x": [1.0]}}}, {"x": "d", "y": [1.0]}),
        ([], {"x": "d", "y": [1.0]}),  # curves not a mapping
        ({}, {"x": 3, "y": [1.0]}),
        ({}, {"x": None, "y": [1.0]}),
    ],
)
def test_curve_x_gives_none_for_anything_but_a_list_or_a_known_axis(curves, curve):
    assert export.curve_x(curves, curve) is None


def test_curve_x_own_list_and_named_axis():
    axes = {"axes": {"d": [1.0, 2.0]}}
    assert export.curve_x(axes, {"x": [3.0], "y": [1.0]}) == [3.0]
    assert export.curve_x(axes, {"x": "d", "y": [1.0, 2.0]}) == [1.0, 2.0]


def test_hostile_axes_in_an_exported_reply_are_answered_not_raised():
    reply = _reply("deposition")
    inputs = REQUESTS["deposition"]
    hostile = [
        {"axes": "diameter", "c": {"x": "diameter", "y": [1.0]}},
        {"axes": {"diameter": [1.0, 2.0]}, "c": {"x": "diameter", "y": [1.0]}},  # lengths differ
        {"axes": {"diameter": ["=cmd", 2.0]}, "c": {"x": "diameter", "y": [1.0, 2.0]}},
        {"axes": {"diameter": [[1.0], 2.0]}, "c": {"x": "diameter", "y": [1.0, 2.0]}},
        {"axes": None, "c": {"x": "diameter", "y": [1.0]}},
    ]
    for curves in hostile:
        request = {
            "calculation": "deposition",
            "part": "curves",
            "inputs": inputs,
            "reply": {**reply, "curves": curves},
        }
        before = copy.deepcopy(request)
        out = api.handle({"kind": "export", "inputs": request})
        assert isinstance(out, dict) and "ok" in out
        assert request == before  # nothing changed
        if out["ok"]:
            assert "=cmd" not in out["text"].replace("'=cmd", "")
