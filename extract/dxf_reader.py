"""Read route pieces and equipment from a DXF drawing, in metres.

Only model space is read.  Block references are followed through any depth of
nesting: route-layer geometry inside them is exploded (entities on layer ``0``
take the layer of the reference, as CAD programs draw them), and every block
reference carrying the tag attribute is an equipment at its world insertion point.
"""

from __future__ import annotations

import logging
import math
import os
from collections.abc import Iterator
from dataclasses import dataclass, field
from pathlib import Path
from typing import TYPE_CHECKING, NamedTuple

from cablewright.core.errors import DrawingReadError, Issue, IssueCode

from .dxf_flatten import FLATTEN_TYPES, flatten_points
from .dxf_tags import Symbol, TagMarks, TextMark, first_word, tag_symbols, text_anchor
from .dxf_units import resolve_units, summarise
from .model import UNIT_TO_M, DrawingConfig, Equipment, Point3, RoutePolyline
from .units import INSUNITS, DrawingSummary

if TYPE_CHECKING:  # pragma: no cover
    from ezdxf.document import Drawing
    from ezdxf.math import Matrix44

__all__ = ["DxfContent", "read_dxf", "block_problems", "BlockProblem", "INSUNITS_NAMES", "ARC_STEP_RAD", "MAX_BLOCK_DEPTH"]

logger = logging.getLogger(__name__)

#: $INSUNITS codes we honour -> unit name: every code that is a length
#: (DXF reference, HEADER section, $INSUNITS; table in :mod:`.units`).
INSUNITS_NAMES = {code: name for code, (name, _) in INSUNITS.items()}

#: Largest angle subtended by one chord when arcs are flattened, [rad].
#: The chord/arc ratio is sin(a/2)/(a/2) ~ 1 - a**2/24, so 2 degrees loses
#: 5e-5 of an arc's length (well inside the 0.5 % we promise).
ARC_STEP_RAD = math.radians(2.0)

#: Deepest nesting of block references followed, [levels].  Drawings nest symbols a few
#: levels deep (a skid holding a motor holding a terminal box); 32 leaves room for any
#: real drawing while keeping a hostile one (a block nested 1,000 deep) from exhausting
#: the interpreter's stack here, in ezdxf's bounding boxes and in its drawing add-on.
MAX_BLOCK_DEPTH = 32


class BlockProblem(NamedTuple):
    """Why a block cannot be followed: ``kind`` is ``"recursion"``, ``"too-deep"`` or ``"undefined"``."""

    kind: str
    message: str
    cause: str = ""  # the first block found bad, for the message of the blocks holding it


def block_problems(doc: Drawing) -> dict[str, BlockProblem]:
    """Blocks that cannot be followed, by name, with what is wrong with each.

    A block is unusable when it inserts itself (directly or through others), nests
    more than :data:`MAX_BLOCK_DEPTH` levels deep, or inserts a block that is not
    defined (then also the undefined name is listed).  Found by one iterative
    depth-first pass over the BLOCKS section (no recursion: any depth is safe here).

    Parameters
    ----------
    doc : ezdxf.document.Drawing
        The drawing.

    Returns
    -------
    dict
        Block name -> :class:`BlockProblem`; blocks that are fine are absent.
    """
    children: dict[str, list[str]] = {}
    for block in doc.blocks:
        if not block.name.startswith("*"):  # not the model and paper space layouts
            children[block.name] = [e.dxf.name for e in block if e.dxftype() == "INSERT"]
    problems: dict[str, BlockProblem] = {}
    depth: dict[str, int] = {}  # levels of blocks, this one included
    for root in children:
        if root not in depth and root not in problems:
            _visit_blocks(root, children, depth, problems)
    return problems


def _visit_blocks(
    root: str, children: dict[str, list[str]], depth: dict[str, int], problems: dict[str, BlockProblem]
) -> None:
    stack: list[tuple[str, int]] = [(root, 0)]
    on_path: list[str] = []
    while stack:
        name, k = stack.pop()
        if k == 0:
            on_path.append(name)
        kids = children[name]
        if k < len(kids):
            stack.append((name, k + 1))
            kid = kids[k]
            if kid in on_path:
                loop = " > ".join(on_path[on_path.index(kid):] + [kid])
                problems.setdefault(kid, BlockProblem("recursion", f"block {kid} inserts itself ({loop})"))
            elif kid not in children:
                problems.setdefault(kid, BlockProblem("undefined", f"block {kid} is not defined in the drawing"))
            elif kid not in depth and kid not in problems:
                stack.append((kid, 0))
            continue
        on_path.pop()
        bad = next((problems[c] for c in kids if c in problems), None)
        if bad is not None:
            cause = bad.cause or bad.message
            problems.setdefault(name, BlockProblem(bad.kind, f"block {name} holds a bad block ({cause})", cause))
            continue
        depth[name] = 1 + max((depth[c] for c in kids), default=0)
        if depth[name] > MAX_BLOCK_DEPTH:
            problems[name] = BlockProblem(
                "too-deep", f"block {name} nests blocks {depth[name]} levels deep, more than {MAX_BLOCK_DEPTH}"
            )


