"""Signed sheets: demo identities, PAdES signatures, the rules of signing, a good sheet.

Every check uses real signatures made by reportgen.signing and read back by independent
code: pyHanko's reader, the `cryptography` package, pypdf, and poppler's pdfsig and qpdf
where installed.

Sources named below:
- ISO 32000-2:2020 (PDF 2.0): 7.5.6 incremental updates; 12.8 digital signatures, 12.8.2.2
  DocMDP (P = 2: filling in forms and signing).
- ETSI EN 319 142-1 (PAdES), 5.3: baseline signatures use SubFilter ETSI.CAdES.detached.
- RFC 5280, 4.1.2.5 (validity), 4.2.1.3 (key usage), 4.2.1.9 (basic constraints),
  4.2.1.12 (extended key usage); RFC 9336 (id-kp-documentSigning).
- SEC 2 v2, 2.4.2 / FIPS 186-4 D.1.2.3: the curve secp256r1 = NIST P-256, 256-bit order.
"""

from __future__ import annotations

import datetime as dt
import io
import shutil
import subprocess
from pathlib import Path

import pytest
from conftest import CHECKER, PREPARER
from cryptography import x509
from cryptography.hazmat.primitives.asymmetric import ec
from cryptography.hazmat.primitives.serialization import pkcs12
from cryptography.x509.oid import ExtensionOID, NameOID
from pyhanko.pdf_utils.reader import PdfFileReader
from pyhanko.sign import fields
from pyhanko.sign.validation.pdf_embedded import read_certification_data
from signing_helpers import DAY, NOW, SERVER_AUTH, make_cert, new_key, write_identity

from reportgen.errors import InputError
from reportgen.signing import keygen, sign_document, verify_document
from reportgen.signing.report import render_report

# ---------------------------------------------------------------------------------------------
# keygen


def test_keygen_certificate_is_a_one_year_signing_certificate(demo_ids):
    cert = x509.load_pem_x509_certificate((demo_ids["prepared"] / "cert.pem").read_bytes())
    key = cert.public_key()
    # SEC 2, 2.4.2: secp256r1 (= NIST P-256, FIPS 186-4 D.1.2.3), 256-bit keys
    assert isinstance(key, ec.EllipticCurvePublicKey) and key.curve.key_size == 256
    # RFC 5280 4.1.2.5: validity notBefore..notAfter, one year (365 days, house choice)
    assert cert.not_valid_after_utc - cert.not_valid_before_utc == dt.timedelta(days=365)
    assert cert.subject.get_attributes_for_oid(NameOID.COMMON_NAME)[0].value == PREPARER
    assert "not for real use" in cert.subject.get_attributes_for_oid(
        NameOID.ORGANIZATION_NAME)[0].value
    # RFC 5280 4.2.1.3 / 4.2.1.9: may sign, may not certify others, not a CA
    usage = cert.extensions.get_extension_for_oid(ExtensionOID.KEY_USAGE).value
    assert usage.digital_signature and usage.content_commitment and not usage.key_cert_sign
    assert cert.extensions.get_extension_for_oid(ExtensionOID.BASIC_CONSTRAINTS).value.ca \
        is False


def test_keygen_p12_and_key_are_encrypted_with_the_passphrase(demo_ids):
    data = (demo_ids["checked"] / "identity.p12").read_bytes()
    with pytest.raises(ValueError):
        pkcs12.load_key_and_certificates(data, b"wrong")
    key, _cert, _ = pkcs12.load_key_and_certificates(data, b"correct horse")
    assert isinstance(key, ec.EllipticCurvePrivateKey)
    assert b"ENCRYPTED PRIVATE KEY" in (demo_ids["checked"] / "key.pem").read_bytes()


def test_keygen_never_overwrites_without_force_and_refuses_control_characters(tmp_path):
    keygen("Carol (invented)", tmp_path)
    before = (tmp_path / "cert.pem").read_bytes()
    with pytest.raises(InputError, match="already exists"):
        keygen("Carol (invented)", tmp_path)
    assert (tmp_path / "cert.pem").read_bytes() == before
    keygen("Carol (invented)", tmp_path, force=True)
    assert (tmp_path / "cert.pem").read_bytes() != before
    with pytest.raises(InputError, match="control characters"):
        keygen("Carol\n\x1b[2J", tmp_path / "x")


# ---------------------------------------------------------------------------------------------
# A good sheet


