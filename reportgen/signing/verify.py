"""Verification of a signed reportgen document: SPEC "Verification", points 1 to 7.

``integrity`` holds everything that needs no trust decision (signatures intact, only
signatures after the first revision, the first revision equal to a fresh rendering, the
embedded inputs equal to the document number, the recomputation equal to the embedded data);
``sign`` refuses a document that fails it. ``verify_document`` adds the trust in each signer
(reportgen.signing.trust), the names the sheet gives for the roles, and the vessel data checks.
Every failure is one sentence in ``problems``; exit 0 needs none and at least one signature.
"""

from __future__ import annotations

import datetime as dt
import json
from collections.abc import Sequence
from pathlib import Path
from typing import Any

from cryptography.hazmat.primitives import serialization

import reportgen.signing.identity as ids
import reportgen.signing.pages as pg
from reportgen import __version__
from reportgen.docinfo import DOCNO_LENGTH, ROLES
from reportgen.errors import InputError
from reportgen.files import read_input
from reportgen.provenance import approval_name, read_approval
from reportgen.report.stack import rendering_stack
from reportgen.signing.recompute import Inputs, rebuild
from reportgen.signing.sheetfile import Document, quiet_pdf_libraries, read_document, title_number
from reportgen.signing.signatures import change_problems, read_signatures
from reportgen.signing.trust import TrustStore, assess, load_trust

# Our bound for the clocks of the signers' computers and of the verifier's: a stated signing
# time may lie this much after the moment of verification, or before the previous signature's.
CLOCK_TOLERANCE = dt.timedelta(minutes=5)


def differing_keys(a: Any, b: Any, prefix: str = "") -> list[str]:
    """Key paths where two JSON values differ (dicts by key, lists by position)."""
    if isinstance(a, dict) and isinstance(b, dict):
        out: list[str] = []
        for key in list(a) + [k for k in b if k not in a]:
            path = f"{prefix}.{key}" if prefix else str(key)
            if key not in a or key not in b:
                out.append(path)
            else:
                out.extend(differing_keys(a[key], b[key], path))
        return out
    if isinstance(a, list) and isinstance(b, list) and len(a) == len(b):
        out = []
        for i, (x, y) in enumerate(zip(a, b, strict=True)):
            out.extend(differing_keys(x, y, f"{prefix}[{i}]"))
        return out
    return [] if a == b else [prefix or "(document)"]


def _inputs_check(doc: Document) -> tuple[Inputs | None, dict]:
    content = doc.content
    recorded = content.get("inputs_sha256")
    docno = title_number(doc.title, doc.kind.title_prefix)
    section: dict[str, Any] = {"recorded_sha256": recorded, "computed_sha256": None,
                               "document_number": docno, "problems": []}
    try:
        inputs = doc.kind.inputs(content, doc.files)
    except InputError as exc:
        section["problems"].append(str(exc))
        section["ok"] = False
        return None, section
    names = [name for name, _data in inputs.condition_files()]
    section.update(condition_file=", ".join(names), vessel_file=inputs.vessel_name,
                   approval_embedded=inputs.approval is not None)
    if len(names) > 1:
        section["condition_files"] = names
    computed = inputs.sha256()
    section["computed_sha256"] = computed
    if computed != recorded:
        section["problems"].append("the SHA-256 of the embedded inputs differs from the "
                                   "recorded inputs_sha256")
    if not (isinstance(recorded, str) and docno == recorded[:DOCNO_LENGTH]):
        section["problems"].append("the document number in the title does not match the "
                                   "recorded hash")
    section["ok"] = not section["problems"]
    return inputs, section


