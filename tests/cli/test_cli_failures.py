"""The command line under hostile or unlucky conditions: every failure is one line on standard
error and exit status 2 (1 for a fault of the program itself), never a traceback, a hang or a
silently overwritten file.

Each case runs ``python -m driftdose`` in a new process with a time limit, as a user would.
"""

from __future__ import annotations

import os
import stat
import subprocess
import sys
import threading
import time
from pathlib import Path

import pytest

from driftdose import cli

ROOT = Path(__file__).resolve().parents[2]
TIMEOUT = 60  # s; a blocked process is a failure, not a hang of the suite


def run(*argv: str, cwd: Path | None = None, stdout: int | None = None, **kw) -> tuple:
    """(exit status, stdout, stderr) of ``python -m driftdose argv``."""
    env = dict(os.environ, PYTHONIOENCODING="utf-8")
    env["PYTHONPATH"] = os.pathsep.join([str(ROOT / "pycore"), env.get("PYTHONPATH", "")])
    env.pop("DRIFTDOSE_DEBUG", None)
    done = subprocess.run(
        [sys.executable, "-m", "driftdose", *argv],
        stdout=subprocess.PIPE if stdout is None else stdout,
        stderr=subprocess.PIPE,
        env=env,
        cwd=cwd or ROOT,
        timeout=TIMEOUT,
        **kw,
    )
    out = done.stdout.decode("utf-8") if done.stdout is not None else ""
    return done.returncode, out, done.stderr.decode("utf-8")


def one_line(err: str, field: str) -> None:
    """The failure is exactly one line, naming the field (or output) at fault."""
    assert "Traceback" not in err
    lines = err.splitlines()
    assert len(lines) == 1, err
    assert lines[0].startswith(f"{field}: "), err


# --- --digits ---------------------------------------------------------------------------------


@pytest.mark.parametrize("digits", ["18", "29", "400", "-1"])
def test_digits_out_of_range_is_one_line(digits):
    code, out, err = run("motion", "--digits", digits)
    assert code == 2
    assert out == ""
    one_line(err, "digits")
    assert "from 0 to 17" in err


@pytest.mark.parametrize("digits", ["0", "1", "17"])
def test_digits_in_range_prints_table(digits):
    code, out, err = run("motion", "--digits", digits)
    assert code == 0, err
    assert "Settling velocity" in out


def test_digits_17_reads_back_every_double():
    """17 significant figures identify every IEEE 754 double (common practice, the reason
    for the upper limit)."""
    for x in (0.1, 1 / 3, 2.0**-1074, 1.7976931348623157e308, 6.02214076e23):
        assert float(cli.to_precision(x, 17)) == x


def test_batch_digits_out_of_range(tmp_path):
    code, _, err = run("batch", "deposition", "--spectra", "x.csv", "--digits", "99", cwd=tmp_path)
    assert code == 2
    one_line(err, "digits")


# --- a full device ----------------------------------------------------------------------------

needs_dev_full = pytest.mark.skipif(
    not os.path.exists("/dev/full"), reason="/dev/full exists only on Linux-like systems"
)


@needs_dev_full
@pytest.mark.parametrize(
    "argv",
    [
        pytest.param(["motion"], id="table"),
        pytest.param(["motion", "--format", "json"], id="json"),
        pytest.param(["describe", "--format", "json"], id="describe"),
        pytest.param(["motion", "--help"], id="help"),
        pytest.param(["--version"], id="version"),
    ],
)
def test_standard_output_on_full_device(argv):
    with open("/dev/full", "wb") as full:
        code, _, err = run(*argv, stdout=full.fileno())
    assert code == 2
    one_line(err, "out")
    assert "standard output" in err and "No space left" in err


@needs_dev_full
@pytest.mark.parametrize("flag", ["--out", "--curves"])
def test_output_file_on_full_device(flag, tmp_path):
    extra = ["--out", str(tmp_path / "r.csv")] if flag == "--curves" else []
    code, _, err = run("motion", "--format", "csv", *extra, flag, "/dev/full")
    assert code == 2
    one_line(err, flag[2:] if flag == "--out" else "out")
    assert "/dev/full" in err and "No space left" in err


