"""The containment size of an IFC cable carrier: tray width or conduit inner diameter.

What the fill check (sizing/fill.py) needs of a carrier: the usable width of a tray,
ladder or trunking, the inner diameter of a conduit or duct.  Read, in turn:

* conduit / duct: the quantity ``Qto_ConduitSegmentBaseQuantities.InnerDiameter``
  (IFC4X3); the inside of the body's hollow circle (``IfcCircleHollowProfileDef``:
  2 (Radius - WallThickness)) or of a swept disk (``IfcSweptDiskSolid`` 2 InnerRadius);
  ``Pset_CableCarrierSegmentTypeConduitSegment.NominalDiameter`` (IFC4X3) or
  ``.NominalWidth`` (IFC4); the body's solid circle (``IfcCircleProfileDef`` 2 Radius,
  ``IfcSweptDiskSolid`` 2 Radius);
* tray, ladder: ``Pset_CableCarrierSegmentType{CableTray,CableLadder}Segment.NominalWidth``
  (IFC4); the inside of the body's hollow
  rectangle (``IfcRectangleHollowProfileDef``: width - 2 WallThickness); the body's
  rectangle (``IfcRectangleProfileDef``).  The width is the larger of XDim and YDim
  (a tray is wider than it is deep, common practice), so the profile's orientation
  in the model does not matter.

Measured inner sizes come before nominal ones for a conduit, since its fill is the
cable area over the inner area; a tray's stated nominal width comes before its
body's outer width.  A trunking (read as conduit, B2) has no circle: it takes the
config's size.  Lengths are in the model's length unit and converted to mm once.

References
----------
.. [1] ISO 16739-1:2018 (IFC4 ADD2 TC1): IfcCableCarrierSegment, IfcRectangleProfileDef,
   IfcRectangleHollowProfileDef, IfcCircleProfileDef, IfcCircleHollowProfileDef,
   IfcExtrudedAreaSolid, IfcSweptDiskSolid; property sets
   Pset_CableCarrierSegmentTypeCableTraySegment, ...CableLadderSegment,
   ...CableTrunkingSegment, ...ConduitSegment (NominalWidth, NominalHeight).
.. [2] IFC 4.3.2.0 (ISO 16739-1:2024): Pset_CableCarrierSegmentTypeConduitSegment
   NominalDiameter; Qto_ConduitSegmentBaseQuantities InnerDiameter.
"""

from __future__ import annotations

from collections.abc import Iterator
from typing import Any

from .model import CarrierSize

__all__ = ["carrier_size", "TRAY_PSETS", "CONDUIT_PSET", "CONDUIT_QTO"]

#: Property set with the nominal width of a tray-like carrier, by containment.
TRAY_PSETS = {
    "tray": "Pset_CableCarrierSegmentTypeCableTraySegment",
    "ladder": "Pset_CableCarrierSegmentTypeCableLadderSegment",
}
#: Property set of a conduit segment (IFC4: NominalWidth; IFC4X3 adds NominalDiameter).
CONDUIT_PSET = "Pset_CableCarrierSegmentTypeConduitSegment"
#: Quantity set of a conduit segment (IFC4X3): the actual inner diameter.
CONDUIT_QTO = "Qto_ConduitSegmentBaseQuantities"
#: Containments whose fill is area over the inner circle (sizing.fill.FILL_RULES).
ROUND = ("conduit", "duct")


def _number(props: dict[str, Any], name: str) -> float | None:
    value = props.get(name)
    try:
        number = float(value) if value is not None and not isinstance(value, bool) else None
    except (TypeError, ValueError):
        return None
    return number if number is not None and number > 0 else None


def _psets(element: Any) -> dict[str, dict[str, Any]]:
    """Property and quantity sets of the element and its type (occurrence wins)."""
    import ifcopenshell.util.element as ue

    return ue.get_psets(element) or {}


