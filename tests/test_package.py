"""Calculation packages (SPEC.md "Package"): several conditions of one vessel in one signed,
verifiable PDF/A-3 document.

Checked against things outside the package code: the embedded results against `reportgen
check --json` of each condition (the command the SPEC names as the reference); the embedded
files and the document's number against the input files hashed here with hashlib (FIPS 180-4
SHA-256); the PDF read back with pypdf (attachments, outline, text) and pyHanko (signatures);
pages drawn by PDFium (pypdfium2) and, where installed, the file checked by qpdf --check.
Sources: ISO 32000-2:2020 12.3.3 (document outline: the bookmarks), 7.11.4 (embedded files),
7.5.6 (incremental updates); ISO 19005-3:2012 6.8 (PDF/A-3 associated files).
"""

from __future__ import annotations

import hashlib
import io
import json
import shutil
import subprocess
from pathlib import Path

import pytest
from click.testing import CliRunner
from conftest import CHECKER, PREPARER, ROOT
from signing_helpers import pypdf_update

from reportgen.cli import main
from reportgen.signing import sign_document, verify_document

CONDITIONS = [ROOT / "conditions" / "ballast-departure.yaml",
              ROOT / "conditions" / "grain-departure.yaml"]  # a grain section too
VESSEL = ROOT / "conditions" / "vessels" / "linnet-demo.yaml"


def _run(*args: str):
    return CliRunner().invoke(main, [str(a) for a in args], catch_exceptions=False)


@pytest.fixture(scope="module")
def package(tmp_path_factory, demo_ids) -> dict:
    """The package of two demo conditions, made by the command, then signed twice."""
    base = tmp_path_factory.mktemp("package")
    unsigned, one, two = base / "package.pdf", base / "one.pdf", base / "two.pdf"
    result = _run("package", *CONDITIONS, "-o", unsigned, "--title", "Voyage 7 (invented)")
    assert result.exit_code == 0, result.output
    sign_document(unsigned, one, "prepared", key_path=demo_ids["prepared"] / "key.pem",
                  cert_path=demo_ids["prepared"] / "cert.pem")
    sign_document(one, two, "checked", p12_path=demo_ids["checked"] / "identity.p12",
                  passphrase=b"correct horse")
    return {"unsigned": unsigned, "two": two, "base": base}


def _reader(path: Path):
    from pypdf import PdfReader

    return PdfReader(io.BytesIO(path.read_bytes()))


def _attachments(path: Path) -> dict[str, bytes]:
    return {name: data[0] for name, data in _reader(path).attachments.items()}


def test_embedded_files_are_the_inputs_byte_for_byte(package):
    files = _attachments(package["unsigned"])
    assert set(files) == {c.name for c in CONDITIONS} | {VESSEL.name, "package.json"}
    for path in [*CONDITIONS, VESSEL]:
        assert files[path.name] == path.read_bytes(), path.name
    doc = json.loads(files["package.json"])
    assert doc["format"] == "reportgen/package-1"
    assert doc["title"] == "Voyage 7 (invented)"
    assert [c["file"] for c in doc["conditions"]] == [c.name for c in CONDITIONS]
    # SPEC: the SHA-256 of the condition files in the given order, then the vessel file
    expected = hashlib.sha256(b"".join(p.read_bytes() for p in [*CONDITIONS, VESSEL]))
    assert doc["inputs_sha256"] == expected.hexdigest()
    assert doc["vessel"]["sha256"] == hashlib.sha256(VESSEL.read_bytes()).hexdigest()
    assert _reader(package["unsigned"]).metadata.title.endswith(expected.hexdigest()[:12])
    # the document validates against its JSON Schema (draft 2020-12, the jsonschema library)
    import jsonschema

    from reportgen.schema import json_schema

    jsonschema.validate(doc, json_schema("package"))


def test_each_embedded_result_equals_check_json_of_its_condition(package):
    doc = json.loads(_attachments(package["unsigned"])["package.json"])
    for entry, path in zip(doc["conditions"], CONDITIONS, strict=True):
        result = _run("check", path, "--json")
        assert result.exit_code in (0, 1), result.output
        assert entry["results"] == json.loads(result.output), path.name


def test_summary_prints_the_results_numbers(package):
    reader = _reader(package["unsigned"])
    doc = json.loads(_attachments(package["unsigned"])["package.json"])
    summary = next(p.extract_text() for p in reader.pages
                   if "Summary of the conditions" in p.extract_text()
                   and "Smallest margin" in p.extract_text())
    for entry in doc["conditions"]:
        r = entry["results"]
        h = r["hydrostatics"]
        # decimals as the sheet prints them: mass 0.1 t, draughts and KG 1 mm
        for text in (f"{r['loading']['displacement']:.1f}", f"{h['draft_aft']:.3f}",
                     f"{h['draft_mean']:.3f}", f"{h['draft_fore']:.3f}",
                     f"{h['gm_fluid']:.3f}", f"{h['kg_fluid']:.3f}"):
            assert text in summary, (r["condition"]["title"], text)


