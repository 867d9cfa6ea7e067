"""Signed sheets: demo identities, PAdES signatures, tamper detection, recomputation.

Every check uses real signatures made by reportgen.signing and read back by independent
code: pyHanko's validator, the `cryptography` package, pypdf (to tamper), and poppler's
pdfsig where installed.

Sources named below:
- ISO 32000-2:2020 (PDF 2.0): 7.5.6 incremental updates; 12.8 digital signatures, 12.8.2.2
  DocMDP (P = 2: filling in forms and signing); 7.11.4 embedded file streams.
- ETSI EN 319 142-1 (PAdES), 5.3: baseline signatures use SubFilter ETSI.CAdES.detached.
- RFC 5280, 4.1.2.5 (validity), 4.2.1.3 (key usage: digitalSignature, nonRepudiation is
  named contentCommitment in later texts).
- SEC 2 v2, 2.4.2 / FIPS 186-4 D.1.2.3: the curve secp256r1 = NIST P-256, 256-bit order.
"""

from __future__ import annotations

import datetime as dt
import hashlib
import io
import json
import shutil
import subprocess
from pathlib import Path

import pytest
from cryptography import x509
from cryptography.hazmat.primitives.asymmetric import ec
from cryptography.hazmat.primitives.serialization import pkcs12
from cryptography.x509.oid import ExtensionOID, NameOID
from pyhanko.keys import load_cert_from_pemder
from pyhanko.pdf_utils import generic
from pyhanko.pdf_utils.incremental_writer import IncrementalPdfFileWriter
from pyhanko.pdf_utils.reader import PdfFileReader
from pyhanko.sign import fields, signers
from pyhanko.sign.validation.pdf_embedded import read_certification_data
from pypdf import PdfWriter

from reportgen import signing
from reportgen.errors import InputError

ROLES = ("prepared", "checked", "reviewed")
FIXED = dt.datetime(2026, 1, 1, tzinfo=dt.UTC)


# ---------------------------------------------------------------------------------------------
# A stand-in sheet built only from the sheet contract (docs: internal contract, "The PDF sheet"):
# PDF/A-3b, condition + vessel files (/Source) and results.json (/Data) embedded, three empty
# signature fields prepared/checked/reviewed, title "Intact stability calculation <docno>".
# Its "evaluation" is a deterministic function of the input bytes, patched in for the real one.


def _standin_results(cond: bytes, vessel: bytes, cond_name: str, vessel_name: str) -> dict:
    return {
        "format": "reportgen/results-1",
        "software": {"name": "reportgen", "version": "0.1.0"},
        "inputs_sha256": hashlib.sha256(cond + vessel).hexdigest(),
        "inputs": {"condition_file": cond_name, "vessel_file": vessel_name},
        "condition": {"title": "Departure", "signatories": {"prepared_by": "A. Preparer"}},
        "loading": {"displacement": 1000.0 + len(cond), "vcg": 5.0 + len(vessel) / 1000},
        "passed": True,
    }


def _standin_json(cond: bytes, vessel: bytes, cond_name: str, vessel_name: str) -> str:
    return json.dumps(_standin_results(cond, vessel, cond_name, vessel_name), indent=2) + "\n"


COND = b"format: reportgen/condition-1\nvessel: demo.yaml\ncondition: {title: Departure}\n"
VESSEL = b"format: reportgen/vessel-1\nvessel: {name: Invented Trader}\n"


def _standin_sheet(results_text: str | None = None, with_fields: bool = True) -> bytes:
    from weasyprint import HTML, Attachment

    results_text = results_text or _standin_json(COND, VESSEL, "cond.yaml", "demo.yaml")
    docno = hashlib.sha256(COND + VESSEL).hexdigest()[:12]
    page = f"""<html><head><title>Intact stability calculation {docno}</title><style>
      @page {{ size: A4; margin: 20mm }} body {{ font-family: "DejaVu Sans" }}
      .b {{ position: absolute; top: 200mm; width: 50mm; height: 20mm; border: 1px solid }}
      </style></head><body><p>Stand-in sheet</p>
      <div class="b" style="left: 0mm"></div><div class="b" style="left: 56mm"></div>
      <div class="b" style="left: 112mm"></div></body></html>"""
    attachments = [
        Attachment(string=COND, name="cond.yaml", relationship="Source",
                   created=FIXED, modified=FIXED),
        Attachment(string=VESSEL, name="demo.yaml", relationship="Source",
                   created=FIXED, modified=FIXED),
        Attachment(string=results_text.encode("utf-8"), name="results.json",
                   relationship="Data", created=FIXED, modified=FIXED),
    ]
    pdf = HTML(string=page).write_pdf(pdf_variant="pdf/a-3b", attachments=attachments)
    if not with_fields:
        return pdf
    writer = IncrementalPdfFileWriter(io.BytesIO(pdf))
    for i, role in enumerate(ROLES):
        x = 57 + i * 159  # 20 mm margin + i * 56 mm, in pt
        fields.append_signature_field(writer, fields.SigFieldSpec(
            role, box=(x, 183, x + 142, 240), on_page=0, empty_field_appearance=True))
    out = io.BytesIO()
    writer.write(out)
    return out.getvalue()


