"""Hydrostatic table, cross curves, deck-edge and flooding angles from the hull offsets
(the vessel file text carrying them: reportgen.hull.tabletext, re-exported here).

Units: lengths m, masses t, density t/m³, angles deg, MCT t·m/cm, TPC t/cm.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence
from typing import Any

import numpy as np
from scipy.optimize import brentq

from reportgen.hull.equilibrium import (
    Equilibrium,
    equilibrium,
    equilibrium_plane,
    solve_draft,
    state_at,
)
from reportgen.hull.hydrostatics import (
    HullGeometry,
    Plane,
    _axes,
    prepare_hull,
)
from reportgen.hull.sections import hull_from_stations
from reportgen.hull.tabletext import (  # noqa: F401  (the file text, re-exported)
    _DEC_ANGLE,
    _DEC_DENSITY,
    _DEC_HEEL,
    _DEC_LENGTH,
    _DEC_MASS,
    _HYDRO_DECIMALS,
    BLOCKS,
    GENERATED_COMMENT,
    _block_spans,
    format_block,
    vessel_text_with_tables,
)
from reportgen.hull.trimmed import (
    check_block_coefficient,
    check_stations,
    hydrostatic_rows,
    upright_at_trim,
)

N_DRAUGHTS = 41
N_DISPLACEMENTS = 20
MAX_TRIM_OF_LPP = 0.1  # of Lpp: trims beyond are refused (the depth of any ship is less)
DEFAULT_HEELS_DEG = tuple(float(h) for h in range(0, 91, 5))
GRAIN_HEELS_DEG = (12.0, 40.0)  # International Grain Code, notes to figure A 7: cross curves
# at 12° and 40° (added to the default heels for a vessel with grain compartments)
def _round(values: Sequence[float] | np.ndarray, decimals: int) -> list[float]:
    return [round(float(v), decimals) + 0.0 for v in values]


def geometry_of(vessel: Any) -> HullGeometry:
    """HullGeometry from vessel.hull.stations (x, points) and vessel.particulars.length_bp."""
    stations = [(float(s.x), np.asarray(s.points, dtype=float).reshape(-1, 2))
                for s in vessel.hull.stations]
    return prepare_hull(hull_from_stations(stations), float(vessel.particulars.length_bp))


def upright_draft(geom: HullGeometry, volume_m3: float) -> float:
    """Even-keel upright moulded draught (m) at which the hull displaces `volume_m3`."""
    return solve_draft(geom, volume_m3, 0.0, 0.0).d_m


def draught_range(geom: HullGeometry, vessel: Any, density: float) -> np.ndarray:
    """N_DRAUGHTS even-keel draughts, m, from 85 % of the lightship draught to halfway
    between the summer draught and the depth (so below the depth), rounded to 0.1 mm."""
    p = vessel.particulars
    t_light = upright_draft(geom, float(vessel.lightship.mass) / density)
    t_lo = math.floor(0.85 * t_light * 100.0) / 100.0
    t_hi = float(p.summer_draft) + 0.5 * (float(p.depth) - float(p.summer_draft))
    if not t_lo > 0.0 or not t_hi > t_lo:
        raise ValueError(
            f"cannot span draughts from below the lightship draught ({t_light:.3f} m) to above "
            f"the summer draught ({float(p.summer_draft):.3f} m) below the depth "
            f"({float(p.depth):.3f} m)"
        )
    return np.round(np.linspace(t_lo, t_hi, N_DRAUGHTS), _DEC_LENGTH)


def hydrostatic_table(geom: HullGeometry, drafts_m: np.ndarray, density: float
                      ) -> dict[str, Any]:
    """Even-keel upright hydrostatics at each draught, in the SPEC column layout (rounded as
    the file writes them)."""
    rows = hydrostatic_rows(geom, drafts_m, 0.0, density)
    out: dict[str, Any] = {"density": round(float(density), _DEC_DENSITY),
                           "draft": _round(drafts_m, _DEC_LENGTH)}
    out.update({key: _round(rows[key], dec) for key, dec in _HYDRO_DECIMALS})
    return out


def clearance_m(geom: HullGeometry, plane: Plane, points_xyz: np.ndarray) -> float:
    """Least height of the points (x, y, z) above the waterplane, measured along its normal, m
    (negative: at least one point is under water)."""
    _, n = _axes(plane.heel_deg)
    pts = np.asarray(points_xyz, dtype=float)
    c = plane.d_m + plane.slope * (0.5 * geom.length_bp_m - pts[:, 0])
    return float(np.min(pts[:, 1:] @ n - c))


def _between(a: Plane, b: Plane, heel_deg: float) -> Plane:
    """The plane linearly inter- or extrapolated in heel from planes a and b (a first
    guess for the equilibrium solver)."""
    f = (heel_deg - a.heel_deg) / (b.heel_deg - a.heel_deg)
    return Plane(a.d_m + f * (b.d_m - a.d_m), a.slope + f * (b.slope - a.slope), heel_deg)


def immersion_angle(
    geom: HullGeometry,
    points_xyz: np.ndarray,
    volume_m3: float,
    lcg_m: float | None,
    scanned: Sequence[Plane],
) -> float:
    """Least heel, deg, at which any of the points reaches the equilibrium waterplane.

    `scanned`: the equilibrium waterplanes at increasing heels (the cross-curve heels) of
    this displacement, a list or a `Scan` that solves them only as they are read. The first
    scanned heel at which a point is immersed brackets the angle with the one before (the
    heels beyond it are not read); brentq on the heel then finds it, solving the equilibrium
    (free trim with xB = lcg_m, or even keel when lcg_m is None) at every trial heel. A point
    immersed already at the first heel gives that heel; one never immersed up to the last
    scanned heel gives that heel (90° for the default scan), the end of the range the tables
    cover.

    The clearances at the bracket's ends are those of the scanned planes (brentq asks for
    them first); each trial heel's solve starts from the line through the two planes already
    solved nearest it, so that the later trials, close together, take fewer steps.
    """
    before = clearance_m(geom, scanned[0], points_xyz)
    if before <= 0.0:
        return scanned[0].heel_deg
    for j in range(1, len(scanned)):
        now = clearance_m(geom, scanned[j], points_xyz)
        if now <= 0.0:
            return _immersion_between(geom, points_xyz, volume_m3, lcg_m,
                                      (scanned[j - 1], before), (scanned[j], now))
        before = now
    return scanned[-1].heel_deg


def _immersion_between(geom: HullGeometry, points_xyz: np.ndarray, volume_m3: float,
                       lcg_m: float | None, prev: tuple[Plane, float],
                       nxt: tuple[Plane, float]) -> float:
    """The heel (deg) between two scanned (plane, clearance m) at which the points reach the
    water, by brentq on the clearance at the equilibrium waterplane (immersion_angle)."""
    known = {prev[0].heel_deg: prev[1], nxt[0].heel_deg: nxt[1]}
    solved = [prev[0], nxt[0]]

    def gap(h: float) -> float:
        if h in known:
            return known[h]
        a, b = sorted(solved, key=lambda p: abs(p.heel_deg - h))[:2]
        p = equilibrium_plane(geom, volume_m3, h, lcg_m, guess=_between(a, b, h))
        solved.append(p)
        return clearance_m(geom, p, points_xyz)

    return float(brentq(gap, prev[0].heel_deg, nxt[0].heel_deg, xtol=1e-4))


def first_immersed(geom: HullGeometry, points_xyz: np.ndarray, volume_m3: float,
                   lcg_m: float | None, heel_deg: float, scanned: Sequence[Plane]) -> int:
    """Index of the point nearest the water (least clearance) at `heel_deg`, deg: the one that
    governs the immersion angle found there."""
    near = min(scanned, key=lambda p: abs(p.heel_deg - heel_deg))
    plane = equilibrium_plane(geom, volume_m3, heel_deg, lcg_m, guess=near)
    return int(np.argmin([clearance_m(geom, plane, p[None, :]) for p in points_xyz]))


def deck_edge_points(geom: HullGeometry) -> np.ndarray:
    """(n, 3) points (x, y, z), m: the starboard deck-edge point of every station."""
    return np.column_stack([geom.x_m, geom.deck_edge_yz])


def opening_points(openings: Sequence[Any]) -> np.ndarray:
    """(n, 3) points (x, |y|, z), m, of the openings: each taken on the immersing side."""
    return np.array([[float(o.x), abs(float(o.y)), float(o.z)] for o in openings]
                    ).reshape(-1, 3)


class Scan(Sequence[Plane]):
    """Equilibrium waterplanes at increasing heels (deg, the first 0) for one volume (m³),
    solved only as they are read and kept: free trim with xB = lcg_m, or even keel when
    lcg_m is None; each solve starts from the last ones (the same chain of first guesses
    however far it is read). An immersion search reads only up to the first heel that
    immerses its points."""

    def __init__(self, geom: HullGeometry, volume_m3: float, lcg_m: float | None,
                 heels_deg: Sequence[float], upright: Plane | None = None) -> None:
        self._geom, self._volume, self._lcg = geom, volume_m3, lcg_m
        self._heels = [float(h) for h in heels_deg]
        self._upright = upright
        self._planes: list[Plane] = []

    def __len__(self) -> int:
        return len(self._heels)

    def __getitem__(self, i):  # type: ignore[override]
        if isinstance(i, slice):
            return [self[k] for k in range(*i.indices(len(self)))]
        k = range(len(self))[i]
        planes = self._planes
        while len(planes) <= k:
            h = self._heels[len(planes)]
            if h == 0.0 and self._upright is not None:
                p = self._upright
            else:
                guess = (None if not planes else planes[-1] if len(planes) < 2
                         else _between(planes[-2], planes[-1], h))
                p = equilibrium_plane(self._geom, self._volume, h, self._lcg, guess=guess)
            planes.append(p)
        return planes[k]


def heel_scan(geom: HullGeometry, volume_m3: float, lcg_m: float | None,
              heels_deg: Sequence[float], upright: Equilibrium | None = None
              ) -> list[Equilibrium]:
    """Equilibria at every heel of `heels_deg` (the whole `Scan`, with the centre of
    buoyancy at each)."""
    planes = Scan(geom, volume_m3, lcg_m, heels_deg,
                  None if upright is None else upright.plane)
    return [upright if upright is not None and p is upright.plane else state_at(geom, p)
            for p in planes]


def default_heels(vessel: Any) -> list[float]:
    """The cross-curve heels (deg) made when none are asked for: every 5° to 90°, and the
    Grain Code's 12° and 40° when the vessel has grain compartments."""
    grain = getattr(vessel, "grain", None)
    extra = GRAIN_HEELS_DEG if grain is not None and grain.compartments else ()
    return sorted(set(DEFAULT_HEELS_DEG) | set(extra))


