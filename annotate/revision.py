"""Revision marks for the annotated drawing: which labels to mark, and the mark's shape.

Pure geometry, no DXF: the writer (annotate/dxf_writer.py) is to place one
mark beside the label of every circuit that is new or changed since the run
it was compared with, on a layer of its own.  The mark is ours: a diamond
(a square on its corner) holding the revision number, beside the label's end.
"""

from __future__ import annotations

from dataclasses import dataclass

from .changes import ChangeReport

__all__ = ["MARKED_CHANGES", "RevisionMark", "changed_circuit_ids", "revision_mark"]

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
