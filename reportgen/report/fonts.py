"""The sheet's typeface: DejaVu Sans as shipped inside matplotlib (a dependency), so a sheet
looks and embeds the same on every machine, whatever fonts the system has.

WeasyPrint embeds the subsets it uses, as PDF/A requires. The family gets a name of its own
so that a system copy of DejaVu Sans can never be picked instead.
"""

from __future__ import annotations

from functools import lru_cache
from pathlib import Path

import matplotlib
import weasyprint
from weasyprint.text.fonts import FontConfiguration

FAMILY = "Sheet Sans"
TYPEFACE = "DejaVu Sans"  # the typeface FAMILY names, for messages
_FILES = {"normal": "DejaVuSans.ttf", "bold": "DejaVuSans-Bold.ttf"}
MATPLOTLIB_FAMILY = TYPEFACE  # the name matplotlib writes into SVG text styles

LAYOUT_CHARACTERS = frozenset("\n\r\t")  # laid out as white space, drawn with no glyph


def font_paths() -> dict[str, Path]:
    folder = Path(matplotlib.get_data_path()) / "fonts" / "ttf"
    return {weight: folder / name for weight, name in _FILES.items()}


def font_face_css() -> str:
    """@font-face rules for the regular and bold weights of FAMILY."""
    return "".join(
        f'@font-face {{ font-family: "{FAMILY}"; font-weight: {weight}; '
        f'src: url("{path.as_uri()}"); }}\n'
        for weight, path in font_paths().items())


@lru_cache(maxsize=1)
def printable_characters() -> frozenset[str]:
    """The characters that both weights of FAMILY have a glyph for (their Unicode cmaps)."""
    from fontTools.ttLib import TTFont  # loaded with WeasyPrint, which subsets with it

    cmaps = [set(TTFont(path, lazy=True).getBestCmap()) for path in font_paths().values()]
    return frozenset(map(chr, set.intersection(*cmaps))) | LAYOUT_CHARACTERS


def unprintable(text: str) -> list[str]:
    """The characters of `text` that FAMILY cannot draw, in code point order. WeasyPrint would
    draw each as an empty box (.notdef) and leave the PDF's text unreadable to extraction."""
    return sorted(set(text) - printable_characters())


@lru_cache(maxsize=1)
def font_config() -> FontConfiguration:
    """One WeasyPrint font configuration for the process (fonts are loaded once)."""
    return FontConfiguration()


def stylesheet(css_text: str) -> weasyprint.CSS:
    """A WeasyPrint stylesheet with FAMILY defined ahead of `css_text`."""
    return weasyprint.CSS(string=font_face_css() + css_text, font_config=font_config())


def svg_with_sheet_font(svg: str) -> str:
    """SVG text from matplotlib set in FAMILY (same glyphs, the sheet's embedded subset)."""
    return svg.replace(f"font-family: '{MATPLOTLIB_FAMILY}'", f"font-family: '{FAMILY}'")
