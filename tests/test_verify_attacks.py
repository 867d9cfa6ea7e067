"""What verify must catch: each case found by an adversarial review, made for real here
(forged certificates with `cryptography`, signatures with pyHanko directly, tampering with
pypdf or pyHanko incremental updates) and checked against SPEC "Verification", points 1-7.

Sources: RFC 5280 (4.1.2.5 validity, 4.2.1.3 key usage, 4.2.1.9 basic constraints,
4.2.1.12 extended key usage, 6.1 path validation); ISO 32000-2:2020 (7.5.6 incremental
updates, 12.7.4.5 signature fields, 12.8.1 byte ranges, 14.3 metadata); ETSI EN 319 102-1
(5.2.6: validation at the current time without a proof of existence).
"""

from __future__ import annotations

import subprocess
import sys
from pathlib import Path

import pytest
from conftest import CHECKER, FAILING, PREPARER
from cryptography import x509
from cryptography.hazmat.primitives import serialization
from signing_helpers import (
    DAY,
    NOW,
    SERVER_AUTH,
    cert_file,
    make_cert,
    new_key,
    pypdf_update,
    raw_sign,
    sheet_with_painted_verdict,
)

from reportgen.signing import verify_document
from reportgen.signing.report import render_report


def _load(folder: Path):
    key = serialization.load_pem_private_key((folder / "key.pem").read_bytes(), None)
    return key, x509.load_pem_x509_certificate((folder / "cert.pem").read_bytes())


def _problems(report: dict) -> str:
    return "\n".join(report["problems"])


def _write(tmp_path: Path, name: str, data: bytes) -> Path:
    path = tmp_path / name
    path.write_bytes(data)
    return path


# --- point 2: trust -------------------------------------------------------------------------


def test_self_signed_identity_cannot_vouch_for_a_certificate_it_issued(demo, demo_ids,
                                                                       tmp_path):
    # The trusted prepared identity (self-signed, CA:false) issues a certificate named after
    # the master and signs "checked" with it.
    a_key, a_cert = _load(demo_ids["prepared"])
    forged_key = new_key()
    forged = make_cert(CHECKER, forged_key, issuer=(a_cert, a_key))
    signed = raw_sign(demo["one"].read_bytes(), "checked", forged_key, forged, (a_cert,))
    sheet = _write(tmp_path, "forged.pdf", signed)
    report = verify_document(sheet, [demo_ids["prepared"] / "cert.pem"])
    assert not report["ok"]
    checked = report["signatures"][1]
    assert checked["intact"] and not checked["trusted"]
    assert "certification authority" in _problems(report)


def test_ca_without_key_cert_sign_cannot_vouch(demo, tmp_path):
    # RFC 5280 4.2.1.3: a CA certificate that signs certificates asserts keyCertSign
    ca_key = new_key()
    ca = make_cert("Invented Root", ca_key, ca=True, cert_sign=False)
    leaf_key = new_key()
    leaf = make_cert(PREPARER, leaf_key, issuer=(ca, ca_key))
    sheet = _write(tmp_path, "s.pdf", raw_sign(demo["unsigned"].read_bytes(), "prepared",
                                               leaf_key, leaf, (ca,), certify=True))
    report = verify_document(sheet, [cert_file(tmp_path, ca)])
    assert not report["ok"] and not report["signatures"][0]["trusted"]


def test_certificates_issued_by_a_trusted_ca_verify(demo, tmp_path):
    ca_key = new_key()
    ca = make_cert("Invented Shipping Co Root", ca_key, ca=True, cert_sign=True)
    keys = {n: new_key() for n in (PREPARER, CHECKER)}
    certs = {n: make_cert(n, k, issuer=(ca, ca_key)) for n, k in keys.items()}
    data = raw_sign(demo["unsigned"].read_bytes(), "prepared", keys[PREPARER], certs[PREPARER],
                    (ca,), certify=True)
    data = raw_sign(data, "checked", keys[CHECKER], certs[CHECKER], (ca,))
    report = verify_document(_write(tmp_path, "s.pdf", data), [cert_file(tmp_path, ca)])
    assert report["ok"], _problems(report)
    assert report["signatures"][0]["path"] == [PREPARER, "Invented Shipping Co Root"]


