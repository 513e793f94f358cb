"""What makes the sheet an archival PDF: XMP metadata, an sRGB output intent, PDF/A-3b.

The sheet carries its job file and results as attachments. ISO 19005-2 (PDF/A-2) allows
an embedded file only when it is itself PDF/A (clause 6.8), so a sheet with YAML and JSON
attached cannot be PDF/A-2; ISO 19005-3 (PDF/A-3) is PDF/A-2 plus attachments of any
kind, each named in an /AF array with its /AFRelationship. The sheet therefore declares
PDF/A-3, conformance level B (`PDFA_PART`, `PDFA_CONFORMANCE`).

The sRGB profile is computed here (`srgb_icc_profile`) from the published definition of
sRGB (IEC 61966-2-1): none of sheetgen's dependencies ships one (pikepdf does, but the
sheet writer does not depend on pikepdf), and the one littleCMS makes through Pillow is
stamped with the current time, which would make the sheet's bytes depend on the clock.
"""

from __future__ import annotations

import datetime as _dt
import re
import struct
from dataclasses import dataclass
from functools import cache
from xml.sax.saxutils import escape

from sheetgen.report.content_hash import XMP_NAMESPACE

PDFA_PART = 3
PDFA_CONFORMANCE = "B"
OUTPUT_CONDITION = "sRGB IEC61966-2.1"
XMP_PREFIX = "sheetgen"
# Our XMP properties and what each means (they go into the PDF/A extension schema too).
XMP_PROPERTIES = (
    ("SheetId", "the sheet's identifier (sheet.id in the job file)"),
    ("Revision", "the sheet's revision (sheet.revision in the job file)"),
    ("ToolVersion", "the sheetgen version that built the sheet"),
    ("ContentSHA256", ("SHA-256 over the attached job.yaml and results.json, as "
                       "sheetgen.report.content_hash defines it (64 lowercase hexadecimal digits)")),
)

# --- sRGB (IEC 61966-2-1) as an ICC version 2 display profile -------------------------------

SRGB_PRIMARIES_XY = ((0.64, 0.33), (0.30, 0.60), (0.15, 0.06))  # IEC 61966-2-1, R, G, B
SRGB_WHITE_XY = (0.3127, 0.3290)  # D65, IEC 61966-2-1
PCS_WHITE_XYZ = (0.9642, 1.0, 0.8249)  # the ICC profile connection space white (D50)
# Bradford cone response matrix, as the ICC specification (Annex E) gives it.
BRADFORD = ((0.8951, 0.2664, -0.1614), (-0.7502, 1.7135, 0.0367), (0.0389, -0.0685, 1.0296))
TRC_POINTS = 1024


def srgb_decode(value: float) -> float:
    """The sRGB transfer function (IEC 61966-2-1): encoded value 0…1 → linear light 0…1."""
    return value / 12.92 if value <= 0.04045 else ((value + 0.055) / 1.055) ** 2.4


def srgb_colorants_d50() -> tuple[tuple[float, float, float], ...]:
    """XYZ of the red, green and blue primaries adapted to D50 (Bradford), as rXYZ/gXYZ/bXYZ.

    RGB→XYZ matrix from the chromaticities with the white scaled to Y = 1 (the usual
    construction, e.g. SMPTE RP 177), then von Kries adaptation in Bradford space.
    """
    import numpy as np
    def xyz(x, y):
        return np.array([x / y, 1.0, (1 - x - y) / y])
    primaries = np.column_stack([xyz(x, y) for x, y in SRGB_PRIMARIES_XY])
    white = xyz(*SRGB_WHITE_XY)
    to_xyz = primaries * np.linalg.solve(primaries, white)
    cone = np.array(BRADFORD)
    adapt = np.linalg.inv(cone) @ np.diag((cone @ np.array(PCS_WHITE_XYZ)) / (cone @ white)) @ cone
    adapted = adapt @ to_xyz
    return tuple(tuple(float(v) for v in adapted[:, column]) for column in range(3))


def _s15f16(value: float) -> bytes:
    return struct.pack(">i", round(value * 65536))


def _xyz_tag(xyz) -> bytes:
    return b"XYZ \0\0\0\0" + b"".join(_s15f16(v) for v in xyz)


def _pad4(data: bytes) -> bytes:
    return data + b"\0" * (-len(data) % 4)


