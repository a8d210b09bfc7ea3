"""Generate the sample IFC model: the same pumping station as ``pumping_station.dxf``.

Writes ``pumping_station.ifc`` next to this script: an IFC4 model in millimetres of
the invented demo scenario of ``generate_pumping_station.py`` (same coordinates,
same equipment, same circuits), built with ``ifcopenshell.api``:

* ladder, tray, conduit segments (``IfcCableCarrierSegment``) with an 'Axis' and a
  'Body', ports at their ends, and tee/bend fittings (``IfcCableCarrierFitting``, no
  axis, all ports at the fitting's origin) joined by ``IfcRelConnectsPorts``;
* a quarter-circle conduit bend as an ``IfcIndexedPolyCurve`` with an arc segment;
* the duct bank as conduit below ground (one piece overridden by our ``CW_Routing``
  property set), the buried run and the clipped run as ``IfcCableSegment``;
* a second storey (+4.5 m) for the control room, so placements chain;
* equipment as ``IfcElectricDistributionBoard``, ``IfcElectricMotor``,
  ``IfcLightFixture``, ``IfcOutlet``, tagged; one ``IfcDistributionCircuit`` group per
  circuit with our ``CW_Circuit`` property set (so no schedule file is needed).

The schedule is the DXF sample's ``pumping_station_circuits.csv``.  GlobalIds are
uuid5 of a fixed name and the header time stamp is fixed, so the file is reproducible.
Every value is invented for the demonstration.  Run:
``python sample_drawings/generate_pumping_station_ifc.py``.

:class:`IfcModelBuilder` is also used by the tests and the benchmark to write small models.
"""

from __future__ import annotations

import sys
import uuid
from collections.abc import Sequence
from pathlib import Path
from typing import Any

import numpy as np

HERE = Path(__file__).resolve().parent
TIME_STAMP = "2024-01-01T00:00:00"

__all__ = ["IfcModelBuilder", "frame", "build_pumping_station", "main"]


#: Property names whose value is a length (written in the model's unit).
_LENGTH_NAMES = ("Width", "Height", "Diameter")

#: The sample's carriers, invented for the demonstration: body profile (world metres) and
#: standard property sets (ISO 16739-1:2018, Pset_CableCarrierSegmentType...Segment).
#: The main tray 400 mm wide, the other trays 200 mm (the profile); the ladder 500 mm (its property set NominalWidth and
#: its profile); conduits of 50 mm outside, 2 mm wall (46 mm inside); the duct bank's
#: conduits 125 mm outside, 6 mm wall (113 mm inside).
SAMPLE_CARRIERS: dict[str, dict[str, Any]] = {
    "CABLETRAYSEGMENT": {"profile": ("rect", 0.2, 0.06)},
    "MAINTRAY": {"profile": ("rect", 0.4, 0.06)},
    "CABLELADDERSEGMENT": {"profile": ("rect", 0.5, 0.1), "psets": {
        "Pset_CableCarrierSegmentTypeCableLadderSegment": {"NominalWidth": 0.5, "NominalHeight": 0.1}}},
    "CONDUITSEGMENT": {"profile": ("circle_hollow", 0.025, 0.002)},
    "DUCTBANK": {"profile": ("circle_hollow", 0.0625, 0.006)},
}


def frame(origin: Sequence[float], x_dir: Sequence[float], z_dir: Sequence[float] = (0.0, 0.0, 1.0)) -> np.ndarray:
    """4x4 placement matrix, world metres: columns X, Y, Z axes and origin."""
    x = np.asarray(x_dir, float) / np.linalg.norm(x_dir)
    z = np.asarray(z_dir, float) / np.linalg.norm(z_dir)
    if abs(float(z @ x)) > 0.999:  # Z along the run: take another
        z = np.array([1.0, 0.0, 0.0]) if abs(x[0]) < 0.9 else np.array([0.0, 1.0, 0.0])
    z = z - x * float(z @ x)
    z = z / np.linalg.norm(z)
    m = np.eye(4)
    m[:3, 0], m[:3, 1], m[:3, 2], m[:3, 3] = x, np.cross(z, x), z, origin
    return m


