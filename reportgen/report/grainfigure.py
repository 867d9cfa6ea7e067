"""The grain figure of the calculation sheet (International Grain Code, MSC.23(59), figure
A 7): the GZ curve, the grain heeling arm from λ0 at 0° to λ40 = 0.8·λ0 at 40°, and the
residual area between them from the angle of heel to its end, hatched and labelled so that it
reads in black and white. Angles deg, levers m, areas m·rad; words from templates/labels.j2.
"""

from __future__ import annotations

from collections.abc import Mapping

import matplotlib
import numpy as np

from reportgen.grain import heeling_arm_m
from reportgen.report.figures import (
    _RC,
    STEP_DEG,
    _legend_below,
    _new_axes,
    _svg,
    _vertical_marker,
)
from reportgen.results import Results
from reportgen.stability import curve_towards_side

X_END_DEG = 60.0  # the figure shows 0° to 60° (the arm is defined to 40°)


def grain_figure_svg(results: Results, labels: Mapping[str, str]) -> str:
    """The GZ curve with the grain heeling arm and the residual area of A 7.1.2, as SVG."""
    side = results.angles.side
    g = results.grain
    with matplotlib.rc_context(_RC):
        fig, ax = _new_axes(labels, labels[f"side_{side}"])
        heel, lever = curve_towards_side(results.gz.heel, results.gz.gz, side)
        keep = heel >= 0.0
        heel, lever = heel[keep], lever[keep]
        hi = min(float(heel[-1]), X_END_DEG)
        fine = np.linspace(0.0, hi, round(hi / STEP_DEG) + 1)
        fine_gz = np.interp(fine, heel, lever)
        arm = heeling_arm_m(g.lambda0, fine)
        if g.heel is not None and g.residual_area is not None and g.residual_to > g.heel:
            inside = (fine >= g.heel) & (fine <= g.residual_to)
            ax.fill_between(fine, arm, fine_gz, where=inside, facecolor="white",
                            edgecolor="black", hatch="////", linewidth=0.0,
                            label=labels["grain_residual"].format(
                                value=f"{g.residual_area:.4f}"))
            mid = 0.5 * (g.heel + g.residual_to)
            ax.text(mid, 0.5 * (float(heeling_arm_m(g.lambda0, mid))
                                + float(np.interp(mid, heel, lever))),
                    labels["grain_residual_short"], ha="center", va="center", fontsize=8,
                    fontweight="bold",
                    bbox={"facecolor": "white", "edgecolor": "black", "pad": 1.2,
                          "linewidth": 0.5})
        ax.plot(heel, lever, color="black", linewidth=1.3, label=labels["gz_curve"])
        to40 = fine <= 40.0
        ax.plot(fine[to40], arm[to40], color="black", linestyle="--", linewidth=1.0,
                label=labels["grain_arm"].format(l0=f"{g.lambda0:.4f}", l40=f"{g.lambda40:.4f}"))
        for angle, key in ((g.heel, "grain_heel"), (g.residual_to, "grain_residual_to")):
            if angle is not None and angle <= hi:
                _vertical_marker(ax, angle, labels[key].format(angle=f"{angle:.1f}"), ":",
                                 key == "grain_heel")
        ax.set_xlim(0.0, hi)
        top = max(float(fine_gz.max()), g.lambda0, 0.05) * 1.2
        ax.set_ylim(min(float(fine_gz.min()) * 1.05, -0.05 * top), top)
        ax.set_xticks(np.arange(0.0, hi + 0.1, 10.0))
        _legend_below(ax)
        return _svg(fig)
