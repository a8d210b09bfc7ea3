"""Write the annotated DXF: cable labels, group tags, device notes, schedule and cautions.

The input drawing is read with ezdxf and never written to; everything we add goes
on layers of our own (see :class:`AnnotateConfig`) and carries extended data
(XDATA) under our application id, so a later run finds and removes it first and
the label count stays the same (contract.md, "The annotated DXF").  The file is
written to a temporary name and renamed into place (:mod:`.atomic`).

What is added (default layer names):

========================  ===============================================
``CW-CABLE-LABEL``        one TEXT per sized circuit: ``"P-101: 4C 70 mm² Cu/XLPE"``,
                          along its route, never upside down
``CW-GROUP-TAG``          one MTEXT per run of shared route segments (2+
                          circuits): counts per segment, then circuit ids
``CW-DEVICE-NOTE``        at each load a note with a leader line:
                          ``"P-101: 125 A"``
``CW-SCHEDULE``           a table (circuit, from, to, cable, device, length,
                          status) beside the drawing's extents
``CW-NOTES``              the cautions text; notes for circuits not sized
========================  ===============================================

Text height follows the drawing's scale: the extents are fitted on a sheet
(default A1 landscape, usable 800 mm x 560 mm), the scale is rounded up to a
usual drawing scale and the text is ``paper_text_height_mm`` at that scale
(common practice: 2.5 mm lettering on plotted drawings).

References
----------
.. [1] ezdxf documentation: ``Drawing.saveas``, ``DXFEntity.set_xdata``,
   ``ezdxf.bbox.extents``, ``ezdxf.fonts``.
.. [2] ISO 3098-0:1997, lettering heights 1.8, 2.5, 3.5, 5, 7 mm (the series the
   default 2.5 mm is taken from; from memory).
"""

from __future__ import annotations

import logging
import math
import os
import textwrap
from collections import defaultdict
from collections.abc import Callable, Iterable, Mapping, Sequence
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

import ezdxf
from cablewright.extract.dxf_reader import block_problems
from cablewright.extract.errors import DrawingReadError
from ezdxf import bbox as ezbbox
from ezdxf.enums import TextEntityAlignment
from ezdxf.fonts import fonts
from ezdxf.tools.text import estimate_mtext_content_extents
from shapely.geometry import Point
from shapely.ops import nearest_points

from .atomic import atomic_path
from .layout import (
    LabelIndex,
    Placement,
    Stretch,
    oriented_box,
    place_along,
    place_near_point,
    rank_stretches,
    route_obstacles,
    straight_stretches,
)
from .model import CircuitOutcome

__all__ = [
    "CAUTIONS",
    "USUAL_SCALES",
    "AnnotateConfig",
    "AnnotationSummary",
    "write_annotated_dxf",
    "remove_old_marks",
    "text_height_m_for_extents",
    "crowded_text_height_m",
    "label_text",
    "group_runs",
    "group_tag_lines",
]

log = logging.getLogger(__name__)

#: The cautions written on the drawing and in the report (DEVELOPERS.md, "Safety").
CAUTIONS = (
    "Design aid only: results must be checked by a qualified person against local "
    "wiring rules, the cable maker's data and the installation as built."
)

#: Usual drawing scale denominators (1:n), common practice in building and plant drawings.
USUAL_SCALES = (1, 2, 5, 10, 20, 25, 50, 100, 200, 250, 500, 1000, 2000, 2500, 5000, 10000)

ProgressHook = Callable[[int], None]


@dataclass(frozen=True)
class AnnotateConfig:
    """How the annotated drawing looks.  Every name may be changed.

    Attributes
    ----------
    label_layer, group_layer, device_layer, schedule_layer, notes_layer : str
        Our layers.  When the input already has a layer of that name that is not
        ours, ``-2``, ``-3`` ... is appended.
    appid : str
        XDATA application id marking every entity (and layer) we add.
    text_style : str
        Text style we create (font ``font``; ``txt`` for DXF R12).
    font : str
        Font file of the text style, also used to measure labels.
    text_height_m : float or None
        Fixed text height in model space [m]; ``None`` derives it from the
        extents (see :func:`text_height_m_for_extents`).
    paper_text_height_mm : float
        Plotted text height [mm] (2.5 mm, ISO 3098 series, common practice).
    sheet_mm : (float, float)
        Usable sheet width and height the extents are fitted on [mm]
        (A1 landscape, 841 x 594 mm less margins).
    min_text_height_m, max_text_height_m : float
        Clamp of the derived height [m].
    colors : mapping
        ACI colour per layer role (``label``, ``group``, ``device``,
        ``schedule``, ``notes``).
    group_tags, device_notes, schedule, error_notes : bool
        Switch each kind of mark on or off (labels are always written).
    schedule_rows_per_panel : int
        Rows in one column of the schedule table before a new column starts.
    ids_per_line : int
        Circuit ids per line in a group tag.
    group_tag_max_ids : int
        Circuit ids written in a group tag; beyond that the tag ends with
        ``"+k more"`` (the full membership of every segment is in
        ``schedule.json``: each circuit's ``route.segments``).
    avoid_drawing_text : bool
        Keep marks off the drawing's own TEXT, MTEXT and visible ATTRIB boxes.
    avoid_symbols : bool
        Keep marks off block references (equipment symbols).
    symbol_max_text_heights : float
        A block reference larger than this many text heights (a frame, a whole
        room drawn as a block) is not an obstacle.
    cautions : str
        Text of the cautions note.
    crowd_fraction : float or None
        On a crowded drawing the derived text height is lowered until the
        marks cover at most this share of the extents (see
        :func:`crowded_text_height_m`); ``None`` keeps the sheet-fitted height.

    Notes
    -----
    Group tags.  A route segment shared by two or more circuits is tagged, but
    not every such segment: shared segments that continue one another (end to
    end, with no third shared segment at the joint) form one *run* and get one
    tag, so a tray from which circuits peel off at every tee carries one tag,
    not one per tee (see :func:`group_runs`).  The tag is placed beside the
    run's best stretch (free, least crowded, long enough) and reads::

        S4, S5: 6 circuits, 6 cables
        S6: 5 circuits, 5 cables
        F-MCC1, P-101, P-102
        P-103, P-104, SP-1 +3 more

    The head lines name every segment of the run, grouped by equal circuit and
    cable counts (most crowded first; at most four lines, the rest summed up
    as ``"+k segments: 2-4 circuits"``), so each shared segment stays
    traceable; at most ``group_tag_max_ids`` circuit ids of the most crowded
    segment follow, ``ids_per_line`` a line.
    A tag pushed away from its run by other marks gets a leader line.
    """

    label_layer: str = "CW-CABLE-LABEL"
    group_layer: str = "CW-GROUP-TAG"
    device_layer: str = "CW-DEVICE-NOTE"
    schedule_layer: str = "CW-SCHEDULE"
    notes_layer: str = "CW-NOTES"
    appid: str = "CABLEWRIGHT"
    text_style: str = "CW-TEXT"
    font: str = "arial.ttf"
    text_height_m: float | None = None
    paper_text_height_mm: float = 2.5
    sheet_mm: tuple[float, float] = (800.0, 560.0)
    min_text_height_m: float = 0.002
    max_text_height_m: float = 10.0
    colors: Mapping[str, int] = field(
        default_factory=lambda: {
            "label": 5,
            "group": 6,
            "device": 94,
            "schedule": 7,
            "notes": 1,
        }
    )
    group_tags: bool = True
    device_notes: bool = True
    schedule: bool = True
    error_notes: bool = True
    schedule_rows_per_panel: int = 60
    ids_per_line: int = 3
    group_tag_max_ids: int = 6
    avoid_drawing_text: bool = True
    avoid_symbols: bool = True
    symbol_max_text_heights: float = 40.0
    cautions: str = CAUTIONS
    crowd_fraction: float | None = 0.25


