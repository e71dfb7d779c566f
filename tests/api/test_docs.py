"""The contributor guide lists every request input name (a documentation guard)."""

from __future__ import annotations

from pathlib import Path

from driftdose import api

GUIDE = (Path(__file__).resolve().parents[2] / "DEVELOPERS.md").read_text(encoding="utf-8")


def _names() -> set[str]:
    names = set()
    for calc in api.describe()["calculations"].values():
        for field in calc["fields"]:
            names.add(field["name"])
            for item in field.get("item_fields", []):
                names.add(f"{field['name']}[].{item['name']}")
            for spec in (field.get("stage_types") or {}).values():
                for sub in spec["fields"]:
                    names.add(f"{field['name']}[].{sub['name']}")
    return names


def test_developers_guide_lists_every_input_name():
    missing = sorted(n for n in _names() if f"`{n}`" not in GUIDE)
    assert not missing, f"add these to DEVELOPERS.md: {missing}"
