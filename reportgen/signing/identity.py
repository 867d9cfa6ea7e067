"""Keys and certificates: the demo identity (``keygen``) and one thin wrapper over the
loaders of `cryptography` (PEM, DER, PKCS#12) so that every failure is one clear message.

Certificates follow RFC 5280; PKCS#12 files RFC 7292; private keys PKCS#8 (RFC 5958).
"""

from __future__ import annotations

import datetime as dt
import unicodedata
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from asn1crypto import x509 as asn1_x509
from cryptography import x509
from cryptography.hazmat.primitives import hashes, serialization
from cryptography.hazmat.primitives.asymmetric import ec
from cryptography.hazmat.primitives.serialization import pkcs12
from cryptography.x509.oid import NameOID

from reportgen.errors import InputError
from reportgen.files import check_output, make_folder, read_input, write_atomic
from reportgen.printable import printable  # noqa: F401  (signing's modules name it here)

DEMO_ORGANISATION = "reportgen demo identity - not for real use"
DEMO_VALIDITY = dt.timedelta(days=365)
MAX_PASSPHRASE_BYTES = 4096
MAX_COMMON_NAME = 64  # characters: RFC 5280 Appendix A.1, ub-common-name INTEGER ::= 64
MAX_CERTIFICATE_BYTES = 1024 * 1024  # a certificate or key file: 1 MiB is generous


def utc_now() -> dt.datetime:
    """The current time, UTC, whole seconds."""
    return dt.datetime.now(dt.UTC).replace(microsecond=0)


@dataclass(frozen=True)
class Identity:
    """A private key with its certificate and any further certificates (its chain)."""

    key: Any
    certificate: x509.Certificate
    chain: tuple[x509.Certificate, ...]
    origin: str  # the file the identity came from, for messages


def common_name(cert: x509.Certificate) -> str:
    """The subject's common name (RFC 5280 4.1.2.6), else the whole subject."""
    try:
        names = cert.subject.get_attributes_for_oid(NameOID.COMMON_NAME)
    except ValueError:
        names = []
    return str(names[0].value) if names else cert.subject.rfc4514_string()


def organisation(cert: x509.Certificate) -> str | None:
    try:
        names = cert.subject.get_attributes_for_oid(NameOID.ORGANIZATION_NAME)
    except ValueError:
        return None
    return str(names[0].value) if names else None


def der(cert: x509.Certificate) -> bytes:
    return cert.public_bytes(serialization.Encoding.DER)


def to_asn1(cert: x509.Certificate) -> asn1_x509.Certificate:
    """The same certificate for pyHanko (asn1crypto)."""
    return asn1_x509.Certificate.load(der(cert))


def from_asn1(cert: asn1_x509.Certificate) -> x509.Certificate:
    return x509.load_der_x509_certificate(cert.dump())


def fingerprint(cert: x509.Certificate) -> str:
    """SHA-256 of the DER certificate, hex (the usual certificate fingerprint)."""
    return cert.fingerprint(hashes.SHA256()).hex()


def read_passphrase(path: Path | None) -> bytes | None:
    """The passphrase in a file (its first line ending removed); None without a file."""
    if path is None:
        return None
    return read_input(path, "passphrase file", MAX_PASSPHRASE_BYTES).rstrip(b"\r\n")


def load_certificates(path: Path, what: str = "certificate") -> list[x509.Certificate]:
    """Every certificate of a PEM file (one or more) or a DER file."""
    data = read_input(path, what, MAX_CERTIFICATE_BYTES)
    try:
        if b"-----BEGIN" in data:
            certs = x509.load_pem_x509_certificates(data)
        else:
            certs = [x509.load_der_x509_certificate(data)]
    except ValueError as exc:
        raise InputError(f"{path}: not a certificate (PEM or DER): {exc}") from None
    return certs


def _load_key(path: Path, passphrase: bytes | None) -> Any:
    data = read_input(path, "private key", MAX_CERTIFICATE_BYTES)
    try:
        if b"-----BEGIN" in data:
            return serialization.load_pem_private_key(data, passphrase)
        return serialization.load_der_private_key(data, passphrase)
    except TypeError as exc:
        raise InputError(f"{path}: {exc} (passphrase missing or not needed)") from None
    except (ValueError, NotImplementedError) as exc:
        raise InputError(f"{path}: cannot read the private key (wrong passphrase or not a "
                         f"key): {exc}") from None


