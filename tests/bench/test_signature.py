"""Signed sheets (`sheetgen build --sign`, checked by `verify`, `grade` and `diff`).

A throwaway key and self-signed certificate are made at test time with the `cryptography`
package (X.509, RFC 5280; PKCS#12, RFC 7292); no private key is kept in the repository.
The signed file is checked by tools outside sheetgen: qpdf --check (structure), pikepdf
(the archival XMP is still the one built), and the signature is attacked with pikepdf (a
full re-save, as a forger recomputing the content hash would) and pypdf (incremental
updates, ISO 32000-1 7.5.6: a form filled in, a page added).
"""

from __future__ import annotations

import datetime
import json
import shutil
import subprocess
from pathlib import Path

import pytest

from sheetgen.cli import main
from tests.bench.test_forgery import build_demo, forge, widen

pikepdf = pytest.importorskip("pikepdf")
pytest.importorskip("pyhanko")
REPO = Path(__file__).resolve().parents[2]
pytestmark = pytest.mark.pdf
PASSPHRASE = "bench-records"
SUBJECT = "Common Name: Bench Records Signer, Organization: Example Test Lab"


def make_identity(folder: Path, common_name: str, organisation: str) -> tuple[Path, Path]:
    """A PKCS#12 file (key + self-signed certificate, passphrase PASSPHRASE) and the
    certificate as PEM."""
    from cryptography import x509
    from cryptography.hazmat.primitives import hashes, serialization
    from cryptography.hazmat.primitives.asymmetric import ec
    from cryptography.hazmat.primitives.serialization import pkcs12
    from cryptography.x509.oid import NameOID
    key = ec.generate_private_key(ec.SECP256R1())
    name = x509.Name([x509.NameAttribute(NameOID.ORGANIZATION_NAME, organisation),
                      x509.NameAttribute(NameOID.COMMON_NAME, common_name)])
    now = datetime.datetime.now(datetime.UTC)
    usage = x509.KeyUsage(digital_signature=True, content_commitment=True,
                          key_encipherment=False, data_encipherment=False, key_agreement=False,
                          key_cert_sign=True, crl_sign=True, encipher_only=False,
                          decipher_only=False)
    certificate = (x509.CertificateBuilder().subject_name(name).issuer_name(name)
                   .public_key(key.public_key()).serial_number(x509.random_serial_number())
                   .not_valid_before(now - datetime.timedelta(days=1))
                   .not_valid_after(now + datetime.timedelta(days=30))
                   .add_extension(x509.BasicConstraints(ca=True, path_length=None), critical=True)
                   .add_extension(usage, critical=True).sign(key, hashes.SHA256()))
    p12, pem = folder / f"{common_name.split()[0].lower()}.p12", folder / \
        f"{common_name.split()[0].lower()}.pem"
    p12.write_bytes(pkcs12.serialize_key_and_certificates(
        b"signer", key, certificate, None,
        serialization.BestAvailableEncryption(PASSPHRASE.encode())))
    pem.write_bytes(certificate.public_bytes(serialization.Encoding.PEM))
    return p12, pem


@pytest.fixture(scope="module")
def signed(tmp_path_factory):
    root = tmp_path_factory.mktemp("signed")
    job, plain = build_demo(root, "plain.pdf")
    p12, pem = make_identity(root, "Bench Records Signer", "Example Test Lab")
    _, stranger = make_identity(root, "Someone Else", "Another Lab")
    sheet = root / "signed.pdf"
    with pytest.MonkeyPatch.context() as patch:
        patch.setenv("SHEETGEN_SIGN_PASSPHRASE", PASSPHRASE)
        assert main(["build", str(job), "-o", str(sheet), "--sign", str(p12)]) in (0, 1)
    return {"root": root, "job": job, "p12": p12, "pem": pem, "stranger": stranger,
            "plain": plain, "sheet": sheet}


def test_the_signature_is_an_incremental_update_after_the_archival_pdf(signed):
    plain, sheet = signed["plain"].read_bytes(), signed["sheet"].read_bytes()
    assert sheet.startswith(plain) and len(sheet) > len(plain)  # the archival file, as built
    with pikepdf.open(signed["sheet"]) as doc:
        xmp = doc.Root.Metadata.read_bytes()
        assert b"<sheetgen:ContentSHA256>" in xmp and b"<pdfaid:part>3</pdfaid:part>" in xmp
        assert str(doc.docinfo["/SheetgenContentSHA256"]) in xmp.decode()
    from tests.sheet.test_archival_pdf import (
        test_pdfa_rule_checker_finds_no_violation_but_our_own_xmp_schema as pdfa_rules_pass,
    )
    pdfa_rules_pass({"demo": (signed["sheet"],)})  # PDF 1.x still (6.1.2), the rules as built
    if shutil.which("qpdf") is None:
        pytest.skip("qpdf is not installed")
    check = subprocess.run(["qpdf", "--check", str(signed["sheet"])], capture_output=True,
                           text=True)
    assert check.returncode == 0 and "No syntax or stream encoding errors" in check.stdout


