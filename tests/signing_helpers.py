"""Certificates, raw signatures and tampered files for the signing tests.

Everything here is made with outside libraries only: certificates with `cryptography`
(RFC 5280 profiles built by hand, so that each test can make exactly the flaw it needs),
signatures with pyHanko directly (bypassing every refusal of ``reportgen sign``), and
incremental updates with pypdf or pyHanko.
"""

from __future__ import annotations

import datetime as dt
import io
from pathlib import Path

from cryptography import x509
from cryptography.hazmat.primitives import hashes, serialization
from cryptography.hazmat.primitives.asymmetric import ec
from cryptography.x509.oid import ExtendedKeyUsageOID, NameOID
from pyhanko.pdf_utils.incremental_writer import IncrementalPdfFileWriter
from pyhanko.sign import fields, signers
from pyhanko_certvalidator.registry import SimpleCertificateStore

NOW = dt.datetime.now(dt.UTC).replace(microsecond=0)
DAY = dt.timedelta(days=1)


def new_key() -> ec.EllipticCurvePrivateKey:
    return ec.generate_private_key(ec.SECP256R1())


def make_cert(name: str, key, *, issuer: tuple | None = None, ca: bool = False,
              cert_sign: bool = False, signing: bool = True, encipher: bool = False,
              eku: list | None = None, not_before: dt.datetime | None = None,
              not_after: dt.datetime | None = None, basic: bool = True,
              key_usage: bool = True) -> x509.Certificate:
    """A certificate for ``name``: self-signed, or issued by ``issuer`` = (cert, key)."""
    subject = x509.Name([x509.NameAttribute(NameOID.COMMON_NAME, name),
                         x509.NameAttribute(NameOID.ORGANIZATION_NAME, "Invented test body")])
    issuer_name, issuer_key = (issuer[0].subject, issuer[1]) if issuer else (subject, key)
    builder = (x509.CertificateBuilder().subject_name(subject).issuer_name(issuer_name)
               .public_key(key.public_key()).serial_number(x509.random_serial_number())
               .not_valid_before(not_before or NOW - DAY)
               .not_valid_after(not_after or NOW + 30 * DAY))
    if basic:
        builder = builder.add_extension(x509.BasicConstraints(ca=ca, path_length=None),
                                        critical=True)
    if key_usage:
        builder = builder.add_extension(x509.KeyUsage(
            digital_signature=signing, content_commitment=signing, key_encipherment=encipher,
            data_encipherment=False, key_agreement=False, key_cert_sign=cert_sign,
            crl_sign=cert_sign, encipher_only=False, decipher_only=False), critical=True)
    if eku:
        builder = builder.add_extension(x509.ExtendedKeyUsage(eku), critical=False)
    builder = builder.add_extension(
        x509.SubjectKeyIdentifier.from_public_key(key.public_key()), critical=False)
    builder = builder.add_extension(
        x509.AuthorityKeyIdentifier.from_issuer_public_key(issuer_key.public_key()),
        critical=False)
    return builder.sign(issuer_key, hashes.SHA256())


SERVER_AUTH = [ExtendedKeyUsageOID.SERVER_AUTH]


def write_identity(folder: Path, key, cert: x509.Certificate,
                   chain: tuple = ()) -> tuple[Path, Path]:
    folder.mkdir(parents=True, exist_ok=True)
    key_path, cert_path = folder / "key.pem", folder / "cert.pem"
    key_path.write_bytes(key.private_bytes(serialization.Encoding.PEM,
                                           serialization.PrivateFormat.PKCS8,
                                           serialization.NoEncryption()))
    cert_path.write_bytes(b"".join(c.public_bytes(serialization.Encoding.PEM)
                                   for c in (cert, *chain)))
    return key_path, cert_path


def cert_file(folder: Path, cert: x509.Certificate, name: str = "cert.pem") -> Path:
    folder.mkdir(parents=True, exist_ok=True)
    path = folder / name
    path.write_bytes(cert.public_bytes(serialization.Encoding.PEM))
    return path


class KeepMetadataWriter(IncrementalPdfFileWriter):
    """pyHanko's incremental writer without its /Info and XMP stamping (as reportgen signs)."""

    def _update_meta(self) -> None:
        return None


def raw_sign(data: bytes, field: str, key, cert: x509.Certificate, chain: tuple = (), *,
             certify: bool = False, keep_metadata: bool = True, before=None) -> bytes:
    """Sign ``field`` with pyHanko directly: none of reportgen's refusals apply.

    ``before(writer)``: a change made in the same incremental update as the signature.
    """
    from asn1crypto import keys as asn1_keys
    from asn1crypto import x509 as asn1_x509

    def asn1(c):
        return asn1_x509.Certificate.load(c.public_bytes(serialization.Encoding.DER))

    registry = SimpleCertificateStore()
    registry.register_multiple(asn1(c) for c in chain)
    signer = signers.SimpleSigner(
        signing_cert=asn1(cert), cert_registry=registry,
        signing_key=asn1_keys.PrivateKeyInfo.load(key.private_bytes(
            serialization.Encoding.DER, serialization.PrivateFormat.PKCS8,
            serialization.NoEncryption())))
    writer_cls = KeepMetadataWriter if keep_metadata else IncrementalPdfFileWriter
    writer = writer_cls(io.BytesIO(data), strict=False)
    if before is not None:
        before(writer)
    meta = signers.PdfSignatureMetadata(field_name=field, subfilter=fields.SigSeedSubFilter.PADES,
                                        md_algorithm="sha256", certify=certify,
                                        docmdp_permissions=fields.MDPPerm.FILL_FORMS)
    out = signers.PdfSigner(meta, signer=signer).sign_pdf(writer, existing_fields_only=True,
                                                          output=io.BytesIO())
    return out.getvalue()


def pypdf_update(data: bytes, change) -> bytes:
    """An incremental update made by pypdf: ``change(writer)`` then write (ISO 32000-2
    7.5.6: the original bytes stay as they are, the update is appended)."""
    from pypdf import PdfWriter

    writer = PdfWriter(io.BytesIO(data), incremental=True)
    change(writer)
    out = io.BytesIO()
    writer.write(out)
    return out.getvalue()


def sheet_with_painted_verdict(monkeypatch, condition: Path) -> bytes:
    """The sheet of a failing condition rendered with its verdict words changed before
    signing ("does not meet" -> "meets after all, despite"): a forger's page."""
    from reportgen.inputs import load_case
    from reportgen.pipeline import evaluate
    from reportgen.report import render

    original = render.sheet_html
    monkeypatch.setattr(render, "sheet_html", lambda case, results: original(
        case, results).replace("does not meet", "meets after all, despite"))
    case = load_case(condition)
    edited = render.render_sheet(case, evaluate(case))
    monkeypatch.setattr(render, "sheet_html", original)
    return edited