def _public_der(obj: Any) -> bytes:
    return obj.public_bytes(serialization.Encoding.DER,
                            serialization.PublicFormat.SubjectPublicKeyInfo)


def load_identity(key_path: Path | None, cert_path: Path | None, p12_path: Path | None,
                  passphrase: bytes | None, command: str = "sign") -> Identity:
    """A signing identity from --key with --cert (PEM or DER) or from --p12 (PKCS#12)."""
    if p12_path is not None:
        if key_path is not None or cert_path is not None:
            raise InputError(f"{command}: give either --p12 or --key with --cert, not both")
        data = read_input(p12_path, "PKCS#12 identity", MAX_CERTIFICATE_BYTES)
        try:
            key, cert, extra = pkcs12.load_key_and_certificates(data, passphrase)
        except (ValueError, TypeError) as exc:
            raise InputError(f"{p12_path}: cannot open the PKCS#12 identity (wrong passphrase "
                             f"or not a PKCS#12 file): {exc}") from None
        if key is None or cert is None:
            raise InputError(f"{p12_path}: the PKCS#12 file holds no key with its certificate")
        identity = Identity(key, cert, tuple(extra or ()), str(p12_path))
    else:
        if key_path is None or cert_path is None:
            raise InputError(f"{command}: give --key and --cert, or --p12")
        key = _load_key(key_path, passphrase)
        certs = load_certificates(cert_path)
        identity = Identity(key, certs[0], tuple(certs[1:]), str(key_path))
    if _public_der(identity.key.public_key()) != _public_der(identity.certificate.public_key()):
        raise InputError(f"{identity.origin}: the private key does not belong to the "
                         f"certificate")
    return identity


def _demo_certificate(name: str, key: ec.EllipticCurvePrivateKey, now: dt.datetime,
                      organisation_name: str) -> x509.Certificate:
    """A self-signed end-entity certificate for ``name`` (RFC 5280), valid one year from
    ``now``: not a CA (4.2.1.9), key usage digitalSignature and nonRepudiation (4.2.1.3)."""
    subject = x509.Name([
        x509.NameAttribute(NameOID.COMMON_NAME, name),
        x509.NameAttribute(NameOID.ORGANIZATION_NAME, organisation_name),
    ])
    public = key.public_key()
    return (
        x509.CertificateBuilder()
        .subject_name(subject)
        .issuer_name(subject)
        .public_key(public)
        .serial_number(x509.random_serial_number())
        .not_valid_before(now)
        .not_valid_after(now + DEMO_VALIDITY)
        .add_extension(x509.BasicConstraints(ca=False, path_length=None), critical=True)
        .add_extension(
            x509.KeyUsage(
                digital_signature=True, content_commitment=True, key_encipherment=False,
                data_encipherment=False, key_agreement=False, key_cert_sign=False,
                crl_sign=False, encipher_only=False, decipher_only=False,
            ),
            critical=True,
        )
        .add_extension(x509.SubjectKeyIdentifier.from_public_key(public), critical=False)
        .add_extension(x509.AuthorityKeyIdentifier.from_issuer_public_key(public),
                       critical=False)
        .sign(key, hashes.SHA256())
    )


def keygen(name: str, out_dir: Path, passphrase: bytes | None = None,
           force: bool = False) -> list[Path]:
    """Make a demo signing identity: EC P-256 key and a self-signed certificate for one year.

    Writes out_dir/key.pem (PKCS#8, encrypted with ``passphrase`` when given), cert.pem and
    identity.p12 (key + certificate, same passphrase). The subject's organisation says the
    identity is not for real use. Existing files are kept unless ``force``.
    Returns the written paths.
    """
    name = (name or "").strip()
    if not name:
        raise InputError("keygen: --name must not be empty")
    if any(ord(ch) < 32 or ord(ch) == 127 for ch in name):
        raise InputError("keygen: --name must not hold control characters")
    if len(name) > MAX_COMMON_NAME:
        raise InputError(f"keygen: --name holds {len(name)} characters; a certificate's "
                         f"common name holds at most {MAX_COMMON_NAME} (RFC 5280, "
                         f"ub-common-name)")
    if passphrase is not None and not passphrase:
        raise InputError("keygen: the passphrase must not be empty")
    out_dir = Path(out_dir)
    paths = [out_dir / "key.pem", out_dir / "cert.pem", out_dir / "identity.p12"]
    if out_dir.is_dir():
        for path in paths:
            check_output(path, force)
    make_folder(out_dir)
    key = ec.generate_private_key(ec.SECP256R1())
    cert = _demo_certificate(name, key, utc_now(), DEMO_ORGANISATION)
    encryption: serialization.KeySerializationEncryption = (
        serialization.BestAvailableEncryption(passphrase)
        if passphrase else serialization.NoEncryption()
    )
    key_pem = key.private_bytes(serialization.Encoding.PEM, serialization.PrivateFormat.PKCS8,
                                encryption)
    cert_pem = cert.public_bytes(serialization.Encoding.PEM)
    p12 = pkcs12.serialize_key_and_certificates(name.encode("utf-8"), key, cert, None,
                                                encryption)
    write_atomic(paths[0], key_pem, force=force, mode=0o600)
    write_atomic(paths[1], cert_pem, force=force)
    write_atomic(paths[2], p12, force=force, mode=0o600)
    return paths


