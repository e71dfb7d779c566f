"""Helpers for reading what the page shows and comparing it with the core."""

from __future__ import annotations

import csv
import io
import math
import re
import struct
import zlib

SUPERSCRIPT = str.maketrans("⁻⁰¹²³⁴⁵⁶⁷⁸⁹", "-0123456789")


def parse_shown(text: str) -> float:
    """Parse a number as the page formats it ("2.735 × 10⁻¹¹", "0.8565")."""
    text = text.strip()
    m = re.fullmatch(r"(-?[\d.]+)(?: × 10([⁻⁰¹²³⁴⁵⁶⁷⁸⁹]+))?", text)
    if not m:
        raise ValueError(f"not a shown number: {text!r}")
    exp = int(m.group(2).translate(SUPERSCRIPT)) if m.group(2) else 0
    return float(m.group(1)) * 10.0**exp


def round_sig(x: float, digits: int = 4) -> float:
    """Round to ``digits`` significant figures, as the page shows numbers."""
    if x == 0:
        return 0.0
    return round(x, digits - 1 - math.floor(math.log10(abs(x))))


def table_values(page, panel_id: str) -> dict[str, tuple[str, str]]:
    """Map result key -> (shown value text, unit text) for a panel's results table."""
    rows = page.locator(f"#panel-{panel_id} table.results tbody tr")
    out = {}
    for i in range(rows.count()):
        row = rows.nth(i)
        key = row.get_attribute("data-key")
        cells = row.locator("td")
        value = cells.nth(0).inner_text()
        unit = cells.nth(1).inner_text() if cells.count() > 1 else ""
        out[key] = (value, unit)
    return out


def png_text(data: bytes) -> dict[str, str]:
    """The iTXt/tEXt chunks of a PNG (PNG 1.2, section 11.3.4), read independently of the page."""
    assert data[:8] == b"\x89PNG\r\n\x1a\n"
    out, at = {}, 8
    while at < len(data):
        (length,) = struct.unpack(">I", data[at : at + 4])
        kind = data[at + 4 : at + 8]
        body = data[at + 8 : at + 8 + length]
        (crc,) = struct.unpack(">I", data[at + 8 + length : at + 12 + length])
        assert crc == zlib.crc32(kind + body), kind
        if kind == b"iTXt":
            key, rest = body.split(b"\0", 1)
            rest = rest[2:]  # compression flag and method
            _lang, rest = rest.split(b"\0", 1)
            _translated, text = rest.split(b"\0", 1)
            out[key.decode("latin-1")] = text.decode("utf-8")
        elif kind == b"tEXt":
            key, text = body.split(b"\0", 1)
            out[key.decode("latin-1")] = text.decode("latin-1")
        at += 12 + length
    return out


def png_size(data: bytes) -> tuple[int, int]:
    return struct.unpack(">II", data[16:24])


def export_parts(text: str) -> tuple[list[list[str]], str]:
    """Split a CSV export of the page into its header block (rows) and the table text.

    The page's exports start with a byte-order mark (unless plain UTF-8 was chosen) and a
    header block ended by the first empty row; the table after it is the core's
    ``export.results_csv`` or ``export.curves_csv``.
    """
    text = text.removeprefix("\ufeff").replace("\r\n", "\n")
    head, sep, table = text.partition("\n\n")
    assert sep, "no header block"
    return list(csv.reader(io.StringIO(head))), table


SERVICE_WORKER_ACTIVATED = """async () => {
    const reg = await navigator.serviceWorker.ready;
    while (!reg.active || reg.active.state !== 'activated') {
      await new Promise(r => setTimeout(r, 100));
    }
}"""


def reload_under_service_worker(page, ready) -> None:
    """Wait until the page's service worker is activated, reload the page, call ``ready()``
    (the caller's wait for a started page), and check the service worker now controls it."""
    page.evaluate(SERVICE_WORKER_ACTIVATED)
    page.reload()
    ready()
    assert page.evaluate("() => navigator.serviceWorker.controller !== null")
