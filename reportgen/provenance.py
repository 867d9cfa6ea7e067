"""Where the vessel data come from: the fingerprint of a vessel file and its approval.

An approval is a detached CMS signature (RFC 5652, 5.1 SignedData without encapsulated
content; DER) over the vessel file's bytes, written by ``reportgen approve`` as
``VESSEL.yaml.p7s`` beside the vessel file. This module reads one and says whether it signs
the given bytes, who signed and when. Whether the signer is entitled to approve is a question
of trust, answered by reportgen.signing (``verify --vessel-trust``).

Imports nothing from reportgen.report or reportgen.signing, so both can import it (the
versions of the rendering stack are reportgen.report.stack).
"""

from __future__ import annotations

import asyncio
import datetime as dt
import hashlib
import logging
from dataclasses import dataclass

from cryptography import x509
from cryptography.x509.oid import NameOID

from reportgen.docinfo import APPROVAL_SUFFIX

MAX_APPROVAL_BYTES = 1024 * 1024  # a detached signature with a few certificates: a few KiB


def vessel_fingerprint(vessel_bytes: bytes) -> str:
    """SHA-256 of the vessel file's bytes alone, hex (SPEC: ``vessel.sha256``)."""
    return hashlib.sha256(vessel_bytes).hexdigest()


def approval_name(vessel_attachment: str) -> str:
    """Name of the embedded approval: the vessel attachment's name plus ``.p7s`` (SPEC)."""
    return vessel_attachment + APPROVAL_SUFFIX


@dataclass(frozen=True)
class Approval:
    """One approval signature read against the vessel bytes it claims to sign."""

    intact: bool  # the signature is mathematically valid over exactly these vessel bytes
    signer: str | None
    organisation: str | None
    signing_time: dt.datetime | None  # the signingTime attribute (RFC 5652 11.3), UTC
    certificate: x509.Certificate | None
    others: tuple[x509.Certificate, ...]  # further certificates the signature carries
    problem: str | None  # why it is not intact, in words

    def describe(self) -> dict:
        """Plain values for documents: signer, organisation, time (ISO 8601 UTC), intact."""
        return {"signer": self.signer, "organisation": self.organisation,
                "signing_time": (self.signing_time.strftime("%Y-%m-%d %H:%M UTC")
                                 if self.signing_time else None),
                "intact": self.intact, "problem": self.problem}


def _name(cert: x509.Certificate, oid: x509.ObjectIdentifier) -> str | None:
    try:
        values = cert.subject.get_attributes_for_oid(oid)
    except ValueError:
        return None
    return str(values[0].value) if values else None


def _broken(problem: str) -> Approval:
    return Approval(False, None, None, None, None, (), problem)


def read_approval(p7s: bytes, vessel_bytes: bytes) -> Approval:
    """Check a detached CMS signature against the vessel bytes (no trust decision here)."""
    from asn1crypto import cms
    from pyhanko.sign.validation.generic_cms import (
        async_validate_detached_cms,
        extract_certificate_info,
    )
    from pyhanko_certvalidator import ValidationContext

    if len(p7s) > MAX_APPROVAL_BYTES:
        return _broken(f"the approval is larger than {MAX_APPROVAL_BYTES} bytes")
    try:
        info = cms.ContentInfo.load(p7s, strict=True)
        if info["content_type"].native != "signed_data":
            return _broken("the approval is not a CMS SignedData (RFC 5652 5.1)")
        signed = info["content"]
        if signed["encap_content_info"]["content"].native is not None:
            return _broken("the approval is not a detached signature: it carries content")
        if len(signed["signer_infos"]) != 1:
            return _broken("the approval must carry exactly one signer")
        certs = extract_certificate_info(signed)
        logger = logging.getLogger("pyhanko")
        level = logger.level
        logger.setLevel(logging.CRITICAL)
        try:
            status = asyncio.run(async_validate_detached_cms(
                vessel_bytes, signed, signer_validation_context=ValidationContext(
                    trust_roots=[], allow_fetching=False)))
        finally:
            logger.setLevel(level)
    except Exception as exc:  # noqa: BLE001 - any malformed approval is a broken approval
        return _broken(f"the approval cannot be read as a CMS signature "
                       f"({type(exc).__name__}: {exc})")
    cert = x509.load_der_x509_certificate(certs.signer_cert.dump())
    others = tuple(x509.load_der_x509_certificate(c.dump()) for c in certs.other_certs)
    when = status.signer_reported_dt
    if when is not None:
        when = (when.replace(tzinfo=dt.UTC) if when.tzinfo is None else when).astimezone(dt.UTC)
    intact = bool(status.intact and status.valid)
    problem = None
    if not intact:
        problem = "the approval does not sign these vessel data (they differ from the bytes signed)"
    elif when is None:
        intact, problem = False, "the approval states no signing time (RFC 5652 11.3)"
    return Approval(intact, _name(cert, NameOID.COMMON_NAME),
                    _name(cert, NameOID.ORGANIZATION_NAME), when, cert, others, problem)
