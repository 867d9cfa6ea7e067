"""Vessel data provenance (SPEC v2 `vessel.sha256`, `approve`, verify --vessel and
--vessel-trust), extraction of the embedded inputs, and verify of several files.

Sources: RFC 5652 (5.1 SignedData, 5.2 detached content, 11.3 signing-time attribute),
checked independently with asn1crypto and, where installed, OpenSSL's `cms -verify`;
FIPS 180-4 (SHA-256) through hashlib.
"""

from __future__ import annotations

import hashlib
import json
import re
import shutil
import subprocess
from pathlib import Path

import pytest
import yaml
from conftest import FAILING, ROOT, render

from reportgen.errors import InputError
from reportgen.signing import keygen, sign_document, verify_document
from reportgen.signing.approve import approve_vessel, extract_inputs

VESSEL = ROOT / "conditions" / "vessels" / "linnet-demo.yaml"


@pytest.fixture(scope="module")
def office(tmp_path_factory) -> Path:
    folder = tmp_path_factory.mktemp("office")
    keygen("Invented Design Office, stability section", folder)
    return folder


@pytest.fixture(scope="module")
def approved(tmp_path_factory, office) -> dict[str, Path]:
    """A copy of the demo vessel and the failing condition, the vessel approved, its sheet."""
    work = tmp_path_factory.mktemp("work")
    (work / "vessels").mkdir()
    shutil.copy(VESSEL, work / "vessels" / VESSEL.name)
    shutil.copy(FAILING, work / FAILING.name)
    approve_vessel(work / "vessels" / VESSEL.name, key_path=office / "key.pem",
                   cert_path=office / "cert.pem")
    sheet = work / "sheet.pdf"
    sheet.write_bytes(render(work / FAILING.name))
    key = office.parent / "preparer"
    keygen("Anyone (invented)", key)
    signed = work / "signed.pdf"
    sign_document(sheet, signed, "prepared", key_path=key / "key.pem",
                  cert_path=key / "cert.pem")
    return {"work": work, "vessel": work / "vessels" / VESSEL.name,
            "p7s": work / "vessels" / (VESSEL.name + ".p7s"), "sheet": sheet,
            "signed": signed, "trust": key / "cert.pem"}


def test_approval_is_a_detached_cms_signature_with_signing_time(approved):
    from asn1crypto import cms

    info = cms.ContentInfo.load(approved["p7s"].read_bytes())
    assert info["content_type"].native == "signed_data"  # RFC 5652 5.1
    signed = info["content"]
    assert signed["encap_content_info"]["content"].native is None  # 5.2: detached
    attrs = {a["type"].native for a in signed["signer_infos"][0]["signed_attrs"]}
    assert {"signing_time", "message_digest", "content_type"} <= attrs  # 11.3, 11.2, 11.1
    if shutil.which("openssl") is None:
        pytest.skip("openssl is not installed")
    done = subprocess.run(["openssl", "cms", "-verify", "-binary", "-inform", "DER", "-in",
                           str(approved["p7s"]), "-content", str(approved["vessel"]),
                           "-noverify", "-out", "/dev/null"], capture_output=True, text=True,
                          check=False)
    assert done.returncode == 0, done.stderr  # OpenSSL: the signature matches the bytes


def test_sheet_embeds_the_approval_and_prints_fingerprint_and_approver(approved):
    from pypdf import PdfReader

    reader = PdfReader(approved["sheet"])
    files = {name: data[0] for name, data in reader.attachments.items()}
    assert files["linnet-demo.yaml.p7s"] == approved["p7s"].read_bytes()
    text = " ".join(" ".join(p.extract_text().split()) for p in reader.pages)
    fingerprint = hashlib.sha256(approved["vessel"].read_bytes()).hexdigest()
    assert fingerprint in text.replace(" ", "") or fingerprint[:32] in text.replace(" ", "")
    assert "Invented Design Office" in text
    results = json.loads(files["results.json"])
    assert results["vessel"]["sha256"] == fingerprint


def test_verify_with_vessel_and_vessel_trust(approved, office, tmp_path):
    report = verify_document(approved["signed"], [approved["trust"]],
                             vessel=approved["vessel"], vessel_trust=[office / "cert.pem"])
    assert report["ok"], report["problems"]
    assert report["vessel_data"]["approval"]["trusted"]
    assert report["certified"]["passed"] is False  # signed and verified, and it says FAILS
    other = tmp_path / "other"
    keygen("Somebody Else (invented)", other)
    report = verify_document(approved["signed"], [approved["trust"]],
                             vessel_trust=[other / "cert.pem"])
    assert not report["ok"] and "vessel data approval: not trusted" in "\n".join(
        report["problems"])
    changed = tmp_path / "v.yaml"
    changed.write_bytes(approved["vessel"].read_bytes() + b"# edited\n")
    report = verify_document(approved["signed"], [approved["trust"]], vessel=changed)
    assert not report["ok"] and report["vessel_data"]["file"]["equal"] is False


