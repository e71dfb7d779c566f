"""Replies written with kept array texts (api.encoding) are the bytes json.dumps writes.

No published values here: the reference is ``json.dumps`` of the same reply (the standard
library), and a fresh computation with nothing kept.
"""

from __future__ import annotations

import copy
import json
import math

import pytest

from driftdose import api
from driftdose.api import encoding
from driftdose.api.encoding import KeptArray, encode_reply, kept_array
from driftdose.compose import deposition as compose_deposition
from driftdose.compose import overlay

DEFAULT = {
    "modes": [
        {
            "basis": "count",
            "median": {"value": "50", "unit": "nm"},
            "gsd": "1.8",
            "concentration": {"value": "10000", "unit": "1/cm3"},
        }
    ],
}
TWO_MODES = {
    "modes": [
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
    ],
    "shape_factor": {"value": 1.5, "unit": "1"},
    "route": "mouth_breather",
}
NARROW = {  # far tails of the overlay underflow to 0.0
    "modes": [
        {
            "basis": "count",
            "median": {"value": "200", "unit": "nm"},
            "gsd": "1.1",
            "concentration": {"value": "100", "unit": "1/cm3"},
        }
    ],
}


def _plain(request: dict) -> str:
    """The reply as json.dumps writes it, every array written afresh."""
    return json.dumps(api.handle(request), allow_nan=False, ensure_ascii=False)


@pytest.mark.parametrize("inputs", [DEFAULT, TWO_MODES, NARROW], ids=["one", "two", "narrow"])
def test_replies_are_the_bytes_json_dumps_writes(inputs):
    # density edits (the overlay of one count mode stays, the axes always), then back to a
    # density seen before, then other edits: each reply equals json.dumps of the same reply
    for density in ("1", "1.5", "2", "1", "2.5", "1.5"):
        for extra in ({}, {"shape_factor": {"value": "2", "unit": "1"}}, {"model": "simplified"}):
            request = {
                "kind": "deposition",
                "inputs": {**inputs, "particle_density": {"value": density, "unit": "g/cm3"}},
            }
            request["inputs"].update(extra)
            text = api.handle_json(json.dumps(request))
            assert text == _plain(request)
            assert json.loads(text)["ok"] is True


def test_an_edit_of_the_density_reuses_the_axes_and_the_overlay_of_one_count_mode():
    def reply(density: str) -> dict:
        inputs = {**DEFAULT, "particle_density": {"value": density, "unit": "g/cm3"}}
        return api.handle({"kind": "deposition", "inputs": inputs})

    a, b = reply("1.3"), reply("2.9")
    curves_a, curves_b = a["curves"], b["curves"]
    for name in ("diameter", "overlay_diameter"):
        assert isinstance(curves_b["axes"][name], KeptArray)
        assert curves_b["axes"][name].text is curves_a["axes"][name].text
    for weight in ("number", "mass"):
        y_a, y_b = curves_a["distribution"][weight]["y"], curves_b["distribution"][weight]["y"]
        assert y_b.text is y_a.text  # written once
        assert y_b == y_a
    # the deposition curves changed with the density: written afresh
    assert curves_a["deposition"]["AI"]["y"] != curves_b["deposition"]["AI"]["y"]


def _reply_with(array: list, other: object = "text") -> dict:
    return {
        "ok": True,
        "results": {"label": other},
        "curves": {"axes": {"diameter": array}, "x_label": other, "deep": {"a": {"b": array}}},
    }


def test_a_string_that_imitates_a_mark_makes_the_reply_written_plainly():
    array = kept_array([1.0, 2.5, 3e-7])
    for imitation in (encoding._MARK + "0", encoding._MARK + "1", encoding._MARK + "x"):
        for where in ("results", "curves"):
            reply = _reply_with(array)
            if where == "results":
                reply["results"]["label"] = imitation
            else:
                reply["curves"]["x_label"] = imitation
            before = copy.deepcopy(reply)
            text = encode_reply(reply)
            assert text == json.dumps(before, allow_nan=False, ensure_ascii=False)
            assert reply == before  # nothing left changed
            assert reply["curves"]["axes"]["diameter"] is array