@dataclass(frozen=True)
class AnnotationSummary:
    """What :func:`write_annotated_dxf` wrote.

    Attributes
    ----------
    output_path : pathlib.Path
    labels : int
        Cable labels (one per sized circuit).
    group_tags, device_notes, error_notes, schedule_rows : int
    removed : int
        Entities of an earlier run removed from the input.
    overlapping : int
        Labels and notes that found no free spot (placed anyway, flagged).
    text_height : float
        Text height used [drawing units].
    layers : mapping
        Role -> layer name actually used.
    unlabelled : tuple of str
        Sized circuits that got no label (no route geometry), with the reason.
    """

    output_path: Path
    labels: int
    group_tags: int
    device_notes: int
    error_notes: int
    schedule_rows: int
    removed: int
    overlapping: int
    text_height: float
    layers: Mapping[str, str]
    unlabelled: tuple[str, ...] = ()


def text_height_m_for_extents(
    width_m: float,
    height_m: float,
    *,
    paper_text_height_mm: float = 2.5,
    sheet_mm: tuple[float, float] = (800.0, 560.0),
    min_m: float = 0.002,
    max_m: float = 10.0,
) -> float:
    """Model-space text height for a drawing of the given extents.

    The scale that fits the extents on the sheet is rounded up to the next
    usual scale (:data:`USUAL_SCALES`); the text height is the paper height
    times that scale, clamped to ``[min_m, max_m]``::

        n = next_usual(max(1000 W / sheet_w, 1000 H / sheet_h))
        h = paper_text_height_mm * n / 1000

    Parameters
    ----------
    width_m, height_m : float
        Extents of the drawing [m].
    paper_text_height_mm : float
        Plotted text height [mm].
    sheet_mm : (float, float)
        Usable sheet size [mm].
    min_m, max_m : float
        Clamp [m].

    Returns
    -------
    float
        Text height [m].

    Examples
    --------
    A 60 m x 30 m plant room fits A1 at 1:100 (60 m / 0.8 m = 75 -> 100):

    >>> text_height_m_for_extents(60.0, 30.0)
    0.25
    """
    need = max(1000.0 * width_m / sheet_mm[0], 1000.0 * height_m / sheet_mm[1], 1.0)
    scale = next((s for s in USUAL_SCALES if s >= need - 1e-9), None)
    if scale is None:
        scale = need
    return min(max(paper_text_height_mm * scale / 1000.0, min_m), max_m)


def crowded_text_height_m(
    area_per_h2: float,
    width_m: float,
    height_m: float,
    *,
    fraction: float = 0.25,
    paper_text_height_mm: float = 2.5,
    min_m: float = 0.002,
) -> float:
    """Text height at which the marks cover at most ``fraction`` of the extents.

    Marks of text height ``h`` cover ``A * h**2`` (``A`` = ``area_per_h2``, the
    sum of every mark's box in units of ``h**2``).  The largest height with
    ``A * h**2 <= fraction * W * H`` is rounded down to the plotted text height
    at a usual scale (:data:`USUAL_SCALES`): the crowded drawing is then read
    at that larger scale, on several sheets, rather than squeezed on one.
    The rule and the default fraction are our own choice (labels that do not
    fit overlap, and cost the most time to place).

    Parameters
    ----------
    area_per_h2 : float
        Total box area of the marks divided by the text height squared [-].
    width_m, height_m : float
        Extents of the drawing [m].
    fraction : float
        Share of the extents the marks may cover [-].
    paper_text_height_mm : float
        Plotted text height [mm].
    min_m : float
        Lower clamp [m].

    Returns
    -------
    float
        Text height [m]; ``inf`` when there are no marks.

    Examples
    --------
    1,000 marks of 20 h x 2 h on a 1,000 m x 500 m plant, 5 % covered: the
    largest height is sqrt(0.05 * 5e5 / 4e4) = 0.79 m, so 1:250 (0.625 m).

    >>> crowded_text_height_m(40_000.0, 1000.0, 500.0, fraction=0.05)
    0.625
    """
    if area_per_h2 <= 0.0:
        return math.inf
    limit = math.sqrt(max(fraction, 0.0) * max(width_m, 0.0) * max(height_m, 0.0) / area_per_h2)
    fitting = [s for s in USUAL_SCALES if paper_text_height_mm * s / 1000.0 <= limit + 1e-12]
    h = paper_text_height_mm * max(fitting) / 1000.0 if fitting else min_m
    return max(h, min_m)


def _mark_area_per_h2(
    outcomes: Sequence[CircuitOutcome],
    per_segment: Mapping[str, Sequence[str]],
    measure: Callable[[str], float],
    config: AnnotateConfig,
) -> float:
    """Box area of the marks to place, in units of text height squared (an estimate).

    Cable labels from their text (``measure`` = advance width at height 1, box
    margins as :meth:`_Writer.line_box`); one device note per load and one group
    tag per shared segment as three-line blocks of 24 characters (a typical
    size; the exact tags are only known later).
    """
    area = 0.0
    loads = set()
    for o in outcomes:
        if o.status != "error" and o.sizing is not None and o.sizing.cable is not None:
            area += (measure(label_text(o)) + 0.4) * 1.7
            loads.add(o.to_tag)
    block = (24 * 0.6 + 0.4) * (2 * _LINE_PITCH + 1.7)
    if config.device_notes:
        area += len(loads) * block
    if config.group_tags:
        area += sum(1 for c in per_segment.values() if len(set(c)) >= 2) * block
    return area


def label_text(outcome: CircuitOutcome) -> str:
    """The cable label of a sized circuit, e.g. ``"P-101: 4C 70 mm² Cu/XLPE"``."""
    sizing = outcome.sizing
    if sizing is None or sizing.cable is None:
        raise ValueError(f"circuit {outcome.circuit_id} has no cable to label")
    text = f"{outcome.circuit_id}: {sizing.cable.describe()}"
    if outcome.status == "fail":
        text += " [FAIL]"
    return _clean(text)


def _clean(text: str) -> str:
    """One line of TEXT content: no line breaks, no control characters."""
    return " ".join(str(text).split())