def build_tables(
    vessel: Any,
    *,
    even_keel: bool = False,
    heels_deg: Sequence[float] | None = None,
    trims: Sequence[float] | None = None,
    progress: Callable[[int, int], None] | None = None,
) -> dict[str, Any]:
    """Hydrostatics, cross curves (KN), deck-edge and flooding angles from vessel.hull.

    vessel: the Vessel model (reportgen.inputs) or any object with the same attributes
    (hull.stations[i].x/.points, hull.density, particulars.length_bp/breadth/depth/
    summer_draft, lightship.mass, openings[i].name/x/y/z).
    even_keel: cross curves at zero trim instead of free trim (free trim: at each
    displacement, xB is held at the even-keel upright LCB, so the ship trims as it heels).
    heels_deg: the cross-curve heels, deg (default 0 to 90 step 5, with GRAIN_HEELS_DEG for a
    vessel with grain compartments; must start at 0).
    trims: the trims (m, + by the stern) to make every table at (SPEC.md `trims`; see
    reportgen.hull.trimmed); None: one even-keel table of each.
    progress(done, total): called as the work advances.

    Hydrostatics: N_DRAUGHTS draughts (see draught_range; at midships with trims). Cross
    curves: N_DISPLACEMENTS displacements spanning the same range. Deck edge: the least heel
    at which a deck-edge point (the last offset of a station, starboard) reaches the
    equilibrium waterplane. Flooding angle (only when openings exist): the least heel at
    which an opening reaches it; each opening is taken at |y| on the immersing (starboard)
    side, which is conservative for an opening given on the other side (it is treated as
    if it also had a twin on the immersing side).

    Raises ValueError when the offsets cannot be integrated faithfully (too few or too
    widely spaced stations, a block coefficient above 1; reportgen.hull.trimmed).
    """
    density = float(vessel.hull.density)
    geom = geometry_of(vessel)
    heels = [float(h) for h in (default_heels(vessel) if heels_deg is None else heels_deg)]
    if not heels or heels[0] != 0.0 or np.any(np.diff(heels) <= 0):
        raise ValueError("the cross-curve heels must start at 0 and increase")
    if trims is not None and even_keel:
        raise ValueError("--even-keel and --trims exclude each other: tables at several "
                         "trims are made free to trim from each trim")
    lpp = float(vessel.particulars.length_bp)
    if trims is not None and max(abs(float(t)) for t in trims) > MAX_TRIM_OF_LPP * lpp:
        raise ValueError(f"--trims: a trim beyond {MAX_TRIM_OF_LPP:.0%} of Lpp "
                         f"({MAX_TRIM_OF_LPP * lpp:g} m) is no floating condition to tabulate")
    check_stations(geom, float(vessel.particulars.summer_draft))

    drafts = draught_range(geom, vessel, density)
    at = [None] if trims is None else [float(t) for t in trims]
    n_disp = N_DISPLACEMENTS
    total = 1 + n_disp * len(at)
    done = 0
    cols: dict[str, list[list[float]]] = {}
    for t in at:
        for k, v in hydrostatic_rows(geom, drafts, t or 0.0, density).items():
            cols.setdefault(k, []).append(v)
    check_block_coefficient(cols["cb"], list(drafts), trims)
    hydro: dict[str, Any] = {"density": round(density, _DEC_DENSITY)}
    if trims is not None:
        hydro["trims"] = _round(at, _DEC_LENGTH)
    hydro["draft"] = _round(drafts, _DEC_LENGTH)
    for key, dec in _HYDRO_DECIMALS:
        cols[key] = [_round(row, dec) for row in cols[key]]
        hydro[key] = cols[key][0] if trims is None else cols[key]
    # cross curves over the displacements every trim's hydrostatic row covers
    lo = max(row[0] for row in cols["displacement"])
    hi = min(row[-1] for row in cols["displacement"])
    done += 1
    if progress is not None:
        progress(done, total)

    disps = np.round(np.linspace(lo, hi, n_disp), _DEC_MASS)
    deck = deck_edge_points(geom)
    vents = opening_points(getattr(vessel, "openings", None) or [])
    kn_rows: list[list[list[float]]] = []
    deck_angles: list[list[float]] = []
    flood_angles: list[list[float]] = []
    governing: list[list[str]] = []  # the opening that reaches the water first, per row
    names = [str(o.name) for o in (getattr(vessel, "openings", None) or [])]
    for t in at:
        kn_t, deck_t, flood_t, gov_t = [], [], [], []
        for disp in disps:
            vol = float(disp) / density
            if t is None:
                upright = equilibrium(geom, vol, 0.0)
                lcg = None if even_keel else upright.lcb_m
            else:  # the LCG that gives trim t upright (reportgen.hull.trimmed)
                upright = upright_at_trim(geom, vol, t)
                lcg = upright.lcb_m
            states = heel_scan(geom, vol, lcg, heels, upright=upright)
            kn_t.append(_round([e.kn_m for e in states], _DEC_LENGTH))
            planes = [e.plane for e in states]
            deck_t.append(immersion_angle(geom, deck, vol, lcg, planes))
            if len(vents):
                flood_t.append(immersion_angle(geom, vents, vol, lcg, planes))
                gov_t.append(names[first_immersed(geom, vents, vol, lcg, flood_t[-1], planes)])
            done += 1
            if progress is not None:
                progress(done, total)
        kn_rows.append(kn_t)
        deck_angles.append(_round(deck_t, _DEC_ANGLE))
        flood_angles.append(_round(flood_t, _DEC_ANGLE))
        governing.append(gov_t)

    one = trims is None  # one table: flat rows, no trims key
    trim_key = {} if one else {"trims": hydro["trims"]}
    disp_list = _round(disps, _DEC_MASS)
    out: dict[str, Any] = {
        "hydrostatics": hydro,
        "cross_curves": {
            "trim": "even_keel" if even_keel else "free", **trim_key,
            "heel": _round(heels, _DEC_HEEL),
            "displacement": disp_list,
            "kn": kn_rows[0] if one else kn_rows,
        },
        "deck_edge": {**trim_key, "displacement": disp_list,
                      "angle": deck_angles[0] if one else deck_angles},
    }
    if len(vents):
        out["flooding_angle"] = {**trim_key, "displacement": disp_list,
                                 "angle": flood_angles[0] if one else flood_angles,
                                 "opening": governing[0] if one else governing}
    return out
