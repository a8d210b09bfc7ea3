"""The sized IFC copy: typed property values, units on them, the standard cable property sets.

External references: ifcopenshell reading the copy back and validating it against its
schema (ISO 16739-1:2018); ifcopenshell's own property-set templates for the names and
measure types of Pset_CableSegmentOccurrence and Pset_CableSegmentTypeCableSegment;
IEC 60364-5-52:2009 Table 52.1 (XLPE 90 °C = 363.15 K).
"""

from __future__ import annotations

from pathlib import Path

import pytest

pytest.importorskip("ifcopenshell")

import ifcopenshell  # noqa: E402
import ifcopenshell.util.element as ue  # noqa: E402
import ifcopenshell.util.pset as up  # noqa: E402
import ifcopenshell.validate  # noqa: E402
from cablewright.annotate.ifc_writer import CHECKS_PSET, SIZING_PSET, write_ifc_copy  # noqa: E402
from cablewright.annotate.model import CircuitOutcome  # noqa: E402
from cablewright.extract.ifc_reader import measure_ifc  # noqa: E402
from cablewright.sizing.model import CableSelection, Check, CheckResult, SizingResult, VoltageDrop  # noqa: E402

SAMPLES = Path(__file__).resolve().parents[1] / "sample_drawings"
IFC = SAMPLES / "pumping_station.ifc"
CSV = SAMPLES / "pumping_station_circuits.csv"


def _outcome(cid, route) -> CircuitOutcome:
    cable = CableSelection("Cu", "XLPE", 4, 70.0, 1, 177.12, "capacity")
    checks = (Check("capacity", True, 160.0, 177.12, "A", "IEC 60364-4-43:2008 433.1"),
              Check("short_circuit", CheckResult.NOT_CHECKED, 0.0, 0.0, "mm²", "IEC 60364-4-43:2008 434.5.2",
                    "not checked: give the device's clearing time"),
              Check("disconnection", True, 0.05, 0.14, "Ω", "IEC 60364-4-41:2005 411.4.4"))
    sizing = SizingResult(cid, "ok", load_current_a=132.5, device_rating_a=160.0, method="E",
                          correction_factor=0.72, cable=cable,
                          voltage_drop=VoltageDrop(2.1, 0.52, 5.0, 0.54, 0.53), checks=checks)
    return CircuitOutcome(cid, route.from_tag, route.to_tag, "ok", (), route, None, sizing)


@pytest.fixture(scope="module")
def copy(tmp_path_factory):
    measured = measure_ifc(IFC, CSV)
    outcomes = [_outcome(c, r) for c, r in sorted(measured.routes.items())]
    out = tmp_path_factory.mktemp("ifc") / "a.ifc"
    write_ifc_copy(IFC, out, outcomes)
    return ifcopenshell.open(str(out)), out, outcomes


def _prop(pset, name):
    return next(p for p in pset.HasProperties if p.Name == name)


def _pset(element, name):
    return element.file.by_id(ue.get_pset(element, name, should_inherit=False)["id"])


def test_our_values_are_typed_with_their_units(copy):
    f, _, _ = copy
    log = ifcopenshell.validate.json_logger()
    ifcopenshell.validate.validate(f, log)
    assert log.statements == []
    cable = next(c for c in f.by_type("IfcCableSegment") if c.Tag == "P-101" and ue.get_pset(c, SIZING_PSET))
    sizing = _pset(cable, SIZING_PSET)
    area = _prop(sizing, "CrossSection_mm2")
    assert area.NominalValue.is_a("IfcAreaMeasure") and area.NominalValue.wrappedValue == 70.0
    assert (area.Unit.UnitType, area.Unit.Prefix, area.Unit.Name) == ("AREAUNIT", "MILLI", "SQUARE_METRE")
    current = _prop(sizing, "Capacity_A")
    assert current.NominalValue.is_a("IfcElectricCurrentMeasure") and current.Unit.Name == "AMPERE"
    length = _prop(sizing, "RoutedLength_m")
    assert length.NominalValue.is_a("IfcPositiveLengthMeasure") and length.Unit.Name == "METRE"
    assert _prop(sizing, "Cable").NominalValue.is_a("IfcLabel")
    assert _prop(sizing, "CorrectionFactor").NominalValue.is_a("IfcPositiveRatioMeasure")
    checks = _pset(cable, CHECKS_PSET)
    assert _prop(checks, "DisconnectionValue").NominalValue.is_a("IfcElectricResistanceMeasure")
    assert _prop(checks, "DisconnectionLimit").Unit.Name == "OHM"
    assert ue.get_pset(cable, CHECKS_PSET)["ShortCircuitResult"] == "not_checked"
    assert ue.get_pset(cable, CHECKS_PSET)["CapacityResult"] == "pass"


def test_standard_cable_psets_follow_the_schema_templates(copy):
    f, _, _ = copy
    template = up.get_template(f.schema)
    occ = {p.Name: p.PrimaryMeasureType for p in template.get_by_name("Pset_CableSegmentOccurrence").HasPropertyTemplates}
    typ = {p.Name: p.PrimaryMeasureType
           for p in template.get_by_name("Pset_CableSegmentTypeCableSegment").HasPropertyTemplates}
    cable = next(c for c in f.by_type("IfcCableSegment") if c.Tag == "P-101" and ue.get_pset(c, SIZING_PSET))
    pset = _pset(cable, "Pset_CableSegmentOccurrence")
    for prop in pset.HasProperties:
        assert prop.Name in occ and prop.NominalValue.is_a(occ[prop.Name]), prop.Name
    assert ue.get_pset(cable, "Pset_CableSegmentOccurrence")["CurrentCarryingCapasity"] == pytest.approx(177.12)
    cable_type = ue.get_type(cable)
    assert cable_type.is_a("IfcCableSegmentType") and cable_type.Name == "4C 70 mm² Cu/XLPE"
    type_pset = ue.get_pset(cable_type, "Pset_CableSegmentTypeCableSegment")
    assert type_pset["NumberOfCores"] == 4
    assert type_pset["MaximumOperatingTemperature"] == pytest.approx(363.15)  # 90 °C in K
    for prop in _pset(cable_type, "Pset_CableSegmentTypeCableSegment").HasProperties:
        assert prop.NominalValue.is_a(typ[prop.Name]), prop.Name
    assert len(f.by_type("IfcCableSegmentType")) == 1  # one type per cable kind


def test_written_again_adds_no_second_type(copy, tmp_path):
    f, out, outcomes = copy
    write_ifc_copy(out, tmp_path / "b.ifc", outcomes)
    g = ifcopenshell.open(str(tmp_path / "b.ifc"))
    assert len(g.by_type("IfcCableSegmentType")) == len(f.by_type("IfcCableSegmentType"))
    cable = next(c for c in g.by_type("IfcCableSegment") if c.Tag == "P-101" and ue.get_pset(c, SIZING_PSET))
    assert len([r for r in cable.IsDefinedBy if r.RelatingPropertyDefinition.Name == "Pset_CableSegmentOccurrence"]) == 1
