"""The command line: a thin shell over load_job → design → results / sheet.

Exit codes: 0 all well; 1 the design fails a check; 2 bad input or usage. Problems are
printed one a line, never as a traceback; an output file is written whole or not at all.
"""

from __future__ import annotations

import argparse
import sys
from pathlib import Path

from sheetgen import __version__
from sheetgen.batch.outputs import OutputFolderError, refuse_overlaps, write_all, write_sheet
from sheetgen.errors import InputError, Problem
from sheetgen.inputs.starters import TEMPLATE_NAMES, demo_job_path, template_text

# The design and report rooms (pydantic, numpy, scipy) are imported by the commands that
# use them, so `new`, `--version` and argument errors start at once.

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

    check = commands.add_parser("check", help="compute the design and print a summary "
                                "(a single job may leave out its sheet identity, drive and "
                                "part losses: the defaults taken are printed)")
    _job_arguments(check)
    check.add_argument("--json", action="store_true", help="print the results as JSON")
    check.add_argument("--brief", action="store_true", help="print only the figures asked "
                       "first (f0, Q, bandwidth, |Z|, stresses) and the checks")
    check.add_argument("--library", type=Path, help="parts library folder (default: see README)")

    build = commands.add_parser("build", help="write the PDF build-and-test sheet")
    _job_arguments(build)
    build.add_argument("-o", "--output", type=Path, help="PDF to write (default: JOB.pdf)")
    build.add_argument("--results", type=Path, help="also write the results JSON here")
    build.add_argument("--library", type=Path, help="parts library folder (default: see README)")
    build.add_argument("--style", type=Path, help="house style file (default: the job's "
                       "sheet.style, else the default style)")
    build.add_argument("--force", action="store_true", help="replace a sheet of the same id "
                       "and revision whose content differs")
    build.add_argument("--sign", type=Path, metavar="KEY.p12", help="sign the sheet with the "
                       "key and certificate in this PKCS#12 file (its passphrase in the "
                       "environment variable SHEETGEN_SIGN_PASSPHRASE)")

    limits = commands.add_parser("limits", help="write the test limits for a work order")
    _job_arguments(limits)
    limits.add_argument("--format", choices=("csv", "json"), default="csv",
                        help="csv (default) or json")
    limits.add_argument("-o", "--output", type=Path, help="file to write (default: print)")
    limits.add_argument("--library", type=Path, help="parts library folder (default: see README)")
    limits.add_argument("--allow-failing", action="store_true",
                        help="write the limits even when the design fails a check")

    diff = commands.add_parser("diff", help="what changed between two revisions of a job")
    diff.add_argument("a", type=Path, help="the earlier job file (or built sheet .pdf)")
    diff.add_argument("b", type=Path, help="the later job file (or built sheet .pdf)")
    diff.add_argument("--json", action="store_true",
                      help="print the changes as JSON: a list of {section, key, a, b}")
    diff.add_argument("--library", type=Path, help="parts library folder (default: see README)")
    _trust_argument(diff)

    verify = commands.add_parser("verify", help="check that archived sheets are intact and "
                                 "still reproduce with this version")
    verify.add_argument("sheets", type=Path, nargs="+", help="built sheets (.pdf)")
    verify.add_argument("--library", type=Path, help="parts library folder for jobs that name "
                        "cores (default: found from the sheet's folder, as for a job)")
    _trust_argument(verify)

    netlist = commands.add_parser("netlist", help="write the circuit as analysed as a SPICE "
                                  "netlist with its sweep and measures")
    netlist.add_argument("job", type=Path, metavar="JOB", help="YAML job file")
    netlist.add_argument("-o", "--output", type=Path, help="file to write (default: print)")
    netlist.add_argument("--library", type=Path, help="parts library folder (default: see README)")

    demo = commands.add_parser("demo", help="build the bundled demo job's sheet")
    demo.add_argument("-o", "--output", type=Path, default=Path("demo.pdf"),
                      help="PDF to write (default: demo.pdf)")
    demo.add_argument("--force", action="store_true", help="replace a sheet of the same id "
                      "and revision whose content differs")

    new = commands.add_parser("new", help="print a starter job file")
    new.add_argument("kind", choices=TEMPLATE_NAMES, help="which starter")

    _grade_arguments(commands)

    schema = commands.add_parser("schema", help="print the JSON Schema of job files")
    schema.add_argument("--markdown", action="store_true",
                        help="print the job file reference in Markdown instead")
    return parser