def _dxf_escape(text: str) -> str:
    """Text content as DXF stores it, so that it reads back as ``text``.

    DXF text takes ``%%`` + a letter as a control code (``%%c`` diameter,
    ``%%d`` degree, ``%%p`` plus/minus, ``%%u`` underline ...) and ``%%%`` as a
    single percent sign; a caret followed by a letter is a control character
    (``^J``) and ``"^ "`` a single caret.  Where a ``%%`` occurs every ``%`` is
    written ``%%%``; every ``^`` is written ``"^ "``.

    Examples
    --------
    >>> _dxf_escape("P-101%%c")
    'P-101%%%%%%c'
    >>> _dxf_escape("5% load")
    '5% load'
    >>> _dxf_escape("A^J")
    'A^ J'

    References
    ----------
    .. [1] ezdxf documentation, "Special Characters" (``%%c``, ``%%d``, ``%%p``,
       ``%%%``) and ``ezdxf.tools.text.caret_decode``.
    """
    if "%%" in text:
        text = text.replace("%", "%%%")
    return text.replace("^", "^ ")


def _mtext_escape(text: str) -> str:
    cleaned = _clean(text).replace("\\", "\\\\").replace("{", "\\{").replace("}", "\\}")
    return _dxf_escape(cleaned)


def _rating_text(value: float) -> str:
    return f"{value:g}"


# -- layers, appid, removal ---------------------------------------------------------


def _is_ours(entity: Any, appid: str) -> bool:
    try:
        return bool(entity.has_xdata(appid))
    except (AttributeError, ezdxf.DXFValueError):
        return False


def remove_old_marks(doc: Any, config: AnnotateConfig = AnnotateConfig()) -> int:
    """Delete what an earlier run added: entities with our XDATA or on our layers.

    Parameters
    ----------
    doc : ezdxf.document.Drawing
    config : AnnotateConfig

    Returns
    -------
    int
        Entities deleted.
    """
    appid = config.appid
    if not doc.appids.has_entry(appid):
        return 0
    our_layers = {layer.dxf.name.upper() for layer in doc.layers if _is_ours(layer, appid)}
    removed = 0
    for layout in doc.layouts:
        doomed = [
            e for e in layout if _is_ours(e, appid) or e.dxf.get("layer", "0").upper() in our_layers
        ]
        for entity in doomed:
            layout.delete_entity(entity)
            removed += 1
    return removed


def _our_layer(doc: Any, wanted: str, color: int, appid: str) -> str:
    """Our layer named ``wanted`` (or ``wanted-2``...), created and marked if missing."""
    for n in range(1, 100):
        name = wanted if n == 1 else f"{wanted}-{n}"
        if not doc.layers.has_entry(name):
            layer = doc.layers.add(name, color=color)
            layer.set_xdata(appid, [(1000, "cablewright layer")])
            return name
        if _is_ours(doc.layers.get(name), appid):
            return name
        if n == 1:
            log.warning(
                "the drawing already has a layer %s; using %s-2 or next free", wanted, wanted
            )
    raise DrawingReadError(
        f"no free layer name like {wanted!r} in the drawing; set another name in the config"
    )


# -- geometry helpers -----------------------------------------------------------


def _scaled(points: Iterable[Sequence[float]], k: float) -> list[tuple[float, float, float]]:
    return [
        (float(p[0]) * k, float(p[1]) * k, (float(p[2]) if len(p) > 2 else 0.0) * k) for p in points
    ]


_LINE_PITCH = 5.0 / 3.0  # MTEXT line pitch / char height at spacing factor 1 (ezdxf, DXF ref.)


def _text_box(entity: Any, measure: Callable[[str], float]) -> tuple | None:
    """Oriented box of a TEXT or ATTRIB in plan, from its alignment [drawing units].

    The width is the font's advance width of the plain text (``measure`` at
    height 1) times height and width factor; the box spans descender (0.2 h)
    to cap height.  Mirrored text and extrusions are ignored (plan drawings).
    """
    text = entity.plain_text()
    if not text.strip():
        return None
    dxf = entity.dxf
    h = float(dxf.get("height", 2.5))
    w = measure(text) * h * float(dxf.get("width", 1.0) or 1.0)
    halign, valign = int(dxf.get("halign", 0)), int(dxf.get("valign", 0))
    rot = float(dxf.get("rotation", 0.0))
    ins = dxf.get("insert", (0.0, 0.0, 0.0))
    ref = ins
    if halign in (3, 5):  # aligned / fit: the text runs from insert to align point
        end = dxf.get("align_point", None)
        if end is not None:
            dx, dy = end[0] - ins[0], end[1] - ins[1]
            if math.hypot(dx, dy) > 0.0:
                w = math.hypot(dx, dy)
                rot = math.degrees(math.atan2(dy, dx))
        x0 = 0.0
        valign = 0
    else:
        if halign or valign:
            ref = dxf.get("align_point", ins) or ins
        x0 = {0: 0.0, 1: -w / 2.0, 2: -w, 4: -w / 2.0}.get(halign, 0.0)
    if halign == 4:
        y0, y1 = -0.5 * h, 0.5 * h
    else:
        y0, y1 = {0: (-0.2 * h, h), 1: (0.0, 1.2 * h), 2: (-0.5 * h, 0.5 * h), 3: (-h, 0.0)}.get(
            valign, (-0.2 * h, h)
        )
    a = math.radians(rot)
    ux, uy = math.cos(a), math.sin(a)
    lx, ly = x0 + w / 2.0, (y0 + y1) / 2.0
    return oriented_box(
        ref[0] + ux * lx - uy * ly, ref[1] + uy * lx + ux * ly, w, y1 - y0, rot
    )


def _mtext_box(entity: Any, measure: Callable[[str], float]) -> tuple | None:
    """Oriented box of an MTEXT from its attachment point, column width and lines."""
    text = entity.plain_text(split=False)
    lines = [line for line in text.split("\n")]
    if not text.strip():
        return None
    dxf = entity.dxf
    ch = float(dxf.get("char_height", 2.5))
    widths = [measure(line) * ch for line in lines]
    column = float(dxf.get("width", 0.0) or 0.0)
    if column > 0.0:
        n_lines = sum(max(1, math.ceil(lw / column)) for lw in widths)
        w = min(column, max(widths))
    else:
        n_lines, w = len(lines), max(widths)
    spacing = float(dxf.get("line_spacing_factor", 1.0) or 1.0)
    height = ch + (n_lines - 1) * ch * _LINE_PITCH * spacing
    ap = int(dxf.get("attachment_point", 1))
    col, row = (ap - 1) % 3, (ap - 1) // 3
    x0 = -w * col / 2.0
    y1 = height * row / 2.0
    rot = float(entity.get_rotation())
    a = math.radians(rot)
    ux, uy = math.cos(a), math.sin(a)
    lx, ly = x0 + w / 2.0, y1 - height / 2.0
    ins = dxf.get("insert", (0.0, 0.0, 0.0))
    return oriented_box(ins[0] + ux * lx - uy * ly, ins[1] + uy * lx + ux * ly, w, height, rot)


@dataclass
class _DrawingScan:
    """What one pass over modelspace found: extents and the boxes labels must avoid."""

    xmin: float = math.inf
    ymin: float = math.inf
    xmax: float = -math.inf
    ymax: float = -math.inf
    texts: list[tuple] = field(default_factory=list)
    symbols: list[tuple] = field(default_factory=list)

    def take(self, x: float, y: float) -> None:
        if math.isfinite(x) and math.isfinite(y):
            self.xmin = min(self.xmin, x)
            self.xmax = max(self.xmax, x)
            self.ymin = min(self.ymin, y)
            self.ymax = max(self.ymax, y)

    def take_box(self, box: tuple) -> None:
        self.take(box[6], box[7])
        self.take(box[8], box[9])


