"""Floating position from a hydrostatic table: density correction, draughts about the LCF,
trim, tables at several trims, table range, and the load line. References: elementary ship
hydrostatics (Rawson & Tupper, Basic Ship Theory, ch. 2 and 4) worked by hand below; the
fresh water allowance of the Load Line Convention 1966, Annex I, regulation 40(4)."""

from __future__ import annotations

import numpy as np
import pytest

from reportgen.errors import InputError
from reportgen.floating import (
    HydroTable,
    draughts_about_lcf,
    hydrostatics_at,
    trim_m,
    waterline_height,
)
from reportgen.loadline import dock_water_allowance_mm, fresh_water_allowance_mm, load_line


def _table(trims=None, lcb_rows=None) -> HydroTable:
    """An invented table at 1.025 t/m³ with a rising LCF and MCT (values chosen for hand
    checks); with trims, the same rows at every trim except LCB (given per trim)."""
    k = 1 if trims is None else len(trims)

    def rows(v):
        return np.tile(np.array(v, dtype=float), (k, 1))

    lcb = rows([51.0, 50.5, 50.0]) if lcb_rows is None else np.array(lcb_rows, dtype=float)
    return HydroTable(
        density=1.025, trims=None if trims is None else np.array(trims, dtype=float),
        draft=rows([2.0, 4.0, 6.0]), displacement=rows([2050.0, 4305.0, 6765.0]), lcb=lcb,
        lcf=rows([49.0, 48.0, 46.0]), kmt=rows([12.0, 8.0, 7.5]), mct=rows([80.0, 90.0, 100.0]),
        tpc=rows([10.5, 11.5, 12.5]), lwl=None, cb=None)


TABLE = _table()


def test_table_rows_returned_exactly():
    # MSC.1/Circ.1229: results from pre-programmed tables match the tables. LCG = LCB: no trim.
    p = hydrostatics_at(TABLE, 4305.0, 1.025, lcg_m=50.5)
    assert (p.draft, p.lcb, p.lcf, p.kmt, p.mct, p.tpc) == (4.0, 50.5, 48.0, 8.0, 90.0, 11.5)
    assert p.trim == 0.0


def test_density_correction_same_volume():
    # In fresh water (1.000) Δ = 4200 t is the volume 4200 m³ = the table's 4305 t at 1.025:
    # geometry from that row, MCT and TPC scaled by 1.000/1.025.
    p = hydrostatics_at(TABLE, 4200.0, 1.000, lcg_m=50.5)
    assert p.displacement_table == pytest.approx(4305.0)
    assert p.draft == pytest.approx(4.0)
    assert p.kmt == pytest.approx(8.0)
    assert p.mct == pytest.approx(90.0 / 1.025)
    assert p.tpc == pytest.approx(11.5 / 1.025)


def test_between_rows_linear():
    p = hydrostatics_at(TABLE, (2050.0 + 4305.0) / 2, 1.025, lcg_m=50.75)
    assert p.draft == pytest.approx(3.0)
    assert p.lcf == pytest.approx(48.5)


def test_outside_the_table_is_refused():
    with pytest.raises(InputError, match="outside the hydrostatic table"):
        hydrostatics_at(TABLE, 7000.0, 1.025, 50.0)
    with pytest.raises(InputError, match="not extrapolated"):
        hydrostatics_at(TABLE, 2000.0, 1.025, 50.0)


def test_trim_sign_and_size():
    # t = Δ(LCB − LCG)/(100·MCT): G 1 m aft of B, Δ = 4305 t, MCT 90 t·m/cm -> 0.4783 m by the
    # stern (SPEC.md: trim positive by the stern).
    assert trim_m(4305.0, 50.5, 49.5, 90.0) == pytest.approx(4305.0 / 9000.0)
    assert trim_m(4305.0, 50.5, 51.5, 90.0) < 0
    assert hydrostatics_at(TABLE, 4305.0, 1.025, 49.5).trim == pytest.approx(4305.0 / 9000.0)


