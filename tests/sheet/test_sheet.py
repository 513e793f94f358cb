"""The PDF build-and-test sheet, read back with independent tools.

Expected text is derived from the results contract (the JSON that `sheetgen build
--results` writes, DESIGN.md "Results contract") formatted with
sheetgen.quantities.format_quantity / format_number as tables.py formats each value, never
from the sheet code. The PDF is read with poppler (pdftotext, pdftoppm, pdfinfo, pdffonts),
qpdf and pypdf. Page sizes: ISO 216 (A4) and ANSI/ASME Y14.1 (Letter).
"""

from __future__ import annotations

import io
import math
import os
import re
import subprocess
import sys

import pytest
from pypdf import PdfReader

from sheetgen import __version__
from sheetgen.quantities import format_number, format_quantity
from tests.sheet.test_tools import (
    A4_PT,
    SHARED,
    TEMPLATES,
    build,
    need,
    overlapping_words,
    page_count,
    page_text,
    page_words,
    words_outside,
)
from tests.support import assert_close

pytestmark = pytest.mark.pdf

JOBS = ("series", "parallel", "demo", "toroid", "solenoid")
MARGIN_PT = 14 / 25.4 * 72 - 1.0  # the sheet's 14 mm margin, less 1 pt for glyph overhang

# How tables.py formats a value, by the unit suffix of its key (DESIGN.md: "SI units, the
# unit in the key's suffix"): engineering notation, 4 significant figures unless listed.
SUFFIX_UNITS = {"_hz": "Hz", "_ohm": "Ω", "_h": "H", "_f": "F", "_v": "V", "_a": "A",
                "_w": "W", "_t": "T", "_m": "m"}
THREE_FIGURES = {"nearest_f", "fixed_parts_f", "overall_diameter_m", "diameter_m",
                 "wire_length_m", "lead_length_m", "flux_density_peak_t", "flux_density_max_t",
                 "core_loss_w", "core_loss_table_w", "core_loss_steinmetz_w", "copper_loss_w",
                 "measure_at_hz", "winding_length_m", "pitch_m",
                 "self_capacitance_f"}
PLAIN_NUMBERS = {"q_inductor", "q_capacitor", "q_unloaded", "q_loaded", "q_estimated", "q_used",
                 "nagaoka_coefficient"}
# Keys the sheet does not print, and why (a path, or a prefix ending in ".").
NOT_PRINTED = {
    "format": "the contract's version, for machines",
    "variation.f0_hz.": "percentile statistics for scripts; the sheet prints the windows",
    "variation.f_peak_hz.": "percentile statistics for scripts; the sheet prints the windows",
    "variation.bandwidth_hz.": "percentile statistics for scripts; the sheet prints the windows",
    "variation.q_loaded.": "percentile statistics for scripts; the sheet prints the windows",
    "variation.impedance_at_peak_ohm.": "percentile statistics for scripts",
    "limits.nan_trials": "a count of failed trials, for scripts",
    "limits.f0_for_tuned_unit": "printed as the 'Units tested' wording",
    "components.capacitor_build.series": "printed inside labels such as 'Fixed E12 part(s)'",
    "inductor.wire.awg": "printed as the wire's name (AWG 24)",
    "inductor.wire.grade": "printed as 'grade 2 enamel'",
    "inductor.check.tolerance": "the same figure as inductor.inductance_tolerance",
    "test_record.fixture.source.wanted_ohm": "the design's Rs, printed with the components",
    "test_record.fixture.receiver.wanted_ohm": "the design's load, printed with the components",
    "test_record.fixture.receiver.ratio": "(N/M)², for scripts; the sheet prints the turns",
    "test_record.fixture.resonance.impedance_at_peak_ohm": "the bench |Z|, for scripts",
}
DRIVE_UNITS = {"voltage": "V", "current": "A", "available_power": "W"}
# The record's field names are a contract with work-order systems: spelled out here.
STABLE_FIELDS = [
    "measured.inductance_h", "measured.capacitance_f", "measured.f0_hz", "measured.f_low_hz",
    "measured.f_high_hz", "measured.bandwidth_hz", "measured.q_loaded",
    "verdict.f0", "verdict.f_low", "verdict.f_high", "verdict.bandwidth", "verdict.q_loaded",
    "verdict.overall", "record.serial", "record.work_order", "record.technician",
    "record.date", "record.ambient_c", "record.instruments", "record.remarks",
]
AS_FOUND = ["as_found.f0_hz", "as_found.f_low_hz", "as_found.f_high_hz",
            "as_found.bandwidth_hz", "as_found.q_loaded"]  # trimmed units only