@pytest.fixture(autouse=True)
def standin_evaluation(request, monkeypatch):
    """Stand-in sheets get the stand-in evaluation; tests of real demo sheets use the real one."""
    if "demo_sheet" not in request.fixturenames:
        monkeypatch.setattr(signing, "_recompute_json", _standin_json)


# ---------------------------------------------------------------------------------------------
# Shared identities and sheets (module scope: each is made once)


@pytest.fixture(scope="module")
def ids(tmp_path_factory) -> dict[str, Path]:
    base = tmp_path_factory.mktemp("ids")
    signing.keygen("Alice Preparer", base / "alice")
    signing.keygen("Bob Checker", base / "bob", passphrase=b"correct horse")
    signing.keygen("Mallory Outsider", base / "mallory")
    return {"alice": base / "alice", "bob": base / "bob", "mallory": base / "mallory"}


@pytest.fixture(scope="module")
def sheets(tmp_path_factory, ids) -> dict[str, Path]:
    """unsigned -> prepared (Alice, PEM files) -> prepared + checked (Bob, PKCS#12)."""
    mp = pytest.MonkeyPatch()
    mp.setattr(signing, "_recompute_json", _standin_json)
    base = tmp_path_factory.mktemp("sheets")
    unsigned = base / "unsigned.pdf"
    unsigned.write_bytes(_standin_sheet())
    one = base / "one.pdf"
    signing.sign_sheet(unsigned, one, "prepared", key_path=ids["alice"] / "key.pem",
                       cert_path=ids["alice"] / "cert.pem", reason="prepared",
                       location="Design office")
    two = base / "two.pdf"
    signing.sign_sheet(one, two, "checked", p12_path=ids["bob"] / "identity.p12",
                       passphrase=b"correct horse")
    mp.undo()
    return {"unsigned": unsigned, "one": one, "two": two}


def _trust(ids, *names: str) -> list[Path]:
    return [ids[n] / "cert.pem" for n in names]


# ---------------------------------------------------------------------------------------------
# keygen


def test_keygen_certificate_loads_in_cryptography_and_pyhanko(ids):
    cert = x509.load_pem_x509_certificate((ids["alice"] / "cert.pem").read_bytes())
    key = cert.public_key()
    # SEC 2, 2.4.2: secp256r1 (= NIST P-256, FIPS 186-4 D.1.2.3), 256-bit keys
    assert isinstance(key, ec.EllipticCurvePublicKey)
    assert key.curve.name == "secp256r1" and key.curve.key_size == 256
    # RFC 5280 4.1.2.5: validity notBefore..notAfter; the brief asks for one year (365 days)
    assert cert.not_valid_after_utc - cert.not_valid_before_utc == dt.timedelta(days=365)
    now = dt.datetime.now(dt.UTC)
    assert cert.not_valid_before_utc <= now + dt.timedelta(seconds=5)
    assert cert.subject.get_attributes_for_oid(NameOID.COMMON_NAME)[0].value == "Alice Preparer"
    org = cert.subject.get_attributes_for_oid(NameOID.ORGANIZATION_NAME)[0].value
    assert "not for real use" in org
    assert cert.issuer == cert.subject  # self-signed
    # RFC 5280 4.2.1.3: digitalSignature and nonRepudiation (contentCommitment)
    usage = cert.extensions.get_extension_for_oid(ExtensionOID.KEY_USAGE).value
    assert usage.digital_signature and usage.content_commitment
    assert not usage.key_cert_sign
    # the same certificate in pyHanko's loaders
    asn1_cert = load_cert_from_pemder(str(ids["alice"] / "cert.pem"))
    assert asn1_cert.subject.native["common_name"] == "Alice Preparer"
    signer = signers.SimpleSigner.load(str(ids["alice"] / "key.pem"),
                                       str(ids["alice"] / "cert.pem"))
    assert signer is not None and signer.signing_cert.dump() == asn1_cert.dump()


