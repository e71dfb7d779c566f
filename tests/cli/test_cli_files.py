"""Files from instruments and spreadsheets on the command line: the CLI reads them with the
core's decoder (``driftdose.textfile``), the same one the page's worker uses, so every reply
equals the api's reply for the text that decoder gives; sizes are the file's bytes.
"""

from __future__ import annotations

import codecs
import json

import pytest

from driftdose import api, cli
from driftdose.textfile import decode_text

SPECTRUM = (
    "sep=;\n"
    "Instrument;mobility sizer (invented)\n"
    "Größe [nm];dN/dlogDp [1/cm³]\n"
    "10,5;1200,5\n"
    "21,0;800\n"
    "42,0;150,25\n"
)
COLUMNS = ["--csv-diameter-column", "Größe [nm]", "--csv-concentration-column", "2"]


def run(capsys, *argv: str) -> tuple[int, str, str]:
    code = cli.main(list(argv))
    out, err = capsys.readouterr()
    return code, out, err


def api_reply(data: bytes) -> dict:
    inputs = {
        "distribution_source": "csv",
        "csv_text": decode_text(data).text,
        "csv_diameter_column": "Größe [nm]",
        "csv_concentration_column": "2",
    }
    return api.handle({"kind": "deposition", "inputs": inputs})


@pytest.mark.parametrize(
    "encode",
    [
        pytest.param(lambda t: t.encode("utf-8"), id="utf-8"),
        pytest.param(lambda t: codecs.BOM_UTF8 + t.encode("utf-8"), id="utf-8-bom"),
        pytest.param(lambda t: codecs.BOM_UTF16_LE + t.encode("utf-16-le"), id="utf-16-le"),
        pytest.param(lambda t: codecs.BOM_UTF16_BE + t.encode("utf-16-be"), id="utf-16-be"),
        pytest.param(lambda t: t.replace("\n", "\r\n").encode("latin-1"), id="latin-1-crlf"),
    ],
)
def test_spectrum_in_each_encoding_gives_the_same_reply(capsys, tmp_path, encode):
    path = tmp_path / "spectrum.csv"
    path.write_bytes(encode(SPECTRUM))
    code, out, err = run(
        capsys, "deposition", "--spectrum", str(path), *COLUMNS, "--format", "json"
    )
    assert code == 0, err
    reply = json.loads(out)
    assert reply == api_reply(path.read_bytes())
    reference = api_reply(SPECTRUM.encode("utf-8"))
    assert reply["results"] == reference["results"]  # the encoding changes nothing


def test_latin1_file_near_the_limit_is_read(capsys, tmp_path):
    """A 4.87 MB Latin-1 file is within the 5 MB limit (it was refused as "13.9 MB")."""
    rows = "".join(
        f"{10 + i * 0.01:.2f};{100 + i % 7};Bemerkung {'äöüß' * 58}\n" for i in range(20_000)
    )
    data = ("Größe [nm];n;Notiz\n" + rows).encode("latin-1")
    assert 4.8 * 2**20 < len(data) <= 5 * 2**20
    path = tmp_path / "big-latin1.csv"
    path.write_bytes(data)
    code, _, err = run(capsys, "deposition", "--spectrum", str(path), *COLUMNS)
    assert code == 0, err


def test_file_over_the_limit_is_named_with_its_own_size(capsys, tmp_path):
    path = tmp_path / "big.csv"
    path.write_bytes(("ä" * (5 * 2**20 + 100)).encode("latin-1"))
    code, out, err = run(capsys, "deposition", "--spectrum", str(path))
    assert code == 2 and out == ""
    assert err == f"csv_text: {path} is 5 MB; the limit is 5 MB.\n"


def test_utf16_without_mark_refused_in_one_line(capsys, tmp_path):
    path = tmp_path / "utf16.csv"
    path.write_bytes(SPECTRUM.encode("utf-16-le"))
    code, _, err = run(capsys, "deposition", "--spectrum", str(path), *COLUMNS)
    assert code == 2
    assert err.count("\n") == 1 and "UTF-16 text without a byte-order mark" in err


def test_utf16_inputs_file_is_read(capsys, tmp_path):
    path = tmp_path / "request.json"
    text = json.dumps({"kind": "motion", "inputs": {"time": {"value": "3", "unit": "min"}}})
    path.write_bytes(codecs.BOM_UTF16_LE + text.encode("utf-16-le"))
    code, out, err = run(capsys, "motion", "--input", str(path), "--format", "json")
    assert code == 0, err
    assert json.loads(out) == api.handle(json.loads(text))


def test_quoted_thousands_refused_with_line(capsys, tmp_path):
    path = tmp_path / "thousands.csv"
    path.write_text('diameter_nm,n\n10,"1,000"\n20,"2,000"\n', encoding="utf-8")
    code, out, err = run(capsys, "deposition", "--spectrum", str(path), "--csv-diameter-column",
                         "1", "--csv-concentration-column", "2")  # fmt: skip
    assert code == 2 and out == ""
    assert err.startswith(
        "csv_text: Line 2: the concentration cell '1,000' (column 2) is ambiguous"
    )
    reply = api.handle(
        {
            "kind": "deposition",
            "inputs": {"distribution_source": "csv", "csv_text": path.read_text()},
        }
    )
    assert err == "".join(f"{e['field']}: {e['message']}\n" for e in reply["errors"])


@pytest.mark.parametrize("given", ["1_000nm", "1_000 nm", "1_0.5um"])
def test_underscore_number_refused_as_the_page_refuses_it(capsys, given):
    code, _, err = run(capsys, "motion", "--particle-diameter", given)
    assert code == 2
    value = given.removesuffix("nm").removesuffix("um").strip()
    page = api.handle(
        {"kind": "motion", "inputs": {"particle_diameter": {"value": value, "unit": "nm"}}}
    )
    assert not page["ok"]
    assert err == f"particle_diameter: {page['errors'][0]['message']}\n"
    assert "must be a number" in err
