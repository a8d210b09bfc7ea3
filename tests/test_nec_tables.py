"""The NFPA 70 tables of sizing/nec/ against public reproductions and outside relations.

Each check names the copy it reads.  Where no public copy was found (Table 310.17 above
4/0 AWG, the larger kcmil rows of 310.16) the check is a relation that holds outside our
code: the temperature formula of 310.15(B), the AWG geometry of ASTM B258, Note 2 of
Chapter 9 Table 9, and free air rating above raceway for the same conductor.
"""

from __future__ import annotations

import math

import pytest
from cablewright.core.errors import OutOfRangeError
from cablewright.sizing.nec import motors, tables

# ---------------------------------------------------------------- Table 310.16
# a public web reproduction, "NEC Table 310.16, Complete Conductor Ampacities Reference (2023 Edition)":
# (Cu 60, 75, 90, Al 60, 75, 90) as printed there, rows across the table's range.
PUBLISHED_310_16 = {
    "14": (15, 20, 25, None, None, None),
    "12": (20, 25, 30, 15, 20, 25),
    "8": (40, 50, 55, 35, 40, 45),
    "3": (85, 100, 115, 65, 75, 85),
    "1/0": (125, 150, 170, 100, 120, 135),
    "4/0": (195, 230, 260, 150, 180, 205),
    "350": (260, 310, 350, 210, 250, 280),
    "600": (350, 420, 475, 285, 340, 385),
    "750": (400, 475, 535, 320, 385, 435),
    "1000": (455, 545, 615, 375, 445, 500),
}


@pytest.mark.parametrize("size", sorted(PUBLISHED_310_16))
def test_310_16_rows_match_the_2023_reproduction(size):
    columns = [("Cu", 60), ("Cu", 75), ("Cu", 90), ("Al", 60), ("Al", 75), ("Al", 90)]
    for (conductor, temp), printed in zip(columns, PUBLISHED_310_16[size], strict=True):
        if printed is None:
            with pytest.raises(OutOfRangeError):
                tables.ampacity_a(size, conductor, temp)
        else:
            assert tables.ampacity_a(size, conductor, temp) == printed, (size, conductor, temp)


def test_310_16_rises_with_size_and_temperature_and_copper_beats_aluminium():
    # The physics behind every column (Neher-McGrath, NFPA 70 Informative Annex B): a
    # larger conductor or a hotter rating carries more; aluminium less than copper.
    for free_air in (False, True):
        for conductor in ("Cu", "Al"):
            for temp in (60, 75, 90):
                sizes = [s for s in tables.SIZES if not (conductor == "Al" and s == "14")]
                amps = [tables.ampacity_a(s, conductor, temp, free_air) for s in sizes]
                assert amps == sorted(amps) and len(set(amps)) == len(amps)
        for size in tables.SIZES[1:]:
            cu = [tables.ampacity_a(size, "Cu", t, free_air) for t in (60, 75, 90)]
            al = [tables.ampacity_a(size, "Al", t, free_air) for t in (60, 75, 90)]
            assert cu == sorted(cu) and al == sorted(al)
            assert all(a < c for a, c in zip(al, cu, strict=True))


# ---------------------------------------------------------------- Table 310.17
# One-conductor column of NEC Table 400.5(B) as reproduced in the Set Lighting Technician's
# Handbook, 4th ed., Appendix D Table D.1: the same values as Table 310.17 (copper, 8 AWG
# to 4/0 AWG) at 60, 75 and 90 °C.
PUBLISHED_FREE_AIR_CU = {
    "8": (None, 70, 80), "6": (None, 95, 105), "4": (105, 125, 140), "2": (140, 170, 190),
    "1/0": (195, 230, 260), "2/0": (225, 265, 300), "3/0": (260, 310, 350), "4/0": (300, 360, 405),
}