def test_keygen_p12_and_key_are_encrypted_with_the_passphrase(ids):
    data = (ids["bob"] / "identity.p12").read_bytes()
    with pytest.raises(ValueError):
        pkcs12.load_key_and_certificates(data, b"wrong")
    key, cert, _ = pkcs12.load_key_and_certificates(data, b"correct horse")
    assert isinstance(key, ec.EllipticCurvePrivateKey)
    assert cert.subject.get_attributes_for_oid(NameOID.COMMON_NAME)[0].value == "Bob Checker"
    assert b"ENCRYPTED PRIVATE KEY" in (ids["bob"] / "key.pem").read_bytes()
    assert signers.SimpleSigner.load_pkcs12(str(ids["bob"] / "identity.p12"),
                                            passphrase=b"correct horse") is not None


def test_keygen_never_overwrites_without_force(tmp_path):
    first = signing.keygen("Carol", tmp_path)
    before = (tmp_path / "cert.pem").read_bytes()
    with pytest.raises(InputError, match="already exist"):
        signing.keygen("Carol", tmp_path)
    assert (tmp_path / "cert.pem").read_bytes() == before
    again = signing.keygen("Carol", tmp_path, force=True)
    assert again == first and (tmp_path / "cert.pem").read_bytes() != before


# ---------------------------------------------------------------------------------------------
# A good sheet


def test_two_signatures_verify_with_trusted_roots(sheets, ids):
    report = signing.verify_sheet(sheets["two"], _trust(ids, "alice", "bob"))
    assert report["ok"], signing.render_verify_report(report)
    sigs = {s["field"]: s for s in report["signatures"]}
    assert list(sigs) == ["prepared", "checked"]
    assert sigs["prepared"]["signer"] == "Alice Preparer"
    assert sigs["checked"]["signer"] == "Bob Checker"
    for s in sigs.values():
        assert s["intact"] and s["trusted"] and s["docmdp_ok"]
        assert s["signing_time"].endswith("Z")
    # the later signature covers the whole file; the earlier one is followed by form filling only
    assert sigs["checked"]["coverage"] == "entire_file"
    assert sigs["prepared"]["modification_level"] == "form_filling"
    assert report["unsigned_fields"] == ["reviewed"]
    assert report["inputs"]["hash_ok"] and report["inputs"]["document_number_ok"]
    assert report["recomputation"]["ok"]
    text = signing.render_verify_report(report)
    assert "Result: VERIFIED" in text and "Alice Preparer" in text


def test_first_signature_certifies_with_form_filling_and_pades_subfilter(sheets):
    reader = PdfFileReader(io.BytesIO(sheets["two"].read_bytes()))
    # ISO 32000-2 12.8.2.2: DocMDP P = 2, form filling and signing
    assert read_certification_data(reader).permission == fields.MDPPerm.FILL_FORMS
    embedded = reader.embedded_signatures
    assert [e.field_name for e in embedded] == ["prepared", "checked"]
    # ETSI EN 319 142-1 5.3: PAdES baseline SubFilter
    for e in embedded:
        assert e.sig_object["/SubFilter"] == "/ETSI.CAdES.detached"
    assert embedded[0].sig_object.get("/Reference") is not None  # the certifying one
    assert embedded[1].sig_object.get("/Reference") is None  # approval
    # ISO 32000-2 7.5.6: each signature is its own incremental update (a new %%EOF)
    assert sheets["two"].read_bytes().count(b"%%EOF") >= 3


def test_stamp_names_signer_role_and_date(sheets):
    reader = PdfFileReader(io.BytesIO(sheets["one"].read_bytes()))
    (_name, _value, ref), = fields.enumerate_sig_fields(reader, with_name="prepared")
    widget = ref.get_object()
    appearance = widget["/AP"]["/N"].get_object()
    xobjects = appearance["/Resources"]["/XObject"]
    assert len(xobjects) >= 1  # the imported stamp page
    # the stamp text is in a font embedded in the file (PDF/A, ISO 19005-3 6.2.11.4)
    text = _page_text(sheets["one"])
    assert "Prepared by" in text and "Alice Preparer" in text
    assert dt.datetime.now(dt.UTC).strftime("%Y-%m-%d") in text


