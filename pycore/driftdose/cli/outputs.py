"""Writing results: standard output or a file, never over a file this run reads."""

from __future__ import annotations

import argparse
import errno
import os
import sys
from collections.abc import Sequence
from typing import TextIO

from .documents import READ_PATHS
from .status import UserError


def write_text(path: str | None, text: str, stdout: TextIO) -> None:
    """Write ``text`` to the file ``path`` or, for None or ``-``, to standard output.

    A named pipe is opened without waiting: if nothing reads it, that is said at once. Any
    failure (a full disk, a closed pipe) becomes one line naming where the writing failed.
    """
    if path in (None, "-"):
        try:
            stdout.write(text)
            stdout.flush()
        except BrokenPipeError:
            raise
        except OSError as exc:
            silence_stdout(stdout)
            raise UserError(
                "out", f"cannot write to standard output: {exc.strerror or exc}."
            ) from None
        return
    try:
        fd = os.open(
            path, os.O_WRONLY | os.O_CREAT | os.O_TRUNC | getattr(os, "O_NONBLOCK", 0), 0o666
        )
    except OSError as exc:
        reason = exc.strerror or str(exc)
        if exc.errno == errno.ENXIO:
            reason = "it is a named pipe that no program is reading"
        raise UserError("out", f"cannot write {path!r}: {reason}.") from None
    try:
        os.set_blocking(fd, True)
        with open(fd, "w", encoding="utf-8", newline="") as fh:
            fh.write(text)
    except OSError as exc:
        raise UserError("out", f"cannot write {path!r}: {exc.strerror or exc}.") from None


def silence_stdout(stdout: TextIO) -> None:
    """After standard output failed: drop what is buffered, so exiting prints nothing more."""
    if stdout is sys.__stdout__:
        try:
            devnull = os.open(os.devnull, os.O_WRONLY)
            os.dup2(devnull, stdout.fileno())
            os.close(devnull)
        except OSError:
            pass


def _same_file(a: str, b: str) -> bool:
    """Tell whether two paths name one file (hard links and ``./`` spellings included)."""
    try:
        return os.path.samefile(a, b)
    except OSError:
        return os.path.realpath(a) == os.path.realpath(b)


def check_outputs(opts: argparse.Namespace, reads: Sequence[str] = ()) -> None:
    """Refuse outputs that would overwrite each other, a file this run has read or ``reads``."""
    outs = [
        (flag, p)
        for flag, p in (("out", opts.out), ("curves", getattr(opts, "curves", None)))
        if p not in (None, "-")
    ]
    if len(outs) == 2 and _same_file(outs[0][1], outs[1][1]):
        raise UserError(
            "curves",
            f"--curves and --out name the same file ({outs[1][1]!r}); the curves would "
            "overwrite the results. Give two different files.",
        )
    for flag, p in outs:
        for read in [*READ_PATHS, *reads]:
            if read != "-" and _same_file(p, read):
                raise UserError(
                    flag, f"--{flag} names {p!r}, a file this run reads; it would be overwritten."
                )


def digits_option(opts: argparse.Namespace, default: int) -> int:
    return default if opts.digits is None else opts.digits
