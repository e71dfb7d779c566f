"""The command line and the CSV export carry diameter types, effective density and LDSA.

No physics here (the api tests check it): the CLI's flags come from the declarations, and the
numbers it prints and exports are the api's for the same request.
"""

from __future__ import annotations

import csv
import io
import json

from driftdose import api, cli, export
from driftdose.unit_labels import unit_label

MODES = [
    {
        "basis": "mass",
        "median": {"value": 0.3, "unit": "um"},
        "diameter_type": "aerodynamic",
        "gsd": 2.0,
        "concentration": {"value": 1, "unit": "mg/m3"},
    }
]
FLAGS = [
    "--modes",
    json.dumps(MODES),
    "--particle-density",
    "0.9g/cm3",
    "--density-basis",
    "effective",
    "--shape-factor",
    "1.8",
]
INPUTS = {
    "modes": MODES,
    "particle_density": {"value": 0.9, "unit": "g/cm3"},
    "density_basis": "effective",
    "shape_factor": {"value": 1.8, "unit": "1"},
}


def test_cli_flags_reach_the_api_and_ldsa_is_printed(capsys):
    code = cli.main(["deposition", *FLAGS, "--format", "json"])
    out, err = capsys.readouterr()
    assert code == 0, err
    printed = json.loads(out)
    reply = api.handle({"kind": "deposition", "inputs": INPUTS})
    assert reply["ok"], reply
    for key in ("ldsa_alveolar", "ldsa_tracheobronchial", "ldsa_total", "mode1_count_median"):
        assert printed["results"][key] == reply["results"][key], key
    assert printed["curves"]["x_label"] == "Particle diameter (mobility-equivalent)"


def test_cli_table_lists_ldsa_with_its_unit(capsys):
    code = cli.main(["deposition", *FLAGS])
    out, err = capsys.readouterr()
    assert code == 0, err
    lines = [line for line in out.splitlines() if "Lung-deposited surface area" in line]
    assert len(lines) == 3
    assert all("µm²/cm³" in line for line in lines)


def test_cli_bad_density_basis_exits_2(capsys):
    code = cli.main(["deposition", "--density-basis", "bulk"])
    _, err = capsys.readouterr()
    assert code == 2
    assert "density_basis" in err or "Density given as" in err


def test_results_csv_holds_ldsa_and_mode_rows():
    reply = api.handle({"kind": "deposition", "inputs": INPUTS})
    rows = list(csv.reader(io.StringIO(export.results_csv(reply))))
    header = rows[0]
    by_label = {r[0]: dict(zip(header, r, strict=True)) for r in rows[1:] if r}
    for key in ("ldsa_alveolar", "ldsa_tracheobronchial", "ldsa_total", "mode1_number"):
        row = reply["results"][key]
        line = by_label[row["label"]]
        assert float(line["value"]) == row["value"]
        assert line["unit"] == unit_label(row["unit"])  # the reply's code, labelled
        assert float(line["value_si"]) == row["si"]
