"""The ``shift`` subcommand and ``batch shift`` over a folder of logged files with one periods
file: the same numbers as the api, one row per file."""

from __future__ import annotations

import csv
import hashlib
import io
import json

from driftdose import api, cli


def file_record(path) -> dict:
    """What the CLI records of a file it reads: name, SHA-256 of the bytes, size."""
    data = path.read_bytes()
    return {"name": path.name, "sha256": hashlib.sha256(data).hexdigest(), "bytes": len(data)}


def run_main(capsys, *argv: str) -> tuple[int, str, str]:
    code = cli.main(list(argv))
    out, err = capsys.readouterr()
    return code, out, err


def invented_day(level: float, date: str = "2026-03-05") -> str:
    """An invented 8 h log at 30 s: a metadata line, ISO date-times, one number column."""
    rows = [f"Invented survey file, level {level}", "Time;Number [1/cm3]"]
    for k in range(8 * 120):
        t = k * 30
        rows.append(f"{date} {6 + t // 3600:02d}:{t % 3600 // 60:02d}:{t % 60:02d};{level + k % 7}")
    return "\n".join(rows) + "\n"


PERIODS = [
    {"label": "Before", "kind": "background", "start": "06:00", "end": "06:30"},
    {"label": "Task", "kind": "task", "start": "06:30", "end": "12:00"},
    {"label": "After", "kind": "background", "start": "12:00", "end": "13:00"},
]
COLUMNS = [{"column": "number", "quantity": "number"}]


def test_shift_subcommand_runs_a_file(capsys, tmp_path):
    log = tmp_path / "day.csv"
    log.write_text(invented_day(1000.0), encoding="utf-8")
    periods = tmp_path / "periods.json"
    periods.write_text(json.dumps(PERIODS), encoding="utf-8")
    code, out, err = run_main(
        capsys,
        "shift",
        "--series-text",
        str(log),
        "--quantity-columns",
        json.dumps(COLUMNS),
        "--periods",
        f"@{periods}",
        "--background-method",
        "marked_mean",
        "--format",
        "json",
    )
    assert code == 0, err
    reply = json.loads(out)
    inputs = {
        "series_text": invented_day(1000.0),
        "series_file": file_record(log),
        "quantity_columns": COLUMNS,
        "periods": PERIODS,
        "background_method": "marked_mean",
    }
    assert reply == api.handle({"kind": "shift", "inputs": inputs})
    # readings 1000 + (k mod 7): the 8 h mean is 1003 within the partial last cycle
    assert abs(reply["results"]["shift_mean"]["value"] - 1003.0) < 0.01


def test_batch_over_a_folder_with_one_periods_file(capsys, tmp_path):
    folder = tmp_path / "survey"
    folder.mkdir()
    levels = {"a-monday.csv": 1000.0, "b-tuesday.csv": 2000.0, "c-wednesday.txt": 4000.0}
    for i, (name, level) in enumerate(levels.items()):
        (folder / name).write_text(invented_day(level, f"2026-03-0{5 + i}"), encoding="utf-8")
    (folder / "notes.md").write_text("not a log", encoding="utf-8")  # not an accepted type
    (folder / ".hidden.csv").write_text("x", encoding="utf-8")
    periods = tmp_path / "periods.json"
    periods.write_text(json.dumps(PERIODS), encoding="utf-8")
    code, out, err = run_main(
        capsys,
        "batch",
        "shift",
        "--files",
        str(folder),
        "--quantity-columns",
        json.dumps(COLUMNS),
        "--periods",
        f"@{periods}",
        "--format",
        "csv",
    )
    assert code == 0, err
    rows = list(csv.reader(io.StringIO(out)))
    header, body = rows[0], rows[1:]
    assert [r[0].rsplit("/", 1)[-1] for r in body] == list(levels)
    twa = header.index(next(h for h in header if h.startswith("8-h TWA")))
    for row, level in zip(body, levels.values(), strict=True):
        # the same clock times on each file's own date; 7 h of the shift measured, the
        # unmeasured hour of the 8 h counted as zero
        path = folder / row[0].rsplit("/", 1)[-1]
        inputs = {
            "series_text": path.read_text(encoding="utf-8"),
            "series_file": file_record(path),
            "quantity_columns": COLUMNS,
            "periods": PERIODS,
        }
        reply = api.handle({"kind": "shift", "inputs": inputs})
        assert float(row[twa]) == reply["results"]["twa8h"]["value"]
        assert abs(float(row[twa]) - (level + 3.0) * 7 / 8) < 0.01 * level


