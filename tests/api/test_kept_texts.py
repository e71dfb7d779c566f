"""File texts kept by the engine between requests (api.kept): the page sends a picked file's
text once and names it by its SHA-256 afterwards.

Checked: a request naming a kept text answers exactly as the request carrying it; the key is
the SHA-256 of the text's UTF-8 bytes (FIPS 180-4, as hashlib computes it); a key the engine
does not hold asks for the text again (``resend``) and changes nothing; hostile ``kept``
entries are refused with the store unchanged; the store holds a bounded number of texts.
"""

from __future__ import annotations

import copy
import hashlib
import json

import pytest

from driftdose import api, textfile
from driftdose.api import kept

PERIODS = [
    {"label": "Background", "kind": "background", "start": "08:00", "end": "08:10"},
    {"label": "Task", "kind": "task", "start": "08:20", "end": "09:30"},
]


def logged(level: int = 5000) -> str:
    """An invented 2-h file at 10 s with one number column."""
    lines = ["Invented logger for tests", "Time,Number (1/cm3)"]
    for k in range(0, 7200, 10):
        n = level + 3000 * (1200 <= k < 5400) + (k * 37) % 101
        lines.append(f"2026-03-10 {8 + k // 3600:02d}:{k % 3600 // 60:02d}:{k % 60:02d},{n}")
    return "\n".join(lines) + "\n"


def request(text: str | None, **extra) -> dict:
    inputs = {
        "quantity_columns": [{"column": "Number", "quantity": "number", "unit": ""}],
        "periods": PERIODS,
        "background_method": "marked_mean",
    }
    if text is not None:
        inputs["series_text"] = text
    return {"kind": "shift", "inputs": inputs, **extra}


@pytest.fixture(autouse=True)
def empty_store():
    kept._texts.clear()
    yield
    kept._texts.clear()


def test_a_named_text_answers_as_the_text_itself():
    text = logged()
    first = api.handle(request(text, keep=True))
    assert first["ok"], first.get("errors")
    key = hashlib.sha256(text.encode("utf-8")).hexdigest()
    assert first["kept"] == {"series_text": key}
    again = api.handle(request(None, kept={"series_text": key}))
    plain = api.handle(request(text))
    assert again == plain
    assert "kept" not in plain  # only a request that asks gets keys
    # through the worker's JSON door too, with the periods moved
    moved = request(None, kept={"series_text": key}, keep=True)
    moved["inputs"]["periods"] = [dict(PERIODS[0]), {**PERIODS[1], "end": "09:40"}]
    reply = json.loads(api.handle_json(json.dumps(moved)))
    assert reply["ok"] and reply["kept"] == {}  # nothing new carried, nothing new kept
    assert reply["results"]["tasks"]["rows"][1]["duration_s"] == 80 * 60


def test_an_unknown_key_asks_for_the_text_and_changes_nothing():
    text = logged()
    api.handle(request(text, keep=True))
    before = dict(kept._texts)
    unknown = hashlib.sha256(b"another file").hexdigest()
    reply = api.handle(request(None, kept={"series_text": unknown}))
    assert reply["ok"] is False
    assert reply["resend"] == ["series_text"]
    assert reply["errors"][0]["field"] == "series_text"
    assert dict(kept._texts) == before


@pytest.mark.parametrize(
    "named",
    [
        "abc",
        ["series_text"],
        {"__proto__": "0" * 64},
        {"periods": "0" * 64},
        {"series_text": "0" * 63},
        {"series_text": "G" * 64},
        {"series_text": 12},
        {"series_text": {"value": "0" * 64}},
        {f"f{i}": "0" * 64 for i in range(9)},
    ],
)
def test_hostile_kept_entries_are_refused_with_nothing_changed(named):
    text = logged()
    key = api.handle(request(text, keep=True))["kept"]["series_text"]
    before = dict(kept._texts)
    req = request(None, kept=named)
    sent = copy.deepcopy(req)
    reply = api.handle(req)
    assert reply["ok"] is False and "resend" not in reply
    assert req == sent
    assert dict(kept._texts) == before
    assert api.handle(request(None, kept={"series_text": key}))["ok"]


def test_the_store_keeps_the_newest_texts_only():
    keys = []
    for level in range(kept.KEPT_TEXTS + 1):
        keys.append(api.handle(request(logged(4000 + level), keep=True))["kept"]["series_text"])
    assert len(set(keys)) == kept.KEPT_TEXTS + 1
    oldest = api.handle(request(None, kept={"series_text": keys[0]}))
    assert oldest["resend"] == ["series_text"]
    newest = api.handle(request(None, kept={"series_text": keys[-1]}))
    assert newest["ok"]


def test_a_failed_request_still_keeps_its_text():
    # typing a period wrongly must not make the page send the file again next time
    text = logged()
    bad = request(text, keep=True)
    bad["inputs"]["periods"] = [{**PERIODS[0], "end": "25:00"}]
    reply = api.handle(bad)
    assert reply["ok"] is False and reply["errors"][0]["field"] == "periods.0.end"
    key = reply["kept"]["series_text"]
    assert api.handle(request(None, kept={"series_text": key}))["ok"]


def test_a_file_kept_as_it_is_decoded_is_named_by_the_first_request():
    text = logged()
    # a byte-order mark: the key is that of the text, not of the file
    raw = ("\ufeff" + text).encode("utf-8")
    plain = json.loads(textfile.decode_text_json(raw, textfile.MAX_BYTES, "day.csv"))
    reply = json.loads(kept.decode_kept_json(raw, textfile.MAX_BYTES, "day.csv"))
    key = hashlib.sha256(text.encode("utf-8")).hexdigest()  # FIPS 180-4, as hashlib computes it
    assert reply.pop("kept") == key
    assert reply == plain, "the decoder's reply is unchanged"
    assert reply["sha256"] == hashlib.sha256(raw).hexdigest() != key
    named = api.handle(request(None, kept={"series_text": key}))
    assert named == api.handle(request(text))


def test_a_refused_file_is_not_kept():
    reply = json.loads(kept.decode_kept_json(None, 1000, "big.csv", 5000))
    assert reply["ok"] is False and "kept" not in reply
    assert not kept._texts
    binary = json.loads(kept.decode_kept_json(b"\x00\x01" * 3000, 100_000, "x.bin"))
    assert binary["ok"] is False and "kept" not in binary
    assert not kept._texts


@pytest.mark.parametrize(
    "raw",
    [
        "Zeit;Größe\n08:00;1,5\n".encode(),  # UTF-8 as it stands: the file's own SHA-256
        "Zeit;Größe\n08:00;1,5\n".encode("latin-1"),  # read as Latin-1
        "Zeit;Größe\n08:00;1,5\n".encode("utf-16"),  # with its byte-order mark
    ],
)
def test_the_key_of_a_decoded_file_is_always_that_of_its_text(raw):
    reply = json.loads(kept.decode_kept_json(raw, textfile.MAX_BYTES, "f.csv"))
    assert reply["kept"] == hashlib.sha256(reply["text"].encode("utf-8")).hexdigest()
    assert kept._texts[reply["kept"]] == reply["text"]
