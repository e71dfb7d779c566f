"""The argument parser: a subcommand per calculation (flags from its fields), ``run``,
``describe`` and ``batch``.
"""

from __future__ import annotations

import argparse
import re
import sys
from typing import Any, NoReturn

from .. import __version__
from .flags import add_field_flags, flag_name, is_file_field, is_quantity
from .numbers import SIG_FIGS, js_string
from .outputs import silence_stdout
from .status import EXIT_USAGE, PROG, UserError

COMMANDS = ("describe", "run", "batch")  # subcommands that are not calculations


class Parser(argparse.ArgumentParser):
    """argparse with messages naming the field (``field: message``) and exit status 2."""

    field_options: dict[str, str]

    def __init__(self, *args: Any, **kwargs: Any) -> None:
        super().__init__(*args, **kwargs)
        self.field_options = {}
        # Let values such as -10degC follow a flag (argparse takes them for options otherwise).
        if hasattr(self, "_negative_number_matcher"):
            self._negative_number_matcher = re.compile(r"^-\.?\d")

    def error(self, message: str) -> NoReturn:
        """Print the problem (naming the field when a field's flag is at fault) and exit 2."""
        m = re.match(r"argument (\S+?)(?:/\S+)?: (.*)", message, re.S)
        if m and m.group(1) in self.field_options:
            self.exit(EXIT_USAGE, f"{self.field_options[m.group(1)]}: {m.group(2)}\n")
        self.print_usage(sys.stderr)
        self.exit(EXIT_USAGE, f"{self.prog}: error: {message}\n")

    def _print_message(self, message: str, file: Any = None) -> None:
        """Print help or usage; unlike argparse, say so when standard output cannot take it."""
        if not message:
            return
        file = sys.stdout if file is None else file
        try:
            file.write(message)
            file.flush()
        except BrokenPipeError:
            raise
        except OSError as exc:
            if file is sys.stderr:
                return
            silence_stdout(file)
            raise UserError(
                "out", f"cannot write to standard output: {exc.strerror or exc}."
            ) from None


def _output_options(parser: argparse.ArgumentParser, batch: bool = False) -> None:
    out = parser.add_argument_group("output")
    out.add_argument(
        "--format",
        choices=("table", "csv", "json"),
        default="csv" if batch else "table",
        help=(
            "csv (one row per file; units in the header), table or json. Default: %(default)s."
            if batch
            else "table (as the page shows it), csv (the page's results CSV: quantity, "
            "value, unit, ...) or json (the full reply). Default: %(default)s."
        ),
    )
    out.add_argument("--out", metavar="FILE", help="write there instead of standard output")
    if not batch:
        out.add_argument(
            "--curves", metavar="FILE", help="also write the curves (the page's charts) as CSV"
        )
    out.add_argument(
        "--digits",
        type=int,
        metavar="N",
        help=f"significant figures in a table (default {SIG_FIGS}, as the page shows them; 0 "
        "for full precision)"
        + ("; in CSV numbers are in full precision unless this is given" if batch else ""),
    )


def _example(kind: str, fields: list[dict[str, Any]]) -> str:
    for fd in fields:
        if is_quantity(fd) and fd["default"].get("value") is not None:
            d = fd["default"]
            return (
                f"example: {PROG} {kind} {flag_name(fd['name'])} {js_string(d['value'])}{d['unit']}"
            )
    return f"example: {PROG} {kind}"


def build_parser(description: dict[str, Any]) -> tuple[Parser, dict[str, Any]]:
    calcs = description["calculations"]
    parser = Parser(
        prog=PROG,
        description="Drift & Dose on the command line: the page's calculations, with the "
        "same inputs, checks and numbers.",
        epilog=f"'{PROG} <calculation> --help' lists a calculation's inputs.",
    )
    parser.add_argument("--version", action="version", version=f"{PROG} {__version__}")
    sub = parser.add_subparsers(dest="command", metavar="<command>", required=True)
    info: dict[str, Any] = {"calc": {}, "batch": {}}

    for kind, calc in calcs.items():
        if kind in COMMANDS:
            continue  # a calculation may not shadow a command; describe() still lists it
        p = sub.add_parser(
            kind,
            help=calc["title"],
            description=calc["title"],
            epilog=_example(kind, calc["fields"]),
        )
        p.add_argument(
            "--input",
            metavar="FILE",
            help='inputs from a JSON file: a request {"kind", "inputs"} or a state the '
            "page saved; flags given as well take precedence ('-' reads standard input)",
        )
        _output_options(p)
        fmap = add_field_flags(p, calc["fields"])
        p.field_options = fmap.options
        info["calc"][kind] = fmap

    p = sub.add_parser("run", help="run a saved request or page state (JSON) as it stands")
    p.add_argument(
        "file", metavar="FILE", help='JSON: a request {"kind", "inputs"} or a state the page saved'
    )
    p.add_argument(
        "--kind",
        choices=[k for k in calcs if k not in COMMANDS],
        help="the calculation to run from a saved state of several panels (default: the panel "
        "that was open)",
    )
    _output_options(p)

    p = sub.add_parser("describe", help="list the calculations and their inputs")
    p.add_argument("kinds", nargs="*", metavar="CALCULATION", help="only these calculations")
    p.add_argument("--format", choices=("text", "json"), default="text")

    batchable = {
        kind: [fd for fd in calc["fields"] if is_file_field(fd)]
        for kind, calc in calcs.items()
        if kind not in COMMANDS
    }
    batchable = {k: v for k, v in batchable.items() if v}
    if batchable:
        bp = sub.add_parser(
            "batch",
            help="run a calculation for many files, one row per file: "
            + ", ".join(sorted(batchable)),
            description="Run a calculation once per input file and write one table, one row "
            "per file, a column for each result (units in the header).",
        )
        bsub = bp.add_subparsers(dest="batch_kind", metavar="<calculation>", required=True)
        for kind, file_fields in batchable.items():
            calc = calcs[kind]
            ff = file_fields[0]
            p = bsub.add_parser(kind, help=calc["title"], description=calc["title"])
            p.add_argument(
                "--spectra",
                "--files",
                dest="files",
                nargs="+",
                required=True,
                metavar="FILE",
                help=f"files, one run each, read into {ff['label']!r} ({ff['name']}); a "
                "folder stands for its files of the accepted types",
            )
            p.add_argument(
                "--input", metavar="FILE", help="the other inputs from a JSON file (as above)"
            )
            p.add_argument(
                "--columns",
                nargs="+",
                metavar="PATTERN",
                help="only the results whose keys match these shell-style patterns "
                "(e.g. 'dose_*'; 'describe --format json' or '--format json' shows the keys)",
            )
            _output_options(p, batch=True)
            others = [fd for fd in calc["fields"] if fd["name"] != ff["name"]]
            fmap = add_field_flags(p, others)
            p.field_options = fmap.options
            info["batch"][kind] = (fmap, ff)
    return parser, info
