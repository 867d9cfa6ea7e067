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
_FILES = {"normal": "DejaVuSans.ttf", "bold": "DejaVuSans-Bold.ttf"}
MATPLOTLIB_FAMILY = "DejaVu Sans"  # the name matplotlib writes into SVG text styles


def font_face_css() -> str:
    """@font-face rules for the regular and bold weights of FAMILY."""
    folder = Path(matplotlib.get_data_path()) / "fonts" / "ttf"
    return "".join(
        f'@font-face {{ font-family: "{FAMILY}"; font-weight: {weight}; '
        f'src: url("{(folder / name).as_uri()}"); }}\n'
        for weight, name in _FILES.items())


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
