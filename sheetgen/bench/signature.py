"""Signing a released sheet, and checking the signature of a sheet read back (pyHanko).

The content hash (report/content_hash.py) detects accidental damage and an edit by someone
who does not recompute it; anyone with a PDF library can recompute it. A PDF digital
signature (ISO 32000-1, 12.8; CMS, RFC 5652) made with the organisation's private key
cannot be remade without that key: it binds the whole file, attachments and pages, to the
signer's certificate.

`sign_pdf` certifies the sheet (a DocMDP signature, ISO 32000-1 12.8.2.2, that permits form
filling only) as an incremental update appended after the archival PDF, so the PDF/A-3
file, its attachments and its XMP stay byte for byte as written. A technician may then
fill the form in a viewer that saves incrementally (ISO 32000-1, 7.5.6). What was saved
after signing is compared with the signed revision (`_changed_beyond_form`): the attached
job and results, the recorded hash and identity, every page's content and the kind and
place of every annotation must be as signed — only form values and their appearances may
differ. Any other change, or a rewrite of the file, is refused.

`check_signature` reports who signed; with trust roots (certificates in PEM or DER) it also
says whether the signer's certificate chains to one of them, and refuses it otherwise.
"""

from __future__ import annotations

import io
import logging
import os
from contextlib import contextmanager
from dataclasses import dataclass
from datetime import UTC
from pathlib import Path

from sheetgen.errors import InputError, Problem

SIGNATURE_FIELD = "sheetgen_signature"  # a partial field name has no period (12.7.3.2)
PASSPHRASE_ENV = "SHEETGEN_SIGN_PASSPHRASE"
SIGNING_REASON = "released build-and-test sheet (sheetgen build --sign)"
FORM_FILLING = "form filled in after signing"


def _load_pyhanko() -> None:
    """Import pyHanko once, quietly: importing its signers touches cryptography's DSA
    support, which recent cryptography releases mark deprecated with a warning (a third
    party's notice about a key type sheetgen never uses)."""
    import warnings
    with warnings.catch_warnings():
        warnings.filterwarnings("ignore", message=".*DSA is deprecated.*")
        import pyhanko.sign  # noqa: F401
        import pyhanko.sign.validation  # noqa: F401
        import pyhanko_certvalidator  # noqa: F401


@dataclass(frozen=True)
class SignatureCheck:
    """The signature of a sheet as checked: `signer` is the certificate's subject,
    `trusted` None when no trust root was given, `after_signing` "" when the signed bytes
    are the whole file, else what was added after (only form filling is accepted)."""

    signer: str
    trusted: bool | None
    signed_at: str
    after_signing: str

    def summary(self) -> str:
        if self.trusted is None:
            trust = "not checked against a trust root"
        else:
            trust = "trusted (chains to a trust root given)"
        after = f"; {self.after_signing}" if self.after_signing else ""
        return f"signed by {self.signer}, {trust}{after}"


UNSIGNED_SUMMARY = ("unsigned: its content hash detects damage and edits that do not "
                    "recompute it, not a deliberate forgery")


def signature_text(check: SignatureCheck | None) -> str:
    """One line for people: who signed, or what an unsigned sheet's hash proves."""
    return UNSIGNED_SUMMARY if check is None else check.summary()


def _fail(path: str, message: str, expected: str = "") -> InputError:
    return InputError([Problem(path, 1, 1, "signature", message, expected)])


@contextmanager
def _quiet_pyhanko():
    """pyHanko logs a validation it cannot complete with a traceback; the outcome is read
    from its status instead, and worded by us."""
    before = logging.root.manager.disable
    logging.disable(logging.CRITICAL)
    try:
        yield
    finally:
        logging.disable(before)