def _scan_modelspace(doc: Any, measure: Callable[[str], float]) -> _DrawingScan:
    """One pass over modelspace: extents, text boxes and equipment symbol boxes.

    Cheap cases are measured directly (LINE, LWPOLYLINE and POLYLINE vertices,
    CIRCLE/ARC circles, HATCH polyline paths, TEXT/MTEXT/ATTRIB boxes from the
    font's advance widths, INSERT as its block's box - measured once per block
    with ``ezdxf.bbox`` - turned by the insert's matrix); anything else falls
    back to ``ezdxf.bbox.extents(fast=True)``.
    """
    scan = _DrawingScan()
    # blocks that insert themselves, nest too deep or are undefined get no box (ezdxf's
    # bounding box would recurse without end); the reader reports them
    block_boxes: dict[str, Any] = dict.fromkeys(block_problems(doc))
    fallback = []
    for e in doc.modelspace():
        t = e.dxftype()
        if t == "INSERT" and e.dxf.name in block_boxes and block_boxes[e.dxf.name] is None:
            continue
        try:
            if t == "LINE":
                scan.take(e.dxf.start[0], e.dxf.start[1])
                scan.take(e.dxf.end[0], e.dxf.end[1])
            elif t == "LWPOLYLINE":
                for x, y in e.get_points("xy"):
                    scan.take(x, y)
            elif t in ("CIRCLE", "ARC"):
                c, r = e.dxf.center, float(e.dxf.radius)
                scan.take(c[0] - r, c[1] - r)
                scan.take(c[0] + r, c[1] + r)
            elif t == "TEXT":
                box = _text_box(e, measure)
                if box is not None:
                    scan.texts.append(box)
                    scan.take_box(box)
            elif t == "MTEXT":
                box = _mtext_box(e, measure)
                if box is not None:
                    scan.texts.append(box)
                    scan.take_box(box)
            elif t == "INSERT":
                _scan_insert(doc, e, measure, scan, block_boxes)
            elif t == "HATCH" and all(hasattr(p, "vertices") for p in e.paths):
                for path in e.paths:
                    for v in path.vertices:
                        scan.take(v[0], v[1])
            elif t == "POLYLINE":
                for v in e.points():
                    scan.take(v[0], v[1])
            else:
                fallback.append(e)
        except (AttributeError, ValueError, ArithmeticError, ezdxf.DXFError) as exc:
            log.debug("entity %s (%s) not measured: %s", e.dxf.get("handle", "?"), t, exc)
    if fallback:
        try:
            box = ezbbox.extents(fallback, fast=True)
            if box.has_data:
                scan.take(box.extmin.x, box.extmin.y)
                scan.take(box.extmax.x, box.extmax.y)
        except (ezdxf.DXFError, ValueError, ArithmeticError) as exc:  # pragma: no cover
            log.warning("could not measure %d entities of the drawing (%s)", len(fallback), exc)
    scan.texts = [b for b in scan.texts if _usable_box(b)]
    scan.symbols = [b for b in scan.symbols if _usable_box(b)]
    return scan


def _usable_box(box: tuple) -> bool:
    """A box whose numbers are finite (an entity at NaN or infinity, refused by the reader)."""
    return all(math.isfinite(v) for v in box)


def _scan_insert(
    doc: Any,
    insert: Any,
    measure: Callable[[str], float],
    scan: _DrawingScan,
    block_boxes: dict[str, Any],
) -> None:
    """A block reference: its block's box turned into place, and its visible attributes."""
    name = insert.dxf.name
    if name not in block_boxes:
        block = doc.blocks.get(name)
        box = None
        if block is not None:
            parts = [b for b in block if b.dxftype() != "ATTDEF"]
            bb = ezbbox.extents(parts, fast=True) if parts else None
            if bb is not None and bb.has_data:
                box = (bb.extmin.x, bb.extmin.y, bb.extmax.x, bb.extmax.y)
        block_boxes[name] = box
    local = block_boxes[name]
    if local is not None:
        m = insert.matrix44()
        c0, c1, c3 = m.transform_vertices(
            [(local[0], local[1], 0.0), (local[2], local[1], 0.0), (local[0], local[3], 0.0)]
        )
        w, h = math.hypot(c1.x - c0.x, c1.y - c0.y), math.hypot(c3.x - c0.x, c3.y - c0.y)
        rot = math.degrees(math.atan2(c1.y - c0.y, c1.x - c0.x)) if w > 0.0 else 0.0
        box = oriented_box((c1.x + c3.x) / 2.0, (c1.y + c3.y) / 2.0, w, h, rot)
        scan.symbols.append(box)
        scan.take_box(box)
    for attrib in insert.attribs:
        if attrib.is_invisible:
            continue
        box = _text_box(attrib, measure)
        if box is not None:
            scan.texts.append(box)
            scan.take_box(box)


def _extents(
    scan: _DrawingScan, extra: Iterable[tuple[float, float, float]]
) -> tuple[float, float, float, float]:
    """(xmin, ymin, xmax, ymax) of the modelspace entities and ``extra`` points."""
    box = _DrawingScan(scan.xmin, scan.ymin, scan.xmax, scan.ymax)
    for p in extra:
        box.take(p[0], p[1])
    if not (math.isfinite(box.xmin) and math.isfinite(box.ymin)):
        return (0.0, 0.0, 1.0, 1.0)
    return (box.xmin, box.ymin, box.xmax, box.ymax)


