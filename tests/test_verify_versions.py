"""SPEC "Verification", point 4 when the running version or stack is not the one that made
the document: pixel comparison (PDFium through pypdfium2) where only the libraries differ,
"pages not compared" and exit 1 for another reportgen version unless accepted."""

from __future__ import annotations

import io

from conftest import FAILING

from reportgen import __version__
from reportgen.signing import recompute as rc
from reportgen.signing import verify, verify_document


def _other_stack(monkeypatch) -> None:
    from reportgen.report import stack

    real = stack.rendering_stack()
    monkeypatch.setattr(verify, "rendering_stack", lambda: {**real, "weasyprint": "0.0"})


def _rebuild_with_other_bytes(monkeypatch) -> None:
    """Fresh renderings whose bytes differ but whose pages do not: the same PDF written
    again by pypdf (another writer, another byte layout)."""
    from pypdf import PdfReader, PdfWriter

    real = rc.rebuild

    def rebuilt(kind, inputs):
        fresh = real(kind, inputs)
        out = io.BytesIO()
        PdfWriter(clone_from=PdfReader(io.BytesIO(fresh.pdf))).write(out)
        return rc.Rebuilt(fresh.data_text, out.getvalue())

    monkeypatch.setattr(verify, "rebuild", rebuilt)


def test_other_stack_compares_pages_as_images(demo, trust_both, monkeypatch):
    _other_stack(monkeypatch)
    _rebuild_with_other_bytes(monkeypatch)
    report = verify_document(demo["two"], trust_both)
    assert report["ok"], report["problems"]
    assert report["pages"]["method"].startswith("images at 100 dpi")
    assert report["pages"]["stack_differences"] == ["weasyprint"]


def test_other_stack_still_catches_an_edited_page(demo, monkeypatch, tmp_path):
    from signing_helpers import (
        cert_file,
        make_cert,
        new_key,
        raw_sign,
        sheet_with_painted_verdict,
    )

    edited = sheet_with_painted_verdict(monkeypatch, FAILING)
    key = new_key()
    cert = make_cert("Anyone (invented)", key)
    sheet = tmp_path / "e.pdf"
    sheet.write_bytes(raw_sign(edited, "prepared", key, cert, certify=True))
    _other_stack(monkeypatch)
    _rebuild_with_other_bytes(monkeypatch)
    report = verify_document(sheet, [cert_file(tmp_path, cert)])
    assert not report["ok"] and report["pages"]["differing_pages"] == [1]


def test_other_reportgen_version_is_not_compared_unless_accepted(demo, trust_both,
                                                                 monkeypatch):
    monkeypatch.setattr(verify, "__version__", "9.9.9")
    report = verify_document(demo["two"], trust_both)
    assert not report["ok"]
    assert report["pages"]["note"] == f"rendered by version {__version__}; pages not compared"
    report = verify_document(demo["two"], trust_both, accept_other_version=True)
    assert report["ok"], report["problems"]
    assert report["pages"]["method"] is None