def test_batch_folder_without_logs_is_refused(capsys, tmp_path):
    empty = tmp_path / "empty"
    empty.mkdir()
    code, _, err = run_main(capsys, "batch", "shift", "--files", str(empty))
    assert code == 2 and "no file" in err


PERIODS_CSV = (
    "Task log (invented)\n"
    "Label;Kind;Start;End;Activity;Route;Protection factor\n"
    "Before;Background;06:00;06:30;;;\n"
    "Task;task;06:30;12:00;light exercise;nose;2,5\n"
    "After;background;12:00;13:00;;;\n"
)
PERIODS_FROM_CSV = [
    {"label": "Before", "kind": "background", "start": "06:00", "end": "06:30"},
    {
        "label": "Task",
        "kind": "task",
        "start": "06:30",
        "end": "12:00",
        "activity": "light_exercise",
        "route": "nose",
        "protection_factor": 2.5,
    },
    {"label": "After", "kind": "background", "start": "12:00", "end": "13:00"},
]


def test_periods_from_a_csv_task_log_equal_the_same_periods_in_json(capsys, tmp_path):
    log = tmp_path / "day.csv"
    log.write_text(invented_day(1000.0), encoding="utf-8")
    periods = tmp_path / "periods.csv"
    periods.write_bytes(PERIODS_CSV.encode("latin-1"))
    args = ["shift", "--series-text", str(log), "--quantity-columns", json.dumps(COLUMNS)]
    args += ["--background-method", "marked_mean", "--format", "json"]
    code, out, err = run_main(capsys, *args, "--periods", f"@{periods}")
    assert code == 0, err
    inputs = {
        "series_text": invented_day(1000.0),
        "series_file": file_record(log),
        "quantity_columns": COLUMNS,
        "periods": PERIODS_FROM_CSV,
        "background_method": "marked_mean",
    }
    assert json.loads(out) == api.handle({"kind": "shift", "inputs": inputs})
    assert json.loads(out)["results"]["tasks"]["rows"][1]["protection_factor"] == 2.5


def test_batch_takes_one_csv_task_log_for_every_file(capsys, tmp_path):
    folder = tmp_path / "survey"
    folder.mkdir()
    for i, level in enumerate((1000.0, 3000.0)):
        (folder / f"day{i}.csv").write_text(invented_day(level, f"2026-03-0{5 + i}"), "utf-8")
    periods = tmp_path / "periods.tsv"
    periods.write_text(PERIODS_CSV.replace(";", "\t"), encoding="utf-8")
    code, out, err = run_main(
        capsys,
        "batch",
        "shift",
        "--files",
        str(folder),
        "--quantity-columns",
        json.dumps(COLUMNS),
        "--periods",
        f"@{periods}",
        "--format",
        "json",
    )
    assert code == 0, err
    for row in json.loads(out):
        path = folder / row["file"].rsplit("/", 1)[-1]
        inputs = {
            "series_text": path.read_text("utf-8"),
            "series_file": file_record(path),
            "quantity_columns": COLUMNS,
            "periods": PERIODS_FROM_CSV,
        }
        expected = api.handle({"kind": "shift", "inputs": inputs})
        assert {k: v for k, v in row.items() if k != "file"} == expected
        # each row records its own file's name and SHA-256
        assert row["results"]["import"]["file"] == file_record(path)


def test_a_malformed_task_log_is_refused_with_its_line_and_nothing_runs(capsys, tmp_path):
    log = tmp_path / "day.csv"
    log.write_text(invented_day(1000.0), encoding="utf-8")
    periods = tmp_path / "periods.csv"
    periods.write_text(PERIODS_CSV.replace("12:00;light", "noon;light"), encoding="utf-8")
    out_file = tmp_path / "out.json"
    code, out, err = run_main(
        capsys,
        "shift",
        "--series-text",
        str(log),
        "--quantity-columns",
        json.dumps(COLUMNS),
        "--periods",
        f"@{periods}",
        "--out",
        str(out_file),
    )
    assert code == 2
    assert out == "" and not out_file.exists()
    assert "periods" in err and "Line 4: column 4 ('End')" in err and "'noon'" in err