def _page_text(path: Path) -> str:
    from pypdf import PdfReader

    page = PdfReader(path).pages[0]
    chunks = [page.extract_text()]
    for annot in page.get("/Annots", []):
        ap = annot.get_object().get("/AP")
        if ap is None:
            continue
        n = ap["/N"].get_object()
        for x in (n.get("/Resources", {}).get("/XObject", {}) or {}).values():
            inner = x.get_object()
            for y in (inner.get("/Resources", {}).get("/XObject", {}) or {}).values():
                chunks.append(_xobject_text(y.get_object()))
            chunks.append(_xobject_text(inner))
    return "\n".join(chunks)


def _xobject_text(xobj) -> str:
    """Text of a form XObject, by placing it on a blank pypdf page."""
    from pypdf import PageObject
    from pypdf.generic import NameObject

    page = PageObject.create_blank_page(width=300, height=100)
    page[NameObject("/Resources")] = xobj.get("/Resources", {})
    page.replace_contents(xobj)
    try:
        return page.extract_text()
    except Exception:  # noqa: BLE001 - a nested XObject without text
        return ""


def test_qpdf_finds_signed_sheet_well_formed(sheets):
    if shutil.which("qpdf") is None:
        pytest.skip("qpdf is not installed (apt-get install qpdf)")
    # qpdf exit status (its manual): 0 no errors, 2 errors, 3 warnings only
    done = subprocess.run(["qpdf", "--check", str(sheets["two"])], capture_output=True,
                          text=True, check=False)
    assert done.returncode == 0, done.stdout + done.stderr


def _pdfsig_two_valid_signatures(path: Path) -> str:
    """poppler's pdfsig on `path`: both signatures valid (an independent validator)."""
    if shutil.which("pdfsig") is None:
        pytest.skip("poppler's pdfsig is not installed (apt-get install poppler-utils)")
    out = subprocess.run(["pdfsig", str(path)], capture_output=True, text=True,
                         check=False).stdout
    # poppler wording (from its output, as observed): one "Signature is Valid." per signature
    assert out.count("Signature Validation: Signature is Valid.") == 2, out
    return out


def test_pdfsig_finds_every_signature_valid(sheets):
    assert "ETSI.CAdES.detached" in _pdfsig_two_valid_signatures(sheets["two"])


# ---------------------------------------------------------------------------------------------
# What verify must catch


def test_changed_byte_in_signed_revision_is_not_intact(sheets, ids, tmp_path):
    data = bytearray(sheets["two"].read_bytes())
    # the binary comment on the second line of the header: inside every signature's
    # byte range (ISO 32000-2 12.8.1: the range starts at offset 0), harmless to a parser
    pos = data.index(b"\n", 0) + 2
    data[pos] ^= 0x01
    bad = tmp_path / "bad.pdf"
    bad.write_bytes(bytes(data))
    report = signing.verify_sheet(bad, _trust(ids, "alice", "bob"))
    assert not report["ok"]
    assert not any(s["intact"] for s in report["signatures"])
    assert "intact:            NO" in signing.render_verify_report(report)


def _with_blank_page(signed: Path, folder: Path) -> Path:
    """A copy of `signed` with a blank page added in an incremental update (pypdf)."""
    writer = PdfWriter(signed, incremental=True)
    writer.add_blank_page(595, 842)
    bad = folder / "page.pdf"
    with bad.open("wb") as fh:
        writer.write(fh)
    return bad


def test_page_added_in_later_update_is_caught(sheets, ids, tmp_path):
    bad = _with_blank_page(sheets["two"], tmp_path)
    assert bad.read_bytes().startswith(sheets["two"].read_bytes())  # really incremental
    report = signing.verify_sheet(bad, _trust(ids, "alice", "bob"))
    assert not report["ok"]
    assert all(s["intact"] for s in report["signatures"])  # signed bytes untouched...
    assert not any(s["docmdp_ok"] for s in report["signatures"])  # ...but a disallowed change