@pytest.fixture(scope="module")
def sheets(tmp_path_factory):
    """Each template job (and the demo) built once by `sheetgen build`."""
    need("pdftotext")
    root = tmp_path_factory.mktemp("sheets")
    return {name: build(root / name, (TEMPLATES / f"{name}.yaml").read_text(encoding="utf-8"),
                        name) for name in JOBS}


def _leaves(data, path=""):
    """(dotted path, key, value) for every leaf of the results."""
    if isinstance(data, dict):
        for key, value in data.items():
            yield from _leaves(value, f"{path}.{key}" if path else key)
    elif isinstance(data, list):
        for index, value in enumerate(data):
            yield from _leaves(value, f"{path}[{index}]")
    else:
        yield path, re.sub(r"\[\d+\]$", "", path.rsplit(".", 1)[-1]), data


def shown(path: str, key: str, value, results: dict) -> str | None:
    """The text the sheet must show for one leaf of the results (None: nothing to show)."""
    if value is None or isinstance(value, bool) or path in NOT_PRINTED or any(
            path.startswith(prefix) for prefix in NOT_PRINTED if prefix.endswith(".")):
        return None
    part = re.fullmatch(r"parts\[(\d+)\]\.(\w+)", path)
    if part and part[2] in ("unit", "condition"):
        return None  # the unit is printed with the value; the condition is worded
    if part and part[2] == "value":
        row = results["parts"][int(part[1])]
        return (format_number(value, 4) if row["kind"] == "turns_ratio"
                else format_quantity(value, row["unit"], 4))
    if re.fullmatch(r"parts\[\d+\]\.worst_case\.condition", path):
        return None
    power = re.fullmatch(r"parts\[(\d+)\]\.(worst_case\.)?power_w", path)
    if power and results["parts"][int(power[1])]["kind"] == "turns_ratio":
        return None  # an ideal turns ratio: printed as lossless
    if re.fullmatch(r"ratings\[\d+\]\.(rating|derating|unit)", path):
        return None  # the derated (allowed) value is printed, with the unit
    if re.fullmatch(r"(cautions|checks)\[\d+\]\.(code|level)", path):
        return None  # codes for machines; the signal word and the text are printed
    if path == "components.capacitor_build.nearest_f" and \
            results["components"]["capacitor_build"]["from_standard_parts"]:
        return None  # tables.py shows the nearest value only for a capacitance the job gives
    rating = re.fullmatch(r"ratings\[(\d+)\]\.(actual|allowed|margin|status)", path)
    if rating:
        entry = results["ratings"][int(rating.group(1))]
        if key == "margin":  # signed, with the true minus sign U+2212 (Unicode)
            return f"margin {value * 100:+.0f} %".replace("-", "\u2212")
        if key == "status":
            return {"pass": "pass", "fail": "FAIL", "accepted": "ACCEPTED",
                    "not rated": "NOT RATED"}[value]
        if entry["unit"] == "A/m²":
            return format_number(value * 1e-6, 3) + " A/mm²"
        return format_quantity(value, entry["unit"], 3)
    fixture = _fixture_text(path, key, value, results)
    if fixture is not False:
        return fixture
    record = re.fullmatch(r"test_record\.values\[(\d+)\]\.(\w+)", path)
    if path.startswith("test_record.measurement.") or (record and key not in ("min", "max")):
        return None  # names and units for machines; the labels wrap in the record's cells
    if record and key in ("min", "max"):
        entry = results["test_record"]["values"][int(record.group(1))]
        if not entry["unit"]:
            return format_number(value, 4)
        if entry["unit"] == "Hz":
            return _at_resolution(value, results)
        return format_quantity(value, entry["unit"], 4)
    if path == "inductor.core_loss_resistance_ohm" and results["inductor"]["form"] != "toroid":
        return None  # an air-core coil has no core loss to print
    if key == "ae_m2":
        return format_number(value * 1e6, 4) + " mm²"
    if key == "ve_m3":
        return format_number(value * 1e9, 4) + " mm³"
    if path == "limits.frequency_accuracy":
        return f"± {format_number(value * 1e6, 3)} ppm"
    if path in ("limits.lcr_accuracy", "limits.loss_spread"):
        return format_number(value * 100, 3) + " %"
    if path == "limits.inductance_tc_assumed_per_k":
        return f"{value * 1e6:+.0f} ppm/K".replace("-", "\u2212")
    if path in ("limits.sweep_step_hz", "limits.tuning_tolerance_hz"):
        return format_quantity(value, "Hz", 3)
    if re.fullmatch(r"limits\.(bench_)?temperature_(min|max)_c|"
                    r"limits\.over_temperature\.temperature_(min|max)_c", path):
        return f"{value:g}"
    if re.fullmatch(r"limits\.f_centre_(min|max)_hz", path):
        return _at_resolution(value, results)
    if re.fullmatch(r"limits\.untrimmed_f0_(min|max)_hz|"
                    r"limits\.over_temperature\.(f0|f_peak)_(min|max)_hz", path):
        return format_quantity(value, "Hz", 6)
    if re.fullmatch(r"limits\.over_temperature\.q_loaded_(min|max)", path):
        return format_number(value, 4)
    if path == "limits.coverage":
        return f"{value * 100:.2f} %"
    if key in ("capacitance_tolerance", "inductance_tolerance"):
        return format_number(value * 100, 3) + " %"
    if path == "limits.trials":
        return f"{value:,}"
    if path == "limits.seed":
        return f"seed {value}"
    if path in ("limits.temperature_min_c", "limits.temperature_max_c"):
        return f"{value:g}"
    if path == "limits.trimmer_fraction_tunable":
        return None if results["limits"]["trimmer_covers"] else f"{value * 100:.1f} %"
    if path in ("limits.f0_min_hz", "limits.f0_max_hz", "limits.f_peak_min_hz",
                "limits.f_peak_max_hz", "limits.f_low_min_hz", "limits.f_low_max_hz",
                "limits.f_high_min_hz", "limits.f_high_max_hz", "limits.bandwidth_min_hz",
                "limits.bandwidth_max_hz"):
        return _at_resolution(value, results)
    if path in ("limits.q_loaded_min", "limits.q_loaded_max", "limits.q_unloaded_min",
                "limits.q_unloaded_max"):
        return format_number(value, 4)
    if path in ("limits.impedance_at_peak_min_ohm", "limits.impedance_at_peak_max_ohm"):
        return format_quantity(value, "Ω", 3)  # rounded outward to 3 figures (limits.py)
    if path == "limits.resolution_hz":
        return format_quantity(value, "Hz", 3)
    if path == "stress.drive.value":
        return format_quantity(value, DRIVE_UNITS[results["stress"]["drive"]["kind"]], 4)
    if key == "al_h_per_turn2":
        return format_quantity(value * 1e9, "", 4).strip() + " nH/turn²"
    if key == "temperature_rise_k":
        return format_number(value, 3) + " K"
    if key == "winding_angle_deg":
        return format_number(value, 3) + "°"
    if key in ("turns", "turns_per_layer"):
        return str(value)
    if key == "link_turns":
        return f"{value} turn"
    if key in PLAIN_NUMBERS:
        return format_number(value, 4)
    if isinstance(value, str):
        return value
    if path.startswith("components.derived") and key == "value":
        entry = results["components"]["derived"][int(re.search(r"\[(\d+)\]", path).group(1))]
        return format_quantity(value, entry["unit"], 4)
    for suffix, unit in SUFFIX_UNITS.items():
        if key.endswith(suffix):
            return format_quantity(value, unit, 3 if key in THREE_FIGURES else 4)
    raise AssertionError(f"no rule says how the sheet shows {path} = {value!r}; add one")


