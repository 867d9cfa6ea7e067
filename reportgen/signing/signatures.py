"""The signatures of a document and what happened to the file after its first revision.

SPEC "Verification", point 1: every signature is cryptographically intact and covers its
whole revision; the revisions after the first (the rendered document) are exactly one per
signature, in role order (prepared, checked, reviewed); each may do nothing but fill its own
signature field with its signature and appearance; nothing follows the last signature (its
byte range ends at the end of the file); the first signature certifies the document with
DocMDP permission 2 and no other certifies (ISO 32000-2 12.8.2.2: a viewer honours P = 1 by
calling every later signature a breach, and allows one certification). The changes are judged by pyHanko's difference
analysis with a policy stricter than its default: no document information or XMP metadata
edits, no catalogue changes other than the form, no annotations, no other form fields.
ISO 32000-2:2020 7.5.6 (incremental updates), 12.8.1 (byte ranges).
"""

from __future__ import annotations

import asyncio
import datetime as dt
from dataclasses import dataclass, field

from cryptography import x509
from pyhanko.pdf_utils.reader import PdfFileReader
from pyhanko.sign.diff_analysis import (
    CatalogModificationRule,
    FormUpdatingRule,
    ModificationLevel,
    ObjectStreamRule,
    SigFieldModificationRule,
    StandardDiffPolicy,
    SuspiciousModification,
    XrefStreamRule,
)
from pyhanko.sign.validation import async_validate_pdf_signature
from pyhanko.sign.validation.status import SignatureCoverageLevel
from pyhanko_certvalidator import ValidationContext

from reportgen.docinfo import ROLES
from reportgen.errors import InputError

# Only the form may change, and in it only signature fields may be filled (their value and
# appearance); the cross-reference machinery of an incremental update is allowed, and so are
# the catalogue entries a certifying PAdES signature adds: /Perms (DocMDP, ISO 32000-2
# 12.8.4), /SigFlags of the form (12.7.3), /Extensions (the ESIC extension of ETSI EN 319 142-1, 5.4) and /Version.
STRICT_POLICY = StandardDiffPolicy(
    global_rules=[
        CatalogModificationRule(ignored_keys=frozenset({"/AcroForm", "/Perms", "/Extensions",
                                                        "/Version"})),
        XrefStreamRule().as_qualified(ModificationLevel.LTA_UPDATES),
        ObjectStreamRule().as_qualified(ModificationLevel.LTA_UPDATES),
    ],
    form_rule=FormUpdatingRule(field_rules=[SigFieldModificationRule()],
                               ignored_acroform_keys=frozenset({"/Fields", "/SigFlags"})),
)
# The first signature certifies the document, allowing form filling and signing only
# (ISO 32000-2 12.8.2.2.2, P = 2): what ``reportgen sign`` writes; no later one certifies.
CERTIFICATION_PERMISSION = 2
_ALLOWED = (ModificationLevel.NONE, ModificationLevel.LTA_UPDATES,
            ModificationLevel.FORM_FILLING)


@dataclass
class Signature:
    """One embedded signature, checked cryptographically (trust is decided elsewhere)."""

    field: str
    revision: int | None = None  # the revision the signature object belongs to
    intact: bool = False  # digest of the byte range and the signature value both good
    certificate: x509.Certificate | None = None
    others: tuple[x509.Certificate, ...] = ()
    signing_time: dt.datetime | None = None  # /M of the signature dictionary, UTC
    byte_range_end: int | None = None
    coverage: str | None = None
    docmdp: int | None = None  # the DocMDP permission when the signature certifies
    problems: list[str] = field(default_factory=list)


def _utc(value: dt.datetime | None) -> dt.datetime | None:
    if value is None:
        return None
    value = value.replace(tzinfo=dt.UTC) if value.tzinfo is None else value
    return value.astimezone(dt.UTC)


def _contents_problem(data: bytes, emb, len1: int, start2: int) -> str | None:
    """The bytes between the two parts of the byte range must be exactly the hexadecimal
    string of the signature (one case throughout) followed by zero padding: nothing in the
    file escapes the signatures (ISO 32000-2 12.8.1; RFC 5652 ContentInfo in DER)."""
    from asn1crypto import cms

    gap = data[len1:start2]
    digits = gap[1:-1]
    if not (gap[:1] == b"<" and gap[-1:] == b">" and
            (digits == digits.lower() or digits == digits.upper())):
        return "the signature's /Contents is not one hexadecimal string"
    try:
        raw = bytes.fromhex(digits.decode("ascii"))
        used = len(cms.ContentInfo.load(raw).dump())
    except (ValueError, UnicodeDecodeError):
        return "the signature's /Contents is not a hexadecimal CMS object"
    if raw != bytes(emb.pkcs7_content) or raw[used:].strip(b"\x00"):
        return "bytes after the CMS object in the signature's /Contents are not zero padding"
    return None


def _docmdp(sig_object) -> int | None:
    """The permission P of the signature's DocMDP transform (ISO 32000-2 12.8.1, table 255
    /Reference; 12.8.2.2), None when it does not certify; -1 when it cannot be read."""
    try:
        for ref in sig_object.get("/Reference", ()):
            ref = ref.get_object()
            if ref.get("/TransformMethod") == "/DocMDP":
                return int(ref["/TransformParams"].get_object().get("/P", 2))
    except Exception:  # noqa: BLE001 - unreadable permissions are not those reportgen writes
        return -1
    return None


