"""The passenger heeling figure of the sheet (IS Code 2008 Part A 3.1): the GZ curve with the
crowding and turning heeling arms, each constant with heel, and the heel where GZ reaches
each; drawn like the other figures (reportgen.report.figures). Angles deg, levers m.
"""

from __future__ import annotations

from collections.abc import Mapping

import matplotlib
import numpy as np

from reportgen.report.figures import _RC, _legend_below, _new_axes, _svg, _vertical_marker
from reportgen.results import Results
from reportgen.stability import curve_towards_side

SHOWN_TO_DEG = 40.0  # the heels of interest lie below the 10° limit; the curve is shown to 40°


def heeling_figure_svg(results: Results, labels: Mapping[str, str]) -> str:
    """GZ towards the side of the list, the crowding arm and the turning arm (constant),
    the 10° limit, and the two heels."""
    p = results.passengers
    side = results.angles.side
    with matplotlib.rc_context(_RC):
        fig, ax = _new_axes(labels, labels[f"side_{side}"])
        heel, lever = curve_towards_side(results.gz.heel, results.gz.gz, side)
        top_deg = min(SHOWN_TO_DEG, float(heel[-1]))
        keep = (heel >= 0.0) & (heel <= top_deg)
        heel, lever = heel[keep], lever[keep]
        ax.plot(heel, lever, color="black", linewidth=1.3, label=labels["gz_curve"])
        arms = (("crowding", p.crowding_arm, p.crowding_heel, "--"),
                ("turning", p.turning_arm, p.turning_heel, "-."))
        for key, arm, angle, style in arms:
            if arm is None:
                continue
            ax.axhline(arm, color="black", linestyle=style, linewidth=0.8,
                       label=labels[f"{key}_arm"].format(value=f"{arm:.4f}"))
            if angle is not None:
                ax.plot([angle], [arm], marker="o", markersize=4, markerfacecolor="white",
                        markeredgecolor="black", linestyle="none")
                ax.annotate(labels[f"{key}_heel"].format(angle=f"{angle:.1f}"), (angle, arm),
                            xytext=(4, 4 if key == "crowding" else -10),
                            textcoords="offset points", fontsize=6.5)
        _vertical_marker(ax, 10.0, labels["heel_limit"], ":", True)
        ax.set_xlim(0.0, top_deg)
        levels = [float(lever.max()), 0.05] + [a for _, a, _, _ in arms if a is not None]
        top = max(levels) * 1.2
        ax.set_ylim(min(float(lever.min()) * 1.1, -0.05 * top), top)
        ax.set_xticks(np.arange(0.0, top_deg + 0.1, 5.0))
        _legend_below(ax)
        return _svg(fig)
