"""The rendering stack: the versions of everything that decides the bytes of a page.

A sheet records them in its document information (reportgen.report.render); `verify` compares
them with the running stack to decide between a byte-for-byte and a pixel comparison of the
pages (SPEC.md "Verification", point 4).
"""

from __future__ import annotations

import hashlib
from functools import lru_cache

from reportgen.report import fonts


@lru_cache(maxsize=1)
def rendering_stack() -> dict[str, str]:
    """Versions of everything that decides the bytes of a page: reportgen, WeasyPrint, pydyf,
    matplotlib, fontTools, Pango, whether HarfBuzz subsets the fonts, and the font files."""
    from importlib.metadata import version

    from weasyprint.text.ffi import harfbuzz_subset, pango

    from reportgen import __version__

    stack = {"reportgen": __version__}
    stack.update({name: version(name) for name in ("weasyprint", "pydyf", "matplotlib",
                                                    "fonttools")})
    stack["pango"] = str(pango.pango_version())
    stack["harfbuzz_subset"] = "yes" if harfbuzz_subset is not None else "no"
    stack["fonts"] = font_fingerprint()
    return stack


def font_fingerprint() -> str:
    """The first 16 hex digits of the SHA-256 of the sheet's font files, in the order of their
    file URIs."""
    digest = hashlib.sha256()
    for path in sorted(fonts.font_paths().values(), key=lambda p: p.as_uri()):
        digest.update(path.read_bytes())
    return "sha256:" + digest.hexdigest()[:16]