def test_verify_and_grade_say_who_signed(signed, capsys):
    capsys.readouterr()
    assert main(["verify", str(signed["sheet"])]) == 0
    out = capsys.readouterr().out
    assert f"signed by {SUBJECT}, not checked against a trust root" in out
    assert main(["verify", str(signed["sheet"]), "--trust", str(signed["pem"])]) == 0
    assert f"signed by {SUBJECT}, trusted" in capsys.readouterr().out
    record = signed["root"] / "record.json"
    assert main(["grade", str(signed["sheet"]), "--json", str(record)]) == 1  # nothing typed
    assert f"sheet signed by {SUBJECT}" in capsys.readouterr().out
    signature = json.loads(record.read_text(encoding="utf-8"))["sheet"]["signature"]
    assert signature["signer"] == SUBJECT and signature["trusted"] is None


def test_an_unsigned_sheet_says_what_its_hash_proves(signed, capsys):
    capsys.readouterr()
    assert main(["verify", str(signed["plain"])]) == 0
    assert "unsigned: its content hash detects damage" in capsys.readouterr().out
    assert main(["verify", str(signed["plain"]), "--trust", str(signed["pem"])]) == 2
    assert "is not signed, and a trust root was given" in capsys.readouterr().err


def test_a_signer_the_trust_root_did_not_issue_is_refused(signed, capsys):
    capsys.readouterr()
    assert main(["grade", str(signed["sheet"]), "--trust", str(signed["stranger"])]) == 2
    err = capsys.readouterr().err
    assert "does not chain to the trust root" in err and "Traceback" not in err


def test_a_forgery_of_a_signed_sheet_is_refused(signed, tmp_path, capsys):
    """Windows widened and the hash recomputed, saved by pikepdf: the signed bytes moved."""
    forged = forge(signed["sheet"], tmp_path / "forged.pdf", widen(0.0, 1e12))
    capsys.readouterr()
    for command in (["grade", str(forged)], ["verify", str(forged)]):
        assert main(command) == 2
        err = capsys.readouterr().err
        assert "altered after it was signed" in err or "changed after it was signed" in err


def _incremental(source: Path, out: Path, change) -> Path:
    from pypdf import PdfWriter
    writer = PdfWriter(str(source), incremental=True)
    change(writer)
    writer.write(str(out))
    return out


def test_a_form_filled_after_signing_is_accepted(signed, tmp_path, capsys):
    def type_f0(writer):
        for page in writer.pages:
            names = {str(a.get_object().get("/T", "")) for a in page.get("/Annots", []) or []}
            if "measured.f0_hz" in names:
                writer.update_page_form_field_values(page, {"measured.f0_hz": "7.1 MHz"},
                                                     auto_regenerate=False)
    filled = _incremental(signed["sheet"], tmp_path / "filled.pdf", type_f0)
    capsys.readouterr()
    assert main(["grade", str(filled)]) == 1  # incomplete: one value typed
    out = capsys.readouterr().out
    assert "form filled in after signing" in out
    assert any(line.startswith("f0_hz") and "7.1 MHz" in line and "pass" in line
               for line in out.splitlines())


def test_a_page_or_attachment_changed_after_signing_is_refused(signed, tmp_path, capsys):
    def add_page(writer):
        writer.add_blank_page(200, 200)

    def reattach(writer):
        from pypdf import PdfReader
        results = json.loads(PdfReader(str(signed["sheet"])).attachments["results.json"][0])
        results["limits"]["f0_max_hz"] = 1e12
        writer.add_attachment("results.json", json.dumps(results).encode())
    capsys.readouterr()
    for change in (add_page, reattach):
        altered = _incremental(signed["sheet"], tmp_path / f"{change.__name__}.pdf", change)
        assert main(["verify", str(altered)]) == 2
        err = capsys.readouterr().err
        assert "changed after it was signed" in err or "content hash differs" in err, err


def test_a_wrong_passphrase_writes_nothing(signed, tmp_path, monkeypatch, capsys):
    monkeypatch.setenv("SHEETGEN_SIGN_PASSPHRASE", "not it")
    out = tmp_path / "never.pdf"
    assert main(["build", str(signed["job"]), "-o", str(out), "--sign", str(signed["p12"])]) == 2
    err = capsys.readouterr().err
    assert "cannot be opened as a PKCS#12" in err and "Traceback" not in err
    assert not out.exists()


def test_the_graded_copy_of_a_signed_sheet_is_not_signed_and_says_so(signed, tmp_path, capsys):
    """The copy's pages and form change after signing, so it carries no signature (one
    carried over would read as broken); its stamp names who signed the sheet graded."""
    from pypdf import PdfReader

    from sheetgen.bench.sheet_file import read_sheet
    copy = tmp_path / "graded.pdf"
    assert main(["grade", str(signed["sheet"]), "-o", str(copy)]) == 1  # nothing typed
    fields = PdfReader(str(copy)).get_fields()
    assert not any(field.get("/FT") == "/Sig" for field in fields.values())
    assert read_sheet(copy).signature is None  # reads back as an intact, unsigned sheet
    text = subprocess.run(["pdftotext", str(copy), "-"], capture_output=True, text=True,
                          check=True).stdout
    assert f"was signed by {SUBJECT}" in " ".join(text.split())
