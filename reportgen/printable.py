"""Texts from files and certificates made safe to print on a terminal or in a report.

A name in an input file or a certificate may hold control characters (an escape sequence that
rewrites the screen, a line break that forges a line of the verdict, a bidirectional override
that reverses what follows). Every such text is printed with those characters shown as
escapes, never acted on (SPEC.md "Verification", point 7, applied to every readable output).
"""

from __future__ import annotations

import unicodedata


def _shown(ch: str) -> str:
    code = ord(ch)
    return f"\\x{code:02x}" if code < 256 else f"\\u{code:04x}"


def _unsafe(ch: str) -> bool:
    code = ord(ch)
    return (code < 32 or 127 <= code < 160 or code in (0x2028, 0x2029)
            or unicodedata.category(ch) in ("Cf", "Cs", "Co"))


def printable(text: object) -> str:
    """``text`` with every control character (C0, DEL, C1), the Unicode line and paragraph
    separators and the format characters (bidirectional overrides, zero-width marks) escaped."""
    return "".join(_shown(ch) if _unsafe(ch) else ch for ch in str(text))


def printable_lines(text: object) -> str:
    """As `printable`, keeping the line breaks of a message that we wrote on several lines
    (each line's text is still escaped)."""
    return "\n".join(printable(line) for line in str(text).split("\n"))