class _Writer:
    """Adds our entities to one modelspace; keeps the style, layers and xdata in one place."""

    def __init__(self, doc: Any, config: AnnotateConfig, height: float) -> None:
        self.doc = doc
        self.msp = doc.modelspace()
        self.config = config
        self.height = height
        self.r12 = doc.dxfversion <= "AC1009"
        if not doc.appids.has_entry(config.appid):
            doc.appids.new(config.appid)
        font = "txt" if self.r12 else config.font
        if not doc.styles.has_entry(config.text_style):
            doc.styles.new(config.text_style, dxfattribs={"font": font})
        self.font = fonts.make_font(font, height)
        colors = dict(AnnotateConfig().colors)
        colors.update(config.colors)
        self.layers = {
            "label": _our_layer(doc, config.label_layer, colors["label"], config.appid),
            "group": _our_layer(doc, config.group_layer, colors["group"], config.appid),
            "device": _our_layer(doc, config.device_layer, colors["device"], config.appid),
            "schedule": _our_layer(doc, config.schedule_layer, colors["schedule"], config.appid),
            "notes": _our_layer(doc, config.notes_layer, colors["notes"], config.appid),
        }

    # measuring -------------------------------------------------------------
    def text_width(self, text: str, height: float | None = None) -> float:
        h = self.height if height is None else height
        return self.font.text_width(text) * h / self.height

    def line_box(self, text: str) -> tuple[float, float]:
        """Box of a one-line TEXT label with a margin: (width, height)."""
        h = self.height
        return self.text_width(text) + 0.4 * h, 1.7 * h

    def block_box(self, lines: Sequence[str]) -> tuple[float, float]:
        """Box of a multi-line note with a margin: (width, height)."""
        h = self.height
        width = max(self.text_width(line) for line in lines)
        if self.r12:
            return width + 0.4 * h, (len(lines) - 1) * 1.667 * h + 1.7 * h
        content = "\\P".join(_mtext_escape(line) for line in lines)
        w, hh = estimate_mtext_content_extents(content, self.font, 0.0, 1.0)
        return max(w, width) + 0.4 * h, hh + 0.7 * h

    # writing ---------------------------------------------------------------
    def _tag(self, entity: Any, kind: str, ref: str) -> Any:
        entity.set_xdata(self.config.appid, [(1000, kind), (1000, ref[:200])])
        return entity

    def text(
        self,
        content: str,
        x: float,
        y: float,
        z: float,
        *,
        role: str,
        kind: str,
        ref: str,
        rotation: float = 0.0,
        align: TextEntityAlignment = TextEntityAlignment.MIDDLE_CENTER,
        color: int | None = None,
        height: float | None = None,
    ) -> Any:
        attribs: dict[str, Any] = {
            "layer": self.layers[role],
            "style": self.config.text_style,
            "rotation": rotation,
        }
        if color is not None:
            attribs["color"] = color
        entity = self.msp.add_text(
            _dxf_escape(_clean(content)), height=self.height if height is None else height, dxfattribs=attribs
        )
        entity.set_placement((x, y, z), align=align)
        return self._tag(entity, kind, ref)

    def block(
        self,
        lines: Sequence[str],
        place: Placement,
        *,
        role: str,
        kind: str,
        ref: str,
        color: int | None = None,
        left: bool = False,
    ) -> list[Any]:
        """A multi-line note centred on the placement: MTEXT, or TEXT lines for R12.

        ``left`` aligns the lines on the left edge of the box instead of centring them.
        """
        if not self.r12:
            attribs: dict[str, Any] = {
                "layer": self.layers[role],
                "style": self.config.text_style,
                "char_height": self.height,
                "attachment_point": 1 if left else 5,  # top left / middle centre
                "insert": (
                    (
                        place.x - place.width / 2.0 + 0.2 * self.height,
                        place.y + place.height / 2.0 - 0.35 * self.height,
                        place.z,
                    )
                    if left
                    else (place.x, place.y, place.z)
                ),
                "rotation": place.rotation_deg,
                "width": 0.0,
            }
            if color is not None:
                attribs["color"] = color
            content = "\\P".join(_mtext_escape(line) for line in lines)
            return [self._tag(self.msp.add_mtext(content, dxfattribs=attribs), kind, ref)]
        a = math.radians(place.rotation_deg)
        vx, vy = -math.sin(a), math.cos(a)
        pitch = 1.667 * self.height
        top = (len(lines) - 1) * pitch / 2.0
        ux, uy = math.cos(a), math.sin(a)
        shift = -place.width / 2.0 + 0.2 * self.height if left else 0.0
        out = []
        for i, line in enumerate(lines):
            d = top - i * pitch
            out.append(
                self.text(
                    line,
                    place.x + vx * d + ux * shift,
                    place.y + vy * d + uy * shift,
                    place.z,
                    role=role,
                    kind=kind,
                    ref=ref,
                    rotation=place.rotation_deg,
                    color=color,
                    align=TextEntityAlignment.MIDDLE_LEFT
                    if left
                    else TextEntityAlignment.MIDDLE_CENTER,
                )
            )
        return out

    def line(
        self,
        a: Sequence[float],
        b: Sequence[float],
        *,
        role: str,
        kind: str,
        ref: str,
        color: int | None = None,
    ) -> Any:
        attribs: dict[str, Any] = {"layer": self.layers[role]}
        if color is not None:
            attribs["color"] = color
        entity = self.msp.add_line(tuple(a), tuple(b), dxfattribs=attribs)
        return self._tag(entity, kind, ref)

    def leader(
        self,
        place: Placement,
        z: float,
        *,
        role: str,
        kind: str,
        ref: str,
        color: int | None = None,
    ) -> None:
        """A straight leader from the anchor point to the nearest edge of the note."""
        anchor = Point(place.anchor)
        _, near = nearest_points(anchor, place.polygon.exterior)
        self.line(
            (place.anchor[0], place.anchor[1], z),
            (near.x, near.y, z),
            role=role,
            kind=kind,
            ref=ref,
            color=color,
        )


# -- the marks ----------------------------------------------------------------


def _route_stretches(
    outcome: CircuitOutcome,
    segments: Mapping[str, Any],
    per_segment: Mapping[str, Sequence[str]],
    k: float,
    from_count: Mapping[str, int],
    to_count: Mapping[str, int],
    cache: dict[str, list[Stretch]] | None = None,
) -> list[Stretch]:
    """Stretches a circuit's label may go on; ``cache`` keeps each segment's (shared ones
    are cut once, not once per circuit on them)."""
    route = outcome.route
    stretches: list[Stretch] = []
    cache = {} if cache is None else cache
    for seg_id in getattr(route, "segment_ids", ()) or ():
        cut = cache.get(seg_id)
        if cut is None:
            seg = segments.get(seg_id)
            if seg is None or len(seg.points_m) < 2:
                cut = []
            else:
                crowd = max(1, len(per_segment.get(seg_id, ())))
                cut = straight_stretches(_scaled(seg.points_m, k), crowd=crowd, key=seg_id)
            cache[seg_id] = cut
        stretches += cut
    pts = _scaled(getattr(route, "points_m", ()) or (), k)
    if not stretches and len(pts) >= 2:
        return straight_stretches(pts, crowd=1, key="route")
    if len(pts) >= 2:
        # tails: a source tail is shared by every circuit from that source
        if (getattr(route, "source_tail_m", 0.0) or 0.0) > 0.0:
            stretches += straight_stretches(
                pts[:2], crowd=max(1, from_count.get(outcome.from_tag, 1)), key="source-tail"
            )
        if (getattr(route, "load_tail_m", 0.0) or 0.0) > 0.0:
            stretches += straight_stretches(
                pts[-2:], crowd=max(1, to_count.get(outcome.to_tag, 1)), key="load-tail"
            )
    return stretches