def _swept_items(element: Any) -> Iterator[Any]:
    """The swept solids of the element's 'Body' (mapped items and boolean results opened)."""
    for rep in getattr(element, "Representation", None) and element.Representation.Representations or ():
        if getattr(rep, "RepresentationIdentifier", None) != "Body":
            continue
        stack = list(rep.Items)
        while stack:
            item = stack.pop(0)
            if item.is_a("IfcMappedItem"):
                stack.extend(item.MappingSource.MappedRepresentation.Items)
            elif item.is_a("IfcBooleanResult"):
                stack.append(item.FirstOperand)
            elif item.is_a("IfcSweptAreaSolid") or item.is_a("IfcSweptDiskSolid"):
                yield item


def _profile_size(item: Any, round_: bool) -> tuple[float, str, bool] | None:
    """(size in model units, what it is, inner?) of one swept solid, or None."""
    if item.is_a("IfcSweptDiskSolid"):
        if not round_:
            return None
        inner = getattr(item, "InnerRadius", None)
        if inner:
            return 2.0 * float(inner), "IfcSweptDiskSolid 2 x InnerRadius", True
        return 2.0 * float(item.Radius), "IfcSweptDiskSolid 2 x Radius", False
    profile = item.SweptArea
    if round_ and profile.is_a("IfcCircleHollowProfileDef"):
        return (2.0 * (float(profile.Radius) - float(profile.WallThickness)),
                "IfcCircleHollowProfileDef 2 x (Radius - WallThickness)", True)
    if round_ and profile.is_a("IfcCircleProfileDef"):
        return 2.0 * float(profile.Radius), "IfcCircleProfileDef 2 x Radius", False
    if not round_ and profile.is_a("IfcRectangleHollowProfileDef"):
        width = max(float(profile.XDim), float(profile.YDim))
        return (width - 2.0 * float(profile.WallThickness),
                "IfcRectangleHollowProfileDef max(XDim, YDim) - 2 x WallThickness", True)
    if not round_ and profile.is_a("IfcRectangleProfileDef"):
        return max(float(profile.XDim), float(profile.YDim)), "IfcRectangleProfileDef max(XDim, YDim)", False
    return None


def _from_profile(element: Any, round_: bool, inner_only: bool) -> tuple[float, str] | None:
    for item in _swept_items(element):
        got = _profile_size(item, round_)
        if got is not None and got[0] > 0 and (got[2] or not inner_only):
            return got[0], got[1]
    return None


def carrier_size(element: Any, containment: str, mm_per_unit: float) -> CarrierSize | None:
    """The usable width or inner diameter of one carrier [mm], with where it was read.

    Parameters
    ----------
    element : ifcopenshell entity
        An ``IfcCableCarrierSegment`` (or the IFC2X3 ``IfcFlowSegment`` standing for one).
    containment : str
        Its containment (``tray``, ``ladder``, ``conduit``, ``duct``, ...).
    mm_per_unit : float
        Millimetres per model length unit (1.0 for a model in mm, 1000.0 in m).

    Returns
    -------
    CarrierSize or None
        None when the model states no size (the config's size per route layer applies),
        or for a containment with no fill (clipped, buried).
    """
    psets = _psets(element)
    gid = str(getattr(element, "GlobalId", "") or "")

    def found(value: float, what: str) -> CarrierSize:
        return CarrierSize(value * mm_per_unit, f"IFC {gid} {what}")

    if containment in ROUND:
        inner = _number(psets.get(CONDUIT_QTO, {}), "InnerDiameter")
        if inner is not None:
            return found(inner, f"{CONDUIT_QTO}.InnerDiameter")
        profile = _from_profile(element, True, inner_only=True)
        if profile is not None:
            return found(*profile)
        for name in ("NominalDiameter", "NominalWidth"):
            nominal = _number(psets.get(CONDUIT_PSET, {}), name)
            if nominal is not None:
                return found(nominal, f"{CONDUIT_PSET}.{name}")
        profile = _from_profile(element, True, inner_only=False)
        return found(*profile) if profile is not None else None
    pset = TRAY_PSETS.get(containment)
    if pset is None:
        return None
    nominal = _number(psets.get(pset, {}), "NominalWidth")
    if nominal is not None:
        return found(nominal, f"{pset}.NominalWidth")
    profile = _from_profile(element, False, inner_only=False)
    return found(*profile) if profile is not None else None