@cache
def srgb_icc_profile() -> bytes:
    """An ICC.1:2001-04 (version 2.1) RGB display ('mntr') profile for sRGB, as bytes.

    Matrix/TRC model: wtpt is the D65 white, rXYZ/gXYZ/bXYZ the Bradford-adapted primaries,
    r/g/bTRC one 1024-point sampled curve of the sRGB transfer function; the creation date
    in the header is fixed, so the bytes never change.
    """
    description = b"sRGB IEC61966-2-1 (computed by sheetgen)\0"
    desc = (b"desc\0\0\0\0" + struct.pack(">I", len(description)) + description
            + struct.pack(">II", 0, 0) + struct.pack(">HB", 0, 0) + b"\0" * 67)
    cprt = b"text\0\0\0\0" + (b"No copyright: computed from the sRGB definition of "
                              b"IEC 61966-2-1.\0")
    white = SRGB_WHITE_XY[0] / SRGB_WHITE_XY[1], 1.0, \
        (1 - SRGB_WHITE_XY[0] - SRGB_WHITE_XY[1]) / SRGB_WHITE_XY[1]
    red, green, blue = srgb_colorants_d50()
    curve = b"curv\0\0\0\0" + struct.pack(">I", TRC_POINTS) + b"".join(
        struct.pack(">H", round(srgb_decode(i / (TRC_POINTS - 1)) * 65535))
        for i in range(TRC_POINTS))
    blocks = [(b"desc", desc), (b"cprt", cprt), (b"wtpt", _xyz_tag(white)),
              (b"rXYZ", _xyz_tag(red)), (b"gXYZ", _xyz_tag(green)), (b"bXYZ", _xyz_tag(blue)),
              (b"rTRC", curve)]
    shared = {b"gTRC": b"rTRC", b"bTRC": b"rTRC"}  # one curve serves the three channels
    count = len(blocks) + len(shared)
    offset = 128 + 4 + 12 * count
    table, body, where = [], b"", {}
    for signature, data in blocks:
        where[signature] = (offset + len(body), len(data))
        body += _pad4(data)
    for signature, source in shared.items():
        where[signature] = where[source]
    for signature, (at, size) in where.items():
        table.append(signature + struct.pack(">II", at, size))
    size = offset + len(body)
    header = (struct.pack(">I", size) + b"\0\0\0\0" + struct.pack(">I", 0x02100000)
              + b"mntr" + b"RGB " + b"XYZ " + struct.pack(">6H", 2000, 1, 1, 0, 0, 0)
              + b"acsp" + b"\0" * 4 + struct.pack(">I", 0) + b"\0" * 8 + b"\0" * 8
              + struct.pack(">I", 0) + b"".join(_s15f16(v) for v in PCS_WHITE_XYZ)
              + b"\0" * 4 + b"\0" * 44)
    assert len(header) == 128
    return header + struct.pack(">I", count) + b"".join(table) + body


# --- XMP (ISO 16684-1) ------------------------------------------------------------------------

@dataclass(frozen=True)
class Record:
    """What the XMP packet says; the same strings go into the document information."""

    title: str
    author: str
    subject: str
    keywords: str
    creator_tool: str
    producer: str
    date: _dt.datetime
    sheet_id: str
    revision: str
    tool_version: str
    content_sha256: str


def pdf_date(moment: _dt.datetime) -> str:
    """A PDF date (ISO 32000-1, 7.9.4) in UTC."""
    return f"D:{moment:%Y%m%d%H%M%S}Z"


def xmp_date(moment: _dt.datetime) -> str:
    """The same instant as an XMP date (ISO 8601)."""
    return f"{moment:%Y-%m-%dT%H:%M:%S}Z"


_NOT_XML = re.compile("[^\t\n\r\x20-\ud7ff\ue000-\ufffd\U00010000-\U0010ffff]")


def _text(value: str) -> str:
    """`value` as XML character data: characters XML 1.0 forbids are dropped."""
    return escape(_NOT_XML.sub("", value))