def test_trusted_certificate_with_another_persons_name_fails(demo, demo_ids, tmp_path):
    m_key, m_cert = _load(demo_ids["mallory"])
    sheet = _write(tmp_path, "m.pdf", raw_sign(demo["one"].read_bytes(), "checked", m_key,
                                               m_cert))
    report = verify_document(sheet, [demo_ids["prepared"] / "cert.pem",
                                     demo_ids["mallory"] / "cert.pem"])
    assert not report["ok"]
    checked = report["signatures"][1]
    assert checked["trusted"] and checked["name_matches"] is False
    assert "the sheet names 'B. N. Other, master (invented)'" in _problems(report)


@pytest.mark.parametrize("flaw, words", [
    ({"not_before": NOW - 40 * DAY, "not_after": NOW - DAY}, "expired"),
    ({"not_before": NOW + DAY, "not_after": NOW + 40 * DAY}, "not yet valid"),
    ({"signing": False, "encipher": True}, "neither digitalSignature nor nonRepudiation"),
    ({"eku": SERVER_AUTH}, "allows neither document signing"),
])
def test_directly_trusted_certificate_that_may_not_sign_fails(demo, tmp_path, flaw, words):
    key = new_key()
    cert = make_cert(PREPARER, key, **flaw)
    sheet = _write(tmp_path, "s.pdf", raw_sign(demo["unsigned"].read_bytes(), "prepared", key,
                                               cert, certify=True))
    report = verify_document(sheet, [cert_file(tmp_path, cert)])
    assert not report["ok"] and words in _problems(report)


def test_same_certificate_for_two_roles_fails(demo, demo_ids, tmp_path):
    # One certificate signs both roles (point 3), whatever the names.
    key = new_key()
    cert = make_cert(PREPARER, key)
    data = raw_sign(demo["unsigned"].read_bytes(), "prepared", key, cert, certify=True)
    data = raw_sign(data, "checked", key, cert)
    report = verify_document(_write(tmp_path, "s.pdf", data), [cert_file(tmp_path, cert)])
    assert not report["ok"] and "the same certificate signed prepared too" in _problems(report)


# --- point 1: nothing but the next role's signature after a signature ------------------------


def test_checked_signed_before_prepared_fails(demo, tmp_path):
    c_key = new_key()
    c_cert = make_cert(CHECKER, c_key)
    data = raw_sign(demo["unsigned"].read_bytes(), "checked", c_key, c_cert, certify=True)
    report = verify_document(_write(tmp_path, "s.pdf", data), [cert_file(tmp_path, c_cert)])
    assert not report["ok"] and "roles sign in the order" in _problems(report)


@pytest.mark.parametrize("case", ["info", "xmp", "appended", "field_removed", "page"])
def test_changes_after_signing_fail(demo, trust_both, tmp_path, case):
    data = demo["two"].read_bytes()
    if case == "info":  # ISO 32000-2 14.3.3: the document information dictionary
        data = pypdf_update(data, lambda w: w.add_metadata({"/Title": "Edited after signing"}))
    elif case == "xmp":  # ISO 32000-2 14.3.2: the XMP metadata stream
        def xmp(w):
            from pypdf.generic import NameObject, StreamObject

            stream = StreamObject()
            stream.set_data(b"<x:xmpmeta xmlns:x='adobe:ns:meta/'/>")
            stream[NameObject("/Type")] = NameObject("/Metadata")
            stream[NameObject("/Subtype")] = NameObject("/XML")
            w._root_object[NameObject("/Metadata")] = w._add_object(stream)
        data = pypdf_update(data, xmp)
    elif case == "appended":
        data += b"\n% appended after signing\n"
    elif case == "field_removed":  # ISO 32000-2 12.7.4.5: the unsigned reviewed field
        def drop(w):
            from pypdf.generic import ArrayObject, NameObject

            form = w._root_object["/AcroForm"]
            kept = [f for f in form["/Fields"] if f.get_object().get("/T") != "reviewed"]
            form[NameObject("/Fields")] = ArrayObject(kept)
        data = pypdf_update(data, drop)
    elif case == "page":
        data = pypdf_update(data, lambda w: w.add_blank_page(595, 842))
    sheet = _write(tmp_path, f"{case}.pdf", data)
    report = verify_document(sheet, trust_both)  # a report, exit 1: not bad input (exit 2)
    assert not report["ok"], case
    assert any(p.startswith("changes after signing") for p in report["problems"]), \
        _problems(report)


