"""The sheet as an archival PDF, read back with independent tools.

Sources: ISO 19005-2/-3 (PDF/A-2, PDF/A-3: fonts embedded 6.2.11.4, output intent 6.2.3,
XMP and document information agree 6.6.2.3, appearance dictionaries 6.3.3, associated
files 6.8), ICC.1:2001-04 (profile header layout), IEC 61966-2-1 (sRGB), FIPS 180-4
(SHA-256, through hashlib). Readers: pikepdf/qpdf, poppler's pdffonts, littleCMS through
Pillow's ImageCms, and pikepdf's own PDF/A rule checker (veraPDF's rule catalogue).
"""

from __future__ import annotations

import datetime as dt
import hashlib
import io
import json
import shutil
import struct
import subprocess
from pathlib import Path

import pytest

from sheetgen.cli import main
from tests.support import assert_close

pikepdf = pytest.importorskip("pikepdf")
REPO = Path(__file__).resolve().parents[2]
JOBS = ("demo", "toroid")  # the demo and a starter, both with the fillable test record
pytestmark = pytest.mark.pdf


def _need(tool: str) -> str:
    path = shutil.which(tool)
    if path is None:
        pytest.skip(f"{tool} is not installed (Debian: qpdf / poppler-utils)")
    return path


@pytest.fixture(scope="module")
def built(tmp_path_factory):
    """Each job built once by `sheetgen build`: {name: (pdf path, job path, results path)}."""
    root = tmp_path_factory.mktemp("archival")
    out = {}
    for name in JOBS:
        job = root / f"{name}.yaml"
        job.write_bytes((REPO / "templates" / f"{name}.yaml").read_bytes())
        pdf, results = root / f"{name}.pdf", root / f"{name}.json"
        assert main(["build", str(job), "-o", str(pdf), "--results", str(results)]) in (0, 1)
        out[name] = (pdf, job, results)
    return out


def _fonts_in(resources, seen, where, found):
    """(where, font dictionary) for every font in `resources`, its form XObjects included."""
    if resources is None:
        return
    for key, font in (resources.get("/Font") or {}).items():
        found.append((f"{where} {key}", font))
    for key, xobject in (resources.get("/XObject") or {}).items():
        if xobject.objgen in seen or xobject.get("/Subtype") != "/Form":
            continue
        seen.add(xobject.objgen)
        _fonts_in(xobject.get("/Resources"), seen, f"{where} {key}", found)


def _every_font(pdf):
    found, seen = [], set()
    for number, page in enumerate(pdf.pages, 1):
        _fonts_in(page.obj.get("/Resources"), seen, f"page {number}", found)
        for annotation in page.obj.get("/Annots") or []:
            appearances = annotation.get("/AP") or {}
            for state_key, appearance in appearances.items():
                streams = ([appearance] if isinstance(appearance, pikepdf.Stream)
                           else list(appearance.values()))
                for stream in streams:
                    _fonts_in(stream.get("/Resources"), seen,
                              f"page {number} field {annotation.get('/T')} {state_key}", found)
    form = pdf.Root.get("/AcroForm")
    if form is not None:
        _fonts_in(form.get("/DR"), seen, "AcroForm /DR", found)
    return found


def _embedded(font) -> bool:
    if font.get("/Subtype") == "/Type0":
        return all(_embedded(d) for d in font.DescendantFonts)
    if font.get("/Subtype") == "/Type3":
        return True  # glyphs are content streams (ISO 19005-2, 6.2.11.4.1)
    descriptor = font.get("/FontDescriptor")
    return descriptor is not None and any(k in descriptor for k in
                                          ("/FontFile", "/FontFile2", "/FontFile3"))


@pytest.mark.parametrize("name", JOBS)
def test_every_font_is_embedded(built, name):
    """ISO 19005-2 6.2.11.4.1: pages, field appearances and the form's /DR."""
    pdf_path = built[name][0]
    with pikepdf.open(pdf_path) as pdf:
        fonts = _every_font(pdf)
        assert any(where.startswith("AcroForm /DR") for where, _ in fonts)
        assert any(" field " in where for where, _ in fonts)  # text fields carry a font
        missing = [where for where, font in fonts if not _embedded(font)]
        assert not missing, missing
        # the fields type in the embedded font: the form's and each field's /DA name it
        form = pdf.Root.AcroForm
        names = {str(k)[1:] for k in form.DR.Font}
        assert str(form.DA).split()[0][1:] in names
        for field in form.Fields:
            if field.get("/FT") == "/Tx":
                assert str(field.DA).split()[0][1:] in names, field.T
    listing = subprocess.run([_need("pdffonts"), str(pdf_path)], capture_output=True,
                             text=True, check=True).stdout.splitlines()[2:]
    assert listing
    for line in listing:  # columns: name type encoding emb sub uni object ID
        assert line.split()[-5] == "yes", line


