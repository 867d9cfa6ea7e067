"""Shared, session-wide fixtures of the signing tests: demo identities and demo sheets made
once (a sheet takes seconds to render) by the real evaluation, renderer and signer."""

from __future__ import annotations

from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parent.parent
PASSING = ROOT / "conditions" / "ballast-departure.yaml"  # names both signatories
FAILING = ROOT / "conditions" / "fails-on-purpose-high-deck-cargo.yaml"
PREPARER = "A. N. Other, chief officer (invented)"
CHECKER = "B. N. Other, master (invented)"


@pytest.fixture(scope="session")
def demo_ids(tmp_path_factory) -> dict[str, Path]:
    from reportgen.signing.identity import keygen

    base = tmp_path_factory.mktemp("ids")
    keygen(PREPARER, base / "prepared")
    keygen(CHECKER, base / "checked", passphrase=b"correct horse")
    keygen("Mallory Outsider (invented)", base / "mallory")
    return {"prepared": base / "prepared", "checked": base / "checked",
            "mallory": base / "mallory"}


def render(condition: Path) -> bytes:
    from reportgen.inputs import load_case
    from reportgen.pipeline import evaluate
    from reportgen.report.render import render_sheet

    case = load_case(condition)
    return render_sheet(case, evaluate(case))


@pytest.fixture(scope="session")
def demo(tmp_path_factory, demo_ids) -> dict[str, Path]:
    """unsigned -> prepared (PEM files) -> prepared + checked (PKCS#12), and a failing
    condition's sheet, unsigned."""
    from reportgen.signing import sign_document

    base = tmp_path_factory.mktemp("sheets")
    unsigned = base / "unsigned.pdf"
    unsigned.write_bytes(render(PASSING))
    one, two = base / "one.pdf", base / "two.pdf"
    sign_document(unsigned, one, "prepared", key_path=demo_ids["prepared"] / "key.pem",
                  cert_path=demo_ids["prepared"] / "cert.pem")
    sign_document(one, two, "checked", p12_path=demo_ids["checked"] / "identity.p12",
                  passphrase=b"correct horse")
    failing = base / "failing.pdf"
    failing.write_bytes(render(FAILING))
    return {"unsigned": unsigned, "one": one, "two": two, "failing": failing, "base": base}


@pytest.fixture(scope="session")
def trust_both(demo_ids) -> list[Path]:
    return [demo_ids["prepared"] / "cert.pem", demo_ids["checked"] / "cert.pem"]
