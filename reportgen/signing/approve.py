"""Approval of vessel data, and the embedded input files taken back out of a document.

``approve_vessel`` writes a detached CMS signature (RFC 5652, 5.1 SignedData without
encapsulated content, DER) over the vessel file's bytes, with the signing time as a signed
attribute (RFC 5652, 11.3): the design office or class approves a vessel data set once;
``sheet`` embeds ``VESSEL.yaml.p7s`` when it lies beside the vessel file.

``extract_inputs`` writes a document's embedded condition file, vessel file (and approval)
into a folder, laid out so that the condition finds its vessel by its own ``vessel:`` path:
``reportgen check`` on the written condition then gives the document's results. A limits
document has no condition: its vessel file (and approval) go to the top of the folder, and
``reportgen limits`` on it at the document's trim gives the document's limits.
"""

from __future__ import annotations

import asyncio
import dataclasses
import posixpath
import shlex
from pathlib import Path
from typing import Any

import reportgen.signing.identity as ids
from reportgen.docinfo import approval_name
from reportgen.errors import InputError
from reportgen.files import check_output, command_scope, make_folder, read_input, write_atomic
from reportgen.provenance import read_approval
from reportgen.signing.recompute import Inputs, check_vessel, vessel_reference
from reportgen.signing.sheetfile import Document, read_document
from reportgen.signing.trust import signing_usage_problems, validity_problem

MAX_CONDITION_DEPTH = 8  # "../" levels a condition's vessel path may climb when extracted


def _approve_vessel(vessel_path: Path, out_path: Path | None = None, *,
                   key_path: Path | None = None, cert_path: Path | None = None,
                   p12_path: Path | None = None, passphrase: bytes | None = None,
                   force: bool = False) -> dict:
    """Sign the vessel file's bytes (detached CMS); write VESSEL.yaml.p7s or ``out_path``.

    Refused: a file that is not a valid vessel data file; a certificate expired or not yet
    valid now or whose key usage does not allow signatures. Returns {"output", "signer",
    "signing_time"}.
    """
    from asn1crypto import keys as asn1_keys
    from cryptography.hazmat.primitives import serialization
    from pyhanko.sign import signers
    from pyhanko.sign.signers.pdf_cms import PdfCMSSignedAttributes
    from pyhanko_certvalidator.registry import SimpleCertificateStore

    vessel_path = Path(vessel_path)
    out_path = Path(out_path) if out_path is not None else \
        vessel_path.with_name(approval_name(vessel_path.name))
    vessel = read_input(vessel_path, "vessel data file")
    check_output(out_path, force)
    check_vessel(vessel, str(vessel_path))
    who = ids.load_identity(key_path, cert_path, p12_path, passphrase, command="approve")
    now = ids.utc_now()
    problem = validity_problem(who.certificate, now, "now")
    if problem:
        raise InputError(f"{who.origin}: {problem}")
    usage = signing_usage_problems(who.certificate)
    if usage:
        raise InputError(f"{who.origin}: the certificate may not sign: {'; '.join(usage)}")
    registry = SimpleCertificateStore()
    registry.register_multiple(ids.to_asn1(c) for c in who.chain)
    key_info = asn1_keys.PrivateKeyInfo.load(who.key.private_bytes(
        serialization.Encoding.DER, serialization.PrivateFormat.PKCS8,
        serialization.NoEncryption()))
    signer = signers.SimpleSigner(signing_cert=ids.to_asn1(who.certificate),
                                  signing_key=key_info, cert_registry=registry)
    try:
        info = asyncio.run(signer.async_sign_general_data(
            vessel, "sha256", detached=True,
            signed_attr_settings=PdfCMSSignedAttributes(signing_time=now)))
    except Exception as exc:  # noqa: BLE001 - pyHanko reports bad keys in many types
        raise InputError(f"{who.origin}: cannot sign the vessel data: {exc}") from None
    p7s = info.dump()
    if not read_approval(p7s, vessel).intact:  # never write an approval that does not check
        raise InputError(f"{vessel_path}: the approval made does not verify; nothing written")
    write_atomic(out_path, p7s, force=force)
    return {"output": str(out_path), "signer": ids.common_name(who.certificate),
            "signing_time": now.isoformat()}


def _safe_name(name: str, what: str) -> str:
    if not name or "/" in name or "\\" in name or name in (".", "..") or "\x00" in name:
        raise InputError(f"the embedded {what} has an unsafe file name {ids.printable(name)!r}")
    return name