# --- outputs that would overwrite each other or an input ----------------------------------------


@pytest.mark.parametrize(
    ("out", "curves"),
    [("x.csv", "x.csv"), ("x.csv", "./x.csv"), ("sub/../x.csv", "x.csv")],
)
def test_out_and_curves_same_file_refused(tmp_path, out, curves):
    (tmp_path / "sub").mkdir()
    code, stdout, err = run("motion", "--out", out, "--curves", curves, cwd=tmp_path)
    assert code == 2
    assert stdout == ""
    one_line(err, "curves")
    assert not (tmp_path / "x.csv").exists()  # nothing written


def test_out_and_curves_hard_link_refused(tmp_path):
    (tmp_path / "a.csv").write_text("keep\n")
    os.link(tmp_path / "a.csv", tmp_path / "b.csv")
    code, _, err = run("motion", "--out", "a.csv", "--curves", "b.csv", cwd=tmp_path)
    assert code == 2
    one_line(err, "curves")
    assert (tmp_path / "a.csv").read_text() == "keep\n"


def test_out_over_an_input_file_refused(tmp_path):
    request = tmp_path / "request.json"
    request.write_text('{"kind": "motion", "inputs": {}}')
    before = request.read_bytes()
    code, _, err = run("motion", "--input", "request.json", "--out", "request.json", cwd=tmp_path)
    assert code == 2
    one_line(err, "out")
    assert request.read_bytes() == before


def test_batch_out_over_a_spectrum_refused(tmp_path):
    spectrum = tmp_path / "a.csv"
    spectrum.write_text("d;n\n10;1\n20;2\n")
    before = spectrum.read_bytes()
    code, _, err = run(
        "batch", "deposition", "--spectra", "a.csv", "--out", "a.csv", "--csv-diameter-column",
        "1", "--csv-concentration-column", "2", cwd=tmp_path,
    )  # fmt: skip
    assert code == 2
    one_line(err, "out")
    assert spectrum.read_bytes() == before


def test_out_and_curves_different_files_both_written(tmp_path):
    code, _, err = run(
        "motion", "--format", "csv", "--out", "r.csv", "--curves", "c.csv", cwd=tmp_path
    )
    assert code == 0, err
    assert (tmp_path / "r.csv").read_text(encoding="utf-8").startswith("quantity,")
    assert (tmp_path / "c.csv").read_text(encoding="utf-8").startswith("curve,")


# --- deep JSON --------------------------------------------------------------------------------


@pytest.mark.parametrize("depth", [65, 3000, 100_000])
def test_deep_json_input_named_as_too_deep(tmp_path, depth):
    path = tmp_path / "deep.json"
    path.write_text("[" * depth + "]" * depth)
    code, out, err = run("motion", "--input", str(path))
    assert code == 2
    assert out == ""
    one_line(err, "input")
    assert "nested too deeply" in err and "not valid JSON" not in err


def test_deep_json_inside_an_object_refused(tmp_path):
    path = tmp_path / "deep.json"
    path.write_text('{"kind": "motion", "inputs": {"time": ' + "[" * 200 + "]" * 200 + "}}")
    code, _, err = run("motion", "--input", str(path))
    assert code == 2
    one_line(err, "input")
    assert "nested too deeply" in err


@pytest.mark.parametrize("how", ["inline", "file", "pair"])
def test_deep_json_data_flag_refused(tmp_path, how):
    deep = "[" * 3000 + "]" * 3000
    (tmp_path / "m.json").write_text(deep)
    arg = {"inline": deep, "file": "@m.json", "pair": f"x={deep}"}[how]
    code, _, err = run("deposition", "--modes", arg, cwd=tmp_path)
    assert code == 2
    one_line(err, "modes")
    assert "nested too deeply" in err


def test_json_at_the_depth_limit_is_read(tmp_path):
    """64 levels are read (and then judged by the api as usual), 65 are not."""
    path = tmp_path / "ok.json"
    path.write_text('{"kind": "motion", "inputs": {"time": ' + "[" * 62 + "]" * 62 + "}}")
    code, _, err = run("motion", "--input", str(path))
    assert code == 2
    assert "nested too deeply" not in err
    assert err.startswith("time: ")


