"""The vessel's limiting KG / minimum GM curve (SPEC.md "Limits", format reportgen/limits-1).

Units: displacement t (in water of the hydrostatic table's density), KG, GM, draught, trim m.

For each displacement of the cross curves that lies within the hydrostatic table, the ship is
put upright (TCG 0) at that displacement and trim T, in water of the table's density, with the
vessel's windage profile and nothing else on board, and made by the same `stages.upright` as a
condition (so the KN, the flooding and deck-edge angles, the wind and roll quantities are taken
exactly as a condition's would be); `reportgen.limits.limit_of` then searches KG from 0 upward.
The LCG for trim T is read from the hydrostatic table; where the offsets float the ship
(calculation.method: hull) it is corrected until their trim is T to within TRIM_MATCH_M.
The criteria are the vessel's `criteria` without `booklet.limits` (the booklet's own curve
cannot limit the curve that would replace it) and without `grain.2008` (its heeling moment is a
property of a grain cargo, which an empty ship at a displacement does not have).
"""

from __future__ import annotations

import dataclasses
import hashlib
import json
import math
from collections.abc import Callable

import numpy as np

from reportgen import NAME, __version__, docinfo, limits, stages
from reportgen.errors import InputError
from reportgen.floating import HydroTable, check_in_range, floating_on_tables
from reportgen.inputs import Case
from reportgen.inputs.case import special_problems
from reportgen.inputs.condition import Condition
from reportgen.inputs.special import PASSENGER_SET
from reportgen.inputs.tables import ship_x_range
from reportgen.inputs.vessel import Lightship, Vessel
from reportgen.limitsmodel import LimitsDocument
from reportgen.plainjson import clean, round_float
from reportgen.vesseldata import VesselData, vessel_data

LIMITS_FORMAT = docinfo.LIMITS_FORMAT
LIMITS_NAME = docinfo.LIMITS_NAME  # the embedded data document of a limits PDF
REQUEST_NAME = docinfo.LIMITS_REQUEST_NAME  # what, beside the vessel file, the curve rests on
NOT_ON_CURVE = ("booklet.limits", "grain.2008")  # the booklet's own curve; needs a grain cargo
TRIM_MATCH_M = 0.001  # the upright trim must come out within this of the trim asked, m
HULL_TRIM_STEPS = 4  # corrections of the LCG where the offsets float the ship (method hull)


class ImpossibleTrim(InputError):
    """The trim puts the keel out of the water or the deck under at a perpendicular."""


def request_bytes(trim_m: float) -> bytes:
    """The canonical bytes of the request (the trim, m): with the vessel file's bytes they make
    the document's inputs_sha256 = SHA-256(request bytes + vessel bytes)."""
    return json.dumps({"format": "reportgen/limits-request-1", "trim": float(trim_m)},
                      sort_keys=True).encode("utf-8")


def inputs_sha256(trim_m: float, vessel_bytes: bytes) -> str:
    return hashlib.sha256(request_bytes(trim_m) + vessel_bytes).hexdigest()


def curve_sets(vessel: Vessel) -> list[str]:
    """The vessel's criteria sets the curve is found against."""
    sets = [s for s in vessel.criteria if s not in NOT_ON_CURVE]
    if not sets:
        raise InputError("criteria: the vessel has no criteria set besides booklet.limits and "
                         "grain.2008; a limiting KG curve needs Code criteria to bisect")
    return sets


def displacements(vd: VesselData) -> list[float]:
    """The cross curves' displacements (t) within the hydrostatic table, both ends included
    (with tables at several trims: within every trim's rows)."""
    h = vd.hydro
    lo = float(np.max(np.min(h.displacement, axis=1)))
    hi = float(np.min(np.max(h.displacement, axis=1)))
    tol = 1e-9 * hi
    return [float(d) for d in vd.cross.displacement if lo - tol <= d <= hi + tol]


def lcg_for_trim(h: HydroTable, disp_t: float, trim_m: float, lpp_m: float) -> float:
    """The LCG (m from AP) at which the ship floats upright at ``trim_m`` in the table's water.

    Even-keel table: t = Δ·(LCB − LCG)/(100·MCT) solved for LCG (reportgen.floating.trim_m).
    Tables at several trims: LCG = LCB at that trim (xB = LCG), linear between the trims.
    """
    if h.trims is None:
        lcb = float(np.interp(disp_t, h.displacement[0], h.lcb[0]))
        mct = float(np.interp(disp_t, h.displacement[0], h.mct[0]))
        return lcb - 100.0 * mct * trim_m / disp_t
    check_in_range(trim_m, h.trims, "hydrostatic table's trims", unit="m")
    lcbs = [float(np.interp(disp_t, h.displacement[k], h.lcb[k])) for k in range(len(h.trims))]
    return float(np.interp(trim_m, h.trims, lcbs))