def _trust_argument(command: argparse.ArgumentParser) -> None:
    command.add_argument("--trust", type=Path, action="append", metavar="CERT.pem",
                         help="a trust root (X.509 certificate, PEM or DER; repeatable): a "
                         "sheet must be signed by a certificate it issued")


def _trust_roots(args) -> list | None:
    if not getattr(args, "trust", None):
        return None
    from sheetgen.bench.signature import load_trust_roots
    return load_trust_roots(args.trust)


def _job_arguments(command: argparse.ArgumentParser) -> None:
    """JOB [JOB ...]: one job file runs as always; several, or a folder, run as a batch."""
    command.add_argument("job", type=Path, metavar="JOB",
                         help="YAML job file, or a folder of job files")
    command.add_argument("more_jobs", type=Path, nargs="*", metavar="JOB",
                         help="more job files or folders: run as a batch")
    command.add_argument("-j", "--jobs", type=int, metavar="N", dest="workers",
                         help="batch: worker processes (default: the number of CPUs)")
    command.add_argument("--out-dir", type=Path, metavar="DIR",
                         help="batch: write each job's output here, named after the job")
    command.add_argument("--timeout", type=float, metavar="SECONDS", help="batch: stop a job "
                         "that runs longer than this (default: 300)")


def main(argv: list[str] | None = None) -> int:
    import logging
    # pypdf's own notes on a damaged PDF are not ours to print: a file we cannot read is
    # reported once, by name, as bad input.
    logging.getLogger("pypdf").setLevel(logging.CRITICAL)
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
    except (UsageError, OutputFolderError) as error:
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
    if _is_batch(args):
        return _batch(args, "check")
    if args.json and args.brief:
        raise UsageError("--json and --brief: choose one")
    from sheetgen.design.pipeline import quick_design_from_file
    from sheetgen.report.summary import assumed_lines, brief_text, judged_checks, summary_text
    design, assumed = quick_design_from_file(args.job, args.library)
    _notices(design)
    if args.json:
        from sheetgen.report.results import results_json
        sys.stdout.write(results_json(design))
        for line in assumed_lines(assumed):  # the JSON stays a results document
            print(line, file=sys.stderr)
    else:
        sys.stdout.write((brief_text if args.brief else summary_text)(design, assumed))
    failures, _ = judged_checks(design, assumed)
    for failure in failures:
        print(f"check failed: {failure.field}: {failure.text}", file=sys.stderr)
    return EXIT_CHECK_FAILED if failures else EXIT_OK


def _limits(args) -> int:
    if _is_batch(args):
        return _batch(args, "limits")
    from sheetgen.design.pipeline import design_from_file
    from sheetgen.report.checks import failed_checks
    from sheetgen.report.results import limits_csv, limits_json
    if args.output is not None:
        refuse_overlaps([("the job file", args.job)], [("--output", args.output)])
    design = design_from_file(args.job, args.library)
    _notices(design)
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
        write_all([(args.output, text.encode("utf-8"))])
        print(f"wrote {args.output}")
    return _exit_for(design)


def _netlist(args) -> int:
    from sheetgen.design.pipeline import design_from_file
    from sheetgen.report.netlist import spice_netlist
    if args.output is not None:
        refuse_overlaps([("the job file", args.job)], [("--output", args.output)])
    text = spice_netlist(design_from_file(args.job, args.library))
    if args.output is None:
        sys.stdout.write(text)
    else:
        write_all([(args.output, text.encode("ascii"))])
        print(f"wrote {args.output}")
    return EXIT_OK


def _build_command(args) -> int:
    if _is_batch(args):
        return _batch(args, "build")
    return _build_sheet(args.job, args.output, args.results, args.style, args.library,
                        args.force, args.sign)


def _demo(args) -> int:
    return _build_sheet(demo_job_path(), args.output, None, None, None, args.force)


