"""The limiting KG curve as SVG text (matplotlib), for the limits document and packages.

Displacement in t on x, KG in m on y. The curve of KG max is drawn solid, KMt dashed; each
point of the curve carries the marker of its governing criterion (shapes, not colours, so that
the figure prints in black and white). Every word drawn comes from ``labels``
(templates/limits_words.j2). Optional ``points``: conditions drawn as labelled crosses, each
label placed where it overlaps no other label and no marker (``label_offsets``), joined to its
cross by a thin leader line when it had to move away from it.
"""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence

import matplotlib
import numpy
from matplotlib.figure import Figure

from reportgen.report.figures import _RC, _svg

MARKERS = ("o", "s", "^", "v", "D", "P", "X", "<", ">", "h", "*", "p")  # one per criterion
FIGURE_SIZE_IN = (7.0, 3.6)
POINT_FONT_PT = 6.5  # size of the conditions' numbers
DIGIT_EM = 0.64  # advance of a digit of DejaVu Sans, in em (its digits share one width)
LEADER_FROM_PT = 9.0  # a label placed farther than this from its cross gets a leader line
CROWDED_PT = 14.0  # crosses nearer than this to each other form a group labelled in a row
ROW_GAP_PT = 5.0  # between the labels of a row
_ANGLES_DEG = (45, 135, -45, -135, 90, -90, 0, 180, 22.5, 157.5, -22.5, -157.5, 67.5, 112.5,
               -67.5, -112.5)
_RADII_PT = (5.5, 10.0, 15.0, 20.0, 26.0, 32.0, 40.0, 48.0)
_ROW_SHIFTS_PT = (-22.0, 22.0, -30.0, 30.0, -38.0, 38.0, -46.0, 46.0, -56.0, 56.0)

Box = tuple[float, float, float, float]  # x0, y0, x1, y1 in pt


def _overlaps(a: Box, b: Box) -> bool:
    return a[0] < b[2] and b[0] < a[2] and a[1] < b[3] and b[1] < a[3]


def _free(box: Box, taken: Sequence[Box], frame: Box) -> bool:
    return (frame[0] <= box[0] and box[2] <= frame[2] and frame[1] <= box[1]
            and box[3] <= frame[3] and not any(_overlaps(box, o) for o in taken))


def _groups(anchors: Sequence[tuple[float, float]]) -> list[list[int]]:
    """The anchors joined when nearer than CROWDED_PT (directly or through others), each
    group in the order of its anchors."""
    group = list(range(len(anchors)))
    for i, (x, y) in enumerate(anchors):
        for j in range(i):
            if math.hypot(x - anchors[j][0], y - anchors[j][1]) < CROWDED_PT:
                old, new = group[i], group[j]
                group = [new if g == old else g for g in group]
    return [[i for i in range(len(anchors)) if group[i] == g] for g in dict.fromkeys(group)]


def _row(members: list[int], anchors: Sequence[tuple[float, float]],
         sizes: Sequence[tuple[float, float]], taken: Sequence[Box],
         frame: Box) -> dict[int, Box] | None:
    """The labels of a group side by side in one row, in the order of their anchors' x (so
    that their leader lines do not cross), below or above the group, where the row is free."""
    order = sorted(members, key=lambda i: (anchors[i][0], anchors[i][1]))
    width = sum(sizes[i][0] for i in order) + ROW_GAP_PT * (len(order) - 1)
    centre = sum(anchors[i][0] for i in order) / len(order)
    left = min(max(centre - width / 2, frame[0]), frame[2] - width)
    for shift in _ROW_SHIFTS_PT:
        base = (min if shift < 0 else max)(anchors[i][1] for i in order) + shift
        boxes, x = {}, left
        for i in order:
            w, h = sizes[i]
            boxes[i] = (x, base - h / 2, x + w, base + h / 2)
            x += w + ROW_GAP_PT
        if all(_free(box, taken, frame) for box in boxes.values()):
            return boxes
    return None