@dataclass
class DxfContent:
    """What :func:`read_dxf` found.

    Attributes
    ----------
    path : str
        The drawing read.
    units : str
        Drawing units used (``"mm"``, ``"cm"``, ``"m"``, ``"in"``, ``"ft"``).
    polylines : list of RoutePolyline
        Route pieces in world coordinates, [m].
    equipment : list of Equipment
        Every block reference with the tag attribute (tags may repeat; the
        network builder reports duplicates).
    issues : list of Issue
        Problems that did not stop reading.
    document : ezdxf.document.Drawing or None
        The parsed drawing itself, kept so that later stages (the annotated
        copy, the preview) need not read the file again.  It is the input as
        read (recovered, with ``config.recover``); nothing here writes it back
        to ``path``, and a later stage that adds to it saves it elsewhere.
    summary : DrawingSummary or None
        Units used and where they came from, route extents, scale check.
    """

    path: str
    units: str
    polylines: list[RoutePolyline] = field(default_factory=list)
    equipment: list[Equipment] = field(default_factory=list)
    issues: list[Issue] = field(default_factory=list)
    document: object | None = field(default=None, repr=False, compare=False)
    summary: DrawingSummary | None = None


def _load(path: Path, config: DrawingConfig) -> tuple[Drawing, list[Issue]]:
    import ezdxf
    from ezdxf import recover

    if not path.exists():
        raise DrawingReadError(file=path, problem="file not found", fix="check the drawing path")
    if path.is_dir():
        raise DrawingReadError(file=path, problem="is a folder, not a DXF file", fix="give the drawing file")
    if path.stat().st_size == 0:
        raise DrawingReadError(file=path, problem="file is empty", fix="export the drawing again as DXF")
    try:
        with path.open("rb") as f:
            f.read(1)
    except OSError as exc:
        raise DrawingReadError(file=path, problem=f"cannot be opened ({exc})", fix="check the path and permissions") from exc
    read_errors = (ezdxf.DXFError, UnicodeError, ValueError, EOFError, IndexError, TypeError, OSError,
                   StopIteration, KeyError, AttributeError)
    try:
        return ezdxf.readfile(str(path)), []
    except read_errors as exc:  # ezdxf raises OSError for "not a DXF file"
        first_error = exc
    # The normal reader failed: is it a damaged DXF that recover mode can read?
    try:
        doc, auditor = recover.readfile(str(path))
    except read_errors as exc:
        raise DrawingReadError(file=path, problem=f'not a readable DXF file, or damaged or truncated beyond repair ({first_error})',
                               fix="export the drawing again as DXF") from exc
    if len(doc.modelspace()) == 0:
        raise DrawingReadError(file=path, problem=f'not a readable DXF file, or damaged or truncated beyond repair ({first_error})',
                               fix="export the drawing again as DXF")
    if not config.recover:
        raise DrawingReadError(file=path, problem=f'the DXF file is damaged ({first_error}) and could be read only in part',
                               fix="missing routes would give wrong lengths. Repair or re-export the drawing, or use --recover to measure what can be read")
    issues = [
        Issue(
            IssueCode.RECOVERED,
            f"{path}: damaged file read in recover mode ({first_error}); "
            f"{len(doc.modelspace())} model-space entities could be read, anything past the "
            "damage is lost - check the routes against the drawing",
        )
    ]
    for err in auditor.errors:
        handle = getattr(getattr(err, "entity", None), "dxf", None)
        sid = getattr(handle, "handle", "") or ""
        issues.append(Issue(IssueCode.RECOVER_LOST, f"{path}: {err.message}", sid))
    for fix in auditor.fixes:
        handle = getattr(getattr(fix, "entity", None), "dxf", None)
        sid = getattr(handle, "handle", "") or ""
        issues.append(Issue(IssueCode.RECOVER_FIXED, f"{path}: {fix.message}", sid))
    return doc, issues