@pytest.mark.parametrize("size", sorted(PUBLISHED_FREE_AIR_CU))
def test_310_17_copper_rows_match_the_handbook_copy(size):
    for temp, printed in zip((60, 75, 90), PUBLISHED_FREE_AIR_CU[size], strict=True):
        if printed is not None:
            assert tables.ampacity_a(size, "Cu", temp, free_air=True) == printed


def test_free_air_rates_above_raceway_for_every_cell():
    # Table 310.17 (free air) against Table 310.16 (raceway): more cooling, more ampacity.
    for size in tables.SIZES[1:]:
        for conductor in ("Cu", "Al"):
            for temp in (60, 75, 90):
                assert (tables.ampacity_a(size, conductor, temp, True)
                        > tables.ampacity_a(size, conductor, temp))


# ---------------------------------------------------------------- 310.15(B)(1)
# a public web reproduction of Table 310.15(B)(1)(1) (2023): (upper end of row, 60/75/90 °C).
PUBLISHED_AMBIENT = {
    10: (1.29, 1.20, 1.15), 15: (1.22, 1.15, 1.12), 20: (1.15, 1.11, 1.08),
    25: (1.08, 1.05, 1.04), 30: (1.0, 1.0, 1.0), 35: (0.91, 0.94, 0.96),
    40: (0.82, 0.88, 0.91), 45: (0.71, 0.82, 0.87), 50: (0.58, 0.75, 0.82),
    55: (0.41, 0.67, 0.76), 60: (None, 0.58, 0.71),
}


@pytest.mark.parametrize("upper", sorted(PUBLISHED_AMBIENT))
def test_ambient_rows_match_the_2023_reproduction(upper):
    for temp, printed in zip((60, 75, 90), PUBLISHED_AMBIENT[upper], strict=True):
        if printed is None:
            with pytest.raises(OutOfRangeError):
                tables.ambient_factor(upper, temp)
        else:
            assert tables.ambient_factor(upper, temp) == printed
            assert tables.ambient_factor(upper - 4, temp) == printed  # the same row


def test_every_ambient_cell_follows_the_310_15_b_formula():
    # NFPA 70:2023 310.15(B): F = sqrt((Tc - Ta) / (Tc - 30)), Ta the warm end of the row;
    # the table prints it to two decimals.
    for upper, factors in tables.AMBIENT_310_15_B_1.rows.items():
        for tc, printed in zip((60, 75, 90), factors, strict=True):
            if printed is None:
                continue
            assert printed == pytest.approx(math.sqrt((tc - upper) / (tc - 30)), abs=0.0051), (upper, tc)


def test_ambient_beyond_the_column_is_refused():
    with pytest.raises(OutOfRangeError):
        tables.ambient_factor(56, 60)
    with pytest.raises(OutOfRangeError):
        tables.ambient_factor(86, 90)


# ---------------------------------------------------------------- 310.15(C)(1)
def test_adjustment_factors_match_the_2023_reproduction():
    # a public web reproduction, "Conductor Bundle Adjustment Factors": 4-6 80 %, 7-9 70 %, 10-20 50 %,
    # 21-30 45 %, 31-40 40 %, 41 and above 35 %.
    expected = {1: 1.0, 3: 1.0, 4: 0.8, 6: 0.8, 7: 0.7, 9: 0.7, 10: 0.5, 20: 0.5, 21: 0.45,
                30: 0.45, 31: 0.4, 40: 0.4, 41: 0.35, 120: 0.35}
    for count, factor in expected.items():
        assert tables.adjustment_factor(count) == factor, count


# ---------------------------------------------------------------- 240.4(D), 240.6(A)
def test_small_conductor_limits():
    # NFPA 70:2023 240.4(D)(3)-(7): 14 Cu 15 A, 12 Al 15 A, 12 Cu 20 A, 10 Al 25 A, 10 Cu 30 A.
    assert tables.small_conductor_limit_a("14", "Cu") == 15
    assert tables.small_conductor_limit_a("12", "Al") == 15
    assert tables.small_conductor_limit_a("12", "Cu") == 20
    assert tables.small_conductor_limit_a("10", "Al") == 25
    assert tables.small_conductor_limit_a("10", "Cu") == 30
    assert tables.small_conductor_limit_a("8", "Cu") is None