def test_two_signatures_verify_and_the_report_says_what_was_certified(demo, trust_both):
    report = verify_document(demo["two"], trust_both)
    assert report["ok"], render_report(report)
    assert [s["role"] for s in report["signatures"]] == ["prepared", "checked"]
    assert [s["signer"] for s in report["signatures"]] == [PREPARER, CHECKER]
    assert all(s["intact"] and s["trusted"] and s["name_matches"] for s in report["signatures"])
    assert report["unsigned_roles"] == ["reviewed"]
    assert report["pages"]["method"] == "bytes"
    certified = report["certified"]
    assert certified["vessel"] == "Linnet Demo" and certified["passed"] is True
    assert certified["condition"] and certified["date"]
    import hashlib

    from reportgen.signing.sheetfile import embedded_files

    files = embedded_files(demo["two"].read_bytes(), demo["two"])
    # SPEC v2: vessel.sha256 is the SHA-256 of the vessel file's bytes alone (FIPS 180-4)
    assert certified["vessel_sha256"] == hashlib.sha256(files["linnet-demo.yaml"]).hexdigest()
    text = render_report(report)
    assert "Result: VERIFIED" in text and certified["vessel_sha256"] in text
    assert "passes every criterion" in text


def test_first_signature_certifies_with_form_filling_and_pades_subfilter(demo):
    reader = PdfFileReader(io.BytesIO(demo["two"].read_bytes()))
    # ISO 32000-2 12.8.2.2: DocMDP P = 2, form filling and signing
    assert read_certification_data(reader).permission == fields.MDPPerm.FILL_FORMS
    embedded = reader.embedded_signatures
    assert [e.field_name for e in embedded] == ["prepared", "checked"]
    for e in embedded:  # ETSI EN 319 142-1 5.3
        assert e.sig_object["/SubFilter"] == "/ETSI.CAdES.detached"
    # ISO 32000-2 7.5.6: the rendered revision plus one incremental update per signature
    assert reader.xrefs.total_revisions == 3


def test_signing_leaves_document_information_and_xmp_unchanged(demo):
    from pypdf import PdfReader

    unsigned, signed = PdfReader(demo["unsigned"]), PdfReader(demo["two"])
    assert dict(unsigned.metadata) == dict(signed.metadata)
    assert unsigned.xmp_metadata.stream.get_data() == signed.xmp_metadata.stream.get_data()


def test_stamp_names_signer_role_and_date():
    from pypdf import PdfReader

    from reportgen.signing.stamp import stamp_pdf

    page = stamp_pdf("checked", CHECKER, NOW, 140.0, 60.0)
    text = PdfReader(io.BytesIO(page)).pages[0].extract_text()
    assert "Checked by" in text and "B. N. Other" in text
    assert NOW.strftime("%Y-%m-%d") in text


def test_qpdf_finds_signed_sheet_well_formed(demo):
    if shutil.which("qpdf") is None:
        pytest.skip("qpdf is not installed (apt-get install qpdf)")
    # qpdf exit status (its manual): 0 no errors, 2 errors, 3 warnings only
    done = subprocess.run(["qpdf", "--check", str(demo["two"])], capture_output=True,
                          text=True, check=False)
    assert done.returncode == 0, done.stdout + done.stderr


def test_pdfsig_finds_every_signature_valid(demo):
    if shutil.which("pdfsig") is None:
        pytest.skip("poppler's pdfsig is not installed (apt-get install poppler-utils)")
    out = subprocess.run(["pdfsig", str(demo["two"])], capture_output=True, text=True,
                         check=False).stdout
    # poppler wording (from its output, as observed): one "Signature is Valid." per signature
    assert out.count("Signature Validation: Signature is Valid.") == 2, out
    assert "ETSI.CAdES.detached" in out


# ---------------------------------------------------------------------------------------------
# The rules of signing (SPEC "Command line", sign)


def _sign(src: Path, out: Path, role: str, folder: Path, **kw) -> dict:
    return sign_document(src, out, role, key_path=folder / "key.pem",
                         cert_path=folder / "cert.pem", **kw)


def test_roles_sign_in_order(demo, demo_ids, tmp_path):
    with pytest.raises(InputError, match="needs the prepared signature first"):
        _sign(demo["unsigned"], tmp_path / "x.pdf", "checked", demo_ids["prepared"])
    with pytest.raises(InputError, match="needs the checked signature first"):
        _sign(demo["one"], tmp_path / "x.pdf", "reviewed", demo_ids["mallory"])
    with pytest.raises(InputError, match="already signed"):
        _sign(demo["two"], tmp_path / "x.pdf", "checked", demo_ids["mallory"])
    assert not (tmp_path / "x.pdf").exists()