def _units(doc: Drawing, path: Path, config: DrawingConfig, issues: list[Issue]) -> str:
    """The units to read the drawing in: the config's when given, else ``$INSUNITS``."""
    return resolve_units(doc, path, config, issues)[0]


# --------------------------------------------------------------------------- geometry


def _arc_points(
    cx: float, cy: float, r: float, a0: float, sweep: float, z: float
) -> list[tuple[float, float, float]]:
    """Points of a circular arc in its OCS from angle a0 sweeping ``sweep`` (signed) [rad]."""
    n = max(1, math.ceil(abs(sweep) / ARC_STEP_RAD))
    return [
        (cx + r * math.cos(a0 + sweep * i / n), cy + r * math.sin(a0 + sweep * i / n), z)
        for i in range(n + 1)
    ]


def _bulge_points(
    p1: tuple[float, float], p2: tuple[float, float], bulge: float, z: float
) -> list[tuple[float, float, float]]:
    """Points from p1 to p2 (p1 included, p2 included) along a bulged segment in OCS.

    The bulge is tan(theta/4), theta the included angle, positive counter-clockwise
    (DXF reference, LWPOLYLINE group code 42).
    """
    if abs(bulge) < 1e-12 or (p1[0] == p2[0] and p1[1] == p2[1]):
        return [(p1[0], p1[1], z), (p2[0], p2[1], z)]
    theta = 4.0 * math.atan(bulge)
    dx, dy = p2[0] - p1[0], p2[1] - p1[1]
    chord = math.hypot(dx, dy)
    r = chord / (2.0 * math.sin(abs(theta) / 2.0))
    # centre: from the chord midpoint along the left normal by d (signed by bulge)
    d = r * math.cos(theta / 2.0) * (1 if theta > 0 else -1)
    mx, my = (p1[0] + p2[0]) / 2.0, (p1[1] + p2[1]) / 2.0
    nx_, ny_ = -dy / chord, dx / chord
    cx, cy = mx + nx_ * d, my + ny_ * d
    a0 = math.atan2(p1[1] - cy, p1[0] - cx)
    pts = _arc_points(cx, cy, r, a0, theta, z)
    pts[0] = (p1[0], p1[1], z)
    pts[-1] = (p2[0], p2[1], z)
    return pts


def _ocs_to_wcs(extrusion, pts: list[tuple[float, float, float]]) -> list[Point3]:
    from ezdxf.math import OCS

    ocs = OCS(extrusion)
    if ocs.uz.isclose((0, 0, 1)):
        return [(float(x), float(y), float(z)) for x, y, z in pts]
    return [tuple(ocs.to_wcs(p)) for p in pts]


def _bulged_chain(
    verts: list[tuple[float, float, float]], closed: bool, z: float
) -> list[tuple[float, float, float]]:
    """OCS points of a chain of (x, y, bulge) vertices."""
    out: list[tuple[float, float, float]] = []
    n = len(verts)
    last = n if closed else n - 1
    for i in range(last):
        x1, y1, b = verts[i]
        x2, y2, _ = verts[(i + 1) % n]
        seg = _bulge_points((x1, y1), (x2, y2), b, z)
        out.extend(seg if not out else seg[1:])
    if not out and verts:
        out = [(verts[0][0], verts[0][1], z)]
    return out


def _entity_points(e) -> list[Point3] | None:
    """World points (of the entity's own layout) of a route entity; None if unsupported."""
    t = e.dxftype()
    if t == "LINE":
        return [tuple(e.dxf.start), tuple(e.dxf.end)]
    if t == "LWPOLYLINE":
        verts = [(float(x), float(y), float(b)) for x, y, b in e.get_points(format="xyb")]
        pts = _bulged_chain(verts, bool(e.closed), float(e.dxf.elevation))
        return _ocs_to_wcs(e.dxf.extrusion, pts)
    if t == "POLYLINE":
        if e.is_3d_polyline:
            pts3 = [tuple(v.dxf.location) for v in e.vertices]
            if e.is_closed and pts3:
                pts3.append(pts3[0])
            return pts3
        if e.is_2d_polyline:
            elevation = float(e.dxf.elevation[2]) if e.dxf.hasattr("elevation") else 0.0
            verts = [
                (float(v.dxf.location[0]), float(v.dxf.location[1]), float(v.dxf.bulge))
                for v in e.vertices
            ]
            pts = _bulged_chain(verts, bool(e.is_closed), elevation)
            return _ocs_to_wcs(e.dxf.extrusion, pts)
        return None  # polyface / polygon mesh
    if t == "ARC":
        c = e.dxf.center
        a0 = math.radians(e.dxf.start_angle)
        a1 = math.radians(e.dxf.end_angle)
        sweep = (a1 - a0) % (2 * math.pi) or 2 * math.pi
        pts = _arc_points(float(c[0]), float(c[1]), float(e.dxf.radius), a0, sweep, float(c[2]))
        return _ocs_to_wcs(e.dxf.extrusion, pts)
    return None