def test_standard_ratings_match_the_2023_text():
    # NFPA 70:2023 240.6(A) as reproduced on a public web page ("NEC 2023 240.6"): 15 ... 6000 A,
    # further fuse ratings 1, 3, 6 and 10 A.
    printed = (15, 20, 25, 30, 35, 40, 45, 50, 60, 70, 80, 90, 100, 110, 125, 150, 175, 200,
               225, 250, 300, 350, 400, 450, 500, 600, 700, 800, 1000, 1200, 1600, 2000, 2500,
               3000, 4000, 5000, 6000)
    assert tables.STANDARD_RATINGS_240_6_A.rows["ratings"] == printed
    assert tables.STANDARD_RATINGS_240_6_A.rows["fuses_only"] == (1, 3, 6, 10)
    assert tables.next_standard_rating_a(801) == 1000
    with pytest.raises(OutOfRangeError):
        tables.next_standard_rating_a(6001)


# ---------------------------------------------------------------- Table 250.122
def test_egc_table_matches_the_public_copy():
    # brunsengineering.com, "NEC Table 250.122" (Source: NFPA 70), every row.
    printed = [(15, "14", "12"), (20, "12", "10"), (60, "10", "8"), (100, "8", "6"),
               (200, "6", "4"), (300, "4", "2"), (400, "3", "1"), (500, "2", "1/0"),
               (600, "1", "2/0"), (800, "1/0", "3/0"), (1000, "2/0", "4/0"),
               (1200, "3/0", "250"), (1600, "4/0", "350"), (2000, "250", "400"),
               (2500, "350", "600"), (3000, "400", "600"), (4000, "500", "750"),
               (5000, "700", "1250"), (6000, "800", "1250")]
    for rating, cu, al in printed:
        assert tables.egc_size(rating, "Cu") == cu and tables.egc_size(rating, "Al") == al
    # Mike Holt's summary of the copper column: 30-60 A 10 AWG, 110-200 A 6 AWG, 700-800 A 1/0.
    assert tables.egc_size(30, "Cu") == "10"
    assert tables.egc_size(110, "Cu") == "6"
    assert tables.egc_size(700, "Cu") == "1/0"


# ---------------------------------------------------------------- Chapter 9 Tables 8, 9
def _astm_b258_cmil(size: str) -> float:
    # ASTM B258: d = 0.005 in x 92 ** ((36 - n) / 39), n = 0 for 1/0, -1 for 2/0, ...
    n = -(int(size.split("/")[0]) - 1) if "/" in size else int(size)
    d_mil = 5.0 * 92 ** ((36 - n) / 39)
    return d_mil ** 2


def test_table_8_areas_follow_the_awg_geometry():
    for size in ("14", "12", "10", "8", "6", "4", "3", "2", "1", "1/0", "2/0", "3/0", "4/0"):
        assert tables.area_cmil(size) == pytest.approx(_astm_b258_cmil(size), rel=0.003), size


def test_areas_in_mm2():
    # Chapter 9 Table 8 metric column: 4/0 AWG 107 mm², 12 AWG 3.31 mm²; 250 kcmil 127 mm²
    # (1 kcmil = 0.5067 mm², definition of the circular mil).
    assert tables.area_mm2("4/0") == pytest.approx(107.2, abs=0.1)
    assert tables.area_mm2("12") == pytest.approx(3.31, abs=0.01)
    assert tables.area_mm2("250") == pytest.approx(126.7, abs=0.1)


