"""The grain of a condition as loading: each compartment's state, volume, mass, centre and
volumetric heeling moment, from the vessel's grain compartments and the condition's grain
block (SPEC.md, grain.2008). Reads the file models; the physics is in reportgen.grain.

Grain Code (MSC.23(59)) assumptions taken here: a filled compartment holds the volume of the
whole space at its volumetric centre (B 1.3, B 1.4, recalled from memory), trimmed or untrimmed
with the booklet's VHM for that state; a partly filled compartment by volume (or mass × SF),
its centre and VHM interpolated linearly in the booklet's table at that volume (common practice
for pre-programmed tables, MSC.1/Circ.1229). Grain has no free-surface moment of its own: its
shift is the heeling arm of A 7. Holds are taken on the centreline (TCG 0): the format gives no
transverse centre.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from reportgen.grain import grain_mass_t, heeling_moment_tm


@dataclass(frozen=True)
class GrainLoad:
    """One compartment's grain: state (trimmed | untrimmed | partly), volume m³, mass t, centre
    m, VHM m⁴ and heeling moment VHM/SF t·m."""

    id: str
    name: str
    state: str
    volume: float
    mass: float
    lcg: float
    vcg: float
    vhm: float
    heeling_moment: float


@dataclass(frozen=True)
class GrainCargo:
    """The condition's grain: stowage factor m³/t, the loads, ΣVHM m⁴ and ΣVHM/SF t·m."""

    stowage_factor: float
    loads: tuple[GrainLoad, ...]
    vhm: float
    heeling_moment: float


def _load(comp, filling, sf: float) -> GrainLoad:
    if filling.filled is not None:
        f = comp.filled
        vhm = f.vhm if filling.filled == "trimmed" else comp.filled_untrimmed_vhm
        volume, lcg, vcg, state = f.volume, f.lcg, f.vcg, filling.filled
    else:
        t = comp.partly
        volume = filling.volume if filling.volume is not None else filling.mass * sf
        lcg, vcg, vhm = (float(np.interp(volume, t.volume, col)) for col in (t.lcg, t.vcg, t.vhm))
        state = "partly"
    return GrainLoad(comp.id, comp.name, state, float(volume), grain_mass_t(volume, sf),
                     float(lcg), float(vcg), float(vhm), heeling_moment_tm(vhm, sf))


def grain_cargo(vessel, condition) -> GrainCargo | None:
    """The condition's grain in the vessel's compartment order; None without grain."""
    g = condition.grain
    if g is None:
        return None
    sf = g.stowage_factor
    loads = tuple(_load(c, g.compartments[c.id], sf) for c in vessel.grain.compartments
                  if c.id in g.compartments)
    vhm = float(sum(x.vhm for x in loads))
    return GrainCargo(sf, loads, vhm, heeling_moment_tm(vhm, sf))

