"""Floating position from a hydrostatic table: density correction, draughts about the LCF,
trim, table range. References: elementary ship hydrostatics (Rawson & Tupper, Basic Ship Theory,
ch. 2 and 4) worked by hand below."""

from __future__ import annotations

import numpy as np
import pytest

from reportgen.errors import InputError
from reportgen.floating import (
    HydroTable,
    draughts,
    hydrostatics_at,
    summer_draught_warning,
    trim_m,
    waterline_height,
)

# An invented table at 1.025 t/m³ with a rising LCF and MCT (values chosen for hand checks).
TABLE = HydroTable(
    density=1.025,
    draft=np.array([2.0, 4.0, 6.0]),
    displacement=np.array([2050.0, 4305.0, 6765.0]),
    lcb=np.array([51.0, 50.5, 50.0]),
    lcf=np.array([49.0, 48.0, 46.0]),
    kmt=np.array([12.0, 8.0, 7.5]),
    mct=np.array([80.0, 90.0, 100.0]),
    tpc=np.array([10.5, 11.5, 12.5]),
    lwl=None,
    cb=None,
)


def test_table_rows_returned_exactly():
    # MSC.1/Circ.1229: results from pre-programmed tables match the tables.
    p = hydrostatics_at(TABLE, 4305.0, 1.025)
    assert (p.draft, p.lcb, p.lcf, p.kmt, p.mct, p.tpc) == (4.0, 50.5, 48.0, 8.0, 90.0, 11.5)


def test_density_correction_same_volume():
    # In fresh water (1.000) Δ = 4200 t is the volume 4200 m³ = the table's 4305 t at 1.025:
    # geometry from that row, MCT and TPC scaled by 1.000/1.025.
    p = hydrostatics_at(TABLE, 4200.0, 1.000)
    assert p.displacement_table == pytest.approx(4305.0)
    assert p.draft == pytest.approx(4.0)
    assert p.kmt == pytest.approx(8.0)
    assert p.mct == pytest.approx(90.0 / 1.025)
    assert p.tpc == pytest.approx(11.5 / 1.025)


def test_between_rows_linear():
    p = hydrostatics_at(TABLE, (2050.0 + 4305.0) / 2, 1.025)
    assert p.draft == pytest.approx(3.0)
    assert p.lcf == pytest.approx(48.5)


def test_outside_the_table_is_refused():
    with pytest.raises(InputError, match="outside the hydrostatic table"):
        hydrostatics_at(TABLE, 7000.0, 1.025)
    with pytest.raises(InputError, match="not extrapolated"):
        hydrostatics_at(TABLE, 2000.0, 1.025)


def test_trim_sign_and_size():
    # t = Δ(LCB − LCG)/(100·MCT): G 1 m aft of B, Δ = 4305 t, MCT 90 t·m/cm -> 0.4783 m by the
    # stern (SPEC.md: trim positive by the stern).
    assert trim_m(4305.0, 50.5, 49.5, 90.0) == pytest.approx(4305.0 / 9000.0)
    assert trim_m(4305.0, 50.5, 51.5, 90.0) < 0


def test_draughts_about_the_lcf():
    # LCF 40 m from AP, Lpp 100 m, T at LCF 5 m, trim 1 m by the stern: the waterline rotates
    # about the LCF, so d_aft = 5 + 1·40/100 = 5.4, d_fore = 5.4 − 1 = 4.4, d_mid = 5 + 1·(40 −
    # 50)/100 = 4.9 (similar triangles).
    d = draughts(5.0, 1.0, 40.0, 100.0)
    assert d.aft == pytest.approx(5.4)
    assert d.fore == pytest.approx(4.4)
    assert d.mid == pytest.approx(4.9)
    assert waterline_height(0.0, d.mid, 1.0, 100.0) == pytest.approx(d.aft)
    assert waterline_height(100.0, d.mid, 1.0, 100.0) == pytest.approx(d.fore)
    assert waterline_height(40.0, d.mid, 1.0, 100.0) == pytest.approx(5.0)


def test_summer_draught_warning():
    assert summer_draught_warning(6.30, 6.35) is None
    text = summer_draught_warning(6.40, 6.35)
    assert text is not None and "summer load line" in text and "6.350" in text
