"""Whom to trust: the ``--trust`` certificates and the rules of SPEC "Verification", point 2.

- A ``--trust`` certificate certifies itself. It certifies other certificates only when it is
  a certification authority: basicConstraints cA TRUE (RFC 5280 4.2.1.9) with a key usage
  extension that asserts keyCertSign (4.2.1.3). A self-signed end-entity certificate that
  "issued" another certificate therefore vouches for nothing but itself.
- The path from a signing certificate to such an authority is validated by
  pyhanko_certvalidator (RFC 5280 6.1: signatures, names, validity, basic constraints and key
  usage of the intermediates), and every authority on it is checked again here.
- A signing certificate must allow signatures: key usage digitalSignature or nonRepudiation
  (RFC 5280 4.2.1.3; an absent extension restricts nothing), and an extended key usage, when
  present, must allow document signing or any purpose (RFC 5280 4.2.1.12, RFC 9336).
- A certificate with a critical extension not understood here is rejected (RFC 5280 4.2);
  pyhanko_certvalidator applies the rule on a path, ``signing_usage_problems`` to the signer.
- Every certificate on the path must be valid at the signing time and at the time of
  verification. The second is the conservative reading: a PAdES B-B signature carries no
  trusted time, only the signer's own claim, so the certificate is validated at the current
  time as well (ETSI EN 319 102-1, 5.2.6 and 5.6.2.1: without a proof of existence the
  validation time is the current time).
"""

from __future__ import annotations

import asyncio
import datetime as dt
import logging
from collections.abc import Iterable, Sequence
from dataclasses import dataclass, field
from pathlib import Path

from cryptography import x509
from cryptography.x509.oid import ExtendedKeyUsageOID, ExtensionOID, ObjectIdentifier
from pyhanko_certvalidator import CertificateValidator, ValidationContext
from pyhanko_certvalidator.errors import PathBuildingError, PathValidationError

from reportgen.signing.identity import common_name, der, from_asn1, load_certificates, to_asn1

# Extended key usages that allow signing a document.
DOCUMENT_SIGNING_PURPOSES = {
    ObjectIdentifier("1.3.6.1.5.5.7.3.36"): "document signing (RFC 9336)",
    ExtendedKeyUsageOID.ANY_EXTENDED_KEY_USAGE: "any purpose (RFC 5280 4.2.1.12)",
}

_log_names = ("pyhanko_certvalidator",)


@dataclass(frozen=True)
class TrustStore:
    """The --trust certificates: each certifies itself; the authorities also certify others."""

    certificates: tuple[x509.Certificate, ...] = ()
    authorities: tuple[x509.Certificate, ...] = ()

    @property
    def direct(self) -> frozenset[bytes]:
        return frozenset(der(c) for c in self.certificates)


@dataclass
class Assessment:
    """What the trust rules say about one signing certificate."""

    trusted: bool = False
    how: str = ""  # "directly" | "through <authority>" | ""
    path: list[str] = field(default_factory=list)  # common names, signer first
    problems: list[str] = field(default_factory=list)


def is_authority(cert: x509.Certificate) -> bool:
    """CA:true (RFC 5280 4.2.1.9) and key usage with keyCertSign (4.2.1.3)."""
    try:
        basic = cert.extensions.get_extension_for_oid(ExtensionOID.BASIC_CONSTRAINTS).value
        usage = cert.extensions.get_extension_for_oid(ExtensionOID.KEY_USAGE).value
    except (x509.ExtensionNotFound, ValueError):
        return False
    return bool(basic.ca) and bool(usage.key_cert_sign)


def load_trust(paths: Iterable[Path]) -> TrustStore:
    certs: list[x509.Certificate] = []
    for path in paths:
        certs.extend(load_certificates(Path(path), "trusted certificate"))
    return TrustStore(tuple(certs), tuple(c for c in certs if is_authority(c)))


