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
import math
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
    return {"unsigned": unsigned, "one": one, "two": two, "base": base}


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
        # KG max and its margin rounded down, to the passing side (SPEC "Limits": every
        # criterion passes at kg_max; the house rules' conservative reading); trim signed
        lim = r["limits"]
        for text in (f"{_down(lim['kg_max']):.3f}", f"{_down(lim['kg_margin']):+.3f}",
                     f"{h['trim']:+.3f}"):
            assert text.replace("-", "−") in summary, (r["condition"]["title"], text)


def test_bookmarks_lead_to_the_cover_summary_each_condition_and_appendix(package):
    reader = _reader(package["unsigned"])
    top = [(item.title, reader.get_destination_page_number(item))
           for item in reader.outline if not isinstance(item, list)]
    titles = [t for t, _ in top]
    doc = json.loads(_attachments(package["unsigned"])["package.json"])
    names = [c["results"]["condition"]["title"] for c in doc["conditions"]]
    # SPEC "Package": cover, summary, the limiting KG curve, then each condition's sheet
    assert titles[:3] == ["Cover and contents", "Summary of the conditions",
                          "Limiting KG curve and the conditions"]
    assert titles[3:5] == [f"{i}. {n}" for i, n in enumerate(names, 1)]
    assert titles[5].startswith("Appendix")
    pages = [p for _, p in top]
    assert pages == sorted(pages) and pages[0] == 0
    # the cover's contents give the page each bookmark leads to (ISO 32000-2 12.3.3: an
    # outline item's destination), and each condition's footer counts its own pages, from the
    # first page of its bookmark to the page before the next bookmark
    contents = reader.pages[0].extract_text()
    assert f"Summary of the conditions {pages[1] + 1}" in contents
    assert f"Limiting KG curve of the vessel, with the conditions {pages[2] + 1}" in contents
    for i, (name, first, after) in enumerate(zip(names, pages[3:5], pages[4:6], strict=True), 1):
        count = after - first
        line = next(x for x in contents.splitlines() if x.startswith(f"{i} {name}"))
        assert line.endswith(f" {first + 1}"), line
        assert f"condition {i} of 2, sheet page 1 of {count}" in \
            reader.pages[first].extract_text(), name
        assert f"condition {i} of 2, sheet page {count} of {count}" in \
            reader.pages[after - 1].extract_text(), name


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


def test_package_json_limits_are_the_vessels_curve_as_limits_json_gives_it(package):
    """SPEC "Package": package.json carries "limits", the vessel's limiting KG curve in the
    format reportgen/limits-1; SPEC "Limits": the curve at trim 0 (the default) for the
    vessel's criteria, as `reportgen limits VESSEL --json` prints it."""
    doc = json.loads(_attachments(package["unsigned"])["package.json"])
    result = _run("limits", VESSEL, "--json")
    assert result.exit_code == 0, result.output
    expected = json.loads(result.output)
    assert doc["limits"]["format"] == "reportgen/limits-1" and doc["limits"]["trim"] == 0.0
    assert doc["limits"] == expected
    assert doc["limits"]["vessel"]["sha256"] == hashlib.sha256(VESSEL.read_bytes()).hexdigest()


def _curve_page(path: Path) -> str:
    reader = _reader(path)
    item = next(i for i in reader.outline
                if not isinstance(i, list) and i.title == "Limiting KG curve and the conditions")
    return reader.pages[reader.get_destination_page_number(item)].extract_text()


def _signed(value: float) -> str:
    """As the sheet prints a signed length: 3 decimals, + or the minus sign U+2212."""
    text = f"{value:+.3f}"
    return "0.000" if float(text) == 0.0 else text.replace("-", "\u2212")


def _down(value: float) -> float:
    """A KG max as documents print it: rounded down to 1 mm, to the passing side."""
    return math.floor(value * 1000 + 1e-6) / 1000


def test_curve_page_draws_every_condition_and_says_what_the_curve_rests_on(package):
    """SPEC "Package": the limiting KG curve with every condition drawn as a labelled point;
    SPEC "Limits": the curve is upright at trim 0 in water of the table's density. The curve's
    KG max at each condition's displacement is checked against numpy.interp (linear in
    displacement, as the booklet criterion reads a curve) on the embedded curve, printed
    rounded down as every KG max is."""
    import numpy as np

    text = " ".join(_curve_page(package["unsigned"]).split())
    doc = json.loads(_attachments(package["unsigned"])["package.json"])
    rows = [r for r in doc["limits"]["rows"] if r["kg_max"] is not None]
    assert "trim 0.000 m" in text and "1.0250 t/m³" in text
    assert "is2008.general" in text and "is2008.weather" in text
    assert "only as a guide" in text and "(governs)" in text  # the trim-0 curve is a guide
    assert "Condition of this package, by its number" in text  # the points' legend
    for i, entry in enumerate(doc["conditions"], 1):
        r = entry["results"]
        curve = np.interp(r["loading"]["displacement"], [x["displacement"] for x in rows],
                          [x["kg_max"] for x in rows])
        row = (f"{i} {r['condition']['title']} {r['loading']['displacement']:.1f} "
               f"{_signed(r['hydrostatics']['trim'])} {r['condition']['water_density']:.4f} "
               f"{r['hydrostatics']['kg_fluid']:.3f} {_down(curve):.3f} "
               f"{_down(r['limits']['kg_max']):.3f}")
        assert row in text, row


