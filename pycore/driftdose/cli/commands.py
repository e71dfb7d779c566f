"""Running the command line: parse, read the inputs, ask the api, write the reply."""

from __future__ import annotations

import argparse
import io
import json
import os
import sys
from collections.abc import Sequence
from typing import Any, TextIO

from .. import api, export
from .batch import run_batch
from .documents import READ_PATHS, document_inputs, document_kind, load_document
from .engine import call_api, print_errors, warn_unknown
from .flags import flag_inputs, source_choice
from .numbers import MAX_DIGITS
from .outputs import check_outputs, digits_option, silence_stdout, write_text
from .parser import COMMANDS, build_parser
from .render import describe_text, input_summary, table_text
from .status import EXIT_FAILURE, EXIT_OK, EXIT_USAGE, UserError


def compute(
    kind: str,
    description: dict[str, Any],
    inputs: dict[str, Any],
    origins: dict[str, str],
    opts: argparse.Namespace,
    stdout: TextIO,
    stderr: TextIO,
) -> int:
    """Run one calculation and write its reply in the chosen format."""
    fields = description["fields"]
    check_outputs(opts)
    warn_unknown(kind, fields, inputs, stderr)
    reply = call_api(kind, inputs)
    if not reply.get("ok"):
        print_errors(reply.get("errors", []), stderr)
        return EXIT_USAGE
    if opts.format == "json":
        text = json.dumps(reply, indent=2, ensure_ascii=False) + "\n"
    elif opts.format == "csv":
        text = export.results_csv(reply)  # the page's "Download results (CSV)", byte for byte
        for w in reply.get("warnings", []):
            stderr.write(f"warning: {w}\n")
    else:
        summary = input_summary(fields, inputs, origins)
        text = table_text(description["title"], summary, reply, digits_option(opts, 4))
    write_text(opts.out, text, stdout)
    if getattr(opts, "curves", None):
        write_text(opts.curves, export.curves_csv(reply), stdout)
    return EXIT_OK


def _run(argv: Sequence[str] | None, stdout: TextIO, stderr: TextIO) -> int:
    description = api.describe()
    parser, info = build_parser(description)
    opts = parser.parse_args(argv)
    calcs = description["calculations"]
    READ_PATHS.clear()
    digits = getattr(opts, "digits", None)
    if digits is not None and not 0 <= digits <= MAX_DIGITS:
        raise UserError(
            "digits",
            f"--digits must be from 0 to {MAX_DIGITS} significant figures (0 for full "
            f"precision), not {digits}.",
        )

    if opts.command == "describe":
        unknown = [k for k in opts.kinds if k not in calcs]
        if unknown:
            raise UserError(
                "kind", f"unknown calculation {unknown[0]!r}; valid: {', '.join(calcs)}."
            )
        if opts.format == "json":
            if opts.kinds:
                description = {
                    **description,
                    "calculations": {k: v for k, v in calcs.items() if k in opts.kinds},
                }
            write_text(None, json.dumps(description, indent=2, ensure_ascii=False) + "\n", stdout)
        else:
            write_text(None, describe_text(description, opts.kinds), stdout)
        return EXIT_OK

    if opts.command == "run":
        doc = load_document(opts.file)
        kind = opts.kind or document_kind(doc)
        if kind is None:
            raise UserError("kind", "the file names no calculation ('kind').")
        if kind not in calcs or kind in COMMANDS:
            valid = ", ".join(k for k in calcs if k not in COMMANDS)
            raise UserError("kind", f"unknown calculation {kind!r}; valid: {valid}.")
        return compute(kind, calcs[kind], document_inputs(doc, kind), {}, opts, stdout, stderr)

    origins: dict[str, str] = {}
    if opts.command == "batch":
        kind = opts.batch_kind
        fmap, file_field = info["batch"][kind]
        base = document_inputs(load_document(opts.input), kind) if opts.input else {}
        base = flag_inputs(opts, fmap, base, origins)
        choice, value = source_choice(file_field)
        if choice:  # every run reads its file, as choosing the file on the page
            given = getattr(opts, f"field:{choice}", value)
            if given != value:
                raise UserError(choice, f"batch runs read each file: {choice} must be {value!r}.")
            base[choice] = value
        return run_batch(kind, calcs[kind], base, file_field, opts, stdout, stderr)

    kind = opts.command
    base = document_inputs(load_document(opts.input), kind) if opts.input else {}
    inputs = flag_inputs(opts, info["calc"][kind], base, origins)
    return compute(kind, calcs[kind], inputs, origins, opts, stdout, stderr)


def main(argv: Sequence[str] | None = None) -> int:
    """Run the command line; return the exit status (0 ok, 2 invalid input, 1 failure)."""
    stdout, stderr = sys.stdout, sys.stderr
    for stream in (stdout, stderr):  # never fail on a console that cannot show µ or ⁻¹¹
        if isinstance(stream, io.TextIOWrapper) and stream.encoding.lower() not in (
            "utf-8",
            "utf8",
        ):
            stream.reconfigure(errors="replace")
    code = _main(argv, stdout, stderr)
    try:  # what argparse printed (--help) is still buffered: fail here, not at exit
        stdout.flush()
    except BrokenPipeError:
        silence_stdout(stdout)
        return EXIT_FAILURE
    except OSError as exc:
        silence_stdout(stdout)
        stderr.write(f"out: cannot write to standard output: {exc.strerror or exc}.\n")
        return EXIT_USAGE
    return code


def _main(argv: Sequence[str] | None, stdout: TextIO, stderr: TextIO) -> int:
    try:
        return _run(argv, stdout, stderr)
    except UserError as exc:
        stderr.write(f"{exc.field}: {exc.message}\n")
        return EXIT_USAGE
    except SystemExit as exc:  # argparse: --help, --version, usage errors
        code = exc.code
        return code if isinstance(code, int) else (EXIT_OK if code is None else EXIT_USAGE)
    except BrokenPipeError:  # e.g. piped into `head`
        silence_stdout(stdout)
        return EXIT_FAILURE
    except KeyboardInterrupt:
        stderr.write("interrupted\n")
        return 130
    except Exception as exc:  # a fault of this program, not of the input: one line, status 1
        if os.environ.get("DRIFTDOSE_DEBUG"):
            raise
        what = " ".join(str(exc).split())[:200]
        stderr.write(
            f"internal error: {type(exc).__name__}{': ' + what if what else ''} (a fault in "
            "driftdose, not in your input; set DRIFTDOSE_DEBUG=1 for the details)\n"
        )
        return EXIT_FAILURE