def _fixture_text(path: str, key: str, value, results: dict):
    """How the test set-up (procedure step 5 and the limits' "Test set-up" row) prints a
    value of test_record.fixture; False for a path outside it."""
    if not path.startswith("test_record.fixture."):
        return False
    if key in ("hookup", "place"):
        return None  # codes for machines; the set-up words them
    if key == "port_resistance_ohm":
        return f"{value:g} Ω"
    if key in ("port_tolerance", "resistor_tolerance", "band"):
        return f"± {format_number(value * 100, 3)} %"
    if key == "resistor_ohm":
        return format_quantity(value, "Ω", 3)  # an E96 value has three figures
    if key == "power_rating_w":
        return f"{value:g} W"
    if key in ("generator_level_dbm", "received_dbm", "noise_floor_dbm"):
        return f"{value:+.1f} dBm".replace("-", "\u2212")
    if key == "half_power_margin_db":
        return format_number(value, 3) + " dB"
    if key == "resistor_shunt_capacitance_f":
        return f"{value * 1e12:g} pF"
    if key == "resistor_lead_inductance_h":
        return f"{value * 1e9:g} nH"
    if key == "probe_gain":
        return f"÷{1 / value:g}"
    if path.endswith(("source.capacitance_f", "receiver.capacitance_f")):
        return format_quantity(value, "F", 2)  # a coupling capacitor or a probe's input
    if key == "source_capacitance_f":
        return format_quantity(value, "F", 3)
    if path == "test_record.fixture.circuit.capacitance_f":
        return format_quantity(value, "F", 4)
    if path == "test_record.fixture.resonance.bandwidth_hz":
        return _at_resolution(value, results)  # the record's expected bandwidth
    if path == "test_record.fixture.resonance.f_peak_hz":
        q = results["test_record"]["fixture"]["resonance"]["q_loaded"]
        trimmed = results["components"]["capacitor_build"]["trimmer_setting_f"] is not None
        return format_quantity(value, "Hz", 4) if q >= 20 or trimmed else None
    if key == "q_loaded":
        return format_number(value, 4)
    unit = {"ohm": "Ω", "hz": "Hz", "v": "V"}[key.rsplit("_", 1)[1]]
    return format_quantity(value, unit, 4)


