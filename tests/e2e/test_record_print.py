"""The printed record as a PDF, read back with poppler-utils (pdfinfo, pdftotext, pdftoppm).

For each calculation: at most 4 pages on A4 and on US Letter; "page x of y", the date and the
tool version on every page; survey details, every input with its unit, the compact result
tables, warnings, sources, cautions, the invented-data mark and imported files with their
SHA-256; the link at the end, read back from its QR code, reproduces the inputs; the inputs
fingerprint is the one of the saved inputs file. Page images land in test-artifacts/.
"""

from __future__ import annotations

import hashlib
import json
import math
import re
import shutil
import subprocess
import urllib.parse
from datetime import UTC, datetime
from pathlib import Path

import pytest

from driftdose import api

from .conftest import ARTIFACTS, wait_ready

pytestmark = [
    pytest.mark.e2e,
    pytest.mark.skipif(
        not all(shutil.which(t) for t in ("pdfinfo", "pdftotext", "pdftoppm")),
        reason="poppler-utils (pdfinfo, pdftotext, pdftoppm) not installed; .ci/setup installs it",
    ),
]

MAX_PAGES = 4
VERSION = api.describe()["version"]
SURVEY = {
    "Site": "Invented works, hall 3",
    "Area or workstation": "Welding bay 2",
    "Task or process": "MIG welding of mild steel",
    "Worker role (no names needed)": "Welder",
    "Instrument": "Invented particle sizer",
    "Serial number": "SN-0042",
    "Sample or file IDs": "S-17, S-18",
    "Assessor": "A. Assessor",
}


def _all_ready(page) -> None:
    wait_ready(page)
    page.wait_for_function(
        "() => [...document.querySelectorAll('.panel')].every(p =>"
        " Number(p.dataset.updates || 0) >= 1 && !p.hasAttribute('aria-busy'))"
    )


def _settle(page, pid: str, before: int) -> None:
    page.wait_for_function(
        "([pid, n]) => { const s = document.getElementById('panel-' + pid);"
        " return Number(s.dataset.updates || 0) > n && !s.hasAttribute('aria-busy'); }",
        arg=[pid, before],
    )


def _updates(page, pid: str) -> int:
    return int(page.locator(f"#panel-{pid}").get_attribute("data-updates") or 0)


def _fill_survey(page) -> None:
    page.locator("#survey summary").click()
    for label, value in SURVEY.items():
        page.get_by_label(label, exact=True).fill(value)
    page.get_by_label("Calibration date", exact=True).fill("2026-10-05")


def _fingerprint(kind: str, inputs: dict, survey: dict) -> str:
    """The fingerprint as README describes it, computed independently of the page."""
    text = json.dumps(
        {"kind": kind, "inputs": inputs, "survey": survey},
        sort_keys=True,
        separators=(",", ":"),
        ensure_ascii=False,
    )
    return hashlib.sha256(text.encode("utf-8")).hexdigest()[:12]


def _saved(page) -> dict:
    with page.expect_download() as info:
        page.get_by_role("button", name="Save inputs (JSON)").click()
    return json.loads(Path(info.value.path()).read_text(encoding="utf-8"))


def _print(page, tmp_path: Path, name: str, fmt: str) -> tuple[Path, list[str]]:
    """Print the record to PDF; return the file and the text of each page."""
    page.evaluate("() => window.dispatchEvent(new Event('beforeprint'))")
    path = tmp_path / f"{name}-{fmt}.pdf"
    path.write_bytes(page.pdf(format=fmt))
    info = subprocess.run(["pdfinfo", str(path)], capture_output=True, text=True, check=True)
    count = int(re.search(r"^Pages:\s+(\d+)", info.stdout, re.M).group(1))
    pages = []
    for n in range(1, count + 1):
        done = subprocess.run(
            ["pdftotext", "-layout", "-f", str(n), "-l", str(n), str(path), "-"],
            capture_output=True,
            text=True,
            check=True,
        )
        pages.append(done.stdout)
    return path, pages