def group_runs(
    segments: Mapping[str, Any],
    per_segment: Mapping[str, Sequence[str]],
    k: float = 1.0,
    *,
    min_circuits: int = 2,
) -> list[tuple[str, ...]]:
    """Shared segments joined into runs along the route, one group tag each.

    Two shared segments (``min_circuits`` or more circuits) are in one run when
    they meet end to end (to 1 mm) at a point where no third shared segment
    ends: a run continues along a tray while circuits peel off or join it at
    tees, and stops where shared routes branch.  Joined transitively
    (union-find).  The tag then names the run's segments grouped by equal
    circuit counts (see :func:`group_tag_lines`), so the grouping of each
    segment stays readable while a long tray gets one tag, not one per tee.

    Parameters
    ----------
    segments : mapping
        Segment id -> RouteSegment (``points_m`` [m]).
    per_segment : mapping
        Segment id -> circuit ids routed through it.
    k : float
        Unused scale, kept for symmetry with the writer (drawing units per m).
    min_circuits : int
        Segments with fewer circuits are not tagged.

    Returns
    -------
    list of tuple of str
        Runs, most crowded first; segment ids of a run in natural order.

    Examples
    --------
    S1 and S2 continue one another (the count drops from 3 to 2 where C
    leaves); S3 and S4 both end at (9, 0) with S2, a branch of shared routes:

    >>> from types import SimpleNamespace as S
    >>> segs = {"S1": S(points_m=((0, 0), (5, 0))), "S2": S(points_m=((5, 0), (9, 0))),
    ...         "S3": S(points_m=((9, 0), (9, 4))), "S4": S(points_m=((9, 0), (14, 0)))}
    >>> group_runs(segs, {"S1": ("A", "B", "C"), "S2": ("B", "A"), "S3": ("A", "B"),
    ...                   "S4": ("A", "B")})
    [('S1', 'S2'), ('S3',), ('S4',)]
    """
    del k
    shared = [
        sid
        for sid, cids in per_segment.items()
        if len(set(cids)) >= min_circuits
        and sid in segments
        and len(getattr(segments[sid], "points_m", ()) or ()) >= 2
    ]
    parent = {sid: sid for sid in shared}

    def find(a: str) -> str:
        while parent[a] != a:
            parent[a] = parent[parent[a]]
            a = parent[a]
        return a

    at_point: dict[tuple, list[str]] = defaultdict(list)
    for sid in shared:
        pts = segments[sid].points_m
        for end in (pts[0], pts[-1]):
            at_point[(round(float(end[0]), 3), round(float(end[1]), 3))].append(sid)
    for sids in at_point.values():
        if len(sids) == 2 and sids[0] != sids[1]:
            ra, rb = find(sids[0]), find(sids[1])
            if ra != rb:
                parent[rb] = ra
    runs: dict[str, list[str]] = defaultdict(list)
    for sid in shared:
        runs[find(sid)].append(sid)
    out = [tuple(sorted(r, key=lambda x: (len(x), x))) for r in runs.values()]
    out.sort(key=lambda r: (-max(len(set(per_segment[x])) for x in r), len(r[0]), r[0]))
    return out


def group_tag_lines(
    run: Sequence[str],
    circuits: Sequence[str],
    n_cables: int,
    *,
    ids_per_line: int = 3,
    max_ids: int = 6,
    counts: Sequence[tuple[Sequence[str], int, int]] | None = None,
    max_count_lines: int = 4,
) -> list[str]:
    """Lines of a group tag: segments with counts, then a few circuit ids.

    Parameters
    ----------
    run : sequence of str
        Segment ids of the run.
    circuits : sequence of str
        Circuit ids listed (those of the run's most crowded segment).
    n_cables : int
        Cables on the run's segments when ``counts`` is not given.
    ids_per_line, max_ids : int
        Circuit ids per line and in all.
    counts : sequence of (segment ids, circuits, cables), optional
        The run's segments grouped by equal counts, most crowded first: one
        head line each.  Default: the whole run with ``len(circuits)`` and
        ``n_cables``.
    max_count_lines : int
        Head lines at most; further groups are summed up in one line.

    Examples
    --------
    >>> group_tag_lines(["S4", "S5"], [f"C{i}" for i in range(8)], 9)
    ['S4, S5: 8 circuits, 9 cables', 'C0, C1, C2', 'C3, C4, C5 +2 more']
    >>> group_tag_lines(["S1"], ["A", "B"], 2)
    ['S1: 2 circuits, 2 cables', 'A, B']
    >>> group_tag_lines(["S1", "S2"], ["A", "B", "C"], 3,
    ...                 counts=[(["S1"], 3, 3), (["S2"], 2, 2)])
    ['S1: 3 circuits, 3 cables', 'S2: 2 circuits, 2 cables', 'A, B, C']
    """
    per = max(1, ids_per_line)
    if counts is None:
        counts = [(list(run), len(circuits), n_cables)]
    head = []
    shown_counts = list(counts)
    rest_counts = []
    if len(shown_counts) > max(1, max_count_lines):
        cut = max(1, max_count_lines) - 1
        shown_counts, rest_counts = shown_counts[:cut], shown_counts[cut:]
    for sids, n_circuits, cables in shown_counts:
        ids = list(sids)
        lines = [", ".join(ids[i : i + 2 * per]) for i in range(0, len(ids), 2 * per)]
        lines[-1] += f": {n_circuits} circuits, {cables} cables"
        head += lines
    if rest_counts:
        n_segs = sum(len(sids) for sids, _, _ in rest_counts)
        low = min(c for _, c, _ in rest_counts)
        high = max(c for _, c, _ in rest_counts)
        span = f"{low}" if low == high else f"{low}-{high}"
        head.append(f"+{n_segs} segments: {span} circuits")
    shown = list(circuits[: max(0, max_ids)])
    lines = [", ".join(shown[i : i + per]) for i in range(0, len(shown), per)]
    rest = len(circuits) - len(shown)
    if rest > 0:
        more = f"+{rest} more"
        if lines:
            lines[-1] += " " + more
        else:
            lines = [more]
    return [_clean(line) for line in head + lines]


def _segment_cables(
    outcomes: Sequence[CircuitOutcome], per_segment: Mapping[str, Sequence[str]]
) -> dict[str, int]:
    """Cables per segment: from the grouping where given, else one per circuit (parallel counted)."""
    parallel = {
        o.circuit_id: (o.sizing.cable.parallel if o.sizing and o.sizing.cable else 1)
        for o in outcomes
    }
    cables: dict[str, int] = {
        seg: sum(parallel.get(c, 1) for c in circuits) for seg, circuits in per_segment.items()
    }
    for o in outcomes:
        for seg, _circuits, n_cables in getattr(o.group, "segment_counts", ()) or ():
            if seg in cables:
                cables[seg] = max(cables[seg], int(n_cables))
    return cables