def _pdf_date(text: str) -> dt.datetime:
    """A PDF date (ISO 32000-1, 7.9.4) in UTC ('Z' or +HH'mm')."""
    text = str(text).removeprefix("D:")
    moment = dt.datetime.strptime(text[:14], "%Y%m%d%H%M%S")
    zone = text[14:].replace("'", "")
    if zone and zone[0] in "+-":
        sign = 1 if zone[0] == "+" else -1
        moment -= sign * dt.timedelta(hours=int(zone[1:3]), minutes=int(zone[3:5] or 0))
    return moment.replace(tzinfo=dt.UTC)


def test_xmp_identifies_pdfa_and_agrees_with_the_document_information(built):
    pdf_path, job, results = built["demo"]
    with pikepdf.open(pdf_path) as pdf:
        info = pdf.docinfo
        meta = pdf.open_metadata()
        assert meta["pdfaid:part"] == "3"  # PDF/A-3: PDF/A-2 with attachments (see report)
        assert meta["pdfaid:conformance"] == "B"
        assert meta["dc:title"] == str(info.Title)
        assert meta["dc:description"] == str(info.Subject)
        assert list(meta["dc:creator"]) == [str(info.Author)]
        assert meta["pdf:Keywords"] == str(info.Keywords)
        assert meta["pdf:Producer"] == str(info.Producer)
        assert meta["xmp:CreatorTool"] == str(info.Creator)
        for xmp_key, info_key in (("xmp:CreateDate", "/CreationDate"),
                                  ("xmp:ModifyDate", "/ModDate")):
            assert dt.datetime.fromisoformat(meta[xmp_key]) == \
                _pdf_date(info[info_key]), xmp_key
        assert _pdf_date(info.CreationDate).date().isoformat() == "2026-12-01"  # demo's date
        ns = "{https://sheetgen.invalid/ns/sheet/1.0/}"
        recorded = str(info["/SheetgenContentSHA256"])
        assert meta[ns + "ContentSHA256"] == recorded
        sheet = json.loads(results.read_text(encoding="utf-8"))["sheet"]
        assert meta[ns + "SheetId"] == sheet["id"] == str(info["/SheetgenSheetId"])
        assert meta[ns + "Revision"] == sheet["revision"]
        # FIPS 180-4 via hashlib over the documented sequence (sheetgen/content_hash.py):
        # 8-byte big-endian length, job bytes, 8-byte big-endian length, results bytes, and
        # the same for the library entries (the demo's core comes from the parts library).
        job_bytes = pdf.attachments["job.yaml"].get_file().read_bytes()
        results_bytes = pdf.attachments["results.json"].get_file().read_bytes()
        library_bytes = pdf.attachments["library.yaml"].get_file().read_bytes()
        assert job_bytes == job.read_bytes() and results_bytes == results.read_bytes()
        sequence = b"".join(len(b).to_bytes(8, "big") + b
                            for b in (job_bytes, results_bytes, library_bytes))
        assert recorded == hashlib.sha256(sequence).hexdigest()
        # ISO 19005-3 6.8: each attachment is an associated file with its relationship
        af = {str(spec.UF): str(spec.AFRelationship) for spec in pdf.Root.AF}
        assert af == {"job.yaml": "/Source", "results.json": "/Data", "library.yaml": "/Source"}