def _images(path: Path, name: str, dpi: int = 70) -> list[Path]:
    """Render every page to PNG in test-artifacts/ (looked at by a person)."""
    ARTIFACTS.mkdir(exist_ok=True)
    for old in ARTIFACTS.glob(f"{name}-*.png"):
        old.unlink()
    subprocess.run(
        ["pdftoppm", "-r", str(dpi), "-png", str(path), str(ARTIFACTS / name)], check=True
    )
    return sorted(ARTIFACTS.glob(f"{name}-*.png"))


def _check_every_page(pages: list[str], fingerprint: str) -> None:
    today = datetime.now(UTC).strftime("%Y-%m-%d")
    for n, text in enumerate(pages, start=1):
        assert f"page {n} of {len(pages)}" in text, n
        assert f"Drift & Dose {VERSION}" in text, n
        assert f"printed {today}" in text, n
        assert f"inputs {fingerprint}" in text, n


def _check_common(text: str) -> None:
    for needed in (
        "screening record",
        "Cautions",
        "not a substitute for measurement or for professional judgment",
        "Local regulations, exposure limits and licensed practice take precedence",
        "Inputs",
        "Valid range",
        "Results",
        "Models, sources and validity",
        "Link to these inputs",
        *SURVEY.values(),
        "2026-10-05",
    ):
        assert needed in text, needed


def _qr_text(pdf: Path, page_number: int) -> str:
    """Decode the QR code on a printed page (zxing-cpp, an independent reader)."""
    zxingcpp = pytest.importorskip("zxingcpp")
    np = pytest.importorskip("numpy")
    done = subprocess.run(
        [
            "pdftoppm",
            "-r",
            "200",
            "-gray",
            "-f",
            str(page_number),
            "-l",
            str(page_number),
            str(pdf),
        ],
        capture_output=True,
        check=True,
    )
    # PGM (P5): header "P5\n<w> <h>\n255\n", then one byte a pixel
    head = re.match(rb"P5\s+(\d+)\s+(\d+)\s+(\d+)\s", done.stdout)
    width, height = int(head.group(1)), int(head.group(2))
    pixels = np.frombuffer(done.stdout[head.end() :], dtype=np.uint8)[: width * height]
    found = zxingcpp.read_barcodes(pixels.reshape(height, width))
    codes = [r.text for r in found if r.format == zxingcpp.BarcodeFormat.QRCode]
    assert len(codes) == 1, f"QR codes found: {len(codes)}"
    return codes[0]


def _printed_link(pdf: Path) -> str:
    """The link as printed in small type, its line breaks removed."""
    text = subprocess.run(
        ["pdftotext", str(pdf), "-"], capture_output=True, text=True, check=True
    ).stdout
    start = text.index("Link to these inputs")
    link = re.search(r"http://\S+(?:\n\S+)*", text[start:]).group(0)
    return re.sub(r"\s+", "", link)