def _pages_check(doc: Document, fresh_pdf: bytes, accept_other_version: bool,
                 inputs: Inputs) -> dict:
    software = doc.content.get("software")
    embedded = software.get("version") if isinstance(software, dict) else None
    section: dict[str, Any] = {"method": None, "rendered_by": embedded, "running": __version__,
                               "differing_pages": [], "problems": [], "note": None}
    if embedded != __version__:
        section["note"] = f"rendered by version {embedded}; pages not compared"
        if not accept_other_version:
            section["problems"].append(f"rendered by version {embedded}, verified by "
                                       f"{__version__}: pages not compared "
                                       f"(--accept-other-version accepts that)")
        allowed = {name for name, _data in inputs.condition_files()} | {
            inputs.vessel_name, approval_name(inputs.vessel_name), doc.kind.data_file}
        try:
            foreign = pg.foreign_parts(pg.first_revision(doc.reader, doc.data) or b"", allowed)
        except Exception as exc:  # noqa: BLE001 - a damaged part is not accepted
            foreign = [f"a part that cannot be read ({type(exc).__name__})"]
        if foreign:
            section["problems"].append("the document holds what no reportgen version "
                                       "writes: " + "; ".join(foreign))
        return section
    if doc.data.startswith(fresh_pdf):
        section["method"] = "bytes"
        return section
    recorded = pg.recorded_stack(doc.reader)
    differ = pg.stack_differences(recorded, rendering_stack())
    section["stack_differences"] = differ
    if not differ or "reportgen" in differ or "all" in differ:
        section["problems"].append("the first revision is not what this version renders "
                                   "from the embedded inputs"
                                   + ("" if not differ else " (no rendering stack recorded)"))
        return section
    first = pg.first_revision(doc.reader, doc.data)
    section["method"] = f"images at {pg.RESOLUTION_DPI} dpi (stack differs: {', '.join(differ)})"
    try:
        pages, count = pg.differing_pages(first or b"", fresh_pdf)
    except Exception as exc:  # noqa: BLE001 - PDFium refuses damaged files in its own way
        section["problems"].append(f"the pages cannot be compared as images "
                                   f"({type(exc).__name__})")
        return section
    section["pages"] = count
    section["differing_pages"] = pages
    if pages:
        section["problems"].append("printed pages differ from a fresh rendering: "
                                   + ", ".join(str(p) for p in pages))
    try:
        others = pg.structure_differences(first or b"", fresh_pdf)
    except Exception as exc:  # noqa: BLE001 - a damaged part is a difference, not a crash
        others = [f"the document's structure (unreadable: {type(exc).__name__})"]
    section["differing_parts"] = others
    if others:
        section["problems"].append("besides the pixels, the document differs from a fresh "
                                   "rendering in: " + ", ".join(others))
    return section


def integrity(doc: Document, accept_other_version: bool = False) -> dict:
    """Every check that needs no trust decision (see the module docstring)."""
    with quiet_pdf_libraries():
        sigs = read_signatures(doc.reader, doc.data)
    problems = [f"{s.field} signature: {p}" for s in sigs for p in s.problems]
    inputs, inputs_section = _inputs_check(doc)
    problems += [f"embedded inputs: {p}" for p in inputs_section["problems"]]
    recomputation: dict[str, Any] = {"ok": False, "differences": [], "error": None}
    page_section: dict[str, Any] = {"method": None, "problems": [], "note": None}
    fresh_size = None
    if inputs is not None and not inputs_section["ok"]:
        recomputation["error"] = "not done: the embedded inputs are not the recorded ones"
        page_section["note"] = "not compared: the embedded inputs are not the recorded ones"
    elif inputs is not None:
        try:
            fresh = rebuild(doc.kind, inputs)
        except InputError as exc:
            recomputation["error"] = f"the embedded inputs do not evaluate: {exc}"
            problems.append(f"recomputation: {recomputation['error']}")
        else:
            a = {k: v for k, v in doc.content.items() if k != "software"}
            b = {k: v for k, v in json.loads(fresh.data_text).items() if k != "software"}
            recomputation["differences"] = differing_keys(a, b)
            recomputation["ok"] = not recomputation["differences"]
            if not recomputation["ok"]:
                shown = ", ".join(recomputation["differences"][:8])
                problems.append(f"recomputation: the embedded {doc.kind.data_file} differs "
                                f"from a recomputation at {shown}")
            page_section = _pages_check(doc, fresh.pdf, accept_other_version, inputs)
            if page_section["method"] == "bytes":  # else sizes differ by right
                fresh_size = len(fresh.pdf)
            problems += [f"pages: {p}" for p in page_section["problems"]]
    with quiet_pdf_libraries():
        changes = change_problems(doc.reader, sigs, len(doc.data), fresh_size)
    problems += [f"changes after signing: {p}" for p in changes]
    return {"problems": problems, "signature_objects": sigs, "inputs": inputs_section,
            "inputs_object": inputs, "recomputation": recomputation, "pages": page_section,
            "changes": changes,
            "certified": doc.kind.certified(doc.content, inputs)}