def _build_sheet(job_path: Path, output: Path | None, results_path: Path | None,
                 style_path: Path | None, library_folder: Path | None,
                 force: bool = False, sign_key: Path | None = None) -> int:
    from sheetgen.design.pipeline import design_from_file
    from sheetgen.inputs.style import resolve_style
    sign = None
    if sign_key is not None:
        from sheetgen.bench.signature import load_signer, sign_pdf
        signer = load_signer(sign_key)

        def sign(pdf: bytes) -> bytes:
            try:
                return sign_pdf(pdf, signer)
            except Exception as error:  # noqa: BLE001 - pyHanko's many kinds, worded once
                raise InputError([Problem(str(sign_key), 1, 1, "signature",
                                          f"the sheet cannot be signed with this key ({error})",
                                          "a PKCS#12 file with an RSA or EC signing key and "
                                          "its certificate")]) from None
    output = output or job_path.with_suffix(".pdf")
    outputs = [("--output", output)] + ([("--results", results_path)] if results_path else [])
    inputs = [("the job file", job_path)] + ([("--style", style_path)] if style_path else [])
    refuse_overlaps(inputs, outputs)
    design = design_from_file(job_path, library_folder)
    _notices(design)
    style = resolve_style(job_path, design.job, style_path, library_folder)
    from sheetgen.inputs.library import find_library_folder, library_files
    folder = find_library_folder(job_path, design.job.library, library_folder)
    used = [("the parts library file", path) for path in
            (library_files(folder) if folder.is_dir() else [])]
    if style is not None:  # the style the job named, and its logo, are inputs too
        used += [("the style file", Path(style.source))]
        used += [("the logo", style.logo_path)] if style.logo_path else []
    refuse_overlaps(used, outputs)
    if write_sheet(design, job_path, output, results_path, style, force, sign):
        print(f"wrote {output}" + (f" (signed with {sign_key})" if sign else ""))
    else:
        sheet = design.job.sheet
        print(f"{output} already holds {sheet.id} rev {sheet.revision} with this content; "
              "nothing written")
    return _exit_for(design)


def _is_batch(args) -> bool:
    """Several jobs, a folder of job files, or --out-dir: a batch; else the single-job
    command (which reports a folder without job files as not a job file)."""
    if args.more_jobs or args.out_dir is not None:
        return True
    if args.job.is_dir():
        from sheetgen.batch.runner import collect_jobs
        return bool(collect_jobs([args.job]))
    return False


# --------------------------------------------------------------------------- grade
# (self-contained: the grade command's arguments and handler)


def _grade_arguments(commands) -> None:
    grade = commands.add_parser("grade", help="grade a filled test record or a measured sweep "
                                "against the sheet's windows, and keep the unit's record")
    grade.add_argument("sheet", type=Path, help="the build-and-test sheet PDF (filled in)")
    grade.add_argument("--sweep", type=Path, help="a measured sweep (Touchstone .s1p/.s2p or "
                       "CSV) whose figures replace the typed f0, half-power points, bandwidth "
                       "and loaded Q")
    grade.add_argument("--parameter", choices=("s21", "s11"), help="which parameter of a "
                       "two-port Touchstone sweep to read (default: s21)")
    grade.add_argument("--json", type=Path, metavar="FILE", help="write the unit's record "
                       "(sheetgen.record/1) as JSON")
    grade.add_argument("--csv", type=Path, metavar="FILE", help="write the unit's record as "
                       "CSV (header and one line)")
    grade.add_argument("--append", type=Path, metavar="FILE.csv", help="add the unit's line "
                       "to a running CSV log")
    grade.add_argument("-o", "--output", type=Path, metavar="PDF", help="write a graded copy "
                       "of the sheet (with --sweep: a test report with the measured curve)")
    _trust_argument(grade)


