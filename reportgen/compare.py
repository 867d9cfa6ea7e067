"""`check --compare`: one condition by the vessel's tables and by direct calculation on the hull,
each quantity with its difference and the tolerance of MSC.1/Circ.1229 it is held to.

Tolerances: MSC.1/Circ.1229, Guidelines for the approval of stability instruments, annex,
4 (acceptable tolerances), table of hull-form dependent quantities: LCB and LCF from AP
1 % / 50 cm max; transverse metacentric height 1 % / 5 cm max (SPEC.md: KMt 1 % / 5 cm max);
MCT 2 %; cross curves of stability 5 cm (held by GZ at each heel: at one KG and TCG the GZ of
the two routes differ exactly as their KN). "Where two values are provided, the per cent
deviation is allowable as long as it does not exceed the linear value"; the per cent is of
the base value, here the hull's (the computer model). Quantities the circular gives no
tolerance for (draughts, trim, TPC, the angles, the criteria's values) are listed with their
difference and no tolerance.
"""

from __future__ import annotations

from dataclasses import dataclass

from reportgen.results import Results

CIRC = "MSC.1/Circ.1229, annex, 4"
GZ_STEP_DEG = 5


@dataclass(frozen=True)
class Rule:
    """A tolerance: `percent` of the base value, capped at `cap` (same unit), or `absolute`."""

    basis: str
    percent: float | None = None
    cap: float | None = None
    absolute: float | None = None

    def tolerance(self, base: float) -> float:
        if self.absolute is not None:
            return self.absolute
        tol = abs(base) * self.percent / 100.0
        return tol if self.cap is None else min(tol, self.cap)


LCB_LCF = Rule(f"{CIRC}: 1 % / 50 cm max", percent=1.0, cap=0.50)
KMT_GM = Rule(f"{CIRC}: 1 % / 5 cm max", percent=1.0, cap=0.05)
MCT = Rule(f"{CIRC}: 2 %", percent=2.0)
CROSS = Rule(f"{CIRC}: cross curves 5 cm", absolute=0.05)
NONE = "no tolerance in MSC.1/Circ.1229"


def _entry(quantity: str, label: str, unit: str, tables: float | None, hull: float | None,
           rule: Rule | None) -> dict:
    diff = None if tables is None or hull is None else tables - hull
    tol = None if rule is None or hull is None else rule.tolerance(hull)
    within = None if tol is None or diff is None else abs(diff) <= tol + 1e-12
    return {"quantity": quantity, "label": label, "unit": unit, "tables": tables, "hull": hull,
            "difference": diff, "tolerance": tol, "within": within,
            "basis": NONE if rule is None else rule.basis}


def comparison(tables: Results, hull: Results) -> list[dict]:
    """The entries of the `comparison` section: tables − hull for each quantity."""
    ht, hh = tables.hydrostatics, hull.hydrostatics
    out = [
        _entry("draft_mean", "Draught at midships", "m", ht.draft_mean, hh.draft_mean, None),
        _entry("draft_aft", "Draught aft", "m", ht.draft_aft, hh.draft_aft, None),
        _entry("draft_fore", "Draught fore", "m", ht.draft_fore, hh.draft_fore, None),
        _entry("trim", "Trim", "m", ht.trim, hh.trim, None),
        _entry("lcb", "LCB from AP", "m", ht.lcb, hh.lcb, LCB_LCF),
        _entry("lcf", "LCF from AP", "m", ht.lcf, hh.lcf, LCB_LCF),
        _entry("kmt", "KMt", "m", ht.kmt, hh.kmt, KMT_GM),
        _entry("gm_fluid", "GM corrected for free surface", "m", ht.gm_fluid, hh.gm_fluid,
               None),  # differs as KMt at one KG; 1 % of a small GM is no hull-form bar
        _entry("mct", "MCT 1 cm", "t·m/cm", ht.mct, hh.mct, MCT),
        _entry("tpc", "TPC", "t/cm", ht.tpc, hh.tpc, None),
    ]
    gt = dict(zip(tables.gz.heel, tables.gz.gz, strict=True))
    gh = dict(zip(hull.gz.heel, hull.gz.gz, strict=True))
    for h in sorted(k for k in gt.keys() & gh.keys() if k > 0 and k % GZ_STEP_DEG == 0):
        out.append(_entry(f"gz_{h:g}", f"GZ at {h:g}°", "m", gt[h], gh[h], CROSS))
    at, ah = tables.angles, hull.angles
    out += [
        _entry("flooding", "Angle of flooding θf", "deg", at.flooding, ah.flooding, None),
        _entry("deck_edge", "Deck edge immersion angle", "deg", at.deck_edge, ah.deck_edge,
               None),
        _entry("gz_max", "Angle of maximum GZ", "deg", at.gz_max, ah.gz_max, None),
    ]
    by_id = {c.id: c for c in hull.criteria}
    for c in tables.criteria:
        other = by_id.get(c.id)
        if other is not None:
            out.append(_entry(f"criterion_{c.id}", f"{c.title} (attained)", c.unit,
                              c.attained, other.attained, None))
    return out


def beyond(entries: list[dict]) -> list[dict]:
    """The entries outside their tolerance."""
    return [e for e in entries if e["within"] is False]


DIGITS = {"m": 3, "deg": 2, "t·m/cm": 2, "t/cm": 3, "m·rad": 4}


def _fmt(value: float | None, unit: str, sign: str = "") -> str:
    if value is None:
        return "—"
    return f"{value:{sign}.{DIGITS.get(unit, 3)}f}"


def render(entries: list[dict]) -> str:
    """The comparison as plain text: one line per quantity."""
    head = (f"{'Quantity':52s} {'Tables':>10s} {'Hull':>10s} {'Difference':>11s} "
            f"{'Tolerance':>10s}  {'Unit':7s} Within")
    title = ("Comparison: the vessel's tables against direct calculation on the hull "
             "(difference = tables − hull)")
    lines = [title, head, "-" * len(head)]
    for e in entries:
        mark = {True: "yes", False: "NO", None: "—"}[e["within"]]
        lines.append(f"{e['label'][:52]:52s} {_fmt(e['tables'], e['unit']):>10s} "
                     f"{_fmt(e['hull'], e['unit']):>10s} "
                     f"{_fmt(e['difference'], e['unit'], '+'):>11s} "
                     f"{_fmt(e['tolerance'], e['unit']):>10s}  {e['unit']:7s} {mark}")
    out = beyond(entries)
    held = [e for e in entries if e["within"] is not None]
    lines.append("")
    lines.append(f"Tolerances: {CIRC} (hull-form dependent quantities; % of the hull's value, "
                 f"capped where the circular gives a length); '—': {NONE}.")
    if out:
        lines.append(f"BEYOND TOLERANCE: {len(out)} of {len(held)} quantities: "
                     + ", ".join(e["label"] for e in out))
    else:
        lines.append(f"Every one of the {len(held)} quantities with a tolerance is within it.")
    return "\n".join(lines)
