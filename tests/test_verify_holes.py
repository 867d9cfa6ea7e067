"""Holes found by attacking ``reportgen verify`` as a dishonest signer or a careless surveyor,
each checked against SPEC "Verification" (points named beside each test).

Sources: ISO 32000-2:2020 7.7.2 (the catalogue: /OpenAction, /AA, /OCProperties, /Names),
7.11.4 (embedded files), 8.11 (optional content), 9.3.6 (text rendering mode 3: neither fill
nor stroke, invisible text), 12.5.3 (annotation flags: NoView, Print), 14.3 (metadata);
RFC 5280 4.1.2.6 (the subject); Unicode Standard Annex #15 (normalisation forms) and
Unicode Technical Standard #39 (confusable characters).
"""

from __future__ import annotations

import io
from pathlib import Path

import pytest
from conftest import PREPARER
from signing_helpers import cert_file, make_cert, new_key, raw_sign

from reportgen.signing import recompute as rc
from reportgen.signing import verify, verify_document
from reportgen.signing.report import render_report


def _write(folder: Path, name: str, data: bytes) -> Path:
    path = folder / name
    path.write_bytes(data)
    return path


@pytest.fixture(scope="module")
def signer(tmp_path_factory):
    folder = tmp_path_factory.mktemp("holes")
    key = new_key()
    cert = make_cert(PREPARER, key)
    return {"key": key, "cert": cert, "trust": [cert_file(folder, cert)], "folder": folder}


# --- point 4: where pages are compared as images, nothing but the pixels may differ ---------


def _other_stack_and_bigger_fresh(monkeypatch) -> None:
    """The running stack differs from the recorded one in a library (so pages are compared
    as images), and its renderer writes other, larger bytes for the same pages (a pypdf
    rewrite, padded): the size of the first revision decides nothing."""
    from pypdf import PdfReader, PdfWriter

    from reportgen.report import stack

    real_stack = stack.rendering_stack()
    monkeypatch.setattr(verify, "rendering_stack", lambda: {**real_stack, "weasyprint": "0.0"})
    real = rc.rebuild

    def rebuilt(kind, inputs):
        fresh = real(kind, inputs)
        out = io.BytesIO()
        PdfWriter(clone_from=PdfReader(io.BytesIO(fresh.pdf))).write(out)
        return rc.Rebuilt(fresh.data_text, out.getvalue() + b"\n" + b" " * 400_000 + b"\n")

    monkeypatch.setattr(verify, "rebuild", rebuilt)


def _javascript(w):  # ISO 32000-2 12.6.4.17, run on opening (7.7.2 /OpenAction)
    from pypdf.generic import DictionaryObject, NameObject, TextStringObject

    w._root_object[NameObject("/OpenAction")] = w._add_object(DictionaryObject({
        NameObject("/S"): NameObject("/JavaScript"),
        NameObject("/JS"): TextStringObject("app.alert('passes')")}))


def _extra_file(w):  # 7.11.4: a further embedded file
    w.add_attachment("corrected-results.txt", b"every criterion passes")


def _print_only_box(w):  # 12.5.3: NoView (32) + Print (4): absent on screen, on paper
    from pypdf.generic import ArrayObject, DictionaryObject, NameObject, NumberObject, StreamObject

    stream = StreamObject()
    stream.set_data(b"1 g 0 0 500 60 re f")
    stream.update({NameObject("/Type"): NameObject("/XObject"),
                   NameObject("/Subtype"): NameObject("/Form"),
                   NameObject("/BBox"): ArrayObject([NumberObject(v) for v in (0, 0, 500, 60)])})
    annot = DictionaryObject({
        NameObject("/Type"): NameObject("/Annot"), NameObject("/Subtype"): NameObject("/Square"),
        NameObject("/Rect"): ArrayObject([NumberObject(v) for v in (40, 600, 540, 660)]),
        NameObject("/F"): NumberObject(36),
        NameObject("/AP"): DictionaryObject({NameObject("/N"): w._add_object(stream)})})
    w.pages[0][NameObject("/Annots")] = ArrayObject([w._add_object(annot)])