def test_package_whose_embedded_limits_were_altered_is_not_verified(package, trust_both,
                                                                    tmp_path):
    """SPEC "Package": verify re-runs every condition and the limits; SPEC "Verification" 5:
    the calculation re-run from the embedded inputs equals the embedded data."""
    files = _attachments(package["two"])
    doc = json.loads(files["package.json"])
    doc["limits"]["rows"][3]["kg_max"] += 0.25  # a curve more generous than the vessel's
    altered = (json.dumps(doc, indent=2, ensure_ascii=False) + "\n").encode("utf-8")
    data = pypdf_update(package["two"].read_bytes(), _replace_attachment("package.json",
                                                                         altered))
    tampered = tmp_path / "limits-altered.pdf"
    tampered.write_bytes(data)
    report = verify_document(tampered, trust_both)
    assert not report["ok"]
    assert not report["recomputation"]["ok"]
    assert any(d.startswith("limits") for d in report["recomputation"]["differences"]), \
        report["recomputation"]


def test_signing_a_second_role_with_the_same_certificate_is_refused_clearly(package, demo_ids,
                                                                            tmp_path):
    """SPEC "Verification" 3: the same certificate signing two roles is a failure; sign
    refuses it before writing, with exit status 2 and a message that says so."""
    out = tmp_path / "twice.pdf"
    result = _run("sign", package["two"], "--role", "reviewed",  # no name given for reviewed
                  "--key", demo_ids["prepared"] / "key.pem",
                  "--cert", demo_ids["prepared"] / "cert.pem", "-o", out)
    assert result.exit_code == 2
    assert "already signed the prepared role of this calculation package" in result.output
    assert "may not sign two roles" in result.output and "Traceback" not in result.output
    assert not out.exists()


@pytest.mark.parametrize("count, failed, words", [
    (1, 0, "1 condition written; the condition meets every criterion"),
    (1, 1, "1 condition written; the condition FAILS at least one criterion"),
    (7, 1, "7 conditions written; 1 of 7 conditions FAILS at least one criterion"),
    (7, 2, "7 conditions written; 2 of 7 conditions FAIL at least one criterion"),
])
def test_the_status_line_counts_in_agreement(count, failed, words):
    """English grammar (common practice): one condition, several conditions."""
    from reportgen.cli.package import counted_words

    assert counted_words(count, failed) == words


def test_a_vessel_without_tables_gives_no_curve_and_says_why():
    """SPEC "Limits": the curve is found on the hydrostatic table and cross curves; a vessel
    file with hull offsets only has none, and the package says so instead of drawing one."""
    from reportgen.inputs.case import parse_vessel
    from reportgen.report.package import vessel_limits

    hull = ROOT / "conditions" / "vessels" / "linnet-demo-hull.yaml"
    raw = hull.read_bytes()
    curve, problem = vessel_limits(parse_vessel(raw, hull.name), raw, hull.name)
    assert curve is None and "reportgen tables" in problem


def test_a_passenger_ships_package_carries_its_curve():
    """SPEC "Package": the limiting KG curve of the vessel for its criteria; the ferry's
    criteria hold is2008.passenger (IS Code 2008 Part A 3.1), whose curve raised an
    AttributeError, so `reportgen package` of the ferry's conditions ended in a traceback.
    (Evaluated only, not rendered.)"""
    from reportgen.inputs import load_case
    from reportgen.report.package import make_package

    pkg = make_package([load_case(ROOT / "conditions" / "ferry-departure.yaml")])
    assert pkg.limits_problem is None
    assert "is2008.passenger" in pkg.limits["criteria"]
    ids = {c["id"] for c in pkg.limits["criteria_list"]}
    assert {"passenger_crowding_heel", "passenger_turning_heel"} <= ids
    assert all(r["kg_max"] is not None for r in pkg.limits["rows"])


def test_attachment_names_are_unique_when_the_vessel_file_is_named_package_json(tmp_path):
    """SPEC "Package": names made unique; the data document is package.json (ISO 32000-2
    7.11.4: an embedded file is found by its name). A vessel file named package.json was
    embedded under that name beside the package's own package.json."""
    from reportgen.docinfo import PACKAGE_NAME
    from reportgen.inputs import load_case
    from reportgen.report.package import _attachments, make_package, package_json

    (tmp_path / PACKAGE_NAME).write_bytes(VESSEL.read_bytes())
    cond = tmp_path / "c.yaml"
    cond.write_text(CONDITIONS[0].read_text(encoding="utf-8").replace(
        "vessel: vessels/linnet-demo.yaml", f"vessel: {PACKAGE_NAME}"), encoding="utf-8")
    pkg = make_package([load_case(cond)])
    names = [a.name for a in _attachments(pkg, package_json(pkg))]
    assert len(names) == len(set(names)), names
    doc = json.loads(package_json(pkg))
    assert doc["vessel"]["file"] in names and doc["vessel"]["file"] != PACKAGE_NAME