def _at_resolution(value: float, results: dict) -> str:
    """A bench frequency printed to the windows' resolution, no finer (hand rule: figures =
    ⌊log10 value⌋ − ⌊log10 resolution⌋ + 1; 3.544 MHz at 1 kHz)."""
    resolution = results["limits"]["resolution_hz"]
    digits = math.floor(math.log10(value)) - math.floor(math.log10(resolution)) + 1
    return format_quantity(value, "Hz", max(digits, 1))


def expected_strings(results: dict) -> list[tuple[str, str]]:
    """(results key, text the sheet must show) for every value the results give."""
    expected = []
    for path, key, value in _leaves(results):
        if path.startswith("components.derived") and key in ("field", "unit", "reason"):
            continue  # the derivation's wording is the remark; its value is checked
        if key in ("kind", "q_source", "srf_basis", "form", "method", "distribution",
                   "capacitance_tolerance_source", "worst_case_condition") and isinstance(
                value, str):
            continue  # codes for machines; the sheet words them
        text = shown(path, key, value, results)
        if text is not None:
            expected.append((path, text))
    return expected


@pytest.mark.parametrize("name", JOBS)
def test_every_result_value_is_on_the_sheet(sheets, name):
    built = sheets[name]
    text = page_text(built.pdf_path)
    missing = [(key, shown) for key, shown in expected_strings(built.results)
               if " ".join(shown.split()) not in text]
    assert not missing, f"{name}: the sheet does not show {missing}"


def test_the_check_can_fail(sheets):
    """The value check above finds a value that is not on the sheet (a mis-scaled f0)."""
    built = sheets["series"]
    text = page_text(built.pdf_path)
    wrong = format_quantity(built.results["resonance"]["f0_hz"] * 1.37, "Hz", 4)
    assert wrong not in text


@pytest.mark.parametrize("name", JOBS)
def test_identity_on_every_page(sheets, name):
    built = sheets[name]
    sheet = built.results["sheet"]
    total = page_count(built.pdf_path)
    assert total >= 2
    for page in range(1, total + 1):
        text = page_text(built.pdf_path, page)
        for value in (sheet["id"], sheet["revision"], sheet["date"], sheet["designer"],
                      f"{page} of {total}", f"sheetgen {__version__}", "DESIGNED", "CHECKED",
                      "APPROVED", "signature"):
            assert value in text, f"{name} page {page}: {value!r} missing"
        assert sheet["title"].split()[0] in text
        assert text.count("signature") >= 3, "a signature line each for designer, checker, approver"