def test_same_certificate_may_not_sign_two_roles(demo, demo_ids, tmp_path):
    with pytest.raises(InputError, match="already signed the prepared role"):
        _sign(demo["two"], tmp_path / "x.pdf", "reviewed", demo_ids["prepared"])


def test_certificate_must_carry_the_name_the_sheet_gives(demo, demo_ids, tmp_path):
    with pytest.raises(InputError, match="the sheet names"):
        _sign(demo["one"], tmp_path / "x.pdf", "checked", demo_ids["mallory"])


@pytest.mark.parametrize("flaw, message", [
    # RFC 5280 4.1.2.5: outside notBefore..notAfter
    ({"not_before": NOW - 40 * DAY, "not_after": NOW - DAY}, "expired"),
    ({"not_before": NOW + DAY, "not_after": NOW + 40 * DAY}, "not yet valid"),
    # RFC 5280 4.2.1.3: keyEncipherment alone does not allow signatures
    ({"signing": False, "encipher": True}, "neither digitalSignature nor nonRepudiation"),
    # RFC 5280 4.2.1.12: serverAuth alone allows neither document signing nor any purpose
    ({"eku": SERVER_AUTH}, "extended key usage"),
])
def test_sign_refuses_certificates_that_may_not_sign_now(demo, tmp_path, flaw, message):
    key = new_key()
    key_path, cert_path = write_identity(tmp_path / "id", key, make_cert(PREPARER, key, **flaw))
    with pytest.raises(InputError, match=message):
        sign_document(demo["unsigned"], tmp_path / "x.pdf", "prepared", key_path=key_path,
                      cert_path=cert_path)
    assert not (tmp_path / "x.pdf").exists()


def test_output_rules_and_input_unchanged(demo, demo_ids, tmp_path):
    src = tmp_path / "in.pdf"
    shutil.copy(demo["one"], src)
    before = src.read_bytes()
    key = new_key()
    key_path, cert_path = write_identity(tmp_path / "id", key, make_cert(CHECKER, key))
    kw = {"key_path": key_path, "cert_path": cert_path}
    with pytest.raises(InputError, match="must not be the input"):
        sign_document(src, src, "checked", force=True, **kw)
    taken = tmp_path / "taken.pdf"
    taken.write_bytes(b"keep me")
    with pytest.raises(InputError, match="already exists"):
        sign_document(src, taken, "checked", **kw)
    assert taken.read_bytes() == b"keep me"
    sign_document(src, taken, "checked", force=True, **kw)
    assert src.read_bytes() == before
    assert taken.read_bytes().startswith(before)  # an incremental update of the input
    assert sorted(p.name for p in tmp_path.iterdir()) == ["id", "in.pdf", "taken.pdf"]


def test_bad_identity_is_refused(demo, demo_ids, tmp_path):
    out = tmp_path / "out.pdf"
    with pytest.raises(InputError, match="passphrase"):
        sign_document(demo["one"], out, "checked",
                      p12_path=demo_ids["checked"] / "identity.p12", passphrase=b"wrong")
    with pytest.raises(InputError, match="does not belong"):
        sign_document(demo["one"], out, "checked", key_path=demo_ids["prepared"] / "key.pem",
                      cert_path=demo_ids["mallory"] / "cert.pem")
    with pytest.raises(InputError, match="--role"):
        _sign(demo["one"], out, "approved", demo_ids["checked"])
    assert not out.exists()


def test_foreign_pdf_and_junk_are_refused(tmp_path, demo_ids):
    from weasyprint import HTML

    foreign = tmp_path / "foreign.pdf"
    foreign.write_bytes(HTML(string="<p>Some other document</p>").write_pdf())
    with pytest.raises(InputError, match="not a reportgen calculation sheet"):
        _sign(foreign, tmp_path / "out.pdf", "prepared", demo_ids["prepared"])
    with pytest.raises(InputError, match="not a reportgen calculation sheet"):
        verify_document(foreign)
    junk = tmp_path / "junk.pdf"
    junk.write_text("format: reportgen/condition-1\n")
    with pytest.raises(InputError, match="not a PDF"):
        verify_document(junk)
    with pytest.raises(InputError, match="not found"):
        verify_document(tmp_path / "missing.pdf")
    assert not (tmp_path / "out.pdf").exists()