# --------------------------------------------------------------------------- traversal

_ROUTE_TYPES = {"LINE", "LWPOLYLINE", "POLYLINE", "ARC"}
#: Entities read for tagging equipment from text, and a CIRCLE on a route layer (reported).
_MARK_TYPES = {"TEXT", "MTEXT", "CIRCLE", "POINT"}


@dataclass
class _Walker:
    doc: Drawing
    path: Path
    config: DrawingConfig
    scale: float
    content: DxfContent
    tag_key: str
    _block_info: dict[str, tuple[bool, bool, bool]] = field(default_factory=dict)
    marks: TagMarks = field(default_factory=TagMarks)
    problems: dict[str, BlockProblem] = field(default_factory=dict)

    def block_info(self, name: str, stack: tuple[str, ...] = ()) -> tuple[bool, bool, bool]:
        """(has explicit route-layer geometry, has layer-0 geometry, has inserts) of a block."""
        if name in self._block_info:
            return self._block_info[name]
        if name in stack or (name in self.problems and self.problems[name].kind != "undefined"):
            return (False, False, False)
        explicit = layer0 = inserts = False
        block = self.doc.blocks.get(name)
        if block is not None:
            for e in block:
                t = e.dxftype()
                if t in _ROUTE_TYPES or t in FLATTEN_TYPES:
                    layer = e.dxf.layer
                    if layer == "0":
                        layer0 = True
                    elif self.config.layer_kind(layer) is not None:
                        explicit = True
                elif t == "INSERT":
                    inserts = True
                    sub = self.block_info(e.dxf.name, stack + (name,))
                    explicit = explicit or sub[0]
                    layer0 = layer0 or sub[1]
        self._block_info[name] = (explicit, layer0, inserts)
        return self._block_info[name]

    def add_route(self, e, layer: str, pts: list[Point3], matrix: Matrix44 | None, sid: str) -> None:
        kind = self.config.layer_kind(layer)
        if kind is None:
            return
        if matrix is not None:
            pts = [tuple(v) for v in matrix.transform_vertices(pts)]
        s = self.scale
        pts_m = tuple((float(x) * s, float(y) * s, float(z) * s) for x, y, z in pts)
        self.content.polylines.append(RoutePolyline(pts_m, layer.upper(), kind[0], kind[1], sid))

    def add_curve(self, e, layer: str, matrix: Matrix44 | None, sid: str) -> None:
        """A SPLINE, ELLIPSE or MLINE on a route layer, flattened (:mod:`.dxf_flatten`)."""
        from ezdxf import DXFError

        try:
            pts = flatten_points(e, self.config.flatten_tolerance_m / self.scale)
        except (ValueError, ArithmeticError, IndexError, DXFError) as exc:
            pts, why = [], f" ({exc})"
        else:
            why = ""
        if not pts or len(pts) < 2:
            self.content.issues.append(Issue(
                IssueCode.UNSUPPORTED_ENTITY,
                f"{self.path}: {e.dxftype()} {sid} on route layer {layer} could not be flattened{why}; "
                "ignored - redraw it as a polyline", sid))
            return
        self.add_route(e, layer, pts, matrix, sid)

    def mark(self, e, t: str, layer: str, matrix: Matrix44 | None, sid: str) -> None:
        """Texts and CIRCLE/POINT symbols for ``tags_from_text`` (:mod:`.dxf_tags`)."""
        config = self.config
        if t == "CIRCLE" and config.layer_kind(layer):
            self.content.issues.append(Issue(
                IssueCode.UNSUPPORTED_ENTITY,
                f"{self.path}: CIRCLE {sid} on route layer {layer} is not a route; ignored - "
                "draw the route as a line, polyline, arc or spline", sid))
        if not config.tags_from_text:
            return
        if t in ("TEXT", "MTEXT"):
            text = e.plain_text() if t == "MTEXT" else str(e.dxf.text)
            p = text_anchor(e)
        elif layer.upper() in {n.upper() for n in config.tag_symbol_layers}:
            p = tuple(e.dxf.center if t == "CIRCLE" else e.dxf.location)
            if t == "CIRCLE":
                p = tuple(e.ocs().to_wcs(p))
        else:
            return
        if matrix is not None:
            p = tuple(matrix.transform(p))
        s = self.scale
        pos = (float(p[0]) * s, float(p[1]) * s, float(p[2]) * s)
        if t in ("TEXT", "MTEXT"):
            self.marks.texts.append(TextMark(first_word(text), text, pos, layer, sid))
        else:
            self.marks.symbols.append(Symbol(layer, pos, sid))

    def symbol(self, ins, matrix: Matrix44 | None, name: str, isid: str, attribs: dict[str, str]) -> None:
        """A model-space block reference without the tag attribute: a symbol to tag from text."""
        explicit, layer0, _ = self.block_info(name)
        if name.startswith("*") or explicit:  # anonymous blocks (dimensions, hatches); route blocks
            return
        p = ins.ocs().to_wcs(ins.dxf.insert)
        if matrix is not None:
            p = matrix.transform(p)
        s = self.scale
        self.marks.symbols.append(Symbol(name, (float(p[0]) * s, float(p[1]) * s, float(p[2]) * s),
                                         isid, tuple(sorted(attribs.items()))))

    def walk(
        self,
        entities,
        matrix: Matrix44 | None,
        parent_layer: str | None,
        prefix: str,
        depth: int,
        stack: tuple[str, ...],
    ) -> None:
        from ezdxf import DXFError

        for e in entities:
            try:
                self.entity(e, matrix, parent_layer, prefix, depth, stack)
            except (DXFError, AttributeError, ValueError, TypeError, IndexError, KeyError, ArithmeticError) as exc:
                # a damaged entity (recover mode keeps some): refused alone, the others go on
                handle = getattr(getattr(e, "dxf", None), "handle", None) or "?"
                sid = prefix + str(handle)
                self.content.issues.append(Issue(
                    IssueCode.UNREADABLE_ENTITY,
                    f"{self.path}: {e.dxftype()} {sid} cannot be read ({type(exc).__name__}: "
                    f"{(str(exc).splitlines() or [''])[0][:120]}); ignored - check it in the drawing",
                    sid,
                ))

    def entity(
        self,
        e,
        matrix: Matrix44 | None,
        parent_layer: str | None,
        prefix: str,
        depth: int,
        stack: tuple[str, ...],
    ) -> None:
        """Read one entity: a route piece, a block reference, a curve, or a mark for tags."""
        t = e.dxftype()
        layer = e.dxf.layer
        if parent_layer is not None and layer == "0":
            layer = parent_layer
        sid = prefix + e.dxf.handle if e.dxf.handle else prefix + "?"
        if t in _ROUTE_TYPES:
            if self.config.layer_kind(layer) is None:
                return
            pts = _entity_points(e)
            if pts is None:
                self.content.issues.append(
                    Issue(
                        IssueCode.UNSUPPORTED_ENTITY,
                        f"{self.path}: {t} {sid} on route layer {layer} is a mesh, not a "
                        "route line; ignored - redraw it as a polyline",
                        sid,
                    )
                )
                return
            self.add_route(e, layer, pts, matrix, sid)
        elif t == "INSERT":
            self.insert(e, matrix, layer, prefix, depth, stack, sid)
        elif t in FLATTEN_TYPES and self.config.layer_kind(layer):
            self.add_curve(e, layer, matrix, sid)
        elif t in _MARK_TYPES:
            self.mark(e, t, layer, matrix, sid)

    def insert(self, e, matrix, layer: str, prefix: str, depth: int, stack, sid: str) -> None:
        name = e.dxf.name
        found = self.problems.get(name)
        problem = found.message if found is not None and found.kind != "undefined" else None
        if problem is None and (depth > MAX_BLOCK_DEPTH or name in stack):  # pragma: no cover
            problem = f"block {name} nests itself or too deep"  # block_problems finds these first
        if problem is not None:
            self.content.issues.append(
                Issue(
                    IssueCode.BLOCK_RECURSION,
                    f"{self.path}: INSERT {sid}: {problem}; its contents are skipped - "
                    "fix the block definitions in the drawing",
                    sid,
                )
            )
            return
        inserts = list(e.multi_insert()) if e.mcount > 1 else [e]
        for k, ins in enumerate(inserts):
            isid = sid if len(inserts) == 1 else f"{sid}#{k}"
            m = ins.matrix44() if matrix is None else ins.matrix44() * matrix
            attribs = {a.dxf.tag.upper(): a.dxf.text for a in ins.attribs}
            tag = attribs.get(self.tag_key, "").strip()
            if not tag and depth == 0 and self.config.tags_from_text:
                self.symbol(ins, matrix, name, isid, attribs)
            if tag:
                p = ins.ocs().to_wcs(ins.dxf.insert)
                if matrix is not None:
                    p = matrix.transform(p)
                s = self.scale
                self.content.equipment.append(
                    Equipment(
                        tag=tag,
                        source_id=isid,
                        position_m=(float(p[0]) * s, float(p[1]) * s, float(p[2]) * s),
                        block_name=name,
                        attributes=tuple(sorted(attribs.items())),
                    )
                )
            block = self.doc.blocks.get(name)
            if block is None:
                self.content.issues.append(
                    Issue(
                        "missing-block",
                        f"{self.path}: INSERT {isid} names block {name}, which is not defined; "
                        "its contents are missing - insert a defined block",
                        isid,
                    )
                )
                continue
            explicit, layer0, has_inserts = self.block_info(name)
            route_layer = self.config.layer_kind(layer) is not None
            if not (explicit or (layer0 and route_layer) or has_inserts):
                continue
            self.walk(block, m, layer, isid + "/", depth + 1, stack + (name,))