def test_output_intent_carries_an_srgb_icc_profile(built):
    with pikepdf.open(built["demo"][0]) as pdf:
        intents = pdf.Root.OutputIntents
        assert len(intents) == 1 and intents[0].S == "/GTS_PDFA1"
        profile = intents[0].DestOutputProfile
        assert int(profile.N) == 3
        icc = profile.read_bytes()
    # ICC.1:2001-04 header: size, device class, colour space, PCS, 'acsp' signature
    assert struct.unpack(">I", icc[:4])[0] == len(icc)
    assert icc[12:16] in (b"mntr", b"prtr") and icc[16:20] == b"RGB "
    assert icc[20:24] == b"XYZ " and icc[36:40] == b"acsp"
    assert icc[8] in (2, 4)  # major version (veraPDF: below 5)
    tags = {icc[132 + 12 * i:136 + 12 * i]: struct.unpack(">II", icc[136 + 12 * i:144 + 12 * i])
            for i in range(struct.unpack(">I", icc[128:132])[0])}
    for tag in (b"desc", b"cprt", b"wtpt", b"rXYZ", b"gXYZ", b"bXYZ", b"rTRC", b"gTRC", b"bTRC"):
        offset, size = tags[tag]
        assert offset + size <= len(icc), tag
    # Bradford-adapted sRGB colorants (D50), B. Lindbloom's sRGB matrix (from memory)
    published = {b"rXYZ": (0.4360747, 0.2225045, 0.0139322),
                 b"gXYZ": (0.3850649, 0.7168786, 0.0971045),
                 b"bXYZ": (0.1430804, 0.0606169, 0.7141733)}
    for tag, expected in published.items():
        offset, _ = tags[tag]
        values = struct.unpack(">3i", icc[offset + 8:offset + 20])
        for got, want in zip(values, expected):
            assert_close(got / 65536, want, abs=1e-3, what=f"{tag.decode()} (s15Fixed16)")
    # littleCMS reads the profile, and maps colours through it onto its own sRGB unchanged
    ImageCms = pytest.importorskip("PIL.ImageCms")
    from PIL import Image
    ours = ImageCms.ImageCmsProfile(io.BytesIO(icc))
    transform = ImageCms.buildTransform(ours, ImageCms.createProfile("sRGB"), "RGB", "RGB",
                                        renderingIntent=ImageCms.Intent.RELATIVE_COLORIMETRIC)
    colours = [(0, 0, 0), (255, 255, 255), (255, 0, 0), (0, 255, 0), (0, 0, 255),
               (128, 128, 128), (12, 200, 90), (250, 20, 160)]
    image = Image.new("RGB", (len(colours), 1))
    for x, colour in enumerate(colours):
        image.putpixel((x, 0), colour)
    mapped = ImageCms.applyTransform(image, transform)
    for x, colour in enumerate(colours):
        for got, want in zip(mapped.getpixel((x, 0)), colour):
            assert_close(got, want, abs=1, what=f"sRGB {colour} through the profile")


@pytest.mark.parametrize("name", JOBS)
def test_qpdf_check_passes(built, name):
    done = subprocess.run([_need("qpdf"), "--check", str(built[name][0])],
                          capture_output=True, text=True, check=False)
    assert done.returncode == 0, done.stdout + done.stderr
    assert "No syntax or stream encoding errors" in done.stdout


def test_annotations_and_form_as_pdfa_allows(built):
    """ISO 19005-2 6.3.2/6.3.3/6.4.1: printable widgets, /AP with /N only, no actions."""
    with pikepdf.open(built["demo"][0]) as pdf:
        assert "/NeedAppearances" not in pdf.Root.AcroForm or not pdf.Root.AcroForm.NeedAppearances
        widgets = [a for page in pdf.pages for a in page.obj.get("/Annots") or []]
        assert widgets
        for widget in widgets:
            flags = int(widget.F)
            assert flags & 4 and not flags & (1 | 2 | 32 | 256), widget.T  # Print; not hidden
            assert set(widget.AP.keys()) == {"/N"}, widget.T
            assert "/A" not in widget and "/AA" not in widget


def test_pdfa_rule_checker_finds_no_violation_but_our_own_xmp_schema(built):
    """pikepdf's allow-list checker (veraPDF's rules) for PDF/A-3b. It does not follow
    forms, attachments or XMP extension schemas (it says so); every other rule passes."""
    try:
        from pikepdf import pdfa
    except ImportError as error:
        pytest.skip(f"pikepdf.pdfa is not available: {error}")
    report = pdfa.validate_written(str(built["demo"][0]), "3b")
    ours = ("XMP namespace sheetgen=", "XMP namespace pdfaExtension=", "XMP namespace pdfaSchema=",
            "XMP namespace pdfaProperty=", "XMP property sheetgen:",
            "XMP property pdfaExtension:schemas")
    violations = [f for f in report.findings if f.kind == "violation"
                  and not f.message.startswith(ours)]
    assert not violations, violations
    unsupported = {f.rule for f in report.findings if f.kind == "unsupported"}
    assert unsupported <= {"pikepdf:schema-Catalog", "pikepdf:embedded-file"}, unsupported