def test_attachment_added_after_signing_is_caught(sheets, ids, tmp_path):
    writer = PdfWriter(sheets["two"], incremental=True)
    writer.add_attachment("extra.yaml", b"format: reportgen/condition-1\n")
    bad = tmp_path / "attach.pdf"
    with bad.open("wb") as fh:
        writer.write(fh)
    report = signing.verify_sheet(bad, _trust(ids, "alice", "bob"))
    assert not report["ok"]
    assert not any(s["docmdp_ok"] for s in report["signatures"])


def test_attachment_replaced_after_signing_is_caught(sheets, ids, tmp_path):
    data = sheets["two"].read_bytes()
    writer = IncrementalPdfFileWriter(io.BytesIO(data))
    names = writer.root["/Names"]["/EmbeddedFiles"]["/Names"]
    for i in range(0, len(names), 2):
        spec = names[i + 1].get_object()
        if str(spec.get("/UF", spec.get("/F"))) == "cond.yaml":
            # ISO 32000-2 7.11.4: the file's bytes are the /EF /F stream of its file spec
            new = generic.StreamObject({generic.pdf_name("/Type"):
                                        generic.pdf_name("/EmbeddedFile")},
                                       stream_data=COND.replace(b"Departure", b"Arrival"))
            spec["/EF"] = generic.DictionaryObject({
                generic.pdf_name("/F"): writer.add_object(new),
                generic.pdf_name("/UF"): writer.add_object(new),
            })
            writer.update_container(spec)
            break
    else:
        pytest.fail("stand-in sheet has no cond.yaml")
    out = io.BytesIO()
    writer.write(out)
    bad = tmp_path / "replaced.pdf"
    bad.write_bytes(out.getvalue())
    report = signing.verify_sheet(bad, _trust(ids, "alice", "bob"))
    assert not report["ok"]
    assert not any(s["docmdp_ok"] for s in report["signatures"])
    # and the replaced bytes no longer match the recorded SHA-256
    assert not report["inputs"]["hash_ok"]


def test_signer_outside_trusted_roots_is_not_trusted(sheets, ids):
    report = signing.verify_sheet(sheets["two"], _trust(ids, "alice", "mallory"))
    assert not report["ok"]
    sigs = {s["field"]: s for s in report["signatures"]}
    assert sigs["prepared"]["trusted"] and not sigs["checked"]["trusted"]
    assert sigs["checked"]["intact"]  # intact but not trusted


def test_no_trust_given_trusts_nothing(sheets):
    report = signing.verify_sheet(sheets["two"])
    assert not report["ok"]
    assert report["signatures"] and not any(s["trusted"] for s in report["signatures"])
    assert "no --trust certificate given" in signing.render_verify_report(report)


def test_unsigned_sheet_is_not_ok(sheets, ids):
    report = signing.verify_sheet(sheets["unsigned"], _trust(ids, "alice"))
    assert not report["ok"]
    assert report["signatures"] == []
    assert report["inputs"]["ok"] and report["recomputation"]["ok"]
    assert "not signed" in signing.render_verify_report(report)


def test_results_disagreeing_with_inputs_are_caught(tmp_path, ids):
    results = _standin_results(COND, VESSEL, "cond.yaml", "demo.yaml")
    results["loading"]["displacement"] += 25.0  # not what the inputs give
    sheet = tmp_path / "altered.pdf"
    sheet.write_bytes(_standin_sheet(json.dumps(results, indent=2) + "\n"))
    report = signing.verify_sheet(sheet, _trust(ids, "alice"))
    assert not report["ok"]
    assert report["inputs"]["hash_ok"]  # the inputs themselves are the recorded ones
    assert report["recomputation"]["differences"] == ["loading.displacement"]
    with pytest.raises(InputError, match="loading.displacement"):
        signing.sign_sheet(sheet, tmp_path / "signed.pdf", "prepared",
                           key_path=ids["alice"] / "key.pem",
                           cert_path=ids["alice"] / "cert.pem")
    assert not (tmp_path / "signed.pdf").exists()


def test_recorded_hash_not_matching_inputs_is_caught(tmp_path, ids):
    results = _standin_results(COND, VESSEL, "cond.yaml", "demo.yaml")
    results["inputs_sha256"] = hashlib.sha256(b"something else").hexdigest()
    sheet = tmp_path / "hash.pdf"
    sheet.write_bytes(_standin_sheet(json.dumps(results, indent=2) + "\n"))
    report = signing.verify_sheet(sheet)
    assert not report["inputs"]["hash_ok"] and not report["inputs"]["document_number_ok"]
    with pytest.raises(InputError, match="SHA-256"):
        signing.sign_sheet(sheet, tmp_path / "signed.pdf", "prepared",
                           key_path=ids["alice"] / "key.pem",
                           cert_path=ids["alice"] / "cert.pem")