def _walk_layout(walker: _Walker, entities: Iterator) -> None:
    walker.walk(entities, None, None, "", 0, ())


def _tag_from_text(walker: _Walker) -> None:
    """Equipment from the symbols collected, tagged from text (:mod:`.dxf_tags`)."""
    content = walker.content
    if not walker.config.tags_from_text:
        if walker.config.tag_symbol_layers:
            content.issues.append(Issue(
                IssueCode.TAGS_FROM_TEXT_OFF,
                f"{walker.path}: tag_symbol_layers is set but tags_from_text is false; the circles and "
                "points on those layers are not read as equipment - set tags_from_text = true"))
        return
    found, issues = tag_symbols(walker.marks, walker.config.tag_text_max_m,
                                (eq.tag for eq in content.equipment), str(walker.path))
    content.equipment.extend(found)
    content.issues.extend(issues)


def read_dxf(path: str | os.PathLike[str], config: DrawingConfig | None = None) -> DxfContent:
    """Read route pieces and equipment from a DXF drawing.

    Parameters
    ----------
    path : str or path-like
        The DXF file.  It is only read, never written.
    config : DrawingConfig, optional
        Layers, units override, tag attribute, recover mode.

    Returns
    -------
    DxfContent
        Route polylines and equipment in world coordinates, [m], issues, and
        the parsed document (``DxfContent.document``).

    Raises
    ------
    DrawingReadError
        File missing, empty, not a DXF, damaged (unless ``config.recover``),
        unitless without ``config.units``, or without any route entity.

    Notes
    -----
    Lengths are true 3D lengths; arcs (ARC and polyline bulges) are flattened
    with chords of at most :data:`ARC_STEP_RAD`, losing less than 5e-5 of length.

    References
    ----------
    .. [1] Autodesk, DXF Reference (AutoCAD 2012): HEADER $INSUNITS; LWPOLYLINE
       group 42 (bulge); OCS (arbitrary axis algorithm).
    """
    config = config or DrawingConfig()
    p = Path(path)
    doc, issues = _load(p, config)
    units = _units(doc, p, config, issues)
    content = DxfContent(path=str(p), units=units, issues=issues, document=doc)
    walker = _Walker(doc, p, config, UNIT_TO_M[units], content, config.tag_attribute.upper())
    walker.problems = block_problems(doc)
    _walk_layout(walker, iter(doc.modelspace()))
    _tag_from_text(walker)
    if not content.polylines:
        names = sorted({e.dxf.layer for e in doc.modelspace()})
        wanted = ", ".join(config.route_layers)
        raise DrawingReadError(file=p, problem=f'no route entities (LINE, LWPOLYLINE, POLYLINE, ARC, SPLINE, ELLIPSE, MLINE) on a route layer ({wanted})',
                               fix=f"layers used in model space: {', '.join(names) or 'none'}. Put the cable routes on those layers or add the layer names to the config ('cablewright layers {p.name} --write-config FILE' suggests one)")
    content.summary = summarise(doc, p, config, content)
    logger.info(
        "%s: %d route pieces, %d equipment, units %s",
        p, len(content.polylines), len(content.equipment), units,
    )
    return content