def _schedule_table(
    w: _Writer, outcomes: Sequence[CircuitOutcome], x0: float, y_top: float, z: float
) -> int:
    """Cautions, title and the schedule table, top left at (x0, y_top)."""
    h = w.height
    config = w.config
    # cautions, wrapped to about the table's width
    caution_lines = ["CAUTION"] + textwrap.wrap(config.cautions, 60)
    bw, bh = w.block_box(caution_lines)
    note = Placement(x0 + bw / 2.0, y_top - bh / 2.0, z, 0.0, bw, bh, None, False)  # type: ignore[arg-type]
    w.block(caution_lines, note, role="notes", kind="cautions", ref="cautions", left=True)
    y = y_top - bh - 2.0 * h  # title baseline: a gap, then 1.4 h title letters
    w.text(
        "CABLE SCHEDULE (cablewright)",
        x0,
        y,
        z,
        role="schedule",
        kind="schedule",
        ref="title",
        align=TextEntityAlignment.BOTTOM_LEFT,
        height=1.4 * h,
    )
    y -= 0.6 * h
    header = ("circuit", "from", "to", "cable", "device", "length", "status")
    rows = []
    for o in outcomes:
        s = o.sizing
        cable = s.cable.describe() if s is not None and s.cable is not None else "-"
        device = (
            f"{_rating_text(s.device_rating_a)} A"
            if s is not None and s.device_rating_a is not None
            else "-"
        )
        length = (
            f"{o.route.routed_length_m:.1f} m"
            if o.route is not None and getattr(o.route, "routed_length_m", None) is not None
            else "-"
        )
        rows.append(
            tuple(
                _clean(v)
                for v in (o.circuit_id, o.from_tag, o.to_tag, cable, device, length, o.status)
            )
        )
    widths = [
        max(w.text_width(r[i]) for r in [header, *rows]) + 1.2 * h for i in range(len(header))
    ]
    table_w = sum(widths)
    row_h = (1.8 if w.r12 else _LINE_PITCH) * h
    per_panel = max(1, config.schedule_rows_per_panel)
    panels = [rows[i : i + per_panel] for i in range(0, len(rows), per_panel)] or [[]]
    for p, panel in enumerate(panels):
        px = x0 + p * (table_w + 3.0 * h)
        lines = [header, *panel]
        bottom = y - len(lines) * row_h
        if w.r12:
            _schedule_cells_r12(w, lines, widths, px, y, z, row_h)
            continue
        # one MTEXT per column and two polylines for the rules: a 2,000-row schedule
        # is a few hundred entities, not 14,000 TEXT and 2,000 LINE
        cx = px
        for c in range(len(header)):
            column = "\\P".join(_mtext_escape(row[c]) for row in lines)
            entity = w.msp.add_mtext(
                column,
                dxfattribs={
                    "layer": w.layers["schedule"],
                    "style": config.text_style,
                    "char_height": h,
                    "attachment_point": 1,  # top left
                    "insert": (cx + 0.6 * h, y - (row_h - h) / 2.0, z),
                    "line_spacing_style": 2,  # exact: rows stay on the grid
                    "line_spacing_factor": row_h / (_LINE_PITCH * h),
                    "width": 0.0,
                },
            )
            w._tag(entity, "schedule", f"column {header[c]}")
            cx += widths[c]
        rules: list[tuple[float, float]] = []
        for r in range(len(lines) + 1):
            yy = y - r * row_h
            ends = [(px, yy), (px + table_w, yy)]
            rules += ends if r % 2 == 0 else ends[::-1]
        cols: list[tuple[float, float]] = []
        cx = px
        for c in range(len(header) + 1):
            ends = [(cx, y), (cx, bottom)]
            cols += ends if c % 2 == 0 else ends[::-1]
            if c < len(header):
                cx += widths[c]
        for pts, ref in ((rules, "grid rows"), (cols, "grid columns")):
            entity = w.msp.add_lwpolyline(
                pts, dxfattribs={"layer": w.layers["schedule"], "elevation": z}
            )
            w._tag(entity, "schedule", ref)
    return len(rows)


def _schedule_cells_r12(
    w: _Writer,
    lines: Sequence[Sequence[str]],
    widths: Sequence[float],
    px: float,
    y: float,
    z: float,
    row_h: float,
) -> None:
    """Schedule panel for DXF R12 (no MTEXT, no LWPOLYLINE): TEXT per cell, LINE rules."""
    h = w.height
    for r, row in enumerate(lines):
        yc = y - (r + 0.5) * row_h
        cx = px
        for c, value in enumerate(row):
            w.text(
                value,
                cx + 0.6 * h,
                yc,
                z,
                role="schedule",
                kind="schedule",
                ref=row[0] if r else "header",
                align=TextEntityAlignment.MIDDLE_LEFT,
            )
            cx += widths[c]
    table_w = sum(widths)
    bottom = y - len(lines) * row_h
    for r in range(len(lines) + 1):
        yy = y - r * row_h
        w.line((px, yy, z), (px + table_w, yy, z), role="schedule", kind="schedule", ref="grid")
    cx = px
    for c in range(len(widths) + 1):
        w.line((cx, y, z), (cx, bottom, z), role="schedule", kind="schedule", ref="grid")
        if c < len(widths):
            cx += widths[c]


def _read_input(src: Path) -> Any:
    """Parse the input drawing (when the caller did not pass the parsed document)."""
    try:
        return ezdxf.readfile(src)
    except OSError as exc:
        raise DrawingReadError(f"{src}: cannot read the drawing ({exc}); check the path") from exc
    except ezdxf.DXFStructureError as exc:
        raise DrawingReadError(
            f"{src}: the drawing is damaged ({exc}); repair it in CAD or re-export it"
        ) from exc