# ---------------------------------------------------------------------------------------------
# What sign refuses


def test_foreign_pdf_is_refused(tmp_path, ids):
    from weasyprint import HTML

    foreign = tmp_path / "foreign.pdf"
    foreign.write_bytes(HTML(string="<p>Some other document</p>").write_pdf())
    with pytest.raises(InputError, match="not a reportgen calculation sheet"):
        signing.sign_sheet(foreign, tmp_path / "out.pdf", "prepared",
                           key_path=ids["alice"] / "key.pem",
                           cert_path=ids["alice"] / "cert.pem")
    with pytest.raises(InputError, match="not a reportgen calculation sheet"):
        signing.verify_sheet(foreign)
    assert not (tmp_path / "out.pdf").exists()


def test_sheet_without_signature_fields_is_refused(tmp_path, ids):
    sheet = tmp_path / "nofields.pdf"
    sheet.write_bytes(_standin_sheet(with_fields=False))
    with pytest.raises(InputError, match="no signature field"):
        signing.sign_sheet(sheet, tmp_path / "out.pdf", "prepared",
                           key_path=ids["alice"] / "key.pem",
                           cert_path=ids["alice"] / "cert.pem")


def test_not_a_pdf_is_an_input_error(tmp_path):
    junk = tmp_path / "junk.pdf"
    junk.write_text("format: reportgen/condition-1\n")
    with pytest.raises(InputError, match="not a PDF"):
        signing.verify_sheet(junk)
    with pytest.raises(InputError, match="cannot read"):
        signing.verify_sheet(tmp_path / "missing.pdf")


def test_role_already_signed_is_refused(sheets, ids, tmp_path):
    with pytest.raises(InputError, match="already signed"):
        signing.sign_sheet(sheets["two"], tmp_path / "again.pdf", "checked",
                           key_path=ids["alice"] / "key.pem",
                           cert_path=ids["alice"] / "cert.pem")


def test_output_rules_and_input_unchanged(sheets, ids, tmp_path):
    src = tmp_path / "in.pdf"
    shutil.copy(sheets["one"], src)
    before = src.read_bytes()
    kw = {"key_path": ids["alice"] / "key.pem", "cert_path": ids["alice"] / "cert.pem"}
    with pytest.raises(InputError, match="must not be the input"):
        signing.sign_sheet(src, src, "reviewed", force=True, **kw)
    taken = tmp_path / "taken.pdf"
    taken.write_bytes(b"keep me")
    with pytest.raises(InputError, match="already exists"):
        signing.sign_sheet(src, taken, "reviewed", **kw)
    assert taken.read_bytes() == b"keep me"
    signing.sign_sheet(src, taken, "reviewed", force=True, **kw)
    assert src.read_bytes() == before
    assert taken.read_bytes().startswith(before)  # an incremental update of the input
    assert [p.name for p in tmp_path.iterdir() if p.name.endswith(".tmp")] == []


def test_bad_identity_is_refused(sheets, ids, tmp_path):
    out = tmp_path / "out.pdf"
    with pytest.raises(InputError, match="passphrase"):
        signing.sign_sheet(sheets["one"], out, "checked", p12_path=ids["bob"] / "identity.p12",
                           passphrase=b"wrong")
    with pytest.raises(InputError, match="does not belong"):
        signing.sign_sheet(sheets["one"], out, "checked", key_path=ids["alice"] / "key.pem",
                           cert_path=ids["bob"] / "cert.pem")
    with pytest.raises(InputError, match="--role"):
        signing.sign_sheet(sheets["one"], out, "approved", key_path=ids["alice"] / "key.pem",
                           cert_path=ids["alice"] / "cert.pem")
    assert not out.exists()


# ---------------------------------------------------------------------------------------------
# Real demo sheets: conditions/*.yaml through the real evaluation and renderer


DEMO_CONDITIONS = sorted((Path(__file__).resolve().parent.parent / "conditions").glob("*.yaml"))