def _grade(args) -> int:
    from sheetgen.bench.grade import UNIT_PASS, bandwidth_resolution_hz, grade_sheet, grading_table
    from sheetgen.bench.record import append_data, append_record, record_csv, record_json
    from sheetgen.bench.sheet_file import read_sheet
    outputs = [(option, path) for option, path in (("--output", args.output), ("--json", args.json),
               ("--csv", args.csv), ("--append", args.append)) if path is not None]
    refuse_overlaps([("the sheet", args.sheet)]
                    + ([("the sweep", args.sweep)] if args.sweep is not None else []), outputs)
    if args.parameter and args.sweep is None:
        raise UsageError("--parameter needs --sweep")
    sheet = read_sheet(args.sheet, _trust_roots(args))
    features = sweep = None
    if args.sweep is not None:
        from sheetgen.bench.sweep import sweep_features
        from sheetgen.bench.sweep_files import read_sweep, require_reach
        sweep = read_sweep(args.sweep, args.parameter)
        require_reach(sweep, sheet.results)
        features = sweep_features(sweep, bandwidth_resolution_hz(sheet.results))
    grading = grade_sheet(sheet, features, str(args.sweep) if args.sweep else None)
    sys.stdout.write(grading_table(grading))
    if grading.problems:
        raise InputError(list(grading.problems))
    record_text = record_json(grading)
    # Every output is made first (the log's line checked against its header too), then all
    # are written: all of them, or none.
    items = []
    if args.output is not None:
        if sweep is not None:
            from sheetgen.bench.report_pdf import sweep_report
            pdf = sweep_report(grading, sweep, features, record_text, args.sweep)
        else:
            from sheetgen.bench.graded_copy import graded_copy
            from sheetgen.bench.sheet_file import MAX_SHEET_BYTES
            from sheetgen.inputs.files import read_bounded
            pdf = graded_copy(read_bounded(args.sheet, MAX_SHEET_BYTES, "sheet PDF"), grading)
        items.append((args.output, pdf))
    if args.json is not None:
        items.append((args.json, record_text.encode("utf-8")))
    if args.csv is not None:
        items.append((args.csv, record_csv(grading).encode("utf-8")))
    appended = append_data(args.append, grading) if args.append is not None else None
    write_all(items)
    for path, _ in items:
        print(f"wrote {path}")
    if appended is not None:
        append_record(args.append, grading, appended)
        print(f"added a line to {args.append}")
    if grading.verdict != UNIT_PASS:
        for value in grading.as_left:
            if value.verdict == "fail" or (value.required and value.verdict != "pass"):
                print(f"grade: {value.field}: {value.verdict}", file=sys.stderr)
        return EXIT_CHECK_FAILED
    return EXIT_OK


# --------------------------------------------------------------------------- commands

def _batch(args, command: str) -> int:
    from sheetgen.batch.runner import (
        JOB_TIMEOUT_S,
        JobTask,
        collect,
        default_workers,
        output_path,
        run_batch,
    )
    if getattr(args, "sign", None) is not None:
        raise UsageError("--sign signs one sheet; build each job on its own to sign it")
    for option in ("output", "results"):
        if getattr(args, option, None) is not None:
            raise UsageError(f"--{option} names one file; for several jobs use --out-dir")
    if args.workers is not None and args.workers < 1:
        raise UsageError("-j needs at least 1 worker")
    if args.timeout is not None and not 0 < args.timeout <= 86_400:
        raise UsageError("--timeout needs a number of seconds above 0 (at most a day, 86400)")
    if args.out_dir is not None and args.out_dir.exists() and not args.out_dir.is_dir():
        raise UsageError(f"--out-dir {args.out_dir}: exists and is not a folder")
    jobs, skipped = collect([args.job, *args.more_jobs])
    for path, reason in skipped:
        print(f"skipped {path}: {reason}", file=sys.stderr)
    if not jobs:
        raise UsageError("no job files found (every *.yaml but house styles and parts library "
                         "files is taken as a job)")
    suffix = {"build": ".pdf", "limits": "." + getattr(args, "format", "csv")}.get(command)
    tasks, seen = [], {}
    for job in jobs:
        output = None if suffix is None else output_path(job, args.out_dir, suffix)
        if output is not None and output.resolve() in seen:
            raise UsageError(f"{job} and {seen[output.resolve()]} would both write {output}")
        if output is not None:
            seen[output.resolve()] = job
        tasks.append(JobTask(command, job, output, args.library, getattr(args, "style", None),
                             getattr(args, "json", False), getattr(args, "format", "csv"),
                             args.timeout or JOB_TIMEOUT_S))
    refuse_overlaps([("the job file", job) for job in jobs]
                    + ([("--style", args.style)] if getattr(args, "style", None) else []),
                    [(f"the output of {task.job}", task.output) for task in tasks
                     if task.output is not None])
    if args.out_dir is not None and suffix is not None:  # made (parents too) once the
        args.out_dir.mkdir(parents=True, exist_ok=True)  # jobs and outputs are known sound
    cpus = default_workers()
    if args.workers is not None and args.workers > cpus:
        print(f"sheetgen: -j {args.workers}: running {cpus} workers, the CPUs this process may "
              "use", file=sys.stderr)
    return run_batch(tasks, min(args.workers or cpus, cpus))


