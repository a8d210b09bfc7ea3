"""Containment sizes read from the IFC carriers themselves (issue 14, item 3).

The fill of a tray segment is computed here by hand: the tray's width read from the
model with ifcopenshell (a general-purpose IFC library: the body's
IfcRectangleProfileDef, ISO 16739-1:2018, in the file's length unit), the cables' outer
diameters from the table of sizing/fill.py (typical makers' data, from memory,
``fill.OD_SOURCE``), and the single-layer tray rule (sum of diameters over the usable
width, common practice).  It must equal the segment schedule's fill.
"""

from __future__ import annotations

import sys
from pathlib import Path

import pytest

pytest.importorskip("ifcopenshell")

from cablewright.annotate.takeoff import build_takeoff, segments_dicts  # noqa: E402
from cablewright.extract.ifc_carrier_size import carrier_size  # noqa: E402
from cablewright.sizing.fill import DEFAULT_CABLE_OD_MM, OD_SOURCE, od_key  # noqa: E402

from cablewright import pipeline  # noqa: E402
from cablewright.config import load_settings  # noqa: E402

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT / "sample_drawings"))
from generate_pumping_station_ifc import IfcModelBuilder  # noqa: E402

IFC = ROOT / "sample_drawings" / "pumping_station.ifc"
CSV = ROOT / "sample_drawings" / "pumping_station_circuits.csv"


def _job(settings):
    measurement = pipeline.measure_drawing(IFC, CSV, settings)
    job = pipeline.size_measurement(measurement, settings)
    rows = build_takeoff(job.outcomes, measurement.segments, job.per_segment, settings.sizing,
                         measurement.carrier_sizes).segments
    return job, {r.segment.segment_id: r for r in rows}


@pytest.fixture(scope="module")
def sized():
    return _job(load_settings(None))


def _profile_width_mm(element, model) -> float:
    """The tray's width as the file gives it: the body's rectangle, in the model's unit."""
    import ifcopenshell.util.unit as uu

    scale_m = uu.calculate_unit_scale(model)
    body = next(r for r in element.Representation.Representations if r.RepresentationIdentifier == "Body")
    profile = body.Items[0].SweptArea
    assert profile.is_a("IfcRectangleProfileDef")
    return max(profile.XDim, profile.YDim) * scale_m * 1000.0


def test_tray_fill_by_hand_from_the_ifc_width_equals_the_segment_schedule(sized):
    import ifcopenshell

    job, rows = sized
    model = ifcopenshell.open(str(IFC))
    # the most crowded tray segment whose carriers are in the model
    trays = [r for r in rows.values() if r.segment.containment == "tray" and r.fill.percent is not None]
    row = max(trays, key=lambda r: r.cables)
    carriers = [model.by_guid(sid) for sid in row.segment.source_ids if "/" not in sid]
    carriers = [c for c in carriers if c.is_a("IfcCableCarrierSegment")]
    width_mm = min(_profile_width_mm(c, model) for c in carriers)
    assert width_mm == pytest.approx(400.0)  # the sample's main tray (invented data)
    cables = {o.circuit_id: o.sizing.cable for o in job.outcomes if o.sizing is not None and o.sizing.cable}
    diameters = []
    for cid in row.circuits:
        c = cables[cid]
        diameters += [DEFAULT_CABLE_OD_MM[od_key(c.cores, c.csa_mm2)]] * c.parallel
    assert "from memory" in OD_SOURCE
    by_hand = 100.0 * sum(diameters) / width_mm  # single layer on a tray (common practice)
    assert row.fill.size_mm == pytest.approx(width_mm)
    assert row.fill.percent == pytest.approx(by_hand)
    assert "IfcRectangleProfileDef" in row.size_source
    entry = next(d for d in segments_dicts([row]))
    assert entry["fill"]["percent"] == pytest.approx(by_hand, abs=0.05)
    assert entry["fill"]["size_source"] == row.size_source


