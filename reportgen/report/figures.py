"""The two figures of the calculation sheet, drawn with matplotlib as SVG text.

No pyplot: each figure is a bare ``matplotlib.figure.Figure`` saved by the SVG
backend, so no GUI backend or global figure state is involved.

Angles are in degrees, levers in metres, areas in m·rad throughout this module.
Every word drawn comes from the ``labels`` mapping (templates/labels.j2); the
functions here only place values. The SVG bytes are stable for equal inputs: a
fixed ``svg.hashsalt``, no date metadata, text kept as SVG text in DejaVu Sans,
renamed to the sheet's own family (reportgen.report.fonts), so WeasyPrint sets it in the
sheet's embedded font subset, as PDF/A requires; faster than glyphs drawn as paths.
"""

from __future__ import annotations

import io
import xml.etree.ElementTree as ET
from collections.abc import Mapping

import matplotlib
import numpy as np
from matplotlib.figure import Figure

from reportgen.report.fonts import MATPLOTLIB_FAMILY, svg_with_sheet_font
from reportgen.results import Results
from reportgen.stability import curve_towards_side

RAD_DEG = 57.29577951308232  # one radian in degrees: the GM slope reaches GM here

_RC = {
    "svg.hashsalt": "reportgen-sheet",
    "svg.fonttype": "none",
    "font.family": MATPLOTLIB_FAMILY,
    "font.size": 7.5,
    "axes.linewidth": 0.6,
    "hatch.linewidth": 0.5,
    "lines.linewidth": 1.0,
    "xtick.major.width": 0.5,
    "ytick.major.width": 0.5,
    "xtick.labelsize": 7,
    "ytick.labelsize": 7,
    "legend.fontsize": 6.5,
    "legend.frameon": True,
    "legend.edgecolor": "black",
    "legend.fancybox": False,
}

FIGURE_SIZE_IN = (7.0, 3.2)  # width, height in inches: the sheet's text width
NEGATIVE_SHARE = 0.6  # GZ figure: lowest lever drawn, as a share of the highest
STEP_DEG = 0.25  # resampling step of the shaded areas; the data grid is 1°


_SVG_NS = "http://www.w3.org/2000/svg"
ET.register_namespace("", _SVG_NS)
ET.register_namespace("xlink", "http://www.w3.org/1999/xlink")


def lean_svg(svg: str) -> str:
    """The same drawing with fewer elements for WeasyPrint to walk: matplotlib's metadata
    dropped and every group that carries nothing but an id (no style, transform or clip)
    replaced by its children, in order. Each element costs WeasyPrint a graphics state and
    a style cascade; a sheet's two figures lose about half their elements."""
    root = ET.fromstring(svg)
    group, metadata = f"{{{_SVG_NS}}}g", f"{{{_SVG_NS}}}metadata"

    def flatten(element: ET.Element) -> None:
        children = []
        for child in element:
            flatten(child)
            if child.tag == group and set(child.attrib) <= {"id"}:
                children.extend(child)
            elif child.tag != metadata:
                children.append(child)
        element[:] = children

    flatten(root)
    return ET.tostring(root, encoding="unicode")


def _svg(fig: Figure) -> str:
    buffer = io.StringIO()
    with matplotlib.rc_context(_RC):
        fig.savefig(buffer, format="svg", metadata={"Date": None})
    return lean_svg(svg_with_sheet_font(buffer.getvalue()))


def _new_axes(labels: Mapping[str, str], side_word: str):
    with matplotlib.rc_context(_RC):
        fig = Figure(figsize=FIGURE_SIZE_IN)
        fig.subplots_adjust(left=0.09, right=0.985, top=0.975, bottom=0.25)
        ax = fig.add_subplot()
        ax.set_xlabel(labels["heel_axis"].format(side=side_word))
        ax.set_ylabel(labels["gz_axis"])
        ax.grid(True, color="0.8", linewidth=0.4)
        ax.axhline(0.0, color="black", linewidth=0.6)
    return fig, ax


def _vertical_marker(ax, angle_deg: float, text: str, style, at_top: bool) -> None:
    """A vertical line at ``angle_deg`` with its label written along it, top or bottom."""
    ax.axvline(angle_deg, color="black", linestyle=style, linewidth=0.7)
    ax.text(angle_deg, 0.98 if at_top else 0.02, text, transform=ax.get_xaxis_transform(),
            rotation=90, va="top" if at_top else "bottom", ha="right", fontsize=6.5,
            bbox={"facecolor": "white", "edgecolor": "none", "pad": 0.6})