def test_broken_json_still_called_not_valid(tmp_path):
    path = tmp_path / "bad.json"
    path.write_text('{"kind": ')
    code, _, err = run("motion", "--input", str(path))
    assert code == 2
    one_line(err, "input")
    assert "not valid JSON (line 1" in err


# --- pipes and devices never block ------------------------------------------------------------

needs_fifo = pytest.mark.skipif(not hasattr(os, "mkfifo"), reason="no named pipes here")


@needs_fifo
@pytest.mark.parametrize(
    "argv",
    [
        pytest.param(["deposition", "--spectrum", "pipe"], id="spectrum"),
        pytest.param(["motion", "--input", "pipe"], id="input"),
        pytest.param(["run", "pipe"], id="run"),
        pytest.param(["deposition", "--modes", "@pipe"], id="data-file"),
        pytest.param(["batch", "deposition", "--spectra", "pipe", "--format", "json"], id="batch"),
    ],
)
def test_reading_a_named_pipe_without_writer_does_not_block(tmp_path, argv):
    os.mkfifo(tmp_path / "pipe")
    t0 = time.monotonic()
    code, _, err = run(*argv, cwd=tmp_path)
    assert time.monotonic() - t0 < TIMEOUT
    assert code == 2
    assert "Traceback" not in err
    assert "not a regular file" in err
    assert len(err.splitlines()) == 1  # batch: the file's own line


@needs_fifo
def test_writing_a_named_pipe_without_reader_does_not_block(tmp_path):
    os.mkfifo(tmp_path / "pipe")
    code, _, err = run("motion", "--out", "pipe", cwd=tmp_path)
    assert code == 2
    one_line(err, "out")
    assert "no program is reading" in err
    assert stat.S_ISFIFO(os.stat(tmp_path / "pipe").st_mode)


@needs_fifo
def test_writing_a_named_pipe_with_a_reader_works(tmp_path):
    pipe = tmp_path / "pipe"
    os.mkfifo(pipe)
    got: list[bytes] = []
    fd = os.open(pipe, os.O_RDONLY | os.O_NONBLOCK)  # a reader is there before the writer

    def drain() -> None:
        os.set_blocking(fd, True)
        with os.fdopen(fd, "rb") as fh:
            got.append(fh.read())

    code, _, err = run("motion", "--format", "csv", "--out", "pipe", cwd=tmp_path)
    reader = threading.Thread(target=drain)
    reader.start()
    reader.join(TIMEOUT)
    assert code == 0, err
    assert got and got[0].startswith(b"quantity,")


def test_reading_a_device_is_refused(tmp_path):
    code, _, err = run("deposition", "--spectrum", "/dev/zero")
    assert code == 2
    one_line(err, "csv_text")
    assert "not a regular file" in err


def test_standard_input_is_still_read_with_dash():
    code, out, err = run(
        "motion", "--input", "-", "--format", "json", input=b'{"kind": "motion", "inputs": {}}'
    )
    assert code == 0, err
    assert '"ok": true' in out


# --- a fault of the program -------------------------------------------------------------------


def test_internal_fault_is_one_line_with_status_1(monkeypatch, capsys):
    def broken(*_args, **_kwargs):
        raise ZeroDivisionError("float division by zero")

    monkeypatch.setattr(cli.commands, "call_api", broken)
    monkeypatch.delenv("DRIFTDOSE_DEBUG", raising=False)
    code = cli.main(["motion"])
    out, err = capsys.readouterr()
    assert code == 1
    assert out == ""
    assert err.count("\n") == 1 and err.startswith("internal error: ZeroDivisionError")


def test_internal_fault_traceback_on_request(monkeypatch):
    monkeypatch.setattr(cli.commands, "call_api", lambda *_a: 1 / 0)
    monkeypatch.setenv("DRIFTDOSE_DEBUG", "1")
    with pytest.raises(ZeroDivisionError):
        cli.main(["motion"])
