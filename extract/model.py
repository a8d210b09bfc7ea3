"""Domain types of the extract stage: route pieces, equipment, schedule rows, routes.

Every length is in metres; drawing units are converted once, on reading.
Every object carries a ``source_id`` (DXF handle, IFC GlobalId, or our own
segment id) so results trace back to the drawing.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Any

from .units import UNIT_TO_M as _UNIT_TO_M

if TYPE_CHECKING:  # pragma: no cover
    import networkx as nx
    from cablewright.core.errors import Issue

    from .units import DrawingSummary

__all__ = [
    "Point3",
    "CONTAINMENTS",
    "DEFAULT_ROUTE_LAYERS",
    "UNIT_TO_M",
    "RoutePolyline",
    "RouteSegment",
    "CarrierSize",
    "Equipment",
    "ScheduleRow",
    "CircuitRoute",
    "DrawingConfig",
    "Measurement",
]

Point3 = tuple[float, float, float]

#: Containment kinds a route layer may stand for (contract.md, "Drawing conventions").
CONTAINMENTS = ("tray", "ladder", "conduit", "clipped", "duct", "buried")

#: Default route layers -> (containment, IEC 60364-5-52 reference method for a
#: multi-core cable), as fixed by contract.md, "Drawing conventions"
#: (methods per IEC 60364-5-52:2009, Table B.52.1 / Annex B).
DEFAULT_ROUTE_LAYERS: Mapping[str, tuple[str, str]] = {
    "ROUTE-TRAY": ("tray", "E"),
    "ROUTE-LADDER": ("ladder", "E"),
    "ROUTE-CONDUIT": ("conduit", "B2"),
    "ROUTE-CLIPPED": ("clipped", "C"),
    "ROUTE-DUCT": ("duct", "D1"),
    "ROUTE-BURIED": ("buried", "D2"),
}

#: Metres per drawing unit, by unit name: every length code of $INSUNITS
#: (table and sources in :mod:`cablewright.extract.units`).
UNIT_TO_M: Mapping[str, float] = _UNIT_TO_M


@dataclass(frozen=True)
class RoutePolyline:
    """One route piece as read from a drawing, already in metres.

    Attributes
    ----------
    points_m : tuple of (x, y, z)
        Vertices in world coordinates, [m]; arcs already flattened.
    layer : str
        Layer (or IFC class) it came from.
    containment : str
        One of :data:`CONTAINMENTS`.
    method : str
        IEC 60364-5-52 reference method letter.
    source_id : str
        DXF handle (``"2A"``, or ``"insert/entity"`` for exploded blocks) or IFC GlobalId.
    """

    points_m: tuple[Point3, ...]
    layer: str
    containment: str
    method: str
    source_id: str


@dataclass(frozen=True)
class RouteSegment:
    """A stretch of route between two nodes of the network.

    A segment ends where the network branches, ends, where an equipment tail
    attaches (contract.md, "Lengths and grouping"), and where the layer changes
    (so that one segment has one installation method).

    Attributes
    ----------
    segment_id : str
        Our own id, ``"S1"``, ``"S2"`` ..., deterministic for a given drawing.
    source_ids : tuple of str
        Handles / GlobalIds of the route pieces it is made of.
    layer : str
        Layer of the pieces.
    containment : str
        One of :data:`CONTAINMENTS`.
    method : str
        IEC 60364-5-52 reference method letter.
    length_m : float
        True 3D length, [m], snap gaps included.
    points_m : tuple of (x, y, z)
        Vertices from one end node to the other, [m].
    """

    segment_id: str
    source_ids: tuple[str, ...]
    layer: str
    containment: str
    method: str
    length_m: float
    points_m: tuple[Point3, ...]


@dataclass(frozen=True)
class CarrierSize:
    """The containment size a model states for one carrier (IFC: profile or property set).

    Attributes
    ----------
    size_mm : float
        Usable width (tray, ladder) or inner diameter (conduit, duct), [mm].
    source : str
        Where it was read, e.g. ``"IFC <GlobalId> IfcRectangleProfileDef max(XDim, YDim)"``.
    """

    size_mm: float
    source: str


@dataclass(frozen=True)
class Equipment:
    """An equipment (block reference with a tag).

    Attributes
    ----------
    tag : str
        The equipment tag, e.g. ``"MCC-1"``.
    source_id : str
        DXF handle (``"outer/inner"`` for nested blocks) or IFC GlobalId.
    position_m : (x, y, z)
        Insertion point in world coordinates, [m].
    block_name : str
        Block (or IFC class) name.
    attributes : tuple of (name, value)
        Attribute names upper-cased, values as written.
    """

    tag: str
    source_id: str
    position_m: Point3
    block_name: str
    attributes: tuple[tuple[str, str], ...] = ()

    def attribute(self, name: str, default: str | None = None) -> str | None:
        """Value of attribute ``name`` (case-insensitive), or ``default``."""
        key = name.upper()
        for k, v in self.attributes:
            if k == key:
                return v
        return default


@dataclass(frozen=True)
class ScheduleRow:
    """One row of the circuit schedule.

    Attributes
    ----------
    source : str
        File the row came from (or ``"drawing"`` for block attributes).
    row : int
        Row number in the file, 1-based as a spreadsheet shows it.
    circuit_id, from_tag, to_tag : str
        The required columns, stripped.
    fields : tuple of (column, text)
        Every column, header lower-cased and stripped, cell text as written.
    """

    source: str
    row: int
    circuit_id: str
    from_tag: str
    to_tag: str
    fields: tuple[tuple[str, str], ...] = ()

    def get(self, name: str, default: Any = None) -> Any:
        """Cell text of column ``name`` (case-insensitive); ``default`` when blank or absent."""
        key = name.strip().lower()
        for k, v in self.fields:
            if k == key:
                v = v.strip()
                return v if v else default
        return default

    @property
    def where(self) -> str:
        """``"file row N"`` for messages."""
        return f"{self.source} row {self.row}"


@dataclass(frozen=True)
class CircuitRoute:
    """The measured route of one circuit.

    Attributes
    ----------
    circuit_id, from_tag, to_tag : str
        As in the schedule.
    routed_length_m : float
        Source tail + path along routes + load tail, no allowance, [m]
        (contract.md, "Lengths and grouping").
    design_length_m : float
        ``routed_length_m * (1 + slack_fraction) + 2 * end_allowance_m``, [m].
    source_tail_m, load_tail_m : float
        Straight tails from the equipment insertion points to the routes, [m].
    segment_ids : tuple of str
        Segments used, in order from the source.
    points_m : tuple of (x, y, z)
        The whole path, tails included, [m].
    """

    circuit_id: str
    from_tag: str
    to_tag: str
    routed_length_m: float
    design_length_m: float
    source_tail_m: float
    load_tail_m: float
    segment_ids: tuple[str, ...]
    points_m: tuple[Point3, ...]


def _default_layers() -> dict[str, tuple[str, str]]:
    return dict(DEFAULT_ROUTE_LAYERS)


@dataclass(frozen=True)
class DrawingConfig:
    """How to read a drawing; defaults from contract.md, "Drawing conventions".

    Attributes
    ----------
    units : str or None
        Drawing units (a name of :data:`UNIT_TO_M`: ``"mm"``, ``"cm"``, ``"dm"``, ``"m"``,
        ``"in"``, ``"ft"`` ...); when given, they override the drawing's ``$INSUNITS``.
    route_layers : mapping
        Layer name (whole name, case-insensitive) -> (containment, method).
    extra_layer_patterns : mapping
        fnmatch pattern (case-insensitive) -> (containment, method).
    snap_tolerance_m : float
        Route ends closer than this join, [m] (contract: 50 mm).
    max_tail_m : float
        Longest straight tail from equipment to route, [m] (contract: 15 m).
    tag_attribute : str
        Attribute holding the equipment tag.
    slack_fraction : float
        Slack added to the routed length, [-] (0.05, common practice).
    end_allowance_m : float
        Added at each end for terminations and drops, [m] (1.5 m, common practice).
    near_miss_factor : float
        Ends within ``near_miss_factor * snap_tolerance_m`` that did not join are reported.
    join_crossings : bool
        Join route runs that cross in plan at the same level (heights within the snap
        tolerance) at the crossing point (``[routes] join_crossings``, contract key).  Off:
        such crossings do not join (contract.md, "Drawing conventions") and are reported.
    recover : bool
        Use ezdxf's recover mode on a damaged drawing and list what was lost.
    route_tiers : mapping
        Layer name or fnmatch pattern (case-insensitive) -> number of tiers
        (trays or ladders stacked) on that layer; layers not named have 1.
        Read with the grouping tables IEC 60364-5-52:2009 B.52.20/B.52.21.
    tags_from_text : bool
        A symbol without a tag attribute (a block reference, or a CIRCLE or POINT on
        one of ``tag_symbol_layers``) takes the first word of the nearest TEXT or
        MTEXT within ``tag_text_max_m`` as its tag (contract.md, Extensions).
    tag_text_max_m : float
        Farthest a text may be from its symbol, in plan, [m] (contract: 1 m).
    tag_symbol_layers : tuple of str
        Layers whose CIRCLE and POINT entities are equipment symbols (case-insensitive).
    flatten_tolerance_m : float
        Largest distance between a curve (SPLINE, ELLIPSE) and the chords it is read
        as, [m] (10 mm, common practice: far below the length allowances).
    """

    units: str | None = None
    route_layers: Mapping[str, tuple[str, str]] = field(default_factory=_default_layers)
    extra_layer_patterns: Mapping[str, tuple[str, str]] = field(default_factory=dict)
    snap_tolerance_m: float = 0.05
    max_tail_m: float = 15.0
    tag_attribute: str = "TAG"
    slack_fraction: float = 0.05
    end_allowance_m: float = 1.5
    near_miss_factor: float = 10.0
    join_crossings: bool = False
    recover: bool = False
    tags_from_text: bool = False
    tag_text_max_m: float = 1.0
    tag_symbol_layers: tuple[str, ...] = ()
    flatten_tolerance_m: float = 0.01
    route_tiers: Mapping[str, int] = field(default_factory=dict)

    def layer_tiers(self, layer: str) -> int:
        """Tiers of trays or ladders on ``layer``: ``route_tiers`` by whole name, then pattern; 1."""
        import fnmatch

        name = layer.upper()
        for key, tiers in self.route_tiers.items():
            if key.upper() == name:
                return int(tiers)
        for pattern, tiers in self.route_tiers.items():
            if fnmatch.fnmatchcase(name, pattern.upper()):
                return int(tiers)
        return 1

    def layer_kind(self, layer: str) -> tuple[str, str] | None:
        """(containment, method) of ``layer``, or None if it is not a route layer."""
        import fnmatch

        name = layer.upper()
        for key, kind in self.route_layers.items():
            if key.upper() == name:
                return kind
        for pattern, kind in self.extra_layer_patterns.items():
            if fnmatch.fnmatchcase(name, pattern.upper()):
                return kind
        return None


@dataclass
class Measurement:
    """Everything measured from one drawing and schedule.

    Attributes
    ----------
    drawing : str
        Path of the drawing.
    units : str
        Drawing units used (``"mm"`` ...).
    segments : dict
        Segment id -> :class:`RouteSegment`.
    equipment : dict
        Tag -> :class:`Equipment` (the first one where a tag is duplicated).
    rows : list
        Schedule rows, in order.
    routes : dict
        Circuit id -> :class:`CircuitRoute`, for circuits that could be routed.
    failures : dict
        Circuit id -> one-line message why it could not be routed.
    issues : list
        Drawing problems found (:class:`~cablewright.core.errors.Issue`).
    graph : networkx.Graph
        Route network: nodes ``"N<i>"`` and ``"EQ:<tag>"``; edges carry
        ``length_m``, ``kind``, ``containment``, ``method``, ``segment_id``, ``source_id``.
    source_document : object or None
        The parsed input kept so that later stages need not read the file again
        (for a DXF drawing the ``ezdxf`` document read by
        :func:`~cablewright.extract.dxf_reader.read_dxf`; ``None`` for IFC).  It is
        never written back to the input path: the annotate stage adds its marks to
        it and saves it under the output name only.
    drawing_summary : DrawingSummary or None
        Units used (and where they came from), route extents and the scale check
        (:class:`~cablewright.extract.units.DrawingSummary`); None for IFC.
    carrier_sizes : dict
        Source id (IFC GlobalId) -> :class:`CarrierSize` of every carrier whose model
        states its width or inner diameter (``[ifc] containment_from_model``); empty for DXF.
    """

    drawing: str
    units: str
    segments: dict[str, RouteSegment]
    equipment: dict[str, Equipment]
    rows: list[ScheduleRow]
    routes: dict[str, CircuitRoute]
    failures: dict[str, str]
    issues: list[Issue]
    graph: nx.Graph
    source_document: object | None = field(default=None, repr=False, compare=False)
    drawing_summary: DrawingSummary | None = None
    carrier_sizes: dict[str, CarrierSize] = field(default_factory=dict)
