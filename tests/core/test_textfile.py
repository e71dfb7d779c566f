"""The shared text decoder (``driftdose.textfile``) with files as instruments and spreadsheets
write them: UTF-8 with and without a byte-order mark, UTF-16 LE/BE with a mark, Latin-1 from
older office programs; sizes are the file's bytes.

References: byte-order marks EF BB BF, FF FE, FE FF (The Unicode Standard, ch. 23.8, common
practice); the Latin-1 fallback is the WHATWG Encoding Standard's windows-1252 index, in which
0x80 is U+20AC and the five bytes Windows-1252 leaves undefined (0x81, 0x8D, 0x8F, 0x90,
0x9D) map to the C1 controls of the same number (from memory of the index).
"""

from __future__ import annotations

import codecs
import json

import pytest
from hypothesis import given
from hypothesis import strategies as st

from driftdose.textfile import (
    MAX_BYTES,
    TextFileError,
    decode_text,
    decode_text_json,
    size_text,
)

TEXT = "Größe [µm];dN/dlogDp [1/cm³]\n0,5;1200\n1,0;800\n"


@pytest.mark.parametrize(
    ("data", "encoding", "bom"),
    [
        pytest.param(TEXT.encode("utf-8"), "utf-8", False, id="utf-8"),
        pytest.param(codecs.BOM_UTF8 + TEXT.encode("utf-8"), "utf-8", True, id="utf-8-bom"),
        pytest.param(
            codecs.BOM_UTF16_LE + TEXT.encode("utf-16-le"), "utf-16-le", True, id="utf-16-le"
        ),
        pytest.param(
            codecs.BOM_UTF16_BE + TEXT.encode("utf-16-be"), "utf-16-be", True, id="utf-16-be"
        ),
        pytest.param(TEXT.encode("latin-1"), "windows-1252", False, id="latin-1"),
        pytest.param(TEXT.encode("cp1252"), "windows-1252", False, id="windows-1252"),
    ],
)
def test_each_encoding_gives_the_same_text_and_the_file_size(data, encoding, bom):
    d = decode_text(data)
    assert d.text == TEXT
    assert d.encoding == encoding
    assert d.bom is bom
    assert d.size == len(data)
    assert d.replaced == 0


def test_plain_utf8_has_no_notes_others_say_how_they_were_read():
    assert decode_text(TEXT.encode()).notes == []
    assert "Latin-1" in " ".join(decode_text(TEXT.encode("latin-1")).notes)
    assert "UTF-16" in " ".join(decode_text(codecs.BOM_UTF16_LE + b"a\x00").notes)


def test_latin1_fallback_follows_the_whatwg_windows_1252_index():
    d = decode_text(bytes([0x80, 0x81, 0x8D, 0x8F, 0x90, 0x9D, 0x9F, 0xA0, 0xE4, 0xFF]))
    assert d.text == "€\x81\x8d\x8f\x90\x9dŸ\xa0äÿ"


def test_a_latin1_file_near_the_limit_is_its_own_size():
    """A 4.87 MB Latin-1 file is 4.87 MB, not the size of its UTF-8 re-encoding."""
    data = ("Größe;n\n" + "0,5;1200äöü\n" * 425_000).encode("latin-1")
    assert 4.5 * 2**20 < len(data) <= MAX_BYTES
    d = decode_text(data)
    assert d.size == len(data)
    assert len(d.text.encode("utf-8")) > len(data)  # the reason the old check misread it
    assert size_text(d.size).endswith(" MB")


def test_utf8_mark_with_bytes_that_are_not_utf8_replaces_and_counts_them():
    d = decode_text(codecs.BOM_UTF8 + b"d \xb5m;n\n")
    assert d.text == "d \ufffdm;n\n"
    assert d.replaced == 1
    assert any("replaced" in n for n in d.notes)


def test_odd_length_utf16_replaces_the_last_byte():
    d = decode_text(codecs.BOM_UTF16_LE + "ab".encode("utf-16-le") + b"c")
    assert d.text == "ab\ufffd"
    assert d.replaced == 1


@pytest.mark.parametrize(
    ("data", "words"),
    [
        pytest.param(b"", "empty", id="empty"),
        pytest.param(TEXT.encode("utf-16-le"), "UTF-16 text without a byte-order mark", id="le"),
        pytest.param(TEXT.encode("utf-16-be"), "UTF-16 text without a byte-order mark", id="be"),
        pytest.param(b"\x89PNG\r\n\x1a\n" + bytes(500), "binary", id="png"),
    ],
)
def test_refusals(data, words):
    with pytest.raises(TextFileError, match=words):
        decode_text(data)


def test_size_limit_is_the_files_bytes():
    assert decode_text(b"a" * MAX_BYTES).size == MAX_BYTES
    with pytest.raises(TextFileError, match=r"^The file is 5 MB; the limit is 5 MB\.$"):
        decode_text(b"a" * (MAX_BYTES + 1))
    with pytest.raises(TextFileError, match=r"6\.5 MB; the limit is 5 MB"):
        decode_text(b"a" * int(6.5 * 2**20))


@pytest.mark.parametrize(
    ("size", "text"),
    [(0, "0 bytes"), (1, "1 byte"), (1023, "1023 bytes"), (1024, "1 kB"), (5_106_000, "4.87 MB")],
)
def test_size_text(size, text):
    assert size_text(size) == text


def test_json_form_for_the_page_worker():
    ok = json.loads(decode_text_json(memoryview(TEXT.encode("cp1252"))))
    assert ok["ok"] and ok["text"] == TEXT and ok["encoding"] == "windows-1252"
    assert ok["size"] == len(TEXT.encode("cp1252")) and ok["size_text"].endswith("bytes")
    bad = json.loads(decode_text_json(b"\x00\x01\x02\x03"))
    assert bad == {"ok": False, "message": bad["message"], "size": 4}


@given(st.text(max_size=200))
def test_any_text_round_trips_through_each_marked_encoding(text):
    for mark, codec in (
        (b"", "utf-8"),
        (codecs.BOM_UTF8, "utf-8"),
        (codecs.BOM_UTF16_LE, "utf-16-le"),
        (codecs.BOM_UTF16_BE, "utf-16-be"),
    ):
        try:
            data = mark + text.encode(codec)
        except UnicodeEncodeError:  # lone surrogates cannot be written to a file at all
            return
        if not data or (not mark and "\x00" in text):
            continue
        assert decode_text(data).text == text


@given(st.binary(max_size=300))
def test_any_bytes_decode_or_refuse_with_a_message(data):
    try:
        d = decode_text(data)
    except TextFileError as exc:
        assert exc.message
    else:
        assert d.size == len(data)
        assert isinstance(d.text, str)


def test_sha256_of_the_bytes_for_the_record():
    # FIPS 180-2, appendix B.1: SHA-256("abc")
    abc = "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad"
    assert decode_text(b"abc").sha256 == abc
    assert json.loads(decode_text_json(b"abc"))["sha256"] == abc
    # the hash is of the bytes as picked, not of the decoded text
    assert decode_text(codecs.BOM_UTF8 + b"abc").sha256 != abc