def _invisible_text(w):  # 9.3.6: rendering mode 3, text that search and copy find
    from pypdf.generic import ArrayObject, NameObject, StreamObject

    page = w.pages[0]
    font = next(iter(page["/Resources"]["/Font"]))
    stream = StreamObject()
    stream.set_data(f"BT {font} 12 Tf 3 Tr 50 50 Td (meets every criterion) Tj ET".encode())
    contents = page.raw_get("/Contents")
    parts = list(contents.get_object()) if isinstance(contents.get_object(), list) \
        else [contents]
    page[NameObject("/Contents")] = ArrayObject([*parts, w._add_object(stream)])


def _no_metadata(w):  # 14.3.2: the XMP metadata (and so PDF/A) removed
    del w._root_object["/Metadata"]


def _bookmark(w):  # 12.3.3: a bookmark that says what the page does not
    w.add_outline_item(title="Verdict: meets every criterion", page_number=0)


@pytest.mark.parametrize("change, part", [
    (_javascript, "catalogue entries"), (_extra_file, "embedded files"),
    (_print_only_box, "annotations"), (_invisible_text, "page text"),
    (_no_metadata, "XMP metadata"), (_bookmark, "bookmarks")],
    ids=["javascript", "extra_file", "print_only", "invisible_text", "no_xmp", "bookmark"])
def test_image_comparison_also_holds_everything_but_the_pixels(demo, signer, monkeypatch,
                                                                 change, part):
    # SPEC "Verification", point 4: the page the reader sees is the page reportgen makes; a
    # trusted but dishonest signer edits the recorded stack, so pages go to images, and
    # changes what pixels do not show. The pixels agree; the part named must not.
    from pypdf import PdfReader, PdfWriter

    writer = PdfWriter(clone_from=PdfReader(demo["unsigned"]))
    change(writer)
    out = io.BytesIO()
    writer.write(out)  # one revision: the forged page, then signed by a trusted signer
    signed = raw_sign(out.getvalue(), "prepared", signer["key"], signer["cert"], certify=True)
    sheet = _write(signer["folder"], f"{change.__name__}.pdf", signed)
    _other_stack_and_bigger_fresh(monkeypatch)
    report = verify_document(sheet, signer["trust"])
    assert report["pages"]["method"].startswith("images at 100 dpi")
    assert not report["ok"]
    assert report["pages"]["differing_pages"] == []  # the forgery shows no pixel
    assert part in report["pages"]["differing_parts"], report["problems"]


# --- point 3: the name in the certificate is the name on the sheet, conservatively ----------

SHEET_NAME = PREPARER  # "A. N. Other, chief officer (invented)"


@pytest.mark.parametrize("certificate_name", [
    PREPARER.upper(),  # letter case
    PREPARER.replace("A.", "\uff21."),  # full-width A (NFKC folds it to A)
    PREPARER.replace("Other", "\u041ether"),  # Cyrillic capital O (UTS #39 confusable)
    PREPARER.replace("Other", "Oth\u200ber"),  # zero-width space (format character)
    PREPARER.replace("N. ", "N.\t"),  # a control character that split() takes for a space
    PREPARER.replace("N. ", "N.\u00a0"),  # no-break space
    PREPARER.replace("N. ", "N.\u2028"),  # line separator
    PREPARER.replace("fficer", "\ufb03cer"),  # the ligature ffi
], ids=["case", "fullwidth", "cyrillic", "zero_width", "tab", "nbsp", "line_sep", "ligature"])
def test_a_name_that_only_looks_the_same_does_not_match(certificate_name):
    from reportgen.signing.identity import name_problem, names_match

    assert not names_match(certificate_name, SHEET_NAME)
    assert name_problem(certificate_name, SHEET_NAME)


def test_names_that_are_the_same_text_match():
    from reportgen.signing.identity import names_match

    assert names_match(SHEET_NAME, SHEET_NAME)
    assert names_match("  A. N.  Other, chief officer (invented) ", SHEET_NAME)  # ASCII spaces
    # canonical equivalence (UAX #15): e + combining acute is the same text as é
    assert names_match("Ren\u0065\u0301e Other", "Ren\u00e9e Other")
    # a mixed-script name matches nothing, not even itself
    assert not names_match("A. N. \u041ether", "A. N. \u041ether")


