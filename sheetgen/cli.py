"""The command line: a thin shell over load_job → design → results / sheet.

Exit codes: 0 all well; 1 the design fails a check; 2 bad input or usage. Problems are
printed one a line, never as a traceback; an output file is written whole or not at all.
"""

from __future__ import annotations

import argparse
import os
import sys
import tempfile
from pathlib import Path

from sheetgen import __version__
from sheetgen.design.pipeline import design_from_file
from sheetgen.design.records import Design
from sheetgen.errors import InputError
from sheetgen.inputs.starters import TEMPLATE_NAMES, demo_job_path, template_text
from sheetgen.report.checks import failed_checks
from sheetgen.report.summary import summary_text

EXIT_OK, EXIT_CHECK_FAILED, EXIT_BAD_INPUT = 0, 1, 2


class UsageError(Exception):
    """Bad command-line usage (exit 2)."""


class _Parser(argparse.ArgumentParser):
    def error(self, message):  # argparse would exit 2 with its own text; keep ours uniform
        raise UsageError(message)


def build_parser() -> argparse.ArgumentParser:
    parser = _Parser(prog="sheetgen", description="Design, check and document a tuned LC "
                     "circuit from one YAML job file.")
    parser.add_argument("--version", action="version", version=f"sheetgen {__version__}")
    commands = parser.add_subparsers(dest="command", required=True, parser_class=_Parser)

    check = commands.add_parser("check", help="compute the design and print a summary")
    check.add_argument("job", type=Path, help="YAML job file")
    check.add_argument("--json", action="store_true", help="print the results as JSON")
    check.add_argument("--library", type=Path, help="parts library folder (default: see README)")

    build = commands.add_parser("build", help="write the PDF build-and-test sheet")
    build.add_argument("job", type=Path, help="YAML job file")
    build.add_argument("-o", "--output", type=Path, help="PDF to write (default: JOB.pdf)")
    build.add_argument("--results", type=Path, help="also write the results JSON here")
    build.add_argument("--library", type=Path, help="parts library folder (default: see README)")
    build.add_argument("--style", type=Path, help="house style file (default: the job's "
                       "sheet.style, else the default style)")

    limits = commands.add_parser("limits", help="write the test limits for a work order")
    limits.add_argument("job", type=Path, help="YAML job file")
    limits.add_argument("--format", choices=("csv", "json"), default="csv",
                        help="csv (default) or json")
    limits.add_argument("-o", "--output", type=Path, help="file to write (default: print)")
    limits.add_argument("--library", type=Path, help="parts library folder (default: see README)")
    limits.add_argument("--allow-failing", action="store_true",
                        help="write the limits even when the design fails a check")

    demo = commands.add_parser("demo", help="build the bundled demo job's sheet")
    demo.add_argument("-o", "--output", type=Path, default=Path("demo.pdf"),
                      help="PDF to write (default: demo.pdf)")

    new = commands.add_parser("new", help="print a starter job file")
    new.add_argument("kind", choices=TEMPLATE_NAMES, help="which starter")

    schema = commands.add_parser("schema", help="print the JSON Schema of job files")
    schema.add_argument("--markdown", action="store_true",
                        help="print the job file reference in Markdown instead")
    return parser


def main(argv: list[str] | None = None) -> int:
    try:
        args = build_parser().parse_args(argv)
    except UsageError as error:
        print(f"sheetgen: {error} (see `sheetgen --help`)", file=sys.stderr)
        return EXIT_BAD_INPUT
    except SystemExit as done:  # --help and --version
        return int(done.code or 0)
    try:
        return COMMANDS[args.command](args)
    except InputError as error:
        for problem in error.problems:
            print(problem, file=sys.stderr)
        return EXIT_BAD_INPUT
    except UsageError as error:
        print(f"sheetgen: {error}", file=sys.stderr)
        return EXIT_BAD_INPUT
    except OSError as error:
        print(f"sheetgen: {error.filename or ''}: {error.strerror or error}", file=sys.stderr)
        return EXIT_BAD_INPUT
    except KeyboardInterrupt:
        print("sheetgen: interrupted; nothing written", file=sys.stderr)
        return EXIT_BAD_INPUT
    except BrokenPipeError:
        return EXIT_OK