def load_signer(path: Path):
    """The key and certificate in the PKCS#12 file at `path` (passphrase from the
    environment variable SHEETGEN_SIGN_PASSPHRASE; none when it is unset)."""
    _load_pyhanko()
    from pyhanko.sign import signers
    passphrase = os.environ.get(PASSPHRASE_ENV)
    if not Path(path).is_file():
        raise _fail(str(path), "no such file", "a PKCS#12 file (.p12/.pfx) with the "
                    "organisation's signing key and certificate")
    with _quiet_pyhanko():
        try:
            signer = signers.SimpleSigner.load_pkcs12(
                str(path), passphrase=passphrase.encode("utf-8") if passphrase else None)
        except Exception:  # noqa: BLE001 - pyHanko raises several kinds for a bad file
            signer = None
    if signer is None:
        raise _fail(str(path), "cannot be opened as a PKCS#12 key and certificate (wrong "
                    f"passphrase in {PASSPHRASE_ENV}, or not a PKCS#12 file)",
                    "a PKCS#12 file (.p12/.pfx) holding one private key and its certificate")
    return signer


def sign_pdf(pdf: bytes, signer) -> bytes:
    """`pdf` with a certifying signature appended as an incremental update."""
    _load_pyhanko()
    from pyhanko.pdf_utils.incremental_writer import IncrementalPdfFileWriter
    from pyhanko.sign import signers
    from pyhanko.sign.fields import MDPPerm

    class MetadataKeepingWriter(IncrementalPdfFileWriter):
        """pyHanko would rewrite the XMP packet (dropping the sheet's own properties and
        its PDF/A extension schema) and the modification date; an archival sheet keeps
        its document information and XMP exactly as built, agreeing with each other."""

        def _update_meta(self):
            return None

        def ensure_output_version(self, version):
            """PDF/A-3 is PDF 1.x (ISO 19005-3, 6.1.2): an EC key would make pyHanko mark
            the file PDF 2.0 (ISO 32002); the extension it registers says the same to a
            reader of a PDF 1.7 file."""
            super().ensure_output_version(min(tuple(version), (1, 7)))

    writer = MetadataKeepingWriter(io.BytesIO(pdf))
    metadata = signers.PdfSignatureMetadata(
        field_name=SIGNATURE_FIELD, md_algorithm="sha256", certify=True,
        docmdp_permissions=MDPPerm.FILL_FORMS, reason=SIGNING_REASON)
    with _quiet_pyhanko():
        return signers.PdfSigner(metadata, signer=signer).sign_pdf(writer).getvalue()


def load_trust_roots(paths: list[Path]) -> list:
    """The certificates in the files at `paths` (PEM or DER), each an InputError if not one."""
    _load_pyhanko()
    from pyhanko.keys import load_certs_from_pemder
    roots = []
    for path in paths:
        try:
            roots.extend(load_certs_from_pemder([str(path)]))
        except Exception as error:  # noqa: BLE001
            reason = getattr(error, "strerror", None) or "not a certificate (PEM or DER)"
            raise _fail(str(path), f"cannot be read as a trust root: {reason}",
                        "an X.509 certificate in PEM or DER") from None
    return roots


def has_signature(reader) -> bool:
    """Whether the sheet (a pypdf reader) carries a signed signature field."""
    form = reader.trailer["/Root"].get("/AcroForm")
    if form is None:
        return False
    stack = list(form.get_object().get("/Fields", []))
    while stack:
        field = stack.pop().get_object()
        if field.get("/FT") == "/Sig" and field.get("/V") is not None:
            return True
        stack.extend(field.get("/Kids", []))
    return False


def _page_marks(reader) -> list:
    """Per page: its content bytes and each annotation's subtype, field name and place."""
    marks = []
    for page in reader.pages:
        contents = page.get_contents()
        annotations = []
        for annotation in page.get("/Annots", []) or []:
            annotation = annotation.get_object()
            annotations.append((str(annotation.get("/Subtype")), str(annotation.get("/T", "")),
                                [round(float(v), 3) for v in annotation.get("/Rect", [])]))
        marks.append((contents.get_data() if contents is not None else b"", annotations))
    return marks