def test_bookmarks_lead_to_the_cover_summary_each_condition_and_appendix(package):
    reader = _reader(package["unsigned"])
    top = [(item.title, reader.get_destination_page_number(item))
           for item in reader.outline if not isinstance(item, list)]
    titles = [t for t, _ in top]
    doc = json.loads(_attachments(package["unsigned"])["package.json"])
    names = [c["results"]["condition"]["title"] for c in doc["conditions"]]
    assert titles[:2] == ["Cover and contents", "Summary of the conditions"]
    assert titles[2:4] == [f"{i}. {n}" for i, n in enumerate(names, 1)]
    assert titles[4].startswith("Appendix")
    pages = [p for _, p in top]
    assert pages == sorted(pages) and pages[0] == 0
    for (_title, page), name in zip(top[2:4], names, strict=True):
        text = reader.pages[page].extract_text()
        assert name in text and "sheet page 1 of" in text


def test_signed_package_verifies_and_pages_are_rendered_again_byte_for_byte(package,
                                                                              trust_both):
    report = verify_document(package["two"], trust_both)
    assert report["ok"], report["problems"]
    assert report["kind"] == "package"
    assert report["pages"]["method"] == "bytes"  # a second rendering, byte-identical
    assert report["recomputation"]["ok"]
    assert report["inputs"]["condition_files"] == [c.name for c in CONDITIONS]
    assert [s["signer"] for s in report["signatures"]] == [PREPARER, CHECKER]


def _replace_attachment(name: str, contents: bytes):
    def change(writer) -> None:
        names = writer._root_object["/Names"]["/EmbeddedFiles"]["/Names"]
        for i in range(0, len(names), 2):
            if names[i] == name:
                spec = names[i + 1].get_object()
                spec["/EF"]["/F"].get_object().set_data(contents)
                return
        raise AssertionError(f"no attachment {name}")
    return change


def test_condition_replaced_after_signing_fails_verification(package, trust_both, tmp_path):
    original = CONDITIONS[1].read_bytes()
    edited = original.replace(b"title:", b"title: ", 1)  # the same YAML, other bytes
    assert edited != original
    data = pypdf_update(package["two"].read_bytes(),
                        _replace_attachment(CONDITIONS[1].name, edited))
    tampered = tmp_path / "tampered.pdf"
    tampered.write_bytes(data)
    assert _attachments(tampered)[CONDITIONS[1].name] == edited
    report = verify_document(tampered, trust_both)
    assert not report["ok"]
    problems = " ".join(report["problems"])
    assert "embedded inputs" in problems and "changes after signing" in problems


def test_conditions_on_different_vessel_data_are_refused(tmp_path):
    (tmp_path / "vessels").mkdir()
    other = tmp_path / "vessels" / VESSEL.name
    other.write_bytes(VESSEL.read_bytes() + b"\n# a copy that differs by a comment\n")
    moved = tmp_path / "moved.yaml"
    moved.write_bytes(CONDITIONS[1].read_bytes())  # names vessels/linnet-demo.yaml
    out = tmp_path / "mixed.pdf"
    result = _run("package", CONDITIONS[0], moved, "-o", out)
    assert result.exit_code == 2
    assert "same vessel data" in result.output
    assert not out.exists() and sorted(p.name for p in tmp_path.iterdir()) == \
        ["moved.yaml", "vessels"]


@pytest.mark.parametrize("args, words", [
    (["--title", "bad\x1b[31m title"], "--title"),
    (["--title", "   "], "--title"),
])
def test_bad_title_is_refused_with_nothing_written(tmp_path, args, words):
    out = tmp_path / "p.pdf"
    result = _run("package", CONDITIONS[0], "-o", out, *args)
    assert result.exit_code == 2 and words in result.output
    assert not out.exists()


def test_the_same_condition_twice_and_an_existing_output_are_refused(tmp_path):
    out = tmp_path / "p.pdf"
    result = _run("package", CONDITIONS[0], CONDITIONS[0], "-o", out)
    assert result.exit_code == 2 and "give each condition once" in result.output
    out.write_bytes(b"keep me")
    result = _run("package", CONDITIONS[0], "-o", out)
    assert result.exit_code == 2 and out.read_bytes() == b"keep me"


def test_unique_names_keep_the_extension():
    from reportgen.report.package import unique_names

    taken = {"package.json", "ship.yaml"}
    assert unique_names(["a.yaml", "a.yaml", "ship.yaml", "a-2.yaml"], taken) == \
        ["a.yaml", "a-2.yaml", "ship-2.yaml", "a-2-2.yaml"]


def test_every_page_draws_and_qpdf_finds_no_fault(package):
    import pypdfium2 as pdfium

    pdf = pdfium.PdfDocument(package["two"])
    try:
        assert len(pdf) == len(_reader(package["two"]).pages) > 4
        for index in range(len(pdf)):
            image = pdf[index].render(scale=0.3).to_numpy()
            assert image.size and image.min() < 128, index  # something dark is drawn
    finally:
        pdf.close()
    if shutil.which("qpdf"):
        done = subprocess.run(["qpdf", "--check", str(package["two"])],
                              capture_output=True, text=True, check=False)
        assert done.returncode in (0, 3), done.stdout + done.stderr  # 3: warnings only