def test_motion_record_fits_carries_survey_qr_and_fingerprint(page, base_url, tmp_path):
    page.goto(base_url + "#v=1&panel=motion")
    _all_ready(page)
    _fill_survey(page)
    panel = page.locator("#panel-motion")
    before = _updates(page, "motion")
    panel.get_by_label("Time", exact=True).fill("5")
    panel.get_by_label("Time unit").select_option("min")
    _settle(page, "motion", before)
    saved = _saved(page)
    expected = _fingerprint("motion", saved["panels"]["motion"], saved["survey"])
    assert saved["fingerprints"]["motion"] == expected
    assert saved["survey"]["site"] == SURVEY["Site"]
    assert saved["survey"]["calibration"] == "2026-10-05"

    for fmt in ("A4", "Letter"):
        pdf, pages = _print(page, tmp_path, "motion", fmt)
        _images(pdf, f"record-motion-{fmt}")
        assert 1 <= len(pages) <= MAX_PAGES, (fmt, len(pages))
        _check_every_page(pages, expected)
        text = "\n".join(pages)
        _check_common(text)
        assert "How it moves" in text
        # every input with its unit and valid range; results with units
        assert re.search(r"Time\s+5\s+min\s+from 1 ms to 24 h", text), text
        assert re.search(r"Air temperature\s+20\s+°C", text)
        assert re.search(r"Diffusion coefficient D\s+[\d.]+ × 10⁻[⁰¹²³⁴⁵⁶⁷⁸⁹]+\s+m²/s", text)
        assert "Kim, J. H." in text
        assert "Invented demo data" not in text
    link = _qr_text(pdf, len(pages))
    assert link == _printed_link(pdf)
    assert link.startswith(base_url + "#v=1&panel=motion")
    assert len(link) < 1000  # only this calculation's inputs and the survey
    state = urllib.parse.parse_qs(link.split("#", 1)[1])
    assert state["motion.time"] == ["5~min"]
    assert state["survey.site"] == [SURVEY["Site"]]
    assert not any(k.startswith(("deposition.", "sampling.")) for k in state)

    # the link read from the printed code reproduces the inputs and the survey details
    page.goto("about:blank")
    page.goto(link)
    _all_ready(page)
    assert page.locator("#panel-motion").get_by_label("Time", exact=True).input_value() == "5"
    assert page.get_by_label("Site", exact=True).input_value() == SURVEY["Site"]
    again = _saved(page)
    assert again["fingerprints"]["motion"] == expected


def test_deposition_record_of_invented_spectrum_is_compact_and_marked(page, base_url, tmp_path):
    page.goto(base_url + "#v=1&panel=deposition")
    _all_ready(page)
    _fill_survey(page)
    # sizes typed first: a demo sets only its own inputs, and a change after it ends the demo
    before = _updates(page, "deposition")
    page.locator("#panel-deposition").get_by_label("Values at these sizes", exact=True).fill(
        "25 nm, 0.3 µm, 4 µm"
    )
    _settle(page, "deposition", before)
    before = _updates(page, "deposition")
    page.get_by_role("button", name=re.compile("Invented demo: measured spectrum")).click()
    _settle(page, "deposition", before)
    demo = next(
        d
        for f in api.describe()["calculations"]["deposition"]["fields"]
        for d in f.get("demos") or []
        if d["id"] == "demo_spectrum"
    )
    sha = hashlib.sha256(demo["inputs"]["csv_text"].encode("utf-8")).hexdigest()
    saved = _saved(page)
    fingerprint = _fingerprint("deposition", saved["panels"]["deposition"], saved["survey"])
    for fmt in ("A4", "Letter"):
        pdf, pages = _print(page, tmp_path, "deposition", fmt)
        _images(pdf, f"record-deposition-{fmt}")
        assert 1 <= len(pages) <= MAX_PAGES, (fmt, len(pages))
        _check_every_page(pages, fingerprint)
        text = "\n".join(pages)
        _check_common(text)
        assert "Invented demo data" in text
        assert sha in re.sub(r"\s+", "", text)  # may wrap at the line end
        # the region table as on screen: one row per region, not a row per quantity
        assert text.count("Deposition by region") == 1
        for region in ("ET1", "ET2", "BB (bronchi)", "bb (bronchioles)", "AI (alveolar"):
            assert region in text, region
        assert not re.search(r"\b(fraction|dose|rate)_[a-z0-9]+_", text)
        assert "ICRP (1994)" in text
        assert re.search(r"Exposure duration\s+8\s+h", text)
        # the values at the sizes typed: a column per size, a row per region and convention
        assert text.count("Values at your sizes") == 1
        assert re.search(r"25 nm\s+300 nm\s+4 µm", text)
        assert re.search(r"Total deposition(\s+[\d.]+ %){3}", text)
        assert re.search(r"ISO 7708 respirable(\s+[\d.]+ %){3}", text)


