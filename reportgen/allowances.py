"""Masses the Code adds to a condition's loading: the water absorbed by timber deck cargo on
arrival, and ice (IS Code 2008 Part B). Pure functions of plain values; each result is a
loading line (reportgen.loading.Line, kind "allowance").

Units: mass t, areas m², lengths m (x from AP, z above base), kg/m² where named.

Sources.
- Timber: in the arrival condition the mass of the timber deck cargo is increased by 10 % for
  the water it absorbs, IS Code 2008 Part B 3.4.2.8 (the rule of practice for timber deck
  cargoes; the 10 % and the paragraph number recalled from memory, not found in the reference
  store). Each timber item's absorbed water is its own line at the item's centre.
- Ice: 30 kg/m² on exposed weather decks and gangways; 7.5 kg/m² on the projected lateral area
  of each side above the waterplane; rails, sundry booms, spars (except masts), rigging and
  small objects allowed for by increasing the total projected area of continuous surfaces by
  5 % and its static moment by 10 % (published text read in the same words in the icing annex
  of the HSC Code; in the 2008 IS Code Part B chapter 6, 6.3, for fishing vessels, applied to
  other ships by 6.1, the paragraph numbers recalled from memory). `half`: one half of each
  allowance (the areas of less severe icing, ibid.).
- Readings (stated on the sheet): "each side" counts both sides, 2 × 7.5 kg/m² on the
  projected area of one side, symmetric (TCG 0); the static moment is the moment about the
  baseline, so the side ice's VCG is 1.10/1.05 × the centroid height of the area, its LCG the
  centroid of the area; the lateral area is taken above the waterline of the condition without
  the ice (more area, so more ice, than at the iced waterline).
"""

from __future__ import annotations

from dataclasses import dataclass

from reportgen.loading import Line

TIMBER_ABSORPTION = 0.10  # Part B 3.4.2.8 (recalled from memory): +10 % on arrival
ICE_DECK_KG_M2 = 30.0  # exposed weather decks and gangways
ICE_SIDE_KG_M2 = 7.5  # projected lateral area of each side above the waterplane
RIGGING_AREA_FACTOR = 1.05  # projected area of continuous surfaces +5 %
RIGGING_MOMENT_FACTOR = 1.10  # static moment of that area +10 %
SIDES = 2  # "each side": port and starboard
ICING_FRACTION = {"full": 1.0, "half": 0.5, "none": 0.0}


def allowance_line(name: str, content: str, mass_t: float, lcg_m: float, vcg_m: float,
                   tcg_m: float = 0.0) -> Line:
    """A loading line of kind "allowance"."""
    return Line("allowance", None, name, content, None, None, None, None, None, float(mass_t),
                float(lcg_m), float(vcg_m), float(tcg_m), 0.0, None)


def absorbed_water_t(timber_mass_t: float) -> float:
    """The water a timber deck cargo of `timber_mass_t` absorbs by arrival: 10 % of it (t)."""
    return TIMBER_ABSORPTION * timber_mass_t


@dataclass(frozen=True)
class Ice:
    """Ice of one condition: on the decks (area m², mass t, centre m) and on the sides (the
    projected lateral area of one side m² with its centroid, the area and moment factors,
    mass t and centre m); totals."""

    fraction: float
    deck_area_m2: float
    deck_mass_t: float
    deck_lcg: float
    deck_vcg: float
    side_area_m2: float
    side_x_m: float
    side_z_m: float
    side_mass_t: float
    side_lcg: float
    side_vcg: float

    @property
    def mass_t(self) -> float:
        return self.deck_mass_t + self.side_mass_t

    @property
    def lcg(self) -> float:
        m = self.mass_t
        return (self.deck_mass_t * self.deck_lcg + self.side_mass_t * self.side_lcg) / m if m \
            else 0.0

    @property
    def vcg(self) -> float:
        m = self.mass_t
        return (self.deck_mass_t * self.deck_vcg + self.side_mass_t * self.side_vcg) / m if m \
            else 0.0


def ice(fraction: float, deck_area_m2: float, deck_lcg_m: float, deck_vcg_m: float,
        side_area_m2: float, side_x_m: float, side_z_m: float) -> Ice:
    """Ice on the exposed decks and on both sides (see the module's sources).

    deck mass = f·30 kg/m²·A_deck at the decks' centre;
    side mass = f·2·7.5 kg/m²·1.05·A_side, its VCG = 1.10·A_side·z / (1.05·A_side), its LCG the
    area's centroid x; f = 1 (full) or 0.5 (half).
    """
    deck_t = fraction * ICE_DECK_KG_M2 * deck_area_m2 / 1000.0
    side_t = fraction * SIDES * ICE_SIDE_KG_M2 * RIGGING_AREA_FACTOR * side_area_m2 / 1000.0
    side_vcg = RIGGING_MOMENT_FACTOR * side_z_m / RIGGING_AREA_FACTOR
    return Ice(fraction, deck_area_m2, deck_t, deck_lcg_m, deck_vcg_m, side_area_m2, side_x_m,
               side_z_m, side_t, side_x_m, side_vcg)
