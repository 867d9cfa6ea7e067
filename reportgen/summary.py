"""The readable text of `reportgen check`, from the results (rich tables, plain text).

Every verdict is a word (PASS / FAIL), never a colour only; warnings stand beside the verdict.
"""

from __future__ import annotations

import io

from rich import box
from rich.console import Console
from rich.table import Table

from reportgen.printable import printable as _p
from reportgen.results import Results

WIDTH = 200  # characters: lines are not wrapped, the table is as wide as its content
DIGITS = {"m·rad": 4, "m": 3, "deg": 1}
FS_WORDS = {"slack": "slack, actual filling", "largest_of_table": "largest of its table",
            "worst_pair": "worst pair of its liquid", "worst_single": "worst single tank",
            "maximum_rule": "maximum rule"}
METHOD_WORDS = {"tables": "the vessel file's tables", "hull": "direct calculation on the hull"}
CAUTION = ("Caution: this does not replace the approved stability booklet or an approved "
           "stability instrument;\nthe master remains responsible for the ship's stability; "
           "the flag Administration's and the\nclassification society's requirements govern.")


def _num(value: float | None, digits: int = 3) -> str:
    return "—" if value is None else f"{value:.{digits}f}"


def _criteria_table(r: Results) -> Table:
    t = Table(box=box.SIMPLE_HEAD, pad_edge=False, show_edge=False)
    for name, justify in (("Criterion", "left"), ("Reference", "left"), ("Required", "right"),
                          ("Attained", "right"), ("Margin", "right"), ("Unit", "left"),
                          ("Result", "left")):
        t.add_column(name, justify=justify, no_wrap=True)
    for c in r.criteria:
        dg = DIGITS.get(c.unit, 3)
        sign = "≤ " if c.limit == "at_most" else "≥ "
        t.add_row(_p(c.title), _p(c.reference), sign + _num(c.required, dg), _num(c.attained, dg),
                  _num(c.margin, dg), c.unit, "PASS" if c.passed else "FAIL")
    return t


def _heel_text(heel: float | None) -> str:
    if heel is None:
        return "none within the tables"
    if heel == 0.0:
        return "0.00°"
    return f"{abs(heel):.2f}° to {'starboard' if heel > 0 else 'port'}"


def _observed_lines(r: Results) -> list[str]:
    """The draughts at the marks and the draught survey of the readings (reportgen.draughts)."""
    lines = []
    if r.draught_marks is not None:
        m = r.draught_marks
        lines.append(f"  At the marks (extreme): aft {m.aft.draft:.3f} m   midships "
                     f"{m.mid.draft:.3f} m   fore {m.fore.draft:.3f} m   (x {m.aft.x:g}, "
                     f"{m.mid.x:g}, {m.fore.x:g} m from AP)")
    o = r.observed
    if o is None:
        return lines
    if o.basis == "even_keel":
        table = (f"Δ at the quarter mean {o.displacement_table:.1f} t   first trim correction "
                 f"{o.first_trim_correction:+.1f} t   second {o.second_trim_correction:+.1f} t")
    else:
        table = f"Δ of the table at the quarter mean and the trim read {o.displacement_table:.1f} t"
    verdict = f"within {o.tolerance:g} %" if o.within else f"BEYOND {o.tolerance:g} %"
    lines += [
        "\nDraughts read alongside (draught survey, UN/ECE code steps)",
        (f"  Read (mean of port and starboard): aft {o.aft.mean:.3f} m   midships "
         f"{o.mid.mean:.3f} m   fore {o.fore.mean:.3f} m"),
        (f"  At the perpendiculars (moulded): aft {o.draft_aft:.3f} m   midships "
         f"{o.draft_mean:.3f} m   fore {o.draft_fore:.3f} m"),
        (f"  Trim {o.trim:+.3f} m   List {o.list:+.2f}°   Hog (+)/sag (−) {o.hog:+.3f} m   "
         f"Quarter mean {o.quarter_mean:.3f} m"),
        f"  {table}   density {o.density_correction:+.1f} t",
        (f"  Δ from the draughts {o.displacement:.1f} t   from the loading {o.calculated:.1f} t"
         f"   difference {o.difference.t:+.1f} t ({o.difference.percent:+.2f} %): {verdict}"),
    ]
    return lines


def margin_text(r: Results) -> str:
    """The KG margin in words (results `limits`, SPEC.md "Limits")."""
    m = r.limits
    named = f"{_p(m.governing_title)} ({_p(m.governing_reference)})"
    if m.kg_max is None:
        return f"KG margin: no KG of 0 m or more meets every criterion; {named} fails at KG 0."
    if m.governing is None:
        return f"KG margin: every criterion passes for any KG up to {m.kg_max:.3f} m."
    if m.kg_margin >= 0:
        return (f"KG margin: KG may rise by {m.kg_margin:.3f} m (to {m.kg_max:.3f} m, GM "
                f"{m.gm_min:.3f} m) before {named} fails.")
    return (f"KG margin: KG must come down by {-m.kg_margin:.3f} m (to {m.kg_max:.3f} m, GM "
            f"{m.gm_min:.3f} m) before every criterion passes; above it {named} fails.")


