"""`reportgen limits` as a user meets it: the limits-1 JSON keys of SPEC "Limits", bad input,
and the PDF/A-3 limits document signed and verified like a sheet (SPEC "Verification").
A small box barge (tests/eval_box.py) with cross curves at three displacements keeps it fast."""

from __future__ import annotations

import json
import subprocess
import sys

import pytest
import yaml
from eval_box import DRAFTS, RHO, B, L, kn_table, vessel_dict

KEEP = (8, 20, 32)  # cross-curve rows kept: T = 4, 7 and 10 m


def _run(*args: str) -> subprocess.CompletedProcess:
    return subprocess.run([sys.executable, "-m", "reportgen", *args], check=False,
                          capture_output=True, text=True)


@pytest.fixture(scope="module")
def small_box(tmp_path_factory):
    d = vessel_dict()
    d["cross_curves"]["displacement"] = [RHO * L * B * DRAFTS[i] for i in KEEP]
    d["cross_curves"]["kn"] = [list(kn_table()[i]) for i in KEEP]
    folder = tmp_path_factory.mktemp("box")
    path = folder / "box.yaml"
    path.write_text(yaml.safe_dump(d, sort_keys=False), encoding="utf-8")
    return path


def test_json_has_the_keys_of_spec(small_box):
    run = _run("limits", str(small_box), "--json")
    assert run.returncode == 0, run.stderr
    doc = json.loads(run.stdout)
    assert doc["format"] == "reportgen/limits-1"
    assert {"software", "vessel", "criteria", "trim", "density", "rows", "warnings"} <= set(doc)
    assert doc["criteria"] == ["is2008.general", "is2008.weather"]
    assert doc["trim"] == 0.0 and doc["density"] == RHO
    assert len(doc["rows"]) == len(KEEP)
    for row in doc["rows"]:
        assert {"displacement", "draft_mean", "kmt", "kg_max", "gm_min", "governing"} <= set(row)
        assert row["gm_min"] == pytest.approx(row["kmt"] - row["kg_max"], abs=2e-6)
    # T = 4 m: GM 0.15 governs, KG max = KMt − 0.15 (IS Code 2008 2.2.4; box KMt closed form)
    assert doc["rows"][0]["governing"] == "gm0"
    assert doc["rows"][0]["kg_max"] == pytest.approx(2.0 + 256 / 48 - 0.15, abs=0.001)


def test_readable_table_and_trim(small_box):
    run = _run("limits", str(small_box), "--trim", "0.5")
    assert run.returncode == 0, run.stderr
    assert "trim of +0.500 m" in run.stdout and "gm0" in run.stdout
    assert "does not replace the approved stability booklet" in run.stdout


@pytest.mark.parametrize("args", [("--trim", "nan"), ("--trim", "inf"), ("--trim", "abc")])
def test_bad_trim_is_refused(small_box, args):
    run = _run("limits", str(small_box), *args)
    assert run.returncode == 2 and "Traceback" not in run.stderr


def test_missing_vessel_and_existing_output(small_box, tmp_path):
    assert _run("limits", str(tmp_path / "none.yaml")).returncode == 2
    target = tmp_path / "there.pdf"
    target.write_bytes(b"keep me")
    run = _run("limits", str(small_box), "-o", str(target))
    assert run.returncode == 2 and target.read_bytes() == b"keep me"
    run = _run("limits", str(small_box), "-o", str(small_box), "--force")
    assert run.returncode == 2 and small_box.read_bytes().startswith(b"format")


def test_pdf_is_signed_and_verified_by_recomputation(small_box, tmp_path):
    """The limits document is signable and `verify` re-runs the curve from the embedded vessel
    file (SPEC "Limits" and "Verification" 4, 5); a document whose embedded limits.json does
    not match its inputs is refused."""
    from reportgen.inputs.case import parse_vessel
    from reportgen.limitcurve import limiting_curve
    from reportgen.report.limitsdoc import render_limits, write_limits
    from reportgen.signing import sign_document
    from reportgen.signing.identity import keygen
    from reportgen.signing.sheetfile import read_document
    from reportgen.signing.verify import integrity, verify_document

    raw = small_box.read_bytes()
    vessel = parse_vessel(raw, "box.yaml")
    doc = limiting_curve(vessel, raw, "box.yaml")
    pdf = tmp_path / "limits.pdf"
    write_limits(raw, doc, pdf, vessel_sets=list(vessel.criteria))
    keygen("Invented Design Office", tmp_path / "id")
    signed = tmp_path / "signed.pdf"
    sign_document(pdf, signed, "prepared", key_path=tmp_path / "id/key.pem",
                  cert_path=tmp_path / "id/cert.pem")
    report = verify_document(signed, [tmp_path / "id/cert.pem"])
    assert report["ok"], report["problems"]
    assert report["kind"] == "limits"
    assert report["pages"]["method"] == "bytes"

    doc["rows"][0]["kg_max"] += 0.5  # a curve that is not what the vessel data give
    forged = tmp_path / "forged.pdf"
    forged.write_bytes(render_limits("box.yaml", raw, doc, list(vessel.criteria)))
    state = integrity(read_document(forged.read_bytes(), forged))
    assert not state["recomputation"]["ok"]
    assert any("rows[0].kg_max" in d for d in state["recomputation"]["differences"])