def test_ladder_from_its_property_set_and_ducts_from_their_hollow_profile(sized):
    import ifcopenshell

    _, rows = sized
    model = ifcopenshell.open(str(IFC))
    ladder = next(r for r in rows.values() if r.segment.containment == "ladder")
    el = model.by_guid(ladder.segment.source_ids[0])
    import ifcopenshell.util.element as ue

    width = ue.get_pset(el, "Pset_CableCarrierSegmentTypeCableLadderSegment")["NominalWidth"]  # mm file
    assert ladder.fill.size_mm == pytest.approx(width) and "NominalWidth" in ladder.size_source
    duct = next(r for r in rows.values() if r.segment.containment == "duct")
    el = model.by_guid(duct.segment.source_ids[0])
    body = next(r for r in el.Representation.Representations if r.RepresentationIdentifier == "Body")
    hollow = body.Items[0].SweptArea
    assert hollow.is_a("IfcCircleHollowProfileDef")
    assert duct.fill.size_mm == pytest.approx(2 * (hollow.Radius - hollow.WallThickness))


def test_the_project_config_can_take_the_layer_sizes_instead(tmp_path):
    cfg = tmp_path / "cfg.toml"
    cfg.write_text("[ifc]\ncontainment_from_model = false\n[sizing.containment_mm]\nROUTE-TRAY = 250.0\n",
                   encoding="utf-8")
    _, rows = _job(load_settings(cfg))
    trays = [r for r in rows.values() if r.segment.containment == "tray"]
    assert trays and all(r.fill.size_mm == 250.0 for r in trays)
    assert all(r.size_source == "[sizing.containment_mm] ROUTE-TRAY" for r in trays)


def _one_carrier(tmp_path, unit: str, **kw):
    import ifcopenshell
    import ifcopenshell.util.unit as uu

    b = IfcModelBuilder("IFC4", unit, seed="carrier-size")
    b.storey("Ground", 0.0)
    b.segment([(0, 0, 3), (10, 0, 3)], geometry="both", **kw)
    path = b.write(tmp_path / f"c-{unit}.ifc")
    model = ifcopenshell.open(str(path))
    (el,) = model.by_type("IfcCableCarrierSegment")
    return el, 1000.0 * uu.calculate_unit_scale(model)


@pytest.mark.parametrize("unit", ["mm", "m"])
def test_units_of_the_file_are_honoured(tmp_path, unit):
    el, mm_per_unit = _one_carrier(tmp_path, unit, profile=("rect", 0.3, 0.08))
    assert carrier_size(el, "tray", mm_per_unit).size_mm == pytest.approx(300.0)
    el, mm_per_unit = _one_carrier(tmp_path, unit, predefined="CONDUITSEGMENT",
                                   profile=("circle", 0.032))
    got = carrier_size(el, "conduit", mm_per_unit)
    assert got.size_mm == pytest.approx(64.0) and "IfcCircleProfileDef" in got.source
    assert carrier_size(el, "clipped", mm_per_unit) is None  # nothing to fill


def test_ifc4x3_conduit_inner_diameter_before_nominal_before_outer(tmp_path):
    # IFC 4.3.2.0: Qto_ConduitSegmentBaseQuantities.InnerDiameter, then
    # Pset_CableCarrierSegmentTypeConduitSegment.NominalDiameter, then the body's circle.
    import ifcopenshell
    import ifcopenshell.api.pset
    import ifcopenshell.util.unit as uu

    def model(with_qto: bool, with_pset: bool):
        b = IfcModelBuilder("IFC4X3", "mm", seed=f"conduit-{with_qto}-{with_pset}")
        b.storey("Ground", 0.0)
        psets = {"Pset_CableCarrierSegmentTypeConduitSegment": {"NominalDiameter": 0.05}} if with_pset else None
        el, _ = b.segment([(0, 0, 3), (10, 0, 3)], predefined="CONDUITSEGMENT", geometry="both",
                          profile=("circle", 0.026), psets=psets)
        if with_qto:
            qto = ifcopenshell.api.pset.add_qto(b.f, product=el, name="Qto_ConduitSegmentBaseQuantities")
            ifcopenshell.api.pset.edit_qto(b.f, qto=qto, properties={"InnerDiameter": 44.0})  # mm file
        path = b.write(tmp_path / f"c-{with_qto}-{with_pset}.ifc")
        f = ifcopenshell.open(str(path))
        (seg,) = f.by_type("IfcCableCarrierSegment")
        return carrier_size(seg, "conduit", 1000.0 * uu.calculate_unit_scale(f))

    assert model(True, True).size_mm == pytest.approx(44.0)
    assert model(False, True).size_mm == pytest.approx(50.0)
    got = model(False, False)
    assert got.size_mm == pytest.approx(52.0) and "IfcCircleProfileDef" in got.source
