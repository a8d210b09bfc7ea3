"""Geometry of IFC route pieces: placements, axis curves and extrusions, in world metres.

Only the curve and solid types cable-carrier models use are read: ``IfcPolyline``,
``IfcIndexedPolyCurve`` (line and arc segments, 2D or 3D), ``IfcTrimmedCurve`` on an
``IfcLine``, ``IfcCompositeCurve`` of those, and an ``IfcExtrudedAreaSolid`` body
(also inside an ``IfcBooleanResult`` or an ``IfcMappedItem``).  Anything else is
reported by the caller as an issue; nothing is guessed.

References
----------
.. [1] ISO 16739-1:2018 (IFC4 ADD2 TC1), 8.9.3 (IfcPolyline, IfcIndexedPolyCurve,
   IfcTrimmedCurve, IfcCompositeCurve), 8.8.3 (IfcExtrudedAreaSolid), 8.18.3
   (IfcLocalPlacement).
"""

from __future__ import annotations

import math
from typing import TYPE_CHECKING, Any

import numpy as np

if TYPE_CHECKING:  # pragma: no cover
    import ifcopenshell

__all__ = [
    "ARC_STEP_RAD",
    "UnsupportedGeometry",
    "world_matrix",
    "transform",
    "curve_points",
    "axis_points",
    "body_axis_points",
    "arc_points",
]

#: Largest angle one chord of a flattened arc spans, [rad] (5 degrees: the chord
#: length is sin(θ/2)/(θ/2) = 0.99968 of the arc, geometry, not a standard).
ARC_STEP_RAD = math.radians(5.0)


class UnsupportedGeometry(ValueError):
    """A curve or solid type this reader does not handle (the caller reports it)."""


def world_matrix(product: ifcopenshell.entity_instance | _Holder, cache: dict[int, np.ndarray] | None = None) -> np.ndarray:
    """4x4 placement of ``product`` in world coordinates, project length units.

    The whole ``PlacementRelTo`` chain is resolved; a product with no placement
    sits at the world origin.
    """
    import ifcopenshell.util.placement as up

    placement = getattr(product, "ObjectPlacement", None)
    if placement is None:
        return np.eye(4)
    if cache is not None and placement.id() in cache:
        return cache[placement.id()]
    if placement.is_a("IfcLocalPlacement"):
        local = up.get_axis2placement(placement.RelativePlacement)
        parent = placement.PlacementRelTo
        if parent is not None:
            holder = _Holder(parent)
            m = world_matrix(holder, cache) @ local
        else:
            m = local
    else:
        m = np.asarray(up.get_local_placement(placement), dtype=float)
    if cache is not None:
        cache[placement.id()] = m
    return m


class _Holder:
    """Lets a bare placement be resolved through :func:`world_matrix` with the cache."""

    def __init__(self, placement: Any) -> None:
        self.ObjectPlacement = placement


def transform(matrix: np.ndarray, points: np.ndarray) -> np.ndarray:
    """Apply a 4x4 matrix to an (n, 3) array of points."""
    return points @ matrix[:3, :3].T + matrix[:3, 3]


def _pad3(coords: Any) -> list[float]:
    c = [float(v) for v in coords]
    return c + [0.0] * (3 - len(c))


def arc_points(p0: np.ndarray, p1: np.ndarray, p2: np.ndarray, step_rad: float = ARC_STEP_RAD) -> np.ndarray:
    """Flatten the circular arc from ``p0`` through ``p1`` to ``p2`` into chords.

    Parameters
    ----------
    p0, p1, p2 : array of 3 floats
        Start, a point on the arc, end (any length unit).
    step_rad : float
        Largest angle of one chord, [rad].

    Returns
    -------
    numpy.ndarray
        (n, 3) points from ``p0`` to ``p2``; the three points themselves when they are collinear.

    Examples
    --------
    >>> pts = arc_points(np.array([1.0, 0, 0]), np.array([0.0, 1, 0]), np.array([-1.0, 0, 0]))
    >>> length = float(np.linalg.norm(np.diff(pts, axis=0), axis=1).sum())
    >>> abs(length - math.pi) < 1e-3   # half a unit circle
    True
    """
    a, b = p0 - p2, p1 - p2
    axb = np.cross(a, b)
    n2 = float(axb @ axb)
    if n2 <= 1e-18 * max(float(a @ a), 1e-30) ** 2:
        return np.asarray([p0, p1, p2], dtype=float)
    center = p2 + np.cross(float(a @ a) * b - float(b @ b) * a, axb) / (2.0 * n2)
    r = float(np.linalg.norm(p0 - center))
    u = (p0 - center) / r
    w = np.cross(p1 - p0, p2 - p1)
    w = w / np.linalg.norm(w)
    v = np.cross(w, u)
    q = p2 - center
    sweep = math.atan2(float(q @ v), float(q @ u)) % (2.0 * math.pi)
    n = max(2, int(math.ceil(sweep / step_rad)))
    t = np.linspace(0.0, sweep, n + 1)
    pts = center + r * (np.outer(np.cos(t), u) + np.outer(np.sin(t), v))
    pts[0], pts[-1] = p0, p2
    return pts