def guarded_integrity(doc: Document, accept_other_version: bool = False) -> dict:
    """``integrity``, with any parser failure deep in a damaged file turned into one message
    naming the file (exit status 2), never a traceback."""
    try:
        return integrity(doc, accept_other_version)
    except InputError as exc:
        raise InputError(f"{doc.path}: {exc}") from None
    except Exception as exc:  # noqa: BLE001 - PDF parsers raise many types on damaged input
        text = " ".join(str(exc).split())[:200]
        raise InputError(f"{doc.path}: cannot read the PDF: {type(exc).__name__}: {text}"
                         ) from None


def _signature_entry(sig: Any, store: TrustStore, named: dict, now: Any,
                     kind: str = "sheet") -> dict:
    cert = sig.certificate
    entry: dict[str, Any] = {
        "field": sig.field, "role": sig.field,
        "signer": ids.common_name(cert) if cert is not None else None,
        "organisation": ids.organisation(cert) if cert is not None else None,
        "certificate_sha256": ids.fingerprint(cert) if cert is not None else None,
        "signing_time": sig.signing_time.isoformat().replace("+00:00", "Z")
        if sig.signing_time else None,
        "intact": sig.intact, "coverage": sig.coverage,
        "named_on_sheet": named.get(f"{sig.field}_by"), "name_matches": None,
        "trusted": False, "trusted_how": None, "path": [], "problems": list(sig.problems)}
    if cert is None:
        return entry
    verdict = assess(cert, sig.others, store, sig.signing_time, now)
    entry.update(trusted=verdict.trusted, trusted_how=verdict.how or None, path=verdict.path)
    entry["problems"] += verdict.problems
    if entry["named_on_sheet"]:
        why = ids.name_problem(entry["signer"], entry["named_on_sheet"])
        entry["name_matches"] = why is None
        if why:
            entry["problems"].append(
                f"the certificate is issued to '{ids.printable(entry['signer'])}', the {kind} "
                f"names '{ids.printable(entry['named_on_sheet'])}' for {sig.field}: {why}")
    return entry


def _stamp(moment: dt.datetime) -> str:
    return f"{moment:%Y-%m-%d %H:%M} UTC"


def _signer_problems(entries: list[dict], sigs: list[Any], now: dt.datetime) -> None:
    """Add to each signature entry's problems what only the signatures together show
    (SPEC "Verification", point 3, read conservatively): each role its own signer, so no
    certificate, no key and no person's name (``person_key``) signs two roles; and the signing
    times the signers state are not in the future and follow the revisions' order, within
    CLOCK_TOLERANCE."""
    seen: dict[tuple[str, object], str] = {}
    previous: tuple[str, dt.datetime] | None = None
    for entry, sig in zip(entries, sigs, strict=True):
        cert = sig.certificate
        if cert is not None:
            name = ids.common_name(cert)
            marks = [("certificate", ids.fingerprint(cert)),
                     ("key", cert.public_key().public_bytes(
                         serialization.Encoding.DER,
                         serialization.PublicFormat.SubjectPublicKeyInfo)),
                     ("person", ids.person_key(name))]
            again = next((m for m in marks if m in seen), None)
            if again is not None:
                what = f"person ({ids.printable(name)})" if again[0] == "person" else again[0]
                entry["problems"].append(f"the same {what} signed {seen[again]} too; "
                                         f"each role needs its own signer")
            for mark in marks:
                seen.setdefault(mark, entry["field"])
        when = sig.signing_time
        if when is None:
            continue
        if when > now + CLOCK_TOLERANCE:
            entry["problems"].append(f"its signing time {_stamp(when)} is in the future "
                                     f"(verified at {_stamp(now)})")
        if previous is not None and when < previous[1] - CLOCK_TOLERANCE:
            entry["problems"].append(f"its signing time {_stamp(when)} is before the "
                                     f"{previous[0]} signature ({_stamp(previous[1])}) that "
                                     f"precedes it in the file")
        previous = (entry["field"], when)