def _layout(condition_name: str, vessel_ref: str) -> tuple[Path, Path]:
    """Relative paths for the condition and vessel files such that the condition's
    ``vessel:`` path, taken from the condition's folder, reaches the vessel file and neither
    leaves the output folder. A path that climbs ("../") puts the condition that many
    folders deep (each named "conditions")."""
    if vessel_ref.startswith("/") or "\\" in vessel_ref or "\x00" in vessel_ref:
        raise InputError(f"the condition names its vessel file by an absolute or unusual path "
                         f"{ids.printable(vessel_ref)!r}; extract writes only inside the "
                         f"output folder")
    parts = posixpath.normpath(vessel_ref).split("/")
    climb = 0
    while climb < len(parts) and parts[climb] == "..":
        climb += 1
    rest = parts[climb:]
    if not rest or ".." in rest or climb > MAX_CONDITION_DEPTH:
        raise InputError(f"the condition's vessel path {ids.printable(vessel_ref)!r} cannot "
                         f"be laid out inside the output folder")
    condition = Path(*(["conditions"] * climb), condition_name)
    vessel = Path(*rest)
    if vessel == condition:
        raise InputError("the condition names itself as its vessel file")
    return condition, vessel


def _limits_layout(sheet_path: Path, inputs: Inputs) -> dict[Path, bytes]:
    """A limits document's inputs: its vessel file (and approval) at the top of the folder;
    the request (the trim) is not a file that `reportgen limits` reads (see ``rerun_hint``)."""
    try:
        vessel = Path(_safe_name(inputs.vessel_name, "vessel file"))
    except InputError as exc:
        raise InputError(f"{sheet_path}: {exc}") from None
    layout = {vessel: inputs.vessel}
    if inputs.approval is not None:
        layout[vessel.with_name(approval_name(vessel.name))] = inputs.approval
    return layout


def rerun_hint(doc: Document, written: list[Path]) -> str | None:
    """The command that makes a limits document's limits again from the extracted vessel file
    (its trim is in limits.json, not in a file); None for other documents."""
    if doc.kind.name != "limits":
        return None
    trim = float(doc.content["trim"])  # checked by the kind's inputs()
    return f"reportgen limits {shlex.quote(str(written[0]))} --trim {trim:g}"


def _extract_inputs(sheet_path: Path, out_dir: Path,
                    force: bool = False) -> tuple[list[Path], str | None]:
    """Write the embedded input files of a document into ``out_dir``: the written paths and,
    for a limits document, the command that re-runs it (``rerun_hint``).

    Existing files are kept unless ``force``; nothing outside ``out_dir`` is written.
    """
    sheet_path, out_dir = Path(sheet_path), Path(out_dir)
    doc = read_document(read_input(sheet_path, "sheet"), sheet_path)
    try:
        inputs = doc.kind.inputs(doc.content, doc.files)
    except InputError as exc:
        raise InputError(f"{sheet_path}: {exc}") from None
    if doc.kind.name == "limits":
        return _write_layout(_limits_layout(sheet_path, inputs), out_dir, force, doc)
    layout: dict[Path, bytes] = {}
    for name, data in inputs.condition_files():  # a package holds several
        one = dataclasses.replace(inputs, condition_name=name, condition=data, conditions=(),
                                  read_as=())
        try:
            reference = vessel_reference(one)
            condition_rel, vessel_rel = _layout(_safe_name(name, "condition file"), reference)
        except InputError as exc:
            raise InputError(f"{sheet_path}: {exc}") from None
        wanted = [(condition_rel, data), (vessel_rel, inputs.vessel)]
        if inputs.approval is not None:
            wanted.append((vessel_rel.with_name(approval_name(vessel_rel.name)),
                           inputs.approval))
        for rel, contents in wanted:
            if layout.setdefault(rel, contents) != contents:
                raise InputError(f"{sheet_path}: two embedded files would be written to {rel}")
    return _write_layout(layout, out_dir, force, doc)


def _write_layout(layout: dict[Path, bytes], out_dir: Path, force: bool,
                  doc: Document) -> tuple[list[Path], str | None]:
    files = [(out_dir / rel, contents) for rel, contents in layout.items()]
    for path, _data in files:  # every file checked before the first is written
        check_output(path, force, make_folders=True)
    for path, data in files:
        make_folder(path.parent)
        write_atomic(path, data, force=force)
    written = [path for path, _data in files]
    return written, rerun_hint(doc, written)


def approve_vessel(vessel_path: Path, out_path: Path | None = None, **kw: Any) -> dict:
    """``_approve_vessel`` in a command scope of its own (outputs never replace inputs)."""
    with command_scope():
        return _approve_vessel(vessel_path, out_path, **kw)


def extract_inputs(sheet_path: Path, out_dir: Path, force: bool = False) -> list[Path]:
    """The paths ``extract_and_hint`` writes."""
    return extract_and_hint(sheet_path, out_dir, force)[0]


def extract_and_hint(sheet_path: Path, out_dir: Path,
                     force: bool = False) -> tuple[list[Path], str | None]:
    """``_extract_inputs`` in a command scope of its own (outputs never replace inputs)."""
    with command_scope():
        return _extract_inputs(sheet_path, out_dir, force)