def test_checker_named_when_the_job_gives_one(sheets):
    text = page_text(sheets["demo"].pdf_path, 1)
    assert "T. Sample" in text  # templates/demo.yaml: checker


@pytest.mark.parametrize("name", JOBS)
def test_qpdf_finds_no_errors(sheets, name):
    done = subprocess.run([need("qpdf"), "--check", str(sheets[name].pdf_path)],
                          capture_output=True, text=True)
    assert done.returncode == 0, done.stdout + done.stderr
    assert "No syntax or stream encoding errors" in done.stdout


@pytest.mark.parametrize("name", JOBS)
def test_every_page_renders(sheets, name, tmp_path):
    built = sheets[name]
    total = page_count(built.pdf_path)
    done = subprocess.run([need("pdftoppm"), "-r", "30", "-png", str(built.pdf_path),
                           str(tmp_path / "page")], capture_output=True, text=True)
    assert done.returncode == 0 and done.stderr == "", done.stderr
    pngs = sorted(tmp_path.glob("page*.png"))
    assert len(pngs) == total
    for png in pngs:
        head = png.read_bytes()[:24]
        width, height = int.from_bytes(head[16:20], "big"), int.from_bytes(head[20:24], "big")
        # A4 at 30 dpi: 248 × 351 pixels (210 mm, 297 mm)
        assert_close(width, 210 / 25.4 * 30, abs=1.5, what="page width in pixels")
        assert_close(height, 297 / 25.4 * 30, abs=1.5, what="page height in pixels")


@pytest.mark.parametrize("name", JOBS)
def test_no_text_in_the_margins_and_no_words_overlap(sheets, name):
    for number, page in enumerate(page_words(sheets[name].pdf_path), 1):
        assert page.words, f"page {number} has no text"
        outside = words_outside(page, MARGIN_PT)
        assert not outside, f"{name} page {number}: text in the margin: {outside[:5]}"
        overlaps = overlapping_words(page.words)
        assert not overlaps, f"{name} page {number}: overlapping words: {overlaps[:5]}"


def test_overlap_check_can_fail():
    """The overlap and margin checks find what they look for (two boxes drawn on each other)."""
    from tests.sheet.test_tools import PageWords, Word
    a, b = Word(100, 100, 140, 110, "7.100"), Word(120, 102, 160, 112, "MHz")
    assert overlapping_words((a, b)) == [(a, b)]
    assert words_outside(PageWords(595, 842, (Word(10, 100, 30, 110, "x"),)), MARGIN_PT)


def test_rebuild_is_byte_identical(tmp_path):
    """Two separate processes with different hash seeds write the same bytes."""
    job = tmp_path / "demo.yaml"
    job.write_text((TEMPLATES / "demo.yaml").read_text(encoding="utf-8"), encoding="utf-8")
    outputs = []
    for seed in ("1", "2"):
        pdf = tmp_path / f"demo-{seed}.pdf"
        env = {**os.environ, "PYTHONHASHSEED": seed, "SOURCE_DATE_EPOCH": str(int(seed) * 1000)}
        done = subprocess.run([sys.executable, "-m", "sheetgen", "build", str(job), "-o",
                               str(pdf)], capture_output=True, text=True, env=env, timeout=120)
        assert done.returncode in (0, 1), done.stderr
        outputs.append(pdf.read_bytes())
    assert outputs[0] == outputs[1]
    assert b"/CreationDate (D:20261201" in outputs[0]  # the sheet's own date, not the clock


@pytest.mark.parametrize("name", JOBS)
def test_attachments_read_back_equal(sheets, name):
    built = sheets[name]
    attachments = PdfReader(io.BytesIO(built.pdf)).attachments
    library_parts = name in ("demo", "toroid")  # their cores come from the parts library
    assert sorted(attachments) == (["job.yaml", "library.yaml", "results.json"] if library_parts
                                   else ["job.yaml", "results.json"])
    assert attachments["job.yaml"] == [built.job_text.encode("utf-8")]
    assert attachments["results.json"] == [built.results_text.encode("utf-8")]