def test_verify_names_the_case_difference_and_sign_refuses_it(demo, signer, tmp_path):
    from reportgen.errors import InputError
    from reportgen.signing import sign_document
    from reportgen.signing.identity import keygen

    key = new_key()
    cert = make_cert(PREPARER.upper(), key)
    signed = raw_sign(demo["unsigned"].read_bytes(), "prepared", key, cert, certify=True)
    report = verify_document(_write(tmp_path, "case.pdf", signed), [cert_file(tmp_path, cert)])
    assert not report["ok"] and report["signatures"][0]["name_matches"] is False
    assert "differ in letter case" in "\n".join(report["problems"])
    keygen(PREPARER.lower(), tmp_path / "lower")
    with pytest.raises(InputError, match="letter case"):
        sign_document(demo["unsigned"], tmp_path / "x.pdf", "prepared",
                      p12_path=tmp_path / "lower" / "identity.p12")


# --- point 3: each role its own signer; a role the sheet names is signed ----------------------


def _two_roles(demo, tmp_path, first, second, sheet="unsigned"):
    """Sign prepared with ``first`` and checked with ``second`` = (key, cert); the report."""
    data = raw_sign(demo[sheet].read_bytes(), "prepared", *first, certify=True)
    data = raw_sign(data, "checked", *second)
    trust = [cert_file(tmp_path, first[1], "a.pem"), cert_file(tmp_path, second[1], "b.pem")]
    return verify_document(_write(tmp_path, "two.pdf", data), trust)


def test_one_key_under_two_certificates_may_not_sign_two_roles(demo, tmp_path):
    # Two certificates (each with the name the sheet gives) over one key: one key holder
    # signs both roles. SPEC point 3: "the same certificate signing two roles is a failure";
    # a certificate is its key's holder, so the same key is the same signer.
    from conftest import CHECKER

    key = new_key()
    report = _two_roles(demo, tmp_path, (key, make_cert(PREPARER, key)),
                        (key, make_cert(CHECKER, key)))
    assert not report["ok"]
    assert "the same key signed prepared too" in "\n".join(report["problems"])


def test_one_name_under_two_keys_may_not_sign_two_roles(demo, tmp_path):
    # The failing sheet names nobody: the same person (by name) under two certificates.
    keys = new_key(), new_key()
    report = _two_roles(demo, tmp_path, (keys[0], make_cert("D. Other (invented)", keys[0])),
                        (keys[1], make_cert("D. OTHER  (invented)", keys[1])), "failing")
    assert not report["ok"]
    assert "the same person (D. OTHER  (invented)) signed prepared too" in \
        "\n".join(report["problems"])


def test_a_role_the_sheet_names_and_nobody_signed_is_said_beside_the_verdict(demo, trust_both):
    # The sheet names B. N. Other for checked; only prepared is signed. SPEC.md "Verification"
    # point 3 matches a role's signing certificate against the name; the exit status of
    # "Command line" fails an unsigned sheet, not one whose later roles are still to sign:
    # prepared alone verifies, and the report says who is still to sign.
    report = verify_document(demo["one"], trust_both)
    assert report["ok"] and report["unsigned_roles"] == ["checked", "reviewed"]
    assert report["notes"] == [("the sheet names 'B. N. Other, master (invented)' for "
                                "checked, and checked is not signed yet: only the signatures "
                                "present are verified")]
    text = render_report(report)
    assert "Note: the sheet names 'B. N. Other" in text and "Result: VERIFIED" in text


def _signing_clock(monkeypatch, shift):
    import datetime as dt

    from pyhanko.sign.signers import pdf_signer

    class Shifted(dt.datetime):
        @classmethod
        def now(cls, tz=None):
            return dt.datetime.now(tz) + shift

    monkeypatch.setattr(pdf_signer, "datetime", Shifted)