def write_annotated_dxf(
    input_path: str | os.PathLike[str],
    output_path: str | os.PathLike[str],
    outcomes: Sequence[CircuitOutcome],
    segments: Mapping[str, Any],
    per_segment: Mapping[str, Sequence[str]],
    equipment: Mapping[str, Any],
    units_per_m: float,
    config: AnnotateConfig = AnnotateConfig(),
    progress: ProgressHook | None = None,
    document: Any = None,
) -> AnnotationSummary:
    """Write a copy of the drawing with cable labels, group tags, notes and schedule.

    Parameters
    ----------
    input_path : path-like
        The drawing (DXF).  Only read.
    output_path : path-like
        Where the annotated copy goes; written atomically.  Must differ from
        ``input_path``.
    outcomes : sequence of CircuitOutcome
        Every circuit; those with a cable get a label, ``error`` ones a note.
    segments : mapping
        Segment id -> RouteSegment (``points_m`` in metres, world).
    per_segment : mapping
        Segment id -> circuit ids routed through it.
    equipment : mapping
        Tag -> Equipment (``position_m`` in metres, world).
    units_per_m : float
        Drawing units per metre (1000 for a drawing in mm) [1/m].
    config : AnnotateConfig
        Layer names, text height, what to add.
    progress : callable, optional
        Called with ``1`` after each cable label is placed (one call per
        labelled circuit), e.g. ``tqdm.update``.
    document : ezdxf.document.Drawing, optional
        The drawing already parsed from ``input_path`` (``Measurement.source_document``,
        kept by the extract stage), so the file is not read a second time.  Our
        marks are added to this document, which is then saved to
        ``output_path`` (never to ``input_path``); afterwards it holds the
        annotated drawing, e.g. for :func:`~.preview.render_preview_png`.

    Returns
    -------
    AnnotationSummary

    Raises
    ------
    DrawingReadError
        The input cannot be read, or the output would overwrite it.
    """
    src = Path(input_path)
    dst = Path(output_path)
    if not units_per_m > 0.0:
        raise ValueError(f"units_per_m must be > 0, got {units_per_m!r}")
    if dst.exists() and src.resolve() == dst.resolve():
        raise DrawingReadError(
            f"{dst}: the annotated drawing would overwrite the input; choose another output folder"
        )
    if document is not None:
        doc = document
    else:
        doc = _read_input(src)

    removed = remove_old_marks(doc, config)
    if removed:
        log.info("%s: removed %d marks of an earlier run", src, removed)
    k = float(units_per_m)

    r12 = doc.dxfversion <= "AC1009"
    measure = fonts.make_font("txt" if r12 else config.font, 1.0).text_width
    scan = _scan_modelspace(doc, measure)
    route_pts = [p for seg in segments.values() for p in _scaled(seg.points_m, k)]
    route_pts += [_scaled([e.position_m], k)[0] for e in equipment.values()]
    xmin, ymin, xmax, ymax = _extents(scan, route_pts)
    if config.text_height_m is not None:
        h_m = float(config.text_height_m)
    else:
        h_m = text_height_m_for_extents(
            (xmax - xmin) / k,
            (ymax - ymin) / k,
            paper_text_height_mm=config.paper_text_height_mm,
            sheet_mm=config.sheet_mm,
            min_m=config.min_text_height_m,
            max_m=config.max_text_height_m,
        )
        if config.crowd_fraction is not None:
            demand = _mark_area_per_h2(outcomes, per_segment, measure, config)
            crowded = crowded_text_height_m(
                demand,
                (xmax - xmin) / k,
                (ymax - ymin) / k,
                fraction=config.crowd_fraction,
                paper_text_height_mm=config.paper_text_height_mm,
                min_m=config.min_text_height_m,
            )
            if crowded < h_m:
                log.info(
                    "%s: crowded drawing (%d circuits); text height %.3g m instead of %.3g m",
                    src, len(outcomes), crowded, h_m,
                )
                h_m = crowded
    h = h_m * k
    w = _Writer(doc, config, h)
    # the drawing's own text and its equipment symbols: no mark goes on them; a
    # symbol bigger than ``symbol_max_text_heights`` text heights (a frame, a room
    # block) is not an obstacle, or nothing could be placed inside it
    big = config.symbol_max_text_heights * h
    blocked = list(scan.texts) if config.avoid_drawing_text else []
    if config.avoid_symbols:
        blocked += [b for b in scan.symbols if 2.0 * max(b[4], b[5]) <= big]
    index = LabelIndex(
        cell=12.0 * h,
        obstacles=route_obstacles(_scaled(s.points_m, k) for s in segments.values()),
        blocked=blocked,
    )
    log.debug("%s: %d text and symbol boxes kept clear", src, len(blocked))

    from_count: dict[str, int] = defaultdict(int)
    to_count: dict[str, int] = defaultdict(int)
    for o in outcomes:
        if o.route is not None:
            from_count[o.from_tag] += 1
            to_count[o.to_tag] += 1

    labels = overlapping = 0
    unlabelled: list[str] = []
    cut_cache: dict[str, list[Stretch]] = {}
    for o in outcomes:
        if o.status == "error" or o.sizing is None or o.sizing.cable is None:
            continue
        stretches = _route_stretches(o, segments, per_segment, k, from_count, to_count, cut_cache)
        if not stretches:
            unlabelled.append(f"{o.circuit_id}: no route geometry to put a label on")
            log.warning(
                "circuit %s: sized but has no route geometry; no label on the drawing", o.circuit_id
            )
            continue
        text = label_text(o)
        bw, bh = w.line_box(text)
        place = place_along(index, rank_stretches(stretches, bw), bw, bh)
        overlapping += place.overlaps
        w.text(
            text,
            place.x,
            place.y,
            place.z,
            role="label",
            kind="cable-label",
            ref=o.circuit_id,
            rotation=place.rotation_deg,
            color=1 if o.status == "fail" else None,
        )
        labels += 1
        if progress is not None:
            progress(1)

    group_tags = 0
    if config.group_tags:
        cables = _segment_cables(outcomes, per_segment)
        for run in group_runs(segments, per_segment, k, min_circuits=2):
            by_count: dict[tuple[int, int], list[str]] = defaultdict(list)
            for seg_id in run:
                n_circuits = len(set(per_segment[seg_id]))
                by_count[(n_circuits, cables.get(seg_id, n_circuits))].append(seg_id)
            counts = [(sids, nc, nk) for (nc, nk), sids in sorted(by_count.items(), reverse=True)]
            busiest = counts[0][0][0]
            circuits = list(per_segment[busiest])
            lines = group_tag_lines(
                run,
                circuits,
                counts[0][2],
                ids_per_line=config.ids_per_line,
                max_ids=config.group_tag_max_ids,
                counts=counts,
            )
            stretches = [
                st
                for seg_id in run
                for st in straight_stretches(
                    _scaled(segments[seg_id].points_m, k),
                    crowd=len(per_segment[seg_id]),
                    key=seg_id,
                )
            ]
            if not stretches:
                continue
            bw, bh = w.block_box(lines)
            place = place_along(index, rank_stretches(stretches, bw), bw, bh)
            overlapping += place.overlaps
            w.block(lines, place, role="group", kind="group-tag", ref=",".join(run))
            if place.polygon.distance(Point(place.anchor)) > 1.5 * h:
                w.leader(place, place.z, role="group", kind="group-leader", ref=run[0])
            group_tags += 1

    device_notes = error_notes = 0
    notes_by_load: dict[str, list[str]] = defaultdict(list)
    errors_by_tag: dict[str, list[str]] = defaultdict(list)
    for o in outcomes:
        s = o.sizing
        if o.status != "error" and s is not None and s.device_rating_a is not None:
            notes_by_load[o.to_tag].append(f"{o.circuit_id}: {_rating_text(s.device_rating_a)} A")
        elif o.status == "error":
            tag = o.to_tag if o.to_tag in equipment else o.from_tag
            errors_by_tag[tag].append(f"{o.circuit_id}: NOT SIZED, see report")

    def notes_at_equipment(by_tag: dict[str, list[str]], role: str, kind: str) -> tuple[int, int]:
        """Place one note with a leader at each equipment; (notes placed, overlaps)."""
        placed = overlaps = 0
        for tag, lines in by_tag.items():
            eq = equipment.get(tag)
            if eq is None:
                continue
            x, y, z = _scaled([eq.position_m], k)[0]
            bw, bh = w.block_box(lines)
            place = place_near_point(index, x, y, z, bw, bh)
            overlaps += place.overlaps
            w.block(lines, place, role=role, kind=f"{kind}-note", ref=tag)
            w.leader(place, z, role=role, kind=f"{kind}-leader", ref=tag)
            placed += 1
        return placed, overlaps

    if config.device_notes:
        device_notes, extra = notes_at_equipment(notes_by_load, "device", "device")
        overlapping += extra
    if config.error_notes:
        error_notes, extra = notes_at_equipment(errors_by_tag, "notes", "error")
        overlapping += extra

    # everything placed so far widens the extents the schedule sits beside
    placed = index.bounds()
    if placed is not None:
        xmin, ymin = min(xmin, placed[0]), min(ymin, placed[1])
        xmax, ymax = max(xmax, placed[2]), max(ymax, placed[3])
    schedule_rows = 0
    if config.schedule:
        schedule_rows = _schedule_table(w, outcomes, xmax + 10.0 * h, ymax, 0.0)

    if overlapping:
        log.warning(
            "%s: %d labels or notes found no free spot and overlap others", dst, overlapping
        )
    with atomic_path(dst) as tmp:
        doc.saveas(tmp)
    log.info(
        "%s: %d cable labels, %d group tags, %d device notes", dst, labels, group_tags, device_notes
    )
    return AnnotationSummary(
        output_path=dst,
        labels=labels,
        group_tags=group_tags,
        device_notes=device_notes,
        error_notes=error_notes,
        schedule_rows=schedule_rows,
        removed=removed,
        overlapping=overlapping,
        text_height=h,
        layers=dict(w.layers),
        unlabelled=tuple(unlabelled),
    )
