"""Methods F, F_flat, G, G_vertical and trays in tiers, end to end (issue 15 items 4, 5, 12)."""

from __future__ import annotations

import json

import pytest
from cablewright.core.errors import OutOfRangeError
from cablewright.extract.model import Measurement, RouteSegment
from cablewright.sizing import correction_tables as ctab
from cablewright.sizing.capacity_tables import canonical_method, tabulated_capacity
from cablewright.sizing.model import CircuitSpec, Load, Stretch
from cablewright.sizing.select import size_circuit
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from cablewright.cli import main
from cablewright.config import load_settings
from cablewright.pipeline import _stretches, drawing_config


# ------------------------------------------------------------------ factors
@pytest.mark.parametrize("method, n, trays, support, value", [
    # IEC 60364-5-52:2009 Table B.52.21, perforated trays, trefoil rows: 1 tray 1.00/0.98/0.96
    ("F", 1, 1, None, 1.00), ("F", 2, 1, None, 0.98), ("F", 3, 2, None, 0.89),
    # ladder, trefoil rows: 1 ladder 1.00 for 1 to 3 circuits; 3 ladders, 3 circuits 0.90
    ("F", 3, 1, "ladder", 1.00), ("F", 3, 3, "ladder", 0.90),
    # perforated trays, touching (flat) rows: 0.98 for one circuit, 2 trays 3 circuits 0.81
    ("F_flat", 1, 1, None, 0.98), ("F_flat", 3, 2, None, 0.81),
])
def test_b52_21_rows_by_formation(method, n, trays, support, value):
    assert ctab.grouping_factor(method, n, trays=trays, support=support).value == value


def test_method_g_one_circuit_and_groups():
    # G (spaced single-core, Table B.52.1 items 32/33): one circuit as tabulated (1.0);
    # B.52.21 gives no rows for groups of spaced single-core circuits.
    assert ctab.grouping_factor("G", 1).value == 1.0
    assert ctab.grouping_factor("G_vertical", 1).value == 1.0
    with pytest.raises(OutOfRangeError, match="method G"):
        ctab.grouping_factor("G", 3)


@pytest.mark.parametrize("cables, tiers, containment, value", [
    # IEC 60364-5-52:2009 Table B.52.20, perforated trays touching: 2 trays, 6 per tray 0.73;
    # 3 trays, 6 per tray 0.71; 6 trays, 9 per tray 0.64
    (12, 2, "tray", 0.73), (18, 3, "tray", 0.71), (54, 6, "tray", 0.64),
    # ladders touching: 2 ladders 6 per ladder 0.76; 1 ladder 9 cables 0.78
    (12, 2, "ladder", 0.76), (9, 1, "ladder", 0.78),
    # one tier beyond nine cables: Table B.52.17 row 4 (perforated tray), 9-circuit value 0.72
    (12, 1, "tray", 0.72),
    # 7 cables on 2 trays: 4 per tray, B.52.20 row 2 column 4: 0.77
    (7, 2, "tray", 0.77),
])
def test_tiers_and_containment_pick_the_row(cables, tiers, containment, value):
    assert ctab.route_grouping_factor("E", cables, tiers, containment).value == value


def test_more_than_nine_per_tier_on_several_tiers_is_out_of_range():
    with pytest.raises(OutOfRangeError, match="B.52.20"):
        ctab.route_grouping_factor("E", 30, 2, "tray")


def test_method_names_any_case():
    assert canonical_method("f_flat") == "F_flat" and canonical_method("G_VERTICAL") == "G_vertical"


# ------------------------------------------------------------ through sizing
def test_f_trefoil_alone_rated_at_the_full_column():
    """Single-core Cu XLPE, trefoil on a perforated tray, alone: Iz = It (B.52.12 column F x 1.00)."""
    spec = CircuitSpec("F1", Load(300, "A"), 400.0, cores=1, stretches=(Stretch(method="F"),))
    r = size_circuit(spec)
    assert r.grouping_factor == 1.00
    assert r.cable.capacity_a == pytest.approx(
        tabulated_capacity("F", "Cu", "XLPE", 3, r.cable.csa_mm2).current_a)


