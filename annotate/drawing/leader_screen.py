"""A bulk screen of leaders against our placed boxes: the ones that surely cross a box.

:meth:`.mark_index.LabelIndex.leader_free` tests one leader at a time, exactly (its thin
box against every placed box, :func:`.boxes.boxes_overlap`).  On a crowded drawing most
candidate spots of a note are free but their leader runs through one of our boxes; this
screen finds those in one vectorised pass, so that the exact test runs only for the
rest.  It answers "surely crossing" only with a margin far above rounding
(:func:`screen_margin`): a leader it names fails the exact test too, and a leader it does
not name is tested exactly, so the spots chosen are the same.

The test per (leader, box) pair: the leader, shortened by the margin at both ends, runs
through the box shrunk by the margin over a length of more than twice the margin
(Liang-Barsky clipping of a segment to a rectangle, in the box's own axes).

References
----------
.. [1] Liang, Y.-D., Barsky, B. A. "A new concept and method for line clipping",
   ACM Transactions on Graphics 3 (1), 1984.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import numpy as np
import shapely

__all__ = ["LeaderRows", "crossing_marks", "spots_crossing_marks", "leader_rows", "screen_margin", "surely_through"]

#: Relative rounding allowance of the screen: the exact leader and the screened one differ
#: by a few units in the last place of the coordinates (about 1e-16 of them); 1e-7 of the
#: largest coordinate leaves a factor of a million (our own choice, on the safe side).
SCALE_MARGIN = 1e-7
#: The exact leader is a box 1e-6 of its length wide (:func:`.mark_index.thin_box`); the
#: margin holds its width, so the shrunk segment inside a box keeps the whole width inside.
WIDTH_MARGIN = 1e-6


@dataclass(frozen=True)
class LeaderRows:
    """Leaders in bulk: each screened (shortened) segment ``p0``-``p1``, its margin, and
    ``ok`` False where a leader is too short to be screened."""

    p0: np.ndarray
    p1: np.ndarray
    margin: np.ndarray
    ok: np.ndarray


def screen_margin(a: np.ndarray, b: np.ndarray, length: np.ndarray, eps: float) -> np.ndarray:
    """Margin per leader [drawing units]: twice the overlap tolerance, the rounding
    allowance of the coordinates and the leader's width."""
    scale = np.maximum(np.abs(a).max(axis=1), np.abs(b).max(axis=1))
    return 2.0 * eps + SCALE_MARGIN * scale + WIDTH_MARGIN * length


def leader_rows(a: np.ndarray, b: np.ndarray, shorten_a: float, eps: float) -> LeaderRows:
    """The leaders from ``a[i]`` to ``b[i]`` as :func:`.mark_index.thin_box` draws them
    (``shorten_a`` off at ``a``, 1e-3 of the length off at ``b``), shortened by the margin
    at both ends; ``ok`` False where too little is left to screen."""
    d = b - a
    length = np.hypot(d[:, 0], d[:, 1])
    keep = length - shorten_a - 1e-3 * length
    margin = screen_margin(a, b, length, eps)
    ok = (keep > 4.0 * margin) & (WIDTH_MARGIN * length > 4.0 * eps)
    with np.errstate(divide="ignore", invalid="ignore"):
        u = d / length[:, None]
    p0 = a + u * (shorten_a + margin)[:, None]
    p1 = a + u * (shorten_a + keep - margin)[:, None]
    return LeaderRows(p0, p1, margin, ok)