# a public web reproduction, "Alternating current resistance and reactance for 600 volt cables" (NEC Table 9),
# ohm/1000 ft: size -> (XL PVC/Al, XL steel, R Cu PVC, R Cu Al, R Cu steel, R Al PVC, R Al Al,
# R Al steel, Ze Cu PVC, Ze Cu Al, Ze Cu steel).
PUBLISHED_T9 = {
    "12": (0.054, 0.068, 2.0, 2.0, 2.0, 3.2, 3.2, 3.2, 1.7, 1.7, 1.7),
    "6": (0.051, 0.064, 0.49, 0.49, 0.49, 0.81, 0.81, 0.81, 0.44, 0.45, 0.45),
    "2": (0.045, 0.057, 0.19, 0.20, 0.20, 0.32, 0.32, 0.32, 0.19, 0.19, 0.20),
    "1/0": (0.044, 0.055, 0.12, 0.13, 0.12, 0.20, 0.21, 0.20, 0.13, 0.13, 0.13),
    "4/0": (0.041, 0.051, 0.062, 0.067, 0.063, 0.10, 0.11, 0.10, 0.074, 0.078, 0.080),
    "350": (0.040, 0.050, 0.038, 0.043, 0.039, 0.061, 0.066, 0.063, 0.053, 0.058, 0.060),
    "600": (0.039, 0.048, 0.023, 0.028, 0.025, 0.036, 0.041, 0.038, 0.040, 0.044, 0.047),
    "1000": (0.037, 0.046, 0.015, 0.019, 0.018, 0.023, 0.027, 0.025, 0.032, 0.036, 0.040),
}
PER_KFT = 304.8  # m in 1000 ft


@pytest.mark.parametrize("size", sorted(PUBLISHED_T9))
def test_table_9_rows_match_the_public_copy(size):
    row = PUBLISHED_T9[size]
    for i, raceway in enumerate(("pvc", "aluminum", "steel")):
        r_cu, x = tables.impedance_ohm_per_m(size, "Cu", raceway)
        r_al, _ = tables.impedance_ohm_per_m(size, "Al", raceway)
        assert r_cu * PER_KFT == pytest.approx(row[2 + i])
        assert r_al * PER_KFT == pytest.approx(row[5 + i])
        assert x * PER_KFT == pytest.approx(row[1] if raceway == "steel" else row[0])


@pytest.mark.parametrize("size", sorted(PUBLISHED_T9))
def test_table_9_note_2_gives_the_printed_effective_z(size):
    # Note 2: Ze = R cos θ + X sin θ at 0.85; printed to two significant figures.
    row = PUBLISHED_T9[size]
    for i, raceway in enumerate(("pvc", "aluminum", "steel")):
        r, x = tables.impedance_ohm_per_m(size, "Cu", raceway)
        ze = (r * 0.85 + x * math.sqrt(1 - 0.85 ** 2)) * PER_KFT
        assert ze == pytest.approx(row[8 + i], rel=0.08, abs=0.006), (size, raceway)
    assert tables.EFFECTIVE_Z_CU_STEEL_085.get(size, row[10]) == row[10]


def test_table_9_has_no_row_for_700_kcmil():
    with pytest.raises(OutOfRangeError):
        tables.impedance_ohm_per_m("700", "Cu")


# ---------------------------------------------------------------- Chapter 9 Tables 1, 4, 5
def test_conductor_areas_match_the_public_copy_of_table_5():
    # buildmyowncabin.com, "NEC 2008: Chapter 9 Table 5" (THHN/THWN and XHH/XHHW columns).
    thhn = {"14": 0.0097, "10": 0.0211, "6": 0.0507, "2": 0.1158, "1/0": 0.1855, "4/0": 0.3237,
            "350": 0.5242, "600": 0.8676, "1000": 1.3478}
    xhhw = {"14": 0.0139, "8": 0.0437, "4": 0.0814, "1": 0.1534, "3/0": 0.2642, "250": 0.3904,
            "500": 0.6984, "750": 1.0532, "1000": 1.3519}
    for size, area in thhn.items():
        assert tables.AREA_CH9_T5.rows["THHN"][size] == area
    for size, area in xhhw.items():
        assert tables.AREA_CH9_T5.rows["XHHW"][size] == area