#: IFC2X3 has no specific occurrence classes for these: a generic occurrence + its type.
_IFC2X3_OCCURRENCE = {
    "IfcCableCarrierSegment": "IfcFlowSegment",
    "IfcCableSegment": "IfcFlowSegment",
    "IfcCableCarrierFitting": "IfcFlowFitting",
    "IfcElectricMotor": "IfcEnergyConversionDevice",
    "IfcLightFixture": "IfcFlowTerminal",
    "IfcOutlet": "IfcFlowTerminal",
    "IfcElectricDistributionBoard": "IfcElectricDistributionPoint",
}


class IfcModelBuilder:
    """Write small cable-carrier models with ifcopenshell.api (positions in world metres).

    Parameters
    ----------
    schema : str
        ``"IFC4"`` (default), ``"IFC2X3"`` or ``"IFC4X3"``.
    unit : str
        Project length unit: ``"mm"`` or ``"m"``.
    seed : str
        Name the reproducible GlobalIds are derived from.
    """

    def __init__(self, schema: str = "IFC4", unit: str = "mm", seed: str = "cablewright-model") -> None:
        import ifcopenshell.api.aggregate
        import ifcopenshell.api.context
        import ifcopenshell.api.project
        import ifcopenshell.api.root
        import ifcopenshell.api.unit

        api = ifcopenshell.api
        self.seed = seed
        self.schema = schema
        f = api.project.create_file(version=schema)
        self.f = f
        if schema == "IFC2X3":
            self._owner_for_ifc2x3()
        self.project = api.root.create_entity(f, ifc_class="IfcProject", name=seed)
        if unit == "mm":
            length = api.unit.add_si_unit(f, unit_type="LENGTHUNIT", prefix="MILLI")
            self.scale = 0.001
        elif unit == "m":
            length = api.unit.add_si_unit(f, unit_type="LENGTHUNIT")
            self.scale = 1.0
        else:
            raise ValueError(f"unit {unit!r}: use 'mm' or 'm'")
        api.unit.assign_unit(f, units=[length])
        model = api.context.add_context(f, context_type="Model")
        self.body = api.context.add_context(f, context_type="Model", context_identifier="Body",
                                            target_view="MODEL_VIEW", parent=model)
        self.axis = api.context.add_context(f, context_type="Model", context_identifier="Axis",
                                            target_view="GRAPH_VIEW", parent=model)
        self.site = api.root.create_entity(f, ifc_class="IfcSite", name="Site")
        self.building = api.root.create_entity(f, ifc_class="IfcBuilding", name="Building")
        api.aggregate.assign_object(f, products=[self.site], relating_object=self.project)
        api.aggregate.assign_object(f, products=[self.building], relating_object=self.site)
        self._place(self.site, np.eye(4))
        self._place(self.building, np.eye(4))
        self.storeys: dict[str, Any] = {}
        self.storey("Ground", 0.0)

    def _owner_for_ifc2x3(self) -> None:
        """IFC2X3 requires an owner history on every rooted entity: a fixed demo user."""
        import ifcopenshell.api.owner.settings as owner

        f = self.f
        person = f.createIfcPerson(None, "Demo", None)
        org = f.createIfcOrganization(None, "cablewright", None)
        user = f.createIfcPersonAndOrganization(person, org)
        app = f.createIfcApplication(org, "0.1", "cablewright model builder", "cablewright")
        prev_user, prev_app = owner.get_user, owner.get_application
        owner.get_user = lambda file: user if file is f else prev_user(file)
        owner.get_application = lambda file: app if file is f else prev_app(file)

    # ------------------------------------------------------------------ basics
    def _place(self, product: Any, matrix: np.ndarray) -> None:
        import ifcopenshell.api.geometry

        ifcopenshell.api.geometry.edit_object_placement(self.f, product=product, matrix=matrix)

    def storey(self, name: str, elevation_m: float) -> Any:
        """Add (or get) a storey placed at ``elevation_m``."""
        import ifcopenshell.api.aggregate
        import ifcopenshell.api.root

        if name in self.storeys:
            return self.storeys[name]
        st = ifcopenshell.api.root.create_entity(self.f, ifc_class="IfcBuildingStorey", name=name)
        st.Elevation = elevation_m / self.scale
        ifcopenshell.api.aggregate.assign_object(self.f, products=[st], relating_object=self.building)
        m = np.eye(4)
        m[2, 3] = elevation_m
        self._place(st, m)
        self.storeys[name] = st
        return st

    def _contain(self, product: Any, storey: str | None) -> None:
        import ifcopenshell.api.spatial

        ifcopenshell.api.spatial.assign_container(
            self.f, products=[product], relating_structure=self.storeys[storey or "Ground"])

    def _create(self, ifc_class: str, predefined: str | None, name: str | None) -> Any:
        import ifcopenshell.api.root
        import ifcopenshell.api.type

        if self.schema == "IFC2X3":
            occurrence = _IFC2X3_OCCURRENCE.get(ifc_class, ifc_class)
            el = ifcopenshell.api.root.create_entity(self.f, ifc_class=occurrence, name=name)
            if occurrence == ifc_class and not predefined:
                return el
            try:
                tp = ifcopenshell.api.root.create_entity(
                    self.f, ifc_class=ifc_class + "Type", predefined_type=predefined or "NOTDEFINED",
                    name=f"{name} type")
            except RuntimeError:  # no such type in IFC2X3 (a distribution point)
                return el
            ifcopenshell.api.type.assign_type(self.f, related_objects=[el], relating_type=tp)
            return el
        return ifcopenshell.api.root.create_entity(
            self.f, ifc_class=ifc_class, predefined_type=predefined, name=name)

    def pset(self, element: Any, name: str, props: dict[str, Any]) -> None:
        """Add a property set of single values."""
        import ifcopenshell.api.pset

        ps = ifcopenshell.api.pset.add_pset(self.f, product=element, name=name)
        ifcopenshell.api.pset.edit_pset(self.f, pset=ps, properties=props)

    def _curve(self, local_m: np.ndarray, arc: bool = False, two_d: bool = False, polyline: bool = False) -> Any:
        f = self.f
        pts = [tuple(float(v) / self.scale for v in (p[:2] if two_d else p)) for p in local_m]
        if polyline or self.schema == "IFC2X3":
            return f.createIfcPolyline([f.createIfcCartesianPoint(p) for p in pts])
        plist = f.createIfcCartesianPointList2D(pts) if two_d else f.createIfcCartesianPointList3D(pts)
        segs = None
        if arc:
            if len(pts) != 3:
                raise ValueError("an arc axis takes start, mid and end points")
            segs = [f.createIfcArcIndex((1, 2, 3))]
        return f.createIfcIndexedPolyCurve(plist, segs, False)

    def _ports(self, element: Any, where: Sequence[np.ndarray], x_dir: Sequence[float]) -> list[Any]:
        import ifcopenshell.api.system

        ports = []
        for w in where:
            port = ifcopenshell.api.system.add_port(self.f, element=element)
            if self.schema != "IFC2X3":
                port.PredefinedType = "CABLECARRIER"
                port.SystemType = "ELECTRICAL"
            self._place(port, frame(w, x_dir if np.linalg.norm(x_dir) > 0 else (1, 0, 0)))
            ports.append(port)
        return ports

    # ------------------------------------------------------------------ route pieces
    def segment(
        self,
        points_m: Sequence[Sequence[float]],
        predefined: str = "CABLETRAYSEGMENT",
        ifc_class: str = "IfcCableCarrierSegment",
        storey: str | None = None,
        name: str | None = None,
        ports: bool = True,
        geometry: str = "axis",
        arc: bool = False,
        routing: dict[str, str] | None = None,
        profile: tuple[Any, ...] = ("rect", 0.3, 0.1),
        psets: dict[str, dict[str, Any]] | None = None,
    ) -> tuple[Any, list[Any]]:
        """A route piece through ``points_m`` (world metres).

        ``geometry``: ``"axis"`` (IfcIndexedPolyCurve, IFC4), ``"polyline"`` (IfcPolyline),
        ``"axis2d"`` (2D indexed curve, horizontal pieces only), ``"body"`` (an extruded solid
        only; two points), ``"both"`` (axis and body).  ``arc``: three points, start-mid-end.
        ``profile`` of the body, world metres: ``("rect", width, depth)``
        (IfcRectangleProfileDef), ``("circle", radius)``, ``("circle_hollow", radius, wall)``.
        ``psets``: property sets of single values (name -> properties, lengths in metres
        written in the model's unit when the name ends a length: Width, Height, Diameter).
        """
        import ifcopenshell.api.geometry

        pts = np.asarray(points_m, dtype=float)
        el = self._create(ifc_class, predefined, name)
        self._contain(el, storey)
        d = pts[-1] - pts[0] if len(pts) == 2 else pts[1] - pts[0]
        up = (0.0, 0.0, 1.0) if abs(d[2]) < 1e-9 * max(1.0, float(np.linalg.norm(d))) else (1.0, 0.0, 0.0)
        if len(pts) == 2 and d[2] != 0 and abs(d[0]) + abs(d[1]) < 1e-12:
            up = (1.0, 0.0, 0.0)
        m = frame(pts[0], d, up) if len(pts) == 2 else frame(pts[0], (1.0, 0.0, 0.0))
        self._place(el, m)
        inv = np.linalg.inv(m)
        local = pts @ inv[:3, :3].T + inv[:3, 3]
        reps = []
        if geometry in ("axis", "polyline", "axis2d", "both"):
            curve = self._curve(local, arc=arc, two_d=geometry == "axis2d", polyline=geometry == "polyline")
            reps.append(self.f.createIfcShapeRepresentation(
                self.axis, "Axis", "Curve2D" if geometry == "axis2d" else "Curve3D", [curve]))
        if geometry in ("body", "both"):
            length = float(np.linalg.norm(pts[-1] - pts[0]))
            f = self.f
            area = self._profile(profile)
            position = f.createIfcAxis2Placement3D(
                f.createIfcCartesianPoint((0.0, 0.0, 0.0)), f.createIfcDirection((1.0, 0.0, 0.0)),
                f.createIfcDirection((0.0, 1.0, 0.0)))
            solid = f.createIfcExtrudedAreaSolid(area, position, f.createIfcDirection((0.0, 0.0, 1.0)),
                                                 length / self.scale)
            reps.append(f.createIfcShapeRepresentation(self.body, "Body", "SweptSolid", [solid]))
        for rep in reps:
            ifcopenshell.api.geometry.assign_representation(self.f, product=el, representation=rep)
        port_list = self._ports(el, [pts[0], pts[-1]], d) if ports else []
        if routing:
            self.pset(el, "CW_Routing", routing)
        for name, props in (psets or {}).items():
            self.pset(el, name, {k: (v / self.scale if k.endswith(_LENGTH_NAMES) else v)
                                 for k, v in props.items()})
        return el, port_list

    def _profile(self, spec: tuple[Any, ...]) -> Any:
        """The body's profile (ISO 16739-1: IfcRectangleProfileDef, IfcCircle(Hollow)ProfileDef)."""
        f = self.f
        where = f.createIfcAxis2Placement2D(f.createIfcCartesianPoint((0.0, 0.0)), None)
        kind, *dims = spec
        d = [float(v) / self.scale for v in dims]
        if kind == "rect":
            return f.createIfcRectangleProfileDef("AREA", None, where, d[0], d[1])
        if kind == "circle":
            return f.createIfcCircleProfileDef("AREA", None, where, d[0])
        if kind == "circle_hollow":
            return f.createIfcCircleHollowProfileDef("AREA", None, where, d[0], d[1])
        raise ValueError(f"profile {kind!r}: use 'rect', 'circle' or 'circle_hollow'")

    def fitting(
        self,
        origin_m: Sequence[float],
        port_points_m: Sequence[Sequence[float]] | int,
        predefined: str = "BEND",
        storey: str | None = None,
        name: str | None = None,
    ) -> tuple[Any, list[Any]]:
        """A fitting with no axis; ``port_points_m`` positions, or a count of ports at the origin."""
        el = self._create("IfcCableCarrierFitting", predefined, name)
        self._contain(el, storey)
        self._place(el, frame(origin_m, (1.0, 0.0, 0.0)))
        where = [np.asarray(origin_m, float)] * port_points_m if isinstance(port_points_m, int) \
            else [np.asarray(p, float) for p in port_points_m]
        return el, self._ports(el, where, (1.0, 0.0, 0.0))

    def connect(self, port1: Any, port2: Any, both_ways: bool = False) -> None:
        """Join two ports (one IfcRelConnectsPorts, or one each way)."""
        import ifcopenshell.api.system

        ifcopenshell.api.system.connect_port(
            self.f, port1=port1, port2=port2, direction="NOTDEFINED" if both_ways else "SOURCE")

    # ------------------------------------------------------------------ equipment, circuits
    def equipment(
        self,
        ifc_class: str,
        tag: str | None,
        position_m: Sequence[float],
        predefined: str | None = None,
        storey: str | None = None,
        name: str | None = None,
        props: dict[str, Any] | None = None,
    ) -> Any:
        """An equipment element with ``Tag`` and placement origin at ``position_m``."""
        el = self._create(ifc_class, predefined, name if name is not None else tag)
        if tag is not None:
            el.Tag = tag
        self._contain(el, storey)
        self._place(el, frame(position_m, (1.0, 0.0, 0.0)))
        if props:
            self.pset(el, "CW_Equipment", props)
        return el

    def circuit(self, name: str, members: Sequence[Any], props: dict[str, Any] | None = None) -> Any:
        """An IfcDistributionCircuit (IFC4) / IfcElectricalCircuit (IFC2X3) grouping ``members``."""
        import ifcopenshell.api.group
        import ifcopenshell.api.root

        cls = "IfcElectricalCircuit" if self.schema == "IFC2X3" else "IfcDistributionCircuit"
        group = ifcopenshell.api.root.create_entity(self.f, ifc_class=cls, name=name)
        if self.schema != "IFC2X3":
            group.PredefinedType = "ELECTRICAL"
        ifcopenshell.api.group.assign_group(self.f, products=list(members), group=group)
        if props:
            self.pset(group, "CW_Circuit", props)
        return group

    # ------------------------------------------------------------------ output
    def finish(self) -> Any:
        """Reproducible GlobalIds (uuid5) and header time stamp; returns the file."""
        import ifcopenshell.guid

        for n, inst in enumerate(sorted(self.f.by_type("IfcRoot"), key=lambda e: e.id())):
            inst.GlobalId = ifcopenshell.guid.compress(
                uuid.uuid5(uuid.NAMESPACE_URL, f"cablewright/{self.seed}/{n}").hex)
        for oh in self.f.by_type("IfcOwnerHistory"):
            oh.CreationDate = 1704067200  # 2024-01-01T00:00:00Z
            if getattr(oh, "LastModifiedDate", None) is not None:
                oh.LastModifiedDate = 1704067200
        self.f.header.file_name.time_stamp = TIME_STAMP
        return self.f

    def write(self, path: str | Path) -> Path:
        """Finish and write the model to ``path``."""
        self.finish()
        self.f.write(str(path))
        return Path(path)