def _legend_below(ax) -> None:
    ax.legend(loc="upper center", bbox_to_anchor=(0.5, -0.15), ncol=3, handlelength=3.0,
              borderaxespad=0.0)


def gz_figure_svg(results: Results, labels: Mapping[str, str]) -> str:
    """The GZ curve with the IS Code 2008 Part A 2.2 criteria marked, as SVG text.

    Shaded: the areas 0°–30° and 30°–min(40°, θf) (2.2.1), in two hatchings that
    stay distinct in black and white. Lines: the initial GM slope reaching GM at
    57.3° (one radian), deck edge immersion, flooding angle θf, maximum GZ.
    """
    side = results.angles.side
    with matplotlib.rc_context(_RC):
        fig, ax = _new_axes(labels, labels[f"side_{side}"])
        heel, lever = curve_towards_side(results.gz.heel, results.gz.gz, side)
        keep = heel >= 0.0
        heel, lever = heel[keep], lever[keep]
        fine = np.linspace(0.0, heel[-1], round(float(heel[-1]) / STEP_DEG) + 1)
        fine_gz = np.interp(fine, heel, lever)

        flooding = results.angles.flooding
        upper = min(40.0, flooding) if flooding is not None else 40.0
        first = fine <= 30.0
        second = (fine >= 30.0) & (fine <= upper)
        ax.fill_between(fine, 0.0, fine_gz, where=first, facecolor="white", edgecolor="black",
                        hatch="////", linewidth=0.0, label=labels["area_0_30"])
        ax.fill_between(fine, 0.0, fine_gz, where=second, facecolor="white",
                        edgecolor="0.35", hatch="\\\\\\\\", linewidth=0.0,
                        label=labels["area_30_40"].format(upper=f"{upper:.1f}"))
        ax.plot(heel, lever, color="black", linewidth=1.3, label=labels["gz_curve"])

        gm = results.hydrostatics.gm_fluid
        ax.plot([0.0, RAD_DEG], [0.0, gm], color="black", linestyle="--", linewidth=0.8,
                label=labels["gm_slope"])
        ax.plot([RAD_DEG, RAD_DEG], [0.0, gm], color="black", linestyle=":", linewidth=0.8)
        ax.annotate(labels["gm_at_rad"].format(gm=f"{gm:.3f}"), (RAD_DEG, gm),
                    xytext=(-3, 3), textcoords="offset points", ha="right", fontsize=6.5,
                    bbox={"facecolor": "white", "edgecolor": "none", "pad": 0.6})

        angles = results.angles
        if angles.deck_edge is not None:
            _vertical_marker(ax, angles.deck_edge,
                             labels["deck_edge"].format(angle=f"{angles.deck_edge:.1f}"),
                             "-.", False)
        if flooding is not None and flooding <= heel[-1]:
            _vertical_marker(ax, flooding, labels["flooding"].format(angle=f"{flooding:.1f}"),
                             (0, (5, 2, 1, 2, 1, 2)), False)
        if angles.gz_max is not None:
            gz_max = float(np.interp(angles.gz_max, heel, lever))
            ax.plot([angles.gz_max], [gz_max], marker="o", markersize=4,
                    markerfacecolor="white", markeredgecolor="black", linestyle="none")
            ax.annotate(labels["gz_max"].format(gz=f"{gz_max:.3f}",
                                                angle=f"{angles.gz_max:.1f}"),
                        (angles.gz_max, gz_max), xytext=(0, 6), textcoords="offset points",
                        ha="center", fontsize=6.5,
                        bbox={"facecolor": "white", "edgecolor": "none", "pad": 0.6})
        ax.set_xlim(0.0, heel[-1])
        top = max(float(lever.max()), gm, 0.05) * 1.22
        # negative levers are shown down to 60 % of the positive range, so that the region
        # the criteria read stays legible (the GZ table prints every value); a curve with no
        # positive lever at all is shown whole
        bottom = (max(min(0.0, float(lever.min())) * 1.05, -NEGATIVE_SHARE * top)
                  if float(lever.max()) > 0.0 else float(lever.min()) * 1.05)
        ax.set_ylim(min(bottom, -0.02 * top), top)
        ax.set_xticks(np.arange(0.0, heel[-1] + 0.1, 10.0))
        _legend_below(ax)
        return _svg(fig)


