"""Reading a sheet back: its attached job and results, the recorded content hash, the form.

`read_sheet` accepts only a sheet that `sheetgen build` wrote and whose attachments still
match the content hash recorded at build (sheetgen.report.content_hash), and, when it is
signed, whose signature holds (bench/signature.py); anything else is an `InputError` naming
the file. The hash and identity are recorded twice (document information and XMP): either
copy is read (a re-save may drop one), and two copies present must agree. Form values are
the strings a PDF viewer saved, untouched.
"""

from __future__ import annotations

import hashlib
import json
from dataclasses import dataclass
from pathlib import Path

from sheetgen.bench.results_shape import check_results
from sheetgen.errors import InputError, Problem
from sheetgen.inputs.files import read_bounded
from sheetgen.inputs.reader import MAX_JOB_BYTES
from sheetgen.report import content_hash
from sheetgen.report.content_hash import XMP_NAMESPACE, content_sha256

from .signature import SignatureCheck, check_signature, has_signature

JOB_ATTACHMENT = "job.yaml"
RESULTS_ATTACHMENT = "results.json"
LIBRARY_ATTACHMENT = "library.yaml"  # only on a sheet whose design used library entries
INFO_CONTENT_SHA256 = "/" + content_hash.INFO_CONTENT_SHA256
INFO_SHEET_ID = "/" + content_hash.INFO_SHEET_ID
INFO_REVISION = "/" + content_hash.INFO_REVISION
INFO_TOOL_VERSION = "/" + content_hash.INFO_TOOL_VERSION
EXPECTED = "a build-and-test sheet PDF written by `sheetgen build`"
# Reading bounds (README "Limits"): a sheet is a few hundred kB, a logo at most 5 MB; an
# attachment is held to the job file's own cap, so a sheet cannot smuggle in what a job
# file could not be.
MAX_SHEET_BYTES = 20_000_000
MAX_ATTACHMENT_BYTES = MAX_JOB_BYTES


@dataclass(frozen=True)
class SheetFile:
    """A sheet read back. `fields` maps each form field's name to what was typed in it
    (text fields) or its state name (check boxes: "Yes" or "Off"); "" when never filled."""

    path: str
    job_text: str
    results: dict
    content_sha256_recorded: str
    content_sha256_computed: str
    fields: dict[str, str]
    sheet_id: str
    revision: str
    tool_version: str
    signature: SignatureCheck | None = None  # None: the sheet is not signed
    library_text: str | None = None  # the attached library.yaml (None: none attached)


def _fail(path: str, field: str, message: str, expected: str = EXPECTED) -> InputError:
    return InputError([Problem(path, 1, 1, field, message, expected)])


def _xmp_values(reader) -> dict[str, str]:
    """Our properties in the sheet's XMP packet (empty when there is none)."""
    import xml.etree.ElementTree as ET
    try:
        stream = reader.trailer["/Root"].get("/Metadata")
        if stream is None:
            return {}
        root = ET.fromstring(stream.get_object().get_data())
    except Exception:  # noqa: BLE001 - any unreadable packet counts as absent
        return {}
    values = {}
    for element in root.iter():
        if isinstance(element.tag, str) and element.tag.startswith("{" + XMP_NAMESPACE):
            values[element.tag[len(XMP_NAMESPACE) + 2:]] = (element.text or "").strip()
    return values


# Each property a sheet records twice: its document information key and its XMP name.
RECORDED_TWICE = (("ContentSHA256", INFO_CONTENT_SHA256), ("SheetId", INFO_SHEET_ID),
                  ("Revision", INFO_REVISION), ("ToolVersion", INFO_TOOL_VERSION))


def _recorded_copies(path: str, info, xmp: dict[str, str]) -> dict[str, str]:
    """Each recorded property from whichever copies are present (document information, XMP);
    InputError when two present copies differ. A re-save that drops one copy leaves the
    other to be read."""
    values = {}
    for name, info_key in RECORDED_TWICE:
        in_info, in_xmp = str(info.get(info_key, "") or ""), xmp.get(name, "")
        if in_info and in_xmp and in_info != in_xmp:
            raise _fail(path, f"metadata.{name}",
                        f"the {name} in the XMP metadata ({in_xmp}) differs from the one in "
                        f"the document information ({in_info}): the metadata was edited",
                        "the two copies to agree, as `sheetgen build` writes them")
        values[name] = in_info or in_xmp
    return values


