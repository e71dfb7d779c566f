"""Helpers for reading what the page shows and comparing it with the core."""

from __future__ import annotations

import math
import re

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