def _one(emb, data: bytes) -> Signature:
    sig = Signature(field=str(emb.field_name))
    try:
        sig.revision = int(emb.signed_revision)
        _start, len1, start2, len2 = (int(v) for v in emb.byte_range)
        sig.byte_range_end = start2 + len2
        contents = _contents_problem(data, emb, len1, start2)
        if contents:
            sig.problems.append(contents)
        sig.certificate = x509.load_der_x509_certificate(emb.signer_cert.dump())
        sig.others = tuple(x509.load_der_x509_certificate(c.dump())
                           for c in emb.other_embedded_certs)
        context = ValidationContext(trust_roots=[], allow_fetching=False)
        status = asyncio.run(async_validate_pdf_signature(
            emb, signer_validation_context=context, skip_diff=True))
    except Exception as exc:  # noqa: BLE001 - any failure to validate is a bad signature
        text = " ".join(str(exc).split())[:200]
        sig.problems.append(f"the signature cannot be validated ({type(exc).__name__}: {text})")
        return sig
    sig.docmdp = _docmdp(emb.sig_object)
    sig.intact = bool(status.intact and status.valid) and not sig.problems
    sig.signing_time = _utc(status.signer_reported_dt)
    sig.coverage = status.coverage.name.lower() if status.coverage is not None else None
    if not status.intact:
        sig.problems.append("the signed bytes were changed after signing (digest differs)")
    elif not status.valid:
        sig.problems.append("the signature value does not verify with the signer's key")
    if status.coverage not in (SignatureCoverageLevel.ENTIRE_FILE,
                               SignatureCoverageLevel.ENTIRE_REVISION):
        sig.problems.append("the signature does not cover its whole revision")
    return sig


def read_signatures(reader: PdfFileReader, data: bytes) -> list[Signature]:
    """Every embedded signature, in the order of the revisions that hold them."""
    try:
        embedded = list(reader.embedded_signatures)
    except Exception as exc:  # noqa: BLE001 - a damaged signature dictionary, say
        text = " ".join(str(exc).split())[:200]
        raise InputError(f"cannot read the signatures: {type(exc).__name__}: {text}") from None
    found = [_one(emb, data) for emb in embedded]
    return sorted(found, key=lambda s: (s.revision is None, s.revision or 0))


def change_problems(reader: PdfFileReader, sigs: list[Signature], file_size: int,
                    first_revision_size: int | None) -> list[str]:
    """What breaks the rule "after the first revision, only signatures, in role order"."""
    problems: list[str] = []
    try:
        revisions = reader.xrefs.total_revisions
    except Exception:  # noqa: BLE001
        return ["the revisions of the file cannot be read"]
    if revisions != 1 + len(sigs):
        problems.append(f"the file has {revisions} revisions where the first and one per "
                        f"signature ({1 + len(sigs)}) are allowed: something was added that "
                        f"is not a signature")
    for index, sig in enumerate(sigs):
        expected = ROLES[index] if index < len(ROLES) else None
        if sig.field != expected:
            problems.append(f"signature {index + 1} is in the field '{sig.field}' where the "
                            f"next role is {expected or 'none'} (roles sign in the order "
                            f"{', '.join(ROLES)})")
        if index == 0 and sig.docmdp != CERTIFICATION_PERMISSION:
            problems.append(f"the first signature ({sig.field}) does not certify the document "
                            f"with DocMDP permission {CERTIFICATION_PERMISSION} (form filling "
                            f"and signing; ISO 32000-2 12.8.2.2) as reportgen signs it"
                            + ("" if sig.docmdp is None else f": permission {sig.docmdp}"))
        elif index > 0 and sig.docmdp is not None:
            problems.append(f"the {sig.field} signature certifies the document again (ISO "
                            f"32000-2 12.8.2.2: only the first signature certifies)")
        if sig.revision != index + 1:
            problems.append(f"the {sig.field} signature is not in revision {index + 1} of "
                            f"the file")
    if sigs and sigs[-1].byte_range_end != file_size:
        extra = file_size - (sigs[-1].byte_range_end or 0)
        problems.append(f"{extra} bytes follow the end of the last signature's range: "
                        f"appended after signing")
    if first_revision_size is not None and revisions > 1:
        try:
            end0 = reader.xrefs.get_xref_container_info(0).end_location
            if end0 > first_revision_size:
                problems.append("the first revision is longer than the rendered document")
        except Exception:  # noqa: BLE001
            problems.append("the first revision of the file cannot be located")
    if revisions > 1 and all(s.intact for s in sigs):
        problems.extend(_review(reader, sigs))
    elif revisions > 1:
        problems.append("the changes after the first revision were not analysed: a signature "
                        "is broken, so the file was altered after signing")
    return problems


def _review(reader: PdfFileReader, sigs: list[Signature]) -> list[str]:
    """pyHanko's difference analysis, strict policy, of each revision after the first
    against the one before it: revision k may fill the field of the k-th signature only."""
    problems = []
    for k, sig in enumerate(sigs, start=1):
        try:
            result = STRICT_POLICY.apply(old=reader.get_historical_resolver(k - 1),
                                         new=reader.get_historical_resolver(k),
                                         field_mdp_spec=None, doc_mdp=None)
        except SuspiciousModification as exc:
            text = " ".join(str(exc).split())[:300]
            problems.append(f"revision {k} ({sig.field}) changes more than its signature: "
                            f"{text}")
            continue
        except Exception as exc:  # noqa: BLE001
            problems.append(f"revision {k} ({sig.field}) cannot be analysed "
                            f"({type(exc).__name__})")
            continue
        if result.modification_level not in _ALLOWED:
            level = result.modification_level.name.lower().replace("_", " ")
            problems.append(f"revision {k} ({sig.field}) goes beyond signing ({level})")
        other = sorted(set(result.changed_form_fields) - {sig.field})
        if other:
            problems.append(f"revision {k} ({sig.field}) also changes the form fields "
                            f"{', '.join(other)}")
    return problems
