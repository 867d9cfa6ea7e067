"""Signed reportgen documents: identities, signing, verification, vessel data approval.

identity.py   keys and certificates (keygen; loading PEM, DER, PKCS#12)
trust.py      whom to trust: --trust certificates, CA rights, key usage, validity
sheetfile.py  reading a signed document (embedded files, fields, kind)
recompute.py  the kinds of document and how each is made again from its inputs
signatures.py each signature's integrity and the changes after the first revision
pages.py      the first revision against a fresh rendering (bytes, else pixels)
sign.py       signing one role
verify.py     verification (SPEC "Verification", points 1 to 7)
report.py     the verification report as text
approve.py    approval of vessel data (detached CMS signature) and extraction of inputs
"""

from reportgen.signing.identity import keygen
from reportgen.signing.sign import sign_document
from reportgen.signing.verify import verify_document

__all__ = ["keygen", "sign_document", "verify_document"]
