"""The limiting KG curve as SVG text (matplotlib), for the limits document and packages.

Displacement in t on x, KG in m on y. The curve of KG max is drawn solid, KMt dashed; each
point of the curve carries the marker of its governing criterion (shapes, not colours, so that
the figure prints in black and white). Every word drawn comes from ``labels``
(templates/limits_words.j2). Optional ``points``: conditions drawn as labelled crosses.
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence

import matplotlib
from matplotlib.figure import Figure

from reportgen.report.figures import _RC, _svg

MARKERS = ("o", "s", "^", "v", "D", "P", "X", "<", ">", "h", "*", "p")  # one per criterion
FIGURE_SIZE_IN = (7.0, 3.6)


def limits_figure_svg(doc: Mapping, labels: Mapping[str, str],
                      points: Sequence[tuple[str, float, float]] = ()) -> str:
    """KG max and KMt against displacement, the governing criterion marked at each row;
    ``points``: (label, displacement t, KG m) drawn as crosses with their labels, with a
    legend entry ``labels["points"]`` when given."""
    rows = doc["rows"]
    titles = {c["id"]: c["title"] for c in doc.get("criteria_list", [])}
    with matplotlib.rc_context(_RC):
        fig = Figure(figsize=FIGURE_SIZE_IN)
        fig.subplots_adjust(left=0.09, right=0.985, top=0.975, bottom=0.36)
        ax = fig.add_subplot()
        ax.set_xlabel(labels["displacement_axis"])
        ax.set_ylabel(labels["kg_axis"])
        ax.grid(True, color="0.8", linewidth=0.4)
        disp = [r["displacement"] for r in rows]
        ax.plot(disp, [r["kmt"] for r in rows], color="black", linestyle="--", linewidth=0.8,
                label=labels["kmt"])
        found = [r for r in rows if r["kg_max"] is not None]
        ax.plot([r["displacement"] for r in found], [r["kg_max"] for r in found],
                color="black", linewidth=1.3, label=labels["kg_max"])
        order = list(dict.fromkeys(r["governing"] for r in found if r["governing"]))
        for i, cid in enumerate(order):
            mine = [r for r in found if r["governing"] == cid]
            ax.plot([r["displacement"] for r in mine], [r["kg_max"] for r in mine],
                    linestyle="none", marker=MARKERS[i % len(MARKERS)], markersize=4.5,
                    markerfacecolor="white" if i % 2 == 0 else "black",
                    markeredgecolor="black",
                    label=labels["governs"].format(title=titles.get(cid, cid), id=cid))
        for i, (text, d, kg) in enumerate(points):
            ax.plot([d], [kg], linestyle="none", marker="x", markersize=6, color="black",
                    label=labels.get("points") if i == 0 else None)
            ax.annotate(text, (d, kg), xytext=(3, 3), textcoords="offset points", fontsize=6)
        ax.legend(loc="upper center", bbox_to_anchor=(0.5, -0.16), ncol=2, handlelength=3.0,
                  borderaxespad=0.0)
        return _svg(fig)