@pytest.mark.parametrize("name", JOBS)
def test_form_fields_exist_with_their_names(sheets, name):
    """The record's field names are stable; a part with a tolerance gets a verdict, a unit
    with a trimmer gets as-found fields, and each verdict is one choice of pass or fail."""
    from sheetgen.design.pipeline import design_from_file
    from sheetgen.report.procedure import form_field_names, procedure
    fields = PdfReader(io.BytesIO(sheets[name].pdf)).get_fields()
    design = design_from_file(TEMPLATES / f"{name}.yaml", SHARED)
    expected = set(STABLE_FIELDS)
    expected.add("verdict.capacitance")  # a capacitor's tolerance defaults from its series
    if design.assessment.inductance_tolerance:
        expected.add("verdict.inductance")
    if design.capacitor_choice.trimmer_setting_f is not None:
        expected |= set(AS_FOUND)
    assert set(fields) == expected
    assert set(form_field_names(procedure(design).record)) == expected
    for name_ in fields:
        kind = "/Btn" if name_.startswith("verdict.") else "/Tx"
        assert fields[name_].get("/FT") == kind, name_
        if kind == "/Btn":
            flags = int(fields[name_]["/Ff"])
            assert flags & (1 << 15), f"{name_} is a one-choice (radio) group (ISO 32000-1)"
            assert sorted(fields[name_]["/_States_"]) == ["/fail", "/pass"], name_


def test_metadata(sheets):
    built = sheets["demo"]
    meta = PdfReader(io.BytesIO(built.pdf)).metadata
    sheet = built.results["sheet"]
    assert meta.author == sheet["designer"]
    assert sheet["id"] in meta.title and sheet["title"] in meta.title
    assert "Build-and-test sheet" in meta.subject
    assert sheet["id"] in meta["/Keywords"] and "tuned circuit" in meta["/Keywords"]


def test_a4_media_boxes(sheets):
    for page in PdfReader(io.BytesIO(sheets["series"].pdf)).pages:
        box = page.mediabox
        assert_close(float(box.width), A4_PT[0], abs=0.01, what="A4 width, pt (ISO 216)")
        assert_close(float(box.height), A4_PT[1], abs=0.01, what="A4 height, pt (ISO 216)")


def test_fonts_embedded_and_symbols_searchable(sheets):
    built = sheets["demo"]
    fonts = subprocess.run([need("pdffonts"), str(built.pdf_path)], capture_output=True,
                           text=True, check=True).stdout
    dejavu = [line for line in fonts.splitlines() if "DejaVuSans" in line]
    assert dejavu and all(" yes yes yes " in f" {' '.join(line.split())} " for line in dejavu)
    text = page_text(built.pdf_path)
    for symbol in ("µH", "kΩ", "−3 dB", "°"):
        assert symbol in text, symbol


def test_plots_are_vector(sheets):
    """The response page has no raster image: the plots are drawn as paths."""
    reader = PdfReader(io.BytesIO(sheets["demo"].pdf))
    assert all(len(page.images) == 0 for page in reader.pages)
    text = page_text(sheets["demo"].pdf_path)
    assert "Frequency (MHz)" in text and "f0 " + format_quantity(
        sheets["demo"].results["resonance"]["f0_hz"], "Hz", 4) in text


def test_schematic_designators(sheets):
    page_one = page_text(sheets["series"].pdf_path, 1)
    for designator in ("L1", "C1", "R1", "R2", "source", "load"):
        assert re.search(rf"\b{designator}\b", page_one), designator
    toroid = page_text(sheets["toroid"].pdf_path, 1)
    for designator in ("L2", "C3"):  # the link winding and the trimmer
        assert re.search(rf"\b{designator}\b", toroid), designator


def test_rerender_in_one_process_is_byte_identical():
    """A second render after another job's (fonts and reportlab state shared) is the same."""
    from sheetgen.design.pipeline import design_from_file
    from sheetgen.report.results import results_json
    from sheetgen.sheet import render_sheet

    def render(name):
        d = design_from_file(TEMPLATES / f"{name}.yaml", SHARED)
        return render_sheet(d, job_text=name, results_text=results_json(d), job_dir=None)

    first = render("demo")
    render("series")
    assert render("demo") == first
    assert render("series") != first