# Letters of these scripts look alike (Latin "A", Greek "Α", Cyrillic "А"): a name mixing them
# is a mixed-script confusable (Unicode Technical Standard #39, 5.1 and 5.2).
LOOKALIKE_SCRIPTS = ("LATIN", "GREEK", "CYRILLIC")


def _plain(name: str) -> str:
    """The name in canonical composition (NFC, Unicode Standard Annex #15: the same text,
    whatever the byte form), without leading, trailing or repeated ASCII spaces."""
    return " ".join(part for part in unicodedata.normalize("NFC", name).split(" ") if part)


def _unusual(name: str) -> list[str]:
    """The characters that have no place in a person's name: control, format, private-use,
    unassigned and surrogate characters (category C) and every separator but the ASCII space
    (category Z: no-break, en, ideographic space, line and paragraph separators)."""
    return sorted({f"U+{ord(ch):04X}" for ch in name
                   if ch != " " and unicodedata.category(ch)[0] in "CZ"})


def _scripts(name: str) -> list[str]:
    found = {unicodedata.name(ch, "").split(" ")[0] for ch in name if ch.isalpha()}
    return sorted(found & set(LOOKALIKE_SCRIPTS))


def name_problem(certificate_name: str, sheet_name: str) -> str | None:
    """Why a certificate's name is not the name the sheet gives for a role; None when it is.

    The rule is the conservative one (SPEC "Verification", point 3): the two names are the
    same text, after canonical normalisation (NFC) and the folding of ASCII spaces only. A
    difference in letter case, a compatibility look-alike (full-width letters, ligatures:
    NFKC would fold them), another script's look-alike letter, an invisible or control
    character or another kind of space is a different name; and a name that mixes Latin,
    Greek or Cyrillic letters, or holds such characters, matches nothing, even itself (it
    cannot be told from the name it imitates when printed). "A. Other" does not match
    "B. Other" nor "A. Other, master".
    """
    for whose, name in (("certificate", certificate_name), ("sheet", sheet_name)):
        odd = _unusual(name)
        if odd:
            return (f"the {whose}'s name holds invisible, control or unusual space "
                    f"characters ({', '.join(odd)})")
        scripts = _scripts(name)
        if len(scripts) > 1:
            return (f"the {whose}'s name mixes {' and '.join(s.lower() for s in scripts)} "
                    f"letters, which look alike (Unicode Technical Standard #39)")
    mine, theirs = _plain(certificate_name), _plain(sheet_name)
    if not theirs:
        return "the sheet's name is empty"
    if mine == theirs:
        return None
    if mine.casefold() == theirs.casefold():
        return "the names differ in letter case"
    if unicodedata.normalize("NFKC", mine) == unicodedata.normalize("NFKC", theirs):
        return "the names differ in look-alike characters (Unicode compatibility forms)"
    return "the names differ"


def person_key(name: str) -> str:
    """A name folded as far as it goes (NFKC, case, every space): two certificates whose names
    give the same key are taken for the same person (the conservative direction here)."""
    return " ".join(unicodedata.normalize("NFKC", name).casefold().split())


def names_match(certificate_name: str, sheet_name: str) -> bool:
    """Whether a certificate's name is the name the sheet gives for a role (``name_problem``
    finds nothing)."""
    return name_problem(certificate_name, sheet_name) is None