def upright_at(vessel: Vessel, vessel_bytes: bytes, vessel_name: str, vd: VesselData,
               disp_t: float, trim_m: float, sets: list[str]) -> stages.Upright:
    """The upright stage of the ship at Δ (t) and trim (m) with nothing on board but its
    lightship moved to the centre of gravity that gives that trim (KG is the search's)."""
    h = vd.hydro
    lcg = lcg_for_trim(h, disp_t, trim_m, vessel.particulars.length_bp)
    ship = vessel.model_copy(update={"lightship": Lightship.model_construct(
        mass=disp_t, lcg=lcg, vcg=0.0, tcg=0.0)})
    empty = {"format": "reportgen/condition-1", "vessel": vessel_name,
             "condition": {"title": "limits", "water_density": h.density},
             "items": [], "free_surface": "actual", "criteria": sets}
    if PASSENGER_SET in sets:  # nobody on board: no crowd; the turning heel still counts
        empty["passengers"] = {"number": 0}
    try:
        cond = Condition.model_validate(empty)
    except ValueError as exc:
        raise InputError(f"hydrostatics.density {h.density:g}: the limits are found in water "
                         f"of the table's density, which a condition cannot take "
                         f"({str(exc).splitlines()[0]})") from None
    problems = special_problems(cond, vessel, sets)
    if problems:
        raise InputError(f"criteria: {problems[0][1]}")
    case = Case(cond, ship, b"", vessel_bytes, "limits", vessel_name)
    p = vessel.particulars
    fl = floating_on_tables(h, disp_t, h.density, lcg, p.length_bp)
    if abs(fl.trim - trim_m) > TRIM_MATCH_M:  # a guard: the inversion above is exact
        raise InputError(f"the ship cannot be put at a trim of {trim_m:g} m at {disp_t:.1f} t")
    dr = fl.draughts
    x_lo, x_hi = ship_x_range(p.length_bp)
    if min(dr.aft, dr.fore) < 0.0 or max(dr.aft, dr.fore) > p.depth or not x_lo <= lcg <= x_hi:
        raise ImpossibleTrim(f"a trim of {trim_m:g} m is not physically possible at this "
                         f"displacement (draughts aft {dr.aft:.2f} m, fore {dr.fore:.2f} m, "
                         f"depth {p.depth:g} m; LCG {lcg:.1f} m): choose a smaller --trim")
    up = stages.upright(case, vd)
    for _ in range(HULL_TRIM_STEPS):  # on the offsets (method hull) the trim is theirs
        off = up.floating.trim - trim_m
        if abs(off) <= TRIM_MATCH_M:
            return up
        # t = Δ·(LCB − LCG)/(100·MCT) (reportgen.floating.trim_m): G moved by 100·MCT·Δt/Δ
        lcg += 100.0 * fl.mct * off / disp_t
        ship = ship.model_copy(update={"lightship": Lightship.model_construct(
            mass=disp_t, lcg=lcg, vcg=0.0, tcg=0.0)})
        up = stages.upright(dataclasses.replace(case, vessel=ship), vd)
    raise InputError(f"the offsets do not float the ship at a trim of {trim_m:g} m at "
                     f"{disp_t:.1f} t (they give {up.floating.trim:.3f} m)")


def row(up: stages.Upright) -> dict:
    """One row of the curve: displacement, draught, KMt, kg_max, gm_min, governing, angles."""
    lim = limits.limit_of(up, 0.0)
    kg_max = limits.reported(lim.kg_max_m)
    fl = up.floating
    return {"displacement": fl.displacement_table_t, "draft_mean": fl.draughts.mid,
            "kmt": fl.kmt, "kg_max": kg_max,
            "gm_min": None if kg_max is None else fl.kmt - kg_max,
            "governing": lim.governing,
            "flooding": up.angles.flooding.deg, "deck_edge": up.angles.deck_edge.deg}


