"""Does an archived sheet still reproduce? Its attachments are checked against the content
hash recorded at build (bench/sheet_file.py), then the attached job is designed again with
the installed sheetgen and every value that moved is listed (report/diff.py compares).

A sheet whose design used parts-library entries carries them (library.yaml, covered by the
content hash): the job is designed again from those, wherever the sheet is checked, unless
--library names another folder. Every section of the results is compared, the test record's windows included (a sheet
whose windows were widened and its hash recomputed does not reproduce). Numbers agree
within the diff's relative tolerance of 1e-9; a frequency window edge (limits, or a test
record row's min/max) agrees when it moved by no more than the window's resolution
(limits.resolution_hz), since edges are rounded outward to it.
"""

from __future__ import annotations

import tempfile
from dataclasses import dataclass
from pathlib import Path

from sheetgen import __version__
from sheetgen.bench.sheet_file import SheetFile, read_sheet
from sheetgen.report.diff import DiffRow, diff_rows, unit_of


@dataclass(frozen=True)
class Verification:
    """One sheet checked: who built it, who checked it, and what moved."""

    sheet: SheetFile
    archived_version: str
    checked_version: str
    drift: tuple[DiffRow, ...]
    library_source: str = ""  # where the parts-library entries came from ("" when none)

    @property
    def reproduces(self) -> bool:
        return not self.drift


def _within_resolution(row: DiffRow, resolution_hz: float | None) -> bool:
    edge = (row.key.endswith("_hz") if row.section == "limits" else
            row.section == "test_record" and row.key.endswith((".min", ".max"))
            and unit_of(row.key) == "Hz")
    if not edge or not isinstance(resolution_hz, (int, float)) or not resolution_hz > 0:
        return False
    if not all(isinstance(v, (int, float)) for v in (row.a, row.b)):
        return False
    return abs(row.a - row.b) <= resolution_hz * (1 + 1e-9)


def verify_sheet(path: Path, library_folder: Path | None = None,
                 trust_roots: list | None = None) -> Verification:
    """Check one sheet; InputError when it is not a sheetgen sheet, was altered, or (with
    `trust_roots`) is not signed by a certificate they issued."""
    from sheetgen.design.pipeline import design_from_file
    from sheetgen.inputs.library import find_library_folder
    from sheetgen.inputs.reader import compose_located
    from sheetgen.report.results import results_document
    sheet = read_sheet(path, trust_roots)
    job = compose_located(sheet.job_text, str(path)).data
    named = job.get("library") if isinstance(job, dict) else None
    with tempfile.TemporaryDirectory(prefix="sheetgen-verify-") as folder:
        job_path = Path(folder) / "job.yaml"
        job_path.write_text(sheet.job_text, encoding="utf-8")
        if sheet.library_text is not None and library_folder is None:
            library = Path(folder) / "recorded-library"
            library.mkdir()
            (library / "library.yaml").write_text(sheet.library_text, encoding="utf-8")
            source = "the library entries recorded in the sheet"
        else:
            library = library_folder or find_library_folder(Path(path), named, None)
            source = f"the parts library in {library}"
        design = design_from_file(job_path, library)
        fresh = results_document(design)
        if not design.library_entries:
            source = ""
    archived = sheet.results
    resolution = (archived.get("limits") or {}).get("resolution_hz")
    drift = tuple(row for row in diff_rows(job, archived, job, fresh)
                  if not _within_resolution(row, resolution))
    return Verification(sheet, str(archived.get("tool_version", "unknown")), __version__, drift,
                        source)