def render_summary(r: Results) -> str:
    """Plain text: condition, verdict with its warnings, loading totals, draughts, GM, angles,
    every criterion with required, attained, margin and PASS/FAIL, and the caution."""
    buf = io.StringIO()
    con = Console(file=buf, width=WIDTH, color_system=None, highlight=False, emoji=False,
                  soft_wrap=True)
    cond, ld, hy, an = r.condition, r.loading, r.hydrostatics, r.angles
    con.print(f"{_p(r.vessel.name)} ({_p(r.vessel.identifier)})", markup=False)
    con.print(f"Condition: {_p(cond.title)}", markup=False)
    if cond.voyage:
        con.print(f"Voyage: {_p(cond.voyage)}", markup=False)
    con.print(f"Date: {cond.date or 'not stated'}")
    con.print(f"Method: {METHOD_WORDS[r.assumptions.method]}")
    verdict = ("PASS: every criterion is met" if r.passed else
               "FAIL: " + ", ".join(c.id for c in r.criteria if not c.passed) + " not met")
    con.print(f"\nResult: {verdict}", markup=False)
    if r.limits is not None:
        con.print(margin_text(r), markup=False)
    for w in r.warnings:
        con.print(f"  ! {_p(w)}", markup=False)
    con.print("\nLoading")
    con.print(f"  Lightship {ld.lightship:.1f} t   Deadweight {ld.deadweight:.1f} t   "
              f"Displacement {ld.displacement:.1f} t")
    con.print(f"  LCG {ld.lcg:.3f} m   VCG {ld.vcg:.3f} m   TCG {ld.tcg:.3f} m   "
              f"FSM {ld.fsm:.1f} t·m (free surface: {cond.free_surface})")
    for t in r.assumptions.free_surface_tanks:
        con.print(f"    {_p(t.id)}: {t.fsm:.1f} t·m, {FS_WORDS.get(t.reason, t.reason)}",
                  markup=False)
    for ln in r.loading.lines:
        if ln.kind == "allowance":
            con.print(f"  + {_p(ln.name)}: {ln.mass:.1f} t at LCG {ln.lcg:.3f} m, VCG {ln.vcg:.3f} m",
                      markup=False)
    con.print("\nFloating position")
    con.print(f"  Draught aft {hy.draft_aft:.3f} m   midships {hy.draft_mean:.3f} m   "
              f"fore {hy.draft_fore:.3f} m   (moulded)")
    con.print(f"  Extreme: aft {hy.draft_aft_extreme:.3f} m   midships "
              f"{hy.draft_mean_extreme:.3f} m   fore {hy.draft_fore_extreme:.3f} m")
    trim_word = "by the stern" if hy.trim > 0 else ("by the head" if hy.trim < 0 else "")
    con.print(f"  Trim {abs(hy.trim):.3f} m {trim_word}".rstrip()
              + f"   Heel {_heel_text(hy.heel)}")
    if r.load_line is not None:
        ll = r.load_line
        con.print(f"  Load line: summer draught {ll.summer_draft:.3f} m   FWA {ll.fwa * 1000:.0f} mm"
                  f"   DWA {ll.dwa * 1000:.0f} mm   permissible midships draught "
                  f"{ll.permissible_draft:.3f} m   deadweight to the marks "
                  f"{ll.deadweight_to_marks:.1f} t")
    con.print(f"  KMt {hy.kmt:.3f} m   KG {hy.kg_solid:.3f} m   FSC {hy.fsc:.3f} m   "
              f"KG corrected {hy.kg_fluid:.3f} m")
    con.print(f"  GM {hy.gm_solid:.3f} m   GM corrected {hy.gm_fluid:.3f} m")
    for line in _observed_lines(r):
        con.print(line, markup=False)
    con.print(f"\nAngles (towards {an.side})")
    flood = f"{an.flooding:.1f}° ({an.flooding_source}"
    flood += f", {_p(an.flooding_opening)})" if an.flooding_opening else ")"
    vanish = "beyond the tables" if an.vanishing is None else f"{an.vanishing:.1f}°"
    con.print(f"  Deck edge {an.deck_edge:.1f}° ({an.deck_edge_source})   Flooding {flood}",
              markup=False)
    con.print(f"  Maximum GZ at {an.gz_max:.1f}°   Vanishing {vanish}")
    if r.grain is not None:
        g = r.grain
        con.print("\nGrain in bulk (International Grain Code, A 7)")
        con.print(f"  SF {g.stowage_factor:.3f} m³/t   ΣVHM {g.vhm:.1f} m⁴   heeling moment "
                  f"{g.heeling_moment:.1f} t·m   λ0 {g.lambda0:.4f} m   λ40 {g.lambda40:.4f} m")
        allow = ("none" if g.allowable_moment is None else
                 f"{g.allowable_moment:.1f} t·m (margin {g.moment_margin:+.1f} t·m)")
        con.print(f"  Allowable grain heeling moment at this displacement and KG: {allow}")
    con.print("\nCriteria")
    con.print(_criteria_table(r))
    con.print(CAUTION)
    return "\n".join(line.rstrip() for line in buf.getvalue().rstrip("\n").split("\n"))