def surely_through(p0: np.ndarray, p1: np.ndarray, margin: np.ndarray,
                   boxes: np.ndarray) -> np.ndarray:
    """Per pair ``i``: True when the segment ``p0[i]``-``p1[i]`` runs through box
    ``boxes[i]`` (columns cx, cy, ux, uy, hw, hh) shrunk by ``margin[i]``, over more than
    twice the margin."""
    cx, cy, ux, uy, hw, hh = boxes[:, :6].T
    hx, hy = hw - margin, hh - margin
    rx0, ry0 = p0[:, 0] - cx, p0[:, 1] - cy
    rx1, ry1 = p1[:, 0] - cx, p1[:, 1] - cy
    x0, y0 = rx0 * ux + ry0 * uy, -rx0 * uy + ry0 * ux
    x1, y1 = rx1 * ux + ry1 * uy, -rx1 * uy + ry1 * ux
    enter = np.zeros(len(p0))
    leave = np.ones(len(p0))
    inside = (hx > 0.0) & (hy > 0.0)
    with np.errstate(divide="ignore", invalid="ignore"):
        for s0, s1, half in ((x0, x1, hx), (y0, y1, hy)):
            ds = s1 - s0
            flat = ds == 0.0
            inside &= ~flat | (np.abs(s0) < half)
            t_a = (-half - s0) / ds
            t_b = (half - s0) / ds
            enter = np.where(flat, enter, np.maximum(enter, np.minimum(t_a, t_b)))
            leave = np.where(flat, leave, np.minimum(leave, np.maximum(t_a, t_b)))
    seg = np.hypot(p1[:, 0] - p0[:, 0], p1[:, 1] - p0[:, 1])
    return inside & (leave > enter) & ((leave - enter) * seg > 2.0 * margin)


def crossing_marks(index: Any, a: np.ndarray, b: np.ndarray, shorten_a: float) -> np.ndarray:
    """Per leader from ``a[i]`` to ``b[i]`` (as ``index.leader_free`` draws it): True when it
    surely crosses one of the boxes placed in ``index`` (a :class:`.mark_index.LabelIndex`),
    so that ``leader_free`` is False whatever its options; False: not sure, test it exactly."""
    out = np.zeros(len(a), dtype=bool)
    if not index._boxes or len(a) == 0:
        return out
    rows = leader_rows(a, b, shorten_a, index._eps)
    which = np.flatnonzero(rows.ok)
    if len(which) == 0:
        return out
    p0, p1, margin = rows.p0[which], rows.p1[which], rows.margin[which]
    segs = shapely.linestrings(np.stack([p0, p1], axis=1))
    # candidate boxes: the trees of our marks (their boxes), and those added since
    parts_l, parts_b = [], []
    first = index._in_tree[0]
    for level in index._marks.levels:  # as the search took them (not rebuilt here)
        li, gi = level.tree.query(segs)
        bi = level.box_of[gi]
        parts_l.append(li[bi >= 0])
        parts_b.append(bi[bi >= 0])
    since = index._since_tree(first)
    if since is not None:
        li, bj = since.query(segs)
        parts_l.append(li)
        parts_b.append(bj + first)
    if not parts_l:
        return out
    li, bi = np.concatenate(parts_l), np.concatenate(parts_b)
    hit = surely_through(p0[li], p1[li], margin[li], index._box_rows[bi])
    out[which[li[hit]]] = True
    return out


def spots_crossing_marks(index: Any, rows: np.ndarray, start: float) -> np.ndarray:
    """Per candidate spot row (columns as :data:`.label_spots.COLUMNS`: box, anchor): True
    when its leader, anchor to the nearest point of the box, surely crosses one of our
    boxes (so its exact leader test fails; :func:`crossing_marks`)."""
    anchors = rows[:, 6:8]
    return crossing_marks(index, anchors, _nearest_rows(rows, anchors), start)


def _nearest_rows(rows: np.ndarray, p: np.ndarray) -> np.ndarray:
    """:func:`.label_spots._nearest_on_box` for every row (box columns as :data:`COLUMNS`)."""
    cx, cy, ux, uy, hw, hh = rows[:, :6].T
    dx, dy = p[:, 0] - cx, p[:, 1] - cy
    lx = np.maximum(-hw, np.minimum(hw, dx * ux + dy * uy))
    ly = np.maximum(-hh, np.minimum(hh, -dx * uy + dy * ux))
    return np.stack([cx + lx * ux - ly * uy, cy + lx * uy + ly * ux], axis=1)
