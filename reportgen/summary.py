"""The readable text of `reportgen check`: plain text from the results document.

Every verdict is a word (PASS / FAIL), never a colour only.
"""

from __future__ import annotations


def _num(value: float | None, digits: int = 3) -> str:
    return "—" if value is None else f"{value:.{digits}f}"


def _digits(unit: str) -> int:
    return {"m·rad": 4, "m": 3, "deg": 1}.get(unit, 3)


def render_summary(results: dict) -> str:
    """Plain text: condition, loading totals, draughts, GM, angles, every criterion with
    required, attained, margin and PASS/FAIL, the verdict and the warnings."""
    cond, ves, ld = results["condition"], results["vessel"], results["loading"]
    hy, an = results["hydrostatics"], results["angles"]
    out: list[str] = []
    out.append(f"{ves['name']} ({ves['identifier']})")
    out.append(f"Condition: {cond['title']}")
    if cond.get("voyage"):
        out.append(f"Voyage: {cond['voyage']}")
    out.append(f"Date: {cond.get('date') or 'not stated'}")
    out.append("")
    out.append("Loading")
    out.append(f"  Lightship      {ld['lightship']:10.1f} t")
    out.append(f"  Deadweight     {ld['deadweight']:10.1f} t")
    out.append(f"  Displacement   {ld['displacement']:10.1f} t")
    out.append(f"  LCG {ld['lcg']:.3f} m   VCG {ld['vcg']:.3f} m   TCG {ld['tcg']:.3f} m   "
               f"FSM {ld['fsm']:.1f} t·m ({cond.get('free_surface', 'actual')})")
    out.append("")
    out.append("Floating position")
    out.append(f"  Draught aft {hy['draft_aft']:.3f} m   midships {hy['draft_mean']:.3f} m   "
               f"fore {hy['draft_fore']:.3f} m   (moulded)")
    if "draft_mean_extreme" in hy:
        out.append(f"  Extreme: aft {hy['draft_aft_extreme']:.3f} m   midships "
                   f"{hy['draft_mean_extreme']:.3f} m   fore {hy['draft_fore_extreme']:.3f} m")
    trim_word = "by the stern" if hy["trim"] > 0 else ("by the head" if hy["trim"] < 0 else "")
    heel = hy["heel"]
    heel_text = "none within the tables" if heel is None else (
        f"{abs(heel):.2f}° to {'starboard' if heel > 0 else 'port'}" if heel else "0.00°")
    out.append(f"  Trim {abs(hy['trim']):.3f} m {trim_word}".rstrip() + f"   Heel {heel_text}")
    out.append(f"  KMt {hy['kmt']:.3f} m   KG {hy['kg_solid']:.3f} m   FSC {hy['fsc']:.3f} m   "
               f"KG corrected {hy['kg_fluid']:.3f} m")
    out.append(f"  GM {hy['gm_solid']:.3f} m   GM corrected {hy['gm_fluid']:.3f} m")
    out.append("")
    side = an.get("side", "starboard")
    out.append(f"Angles (towards {side})")
    flood = f"{an['flooding']:.1f}°"
    if an.get("flooding_opening"):
        flood += f" ({an['flooding_opening']})"
    vanish = "beyond the tables" if an["vanishing"] is None else f"{an['vanishing']:.1f}°"
    out.append(f"  Deck edge {an['deck_edge']:.1f}°   Flooding {flood}   "
               f"Maximum GZ at {an['gz_max']:.1f}°   Vanishing {vanish}")
    out.append("")
    out.append("Criteria")
    rows = [("Criterion", "Reference", "Required", "Attained", "Margin", "Unit", "Result")]
    for c in results["criteria"]:
        dg = _digits(c["unit"])
        sign = "≤ " if c.get("limit") == "at_most" else "≥ "
        rows.append((c["title"], c["reference"], sign + _num(c["required"], dg),
                     _num(c["attained"], dg), _num(c.get("margin"), dg), c["unit"],
                     "PASS" if c["passed"] else "FAIL"))
    widths = [max(len(r[i]) for r in rows) for i in range(len(rows[0]))]
    for j, r in enumerate(rows):
        cells = [r[0].ljust(widths[0]), r[1].ljust(widths[1])]
        cells += [r[i].rjust(widths[i]) for i in (2, 3, 4)]
        cells += [r[5].ljust(widths[5]), r[6]]
        out.append("  " + "  ".join(cells))
        if j == 0:
            out.append("  " + "  ".join("-" * w for w in widths))
    out.append("")
    verdict = "PASS: every criterion is met" if results["passed"] else \
        "FAIL: at least one criterion is not met"
    out.append(f"Result: {verdict}")
    if results.get("warnings"):
        out.append("")
        out.append("Warnings")
        for w in results["warnings"]:
            out.append(f"  - {w}")
    out.append("")
    out.append("Caution: this does not replace the approved stability booklet or an approved "
               "stability instrument;\nthe master remains responsible for the ship's stability; "
               "the flag Administration's and the\nclassification society's requirements govern.")
    return "\n".join(out)