def test_a_kept_list_changed_after_it_was_made_is_written_afresh():
    array = kept_array([1.0, 2.0, 3.0])
    other = kept_array([1.0, 2.0, 3.0])
    array[1] = 7.0
    other.append(4.0)
    for changed in (array, other):
        reply = _reply_with(changed)
        assert encode_reply(reply) == json.dumps(reply, allow_nan=False, ensure_ascii=False)
    assert json.loads(encode_reply(_reply_with(array)))["curves"]["axes"]["diameter"] == [
        1.0,
        7.0,
        3.0,
    ]


def test_kept_arrays_are_fresh_lists_with_the_same_numbers():
    values = (1e-9, 2.5e-7, 1e-4)
    a = kept_array(values, 1e6)
    b = kept_array(values, 1e6)
    assert a == b == [v * 1e6 for v in values]
    assert a is not b
    a[0] = 99.0  # changing one list changes neither the other nor the kept text
    assert kept_array(values, 1e6) == [v * 1e6 for v in values]
    assert json.loads(kept_array(values, 1e6).text) == [v * 1e6 for v in values]
    assert kept_array(values) == list(values)  # scale 1: the values themselves


def test_negative_zero_is_never_written_as_a_kept_zero():
    plain = kept_array([0.0, 1.0])
    assert isinstance(plain, KeptArray)
    negative = kept_array([-0.0, 1.0])
    assert not isinstance(negative, KeptArray)
    assert math.copysign(1.0, negative[0]) < 0.0
    reply = _reply_with(negative)
    assert "[-0.0, 1.0]" in encode_reply(reply)


def test_nan_is_refused_as_json_dumps_refuses_it():
    array = kept_array([1.0, math.nan])
    assert array.text == ""
    with pytest.raises(ValueError):
        encode_reply(_reply_with(array))
    # the boundary answers with the field-free error of a reply that cannot be sent
    reply = _reply_with(kept_array([math.inf]))
    with pytest.raises(ValueError):
        encode_reply(reply)


def test_only_the_last_arrays_are_kept():
    for i in range(encoding.KEPT_ARRAYS + 5):
        kept_array([float(i), 0.5])
    assert len(encoding._kept) == encoding.KEPT_ARRAYS


def test_overlays_kept_by_shape_equal_a_fresh_computation():
    # the composer keeps the overlay's shape per (relative amounts, medians, GSDs); every
    # change must give what the distribution's own density gives, and what a computation with
    # nothing kept gives to the last bit
    from driftdose.compose.aerosol import ModeSpec, aerosol_from_modes
    from driftdose.deposition import REFERENCE_WORKER
    from driftdose.diameters import ParticleDescription

    cases = []
    for density in (1000.0, 1700.0, 3000.0, 1000.0):
        for chi in (1.0, 1.8):
            desc = ParticleDescription(density, chi, "material")
            one = (ModeSpec("number", 50e-9, "volume_equivalent", 1.8, 1e10),)
            two = (
                ModeSpec("number", 40e-9, "volume_equivalent", 1.8, 1e11),
                ModeSpec("mass", 5e-6, "aerodynamic", 2.5, 1e-6),
            )
            cases += [aerosol_from_modes(one, desc), aerosol_from_modes(two, desc)]
    for aerosol in cases:
        out = compose_deposition.compose_deposition(aerosol, REFERENCE_WORKER, 8 * 3600.0)
        dist = aerosol.distribution
        for w in ("number", "mass"):
            own = [dist.density_per_ln_d(x, w) for x in out.overlay_sizes]
            assert list(out.overlay[w]) == pytest.approx([y / max(own) for y in own], rel=1e-13)
        kept = dict(out.overlay)
        overlay._mode_overlay.cache_clear()
        overlay._overlay_factors.cache_clear()
        fresh = compose_deposition.compose_deposition(aerosol, REFERENCE_WORKER, 8 * 3600.0)
        assert fresh.overlay == kept


@pytest.mark.parametrize(
    ("kind", "field", "values", "unit"),
    [
        ("motion", "particle_diameter", ["100", "150", "220", "100"], "nm"),
        ("motion", "particle_density", ["1", "2.5"], "g/cm3"),
        ("sampling", "particle_density", ["1", "2.5", "1"], "g/cm3"),
    ],
)
def test_motion_and_sampling_replies_are_the_bytes_json_dumps_writes(kind, field, values, unit):
    for value in values:
        request = {"kind": kind, "inputs": {field: {"value": value, "unit": unit}}}
        text = api.handle_json(json.dumps(request))
        assert text == _plain(request)
        reply = json.loads(text)
        assert reply["ok"] is True, reply
        assert len(reply["curves"]["axes"]["diameter"]) > 100