SPECTRUM_BINS = 100


def _spectrum_file(path: Path) -> bytes:
    """An invented 100-bin spectrum (a lognormal, CMD 80 nm), UTF-8 with a byte-order mark."""
    lines = ["# invented spectrum for a test, not a measurement", "diameter_nm;dN/dlogDp"]
    for i in range(SPECTRUM_BINS):
        d = 10 * 10 ** (3 * i / (SPECTRUM_BINS - 1))
        c = 1e4 * math.exp(-(math.log(d / 80) ** 2) / (2 * math.log(1.8) ** 2))
        lines.append(f"{d:.4g};{c:.4g}".replace(".", ","))
    data = ("\ufeff" + "\n".join(lines) + "\n").encode("utf-8")
    path.write_bytes(data)
    return data


def test_sampling_record_with_spectrum_file_fits_and_names_the_file(page, base_url, tmp_path):
    page.goto(base_url + "#v=1&panel=sampling")
    _all_ready(page)
    _fill_survey(page)
    panel = page.locator("#panel-sampling")
    data = _spectrum_file(tmp_path / "spectrum-S17.csv")
    panel.get_by_label("Measured spectrum to correct").select_option("csv")
    panel.get_by_label("Spectrum CSV file").set_input_files(str(tmp_path / "spectrum-S17.csv"))
    panel.get_by_label("Diameter column").select_option("diameter_nm")
    before = _updates(page, "sampling")
    panel.get_by_label("Concentration column").select_option("dN/dlogDp")
    _settle(page, "sampling", before)
    before = _updates(page, "sampling")
    panel.get_by_label("Values at these sizes", exact=True).fill("25 nm, 0.3 µm, 4 µm")
    _settle(page, "sampling", before)
    assert panel.locator("table.spectrum-table tbody tr").count() == SPECTRUM_BINS
    saved = _saved(page)
    fingerprint = _fingerprint("sampling", saved["panels"]["sampling"], saved["survey"])
    for fmt in ("A4", "Letter"):
        pdf, pages = _print(page, tmp_path, "sampling", fmt)
        _images(pdf, f"record-sampling-{fmt}")
        assert 1 <= len(pages) <= MAX_PAGES, (fmt, len(pages))
        _check_every_page(pages, fingerprint)
        text = "\n".join(pages)
        _check_common(text)
        flat = re.sub(r"\s+", "", text)
        assert (
            f"spectrum-S17.csv—{len(data):,}bytes,SHA-256{hashlib.sha256(data).hexdigest()}" in flat
        )
        # the per-stage table with stage names and the whole chain, and no internal codes
        assert "Penetration by stage" in text
        assert re.search(r"1\. 10 m of 4 mm tubing", text)
        assert re.search(r"Whole chain\s+[\d.]+ %", text)
        assert not re.search(r"\b(index|type label|half penetration sizes)\b", text)
        assert not re.search(r"\b(tub e|lami nar|L/m in)\b", text)
        # every bin printed once: 100 rows of the corrected spectrum
        assert "Corrected spectrum" in text
        bins = re.findall(r"\d[\d.]*\s+[\d.]+(?: × 10⁻?[⁰¹²³⁴⁵⁶⁷⁸⁹]+)?\s+[\d.]+\s*%", text)
        assert len(bins) == SPECTRUM_BINS, len(bins)
        assert "Invented demo data" not in text
        # the values at the sizes typed, and the spectrum in the file's terms with its totals
        assert re.search(r"25 nm\s+300 nm\s+4 µm", text)
        assert re.search(r"Whole chain(\s+[\d.]+ %){3}", text)
        assert "dN/dlogDp, 1/cm³" in text
        assert re.search(r"Total number concentration, measured[^\n]*\s[\d.]+\s+1/cm³", text)
        assert "Total number concentration, corrected" in text
