"""Tests of sizing/conductor_resistance.py against IEC 60228:2004 Table 2.

Expected resistances are printed cells of IEC 60228:2004 Table 2 (class 2) as
read in public reproductions; the temperature correction is checked against
the IEC 60228:2004 Annex B formula k_t = 254.5 / (234.5 + t) (copper) and
248 / (228 + t) (aluminium) (from memory), an independent form of the law.
"""

from __future__ import annotations

import pytest
from cablewright.core.errors import OutOfRangeError, UnknownKeyError
from cablewright.sizing import conductor_resistance as cr


@pytest.mark.parametrize("csa,cond,ohm_km", [
    (0.5, "Cu", 36.0), (2.5, "Cu", 7.41), (95, "Cu", 0.193), (185, "Cu", 0.0991),
    (630, "Cu", 0.0283),                                              # IEC 60228:2004 Table 2
    (10, "Al", 3.08), (50, "Al", 0.641), (300, "Al", 0.100), (1200, "Al", 0.0247),
])
def test_table_2_values(csa, cond, ohm_km):
    """IEC 60228:2004 Table 2, class 2, maximum resistance at 20 °C, row csa, column cond."""
    assert cr.dc_resistance_20c_ohm_per_km(csa, cond) == ohm_km


def test_table_metadata_and_memory_rows():
    t = cr.IEC_60228_TABLE_2
    assert t.source == "IEC 60228:2004 Table 2" and t.unit == "ohm/km"
    cu = dict(t.copper_ohm_per_km)
    assert all(a in cu for a in cr.FROM_MEMORY_CSA_MM2["Cu"])


def test_resistance_falls_with_csa():
    """Consistency of IEC 60228:2004 Table 2: resistance falls with cross-section; Al above Cu."""
    for rows in (cr.IEC_60228_TABLE_2.copper_ohm_per_km, cr.IEC_60228_TABLE_2.aluminium_ohm_per_km):
        vals = [r for _, r in rows]
        assert all(b < a for a, b in zip(vals, vals[1:], strict=False))
    for a, r in cr.IEC_60228_TABLE_2.aluminium_ohm_per_km:
        assert r > cr.dc_resistance_20c_ohm_per_km(a, "Cu")


@pytest.mark.parametrize("csa,cond,temp", [(2.5, "Cu", 70), (240, "Cu", 90), (95, "Al", 90),
                                           (16, "Al", 5)])
def test_temperature_correction_matches_annex_b(csa, cond, temp):
    """IEC 60228:2004 Annex B: R_t = R20 / k_t, k_t = 254.5/(234.5+t) Cu, 248/(228+t) Al."""
    r20 = cr.dc_resistance_20c_ohm_per_km(csa, cond)
    k_t = 254.5 / (234.5 + temp) if cond == "Cu" else 248.0 / (228.0 + temp)
    assert cr.resistance_ohm_per_km(csa, cond, temp) == pytest.approx(r20 / k_t, rel=2e-4)


def test_alpha_values():
    """IEC 60287-1-1:2006 Table 1: alpha20 copper 3.93e-3 /K, aluminium 4.03e-3 /K."""
    assert cr.ALPHA_20_PER_K == {"Cu": 0.00393, "Al": 0.00403}
    assert cr.resistance_ohm_per_km(10, "Cu", 20) == 1.83


def test_standard_series():
    """IEC 60364-5-52:2009 Annex B sizes 1.5 to 630 mm², as listed in IEC 60228:2004 Table 2."""
    assert cr.STANDARD_CSA_MM2[:6] == (1.5, 2.5, 4, 6, 10, 16)
    assert cr.STANDARD_CSA_MM2[-4:] == (300, 400, 500, 630)
    assert len(cr.STANDARD_CSA_MM2) == 19


@pytest.mark.parametrize("need,size", [(0.3, 1.5), (1.5, 1.5), (20, 25), (120.0001, 150),
                                       (601, 630)])
def test_next_standard_csa(need, size):
    """IEC 60228:2004 Table 2 series: next size up."""
    assert cr.next_standard_csa(need) == size


def test_errors():
    with pytest.raises(OutOfRangeError, match="630"):
        cr.next_standard_csa(700)
    with pytest.raises(OutOfRangeError):
        cr.next_standard_csa(0)
    with pytest.raises(OutOfRangeError, match=r"IEC 60228:2004 Table 2"):
        cr.dc_resistance_20c_ohm_per_km(6, "Al")  # aluminium class 2 starts at 10 mm²
    with pytest.raises(OutOfRangeError):
        cr.dc_resistance_20c_ohm_per_km(20, "Cu")
    with pytest.raises(UnknownKeyError, match="Cu, Al"):
        cr.dc_resistance_20c_ohm_per_km(10, "Fe")
    with pytest.raises(OutOfRangeError):
        cr.resistance_ohm_per_km(10, "Cu", 300)