# --------------------------------------------------------------------------- the scenario
def _dxf_sample():
    sys.path.insert(0, str(HERE))
    try:
        import generate_pumping_station as dxf_sample
    finally:
        sys.path.pop(0)
    return dxf_sample


def build_pumping_station() -> IfcModelBuilder:
    """The pumping station of ``generate_pumping_station.py`` as an IFC4 model in mm."""
    s = _dxf_sample()
    mm = s.MM
    P = {k: np.asarray(v, float) * mm for k, v in s.P.items()}
    b = IfcModelBuilder("IFC4", "mm", seed="pumping-station")
    b.storey("Level +4.5", s.UPPER_FLOOR_Z * mm)
    b.storey("Site", 0.0)

    def seg(names, kind="CABLETRAYSEGMENT", carrier=None, **kw):
        return b.segment([P[n] for n in names], predefined=kind, name="-".join(names), geometry="both"
                         if len(names) == 2 and "arc" not in kw else "axis",
                         **SAMPLE_CARRIERS[carrier or kind], **kw)

    def chain(*items):
        """Join consecutive port lists: end port of one to start port of the next."""
        for (_, pa), (_, pb) in zip(items[:-1], items[1:], strict=True):
            b.connect(pa[-1], pb[0])

    def tee(at, parts, storey=None, kind="TEE"):
        """A fitting at point ``at``, its ports joined to the given (port, ...) list."""
        _, ports = b.fitting(P[at], len(parts), predefined=kind, storey=storey, name=f"{kind} {at}")
        for fp, other in zip(ports, parts, strict=True):
            b.connect(other, fp)

    lad = "CABLELADDERSEGMENT"
    # switchroom ladder, split at the riser foot (a tee)
    l1 = seg(["A", "RIS_B"], lad)
    l2 = seg(["RIS_B", "B1"], lad)
    riser = seg(["RIS_B", "RIS_T"], lad)
    tee("RIS_B", [l1[1][1], l2[1][0], riser[1][0]])
    # main tray B..C, split at the branch tees; B1-B is the 20 mm gap, ports joined
    stops = ["B", "X20", "X27", "X34", "X41", "X43", "C"]
    main = [seg([a, c], carrier="MAINTRAY") for a, c in zip(stops[:-1], stops[1:], strict=True)]
    b.connect(l2[1][1], main[0][1][0])
    branch = {x: seg([x, t]) for x, t in (("X20", "P101_A"), ("X27", "P102_A"), ("X41", "P104_A"))}
    branch["X34"] = seg(["X34", "TN1"])  # through P103_A, straight on to TN1
    branch["X43"] = seg(["X43", "TE_N"])
    for k, x in enumerate(stops[1:-1]):
        tee(x, [main[k][1][1], main[k + 1][1][0], branch[x][1][0]])
    # north branch bends round to DB-2, then the tray crossing the main tray (no joint)
    tn = seg(["TN1", "TX_N"])
    tee("TN1", [branch["X34"][1][1], tn[1][0]], kind="BEND")
    cross = seg(["TX_N", "TX_S"])
    tee("TX_N", [tn[1][1], cross[1][0]], kind="BEND")
    # control room tray at +4.5 m storey, reached by the riser
    up = "Level +4.5"
    c1 = seg(["RIS_T", "CR1"], storey=up)
    c2 = seg(["CR1", "CP_A"], storey=up)
    tee("RIS_T", [riser[1][1], c1[1][0]], storey=up, kind="BEND")
    tee("CR1", [c1[1][1], c2[1][0]], storey=up, kind="BEND")
    # duct bank: a conduit dropping into the ground (ours says duct), then conduit in the ground
    drop = seg(["TE_N", "DU1"], "CONDUITSEGMENT", "DUCTBANK", storey="Site", routing={"Containment": "duct"})
    d1 = seg(["DU1", "DU2"], "CONDUITSEGMENT", "DUCTBANK", storey="Site")
    d2 = seg(["DU2", "VC1"], "CONDUITSEGMENT", "DUCTBANK", storey="Site")
    tee("TE_N", [branch["X43"][1][1], drop[1][0]], kind="BEND")
    tee("DU1", [drop[1][1], d1[1][0]], storey="Site", kind="BEND")
    tee("DU2", [d1[1][1], d2[1][0]], storey="Site", kind="BEND")
    # buried cable to the far valve chamber (a cable segment in the ground: D2)
    buried = b.segment([P["VC1"], P["VC2"]], predefined="CABLESEGMENT", ifc_class="IfcCableSegment",
                       storey="Site", name="VC1-VC2")
    b.connect(d2[1][1], buried[1][0])
    # dosing room conduit with a quarter-circle bend (arc axis), centre (52000, 9000) mm
    cx, cy = (v * mm for v in s.ARC_CENTRE)
    r = s.ARC_RADIUS * mm
    mid = np.asarray([cx + r * np.cos(-np.pi / 4), cy + r * np.sin(-np.pi / 4), s.TRAY_Z * mm])
    k1 = seg(["C", "CD1"], "CONDUITSEGMENT")
    arc = b.segment([P["CD1"], mid, P["CD2"]], predefined="CONDUITSEGMENT", name="CD1-CD2 bend", arc=True)
    k2 = seg(["CD2", "DP1_A"], "CONDUITSEGMENT")
    chain(k1, arc, k2)
    # clipped cable C -> CL1 -> MX_A (a cable segment above ground: method C)
    clip = b.segment([P["C"], P["CL1"], P["MX_A"]], predefined="CABLESEGMENT", ifc_class="IfcCableSegment",
                     name="C-CL1-MX_A")
    tee("C", [main[-1][1][1], k1[1][0], clip[1][0]])

    # equipment
    classes = {
        "SWITCHBOARD": ("IfcElectricDistributionBoard", "SWITCHBOARD"),
        "DISTBOARD": ("IfcElectricDistributionBoard", "DISTRIBUTIONBOARD"),
        "PANEL": ("IfcElectricDistributionBoard", "DISTRIBUTIONBOARD"),
        "MOTOR": ("IfcElectricMotor", "INDUCTION"),
        "VALVE": ("IfcElectricMotor", "INDUCTION"),
        "LIGHT": ("IfcLightFixture", "DIRECTIONSOURCE"),
        "SOCKET": ("IfcOutlet", "POWEROUTLET"),
    }
    items = {tag: (blk, pos) for tag, (blk, pos, _) in s.EQUIPMENT.items()}
    for tag, (local, _) in s.SKID_CHILDREN.items():
        items[tag] = ("MOTOR", s.skid_world(local))
    elements = {}
    for tag, (blk, pos) in sorted(items.items()):
        cls, pre = classes[blk]
        if tag == "MCC-1":
            pre = "MOTORCONTROLCENTRE"
        where = np.asarray(pos, float) * mm
        storey = up if where[2] >= s.UPPER_FLOOR_Z * mm else ("Site" if where[2] < 0 else None)
        elements[tag] = b.equipment(cls, tag, where, predefined=pre, storey=storey)
    # circuits as groups with our property set (the same data as the schedule)
    for row in s.schedule_rows():
        props = {k: v for k, v in zip(s.COLUMNS, row, strict=True) if v and k not in ("circuit",)}
        b.circuit(row[0], [elements[row[1]], elements[row[2]]], props)
    return b


def main(out_dir: Path = HERE) -> Path:
    """Write ``pumping_station.ifc`` into ``out_dir``."""
    out_dir.mkdir(parents=True, exist_ok=True)
    return build_pumping_station().write(out_dir / "pumping_station.ifc")


if __name__ == "__main__":
    main()