def _edited_vessel(text: str) -> str:
    """Every KN x 1.25 and KMt + 5 cm: the edit found in review."""
    data = yaml.safe_load(text)
    def edit(value, f):  # a number, or rows of them at any depth (tables at trims)
        return [edit(v, f) for v in value] if isinstance(value, list) else f(value)

    data["cross_curves"]["kn"] = edit(data["cross_curves"]["kn"], lambda v: v * 1.25)
    data["hydrostatics"]["kmt"] = edit(data["hydrostatics"]["kmt"], lambda v: v + 0.05)
    if "limiting_kg" in data:  # the forger raises the booklet's curve as well
        data["limiting_kg"]["kg"] = [v + 1.0 for v in data["limiting_kg"]["kg"]]
    return yaml.safe_dump(data, sort_keys=False)


def test_edited_vessel_data_cannot_pass_as_approved(approved, office, tmp_path):
    from reportgen.pipeline import evaluate_path

    work = tmp_path / "w"
    (work / "vessels").mkdir(parents=True)
    edited = work / "vessels" / VESSEL.name
    edited.write_text(_edited_vessel(VESSEL.read_text()))
    shutil.copy(FAILING, work / FAILING.name)
    assert not evaluate_path(FAILING).passed
    assert evaluate_path(work / FAILING.name).passed  # the edit makes it pass
    # the approval of the real data beside the edited data: the sheet refuses to print it
    shutil.copy(approved["p7s"], work / "vessels")
    with pytest.raises(InputError, match="does not sign these vessel data"):
        render(work / FAILING.name)
    (work / "vessels" / (VESSEL.name + ".p7s")).unlink()
    sheet = work / "sheet.pdf"
    sheet.write_bytes(render(work / FAILING.name))
    signed = work / "signed.pdf"
    sign_document(sheet, signed, "prepared", key_path=approved["trust"].parent / "key.pem",
                  cert_path=approved["trust"])
    assert verify_document(signed, [approved["trust"]])["ok"]  # signatures alone are fine...
    report = verify_document(signed, [approved["trust"]], vessel=approved["vessel"],
                             vessel_trust=[office / "cert.pem"])
    assert not report["ok"]  # ...but not against the approved data
    problems = "\n".join(report["problems"])
    assert "not byte for byte" in problems and "no approval signature" in problems
    assert report["certified"]["vessel_sha256"] != hashlib.sha256(
        approved["vessel"].read_bytes()).hexdigest()


def test_extract_writes_inputs_that_reproduce_the_results(approved, tmp_path):
    from reportgen.pipeline import evaluate_path
    from reportgen.signing.sheetfile import embedded_files

    written = extract_inputs(approved["signed"], tmp_path / "x")
    names = sorted(str(p.relative_to(tmp_path / "x")) for p in written)
    assert names == sorted([FAILING.name, "vessels/linnet-demo.yaml",
                            "vessels/linnet-demo.yaml.p7s"])
    embedded = embedded_files(approved["signed"].read_bytes(), approved["signed"])
    assert evaluate_path(tmp_path / "x" / FAILING.name).to_json() == \
        embedded["results.json"].decode("utf-8")
    with pytest.raises(InputError, match="already exists"):
        extract_inputs(approved["signed"], tmp_path / "x")
    assert len(extract_inputs(approved["signed"], tmp_path / "x", force=True)) == 3


@pytest.mark.parametrize("reference, laid_out", [
    ("vessels/v.yaml", ("c.yaml", "vessels/v.yaml")),
    ("../vessels/v.yaml", ("conditions/c.yaml", "vessels/v.yaml")),
    ("./v.yaml", ("c.yaml", "v.yaml")),
])
def test_extract_layout_stays_inside_the_folder(reference, laid_out):
    from reportgen.signing.approve import _layout

    condition, vessel = _layout("c.yaml", reference)
    assert (str(condition), str(vessel)) == laid_out


@pytest.mark.parametrize("reference", ["/etc/passwd", "../../../../../../../../../../x.yaml",
                                       "a/../../..", "..\\x.yaml"])
def test_extract_refuses_paths_that_leave_the_folder(reference):
    from reportgen.signing.approve import _layout

    with pytest.raises(InputError):
        _layout("c.yaml", reference)


def test_verify_several_files_one_line_each_and_the_worst_status(approved, demo, tmp_path):
    junk = tmp_path / "junk.pdf"
    junk.write_bytes(b"%PDF-1.7\nnot really\n")
    folder = tmp_path / "many"
    folder.mkdir()
    shutil.copy(approved["signed"], folder / "a.pdf")
    shutil.copy(demo["unsigned"], folder / "b.pdf")
    from click.testing import CliRunner

    from reportgen.cli import main

    runner = CliRunner()
    command = ["verify", str(folder), str(junk), "--trust", str(approved["trust"])]
    done = runner.invoke(main, command)
    assert done.exit_code == 2, done.output  # 2 > 1 > 0: the junk file is unreadable
    lines = done.stdout.strip().splitlines()
    assert re.match(r"VERIFIED\s+\S+a\.pdf", lines[0]) and "FAILS: " in lines[0]
    assert lines[1].startswith("NOT VERIFIED") and "b.pdf" in lines[1]
    assert lines[-1] == "3 file(s): 1 verified, 1 not verified, 1 unreadable"
    assert "junk.pdf" in done.stderr and done.exception is None or isinstance(
        done.exception, SystemExit)
    done = runner.invoke(main, command + ["--json"])
    batch = json.loads(done.stdout)
    assert batch["summary"] == {"files": 3, "verified": 1, "not_verified": 1, "unreadable": 1}
    assert [r["ok"] for r in batch["files"]] == [True, False]