@pytest.mark.parametrize("method", ["F_flat", "G", "G_vertical", "f_flat", "g"])
def test_calc_reaches_every_single_core_method(capsys, method):
    code = main(["calc", "--load", "250 A", "--length", "20", "--method", method, "--cores", "1",
                 "--fault-ka", "25", "--json"])  # a stiff supply: disconnection is not the point here
    out = json.loads(capsys.readouterr().out)["circuits"][0]
    assert code == 0, out["messages"]
    assert out["method"] == canonical_method(method)
    # the capacity is the printed cell of that method's column (Table B.52.12) times the factors
    tab = tabulated_capacity(canonical_method(method), "Cu", "XLPE", 3, out["cable"]["csa_mm2"])
    assert out["cable"]["capacity_a"] == pytest.approx(tab.current_a * out["correction_factor"],
                                                       rel=2e-3)  # JSON rounds the factor


# ------------------------------------------------------------------ config
def _settings(tmp_path, text):
    path = tmp_path / "c.toml"
    path.write_text(text, encoding="utf-8")
    return load_settings(path)


def test_route_layers_keep_the_method_case_and_tiers_from_the_config(tmp_path):
    cfg = drawing_config(_settings(tmp_path, """
[drawing.route_layers]
"TRAY-SC" = ["tray", "F_flat"]
[drawing.route_tiers]
"ROUTE-LADDER" = 3
"TRAY-*" = 2
"""))
    assert cfg.layer_kind("TRAY-SC") == ("tray", "F_flat")
    assert cfg.layer_tiers("route-ladder") == 3
    assert cfg.layer_tiers("TRAY-SC") == 2
    assert cfg.layer_tiers("ROUTE-TRAY") == 1  # default


def test_bad_tiers_name_the_file(tmp_path):
    from cablewright.core.errors import ConfigError

    with pytest.raises(ConfigError, match="c.toml.*route_tiers"):
        drawing_config(_settings(tmp_path, '[drawing.route_tiers]\n"ROUTE-TRAY" = 0\n'))


def test_stretch_carries_tiers_and_containment():
    seg = RouteSegment("S1", ("h",), "ROUTE-LADDER", "ladder", "E", 10.0, ((0, 0, 0), (10, 0, 0)))
    m = Measurement(drawing="x.dxf", units="m", segments={"S1": seg}, equipment={}, rows=[],
                    routes={}, failures={}, issues=[], graph=None)

    class Route:
        segment_ids = ("S1",)

    (stretch,) = _stretches(m, Route(), 1, {"S1": 12}, lambda layer: 2)
    assert (stretch.trays, stretch.containment, stretch.other_cables) == (2, "ladder", 11)
    spec = CircuitSpec("T", Load(20, "A"), 400.0, stretches=(stretch,))
    # 12 cables on 2 ladders: 6 per ladder, IEC 60364-5-52:2009 Table B.52.20 ladder row 2: 0.76
    assert size_circuit(spec).grouping_factor == 0.76


@settings(max_examples=80, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(st.sampled_from(("E", "F", "F_flat")), st.sampled_from(("tray", "ladder")),
       st.integers(1, 3), st.integers(0, 12), st.integers(1, 6), st.floats(5.0, 400.0))
def test_more_cables_on_the_tiers_never_a_smaller_cable(method, containment, tiers, others, more,
                                                         load_a):
    """Property: on trays in tiers, a bigger group never gives less copper (the factors of
    IEC 60364-5-52:2009 Tables B.52.17, B.52.20 and B.52.21 never rise with the count)."""
    def size(n):
        stretch = Stretch(method=method, other_cables=n, trays=tiers, containment=containment)
        return size_circuit(CircuitSpec("T", Load(load_a, "A"), 400.0,
                                        cores=1 if method != "E" else None,
                                        design_length_m=20.0, stretches=(stretch,)))
    a, b = size(others), size(others + more)
    if a.cable is None:
        assert b.cable is None
        return
    if b.cable is None:
        return  # beyond the table on several tiers: an error, never a smaller cable
    assert b.cable.parallel * b.cable.csa_mm2 >= a.cable.parallel * a.cable.csa_mm2 - 1e-9