def test_booklet_block_round_trip(small_box, tmp_path):
    """`--booklet-block` prints a limiting_kg block that a vessel file takes as its booklet
    curve: at a row's displacement the criterion kg_limit requires that row's KG max."""
    from eval_box import condition_dict, write_case

    from reportgen.pipeline import evaluate_path

    run = _run("limits", str(small_box), "--booklet-block")
    assert run.returncode == 0, run.stderr
    block = yaml.safe_load(run.stdout)["limiting_kg"]
    assert block["source"].startswith("made by reportgen limits")
    doc = json.loads(_run("limits", str(small_box), "--json").stdout)
    vessel = yaml.safe_load(small_box.read_text())
    vessel["criteria"] = ["is2008.general", "is2008.weather", "booklet.limits"]
    vessel["limiting_kg"] = block
    draft = DRAFTS[KEEP[1]]
    disp = RHO * L * B * draft
    cargo = {"name": "Cargo", "mass": disp - 1000.0, "lcg": L / 2,
             "vcg": (disp * 5.0 - 4000.0) / (disp - 1000.0)}
    r = evaluate_path(write_case(tmp_path, condition_dict([cargo]), vessel))
    c = {c.id: c for c in r.criteria}["kg_limit"]
    assert c.required == pytest.approx(doc["rows"][1]["kg_max"], abs=1e-6)


def _cli(*args: str):
    """The command in this process (click's runner): as a user runs it, without the start-up."""
    from click.testing import CliRunner

    from reportgen.cli import main

    return CliRunner().invoke(main, list(args))


def _page_text(pdf) -> str:
    from pypdf import PdfReader

    return " ".join(" ".join(p.extract_text() for p in PdfReader(pdf).pages).split())


def test_approved_vessel_limits_are_embedded_printed_verified_and_extracted(small_box, tmp_path):
    """SPEC "Verification" (VESSEL.yaml.p7s beside the vessel file is embedded under the vessel
    attachment's name plus .p7s, the document prints who approved the data and when, verify
    --vessel-trust checks it) and SPEC "Command line" (extract gives the embedded input files
    back, ready to re-run). The signing time printed is checked against the CMS signingTime
    attribute read independently with asn1crypto (RFC 5652 11.3)."""
    from asn1crypto import cms

    from reportgen.signing import sign_document
    from reportgen.signing.identity import keygen
    from reportgen.signing.sheetfile import embedded_files
    from reportgen.signing.verify import verify_document

    ship = tmp_path / "ship"
    ship.mkdir()
    vessel = ship / "box.yaml"
    vessel.write_bytes(small_box.read_bytes())
    keygen("Invented Class Society, approvals", tmp_path / "office")
    keygen("Invented Preparer", tmp_path / "prep")
    run = _cli("approve", str(vessel), "--key", str(tmp_path / "office/key.pem"),
               "--cert", str(tmp_path / "office/cert.pem"))
    assert run.exit_code == 0, run.stderr
    p7s = (ship / "box.yaml.p7s").read_bytes()
    pdf = tmp_path / "limits.pdf"
    run = _cli("limits", str(vessel), "--trim", "0.5", "-o", str(pdf))
    assert run.exit_code == 0, run.stderr
    files = embedded_files(pdf.read_bytes(), pdf)
    assert files["box.yaml.p7s"] == p7s and files["box.yaml"] == vessel.read_bytes()
    signed_attrs = cms.ContentInfo.load(p7s)["content"]["signer_infos"][0]["signed_attrs"]
    when = next(a["values"][0].native for a in signed_attrs if a["type"].native == "signing_time")
    text = _page_text(pdf)
    assert "signed by Invented Class Society, approvals" in text
    assert when.strftime("%Y-%m-%d %H:%M UTC") in text and "not approved" not in text

    signed = tmp_path / "signed.pdf"
    sign_document(pdf, signed, "prepared", key_path=tmp_path / "prep/key.pem",
                  cert_path=tmp_path / "prep/cert.pem")
    report = verify_document(signed, [tmp_path / "prep/cert.pem"],
                             vessel_trust=[tmp_path / "office/cert.pem"])
    assert report["ok"], report["problems"]
    assert report["vessel_data"]["approval"]["trusted"] is True
    report = verify_document(signed, [tmp_path / "prep/cert.pem"],
                             vessel_trust=[tmp_path / "prep/cert.pem"])  # not the approver
    assert not report["ok"]

    out = tmp_path / "back"
    run = _cli("extract", str(signed), "-o", str(out))
    assert run.exit_code == 0, run.stderr
    assert sorted(p.name for p in out.iterdir()) == ["box.yaml", "box.yaml.p7s"]
    assert (out / "box.yaml.p7s").read_bytes() == p7s
    assert f"reportgen limits {out / 'box.yaml'} --trim 0.5" in run.stderr
    again = _cli("limits", str(out / "box.yaml"), "--trim", "0.5", "--json")
    assert again.exit_code == 0, again.stderr
    assert again.stdout == files["limits.json"].decode("utf-8")  # re-run gives the same limits
    run = _cli("extract", str(signed), "-o", str(out))  # never replaced without --force
    assert run.exit_code == 2 and "Traceback" not in run.stderr