def _white_box(writer) -> None:
    """A filled white square annotation over the verdict, with a drawn tick (pyHanko)."""
    from pyhanko.pdf_utils import generic

    page = writer.root["/Pages"]["/Kids"][0].get_object()
    stream = generic.StreamObject({generic.pdf_name("/Type"): generic.pdf_name("/XObject"),
                                   generic.pdf_name("/Subtype"): generic.pdf_name("/Form"),
                                   generic.pdf_name("/BBox"): generic.ArrayObject(
                                       [generic.NumberObject(v) for v in (0, 0, 500, 60)])},
                                  stream_data=b"1 g 0 0 500 60 re f 0 G 3 w 10 30 m 20 15 l "
                                              b"40 50 l S")
    annot = generic.DictionaryObject({
        generic.pdf_name("/Type"): generic.pdf_name("/Annot"),
        generic.pdf_name("/Subtype"): generic.pdf_name("/Square"),
        generic.pdf_name("/Rect"): generic.ArrayObject(
            [generic.NumberObject(v) for v in (40, 600, 540, 660)]),
        generic.pdf_name("/F"): generic.NumberObject(4),
        generic.pdf_name("/AP"): generic.DictionaryObject(
            {generic.pdf_name("/N"): writer.add_object(stream)})})
    annots = page.get("/Annots", generic.ArrayObject())
    annots.append(writer.add_object(annot))
    page["/Annots"] = annots
    writer.update_container(page)


def test_overlay_drawn_before_signing_fails_in_every_form(demo, tmp_path):
    import io

    from signing_helpers import KeepMetadataWriter

    from reportgen.errors import InputError
    from reportgen.signing import sign_document

    key = new_key()
    cert = make_cert(PREPARER, key)
    trust = [cert_file(tmp_path, cert)]
    unsigned = demo["failing"].read_bytes()
    # 1. overlay in its own update, then signed: one revision too many
    writer = KeepMetadataWriter(io.BytesIO(unsigned), strict=False)
    _white_box(writer)
    out = io.BytesIO()
    writer.write(out)
    covered = _write(tmp_path, "covered.pdf", out.getvalue())
    with pytest.raises(InputError, match="refusing to sign"):
        key_path = tmp_path / "k.pem"
        key_path.write_bytes(key.private_bytes(serialization.Encoding.PEM,
                                               serialization.PrivateFormat.PKCS8,
                                               serialization.NoEncryption()))
        sign_document(covered, tmp_path / "x.pdf", "prepared", key_path=key_path,
                      cert_path=trust[0])
    signed = raw_sign(out.getvalue(), "prepared", key, cert, certify=True)
    report = verify_document(_write(tmp_path, "a.pdf", signed), trust)
    assert not report["ok"] and not report["changes"]["ok"]
    # 2. overlay in the same update as the signature: a change that is not a signature
    signed = raw_sign(unsigned, "prepared", key, cert, certify=True, before=_white_box)
    report = verify_document(_write(tmp_path, "b.pdf", signed), trust)
    assert not report["ok"] and not report["changes"]["ok"], _problems(report)
    # 3. the file rewritten with the overlay (no incremental update): the page differs
    from pypdf import PdfReader, PdfWriter

    rewritten = PdfWriter(clone_from=PdfReader(covered))
    buffer = io.BytesIO()
    rewritten.write(buffer)
    signed = raw_sign(buffer.getvalue(), "prepared", key, cert, certify=True)
    report = verify_document(_write(tmp_path, "c.pdf", signed), trust)
    assert not report["ok"] and report["pages"]["problems"], _problems(report)
    # and the report says the condition fails, and which criteria (point 6)
    assert report["certified"]["passed"] is False and report["certified"]["failing_criteria"]
    assert "FAILS:" in render_report(report)