def test_emt_areas_and_fill_percentages():
    # 2011 NEC Handbook Chapter 9 Table 4, Article 358 (EMT), 100 % column; the 40 % column
    # printed beside it (1/2: 0.122, 1: 0.346, 2: 1.342 in²); Table 1: 53 / 31 / 40 %.
    printed = {"1/2": 0.304, "3/4": 0.533, "1": 0.864, "1-1/4": 1.496, "1-1/2": 2.036, "2": 3.356}
    for trade, area in printed.items():
        assert tables.EMT_AREA_CH9_T4.rows[trade] == area
    assert round(0.40 * tables.EMT_AREA_CH9_T4.rows["1/2"], 3) == 0.122
    assert round(0.40 * tables.EMT_AREA_CH9_T4.rows["1"], 3) == 0.346
    assert round(0.40 * tables.EMT_AREA_CH9_T4.rows["2"], 3) == 1.342
    assert (tables.fill_limit_pct(1), tables.fill_limit_pct(2), tables.fill_limit_pct(3)) == (53, 31, 40)


# ---------------------------------------------------------------- Tables 430.248, 430.250
def test_three_phase_motor_currents_match_the_public_copies():
    # Schneider Electric 8536DB0901 Table 74 (2017 NEC Table 430.250) and the 1999 edition's
    # Table 430-150 (paigewire.com): (hp, 200, 208, 230, 460, 575 V).
    printed = [(0.5, 2.5, 2.4, 2.2, 1.1, 0.9), (3, 11.0, 10.6, 9.6, 4.8, 3.9),
               (10, 32.2, 30.8, 28, 14, 11), (25, 78.2, 74.8, 68, 34, 27),
               (50, 150, 143, 130, 65, 52), (100, 285, 273, 248, 124, 99),
               (200, 552, 528, 480, 240, 192)]
    for hp, *currents in printed:
        for volts, amps in zip((200, 208, 230, 460, 575), currents, strict=True):
            assert motors.full_load_current_a(hp, volts, 3) == amps, (hp, volts)
    assert motors.full_load_current_a(500, 460, 3) == 590
    assert motors.full_load_current_a(500, 575, 3) == 472
    with pytest.raises(OutOfRangeError):
        motors.full_load_current_a(250, 230, 3)  # blank cell


def test_single_phase_motor_currents_match_the_public_copy():
    # 1999 edition's Table 430-148 (paigewire.com), every row: (hp, 115, 200, 208, 230 V).
    printed = [(1 / 6, 4.4, 2.5, 2.4, 2.2), (0.25, 5.8, 3.3, 3.2, 2.9), (1 / 3, 7.2, 4.1, 4.0, 3.6),
               (0.5, 9.8, 5.6, 5.4, 4.9), (0.75, 13.8, 7.9, 7.6, 6.9), (1, 16, 9.2, 8.8, 8.0),
               (1.5, 20, 11.5, 11.0, 10), (2, 24, 13.8, 13.2, 12), (3, 34, 19.6, 18.7, 17),
               (5, 56, 32.2, 30.8, 28), (7.5, 80, 46.0, 44.0, 40), (10, 100, 57.5, 55.0, 50)]
    for hp, *currents in printed:
        for volts, amps in zip((115, 200, 208, 230), currents, strict=True):
            assert motors.full_load_current_a(hp, volts, 1) == amps, (hp, volts)


def test_motor_voltage_ranges_of_430_6():
    # 430.6(A)(1) / the tables' headnote: 110-120, 220-240, 440-480, 550-600 V.
    assert motors.full_load_current_a(25, 480, 3) == motors.full_load_current_a(25, 460, 3)
    assert motors.full_load_current_a(5, 240, 1) == motors.full_load_current_a(5, 230, 1)
    assert motors.full_load_current_a(20, 600, 3) == 22
    with pytest.raises(OutOfRangeError):
        motors.full_load_current_a(25, 400, 3)