def test_draughts_about_the_lcf():
    # LCF 40 m from AP, Lpp 100 m, T at LCF 5 m, trim 1 m by the stern: the waterline rotates
    # about the LCF, so d_aft = 5 + 1·40/100 = 5.4, d_fore = 5.4 − 1 = 4.4, d_mid = 5 + 1·(40 −
    # 50)/100 = 4.9 (similar triangles).
    d = draughts_about_lcf(5.0, 1.0, 40.0, 100.0)
    assert d.aft == pytest.approx(5.4)
    assert d.fore == pytest.approx(4.4)
    assert d.mid == pytest.approx(4.9)
    assert waterline_height(0.0, d.mid, 1.0, 100.0) == pytest.approx(d.aft)
    assert waterline_height(100.0, d.mid, 1.0, 100.0) == pytest.approx(d.fore)
    assert waterline_height(40.0, d.mid, 1.0, 100.0) == pytest.approx(5.0)


# A table at trims −1, 0, 2 m whose LCB moves aft 0.5 m per metre of trim by the stern (a hand
# made table: the equilibrium trim is then (LCB0 − LCG)/0.5, linear in trim between rows).
TRIMMED = _table([-1.0, 0.0, 2.0], [[51.5, 51.0, 50.5], [51.0, 50.5, 50.0], [50.0, 49.5, 49.0]])


def test_trimmed_table_finds_lcb_equal_lcg():
    p = hydrostatics_at(TRIMMED, 4305.0, 1.025, lcg_m=50.0)  # LCB 50.5 at trim 0: 1 m by stern
    assert p.trim == pytest.approx(1.0)
    assert p.lcb == pytest.approx(50.0)
    p = hydrostatics_at(TRIMMED, 4305.0, 1.025, lcg_m=50.75)
    assert p.trim == pytest.approx(-0.5)
    assert hydrostatics_at(TRIMMED, 4305.0, 1.025, lcg_m=49.5).trim == pytest.approx(2.0)


def test_trim_outside_the_tables_is_an_error():
    # SPEC.md: a condition trim outside a table's trims is an error, never an extrapolation.
    with pytest.raises(InputError, match="outside the hydrostatic table's trims"):
        hydrostatics_at(TRIMMED, 4305.0, 1.025, lcg_m=49.0)
    with pytest.raises(InputError, match="not extrapolated"):
        hydrostatics_at(TRIMMED, 4305.0, 1.025, lcg_m=51.5)


def test_fresh_water_allowance_of_a_box_barge():
    # Box barge 100 × 16 m at its summer draught 10 m in salt water: Δs = 1.025·100·16·10 =
    # 16400 t, TPC = 1.025·100·16/100 = 16.4 t/cm, FWA = Δ/(4·TPC) = 250 mm = T·(1 − 1/1.025)·…
    # exactly: the box sinks by T·(1.025/1.000 − 1) = 0.25 m in fresh water (Archimedes).
    fwa = fresh_water_allowance_mm(16400.0, 16.4)
    assert fwa == pytest.approx(250.0)
    assert fwa / 1000.0 == pytest.approx(10.0 * (1.025 / 1.000 - 1.0))
    assert dock_water_allowance_mm(fwa, 1.025) == pytest.approx(0.0)
    assert dock_water_allowance_mm(fwa, 1.000) == pytest.approx(250.0)
    assert dock_water_allowance_mm(fwa, 1.015) == pytest.approx(100.0)


def test_load_line_permits_the_fresh_water_draught():
    # In fresh water the box may float at 10.25 m: not overloaded at 10.2 m, 50 mm still free.
    ll = load_line(10.0, 16400.0, 16.4, 1.000, 10.2, 16.0)
    assert ll.permissible_draft == pytest.approx(10.25)
    assert not ll.overloaded
    assert ll.deadweight_to_marks == pytest.approx(5.0 * 16.0)
    assert load_line(10.0, 16400.0, 16.4, 1.025, 10.0004, 16.4).overloaded is False  # < 1 mm
    assert load_line(10.0, 16400.0, 16.4, 1.025, 10.002, 16.4).overloaded is True