def curve_points(curve: Any) -> np.ndarray:
    """Vertices of an axis curve in its representation's coordinates, (n, 3), project units.

    Raises
    ------
    UnsupportedGeometry
        For a curve type not listed in the module docstring.
    """
    if curve.is_a("IfcPolyline"):
        return np.asarray([_pad3(p.Coordinates) for p in curve.Points], dtype=float)
    if curve.is_a("IfcIndexedPolyCurve"):
        coords = np.asarray([_pad3(p) for p in curve.Points.CoordList], dtype=float)
        segments = curve.Segments
        if not segments:
            return coords
        out: list[np.ndarray] = []
        for seg in segments:
            idx = [int(i) - 1 for i in seg.wrappedValue]
            if seg.is_a("IfcArcIndex"):
                part = arc_points(coords[idx[0]], coords[idx[1]], coords[idx[2]])
            else:
                part = coords[idx]
            out.append(part if not out else part[1:])
        return np.concatenate(out)
    if curve.is_a("IfcTrimmedCurve") and curve.BasisCurve.is_a("IfcLine"):
        line = curve.BasisCurve
        origin = np.asarray(_pad3(line.Pnt.Coordinates))
        direction = np.asarray(_pad3(line.Dir.Orientation.DirectionRatios))
        direction = direction / np.linalg.norm(direction) * float(line.Dir.Magnitude)

        def trim(values: Any) -> np.ndarray:
            for v in values:
                if v.is_a("IfcCartesianPoint"):
                    return np.asarray(_pad3(v.Coordinates))
            for v in values:
                if v.is_a("IfcParameterValue"):
                    return origin + float(v.wrappedValue) * direction
            raise UnsupportedGeometry("IfcTrimmedCurve trimmed by neither point nor parameter")

        a, b = trim(curve.Trim1), trim(curve.Trim2)
        return np.asarray([a, b] if curve.SenseAgreement else [b, a], dtype=float)
    if curve.is_a("IfcCompositeCurve"):
        parts: list[np.ndarray] = []
        for seg in curve.Segments:
            parent = getattr(seg, "ParentCurve", None)
            if parent is None:
                raise UnsupportedGeometry(f"{seg.is_a()} in IfcCompositeCurve")
            pts = curve_points(parent)
            if getattr(seg, "SameSense", True) is False:
                pts = pts[::-1]
            parts.append(pts if not parts else pts[1:])
        return np.concatenate(parts)
    raise UnsupportedGeometry(f"axis curve {curve.is_a()}")


def _representations(product: Any, identifier: str) -> list[Any]:
    rep = getattr(product, "Representation", None)
    if rep is None:
        return []
    return [
        r for r in rep.Representations
        if (r.RepresentationIdentifier or "").lower() == identifier.lower()
    ]


def axis_points(product: Any) -> np.ndarray | None:
    """The product's 'Axis' curve in its own frame, (n, 3), project units; None if it has none."""
    for rep in _representations(product, "Axis"):
        for item in rep.Items:
            if item.is_a("IfcCurve"):
                return curve_points(item)
    return None


def _solid_axis(item: Any) -> np.ndarray:
    if item.is_a("IfcExtrudedAreaSolid"):
        import ifcopenshell.util.placement as up

        pos = up.get_axis2placement(item.Position) if item.Position is not None else np.eye(4)
        start = np.zeros(3)
        profile_pos = getattr(item.SweptArea, "Position", None)
        if profile_pos is not None:
            start = np.asarray(_pad3(profile_pos.Location.Coordinates))
        d = np.asarray(_pad3(item.ExtrudedDirection.DirectionRatios))
        d = d / np.linalg.norm(d)
        local = np.asarray([start, start + d * float(item.Depth)])
        return transform(pos, local)
    if item.is_a("IfcBooleanResult"):
        return _solid_axis(item.FirstOperand)
    if item.is_a("IfcMappedItem"):
        import ifcopenshell.util.placement as up

        m = np.asarray(up.get_mappeditem_transformation(item), dtype=float)
        for inner in item.MappingSource.MappedRepresentation.Items:
            try:
                return transform(m, _solid_axis(inner))
            except UnsupportedGeometry:
                continue
        raise UnsupportedGeometry("IfcMappedItem with no extruded solid")
    raise UnsupportedGeometry(f"body item {item.is_a()}")


def body_axis_points(product: Any) -> np.ndarray | None:
    """Run of the product's body extrusion in its own frame, (2, 3), project units.

    The profile's origin swept along ``ExtrudedDirection`` by ``Depth``, placed by
    the solid's ``Position``.  None when the product has no 'Body'.

    Raises
    ------
    UnsupportedGeometry
        When the body has no extruded solid.
    """
    reps = _representations(product, "Body")
    if not reps:
        return None
    last: UnsupportedGeometry | None = None
    for rep in reps:
        for item in rep.Items:
            try:
                return _solid_axis(item)
            except UnsupportedGeometry as exc:
                last = exc
    raise last or UnsupportedGeometry("empty body")
