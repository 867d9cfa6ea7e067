"""The figures' SVG made lean for the page (report/figures.lean_svg) and the conditions'
numbers on the package's limiting KG curve set where they can be read (report/limitsfig)."""

from __future__ import annotations

import xml.etree.ElementTree as ET
from io import StringIO

import matplotlib
from matplotlib.figure import Figure
from shapely.geometry import box

from reportgen.report.figures import _RC, lean_svg
from reportgen.report.limitsfig import label_offsets

SVG = "{http://www.w3.org/2000/svg}"


def _figure_svg() -> str:
    with matplotlib.rc_context(_RC):
        fig = Figure(figsize=(3, 2))
        ax = fig.add_subplot()
        ax.plot([0, 1, 2], [0, 1, 0], marker="o", label="curve")
        ax.fill_between([0, 1, 2], 0, [0, 1, 0], hatch="////", facecolor="white")
        ax.set_xlabel("Heel")
        ax.legend()
        out = StringIO()
        fig.savefig(out, format="svg", metadata={"Date": None})
        return out.getvalue()


def test_lean_svg_keeps_every_drawn_element_and_drops_only_bare_groups():
    """Groups with nothing but an id draw nothing themselves (SVG 1.1, 9.2 and 5.2.1: a 'g'
    only passes its own attributes on), so removing them, and the metadata, leaves every
    shape, text and use in the same order with the same attributes."""
    before, after = ET.fromstring(_figure_svg()), ET.fromstring(lean_svg(_figure_svg()))

    def drawn(root):
        return [(e.tag, sorted(e.attrib.items()), (e.text or "").strip()) for e in root.iter()
                if e.tag not in (f"{SVG}g", f"{SVG}metadata", f"{SVG}svg")
                and not e.tag.startswith("{http://www.w3.org/1999/02/22-rdf")
                and not e.tag.startswith(("{http://purl.org", "{http://creativecommons"))]

    assert drawn(after) == drawn(before)
    assert not after.findall(f".//{SVG}metadata")
    assert all(set(g.attrib) - {"id"} for g in after.iter(f"{SVG}g"))
    assert any(set(g.attrib) == {"id"} for g in before.iter(f"{SVG}g"))  # there was work


def test_crowded_labels_overlap_nothing():
    """Seven crosses within 12 pt of each other (the demo package's cluster near 6 600 t) and
    a lone one: no label box intersects another, a marker or the frame's edge (checked with
    shapely, the reference geometry library), and every input gives the same places again."""
    anchors = [(300.0, 100.0), (305.0, 96.0), (309.0, 101.0), (303.0, 92.0), (311.0, 94.0),
               (298.0, 95.0), (307.0, 104.0), (120.0, 60.0)]
    sizes = [(6.0, 7.5)] * 7 + [(11.0, 7.5)]
    markers = [(x - 3.5, y - 3.5, x + 3.5, y + 3.5) for x, y in anchors]
    frame = (40.0, 20.0, 480.0, 240.0)
    offsets = label_offsets(anchors, sizes, markers, frame)
    assert offsets == label_offsets(anchors, sizes, markers, frame)
    labels = [box(x + dx - w / 2, y + dy - h / 2, x + dx + w / 2, y + dy + h / 2)
              for (x, y), (dx, dy), (w, h) in zip(anchors, offsets, sizes, strict=True)]
    for i, a in enumerate(labels):
        assert box(*frame).contains(a)
        assert not any(a.intersection(b).area > 0 for b in labels[i + 1:])
        assert not any(a.intersection(box(*m)).area > 0 for m in markers)