def test_unapproved_vessel_limits_say_so(small_box, tmp_path):
    """SPEC "Verification": without VESSEL.yaml.p7s the document says "vessel data not
    approved", embeds no approval, and verify --vessel-trust fails; an approval of other bytes
    beside the vessel file is refused (exit 2, nothing written)."""
    from reportgen.inputs.case import parse_vessel
    from reportgen.limitcurve import limiting_curve
    from reportgen.report.limitsdoc import write_limits
    from reportgen.signing import sign_document
    from reportgen.signing.identity import keygen
    from reportgen.signing.sheetfile import embedded_files
    from reportgen.signing.verify import verify_document

    raw = small_box.read_bytes()
    vessel = parse_vessel(raw, "box.yaml")
    pdf = tmp_path / "limits.pdf"
    write_limits(raw, limiting_curve(vessel, raw, "box.yaml"), pdf,
                 vessel_sets=list(vessel.criteria))
    assert "vessel data not approved" in _page_text(pdf)
    assert set(embedded_files(pdf.read_bytes(), pdf)) == {"box.yaml", "limits.json"}
    keygen("Invented Preparer", tmp_path / "prep")
    signed = tmp_path / "signed.pdf"
    sign_document(pdf, signed, "prepared", key_path=tmp_path / "prep/key.pem",
                  cert_path=tmp_path / "prep/cert.pem")
    report = verify_document(signed, [tmp_path / "prep/cert.pem"],
                             vessel_trust=[tmp_path / "prep/cert.pem"])
    assert not report["ok"]
    assert any("no approval signature" in p for p in report["problems"])
    out = tmp_path / "back"
    run = _cli("extract", str(signed), "-o", str(out))
    assert run.exit_code == 0, run.stderr
    assert [p.name for p in out.iterdir()] == ["box.yaml"]

    ship = tmp_path / "ship"
    ship.mkdir()
    (ship / "box.yaml").write_bytes(raw + b"# edited after approval\n")
    run = _cli("approve", str(ship / "box.yaml"), "--key", str(tmp_path / "prep/key.pem"),
               "--cert", str(tmp_path / "prep/cert.pem"))
    assert run.exit_code == 0, run.stderr
    (ship / "box.yaml").write_bytes(raw)  # the approval no longer signs these bytes
    run = _cli("limits", str(ship / "box.yaml"), "-o", str(tmp_path / "bad.pdf"))
    assert run.exit_code == 2 and "does not sign these vessel data" in run.stderr
    assert not (tmp_path / "bad.pdf").exists() and "Traceback" not in run.stderr


@pytest.mark.parametrize("trim", [-0.0, 0.1234567])
def test_the_trim_hashed_is_the_trim_recorded(small_box, trim):
    """`--trim -0` is the even-keel curve (IEEE 754: −0.0 == 0.0), and the document records
    trims to 6 decimals. It recorded 0.0 (or 0.123457) but hashed the request "-0.0" (or
    0.1234567), so its inputs_sha256 could not be made again from what it embeds and `verify`
    refused it (SPEC "Verification": the inputs hash)."""
    from reportgen.inputs.case import parse_vessel
    from reportgen.limitcurve import inputs_sha256, limiting_curve

    raw = small_box.read_bytes()
    v = parse_vessel(raw, small_box.name)
    doc = limiting_curve(v, raw, small_box.name, trim)
    assert doc["inputs_sha256"] == inputs_sha256(doc["trim"], raw)
    again = limiting_curve(v, raw, small_box.name, round(trim, 6) + 0.0)
    assert doc["inputs_sha256"] == again["inputs_sha256"] and doc == again