def signing_usage_problems(cert: x509.Certificate) -> list[str]:
    """Why the certificate's key may not sign documents (empty when it may); a critical
    extension not understood here rejects the certificate (RFC 5280 4.2)."""
    try:
        problems = [f"its critical extension {ext.oid.dotted_string} is not understood "
                    f"(RFC 5280 4.2: such a certificate is rejected)"
                    for ext in cert.extensions
                    if ext.critical and isinstance(ext.value, x509.UnrecognizedExtension)]
    except ValueError as exc:
        problems = [f"its extensions cannot be read: {exc}"]
    try:
        usage = cert.extensions.get_extension_for_oid(ExtensionOID.KEY_USAGE).value
        if not (usage.digital_signature or usage.content_commitment):
            problems.append("its key usage allows neither digitalSignature nor "
                            "nonRepudiation (RFC 5280 4.2.1.3)")
    except x509.ExtensionNotFound:
        pass
    except ValueError as exc:
        problems.append(f"its key usage extension cannot be read: {exc}")
    try:
        purposes = cert.extensions.get_extension_for_oid(ExtensionOID.EXTENDED_KEY_USAGE).value
        if not any(oid in DOCUMENT_SIGNING_PURPOSES for oid in purposes):
            named = ", ".join(getattr(oid, "_name", None) or oid.dotted_string
                              for oid in purposes)
            problems.append(f"its extended key usage ({named}) allows neither document "
                            f"signing nor any purpose (RFC 5280 4.2.1.12, RFC 9336)")
    except x509.ExtensionNotFound:
        pass
    except ValueError as exc:
        problems.append(f"its extended key usage extension cannot be read: {exc}")
    return problems


def validity_problem(cert: x509.Certificate, at: dt.datetime, when: str) -> str | None:
    """A message when ``at`` lies outside the certificate's validity (RFC 5280 4.1.2.5)."""
    start, end = cert.not_valid_before_utc, cert.not_valid_after_utc
    if at < start:
        return (f"certificate of {common_name(cert)} not yet valid "
                f"{when if when == 'now' else 'at ' + when} "
                f"(valid from {start:%Y-%m-%d %H:%M} UTC)")
    if at > end:
        return (f"certificate of {common_name(cert)} expired before {when} "
                f"(valid until {end:%Y-%m-%d %H:%M} UTC)")
    return None


def _validate_path(cert: x509.Certificate, others: Sequence[x509.Certificate],
                   authorities: Sequence[x509.Certificate],
                   moment: dt.datetime) -> list[x509.Certificate]:
    """The certification path, authority first, or PathValidationError/PathBuildingError."""
    context = ValidationContext(trust_roots=[to_asn1(c) for c in authorities],
                                other_certs=[to_asn1(c) for c in others],
                                moment=moment, allow_fetching=False,
                                revocation_mode="soft-fail")
    validator = CertificateValidator(to_asn1(cert), validation_context=context)
    loggers = [logging.getLogger(n) for n in _log_names]
    levels = [lg.level for lg in loggers]
    for lg in loggers:
        lg.setLevel(logging.CRITICAL)
    try:
        path = asyncio.run(validator.async_validate_path())
    finally:
        for lg, level in zip(loggers, levels, strict=True):
            lg.setLevel(level)
    return [from_asn1(c) for c in path.iter_certs(include_root=True)]


def assess(cert: x509.Certificate, others: Sequence[x509.Certificate], store: TrustStore,
           signing_time: dt.datetime | None, now: dt.datetime) -> Assessment:
    """Apply the rules of the module docstring to one signing certificate.

    ``others``: further certificates the signature carries (possible intermediates).
    """
    result = Assessment()
    if signing_time is None:
        result.problems.append("the signature states no signing time")
    result.problems.extend(f"the signing certificate: {p}" for p in signing_usage_problems(cert))
    if der(cert) in store.direct:
        path = [cert]
        result.how = "directly (it is one of the --trust certificates)"
    elif not store.authorities:
        result.problems.append(
            "not trusted: the certificate is not among the --trust certificates"
            + (" (none given)" if not store.certificates else
               ", and none of these is a certification authority that could vouch for it "
               "(CA:true with keyCertSign)"))
        result.path = [common_name(cert)]
        return result
    else:
        try:
            path = _validate_path(cert, others, store.authorities, signing_time or now)
        except (PathValidationError, PathBuildingError) as exc:
            result.problems.append(f"not trusted: no valid path to a --trust authority ({exc})")
            result.path = [common_name(cert)]
            return result
        except Exception as exc:  # noqa: BLE001 - a malformed certificate is distrust, too
            result.problems.append(f"not trusted: the certificate path cannot be checked "
                                   f"({type(exc).__name__}: {exc})")
            result.path = [common_name(cert)]
            return result
        path = list(reversed(path))  # signer first
        result.how = f"through {common_name(path[-1])}"
        for issuer in path[1:]:
            if not is_authority(issuer):
                result.problems.append(f"{common_name(issuer)} issues certificates without "
                                       f"CA:true and keyCertSign")
    result.path = [common_name(c) for c in path]
    for c in path:
        for at, when in ((signing_time, "the signing time"), (now, "now")):
            if at is not None:
                problem = validity_problem(c, at, when)
                if problem:
                    result.problems.append(problem)
    result.trusted = not result.problems
    return result