def _warnings(up: stages.Upright) -> list[str]:
    """The upright warnings that concern the curve (a load-line warning does not)."""
    return [w for w in up.warnings if "overloaded" not in w]


def limiting_curve(vessel: Vessel, vessel_bytes: bytes, vessel_name: str, trim_m: float = 0.0,
                   advance: Callable[[], None] | None = None) -> dict:
    """The limits document (reportgen/limits-1) of a vessel at a trim (m)."""
    if not math.isfinite(trim_m):
        raise InputError("--trim: expected a finite number of metres")
    # the trim as the document records it (6 decimals, −0.0 as 0.0): the curve, its hash and
    # `verify`'s recomputation all rest on that one number
    trim_m = round_float(float(trim_m))
    if not vessel.has_tables:
        raise InputError(f"{vessel_name}: no hydrostatics and cross_curves; make them with "
                         f"'reportgen tables' first")
    vd = vessel_data(vessel)
    sets = curve_sets(vessel)
    rows, warnings, named = [], [], []
    disps = displacements(vd)
    if not disps:
        raise InputError(f"{vessel_name}: no displacement of the cross curves lies within the "
                         f"hydrostatic table")
    skipped = []
    for d in disps:
        try:
            up = upright_at(vessel, vessel_bytes, vessel_name, vd, d, trim_m, sets)
            rows.append(row(up))
        except ImpossibleTrim:
            skipped.append(d)
            continue
        except InputError as exc:
            raise InputError(f"{vessel_name}: limits at {d:.1f} t, trim {trim_m:g} m: {exc}"
                             ) from None
        warnings += [w for w in _warnings(up) if w not in warnings]
        if not named:
            named = [{"id": c.id, "title": c.title, "reference": c.reference, "set": c.set,
                      "limit": c.limit} for c in stages.checked(up, 0.0).checks]
        if advance is not None:
            advance()
    if not rows:
        raise InputError(f"{vessel_name}: a trim of {trim_m:g} m is not physically possible at "
                         f"any displacement of the tables: choose a smaller --trim")
    if PASSENGER_SET in sets:
        warnings.append("The curve has no passengers on board, so the crowding heel of IS Code "
                        "2008 Part A 3.1.2 is nil on it; the turning heel of 3.1.3 is counted. "
                        "Each condition's own KG limit counts its passengers crowded.")
    if skipped:
        warnings.append(f"No limit is given at {', '.join(f'{d:.1f}' for d in skipped)} t: "
                        f"at a trim of {trim_m:g} m a draught at a perpendicular would be below "
                        f"zero or above the depth.")
    return LimitsDocument.model_validate(clean({
        "format": LIMITS_FORMAT, "software": {"name": NAME, "version": __version__},
        "inputs_sha256": inputs_sha256(trim_m, vessel_bytes),
        "inputs": {"vessel_file": vessel_name, "request": REQUEST_NAME},
        "vessel": {"name": vessel.vessel.name, "identifier": vessel.vessel.identifier,
                   "sha256": hashlib.sha256(vessel_bytes).hexdigest(),
                   "source": vessel.source},
        "criteria": sets, "trim": float(trim_m), "density": vd.hydro.density,
        "search": {"start": 0.0, "step_max": limits.SCAN_STEP_MAX_M,
                   "tolerance": limits.TOLERANCE_M},
        "rows": rows, "criteria_list": named, "warnings": warnings})).model_dump(mode="json")


def to_json(doc: dict) -> str:
    """The limits document as text: indented, keys in document order, a final newline."""
    return json.dumps(doc, indent=2, ensure_ascii=False) + "\n"


def booklet_block(doc: dict) -> str:
    """The curve as a `limiting_kg` block of a vessel file (YAML text), its `source` saying how
    it was made; rows without a limit are left out."""
    rows = [r for r in doc["rows"] if r["kg_max"] is not None]
    source = (f"made by reportgen limits {doc['software']['version']} from "
              f"{doc['inputs']['vessel_file']} (SHA-256 {doc['vessel']['sha256'][:12]}), "
              f"upright at trim {doc['trim']:g} m, criteria {', '.join(doc['criteria'])}")
    return ("limiting_kg:\n"
            f"  source: {json.dumps(source, ensure_ascii=False)}\n"
            f"  displacement: {json.dumps([r['displacement'] for r in rows])}\n"
            f"  kg: {json.dumps([r['kg_max'] for r in rows])}\n")