def test_a_signing_time_in_the_future_fails(demo, signer, monkeypatch, tmp_path):
    # The certificate is valid then and now (RFC 5280 4.1.2.5), but a signature cannot have
    # been made after the moment it is verified (our bound: 5 minutes of clock difference).
    from signing_helpers import DAY

    _signing_clock(monkeypatch, 3 * DAY)
    signed = raw_sign(demo["failing"].read_bytes(), "prepared", signer["key"], signer["cert"],
                      certify=True)
    monkeypatch.undo()
    report = verify_document(_write(tmp_path, "future.pdf", signed), signer["trust"])
    assert not report["ok"] and "in the future" in "\n".join(report["problems"])


def test_signing_times_out_of_role_order_fail(demo, monkeypatch, tmp_path):
    # checked states a signing time a day before prepared's: the revisions say otherwise.
    from signing_helpers import DAY

    keys = new_key(), new_key()
    first = (keys[0], make_cert("E. Other (invented)", keys[0]))
    second = (keys[1], make_cert("F. Other (invented)", keys[1]))
    data = raw_sign(demo["failing"].read_bytes(), "prepared", *first, certify=True)
    _signing_clock(monkeypatch, -DAY)
    data = raw_sign(data, "checked", *second)
    monkeypatch.undo()
    trust = [cert_file(tmp_path, first[1], "a.pem"), cert_file(tmp_path, second[1], "b.pem")]
    report = verify_document(_write(tmp_path, "order.pdf", data), trust)
    assert not report["ok"] and "before the prepared signature" in "\n".join(report["problems"])


# --- hostile embedded data: a report (exit 1), never a traceback ------------------------------


def _with_results(unsigned: Path, change) -> bytes:
    """The sheet with its embedded results.json edited by ``change(dict)`` (pypdf rewrite)."""
    import json

    from pypdf import PdfReader, PdfWriter

    writer = PdfWriter(clone_from=PdfReader(unsigned))
    names = writer._root_object["/Names"]["/EmbeddedFiles"]["/Names"]
    for i in range(0, len(names), 2):
        if names[i] == "results.json":
            stream = names[i + 1].get_object()["/EF"]["/F"].get_object()
            data = json.loads(stream.get_data())
            change(data)
            stream.set_data(json.dumps(data).encode())
    out = io.BytesIO()
    writer.write(out)
    return out.getvalue()


@pytest.mark.parametrize("signatories", [["A. N. Other"], {"prepared_by": 5}, "A. N. Other"])
def test_signatories_of_the_wrong_type_give_a_report(demo, signer, tmp_path, signatories):
    def change(data):
        data["condition"]["signatories"] = signatories

    forged = _with_results(demo["unsigned"], change)
    signed = raw_sign(forged, "prepared", signer["key"], signer["cert"], certify=True)
    report = verify_document(_write(tmp_path, "t.pdf", signed), signer["trust"])
    assert not report["ok"] and report["recomputation"]["differences"]


def test_a_folder_without_documents_is_bad_input_beside_a_good_file(demo, trust_both, tmp_path):
    # SPEC "Command line": every file is processed, a bad one reported, the exit status the
    # worst of them. A folder with nothing to verify (a mistyped path) must not let a run
    # over it and a good file end in 0, and the JSON summary must count it.
    import json

    from click.testing import CliRunner

    from reportgen.cli import main

    empty = tmp_path / "empty"
    empty.mkdir()
    trust = [a for t in trust_both for a in ("--trust", str(t))]
    done = CliRunner().invoke(main, ["verify", str(empty), str(demo["two"]), *trust, "--json"])
    assert done.exit_code == 2, done.output
    batch = json.loads(done.stdout)
    assert batch["summary"]["unreadable"] == 1
    assert batch["unreadable"][0]["file"] == str(empty)


@pytest.mark.parametrize("what", ["empty", "truncated", "header_only", "dev_zero", "fifo",
                                  "cut_in_signature"])