def _vessel_checks(inputs: Inputs | None, vessel: Path | None, vessel_store: TrustStore | None,
                   now: Any) -> tuple[dict, list[str]]:
    section: dict[str, Any] = {"file": None, "approval": None}
    problems: list[str] = []
    if vessel is not None:
        given = read_input(vessel, "approved vessel data file")
        same = inputs is not None and inputs.vessel == given
        section["file"] = {"path": str(vessel), "equal": same}
        if not same:
            problems.append(f"vessel data: the embedded vessel file is not byte for byte "
                            f"{vessel}")
    if vessel_store is not None:
        approval: dict[str, Any] = {"present": bool(inputs and inputs.approval)}
        section["approval"] = approval
        if inputs is None or inputs.approval is None:
            problems.append("vessel data: no approval signature is embedded "
                            "(vessel data not approved)")
        else:
            found = read_approval(inputs.approval, inputs.vessel)
            approval.update(found.describe())
            if not found.intact or found.certificate is None:
                problems.append(f"vessel data approval: {found.problem}")
            else:
                verdict = assess(found.certificate, found.others, vessel_store,
                                 found.signing_time, now)
                approval.update(trusted=verdict.trusted, trusted_how=verdict.how or None,
                                path=verdict.path)
                problems += [f"vessel data approval: {p}" for p in verdict.problems]
                when = found.signing_time
                if when is not None and when > now + CLOCK_TOLERANCE:
                    problems.append(f"vessel data approval: its signing time {_stamp(when)} "
                                    f"is in the future (verified at {_stamp(now)})")
    return section, problems


def verify_document(path: Path, trust: Sequence[Path] | TrustStore = (), *,
                    vessel: Path | None = None,
                    vessel_trust: Sequence[Path] | TrustStore = (),
                    accept_other_version: bool = False) -> dict:
    """Verify one signed document; the report dict (see README, "For surveyors").

    InputError (exit 2) only when the file cannot be read as a reportgen document or a
    --trust/--vessel file cannot be read; every other finding is in ``problems``.
    """
    path = Path(path)
    store = trust if isinstance(trust, TrustStore) else load_trust(trust)
    vessel_store = (vessel_trust if isinstance(vessel_trust, TrustStore)
                    else load_trust(vessel_trust) if vessel_trust else None)
    doc = read_document(read_input(path, "sheet"), path)
    now = ids.utc_now()
    state = guarded_integrity(doc, accept_other_version)
    certified = state["certified"]
    named = certified.get("signatories") or {}
    signatures = [_signature_entry(s, store, named, now, doc.kind.name)
                  for s in state["signature_objects"]]
    problems = list(state["problems"])
    _signer_problems(signatures, state["signature_objects"], now)
    for entry, sig in zip(signatures, state["signature_objects"], strict=True):
        problems += [f"{entry['field']} signature: {p}" for p in entry["problems"]
                     if p not in sig.problems]  # those are in the integrity problems already
    signed = {s["field"] for s in signatures}
    # A role the document names but nobody has signed yet: said beside the verdict, not a
    # failure. Point 3 matches the name of a role's signing certificate, and SPEC's exit 1
    # names an unsigned document, not one whose later roles are still to sign (prepared
    # alone verifies, as the signing order allows); the report says who is still to sign.
    notes = [f"the {doc.kind.name} names '{ids.printable(who)}' for {role}, and {role} is "
             f"not signed yet: only the signatures present are verified"
             for role in ROLES if (who := named.get(f"{role}_by")) and role not in signed]
    if not signatures:
        problems.append("the document is not signed")
    vessel_section, vessel_problems = _vessel_checks(state["inputs_object"], vessel,
                                                     vessel_store, now)
    problems += vessel_problems
    unsigned = [r for r in doc.fields if not doc.fields[r]]
    return {
        "format": "reportgen/verify-1", "file": str(path), "kind": doc.kind.name,
        "ok": not problems, "certified": certified,
        "trusted_certificates": len(store.certificates),
        "signatures": signatures, "unsigned_roles": unsigned,
        "changes": {"ok": not state["changes"], "problems": state["changes"]},
        "pages": state["pages"], "inputs": state["inputs"],
        "recomputation": state["recomputation"], "vessel_data": vessel_section,
        "problems": problems, "notes": notes, "verified_by": {"name": "reportgen", "version": __version__},
    }
