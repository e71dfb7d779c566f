"""The command line answers at the sizes typed (``--sizes``) with the api's numbers.

No physics here (tests/api/test_typed_sizes.py checks it): the CLI's numbers for the sizes are
the api's for the same request.
"""

from __future__ import annotations

import csv
import io

from driftdose import api, cli


def run_main(capsys, *argv: str) -> tuple[int, str, str]:
    code = cli.main(list(argv))
    out, err = capsys.readouterr()
    return code, out, err


def test_sampling_sizes_table_in_the_terminal(capsys):
    code, out, err = run_main(capsys, "sampling", "--sizes", "25nm, 0.3um, 4 µm")
    assert code == 0, err
    assert "Values at these sizes         25nm, 0.3um, 4 µm" in out  # the input as given
    block = out.split("  Values at your sizes", 1)[1]
    for size in ("25 nm", "300 nm", "4 µm"):
        assert f"\n    {size}\n" in block
    reply = api.handle({"kind": "sampling", "inputs": {"sizes": "25nm, 0.3um, 4 µm"}})
    whole = [
        c
        for r in reply["results"]["sizes_table"]["rows"]
        for c in r["quantities"]
        if c["key"] == "overall"
    ]
    lines = [ln.split() for ln in block.splitlines() if ln.strip().startswith("Whole chain")]
    assert [float(ln[2]) for ln in lines] == [float(f"{c['value']:.4g}") for c in whole]


def test_deposition_sizes_in_the_results_csv(capsys):
    code, out, err = run_main(capsys, "deposition", "--sizes", "4um", "--format", "csv")
    assert code == 0, err
    block = out.split("Values at your sizes", 1)[1].strip()
    rows = list(csv.reader(io.StringIO(block)))
    col = rows[0].index("ISO 7708 respirable [%]")
    reply = api.handle({"kind": "deposition", "inputs": {"sizes": "4um"}})
    cell = next(
        c
        for c in reply["results"]["sizes_table"]["rows"][0]["quantities"]
        if c["key"] == "iso7708_respirable"
    )
    assert float(rows[1][col]) == cell["value"]


def test_bad_sizes_name_the_flag_and_exit_nonzero(capsys):
    code, out, err = run_main(capsys, "sampling", "--sizes", "5 nm, NaN")
    assert code != 0 and not out
    assert "sizes" in err and "not a number" in err