def weather_figure_svg(results: Results, labels: Mapping[str, str]) -> str:
    """The severe wind and rolling diagram (IS Code 2008 Part A 2.3, Fig. 2.3.1), as SVG.

    GZ, the steady wind lever lw1 and the gust lever lw2 (constant with heel), area a
    (from θ0 − θ1 to the first intercept of lw2) and area b (from there to θ2),
    shaded in two hatchings and labelled; θ0, θ0 − θ1 and θ2 marked.
    """
    side = results.angles.side
    weather = results.weather
    with matplotlib.rc_context(_RC):
        fig, ax = _new_axes(labels, labels[f"side_{side}"])
        heel, lever = curve_towards_side(results.gz.heel, results.gz.gz, side)
        start = weather.theta_start  # None where θ0 or θ1 does not exist
        theta2 = weather.theta2
        lo = max(float(heel[0]), np.floor(((start if start is not None else -25.0) - 5.0)
                                          / 5.0) * 5.0)
        # θ2 is None where area b does not exist: show the curve to 60° then
        ends = [theta2 + 10.0 if theta2 is not None else 60.0] + (
            [weather.thetac + 5.0] if weather.thetac else [])
        hi = min(float(heel[-1]), np.ceil(max(ends) / 5.0) * 5.0)
        fine = np.linspace(lo, hi, round(float(hi - lo) / STEP_DEG) + 1)
        fine_gz = np.interp(fine, heel, lever)
        lw1, lw2 = weather.lw1, weather.lw2

        cross = weather.theta_lw2
        if None not in (cross, start, weather.area_a, weather.area_b):
            in_a = (fine >= start) & (fine <= cross)
            in_b = (fine >= cross) & (fine <= theta2)
            ax.fill_between(fine, fine_gz, lw2, where=in_a, facecolor="white",
                            edgecolor="black", hatch="////", linewidth=0.0,
                            label=labels["area_a_legend"].format(value=f"{weather.area_a:.4f}"))
            ax.fill_between(fine, fine_gz, lw2, where=in_b, facecolor="white",
                            edgecolor="0.35", hatch="\\\\\\\\", linewidth=0.0,
                            label=labels["area_b_legend"].format(value=f"{weather.area_b:.4f}"))
            a_x = 0.5 * (start + cross)
            b_x = 0.5 * (cross + theta2)
            box = {"facecolor": "white", "edgecolor": "black", "pad": 1.2, "linewidth": 0.5}
            ax.text(a_x, 0.5 * (lw2 + float(np.interp(a_x, heel, lever))), labels["area_a"],
                    ha="center", va="center", fontsize=9, fontweight="bold", bbox=box)
            ax.text(b_x, 0.5 * (lw2 + float(np.interp(b_x, heel, lever))), labels["area_b"],
                    ha="center", va="center", fontsize=9, fontweight="bold", bbox=box)

        ax.plot(heel, lever, color="black", linewidth=1.3, label=labels["gz_curve"])
        ax.axhline(lw1, color="black", linestyle="--", linewidth=0.8,
                   label=labels["lw1"].format(value=f"{lw1:.4f}"))
        ax.axhline(lw2, color="black", linestyle="-.", linewidth=0.8,
                   label=labels["lw2"].format(value=f"{lw2:.4f}"))
        for key, value in (("theta0", weather.theta0), ("theta_start", start),
                           ("theta2", theta2)):
            if value is not None:
                _vertical_marker(ax, value, labels[key].format(angle=f"{value:.1f}"), ":", True)
        ax.set_xlim(lo, hi)
        top = max(float(fine_gz.max()), 1.5 * lw2, 0.05) * 1.2
        bottom = min(float(fine_gz.min()) * 1.1, -0.05 * top)
        ax.set_ylim(bottom, top)
        ax.set_xticks(np.arange(np.ceil(lo / 10.0) * 10.0, hi + 0.1, 10.0))
        _legend_below(ax)
        return _svg(fig)