def test_unreadable_files_are_exit_2_with_one_message(demo, trust_both, tmp_path, what):
    # SPEC "Conventions" and "Command line": 2 when the file is unreadable; one clear
    # message naming the file; never a traceback.
    import os

    from click.testing import CliRunner

    from reportgen.cli import main

    data = demo["two"].read_bytes()
    path = tmp_path / f"{what}.pdf"
    if what == "dev_zero":
        path = Path("/dev/zero")
    elif what == "fifo":
        os.mkfifo(path)
    else:
        path.write_bytes({"empty": b"", "truncated": data[: len(data) // 2],
                          "header_only": b"%PDF-1.7\n",
                          "cut_in_signature": data[: len(data) - 3000]}[what])
    trust = [a for t in trust_both for a in ("--trust", str(t))]
    done = CliRunner().invoke(main, ["verify", str(path), *trust])
    assert done.exit_code == 2, done.output
    assert str(path) in done.stderr and "Traceback" not in done.output
    assert not isinstance(done.exception, Exception) or isinstance(done.exception, SystemExit)


def test_inputs_edited_and_hashed_again_are_caught_by_the_recomputation(demo, signer,
                                                                        tmp_path):
    # SPEC "Verification", point 5: a forger edits the embedded condition (a heavy item
    # placed high), writes the new inputs_sha256 and document number, and keeps the
    # embedded results of the original: the hash agrees, the recomputation does not.
    import hashlib
    import json

    from pypdf import PdfReader, PdfWriter
    from pypdf.generic import NameObject, TextStringObject

    writer = PdfWriter(clone_from=PdfReader(demo["unsigned"]))
    names = writer._root_object["/Names"]["/EmbeddedFiles"]["/Names"]
    streams = {str(names[i]): names[i + 1].get_object()["/EF"]["/F"].get_object()
               for i in range(0, len(names), 2)}
    results = json.loads(streams["results.json"].get_data())
    condition_name = results["inputs"]["condition_file"]
    vessel = streams[results["inputs"]["vessel_file"]].get_data()
    condition = streams[condition_name].get_data().replace(
        b"mass: 15.0, lcg: 12.0, vcg: 4.0", b"mass: 15.0, lcg: 12.0, vcg: 9.0")
    assert condition != streams[condition_name].get_data()
    streams[condition_name].set_data(condition)
    results["inputs_sha256"] = hashlib.sha256(condition + vessel).hexdigest()
    streams["results.json"].set_data(json.dumps(results, indent=2).encode())
    title = str(writer._info["/Title"])
    writer._info[NameObject("/Title")] = TextStringObject(
        title[: -12] + results["inputs_sha256"][:12])
    out = io.BytesIO()
    writer.write(out)
    signed = raw_sign(out.getvalue(), "prepared", signer["key"], signer["cert"], certify=True)
    report = verify_document(_write(tmp_path, "rehashed.pdf", signed), signer["trust"])
    assert report["inputs"]["ok"], report["inputs"]  # the forger got the hash right
    assert not report["ok"] and not report["recomputation"]["ok"]
    # the item's VCG rises 5 m: KG, GM and the GZ curve differ (wall-sided reasoning: a
    # higher KG shortens every lever; common practice)
    assert {"hydrostatics.kg_fluid", "hydrostatics.gm_fluid", "gz.gz[1]"} <= set(
        report["recomputation"]["differences"])


# --- point 4 with --accept-other-version: pages are not compared, but what no reportgen ever
# writes (actions, JavaScript, further files, annotations other than links and signature
# fields) is still refused -------------------------------------------------------------------


def _other_version(unsigned: Path, change=None) -> bytes:
    from pypdf import PdfReader, PdfWriter

    def older(data):
        data["software"]["version"] = "0.0.1"

    writer = PdfWriter(clone_from=PdfReader(io.BytesIO(_with_results(unsigned, older))))
    if change is not None:
        change(writer)
    out = io.BytesIO()
    writer.write(out)
    return out.getvalue()


@pytest.mark.parametrize("change", [None, _javascript, _extra_file, _print_only_box],
                         ids=["none", "javascript", "extra_file", "print_only"])
def test_other_version_accepted_still_refuses_what_reportgen_never_writes(demo, signer,
                                                                          tmp_path, change):
    signed = raw_sign(_other_version(demo["failing"], change), "prepared", signer["key"],
                      signer["cert"], certify=True)
    sheet = _write(tmp_path, "older.pdf", signed)
    report = verify_document(sheet, signer["trust"], accept_other_version=True)
    assert report["pages"]["note"] == "rendered by version 0.0.1; pages not compared"
    if change is None:  # a larger first revision than ours is no fault of another version
        assert report["ok"], report["problems"]
    else:
        assert not report["ok"]
        assert "no reportgen version writes" in report["pages"]["problems"][0]


# --- point 2: a certificate with a critical extension nobody here understands ----------------


def test_directly_trusted_certificate_with_an_unknown_critical_extension_fails(demo, tmp_path):
    # RFC 5280 4.2: "A certificate-using system MUST reject the certificate if it encounters
    # a critical extension it does not recognize". A directly trusted certificate is not
    # path-validated, so the rule is applied to it here.
    from cryptography import x509
    from cryptography.hazmat.primitives import hashes
    from cryptography.x509.oid import NameOID, ObjectIdentifier
    from signing_helpers import DAY, NOW

    key = new_key()
    name = x509.Name([x509.NameAttribute(NameOID.COMMON_NAME, "G. Other (invented)")])
    cert = (x509.CertificateBuilder().subject_name(name).issuer_name(name)
            .public_key(key.public_key()).serial_number(x509.random_serial_number())
            .not_valid_before(NOW - DAY).not_valid_after(NOW + DAY)
            .add_extension(x509.UnrecognizedExtension(ObjectIdentifier("1.3.6.1.4.1.99999.1"),
                                                      b"\x05\x00"), critical=True)
            .sign(key, hashes.SHA256()))
    signed = raw_sign(demo["failing"].read_bytes(), "prepared", key, cert, certify=True)
    report = verify_document(_write(tmp_path, "crit.pdf", signed), [cert_file(tmp_path, cert)])
    assert not report["ok"]
    assert "critical extension" in "\n".join(report["problems"])


# --- point 1: the first signature certifies with form filling; no other signature certifies --


def _sign_mdp(monkeypatch, data, field, key, cert, certify, permission):
    """pyHanko signing with a chosen DocMDP use, its own refusal to sign a document whose
    certification forbids changes switched off (a forger's tool would not have it)."""
    from pyhanko.sign import fields, signers
    from signing_helpers import KeepMetadataWriter

    from reportgen.signing.identity import to_asn1

    monkeypatch.setattr(signers.PdfSigner, "_enforce_certification_constraints",
                        lambda self, reader: None)
    from asn1crypto import keys as asn1_keys
    from cryptography.hazmat.primitives import serialization

    signer = signers.SimpleSigner(
        signing_cert=to_asn1(cert), cert_registry=None,
        signing_key=asn1_keys.PrivateKeyInfo.load(key.private_bytes(
            serialization.Encoding.DER, serialization.PrivateFormat.PKCS8,
            serialization.NoEncryption())))
    meta = signers.PdfSignatureMetadata(field_name=field, md_algorithm="sha256",
                                        subfilter=fields.SigSeedSubFilter.PADES,
                                        certify=certify,
                                        docmdp_permissions=fields.MDPPerm(permission))
    writer = KeepMetadataWriter(io.BytesIO(data), strict=False)
    return signers.PdfSigner(meta, signer=signer).sign_pdf(
        writer, existing_fields_only=True, output=io.BytesIO()).getvalue()


@pytest.mark.parametrize("first, second, words", [
    # ISO 32000-2 12.8.2.2.2: P=1, "no changes to the document shall be permitted; any
    # change to the document shall invalidate the signature": a reader's viewer calls the
    # certification broken once checked signs
    ((True, 1), (False, 2), "DocMDP permission 2"),
    ((False, 2), (False, 2), "DocMDP permission 2"),  # the first signature does not certify
    # 12.8.2.2.1: one signature field with a DocMDP transform, the first signed
    ((True, 2), (True, 2), "certifies the document again"),
], ids=["no_changes_then_signed", "first_not_certifying", "two_certifications"])
def test_certification_as_reportgen_makes_it(demo, monkeypatch, tmp_path, first, second,
                                              words):
    keys = new_key(), new_key()
    certs = make_cert("H. One (invented)", keys[0]), make_cert("H. Two (invented)", keys[1])
    data = _sign_mdp(monkeypatch, demo["failing"].read_bytes(), "prepared", keys[0],
                     certs[0], *first)
    data = _sign_mdp(monkeypatch, data, "checked", keys[1], certs[1], *second)
    monkeypatch.undo()
    trust = [cert_file(tmp_path, certs[0], "1.pem"), cert_file(tmp_path, certs[1], "2.pem")]
    report = verify_document(_write(tmp_path, "mdp.pdf", data), trust)
    assert not report["ok"] and words in "\n".join(report["problems"])


def test_a_hostile_file_name_is_printed_escaped(tmp_path):
    # SPEC point 7: names and texts are printed with control characters escaped; a file in
    # a folder handed over by someone else names itself.
    from click.testing import CliRunner

    from reportgen.cli import main

    folder = tmp_path / "from-the-ship"
    folder.mkdir()
    (folder / "\x1b[2J\x1b]0;owned\x07sheet.pdf").write_bytes(b"%PDF-1.7\nnothing\n")
    done = CliRunner().invoke(main, ["verify", str(folder)])
    assert done.exit_code == 2
    assert "\x1b" not in done.stderr and "\\x1b[2J" in done.stderr


def test_sign_and_extract_print_hostile_names_escaped(tmp_path):
    from click.testing import CliRunner

    from reportgen.cli import main

    hostile = tmp_path / "\x1b]0;owned\x07\rsheet.pdf"  # a title escape, a return
    hostile.write_bytes(b"%PDF-1.7\nnothing\n")
    for command in (["sign", str(hostile), "--role", "prepared", "--key", "k", "--cert", "c",
                     "-o", str(tmp_path / "o.pdf")],
                    ["extract", str(hostile), "-o", str(tmp_path / "x")]):
        done = CliRunner().invoke(main, command)
        assert done.exit_code == 2 and not {"\x1b", "\x07", "\r"} & set(done.stderr)


def test_a_vessel_approval_dated_in_the_future_fails(tmp_path, monkeypatch):
    # SPEC point 6 (--vessel-trust), with point 3's reading of signing times: an approval
    # cannot have been made after the moment it is verified (our bound: 5 minutes).
    import shutil

    from conftest import ROOT
    from signing_helpers import DAY

    from reportgen.signing import identity as ids
    from reportgen.signing.approve import approve_vessel
    from reportgen.signing.recompute import Inputs
    from reportgen.signing.trust import load_trust

    vessel = tmp_path / "ship.yaml"
    shutil.copy(ROOT / "conditions" / "vessels" / "linnet-demo.yaml", vessel)
    ids.keygen("Invented Design Office (invented)", tmp_path / "office")
    now = ids.utc_now()
    monkeypatch.setattr(ids, "utc_now", lambda: now + 3 * DAY)
    approve_vessel(vessel, key_path=tmp_path / "office" / "key.pem",
                   cert_path=tmp_path / "office" / "cert.pem")
    monkeypatch.undo()
    inputs = Inputs("c.yaml", b"", "ship.yaml", vessel.read_bytes(),
                    (tmp_path / "ship.yaml.p7s").read_bytes())
    section, problems = verify._vessel_checks(
        inputs, None, load_trust([tmp_path / "office" / "cert.pem"]), now)
    assert section["approval"]["present"]
    assert any("in the future" in p for p in problems), problems


def test_a_certificate_not_yet_valid_at_the_stated_signing_time_fails(demo, monkeypatch,
                                                                       tmp_path):
    # SPEC point 2: valid at its signing time (RFC 5280 4.1.2.5). Valid now, but the signer
    # states a time two days back, before the certificate's notBefore (yesterday).
    from signing_helpers import DAY

    key = new_key()
    cert = make_cert("J. Other (invented)", key)  # valid from a day ago
    _signing_clock(monkeypatch, -2 * DAY)
    signed = raw_sign(demo["failing"].read_bytes(), "prepared", key, cert, certify=True)
    monkeypatch.undo()
    report = verify_document(_write(tmp_path, "early.pdf", signed), [cert_file(tmp_path, cert)])
    assert not report["ok"] and "not yet valid at the signing time" in "\n".join(
        report["problems"])