def label_offsets(anchors: Sequence[tuple[float, float]], sizes: Sequence[tuple[float, float]],
                  obstacles: Sequence[Box], frame: Box) -> list[tuple[float, float]]:
    """Where to centre each label, as an offset (pt) from its anchor (pt), so that no label
    overlaps another, a box of ``obstacles`` (markers, lines) or the edge of ``frame``.

    A lone anchor takes the first free place going out ring by ring (``_RADII_PT``) and round
    each ring (``_ANGLES_DEG``). Anchors nearer each other than ``CROWDED_PT`` form a group
    whose labels stand in a row below or above it (``_row``), on leader lines; a group with no
    free row, or a lone anchor with no free place, is labelled ring by ring beyond
    ``LEADER_FROM_PT``, or at the last ring's corner when nothing is free. Equal inputs give
    equal places."""
    placed: list[Box] = []
    found: dict[int, Box] = {}
    for members in _groups(anchors):
        boxes = _row(members, anchors, sizes, [*obstacles, *placed], frame) \
            if len(members) > 1 else None
        for i in members if boxes is None else ():
            x, y = anchors[i]
            w, h = sizes[i]
            radii = [r for r in _RADII_PT if len(members) == 1 or r > LEADER_FROM_PT]
            candidates = [(x + r * math.cos(math.radians(a)), y + r * math.sin(math.radians(a)))
                          for r in radii for a in _ANGLES_DEG]
            cx, cy = next((c for c in candidates if _free(
                (c[0] - w / 2, c[1] - h / 2, c[0] + w / 2, c[1] + h / 2),
                [*obstacles, *placed], frame)), (x + _RADII_PT[-1], y + _RADII_PT[-1]))
            found[i] = (cx - w / 2, cy - h / 2, cx + w / 2, cy + h / 2)
            placed.append(found[i])
        if boxes is not None:
            found.update(boxes)
            placed.extend(boxes.values())
    return [(round((found[i][0] + found[i][2]) / 2 - x, 3),
             round((found[i][1] + found[i][3]) / 2 - y, 3))
            for i, (x, y) in enumerate(anchors)]


def _label_points(ax, fig, points: Sequence[tuple[str, float, float]],
                  markers: Sequence[tuple[float, float, float]],
                  curves: Sequence[tuple[Sequence[float], Sequence[float]]]) -> None:
    """The numbers of ``points`` placed by ``label_offsets`` (in pt of the figure); markers:
    (displacement, KG, half size in pt) of every marker drawn; curves: (displacements, KGs)
    of the lines drawn, which the labels keep off too (sampled every 1/300 of the axis)."""
    lo, hi = ax.get_xlim()
    samples = [lo + (hi - lo) * k / 300.0 for k in range(301)]
    lines = [(d, float(numpy.interp(d, xs, ys)), 1.0)
             for xs, ys in curves if len(xs) > 1 for d in samples if xs[0] <= d <= xs[-1]]
    to_pt = 72.0 / fig.dpi
    def at(d: float, kg: float) -> tuple[float, float]:
        px, py = ax.transData.transform((d, kg))
        return px * to_pt, py * to_pt
    obstacles = []
    for d, kg, half in [*markers, *lines]:
        x, y = at(d, kg)
        obstacles.append((x - half, y - half, x + half, y + half))
    x0, y0 = at(ax.get_xlim()[0], ax.get_ylim()[0])
    x1, y1 = at(ax.get_xlim()[1], ax.get_ylim()[1])
    order = sorted(range(len(points)), key=lambda i: (points[i][1], points[i][2], i))
    anchors = [at(points[i][1], points[i][2]) for i in order]
    sizes = [(len(points[i][0]) * DIGIT_EM * POINT_FONT_PT + 1.6, POINT_FONT_PT + 1.0)
             for i in order]
    offsets = label_offsets(anchors, sizes, obstacles, (x0, y0, x1, y1))
    for i, (dx, dy) in zip(order, offsets, strict=True):
        text, d, kg = points[i]
        far = math.hypot(dx, dy) > LEADER_FROM_PT
        ax.annotate(text, (d, kg), xytext=(dx, dy), textcoords="offset points",
                    fontsize=POINT_FONT_PT, ha="center", va="center",
                    arrowprops={"arrowstyle": "-", "linewidth": 0.4, "color": "0.3",
                                "shrinkA": 0.5, "shrinkB": 3.0} if far else None)


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
        for i, (_, d, kg) in enumerate(points):
            ax.plot([d], [kg], linestyle="none", marker="x", markersize=6, color="black",
                    label=labels.get("points") if i == 0 else None)
        if points:
            _label_points(ax, fig, points,
                          [(d, kg, 3.5) for _, d, kg in points]
                          + [(r["displacement"], r["kg_max"], 3.0) for r in found],
                          [(disp, [r["kmt"] for r in rows]),
                           ([r["displacement"] for r in found], [r["kg_max"] for r in found])])
        ax.legend(loc="upper center", bbox_to_anchor=(0.5, -0.16), ncol=2, handlelength=3.0,
                  borderaxespad=0.0)
        return _svg(fig)
