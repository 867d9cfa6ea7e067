"""The readable text of `reportgen limits`, from the limits document (rich table, plain text)."""

from __future__ import annotations

import io

from rich import box
from rich.console import Console
from rich.table import Table

from reportgen.printable import printable
from reportgen.summary import CAUTION, WIDTH


def _num(value: float | None, digits: int = 3) -> str:
    return "—" if value is None else f"{value:.{digits}f}"


def render_limits(doc: dict) -> str:
    """Vessel, basis (criteria, trim, density), one row per displacement, warnings, caution."""
    buf = io.StringIO()
    con = Console(file=buf, width=WIDTH, color_system=None, highlight=False, emoji=False,
                  soft_wrap=True)
    v = doc["vessel"]
    con.print(f"{printable(v['name'])} ({printable(v['identifier'])})", markup=False)
    con.print(f"Limiting KG and minimum GM, upright at a trim of {doc['trim']:+.3f} m "
              f"(+ by the stern), in water of {doc['density']:.4f} t/m³", markup=False)
    con.print("Criteria: " + ", ".join(doc["criteria"]), markup=False)
    s = doc["search"]
    con.print(f"KG corrected for free surface, searched upwards from {s['start']:g} m in steps "
              f"of at most {s['step_max']:g} m; the first failure limits (to within "
              f"{s['tolerance'] * 1000:g} mm).", markup=False)
    t = Table(box=box.SIMPLE_HEAD, pad_edge=False, show_edge=False)
    for name in ("Displacement t", "Draught m", "KMt m", "KG max m", "GM min m", "Governing",
                 "θf °", "Deck edge °"):
        t.add_column(name, justify="left" if name == "Governing" else "right", no_wrap=True)
    for r in doc["rows"]:
        t.add_row(_num(r["displacement"], 1), _num(r["draft_mean"]), _num(r["kmt"]),
                  _num(r["kg_max"]), _num(r["gm_min"]), r["governing"] or "none",
                  _num(r["flooding"], 1), _num(r["deck_edge"], 1))
    con.print(t)
    for w in doc["warnings"]:
        con.print(f"  ! {printable(w)}", markup=False)
    con.print(CAUTION)
    return "\n".join(line.rstrip() for line in buf.getvalue().rstrip("\n").split("\n"))