def _diff(args) -> int:
    from sheetgen.report.diff import diff_json, diff_rows, diff_table
    trust = _trust_roots(args)
    job_a, results_a, library_a = _diff_side(args.a, args.library, trust)
    job_b, results_b, library_b = _diff_side(args.b, args.library, trust)
    rows = diff_rows(job_a, results_a, job_b, results_b, library_a, library_b)
    sys.stdout.write(diff_json(rows) if args.json else diff_table(rows, args.a, args.b))
    return EXIT_CHECK_FAILED if rows else EXIT_OK


def _diff_side(path: Path, library_folder: Path | None,
               trust_roots: list | None = None) -> tuple[object, dict, dict]:
    """(job data, results document, library entries used) of a job file, or of a built
    sheet's attachments (its library.yaml; {} when it has none)."""
    from sheetgen.inputs.reader import compose_located, read_job_text
    if path.suffix.lower() == ".pdf":  # a built sheet: its attached job and results
        from sheetgen.bench.sheet_file import read_sheet
        sheet = read_sheet(path, trust_roots)
        library = (compose_located(sheet.library_text, str(path)).data
                   if sheet.library_text is not None else {})
        return compose_located(sheet.job_text, str(path)).data, sheet.results, library or {}
    from sheetgen.design.pipeline import design_from_file
    from sheetgen.inputs.library import library_document
    from sheetgen.report.results import results_document
    design = design_from_file(path, library_folder)
    return (compose_located(read_job_text(path), str(path)).data,
            results_document(design), library_document(design.library_entries))


def _verify(args) -> int:
    """Each sheet: reproduces (0), drifted (1, values listed) or not a sound sheet (2)."""
    from sheetgen.bench.signature import signature_text
    from sheetgen.bench.verify import verify_sheet
    from sheetgen.report.diff import diff_table
    from sheetgen.report.formatting import plural
    worst = EXIT_OK
    trust = _trust_roots(args)
    for path in args.sheets:
        try:
            result = verify_sheet(path, args.library, trust)
        except InputError as error:
            for problem in error.problems:
                print(problem, file=sys.stderr)
            worst = EXIT_BAD_INPUT
            continue
        versions = (f"built by sheetgen {result.archived_version}, checked with "
                    f"{result.checked_version}"
                    + (f"; designed from {result.library_source}" if result.library_source
                       else ""))
        sheet = result.sheet
        print(f"{path}: {signature_text(sheet.signature)}")
        if result.reproduces:
            print(f"{path}: {sheet.sheet_id} rev {sheet.revision} reproduces ({versions})")
            continue
        print(f"{path}: {sheet.sheet_id} rev {sheet.revision} does NOT reproduce ({versions}); "
              f"{plural(len(result.drift), 'value')} moved:")
        sys.stdout.write(diff_table(list(result.drift), "archived", "now"))
        worst = max(worst, EXIT_CHECK_FAILED)
    return worst


COMMANDS = {"check": _check, "build": _build_command, "limits": _limits, "diff": _diff,
            "verify": _verify, "grade": _grade, "netlist": _netlist, "demo": _demo, "new": _new, "schema": _schema}


def _notices(design) -> None:
    """What the user should know that is not a failure (printed to stderr)."""
    from sheetgen.report.parts import library_notices
    for notice in library_notices(design):
        print(notice, file=sys.stderr)


def _exit_for(result) -> int:
    """1 when the design fails one of its checks (each printed to stderr), else 0."""
    from sheetgen.report.checks import failed_checks
    failures = failed_checks(result)
    for failure in failures:
        print(f"check failed: {failure.field}: {failure.text}", file=sys.stderr)
    return EXIT_CHECK_FAILED if failures else EXIT_OK


if __name__ == "__main__":
    sys.exit(main())