@pytest.fixture(scope="module")
def demo_sheet(tmp_path_factory, ids) -> dict:
    if not DEMO_CONDITIONS:
        pytest.skip("no demo condition in conditions/*.yaml yet")
    from reportgen.inputs import load_case
    from reportgen.pipeline import evaluate
    from reportgen.report.render import render_sheet
    from reportgen.results import Results

    base = tmp_path_factory.mktemp("demo")
    case = load_case(DEMO_CONDITIONS[0])
    results = evaluate(case)
    unsigned = base / "unsigned.pdf"
    unsigned.write_bytes(render_sheet(case, results))
    one, two = base / "one.pdf", base / "two.pdf"
    signing.sign_sheet(unsigned, one, "prepared", key_path=ids["alice"] / "key.pem",
                       cert_path=ids["alice"] / "cert.pem")
    signing.sign_sheet(one, two, "checked", p12_path=ids["bob"] / "identity.p12",
                       passphrase=b"correct horse")
    altered_doc = results.to_dict()
    altered_doc["hydrostatics"]["gm_fluid"] += 0.05  # not what the inputs give
    altered = base / "altered.pdf"
    altered.write_bytes(render_sheet(case, Results.model_validate(altered_doc)))
    return {"unsigned": unsigned, "two": two, "altered": altered}


def test_demo_sheet_signed_twice_verifies(demo_sheet, ids):
    report = signing.verify_sheet(demo_sheet["two"], _trust(ids, "alice", "bob"))
    assert report["ok"], signing.render_verify_report(report)
    assert [s["field"] for s in report["signatures"]] == ["prepared", "checked"]
    assert report["recomputation"]["ok"] and report["recomputation"]["differences"] == []


def test_demo_sheet_signatures_valid_in_pdfsig(demo_sheet):
    _pdfsig_two_valid_signatures(demo_sheet["two"])


def test_demo_sheet_with_altered_results_is_caught(demo_sheet, ids, tmp_path):
    report = signing.verify_sheet(demo_sheet["altered"], _trust(ids, "alice"))
    assert not report["ok"]
    assert "hydrostatics.gm_fluid" in report["recomputation"]["differences"]
    with pytest.raises(InputError, match="hydrostatics.gm_fluid"):
        signing.sign_sheet(demo_sheet["altered"], tmp_path / "s.pdf", "prepared",
                           key_path=ids["alice"] / "key.pem",
                           cert_path=ids["alice"] / "cert.pem")


def test_demo_sheet_page_added_after_signing_is_caught(demo_sheet, ids, tmp_path):
    bad = _with_blank_page(demo_sheet["two"], tmp_path)
    report = signing.verify_sheet(bad, _trust(ids, "alice", "bob"))
    assert not report["ok"] and not any(s["docmdp_ok"] for s in report["signatures"])


def test_demo_sheet_pages_agree_with_a_fresh_rendering(demo_sheet, ids):
    report = signing.verify_sheet(demo_sheet["two"], _trust(ids, "alice", "bob"), pages=True)
    assert report["ok"] and report["pages"]["ok"] and report["pages"]["differing_pages"] == []
    assert "Printed pages: AGREE" in signing.render_verify_report(report)


def test_demo_sheet_with_a_page_edited_before_signing_is_caught(demo_sheet, ids, tmp_path,
                                                               monkeypatch):
    # A sheet whose printed words were changed before it was signed: its embedded results
    # still agree with its inputs, so only the comparison of the printed pages can tell.
    from reportgen.inputs import load_case
    from reportgen.pipeline import evaluate
    from reportgen.report import render

    original = render.sheet_html
    monkeypatch.setattr(render, "sheet_html", lambda case, results: original(
        case, results).replace("<h1>Intact stability calculation</h1>", "<h1>Edited</h1>"))
    case = load_case(DEMO_CONDITIONS[0])
    edited = tmp_path / "edited.pdf"
    edited.write_bytes(render.render_sheet(case, evaluate(case)))
    monkeypatch.setattr(render, "sheet_html", original)
    signed = tmp_path / "edited-signed.pdf"
    signing.sign_sheet(edited, signed, "prepared", key_path=ids["alice"] / "key.pem",
                       cert_path=ids["alice"] / "cert.pem")
    assert signing.verify_sheet(signed, _trust(ids, "alice"))["ok"]  # signatures and results
    report = signing.verify_sheet(signed, _trust(ids, "alice"), pages=True)
    assert not report["ok"] and 1 in report["pages"]["differing_pages"]