def _attached_stream(reader, name: str):
    names = reader.trailer["/Root"].get("/Names", {}).get("/EmbeddedFiles", {}).get("/Names", [])
    for index in range(0, len(names) - 1, 2):
        if str(names[index]) == name:
            return names[index + 1].get_object()["/EF"]["/F"].get_object()
    return None


def all_attachments(reader, path: str = "the sheet") -> list[tuple[str, bytes]]:
    """Every attached file as (name, bytes), in the order of the name tree, each held to
    the attachment cap like the job and results (_bounded_data)."""
    names = reader.trailer["/Root"].get("/Names", {}).get("/EmbeddedFiles", {}).get("/Names", [])
    return [(str(names[index]), _bounded_data(names[index + 1].get_object()["/EF"]["/F"]
                                              .get_object(), path, str(names[index])))
            for index in range(0, len(names) - 1, 2)]


def recorded_metadata(reader) -> tuple[dict[str, str], dict[str, str]]:
    """Our properties as the document information and the XMP packet record them."""
    info = reader.metadata or {}
    return ({key: str(info.get(key, "")) for _, key in RECORDED_TWICE}, _xmp_values(reader))


def _attachment(reader, path: str, name: str) -> tuple[bytes, bytes | None]:
    """The attached file's bytes and the MD5 checksum its /Params recorded (if any)."""
    stream = _attached_stream(reader, name)
    if stream is not None:
        checksum = stream.get("/Params", {}).get("/CheckSum")
        return _bounded_data(stream, path, name), (bytes(checksum.original_bytes)
                                                   if checksum is not None else None)
    raise _fail(path, f"attachments.{name}",
                f"the sheet has no attached {name}; a sheet made by `sheetgen build` carries "
                f"{JOB_ATTACHMENT} and {RESULTS_ATTACHMENT}")


def _field_values(reader) -> dict[str, str]:
    values = {}
    for name, field in (reader.get_fields() or {}).items():
        if field.get("/FT") == "/Sig":  # the signature, not a value of the record
            continue
        value = field.get("/V")
        if value is None:
            values[name] = "Off" if field.get("/FT") == "/Btn" else ""
        elif field.get("/FT") == "/Btn":
            values[name] = str(value).lstrip("/")
        else:
            values[name] = str(value)
    return values