def xmp_packet(record: Record) -> bytes:
    """The XMP packet (UTF-8) with the Dublin Core, XMP, PDF, PDF/A-id and our properties.

    Our namespace is described in a PDF/A extension schema (ISO 19005-2, 6.6.2.3.2), as
    PDF/A requires for any property outside the predefined schemas.
    """
    date = xmp_date(record.date)
    ours = {"SheetId": record.sheet_id, "Revision": record.revision,
            "ToolVersion": record.tool_version, "ContentSHA256": record.content_sha256}
    properties = "".join(
        '<rdf:li rdf:parseType="Resource">'
        f"<pdfaProperty:name>{name}</pdfaProperty:name>"
        "<pdfaProperty:valueType>Text</pdfaProperty:valueType>"
        "<pdfaProperty:category>external</pdfaProperty:category>"
        f"<pdfaProperty:description>{_text(meaning)}</pdfaProperty:description></rdf:li>"
        for name, meaning in XMP_PROPERTIES)
    own = "".join(f"<{XMP_PREFIX}:{name}>{_text(value)}</{XMP_PREFIX}:{name}>"
                  for name, value in ours.items())
    text = (
        '<?xpacket begin="\ufeff" id="W5M0MpCehiHzreSzNTczkc9d"?>\n'
        '<x:xmpmeta xmlns:x="adobe:ns:meta/">\n'
        '<rdf:RDF xmlns:rdf="http://www.w3.org/1999/02/22-rdf-syntax-ns#">\n'
        '<rdf:Description rdf:about=""'
        ' xmlns:dc="http://purl.org/dc/elements/1.1/"'
        ' xmlns:xmp="http://ns.adobe.com/xap/1.0/"'
        ' xmlns:pdf="http://ns.adobe.com/pdf/1.3/"'
        ' xmlns:pdfaid="http://www.aiim.org/pdfa/ns/id/"'
        f' xmlns:{XMP_PREFIX}="{XMP_NAMESPACE}"'
        ' xmlns:pdfaExtension="http://www.aiim.org/pdfa/ns/extension/"'
        ' xmlns:pdfaSchema="http://www.aiim.org/pdfa/ns/schema#"'
        ' xmlns:pdfaProperty="http://www.aiim.org/pdfa/ns/property#">\n'
        "<dc:format>application/pdf</dc:format>\n"
        f'<dc:title><rdf:Alt><rdf:li xml:lang="x-default">{_text(record.title)}</rdf:li>'
        "</rdf:Alt></dc:title>\n"
        f"<dc:creator><rdf:Seq><rdf:li>{_text(record.author)}</rdf:li></rdf:Seq></dc:creator>\n"
        f'<dc:description><rdf:Alt><rdf:li xml:lang="x-default">{_text(record.subject)}'
        "</rdf:li></rdf:Alt></dc:description>\n"
        f"<pdf:Keywords>{_text(record.keywords)}</pdf:Keywords>\n"
        f"<pdf:Producer>{_text(record.producer)}</pdf:Producer>\n"
        f"<xmp:CreatorTool>{_text(record.creator_tool)}</xmp:CreatorTool>\n"
        f"<xmp:CreateDate>{date}</xmp:CreateDate>\n"
        f"<xmp:ModifyDate>{date}</xmp:ModifyDate>\n"
        f"<xmp:MetadataDate>{date}</xmp:MetadataDate>\n"
        f"<pdfaid:part>{PDFA_PART}</pdfaid:part>\n"
        f"<pdfaid:conformance>{PDFA_CONFORMANCE}</pdfaid:conformance>\n"
        f"{own}\n"
        '<pdfaExtension:schemas><rdf:Bag><rdf:li rdf:parseType="Resource">'
        "<pdfaSchema:schema>sheetgen build-and-test sheet</pdfaSchema:schema>"
        f"<pdfaSchema:namespaceURI>{XMP_NAMESPACE}</pdfaSchema:namespaceURI>"
        f"<pdfaSchema:prefix>{XMP_PREFIX}</pdfaSchema:prefix>"
        f"<pdfaSchema:property><rdf:Seq>{properties}</rdf:Seq></pdfaSchema:property>"
        "</rdf:li></rdf:Bag></pdfaExtension:schemas>\n"
        "</rdf:Description>\n</rdf:RDF>\n</x:xmpmeta>\n"
        '<?xpacket end="r"?>')
    return text.encode("utf-8")


# --- the PDF objects (reportlab's object model) ------------------------------------------------

def add_archival_objects(doc, record: Record, file_specs: list) -> None:
    """Catalog /Metadata (XMP, not compressed), /OutputIntents (sRGB) and /AF (attachments)."""
    from reportlab.pdfbase.pdfdoc import PDFArray, PDFDictionary, PDFName, PDFStream, PDFString
    metadata = PDFStream(PDFDictionary({"Type": PDFName("Metadata"), "Subtype": PDFName("XML")}),
                         xmp_packet(record), filters=[])
    profile = PDFStream(PDFDictionary({"N": 3}), srgb_icc_profile())
    intent = PDFDictionary({
        "Type": PDFName("OutputIntent"), "S": PDFName("GTS_PDFA1"),
        "OutputConditionIdentifier": PDFString(OUTPUT_CONDITION),
        "Info": PDFString("sRGB (IEC 61966-2-1), computed from its published definition"),
        "RegistryName": PDFString("http://www.color.org"),
        "DestOutputProfile": doc.Reference(profile)})
    catalog = doc.Catalog
    # PDFCatalog writes only the keys it lists; add ours to this catalog's list.
    catalog.__NoDefault__ = list(type(catalog).__NoDefault__) + ["OutputIntents", "AF"]
    catalog.Metadata = metadata
    catalog.OutputIntents = PDFArray([intent])
    catalog.AF = PDFArray(list(file_specs))