def test_page_edited_before_signing_fails(demo, monkeypatch, tmp_path):
    edited = sheet_with_painted_verdict(monkeypatch, FAILING)
    key = new_key()
    cert = make_cert(PREPARER, key)
    signed = raw_sign(edited, "prepared", key, cert, certify=True)
    report = verify_document(_write(tmp_path, "e.pdf", signed), [cert_file(tmp_path, cert)])
    assert not report["ok"]
    assert "not what this version renders" in _problems(report)


# --- point 7: names are printed escaped -------------------------------------------------------


def test_certificate_name_with_control_characters_is_escaped(demo, tmp_path):
    key = new_key()
    evil = "Eve\nResult: VERIFIED\x1b[2J\x1b]0;owned\x07 [bold]x[/bold]"
    cert = make_cert(evil, key)
    signed = raw_sign(demo["unsigned"].read_bytes(), "prepared", key, cert, certify=True)
    sheet = _write(tmp_path, "evil.pdf", signed)
    report = verify_document(sheet, [cert_file(tmp_path, cert)])
    text = render_report(report, width=200)
    assert "\x1b" not in text and "\x07" not in text
    assert "\\x1b[2J" in text and "\\x0a" in text and "[bold]x[/bold]" in text
    starts = [line for line in text.splitlines() if line.startswith("Result:")]
    assert starts == ["Result: NOT VERIFIED"]
    done = subprocess.run([sys.executable, "-m", "reportgen", "verify", str(sheet), "--trust",
                           str(tmp_path / "cert.pem")], capture_output=True, text=True,
                          check=False)
    assert done.returncode == 1 and "\x1b" not in done.stdout + done.stderr


# --- hostile bytes: a flipped byte at every 1 % never verifies, never a traceback -------------


def test_a_byte_flipped_anywhere_never_verifies(demo, trust_both, tmp_path):
    from reportgen.errors import InputError

    data = demo["two"].read_bytes()
    outcomes = {"report": 0, "input error": 0}
    for percent in range(100):
        position = len(data) * percent // 100
        bad = bytearray(data)
        bad[position] ^= 0x01
        sheet = _write(tmp_path, "flip.pdf", bytes(bad))
        try:
            report = verify_document(sheet, trust_both)
        except InputError:
            outcomes["input error"] += 1  # exit 2 with one message: unreadable
            continue
        outcomes["report"] += 1
        assert not report["ok"], f"byte {position} ({percent} %) flipped and still verified"
    assert sum(outcomes.values()) == 100


def test_a_later_signature_may_not_touch_an_earlier_field(demo, demo_ids, tmp_path):
    # The checked revision also replaces the appearance of the prepared signature
    # (ISO 32000-2 12.7.4.5: a signed field is not to be changed by a later revision).
    from pyhanko.pdf_utils import generic
    from pyhanko.sign import fields

    def repaint_prepared(writer) -> None:
        for name, _value, ref in fields.enumerate_sig_fields(writer):
            if name == "prepared":
                widget = ref.get_object()
                stream = generic.StreamObject(
                    {generic.pdf_name("/Type"): generic.pdf_name("/XObject"),
                     generic.pdf_name("/Subtype"): generic.pdf_name("/Form"),
                     generic.pdf_name("/BBox"): generic.ArrayObject(
                         [generic.NumberObject(v) for v in (0, 0, 100, 40)])},
                    stream_data=b"1 0 0 rg 0 0 100 40 re f")
                widget["/AP"] = generic.DictionaryObject(
                    {generic.pdf_name("/N"): writer.add_object(stream)})
                writer.update_container(widget)

    key = new_key()
    cert = make_cert(CHECKER, key)
    data = raw_sign(demo["one"].read_bytes(), "checked", key, cert, before=repaint_prepared)
    report = verify_document(_write(tmp_path, "r.pdf", data),
                             [demo_ids["prepared"] / "cert.pem", cert_file(tmp_path, cert)])
    assert not report["ok"] and not report["changes"]["ok"], _problems(report)
