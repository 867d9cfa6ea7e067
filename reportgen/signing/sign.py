"""Signing one role of a reportgen document.

PAdES baseline B-B, subfilter ETSI.CAdES.detached (ETSI EN 319 142-1, 5.3; ISO 32000-2,
12.8.3.4). The first signature certifies the document with DocMDP permission 2, form filling
and signing (ISO 32000-2, 12.8.2.2); later ones are approval signatures, each in its own
incremental update (ISO 32000-2, 7.5.6) that changes nothing but its own signature field:
the document information and the XMP metadata are left as rendered, so that verify can hold
every later revision to "a signature and nothing else".

Refused (InputError, nothing written): a file that is not a reportgen document or does not
pass the integrity checks of verify (except trust); a role out of order (checked needs
prepared, reviewed needs checked) or already signed; a certificate expired or not yet valid
now, or whose key usage does not allow signatures; a certificate that already signed another
role; a certificate whose name is not the one the sheet names for the role.
"""

from __future__ import annotations

import io
from pathlib import Path
from typing import Any

from pyhanko.pdf_utils.incremental_writer import IncrementalPdfFileWriter
from pyhanko.sign import fields, signers
from pyhanko_certvalidator.registry import SimpleCertificateStore

import reportgen.signing.identity as ids
from reportgen.docinfo import ROLES
from reportgen.errors import InputError
from reportgen.files import check_output, command_scope, is_input, read_input, write_atomic
from reportgen.signing.sheetfile import (
    field_size,
    quiet_pdf_libraries,
    read_document,
)
from reportgen.signing.stamp import stamp_style
from reportgen.signing.trust import signing_usage_problems, validity_problem

_ROLE_REASON = {"prepared": "prepared the calculation", "checked": "checked the calculation",
                "reviewed": "reviewed the calculation"}


class _UnchangedMetadataWriter(IncrementalPdfFileWriter):
    """An incremental writer that leaves /Info and the XMP metadata as they are.

    pyHanko's writer stamps its name and the time into both on every write; a signed
    reportgen document allows no such change after its first revision.
    """

    def _update_meta(self) -> None:  # pyHanko hook, called before writing
        return None


def _order_problem(role: str, signed: list[str]) -> str | None:
    index = ROLES.index(role)
    if role in signed:
        return f"the {role} field is already signed"
    if signed != list(ROLES[:index]):
        needed = ROLES[index - 1] if index else None
        if needed and needed not in signed:
            return f"{role} needs the {needed} signature first (roles sign in the order " \
                   f"{', '.join(ROLES)})"
        return f"a later role ({', '.join(signed)}) has already signed; {role} cannot follow"
    return None


def _sign_document(in_path: Path, out_path: Path, role: str, *, key_path: Path | None = None,
                  cert_path: Path | None = None, p12_path: Path | None = None,
                  passphrase: bytes | None = None, reason: str | None = None,
                  location: str | None = None, force: bool = False) -> dict:
    """Sign ``role`` of the document at ``in_path`` and write the result to ``out_path``.

    Returns a short account: {"role", "signer", "signing_time"}. See the module docstring for
    what is refused. The input is never changed; the output is written atomically and, without
    ``force``, never replaces a file, even one that appears while the signature is made.
    """
    from reportgen.signing.verify import guarded_integrity

    in_path, out_path = Path(in_path), Path(out_path)
    if role not in ROLES:
        raise InputError(f"sign: --role must be one of {', '.join(ROLES)}, not {role!r}")
    data = read_input(in_path, "sheet")
    if is_input(out_path):
        raise InputError(f"{out_path}: the output must not be the input sheet; a signed "
                         f"sheet is written to a new file")
    check_output(out_path, force)
    doc = read_document(data, in_path)
    problem = _order_problem(role, doc.signed_roles)
    if problem:
        raise InputError(f"{in_path}: {problem}")
    if role not in doc.fields:
        raise InputError(f"{in_path}: the document has no signature field {role}")

    who = ids.load_identity(key_path, cert_path, p12_path, passphrase)
    cert = who.certificate
    name = ids.common_name(cert)
    now = ids.utc_now()
    for problem in filter(None, [validity_problem(cert, now, "now")]):
        raise InputError(f"{who.origin}: {problem}")
    usage = signing_usage_problems(cert)
    if usage:
        raise InputError(f"{who.origin}: the certificate may not sign documents: "
                         f"{'; '.join(usage)}")
    named = (doc.kind.certified(doc.content, None).get("signatories") or {}).get(f"{role}_by")
    why = ids.name_problem(name, named) if named else None
    if why:
        raise InputError(f"{who.origin}: the certificate is issued to '{ids.printable(name)}' "
                         f"but the {doc.kind.name} names '{ids.printable(named)}' for {role}: "
                         f"{why}")

    state = guarded_integrity(doc)
    if state["problems"]:
        raise InputError(f"{in_path}: refusing to sign: " + "; ".join(state["problems"][:6]))
    for sig in state["signature_objects"]:
        if sig.certificate is not None and ids.der(sig.certificate) == ids.der(cert):
            raise InputError(f"{who.origin}: this certificate ('{ids.printable(name)}') "
                             f"already signed the {sig.field} role of this {doc.kind.words}; "
                             f"the same signer may not sign two roles: sign {role} with "
                             f"another person's certificate")

    width, height = field_size(doc.reader, role)
    registry = SimpleCertificateStore()
    registry.register_multiple(ids.to_asn1(c) for c in who.chain)
    from asn1crypto import keys as asn1_keys
    from cryptography.hazmat.primitives import serialization

    key_info = asn1_keys.PrivateKeyInfo.load(who.key.private_bytes(
        serialization.Encoding.DER, serialization.PrivateFormat.PKCS8,
        serialization.NoEncryption()))
    signer = signers.SimpleSigner(signing_cert=ids.to_asn1(cert), signing_key=key_info,
                                  cert_registry=registry)
    meta = signers.PdfSignatureMetadata(
        field_name=role, subfilter=fields.SigSeedSubFilter.PADES, md_algorithm="sha256",
        certify=not doc.signed_roles, docmdp_permissions=fields.MDPPerm.FILL_FORMS,
        reason=reason or _ROLE_REASON[role], location=location, name=name)
    pdf_signer = signers.PdfSigner(meta, signer=signer,
                                   stamp_style=stamp_style(role, name, now, width, height))
    try:
        with quiet_pdf_libraries():
            writer = _UnchangedMetadataWriter(io.BytesIO(data), strict=False)
            output = pdf_signer.sign_pdf(writer, existing_fields_only=True,
                                         output=io.BytesIO())
    except Exception as exc:  # noqa: BLE001 - pyHanko reports bad input in many types
        raise InputError(f"{in_path}: cannot sign the {role} field: "
                         f"{type(exc).__name__}: {exc}") from None
    write_atomic(out_path, output.getvalue(), force=force)
    return {"role": role, "signer": name, "signing_time": now.isoformat()}


def sign_document(in_path: Path, out_path: Path, role: str, **kw: Any) -> dict:
    """Sign ``role`` of the document at ``in_path`` into ``out_path`` (see ``_sign_document``
    for the arguments); its own command scope, so the output never replaces the input."""
    with command_scope():
        return _sign_document(in_path, out_path, role, **kw)
