"""Revision and fill marks for the annotated drawing: what to mark, where, and the shape.

Pure geometry, no DXF: the writer (annotate/drawing/) is to place one
mark beside the label of every circuit that is new or changed since the run
it was compared with, on a layer of its own.  The mark is ours: a diamond
(a square on its corner) holding the revision number, beside the label's end.
Likewise :func:`fill_marks` gives, for every segment whose tray or duct fill is
above its limit, the point half-way along the segment and the note to write there.
"""

from __future__ import annotations

import math
from collections.abc import Iterable, Sequence
from dataclasses import dataclass
from typing import cast

from .changes import ChangeReport

__all__ = ["MARKED_CHANGES", "RevisionMark", "FillMark", "changed_circuit_ids", "revision_mark",
           "fill_marks"]

#: Kinds of change that get a mark: a removed circuit has no label left to mark.
MARKED_CHANGES = ("new", "changed")
#: Half the diagonal of the diamond, in label text heights: big enough to hold a
#: two-digit revision number at the label's text height.
HALF_DIAGONAL_HEIGHTS = 1.2
#: Gap between the label's end and the diamond's left corner, in text heights.
GAP_HEIGHTS = 0.5

#: Height of the revision number, in label text heights: fits inside the diamond.
NUMBER_HEIGHTS = 0.8


@dataclass(frozen=True)
class RevisionMark:
    """One revision mark, in drawing units.

    Attributes
    ----------
    circuit_id : str
    outline : tuple of (x, y)
        The diamond's four corners, closed by the writer (left, bottom, right, top).
    text : str
        The revision number, centred at ``text_at``.
    text_at : (x, y)
    text_height : float
    """

    circuit_id: str
    outline: tuple[tuple[float, float], ...]
    text: str
    text_at: tuple[float, float]
    text_height: float


def changed_circuit_ids(report: ChangeReport) -> frozenset[str]:
    """Circuits whose labels get a revision mark: new or changed ones."""
    return frozenset(c.circuit_id for c in report.circuits if c.change in MARKED_CHANGES)


def revision_mark(circuit_id: str, label_end: tuple[float, float], text_height: float,
                  revision: str = "1") -> RevisionMark:
    """The diamond beside a label that ends (right, middle) at ``label_end``.

    Parameters
    ----------
    circuit_id : str
        The circuit the label belongs to.
    label_end : (float, float)
        Right end of the label's baseline middle, in drawing units.
    text_height : float
        The label's text height, in drawing units; the mark scales with it.
    revision : str
        Written inside the diamond.

    Examples
    --------
    >>> m = revision_mark("P-101", (10.0, 5.0), 1.0)
    >>> m.outline
    ((10.5, 5.0), (11.7, 3.8), (12.9, 5.0), (11.7, 6.2))
    >>> m.text_at
    (11.7, 5.0)
    """
    half = HALF_DIAGONAL_HEIGHTS * text_height
    left = label_end[0] + GAP_HEIGHTS * text_height
    cx, cy = round(left + half, 9), float(label_end[1])
    outline = ((round(left, 9), cy), (cx, round(cy - half, 9)), (round(cx + half, 9), cy), (cx, round(cy + half, 9)))
    return RevisionMark(circuit_id, outline, revision, (cx, cy), NUMBER_HEIGHTS * text_height)


@dataclass(frozen=True)
class FillMark:
    """A fill note to write at ``at_m`` (x, y, z in metres; the writer converts to drawing units);
    ``text`` is ``"<CONTAINMENT> FILL <percent> %"`` from ``containment`` and ``percent``."""

    segment_id: str
    at_m: tuple[float, float, float]
    result: str
    text: str
    percent: float = 0.0
    containment: str = ""


def _halfway(points: Iterable[Sequence[float]]) -> tuple[float, float, float]:
    """The point half-way along a polyline, measured along it."""
    # x, y, z of each point (route points are 3D, extract/model.py Point3)
    pts = [cast("tuple[float, float, float]", tuple(float(v) for v in p)) for p in points]
    if len(pts) == 1:
        return pts[0]
    pieces = [math.dist(a, b) for a, b in zip(pts[:-1], pts[1:], strict=True)]
    left = sum(pieces) / 2.0
    for (a, b), length in zip(zip(pts[:-1], pts[1:], strict=True), pieces, strict=True):
        if left <= length and length > 0:
            t = left / length
            return cast("tuple[float, float, float]", tuple(a[i] + t * (b[i] - a[i]) for i in range(3)))
        left -= length
    return pts[-1]


def fill_marks(rows: Iterable) -> tuple[FillMark, ...]:
    """Notes for the segments whose fill is a ``warning`` or ``fail``.

    Parameters
    ----------
    rows : iterable of SegmentRow
        From :func:`.takeoff.segment_rows`.

    Examples
    --------
    >>> _halfway([(0, 0, 0), (4, 0, 0), (4, 2, 0)])
    (3.0, 0.0, 0.0)
    """
    out = []
    for row in rows:
        fill = row.fill
        if fill.result in ("warning", "fail") and fill.percent is not None:
            kind = row.segment.containment.upper()
            out.append(FillMark(row.segment.segment_id, _halfway(row.segment.points_m), fill.result,
                                f"{kind} FILL {fill.percent:.0f} %", fill.percent, kind))
    return tuple(out)
