"""The readable text of `reportgen show`, from reportgen.vesselinfo.summary (rich tables)."""

from __future__ import annotations

import io
from typing import Any

from rich import box
from rich.console import Console
from rich.table import Table

from reportgen.printable import printable

WIDTH = 200


def _t(value: Any) -> str:
    """A text from the file, control characters shown escaped (never acted on)."""
    if value is None:
        return "—"
    return printable(value)


def _n(value: float | None, digits: int) -> str:
    return "—" if value is None else f"{value:.{digits}f}"


def _span(span: list[float] | None, digits: int) -> str:
    return "—" if span is None else f"{span[0]:.{digits}f} to {span[1]:.{digits}f}"


def _table(*columns: tuple[str, str]) -> Table:
    t = Table(box=box.SIMPLE_HEAD, pad_edge=False, show_edge=False)
    for name, justify in columns:
        t.add_column(name, justify=justify, no_wrap=True)  # type: ignore[arg-type]
    return t


def render_show(s: dict[str, Any]) -> str:
    buf = io.StringIO()
    con = Console(file=buf, width=WIDTH, color_system=None, highlight=False, emoji=False,
                  soft_wrap=True)
    v, p, ls = s["vessel"], s["particulars"], s["lightship"]
    con.print(f"{_t(v['name'])} ({_t(v['identifier'])}), {_t(v['type'])}", markup=False)
    con.print(f"Lpp {p['length_bp']:.2f} m, B {p['breadth']:.2f} m, D {p['depth']:.2f} m, "
              f"summer draught {p['summer_draft']:.3f} m; lightship {ls['mass']:.1f} t at LCG "
              f"{ls['lcg']:.2f} m, VCG {ls['vcg']:.2f} m, TCG {ls['tcg']:.2f} m", markup=False)
    con.print(f"Vessel data fingerprint (SHA-256): {v['sha256']}", markup=False)

    con.print(f"\nTanks ({len(s['tanks'])})", markup=False)
    if s["tanks"]:
        t = _table(("Id", "left"), ("Name", "left"), ("Content", "left"), ("Role", "left"),
                   ("Pair", "left"), ("Density t/m³", "right"), ("Capacity m³", "right"),
                   ("Capacity t", "right"), ("Largest FSM t·m", "right"), ("Sounding m", "right"))
        for r in s["tanks"]:
            t.add_row(_t(r["id"]), _t(r["name"]), _t(r["content"]), r["role"], _t(r["pair"]),
                      f"{r['density']:.3f}", _n(r["capacity_m3"], 1), _n(r["capacity_t"], 1),
                      _n(r["fsm_max"], 1),
                      _span(r["sounding"], 2) if r["sounding"] else "no table yet (geometry)")
        con.print(t)
    con.print(f"\nHolds ({len(s['holds'])})", markup=False)
    if s["holds"]:
        t = _table(("Id", "left"), ("Name", "left"), ("Filled volume m³", "right"),
                   ("Grain VHM filled m⁴", "right"))
        for r in s["holds"]:
            t.add_row(_t(r["id"]), _t(r["name"]), _n(r["volume_m3"], 1), _n(r["vhm_m4"], 1))
        con.print(t)
    con.print(f"\nOpenings ({len(s['openings'])})", markup=False)
    if s["openings"]:
        t = _table(("Name", "left"), ("x m", "right"), ("y m", "right"), ("z m", "right"))
        for o in s["openings"]:
            t.add_row(_t(o["name"]), f"{o['x']:.2f}", f"{o['y']:.2f}", f"{o['z']:.2f}")
        con.print(t)
    con.print(f"\nCriteria sets: {', '.join(s['criteria'])}", markup=False)
    con.print("Permitted instead: " + (", ".join(s["permitted_criteria"]) or "none"),
              markup=False)
    con.print(f"Calculation method: {s['method']}", markup=False)

    con.print("\nTables", markup=False)
    t = _table(("Table", "left"), ("Covers", "left"), ("Trims m", "left"))
    tb = s["tables"]
    if "hydrostatics" in tb:
        h = tb["hydrostatics"]
        t.add_row("hydrostatics", f"draught {_span(h['draft'], 3)} m, displacement "
                  f"{_span(h['displacement'], 1)} t ({h['rows']} rows, {h['density']:g} t/m³)",
                  _trims(h["trims"]))
    if "cross_curves" in tb:
        c = tb["cross_curves"]
        t.add_row("cross curves", f"displacement {_span(c['displacement'], 1)} t, heel "
                  f"{_span(c['heel'], 0)}°, trim {c['trim']}", _trims(c["trims"]))
    for name, word in (("deck_edge", "deck edge angle"), ("flooding_angle", "flooding angle")):
        if name in tb:
            a = tb[name]
            t.add_row(word, f"displacement {_span(a['displacement'], 1)} t, angle "
                      f"{_span(a['angle'], 1)}°", _trims(a["trims"]))
    if "limiting_kg" in tb:
        t.add_row("limiting KG", f"displacement {_span(tb['limiting_kg']['displacement'], 1)} t",
                  "")
    if "hull" in tb:
        hl = tb["hull"]
        t.add_row("hull offsets", f"{hl['stations']} stations, x {_span(hl['x'], 2)} m", "")
    if not tb:
        t.add_row("none", "", "")
    con.print(t)
    return buf.getvalue()


def _trims(trims: list[float] | None) -> str:
    return "single trim" if not trims else ", ".join(f"{x:g}" for x in trims)