def _changed_beyond_form(signed: bytes, current: bytes) -> str:
    """What differs between the signed revision and the file now, other than form values
    and their appearances ("" when nothing else): the attached files, the catalog's
    entries (e.g. an added /OpenAction), our recorded metadata, and every page's content
    and annotations (kind, field name, place)."""
    from pypdf import PdfReader

    from . import sheet_file
    try:
        before, after = PdfReader(io.BytesIO(signed)), PdfReader(io.BytesIO(current))
        if sheet_file.all_attachments(before) != sheet_file.all_attachments(after):
            return "the attached files differ"
        catalog_before, catalog_after = (set(r.trailer["/Root"]) - {"/AcroForm"}
                                         for r in (before, after))
        if catalog_before != catalog_after:
            return "the document catalog gained or lost entries"
        if sheet_file.recorded_metadata(before) != sheet_file.recorded_metadata(after):
            return "the recorded content hash or identity differs"
        if _page_marks(before) != _page_marks(after):
            return "a page's content or annotations differ"
    except Exception as error:  # noqa: BLE001 - a revision that cannot be read is a change
        return f"a revision cannot be read ({error})"
    return ""


def check_signature(path: str, data: bytes, trust_roots: list | None) -> SignatureCheck:
    """Check every signature of the sheet `data`; InputError when one is broken, covers
    less than the file with more than form filling after it, or (with `trust_roots`) does
    not chain to a root."""
    _load_pyhanko()
    from pyhanko.pdf_utils.reader import PdfFileReader
    from pyhanko.sign.validation import validate_pdf_signature
    from pyhanko.sign.validation.status import SignatureCoverageLevel
    from pyhanko_certvalidator import ValidationContext
    with _quiet_pyhanko():
        try:
            signatures = PdfFileReader(io.BytesIO(data), strict=False).embedded_signatures
        except Exception as error:  # noqa: BLE001
            raise _fail(path, f"its signature cannot be read ({error})") from None
        checks = []
        for signature in signatures:
            context = ValidationContext(trust_roots=list(trust_roots or []),
                                        allow_fetching=False)
            try:
                # the form's field names are dotted ("measured.f0_hz"), which pyHanko's own
                # analysis of later revisions rejects; _changed_beyond_form does that part
                status = validate_pdf_signature(signature, context, skip_diff=True)
            except Exception as error:  # noqa: BLE001
                raise _fail(path, f"its signature cannot be checked ({error})") from None
            checks.append((signature, status))
    if not checks:
        raise _fail(path, "carries an empty signature field")
    first = None
    for signature, status in checks:
        signer = status.signing_cert.subject.human_friendly
        if not status.intact:
            raise _fail(path, f"was altered after it was signed by {signer}: the signed bytes "
                        "no longer match the signature", "the sheet as it was signed")
        if not status.valid:
            raise _fail(path, f"its signature by {signer} does not verify",
                        "a signature made with the certificate's key")
        after = ""
        if status.coverage != SignatureCoverageLevel.ENTIRE_FILE:
            byte_range = list(signature.sig_object.get("/ByteRange", []))
            changed = (status.coverage != SignatureCoverageLevel.ENTIRE_REVISION
                       or len(byte_range) != 4
                       or _changed_beyond_form(data[:int(byte_range[2]) + int(byte_range[3])],
                                               data))
            if changed:
                raise _fail(path, f"was changed after it was signed by {signer}, beyond "
                            f"filling in its form ({changed or 'not a saved revision'})",
                            "the sheet as signed, with only its form filled in")
            after = FORM_FILLING
        if trust_roots and not status.trusted:
            raise _fail(path, f"is signed by {signer}, whose certificate does not chain to "
                        "the trust root(s) given", "a signature by a certificate the trust "
                        "roots issued")
        if first is None:
            when = status.signer_reported_dt
            first = SignatureCheck(
                signer=signer, trusted=True if trust_roots else None,
                signed_at=when.astimezone(UTC).strftime("%Y-%m-%d %H:%M:%S UTC")
                if when else "", after_signing=after)
    return first