def read_sheet(path: str | Path, trust_roots: list | None = None) -> SheetFile:
    """Read the sheet at `path`; raise InputError unless it is an intact sheetgen sheet.
    A signed sheet's signature is checked (bench/signature.py); with `trust_roots` (from
    load_trust_roots) the sheet must be signed by a certificate that chains to one."""
    shown = str(path)
    data = read_bounded(path, MAX_SHEET_BYTES, "sheet PDF written by `sheetgen build`")
    if b"%PDF-" not in data[:1024]:
        raise _fail(shown, "", "is not a PDF file (no %PDF- header)")
    import io

    from pypdf import PdfReader
    try:
        reader = PdfReader(io.BytesIO(data))
        if reader.is_encrypted:
            raise _fail(shown, "", "is encrypted (saved with a password); sheetgen reads a "
                        "sheet as it was built", "the sheet saved without a password")
        info = reader.metadata or {}
        xmp = _xmp_values(reader)
    except InputError:
        raise
    except Exception as error:  # noqa: BLE001 - pypdf raises many kinds on a damaged file
        raise _fail(shown, "", f"cannot be read as a PDF ({_short(error)})") from None
    copies = _recorded_copies(shown, info, xmp)
    recorded = copies["ContentSHA256"]
    if not recorded:
        raise _fail(shown, "", "is a PDF but not a sheetgen sheet (neither its document "
                               "information nor its XMP metadata records a sheetgen content "
                               "hash)")
    try:
        job, job_checksum = _attachment(reader, shown, JOB_ATTACHMENT)
        results, results_checksum = _attachment(reader, shown, RESULTS_ATTACHMENT)
        library_stream = _attached_stream(reader, LIBRARY_ATTACHMENT)
        library = None if library_stream is None else library_stream.get_data()
        fields = _field_values(reader)
        signed = has_signature(reader)
    except InputError:
        raise
    except Exception as error:  # noqa: BLE001
        raise _fail(shown, "", f"cannot be read as a PDF ({_short(error)})") from None
    computed = content_sha256(job, results, library)
    if computed != recorded:
        changed = [label for label, blob, checksum in (("job file", job, job_checksum),
                                                       ("results", results, results_checksum))
                   if checksum is not None and hashlib.md5(blob).digest() != checksum]
        what = (" and ".join(f"the attached {label}" for label in changed)
                if changed else "the attached job file or results")
        if not changed and library is not None:
            what = "the attached job file, results or library entries"
        raise _fail(shown, "content_sha256",
                    f"{what} {'was' if len(changed) == 1 else 'were'} changed after the build "
                    f"(content hash differs: recorded {recorded}, computed {computed})",
                    "the attachments exactly as `sheetgen build` wrote them")
    if signed:
        signature = check_signature(shown, data, trust_roots)
    elif trust_roots:
        raise _fail(shown, "signature", "is not signed, and a trust root was given",
                    "a sheet signed by `sheetgen build --sign`")
    else:
        signature = None
    try:
        job_text = job.decode("utf-8")
        library_text = None if library is None else library.decode("utf-8")
        results_data = json.loads(results.decode("utf-8"))
    except (UnicodeDecodeError, json.JSONDecodeError) as error:
        raise _fail(shown, f"attachments.{RESULTS_ATTACHMENT}",
                    f"the attachments cannot be read ({_short(error)})") from None
    except RecursionError:
        raise _fail(shown, f"attachments.{RESULTS_ATTACHMENT}", "nests too deep to read",
                    "the results document sheetgen build attaches") from None
    check_results(results_data, shown)
    sheet = results_data.get("sheet", {}) if isinstance(results_data, dict) else {}
    return SheetFile(
        path=shown, job_text=job_text, results=results_data, signature=signature,
        library_text=library_text,
        content_sha256_recorded=recorded, content_sha256_computed=computed, fields=fields,
        sheet_id=copies["SheetId"] or str(sheet.get("id", "")),
        revision=copies["Revision"] or str(sheet.get("revision", "")),
        tool_version=copies["ToolVersion"]
        or str(results_data.get("tool_version", "") if isinstance(results_data, dict) else ""))


# --------------------------------------------------------------------------- reading bounds


def _short(error: Exception, limit: int = 200) -> str:
    """A library's complaint, one line, cut to `limit` characters."""
    text = " ".join(str(error).split()) or type(error).__name__
    return text if len(text) <= limit else text[:limit - 1] + "…"


def _bounded_data(stream, path: str, name: str) -> bytes:
    """An attachment's bytes, at most MAX_ATTACHMENT_BYTES: a stored or Flate-compressed
    stream (what PDF writers use) is inflated no further than the cap; any other filter
    is refused."""
    import zlib
    filters = stream.get("/Filter")
    filters = [filters] if isinstance(filters, str) else list(filters or [])
    too_big = _fail(path, f"attachments.{name}", f"the attached {name} is larger than "
                    f"{MAX_ATTACHMENT_BYTES:,} bytes", f"at most {MAX_ATTACHMENT_BYTES:,} bytes, "
                    "as for a job file")
    if not filters:
        data = stream.get_data()
    elif filters == ["/FlateDecode"] and stream.get("/DecodeParms") is None:
        raw = stream._data  # the stream as stored (pypdf keeps it until decoded)
        if len(raw) > MAX_SHEET_BYTES:
            raise too_big
        try:
            inflater = zlib.decompressobj()
            data = inflater.decompress(raw, MAX_ATTACHMENT_BYTES + 1)
        except zlib.error as error:
            raise _fail(path, f"attachments.{name}", f"the attached {name} cannot be "
                        f"inflated ({error})") from None
    else:
        raise _fail(path, f"attachments.{name}", f"the attached {name} is encoded with "
                    f"{', '.join(map(str, filters))}", "a stored or Flate-compressed attachment")
    if len(data) > MAX_ATTACHMENT_BYTES:
        raise too_big
    return data