def _new(args) -> int:
    sys.stdout.write(template_text(args.kind))
    return EXIT_OK


def _schema(args) -> int:
    if args.markdown:
        from sheetgen.inputs.jobdoc import job_reference_markdown
        sys.stdout.write(job_reference_markdown())
    else:
        from sheetgen.inputs.schema import job_schema_json
        sys.stdout.write(job_schema_json())
    return EXIT_OK


def _check(args) -> int:
    design = design_from_file(args.job, args.library)
    if args.json:
        from sheetgen.report.results import results_json
        sys.stdout.write(results_json(design))
    else:
        sys.stdout.write(summary_text(design))
    return _exit_for(design)


def _limits(args) -> int:
    from sheetgen.report.results import limits_csv, limits_json
    design = design_from_file(args.job, args.library)
    if failed_checks(design) and not args.allow_failing:
        code = _exit_for(design)
        print("limits not written: the design fails the checks above, so a unit built to it "
              "cannot be trusted to its windows; fix the design, or pass --allow-failing",
              file=sys.stderr)
        return code
    text = limits_csv(design) if args.format == "csv" else limits_json(design)
    if args.output is None:
        sys.stdout.write(text)
    else:
        write_atomically(args.output, text.encode("utf-8"))
        print(f"wrote {args.output}")
    return _exit_for(design)


def _build_command(args) -> int:
    return _build_sheet(args.job, args.output, args.results, args.style, args.library)


def _demo(args) -> int:
    return _build_sheet(demo_job_path(), args.output, None, None, None)


def _build_sheet(job_path: Path, output: Path | None, results_path: Path | None,
                 style_path: Path | None, library_folder: Path | None) -> int:
    from sheetgen.inputs.style import resolve_style
    design = design_from_file(job_path, library_folder)
    output = output or job_path.with_suffix(".pdf")
    style = resolve_style(job_path, design.job, style_path, library_folder)
    _build(design, job_path, output, results_path, style)
    print(f"wrote {output}")
    return _exit_for(design)


COMMANDS = {"check": _check, "build": _build_command, "limits": _limits, "demo": _demo,
            "new": _new, "schema": _schema}


def _exit_for(result: Design) -> int:
    """1 when the design fails one of its checks (each printed to stderr), else 0."""
    failures = failed_checks(result)
    for failure in failures:
        print(f"check failed: {failure.field}: {failure.text}", file=sys.stderr)
    return EXIT_CHECK_FAILED if failures else EXIT_OK


def _build(result: Design, job_path: Path, output: Path, results_path: Path | None,
           style=None) -> None:
    from sheetgen.report.results import results_json
    from sheetgen.sheet import render_sheet
    job_text = job_path.read_text(encoding="utf-8")
    results_text = results_json(result)
    pdf = render_sheet(result, job_text=job_text, results_text=results_text,
                       job_dir=job_path.resolve().parent, style=style)
    if results_path is not None:
        write_atomically(results_path, results_text.encode("utf-8"))
    write_atomically(output, pdf)


def _file_mode(path: Path) -> int:
    """The mode of the file being replaced, else what a new file gets under the umask."""
    if path.exists():
        return path.stat().st_mode & 0o777
    mask = os.umask(0)
    os.umask(mask)
    return 0o666 & ~mask


def write_atomically(path: Path, data: bytes) -> None:
    """Write to a temporary file beside `path`, then rename over it: whole or not at all."""
    directory = path.resolve().parent
    if not directory.is_dir():
        raise UsageError(f"cannot write {path}: the folder {directory} does not exist")
    handle, temporary = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".part", dir=directory)
    try:
        os.chmod(temporary, _file_mode(path))  # mkstemp makes 0600; a sheet is for sharing
        with os.fdopen(handle, "wb") as stream:
            stream.write(data)
            stream.flush()
            os.fsync(stream.fileno())
        os.replace(temporary, path)
    except BaseException:
        Path(temporary).unlink(missing_ok=True)
        raise


if __name__ == "__main__":
    sys.exit(main())
